//! The bad-input matrix of issue 9: the conventions a practitioner brings,
//! written wrongly, give exit 2, a message naming the file, line and key
//! (or the option) with the accepted form and no Rust type name, and no
//! output file.

use crate::util::{edit, line_of, Dir, Run};

const DEMO: &str = include_str!("../../ephemerides/demo.toml");

/// Words that would betray the program's insides in a message.
const RUST_WORDS: [&str; 8] = [
    "RawRates",
    "RawBody",
    "RawFrame",
    "struct ",
    "u32",
    "f64",
    "usize",
    "invalid type",
];

fn plain(r: &Run) {
    for w in RUST_WORDS {
        assert!(!r.stderr.contains(w), "message shows {w:?}: {}", r.stderr);
    }
}

/// A small study on system file `system`, writing into `out`.
fn study_on(system: &str) -> String {
    format!(
        "system = \"{system}\"\nout = \"out\"\n\n[[pair]]\nfrom = \"Teodra\"\nto = \"Kesh\"\n\n\
         [sweep]\ndepart = \"2032-03-01..2032-04-01\"\ntof_days = [200.0, 300.0]\nstep_days = [5.0]\n"
    )
}

/// `text` as a system file: `bodies --system` and `run` of a study naming
/// it both exit 2 with every needle, and the run writes nothing.
fn system_refused(name: &str, text: &str, needles: &[&str]) {
    let d = Dir::new(name);
    d.write("sys.toml", text);
    let r = d
        .run(&["bodies", "--system", "sys.toml"])
        .bad_input(needles);
    plain(&r);
    assert!(r.stdout.is_empty(), "{}", r.stdout);
    d.write("study.toml", &study_on("sys.toml"));
    let r = d.run(&["run", "study.toml", "--quiet"]).bad_input(needles);
    plain(&r);
    assert_eq!(d.files(""), vec!["study.toml", "sys.toml"]);
}

/// `text` as a study on the demo system: exit 2 with every needle, nothing
/// written.
fn study_refused(name: &str, text: &str, needles: &[&str]) {
    let d = Dir::new(name);
    d.write("study.toml", text);
    let r = d.run(&["run", "study.toml", "--quiet"]).bad_input(needles);
    plain(&r);
    assert_eq!(d.files(""), vec!["study.toml"]);
}

/// A command line: exit 2 with every needle, nothing written.
fn command_refused(name: &str, args: &[&str], needles: &[&str]) {
    let d = Dir::new(name);
    let r = d.run(args).bad_input(needles);
    plain(&r);
    assert!(d.files("").is_empty(), "{:?}", d.files(""));
}

const KESH: &str = "name = \"Kesh\"\na_au = 1.58\n";

#[test]
fn control_demo_and_study_are_accepted() {
    let d = Dir::new("bt-control");
    d.write("sys.toml", DEMO);
    d.write("study.toml", &study_on("sys.toml"));
    d.run(&["run", "study.toml", "--quiet"]).ok();
    assert!(d.files("out").contains(&"summary.json".to_string()));
}

/// The demo with `from` replaced by `to` in Kesh's table is refused with a
/// message at the line holding `at`, naming `key` of body Kesh, and
/// mentioning every needle.
fn kesh_refused(name: &str, (from, to): (&str, &str), at: &str, key: &str, needles: &[&str]) {
    let text = edit(DEMO, from, to);
    let line = format!("sys.toml:{}: body \"Kesh\": {key}", line_of(&text, at));
    let mut all = vec![line.as_str()];
    all.extend(needles);
    system_refused(name, &text, &all);
}

/// A mean-longitude rate per day where per century is meant: Kepler's
/// third law refuses it, printing both rates and their ratio.
#[test]
fn unit_slip_rate() {
    kesh_refused(
        "bt-unit-slip",
        (
            "mean_lon_deg = 205.0\n",
            "mean_lon_deg = 205.0\nrates = { mean_lon_deg = 1.914 }\n",
        ),
        "rates = { mean_lon_deg = 1.914",
        "rates: key `mean_lon_deg`",
        &[
            "disagrees with Kepler's third law",
            "Kepler / given = ",
            "per Julian century",
            "rate_check = false",
        ],
    );
}

#[test]
fn retired_peri_deg() {
    kesh_refused(
        "bt-peri-deg",
        ("lon_peri_deg = 301.0", "peri_deg = 301.0"),
        "peri_deg = 301.0",
        "key `peri_deg`",
        &[
            "lon_peri_deg (longitude of periapsis",
            "arg_peri_deg (argument of periapsis",
        ],
    );
}

