//! Why a flyby, a sequence search or a survey was rejected.

/// Errors of the flyby model, the sequence search and the survey.
///
/// Messages speak of the quantities a user set (a leg's time of flight,
/// a flyby's minimum altitude), never of Rust types, so the command line
/// can add the file, line and key or the option that carried them.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum FlybyError {
    /// A number that must be finite is NaN or infinite.
    #[error("{what} must be a finite number, got {value}")]
    NonFinite {
        /// What the number is, in the user's words.
        what: &'static str,
        /// The offending value.
        value: f64,
    },
    /// A v-infinity of zero: the flyby hyperbola degenerates to a
    /// parabola and has no turn angle.
    #[error("the {which} v-infinity is zero: a flyby needs a hyperbolic approach and departure")]
    ZeroExcessSpeed {
        /// "incoming" or "outgoing".
        which: &'static str,
    },
    /// A body's GM or radius is zero or negative.
    #[error("{what} must be > 0, got {value}")]
    NonPositive {
        /// What the number is.
        what: &'static str,
        /// The offending value.
        value: f64,
    },
    /// A flyby body lacks the GM or radius the flyby model needs.
    #[error("body \"{body}\" has no `{key}`, needed to model a flyby there")]
    MissingBodyValue {
        /// The body's name.
        body: String,
        /// The system-file key that is missing.
        key: &'static str,
    },
    /// A sequence needs a departure and an arrival body.
    #[error("a sequence needs at least a departure and an arrival body, got {count} bodies")]
    TooFewBodies {
        /// Bodies given.
        count: usize,
    },
    /// A body index outside the system.
    #[error("body number {index} is not in the system (it has {count} bodies)")]
    UnknownBody {
        /// The index given.
        index: usize,
        /// Bodies in the system.
        count: usize,
    },
    /// The departure span is empty or reversed.
    #[error("the departure span must end on or after its start, got {start_days} .. {end_days} (days past J2000 TDB)")]
    DepartSpan {
        /// Start, days past J2000 TDB.
        start_days: f64,
        /// End, days past J2000 TDB.
        end_days: f64,
    },
    /// The grid step is not positive.
    #[error("the date step must be > 0 days, got {step_days}")]
    Step {
        /// The offending step.
        step_days: f64,
    },
    /// A per-leg or per-flyby list has the wrong length.
    #[error("{what}: expected {expected} values (one per {per}), got {got}")]
    Count {
        /// Which list.
        what: &'static str,
        /// What each value belongs to ("leg" or "flyby").
        per: &'static str,
        /// Expected length.
        expected: usize,
        /// Given length.
        got: usize,
    },
    /// A leg's time-of-flight range is empty, reversed or not positive.
    #[error("leg {leg}: the time of flight must satisfy 0 < min <= max, got {min_days} .. {max_days} days")]
    TofRange {
        /// Leg number, counting from 1.
        leg: usize,
        /// Minimum, days.
        min_days: f64,
        /// Maximum, days.
        max_days: f64,
    },
    /// A leg's time-of-flight range holds no grid step.
    #[error("leg {leg}: no multiple of the {step_days}-day step lies in {min_days} .. {max_days} days; widen the range or shorten the step")]
    TofNoStep {
        /// Leg number, counting from 1.
        leg: usize,
        /// Minimum, days.
        min_days: f64,
        /// Maximum, days.
        max_days: f64,
        /// The grid step.
        step_days: f64,
    },
    /// A minimum flyby altitude is negative or not finite.
    #[error("flyby {flyby} (\"{body}\"): the minimum altitude must be a finite number >= 0 km, got {value_km}")]
    Altitude {
        /// Flyby number, counting from 1.
        flyby: usize,
        /// The body's name.
        body: String,
        /// The offending value.
        value_km: f64,
    },
    /// A ceiling or bound is negative or not finite.
    #[error("{what} must be a finite number >= 0, got {value}")]
    Limit {
        /// Which limit, with its unit.
        what: &'static str,
        /// The offending value.
        value: f64,
    },
    /// The date grid would need more Lambert arcs than the memory guard
    /// allows.
    #[error("the search would solve {arcs} Lambert arcs, more than the limit of {limit}; use a longer step, a shorter departure span or narrower time-of-flight ranges")]
    GridTooLarge {
        /// Arcs the grid needs.
        arcs: u64,
        /// The limit.
        limit: u64,
    },
    /// The parking or capture orbit does not fit the departure or arrival
    /// body (missing GM or radius, bad altitude or eccentricity).
    #[error(transparent)]
    Endpoints(#[from] crate::transfer::EndpointError),
    /// A survey would search more sequences than the guard allows.
    #[error("the survey would search more than {limit} sequences; use fewer candidate bodies or fewer flybys")]
    TooManySequences {
        /// The limit.
        limit: u64,
    },
    /// A survey was asked for without candidate flyby bodies while
    /// flybys were requested.
    #[error("a survey with up to {max_flybys} flybys needs at least one candidate flyby body")]
    NoCandidates {
        /// Flybys requested.
        max_flybys: usize,
    },
}

/// `value` if finite, else [`FlybyError::NonFinite`].
pub(crate) fn finite(what: &'static str, value: f64) -> Result<f64, FlybyError> {
    if value.is_finite() {
        Ok(value)
    } else {
        Err(FlybyError::NonFinite { what, value })
    }
}

/// `value` if finite and > 0, else [`FlybyError::NonFinite`] or
/// [`FlybyError::NonPositive`].
pub(crate) fn positive(what: &'static str, value: f64) -> Result<f64, FlybyError> {
    if finite(what, value)? > 0.0 {
        Ok(value)
    } else {
        Err(FlybyError::NonPositive { what, value })
    }
}

/// `value` if finite and >= 0, else [`FlybyError::Limit`].
pub(crate) fn limit(what: &'static str, value: f64) -> Result<f64, FlybyError> {
    if value.is_finite() && value >= 0.0 {
        Ok(value)
    } else {
        Err(FlybyError::Limit { what, value })
    }
}
