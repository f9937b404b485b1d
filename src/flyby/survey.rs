//! The sequence survey: every sequence of up to K flybys drawn from a list
//! of bodies, each searched, ranked by the objective.

use super::error::FlybyError;
use super::grid::GridStats;
use super::search::search_sequence;
use super::spec::{SequenceSpec, DEFAULT_MIN_ALTITUDE_KM};
use super::trajectory::Trajectory;
use crate::ephemeris::System;

/// Most sequences one survey searches (a guard against a request that
/// would run for days: each sequence is a full search).
pub const MAX_SEQUENCES: u64 = 10_000;

/// A survey: departure and arrival bodies, candidate flyby bodies, and a
/// template for every search.
#[derive(Debug, Clone, PartialEq)]
pub struct SurveySpec {
    /// Departure body index.
    pub from: usize,
    /// Arrival body index.
    pub to: usize,
    /// Candidate flyby bodies, in the order sequences are enumerated.
    pub via_any: Vec<usize>,
    /// Most flybys in a sequence (0 gives the direct transfer alone).
    pub max_flybys: usize,
    /// Minimum flyby altitude per candidate body (parallel to
    /// `via_any`), km; empty: [`DEFAULT_MIN_ALTITUDE_KM`] for each.
    pub min_altitude_km: Vec<f64>,
    /// Most complete revolutions searched on every leg.
    pub max_revs: u32,
    /// Dates, step, ceilings, bounds, endpoints, launch term and
    /// refinement settings for every search. Its `bodies` and per-leg and
    /// per-flyby lists are replaced for each sequence (times of flight
    /// from each leg's Hohmann time).
    pub template: SequenceSpec,
}

/// One surveyed sequence.
#[derive(Debug, Clone, PartialEq)]
pub struct SurveyRow {
    /// Body indices: departure, flybys, arrival.
    pub bodies: Vec<usize>,
    /// The best refined trajectory, if any is feasible.
    pub best: Option<Trajectory>,
    /// Counts of the sequence's grid stage.
    pub stats: GridStats,
    /// Why the sequence could not be searched (e.g. its grid is too
    /// large), if so; the other sequences are still searched.
    pub error: Option<FlybyError>,
}

impl SurveyRow {
    /// The best objective, km/s, if a trajectory was found.
    pub fn dv_total_km_s(&self) -> Option<f64> {
        self.best.as_ref().map(|t| t.dv_total_km_s)
    }
}

/// The ranked survey: feasible sequences by ascending objective (ties in
/// enumeration order), then the sequences without a feasible trajectory
/// in enumeration order.
#[derive(Debug, Clone, PartialEq)]
pub struct SurveyTable {
    /// One row per sequence.
    pub rows: Vec<SurveyRow>,
}

/// The sequences a survey searches: `from`, then 0 to `max_flybys`
/// bodies from `via_any`, then `to`, never the same body twice in a row
/// (a back-to-back return to the same body is left to an explicit
/// sequence with its own time-of-flight range). Fewer flybys first, then
/// in the order of `via_any`.
pub fn sequences(from: usize, to: usize, via_any: &[usize], max_flybys: usize) -> Vec<Vec<usize>> {
    let mut out = Vec::new();
    let mut level: Vec<Vec<usize>> = vec![vec![from]];
    for k in 0..=max_flybys {
        out.extend(level.iter().filter(|s| s.last() != Some(&to)).map(|s| {
            let mut full = s.clone();
            full.push(to);
            full
        }));
        if k == max_flybys {
            break;
        }
        let mut next = Vec::new();
        for s in &level {
            for &v in via_any {
                if s.last() != Some(&v) {
                    let mut longer = s.clone();
                    longer.push(v);
                    next.push(longer);
                }
            }
        }
        level = next;
    }
    out
}

