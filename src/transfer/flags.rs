//! Sanity flags of a transfer arc: what a number alone would not say.
//!
//! - `periapsis-inside`: the arc passes its periapsis, and the periapsis
//!   lies inside the central body's radius (when the system gives one). The
//!   arc is a valid conic but not a flyable transfer: such arcs are kept in
//!   grids but never chosen as optima or counted in launch periods unless
//!   the user allows flagged arcs.
//! - `hyperbolic`: the transfer orbit escapes the central body (specific
//!   energy >= 0). Information only: fast transfers are real.
//! - `relativistic`: the spacecraft's speed on the arc, at either end,
//!   exceeds [`RELATIVISTIC_SPEED_KM_S`], 1 % of the speed of light. The
//!   time of flight is then so short that the arc has no physical meaning
//!   (see the constant); treated like `periapsis-inside`.

use nalgebra::Vector3;

/// Speed of light, km/s (exact: SI definition of the metre, 1983).
pub const SPEED_OF_LIGHT_KM_S: f64 = 299_792.458;

/// Arcs faster than this (km/s) at either end are flagged `relativistic`:
/// 1 % of the speed of light, 2998 km/s. There the first relativistic
/// correction to two-body motion, of order (v/c)^2, reaches 1e-4, so the
/// Newtonian patched-conic model no longer describes the arc; and no
/// spacecraft has come within a factor of ten of it (the fastest, Parker
/// Solar Probe, about 190 km/s at perihelion: from memory). Such speeds
/// only arise from times of flight far too short for the distance.
pub const RELATIVISTIC_SPEED_KM_S: f64 = 0.01 * SPEED_OF_LIGHT_KM_S;

/// A set of sanity flags, stored in one byte per grid cell.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Hash)]
pub struct ArcFlags(u8);

impl ArcFlags {
    /// No flag.
    pub const NONE: ArcFlags = ArcFlags(0);
    /// The arc's periapsis lies inside the central body.
    pub const PERIAPSIS_INSIDE: ArcFlags = ArcFlags(1);
    /// The transfer orbit escapes the central body.
    pub const HYPERBOLIC: ArcFlags = ArcFlags(2);
    /// The arc is faster than [`RELATIVISTIC_SPEED_KM_S`].
    pub const RELATIVISTIC: ArcFlags = ArcFlags(4);

    /// Each flag with its name in files, in the order they are written.
    pub const NAMED: [(ArcFlags, &'static str); 3] = [
        (ArcFlags::PERIAPSIS_INSIDE, "periapsis-inside"),
        (ArcFlags::HYPERBOLIC, "hyperbolic"),
        (ArcFlags::RELATIVISTIC, "relativistic"),
    ];

    /// The byte stored in a grid.
    pub fn bits(self) -> u8 {
        self.0
    }

    /// Flags from a stored byte (unknown bits dropped).
    pub fn from_bits(bits: u8) -> ArcFlags {
        ArcFlags(bits & 0b111)
    }

    /// Whether every flag of `other` is set.
    pub fn contains(self, other: ArcFlags) -> bool {
        self.0 & other.0 == other.0
    }

    /// Both sets together.
    #[must_use]
    pub fn union(self, other: ArcFlags) -> ArcFlags {
        ArcFlags(self.0 | other.0)
    }

    /// Whether no flag is set.
    pub fn is_empty(self) -> bool {
        self.0 == 0
    }

    /// Whether the arc is unfit to be an optimum or to open a launch
    /// period (`periapsis-inside` or `relativistic`) unless the user
    /// allows flagged arcs.
    pub fn excludes(self) -> bool {
        self.0 & (ArcFlags::PERIAPSIS_INSIDE.0 | ArcFlags::RELATIVISTIC.0) != 0
    }

    /// The names of the flags set, in [`ArcFlags::NAMED`] order.
    pub fn names(self) -> Vec<&'static str> {
        ArcFlags::NAMED
            .iter()
            .filter(|(f, _)| self.contains(*f))
            .map(|(_, n)| *n)
            .collect()
    }

    /// The names joined by `;` (empty without flags), as in files.
    pub fn to_text(self) -> String {
        self.names().join(";")
    }

