//! `grid.csv`: one row per cell and solution layer.

use std::collections::HashMap;
use std::fmt::Write as _;

use std::path::Path;

use super::dates::{stamp, Stamp};
use super::ExportError;
use crate::sweep::{Axis, CellStatus, Grid, Layer, SecondAxis};
use crate::transfer::{ArcFlags, Endpoints};

/// The header of `grid.csv`, units in the column names.
pub const GRID_COLUMNS: [&str; 21] = [
    "depart_jd_tdb",
    "arrive_jd_tdb",
    "depart_date",
    "arrive_date",
    "tof_days",
    "revs",
    "branch",
    "type",
    "transfer_angle_deg",
    "c3_km2_s2",
    "vinf_depart_km_s",
    "dla_deg",
    "rla_deg",
    "vinf_arrive_km_s",
    "arrive_dec_deg",
    "arrive_ra_deg",
    "dv_depart_km_s",
    "dv_arrive_km_s",
    "dv_total_km_s",
    "status",
    "flags",
];

/// Encode a grid as CSV, rows ordered by departure, then second axis, then
/// layer. Figures of cells whose status is not ok are left empty; `flags`
/// holds the cell's sanity flags ([`ArcFlags`], `;`-separated).
/// Numbers use fixed decimals, so equal grids give equal bytes.
pub fn grid_csv(grid: &Grid, ends: &Endpoints) -> Vec<u8> {
    let mut dates: HashMap<u64, Stamp> = HashMap::new();
    let mut date = |days: f64| -> Stamp {
        dates
            .entry(days.to_bits())
            .or_insert_with(|| stamp(days))
            .clone()
    };
    let n_layers = grid.layers.len();
    let mut out = String::with_capacity(grid.cells() * n_layers * 160 + 400);
    out.push_str(&GRID_COLUMNS.join(","));
    out.push('\n');
    for i in 0..grid.depart.count {
        for j in 0..grid.second.count {
            let (d, a) = grid.dates_days(i, j);
            let (sd, sa) = (date(d), date(a));
            let prefix = format!(
                "{:.6},{:.6},{},{},{:.6}",
                sd.jd_tdb,
                sa.jd_tdb,
                sd.date,
                sa.date,
                a - d
            );
            for (l, layer) in grid.layers.iter().enumerate() {
                let idx = grid.index(i, j, l);
                let status = grid.status_at(idx);
                let _ = write!(out, "{prefix},{},{},", layer.revs, layer.branch);
                if status == CellStatus::Ok {
                    let vd = grid.vinf_depart_km_s[idx];
                    let va = grid.vinf_arrive_km_s[idx];
                    let dvd = ends.dv_depart_km_s(vd);
                    let dva = ends.dv_arrive_km_s(va);
                    let _ = write!(
                        out,
                        "{},{:.5},{:.6},{:.6},{:.5},{:.5},{:.6},{:.5},{:.5},{:.6},{:.6},{:.6},",
                        grid.kind_at(idx),
                        grid.transfer_angle_deg[idx],
                        vd * vd,
                        vd,
                        grid.dla_deg(idx),
                        grid.rla_deg(idx),
                        va,
                        grid.arrive_dec_deg(idx),
                        grid.arrive_ra_deg(idx),
                        dvd,
                        dva,
                        dvd + dva
                    );
                } else {
                    out.push_str(",,,,,,,,,,,,");
                }
                out.push_str(status.as_str());
                out.push(',');
                out.push_str(&grid.flags_at(idx).to_text());
                out.push('\n');
            }
        }
    }
    out.into_bytes()
}

/// The unit vector with declination `dec_deg` and right ascension `ra_deg`.
fn unit_of_dec_ra(dec_deg: f64, ra_deg: f64) -> [f32; 3] {
    let (d, r) = (dec_deg.to_radians(), ra_deg.to_radians());
    [
        (d.cos() * r.cos()) as f32,
        (d.cos() * r.sin()) as f32,
        d.sin() as f32,
    ]
}

