//! Isolines of a regularly sampled 2-D field, in data coordinates.
//!
//! A thin layer over the `contour` crate's marching squares (with linear
//! interpolation along cell edges, `smooth = true`). It fixes the three
//! things a chart needs that the crate leaves to its caller:
//!
//! * **Cell-centre offsets.** The crate puts sample `(ix, iy)` at
//!   `(ix + 0.5, iy + 0.5)` of its cell space; the origin is shifted by half
//!   a step so that sample `ix` lands exactly on `x0 + ix * dx`.
//! * **Borders.** The crate pads the field with "below threshold" values, so
//!   an isoline that leaves the grid comes back as a closed ring running
//!   along the padded border. Those border runs are cut away; what remains
//!   lies within the sampled rectangle.
//! * **Masked samples (NaN).** Masked samples are first extended by one
//!   sample (linear extrapolation from their unmasked neighbours) so that
//!   lines reach the edge of the mask instead of stopping a cell short; the
//!   line is then cut wherever its nearest sample is masked, or where the
//!   interpolation produced NaN.

use contour::ContourBuilder;

use super::ChartError;

/// A regular lattice of samples: `nx` columns at `x0 + ix * dx`, `ny` rows at
/// `y0 + iy * dy`. Values on it are row-major: `values[iy * nx + ix]`.
///
/// # Units
/// Any, as long as they match the data coordinates wanted back (the chart
/// uses days past J2000 TDB for dates and days for times of flight).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Lattice {
    /// Number of columns (x samples), >= 2.
    pub nx: usize,
    /// Number of rows (y samples), >= 2.
    pub ny: usize,
    /// x of column 0.
    pub x0: f64,
    /// Column spacing, > 0.
    pub dx: f64,
    /// y of row 0.
    pub y0: f64,
    /// Row spacing, > 0.
    pub dy: f64,
}

impl Lattice {
    /// x of the last column.
    pub fn x_last(&self) -> f64 {
        self.x0 + (self.nx as f64 - 1.0) * self.dx
    }

    /// y of the last row.
    pub fn y_last(&self) -> f64 {
        self.y0 + (self.ny as f64 - 1.0) * self.dy
    }

    fn check(&self, len: usize) -> Result<(), ChartError> {
        if self.nx < 2 || self.ny < 2 {
            return Err(ChartError::GridTooSmall {
                nx: self.nx,
                ny: self.ny,
            });
        }
        let steps_ok = self.dx.is_finite()
            && self.dx > 0.0
            && self.dy.is_finite()
            && self.dy > 0.0
            && self.x0.is_finite()
            && self.y0.is_finite();
        if !steps_ok {
            return Err(ChartError::BadLattice {
                dx: self.dx,
                dy: self.dy,
            });
        }
        if len != self.nx * self.ny {
            return Err(ChartError::FieldSize {
                expected: self.nx * self.ny,
                got: len,
            });
        }
        Ok(())
    }
}

/// The isoline of one level: zero or more open or closed polylines.
#[derive(Debug, Clone, PartialEq)]
pub struct Isoline {
    /// The level, in the field's unit.
    pub level: f64,
    /// Polylines as `(x, y)` points in data coordinates. A closed ring
    /// repeats its first point at the end.
    pub pieces: Vec<Vec<(f64, f64)>>,
}

