//! Study files: a whole design run in one TOML file, so that it can be
//! repeated exactly months later.
//!
//! A study names the system (the built-in demo or a system file), one or
//! more body pairs, a grid sweep and/or a multi-opportunity window scan,
//! the parking and capture orbits, the launch-vehicle limits and which
//! outputs to write. Relative paths resolve against the study file's
//! folder; unknown keys are errors so that typos surface.
//!
//! ```toml
//! title = "Cargo runs, Teodra to Kesh"
//! system = "demo"                       # or a path to a system file
//! out = "out"                           # output folder (default synodic-out)
//!
//! [[pair]]
//! from = "Teodra"
//! to = "Kesh"
//!
//! [sweep]                               # a departure x arrival grid
//! depart = "2032-03-01..2032-10-01"     # omitted: the next opportunity
//! tof_days = [120.0, 480.0]             # or arrive = "START..END"
//! step_days = [1.0, 1.0]                # one value for both axes, or two
//! revs = 0
//!
//! [windows]                             # every opportunity of a span
//! span = "2030-01-01..2040-01-01"
//! objective = "c3"                      # c3, vinf-arrive, dv-total, c3+vinf
//! tof_days = [100.0, 500.0]
//! launch_period_days = 20
//!
//! [orbits]
//! park_alt_km = 200.0
//! capture_alt_km = 400.0
//! capture_ecc = 0.6
//!
//! [limits]
//! max_c3_km2_s2 = 14.0
//! max_vinf_arrive_km_s = 4.0
//!
//! [chart]                               # contour levels (automatic if omitted)
//! c3_levels = [8.0, 10.0, 12.0, 15.0, 20.0]
//! show = ["dla", "arrive-dec"]          # extra panels: dla, arrive-dec, dv-total
//!
//! [outputs]                             # all true by default
//! grid = true
//! chart = true
//! windows = true
//! ```
//!
//! A top-level `allow_flagged = true` (before the first table) lets arcs
//! flagged `periapsis-inside` or `relativistic` be optima.

use std::path::{Path, PathBuf};

use serde::{Deserialize, Serialize};

use crate::error::line_of_offset;

/// A study as written in a file (or resolved from a command line).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Study {
    /// Free text shown in reports.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub title: Option<String>,
    /// `"demo"` for the built-in system, else a system file's path
    /// (relative to the study file's folder).
    pub system: String,
    /// Output folder, relative to the study file's folder.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub out: Option<String>,
    /// Departure/arrival body pairs.
    #[serde(rename = "pair")]
    pub pairs: Vec<Pair>,
    /// A grid sweep per pair.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub sweep: Option<SweepSection>,
    /// A window scan per pair.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub windows: Option<WindowsSection>,
    /// Parking and capture orbits.
    #[serde(default, skip_serializing_if = "Orbits::is_empty")]
    pub orbits: Orbits,
    /// Launch-vehicle and arrival limits.
    #[serde(default, skip_serializing_if = "Limits::is_empty")]
    pub limits: Limits,
    /// Chart options.
    #[serde(default, skip_serializing_if = "ChartSection::is_empty")]
    pub chart: ChartSection,
    /// Which files to write.
    #[serde(default)]
    pub outputs: Outputs,
    /// Let arcs flagged `periapsis-inside` or `relativistic` be chosen as
    /// optima and counted in launch periods (default false: they are kept
    /// in the grid but passed over).
    #[serde(default, skip_serializing_if = "is_false")]
    pub allow_flagged: bool,
}

fn is_false(b: &bool) -> bool {
    !*b
}

/// Chart options of a study.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ChartSection {
    /// C3 contour levels, km^2/s^2 (automatic when omitted).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub c3_levels: Option<Vec<f64>>,
    /// Arrival v-infinity contour levels, km/s (automatic when omitted).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub vinf_levels: Option<Vec<f64>>,
    /// Extra panels, each its own chart: `dla`, `arrive-dec`, `dv-total`.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub show: Vec<String>,
}

impl ChartSection {
    fn is_empty(&self) -> bool {
        *self == ChartSection::default()
    }
}

/// One departure/arrival pair.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Pair {
    /// Departure body.
    pub from: String,
    /// Arrival body.
    pub to: String,
}

