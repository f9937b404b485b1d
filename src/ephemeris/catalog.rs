//! System files: a central body and its orbiting bodies, read from TOML.
//!
//! A system file names a central body (with its GM) and one `[[body]]`
//! table per orbiting body, each with mean elements at the file's epoch
//! and optional rates per Julian century. See [`System::from_toml_str`] for
//! the format and [`System::demo`] for the built-in invented system.
//!
//! Every error names the file, the line and the key
//! ([`CatalogError`]). Unknown keys are errors, so a typo never silently
//! falls back to a default.

use std::ops::Range;
use std::path::{Path, PathBuf};

use nalgebra::Vector3;
use serde::Deserialize;
use toml::Spanned;

use super::elements::{
    mean_motion_deg_per_century, ElementRates, ElementSet, EpochAngle, MeanElements, StateError,
};
use super::frame::Axes;
use super::{AU_KM, JULIAN_CENTURY_DAYS};
use crate::orbit::State;
use crate::time::Epoch;

/// The invented demo system, embedded in the library.
const DEMO_TOML: &str = include_str!("../../ephemerides/demo.toml");

/// A set of bodies orbiting one central body, with elements at one epoch.
#[derive(Debug, Clone, PartialEq)]
pub struct System {
    /// Free-text name of the system.
    pub name: String,
    /// Epoch of the elements (TDB).
    pub epoch: Epoch,
    /// The body at the centre of the frame.
    pub central: CentralBody,
    /// The orbiting bodies, in file order.
    pub bodies: Vec<Body>,
    /// Where the system came from: the file path, or `built-in demo`.
    pub source: String,
    /// The celestial pole of the file's `[frame]` (the pole of the equator
    /// right ascensions are measured in), if given; without it the system
    /// reference plane is the celestial equator.
    pub celestial_pole: Option<Pole>,
    /// The celestial frame ([`Axes::celestial`]): the system frame without
    /// a `[frame]`.
    pub celestial: Axes,
}

/// The central body of a system.
#[derive(Debug, Clone, PartialEq)]
pub struct CentralBody {
    /// Name.
    pub name: String,
    /// Gravitational parameter GM, km^3/s^2.
    pub mu_km3_s2: f64,
    /// Radius, km, if given.
    pub radius_km: Option<f64>,
}

/// A body orbiting the central body.
#[derive(Debug, Clone, PartialEq)]
pub struct Body {
    /// Name (unique within its system, ignoring case).
    pub name: String,
    /// Mean elements at the system epoch.
    pub elements: MeanElements,
    /// Rates of the elements per Julian century. When the file gives no
    /// rate of its mean longitude (or mean anomaly), that angle advances at
    /// the two-body mean motion `sqrt(mu / a^3)` (Kepler's third law); the
    /// other rates default to 0.
    pub rates: ElementRates,
    /// The element set the file gave (the elements themselves are always
    /// held as longitudes).
    pub element_set: ElementSet,
    /// The body's own GM, km^3/s^2, if given (needed for parking-orbit and
    /// capture delta-v).
    pub mu_km3_s2: Option<f64>,
    /// The body's radius, km, if given.
    pub radius_km: Option<f64>,
    /// Direction of the body's north pole, if given (for DLA/RLA).
    pub pole: Option<Pole>,
    /// The body's equator frame ([`Axes::equator`]), in which asymptote
    /// directions at this body are quoted: the celestial frame when the
    /// body has no pole.
    pub equator: Axes,
}

/// A direction in the system frame, as longitude and latitude.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Pole {
    /// Longitude in the system frame's reference plane, degrees in
    /// [0, 360).
    pub lon_deg: f64,
    /// Latitude above the reference plane, degrees, in [-90, 90].
    pub lat_deg: f64,
}

impl Pole {
    /// The unit vector of this direction in the system frame:
    /// `(cos lat cos lon, cos lat sin lon, sin lat)`.
    ///
    /// # Units
    /// Dimensionless unit vector.
    pub fn unit_vector(&self) -> Vector3<f64> {
        let (slat, clat) = self.lat_deg.to_radians().sin_cos();
        let (slon, clon) = self.lon_deg.to_radians().sin_cos();
        Vector3::new(clat * clon, clat * slon, slat)
    }
}

