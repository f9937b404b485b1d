//! Benchmarks: ephemeris (criterion).
//!
//! `ephemeris/state`: one body state from mean elements (rates applied,
//! Kepler's equation, rotation), the inner call of a date sweep.
//! Run: `cargo bench --bench ephemeris -- --warm-up-time 1 --measurement-time 3`.

use criterion::{criterion_group, criterion_main, Criterion};
use std::hint::black_box;
use synodic::ephemeris::System;

/// The states the benchmark visits obey vis-viva and the conic's angular
/// momentum (energy -mu/(2a), |r x v| = sqrt(mu a (1 - e^2)); Bate,
/// Mueller & White 1971, ch. 1), checked once before timing so that a
/// benchmark computing nonsense fails. Tolerance 1e-11: rounding.
fn check_states(system: &System, body: usize, t0: f64) {
    let mu = system.central.mu_km3_s2;
    let el = &system.bodies[body].elements;
    let (a, e) = (el.a_km, el.e);
    let h_want = (mu * a * (1.0 - e * e)).sqrt();
    let mut day = 0.0_f64;
    for _ in 0..500 {
        day = (day + 7.3) % 3000.0;
        let s = system.state_at_days(body, t0 + day);
        let energy = 0.5 * s.v_km_s.norm_squared() - mu / s.r_km.norm();
        assert!(
            (energy / (-mu / (2.0 * a)) - 1.0).abs() < 1e-11,
            "energy {energy} at day {day}"
        );
        let h = s.r_km.cross(&s.v_km_s).norm();
        assert!((h / h_want - 1.0).abs() < 1e-11, "|h| {h} at day {day}");
    }
}

fn state(c: &mut Criterion) {
    let system = System::demo();
    // The eccentric, inclined minor body: the most Kepler iterations.
    let body = system.find("Iskra").expect("demo body");
    let t0 = system.epoch.days_since_j2000_tdb();
    check_states(&system, body, t0);
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
