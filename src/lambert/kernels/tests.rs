//! The kernels against std's `f64` functions (the outside reference:
//! glibc's, or the platform's, correctly rounded in nearly all cases) over
//! each kernel's domain, in units in the last place.

use super::*;
use crate::lambert::lanes::Portable;

/// Distance in units in the last place of `reference`.
fn ulps(got: f64, reference: f64) -> f64 {
    if got.to_bits() == reference.to_bits() {
        return 0.0;
    }
    let spacing = f64::from_bits(reference.abs().to_bits() + 1) - reference.abs();
    (got - reference).abs() / spacing
}

/// A deterministic uniform stream on [0, 1) (splitmix64).
struct Stream(u64);
impl Stream {
    fn unit(&mut self) -> f64 {
        self.0 = self.0.wrapping_add(0x9e37_79b9_7f4a_7c15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xbf58_476d_1ce4_e5b9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94d0_49bb_1331_11eb);
        z ^= z >> 31;
        (z >> 11) as f64 / (1u64 << 53) as f64
    }
    /// Log-uniform magnitude in [10^lo, 10^hi).
    fn log_uniform(&mut self, lo: f64, hi: f64) -> f64 {
        10f64.powf(lo + (hi - lo) * self.unit())
    }
}

/// Largest ulp distance of `kernel` from `reference` over `inputs`,
/// with the arguments where it occurs.
fn worst<I: Copy + std::fmt::Debug>(
    inputs: impl Iterator<Item = I>,
    kernel: impl Fn(I) -> f64,
    reference: impl Fn(I) -> f64,
) -> (f64, Option<I>) {
    let mut w = (0.0, None);
    for a in inputs {
        let d = ulps(kernel(a), reference(a));
        if d > w.0 || d.is_nan() {
            w = (d, Some(a));
        }
    }
    w
}

/// Tolerance of every kernel: 1 ulp of the correctly rounded value. A
/// kernel within ~0.5 ulp of the exact value and a reference within 0.5
/// ulp are at most 1 ulp apart.
const MAX_ULPS: f64 = 1.0;

/// atan2 on the upper half-plane, against `f64::atan2`: random angles
/// with radii over 40 decades, each region boundary, the axes, and both
/// signs of `x`.
#[test]
fn atan2_upper_within_one_ulp() {
    let mut s = Stream(1);
    let mut pts = vec![
        (0.0, 1.0),
        (0.0, -1.0),
        (1.0, 0.0),
        (1.0, -0.0),
        (1.0, 1.0),
        (1.0, -1.0),
    ];
    for t in [0.4375, 0.6875, 1.1875, 2.4375] {
        for d in [-2.0, -1.0, 0.0, 1.0, 2.0] {
            let y = t + d * f64::EPSILON * t;
            pts.extend([(y, 1.0), (y, -1.0), (1.0, y), (1.0, -y)]);
        }
    }
    for _ in 0..1_000_000 {
        let y = s.log_uniform(-20.0, 20.0);
        let x = s.log_uniform(-20.0, 20.0) * if s.unit() < 0.5 { -1.0 } else { 1.0 };
        pts.push((y, x));
        // Angles near 0, pi/2 and pi as well.
        pts.push((y * 1e-12, x));
    }
    let (w, at) = worst(
        pts.iter().copied(),
        |(y, x)| atan2_upper(y, x),
        |(y, x): (f64, f64)| y.atan2(x),
    );
    assert!(w <= MAX_ULPS, "{w} ulp at {at:?}");
}

