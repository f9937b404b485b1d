//! One transfer between two bodies: the patched-conic figures a mission
//! designer reads off a Lambert arc.
//!
//! Given the heliocentric (central-body) states of the departure and
//! arrival bodies and a Lambert solution joining them, this module turns
//! the arc's end velocities into the departure hyperbolic excess (C3,
//! DLA, RLA), the arrival hyperbolic excess (v-infinity, declination,
//! right ascension) and the impulsive delta-v of leaving a circular
//! parking orbit and of capturing into an elliptic orbit.
//!
//! The same [`Figures::from_arc`] routine serves the single-transfer command
//! and every cell of the grid sweep, so the two can never disagree.
//!
//! # Method
//! Patched conics: the spacecraft's velocity relative to a body at the
//! sphere-of-influence boundary is the hyperbolic excess velocity
//! `v_inf = v_transfer - v_body`; C3 = |v_inf|^2. Burns at periapsis of
//! the planet-centred hyperbola follow from vis-viva (Bate, Mueller &
//! White, *Fundamentals of Astrodynamics*, Dover 1971, sections 7.3-7.4;
//! Curtis, *Orbital Mechanics for Engineering Students*, 2nd ed. 2010,
//! eqs. 8.40 and 8.58-8.59).

use nalgebra::Vector3;

use crate::ephemeris::{Axes, Body, CentralBody, Pole, System};
use crate::lambert::{self, Branch, Direction, LambertError, LambertProblem, LambertSolution};
use crate::orbit::State;
use crate::time::Epoch;

mod flags;

pub use flags::{periapsis_km, ArcFlags, RELATIVISTIC_SPEED_KM_S, SPEED_OF_LIGHT_KM_S};

/// Mission-design classification of a transfer by its transfer angle.
///
/// Type I transfers sweep less than 180 deg around the central body, Type II
/// more (within the final revolution for multi-revolution arcs).
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum TransferType {
    /// Transfer angle below 180 deg.
    I,
    /// Transfer angle above 180 deg.
    II,
}

impl TransferType {
    /// The type of a transfer whose angle (in the direction of motion,
    /// reduced to one revolution) is `transfer_angle_rad`.
    pub fn from_angle_rad(transfer_angle_rad: f64) -> TransferType {
        if transfer_angle_rad.rem_euclid(std::f64::consts::TAU) < std::f64::consts::PI {
            TransferType::I
        } else {
            TransferType::II
        }
    }

    /// "I" or "II".
    pub fn as_str(&self) -> &'static str {
        match self {
            TransferType::I => "I",
            TransferType::II => "II",
        }
    }
}

impl std::fmt::Display for TransferType {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        // `pad` honours width and alignment in tables.
        f.pad(self.as_str())
    }
}

/// A body's equator frame, in which asymptote angles are measured.
///
/// `z` is the body's north pole, `x` the ascending node of the body's
/// equator on the celestial equator (celestial pole x body pole, the IAU
/// working group's convention), and `y = z x x`; a body without a pole, or
/// whose pole is the celestial pole, uses the celestial frame itself
/// ([`crate::ephemeris::frame`] has the formulas). With the ecliptic as
/// reference plane and the Earth's pole as celestial pole, the Earth's
/// frame is EME2000 and RLA is measured from the vernal equinox.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct EquatorFrame {
    /// Unit vector to the origin of right ascension (system frame).
    pub x: Vector3<f64>,
    /// Completes the right-handed triad.
    pub y: Vector3<f64>,
    /// North pole (system frame).
    pub z: Vector3<f64>,
}

impl EquatorFrame {
    /// The system reference frame itself.
    pub fn system() -> EquatorFrame {
        EquatorFrame::from_axes(&Axes::system())
    }

    /// The frame of a triad of [`crate::ephemeris::frame`].
    pub fn from_axes(a: &Axes) -> EquatorFrame {
        EquatorFrame {
            x: a.x,
            y: a.y,
            z: a.z,
        }
    }

