//! `synodic windows`: the best-window table over a span.

use std::fmt::Write as _;
use std::path::{Path, PathBuf};

use serde::Serialize;
use synodic::chart::{overview_png, overview_svg, OverviewPoint, OverviewSpec};
use synodic::ephemeris::System;
use synodic::export::{
    ensure_dir, file_date, launch_period_csv, stamp, windows_csv, write_atomic, WindowRecord,
};
use synodic::study::{Limits as StudyLimits, Orbits, Outputs, Pair, Study, WindowsSection};
use synodic::sweep::Objective;
use synodic::time::parse_span;
use synodic::time::J2000_JD;
use synodic::transfer::{Leg, TransferType};
use synodic::windows::launch::{fixed_arrival_period, launch_period, FixedArrivalPeriod};
use synodic::windows::{scan, Bounds, OpportunityWindow, ScanOptions};

use super::print;
use super::study::{endpoints, folder_of, save_study, Origin, PartResult, Provenance, RunFlags};
use crate::cli::args::WindowsArgs;
use crate::cli::input::{
    body_pair, compact_date, day_of, load_system, parse_number_span, tof_unit,
};
use crate::cli::{CliResult, Outcome};

/// Caution printed under every table.
pub const CAUTION: &str = "Preliminary patched-conic design figures from mean-element \
ephemerides; not a flight product. Defer to the mission's navigation and flight-dynamics \
processes and applicable standards.";

/// Limits a row is checked against.
#[derive(Debug, Clone, Copy)]
pub struct Limits {
    pub max_c3: Option<f64>,
    pub max_vinf_arrive: Option<f64>,
}

/// Records (and fixed-arrival daily tables) for a list of opportunities.
pub fn tabulate(
    leg: &Leg<'_>,
    span: (f64, f64),
    windows: &[OpportunityWindow],
    objective: Objective,
    limits: Limits,
    launch_days: Option<u32>,
) -> Vec<(WindowRecord, Option<FixedArrivalPeriod>)> {
    let mut out = Vec::new();
    for w in windows {
        // Launch periods may run past the window's seams but not past the
        // span searched.
        let bounds = Bounds {
            depart: span,
            arrive: None,
            tof: Some(w.tof),
        };
        for opt in &w.optima {
            let f = &opt.figures;
            let over = limits.max_c3.is_some_and(|m| f.c3_km2_s2 > m)
                || limits
                    .max_vinf_arrive
                    .is_some_and(|m| f.vinf_arrive_km_s > m);
            let lp = limits
                .max_c3
                .filter(|_| !opt.ridge)
                .and_then(|m| launch_period(leg, opt, &bounds, m));
            let fixed = match (launch_days, lp) {
                (Some(n), Some(_)) => fixed_arrival_period(leg, opt, &bounds, n),
                _ => None,
            };
            let mut opt = *opt;
            // A launch period cut by the span's ends is an edge result too.
            if lp.is_some_and(|l| l.first_days <= span.0 || l.last_days >= span.1) {
                opt.edge = true;
            }
            let rec =
                WindowRecord::new(&w.label, &opt, objective, over, lp.as_ref(), fixed.as_ref());
            out.push((rec, fixed));
        }
    }
    out
}

#[derive(Debug, Serialize)]
struct JsonRow<'a> {
    #[serde(flatten)]
    record: &'a WindowRecord,
    #[serde(skip_serializing_if = "Option::is_none")]
    launch_period_daily: Option<Vec<DailyOut>>,
}

#[derive(Debug, Serialize)]
struct DailyOut {
    depart_date: String,
    depart_jd_tdb: f64,
    c3_km2_s2: Option<f64>,
    dla_deg: Option<f64>,
    rla_deg: Option<f64>,
    vinf_arrive_km_s: Option<f64>,
}

/// A validated window scan.
pub struct ScanPlan {
    span: (f64, f64),
    options: ScanOptions,
    limits: Limits,
    launch_days: Option<u32>,
}

