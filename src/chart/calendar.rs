//! The chart's calendar: TDB day counts to calendar dates and back, for
//! axis ticks and date text.
//!
//! This duplicates the calendar of `src/time.rs` (which goes through
//! hifitime and rounds to the millisecond first; this one floors the day
//! count). It is kept apart on purpose as the one seam to close when the
//! time module offers every calendar form: the chart reads dates only
//! through [`date_label_tdb`] (date text), [`civil_from_days_j2000`] and
//! [`days_j2000_from_civil`] (month boundaries for ticks), so replacing
//! this file by calls into `crate::time` touches nothing else.

/// The calendar date (TDB) containing `days` past J2000 TDB, as
/// `YYYY-MM-DD`.
///
/// The chart module carries this small conversion itself so that axis
/// labels do not depend on the time module's formatting.
///
/// # Method
/// J2000 is 2000-01-01 12:00 TDB, so the civil day number counted from
/// 2000-01-01 is `floor(days + 0.5)`. Days to a proleptic Gregorian date
/// follow H. Hinnant, *chrono-Compatible Low-Level Date Algorithms*,
/// `civil_from_days` (<https://howardhinnant.github.io/date_algorithms.html>).
pub fn date_label_tdb(days: f64) -> String {
    let (y, m, d) = civil_from_days_j2000(days);
    format!("{y:04}-{m:02}-{d:02}")
}

/// `(year, month 1..=12, day 1..=31)` of the TDB calendar day containing
/// `days` past J2000 TDB.
pub(crate) fn civil_from_days_j2000(days: f64) -> (i64, u32, u32) {
    // 2000-01-01 is day 10957 after 1970-01-01.
    let z = (days + 0.5).floor() as i64 + 10957 + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36524 - doe / 146_096) / 365;
    let y = yoe + era * 400;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = (doy - (153 * mp + 2) / 5 + 1) as u32;
    let m = if mp < 10 { mp + 3 } else { mp - 9 } as u32;
    (if m <= 2 { y + 1 } else { y }, m, d)
}

/// Days past J2000 TDB of midnight TDB starting `year-month-day`.
pub(crate) fn days_j2000_from_civil(year: i64, month: u32, day: u32) -> f64 {
    let y = if month <= 2 { year - 1 } else { year };
    let era = y.div_euclid(400);
    let yoe = y.rem_euclid(400);
    let m = i64::from(month);
    let mp = if m > 2 { m - 3 } else { m + 9 };
    let doy = (153 * mp + 2) / 5 + i64::from(day) - 1;
    let doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
    let unix_days = era * 146_097 + doe - 719_468;
    (unix_days - 10957) as f64 - 0.5
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dates_round_trip_and_known_days() {
        // J2000 itself is 2000-01-01 12:00 TDB.
        assert_eq!(date_label_tdb(0.0), "2000-01-01");
        assert_eq!(date_label_tdb(-0.5), "2000-01-01");
        assert_eq!(date_label_tdb(-0.51), "1999-12-31");
        // 2000 is a leap year: day 59.5 after J2000 is 2000-03-01 midnight.
        assert_eq!(date_label_tdb(59.5), "2000-03-01");
        assert_eq!(date_label_tdb(59.4), "2000-02-29");
        // Every day from 1900 to 2200 round-trips.
        for year in 1900..2200 {
            for month in 1..=12 {
                for day in [1, 15, 28] {
                    let d = days_j2000_from_civil(year, month, day);
                    assert_eq!(civil_from_days_j2000(d), (year, month, day));
                    assert_eq!(civil_from_days_j2000(d + 0.999), (year, month, day));
                }
            }
        }
        // 2031-01-01 00:00 TDB is 11322.5 days past J2000.
        assert!((days_j2000_from_civil(2031, 1, 1) - 11322.5).abs() < 1e-9);
    }
}
