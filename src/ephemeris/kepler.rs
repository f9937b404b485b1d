//! Kepler's equation for elliptic orbits, `M = E - e sin E`.
//!
//! [`eccentric_anomaly`] turns a mean anomaly into an eccentric anomaly;
//! [`mean_anomaly`] goes back. The ephemeris ([`super::elements`]) calls
//! the solver once per body state.

use std::f64::consts::{PI, TAU};

/// Convergence tolerance on the residual `|E - e sin E - M|`, radians.
///
/// 1e-14 rad is about 50 ulp at pi: the smallest tolerance that double
/// precision can meet for every `M` in (-pi, pi] without stalling. At
/// 1 au it is a position error of about 1.5 micrometres times
/// `1 / (1 - e cos E)`.
pub const KEPLER_TOLERANCE_RAD: f64 = 1.0e-14;

/// Iteration cap. The safeguarded iteration below halves its bracket at
/// worst, and a bracket of width at most 1 rad shrinks below 1e-16 rad in
/// 54 halvings; with Halley steps it converges in 2 to 5 iterations for
/// e <= 0.99 (the tests count them). 100 can therefore only be reached
/// through a defect, reported as [`KeplerError::NoConvergence`].
pub const KEPLER_MAX_ITERATIONS: u32 = 100;

/// Why Kepler's equation was not solved.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum KeplerError {
    /// The eccentricity is not in [0, 1) (this solver handles ellipses only).
    #[error("eccentricity must be in [0, 1) for Kepler's equation, got {e}")]
    Eccentricity {
        /// The eccentricity given.
        e: f64,
    },
    /// The mean anomaly is NaN or infinite.
    #[error("mean anomaly must be finite, got {mean_anomaly_rad} rad")]
    NonFinite {
        /// The mean anomaly given, radians.
        mean_anomaly_rad: f64,
    },
    /// The iteration cap was reached (a defect: see [`KEPLER_MAX_ITERATIONS`]).
    #[error(
        "Kepler's equation did not converge in {iterations} iterations: residual {residual_rad} rad, tolerance {tolerance_rad} rad"
    )]
    NoConvergence {
        /// Iterations used.
        iterations: u32,
        /// Last residual `|E - e sin E - M|`, radians.
        residual_rad: f64,
        /// Tolerance asked for, radians.
        tolerance_rad: f64,
    },
}

/// Solves Kepler's equation `M = E - e sin E` for the eccentric anomaly `E`.
///
/// # Method
/// - Reduce `M` to (-pi, pi] and use the symmetry `E(-M) = -E(M)`, so that
///   `0 <= M <= pi`; there `E` lies in the bracket `[M, min(M + e, pi)]`
///   because `E - M = e sin E` is in `[0, e]`.
/// - Starter: Danby (1988), *Fundamentals of Celestial Mechanics*, 2nd ed.,
///   Willmann-Bell, section 6.6: `E0 = M + 0.85 e` for `M >= 0` (the
///   constant 0.85 is from memory of that section).
/// - Iteration: Halley's method (third order), the correction
///   `dE = -f / (f' - f f'' / (2 f'))` with `f = E - e sin E - M`,
///   `f' = 1 - e cos E`, `f'' = e sin E` (Danby 1988, section 6.6, also
///   Vallado 2013, *Fundamentals of Astrodynamics and Applications*, 4th
///   ed., section 2.2 for the Newton form). Safeguard: `f` is increasing,
///   so each iterate's sign of `f` shrinks the bracket; a Halley step that
///   leaves the bracket is replaced by the Newton step `-f / f'` (which,
///   `f` being convex on [0, pi], cannot overshoot from above), and a
///   Newton step that leaves it by bisection. This makes convergence
///   certain for all `0 <= e < 1`, including `e -> 1` near periapsis where
///   plain Newton overshoots.
/// - Stop when `|f| <= KEPLER_TOLERANCE_RAD` or the bracket is narrower
///   than the spacing of doubles.
///
/// # Units
/// `mean_anomaly_rad` and the result in radians. The result is on the same
/// revolution as the input: `E = 2 pi k + E0` where `M = 2 pi k + M0` with
/// `M0, E0` in (-pi, pi].
///
/// # Errors
/// [`KeplerError::Eccentricity`] unless `0 <= e < 1` (NaN included);
/// [`KeplerError::NonFinite`] for a NaN or infinite mean anomaly;
/// [`KeplerError::NoConvergence`] only through a defect.
///
/// # Properties
/// `mean_anomaly(E, e)` equals `M` to within `KEPLER_TOLERANCE_RAD` plus
/// the rounding of the reduction of `M` (a few ulp of `M`).
///
/// # Example
/// ```
/// use synodic::ephemeris::kepler::{eccentric_anomaly, mean_anomaly};
/// let e_rad = eccentric_anomaly(1.0, 0.3)?;
/// assert!((mean_anomaly(e_rad, 0.3) - 1.0).abs() < 1e-13);
/// # Ok::<(), synodic::ephemeris::kepler::KeplerError>(())
/// ```
pub fn eccentric_anomaly(mean_anomaly_rad: f64, e: f64) -> Result<f64, KeplerError> {
    solve(mean_anomaly_rad, e).map(|(ecc, _)| ecc)
}

