//! The span overview: the best C3 and arrival v-infinity of every
//! opportunity against its departure date, one series per Type.

use plotters::coord::Shift;
use plotters::prelude::*;

use super::render::{
    check_size, downsample_2x, draw_err, encode_png, ensure_font, C3_RGB, CAPTION, GRIDLINE_RGB,
    INK, LIMIT_RGB, MUTED, VINF_RGB,
};
use super::{date_label_tdb, ChartError};
use crate::transfer::TransferType;

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

/// A panel: axis label, colour, the value plotted, an optional limit line.
type Panel = (
    &'static str,
    RGBColor,
    Box<dyn Fn(&OverviewPoint) -> f64>,
    Option<f64>,
);

fn draw<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    spec: &OverviewSpec,
    s: f64,
) -> Result<(), ChartError> {
    area.fill(&WHITE).map_err(draw_err)?;
    let px = |v: f64| (v * s).round() as i32;
    let font = |size: f64| ("sans-serif", size * s).into_font();
    let (w, h) = area.dim_in_pixel();
    area.draw(&Text::new(
        spec.title.clone(),
        (px(40.0), px(22.0)),
        font(34.0).color(&INK),
    ))
    .map_err(draw_err)?;
    area.draw(&Text::new(
        spec.subtitle.clone(),
        (px(40.0), px(66.0)),
        font(22.0).color(&MUTED),
    ))
    .map_err(draw_err)?;
    area.draw(&Text::new(
        CAPTION,
        (px(40.0), h as i32 - px(40.0)),
        font(17.0).color(&MUTED),
    ))
    .map_err(draw_err)?;
    let body = area.margin(px(110.0), px(70.0), px(20.0), px(40.0));
    let panels = body.split_evenly((2, 1));
    let Some((x0, x1)) = bounds(spec.points.iter().map(|p| p.depart_days)) else {
        return Err(ChartError::GridTooSmall { nx: 0, ny: 0 });
    };
    let x_span = (x0.min(x1 - 180.0), x1.max(x0 + 180.0));
    let c3_max = spec.max_c3.unwrap_or(f64::NEG_INFINITY);
    let panels_spec: [Panel; 2] = [
        (
            "Departure C3, km²/s²",
            C3_RGB,
            Box::new(|p: &OverviewPoint| p.c3_km2_s2),
            spec.max_c3,
        ),
        (
            "Arrival v∞, km/s",
            VINF_RGB,
            Box::new(|p: &OverviewPoint| p.vinf_arrive_km_s),
            None,
        ),
    ];
    for (panel, (label, colour, value, limit)) in panels.iter().zip(panels_spec.iter()) {
        let Some((y0, mut y1)) = bounds(spec.points.iter().map(value)) else {
            continue;
        };
        if limit.is_some() {
            y1 = y1.max(c3_max * 1.05);
        }
        let mut chart = ChartBuilder::on(panel)
            .margin(px(12.0))
            .x_label_area_size(px(48.0))
            .y_label_area_size(px(90.0))
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
            .y_desc(*label)
            .x_desc("Departure date (TDB)")
            .label_style(font(17.0).color(&INK))
            .axis_desc_style(font(19.0).color(&INK))
            .draw()
            .map_err(draw_err)?;
        if let Some(m) = limit {
            chart
                .draw_series(LineSeries::new(
                    [(x_span.0, *m), (x_span.1, *m)],
                    LIMIT_RGB.stroke_width(px(2.0) as u32),
                ))
                .map_err(draw_err)?
                .label(format!("C3 ceiling {m}"))
                .legend(move |(x, y)| {
                    PathElement::new(
                        [(x, y), (x + px(30.0), y)],
                        LIMIT_RGB.stroke_width(px(2.0) as u32),
                    )
                });
        }
        for kind in [TransferType::I, TransferType::II] {
            let mut pts: Vec<&OverviewPoint> =
                spec.points.iter().filter(|p| p.kind == kind).collect();
            pts.sort_by(|a, b| a.depart_days.total_cmp(&b.depart_days));
            let style = colour.mix(if kind == TransferType::I { 1.0 } else { 0.55 });
            chart
                .draw_series(LineSeries::new(
                    pts.iter().map(|p| (p.depart_days, value(p))),
                    style.stroke_width(px(1.5).max(1) as u32),
                ))
                .map_err(draw_err)?
                .label(format!("Type {kind}"))
                .legend(move |(x, y)| {
                    PathElement::new(
                        [(x, y), (x + px(30.0), y)],
                        style.stroke_width(px(2.0) as u32),
                    )
                });
            for p in pts {
                let filled = !p.flagged;
                let at = (p.depart_days, value(p));
                let r = px(6.0).max(2) as u32;
                let mk = if kind == TransferType::I {
                    Circle::new(
                        at,
                        r,
                        if filled {
                            style.filled()
                        } else {
                            style.stroke_width(px(2.0) as u32)
                        },
                    )
                    .into_dyn()
                } else {
                    TriangleMarker::new(
                        at,
                        r + 2,
                        if filled {
                            style.filled()
                        } else {
                            style.stroke_width(px(2.0) as u32)
                        },
                    )
                    .into_dyn()
                };
                chart.draw_series(std::iter::once(mk)).map_err(draw_err)?;
            }
        }
        chart
            .configure_series_labels()
            .background_style(WHITE.mix(0.9))
            .border_style(MUTED)
            .label_font(font(17.0).color(&INK))
            .position(SeriesLabelPosition::UpperRight)
            .draw()
            .map_err(draw_err)?;
    }
    let _ = w;
    Ok(())
}

/// The overview as SVG (1800 x 1200; text stays text).
///
/// # Errors
/// [`ChartError`] when there is nothing to plot or drawing fails.
pub fn overview_svg(spec: &OverviewSpec) -> Result<String, ChartError> {
    ensure_font()?;
    let mut svg = String::new();
    {
        let area = SVGBackend::with_string(&mut svg, (1800, 1200)).into_drawing_area();
        draw(&area, spec, 1.0)?;
        area.present().map_err(draw_err)?;
    }
    Ok(svg)
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
    let (bw, bh) = (2 * width_px, 2 * height_px);
    let mut big = vec![255u8; bw as usize * bh as usize * 3];
    {
        let area = BitMapBackend::with_buffer(&mut big, (bw, bh)).into_drawing_area();
        draw(&area, spec, 2.0 * f64::from(width_px) / 1800.0)?;
        area.present().map_err(draw_err)?;
    }
    encode_png(
        &downsample_2x(&big, width_px as usize, height_px as usize),
        width_px,
        height_px,
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    fn spec() -> OverviewSpec {
        let points = (0..5)
            .flat_map(|k| {
                [TransferType::I, TransferType::II].map(|kind| OverviewPoint {
                    depart_days: 11_000.0 + 780.0 * f64::from(k),
                    kind,
                    c3_km2_s2: 9.0
                        + f64::from(k % 3)
                        + if kind == TransferType::II { 0.5 } else { 0.0 },
                    vinf_arrive_km_s: 3.0 + 0.2 * f64::from(k),
                    flagged: k == 4,
                })
            })
            .collect();
        OverviewSpec {
            title: "A → B".to_string(),
            subtitle: "test".to_string(),
            points,
            max_c3: Some(11.0),
        }
    }

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
            "A → B",
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
