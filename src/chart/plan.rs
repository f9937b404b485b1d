//! What a chart shows, worked out once before anything is drawn: the
//! layer's fields on the chart's lattice, the contour levels and their
//! isolines, the shaded and blank regions, the lines of constant time of
//! flight, the title, and (per image size) the ticks.
//!
//! Everything here is in data coordinates (days past J2000 TDB across;
//! days past J2000 TDB or days of flight up), so one [`Plan`] serves every
//! image size and format; only the ticks depend on the size of the plot.

use contour::ContourBuilder;

use super::calendar::{civil_from_days_j2000, days_j2000_from_civil};
use super::geometry::{Map, Rect};
use super::isolines::{extend_one_sample, isolines, Isoline, Lattice};
use super::levels::{c3_levels, explicit_levels, nice_ceil, vinf_levels};
use super::panel::Panel;
use super::{ChartError, ChartSpec};
use crate::sweep::{CellStatus, Grid, SecondAxis};
use crate::transfer::Endpoints;

// Tick spacing at the reference size, logical px (chosen by eye; no
// source): a date label is about 100 px wide, a line of text about 25 px
// high.
/// At most one departure-date tick per this much plot width.
const X_TICK_SPACING_PX: f64 = 150.0;
/// At most one arrival-date tick per this much plot height.
const Y_DATE_TICK_SPACING_PX: f64 = 80.0;
/// At most one time-of-flight tick per this much plot height.
const Y_NUMBER_TICK_SPACING_PX: f64 = 90.0;
/// About this many lines of constant time of flight span the chart.
const TOF_LINES_WANTED: f64 = 7.0;

/// What a chart contours.
#[derive(Debug, Clone, Copy)]
pub(crate) enum Contours<'e> {
    /// The transfer-window chart: C3, arrival v-infinity, the C3 limit.
    Window,
    /// One panel quantity; the endpoints turn excess speeds into delta-v.
    Panel(Panel, &'e Endpoints),
}

/// The layer's fields, row-major on the chart's lattice (x = departure).
struct Fields {
    lattice: Lattice,
    c3: Vec<f64>,
    vinf: Vec<f64>,
    /// Transfer angle - 180 deg within 90 deg of 180, NaN elsewhere.
    ridge: Vec<f64>,
    angle_deg: Vec<f64>,
    masked: Vec<bool>,
}

