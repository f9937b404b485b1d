//! Where the transfer opportunities between two bodies fall.
//!
//! Opportunities recur once per synodic period. Each is bracketed by the
//! date at which the arrival body leads the departure body by the phase
//! angle a Hohmann transfer between their mean orbits would need; the grid
//! sweep and window search then look around that date.

use std::f64::consts::{PI, TAU};

use crate::ephemeris::System;

/// The phasing of one opportunity.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Opportunity {
    /// Departure date at which the Hohmann phase angle is met, days past
    /// J2000 TDB.
    pub depart_days: f64,
    /// Hohmann transfer time between the mean orbits, days.
    pub hohmann_tof_days: f64,
    /// Synodic period of the pair, days.
    pub synodic_days: f64,
}

/// Hohmann transfer time (days) between circular orbits of radii
/// `a1_km` and `a2_km` around a body of GM `mu_km3_s2`.
///
/// # Method
/// Half the period of the transfer ellipse by Kepler's third law:
/// `pi sqrt(((a1 + a2) / 2)^3 / mu)` (Curtis 2010, eq. 6.3 with 2.83).
pub fn hohmann_tof_days(a1_km: f64, a2_km: f64, mu_km3_s2: f64) -> f64 {
    let a = 0.5 * (a1_km + a2_km);
    PI * (a * a * a / mu_km3_s2).sqrt() / 86_400.0
}

