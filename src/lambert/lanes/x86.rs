//! x86-64 packs: SSE2 (2 lanes, the x86-64 baseline), AVX2 (4 lanes) and
//! AVX-512F (8 lanes), each implementing [`Real`] with the instructions
//! that compute exactly the scalar operation in every lane.
//!
//! # Safety
//! The AVX2 and AVX-512 methods call intrinsics of those extensions. A
//! value of [`F64x4`] or [`F64x8`] is only ever created inside a function
//! compiled with the matching `#[target_feature]` and entered after
//! run-time detection (`batch.rs`), and every method here is
//! `#[inline(always)]`, so each call runs inside such a function on a CPU
//! that has the extension.

use super::{Mask, Real, MAGIC_EXP, ONE_BITS, ROUNDER, TWO52_BITS};
use std::arch::x86_64::*;
use std::ops::{Add, BitAnd, BitOr, Div, Mul, Neg, Not, Sub};

/// Two lanes in an SSE2 register.
#[derive(Debug, Clone, Copy)]
pub(crate) struct F64x2(__m128d);
/// Mask of [`F64x2`]: all-ones or all-zeros per lane.
#[derive(Debug, Clone, Copy)]
pub(crate) struct M2(__m128d);
/// Four lanes in an AVX register.
#[derive(Debug, Clone, Copy)]
pub(crate) struct F64x4(__m256d);
/// Mask of [`F64x4`].
#[derive(Debug, Clone, Copy)]
pub(crate) struct M4(__m256d);
/// Eight lanes in an AVX-512 register.
#[derive(Debug, Clone, Copy)]
pub(crate) struct F64x8(__m512d);
/// Mask of [`F64x8`]: one bit per lane.
#[derive(Debug, Clone, Copy)]
pub(crate) struct M8(u8);

macro_rules! binops {
    ($t:ident, $add:ident, $sub:ident, $mul:ident, $div:ident) => {
        impl Add for $t {
            type Output = Self;
            #[inline(always)]
            fn add(self, o: Self) -> Self {
                // SAFETY: see the module docs.
                $t(unsafe { $add(self.0, o.0) })
            }
        }
        impl Sub for $t {
            type Output = Self;
            #[inline(always)]
            fn sub(self, o: Self) -> Self {
                // SAFETY: see the module docs.
                $t(unsafe { $sub(self.0, o.0) })
            }
        }
        impl Mul for $t {
            type Output = Self;
            #[inline(always)]
            fn mul(self, o: Self) -> Self {
                // SAFETY: see the module docs.
                $t(unsafe { $mul(self.0, o.0) })
            }
        }
        impl Div for $t {
            type Output = Self;
            #[inline(always)]
            fn div(self, o: Self) -> Self {
                // SAFETY: see the module docs.
                $t(unsafe { $div(self.0, o.0) })
            }
        }
    };
}
binops!(F64x2, _mm_add_pd, _mm_sub_pd, _mm_mul_pd, _mm_div_pd);
binops!(
    F64x4,
    _mm256_add_pd,
    _mm256_sub_pd,
    _mm256_mul_pd,
    _mm256_div_pd
);
binops!(
    F64x8,
    _mm512_add_pd,
    _mm512_sub_pd,
    _mm512_mul_pd,
    _mm512_div_pd
);

/// Mask operations for the packs whose masks are f64 registers.
macro_rules! vector_mask {
    ($m:ident, $and:ident, $or:ident, $xor:ident, $ones:expr, $movemask:ident, $full:expr) => {
        impl BitAnd for $m {
            type Output = Self;
            #[inline(always)]
            fn bitand(self, o: Self) -> Self {
                // SAFETY: see the module docs.
                $m(unsafe { $and(self.0, o.0) })
            }
        }
        impl BitOr for $m {
            type Output = Self;
            #[inline(always)]
            fn bitor(self, o: Self) -> Self {
                // SAFETY: see the module docs.
                $m(unsafe { $or(self.0, o.0) })
            }
        }
        impl Not for $m {
            type Output = Self;
            #[inline(always)]
            fn not(self) -> Self {
                // SAFETY: see the module docs.
                $m(unsafe { $xor(self.0, $ones) })
            }
        }
        impl Mask for $m {
            #[inline(always)]
            fn all(self) -> bool {
                // SAFETY: see the module docs.
                unsafe { $movemask(self.0) == $full }
            }
            #[inline(always)]
            fn any(self) -> bool {
                // SAFETY: see the module docs.
                unsafe { $movemask(self.0) != 0 }
            }
        }
    };
}
vector_mask!(
    M2,
    _mm_and_pd,
    _mm_or_pd,
    _mm_xor_pd,
    _mm_castsi128_pd(_mm_set1_epi64x(-1)),
    _mm_movemask_pd,
    0b11
);
vector_mask!(
    M4,
    _mm256_and_pd,
    _mm256_or_pd,
    _mm256_xor_pd,
    _mm256_castsi256_pd(_mm256_set1_epi64x(-1)),
    _mm256_movemask_pd,
    0b1111
);

