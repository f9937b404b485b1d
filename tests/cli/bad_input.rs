//! Bad input: a clear message, exit 2, never a panic, no partial files.

use crate::util::{assert_no_temp_files, edit, line_of, Dir};

#[test]
fn unknown_body_suggests_the_closest_name() {
    let d = Dir::new("unknown-body");
    d.run(&[
        "transfer",
        "Teodar",
        "Kesh",
        "--depart",
        "2031-03-01",
        "--arrive",
        "2031-11-15",
    ])
    .bad_input(&["Teodar", "Teodra"]);
}

#[test]
fn same_body_twice_is_refused() {
    let d = Dir::new("same-body");
    d.run(&["sweep", "Kesh", "Kesh"])
        .bad_input(&["Kesh", "two different bodies"]);
}

#[test]
fn malformed_dates_are_named() {
    let d = Dir::new("bad-date");
    d.run(&[
        "transfer",
        "Teodra",
        "Kesh",
        "--depart",
        "2031-13-01",
        "--arrive",
        "2031-11-15",
    ])
    .bad_input(&["--depart", "2031-13-01"]);
    d.run(&[
        "transfer",
        "Teodra",
        "Kesh",
        "--depart",
        "2031-03-01 XYZ",
        "--arrive",
        "2031-11-15",
    ])
    .bad_input(&["--depart", "XYZ"]);
    d.run(&[
        "sweep",
        "Teodra",
        "Kesh",
        "--depart",
        "2031-03-01",
        "--quiet",
    ])
    .bad_input(&["--depart"]);
    d.run(&[
        "sweep",
        "Teodra",
        "Kesh",
        "--tof-days",
        "300..100",
        "--quiet",
    ])
    .bad_input(&["--tof-days"]);
    d.run(&["sweep", "Teodra", "Kesh", "--step-days", "0", "--quiet"])
        .bad_input(&["--step-days"]);
}

#[test]
fn missing_system_file_is_named() {
    let d = Dir::new("no-system");
    d.run(&["bodies", "--system", "nowhere.toml"])
        .bad_input(&["nowhere.toml"]);
}

#[test]
fn unwritable_output_leaves_nothing_behind() {
    let d = Dir::new("unwritable");
    d.write("blocker", "a file where a folder should be\n");
    d.run(&["sweep", "--quiet", "--out", "blocker/out"])
        .bad_input(&["blocker"]);
    assert_eq!(d.files(""), vec!["blocker".to_string()]);
}

// ---------------------------------------------------------------------
// System files, each read both by `bodies --system` and through a study.

const DEMO: &str = include_str!("../../ephemerides/demo.toml");

/// A small valid study on system `system`, writing into `out`.
fn study_text(system: &str) -> String {
    format!(
        "title = \"robustness\"\nsystem = \"{system}\"\nout = \"out\"\n\n\
         [[pair]]\nfrom = \"Teodra\"\nto = \"Kesh\"\n\n\
         [sweep]\ndepart = \"2032-03-01..2032-04-01\"\ntof_days = [200.0, 300.0]\n\
         step_days = [5.0]\n"
    )
}

/// Write `text` as `sys.toml`; check that `bodies --system` and `run` of a
/// study naming it both exit 2 with every needle in the message, and that
/// the study run creates nothing.
fn system_rejected(name: &str, text: &str, needles: &[&str]) {
    let d = Dir::new(name);
    d.write("sys.toml", text);
    let r = d
        .run(&["bodies", "--system", "sys.toml"])
        .bad_input(needles);
    assert!(r.stdout.is_empty(), "no partial listing: {}", r.stdout);
    d.write("study.toml", &study_text("sys.toml"));
    d.run(&["run", "study.toml", "--quiet"]).bad_input(needles);
    assert_eq!(d.files(""), vec!["study.toml", "sys.toml"]);
}

#[test]
fn system_valid_control_is_accepted() {
    // The control for the tests below: the unmodified demo file passes
    // both ways, so each failure below is due to its one edit.
    let d = Dir::new("sys-control");
    d.write("sys.toml", DEMO);
    let r = d.run(&["bodies", "--system", "sys.toml"]).ok();
    assert!(r.stdout.contains("Kesh"), "{}", r.stdout);
    d.write("study.toml", &study_text("sys.toml"));
    d.run(&["run", "study.toml", "--quiet"]).ok();
    assert!(d.files("out").contains(&"grid.csv".to_string()));
}