/// The grid sweep of a study.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SweepSection {
    /// Departure dates `START..END`; omitted: around the next opportunity
    /// after the system epoch.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub depart: Option<String>,
    /// Arrival dates `START..END` (or give `tof_days`).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub arrive: Option<String>,
    /// Times of flight `[MIN, MAX]`, days.
    #[serde(
        default,
        deserialize_with = "min_max_days",
        skip_serializing_if = "Option::is_none"
    )]
    pub tof_days: Option<[f64; 2]>,
    /// Grid step, days: `[D]` or `[DEPART, SECOND]` (default 1).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub step_days: Option<Vec<f64>>,
    /// Highest number of complete revolutions (default 0).
    #[serde(default)]
    pub revs: u32,
    /// Memory limit of the grid, GiB (default 4).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub max_memory_gib: Option<f64>,
}

/// The multi-opportunity window scan of a study.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WindowsSection {
    /// Departure dates to search, `START..END`.
    pub span: String,
    /// Objective: `c3`, `vinf-arrive`, `dv-total` or `c3+vinf`.
    #[serde(default = "default_objective")]
    pub objective: String,
    /// Time-of-flight limits `[MIN, MAX]`, days.
    #[serde(
        default,
        deserialize_with = "min_max_days",
        skip_serializing_if = "Option::is_none"
    )]
    pub tof_days: Option<[f64; 2]>,
    /// Highest number of complete revolutions (default 0).
    #[serde(default)]
    pub revs: u32,
    /// Length of the fixed-arrival launch period, daily departures.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub launch_period_days: Option<u32>,
}

/// `[MIN, MAX]`: exactly two numbers (a third would otherwise be
/// dropped without a word).
fn min_max_days<'de, D: serde::Deserializer<'de>>(d: D) -> Result<Option<[f64; 2]>, D::Error> {
    match Option::<Vec<f64>>::deserialize(d)? {
        None => Ok(None),
        Some(v) => match v.as_slice() {
            [lo, hi] => Ok(Some([*lo, *hi])),
            _ => Err(serde::de::Error::custom(format!(
                "expected two numbers [MIN, MAX] in days, e.g. [100.0, 400.0], got {} number(s)",
                v.len()
            ))),
        },
    }
}

fn default_objective() -> String {
    "c3".to_string()
}

/// Parking and capture orbits.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Orbits {
    /// Circular parking-orbit altitude at departure, km.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub park_alt_km: Option<f64>,
    /// Capture-orbit periapsis altitude, km.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub capture_alt_km: Option<f64>,
    /// Capture-orbit eccentricity.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub capture_ecc: Option<f64>,
}

impl Orbits {
    fn is_empty(&self) -> bool {
        *self == Orbits::default()
    }
}

/// Limits the results are checked against.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Limits {
    /// Launch-vehicle C3 ceiling, km^2/s^2.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub max_c3_km2_s2: Option<f64>,
    /// Arrival v-infinity ceiling, km/s.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub max_vinf_arrive_km_s: Option<f64>,
}

impl Limits {
    fn is_empty(&self) -> bool {
        *self == Limits::default()
    }
}

/// Which files a run writes.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Outputs {
    /// `grid.csv`.
    #[serde(default = "yes")]
    pub grid: bool,
    /// `chart.svg` and `chart.png`.
    #[serde(default = "yes")]
    pub chart: bool,
    /// `windows.csv` (and launch-period tables).
    #[serde(default = "yes")]
    pub windows: bool,
}

fn yes() -> bool {
    true
}

impl Default for Outputs {
    fn default() -> Outputs {
        Outputs {
            grid: true,
            chart: true,
            windows: true,
        }
    }
}

/// Why a study file could not be used.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum StudyError {
    /// The file could not be read.
    #[error("{}: cannot read: {source}", path.display())]
    Read {
        /// The study file.
        path: PathBuf,
        /// The I/O error.
        #[source]
        source: std::io::Error,
    },
    /// The file is not valid TOML for a study (syntax, missing or unknown
    /// key, wrong type).
    #[error("{file}:{line}: {}{message}", key.as_ref().map(|k| format!("key `{k}`: ")).unwrap_or_default())]
    Syntax {
        /// File name as given.
        file: String,
        /// 1-based line (0 when the parser gave no position).
        line: usize,
        /// The dotted key at fault (e.g. `sweep.revs`), when the text
        /// tells it and the parser's message does not already name it.
        key: Option<String>,
        /// What the parser said.
        message: String,
    },
    /// A value is out of range or inconsistent.
    #[error("{file}:{line}: key `{key}`: {message}")]
    Invalid {
        /// File name as given.
        file: String,
        /// 1-based line of the key (of its section when the key is absent).
        line: usize,
        /// Dotted key, e.g. `sweep.step_days`.
        key: String,
        /// What is wrong.
        message: String,
    },
}

