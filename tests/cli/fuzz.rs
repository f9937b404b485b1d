//! Parser fuzzing: random bytes and mutated valid files fed to the system
//! and study parsers in process, and to the batch Lambert reader through
//! the binary. Every case must return (no panic, no hang) and an accepted
//! input must be usable.

use std::time::{Duration, Instant};

use proptest::prelude::*;
use proptest::test_runner::Config;
use synodic::ephemeris::System;
use synodic::study::Study;

use crate::util::{assert_no_temp_files, Dir};

const DEMO: &str = include_str!("../../ephemerides/demo.toml");

/// A valid study touching every section.
const STUDY: &str = r#"title = "Cargo runs, Teodra to Kesh"
system = "demo"
out = "out"

[[pair]]
from = "Teodra"
to = "Kesh"

[sweep]
depart = "2032-03-01..2032-10-01"
tof_days = [120.0, 480.0]
step_days = [1.0, 1.0]
revs = 0
max_memory_gib = 1.0

[windows]
span = "2030-01-01..2040-01-01"
objective = "c3"
tof_days = [100.0, 500.0]
launch_period_days = 20

[orbits]
park_alt_km = 200.0
capture_alt_km = 400.0
capture_ecc = 0.6

[limits]
max_c3_km2_s2 = 14.0
max_vinf_arrive_km_s = 4.0

[outputs]
grid = true
chart = false
windows = true
"#;

/// A valid batch: zero- and multi-revolution rows.
const BATCH: &str = "id,mu,r1x,r1y,r1z,r2x,r2y,r2z,tof,revs,prograde
curtis,398600,5000,10000,2100,-14600,2500,7000,3600,0,1
der2,398600.4418,22592.145603,-1599.915239,-19783.950506,1922.067697,4054.157051,-8925.727465,36000,1,1
retro,398600,7000,0,0,0,8000,0,4000,0,0
";

const BATCH_OUT_HEADER: &str = "id,revs,branch,v1x,v1y,v1z,v2x,v2y,v2z,status";

/// Values that sit on the edges of what the readers accept.
const TOKENS: &[&str] = &[
    "nan",
    "inf",
    "-inf",
    "NaN",
    "0",
    "-0.0",
    "-1",
    "1",
    "2",
    "0.9999999999999999",
    "1e308",
    "1e-308",
    "-1e308",
    "4294967295",
    "18446744073709551615",
    "\"\"",
    "\"x\"",
    "\"Kesh\"",
    "\"kesh\"",
    "[]",
    "[0.0]",
    "[1.0, 0.0]",
    "[1e-9]",
    "[1e9, 1e10]",
    "{}",
    "true",
    "[[body]]",
    "[sweep]",
    "[[pair]]",
    "\"2030-01-01..2029-01-01\"",
    "\"2030-01-01..2030-01-01\"",
    "\"9999-12-31T23:59:59 UTC\"",
    "\"0001-01-01 TT\"",
    "\"2031-03-01 XYZ\"",
    "\"2016-12-31T23:59:60 UTC\"",
    "=",
    ",",
    "\"",
    "\n",
    "#",
    "..",
];

