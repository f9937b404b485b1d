//! Lambert's two-point boundary-value problem.
//!
//! Given two position vectors, a time of flight and a gravitational
//! parameter, find the two-body arc (its velocities at both ends) that
//! connects them. The sweep calls [`solve_zero_rev`] for every cell of a
//! departure/arrival grid; [`solve`] and [`solve_revs`] add the
//! multi-revolution solutions.
//!
//! # Method
//! D. Izzo, "Revisiting Lambert's problem", Celestial Mechanics and
//! Dynamical Astronomy 121 (2015) 1-15, DOI 10.1007/s10569-014-9587-y:
//! a single non-dimensional variable `x`, Householder iterations from
//! analytic initial guesses, and a velocity reconstruction that has no
//! singularity at 180 degrees. Deviations from the printed algorithm, all
//! for accuracy or robustness:
//! - `lambda` from half-angle identities: `lambda = sqrt(r1 r2)
//!   cos(theta/2) / s` with `|cos(theta/2)| = |r1_hat + r2_hat| / 2`,
//!   instead of `sqrt(1 - c/s)`, which loses about half the digits near
//!   180 degrees;
//! - the continuous initial guess `x0 = 2^(ln(T/T0)/ln(T1/T0)) - 1`
//!   between the anchors `T0 = T(0)` and `T1 = T(1)`;
//! - every iterate is kept in the domain (`x > -1`, and inside the
//!   branch's bracket for multiple revolutions) by a bisection safeguard;
//! - near the parabola `T(x)` comes from its power series (see
//!   `izzo.rs`), free of the closed form's cancellation.
//!
//! # Conventions
//! - **Direction**: [`Direction::Prograde`] means the transfer's angular
//!   momentum has a positive component along the reference normal (the
//!   problem's `reference_normal`, default +z of the input frame). When
//!   `r1 x r2` is exactly perpendicular to the normal, "prograde" takes
//!   the short way.
//! - **Transfer angle**: measured from `r1` to `r2` in the direction of
//!   motion, in `[0, 2 pi)`; above `pi` is the long way (the
//!   mission-design "Type II").
//! - **Near 180 degrees** (within [`ANGLE_TOLERANCE_RAD`]) the plane of
//!   `r1` and `r2` is undefined (or ill-conditioned): the transfer plane
//!   is then spanned by `r1` and the part of the reference normal
//!   perpendicular to `r1`, and any out-of-plane part of `r2` (at most
//!   `1e-6 |r2|`) is ignored. If that part of the normal is (nearly) zero
//!   the problem fails with [`LambertError::UndefinedPlane`].
//! - **Near 0 / 360 degrees** (within [`ANGLE_TOLERANCE_RAD`]):
//!   [`LambertError::Collinear`].
//! - **Order of solutions** from [`solve`]: by revolutions ascending;
//!   for each `M > 0`, [`Branch::Left`] before [`Branch::Right`].
//!
//! # Units
//! Any consistent set: the positions' length unit, the time of flight's
//! time unit, and `mu` in length^3/time^2 (synodic uses km, s, km^3/s^2);
//! velocities come out in length/time.

use nalgebra::Vector3;
use std::f64::consts::{PI, TAU};

pub mod cases;
mod izzo;
#[cfg(test)]
mod tests;

use izzo::Lambda;

/// Transfer angles within this many radians of 0, 180 or 360 degrees are
/// treated as degenerate (see the module's conventions). Below 1e-6 rad
/// the plane of two position vectors carries less than ten significant
/// digits.
pub const ANGLE_TOLERANCE_RAD: f64 = 1e-6;

/// Sense of the transfer with respect to the reference normal.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Direction {
    /// Angular momentum has a positive component along the reference
    /// normal.
    Prograde,
    /// Angular momentum has a negative component along the reference
    /// normal.
    Retrograde,
}

/// Which solution of a given revolution count.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Branch {
    /// The only solution with zero revolutions.
    Single,
    /// For `M > 0`: Izzo's left solution, `x < x_min` (the root with the
    /// smaller `x`, i.e. the larger semi-major axis side nearer
    /// `x = -1`).
    Left,
    /// For `M > 0`: Izzo's right solution, `x > x_min`.
    Right,
}

impl std::fmt::Display for Branch {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        // `pad` honours width and alignment in tables.
        f.pad(match self {
            Branch::Single => "single",
            Branch::Left => "left",
            Branch::Right => "right",
        })
    }
}

