//! Axis ticks: calendar boundaries on date axes (month starts, or year
//! starts for spans of years), round numbers elsewhere.

use super::calendar::{civil_from_days_j2000, date_label_tdb, days_j2000_from_civil};
use super::levels::nice_ceil;

/// Month steps tried for date ticks, smallest first.
const MONTH_STEPS: [i64; 9] = [1, 2, 3, 4, 6, 12, 24, 60, 120];
/// Day steps tried for spans too short for month ticks.
const DAY_STEPS: [f64; 7] = [1.0, 2.0, 5.0, 7.0, 10.0, 15.0, 30.0];

/// Date ticks: positions (days past J2000 TDB, midnight TDB) and whether
/// they all fall on year starts, so that the year alone labels them.
#[derive(Debug, Clone, PartialEq)]
pub(crate) struct DateTicks {
    pub(crate) at: Vec<f64>,
    pub(crate) years: bool,
}

impl DateTicks {
    /// The label of tick `t`: `YYYY` on year ticks, else `YYYY-MM-DD`.
    pub(crate) fn label(&self, t: f64) -> String {
        let text = date_label_tdb(t);
        if self.years {
            text[..text.len() - 6].to_string()
        } else {
            text
        }
    }
}

/// Tick positions (days past J2000 TDB) at calendar boundaries, at most
/// `max_ticks` of them: month starts every 1, 2, 3, 4 or 6 months, year
/// starts every 1, 2, 5 or 10 years, or for short spans every few days.
pub(crate) fn date_ticks(lo: f64, hi: f64, max_ticks: usize) -> DateTicks {
    let (y0, m0, _) = civil_from_days_j2000(lo);
    let (y1, m1, _) = civil_from_days_j2000(hi);
    let first = y0 * 12 + i64::from(m0) - 1;
    let last = y1 * 12 + i64::from(m1) - 1;
    for step in MONTH_STEPS {
        let mut ticks = Vec::new();
        for mi in first..=last {
            if mi.rem_euclid(step) != 0 {
                continue;
            }
            let d = days_j2000_from_civil(mi.div_euclid(12), (mi.rem_euclid(12) + 1) as u32, 1);
            if d >= lo - 1e-9 && d <= hi + 1e-9 {
                ticks.push(d);
            }
        }
        if ticks.len() <= max_ticks && (ticks.len() >= 3 || step == 1) {
            if ticks.len() >= 3 {
                return DateTicks {
                    at: ticks,
                    years: step >= 12,
                };
            }
            break;
        }
    }
    // Short spans: every n days at midnight TDB.
    let span = hi - lo;
    let step = DAY_STEPS
        .into_iter()
        .find(|s| span / s <= max_ticks as f64)
        .unwrap_or(30.0);
    let mut t = ((lo + 0.5) / step).ceil() * step - 0.5;
    let mut ticks = Vec::new();
    while t <= hi + 1e-9 {
        ticks.push(t);
        t += step;
    }
    DateTicks {
        at: ticks,
        years: false,
    }
}

/// Round-number ticks between `lo` and `hi`, at most about `max_ticks`.
pub(crate) fn number_ticks(lo: f64, hi: f64, max_ticks: usize) -> Vec<f64> {
    let step = nice_ceil((hi - lo) / max_ticks.max(1) as f64);
    if !(step.is_finite() && step > 0.0) {
        return Vec::new();
    }
    let mut t = (lo / step).ceil() * step;
    let mut out = Vec::new();
    while t <= hi + 1e-9 * step {
        out.push(t);
        t += step;
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn date_ticks_fall_on_month_starts() {
        let lo = days_j2000_from_civil(2031, 1, 10);
        let hi = days_j2000_from_civil(2031, 12, 20);
        let t = date_ticks(lo, hi, 8);
        assert!(t.at.len() >= 3 && t.at.len() <= 8, "{t:?}");
        assert!(!t.years);
        for d in &t.at {
            assert!(t.label(*d).ends_with("-01"));
            assert!(*d >= lo && *d <= hi);
        }
        // Short spans fall back to days.
        let t = date_ticks(lo, lo + 20.0, 8);
        assert!(t.at.len() >= 3 && t.at.len() <= 8, "{t:?}");
    }

    #[test]
    fn spans_of_years_get_year_ticks() {
        // 2030-01-01 to 2040-01-01 with room for 8 ticks: every second
        // year, labelled by the year alone (the proleptic Gregorian
        // calendar: 2030-01-01 00:00 TDB is 10957.5 days past J2000).
        let lo = days_j2000_from_civil(2030, 1, 1);
        assert!((lo - 10957.5).abs() < 1e-9);
        let hi = days_j2000_from_civil(2040, 1, 1);
        let t = date_ticks(lo, hi, 8);
        assert!(t.years, "{t:?}");
        let labels: Vec<String> = t.at.iter().map(|&d| t.label(d)).collect();
        assert_eq!(labels, ["2030", "2032", "2034", "2036", "2038", "2040"]);
        for d in &t.at {
            assert!(date_label_tdb(*d).ends_with("-01-01"));
        }
        // With room for 12, every year.
        assert_eq!(date_ticks(lo, hi, 12).at.len(), 11);
    }

    #[test]
    fn number_ticks_are_round() {
        assert_eq!(
            number_ticks(0.0, 10.0, 5),
            vec![0.0, 2.0, 4.0, 6.0, 8.0, 10.0]
        );
        assert_eq!(number_ticks(121.0, 1499.0, 4), vec![500.0, 1000.0]);
        assert!(number_ticks(1.0, 1.0, 4).is_empty());
    }
}