    /// Read [`ArcFlags::to_text`] back; `None` for an unknown name.
    pub fn parse(text: &str) -> Option<ArcFlags> {
        let mut flags = ArcFlags::NONE;
        for name in text.split(';').filter(|n| !n.is_empty()) {
            let (f, _) = ArcFlags::NAMED.iter().find(|(_, n)| *n == name)?;
            flags = flags.union(*f);
        }
        Some(flags)
    }

    /// The flags of a transfer arc that leaves `r1` with velocity `v1` and
    /// arrives with velocity `v2`, sweeping `transfer_angle_rad` (in
    /// [0, 2 pi)) after `revs` complete revolutions, around a body of GM
    /// `mu` and radius `central_radius_km` (if known).
    ///
    /// # Method
    /// Two-body conic from the departure state (Bate, Mueller & White
    /// 1971, ch. 2): energy `E = v1^2 / 2 - mu / r1` (hyperbolic when
    /// `E >= 0`); angular momentum `h = |r1 x v1|`, parameter `p = h^2 / mu`,
    /// eccentricity `e = sqrt(1 + 2 E h^2 / mu^2)`, periapsis `p / (1 + e)`.
    /// Only when that lies inside the radius is the departure true anomaly
    /// computed, `nu1 = atan2(h (r1 . v1) / (mu r1), p / r1 - 1)`, and the
    /// arc passes periapsis when it covers true anomaly 0 (mod 360 deg):
    /// always with a complete revolution, else when `nu1 <= 0 <= nu1 +
    /// angle` or `nu1 + angle >= 360 deg`.
    ///
    /// # Units
    /// km, km/s, km^3/s^2, radians.
    #[allow(clippy::too_many_arguments)]
    #[inline]
    pub fn of_arc(
        r1: &Vector3<f64>,
        r1_norm_km: f64,
        v1: &Vector3<f64>,
        v2: &Vector3<f64>,
        transfer_angle_rad: f64,
        revs: u32,
        mu_km3_s2: f64,
        central_radius_km: Option<f64>,
    ) -> ArcFlags {
        let mut flags = ArcFlags::NONE;
        let v1_sq = v1.norm_squared();
        let energy = 0.5 * v1_sq - mu_km3_s2 / r1_norm_km;
        if energy >= 0.0 {
            flags = flags.union(ArcFlags::HYPERBOLIC);
        }
        let limit_sq = RELATIVISTIC_SPEED_KM_S * RELATIVISTIC_SPEED_KM_S;
        if v1_sq > limit_sq || v2.norm_squared() > limit_sq {
            flags = flags.union(ArcFlags::RELATIVISTIC);
        }
        if let Some(radius) = central_radius_km {
            let rp = periapsis_km(r1, r1_norm_km, v1, mu_km3_s2);
            if rp < radius
                && passes_periapsis(r1, r1_norm_km, v1, transfer_angle_rad, revs, mu_km3_s2)
            {
                flags = flags.union(ArcFlags::PERIAPSIS_INSIDE);
            }
        }
        flags
    }
}

impl std::fmt::Display for ArcFlags {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.pad(&self.to_text())
    }
}

/// Periapsis radius (km) of the conic through `r1` with velocity `v1`.
///
/// # Method
/// `p / (1 + e)` with `p = h^2 / mu` and `e = sqrt(1 + 2 E h^2 / mu^2)`
/// (Bate, Mueller & White 1971, eqs. 2.4-2.5); 0 for a rectilinear arc.
pub fn periapsis_km(r1: &Vector3<f64>, r1_norm_km: f64, v1: &Vector3<f64>, mu_km3_s2: f64) -> f64 {
    let h_sq = r1.cross(v1).norm_squared();
    let energy = 0.5 * v1.norm_squared() - mu_km3_s2 / r1_norm_km;
    let e = (1.0 + 2.0 * energy * h_sq / (mu_km3_s2 * mu_km3_s2))
        .max(0.0)
        .sqrt();
    h_sq / mu_km3_s2 / (1.0 + e)
}

