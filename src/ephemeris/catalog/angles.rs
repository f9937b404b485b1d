//! The angles of a `[[body]]` table: inclination, node, the element set
//! (longitude or argument of periapsis; mean longitude or mean anomaly),
//! their rates, and Kepler's third law as a guard on the mean-motion rate.
//!
//! Each body gives exactly one angle of each pair; the rates use the same
//! keys as the elements. Whatever was given, the result holds the
//! longitudes of planetary tables (what [`MeanElements`] stores):
//! `lon_peri = node + arg_peri`, `mean_lon = lon_peri + mean_anom`, and the
//! same sums for the rates.

use toml::Spanned;

use super::{CatalogError, Locator, RawBody};
use crate::ephemeris::elements::{
    mean_motion_deg_per_century, ElementSet, EpochAngle, PeriapsisAngle,
};

/// The angles of one body, as longitudes, with their rates per Julian
/// century.
#[derive(Debug, Clone, Copy)]
pub(super) struct Angles {
    /// Inclination, deg in [0, 180].
    pub i_deg: f64,
    /// Longitude of the ascending node, deg in [0, 360).
    pub node_deg: f64,
    /// Longitude of periapsis, deg in [0, 360).
    pub lon_peri_deg: f64,
    /// Mean longitude at the epoch, deg in [0, 360).
    pub mean_lon_deg: f64,
    /// Rates, deg per Julian century.
    pub i_rate: f64,
    /// Node rate.
    pub node_rate: f64,
    /// Longitude-of-periapsis rate.
    pub lon_peri_rate: f64,
    /// Mean-longitude rate; `None` when the file gives no rate for the
    /// epoch angle (the caller derives it from Kepler's third law).
    pub mean_lon_rate: Option<f64>,
    /// The element set the file used.
    pub set: ElementSet,
}

/// What the two pairs of angles mean, for messages.
const PERIAPSIS_KEYS: &str = "lon_peri_deg (longitude of periapsis = node + argument of \
periapsis, as in Standish's tables) or arg_peri_deg (argument of periapsis, measured from the \
ascending node)";
const EPOCH_KEYS: &str = "mean_lon_deg (mean longitude = longitude of periapsis + mean anomaly, \
as in Standish's tables) or mean_anom_deg (mean anomaly at the epoch)";

/// Tolerance of the Kepler's-third-law guard: 1 % (Standish's Table 1
/// rates agree with sqrt(mu / a^3) to about 5e-6; a unit slip is off by a
/// factor of 100 or more).
pub(super) const RATE_TOLERANCE: f64 = 0.01;

/// `x` reduced to [0, 360).
fn wrap(x: f64) -> f64 {
    let w = x.rem_euclid(360.0);
    // rem_euclid of a tiny negative number rounds to 360.0.
    if w >= 360.0 {
        0.0
    } else {
        w
    }
}

/// Exactly one of two optional keys, or an error naming them.
fn one_of<'a>(
    loc: &Locator<'_>,
    ctx: &str,
    name: &Spanned<String>,
    first: (&'static str, &'a Option<Spanned<f64>>),
    second: (&'static str, &'a Option<Spanned<f64>>),
    what: &str,
    keys: &str,
) -> Result<(bool, &'a Spanned<f64>), CatalogError> {
    match (first.1, second.1) {
        (Some(v), None) => Ok((true, v)),
        (None, Some(v)) => Ok((false, v)),
        (Some(_), Some(v)) => Err(loc.invalid(
            v.span(),
            ctx,
            second.0,
            format!("give only one of the two: {keys}"),
        )),
        (None, None) => Err(loc.invalid(
            name.span(),
            ctx,
            first.0,
            format!("missing {what}: give {keys}"),
        )),
    }
}