    /// The equator frame of a body whose north pole is `pole` (any
    /// length), with the system reference plane as the celestial equator
    /// (a system without `[frame]`).
    pub fn from_pole_vector(pole: &Vector3<f64>) -> EquatorFrame {
        EquatorFrame::from_axes(&Axes::equator(&Axes::system(), Some(pole)))
    }

    /// The equator frame of `body` as its system defines it
    /// ([`Body::equator`]): the celestial frame if it has no pole.
    pub fn of_body(body: &Body) -> EquatorFrame {
        EquatorFrame::from_axes(&body.equator)
    }

    /// The equator frame for a pole given by its longitude and latitude in
    /// the system frame, with the system reference plane as the celestial
    /// equator (a system without `[frame]`).
    pub fn from_pole(pole: &Pole) -> EquatorFrame {
        EquatorFrame::from_pole_vector(&pole.unit_vector())
    }

    /// The length of `v` and its unit vector's components in this frame
    /// (f32, for compact storage). A zero vector gives NaN components.
    #[inline]
    pub fn length_and_unit(&self, v: &Vector3<f64>) -> (f64, [f32; 3]) {
        let (x, y, z) = (v.dot(&self.x), v.dot(&self.y), v.dot(&self.z));
        let n = (x * x + y * y + z * z).sqrt();
        let inv = 1.0 / n;
        (n, [(x * inv) as f32, (y * inv) as f32, (z * inv) as f32])
    }

    /// Declination and right ascension (deg) of direction `v` in this frame.
    ///
    /// Declination in [-90, 90], right ascension in [0, 360). A zero vector
    /// gives (0, 0).
    ///
    /// # Method
    /// `dec = asin(v.z / |v|)`, `ra = atan2(v.y, v.x)`.
    #[inline]
    pub fn dec_ra_deg(&self, v: &Vector3<f64>) -> (f64, f64) {
        let n = v.norm();
        if n <= 0.0 || !n.is_finite() {
            return (0.0, 0.0);
        }
        let dec = (v.dot(&self.z) / n).clamp(-1.0, 1.0).asin().to_degrees();
        let ra = v.dot(&self.y).atan2(v.dot(&self.x)).to_degrees();
        let ra = if ra < 0.0 { ra + 360.0 } else { ra };
        // atan2 of a tiny negative number rounds to 360.0 after the shift.
        let ra = if ra >= 360.0 { 0.0 } else { ra };
        (dec, ra)
    }
}

/// Declination and right ascension (deg) of a unit vector given by its
/// components in an equator frame; NaN components give NaN angles.
///
/// # Method
/// `dec = atan2(z, sqrt(x^2 + y^2))`, `ra = atan2(y, x)` in [0, 360).
pub fn dec_ra_deg_of_unit(u: [f32; 3]) -> (f64, f64) {
    let (x, y, z) = (f64::from(u[0]), f64::from(u[1]), f64::from(u[2]));
    let dec = z.atan2(x.hypot(y)).to_degrees();
    let ra = y.atan2(x).to_degrees();
    let ra = if ra < 0.0 { ra + 360.0 } else { ra };
    (dec, if ra >= 360.0 { 0.0 } else { ra })
}

/// A circular parking orbit around the departure body.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ParkingOrbit {
    /// GM of the departure body, km^3/s^2.
    pub mu_km3_s2: f64,
    /// Radius of the circular orbit, km (body radius + altitude).
    pub radius_km: f64,
}

impl ParkingOrbit {
    /// Impulsive delta-v (km/s) from this circular orbit onto the departure
    /// hyperbola with excess speed `vinf_km_s`, burning at periapsis.
    ///
    /// # Method
    /// Vis-viva at periapsis: `sqrt(vinf^2 + 2 mu / r) - sqrt(mu / r)`
    /// (Curtis 2010, eq. 8.40 with eq. 8.41).
    #[inline]
    pub fn injection_dv_km_s(&self, vinf_km_s: f64) -> f64 {
        let r = self.radius_km;
        (vinf_km_s * vinf_km_s + 2.0 * self.mu_km3_s2 / r).sqrt() - (self.mu_km3_s2 / r).sqrt()
    }
}

