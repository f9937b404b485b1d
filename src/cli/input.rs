//! Turning raw arguments into validated inputs: systems, vectors, dates.

use std::path::Path;

use nalgebra::Vector3;
use synodic::ephemeris::{Body, System};
use synodic::time::Epoch;
use synodic::transfer::Endpoints;

use super::CliResult;

/// The system named by `--system`, or the built-in demo system.
pub fn load_system(path: Option<&Path>) -> CliResult<System> {
    Ok(load_system_with_hash(path)?.0)
}

/// The system and the SHA-256 (hex) of its file's bytes.
pub fn load_system_with_hash(path: Option<&Path>) -> CliResult<(System, String)> {
    match path {
        Some(p) => {
            let system = System::load(p)?;
            let bytes =
                std::fs::read(p).map_err(|e| format!("cannot read {}: {e}", p.display()))?;
            Ok((system, sha256_hex(&bytes)))
        }
        None => Ok((System::demo(), sha256_hex(System::demo_toml().as_bytes()))),
    }
}

/// SHA-256 of `bytes` as lowercase hex.
pub fn sha256_hex(bytes: &[u8]) -> String {
    use sha2::Digest;
    let digest = sha2::Sha256::digest(bytes);
    digest.iter().map(|b| format!("{b:02x}")).collect()
}

/// Parking and capture orbits as asked. Without `--park-alt-km`, a
/// 200 km parking orbit is used when the departure body has a GM and a
/// radius (common practice, no source), else the departure delta-v is the
/// excess speed itself.
pub fn resolve_endpoints(
    from: &Body,
    to: &Body,
    park_alt_km: Option<f64>,
    capture_alt_km: Option<f64>,
    capture_ecc: f64,
) -> CliResult<Endpoints> {
    let park = park_alt_km.or_else(|| {
        (from.mu_km3_s2.is_some() && from.radius_km.is_some()).then_some(DEFAULT_PARK_ALT_KM)
    });
    let capture = capture_alt_km.map(|alt| (alt, capture_ecc));
    Ok(Endpoints::new(from, to, park, capture)?)
}

/// Default parking-orbit altitude, km (common practice, no source).
pub const DEFAULT_PARK_ALT_KM: f64 = 200.0;

/// Parse `X,Y,Z` into a vector; `what` names the option in messages.
pub fn parse_vector(text: &str, what: &str) -> CliResult<Vector3<f64>> {
    let parts: Vec<&str> = text.split(',').map(str::trim).collect();
    if parts.len() != 3 {
        return Err(format!("{what}: expected three numbers X,Y,Z, got {text:?}").into());
    }
    let mut v = [0.0; 3];
    for (slot, part) in v.iter_mut().zip(&parts) {
        *slot = part
            .parse::<f64>()
            .ok()
            .filter(|x| x.is_finite())
            .ok_or_else(|| format!("{what}: {part:?} is not a finite number"))?;
    }
    Ok(Vector3::new(v[0], v[1], v[2]))
}

/// Parse a date option; `what` names the option in messages.
pub fn parse_epoch(text: &str, what: &str) -> CliResult<Epoch> {
    Epoch::parse(text).map_err(|e| format!("{what}: {e}").into())
}

/// The TDB calendar date (`YYYY-MM-DD`) of a day count past J2000 TDB.
pub fn day_of(days_since_j2000_tdb: f64) -> String {
    Epoch::from_days_since_j2000_tdb(days_since_j2000_tdb).date_tdb()
}

/// A date for study files and screens: `YYYY-MM-DD` at TDB midnight, else
/// `YYYY-MM-DDThh:mm:ss[.fff]` (TDB, to the millisecond, so a resolved
/// study keeps the instant the user gave). Files of results use the fixed
/// form of [`synodic::export::stamp`] instead.
pub fn compact_date(days_since_j2000_tdb: f64) -> String {
    let iso = Epoch::from_days_since_j2000_tdb(days_since_j2000_tdb).to_iso_tdb();
    let iso = iso.trim_end_matches(" TDB");
    iso.strip_suffix("T00:00:00").unwrap_or(iso).to_string()
}

/// The unit of a screen column of times of flight: hours when every value
/// is under 10 days (moon systems, where days would print as 2.7 or 0.1),
/// else days. Returns the unit's label and the factor from days.
pub fn tof_unit(tofs_days: impl IntoIterator<Item = f64>) -> (&'static str, f64) {
    let longest = tofs_days.into_iter().fold(0.0, f64::max);
    if longest < 10.0 {
        ("h", 24.0)
    } else {
        ("d", 1.0)
    }
}

/// Find two distinct bodies of `system` by name.
pub fn body_pair(system: &System, from: &str, to: &str) -> CliResult<(usize, usize)> {
    let a = system.find(from)?;
    let b = system.find(to)?;
    if a == b {
        return Err(format!(
            "departure and arrival body are both \"{}\": choose two different bodies",
            system.bodies[a].name
        )
        .into());
    }
    Ok((a, b))
}

/// Parse `MIN..MAX` numbers (MAX not below MIN).
pub fn parse_number_span(text: &str) -> Result<(f64, f64), String> {
    let (a, b) = text
        .split_once("..")
        .ok_or_else(|| format!("expected MIN..MAX, got {text:?}"))?;
    let num = |s: &str| {
        s.trim()
            .parse::<f64>()
            .ok()
            .filter(|x| x.is_finite())
            .ok_or_else(|| format!("{s:?} is not a number"))
    };
    let (a, b) = (num(a)?, num(b)?);
    if b < a {
        return Err(format!("empty range {a}..{b}: MAX must not be below MIN"));
    }
    Ok((a, b))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn vectors_parse_and_reject() {
        let v = parse_vector("1, -2.5,3e3", "--r1").expect("valid");
        assert_eq!(v, Vector3::new(1.0, -2.5, 3000.0));
        assert!(parse_vector("1,2", "--r1").is_err());
        assert!(parse_vector("1,2,x", "--r1").is_err());
        assert!(parse_vector("1,2,NaN", "--r1").is_err());
    }
}
