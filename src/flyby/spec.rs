//! What a sequence search is asked for, its defaults, and its checked,
//! resolved form.

use super::error::{finite, limit, FlybyError};
use super::model::{FlybyBody, UNPOWERED_TOLERANCE_KM_S};
use crate::ephemeris::System;
use crate::opportunity::hohmann_tof_days;
use crate::time::Epoch;
use crate::transfer::{Endpoints, EquatorFrame};

/// Default minimum flyby altitude, km: 300 km, the periapsis altitude of
/// Curtis's Venus flyby example (2010, Example 8.6); clear of the
/// atmospheres of the terrestrial planets (common practice, no source).
/// Giant planets need far more (radiation, rings): set it per flyby.
pub const DEFAULT_MIN_ALTITUDE_KM: f64 = 300.0;

/// Default bound on one flyby's periapsis impulse during the grid search,
/// km/s. A search bound, not a physical limit: pairs of legs that would
/// need more are skipped before any root finding (common practice, no
/// source).
pub const DEFAULT_MAX_FLYBY_DV_KM_S: f64 = 0.5;

/// Default time-of-flight range of a leg between two different bodies, as
/// multiples of the Hohmann time between their mean orbits (the same
/// 0.3-2.0 rule the window search uses; common practice, no source).
pub const TOF_HOHMANN_RANGE: (f64, f64) = (0.3, 2.0);

/// Default time-of-flight range of a leg from a body back to itself, as
/// multiples of the Hohmann time (half the body's period): half to two
/// orbital periods, where the resonant and near-resonant returns lie
/// (common practice, no source).
pub const TOF_RETURN_RANGE: (f64, f64) = (1.0, 4.0);

/// Memory guard: the largest number of Lambert arcs one search keeps
/// (about 60 bytes each with the search's bookkeeping, so ~1 GB).
pub const MAX_ARCS: u64 = 16_000_000;

/// How the launch enters the objective.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum LaunchTerm {
    /// The departure counts as the injection burn from the parking orbit
    /// when one is given, else as the departure v-infinity `sqrt(C3)`
    /// itself (as [`Endpoints::dv_depart_km_s`]); C3 above the ceiling is
    /// rejected.
    #[default]
    Injection,
    /// The launch vehicle delivers any C3 up to the ceiling: the departure
    /// adds nothing to the spacecraft's delta-v, and C3 above the ceiling
    /// is rejected. Without a ceiling every C3 is free.
    Vehicle,
}

/// A sequence search: bodies FROM, VIA..., TO, dates and limits.
///
/// Build one with [`SequenceSpec::new`] and change the public fields.
/// Per-leg lists are either empty (defaults for every leg) or hold one
/// value per leg; per-flyby lists likewise one value per flyby.
#[derive(Debug, Clone, PartialEq)]
pub struct SequenceSpec {
    /// Body indices of the system ([`System::find`]): departure, flyby
    /// bodies in order, arrival.
    pub bodies: Vec<usize>,
    /// First departure date of the grid (TDB).
    pub depart_first: Epoch,
    /// Last departure date (TDB), inclusive when it falls on the grid.
    pub depart_last: Epoch,
    /// Spacing of every date on the grid, days.
    pub step_days: f64,
    /// Per leg, `(min, max)` time of flight in days; `None` (or an empty
    /// list) takes the default from the leg's Hohmann time
    /// ([`TOF_HOHMANN_RANGE`], [`TOF_RETURN_RANGE`]).
    pub tof_days: Vec<Option<(f64, f64)>>,
    /// Per leg, the most complete revolutions searched (0: direct arcs
    /// only). Empty: 0 for every leg.
    pub max_revs: Vec<u32>,
    /// Per flyby, the minimum periapsis altitude, km. Empty:
    /// [`DEFAULT_MIN_ALTITUDE_KM`] for every flyby.
    pub min_altitude_km: Vec<f64>,
    /// Launch C3 ceiling, km^2/s^2.
    pub c3_max_km2_s2: Option<f64>,
    /// Arrival v-infinity ceiling, km/s.
    pub vinf_arrive_max_km_s: Option<f64>,
    /// Bound on each flyby's periapsis impulse during the grid search,
    /// km/s ([`DEFAULT_MAX_FLYBY_DV_KM_S`]).
    pub max_flyby_dv_km_s: f64,
    /// Speeds within this of each other make a flyby unpowered, km/s.
    pub unpowered_tol_km_s: f64,
    /// Circular parking orbit altitude at departure, km (needs the
    /// departure body's GM and radius).
    pub park_altitude_km: Option<f64>,
    /// Capture orbit at arrival as (periapsis altitude km, eccentricity);
    /// its insertion burn then counts instead of the arrival v-infinity.
    pub capture: Option<(f64, f64)>,
    /// How the launch counts in the objective.
    pub launch: LaunchTerm,
    /// How many grid candidates are refined on continuous dates.
    pub refine_count: usize,
    /// Refined candidates depart at least this many days apart.
    pub separation_days: f64,
}

