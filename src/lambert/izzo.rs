//! Izzo's (2015) non-dimensional time-of-flight function and its root
//! finders.
//!
//! Reference for the whole file: D. Izzo, "Revisiting Lambert's problem",
//! Celestial Mechanics and Dynamical Astronomy 121 (2015) 1-15,
//! DOI 10.1007/s10569-014-9587-y. Local names follow the paper's symbols
//! (`x`, `y`, `lambda`, `T`, `M`).
//!
//! The variable `x` lives on `(-1, inf)` (`x < 1` ellipse, `x = 1`
//! parabola, `x > 1` hyperbola); `y = sqrt(1 - lambda^2 (1 - x^2))`.
//! The non-dimensional time of flight is (Izzo 2015, sec. 2)
//! `T = [ (psi + M pi) / sqrt|1 - x^2| - x + lambda y ] / (1 - x^2)`.

use std::f64::consts::{LN_2, PI};

use super::kernels::{asinh_pos, atan2_first, atan2_upper, cbrt, exp2, ln};
use super::lanes::{choose, Real};

/// `lambda` and the differences `1 - lambda^k` that the formulas need,
/// each computed without cancellation from `1 - lambda^2 = c / s`.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Lambda {
    /// Izzo's geometry parameter, in (-1, 1); negative for transfer
    /// angles above 180 degrees.
    pub l: f64,
    /// `1 - lambda`.
    pub one_m_l: f64,
    /// `1 - lambda^2` (equal to `c / s`).
    pub one_m_l2: f64,
    /// `1 - lambda^3`.
    pub one_m_l3: f64,
}

impl Lambda {
    /// Builds the parameters from `lambda` and `1 - lambda^2` (given
    /// separately so that `c / s` can be passed exactly).
    #[inline]
    pub(crate) fn new(l: f64, one_m_l2: f64) -> Self {
        // 1 - lambda: exact identity (1 - l^2)/(1 + l) avoids cancellation
        // when lambda -> 1 (small transfer angles).
        let one_m_l = if l > 0.0 {
            one_m_l2 / (1.0 + l)
        } else {
            1.0 - l
        };
        let l2 = l * l;
        Lambda {
            l,
            one_m_l,
            one_m_l2,
            one_m_l3: one_m_l * (1.0 + l + l2),
        }
    }
}

/// Time of flight and its first three derivatives with respect to `x`.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Tof {
    pub t: f64,
    pub d1: f64,
    pub d2: f64,
    pub d3: f64,
}

/// Below this `|1 - x^2|` (and for `x > 0`) the time of flight is
/// evaluated from its power series in `z = 1 - x^2`: the closed form (eq.
/// 18) loses about `log10(1/|z|)` digits to cancellation near the
/// parabola; at 0.2 the loss is under one digit and the series needs at
/// most 24 terms.
pub(crate) const SERIES_Z: f64 = 0.2;
pub(crate) const SERIES_TERMS: usize = 24;

/// Non-dimensional time of flight `T(x)` and derivatives for `M`
/// revolutions.
///
/// # Method
/// Away from the parabola: Izzo (2015), sec. 2, time of flight in `x`,
/// with `psi` from `atan2` (ellipse) or `asinh` (hyperbola) of
/// `sin psi = sqrt|1-x^2| (y - lambda x)` and
/// `cos psi = x y + lambda (1 - x^2)` (the paper's `cos psi` relation
/// rewritten without `acos`), and the paper's recursions for the first
/// three derivatives (`(1-x^2) T' = 3 T x - 2 + 2 lambda^3 x / y`, etc.).
///
/// Near the parabola (`x > 0`, `|1 - x^2| <` 0.2) a series replaces both.
/// Writing Lagrange's equation in Izzo's variables, with `z = 1 - x^2`,
/// `T = 2 [G(z) - lambda^3 G(lambda^2 z)] + M pi z^(-3/2)`, where
/// `G(z) = sum_k c_k z^k / (2k + 3)`, `c_k = binom(2k, k) / 4^k`, which
/// is `(4/3) G = 2F1(3/2, 3/2; 5/2; z)`-type hypergeometric series (the
/// form Izzo takes from Battin for the same purpose). Its coefficients
/// `2 c_k (1 - lambda^(2k+3)) / (2k+3)` are built with the recurrence
/// `1 - lambda^(n+2) = (1 - lambda^2) + lambda^2 (1 - lambda^n)`, which
/// has no cancellation, and the derivatives in `x` follow by the chain
/// rule from Horner's scheme.
#[inline]
pub(crate) fn tof(x: f64, lam: &Lambda, m: u32) -> Tof {
    let z = (1.0 - x) * (1.0 + x);
    if x > 0.0 && z.abs() < SERIES_Z {
        tof_series(x, z, lam, m)
    } else {
        tof_closed(x, z, lam, m)
    }
}

