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
use synodic::transfer::{Endpoints, Leg, TransferType};
use synodic::windows::{scan, OpportunityWindow, ScanOptions};

/// Values, not just shapes, so that a benchmark computing nonsense fails:
/// - every interior optimum's C3 is at least Lambert's minimum-energy
///   bound for its two positions: no arc joining r1 and r2 has a smaller
///   semi-major axis than a_m = s / 2 (s the semi-perimeter of the
///   triangle Sun-r1-r2; Battin 1999, section 6.2, from memory), so the
///   departure speed is at least sqrt(mu (2 / r1 - 1 / a_m)) and the
///   excess speed at least that minus the body's speed;
/// - its Type agrees with the angle from r1 to r2 in the sense of motion;
/// - the lowest-C3 optima of consecutive opportunities are one synodic
///   period apart, within 15 % (the demo orbits' eccentricities shift
///   each opportunity by a few weeks).
fn check_windows(leg: &Leg<'_>, windows: &[OpportunityWindow], synodic_days: f64) {
    let system = leg.system;
    let mu = system.central.mu_km3_s2;
    let mut best_dates = Vec::new();
    for w in windows {
        let mut best: Option<(f64, f64)> = None;
        for o in w.optima.iter().filter(|o| !o.ridge && !o.edge) {
            let s1 = system.state_at_days(leg.from, o.depart_days);
            let s2 = system.state_at_days(leg.to, o.arrive_days);
            let (r1, r2) = (s1.r_km.norm(), s2.r_km.norm());
            let chord = (s2.r_km - s1.r_km).norm();
            let a_min = 0.25 * (r1 + r2 + chord);
            let v_min = (mu * (2.0 / r1 - 1.0 / a_min)).sqrt();
            let vinf_min = (v_min - s1.v_km_s.norm()).max(0.0);
            let c3 = o.figures.c3_km2_s2;
            assert!(
                c3 >= vinf_min * vinf_min * (1.0 - 1e-9),
                "{}: C3 {c3} below the minimum-energy bound {}",
                w.label,
                vinf_min * vinf_min
            );
            let h = s1.r_km.cross(&s1.v_km_s);
            let cos = s1.r_km.dot(&s2.r_km) / (r1 * r2);
            let mut angle = cos.clamp(-1.0, 1.0).acos().to_degrees();
            if s1.r_km.cross(&s2.r_km).dot(&h) < 0.0 {
                angle = 360.0 - angle;
            }
            let kind = if angle < 180.0 {
                TransferType::I
            } else {
                TransferType::II
            };
            assert_eq!(o.kind, kind, "{}: angle {angle} deg", w.label);
            if best.is_none_or(|(v, _)| c3 < v) {
                best = Some((c3, o.depart_days));
            }
        }
        if let Some((_, d)) = best {
            best_dates.push(d);
        }
    }
    for pair in best_dates.windows(2) {
        let gap = pair[1] - pair[0];
        assert!(
            (gap / synodic_days - 1.0).abs() < 0.15,
            "optima {gap} days apart, synodic period {synodic_days}"
        );
    }
}

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
    let synodic_days = system.synodic_period_days(leg.from, leg.to);
    c.bench_function("windows/scan/20y", |b| {
        b.iter(|| {
            let windows = scan(&leg, black_box(s0), black_box(s1), &opts).expect("scan runs");
            // Teodra and Kesh meet every 895 days: 8 or 9 opportunities.
            assert!(windows.len() >= 8, "{} opportunities", windows.len());
            assert!(windows.iter().all(|w| !w.optima.is_empty()));
            check_windows(&leg, &windows, synodic_days);
            black_box(windows)
        })
    });
    c.final_summary();
}
