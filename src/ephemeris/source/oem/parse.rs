//! The KVN (keyword = value) reader of OEM files (CCSDS 502.0-B-2: OEM
//! header, metadata and data lines; KVN syntax).

use std::collections::HashMap;
use std::path::Path;

use super::{
    Method, OemError, OemHeader, OemMetadata, OemSegment, TimeSystem, DEFAULT_LAGRANGE_DEGREE,
};
use crate::ephemeris::source::frame::Frame;
use crate::time::Epoch;

/// Seconds in a day.
const DAY_S: f64 = 86400.0;

/// GPS time runs 19 s behind TAI (the offset at the GPS epoch, 1980-01-06;
/// IS-GPS-200: GPS time matched UTC at that epoch, when TAI - UTC was 19 s).
const GPS_BEHIND_TAI_S: f64 = 19.0;

/// Slack when comparing data epochs with the metadata's span: 1 us, far
/// below any data spacing, above the rounding of two conversions.
const SPAN_SLACK_DAYS: f64 = 1.0e-6 / DAY_S;

/// Keywords allowed in an OEM metadata block (CCSDS 502.0-B-2).
const META_KEYS: [&str; 13] = [
    "OBJECT_NAME",
    "OBJECT_ID",
    "CENTER_NAME",
    "REF_FRAME",
    "REF_FRAME_EPOCH",
    "TIME_SYSTEM",
    "START_TIME",
    "USEABLE_START_TIME",
    "USEABLE_STOP_TIME",
    "STOP_TIME",
    "INTERPOLATION",
    "INTERPOLATION_DEGREE",
    "COMMENT",
];

/// Mandatory metadata keywords.
const META_MANDATORY: [&str; 7] = [
    "OBJECT_NAME",
    "OBJECT_ID",
    "CENTER_NAME",
    "REF_FRAME",
    "TIME_SYSTEM",
    "START_TIME",
    "STOP_TIME",
];

/// Names of the data columns after the epoch (the standard's names).
const COLUMNS: [&str; 9] = [
    "X", "Y", "Z", "X_DOT", "Y_DOT", "Z_DOT", "X_DDOT", "Y_DDOT", "Z_DDOT",
];

/// One line, classified.
#[derive(Debug, Clone, Copy, PartialEq)]
enum Kvn<'a> {
    Blank,
    Comment,
    /// `KEY = value`.
    Pair(&'a str, &'a str),
    /// A keyword alone: `META_START`, `META_STOP`, `COVARIANCE_START`,
    /// `COVARIANCE_STOP`.
    Marker(&'a str),
    /// Anything else: a data line.
    Data(&'a str),
}

fn classify(line: &str) -> Kvn<'_> {
    let t = line.trim();
    if t.is_empty() {
        return Kvn::Blank;
    }
    if t == "COMMENT" || t.starts_with("COMMENT ") || t.starts_with("COMMENT\t") {
        return Kvn::Comment;
    }
    if matches!(
        t,
        "META_START" | "META_STOP" | "COVARIANCE_START" | "COVARIANCE_STOP"
    ) {
        return Kvn::Marker(t);
    }
    match t.split_once('=') {
        Some((k, v)) => Kvn::Pair(k.trim(), v.trim()),
        None => Kvn::Data(t),
    }
}

/// The reader's context: the file's name for messages.
struct Reader<'p> {
    path: &'p Path,
}

impl Reader<'_> {
    fn invalid(&self, line: usize, key: &str, problem: impl Into<String>) -> OemError {
        OemError::Invalid {
            path: self.path.to_path_buf(),
            line,
            key: key.to_string(),
            problem: problem.into(),
        }
    }

    fn missing(&self, line: usize, key: &str, block: impl Into<String>) -> OemError {
        OemError::MissingKey {
            path: self.path.to_path_buf(),
            line,
            key: key.to_string(),
            block: block.into(),
        }
    }

    fn unsupported(&self, line: usize, key: &str, value: &str, accepted: &str) -> OemError {
        OemError::Unsupported {
            path: self.path.to_path_buf(),
            line,
            key: key.to_string(),
            value: value.to_string(),
            accepted: accepted.to_string(),
        }
    }
}