#[test]
fn system_missing_file_is_named_by_the_study() {
    let d = Dir::new("sys-missing");
    d.write("study.toml", &study_text("nowhere.toml"));
    d.run(&["run", "study.toml", "--quiet"])
        .bad_input(&["study.toml:2: key `system`", "nowhere.toml"]);
    assert_eq!(d.files(""), vec!["study.toml"]);
}

#[test]
fn system_not_toml() {
    let text = edit(DEMO, "name = \"Kesh\"", "name = \"Kesh");
    let line = format!("sys.toml:{}:", line_of(&text, "\"Kesh\n"));
    system_rejected("sys-not-toml", &text, &[&line]);
}

#[test]
fn system_missing_key() {
    let text = edit(DEMO, "e = 0.005\n", "");
    // Reported at the header of the table that lacks it.
    let line = format!("sys.toml:{}:", line_of(&text, "[[body]]\nname = \"Vell\""));
    system_rejected(
        "sys-missing-key",
        &text,
        &[&line, "missing key `e`", "[[body]]"],
    );
}

#[test]
fn system_unknown_key() {
    let text = edit(DEMO, "e = 0.005\n", "e = 0.005\ncolour = \"white\"\n");
    let line = format!("sys.toml:{}:", line_of(&text, "colour"));
    system_rejected("sys-unknown-key", &text, &[&line, "`colour`"]);
}

#[test]
fn system_wrong_type() {
    let text = edit(DEMO, "e = 0.005", "e = \"small\"");
    let line = format!("sys.toml:{}:", line_of(&text, "\"small\""));
    system_rejected(
        "sys-wrong-type",
        &text,
        &[&line, "key `e`", "expected a number"],
    );
}

#[test]
fn system_negative_semi_major_axis() {
    let text = edit(DEMO, "a_au = 0.81", "a_au = -0.81");
    let line = format!("sys.toml:{}:", line_of(&text, "-0.81"));
    system_rejected(
        "sys-neg-a",
        &text,
        &[&line, "body \"Vell\"", "key `a_au`", "positive"],
    );
}

#[test]
fn system_semi_major_axis_without_a_finite_orbit() {
    // Finite in au, but infinite in km; or so small that the speed is not
    // finite. Both were once accepted and gave NaN states.
    for (name, value) in [("sys-a-huge", "1e308"), ("sys-a-tiny", "1e-300")] {
        let text = edit(DEMO, "a_au = 0.81", &format!("a_au = {value}"));
        let line = format!("sys.toml:{}:", line_of(&text, value));
        system_rejected(
            name,
            &text,
            &[&line, "body \"Vell\"", "key `a_au`", "out of range"],
        );
    }
    let text = edit(
        DEMO,
        "lon_peri_deg = 40.0",
        "lon_peri_deg = 40.0\nrates = { a_au = 1e308 }",
    );
    let line = format!("sys.toml:{}:", line_of(&text, "rates ="));
    system_rejected(
        "sys-a-rate-huge",
        &text,
        &[&line, "rates: key `a_au`", "out of range"],
    );
}

#[test]
fn system_eccentricity_one_or_more() {
    for (name, value) in [("sys-e-one", "1.0"), ("sys-e-big", "3.5")] {
        let text = edit(DEMO, "e = 0.005", &format!("e = {value}"));
        let line = format!("sys.toml:{}:", line_of(&text, &format!("e = {value}")));
        system_rejected(name, &text, &[&line, "body \"Vell\"", "key `e`", "[0, 1)"]);
    }
}

