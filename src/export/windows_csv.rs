//! `windows.csv` and the JSON best-window table: one record per
//! opportunity, Type and solution layer.

use serde::Serialize;

use crate::sweep::Objective;
use crate::windows::launch::{FixedArrivalPeriod, LaunchPeriod};
use crate::windows::Optimum;

use super::dates::{stamp, Stamp};

/// One row of the best-window table, as written to CSV and JSON.
///
/// Column names carry their units; dates are TDB, `YYYY-MM-DDThh:mm:ss`,
/// each beside its Julian date and made from the same value
/// ([`super::stamp`]). Launch-period columns are empty without a C3
/// ceiling (or a launch-period length).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct WindowRecord {
    /// Opportunity label: the TDB date `YYYY-MM-DD` of the opportunity's
    /// best departure (a letter appended where two share a date).
    pub opportunity: String,
    /// `I` or `II`.
    #[serde(rename = "type")]
    pub kind: String,
    /// Complete revolutions.
    pub revs: u32,
    /// `single`, `left` or `right`.
    pub branch: String,
    /// Departure, Julian date TDB.
    pub depart_jd_tdb: f64,
    /// Arrival, Julian date TDB.
    pub arrive_jd_tdb: f64,
    /// Departure date.
    pub depart_date: String,
    /// Arrival date.
    pub arrive_date: String,
    /// Time of flight, days.
    pub tof_days: f64,
    /// Departure C3, km^2/s^2.
    pub c3_km2_s2: f64,
    /// DLA, deg.
    pub dla_deg: f64,
    /// RLA, deg.
    pub rla_deg: f64,
    /// Departure v-infinity, km/s.
    pub vinf_depart_km_s: f64,
    /// Arrival v-infinity, km/s.
    pub vinf_arrive_km_s: f64,
    /// Arrival declination, deg.
    pub arrive_dec_deg: f64,
    /// Arrival right ascension, deg.
    pub arrive_ra_deg: f64,
    /// Total delta-v, km/s.
    pub dv_total_km_s: f64,
    /// The objective minimised.
    pub objective: String,
    /// Its value at the optimum.
    pub objective_value: f64,
    /// Its value at the grid cell the refinement started from.
    pub grid_value: f64,
    /// `ridge`, `edge`, `over-limit` and the arc's sanity flags
    /// (`periapsis-inside`, `hyperbolic`, `relativistic`), separated by `;`
    /// (empty: none).
    pub flags: String,
    /// First open departure date under the C3 ceiling.
    pub launch_first_date: Option<String>,
    /// Its Julian date, TDB.
    pub launch_first_jd_tdb: Option<f64>,
    /// Last open departure date under the C3 ceiling.
    pub launch_last_date: Option<String>,
    /// Its Julian date, TDB.
    pub launch_last_jd_tdb: Option<f64>,
    /// Days from first to last open departure.
    pub launch_days_open: Option<f64>,
    /// Fixed arrival date of the N-day launch period.
    pub fixed_arrive_date: Option<String>,
    /// Its Julian date, TDB.
    pub fixed_arrive_jd_tdb: Option<f64>,
    /// First departure of the N-day launch period.
    pub fixed_first_date: Option<String>,
    /// Its Julian date, TDB.
    pub fixed_first_jd_tdb: Option<f64>,
    /// Largest C3 over the N-day launch period, km^2/s^2.
    pub fixed_max_c3_km2_s2: Option<f64>,
}

