//! `synodic sweep`: the departure x arrival grid and its files.

use std::fmt::Write as _;
use std::path::PathBuf;
use std::time::Instant;

use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};
use serde::Serialize;
use synodic::ephemeris::System;
use synodic::export::{ensure_dir, file_date, grid_csv, windows_csv, write_atomic, WindowRecord};
use synodic::opportunity::{hohmann_tof_days, next_opportunity};
use synodic::sweep::{
    grid_minima, sweep, Axis, CellStatus, Grid, Objective, RunOptions, SecondAxis, SweepSpec,
};
use synodic::time::{parse_span, J2000_JD};
use synodic::transfer::{Endpoints, Leg};
use synodic::windows::{optima_of_grid, Borders, Bounds};

use super::print;
use crate::cli::args::SweepArgs;
use crate::cli::input::{body_pair, load_system_with_hash, parse_number_span, resolve_endpoints};
use crate::cli::{CliResult, Outcome};

/// The demo study's default pair: two bodies of the built-in system whose
/// windows recur every couple of years.
pub const DEMO_PAIR: (&str, &str) = ("Teodra", "Kesh");

const CAUTION: &str = "Preliminary patched-conic design figures from mean-element \
ephemerides; not a flight product. Defer to the mission's navigation and flight-dynamics \
processes and applicable standards.";

/// A resolved, validated sweep.
struct Plan {
    system: System,
    system_sha256: String,
    spec: SweepSpec,
    out: PathBuf,
    write_grid: bool,
    write_windows: bool,
    threads: Option<usize>,
    memory_limit_bytes: u128,
}

fn resolve(args: &SweepArgs) -> CliResult<Plan> {
    let (system, system_sha256) = load_system_with_hash(args.system.as_deref())?;
    let (from_name, to_name) = match (&args.from, &args.to) {
        (Some(f), Some(t)) => (f.clone(), t.clone()),
        _ if args.system.is_some() => {
            return Err("with --system, name the departure and arrival bodies: \
                        synodic sweep FROM TO --system FILE"
                .into())
        }
        _ => (DEMO_PAIR.0.to_string(), DEMO_PAIR.1.to_string()),
    };
    let (from, to) = body_pair(&system, &from_name, &to_name)?;
    let (step_d, step_s) = parse_steps(&args.step_days)?;
    let mu = system.central.mu_km3_s2;
    let t_h = hohmann_tof_days(
        system.bodies[from].elements.a_km,
        system.bodies[to].elements.a_km,
        mu,
    );
    let (d0, d1) = match &args.depart {
        Some(text) => {
            let (a, b) = parse_span(text).map_err(|e| format!("--depart: {e}"))?;
            (a.days_since_j2000_tdb(), b.days_since_j2000_tdb())
        }
        None => {
            let opp = next_opportunity(&system, from, to, system.epoch.days_since_j2000_tdb())
                .ok_or("the two bodies share a period: give --depart START..END")?;
            let half = (0.12 * opp.synodic_days).clamp(60.0, 200.0).round();
            // Days past J2000 count from noon: round to a TDB midnight.
            let centre = (opp.depart_days - 0.5).round() + 0.5;
            (centre - half, centre + half)
        }
    };
    let depart = Axis::spanning(d0, d1, step_d).map_err(|e| format!("--depart: {e}"))?;
    let (second, second_kind) = match (&args.arrive, &args.tof_days) {
        (Some(text), _) => {
            let (a, b) = parse_span(text).map_err(|e| format!("--arrive: {e}"))?;
            let (a, b) = (a.days_since_j2000_tdb(), b.days_since_j2000_tdb());
            if b <= d0 {
                return Err(
                    "--arrive: the arrival span ends before the departure span starts".into(),
                );
            }
            let axis = Axis::spanning(a, b, step_s).map_err(|e| format!("--arrive: {e}"))?;
            (axis, SecondAxis::Arrival)
        }
        (None, Some(text)) => {
            let (lo, hi) = parse_number_span(text).map_err(|e| format!("--tof-days: {e}"))?;
            if lo <= 0.0 {
                return Err(
                    format!("--tof-days: times of flight must be > 0 days, got {lo}").into(),
                );
            }
            let axis = Axis::spanning(lo, hi, step_s).map_err(|e| format!("--tof-days: {e}"))?;
            (axis, SecondAxis::TimeOfFlight)
        }
        (None, None) => {
            let a = (d0 + 0.5 * t_h).round();
            let b = (d1 + 1.5 * t_h).round();
            (Axis::spanning(a, b, step_s)?, SecondAxis::Arrival)
        }
    };
    let ends: Endpoints = resolve_endpoints(
        &system.bodies[from],
        &system.bodies[to],
        args.park_alt_km,
        args.capture_alt_km,
        args.capture_ecc,
    )?;
    if !(args.max_memory_gib.is_finite() && args.max_memory_gib > 0.0) {
        return Err(format!("--max-memory-gib must be > 0, got {}", args.max_memory_gib).into());
    }
    if args.threads == Some(0) {
        return Err("--threads must be at least 1".into());
    }
    let mut write_grid = true;
    let mut write_windows = true;
    for item in &args.skip {
        match item.as_str() {
            "grid" => write_grid = false,
            "windows" => write_windows = false,
            // Accepted now so scripts keep working when charts arrive.
            "chart" => {}
            other => {
                return Err(format!(
                    "--skip: unknown output {other:?}; choose from grid, chart, windows"
                )
                .into())
            }
        }
    }
    Ok(Plan {
        system,
        system_sha256,
        spec: SweepSpec {
            from,
            to,
            depart,
            second,
            second_kind,
            max_revs: args.revs,
            ends,
        },
        out: args.out.clone(),
        write_grid,
        write_windows,
        threads: args.threads,
        memory_limit_bytes: (args.max_memory_gib * (1u64 << 30) as f64) as u128,
    })
}