/// Reads the header and every segment.
pub(super) fn read(path: &Path, text: &str) -> Result<(OemHeader, Vec<OemSegment>), OemError> {
    let r = Reader { path };
    let lines: Vec<(usize, Kvn)> = text
        .lines()
        .enumerate()
        .map(|(i, l)| (i + 1, classify(l)))
        .filter(|(_, k)| !matches!(k, Kvn::Blank))
        .collect();
    let last_line = text.lines().count().max(1);
    let mut pos = 0;

    // Header: CCSDS_OEM_VERS first, then CREATION_DATE, ORIGINATOR,
    // MESSAGE_ID and comments, up to the first META_START.
    let (version_line, version) = match lines.first() {
        Some(&(n, Kvn::Pair("CCSDS_OEM_VERS", v))) => (n, v),
        Some(&(n, _)) => return Err(r.missing(n, "CCSDS_OEM_VERS", "first line of the header")),
        None => return Err(r.missing(1, "CCSDS_OEM_VERS", "header (the file is empty)")),
    };
    if !matches!(version, "1.0" | "2.0" | "3.0") {
        return Err(r.unsupported(version_line, "CCSDS_OEM_VERS", version, "1.0, 2.0, 3.0"));
    }
    pos += 1;
    let mut header_keys: HashMap<&str, (usize, &str)> = HashMap::new();
    while let Some(&(n, kvn)) = lines.get(pos) {
        match kvn {
            Kvn::Marker("META_START") => break,
            Kvn::Comment => {}
            Kvn::Pair(k @ ("CREATION_DATE" | "ORIGINATOR" | "MESSAGE_ID"), v) => {
                if let Some((first, _)) = header_keys.insert(k, (n, v)) {
                    return Err(r.invalid(n, k, format!("given twice (first at line {first})")));
                }
            }
            Kvn::Pair(k, _) => {
                return Err(r.invalid(
                    n,
                    k,
                    "not a header keyword (the header takes CREATION_DATE, ORIGINATOR, MESSAGE_ID and COMMENT, then META_START)",
                ))
            }
            _ => {
                return Err(r.invalid(
                    n,
                    "META_START",
                    "expected META_START before the first metadata or data line",
                ))
            }
        }
        pos += 1;
    }
    let header_end = lines.get(pos).map_or(last_line, |&(n, _)| n);
    let mut header_value = |key: &str| {
        header_keys
            .remove(key)
            .map(|(_, v)| v.to_string())
            .ok_or_else(|| r.missing(header_end, key, "header"))
    };
    let header = OemHeader {
        version: version.to_string(),
        creation_date: header_value("CREATION_DATE")?,
        originator: header_value("ORIGINATOR")?,
        message_id: header_value("MESSAGE_ID").ok(),
    };
    if pos >= lines.len() {
        return Err(r.missing(
            last_line,
            "META_START",
            "file (an OEM has at least one segment)",
        ));
    }

    let mut segments: Vec<OemSegment> = Vec::new();
    let mut identity: Option<[(usize, String); 3]> = None;
    while pos < lines.len() {
        let (meta, ids, next) = read_metadata(&r, &lines, pos, last_line)?;
        // One object and centre per file.
        match &identity {
            None => identity = Some(ids),
            Some(first) => {
                for (key, ((line, value), (first_line, first_value))) in
                    ["OBJECT_NAME", "OBJECT_ID", "CENTER_NAME"]
                        .iter()
                        .zip(ids.iter().zip(first.iter()))
                {
                    if value != first_value {
                        return Err(r.invalid(
                            *line,
                            key,
                            format!(
                                "{value:?} differs from {first_value:?} at line {first_line}; this reader takes one object and centre per file"
                            ),
                        ));
                    }
                }
            }
        }
        let (segment, after) = read_data(&r, &lines, next, meta, last_line)?;
        segments.push(segment);
        pos = after;
    }
    Ok((header, segments))
}

type Identity = [(usize, String); 3];

