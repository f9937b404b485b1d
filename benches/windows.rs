//! Benchmarks: multi-opportunity window scans.
//!
//! `windows/scan/20y`: every Teodra -> Kesh opportunity of 2030-2050 on the
//! demo system, coarse sweeps and Nelder-Mead refinement, both Types.
//!
//! Run: `cargo bench --bench windows -- --warm-up-time 1 --measurement-time 10`

use std::hint::black_box;

use criterion::Criterion;
use synodic::ephemeris::System;
use synodic::sweep::Objective;
use synodic::time::Epoch;
use synodic::transfer::{Endpoints, Leg};
use synodic::windows::{scan, ScanOptions};

fn main() {
    // Plots off: criterion draws them with plotters, whose fonts this crate
    // registers only for its own charts.
    let mut c = Criterion::default()
        .without_plots()
        .configure_from_args()
        .sample_size(10);
    let system = System::demo();
    let leg = Leg {
        system: &system,
        from: system.find("Teodra").expect("demo body"),
        to: system.find("Kesh").expect("demo body"),
        ends: Endpoints::bare(),
        allow_flagged: false,
    };
    let s0 = Epoch::parse("2030-01-01")
        .expect("date")
        .days_since_j2000_tdb();
    let s1 = Epoch::parse("2050-01-01")
        .expect("date")
        .days_since_j2000_tdb();
    let opts = ScanOptions {
        objective: Objective::C3,
        tof_days: None,
        max_revs: 0,
        steps: 150,
        threads: None,
    };
    c.bench_function("windows/scan/20y", |b| {
        b.iter(|| {
            let windows = scan(&leg, black_box(s0), black_box(s1), &opts).expect("scan runs");
            // Teodra and Kesh meet every 895 days: 8 or 9 opportunities.
            assert!(windows.len() >= 8, "{} opportunities", windows.len());
            assert!(windows.iter().all(|w| !w.optima.is_empty()));
            black_box(windows)
        })
    });
    c.final_summary();
}