fn parse_steps(text: &str) -> CliResult<(f64, f64)> {
    let nums: Result<Vec<f64>, _> = text.split(',').map(|p| p.trim().parse::<f64>()).collect();
    let nums =
        nums.map_err(|_| format!("--step-days: expected D or D1,D2 in days, got {text:?}"))?;
    let (a, b) = match nums.as_slice() {
        [a] => (*a, *a),
        [a, b] => (*a, *b),
        _ => return Err(format!("--step-days: expected D or D1,D2 in days, got {text:?}").into()),
    };
    for s in [a, b] {
        if !(s.is_finite() && s > 0.0) {
            return Err(format!("--step-days: steps must be > 0 days, got {s}").into());
        }
    }
    Ok((a, b))
}

#[derive(Debug, Serialize)]
struct AxisOut {
    kind: &'static str,
    start: String,
    end: String,
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
}

#[derive(Debug, Serialize)]
struct Summary {
    tool: String,
    caution: &'static str,
    system: SystemOut,
    from: String,
    to: String,
    depart_axis: AxisOut,
    second_axis: AxisOut,
    options: OptionsOut,
    grid: GridOut,
    minima: Vec<MinimumOut>,
}

#[derive(Debug, Serialize)]
struct SystemOut {
    name: String,
    source: String,
    sha256: String,
    central_mu_km3_s2: f64,
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
    let plan = resolve(args)?;
    let spec = &plan.spec;
    let layers = spec.layers().len();
    // About 0.3 us per cell and layer per core: show a bar past ~0.5 s.
    let cores = plan
        .threads
        .unwrap_or_else(rayon::current_num_threads)
        .max(1);
    let est_s = spec.cells() as f64 * layers as f64 * 3e-7 / cores as f64;
    let bar = if args.quiet || est_s < 0.5 {
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
        &plan.system,
        spec,
        RunOptions {
            threads: plan.threads,
            memory_limit_bytes: Some(plan.memory_limit_bytes),
        },
        || bar.inc(1),
    )?;
    bar.finish_and_clear();
    let elapsed = started.elapsed().as_secs_f64();

    let summary = summarise(&plan, &grid);
    ensure_dir(&plan.out)?;
    let mut written = Vec::new();
    if plan.write_grid {
        let path = plan.out.join("grid.csv");
        write_atomic(&path, &grid_csv(&grid, &spec.ends))?;
        written.push(path);
    }
    if plan.write_windows {
        let path = plan.out.join("windows.csv");
        let records = refined_windows(&plan, &grid);
        write_atomic(&path, &windows_csv(&records)?)?;
        written.push(path);
    }
    let path = plan.out.join("summary.json");
    let mut json = serde_json::to_string_pretty(&summary)?;
    json.push('\n');
    write_atomic(&path, json.as_bytes())?;
    written.push(path);

    if args.json {
        print(&json)?;
    } else {
        print(&screen(&summary, elapsed, &written))?;
    }
    if summary.grid.ok == 0 {
        return Ok(Outcome::NothingFeasible);
    }
    Ok(Outcome::Done)
}

