//! The flyby in patched conics: one hyperbola (unpowered) or two joined at
//! periapsis by one impulse (powered).
//!
//! Inside the flyby body's sphere of influence the spacecraft follows a
//! hyperbola about the body. Far out it moves with the v-infinity vectors
//! of the two heliocentric legs that meet at the encounter date: the
//! incoming leg's arrival v-infinity and the outgoing leg's departure
//! v-infinity, both relative to the body.
//!
//! # Method
//! Unpowered flyby (H. D. Curtis, *Orbital Mechanics for Engineering
//! Students*, 2nd ed., Elsevier 2010, sec. 8.9 "Planetary flyby"; the same
//! relations in Bate, Mueller & White, *Fundamentals of Astrodynamics*,
//! Dover 1971, ch. 4 and 8):
//! - hyperbola eccentricity from the periapsis radius and the excess
//!   speed, `e = 1 + rp v_inf^2 / mu`;
//! - turn angle between the asymptotes, `sin(delta / 2) = 1 / e`;
//! - both asymptotic speeds equal, `|v_inf in| = |v_inf out|`.
//!
//! Powered flyby, with one impulse at the common periapsis of an incoming
//! hyperbola (excess speed `v_in`) and an outgoing one (`v_out`): each
//! hyperbola turns the asymptote by half its own unpowered turn,
//! `asin(1 / e)`, so the periapsis radius that makes a turn `delta` solves
//! `delta = asin(1 / e_in(rp)) + asin(1 / e_out(rp))`, with
//! `e = 1 + rp v^2 / mu` for each; the impulse joins the two periapsis
//! speeds from vis-viva, `dv = |sqrt(v_out^2 + 2 mu / rp) - sqrt(v_in^2 + 2
//! mu / rp)|`. This is the periapsis-impulse model of D. Izzo, V. M.
//! Becerra, D. R. Myatt, S. J. Nasuto, J. M. Bishop, "Search space pruning
//! and global optimisation of multiple gravity assist spacecraft
//! trajectories", *Journal of Global Optimization* 38 (2007) 283-296,
//! sec. 2 (from memory: the paper was not at hand; every relation above
//! follows from Curtis's hyperbola relations and vis-viva). It is exact for
//! two coplanar hyperbolas with a common periapsis and a tangential
//! impulse; the plane of the flyby is the plane of the two asymptotes.
//!
//! The root is found by a Newton iteration safeguarded by bisection
//! ("rtsafe", W. H. Press et al., *Numerical Recipes*, 3rd ed., Cambridge
//! 2007, sec. 9.4) inside a closed-form bracket: the turn is a decreasing
//! function of `rp` and lies between the unpowered turns of the faster and
//! the slower hyperbola, so `rp` lies between their unpowered periapsis
//! radii `rp(v) = mu / v^2 (1 / sin(delta / 2) - 1)`.
//!
//! A flyby whose periapsis would lie below the body's radius plus the
//! minimum altitude is rejected ([`Verdict::BelowMinimumAltitude`]), never
//! reported as feasible.

use std::f64::consts::PI;

use nalgebra::Vector3;

use super::error::{finite, limit, positive, FlybyError};
use crate::ephemeris::Body;

/// Turns below this many radians count as no turn: the periapsis radius is
/// then infinite and the powered delta-v is `|v_out - v_in|` (the limit of
/// the model). 1e-12 rad is below the double-precision resolution of an
/// angle between two km/s vectors.
pub const NO_TURN_RAD: f64 = 1e-12;

/// Default tolerance on `| |v_inf out| - |v_inf in| |` for a flyby to count
/// as unpowered, km/s. 1 m/s: below the navigation accuracy of a
/// concept-phase design (common practice, no source).
pub const UNPOWERED_TOLERANCE_KM_S: f64 = 1e-3;

/// A body as the flyby model sees it.
///
/// # Units
/// km^3/s^2 and km.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FlybyBody {
    /// The body's GM, km^3/s^2.
    pub mu_km3_s2: f64,
    /// The body's radius, km.
    pub radius_km: f64,
    /// The lowest allowed periapsis altitude above `radius_km`, km.
    pub min_altitude_km: f64,
}

