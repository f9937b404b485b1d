//! The span overview: the best C3 and arrival v-infinity of every
//! opportunity against its departure date, one series per Type.

use plotters::coord::types::RangedCoordf64;
use plotters::coord::Shift;
use plotters::prelude::*;

use super::calendar::date_label_tdb;
use super::encode::{self, check_size, ensure_font};
use super::style::{C3_RGB, CAPTION, FONT_FAMILY, GRIDLINE_RGB, INK, LIMIT_RGB, MUTED, VINF_RGB};
use super::{draw_err, ChartError};
use crate::transfer::TransferType;

/// The overview's size as SVG, px (3:2, the width of the main chart);
/// its PNG may have any size and scales from this one.
const OVERVIEW_WIDTH_PX: u32 = 1800;
/// The overview's SVG height, px.
const OVERVIEW_HEIGHT_PX: u32 = 1200;

// Layout at 1800 px wide, logical px (chosen by eye; no source).
/// Left edge of the headings; the caption's baseline is as far above the
/// bottom.
const HEADING_LEFT_PX: f64 = 40.0;
/// Top of the title.
const TITLE_TOP_PX: f64 = 22.0;
/// Top of the subtitle.
const SUBTITLE_TOP_PX: f64 = 66.0;
/// Margins of the two plots' area: top (below the headings), bottom
/// (above the caption), left, right.
const BODY_MARGINS_PX: (f64, f64, f64, f64) = (110.0, 70.0, 20.0, 40.0);
/// Margin around each plot.
const PLOT_MARGIN_PX: f64 = 12.0;
/// Height of the date labels' band under each plot.
const X_LABEL_AREA_PX: f64 = 48.0;
/// Width of the value labels' band left of each plot.
const Y_LABEL_AREA_PX: f64 = 90.0;
/// Title text.
const TITLE_TEXT_PX: f64 = 34.0;
/// Subtitle text.
const SUBTITLE_TEXT_PX: f64 = 22.0;
/// Axis titles.
const AXIS_TITLE_TEXT_PX: f64 = 19.0;
/// Tick labels, the series legend and the caption.
const LABEL_TEXT_PX: f64 = 17.0;
/// Stroke of the series lines.
const SERIES_STROKE_PX: f64 = 1.5;
/// Stroke of the limit line, the legend samples and hollow markers.
const HEAVY_STROKE_PX: f64 = 2.0;
/// Length of a legend sample line.
const LEGEND_SAMPLE_PX: f64 = 30.0;
/// Radius of a Type I circle (a Type II triangle is 2 backend px larger).
const MARKER_RADIUS_PX: f64 = 6.0;
/// The departure axis spans at least this many days, so that a single
/// optimum has room.
const MIN_SPAN_DAYS: f64 = 180.0;

/// One optimum on the overview.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct OverviewPoint {
    /// Departure, days past J2000 TDB.
    pub depart_days: f64,
    /// Type I or II.
    pub kind: TransferType,
    /// Departure C3, km^2/s^2.
    pub c3_km2_s2: f64,
    /// Arrival v-infinity, km/s.
    pub vinf_arrive_km_s: f64,
    /// Flagged (ridge, edge or over a limit): drawn hollow.
    pub flagged: bool,
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
}

/// The range of the finite values, padded by 8 % of its width (at least
/// 5 % of the upper end's magnitude, and at least 0.05) so that markers
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

/// One of the overview's two plots: axis label, colour, the value plotted,
/// an optional limit line.
struct Quantity {
    label: &'static str,
    colour: RGBColor,
    value: fn(&OverviewPoint) -> f64,
    limit: Option<f64>,
}

/// The overview's plotting surface.
type Plot<'a, DB> = ChartContext<'a, DB, Cartesian2d<RangedCoordf64, RangedCoordf64>>;

/// `v` logical px (at 1800 px wide) in backend px.
fn px(v: f64, s: f64) -> i32 {
    (v * s).round() as i32
}

/// The chart font at `size` logical px.
fn font(size: f64, s: f64) -> FontDesc<'static> {
    (FONT_FAMILY, size * s).into_font()
}

