//! Body states from CCSDS Orbit Ephemeris Messages (OEM), text form.
//!
//! The Orbit Data Messages standard (CCSDS 502.0-B-2, 2009, and its issue
//! 3, 502.0-B-3, 2023) defines the OEM: a header, then one or more
//! segments, each a metadata block (`META_START` .. `META_STOP`: object,
//! centre, frame, time system, time span, interpolation) followed by data
//! lines `epoch x y z vx vy vz [ax ay az]` in km, km/s and km/s^2. This
//! module reads the keyword = value (KVN) form ([`Oem::read`]) and
//! interpolates states as each segment's metadata says ([`Oem::state`]).
//!
//! Supported: `TIME_SYSTEM` TDB, TT, TAI, UTC, GPS (converted to TDB
//! through [`crate::time`]); `REF_FRAME` ICRF, EME2000, J2000, GCRF (ICRF
//! axes) and ECLIPJ2000 (mean ecliptic and equinox of J2000);
//! `INTERPOLATION` LAGRANGE, HERMITE, LINEAR. A file without
//! `INTERPOLATION` is read with Lagrange interpolation of degree
//! [`DEFAULT_LAGRANGE_DEGREE`]. Covariance blocks are skipped. One object
//! and centre per file.

mod parse;

use std::path::{Path, PathBuf};

use nalgebra::Vector3;

use super::coverage::Coverage;
use super::frame::Frame;
use super::interpolate;
use crate::orbit::State;
use crate::time::Epoch;

/// Lagrange degree used when a segment gives no `INTERPOLATION` (common
/// practice for planetary tables at steps of days, no source).
pub const DEFAULT_LAGRANGE_DEGREE: usize = 7;

/// Seconds in a day.
const DAY_S: f64 = 86400.0;

/// Why an OEM is unusable or gives no state at a date.
///
/// Every message names the file, the line and the keyword (or data
/// column) at fault.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum OemError {
    /// The file could not be read.
    #[error("{}: cannot read the OEM: {reason}", path.display())]
    Io {
        /// The file.
        path: PathBuf,
        /// The operating system's explanation.
        reason: String,
    },
    /// A mandatory keyword is missing from a header or metadata block.
    #[error(
        "{}:{line}: key `{key}`: missing from the {block} (mandatory in CCSDS 502.0-B OEM)",
        path.display()
    )]
    MissingKey {
        /// The file.
        path: PathBuf,
        /// Line where the block ends (or starts, for metadata).
        line: usize,
        /// The missing keyword.
        key: String,
        /// `header` or `metadata block starting at line N`.
        block: String,
    },
    /// A value or a line is malformed.
    #[error("{}:{line}: key `{key}`: {problem}", path.display())]
    Invalid {
        /// The file.
        path: PathBuf,
        /// 1-based line.
        line: usize,
        /// The keyword, or the data column (`EPOCH`, `X`, ..., `Z_DDOT`).
        key: String,
        /// What is wrong and what is accepted.
        problem: String,
    },
    /// A value the standard allows but this reader does not take.
    #[error("{}:{line}: key `{key}`: {value:?} is not supported (accepted: {accepted})", path.display())]
    Unsupported {
        /// The file.
        path: PathBuf,
        /// 1-based line.
        line: usize,
        /// The keyword.
        key: String,
        /// The value given.
        value: String,
        /// The values accepted.
        accepted: String,
    },
    /// Data epochs do not increase.
    #[error(
        "{}:{line}: key `EPOCH`: {epoch} does not come after the previous data line's {previous}",
        path.display()
    )]
    NotIncreasing {
        /// The file.
        path: PathBuf,
        /// 1-based line.
        line: usize,
        /// This line's epoch, ISO TDB.
        epoch: String,
        /// The previous line's epoch, ISO TDB.
        previous: String,
    },
    /// A segment has fewer data lines than its interpolation needs.
    #[error(
        "{}:{line}: key `INTERPOLATION_DEGREE`: {method} of degree {degree} needs {needed} data lines, the segment has {points}",
        path.display()
    )]
    TooFewPoints {
        /// The file.
        path: PathBuf,
        /// Line of the degree (or of `META_START` when defaulted).
        line: usize,
        /// The interpolation method.
        method: Method,
        /// The degree.
        degree: usize,
        /// Data lines in the segment.
        points: usize,
        /// Data lines needed.
        needed: usize,
    },
    /// A state was asked for outside the file's useable span.
    #[error("{}: {epoch} is outside the OEM's coverage: {coverage}", path.display())]
    OutsideCoverage {
        /// The file.
        path: PathBuf,
        /// The epoch asked for, ISO TDB.
        epoch: String,
        /// The dates the file covers.
        coverage: Coverage,
    },
}

