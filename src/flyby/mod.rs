//! Gravity-assist sequences: the flyby model, a date-grid search over a
//! sequence of bodies, and a survey of sequences.
//!
//! - [`model`]: one flyby in patched conics, unpowered or powered (one
//!   impulse at periapsis), with its turn angle, periapsis altitude and
//!   delta-v (Curtis 2010 sec. 8.9; the periapsis-impulse model).
//! - [`search_sequence`]: a sequence FROM, VIA..., TO searched on a date
//!   grid (each leg solved once per pair of dates, legs matched at the
//!   flyby dates by dynamic programming), then refined on continuous
//!   dates (Nelder-Mead).
//! - [`survey`]: every sequence of up to K flybys drawn from a list of
//!   bodies, searched and ranked by the objective.
//!
//! Data flows one way: `spec` (what is asked, checked into a plan) ->
//! `grid` (the date grid) -> `trajectory` (continuous refinement) ->
//! `search` -> `survey`; `model` is used by `grid` and `trajectory`.
//!
//! **Caution.** Patched conics with mean-element ephemerides: preliminary
//! design figures only.

mod error;
mod grid;
pub mod model;
mod search;
mod spec;
mod survey;
#[cfg(test)]
mod tests;
mod trajectory;

pub use error::FlybyError;
pub use grid::GridStats;
pub use model::{evaluate, FlybyBody, FlybyFigures, Verdict};
pub use search::{search_sequence, SearchResult};
pub use spec::{
    default_tof_days, LaunchTerm, SequenceSpec, DEFAULT_MAX_FLYBY_DV_KM_S, DEFAULT_MIN_ALTITUDE_KM,
    MAX_ARCS, TOF_HOHMANN_RANGE, TOF_RETURN_RANGE,
};
pub use survey::{sequences, survey, SurveyRow, SurveySpec, SurveyTable, MAX_SEQUENCES};
pub use trajectory::Trajectory;