impl WindowRecord {
    /// Build a record from an optimum and its launch periods.
    pub fn new(
        opportunity: &str,
        opt: &Optimum,
        objective: Objective,
        over_limit: bool,
        launch: Option<&LaunchPeriod>,
        fixed: Option<&FixedArrivalPeriod>,
    ) -> WindowRecord {
        let f = &opt.figures;
        let mut flags = Vec::new();
        if opt.ridge {
            flags.push("ridge");
        }
        if opt.edge {
            flags.push("edge");
        }
        if over_limit {
            flags.push("over-limit");
        }
        flags.extend(opt.figures.flags.names());
        let round = |x: f64, k: i32| {
            let s = 10f64.powi(k);
            (x * s).round() / s
        };
        let (depart, arrive) = (stamp(opt.depart_days), stamp(opt.arrive_days));
        let split = |s: Stamp| (Some(s.date), Some(s.jd_tdb));
        let (launch_first_date, launch_first_jd_tdb) =
            launch.map_or((None, None), |l| split(stamp(l.first_days)));
        let (launch_last_date, launch_last_jd_tdb) =
            launch.map_or((None, None), |l| split(stamp(l.last_days)));
        let (fixed_arrive_date, fixed_arrive_jd_tdb) =
            fixed.map_or((None, None), |p| split(stamp(p.arrive_days)));
        let (fixed_first_date, fixed_first_jd_tdb) =
            fixed.map_or((None, None), |p| split(stamp(p.first_days)));
        WindowRecord {
            opportunity: opportunity.to_string(),
            kind: opt.kind.to_string(),
            revs: opt.layer.revs,
            branch: opt.layer.branch.to_string(),
            depart_jd_tdb: depart.jd_tdb,
            arrive_jd_tdb: arrive.jd_tdb,
            depart_date: depart.date,
            arrive_date: arrive.date,
            tof_days: round(opt.arrive_days - opt.depart_days, 3),
            c3_km2_s2: round(f.c3_km2_s2, 5),
            dla_deg: round(f.dla_deg, 4),
            rla_deg: round(f.rla_deg, 4),
            vinf_depart_km_s: round(f.vinf_depart_km_s, 5),
            vinf_arrive_km_s: round(f.vinf_arrive_km_s, 5),
            arrive_dec_deg: round(f.arrive_dec_deg, 4),
            arrive_ra_deg: round(f.arrive_ra_deg, 4),
            dv_total_km_s: round(f.dv_total_km_s, 5),
            objective: objective.name().to_string(),
            objective_value: round(opt.value, 6),
            grid_value: round(opt.grid_value, 6),
            flags: flags.join(";"),
            launch_first_date,
            launch_first_jd_tdb,
            launch_last_date,
            launch_last_jd_tdb,
            launch_days_open: launch.map(|l| round(l.days_open(), 2)),
            fixed_arrive_date,
            fixed_arrive_jd_tdb,
            fixed_first_date,
            fixed_first_jd_tdb,
            fixed_max_c3_km2_s2: fixed.map(|p| round(p.max_c3_km2_s2, 5)),
        }
    }
}

/// Encode records as CSV (header from the field names).
///
/// # Errors
/// Only if the CSV encoder fails, which it does not for these types.
pub fn windows_csv(records: &[WindowRecord]) -> Result<Vec<u8>, csv::Error> {
    let mut w = csv::Writer::from_writer(Vec::new());
    if records.is_empty() {
        // Still write the header so an empty table loads.
        w.write_record(WINDOW_COLUMNS)?;
    }
    for r in records {
        w.serialize(r)?;
    }
    w.into_inner().map_err(|e| csv::Error::from(e.into_error()))
}

/// The header of `windows.csv`.
pub const WINDOW_COLUMNS: [&str; 31] = [
    "opportunity",
    "type",
    "revs",
    "branch",
    "depart_jd_tdb",
    "arrive_jd_tdb",
    "depart_date",
    "arrive_date",
    "tof_days",
    "c3_km2_s2",
    "dla_deg",
    "rla_deg",
    "vinf_depart_km_s",
    "vinf_arrive_km_s",
    "arrive_dec_deg",
    "arrive_ra_deg",
    "dv_total_km_s",
    "objective",
    "objective_value",
    "grid_value",
    "flags",
    "launch_first_date",
    "launch_first_jd_tdb",
    "launch_last_date",
    "launch_last_jd_tdb",
    "launch_days_open",
    "fixed_arrive_date",
    "fixed_arrive_jd_tdb",
    "fixed_first_date",
    "fixed_first_jd_tdb",
    "fixed_max_c3_km2_s2",
];

/// The daily table of a fixed-arrival launch period as CSV: departure
/// date, C3, DLA, RLA and arrival v-infinity (empty where no arc exists).
pub fn launch_period_csv(p: &FixedArrivalPeriod) -> Vec<u8> {
    use std::fmt::Write as _;
    let mut s = String::from(
        "depart_date,depart_jd_tdb,arrive_date,arrive_jd_tdb,c3_km2_s2,dla_deg,rla_deg,vinf_arrive_km_s\n",
    );
    let arrive = stamp(p.arrive_days);
    for row in &p.daily {
        let depart = stamp(row.depart_days);
        let _ = write!(
            s,
            "{},{:.6},{},{:.6},",
            depart.date, depart.jd_tdb, arrive.date, arrive.jd_tdb
        );
        match &row.figures {
            Some(f) => {
                let _ = writeln!(
                    s,
                    "{:.5},{:.4},{:.4},{:.5}",
                    f.c3_km2_s2, f.dla_deg, f.rla_deg, f.vinf_arrive_km_s
                );
            }
            None => s.push_str(",,,\n"),
        }
    }
    s.into_bytes()
}
