//! End-to-end tests: run the real `synodic` binary in a fresh folder.
//!
//! One integration binary (see `[[test]]` in Cargo.toml); each module
//! covers one command. `util` builds the temp folders and commands.

mod bad_input;
mod bad_trust;
mod commands;
mod examples;
mod fuzz;
mod labels;
mod study;
mod sweep;
mod trust;
mod util;
