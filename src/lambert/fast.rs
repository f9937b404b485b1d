//! The zero-revolution fast path, written once over [`Real`]: on `f64` it
//! is the scalar solver's first attempt, on SIMD packs the batch solver's
//! lanes, and both compute the same bits.
//!
//! It covers the common case of Izzo's method and declines the rest (its
//! lanes come back not `done`), which the careful path of `solver.rs`
//! then solves: invalid or degenerate input (non-finite, non-positive,
//! within [`ANGLE_TOLERANCE_RAD`] of 0 or 180 degrees, a reference normal
//! perpendicular to `r1 x r2`), a Householder step that moves away from
//! the root or out of the domain `x > -1` (where the careful path
//! bisects), more than [`FAST_MAX_ITER`] iterations, or a result that is
//! not finite.
//!
//! # Method
//! D. Izzo, "Revisiting Lambert's problem", Celestial Mechanics and
//! Dynamical Astronomy 121 (2015) 1-15, DOI 10.1007/s10569-014-9587-y, as
//! in the module docs of [`crate::lambert`], with the hot path trimmed:
//! - the geometry shares its square roots and divisions (`1/s` and `1/c`
//!   from one division, `gamma = s^2 sqrt(2 mu / s^3) / 2` from the time
//!   scale, no normalised reference normal: only the sign of
//!   `(r1 x r2) . n` matters);
//! - the transfer angle from half-angles, `theta/2 = atan2(|u1 - u2|,
//!   |u1 + u2|)`, one first-quadrant angle;
//! - the initial guess of `izzo::zero_rev_guess` (shared with the careful
//!   path), with logarithms and a power of two only;
//! - per iteration, `psi` by [`atan2_upper`] (ellipse) or [`asinh_pos`]
//!   (hyperbola), `1/(1 - x^2)` and `1/y` from one division, `psi /
//!   sqrt|1 - x^2|` without one, and the stopping test on
//!   `|T - T*| <= 4 eps T*` without a division; near the parabola
//!   (`x > 0`, `|1 - x^2| <` [`FAST_SERIES_Z`]) the series of `izzo.rs`
//!   with a fixed number of terms;
//! - no bracket: T(x) decreases on `(-1, inf)`, so a step must move `x`
//!   up where `T > T*` and down where `T < T*`; a lane whose step does not
//!   is declined (the careful path keeps a bracket and bisects).
//!
//! The transcendental functions are this crate's kernels
//! ([`crate::lambert`]'s `kernels`), the same in every lane type.

use super::izzo::{zero_rev_guess, ZERO_REV_TOL};
use super::kernels::{asinh_pos, atan2_first, atan2_upper};
use super::lanes::{choose, Mask, Real};
use super::types::ANGLE_TOLERANCE_RAD;

/// Householder iterations the fast path allows before declining a lane:
/// two or three are typical (the benchmark set: 2.1 on average, at most
/// 6); the careful path allows 30 with its bisection safeguard.
pub(crate) const FAST_MAX_ITER: u32 = 12;
/// Below this `|1 - x^2|` (and `x > 0`) the fast path evaluates `T(x)` by
/// its series. The closed form loses about `log10(1/|1 - x^2|)` digits to
/// cancellation: at 0.02, 1.7 digits (T to ~1e-14), which leaves the
/// velocities at the rounding floor (on 200,000 problems of the benchmark
/// set they agree with a 1e-14-tolerance careful solve to 1.3e-13, as with
/// the careful path's 0.2). A band ten times narrower than the careful
/// path's keeps the series rare in packs of lanes.
const FAST_SERIES_Z: f64 = 0.02;
/// Series terms for the band: `0.02^10 = 1e-17`.
const FAST_SERIES_TERMS: usize = 10;

/// A pack of zero-revolution problems, one per lane.
///
/// # Units
/// As [`crate::lambert::LambertProblem`] (synodic: km, s, km^3/s^2).
#[derive(Debug, Clone, Copy)]
pub(crate) struct Pack<R> {
    pub r1: [R; 3],
    pub r2: [R; 3],
    pub tof: R,
    pub mu: R,
    /// +1 prograde, -1 retrograde.
    pub sense: R,
    /// The reference normal, any length (+z when the problem has none).
    pub normal: [R; 3],
}

/// The fast path's answer for a [`Pack`].
#[derive(Debug, Clone, Copy)]
pub(crate) struct PackSolution<R: Real> {
    pub v1: [R; 3],
    pub v2: [R; 3],
    /// Transfer angle along the motion, radians in `[0, 2 pi)`.
    pub theta: R,
    /// Householder iterations (an integer-valued f64).
    pub iterations: R,
    /// Lanes solved here; the others belong to the careful path.
    pub done: R::Mask,
}

