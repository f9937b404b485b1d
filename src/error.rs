//! The crate-wide error type.
//!
//! # Design
//! Each module that can fail has its own `#[non_exhaustive]` error enum
//! carrying the values needed to act on it (file, line, key; iterations
//! and tolerances for solvers). [`Error`] gathers them with `From`
//! conversions so that callers who do not care about the module can use
//! `?` throughout; callers who do can match on the inner error.

/// Any error synodic's library can return.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum Error {
    /// A date or span could not be read.
    #[error(transparent)]
    Time(#[from] crate::time::TimeError),
    /// A system file is unusable.
    #[error(transparent)]
    Catalog(#[from] crate::ephemeris::CatalogError),
    /// Kepler's equation failed.
    #[error(transparent)]
    Kepler(#[from] crate::ephemeris::KeplerError),
    /// A body state could not be computed.
    #[error(transparent)]
    State(#[from] crate::ephemeris::StateError),
    /// Lambert's problem failed.
    #[error(transparent)]
    Lambert(#[from] crate::lambert::LambertError),
    /// Two-body propagation failed.
    #[error(transparent)]
    Propagate(#[from] crate::orbit::PropagateError),
    /// Conic elements are undefined.
    #[error(transparent)]
    Conic(#[from] crate::orbit::ConicError),
    /// A parking or capture orbit is unusable.
    #[error(transparent)]
    Endpoint(#[from] crate::transfer::EndpointError),
    /// A transfer could not be computed.
    #[error(transparent)]
    Transfer(#[from] crate::transfer::TransferError),
    /// A sweep axis is invalid.
    #[error(transparent)]
    Axis(#[from] crate::sweep::AxisError),
    /// A sweep could not run.
    #[error(transparent)]
    Sweep(#[from] crate::sweep::SweepError),
    /// A window search could not run.
    #[error(transparent)]
    Window(#[from] crate::windows::WindowError),
    /// A study file is unusable.
    #[error(transparent)]
    Study(#[from] crate::study::StudyError),
    /// An output could not be written or read.
    #[error(transparent)]
    Export(#[from] crate::export::ExportError),
    /// A chart could not be drawn.
    #[error(transparent)]
    Chart(#[from] crate::chart::ChartError),
    /// Some other failure, described in words.
    #[error("{0}")]
    Other(String),
}

/// `Result` with synodic's [`Error`].
pub type Result<T, E = Error> = std::result::Result<T, E>;

/// 1-based line number of byte `offset` in `text`, for messages that name
/// the line of a file (system files, study files).
pub fn line_of_offset(text: &str, offset: usize) -> usize {
    text.as_bytes()[..offset.min(text.len())]
        .iter()
        .filter(|&&b| b == b'\n')
        .count()
        + 1
}

/// The TOML reader's message in the words of a file's author: no Rust
/// type names, "key" for "field", and for a bare TOML date the advice to
/// quote it. `value` is the text of the offending value, when known.
///
/// # Method
/// The serde messages of the `toml` crate have the forms `invalid type:
/// GOT, expected WANT`, `invalid value: GOT, expected WANT`, `missing
/// field `K``, `unknown field `K`, expected one of ...`; each part is
/// translated, anything else is kept as it is.
pub fn plain_toml_message(message: &str, value: Option<&str>) -> String {
    let message = message.trim();
    for prefix in ["invalid type: ", "invalid value: "] {
        if let Some(rest) = message.strip_prefix(prefix) {
            if let Some((got, want)) = rest.rsplit_once(", expected ") {
                return plain_mismatch(got, want, value);
            }
        }
    }
    if let Some(rest) = message.strip_prefix("unknown field ") {
        return match rest.split_once(", expected one of ") {
            Some((key, known)) => format!("unknown key {key}; the keys allowed here are {known}"),
            None => format!(
                "unknown key {}",
                rest.replace("there are no fields", "no keys are allowed here")
            ),
        };
    }
    if let Some(rest) = message.strip_prefix("missing field ") {
        return format!("missing key {rest}");
    }
    message.to_string()
}

/// `expected WANT, got GOT` in plain words.
fn plain_mismatch(got: &str, want: &str, value: Option<&str>) -> String {
    let want = match want {
        "f64" | "f32" => "a number".to_string(),
        "u8" | "u16" | "u32" | "u64" | "usize" => "a whole number >= 0".to_string(),
        "i8" | "i16" | "i32" | "i64" | "isize" => "a whole number".to_string(),
        "a boolean" => "true or false".to_string(),
        "a string" => "text in double quotes".to_string(),
        "a sequence" => "a list in brackets, e.g. [1.0, 2.0]".to_string(),
        w if w.starts_with("an array of length ") => {
            let n = w.trim_start_matches("an array of length ");
            format!("a list of {n} numbers in brackets, e.g. [100.0, 400.0]")
        }
        "struct RawRates" => {
            "a table of rates per Julian century, e.g. { lon_peri_deg = 0.3 }".to_string()
        }
        w if w.starts_with("struct ") => "a table of keys (e.g. { key = 1.0 })".to_string(),
        w => w.to_string(),
    };
    let got_plain = if let Some(v) = got.strip_prefix("floating point ") {
        format!("the number {}", v.trim_matches('`'))
    } else if let Some(v) = got.strip_prefix("integer ") {
        format!("the whole number {}", v.trim_matches('`'))
    } else if let Some(v) = got.strip_prefix("boolean ") {
        v.trim_matches('`').to_string()
    } else if let Some(v) = got.strip_prefix("string ") {
        format!("the text {v}")
    } else if got == "map" {
        // A TOML date or time written without quotes reaches serde as a
        // map; say so, since the file shows no table there.
        if let Some(v) = value.filter(|v| looks_like_bare_date(v)) {
            return format!(
                "{} is a bare TOML date: write it as text in double quotes with its time \
                 scale, e.g. \"{}T00:00:00 TDB\"",
                v.trim(),
                v.trim().get(..10).unwrap_or("2040-01-01")
            );
        }
        "a table".to_string()
    } else if got == "sequence" {
        "a list".to_string()
    } else {
        got.to_string()
    };
    format!("expected {want}, got {got_plain}")
}

/// Whether `text` starts like a TOML date (`YYYY-MM-DD`).
fn looks_like_bare_date(text: &str) -> bool {
    let b = text.trim().as_bytes();
    b.len() >= 10
        && b[..4].iter().all(u8::is_ascii_digit)
        && b[4] == b'-'
        && b[5..7].iter().all(u8::is_ascii_digit)
        && b[7] == b'-'
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Messages as the `toml` crate prints them (captured from real runs)
    /// lose their Rust type names.
    #[test]
    fn toml_messages_in_plain_words() {
        let cases = [
            (
                "invalid type: floating point `0.001`, expected struct RawRates",
                None,
                "expected a table of rates per Julian century, e.g. { lon_peri_deg = 0.3 }, \
                 got the number 0.001",
            ),
            (
                "invalid value: integer `-1`, expected u32",
                None,
                "expected a whole number >= 0, got the whole number -1",
            ),
            (
                "invalid type: string \"x\", expected f64",
                None,
                "expected a number, got the text \"x\"",
            ),
            (
                "invalid type: integer `1`, expected a boolean",
                None,
                "expected true or false, got the whole number 1",
            ),
            (
                "invalid type: map, expected a string",
                Some("2040-01-01"),
                "2040-01-01 is a bare TOML date: write it as text in double quotes with its \
                 time scale, e.g. \"2040-01-01T00:00:00 TDB\"",
            ),
            ("missing field `e`", None, "missing key `e`"),
            (
                "unknown field `depar`, expected one of `depart`, `arrive`",
                None,
                "unknown key `depar`; the keys allowed here are `depart`, `arrive`",
            ),
        ];
        for (raw, value, want) in cases {
            assert_eq!(plain_toml_message(raw, value), want, "{raw}");
        }
        for (raw, _, _) in cases {
            let plain = plain_toml_message(raw, Some("2040-01-01"));
            for rust in ["RawRates", "u32", "f64", "struct", "field"] {
                assert!(!plain.contains(rust), "{plain}");
            }
        }
    }
}