/// One Lambert problem.
///
/// # Units
/// Any consistent set (see the module docs); synodic uses km, s and
/// km^3/s^2.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LambertProblem {
    /// Departure position (synodic: km).
    pub r1: Vector3<f64>,
    /// Arrival position (synodic: km).
    pub r2: Vector3<f64>,
    /// Time of flight, in the time unit of `mu` (synodic: s).
    pub tof: f64,
    /// Gravitational parameter (synodic: km^3/s^2).
    pub mu: f64,
    /// Sense of motion with respect to the reference normal.
    pub direction: Direction,
    /// Largest number of complete revolutions [`solve`] looks for.
    pub max_revs: u32,
    /// Defines "prograde" (default +z) and the transfer plane near 180
    /// degrees. Any non-zero length.
    pub reference_normal: Option<Vector3<f64>>,
}

/// One solution of a Lambert problem.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LambertSolution {
    /// Complete revolutions before arrival.
    pub revs: u32,
    /// Which of the solutions with `revs` revolutions.
    pub branch: Branch,
    /// Velocity at departure (synodic: km/s).
    pub v1: Vector3<f64>,
    /// Velocity at arrival (synodic: km/s).
    pub v2: Vector3<f64>,
    /// Root-finder iterations: Householder iterations for this root plus,
    /// for `revs > 0`, the Halley iterations of the minimum search.
    pub iterations: u32,
    /// Transfer angle in `[0, 2 pi)`, radians, measured from `r1` to `r2`
    /// in the direction of motion (not counting complete revolutions).
    pub transfer_angle_rad: f64,
}

/// Why a Lambert problem has no (computed) solution.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum LambertError {
    /// An input is NaN or infinite.
    #[error("non-finite input: {what}")]
    NonFiniteInput {
        /// "r1", "r2", "tof", "mu" or "reference_normal".
        what: &'static str,
    },
    /// The time of flight is zero or negative.
    #[error("time of flight must be positive, got {tof}")]
    NonPositiveTimeOfFlight {
        /// The offending value.
        tof: f64,
    },
    /// The gravitational parameter is zero or negative.
    #[error("gravitational parameter must be positive, got {mu}")]
    NonPositiveMu {
        /// The offending value.
        mu: f64,
    },
    /// A position vector has zero length.
    #[error("position vector {which} has zero length")]
    ZeroRadius {
        /// "r1" or "r2".
        which: &'static str,
    },
    /// The reference normal has zero length.
    #[error("reference normal has zero length")]
    ZeroReferenceNormal,
    /// The transfer angle is within [`ANGLE_TOLERANCE_RAD`] of 0 or 360
    /// degrees: the transfer plane and the arc are undefined.
    #[error("position vectors are collinear (angle {angle_rad:e} rad from 0 or 360 degrees)")]
    Collinear {
        /// Angle between r1 and r2, radians, in [0, pi].
        angle_rad: f64,
    },
    /// The transfer angle is within [`ANGLE_TOLERANCE_RAD`] of 180
    /// degrees and the reference normal (given or the default +z) is
    /// parallel to r1, so it cannot define the transfer plane.
    #[error(
        "transfer plane undefined: angle {angle_rad} rad is within 1e-6 of 180 degrees \
         and the reference normal is parallel to r1"
    )]
    UndefinedPlane {
        /// Angle between r1 and r2, radians, in [0, pi].
        angle_rad: f64,
    },
    /// No solution with `revs` revolutions: the time of flight is below
    /// the minimum for that count.
    #[error("no {revs}-revolution solution: time of flight {tof} is below the minimum {min_tof}")]
    NoSolution {
        /// Requested revolutions.
        revs: u32,
        /// Requested time of flight.
        tof: f64,
        /// Minimum time of flight for `revs` revolutions (same unit).
        min_tof: f64,
    },
    /// The root finder did not converge.
    #[error(
        "not converged after {iterations} iterations \
         (relative residual {residual:e}, tolerance {tolerance:e})"
    )]
    NotConverged {
        /// Iterations used.
        iterations: u32,
        /// Last relative time-of-flight residual (or |dT/dx| for the
        /// minimum search).
        residual: f64,
        /// Step tolerance that was not met.
        tolerance: f64,
    },
    /// The solution overflows or underflows double precision (e.g. a
    /// time of flight so small that the speed is not representable).
    #[error("solution not representable in double precision (tof {tof})")]
    NotRepresentable {
        /// Requested time of flight.
        tof: f64,
    },
}

