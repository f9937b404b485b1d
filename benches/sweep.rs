//! Benchmarks: sweep (criterion).
fn main() {}
