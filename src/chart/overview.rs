//! The span overview: the best transfer of every opportunity and Type
//! against its departure date, C3 above arrival v-infinity.
//!
//! Each opportunity is a point of its own (Type I a circle, Type II a
//! triangle; hollow when flagged), never joined to the next one by a line:
//! opportunities are separate windows, not samples of one curve. The
//! departure axis spans the scanned span exactly, with year ticks over
//! spans of years. The legend, beside each plot, lists every shape and
//! line drawn and which flags the hollow points carry.

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

use super::encode::{self, check_size, ensure_font, SUPERSAMPLE};
use super::geometry::{Map, Rect};
use super::legend::{legend_box, Row, Sample};
use super::levels::format_level;
use super::pdf::svg_to_pdf;
use super::pen::{MarkerLook, Pen};
use super::style::{AXIS_TITLE_TEXT_PX, C3_RGB, INK, LIMIT_RGB, PAPER, VINF_RGB};
use super::ticks::{date_ticks, number_ticks};
use super::{draw_err, ChartError};
use crate::sweep::Objective;
use crate::transfer::TransferType;

/// The overview's size as SVG, px (3:2, the width of the main chart);
/// its PNG may have any size and scales from this one.
const OVERVIEW_WIDTH_PX: f64 = 1800.0;
/// The overview's SVG height, px.
const OVERVIEW_HEIGHT_PX: f64 = 1200.0;

// Layout at 1800 x 1200, logical px (chosen by eye; no source).
/// Left edge of the headings and of the caption.
const HEADING_LEFT_PX: f64 = 40.0;
/// Top of the title.
const TITLE_TOP_PX: f64 = 24.0;
/// Top of the subtitle.
const SUBTITLE_TOP_PX: f64 = 72.0;
/// Bottom of the caption from the image's bottom edge.
const CAPTION_BOTTOM_PX: f64 = 22.0;
/// The plots' left and right edges.
const PLOT_X_PX: (f64, f64) = (150.0, 1370.0);
/// The top plot's top and bottom edges.
const TOP_PLOT_Y_PX: (f64, f64) = (130.0, 560.0);
/// The bottom plot's top and bottom edges.
const BOTTOM_PLOT_Y_PX: (f64, f64) = (650.0, 1080.0);
/// The legends' left edge right of the plots, and right edge from the
/// image's right edge.
const LEGEND_GAPS_PX: (f64, f64) = (30.0, 26.0);
/// Centre of the (rotated) value-axis titles from the left edge.
const Y_TITLE_X_PX: f64 = 36.0;
/// Top of the departure-axis title below the bottom plot.
const X_TITLE_BELOW_PLOT_PX: f64 = 46.0;
/// At most one date tick per this much plot width.
const X_TICK_SPACING_PX: f64 = 140.0;
/// At most one value tick per this much plot height.
const Y_TICK_SPACING_PX: f64 = 70.0;
/// Radius of a point (a triangle has the same area).
const POINT_RADIUS_PX: f64 = 8.0;
/// Outline of a point.
const POINT_STROKE_PX: f64 = 2.0;
/// Stroke of the C3 ceiling line.
const LIMIT_STROKE_PX: f64 = 2.2;
/// Type II points are drawn this much lighter (mixed with white).
const TYPE_II_LIGHTEN: f64 = 0.4;
/// Without a span, the departure axis spans at least this many days, so
/// that a single optimum has room.
const MIN_SPAN_DAYS: f64 = 180.0;

/// One optimum on the overview.
#[derive(Debug, Clone, PartialEq)]
pub struct OverviewPoint {
    /// Departure, days past J2000 TDB.
    pub depart_days: f64,
    /// Type I or II.
    pub kind: TransferType,
    /// Departure C3, km^2/s^2.
    pub c3_km2_s2: f64,
    /// Arrival v-infinity, km/s.
    pub vinf_arrive_km_s: f64,
    /// The row's flags as the tables name them (`ridge`, `edge`,
    /// `over-limit`, ...); a flagged point is drawn hollow.
    pub flags: Vec<String>,
}

/// What the overview shows.
#[derive(Debug, Clone, PartialEq)]
pub struct OverviewSpec {
    /// Title, e.g. "Teodra → Kesh, 2030-2040".
    pub title: String,
    /// Second line.
    pub subtitle: String,
    /// The optima (zero revolutions) to plot.
    pub points: Vec<OverviewPoint>,
    /// Launch-vehicle C3 ceiling drawn as a line, km^2/s^2.
    pub max_c3: Option<f64>,
    /// The span scanned, days past J2000 TDB: the departure axis spans it
    /// exactly. `None`: the points' range, padded.
    pub span_days: Option<(f64, f64)>,
    /// What "best" means for the points, named in the legend.
    pub objective: Option<Objective>,
}

