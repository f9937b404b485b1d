//! Elementary functions written once over [`Real`], used by the scalar
//! and the batch Lambert paths alike, so both get the same bits.
//!
//! SIMD instruction sets have no transcendental instructions, and the C
//! library's functions differ between platforms; these kernels replace
//! them in the solver. Each is a range reduction that is exact (or exact
//! up to one rounding) followed by a short polynomial, accurate to about
//! one unit in the last place (the tests compare each with std's `f64`
//! functions over its domain).
//!
//! # Method
//! Polynomial remainders fitted by Chebyshev interpolation in 50-digit
//! arithmetic (near-minimax; `fit.py` beside this file prints the
//! coefficients and the interpolation errors), evaluated by Estrin's
//! scheme (short dependency chains) where the argument is small, by
//! Horner's for `exp2`. Range reductions are the classical ones (e.g. J.-M. Muller,
//! *Elementary Functions: Algorithms and Implementation*, 3rd ed.,
//! Birkhauser 2016, ch. 11):
//! - `atan2` on the upper half-plane: reflection `x < 0 -> pi - angle`;
//!   then, by the ratio `t = y/x`, one of five regions with a base angle
//!   `b` in {0, atan(1/2), pi/4, atan(3/2), pi/2} and
//!   `atan t = b + atan((t - c)/(1 + c t))` (`c = tan b`; for `pi/2`,
//!   `-atan(1/t)`), written as `u = (a y - b' x)/(a x + b' y)` with small
//!   integers `a, b'` so that `|u| <= 7/16` and the correction never
//!   exceeds about half the result. The base angles are added as a
//!   40-bit head plus a tail (Cody and Waite's split constants), so heads
//!   add and subtract exactly.
//! - `log`: `v = 2^k (1 + g)` with `1 + g` in `[sqrt(1/2), sqrt(2))` and `g`
//!   exact, then `log(1 + g) = g - (g^2/2 - s (g^2/2 + R))`, `s = g/(2 + g)`,
//!   `R = 2 (atanh(s)/s - 1)`, so the rounding of `s` only touches a term
//!   a fifth the size of the result; `k ln 2` with `ln 2` split as above,
//!   and the sum of its head with `g` carried with its rounding error
//!   (Dekker's Fast2Sum).
//! - `asinh` for `s >= 0`: `log(1 + a)` with `a = s + s^2/(1 + sqrt(1 +
//!   s^2))` (no cancellation), where `1 + a = 2^k (1 + g)` gives the exact
//!   `g = (a - (2^k - 1)) / 2^k` (Sterbenz: the difference of numbers
//!   within a factor of two is exact); the rounding error of `a` itself
//!   (Fast2Sum) is added back to first order.
//! - `exp2`: `2^e = 2^k 2^r`, `k` the nearest integer, `|r| <= 1/2`.
//! - `cbrt`: `v = 2^(3q + r) m`, `r` in {0, 1, 2}, `m` in `[1, 2)`; a
//!   quintic starting value for `cbrt(m)` (1.7e-6), times `2^(r/3)`, then
//!   one Halley step in the additive form `y + y (a - y^3)/(2 y^3 + a)`
//!   (cubic convergence: error `(2/3) e^3`; the correction is so small
//!   that its own rounding hardly matters).

use super::lanes::Real;

