//! What a chart shows, worked out once before anything is drawn: the
//! layer's fields on the chart's lattice, the band around the 180-degree
//! line, the contour levels and their isolines, the shaded and blank
//! regions, the lines of constant time of flight, the title and subtitle,
//! the warnings for the caller, and (per image size) the ticks.
//!
//! Everything here is in data coordinates (days past J2000 TDB across;
//! days past J2000 TDB or days of flight up), so one [`Plan`] serves every
//! image size and format; only the ticks depend on the size of the plot.

use contour::ContourBuilder;

use super::band::ridge_band;
use super::crowd::thin;
use super::fields::{fields, Fields};
use super::geometry::{layout, Map, Rect, REF_HEIGHT_PX, REF_WIDTH_PX};
use super::isolines::{extend_one_sample, isolines, Isoline, Lattice};
use super::levels::{c3_levels, explicit_levels, fit_levels, format_level, nice_ceil, vinf_levels};
use super::panel::Panel;
use super::ticks::{date_ticks, number_ticks, DateTicks};
use super::{ChartError, ChartSpec, ChartWarning};
use crate::sweep::SecondAxis;
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

/// A field whose 0.5 isoline outlines the marked samples: every marked
/// sample is above 0.5 and every other one below, while a 3 x 3 box
/// average sets how far above or below, so that staircase edges come out
/// as straight diagonals instead of steps.
fn mask_field(marked: &[bool], nx: usize, ny: usize) -> Vec<f64> {
    let mut out = vec![0.0; nx * ny];
    for iy in 0..ny {
        for ix in 0..nx {
            let mut sum = 0.0;
            let mut n = 0.0;
            for jy in iy.saturating_sub(1)..=(iy + 1).min(ny - 1) {
                for jx in ix.saturating_sub(1)..=(ix + 1).min(nx - 1) {
                    sum += if marked[jy * nx + jx] { 1.0 } else { 0.0 };
                    n += 1.0;
                }
            }
            let avg: f64 = sum / n;
            out[iy * nx + ix] = if marked[iy * nx + ix] {
                avg.max(0.55)
            } else {
                avg.min(0.45)
            };
        }
    }
    out
}

/// The outline of the marked samples, smoothed ([`mask_field`]); empty
/// when none is marked.
fn outline(marked: &[bool], lat: &Lattice) -> Result<Vec<Region>, ChartError> {
    if !marked.iter().any(|&m| m) {
        return Ok(Vec::new());
    }
    regions(&mask_field(marked, lat.nx, lat.ny), lat, 0.5)
}

