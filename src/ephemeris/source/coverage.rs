//! The dates an ephemeris file covers.

use std::fmt;

use crate::time::Epoch;

/// The closed spans of TDB dates where a file gives states, sorted and
/// disjoint (touching spans are merged).
///
/// [`Display`](fmt::Display) prints the spans as ISO dates, e.g.
/// `1996-01-01T00:00:00 TDB .. 1999-01-01T00:00:00 TDB`, several joined by
/// `, `.
///
/// # Units
/// Days since J2000 TDB.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Coverage {
    spans: Vec<(f64, f64)>,
}

impl Coverage {
    /// The union of the given spans (each `(start, end)` in days since
    /// J2000 TDB; spans with `end < start` or non-finite ends are dropped).
    pub fn from_spans(spans: impl IntoIterator<Item = (f64, f64)>) -> Coverage {
        let mut v: Vec<(f64, f64)> = spans
            .into_iter()
            .filter(|(a, b)| a.is_finite() && b.is_finite() && a <= b)
            .collect();
        v.sort_by(|a, b| a.0.total_cmp(&b.0));
        let mut merged: Vec<(f64, f64)> = Vec::with_capacity(v.len());
        for (a, b) in v {
            match merged.last_mut() {
                Some(last) if a <= last.1 => last.1 = last.1.max(b),
                _ => merged.push((a, b)),
            }
        }
        Coverage { spans: merged }
    }

    /// The spans, as epochs.
    pub fn spans(&self) -> impl Iterator<Item = (Epoch, Epoch)> + '_ {
        self.spans.iter().map(|&(a, b)| {
            (
                Epoch::from_days_since_j2000_tdb(a),
                Epoch::from_days_since_j2000_tdb(b),
            )
        })
    }

    /// Whether nothing is covered.
    pub fn is_empty(&self) -> bool {
        self.spans.is_empty()
    }

    /// Whether `t` lies in a span (ends included).
    pub fn contains(&self, t: &Epoch) -> bool {
        let d = t.days_since_j2000_tdb();
        self.spans.iter().any(|&(a, b)| a <= d && d <= b)
    }

    /// Whether every date from `start` to `end` is covered (one span holds
    /// both), the check a sweep makes for its whole grid before solving.
    pub fn covers(&self, start: &Epoch, end: &Epoch) -> bool {
        let (s, e) = (start.days_since_j2000_tdb(), end.days_since_j2000_tdb());
        self.spans.iter().any(|&(a, b)| a <= s && e <= b)
    }

    /// The dates covered by either.
    pub fn union(&self, other: &Coverage) -> Coverage {
        Coverage::from_spans(self.spans.iter().chain(other.spans.iter()).copied())
    }

    /// The dates covered by both.
    pub fn intersect(&self, other: &Coverage) -> Coverage {
        let mut out = Vec::new();
        for &(a, b) in &self.spans {
            for &(c, d) in &other.spans {
                let (lo, hi) = (a.max(c), b.min(d));
                if lo <= hi {
                    out.push((lo, hi));
                }
            }
        }
        Coverage::from_spans(out)
    }
}

impl fmt::Display for Coverage {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if self.spans.is_empty() {
            return f.write_str("no dates");
        }
        for (i, (a, b)) in self.spans().enumerate() {
            if i > 0 {
                f.write_str(", ")?;
            }
            write!(f, "{} .. {}", a.to_iso_tdb(), b.to_iso_tdb())?;
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn day(d: f64) -> Epoch {
        Epoch::from_days_since_j2000_tdb(d)
    }

    /// Set algebra on closed intervals (exact on these small integers).
    #[test]
    fn union_intersection_and_membership() {
        let c = Coverage::from_spans([(10.0, 20.0), (0.0, 5.0), (5.0, 7.0), (30.0, 29.0)]);
        assert_eq!(c.spans, vec![(0.0, 7.0), (10.0, 20.0)]);
        assert!(c.contains(&day(7.0)) && c.contains(&day(10.0)));
        assert!(!c.contains(&day(8.0)) && !c.contains(&day(-0.1)));
        assert!(c.covers(&day(11.0), &day(20.0)));
        assert!(!c.covers(&day(6.0), &day(11.0)), "a gap inside");
        let d = Coverage::from_spans([(3.0, 12.0)]);
        assert_eq!(c.intersect(&d).spans, vec![(3.0, 7.0), (10.0, 12.0)]);
        assert!(Coverage::from_spans([(f64::NAN, 1.0)]).is_empty());
    }

    #[test]
    fn prints_iso_dates() {
        let c = Coverage::from_spans([(-1461.5, -365.5), (9131.5, 18262.5)]);
        assert_eq!(
            c.to_string(),
            "1996-01-01T00:00:00 TDB .. 1999-01-01T00:00:00 TDB, \
             2025-01-01T00:00:00 TDB .. 2050-01-01T00:00:00 TDB"
        );
        assert_eq!(Coverage::default().to_string(), "no dates");
    }
}