/// `atan(u) = u + u w P(w)`, `w = u^2`, `|u| <= 7/16`: `P` from
/// `fit.py`, highest degree first (interpolation error 3.9e-18 in `P`,
/// 7.5e-19 relative to the result).
const ATAN: [f64; 12] = [
    0.014773184616983806,
    -0.033128134256069586,
    0.04492259293193656,
    -0.05216679739313656,
    0.05876946456755061,
    -0.06666241923359964,
    0.07692285554889286,
    -0.09090908355602592,
    0.11111111096645038,
    -0.14285714285566806,
    0.1999999999999941,
    -0.3333333333333333,
];
/// `atanh(s) = s + s w Q(w)`, `w = s^2`, `|s| <= 0.1716` (interpolation
/// error 4.6e-18 relative to the result).
const ATANH: [f64; 7] = [
    0.07308224842521703,
    0.07665860800278021,
    0.09091444562630861,
    0.1111110556739754,
    0.14285714312987743,
    0.19999999999949752,
    0.3333333333333335,
];
/// `2^r = 1 + r E(r)`, `|r| <= 1/2` (interpolation error 6.3e-18
/// relative to the result).
const EXP2: [f64; 11] = [
    4.4549605981865186e-10,
    7.072585949269223e-09,
    1.0178062445845774e-07,
    1.321544258792169e-06,
    1.525273382983612e-05,
    0.0001540353044173605,
    0.0013333558146416936,
    0.009618129107606888,
    0.0555041086648216,
    0.24022650695910097,
    std::f64::consts::LN_2,
];

/// `cbrt(m)` on `[1, 2]` to 1.7e-6 (`fit.py`), highest degree first: the
/// starting value of [`cbrt`].
const CBRT: [f64; 6] = [
    0.005072953325277491,
    -0.04831832068166114,
    0.19665479701360078,
    -0.4602977267696209,
    0.8317431442479309,
    0.47514693623890253,
];
/// `2^(r/3)` for `r` = 0, 1, 2 (in the first column; padded for
/// `pick5x4`).
const CBRT_2_R: [[f64; 4]; 5] = [
    [1.0, 0.0, 0.0, 0.0],
    [1.2599210498948732, 0.0, 0.0, 0.0],
    [1.5874010519681996, 0.0, 0.0, 0.0],
    [1.5874010519681996, 0.0, 0.0, 0.0],
    [1.5874010519681996, 0.0, 0.0, 0.0],
];

/// Split constants (40-bit head, tail) from `fit.py`: the heads are
/// multiples of 2^-42 below 4, so their sums and differences are exact.
const ATAN_HALF: (f64, f64) = (0.46364760900087276, -6.664619385128769e-14);
const PI_4: (f64, f64) = (0.7853981633970761, 3.7217737402433116e-13);
const ATAN_3HALF: (f64, f64) = (0.9827937232475961, -2.6699473411131893e-13);
const PI_2: (f64, f64) = (1.5707963267941523, 7.443547480486623e-13);
const PI: (f64, f64) = (3.1415926535883045, 1.4887094960973246e-12);
/// Per region of [`atan2_upper`]: `(a, b, head, tail)` for
/// `u = (a y - b x)/(a x + b y)` and the base angle `atan(b/a)` as head
/// and tail.
const REGIONS: [[f64; 4]; 5] = [
    [1.0, 0.0, 0.0, 0.0],
    [2.0, 1.0, ATAN_HALF.0, ATAN_HALF.1],
    [1.0, 1.0, PI_4.0, PI_4.1],
    [2.0, 3.0, ATAN_3HALF.0, ATAN_3HALF.1],
    [0.0, 1.0, PI_2.0, PI_2.1],
];
/// `ln 2` with a 42-bit head: `k LN2.0` is exact for `|k| < 2^11`.
const LN2: (f64, f64) = (0.6931471805598903, 5.497923018708371e-14);

/// Horner's scheme, coefficients highest degree first (for `exp2`, whose
/// argument reaches 1/2: the pairing below would round more there).
#[inline(always)]
fn horner<R: Real>(c: &[f64], w: R) -> R {
    let mut p = R::splat(c[0]);
    for &ck in &c[1..] {
        p = p * w + R::splat(ck);
    }
    p
}

