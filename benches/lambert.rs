//! Benchmarks: the Lambert solver (criterion).
//!
//! All zero-revolution benchmarks run on the shared case set
//! (`synodic::lambert::cases`, seed `BENCH_SEED`, 4096 problems: radii
//! 0.5-5 au, any transfer angle, planes inclined 0-30 deg, time of flight
//! 0.2-3 Hohmann times) and report **ns per solve**:
//! - `lambert/zero_rev`: `solve_zero_rev`, one problem at a time;
//! - `lambert/batch`: `solve_zero_rev_batch` on the whole set, on the
//!   widest lanes this CPU has, and `lambert/batch/<lanes>` on each lane
//!   set it has (`portable`, `sse2`, `avx2`, `avx512`): ns per solve, the
//!   same results as `lambert/zero_rev` bit for bit (asserted);
//! - `lambert/multi_rev`: `solve_revs` for M = 1 or 2, both branches
//!   (its own set with 6-12 Hohmann times of flight), ns per call.
//!
//! Before timing, every solution of the set is checked against the
//! universal-variable propagator (`synodic::orbit::propagate`): the arc
//! from `(r1, v1)` reaches `r2` and arrives with `v2`. Inside the timed
//! loop each block's results are summed and compared bit for bit with the
//! checked solutions' sum, so a benchmark that computes anything else
//! fails.
//!
//! Run: `cargo bench --bench lambert -- --warm-up-time 1 --measurement-time 3`;
//! quick check that every benchmark runs and asserts:
//! `cargo bench --bench lambert -- --test`.
//!
//! Instruction counts: with `SYNODIC_PROFILE=zero_rev` (or `batch`,
//! `multi_rev`) the binary skips criterion and solves the set
//! `SYNODIC_PROFILE_ROUNDS` times (default 10) in a function named
//! `profile_loop`, for
//! `valgrind --tool=callgrind --toggle-collect='*profile_loop*'`
//! (valgrind runs no AVX-512 code; its CPU reports none, so `batch` runs
//! on AVX2 there; `SYNODIC_LANES=portable|sse2|avx2|avx512` picks a lane
//! set). The same mode times solves in CPU time, which a loaded machine
//! disturbs less than wall time: `perf stat -r 5 -e task-clock`.

use criterion::Criterion;
use std::hint::black_box;
use std::time::{Duration, Instant};
use synodic::lambert::cases::{Cases, BENCH_SEED};
use synodic::lambert::{
    solve_revs, solve_zero_rev, solve_zero_rev_batch, solve_zero_rev_batch_on, LambertError,
    LambertProblem, LambertSolution, Lanes,
};
use synodic::orbit::{propagate, State};

const N_PROBLEMS: usize = 4096;

/// The zero-revolution case set.
fn zero_rev_set() -> Vec<LambertProblem> {
    Cases::take(BENCH_SEED, N_PROBLEMS)
        .into_iter()
        .map(|c| c.problem)
        .collect()
}

/// Multi-revolution problems: the case geometry with 6-12 Hohmann times
/// of flight, for M = 1 or 2 alternately, kept where a solution exists.
fn multi_rev_set() -> Vec<(LambertProblem, u32)> {
    Cases::take(0x5eed_0002, N_PROBLEMS)
        .into_iter()
        .enumerate()
        .map(|(k, c)| {
            let f = 6.0 + 6.0 * (k as f64 / N_PROBLEMS as f64);
            let p = LambertProblem {
                tof: f * c.hohmann_s,
                max_revs: 2,
                ..c.problem
            };
            (p, 1 + (k % 2) as u32)
        })
        .filter(|(p, m)| solve_revs(p, *m).is_ok())
        .collect()
}

fn solve_one(p: &LambertProblem) -> LambertSolution {
    solve_zero_rev(&p.r1, &p.r2, p.tof, p.mu, p.direction, None)
        .expect("every benchmark problem has a zero-revolution solution")
}

