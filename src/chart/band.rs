//! The band around the 180-degree transfer-angle line in which no contour
//! or label is drawn.
//!
//! Where the transfer angle nears 180 degrees the two position vectors
//! are almost opposite, the transfer plane is barely defined and C3,
//! arrival v-infinity and the asymptote declinations all change steeply:
//! contours crowd into a knot along the line, and a sampled grid adds
//! noise there, because neighbouring samples on either side of the line
//! belong to transfer planes tilted the opposite way. The chart leaves a
//! band around the line blank instead, and draws the line itself once,
//! clearly, in its middle.
//!
//! **Width.** The band reaches [`BAND_STEPS`] grid steps either side of
//! the line (the sampling noise lives within a step or two of it), and at
//! least [`BAND_MIN_PX`] logical px at the reference size on fine grids,
//! where a few steps would be narrower than the knot looks. Distances are
//! measured on the chart, so a grid with unequal steps in days, or unequal
//! px per day across and up, gets a band of even width.

use super::isolines::Lattice;

/// Half-width of the band in grid steps (the larger of the two px sizes
/// of a step).
pub const BAND_STEPS: f64 = 3.0;
/// Smallest half-width of the band, logical px at the reference size.
pub const BAND_MIN_PX: f64 = 12.0;

/// One pass of the distance transform along a line of samples spaced `w`
/// apart: `out[p] = min_q (w (p - q))^2 + f[q]`.
///
/// # Method
/// The lower envelope of parabolas of P. F. Felzenszwalb and D. P.
/// Huttenlocher, "Distance Transforms of Sampled Functions", Theory of
/// Computing 8 (2012), algorithm DT(f), with sample positions `w q`.
/// Infinite `f[q]` add no parabola.
fn transform_1d(f: &[f64], w: f64, out: &mut [f64]) {
    let n = f.len();
    let mut v: Vec<usize> = Vec::with_capacity(n);
    let mut z: Vec<f64> = Vec::with_capacity(n + 1);
    let pos = |q: usize| w * q as f64;
    for q in 0..n {
        if !f[q].is_finite() {
            continue;
        }
        loop {
            let Some(&last) = v.last() else {
                v.push(q);
                z.clear();
                z.push(f64::NEG_INFINITY);
                z.push(f64::INFINITY);
                break;
            };
            let s = ((f[q] + pos(q) * pos(q)) - (f[last] + pos(last) * pos(last)))
                / (2.0 * (pos(q) - pos(last)));
            if s <= z[z.len() - 2] {
                v.pop();
                z.pop();
                continue;
            }
            let top = z.len() - 1;
            z[top] = s;
            z.push(f64::INFINITY);
            v.push(q);
            break;
        }
    }
    if v.is_empty() {
        out.fill(f64::INFINITY);
        return;
    }
    let mut k = 0;
    for (p, o) in out.iter_mut().enumerate() {
        while z[k + 1] < pos(p) {
            k += 1;
        }
        let d = pos(p) - pos(v[k]);
        *o = d * d + f[v[k]];
    }
}

/// Squared distance (in units where a step is `wx` across and `wy` up)
/// from every sample to the nearest seed; infinite without seeds.
///
/// # Method
/// Felzenszwalb and Huttenlocher (2012): the exact Euclidean transform as
/// a 1-D transform along every row, then along every column.
pub(crate) fn squared_distance(seeds: &[bool], nx: usize, ny: usize, wx: f64, wy: f64) -> Vec<f64> {
    let mut rows = vec![f64::INFINITY; nx * ny];
    let mut line = vec![0.0; nx.max(ny)];
    for iy in 0..ny {
        let f: Vec<f64> = (0..nx)
            .map(|ix| {
                if seeds[iy * nx + ix] {
                    0.0
                } else {
                    f64::INFINITY
                }
            })
            .collect();
        transform_1d(&f, wx, &mut line[..nx]);
        rows[iy * nx..(iy + 1) * nx].copy_from_slice(&line[..nx]);
    }
    let mut out = vec![f64::INFINITY; nx * ny];
    for ix in 0..nx {
        let f: Vec<f64> = (0..ny).map(|iy| rows[iy * nx + ix]).collect();
        transform_1d(&f, wy, &mut line[..ny]);
        for iy in 0..ny {
            out[iy * nx + ix] = line[iy];
        }
    }
    out
}