/// Validate a study's window section for one pair.
pub fn scan_plan(
    w: &WindowsSection,
    study: &Study,
    system: &System,
    from: usize,
    to: usize,
    origin: &Origin,
) -> CliResult<ScanPlan> {
    let at = |key: &str, flag: &str| origin.at("windows", 0, key, flag);
    let objective = Objective::from_name(&w.objective).ok_or_else(|| {
        format!(
            "{}: unknown objective {:?}; choose from c3, vinf-arrive, dv-total, c3+vinf",
            at("objective", "--objective"),
            w.objective
        )
    })?;
    let (s0, s1) = parse_span(&w.span).map_err(|e| format!("{}: {e}", at("span", "--span")))?;
    if let Some([lo, hi]) = w.tof_days {
        if !(lo.is_finite() && hi.is_finite() && lo > 0.0 && hi >= lo) {
            return Err(format!(
                "{}: times of flight must satisfy 0 < MIN <= MAX, got {lo}..{hi}",
                at("tof_days", "--tof-days")
            )
            .into());
        }
    }
    let limits = Limits {
        max_c3: study.limits.max_c3_km2_s2,
        max_vinf_arrive: study.limits.max_vinf_arrive_km_s,
    };
    for (key, flag, v) in [
        ("max_c3_km2_s2", "--max-c3", limits.max_c3),
        (
            "max_vinf_arrive_km_s",
            "--max-vinf-arrive",
            limits.max_vinf_arrive,
        ),
    ] {
        if let Some(x) = v {
            if !(x.is_finite() && x >= 0.0) {
                return Err(format!(
                    "{}: must be a number >= 0, got {x}",
                    origin.at("limits", 0, key, flag)
                )
                .into());
            }
        }
    }
    if w.launch_period_days == Some(0) {
        return Err(format!(
            "{}: must be at least 1",
            at("launch_period_days", "--launch-period-days")
        )
        .into());
    }
    if w.launch_period_days.is_some() && limits.max_c3.is_none() {
        return Err(format!(
            "{}: a launch period needs a C3 ceiling (limits.max_c3_km2_s2, --max-c3)",
            at("launch_period_days", "--launch-period-days")
        )
        .into());
    }
    // Validate the orbits now, before any work.
    endpoints(study, system, from, to, origin)?;
    Ok(ScanPlan {
        span: (s0.days_since_j2000_tdb(), s1.days_since_j2000_tdb()),
        options: ScanOptions {
            objective,
            tof_days: w.tof_days.map(|[a, b]| (a, b)),
            max_revs: w.revs,
            steps: 150,
            threads: None,
        },
        limits,
        launch_days: w.launch_period_days,
    })
}

/// Scan, tabulate and print; the rows with their daily tables.
fn scan_rows(
    system: &System,
    from: usize,
    to: usize,
    plan: &ScanPlan,
    study: &Study,
    threads: Option<usize>,
) -> CliResult<Vec<(WindowRecord, Option<FixedArrivalPeriod>)>> {
    let leg = Leg {
        system,
        from,
        to,
        ends: endpoints(study, system, from, to, &Origin::Cli)?,
        allow_flagged: study.allow_flagged,
    };
    let mut options = plan.options;
    options.threads = threads;
    let windows = scan(&leg, plan.span.0, plan.span.1, &options)?;
    Ok(tabulate(
        &leg,
        plan.span,
        &windows,
        options.objective,
        plan.limits,
        plan.launch_days,
    ))
}

fn title(system: &System, from: usize, to: usize, plan: &ScanPlan) -> String {
    format!(
        "{} -> {}   ({}), departures {} .. {}, objective {}",
        system.bodies[from].name,
        system.bodies[to].name,
        system.name,
        compact_date(plan.span.0),
        compact_date(plan.span.1),
        plan.options.objective.name()
    )
}