/// Why a system file, or a body name, was rejected.
///
/// Messages have the form `FILE:LINE: CONTEXT: key `KEY`: PROBLEM`, e.g.
/// ``demo.toml:14: body "Vell": key `e`: must be in [0, 1), got 1.2``.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum CatalogError {
    /// The file could not be read.
    #[error("{}: cannot read: {source}", path.display())]
    Read {
        /// The path given.
        path: PathBuf,
        /// The operating system's error.
        source: std::io::Error,
    },
    /// The text is not TOML, or does not have the expected shape: missing
    /// or unknown key, or a value of the wrong type.
    #[error("{file}:{line}: {}{message}", key.as_ref().map(|k| format!("key `{k}`: ")).unwrap_or_default())]
    Syntax {
        /// The file (or source name) the text came from.
        file: String,
        /// Line, counting from 1.
        line: usize,
        /// The key at fault, when it can be told from the text.
        key: Option<String>,
        /// The TOML reader's message.
        message: String,
    },
    /// A value is of the right type but not acceptable.
    #[error("{file}:{line}: {context}key `{key}`: {message}")]
    Invalid {
        /// The file (or source name).
        file: String,
        /// Line, counting from 1.
        line: usize,
        /// Where the key sits, e.g. `body "Vell": ` or `central: ` (empty
        /// at top level), with the separator.
        context: String,
        /// The key at fault.
        key: String,
        /// What is wrong, with the value.
        message: String,
    },
    /// The file has no `[[body]]` table.
    #[error("{file}: key `body`: at least one [[body]] table is required")]
    NoBodies {
        /// The file (or source name).
        file: String,
    },
    /// [`System::find`] found no body of that name.
    #[error("no body named {name:?} in {system}{}; known bodies: {}", suggestion.as_ref().map(|s| format!(" (did you mean {s:?}?)")).unwrap_or_default(), known.join(", "))]
    UnknownBody {
        /// The name asked for.
        name: String,
        /// The system's name.
        system: String,
        /// The names of the system's bodies.
        known: Vec<String>,
        /// The closest known name, if any.
        suggestion: Option<String>,
    },
}

