//! Lane types: `f64` and packs of `f64` behind one arithmetic interface,
//! so that one generic routine runs on a single problem or on several in
//! SIMD lanes and gives the same bits in every lane.
//!
//! Every operation of [`Real`] is either correctly rounded by IEEE 754
//! (`+ - * /`, `sqrt`) or exact (comparisons, selection, absolute value,
//! rounding to an integer, exponent splitting and scaling by a power of
//! two). No operation fuses a multiply and an add. Hence a routine written
//! once against [`Real`] computes, lane by lane, exactly what it computes
//! on `f64`, whatever the lane type: this is what makes the batch solver
//! bit-for-bit equal to the scalar one.
//!
//! The x86-64 pack types wrap `std::arch` registers. Their arithmetic is
//! `#[inline(always)]` and only ever runs inside a function compiled with
//! the matching `#[target_feature]`, entered after run-time detection
//! (see `batch.rs`); SSE2 is part of the x86-64 baseline.

use std::ops::{Add, BitAnd, BitOr, Div, Mul, Neg, Not, Sub};

/// `2^52 + 1023` as f64: adding it to a small integer-valued f64 `k`
/// puts `k + 1023` in the low bits (exact), and subtracting it from
/// `2^52 + E` gives `E - 1023` (exact).
const MAGIC_EXP: f64 = 4_503_599_627_371_519.0;
/// Bits of `2^52`: or-ing a biased exponent `E < 2^52` into them gives the
/// f64 `2^52 + E`.
const TWO52_BITS: u64 = 0x4330_0000_0000_0000;
/// Bits of 1.0: exponent field of `[1, 2)`.
const ONE_BITS: u64 = 0x3ff0_0000_0000_0000;
/// The 52 fraction bits.
const FRACTION: u64 = 0x000f_ffff_ffff_ffff;
/// `1.5 * 2^52`: adding and subtracting it rounds to the nearest integer
/// (ties to even) for `|v| < 2^51`.
const ROUNDER: f64 = 6_755_399_441_055_744.0;

/// A selection mask: one boolean per lane.
pub(crate) trait Mask:
    Copy + BitAnd<Output = Self> + BitOr<Output = Self> + Not<Output = Self>
{
    /// True in every lane.
    fn all(self) -> bool;
    /// True in at least one lane.
    fn any(self) -> bool;
}

/// One or several `f64` lanes with exact or correctly rounded operations
/// (see the module docs).
pub(crate) trait Real:
    Copy
    + Add<Output = Self>
    + Sub<Output = Self>
    + Mul<Output = Self>
    + Div<Output = Self>
    + Neg<Output = Self>
{
    /// One boolean per lane.
    type Mask: Mask;
    /// Number of lanes.
    const LANES: usize;
    /// Every lane `v`.
    fn splat(v: f64) -> Self;
    /// Lanes from `v[..LANES]`.
    fn load(v: &[f64]) -> Self;
    /// Lanes into `out[..LANES]`.
    fn store(self, out: &mut [f64]);
    /// Correctly rounded square root.
    fn sqrt(self) -> Self;
    /// Absolute value (clears the sign bit).
    fn abs(self) -> Self;
    /// `self < o` (false where either is NaN).
    fn lt(self, o: Self) -> Self::Mask;
    /// `self <= o` (false where either is NaN).
    fn le(self, o: Self) -> Self::Mask;
    /// Where `m`: `a`, else `b`.
    fn select(m: Self::Mask, a: Self, b: Self) -> Self;
    /// Booleans into `out[..LANES]`.
    fn mask_store(m: Self::Mask, out: &mut [bool]);
    /// Nearest integer, ties to even; exact for `|self| < 2^51` (a zero
    /// result may lose its sign).
    fn round(self) -> Self;
    /// For positive normal `self`: `(e, m)` with `self = 2^e m`, `m` in
    /// `[1, 2)`, `e` an integer-valued f64 (exact).
    fn split_exponent(self) -> (Self, Self);
    /// `2^k` for integer-valued `k` in `[-1022, 1023]` (exact).
    fn pow2i(k: Self) -> Self;

    /// For nested masks `r[0] >= r[1] >= r[2] >= r[3]` (each true only
    /// where the one before is), row `k` of `v` with `k` the number of
    /// true masks in each lane.
    #[inline(always)]
    fn pick5x4(r: [Self::Mask; 4], v: &[[f64; 4]; 5]) -> [Self; 4] {
        // Written out: `std::array::from_fn` is not always inlined, and
        // lane code must inline into its #[target_feature] caller.
        let column = |j: usize| {
            let s = |i: usize| Self::splat(v[i][j]);
            Self::select(
                r[3],
                s(4),
                Self::select(
                    r[2],
                    s(3),
                    Self::select(r[1], s(2), Self::select(r[0], s(1), s(0))),
                ),
            )
        };
        [column(0), column(1), column(2), column(3)]
    }
    /// Neither NaN nor infinite.
    #[inline(always)]
    fn is_finite(self) -> Self::Mask {
        self.abs().le(Self::splat(f64::MAX))
    }
    /// The smaller of two non-NaN values.
    #[inline(always)]
    fn min(self, o: Self) -> Self {
        Self::select(self.lt(o), self, o)
    }
    /// The larger of two non-NaN values.
    #[inline(always)]
    fn max(self, o: Self) -> Self {
        Self::select(o.lt(self), self, o)
    }
}

