//! The `synodic` command line: a thin front over the library.
//!
//! Everything that computes lives in the library; `cli/` parses arguments,
//! resolves them into a validated run, calls the library and prints.

mod cli;

fn main() -> std::process::ExitCode {
    cli::main()
}