#[test]
fn element_set_neither_or_both() {
    kesh_refused(
        "bt-neither",
        ("lon_peri_deg = 301.0\n", ""),
        KESH,
        "key `lon_peri_deg`",
        &["missing the periapsis: give lon_peri_deg"],
    );
    kesh_refused(
        "bt-both",
        (
            "lon_peri_deg = 301.0\n",
            "lon_peri_deg = 301.0\narg_peri_deg = 268.0\n",
        ),
        "arg_peri_deg = 268.0",
        "key `arg_peri_deg`",
        &["give only one of the two"],
    );
    kesh_refused(
        "bt-both-epoch",
        (
            "mean_lon_deg = 205.0\n",
            "mean_lon_deg = 205.0\nmean_anom_deg = 264.0\n",
        ),
        "mean_anom_deg = 264.0",
        "key `mean_anom_deg`",
        &["mean_lon_deg (mean longitude"],
    );
    kesh_refused(
        "bt-rate-key",
        (
            "mean_lon_deg = 205.0\n",
            "mean_lon_deg = 205.0\nrates = { arg_peri_deg = 0.1 }\n",
        ),
        "rates = { arg_peri_deg",
        "rates: key `arg_peri_deg`",
        &["its rate is rates.lon_peri_deg"],
    );
}

#[test]
fn inclination_out_of_range() {
    for (value, folded) in [("200", "i_deg = 160"), ("-10", "i_deg = 10")] {
        let edited = format!("i_deg = {value}");
        kesh_refused(
            &format!("bt-incl{value}"),
            ("i_deg = 1.6", &edited),
            &edited,
            "key `i_deg`",
            &["must be in [0, 180] deg", folded, "node_deg + 180"],
        );
    }
}

#[test]
fn bare_toml_date_and_scalar_rates() {
    let text = edit(
        DEMO,
        "epoch = \"2030-01-01T00:00:00 TDB\"",
        "epoch = 2030-01-01",
    );
    let line = format!("sys.toml:{}: key `epoch`", line_of(&text, "epoch = 2030"));
    system_refused(
        "bt-bare-date",
        &text,
        &[&line, "bare TOML date", "\"2030-01-01T00:00:00 TDB\""],
    );
    let text = edit(
        DEMO,
        "mean_lon_deg = 205.0\n",
        "mean_lon_deg = 205.0\nrates = 0.001\n",
    );
    let line = format!("sys.toml:{}: key `rates`", line_of(&text, "rates = 0.001"));
    system_refused(
        "bt-scalar-rates",
        &text,
        &[&line, "expected a table of rates", "got the number 0.001"],
    );
}

#[test]
fn frame_table_checked() {
    let text = edit(DEMO, "celestial_pole_lat_deg = 62.0\n", "");
    let line = format!("sys.toml:{}:", line_of(&text, "[frame]"));
    system_refused(
        "bt-frame-half",
        &text,
        &[&line, "missing key `celestial_pole_lat_deg`", "[frame]"],
    );
    let text = edit(
        DEMO,
        "celestial_pole_lat_deg = 62.0",
        "celestial_pole_lat_deg = 95.0",
    );
    let line = format!(
        "sys.toml:{}: frame: key `celestial_pole_lat_deg`",
        line_of(&text, "= 95.0")
    );
    system_refused("bt-frame-lat", &text, &[&line, "must be in [-90, 90]"]);
}

