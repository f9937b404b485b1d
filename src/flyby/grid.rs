//! The date-grid stage of the sequence search: every leg solved once per
//! pair of grid dates, then legs matched at each flyby date.
//!
//! # Method
//! Encounter `k` of a sequence may fall on grid dates `lo_k ..= hi_k`
//! (the departure span, widened by each earlier leg's time-of-flight
//! range). Leg `k` is solved by Lambert's problem (Izzo 2015, through
//! [`crate::transfer::arcs_between`], the single-transfer computation) for
//! every departure date and every time of flight of its range, once; arcs that break the C3 ceiling (first leg) or the
//! arrival v-infinity ceiling (last leg) are dropped at once.
//!
//! The objective is a sum along the chain: the launch term of the first
//! arc, one periapsis impulse per flyby (which depends only on the two
//! arcs meeting there), and the arrival term of the last arc. So the best
//! completion of a chain from any arc onwards follows from the best
//! completions of the arcs leaving on its arrival date: dynamic
//! programming over the legs (R. Bellman, *Dynamic Programming*,
//! Princeton 1957), exact on the grid, with no enumeration of full date
//! tuples. It runs backwards, from the arrival, so that every first arc
//! gets its own best completion: the best objective for each departure
//! date is then exact too (a forward pass keeps one chain per arc and
//! loses departures dominated at every later arc).
//!
//! Matching at a flyby date prunes in four steps: outgoing arcs are read
//! in order of their cost to go, and the reading stops at the first that
//! costs as much as the best completion found (impulses are never
//! negative); arcs outside the
//! [`matching_speed_window`](super::model::matching_speed_window) of the
//! incoming arc's speed are skipped; so are those whose lower bound on the
//! impulse (its value at the minimum periapsis) cannot beat the best; the
//! turn reachable at the minimum periapsis, compared through cosines with
//! the halves precomputed per arc, rejects the rest before any root
//! finding.
//!
//! Work is split over dates with rayon; every minimum is taken in a fixed
//! order with ties broken by arc index, so results are the same for any
//! thread count.

use nalgebra::Vector3;
use rayon::prelude::*;

use super::model::{matching_speed_window, periapsis_dv_km_s, quick_dv_km_s};
use super::spec::Plan;
use crate::ephemeris::System;
use crate::lambert::Branch;
use crate::time::Epoch;
use crate::transfer::{arcs_between, Endpoints};

/// One solved leg on the grid.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Arc {
    /// Departure and arrival grid indices.
    pub dep: u32,
    pub arr: u32,
    pub revs: u8,
    pub branch: Branch,
    /// Departure and arrival v-infinity, km/s (single precision: the grid
    /// only ranks; refinement recomputes in double precision).
    pub vd: [f32; 3],
    pub va: [f32; 3],
}

impl Arc {
    fn vd(&self) -> Vector3<f64> {
        Vector3::new(self.vd[0].into(), self.vd[1].into(), self.vd[2].into())
    }
    fn va(&self) -> Vector3<f64> {
        Vector3::new(self.va[0].into(), self.va[1].into(), self.va[2].into())
    }
}

/// Counts of the grid stage, for the pruning ratio.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct GridStats {
    /// Lambert problems posed (one per leg, departure date and time of
    /// flight).
    pub arcs_solved: u64,
    /// Arcs kept: solutions (up to `1 + 2 M` per problem with `M`
    /// revolutions allowed) within the C3 and arrival ceilings.
    pub arcs_kept: u64,
    /// Pairs of arcs meeting at a flyby date (incoming x outgoing, summed
    /// over flyby dates): what a full enumeration would evaluate.
    pub pairs_possible: u64,
    /// Pairs read before the cost cut-off, inside the speed window and
    /// not beaten by the impulse's lower bound: those whose turn was
    /// checked.
    pub pairs_examined: u64,
    /// Examined pairs flyable within the impulse bound.
    pub pairs_feasible: u64,
    /// First-leg arcs with a feasible completion to the arrival (each
    /// the start of the best chain through it).
    pub chains: u64,
}

