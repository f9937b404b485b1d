//! Lambert's two-point boundary-value problem.
