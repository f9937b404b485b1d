//! Mean orbital elements with secular rates, and the state they give.
//!
//! A body of a system ([`super::Body`]) carries [`MeanElements`] at the
//! system epoch and [`ElementRates`] per Julian century. [`MeanElements::at`]
//! applies the rates; [`MeanElements::state`] turns elements into a position
//! and velocity with [`super::kepler`].

use nalgebra::Vector3;

use super::kepler::{self, KeplerError};
use crate::orbit::State;

/// Seconds in a Julian century (36525 days of 86400 s).
const JULIAN_CENTURY_S: f64 = 36525.0 * 86400.0;

/// Mean elements of an orbit at one epoch, in the system frame.
///
/// The angles are the classical set of planetary tables: longitudes are
/// measured from the frame's x axis, with the longitude of periapsis
/// `peri_deg = node_deg + argument of periapsis` ("dog-leg" angle) and the
/// mean longitude `mean_lon_deg = peri_deg + mean anomaly`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MeanElements {
    /// Semi-major axis, km.
    pub a_km: f64,
    /// Eccentricity (dimensionless, 0 <= e < 1).
    pub e: f64,
    /// Inclination to the frame's reference plane, degrees.
    pub i_deg: f64,
    /// Longitude of the ascending node, degrees.
    pub node_deg: f64,
    /// Longitude of periapsis, degrees.
    pub peri_deg: f64,
    /// Mean longitude, degrees.
    pub mean_lon_deg: f64,
}

/// Secular rates of [`MeanElements`], per Julian century (36525 days).
///
/// Field names mirror [`MeanElements`]; each is that element's rate:
/// `a_km` in km per century, `e` per century, the angles in degrees per
/// century.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct ElementRates {
    /// Rate of the semi-major axis, km per Julian century.
    pub a_km: f64,
    /// Rate of the eccentricity, per Julian century.
    pub e: f64,
    /// Rate of the inclination, degrees per Julian century.
    pub i_deg: f64,
    /// Rate of the longitude of the ascending node, degrees per Julian century.
    pub node_deg: f64,
    /// Rate of the longitude of periapsis, degrees per Julian century.
    pub peri_deg: f64,
    /// Rate of the mean longitude, degrees per Julian century.
    pub mean_lon_deg: f64,
}

/// The angle that places the periapsis, as a system file gives it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PeriapsisAngle {
    /// Longitude of periapsis (node + argument of periapsis, the "dog-leg"
    /// angle of planetary tables): key `lon_peri_deg`.
    Longitude,
    /// Argument of periapsis, from the ascending node: key `arg_peri_deg`.
    Argument,
}

/// The angle that places the body on its orbit at the epoch, as a system
/// file gives it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum EpochAngle {
    /// Mean longitude (longitude of periapsis + mean anomaly): key
    /// `mean_lon_deg`.
    MeanLongitude,
    /// Mean anomaly at the epoch: key `mean_anom_deg`.
    MeanAnomaly,
}

/// Which element set a body's file entry used; [`MeanElements`] always
/// holds the longitudes, the other angles follow
/// ([`MeanElements::arg_peri_deg`], [`MeanElements::mean_anom_deg`]).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct ElementSet {
    /// How the periapsis was given.
    pub periapsis: PeriapsisAngle,
    /// How the position at the epoch was given.
    pub epoch_angle: EpochAngle,
}

impl ElementSet {
    /// The longitudes of planetary tables (`lon_peri_deg`, `mean_lon_deg`).
    pub const LONGITUDES: ElementSet = ElementSet {
        periapsis: PeriapsisAngle::Longitude,
        epoch_angle: EpochAngle::MeanLongitude,
    };

    /// The system-file keys of the two angles, e.g.
    /// `("lon_peri_deg", "mean_lon_deg")`.
    pub fn keys(&self) -> (&'static str, &'static str) {
        (
            match self.periapsis {
                PeriapsisAngle::Longitude => "lon_peri_deg",
                PeriapsisAngle::Argument => "arg_peri_deg",
            },
            match self.epoch_angle {
                EpochAngle::MeanLongitude => "mean_lon_deg",
                EpochAngle::MeanAnomaly => "mean_anom_deg",
            },
        )
    }
}