/// Reads `META_START` (at `pos`) .. `META_STOP`; returns the metadata, the
/// object's identity with lines, and the position after `META_STOP`.
fn read_metadata(
    r: &Reader,
    lines: &[(usize, Kvn)],
    mut pos: usize,
    last_line: usize,
) -> Result<(OemMetadata, Identity, usize), OemError> {
    let start_line = lines[pos].0;
    pos += 1;
    let block = format!("metadata block starting at line {start_line}");
    let mut keys: HashMap<&str, (usize, &str)> = HashMap::new();
    loop {
        let Some(&(n, kvn)) = lines.get(pos) else {
            return Err(r.missing(last_line, "META_STOP", block));
        };
        pos += 1;
        match kvn {
            Kvn::Marker("META_STOP") => break,
            Kvn::Comment => {}
            Kvn::Pair(k, v) if META_KEYS.contains(&k) => {
                if let Some((first, _)) = keys.insert(k, (n, v)) {
                    return Err(r.invalid(n, k, format!("given twice (first at line {first})")));
                }
            }
            Kvn::Pair(k, _) => {
                return Err(r.invalid(
                    n,
                    k,
                    format!(
                        "not a metadata keyword (accepted: {})",
                        META_KEYS.join(", ")
                    ),
                ))
            }
            _ => {
                return Err(r.invalid(
                    n,
                    "META_STOP",
                    "expected META_STOP before this line (metadata lines are KEY = value)",
                ))
            }
        }
    }
    for key in META_MANDATORY {
        if !keys.contains_key(key) {
            return Err(r.missing(start_line, key, block));
        }
    }
    let get = |key: &str| keys[key];
    let text = |key: &str| {
        let (n, v) = get(key);
        if v.is_empty() {
            Err(r.invalid(n, key, "the value is empty"))
        } else {
            Ok((n, v.to_string()))
        }
    };
    let ids = [
        text("OBJECT_NAME")?,
        text("OBJECT_ID")?,
        text("CENTER_NAME")?,
    ];

    let (ts_line, ts) = get("TIME_SYSTEM");
    let time_system = match ts {
        "TDB" => TimeSystem::Tdb,
        "TT" => TimeSystem::Tt,
        "TAI" => TimeSystem::Tai,
        "UTC" => TimeSystem::Utc,
        "GPS" => TimeSystem::Gps,
        _ => return Err(r.unsupported(ts_line, "TIME_SYSTEM", ts, "TDB, TT, TAI, UTC, GPS")),
    };
    let (frame_line, ref_frame) = get("REF_FRAME");
    let frame = match ref_frame {
        "ICRF" | "EME2000" | "J2000" | "GCRF" => Frame::Icrf,
        "ECLIPJ2000" => Frame::EclipticJ2000,
        _ => {
            return Err(r.unsupported(
                frame_line,
                "REF_FRAME",
                ref_frame,
                "ICRF, EME2000, J2000, GCRF (ICRF axes), ECLIPJ2000 (mean ecliptic and equinox of J2000)",
            ))
        }
    };
    let epoch = |key: &str| -> Result<Option<(usize, Epoch)>, OemError> {
        match keys.get(key) {
            None => Ok(None),
            Some(&(n, v)) => parse_epoch(v, time_system)
                .map(|e| Some((n, e)))
                .map_err(|problem| r.invalid(n, key, problem)),
        }
    };
    let (_, start) = epoch("START_TIME")?.expect("mandatory key checked above");
    let (stop_line, stop) = epoch("STOP_TIME")?.expect("mandatory key checked above");
    if stop < start {
        return Err(r.invalid(stop_line, "STOP_TIME", "comes before START_TIME"));
    }
    let useable_start = epoch("USEABLE_START_TIME")?;
    let useable_stop = epoch("USEABLE_STOP_TIME")?;
    for (key, value) in [
        ("USEABLE_START_TIME", useable_start),
        ("USEABLE_STOP_TIME", useable_stop),
    ] {
        if let Some((n, t)) = value {
            if t < start || t > stop {
                return Err(r.invalid(n, key, "lies outside START_TIME .. STOP_TIME"));
            }
        }
    }
    if let (Some((_, a)), Some((n, b))) = (useable_start, useable_stop) {
        if b <= a {
            return Err(r.invalid(
                n,
                "USEABLE_STOP_TIME",
                "does not come after USEABLE_START_TIME",
            ));
        }
    }

    let degree = match keys.get("INTERPOLATION_DEGREE") {
        None => None,
        Some(&(n, v)) => match v.parse::<usize>() {
            Ok(d) if (1..=32).contains(&d) => Some(d),
            _ => {
                return Err(r.invalid(
                    n,
                    "INTERPOLATION_DEGREE",
                    format!("{v:?} is not a whole number from 1 to 32"),
                ))
            }
        },
    };
    let (method, degree) = match keys.get("INTERPOLATION") {
        None => (Method::Lagrange, degree.unwrap_or(DEFAULT_LAGRANGE_DEGREE)),
        Some(&(n, v)) => {
            let method = match v {
                "LAGRANGE" => Method::Lagrange,
                "HERMITE" => Method::Hermite,
                "LINEAR" => Method::Linear,
                _ => return Err(r.unsupported(n, "INTERPOLATION", v, "LAGRANGE, HERMITE, LINEAR")),
            };
            match (method, degree) {
                (Method::Linear, _) => (method, 1),
                (_, Some(d)) => (method, d),
                (_, None) => {
                    return Err(r.missing(
                        start_line,
                        "INTERPOLATION_DEGREE",
                        format!("{block} (required with INTERPOLATION)"),
                    ))
                }
            }
        }
    };
    let meta = OemMetadata {
        line: start_line,
        object_name: ids[0].1.clone(),
        object_id: ids[1].1.clone(),
        center_name: ids[2].1.clone(),
        ref_frame: ref_frame.to_string(),
        frame,
        time_system,
        start,
        stop,
        useable_start: useable_start.map(|(_, t)| t),
        useable_stop: useable_stop.map(|(_, t)| t),
        method,
        degree,
    };
    Ok((meta, ids, pos))
}

