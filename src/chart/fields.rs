//! The fields a chart contours, taken from one layer of a [`Grid`] onto
//! the chart's lattice (the whole grid, or the samples inside a crop
//! window), with the cells that have no figures sorted by why: arrival
//! not after departure (a fact of the axes) or no solution (the solver's
//! verdict).

use super::calendar::date_label_tdb;
use super::isolines::Lattice;
use super::levels::format_level;
use super::panel::Panel;
use super::{ChartError, ChartSpec};
use crate::sweep::{Axis, CellStatus, Grid, SecondAxis};
use crate::transfer::Endpoints;

/// Samples closer than this to a crop limit count as inside it, days
/// (well below any grid step, above the rounding of a day count).
const CROP_TOLERANCE_DAYS: f64 = 1e-6;

/// The layer's fields, row-major on the chart's lattice (x = departure).
pub(crate) struct Fields {
    pub(crate) lattice: Lattice,
    /// Grid indices `(i, j)` of the lattice's first sample.
    pub(crate) origin: (usize, usize),
    pub(crate) c3: Vec<f64>,
    pub(crate) vinf: Vec<f64>,
    /// Transfer angle - 180 deg within 90 deg of 180, NaN elsewhere.
    pub(crate) ridge: Vec<f64>,
    pub(crate) angle_deg: Vec<f64>,
    /// Samples without figures whose arrival is after departure.
    pub(crate) unsolved: Vec<bool>,
    /// Samples whose arrival is not after departure.
    pub(crate) before: Vec<bool>,
}

/// First index and count of the samples of `axis` within `window`.
fn crop(
    axis: &Axis,
    window: Option<(f64, f64)>,
    name: &'static str,
    dates: bool,
) -> Result<(usize, usize), ChartError> {
    let Some((a, b)) = window else {
        return Ok((0, axis.count));
    };
    let inside: Vec<usize> = (0..axis.count)
        .filter(|&i| {
            let v = axis.value(i);
            v >= a.min(b) - CROP_TOLERANCE_DAYS && v <= a.max(b) + CROP_TOLERANCE_DAYS
        })
        .collect();
    match (inside.first(), inside.last()) {
        (Some(&first), Some(&last)) if last > first => Ok((first, last - first + 1)),
        _ => {
            let text = |d: f64| {
                if !d.is_finite() {
                    "?".to_string()
                } else if dates {
                    date_label_tdb(d)
                } else {
                    format!("{} d", format_level(d))
                }
            };
            Err(ChartError::Crop {
                axis: name,
                window: format!("{}..{}", text(a.min(b)), text(a.max(b))),
                grid: format!("{}..{}", text(axis.start_days), text(axis.end_days())),
            })
        }
    }
}

/// The fields of `spec`'s layer inside its crop windows.
///
/// # Errors
/// [`ChartError::NoSuchLayer`], [`ChartError::GridTooSmall`],
/// [`ChartError::FieldSize`] for an unusable grid; [`ChartError::Crop`]
/// when a crop window holds fewer than two samples.
pub(crate) fn fields(spec: &ChartSpec<'_>) -> Result<Fields, ChartError> {
    let (grid, layer) = (spec.grid, spec.layer);
    if layer >= grid.layers.len() {
        return Err(ChartError::NoSuchLayer {
            layer,
            layers: grid.layers.len(),
        });
    }
    let (gx, gy) = (grid.depart.count, grid.second.count);
    if gx < 2 || gy < 2 {
        return Err(ChartError::GridTooSmall { nx: gx, ny: gy });
    }
    let needed = grid.index(gx - 1, gy - 1, layer) + 1;
    let arrays = [
        grid.vinf_depart_km_s.len(),
        grid.vinf_arrive_km_s.len(),
        grid.transfer_angle_deg.len(),
        grid.status.len(),
        grid.depart_dir.len(),
        grid.arrive_dir.len(),
    ];
    if let Some(&got) = arrays.iter().find(|&&len| len < needed) {
        return Err(ChartError::FieldSize {
            expected: gx * gy * grid.layers.len(),
            got,
        });
    }
    let dated = grid.second_kind == SecondAxis::Arrival;
    let (i0, nx) = crop(&grid.depart, spec.slide.crop_depart_days, "departure", true)?;
    let second_name = if dated { "arrival" } else { "time-of-flight" };
    let (j0, ny) = crop(
        &grid.second,
        spec.slide.crop_second_days,
        second_name,
        dated,
    )?;
    let lattice = Lattice {
        nx,
        ny,
        x0: grid.depart.value(i0),
        dx: grid.depart.step_days,
        y0: grid.second.value(j0),
        dy: grid.second.step_days,
    };
    let n = nx * ny;
    let mut f = Fields {
        lattice,
        origin: (i0, j0),
        c3: vec![f64::NAN; n],
        vinf: vec![f64::NAN; n],
        ridge: vec![f64::NAN; n],
        angle_deg: vec![f64::NAN; n],
        unsolved: vec![false; n],
        before: vec![false; n],
    };
    for i in 0..nx {
        for j in 0..ny {
            let idx = grid.index(i0 + i, j0 + j, layer);
            let k = j * nx + i;
            if grid.status[idx] != CellStatus::Ok as u8 {
                let (d, a) = grid.dates_days(i0 + i, j0 + j);
                if a <= d {
                    f.before[k] = true;
                } else {
                    f.unsolved[k] = true;
                }
                continue;
            }
            let c3 = grid.c3_km2_s2(idx);
            let vinf = grid.vinf_arrive_km_s[idx];
            let angle = f64::from(grid.transfer_angle_deg[idx]);
            f.c3[k] = if c3.is_finite() { c3 } else { f64::NAN };
            f.vinf[k] = if vinf.is_finite() { vinf } else { f64::NAN };
            if angle.is_finite() {
                f.angle_deg[k] = angle;
                // Only the 180-degree crossing: the 0/360 wrap is NaN here.
                if (angle - 180.0).abs() < 90.0 {
                    f.ridge[k] = angle - 180.0;
                }
            }
        }
    }
    Ok(f)
}