/// The retired key `peri_deg`, in the body or its rates: an error saying
/// which keys replace it.
fn retired_peri(
    loc: &Locator<'_>,
    ctx: &str,
    v: &Option<Spanned<serde::de::IgnoredAny>>,
) -> Result<(), CatalogError> {
    match v {
        None => Ok(()),
        Some(v) => Err(loc.invalid(
            v.span(),
            ctx,
            "peri_deg",
            format!(
                "`peri_deg` is no longer read because it was ambiguous; give {PERIAPSIS_KEYS}. \
                 peri_deg meant the longitude of periapsis, so an older file needs only the \
                 key renamed to lon_peri_deg"
            ),
        )),
    }
}

/// Reads the inclination, node and element set of a body, with rates.
///
/// # Errors
/// An inclination outside [0, 180] deg (with the equivalent orbit to
/// enter instead), neither or both keys of a pair, `peri_deg`, a rate keyed
/// differently from its element, and non-finite numbers.
pub(super) fn read_angles(
    loc: &Locator<'_>,
    b: &RawBody,
    ctx: &str,
) -> Result<Angles, CatalogError> {
    retired_peri(loc, ctx, &b.peri_deg)?;
    let (lon_given, peri) = one_of(
        loc,
        ctx,
        &b.name,
        ("lon_peri_deg", &b.lon_peri_deg),
        ("arg_peri_deg", &b.arg_peri_deg),
        "the periapsis",
        PERIAPSIS_KEYS,
    )?;
    let (mean_lon_given, epoch) = one_of(
        loc,
        ctx,
        &b.name,
        ("mean_lon_deg", &b.mean_lon_deg),
        ("mean_anom_deg", &b.mean_anom_deg),
        "the position at the epoch",
        EPOCH_KEYS,
    )?;
    let set = ElementSet {
        periapsis: if lon_given {
            PeriapsisAngle::Longitude
        } else {
            PeriapsisAngle::Argument
        },
        epoch_angle: if mean_lon_given {
            EpochAngle::MeanLongitude
        } else {
            EpochAngle::MeanAnomaly
        },
    };
    let (peri_key, epoch_key) = set.keys();

    let i_deg = loc.finite(&b.i_deg, ctx, "i_deg")?;
    if !(0.0..=180.0).contains(&i_deg) {
        let folded = if i_deg < 0.0 { -i_deg } else { 360.0 - i_deg };
        let arg_too = if lon_given {
            ""
        } else {
            " and arg_peri_deg + 180"
        };
        return Err(loc.invalid(
            b.i_deg.span(),
            ctx,
            "i_deg",
            format!(
                "must be in [0, 180] deg, got {i_deg}. The same orbit has i_deg = {folded} \
                 with node_deg + 180{arg_too} (the mean angle unchanged) and, if it has a \
                 rate, rates.i_deg with the opposite sign"
            ),
        ));
    }
    let node_deg = loc.finite(&b.node_deg, ctx, "node_deg")?;
    let peri_deg = loc.finite(peri, ctx, peri_key)?;
    let epoch_deg = loc.finite(epoch, ctx, epoch_key)?;
    let lon_peri_deg = if lon_given {
        peri_deg
    } else {
        node_deg + peri_deg
    };
    let mean_lon_deg = if mean_lon_given {
        epoch_deg
    } else {
        lon_peri_deg + epoch_deg
    };

    let mut angles = Angles {
        i_deg,
        node_deg: wrap(node_deg),
        lon_peri_deg: wrap(lon_peri_deg),
        mean_lon_deg: wrap(mean_lon_deg),
        i_rate: 0.0,
        node_rate: 0.0,
        lon_peri_rate: 0.0,
        mean_lon_rate: None,
        set,
    };
    let Some(rates) = &b.rates else {
        return Ok(angles);
    };
    let r = rates.get_ref();
    let rctx = format!("{ctx}rates: ");
    retired_peri(loc, &rctx, &r.peri_deg)?;
    // Rates are keyed like the elements: a rate of the other angle of a
    // pair is refused, so nobody mixes the two sets by accident.
    let pairs = [
        (peri_key, "lon_peri_deg", &r.lon_peri_deg),
        (peri_key, "arg_peri_deg", &r.arg_peri_deg),
        (epoch_key, "mean_lon_deg", &r.mean_lon_deg),
        (epoch_key, "mean_anom_deg", &r.mean_anom_deg),
    ];
    for (given, key, value) in pairs {
        if let (Some(v), true) = (value, given != key) {
            return Err(loc.invalid(
                v.span(),
                &rctx,
                key,
                format!(
                    "this body gives {given}, so its rate is rates.{given} (rates are keyed \
                     like the elements)"
                ),
            ));
        }
    }
    angles.i_rate = loc.opt_finite(&r.i_deg, &rctx, "i_deg")?.unwrap_or(0.0);
    angles.node_rate = loc
        .opt_finite(&r.node_deg, &rctx, "node_deg")?
        .unwrap_or(0.0);
    let peri_rate = loc
        .opt_finite(
            if lon_given {
                &r.lon_peri_deg
            } else {
                &r.arg_peri_deg
            },
            &rctx,
            peri_key,
        )?
        .unwrap_or(0.0);
    angles.lon_peri_rate = if lon_given {
        peri_rate
    } else {
        angles.node_rate + peri_rate
    };
    let epoch_rate = loc.opt_finite(
        if mean_lon_given {
            &r.mean_lon_deg
        } else {
            &r.mean_anom_deg
        },
        &rctx,
        epoch_key,
    )?;
    angles.mean_lon_rate = epoch_rate.map(|n| {
        if mean_lon_given {
            n
        } else {
            angles.lon_peri_rate + n
        }
    });
    Ok(angles)
}

