//! From drawing to bytes: the embedded font, the accepted image sizes, the
//! SVG document (with its lines tagged for tools and tests) and the one
//! PNG pipeline every chart uses.
//!
//! PNG: plotters' bitmap backend draws without anti-aliasing, so every
//! chart is drawn at [`SUPERSAMPLE`] times its size into an RGB buffer,
//! box-filtered 2 x 2 back down and written with the `png` crate (which
//! spares the heavy `image` crate).
//!
//! SVG: the main chart and its panels are drawn at the same doubled size
//! and keep the doubled `viewBox` with the requested `width`/`height`,
//! which gives half-pixel coordinates. Each data line then gets a `class`
//! (`c3`, `vinf`, `tof`, `ridge`, `c3max`, `panel`; `legend` for the
//! legend's samples), found by its colour; dashes become
//! `stroke-dasharray` there and are drawn dash by dash in the PNG.

use std::sync::OnceLock;

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::FontStyle;

use super::levels::format_level;
use super::style::{Line, FONT_FAMILY};
use super::{draw_err, ChartError};

/// Backend px per logical px.
pub(crate) const SUPERSAMPLE: u32 = 2;
/// Smallest image side accepted, px: there the layout is about a seventh
/// of its reference size.
const MIN_SIDE_PX: u32 = 200;
/// Largest image side accepted, px: at 10,000 x 10,000 px the doubled RGB
/// buffer holds 1.2 GB (20,000 x 20,000 x 3 bytes).
const MAX_SIDE_PX: u32 = 10_000;

/// DejaVu Sans (Bitstream Vera licence; see fonts/LICENSE-DejaVu.txt).
pub(crate) static FONT_TTF: &[u8] = include_bytes!("fonts/DejaVuSans.ttf");

/// Registers the embedded font with plotters under [`FONT_FAMILY`], once
/// per process.
///
/// # Errors
/// [`ChartError::Font`] if plotters rejects the font.
pub(crate) fn ensure_font() -> Result<(), ChartError> {
    static REGISTERED: OnceLock<bool> = OnceLock::new();
    let ok = *REGISTERED.get_or_init(|| {
        plotters::style::register_font(FONT_FAMILY, FontStyle::Normal, FONT_TTF).is_ok()
    });
    if ok {
        Ok(())
    } else {
        Err(ChartError::Font)
    }
}

/// Checks both sides of an image against 200..=10000 px.
///
/// # Errors
/// [`ChartError::ImageSize`] when either side is outside.
pub(crate) fn check_size(width_px: u32, height_px: u32) -> Result<(), ChartError> {
    let ok = |s: u32| (MIN_SIDE_PX..=MAX_SIDE_PX).contains(&s);
    if ok(width_px) && ok(height_px) {
        Ok(())
    } else {
        Err(ChartError::ImageSize {
            width_px,
            height_px,
        })
    }
}

