//! Running a study: resolve it against its system, run each pair's sweep
//! and window scan, and write every output with the resolved study beside
//! it, so that `synodic run DIR/study.toml` repeats the run byte for byte.
//!
//! Both `synodic sweep` and `synodic run` come through here: the command
//! line is first turned into a [`Study`], then resolved (defaults filled,
//! dates normalised) and built from the resolved form only, so the first
//! run and any repetition start from the same text.

use std::path::{Path, PathBuf};
use std::time::Instant;

use serde::Serialize;
use synodic::ephemeris::System;
use synodic::export::{ensure_dir, write_atomic};
use synodic::opportunity::{hohmann_tof_days, next_opportunity};
use synodic::study::{locate, relative_path, Orbits, Study, SweepSection};
use synodic::sweep::{Axis, SecondAxis, SweepError, SweepSpec};
use synodic::time::parse_span;

use super::{print, sweep, windows};
use crate::cli::input::{compact_date, resolve_endpoints, sha256_hex};
use crate::cli::{CliResult, Outcome};

/// Where a study came from, for messages that point at the right place.
#[derive(Debug, Clone)]
pub enum Origin {
    /// The command line: messages name the option.
    Cli,
    /// A file: messages name the file, line and key.
    File {
        /// The file as the user named it.
        name: String,
        /// Its text.
        text: String,
    },
}

impl Origin {
    /// Prefix for a message about `section.key` (option `flag` on the
    /// command line). `index` picks the `[[pair]]` for pair keys.
    pub fn at(&self, section: &str, index: usize, key: &str, flag: &str) -> String {
        match self {
            Origin::Cli => flag.to_string(),
            Origin::File { name, text } => {
                let line = locate(text, section, index, key);
                let dotted = if section.is_empty() {
                    key.to_string()
                } else {
                    format!("{section}.{key}")
                };
                format!("{name}:{line}: key `{dotted}`")
            }
        }
    }
}

/// Run options that do not change any output file.
#[derive(Debug, Clone, Copy, Default)]
pub struct RunFlags {
    /// Worker threads.
    pub threads: Option<usize>,
    /// No progress bar.
    pub quiet: bool,
    /// JSON on stdout.
    pub json: bool,
}

/// The system a study names, with the SHA-256 of its file.
pub struct LoadedSystem {
    pub system: System,
    pub sha256: String,
    /// The file's absolute-or-relative path as resolved (None: demo).
    pub path: Option<PathBuf>,
}

/// Load the study's system, relative to `base_dir`.
pub fn load_system(study: &Study, base_dir: &Path, origin: &Origin) -> CliResult<LoadedSystem> {
    if study.system == "demo" {
        return Ok(LoadedSystem {
            system: System::demo(),
            sha256: sha256_hex(System::demo_toml().as_bytes()),
            path: None,
        });
    }
    let path = base_dir.join(&study.system);
    let bytes = std::fs::read(&path).map_err(|e| {
        format!(
            "{}: cannot read system file {}: {e}",
            origin.at("", 0, "system", "--system"),
            path.display()
        )
    })?;
    let system = System::load(&path)
        .map_err(|e| format!("{}: {e}", origin.at("", 0, "system", "--system")))?;
    Ok(LoadedSystem {
        system,
        sha256: sha256_hex(&bytes),
        path: Some(path),
    })
}

/// Days past J2000 TDB rounded to the nearest TDB midnight (J2000 is noon).
fn midnight(days: f64) -> f64 {
    (days - 0.5).round() + 0.5
}

fn span_text(a: f64, b: f64) -> String {
    format!("{}..{}", compact_date(a), compact_date(b))
}