/// Read a `grid.csv` written by [`grid_csv`] back into a grid with the
/// given axes and layers (from the run's `summary.json`), for redrawing.
///
/// # Errors
/// [`ExportError::Parse`] naming the file, line and column of the first
/// malformed row, a wrong header, or a row count that does not match the
/// axes.
pub fn read_grid_csv(
    text: &str,
    source: &Path,
    depart: Axis,
    second: Axis,
    second_kind: SecondAxis,
    layers: Vec<Layer>,
) -> Result<Grid, ExportError> {
    let err = |line: usize, message: String| ExportError::Parse {
        path: source.to_path_buf(),
        line,
        message,
    };
    let mut lines = text.lines();
    let header = lines.next().unwrap_or_default();
    if header != GRID_COLUMNS.join(",") {
        return Err(err(
            1,
            "header is not that of a synodic grid.csv".to_string(),
        ));
    }
    let mut grid = Grid::new(depart, second, second_kind, layers);
    let expected = grid.status.len();
    let mut k = 0usize;
    for (n, row) in lines.enumerate() {
        let line = n + 2;
        if row.is_empty() {
            continue;
        }
        if k >= expected {
            return Err(err(
                line,
                format!("more rows than the {expected} the axes allow"),
            ));
        }
        let f: Vec<&str> = row.split(',').collect();
        if f.len() != GRID_COLUMNS.len() {
            return Err(err(
                line,
                format!("expected {} fields, got {}", GRID_COLUMNS.len(), f.len()),
            ));
        }
        let status = match f[19] {
            "ok" => CellStatus::Ok,
            "no solution" => CellStatus::NoSolution,
            "not converged" => CellStatus::NotConverged,
            other => {
                return Err(err(
                    line,
                    format!("column `status`: unknown value {other:?}"),
                ))
            }
        };
        grid.status[k] = status as u8;
        grid.flags[k] = ArcFlags::parse(f[20])
            .ok_or_else(|| err(line, format!("column `flags`: unknown value {:?}", f[20])))?
            .bits();
        if status == CellStatus::Ok {
            let num = |c: usize| -> Result<f64, ExportError> {
                f[c].parse::<f64>()
                    .ok()
                    .filter(|x| x.is_finite())
                    .ok_or_else(|| {
                        err(
                            line,
                            format!("column `{}`: {:?} is not a number", GRID_COLUMNS[c], f[c]),
                        )
                    })
            };
            grid.transfer_angle_deg[k] = num(8)? as f32;
            grid.vinf_depart_km_s[k] = num(10)?;
            grid.depart_dir[k] = unit_of_dec_ra(num(11)?, num(12)?);
            grid.vinf_arrive_km_s[k] = num(13)?;
            grid.arrive_dir[k] = unit_of_dec_ra(num(14)?, num(15)?);
        }
        k += 1;
    }
    if k != expected {
        return Err(err(
            k + 1,
            format!("{k} rows, but the axes need {expected}"),
        ));
    }
    Ok(grid)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::ephemeris::System;
    use crate::sweep::{layers_for, sweep, RunOptions, SweepSpec};
    use crate::transfer::Endpoints;

    /// Writing a grid and reading it back gives the same figures to the
    /// printed digits, and the same statuses.
    #[test]
    fn grid_round_trips_through_csv() {
        let system = System::demo();
        let ends = Endpoints::bare();
        let start = 11_700.5;
        let spec = SweepSpec {
            from: 2,
            to: 3,
            depart: Axis {
                start_days: start,
                step_days: 7.0,
                count: 12,
            },
            second: Axis {
                start_days: start - 20.0,
                step_days: 11.0,
                count: 30,
            },
            second_kind: SecondAxis::Arrival,
            max_revs: 1,
            ends,
        };
        let grid = sweep(&system, &spec, RunOptions::default(), || {}).expect("sweep");
        let text = String::from_utf8(grid_csv(&grid, &ends)).expect("utf8");
        let back = read_grid_csv(
            &text,
            Path::new("g.csv"),
            spec.depart,
            spec.second,
            spec.second_kind,
            layers_for(1),
        )
        .expect("reads back");
        assert!(back.status == grid.status);
        assert!(
            grid.status.iter().any(|&s| s != 0),
            "some cells must be unsolved"
        );
        for k in 0..grid.status.len() {
            if grid.status[k] == 0 {
                assert!((back.vinf_depart_km_s[k] - grid.vinf_depart_km_s[k]).abs() < 1e-6);
                assert!((back.dla_deg(k) - grid.dla_deg(k)).abs() < 1e-4);
                assert!((back.arrive_ra_deg(k) - grid.arrive_ra_deg(k)).abs() < 1e-4);
            }
        }
        let cut: String = text.lines().take(20).map(|l| format!("{l}\n")).collect();
        let e = read_grid_csv(
            &cut,
            Path::new("g.csv"),
            spec.depart,
            spec.second,
            spec.second_kind,
            layers_for(1),
        )
        .expect_err("too short");
        assert!(e.to_string().contains("g.csv"), "{e}");
    }
}