/// The best completion from each arc of one leg to the arrival.
struct Stage {
    arcs: Vec<Arc>,
    /// Objective from this arc's flyby (or arrival) onwards, km/s
    /// (infinite: no feasible completion).
    cost: Vec<f64>,
    /// Index of the next leg's arc in the best completion.
    next: Vec<u32>,
}

/// A complete chain picked from the grid.
#[derive(Debug, Clone, PartialEq)]
pub(crate) struct Chain {
    /// Encounter dates, days past J2000 TDB.
    pub days: Vec<f64>,
    /// Revolutions and branch of each leg.
    pub solutions: Vec<(u32, Branch)>,
    /// Objective on the grid, km/s.
    pub total_km_s: f64,
}

/// What the grid stage returns.
pub(crate) struct GridResult {
    pub stats: GridStats,
    /// Per departure date of the grid: the best objective of any chain
    /// leaving then (infinite: none).
    pub best_by_departure: Vec<f64>,
    /// The chosen candidates, best first.
    pub candidates: Vec<Chain>,
}

/// Runs the grid stage.
pub(crate) fn run(system: &System, plan: &Plan) -> GridResult {
    let mut stats = GridStats::default();
    let n_legs = plan.legs.len();
    let legs: Vec<Vec<Arc>> = (0..n_legs)
        .map(|k| solve_leg(system, plan, k, &mut stats))
        .collect();
    let mut stages: Vec<Stage> = Vec::with_capacity(n_legs);
    for (k, arcs) in legs.into_iter().enumerate().rev() {
        let stage = match stages.last() {
            None => Stage {
                cost: arcs.iter().map(|a| plan.arrive_dv(norm(&a.va))).collect(),
                next: vec![u32::MAX; arcs.len()],
                arcs,
            },
            Some(after) => link(plan, k, arcs, after, &mut stats),
        };
        stages.push(stage);
    }
    stages.reverse();
    let first = &stages[0];
    let mut best_by_departure = vec![f64::INFINITY; plan.depart_count as usize];
    let mut best_arc = vec![u32::MAX; best_by_departure.len()];
    for (i, a) in first.arcs.iter().enumerate() {
        let c = first.cost[i];
        if !c.is_finite() {
            continue;
        }
        stats.chains += 1;
        let total = plan.launch_dv(norm(&a.vd)) + c;
        let o = a.dep as usize;
        if total < best_by_departure[o] {
            best_by_departure[o] = total;
            best_arc[o] = i as u32;
        }
    }
    let picks = pick(plan, &best_by_departure);
    let candidates = picks
        .into_iter()
        .map(|o| follow(plan, &stages, best_arc[o], best_by_departure[o]))
        .collect();
    GridResult {
        stats,
        best_by_departure,
        candidates,
    }
}

fn norm(v: &[f32; 3]) -> f64 {
    let (x, y, z) = (f64::from(v[0]), f64::from(v[1]), f64::from(v[2]));
    (x * x + y * y + z * z).sqrt()
}

fn to_f32(v: &Vector3<f64>) -> [f32; 3] {
    [v.x as f32, v.y as f32, v.z as f32]
}

