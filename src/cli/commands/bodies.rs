//! `synodic bodies`: a system's bodies, periods and synodic periods, and
//! with `--at` their states, to compare with any ephemeris one trusts.

use std::fmt::Write as _;
use std::path::Path;

use serde::Serialize;
use synodic::ephemeris::{Axes, System, AU_KM, JULIAN_CENTURY_DAYS};
use synodic::export::stamp;
use synodic::time::Epoch;

use super::print;
use crate::cli::input::load_system;
use crate::cli::{CliResult, Outcome};

#[derive(Debug, Serialize)]
struct BodyRow {
    name: String,
    a_km: f64,
    a_au: f64,
    e: f64,
    i_deg: f64,
    node_deg: f64,
    lon_peri_deg: f64,
    arg_peri_deg: f64,
    mean_lon_deg: f64,
    mean_anom_deg: f64,
    /// The keys the system file gave (the other two angles are derived).
    given: [&'static str; 2],
    /// Kepler's third law, from `a` and the central GM.
    period_days: f64,
    /// 360 deg over the mean-longitude rate the states use (equal to the
    /// Kepler period unless the file gives its own rate).
    mean_lon_period_days: f64,
    retrograde: bool,
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
struct StateRow {
    name: String,
    /// Position and velocity in the system frame, km and km/s.
    r_km: [f64; 3],
    v_km_s: [f64; 3],
    /// The same in the celestial frame (systems with a `[frame]`).
    #[serde(skip_serializing_if = "Option::is_none")]
    celestial_r_km: Option<[f64; 3]>,
    #[serde(skip_serializing_if = "Option::is_none")]
    celestial_v_km_s: Option<[f64; 3]>,
}

#[derive(Debug, Serialize)]
struct States {
    at_date: String,
    at_jd_tdb: f64,
    centre: String,
    states: Vec<StateRow>,
}

#[derive(Debug, Serialize)]
struct Report {
    system: String,
    source: String,
    epoch_date: String,
    epoch_jd_tdb: f64,
    central: String,
    central_mu_km3_s2: f64,
    bodies: Vec<BodyRow>,
    #[serde(skip_serializing_if = "Option::is_none")]
    at: Option<States>,
}

pub fn run(system_path: Option<&Path>, at: Option<&str>, json: bool) -> CliResult<Outcome> {
    let system = load_system(system_path)?;
    let at = at
        .map(|text| Epoch::parse(text).map_err(|e| format!("--at: {e}")))
        .transpose()?;
    let n = system.bodies.len();
    let rows: Vec<BodyRow> = (0..n)
        .map(|i| {
            let b = &system.bodies[i];
            let (peri_key, epoch_key) = b.element_set.keys();
            BodyRow {
                name: b.name.clone(),
                a_km: b.elements.a_km,
                a_au: b.elements.a_km / AU_KM,
                e: b.elements.e,
                i_deg: b.elements.i_deg,
                node_deg: b.elements.node_deg,
                lon_peri_deg: b.elements.peri_deg,
                arg_peri_deg: b.elements.arg_peri_deg(),
                mean_lon_deg: b.elements.mean_lon_deg,
                mean_anom_deg: b.elements.mean_anom_deg(),
                given: [peri_key, epoch_key],
                period_days: system.period_days(i),
                mean_lon_period_days: 360.0 / b.rates.mean_lon_deg * JULIAN_CENTURY_DAYS,
                retrograde: system.signed_period_days(i) < 0.0,
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
    let epoch = stamp(system.epoch.days_since_j2000_tdb());
    let report = Report {
        system: system.name.clone(),
        source: system.source.clone(),
        epoch_date: epoch.date,
        epoch_jd_tdb: epoch.jd_tdb,
        central: system.central.name.clone(),
        central_mu_km3_s2: system.central.mu_km3_s2,
        bodies: rows,
        at: at.map(|t| states_at(&system, &t)),
    };
    if json {
        let mut text = serde_json::to_string_pretty(&report)?;
        text.push('\n');
        return print(&text).map(|_| Outcome::Done);
    }
    let mut text = table(&report);
    if let Some(states) = &report.at {
        text.push_str(&states_table(states, &system));
    }
    print(&text).map(|_| Outcome::Done)
}

fn states_at(system: &System, t: &Epoch) -> States {
    let when = stamp(t.days_since_j2000_tdb());
    let celestial: Option<&Axes> = system.celestial_pole.map(|_| &system.celestial);
    let states = system
        .bodies
        .iter()
        .enumerate()
        .map(|(k, b)| {
            let s = system.state(k, t);
            let arr = |v: nalgebra::Vector3<f64>| [v.x, v.y, v.z];
            StateRow {
                name: b.name.clone(),
                r_km: arr(s.r_km),
                v_km_s: arr(s.v_km_s),
                celestial_r_km: celestial.map(|c| arr(c.components(&s.r_km))),
                celestial_v_km_s: celestial.map(|c| arr(c.components(&s.v_km_s))),
            }
        })
        .collect();
    States {
        at_date: when.date,
        at_jd_tdb: when.jd_tdb,
        centre: system.central.name.clone(),
        states,
    }
}

/// Distances in au for planetary systems, in km where every orbit is
/// smaller than 0.1 au (moon systems).
fn in_au(r: &Report) -> bool {
    r.bodies.iter().any(|b| b.a_au >= 0.1)
}

fn table(r: &Report) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "System   {} ({})", r.system, r.source);
    let _ = writeln!(s, "Epoch    {} TDB", r.epoch_date);
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
    let au = in_au(r);
    let _ = writeln!(
        s,
        "{:<w$}  {:>12}  {:>7}  {:>7}  {:>8}  {:>9}  {:>9}  {:>9}  {:>9}  {:>10}",
        "body",
        if au { "a (au)" } else { "a (km)" },
        "e",
        "i (deg)",
        "node",
        "lon peri",
        "arg peri",
        "mean lon",
        "mean anom",
        "period (d)"
    );
    for b in &r.bodies {
        // The angles as given carry a '*'; the others are derived.
        let angle = |v: f64, key: &str| {
            let mark = if b.given.contains(&key) { "*" } else { " " };
            format!("{v:>8.3}{mark}")
        };
        let a = if au {
            format!("{:.5}", b.a_au)
        } else {
            format!("{:.1}", b.a_km)
        };
        let _ = writeln!(
            s,
            "{:<w$}  {:>12}  {:>7.4}  {:>7.3}  {:>8.3}  {:>9}  {:>9}  {:>9}  {:>9}  {:>10.2}{}",
            b.name,
            a,
            b.e,
            b.i_deg,
            b.node_deg,
            angle(b.lon_peri_deg, "lon_peri_deg"),
            angle(b.arg_peri_deg, "arg_peri_deg"),
            angle(b.mean_lon_deg, "mean_lon_deg"),
            angle(b.mean_anom_deg, "mean_anom_deg"),
            b.period_days,
            notes(b)
        );
    }
    let _ = writeln!(
        s,
        "(angles in deg at the epoch; * as given in the system file, the others derived:\n \
         arg peri = lon peri - node, mean anom = mean lon - lon peri)"
    );
    let _ = writeln!(
        s,
        "\nSynodic periods (days; a retrograde body's mean motion counts as negative)"
    );
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

/// Remarks after a body's period: retrograde, and a given mean-motion
/// rate that differs from Kepler's third law (rate_check = false).
fn notes(b: &BodyRow) -> String {
    let mut n = String::new();
    if b.retrograde {
        n.push_str("  retrograde");
    }
    if (b.mean_lon_period_days / b.period_days - 1.0).abs() > 1e-4 {
        let _ = write!(
            n,
            "  (its mean-longitude rate gives {:.2} d)",
            b.mean_lon_period_days
        );
    }
    n
}

fn states_table(st: &States, system: &System) -> String {
    let mut s = String::new();
    let w = st
        .states
        .iter()
        .map(|b| b.name.len())
        .max()
        .unwrap_or(4)
        .max(4);
    let _ = writeln!(
        s,
        "\nStates at {} TDB (JD {:.6} TDB), centred on {}: km, km/s",
        st.at_date, st.at_jd_tdb, st.centre
    );
    let mut frames: Vec<(&str, bool)> = vec![("system frame (the file's reference plane)", false)];
    if system.celestial_pole.is_some() {
        frames.push((
            "celestial frame ([frame]: its equator; x = ascending node of the reference plane on it)",
            true,
        ));
    }
    for (title, celestial) in frames {
        let _ = writeln!(s, "\n{title}");
        let _ = writeln!(
            s,
            "{:<w$}  {:>17} {:>17} {:>17}  {:>12} {:>12} {:>12}",
            "body", "x", "y", "z", "vx", "vy", "vz"
        );
        for b in &st.states {
            let (r, v) = if celestial {
                (
                    b.celestial_r_km.unwrap_or([f64::NAN; 3]),
                    b.celestial_v_km_s.unwrap_or([f64::NAN; 3]),
                )
            } else {
                (b.r_km, b.v_km_s)
            };
            let _ = writeln!(
                s,
                "{:<w$}  {:>17.3} {:>17.3} {:>17.3}  {:>12.6} {:>12.6} {:>12.6}",
                b.name, r[0], r[1], r[2], v[0], v[1], v[2]
            );
        }
    }
    s
}