impl From<izzo::NoConvergence> for LambertError {
    #[cold]
    fn from(e: izzo::NoConvergence) -> Self {
        LambertError::NotConverged {
            iterations: e.iterations,
            residual: e.residual,
            tolerance: e.tolerance,
        }
    }
}

/// Geometry of one problem in Izzo's variables.
#[derive(Debug, Clone, Copy)]
struct Geometry {
    r1n: f64,
    r2n: f64,
    u1: Vector3<f64>,
    u2: Vector3<f64>,
    /// Unit tangents (direction of motion) at r1 and r2.
    it1: Vector3<f64>,
    it2: Vector3<f64>,
    lam: Lambda,
    /// Non-dimensional time of flight T.
    t: f64,
    /// T per unit of dimensional time: sqrt(2 mu / s^3).
    t_per_tof: f64,
    gamma: f64,
    rho: f64,
    sigma: f64,
    theta: f64,
    tof: f64,
}

#[inline]
fn finite3(v: &Vector3<f64>) -> bool {
    v.x.is_finite() && v.y.is_finite() && v.z.is_finite()
}

impl Geometry {
    /// The geometry of a [`LambertProblem`] (see [`Geometry::new`]).
    fn of_problem(p: &LambertProblem) -> Result<Self, LambertError> {
        Geometry::new(
            &p.r1,
            &p.r2,
            p.tof,
            p.mu,
            p.direction,
            p.reference_normal.as_ref(),
        )
    }

    #[inline]
    fn new(
        r1: &Vector3<f64>,
        r2: &Vector3<f64>,
        tof: f64,
        mu: f64,
        direction: Direction,
        reference_normal: Option<&Vector3<f64>>,
    ) -> Result<Self, LambertError> {
        if !finite3(r1) {
            return Err(LambertError::NonFiniteInput { what: "r1" });
        }
        if !finite3(r2) {
            return Err(LambertError::NonFiniteInput { what: "r2" });
        }
        if !tof.is_finite() {
            return Err(LambertError::NonFiniteInput { what: "tof" });
        }
        if !mu.is_finite() {
            return Err(LambertError::NonFiniteInput { what: "mu" });
        }
        if tof <= 0.0 {
            return Err(LambertError::NonPositiveTimeOfFlight { tof });
        }
        if mu <= 0.0 {
            return Err(LambertError::NonPositiveMu { mu });
        }
        let n = match reference_normal {
            Some(n) => {
                if !finite3(n) {
                    return Err(LambertError::NonFiniteInput {
                        what: "reference_normal",
                    });
                }
                let nn = n.norm();
                if nn <= 0.0 || !nn.is_finite() {
                    return Err(LambertError::ZeroReferenceNormal);
                }
                n * (1.0 / nn)
            }
            None => Vector3::z(),
        };
        let r1n = r1.norm();
        let r2n = r2.norm();
        if r1n <= 0.0 {
            return Err(LambertError::ZeroRadius { which: "r1" });
        }
        if r2n <= 0.0 {
            return Err(LambertError::ZeroRadius { which: "r2" });
        }
        if !(r1n.is_finite() && r2n.is_finite()) {
            return Err(LambertError::NotRepresentable { tof });
        }
        let u1 = r1 * (1.0 / r1n);
        let u2 = r2 * (1.0 / r2n);
        let cross = u1.cross(&u2);
        let sin_s = cross.norm();
        let cos_s = u1.dot(&u2);
        let sgn = match direction {
            Direction::Prograde => 1.0,
            Direction::Retrograde => -1.0,
        };
        // Unit normal of the motion.
        let ih = if sin_s >= ANGLE_TOLERANCE_RAD {
            if cross.dot(&n) >= 0.0 {
                cross * (sgn / sin_s)
            } else {
                cross * (-sgn / sin_s)
            }
        } else if cos_s > 0.0 {
            return Err(LambertError::Collinear {
                angle_rad: sin_s.atan2(cos_s),
            });
        } else {
            let np = n - u1 * n.dot(&u1);
            let npn = np.norm();
            if npn < ANGLE_TOLERANCE_RAD {
                return Err(LambertError::UndefinedPlane {
                    angle_rad: sin_s.atan2(cos_s),
                });
            }
            np * (sgn / npn)
        };
        let it1 = ih.cross(&u1);
        let it2 = ih.cross(&u2);
        // Signed sine of the transfer angle along the motion.
        let sin_t = cross.dot(&ih);
        let theta = {
            let a = sin_t.atan2(cos_s);
            if a < 0.0 {
                (a + TAU).min(TAU - f64::EPSILON * PI)
            } else {
                a
            }
        };
        let c = (r2 - r1).norm();
        let s = 0.5 * (r1n + r2n + c);
        let sqr = (r1n * r2n).sqrt();
        // |cos(theta/2)| and |sin(theta/2)| from the unit vectors: no
        // cancellation near 180 (or 0) degrees.
        let half_cos = 0.5 * (u1 + u2).norm();
        let half_sin = 0.5 * (u1 - u2).norm();
        let l_abs = sqr * half_cos / s;
        let l = if sin_t < 0.0 { -l_abs } else { l_abs };
        let lam = Lambda::new(l, c / s);
        let t_per_tof = (2.0 * mu / (s * s * s)).sqrt();
        Ok(Geometry {
            r1n,
            r2n,
            u1,
            u2,
            it1,
            it2,
            lam,
            t: tof * t_per_tof,
            t_per_tof,
            gamma: (0.5 * mu * s).sqrt(),
            rho: (r1n - r2n) / c,
            sigma: 2.0 * sqr * half_sin / c,
            theta,
            tof,
        })
    }

