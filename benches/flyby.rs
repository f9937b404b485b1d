//! Benchmarks: gravity-assist sequence searches on the Standish Table 1
//! test fixture (real planets' mean elements, test data only), 1-day grid
//! steps, default time-of-flight ranges and limits.
//!
//! - `flyby/evm/1y`: Earth-Moon barycentre -> Venus -> Mars, departures
//!   over 2030.
//! - `flyby/evej/2y`: Earth-Moon barycentre -> Venus -> Earth-Moon
//!   barycentre -> Jupiter, departures over 2030-2031.
//! - `flyby/evej-wide/2y`: the same with the Venus -> EMB leg at 150-700
//!   days and up to one revolution, C3 at most 40 km^2/s^2, flyby
//!   impulses up to 2 km/s.
//!
//! Target (issue 15): each under 30 s on 2 cores.
//!
//! Run: `cargo bench --bench flyby -- --warm-up-time 1 --measurement-time 20`
//! (`cargo run --release --example flyby_timing` prints the same searches'
//! wall times and pruning counts).

use std::hint::black_box;

use criterion::Criterion;
use synodic::ephemeris::System;
use synodic::flyby::{search_sequence, SequenceSpec};
use synodic::time::Epoch;

fn main() {
    // Plots off: criterion draws them with plotters, whose fonts this crate
    // registers only for its own charts.
    let mut c = Criterion::default()
        .without_plots()
        .configure_from_args()
        .sample_size(10);
    let system = System::from_toml_str(
        include_str!("../tests/fixtures/standish-flyby.toml"),
        "standish-flyby.toml",
    )
    .expect("fixture parses");
    let body = |name| system.find(name).expect("fixture body");
    let (emb, venus, mars, jupiter) = (
        body("Earth-Moon Barycenter"),
        body("Venus"),
        body("Mars"),
        body("Jupiter"),
    );
    let first = Epoch::parse("2030-01-01").expect("date");

    let evm = SequenceSpec::new(vec![emb, venus, mars], first, first.plus_days(365.0), 1.0);
    c.bench_function("flyby/evm/1y", |b| {
        b.iter(|| {
            let found = search_sequence(&system, black_box(&evm)).expect("valid spec");
            let best = &found.trajectories[0];
            // A Venus flyby route to Mars with a modest launch (2030:
            // C3 near 25 km^2/s^2) and the flyby at or above the 300 km
            // default minimum.
            assert!(best.c3_km2_s2 < 40.0, "C3 {}", best.c3_km2_s2);
            assert!(best.flybys[0].altitude_km >= 300.0);
            black_box(found)
        })
    });

    let evej = SequenceSpec::new(
        vec![emb, venus, emb, jupiter],
        first,
        first.plus_days(730.0),
        1.0,
    );
    c.bench_function("flyby/evej/2y", |b| {
        b.iter(|| {
            let found = search_sequence(&system, black_box(&evej)).expect("valid spec");
            assert!(!found.trajectories.is_empty());
            assert!(found.stats.pairs_examined < found.stats.pairs_possible);
            black_box(found)
        })
    });
    // Venus-Earth gravity-assist routes to Jupiter need a longer Venus ->
    // EMB leg, here with up to one revolution.
    let mut wide = evej.clone();
    wide.tof_days = vec![None, Some((150.0, 700.0)), None];
    wide.max_revs = vec![0, 1, 0];
    wide.c3_max_km2_s2 = Some(40.0);
    wide.max_flyby_dv_km_s = 2.0;
    c.bench_function("flyby/evej-wide/2y", |b| {
        b.iter(|| {
            let found = search_sequence(&system, black_box(&wide)).expect("valid spec");
            let best = &found.trajectories[0];
            assert!(best.c3_km2_s2 <= 40.0 + 1e-9);
            assert!(best.flybys.iter().all(|f| f.altitude_km >= 300.0));
            black_box(found)
        })
    });
    c.final_summary();
}
