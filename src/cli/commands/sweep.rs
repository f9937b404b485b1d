//! `synodic sweep`: the departure x arrival grid and its files.

use std::fmt::Write as _;
use std::path::{Path, PathBuf};
use std::time::Instant;

use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};
use serde::Serialize;
use synodic::chart::{
    render_panel_png, render_panel_svg, render_png, render_svg, ChartSpec, Marker, MarkerFigures,
    Panel, DEFAULT_HEIGHT_PX, DEFAULT_WIDTH_PX,
};
use synodic::ephemeris::System;
use synodic::export::{
    ensure_dir, file_date, grid_csv, stamp, windows_csv, write_atomic, WindowRecord,
};
use synodic::study::{
    relative_path, ChartSection, Limits, Orbits, Outputs, Pair, Study, SweepSection,
};
use synodic::sweep::{
    grid_minima_with, sweep, Axis, CellStatus, Grid, Layer, Objective, RunOptions, SecondAxis,
    SweepSpec,
};
use synodic::transfer::{Endpoints, Leg};
use synodic::windows::{optima_of_grid, Borders, Bounds, Optimum};

use super::study::{execute, folder_of, save_study, Origin, PartResult, Provenance, RunFlags};
use crate::cli::args::SweepArgs;
use crate::cli::input::{day_of, parse_number_span, tof_unit};
use crate::cli::{CliResult, Outcome};

/// The demo study's default pair: two bodies of the built-in system whose
/// windows recur every couple of years.
pub const DEMO_PAIR: (&str, &str) = ("Teodra", "Kesh");

const CAUTION: &str = "Preliminary patched-conic design figures from mean-element \
ephemerides; not a flight product. Defer to the mission's navigation and flight-dynamics \
processes and applicable standards.";

#[derive(Debug, Serialize)]
struct AxisOut {
    kind: &'static str,
    start: String,
    #[serde(skip_serializing_if = "Option::is_none")]
    start_jd_tdb: Option<f64>,
    end: String,
    #[serde(skip_serializing_if = "Option::is_none")]
    end_jd_tdb: Option<f64>,
    step_days: f64,
    count: usize,
}

#[derive(Debug, Serialize)]
struct MinimumOut {
    objective: &'static str,
    #[serde(rename = "type")]
    kind: String,
    revs: u32,
    branch: String,
    value: f64,
    depart_date: String,
    arrive_date: String,
    depart_jd_tdb: f64,
    arrive_jd_tdb: f64,
    tof_days: f64,
    c3_km2_s2: f64,
    vinf_arrive_km_s: f64,
    dv_total_km_s: f64,
    /// `edge` (on a limit of the grid) and the cell's sanity flags,
    /// `;`-separated.
    flags: String,
}

#[derive(Debug, Serialize)]
struct Summary {
    tool: String,
    caution: &'static str,
    provenance: Provenance,
    central_mu_km3_s2: f64,
    from: String,
    to: String,
    depart_axis: AxisOut,
    second_axis: AxisOut,
    options: OptionsOut,
    grid: GridOut,
    minima: Vec<MinimumOut>,
}

#[derive(Debug, Serialize)]
struct OptionsOut {
    revs: u32,
    park_alt_km: Option<f64>,
    capture_alt_km: Option<f64>,
    capture_ecc: Option<f64>,
}

#[derive(Debug, Serialize)]
struct GridOut {
    departures: usize,
    seconds: usize,
    layers: usize,
    rows: usize,
    ok: usize,
    no_solution: usize,
    not_converged: usize,
}

pub fn run(args: &SweepArgs) -> CliResult<Outcome> {
    let study = study_from_args(args)?;
    let cwd = PathBuf::from(".");
    let outcome = execute(
        &study,
        &Origin::Cli,
        &cwd,
        Some(&args.out),
        RunFlags {
            threads: args.threads,
            quiet: args.quiet,
            json: args.json,
        },
    )?;
    // Saved only once the run has succeeded (and its folder exists).
    if let Some(path) = &args.save_study {
        let mut saved = study.clone();
        saved.out = Some(relative_path_lossy(path, &args.out));
        save_study(&saved, args.system.as_deref(), path)?;
    }
    Ok(outcome)
}