/// One edit of a valid file.
#[derive(Debug, Clone)]
enum Mutation {
    /// XOR one byte with a non-zero mask.
    Flip(usize, u8),
    /// Delete up to n bytes.
    Delete(usize, usize),
    /// Repeat one line.
    DuplicateLine(usize),
    /// Cut the text short.
    Truncate(usize),
    /// Insert a token at a byte position.
    Insert(usize, &'static str),
    /// Replace the value of one line (TOML: right of `=`; CSV: one field).
    Replace(usize, usize, &'static str),
}

fn mutation() -> impl Strategy<Value = Mutation> {
    let token = prop::sample::select(TOKENS);
    prop_oneof![
        (any::<usize>(), 1u8..=255).prop_map(|(i, m)| Mutation::Flip(i, m)),
        (any::<usize>(), 1usize..40).prop_map(|(i, n)| Mutation::Delete(i, n)),
        any::<usize>().prop_map(Mutation::DuplicateLine),
        any::<usize>().prop_map(Mutation::Truncate),
        (any::<usize>(), token.clone()).prop_map(|(i, t)| Mutation::Insert(i, t)),
        (any::<usize>(), any::<usize>(), token).prop_map(|(l, f, t)| Mutation::Replace(l, f, t)),
    ]
}

fn split_lines(bytes: &[u8]) -> Vec<Vec<u8>> {
    bytes
        .split_inclusive(|&b| b == b'\n')
        .map(<[u8]>::to_vec)
        .collect()
}

/// Apply `edits` in order to `base`. `csv` picks how `Replace` finds a
/// value.
fn mutate(base: &str, edits: &[Mutation], csv: bool) -> Vec<u8> {
    let mut b = base.as_bytes().to_vec();
    for m in edits {
        let len = b.len().max(1);
        match *m {
            Mutation::Flip(i, mask) => {
                if !b.is_empty() {
                    b[i % len] ^= mask;
                }
            }
            Mutation::Delete(i, n) => {
                let start = i % len;
                let end = (start + n).min(b.len());
                if start < end {
                    b.drain(start..end);
                }
            }
            Mutation::DuplicateLine(i) => {
                let mut lines = split_lines(&b);
                if !lines.is_empty() {
                    let k = i % lines.len();
                    let mut copy = lines[k].clone();
                    if copy.last() != Some(&b'\n') {
                        copy.insert(0, b'\n');
                    }
                    lines.insert(k + 1, copy);
                    b = lines.concat();
                }
            }
            Mutation::Truncate(i) => b.truncate(i % len),
            Mutation::Insert(i, t) => {
                let at = i % (b.len() + 1);
                b.splice(at..at, t.bytes());
            }
            Mutation::Replace(l, f, t) => {
                let mut lines = split_lines(&b);
                if lines.is_empty() {
                    continue;
                }
                let k = l % lines.len();
                let line = String::from_utf8_lossy(&lines[k]).into_owned();
                let new = if csv {
                    let mut fields: Vec<&str> = line.trim_end_matches('\n').split(',').collect();
                    let n = fields.len();
                    fields[f % n] = t;
                    format!("{}\n", fields.join(","))
                } else {
                    match line.split_once('=') {
                        Some((key, _)) => format!("{key}= {t}\n"),
                        None => continue,
                    }
                };
                lines[k] = new.into_bytes();
                b = lines.concat();
            }
        }
    }
    b
}

/// Generous per-case bound for the in-process parsers: a hang guard, not
/// a speed test (a parse takes microseconds).
const PARSE_LIMIT: Duration = Duration::from_secs(2);

/// Parse `text` as a system; an accepted system must give finite states
/// for all its bodies at its own epoch (its elements were checked there:
/// `a > 0`, `0 <= e < 1`, all finite, so Kepler's equation has a root).
fn check_system(text: &str) -> Result<(), TestCaseError> {
    let start = Instant::now();
    let parsed = System::from_toml_str(text, "fuzz.toml");
    prop_assert!(
        start.elapsed() < PARSE_LIMIT,
        "parse took {:?}",
        start.elapsed()
    );
    match parsed {
        Ok(system) => {
            prop_assert!(!system.bodies.is_empty());
            let t = system.epoch.days_since_j2000_tdb();
            for (k, body) in system.bodies.iter().enumerate() {
                let s = system.try_state_at_days(k, t);
                prop_assert!(s.is_ok(), "{}: {:?}\n{text}", body.name, s.err());
                let s = s.unwrap();
                let finite = s.r_km.iter().chain(s.v_km_s.iter()).all(|x| x.is_finite());
                prop_assert!(finite, "{}: {:?}\n{text}", body.name, s);
                prop_assert!(s.r_km.norm() > 0.0, "{}: at the centre\n{text}", body.name);
            }
            prop_assert!(
                start.elapsed() < PARSE_LIMIT,
                "states took {:?}",
                start.elapsed()
            );
        }
        Err(e) => {
            let msg = e.to_string();
            prop_assert!(msg.starts_with("fuzz.toml"), "message without file: {msg}");
        }
    }
    Ok(())
}

/// Parse `text` as a study; an accepted study must survive its own
/// `to_toml` (the form written beside every output) unchanged.
fn check_study(text: &str) -> Result<(), TestCaseError> {
    let start = Instant::now();
    let parsed = Study::from_toml_str(text, "fuzz.toml");
    prop_assert!(
        start.elapsed() < PARSE_LIMIT,
        "parse took {:?}",
        start.elapsed()
    );
    match parsed {
        Ok(study) => {
            let once = study.to_toml();
            let again = Study::from_toml_str(&once, "resolved.toml");
            prop_assert!(again.is_ok(), "{:?}\n{once}", again.err());
            prop_assert_eq!(again.unwrap().to_toml(), once);
        }
        Err(e) => {
            let msg = e.to_string();
            prop_assert!(msg.starts_with("fuzz.toml:"), "message without file: {msg}");
        }
    }
    Ok(())
}

#[test]
fn valid_inputs_are_accepted() {
    // The controls of the fuzzers below: unmutated, every input is valid.
    let s = System::from_toml_str(DEMO, "demo.toml").expect("demo parses");
    assert_eq!(s.bodies.len(), 8);
    check_system(DEMO).expect("demo states");
    let st = Study::from_toml_str(STUDY, "s.toml").expect("study parses");
    assert!(st.windows.is_some() && st.sweep.is_some());
    check_study(STUDY).expect("study round trip");
    assert_eq!(mutate(DEMO, &[], false), DEMO.as_bytes());
}

proptest! {
    #![proptest_config(Config { cases: 1500, ..Config::default() })]

    #[test]
    fn system_parser_survives_mutated_demo(
        edits in prop::collection::vec(mutation(), 1..6)
    ) {
        let bytes = mutate(DEMO, &edits, false);
        check_system(&String::from_utf8_lossy(&bytes))?;
    }

    #[test]
    fn study_parser_survives_mutated_study(
        edits in prop::collection::vec(mutation(), 1..6)
    ) {
        let bytes = mutate(STUDY, &edits, false);
        check_study(&String::from_utf8_lossy(&bytes))?;
    }
}

/// Only value replacements: the file mostly stays valid TOML, so the
/// checks after parsing get exercised, not just the syntax errors.
fn value_edits() -> impl Strategy<Value = Vec<Mutation>> {
    let one = (any::<usize>(), prop::sample::select(TOKENS))
        .prop_map(|(l, t)| Mutation::Replace(l, 0, t));
    prop::collection::vec(one, 1..4)
}

proptest! {
    #![proptest_config(Config { cases: 3000, ..Config::default() })]

    #[test]
    fn system_checks_survive_edited_values(edits in value_edits()) {
        check_system(&String::from_utf8_lossy(&mutate(DEMO, &edits, false)))?;
    }

    #[test]
    fn study_checks_survive_edited_values(edits in value_edits()) {
        check_study(&String::from_utf8_lossy(&mutate(STUDY, &edits, false)))?;
    }
}

proptest! {
    #![proptest_config(Config { cases: 1000, ..Config::default() })]

    #[test]
    fn parsers_survive_random_bytes(bytes in prop::collection::vec(any::<u8>(), 0..600)) {
        let text = String::from_utf8_lossy(&bytes);
        check_system(&text)?;
        check_study(&text)?;
    }

    #[test]
    fn parsers_survive_toml_like_text(text in "[a-z_\\[\\]\\.=\"0-9 \n#{},+-]{0,400}") {
        check_system(&text)?;
        check_study(&text)?;
    }
}

/// Per-process bound for the binary: a hang guard, generous because the
/// tests share two cores with other work.
const RUN_LIMIT: Duration = Duration::from_secs(10);

proptest! {
    #![proptest_config(Config { cases: 300, ..Config::default() })]

    #[test]
    fn batch_reader_survives_mutated_csv(
        edits in prop::collection::vec(mutation(), 1..5)
    ) {
        let d = Dir::new("fuzz-batch");
        let bytes = mutate(BATCH, &edits, true);
        std::fs::write(d.join("in.csv"), &bytes).expect("write input");
        let (r, took) =
            d.run_bounded(&["lambert", "--batch", "in.csv", "--out", "out.csv"], RUN_LIMIT);
        prop_assert!(took < RUN_LIMIT, "hung: killed after {took:?}");
        prop_assert!(r.code == 0 || r.code == 2, "exit {}:\n{}", r.code, r.stderr);
        if r.code == 2 {
            prop_assert!(r.stderr.contains("in.csv"), "message without file: {}", r.stderr);
        }
        assert_no_temp_files(&d.path);
        let files = d.files("");
        if files.contains(&"out.csv".to_string()) {
            // Written at all means written whole: header, complete rows.
            let out = std::fs::read_to_string(d.join("out.csv")).expect("utf-8 output");
            prop_assert!(out.ends_with('\n'));
            let mut reader = csv::ReaderBuilder::new().from_reader(out.as_bytes());
            let header: Vec<String> =
                reader.headers().expect("header").iter().map(String::from).collect();
            prop_assert_eq!(header.join(","), BATCH_OUT_HEADER);
            for row in reader.records() {
                let row = row.expect("well-formed row");
                prop_assert_eq!(row.len(), 10);
                let status = &row[9];
                if status == "ok" {
                    for v in row.iter().skip(3).take(6) {
                        let x: f64 = v.parse().expect("number");
                        prop_assert!(x.is_finite(), "non-finite velocity in {out}");
                    }
                }
            }
        } else {
            // Nothing written only when the whole file was refused.
            prop_assert_eq!(r.code, 2);
            prop_assert!(r.stderr.contains("line 1"), "{}", r.stderr);
        }
    }

    #[test]
    fn bodies_command_survives_mutated_demo(
        edits in prop::collection::vec(mutation(), 1..4)
    ) {
        let d = Dir::new("fuzz-bodies");
        std::fs::write(d.join("sys.toml"), mutate(DEMO, &edits, false)).expect("write");
        let (r, took) = d.run_bounded(&["bodies", "--system", "sys.toml"], RUN_LIMIT);
        prop_assert!(took < RUN_LIMIT, "hung: killed after {took:?}");
        prop_assert!(r.code == 0 || r.code == 2, "exit {}:\n{}", r.code, r.stderr);
        if r.code == 2 {
            prop_assert!(r.stderr.contains("sys.toml"), "message without file: {}", r.stderr);
        }
    }
}
