//! Contour charts of a sweep grid, as SVG, PNG and PDF.
//!
//! One chart shows one solution layer of a [`Grid`]: departure date across,
//! arrival date (or time of flight) up, with
//!
//! * departure C3 contours (solid, labelled in km^2/s^2),
//! * arrival v-infinity contours (dashed, another colour, labelled in km/s),
//! * lines of constant time of flight (dotted diagonals, labelled in days;
//!   left out when the second axis already is the time of flight),
//! * the 180-degree transfer-angle line that separates Type I from Type II
//!   transfers, with both regions named, in the middle of a band left
//!   without contours or labels (below),
//! * cells without figures left blank and told apart: "arrival before
//!   departure" (a fact of the axes, outlined exactly) and "no solution"
//!   (the solver's verdict), never drawn as zero,
//! * an optional shaded region where C3 stays within a limit,
//! * markers (Type I circles, Type II triangles) with callouts quoting the
//!   chart's own quantity, a legend of what is drawn, title, subtitle
//!   (with the grid step) and caption.
//!
//! A [`Panel`] ([`render_panel_svg`], [`render_panel_png`]) is the same
//! frame with another quantity contoured instead of C3 and v-infinity: the
//! departure asymptote's declination (DLA), the arrival asymptote's
//! declination, or the total delta-v.
//!
//! # Near the 180-degree line
//!
//! Where the transfer angle nears 180 degrees the transfer plane is
//! barely defined and every figure changes steeply; a grid shows that as
//! a knot of contours plus sampling noise. No contour and no label is
//! drawn within [`BAND_STEPS`] grid steps of the line (the larger step in
//! px), and never within less than [`BAND_MIN_PX`] px at the reference
//! size (1800 x 1350); the band is tinted and the line drawn once on top.
//!
//! # Levels
//!
//! Automatic levels ([`levels`]) start half a round step above the field's
//! minimum and widen along 1-2-5 up to 4 times the minimum (or the field's
//! 60 % quantile, if lower), at most 12 lines. Explicit levels outside the
//! chart's data are not drawn; [`Chart::warnings`] says so with the data's
//! range, for the caller to print.
//!
//! # Slides
//!
//! [`Slide`] overrides the title and subtitle and crops to departure and
//! second-axis windows; [`page_svg`], [`page_png`] and [`page_pdf`] put
//! several charts (panels of a sweep, or opportunities cropped from it) on
//! one sheet; [`Chart::pdf`], [`overview_pdf`] and [`svg_to_pdf`] write
//! vector PDF with the embedded font.
//!
//! # How a chart is made
//!
//! Data flows one way through modules of one concept each:
//!
//! * `fields` takes the layer's fields onto the chart's lattice (crop
//!   windows applied, blank cells sorted by why), `band` finds the band
//!   around the 180-degree line (an exact distance transform), `plan`
//!   works out, once per chart, everything that is drawn: the contour
//!   levels ([`levels`]) and their [`isolines`] (marching squares, via the
//!   `contour` crate), the shaded and blank regions, the time-of-flight
//!   lines, the titles and warnings; `ticks` places calendar and number
//!   ticks; `panel` says what a [`Panel`] contours;
//! * `geometry` holds the plane geometry in logical px: the layout, the
//!   map from data coordinates, polygon clipping, dashes and the placer
//!   that keeps labels apart;
//! * `pen` draws primitives with `plotters` on any backend; `draw` draws a
//!   plan, `labels` its markers, callouts and labels, `legend` the legend
//!   boxes, in the look that `style` fixes (palette, line kinds, text
//!   sizes);
//! * `encode` turns the drawing into bytes: the embedded font, the SVG
//!   (text stays text; data lines tagged with a `class`) and the one PNG
//!   pipeline of every chart (drawn at twice the size, box-filtered down
//!   because the bitmap backend does not anti-alias, written with the
//!   `png` crate); `pdf` converts an SVG with `svg2pdf`;
//! * `render` is the entry: a [`Chart`] planned once and drawn to SVG,
//!   PNG and PDF, and the one-call [`render_svg`], [`render_png`],
//!   [`render_panel_svg`], [`render_panel_png`]; `page` lays charts out on
//!   one sheet; `overview` draws the span overview with the same pen,
//!   legend and encoder.
//!
//! Dates on the axes come from `calendar`, the chart's one seam to the
//! calendar ([`date_label_tdb`]).
//!
//! Chart text uses DejaVu Sans, embedded in the library (Bitstream Vera
//! licence, `src/chart/fonts/LICENSE-DejaVu.txt`).
//!
//! Every chart is a preliminary design figure; its caption says so.