#[inline(always)]
fn dot<R: Real>(a: &[R; 3], b: &[R; 3]) -> R {
    a[0] * b[0] + a[1] * b[1] + a[2] * b[2]
}

#[inline(always)]
fn cross<R: Real>(a: &[R; 3], b: &[R; 3]) -> [R; 3] {
    [
        a[1] * b[2] - a[2] * b[1],
        a[2] * b[0] - a[0] * b[2],
        a[0] * b[1] - a[1] * b[0],
    ]
}

#[inline(always)]
fn scale<R: Real>(a: &[R; 3], k: R) -> [R; 3] {
    [a[0] * k, a[1] * k, a[2] * k]
}

#[inline(always)]
fn add<R: Real>(a: &[R; 3], b: &[R; 3]) -> [R; 3] {
    [a[0] + b[0], a[1] + b[1], a[2] + b[2]]
}

#[inline(always)]
fn sub<R: Real>(a: &[R; 3], b: &[R; 3]) -> [R; 3] {
    [a[0] - b[0], a[1] - b[1], a[2] - b[2]]
}

/// `0 < v <= f64::MAX` (false for NaN).
#[inline(always)]
fn positive_finite<R: Real>(v: R) -> R::Mask {
    R::splat(0.0).lt(v) & v.le(R::splat(f64::MAX))
}

/// Izzo's `lambda` and the constants of `T(x)` for one pack.
#[derive(Clone, Copy)]
struct Shape<R> {
    l: R,
    l2: R,
    one_m_l: R,
    one_m_l2: R,
    one_m_l3: R,
    /// `2 lambda^3`, `2 (1 - lambda^2) lambda^3`, `6 (1 - lambda^2) lambda^5`:
    /// the constants of the derivative recursions.
    c1: R,
    c2: R,
    c3: R,
}

impl<R: Real> Shape<R> {
    #[inline(always)]
    fn new(l: R, one_m_l2: R) -> Self {
        let one = R::splat(1.0);
        // 1 - lambda without cancellation as lambda -> 1.
        let one_m_l = choose!(R, R::splat(0.0).lt(l), one_m_l2 / (one + l), one - l);
        let l2 = l * l;
        let l3 = l2 * l;
        let k = one_m_l2 * l3;
        Shape {
            l,
            l2,
            one_m_l,
            one_m_l2,
            one_m_l3: one_m_l * (one + l + l2),
            c1: l3 + l3,
            c2: k + k,
            c3: R::splat(6.0) * k * l2,
        }
    }
}

/// `T(x)` and its first three derivatives for `M = 0`: the closed form,
/// or near the parabola the series.
#[inline(always)]
fn tof<R: Real>(x: R, sh: &Shape<R>) -> [R; 4] {
    let one = R::splat(1.0);
    let z = (one - x) * (one + x);
    let series = R::splat(0.0).lt(x) & z.abs().lt(R::splat(FAST_SERIES_Z));
    choose!(R, series, tof_series(x, z, sh), tof_closed(x, z, sh))
}

/// The closed form of `T(x)` (Izzo 2015, sec. 2) and the paper's
/// recursions for its derivatives; `z = 1 - x^2`.
#[inline(always)]
fn tof_closed<R: Real>(x: R, z: R, sh: &Shape<R>) -> [R; 4] {
    let one = R::splat(1.0);
    let y = (sh.one_m_l2 + sh.l2 * x * x).sqrt();
    let lx = sh.l * x;
    let sq = z.abs().sqrt();
    // 1/z and 1/y from one division.
    let inv_zy = one / (z * y);
    let inv_z = inv_zy * y;
    let inv_y = inv_zy * z;
    // y - lambda x, via (y - lambda x)(y + lambda x) = 1 - lambda^2 where
    // the difference would cancel.
    let y_m_lx = choose!(R, R::splat(0.0).lt(lx), sh.one_m_l2 / (y + lx), y - lx);
    let sin_psi = sq * y_m_lx;
    let psi = choose!(
        R,
        R::splat(0.0).lt(z),
        atan2_upper(sin_psi, x * y + sh.l * z),
        asinh_pos(sin_psi)
    );
    // psi / sqrt|z| = psi sqrt|z| / |z|.
    let t = (psi * (sq * inv_z.abs()) - x + sh.l * y) * inv_z;
    let inv_y2 = inv_y * inv_y;
    let inv_y3 = inv_y2 * inv_y;
    let d1 = (R::splat(3.0) * t * x - R::splat(2.0) + sh.c1 * x * inv_y) * inv_z;
    let d2 = (R::splat(3.0) * t + R::splat(5.0) * x * d1 + sh.c2 * inv_y3) * inv_z;
    let d3 = (R::splat(7.0) * x * d2 + R::splat(8.0) * d1 - sh.c3 * x * inv_y3 * inv_y2) * inv_z;
    [t, d1, d2, d3]
}