/// Natural logarithm against `f64::ln` from 1e-300 to 1e300, near 1, and
/// at the reduction boundaries sqrt(2) 2^k.
#[test]
fn ln_within_one_ulp() {
    let mut s = Stream(2);
    let mut pts: Vec<f64> = (0..1_000_000)
        .map(|_| s.log_uniform(-300.0, 300.0))
        .collect();
    pts.extend((0..200_000).map(|_| 1.0 + (s.unit() - 0.5) * 1e-3));
    pts.extend((0..200_000).map(|_| 0.5 + s.unit()));
    for k in -5..5 {
        let b = std::f64::consts::SQRT_2 * 2f64.powi(k);
        pts.extend([b, b.next_up(), b.next_down(), 2f64.powi(k)]);
    }
    let (w, at) = worst(pts.iter().copied(), ln, f64::ln);
    assert!(w <= MAX_ULPS, "{w} ulp at {at:?}");
}

/// asinh for s >= 0 against std's `f64::asinh` from 1e-20 to 1e150 and
/// around the switches between exponents of `1 + a` (sqrt(2),
/// 2 sqrt(2)), and against 50-digit values.
///
/// Unlike std's atan2, ln and exp2 (from the C library, correctly rounded
/// in nearly all cases), std's `asinh` is a formula with four roundings,
/// itself about an ulp off (at s = 0.46786106834637137 it gives
/// 0.45228277865511535, the exact value is 0.4522827786551154...), so the
/// sweep allows 2 ulp between the two. The exact values (mpmath 1.3 at 50
/// digits, as head + tail) bound the kernel's own error. Tolerance 1.5
/// ulp: the argument `a` carries about two roundings of its smaller term
/// (up to ~0.4 ulp of the result), the tail ~0.1 and the last rounding
/// 0.5; the largest seen is 1.27 ulp (s = 0.3848832066810046).
#[test]
fn asinh_pos_within_one_ulp() {
    let mut s = Stream(3);
    let mut pts: Vec<f64> = (0..1_000_000)
        .map(|_| s.log_uniform(-20.0, 150.0))
        .collect();
    pts.extend((0..200_000).map(|_| 0.3 + 0.2 * s.unit()));
    pts.extend((0..200_000).map(|_| 1.5 + 2.0 * s.unit()));
    pts.push(0.0);
    let (w, at) = worst(pts.iter().copied(), asinh_pos, f64::asinh);
    assert!(w <= 2.0, "{w} ulp at {at:?}");
    let exact = [
        (
            0.3848832066810046,
            0.3759634222714074,
            1.5025070795843854e-17,
        ),
        (1e-10_f64, 1e-10_f64, -1.6666666666666669e-31_f64),
        (0.001, 0.0009999998333334083, 1.0227947063237223e-19),
        (0.1, 0.09983407889920756, 6.565457464795216e-18),
        (0.3, 0.29567304756342244, -1.351693404864361e-17),
        (0.35, 0.34322155508594393, 1.1028722278663587e-17),
        (0.431243581365589, 0.4188856814034265, 5.303474667131702e-18),
        (
            0.46786106834637137,
            0.4522827786551154,
            -6.025027780308434e-18,
        ),
        (
            0.9124800356698962,
            0.8181145367951034,
            1.0104872113530559e-17,
        ),
        (1.0, 0.881373587019543, -2.250545892825866e-17),
        (2.5, 1.6472311463710958, -8.953786186897676e-17),
        (100.0, 5.298342365610589, -4.262681373053589e-17),
        (1e10, 23.7189981105004, 1.294128121094199e-15),
        (1e100, 230.95165647996453, -1.2897706980035535e-14),
    ];
    for (x, hi, lo) in exact {
        let spacing = f64::from_bits(hi.to_bits() + 1) - hi;
        let err = ((asinh_pos(x) - hi) - lo) / spacing;
        assert!(err.abs() <= 1.5, "asinh({x}): {err} ulp");
    }
}

