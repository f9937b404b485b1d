//! Launch periods: how long an opportunity stays open under a C3 ceiling.

use crate::transfer::{Figures, Leg};

use super::{golden, Bounds, Optimum};

/// Departure dates for which some allowed arrival keeps C3 at or under a
/// ceiling.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LaunchPeriod {
    /// First open departure date, days past J2000 TDB.
    pub first_days: f64,
    /// Last open departure date, days past J2000 TDB.
    pub last_days: f64,
}

impl LaunchPeriod {
    /// Days from the first to the last open departure.
    pub fn days_open(&self) -> f64 {
        self.last_days - self.first_days
    }
}

/// Samples of time of flight scanned per departure date before the golden
/// refinement: fine enough that the minimum over arrival is not missed on
/// the smooth fields of a single Type.
pub const TOF_SAMPLES: usize = 48;

/// The lowest C3 (km^2/s^2) over arrival dates allowed by `bounds`, on the
/// optimum's layer and Type, for departure `depart_days`; infinity when no
/// arrival is allowed.
///
/// # Method
/// A scan of [`TOF_SAMPLES`] times of flight, then golden-section search
/// ([`golden`]) between the neighbours of the best sample.
pub fn min_c3_over_arrival(leg: &Leg<'_>, opt: &Optimum, bounds: &Bounds, depart_days: f64) -> f64 {
    let (t_lo, t_hi) = tof_range(opt, bounds, depart_days);
    if t_hi <= t_lo {
        return f64::INFINITY;
    }
    let c3 = |tof: f64| -> f64 {
        let a = depart_days + tof;
        if !bounds.contains(depart_days, a) {
            return f64::INFINITY;
        }
        same_kind(leg, opt, depart_days, a).map_or(f64::INFINITY, |f| f.c3_km2_s2)
    };
    let h = (t_hi - t_lo) / (TOF_SAMPLES - 1) as f64;
    let (mut best_k, mut best) = (0usize, f64::INFINITY);
    for k in 0..TOF_SAMPLES {
        let v = c3(t_lo + k as f64 * h);
        if v < best {
            best = v;
            best_k = k;
        }
    }
    if !best.is_finite() {
        return best;
    }
    let lo = t_lo + (best_k.saturating_sub(1)) as f64 * h;
    let hi = (t_lo + (best_k + 1) as f64 * h).min(t_hi);
    golden(c3, lo, hi, 1e-4).1.min(best)
}

fn tof_range(opt: &Optimum, bounds: &Bounds, depart_days: f64) -> (f64, f64) {
    let tof0 = opt.arrive_days - opt.depart_days;
    let (mut lo, mut hi) = bounds.tof.unwrap_or((1e-3, 3.0 * tof0));
    if let Some((a_lo, a_hi)) = bounds.arrive {
        lo = lo.max(a_lo - depart_days);
        hi = hi.min(a_hi - depart_days);
    }
    (lo.max(1e-3), hi)
}

fn same_kind(leg: &Leg<'_>, opt: &Optimum, depart_days: f64, arrive_days: f64) -> Option<Figures> {
    leg.figures(opt.layer.revs, opt.layer.branch, depart_days, arrive_days)
        .filter(|f| f.kind == opt.kind && leg.admits(f))
}

/// The launch period around `opt` under the ceiling `max_c3_km2_s2`: the
/// contiguous run of departure dates, containing the optimum's, for which
/// some allowed arrival keeps C3 at or under the ceiling. `None` when the
/// optimum itself exceeds it. Ends are found to 0.01 day.
///
/// # Method
/// Daily steps outward from the optimum's departure until
/// [`min_c3_over_arrival`] exceeds the ceiling or the bounds end, then
/// bisection on the crossing.
pub fn launch_period(
    leg: &Leg<'_>,
    opt: &Optimum,
    bounds: &Bounds,
    max_c3_km2_s2: f64,
) -> Option<LaunchPeriod> {
    let f = |d: f64| min_c3_over_arrival(leg, opt, bounds, d);
    let d0 = opt.depart_days;
    if opt.figures.c3_km2_s2 > max_c3_km2_s2 && f(d0) > max_c3_km2_s2 {
        return None;
    }
    let edge = |dir: f64| -> f64 {
        let limit = if dir < 0.0 {
            bounds.depart.0
        } else {
            bounds.depart.1
        };
        let mut inside = d0;
        loop {
            let next = inside + dir;
            if (dir < 0.0 && next < limit) || (dir > 0.0 && next > limit) {
                if f(limit) <= max_c3_km2_s2 {
                    return limit;
                }
                return bisect(&f, inside, limit, max_c3_km2_s2);
            }
            if f(next) > max_c3_km2_s2 {
                return bisect(&f, inside, next, max_c3_km2_s2);
            }
            inside = next;
        }
    };
    Some(LaunchPeriod {
        first_days: edge(-1.0),
        last_days: edge(1.0),
    })
}