impl BitAnd for M8 {
    type Output = Self;
    #[inline(always)]
    fn bitand(self, o: Self) -> Self {
        M8(self.0 & o.0)
    }
}
impl BitOr for M8 {
    type Output = Self;
    #[inline(always)]
    fn bitor(self, o: Self) -> Self {
        M8(self.0 | o.0)
    }
}
impl Not for M8 {
    type Output = Self;
    #[inline(always)]
    fn not(self) -> Self {
        M8(!self.0)
    }
}
impl Mask for M8 {
    #[inline(always)]
    fn all(self) -> bool {
        self.0 == 0xff
    }
    #[inline(always)]
    fn any(self) -> bool {
        self.0 != 0
    }
}

/// Bit-pattern constants as integer vectors (sign bit, fraction, one, 2^52).
const SIGN: i64 = i64::MIN;
const FRACTION_I: i64 = super::FRACTION as i64;
const ONE_I: i64 = ONE_BITS as i64;
const TWO52_I: i64 = TWO52_BITS as i64;

/// The [`Real`] methods every pack implements the same way, with the
/// register width's intrinsics; `$specific` adds the comparisons,
/// selection, mask readout and absolute value, which differ.
macro_rules! pack_real {
    (
        $t:ident, $mask:ident, $lanes:expr,
        set1 $set1:ident, loadu $loadu:ident, storeu $storeu:ident,
        sqrt $sqrt:ident, sub $sub:ident, set1_epi64 $set1i:ident,
        to_int $to_int:ident, to_f64 $to_f64:ident, srli $srli:ident,
        slli $slli:ident, or $or:ident, and $and:ident, xor $xor:ident,
        { $($specific:tt)* }
    ) => {
        impl Real for $t {
            type Mask = $mask;
            const LANES: usize = $lanes;
            #[inline(always)]
            fn splat(v: f64) -> Self {
                // SAFETY: see the module docs.
                $t(unsafe { $set1(v) })
            }
            #[inline(always)]
            fn load(v: &[f64]) -> Self {
                let v = &v[..$lanes];
                // SAFETY: `v` holds LANES f64 (checked above); unaligned load.
                $t(unsafe { $loadu(v.as_ptr()) })
            }
            #[inline(always)]
            fn store(self, out: &mut [f64]) {
                let out = &mut out[..$lanes];
                // SAFETY: `out` holds LANES f64 (checked above); unaligned store.
                unsafe { $storeu(out.as_mut_ptr(), self.0) }
            }
            #[inline(always)]
            fn sqrt(self) -> Self {
                // SAFETY: see the module docs.
                $t(unsafe { $sqrt(self.0) })
            }
            #[inline(always)]
            fn abs(self) -> Self {
                // SAFETY: see the module docs. Clears the sign bit.
                $t(unsafe { $to_f64($and($to_int(self.0), $set1i(i64::MAX))) })
            }
            #[inline(always)]
            fn round(self) -> Self {
                let r = Self::splat(ROUNDER);
                (self + r) - r
            }
            #[inline(always)]
            fn split_exponent(self) -> (Self, Self) {
                // SAFETY: see the module docs. Integer shifts and masks on
                // the bits.
                unsafe {
                    let bits = $to_int(self.0);
                    let e = $or($srli::<52>(bits), $set1i(TWO52_I));
                    let m = $or($and(bits, $set1i(FRACTION_I)), $set1i(ONE_I));
                    (
                        $t($sub($to_f64(e), $set1(MAGIC_EXP))),
                        $t($to_f64(m)),
                    )
                }
            }
            #[inline(always)]
            fn pow2i(k: Self) -> Self {
                let biased = k + Self::splat(MAGIC_EXP);
                // SAFETY: see the module docs.
                $t(unsafe { $to_f64($slli::<52>($to_int(biased.0))) })
            }
            $($specific)*
        }

        impl Neg for $t {
            type Output = Self;
            #[inline(always)]
            fn neg(self) -> Self {
                // SAFETY: see the module docs. Sign flip by an integer xor
                // (exact, keeps -0; AVX-512F has no f64 xor).
                $t(unsafe { $to_f64($xor($to_int(self.0), $set1i(SIGN))) })
            }
        }
    };
}

