//! Date columns: one form everywhere, `YYYY-MM-DDThh:mm:ss` (TDB), taken
//! from the same value as the Julian date printed beside it.

use crate::time::{Epoch, J2000_JD};

/// Decimals of every `*_jd_tdb` column: 1e-6 day is 0.0864 s.
pub const JD_DECIMALS: usize = 6;

/// A date column and its Julian date, made from one value.
#[derive(Debug, Clone, PartialEq)]
pub struct Stamp {
    /// Julian date (TDB) rounded to [`JD_DECIMALS`] decimals: the value
    /// the `*_jd_tdb` column prints.
    pub jd_tdb: f64,
    /// `YYYY-MM-DDThh:mm:ss` (TDB) of that same Julian date, rounded to
    /// the second: within 0.5 s of the printed Julian date.
    pub date: String,
}

/// The date and Julian date of a day count past J2000 TDB.
///
/// # Method
/// The Julian date is rounded to 1e-6 day first and the calendar date is
/// printed from that rounded value ([`Epoch::to_iso_seconds_tdb`]), so the
/// two columns never disagree by more than half a second.
pub fn stamp(days_since_j2000_tdb: f64) -> Stamp {
    let scale = 10f64.powi(JD_DECIMALS as i32);
    let jd_tdb = ((days_since_j2000_tdb + J2000_JD) * scale).round() / scale;
    Stamp {
        jd_tdb,
        date: Epoch::from_jd_tdb(jd_tdb).to_iso_seconds_tdb(),
    }
}

/// The date column alone: [`stamp`]'s date.
pub fn file_date(days_since_j2000_tdb: f64) -> String {
    stamp(days_since_j2000_tdb).date
}

#[cfg(test)]
mod tests {
    use super::*;

    /// TDB midnight is JD x.5 (J2000 = JD 2451545.0 is noon, IAU): the
    /// date carries its time, and the JD keeps six decimals.
    #[test]
    fn midnight_and_fractions() {
        let s = stamp(11_423.5);
        assert_eq!(s.date, "2031-04-12T00:00:00");
        assert_eq!(format!("{:.6}", s.jd_tdb), "2462968.500000");
        // 0.778472 day past midnight = 67259.98 s = 18:41:00 (rounded).
        let s = stamp(11_424.278472);
        assert_eq!(s.date, "2031-04-12T18:41:00");
    }
}