/// Reads the data lines after `META_STOP` up to the next `META_START` or
/// the end; returns the segment and the position of that `META_START`.
fn read_data(
    r: &Reader,
    lines: &[(usize, Kvn)],
    mut pos: usize,
    meta: OemMetadata,
    last_line: usize,
) -> Result<(OemSegment, usize), OemError> {
    let mut epochs: Vec<f64> = Vec::new();
    let mut states: Vec<[f64; 6]> = Vec::new();
    let (start, stop) = (
        meta.start.days_since_j2000_tdb(),
        meta.stop.days_since_j2000_tdb(),
    );
    while let Some(&(n, kvn)) = lines.get(pos) {
        match kvn {
            Kvn::Marker("META_START") => break,
            Kvn::Comment => {}
            Kvn::Marker("COVARIANCE_START") => {
                // Covariance blocks are not used: skip to their end.
                let close = lines[pos..]
                    .iter()
                    .position(|(_, k)| *k == Kvn::Marker("COVARIANCE_STOP"))
                    .ok_or_else(|| {
                        r.missing(last_line, "COVARIANCE_STOP", format!("covariance block starting at line {n}"))
                    })?;
                pos += close;
            }
            Kvn::Data(line) => {
                let (t, state) = data_line(r, n, line, meta.time_system)?;
                let d = t.days_since_j2000_tdb();
                if let Some(&prev) = epochs.last() {
                    if d <= prev {
                        return Err(OemError::NotIncreasing {
                            path: r.path.to_path_buf(),
                            line: n,
                            epoch: t.to_iso_tdb(),
                            previous: Epoch::from_days_since_j2000_tdb(prev).to_iso_tdb(),
                        });
                    }
                }
                if d < start - SPAN_SLACK_DAYS || d > stop + SPAN_SLACK_DAYS {
                    return Err(r.invalid(
                        n,
                        "EPOCH",
                        format!(
                            "{} lies outside START_TIME .. STOP_TIME of the metadata block at line {} ({} .. {})",
                            t.to_iso_tdb(),
                            meta.line,
                            meta.start.to_iso_tdb(),
                            meta.stop.to_iso_tdb()
                        ),
                    ));
                }
                epochs.push(d);
                states.push(state);
            }
            Kvn::Pair(k, _) | Kvn::Marker(k) => {
                return Err(r.invalid(
                    n,
                    k,
                    "a data section holds data lines and comments only (a new segment starts with META_START)",
                ))
            }
            Kvn::Blank => {}
        }
        pos += 1;
    }
    let needed = meta.method.points_for(meta.degree);
    if epochs.len() < needed {
        return Err(OemError::TooFewPoints {
            path: r.path.to_path_buf(),
            line: meta.line,
            method: meta.method,
            degree: meta.degree,
            points: epochs.len(),
            needed,
        });
    }
    let first = epochs[0];
    let last = epochs[epochs.len() - 1];
    let lo = meta
        .useable_start
        .map_or(first, |t| t.days_since_j2000_tdb().max(first));
    let hi = meta
        .useable_stop
        .map_or(last, |t| t.days_since_j2000_tdb().min(last));
    if hi < lo {
        return Err(r.invalid(
            meta.line,
            "USEABLE_START_TIME",
            "the useable span holds no data lines",
        ));
    }
    Ok((
        OemSegment {
            meta,
            epochs,
            states,
            useable: (lo, hi),
        },
        pos,
    ))
}

