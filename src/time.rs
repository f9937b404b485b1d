//! Epochs in Barycentric Dynamical Time (TDB).
//!
//! An [`Epoch`] is a count of days since J2000.0 (JD 2451545.0) in the TDB
//! time scale, stored as one `f64`. That makes the date arithmetic of a
//! sweep (adding days, differences in days) a plain float operation. The
//! calendar side (reading `2033-04-29T06:30:00 UTC`, converting UTC or TT
//! to TDB, printing a calendar date) goes through the `hifitime` crate;
//! this module is the only one in synodic that touches it.
//!
//! Resolution: near the present, an `f64` count of days resolves about
//! 2e-12 days (0.2 microseconds), far finer than mean-element ephemerides
//! need.

use std::fmt;

use hifitime::{Epoch as HEpoch, TimeScale, Unit};

/// Julian date of J2000.0, the origin of [`Epoch`]'s day count.
///
/// # Units
/// Days (Julian date in TDB; J2000.0 is JD 2451545.0 TT by IAU definition,
/// and TDB and TT differ there by well under 2 ms).
pub const J2000_JD: f64 = 2451545.0;

/// Seconds in one day (SI seconds of the time scale).
const SECONDS_PER_DAY: f64 = 86400.0;

/// Beyond this many days from J2000 (about 270 000 years) an epoch is not
/// printed as a calendar date; hifitime's own range would be exceeded.
const MAX_CALENDAR_DAYS: f64 = 1.0e8;

/// Why a piece of text is not an epoch or a span of epochs.
///
/// Every message quotes the offending text.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[non_exhaustive]
pub enum TimeError {
    /// The text is not of the form `YYYY-MM-DD[THH:MM[:SS[.fff]]] [SCALE]`.
    #[error(
        "cannot read {text:?} as an epoch: {reason} (expected e.g. \"2033-04-29\" or \"2033-04-29T06:30:00 TDB\")"
    )]
    Syntax {
        /// The text as given.
        text: String,
        /// What is wrong with it.
        reason: String,
    },
    /// The time scale suffix is not one synodic knows.
    #[error("unknown time scale {scale:?} in {text:?} (known: TDB, TT, TAI, UTC)")]
    UnknownScale {
        /// The text as given.
        text: String,
        /// The unrecognised scale.
        scale: String,
    },
    /// The fields are well formed but do not name a calendar instant
    /// (e.g. 2033-02-30, or second 60 outside a UTC leap second).
    #[error("{text:?} is not a valid calendar date and time: {reason}")]
    InvalidDate {
        /// The text as given.
        text: String,
        /// The calendar library's explanation.
        reason: String,
    },
    /// A span `START..END` without the `..` separator.
    #[error(
        "cannot read {text:?} as a span: expected START..END, e.g. \"2033-01-01..2033-12-31\""
    )]
    SpanSyntax {
        /// The text as given.
        text: String,
    },
    /// A span whose end is not after its start.
    #[error("span {text:?} ends before or at its start")]
    SpanOrder {
        /// The text as given.
        text: String,
    },
}

/// An instant, as days since J2000.0 in Barycentric Dynamical Time (TDB).
///
/// Build one with [`Epoch::parse`], [`Epoch::from_jd_tdb`] or
/// [`Epoch::from_days_since_j2000_tdb`]. [`Display`](fmt::Display) prints
/// the ISO form of [`Epoch::to_iso_tdb`].
///
/// # Units
/// Days of 86400 SI seconds on the TDB scale, counted from J2000.0
/// (JD 2451545.0).
///
/// # Example
/// ```
/// use synodic::time::Epoch;
/// let t = Epoch::parse("2033-04-29T06:30:00")?;      // TDB by default
/// assert_eq!(t.to_iso_tdb(), "2033-04-29T06:30:00 TDB");
/// assert_eq!(t.plus_days(2.0).date_tdb(), "2033-05-01");
/// # Ok::<(), synodic::time::TimeError>(())
/// ```
#[derive(Debug, Clone, Copy, PartialEq, PartialOrd)]
pub struct Epoch {
    /// Days since J2000.0, TDB.
    days_tdb: f64,
}