impl FlybyBody {
    /// A flyby body from its GM, radius and minimum altitude.
    ///
    /// # Errors
    /// [`FlybyError::NonFinite`] or [`FlybyError::NonPositive`] for a GM
    /// or radius that is not a finite positive number;
    /// [`FlybyError::Limit`] for a negative or non-finite minimum altitude.
    pub fn new(
        mu_km3_s2: f64,
        radius_km: f64,
        min_altitude_km: f64,
    ) -> Result<FlybyBody, FlybyError> {
        positive("the flyby body's GM (km^3/s^2)", mu_km3_s2)?;
        positive("the flyby body's radius (km)", radius_km)?;
        limit("the minimum flyby altitude (km)", min_altitude_km)?;
        Ok(FlybyBody {
            mu_km3_s2,
            radius_km,
            min_altitude_km,
        })
    }

    /// The flyby body for a body of a system, which must carry
    /// `mu_km3_s2` and `radius_km`.
    ///
    /// # Errors
    /// [`FlybyError::MissingBodyValue`] naming the missing key; as
    /// [`FlybyBody::new`] otherwise.
    pub fn of_body(body: &Body, min_altitude_km: f64) -> Result<FlybyBody, FlybyError> {
        let missing = |key| FlybyError::MissingBodyValue {
            body: body.name.clone(),
            key,
        };
        let mu = body.mu_km3_s2.ok_or_else(|| missing("mu_km3_s2"))?;
        let radius = body.radius_km.ok_or_else(|| missing("radius_km"))?;
        FlybyBody::new(mu, radius, min_altitude_km)
    }

    /// The lowest allowed periapsis radius, km: radius plus minimum
    /// altitude.
    pub fn min_periapsis_km(&self) -> f64 {
        self.radius_km + self.min_altitude_km
    }
}

/// Eccentricity of a flyby hyperbola, `e = 1 + rp v_inf^2 / mu`.
///
/// # Method
/// Curtis (2010) sec. 8.9 (the hyperbola's eccentricity from its periapsis
/// radius and excess speed).
///
/// # Units
/// km, km/s, km^3/s^2; dimensionless result.
#[inline]
pub fn hyperbola_eccentricity(periapsis_km: f64, vinf_km_s: f64, mu_km3_s2: f64) -> f64 {
    1.0 + periapsis_km * vinf_km_s * vinf_km_s / mu_km3_s2
}

/// Half the turn of one hyperbola, `asin(1 / e)`, radians.
#[inline]
fn half_turn_rad(periapsis_km: f64, vinf_km_s: f64, mu_km3_s2: f64) -> f64 {
    // 1 / e written as mu / (mu + rp v^2): no cancellation for large e.
    (mu_km3_s2 / (mu_km3_s2 + periapsis_km * vinf_km_s * vinf_km_s)).asin()
}

/// Turn angle of an unpowered flyby, radians: `delta = 2 asin(1 / e)`.
///
/// # Method
/// Curtis (2010) sec. 8.9, `sin(delta / 2) = 1 / e` with
/// [`hyperbola_eccentricity`].
///
/// # Units
/// km, km/s, km^3/s^2; radians in `[0, pi]`.
#[inline]
pub fn unpowered_turn_rad(periapsis_km: f64, vinf_km_s: f64, mu_km3_s2: f64) -> f64 {
    2.0 * half_turn_rad(periapsis_km, vinf_km_s, mu_km3_s2)
}

/// Periapsis radius of the unpowered flyby that turns the asymptote by
/// `turn_rad`: `rp = mu / v_inf^2 (1 / sin(delta / 2) - 1)`.
///
/// # Method
/// Curtis (2010) sec. 8.9, the turn-angle relation solved for `rp`.
///
/// # Units
/// radians, km/s, km^3/s^2; km. Infinite for a turn of zero.
#[inline]
pub fn unpowered_periapsis_km(turn_rad: f64, vinf_km_s: f64, mu_km3_s2: f64) -> f64 {
    mu_km3_s2 / (vinf_km_s * vinf_km_s) * (1.0 / (0.5 * turn_rad).sin() - 1.0)
}