/// The elliptic orbit to capture into at the arrival body.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CaptureOrbit {
    /// GM of the arrival body, km^3/s^2.
    pub mu_km3_s2: f64,
    /// Periapsis radius, km (body radius + periapsis altitude).
    pub periapsis_km: f64,
    /// Eccentricity of the capture orbit, in [0, 1).
    pub ecc: f64,
}

impl CaptureOrbit {
    /// Impulsive delta-v (km/s) at periapsis from the arrival hyperbola with
    /// excess speed `vinf_km_s` into this orbit.
    ///
    /// # Method
    /// Vis-viva at a shared periapsis: `sqrt(vinf^2 + 2 mu / rp) -
    /// sqrt(mu (1 + e) / rp)` (Curtis 2010, eqs. 8.58-8.59).
    #[inline]
    pub fn capture_dv_km_s(&self, vinf_km_s: f64) -> f64 {
        let rp = self.periapsis_km;
        (vinf_km_s * vinf_km_s + 2.0 * self.mu_km3_s2 / rp).sqrt()
            - (self.mu_km3_s2 * (1.0 + self.ecc) / rp).sqrt()
    }
}

/// How to turn hyperbolic excess speeds into delta-v, and the frames in
/// which to measure asymptote directions.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Endpoints {
    /// Equator frame of the departure body (for DLA and RLA).
    pub depart_frame: EquatorFrame,
    /// Equator frame of the arrival body (for the arrival declination and
    /// right ascension).
    pub arrive_frame: EquatorFrame,
    /// Parking orbit to leave; without one the departure delta-v is the
    /// hyperbolic excess speed itself.
    pub parking: Option<ParkingOrbit>,
    /// Orbit to capture into; without one the arrival delta-v is 0.
    pub capture: Option<CaptureOrbit>,
}

impl Endpoints {
    /// No parking or capture orbit, asymptotes measured in the system
    /// frame: departure delta-v is the excess speed itself.
    pub fn bare() -> Endpoints {
        Endpoints {
            depart_frame: EquatorFrame::system(),
            arrive_frame: EquatorFrame::system(),
            parking: None,
            capture: None,
        }
    }

    /// Endpoints for a departure from `from` and an arrival at `to`.
    ///
    /// A parking orbit needs the departure body's GM and radius; a capture
    /// orbit needs the arrival body's. Missing values make
    /// [`Endpoints::new`] fail with a message naming the body and key.
    ///
    /// # Errors
    /// A requested orbit around a body without `mu_km3_s2` or `radius_km`,
    /// a negative altitude, or a capture eccentricity outside [0, 1).
    pub fn new(
        from: &Body,
        to: &Body,
        park_alt_km: Option<f64>,
        capture: Option<(f64, f64)>,
    ) -> Result<Endpoints, EndpointError> {
        let parking = match park_alt_km {
            None => None,
            Some(alt) => {
                let (mu, radius) = body_mu_radius(from, "parking orbit")?;
                if !(alt.is_finite() && alt >= 0.0) {
                    return Err(EndpointError::Altitude { value_km: alt });
                }
                Some(ParkingOrbit {
                    mu_km3_s2: mu,
                    radius_km: radius + alt,
                })
            }
        };
        let capture = match capture {
            None => None,
            Some((alt, ecc)) => {
                let (mu, radius) = body_mu_radius(to, "capture orbit")?;
                if !(alt.is_finite() && alt >= 0.0) {
                    return Err(EndpointError::Altitude { value_km: alt });
                }
                if !(ecc.is_finite() && (0.0..1.0).contains(&ecc)) {
                    return Err(EndpointError::Eccentricity { value: ecc });
                }
                Some(CaptureOrbit {
                    mu_km3_s2: mu,
                    periapsis_km: radius + alt,
                    ecc,
                })
            }
        };
        Ok(Endpoints {
            depart_frame: EquatorFrame::of_body(from),
            arrive_frame: EquatorFrame::of_body(to),
            parking,
            capture,
        })
    }
}

impl Endpoints {
    /// Departure delta-v (km/s) for excess speed `vinf_km_s`: injection
    /// from the parking orbit, or the excess speed itself without one.
    #[inline]
    pub fn dv_depart_km_s(&self, vinf_km_s: f64) -> f64 {
        match &self.parking {
            Some(p) => p.injection_dv_km_s(vinf_km_s),
            None => vinf_km_s,
        }
    }

