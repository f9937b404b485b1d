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
mod interpolate;
pub mod oem;
pub mod spk;

pub use coverage::Coverage;
pub use frame::{obliquity_j2000_rad, Frame, OBLIQUITY_J2000_ARCSEC};
pub use oem::{Method, Oem, OemError, OemHeader, OemMetadata, OemSegment, TimeSystem};
pub use spk::{SegmentInfo, SpkBody, SpkError, SpkKernel};

use crate::orbit::State;
use crate::time::Epoch;

/// A body's states from a file: an SPK chain or an OEM.
#[derive(Debug, Clone)]
#[non_exhaustive]
pub enum FileSource {
    /// Target relative to centre in an SPK kernel.
    Spk(SpkBody),
    /// The object of an OEM, relative to its centre.
    Oem(Oem),
}

/// Why a file source gives no state.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum SourceError {
    /// From an SPK kernel.
    #[error(transparent)]
    Spk(#[from] SpkError),
    /// From an OEM.
    #[error(transparent)]
    Oem(#[from] OemError),
}

impl FileSource {
    /// Position and velocity relative to the file's centre at `t`, in
    /// `frame` (km, km/s).
    ///
    /// # Errors
    /// Outside [`FileSource::coverage`], an error naming the file and its
    /// coverage; see [`SpkBody::state`] and [`Oem::state`].
    pub fn state(&self, t: &Epoch, frame: Frame) -> Result<State, SourceError> {
        match self {
            FileSource::Spk(b) => Ok(b.state(t, frame)?),
            FileSource::Oem(o) => Ok(o.state(t, frame)?),
        }
    }

    /// The TDB dates with states.
    pub fn coverage(&self) -> &Coverage {
        match self {
            FileSource::Spk(b) => b.coverage(),
            FileSource::Oem(o) => o.coverage(),
        }
    }

    /// The file's path.
    pub fn path(&self) -> &std::path::Path {
        match self {
            FileSource::Spk(b) => b.path(),
            FileSource::Oem(o) => o.path(),
        }
    }
}

#[cfg(test)]
mod tests;
