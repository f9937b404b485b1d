//! Regenerates the chart module's golden SVGs and writes preview charts
//! for a visual check.
//!
//! ```sh
//! # Rewrite src/chart/testdata/*.svg (only when a chart is meant to
//! # change; say why in the commit):
//! cargo run --release --example chart_fixtures -- golden
//! # Write the sample charts (SVG and PNG at several sizes, every panel,
//! # a page of two charts, PDFs, a span overview) into DIR to look at:
//! cargo run --release --example chart_fixtures -- preview DIR
//! ```
//!
//! The golden files are what `charts_match_the_golden_svgs` (in
//! `src/chart/tests.rs`) compares byte for byte. The charts are drawn from
//! the invented analytic grids of `synodic::chart::samples`; their figures
//! mean nothing physical.

use std::path::{Path, PathBuf};
use std::process::ExitCode;

use synodic::chart::samples::{
    analytic_grid, analytic_spec, golden_charts, overview_spec, panel_grid,
};
use synodic::chart::{
    overview_pdf, overview_png, overview_svg, page_png, render_panel_png, render_panel_svg,
    render_png, render_svg, synthetic_grid, Chart, ChartSpec, Marker, MarkerFigures, Panel,
    DEFAULT_HEIGHT_PX, DEFAULT_WIDTH_PX,
};
use synodic::export::write_atomic;
use synodic::sweep::SecondAxis;
use synodic::transfer::{Endpoints, ParkingOrbit, TransferType};

const USAGE: &str = "usage: chart_fixtures golden | chart_fixtures preview DIR";

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let outcome = match args.iter().map(String::as_str).collect::<Vec<_>>()[..] {
        ["golden"] => golden(),
        ["preview", dir] if Path::new(dir).is_dir() => preview(Path::new(dir)),
        ["preview", dir] => {
            eprintln!("chart_fixtures: {dir}: not a directory (create it first)");
            return ExitCode::from(2);
        }
        _ => {
            eprintln!("{USAGE}");
            return ExitCode::from(2);
        }
    };
    match outcome {
        Ok(n) => {
            println!("wrote {n} files");
            ExitCode::SUCCESS
        }
        Err(e) => {
            eprintln!("chart_fixtures: {e}");
            ExitCode::FAILURE
        }
    }
}

type Outcome = Result<usize, Box<dyn std::error::Error>>;

fn golden() -> Outcome {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("src/chart/testdata");
    let charts = golden_charts()?;
    for (name, svg) in &charts {
        write_atomic(&dir.join(name), svg.as_bytes())?;
    }
    Ok(charts.len())
}

/// Collects files to write, so that nothing is written when a chart fails.
struct Files {
    dir: PathBuf,
    files: Vec<(PathBuf, Vec<u8>)>,
}

impl Files {
    fn add(&mut self, name: &str, bytes: impl Into<Vec<u8>>) {
        self.files.push((self.dir.join(name), bytes.into()));
    }
}

fn preview(dir: &Path) -> Outcome {
    let mut out = Files {
        dir: dir.to_path_buf(),
        files: Vec::new(),
    };
    main_charts(&mut out)?;
    panels(&mut out)?;
    overview(&mut out)?;
    for (path, bytes) in &out.files {
        write_atomic(path, bytes)?;
    }
    Ok(out.files.len())
}