/// The part of the lattice's rectangle where arrival is not after
/// departure, as one polygon in data coordinates (empty when none is):
/// below the diagonal arrival = departure on an arrival-date chart, below
/// a time of flight of zero on a time-of-flight chart.
///
/// # Method
/// The rectangle clipped against the half-plane tof <= 0 (one step of
/// Sutherland-Hodgman polygon clipping, tof being linear in both axes).
fn before_polygon(lat: &Lattice, kind: SecondAxis) -> Vec<(f64, f64)> {
    let tof = |p: (f64, f64)| match kind {
        SecondAxis::Arrival => p.1 - p.0,
        SecondAxis::TimeOfFlight => p.1,
    };
    let (x0, x1, y0, y1) = (lat.x0, lat.x_last(), lat.y0, lat.y_last());
    let rect = [(x0, y0), (x1, y0), (x1, y1), (x0, y1)];
    let mut out = Vec::new();
    for n in 0..4 {
        let (a, b) = (rect[(n + 3) % 4], rect[n]);
        let (ta, tb) = (tof(a), tof(b));
        if (ta <= 0.0) != (tb <= 0.0) {
            let t = ta / (ta - tb);
            out.push((a.0 + t * (b.0 - a.0), a.1 + t * (b.1 - a.1)));
        }
        if tb <= 0.0 {
            out.push(b);
        }
    }
    if out.len() < 3 {
        out.clear();
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
    pub(crate) x: DateTicks,
    /// Arrival dates (days past J2000 TDB) or times of flight (days).
    pub(crate) y: Vec<f64>,
    /// The arrival-date ticks' labels, when `y` holds dates.
    pub(crate) y_dates: Option<DateTicks>,
}

/// The contour families a plan draws.
#[derive(Default)]
struct Families {
    c3: Vec<Isoline>,
    vinf: Vec<Isoline>,
    panel: Option<(Panel, Vec<Isoline>)>,
    limit: Vec<Isoline>,
    shade: Vec<Region>,
    max_c3: Option<f64>,
    warnings: Vec<ChartWarning>,
}

/// `field` with the band's samples set to NaN.
fn outside_band(field: &[f64], band: &[bool]) -> Vec<f64> {
    field
        .iter()
        .zip(band)
        .map(|(&v, &b)| if b { f64::NAN } else { v })
        .collect()
}

/// Explicit `levels` (cleaned) fitted to `field`, with a warning for
/// those outside it.
fn user_levels(
    levels: &[f64],
    field: &[f64],
    quantity: &'static str,
    unit: &'static str,
    warnings: &mut Vec<ChartWarning>,
) -> Vec<f64> {
    let (inside, outside, range) = fit_levels(&explicit_levels(levels), field.iter().copied());
    if !outside.is_empty() {
        warnings.push(ChartWarning::LevelsOutsideData {
            quantity,
            unit,
            levels: outside,
            range,
        });
    }
    inside
}

/// The contour families of the main chart: C3 and v-infinity at the
/// spec's levels (fitted to the data) or automatic ones, a C3 level equal
/// to the limit left to the limit line; none in the band, none where
/// lines crowd (`crowd`).
fn window_families(
    spec: &ChartSpec<'_>,
    f: &Fields,
    band: &[bool],
    px_per_day: (f64, f64),
) -> Result<Families, ChartError> {
    let lat = f.lattice;
    let mut warnings = Vec::new();
    let c3_lv = match &spec.c3_levels {
        Some(v) => user_levels(v, &f.c3, "C3", "km²/s²", &mut warnings),
        None => c3_levels(f.c3.iter().copied()),
    };
    let vinf_lv = match &spec.vinf_levels {
        Some(v) => user_levels(v, &f.vinf, "arrival v∞", "km/s", &mut warnings),
        None => vinf_levels(f.vinf.iter().copied()),
    };
    let max_c3 = spec.max_c3.filter(|m| m.is_finite());
    // A C3 level equal to the shaded limit is drawn once, as the limit.
    let c3_lv: Vec<f64> = match max_c3 {
        Some(max) => c3_lv
            .into_iter()
            .filter(|l| (l - max).abs() > 1e-9 * (1.0 + max.abs()))
            .collect(),
        None => c3_lv,
    };
    let c3 = outside_band(&f.c3, band);
    let (limit, shade) = match max_c3 {
        Some(max) => {
            let lim = isolines(&c3, &lat, &[max])?;
            // C3 <= max as -C3 >= -max, extended one sample into the
            // mask (the mask is painted over it). The shade is a region,
            // not a line: it keeps its smooth edge through the band.
            let neg: Vec<f64> = extend_one_sample(&f.c3, lat.nx, lat.ny)
                .iter()
                .map(|c| -c)
                .collect();
            (lim, regions(&neg, &lat, -max)?)
        }
        None => (Vec::new(), Vec::new()),
    };
    let vinf = outside_band(&f.vinf, band);
    Ok(Families {
        c3: thin(isolines(&c3, &lat, &c3_lv)?, &c3, &lat, px_per_day),
        vinf: thin(isolines(&vinf, &lat, &vinf_lv)?, &vinf, &lat, px_per_day),
        panel: None,
        limit,
        shade,
        max_c3,
        warnings,
    })
}

/// The contour family of a panel at its automatic levels, none in the
/// band nor where lines crowd.
fn panel_family(
    spec: &ChartSpec<'_>,
    f: &Fields,
    (band, px_per_day): (&[bool], (f64, f64)),
    panel: Panel,
    ends: &Endpoints,
) -> Result<Families, ChartError> {
    let field = f.panel(spec.grid, spec.layer, panel, ends);
    let levels = panel.levels(field.iter().copied());
    let field = outside_band(&field, band);
    let lines = thin(
        isolines(&field, &f.lattice, &levels)?,
        &field,
        &f.lattice,
        px_per_day,
    );
    Ok(Families {
        panel: Some((panel, lines)),
        ..Families::default()
    })
}

/// "grid step 1 d" or "grid steps 2 d × 4 d" (departure, then second
/// axis).
fn step_text(lat: &Lattice) -> String {
    let close = (lat.dx - lat.dy).abs() <= 1e-9 * lat.dx.abs().max(lat.dy.abs());
    if close {
        format!("grid step {} d", format_level(lat.dx))
    } else {
        format!(
            "grid steps {} d × {} d",
            format_level(lat.dx),
            format_level(lat.dy)
        )
    }
}

/// Everything that decides what is drawn, shared by every format and size.
pub(crate) struct Plan<'s, 'g> {
    pub(crate) spec: &'s ChartSpec<'g>,
    /// The title as drawn.
    pub(crate) title: String,
    /// The subtitle as drawn.
    pub(crate) subtitle: String,
    fields: Fields,
    pub(crate) c3: Vec<Isoline>,
    pub(crate) vinf: Vec<Isoline>,
    /// The panel drawn and its lines (`None` on the main chart).
    pub(crate) panel: Option<(Panel, Vec<Isoline>)>,
    pub(crate) ridge: Vec<Isoline>,
    /// The band around the 180-degree line, left without contours.
    pub(crate) band: Vec<Region>,
    /// The C3 limit drawn and shaded (main chart only).
    pub(crate) max_c3: Option<f64>,
    pub(crate) limit: Vec<Isoline>,
    pub(crate) shade: Vec<Region>,
    /// Cells without a solution (arrival after departure).
    pub(crate) unsolved: Vec<Region>,
    /// Where arrival is not after departure (empty when nowhere).
    pub(crate) before: Vec<(f64, f64)>,
    /// Lines of constant time of flight (arrival-date charts only).
    pub(crate) tof: Vec<TofLine>,
    pub(crate) warnings: Vec<ChartWarning>,
}

impl<'s, 'g> Plan<'s, 'g> {
    /// Works out what `spec` draws with `contours`.
    ///
    /// # Errors
    /// [`ChartError::NoSuchLayer`], [`ChartError::GridTooSmall`],
    /// [`ChartError::FieldSize`] for an unusable grid;
    /// [`ChartError::Crop`] for a crop window without two samples;
    /// [`ChartError::BadLattice`] or [`ChartError::Contour`] if
    /// contouring fails.
    pub(crate) fn new(
        spec: &'s ChartSpec<'g>,
        contours: Contours<'_>,
    ) -> Result<Plan<'s, 'g>, ChartError> {
        let f = fields(spec)?;
        let lat = f.lattice;
        let plot = layout(REF_WIDTH_PX as u32, REF_HEIGHT_PX as u32).plot;
        let px_per_day = (
            (plot.x1 - plot.x0) / (lat.x_last() - lat.x0),
            (plot.y1 - plot.y0) / (lat.y_last() - lat.y0),
        );
        let band = ridge_band(&f.ridge, &lat, px_per_day);
        let ridge = isolines(&f.ridge, &lat, &[0.0])?;
        let families = match contours {
            Contours::Window => window_families(spec, &f, &band, px_per_day)?,
            Contours::Panel(panel, ends) => {
                panel_family(spec, &f, (&band, px_per_day), panel, ends)?
            }
        };
        let composed = match &families.panel {
            None => spec.title.clone(),
            Some((panel, _)) if spec.title.is_empty() => panel.title_suffix().to_string(),
            Some((panel, _)) => format!("{} — {}", spec.title, panel.title_suffix()),
        };
        let title = spec.slide.title.clone().unwrap_or(composed);
        let subtitle = spec.slide.subtitle.clone().unwrap_or_else(|| {
            if spec.subtitle.is_empty() {
                step_text(&lat)
            } else {
                format!("{} · {}", spec.subtitle, step_text(&lat))
            }
        });
        // Unsolved cells are outlined together with the cells before
        // departure (painted over them), so no sliver opens between the
        // two.
        let unsolved = if f.unsolved.iter().any(|&u| u) {
            let either: Vec<bool> = f
                .unsolved
                .iter()
                .zip(&f.before)
                .map(|(a, b)| *a || *b)
                .collect();
            outline(&either, &lat)?
        } else {
            Vec::new()
        };
        let before = if f.before.iter().any(|&b| b) {
            before_polygon(&lat, spec.grid.second_kind)
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
            subtitle,
            band: outline(&band, &lat)?,
            fields: f,
            c3: families.c3,
            vinf: families.vinf,
            panel: families.panel,
            ridge,
            max_c3: families.max_c3,
            limit: families.limit,
            shade: families.shade,
            unsolved,
            before,
            tof,
            warnings: families.warnings,
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
        match self.spec.grid.second_kind {
            SecondAxis::Arrival => {
                let y = date_ticks(
                    map.ymin,
                    map.ymax,
                    ((plot.y1 - plot.y0) / (Y_DATE_TICK_SPACING_PX * k)) as usize,
                );
                Ticks {
                    x,
                    y: y.at.clone(),
                    y_dates: Some(y),
                }
            }
            SecondAxis::TimeOfFlight => Ticks {
                x,
                y: number_ticks(
                    map.ymin,
                    map.ymax,
                    ((plot.y1 - plot.y0) / (Y_NUMBER_TICK_SPACING_PX * k)) as usize,
                ),
                y_dates: None,
            },
        }
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

    /// The arrival date of a point, days past J2000 TDB.
    pub(crate) fn arrival_days(&self, depart_days: f64, second: f64) -> f64 {
        match self.spec.grid.second_kind {
            SecondAxis::Arrival => second,
            SecondAxis::TimeOfFlight => depart_days + second,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

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
        // The region before departure: the triangle below the diagonal
        // from (50, 50) to (100, 100), with the corner (100, 50).
        let p = before_polygon(&lat, SecondAxis::Arrival);
        assert_eq!(p.len(), 3, "{p:?}");
        for v in [(50.0, 50.0), (100.0, 50.0), (100.0, 100.0)] {
            assert!(p.iter().any(|q| near(q.0, v.0) && near(q.1, v.1)), "{p:?}");
        }
        // Area 50 * 50 / 2 by the shoelace formula.
        let area: f64 = (0..p.len())
            .map(|i| {
                let (a, b) = (p[i], p[(i + 1) % p.len()]);
                a.0 * b.1 - b.0 * a.1
            })
            .sum::<f64>()
            / 2.0;
        assert!(near(area.abs(), 1250.0), "{area}");
        assert!(before_polygon(&lat, SecondAxis::TimeOfFlight).is_empty());
    }

    #[test]
    fn grid_steps_in_the_subtitle() {
        let mut lat = Lattice {
            nx: 3,
            ny: 3,
            x0: 0.0,
            dx: 1.0,
            y0: 0.0,
            dy: 1.0,
        };
        assert_eq!(step_text(&lat), "grid step 1 d");
        lat.dx = 2.0;
        lat.dy = 4.0;
        assert_eq!(step_text(&lat), "grid steps 2 d × 4 d");
        lat.dx = 0.025;
        lat.dy = 0.02;
        assert_eq!(step_text(&lat), "grid steps 0.025 d × 0.02 d");
    }
}
