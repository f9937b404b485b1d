//! The frames of a system in which directions are quoted: the celestial
//! frame (whose equator right ascensions and declinations refer to) and
//! each body's equator frame (in which DLA/RLA and the arrival asymptote
//! are measured).
//!
//! # Conventions
//! The ascending node of a plane A (pole `a`) on a plane B (pole `b`) lies
//! along `b x a`, as the node vector `n = k x h` of an orbit.
//!
//! - **Celestial frame.** `z_c` is the celestial pole `c` (a system file's
//!   `[frame]`, given in the system frame; without one, the system's own
//!   `z`). `x_c = c x z / |c x z|`, the ascending node of the system
//!   reference plane on the celestial equator: for the ecliptic and the
//!   Earth's pole, the vernal equinox, so the celestial frame is EME2000.
//!   Where `c` is the system `z`, `x_c` is the system `x`.
//! - **A body's equator frame.** `z_b` is the body's north pole `p`;
//!   `x_b = c x p / |c x p|`, the ascending node of the body's equator on
//!   the celestial equator, as in the IAU Working Group on Cartographic
//!   Coordinates and Rotational Elements (Archinal et al. 2018, CMDA 130:22:
//!   node Q at right ascension `alpha0 + 90 deg`). Where the pole is within
//!   [`SAME_POLE_DEG`] of the celestial pole (the Earth), or the body has no
//!   pole, the body's equator frame is the celestial frame itself.
//! - In every frame `y = z x x`; right ascension is `atan2(v.y, v.x)`,
//!   declination `asin(v.z / |v|)` (`transfer::EquatorFrame::dec_ra_deg`).
//!
//! Vectors here are unit vectors in the system frame; this module knows
//! nothing of system files.

use nalgebra::Vector3;

/// A pole within this angle of the celestial pole counts as the celestial
/// pole, degrees (3.6 arcsec): the node between two nearly equal equators
/// is ill-defined, and a pole typed with fewer digits than the celestial
/// pole (66.5607 against 66.5607206 deg) must not swing the origin of
/// right ascension. No real body's pole is this close to another's.
pub const SAME_POLE_DEG: f64 = 0.001;

/// A right-handed orthonormal triad, its axes given in the system frame.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Axes {
    /// The origin of right ascension.
    pub x: Vector3<f64>,
    /// Right ascension 90 deg: `z x x`.
    pub y: Vector3<f64>,
    /// The pole.
    pub z: Vector3<f64>,
}

impl Axes {
    /// The system frame itself.
    pub fn system() -> Axes {
        Axes {
            x: Vector3::x(),
            y: Vector3::y(),
            z: Vector3::z(),
        }
    }

    /// The celestial frame whose pole is `pole` (any length; `None`: the
    /// system's `z`): `x` the ascending node of the system reference plane
    /// on the celestial equator, `pole x z_system`, or the system `x` where
    /// the two poles coincide (within [`SAME_POLE_DEG`]).
    ///
    /// # Method
    /// The node convention of the module documentation. Degenerate input
    /// (a zero or non-finite vector) gives the system frame.
    pub fn celestial(pole: Option<&Vector3<f64>>) -> Axes {
        let Some(c) = pole.and_then(unit) else {
            return Axes::system();
        };
        // Poles (anti)parallel: no node; the system x is the origin.
        let x = node(&c, &Vector3::z()).unwrap_or_else(Vector3::x);
        Axes::from_pole_and_x(c, x)
    }

    /// The equator frame of a body whose north pole is `pole` (any length),
    /// for right ascensions referred to `celestial`: `x` the ascending node
    /// of the body's equator on the celestial equator (`c x pole`); the
    /// celestial frame itself without a pole or where the pole is within
    /// [`SAME_POLE_DEG`] of the celestial pole.
    pub fn equator(celestial: &Axes, pole: Option<&Vector3<f64>>) -> Axes {
        let Some(p) = pole.and_then(unit) else {
            return *celestial;
        };
        match node(&celestial.z, &p) {
            Some(x) => Axes::from_pole_and_x(p, x),
            // The celestial pole itself (the Earth's case).
            None if p.dot(&celestial.z) > 0.0 => *celestial,
            // Its opposite: no node either; keep the celestial origin.
            None => Axes::from_pole_and_x(p, celestial.x),
        }
    }

    /// The components of `v` (system frame) in this frame.
    #[inline]
    pub fn components(&self, v: &Vector3<f64>) -> Vector3<f64> {
        Vector3::new(v.dot(&self.x), v.dot(&self.y), v.dot(&self.z))
    }

    fn from_pole_and_x(z: Vector3<f64>, x: Vector3<f64>) -> Axes {
        Axes {
            x,
            y: z.cross(&x),
            z,
        }
    }
}

/// `v / |v|`, or `None` for a zero or non-finite vector.
fn unit(v: &Vector3<f64>) -> Option<Vector3<f64>> {
    let n = v.norm();
    (n > 0.0 && n.is_finite()).then(|| v / n)
}

/// The unit ascending node of the plane with (unit) pole `a` on the plane
/// with (unit) pole `b`, `b x a`; `None` where the poles are parallel or
/// opposite within [`SAME_POLE_DEG`] (the node is then undefined).
fn node(b: &Vector3<f64>, a: &Vector3<f64>) -> Option<Vector3<f64>> {
    let n = b.cross(a);
    let sin_angle = n.norm();
    (sin_angle >= SAME_POLE_DEG.to_radians().sin()).then(|| n / sin_angle)
}
