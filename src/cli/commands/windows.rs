//! `synodic windows`: the best-window table over a span.

use std::fmt::Write as _;
use std::path::{Path, PathBuf};

use serde::Serialize;
use synodic::export::{launch_period_csv, windows_csv, write_atomic, WindowRecord};
use synodic::sweep::Objective;
use synodic::time::parse_span;
use synodic::transfer::Leg;
use synodic::windows::launch::{fixed_arrival_period, launch_period, FixedArrivalPeriod};
use synodic::windows::{scan, Bounds, OpportunityWindow, ScanOptions};

use super::print;
use crate::cli::args::WindowsArgs;
use crate::cli::input::{body_pair, load_system, parse_number_span, resolve_endpoints};
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
    windows: &[OpportunityWindow],
    objective: Objective,
    limits: Limits,
    launch_days: Option<u32>,
) -> Vec<(WindowRecord, Option<FixedArrivalPeriod>)> {
    let mut out = Vec::new();
    for w in windows {
        let bounds = Bounds {
            depart: w.depart,
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
            let rec =
                WindowRecord::new(&w.label, opt, objective, over, lp.as_ref(), fixed.as_ref());
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
    c3_km2_s2: Option<f64>,
    dla_deg: Option<f64>,
    rla_deg: Option<f64>,
    vinf_arrive_km_s: Option<f64>,
}

pub fn run(args: &WindowsArgs) -> CliResult<Outcome> {
    let system = load_system(args.system.as_deref())?;
    let (from, to) = body_pair(&system, &args.from, &args.to)?;
    let objective = Objective::from_name(&args.objective).ok_or_else(|| {
        format!(
            "--objective: unknown {:?}; choose from c3, vinf-arrive, dv-total, c3+vinf",
            args.objective
        )
    })?;
    let (s0, s1) = parse_span(&args.span).map_err(|e| format!("--span: {e}"))?;
    let tof = match &args.tof_days {
        Some(t) => {
            let (lo, hi) = parse_number_span(t).map_err(|e| format!("--tof-days: {e}"))?;
            if lo <= 0.0 {
                return Err(
                    format!("--tof-days: times of flight must be > 0 days, got {lo}").into(),
                );
            }
            Some((lo, hi))
        }
        None => None,
    };
    for (name, v) in [
        ("--max-c3", args.max_c3),
        ("--max-vinf-arrive", args.max_vinf_arrive),
    ] {
        if let Some(x) = v {
            if !(x.is_finite() && x >= 0.0) {
                return Err(format!("{name} must be a number >= 0, got {x}").into());
            }
        }
    }
    if args.launch_period_days == Some(0) {
        return Err("--launch-period-days must be at least 1".into());
    }
    let ends = resolve_endpoints(
        &system.bodies[from],
        &system.bodies[to],
        args.park_alt_km,
        args.capture_alt_km,
        args.capture_ecc,
    )?;
    let leg = Leg {
        system: &system,
        from,
        to,
        ends,
    };
    let windows = scan(
        &leg,
        s0.days_since_j2000_tdb(),
        s1.days_since_j2000_tdb(),
        &ScanOptions {
            objective,
            tof_days: tof,
            max_revs: args.revs,
            steps: 150,
            threads: args.threads,
        },
    )?;
    let limits = Limits {
        max_c3: args.max_c3,
        max_vinf_arrive: args.max_vinf_arrive,
    };
    let rows = tabulate(&leg, &windows, objective, limits, args.launch_period_days);
    if let Some(out) = &args.out {
        let records: Vec<WindowRecord> = rows.iter().map(|r| r.0.clone()).collect();
        write_atomic(out, &windows_csv(&records)?)?;
        write_daily_tables(out, &rows)?;
    }
    if args.json {
        let json: Vec<JsonRow> = rows
            .iter()
            .map(|(record, fixed)| JsonRow {
                record,
                launch_period_daily: fixed.as_ref().map(daily_out),
            })
            .collect();
        let mut text = serde_json::to_string_pretty(&json)?;
        text.push('\n');
        print(&text)?;
    } else {
        let title = format!(
            "{} -> {}   ({}), departures {} .. {}, objective {}",
            system.bodies[from].name,
            system.bodies[to].name,
            system.name,
            s0.date_tdb(),
            s1.date_tdb(),
            objective.name()
        );
        print(&table(&title, &rows, args.max_c3))?;
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
            depart_date: synodic::export::table_date(d.depart_days),
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
    let dir = out
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
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
    let _ = writeln!(s, "{title}\n");
    let _ = writeln!(
        s,
        "{:<7} {:<4} {:<8} {:<16} {:<16} {:>7} {:>8} {:>7} {:>7} {:>7} {:>7} {:>7} {:>7}  {:<24} flags",
        "opport.", "type", "revs", "depart", "arrive", "tof d", "C3", "DLA", "RLA", "vinf o", "vinf i", "dec i", "dv tot",
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
            (Some(a), Some(b), Some(d)) => format!("{}..{} ({d:.1})", &a[5..10], &b[5..10]),
            _ if max_c3.is_some() => "closed".to_string(),
            _ => String::new(),
        };
        let _ = writeln!(
            s,
            "{:<7} {:<4} {:<8} {:<16} {:<16} {:>7.1} {:>8.3} {:>7.2} {:>7.2} {:>7.3} {:>7.3} {:>7.2} {:>7.3}  {:<24} {}",
            r.opportunity,
            r.kind,
            revs,
            short(&r.depart_date),
            short(&r.arrive_date),
            r.tof_days,
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
                "{:<13} fixed arrival {}: {} daily departures from {}, C3 <= {:.3}",
                "",
                short(&synodic::export::table_date(p.arrive_days)),
                p.days,
                short(&synodic::export::table_date(p.first_days)),
                p.max_c3_km2_s2
            );
        }
    }
    let _ = writeln!(
        s,
        "\nC3 km^2/s^2; v-infinity (out, in) and delta-v km/s; angles deg; dates TDB.\n\
         Type I: transfer angle < 180 deg; II: > 180 deg. Flags: ridge = next to the \
         180-deg ridge (ill-conditioned), edge = on a search limit, over-limit = above a ceiling."
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
