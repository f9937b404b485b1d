//! Benchmarks: chart rendering.
//!
//! `chart/svg/1000` and `chart/png/1000`: a 1000 x 1000 synthetic grid
//! (automatic levels, a marker, the feasible-region shade) rendered to an
//! SVG string and to 1800 x 1350 PNG bytes; `chart/pdf/1000` converts
//! that SVG to PDF (the SVG drawn once, outside the timing).
//!
//! Run: `cargo bench --bench chart -- --warm-up-time 1 --measurement-time 3`

use std::hint::black_box;

use criterion::Criterion;
use synodic::chart::{
    render_png, render_svg, svg_to_pdf, synthetic_grid, ChartSpec, Marker, MarkerFigures,
    DEFAULT_HEIGHT_PX, DEFAULT_WIDTH_PX,
};
use synodic::transfer::TransferType;

/// What the synthetic chart must show (its grid has two C3 bowls either
/// side of a 180-degree ridge): several C3 isolines, the ridge, the shade
/// above the C3 ceiling, the marker and the title.
fn check_svg(svg: &str) {
    let c3_lines = svg.matches("class=\"c3\"").count();
    assert!(c3_lines >= 5, "{c3_lines} C3 isolines");
    for needle in [
        "class=\"ridge\"",
        "class=\"c3max\"",
        "marked",
        "Teodra → Kesh, 2031 opportunity",
    ] {
        assert!(svg.contains(needle), "SVG lacks {needle}");
    }
}

/// Width and height from a PNG's IHDR chunk (PNG specification, ISO/IEC
/// 15948: signature, then IHDR with big-endian width and height).
fn png_size(png: &[u8]) -> (u32, u32) {
    assert!(png.len() > 24 && png.starts_with(b"\x89PNG\r\n\x1a\n") && &png[12..16] == b"IHDR");
    let word = |k: usize| u32::from_be_bytes([png[k], png[k + 1], png[k + 2], png[k + 3]]);
    (word(16), word(20))
}

/// Before timing: the PNG decodes (the `png` crate) to the requested size
/// and is a picture, not a blank page (many colours).
fn check_once(spec: &ChartSpec<'_>) {
    let bytes = render_png(spec, DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX).expect("png renders");
    let mut reader = png::Decoder::new(std::io::Cursor::new(&bytes))
        .read_info()
        .expect("PNG header");
    let mut buf = vec![0u8; reader.output_buffer_size().expect("PNG size")];
    let info = reader.next_frame(&mut buf).expect("PNG frame");
    assert_eq!(
        (info.width, info.height),
        (DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX)
    );
    buf.truncate(info.buffer_size());
    let px = info.color_type.samples();
    let colours: std::collections::HashSet<&[u8]> = buf.chunks_exact(px).collect();
    assert!(colours.len() > 50, "only {} colours", colours.len());
    check_svg(&render_svg(spec).expect("svg renders"));
}

fn define(c: &mut Criterion) {
    let grid = synthetic_grid(1000);
    let spec = ChartSpec {
        title: "Teodra → Kesh, 2031 opportunity".to_string(),
        subtitle: "Veyra system (invented)".to_string(),
        markers: vec![Marker {
            depart_days: grid.depart.value(400),
            second: grid.second.value(300),
            kind: TransferType::I,
            name: "marked".to_string(),
            figures: MarkerFigures::default(),
        }],
        max_c3: Some(20.0),
        ..ChartSpec::new(&grid)
    };
    check_once(&spec);
    let mut group = c.benchmark_group("chart");
    group.sample_size(10);
    group.bench_function("svg/1000", |b| {
        b.iter(|| {
            let svg = render_svg(black_box(&spec)).expect("svg renders");
            check_svg(&svg);
            svg.len()
        })
    });
    group.bench_function("png/1000", |b| {
        b.iter(|| {
            let png = render_png(black_box(&spec), DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX)
                .expect("png renders");
            assert_eq!(
                png_size(&png),
                (DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX),
                "PNG size"
            );
            png.len()
        })
    });
    let svg = render_svg(&spec).expect("svg renders");
    group.bench_function("pdf/1000", |b| {
        b.iter(|| {
            let pdf = svg_to_pdf(black_box(&svg)).expect("pdf converts");
            assert!(pdf.starts_with(b"%PDF-") && pdf.len() > 10_000, "PDF");
            pdf.len()
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
