//! `synodic transfer`: one transfer between two bodies on given dates.

use std::fmt::Write as _;

use nalgebra::Vector3;
use serde::Serialize;
use synodic::ephemeris::System;
use synodic::export::stamp;
use synodic::lambert::LambertSolution;
use synodic::orbit::{conic_from_state, State};
use synodic::transfer::{arcs_between, periapsis_km, ArcFlags, Figures, RELATIVISTIC_SPEED_KM_S};

use super::print;
use super::study::{check_orbits, Origin};
use crate::cli::args::TransferArgs;
use crate::cli::input::{body_pair, load_system, parse_epoch, resolve_endpoints};
use crate::cli::{CliResult, Outcome};
use synodic::study::Orbits;

#[derive(Debug, Serialize)]
struct ArcOut {
    revs: u32,
    branch: String,
    #[serde(rename = "type")]
    kind: String,
    transfer_angle_deg: f64,
    tof_days: f64,
    c3_km2_s2: f64,
    vinf_depart_km_s: f64,
    dla_deg: f64,
    rla_deg: f64,
    vinf_arrive_km_s: f64,
    arrive_dec_deg: f64,
    arrive_ra_deg: f64,
    dv_depart_km_s: f64,
    dv_arrive_km_s: f64,
    dv_total_km_s: f64,
    /// Sanity flags, `;`-separated (README: Flags).
    flags: String,
    orbit: Option<OrbitOut>,
}

#[derive(Debug, Serialize)]
struct OrbitOut {
    a_km: f64,
    e: f64,
    i_deg: f64,
    node_deg: f64,
    arg_peri_deg: f64,
}

#[derive(Debug, Serialize)]
struct Report {
    system: String,
    from: String,
    to: String,
    depart_date: String,
    depart_jd_tdb: f64,
    arrive_date: String,
    arrive_jd_tdb: f64,
    arcs: Vec<ArcOut>,
}

pub fn run(args: &TransferArgs) -> CliResult<Outcome> {
    let system = load_system(args.system.as_deref())?;
    let (from, to) = body_pair(&system, &args.from, &args.to)?;
    let depart = parse_epoch(&args.depart, "--depart")?;
    let arrive = parse_epoch(&args.arrive, "--arrive")?;
    check_orbits(
        &Orbits {
            park_alt_km: args.orbits.park_alt_km,
            capture_alt_km: args.orbits.capture_alt_km,
            capture_ecc: args.orbits.capture_alt_km.map(|_| args.orbits.capture_ecc),
        },
        &Origin::Cli,
    )?;
    let ends = resolve_endpoints(
        &system.bodies[from],
        &system.bodies[to],
        args.orbits.park_alt_km,
        args.orbits.capture_alt_km,
        args.orbits.capture_ecc,
    )
    .map_err(|e| {
        let flag = if e.to_string().contains("capture") {
            "--capture-alt-km"
        } else {
            "--park-alt-km"
        };
        format!("{flag}: {e} (in {})", system.source)
    })?;
    let arcs = arcs_between(&system, from, to, &depart, &arrive, &ends, args.revs)?;
    let r1 = system.state(from, &depart).r_km;
    let mu = system.central.mu_km3_s2;
    let mut out = Vec::with_capacity(arcs.len());
    for (fig, sol) in &arcs {
        warn(fig, sol, &r1, &system);
        // A degenerate arc (e.g. rectilinear) has no classical elements;
        // its other figures still stand.
        let orbit = conic_from_state(
            &State {
                r_km: r1,
                v_km_s: sol.v1,
            },
            mu,
        )
        .ok()
        .map(|conic| OrbitOut {
            a_km: conic.a_km,
            e: conic.e,
            i_deg: conic.i_deg,
            node_deg: conic.node_deg,
            arg_peri_deg: conic.arg_peri_deg,
        });
        out.push(arc_out(fig, orbit));
    }
    let report = Report {
        system: system.name.clone(),
        from: system.bodies[from].name.clone(),
        to: system.bodies[to].name.clone(),
        depart_date: stamp(depart.days_since_j2000_tdb()).date,
        depart_jd_tdb: stamp(depart.days_since_j2000_tdb()).jd_tdb,
        arrive_date: stamp(arrive.days_since_j2000_tdb()).date,
        arrive_jd_tdb: stamp(arrive.days_since_j2000_tdb()).jd_tdb,
        arcs: out,
    };
    if args.json {
        let mut text = serde_json::to_string_pretty(&report)?;
        text.push('\n');
        print(&text)?;
    } else {
        print(&table(&report))?;
    }
    Ok(Outcome::Done)
}