/// Solves leg `k` for every departure date and time of flight, in
/// departure order, keeping the arcs inside the ceilings.
///
/// Each arc is [`arcs_between`], the computation of a single transfer, so
/// grid legs and reported legs cannot disagree.
fn solve_leg(system: &System, plan: &Plan, k: usize, stats: &mut GridStats) -> Vec<Arc> {
    let leg = plan.legs[k];
    let (lo, hi) = plan.date_range(k);
    let first = k == 0;
    let last = k + 1 == plan.legs.len();
    let ends = Endpoints::bare();
    let rows: Vec<(Vec<Arc>, u64)> = (lo..=hi)
        .into_par_iter()
        .map(|p| {
            let depart = Epoch::from_days_since_j2000_tdb(plan.day(p));
            let mut row = Vec::new();
            let mut solved = 0u64;
            for q in leg.q_min..=leg.q_max {
                let arr = p + q;
                let arrive = Epoch::from_days_since_j2000_tdb(plan.day(arr));
                solved += 1;
                let Ok(found) = arcs_between(
                    system,
                    leg.from,
                    leg.to,
                    &depart,
                    &arrive,
                    &ends,
                    leg.max_revs,
                ) else {
                    continue;
                };
                for (f, sol) in found {
                    // Arcs through the central body or beyond physical
                    // meaning never join a sequence.
                    if f.flags.excludes() {
                        continue;
                    }
                    if first && !plan.c3_ok(f.vinf_depart_km_s) {
                        continue;
                    }
                    if last && !plan.arrive_ok(f.vinf_arrive_km_s) {
                        continue;
                    }
                    row.push(Arc {
                        dep: p,
                        arr,
                        revs: sol.revs.min(255) as u8,
                        branch: sol.branch,
                        vd: to_f32(&f.vinf_depart),
                        va: to_f32(&f.vinf_arrive),
                    });
                }
            }
            (row, solved)
        })
        .collect();
    let mut arcs = Vec::with_capacity(rows.iter().map(|r| r.0.len()).sum());
    for (row, solved) in rows {
        stats.arcs_solved += solved;
        arcs.extend(row);
    }
    stats.arcs_kept += arcs.len() as u64;
    arcs
}

/// An outgoing arc as the matching loop reads it.
#[derive(Debug, Clone, Copy)]
struct Out {
    /// Cost to go, km/s.
    cost: f64,
    /// Departure v-infinity, km/s, and its vector.
    speed: f64,
    v: Vector3<f64>,
    /// Sine and cosine of the half turn at the minimum periapsis.
    sin: f64,
    cos: f64,
    /// Index in the next stage.
    index: u32,
}

/// Sine and cosine of the half turn `asin(1 / e)` of a hyperbola of excess
/// speed `v` at periapsis `rp` (Curtis 2010 sec. 8.9: `sin = 1 / e`, `e =
/// 1 + rp v^2 / mu`).
fn half_turn_sin_cos(rp: f64, v: f64, mu: f64) -> (f64, f64) {
    let sin = mu / (mu + rp * v * v);
    (sin, (1.0 - sin * sin).max(0.0).sqrt())
}

