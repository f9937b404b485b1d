//! Two-body orbits: states, propagation and conic elements.

use nalgebra::Vector3;

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
#[allow(missing_docs)]
#[derive(Debug)]
pub struct Conic {
    pub a_km: f64,
    pub e: f64,
    pub i_deg: f64,
    pub node_deg: f64,
    pub arg_peri_deg: f64,
}
#[allow(missing_docs)]
pub fn conic_from_state(_s: &State, _mu: f64) -> Result<Conic, crate::lambert::LambertError> {
    unimplemented!()
}