/// Whether the arc covers true anomaly 0 (see [`ArcFlags::of_arc`]).
fn passes_periapsis(
    r1: &Vector3<f64>,
    r1_norm_km: f64,
    v1: &Vector3<f64>,
    transfer_angle_rad: f64,
    revs: u32,
    mu_km3_s2: f64,
) -> bool {
    if revs > 0 {
        return true;
    }
    let h = r1.cross(v1).norm();
    let p = h * h / mu_km3_s2;
    let nu1 = (h * r1.dot(v1) / (mu_km3_s2 * r1_norm_km)).atan2(p / r1_norm_km - 1.0);
    let end = nu1 + transfer_angle_rad;
    (nu1 <= 0.0 && end >= 0.0) || end >= std::f64::consts::TAU
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// GM of the Sun, km^3/s^2 (IAU 2009, REFERENCES.md section 4).
    const MU: f64 = 1.32712440041e11;

    /// Vis-viva (Bate, Mueller & White 1971, ch. 1-2): at periapsis r_p
    /// of an ellipse of eccentricity e the speed is sqrt(mu (1 + e) / r_p),
    /// perpendicular to r; the periapsis computed back is r_p. And at the
    /// escape speed sqrt(2 mu / r) the orbit is (just) hyperbolic.
    #[test]
    fn periapsis_and_energy_from_vis_viva() {
        let rp = 7.0e7;
        let e = 0.6;
        let r1 = Vector3::new(rp, 0.0, 0.0);
        let v1 = Vector3::new(0.0, (MU * (1.0 + e) / rp).sqrt(), 0.0);
        assert_relative_eq!(periapsis_km(&r1, rp, &v1, MU), rp, max_relative = 1e-12);
        // From apoapsis r_a = r_p (1 + e) / (1 - e), speed sqrt(mu (1 - e) / r_a).
        let ra = rp * (1.0 + e) / (1.0 - e);
        let r2 = Vector3::new(-ra, 0.0, 0.0);
        let v2 = Vector3::new(0.0, -(MU * (1.0 - e) / ra).sqrt(), 0.0);
        assert_relative_eq!(periapsis_km(&r2, ra, &v2, MU), rp, max_relative = 1e-12);
        let escape = Vector3::new(0.0, (2.0 * MU / ra).sqrt() * (1.0 + 1e-12), 0.0);
        let f = ArcFlags::of_arc(&r2, ra, &escape, &escape, 1.0, 0, MU, None);
        assert!(f.contains(ArcFlags::HYPERBOLIC));
        let f = ArcFlags::of_arc(&r2, ra, &v2, &v2, 1.0, 0, MU, None);
        assert!(f.is_empty());
    }

    /// Periapsis inside the body is flagged only when the arc reaches it:
    /// from apoapsis (true anomaly 180 deg) an arc of 170 deg stops short,
    /// one of 190 deg passes it; any complete revolution passes it.
    #[test]
    fn periapsis_inside_only_when_passed() {
        let (rp, e) = (6.0e5, 0.95);
        let ra = rp * (1.0 + e) / (1.0 - e);
        let r1 = Vector3::new(-ra, 0.0, 0.0);
        let v1 = Vector3::new(0.0, -(MU * (1.0 - e) / ra).sqrt(), 0.0);
        let radius = Some(7.0e5);
        let short = ArcFlags::of_arc(&r1, ra, &v1, &v1, 170f64.to_radians(), 0, MU, radius);
        assert!(!short.contains(ArcFlags::PERIAPSIS_INSIDE));
        let long = ArcFlags::of_arc(&r1, ra, &v1, &v1, 190f64.to_radians(), 0, MU, radius);
        assert!(long.contains(ArcFlags::PERIAPSIS_INSIDE) && long.excludes());
        let rev = ArcFlags::of_arc(&r1, ra, &v1, &v1, 10f64.to_radians(), 1, MU, radius);
        assert!(rev.contains(ArcFlags::PERIAPSIS_INSIDE));
        // A periapsis outside the radius is never flagged.
        let wide = ArcFlags::of_arc(&r1, ra, &v1, &v1, 190f64.to_radians(), 0, MU, Some(5.0e5));
        assert!(wide.is_empty());
        // Without a radius the check is not made.
        let none = ArcFlags::of_arc(&r1, ra, &v1, &v1, 190f64.to_radians(), 0, MU, None);
        assert!(none.is_empty());
    }

    /// The speed of light is exact by definition (SI, 1983); the
    /// threshold is 1 % of it.
    #[test]
    fn relativistic_threshold() {
        assert_relative_eq!(RELATIVISTIC_SPEED_KM_S, 2997.92458, max_relative = 1e-15);
        let r = Vector3::new(1.5e8, 0.0, 0.0);
        let fast = Vector3::new(0.0, 3000.0, 0.0);
        let f = ArcFlags::of_arc(&r, 1.5e8, &fast, &Vector3::zeros(), 0.1, 0, MU, None);
        assert!(f.contains(ArcFlags::RELATIVISTIC) && f.excludes());
        assert_eq!(f.to_text(), "hyperbolic;relativistic");
        assert_eq!(ArcFlags::parse(&f.to_text()), Some(f));
        assert_eq!(ArcFlags::parse(""), Some(ArcFlags::NONE));
        assert_eq!(ArcFlags::parse("bogus"), None);
        assert!(!ArcFlags::HYPERBOLIC.excludes());
    }
}