/// The series of `T(x)` near the parabola (see `izzo::tof` for its
/// derivation), with all 24 terms: `|z|^24 < 2e-17` on the whole band.
#[inline(always)]
fn tof_series<R: Real>(x: R, z: R, sh: &Shape<R>) -> [R; 4] {
    let two = R::splat(2.0);
    // Coefficients a_k = 2 c_k (1 - lambda^(2k+3)) / (2k + 3), c_k =
    // binom(2k, k) / 4^k, then Horner for P(z) and its derivatives.
    let mut a = [R::splat(0.0); FAST_SERIES_TERMS];
    // c_0 = 1 and d_0 = 1 - lambda^3, each plus 0 z (the same values: z
    // is finite here), so that the coefficients depend on this evaluation:
    // otherwise the compiler hoists them out of the iteration loop, and
    // every problem pays for the rare series.
    let zero_z = R::splat(0.0) * z;
    let mut c = zero_z + R::splat(1.0);
    let mut d = sh.one_m_l3 + zero_z;
    for (k, ak) in a.iter_mut().enumerate() {
        let kf = k as f64;
        *ak = two * c * d / R::splat(2.0 * kf + 3.0);
        c = c * R::splat((2.0 * kf + 1.0) / (2.0 * kf + 2.0));
        d = sh.one_m_l2 + sh.l2 * d;
    }
    let zero = R::splat(0.0);
    let (mut p0, mut p1, mut p2, mut p3) = (zero, zero, zero, zero);
    for &ak in a.iter().rev() {
        p3 = p3 * z + p2;
        p2 = p2 * z + p1;
        p1 = p1 * z + p0;
        p0 = p0 * z + ak;
    }
    let (h1, h2, h3) = (p1, two * p2, R::splat(6.0) * p3);
    let x2 = x * x;
    [
        p0,
        -two * x * h1,
        R::splat(4.0) * x2 * h2 - two * h1,
        R::splat(-8.0) * x2 * x * h3 + R::splat(12.0) * x * h2,
    ]
}

