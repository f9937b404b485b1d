//! Finding, refining and tabulating transfer opportunities.
//!
//! A grid (from [`crate::sweep`]) gives candidate minima: cells whose
//! objective is no higher than any solved neighbour of the same Type and
//! solution layer. Each candidate is refined continuously on the Lambert
//! objective itself (not on an interpolated grid) with Nelder-Mead,
//! staying inside the date and time-of-flight limits and on the same Type.
//! Candidates next to the 180-degree ridge between Type I and Type II are
//! kept apart and reported only as flagged `ridge` rows, never in place of
//! an interior optimum: transfers there are ill-conditioned (the transfer
//! plane swings wildly).
//!
//! [`scan`] brackets every opportunity of a span from the synodic period
//! ([`crate::opportunity`]), tiles the span with one departure window per
//! opportunity so none can be missed, sweeps each at a coarse step and
//! refines. [`launch`] turns an optimum and a C3 ceiling into launch
//! periods.

pub mod launch;
mod simplex;

pub use simplex::{golden, nelder_mead, Minimum2};

use crate::opportunity::next_opportunity;
use crate::sweep::{self, Axis, Grid, Layer, Objective, RunOptions, SecondAxis, SweepSpec};
use crate::time::Epoch;
use crate::transfer::{Figures, Leg, TransferType};

/// Where a search may go, days past J2000 TDB (dates) or days (time of
/// flight). Every limit is inclusive.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Bounds {
    /// Departure dates.
    pub depart: (f64, f64),
    /// Arrival dates, if limited.
    pub arrive: Option<(f64, f64)>,
    /// Times of flight, if limited.
    pub tof: Option<(f64, f64)>,
}

impl Bounds {
    /// Whether a departure/arrival pair lies inside every limit.
    pub fn contains(&self, depart_days: f64, arrive_days: f64) -> bool {
        let inside = |x: f64, (lo, hi): (f64, f64)| x >= lo && x <= hi;
        inside(depart_days, self.depart)
            && self.arrive.is_none_or(|a| inside(arrive_days, a))
            && self
                .tof
                .is_none_or(|t| inside(arrive_days - depart_days, t))
    }

    /// Whether a pair lies within `margin_days` of a limit.
    pub fn near_edge(&self, depart_days: f64, arrive_days: f64, margin_days: f64) -> bool {
        let near = |x: f64, (lo, hi): (f64, f64)| x - lo < margin_days || hi - x < margin_days;
        near(depart_days, self.depart)
            || self.arrive.is_some_and(|a| near(arrive_days, a))
            || self.tof.is_some_and(|t| near(arrive_days - depart_days, t))
    }
}

/// A refined optimum of one solution layer and Type.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Optimum {
    /// Solution layer (revolutions and branch).
    pub layer: Layer,
    /// Type I or II.
    pub kind: TransferType,
    /// Departure, days past J2000 TDB.
    pub depart_days: f64,
    /// Arrival, days past J2000 TDB.
    pub arrive_days: f64,
    /// The objective at the optimum.
    pub value: f64,
    /// The objective at the grid cell the refinement started from.
    pub grid_value: f64,
    /// All figures at the optimum.
    pub figures: Figures,
    /// Next to the 180-degree ridge: reported apart, flagged.
    pub ridge: bool,
    /// Within a grid step of a searched limit: the true optimum may lie
    /// beyond it.
    pub edge: bool,
}

/// A cell that is a local minimum of the objective on the grid.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Candidate {
    /// Layer index.
    pub layer: usize,
    /// Type of the cell.
    pub kind: TransferType,
    /// Departure index.
    pub i: usize,
    /// Second-axis index.
    pub j: usize,
    /// Objective value.
    pub value: f64,
    /// A solved neighbour has the other Type.
    pub ridge: bool,
    /// The cell is on the grid's border.
    pub border: bool,
}