#[test]
fn system_nan_and_infinity() {
    let cases = [
        ("sys-nan", "i_deg = 2.3", "i_deg = nan", "key `i_deg`"),
        (
            "sys-inf",
            "mean_lon_deg = 250.0",
            "mean_lon_deg = inf",
            "key `mean_lon_deg`",
        ),
        (
            "sys-neg-inf",
            "node_deg = 118.0",
            "node_deg = -inf",
            "key `node_deg`",
        ),
        (
            "sys-nan-mu",
            "mu_km3_s2 = 1.38e11",
            "mu_km3_s2 = nan",
            "key `mu_km3_s2`",
        ),
        (
            "sys-inf-rate",
            "lon_peri_deg = 40.0",
            "lon_peri_deg = 40.0\nrates = { node_deg = inf }",
            "key `node_deg`",
        ),
    ];
    for (name, from, to, key) in cases {
        let text = edit(DEMO, from, to);
        let bad = to.lines().last().expect("a line");
        let line = format!("sys.toml:{}:", line_of(&text, bad));
        system_rejected(name, &text, &[&line, key, "finite"]);
    }
}

#[test]
fn system_duplicate_body() {
    let text = edit(DEMO, "name = \"Kesh\"", "name = \"vell\"");
    let line = format!("sys.toml:{}:", line_of(&text, "\"vell\""));
    let first = format!("line {}", line_of(&text, "\"Vell\""));
    system_rejected(
        "sys-dup",
        &text,
        &[&line, "key `name`", "duplicate", &first],
    );
}

#[test]
fn system_empty_body_list() {
    let head = &DEMO[..DEMO.find("[[body]]").expect("bodies")];
    system_rejected("sys-no-body", head, &["sys.toml", "key `body`", "[[body]]"]);
    let text = format!("body = []\n{head}");
    system_rejected("sys-body-empty-array", &text, &["sys.toml", "key `body`"]);
}

#[test]
fn system_unparseable_epoch() {
    for (name, value) in [
        ("sys-epoch-day", "2030-02-30 TDB"),
        ("sys-epoch-scale", "2030-01-01 XYZ"),
        ("sys-epoch-text", "soon"),
    ] {
        let text = edit(
            DEMO,
            "epoch = \"2030-01-01T00:00:00 TDB\"",
            &format!("epoch = \"{value}\""),
        );
        let line = format!("sys.toml:{}:", line_of(&text, "epoch ="));
        system_rejected(name, &text, &[&line, "key `epoch`", value]);
    }
}

// ---------------------------------------------------------------------
// Study files: `synodic run F` refuses them and creates no output.

/// Write `text` as `study.toml`, check `run` exits 2 naming every needle,
/// and that the folder still holds only the study.
fn study_rejected(name: &str, text: &str, needles: &[&str]) {
    let d = Dir::new(name);
    d.write("study.toml", text);
    d.run(&["run", "study.toml", "--quiet"]).bad_input(needles);
    assert_eq!(d.files(""), vec!["study.toml"]);
}

fn demo_study() -> String {
    study_text("demo")
}

#[test]
fn study_valid_control_is_accepted() {
    let d = Dir::new("study-control");
    d.write("study.toml", &demo_study());
    d.run(&["run", "study.toml", "--quiet"]).ok();
    assert!(d.files("out").contains(&"summary.json".to_string()));
}

#[test]
fn study_not_toml() {
    let text = edit(&demo_study(), "to = \"Kesh\"", "to = \"Kesh");
    let line = format!("study.toml:{}:", line_of(&text, "to = "));
    study_rejected("study-not-toml", &text, &[&line]);
}

#[test]
fn study_missing_key() {
    let text = edit(&demo_study(), "from = \"Teodra\"\n", "");
    let line = format!("study.toml:{}:", line_of(&text, "[[pair]]"));
    study_rejected("study-missing-key", &text, &[&line, "missing key `from`"]);
    let text = edit(&demo_study(), "system = \"demo\"\n", "");
    study_rejected("study-missing-system", &text, &["study.toml:", "`system`"]);
}

#[test]
fn study_unknown_key() {
    let text = edit(&demo_study(), "step_days", "step_dayz");
    let line = format!("study.toml:{}:", line_of(&text, "step_dayz"));
    study_rejected("study-unknown-key", &text, &[&line, "`step_dayz`"]);
}