/// The grid's own optima, refined on the Lambert objective inside the
/// grid's spans (minimum C3 per layer and Type).
fn refined_windows(plan: &Plan, grid: &Grid) -> Vec<WindowRecord> {
    let spec = &plan.spec;
    let leg = Leg {
        system: &plan.system,
        from: spec.from,
        to: spec.to,
        ends: spec.ends,
    };
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
    optima_of_grid(&leg, grid, Objective::C3, &bounds, borders)
        .iter()
        .map(|o| {
            let label: String = file_date(o.depart_days).chars().take(4).collect();
            WindowRecord::new(&label, o, Objective::C3, false, None, None)
        })
        .collect()
}

fn axis_out(axis: &Axis, kind: SecondAxis, is_depart: bool) -> AxisOut {
    let dated = is_depart || kind == SecondAxis::Arrival;
    let show = |d: f64| {
        if dated {
            file_date(d)
        } else {
            format!("{d}")
        }
    };
    AxisOut {
        kind: if is_depart {
            "departure date (TDB)"
        } else if dated {
            "arrival date (TDB)"
        } else {
            "time of flight (days)"
        },
        start: show(axis.start_days),
        end: show(axis.end_days()),
        step_days: axis.step_days,
        count: axis.count,
    }
}

fn summarise(plan: &Plan, grid: &Grid) -> Summary {
    let spec = &plan.spec;
    let ends = &spec.ends;
    let counts = grid.status_counts();
    let count = |s: CellStatus| counts.iter().find(|c| c.0 == s).map_or(0, |c| c.1);
    let mut minima = Vec::new();
    for objective in [Objective::C3, Objective::VinfArrive, Objective::DvTotal] {
        for m in grid_minima(grid, ends, objective) {
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
                depart_date: file_date(d),
                arrive_date: file_date(a),
                depart_jd_tdb: d + J2000_JD,
                arrive_jd_tdb: a + J2000_JD,
                tof_days: a - d,
                c3_km2_s2: vd * vd,
                vinf_arrive_km_s: va,
                dv_total_km_s: ends.dv_total_km_s(vd, va),
            });
        }
    }
    Summary {
        tool: format!("synodic {}", env!("CARGO_PKG_VERSION")),
        caution: CAUTION,
        system: SystemOut {
            name: plan.system.name.clone(),
            source: plan.system.source.clone(),
            sha256: plan.system_sha256.clone(),
            central_mu_km3_s2: plan.system.central.mu_km3_s2,
        },
        from: plan.system.bodies[spec.from].name.clone(),
        to: plan.system.bodies[spec.to].name.clone(),
        depart_axis: axis_out(&spec.depart, spec.second_kind, true),
        second_axis: axis_out(&spec.second, spec.second_kind, false),
        options: OptionsOut {
            revs: spec.max_revs,
            park_alt_km: ends
                .parking
                .map(|p| p.radius_km - plan.system.bodies[spec.from].radius_km.unwrap_or(0.0)),
            capture_alt_km: ends
                .capture
                .map(|c| c.periapsis_km - plan.system.bodies[spec.to].radius_km.unwrap_or(0.0)),
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

fn screen(s: &Summary, elapsed_s: f64, written: &[PathBuf]) -> String {
    let mut o = String::new();
    let _ = writeln!(
        o,
        "{} -> {}   ({}, {})",
        s.from, s.to, s.system.name, s.system.source
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
    let _ = writeln!(o, "\nGrid minima (refine with a finer step)");
    let _ = writeln!(
        o,
        "  {:<12} {:<4} {:>4} {:<6} {:>10}  {:<10}  {:<10}  {:>8}  {:>9}  {:>9}  {:>9}",
        "objective",
        "type",
        "revs",
        "branch",
        "value",
        "depart",
        "arrive",
        "tof (d)",
        "C3",
        "vinf in",
        "dv total"
    );
    for m in &s.minima {
        let _ = writeln!(
            o,
            "  {:<12} {:<4} {:>4} {:<6} {:>10.4}  {:<10}  {:<10}  {:>8.1}  {:>9.4}  {:>9.4}  {:>9.4}",
            m.objective,
            m.kind,
            m.revs,
            m.branch,
            m.value,
            m.depart_date,
            m.arrive_date,
            m.tof_days,
            m.c3_km2_s2,
            m.vinf_arrive_km_s,
            m.dv_total_km_s
        );
    }
    let _ = writeln!(o, "  (C3 km^2/s^2; speeds and delta-v km/s; dates TDB)");
    let _ = writeln!(o);
    for p in written {
        let _ = writeln!(o, "wrote {}", p.display());
    }
    let _ = writeln!(o, "\n{}", s.caution);
    o
}