/// The samples of the band around the 180-degree line: `ridge` is the
/// transfer angle minus 180 deg (NaN where unknown or far from 180);
/// `px_per_day` the chart's scale across and up at the reference size.
///
/// Seeds are the samples either side of a sign change of `ridge` between
/// neighbours; the band holds every sample within the half-width
/// (module docs) of a seed.
pub(crate) fn ridge_band(ridge: &[f64], lat: &Lattice, px_per_day: (f64, f64)) -> Vec<bool> {
    let (nx, ny) = (lat.nx, lat.ny);
    let mut seeds = vec![false; nx * ny];
    let crosses = |a: f64, b: f64| a.is_finite() && b.is_finite() && (a <= 0.0) != (b <= 0.0);
    for iy in 0..ny {
        for ix in 0..nx {
            let k = iy * nx + ix;
            if ix + 1 < nx && crosses(ridge[k], ridge[k + 1]) {
                seeds[k] = true;
                seeds[k + 1] = true;
            }
            if iy + 1 < ny && crosses(ridge[k], ridge[k + nx]) {
                seeds[k] = true;
                seeds[k + nx] = true;
            }
        }
    }
    let wx = lat.dx * px_per_day.0;
    let wy = lat.dy * px_per_day.1;
    let half = (BAND_STEPS * wx.max(wy)).max(BAND_MIN_PX);
    squared_distance(&seeds, nx, ny, wx, wy)
        .into_iter()
        .map(|d2| d2 <= half * half)
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Brute force: the smallest distance to any seed.
    fn brute(seeds: &[bool], nx: usize, ny: usize, wx: f64, wy: f64) -> Vec<f64> {
        let pts: Vec<(f64, f64)> = (0..nx * ny)
            .filter(|&k| seeds[k])
            .map(|k| ((k % nx) as f64 * wx, (k / nx) as f64 * wy))
            .collect();
        (0..nx * ny)
            .map(|k| {
                let (x, y) = ((k % nx) as f64 * wx, (k / nx) as f64 * wy);
                pts.iter()
                    .map(|p| (p.0 - x).powi(2) + (p.1 - y).powi(2))
                    .fold(f64::INFINITY, f64::min)
            })
            .collect()
    }

    #[test]
    fn transform_equals_the_nearest_seed_by_brute_force() {
        // Scattered seeds on a 23 x 17 lattice with unequal steps: the
        // exact Euclidean distance, checked against every seed directly.
        let (nx, ny, wx, wy) = (23, 17, 1.5, 0.7);
        let seeds: Vec<bool> = (0..nx * ny).map(|k| (k * 37 + 11) % 53 == 0).collect();
        assert!(seeds.iter().filter(|&&s| s).count() >= 5);
        let fast = squared_distance(&seeds, nx, ny, wx, wy);
        for (a, b) in fast.iter().zip(brute(&seeds, nx, ny, wx, wy)) {
            assert!((a - b).abs() < 1e-9, "{a} vs {b}");
        }
        assert!(squared_distance(&[false; 6], 3, 2, 1.0, 1.0)
            .iter()
            .all(|d| d.is_infinite()));
    }

    #[test]
    fn band_follows_a_diagonal_line_at_its_width() {
        // Transfer angle - 180 = x - y on a 60 x 60 lattice: the line
        // x = y. At 3 px per step across and up (3 steps = 9 px) the
        // minimum of 12 px sets the half-width, 4 steps; the
        // perpendicular distance of sample (x, y) from the seeds is
        // about |x - y| * 3 / sqrt 2 px.
        let lat = Lattice {
            nx: 60,
            ny: 60,
            x0: 0.0,
            dx: 1.0,
            y0: 0.0,
            dy: 1.0,
        };
        let ridge: Vec<f64> = (0..3600)
            .map(|k| (k % 60) as f64 - (k / 60) as f64 + 0.5)
            .collect();
        let band = ridge_band(&ridge, &lat, (3.0, 3.0));
        for (k, &inside) in band.iter().enumerate() {
            let off = ((k % 60) as f64 - (k / 60) as f64 + 0.5).abs();
            let perp_px = off * 3.0 / 2f64.sqrt();
            // Seeds sit within half a step of the line: allow a step.
            if perp_px < BAND_MIN_PX - 3.0 {
                assert!(inside, "sample {k} at {perp_px} px outside");
            }
            if perp_px > BAND_MIN_PX + 3.0 {
                assert!(!inside, "sample {k} at {perp_px} px inside");
            }
        }
        // On a coarse chart (20 px per step) three steps set it: 60 px.
        let band = ridge_band(&ridge, &lat, (20.0, 20.0));
        let width = (0..60).filter(|&i| band[30 * 60 + i]).count();
        // Along a row, 60 px either side of the seeds is 60 / 20 = 3
        // steps at 45 degrees times sqrt 2: about 4.2 steps each side.
        assert!((9..=12).contains(&width), "{width}");
    }
}
