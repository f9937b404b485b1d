//! Benchmarks: ephemeris (criterion).
fn main() {}