/// Asserts that the arc from `(r1, s.v1)` reaches `(r2, s.v2)` after
/// `tof` (universal-variable propagation, Bate, Mueller & White 1971,
/// ch. 4). Tolerance: 1e-8 relative, the propagator's own accuracy on
/// these arcs (the solver is good to ~1e-13).
fn assert_lands(p: &LambertProblem, s: &LambertSolution) {
    let start = State {
        r_km: p.r1,
        v_km_s: s.v1,
    };
    let end = propagate(&start, p.tof, p.mu).expect("propagation of a benchmark arc");
    let miss = (end.r_km - p.r2).norm() / p.r2.norm();
    let dv = (end.v_km_s - s.v2).norm() / s.v2.norm();
    assert!(miss < 1e-8 && dv < 1e-8, "{p:?}: miss {miss:e}, dv {dv:e}");
}

/// Order-dependent hash of every velocity component's bits: equal
/// hashes mean the same solutions (to any practical certainty).
fn checksum<'a>(sols: impl Iterator<Item = &'a LambertSolution>) -> u64 {
    let mut h = 0u64;
    for s in sols {
        for v in s.v1.iter().chain(s.v2.iter()) {
            h = (h.rotate_left(7) ^ v.to_bits()).wrapping_mul(0x9e37_79b9_7f4a_7c15);
        }
    }
    h
}

/// Times `solve` (which solves `n` problems) and reports the time per
/// problem; after each timed call, untimed, `check` must return the
/// expected checksum.
fn per_solve<S>(
    c: &mut Criterion,
    id: &str,
    n: usize,
    expected: u64,
    state: &mut S,
    mut solve: impl FnMut(&mut S),
    check: impl Fn(&S) -> u64,
) {
    c.bench_function(id, |b| {
        b.iter_custom(|iters| {
            let mut total = Duration::ZERO;
            for _ in 0..iters {
                let start = Instant::now();
                solve(state);
                total += start.elapsed();
                assert_eq!(check(state), expected, "{id}: results changed");
            }
            Duration::from_secs_f64(total.as_secs_f64() / n as f64)
        })
    });
}

/// Solves `set` into `out`, slot by slot, as the batch harness below does
/// (the instruction-count harness: nothing else runs inside, so
/// callgrind's count over this function is the solves').
#[inline(never)]
fn profile_loop(set: &[LambertProblem], out: &mut [Result<LambertSolution, LambertError>]) {
    for (o, p) in out.iter_mut().zip(set) {
        let p = black_box(p);
        *o = solve_zero_rev(&p.r1, &p.r2, p.tof, p.mu, p.direction, None);
    }
}

/// The batch solver on `set` (the instruction-count harness).
#[inline(never)]
fn profile_loop_batch(
    lanes: Lanes,
    set: &[LambertProblem],
    out: &mut [Result<LambertSolution, LambertError>],
) {
    solve_zero_rev_batch_on(lanes, set, out).expect("matching lengths, available lanes");
}

#[inline(never)]
fn profile_loop_multi(set: &[(LambertProblem, u32)], rounds: usize) -> usize {
    let mut n = 0;
    for _ in 0..rounds {
        for (p, m) in set {
            n += solve_revs(black_box(p), *m).map_or(0, |s| s.len());
        }
    }
    n
}

