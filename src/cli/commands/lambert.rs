//! `synodic lambert`: one Lambert problem, or a CSV batch.

use std::fmt::Write as _;
use std::path::Path;

use nalgebra::Vector3;
use serde::Serialize;
use synodic::export::write_atomic;
use synodic::lambert::{self, Direction, LambertProblem, LambertSolution};

use super::print;
use crate::cli::args::LambertArgs;
use crate::cli::input::parse_vector;
use crate::cli::{CliResult, Outcome};

#[derive(Debug, Serialize)]
struct SolutionOut {
    revs: u32,
    branch: String,
    v1: [f64; 3],
    v2: [f64; 3],
    transfer_angle_deg: f64,
    /// Semi-major axis of the arc (same length unit as r1, r2).
    a: f64,
    iterations: u32,
}

pub fn run(args: &LambertArgs) -> CliResult<Outcome> {
    if let Some(batch) = &args.batch {
        return run_batch(batch, args.out.as_deref());
    }
    let (Some(mu), Some(r1), Some(r2), Some(tof)) = (args.mu, &args.r1, &args.r2, args.tof) else {
        return Err("give --mu, --r1, --r2 and --tof, or --batch FILE".into());
    };
    let problem = LambertProblem {
        r1: parse_vector(r1, "--r1")?,
        r2: parse_vector(r2, "--r2")?,
        tof,
        mu,
        direction: if args.retrograde {
            Direction::Retrograde
        } else {
            Direction::Prograde
        },
        max_revs: args.revs,
        reference_normal: None,
    };
    let solutions = lambert::solve(&problem)?;
    let out: Vec<SolutionOut> = solutions.iter().map(|s| describe(&problem, s)).collect();
    if args.json {
        let mut text = serde_json::to_string_pretty(&out)?;
        text.push('\n');
        print(&text)?;
    } else {
        let mut s = String::new();
        for o in &out {
            let _ = writeln!(
                s,
                "revs {}  branch {:<6}  transfer angle {:.6} deg  a {:.10e}  ({} iterations)",
                o.revs, o.branch, o.transfer_angle_deg, o.a, o.iterations
            );
            let _ = writeln!(
                s,
                "  v1 = [{:.12e}, {:.12e}, {:.12e}]",
                o.v1[0], o.v1[1], o.v1[2]
            );
            let _ = writeln!(
                s,
                "  v2 = [{:.12e}, {:.12e}, {:.12e}]",
                o.v2[0], o.v2[1], o.v2[2]
            );
        }
        print(&s)?;
    }
    Ok(Outcome::Done)
}

/// Semi-major axis from vis-viva at r1.
fn describe(p: &LambertProblem, s: &LambertSolution) -> SolutionOut {
    let energy = 0.5 * s.v1.norm_squared() - p.mu / p.r1.norm();
    SolutionOut {
        revs: s.revs,
        branch: s.branch.to_string(),
        v1: [s.v1.x, s.v1.y, s.v1.z],
        v2: [s.v2.x, s.v2.y, s.v2.z],
        transfer_angle_deg: s.transfer_angle_rad.to_degrees(),
        a: -p.mu / (2.0 * energy),
        iterations: s.iterations,
    }
}

const BATCH_IN: [&str; 11] = [
    "id", "mu", "r1x", "r1y", "r1z", "r2x", "r2y", "r2z", "tof", "revs", "prograde",
];
const BATCH_OUT: [&str; 10] = [
    "id", "revs", "branch", "v1x", "v1y", "v1z", "v2x", "v2y", "v2z", "status",
];