/// Periapsis impulse joining an incoming hyperbola of excess speed
/// `vin_km_s` to an outgoing one of `vout_km_s` at periapsis radius
/// `periapsis_km`.
///
/// # Method
/// Vis-viva at periapsis, `v_p = sqrt(v_inf^2 + 2 mu / rp)`, for both
/// hyperbolas; the difference is written as
/// `(v_out^2 - v_in^2) / (v_p,out + v_p,in)`, free of cancellation.
///
/// # Units
/// km, km/s, km^3/s^2; km/s. An infinite `periapsis_km` gives
/// `|v_out - v_in|`.
#[inline]
pub fn periapsis_dv_km_s(periapsis_km: f64, vin_km_s: f64, vout_km_s: f64, mu_km3_s2: f64) -> f64 {
    let x = 2.0 * mu_km3_s2 / periapsis_km;
    let (a, b) = (vin_km_s, vout_km_s);
    ((b * b - a * a) / ((b * b + x).sqrt() + (a * a + x).sqrt())).abs()
}

/// The range of outgoing excess speeds that an incoming speed `vin_km_s`
/// can be joined to with a periapsis impulse of at most `max_dv_km_s`
/// at any periapsis radius at or above `min_periapsis_km`.
///
/// # Method
/// The periapsis impulse [`periapsis_dv_km_s`] grows with the periapsis
/// radius (its denominator shrinks), so its least value over the allowed
/// radii is at `min_periapsis_km`; solving `|sqrt(b^2 + x) - sqrt(a^2 +
/// x)| = D` with `x = 2 mu / r_min` for `b` gives the bounds. The search
/// uses this window to skip pairs of legs that cannot meet.
///
/// # Units
/// km/s, km, km^3/s^2; `(low, high)` in km/s.
pub fn matching_speed_window(
    vin_km_s: f64,
    min_periapsis_km: f64,
    mu_km3_s2: f64,
    max_dv_km_s: f64,
) -> (f64, f64) {
    let x = 2.0 * mu_km3_s2 / min_periapsis_km;
    let vp = (vin_km_s * vin_km_s + x).sqrt();
    let lo_p = vp - max_dv_km_s;
    let lo = if lo_p * lo_p > x {
        (lo_p * lo_p - x).sqrt()
    } else {
        0.0
    };
    let hi_p = vp + max_dv_km_s;
    (lo, (hi_p * hi_p - x).sqrt())
}

/// Periapsis radius at which a powered flyby turns the asymptote by
/// `turn_rad`, with excess speeds `vin_km_s` in and `vout_km_s` out.
///
/// # Method
/// Root of `g(rp) = asin(1/e_in) + asin(1/e_out) - delta` by
/// safeguarded Newton iteration (Press et al. 2007, sec. 9.4) inside the
/// bracket between the unpowered radii of the two speeds (see the module
/// docs); `dg/drp = -sum v^2 / (mu e sqrt(e^2 - 1))`. Stops when the step
/// or the bracket falls below `1e-13` of `rp`, at most 100 iterations (the
/// bisection alone halves the bracket each time, so 100 iterations reach
/// the double-precision resolution of any bracket).
///
/// # Units
/// radians, km/s, km^3/s^2; km. Infinite for a turn below
/// [`NO_TURN_RAD`]; zero for a turn of `pi` or more (a head-on reversal
/// needs a periapsis at the centre).
///
/// # Errors
/// [`FlybyError::NonFinite`] for a non-finite input,
/// [`FlybyError::ZeroExcessSpeed`] for a zero speed,
/// [`FlybyError::NonPositive`] for a GM that is not positive.
pub fn powered_periapsis_km(
    turn_rad: f64,
    vin_km_s: f64,
    vout_km_s: f64,
    mu_km3_s2: f64,
) -> Result<f64, FlybyError> {
    finite("the turn angle", turn_rad)?;
    finite("the incoming v-infinity", vin_km_s)?;
    finite("the outgoing v-infinity", vout_km_s)?;
    positive("the flyby body's GM (km^3/s^2)", mu_km3_s2)?;
    if vin_km_s <= 0.0 {
        return Err(FlybyError::ZeroExcessSpeed { which: "incoming" });
    }
    if vout_km_s <= 0.0 {
        return Err(FlybyError::ZeroExcessSpeed { which: "outgoing" });
    }
    Ok(solve_periapsis(turn_rad, vin_km_s, vout_km_s, mu_km3_s2))
}