    /// Arrival delta-v (km/s) for excess speed `vinf_km_s`: the capture
    /// burn, or 0 without a capture orbit.
    #[inline]
    pub fn dv_arrive_km_s(&self, vinf_km_s: f64) -> f64 {
        match &self.capture {
            Some(c) => c.capture_dv_km_s(vinf_km_s),
            None => 0.0,
        }
    }

    /// Total delta-v (km/s) from the two excess speeds.
    #[inline]
    pub fn dv_total_km_s(&self, vinf_depart_km_s: f64, vinf_arrive_km_s: f64) -> f64 {
        self.dv_depart_km_s(vinf_depart_km_s) + self.dv_arrive_km_s(vinf_arrive_km_s)
    }
}

fn body_mu_radius(body: &Body, what: &'static str) -> Result<(f64, f64), EndpointError> {
    match (body.mu_km3_s2, body.radius_km) {
        (Some(mu), Some(r)) => Ok((mu, r)),
        (None, _) => Err(EndpointError::MissingBodyValue {
            body: body.name.clone(),
            key: "mu_km3_s2",
            what,
        }),
        (_, None) => Err(EndpointError::MissingBodyValue {
            body: body.name.clone(),
            key: "radius_km",
            what,
        }),
    }
}

/// Why [`Endpoints`] could not be built.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum EndpointError {
    /// The body lacks a value the requested orbit needs.
    #[error("body \"{body}\" has no `{key}`, needed for the {what}")]
    MissingBodyValue {
        /// Body name.
        body: String,
        /// The missing key of the system file.
        key: &'static str,
        /// "parking orbit" or "capture orbit".
        what: &'static str,
    },
    /// Altitudes must be finite and non-negative.
    #[error("altitude must be a finite number >= 0 km, got {value_km}")]
    Altitude {
        /// The rejected altitude, km.
        value_km: f64,
    },
    /// Capture eccentricity must lie in [0, 1).
    #[error("capture eccentricity must be in [0, 1), got {value}")]
    Eccentricity {
        /// The rejected eccentricity.
        value: f64,
    },
}

/// Everything a design review reads off one transfer arc.
///
/// # Units
/// Speeds km/s, C3 km^2/s^2, angles deg, time of flight days. Vectors in
/// the system frame.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Figures {
    /// Complete revolutions of the arc.
    pub revs: u32,
    /// Solution branch (single for zero revolutions).
    pub branch: Branch,
    /// Type I or II by transfer angle.
    pub kind: TransferType,
    /// Transfer angle in the direction of motion, deg, in [0, 360).
    pub transfer_angle_deg: f64,
    /// Time of flight, days.
    pub tof_days: f64,
    /// Departure hyperbolic excess velocity vector, km/s.
    pub vinf_depart: Vector3<f64>,
    /// Arrival hyperbolic excess velocity vector, km/s.
    pub vinf_arrive: Vector3<f64>,
    /// Departure energy C3 = |v_inf|^2, km^2/s^2.
    pub c3_km2_s2: f64,
    /// Departure hyperbolic excess speed, km/s.
    pub vinf_depart_km_s: f64,
    /// Declination of the outgoing asymptote in the departure body's
    /// equator frame, deg.
    pub dla_deg: f64,
    /// Right ascension of the outgoing asymptote in the departure body's
    /// equator frame ([`EquatorFrame`]: for the Earth with a celestial
    /// `[frame]`, from the vernal equinox), deg in [0, 360).
    pub rla_deg: f64,
    /// Arrival hyperbolic excess speed, km/s.
    pub vinf_arrive_km_s: f64,
    /// Declination of the incoming asymptote in the arrival body's equator
    /// frame, deg.
    pub arrive_dec_deg: f64,
    /// Right ascension of the incoming asymptote in the arrival body's
    /// equator frame, deg in [0, 360).
    pub arrive_ra_deg: f64,
    /// Departure delta-v, km/s: injection from the parking orbit, or the
    /// excess speed when no parking orbit was given.
    pub dv_depart_km_s: f64,
    /// Arrival delta-v for capture, km/s (0 without a capture orbit).
    pub dv_arrive_km_s: f64,
    /// Total delta-v, km/s.
    pub dv_total_km_s: f64,
    /// Sanity flags of the arc ([`ArcFlags`]).
    pub flags: ArcFlags,
}