/// The closed-form branch of [`tof`]; see there. `z = 1 - x^2`.
#[inline]
fn tof_closed(x: f64, z: f64, lam: &Lambda, m: u32) -> Tof {
    let l = lam.l;
    // y^2 = 1 - lambda^2 + lambda^2 x^2: a sum of non-negative terms.
    let y = (lam.one_m_l2 + l * l * x * x).sqrt();
    let lx = l * x;
    // y - lambda x, via (y - lambda x)(y + lambda x) = 1 - lambda^2 when
    // the direct difference would cancel.
    let y_m_lx = if lx > 0.0 {
        lam.one_m_l2 / (y + lx)
    } else {
        y - lx
    };
    let sq = z.abs().sqrt();
    // One division each for 1/z and 1/y: the hot loop of every sweep
    // runs through here about twice per solve.
    let inv_z = 1.0 / z;
    let inv_y = 1.0 / y;
    let t = if z > 0.0 {
        let psi = atan2_upper(sq * y_m_lx, x * y + l * z);
        ((psi + f64::from(m) * PI) / sq - x + l * y) * inv_z
    } else {
        let psi = asinh_pos(sq * y_m_lx);
        (psi / sq - x + l * y) * inv_z
    };
    let l2 = l * l;
    let l3 = l2 * l;
    let inv_y2 = inv_y * inv_y;
    let inv_y3 = inv_y2 * inv_y;
    let d1 = (3.0 * t * x - 2.0 + 2.0 * l3 * x * inv_y) * inv_z;
    let d2 = (3.0 * t + 5.0 * x * d1 + 2.0 * lam.one_m_l2 * l3 * inv_y3) * inv_z;
    let d3 = (7.0 * x * d2 + 8.0 * d1 - 6.0 * lam.one_m_l2 * l3 * l2 * x * inv_y3 * inv_y2) * inv_z;
    Tof { t, d1, d2, d3 }
}

/// The series branch of [`tof`]; see there.
#[inline]
fn tof_series(x: f64, z: f64, lam: &Lambda, m: u32) -> Tof {
    let l2 = lam.l * lam.l;
    // Terms needed for 1e-17 truncation: |z|^n < 1e-17.
    let n = if z.abs() < 1e-300 {
        1
    } else {
        ((-39.1 / ln(z.abs())).ceil() as usize).clamp(2, SERIES_TERMS)
    };
    let mut a = [0.0; SERIES_TERMS];
    let mut c = 1.0; // c_k
    let mut d = lam.one_m_l3; // 1 - lambda^(2k+3)
    for (k, ak) in a.iter_mut().enumerate().take(n) {
        let kf = k as f64;
        *ak = 2.0 * c * d / (2.0 * kf + 3.0);
        c *= (2.0 * kf + 1.0) / (2.0 * kf + 2.0);
        d = lam.one_m_l2 + l2 * d;
    }
    // Horner for P(z) and its first three derivatives.
    let (mut p0, mut p1, mut p2, mut p3) = (0.0, 0.0, 0.0, 0.0);
    for &ak in a[..n].iter().rev() {
        p3 = p3 * z + p2;
        p2 = p2 * z + p1;
        p1 = p1 * z + p0;
        p0 = p0 * z + ak;
    }
    let (h0, h1, h2, h3) = (p0, p1, 2.0 * p2, 6.0 * p3);
    let x2 = x * x;
    let mut out = Tof {
        t: h0,
        d1: -2.0 * x * h1,
        d2: 4.0 * x2 * h2 - 2.0 * h1,
        d3: -8.0 * x2 * x * h3 + 12.0 * x * h2,
    };
    if m > 0 {
        // M pi (1 - x^2)^(-3/2) and its derivatives in x.
        let mp = f64::from(m) * PI;
        let w = 1.0 / z;
        let ws = w.sqrt();
        let w32 = w * ws;
        let w52 = w32 * w;
        let w72 = w52 * w;
        let w92 = w72 * w;
        out.t += mp * w32;
        out.d1 += mp * 3.0 * x * w52;
        out.d2 += mp * (3.0 * w52 + 15.0 * x2 * w72);
        out.d3 += mp * (45.0 * x * w72 + 105.0 * x2 * x * w92);
    }
    out
}