/// Fill a sweep section's defaults for one pair and normalise its dates.
pub fn resolve_sweep(
    s: &SweepSection,
    system: &System,
    from: usize,
    to: usize,
    origin: &Origin,
) -> CliResult<SweepSection> {
    let t_h = hohmann_tof_days(
        system.bodies[from].elements.a_km,
        system.bodies[to].elements.a_km,
        system.central.mu_km3_s2,
    );
    let (d0, d1) = match &s.depart {
        Some(text) => {
            let (a, b) = parse_span(text)
                .map_err(|e| format!("{}: {e}", origin.at("sweep", 0, "depart", "--depart")))?;
            (a.days_since_j2000_tdb(), b.days_since_j2000_tdb())
        }
        None => {
            let opp = next_opportunity(system, from, to, system.epoch.days_since_j2000_tdb())
                .ok_or("the two bodies share a period: give the departure span")?;
            let half = (0.12 * opp.synodic_days).clamp(60.0, 200.0).round();
            let centre = midnight(opp.depart_days);
            (centre - half, centre + half)
        }
    };
    let mut out = s.clone();
    out.depart = Some(span_text(d0, d1));
    match (&s.arrive, &s.tof_days) {
        (Some(_), Some(_)) => {
            return Err(format!(
                "{}: give arrival dates or times of flight, not both",
                origin.at("sweep", 0, "tof_days", "--tof-days")
            )
            .into())
        }
        (Some(text), None) => {
            let (a, b) = parse_span(text)
                .map_err(|e| format!("{}: {e}", origin.at("sweep", 0, "arrive", "--arrive")))?;
            out.arrive = Some(span_text(
                a.days_since_j2000_tdb(),
                b.days_since_j2000_tdb(),
            ));
        }
        (None, Some(_)) => {}
        (None, None) => {
            out.arrive = Some(span_text(
                midnight(d0 + 0.5 * t_h),
                midnight(d1 + 1.5 * t_h),
            ));
        }
    }
    if out.step_days.is_none() {
        out.step_days = Some(vec![1.0]);
    }
    Ok(out)
}

/// Build the grid specification from a resolved sweep section.
pub fn sweep_spec(
    s: &SweepSection,
    system: &System,
    from: usize,
    to: usize,
    study: &Study,
    origin: &Origin,
) -> CliResult<(SweepSpec, u128)> {
    let at = |key: &str, flag: &str| origin.at("sweep", 0, key, flag);
    let steps = s.step_days.clone().unwrap_or_else(|| vec![1.0]);
    let (step_d, step_s) = match steps.as_slice() {
        [a] => (*a, *a),
        [a, b] => (*a, *b),
        _ => {
            return Err(format!(
                "{}: give one step or two (departure, second axis), got {}",
                at("step_days", "--step-days"),
                steps.len()
            )
            .into())
        }
    };
    for v in [step_d, step_s] {
        if !(v.is_finite() && v > 0.0) {
            return Err(format!(
                "{}: steps must be > 0 days, got {v}",
                at("step_days", "--step-days")
            )
            .into());
        }
    }
    let depart_text = s.depart.as_deref().unwrap_or_default();
    let (a, b) =
        parse_span(depart_text).map_err(|e| format!("{}: {e}", at("depart", "--depart")))?;
    let (d0, d1) = (a.days_since_j2000_tdb(), b.days_since_j2000_tdb());
    let depart =
        Axis::spanning(d0, d1, step_d).map_err(|e| format!("{}: {e}", at("depart", "--depart")))?;
    let (second, kind) = match (&s.arrive, &s.tof_days) {
        (Some(text), _) => {
            let (a, b) =
                parse_span(text).map_err(|e| format!("{}: {e}", at("arrive", "--arrive")))?;
            let (a, b) = (a.days_since_j2000_tdb(), b.days_since_j2000_tdb());
            if b <= d0 {
                return Err(format!(
                    "{}: the arrival span ends before the departure span starts",
                    at("arrive", "--arrive")
                )
                .into());
            }
            let axis = Axis::spanning(a, b, step_s)
                .map_err(|e| format!("{}: {e}", at("arrive", "--arrive")))?;
            (axis, SecondAxis::Arrival)
        }
        (None, Some([lo, hi])) => {
            if !(lo.is_finite() && hi.is_finite() && *lo > 0.0 && hi >= lo) {
                return Err(format!(
                    "{}: times of flight must satisfy 0 < MIN <= MAX, got {lo}..{hi}",
                    at("tof_days", "--tof-days")
                )
                .into());
            }
            let axis = Axis::spanning(*lo, *hi, step_s)
                .map_err(|e| format!("{}: {e}", at("tof_days", "--tof-days")))?;
            (axis, SecondAxis::TimeOfFlight)
        }
        (None, None) => {
            return Err(format!(
                "{}: give arrival dates or times of flight",
                at("arrive", "--arrive")
            )
            .into())
        }
    };
    let gib = s.max_memory_gib.unwrap_or(4.0);
    if !(gib.is_finite() && gib > 0.0) {
        return Err(format!(
            "{}: must be > 0 GiB, got {gib}",
            at("max_memory_gib", "--max-memory-gib")
        )
        .into());
    }
    let ends = endpoints(study, system, from, to, origin)?;
    Ok((
        SweepSpec {
            from,
            to,
            depart,
            second,
            second_kind: kind,
            max_revs: s.revs,
            ends,
        },
        (gib * (1u64 << 30) as f64) as u128,
    ))
}