/// [`powered_periapsis_km`] on inputs already checked.
fn solve_periapsis(turn_rad: f64, vin: f64, vout: f64, mu: f64) -> f64 {
    if turn_rad < NO_TURN_RAD {
        return f64::INFINITY;
    }
    if turn_rad >= PI {
        return 0.0;
    }
    let (slow, fast) = if vin <= vout {
        (vin, vout)
    } else {
        (vout, vin)
    };
    let mut lo = unpowered_periapsis_km(turn_rad, fast, mu);
    let mut hi = unpowered_periapsis_km(turn_rad, slow, mu);
    if hi - lo <= 1e-13 * hi {
        return 0.5 * (lo + hi);
    }
    let g = |rp: f64| half_turn_rad(rp, vin, mu) + half_turn_rad(rp, vout, mu) - turn_rad;
    let dg = |rp: f64| {
        let slope = |v: f64| {
            let e = hyperbola_eccentricity(rp, v, mu);
            v * v / (mu * e * (e * e - 1.0).sqrt())
        };
        -(slope(vin) + slope(vout))
    };
    // Start from the unpowered radius of the mean speed.
    let mut rp = unpowered_periapsis_km(turn_rad, 0.5 * (vin + vout), mu).clamp(lo, hi);
    for _ in 0..100 {
        let f = g(rp);
        if f == 0.0 {
            return rp;
        }
        // g decreases with rp: a positive g means the root lies above.
        if f > 0.0 {
            lo = rp;
        } else {
            hi = rp;
        }
        let d = dg(rp);
        let newton = rp - f / d;
        let next = if d < 0.0 && newton > lo && newton < hi {
            newton
        } else {
            0.5 * (lo + hi)
        };
        let done = (next - rp).abs() <= 1e-13 * rp || hi - lo <= 1e-13 * hi;
        rp = next;
        if done {
            break;
        }
    }
    rp
}

/// Whether a flyby can be flown, and how.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Verdict {
    /// The asymptotic speeds agree within the tolerance and the turn is
    /// reachable at or above the minimum altitude: no impulse needed.
    Unpowered,
    /// The turn is reachable at or above the minimum altitude with a
    /// periapsis impulse.
    Powered,
    /// The turn needs a periapsis below the body's radius plus the minimum
    /// altitude: rejected.
    BelowMinimumAltitude,
}

impl Verdict {
    /// Whether the flyby may be flown (not below the minimum altitude).
    pub fn is_feasible(&self) -> bool {
        !matches!(self, Verdict::BelowMinimumAltitude)
    }

    /// A short word for tables: `unpowered`, `powered` or `too-low`.
    pub fn as_str(&self) -> &'static str {
        match self {
            Verdict::Unpowered => "unpowered",
            Verdict::Powered => "powered",
            Verdict::BelowMinimumAltitude => "too-low",
        }
    }
}

