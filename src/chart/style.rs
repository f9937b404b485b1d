//! How the charts look: the palette, the kinds of line with their strokes
//! and dashes, the text family and sizes, and the caption.
//!
//! Every size here is in logical px at the reference image size
//! ([`super::geometry::REF_WIDTH_PX`] x [`super::geometry::REF_HEIGHT_PX`])
//! and scales with the image. The values were chosen by eye for charts
//! shown on a slide at a design review (common practice, no source).

use plotters::style::RGBColor;

/// Caption printed under every chart.
pub(crate) const CAPTION: &str =
    "patched-conic, mean-element ephemerides; preliminary design figures";

/// Font family the charts ask plotters for; the embedded font is
/// registered under it (plotters' own axis labels ask for it too).
pub(crate) const FONT_FAMILY: &str = "sans-serif";
/// Text sizes in this module are nominal; plotters' size is this much
/// larger for text that reads at design-review distance.
pub(crate) const FONT_SCALE: f64 = 1.18;

/// Chart title.
pub(crate) const TITLE_TEXT_PX: f64 = 32.0;
/// Subtitle.
pub(crate) const SUBTITLE_TEXT_PX: f64 = 20.0;
/// Axis titles.
pub(crate) const AXIS_TITLE_TEXT_PX: f64 = 20.0;
/// Tick labels (dates, times of flight).
pub(crate) const TICK_TEXT_PX: f64 = 17.0;
/// "Type I" and "Type II" beside the 180-degree line.
pub(crate) const REGION_TEXT_PX: f64 = 17.0;
/// A marker's annotation.
pub(crate) const MARKER_TEXT_PX: f64 = 16.0;
/// Legend rows.
pub(crate) const LEGEND_TEXT_PX: f64 = 16.0;
/// Contour labels.
pub(crate) const LINE_LABEL_TEXT_PX: f64 = 15.0;
/// The caption.
pub(crate) const CAPTION_TEXT_PX: f64 = 15.0;
/// Time-of-flight labels and the legend's "Solutions" note.
pub(crate) const SMALL_TEXT_PX: f64 = 14.0;

// Palette: blue and orange stay apart under the common colour-vision
// deficiencies; the other line kinds differ by dash pattern as well as hue.
/// Text and outlines.
pub(crate) const INK: RGBColor = RGBColor(0x22, 0x22, 0x2a);
/// Secondary text (subtitle, caption, time-of-flight labels).
pub(crate) const MUTED: RGBColor = RGBColor(0x5c, 0x5f, 0x66);
/// Departure C3 contours.
pub(crate) const C3_RGB: RGBColor = RGBColor(0x1d, 0x3f, 0x8f);
/// Arrival v-infinity contours.
pub(crate) const VINF_RGB: RGBColor = RGBColor(0xc2, 0x5a, 0x00);
/// Lines of constant time of flight.
pub(crate) const TOF_RGB: RGBColor = RGBColor(0x8c, 0x8c, 0x8c);
/// The 180-degree (Type I/II) line and its region names.
pub(crate) const RIDGE_RGB: RGBColor = RGBColor(0x6a, 0x2c, 0x91);
/// The C3 limit line.
pub(crate) const LIMIT_RGB: RGBColor = RGBColor(0x1f, 0x7a, 0x5c);
/// The region within the C3 limit.
pub(crate) const SHADE_RGB: RGBColor = RGBColor(0xd9, 0xf0, 0xe3);
/// Cells without a solution.
pub(crate) const MASK_RGB: RGBColor = RGBColor(0xdc, 0xdc, 0xdc);
/// Where arrival is not after departure: lighter than "no solution", a
/// region no solver is asked about.
pub(crate) const BEFORE_RGB: RGBColor = RGBColor(0xf1, 0xf1, 0xf1);
/// The band around the 180-degree line left without contours: a tint of
/// the line's purple.
pub(crate) const BAND_RGB: RGBColor = RGBColor(0xf3, 0xee, 0xf7);
/// Grid lines.
pub(crate) const GRIDLINE_RGB: RGBColor = RGBColor(0xea, 0xea, 0xea);
/// The plot frame and ticks.
pub(crate) const FRAME_RGB: RGBColor = RGBColor(0x44, 0x44, 0x44);
/// The legend's border.
pub(crate) const LEGEND_BORDER_RGB: RGBColor = RGBColor(0xb0, 0xb0, 0xb0);
/// Marker fill.
pub(crate) const MARKER_RGB: RGBColor = RGBColor(0xff, 0xc8, 0x2e);
/// A panel's single contour family: a deep teal, away from the C3 blue,
/// the v-infinity orange, the ridge purple and the limit green in hue and
/// lightness.
pub(crate) const PANEL_RGB: RGBColor = RGBColor(0x00, 0x7d, 0x8a);
/// Background, and the boxes behind labels.
pub(crate) const PAPER: RGBColor = RGBColor(0xff, 0xff, 0xff);