/// Draws the overview on `area`, `s` backend px per logical px: headings,
/// then C3 above arrival v-infinity against the departure date.
fn draw<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    spec: &OverviewSpec,
    s: f64,
) -> Result<(), ChartError> {
    area.fill(&WHITE).map_err(draw_err)?;
    headings(area, spec, s)?;
    let (top, bottom, left, right) = BODY_MARGINS_PX;
    let body = area.margin(px(top, s), px(bottom, s), px(left, s), px(right, s));
    let panels = body.split_evenly((2, 1));
    let Some((x0, x1)) = bounds(spec.points.iter().map(|p| p.depart_days)) else {
        return Err(ChartError::GridTooSmall { nx: 0, ny: 0 });
    };
    let x_span = (x0.min(x1 - MIN_SPAN_DAYS), x1.max(x0 + MIN_SPAN_DAYS));
    let quantities = [
        Quantity {
            label: "Departure C3, km²/s²",
            colour: C3_RGB,
            value: |p| p.c3_km2_s2,
            limit: spec.max_c3,
        },
        Quantity {
            label: "Arrival v∞, km/s",
            colour: VINF_RGB,
            value: |p| p.vinf_arrive_km_s,
            limit: None,
        },
    ];
    for (panel, q) in panels.iter().zip(quantities.iter()) {
        plot_quantity(panel, spec, q, x_span, s)?;
    }
    Ok(())
}

/// Title, subtitle and caption.
fn headings<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    spec: &OverviewSpec,
    s: f64,
) -> Result<(), ChartError> {
    let (_, h) = area.dim_in_pixel();
    area.draw(&Text::new(
        spec.title.clone(),
        (px(HEADING_LEFT_PX, s), px(TITLE_TOP_PX, s)),
        font(TITLE_TEXT_PX, s).color(&INK),
    ))
    .map_err(draw_err)?;
    area.draw(&Text::new(
        spec.subtitle.clone(),
        (px(HEADING_LEFT_PX, s), px(SUBTITLE_TOP_PX, s)),
        font(SUBTITLE_TEXT_PX, s).color(&MUTED),
    ))
    .map_err(draw_err)?;
    area.draw(&Text::new(
        CAPTION,
        (px(HEADING_LEFT_PX, s), h as i32 - px(HEADING_LEFT_PX, s)),
        font(LABEL_TEXT_PX, s).color(&MUTED),
    ))
    .map_err(draw_err)
}

/// One quantity against the departure date: axes, the limit line, a
/// series per Type, the series legend.
fn plot_quantity<DB: DrawingBackend>(
    panel: &DrawingArea<DB, Shift>,
    spec: &OverviewSpec,
    q: &Quantity,
    x_span: (f64, f64),
    s: f64,
) -> Result<(), ChartError> {
    let Some((y0, mut y1)) = bounds(spec.points.iter().map(q.value)) else {
        return Ok(());
    };
    if q.limit.is_some() {
        // Room above the limit line.
        y1 = y1.max(spec.max_c3.unwrap_or(f64::NEG_INFINITY) * 1.05);
    }
    let mut chart = ChartBuilder::on(panel)
        .margin(px(PLOT_MARGIN_PX, s))
        .x_label_area_size(px(X_LABEL_AREA_PX, s))
        .y_label_area_size(px(Y_LABEL_AREA_PX, s))
        .build_cartesian_2d(x_span.0..x_span.1, y0..y1)
        .map_err(draw_err)?;
    chart
        .configure_mesh()
        .light_line_style(GRIDLINE_RGB)
        .bold_line_style(GRIDLINE_RGB)
        .axis_style(INK)
        .x_labels(8)
        .y_labels(6)
        .x_label_formatter(&|d| date_label_tdb(*d))
        .y_desc(q.label)
        .x_desc("Departure date (TDB)")
        .label_style(font(LABEL_TEXT_PX, s).color(&INK))
        .axis_desc_style(font(AXIS_TITLE_TEXT_PX, s).color(&INK))
        .draw()
        .map_err(draw_err)?;
    if let Some(m) = q.limit {
        let style = LIMIT_RGB.stroke_width(px(HEAVY_STROKE_PX, s) as u32);
        chart
            .draw_series(LineSeries::new([(x_span.0, m), (x_span.1, m)], style))
            .map_err(draw_err)?
            .label(format!("C3 ceiling {m}"))
            .legend(move |(x, y)| {
                PathElement::new([(x, y), (x + px(LEGEND_SAMPLE_PX, s), y)], style)
            });
    }
    for kind in [TransferType::I, TransferType::II] {
        type_series(&mut chart, spec, q, kind, s)?;
    }
    chart
        .configure_series_labels()
        .background_style(WHITE.mix(0.9))
        .border_style(MUTED)
        .label_font(font(LABEL_TEXT_PX, s).color(&INK))
        .position(SeriesLabelPosition::UpperRight)
        .draw()
        .map_err(draw_err)
}