/// Everything the model says about one flyby. No B-plane quantities.
///
/// # Units
/// km/s, degrees, km.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FlybyFigures {
    /// Incoming v-infinity vector (the incoming leg's arrival velocity
    /// minus the body's), km/s, system frame.
    pub vinf_in: Vector3<f64>,
    /// Outgoing v-infinity vector (the outgoing leg's departure velocity
    /// minus the body's), km/s, system frame.
    pub vinf_out: Vector3<f64>,
    /// `|vinf_in|`, km/s.
    pub vinf_in_km_s: f64,
    /// `|vinf_out|`, km/s.
    pub vinf_out_km_s: f64,
    /// Angle between the two asymptotes, degrees in `[0, 180]`.
    pub turn_deg: f64,
    /// The largest turn an unpowered flyby at the minimum altitude gives
    /// at the incoming speed, degrees.
    pub max_unpowered_turn_deg: f64,
    /// Periapsis radius that makes the turn, km (infinite for no turn).
    pub periapsis_km: f64,
    /// `periapsis_km` minus the body's radius, km.
    pub altitude_km: f64,
    /// Periapsis impulse joining the two hyperbolas, km/s.
    pub dv_km_s: f64,
    /// Whether and how the flyby can be flown.
    pub verdict: Verdict,
}

/// Angle between two vectors, radians in `[0, pi]`, by `atan2(|a x b|, a.b)`
/// (accurate at small and large angles alike).
#[inline]
pub fn angle_between_rad(a: &Vector3<f64>, b: &Vector3<f64>) -> f64 {
    a.cross(b).norm().atan2(a.dot(b))
}

/// Evaluates one flyby from its two v-infinity vectors.
///
/// # Method
/// As the module docs: the turn angle is the angle between the vectors;
/// the periapsis radius from [`powered_periapsis_km`] (for equal speeds it
/// is the unpowered radius); the impulse from [`periapsis_dv_km_s`]. The
/// verdict: [`Verdict::BelowMinimumAltitude`] when the radius is below
/// [`FlybyBody::min_periapsis_km`], else [`Verdict::Unpowered`] when the
/// speeds differ by at most `unpowered_tol_km_s`, else
/// [`Verdict::Powered`].
///
/// # Units
/// km/s in, as [`FlybyFigures`] out.
///
/// # Errors
/// As [`powered_periapsis_km`]; [`FlybyError::Limit`] for a negative or
/// non-finite tolerance.
pub fn evaluate(
    vinf_in: &Vector3<f64>,
    vinf_out: &Vector3<f64>,
    body: &FlybyBody,
    unpowered_tol_km_s: f64,
) -> Result<FlybyFigures, FlybyError> {
    limit("the unpowered-flyby tolerance (km/s)", unpowered_tol_km_s)?;
    let (a, b) = (vinf_in.norm(), vinf_out.norm());
    let turn = angle_between_rad(vinf_in, vinf_out);
    let mu = body.mu_km3_s2;
    let rp = powered_periapsis_km(turn, a, b, mu)?;
    let rmin = body.min_periapsis_km();
    let verdict = if rp < rmin {
        Verdict::BelowMinimumAltitude
    } else if (b - a).abs() <= unpowered_tol_km_s {
        Verdict::Unpowered
    } else {
        Verdict::Powered
    };
    Ok(FlybyFigures {
        vinf_in: *vinf_in,
        vinf_out: *vinf_out,
        vinf_in_km_s: a,
        vinf_out_km_s: b,
        turn_deg: turn.to_degrees(),
        max_unpowered_turn_deg: unpowered_turn_rad(rmin, a, mu).to_degrees(),
        periapsis_km: rp,
        altitude_km: rp - body.radius_km,
        dv_km_s: periapsis_dv_km_s(rp, a, b, mu),
        verdict,
    })
}