fn arc_out(f: &Figures, orbit: Option<OrbitOut>) -> ArcOut {
    ArcOut {
        revs: f.revs,
        branch: f.branch.to_string(),
        kind: f.kind.to_string(),
        transfer_angle_deg: f.transfer_angle_deg,
        tof_days: f.tof_days,
        c3_km2_s2: f.c3_km2_s2,
        vinf_depart_km_s: f.vinf_depart_km_s,
        dla_deg: f.dla_deg,
        rla_deg: f.rla_deg,
        vinf_arrive_km_s: f.vinf_arrive_km_s,
        arrive_dec_deg: f.arrive_dec_deg,
        arrive_ra_deg: f.arrive_ra_deg,
        dv_depart_km_s: f.dv_depart_km_s,
        dv_arrive_km_s: f.dv_arrive_km_s,
        dv_total_km_s: f.dv_total_km_s,
        flags: f.flags.to_text(),
        orbit,
    }
}

/// A warning on stderr for an arc whose numbers should not be used as
/// they stand (the figures are still printed).
fn warn(f: &Figures, sol: &LambertSolution, r1: &Vector3<f64>, system: &System) {
    let arc = format!("Type {} arc ({} rev, {})", f.kind, f.revs, f.branch);
    if f.flags.contains(ArcFlags::PERIAPSIS_INSIDE) {
        let rp = periapsis_km(r1, r1.norm(), &sol.v1, system.central.mu_km3_s2);
        eprintln!(
            "synodic: warning: {arc}: its periapsis, {rp:.0} km from the centre of {}, lies \
             inside its radius ({:.0} km): not a flyable transfer",
            system.central.name,
            system.central.radius_km.unwrap_or(f64::NAN)
        );
    }
    if f.flags.contains(ArcFlags::RELATIVISTIC) {
        eprintln!(
            "synodic: warning: {arc}: the spacecraft would move at {:.0} km/s, over 1 % of the \
             speed of light ({RELATIVISTIC_SPEED_KM_S:.0} km/s), where two-body (Newtonian) \
             motion no longer holds: the time of flight ({}) is far too short for the distance, \
             and the figures have no physical meaning",
            sol.v1.norm().max(sol.v2.norm()),
            duration(f.tof_days)
        );
    }
}

fn orbit_line(o: Option<&OrbitOut>, first: bool) -> String {
    match (o, first) {
        (Some(o), true) => format!("a {:.6e} km  e {:.5}  i {:.4} deg", o.a_km, o.e, o.i_deg),
        (Some(o), false) => format!(
            "node {:.4} deg  arg. periapsis {:.4} deg",
            o.node_deg, o.arg_peri_deg
        ),
        (None, true) => "undefined (degenerate arc)".to_string(),
        (None, false) => String::new(),
    }
}

fn table(r: &Report) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "{} -> {}  ({})", r.from, r.to, r.system);
    let _ = writeln!(
        s,
        "depart   {} TDB  (JD {:.6} TDB)",
        r.depart_date, r.depart_jd_tdb
    );
    let _ = writeln!(
        s,
        "arrive   {} TDB  (JD {:.6} TDB)",
        r.arrive_date, r.arrive_jd_tdb
    );
    for a in &r.arcs {
        let _ = writeln!(
            s,
            "\nType {}  revs {}  branch {}  transfer angle {:.3} deg  time of flight {}",
            a.kind,
            a.revs,
            a.branch,
            a.transfer_angle_deg,
            duration(a.tof_days)
        );
        let rows: [(&str, String); 13] = [
            ("C3", format!("{:.4} km^2/s^2", a.c3_km2_s2)),
            ("v-infinity out", format!("{:.4} km/s", a.vinf_depart_km_s)),
            ("DLA", format!("{:.3} deg", a.dla_deg)),
            ("RLA", format!("{:.3} deg", a.rla_deg)),
            ("v-infinity in", format!("{:.4} km/s", a.vinf_arrive_km_s)),
            ("arrival dec", format!("{:.3} deg", a.arrive_dec_deg)),
            ("arrival RA", format!("{:.3} deg", a.arrive_ra_deg)),
            ("delta-v depart", format!("{:.4} km/s", a.dv_depart_km_s)),
            ("delta-v arrive", format!("{:.4} km/s", a.dv_arrive_km_s)),
            ("delta-v total", format!("{:.4} km/s", a.dv_total_km_s)),
            ("flags", a.flags.clone()),
            ("transfer orbit", orbit_line(a.orbit.as_ref(), true)),
            ("", orbit_line(a.orbit.as_ref(), false)),
        ];
        for (k, v) in rows {
            let _ = writeln!(s, "  {k:<16} {v}");
        }
    }
    s
}

/// A time of flight for screens: days, or hours (and seconds) where days
/// would print as a small fraction.
fn duration(tof_days: f64) -> String {
    if tof_days >= 10.0 {
        format!("{tof_days:.3} d")
    } else if tof_days * 24.0 >= 1.0 {
        format!("{tof_days:.5} d ({:.3} h)", tof_days * 24.0)
    } else {
        format!("{tof_days:.3e} d ({:.3} s)", tof_days * 86400.0)
    }
}