/// The output folder as seen from the saved study's folder.
fn relative_path_lossy(study_path: &Path, out: &Path) -> String {
    let dir = folder_of(study_path);
    if ensure_dir(out).is_ok() {
        return relative_path(dir, out).display().to_string();
    }
    out.display().to_string()
}

/// The command line as a study.
fn study_from_args(args: &SweepArgs) -> CliResult<Study> {
    let (from, to) = match (&args.from, &args.to) {
        (Some(f), Some(t)) => (f.clone(), t.clone()),
        _ if args.system.is_some() => {
            return Err("with --system, name the departure and arrival bodies: \
                        synodic sweep FROM TO --system FILE"
                .into())
        }
        _ => (DEMO_PAIR.0.to_string(), DEMO_PAIR.1.to_string()),
    };
    let steps: Result<Vec<f64>, _> = args
        .step_days
        .split(',')
        .map(|p| p.trim().parse::<f64>())
        .collect();
    let steps = steps
        .ok()
        .filter(|v| (1..=2).contains(&v.len()))
        .ok_or_else(|| {
            format!(
                "--step-days: expected D or D1,D2 in days, got {:?}",
                args.step_days
            )
        })?;
    let tof_days = match &args.tof_days {
        Some(t) => {
            let (lo, hi) = parse_number_span(t).map_err(|e| format!("--tof-days: {e}"))?;
            Some([lo, hi])
        }
        None => None,
    };
    let mut outputs = Outputs::default();
    for item in &args.skip {
        match item.as_str() {
            "grid" => outputs.grid = false,
            "windows" => outputs.windows = false,
            "chart" => outputs.chart = false,
            other => {
                return Err(format!(
                    "--skip: unknown output {other:?}; choose from grid, chart, windows"
                )
                .into())
            }
        }
    }
    Ok(Study {
        title: None,
        system: args
            .system
            .as_ref()
            .map_or_else(|| "demo".to_string(), |p| p.display().to_string()),
        out: None,
        pairs: vec![Pair { from, to }],
        sweep: Some(SweepSection {
            depart: args.depart.clone(),
            arrive: args.arrive.clone(),
            tof_days,
            step_days: Some(steps),
            revs: args.revs,
            max_memory_gib: Some(args.max_memory_gib),
        }),
        windows: None,
        orbits: Orbits {
            park_alt_km: args.orbits.park_alt_km,
            capture_alt_km: args.orbits.capture_alt_km,
            capture_ecc: args.orbits.capture_alt_km.map(|_| args.orbits.capture_ecc),
        },
        limits: Limits {
            max_c3_km2_s2: args.max_c3,
            max_vinf_arrive_km_s: None,
        },
        chart: ChartSection {
            c3_levels: args.c3_levels.clone(),
            vinf_levels: args.vinf_levels.clone(),
            show: args.show.clone(),
        },
        outputs,
        allow_flagged: args.allow_flagged,
    })
}