fn fields(grid: &Grid, layer: usize) -> Result<Fields, ChartError> {
    if layer >= grid.layers.len() {
        return Err(ChartError::NoSuchLayer {
            layer,
            layers: grid.layers.len(),
        });
    }
    let (nx, ny) = (grid.depart.count, grid.second.count);
    let lattice = Lattice {
        nx,
        ny,
        x0: grid.depart.start_days,
        dx: grid.depart.step_days,
        y0: grid.second.start_days,
        dy: grid.second.step_days,
    };
    let n = nx * ny;
    if nx < 2 || ny < 2 {
        return Err(ChartError::GridTooSmall { nx, ny });
    }
    let needed = grid.index(nx - 1, ny - 1, layer) + 1;
    let arrays = [
        grid.vinf_depart_km_s.len(),
        grid.vinf_arrive_km_s.len(),
        grid.transfer_angle_deg.len(),
        grid.status.len(),
    ];
    if let Some(&got) = arrays.iter().find(|&&len| len < needed) {
        return Err(ChartError::FieldSize {
            expected: nx * ny * grid.layers.len(),
            got,
        });
    }
    let mut f = Fields {
        lattice,
        c3: vec![f64::NAN; n],
        vinf: vec![f64::NAN; n],
        ridge: vec![f64::NAN; n],
        angle_deg: vec![f64::NAN; n],
        masked: vec![true; n],
    };
    for i in 0..nx {
        for j in 0..ny {
            let idx = grid.index(i, j, layer);
            if grid.status[idx] != CellStatus::Ok as u8 {
                continue;
            }
            let k = j * nx + i;
            let c3 = grid.c3_km2_s2(idx);
            let vinf = grid.vinf_arrive_km_s[idx];
            let angle = f64::from(grid.transfer_angle_deg[idx]);
            f.masked[k] = false;
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

/// The panel's field on the chart's lattice: the quantity at every solved
/// cell, NaN elsewhere.
fn panel_field(spec: &ChartSpec<'_>, lat: &Lattice, panel: Panel, ends: &Endpoints) -> Vec<f64> {
    let grid = spec.grid;
    let mut out = vec![f64::NAN; lat.nx * lat.ny];
    for i in 0..lat.nx {
        for j in 0..lat.ny {
            let idx = grid.index(i, j, spec.layer);
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

/// A filled region in data coordinates: exterior ring and holes.
pub(crate) type Region = (Vec<(f64, f64)>, Vec<Vec<(f64, f64)>>);

/// Filled regions (polygons with holes) where `values >= threshold`,
/// in data coordinates. NaN samples count as below.
///
/// # Method
/// Marching squares (via the `contour` crate's filled contours), with the
/// same half-step origin shift as [`isolines`] so that samples sit on
/// their coordinates.
fn regions(values: &[f64], lat: &Lattice, threshold: f64) -> Result<Vec<Region>, ChartError> {
    let v: Vec<f64> = values
        .iter()
        .map(|&x| if x.is_finite() { x } else { f64::MIN })
        .collect();
    let contours = ContourBuilder::new(lat.nx, lat.ny, true)
        .x_origin(lat.x0 - 0.5 * lat.dx)
        .y_origin(lat.y0 - 0.5 * lat.dy)
        .x_step(lat.dx)
        .y_step(lat.dy)
        .contours(&v, &[threshold])
        .map_err(|e| ChartError::Contour(format!("{:?}", e.kind())))?;
    let mut out = Vec::new();
    for c in &contours {
        for poly in c.geometry().0.iter() {
            let ext = poly.exterior().coords().map(|c| (c.x, c.y)).collect();
            let holes = poly
                .interiors()
                .iter()
                .map(|ls| ls.coords().map(|c| (c.x, c.y)).collect())
                .collect();
            out.push((ext, holes));
        }
    }
    Ok(out)
}

/// A field whose 0.5 isoline outlines the masked samples: every masked
/// sample is above 0.5 and every unmasked one below, while a 3 x 3 box
/// average sets how far above or below, so that staircase edges of the
/// mask come out as straight diagonals instead of steps.
fn mask_field(masked: &[bool], nx: usize, ny: usize) -> Vec<f64> {
    let mut out = vec![0.0; nx * ny];
    for iy in 0..ny {
        for ix in 0..nx {
            let mut sum = 0.0;
            let mut n = 0.0;
            for jy in iy.saturating_sub(1)..=(iy + 1).min(ny - 1) {
                for jx in ix.saturating_sub(1)..=(ix + 1).min(nx - 1) {
                    sum += if masked[jy * nx + jx] { 1.0 } else { 0.0 };
                    n += 1.0;
                }
            }
            let avg: f64 = sum / n;
            out[iy * nx + ix] = if masked[iy * nx + ix] {
                avg.max(0.55)
            } else {
                avg.min(0.45)
            };
        }
    }
    out
}

/// Tick positions (days past J2000 TDB) at calendar boundaries, at most
/// `max_ticks` of them.
fn date_ticks(lo: f64, hi: f64, max_ticks: usize) -> Vec<f64> {
    let (y0, m0, _) = civil_from_days_j2000(lo);
    let (y1, m1, _) = civil_from_days_j2000(hi);
    let first = y0 * 12 + i64::from(m0) - 1;
    let last = y1 * 12 + i64::from(m1) - 1;
    for step in [1i64, 2, 3, 4, 6, 12, 24, 60, 120] {
        let mut ticks = Vec::new();
        for mi in first..=last {
            if mi.rem_euclid(step) != 0 {
                continue;
            }
            let d = days_j2000_from_civil(mi.div_euclid(12), (mi.rem_euclid(12) + 1) as u32, 1);
            if d >= lo - 1e-9 && d <= hi + 1e-9 {
                ticks.push(d);
            }
        }
        if ticks.len() <= max_ticks && (ticks.len() >= 3 || step == 1) {
            if ticks.len() >= 3 {
                return ticks;
            }
            break;
        }
    }
    // Short spans: every n days at midnight TDB.
    let span = hi - lo;
    let step = [1.0, 2.0, 5.0, 7.0, 10.0, 15.0, 30.0]
        .into_iter()
        .find(|s| span / s <= max_ticks as f64)
        .unwrap_or(30.0);
    let mut t = ((lo + 0.5) / step).ceil() * step - 0.5;
    let mut ticks = Vec::new();
    while t <= hi + 1e-9 {
        ticks.push(t);
        t += step;
    }
    ticks
}

/// Round-number ticks between `lo` and `hi`, at most about `max_ticks`.
fn number_ticks(lo: f64, hi: f64, max_ticks: usize) -> Vec<f64> {
    let step = nice_ceil((hi - lo) / max_ticks.max(1) as f64);
    let mut t = (lo / step).ceil() * step;
    let mut out = Vec::new();
    while t <= hi + 1e-9 * step {
        out.push(t);
        t += step;
    }
    out
}

/// A line of constant time of flight, in data coordinates.
#[derive(Debug, Clone, Copy)]
pub(crate) struct TofLine {
    /// Time of flight, days.
    pub(crate) days: f64,
    /// Where it enters the chart: (departure, arrival), days past J2000 TDB.
    pub(crate) from: (f64, f64),
    /// Where it leaves.
    pub(crate) to: (f64, f64),
}

/// Diagonals of constant time of flight at round numbers of days across
/// an arrival-date chart's rectangle.
fn tof_lines(lat: &Lattice) -> Vec<TofLine> {
    let (xmin, xmax, ymin, ymax) = (lat.x0, lat.x_last(), lat.y0, lat.y_last());
    let mut out = Vec::new();
    let lo = (ymin - xmax).max(0.0);
    let hi = ymax - xmin;
    if hi > lo {
        let step = nice_ceil((hi - lo) / TOF_LINES_WANTED);
        let mut t = (lo / step).floor() * step + step;
        while t < hi {
            let a = xmin.max(ymin - t);
            let b = xmax.min(ymax - t);
            if b > a {
                out.push(TofLine {
                    days: t,
                    from: (a, a + t),
                    to: (b, b + t),
                });
            }
            t += step;
        }
    }
    out
}

/// Tick positions along both axes, data coordinates.
pub(crate) struct Ticks {
    /// Departure dates, days past J2000 TDB.
    pub(crate) x: Vec<f64>,
    /// Arrival dates (days past J2000 TDB) or times of flight (days).
    pub(crate) y: Vec<f64>,
}

/// Everything that decides what is drawn, shared by every format and size.
pub(crate) struct Plan<'s, 'g> {
    pub(crate) spec: &'s ChartSpec<'g>,
    /// The title as drawn.
    pub(crate) title: String,
    fields: Fields,
    pub(crate) c3: Vec<Isoline>,
    pub(crate) vinf: Vec<Isoline>,
    /// The panel drawn and its lines (`None` on the main chart).
    pub(crate) panel: Option<(Panel, Vec<Isoline>)>,
    pub(crate) ridge: Vec<Isoline>,
    pub(crate) limit: Vec<Isoline>,
    pub(crate) shade: Vec<Region>,
    pub(crate) mask: Vec<Region>,
    /// Lines of constant time of flight (arrival-date charts only).
    pub(crate) tof: Vec<TofLine>,
}

/// Title, C3 lines, v-infinity lines, panel lines, C3 limit.
type Families = (
    String,
    Vec<Isoline>,
    Vec<Isoline>,
    Option<(Panel, Vec<Isoline>)>,
    Option<f64>,
);

/// The contour families of the main chart: C3 and v-infinity at the
/// spec's levels or automatic ones, a C3 level equal to the limit left to
/// the limit line.
fn window_families(spec: &ChartSpec<'_>, fields: &Fields) -> Result<Families, ChartError> {
    let lat = fields.lattice;
    let c3_lv = match &spec.c3_levels {
        Some(v) => explicit_levels(v),
        None => c3_levels(fields.c3.iter().copied()),
    };
    let vinf_lv = match &spec.vinf_levels {
        Some(v) => explicit_levels(v),
        None => vinf_levels(fields.vinf.iter().copied()),
    };
    // A C3 level equal to the shaded limit is drawn once, as the limit.
    let c3_lv: Vec<f64> = match spec.max_c3 {
        Some(max) => c3_lv
            .into_iter()
            .filter(|l| (l - max).abs() > 1e-9 * (1.0 + max.abs()))
            .collect(),
        None => c3_lv,
    };
    let c3 = isolines(&fields.c3, &lat, &c3_lv)?;
    let vinf = isolines(&fields.vinf, &lat, &vinf_lv)?;
    Ok((spec.title.clone(), c3, vinf, None, spec.max_c3))
}

/// The contour family of a panel at its automatic levels; the title gets
/// the quantity appended.
fn panel_family(
    spec: &ChartSpec<'_>,
    lat: &Lattice,
    panel: Panel,
    ends: &Endpoints,
) -> Result<Families, ChartError> {
    let field = panel_field(spec, lat, panel, ends);
    let levels = panel.levels(field.iter().copied());
    let lines = isolines(&field, lat, &levels)?;
    let title = if spec.title.is_empty() {
        panel.title_suffix().to_string()
    } else {
        format!("{} — {}", spec.title, panel.title_suffix())
    };
    Ok((title, Vec::new(), Vec::new(), Some((panel, lines)), None))
}

impl<'s, 'g> Plan<'s, 'g> {
    /// Works out what `spec` draws with `contours`.
    ///
    /// # Errors
    /// [`ChartError::NoSuchLayer`], [`ChartError::GridTooSmall`],
    /// [`ChartError::FieldSize`] for an unusable grid;
    /// [`ChartError::BadLattice`] or [`ChartError::Contour`] if
    /// contouring fails.
    pub(crate) fn new(
        spec: &'s ChartSpec<'g>,
        contours: Contours<'_>,
    ) -> Result<Plan<'s, 'g>, ChartError> {
        let fields = fields(spec.grid, spec.layer)?;
        let lat = fields.lattice;
        let ridge = isolines(&fields.ridge, &lat, &[0.0])?;
        let (title, c3, vinf, panel, max_c3) = match contours {
            Contours::Window => window_families(spec, &fields)?,
            Contours::Panel(panel, ends) => panel_family(spec, &lat, panel, ends)?,
        };
        let (limit, shade) = match max_c3 {
            Some(max) if max.is_finite() => {
                let lim = isolines(&fields.c3, &lat, &[max])?;
                // C3 <= max as -C3 >= -max, extended one sample into the
                // mask (the mask is painted over it).
                let neg: Vec<f64> = extend_one_sample(&fields.c3, lat.nx, lat.ny)
                    .iter()
                    .map(|c| -c)
                    .collect();
                (lim, regions(&neg, &lat, -max)?)
            }
            _ => (Vec::new(), Vec::new()),
        };
        let mask_field = mask_field(&fields.masked, lat.nx, lat.ny);
        let mask = if fields.masked.iter().any(|&m| m) {
            regions(&mask_field, &lat, 0.5)?
        } else {
            Vec::new()
        };
        let tof = match spec.grid.second_kind {
            SecondAxis::Arrival => tof_lines(&lat),
            SecondAxis::TimeOfFlight => Vec::new(),
        };
        Ok(Plan {
            spec,
            title,
            fields,
            c3,
            vinf,
            panel,
            ridge,
            limit,
            shade,
            mask,
            tof,
        })
    }

    /// The sampled rectangle onto `plot` (logical px).
    pub(crate) fn map(&self, plot: Rect) -> Map {
        Map::of_lattice(&self.fields.lattice, plot)
    }

    /// Ticks for a plot drawn through `map` at layout scale `k`: calendar
    /// boundaries on date axes, round numbers of days on a time-of-flight
    /// axis, spaced for their labels.
    pub(crate) fn ticks(&self, map: &Map, k: f64) -> Ticks {
        let plot = map.plot;
        let x = date_ticks(
            map.xmin,
            map.xmax,
            ((plot.x1 - plot.x0) / (X_TICK_SPACING_PX * k)) as usize,
        );
        let y = match self.spec.grid.second_kind {
            SecondAxis::Arrival => date_ticks(
                map.ymin,
                map.ymax,
                ((plot.y1 - plot.y0) / (Y_DATE_TICK_SPACING_PX * k)) as usize,
            ),
            SecondAxis::TimeOfFlight => number_ticks(
                map.ymin,
                map.ymax,
                ((plot.y1 - plot.y0) / (Y_NUMBER_TICK_SPACING_PX * k)) as usize,
            ),
        };
        Ticks { x, y }
    }

    /// Transfer angle at the sample nearest to `(x, y)` (data
    /// coordinates), deg; `None` off the lattice or at a cell without one.
    pub(crate) fn angle_at(&self, x: f64, y: f64) -> Option<f64> {
        let lat = &self.fields.lattice;
        let ix = ((x - lat.x0) / lat.dx).round();
        let iy = ((y - lat.y0) / lat.dy).round();
        if ix < 0.0 || iy < 0.0 || ix >= lat.nx as f64 || iy >= lat.ny as f64 {
            return None;
        }
        let a = self.fields.angle_deg[iy as usize * lat.nx + ix as usize];
        a.is_finite().then_some(a)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::chart::calendar::date_label_tdb;

    #[test]
    fn date_ticks_fall_on_month_starts() {
        let lo = days_j2000_from_civil(2031, 1, 10);
        let hi = days_j2000_from_civil(2031, 12, 20);
        let t = date_ticks(lo, hi, 8);
        assert!(t.len() >= 3 && t.len() <= 8, "{t:?}");
        for d in &t {
            assert!(date_label_tdb(*d).ends_with("-01"));
            assert!(*d >= lo && *d <= hi);
        }
        // Short spans fall back to days.
        let t = date_ticks(lo, lo + 20.0, 8);
        assert!(t.len() >= 3 && t.len() <= 8, "{t:?}");
    }

    #[test]
    fn tof_lines_are_round_diagonals_across_the_rectangle() {
        // Departures 0..100 days, arrivals 50..350 days: flights from 0
        // (top left is 350, bottom right -50, clipped to 0) to 350 days.
        // About 7 lines over 350 days: a step of 50 days, lines at
        // 50, 100, ..., 300.
        let lat = Lattice {
            nx: 101,
            ny: 301,
            x0: 0.0,
            dx: 1.0,
            y0: 50.0,
            dy: 1.0,
        };
        let lines = tof_lines(&lat);
        let days: Vec<f64> = lines.iter().map(|l| l.days).collect();
        // Whole days are exact in f64: 1e-9 allows only rounding noise.
        let near = |a: f64, b: f64| (a - b).abs() < 1e-9;
        let want = [50.0, 100.0, 150.0, 200.0, 250.0, 300.0];
        assert!(
            days.len() == want.len() && days.iter().zip(want).all(|(&d, w)| near(d, w)),
            "{days:?}"
        );
        for l in &lines {
            // Arrival - departure is the time of flight at both ends.
            assert!(near(l.from.1 - l.from.0, l.days), "{l:?}");
            assert!(near(l.to.1 - l.to.0, l.days), "{l:?}");
            // Enters through the left or bottom edge, leaves through the
            // right or top edge.
            assert!(near(l.from.0, 0.0) || near(l.from.1, 50.0), "{l:?}");
            assert!(near(l.to.0, 100.0) || near(l.to.1, 350.0), "{l:?}");
            assert!(l.from.0 < l.to.0);
        }
    }
}
