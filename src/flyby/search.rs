//! The sequence search: grid, then refinement of the best candidates.

use rayon::prelude::*;

use super::error::FlybyError;
use super::grid::{self, GridStats};
use super::spec::{resolve, SequenceSpec};
use super::trajectory::{refine, Trajectory};
use crate::ephemeris::System;
use crate::time::Epoch;

/// Refined trajectories departing closer than this are one trajectory,
/// days (about 9 s: far below any grid step).
const MIN_APART_DAYS: f64 = 1e-4;

/// What a sequence search found.
#[derive(Debug, Clone, PartialEq)]
pub struct SearchResult {
    /// Refined trajectories, best objective first (at most
    /// [`SequenceSpec::refine_count`]; empty when no chain on the grid is
    /// feasible).
    pub trajectories: Vec<Trajectory>,
    /// For every departure date of the grid, the best objective of any
    /// chain leaving then, km/s (`None`: no feasible chain). Grid values,
    /// not refined.
    pub best_by_departure: Vec<(Epoch, Option<f64>)>,
    /// Counts of the grid stage.
    pub stats: GridStats,
}

/// Searches one sequence of bodies over a grid of dates and refines the
/// best candidates.
///
/// # Method
/// The grid stage (every leg solved once per
/// pair of grid dates by Izzo's (2015) Lambert solver, legs matched at
/// each flyby date by dynamic programming with speed-window, lower-bound
/// and turn-angle pruning), then, for the best departure dates at least
/// [`SequenceSpec::separation_days`] apart, block-coordinate Nelder-Mead
/// refinement on continuous dates; refined trajectories that end up
/// departing closer than the separation are merged (the best kept). The objective, km/s: the launch term
/// ([`LaunchTerm`](super::spec::LaunchTerm)) + every flyby's periapsis
/// impulse ([`model`](super::model)) + the capture burn into the capture
/// orbit when one is given, else the arrival v-infinity. Limits: C3 and
/// arrival v-infinity ceilings, each flyby's minimum altitude; on the grid
/// also the flyby impulse bound.
///
/// Deterministic: the same result for any number of threads.
///
/// # Errors
/// [`FlybyError`] for a spec that does not fit the system (see
/// [`SequenceSpec`]), naming the value at fault.
///
/// # Example
/// Teodra -> Vell -> Kesh in the invented demo system, departures from
/// July 2033 to February 2034 every 5 days:
/// ```
/// use synodic::ephemeris::System;
/// use synodic::flyby::{search_sequence, SequenceSpec, Verdict};
/// use synodic::time::Epoch;
///
/// let system = System::demo();
/// let bodies = vec![system.find("Teodra")?, system.find("Vell")?, system.find("Kesh")?];
/// let first = Epoch::parse("2033-07-01")?;
/// let mut spec = SequenceSpec::new(bodies, first, first.plus_days(240.0), 5.0);
/// spec.c3_max_km2_s2 = Some(30.0); // km^2/s^2
/// let found = search_sequence(&system, &spec)?;
/// let best = &found.trajectories[0];
/// let vell = &best.flybys[0];
/// assert!(vell.verdict != Verdict::BelowMinimumAltitude);
/// assert!(vell.altitude_km >= 300.0); // the default minimum, km
/// assert!(best.dv_total_km_s <= best.grid_total_km_s); // refined, km/s
/// println!(
///     "{}: C3 {:.1}, Vell flyby turn {:.1} deg at {:.0} km, impulse {:.3} km/s",
///     best.encounters[0].date_tdb(),
///     best.c3_km2_s2,
///     vell.turn_deg,
///     vell.altitude_km,
///     vell.dv_km_s
/// );
/// # Ok::<(), Box<dyn std::error::Error>>(())
/// ```
pub fn search_sequence(system: &System, spec: &SequenceSpec) -> Result<SearchResult, FlybyError> {
    let plan = resolve(system, spec)?;
    let g = grid::run(system, &plan);
    let mut trajectories: Vec<Trajectory> = g
        .candidates
        .par_iter()
        .filter_map(|c| refine(system, &plan, c))
        .collect();
    trajectories.sort_by(|a, b| {
        a.dv_total_km_s.total_cmp(&b.dv_total_km_s).then(
            a.encounters[0]
                .days_since_j2000_tdb()
                .total_cmp(&b.encounters[0].days_since_j2000_tdb()),
        )
    });
    // Candidates seeded apart may refine onto the same trajectory: keep
    // the best of those departing within the separation of each other.
    let apart = spec.separation_days.max(MIN_APART_DAYS);
    let mut kept: Vec<Trajectory> = Vec::with_capacity(trajectories.len());
    for t in trajectories {
        let d = t.encounters[0].days_since_j2000_tdb();
        if kept
            .iter()
            .all(|k| (k.encounters[0].days_since_j2000_tdb() - d).abs() >= apart)
        {
            kept.push(t);
        }
    }
    let trajectories = kept;
    let best_by_departure = g
        .best_by_departure
        .iter()
        .enumerate()
        .map(|(i, &v)| {
            (
                Epoch::from_days_since_j2000_tdb(plan.day(i as u32)),
                v.is_finite().then_some(v),
            )
        })
        .collect();
    Ok(SearchResult {
        trajectories,
        best_by_departure,
        stats: g.stats,
    })
}