impl SequenceSpec {
    /// A search over `bodies` departing from `depart_first` to
    /// `depart_last` every `step_days`, with every other field at its
    /// default: default times of flight, no revolutions, 300 km minimum
    /// altitude, no ceilings, 0.5 km/s flyby impulse bound, 1 m/s unpowered
    /// tolerance, no parking or capture orbit, launch counted as
    /// injection, 5 candidates refined at least 30 days apart.
    pub fn new(
        bodies: Vec<usize>,
        depart_first: Epoch,
        depart_last: Epoch,
        step_days: f64,
    ) -> SequenceSpec {
        SequenceSpec {
            bodies,
            depart_first,
            depart_last,
            step_days,
            tof_days: Vec::new(),
            max_revs: Vec::new(),
            min_altitude_km: Vec::new(),
            c3_max_km2_s2: None,
            vinf_arrive_max_km_s: None,
            max_flyby_dv_km_s: DEFAULT_MAX_FLYBY_DV_KM_S,
            unpowered_tol_km_s: UNPOWERED_TOLERANCE_KM_S,
            park_altitude_km: None,
            capture: None,
            launch: LaunchTerm::Injection,
            refine_count: 5,
            separation_days: 30.0,
        }
    }

    /// Number of legs: bodies minus one.
    pub fn leg_count(&self) -> usize {
        self.bodies.len().saturating_sub(1)
    }
}

/// One leg, resolved.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct LegPlan {
    pub from: usize,
    pub to: usize,
    pub tof_min_days: f64,
    pub tof_max_days: f64,
    /// Smallest and largest time of flight in grid steps.
    pub q_min: u32,
    pub q_max: u32,
    pub max_revs: u32,
}

/// A checked search: every default filled in, every limit validated.
#[derive(Debug, Clone)]
pub(crate) struct Plan {
    pub bodies: Vec<usize>,
    pub legs: Vec<LegPlan>,
    /// One per flyby (intermediate body).
    pub flybys: Vec<FlybyBody>,
    pub t0_days: f64,
    pub step_days: f64,
    /// Departure dates on the grid: indices `0..depart_count`.
    pub depart_count: u32,
    pub depart_last_days: f64,
    pub c3_max: Option<f64>,
    pub vinf_arrive_max: Option<f64>,
    pub max_flyby_dv: f64,
    pub unpowered_tol: f64,
    /// Endpoints of the first leg (departure frame and parking orbit).
    pub first_ends: Endpoints,
    /// Endpoints of the last leg (arrival frame and capture orbit).
    pub last_ends: Endpoints,
    pub launch: LaunchTerm,
    pub refine_count: usize,
    pub separation_days: f64,
}

impl Plan {
    /// Index range `[lo, hi]` of the dates of encounter `k` (0 the
    /// departure).
    pub fn date_range(&self, k: usize) -> (u32, u32) {
        let mut lo = 0u32;
        let mut hi = self.depart_count - 1;
        for leg in &self.legs[..k] {
            lo += leg.q_min;
            hi += leg.q_max;
        }
        (lo, hi)
    }

    /// Days past J2000 TDB of grid index `i`.
    pub fn day(&self, i: u32) -> f64 {
        self.t0_days + f64::from(i) * self.step_days
    }