impl Epoch {
    /// Reads an epoch from text.
    ///
    /// Accepted forms (leading and trailing white space is ignored):
    /// - `YYYY-MM-DD` (midnight at the start of that day),
    /// - `YYYY-MM-DDTHH:MM`, `YYYY-MM-DDTHH:MM:SS` or
    ///   `YYYY-MM-DDTHH:MM:SS.fffffffff` (a space may replace the `T`),
    ///
    /// each optionally followed by white space and a time scale: `TDB`,
    /// `TT`, `TAI` or `UTC` (case-insensitive). Without a scale the text is
    /// read as **TDB**, the scale of the ephemerides. The scale must be
    /// separated by white space (`2033-04-29TDB` is rejected as ambiguous).
    /// UTC and TT inputs are converted to TDB with hifitime's leap-second
    /// table and TDB - TT model.
    ///
    /// # Method
    /// The fields are checked here (for messages that say what is wrong)
    /// and handed to `hifitime::Epoch::maybe_from_gregorian`, which checks
    /// the calendar (days per month, leap years, leap seconds) and converts
    /// between scales.
    ///
    /// # Units
    /// The result counts TDB days from J2000.0.
    ///
    /// # Errors
    /// [`TimeError::Syntax`] for malformed text, [`TimeError::UnknownScale`]
    /// for a scale other than the four above, [`TimeError::InvalidDate`] for
    /// well-formed fields that name no instant (2033-02-30).
    pub fn parse(text: &str) -> Result<Epoch, TimeError> {
        let fields = Fields::read(text)?;
        let h = HEpoch::maybe_from_gregorian(
            fields.year,
            fields.month,
            fields.day,
            fields.hour,
            fields.minute,
            fields.second,
            fields.nanos,
            fields.scale,
        )
        .map_err(|e| TimeError::InvalidDate {
            text: text.to_string(),
            reason: match e {
                hifitime::HifitimeError::InvalidGregorianDate => {
                    "second 60 exists only in UTC, at a leap second".to_string()
                }
                other => other.to_string(),
            },
        })?;
        Ok(Epoch {
            days_tdb: h.to_tdb_duration().to_unit(Unit::Day),
        })
    }

    /// The epoch at a Julian date on the TDB scale.
    ///
    /// # Units
    /// `jd` in days (Julian date, TDB). A non-finite `jd` gives an epoch
    /// whose day counts are non-finite too; it prints as `invalid epoch`.
    pub fn from_jd_tdb(jd: f64) -> Epoch {
        Epoch {
            days_tdb: jd - J2000_JD,
        }
    }

    /// The epoch `days` TDB days after J2000.0 (before it if negative).
    ///
    /// # Units
    /// Days of 86400 s, TDB.
    pub fn from_days_since_j2000_tdb(days: f64) -> Epoch {
        Epoch { days_tdb: days }
    }

    /// Julian date on the TDB scale.
    ///
    /// # Units
    /// Days.
    pub fn jd_tdb(&self) -> f64 {
        self.days_tdb + J2000_JD
    }

    /// Days since J2000.0 on the TDB scale.
    ///
    /// # Units
    /// Days.
    pub fn days_since_j2000_tdb(&self) -> f64 {
        self.days_tdb
    }

    /// The epoch `days` later (earlier if negative).
    ///
    /// # Units
    /// Days.
    pub fn plus_days(&self, days: f64) -> Epoch {
        Epoch {
            days_tdb: self.days_tdb + days,
        }
    }

    /// Days from `self` to `later` (negative if `later` is earlier).
    ///
    /// # Units
    /// Days.
    pub fn days_until(&self, later: &Epoch) -> f64 {
        later.days_tdb - self.days_tdb
    }

    /// Whether the day count is finite (epochs from arithmetic on NaN or
    /// infinite values are not).
    pub fn is_finite(&self) -> bool {
        self.days_tdb.is_finite()
    }

    /// ISO 8601 calendar date and time on the TDB scale, e.g.
    /// `2033-04-29T06:30:00 TDB`.
    ///
    /// Rounded to the nearest millisecond; the fraction is printed only
    /// when it is not zero (`2033-04-29T06:30:00.250 TDB`). An epoch more
    /// than 10^8 days from J2000 prints as `JD <value> TDB`, and a
    /// non-finite one as `invalid epoch (<value> days since J2000 TDB)`.
    pub fn to_iso_tdb(&self) -> String {
        match self.calendar_tdb() {
            Some(c) => {
                let mut s = format!(
                    "{:04}-{:02}-{:02}T{:02}:{:02}:{:02}",
                    c.year, c.month, c.day, c.hour, c.minute, c.second
                );
                if c.millis != 0 {
                    s.push_str(&format!(".{:03}", c.millis));
                }
                s.push_str(" TDB");
                s
            }
            None => self.uncalendared(),
        }
    }