/// The overview chart of a scan: zero-revolution optima per opportunity.
fn overview(
    system: &System,
    from: usize,
    to: usize,
    plan: &ScanPlan,
    rows: &[(WindowRecord, Option<FixedArrivalPeriod>)],
) -> OverviewSpec {
    let points = rows
        .iter()
        .map(|r| &r.0)
        .filter(|r| r.revs == 0)
        .map(|r| OverviewPoint {
            depart_days: r.depart_jd_tdb - J2000_JD,
            kind: if r.kind == "I" {
                TransferType::I
            } else {
                TransferType::II
            },
            c3_km2_s2: r.c3_km2_s2,
            vinf_arrive_km_s: r.vinf_arrive_km_s,
            flags: r
                .flags
                .split(';')
                .filter(|f| !f.is_empty())
                .map(str::to_string)
                .collect(),
        })
        .collect();
    OverviewSpec {
        title: format!(
            "{} → {}, every opportunity",
            system.bodies[from].name, system.bodies[to].name
        ),
        subtitle: format!(
            "{} · departures {} to {}",
            system.name,
            &day_of(plan.span.0),
            &day_of(plan.span.1),
        ),
        points,
        max_c3: plan.limits.max_c3,
        span_days: Some(plan.span),
        objective: Some(plan.options.objective),
    }
}

fn json_rows(rows: &[(WindowRecord, Option<FixedArrivalPeriod>)]) -> CliResult<String> {
    let json: Vec<JsonRow> = rows
        .iter()
        .map(|(record, fixed)| JsonRow {
            record,
            launch_period_daily: fixed.as_ref().map(daily_out),
        })
        .collect();
    Ok(serde_json::to_string_pretty(&json)?)
}

/// A study's window scan: `span-windows.csv`, `span-windows.json` and the
/// launch-period tables into `out_dir`.
#[allow(clippy::too_many_arguments)]
pub fn run_scan(
    system: &System,
    from: usize,
    to: usize,
    plan: &ScanPlan,
    study: &Study,
    provenance: &Provenance,
    out_dir: &Path,
    flags: RunFlags,
) -> CliResult<PartResult> {
    let rows = scan_rows(system, from, to, plan, study, flags.threads)?;
    let records: Vec<WindowRecord> = rows.iter().map(|r| r.0.clone()).collect();
    let mut written = Vec::new();
    if study.outputs.windows {
        let csv_path = out_dir.join("span-windows.csv");
        write_atomic(&csv_path, &windows_csv(&records)?)?;
        written.push(csv_path);
        written.extend(write_daily_tables(
            &out_dir.join("span-windows.csv"),
            &rows,
        )?);
    }
    if study.outputs.chart && !rows.is_empty() {
        let spec = overview(system, from, to, plan, &rows);
        let svg = out_dir.join("span-windows.svg");
        write_atomic(&svg, overview_svg(&spec)?.as_bytes())?;
        let png = out_dir.join("span-windows.png");
        write_atomic(&png, &overview_png(&spec, 1800, 1200)?)?;
        written.push(svg);
        written.push(png);
    }
    let json = format!(
        "{{\n\"provenance\": {},\n\"windows\": {}\n}}",
        serde_json::to_string_pretty(provenance)?,
        json_rows(&rows)?
    );
    let json_path = out_dir.join("span-windows.json");
    write_atomic(&json_path, format!("{json}\n").as_bytes())?;
    written.push(json_path);
    let feasible = rows.iter().any(|(r, _)| !r.flags.contains("over-limit"));
    Ok(PartResult {
        written,
        screen: table(&title(system, from, to, plan), &rows, plan.limits.max_c3),
        json,
        feasible,
    })
}

