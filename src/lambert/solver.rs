//! The scalar solver: geometry in Izzo's variables, the zero-revolution
//! entry point (the lane-generic fast path of `fast.rs` on one problem,
//! this file's careful path for what it declines) and the
//! multi-revolution solutions.

use nalgebra::Vector3;
use std::f64::consts::{PI, TAU};

use super::fast::{self, Pack};
use super::izzo::{self, Lambda};
use super::kernels::atan2_upper;
use super::types::{
    Branch, Direction, LambertError, LambertProblem, LambertSolution, ANGLE_TOLERANCE_RAD,
};

/// Geometry of one problem in Izzo's variables.
#[derive(Debug, Clone, Copy)]
pub(super) struct Geometry {
    r1n: f64,
    r2n: f64,
    u1: Vector3<f64>,
    u2: Vector3<f64>,
    /// Unit tangents (direction of motion) at r1 and r2.
    it1: Vector3<f64>,
    it2: Vector3<f64>,
    pub(super) lam: Lambda,
    /// Non-dimensional time of flight T.
    pub(super) t: f64,
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
    pub(super) fn of_problem(p: &LambertProblem) -> Result<Self, LambertError> {
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
    pub(super) fn new(
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
        let c = (r2 - r1).norm();
        let s = 0.5 * (r1n + r2n + c);
        let sqr = (r1n * r2n).sqrt();
        // |cos(theta/2)| and |sin(theta/2)| from the unit vectors: no
        // cancellation near 180 (or 0) degrees.
        let half_cos = 0.5 * (u1 + u2).norm();
        let half_sin = 0.5 * (u1 - u2).norm();
        // The angle from its half, as the fast path does.
        let th = atan2_upper(half_sin, half_cos);
        let theta = if sin_t < 0.0 {
            TAU - (th + th)
        } else {
            th + th
        };
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

    pub(super) fn zero_rev(&self, tol: f64) -> Result<LambertSolution, LambertError> {
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
/// `x` is below `3e-4 min(1, 1 + x)` (the next would be below rounding);
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
    let args = ZeroRevArgs {
        r1,
        r2,
        tof,
        mu,
        direction,
        reference_normal,
    };
    #[cfg(target_arch = "x86_64")]
    if std::arch::is_x86_feature_detected!("avx2") {
        // SAFETY: the CPU has AVX2 (checked above).
        return unsafe { zero_rev_avx2(&args) };
    }
    zero_rev_in(&args)
}

/// The arguments of [`solve_zero_rev`].
#[derive(Debug, Clone, Copy)]
struct ZeroRevArgs<'a> {
    r1: &'a Vector3<f64>,
    r2: &'a Vector3<f64>,
    tof: f64,
    mu: f64,
    direction: Direction,
    reference_normal: Option<&'a Vector3<f64>>,
}

/// The careful path of [`solve_zero_rev`] for what the fast path declines
/// (see `fast.rs`): full input validation with typed errors, the
/// degenerate 180-degree plane, the near-parabolic series and the
/// bisection safeguard.
#[cold]
fn careful_zero_rev(a: &ZeroRevArgs<'_>) -> Result<LambertSolution, LambertError> {
    Geometry::new(a.r1, a.r2, a.tof, a.mu, a.direction, a.reference_normal)?
        .zero_rev(izzo::ZERO_REV_TOL)
}

/// [`solve_zero_rev`] of a [`LambertProblem`].
pub(super) fn zero_rev_of(p: &LambertProblem) -> Result<LambertSolution, LambertError> {
    solve_zero_rev(
        &p.r1,
        &p.r2,
        p.tof,
        p.mu,
        p.direction,
        p.reference_normal.as_ref(),
    )
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
        Ok(vec![zero_rev_of(p)?])
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
    out.push(zero_rev_of(p)?);
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

/// [`solve_zero_rev`] compiled with AVX2's three-operand encoding, for
/// CPUs that have it: fewer register copies; the arithmetic, and so the
/// result, is the same operation for operation (no fused multiply-add is
/// enabled).
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
fn zero_rev_avx2(a: &ZeroRevArgs<'_>) -> Result<LambertSolution, LambertError> {
    zero_rev_in(a)
}

/// The fast path (`fast.rs`) on one problem; the careful path where it
/// declines.
#[inline(always)]
fn zero_rev_in(a: &ZeroRevArgs<'_>) -> Result<LambertSolution, LambertError> {
    let v = |a: &Vector3<f64>| [a.x, a.y, a.z];
    let pack = Pack {
        r1: v(a.r1),
        r2: v(a.r2),
        tof: a.tof,
        mu: a.mu,
        sense: a.direction.sense(),
        normal: a.reference_normal.map_or([0.0, 0.0, 1.0], v),
    };
    let fast = fast::zero_rev(&pack);
    if fast.done {
        Ok(fast_to_solution(&fast))
    } else {
        careful_zero_rev(a)
    }
}

/// A solved lane of the fast path as a [`LambertSolution`].
#[inline(always)]
pub(super) fn fast_to_solution(fast: &fast::PackSolution<f64>) -> LambertSolution {
    let v3 = |a: [f64; 3]| Vector3::new(a[0], a[1], a[2]);
    LambertSolution {
        revs: 0,
        branch: Branch::Single,
        v1: v3(fast.v1),
        v2: v3(fast.v2),
        // An integer from 1 to FAST_MAX_ITER.
        iterations: fast.iterations as u32,
        transfer_angle_rad: fast.theta,
    }
}
