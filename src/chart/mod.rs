//! Contour charts of a sweep grid, as SVG and PNG.
//!
//! One chart shows one solution layer of a [`Grid`]: departure date across,
//! arrival date (or time of flight) up, with
//!
//! * departure C3 contours (solid, labelled in km^2/s^2),
//! * arrival v-infinity contours (dashed, another colour, labelled in km/s),
//! * lines of constant time of flight (dotted diagonals, labelled in days;
//!   left out when the second axis already is the time of flight),
//! * the 180-degree transfer-angle line that separates Type I from Type II
//!   transfers, with both regions named,
//! * cells without a solution left blank (light grey), never drawn as zero,
//! * an optional shaded region where C3 stays within a limit,
//! * markers with their annotations, a legend, title, subtitle and caption.
//!
//! A [`Panel`] ([`render_panel_svg`], [`render_panel_png`]) is the same
//! frame with another quantity contoured instead of C3 and v-infinity: the
//! departure asymptote's declination (DLA), the arrival asymptote's
//! declination, or the total delta-v.
//!
//! [`isolines`] turns a sampled field into polylines (marching squares, via
//! the `contour` crate), [`levels`] picks contour levels, and the renderer
//! draws with `plotters`, once for both formats: the PNG is drawn at twice
//! its size and box-filtered down (the bitmap backend does not anti-alias)
//! and written with the `png` crate; the SVG keeps its text as text.
//!
//! Chart text uses DejaVu Sans, embedded in the library (Bitstream Vera
//! licence, `src/chart/fonts/LICENSE-DejaVu.txt`).
//!
//! Every chart is a preliminary design figure; its caption says so.

pub mod isolines;
pub mod levels;
mod overview;
mod panel;
mod render;

pub use overview::{overview_png, overview_svg, OverviewPoint, OverviewSpec};
pub use panel::{render_panel_png, render_panel_svg, Panel, MAX_ANGLE_LINES};
pub use render::{render_png, render_svg, DEFAULT_HEIGHT_PX, DEFAULT_WIDTH_PX};

use crate::sweep::{layers_for, Axis, CellStatus, Grid, SecondAxis};

/// What to draw: the grid, which layer, titles, levels, markers.
#[derive(Debug, Clone)]
pub struct ChartSpec<'a> {
    /// The sweep result to draw.
    pub grid: &'a Grid,
    /// Index into [`Grid::layers`]; usually 0 (zero revolutions).
    pub layer: usize,
    /// Title, e.g. "Teodra → Kesh, 2031 opportunity".
    pub title: String,
    /// Subtitle: system name, span and so on.
    pub subtitle: String,
    /// C3 contour levels, km^2/s^2; `None` picks them automatically
    /// ([`levels::c3_levels`]).
    pub c3_levels: Option<Vec<f64>>,
    /// Arrival v-infinity contour levels, km/s; `None` picks them
    /// automatically ([`levels::vinf_levels`]).
    pub vinf_levels: Option<Vec<f64>>,
    /// Points to mark and annotate (optima, chosen transfers).
    pub markers: Vec<Marker>,
    /// Shade the region where C3 <= this value, km^2/s^2.
    pub max_c3: Option<f64>,
}

/// A marked point of the chart with its annotation.
#[derive(Debug, Clone, PartialEq)]
pub struct Marker {
    /// Departure date, days past J2000 TDB.
    pub depart_days: f64,
    /// Second-axis value: arrival date in days past J2000 TDB, or time of
    /// flight in days, as the grid's [`Grid::second_kind`] says.
    pub second: f64,
    /// Annotation, e.g. "C3 9.12 · 2031-04-02 → 2031-11-20".
    pub label: String,
}

/// Why a chart could not be drawn.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum ChartError {
    /// The requested layer does not exist in the grid.
    #[error("layer {layer} does not exist (the grid has {layers} layers)")]
    NoSuchLayer {
        /// Requested layer index.
        layer: usize,
        /// Number of layers in the grid.
        layers: usize,
    },
    /// A chart needs at least two samples along each axis.
    #[error("grid of {nx} x {ny} samples is too small to chart (need at least 2 x 2)")]
    GridTooSmall {
        /// Samples along x (departure).
        nx: usize,
        /// Samples along y (second axis).
        ny: usize,
    },
    /// Axis steps must be finite and > 0.
    #[error("axis steps must be finite and > 0, got dx = {dx}, dy = {dy}")]
    BadLattice {
        /// x step.
        dx: f64,
        /// y step.
        dy: f64,
    },
    /// A field does not have one value per sample.
    #[error("field has {got} values, expected {expected}")]
    FieldSize {
        /// nx * ny.
        expected: usize,
        /// Length given.
        got: usize,
    },
    /// The image size is unusable.
    #[error("image size {width_px} x {height_px} px is outside 200..=10000 on either side")]
    ImageSize {
        /// Requested width, px.
        width_px: u32,
        /// Requested height, px.
        height_px: u32,
    },
    /// The embedded font could not be loaded.
    #[error("embedded font could not be loaded")]
    Font,
    /// The contour crate failed.
    #[error("contouring failed: {0}")]
    Contour(String),
    /// The drawing backend failed.
    #[error("drawing failed: {0}")]
    Draw(String),
    /// PNG encoding failed.
    #[error("png encoding failed: {0}")]
    Png(String),
}

/// The calendar date (TDB) containing `days` past J2000 TDB, as
/// `YYYY-MM-DD`.
///
/// The chart module carries this small conversion itself so that axis
/// labels do not depend on the time module's formatting.
///
/// # Method
/// J2000 is 2000-01-01 12:00 TDB, so the civil day number counted from
/// 2000-01-01 is `floor(days + 0.5)`. Days to a proleptic Gregorian date
/// follow H. Hinnant, *chrono-Compatible Low-Level Date Algorithms*,
/// `civil_from_days` (<https://howardhinnant.github.io/date_algorithms.html>).
pub fn date_label_tdb(days: f64) -> String {
    let (y, m, d) = civil_from_days_j2000(days);
    format!("{y:04}-{m:02}-{d:02}")
}

