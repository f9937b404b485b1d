//! Universal-variable Kepler propagation of a two-body state.
//!
//! One routine, [`propagate`], moves a [`State`] forward or backward in
//! time on its conic (ellipse, parabola or hyperbola alike). The Lambert
//! solver's tests use it as the independent check of every solution.

use super::State;

/// Why [`propagate`] could not return a state.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum PropagateError {
    /// An input component is NaN or infinite.
    #[error("non-finite input: {what}")]
    NonFiniteInput {
        /// Which input: "position", "velocity", "dt" or "mu".
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
    /// The universal Kepler equation was not solved to tolerance.
    #[error(
        "universal Kepler equation did not converge after {iterations} iterations \
         (relative residual {residual:e}, tolerance {tolerance:e})"
    )]
    NotConverged {
        /// Iterations used.
        iterations: u32,
        /// Last residual of the universal Kepler equation, relative to
        /// the size of its largest term.
        residual: f64,
        /// The relative residual that would have been accepted.
        tolerance: f64,
    },
    /// The result overflows double precision (e.g. a hyperbola followed
    /// for an absurdly long time).
    #[error("propagated state is not representable in double precision (dt = {dt_s} s)")]
    NotRepresentable {
        /// The requested time step, s.
        dt_s: f64,
    },
}

/// Iteration cap of the safeguarded Newton solver. Newton converges
/// quadratically once bracketed; the bisection fallback halves the
/// bracket at worst, so 200 steps cover the whole double-precision range
/// (about 2 x 1075 halvings would be the absolute worst, but every
/// bisection is followed by Newton steps that converge in a handful).
const MAX_ITERATIONS: u32 = 200;

/// Relative residual of the universal Kepler equation accepted when the
/// Newton steps stall at the rounding floor: 1e-12 of its largest term,
/// which is the accuracy the module promises.
const RESIDUAL_TOLERANCE: f64 = 1e-12;

/// Stumpff functions `C(z)` and `S(z)`.
///
/// # Method
/// Bate, Mueller & White (1971), *Fundamentals of Astrodynamics*, sec.
/// 4.5: `C(z) = (1 - cos sqrt z) / z`, `S(z) = (sqrt z - sin sqrt z) /
/// sqrt(z)^3`, continued to `z < 0` with the hyperbolic functions. For
/// `|z| < 1` the Maclaurin series (10 terms, truncation below 1e-18) is
/// used to avoid cancellation; above, `C` uses the half-angle form
/// `2 sin^2(sqrt(z)/2) / z`, which has no cancellation.
///
/// # Units
/// Dimensionless.
#[inline]
pub(crate) fn stumpff(z: f64) -> (f64, f64) {
    if z.abs() < 1.0 {
        // C = sum (-z)^k / (2k+2)!, S = sum (-z)^k / (2k+3)!, k = 0..9.
        const C_COEF: [f64; 10] = [
            1.0 / 2.0,
            1.0 / 24.0,
            1.0 / 720.0,
            1.0 / 40_320.0,
            1.0 / 3_628_800.0,
            1.0 / 479_001_600.0,
            1.0 / 87_178_291_200.0,
            1.0 / 20_922_789_888_000.0,
            1.0 / 6_402_373_705_728_000.0,
            1.0 / 2_432_902_008_176_640_000.0,
        ];
        const S_COEF: [f64; 10] = [
            1.0 / 6.0,
            1.0 / 120.0,
            1.0 / 5_040.0,
            1.0 / 362_880.0,
            1.0 / 39_916_800.0,
            1.0 / 6_227_020_800.0,
            1.0 / 1_307_674_368_000.0,
            1.0 / 355_687_428_096_000.0,
            1.0 / 121_645_100_408_832_000.0,
            1.0 / 51_090_942_171_709_440_000.0,
        ];
        let w = -z;
        let mut c = 0.0;
        let mut s = 0.0;
        for k in (0..10).rev() {
            c = c * w + C_COEF[k];
            s = s * w + S_COEF[k];
        }
        (c, s)
    } else if z > 0.0 {
        let sz = z.sqrt();
        let h = (0.5 * sz).sin();
        (2.0 * h * h / z, (sz - sz.sin()) / (z * sz))
    } else {
        let sz = (-z).sqrt();
        let h = (0.5 * sz).sinh();
        (2.0 * h * h / -z, (sz.sinh() - sz) / (-z * sz))
    }
}