/// Householder stopping tolerance on `|x_{n+1} - x_n|` for zero
/// revolutions. Householder's method is of order 4 here (third
/// derivatives), so a last correction below 3e-4 leaves an error of
/// order (3e-4)^4 ~ 1e-14 in `x` before that correction is applied, and
/// the corrected root is at rounding: on 400,000 problems of the
/// benchmark case set the velocities agree with a 1e-14-tolerance solve
/// to 6.8e-14 (the rounding floor), the same as with 1e-4 or 1e-5, and
/// 2.005 iterations are needed on average (2.029 with 1e-4); 1e-3 leaves
/// 1.2e-12. The test `tolerance_is_sufficient` keeps checking it.
pub(crate) const ZERO_REV_TOL: f64 = 3e-4;
/// Stopping tolerance for multi-revolution branches. Near the minimum
/// time of flight the convergence degrades (T'(x) -> 0), hence tighter.
pub(crate) const MULTI_REV_TOL: f64 = 1e-9;
/// Iteration cap for the zero-revolution root. Two to three iterations
/// are typical; the cap leaves room for the bisection safeguard.
pub(crate) const ZERO_REV_MAX_ITER: u32 = 30;
/// Iteration cap for multi-revolution branches and the minimum search
/// (bisection fallback near the double root at `T_min`).
pub(crate) const MULTI_REV_MAX_ITER: u32 = 120;

/// A failed root search: iterations used and the final relative residual.
#[derive(Debug, Clone, Copy)]
pub(crate) struct NoConvergence {
    pub iterations: u32,
    pub residual: f64,
    pub tolerance: f64,
}

/// Householder iteration (third-order update of Izzo 2015, sec. 3)
/// for `T(x) = t_target` on the bracket `(lo, hi)` where `T` is
/// monotonic (`decreasing` says which way). A step that leaves the
/// bracket or is not finite is replaced by a bisection (or, with `hi`
/// infinite, by doubling), so iterates stay in the domain `x > -1`.
/// Convergence is declared after a Householder step below `tol` times
/// `min(1 + x, 1)` (`M = 0`) or `min(1 + x, 1 - x)` (`M > 0`), when the
/// residual is within 4 ulp of `T`, or when the bracket is narrower than
/// that step tolerance.
// The bracket, monotonicity and stopping rule are the solver's inputs;
// bundling them into a struct would only rename them.
#[allow(clippy::too_many_arguments)]
#[inline]
pub(crate) fn householder(
    t_target: f64,
    x0: f64,
    lam: &Lambda,
    m: u32,
    mut lo: f64,
    mut hi: f64,
    decreasing: bool,
    tol: f64,
    max_iter: u32,
) -> Result<(f64, u32), NoConvergence> {
    let mut x = if x0 > lo && x0 < hi {
        x0
    } else {
        midpoint(lo, hi)
    };
    let mut residual = f64::INFINITY;
    for it in 1..=max_iter {
        let v = tof(x, lam, m);
        let f = v.t - t_target;
        residual = (f / t_target).abs();
        if (f > 0.0) == decreasing {
            lo = x;
        } else {
            hi = x;
        }
        let f2 = f * f;
        let d12 = v.d1 * v.d1;
        let num = f * (d12 - 0.5 * f * v.d2);
        let den = v.d1 * (d12 - f * v.d2) + v.d3 * f2 / 6.0;
        // Steps are measured relative to the distance to the domain's
        // ends (x -> -1 for long times of flight, x -> 1 for M > 0
        // near the right end), where T varies like a power of 1 -+ x.
        let scale = if m == 0 {
            (1.0 + x).min(1.0)
        } else {
            (1.0 + x).min(1.0 - x)
        };
        if residual <= 4.0 * f64::EPSILON || hi - lo <= tol * scale {
            // On the root to rounding, or bracketed tighter than `tol`
            // (possible near the double root at T_min, where T' -> 0).
            return Ok((x, it));
        }
        let xn = x - num / den;
        let step = xn - x;
        // The root may sit on the bracket end just set from x itself, so
        // the bracket is closed for a converged step (x > -1 throughout:
        // lo >= -1 is only reached by a step of at least 1 + x).
        if step.abs() < tol * scale && xn >= lo && xn <= hi && xn > -1.0 {
            return Ok((xn, it));
        }
        x = if xn > lo && xn < hi {
            xn
        } else {
            midpoint(lo, hi)
        };
    }
    Err(NoConvergence {
        iterations: max_iter,
        residual,
        tolerance: tol,
    })
}

