//! Lines left out where they crowd: a contour is cut where the next
//! level's line would run closer than [`MIN_LINE_GAP_PX`] beside it on
//! the chart. Bundles of lines closer than that print as a dark blob on a
//! slide (the steep walls of a transfer-window field, the approach to the
//! 180-degree line) and carry no reading a reviewer can take; the lines
//! resume where they spread out again.

use super::isolines::{Isoline, Lattice};

/// Closest two neighbouring contour lines may run, logical px at the
/// reference size: about four strokes, so that a bundle still reads as
/// separate lines on a projected slide (chosen by eye; no source).
pub const MIN_LINE_GAP_PX: f64 = 6.0;

/// The field's gradient at the sample nearest to `(x, y)` (data
/// coordinates), per px across and up: central differences, one-sided
/// next to a border or a blank sample; `None` where neither neighbour
/// along an axis has a value.
///
/// # Method
/// Finite differences on the sample lattice: (f[i+1] - f[i-1]) / 2h, or
/// (f[i+1] - f[i]) / h and (f[i] - f[i-1]) / h at an edge.
fn gradient_px(
    field: &[f64],
    lat: &Lattice,
    px_per_day: (f64, f64),
    (x, y): (f64, f64),
) -> Option<(f64, f64)> {
    let ix = ((x - lat.x0) / lat.dx)
        .round()
        .clamp(0.0, lat.nx as f64 - 1.0) as usize;
    let iy = ((y - lat.y0) / lat.dy)
        .round()
        .clamp(0.0, lat.ny as f64 - 1.0) as usize;
    let at = |i: usize, j: usize| {
        let v = field[j * lat.nx + i];
        v.is_finite().then_some(v)
    };
    let diff = |lo: Option<f64>, mid: Option<f64>, hi: Option<f64>, h: f64| match (lo, mid, hi) {
        (Some(a), _, Some(b)) => Some((b - a) / (2.0 * h)),
        (None, Some(m), Some(b)) => Some((b - m) / h),
        (Some(a), Some(m), None) => Some((m - a) / h),
        _ => None,
    };
    let mid = at(ix, iy);
    let gx = diff(
        ix.checked_sub(1).and_then(|i| at(i, iy)),
        mid,
        (ix + 1 < lat.nx).then(|| at(ix + 1, iy)).flatten(),
        lat.dx,
    )?;
    let gy = diff(
        iy.checked_sub(1).and_then(|j| at(ix, j)),
        mid,
        (iy + 1 < lat.ny).then(|| at(ix, iy + 1)).flatten(),
        lat.dy,
    )?;
    Some((gx / px_per_day.0, gy / px_per_day.1))
}

/// A run left over by a cut shorter than this many px is dropped: a
/// stray dash means nothing.
const MIN_RUN_PX: f64 = 4.0 * MIN_LINE_GAP_PX;

/// Length of a polyline in px.
fn length_px(run: &[(f64, f64)], px_per_day: (f64, f64)) -> f64 {
    run.windows(2)
        .map(|w| ((w[1].0 - w[0].0) * px_per_day.0).hypot((w[1].1 - w[0].1) * px_per_day.1))
        .sum()
}

/// `lines` (isolines of `field` on `lat`, one per level) cut wherever a
/// neighbouring level's line lies closer than [`MIN_LINE_GAP_PX`]: the
/// distance to it is the smaller level step beside this level divided by
/// the field's gradient per px there. A piece that is cut keeps its runs
/// of points far enough apart from their neighbours that are at least
/// four such gaps long.
pub(crate) fn thin(
    lines: Vec<Isoline>,
    field: &[f64],
    lat: &Lattice,
    px_per_day: (f64, f64),
) -> Vec<Isoline> {
    let levels: Vec<f64> = lines.iter().map(|l| l.level).collect();
    lines
        .into_iter()
        .enumerate()
        .map(|(n, line)| {
            let below = n.checked_sub(1).map(|m| line.level - levels[m]);
            let above = levels.get(n + 1).map(|l| l - line.level);
            let step = match (below, above) {
                (Some(a), Some(b)) => a.min(b),
                (Some(a), None) | (None, Some(a)) => a,
                (None, None) => return line,
            };
            let crowded = |p: (f64, f64)| {
                gradient_px(field, lat, px_per_day, p).is_some_and(|(gx, gy)| {
                    let g = gx.hypot(gy);
                    g > 0.0 && step / g < MIN_LINE_GAP_PX
                })
            };
            let mut pieces = Vec::new();
            for piece in line.pieces {
                let flags: Vec<bool> = piece.iter().map(|&p| crowded(p)).collect();
                if !flags.contains(&true) {
                    pieces.push(piece);
                    continue;
                }
                let mut run: Vec<(f64, f64)> = Vec::new();
                for (p, bad) in piece.into_iter().zip(flags).chain([((0.0, 0.0), true)]) {
                    if bad {
                        if length_px(&run, px_per_day) >= MIN_RUN_PX {
                            pieces.push(std::mem::take(&mut run));
                        }
                        run.clear();
                    } else {
                        run.push(p);
                    }
                }
            }
            Isoline {
                level: line.level,
                pieces,
            }
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::chart::isolines::isolines;

    #[test]
    fn lines_stop_where_the_next_level_comes_too_close() {
        // f = x^2 on x in [0, 10] days at 20 px per day: levels every 1
        // lie at x = sqrt(L), 20 / (2 sqrt L) px apart, which is below
        // 6 px from L = 2.8 on. The gradient 2x per day is 0.1 x per px:
        // the rule cuts where 1 / (0.1 x) < 6, x > 1.67.
        let lat = Lattice {
            nx: 101,
            ny: 11,
            x0: 0.0,
            dx: 0.1,
            y0: 0.0,
            dy: 1.0,
        };
        let field: Vec<f64> = (0..lat.nx * lat.ny)
            .map(|k| ((k % lat.nx) as f64 * 0.1).powi(2))
            .collect();
        let levels: Vec<f64> = (1..=9).map(f64::from).collect();
        let lines = isolines(&field, &lat, &levels).expect("lines");
        let kept = thin(lines, &field, &lat, (20.0, 20.0));
        assert!(kept.iter().filter(|l| l.pieces.is_empty()).count() >= 5);
        for l in &kept {
            let x = l.level.sqrt();
            let drawn = !l.pieces.is_empty();
            // Away from the threshold by more than the central
            // difference's error (h = 0.1 day).
            if x < 1.5 {
                assert!(drawn, "level {} at x = {x} cut", l.level);
            }
            if x > 1.85 {
                assert!(!drawn, "level {} at x = {x} kept", l.level);
            }
        }
        // One level alone is never cut.
        let one = isolines(&field, &lat, &[9.0]).expect("line");
        assert_eq!(thin(one.clone(), &field, &lat, (20.0, 20.0)), one);
    }
}