/// As [`eccentric_anomaly`], also returning the iterations used.
///
/// # Units
/// Radians in and out.
///
/// # Errors
/// As [`eccentric_anomaly`].
pub fn eccentric_anomaly_with_iterations(
    mean_anomaly_rad: f64,
    e: f64,
) -> Result<(f64, u32), KeplerError> {
    solve(mean_anomaly_rad, e)
}

/// The mean anomaly of an eccentric anomaly: `M = E - e sin E`.
///
/// # Method
/// Kepler's equation itself (e.g. Vallado 2013, eq. 2-4).
///
/// # Units
/// Radians in and out. No checks: `e` outside [0, 1) gives the formula's
/// value.
pub fn mean_anomaly(eccentric_anomaly_rad: f64, e: f64) -> f64 {
    eccentric_anomaly_rad - e * eccentric_anomaly_rad.sin()
}

fn solve(m_rad: f64, e: f64) -> Result<(f64, u32), KeplerError> {
    if !(0.0..1.0).contains(&e) {
        return Err(KeplerError::Eccentricity { e });
    }
    if !m_rad.is_finite() {
        return Err(KeplerError::NonFinite {
            mean_anomaly_rad: m_rad,
        });
    }
    // Reduce to (-pi, pi]; `turns` whole revolutions are added back at the end.
    let mut turns = (m_rad / TAU).round();
    let mut m0 = m_rad - turns * TAU;
    if m0 <= -PI {
        m0 += TAU;
        turns -= 1.0;
    }
    let sign = if m0 < 0.0 { -1.0 } else { 1.0 };
    let m = m0.abs();

    // Bracket [lo, hi] with f(lo) <= 0 <= f(hi).
    let mut lo = m;
    let mut hi = (m + e).min(PI);
    // Danby's starter, clamped into the bracket.
    let mut ecc = (m + 0.85 * e).clamp(lo, hi);
    let mut residual = f64::INFINITY;
    for iteration in 1..=KEPLER_MAX_ITERATIONS {
        let (s, c) = ecc.sin_cos();
        let f = ecc - e * s - m;
        residual = f.abs();
        if residual <= KEPLER_TOLERANCE_RAD {
            return Ok((sign * ecc + turns * TAU, iteration));
        }
        if f < 0.0 {
            lo = ecc;
        } else {
            hi = ecc;
        }
        if hi - lo <= f64::EPSILON * hi.max(1.0) {
            // The root is pinned down to the resolution of doubles.
            return Ok((sign * ecc + turns * TAU, iteration));
        }
        let f1 = 1.0 - e * c;
        let f2 = e * s;
        let newton = -f / f1;
        let halley = -f / (f1 + 0.5 * newton * f2);
        let inside = |x: f64| x >= lo && x <= hi;
        ecc = if inside(ecc + halley) {
            ecc + halley
        } else if inside(ecc + newton) {
            ecc + newton
        } else {
            0.5 * (lo + hi)
        };
    }
    Err(KeplerError::NoConvergence {
        iterations: KEPLER_MAX_ITERATIONS,
        residual_rad: residual,
        tolerance_rad: KEPLER_TOLERANCE_RAD,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;
    use proptest::prelude::*;

    /// Source: Vallado (2013), *Fundamentals of Astrodynamics and
    /// Applications*, 4th ed., Example 2-1 (from memory): M = 235.4 deg,
    /// e = 0.4 gives E = 220.512074767522 deg. Tolerance 1e-9 deg: the
    /// printed digits, loosened because recalled from memory.
    #[test]
    fn vallado_example_2_1_from_memory() {
        let m = 235.4_f64.to_radians();
        let ecc = eccentric_anomaly(m, 0.4).expect("valid");
        // The solver returns E on the revolution of the reduced M (-124.6 deg).
        let ecc_deg = ecc.to_degrees().rem_euclid(360.0);
        assert_relative_eq!(ecc_deg, 220.512074767522, epsilon = 1e-9);
    }

    /// Invariant: circular orbits have E = M exactly (to the tolerance).
    #[test]
    fn circular_orbit_e_equals_m() {
        for m in [-3.0, -0.5, 0.0, 0.1, 1.0, 3.0, PI] {
            assert_relative_eq!(
                eccentric_anomaly(m, 0.0).expect("valid"),
                m,
                epsilon = 1e-14
            );
        }
    }

    /// Invariant: the solution keeps the revolution count of M.
    #[test]
    fn keeps_revolution() {
        let m = 10.0 * TAU + 1.0;
        let ecc = eccentric_anomaly(m, 0.5).expect("valid");
        assert!(ecc > 10.0 * TAU && ecc < 11.0 * TAU, "{ecc}");
        // Tolerance: KEPLER_TOLERANCE_RAD plus rounding of 63 rad (~1e-14).
        assert_relative_eq!(mean_anomaly(ecc, 0.5), m, epsilon = 3e-14);
    }

    /// Convergence speed: Halley from Danby's starter needs few iterations
    /// (a regression guard on the method, not a published value).
    #[test]
    fn converges_quickly() {
        let mut worst = 0;
        let tiny = [1e-300, 1e-20, 1e-12, 1e-6, -1e-9];
        for i in 0..=(200 + tiny.len()) {
            let m = match i.checked_sub(201) {
                Some(j) => tiny[j],
                None => -PI + TAU * f64::from(i as u32) / 200.0,
            };
            for e in [0.0, 0.1, 0.5, 0.9, 0.99] {
                let (_, n) = eccentric_anomaly_with_iterations(m, e).expect("valid");
                worst = worst.max(n);
            }
        }
        assert!(worst <= 8, "worst case {worst} iterations");
    }

    #[test]
    fn bad_eccentricity_and_anomaly_are_errors() {
        for e in [-0.1, 1.0, 1.5, f64::NAN, f64::INFINITY] {
            let err = eccentric_anomaly(1.0, e).expect_err("out of range");
            assert!(matches!(err, KeplerError::Eccentricity { .. }));
        }
        assert_eq!(
            eccentric_anomaly(1.0, 1.2).expect_err("e > 1").to_string(),
            "eccentricity must be in [0, 1) for Kepler's equation, got 1.2"
        );
        assert!(matches!(
            eccentric_anomaly(f64::NAN, 0.1),
            Err(KeplerError::NonFinite { .. })
        ));
        assert!(matches!(
            eccentric_anomaly(f64::NEG_INFINITY, 0.1),
            Err(KeplerError::NonFinite { .. })
        ));
    }

    proptest! {
        /// Round trip M -> E -> M over e in [0, 0.99] and M over several
        /// revolutions. Tolerance: KEPLER_TOLERANCE_RAD plus the rounding of
        /// reducing |M| <= 20 rad (about 4 ulp of 20, ~1.5e-14).
        #[test]
        fn mean_eccentric_mean_round_trip(m in -20.0f64..20.0, e in 0.0f64..=0.99) {
            let ecc = eccentric_anomaly(m, e).expect("valid input");
            let back = mean_anomaly(ecc, e);
            prop_assert!((back - m).abs() <= 3.0e-14, "M {m} e {e} E {ecc} back {back}");
        }

        /// Near periapsis at high eccentricity, the hardest region.
        #[test]
        fn high_eccentricity_near_periapsis(m in -0.05f64..0.05, e in 0.9f64..=0.99) {
            let ecc = eccentric_anomaly(m, e).expect("valid input");
            prop_assert!((mean_anomaly(ecc, e) - m).abs() <= 2.0e-14);
        }
    }
}