    /// The fixed form of every date column synodic writes:
    /// `YYYY-MM-DDThh:mm:ss`, TDB, rounded to the nearest second (no
    /// fraction, no scale suffix). An epoch outside the printable range
    /// prints as [`Epoch::to_iso_tdb`] does.
    pub fn to_iso_seconds_tdb(&self) -> String {
        if !self.days_tdb.is_finite() || self.days_tdb.abs() > MAX_CALENDAR_DAYS {
            return self.uncalendared();
        }
        // Whole seconds, exact in f64 far beyond the printable range.
        let seconds = (self.days_tdb * SECONDS_PER_DAY).round();
        let whole = Epoch {
            days_tdb: seconds / SECONDS_PER_DAY,
        };
        match whole.calendar_tdb() {
            Some(c) => format!(
                "{:04}-{:02}-{:02}T{:02}:{:02}:{:02}",
                c.year, c.month, c.day, c.hour, c.minute, c.second
            ),
            None => self.uncalendared(),
        }
    }

    /// Calendar date on the TDB scale, `YYYY-MM-DD` (the day that contains
    /// the epoch rounded to the nearest millisecond).
    pub fn date_tdb(&self) -> String {
        match self.calendar_tdb() {
            Some(c) => format!("{:04}-{:02}-{:02}", c.year, c.month, c.day),
            None => self.uncalendared(),
        }
    }

    fn uncalendared(&self) -> String {
        if self.days_tdb.is_finite() {
            format!("JD {} TDB", self.jd_tdb())
        } else {
            format!("invalid epoch ({} days since J2000 TDB)", self.days_tdb)
        }
    }

    /// Calendar fields in TDB, rounded to the millisecond; `None` when the
    /// epoch is non-finite or out of the printable range.
    fn calendar_tdb(&self) -> Option<Calendar> {
        if !self.days_tdb.is_finite() || self.days_tdb.abs() > MAX_CALENDAR_DAYS {
            return None;
        }
        // Round in integer milliseconds (exact in f64 up to 2^53 ms).
        let millis_total = (self.days_tdb * SECONDS_PER_DAY * 1000.0).round() as i64;
        let duration = Unit::Millisecond * millis_total;
        let h = HEpoch::from_tdb_duration(duration);
        let (year, month, day, hour, minute, second, nanos) = h.to_gregorian(TimeScale::TDB);
        Some(Calendar {
            year,
            month,
            day,
            hour,
            minute,
            second,
            // Rounded to whole milliseconds above; the division is exact.
            millis: nanos / 1_000_000,
        })
    }
}

impl fmt::Display for Epoch {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.to_iso_tdb())
    }
}

impl std::str::FromStr for Epoch {
    type Err = TimeError;
    fn from_str(s: &str) -> Result<Self, Self::Err> {
        Epoch::parse(s)
    }
}

/// Reads a span `START..END` of two epochs, each as [`Epoch::parse`]
/// accepts (white space around `..` is allowed).
///
/// # Errors
/// [`TimeError::SpanSyntax`] without `..`; the errors of [`Epoch::parse`]
/// for either end; [`TimeError::SpanOrder`] if END is not after START.
pub fn parse_span(text: &str) -> Result<(Epoch, Epoch), TimeError> {
    let (start, end) = text.split_once("..").ok_or_else(|| TimeError::SpanSyntax {
        text: text.to_string(),
    })?;
    let start = Epoch::parse(start)?;
    let end = Epoch::parse(end)?;
    if end.days_tdb.partial_cmp(&start.days_tdb) != Some(std::cmp::Ordering::Greater) {
        return Err(TimeError::SpanOrder {
            text: text.to_string(),
        });
    }
    Ok((start, end))
}

/// Calendar fields of a printed epoch.
struct Calendar {
    year: i32,
    month: u8,
    day: u8,
    hour: u8,
    minute: u8,
    second: u8,
    millis: u32,
}

/// The fields of an epoch as read from text, before calendar checks.
struct Fields {
    year: i32,
    month: u8,
    day: u8,
    hour: u8,
    minute: u8,
    second: u8,
    nanos: u32,
    scale: TimeScale,
}