/// Stroke of the plot frame, logical px.
pub(crate) const FRAME_STROKE_PX: f64 = 1.4;
/// Stroke of the ticks, logical px.
pub(crate) const TICK_STROKE_PX: f64 = 1.2;
/// Stroke of grid lines and box borders, logical px.
pub(crate) const THIN_STROKE_PX: f64 = 1.0;
/// Stroke of a marker's outline, logical px.
pub(crate) const MARKER_STROKE_PX: f64 = 1.6;
/// Half-diagonal of a marker's diamond, logical px.
pub(crate) const MARKER_RADIUS_PX: f64 = 9.0;

/// The kinds of line the chart draws.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) enum Line {
    /// Departure C3 contours.
    C3,
    /// Arrival v-infinity contours.
    Vinf,
    /// Lines of constant time of flight.
    Tof,
    /// The 180-degree transfer-angle line.
    Ridge,
    /// The C3 limit.
    Limit,
    /// The contour family of a panel.
    Panel,
}

impl Line {
    /// Every kind, in a fixed order.
    pub(crate) const ALL: [Line; 6] = [
        Line::C3,
        Line::Vinf,
        Line::Tof,
        Line::Ridge,
        Line::Limit,
        Line::Panel,
    ];

    /// The `class` of this kind's lines in the SVG.
    pub(crate) fn class(self) -> &'static str {
        match self {
            Line::C3 => "c3",
            Line::Vinf => "vinf",
            Line::Tof => "tof",
            Line::Ridge => "ridge",
            Line::Limit => "c3max",
            Line::Panel => "panel",
        }
    }

    /// Stroke colour.
    pub(crate) fn colour(self) -> RGBColor {
        match self {
            Line::C3 => C3_RGB,
            Line::Vinf => VINF_RGB,
            Line::Tof => TOF_RGB,
            Line::Ridge => RIDGE_RGB,
            Line::Limit => LIMIT_RGB,
            Line::Panel => PANEL_RGB,
        }
    }

    /// The same hue one step off in blue: legend samples look the same but
    /// are not counted as data lines in the SVG.
    pub(crate) fn legend_colour(self) -> RGBColor {
        let RGBColor(r, g, b) = self.colour();
        RGBColor(r, g, if b == 0xff { 0xfe } else { b + 1 })
    }

    /// Stroke width, logical px.
    pub(crate) fn width_px(self) -> f64 {
        match self {
            Line::C3 => 1.6,
            Line::Vinf => 1.5,
            Line::Tof => 1.0,
            Line::Ridge => 2.2,
            Line::Limit => 2.4,
            Line::Panel => 1.6,
        }
    }

    /// Dash (on, off), logical px; `None` = solid.
    pub(crate) fn dash_px(self) -> Option<(f64, f64)> {
        match self {
            Line::C3 | Line::Limit | Line::Panel => None,
            Line::Vinf => Some((11.0, 6.0)),
            Line::Tof => Some((2.0, 5.0)),
            Line::Ridge => Some((22.0, 5.0)),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_line_kind_has_colours_of_its_own() {
        // The SVG tags lines by colour: a legend sample sharing a data
        // line's colour, two kinds sharing one, or a kind sharing the
        // colour of the other polylines (grid lines, frame and ticks,
        // marker outlines) would be miscounted.
        let mut seen: std::collections::HashSet<RGBColor> =
            [GRIDLINE_RGB, FRAME_RGB, INK].into_iter().collect();
        for l in Line::ALL {
            assert_ne!(l.colour(), l.legend_colour(), "{l:?}");
            assert!(seen.insert(l.colour()), "{l:?} shares its colour");
            assert!(seen.insert(l.legend_colour()), "{l:?} legend colour");
        }
    }
}