impl Fields {
    /// The panel's field on the lattice: the quantity at every solved
    /// cell, NaN elsewhere.
    pub(crate) fn panel(
        &self,
        grid: &Grid,
        layer: usize,
        panel: Panel,
        ends: &Endpoints,
    ) -> Vec<f64> {
        let lat = &self.lattice;
        let (i0, j0) = self.origin;
        let mut out = vec![f64::NAN; lat.nx * lat.ny];
        for i in 0..lat.nx {
            for j in 0..lat.ny {
                let idx = grid.index(i0 + i, j0 + j, layer);
                if grid.status[idx] != CellStatus::Ok as u8 {
                    continue;
                }
                let v = panel.value(grid, idx, ends);
                if v.is_finite() {
                    out[j * lat.nx + i] = v;
                }
            }
        }
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::chart::samples::{analytic_grid, analytic_spec};

    #[test]
    fn crop_keeps_the_samples_inside_the_window() {
        let g = analytic_grid(SecondAxis::Arrival);
        // Departures every 2 days from 11322.5 (2031-01-01): a window
        // from day 11 to day 31 holds the samples at 12, 14, ..., 30.
        let start = g.depart.start_days;
        let (first, count) = crop(
            &g.depart,
            Some((start + 31.0, start + 11.0)),
            "departure",
            true,
        )
        .expect("inside");
        assert_eq!((first, count), (6, 10));
        // A window exactly on samples keeps both ends.
        let (first, count) = crop(
            &g.depart,
            Some((start + 12.0, start + 30.0)),
            "departure",
            true,
        )
        .expect("inside");
        assert_eq!((first, count), (6, 10));
        // One sample or none is an error naming both spans as dates.
        let e = crop(
            &g.depart,
            Some((start + 11.0, start + 12.5)),
            "departure",
            true,
        )
        .expect_err("one sample");
        let text = e.to_string();
        assert!(text.contains("2031-01-12..2031-01-13"), "{text}");
        assert!(text.contains("2031-01-01..2032-02-03"), "{text}");
        assert!(crop(&g.depart, Some((f64::NAN, 3.0)), "departure", true).is_err());
    }

    #[test]
    fn cells_without_figures_are_told_apart_by_the_axes() {
        // The analytic grid has no solution for flights under 80 days
        // and in a block; the arrival axis starts 100 days after the
        // first departure, so late departures arrive before they leave.
        let g = analytic_grid(SecondAxis::Arrival);
        let s = analytic_spec(&g);
        let f = fields(&s).expect("fields");
        let lat = f.lattice;
        let (mut before, mut unsolved) = (0, 0);
        for j in 0..lat.ny {
            for i in 0..lat.nx {
                let k = j * lat.nx + i;
                let tof = (lat.y0 + j as f64 * lat.dy) - (lat.x0 + i as f64 * lat.dx);
                assert_eq!(f.before[k], tof <= 0.0, "tof {tof}");
                assert!(!(f.before[k] && f.unsolved[k]));
                if f.unsolved[k] {
                    assert!(tof > 0.0);
                    unsolved += 1;
                }
                if f.before[k] {
                    before += 1;
                }
            }
        }
        assert!(before > 100 && unsolved > 100, "{before} {unsolved}");
    }
}
