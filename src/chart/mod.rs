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
//! # How a chart is made
//!
//! Data flows one way through modules of one concept each:
//!
//! * `plan` works out, once per chart, everything that is drawn: the
//!   layer's fields, the contour levels ([`levels`]) and their
//!   [`isolines`] (marching squares, via the `contour` crate), the shaded
//!   and blank regions, the time-of-flight lines, the title and the ticks;
//!   `panel` says what a [`Panel`] contours;
//! * `geometry` holds the plane geometry in logical px: the layout, the
//!   map from data coordinates, polygon clipping, dashes and where labels
//!   fit;
//! * `draw` draws a plan with `plotters`, one code path for both formats,
//!   in the look that `style` fixes (palette, line kinds, text sizes);
//! * `encode` turns the drawing into bytes: the embedded font, the SVG
//!   (text stays text; data lines tagged with a `class`) and the one PNG
//!   pipeline of every chart (drawn at twice the size, box-filtered down
//!   because the bitmap backend does not anti-alias, written with the
//!   `png` crate);
//! * `render` is the entry: a [`Chart`] planned once and drawn to SVG and
//!   PNG, and the one-call [`render_svg`], [`render_png`],
//!   [`render_panel_svg`], [`render_panel_png`]; `overview` draws the span
//!   overview through the same encoder.
//!
//! Dates on the axes come from `calendar`, the chart's one seam to the
//! calendar ([`date_label_tdb`]).
//!
//! Chart text uses DejaVu Sans, embedded in the library (Bitstream Vera
//! licence, `src/chart/fonts/LICENSE-DejaVu.txt`).
//!
//! Every chart is a preliminary design figure; its caption says so.

mod calendar;
mod draw;
mod encode;
mod geometry;
pub mod isolines;
pub mod levels;
mod overview;
mod panel;
mod plan;
mod render;
#[doc(hidden)]
pub mod samples;
mod style;
#[cfg(test)]
mod tests;

pub use overview::{overview_png, overview_svg, OverviewPoint, OverviewSpec};
pub use panel::{Panel, MAX_ANGLE_LINES};
pub use render::{
    render_panel_png, render_panel_svg, render_png, render_svg, Chart, DEFAULT_HEIGHT_PX,
    DEFAULT_WIDTH_PX,
};

pub use calendar::date_label_tdb;
#[doc(hidden)]
pub use samples::synthetic_grid;

use crate::sweep::Grid;

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

/// A drawing backend's error as a [`ChartError::Draw`].
pub(crate) fn draw_err<E: std::fmt::Display>(e: E) -> ChartError {
    ChartError::Draw(e.to_string())
}