impl Fields {
    fn read(text: &str) -> Result<Fields, TimeError> {
        let syntax = |reason: &str| TimeError::Syntax {
            text: text.to_string(),
            reason: reason.to_string(),
        };
        let trimmed = text.trim();
        if trimmed.is_empty() {
            return Err(syntax("the text is empty"));
        }
        // Split "DATE[T|space]TIME [SCALE]" into words.
        let mut words: Vec<&str> = trimmed.split_whitespace().collect();
        let scale = match words.last() {
            Some(w) if words.len() >= 2 && w.chars().all(|c| c.is_ascii_alphabetic()) => {
                let w = *w;
                words.pop();
                match w.to_ascii_uppercase().as_str() {
                    "TDB" => TimeScale::TDB,
                    "TT" => TimeScale::TT,
                    "TAI" => TimeScale::TAI,
                    "UTC" => TimeScale::UTC,
                    _ => {
                        return Err(TimeError::UnknownScale {
                            text: text.to_string(),
                            scale: w.to_string(),
                        })
                    }
                }
            }
            _ => TimeScale::TDB,
        };
        // ISO 8601's zone designators ("Z" for UTC, "+02:00") are not read:
        // synodic takes the scale as a word, so say how to write it.
        if let Some(last) = words.last() {
            let time_part = last.split_once(['T', 't']).map_or(*last, |(_, t)| t);
            let zoned = time_part.contains(':')
                && (time_part.ends_with(['Z', 'z']) || time_part.contains(['+', '-']));
            if zoned {
                return Err(syntax(
                    "a time-zone designator (\"Z\" or an offset such as \"+02:00\") is not \
                     read; for UTC write the scale as a word, e.g. \"2041-03-01T00:00:00 UTC\", \
                     or leave it off for TDB",
                ));
            }
        }
        let (date, time) = match words.as_slice() {
            [one] => match one.split_once(['T', 't']) {
                Some((d, t)) => (d, Some(t)),
                None => (*one, None),
            },
            [d, t] => (*d, Some(*t)),
            [] => return Err(syntax("a time scale alone is not an epoch")),
            _ => return Err(syntax("too many words")),
        };

        let mut date_parts = date.split('-');
        let (Some(y), Some(m), Some(d), None) = (
            date_parts.next(),
            date_parts.next(),
            date_parts.next(),
            date_parts.next(),
        ) else {
            return Err(syntax("the date must be YYYY-MM-DD"));
        };
        let year = digits(y, 4).ok_or_else(|| syntax("the year must be four digits"))?;
        let month = digits(m, 2).ok_or_else(|| syntax("the month must be two digits"))?;
        let day = digits(d, 2).ok_or_else(|| syntax("the day must be two digits"))?;

        let (mut hour, mut minute, mut second, mut nanos) = (0, 0, 0, 0);
        if let Some(time) = time {
            let mut parts = time.split(':');
            let h = parts.next().unwrap_or("");
            let mi = parts
                .next()
                .ok_or_else(|| syntax("the time must be HH:MM or HH:MM:SS"))?;
            let s = parts.next();
            if parts.next().is_some() {
                return Err(syntax("the time must be HH:MM or HH:MM:SS"));
            }
            hour = digits(h, 2).ok_or_else(|| syntax("the hour must be two digits"))?;
            minute = digits(mi, 2).ok_or_else(|| syntax("the minute must be two digits"))?;
            if let Some(s) = s {
                let (whole, frac) = match s.split_once('.') {
                    Some((w, f)) => (w, Some(f)),
                    None => (s, None),
                };
                second = digits(whole, 2).ok_or_else(|| syntax("the second must be two digits"))?;
                if let Some(frac) = frac {
                    if frac.is_empty()
                        || frac.len() > 9
                        || !frac.bytes().all(|b| b.is_ascii_digit())
                    {
                        return Err(syntax("the fraction of a second must be 1 to 9 digits"));
                    }
                    let scale_up = 10u32.pow(9 - frac.len() as u32);
                    nanos = frac.parse::<u32>().map_err(|_| syntax("bad fraction"))? * scale_up;
                }
            }
        }
        let invalid = |reason: &str| TimeError::InvalidDate {
            text: text.to_string(),
            reason: reason.to_string(),
        };
        if !(1..=12).contains(&month) {
            return Err(invalid("month must be 01-12"));
        }
        let leap = (year % 4 == 0 && year % 100 != 0) || year % 400 == 0;
        let month_days = [
            31,
            if leap { 29 } else { 28 },
            31,
            30,
            31,
            30,
            31,
            31,
            30,
            31,
            30,
            31,
        ];
        if day < 1 || day > month_days[(month - 1) as usize] {
            return Err(invalid("no such day in that month"));
        }
        if hour > 23 || minute > 59 || second > 60 {
            return Err(TimeError::InvalidDate {
                text: text.to_string(),
                reason: "hour must be 00-23, minute 00-59, second 00-60".to_string(),
            });
        }
        let small = |v: u32, what: &str| u8::try_from(v).map_err(|_| syntax(what));
        Ok(Fields {
            year: i32::try_from(year).map_err(|_| syntax("year out of range"))?,
            month: small(month, "month out of range")?,
            day: small(day, "day out of range")?,
            hour: small(hour, "hour out of range")?,
            minute: small(minute, "minute out of range")?,
            second: small(second, "second out of range")?,
            nanos,
            scale,
        })
    }
}