/// Solve every row of a batch file. Malformed rows are reported on stderr
/// with their line number and the run exits 2 after writing every row
/// that could be read.
fn run_batch(input: &Path, out: Option<&Path>) -> CliResult<Outcome> {
    let file =
        std::fs::File::open(input).map_err(|e| format!("cannot read {}: {e}", input.display()))?;
    let mut reader = csv::ReaderBuilder::new()
        .has_headers(true)
        .trim(csv::Trim::All)
        .flexible(true)
        .from_reader(file);
    let header = reader
        .headers()
        .map_err(|e| format!("{}: line 1: cannot read header: {e}", input.display()))?
        .clone();
    let names: Vec<&str> = header.iter().collect();
    if names != BATCH_IN {
        return Err(format!(
            "{}: line 1: header must be `{}`, got `{}`",
            input.display(),
            BATCH_IN.join(","),
            names.join(",")
        )
        .into());
    }
    let mut writer = csv::WriterBuilder::new().from_writer(Vec::new());
    writer.write_record(BATCH_OUT)?;
    let mut bad_rows = 0usize;
    for (index, record) in reader.records().enumerate() {
        // The reader's own position counts lines inside quoted fields.
        let position = match &record {
            Ok(r) => r.position().cloned(),
            Err(e) => e.position().cloned(),
        };
        let line = position.map_or(index as u64 + 2, |p| p.line());
        let parsed = record
            .map_err(|e| e.to_string())
            .and_then(|r| parse_batch_row(&r));
        match parsed {
            Ok((id, problem, revs)) => write_batch_solutions(&mut writer, &id, &problem, revs)?,
            Err(message) => {
                bad_rows += 1;
                eprintln!("synodic: {}: line {line}: {message}", input.display());
            }
        }
    }
    let bytes = writer.into_inner().map_err(|e| e.to_string())?;
    match out {
        Some(path) => write_atomic(path, &bytes)?,
        None => print(&String::from_utf8_lossy(&bytes))?,
    }
    if bad_rows > 0 {
        return Err(format!(
            "{}: {bad_rows} malformed row(s) skipped; the others were solved",
            input.display()
        )
        .into());
    }
    Ok(Outcome::Done)
}

fn parse_batch_row(r: &csv::StringRecord) -> Result<(String, LambertProblem, u32), String> {
    if r.len() != BATCH_IN.len() {
        return Err(format!(
            "expected {} fields, got {}",
            BATCH_IN.len(),
            r.len()
        ));
    }
    let num = |i: usize| -> Result<f64, String> {
        r[i].parse::<f64>()
            .ok()
            .filter(|x| x.is_finite())
            .ok_or_else(|| {
                format!(
                    "field `{}`: {:?} is not a finite number",
                    BATCH_IN[i], &r[i]
                )
            })
    };
    let revs: u32 = r[9]
        .parse()
        .map_err(|_| format!("field `revs`: {:?} is not a whole number >= 0", &r[9]))?;
    let direction = match &r[10] {
        "1" => Direction::Prograde,
        "0" => Direction::Retrograde,
        other => return Err(format!("field `prograde`: must be 1 or 0, got {other:?}")),
    };
    let problem = LambertProblem {
        r1: Vector3::new(num(2)?, num(3)?, num(4)?),
        r2: Vector3::new(num(5)?, num(6)?, num(7)?),
        tof: num(8)?,
        mu: num(1)?,
        direction,
        max_revs: revs,
        reference_normal: None,
    };
    Ok((r[0].to_string(), problem, revs))
}

fn write_batch_solutions(
    w: &mut csv::Writer<Vec<u8>>,
    id: &str,
    problem: &LambertProblem,
    revs: u32,
) -> CliResult<()> {
    match lambert::solve_revs(problem, revs) {
        Ok(solutions) if !solutions.is_empty() => {
            for s in &solutions {
                let f = |x: f64| format!("{x:.16e}");
                w.write_record([
                    id.to_string(),
                    s.revs.to_string(),
                    s.branch.to_string(),
                    f(s.v1.x),
                    f(s.v1.y),
                    f(s.v1.z),
                    f(s.v2.x),
                    f(s.v2.y),
                    f(s.v2.z),
                    "ok".to_string(),
                ])?;
            }
        }
        Ok(_) => write_failure(w, id, revs, "no solution")?,
        Err(e) => write_failure(w, id, revs, &e.to_string())?,
    }
    Ok(())
}

fn write_failure(w: &mut csv::Writer<Vec<u8>>, id: &str, revs: u32, why: &str) -> CliResult<()> {
    let revs = revs.to_string();
    w.write_record([id, revs.as_str(), "", "", "", "", "", "", "", why])?;
    Ok(())
}
