//! The extra chart panels: which quantity a panel contours in place of C3
//! and arrival v-infinity, its levels, and how it is named and labelled.
//!
//! A panel (drawn by [`super::render_panel_svg`] and
//! [`super::render_panel_png`]) keeps everything of the main chart that
//! locates a transfer (axes, dates, blank unsolved cells, time-of-flight
//! lines, the Type I/II ridge, markers, title, legend and caption) and
//! draws one labelled contour family of the chosen [`Panel`] quantity. The
//! spec's C3 and v-infinity levels and its C3 limit are not used.

use super::levels::{auto_levels, even_levels, format_level, MAX_C3_LINES};
use crate::sweep::Grid;
use crate::transfer::Endpoints;

/// Most lines an angle panel (DLA, arrival declination) draws.
pub const MAX_ANGLE_LINES: usize = 12;

/// Which quantity a panel contours.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Panel {
    /// Declination of the departure asymptote (DLA) in the departure
    /// body's equator frame, deg.
    Dla,
    /// Declination of the arrival asymptote in the arrival body's equator
    /// frame, deg.
    ArriveDec,
    /// Total delta-v (departure plus arrival burn, as
    /// [`Endpoints::dv_total_km_s`] counts it), km/s.
    DvTotal,
}

impl Panel {
    /// Every panel, in a fixed order.
    pub const ALL: [Panel; 3] = [Panel::Dla, Panel::ArriveDec, Panel::DvTotal];

    /// Short name for command lines and file names: `dla`, `arrive-dec`,
    /// `dv-total`.
    pub fn name(&self) -> &'static str {
        match self {
            Panel::Dla => "dla",
            Panel::ArriveDec => "arrive-dec",
            Panel::DvTotal => "dv-total",
        }
    }

    /// The panel called `name` (as [`Panel::name`] prints it), if any.
    pub fn from_name(name: &str) -> Option<Panel> {
        Panel::ALL.into_iter().find(|p| p.name() == name)
    }

    /// What the title gets appended after a dash.
    pub(crate) fn title_suffix(&self) -> &'static str {
        match self {
            Panel::Dla => "DLA",
            Panel::ArriveDec => "arrival declination",
            Panel::DvTotal => "total Δv",
        }
    }

    /// The legend's text: the quantity and its unit.
    pub(crate) fn legend(&self) -> &'static str {
        match self {
            Panel::Dla => "DLA, deg",
            Panel::ArriveDec => "Arrival declination, deg",
            Panel::DvTotal => "Total Δv, km/s",
        }
    }

    /// A contour level as printed on the chart: degrees carry `°`, km/s
    /// are bare numbers (like the v-infinity labels).
    pub(crate) fn level_text(&self, level: f64) -> String {
        match self {
            Panel::Dla | Panel::ArriveDec => format!("{}°", format_level(level)),
            Panel::DvTotal => format_level(level),
        }
    }

    /// The value at grid index `idx` (the cell's status is not checked):
    /// deg for the declinations, km/s for delta-v.
    pub(crate) fn value(&self, grid: &Grid, idx: usize, ends: &Endpoints) -> f64 {
        match self {
            Panel::Dla => grid.dla_deg(idx),
            Panel::ArriveDec => grid.arrive_dec_deg(idx),
            Panel::DvTotal => {
                ends.dv_total_km_s(grid.vinf_depart_km_s[idx], grid.vinf_arrive_km_s[idx])
            }
        }
    }

    /// Automatic levels for the field's values (NaN ignored): evenly
    /// spaced round degrees over the whole range for the declinations (at
    /// most [`MAX_ANGLE_LINES`]), a ladder denser near the minimum for
    /// delta-v (like C3, at most [`MAX_C3_LINES`]).
    pub(crate) fn levels(&self, values: impl IntoIterator<Item = f64>) -> Vec<f64> {
        match self {
            Panel::Dla | Panel::ArriveDec => even_levels(values, MAX_ANGLE_LINES),
            Panel::DvTotal => auto_levels(values, MAX_C3_LINES),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn names_round_trip() {
        for p in Panel::ALL {
            assert_eq!(Panel::from_name(p.name()), Some(p));
        }
        assert_eq!(Panel::from_name("dla"), Some(Panel::Dla));
        assert_eq!(Panel::from_name("arrive-dec"), Some(Panel::ArriveDec));
        assert_eq!(Panel::from_name("dv-total"), Some(Panel::DvTotal));
        assert_eq!(Panel::from_name("DLA"), None);
        assert_eq!(Panel::from_name("c3"), None);
    }

    #[test]
    fn angle_levels_are_even_round_degrees() {
        let v: Vec<f64> = (0..=120).map(|i| -60.0 + f64::from(i)).collect();
        let l = Panel::Dla.levels(v.iter().copied());
        assert!(l.len() <= MAX_ANGLE_LINES && l.len() >= 5, "{l:?}");
        assert!(l.iter().all(|x| *x > -60.0 && *x < 60.0), "{l:?}");
        let step = l[1] - l[0];
        assert!((step - 10.0).abs() < 1e-9, "{l:?}");
        assert!(l.windows(2).all(|w| (w[1] - w[0] - step).abs() < 1e-9));
        assert_eq!(Panel::Dla.level_text(-30.0), "-30°");
        assert_eq!(Panel::DvTotal.level_text(5.5), "5.5");
    }
}
