//! The chart's entry points: a [`Chart`] is planned once and drawn to
//! SVG and to PNG at any size; [`render_svg`], [`render_png`],
//! [`render_panel_svg`] and [`render_panel_png`] do both steps for one
//! format.

use super::draw;
use super::encode::{self, check_size, ensure_font, SUPERSAMPLE};
use super::geometry::layout;
use super::panel::Panel;
use super::pdf::svg_to_pdf;
use super::plan::{Contours, Plan};
use super::{ChartError, ChartSpec, ChartWarning};
use crate::transfer::Endpoints;

/// Default image width, px: the layout's reference size, a 4:3 slide of
/// 12 x 9 in at 150 px per inch (common practice, no source).
pub const DEFAULT_WIDTH_PX: u32 = 1800;
/// Default image height, px.
pub const DEFAULT_HEIGHT_PX: u32 = 1350;

/// A chart worked out once (fields, contour levels and lines, regions,
/// title), ready to be drawn to SVG and PNG at any size without
/// recomputing them.
///
/// ```
/// use synodic::chart::{synthetic_grid, Chart, ChartSpec};
///
/// let grid = synthetic_grid(60);
/// let spec = ChartSpec {
///     title: "Teodra → Kesh".to_string(),
///     subtitle: "Veyra system (invented)".to_string(),
///     c3_levels: Some(vec![12.0, 16.0, 500.0]),
///     max_c3: Some(20.0),
///     ..ChartSpec::new(&grid)
/// };
/// let chart = Chart::window(&spec)?;
/// let svg = chart.svg()?;
/// let png = chart.png(900, 675)?;
/// let pdf = chart.pdf()?;
/// assert!(svg.contains("class=\"c3\""));
/// assert!(png.starts_with(b"\x89PNG"));
/// assert!(pdf.starts_with(b"%PDF-"));
/// // 500 km²/s² lies above every C3 of this grid: not drawn, and said.
/// assert_eq!(chart.warnings().len(), 1);
/// assert!(chart.warnings()[0].to_string().starts_with("C3 level 500 km²/s² outside"));
/// # Ok::<(), synodic::chart::ChartError>(())
/// ```
pub struct Chart<'s, 'g> {
    plan: Plan<'s, 'g>,
}

impl std::fmt::Debug for Chart<'_, '_> {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("Chart")
            .field("title", &self.plan.title)
            .finish_non_exhaustive()
    }
}

impl<'s, 'g> Chart<'s, 'g> {
    /// The transfer-window chart of `spec`: C3 and arrival v-infinity
    /// contours, the C3 limit, the Type I/II line, time-of-flight lines.
    ///
    /// # Errors
    /// [`ChartError::NoSuchLayer`], [`ChartError::GridTooSmall`] and
    /// friends for an unusable grid; [`ChartError::Contour`] if
    /// contouring fails.
    pub fn window(spec: &'s ChartSpec<'g>) -> Result<Chart<'s, 'g>, ChartError> {
        Ok(Chart {
            plan: Plan::new(spec, Contours::Window)?,
        })
    }

    /// The `panel` of `spec` (see [`render_panel_svg`]); `ends` counts the
    /// burns for [`Panel::DvTotal`].
    ///
    /// # Errors
    /// As [`Chart::window`].
    pub fn panel(
        spec: &'s ChartSpec<'g>,
        panel: Panel,
        ends: &Endpoints,
    ) -> Result<Chart<'s, 'g>, ChartError> {
        Ok(Chart {
            plan: Plan::new(spec, Contours::Panel(panel, ends))?,
        })
    }

    /// What the caller should tell the user: explicit levels outside the
    /// data (not drawn), and so on. Empty for most charts.
    pub fn warnings(&self) -> &[ChartWarning] {
        &self.plan.warnings
    }

    /// The plan, for the page layout.
    pub(crate) fn plan(&self) -> &Plan<'s, 'g> {
        &self.plan
    }

    /// The chart as a one-page PDF of 12 x 9 in (the SVG at 150 px per
    /// inch), text embedded in DejaVu Sans ([`svg_to_pdf`]).
    ///
    /// # Errors
    /// [`ChartError::Draw`] if drawing fails, [`ChartError::Pdf`] if the
    /// conversion does.
    pub fn pdf(&self) -> Result<Vec<u8>, ChartError> {
        svg_to_pdf(&self.svg()?)
    }

