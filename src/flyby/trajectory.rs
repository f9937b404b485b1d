//! A multi-leg trajectory on continuous dates: its figures, its objective,
//! and its refinement from a grid candidate.

use super::grid::Chain;
use super::model::{evaluate, FlybyFigures};
use super::spec::Plan;
use crate::ephemeris::System;
use crate::lambert::Branch;
use crate::time::Epoch;
use crate::transfer::{Endpoints, Figures, Leg};
use crate::windows::nelder_mead;

/// Passes of pairwise refinement over the legs, at most. Each pass moves
/// every pair of neighbouring encounter dates; four to six passes settle
/// the three- and four-leg sequences tried (common practice, no source).
const MAX_PASSES: usize = 8;

/// A pass that gains less than this stops the refinement, km/s (0.1 mm/s,
/// far below the model's accuracy).
const PASS_GAIN_KM_S: f64 = 1e-7;

/// Simplex tolerance on dates, days (about 1 s), and its evaluation cap
/// per pair; the same tolerance the window refinement uses.
const DATE_TOL_DAYS: f64 = 1e-5;
const MAX_EVALS: u32 = 600;

/// Date limits are met within this many days (about 0.1 ms), so grid
/// dates a rounding away from a limit stay inside.
const SLACK_DAYS: f64 = 1e-9;

/// One gravity-assist trajectory: every leg, every flyby and the totals.
///
/// # Units
/// As the fields say; dates are TDB.
#[derive(Debug, Clone, PartialEq)]
pub struct Trajectory {
    /// Body indices: departure, flyby bodies, arrival.
    pub bodies: Vec<usize>,
    /// Encounter dates, one per body (departure first).
    pub encounters: Vec<Epoch>,
    /// Each leg's transfer figures. The first leg's C3, DLA and RLA are
    /// the launch's (departure body's frame); the last leg's arrival
    /// figures are the arrival's (arrival body's frame). A leg's
    /// `dv_*` fields follow that leg's own endpoints and are not the
    /// trajectory's; use the totals below.
    pub legs: Vec<Figures>,
    /// Each flyby, in order.
    pub flybys: Vec<FlybyFigures>,
    /// Launch C3, km^2/s^2.
    pub c3_km2_s2: f64,
    /// Arrival v-infinity, km/s.
    pub vinf_arrive_km_s: f64,
    /// The launch's share of the objective, km/s (see
    /// [`LaunchTerm`](super::spec::LaunchTerm)).
    pub dv_launch_km_s: f64,
    /// Sum of the flybys' periapsis impulses, km/s.
    pub dv_flybys_km_s: f64,
    /// Capture burn, or the arrival v-infinity without a capture orbit,
    /// km/s.
    pub dv_arrive_km_s: f64,
    /// The objective: launch + flybys + arrival, km/s.
    pub dv_total_km_s: f64,
    /// The objective of the grid candidate this was refined from, km/s.
    pub grid_total_km_s: f64,
    /// Whether every simplex of the last refinement pass converged.
    pub converged: bool,
}

/// The endpoints that leg `k` is computed with.
fn leg_ends(plan: &Plan, k: usize) -> Endpoints {
    let n = plan.legs.len();
    if k == 0 {
        plan.first_ends
    } else if k + 1 == n {
        plan.last_ends
    } else {
        Endpoints::bare()
    }
}

