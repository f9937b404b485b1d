//! Argument parsing, dispatch and the exit-code policy.
//!
//! Exit codes: 0 done; 1 ran, but nothing met the constraints; 2 bad input
//! or failure (clap's own usage errors also exit 2). A closed pipe on
//! stdout (`synodic ... | head`) is a quiet success.

use std::io::Write;
use std::process::ExitCode;

use clap::Parser;

mod args;
mod commands;
mod input;

pub use args::{Args, Command};

/// What a command reports besides its output.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Outcome {
    /// Done.
    Done,
    /// Ran to the end, but nothing met the constraints.
    NothingFeasible,
}

/// Errors of the binary: a message already carrying its context.
pub type CliError = Box<dyn std::error::Error + Send + Sync>;

/// `Result` of a command.
pub type CliResult<T> = Result<T, CliError>;

/// Parse, run, map the outcome to an exit code.
pub fn main() -> ExitCode {
    let args = Args::parse();
    match commands::run(args) {
        Ok(Outcome::Done) => ExitCode::SUCCESS,
        Ok(Outcome::NothingFeasible) => ExitCode::from(1),
        Err(err) => {
            if is_broken_pipe(err.as_ref()) {
                return ExitCode::SUCCESS;
            }
            let mut stderr = std::io::stderr().lock();
            let _ = writeln!(stderr, "synodic: error: {err}");
            ExitCode::from(2)
        }
    }
}

fn is_broken_pipe(err: &(dyn std::error::Error + 'static)) -> bool {
    let mut cur: Option<&(dyn std::error::Error + 'static)> = Some(err);
    while let Some(e) = cur {
        if let Some(io) = e.downcast_ref::<std::io::Error>() {
            if io.kind() == std::io::ErrorKind::BrokenPipe {
                return true;
            }
        }
        cur = e.source();
    }
    false
}