#[test]
fn study_counts_orbits_and_dates() {
    let base = study_on("demo");
    let text = edit(
        &base,
        "step_days = [5.0]\n",
        "step_days = [5.0]\nrevs = -1\n",
    );
    study_refused(
        "bt-revs",
        &text,
        &[
            "study.toml:12: key `sweep.revs`",
            "expected a whole number >= 0, got the whole number -1",
        ],
    );
    let text = format!("{base}\n[orbits]\ncapture_alt_km = 300.0\ncapture_ecc = 1.5\n");
    study_refused(
        "bt-ecc",
        &text,
        &[
            "study.toml:15: key `orbits.capture_ecc`",
            "must be in [0, 1)",
            "got 1.5",
        ],
    );
    let text = format!("{base}\n[orbits]\ncapture_ecc = 0.5\n");
    study_refused(
        "bt-ecc-alone",
        &text,
        &[
            "study.toml:14: key `orbits.capture_ecc`",
            "orbits.capture_alt_km",
        ],
    );
    let text = format!("{base}\n[orbits]\npark_alt_km = -200.0\n");
    study_refused(
        "bt-park",
        &text,
        &[
            "study.toml:14: key `orbits.park_alt_km`",
            "altitude >= 0 km",
        ],
    );
    let text = edit(
        &base,
        "\"2032-03-01..2032-04-01\"",
        "\"2032-03-01T00:00:00Z..2032-04-01T00:00:00Z\"",
    );
    study_refused(
        "bt-zulu",
        &text,
        &[
            "study.toml:9: key `sweep.depart`",
            "time-zone designator",
            "UTC",
        ],
    );
    let text = edit(
        &base,
        "tof_days = [200.0, 300.0]",
        "tof_days = [200.0, 300.0, 400.0]",
    );
    study_refused(
        "bt-tof3",
        &text,
        &[
            "study.toml:10: key `sweep.tof_days`",
            "two numbers [MIN, MAX]",
        ],
    );
    let text = format!("{base}\n[windows]\nspan = 2032-01-01\n");
    study_refused(
        "bt-span-bare",
        &text,
        &["key `windows.span`", "bare TOML date"],
    );
}

#[test]
fn command_line_counts_dates_and_orbits() {
    command_refused(
        "bt-cl-revs",
        &["sweep", "--revs", "-1", "--out", "o"],
        &["--revs", "expected a whole number >= 0"],
    );
    command_refused(
        "bt-cl-zulu",
        &[
            "sweep",
            "--depart",
            "2032-03-01T00:00:00Z..2032-04-01T00:00:00Z",
            "--out",
            "o",
        ],
        &[
            "--depart",
            "time-zone designator",
            "2041-03-01T00:00:00 UTC",
        ],
    );
    command_refused(
        "bt-cl-ecc",
        &[
            "transfer",
            "Teodra",
            "Kesh",
            "--depart",
            "2032-07-22",
            "--arrive",
            "2033-02-24",
            "--capture-alt-km",
            "300",
            "--capture-ecc",
            "1.2",
        ],
        &["--capture-ecc", "must be in [0, 1)"],
    );
    command_refused(
        "bt-cl-park",
        &[
            "transfer",
            "Teodra",
            "Kesh",
            "--depart",
            "2032-07-22",
            "--arrive",
            "2033-02-24",
            "--park-alt-km",
            "-5",
        ],
        &["--park-alt-km", "altitude >= 0 km"],
    );
    command_refused(
        "bt-cl-at",
        &["bodies", "--at", "2031-06-01Z"],
        &["--at", "cannot read"],
    );
    command_refused(
        "bt-cl-lp",
        &[
            "windows",
            "Teodra",
            "Kesh",
            "--span",
            "2032-01-01..2033-01-01",
            "--max-c3",
            "16",
            "--launch-period-days",
            "-3",
            "--out",
            "w.csv",
        ],
        &["--launch-period-days", "whole number >= 0"],
    );
}

/// `windows --out` into a folder that does not exist: the folder is made
/// before the scan; into a path whose folder cannot exist (below a file),
/// the run fails before scanning and writes nothing.
#[test]
fn windows_output_folder_settled_before_scanning() {
    let d = Dir::new("bt-win-out");
    d.run(&[
        "windows",
        "Teodra",
        "Kesh",
        "--span",
        "2032-01-01..2033-01-01",
        "--out",
        "missing/dir/x.csv",
    ])
    .ok();
    assert!(d.join("missing/dir/x.csv").is_file());
    let d = Dir::new("bt-win-blocked");
    d.write("file", "not a folder");
    let (r, took) = d.run_bounded(
        &[
            "windows",
            "Teodra",
            "Kesh",
            "--span",
            "2030-01-01..2050-01-01",
            "--out",
            "file/x.csv",
        ],
        std::time::Duration::from_secs(60),
    );
    let r = r.bad_input(&["--out", "file"]);
    plain(&r);
    assert_eq!(d.files(""), vec!["file"]);
    // Failing before the scan: a 20-year scan takes far longer than the
    // start-up (informational bound, generous for a loaded machine).
    assert!(took < std::time::Duration::from_secs(30), "{took:?}");
    let r = d.run(&[
        "windows",
        "Teodra",
        "Kesh",
        "--span",
        "2030-01-01..2031-01-01",
        "--overview",
        "o.pdf",
    ]);
    r.bad_input(&["--overview", "must end in .svg or .png"]);
    assert_eq!(d.files(""), vec!["file"]);
}