    /// Velocities from a root `x` (Izzo 2015, sec. 2, velocity
    /// reconstruction: radial and tangential components).
    #[inline]
    fn solution(
        &self,
        x: f64,
        revs: u32,
        branch: Branch,
        iterations: u32,
    ) -> Result<LambertSolution, LambertError> {
        let l = self.lam.l;
        let y = (self.lam.one_m_l2 + l * l * x * x).sqrt();
        let ly = l * y;
        let lx = l * x;
        // y + lambda x, via (y + lambda x)(y - lambda x) = 1 - lambda^2
        // when the direct sum would cancel.
        let y_p_lx = if lx < 0.0 {
            self.lam.one_m_l2 / (y - lx)
        } else {
            y + lx
        };
        let g = self.gamma;
        let (inv_r1, inv_r2) = (1.0 / self.r1n, 1.0 / self.r2n);
        let vr1 = g * ((ly - x) - self.rho * (ly + x)) * inv_r1;
        let vr2 = -g * ((ly - x) + self.rho * (ly + x)) * inv_r2;
        let vt = g * self.sigma * y_p_lx;
        let v1 = self.u1 * vr1 + self.it1 * (vt * inv_r1);
        let v2 = self.u2 * vr2 + self.it2 * (vt * inv_r2);
        if !(finite3(&v1) && finite3(&v2)) {
            return Err(LambertError::NotRepresentable { tof: self.tof });
        }
        Ok(LambertSolution {
            revs,
            branch,
            v1,
            v2,
            iterations,
            transfer_angle_rad: self.theta,
        })
    }

    fn zero_rev(&self, tol: f64) -> Result<LambertSolution, LambertError> {
        if !(self.t.is_finite() && self.t > 0.0) {
            return Err(LambertError::NotRepresentable { tof: self.tof });
        }
        let (x, it) = izzo::zero_rev(self.t, &self.lam, tol)?;
        self.solution(x, 0, Branch::Single, it)
    }

    fn multi_rev(&self, m: u32) -> Result<[LambertSolution; 2], LambertError> {
        let (x_min, t_min, it_min) = izzo::t_min(&self.lam, m)?;
        if self.t < t_min {
            return Err(LambertError::NoSolution {
                revs: m,
                tof: self.tof,
                min_tof: t_min / self.t_per_tof,
            });
        }
        let [(xl, il), (xr, ir)] = izzo::multi_rev(self.t, &self.lam, m, x_min)?;
        Ok([
            self.solution(xl, m, Branch::Left, it_min + il)?,
            self.solution(xr, m, Branch::Right, it_min + ir)?,
        ])
    }
}