/// Parking and capture orbits of a study for one pair; a message about a
/// bad value names the study's key (or the option).
pub fn endpoints(
    study: &Study,
    system: &System,
    from: usize,
    to: usize,
    origin: &Origin,
) -> CliResult<synodic::transfer::Endpoints> {
    let o = &study.orbits;
    let at = |key: &str, flag: &str| origin.at("orbits", 0, key, flag);
    check_orbits(o, origin)?;
    resolve_endpoints(
        &system.bodies[from],
        &system.bodies[to],
        o.park_alt_km,
        o.capture_alt_km,
        o.capture_ecc.unwrap_or(0.0),
    )
    .map_err(|e| {
        let (key, flag) = if o.capture_alt_km.is_some() && e.to_string().contains("capture") {
            ("capture_alt_km", "--capture-alt-km")
        } else {
            ("park_alt_km", "--park-alt-km")
        };
        format!("{}: {e} (in {})", at(key, flag), system.source).into()
    })
}

/// Altitudes and the capture eccentricity in range, each message naming
/// its study key (or option).
pub fn check_orbits(o: &Orbits, origin: &Origin) -> CliResult<()> {
    let at = |key: &str, flag: &str| origin.at("orbits", 0, key, flag);
    for (key, flag, value) in [
        ("park_alt_km", "--park-alt-km", o.park_alt_km),
        ("capture_alt_km", "--capture-alt-km", o.capture_alt_km),
    ] {
        if let Some(v) = value {
            if !(v.is_finite() && v >= 0.0) {
                return Err(
                    format!("{}: must be an altitude >= 0 km, got {v}", at(key, flag)).into(),
                );
            }
        }
    }
    if let Some(e) = o.capture_ecc {
        if !(e.is_finite() && (0.0..1.0).contains(&e)) {
            return Err(format!(
                "{}: the capture orbit's eccentricity must be in [0, 1) (0 circular, below 1 \
                 elliptic), got {e}",
                at("capture_ecc", "--capture-ecc")
            )
            .into());
        }
        if o.capture_alt_km.is_none() {
            return Err(format!(
                "{}: a capture eccentricity needs the capture orbit's periapsis altitude, \
                 orbits.capture_alt_km (--capture-alt-km)",
                at("capture_ecc", "--capture-ecc")
            )
            .into());
        }
    }
    Ok(())
}

/// What every run records beside its outputs but keeps out of them.
#[derive(Debug, Serialize)]
struct RunInfo {
    tool: String,
    command: Vec<String>,
    started_unix_s: u64,
    wall_s: f64,
    threads: usize,
    host: String,
}