impl Figures {
    /// The figures of one Lambert arc from `depart` to `arrive` around
    /// `central`.
    ///
    /// `depart` and `arrive` are the bodies' states at the departure and
    /// arrival epochs; `solution` is an arc between their positions taking
    /// `tof_days`.
    pub fn from_arc(
        ends: &Endpoints,
        central: &CentralBody,
        depart: &State,
        arrive: &State,
        tof_days: f64,
        solution: &LambertSolution,
    ) -> Figures {
        let flags = ArcFlags::of_arc(
            &depart.r_km,
            depart.r_km.norm(),
            &solution.v1,
            &solution.v2,
            solution.transfer_angle_rad,
            solution.revs,
            central.mu_km3_s2,
            central.radius_km,
        );
        let vinf_depart = solution.v1 - depart.v_km_s;
        let vinf_arrive = solution.v2 - arrive.v_km_s;
        let a = Asymptotes::of_arc(ends, depart, arrive, solution);
        let (vinf_d, vinf_a) = (a.vinf_depart_km_s, a.vinf_arrive_km_s);
        let c3 = vinf_d * vinf_d;
        let (dla, rla, adec, ara) = (a.dla_deg, a.rla_deg, a.arrive_dec_deg, a.arrive_ra_deg);
        let dv_d = ends.dv_depart_km_s(vinf_d);
        let dv_a = ends.dv_arrive_km_s(vinf_a);
        let angle = solution.transfer_angle_rad;
        Figures {
            revs: solution.revs,
            branch: solution.branch,
            kind: TransferType::from_angle_rad(angle),
            transfer_angle_deg: angle.rem_euclid(std::f64::consts::TAU).to_degrees(),
            tof_days,
            vinf_depart,
            vinf_arrive,
            c3_km2_s2: c3,
            vinf_depart_km_s: vinf_d,
            dla_deg: dla,
            rla_deg: rla,
            vinf_arrive_km_s: vinf_a,
            arrive_dec_deg: adec,
            arrive_ra_deg: ara,
            dv_depart_km_s: dv_d,
            dv_arrive_km_s: dv_a,
            dv_total_km_s: dv_d + dv_a,
            flags,
        }
    }
}

/// The part of [`Figures`] a grid sweep stores per cell: excess speeds
/// and asymptote directions. Everything else follows from these.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Asymptotes {
    /// Departure hyperbolic excess speed, km/s.
    pub vinf_depart_km_s: f64,
    /// Arrival hyperbolic excess speed, km/s.
    pub vinf_arrive_km_s: f64,
    /// DLA, deg.
    pub dla_deg: f64,
    /// RLA, deg.
    pub rla_deg: f64,
    /// Arrival asymptote declination, deg.
    pub arrive_dec_deg: f64,
    /// Arrival asymptote right ascension, deg.
    pub arrive_ra_deg: f64,
}

impl Asymptotes {
    /// Excess speeds and asymptote directions of an arc (see
    /// [`Figures::from_arc`], which builds on this).
    #[inline]
    pub fn of_arc(
        ends: &Endpoints,
        depart: &State,
        arrive: &State,
        solution: &LambertSolution,
    ) -> Asymptotes {
        let vinf_depart = solution.v1 - depart.v_km_s;
        let vinf_arrive = solution.v2 - arrive.v_km_s;
        let (dla, rla) = ends.depart_frame.dec_ra_deg(&vinf_depart);
        let (adec, ara) = ends.arrive_frame.dec_ra_deg(&vinf_arrive);
        Asymptotes {
            vinf_depart_km_s: vinf_depart.norm(),
            vinf_arrive_km_s: vinf_arrive.norm(),
            dla_deg: dla,
            rla_deg: rla,
            arrive_dec_deg: adec,
            arrive_ra_deg: ara,
        }
    }
}