/// Zero-revolution solve of every lane of `p` (see the module docs for
/// what it declines).
///
/// # Method
/// Izzo (2015), as in the module docs.
///
/// # Units
/// As [`Pack`]; velocities in length/time.
#[inline(always)]
pub(crate) fn zero_rev<R: Real>(p: &Pack<R>) -> PackSolution<R> {
    let one = R::splat(1.0);
    let half = R::splat(0.5);
    let zero = R::splat(0.0);

    // Geometry.
    let [r1, r2] = [p.r1, p.r2];
    let r1n2 = dot(&r1, &r1);
    let r2n2 = dot(&r2, &r2);
    let r1n = r1n2.sqrt();
    let r2n = r2n2.sqrt();
    // Two divisions: unit vectors to the last bit matter near 180
    // degrees, where |u1 + u2| is small.
    let inv_r1 = one / r1n;
    let inv_r2 = one / r2n;
    let u1 = scale(&r1, inv_r1);
    let u2 = scale(&r2, inv_r2);
    let cr = cross(&u1, &u2);
    let sin_s = dot(&cr, &cr).sqrt();
    // Input checks, folded: a zero, non-finite or overflowing position
    // makes sin_s NaN (false below); a non-positive or non-finite tof or
    // mu makes T* zero or NaN (checked below).
    let mut ok = R::splat(ANGLE_TOLERANCE_RAD).le(sin_s);
    // Motion along +cr (the short way) when (cr . n >= 0) agrees with the
    // sense: sign = +1 short way, -1 long way. A zero, NaN or infinite
    // cr . n (a zero or non-finite normal, or r1 x r2 perpendicular to it)
    // is left to the careful path.
    let cn = dot(&cr, &p.normal);
    ok = ok & positive_finite(cn.abs());
    let sign = R::select(zero.le(cn), p.sense, -p.sense);
    let long = sign.lt(zero);
    let d = sub(&r2, &r1);
    let c = dot(&d, &d).sqrt();
    let s = half * (r1n + r2n + c);
    let inv_sc = one / (s * c);
    let inv_s = inv_sc * c;
    let inv_c = inv_sc * s;
    let sqr = (r1n * r2n).sqrt();
    // |cos(theta/2)| and |sin(theta/2)| from the unit vectors: no
    // cancellation near 180 (or 0) degrees.
    let sum = add(&u1, &u2);
    let dif = sub(&u1, &u2);
    let half_cos = half * dot(&sum, &sum).sqrt();
    let half_sin = half * dot(&dif, &dif).sqrt();
    let l_abs = sqr * half_cos * inv_s;
    let sh = Shape::new(R::select(long, -l_abs, l_abs), c * inv_s);
    let t_per_tof = (R::splat(2.0) * p.mu * inv_s * inv_s * inv_s).sqrt();
    let t_star = p.tof * t_per_tof;
    ok = ok & positive_finite(t_star);
    let th = atan2_first(half_sin, half_cos);
    let theta = R::select(long, R::splat(std::f64::consts::TAU) - (th + th), th + th);

    let x0 = zero_rev_guess(t_star, sh.l, sh.one_m_l, sh.one_m_l3);
    ok = ok & (-one).lt(x0);

    // Householder iterations on (-1, inf), in lock step; a lane leaves
    // when it converges (done) or is declined.
    let tol = R::splat(ZERO_REV_TOL);
    let eps4 = R::splat(4.0 * f64::EPSILON);
    let mut x = x0;
    let mut active = ok;
    let mut done = zero.lt(zero);
    let mut x_out = zero;
    let mut iterations = zero;
    for it in 1..=FAST_MAX_ITER {
        if !active.any() {
            break;
        }
        let [t, d1, d2, d3] = tof(x, &sh);
        let f = t - t_star;
        let f2 = f * f;
        let d12 = d1 * d1;
        let num = f * (d12 - half * f * d2);
        let den = d1 * (d12 - f * d2) + d3 * f2 * R::splat(1.0 / 6.0);
        let step_tol = tol * (one + x).min(one);
        let step = -(num / den);
        let xn = x + step;
        let inside = (-one).lt(xn);
        // On the root to rounding, or a last correction below tolerance.
        let at_x = f.abs().le(eps4 * t_star);
        let stop = active & (at_x | step.abs().lt(step_tol) & inside);
        x_out = R::select(stop, R::select(at_x, x, xn), x_out);
        iterations = R::select(stop, R::splat(f64::from(it)), iterations);
        done = done | stop;
        // T decreases: where T > T* the root lies above x, below it
        // elsewhere; the step must go that way and stay in the domain.
        let toward = zero.lt(step * f);
        active = active & !stop & toward & inside;
        x = xn;
    }

    // Velocities (Izzo 2015, sec. 2): radial and tangential components
    // with gamma = sqrt(mu s / 2) = s^2 sqrt(2 mu / s^3) / 2,
    // rho = (r1 - r2)/c, sigma = 2 sqrt(r1 r2) sin(theta/2) / c.
    let x = x_out;
    let l = sh.l;
    let gamma = half * s * s * t_per_tof;
    let rho = (r1n - r2n) * inv_c;
    let sigma = R::splat(2.0) * sqr * half_sin * inv_c;
    let y = (sh.one_m_l2 + sh.l2 * x * x).sqrt();
    let ly = l * y;
    let lx = l * x;
    let y_p_lx = choose!(R, lx.lt(zero), sh.one_m_l2 / (y - lx), y + lx);
    let vr1 = gamma * ((ly - x) - rho * (ly + x)) * inv_r1;
    let vr2 = -gamma * ((ly - x) + rho * (ly + x)) * inv_r2;
    let vt = gamma * sigma * y_p_lx;
    // Unit tangents along the motion: ih x u1 and ih x u2, ih the unit
    // normal of the motion.
    let ih = scale(&cr, sign / sin_s);
    let it1 = cross(&ih, &u1);
    let it2 = cross(&ih, &u2);
    let v1 = add(&scale(&u1, vr1), &scale(&it1, vt * inv_r1));
    let v2 = add(&scale(&u2, vr2), &scale(&it2, vt * inv_r2));
    // Any NaN or infinity among the components makes the sum non-finite
    // (a finite sum of huge components overflowing also declines: rare
    // and harmless).
    done = done & (v1[0] + v1[1] + v1[2] + v2[0] + v2[1] + v2[2]).is_finite();
    PackSolution {
        v1,
        v2,
        theta,
        iterations,
        done,
    }
}