/// Local minima of `objective` on `grid`: usable cells ([`Grid::usable`]:
/// ok, and not flagged `periapsis-inside` or `relativistic` unless the leg
/// allows flagged arcs) no higher than any usable neighbour (of the 8) of
/// the same layer and Type. Sorted by layer, Type, then value.
pub fn grid_candidates(grid: &Grid, leg: &Leg<'_>, objective: Objective) -> Vec<Candidate> {
    let (ni, nj) = (grid.depart.count, grid.second.count);
    let mut out = Vec::new();
    for l in 0..grid.layers.len() {
        let value = |idx: usize| {
            objective.value(
                &leg.ends,
                grid.vinf_depart_km_s[idx],
                grid.vinf_arrive_km_s[idx],
            )
        };
        for i in 0..ni {
            for j in 0..nj {
                let idx = grid.index(i, j, l);
                if !grid.usable(idx, leg.allow_flagged) {
                    continue;
                }
                let kind = grid.kind_at(idx);
                let v = value(idx);
                let mut is_min = true;
                let mut ridge = false;
                for di in -1i64..=1 {
                    for dj in -1i64..=1 {
                        if di == 0 && dj == 0 {
                            continue;
                        }
                        let (ii, jj) = (i as i64 + di, j as i64 + dj);
                        if ii < 0 || jj < 0 || ii >= ni as i64 || jj >= nj as i64 {
                            continue;
                        }
                        let n = grid.index(ii as usize, jj as usize, l);
                        if !grid.usable(n, leg.allow_flagged) {
                            continue;
                        }
                        if grid.kind_at(n) != kind {
                            ridge = true;
                            continue;
                        }
                        if value(n) < v {
                            is_min = false;
                        }
                    }
                }
                if is_min {
                    out.push(Candidate {
                        layer: l,
                        kind,
                        i,
                        j,
                        value: v,
                        ridge,
                        border: i == 0 || j == 0 || i + 1 == ni || j + 1 == nj,
                    });
                }
            }
        }
    }
    out.sort_by(|a, b| {
        (a.layer, a.kind)
            .cmp(&(b.layer, b.kind))
            .then(a.value.total_cmp(&b.value))
    });
    out
}

/// Refine a grid candidate on the Lambert objective, inside `bounds`, on
/// the same layer and Type, to 1e-4 day in both dates.
///
/// The result is never worse than the candidate's cell: the search starts
/// there and keeps its best point.
///
/// # Method
/// Nelder-Mead ([`nelder_mead`]) in (departure, arrival) with a first
/// simplex of one grid step; infeasible points (outside `bounds`, other
/// Type, no arc, an arc the leg does not admit) count as +infinity.
pub fn refine(
    leg: &Leg<'_>,
    grid: &Grid,
    c: &Candidate,
    objective: Objective,
    bounds: &Bounds,
) -> Option<Optimum> {
    let layer = grid.layers[c.layer];
    let (d0, a0) = grid.dates_days(c.i, c.j);
    let eval = |x: [f64; 2]| -> f64 {
        if !bounds.contains(x[0], x[1]) {
            return f64::INFINITY;
        }
        match leg.figures(layer.revs, layer.branch, x[0], x[1]) {
            Some(f) if f.kind == c.kind && leg.admits(&f) => {
                objective.value(&leg.ends, f.vinf_depart_km_s, f.vinf_arrive_km_s)
            }
            _ => f64::INFINITY,
        }
    };
    let step = grid.depart.step_days.min(grid.second.step_days).max(1e-3);
    let m = nelder_mead(eval, [d0, a0], [step, step], 1e-4, 4000);
    let figures = leg.figures(layer.revs, layer.branch, m.x[0], m.x[1])?;
    Some(Optimum {
        layer,
        kind: c.kind,
        depart_days: m.x[0],
        arrive_days: m.x[1],
        value: m.value,
        grid_value: c.value,
        figures,
        // Judged where the refinement ended: a ridge-adjacent cell whose
        // optimum lies clear of the ridge is an interior optimum, and an
        // interior cell whose optimum slid onto the ridge is not.
        ridge: (figures.transfer_angle_deg - 180.0).abs() < RIDGE_BAND_DEG,
        edge: bounds.near_edge(m.x[0], m.x[1], 0.5 * step),
    })
}

/// Refined optima closer than this in both dates (days) are one optimum.
const SAME_OPTIMUM_DAYS: f64 = 0.05;