/// The search's fast path: the periapsis impulse of a flyby, or `None`
/// when the turn needs a periapsis below the minimum. Inputs are finite
/// and non-zero (legs of a solved grid).
///
/// # Method
/// As [`evaluate`], with the minimum-altitude test done first from the
/// turn the two hyperbolas give at the minimum radius (no root finding for
/// rejected pairs).
#[inline]
pub(crate) fn quick_dv_km_s(
    vinf_in: &Vector3<f64>,
    vinf_out: &Vector3<f64>,
    mu_km3_s2: f64,
    min_periapsis_km: f64,
) -> Option<f64> {
    let (a, b) = (vinf_in.norm(), vinf_out.norm());
    if !(a > 0.0 && b > 0.0) {
        return None;
    }
    let turn = angle_between_rad(vinf_in, vinf_out);
    let reach = half_turn_rad(min_periapsis_km, a, mu_km3_s2)
        + half_turn_rad(min_periapsis_km, b, mu_km3_s2);
    if turn > reach {
        return None;
    }
    let rp = solve_periapsis(turn, a, b, mu_km3_s2).max(min_periapsis_km);
    Some(periapsis_dv_km_s(rp, a, b, mu_km3_s2))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::orbit::{propagate, State};
    use proptest::prelude::*;

    /// Curtis, *Orbital Mechanics for Engineering Students*, 2nd ed.
    /// (2010), Example 8.6, Venus flyby. Inputs printed in the example:
    /// mu_sun = 1.3271e11, mu_Venus = 324 900 km^3/s^2, Venus radius 6052
    /// km, orbit radii 149.6e6 km (Earth) and 108.2e6 km (Venus), the
    /// approach ellipse leaving Earth perpendicular to the Sun line and
    /// meeting Venus at true anomaly -30 deg, periapsis altitude 300 km.
    /// Printed intermediate read in a published solution of the example:
    /// e1 = 0.1702. Printed results as quoted in secondary material (the
    /// book itself was not at hand): v-infinity 3.733 km/s, hyperbola
    /// eccentricity 1.272, turn angle 103.6 deg.
    struct Curtis86 {
        vinf: Vector3<f64>,
        e1: f64,
    }

    fn curtis_8_6() -> Curtis86 {
        let (mu_sun, r_earth, r_venus) = (1.3271e11, 149.6e6, 108.2e6);
        let theta = (-30f64).to_radians();
        // Orbit equation at aphelion (Earth) and at the encounter.
        let e1 = (r_earth - r_venus) / (r_earth + r_venus * theta.cos());
        let h1 = (mu_sun * r_earth * (1.0 - e1)).sqrt();
        let v_perp = h1 / r_venus;
        let v_radial = mu_sun / h1 * e1 * theta.sin();
        let v_venus = (mu_sun / r_venus).sqrt();
        Curtis86 {
            vinf: Vector3::new(v_perp - v_venus, v_radial, 0.0),
            e1,
        }
    }

    const MU_VENUS_CURTIS: f64 = 324_900.0;
    const RP_CURTIS_KM: f64 = 6052.0 + 300.0;

    #[test]
    fn curtis_example_8_6_unpowered_relations() {
        let c = curtis_8_6();
        // Printed to 4 digits: half a unit in the last place.
        assert!((c.e1 - 0.1702).abs() < 5e-5, "e1 {}", c.e1);
        // The book subtracts heliocentric speeds printed to 0.01 km/s
        // (37.51 - 35.02), so its v-infinity carries up to ~0.007 km/s of
        // rounding.
        let v = c.vinf.norm();
        assert!((v - 3.733).abs() < 7e-3, "vinf {v}");
        // From the printed v-infinity, the relations give the printed
        // eccentricity (4 digits) and turn angle (0.1 deg).
        let e = hyperbola_eccentricity(RP_CURTIS_KM, 3.733, MU_VENUS_CURTIS);
        assert!((e - 1.272).abs() < 5e-4, "e {e}");
        let turn = unpowered_turn_rad(RP_CURTIS_KM, 3.733, MU_VENUS_CURTIS).to_degrees();
        assert!((turn - 103.6).abs() < 0.05, "turn {turn}");
    }

    #[test]
    fn curtis_example_8_6_periapsis_from_the_printed_turn() {
        // Rotating the approach v-infinity by the printed 103.6 deg and
        // asking the model for the periapsis that makes that turn gives
        // back the example's 300 km altitude. Tolerance: 0.05 deg of
        // printed rounding moves rp by d rp / d delta ~ 11 700 km/rad,
        // i.e. ~10 km.
        let v = curtis_8_6().vinf;
        let d = 103.6f64.to_radians();
        let (s, c) = d.sin_cos();
        let out = Vector3::new(c * v.x - s * v.y, s * v.x + c * v.y, 0.0);
        let body = FlybyBody::new(MU_VENUS_CURTIS, 6052.0, 0.0).expect("valid");
        let f = evaluate(&v, &out, &body, UNPOWERED_TOLERANCE_KM_S).expect("finite");
        assert!(
            (f.altitude_km - 300.0).abs() < 12.0,
            "alt {}",
            f.altitude_km
        );
        assert_eq!(f.verdict, Verdict::Unpowered);
        assert!(f.dv_km_s < 1e-9, "dv {}", f.dv_km_s);
        // Below 310 km minimum the same turn is rejected.
        let strict = FlybyBody::new(MU_VENUS_CURTIS, 6052.0, 320.0).expect("valid");
        let f = evaluate(&v, &out, &strict, UNPOWERED_TOLERANCE_KM_S).expect("finite");
        assert_eq!(f.verdict, Verdict::BelowMinimumAltitude);
        assert!(!f.verdict.is_feasible());
    }

    #[test]
    fn powered_radius_reduces_to_the_unpowered_relation_for_equal_speeds() {
        // Curtis sec. 8.9: rp = mu / v^2 (1 / sin(delta/2) - 1) in closed
        // form, against the root finder; and the impulse vanishes.
        for &(turn_deg, v) in &[(5.0, 12.0), (40.0, 6.0), (103.6, 3.733), (170.0, 1.2)] {
            let turn = f64::to_radians(turn_deg);
            let closed = unpowered_periapsis_km(turn, v, MU_VENUS_CURTIS);
            let root = powered_periapsis_km(turn, v, v, MU_VENUS_CURTIS).expect("valid");
            assert!(
                (root / closed - 1.0).abs() < 1e-12,
                "{turn_deg}: {root} vs {closed}"
            );
            assert!(periapsis_dv_km_s(root, v, v, MU_VENUS_CURTIS) < 1e-15);
        }
    }

    /// Builds the two hyperbolas of a powered flyby at periapsis, flies
    /// each away from periapsis with the universal-variable propagator,
    /// and checks the physics: far out, the speeds are the requested
    /// v-infinities (energy, vis-viva) and the asymptotes are turned by
    /// the requested angle (geometry), with a single tangential impulse
    /// of the model's delta-v at periapsis.
    #[test]
    fn powered_flyby_hyperbolas_reach_the_requested_asymptotes() {
        let mu = 126_686_534.0; // Jupiter-like GM, km^3/s^2
        for &(vin, vout, turn_deg) in &[(5.6, 6.1, 60.0), (9.0, 7.5, 25.0), (3.0, 3.4, 140.0)] {
            let turn = f64::to_radians(turn_deg);
            let rp = powered_periapsis_km(turn, vin, vout, mu).expect("valid");
            let vp_in = (vin * vin + 2.0 * mu / rp).sqrt();
            let vp_out = (vout * vout + 2.0 * mu / rp).sqrt();
            let peri = |vp: f64| State {
                r_km: Vector3::new(rp, 0.0, 0.0),
                v_km_s: Vector3::new(0.0, vp, 0.0),
            };
            // Far enough that mu / (r v^2) < 1e-5: the direction then
            // differs from the asymptote by less than ~1e-4 rad.
            let t = 3.0e9 / vin.min(vout);
            let before = propagate(&peri(vp_in), -t, mu).expect("propagates");
            let after = propagate(&peri(vp_out), t, mu).expect("propagates");
            let speed_in = (before.v_km_s.norm_squared() - 2.0 * mu / before.r_km.norm()).sqrt();
            let speed_out = (after.v_km_s.norm_squared() - 2.0 * mu / after.r_km.norm()).sqrt();
            assert!((speed_in - vin).abs() < 1e-9 * vin, "{speed_in}");
            assert!((speed_out - vout).abs() < 1e-9 * vout, "{speed_out}");
            let got = angle_between_rad(&before.v_km_s, &after.v_km_s);
            assert!((got - turn).abs() < 2e-4, "turn {got} vs {turn}");
            let dv = periapsis_dv_km_s(rp, vin, vout, mu);
            assert!((dv - (vp_out - vp_in).abs()).abs() < 1e-12);
        }
    }

    #[test]
    fn speed_window_bounds_the_least_impulse() {
        let (mu, rmin, d) = (324_859.0, 6351.8, 0.4);
        for vin in [0.5, 2.0, 4.0, 9.0] {
            let (lo, hi) = matching_speed_window(vin, rmin, mu, d);
            assert!((periapsis_dv_km_s(rmin, vin, hi, mu) - d).abs() < 1e-12);
            if lo > 0.0 {
                assert!((periapsis_dv_km_s(rmin, vin, lo, mu) - d).abs() < 1e-12);
            }
            // A radius above the minimum never needs less.
            assert!(periapsis_dv_km_s(2.0 * rmin, vin, hi, mu) > d);
        }
    }

    #[test]
    fn bad_inputs_are_errors_not_panics() {
        let v = Vector3::new(3.0, 0.0, 0.0);
        let body = FlybyBody::new(324_859.0, 6051.8, 300.0).expect("valid");
        assert!(matches!(
            evaluate(&Vector3::zeros(), &v, &body, 1e-3),
            Err(FlybyError::ZeroExcessSpeed { which: "incoming" })
        ));
        assert!(matches!(
            evaluate(&v, &Vector3::new(f64::NAN, 0.0, 0.0), &body, 1e-3),
            Err(FlybyError::NonFinite { .. })
        ));
        assert!(evaluate(&v, &v, &body, -1.0).is_err());
        assert!(FlybyBody::new(-1.0, 6051.8, 0.0).is_err());
        assert!(FlybyBody::new(1.0, f64::INFINITY, 0.0).is_err());
        assert!(FlybyBody::new(1.0, 1.0, -5.0).is_err());
        // No turn: infinite periapsis, impulse |vout - vin|.
        let f = evaluate(&v, &(v * 1.1), &body, 1e-3).expect("finite");
        assert!(f.periapsis_km.is_infinite());
        assert!((f.dv_km_s - 0.3).abs() < 1e-12);
        // A reversal needs a periapsis at the centre: too low.
        let f = evaluate(&v, &(-v), &body, 1e-3).expect("finite");
        assert_eq!(f.verdict, Verdict::BelowMinimumAltitude);
    }

    proptest! {
        /// A flyby that would pass below the surface is never feasible,
        /// and the fast path agrees with the full evaluation about which
        /// flybys are feasible and what they cost.
        #[test]
        fn never_feasible_below_the_surface(
            a in prop::array::uniform3(-15.0f64..15.0),
            b in prop::array::uniform3(-15.0f64..15.0),
            alt in 0.0f64..2000.0,
        ) {
            let (vin, vout) = (Vector3::from(a), Vector3::from(b));
            prop_assume!(vin.norm() > 0.05 && vout.norm() > 0.05);
            let body = FlybyBody::new(324_859.0, 6051.8, alt).expect("valid");
            let f = evaluate(&vin, &vout, &body, 1e-3).expect("finite");
            if f.verdict.is_feasible() {
                prop_assert!(f.periapsis_km >= body.radius_km + alt);
                prop_assert!(f.altitude_km >= alt);
            } else {
                prop_assert!(f.periapsis_km < body.radius_km + alt);
            }
            // The turn at the returned radius is the requested one.
            if f.periapsis_km.is_finite() && f.periapsis_km > 0.0 {
                let g = half_turn_rad(f.periapsis_km, f.vinf_in_km_s, 324_859.0)
                    + half_turn_rad(f.periapsis_km, f.vinf_out_km_s, 324_859.0);
                prop_assert!((g - f.turn_deg.to_radians()).abs() < 1e-9);
            }
            let quick = quick_dv_km_s(&vin, &vout, 324_859.0, body.min_periapsis_km());
            prop_assert_eq!(quick.is_some(), f.verdict.is_feasible());
            if let Some(dv) = quick {
                prop_assert!((dv - f.dv_km_s).abs() < 1e-9);
            }
        }
    }
}
