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
