//! Epochs in Barycentric Dynamical Time (TDB).
