//! Bad input: a clear message, exit 2, never a panic, no partial files.

use crate::util::Dir;

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
