//! One file per subcommand.

use super::{Args, CliResult, Command, Outcome};

mod bodies;
mod chart;
mod lambert;
mod run;
mod study;
mod sweep;
mod transfer;
mod windows;

/// Run the chosen subcommand.
pub fn run(args: Args) -> CliResult<Outcome> {
    match args.command {
        Command::Bodies { system, at, json } => bodies::run(system.as_deref(), at.as_deref(), json),
        Command::Lambert(a) => lambert::run(&a),
        Command::Transfer(a) => transfer::run(&a),
        Command::Sweep(a) => sweep::run(&a),
        Command::Windows(a) => windows::run(&a),
        Command::Run(a) => run::run(&a),
        Command::Chart(a) => chart::run(&a),
    }
}

/// Print `text` to stdout, reporting a closed pipe as an error the exit
/// policy treats as success.
pub fn print(text: &str) -> CliResult<()> {
    use std::io::Write;
    let mut out = std::io::stdout().lock();
    out.write_all(text.as_bytes())?;
    out.flush()?;
    Ok(())
}