/// `(year, month 1..=12, day 1..=31)` of the TDB calendar day containing
/// `days` past J2000 TDB.
pub(crate) fn civil_from_days_j2000(days: f64) -> (i64, u32, u32) {
    // 2000-01-01 is day 10957 after 1970-01-01.
    let z = (days + 0.5).floor() as i64 + 10957 + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36524 - doe / 146_096) / 365;
    let y = yoe + era * 400;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = (doy - (153 * mp + 2) / 5 + 1) as u32;
    let m = if mp < 10 { mp + 3 } else { mp - 9 } as u32;
    (if m <= 2 { y + 1 } else { y }, m, d)
}

/// Days past J2000 TDB of midnight TDB starting `year-month-day`.
pub(crate) fn days_j2000_from_civil(year: i64, month: u32, day: u32) -> f64 {
    let y = if month <= 2 { year - 1 } else { year };
    let era = y.div_euclid(400);
    let yoe = y.rem_euclid(400);
    let m = i64::from(month);
    let mp = if m > 2 { m - 3 } else { m + 9 };
    let doy = (153 * mp + 2) / 5 + i64::from(day) - 1;
    let doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
    let unix_days = era * 146_097 + doe - 719_468;
    (unix_days - 10957) as f64 - 0.5
}

/// A synthetic `n x n` zero-revolution grid with analytic fields, for
/// benchmarks and examples: departures over 400 days from 2031-01-01,
/// arrivals 90 to 700 days after the first departure; two C3 bowls either
/// side of a 180-degree ridge, arrival v-infinity in another bowl, and no
/// solution for flights shorter than 60 days.
#[doc(hidden)]
pub fn synthetic_grid(n: usize) -> Grid {
    let n = n.max(2);
    let start = days_j2000_from_civil(2031, 1, 1);
    let depart = Axis {
        start_days: start,
        step_days: 400.0 / (n as f64 - 1.0),
        count: n,
    };
    let second = Axis {
        start_days: start + 90.0,
        step_days: 610.0 / (n as f64 - 1.0),
        count: n,
    };
    let mut g = Grid::new(depart, second, SecondAxis::Arrival, layers_for(0));
    for i in 0..n {
        for j in 0..n {
            let (d, a) = g.dates_days(i, j);
            let idx = g.index(i, j, 0);
            let tof = a - d;
            if tof < 60.0 {
                continue;
            }
            let x = (d - start) / 400.0; // 0..1
                                         // The Type I/II ridge: tof = 300 - 60 x days.
            let ridge_tof = 300.0 - 60.0 * x;
            let angle = (180.0 + 0.55 * (tof - ridge_tof)).rem_euclid(360.0);
            let near = (angle - 180.0).abs().max(0.0);
            let u1 = (x - 0.35) / 0.18;
            let v1 = (tof - 210.0) / 70.0;
            let u2 = (x - 0.55) / 0.22;
            let v2 = (tof - 420.0) / 110.0;
            let bowl1 = 9.1 + 14.0 * (u1 * u1 + v1 * v1 + 0.6 * u1 * v1);
            let bowl2 = 12.4 + 11.0 * (u2 * u2 + v2 * v2 - 0.5 * u2 * v2);
            let c3 = bowl1.min(bowl2) + 90.0 / (near + 2.5);
            let w1 = (x - 0.45) / 0.3;
            let w2 = (tof - 330.0) / 160.0;
            let vinf = 2.6 + 2.2 * (w1 * w1 + w2 * w2) + 6.0 / (near + 4.0);
            g.vinf_depart_km_s[idx] = c3.sqrt();
            g.vinf_arrive_km_s[idx] = vinf;
            g.transfer_angle_deg[idx] = angle as f32;
            g.status[idx] = CellStatus::Ok as u8;
        }
    }
    g
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dates_round_trip_and_known_days() {
        // J2000 itself is 2000-01-01 12:00 TDB.
        assert_eq!(date_label_tdb(0.0), "2000-01-01");
        assert_eq!(date_label_tdb(-0.5), "2000-01-01");
        assert_eq!(date_label_tdb(-0.51), "1999-12-31");
        // 2000 is a leap year: day 59.5 after J2000 is 2000-03-01 midnight.
        assert_eq!(date_label_tdb(59.5), "2000-03-01");
        assert_eq!(date_label_tdb(59.4), "2000-02-29");
        // Every day from 1900 to 2200 round-trips.
        for year in 1900..2200 {
            for month in 1..=12 {
                for day in [1, 15, 28] {
                    let d = days_j2000_from_civil(year, month, day);
                    assert_eq!(civil_from_days_j2000(d), (year, month, day));
                    assert_eq!(civil_from_days_j2000(d + 0.999), (year, month, day));
                }
            }
        }
        // 2031-01-01 00:00 TDB is 11322.5 days past J2000.
        assert!((days_j2000_from_civil(2031, 1, 1) - 11322.5).abs() < 1e-9);
    }

    #[test]
    fn synthetic_grid_has_ok_and_masked_cells() {
        let g = synthetic_grid(50);
        let counts = g.status_counts();
        assert!(counts[0].1 > 1000 && counts[1].1 > 10, "{counts:?}");
        let ok = g.index(25, 40, 0);
        assert_eq!(g.status_at(ok), CellStatus::Ok);
        assert!(g.c3_km2_s2(ok).is_finite());
    }
}