pub fn run(args: &WindowsArgs) -> CliResult<Outcome> {
    let tof_days = match &args.tof_days {
        Some(t) => {
            let (lo, hi) = parse_number_span(t).map_err(|e| format!("--tof-days: {e}"))?;
            Some([lo, hi])
        }
        None => None,
    };
    let study = Study {
        title: None,
        system: args
            .system
            .as_ref()
            .map_or_else(|| "demo".to_string(), |p| p.display().to_string()),
        out: None,
        pairs: vec![Pair {
            from: args.from.clone(),
            to: args.to.clone(),
        }],
        sweep: None,
        windows: Some(WindowsSection {
            span: args.span.clone(),
            objective: args.objective.clone(),
            tof_days,
            revs: args.revs,
            launch_period_days: args.launch_period_days,
        }),
        orbits: Orbits {
            park_alt_km: args.orbits.park_alt_km,
            capture_alt_km: args.orbits.capture_alt_km,
            capture_ecc: args.orbits.capture_alt_km.map(|_| args.orbits.capture_ecc),
        },
        limits: StudyLimits {
            max_c3_km2_s2: args.max_c3,
            max_vinf_arrive_km_s: args.max_vinf_arrive,
        },
        chart: Default::default(),
        outputs: Outputs::default(),
        allow_flagged: args.allow_flagged,
    };
    let system = load_system(args.system.as_deref())?;
    let (from, to) = body_pair(&system, &args.from, &args.to)?;
    let w = study
        .windows
        .as_ref()
        .ok_or("internal: no window section")?;
    let plan = scan_plan(w, &study, &system, from, to, &Origin::Cli)?;
    // Settle where the files go before the scan, not after it.
    if let Some(path) = &args.overview {
        if !matches!(
            path.extension().and_then(|e| e.to_str()),
            Some("svg" | "png")
        ) {
            return Err(format!("--overview: {} must end in .svg or .png", path.display()).into());
        }
    }
    for (flag, path) in [("--out", &args.out), ("--overview", &args.overview)] {
        if let Some(path) = path {
            ensure_dir(folder_of(path)).map_err(|e| format!("{flag}: {e}"))?;
        }
    }
    let rows = scan_rows(&system, from, to, &plan, &study, args.threads)?;
    // Saved only once the scan has succeeded.
    if let Some(path) = &args.save_study {
        save_study(&study, args.system.as_deref(), path)?;
    }
    if let Some(out) = &args.out {
        let records: Vec<WindowRecord> = rows.iter().map(|r| r.0.clone()).collect();
        write_atomic(out, &windows_csv(&records)?)?;
        write_daily_tables(out, &rows)?;
    }
    if let Some(path) = &args.overview {
        let spec = overview(&system, from, to, &plan, &rows);
        match path.extension().and_then(|e| e.to_str()) {
            Some("svg") => write_atomic(path, overview_svg(&spec)?.as_bytes())?,
            Some("png") => write_atomic(path, &overview_png(&spec, 1800, 1200)?)?,
            _ => {
                return Err(
                    format!("--overview: {} must end in .svg or .png", path.display()).into(),
                )
            }
        }
    }
    if args.json {
        print(&format!("{}\n", json_rows(&rows)?))?;
    } else {
        print(&table(
            &title(&system, from, to, &plan),
            &rows,
            plan.limits.max_c3,
        ))?;
    }
    let feasible = rows.iter().any(|(r, _)| !r.flags.contains("over-limit"));
    if !feasible {
        return Ok(Outcome::NothingFeasible);
    }
    Ok(Outcome::Done)
}

fn daily_out(p: &FixedArrivalPeriod) -> Vec<DailyOut> {
    p.daily
        .iter()
        .map(|d| DailyOut {
            depart_date: stamp(d.depart_days).date,
            depart_jd_tdb: stamp(d.depart_days).jd_tdb,
            c3_km2_s2: d.figures.map(|f| f.c3_km2_s2),
            dla_deg: d.figures.map(|f| f.dla_deg),
            rla_deg: d.figures.map(|f| f.rla_deg),
            vinf_arrive_km_s: d.figures.map(|f| f.vinf_arrive_km_s),
        })
        .collect()
}

/// `launch-period-<opportunity>-<type>[-<revs><branch>].csv` beside `out`.
pub fn write_daily_tables(
    out: &Path,
    rows: &[(WindowRecord, Option<FixedArrivalPeriod>)],
) -> CliResult<Vec<PathBuf>> {
    let dir = folder_of(out);
    let mut written = Vec::new();
    for (r, fixed) in rows {
        if let Some(p) = fixed {
            let mut name = format!("launch-period-{}-{}", r.opportunity, r.kind);
            if r.revs > 0 {
                let _ = write!(name, "-{}{}", r.revs, r.branch);
            }
            name.push_str(".csv");
            let path = dir.join(name);
            write_atomic(&path, &launch_period_csv(p))?;
            written.push(path);
        }
    }
    Ok(written)
}

