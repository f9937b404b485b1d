//! `grid.csv`: one row per cell and solution layer.

use std::collections::HashMap;
use std::fmt::Write as _;

use crate::sweep::{CellStatus, Grid};
use crate::time::{Epoch, J2000_JD};
use crate::transfer::Endpoints;

/// The header of `grid.csv`, units in the column names.
pub const GRID_COLUMNS: [&str; 20] = [
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
];

/// A date for a file: `YYYY-MM-DD` at TDB midnight, else
/// `YYYY-MM-DDThh:mm:ss` (TDB).
pub fn file_date(days_since_j2000_tdb: f64) -> String {
    let iso = Epoch::from_days_since_j2000_tdb(days_since_j2000_tdb).to_iso_tdb();
    let iso = iso.trim_end_matches(" TDB");
    match iso.strip_suffix("T00:00:00") {
        Some(date) => date.to_string(),
        None => iso.to_string(),
    }
}

/// Encode a grid as CSV, rows ordered by departure, then second axis, then
/// layer. Figures of cells whose status is not ok are left empty.
/// Numbers use fixed decimals, so equal grids give equal bytes.
pub fn grid_csv(grid: &Grid, ends: &Endpoints) -> Vec<u8> {
    let mut dates: HashMap<u64, String> = HashMap::new();
    let mut date = |days: f64| -> String {
        dates
            .entry(days.to_bits())
            .or_insert_with(|| file_date(days))
            .clone()
    };
    let n_layers = grid.layers.len();
    let mut out = String::with_capacity(grid.cells() * n_layers * 160 + 400);
    out.push_str(&GRID_COLUMNS.join(","));
    out.push('\n');
    for i in 0..grid.depart.count {
        for j in 0..grid.second.count {
            let (d, a) = grid.dates_days(i, j);
            let (dj, aj) = (d + J2000_JD, a + J2000_JD);
            let prefix = format!("{dj:.6},{aj:.6},{},{},{:.6}", date(d), date(a), a - d);
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
                        grid.dla_deg[idx],
                        grid.rla_deg[idx],
                        va,
                        grid.arrive_dec_deg[idx],
                        grid.arrive_ra_deg[idx],
                        dvd,
                        dva,
                        dvd + dva
                    );
                } else {
                    out.push_str(",,,,,,,,,,,,");
                }
                out.push_str(status.as_str());
                out.push('\n');
            }
        }
    }
    out.into_bytes()
}