/// Searches every sequence of a survey and ranks them.
///
/// # Method
/// [`sequences`] enumerates; each sequence runs [`search_sequence`] with
/// the template's settings; rows are ranked by the best refined
/// objective (see [`search_sequence`] for its terms).
///
/// # Errors
/// [`FlybyError::NoCandidates`] when flybys are asked for without
/// candidate bodies; [`FlybyError::TooManySequences`] past
/// [`MAX_SEQUENCES`]; [`FlybyError::Count`] when the altitude list does not
/// match the candidates; [`FlybyError::UnknownBody`] for an index outside
/// the system; [`FlybyError::MissingBodyValue`] for a candidate without GM
/// or radius. Errors of one sequence's search (a grid too large) are kept
/// in its row instead.
pub fn survey(system: &System, spec: &SurveySpec) -> Result<SurveyTable, FlybyError> {
    if spec.max_flybys > 0 && spec.via_any.is_empty() {
        return Err(FlybyError::NoCandidates {
            max_flybys: spec.max_flybys,
        });
    }
    // An upper bound on the count, sum of n^k, before any allocation.
    let mut count = 0u64;
    let mut level = 1u64;
    for _ in 0..=spec.max_flybys.min(64) {
        count = count.saturating_add(level);
        level = level.saturating_mul(spec.via_any.len() as u64);
    }
    if count > MAX_SEQUENCES || spec.max_flybys > 64 && !spec.via_any.is_empty() {
        return Err(FlybyError::TooManySequences {
            limit: MAX_SEQUENCES,
        });
    }
    let n = system.bodies.len();
    for &b in spec.via_any.iter().chain([&spec.from, &spec.to]) {
        if b >= n {
            return Err(FlybyError::UnknownBody { index: b, count: n });
        }
    }
    let alts = match spec.min_altitude_km.len() {
        0 => vec![DEFAULT_MIN_ALTITUDE_KM; spec.via_any.len()],
        m if m == spec.via_any.len() => spec.min_altitude_km.clone(),
        m => {
            return Err(FlybyError::Count {
                what: "minimum flyby altitudes",
                per: "candidate flyby body",
                expected: spec.via_any.len(),
                got: m,
            })
        }
    };
    for (&b, &alt) in spec.via_any.iter().zip(&alts) {
        super::model::FlybyBody::of_body(&system.bodies[b], alt)?;
    }
    let altitude_of = |b: usize| {
        spec.via_any
            .iter()
            .position(|&v| v == b)
            .map_or(DEFAULT_MIN_ALTITUDE_KM, |i| alts[i])
    };
    let mut rows: Vec<SurveyRow> = sequences(spec.from, spec.to, &spec.via_any, spec.max_flybys)
        .into_iter()
        .map(|bodies| {
            let legs = bodies.len() - 1;
            let s = SequenceSpec {
                tof_days: Vec::new(),
                max_revs: vec![spec.max_revs; legs],
                min_altitude_km: bodies[1..legs].iter().map(|&b| altitude_of(b)).collect(),
                bodies: bodies.clone(),
                ..spec.template.clone()
            };
            match search_sequence(system, &s) {
                Ok(found) => SurveyRow {
                    bodies,
                    best: found.trajectories.into_iter().next(),
                    stats: found.stats,
                    error: None,
                },
                Err(e) => SurveyRow {
                    bodies,
                    best: None,
                    stats: GridStats::default(),
                    error: Some(e),
                },
            }
        })
        .collect();
    // Stable sort: ties and infeasible rows keep enumeration order.
    rows.sort_by(|a, b| match (a.dv_total_km_s(), b.dv_total_km_s()) {
        (Some(x), Some(y)) => x.total_cmp(&y),
        (Some(_), None) => std::cmp::Ordering::Less,
        (None, Some(_)) => std::cmp::Ordering::Greater,
        (None, None) => std::cmp::Ordering::Equal,
    });
    Ok(SurveyTable { rows })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn enumeration_counts_and_order() {
        // from 0, to 9, candidates 1 and 2: direct; 0-1-9, 0-2-9;
        // 0-1-2-9, 0-2-1-9 (no body twice in a row).
        let s = sequences(0, 9, &[1, 2], 2);
        assert_eq!(
            s,
            vec![
                vec![0, 9],
                vec![0, 1, 9],
                vec![0, 2, 9],
                vec![0, 1, 2, 9],
                vec![0, 2, 1, 9],
            ]
        );
        // A candidate equal to the departure body may follow a different
        // one: E-V-E-J.
        let s = sequences(0, 3, &[0, 1], 2);
        assert!(s.contains(&vec![0, 1, 0, 3]));
        assert!(!s.iter().any(|q| q.windows(2).any(|w| w[0] == w[1])));
        // n candidates, K flybys, no repeats in a row: 1 + n + n(n-1) + ...
        // when neither end is a candidate.
        let s = sequences(10, 11, &[1, 2, 3], 3);
        assert_eq!(s.len(), 1 + 3 + 3 * 2 + 3 * 2 * 2);
    }
}