#[test]
fn study_wrong_type() {
    let text = edit(&demo_study(), "step_days = [5.0]", "step_days = \"five\"");
    let line = format!("study.toml:{}:", line_of(&text, "\"five\""));
    study_rejected(
        "study-wrong-type",
        &text,
        &[&line, "key `sweep.step_days`", "expected a list"],
    );
    let text = edit(
        &demo_study(),
        "step_days = [5.0]",
        "step_days = [5.0]\nrevs = -1",
    );
    let line = format!("study.toml:{}:", line_of(&text, "revs"));
    study_rejected(
        "study-negative-revs",
        &text,
        &[&line, "key `sweep.revs`", "-1", "whole number >= 0"],
    );
}

#[test]
fn study_unknown_body_suggests_a_name() {
    let text = edit(&demo_study(), "\"Kesh\"", "\"Kseh\"");
    let line = format!("study.toml:{}:", line_of(&text, "Kseh"));
    study_rejected(
        "study-unknown-body",
        &text,
        &[&line, "key `pair.to`", "\"Kseh\"", "did you mean \"Kesh\""],
    );
}

#[test]
fn study_arrival_span_before_departure() {
    let text = edit(
        &demo_study(),
        "tof_days = [200.0, 300.0]",
        "arrive = \"2031-01-01..2032-02-01\"",
    );
    let line = format!("study.toml:{}:", line_of(&text, "arrive ="));
    study_rejected(
        "study-arrive-early",
        &text,
        &[&line, "key `sweep.arrive`", "ends before"],
    );
}

#[test]
fn study_zero_or_negative_step() {
    for (name, steps) in [
        ("study-step-zero", "[0.0]"),
        ("study-step-negative", "[5.0, -1.0]"),
        ("study-step-nan", "[nan]"),
    ] {
        let text = edit(&demo_study(), "[5.0]", steps);
        let line = format!("study.toml:{}:", line_of(&text, "step_days"));
        study_rejected(name, &text, &[&line, "key `sweep.step_days`", "> 0"]);
    }
}

#[test]
fn study_empty_time_of_flight_range() {
    for (name, tof, shown) in [
        ("study-tof-inverted", "[300.0, 200.0]", "300..200"),
        ("study-tof-zero", "[0.0, 200.0]", "0..200"),
        ("study-tof-negative", "[-10.0, 200.0]", "-10..200"),
    ] {
        let text = edit(&demo_study(), "[200.0, 300.0]", tof);
        let line = format!("study.toml:{}:", line_of(&text, "tof_days"));
        study_rejected(name, &text, &[&line, "key `sweep.tof_days`", shown]);
    }
}

#[test]
fn study_grid_over_the_memory_limit() {
    let text = edit(
        &demo_study(),
        "step_days = [5.0]",
        "step_days = [0.01]\nmax_memory_gib = 0.001",
    );
    let line = format!("study.toml:{}:", line_of(&text, "max_memory_gib"));
    study_rejected(
        "study-memory",
        &text,
        &[&line, "key `sweep.max_memory_gib`", "over the limit"],
    );
}

// ---------------------------------------------------------------------
// Command line.

#[test]
fn command_line_malformed_range_creates_nothing() {
    let d = Dir::new("cli-range");
    let cases: [(&[&str], &[&str]); 7] = [
        (
            &["--depart", "2031-03-01..garbage"],
            &["--depart", "garbage"],
        ),
        (&["--depart", "2031-03-01...2031-04-01"], &["--depart"]),
        (
            &["--depart", "2031-04-01..2031-03-01"],
            &["--depart", "ends before"],
        ),
        (&["--arrive", "2031-03-01"], &["--arrive", "START..END"]),
        (&["--tof-days", "a..300"], &["--tof-days", "\"a\""]),
        (&["--tof-days", "0..300"], &["--tof-days", "0 < MIN"]),
        (
            &["--depart", "2031-03-01..2031-03-01"],
            &["--depart", "ends before or at"],
        ),
    ];
    for (extra, needles) in cases {
        let mut args = vec!["sweep", "Teodra", "Kesh", "--quiet"];
        args.extend_from_slice(extra);
        d.run(&args).bad_input(needles);
    }
    assert!(d.files("").is_empty(), "{:?}", d.files(""));
}