/// The optima of one Type joined in departure order, Type I as circles
/// and Type II as triangles, flagged ones hollow.
fn type_series<DB: DrawingBackend>(
    chart: &mut Plot<'_, DB>,
    spec: &OverviewSpec,
    q: &Quantity,
    kind: TransferType,
    s: f64,
) -> Result<(), ChartError> {
    let value = q.value;
    let mut pts: Vec<&OverviewPoint> = spec.points.iter().filter(|p| p.kind == kind).collect();
    pts.sort_by(|a, b| a.depart_days.total_cmp(&b.depart_days));
    // Type II in the same hue, lighter.
    let style = q
        .colour
        .mix(if kind == TransferType::I { 1.0 } else { 0.55 });
    chart
        .draw_series(LineSeries::new(
            pts.iter().map(|p| (p.depart_days, value(p))),
            style.stroke_width(px(SERIES_STROKE_PX, s).max(1) as u32),
        ))
        .map_err(draw_err)?
        .label(format!("Type {kind}"))
        .legend(move |(x, y)| {
            PathElement::new(
                [(x, y), (x + px(LEGEND_SAMPLE_PX, s), y)],
                style.stroke_width(px(HEAVY_STROKE_PX, s) as u32),
            )
        });
    for p in pts {
        let at = (p.depart_days, value(p));
        let r = px(MARKER_RADIUS_PX, s).max(2) as u32;
        let look = if p.flagged {
            style.stroke_width(px(HEAVY_STROKE_PX, s) as u32)
        } else {
            style.filled()
        };
        let mk = if kind == TransferType::I {
            Circle::new(at, r, look).into_dyn()
        } else {
            TriangleMarker::new(at, r + 2, look).into_dyn()
        };
        chart.draw_series(std::iter::once(mk)).map_err(draw_err)?;
    }
    Ok(())
}

/// The overview as SVG (1800 x 1200; text stays text).
///
/// # Errors
/// [`ChartError`] when there is nothing to plot or drawing fails.
pub fn overview_svg(spec: &OverviewSpec) -> Result<String, ChartError> {
    ensure_font()?;
    encode::svg(OVERVIEW_WIDTH_PX, OVERVIEW_HEIGHT_PX, |area| {
        draw(area, spec, 1.0)
    })
}

/// The overview as PNG bytes, drawn at twice the size and box-filtered.
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
    let s = f64::from(encode::SUPERSAMPLE) * f64::from(width_px) / f64::from(OVERVIEW_WIDTH_PX);
    encode::png(width_px, height_px, |area| draw(area, spec, s))
}

#[cfg(test)]
mod tests {
    use super::*;

    use crate::chart::samples::overview_spec as spec;

    #[test]
    fn overview_svg_has_both_panels_and_labels() {
        let svg = overview_svg(&spec()).expect("renders");
        assert!(svg.starts_with("<svg"));
        for t in [
            "Departure C3",
            "Arrival v∞",
            "Type I",
            "Type II",
            "C3 ceiling 11",
            "Teodra → Kesh, 2030-2040",
        ] {
            assert!(svg.contains(t), "missing {t}");
        }
        // Ten optima in two panels: at least twenty markers.
        assert!(svg.matches("<circle").count() >= 10, "circles");
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
        assert!(overview_svg(&s).is_err());
    }
}