/// The mean motion of a two-body orbit, by Kepler's third law.
///
/// # Method
/// `n = sqrt(mu / a^3)` (Kepler's third law; e.g. Vallado 2013,
/// *Fundamentals of Astrodynamics and Applications*, eq. 1-29), converted to
/// degrees per Julian century.
///
/// # Units
/// `a_km` km, `mu_km3_s2` km^3/s^2; result in degrees per Julian century.
/// Non-positive inputs give NaN.
pub fn mean_motion_deg_per_century(a_km: f64, mu_km3_s2: f64) -> f64 {
    (mu_km3_s2 / (a_km * a_km * a_km)).sqrt() * JULIAN_CENTURY_S * (180.0 / std::f64::consts::PI)
}

impl MeanElements {
    /// Argument of periapsis, `peri_deg - node_deg`, degrees in [0, 360).
    pub fn arg_peri_deg(&self) -> f64 {
        (self.peri_deg - self.node_deg).rem_euclid(360.0)
    }

    /// Mean anomaly, `mean_lon_deg - peri_deg`, degrees in [0, 360).
    pub fn mean_anom_deg(&self) -> f64 {
        (self.mean_lon_deg - self.peri_deg).rem_euclid(360.0)
    }

    /// The elements `centuries` Julian centuries after their epoch:
    /// each element plus its rate times `centuries`.
    ///
    /// # Method
    /// Linear secular terms, as in Standish, *Keplerian Elements for
    /// Approximate Positions of the Major Planets* (JPL Solar System
    /// Dynamics), step 1: `element = element0 + rate * T`.
    ///
    /// # Units
    /// `centuries` in Julian centuries (36525 days) from the elements'
    /// epoch; the units of each field are kept.
    pub fn at(&self, rates: &ElementRates, centuries: f64) -> MeanElements {
        MeanElements {
            a_km: self.a_km + rates.a_km * centuries,
            e: self.e + rates.e * centuries,
            i_deg: self.i_deg + rates.i_deg * centuries,
            node_deg: self.node_deg + rates.node_deg * centuries,
            peri_deg: self.peri_deg + rates.peri_deg * centuries,
            mean_lon_deg: self.mean_lon_deg + rates.mean_lon_deg * centuries,
        }
    }

    /// Position and velocity on the orbit these elements describe.
    ///
    /// # Method
    /// Standish, *Keplerian Elements for Approximate Positions of the Major
    /// Planets* (JPL Solar System Dynamics), steps 2-6: argument of periapsis
    /// `omega = peri - node`, mean anomaly `M = L - peri` (reduced to
    /// (-180, 180] deg), eccentric anomaly `E` from Kepler's equation
    /// ([`kepler::eccentric_anomaly`]), position in the orbital plane
    /// `x' = a (cos E - e)`, `y' = a sqrt(1 - e^2) sin E`, then the rotation
    /// `Rz(node) Rx(i) Rz(omega)` into the system frame.
    ///
    /// Velocity (Standish gives positions only): the two-body velocity on
    /// the same ellipse, `dE/dt = n / (1 - e cos E)` with
    /// `n = sqrt(mu / a^3)` from the central body's GM, so
    /// `vx' = -a sin E dE/dt`, `vy' = a sqrt(1 - e^2) cos E dE/dt`. This is
    /// the osculating two-body velocity, consistent with vis-viva and the
    /// patched-conic model; it ignores the slow drift of the elements
    /// (rates), which changes velocity by far less than the model's error.
    ///
    /// # Units
    /// `mu_km3_s2` in km^3/s^2. The state is in km and km/s, in the
    /// elements' frame, centred on the central body.
    ///
    /// # Errors
    /// [`StateError::Kepler`] if `e` is outside [0, 1) or an angle is not
    /// finite; [`StateError::SemiMajorAxis`] unless `a_km > 0`;
    /// [`StateError::Mu`] unless `mu_km3_s2 > 0`; [`StateError::NonFinite`]
    /// if the state overflows.
    pub fn state(&self, mu_km3_s2: f64) -> Result<State, StateError> {
        if !(self.a_km > 0.0 && self.a_km.is_finite()) {
            return Err(StateError::SemiMajorAxis { a_km: self.a_km });
        }
        if !(mu_km3_s2 > 0.0 && mu_km3_s2.is_finite()) {
            return Err(StateError::Mu { mu_km3_s2 });
        }
        let a = self.a_km;
        let e = self.e;
        // Reduce the mean anomaly in degrees first: exact for the large
        // values that L + rate * T reaches.
        let mut m_deg = (self.mean_lon_deg - self.peri_deg).rem_euclid(360.0);
        if m_deg > 180.0 {
            m_deg -= 360.0;
        }
        let ecc = kepler::eccentric_anomaly(m_deg.to_radians(), e)?;
        let (sin_e, cos_e) = ecc.sin_cos();
        let root = (1.0 - e * e).sqrt();
        let n_rad_s = (mu_km3_s2 / (a * a * a)).sqrt();
        let e_dot = n_rad_s / (1.0 - e * cos_e);
        let r_plane = Vector3::new(a * (cos_e - e), a * root * sin_e, 0.0);
        let v_plane = Vector3::new(-a * sin_e * e_dot, a * root * cos_e * e_dot, 0.0);

        let omega = (self.peri_deg - self.node_deg).to_radians();
        let (so, co) = omega.sin_cos();
        let (si, ci) = self.i_deg.to_radians().sin_cos();
        let (sn, cn) = self.node_deg.to_radians().sin_cos();
        // Columns: the orbital-plane x (periapsis) and y axes in the frame.
        let p = Vector3::new(cn * co - sn * so * ci, sn * co + cn * so * ci, so * si);
        let q = Vector3::new(-cn * so - sn * co * ci, -sn * so + cn * co * ci, co * si);
        let state = State {
            r_km: p * r_plane.x + q * r_plane.y,
            v_km_s: p * v_plane.x + q * v_plane.y,
        };
        if state
            .r_km
            .iter()
            .chain(state.v_km_s.iter())
            .all(|x| x.is_finite())
        {
            Ok(state)
        } else {
            Err(StateError::NonFinite)
        }
    }
}