/// Midpoint of a bracket; with an infinite upper end, moves up
/// geometrically.
#[inline]
fn midpoint(lo: f64, hi: f64) -> f64 {
    if hi.is_finite() {
        0.5 * (lo + hi)
    } else {
        (lo + 1.0).max(2.0 * lo)
    }
}

/// The initial guess for zero revolutions, from Izzo's (2015, sec. 3)
/// anchors `T0 = T(x=0) = acos lambda + lambda sqrt(1 - lambda^2)` and
/// `T1 = T(x=1) = (2/3)(1 - lambda^3)`: Izzo's `x0 = (T0/T)^(2/3) - 1` for
/// `T >= T0` and `x0 = (5/2) T1 (T1 - T) / (T (1 - lambda^5)) + 1` for
/// `T < T1`; between the anchors (the printed formula for that range is
/// reported wrong) the linear interpolation `x0 = (T0 - T)/(T0 - T1)`,
/// which meets both anchors exactly. On 200,000 problems of the
/// benchmark set it needs 2.028 Householder iterations on average, the
/// continuous guess `2^(ln(T/T0)/ln(T1/T0)) - 1` 2.024 at the price of
/// two logarithms and a power. Shared by the fast path's lanes and the
/// careful path, so both start from the same bits.
///
/// # Method
/// `acos lambda = 2 atan2(sqrt(1 - lambda), sqrt(1 + lambda))`,
/// `(T0/T)^(2/3) = cbrt((T0/T)^2)` with this crate's kernels.
#[inline(always)]
pub(crate) fn zero_rev_guess<R: Real>(t: R, l: R, one_m_l: R, one_m_l3: R) -> R {
    let one = R::splat(1.0);
    // acos(lambda) = 2 atan2(sqrt(1 - lambda), sqrt(1 + lambda)): a
    // first-quadrant angle, and sqrt(1 - lambda^2) as the product.
    let (a, b) = (one_m_l.sqrt(), (one + l).sqrt());
    let t0 = R::splat(2.0) * atan2_first(a, b) + l * (a * b);
    let t1 = R::splat(2.0 / 3.0) * one_m_l3;
    choose!(
        R,
        t.lt(t1),
        {
            // 1 - lambda^5, only here (the hyperbolic side, 5 % of the
            // benchmark problems).
            let l2 = l * l;
            let one_m_l5 = one_m_l * (one + l + l2 + l2 * l + l2 * l2);
            R::splat(2.5) * t1 * (t1 - t) / (t * one_m_l5) + one
        },
        choose!(
            R,
            t0.le(t),
            {
                // (T0/T)^(2/3); NaN (a declined or bisected start) where
                // the square is not a normal number.
                let r = t0 / t;
                let a = r * r;
                R::select(R::splat(1e-300).lt(a), cbrt(a) - one, R::splat(f64::NAN))
            },
            (t0 - t) / (t0 - t1)
        )
    )
}