#[cfg(test)]
mod arc_tests {
    use super::*;
    use crate::ephemeris::System;
    use crate::orbit::{propagate, State};
    use crate::time::Epoch;
    use crate::transfer::{arcs_between, Endpoints};

    /// Invariant (two-body propagation, Bate, Mueller & White 1971 ch. 4,
    /// universal variables): an arc flagged `periapsis-inside` really dips
    /// below the central body's radius when flown, and an unflagged one
    /// stays above it. Arcs of the demo system from Teodra to Ashkel, one
    /// a Type II arc of 353.5 deg that swings round the star: the lowest
    /// radius along each arc from 2000 samples refined by golden-section
    /// search.
    #[test]
    fn flagged_arcs_dive_into_the_central_body_when_flown() {
        let sys = System::demo();
        let radius = sys.central.radius_km.expect("demo star has a radius");
        let mu = sys.central.mu_km3_s2;
        let from = sys.find("Teodra").expect("demo");
        let to = sys.find("Ashkel").expect("demo");
        let mut seen = (0, 0);
        for (depart, arrive) in [
            ("2031-01-01", "2031-06-05"),
            ("2031-01-11", "2031-03-02"),
            ("2031-05-06", "2031-08-24"),
            ("2031-01-01", "2031-09-13"),
        ] {
            let (d, a) = (
                Epoch::parse(depart).expect("date"),
                Epoch::parse(arrive).expect("date"),
            );
            let arcs = arcs_between(&sys, from, to, &d, &a, &Endpoints::bare(), 1).expect("arcs");
            let r1 = sys.state(from, &d).r_km;
            for (f, sol) in &arcs {
                let start = State {
                    r_km: r1,
                    v_km_s: sol.v1,
                };
                let tof_s = f.tof_days * 86400.0;
                let r_at = |t: f64| propagate(&start, t, mu).expect("propagates").r_km.norm();
                // Coarse samples, then golden-section search (Kiefer 1953)
                // between the neighbours of the lowest: r(t) is unimodal
                // near periapsis.
                let n = 2000;
                let h = tof_s / f64::from(n);
                let k = (0..=n)
                    .min_by(|&a, &b| r_at(h * f64::from(a)).total_cmp(&r_at(h * f64::from(b))))
                    .expect("samples");
                let lo = (h * (f64::from(k) - 1.0)).max(0.0);
                let hi = (h * (f64::from(k) + 1.0)).min(tof_s);
                let lowest = crate::windows::golden(r_at, lo, hi, 1e-3).1;
                let flagged = f.flags.contains(ArcFlags::PERIAPSIS_INSIDE);
                assert_eq!(
                    flagged,
                    lowest < radius,
                    "{depart} {arrive} {:?}: lowest {lowest} km",
                    f.branch
                );
                if flagged {
                    seen.0 += 1;
                } else {
                    seen.1 += 1;
                }
            }
        }
        assert!(seen.0 >= 2 && seen.1 >= 2, "{seen:?}");
    }
}
