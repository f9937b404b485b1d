//! Benchmarks: body states from ephemeris files against mean elements
//! (criterion).
//!
//! `ephemeris_files/spk`: Mars barycentre relative to the Sun from the
//! DE421 excerpt (two Chebyshev links through the solar-system
//! barycentre), in the ecliptic frame. `ephemeris_files/oem`: the same
//! body from the Lagrange OEM fixture (degree 7, window of 8 lines).
//! `ephemeris_files/mean_elements`: the same body from Standish's Table 1
//! (rates applied, Kepler's equation, rotation) -- the reference.
//! Run: `cargo bench --bench ephemeris_files -- --warm-up-time 1 --measurement-time 3`.

use std::path::Path;

use criterion::{criterion_group, criterion_main, Criterion};
use std::hint::black_box;
use synodic::ephemeris::source::{Frame, Oem, SpkKernel};
use synodic::ephemeris::{ElementRates, MeanElements, AU_KM, JULIAN_CENTURY_DAYS};
use synodic::time::Epoch;

fn fixture(name: &str) -> std::path::PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("tests/fixtures")
        .join(name)
}

/// Mars' Table 1 elements and rates from the fixture file.
fn mars_elements() -> (MeanElements, ElementRates, f64) {
    let text = std::fs::read_to_string(fixture("standish-table1.toml")).expect("fixture");
    let table: toml::Value = toml::from_str(&text).expect("TOML");
    let mars = table["body"]
        .as_array()
        .expect("bodies")
        .iter()
        .find(|b| b["name"].as_str() == Some("Mars"))
        .expect("Mars");
    let num = |t: &toml::Value, k: &str| t[k].as_float().expect("number");
    let r = &mars["rates"];
    (
        MeanElements {
            a_km: num(mars, "a_au") * AU_KM,
            e: num(mars, "e"),
            i_deg: num(mars, "i_deg"),
            node_deg: num(mars, "node_deg"),
            peri_deg: num(mars, "lon_peri_deg"),
            mean_lon_deg: num(mars, "mean_lon_deg"),
        },
        ElementRates {
            a_km: num(r, "a_au") * AU_KM,
            e: num(r, "e"),
            i_deg: num(r, "i_deg"),
            node_deg: num(r, "node_deg"),
            peri_deg: num(r, "lon_peri_deg"),
            mean_lon_deg: num(r, "mean_lon_deg"),
        },
        table["central"]["mu_km3_s2"].as_float().expect("GM"),
    )
}

fn states(c: &mut Criterion) {
    let kernel = SpkKernel::open(fixture("de421/de421-excerpt.bsp")).expect("fixture");
    let spk = kernel.body(4, 10).expect("Mars wrt Sun");
    let oem = Oem::read(fixture("de421/mars-icrf-tdb.oem")).expect("fixture");
    let (elements, rates, mu) = mars_elements();
    let t0 = Epoch::parse("1996-01-02").expect("date");
    // Mars' heliocentric distance stays within 1.38-1.67 au.
    let plausible = |r_km: f64| (2.0e8..2.6e8).contains(&r_km);
    let mut group = c.benchmark_group("ephemeris_files");
    let mut day = 0.0_f64;
    group.bench_function("spk", |b| {
        b.iter(|| {
            day = (day + 7.3) % 1000.0;
            let s = spk
                .state(&t0.plus_days(black_box(day)), Frame::EclipticJ2000)
                .expect("covered");
            assert!(plausible(s.r_km.norm()));
            s
        })
    });
    group.bench_function("oem", |b| {
        b.iter(|| {
            day = (day + 7.3) % 1000.0;
            let s = oem
                .state(&t0.plus_days(black_box(day)), Frame::EclipticJ2000)
                .expect("covered");
            assert!(plausible(s.r_km.norm()));
            s
        })
    });
    group.bench_function("mean_elements", |b| {
        b.iter(|| {
            day = (day + 7.3) % 1000.0;
            let t = t0.plus_days(black_box(day));
            let s = elements
                .at(&rates, t.days_since_j2000_tdb() / JULIAN_CENTURY_DAYS)
                .state(mu)
                .expect("elements");
            assert!(plausible(s.r_km.norm()));
            s
        })
    });
    group.finish();
}

criterion_group! {
    name = benches;
    // Plots off: criterion draws them with plotters, whose fonts this
    // crate registers only for its own charts.
    config = Criterion::default().without_plots();
    targets = states
}
criterion_main!(benches);
