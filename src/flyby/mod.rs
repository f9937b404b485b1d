//! Gravity-assist sequences: the flyby model, a date-grid search over a
//! sequence of bodies, and a survey of sequences.
//!
//! - [`model`]: one flyby in patched conics, unpowered or powered (one
//!   impulse at periapsis), with its turn angle, periapsis altitude and
//!   delta-v.

mod error;
pub mod model;

pub use error::FlybyError;
pub use model::{evaluate, FlybyBody, FlybyFigures, Verdict};