/// Interpolation methods of the OEM metadata keyword `INTERPOLATION`.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[non_exhaustive]
pub enum Method {
    /// Lagrange polynomials through `degree + 1` positions (velocities
    /// interpolated alike).
    Lagrange,
    /// Hermite polynomials through positions and velocities of
    /// `(degree + 1) / 2` nodes (rounded up); velocity is the
    /// polynomial's derivative.
    Hermite,
    /// Straight lines between neighbours (Lagrange of degree 1).
    Linear,
}

impl Method {
    /// Data lines a window needs for `degree`.
    pub fn points_for(&self, degree: usize) -> usize {
        match self {
            Method::Lagrange => degree + 1,
            Method::Hermite => (degree + 1).div_ceil(2).max(1),
            Method::Linear => 2,
        }
    }
}

impl std::fmt::Display for Method {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(match self {
            Method::Lagrange => "LAGRANGE",
            Method::Hermite => "HERMITE",
            Method::Linear => "LINEAR",
        })
    }
}

/// Time systems of the OEM keyword `TIME_SYSTEM` that are read.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[non_exhaustive]
pub enum TimeSystem {
    /// Barycentric Dynamical Time.
    Tdb,
    /// Terrestrial Time.
    Tt,
    /// International Atomic Time.
    Tai,
    /// Coordinated Universal Time (leap seconds applied).
    Utc,
    /// GPS time, TAI - 19 s.
    Gps,
}

/// The header of an OEM.
#[derive(Debug, Clone, PartialEq)]
pub struct OemHeader {
    /// `CCSDS_OEM_VERS`.
    pub version: String,
    /// `CREATION_DATE`, as written.
    pub creation_date: String,
    /// `ORIGINATOR`.
    pub originator: String,
    /// `MESSAGE_ID` (issue 3), if given.
    pub message_id: Option<String>,
}

/// One segment's metadata.
#[derive(Debug, Clone, PartialEq)]
pub struct OemMetadata {
    /// Line of `META_START`.
    pub line: usize,
    /// `OBJECT_NAME`.
    pub object_name: String,
    /// `OBJECT_ID`.
    pub object_id: String,
    /// `CENTER_NAME`: the states are relative to this body.
    pub center_name: String,
    /// `REF_FRAME` as written.
    pub ref_frame: String,
    /// The frame it names.
    pub frame: Frame,
    /// `TIME_SYSTEM`.
    pub time_system: TimeSystem,
    /// `START_TIME`.
    pub start: Epoch,
    /// `STOP_TIME`.
    pub stop: Epoch,
    /// `USEABLE_START_TIME`, if given.
    pub useable_start: Option<Epoch>,
    /// `USEABLE_STOP_TIME`, if given.
    pub useable_stop: Option<Epoch>,
    /// `INTERPOLATION` (or the default).
    pub method: Method,
    /// `INTERPOLATION_DEGREE` (or the default).
    pub degree: usize,
}

/// A segment: metadata and its data lines.
#[derive(Debug, Clone, PartialEq)]
pub struct OemSegment {
    /// The metadata block.
    pub meta: OemMetadata,
    /// Data epochs, days since J2000 TDB, increasing.
    epochs: Vec<f64>,
    /// States at the epochs, km and km/s, in the segment's frame.
    states: Vec<[f64; 6]>,
    /// Where the segment is to be used (days since J2000 TDB).
    useable: (f64, f64),
}

impl OemSegment {
    /// Number of data lines.
    pub fn len(&self) -> usize {
        self.epochs.len()
    }

    /// Data epochs, days since J2000 TDB, increasing.
    pub fn epochs_days(&self) -> &[f64] {
        &self.epochs
    }

