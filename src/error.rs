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
    /// Some other failure, described in words.
    #[error("{0}")]
    Other(String),
}

/// `Result` with synodic's [`Error`].
pub type Result<T, E = Error> = std::result::Result<T, E>;