pack_real!(
    F64x2, M2, 2,
    set1 _mm_set1_pd, loadu _mm_loadu_pd, storeu _mm_storeu_pd,
    sqrt _mm_sqrt_pd, sub _mm_sub_pd, set1_epi64 _mm_set1_epi64x,
    to_int _mm_castpd_si128, to_f64 _mm_castsi128_pd, srli _mm_srli_epi64,
    slli _mm_slli_epi64, or _mm_or_si128, and _mm_and_si128, xor _mm_xor_si128,
    {
        #[inline(always)]
        fn lt(self, o: Self) -> M2 {
            // SAFETY: see the module docs. Ordered: false with a NaN.
            M2(unsafe { _mm_cmplt_pd(self.0, o.0) })
        }
        #[inline(always)]
        fn le(self, o: Self) -> M2 {
            // SAFETY: see the module docs. Ordered: false with a NaN.
            M2(unsafe { _mm_cmple_pd(self.0, o.0) })
        }
        #[inline(always)]
        fn select(m: M2, a: Self, b: Self) -> Self {
            // SAFETY: see the module docs.
            F64x2(unsafe { _mm_or_pd(_mm_and_pd(m.0, a.0), _mm_andnot_pd(m.0, b.0)) })
        }
        #[inline(always)]
        fn mask_store(m: M2, out: &mut [bool]) {
            // SAFETY: see the module docs.
            let bits = unsafe { _mm_movemask_pd(m.0) };
            for (i, o) in out[..2].iter_mut().enumerate() {
                *o = bits >> i & 1 == 1;
            }
        }
    }
);

pack_real!(
    F64x4, M4, 4,
    set1 _mm256_set1_pd, loadu _mm256_loadu_pd, storeu _mm256_storeu_pd,
    sqrt _mm256_sqrt_pd, sub _mm256_sub_pd, set1_epi64 _mm256_set1_epi64x,
    to_int _mm256_castpd_si256, to_f64 _mm256_castsi256_pd, srli _mm256_srli_epi64,
    slli _mm256_slli_epi64, or _mm256_or_si256, and _mm256_and_si256,
    xor _mm256_xor_si256,
    {
        #[inline(always)]
        fn lt(self, o: Self) -> M4 {
            // SAFETY: see the module docs. Ordered, quiet: false with a NaN.
            M4(unsafe { _mm256_cmp_pd::<_CMP_LT_OQ>(self.0, o.0) })
        }
        #[inline(always)]
        fn le(self, o: Self) -> M4 {
            // SAFETY: see the module docs. Ordered, quiet: false with a NaN.
            M4(unsafe { _mm256_cmp_pd::<_CMP_LE_OQ>(self.0, o.0) })
        }
        #[inline(always)]
        fn select(m: M4, a: Self, b: Self) -> Self {
            // SAFETY: see the module docs. blendv takes the second operand
            // where the mask's sign bit is set.
            F64x4(unsafe { _mm256_blendv_pd(b.0, a.0, m.0) })
        }
        #[inline(always)]
        fn mask_store(m: M4, out: &mut [bool]) {
            // SAFETY: see the module docs.
            let bits = unsafe { _mm256_movemask_pd(m.0) };
            for (i, o) in out[..4].iter_mut().enumerate() {
                *o = bits >> i & 1 == 1;
            }
        }
    }
);

pack_real!(
    F64x8, M8, 8,
    set1 _mm512_set1_pd, loadu _mm512_loadu_pd, storeu _mm512_storeu_pd,
    sqrt _mm512_sqrt_pd, sub _mm512_sub_pd, set1_epi64 _mm512_set1_epi64,
    to_int _mm512_castpd_si512, to_f64 _mm512_castsi512_pd, srli _mm512_srli_epi64,
    slli _mm512_slli_epi64, or _mm512_or_si512, and _mm512_and_si512,
    xor _mm512_xor_si512,
    {
        #[inline(always)]
        fn lt(self, o: Self) -> M8 {
            // SAFETY: see the module docs. Ordered, quiet: false with a NaN.
            M8(unsafe { _mm512_cmp_pd_mask::<_CMP_LT_OQ>(self.0, o.0) })
        }
        #[inline(always)]
        fn le(self, o: Self) -> M8 {
            // SAFETY: see the module docs. Ordered, quiet: false with a NaN.
            M8(unsafe { _mm512_cmp_pd_mask::<_CMP_LE_OQ>(self.0, o.0) })
        }
        #[inline(always)]
        fn select(m: M8, a: Self, b: Self) -> Self {
            // SAFETY: see the module docs. The blend takes its second
            // operand where the mask bit is set.
            F64x8(unsafe { _mm512_mask_blend_pd(m.0, b.0, a.0) })
        }
        #[inline(always)]
        fn mask_store(m: M8, out: &mut [bool]) {
            for (i, o) in out[..8].iter_mut().enumerate() {
                *o = m.0 >> i & 1 == 1;
            }
        }
    }
);