    /// The data lines' states `[x, y, z, vx, vy, vz]` (km, km/s) in the
    /// segment's frame ([`OemMetadata::frame`]).
    pub fn states(&self) -> &[[f64; 6]] {
        &self.states
    }

    /// Whether the segment has no data lines (never true for a segment
    /// [`Oem::read`] returns).
    pub fn is_empty(&self) -> bool {
        self.epochs.is_empty()
    }

    /// The state at `t` (days since J2000 TDB), in the segment's frame.
    fn interpolate(&self, t: f64) -> State {
        let n = self.meta.method.points_for(self.meta.degree);
        let i0 = interpolate::window(&self.epochs, t, n);
        let nodes = i0..i0 + n;
        // Abscissae in seconds from the window's first node: small numbers.
        let t0 = self.epochs[i0];
        let xs: Vec<f64> = self.epochs[nodes.clone()]
            .iter()
            .map(|e| (e - t0) * DAY_S)
            .collect();
        let x = (t - t0) * DAY_S;
        let ys = &self.states[nodes];
        let s = match self.meta.method {
            Method::Lagrange | Method::Linear => interpolate::lagrange(&xs, ys, x),
            Method::Hermite => {
                let mut out = [0.0; 6];
                for axis in 0..3 {
                    let p: Vec<f64> = ys.iter().map(|y| y[axis]).collect();
                    let v: Vec<f64> = ys.iter().map(|y| y[axis + 3]).collect();
                    let (pos, vel) = interpolate::hermite(&xs, &p, &v, x);
                    out[axis] = pos;
                    out[axis + 3] = vel;
                }
                out
            }
        };
        State {
            r_km: Vector3::new(s[0], s[1], s[2]),
            v_km_s: Vector3::new(s[3], s[4], s[5]),
        }
    }
}

/// A parsed OEM: a body's states relative to its centre.
///
/// Answers [`Oem::state`] at any TDB epoch inside [`Oem::coverage`].
///
/// # Example
/// ```
/// use synodic::ephemeris::source::{Frame, Oem};
/// use synodic::time::Epoch;
/// let path = concat!(env!("CARGO_MANIFEST_DIR"), "/tests/fixtures/de421/mars-icrf-tdb.oem");
/// let mars = Oem::read(path)?;
/// assert_eq!(mars.center_name(), "SUN");
/// let s = mars.state(&Epoch::parse("1997-09-12")?, Frame::EclipticJ2000)?;
/// assert!((s.r_km.norm() - 2.1e8).abs() < 0.1e8);
/// # Ok::<(), Box<dyn std::error::Error>>(())
/// ```
#[derive(Debug, Clone, PartialEq)]
pub struct Oem {
    path: PathBuf,
    header: OemHeader,
    segments: Vec<OemSegment>,
    coverage: Coverage,
}

impl Oem {
    /// Reads and checks an OEM file (KVN form).
    ///
    /// # Errors
    /// [`OemError::Io`] if unreadable; otherwise an error naming the line
    /// and keyword: [`OemError::MissingKey`], [`OemError::Invalid`] (bad
    /// number or date, unknown keyword, data outside the segment's span),
    /// [`OemError::Unsupported`] (time system, frame, interpolation),
    /// [`OemError::NotIncreasing`], [`OemError::TooFewPoints`].
    pub fn read(path: impl AsRef<Path>) -> Result<Oem, OemError> {
        let path = path.as_ref().to_path_buf();
        let text = std::fs::read_to_string(&path).map_err(|e| OemError::Io {
            path: path.clone(),
            reason: e.to_string(),
        })?;
        Oem::from_text(&path, &text)
    }

    /// Reads an OEM from `text`; `path` names it in messages.
    ///
    /// # Errors
    /// As [`Oem::read`].
    pub fn from_text(path: &Path, text: &str) -> Result<Oem, OemError> {
        let (header, segments) = parse::read(path, text)?;
        let coverage = segments.iter().fold(Coverage::default(), |c, s| {
            c.union(&Coverage::from_spans([s.useable]))
        });
        Ok(Oem {
            path: path.to_path_buf(),
            header,
            segments,
            coverage,
        })
    }