/// The range of the finite values, padded by 8 % of its width (at least
/// 5 % of the upper end's magnitude, and at least 0.05) so that points
/// clear the frame.
fn bounds(v: impl Iterator<Item = f64>) -> Option<(f64, f64)> {
    let (lo, hi) = v
        .filter(|x| x.is_finite())
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), x| {
            (a.min(x), b.max(x))
        });
    (lo <= hi).then(|| {
        let pad = ((hi - lo) * 0.08).max(0.05 * hi.abs().max(1.0));
        (lo - pad, hi + pad)
    })
}

/// The departure axis: the span when given (and not empty), else the
/// points' padded range, at least [`MIN_SPAN_DAYS`] wide.
fn x_span(spec: &OverviewSpec) -> Option<(f64, f64)> {
    if let Some((a, b)) = spec.span_days {
        if a.is_finite() && b.is_finite() && b > a {
            return Some((a, b));
        }
    }
    let (x0, x1) = bounds(spec.points.iter().map(|p| p.depart_days))?;
    let mid = (x0 + x1) / 2.0;
    let half = ((x1 - x0) / 2.0).max(MIN_SPAN_DAYS / 2.0);
    Some((mid - half, mid + half))
}

/// One of the overview's two plots.
struct Quantity {
    label: &'static str,
    colour: RGBColor,
    value: fn(&OverviewPoint) -> f64,
    limit: Option<f64>,
    plot: Rect,
}

/// `c` mixed with white by `t` (0 = `c`).
fn lighter(c: RGBColor, t: f64) -> RGBColor {
    let mix = |v: u8| (f64::from(v) + (255.0 - f64::from(v)) * t).round() as u8;
    RGBColor(mix(c.0), mix(c.1), mix(c.2))
}

/// A point's look: shape by Type, colour by quantity (Type II lighter),
/// hollow when flagged.
fn look(kind: TransferType, colour: RGBColor, flagged: bool) -> MarkerLook {
    let c = match kind {
        TransferType::I => colour,
        TransferType::II => lighter(colour, TYPE_II_LIGHTEN),
    };
    MarkerLook {
        kind,
        fill: Some(if flagged { PAPER } else { c }),
        edge: c,
        edge_px: POINT_STROKE_PX,
    }
}

/// The distinct flags of the points, in order of first appearance.
fn flag_names(points: &[OverviewPoint]) -> Vec<&str> {
    let mut out: Vec<&str> = Vec::new();
    for f in points.iter().flat_map(|p| &p.flags) {
        if !out.contains(&f.as_str()) {
            out.push(f);
        }
    }
    out
}

/// The objective as the legend names it, capitalised.
fn objective_text(o: Objective) -> &'static str {
    match o {
        Objective::C3 => "Best C3",
        Objective::VinfArrive => "Best arrival v∞",
        Objective::DvTotal => "Best total Δv",
        Objective::C3PlusVinf => "Best C3 + v∞²",
    }
}

/// Draws the overview on `area`, `k` logical px per reference px and `s`
/// backend px per logical px.
fn draw<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    spec: &OverviewSpec,
    k: f64,
    s: f64,
) -> Result<(), ChartError> {
    let span = match x_span(spec) {
        Some(span) if !spec.points.is_empty() => span,
        _ => return Err(ChartError::NothingToPlot),
    };
    area.fill(&PAPER).map_err(draw_err)?;
    let pen = Pen {
        area,
        s,
        k,
        native_dash: false,
    };
    headings(&pen, spec)?;
    let rect = |(x0, x1): (f64, f64), (y0, y1): (f64, f64)| Rect {
        x0: x0 * k,
        y0: y0 * k,
        x1: x1 * k,
        y1: y1 * k,
    };
    let quantities = [
        Quantity {
            label: "Departure C3, km²/s²",
            colour: C3_RGB,
            value: |p| p.c3_km2_s2,
            limit: spec.max_c3.filter(|m| m.is_finite()),
            plot: rect(PLOT_X_PX, TOP_PLOT_Y_PX),
        },
        Quantity {
            label: "Arrival v∞, km/s",
            colour: VINF_RGB,
            value: |p| p.vinf_arrive_km_s,
            limit: None,
            plot: rect(PLOT_X_PX, BOTTOM_PLOT_Y_PX),
        },
    ];
    for (n, q) in quantities.iter().enumerate() {
        plot_quantity(&pen, spec, q, span, n == 1)?;
    }
    Ok(())
}