/// Zero-revolution solve: `x` and the number of iterations.
///
/// # Method
/// Izzo (2015) sec. 3: the initial guess of [`zero_rev_guess`], then
/// Householder iterations on `(-1, inf)`.
#[inline]
pub(crate) fn zero_rev(t: f64, lam: &Lambda, tol: f64) -> Result<(f64, u32), NoConvergence> {
    let x0 = zero_rev_guess(t, lam.l, lam.one_m_l, lam.one_m_l3);
    householder(
        t,
        x0,
        lam,
        0,
        -1.0,
        f64::INFINITY,
        true,
        tol,
        ZERO_REV_MAX_ITER,
    )
}

/// Minimum non-dimensional time of flight for `M >= 1` revolutions:
/// `(x_min, T_min, iterations)`.
///
/// # Method
/// Izzo (2015) sec. 3: Halley iterations on `dT/dx = 0` started at
/// `x = 0`, kept inside `(-1, 1)` by a bisection safeguard (`T` is convex
/// there: `T' < 0` left of the minimum, `> 0` right of it).
pub(crate) fn t_min(lam: &Lambda, m: u32) -> Result<(f64, f64, u32), NoConvergence> {
    let (mut lo, mut hi) = (-1.0_f64, 1.0_f64);
    let mut x = 0.0_f64;
    let mut residual = f64::INFINITY;
    let mut last_step = f64::INFINITY;
    for it in 1..=MULTI_REV_MAX_ITER {
        let v = tof(x, lam, m);
        residual = v.d1.abs();
        if v.d1 > 0.0 {
            hi = x;
        } else {
            lo = x;
        }
        let den = 2.0 * v.d2 * v.d2 - v.d1 * v.d3;
        let xn = x - 2.0 * v.d1 * v.d2 / den;
        if xn > lo && xn < hi {
            let step = (xn - x).abs();
            x = xn;
            // Converged: below the tolerance, or at the rounding floor
            // (Halley's steps shrink cubically until rounding in T'
            // makes them stall; a small step that does not shrink means
            // x is on the root to rounding).
            if step < 1e-13 || (step < 1e-9 && step >= last_step) {
                return Ok((x, tof(x, lam, m).t, it));
            }
            last_step = step;
        } else {
            // A Halley step out of the bracket: bisect, unless T' is
            // zero to rounding or the bracket is already below the
            // tolerance (then x is the minimum to rounding).
            if residual <= f64::EPSILON || hi - lo < 1e-13 {
                return Ok((x, v.t, it));
            }
            x = 0.5 * (lo + hi);
        }
    }
    Err(NoConvergence {
        iterations: MULTI_REV_MAX_ITER,
        residual,
        tolerance: 1e-13,
    })
}