/// The output folder of pair `k`.
fn pair_out(study: &Study, base_dir: &Path, out_override: Option<&Path>, k: usize) -> PathBuf {
    let root = match (out_override, &study.out) {
        (Some(p), _) => p.to_path_buf(),
        (None, Some(o)) => base_dir.join(o),
        (None, None) => base_dir.join("synodic-out"),
    };
    if study.pairs.len() > 1 {
        let p = &study.pairs[k];
        root.join(format!("{}-{}", p.from, p.to))
    } else {
        root
    }
}

/// Run every pair of `study`.
pub fn execute(
    study: &Study,
    origin: &Origin,
    base_dir: &Path,
    out_override: Option<&Path>,
    flags: RunFlags,
) -> CliResult<Outcome> {
    if flags.threads == Some(0) {
        return Err("--threads must be at least 1".into());
    }
    let started = Instant::now();
    let unix = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map_or(0, |d| d.as_secs());
    let loaded = load_system(study, base_dir, origin)?;
    let system = &loaded.system;
    // Check every pair before running any, so a typo in the last pair does
    // not leave the first pair's files behind.
    let mut pairs = Vec::new();
    for (k, p) in study.pairs.iter().enumerate() {
        let from = system
            .find(&p.from)
            .map_err(|e| format!("{}: {e}", origin.at("pair", k, "from", "FROM")))?;
        let to = system
            .find(&p.to)
            .map_err(|e| format!("{}: {e}", origin.at("pair", k, "to", "TO")))?;
        if from == to {
            return Err(format!(
                "{}: departure and arrival body are both \"{}\": choose two different bodies",
                origin.at("pair", k, "to", "TO"),
                system.bodies[from].name
            )
            .into());
        }
        pairs.push((from, to));
    }
    for name in &study.chart.show {
        if synodic::chart::Panel::from_name(name).is_none() {
            return Err(format!(
                "{}: unknown chart panel {name:?}; choose from dla, arrive-dec, dv-total",
                origin.at("chart", 0, "show", "--show")
            )
            .into());
        }
    }
    let mut outcome = Outcome::NothingFeasible;
    let mut prepared = Vec::new();
    for (k, &(from, to)) in pairs.iter().enumerate() {
        let out_dir = pair_out(study, base_dir, out_override, k);
        let mut resolved = study.clone();
        resolved.pairs = vec![study.pairs[k].clone()];
        resolved.out = Some(".".to_string());
        if let Some(s) = &study.sweep {
            resolved.sweep = Some(resolve_sweep(s, system, from, to, origin)?);
        }
        if let Some(w) = &mut resolved.windows {
            let (a, b) = parse_span(&w.span)
                .map_err(|e| format!("{}: {e}", origin.at("windows", 0, "span", "--span")))?;
            w.span = span_text(a.days_since_j2000_tdb(), b.days_since_j2000_tdb());
        }
        let sweep_plan = match &resolved.sweep {
            Some(s) => {
                let (spec, limit) = sweep_spec(s, system, from, to, &resolved, origin)?;
                let need = spec.memory_estimate_bytes();
                if need > limit {
                    let too_large = SweepError::TooLarge {
                        needed_mib: need.div_ceil(1 << 20),
                        limit_mib: limit >> 20,
                    };
                    let at = origin.at("sweep", 0, "max_memory_gib", "--max-memory-gib");
                    return Err(format!("{at}: {too_large}").into());
                }
                Some((spec, limit))
            }
            None => None,
        };
        let scan_plan = match &resolved.windows {
            Some(w) => Some(windows::scan_plan(w, &resolved, system, from, to, origin)?),
            None => None,
        };
        prepared.push((out_dir, resolved, sweep_plan, scan_plan, from, to));
    }
    for (out_dir, mut resolved, sweep_plan, scan_plan, from, to) in prepared {
        ensure_dir(&out_dir)?;
        if let Some(path) = &loaded.path {
            resolved.system = relative_path(&out_dir, path).display().to_string();
        }
        let study_text = resolved.to_toml();
        let provenance = Provenance {
            tool: format!("synodic {}", env!("CARGO_PKG_VERSION")),
            system_name: system.name.clone(),
            system_file: resolved.system.clone(),
            system_sha256: loaded.sha256.clone(),
            study_sha256: sha256_hex(study_text.as_bytes()),
        };
        let mut written = Vec::new();
        let mut screen = String::new();
        let mut json = Vec::new();
        let mut parts = Vec::new();
        if let Some((spec, limit)) = &sweep_plan {
            let r = sweep::run_grid(
                system,
                spec,
                *limit,
                &resolved,
                &provenance,
                &out_dir,
                flags,
            )?;
            parts.push(r);
        }
        if let Some(plan) = &scan_plan {
            let r = windows::run_scan(
                system,
                from,
                to,
                plan,
                &resolved,
                &provenance,
                &out_dir,
                flags,
            )?;
            parts.push(r);
        }
        for r in parts {
            if r.feasible {
                outcome = Outcome::Done;
            }
            written.extend(r.written);
            screen.push_str(&r.screen);
            json.push(r.json);
        }
        let study_path = out_dir.join("study.toml");
        write_atomic(&study_path, study_text.as_bytes())?;
        written.push(study_path);
        let info = RunInfo {
            tool: provenance.tool.clone(),
            command: std::env::args().collect(),
            started_unix_s: unix,
            wall_s: started.elapsed().as_secs_f64(),
            threads: flags.threads.unwrap_or_else(rayon::current_num_threads),
            host: host_name(),
        };
        let info_path = out_dir.join("run-info.json");
        let mut info_text = serde_json::to_string_pretty(&info)?;
        info_text.push('\n');
        write_atomic(&info_path, info_text.as_bytes())?;
        written.push(info_path);
        if flags.json {
            let mut text = if json.len() == 1 {
                json.remove(0)
            } else {
                format!("[{}]", json.join(","))
            };
            text.push('\n');
            print(&text)?;
        } else {
            for p in &written {
                screen.push_str(&format!("wrote {}\n", p.display()));
            }
            screen.push_str(&format!("\n{}\n", windows::CAUTION));
            print(&screen)?;
        }
    }
    Ok(outcome)
}