/// Solves the zero-revolution Lambert problem: the allocation-free fast
/// path used by the grid sweep.
///
/// # Method
/// Izzo (2015), *Revisiting Lambert's problem*, CMDA 121, DOI
/// 10.1007/s10569-014-9587-y: see the module docs for the method and the
/// deviations. Householder iterations stop when the last correction of
/// `x` is below `1e-5 min(1, 1 + x)` (the next would be below rounding);
/// about two iterations on average.
///
/// # Units
/// Any consistent units (see the module docs). `reference_normal` is
/// a direction (any non-zero length); `None` means +z.
///
/// # Errors
/// [`LambertError::NonFiniteInput`], [`LambertError::NonPositiveTimeOfFlight`],
/// [`LambertError::NonPositiveMu`], [`LambertError::ZeroRadius`],
/// [`LambertError::ZeroReferenceNormal`], [`LambertError::Collinear`],
/// [`LambertError::UndefinedPlane`] on bad or degenerate input;
/// [`LambertError::NotConverged`] if the root is not found within 30
/// iterations; [`LambertError::NotRepresentable`] if the velocities
/// overflow.
///
/// # Properties
/// The arc from `(r1, v1)` propagated for `tof` reaches `r2`; energy and
/// angular momentum agree at both ends.
#[inline]
pub fn solve_zero_rev(
    r1: &Vector3<f64>,
    r2: &Vector3<f64>,
    tof: f64,
    mu: f64,
    direction: Direction,
    reference_normal: Option<&Vector3<f64>>,
) -> Result<LambertSolution, LambertError> {
    Geometry::new(r1, r2, tof, mu, direction, reference_normal)?.zero_rev(izzo::ZERO_REV_TOL)
}

/// Solves for exactly `revs` complete revolutions: one solution for 0,
/// two ([`Branch::Left`] then [`Branch::Right`]) for `revs > 0`.
///
/// # Method
/// Izzo (2015), as [`solve_zero_rev`]; for `revs > 0` the minimum time of
/// flight is found first by Halley iterations on `dT/dx = 0`, then each
/// branch is solved from its own initial guess within its own bracket.
///
/// # Units
/// As [`LambertProblem`].
///
/// # Errors
/// As [`solve_zero_rev`], plus [`LambertError::NoSolution`] (with the
/// minimum time of flight) when `p.tof` is below the minimum for `revs`.
/// `p.max_revs` is ignored.
pub fn solve_revs(p: &LambertProblem, revs: u32) -> Result<Vec<LambertSolution>, LambertError> {
    let g = Geometry::of_problem(p)?;
    if revs == 0 {
        Ok(vec![g.zero_rev(izzo::ZERO_REV_TOL)?])
    } else {
        Ok(g.multi_rev(revs)?.to_vec())
    }
}

/// For each `M` in `1..=p.max_revs`, what [`solve_revs`] gives for `M`
/// (both branches, or why not), from one shared geometry: the grid sweep's
/// path for multi-revolution layers.
///
/// # Errors
/// The outer error is input validation (as [`solve_zero_rev`]), which
/// every `M` would share.
pub fn solve_each_rev(
    p: &LambertProblem,
) -> Result<Vec<Result<[LambertSolution; 2], LambertError>>, LambertError> {
    let g = Geometry::of_problem(p)?;
    Ok((1..=p.max_revs).map(|m| g.multi_rev(m)).collect())
}

/// All solutions with `0..=p.max_revs` complete revolutions.
///
/// Order: by revolutions ascending; for each `M > 0`, [`Branch::Left`]
/// before [`Branch::Right`]. Revolution counts whose minimum time of
/// flight exceeds `p.tof` are absent (the minimum grows with `M`, so the
/// search stops at the first such count).
///
/// # Method
/// As [`solve_revs`].
///
/// # Units
/// As [`LambertProblem`].
///
/// # Errors
/// As [`solve_zero_rev`] (input validation and the zero-revolution
/// solve); [`LambertError::NotConverged`] from any branch.
pub fn solve(p: &LambertProblem) -> Result<Vec<LambertSolution>, LambertError> {
    let g = Geometry::of_problem(p)?;
    let mut out = Vec::with_capacity(1 + 2 * p.max_revs.min(8) as usize);
    out.push(g.zero_rev(izzo::ZERO_REV_TOL)?);
    for m in 1..=p.max_revs {
        // T_min(M) > M pi: skip the minimum search when hopeless.
        if g.t <= f64::from(m) * PI {
            break;
        }
        match g.multi_rev(m) {
            Ok(pair) => out.extend_from_slice(&pair),
            Err(LambertError::NoSolution { .. }) => break,
            Err(e) => return Err(e),
        }
    }
    Ok(out)
}
