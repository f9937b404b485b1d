//! Two-body orbits: states, propagation and conic elements.
//!
//! [`propagate`] moves a [`State`] along its conic with universal
//! variables; [`conic_from_state`] reads the classical elements off a
//! state. The Lambert solver ([`crate::lambert`]) is checked against both.

use nalgebra::Vector3;

mod conic;
mod propagate;

pub use conic::{
    conic_from_state, Conic, ConicError, CIRCULAR_E, EQUATORIAL_SIN_I, PARABOLIC_ENERGY,
};
pub use propagate::{propagate, PropagateError};

/// A position and velocity in an inertial frame.
///
/// # Units
/// `r_km` in km, `v_km_s` in km/s; the frame is the caller's (for bodies
/// of a system, the system's reference frame centred on the central body).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct State {
    /// Position, km.
    pub r_km: Vector3<f64>,
    /// Velocity, km/s.
    pub v_km_s: Vector3<f64>,
}