/// Provenance recorded in every `summary.json`: no times, no host, so equal
/// inputs give equal files.
#[derive(Debug, Clone, Serialize)]
pub struct Provenance {
    pub tool: String,
    pub system_name: String,
    /// `demo`, or the system file relative to the output folder.
    pub system_file: String,
    pub system_sha256: String,
    /// SHA-256 of the `study.toml` written beside the outputs.
    pub study_sha256: String,
}

fn host_name() -> String {
    std::fs::read_to_string("/etc/hostname")
        .map(|s| s.trim().to_string())
        .ok()
        .or_else(|| std::env::var("HOSTNAME").ok())
        .unwrap_or_default()
}

/// What one part of a run (sweep or scan) produced.
pub struct PartResult {
    pub written: Vec<PathBuf>,
    pub screen: String,
    pub json: String,
    pub feasible: bool,
}

/// Save a command line's `study` to `path` (for `--save-study`), with the
/// `--system` file, if any, made relative to the saved file's folder.
pub fn save_study(study: &Study, system: Option<&Path>, path: &Path) -> CliResult<()> {
    let mut saved = study.clone();
    if let Some(sys) = system {
        saved.system = relative_path(folder_of(path), sys).display().to_string();
    }
    write_atomic(path, saved.to_toml().as_bytes())?;
    Ok(())
}

/// The folder holding `path` (`.` for a bare file name).
pub fn folder_of(path: &Path) -> &Path {
    path.parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."))
}