/// One data line: epoch, position, velocity (and accelerations, checked
/// and dropped).
fn data_line(
    r: &Reader,
    n: usize,
    line: &str,
    ts: TimeSystem,
) -> Result<(Epoch, [f64; 6]), OemError> {
    let fields: Vec<&str> = line.split_whitespace().collect();
    if fields.len() != 7 && fields.len() != 10 {
        return Err(r.invalid(
            n,
            "EPOCH",
            format!(
                "a data line has 7 fields (epoch X Y Z X_DOT Y_DOT Z_DOT) or 10 (with X_DDOT Y_DDOT Z_DDOT); this one has {}",
                fields.len()
            ),
        ));
    }
    let t = parse_epoch(fields[0], ts).map_err(|p| r.invalid(n, "EPOCH", p))?;
    let mut values = [0.0; 9];
    for (i, f) in fields[1..].iter().enumerate() {
        values[i] = f
            .parse::<f64>()
            .ok()
            .filter(|x| x.is_finite())
            .ok_or_else(|| {
                r.invalid(
                    n,
                    COLUMNS[i],
                    format!(
                        "cannot read {f:?} as a number ({})",
                        ["km", "km/s", "km/s**2"][i / 3]
                    ),
                )
            })?;
    }
    let mut state = [0.0; 6];
    state.copy_from_slice(&values[..6]);
    Ok((t, state))
}

/// An OEM epoch in `ts`, as a TDB [`Epoch`].
///
/// Forms (the ODM time format of CCSDS 502.0-B-2): `YYYY-MM-DDThh:mm:ss[.d...][Z]`
/// and `YYYY-DDDThh:mm:ss[.d...][Z]` (day of year). Digits beyond
/// nanoseconds are dropped.
fn parse_epoch(text: &str, ts: TimeSystem) -> Result<Epoch, String> {
    let bad = || {
        format!(
            "cannot read {text:?} as an epoch (expected YYYY-MM-DDThh:mm:ss[.ddd] or YYYY-DDDThh:mm:ss[.ddd])"
        )
    };
    let body = text.strip_suffix('Z').unwrap_or(text);
    let (date, time) = body.split_once('T').ok_or_else(bad)?;
    let parts: Vec<&str> = date.split('-').collect();
    let all_digits = |s: &str, n: usize| s.len() == n && s.bytes().all(|b| b.is_ascii_digit());
    let date = match parts.as_slice() {
        [y, m, d] if all_digits(y, 4) && all_digits(m, 2) && all_digits(d, 2) => date.to_string(),
        [y, doy] if all_digits(y, 4) && all_digits(doy, 3) => {
            let day: u16 = doy.parse().map_err(|_| bad())?;
            calendar_date_of_day(y, day)
                .ok_or_else(|| format!("{text:?}: day of year {day} does not exist in {y}"))?
        }
        _ => return Err(bad()),
    };
    let (whole, frac) = match time.split_once('.') {
        Some((w, f)) if !f.is_empty() && f.bytes().all(|b| b.is_ascii_digit()) => {
            (w, &f[..f.len().min(9)])
        }
        Some(_) => return Err(bad()),
        None => (time, ""),
    };
    if whole.len() != 8 {
        return Err(bad());
    }
    let scale = match ts {
        TimeSystem::Tdb => "TDB",
        TimeSystem::Tt => "TT",
        TimeSystem::Tai | TimeSystem::Gps => "TAI",
        TimeSystem::Utc => "UTC",
    };
    let canonical = if frac.is_empty() {
        format!("{date}T{whole} {scale}")
    } else {
        format!("{date}T{whole}.{frac} {scale}")
    };
    let t = Epoch::parse(&canonical).map_err(|e| match e {
        crate::time::TimeError::InvalidDate { reason, .. } => {
            format!("{text:?} is not a valid date and time: {reason}")
        }
        _ => bad(),
    })?;
    Ok(match ts {
        TimeSystem::Gps => t.plus_days(-GPS_BEHIND_TAI_S / DAY_S),
        _ => t,
    })
}

