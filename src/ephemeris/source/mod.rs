//! Body states from standard ephemeris files: SPICE SPK kernels and CCSDS
//! Orbit Ephemeris Messages.
//!
//! Mean elements ([`super::elements`]) stay synodic's default; these
//! sources let a body follow a published ephemeris instead. Each answers
//! the same two questions, through [`FileSource`]:
//!
//! - `state(epoch, frame)`: position and velocity (km, km/s) relative to
//!   the file's centre at a TDB [`Epoch`], in the [`Frame`] asked for;
//! - `coverage()`: the TDB dates with states ([`Coverage`]); any other
//!   date is an error that names the file and prints its coverage.
//!
//! | source | reader | frames | time |
//! |---|---|---|---|
//! | SPK kernel ([`SpkKernel`], [`SpkBody`]) | the `spicekit` crate, segment types 2 and 3 (Chebyshev), chained through barycentres | J2000 (ICRF axes), ECLIPJ2000 | TDB seconds past J2000 |
//! | OEM, KVN text ([`Oem`]) | our own, CCSDS 502.0-B | ICRF, EME2000, J2000, GCRF, ECLIPJ2000 | TDB, TT, TAI, UTC, GPS |
//!
//! Frames are converted explicitly with [`Frame::rotate_state`] (ICRF to
//! the mean ecliptic of J2000 by the IAU 2006 obliquity). See
//! `docs/ephemeris-files.md` for the user's view.

pub mod coverage;
pub mod frame;
pub mod spk;

pub use coverage::Coverage;
pub use frame::{obliquity_j2000_rad, Frame, OBLIQUITY_J2000_ARCSEC};
pub use spk::{SegmentInfo, SpkBody, SpkError, SpkKernel};