#[test]
fn command_line_unknown_time_scale() {
    let d = Dir::new("cli-scale");
    d.run(&[
        "sweep",
        "Teodra",
        "Kesh",
        "--quiet",
        "--depart",
        "2031-03-01 XYZ..2031-04-01",
    ])
    .bad_input(&["--depart", "unknown time scale", "XYZ"]);
    d.run(&[
        "transfer",
        "Teodra",
        "Kesh",
        "--depart",
        "2031-03-01",
        "--arrive",
        "2031-11-15 XYZ",
    ])
    .bad_input(&["--arrive", "unknown time scale", "XYZ"]);
    assert!(d.files("").is_empty(), "{:?}", d.files(""));
}

#[test]
fn command_line_from_equal_to() {
    let d = Dir::new("cli-same");
    // Names are compared ignoring case, so this is the same body.
    d.run(&[
        "transfer",
        "Teodra",
        "teodra",
        "--depart",
        "2031-03-01",
        "--arrive",
        "2031-11-15",
    ])
    .bad_input(&["Teodra", "two different bodies"]);
    d.run(&[
        "windows",
        "Kesh",
        "Kesh",
        "--span",
        "2031-01-01..2033-01-01",
    ])
    .bad_input(&["Kesh", "two different bodies"]);
    assert!(d.files("").is_empty(), "{:?}", d.files(""));
}

// ---------------------------------------------------------------------
// Outputs that cannot be written.

#[test]
fn study_output_folder_is_a_file() {
    let d = Dir::new("out-is-file");
    d.write("out", "a file where the output folder should be\n");
    d.write("study.toml", &demo_study());
    d.run(&["run", "study.toml", "--quiet"]).bad_input(&["out"]);
    assert_eq!(d.files(""), vec!["out", "study.toml"]);
    assert_eq!(
        std::fs::read_to_string(d.join("out")).expect("still there"),
        "a file where the output folder should be\n"
    );
}

#[test]
fn batch_output_below_a_file() {
    let d = Dir::new("batch-out-blocked");
    d.write("blocker", "x\n");
    d.write("in.csv", &format!("{BATCH_HEADER}\n{BATCH_GOOD}\n"));
    d.run(&["lambert", "--batch", "in.csv", "--out", "blocker/out.csv"])
        .bad_input(&["blocker/out.csv"]);
    assert_eq!(d.files(""), vec!["blocker", "in.csv"]);
}

/// Unmounts a tmpfs when dropped (also when the test fails).
struct Mount(std::path::PathBuf);

impl Drop for Mount {
    fn drop(&mut self) {
        let _ = std::process::Command::new("umount").arg(&self.0).status();
    }
}

#[test]
fn full_disk_leaves_only_complete_files() {
    let d = Dir::new("full-disk");
    let mnt = d.join("mnt");
    std::fs::create_dir(&mnt).expect("mount point");
    let mounted = std::process::Command::new("mount")
        .args(["-t", "tmpfs", "-o", "size=64k", "tmpfs"])
        .arg(&mnt)
        .stderr(std::process::Stdio::null())
        .status()
        .is_ok_and(|s| s.success());
    if !mounted {
        // Not allowed to mount here (not root, or in a restricted
        // container): the file-in-the-way tests above cover unwritable
        // folders.
        eprintln!("full_disk_leaves_only_complete_files: skipped, cannot mount a tmpfs");
        return;
    }
    let _guard = Mount(mnt.clone());
    // A one-day grid over the default opportunity is far more than 64 KiB.
    d.run(&["sweep", "--quiet", "--out", "mnt/out"])
        .bad_input(&["mnt/out", "No space left"]);
    assert_no_temp_files(&mnt);
    // Whatever was written before the disk filled up is complete.
    for f in d.files("mnt/out") {
        let text = std::fs::read_to_string(mnt.join("out").join(&f)).expect("readable");
        assert!(text.ends_with('\n'), "{f} is cut short");
        if f.ends_with(".json") {
            serde_json::from_str::<serde_json::Value>(&text).expect("complete JSON");
        }
    }
    assert!(!d.files("mnt/out").contains(&"grid.csv".to_string()));
}