/// The whole trajectory at the given encounter dates (days past J2000
/// TDB), each leg on the given revolutions and branch; `None` when a leg
/// has no such solution or a limit is broken (departure outside the span,
/// time of flight outside its range, C3 or arrival ceiling, a flyby below
/// its minimum altitude).
pub(crate) fn at_dates(
    system: &System,
    plan: &Plan,
    days: &[f64],
    solutions: &[(u32, Branch)],
) -> Option<Trajectory> {
    let slack = SLACK_DAYS;
    if !(days[0] >= plan.t0_days - slack && days[0] <= plan.depart_last_days + slack) {
        return None;
    }
    let mut legs = Vec::with_capacity(plan.legs.len());
    for (k, lp) in plan.legs.iter().enumerate() {
        let tof = days[k + 1] - days[k];
        if !(tof >= lp.tof_min_days - slack && tof <= lp.tof_max_days + slack) {
            return None;
        }
        let leg = Leg {
            system,
            from: lp.from,
            to: lp.to,
            ends: leg_ends(plan, k),
            allow_flagged: false,
        };
        let (revs, branch) = solutions[k];
        let figures = leg.figures(revs, branch, days[k], days[k + 1])?;
        // An arc through the central body (or beyond physical meaning) is
        // never part of a reported trajectory.
        if !leg.admits(&figures) {
            return None;
        }
        legs.push(figures);
    }
    let first = legs.first()?;
    let last = legs.last()?;
    if !plan.c3_ok(first.vinf_depart_km_s) || !plan.arrive_ok(last.vinf_arrive_km_s) {
        return None;
    }
    let mut flybys = Vec::with_capacity(plan.flybys.len());
    for (j, body) in plan.flybys.iter().enumerate() {
        let f = evaluate(
            &legs[j].vinf_arrive,
            &legs[j + 1].vinf_depart,
            body,
            plan.unpowered_tol,
        )
        .ok()?;
        if !f.verdict.is_feasible() {
            return None;
        }
        flybys.push(f);
    }
    let dv_launch = plan.launch_dv(first.vinf_depart_km_s);
    let dv_flybys: f64 = flybys.iter().map(|f| f.dv_km_s).sum();
    let dv_arrive = plan.arrive_dv(last.vinf_arrive_km_s);
    let total = dv_launch + dv_flybys + dv_arrive;
    Some(Trajectory {
        bodies: plan.bodies.clone(),
        encounters: days
            .iter()
            .map(|&d| Epoch::from_days_since_j2000_tdb(d))
            .collect(),
        c3_km2_s2: first.c3_km2_s2,
        vinf_arrive_km_s: last.vinf_arrive_km_s,
        legs,
        flybys,
        dv_launch_km_s: dv_launch,
        dv_flybys_km_s: dv_flybys,
        dv_arrive_km_s: dv_arrive,
        dv_total_km_s: total,
        grid_total_km_s: total,
        converged: true,
    })
}

/// Refines a grid chain on continuous dates.
///
/// # Method
/// Block-coordinate descent over pairs of neighbouring encounter dates:
/// each pass runs the Nelder & Mead (1965) simplex
/// ([`nelder_mead`]) on `(t_k, t_k+1)` for every leg `k` in turn, the other
/// dates held, on the full double-precision objective ([`at_dates`]);
/// passes repeat until one gains less than [`PASS_GAIN_KM_S`] or after
/// [`MAX_PASSES`]. Every step keeps the best point, so the result is never
/// worse than the start. Revolutions and branches stay those of the grid.
pub(crate) fn refine(system: &System, plan: &Plan, chain: &Chain) -> Option<Trajectory> {
    let sols = &chain.solutions;
    let f = |days: &[f64]| {
        at_dates(system, plan, days, sols).map_or(f64::INFINITY, |t| t.dv_total_km_s)
    };
    let mut x = chain.days.clone();
    let mut fx = f(&x);
    if !fx.is_finite() {
        return None;
    }
    let h = 0.5 * plan.step_days;
    let mut converged = true;
    for _ in 0..MAX_PASSES {
        let before = fx;
        converged = true;
        for k in 0..plan.legs.len() {
            let mut y = x.clone();
            let m = nelder_mead(
                |p| {
                    y[k] = p[0];
                    y[k + 1] = p[1];
                    f(&y)
                },
                [x[k], x[k + 1]],
                [h, h],
                DATE_TOL_DAYS,
                MAX_EVALS,
            );
            converged &= m.converged;
            if m.value < fx {
                x[k] = m.x[0];
                x[k + 1] = m.x[1];
                fx = m.value;
            }
        }
        if before - fx < PASS_GAIN_KM_S {
            break;
        }
    }
    let mut t = at_dates(system, plan, &x, sols)?;
    t.grid_total_km_s = chain.total_km_s;
    t.converged = converged;
    Some(t)
}