/// Optima whose transfer angle lies within this many degrees of 180 are
/// flagged `ridge`: there the transfer plane is ill-conditioned.
pub const RIDGE_BAND_DEG: f64 = 1.0;

/// Which of a grid's borders are real limits of the search (a minimum
/// there is kept and flagged `edge`) rather than seams between adjacent
/// windows (a minimum there belongs to the neighbour and is dropped).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Borders {
    /// First departure row is a real limit.
    pub depart_lo: bool,
    /// Last departure row is a real limit.
    pub depart_hi: bool,
}

/// The optima of one grid: per layer and Type, the best refined interior
/// minimum, plus the best ridge-adjacent one as a flagged row where it is
/// lower (or where no interior minimum exists).
pub fn optima_of_grid(
    leg: &Leg<'_>,
    grid: &Grid,
    objective: Objective,
    bounds: &Bounds,
    borders: Borders,
) -> Vec<Optimum> {
    // Refine at most this many candidates per group: the field is smooth,
    // so more than a few local minima per Type means a ragged region next
    // to the ridge, whose best few are enough.
    const PER_GROUP: usize = 4;
    let candidates = grid_candidates(grid, leg, objective);
    let last_i = grid.depart.count.saturating_sub(1);
    let mut out = Vec::new();
    for l in 0..grid.layers.len() {
        for kind in [TransferType::I, TransferType::II] {
            let group = candidates.iter().filter(|c| {
                c.layer == l
                    && c.kind == kind
                    && (c.i != 0 || borders.depart_lo)
                    && (c.i != last_i || borders.depart_hi)
            });
            let mut refined: Vec<Optimum> = Vec::new();
            let starts = group
                .clone()
                .filter(|c| !c.ridge)
                .take(PER_GROUP)
                .chain(group.clone().filter(|c| c.ridge).take(PER_GROUP));
            for o in starts.filter_map(|c| refine(leg, grid, c, objective, bounds)) {
                // Several cells often refine to the same optimum.
                let same = |r: &Optimum| {
                    (r.depart_days - o.depart_days).abs() < SAME_OPTIMUM_DAYS
                        && (r.arrive_days - o.arrive_days).abs() < SAME_OPTIMUM_DAYS
                };
                if !refined.iter().any(same) {
                    refined.push(o);
                }
            }
            let best = |keep: &dyn Fn(&Optimum) -> bool| {
                refined
                    .iter()
                    .filter(|o| keep(o))
                    .min_by(|a, b| a.value.total_cmp(&b.value))
                    .copied()
            };
            let interior = best(&|o| !o.ridge && !o.edge);
            let edge = best(&|o| !o.ridge && o.edge);
            let ridge = best(&|o| o.ridge);
            let value = |o: &Option<Optimum>| o.map_or(f64::INFINITY, |o| o.value);
            // The interior optimum always; a minimum on a search limit only
            // where the field keeps falling past it (lower than the rest);
            // a ridge minimum only where it undercuts both.
            out.extend(interior);
            if value(&edge) < value(&interior).min(value(&ridge)) {
                out.extend(edge);
            }
            if value(&ridge) < value(&interior).min(value(&edge)) {
                out.extend(ridge);
            }
        }
    }
    out
}

/// Options of a multi-opportunity scan.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ScanOptions {
    /// What to minimise.
    pub objective: Objective,
    /// Time-of-flight limits, days; `None` for 0.3 to 2.0 times the
    /// Hohmann time between the mean orbits.
    pub tof_days: Option<(f64, f64)>,
    /// Highest number of complete revolutions.
    pub max_revs: u32,
    /// Coarse grid values per axis in each opportunity (default 150).
    pub steps: usize,
    /// Worker threads for the coarse sweeps.
    pub threads: Option<usize>,
}

/// One opportunity of a scan and its optima.
#[derive(Debug, Clone, PartialEq)]
pub struct OpportunityWindow {
    /// Label: the TDB date `YYYY-MM-DD` of the best optimum's departure.
    pub label: String,
    /// Hohmann phasing date at the window's centre, days past J2000 TDB.
    pub centre_days: f64,
    /// The departure dates searched, days past J2000 TDB.
    pub depart: (f64, f64),
    /// Time-of-flight limits used, days.
    pub tof: (f64, f64),
    /// Refined optima, by layer then Type (interior first, ridge after).
    pub optima: Vec<Optimum>,
}