/// Title, subtitle and caption.
fn headings<DB: DrawingBackend>(pen: &Pen<'_, DB>, spec: &OverviewSpec) -> Result<(), ChartError> {
    let k = pen.k;
    pen.headings(
        (&spec.title, &spec.subtitle),
        HEADING_LEFT_PX * k,
        (TITLE_TOP_PX * k, SUBTITLE_TOP_PX * k),
        (OVERVIEW_HEIGHT_PX - CAPTION_BOTTOM_PX) * k,
    )
}

/// One quantity against the departure date: grid, frame, ticks, the
/// limit line, the points, the legend.
fn plot_quantity<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    spec: &OverviewSpec,
    q: &Quantity,
    span: (f64, f64),
    bottom: bool,
) -> Result<(), ChartError> {
    let k = pen.k;
    let plot = q.plot;
    let Some((y0, mut y1)) = bounds(spec.points.iter().map(q.value)) else {
        return Ok(());
    };
    if let Some(m) = q.limit {
        // Room above the limit line.
        y1 = y1.max(m * 1.05);
    }
    let map = Map {
        xmin: span.0,
        xmax: span.1,
        ymin: y0,
        ymax: y1,
        plot,
    };
    let xt = date_ticks(
        span.0,
        span.1,
        ((plot.x1 - plot.x0) / (X_TICK_SPACING_PX * k)) as usize,
    );
    let yt = number_ticks(
        y0,
        y1,
        ((plot.y1 - plot.y0) / (Y_TICK_SPACING_PX * k)) as usize,
    );
    pen.gridlines(&map, &xt.at, &yt)?;
    let x: Vec<(f64, String)> = xt.at.iter().map(|&t| (t, xt.label(t))).collect();
    let y: Vec<(f64, String)> = yt.iter().map(|&t| (t, format_level(t))).collect();
    pen.frame_and_ticks(&map, &x, &y)?;
    pen.text_up(
        q.label,
        (Y_TITLE_X_PX * k, (plot.y0 + plot.y1) / 2.0),
        AXIS_TITLE_TEXT_PX,
        &INK,
    )?;
    if bottom {
        pen.text(
            "Departure date (TDB)",
            (
                (plot.x0 + plot.x1) / 2.0,
                plot.y1 + X_TITLE_BELOW_PLOT_PX * k,
            ),
            AXIS_TITLE_TEXT_PX,
            &INK,
            (HPos::Center, VPos::Top),
        )?;
    }
    if let Some(m) = q.limit {
        let y = map.py(m);
        pen.line(
            &[(plot.x0, y), (plot.x1, y)],
            LIMIT_RGB,
            LIMIT_STROKE_PX,
            None,
        )?;
    }
    let mut points: Vec<&OverviewPoint> = spec.points.iter().collect();
    // Type I over Type II, unflagged over flagged.
    points.sort_by_key(|p| (p.kind == TransferType::I, p.flags.is_empty()));
    for p in points {
        let (x, y) = (map.px(p.depart_days), map.py((q.value)(p)));
        if x.is_finite() && y.is_finite() && x >= plot.x0 && x <= plot.x1 {
            let l = look(p.kind, q.colour, !p.flags.is_empty());
            pen.marker((x, y), POINT_RADIUS_PX * k, l)?;
        }
    }
    let rows = legend_rows(spec, q);
    let note = (!bottom)
        .then(|| {
            spec.objective
                .map(|o| format!("{} per opportunity and Type", objective_text(o)))
        })
        .flatten();
    let x0 = plot.x1 + LEGEND_GAPS_PX.0 * k;
    let x1 = OVERVIEW_WIDTH_PX * k - LEGEND_GAPS_PX.1 * k;
    legend_box(pen, (x0, plot.y0, x1), &rows, note.as_deref())?;
    Ok(())
}

/// The legend of one plot: the shapes drawn, what hollow means, the
/// ceiling.
fn legend_rows(spec: &OverviewSpec, q: &Quantity) -> Vec<Row> {
    let mut rows = Vec::new();
    for kind in [TransferType::I, TransferType::II] {
        if spec.points.iter().any(|p| p.kind == kind) {
            rows.push(Row::new(
                Sample::Marker(look(kind, q.colour, false), POINT_RADIUS_PX),
                format!("Type {kind}"),
            ));
        }
    }
    let flags = flag_names(&spec.points);
    if !flags.is_empty() {
        rows.push(Row::new(
            Sample::Marker(look(TransferType::I, q.colour, true), POINT_RADIUS_PX),
            format!("Hollow: flagged {}", flags.join(", ")),
        ));
    }
    if let Some(m) = q.limit {
        rows.push(Row::new(
            Sample::Line(LIMIT_RGB, LIMIT_STROKE_PX, None),
            format!("C3 ceiling {} km²/s²", format_level(m)),
        ));
    }
    rows
}

