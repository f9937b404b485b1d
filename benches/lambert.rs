//! Benchmarks: the Lambert solver (criterion).
//!
//! - `lambert/zero_rev`: one `solve_zero_rev` per iteration over a fixed,
//!   seeded set of heliocentric problems (radii 0.5-5 au, any transfer
//!   angle, tof 0.2-3 Hohmann times, mu = GM Sun, IAU 2009).
//! - `lambert/multi_rev`: `solve_revs` for M = 1..2, both branches.
//!
//! Every result is checked to be finite inside the timed loop, so a
//! benchmark that computes nonsense fails. The average iteration count
//! is printed once before timing.

use criterion::{criterion_group, criterion_main, Criterion};
use nalgebra::Vector3;
use std::f64::consts::{PI, TAU};
use std::hint::black_box;
use synodic::lambert::{solve_revs, solve_zero_rev, Direction, LambertProblem};

/// GM of the Sun, km^3/s^2 (IAU 2009 system of constants, TDB-compatible).
const MU_SUN: f64 = 1.327_124_400_41e11;
/// The astronomical unit, km (IAU 2012 Resolution B2).
const AU_KM: f64 = 149_597_870.7;
const N_PROBLEMS: usize = 4096;

/// splitmix64: a tiny seeded generator, so the problem set is fixed.
struct SplitMix(u64);

impl SplitMix {
    fn next_f64(&mut self) -> f64 {
        self.0 = self.0.wrapping_add(0x9e37_79b9_7f4a_7c15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xbf58_476d_1ce4_e5b9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94d0_49bb_1331_11eb);
        z ^= z >> 31;
        (z >> 11) as f64 / (1u64 << 53) as f64
    }
    fn range(&mut self, a: f64, b: f64) -> f64 {
        a + (b - a) * self.next_f64()
    }
}

fn problems(seed: u64, tof_factor: (f64, f64), max_revs: u32) -> Vec<LambertProblem> {
    let mut rng = SplitMix(seed);
    (0..N_PROBLEMS)
        .map(|_| {
            let ra = rng.range(0.5, 5.0) * AU_KM;
            let rb = rng.range(0.5, 5.0) * AU_KM;
            let phase = rng.range(0.0, TAU);
            // Transfer angle anywhere, avoiding the degenerate 1e-6 bands.
            let ang = rng.range(1e-3, TAU - 1e-3);
            let tilt = rng.range(-0.1, 0.1);
            let r1 = ra * Vector3::new(phase.cos(), phase.sin(), 0.0);
            let r2 = rb * Vector3::new((phase + ang).cos(), (phase + ang).sin(), tilt);
            let sma = 0.5 * (ra + rb);
            let hohmann = PI * (sma * sma * sma / MU_SUN).sqrt();
            let tof = rng.range(tof_factor.0, tof_factor.1) * hohmann;
            LambertProblem {
                r1,
                r2,
                tof,
                mu: MU_SUN,
                direction: if rng.next_f64() < 0.5 {
                    Direction::Prograde
                } else {
                    Direction::Retrograde
                },
                max_revs,
                reference_normal: None,
            }
        })
        .collect()
}

fn bench(c: &mut Criterion) {
    let zero = problems(0x5eed_0001, (0.2, 3.0), 0);
    let iters: u32 = zero
        .iter()
        .map(|p| {
            solve_zero_rev(&p.r1, &p.r2, p.tof, p.mu, p.direction, None)
                .expect("zero-rev benchmark problem")
                .iterations
        })
        .sum();
    eprintln!(
        "lambert/zero_rev: average iterations {:.3} over {} problems",
        f64::from(iters) / zero.len() as f64,
        zero.len()
    );
    let mut i = 0;
    c.bench_function("lambert/zero_rev", |b| {
        b.iter(|| {
            let p = &zero[i % N_PROBLEMS];
            i += 1;
            let s = solve_zero_rev(
                black_box(&p.r1),
                black_box(&p.r2),
                black_box(p.tof),
                black_box(p.mu),
                p.direction,
                None,
            )
            .expect("zero-rev benchmark problem");
            assert!(s.v1.x.is_finite() && s.v2.z.is_finite());
            s
        })
    });

    // Multi-revolution: enough time for 1 or 2 revolutions on every problem.
    let multi: Vec<(LambertProblem, u32)> = problems(0x5eed_0002, (6.0, 12.0), 2)
        .into_iter()
        .enumerate()
        .map(|(k, p)| (p, 1 + (k % 2) as u32))
        .filter(|(p, m)| solve_revs(p, *m).is_ok())
        .collect();
    let (mut n, mut it) = (0u32, 0u32);
    for (p, m) in &multi {
        for s in solve_revs(p, *m).unwrap() {
            n += 1;
            it += s.iterations;
        }
    }
    eprintln!(
        "lambert/multi_rev: {} problems with solutions, average iterations per branch {:.3} \
         (including the T_min search)",
        multi.len(),
        f64::from(it) / f64::from(n)
    );
    let mut j = 0;
    c.bench_function("lambert/multi_rev", |b| {
        b.iter(|| {
            let (p, m) = &multi[j % multi.len()];
            j += 1;
            let s = solve_revs(black_box(p), black_box(*m)).expect("multi-rev benchmark");
            assert!(s.len() == 2 && s[0].v1.x.is_finite() && s[1].v2.z.is_finite());
            s
        })
    });
}

criterion_group! {
    name = benches;
    // Plots off: criterion draws them with plotters, whose fonts this
    // crate registers only for its own charts.
    config = Criterion::default().without_plots();
    targets = bench
}
criterion_main!(benches);