    /// The launch's share of the objective for a departure v-infinity.
    pub fn launch_dv(&self, vinf_km_s: f64) -> f64 {
        match self.launch {
            LaunchTerm::Injection => self.first_ends.dv_depart_km_s(vinf_km_s),
            LaunchTerm::Vehicle => 0.0,
        }
    }

    /// The arrival's share: capture burn when given, else the v-infinity.
    pub fn arrive_dv(&self, vinf_km_s: f64) -> f64 {
        match self.last_ends.capture {
            Some(c) => c.capture_dv_km_s(vinf_km_s),
            None => vinf_km_s,
        }
    }

    /// Whether a departure v-infinity respects the C3 ceiling.
    pub fn c3_ok(&self, vinf_km_s: f64) -> bool {
        self.c3_max.is_none_or(|c| vinf_km_s * vinf_km_s <= c)
    }

    /// Whether an arrival v-infinity respects its ceiling.
    pub fn arrive_ok(&self, vinf_km_s: f64) -> bool {
        self.vinf_arrive_max.is_none_or(|v| vinf_km_s <= v)
    }
}

fn per<T: Clone>(
    list: &[T],
    n: usize,
    what: &'static str,
    per: &'static str,
    default: T,
) -> Result<Vec<T>, FlybyError> {
    match list.len() {
        0 => Ok(vec![default; n]),
        m if m == n => Ok(list.to_vec()),
        m => Err(FlybyError::Count {
            what,
            per,
            expected: n,
            got: m,
        }),
    }
}

/// The default time-of-flight range of a leg, days (see
/// [`TOF_HOHMANN_RANGE`] and [`TOF_RETURN_RANGE`]).
///
/// # Method
/// Hohmann time between the bodies' mean orbits at the system epoch
/// ([`hohmann_tof_days`], Kepler's third law), times the range.
pub fn default_tof_days(system: &System, from: usize, to: usize) -> (f64, f64) {
    let a1 = system.bodies[from].elements.a_km;
    let a2 = system.bodies[to].elements.a_km;
    let t_h = hohmann_tof_days(a1, a2, system.central.mu_km3_s2);
    let (lo, hi) = if from == to {
        TOF_RETURN_RANGE
    } else {
        TOF_HOHMANN_RANGE
    };
    (lo * t_h, hi * t_h)
}

