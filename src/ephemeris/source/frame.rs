//! The two inertial frames ephemeris files come in, and the rotation
//! between them.
//!
//! Planetary ephemerides (SPK kernels, most OEMs) are given on the axes of
//! the ICRF; mean-element tables such as Standish's are given in the mean
//! ecliptic and equinox of J2000. The two share the x axis (the equinox)
//! and differ by a rotation about it through the obliquity of the
//! ecliptic at J2000.
//!
//! EME2000 (mean equator and equinox of J2000) is taken as the ICRF: the
//! two differ by the frame bias, a few hundredths of an arcsecond (IERS
//! Conventions 2010, ch. 5; below 0.1 arcsec per Archinal et al. 2018),
//! about 15 km at 1 au, far below what a patched-conic design figure
//! resolves.

use nalgebra::Vector3;

use crate::orbit::State;

/// Obliquity of the ecliptic at J2000, arcseconds.
///
/// Source: IAU 2006 precession (Capitaine, Wallace & Chapront 2003,
/// adopted by IAU 2006 Resolution B1): epsilon_0 = 84381.406 arcsec.
pub const OBLIQUITY_J2000_ARCSEC: f64 = 84381.406;

/// Obliquity of the ecliptic at J2000, radians (see
/// [`OBLIQUITY_J2000_ARCSEC`]).
pub fn obliquity_j2000_rad() -> f64 {
    (OBLIQUITY_J2000_ARCSEC / 3600.0).to_radians()
}

/// An inertial frame of an ephemeris file.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
#[non_exhaustive]
pub enum Frame {
    /// The axes of the International Celestial Reference Frame (also
    /// EME2000, SPICE's `J2000`, GCRF axes): x to the equinox, z to the
    /// celestial pole.
    Icrf,
    /// The mean ecliptic and equinox of J2000 (SPICE's `ECLIPJ2000`): x to
    /// the equinox, z to the ecliptic pole, obliquity
    /// [`OBLIQUITY_J2000_ARCSEC`] from the ICRF.
    EclipticJ2000,
}

impl Frame {
    /// The frame's usual name in files (`ICRF`, `ECLIPJ2000`).
    pub fn name(&self) -> &'static str {
        match self {
            Frame::Icrf => "ICRF",
            Frame::EclipticJ2000 => "ECLIPJ2000",
        }
    }

    /// A vector given in `self`, expressed in `to`.
    ///
    /// # Method
    /// ICRF to ecliptic: rotation about the common x axis by the obliquity
    /// epsilon, `x' = x`, `y' = y cos e + z sin e`, `z' = -y sin e + z cos e`
    /// (e.g. Seidelmann (ed.), *Explanatory Supplement to the Astronomical
    /// Almanac*, 1992); the reverse rotation back.
    ///
    /// # Units
    /// Any; the rotation keeps lengths.
    pub fn rotate(&self, v: &Vector3<f64>, to: Frame) -> Vector3<f64> {
        let (s, c) = obliquity_j2000_rad().sin_cos();
        match (self, to) {
            (Frame::Icrf, Frame::EclipticJ2000) => {
                Vector3::new(v.x, c * v.y + s * v.z, -s * v.y + c * v.z)
            }
            (Frame::EclipticJ2000, Frame::Icrf) => {
                Vector3::new(v.x, c * v.y - s * v.z, s * v.y + c * v.z)
            }
            _ => *v,
        }
    }

    /// A state given in `self`, expressed in `to` (both frames are
    /// inertial and fixed, so position and velocity rotate alike).
    pub fn rotate_state(&self, state: &State, to: Frame) -> State {
        State {
            r_km: self.rotate(&state.r_km, to),
            v_km_s: self.rotate(&state.v_km_s, to),
        }
    }
}