// ---------------------------------------------------------------------
// Batch Lambert CSV.

const BATCH_HEADER: &str = "id,mu,r1x,r1y,r1z,r2x,r2y,r2z,tof,revs,prograde";
const BATCH_GOOD: &str = "good,398600,5000,10000,2100,-14600,2500,7000,3600,0,1";

/// A batch with a good row, `bad` on line 3 and another good row: exit 2
/// naming the file, line 3 and each needle; both good rows written.
fn batch_row_rejected(name: &str, bad: &str, needles: &[&str]) {
    let d = Dir::new(name);
    let after = BATCH_GOOD.replacen("good", "after", 1);
    d.write(
        "in.csv",
        &format!("{BATCH_HEADER}\n{BATCH_GOOD}\n{bad}\n{after}\n"),
    );
    let r = d.run(&["lambert", "--batch", "in.csv", "--out", "out.csv"]);
    let mut all = vec!["in.csv: line 3:", "malformed"];
    all.extend_from_slice(needles);
    r.bad_input(&all);
    assert_eq!(d.files(""), vec!["in.csv", "out.csv"]);
    let out = std::fs::read_to_string(d.join("out.csv")).expect("written");
    let lines: Vec<&str> = out.lines().collect();
    assert_eq!(lines.len(), 3, "{out}");
    assert_eq!(lines[0], "id,revs,branch,v1x,v1y,v1z,v2x,v2y,v2z,status");
    assert!(lines[1].starts_with("good,0,single,") && lines[1].ends_with(",ok"));
    assert!(lines[2].starts_with("after,0,single,") && lines[2].ends_with(",ok"));
}

#[test]
fn batch_wrong_field_count() {
    batch_row_rejected(
        "batch-short",
        "short,398600,5000",
        &["expected 11 fields, got 3"],
    );
    batch_row_rejected(
        "batch-long",
        &format!("{BATCH_GOOD},9"),
        &["expected 11 fields, got 12"],
    );
}

#[test]
fn batch_non_numeric_field() {
    batch_row_rejected(
        "batch-text",
        "nn,398600,5000,10000,2100,-14600,2500,7000,soon,0,1",
        &["field `tof`", "\"soon\""],
    );
    batch_row_rejected(
        "batch-nan",
        "nan,NaN,5000,10000,2100,-14600,2500,7000,3600,0,1",
        &["field `mu`", "finite"],
    );
}

#[test]
fn batch_negative_revs() {
    batch_row_rejected(
        "batch-revs",
        "neg,398600,5000,10000,2100,-14600,2500,7000,3600,-1,1",
        &["field `revs`", "\"-1\""],
    );
}

#[test]
fn batch_prograde_not_zero_or_one() {
    batch_row_rejected(
        "batch-prograde",
        "pro,398600,5000,10000,2100,-14600,2500,7000,3600,0,yes",
        &["field `prograde`", "\"yes\""],
    );
}

#[test]
fn batch_wrong_header_writes_nothing() {
    let d = Dir::new("batch-header");
    let header = BATCH_HEADER.replace(",prograde", "");
    d.write("in.csv", &format!("{header}\n{BATCH_GOOD}\n"));
    d.run(&["lambert", "--batch", "in.csv", "--out", "out.csv"])
        .bad_input(&["in.csv: line 1:", "header must be", "prograde"]);
    assert_eq!(d.files(""), vec!["in.csv"]);
}

#[test]
fn batch_empty_or_binary_file_writes_nothing() {
    let d = Dir::new("batch-empty");
    d.write("in.csv", "");
    d.run(&["lambert", "--batch", "in.csv", "--out", "out.csv"])
        .bad_input(&["in.csv: line 1:", "header"]);
    assert_eq!(d.files(""), vec!["in.csv"]);
    std::fs::write(d.join("in.csv"), b"\xff\xfe\x00garbage\n").expect("write");
    d.run(&["lambert", "--batch", "in.csv", "--out", "out.csv"])
        .bad_input(&["in.csv: line 1:", "header"]);
    assert_eq!(d.files(""), vec!["in.csv"]);
}