/// Kepler's third law as a guard on a given mean-longitude (or
/// mean-anomaly) rate: more than [`RATE_TOLERANCE`] from the mean motion
/// `sqrt((mu_central + mu_body) / a^3)` is an error printing both values
/// and their ratio.
///
/// # Method
/// Kepler's third law, `n = sqrt(G (M + m) / a^3)` (e.g. Vallado 2013,
/// *Fundamentals of Astrodynamics and Applications*, eq. 1-29), in degrees
/// per Julian century.
///
/// # Errors
/// [`CatalogError::Invalid`] at the rate's key when the ratio is off.
pub(super) fn check_rate(
    loc: &Locator<'_>,
    b: &RawBody,
    ctx: &str,
    set: ElementSet,
    a_km: f64,
    mu_total_km3_s2: f64,
) -> Result<(), CatalogError> {
    if b.rate_check == Some(false) {
        return Ok(());
    }
    let Some(rates) = &b.rates else {
        return Ok(());
    };
    let r = rates.get_ref();
    let (_, key) = set.keys();
    let value = match set.epoch_angle {
        EpochAngle::MeanLongitude => &r.mean_lon_deg,
        EpochAngle::MeanAnomaly => &r.mean_anom_deg,
    };
    let Some(v) = value else {
        return Ok(());
    };
    let given = *v.get_ref();
    let kepler = mean_motion_deg_per_century(a_km, mu_total_km3_s2);
    if (given / kepler - 1.0).abs() <= RATE_TOLERANCE {
        return Ok(());
    }
    let ratio = kepler / given;
    let sign = if given < 0.0 {
        " A retrograde orbit's mean longitude (node + argument of periapsis + mean \
         anomaly) still increases: its rate is positive."
    } else {
        ""
    };
    Err(loc.invalid(
        v.span(),
        &format!("{ctx}rates: "),
        key,
        format!(
            "{given} deg per Julian century disagrees with Kepler's third law: the mean motion \
             sqrt((GM_central + GM_body) / a^3) for a = {a_km:.6e} km is {kepler:.6} deg per \
             Julian century (Kepler / given = {ratio:.6}). Rates are per Julian century of \
             36525 days: a ratio near 36525 means a rate per day, near 100 a rate per year. \
             For an orbit perturbed on purpose, set rate_check = false in this body.{sign}"
        ),
    ))
}