    /// The chart as an SVG document of [`DEFAULT_WIDTH_PX`] x
    /// [`DEFAULT_HEIGHT_PX`] (text stays text; data lines carry a
    /// `class`).
    ///
    /// # Errors
    /// [`ChartError::Font`] or [`ChartError::Draw`] if drawing fails.
    pub fn svg(&self) -> Result<String, ChartError> {
        let (w, h) = (DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX);
        ensure_font()?;
        let lay = layout(w, h);
        let s = f64::from(SUPERSAMPLE);
        let svg = encode::svg(w * SUPERSAMPLE, h * SUPERSAMPLE, |area| {
            draw::chart(area, &self.plan, &lay, s, true)
        })?;
        Ok(encode::finish_chart_svg(svg, w, h, lay.k))
    }

    /// The chart as PNG bytes of `width_px` x `height_px`, RGB, 8 bits,
    /// drawn at twice the size and box-filtered down for smooth lines.
    ///
    /// # Errors
    /// [`ChartError::ImageSize`] for sides outside 200..=10000 px;
    /// [`ChartError::Font`], [`ChartError::Draw`] or [`ChartError::Png`]
    /// if drawing or encoding fails.
    pub fn png(&self, width_px: u32, height_px: u32) -> Result<Vec<u8>, ChartError> {
        check_size(width_px, height_px)?;
        ensure_font()?;
        let lay = layout(width_px, height_px);
        let s = f64::from(SUPERSAMPLE);
        encode::png(width_px, height_px, |area| {
            draw::chart(area, &self.plan, &lay, s, false)
        })
    }
}

/// The chart as an SVG document (1800 x 1350 px; text stays text).
///
/// Data lines carry a `class`: `c3`, `vinf`, `tof`, `ridge`, `c3max`.
/// To write the same chart as PNG too, plan it once with [`Chart`].
///
/// # Errors
/// [`ChartError::NoSuchLayer`], [`ChartError::GridTooSmall`] and friends
/// for an unusable grid; [`ChartError::Draw`] if drawing fails.
pub fn render_svg(spec: &ChartSpec) -> Result<String, ChartError> {
    ensure_font()?;
    Chart::window(spec)?.svg()
}

/// The chart as PNG bytes of `width_px` x `height_px` (the default is
/// [`DEFAULT_WIDTH_PX`] x [`DEFAULT_HEIGHT_PX`]), RGB, 8 bits.
///
/// Drawn at twice the size and box-filtered down for smooth lines.
///
/// # Errors
/// [`ChartError::ImageSize`] for sides outside 200..=10000 px;
/// [`ChartError::NoSuchLayer`], [`ChartError::GridTooSmall`] and friends
/// for an unusable grid; [`ChartError::Draw`] or [`ChartError::Png`] if
/// drawing or encoding fails.
pub fn render_png(spec: &ChartSpec, width_px: u32, height_px: u32) -> Result<Vec<u8>, ChartError> {
    check_size(width_px, height_px)?;
    ensure_font()?;
    Chart::window(spec)?.png(width_px, height_px)
}

/// A panel as an SVG document (1800 x 1350 px; text stays text).
///
/// The frame is the main chart's ([`render_svg`]); the contours are those
/// of `panel`, one family with `class="panel"` on its lines, labelled
/// with their values (degrees with `°`, delta-v in km/s). The title is
/// `spec.title` with the quantity appended; `spec.c3_levels`,
/// `spec.vinf_levels` and `spec.max_c3` are not used. `ends` counts the
/// burns for [`Panel::DvTotal`] and is not used by the other panels (the
/// grid stores the asymptote directions in the bodies' frames already).
///
/// # Errors
/// [`ChartError::NoSuchLayer`], [`ChartError::GridTooSmall`] and friends
/// for an unusable grid; [`ChartError::Draw`] if drawing fails.
pub fn render_panel_svg(
    spec: &ChartSpec,
    panel: Panel,
    ends: &Endpoints,
) -> Result<String, ChartError> {
    ensure_font()?;
    Chart::panel(spec, panel, ends)?.svg()
}

/// A panel as PNG bytes of `width_px` x `height_px`, RGB, 8 bits: what
/// [`render_panel_svg`] draws, rendered like [`render_png`].
///
/// # Errors
/// [`ChartError::ImageSize`] for sides outside 200..=10000 px;
/// [`ChartError::NoSuchLayer`], [`ChartError::GridTooSmall`] and friends
/// for an unusable grid; [`ChartError::Draw`] or [`ChartError::Png`] if
/// drawing or encoding fails.
pub fn render_panel_png(
    spec: &ChartSpec,
    panel: Panel,
    ends: &Endpoints,
    width_px: u32,
    height_px: u32,
) -> Result<Vec<u8>, ChartError> {
    check_size(width_px, height_px)?;
    ensure_font()?;
    Chart::panel(spec, panel, ends)?.png(width_px, height_px)
}