/// The field with every masked (NaN) sample that touches an unmasked one
/// replaced by a linear extrapolation of its unmasked neighbours.
pub(crate) fn extend_one_sample(values: &[f64], nx: usize, ny: usize) -> Vec<f64> {
    let mut out = values.to_vec();
    let at = |ix: isize, iy: isize| -> Option<f64> {
        if ix < 0 || iy < 0 || ix >= nx as isize || iy >= ny as isize {
            return None;
        }
        let v = values[iy as usize * nx + ix as usize];
        v.is_finite().then_some(v)
    };
    for iy in 0..ny {
        for ix in 0..nx {
            if values[iy * nx + ix].is_finite() {
                continue;
            }
            let (x, y) = (ix as isize, iy as isize);
            let mut sum = 0.0;
            let mut n = 0u32;
            for (sx, sy) in [(1, 0), (-1, 0), (0, 1), (0, -1)] {
                if let Some(v1) = at(x + sx, y + sy) {
                    // Two unmasked samples in a row: continue their slope.
                    let est = match at(x + 2 * sx, y + 2 * sy) {
                        Some(v2) => 2.0 * v1 - v2,
                        None => v1,
                    };
                    sum += est;
                    n += 1;
                }
            }
            if n > 0 {
                out[iy * nx + ix] = sum / f64::from(n);
            }
        }
    }
    out
}

/// Isolines of `values` (row-major on `lattice`, NaN = masked) at `levels`.
///
/// Lines are interpolated linearly along cell edges, lie inside the
/// sampled rectangle `[x0, x_last] x [y0, y_last]`, never run along its
/// border, and stop at the boundary between unmasked and masked samples
/// (half-way between the two).
///
/// # Errors
/// [`ChartError::GridTooSmall`], [`ChartError::BadLattice`] or
/// [`ChartError::FieldSize`] for an unusable lattice; [`ChartError::Contour`]
/// if the contour crate fails.
pub fn isolines(
    values: &[f64],
    lattice: &Lattice,
    levels: &[f64],
) -> Result<Vec<Isoline>, ChartError> {
    lattice.check(values.len())?;
    let Lattice {
        nx,
        ny,
        x0,
        dx,
        y0,
        dy,
    } = *lattice;
    let levels: Vec<f64> = levels.iter().copied().filter(|l| l.is_finite()).collect();
    let extended = extend_one_sample(values, nx, ny);
    let builder = ContourBuilder::new(nx, ny, true)
        .x_origin(x0 - 0.5 * dx)
        .y_origin(y0 - 0.5 * dy)
        .x_step(dx)
        .y_step(dy);
    let lines = builder
        .lines(&extended, &levels)
        .map_err(|e| ChartError::Contour(format!("{:?}", e.kind())))?;

    // A point is kept when it is finite, off the padded border and nearest
    // to an unmasked sample.
    let tol = 1e-9;
    let good = |x: f64, y: f64| -> bool {
        if !(x.is_finite() && y.is_finite()) {
            return false;
        }
        let cx = (x - x0) / dx; // sample index space
        let cy = (y - y0) / dy;
        let on_border = cx <= -0.5 + tol
            || cx >= nx as f64 - 0.5 - tol
            || cy <= -0.5 + tol
            || cy >= ny as f64 - 0.5 - tol;
        if on_border {
            return false;
        }
        let ix = (cx.round().max(0.0) as usize).min(nx - 1);
        let iy = (cy.round().max(0.0) as usize).min(ny - 1);
        values[iy * nx + ix].is_finite()
    };

    let mut out = Vec::with_capacity(lines.len());
    for line in lines {
        let level = line.threshold();
        let mut pieces = Vec::new();
        for ls in line.geometry().0.iter() {
            let pts: Vec<(f64, f64)> = ls.0.iter().map(|c| (c.x, c.y)).collect();
            split_ring(&pts, &good, &mut pieces);
        }
        out.push(Isoline { level, pieces });
    }
    Ok(out)
}

