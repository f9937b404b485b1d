//! `synodic run` and `--save-study`: runs that repeat byte for byte.

use crate::util::{list, Dir};

const STUDY: &str = r#"
title = "two pairs"
system = "demo"
out = "results"

[[pair]]
from = "Teodra"
to = "Kesh"

[[pair]]
from = "Vell"
to = "Teodra"

[sweep]
tof_days = [80.0, 400.0]
step_days = [4.0, 4.0]
"#;

/// Every file but the run log, in a folder.
fn snapshot(dir: &std::path::Path) -> Vec<(String, Vec<u8>)> {
    list(dir)
        .into_iter()
        .filter(|n| n != "run-info.json")
        .map(|n| {
            let bytes = std::fs::read(dir.join(&n)).expect("read output");
            (n, bytes)
        })
        .collect()
}

#[test]
fn a_study_repeats_byte_for_byte_from_its_resolved_copy() {
    let d = Dir::new("study-repeat");
    d.write("study.toml", STUDY);
    let r = d.run(&["run", "study.toml", "--quiet"]).ok();
    assert!(r.stdout.contains("Teodra -> Kesh") && r.stdout.contains("Vell -> Teodra"));
    let a = d.join("results/Teodra-Kesh");
    let b = d.join("results/Vell-Teodra");
    for dir in [&a, &b] {
        let files = list(dir);
        for f in [
            "grid.csv",
            "summary.json",
            "study.toml",
            "run-info.json",
            "windows.csv",
        ] {
            assert!(files.contains(&f.to_string()), "{files:?}");
        }
    }
    let before = snapshot(&a);
    // Repeat from the copy written beside the outputs, in place.
    d.run(&["run", "results/Teodra-Kesh/study.toml", "--quiet"])
        .ok();
    assert!(before == snapshot(&a), "outputs changed on repetition");
    // And into a fresh folder: the demo needs no path, so the files match.
    d.run(&[
        "run",
        "results/Teodra-Kesh/study.toml",
        "--quiet",
        "--out",
        "again",
    ])
    .ok();
    assert!(
        before == snapshot(&d.join("again")),
        "outputs differ in a new folder"
    );
}

#[test]
fn a_system_file_study_repeats_in_place() {
    let d = Dir::new("study-system");
    std::fs::create_dir_all(d.join("systems")).expect("mkdir");
    let demo = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/ephemerides/demo.toml"
    ))
    .expect("demo system");
    d.write("systems/veyra.toml", &demo);
    d.write(
        "s.toml",
        "system = \"systems/veyra.toml\"\nout = \"o\"\n[[pair]]\nfrom = \"Vell\"\nto = \"Teodra\"\n\
         [sweep]\ndepart = \"2031-01-01..2031-03-01\"\ntof_days = [100.0, 300.0]\nstep_days = [5.0]\n",
    );
    d.run(&["run", "s.toml", "--quiet"]).ok();
    let study = std::fs::read_to_string(d.join("o/study.toml")).expect("resolved study");
    assert!(
        study.contains("system = \"../systems/veyra.toml\""),
        "{study}"
    );
    let before = snapshot(&d.join("o"));
    d.run(&["run", "o/study.toml", "--quiet"]).ok();
    assert!(before == snapshot(&d.join("o")));
    let summary = std::fs::read_to_string(d.join("o/summary.json")).expect("summary");
    assert!(
        summary.contains("\"system_file\": \"../systems/veyra.toml\""),
        "{summary}"
    );
}

#[test]
fn a_saved_command_line_study_reproduces_the_run() {
    let d = Dir::new("save-study");
    let args = [
        "sweep",
        "Teodra",
        "Kesh",
        "--depart",
        "2032-04-01..2032-06-01",
        "--tof-days",
        "150..350",
        "--step-days",
        "3",
        "--quiet",
        "--out",
        "first",
        "--save-study",
        "saved.toml",
    ];
    d.run(&args).ok();
    d.run(&["run", "saved.toml", "--quiet", "--out", "second"])
        .ok();
    assert!(snapshot(&d.join("first")) == snapshot(&d.join("second")));
}