/// Sweep one grid and write its files into `out_dir`.
#[allow(clippy::too_many_arguments)]
pub fn run_grid(
    system: &System,
    spec: &SweepSpec,
    memory_limit_bytes: u128,
    study: &Study,
    provenance: &Provenance,
    out_dir: &Path,
    flags: RunFlags,
) -> CliResult<PartResult> {
    let layers = spec.layers().len();
    // About 0.3 us per cell and layer per core: show a bar past ~0.5 s.
    let cores = flags
        .threads
        .unwrap_or_else(rayon::current_num_threads)
        .max(1);
    let est_s = spec.cells() as f64 * layers as f64 * 3e-7 / cores as f64;
    let bar = if flags.quiet || est_s < 0.5 {
        ProgressBar::hidden()
    } else {
        let b = ProgressBar::with_draw_target(
            Some(spec.depart.count as u64),
            ProgressDrawTarget::stderr(),
        );
        if let Ok(style) =
            ProgressStyle::with_template("sweeping {bar:40} {pos}/{len} departure dates, eta {eta}")
        {
            b.set_style(style);
        }
        b
    };
    let started = Instant::now();
    let grid = sweep(
        system,
        spec,
        RunOptions {
            threads: flags.threads,
            memory_limit_bytes: Some(memory_limit_bytes),
        },
        || bar.inc(1),
    )?;
    bar.finish_and_clear();
    let elapsed = started.elapsed().as_secs_f64();

    let leg = Leg {
        system,
        from: spec.from,
        to: spec.to,
        ends: spec.ends,
        allow_flagged: study.allow_flagged,
    };
    let optima = if study.outputs.windows || study.outputs.chart {
        refined_optima(&leg, spec, &grid)
    } else {
        Vec::new()
    };
    let summary = summarise(system, spec, provenance, &grid, study.allow_flagged);
    let mut written = Vec::new();
    if study.outputs.grid {
        let path = out_dir.join("grid.csv");
        write_atomic(&path, &grid_csv(&grid, &spec.ends))?;
        written.push(path);
    }
    if study.outputs.windows {
        let path = out_dir.join("windows.csv");
        let records: Vec<WindowRecord> = optima
            .iter()
            .map(|o| {
                let label =
                    synodic::time::Epoch::from_days_since_j2000_tdb(o.depart_days).date_tdb();
                WindowRecord::new(&label, o, Objective::C3, false, None, None)
            })
            .collect();
        write_atomic(&path, &windows_csv(&records)?)?;
        written.push(path);
    }
    if study.outputs.chart {
        written.extend(write_charts(system, spec, study, &grid, &optima, out_dir)?);
    }
    let path = out_dir.join("summary.json");
    let mut json = serde_json::to_string_pretty(&summary)?;
    json.push('\n');
    write_atomic(&path, json.as_bytes())?;
    written.push(path);
    Ok(PartResult {
        written,
        screen: screen(&summary, elapsed) + &refined_screen(&optima),
        json: json.trim_end().to_string(),
        // Solved cells that may be optima (not all flagged away).
        feasible: !summary.minima.is_empty(),
    })
}

/// The refined optima as printed under the grid minima.
fn refined_screen(optima: &[Optimum]) -> String {
    if optima.is_empty() {
        return String::new();
    }
    let mut o =
        String::from("Refined optima (minimum C3 on the Lambert solution itself, windows.csv)\n");
    let (unit, per_day) = tof_unit(optima.iter().map(|o| o.arrive_days - o.depart_days));
    let _ = writeln!(
        o,
        "  {:<4} {:>4} {:<6} {:<16}  {:<16}  {:>8}  {:>9}  {:>7}  {:>7}  {:>9}  flags",
        "type",
        "revs",
        "branch",
        "depart",
        "arrive",
        format!("tof ({unit})"),
        "C3",
        "DLA",
        "RLA",
        "vinf in"
    );
    for opt in optima {
        let f = &opt.figures;
        let when = |d: f64| minute(&file_date(d));
        let flags: Vec<&str> = [(opt.ridge, "ridge"), (opt.edge, "edge")]
            .into_iter()
            .filter_map(|(on, name)| on.then_some(name))
            .chain(f.flags.names())
            .collect();
        let _ = writeln!(
            o,
            "  {:<4} {:>4} {:<6} {:<16}  {:<16}  {:>8.2}  {:>9.4}  {:>7.2}  {:>7.2}  {:>9.4}  {}",
            opt.kind.as_str(),
            opt.layer.revs,
            opt.layer.branch.to_string(),
            when(opt.depart_days),
            when(opt.arrive_days),
            (opt.arrive_days - opt.depart_days) * per_day,
            f.c3_km2_s2,
            f.dla_deg,
            f.rla_deg,
            f.vinf_arrive_km_s,
            flags.join(";")
        );
    }
    o.push('\n');
    o
}

