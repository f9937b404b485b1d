//! Epochs in Barycentric Dynamical Time (TDB). STUB
#![allow(missing_docs, clippy::all)]
#[derive(Debug, Clone, Copy, PartialEq, PartialOrd)]
pub struct Epoch {
    d: f64,
}
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum TimeError {
    #[error("bad {0}")]
    Bad(String),
}
pub const J2000_JD: f64 = 2451545.0;
impl Epoch {
    pub fn parse(_text: &str) -> Result<Epoch, TimeError> {
        unimplemented!()
    }
    pub fn from_jd_tdb(jd: f64) -> Epoch {
        Epoch { d: jd - J2000_JD }
    }
    pub fn from_days_since_j2000_tdb(days: f64) -> Epoch {
        Epoch { d: days }
    }
    pub fn jd_tdb(&self) -> f64 {
        self.d + J2000_JD
    }
    pub fn days_since_j2000_tdb(&self) -> f64 {
        self.d
    }
    pub fn plus_days(&self, days: f64) -> Epoch {
        Epoch { d: self.d + days }
    }
    pub fn days_until(&self, later: &Epoch) -> f64 {
        later.d - self.d
    }
    pub fn to_iso_tdb(&self) -> String {
        unimplemented!()
    }
    pub fn date_tdb(&self) -> String {
        unimplemented!()
    }
}
impl std::fmt::Display for Epoch {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}", self.d)
    }
}
pub fn parse_span(_text: &str) -> Result<(Epoch, Epoch), TimeError> {
    unimplemented!()
}