/// The main chart on both analytic grids, and on a 400 x 400 synthetic
/// grid with automatic levels and a marker at its lowest C3.
fn main_charts(out: &mut Files) -> Result<(), Box<dyn std::error::Error>> {
    let (w, h) = (DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX);
    let g = analytic_grid(SecondAxis::Arrival);
    let s = analytic_spec(&g);
    out.add("main-arrival.svg", render_svg(&s)?);
    out.add("main-arrival.png", render_png(&s, w, h)?);
    out.add("main-arrival-640.png", render_png(&s, 640, 480)?);
    let g = analytic_grid(SecondAxis::TimeOfFlight);
    let s = analytic_spec(&g);
    out.add("main-tof.svg", render_svg(&s)?);
    out.add("main-tof-1200.png", render_png(&s, 1200, 900)?);
    let g = synthetic_grid(400);
    let best = (0..g.cells())
        .filter(|&i| g.status[i] == 0)
        .min_by(|&a, &b| g.c3_km2_s2(a).total_cmp(&g.c3_km2_s2(b)))
        .ok_or("the synthetic grid has no solved cell")?;
    let (i, j) = (best / g.second.count, best % g.second.count);
    let (d, a) = g.dates_days(i, j);
    let s = ChartSpec {
        title: "Teodra → Kesh, 2031 opportunity".to_string(),
        subtitle: "Veyra system (invented) · departures 2031-01-01 to 2032-02-05".to_string(),
        markers: vec![Marker {
            depart_days: d,
            second: a,
            kind: TransferType::I,
            name: "Lowest C3".to_string(),
            figures: MarkerFigures {
                c3_km2_s2: Some(g.c3_km2_s2(best)),
                vinf_arrive_km_s: Some(g.vinf_arrive_km_s[best]),
                ..MarkerFigures::default()
            },
        }],
        max_c3: Some(20.0),
        ..ChartSpec::new(&g)
    };
    out.add("main-synthetic.svg", render_svg(&s)?);
    out.add("main-synthetic.png", render_png(&s, w, h)?);
    out.add("main-synthetic-wide.png", render_png(&s, 2400, 1000)?);
    // A page: the chart beside its total delta-v panel.
    let bare = Endpoints::bare();
    let main = Chart::window(&s)?;
    let dv = Chart::panel(&s, Panel::DvTotal, &bare)?;
    out.add(
        "page-synthetic.png",
        page_png("Teodra → Kesh, 2031", &[&main, &dv], 2, 2400)?,
    );
    out.add("main-synthetic.pdf", main.pdf()?);
    Ok(())
}

/// Every panel on the analytic panel grid; total delta-v also with a
/// parking orbit (a 200 km orbit of a body with Earth's mu and radius).
fn panels(out: &mut Files) -> Result<(), Box<dyn std::error::Error>> {
    let g = panel_grid();
    let s = analytic_spec(&g);
    let bare = Endpoints::bare();
    for panel in Panel::ALL {
        let name = panel.name();
        out.add(
            &format!("panel-{name}.svg"),
            render_panel_svg(&s, panel, &bare)?,
        );
        let png = render_panel_png(&s, panel, &bare, DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX)?;
        out.add(&format!("panel-{name}.png"), png);
        let small = render_panel_png(&s, panel, &bare, 800, 600)?;
        out.add(&format!("panel-{name}-800.png"), small);
    }
    let ends = Endpoints {
        parking: Some(ParkingOrbit {
            mu_km3_s2: 398_600.0,
            radius_km: 6_578.0,
        }),
        ..Endpoints::bare()
    };
    let svg = render_panel_svg(&s, Panel::DvTotal, &ends)?;
    out.add("panel-dv-total-parking.svg", svg);
    let g = analytic_grid(SecondAxis::TimeOfFlight);
    let s = analytic_spec(&g);
    let svg = render_panel_svg(&s, Panel::DvTotal, &bare)?;
    out.add("panel-dv-total-tof.svg", svg);
    Ok(())
}

/// The span overview of `samples::overview_spec` at two sizes.
fn overview(out: &mut Files) -> Result<(), Box<dyn std::error::Error>> {
    let spec = overview_spec();
    out.add("overview.svg", overview_svg(&spec)?);
    out.add("overview.png", overview_png(&spec, 1800, 1200)?);
    out.add("overview-900.png", overview_png(&spec, 900, 600)?);
    out.add("overview.pdf", overview_pdf(&spec)?);
    Ok(())
}
