//! Benchmarks: chart rendering.
//!
//! `chart/svg/1000` and `chart/png/1000`: a 1000 x 1000 synthetic grid
//! (automatic levels, a marker, the feasible-region shade) rendered to an
//! SVG string and to 1800 x 1350 PNG bytes.
//!
//! Run: `cargo bench --bench chart -- --warm-up-time 1 --measurement-time 3`

use std::hint::black_box;

use criterion::Criterion;
use synodic::chart::{
    render_png, render_svg, synthetic_grid, ChartSpec, Marker, DEFAULT_HEIGHT_PX, DEFAULT_WIDTH_PX,
};

fn define(c: &mut Criterion) {
    let grid = synthetic_grid(1000);
    let spec = ChartSpec {
        grid: &grid,
        layer: 0,
        title: "Teodra → Kesh, 2031 opportunity".to_string(),
        subtitle: "Veyra system (invented)".to_string(),
        c3_levels: None,
        vinf_levels: None,
        markers: vec![Marker {
            depart_days: grid.depart.value(400),
            second: grid.second.value(300),
            label: "marked".to_string(),
        }],
        max_c3: Some(20.0),
    };
    let mut group = c.benchmark_group("chart");
    group.sample_size(10);
    group.bench_function("svg/1000", |b| {
        b.iter(|| {
            let svg = render_svg(black_box(&spec)).expect("svg renders");
            assert!(svg.contains("class=\"c3\""));
            svg.len()
        })
    });
    group.bench_function("png/1000", |b| {
        b.iter(|| {
            let png = render_png(black_box(&spec), DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX)
                .expect("png renders");
            assert!(png.starts_with(b"\x89PNG"));
            png.len()
        })
    });
    group.finish();
}

fn main() {
    // Plots off: criterion draws them with plotters, whose fonts this crate
    // registers only for its own charts.
    let mut c = Criterion::default().without_plots().configure_from_args();
    define(&mut c);
    c.final_summary();
}