/// The best completion from each arc of leg `k`, given those of leg
/// `k + 1` (`after`): the flyby at the end of leg `k` plus the best
/// completion of an arc leaving then.
fn link(plan: &Plan, k: usize, arcs: Vec<Arc>, after: &Stage, stats: &mut GridStats) -> Stage {
    let body = plan.flybys[k];
    let (mu, rmin) = (body.mu_km3_s2, body.min_periapsis_km());
    let dmax = plan.max_flyby_dv;
    let (lo, hi) = plan.date_range(k + 1);
    let n_dates = (hi - lo + 1) as usize;
    // Outgoing arcs with a feasible completion, grouped by departure date
    // and sorted by their cost to go (ties by index, for a fixed order).
    let mut outgoing: Vec<Vec<Out>> = vec![Vec::new(); n_dates];
    for (i, a) in after.arcs.iter().enumerate() {
        if after.cost[i].is_finite() {
            let v = a.vd();
            let (sin, cos) = half_turn_sin_cos(rmin, v.norm(), mu);
            outgoing[(a.dep - lo) as usize].push(Out {
                cost: after.cost[i],
                speed: v.norm(),
                sin,
                cos,
                v,
                index: i as u32,
            });
        }
    }
    outgoing
        .par_iter_mut()
        .for_each(|v| v.sort_by(|x, y| x.cost.total_cmp(&y.cost).then(x.index.cmp(&y.index))));
    // Incoming arcs (this leg) grouped by arrival date, in index order.
    let mut incoming: Vec<Vec<u32>> = vec![Vec::new(); n_dates];
    for (i, a) in arcs.iter().enumerate() {
        incoming[(a.arr - lo) as usize].push(i as u32);
    }
    type Row = (Vec<(u32, f64, u32)>, [u64; 3]);
    let rows: Vec<Row> = (0..n_dates)
        .into_par_iter()
        .map(|d| {
            let outs = &outgoing[d];
            let ins = &incoming[d];
            let mut counts = [(ins.len() * outs.len()) as u64, 0, 0];
            let row = ins
                .iter()
                .map(|&i| {
                    let vin = arcs[i as usize].va();
                    let a = vin.norm();
                    let (wlo, whi) = matching_speed_window(a, rmin, mu, dmax);
                    let (sin_a, cos_a) = half_turn_sin_cos(rmin, a, mu);
                    let mut best = (f64::INFINITY, u32::MAX);
                    for out in outs {
                        // Impulses are never negative: no later (dearer)
                        // completion can win.
                        if out.cost >= best.0 {
                            break;
                        }
                        let b = out.speed;
                        if b < wlo
                            || b > whi
                            || out.cost + periapsis_dv_km_s(rmin, a, b, mu) >= best.0
                        {
                            continue;
                        }
                        counts[1] += 1;
                        // The turn must not exceed what the two hyperbolas
                        // give at the minimum periapsis: cos(turn) >=
                        // cos(half_a + half_b), with a rounding margin (the
                        // exact test follows in `quick_dv_km_s`).
                        let reach_cos = cos_a * out.cos - sin_a * out.sin;
                        if vin.dot(&out.v) < a * b * (reach_cos - 1e-12) {
                            continue;
                        }
                        if let Some(dv) = quick_dv_km_s(&vin, &out.v, mu, rmin) {
                            if dv <= dmax {
                                counts[2] += 1;
                                let c = out.cost + dv;
                                if c < best.0 || (c <= best.0 && out.index < best.1) {
                                    best = (c, out.index);
                                }
                            }
                        }
                    }
                    (i, best.0, best.1)
                })
                .collect();
            (row, counts)
        })
        .collect();
    let mut cost = vec![f64::INFINITY; arcs.len()];
    let mut next = vec![u32::MAX; arcs.len()];
    for (row, counts) in rows {
        stats.pairs_possible += counts[0];
        stats.pairs_examined += counts[1];
        stats.pairs_feasible += counts[2];
        for (i, c, j) in row {
            cost[i as usize] = c;
            next[i as usize] = j;
        }
    }
    Stage { arcs, cost, next }
}

/// Departure dates to refine: the best first, then each next best whose
/// departure lies at least the separation from every one already taken.
fn pick(plan: &Plan, best_by_departure: &[f64]) -> Vec<usize> {
    let mut order: Vec<usize> = (0..best_by_departure.len())
        .filter(|&o| best_by_departure[o].is_finite())
        .collect();
    order.sort_by(|&a, &b| {
        best_by_departure[a]
            .total_cmp(&best_by_departure[b])
            .then(a.cmp(&b))
    });
    let mut taken: Vec<usize> = Vec::new();
    for o in order {
        if taken.len() >= plan.refine_count {
            break;
        }
        let apart = |t: &usize| (t.abs_diff(o) as f64) * plan.step_days >= plan.separation_days;
        if taken.iter().all(apart) {
            taken.push(o);
        }
    }
    taken
}

/// The chain that starts with arc `first_arc` of the first leg and
/// follows the best completions.
fn follow(plan: &Plan, stages: &[Stage], first_arc: u32, total_km_s: f64) -> Chain {
    let mut idx = first_arc as usize;
    let mut picked = Vec::with_capacity(stages.len());
    for (k, stage) in stages.iter().enumerate() {
        picked.push(stage.arcs[idx]);
        if k + 1 < stages.len() {
            idx = stage.next[idx] as usize;
        }
    }
    let mut days = vec![plan.day(picked[0].dep)];
    days.extend(picked.iter().map(|a| plan.day(a.arr)));
    Chain {
        days,
        solutions: picked
            .iter()
            .map(|a| (u32::from(a.revs), a.branch))
            .collect(),
        total_km_s,
    }
}