/// Lane-wise selection for values made of lanes: one [`Real`] or an
/// array of them.
pub(crate) trait Blend<R: Real>: Sized {
    /// Where `m`, `a`, else `b`.
    fn blend(m: R::Mask, a: Self, b: Self) -> Self;
}

impl<R: Real> Blend<R> for R {
    #[inline(always)]
    fn blend(m: R::Mask, a: Self, b: Self) -> Self {
        R::select(m, a, b)
    }
}

impl<R: Real, const N: usize> Blend<R> for [R; N] {
    #[inline(always)]
    fn blend(m: R::Mask, a: Self, b: Self) -> Self {
        // A plain loop: `std::array::from_fn` is not always inlined.
        let mut out = b;
        for (o, &x) in out.iter_mut().zip(&a) {
            *o = R::select(m, x, *o);
        }
        out
    }
}

/// `choose!(R, m, a, b)`: where the mask `m`, the value of expression
/// `a`, else that of `b` (an `R` or an array of `R`), for the lane type
/// `R`; evaluates only the side some lane needs (on `f64`, exactly one).
/// A macro rather than a function taking closures, so both sides are
/// always inlined into the caller (and its `#[target_feature]` context).
macro_rules! choose {
    ($r:ty, $m:expr, $a:expr, $b:expr) => {{
        let m = $m;
        if $crate::lambert::lanes::Mask::all(m) {
            $a
        } else if !$crate::lambert::lanes::Mask::any(m) {
            $b
        } else {
            let (a, b) = ($a, $b);
            <_ as $crate::lambert::lanes::Blend<$r>>::blend(m, a, b)
        }
    }};
}
pub(crate) use choose;

impl Mask for bool {
    #[inline(always)]
    fn all(self) -> bool {
        self
    }
    #[inline(always)]
    fn any(self) -> bool {
        self
    }
}

#[inline(always)]
fn split_exponent_bits(bits: u64) -> (f64, f64) {
    let e = f64::from_bits((bits >> 52) | TWO52_BITS) - MAGIC_EXP;
    (e, f64::from_bits((bits & FRACTION) | ONE_BITS))
}

#[inline(always)]
fn pow2i_f64(k: f64) -> f64 {
    f64::from_bits((k + MAGIC_EXP).to_bits() << 52)
}

impl Real for f64 {
    type Mask = bool;
    const LANES: usize = 1;
    #[inline(always)]
    fn splat(v: f64) -> Self {
        v
    }
    #[inline(always)]
    fn load(v: &[f64]) -> Self {
        v[0]
    }
    #[inline(always)]
    fn store(self, out: &mut [f64]) {
        out[0] = self;
    }
    #[inline(always)]
    fn sqrt(self) -> Self {
        f64::sqrt(self)
    }
    #[inline(always)]
    fn abs(self) -> Self {
        f64::abs(self)
    }
    #[inline(always)]
    fn lt(self, o: Self) -> bool {
        self < o
    }
    #[inline(always)]
    fn le(self, o: Self) -> bool {
        self <= o
    }
    #[inline(always)]
    fn select(m: bool, a: Self, b: Self) -> Self {
        if m {
            a
        } else {
            b
        }
    }
    #[inline(always)]
    fn mask_store(m: bool, out: &mut [bool]) {
        out[0] = m;
    }
    #[inline(always)]
    fn round(self) -> Self {
        (self + ROUNDER) - ROUNDER
    }
    #[inline(always)]
    fn pick5x4(r: [bool; 4], v: &[[f64; 4]; 5]) -> [Self; 4] {
        // One table row instead of chains of selects.
        v[usize::from(r[0]) + usize::from(r[1]) + usize::from(r[2]) + usize::from(r[3])]
    }
    #[inline(always)]
    fn split_exponent(self) -> (Self, Self) {
        split_exponent_bits(self.to_bits())
    }
    #[inline(always)]
    fn pow2i(k: Self) -> Self {
        pow2i_f64(k)
    }
}

/// A portable pack of lanes: plain arrays, lane by lane in `f64`.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Portable<const N: usize>([f64; N]);

/// The mask of [`Portable`].
#[derive(Debug, Clone, Copy)]
pub(crate) struct PortableMask<const N: usize>([bool; N]);