impl Study {
    /// Parse a study from TOML text; `source` names the file in messages.
    ///
    /// # Errors
    /// [`StudyError::Syntax`] with the line of the problem, and
    /// [`StudyError::Invalid`] for an empty pair list.
    pub fn from_toml_str(text: &str, source: &str) -> Result<Study, StudyError> {
        let study: Study = toml::from_str(text).map_err(|e| {
            let value = e.span().and_then(|s| text.get(s));
            let message = crate::error::plain_toml_message(e.message(), value);
            let key = e.span().and_then(|s| key_at(text, s.start)).filter(|k| {
                let last = k.rsplit('.').next().unwrap_or(k);
                !message.contains(&format!("`{last}`"))
            });
            StudyError::Syntax {
                file: source.to_string(),
                line: e.span().map_or(0, |s| line_of_offset(text, s.start)),
                key,
                message,
            }
        })?;
        if study.pairs.is_empty() {
            return Err(StudyError::Invalid {
                file: source.to_string(),
                line: 1,
                key: "pair".to_string(),
                message: "a study needs at least one [[pair]] with from and to".to_string(),
            });
        }
        if study.sweep.is_none() && study.windows.is_none() {
            return Err(StudyError::Invalid {
                file: source.to_string(),
                line: 1,
                key: "sweep".to_string(),
                message: "a study needs a [sweep] or a [windows] section (or both)".to_string(),
            });
        }
        Ok(study)
    }

    /// Read and parse a study file.
    ///
    /// # Errors
    /// As [`Study::from_toml_str`], and [`StudyError::Read`].
    pub fn load(path: &Path) -> Result<(Study, String), StudyError> {
        let text = std::fs::read_to_string(path).map_err(|source| StudyError::Read {
            path: path.to_path_buf(),
            source,
        })?;
        let study = Study::from_toml_str(&text, &path.display().to_string())?;
        Ok((study, text))
    }

    /// The study as TOML text, as written into every output folder.
    pub fn to_toml(&self) -> String {
        let body = toml::to_string(self).unwrap_or_else(|e| format!("# cannot encode: {e}\n"));
        format!(
            "# Resolved synodic study: `synodic run` on this file repeats the run\n\
             # and rewrites the files beside it byte for byte.\n{body}"
        )
    }
}

/// The dotted key whose value holds byte `offset`: the name left of the
/// last `=` before `offset` on its line, prefixed with the nearest table
/// header above (`sweep.revs`, `pair.from`). `None` on a line without `=`.
fn key_at(text: &str, offset: usize) -> Option<String> {
    let before = text.get(..offset.min(text.len()))?;
    let line_start = before.rfind('\n').map_or(0, |i| i + 1);
    let head = &before[line_start..];
    let left = head[..head.rfind('=')?].trim_end();
    let key: String = left
        .chars()
        .rev()
        .take_while(|c| c.is_ascii_alphanumeric() || *c == '_' || *c == '-')
        .collect::<Vec<_>>()
        .into_iter()
        .rev()
        .collect();
    if key.is_empty() {
        return None;
    }
    let section = before[..line_start]
        .lines()
        .rev()
        .map(str::trim)
        .find(|l| l.starts_with('['))
        .map(|l| l.trim_matches(|c| c == '[' || c == ']').trim().to_string());
    Some(match section {
        Some(s) if !s.is_empty() => format!("{s}.{key}"),
        _ => key,
    })
}

/// The 1-based line where `key` is set in table `section` (`""` for the
/// top level; `pair` with `index` for the index-th `[[pair]]`), or the
/// section header's line when the key is absent, or 1.
pub fn locate(text: &str, section: &str, index: usize, key: &str) -> usize {
    let mut seen = 0usize;
    let mut header_line = None;
    let mut in_target = section.is_empty();
    for (n, raw) in text.lines().enumerate() {
        let line = raw.trim();
        if let Some(name) = line.strip_prefix("[[").and_then(|l| l.split("]]").next()) {
            if name.trim() == section {
                in_target = seen == index;
                seen += 1;
                if in_target {
                    header_line = Some(n + 1);
                }
            } else {
                in_target = false;
            }
            continue;
        }
        if let Some(name) = line.strip_prefix('[').and_then(|l| l.split(']').next()) {
            in_target = name.trim() == section;
            if in_target {
                header_line = Some(n + 1);
            }
            continue;
        }
        if in_target {
            let k = line.split('=').next().unwrap_or("").trim();
            if k == key {
                return n + 1;
            }
        }
    }
    header_line.unwrap_or(1)
}

