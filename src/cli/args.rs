//! Raw command-line arguments, close to what the user typed.
//!
//! Building these only parses; files are read and values validated in
//! [`super::input`] and the commands.

use std::path::PathBuf;

use clap::{Parser, Subcommand};

/// Transfer-window design from analytic mean-element ephemerides.
///
/// Figures are preliminary patched-conic design values; they do not replace
/// a mission's own navigation and flight-dynamics process.
#[derive(Debug, Parser)]
#[command(name = "synodic", version, about, long_about = None)]
pub struct Args {
    /// What to do.
    #[command(subcommand)]
    pub command: Command,
}

/// The subcommands.
#[derive(Debug, Subcommand)]
pub enum Command {
    /// List a system's bodies: elements, periods and synodic periods; with
    /// --at, each body's position and velocity on a date.
    ///
    /// Example: synodic bodies --system my-system.toml --at 2031-06-01
    Bodies {
        /// System file (TOML); the built-in demo system when omitted.
        #[arg(long, value_name = "FILE")]
        system: Option<PathBuf>,
        /// Also print every body's position (km) and velocity (km/s) at
        /// this date, in the system frame and, with a [frame], in the
        /// celestial frame.
        #[arg(long, value_name = "DATE")]
        at: Option<String>,
        /// Print JSON instead of a table.
        #[arg(long)]
        json: bool,
    },
    /// Solve Lambert's problem for one geometry, or a CSV batch of them.
    ///
    /// Units are whatever the inputs use consistently (km, km^3/s^2 and s
    /// by default).
    ///
    /// Example: synodic lambert --mu 398600 --r1 5000,10000,2100
    /// --r2 -14600,2500,7000 --tof 3600
    Lambert(LambertArgs),
    /// One transfer between two bodies on given dates: C3, DLA, RLA,
    /// v-infinity, delta-v and the transfer orbit.
    ///
    /// Example: synodic transfer Teodra Kesh --depart 2031-03-01
    /// --arrive 2031-11-15
    Transfer(TransferArgs),
    /// Sweep departure x arrival dates: C3, DLA, RLA, v-infinity and
    /// delta-v for every pair, written to grid.csv and summary.json.
    ///
    /// With no arguments, runs the demo study on the built-in system.
    ///
    /// Example: synodic sweep --depart 2031-01-01..2031-06-30
    /// --tof-days 120..400 --step-days 2
    Sweep(SweepArgs),
    /// Find and refine every opportunity of a span: the best-window table
    /// per opportunity and Type, with launch periods.
    ///
    /// Example: synodic windows Teodra Kesh --span 2030-01-01..2050-01-01
    /// --max-c3 12 --launch-period-days 21
    Windows(WindowsArgs),
    /// Run a study file: every pair's sweep and window scan, with the
    /// resolved study written beside the outputs.
    ///
    /// Example: synodic run examples/cargo-runs/study.toml
    Run(RunArgs),
    /// Redraw the chart of a sweep's output folder from its grid.csv and
    /// summary.json, without recomputing.
    ///
    /// Example: synodic chart synodic-out --c3-levels 13,14,16,20 --out c.png
    Chart(ChartArgs),
}

/// Arguments of `synodic chart`.
#[derive(Debug, clap::Args)]
pub struct ChartArgs {
    /// A folder written by `synodic sweep` or `synodic run`.
    pub dir: PathBuf,
    /// Chart file to write: .svg or .png (default DIR/chart.svg and
    /// DIR/chart.png).
    #[arg(long, value_name = "FILE")]
    pub out: Option<PathBuf>,
    /// C3 contour levels, km^2/s^2.
    #[arg(long, value_name = "LIST", value_delimiter = ',')]
    pub c3_levels: Option<Vec<f64>>,
    /// Arrival v-infinity contour levels, km/s.
    #[arg(long, value_name = "LIST", value_delimiter = ',')]
    pub vinf_levels: Option<Vec<f64>>,
    /// Shade the region with C3 at or below this ceiling (km^2/s^2).
    #[arg(long, value_name = "C3", allow_hyphen_values = true)]
    pub max_c3: Option<f64>,
    /// Draw this panel instead of the main chart: dla, arrive-dec or
    /// dv-total (total delta-v without parking or capture orbits).
    #[arg(long, value_name = "NAME")]
    pub show: Option<String>,
}

/// Arguments of `synodic run`.
#[derive(Debug, clap::Args)]
pub struct RunArgs {
    /// The study file (TOML).
    pub study: PathBuf,
    /// Output folder (overrides the study's `out`).
    #[arg(long, value_name = "DIR")]
    pub out: Option<PathBuf>,
    /// Worker threads. Results do not depend on it.
    #[arg(long, value_name = "N")]
    pub threads: Option<usize>,
    /// No progress bar.
    #[arg(long)]
    pub quiet: bool,
    /// Print JSON summaries.
    #[arg(long)]
    pub json: bool,
}

