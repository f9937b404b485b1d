//! Benchmarks: ephemeris (criterion).
//!
//! `ephemeris/state`: one body state from mean elements (rates applied,
//! Kepler's equation, rotation), the inner call of a date sweep.
//! Run: `cargo bench --bench ephemeris -- --warm-up-time 1 --measurement-time 3`.

use criterion::{criterion_group, criterion_main, Criterion};
use std::hint::black_box;
use synodic::ephemeris::System;

fn state(c: &mut Criterion) {
    let system = System::demo();
    // The eccentric, inclined minor body: the most Kepler iterations.
    let body = system.find("Iskra").expect("demo body");
    let t0 = system.epoch.days_since_j2000_tdb();
    let mut day = 0.0_f64;
    c.bench_function("ephemeris/state", |b| {
        b.iter(|| {
            // Step through the orbit so that every mean anomaly is visited.
            day = (day + 7.3) % 3000.0;
            let s = system.state_at_days(black_box(body), black_box(t0 + day));
            assert!(s.r_km.norm().is_finite() && s.v_km_s.norm().is_finite());
            s
        })
    });
}

criterion_group! {
    name = benches;
    // Plots off: criterion draws them with plotters, whose fonts this
    // crate registers only for its own charts.
    config = Criterion::default().without_plots();
    targets = state
}
criterion_main!(benches);