/// `to` expressed relative to the folder `from` (both made absolute
/// first); `to` itself when no relative form exists.
pub fn relative_path(from_dir: &Path, to: &Path) -> PathBuf {
    let (Ok(from), Ok(to_abs)) = (from_dir.canonicalize(), to.canonicalize()) else {
        return to.to_path_buf();
    };
    let a: Vec<_> = from.components().collect();
    let b: Vec<_> = to_abs.components().collect();
    let common = a.iter().zip(&b).take_while(|(x, y)| x == y).count();
    if common == 0 {
        return to_abs;
    }
    let mut rel = PathBuf::new();
    for _ in common..a.len() {
        rel.push("..");
    }
    for c in &b[common..] {
        rel.push(c.as_os_str());
    }
    rel
}

#[cfg(test)]
mod tests {
    use super::*;

    const STUDY: &str = "title = \"t\"\nsystem = \"demo\"\n\n[[pair]]\nfrom = \"Teodra\"\nto = \"Kesh\"\n\n[sweep]\ndepart = \"2032-03-01..2032-10-01\"\nstep_days = [2.0]\n";

    #[test]
    fn parses_and_round_trips() {
        let s = Study::from_toml_str(STUDY, "s.toml").expect("valid");
        assert_eq!(s.pairs[0].to, "Kesh");
        assert_eq!(
            s.sweep.as_ref().and_then(|w| w.step_days.clone()),
            Some(vec![2.0])
        );
        let again = Study::from_toml_str(&s.to_toml(), "again.toml").expect("round trip");
        assert_eq!(again, s);
    }

    #[test]
    fn unknown_key_names_its_line() {
        let text = STUDY.replace("step_days", "stp_days");
        let err = Study::from_toml_str(&text, "s.toml").expect_err("typo");
        let msg = err.to_string();
        assert!(msg.starts_with("s.toml:10:"), "{msg}");
        assert!(msg.contains("stp_days"), "{msg}");
    }

    #[test]
    fn wrong_type_names_its_line() {
        let text = STUDY.replace("step_days = [2.0]", "step_days = \"two\"");
        let msg = Study::from_toml_str(&text, "s.toml")
            .expect_err("type")
            .to_string();
        assert!(
            msg.starts_with("s.toml:10: key `sweep.step_days`:"),
            "{msg}"
        );
    }

    /// A time-of-flight range takes exactly two numbers.
    #[test]
    fn time_of_flight_range_has_two_numbers() {
        for bad in ["[100.0, 200.0, 300.0]", "[100.0]"] {
            let text = STUDY.replace("step_days = [2.0]", &format!("tof_days = {bad}"));
            let msg = Study::from_toml_str(&text, "s.toml")
                .expect_err(bad)
                .to_string();
            assert!(
                msg.starts_with("s.toml:10: key `sweep.tof_days`: "),
                "{msg}"
            );
            assert!(msg.contains("two numbers [MIN, MAX]"), "{msg}");
        }
    }

    #[test]
    fn key_at_names_the_dotted_key() {
        let at = |needle: &str| key_at(STUDY, STUDY.find(needle).expect("in text"));
        assert_eq!(at("[2.0]").as_deref(), Some("sweep.step_days"));
        assert_eq!(at("\"Kesh\"").as_deref(), Some("pair.to"));
        assert_eq!(at("\"demo\"").as_deref(), Some("system"));
        assert_eq!(at("[sweep]"), None);
    }

    #[test]
    fn needs_a_pair_and_a_section() {
        let no_pair = "system = \"demo\"\npair = []\n[sweep]\n";
        assert!(Study::from_toml_str(no_pair, "s.toml").is_err());
        let no_section = "system = \"demo\"\n[[pair]]\nfrom = \"A\"\nto = \"B\"\n";
        let msg = Study::from_toml_str(no_section, "s.toml")
            .expect_err("no section")
            .to_string();
        assert!(msg.contains("[sweep]"), "{msg}");
    }

    #[test]
    fn locate_finds_keys_and_sections() {
        assert_eq!(locate(STUDY, "sweep", 0, "step_days"), 10);
        assert_eq!(locate(STUDY, "sweep", 0, "revs"), 8);
        assert_eq!(locate(STUDY, "pair", 0, "to"), 6);
        assert_eq!(locate(STUDY, "", 0, "system"), 2);
    }
}