/// Arguments of `synodic windows`.
#[derive(Debug, clap::Args)]
pub struct WindowsArgs {
    /// Departure body.
    pub from: String,
    /// Arrival body.
    pub to: String,
    /// Departure dates to search, START..END.
    #[arg(long, value_name = "START..END")]
    pub span: String,
    /// System file (TOML); the built-in demo system when omitted.
    #[arg(long, value_name = "FILE")]
    pub system: Option<PathBuf>,
    /// What to minimise: c3, vinf-arrive, dv-total or c3+vinf.
    #[arg(long, value_name = "NAME", default_value = "c3")]
    pub objective: String,
    /// Time-of-flight limits MIN..MAX in days (0.3 to 2 Hohmann times when
    /// omitted).
    #[arg(long, value_name = "MIN..MAX")]
    pub tof_days: Option<String>,
    /// Launch-vehicle C3 ceiling (km^2/s^2): launch periods are reported
    /// against it.
    #[arg(long, value_name = "C3", allow_hyphen_values = true)]
    pub max_c3: Option<f64>,
    /// Arrival v-infinity ceiling (km/s).
    #[arg(long, value_name = "KM_S")]
    pub max_vinf_arrive: Option<f64>,
    /// Also search multi-revolution arcs with up to M revolutions.
    #[arg(long, value_name = "M", default_value_t = 0, allow_hyphen_values = true, value_parser = whole_number)]
    pub revs: u32,
    /// Length of a fixed-arrival-date launch period, in daily departures.
    #[arg(long, value_name = "N", requires = "max_c3", allow_hyphen_values = true, value_parser = whole_number)]
    pub launch_period_days: Option<u32>,
    /// Parking and capture orbits.
    #[command(flatten)]
    pub orbits: OrbitArgs,
    /// Write the table as CSV here (launch-period tables go beside it).
    #[arg(long, value_name = "FILE.csv")]
    pub out: Option<PathBuf>,
    /// Also draw the overview chart (best C3 and arrival v-infinity per
    /// opportunity and Type) to this .svg or .png file.
    #[arg(long, value_name = "FILE")]
    pub overview: Option<PathBuf>,
    /// Print JSON instead of a table.
    #[arg(long)]
    pub json: bool,
    /// Worker threads.
    #[arg(long, value_name = "N")]
    pub threads: Option<usize>,
    /// Also save this run as a study file, to repeat it with `synodic run`.
    #[arg(long, value_name = "FILE")]
    pub save_study: Option<PathBuf>,
    /// Let arcs flagged periapsis-inside or relativistic be optima and
    /// count in launch periods.
    #[arg(long)]
    pub allow_flagged: bool,
}

/// Arguments of `synodic sweep`.
#[derive(Debug, clap::Args)]
pub struct SweepArgs {
    /// Departure body (the demo pair when omitted).
    #[arg(requires = "to")]
    pub from: Option<String>,
    /// Arrival body.
    pub to: Option<String>,
    /// System file (TOML); the built-in demo system when omitted.
    #[arg(long, value_name = "FILE")]
    pub system: Option<PathBuf>,
    /// Departure dates START..END (the next opportunity after the system
    /// epoch when omitted).
    #[arg(long, value_name = "START..END")]
    pub depart: Option<String>,
    /// Arrival dates START..END.
    #[arg(long, value_name = "START..END", conflicts_with = "tof_days")]
    pub arrive: Option<String>,
    /// Times of flight MIN..MAX in days, instead of arrival dates.
    #[arg(long, value_name = "MIN..MAX")]
    pub tof_days: Option<String>,
    /// Grid step in days: one value for both axes, or DEPART,SECOND.
    #[arg(long, value_name = "D[,D]", default_value = "1")]
    pub step_days: String,
    /// Also solve multi-revolution arcs with up to M revolutions.
    #[arg(long, value_name = "M", default_value_t = 0, allow_hyphen_values = true, value_parser = whole_number)]
    pub revs: u32,
    /// Worker threads (one per core when omitted). Results do not depend
    /// on it.
    #[arg(long, value_name = "N")]
    pub threads: Option<usize>,
    /// Parking and capture orbits.
    #[command(flatten)]
    pub orbits: OrbitArgs,
    /// Output folder.
    #[arg(long, value_name = "DIR", default_value = "synodic-out")]
    pub out: PathBuf,
    /// Output files to leave out, comma-separated: grid, chart, windows.
    #[arg(long, value_name = "LIST", value_delimiter = ',')]
    pub skip: Vec<String>,
    /// Refuse grids estimated to need more memory than this (GiB).
    #[arg(long, value_name = "GIB", default_value_t = 4.0)]
    pub max_memory_gib: f64,
    /// Print the summary as JSON.
    #[arg(long)]
    pub json: bool,
    /// No progress bar.
    #[arg(long)]
    pub quiet: bool,
    /// Also save this run as a study file, to repeat it with `synodic run`.
    #[arg(long, value_name = "FILE")]
    pub save_study: Option<PathBuf>,
    /// C3 contour levels for the chart, km^2/s^2 (automatic when omitted).
    #[arg(long, value_name = "LIST", value_delimiter = ',')]
    pub c3_levels: Option<Vec<f64>>,
    /// Arrival v-infinity contour levels for the chart, km/s.
    #[arg(long, value_name = "LIST", value_delimiter = ',')]
    pub vinf_levels: Option<Vec<f64>>,
    /// Shade the region with C3 at or below this ceiling (km^2/s^2).
    #[arg(long, value_name = "C3", allow_hyphen_values = true)]
    pub max_c3: Option<f64>,
    /// Extra chart panels, each written as chart-NAME.svg/.png:
    /// dla, arrive-dec, dv-total.
    #[arg(long, value_name = "LIST", value_delimiter = ',')]
    pub show: Vec<String>,
    /// Let arcs flagged periapsis-inside or relativistic be optima.
    #[arg(long)]
    pub allow_flagged: bool,
}