/// A polynomial in a small `w`, coefficients highest degree first.
#[inline(always)]
fn estrin<R: Real>(c: &[f64], w: R) -> R {
    // Estrin's scheme: adjacent coefficients paired with w, the pairs
    // with w^2, those with w^4, ... The same operations as Horner's plus
    // the powers, but a dependency chain of log2(n) steps instead of n, so
    // the polynomial does not hold up the iteration it sits in.
    let n = c.len();
    debug_assert!(n <= MAX_TERMS);
    let mut t = [R::splat(0.0); MAX_TERMS];
    for (i, ti) in t.iter_mut().take(n).enumerate() {
        *ti = R::splat(c[n - 1 - i]);
    }
    let (mut len, mut p) = (n, w);
    while len > 1 {
        let half = len.div_ceil(2);
        for j in 0..half {
            t[j] = if 2 * j + 1 < len {
                t[2 * j] + t[2 * j + 1] * p
            } else {
                t[2 * j]
            };
        }
        len = half;
        p = p * p;
    }
    t[0]
}

/// Longest polynomial of the kernels.
const MAX_TERMS: usize = 12;

/// The angle of `(x, y)` for `y >= 0`: `atan2(y, x)` in `[0, pi]`.
///
/// # Method
/// See the module docs. Accuracy: within 1 ulp of the exact angle on the
/// domain (test `atan2_upper_within_one_ulp`).
///
/// # Units
/// Radians.
#[inline(always)]
pub(crate) fn atan2_upper<R: Real>(y: R, x: R) -> R {
    let (num, den, head, tail) = atan2_reduce(y, x.abs());
    // x < 0: pi - (base + atan u) = (pi - base) + atan(-u).
    let neg = x.lt(R::splat(0.0));
    let num = R::select(neg, -num, num);
    let head = R::select(neg, R::splat(PI.0) - head, head);
    let tail = R::select(neg, R::splat(PI.1) - tail, tail);
    atan2_finish(num, den, head, tail)
}

/// The angle of `(x, y)` for `x, y >= 0`: `atan2(y, x)` in `[0, pi/2]`,
/// equal to [`atan2_upper`] there (the same operations without the
/// reflection).
#[inline(always)]
pub(crate) fn atan2_first<R: Real>(y: R, x: R) -> R {
    let (num, den, head, tail) = atan2_reduce(y, x);
    atan2_finish(num, den, head, tail)
}

/// Region of `(ax, y)`, `ax, y >= 0`: numerator and denominator of the
/// reduced argument and the base angle as head and tail.
#[inline(always)]
fn atan2_reduce<R: Real>(y: R, ax: R) -> (R, R, R, R) {
    let c = |v: f64| R::splat(v);
    // Region by t = y/ax against 7/16, 11/16, 19/16, 39/16, without the
    // division: one fewer division on the dependency chain.
    let r = [
        (ax * c(0.4375)).lt(y),
        (ax * c(0.6875)).lt(y),
        (ax * c(1.1875)).lt(y),
        (ax * c(2.4375)).lt(y),
    ];
    // u = (a y - b x)/(a x + b y) and the base angle of each region.
    let [a, b, head, tail] = R::pick5x4(r, &REGIONS);
    (a * y - b * ax, a * ax + b * y, head, tail)
}

/// `head + atan(num/den) + tail`, `|num/den| <= 7/16`.
#[inline(always)]
fn atan2_finish<R: Real>(num: R, den: R, head: R, tail: R) -> R {
    let u = num / den;
    let w = u * u;
    let p = estrin(&ATAN, w);
    head + (u + (u * w * p + tail))
}

/// `k ln 2 + log(1 + g) + extra` for `1 + g` in about
/// `[sqrt(1/2), sqrt(2)]`, `g` exact, `extra` a correction below an ulp:
/// the common tail of [`ln`] and [`asinh_pos`].
#[inline(always)]
fn log_tail<R: Real>(k: R, g: R, extra: R) -> R {
    let s = g / (R::splat(2.0) + g);
    let w = s * s;
    let r = (w + w) * estrin(&ATANH, w);
    let hfsq = R::splat(0.5) * g * g;
    // k ln2_hi + g with its rounding error (Fast2Sum: |g| < ln 2 <= |k
    // ln2_hi| unless k = 0, when the sum is exact).
    let kh = k * R::splat(LN2.0);
    let hi = kh + g;
    let lo = (kh - hi) + g;
    hi + ((lo + extra) - (hfsq - (s * (hfsq + r) + k * R::splat(LN2.1))))
}

