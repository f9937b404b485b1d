//! Several charts on one sheet: panels of one sweep, or opportunities
//! cropped from one grid, in a grid of cells under a page title, as SVG,
//! PNG or PDF.
//!
//! Every cell is a whole chart at the reference size (1800 x 1350 logical
//! px, with its own title, legend and caption), so a cell reads as the
//! chart alone would; the page is as many cells wide as it has columns.

use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

use super::draw;
use super::encode::{self, check_size, ensure_font, SUPERSAMPLE};
use super::geometry::{layout, REF_HEIGHT_PX, REF_WIDTH_PX};
use super::pdf::svg_to_pdf;
use super::pen::Pen;
use super::render::Chart;
use super::style::{INK, TITLE_TEXT_PX};
use super::{draw_err, ChartError};

/// Height of the page title's band, logical px at the reference size.
const HEADER_PX: f64 = 90.0;
/// Left edge and top of the page title, logical px.
const HEADER_TEXT_AT_PX: (f64, f64) = (40.0, 26.0);

/// Page size in logical px (at scale 1) for `n` charts in `columns`.
fn page_size(n: usize, columns: usize) -> Result<(f64, f64, usize), ChartError> {
    if n == 0 || columns == 0 {
        return Err(ChartError::EmptyPage { charts: n, columns });
    }
    let columns = columns.min(n);
    let rows = n.div_ceil(columns);
    Ok((
        REF_WIDTH_PX * columns as f64,
        HEADER_PX + REF_HEIGHT_PX * rows as f64,
        columns,
    ))
}

/// Draws the page at `f` logical px per reference px and `s` backend px
/// per logical px.
fn draw_page<DB: DrawingBackend>(
    area: &DrawingArea<DB, plotters::coord::Shift>,
    title: &str,
    charts: &[&Chart<'_, '_>],
    columns: usize,
    (f, s): (f64, f64),
    native_dash: bool,
) -> Result<(), ChartError> {
    area.fill(&WHITE).map_err(draw_err)?;
    let pen = Pen {
        area,
        s,
        k: f,
        native_dash,
    };
    pen.text(
        title,
        (HEADER_TEXT_AT_PX.0 * f, HEADER_TEXT_AT_PX.1 * f),
        TITLE_TEXT_PX,
        &INK,
        (HPos::Left, VPos::Top),
    )?;
    let (cw, ch) = (REF_WIDTH_PX * f, REF_HEIGHT_PX * f);
    let lay = layout(cw.round() as u32, ch.round() as u32);
    for (n, chart) in charts.iter().enumerate() {
        let (col, row) = (n % columns, n / columns);
        let x = cw * col as f64;
        let y = HEADER_PX * f + ch * row as f64;
        let cell = area.clone().shrink(
            ((x * s).round() as i32, (y * s).round() as i32),
            ((cw * s).round() as u32, (ch * s).round() as u32),
        );
        draw::chart(&cell, chart.plan(), &lay, s, native_dash)?;
    }
    Ok(())
}

/// `charts` on one page under `title`, `columns` across (rows as
/// needed), as SVG: each cell 1800 x 1350 px.
///
/// ```
/// use synodic::chart::{page_svg, synthetic_grid, Chart, ChartSpec, Panel};
/// use synodic::transfer::Endpoints;
///
/// let grid = synthetic_grid(40);
/// let spec = ChartSpec { title: "Teodra → Kesh".to_string(), ..ChartSpec::new(&grid) };
/// let ends = Endpoints::bare();
/// let main = Chart::window(&spec)?;
/// let dla = Chart::panel(&spec, Panel::DvTotal, &ends)?;
/// let svg = page_svg("Teodra → Kesh, 2031", &[&main, &dla], 2)?;
/// assert!(svg.contains("width=\"3600\""));
/// # Ok::<(), synodic::chart::ChartError>(())
/// ```
///
/// # Errors
/// [`ChartError::EmptyPage`] without charts or columns;
/// [`ChartError::Draw`] if drawing fails.
pub fn page_svg(
    title: &str,
    charts: &[&Chart<'_, '_>],
    columns: usize,
) -> Result<String, ChartError> {
    let (w, h, columns) = page_size(charts.len(), columns)?;
    ensure_font()?;
    let (w, h) = (w.round() as u32, h.round() as u32);
    let s = f64::from(SUPERSAMPLE);
    let svg = encode::svg(w * SUPERSAMPLE, h * SUPERSAMPLE, |area| {
        draw_page(area, title, charts, columns, (1.0, s), true)
    })?;
    Ok(encode::finish_chart_svg(svg, w, h, 1.0))
}

/// The page of [`page_svg`] as PNG bytes `width_px` wide (the height
/// follows), drawn like every chart's PNG.
///
/// # Errors
/// [`ChartError::EmptyPage`] without charts or columns;
/// [`ChartError::ImageSize`] when a side falls outside 200..=10000 px;
/// [`ChartError::Draw`] or [`ChartError::Png`] if drawing or encoding
/// fails.
pub fn page_png(
    title: &str,
    charts: &[&Chart<'_, '_>],
    columns: usize,
    width_px: u32,
) -> Result<Vec<u8>, ChartError> {
    let (w, h, columns) = page_size(charts.len(), columns)?;
    let f = f64::from(width_px) / w;
    let height_px = (h * f).round() as u32;
    check_size(width_px, height_px)?;
    ensure_font()?;
    let s = f64::from(SUPERSAMPLE);
    encode::png(width_px, height_px, |area| {
        draw_page(area, title, charts, columns, (f, s), false)
    })
}

/// The page of [`page_svg`] as a one-page PDF (each cell 12 x 9 in).
///
/// # Errors
/// As [`page_svg`]; [`ChartError::Pdf`] if the conversion fails.
pub fn page_pdf(
    title: &str,
    charts: &[&Chart<'_, '_>],
    columns: usize,
) -> Result<Vec<u8>, ChartError> {
    svg_to_pdf(&page_svg(title, charts, columns)?)
}
