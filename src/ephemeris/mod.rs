//! Bodies of a system and their states from mean elements.
//!
//! A [`System`] is a central body and the bodies orbiting it, read from a
//! TOML system file ([`catalog`]) or the built-in invented demo
//! ([`System::demo`]). Each body carries [`MeanElements`] at the system
//! epoch with secular [`ElementRates`] ([`elements`]); its state at any
//! epoch follows Standish's procedure, solving Kepler's equation
//! ([`kepler`]). States are centred on the central body, in the frame the
//! elements are given in, as [`crate::orbit::State`].
//!
//! # Example
//! ```
//! use synodic::ephemeris::System;
//! use synodic::time::Epoch;
//! let system = System::demo();
//! let home = system.find("teodra")?;
//! let s = system.state(home, &Epoch::parse("2031-06-01")?);
//! assert!(s.r_km.norm() > 1.0e8);
//! # Ok::<(), Box<dyn std::error::Error>>(())
//! ```

pub mod catalog;
pub mod elements;
pub mod frame;
pub mod kepler;
pub mod source;

pub use catalog::{synodic_period_days, Body, CatalogError, CentralBody, Pole, System};
pub use elements::{
    ElementRates, ElementSet, EpochAngle, MeanElements, PeriapsisAngle, StateError,
};
pub use frame::Axes;
pub use kepler::KeplerError;

/// The astronomical unit, km (exact by definition).
///
/// Source: IAU 2012 Resolution B2.
pub const AU_KM: f64 = 149_597_870.7;

/// Days in a Julian century, the time unit of element rates.
///
/// Source: IAU (a Julian century is 36525 days of 86400 s).
pub const JULIAN_CENTURY_DAYS: f64 = 36525.0;

#[cfg(test)]
mod standish_tests;