#[test]
fn a_window_scan_study_writes_its_table() {
    let d = Dir::new("study-windows");
    d.write(
        "w.toml",
        "system = \"demo\"\n[[pair]]\nfrom = \"Teodra\"\nto = \"Kesh\"\n\
         [windows]\nspan = \"2031-01-01..2036-01-01\"\nlaunch_period_days = 10\n\
         [limits]\nmax_c3_km2_s2 = 20.0\n",
    );
    let r = d.run(&["run", "w.toml", "--quiet"]).ok();
    assert!(r.stdout.contains("launch period"), "{}", r.stdout);
    let files = d.files("synodic-out");
    assert!(files.contains(&"span-windows.csv".to_string()), "{files:?}");
    assert!(
        files.iter().any(|f| f.starts_with("launch-period-")),
        "{files:?}"
    );
    let csv = std::fs::read_to_string(d.join("synodic-out/span-windows.csv")).expect("table");
    let header = csv.lines().next().expect("header");
    for col in [
        "depart_jd_tdb",
        "arrive_jd_tdb",
        "type",
        "revs",
        "c3_km2_s2",
        "vinf_arrive_km_s",
    ] {
        assert!(header.split(',').any(|c| c == col), "{header}");
    }
    assert!(csv.lines().count() >= 3, "{csv}");
}

#[test]
fn study_errors_name_file_line_and_key() {
    let d = Dir::new("study-errors");
    d.write(
        "bad.toml",
        "system = \"demo\"\n[[pair]]\nfrom = \"Teodar\"\nto = \"Kesh\"\n[sweep]\ntof_days = [80.0, 400.0]\n",
    );
    d.run(&["run", "bad.toml"])
        .bad_input(&["bad.toml:3", "pair.from", "Teodra"]);
    d.write(
        "step.toml",
        "system = \"demo\"\n[[pair]]\nfrom = \"Teodra\"\nto = \"Kesh\"\n[sweep]\ntof_days = [80.0, 400.0]\nstep_days = [0.0]\n",
    );
    d.run(&["run", "step.toml"])
        .bad_input(&["step.toml:7", "sweep.step_days"]);
    assert!(!d.join("synodic-out").exists());
}

/// A saved window scan, run as a study, gives the same table as the
/// command line did.
#[test]
fn a_saved_window_scan_reproduces_its_table() {
    let d = Dir::new("save-windows");
    d.run(&[
        "windows",
        "Teodra",
        "Kesh",
        "--span",
        "2031-01-01..2036-01-01",
        "--max-c3",
        "15",
        "--out",
        "table.csv",
        "--save-study",
        "w.toml",
    ])
    .ok();
    d.run(&["run", "w.toml", "--quiet", "--out", "again"]).ok();
    let a = std::fs::read(d.join("table.csv")).expect("command-line table");
    let b = std::fs::read(d.join("again/span-windows.csv")).expect("study table");
    assert!(a == b, "tables differ");
    assert!(String::from_utf8_lossy(&a).lines().count() >= 4);
}

/// A bad system file named by a study: the message points at the study's
/// `system` key and at the system file's own line and key.
#[test]
fn a_bad_system_file_is_named_through_the_study() {
    let d = Dir::new("study-bad-system");
    let demo = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/ephemerides/demo.toml"
    ))
    .expect("demo system");
    d.write("sys.toml", &demo.replacen("e = 0.005", "e = 1.5", 1));
    d.write(
        "s.toml",
        "system = \"sys.toml\"\n[[pair]]\nfrom = \"Vell\"\nto = \"Teodra\"\n[sweep]\ntof_days = [100.0, 300.0]\n",
    );
    d.run(&["run", "s.toml"])
        .bad_input(&["s.toml:1: key `system`", "sys.toml:", "key `e`"]);
    assert_eq!(d.files(""), ["s.toml", "sys.toml"]);
}