// ---------------------------------------------------------------------
// The file format, as serde reads it.

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawSystem {
    name: Spanned<String>,
    epoch: Spanned<String>,
    frame: Option<RawFrame>,
    central: RawCentral,
    #[serde(default)]
    body: Vec<Spanned<RawBody>>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawFrame {
    celestial_pole_lon_deg: Spanned<f64>,
    celestial_pole_lat_deg: Spanned<f64>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawCentral {
    name: Spanned<String>,
    mu_km3_s2: Spanned<f64>,
    radius_km: Option<Spanned<f64>>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawBody {
    name: Spanned<String>,
    a_au: Option<Spanned<f64>>,
    a_km: Option<Spanned<f64>>,
    e: Spanned<f64>,
    i_deg: Spanned<f64>,
    node_deg: Spanned<f64>,
    lon_peri_deg: Option<Spanned<f64>>,
    arg_peri_deg: Option<Spanned<f64>>,
    mean_lon_deg: Option<Spanned<f64>>,
    mean_anom_deg: Option<Spanned<f64>>,
    /// Retired (ambiguous): an error naming its replacements.
    peri_deg: Option<Spanned<serde::de::IgnoredAny>>,
    rates: Option<Spanned<RawRates>>,
    rate_check: Option<bool>,
    mu_km3_s2: Option<Spanned<f64>>,
    radius_km: Option<Spanned<f64>>,
    pole_lon_deg: Option<Spanned<f64>>,
    pole_lat_deg: Option<Spanned<f64>>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawRates {
    a_au: Option<Spanned<f64>>,
    a_km: Option<Spanned<f64>>,
    e: Option<Spanned<f64>>,
    i_deg: Option<Spanned<f64>>,
    node_deg: Option<Spanned<f64>>,
    lon_peri_deg: Option<Spanned<f64>>,
    arg_peri_deg: Option<Spanned<f64>>,
    mean_lon_deg: Option<Spanned<f64>>,
    mean_anom_deg: Option<Spanned<f64>>,
    /// Retired (ambiguous): an error naming its replacements.
    peri_deg: Option<Spanned<serde::de::IgnoredAny>>,
}

/// Builds errors that point into one source text.
struct Locator<'a> {
    text: &'a str,
    file: &'a str,
}

impl Locator<'_> {
    /// The 1-based line containing byte `offset`.
    fn line(&self, offset: usize) -> usize {
        crate::error::line_of_offset(self.text, offset)
    }

    /// The trimmed text of the line containing byte `offset`.
    fn line_text(&self, offset: usize) -> Option<&str> {
        let offset = offset.min(self.text.len());
        let start = self.text.get(..offset)?.rfind('\n').map_or(0, |i| i + 1);
        let rest = self.text.get(start..)?;
        Some(rest.lines().next().unwrap_or("").trim())
    }

    fn invalid(
        &self,
        span: Range<usize>,
        context: &str,
        key: &str,
        message: String,
    ) -> CatalogError {
        CatalogError::Invalid {
            file: self.file.to_string(),
            line: self.line(span.start),
            context: context.to_string(),
            key: key.to_string(),
            message,
        }
    }

    /// The key whose value starts at or before `offset` on the same line:
    /// the identifier left of the last `=` before `offset`.
    fn key_at(&self, offset: usize) -> Option<String> {
        let offset = offset.min(self.text.len());
        let before = self.text.get(..offset)?;
        let line_start = before.rfind('\n').map_or(0, |i| i + 1);
        let head = &before[line_start..];
        let eq = head.rfind('=')?;
        let left = head[..eq].trim_end();
        let key: String = left
            .chars()
            .rev()
            .take_while(|c| c.is_ascii_alphanumeric() || *c == '_' || *c == '-')
            .collect::<Vec<_>>()
            .into_iter()
            .rev()
            .collect();
        (!key.is_empty()).then_some(key)
    }

    /// A finite number, else an error naming the key.
    fn finite(&self, v: &Spanned<f64>, context: &str, key: &str) -> Result<f64, CatalogError> {
        let x = *v.get_ref();
        if x.is_finite() {
            Ok(x)
        } else {
            Err(self.invalid(
                v.span(),
                context,
                key,
                format!("must be a finite number, got {x}"),
            ))
        }
    }

    /// A finite number > 0.
    fn positive(&self, v: &Spanned<f64>, context: &str, key: &str) -> Result<f64, CatalogError> {
        let x = self.finite(v, context, key)?;
        if x > 0.0 {
            Ok(x)
        } else {
            Err(self.invalid(v.span(), context, key, format!("must be positive, got {x}")))
        }
    }

    fn opt_positive(
        &self,
        v: &Option<Spanned<f64>>,
        context: &str,
        key: &str,
    ) -> Result<Option<f64>, CatalogError> {
        v.as_ref()
            .map(|v| self.positive(v, context, key))
            .transpose()
    }

    fn opt_finite(
        &self,
        v: &Option<Spanned<f64>>,
        context: &str,
        key: &str,
    ) -> Result<Option<f64>, CatalogError> {
        v.as_ref().map(|v| self.finite(v, context, key)).transpose()
    }

    /// A direction given as longitude and latitude (keys `keys`): finite,
    /// latitude in [-90, 90], longitude reduced to [0, 360).
    fn pole(
        &self,
        lon: &Spanned<f64>,
        lat: &Spanned<f64>,
        context: &str,
        keys: (&str, &str),
    ) -> Result<Pole, CatalogError> {
        let lon_deg = self.finite(lon, context, keys.0)?.rem_euclid(360.0);
        let lat_deg = self.finite(lat, context, keys.1)?;
        if !(-90.0..=90.0).contains(&lat_deg) {
            return Err(self.invalid(
                lat.span(),
                context,
                keys.1,
                format!("must be in [-90, 90], got {lat_deg}"),
            ));
        }
        Ok(Pole { lon_deg, lat_deg })
    }

    fn name(&self, v: &Spanned<String>, context: &str) -> Result<String, CatalogError> {
        let name = v.get_ref().trim();
        if name.is_empty() {
            Err(self.invalid(v.span(), context, "name", "must not be empty".to_string()))
        } else {
            Ok(name.to_string())
        }
    }
}

impl System {
    /// Reads a system from TOML text.
    ///
    /// `source` names the text in error messages and is kept in
    /// [`System::source`] (a file path, or e.g. `built-in demo`).
    ///
    /// # Format
    /// ```toml
    /// name = "An example"                 # free text
    /// epoch = "2030-01-01T00:00:00 TDB"   # epoch of the elements (Epoch::parse)
    /// [frame]                             # optional: the celestial equator
    /// celestial_pole_lon_deg = 90.0       # its pole in the system frame
    /// celestial_pole_lat_deg = 66.5607206 #   (here: the Earth's, in the ecliptic)
    /// [central]
    /// name = "Star"
    /// mu_km3_s2 = 1.3e11                  # GM, > 0
    /// radius_km = 700000.0                # optional, > 0
    /// [[body]]                            # one or more
    /// name = "Planet"                     # unique, ignoring case
    /// a_au = 1.0                          # or a_km: exactly one, > 0
    /// e = 0.01                            # in [0, 1)
    /// i_deg = 1.0                         # inclination, in [0, 180]
    /// node_deg = 10.0                     # longitude of the ascending node
    /// lon_peri_deg = 100.0                # longitude of periapsis (node + argument);
    ///                                     # or arg_peri_deg: exactly one
    /// mean_lon_deg = 50.0                 # mean longitude at the epoch;
    ///                                     # or mean_anom_deg: exactly one
    /// rates = { lon_peri_deg = 0.3 }      # optional, per Julian century, keyed like
    ///                                     # the elements (a_au or a_km); omitted = 0,
    ///                                     # except the mean longitude (or anomaly):
    ///                                     # omitted = sqrt(mu/a^3)
    /// rate_check = true                   # optional: false lets a given mean-motion
    ///                                     # rate differ from Kepler's third law
    /// mu_km3_s2 = 400000.0                # optional, > 0
    /// radius_km = 6400.0                  # optional, > 0
    /// pole_lon_deg = 90.0                 # optional pair: north pole direction
    /// pole_lat_deg = 66.5607206           # in the system frame, lat in [-90, 90]
    /// ```
    /// Integers are accepted wherever a number is expected. Angles that
    /// wrap (node, longitudes, anomaly, pole longitude) are reduced to
    /// [0, 360).
    ///
    /// # Method
    /// TOML via the `toml` crate with serde (`deny_unknown_fields`), then
    /// the checks above. The derived mean-longitude rate is Kepler's third
    /// law `n = sqrt(mu / a^3)` with the central GM and the epoch's `a`; a
    /// given one must agree within 1 % with `sqrt((mu + mu_body) / a^3)`
    /// unless `rate_check = false`.
    ///
    /// # Units
    /// As the key names say; `a_au` is converted with [`AU_KM`].
    ///
    /// # Errors
    /// [`CatalogError::Syntax`] for malformed TOML, missing or unknown keys
    /// and wrong types; [`CatalogError::Invalid`] for out-of-range or
    /// non-finite values, both or neither of `a_au`/`a_km`,
    /// `lon_peri_deg`/`arg_peri_deg` or `mean_lon_deg`/`mean_anom_deg`,
    /// the retired `peri_deg`, a rate keyed unlike its element, a
    /// mean-motion rate off Kepler's third law, half a pole, duplicate
    /// names and an unreadable epoch; [`CatalogError::NoBodies`] without
    /// any `[[body]]`. Each names `source`, the line and the key.
    pub fn from_toml_str(text: &str, source: &str) -> Result<System, CatalogError> {
        let loc = Locator { text, file: source };
        let raw: RawSystem = toml::from_str(text).map_err(|e| {
            let line = e.span().map_or(1, |s| loc.line(s.start));
            let value = e.span().and_then(|s| text.get(s));
            let mut message = crate::error::plain_toml_message(e.message(), value);
            // A missing key is reported at its table's header: say which.
            if let Some(header) = e.span().and_then(|s| loc.line_text(s.start)) {
                if header.starts_with('[') {
                    message = format!("{message} in table {header}");
                }
            }
            let key = e
                .span()
                .and_then(|s| loc.key_at(s.start))
                .filter(|k| !message.contains(&format!("`{k}`")));
            CatalogError::Syntax {
                file: source.to_string(),
                line,
                key,
                message,
            }
        })?;

        let name = raw.name.get_ref().trim().to_string();
        let epoch = Epoch::parse(raw.epoch.get_ref())
            .map_err(|e| loc.invalid(raw.epoch.span(), "", "epoch", e.to_string()))?;

        let celestial_pole = match &raw.frame {
            Some(f) => Some(loc.pole(
                &f.celestial_pole_lon_deg,
                &f.celestial_pole_lat_deg,
                "frame: ",
                ("celestial_pole_lon_deg", "celestial_pole_lat_deg"),
            )?),
            None => None,
        };
        let celestial = Axes::celestial(celestial_pole.map(|p| p.unit_vector()).as_ref());
        let c = &raw.central;
        let central = CentralBody {
            name: loc.name(&c.name, "central: ")?,
            mu_km3_s2: loc.positive(&c.mu_km3_s2, "central: ", "mu_km3_s2")?,
            radius_km: loc.opt_positive(&c.radius_km, "central: ", "radius_km")?,
        };

        if raw.body.is_empty() {
            return Err(CatalogError::NoBodies {
                file: source.to_string(),
            });
        }
        let mut bodies: Vec<Body> = Vec::with_capacity(raw.body.len());
        let mut name_lines: Vec<usize> = Vec::with_capacity(raw.body.len());
        for (k, spanned) in raw.body.iter().enumerate() {
            let b = spanned.get_ref();
            let body_name = loc.name(&b.name, &format!("body #{}: ", k + 1))?;
            let ctx = format!("body {body_name:?}: ");
            if let Some(first) = bodies
                .iter()
                .position(|o| o.name.to_lowercase() == body_name.to_lowercase())
            {
                return Err(loc.invalid(
                    b.name.span(),
                    &ctx,
                    "name",
                    format!(
                        "duplicate body name (also on line {}, names are compared ignoring case)",
                        name_lines[first]
                    ),
                ));
            }
            let mut body = read_body(&loc, spanned, &ctx, body_name, central.mu_km3_s2)?;
            body.equator = Axes::equator(&celestial, body.pole.map(|p| p.unit_vector()).as_ref());
            name_lines.push(loc.line(b.name.span().start));
            bodies.push(body);
        }
        Ok(System {
            name,
            epoch,
            central,
            bodies,
            source: source.to_string(),
            celestial_pole,
            celestial,
        })
    }

    /// Reads a system file from disk ([`System::from_toml_str`] with the
    /// path as the source name).
    ///
    /// # Errors
    /// [`CatalogError::Read`] naming the path if the file cannot be read;
    /// otherwise as [`System::from_toml_str`].
    pub fn load(path: &Path) -> Result<System, CatalogError> {
        let text = std::fs::read_to_string(path).map_err(|source| CatalogError::Read {
            path: path.to_path_buf(),
            source,
        })?;
        System::from_toml_str(&text, &path.display().to_string())
    }

    /// The built-in invented demo system (`ephemerides/demo.toml`).
    ///
    /// # Panics
    /// Never in a released build: the embedded file is fixed at compile
    /// time and a unit test checks that it parses.
    pub fn demo() -> System {
        System::from_toml_str(DEMO_TOML, "built-in demo")
            .expect("the embedded demo system parses (checked by a unit test)")
    }

    /// The TOML text of the built-in demo system.
    pub fn demo_toml() -> &'static str {
        DEMO_TOML
    }

    /// The index of the body called `name`, ignoring case and surrounding
    /// white space.
    ///
    /// # Errors
    /// [`CatalogError::UnknownBody`] listing the known names and the
    /// closest one (Levenshtein distance, ignoring case).
    pub fn find(&self, name: &str) -> Result<usize, CatalogError> {
        let wanted = name.trim().to_lowercase();
        if let Some(i) = self
            .bodies
            .iter()
            .position(|b| b.name.to_lowercase() == wanted)
        {
            return Ok(i);
        }
        let suggestion = self
            .bodies
            .iter()
            .map(|b| (levenshtein(&wanted, &b.name.to_lowercase()), &b.name))
            .min_by_key(|(d, _)| *d)
            .map(|(_, n)| n.clone());
        Err(CatalogError::UnknownBody {
            name: name.to_string(),
            system: self.name.clone(),
            known: self.bodies.iter().map(|b| b.name.clone()).collect(),
            suggestion,
        })
    }

    /// State of body `body` at `epoch`; see [`System::state_at_days`].
    ///
    /// # Units
    /// km and km/s in the system frame, centred on the central body.
    ///
    /// # Panics
    /// If `body >= self.bodies.len()` (an index not from [`System::find`]).
    pub fn state(&self, body: usize, epoch: &Epoch) -> State {
        self.state_at_days(body, epoch.days_since_j2000_tdb())
    }

    /// State of body `body` at a TDB day count (the sweep's fast path).
    ///
    /// # Method
    /// [`MeanElements::at`] with `T = (t - epoch) / 36525` Julian centuries
    /// from the system epoch, then [`MeanElements::state`] (Standish's
    /// procedure, two-body velocity with the central GM).
    ///
    /// # Units
    /// `tdb_days_since_j2000` in days (TDB); the state in km and km/s, in
    /// the system frame centred on the central body.
    ///
    /// # Errors
    /// None reported: if the rates carry the elements out of range (only
    /// far outside an ephemeris' validity, e.g. `e >= 1`), every component
    /// of the state is NaN. Use [`System::try_state_at_days`] to get the
    /// reason instead.
    ///
    /// # Panics
    /// If `body >= self.bodies.len()`.
    pub fn state_at_days(&self, body: usize, tdb_days_since_j2000: f64) -> State {
        self.try_state_at_days(body, tdb_days_since_j2000)
            .unwrap_or(State {
                r_km: Vector3::repeat(f64::NAN),
                v_km_s: Vector3::repeat(f64::NAN),
            })
    }

    /// As [`System::state_at_days`], reporting why elements give no state.
    ///
    /// # Units
    /// As [`System::state_at_days`].
    ///
    /// # Errors
    /// [`StateError`] when the propagated elements are out of range.
    ///
    /// # Panics
    /// If `body >= self.bodies.len()`.
    pub fn try_state_at_days(
        &self,
        body: usize,
        tdb_days_since_j2000: f64,
    ) -> Result<State, StateError> {
        let b = &self.bodies[body];
        let centuries =
            (tdb_days_since_j2000 - self.epoch.days_since_j2000_tdb()) / JULIAN_CENTURY_DAYS;
        b.elements
            .at(&b.rates, centuries)
            .state(self.central.mu_km3_s2)
    }

    /// Orbital period of body `body`, from the semi-major axis at the epoch.
    ///
    /// # Method
    /// Kepler's third law `P = 2 pi sqrt(a^3 / mu)` with the central GM
    /// (the body's own mass is neglected, as in the state computation).
    ///
    /// # Units
    /// Days.
    ///
    /// # Panics
    /// If `body >= self.bodies.len()`.
    pub fn period_days(&self, body: usize) -> f64 {
        let a = self.bodies[body].elements.a_km;
        std::f64::consts::TAU * (a * a * a / self.central.mu_km3_s2).sqrt() / 86400.0
    }

    /// [`System::period_days`] with the sense of motion: negative for a
    /// retrograde orbit (inclination above 90 deg), whose longitude in the
    /// reference plane decreases.
    ///
    /// # Units
    /// Days.
    ///
    /// # Panics
    /// If `body >= self.bodies.len()`.
    pub fn signed_period_days(&self, body: usize) -> f64 {
        let p = self.period_days(body);
        if self.bodies[body].elements.i_deg > 90.0 {
            -p
        } else {
            p
        }
    }

    /// Synodic period of bodies `a` and `b`: the time between successive
    /// alignments, [`synodic_period_days`] of their signed periods
    /// ([`System::signed_period_days`]), so a retrograde body counts its
    /// mean motion as negative.
    ///
    /// # Units
    /// Days; infinite for equal periods in the same sense.
    ///
    /// # Panics
    /// If either index is out of range.
    pub fn synodic_period_days(&self, a: usize, b: usize) -> f64 {
        synodic_period_days(self.signed_period_days(a), self.signed_period_days(b))
    }
}

/// Synodic period of two orbits: `1 / |1/Pa - 1/Pb|`.
///
/// # Method
/// The relative angular rate of two circular orbits is `2 pi (1/Pa - 1/Pb)`;
/// the synodic period is one full turn at that rate. Periods are signed: a
/// retrograde orbit's is negative, so a prograde and a retrograde body of
/// period P meet every P / 2.
///
/// # Units
/// Days in, days out. Equal periods give `f64::INFINITY` (the two bodies
/// never change their relative phase).
pub fn synodic_period_days(period_a_days: f64, period_b_days: f64) -> f64 {
    1.0 / (1.0 / period_a_days - 1.0 / period_b_days).abs()
}

/// Reads one `[[body]]` table.
fn read_body(
    loc: &Locator<'_>,
    spanned: &Spanned<RawBody>,
    ctx: &str,
    name: String,
    central_mu_km3_s2: f64,
) -> Result<Body, CatalogError> {
    let b = spanned.get_ref();
    let a_km = match (&b.a_au, &b.a_km) {
        (Some(au), None) => loc.positive(au, ctx, "a_au")? * AU_KM,
        (None, Some(km)) => loc.positive(km, ctx, "a_km")?,
        (Some(_), Some(km)) => {
            return Err(loc.invalid(
                km.span(),
                ctx,
                "a_km",
                "give a_au or a_km, not both".to_string(),
            ))
        }
        (None, None) => {
            return Err(loc.invalid(
                b.name.span(),
                ctx,
                "a_au",
                "missing semi-major axis: give a_au or a_km".to_string(),
            ))
        }
    };
    // A value can be finite in its own unit yet overflow in km, or give an
    // orbit too small for a finite speed: refuse both here, naming the key.
    let (a_key, a_span) = match (&b.a_au, &b.a_km) {
        (Some(au), _) => ("a_au", au.span()),
        (None, Some(km)) => ("a_km", km.span()),
        (None, None) => ("a_au", b.name.span()),
    };
    if !(a_km.is_finite()
        && (central_mu_km3_s2 / a_km).is_finite()
        && mean_motion_deg_per_century(a_km, central_mu_km3_s2).is_finite())
    {
        return Err(loc.invalid(
            a_span,
            ctx,
            a_key,
            format!("out of range: {a_km} km gives no finite orbit"),
        ));
    }
    let e = loc.finite(&b.e, ctx, "e")?;
    if !(0.0..1.0).contains(&e) {
        return Err(loc.invalid(b.e.span(), ctx, "e", format!("must be in [0, 1), got {e}")));
    }
    let angles = angles::read_angles(loc, b, ctx)?;
    let elements = MeanElements {
        a_km,
        e,
        i_deg: angles.i_deg,
        node_deg: angles.node_deg,
        peri_deg: angles.lon_peri_deg,
        mean_lon_deg: angles.mean_lon_deg,
    };
    let n_deg_cy = mean_motion_deg_per_century(a_km, central_mu_km3_s2);
    let mut rates = ElementRates {
        i_deg: angles.i_rate,
        node_deg: angles.node_rate,
        peri_deg: angles.lon_peri_rate,
        // Omitted: the two-body mean motion, as the rate of the angle the
        // file gave (mean longitude, or mean anomaly on a turning apse).
        mean_lon_deg: angles
            .mean_lon_rate
            .unwrap_or(match angles.set.epoch_angle {
                EpochAngle::MeanLongitude => n_deg_cy,
                EpochAngle::MeanAnomaly => angles.lon_peri_rate + n_deg_cy,
            }),
        ..ElementRates::default()
    };
    if let Some(r) = &b.rates {
        let rctx = format!("{ctx}rates: ");
        let r = r.get_ref();
        rates.a_km = match (&r.a_au, &r.a_km) {
            (Some(_), Some(km)) => {
                return Err(loc.invalid(
                    km.span(),
                    &rctx,
                    "a_km",
                    "give a_au or a_km, not both".to_string(),
                ))
            }
            (Some(au), None) => {
                let km = loc.finite(au, &rctx, "a_au")? * AU_KM;
                if !km.is_finite() {
                    return Err(loc.invalid(
                        au.span(),
                        &rctx,
                        "a_au",
                        format!("out of range: {km} km per century"),
                    ));
                }
                km
            }
            (None, Some(km)) => loc.finite(km, &rctx, "a_km")?,
            (None, None) => 0.0,
        };
        rates.e = loc.opt_finite(&r.e, &rctx, "e")?.unwrap_or(0.0);
    }
    let mu_body = loc.opt_positive(&b.mu_km3_s2, ctx, "mu_km3_s2")?;
    angles::check_rate(
        loc,
        b,
        ctx,
        angles.set,
        a_km,
        central_mu_km3_s2 + mu_body.unwrap_or(0.0),
    )?;

    // The checks above should make the state at the epoch finite; if some
    // combination still does not, refuse the body rather than let NaN into
    // a sweep.
    if let Err(why) = elements.at(&rates, 0.0).state(central_mu_km3_s2) {
        let (key, span) = match why {
            StateError::Kepler(_) => ("e", b.e.span()),
            _ => (a_key, a_span),
        };
        return Err(loc.invalid(
            span,
            ctx,
            key,
            format!("the elements give no state at the epoch: {why}"),
        ));
    }

    let pole = match (&b.pole_lon_deg, &b.pole_lat_deg) {
        (Some(lon), Some(lat)) => {
            Some(loc.pole(lon, lat, ctx, ("pole_lon_deg", "pole_lat_deg"))?)
        }
        (Some(half), None) | (None, Some(half)) => {
            let missing = match b.pole_lon_deg {
                Some(_) => "pole_lat_deg",
                None => "pole_lon_deg",
            };
            let why = "missing: pole_lon_deg and pole_lat_deg go together".to_string();
            return Err(loc.invalid(half.span(), ctx, missing, why));
        }
        (None, None) => None,
    };

    Ok(Body {
        name,
        elements,
        rates,
        element_set: angles.set,
        mu_km3_s2: mu_body,
        radius_km: loc.opt_positive(&b.radius_km, ctx, "radius_km")?,
        pole,
        // Set by the caller, which knows the celestial frame.
        equator: Axes::system(),
    })
}

/// Levenshtein edit distance between two strings, by characters.
///
/// # Method
/// The two-row dynamic programme of Wagner and Fischer (1974), "The
/// string-to-string correction problem", J. ACM 21(1).
fn levenshtein(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    let mut cur = vec![0; b.len() + 1];
    for (i, ca) in a.chars().enumerate() {
        cur[0] = i + 1;
        for (j, cb) in b.iter().enumerate() {
            let subst = prev[j] + usize::from(ca != *cb);
            cur[j + 1] = subst.min(prev[j + 1] + 1).min(cur[j] + 1);
        }
        std::mem::swap(&mut prev, &mut cur);
    }
    prev[b.len()]
}

mod angles;

#[cfg(test)]
mod frame_tests;
#[cfg(test)]
mod tests;
#[cfg(test)]
mod trust_tests;
