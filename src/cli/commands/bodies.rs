//! `synodic bodies`: a system's bodies, periods and synodic periods.

use std::fmt::Write as _;
use std::path::Path;

use serde::Serialize;
use synodic::ephemeris::AU_KM;

use super::print;
use crate::cli::input::load_system;
use crate::cli::{CliResult, Outcome};

#[derive(Debug, Serialize)]
struct BodyRow {
    name: String,
    a_au: f64,
    e: f64,
    i_deg: f64,
    node_deg: f64,
    peri_deg: f64,
    mean_lon_deg: f64,
    period_days: f64,
    mu_km3_s2: Option<f64>,
    radius_km: Option<f64>,
    /// Synodic period against each other body, days, in body order.
    synodic_days: Vec<SynodicEntry>,
}

#[derive(Debug, Serialize)]
struct SynodicEntry {
    with: String,
    days: Option<f64>,
}

#[derive(Debug, Serialize)]
struct Report {
    system: String,
    source: String,
    epoch: String,
    central: String,
    central_mu_km3_s2: f64,
    bodies: Vec<BodyRow>,
}

pub fn run(system_path: Option<&Path>, json: bool) -> CliResult<Outcome> {
    let system = load_system(system_path)?;
    let n = system.bodies.len();
    let rows: Vec<BodyRow> = (0..n)
        .map(|i| {
            let b = &system.bodies[i];
            BodyRow {
                name: b.name.clone(),
                a_au: b.elements.a_km / AU_KM,
                e: b.elements.e,
                i_deg: b.elements.i_deg,
                node_deg: b.elements.node_deg,
                peri_deg: b.elements.peri_deg,
                mean_lon_deg: b.elements.mean_lon_deg,
                period_days: system.period_days(i),
                mu_km3_s2: b.mu_km3_s2,
                radius_km: b.radius_km,
                synodic_days: (0..n)
                    .filter(|&j| j != i)
                    .map(|j| {
                        let d = system.synodic_period_days(i, j);
                        SynodicEntry {
                            with: system.bodies[j].name.clone(),
                            days: d.is_finite().then_some(d),
                        }
                    })
                    .collect(),
            }
        })
        .collect();
    let report = Report {
        system: system.name.clone(),
        source: system.source.clone(),
        epoch: system.epoch.to_iso_tdb(),
        central: system.central.name.clone(),
        central_mu_km3_s2: system.central.mu_km3_s2,
        bodies: rows,
    };
    if json {
        let mut text = serde_json::to_string_pretty(&report)?;
        text.push('\n');
        return print(&text).map(|_| Outcome::Done);
    }
    print(&table(&report)).map(|_| Outcome::Done)
}

fn table(r: &Report) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "System   {} ({})", r.system, r.source);
    let _ = writeln!(s, "Epoch    {}", r.epoch);
    let _ = writeln!(
        s,
        "Central  {}  GM {:.6e} km^3/s^2\n",
        r.central, r.central_mu_km3_s2
    );
    let w = r
        .bodies
        .iter()
        .map(|b| b.name.len())
        .max()
        .unwrap_or(4)
        .max(4);
    let _ = writeln!(
        s,
        "{:<w$}  {:>9}  {:>7}  {:>7}  {:>8}  {:>8}  {:>8}  {:>10}",
        "body", "a (au)", "e", "i (deg)", "node", "peri", "L", "period (d)"
    );
    for b in &r.bodies {
        let _ = writeln!(
            s,
            "{:<w$}  {:>9.5}  {:>7.4}  {:>7.3}  {:>8.3}  {:>8.3}  {:>8.3}  {:>10.2}",
            b.name, b.a_au, b.e, b.i_deg, b.node_deg, b.peri_deg, b.mean_lon_deg, b.period_days
        );
    }
    let _ = writeln!(s, "\nSynodic periods (days)");
    let _ = write!(s, "{:<w$}", "");
    for b in &r.bodies {
        let _ = write!(s, "  {:>w2$}", b.name, w2 = b.name.len().max(8));
    }
    let _ = writeln!(s);
    for (i, b) in r.bodies.iter().enumerate() {
        let _ = write!(s, "{:<w$}", b.name);
        let mut k = 0;
        for (j, other) in r.bodies.iter().enumerate() {
            let width = other.name.len().max(8);
            if i == j {
                let _ = write!(s, "  {:>width$}", "-");
            } else {
                let cell = match b.synodic_days[k].days {
                    Some(d) => format!("{d:.1}"),
                    None => "inf".to_string(),
                };
                let _ = write!(s, "  {cell:>width$}");
                k += 1;
            }
        }
        let _ = writeln!(s);
    }
    s
}
