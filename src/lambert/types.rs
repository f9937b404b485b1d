//! The Lambert solver's public types: problems, solutions, errors.

use nalgebra::Vector3;

use super::izzo;

/// Transfer angles within this many radians of 0, 180 or 360 degrees are
/// treated as degenerate (see the module's conventions). Below 1e-6 rad
/// the plane of two position vectors carries less than ten significant
/// digits.
pub const ANGLE_TOLERANCE_RAD: f64 = 1e-6;

/// Sense of the transfer with respect to the reference normal.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Direction {
    /// Angular momentum has a positive component along the reference
    /// normal.
    Prograde,
    /// Angular momentum has a negative component along the reference
    /// normal.
    Retrograde,
}

impl Direction {
    /// +1 prograde, -1 retrograde.
    pub(crate) fn sense(self) -> f64 {
        match self {
            Direction::Prograde => 1.0,
            Direction::Retrograde => -1.0,
        }
    }
}

/// Which solution of a given revolution count.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Branch {
    /// The only solution with zero revolutions.
    Single,
    /// For `M > 0`: Izzo's left solution, the root of `T(x) = T*` with
    /// `x < x_min` (the minimum of T). It has the *smaller* semi-major
    /// axis (`a = s / (2 (1 - x^2))`, and the left root lies nearer
    /// `x = 0`: in practice `x < 0` with `|x|` below the right root's):
    /// near `x = -1`, T grows like `(M + 1) pi / (1 - x^2)^(3/2)`, near
    /// `x = +1` only like `M pi / (1 - x^2)^(3/2)`. Checked on 20,000
    /// problems by the test `branch_order`.
    Left,
    /// For `M > 0`: Izzo's right solution, `x > x_min`: the larger
    /// semi-major axis.
    Right,
}

impl std::fmt::Display for Branch {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        // `pad` honours width and alignment in tables.
        f.pad(match self {
            Branch::Single => "single",
            Branch::Left => "left",
            Branch::Right => "right",
        })
    }
}

/// One Lambert problem.
///
/// # Units
/// Any consistent set (see the module docs); synodic uses km, s and
/// km^3/s^2.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LambertProblem {
    /// Departure position (synodic: km).
    pub r1: Vector3<f64>,
    /// Arrival position (synodic: km).
    pub r2: Vector3<f64>,
    /// Time of flight, in the time unit of `mu` (synodic: s).
    pub tof: f64,
    /// Gravitational parameter (synodic: km^3/s^2).
    pub mu: f64,
    /// Sense of motion with respect to the reference normal.
    pub direction: Direction,
    /// Largest number of complete revolutions [`solve`](super::solve) looks for.
    pub max_revs: u32,
    /// Defines "prograde" (default +z) and the transfer plane near 180
    /// degrees. Any non-zero length.
    pub reference_normal: Option<Vector3<f64>>,
}

/// One solution of a Lambert problem.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LambertSolution {
    /// Complete revolutions before arrival.
    pub revs: u32,
    /// Which of the solutions with `revs` revolutions.
    pub branch: Branch,
    /// Velocity at departure (synodic: km/s).
    pub v1: Vector3<f64>,
    /// Velocity at arrival (synodic: km/s).
    pub v2: Vector3<f64>,
    /// Root-finder iterations: Householder iterations for this root plus,
    /// for `revs > 0`, the Halley iterations of the minimum search.
    pub iterations: u32,
    /// Transfer angle in `[0, 2 pi)`, radians, measured from `r1` to `r2`
    /// in the direction of motion (not counting complete revolutions).
    pub transfer_angle_rad: f64,
}

/// Why a Lambert problem has no (computed) solution.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum LambertError {
    /// An input is NaN or infinite.
    #[error("non-finite input: {what}")]
    NonFiniteInput {
        /// "r1", "r2", "tof", "mu" or "reference_normal".
        what: &'static str,
    },
    /// The time of flight is zero or negative.
    #[error("time of flight must be positive, got {tof}")]
    NonPositiveTimeOfFlight {
        /// The offending value.
        tof: f64,
    },
    /// The gravitational parameter is zero or negative.
    #[error("gravitational parameter must be positive, got {mu}")]
    NonPositiveMu {
        /// The offending value.
        mu: f64,
    },
    /// A position vector has zero length.
    #[error("position vector {which} has zero length")]
    ZeroRadius {
        /// "r1" or "r2".
        which: &'static str,
    },
    /// The reference normal has zero length.
    #[error("reference normal has zero length")]
    ZeroReferenceNormal,
    /// The transfer angle is within [`ANGLE_TOLERANCE_RAD`] of 0 or 360
    /// degrees: the transfer plane and the arc are undefined.
    #[error("position vectors are collinear (angle {angle_rad:e} rad from 0 or 360 degrees)")]
    Collinear {
        /// Angle between r1 and r2, radians, in [0, pi].
        angle_rad: f64,
    },
    /// The transfer angle is within [`ANGLE_TOLERANCE_RAD`] of 180
    /// degrees and the reference normal (given or the default +z) is
    /// parallel to r1, so it cannot define the transfer plane.
    #[error(
        "transfer plane undefined: angle {angle_rad} rad is within 1e-6 of 180 degrees \
         and the reference normal is parallel to r1"
    )]
    UndefinedPlane {
        /// Angle between r1 and r2, radians, in [0, pi].
        angle_rad: f64,
    },
    /// No solution with `revs` revolutions: the time of flight is below
    /// the minimum for that count.
    #[error("no {revs}-revolution solution: time of flight {tof} is below the minimum {min_tof}")]
    NoSolution {
        /// Requested revolutions.
        revs: u32,
        /// Requested time of flight.
        tof: f64,
        /// Minimum time of flight for `revs` revolutions (same unit).
        min_tof: f64,
    },
    /// The root finder did not converge.
    #[error(
        "not converged after {iterations} iterations \
         (relative residual {residual:e}, tolerance {tolerance:e})"
    )]
    NotConverged {
        /// Iterations used.
        iterations: u32,
        /// Last relative time-of-flight residual (or |dT/dx| for the
        /// minimum search).
        residual: f64,
        /// Step tolerance that was not met.
        tolerance: f64,
    },
    /// The solution overflows or underflows double precision (e.g. a
    /// time of flight so small that the speed is not representable).
    #[error("solution not representable in double precision (tof {tof})")]
    NotRepresentable {
        /// Requested time of flight.
        tof: f64,
    },
}

impl From<izzo::NoConvergence> for LambertError {
    #[cold]
    fn from(e: izzo::NoConvergence) -> Self {
        LambertError::NotConverged {
            iterations: e.iterations,
            residual: e.residual,
            tolerance: e.tolerance,
        }
    }
}