/// Markers for the chart of `layer`: its refined optima.
pub fn markers(
    optima: &[Optimum],
    kind: SecondAxis,
    layer: Layer,
    ends: &Endpoints,
) -> Vec<Marker> {
    optima
        .iter()
        .filter(|o| o.layer == layer)
        .map(|o| {
            let f = &o.figures;
            Marker {
                depart_days: o.depart_days,
                second: match kind {
                    SecondAxis::Arrival => o.arrive_days,
                    SecondAxis::TimeOfFlight => o.arrive_days - o.depart_days,
                },
                kind: o.kind,
                name: format!("Type {}{}", o.kind, if o.ridge { " (ridge)" } else { "" }),
                figures: MarkerFigures {
                    c3_km2_s2: Some(f.c3_km2_s2),
                    vinf_arrive_km_s: Some(f.vinf_arrive_km_s),
                    dla_deg: Some(f.dla_deg),
                    arrive_dec_deg: Some(f.arrive_dec_deg),
                    dv_total_km_s: Some(ends.dv_total_km_s(f.vinf_depart_km_s, f.vinf_arrive_km_s)),
                },
            }
        })
        .collect()
}

/// Title and subtitle of a grid's chart.
pub fn chart_titles(system: &System, from: usize, to: usize, grid: &Grid) -> (String, String) {
    (
        format!("{} → {}", system.bodies[from].name, system.bodies[to].name),
        format!(
            "{} · departures {} to {}",
            system.name,
            &day_of(grid.depart.start_days),
            &day_of(grid.depart.end_days())
        ),
    )
}

/// `chart.svg` and `chart.png` of a grid.
fn write_charts(
    system: &System,
    spec: &SweepSpec,
    study: &Study,
    grid: &Grid,
    optima: &[Optimum],
    out_dir: &Path,
) -> CliResult<Vec<PathBuf>> {
    if grid.depart.count < 2 || grid.second.count < 2 {
        // A contour chart needs a 2 x 2 grid at least; the other files
        // still carry every figure.
        eprintln!(
            "synodic: note: no chart for a {} x {} grid (contours need at least 2 x 2)",
            grid.depart.count, grid.second.count
        );
        return Ok(Vec::new());
    }
    let (title, subtitle) = chart_titles(system, spec.from, spec.to, grid);
    let chart = ChartSpec {
        grid,
        layer: 0,
        title,
        subtitle,
        c3_levels: study.chart.c3_levels.clone(),
        vinf_levels: study.chart.vinf_levels.clone(),
        markers: markers(optima, spec.second_kind, grid.layers[0], &spec.ends),
        max_c3: study.limits.max_c3_km2_s2,
        ..ChartSpec::new(grid)
    };
    let svg = out_dir.join("chart.svg");
    write_atomic(&svg, render_svg(&chart)?.as_bytes())?;
    let png = out_dir.join("chart.png");
    write_atomic(
        &png,
        &render_png(&chart, DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX)?,
    )?;
    let mut written = vec![svg, png];
    for name in &study.chart.show {
        let panel = Panel::from_name(name).ok_or_else(|| {
            format!("unknown chart panel {name:?}; choose from dla, arrive-dec, dv-total")
        })?;
        let svg = out_dir.join(format!("chart-{name}.svg"));
        write_atomic(
            &svg,
            render_panel_svg(&chart, panel, &spec.ends)?.as_bytes(),
        )?;
        let png = out_dir.join(format!("chart-{name}.png"));
        write_atomic(
            &png,
            &render_panel_png(
                &chart,
                panel,
                &spec.ends,
                DEFAULT_WIDTH_PX,
                DEFAULT_HEIGHT_PX,
            )?,
        )?;
        written.extend([svg, png]);
    }
    // One chart per multi-revolution layer that solved anywhere.
    for (l, layer) in grid.layers.iter().enumerate().skip(1) {
        let solved = (0..grid.cells()).any(|c| grid.status[c * grid.layers.len() + l] == 0);
        if !solved {
            continue;
        }
        let layer_chart = ChartSpec {
            layer: l,
            title: format!(
                "{} ({} rev, {} branch)",
                chart.title, layer.revs, layer.branch
            ),
            markers: markers(optima, spec.second_kind, *layer, &spec.ends),
            ..chart.clone()
        };
        let stem = format!("chart-{}rev-{}", layer.revs, layer.branch);
        let svg = out_dir.join(format!("{stem}.svg"));
        write_atomic(&svg, render_svg(&layer_chart)?.as_bytes())?;
        let png = out_dir.join(format!("{stem}.png"));
        write_atomic(
            &png,
            &render_png(&layer_chart, DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX)?,
        )?;
        written.extend([svg, png]);
    }
    Ok(written)
}