/// `(k, m)` with `v = 2^k m`, `m` in `[sqrt(1/2), sqrt(2))` (exact).
#[inline(always)]
fn split_sqrt2<R: Real>(v: R) -> (R, R) {
    let (e, m) = v.split_exponent();
    let big = R::splat(std::f64::consts::SQRT_2).le(m);
    (
        R::select(big, e + R::splat(1.0), e),
        R::select(big, m * R::splat(0.5), m),
    )
}

/// Natural logarithm of a positive normal `v` (subnormal, zero, negative
/// or non-finite input gives an unspecified value: callers check).
///
/// # Method
/// See the module docs. Accuracy: within 1 ulp (test
/// `ln_within_one_ulp`).
#[inline(always)]
pub(crate) fn ln<R: Real>(v: R) -> R {
    let (k, m) = split_sqrt2(v);
    log_tail(k, m - R::splat(1.0), R::splat(0.0))
}

/// `asinh(s)` for `0 <= s < 1e150` (so that `s^2` is finite).
///
/// # Method
/// See the module docs. Accuracy: within 1.5 ulp of the exact value
/// (test `asinh_pos_within_one_ulp`).
#[inline(always)]
pub(crate) fn asinh_pos<R: Real>(s: R) -> R {
    let one = R::splat(1.0);
    let t = s * s / (one + (one + s * s).sqrt());
    let a = s + t;
    // a + a_err = s + t exactly (Fast2Sum: t < s).
    let a_err = (s - a) + t;
    let (k, _) = split_sqrt2(one + a);
    let scale = R::pow2i(-k);
    let g = (a - (R::pow2i(k) - one)) * scale;
    // log(1 + g + e) = log(1 + g) + e/(1 + g) to first order in e.
    log_tail(k, g, a_err * scale / (one + g))
}

/// `2^e` for `e` in `[-1022, 1023]` (outside: clamped to that range).
///
/// # Method
/// See the module docs. Accuracy: within 1 ulp (test
/// `exp2_within_one_ulp`).
#[inline(always)]
pub(crate) fn exp2<R: Real>(e: R) -> R {
    let e = e.max(R::splat(-1022.0)).min(R::splat(1023.0));
    let k = e.round();
    let r = e - k;
    let p = R::splat(1.0) + r * horner(&EXP2, r);
    p * R::pow2i(k)
}

/// Cube root of a positive normal `v` (other input gives an unspecified
/// value: callers check).
///
/// # Method
/// See the module docs. Accuracy: within 1 ulp (test
/// `cbrt_within_one_ulp`).
#[inline(always)]
pub(crate) fn cbrt<R: Real>(v: R) -> R {
    let one = R::splat(1.0);
    let (e, m) = v.split_exponent();
    // e = 3q + r: (e - 1)/3 = q + (r - 1)/3 rounds to q.
    let q = ((e - one) * R::splat(1.0 / 3.0)).round();
    let r = e - R::splat(3.0) * q;
    let r1 = R::splat(0.5).lt(r);
    let r2 = R::splat(1.5).lt(r);
    let a = m * R::pow2i(r);
    let no = R::splat(0.0).lt(R::splat(0.0));
    let [scale, _, _, _] = R::pick5x4([r1, r2, no, no], &CBRT_2_R);
    let mut y = estrin(&CBRT, m) * scale;
    // One Halley step: error -(2/3) e^3 < 1e-17 from e = 1.7e-6.
    let y3 = y * y * y;
    y = y + y * (a - y3) / (y3 + y3 + a);
    y * R::pow2i(q)
}

#[cfg(test)]
mod tests;