/// Checks a spec against a system and fills in the defaults.
pub(crate) fn resolve(system: &System, spec: &SequenceSpec) -> Result<Plan, FlybyError> {
    let n_bodies = spec.bodies.len();
    if n_bodies < 2 {
        return Err(FlybyError::TooFewBodies { count: n_bodies });
    }
    for &b in &spec.bodies {
        if b >= system.bodies.len() {
            return Err(FlybyError::UnknownBody {
                index: b,
                count: system.bodies.len(),
            });
        }
    }
    let n_legs = n_bodies - 1;
    let step = finite("the date step (days)", spec.step_days)?;
    if step <= 0.0 {
        return Err(FlybyError::Step { step_days: step });
    }
    let t0 = finite(
        "the first departure date",
        spec.depart_first.days_since_j2000_tdb(),
    )?;
    let t1 = finite(
        "the last departure date",
        spec.depart_last.days_since_j2000_tdb(),
    )?;
    if t1 < t0 {
        return Err(FlybyError::DepartSpan {
            start_days: t0,
            end_days: t1,
        });
    }
    // A tiny allowance so a last date on the grid is not lost to rounding.
    let span_steps = ((t1 - t0) / step + 1e-9).floor();
    let tofs = per(&spec.tof_days, n_legs, "times of flight", "leg", None)?;
    let revs = per(&spec.max_revs, n_legs, "revolutions", "leg", 0)?;
    let alts = per(
        &spec.min_altitude_km,
        n_legs - 1,
        "minimum flyby altitudes",
        "flyby",
        DEFAULT_MIN_ALTITUDE_KM,
    )?;
    let mut legs = Vec::with_capacity(n_legs);
    let mut arcs = 0u64;
    let mut dates = span_steps + 1.0;
    for (k, pair) in spec.bodies.windows(2).enumerate() {
        let (from, to) = (pair[0], pair[1]);
        let (lo, hi) = tofs[k].unwrap_or_else(|| default_tof_days(system, from, to));
        if !(lo.is_finite() && hi.is_finite() && lo > 0.0 && lo <= hi) {
            return Err(FlybyError::TofRange {
                leg: k + 1,
                min_days: lo,
                max_days: hi,
            });
        }
        let q_min = (lo / step - 1e-9).ceil();
        let q_max = (hi / step + 1e-9).floor();
        if q_max > f64::from(u32::MAX / 4) {
            return Err(FlybyError::GridTooLarge {
                arcs: (dates * (q_max - q_min + 1.0)).min(u64::MAX as f64) as u64,
                limit: MAX_ARCS,
            });
        }
        if q_max < q_min {
            return Err(FlybyError::TofNoStep {
                leg: k + 1,
                min_days: lo,
                max_days: hi,
                step_days: step,
            });
        }
        let per_date = (q_max - q_min + 1.0) * (1.0 + 2.0 * f64::from(revs[k]));
        let leg_arcs = dates * per_date;
        if leg_arcs > MAX_ARCS as f64 || arcs as f64 + leg_arcs > MAX_ARCS as f64 {
            return Err(FlybyError::GridTooLarge {
                arcs: (arcs as f64 + leg_arcs).min(u64::MAX as f64) as u64,
                limit: MAX_ARCS,
            });
        }
        arcs += leg_arcs as u64;
        dates += q_max - q_min;
        legs.push(LegPlan {
            from,
            to,
            tof_min_days: lo,
            tof_max_days: hi,
            q_min: q_min as u32,
            q_max: q_max as u32,
            max_revs: revs[k],
        });
    }
    let mut flybys = Vec::with_capacity(n_legs - 1);
    for (j, (&b, &alt)) in spec.bodies[1..n_bodies - 1].iter().zip(&alts).enumerate() {
        let body = &system.bodies[b];
        if !(alt.is_finite() && alt >= 0.0) {
            return Err(FlybyError::Altitude {
                flyby: j + 1,
                body: body.name.clone(),
                value_km: alt,
            });
        }
        flybys.push(FlybyBody::of_body(body, alt)?);
    }
    let c3_max = spec
        .c3_max_km2_s2
        .map(|c| limit("the C3 ceiling (km^2/s^2)", c))
        .transpose()?;
    let vinf_arrive_max = spec
        .vinf_arrive_max_km_s
        .map(|v| limit("the arrival v-infinity ceiling (km/s)", v))
        .transpose()?;
    let max_flyby_dv = limit("the flyby impulse bound (km/s)", spec.max_flyby_dv_km_s)?;
    let unpowered_tol = limit(
        "the unpowered-flyby tolerance (km/s)",
        spec.unpowered_tol_km_s,
    )?;
    let separation_days = limit("the candidate separation (days)", spec.separation_days)?;
    let (from, to) = (spec.bodies[0], spec.bodies[n_bodies - 1]);
    let ends = Endpoints::new(
        &system.bodies[from],
        &system.bodies[to],
        spec.park_altitude_km,
        spec.capture,
    )?;
    let first_ends = Endpoints {
        arrive_frame: EquatorFrame::system(),
        capture: None,
        ..ends
    };
    let last_ends = Endpoints {
        depart_frame: EquatorFrame::system(),
        parking: None,
        ..ends
    };
    let (first_ends, last_ends) = if n_legs == 1 {
        (ends, ends)
    } else {
        (first_ends, last_ends)
    };
    Ok(Plan {
        bodies: spec.bodies.clone(),
        legs,
        flybys,
        t0_days: t0,
        step_days: step,
        depart_count: span_steps as u32 + 1,
        depart_last_days: t1,
        c3_max,
        vinf_arrive_max,
        max_flyby_dv,
        unpowered_tol,
        first_ends,
        last_ends,
        launch: spec.launch,
        refine_count: spec.refine_count,
        separation_days,
    })
}
