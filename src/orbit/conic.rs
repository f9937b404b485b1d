//! Classical conic elements from a two-body state.

use super::State;
use nalgebra::Vector3;

/// Why [`conic_from_state`] could not return elements.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum ConicError {
    /// An input component is NaN or infinite.
    #[error("non-finite input: {what}")]
    NonFiniteInput {
        /// Which input: "position", "velocity" or "mu".
        what: &'static str,
    },
    /// The gravitational parameter is zero or negative.
    #[error("gravitational parameter must be positive, got {mu_km3_s2} km^3/s^2")]
    NonPositiveMu {
        /// The offending value, km^3/s^2.
        mu_km3_s2: f64,
    },
    /// The position vector has zero length.
    #[error("position vector has zero length")]
    ZeroRadius,
    /// Position and velocity are parallel (rectilinear motion): the orbit
    /// plane, and with it every angle, is undefined.
    #[error("rectilinear motion: angular momentum {h_km2_s} km^2/s is zero to rounding")]
    Rectilinear {
        /// The magnitude of r x v, km^2/s.
        h_km2_s: f64,
    },
}

/// Below this sine of the inclination the orbit counts as equatorial:
/// the node is undefined and [`Conic::node_deg`] is set to 0. 1e-11 is
/// about a thousand times the rounding level of a unit vector.
pub const EQUATORIAL_SIN_I: f64 = 1e-11;

/// Below this eccentricity the orbit counts as circular: the periapsis is
/// undefined and [`Conic::arg_peri_deg`] is set to 0. Chosen like
/// [`EQUATORIAL_SIN_I`].
pub const CIRCULAR_E: f64 = 1e-11;

/// Energies within this fraction of `mu/r` of zero count as parabolic:
/// [`Conic::a_km`] is then `+infinity`.
pub const PARABOLIC_ENERGY: f64 = 1e-14;

/// The conic (classical elements) of a two-body state.
///
/// # Conventions
/// - Angles in degrees; `node_deg`, `arg_peri_deg`, `true_anomaly_deg`
///   in `[0, 360)`, `i_deg` in `[0, 180]`. All angles in the plane are
///   measured in the direction of motion.
/// - Equatorial orbits (`sin i <` [`EQUATORIAL_SIN_I`]): the node is
///   undefined; `node_deg = 0` and the argument of periapsis is measured
///   from the +x axis (it is then the longitude of periapsis).
/// - Circular orbits (`e <` [`CIRCULAR_E`]): the periapsis is undefined;
///   `arg_peri_deg = 0` and the true anomaly is measured from the node
///   (argument of latitude), or from +x if also equatorial (true
///   longitude).
/// - `a_km = -mu / (2 energy)`: positive for ellipses, negative for
///   hyperbolas, `+infinity` for parabolas (|energy| below
///   [`PARABOLIC_ENERGY`] `* mu / r`). `p_km` (semi-latus rectum) is
///   finite in every case.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Conic {
    /// Semi-major axis, km (negative: hyperbola; infinite: parabola).
    pub a_km: f64,
    /// Eccentricity (dimensionless).
    pub e: f64,
    /// Inclination to the frame's xy plane, degrees.
    pub i_deg: f64,
    /// Right ascension (longitude) of the ascending node, degrees.
    pub node_deg: f64,
    /// Argument of periapsis, degrees.
    pub arg_peri_deg: f64,
    /// True anomaly, degrees.
    pub true_anomaly_deg: f64,
    /// Specific angular momentum |r x v|, km^2/s.
    pub h_km2_s: f64,
    /// Specific orbital energy v^2/2 - mu/r, km^2/s^2.
    pub energy_km2_s2: f64,
    /// Semi-latus rectum h^2/mu, km.
    pub p_km: f64,
}

/// Angle from `from` to `to` about the unit normal `n`, degrees in [0, 360).
fn angle_deg(from: &Vector3<f64>, to: &Vector3<f64>, n: &Vector3<f64>) -> f64 {
    let a = from.cross(to).dot(n).atan2(from.dot(to)).to_degrees();
    if a < 0.0 {
        // a + 360 can round up to exactly 360 for tiny negative a.
        let b = a + 360.0;
        if b >= 360.0 {
            0.0
        } else {
            b
        }
    } else {
        a
    }
}

