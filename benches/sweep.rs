//! Benchmarks: the grid sweep on the demo system.
//!
//! `sweep/zero_rev/{200,500,1000}`: square zero-revolution grids with every
//! figure computed (no file written), on all cores.
//! `sweep/threads/{1,all}`: a 500 x 500 grid on one thread and on all.
//!
//! Before timing, sampled cells of a 200 x 200 sweep are checked against
//! arcs verified by the universal-variable propagator, and the bare solves'
//! velocities are checked the same way; inside the timed loops the sweep's
//! solved-cell count and the bare solves' checksum must not change.
//!
//! Run: `cargo bench --bench sweep -- --warm-up-time 1 --measurement-time 5`;
//! quick check that every benchmark runs and asserts:
//! `cargo bench --bench sweep -- --test`.

use std::hint::black_box;

use criterion::{BenchmarkId, Criterion, Throughput};
use synodic::ephemeris::System;
use synodic::lambert::{solve_zero_rev, Direction, LambertSolution};
use synodic::orbit::{propagate, State};
use synodic::sweep::{sweep, Axis, Grid, RunOptions, SecondAxis, SweepSpec};
use synodic::time::Epoch;
use synodic::transfer::Endpoints;

fn spec(system: &System, n: usize) -> SweepSpec {
    let from = system.find("Teodra").expect("demo body");
    let to = system.find("Kesh").expect("demo body");
    let start = Epoch::parse("2031-01-01")
        .expect("date")
        .days_since_j2000_tdb();
    // 400 days of departures and 150-550 days of flight, n values each.
    let step_d = 400.0 / n as f64;
    SweepSpec {
        from,
        to,
        depart: Axis {
            start_days: start,
            step_days: step_d,
            count: n,
        },
        second: Axis {
            start_days: 150.0,
            step_days: step_d,
            count: n,
        },
        second_kind: SecondAxis::TimeOfFlight,
        max_revs: 0,
        ends: Endpoints::new(
            &system.bodies[from],
            &system.bodies[to],
            Some(200.0),
            Some((300.0, 0.5)),
        )
        .expect("demo bodies have GM and radius"),
    }
}

fn run(system: &System, spec: &SweepSpec, threads: Option<usize>) -> Grid {
    let grid = sweep(
        system,
        spec,
        RunOptions {
            threads,
            memory_limit_bytes: None,
        },
        || {},
    )
    .expect("sweep runs");
    // A sweep that computes nonsense fails the benchmark.
    let ok = grid.status.iter().filter(|&&s| s == 0).count();
    assert!(ok * 10 > grid.status.len() * 9, "only {ok} cells solved");
    assert!(grid
        .vinf_depart_km_s
        .iter()
        .take(1000)
        .any(|v| v.is_finite()));
    grid
}

/// Asserts that the arc from `(r1, s.v1)` reaches `(r2, s.v2)` after
/// `tof_s` (universal-variable propagation, Bate, Mueller & White 1971,
/// ch. 4). Tolerance: 1e-8 relative, the propagator's accuracy on these
/// arcs.
fn assert_lands(s1: &State, s2: &State, tof_s: f64, mu: f64, s: &LambertSolution) {
    let start = State {
        r_km: s1.r_km,
        v_km_s: s.v1,
    };
    let end = propagate(&start, tof_s, mu).expect("propagation of a sweep arc");
    let miss = (end.r_km - s2.r_km).norm() / s2.r_km.norm();
    let dv = (end.v_km_s - s.v2).norm() / s.v2.norm();
    assert!(miss < 1e-8 && dv < 1e-8, "miss {miss:e}, dv {dv:e}");
}

/// Every 7th cell of a sweep: its excess speeds are those of an arc that
/// the propagator confirms (relative 1e-12: the same f64 subtraction and
/// norm, in a frame rotated by the equator frame, ~10 ulp).
fn check_sampled_cells(system: &System, spec: &SweepSpec, grid: &Grid) {
    let mu = system.central.mu_km3_s2;
    let n2 = spec.second.count;
    let mut checked = 0;
    for k in (0..grid.status.len()).step_by(7) {
        if grid.status[k] != 0 {
            continue;
        }
        let (i, j) = (k / n2, k % n2);
        let dep = spec.depart.value(i);
        let tof_days = spec.second.value(j);
        let s1 = system.state_at_days(spec.from, dep);
        let s2 = system.state_at_days(spec.to, dep + tof_days);
        let tof_s = tof_days * 86_400.0;
        let normal = s1.r_km.cross(&s1.v_km_s);
        let sol = solve_zero_rev(
            &s1.r_km,
            &s2.r_km,
            tof_s,
            mu,
            Direction::Prograde,
            Some(&normal),
        )
        .expect("a solved cell solves");
        assert_lands(&s1, &s2, tof_s, mu, &sol);
        let vd = (sol.v1 - s1.v_km_s).norm();
        let va = (sol.v2 - s2.v_km_s).norm();
        let rel = |a: f64, b: f64| (a - b).abs() / b;
        assert!(rel(grid.vinf_depart_km_s[k], vd) < 1e-12, "cell {k}");
        assert!(rel(grid.vinf_arrive_km_s[k], va) < 1e-12, "cell {k}");
        checked += 1;
    }
    assert!(checked * 7 * 10 > grid.status.len() * 9, "{checked}");
}