/// The first opportunity from `from` to `to` whose Hohmann phasing date
/// is at or after `after_days` (days past J2000 TDB).
///
/// Returns `None` when the two bodies share a period (no recurrence).
///
/// # Method
/// The required lead angle of the arrival body at departure is
/// `pi - n2 T_H` (mean motion `n2`, Hohmann time `T_H`); the actual lead
/// is the difference of the bodies' longitudes in the reference plane.
/// Scanned daily over one synodic period, then refined by bisection on the
/// wrapped difference.
pub fn next_opportunity(
    system: &System,
    from: usize,
    to: usize,
    after_days: f64,
) -> Option<Opportunity> {
    let synodic = system.synodic_period_days(from, to);
    if !synodic.is_finite() {
        return None;
    }
    let mu = system.central.mu_km3_s2;
    let a1 = system.bodies[from].elements.a_km;
    let a2 = system.bodies[to].elements.a_km;
    let t_h = hohmann_tof_days(a1, a2, mu);
    // Signed: a retrograde target's longitude falls.
    let p2 = system.signed_period_days(to);
    let required = PI - TAU * t_h / p2;
    let error = |d: f64| -> f64 {
        let r1 = system.state_at_days(from, d).r_km;
        let r2 = system.state_at_days(to, d).r_km;
        let lead = r2.y.atan2(r2.x) - r1.y.atan2(r1.x);
        (lead - required + PI).rem_euclid(TAU) - PI
    };
    // One synodic period holds one crossing; a margin covers a crossing
    // that falls just before `after_days`.
    let steps = (1.05 * synodic).ceil() as usize + 2;
    let mut prev = error(after_days);
    for k in 1..=steps {
        let d = after_days + k as f64;
        let cur = error(d);
        // A true crossing changes sign by a small amount; a wrap jumps by
        // about 2 pi.
        if prev.signum() != cur.signum() && (cur - prev).abs() < PI {
            let (mut lo, mut hi) = (d - 1.0, d);
            let f_lo = prev;
            for _ in 0..50 {
                let mid = 0.5 * (lo + hi);
                if error(mid).signum() == f_lo.signum() {
                    lo = mid;
                } else {
                    hi = mid;
                }
            }
            return Some(Opportunity {
                depart_days: 0.5 * (lo + hi),
                hohmann_tof_days: t_h,
                synodic_days: synodic,
            });
        }
        prev = cur;
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::orbit::{propagate, State};
    use approx::assert_relative_eq;
    use nalgebra::Vector3;

    /// Hohmann time between circular orbits at 1 and 1.524 au around the
    /// Sun: about 259 days.
    ///
    /// Source: Curtis (2010), *Orbital Mechanics for Engineering Students*,
    /// Example 8.4 (from memory). Printed to three digits, so the tolerance
    /// is half a day.
    #[test]
    fn hohmann_earth_mars_time() {
        let au = 149_597_870.7;
        let t = hohmann_tof_days(au, 1.524 * au, 1.327_124_400_41e11);
        assert!((t - 259.0).abs() < 0.5, "{t}");
    }

    /// The Hohmann time is what the transfer ellipse takes from periapsis
    /// to apoapsis: a state at r1 with the vis-viva speed of the ellipse
    /// with a = (r1 + r2) / 2, propagated by universal variables (an
    /// independent routine, Bate, Mueller & White 1971, ch. 4) for that
    /// time, is at r2 on the far side with no radial velocity. Tolerance
    /// 1e-9: the propagator's convergence.
    #[test]
    fn hohmann_time_takes_the_ellipse_from_periapsis_to_apoapsis() {
        let (r1, r2, mu): (f64, f64, f64) = (1.0e8, 3.0e8, 1.3e11);
        let a = 0.5 * (r1 + r2);
        let start = State {
            r_km: Vector3::new(r1, 0.0, 0.0),
            v_km_s: Vector3::new(0.0, (mu * (2.0 / r1 - 1.0 / a)).sqrt(), 0.0),
        };
        let t_s = hohmann_tof_days(r1, r2, mu) * 86_400.0;
        let end = propagate(&start, t_s, mu).expect("ellipse propagates");
        assert_relative_eq!(end.r_km, Vector3::new(-r2, 0.0, 0.0), epsilon = 1e-9 * r2);
        assert!(end.r_km.dot(&end.v_km_s).abs() < 1e-9 * r2 * end.v_km_s.norm());
    }

    /// Two circular coplanar orbits (tests/fixtures/two-circles.toml, the
    /// radii of Curtis 2010, Example 8.4): at the opportunity's date, a
    /// spacecraft leaving the inner body tangentially with the Hohmann
    /// ellipse's periapsis speed (vis-viva) and propagated by universal
    /// variables for the Hohmann time meets the outer body. The next
    /// opportunity does too, one synodic period later. Tolerance 1e-8 of
    /// the orbit radius: the bisection brackets the date to ~1e-13 day.
    #[test]
    fn opportunity_dates_put_a_hohmann_arc_on_the_arrival_body() {
        let system = System::from_toml_str(
            include_str!("../tests/fixtures/two-circles.toml"),
            "two-circles.toml",
        )
        .expect("fixture parses");
        let mu = system.central.mu_km3_s2;
        let r2 = system.bodies[1].elements.a_km;
        let start = system.epoch.days_since_j2000_tdb();
        let first = next_opportunity(&system, 0, 1, start).expect("periods differ");
        let second =
            next_opportunity(&system, 0, 1, first.depart_days + 1.0).expect("periods differ");
        for opp in [first, second] {
            let s1 = system.state_at_days(0, opp.depart_days);
            let r1 = s1.r_km.norm();
            let a = 0.5 * (r1 + r2);
            let leave = State {
                r_km: s1.r_km,
                v_km_s: s1.v_km_s.normalize() * (mu * (2.0 / r1 - 1.0 / a)).sqrt(),
            };
            let tof_s = opp.hohmann_tof_days * 86_400.0;
            let arc_end = propagate(&leave, tof_s, mu).expect("ellipse propagates");
            let target = system.state_at_days(1, opp.depart_days + opp.hohmann_tof_days);
            assert_relative_eq!(arc_end.r_km, target.r_km, epsilon = 1e-8 * r2);
        }
        assert!(first.depart_days >= start);
        assert_relative_eq!(
            second.depart_days - first.depart_days,
            first.synodic_days,
            epsilon = 1e-6
        );
    }

    /// Bodies with one period never change phase: no opportunity.
    #[test]
    fn equal_periods_have_no_opportunity() {
        let text = include_str!("../tests/fixtures/two-circles.toml")
            .replace("a_au = 1.524", "a_au = 1.0");
        let system = System::from_toml_str(&text, "t.toml").expect("parses");
        assert!(next_opportunity(&system, 0, 1, 0.0).is_none());
    }
}