/// The overview as SVG (1800 x 1200; text stays text).
///
/// # Errors
/// [`ChartError`] when there is nothing to plot or drawing fails.
pub fn overview_svg(spec: &OverviewSpec) -> Result<String, ChartError> {
    ensure_font()?;
    encode::svg(
        OVERVIEW_WIDTH_PX as u32,
        OVERVIEW_HEIGHT_PX as u32,
        |area| draw(area, spec, 1.0, 1.0),
    )
}

/// The overview as PNG bytes, drawn at twice the size and box-filtered.
/// The layout scales with the width; the height should keep the 3:2 shape.
///
/// # Errors
/// [`ChartError`] for a bad size, nothing to plot, or a drawing or
/// encoding failure.
pub fn overview_png(
    spec: &OverviewSpec,
    width_px: u32,
    height_px: u32,
) -> Result<Vec<u8>, ChartError> {
    check_size(width_px, height_px)?;
    ensure_font()?;
    let k =
        (f64::from(width_px) / OVERVIEW_WIDTH_PX).min(f64::from(height_px) / OVERVIEW_HEIGHT_PX);
    encode::png(width_px, height_px, |area| {
        draw(area, spec, k, f64::from(SUPERSAMPLE))
    })
}

/// The overview as a one-page PDF (12 x 8 in).
///
/// # Errors
/// As [`overview_svg`]; [`ChartError::Pdf`] if the conversion fails.
pub fn overview_pdf(spec: &OverviewSpec) -> Result<Vec<u8>, ChartError> {
    svg_to_pdf(&overview_svg(spec)?)
}

#[cfg(test)]
mod tests {
    use super::*;

    use crate::chart::samples::overview_spec as spec;

    #[test]
    fn overview_svg_has_both_plots_and_a_complete_legend() {
        let svg = overview_svg(&spec()).expect("renders");
        assert!(svg.starts_with("<svg"));
        for t in [
            "Departure C3, km²/s²",
            "Arrival v∞, km/s",
            "Type I",
            "Type II",
            "C3 ceiling 11 km²/s²",
            "Hollow: flagged edge",
            "Best C3 per opportunity and Type",
            "Teodra → Kesh, 2030-2040",
        ] {
            assert!(svg.contains(t), "missing {t}");
        }
        // Year ticks only (the span is 2030-2040), never a full date.
        assert!(
            svg.contains(">\n2032\n<") || svg.contains(">2032<"),
            "year tick"
        );
        assert!(!svg.contains("-01-01"), "dates on a span of years");
        // No line joins two opportunities: every polyline runs straight
        // across or up (grid lines, frame, ticks, the ceiling) or is a
        // marker's outline, no wider than a marker.
        for (_, pts) in crate::chart::tests::polylines(&svg) {
            let span = |f: fn(&(f64, f64)) -> f64| {
                let v: Vec<f64> = pts.iter().map(f).collect();
                v.iter().copied().fold(f64::MIN, f64::max)
                    - v.iter().copied().fold(f64::MAX, f64::min)
            };
            let (w, h) = (span(|p| p.0), span(|p| p.1));
            let marker = w <= 3.0 * POINT_RADIUS_PX && h <= 3.0 * POINT_RADIUS_PX;
            let square = pts
                .windows(2)
                .all(|s| (s[0].0 - s[1].0).abs() < 1e-9 || (s[0].1 - s[1].1).abs() < 1e-9);
            assert!(square || marker, "a joining line: {pts:?}");
        }
    }

    #[test]
    fn axis_ends_at_the_span() {
        let s = spec();
        assert_eq!(x_span(&s), s.span_days);
        let mut s = spec();
        s.span_days = None;
        let (a, b) = x_span(&s).expect("points");
        assert!(a < 11_000.0 && b > 11_000.0 + 4.0 * 780.0);
    }

    #[test]
    fn overview_png_decodes_at_size() {
        let bytes = overview_png(&spec(), 1800, 1200).expect("renders");
        let decoder = png::Decoder::new(std::io::Cursor::new(bytes));
        let reader = decoder.read_info().expect("png header");
        let info = reader.info();
        assert_eq!((info.width, info.height), (1800, 1200));
    }

    #[test]
    fn empty_overview_is_an_error() {
        let mut s = spec();
        s.points.clear();
        s.span_days = None;
        assert!(overview_svg(&s).is_err());
    }
}