/// The last point on the open side of the crossing between `open` (f <=
/// ceiling) and `closed` (f > ceiling), to 0.005 day.
fn bisect<F: Fn(f64) -> f64>(f: &F, mut open: f64, mut closed: f64, ceiling: f64) -> f64 {
    while (closed - open).abs() > 0.005 {
        let mid = 0.5 * (open + closed);
        if f(mid) <= ceiling {
            open = mid;
        } else {
            closed = mid;
        }
    }
    open
}

/// One departure day of a fixed-arrival launch period.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DailyRow {
    /// Departure, days past J2000 TDB.
    pub depart_days: f64,
    /// Figures of the arc to the fixed arrival date (`None`: no arc).
    pub figures: Option<Figures>,
}

/// A launch period flown to one fixed arrival date.
#[derive(Debug, Clone, PartialEq)]
pub struct FixedArrivalPeriod {
    /// The arrival date, days past J2000 TDB.
    pub arrive_days: f64,
    /// First departure, days past J2000 TDB.
    pub first_days: f64,
    /// Number of daily departures.
    pub days: u32,
    /// The largest C3 over the daily departures, km^2/s^2.
    pub max_c3_km2_s2: f64,
    /// One row per departure day.
    pub daily: Vec<DailyRow>,
}

/// The fixed-arrival-date launch period of `days` daily departures that
/// minimises the largest C3 over its days, around `opt`.
///
/// # Method
/// Nested golden-section searches ([`golden`]): the outer over the arrival
/// date (within half the optimum's time of flight, clipped to `bounds`),
/// the inner over the first departure date (so that the optimum's
/// departure lies inside the period); the function minimised is the
/// largest C3 over the `days` daily departures.
pub fn fixed_arrival_period(
    leg: &Leg<'_>,
    opt: &Optimum,
    bounds: &Bounds,
    days: u32,
) -> Option<FixedArrivalPeriod> {
    if days == 0 {
        return None;
    }
    let n = days as usize;
    let span = (n - 1) as f64;
    let worst = |first: f64, arrive: f64| -> f64 {
        (0..n)
            .map(|k| {
                let d = first + k as f64;
                if !bounds.contains(d, arrive) {
                    return f64::INFINITY;
                }
                same_kind(leg, opt, d, arrive).map_or(f64::INFINITY, |f| f.c3_km2_s2)
            })
            .fold(0.0, f64::max)
    };
    let inner = |arrive: f64| -> (f64, f64) {
        golden(
            |first| worst(first, arrive),
            opt.depart_days - span,
            opt.depart_days,
            1e-3,
        )
    };
    let half_tof = 0.5 * (opt.arrive_days - opt.depart_days);
    let (arrive, _) = golden(
        |a| inner(a).1,
        opt.arrive_days - half_tof,
        opt.arrive_days + half_tof,
        1e-3,
    );
    let (first, max_c3) = inner(arrive);
    if !max_c3.is_finite() {
        return None;
    }
    let daily = (0..n)
        .map(|k| {
            let d = first + k as f64;
            DailyRow {
                depart_days: d,
                figures: same_kind(leg, opt, d, arrive),
            }
        })
        .collect();
    Some(FixedArrivalPeriod {
        arrive_days: arrive,
        first_days: first,
        days,
        max_c3_km2_s2: max_c3,
        daily,
    })
}