/// Why a scan could not run.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum WindowError {
    /// The two bodies have equal periods: opportunities do not recur.
    #[error("the two bodies share a period, so opportunities do not recur")]
    NoRecurrence,
    /// The span is empty or not finite.
    #[error("the span must end after it starts")]
    Span,
    /// Time-of-flight limits are empty or not positive.
    #[error("time-of-flight limits must satisfy 0 < MIN <= MAX, got {min_days}..{max_days}")]
    Tof {
        /// Lower limit, days.
        min_days: f64,
        /// Upper limit, days.
        max_days: f64,
    },
    /// A coarse sweep failed.
    #[error(transparent)]
    Sweep(#[from] sweep::SweepError),
}

/// Every opportunity whose departure window meets `[span_start_days,
/// span_end_days]` (days past J2000 TDB), with refined optima.
///
/// The span is tiled with departure windows centred on successive Hohmann
/// phasing dates and split midway between them, so each departure date of
/// the span is searched exactly once. Minima on the span's own ends are
/// kept and flagged `edge`.
///
/// # Errors
/// [`WindowError`] for an empty span, bad limits or non-recurring bodies.
pub fn scan(
    leg: &Leg<'_>,
    span_start_days: f64,
    span_end_days: f64,
    opts: &ScanOptions,
) -> Result<Vec<OpportunityWindow>, WindowError> {
    if !(span_start_days.is_finite() && span_end_days.is_finite())
        || span_end_days <= span_start_days
    {
        return Err(WindowError::Span);
    }
    let system = leg.system;
    let synodic = system.synodic_period_days(leg.from, leg.to);
    if !synodic.is_finite() {
        return Err(WindowError::NoRecurrence);
    }
    let t_h = crate::opportunity::hohmann_tof_days(
        system.bodies[leg.from].elements.a_km,
        system.bodies[leg.to].elements.a_km,
        system.central.mu_km3_s2,
    );
    let tof = opts.tof_days.unwrap_or((0.3 * t_h, 2.0 * t_h));
    if !(tof.0 > 0.0 && tof.1 >= tof.0 && tof.1.is_finite()) {
        return Err(WindowError::Tof {
            min_days: tof.0,
            max_days: tof.1,
        });
    }
    // Phasing dates from one synodic period before the span to one after.
    let mut centres = Vec::new();
    let mut after = span_start_days - 1.5 * synodic;
    while let Some(o) = next_opportunity(system, leg.from, leg.to, after) {
        centres.push(o.depart_days);
        if o.depart_days > span_end_days + synodic {
            break;
        }
        after = o.depart_days + 0.5 * synodic;
    }
    if centres.len() < 2 {
        return Err(WindowError::NoRecurrence);
    }
    let mut windows = Vec::new();
    for k in 1..centres.len() - 1 {
        let lo = 0.5 * (centres[k - 1] + centres[k]);
        let hi = 0.5 * (centres[k] + centres[k + 1]);
        let (d_lo, d_hi) = (lo.max(span_start_days), hi.min(span_end_days));
        if d_hi <= d_lo {
            continue;
        }
        let clipped = d_lo > lo || d_hi < hi;
        if clipped {
            // Keep a window cut by the span only if its own optimum lies in
            // the span or close to it; otherwise what the cut leaves is the
            // rising flank of an opportunity outside the span.
            let full = window_optima(
                leg,
                lo,
                hi,
                tof,
                Borders {
                    depart_lo: false,
                    depart_hi: false,
                },
                opts,
            )?;
            let best = full.iter().min_by(|a, b| a.value.total_cmp(&b.value));
            let margin = CLIPPED_MARGIN * synodic;
            if best.is_none_or(|b| {
                b.depart_days < span_start_days - margin || b.depart_days > span_end_days + margin
            }) {
                continue;
            }
        }
        let borders = Borders {
            depart_lo: d_lo <= span_start_days,
            depart_hi: d_hi >= span_end_days,
        };
        let optima = window_optima(leg, d_lo, d_hi, tof, borders, opts)?;
        if optima.is_empty() {
            continue;
        }
        // Label by the best zero-revolution interior optimum, else by the
        // best of any kind.
        let best_of = |keep: &dyn Fn(&&Optimum) -> bool| {
            optima
                .iter()
                .filter(keep)
                .min_by(|a, b| a.value.total_cmp(&b.value))
        };
        let label_day = best_of(&|o| o.layer.revs == 0 && !o.ridge && !o.edge)
            .or_else(|| best_of(&|_| true))
            .map_or(centres[k], |o| o.depart_days);
        windows.push(OpportunityWindow {
            // Always text of one form, whatever the recurrence.
            label: file_date_of(label_day),
            centre_days: centres[k],
            depart: (d_lo, d_hi),
            tof,
            optima,
        });
    }
    disambiguate_labels(&mut windows);
    Ok(windows)
}