/// Propagates a two-body state by `dt_s` seconds (negative: backward).
///
/// # Method
/// Universal-variable formulation of Bate, Mueller & White (1971),
/// *Fundamentals of Astrodynamics* (Dover), sec. 4.4-4.5 (also Curtis,
/// *Orbital Mechanics for Engineering Students*, Algorithms 3.3 and 3.4):
/// the universal Kepler equation
/// `sqrt(mu) dt = sigma0 chi^2 C(z) + (1 - alpha r0) chi^3 S(z) + r0 chi`,
/// `z = alpha chi^2`, `alpha = 2/r0 - v0^2/mu`, `sigma0 = r0.v0/sqrt(mu)`,
/// is solved for `chi` by Newton's method. Its derivative is the radius
/// `r(chi) > 0`, so the left side is strictly increasing in `chi`; each
/// Newton step is kept inside a bracket of the root and replaced by a
/// bisection (or a bracket expansion) when it would leave it or when the
/// equation overflows. The state follows from the Lagrange coefficients
/// `f, g, fdot, gdot` (BMW eq. 4.4-31 to 4.4-36). Elliptic, parabolic and
/// hyperbolic orbits share one code path; no reduction modulo the period
/// is made.
///
/// A Newton step that fails to halve the residual is also replaced by a
/// bisection once the root is bracketed.
///
/// Convergence: the Newton step falls below `4 eps |chi|`, or, failing
/// that within 200 iterations, the residual is below 1e-12 of the
/// equation's largest term.
///
/// # Units
/// `state` in km and km/s, `dt_s` in s, `mu_km3_s2` in km^3/s^2; the
/// returned state is in the same inertial frame.
///
/// # Errors
/// [`PropagateError::NonFiniteInput`], [`PropagateError::NonPositiveMu`],
/// [`PropagateError::ZeroRadius`] on bad input;
/// [`PropagateError::NotConverged`] (iterations and residual) if the
/// universal Kepler equation is not solved;
/// [`PropagateError::NotRepresentable`] if the result, or its norm,
/// overflows double precision.
///
/// # Properties
/// Energy `v^2/2 - mu/r` and angular momentum `r x v` are conserved to
/// rounding; propagating by `dt` then `-dt` returns the start state.
pub fn propagate(state: &State, dt_s: f64, mu_km3_s2: f64) -> Result<State, PropagateError> {
    let r0v = state.r_km;
    let v0v = state.v_km_s;
    if !r0v.iter().all(|c| c.is_finite()) {
        return Err(PropagateError::NonFiniteInput { what: "position" });
    }
    if !v0v.iter().all(|c| c.is_finite()) {
        return Err(PropagateError::NonFiniteInput { what: "velocity" });
    }
    if !dt_s.is_finite() {
        return Err(PropagateError::NonFiniteInput { what: "dt" });
    }
    if !mu_km3_s2.is_finite() {
        return Err(PropagateError::NonFiniteInput { what: "mu" });
    }
    if mu_km3_s2 <= 0.0 {
        return Err(PropagateError::NonPositiveMu { mu_km3_s2 });
    }
    let r0 = r0v.norm();
    if r0 <= 0.0 {
        return Err(PropagateError::ZeroRadius);
    }
    if !r0.is_finite() {
        return Err(PropagateError::NonFiniteInput { what: "position" });
    }
    if dt_s.abs() < f64::MIN_POSITIVE {
        return Ok(*state);
    }

    let sqmu = mu_km3_s2.sqrt();
    let sigma0 = r0v.dot(&v0v) / sqmu;
    let alpha = 2.0 / r0 - v0v.norm_squared() / mu_km3_s2;
    let one_m_ar0 = 1.0 - alpha * r0;
    let target = sqmu * dt_s;

    // F(chi) and its largest term (for the relative residual).
    let eval = |chi: f64| -> (f64, f64, f64, f64) {
        let chi2 = chi * chi;
        let z = alpha * chi2;
        let (c, s) = stumpff(z);
        let t1 = sigma0 * chi2 * c;
        let t2 = one_m_ar0 * chi2 * chi * s;
        let t3 = r0 * chi;
        let f = t1 + t2 + t3 - target;
        let scale = t1.abs().max(t2.abs()).max(t3.abs()).max(target.abs());
        // dF/dchi = r(chi).
        let fp = sigma0 * chi * (1.0 - z * s) + one_m_ar0 * chi2 * c + r0;
        (f, fp, scale, z)
    };

    // Bracket [lo, hi] with F(lo) < 0 < F(hi); F(0) = -target.
    let (mut lo, mut hi) = if dt_s > 0.0 {
        (0.0, f64::INFINITY)
    } else {
        (f64::NEG_INFINITY, 0.0)
    };
    // Initial guess: BMW's chi = sqrt(mu) alpha dt for ellipses (exact
    // for circles); the first-order chi = sqrt(mu) dt / r0 otherwise.
    let mut chi = if alpha > 0.0 {
        target * alpha
    } else {
        target / r0
    };
    // Expansion step used while one side of the bracket is still open.
    let open_step = (target / r0).abs().max(f64::MIN_POSITIVE);
    let mut converged = false;
    let mut last_residual = f64::INFINITY;
    let mut iterations = 0;
    while iterations < MAX_ITERATIONS {
        iterations += 1;
        let (f, fp, scale, _) = eval(chi);
        if !f.is_finite() || !fp.is_finite() {
            // Overflow of the hyperbolic functions: the root lies closer
            // to zero than chi.
            if chi > 0.0 {
                hi = chi;
            } else {
                lo = chi;
            }
        } else {
            let residual = (f / scale).abs();
            // Newton crawls (about one e-folding per step) when started
            // far out on the exponential side of a hyperbola: whenever
            // the residual has not at least halved, bisect instead.
            let crawling = residual > 0.5 * last_residual;
            last_residual = residual;
            if f < 0.0 {
                lo = chi;
            } else if f > 0.0 {
                hi = chi;
            } else {
                converged = true;
                break;
            }
            let next = chi - f / fp;
            let bracketed = lo.is_finite() && hi.is_finite();
            if next > lo && next < hi && !(crawling && bracketed) {
                let step = next - chi;
                chi = next;
                if step.abs() <= 4.0 * f64::EPSILON * chi.abs() {
                    converged = true;
                    break;
                }
                continue;
            }
        }
        // Safeguard: bisect, or expand towards the open side.
        chi = if lo.is_finite() && hi.is_finite() {
            // The root has the sign of dt, so lo and hi never straddle
            // zero: bisect in log space while the bracket spans decades
            // (a far-out first guess on a hyperbola), linearly after.
            let (a, b) = (lo.abs().min(hi.abs()), lo.abs().max(hi.abs()));
            if b > 4.0 * a {
                (a.max(1e-150) * b).sqrt().copysign(dt_s)
            } else {
                0.5 * (lo + hi)
            }
        } else if hi.is_finite() {
            hi - 2.0 * (hi.abs() + open_step)
        } else {
            lo + 2.0 * (lo.abs() + open_step)
        };
        if hi - lo <= 4.0 * f64::EPSILON * chi.abs() {
            converged = true;
            break;
        }
    }
    let (f_end, _, scale_end, z) = eval(chi);
    if f_end.is_finite() {
        last_residual = (f_end / scale_end).abs();
    }
    if !converged && last_residual > RESIDUAL_TOLERANCE {
        return Err(PropagateError::NotConverged {
            iterations,
            residual: last_residual,
            tolerance: RESIDUAL_TOLERANCE,
        });
    }

    let chi2 = chi * chi;
    let (c, s) = stumpff(z);
    let f = 1.0 - chi2 * c / r0;
    let g = dt_s - chi2 * chi * s / sqmu;
    let r_km = f * r0v + g * v0v;
    let r = r_km.norm();
    let fdot = sqmu / (r * r0) * chi * (z * s - 1.0);
    let gdot = 1.0 - chi2 * c / r;
    let v_km_s = fdot * r0v + gdot * v0v;
    if !(r_km.iter().chain(v_km_s.iter()).all(|c| c.is_finite()) && r > 0.0 && r.is_finite()) {
        return Err(PropagateError::NotRepresentable { dt_s });
    }
    Ok(State { r_km, v_km_s })
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;
    use nalgebra::Vector3;

    const MU_EARTH: f64 = 398_600.441_8;

    /// The series branch and the closed forms of the Stumpff functions
    /// must meet at |z| = 1 (each side is accurate to a few ulp there).
    #[test]
    fn stumpff_branches_agree_at_the_switch() {
        for z0 in [1.0_f64, -1.0] {
            let below = stumpff(z0 * (1.0 - 1e-15));
            let above = stumpff(z0 * (1.0 + 1e-15));
            // Tolerance: a few ulp of cancellation in the closed form of S
            // at |z| = 1 (sqrt z - sin sqrt z loses about 3 bits).
            assert_relative_eq!(below.0, above.0, max_relative = 1e-14);
            assert_relative_eq!(below.1, above.1, max_relative = 1e-14);
        }
        // Values at z = 0: C = 1/2, S = 1/6 (the limits of BMW's definitions).
        let (c, s) = stumpff(0.0);
        assert_relative_eq!(c, 0.5, max_relative = 1e-16);
        assert_relative_eq!(s, 1.0 / 6.0, max_relative = 1e-16);
        // z = (2 pi)^2: C = 0, S = 1/(2 pi)^2 exactly in exact arithmetic.
        let tp = std::f64::consts::TAU;
        let (c, s) = stumpff(tp * tp);
        // Tolerance: C is (sin pi)^2-sized, i.e. rounding of pi: ~1e-32.
        assert!(c.abs() < 1e-20, "C((2pi)^2) = {c}");
        assert_relative_eq!(s, 1.0 / (tp * tp), max_relative = 1e-15);
    }

    /// Kepler's third law: after one period T = 2 pi sqrt(a^3/mu) the
    /// state returns to its start.
    /// Source: Kepler's third law; a from vis-viva (BMW 1971, eq. 1.6-4).
    #[test]
    fn one_period_returns_to_start() {
        let s0 = State {
            r_km: Vector3::new(7000.0, -1200.0, 300.0),
            v_km_s: Vector3::new(1.2, 8.1, 2.4),
        };
        let a = 1.0 / (2.0 / s0.r_km.norm() - s0.v_km_s.norm_squared() / MU_EARTH);
        assert!(a > 0.0);
        let period = std::f64::consts::TAU * (a * a * a / MU_EARTH).sqrt();
        let s1 = propagate(&s0, period, MU_EARTH).unwrap();
        // Tolerance: 1e-10 relative; chi reaches 2 pi sqrt(a), rounding of
        // the trig argument is ~1e-15, amplified by the orbit's eccentricity.
        assert_relative_eq!(s1.r_km, s0.r_km, max_relative = 1e-10);
        assert_relative_eq!(s1.v_km_s, s0.v_km_s, max_relative = 1e-10);
        // Half a period is far from the start (the test can fail).
        let half = propagate(&s0, 0.5 * period, MU_EARTH).unwrap();
        assert!((half.r_km - s0.r_km).norm() > 1000.0);
    }

    /// A circular orbit advances uniformly: after a quarter period the
    /// position is rotated by 90 degrees.
    /// Source: circular-orbit kinematics, v = sqrt(mu/r) (BMW 1971, sec. 1.8).
    #[test]
    fn circular_quarter_period() {
        let r = 42_164.0;
        let v = (MU_EARTH / r).sqrt();
        let s0 = State {
            r_km: Vector3::new(r, 0.0, 0.0),
            v_km_s: Vector3::new(0.0, v, 0.0),
        };
        let period = std::f64::consts::TAU * (r * r * r / MU_EARTH).sqrt();
        let s1 = propagate(&s0, 0.25 * period, MU_EARTH).unwrap();
        // Tolerance: 1e-12 of the radius, the module's accuracy target.
        assert!((s1.r_km - Vector3::new(0.0, r, 0.0)).norm() < 1e-12 * r);
        assert!((s1.v_km_s - Vector3::new(-v, 0.0, 0.0)).norm() < 1e-12 * v);
    }

    /// A parabola (v = escape speed) from periapsis: Barker's equation
    /// gives the time to true anomaly nu: t = sqrt(p^3/mu)/2 (D + D^3/3),
    /// D = tan(nu/2), p = 2 r_p.
    /// Source: Barker's equation for the parabolic time of flight, Bate,
    /// Mueller & White (1971), ch. 4 (from memory; section not rechecked).
    #[test]
    fn parabola_matches_barker() {
        let rp = 7000.0;
        let s0 = State {
            r_km: Vector3::new(rp, 0.0, 0.0),
            v_km_s: Vector3::new(0.0, (2.0 * MU_EARTH / rp).sqrt(), 0.0),
        };
        let p = 2.0 * rp;
        let nu = 100.0_f64.to_radians();
        let d = (0.5 * nu).tan();
        let t = 0.5 * (p * p * p / MU_EARTH).sqrt() * (d + d * d * d / 3.0);
        let s1 = propagate(&s0, t, MU_EARTH).unwrap();
        let r_expected = p / (1.0 + nu.cos());
        // Tolerance: 1e-12 relative, the module's accuracy target.
        assert_relative_eq!(s1.r_km.norm(), r_expected, max_relative = 1e-12);
        assert_relative_eq!(s1.r_km.y.atan2(s1.r_km.x), nu, max_relative = 1e-12);
    }

    fn invariants(s: &State) -> (f64, Vector3<f64>) {
        (
            0.5 * s.v_km_s.norm_squared() - MU_EARTH / s.r_km.norm(),
            s.r_km.cross(&s.v_km_s),
        )
    }

    /// Energy and angular momentum are conserved, and dt then -dt returns
    /// to the start, on an ellipse, near-parabola and hyperbola, forward
    /// and backward, including multi-revolution spans.
    /// Source: conservation laws of the two-body problem (BMW 1971, sec. 1.4).
    #[test]
    fn conservation_and_round_trip() {
        let r = Vector3::new(-6045.0, -3490.0, 2500.0);
        for speed in [5.0, 7.5, 10.0, 10.6884, 12.0, 25.0] {
            let v = Vector3::new(-3.457, 6.618, 2.533).normalize() * speed;
            let s0 = State { r_km: r, v_km_s: v };
            let (e0, h0) = invariants(&s0);
            for dt in [1.0, -1.0, 600.0, -3000.0, 86_400.0, -86_400.0 * 3.0] {
                let s1 = propagate(&s0, dt, MU_EARTH).unwrap();
                let (e1, h1) = invariants(&s1);
                // Tolerance: 1e-10 relative; a few ulp per term of f, g
                // amplified by the growth of |r| over multi-day spans.
                assert_relative_eq!(e1, e0, max_relative = 1e-10, epsilon = 1e-12);
                assert_relative_eq!(h1, h0, max_relative = 1e-10);
                let back = propagate(&s1, -dt, MU_EARTH).unwrap();
                assert_relative_eq!(back.r_km, s0.r_km, max_relative = 1e-9);
                assert_relative_eq!(back.v_km_s, s0.v_km_s, max_relative = 1e-9);
            }
        }
    }

    /// Bad input gives typed errors, never NaN.
    #[test]
    fn bad_input_is_typed() {
        let s0 = State {
            r_km: Vector3::new(7000.0, 0.0, 0.0),
            v_km_s: Vector3::new(0.0, 7.5, 0.0),
        };
        assert_eq!(
            propagate(&s0, 10.0, 0.0),
            Err(PropagateError::NonPositiveMu { mu_km3_s2: 0.0 })
        );
        assert_eq!(
            propagate(&s0, f64::NAN, MU_EARTH),
            Err(PropagateError::NonFiniteInput { what: "dt" })
        );
        let z = State {
            r_km: Vector3::zeros(),
            ..s0
        };
        assert_eq!(
            propagate(&z, 10.0, MU_EARTH),
            Err(PropagateError::ZeroRadius)
        );
        // A fast hyperbola followed for 1e307 s would be ~5e308 km away:
        // beyond f64::MAX, so a typed error, not an infinite position.
        let fast = State {
            v_km_s: Vector3::new(0.0, 50.0, 0.0),
            ..s0
        };
        assert!(propagate(&fast, 1e307, MU_EARTH).is_err());
        // 1e100 s (~5e101 km) is representable and must come back finite,
        // moving radially at the asymptotic speed sqrt(v0^2 - 2 mu/r0).
        // Tolerance: 1e-3, the offset of the asymptote is negligible there.
        let far = propagate(&fast, 1e100, MU_EARTH).unwrap();
        let v_inf = (50.0_f64 * 50.0 - 2.0 * MU_EARTH / 7000.0).sqrt();
        assert_relative_eq!(far.r_km.norm(), v_inf * 1e100, max_relative = 1e-3);
        assert_relative_eq!(far.v_km_s.norm(), v_inf, max_relative = 1e-12);
        assert_eq!(
            PropagateError::NonPositiveMu { mu_km3_s2: -1.0 }.to_string(),
            "gravitational parameter must be positive, got -1 km^3/s^2"
        );
    }
}
