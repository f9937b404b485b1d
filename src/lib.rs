//! # synodic
//!
//! Interplanetary transfer-window design from analytic mean-element
//! ephemerides: sweep departure and arrival dates, solve Lambert's problem
//! for each pair, and read off departure C3, DLA and RLA, arrival
//! v-infinity and total delta-v.
//!
//! **Caution.** Every figure synodic produces is a preliminary,
//! patched-conic design value computed from mean-element ephemerides. It
//! does not replace a mission's own navigation and flight-dynamics
//! process, nor the applicable agency standards.
//!
//! ## Modules
//!
//! | module | what it holds | method |
//! |---|---|---|
//! | [`chart`] | contour charts of a sweep grid, SVG and PNG | marching squares (contour crate), plotters |
//! | [`time`] | epochs in TDB, parsing and printing | hifitime |
//! | [`opportunity`] | bracketing opportunities by Hohmann phasing | Kepler's third law |
//! | [`orbit`] | two-body states, universal-variable propagation, elements from a state | Bate, Mueller & White (1971) ch. 4-5 |
//! | [`ephemeris`] | mean-element bodies, system files, Kepler's equation | Standish, *Keplerian Elements for Approximate Positions of the Major Planets* |
//! | [`lambert`] | Lambert's two-point boundary-value problem | Izzo (2015) |
//! | [`export`] | atomic file writing | temp file, then rename |
//! | [`study`] | study files: a whole run in one TOML file | serde + toml |
//! | [`sweep`] | the departure x arrival grid, in parallel | rayon over departure rows |
//! | [`transfer`] | one transfer between two bodies: C3, DLA, RLA, v-infinity, delta-v | patched conics |
//! | [`windows`] | optima refined on the Lambert objective, opportunity scans, launch periods | Nelder & Mead (1965), golden section |
//!
//! ## Units
//!
//! Unless a name says otherwise: km, km/s, km^3/s^2 (GM), km^2/s^2 (C3),
//! seconds for propagation, days for dates and times of flight, degrees
//! in files and reports, radians inside the math. Epochs are TDB.

// Every public item documents its units and method.
#![deny(missing_docs)]
// Debug output is needed when a run has to be reproduced from a log.
#![warn(missing_debug_implementations)]
// Floats are compared with tolerances, never with `==`.
#![deny(clippy::float_cmp)]

pub mod chart;
pub mod ephemeris;
pub mod error;
pub mod export;
pub mod lambert;
pub mod opportunity;
pub mod orbit;
pub mod study;
pub mod sweep;
pub mod time;
pub mod transfer;
pub mod windows;

pub use error::{Error, Result};
