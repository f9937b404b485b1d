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
//! ## Example
//!
//! One transfer and a small grid on the built-in, invented demo system:
//!
//! ```
//! use synodic::ephemeris::System;
//! use synodic::sweep::{self, grid_minima, Axis, Objective, RunOptions, SecondAxis, SweepSpec};
//! use synodic::time::Epoch;
//! use synodic::transfer::{arcs_between, Endpoints};
//!
//! let system = System::demo();
//! let (from, to) = (system.find("Teodra")?, system.find("Kesh")?);
//! let depart = Epoch::parse("2032-07-22")?;
//! let arrive = Epoch::parse("2033-02-24")?;
//! let arcs = arcs_between(&system, from, to, &depart, &arrive, &Endpoints::bare(), 0)?;
//! let (figures, _) = &arcs[0];
//! assert!(figures.c3_km2_s2 > 12.0 && figures.c3_km2_s2 < 14.0); // km^2/s^2
//!
//! // Departures every 5 days over 100 days, times of flight 150-350 days.
//! let spec = SweepSpec {
//!     from,
//!     to,
//!     depart: Axis::spanning(depart.days_since_j2000_tdb() - 50.0, depart.days_since_j2000_tdb() + 50.0, 5.0)?,
//!     second: Axis::spanning(150.0, 350.0, 5.0)?,
//!     second_kind: SecondAxis::TimeOfFlight,
//!     max_revs: 0,
//!     ends: Endpoints::bare(),
//! };
//! let grid = sweep::sweep(&system, &spec, RunOptions::default(), || {})?;
//! let best = grid_minima(&grid, &spec.ends, Objective::C3);
//! assert!(best.iter().all(|m| m.value >= figures.c3_km2_s2 - 0.5));
//! # Ok::<(), synodic::Error>(())
//! ```
//!
//! ## Modules
//!
//! | module | what it holds | method |
//! |---|---|---|
//! | [`chart`] | contour charts of a sweep grid, SVG and PNG | marching squares (contour crate), plotters |
//! | [`time`] | epochs in TDB, parsing and printing | hifitime |
//! | [`opportunity`] | bracketing opportunities by Hohmann phasing | Kepler's third law |
//! | [`orbit`] | two-body states, universal-variable propagation, elements from a state | Bate, Mueller & White (1971) ch. 4-5 |
//! | [`ephemeris`] | mean-element bodies, system files, Kepler's equation, celestial and equator frames | Standish, *Keplerian Elements for Approximate Positions of the Major Planets*; IAU working group node convention |
//! | [`lambert`] | Lambert's two-point boundary-value problem | Izzo (2015) |
//! | [`export`] | atomic file writing | temp file, then rename |
//! | [`flyby`] | flyby model, gravity-assist sequence search and survey | patched conics (Curtis 2010 sec. 8.9), dynamic programming on a date grid, Nelder & Mead (1965) |
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
pub mod flyby;
pub mod lambert;
pub mod opportunity;
pub mod orbit;
pub mod study;
pub mod sweep;
pub mod time;
pub mod transfer;
pub mod windows;

pub use error::{Error, Result};