mod band;
mod calendar;
mod crowd;
mod draw;
mod encode;
mod fields;
mod geometry;
pub mod isolines;
mod labels;
mod legend;
pub mod levels;
mod overview;
mod page;
mod panel;
mod pdf;
mod pen;
mod plan;
mod render;
#[doc(hidden)]
pub mod samples;
mod style;
#[cfg(test)]
mod tests;
mod ticks;

pub use band::{BAND_MIN_PX, BAND_STEPS};
pub use crowd::MIN_LINE_GAP_PX;
pub use overview::{overview_pdf, overview_png, overview_svg, OverviewPoint, OverviewSpec};
pub use page::{page_pdf, page_png, page_svg};
pub use panel::{Panel, MAX_ANGLE_LINES};
pub use pdf::{svg_to_pdf, PDF_PX_PER_INCH};
pub use render::{
    render_panel_png, render_panel_svg, render_png, render_svg, Chart, DEFAULT_HEIGHT_PX,
    DEFAULT_WIDTH_PX,
};

pub use calendar::date_label_tdb;
#[doc(hidden)]
pub use samples::synthetic_grid;

use crate::sweep::Grid;
use crate::transfer::TransferType;

/// What to draw: the grid, which layer, titles, levels, markers, and the
/// slide controls.
///
/// Build one with [`ChartSpec::new`] and set what differs:
///
/// ```
/// use synodic::chart::{synthetic_grid, ChartSpec};
///
/// let grid = synthetic_grid(40);
/// let spec = ChartSpec {
///     title: "Teodra → Kesh".to_string(),
///     max_c3: Some(20.0),
///     ..ChartSpec::new(&grid)
/// };
/// assert_eq!(spec.layer, 0);
/// ```
#[derive(Debug, Clone)]
pub struct ChartSpec<'a> {
    /// The sweep result to draw.
    pub grid: &'a Grid,
    /// Index into [`Grid::layers`]; usually 0 (zero revolutions).
    pub layer: usize,
    /// Title, e.g. "Teodra → Kesh, 2031 opportunity"; a panel appends its
    /// quantity.
    pub title: String,
    /// Subtitle: system name, span and so on; the chart appends the grid
    /// step ("grid step 1 d").
    pub subtitle: String,
    /// C3 contour levels, km^2/s^2; `None` picks them automatically
    /// ([`levels::c3_levels`]). Levels outside the data are not drawn and
    /// give a [`ChartWarning`].
    pub c3_levels: Option<Vec<f64>>,
    /// Arrival v-infinity contour levels, km/s; `None` picks them
    /// automatically ([`levels::vinf_levels`]).
    pub vinf_levels: Option<Vec<f64>>,
    /// Transfers to mark and call out: typically the refined optimum of
    /// every opportunity and Type.
    pub markers: Vec<Marker>,
    /// Shade the region where C3 <= this value, km^2/s^2.
    pub max_c3: Option<f64>,
    /// Title and subtitle overrides and crop windows.
    pub slide: Slide,
}

impl<'a> ChartSpec<'a> {
    /// The zero-revolution layer of `grid` with automatic levels, no
    /// titles, markers, limit or slide controls.
    pub fn new(grid: &'a Grid) -> ChartSpec<'a> {
        ChartSpec {
            grid,
            layer: 0,
            title: String::new(),
            subtitle: String::new(),
            c3_levels: None,
            vinf_levels: None,
            markers: Vec::new(),
            max_c3: None,
            slide: Slide::default(),
        }
    }
}

/// Controls for charts shown as slides.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Slide {
    /// The title exactly as drawn (a panel's quantity is not appended).
    pub title: Option<String>,
    /// The subtitle exactly as drawn (the grid step is not appended).
    pub subtitle: Option<String>,
    /// Show only the departures in this window, days past J2000 TDB
    /// (inclusive; the axis starts and ends at the first and last grid
    /// sample inside).
    pub crop_depart_days: Option<(f64, f64)>,
    /// Show only this window of the second axis: arrival dates in days
    /// past J2000 TDB, or times of flight in days, as the grid's
    /// [`Grid::second_kind`] says.
    pub crop_second_days: Option<(f64, f64)>,
}