macro_rules! portable_binop {
    ($tr:ident, $f:ident, $op:tt) => {
        impl<const N: usize> $tr for Portable<N> {
            type Output = Self;
            #[inline(always)]
            fn $f(self, o: Self) -> Self {
                Portable(std::array::from_fn(|i| self.0[i] $op o.0[i]))
            }
        }
    };
}
portable_binop!(Add, add, +);
portable_binop!(Sub, sub, -);
portable_binop!(Mul, mul, *);
portable_binop!(Div, div, /);

impl<const N: usize> Neg for Portable<N> {
    type Output = Self;
    #[inline(always)]
    fn neg(self) -> Self {
        Portable(self.0.map(|v| -v))
    }
}

impl<const N: usize> BitAnd for PortableMask<N> {
    type Output = Self;
    #[inline(always)]
    fn bitand(self, o: Self) -> Self {
        PortableMask(std::array::from_fn(|i| self.0[i] & o.0[i]))
    }
}
impl<const N: usize> BitOr for PortableMask<N> {
    type Output = Self;
    #[inline(always)]
    fn bitor(self, o: Self) -> Self {
        PortableMask(std::array::from_fn(|i| self.0[i] | o.0[i]))
    }
}
impl<const N: usize> Not for PortableMask<N> {
    type Output = Self;
    #[inline(always)]
    fn not(self) -> Self {
        PortableMask(self.0.map(|b| !b))
    }
}
impl<const N: usize> Mask for PortableMask<N> {
    #[inline(always)]
    fn all(self) -> bool {
        self.0.iter().all(|&b| b)
    }
    #[inline(always)]
    fn any(self) -> bool {
        self.0.iter().any(|&b| b)
    }
}

impl<const N: usize> Real for Portable<N> {
    type Mask = PortableMask<N>;
    const LANES: usize = N;
    #[inline(always)]
    fn splat(v: f64) -> Self {
        Portable([v; N])
    }
    #[inline(always)]
    fn load(v: &[f64]) -> Self {
        Portable(std::array::from_fn(|i| v[i]))
    }
    #[inline(always)]
    fn store(self, out: &mut [f64]) {
        out[..N].copy_from_slice(&self.0);
    }
    #[inline(always)]
    fn sqrt(self) -> Self {
        Portable(self.0.map(f64::sqrt))
    }
    #[inline(always)]
    fn abs(self) -> Self {
        Portable(self.0.map(f64::abs))
    }
    #[inline(always)]
    fn lt(self, o: Self) -> Self::Mask {
        PortableMask(std::array::from_fn(|i| self.0[i] < o.0[i]))
    }
    #[inline(always)]
    fn le(self, o: Self) -> Self::Mask {
        PortableMask(std::array::from_fn(|i| self.0[i] <= o.0[i]))
    }
    #[inline(always)]
    fn select(m: Self::Mask, a: Self, b: Self) -> Self {
        Portable(std::array::from_fn(
            |i| if m.0[i] { a.0[i] } else { b.0[i] },
        ))
    }
    #[inline(always)]
    fn mask_store(m: Self::Mask, out: &mut [bool]) {
        out[..N].copy_from_slice(&m.0);
    }
    #[inline(always)]
    fn round(self) -> Self {
        Portable(self.0.map(<f64 as Real>::round))
    }
    #[inline(always)]
    fn split_exponent(self) -> (Self, Self) {
        let parts = self.0.map(|v| split_exponent_bits(v.to_bits()));
        (Portable(parts.map(|p| p.0)), Portable(parts.map(|p| p.1)))
    }
    #[inline(always)]
    fn pow2i(k: Self) -> Self {
        Portable(k.0.map(pow2i_f64))
    }
}

pub(crate) use pair::Pair;
#[cfg(target_arch = "x86_64")]
pub(crate) use x86::{F64x2, F64x4, F64x8};

mod pair;

#[cfg(target_arch = "x86_64")]
mod x86;

#[cfg(test)]
mod tests {
    use super::*;

    /// The exact helpers against std on their domains: exponent splitting
    /// against `log2` of powers of two and the definition `v = 2^e m`,
    /// `pow2i` against `powi`, rounding against `round_ties_even`.
    /// Source: IEEE 754 binary64 layout (exponent bias 1023, 52 fraction
    /// bits).
    #[test]
    fn exact_helpers_match_std() {
        for k in -1022..=1023 {
            let p = <f64 as Real>::pow2i(f64::from(k));
            assert_eq!(p.to_bits(), 2.0_f64.powi(k).to_bits(), "{k}");
            let (e, m) = (p * 1.5).split_exponent();
            assert_eq!((e, m.to_bits()), (f64::from(k), 1.5_f64.to_bits()));
        }
        for v in [
            -3.5,
            -2.5,
            -0.5,
            0.49999999999999994,
            0.5,
            1.5,
            2.5,
            1e15 + 0.5,
            -7.0,
        ] {
            // `+ 0.0`: the sign of a zero result is not kept (-0.5 -> +0).
            let r = <f64 as Real>::round(v) + 0.0;
            assert_eq!(r.to_bits(), (v.round_ties_even() + 0.0).to_bits(), "{v}");
        }
    }
}