/// A window cut by the span's start or end is kept when its uncut optimum
/// lies within this fraction of a synodic period of the span.
const CLIPPED_MARGIN: f64 = 0.1;

/// Sweep departures `[d_lo, d_hi]` x times of flight `tof` at the scan's
/// coarse step and refine the optima.
fn window_optima(
    leg: &Leg<'_>,
    d_lo: f64,
    d_hi: f64,
    tof: (f64, f64),
    borders: Borders,
    opts: &ScanOptions,
) -> Result<Vec<Optimum>, WindowError> {
    let steps = opts.steps.max(10);
    let spec = SweepSpec {
        from: leg.from,
        to: leg.to,
        depart: Axis::spanning(d_lo, d_hi, ((d_hi - d_lo) / (steps - 1) as f64).max(1e-3))
            .map_err(|_| WindowError::Span)?,
        second: Axis::spanning(
            tof.0,
            tof.1,
            ((tof.1 - tof.0) / (steps - 1) as f64).max(1e-3),
        )
        .map_err(|_| WindowError::Tof {
            min_days: tof.0,
            max_days: tof.1,
        })?,
        second_kind: SecondAxis::TimeOfFlight,
        max_revs: opts.max_revs,
        ends: leg.ends,
    };
    let grid = sweep::sweep(
        leg.system,
        &spec,
        RunOptions {
            threads: opts.threads,
            memory_limit_bytes: None,
        },
        || {},
    )?;
    let bounds = Bounds {
        depart: (d_lo, d_hi),
        arrive: None,
        tof: Some(tof),
    };
    let mut optima = optima_of_grid(leg, &grid, opts.objective, &bounds, borders);
    // An edge flag on a seam between windows is not a real limit.
    for o in &mut optima {
        let near = 0.5 * spec.depart.step_days;
        let at_seam_lo = !borders.depart_lo && o.depart_days - d_lo < near;
        let at_seam_hi = !borders.depart_hi && d_hi - o.depart_days < near;
        if (at_seam_lo || at_seam_hi) && !near_tof_edge(o, tof, spec.second.step_days) {
            o.edge = false;
        }
    }
    Ok(optima)
}

fn near_tof_edge(o: &Optimum, tof: (f64, f64), step: f64) -> bool {
    let t = o.arrive_days - o.depart_days;
    t - tof.0 < 0.5 * step || tof.1 - t < 0.5 * step
}

/// The TDB calendar date of a day count, as text.
fn file_date_of(days: f64) -> String {
    Epoch::from_days_since_j2000_tdb(days).date_tdb()
}

/// Two opportunities labelled with the same date become `2031-04-02a`,
/// `2031-04-02b` (only when opportunities recur within days).
fn disambiguate_labels(windows: &mut [OpportunityWindow]) {
    let labels: Vec<String> = windows.iter().map(|w| w.label.clone()).collect();
    for (k, w) in windows.iter_mut().enumerate() {
        let same: Vec<usize> = (0..labels.len())
            .filter(|&m| labels[m] == labels[k])
            .collect();
        if same.len() > 1 {
            let pos = same.iter().position(|&m| m == k).unwrap_or(0);
            w.label = format!("{}{}", labels[k], (b'a' + pos as u8) as char);
        }
    }
}

#[cfg(test)]
mod tests;