/// An SVG document of `width_px` x `height_px` backend px drawn by `draw`.
///
/// # Errors
/// What `draw` returns; [`ChartError::Draw`] if the backend fails.
pub(crate) fn svg<F>(width_px: u32, height_px: u32, draw: F) -> Result<String, ChartError>
where
    F: FnOnce(&DrawingArea<SVGBackend<'_>, Shift>) -> Result<(), ChartError>,
{
    let mut svg = String::new();
    {
        let area = SVGBackend::with_string(&mut svg, (width_px, height_px)).into_drawing_area();
        draw(&area)?;
        area.present().map_err(draw_err)?;
    }
    Ok(svg)
}

/// A chart's SVG drawn at [`SUPERSAMPLE`] times `width_px` x `height_px`
/// made ready to write: the requested size outside (the doubled
/// coordinates stay inside), each line kind's `class` and dashes, and
/// round joins. `k` is the layout's scale, which sized the dashes.
pub(crate) fn finish_chart_svg(svg: String, width_px: u32, height_px: u32, k: f64) -> String {
    let (bw, bh) = (width_px * SUPERSAMPLE, height_px * SUPERSAMPLE);
    let mut svg = svg.replacen(
        &format!("width=\"{bw}\" height=\"{bh}\""),
        &format!("width=\"{width_px}\" height=\"{height_px}\""),
        1,
    );
    let s = f64::from(SUPERSAMPLE) * k;
    for kind in Line::ALL {
        let dash = kind
            .dash_px()
            .map(|(on, off)| {
                format!(
                    " stroke-dasharray=\"{} {}\"",
                    format_level(on * s),
                    format_level(off * s)
                )
            })
            .unwrap_or_default();
        for (colour, class) in [
            (kind.colour(), kind.class()),
            (kind.legend_colour(), "legend"),
        ] {
            let RGBColor(r, g, b) = colour;
            let from =
                format!("<polyline fill=\"none\" opacity=\"1\" stroke=\"#{r:02X}{g:02X}{b:02X}\"");
            let to = format!("<polyline class=\"{class}\" fill=\"none\" opacity=\"1\"{dash} stroke=\"#{r:02X}{g:02X}{b:02X}\"");
            svg = svg.replace(&from, &to);
        }
    }
    svg.replace("<polyline ", "<polyline stroke-linejoin=\"round\" ")
}

/// PNG bytes (RGB, 8 bits) of a `width_px` x `height_px` image that `draw`
/// draws at [`SUPERSAMPLE`] times the size on a white buffer.
///
/// # Errors
/// [`ChartError::ImageSize`] for sides outside 200..=10000 px; what
/// `draw` returns; [`ChartError::Draw`] or [`ChartError::Png`] if the
/// backend or the encoder fails.
pub(crate) fn png<F>(width_px: u32, height_px: u32, draw: F) -> Result<Vec<u8>, ChartError>
where
    F: FnOnce(&DrawingArea<BitMapBackend<'_>, Shift>) -> Result<(), ChartError>,
{
    check_size(width_px, height_px)?;
    let (bw, bh) = (width_px * SUPERSAMPLE, height_px * SUPERSAMPLE);
    let mut big = vec![255u8; bw as usize * bh as usize * 3];
    {
        let area = BitMapBackend::with_buffer(&mut big, (bw, bh)).into_drawing_area();
        draw(&area)?;
        area.present().map_err(draw_err)?;
    }
    encode_png(
        &downsample_2x(&big, width_px as usize, height_px as usize),
        width_px,
        height_px,
    )
}

/// Encodes an 8-bit RGB buffer as PNG.
fn encode_png(rgb: &[u8], width_px: u32, height_px: u32) -> Result<Vec<u8>, ChartError> {
    let mut out = Vec::new();
    {
        let mut enc = png::Encoder::new(&mut out, width_px, height_px);
        enc.set_color(png::ColorType::Rgb);
        enc.set_depth(png::BitDepth::Eight);
        enc.set_compression(png::Compression::Fast);
        let mut w = enc
            .write_header()
            .map_err(|e| ChartError::Png(e.to_string()))?;
        w.write_image_data(rgb)
            .map_err(|e| ChartError::Png(e.to_string()))?;
        w.finish().map_err(|e| ChartError::Png(e.to_string()))?;
    }
    Ok(out)
}

/// 2 x 2 box filter: RGB of `2w x 2h` to `w x h`, each channel the
/// rounded mean of its four samples.
fn downsample_2x(big: &[u8], w: usize, h: usize) -> Vec<u8> {
    let bw = 2 * w;
    let mut out = vec![0u8; w * h * 3];
    for y in 0..h {
        let r0 = 2 * y * bw * 3;
        let r1 = (2 * y + 1) * bw * 3;
        for x in 0..w {
            for c in 0..3 {
                let i = 2 * x * 3 + c;
                let sum = u32::from(big[r0 + i])
                    + u32::from(big[r0 + i + 3])
                    + u32::from(big[r1 + i])
                    + u32::from(big[r1 + i + 3]);
                out[(y * w + x) * 3 + c] = ((sum + 2) / 4) as u8;
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn box_filter_averages_each_two_by_two_block() {
        // 4 x 2 px in, 2 x 1 px out. Left block: 0, 1, 2, 4 in red (mean
        // 1.75, rounds to 2); right block all 200.
        let mut big = vec![200u8; 4 * 2 * 3];
        for (px, v) in [(0, 0u8), (1, 1), (4, 2), (5, 4)] {
            big[px * 3] = v;
            big[px * 3 + 1] = 10;
            big[px * 3 + 2] = 255;
        }
        assert_eq!(downsample_2x(&big, 2, 1), vec![2, 10, 255, 200, 200, 200]);
    }

    #[test]
    fn sizes_outside_the_accepted_range_are_errors() {
        assert!(check_size(200, 10_000).is_ok());
        assert_eq!(
            check_size(199, 500),
            Err(ChartError::ImageSize {
                width_px: 199,
                height_px: 500
            })
        );
        assert!(check_size(500, 10_001).is_err());
    }
}
