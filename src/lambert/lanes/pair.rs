//! Two packs side by side as one: twice the lanes, and two independent
//! chains of dependent operations for the CPU to overlap (the solver is
//! bound by the latency of divisions, square roots and polynomial chains,
//! not by arithmetic throughput).

use super::{Mask, Real};
use std::ops::{Add, BitAnd, BitOr, Div, Mul, Neg, Not, Sub};

/// Lanes `0..R::LANES` in the first pack, the rest in the second.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Pair<R>(R, R);

/// The mask of [`Pair`].
#[derive(Debug, Clone, Copy)]
pub(crate) struct PairMask<M>(M, M);

macro_rules! pair_binop {
    ($tr:ident, $f:ident) => {
        impl<R: Real> $tr for Pair<R> {
            type Output = Self;
            #[inline(always)]
            fn $f(self, o: Self) -> Self {
                Pair(self.0.$f(o.0), self.1.$f(o.1))
            }
        }
    };
}
pair_binop!(Add, add);
pair_binop!(Sub, sub);
pair_binop!(Mul, mul);
pair_binop!(Div, div);

impl<R: Real> Neg for Pair<R> {
    type Output = Self;
    #[inline(always)]
    fn neg(self) -> Self {
        Pair(-self.0, -self.1)
    }
}

impl<M: Mask> BitAnd for PairMask<M> {
    type Output = Self;
    #[inline(always)]
    fn bitand(self, o: Self) -> Self {
        PairMask(self.0 & o.0, self.1 & o.1)
    }
}

impl<M: Mask> BitOr for PairMask<M> {
    type Output = Self;
    #[inline(always)]
    fn bitor(self, o: Self) -> Self {
        PairMask(self.0 | o.0, self.1 | o.1)
    }
}

impl<M: Mask> Not for PairMask<M> {
    type Output = Self;
    #[inline(always)]
    fn not(self) -> Self {
        PairMask(!self.0, !self.1)
    }
}

impl<M: Mask> Mask for PairMask<M> {
    #[inline(always)]
    fn all(self) -> bool {
        self.0.all() && self.1.all()
    }
    #[inline(always)]
    fn any(self) -> bool {
        self.0.any() || self.1.any()
    }
}

impl<R: Real> Real for Pair<R> {
    type Mask = PairMask<R::Mask>;
    const LANES: usize = 2 * R::LANES;
    #[inline(always)]
    fn splat(v: f64) -> Self {
        Pair(R::splat(v), R::splat(v))
    }
    #[inline(always)]
    fn load(v: &[f64]) -> Self {
        Pair(R::load(v), R::load(&v[R::LANES..]))
    }
    #[inline(always)]
    fn store(self, out: &mut [f64]) {
        self.0.store(out);
        self.1.store(&mut out[R::LANES..]);
    }
    #[inline(always)]
    fn sqrt(self) -> Self {
        Pair(self.0.sqrt(), self.1.sqrt())
    }
    #[inline(always)]
    fn abs(self) -> Self {
        Pair(self.0.abs(), self.1.abs())
    }
    #[inline(always)]
    fn lt(self, o: Self) -> Self::Mask {
        PairMask(self.0.lt(o.0), self.1.lt(o.1))
    }
    #[inline(always)]
    fn le(self, o: Self) -> Self::Mask {
        PairMask(self.0.le(o.0), self.1.le(o.1))
    }
    #[inline(always)]
    fn select(m: Self::Mask, a: Self, b: Self) -> Self {
        Pair(R::select(m.0, a.0, b.0), R::select(m.1, a.1, b.1))
    }
    #[inline(always)]
    fn mask_store(m: Self::Mask, out: &mut [bool]) {
        R::mask_store(m.0, out);
        R::mask_store(m.1, &mut out[R::LANES..]);
    }
    #[inline(always)]
    fn round(self) -> Self {
        Pair(self.0.round(), self.1.round())
    }
    #[inline(always)]
    fn split_exponent(self) -> (Self, Self) {
        let (e0, m0) = self.0.split_exponent();
        let (e1, m1) = self.1.split_exponent();
        (Pair(e0, e1), Pair(m0, m1))
    }
    #[inline(always)]
    fn pow2i(k: Self) -> Self {
        Pair(R::pow2i(k.0), R::pow2i(k.1))
    }
    #[inline(always)]
    fn pick5x4(r: [Self::Mask; 4], v: &[[f64; 4]; 5]) -> [Self; 4] {
        let a = R::pick5x4([r[0].0, r[1].0, r[2].0, r[3].0], v);
        let b = R::pick5x4([r[0].1, r[1].1, r[2].1, r[3].1], v);
        [
            Pair(a[0], b[0]),
            Pair(a[1], b[1]),
            Pair(a[2], b[2]),
            Pair(a[3], b[3]),
        ]
    }
}