/// Splits one ring from the contour crate into runs of good points.
fn split_ring(
    pts: &[(f64, f64)],
    good: &dyn Fn(f64, f64) -> bool,
    pieces: &mut Vec<Vec<(f64, f64)>>,
) {
    if pts.len() < 2 {
        return;
    }
    let first = pts[0];
    let last = pts[pts.len() - 1];
    let closed = (first.0 - last.0).abs() <= 1e-12 * (1.0 + first.0.abs())
        && (first.1 - last.1).abs() <= 1e-12 * (1.0 + first.1.abs());
    let flags: Vec<bool> = pts.iter().map(|&(x, y)| good(x, y)).collect();
    match flags.iter().position(|&g| !g) {
        None => {
            pieces.push(pts.to_vec());
        }
        Some(first_bad) => {
            // In a closed ring, start at a bad point so that the run that
            // wraps past the ring's start stays in one piece.
            let body = if closed { &pts[..pts.len() - 1] } else { pts };
            let n = body.len();
            let order: Vec<usize> = if closed {
                (0..n).map(|k| (first_bad + k) % n).collect()
            } else {
                (0..n).collect()
            };
            let mut run: Vec<(f64, f64)> = Vec::new();
            for k in order {
                if flags[k] {
                    run.push(body[k]);
                } else {
                    if run.len() >= 2 {
                        pieces.push(std::mem::take(&mut run));
                    }
                    run.clear();
                }
            }
            if run.len() >= 2 {
                pieces.push(run);
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A lattice with different origins, steps and counts on x and y, so a
    /// swapped axis or a wrong offset shows up.
    fn lattice() -> Lattice {
        Lattice {
            nx: 81,
            ny: 161,
            x0: 100.0,
            dx: 0.5,
            y0: -20.0,
            dy: 0.25,
        }
    }

    fn cone(lat: &Lattice, xc: f64, yc: f64) -> Vec<f64> {
        let mut v = vec![0.0; lat.nx * lat.ny];
        for iy in 0..lat.ny {
            for ix in 0..lat.nx {
                let x = lat.x0 + ix as f64 * lat.dx;
                let y = lat.y0 + iy as f64 * lat.dy;
                v[iy * lat.nx + ix] = ((x - xc).powi(2) + (y - yc).powi(2)).sqrt();
            }
        }
        v
    }

    #[test]
    fn circle_of_known_radius() {
        let lat = lattice();
        // Centre (120, 0): inside x 100..140, y -20..20.
        let (xc, yc, r) = (120.0, 0.0, 7.0);
        let lines = isolines(&cone(&lat, xc, yc), &lat, &[r]).expect("contours");
        assert_eq!(lines.len(), 1);
        let line = &lines[0];
        assert!((line.level - r).abs() < 1e-12);
        assert_eq!(line.pieces.len(), 1, "one closed ring");
        let ring = &line.pieces[0];
        assert!(ring.len() > 50);
        let (f, l) = (ring[0], ring[ring.len() - 1]);
        assert!(
            (f.0 - l.0).abs() < 1e-9 && (f.1 - l.1).abs() < 1e-9,
            "closed"
        );
        // Linear interpolation of the cone along edges: error below
        // h^2 / (8 r) ~ 0.005 for h = 0.5; allow 0.01.
        for &(x, y) in ring {
            let d = ((x - xc).powi(2) + (y - yc).powi(2)).sqrt();
            assert!((d - r).abs() < 0.01, "point ({x}, {y}) at distance {d}");
        }
        // Extent: the ring reaches xc +- r and yc +- r (x and y not swapped).
        let xmin = ring.iter().map(|p| p.0).fold(f64::INFINITY, f64::min);
        let xmax = ring.iter().map(|p| p.0).fold(f64::NEG_INFINITY, f64::max);
        let ymin = ring.iter().map(|p| p.1).fold(f64::INFINITY, f64::min);
        let ymax = ring.iter().map(|p| p.1).fold(f64::NEG_INFINITY, f64::max);
        assert!((xmin - (xc - r)).abs() < 0.01 && (xmax - (xc + r)).abs() < 0.01);
        assert!((ymin - (yc - r)).abs() < 0.01 && (ymax - (yc + r)).abs() < 0.01);
    }

    #[test]
    fn sample_values_land_on_their_coordinates() {
        // A plane f = x: the isoline at a sample's own x value must pass
        // exactly through that column (checks the half-cell offset).
        let lat = lattice();
        let mut v = vec![0.0; lat.nx * lat.ny];
        for iy in 0..lat.ny {
            for ix in 0..lat.nx {
                v[iy * lat.nx + ix] = lat.x0 + ix as f64 * lat.dx;
            }
        }
        let x_col = lat.x0 + 30.0 * lat.dx;
        let lines = isolines(&v, &lat, &[x_col + 0.1]).expect("contours");
        let pts: Vec<_> = lines[0].pieces.iter().flatten().collect();
        assert!(!pts.is_empty());
        for p in &pts {
            assert!((p.0 - (x_col + 0.1)).abs() < 1e-9, "x = {}", p.0);
        }
        // Spans the sampled rows and no further (border runs removed).
        let ymin = pts.iter().map(|p| p.1).fold(f64::INFINITY, f64::min);
        let ymax = pts.iter().map(|p| p.1).fold(f64::NEG_INFINITY, f64::max);
        assert!((ymin - lat.y0).abs() < 1e-9, "ymin {ymin}");
        assert!((ymax - lat.y_last()).abs() < 1e-9, "ymax {ymax}");
    }

    #[test]
    fn circle_cut_by_the_border_has_no_border_runs() {
        let lat = lattice();
        // Centre near the left edge: the circle leaves the grid.
        let (xc, yc, r) = (102.0, 5.0, 6.0);
        let lines = isolines(&cone(&lat, xc, yc), &lat, &[r]).expect("contours");
        let pieces = &lines[0].pieces;
        assert_eq!(pieces.len(), 1, "one open arc");
        for &(x, y) in &pieces[0] {
            assert!(x >= lat.x0 - 1e-9 && x <= lat.x_last() + 1e-9);
            assert!(y >= lat.y0 - 1e-9 && y <= lat.y_last() + 1e-9);
            let d = ((x - xc).powi(2) + (y - yc).powi(2)).sqrt();
            assert!((d - r).abs() < 0.01);
        }
    }

    #[test]
    fn masked_samples_carry_no_lines() {
        let lat = lattice();
        let (xc, yc, r) = (120.0, 0.0, 7.0);
        let mut v = cone(&lat, xc, yc);
        // Mask every sample right of x = 121.
        for iy in 0..lat.ny {
            for ix in 0..lat.nx {
                if lat.x0 + ix as f64 * lat.dx > 121.0 {
                    v[iy * lat.nx + ix] = f64::NAN;
                }
            }
        }
        let lines = isolines(&v, &lat, &[r]).expect("contours");
        let pieces = &lines[0].pieces;
        assert_eq!(pieces.len(), 1, "the ring is cut into one arc");
        let arc = &pieces[0];
        let (f, l) = (arc[0], arc[arc.len() - 1]);
        assert!((f.0 - l.0).abs() > 1e-3 || (f.1 - l.1).abs() > 1e-3, "open");
        // The mask boundary is half-way between x = 121 and 121.5.
        let xmax = arc.iter().map(|p| p.0).fold(f64::NEG_INFINITY, f64::max);
        assert!(xmax <= 121.25 + 1e-9, "xmax {xmax}");
        assert!(xmax >= 120.75, "line reaches the mask, xmax {xmax}");
        for &(x, y) in arc {
            assert!(x.is_finite() && y.is_finite());
            let d = ((x - xc).powi(2) + (y - yc).powi(2)).sqrt();
            assert!((d - r).abs() < 0.02);
        }
    }

    #[test]
    fn bad_lattices_are_errors() {
        let mut lat = lattice();
        let v = vec![0.0; 10];
        assert!(matches!(
            isolines(&v, &lat, &[1.0]),
            Err(ChartError::FieldSize { .. })
        ));
        lat.dx = 0.0;
        let v = vec![0.0; lat.nx * lat.ny];
        assert!(matches!(
            isolines(&v, &lat, &[1.0]),
            Err(ChartError::BadLattice { .. })
        ));
        lat.nx = 1;
        assert!(matches!(
            isolines(&v, &lat, &[1.0]),
            Err(ChartError::GridTooSmall { .. })
        ));
    }
}