/// 2^e against `f64::exp2` on [-1022, 1023] and near integers and
/// half-integers (the reduction's boundaries).
#[test]
fn exp2_within_one_ulp() {
    let mut s = Stream(4);
    let mut pts: Vec<f64> = (0..1_000_000)
        .map(|_| -1022.0 + 2045.0 * s.unit())
        .collect();
    pts.extend((0..200_000).map(|_| -3.0 + 6.0 * s.unit()));
    for k in -4..4 {
        let b = f64::from(k) + 0.5;
        pts.extend([f64::from(k), b, b.next_up(), b.next_down()]);
    }
    let (w, at) = worst(pts.iter().copied(), exp2, f64::exp2);
    assert!(w <= MAX_ULPS, "{w} ulp at {at:?}");
}

/// Cube root against `f64::cbrt` from 1e-300 to 1e300, and across the
/// exponent residues (v = 2^k m for k = -6..6, m near 1 and 2).
#[test]
fn cbrt_within_one_ulp() {
    let mut s = Stream(6);
    let mut pts: Vec<f64> = (0..1_000_000)
        .map(|_| s.log_uniform(-300.0, 300.0))
        .collect();
    for k in -6..6 {
        let b = 2f64.powi(k);
        pts.extend([b, b.next_up(), b.next_down(), 2.0 * b.next_down()]);
        pts.extend((0..10_000).map(|_| b * (1.0 + s.unit())));
    }
    let (w, at) = worst(pts.iter().copied(), cbrt, f64::cbrt);
    assert!(w <= MAX_ULPS, "{w} ulp at {at:?}");
}

/// Every lane type gives the f64 kernel's bits in every lane (the
/// property the batch solver rests on), including at the reduction
/// boundaries and for both signs of zero.
/// Source: IEEE 754 (each lane operation is the scalar operation).
#[test]
fn lane_types_agree_bitwise() {
    let mut s = Stream(5);
    let mut ys: Vec<f64> = vec![0.0, -0.0, 0.4375, 0.6875, 1.1875, 2.4375, 1.0, 0.5];
    ys.extend((0..4000).map(|_| s.log_uniform(-10.0, 10.0)));
    let xs: Vec<f64> = ys.iter().map(|&y| (y * 7.3).fract() - 0.5).collect();
    type Lanes = dyn Fn(&[f64], &[f64], &mut [f64; 4]);
    let check = |name: &str, lanes: &Lanes| {
        for (yc, xc) in ys.chunks_exact(4).zip(xs.chunks_exact(4)) {
            let mut out = [0.0; 4];
            lanes(yc, xc, &mut out);
            for i in 0..4 {
                let (y, x) = (yc[i].abs(), xc[i]);
                let want = [
                    atan2_upper(y, x),
                    ln(y.max(1e-300)),
                    asinh_pos(y),
                    exp2(x * 40.0),
                    cbrt(y.max(1e-300)),
                ]
                .iter()
                .fold(0u64, |h, v| h.rotate_left(17) ^ v.to_bits());
                assert_eq!(out[i].to_bits(), want, "{name} lane {i}: y {y}, x {x}");
            }
        }
    };
    fn fold<R: Real>(y: &[f64], x: &[f64], out: &mut [f64; 4]) {
        for (k, (yc, xc)) in y
            .chunks_exact(R::LANES)
            .zip(x.chunks_exact(R::LANES))
            .enumerate()
        {
            let (y, x) = (R::load(yc).abs(), R::load(xc));
            let vals = [
                atan2_upper(y, x),
                ln(y.max(R::splat(1e-300))),
                asinh_pos(y),
                exp2(x * R::splat(40.0)),
                cbrt(y.max(R::splat(1e-300))),
            ];
            let mut lanes = [[0.0; 8]; 5];
            for (v, l) in vals.iter().zip(lanes.iter_mut()) {
                v.store(l);
            }
            for i in 0..R::LANES {
                out[k * R::LANES + i] = f64::from_bits(
                    lanes
                        .iter()
                        .fold(0u64, |h, l| h.rotate_left(17) ^ l[i].to_bits()),
                );
            }
        }
    }
    check("portable", &fold::<Portable<4>>);
}
