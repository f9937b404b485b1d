//! `synodic run`: a study file.

use std::path::Path;

use synodic::study::Study;

use super::study::{execute, Origin, RunFlags};
use crate::cli::args::RunArgs;
use crate::cli::{CliResult, Outcome};

pub fn run(args: &RunArgs) -> CliResult<Outcome> {
    let (study, text) = Study::load(&args.study)?;
    let base = args
        .study
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
    let origin = Origin::File {
        name: args.study.display().to_string(),
        text,
    };
    execute(
        &study,
        &origin,
        base,
        args.out.as_deref(),
        RunFlags {
            threads: args.threads,
            quiet: args.quiet,
            json: args.json,
        },
    )
}