/// The calendar date `YYYY-MM-DD` of day-of-year `doy` (1-based) in the
/// four-digit `year`, or `None` if that year has no such day.
///
/// # Method
/// Day `doy` is `doy - 1` whole days after 1 January at 0h on the TDB
/// scale, whose days all last 86400 s (no leap seconds); its calendar date
/// is printed by [`Epoch::date_tdb`] and must still fall in `year`.
fn calendar_date_of_day(year: &str, doy: u16) -> Option<String> {
    let jan1 = Epoch::parse(&format!("{year}-01-01T00:00:00 TDB")).ok()?;
    let date = jan1.plus_days(f64::from(doy.checked_sub(1)?)).date_tdb();
    date.starts_with(year).then_some(date)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Day-of-year calendar (Gregorian rules): day 60 is 29 February in a
    /// leap year and 1 March otherwise; 366 exists only in leap years.
    #[test]
    fn day_of_year() {
        let date = |y: &str, d: u16| calendar_date_of_day(y, d);
        assert_eq!(date("1996", 60).as_deref(), Some("1996-02-29"));
        assert_eq!(date("1997", 60).as_deref(), Some("1997-03-01"));
        assert_eq!(date("1996", 366).as_deref(), Some("1996-12-31"));
        assert_eq!(date("2000", 366).as_deref(), Some("2000-12-31"));
        assert_eq!(date("1900", 366), None);
        assert_eq!(date("1997", 366), None);
        assert_eq!(date("1997", 0), None);
    }

    /// Both epoch forms name the same instant; `Z` is allowed; GPS runs
    /// 19 s behind TAI (IS-GPS-200); UTC differs from TAI by 30 s in 1996
    /// (IERS Bulletin C: TAI - UTC = 30 s from 1996-01-01 to 1997-07-01).
    #[test]
    fn epoch_forms_and_scales() {
        let a = parse_epoch("1996-03-01T12:00:00.500", TimeSystem::Tai).expect("valid");
        let b = parse_epoch("1996-061T12:00:00.500Z", TimeSystem::Tai).expect("valid");
        assert_eq!(a, b);
        let gps = parse_epoch("1996-061T12:00:00.500", TimeSystem::Gps).expect("valid");
        assert!((a.days_until(&gps) * DAY_S + 19.0).abs() < 1e-6);
        let utc = parse_epoch("1996-061T12:00:00.500", TimeSystem::Utc).expect("valid");
        assert!((a.days_until(&utc) * DAY_S - 30.0).abs() < 1e-6);
        for bad in [
            "1996-03-01",
            "1996-3-01T00:00:00",
            "1996-03-01T00:00",
            "1996-03-01T00:00:00.",
        ] {
            assert!(parse_epoch(bad, TimeSystem::Tdb).is_err(), "{bad}");
        }
        let e = parse_epoch("1997-02-30T00:00:00", TimeSystem::Tdb).expect_err("no such day");
        assert!(e.contains("not a valid date"), "{e}");
    }
}
