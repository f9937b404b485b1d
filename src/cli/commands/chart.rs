//! `synodic chart`: redraw a sweep's chart from its saved files.

use std::path::{Path, PathBuf};

use serde_json::Value;
use synodic::chart::{
    render_panel_png, render_panel_svg, render_png, render_svg, ChartSpec, Marker, MarkerFigures,
    Panel, DEFAULT_HEIGHT_PX, DEFAULT_WIDTH_PX,
};
use synodic::export::{read_grid_csv, write_atomic};
use synodic::sweep::{layers_for, Axis, SecondAxis};
use synodic::time::{Epoch, J2000_JD};
use synodic::transfer::{Endpoints, TransferType};

use super::print;
use crate::cli::args::ChartArgs;
use crate::cli::{CliResult, Outcome};

fn read(path: &Path) -> CliResult<String> {
    std::fs::read_to_string(path).map_err(|e| format!("cannot read {}: {e}", path.display()).into())
}

/// An axis from `summary.json`: dates for date axes, numbers for time of
/// flight.
fn axis(v: &Value, summary: &Path, name: &str) -> CliResult<(Axis, bool)> {
    let bad = || format!("{}: `{name}` is missing or malformed", summary.display());
    let a = &v[name];
    let dated = a["kind"].as_str().ok_or_else(bad)?.contains("date");
    let start_text = a["start"].as_str().ok_or_else(bad)?;
    let start_days = if dated {
        Epoch::parse(start_text)
            .map_err(|e| format!("{}: `{name}.start`: {e}", summary.display()))?
            .days_since_j2000_tdb()
    } else {
        start_text.parse::<f64>().map_err(|_| bad())?
    };
    let step_days = a["step_days"].as_f64().ok_or_else(bad)?;
    let count = a["count"].as_u64().ok_or_else(bad)? as usize;
    Ok((
        Axis {
            start_days,
            step_days,
            count,
        },
        dated,
    ))
}

/// Markers from the run's `windows.csv`, if it has one.
fn markers(dir: &Path, tof_axis: bool) -> Vec<Marker> {
    let Ok(mut reader) = csv::Reader::from_path(dir.join("windows.csv")) else {
        return Vec::new();
    };
    let Ok(header) = reader.headers().cloned() else {
        return Vec::new();
    };
    let col = |name: &str| header.iter().position(|h| h == name);
    let (Some(d), Some(a), Some(t), Some(r), Some(c), Some(fl)) = (
        col("depart_jd_tdb"),
        col("arrive_jd_tdb"),
        col("type"),
        col("revs"),
        col("c3_km2_s2"),
        col("flags"),
    ) else {
        return Vec::new();
    };
    let figure =
        |rec: &csv::StringRecord, name: &str| -> Option<f64> { rec.get(col(name)?)?.parse().ok() };
    reader
        .records()
        .filter_map(Result::ok)
        .filter(|rec| rec.get(r) == Some("0"))
        .filter_map(|rec| {
            let dj: f64 = rec.get(d)?.parse().ok()?;
            let aj: f64 = rec.get(a)?.parse().ok()?;
            let (dd, ad) = (dj - J2000_JD, aj - J2000_JD);
            let ridge = rec.get(fl).is_some_and(|f| f.contains("ridge"));
            let kind = if rec.get(t)? == "II" {
                TransferType::II
            } else {
                TransferType::I
            };
            Some(Marker {
                depart_days: dd,
                second: if tof_axis { ad - dd } else { ad },
                kind,
                name: format!("Type {kind}{}", if ridge { " (ridge)" } else { "" }),
                figures: MarkerFigures {
                    c3_km2_s2: rec.get(c)?.parse().ok(),
                    vinf_arrive_km_s: figure(&rec, "vinf_arrive_km_s"),
                    dla_deg: figure(&rec, "dla_deg"),
                    arrive_dec_deg: figure(&rec, "arrive_dec_deg"),
                    dv_total_km_s: figure(&rec, "dv_total_km_s"),
                },
            })
        })
        .collect()
}

pub fn run(args: &ChartArgs) -> CliResult<Outcome> {
    let summary_path = args.dir.join("summary.json");
    let summary: Value = serde_json::from_str(&read(&summary_path)?)
        .map_err(|e| format!("{}: {e}", summary_path.display()))?;
    let (depart, _) = axis(&summary, &summary_path, "depart_axis")?;
    let (second, dated) = axis(&summary, &summary_path, "second_axis")?;
    let kind = if dated {
        SecondAxis::Arrival
    } else {
        SecondAxis::TimeOfFlight
    };
    let revs = summary["options"]["revs"].as_u64().unwrap_or(0) as u32;
    let grid_path = args.dir.join("grid.csv");
    let grid = read_grid_csv(
        &read(&grid_path)?,
        &grid_path,
        depart,
        second,
        kind,
        layers_for(revs),
    )?;
    let text = |k: &str| summary[k].as_str().unwrap_or("?").to_string();
    let system = summary["provenance"]["system_name"].as_str().unwrap_or("?");
    let spec = ChartSpec {
        grid: &grid,
        layer: 0,
        title: format!("{} → {}", text("from"), text("to")),
        subtitle: format!(
            "{system} · departures {} to {}",
            Epoch::from_days_since_j2000_tdb(depart.start_days).date_tdb(),
            Epoch::from_days_since_j2000_tdb(depart.end_days()).date_tdb()
        ),
        c3_levels: args.c3_levels.clone(),
        vinf_levels: args.vinf_levels.clone(),
        markers: markers(&args.dir, !dated),
        max_c3: args.max_c3,
        ..ChartSpec::new(&grid)
    };
    let panel = match &args.show {
        Some(name) => Some(Panel::from_name(name).ok_or_else(|| {
            format!("--show: unknown panel {name:?}; choose from dla, arrive-dec, dv-total")
        })?),
        None => None,
    };
    let stem = match &args.show {
        Some(name) => format!("chart-{name}"),
        None => "chart".to_string(),
    };
    let targets: Vec<PathBuf> = match &args.out {
        Some(p) => vec![p.clone()],
        None => vec![
            args.dir.join(format!("{stem}.svg")),
            args.dir.join(format!("{stem}.png")),
        ],
    };
    // The saved files hold excess speeds, not the orbits: a delta-v panel
    // redrawn here has no parking or capture burn.
    let ends = Endpoints::bare();
    let mut said = String::new();
    for path in targets {
        match path.extension().and_then(|e| e.to_str()) {
            Some("svg") => {
                let svg = match panel {
                    Some(p) => render_panel_svg(&spec, p, &ends)?,
                    None => render_svg(&spec)?,
                };
                write_atomic(&path, svg.as_bytes())?
            }
            Some("png") => {
                let (w, h) = (DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX);
                let png = match panel {
                    Some(p) => render_panel_png(&spec, p, &ends, w, h)?,
                    None => render_png(&spec, w, h)?,
                };
                write_atomic(&path, &png)?
            }
            _ => {
                return Err(format!("--out: {} must end in .svg or .png", path.display()).into());
            }
        }
        said.push_str(&format!("wrote {}\n", path.display()));
    }
    print(&said)?;
    Ok(Outcome::Done)
}