impl std::fmt::Display for Frame {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.name())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// Right ascension and declination of an ICRF vector, degrees.
    fn ra_dec_deg(v: &Vector3<f64>) -> (f64, f64) {
        let ra = v.y.atan2(v.x).to_degrees().rem_euclid(360.0);
        let dec = (v.z / v.norm()).asin().to_degrees();
        (ra, dec)
    }

    fn from_lon_lat_deg(lon: f64, lat: f64) -> Vector3<f64> {
        let (sl, cl) = lon.to_radians().sin_cos();
        let (sb, cb) = lat.to_radians().sin_cos();
        Vector3::new(cb * cl, cb * sl, sb)
    }

    /// Source: REFERENCES.md section 4 (IAU 2006: 84381.406 arcsec =
    /// 23.4392794 deg, printed to 7 decimals: tolerance 5e-8 deg).
    #[test]
    fn obliquity_is_iau_2006() {
        assert_relative_eq!(
            obliquity_j2000_rad().to_degrees(),
            23.4392794,
            epsilon = 5e-8
        );
    }

    /// Source: REFERENCES.md section 5 identities: the ecliptic x axis has
    /// RA 0, Dec 0; the ecliptic y axis RA 90 deg, Dec +23.4392794 deg; the
    /// ecliptic pole lies at RA 270 deg, Dec 90 - 23.4392794 deg.
    /// Tolerance 1e-7 deg: the printed digits.
    #[test]
    fn ecliptic_axes_in_icrf() {
        let e = Frame::EclipticJ2000;
        let (ra, dec) = ra_dec_deg(&e.rotate(&Vector3::x(), Frame::Icrf));
        assert_relative_eq!(ra, 0.0, epsilon = 1e-7);
        assert_relative_eq!(dec, 0.0, epsilon = 1e-7);
        let (ra, dec) = ra_dec_deg(&e.rotate(&Vector3::y(), Frame::Icrf));
        assert_relative_eq!(ra, 90.0, epsilon = 1e-7);
        assert_relative_eq!(dec, 23.4392794, epsilon = 1e-7);
        let (ra, dec) = ra_dec_deg(&e.rotate(&Vector3::z(), Frame::Icrf));
        assert_relative_eq!(ra, 270.0, epsilon = 1e-7);
        assert_relative_eq!(dec, 90.0 - 23.4392794, epsilon = 1e-7);
        // The north celestial pole is at ecliptic longitude 90 deg,
        // latitude 66.5607206 deg (same section).
        let pole = Frame::Icrf.rotate(&Vector3::z(), Frame::EclipticJ2000);
        assert_relative_eq!(pole.y.atan2(pole.x).to_degrees(), 90.0, epsilon = 1e-7);
        assert_relative_eq!(pole.z.asin().to_degrees(), 66.5607206, epsilon = 1e-7);
    }

    /// Source: REFERENCES.md section 5: the Mars pole (RA 317.68143 deg,
    /// Dec 52.88650 deg, Archinal et al. 2018) lies at ecliptic longitude
    /// 352.9076 deg, latitude 63.2820 deg. Tolerance 1e-4 deg: the printed
    /// digits of the ecliptic values.
    #[test]
    fn mars_pole_in_ecliptic() {
        let ra: f64 = 317.68143;
        let dec: f64 = 52.88650;
        let v = from_lon_lat_deg(ra, dec);
        let e = Frame::Icrf.rotate(&v, Frame::EclipticJ2000);
        let lon = e.y.atan2(e.x).to_degrees().rem_euclid(360.0);
        let lat = e.z.asin().to_degrees();
        assert_relative_eq!(lon, 352.9076, epsilon = 1e-4);
        assert_relative_eq!(lat, 63.2820, epsilon = 1e-4);
    }

    /// Source: IAU SOFA `eceq06` at J2000 through pyerfa 2.0
    /// (tests/fixtures/de421/ecliptic-pairs.csv, made by make_fixtures.py).
    /// SOFA includes the ICRS frame bias that this module leaves out, so
    /// the tolerance is 0.1 arcsec (the bias is below 0.03 arcsec).
    #[test]
    fn agrees_with_sofa_eceq06() {
        let text = include_str!("../../../tests/fixtures/de421/ecliptic-pairs.csv");
        let mut rows = 0;
        for line in text.lines().filter(|l| !l.starts_with('#')).skip(1) {
            let f: Vec<f64> = line
                .split(',')
                .map(|x| x.parse().expect("fixture numbers"))
                .collect();
            let icrf = Frame::EclipticJ2000.rotate(&from_lon_lat_deg(f[0], f[1]), Frame::Icrf);
            let sofa = from_lon_lat_deg(f[2], f[3]);
            let angle_arcsec = icrf.angle(&sofa).to_degrees() * 3600.0;
            assert!(angle_arcsec < 0.1, "{line}: {angle_arcsec} arcsec");
            rows += 1;
        }
        assert_eq!(rows, 8);
    }

    /// Round trip ICRF -> ecliptic -> ICRF keeps any vector (rotation
    /// invariant; 1e-9 relative covers rounding).
    #[test]
    fn round_trip() {
        let v = Vector3::new(-1.2e8, 3.4e7, 5.6e6);
        let back =
            Frame::EclipticJ2000.rotate(&Frame::Icrf.rotate(&v, Frame::EclipticJ2000), Frame::Icrf);
        assert_relative_eq!((back - v).norm(), 0.0, epsilon = 1e-9 * v.norm());
        assert_eq!(Frame::Icrf.rotate(&v, Frame::Icrf), v);
    }
}