/// Both `M`-revolution roots, left (`x < x_min`) then right, each with
/// its iteration count.
///
/// # Method
/// Izzo (2015) sec. 3, initial guesses for the two branches:
/// `x0l = [((M pi + pi)/(8T))^(2/3) - 1] / [((M pi + pi)/(8T))^(2/3) + 1]`,
/// `x0r = [(8T/(M pi))^(2/3) - 1] / [(8T/(M pi))^(2/3) + 1]`,
/// each moved to the middle of its bracket if it falls on the wrong side
/// of `x_min`; then safeguarded Householder iterations on `(-1, x_min)`
/// and `(x_min, 1)`.
pub(crate) fn multi_rev(
    t: f64,
    lam: &Lambda,
    m: u32,
    x_min: f64,
) -> Result<[(f64, u32); 2], NoConvergence> {
    let mf = f64::from(m);
    // q^(2/3) = 2^((2/3) log2 q) with this crate's kernels.
    let pow23 = |q: f64| exp2(ln(q) * (2.0 / (3.0 * LN_2)));
    let ql = pow23((mf * PI + PI) / (8.0 * t));
    let x0l = (ql - 1.0) / (ql + 1.0);
    let qr = pow23(8.0 * t / (mf * PI));
    let x0r = (qr - 1.0) / (qr + 1.0);
    let left = householder(
        t,
        x0l,
        lam,
        m,
        -1.0,
        x_min,
        true,
        MULTI_REV_TOL,
        MULTI_REV_MAX_ITER,
    )?;
    let right = householder(
        t,
        x0r,
        lam,
        m,
        x_min,
        1.0,
        false,
        MULTI_REV_TOL,
        MULTI_REV_MAX_ITER,
    )?;
    Ok([left, right])
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    fn lam(l: f64) -> Lambda {
        Lambda::new(l, (1.0 - l) * (1.0 + l))
    }

    /// The analytic derivatives (the paper's recursions and the series) match central
    /// finite differences across the domain, both branches, M = 0..2.
    /// Source: calculus (central differences, error O(h^2)).
    #[test]
    fn derivatives_match_finite_differences() {
        for &l in &[-0.9, -0.3, 0.0, 0.4, 0.95] {
            let lm = lam(l);
            for m in 0..3u32 {
                let xs: &[f64] = if m == 0 {
                    &[-0.7, -0.2, 0.3, 0.8, 0.95, 1.05, 1.3, 3.0]
                } else {
                    &[-0.7, -0.2, 0.3, 0.8, 0.95]
                };
                for &x in xs {
                    let h = 2e-6;
                    let p = tof(x + h, &lm, m);
                    let q = tof(x - h, &lm, m);
                    let v = tof(x, &lm, m);
                    // Tolerance: truncation (h / scale length)^2 with scale
                    // length (1 - x^2)/2x >= 0.05 gives < 1e-8, rounding
                    // eps * f / h ~ 1e-10.
                    let fd1 = (p.t - q.t) / (2.0 * h);
                    let fd2 = (p.d1 - q.d1) / (2.0 * h);
                    let fd3 = (p.d2 - q.d2) / (2.0 * h);
                    assert_relative_eq!(v.d1, fd1, max_relative = 1e-7, epsilon = 1e-8);
                    assert_relative_eq!(v.d2, fd2, max_relative = 1e-7, epsilon = 1e-8);
                    assert_relative_eq!(v.d3, fd3, max_relative = 1e-6, epsilon = 1e-7);
                }
            }
        }
    }

    /// The series and closed form of T(x) (and derivatives) agree where
    /// both are accurate, and T hits the published anchors.
    /// Source: Izzo (2015) sec. 3: T(x=0) = acos(lambda) + lambda
    /// sqrt(1 - lambda^2), T(x=1) = (2/3)(1 - lambda^3).
    #[test]
    fn tof_anchors_and_branch_agreement() {
        for &l in &[-0.99, -0.5, 0.0, 0.5, 0.99] {
            let lm = lam(l);
            let t0 = l.acos() + l * (1.0 - l * l).sqrt();
            // Tolerance: a few ulp of the closed form.
            assert_relative_eq!(tof(0.0, &lm, 0).t, t0, max_relative = 1e-15);
            assert_relative_eq!(
                tof(1.0, &lm, 0).t,
                2.0 / 3.0 * (1.0 - l * l * l),
                max_relative = 1e-15
            );
            for z in [0.199_f64, 0.1, 0.05, -0.05, -0.1, -0.199] {
                let x = (1.0 - z).sqrt();
                let zz = (1.0 - x) * (1.0 + x);
                for m in [0, 1] {
                    if m == 1 && z < 0.0 {
                        continue;
                    }
                    let a = tof_series(x, zz, &lm, m);
                    let b = tof_closed(x, zz, &lm, m);
                    // Tolerance: the closed form cancels by a factor
                    // ~1/|z| near the parabola and ~1/(1 - |lambda|) when
                    // T itself is small; its derivative recursions divide
                    // by z once more per order (with O(10) constants in
                    // the recursions). Base: 64 eps.
                    let tol = 64.0 * f64::EPSILON / (z.abs() * (1.0 - l.abs()));
                    assert_relative_eq!(a.t, b.t, max_relative = tol);
                    assert_relative_eq!(a.d1, b.d1, max_relative = tol / z.abs());
                    assert_relative_eq!(a.d2, b.d2, max_relative = tol / (z * z));
                    // T''' only shapes the Householder step, and its closed form
                    // cancels most: 1e-7 relative is ample.
                    assert_relative_eq!(a.d3, b.d3, max_relative = 1e-7);
                }
            }
        }
    }
}