/// Classical conic elements of a state.
///
/// # Method
/// The state-to-elements algorithm of Bate, Mueller & White (1971),
/// *Fundamentals of Astrodynamics*, sec. 2.4 (Curtis, *Orbital Mechanics
/// for Engineering Students*, Algorithm 4.2): `h = r x v`, node vector
/// `n = z x h`, eccentricity vector `e = ((v^2 - mu/r) r - (r.v) v)/mu`,
/// energy `v^2/2 - mu/r`. Deviation: every angle is taken with `atan2`
/// of a sine and cosine in the orbit plane instead of `acos` plus a
/// quadrant test, which keeps full accuracy near 0 and 180 degrees and
/// makes the circular/equatorial conventions of [`Conic`] NaN-free.
///
/// # Units
/// `state` in km, km/s; `mu_km3_s2` in km^3/s^2; output as in [`Conic`].
///
/// # Errors
/// [`ConicError::NonFiniteInput`], [`ConicError::NonPositiveMu`],
/// [`ConicError::ZeroRadius`]; [`ConicError::Rectilinear`] when
/// `|r x v|` is below 1e-14 `|r| |v|`.
pub fn conic_from_state(state: &State, mu_km3_s2: f64) -> Result<Conic, ConicError> {
    let r = state.r_km;
    let v = state.v_km_s;
    if !r.iter().all(|c| c.is_finite()) {
        return Err(ConicError::NonFiniteInput { what: "position" });
    }
    if !v.iter().all(|c| c.is_finite()) {
        return Err(ConicError::NonFiniteInput { what: "velocity" });
    }
    if !mu_km3_s2.is_finite() {
        return Err(ConicError::NonFiniteInput { what: "mu" });
    }
    if mu_km3_s2 <= 0.0 {
        return Err(ConicError::NonPositiveMu { mu_km3_s2 });
    }
    let rn = r.norm();
    if rn <= 0.0 {
        return Err(ConicError::ZeroRadius);
    }
    let hv = r.cross(&v);
    let h = hv.norm();
    if h <= 1e-14 * rn * v.norm() {
        return Err(ConicError::Rectilinear { h_km2_s: h });
    }
    let hu = hv / h;
    let energy = 0.5 * v.norm_squared() - mu_km3_s2 / rn;
    let a_km = if energy.abs() < PARABOLIC_ENERGY * mu_km3_s2 / rn {
        f64::INFINITY
    } else {
        -mu_km3_s2 / (2.0 * energy)
    };
    let ev = ((v.norm_squared() - mu_km3_s2 / rn) * r - r.dot(&v) * v) / mu_km3_s2;
    let e = ev.norm();
    let i_deg = hu.xy().norm().atan2(hu.z).to_degrees();

    // Node direction z x h = (-h_y, h_x, 0).
    let nv = Vector3::new(-hu.y, hu.x, 0.0);
    let nn = nv.norm();
    let (node_deg, node_dir) = if nn < EQUATORIAL_SIN_I {
        (0.0, Vector3::x())
    } else {
        let nd = nv / nn;
        (angle_deg(&Vector3::x(), &nd, &Vector3::z()), nd)
    };
    let (arg_peri_deg, peri_dir) = if e < CIRCULAR_E {
        (0.0, node_dir)
    } else {
        let ed = ev / e;
        (angle_deg(&node_dir, &ed, &hu), ed)
    };
    let true_anomaly_deg = angle_deg(&peri_dir, &(r / rn), &hu);
    Ok(Conic {
        a_km,
        e,
        i_deg,
        node_deg,
        arg_peri_deg,
        true_anomaly_deg,
        h_km2_s: h,
        energy_km2_s2: energy,
        p_km: h * h / mu_km3_s2,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::orbit::propagate;
    use approx::assert_relative_eq;

    /// The orbit of Curtis's Example 5.2 arc, with the Example 5.2
    /// velocity at r1 as input.
    /// Source: Curtis (2010), Orbital Mechanics for Engineering Students,
    /// 2nd ed., Example 5.3 (values from memory): h ~ 80470 km^2/s,
    /// e ~ 0.4335,
    /// i ~ 30.19 deg, RAAN ~ 44.60 deg, a ~ 20000 km.
    #[test]
    fn curtis_example_5_3_from_memory() {
        let s = State {
            r_km: Vector3::new(5000.0, 10000.0, 2100.0),
            v_km_s: Vector3::new(-5.9925, 1.9254, 3.2456),
        };
        let c = conic_from_state(&s, 398_600.0).unwrap();
        // Tolerances are loose because the values are from memory and the
        // input velocity has 5 significant figures: 1e-3 relative for h
        // and e, 0.02 deg for the angles, 0.5 % for a (printed "20000").
        assert_relative_eq!(c.h_km2_s, 80_470.0, max_relative = 1e-3);
        assert_relative_eq!(c.e, 0.4335, max_relative = 1e-3);
        assert_relative_eq!(c.i_deg, 30.19, epsilon = 0.02);
        assert_relative_eq!(c.node_deg, 44.60, epsilon = 0.02);
        assert_relative_eq!(c.a_km, 20_000.0, max_relative = 5e-3);
    }

    /// Circular equatorial orbits follow the documented conventions:
    /// node and argument of periapsis 0, true anomaly = true longitude.
    /// Source: definitions of the conventions in [`Conic`]; circular speed
    /// sqrt(mu/r) (BMW 1971, sec. 1.8).
    #[test]
    fn circular_equatorial_conventions() {
        let mu = 398_600.441_8;
        let r = 8000.0;
        let lon = 123.0_f64.to_radians();
        for sense in [1.0, -1.0] {
            let s = State {
                r_km: Vector3::new(r * lon.cos(), r * lon.sin(), 0.0),
                v_km_s: sense * (mu / r).sqrt() * Vector3::new(-lon.sin(), lon.cos(), 0.0),
            };
            let c = conic_from_state(&s, mu).unwrap();
            assert!(c.e < 1e-13, "e = {}", c.e);
            assert_relative_eq!(c.a_km, r, max_relative = 1e-12);
            assert_relative_eq!(c.node_deg, 0.0, epsilon = 1e-12);
            assert_relative_eq!(c.arg_peri_deg, 0.0, epsilon = 1e-12);
            // Prograde: i = 0 and angle measured counter-clockwise from +x;
            // retrograde: i = 180 and the angle is measured along the
            // (clockwise) motion, so it is 360 - 123.
            // Tolerance: rounding of the vectors, ~1e-13 deg.
            if sense > 0.0 {
                assert_relative_eq!(c.i_deg, 0.0, epsilon = 1e-12);
                assert_relative_eq!(c.true_anomaly_deg, 123.0, max_relative = 1e-12);
            } else {
                assert_relative_eq!(c.i_deg, 180.0, max_relative = 1e-12);
                assert_relative_eq!(c.true_anomaly_deg, 237.0, max_relative = 1e-12);
            }
        }
    }

    /// Parabolic and hyperbolic states: a is +infinity / negative, and
    /// p = a (1 - e^2) where a is finite.
    /// Source: conic relations, BMW (1971), sec. 1.5-1.6.
    #[test]
    fn parabola_and_hyperbola() {
        let mu: f64 = 398_600.441_8;
        let r = Vector3::<f64>::new(7000.0, 100.0, -300.0);
        let vesc = (2.0 * mu / r.norm()).sqrt();
        let dir = Vector3::new(0.1, 1.0, 0.4).normalize();
        let par = conic_from_state(
            &State {
                r_km: r,
                v_km_s: vesc * dir,
            },
            mu,
        )
        .unwrap();
        assert!(par.a_km.is_infinite() && par.a_km > 0.0);
        // Tolerance: e of an escape-speed state is 1 to rounding.
        assert_relative_eq!(par.e, 1.0, max_relative = 1e-12);
        let hyp = conic_from_state(
            &State {
                r_km: r,
                v_km_s: 1.5 * vesc * dir,
            },
            mu,
        )
        .unwrap();
        assert!(hyp.a_km < 0.0 && hyp.e > 1.0);
        assert_relative_eq!(
            hyp.p_km,
            hyp.a_km * (1.0 - hyp.e * hyp.e),
            max_relative = 1e-12
        );
    }

    /// Elements are constant along the arc (except the true anomaly), and
    /// the true anomaly advances as the propagation says.
    /// Source: two-body conservation laws (BMW 1971, sec. 1.4-1.5).
    #[test]
    fn elements_constant_under_propagation() {
        let mu = 398_600.441_8;
        let s0 = State {
            r_km: Vector3::new(-6045.0, -3490.0, 2500.0),
            v_km_s: Vector3::new(-3.457, 6.618, 2.533),
        };
        let c0 = conic_from_state(&s0, mu).unwrap();
        let s1 = propagate(&s0, 4000.0, mu).unwrap();
        let c1 = conic_from_state(&s1, mu).unwrap();
        // Tolerance: 1e-10, rounding of the propagation (1e-12) amplified
        // through the element formulas.
        assert_relative_eq!(c1.a_km, c0.a_km, max_relative = 1e-10);
        assert_relative_eq!(c1.e, c0.e, max_relative = 1e-10);
        assert_relative_eq!(c1.i_deg, c0.i_deg, max_relative = 1e-10);
        assert_relative_eq!(c1.node_deg, c0.node_deg, max_relative = 1e-10);
        assert_relative_eq!(c1.arg_peri_deg, c0.arg_peri_deg, max_relative = 1e-9);
        assert!((c1.true_anomaly_deg - c0.true_anomaly_deg).abs() > 1.0);
        // Radius from the conic equation r = p / (1 + e cos nu).
        let nu = c1.true_anomaly_deg.to_radians();
        assert_relative_eq!(
            s1.r_km.norm(),
            c1.p_km / (1.0 + c1.e * nu.cos()),
            max_relative = 1e-10
        );
    }

    /// Bad input gives typed errors.
    #[test]
    fn bad_input_is_typed() {
        let r = Vector3::new(7000.0, 0.0, 0.0);
        let radial = State {
            r_km: r,
            v_km_s: Vector3::new(3.0, 0.0, 0.0),
        };
        assert!(matches!(
            conic_from_state(&radial, 398_600.0),
            Err(ConicError::Rectilinear { .. })
        ));
        let ok = State {
            r_km: r,
            v_km_s: Vector3::new(0.0, 7.0, 0.0),
        };
        assert_eq!(
            conic_from_state(&ok, -1.0),
            Err(ConicError::NonPositiveMu { mu_km3_s2: -1.0 })
        );
        let nan = State {
            r_km: Vector3::new(f64::NAN, 0.0, 0.0),
            ..ok
        };
        assert_eq!(
            conic_from_state(&nan, 1.0),
            Err(ConicError::NonFiniteInput { what: "position" })
        );
    }
}
