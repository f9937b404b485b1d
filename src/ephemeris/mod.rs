//! STUB
#![allow(missing_docs, clippy::all)]
use crate::{orbit::State, time::Epoch};
use nalgebra::Vector3;
pub const AU_KM: f64 = 149_597_870.7;
pub const JULIAN_CENTURY_DAYS: f64 = 36525.0;
#[derive(Debug, Clone)]
pub struct MeanElements {
    pub a_km: f64,
    pub e: f64,
    pub i_deg: f64,
    pub node_deg: f64,
    pub peri_deg: f64,
    pub mean_lon_deg: f64,
}
#[derive(Debug, Clone)]
pub struct ElementRates {
    pub a_km: f64,
    pub e: f64,
    pub i_deg: f64,
    pub node_deg: f64,
    pub peri_deg: f64,
    pub mean_lon_deg: f64,
}
#[derive(Debug, Clone)]
pub struct System {
    pub name: String,
    pub epoch: Epoch,
    pub central: CentralBody,
    pub bodies: Vec<Body>,
    pub source: String,
}
#[derive(Debug, Clone)]
pub struct CentralBody {
    pub name: String,
    pub mu_km3_s2: f64,
    pub radius_km: Option<f64>,
}
#[derive(Debug, Clone)]
pub struct Body {
    pub name: String,
    pub elements: MeanElements,
    pub rates: ElementRates,
    pub mu_km3_s2: Option<f64>,
    pub radius_km: Option<f64>,
    pub pole: Option<Pole>,
}
#[derive(Debug, Clone, Copy)]
pub struct Pole {
    pub lon_deg: f64,
    pub lat_deg: f64,
}
impl Pole {
    pub fn unit_vector(&self) -> Vector3<f64> {
        unimplemented!()
    }
}
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum CatalogError {
    #[error("bad {0}")]
    Bad(String),
}
impl System {
    pub fn from_toml_str(_text: &str, _source: &str) -> Result<System, CatalogError> {
        unimplemented!()
    }
    pub fn load(_path: &std::path::Path) -> Result<System, CatalogError> {
        unimplemented!()
    }
    pub fn demo() -> System {
        unimplemented!()
    }
    pub fn demo_toml() -> &'static str {
        unimplemented!()
    }
    pub fn find(&self, _name: &str) -> Result<usize, CatalogError> {
        unimplemented!()
    }
    pub fn state(&self, _body: usize, _epoch: &Epoch) -> State {
        unimplemented!()
    }
    pub fn state_at_days(&self, _body: usize, _d: f64) -> State {
        unimplemented!()
    }
    pub fn period_days(&self, _body: usize) -> f64 {
        unimplemented!()
    }
    pub fn synodic_period_days(&self, _a: usize, _b: usize) -> f64 {
        unimplemented!()
    }
}
pub fn synodic_period_days(_a: f64, _b: f64) -> f64 {
    unimplemented!()
}