/// The grid's own optima, refined on the Lambert objective inside the
/// grid's spans (minimum C3 per layer and Type).
fn refined_optima(leg: &Leg<'_>, spec: &SweepSpec, grid: &Grid) -> Vec<Optimum> {
    let second = (spec.second.start_days, spec.second.end_days());
    let bounds = Bounds {
        depart: (spec.depart.start_days, spec.depart.end_days()),
        arrive: (spec.second_kind == SecondAxis::Arrival).then_some(second),
        tof: (spec.second_kind == SecondAxis::TimeOfFlight).then_some(second),
    };
    let borders = Borders {
        depart_lo: true,
        depart_hi: true,
    };
    optima_of_grid(leg, grid, Objective::C3, &bounds, borders)
}

fn axis_out(axis: &Axis, kind: SecondAxis, is_depart: bool) -> AxisOut {
    let dated = is_depart || kind == SecondAxis::Arrival;
    let show = |d: f64| {
        if dated {
            stamp(d).date
        } else {
            format!("{d}")
        }
    };
    let jd = |d: f64| dated.then(|| stamp(d).jd_tdb);
    AxisOut {
        kind: if is_depart {
            "departure date (TDB)"
        } else if dated {
            "arrival date (TDB)"
        } else {
            "time of flight (days)"
        },
        start: show(axis.start_days),
        start_jd_tdb: jd(axis.start_days),
        end: show(axis.end_days()),
        end_jd_tdb: jd(axis.end_days()),
        step_days: axis.step_days,
        count: axis.count,
    }
}