    /// The file's path.
    pub fn path(&self) -> &Path {
        &self.path
    }

    /// The header.
    pub fn header(&self) -> &OemHeader {
        &self.header
    }

    /// The segments, in file order.
    pub fn segments(&self) -> &[OemSegment] {
        &self.segments
    }

    /// `OBJECT_NAME` (the same in every segment).
    pub fn object_name(&self) -> &str {
        &self.segments[0].meta.object_name
    }

    /// `CENTER_NAME`: the body the states are relative to.
    pub fn center_name(&self) -> &str {
        &self.segments[0].meta.center_name
    }

    /// The dates with states: the union of the segments' useable spans
    /// (`USEABLE_START_TIME` .. `USEABLE_STOP_TIME`, else the span of the
    /// data lines).
    pub fn coverage(&self) -> &Coverage {
        &self.coverage
    }

    /// Position and velocity of the object relative to the centre at `t`,
    /// in `frame`.
    ///
    /// # Method
    /// The last segment (in file order) whose useable span holds `t` is
    /// used. Its interpolation ([`Method`]) runs on the window of data
    /// lines centred on `t` (as many nodes on each side as the table's
    /// ends allow): Lagrange on each of the six components (barycentric
    /// form, Berrut & Trefethen 2004), or
    /// Hermite on positions with velocities as derivatives (Burden &
    /// Faires, sect. 3.4). Nodes outside the useable span but inside the
    /// segment are used, as the standard intends. The state is then
    /// rotated from the segment's frame ([`Frame::rotate_state`]).
    ///
    /// # Units
    /// km and km/s.
    ///
    /// # Errors
    /// [`OemError::OutsideCoverage`] outside [`Oem::coverage`] (the message
    /// prints the coverage).
    pub fn state(&self, t: &Epoch, frame: Frame) -> Result<State, OemError> {
        let d = t.days_since_j2000_tdb();
        let segment = self
            .segments
            .iter()
            .rev()
            .find(|s| s.useable.0 <= d && d <= s.useable.1)
            .ok_or_else(|| OemError::OutsideCoverage {
                path: self.path.clone(),
                epoch: t.to_iso_tdb(),
                coverage: self.coverage.clone(),
            })?;
        Ok(segment
            .meta
            .frame
            .rotate_state(&segment.interpolate(d), frame))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Radius (km) and period (days) of the circular test orbit.
    const R_KM: f64 = 1.5e8;
    const PERIOD_DAYS: f64 = 365.25;

    /// A small valid OEM: a circular orbit in the ICRF x-y plane, one data
    /// line a day from 2030-01-01 (TDB), `n` lines, data from line 16.
    fn circle_oem(n: usize) -> Vec<String> {
        let mut lines: Vec<String> = [
            "CCSDS_OEM_VERS = 2.0",
            "CREATION_DATE = 2026-12-02T00:00:00",
            "ORIGINATOR = TEST",
            "",
            "META_START",
            "OBJECT_NAME = PROBE",
            "OBJECT_ID = 2030-001A",
            "CENTER_NAME = SUN",
            "REF_FRAME = ICRF",
            "TIME_SYSTEM = TDB",
            "START_TIME = 2030-01-01T00:00:00",
            "STOP_TIME = 2030-12-31T00:00:00",
            "INTERPOLATION = LAGRANGE",
            "INTERPOLATION_DEGREE = 3",
            "META_STOP",
        ]
        .iter()
        .map(|s| s.to_string())
        .collect();
        let w = std::f64::consts::TAU / PERIOD_DAYS;
        for i in 0..n {
            let th = w * i as f64;
            let v = R_KM * w / DAY_S;
            lines.push(format!(
                "2030-{:03}T00:00:00 {} {} 0 {} {} 0",
                i + 1,
                R_KM * th.cos(),
                R_KM * th.sin(),
                -v * th.sin(),
                v * th.cos()
            ));
        }
        lines
    }

    fn read(lines: &[String]) -> Result<Oem, OemError> {
        Oem::from_text(Path::new("probe.oem"), &lines.join("\n"))
    }

    /// Interpolation error theorem (Burden & Faires, *Numerical
    /// Analysis*, Theorem 3.3) for the circle, each coordinate's 4th
    /// derivative bounded by R w^4: |error| <= R (w h)^4 / 4! * max prod
    /// |s - s_i| (= 1 at the table's edge for nodes 0..3). The error must
    /// stay under the bound and be of its order.
    #[test]
    fn circle_within_the_interpolation_bound() {
        let oem = read(&circle_oem(10)).expect("valid");
        assert_eq!(oem.header().originator, "TEST");
        assert_eq!(oem.object_name(), "PROBE");
        let w = std::f64::consts::TAU / PERIOD_DAYS;
        let bound = R_KM * w.powi(4) / 24.0;
        let mut worst = 0.0_f64;
        for k in 0..=90 {
            let d = 0.1 * f64::from(k);
            let t = Epoch::parse("2030-01-01").expect("valid").plus_days(d);
            let s = oem.state(&t, Frame::Icrf).expect("covered");
            let th = w * d;
            let exact = Vector3::new(R_KM * th.cos(), R_KM * th.sin(), 0.0);
            worst = worst.max((s.r_km - exact).norm());
        }
        assert!(worst <= bound * 2f64.sqrt(), "{worst} > {bound}");
        assert!(worst > 0.05 * bound, "{worst} far below {bound}");
    }

    fn expect_err(lines: &[String]) -> (OemError, String) {
        let e = read(lines).expect_err("bad file");
        let msg = e.to_string();
        (e, msg)
    }

    #[test]
    fn missing_mandatory_keys_are_named() {
        let mut lines = circle_oem(6);
        lines.remove(6); // OBJECT_ID
        let (e, msg) = expect_err(&lines);
        assert!(matches!(e, OemError::MissingKey { line: 5, .. }), "{e:?}");
        assert_eq!(
            msg,
            "probe.oem:5: key `OBJECT_ID`: missing from the metadata block starting at line 5 (mandatory in CCSDS 502.0-B OEM)"
        );
        let mut lines = circle_oem(6);
        lines.remove(2); // ORIGINATOR
        let (_, msg) = expect_err(&lines);
        assert!(
            msg.starts_with("probe.oem:4: key `ORIGINATOR`: missing from the header"),
            "{msg}"
        );
        let (_, msg) = expect_err(&[String::new()]);
        assert!(
            msg.starts_with("probe.oem:1: key `CCSDS_OEM_VERS`"),
            "{msg}"
        );
        let mut lines = circle_oem(6);
        lines.remove(13); // INTERPOLATION_DEGREE, required with INTERPOLATION
        let (_, msg) = expect_err(&lines);
        assert!(msg.contains("key `INTERPOLATION_DEGREE`: missing"), "{msg}");
        let lines = circle_oem(6)[..10].to_vec(); // no META_STOP
        let (_, msg) = expect_err(&lines);
        assert!(msg.contains("key `META_STOP`"), "{msg}");
    }

    #[test]
    fn bad_values_name_line_and_key() {
        let mut lines = circle_oem(6);
        lines[17] = lines[17].replacen(' ', " 1.2.3 ", 1).replacen(' ', "", 0);
        // Now 8 fields: the count is wrong.
        let (_, msg) = expect_err(&lines);
        assert!(
            msg.starts_with("probe.oem:18: key `EPOCH`: a data line has 7 fields"),
            "{msg}"
        );
        let mut lines = circle_oem(6);
        let fields: Vec<String> = lines[17].split(' ').map(String::from).collect();
        lines[17] = format!("{} {} abc {} 0 0 0", fields[0], fields[1], fields[3]);
        let (_, msg) = expect_err(&lines);
        assert_eq!(
            msg,
            "probe.oem:18: key `Y`: cannot read \"abc\" as a number (km)"
        );
        let mut lines = circle_oem(6);
        lines[9] = "TIME_SYSTEM = TCB".to_string();
        let (e, msg) = expect_err(&lines);
        assert!(matches!(e, OemError::Unsupported { line: 10, .. }), "{e:?}");
        assert!(msg.contains("\"TCB\" is not supported (accepted: TDB, TT, TAI, UTC, GPS)"));
        let mut lines = circle_oem(6);
        lines[8] = "REF_FRAME = ITRF2000".to_string();
        let (_, msg) = expect_err(&lines);
        assert!(
            msg.starts_with("probe.oem:9: key `REF_FRAME`: \"ITRF2000\""),
            "{msg}"
        );
        let mut lines = circle_oem(6);
        lines[6] = "OBJECT_IDENT = X".to_string();
        let (_, msg) = expect_err(&lines);
        assert!(
            msg.starts_with("probe.oem:7: key `OBJECT_IDENT`: not a metadata keyword"),
            "{msg}"
        );
        let mut lines = circle_oem(6);
        lines[15] = lines[15].replace("2030-001T", "2029-365T");
        let (_, msg) = expect_err(&lines);
        assert!(
            msg.contains(
                "probe.oem:16: key `EPOCH`: 2029-12-31T00:00:00 TDB lies outside START_TIME"
            ),
            "{msg}"
        );
        let mut lines = circle_oem(6);
        lines[10] = "START_TIME = 2030-02-30T00:00:00".to_string();
        let (_, msg) = expect_err(&lines);
        assert!(
            msg.starts_with(
                "probe.oem:11: key `START_TIME`: \"2030-02-30T00:00:00\" is not a valid date"
            ),
            "{msg}"
        );
    }

    #[test]
    fn epochs_must_increase_and_suffice_for_the_degree() {
        let mut lines = circle_oem(6);
        lines.swap(17, 18);
        let (e, msg) = expect_err(&lines);
        assert!(
            matches!(e, OemError::NotIncreasing { line: 19, .. }),
            "{e:?}"
        );
        assert!(
            msg.starts_with(
                "probe.oem:19: key `EPOCH`: 2030-01-03T00:00:00 TDB does not come after"
            ),
            "{msg}"
        );
        let (e, msg) = expect_err(&circle_oem(3));
        assert!(
            matches!(
                e,
                OemError::TooFewPoints {
                    needed: 4,
                    points: 3,
                    ..
                }
            ),
            "{e:?}"
        );
        assert_eq!(
            msg,
            "probe.oem:5: key `INTERPOLATION_DEGREE`: LAGRANGE of degree 3 needs 4 data lines, the segment has 3"
        );
    }

    #[test]
    fn second_segment_covariance_and_coverage() {
        let mut lines = circle_oem(6);
        lines.extend(
            [
                "COVARIANCE_START",
                "EPOCH = 2030-01-02T00:00:00",
                "1.0",
                "COVARIANCE_STOP",
            ]
            .iter()
            .map(|s| s.to_string()),
        );
        let second: Vec<String> = circle_oem(12)[4..]
            .iter()
            .enumerate()
            .filter(|(i, _)| *i < 11 || *i >= 11 + 6)
            .map(|(_, l)| l.clone())
            .collect();
        lines.extend(second.clone());
        let oem = read(&lines).expect("two segments");
        assert_eq!(oem.segments().len(), 2);
        // Segments are not interpolated across: the day between them is a
        // gap (each segment has its own metadata and data).
        let coverage = "2030-01-01T00:00:00 TDB .. 2030-01-06T00:00:00 TDB, \
                        2030-01-07T00:00:00 TDB .. 2030-01-12T00:00:00 TDB";
        assert_eq!(oem.coverage().to_string(), coverage);
        let err = oem
            .state(
                &Epoch::parse("2030-01-06T12:00").expect("valid"),
                Frame::Icrf,
            )
            .expect_err("in the gap");
        assert_eq!(
            err.to_string(),
            format!("probe.oem: 2030-01-06T12:00:00 TDB is outside the OEM's coverage: {coverage}")
        );
        assert!(oem
            .state(
                &Epoch::parse("2030-01-07T12:00").expect("valid"),
                Frame::Icrf
            )
            .is_ok());
        // A second object is refused at its line.
        let mut other = lines.clone();
        let at = other.len() - second.len() + 1;
        other[at] = "OBJECT_NAME = OTHER".to_string();
        let (_, msg) = expect_err(&other);
        assert!(
            msg.contains("key `OBJECT_NAME`: \"OTHER\" differs from \"PROBE\" at line 6"),
            "{msg}"
        );
    }
}
