//! Benchmarks: the grid sweep on the demo system.
//!
//! `sweep/zero_rev/{200,500,1000}`: square zero-revolution grids with every
//! figure computed (no file written), on all cores.
//! `sweep/threads/{1,all}`: a 500 x 500 grid on one thread and on all.
//!
//! Run: `cargo bench --bench sweep -- --warm-up-time 1 --measurement-time 5`

use std::hint::black_box;

use criterion::{BenchmarkId, Criterion, Throughput};
use synodic::ephemeris::System;
use synodic::sweep::{sweep, Axis, RunOptions, SecondAxis, SweepSpec};
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

fn run(system: &System, spec: &SweepSpec, threads: Option<usize>) {
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
    black_box(&grid);
}

/// The reference for the sweep's speed target: the same n x n Lambert
/// solves with nothing else (states precomputed), over all cores.
fn bare_lambert(system: &System, spec: &SweepSpec) -> usize {
    use rayon::prelude::*;
    use synodic::lambert::{solve_zero_rev, Direction};
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
            for j in 0..n2 {
                let tof = spec.second.value(j);
                let s2 = &arr[i + j];
                // black_box keeps the velocities: a solve whose result is
                // only tested for Ok would let the compiler skip them.
                if let Ok(sol) = solve_zero_rev(
                    &s1.r_km,
                    &s2.r_km,
                    tof * 86_400.0,
                    mu,
                    Direction::Prograde,
                    Some(&normal),
                ) {
                    black_box(&sol);
                    ok += 1;
                }
            }
            ok
        })
        .sum()
}

fn main() {
    // Plots off: criterion draws them with plotters, whose fonts this crate
    // registers only for its own charts.
    let mut c = Criterion::default()
        .without_plots()
        .configure_from_args()
        .sample_size(10);
    let system = System::demo();
    {
        let mut g = c.benchmark_group("sweep/zero_rev");
        for n in [200usize, 500, 1000] {
            let s = spec(&system, n);
            g.throughput(Throughput::Elements((n * n) as u64));
            g.bench_with_input(BenchmarkId::from_parameter(n), &s, |b, s| {
                b.iter(|| run(&system, black_box(s), None))
            });
        }
        g.finish();
    }
    {
        let mut g = c.benchmark_group("sweep/bare_lambert");
        let s = spec(&system, 1000);
        g.throughput(Throughput::Elements(1000 * 1000));
        g.bench_function("1000", |b| {
            b.iter(|| {
                let ok = bare_lambert(&system, black_box(&s));
                assert!(ok > 900_000, "{ok}");
            })
        });
        g.finish();
    }
    {
        let mut g = c.benchmark_group("sweep/threads");
        let s = spec(&system, 500);
        g.throughput(Throughput::Elements(500 * 500));
        g.bench_function("1", |b| b.iter(|| run(&system, black_box(&s), Some(1))));
        g.bench_function("all", |b| b.iter(|| run(&system, black_box(&s), None)));
        g.finish();
    }
    c.final_summary();
}