/// A departure body, an arrival body and what to do at each end: the
/// unit that optimisers and window searches evaluate at arbitrary dates.
#[derive(Debug, Clone, Copy)]
pub struct Leg<'a> {
    /// The system both bodies belong to.
    pub system: &'a System,
    /// Departure body index.
    pub from: usize,
    /// Arrival body index.
    pub to: usize,
    /// Parking and capture orbits, asymptote frames.
    pub ends: Endpoints,
    /// Let arcs flagged `periapsis-inside` or `relativistic` be optima and
    /// open launch periods (normally they are kept out: [`Leg::admits`]).
    pub allow_flagged: bool,
}

impl Leg<'_> {
    /// Whether `figures` may be an optimum or open a launch period: not
    /// when its flags exclude it ([`ArcFlags::excludes`]), unless
    /// [`Leg::allow_flagged`].
    pub fn admits(&self, figures: &Figures) -> bool {
        self.allow_flagged || !figures.flags.excludes()
    }

    /// The figures of the arc with `revs` revolutions on `branch` from
    /// `depart_days` to `arrive_days` (days past J2000 TDB), or `None`
    /// when no such arc exists (arrival not after departure, degenerate
    /// geometry, time of flight below the minimum for `revs`).
    ///
    /// Motion is prograde about the departure body's orbit normal, as in
    /// the grid sweep, so the two agree to the last bit.
    pub fn figures(
        &self,
        revs: u32,
        branch: Branch,
        depart_days: f64,
        arrive_days: f64,
    ) -> Option<Figures> {
        let tof_days = arrive_days - depart_days;
        if tof_days.is_nan() || tof_days <= 0.0 {
            return None;
        }
        let s1 = self.system.state_at_days(self.from, depart_days);
        let s2 = self.system.state_at_days(self.to, arrive_days);
        let normal = s1.r_km.cross(&s1.v_km_s);
        let tof_s = tof_days * SECONDS_PER_DAY;
        let mu = self.system.central.mu_km3_s2;
        let sol = if revs == 0 {
            lambert::solve_zero_rev(
                &s1.r_km,
                &s2.r_km,
                tof_s,
                mu,
                Direction::Prograde,
                Some(&normal),
            )
            .ok()?
        } else {
            let problem = LambertProblem {
                r1: s1.r_km,
                r2: s2.r_km,
                tof: tof_s,
                mu,
                direction: Direction::Prograde,
                max_revs: revs,
                reference_normal: Some(normal),
            };
            lambert::solve_revs(&problem, revs)
                .ok()?
                .into_iter()
                .find(|s| s.branch == branch)?
        };
        Some(Figures::from_arc(
            &self.ends,
            &self.system.central,
            &s1,
            &s2,
            tof_days,
            &sol,
        ))
    }
}

/// Every Lambert arc from body `from` at `depart` to body `to` at `arrive`
/// with up to `max_revs` complete revolutions, with its figures.
///
/// Motion is prograde with respect to the departure body's orbit normal,
/// which also fixes the transfer plane when the transfer angle is within
/// 1e-6 rad of 180 deg.
///
/// # Errors
/// An arrival not after the departure, or a Lambert failure (for example
/// the two positions collinear on the same side).
pub fn arcs_between(
    system: &System,
    from: usize,
    to: usize,
    depart: &Epoch,
    arrive: &Epoch,
    ends: &Endpoints,
    max_revs: u32,
) -> Result<Vec<(Figures, LambertSolution)>, TransferError> {
    let tof_days = depart.days_until(arrive);
    if tof_days.is_nan() || tof_days <= 0.0 {
        return Err(TransferError::ArrivalNotAfterDeparture { tof_days });
    }
    let s1 = system.state(from, depart);
    let s2 = system.state(to, arrive);
    let problem = LambertProblem {
        r1: s1.r_km,
        r2: s2.r_km,
        tof: tof_days * SECONDS_PER_DAY,
        mu: system.central.mu_km3_s2,
        direction: Direction::Prograde,
        max_revs,
        reference_normal: Some(s1.r_km.cross(&s1.v_km_s)),
    };
    let solutions = lambert::solve(&problem)?;
    Ok(solutions
        .into_iter()
        .map(|sol| {
            let f = Figures::from_arc(ends, &system.central, &s1, &s2, tof_days, &sol);
            (f, sol)
        })
        .collect())
}