fn profile(which: &str) {
    let rounds = std::env::var("SYNODIC_PROFILE_ROUNDS")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(10);
    match which {
        "zero_rev" => {
            let set = zero_rev_set();
            let mut out = vec![Err(LambertError::ZeroReferenceNormal); set.len()];
            let mut sum = 0u64;
            for _ in 0..rounds {
                profile_loop(&set, &mut out);
                let sols = out
                    .iter()
                    .map(|r| r.as_ref().expect("every problem solves"));
                sum = sum.wrapping_add(checksum(sols));
            }
            println!("zero_rev: {} solves, checksum {sum:x}", rounds * set.len());
        }
        "batch" => {
            let set = zero_rev_set();
            let lanes = match std::env::var("SYNODIC_LANES").as_deref() {
                Ok("portable") => Lanes::Portable,
                Ok("sse2") => Lanes::Sse2,
                Ok("avx2") => Lanes::Avx2,
                Ok("avx512") => Lanes::Avx512,
                _ => Lanes::detect(),
            };
            let mut out = vec![Err(LambertError::ZeroReferenceNormal); set.len()];
            let mut sum = 0u64;
            for _ in 0..rounds {
                profile_loop_batch(lanes, &set, &mut out);
                let sols: Vec<_> = out.iter().map(|r| *r.as_ref().expect("solves")).collect();
                sum = sum.wrapping_add(checksum(sols.iter()));
            }
            println!(
                "batch ({lanes:?}): {} solves, checksum {sum:x}",
                rounds * set.len()
            );
        }
        "multi_rev" => {
            let set = multi_rev_set();
            let n = profile_loop_multi(&set, rounds);
            println!("multi_rev: {} calls, {n} solutions", rounds * set.len());
        }
        other => {
            panic!("SYNODIC_PROFILE: unknown benchmark {other:?} (zero_rev, batch, multi_rev)")
        }
    }
}

fn main() {
    if let Ok(which) = std::env::var("SYNODIC_PROFILE") {
        profile(&which);
        return;
    }
    // Plots off: criterion draws them with plotters, whose fonts this
    // crate registers only for its own charts.
    let mut c = Criterion::default().without_plots().configure_from_args();

    let zero = zero_rev_set();
    let reference: Vec<LambertSolution> = zero.iter().map(solve_one).collect();
    for (p, s) in zero.iter().zip(&reference) {
        assert_lands(p, s);
    }
    let iters: u32 = reference.iter().map(|s| s.iterations).sum();
    eprintln!(
        "lambert/zero_rev: average iterations {:.3} over {} problems",
        f64::from(iters) / zero.len() as f64,
        zero.len()
    );
    let expected = checksum(reference.iter());
    let mut sols = Vec::with_capacity(zero.len());
    per_solve(
        &mut c,
        "lambert/zero_rev",
        zero.len(),
        expected,
        &mut sols,
        |out| {
            out.clear();
            out.extend(zero.iter().map(|p| solve_one(black_box(p))));
        },
        |out| checksum(out.iter()),
    );

    // Batches: the same set, the same bits.
    let mut results = vec![Err(LambertError::ZeroReferenceNormal); zero.len()];
    let batch_sum = |out: &Vec<Result<LambertSolution, LambertError>>| {
        checksum(
            out.iter()
                .map(|r| r.as_ref().expect("every problem solves")),
        )
    };
    per_solve(
        &mut c,
        "lambert/batch",
        zero.len(),
        expected,
        &mut results,
        |out| solve_zero_rev_batch(black_box(&zero), out).expect("matching lengths"),
        batch_sum,
    );
    for lanes in Lanes::available() {
        let id = format!("lambert/batch/{}", format!("{lanes:?}").to_lowercase());
        per_solve(
            &mut c,
            &id,
            zero.len(),
            expected,
            &mut results,
            |out| solve_zero_rev_batch_on(lanes, black_box(&zero), out).expect("available"),
            batch_sum,
        );
    }

    let multi = multi_rev_set();
    let (mut n, mut it) = (0u32, 0u32);
    let mut multi_ref = Vec::new();
    for (p, m) in &multi {
        for s in solve_revs(p, *m).expect("kept because it solves") {
            assert_lands(p, &s);
            n += 1;
            it += s.iterations;
            multi_ref.push(s);
        }
    }
    eprintln!(
        "lambert/multi_rev: {} problems with solutions, average iterations per branch {:.3} \
         (including the T_min search)",
        multi.len(),
        f64::from(it) / f64::from(n)
    );
    let expected = checksum(multi_ref.iter());
    let mut sols = Vec::with_capacity(multi_ref.len());
    per_solve(
        &mut c,
        "lambert/multi_rev",
        multi.len(),
        expected,
        &mut sols,
        |out| {
            out.clear();
            for (p, m) in &multi {
                out.extend(solve_revs(black_box(p), *m).expect("multi-rev benchmark"));
            }
        },
        |out| checksum(out.iter()),
    );

    c.final_summary();
}