/// The aligned best-window table.
pub fn table(
    title: &str,
    rows: &[(WindowRecord, Option<FixedArrivalPeriod>)],
    max_c3: Option<f64>,
) -> String {
    let mut s = String::new();
    let (unit, per_day) = tof_unit(rows.iter().map(|r| r.0.tof_days));
    let _ = writeln!(s, "{title}\n");
    let _ = writeln!(
        s,
        "{:<11} {:<4} {:<8} {:<16} {:<16} {:>7} {:>8} {:>7} {:>7} {:>7} {:>7} {:>7} {:>7}  {:<28} flags",
        "opportunity", "type", "revs", "depart", "arrive", format!("tof {unit}"), "C3", "DLA", "RLA", "vinf o", "vinf i", "dec i", "dv tot",
        if max_c3.is_some() { "launch period (days)" } else { "" },
    );
    for (r, fixed) in rows {
        let revs = if r.revs == 0 {
            "0".to_string()
        } else {
            format!("{} {}", r.revs, r.branch)
        };
        let lp = match (
            &r.launch_first_date,
            &r.launch_last_date,
            r.launch_days_open,
        ) {
            (Some(a), Some(b), Some(d)) => format!(
                "{}..{} ({d:.1})",
                a.get(5..10).unwrap_or(a),
                b.get(5..10).unwrap_or(b)
            ),
            // Launch periods are not computed for ridge rows (their
            // transfer plane is ill-conditioned): say so, not "closed".
            _ if max_c3.is_some() && r.flags.split(';').any(|f| f == "ridge") => {
                "not computed at the ridge".to_string()
            }
            _ if max_c3.is_some() => "closed".to_string(),
            _ => String::new(),
        };
        let _ = writeln!(
            s,
            "{:<11} {:<4} {:<8} {:<16} {:<16} {:>7.1} {:>8.3} {:>7.2} {:>7.2} {:>7.3} {:>7.3} {:>7.2} {:>7.3}  {:<28} {}",
            r.opportunity,
            r.kind,
            revs,
            short(&r.depart_date),
            short(&r.arrive_date),
            r.tof_days * per_day,
            r.c3_km2_s2,
            r.dla_deg,
            r.rla_deg,
            r.vinf_depart_km_s,
            r.vinf_arrive_km_s,
            r.arrive_dec_deg,
            r.dv_total_km_s,
            lp,
            r.flags
        );
        if let Some(p) = fixed {
            let _ = writeln!(
                s,
                "{:<17} fixed arrival {}: {} daily departures from {}, C3 <= {:.3}",
                "",
                short(&file_date(p.arrive_days)),
                p.days,
                short(&file_date(p.first_days)),
                p.max_c3_km2_s2
            );
        }
    }
    if rows.is_empty() {
        let _ = writeln!(
            s,
            "(no opportunity in this span: its best departures all lie outside it; \
             widen the span)"
        );
    }
    let _ = writeln!(
        s,
        "\nC3 km^2/s^2; v-infinity (out, in) and delta-v km/s; angles deg; dates TDB.\n\
         Type I: transfer angle < 180 deg; II: > 180 deg. Flags: ridge = next to the \
         180-deg ridge (ill-conditioned), edge = on a search limit, over-limit = above a ceiling;\n\
         hyperbolic = the transfer orbit escapes the central body (information only)."
    );
    let _ = writeln!(s, "\n{CAUTION}");
    s
}

/// `YYYY-MM-DD hh:mm` from a table date.
fn short(date: &str) -> String {
    let d = date.replacen('T', " ", 1);
    if d.len() >= 16 {
        d[..16].to_string()
    } else {
        d
    }
}