/// Seconds in a day (SI days of 86400 s, as TDB counts them).
pub const SECONDS_PER_DAY: f64 = 86_400.0;

/// Why a transfer could not be computed.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum TransferError {
    /// The arrival epoch is not after the departure epoch.
    #[error("arrival must come after departure (time of flight {tof_days} days)")]
    ArrivalNotAfterDeparture {
        /// Arrival minus departure, days.
        tof_days: f64,
    },
    /// Lambert's problem has no solution or failed for this geometry.
    #[error(transparent)]
    Lambert(#[from] LambertError),
}

#[cfg(test)]
mod capture_tests;

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// Hohmann transfer from a 300 km parking orbit around a body with
    /// Earth's GM and radius: injection delta-v 3.590 km/s for
    /// v-infinity 2.943 km/s.
    ///
    /// Source: Curtis (2010), *Orbital Mechanics for Engineering Students*,
    /// Example 8.4 (from memory). The book prints four digits, so the
    /// tolerance is half the last one, 5e-4 km/s.
    #[test]
    fn injection_dv_matches_curtis_example_8_4() {
        let park = ParkingOrbit {
            mu_km3_s2: 398_600.0,
            radius_km: 6378.0 + 300.0,
        };
        assert_relative_eq!(park.injection_dv_km_s(2.943), 3.590, epsilon = 5e-4);
    }

    /// With zero excess speed, injection costs exactly the step from
    /// circular to escape speed, (sqrt(2) - 1) sqrt(mu / r) (vis-viva).
    #[test]
    fn injection_dv_at_zero_excess_is_escape_minus_circular() {
        let park = ParkingOrbit {
            mu_km3_s2: 398600.4418,
            radius_km: 7000.0,
        };
        let vc = (398600.4418f64 / 7000.0).sqrt();
        assert_relative_eq!(
            park.injection_dv_km_s(0.0),
            (2f64.sqrt() - 1.0) * vc,
            max_relative = 1e-14
        );
    }

    /// Capture into a parabola-like limit: with e -> 1 and zero excess speed
    /// the burn vanishes; with e = 0 it is escape minus circular speed.
    #[test]
    fn capture_dv_limits_follow_vis_viva() {
        let cap = |ecc| CaptureOrbit {
            mu_km3_s2: 42828.37,
            periapsis_km: 3696.0,
            ecc,
        };
        assert_relative_eq!(cap(0.999_999_999).capture_dv_km_s(0.0), 0.0, epsilon = 1e-8);
        let vc = (42828.37f64 / 3696.0).sqrt();
        assert_relative_eq!(
            cap(0.0).capture_dv_km_s(0.0),
            (2f64.sqrt() - 1.0) * vc,
            max_relative = 1e-14
        );
    }

    #[test]
    fn system_frame_angles_of_axes() {
        let f = EquatorFrame::system();
        let (d, r) = f.dec_ra_deg(&Vector3::new(0.0, 1.0, 0.0));
        assert_relative_eq!(d, 0.0, epsilon = 1e-12);
        assert_relative_eq!(r, 90.0, epsilon = 1e-12);
        let (d, _) = f.dec_ra_deg(&Vector3::new(0.0, 0.0, -2.0));
        assert_relative_eq!(d, -90.0, epsilon = 1e-12);
        let (_, r) = f.dec_ra_deg(&Vector3::new(1.0, -1e-300, 0.0));
        assert!((0.0..360.0).contains(&r));
    }

    /// A tilted equator: the node lies on the system plane, the pole is the
    /// given vector, and the triad is orthonormal and right-handed
    /// (the frame's definition, as for the IAU body-fixed frames: node =
    /// reference pole x body pole).
    #[test]
    fn tilted_frame_is_orthonormal_with_node_on_reference_plane() {
        // An arbitrary tilted pole (not the Earth's: in the ecliptic that
        // lies at longitude 90 deg; see ephemeris::catalog::frame_tests).
        let pole = Pole {
            lon_deg: 270.0,
            lat_deg: 60.0,
        };
        let f = EquatorFrame::from_pole(&pole);
        assert_relative_eq!(f.x.z, 0.0, epsilon = 1e-15);
        assert_relative_eq!(f.x.cross(&f.y), f.z, epsilon = 1e-15);
        assert_relative_eq!(f.x.dot(&f.z), 0.0, epsilon = 1e-15);
        // A pole at longitude 270 deg puts the node on +x.
        assert_relative_eq!(f.x, Vector3::x(), epsilon = 1e-12);
        // The pole's declination in its own frame is 90 deg.
        let (d, _) = f.dec_ra_deg(&f.z);
        assert_relative_eq!(d, 90.0, epsilon = 1e-9);
    }

    #[test]
    fn type_from_angle() {
        assert_eq!(TransferType::from_angle_rad(3.0), TransferType::I);
        assert_eq!(TransferType::from_angle_rad(3.2), TransferType::II);
        assert_eq!(
            TransferType::from_angle_rad(3.0 + std::f64::consts::TAU),
            TransferType::I
        );
    }

    /// Earth (Earth-Moon barycentre) 1996-11-07 0h UT to Mars 1997-09-12
    /// 0h UT: departure v-infinity 3.1651 km/s, arrival v-infinity 2.8852
    /// km/s; transfer orbit e 0.2058, i 1.662 deg, a 1.8474e8 km; a Type II
    /// transfer (transfer angle above 180 deg).
    ///
    /// Source: Curtis (2010), *Orbital Mechanics for Engineering Students*,
    /// Example 8.8 (from memory), with Standish, "Keplerian Elements for
    /// Approximate Positions of the Major Planets", Table 1 as the test
    /// fixture. Tolerances: the book's own element table differs from
    /// Standish's (its Mars a-rate is ten times too large), which moves the
    /// speeds by up to ~1e-3 km/s, so 1e-3 km/s (5.4e-4 and 2e-5 measured);
    /// the orbit to its printed digits plus one: 1e-4 on e, 1e-3 deg on i,
    /// 1e-4 relative on a (1.6e-5, 2e-4 deg and 4.3e-5 measured).
    #[test]
    fn curtis_example_8_8_earth_to_mars() {
        let system = System::from_toml_str(
            include_str!("../tests/fixtures/standish-table1.toml"),
            "standish-table1.toml",
        )
        .expect("fixture parses");
        let earth = system.find("Earth-Moon Barycenter").expect("EMB");
        let mars = system.find("Mars").expect("Mars");
        let depart = Epoch::parse("1996-11-07T00:00:00 UTC").expect("date");
        let arrive = Epoch::parse("1997-09-12T00:00:00 UTC").expect("date");
        let arcs = arcs_between(
            &system,
            earth,
            mars,
            &depart,
            &arrive,
            &Endpoints::bare(),
            0,
        )
        .expect("solvable");
        let (f, sol) = &arcs[0];
        assert!(
            (f.vinf_depart_km_s - 3.1651).abs() < 1e-3,
            "{}",
            f.vinf_depart_km_s
        );
        assert!(
            (f.vinf_arrive_km_s - 2.8852).abs() < 1e-3,
            "{}",
            f.vinf_arrive_km_s
        );
        assert_eq!(f.kind, TransferType::II);
        let r1 = system.state(earth, &depart).r_km;
        let conic = crate::orbit::conic_from_state(
            &State {
                r_km: r1,
                v_km_s: sol.v1,
            },
            system.central.mu_km3_s2,
        )
        .expect("elliptic arc");
        assert!((conic.e - 0.2058).abs() < 1e-4, "e {}", conic.e);
        assert!((conic.i_deg - 1.662).abs() < 1e-3, "i {}", conic.i_deg);
        assert!(
            (conic.a_km / 1.8474e8 - 1.0).abs() < 1e-4,
            "a {}",
            conic.a_km
        );
    }
}