fn summarise(
    system: &System,
    spec: &SweepSpec,
    provenance: &Provenance,
    grid: &Grid,
    allow_flagged: bool,
) -> Summary {
    let ends = &spec.ends;
    let counts = grid.status_counts();
    let count = |s: CellStatus| counts.iter().find(|c| c.0 == s).map_or(0, |c| c.1);
    let mut minima = Vec::new();
    for objective in [Objective::C3, Objective::VinfArrive, Objective::DvTotal] {
        for m in grid_minima_with(grid, ends, objective, allow_flagged) {
            let idx = grid.index(m.i, m.j, m.layer);
            let (d, a) = grid.dates_days(m.i, m.j);
            let vd = grid.vinf_depart_km_s[idx];
            let va = grid.vinf_arrive_km_s[idx];
            let layer = grid.layers[m.layer];
            minima.push(MinimumOut {
                objective: objective.name(),
                kind: m.kind.to_string(),
                revs: layer.revs,
                branch: layer.branch.to_string(),
                value: m.value,
                depart_date: stamp(d).date,
                arrive_date: stamp(a).date,
                depart_jd_tdb: stamp(d).jd_tdb,
                arrive_jd_tdb: stamp(a).jd_tdb,
                tof_days: a - d,
                c3_km2_s2: vd * vd,
                vinf_arrive_km_s: va,
                dv_total_km_s: ends.dv_total_km_s(vd, va),
                flags: m
                    .edge
                    .then_some("edge")
                    .into_iter()
                    .chain(m.flags.names())
                    .collect::<Vec<_>>()
                    .join(";"),
            });
        }
    }
    Summary {
        tool: provenance.tool.clone(),
        caution: CAUTION,
        provenance: provenance.clone(),
        central_mu_km3_s2: system.central.mu_km3_s2,
        from: system.bodies[spec.from].name.clone(),
        to: system.bodies[spec.to].name.clone(),
        depart_axis: axis_out(&spec.depart, spec.second_kind, true),
        second_axis: axis_out(&spec.second, spec.second_kind, false),
        options: OptionsOut {
            revs: spec.max_revs,
            park_alt_km: ends
                .parking
                .map(|p| p.radius_km - system.bodies[spec.from].radius_km.unwrap_or(0.0)),
            capture_alt_km: ends
                .capture
                .map(|c| c.periapsis_km - system.bodies[spec.to].radius_km.unwrap_or(0.0)),
            capture_ecc: ends.capture.map(|c| c.ecc),
        },
        grid: GridOut {
            departures: grid.depart.count,
            seconds: grid.second.count,
            layers: grid.layers.len(),
            rows: grid.status.len(),
            ok: count(CellStatus::Ok),
            no_solution: count(CellStatus::NoSolution),
            not_converged: count(CellStatus::NotConverged),
        },
        minima,
    }
}

fn screen(s: &Summary, elapsed_s: f64) -> String {
    let mut o = String::new();
    let _ = writeln!(
        o,
        "{} -> {}   ({}, {})",
        s.from, s.to, s.provenance.system_name, s.provenance.system_file
    );
    for a in [&s.depart_axis, &s.second_axis] {
        let _ = writeln!(
            o,
            "  {:<22} {} .. {}  every {} d  ({} values)",
            a.kind, a.start, a.end, a.step_days, a.count
        );
    }
    let g = &s.grid;
    let _ = writeln!(
        o,
        "  {} cells x {} layer(s) in {:.3} s: {} ok, {} no solution, {} not converged",
        g.departures * g.seconds,
        g.layers,
        elapsed_s,
        g.ok,
        g.no_solution,
        g.not_converged
    );
    let (unit, per_day) = tof_unit(s.minima.iter().map(|m| m.tof_days));
    let _ = writeln!(o, "\nGrid minima (refine with a finer step)");
    let _ = writeln!(
        o,
        "  {:<12} {:<4} {:>4} {:<6} {:>10}  {:<16}  {:<16}  {:>8}  {:>9}  {:>9}  {:>9}  flags",
        "objective",
        "type",
        "revs",
        "branch",
        "value",
        "depart",
        "arrive",
        format!("tof ({unit})"),
        "C3",
        "vinf in",
        "dv total"
    );
    for m in &s.minima {
        let _ = writeln!(
            o,
            "  {:<12} {:<4} {:>4} {:<6} {:>10.4}  {:<16}  {:<16}  {:>8.1}  {:>9.4}  {:>9.4}  {:>9.4}  {}",
            m.objective,
            m.kind,
            m.revs,
            m.branch,
            m.value,
            minute(&m.depart_date),
            minute(&m.arrive_date),
            m.tof_days * per_day,
            m.c3_km2_s2,
            m.vinf_arrive_km_s,
            m.dv_total_km_s,
            m.flags
        );
    }
    let _ = writeln!(o, "  (C3 km^2/s^2; speeds and delta-v km/s; dates TDB)\n");
    o
}

/// `YYYY-MM-DD hh:mm` of a date column, for screens.
fn minute(date: &str) -> String {
    let d = date.replacen('T', " ", 1);
    d.get(..16).unwrap_or(&d).to_string()
}