/// Arguments of `synodic lambert`.
#[derive(Debug, clap::Args)]
pub struct LambertArgs {
    /// Gravitational parameter of the central body (km^3/s^2).
    #[arg(long, allow_hyphen_values = true, required_unless_present = "batch")]
    pub mu: Option<f64>,
    /// Initial position X,Y,Z (km).
    #[arg(
        long,
        value_name = "X,Y,Z",
        allow_hyphen_values = true,
        required_unless_present = "batch"
    )]
    pub r1: Option<String>,
    /// Final position X,Y,Z (km).
    #[arg(
        long,
        value_name = "X,Y,Z",
        allow_hyphen_values = true,
        required_unless_present = "batch"
    )]
    pub r2: Option<String>,
    /// Time of flight (s).
    #[arg(long, allow_hyphen_values = true, required_unless_present = "batch")]
    pub tof: Option<f64>,
    /// Also return solutions with up to this many complete revolutions.
    #[arg(long, value_name = "M", default_value_t = 0, allow_hyphen_values = true, value_parser = whole_number)]
    pub revs: u32,
    /// Solve for retrograde motion (angular momentum along -z).
    #[arg(long)]
    pub retrograde: bool,
    /// Print JSON instead of a table.
    #[arg(long)]
    pub json: bool,
    /// Solve every row of a CSV file
    /// (header id,mu,r1x,r1y,r1z,r2x,r2y,r2z,tof,revs,prograde).
    #[arg(long, value_name = "IN.csv", conflicts_with_all = ["mu", "r1", "r2", "tof", "json"])]
    pub batch: Option<PathBuf>,
    /// Where to write the batch results (stdout when omitted).
    #[arg(long, value_name = "OUT.csv", requires = "batch")]
    pub out: Option<PathBuf>,
}

/// Arguments of `synodic transfer`.
#[derive(Debug, clap::Args)]
pub struct TransferArgs {
    /// Departure body.
    pub from: String,
    /// Arrival body.
    pub to: String,
    /// Departure date (YYYY-MM-DD[Thh:mm:ss][ TDB|TT|UTC]; TDB by default).
    #[arg(long, value_name = "DATE")]
    pub depart: String,
    /// Arrival date, same forms as --depart.
    #[arg(long, value_name = "DATE")]
    pub arrive: String,
    /// System file (TOML); the built-in demo system when omitted.
    #[arg(long, value_name = "FILE")]
    pub system: Option<PathBuf>,
    /// Parking and capture orbits.
    #[command(flatten)]
    pub orbits: OrbitArgs,
    /// Also consider arcs with up to this many complete revolutions.
    #[arg(long, value_name = "M", default_value_t = 0, allow_hyphen_values = true, value_parser = whole_number)]
    pub revs: u32,
    /// Print JSON instead of a table.
    #[arg(long)]
    pub json: bool,
}

/// Parking and capture orbits, shared by the commands that compute
/// delta-v.
#[derive(Debug, Clone, Copy, clap::Args)]
pub struct OrbitArgs {
    /// Altitude of the circular parking orbit at departure (km); 200 km
    /// when omitted and the body has a GM and radius.
    #[arg(long, value_name = "KM", allow_hyphen_values = true)]
    pub park_alt_km: Option<f64>,
    /// Periapsis altitude of the capture orbit at arrival (km); no capture
    /// burn when omitted.
    #[arg(long, value_name = "KM", allow_hyphen_values = true)]
    pub capture_alt_km: Option<f64>,
    /// Eccentricity of the capture orbit.
    #[arg(
        long,
        value_name = "E",
        default_value_t = 0.0,
        requires = "capture_alt_km",
        allow_hyphen_values = true
    )]
    pub capture_ecc: f64,
}

/// A count given on the command line: a whole number >= 0, with a message
/// in those words (clap's own would quote Rust's integer parser).
fn whole_number(text: &str) -> Result<u32, String> {
    text.trim()
        .parse::<u32>()
        .map_err(|_| format!("expected a whole number >= 0, got {text:?}"))
}