/// The reference for the sweep's speed target: the same n x n Lambert
/// solves with nothing else (states precomputed), over all cores.
/// Returns the solved count and a checksum of every velocity; with
/// `verify`, each row's first solution is also checked by propagation.
fn bare_lambert(system: &System, spec: &SweepSpec, verify: bool) -> (usize, u64) {
    use rayon::prelude::*;
    let dep: Vec<_> = spec
        .depart
        .values()
        .iter()
        .map(|&d| system.state_at_days(spec.from, d))
        .collect();
    let n2 = spec.second.count;
    let mu = system.central.mu_km3_s2;
    // Departure and time-of-flight steps are equal in `spec`, so arrival
    // (i, j) falls on lattice point i + j.
    let arr: Vec<_> = (0..dep.len() + n2)
        .map(|k| {
            let d =
                spec.depart.start_days + spec.second.start_days + k as f64 * spec.depart.step_days;
            system.state_at_days(spec.to, d)
        })
        .collect();
    dep.par_iter()
        .enumerate()
        .map(|(i, s1)| {
            let normal = s1.r_km.cross(&s1.v_km_s);
            let mut ok = 0usize;
            let mut sum = 0.0_f64;
            for j in 0..n2 {
                let tof = spec.second.value(j);
                let s2 = &arr[i + j];
                // The checksum keeps the velocities: a solve whose result
                // is only tested for Ok would let the compiler skip them.
                if let Ok(sol) = solve_zero_rev(
                    &s1.r_km,
                    &s2.r_km,
                    tof * 86_400.0,
                    mu,
                    Direction::Prograde,
                    Some(&normal),
                ) {
                    if verify && ok == 0 {
                        assert_lands(s1, s2, tof * 86_400.0, mu, &sol);
                    }
                    sum = sum * 0.5 + (sol.v1.x + sol.v1.y + sol.v1.z) - sol.v2.x;
                    ok += 1;
                }
            }
            (ok, sum.to_bits())
        })
        .collect::<Vec<_>>()
        .into_iter()
        .fold((0, 0), |(n, h), (ok, bits)| {
            (n + ok, h.rotate_left(5) ^ bits)
        })
}

fn main() {
    // Plots off: criterion draws them with plotters, whose fonts this crate
    // registers only for its own charts.
    let mut c = Criterion::default()
        .without_plots()
        .configure_from_args()
        .sample_size(10);
    let system = System::demo();
    let small = spec(&system, 200);
    check_sampled_cells(&system, &small, &run(&system, &small, None));
    {
        let mut g = c.benchmark_group("sweep/zero_rev");
        for n in [200usize, 500, 1000] {
            let s = spec(&system, n);
            g.throughput(Throughput::Elements((n * n) as u64));
            g.bench_with_input(BenchmarkId::from_parameter(n), &s, |b, s| {
                b.iter(|| black_box(run(&system, black_box(s), None)))
            });
        }
        g.finish();
    }
    {
        let mut g = c.benchmark_group("sweep/bare_lambert");
        let s = spec(&system, 1000);
        let expected = bare_lambert(&system, &s, true);
        assert!(expected.0 > 900_000, "{expected:?}");
        g.throughput(Throughput::Elements(1000 * 1000));
        g.bench_function("1000", |b| {
            b.iter(|| assert_eq!(bare_lambert(&system, black_box(&s), false), expected))
        });
        g.finish();
    }
    {
        let mut g = c.benchmark_group("sweep/threads");
        let s = spec(&system, 500);
        g.throughput(Throughput::Elements(500 * 500));
        g.bench_function("1", |b| {
            b.iter(|| black_box(run(&system, black_box(&s), Some(1))))
        });
        g.bench_function("all", |b| {
            b.iter(|| black_box(run(&system, black_box(&s), None)))
        });
        g.finish();
    }
    c.final_summary();
}