/// A transfer marked on the chart, with what its callout quotes.
#[derive(Debug, Clone, PartialEq)]
pub struct Marker {
    /// Departure date, days past J2000 TDB.
    pub depart_days: f64,
    /// Second-axis value: arrival date in days past J2000 TDB, or time of
    /// flight in days, as the grid's [`Grid::second_kind`] says.
    pub second: f64,
    /// Type I or II: the marker's shape (circle or triangle).
    pub kind: TransferType,
    /// The callout's first words, e.g. "Type I" or "Type II (ridge)".
    pub name: String,
    /// The transfer's figures; each chart quotes its own quantity.
    pub figures: MarkerFigures,
}

/// A marked transfer's figures. The main chart quotes C3 and arrival
/// v-infinity, a [`Panel`] its own quantity; an unknown figure (`None`)
/// is left out of the callout.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct MarkerFigures {
    /// Departure C3, km^2/s^2.
    pub c3_km2_s2: Option<f64>,
    /// Arrival v-infinity, km/s.
    pub vinf_arrive_km_s: Option<f64>,
    /// Declination of the departure asymptote, deg.
    pub dla_deg: Option<f64>,
    /// Declination of the arrival asymptote, deg.
    pub arrive_dec_deg: Option<f64>,
    /// Total delta-v, km/s.
    pub dv_total_km_s: Option<f64>,
}

/// Something the caller should tell the user about a chart that was
/// drawn anyway ([`Chart::warnings`]). The text names the quantity and
/// the data's range; the caller adds which pair the chart shows.
#[derive(Debug, Clone, PartialEq)]
#[non_exhaustive]
pub enum ChartWarning {
    /// Explicit contour levels that lie outside the chart's data: they
    /// are not drawn and the legend does not list them.
    LevelsOutsideData {
        /// The quantity, e.g. "C3".
        quantity: &'static str,
        /// Its unit as printed, e.g. "km²/s²".
        unit: &'static str,
        /// The levels left out.
        levels: Vec<f64>,
        /// The data's smallest and largest value on the chart; `None`
        /// when the chart has none.
        range: Option<(f64, f64)>,
    },
}

impl std::fmt::Display for ChartWarning {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            ChartWarning::LevelsOutsideData {
                quantity,
                unit,
                levels,
                range,
            } => {
                let list: Vec<String> = levels.iter().map(|l| levels::format_level(*l)).collect();
                let s = if levels.len() == 1 { "" } else { "s" };
                write!(f, "{quantity} level{s} {} {unit} ", list.join(", "))?;
                match range {
                    Some((lo, hi)) => write!(
                        f,
                        "outside the chart's data ({} to {} {unit}): not drawn",
                        levels::format_level(*lo),
                        levels::format_level(*hi)
                    ),
                    None => write!(f, "not drawn: the chart has no {quantity} values"),
                }
            }
        }
    }
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
    /// A crop window holds fewer than two grid samples.
    #[error(
        "the {axis} crop window {window} holds fewer than two grid samples (the grid spans {grid})"
    )]
    Crop {
        /// Which axis: "departure", "arrival" or "time-of-flight".
        axis: &'static str,
        /// The window asked for, as text.
        window: String,
        /// The grid's span on that axis, as text.
        grid: String,
    },
    /// A page needs at least one chart and one column.
    #[error(
        "a page needs at least one chart and one column (got {charts} charts, {columns} columns)"
    )]
    EmptyPage {
        /// Charts given.
        charts: usize,
        /// Columns asked for.
        columns: usize,
    },
    /// An overview without points.
    #[error("nothing to plot: the overview has no points")]
    NothingToPlot,
    /// PDF conversion failed.
    #[error("pdf conversion failed: {0}")]
    Pdf(String),
}

/// A drawing backend's error as a [`ChartError::Draw`].
pub(crate) fn draw_err<E: std::fmt::Display>(e: E) -> ChartError {
    ChartError::Draw(e.to_string())
}
