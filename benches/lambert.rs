//! Benchmarks: lambert (criterion).
fn main() {}