/// `s` as a number if it is exactly `n` ASCII digits.
fn digits(s: &str, n: usize) -> Option<u32> {
    if s.len() == n && s.bytes().all(|b| b.is_ascii_digit()) {
        s.parse().ok()
    } else {
        None
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// One millisecond in days: the resolution epochs are printed at.
    const MS_DAYS: f64 = 1.0e-3 / SECONDS_PER_DAY;

    /// Source: IAU definition of J2000.0:
    /// J2000.0 = JD 2451545.0 TT = 2000-01-01T12:00:00 TT.
    /// TDB - TT at J2000 is below 2 ms, so the TDB day count is 0 to
    /// within 2 ms (tolerance: the amplitude of TDB - TT, 1.66 ms).
    #[test]
    fn j2000_is_jd_2451545_tt() {
        let t = Epoch::parse("2000-01-01T12:00:00 TT").expect("valid");
        assert_relative_eq!(t.jd_tdb(), 2451545.0, epsilon = 2.0e-3 / SECONDS_PER_DAY);
        assert_relative_eq!(
            t.days_since_j2000_tdb(),
            0.0,
            epsilon = 2.0e-3 / SECONDS_PER_DAY
        );
        let h = HEpoch::from_gregorian(2000, 1, 1, 12, 0, 0, 0, TimeScale::TT);
        assert_relative_eq!(h.to_jde_tt_days(), J2000_JD, epsilon = 1e-9);
    }

    /// Source: IAU, TT - TAI = 32.184 s exactly (IAU 1991 Resolution A4).
    /// Tolerance 1 microsecond: float rounding of an 1e9-second count.
    #[test]
    fn tt_minus_tai_is_32_184_s() {
        let tt = Epoch::parse("2025-06-01T00:00:00 TT").expect("valid");
        let tai = Epoch::parse("2025-06-01T00:00:00 TAI").expect("valid");
        // The same clock reading in TAI is a later instant by TT - TAI.
        let dt_s = tt.days_until(&tai) * SECONDS_PER_DAY;
        assert_relative_eq!(dt_s, 32.184, epsilon = 1e-6);
    }

    /// Source: IERS Bulletin C 52, TAI - UTC = 37 s from 2017-01-01.
    /// Tolerance 1 microsecond (float rounding).
    #[test]
    fn tai_minus_utc_is_37_s_in_2020() {
        let tai = Epoch::parse("2020-03-15T00:00:00 TAI").expect("valid");
        let utc = Epoch::parse("2020-03-15T00:00:00 UTC").expect("valid");
        let dt_s = tai.days_until(&utc) * SECONDS_PER_DAY;
        assert_relative_eq!(dt_s, 37.0, epsilon = 1e-6);
    }

    /// Source: IERS Bulletin C 52 (TAI - UTC = 37 s) and IAU (TT - TAI =
    /// 32.184 s): TDB - UTC = 69.184 s plus the
    /// periodic TDB - TT term, whose amplitude is 1.66 ms (the tolerance;
    /// assumes no new leap second before 2033, as announced so far).
    #[test]
    fn utc_input_is_69_18_s_behind_tdb_in_2030s() {
        let utc = Epoch::parse("2033-04-29T06:30:00 UTC").expect("valid");
        let tdb = Epoch::parse("2033-04-29T06:30:00 TDB").expect("valid");
        let dt_s = tdb.days_until(&utc) * SECONDS_PER_DAY;
        assert_relative_eq!(dt_s, 69.184, epsilon = 1.7e-3);
    }

    /// Round trip: parse then print gives the canonical text back
    /// (invariant of this module; exact string comparison).
    #[test]
    fn parse_print_round_trip() {
        for text in [
            "2033-04-29T06:30:00 TDB",
            "2000-01-01T12:00:00 TDB",
            "1999-12-31T23:59:59 TDB",
            "2024-02-29T00:00:00 TDB",
            "2100-03-01T18:45:30.250 TDB",
            "1850-07-04T03:02:01 TDB",
        ] {
            let t = Epoch::parse(text).expect("valid");
            assert_eq!(t.to_iso_tdb(), text);
            assert_eq!(t.to_string(), text);
            assert_eq!(Epoch::parse(&t.to_iso_tdb()).expect("valid"), t);
        }
    }

    /// Other accepted spellings agree with the canonical one (default
    /// scale TDB, lowercase scale, space separator, HH:MM).
    #[test]
    fn accepted_forms_agree() {
        let canonical = Epoch::parse("2033-04-29T06:30:00 TDB").expect("valid");
        for text in [
            "2033-04-29T06:30:00",
            "2033-04-29 06:30:00",
            "2033-04-29t06:30",
            "  2033-04-29T06:30:00.000 tdb  ",
            "2033-04-29 06:30 TDB",
        ] {
            let t = Epoch::parse(text).expect("valid");
            assert_relative_eq!(
                t.days_since_j2000_tdb(),
                canonical.days_since_j2000_tdb(),
                epsilon = MS_DAYS
            );
        }
        let midnight = Epoch::parse("2033-04-29").expect("valid");
        assert_eq!(midnight.to_iso_tdb(), "2033-04-29T00:00:00 TDB");
        assert_eq!(canonical.date_tdb(), "2033-04-29");
        let utc_date = Epoch::parse("2033-04-29 UTC").expect("valid");
        assert_eq!(utc_date.date_tdb(), "2033-04-29");
    }

    /// Round trip through Julian dates and day counts; J2000 = JD 2451545.0.
    /// Tolerance: 1e-9 days (0.1 ms) covers float rounding at JD ~2.46e6.
    #[test]
    fn jd_and_day_count_round_trip() {
        let t = Epoch::from_jd_tdb(2462968.5);
        assert_relative_eq!(t.days_since_j2000_tdb(), 11423.5, epsilon = 1e-9);
        assert_relative_eq!(t.jd_tdb(), 2462968.5, epsilon = 1e-9);
        let u = Epoch::from_days_since_j2000_tdb(11423.5);
        assert_eq!(u.to_iso_tdb(), t.to_iso_tdb());
        assert_eq!(t.to_iso_tdb(), "2031-04-12T00:00:00 TDB");
        assert_relative_eq!(t.plus_days(10.25).days_until(&t), -10.25, epsilon = 1e-9);
        assert!(t < t.plus_days(1.0));
    }

    /// Printing rounds to the millisecond and never shows 60 seconds.
    #[test]
    fn printing_rounds_to_millisecond() {
        let t = Epoch::parse("2033-04-29T06:30:00").expect("valid");
        assert_eq!(
            t.plus_days(-0.1 * MS_DAYS).to_iso_tdb(),
            "2033-04-29T06:30:00 TDB"
        );
        assert_eq!(t.plus_days(-0.4 * MS_DAYS).date_tdb(), "2033-04-29");
        let nan = Epoch::from_days_since_j2000_tdb(f64::NAN);
        assert!(!nan.is_finite());
        assert!(nan.to_iso_tdb().starts_with("invalid epoch"));
        assert!(Epoch::from_days_since_j2000_tdb(1e12)
            .to_iso_tdb()
            .starts_with("JD "));
    }

    /// The date-column form has whole seconds and no suffix; it rounds to
    /// the nearest second and carries into the next day.
    #[test]
    fn seconds_form_rounds_to_the_second() {
        let t = Epoch::parse("2033-04-29T23:59:59.6").expect("valid");
        assert_eq!(t.to_iso_seconds_tdb(), "2033-04-30T00:00:00");
        let t = Epoch::parse("2033-04-29T06:30:00.4").expect("valid");
        assert_eq!(t.to_iso_seconds_tdb(), "2033-04-29T06:30:00");
        assert!(Epoch::from_days_since_j2000_tdb(f64::NAN)
            .to_iso_seconds_tdb()
            .starts_with("invalid epoch"));
    }

    #[test]
    fn unknown_scale_is_rejected_with_its_name() {
        let err = Epoch::parse("2033-04-29T06:30:00 GMT").expect_err("GMT unknown");
        assert!(matches!(err, TimeError::UnknownScale { .. }));
        assert_eq!(
            err.to_string(),
            "unknown time scale \"GMT\" in \"2033-04-29T06:30:00 GMT\" (known: TDB, TT, TAI, UTC)"
        );
    }

    #[test]
    fn garbage_is_rejected_quoting_the_text() {
        for text in [
            "",
            "tomorrow",
            "2033/04/29",
            "33-04-29",
            "2033-4-29",
            "2033-04-29T6:30",
            "2033-04-29T06",
            "2033-04-29T06:30:00:00",
            "2033-04-29T06:30:00.",
            "2033-04-29T06:30:00 TDB extra",
            "2033-04-29TDB",
        ] {
            let err = Epoch::parse(text).expect_err(text);
            assert!(err.to_string().contains(&format!("{text:?}")), "{err}");
        }
        let err = Epoch::parse("2033-02-30").expect_err("no such day");
        assert!(matches!(err, TimeError::InvalidDate { .. }), "{err}");
        assert!(err
            .to_string()
            .starts_with("\"2033-02-30\" is not a valid calendar date"));
        let err = Epoch::parse("2033-04-29T24:00:00").expect_err("hour 24");
        assert!(matches!(err, TimeError::InvalidDate { .. }), "{err}");
    }

    /// ISO 8601 zone designators get a message saying how to write the
    /// scale, not a complaint about the digits of the second.
    #[test]
    fn zone_designators_are_explained() {
        for text in [
            "2041-03-01T00:00:00Z",
            "2041-03-01T00:00:00z",
            "2041-03-01T00:00:00+02:00",
            "2041-03-01T00:00-05:00",
        ] {
            let msg = Epoch::parse(text).expect_err(text).to_string();
            assert!(msg.contains("time-zone designator"), "{msg}");
            assert!(msg.contains("2041-03-01T00:00:00 UTC"), "{msg}");
            assert!(!msg.contains("two digits"), "{msg}");
        }
    }

    #[test]
    fn spans() {
        let (a, b) = parse_span("2033-01-01..2033-12-31").expect("valid");
        assert_relative_eq!(a.days_until(&b), 364.0, epsilon = 1e-9);
        let (a, b) = parse_span("2033-01-01T00:00 UTC .. 2033-01-02 TT").expect("valid");
        assert!(a < b);
        assert!(matches!(
            parse_span("2033-01-01"),
            Err(TimeError::SpanSyntax { .. })
        ));
        let err = parse_span("2033-12-31..2033-01-01").expect_err("reversed");
        assert_eq!(
            err.to_string(),
            "span \"2033-12-31..2033-01-01\" ends before or at its start"
        );
        assert!(matches!(
            parse_span("2033-01-01..2033-01-01"),
            Err(TimeError::SpanOrder { .. })
        ));
        assert!(matches!(
            parse_span("2033-01-01..soon"),
            Err(TimeError::Syntax { .. })
        ));
    }

    proptest::proptest! {
        /// Any epoch within +/- 300 years of J2000 prints and parses back
        /// to within the printed resolution (half a millisecond).
        #[test]
        fn print_parse_round_trip(days in -110_000.0f64..110_000.0) {
            let t = Epoch::from_days_since_j2000_tdb(days);
            let back = Epoch::parse(&t.to_iso_tdb()).expect("printed epochs parse");
            // Half a millisecond of printing, plus the spacing of f64 day
            // counts near 1e5 days (about 1.5e-11 days, 1.3 us) for the
            // arithmetic of the conversions.
            let slack = 8.0 * f64::EPSILON * days.abs().max(1.0);
            proptest::prop_assert!((back.days_since_j2000_tdb() - days).abs() <= 0.5 * MS_DAYS + slack);
        }
    }
}