/// Why elements give no state.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum StateError {
    /// Kepler's equation failed (eccentricity out of range, non-finite angle).
    #[error(transparent)]
    Kepler(#[from] KeplerError),
    /// The semi-major axis is not positive and finite (e.g. rates
    /// extrapolated far beyond their validity).
    #[error("semi-major axis must be positive, got {a_km} km")]
    SemiMajorAxis {
        /// The semi-major axis, km.
        a_km: f64,
    },
    /// The central body's GM is not positive and finite.
    #[error("GM must be positive, got {mu_km3_s2} km^3/s^2")]
    Mu {
        /// The GM, km^3/s^2.
        mu_km3_s2: f64,
    },
    /// An element was not finite, so the state is not.
    #[error("elements are not finite")]
    NonFinite,
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// GM of the Sun, km^3/s^2. Source: IAU 2009 system of astronomical
    /// constants (TDB-compatible value).
    const MU_SUN: f64 = 1.32712440041e11;

    fn sample() -> MeanElements {
        // An arbitrary inclined eccentric test orbit (not a real body).
        MeanElements {
            a_km: 2.0e8,
            e: 0.3,
            i_deg: 11.0,
            node_deg: 40.0,
            peri_deg: 130.0,
            mean_lon_deg: 75.0,
        }
    }

    /// Invariant: at M = 0 the body is at periapsis, r = a (1 - e), and the
    /// velocity there is the vis-viva value sqrt(mu (1 + e) / (a (1 - e))).
    /// Tolerance 1e-12 relative: a few rounding steps.
    #[test]
    fn periapsis_distance_and_speed() {
        let mut el = sample();
        el.mean_lon_deg = el.peri_deg;
        let s = el.state(MU_SUN).expect("valid");
        assert_relative_eq!(s.r_km.norm(), el.a_km * (1.0 - el.e), max_relative = 1e-12);
        let v_peri = (MU_SUN * (1.0 + el.e) / (el.a_km * (1.0 - el.e))).sqrt();
        assert_relative_eq!(s.v_km_s.norm(), v_peri, max_relative = 1e-12);
        assert_relative_eq!(
            s.r_km.dot(&s.v_km_s),
            0.0,
            epsilon = 1e-12 * s.r_km.norm() * v_peri
        );
    }

    /// Invariant: the angular momentum direction is the orbit normal, so
    /// h_z / |h| = cos i, and the node line points to longitude `node_deg`
    /// (ascending node = z x h direction). Tolerance 1e-12 (rounding).
    #[test]
    fn orientation_matches_angles() {
        let el = sample();
        let s = el.state(MU_SUN).expect("valid");
        let h = s.r_km.cross(&s.v_km_s);
        assert_relative_eq!(h.z / h.norm(), el.i_deg.to_radians().cos(), epsilon = 1e-12);
        let node = Vector3::z().cross(&h);
        assert_relative_eq!(
            node.y.atan2(node.x).to_degrees(),
            el.node_deg,
            epsilon = 1e-10
        );
    }

    /// Invariant: the velocity is the time derivative of the position on the
    /// ellipse (central difference over +/- 60 s, mean longitude advanced at
    /// n; truncation error ~ (60 s)^2 / P^2 ~ 1e-13, tolerance 1e-8 for
    /// cancellation in the difference).
    #[test]
    fn velocity_is_derivative_of_position() {
        let el = sample();
        let n = mean_motion_deg_per_century(el.a_km, MU_SUN);
        let rates = ElementRates {
            mean_lon_deg: n,
            ..ElementRates::default()
        };
        let dt_s = 60.0;
        let dt_c = dt_s / JULIAN_CENTURY_S;
        let before = el.at(&rates, -dt_c).state(MU_SUN).expect("valid");
        let after = el.at(&rates, dt_c).state(MU_SUN).expect("valid");
        let now = el.state(MU_SUN).expect("valid");
        let v_num = (after.r_km - before.r_km) / (2.0 * dt_s);
        assert_relative_eq!(v_num, now.v_km_s, max_relative = 1e-8);
    }

    /// Source: Kepler's third law n = sqrt(mu / a^3); for a = 1 au
    /// (149597870.7 km, IAU 2012 B2) and the Sun's GM the mean motion is
    /// about 35999.4 deg per century, close to Standish Table 1's Earth-Moon
    /// rate 35999.37244981. Tolerance 5e-6 relative (1.5e-6 observed):
    /// Standish's a is 1.00000261 au (3.9e-6 in n) and the Earth-Moon
    /// system's own mass adds 3e-6 to mu (1.5e-6 in n, the other way).
    #[test]
    fn mean_motion_of_one_au() {
        let n = mean_motion_deg_per_century(149_597_870.7, MU_SUN);
        assert_relative_eq!(n, 35999.37244981, max_relative = 5e-6);
    }

    proptest::proptest! {
        /// Invariants of any ellipse (vis-viva and the conic's angular
        /// momentum): energy v^2/2 - mu/r = -mu/(2a) and
        /// |r x v| = sqrt(mu a (1 - e^2)), and r between a(1-e) and a(1+e).
        /// Tolerance 1e-11 relative: rounding, amplified at most ~1/(1-e)
        /// for e <= 0.95 near periapsis.
        #[test]
        fn state_obeys_vis_viva(
            a_km in 1.0e6f64..1.0e10,
            e in 0.0f64..0.95,
            i_deg in 0.0f64..180.0,
            node_deg in -360.0f64..360.0,
            peri_deg in -360.0f64..360.0,
            mean_lon_deg in -1.0e5f64..1.0e5,
        ) {
            let el = MeanElements { a_km, e, i_deg, node_deg, peri_deg, mean_lon_deg };
            let s = el.state(MU_SUN).expect("valid elements");
            let r = s.r_km.norm();
            let energy = 0.5 * s.v_km_s.norm_squared() - MU_SUN / r;
            let want = -MU_SUN / (2.0 * a_km);
            proptest::prop_assert!(((energy - want) / want).abs() < 1e-11);
            let h = s.r_km.cross(&s.v_km_s).norm();
            let h_want = (MU_SUN * a_km * (1.0 - e * e)).sqrt();
            proptest::prop_assert!(((h - h_want) / h_want).abs() < 1e-11);
            proptest::prop_assert!(r >= a_km * (1.0 - e) * (1.0 - 1e-12));
            proptest::prop_assert!(r <= a_km * (1.0 + e) * (1.0 + 1e-12));
        }
    }

    #[test]
    fn degenerate_elements_are_errors() {
        let mut el = sample();
        el.a_km = -1.0;
        assert!(matches!(
            el.state(MU_SUN),
            Err(StateError::SemiMajorAxis { .. })
        ));
        let mut el = sample();
        el.e = 1.0;
        assert!(matches!(el.state(MU_SUN), Err(StateError::Kepler(_))));
        assert!(matches!(sample().state(0.0), Err(StateError::Mu { .. })));
        let mut el = sample();
        el.i_deg = f64::NAN;
        assert!(el.state(MU_SUN).is_err());
    }
}
