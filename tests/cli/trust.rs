//! The conventions a practitioner brings: time scales of spans, element
//! sets, frames, sanity flags and date columns, end to end.

use crate::util::Dir;

fn summary(d: &Dir, dir: &str) -> serde_json::Value {
    let text = std::fs::read_to_string(d.join(&format!("{dir}/summary.json"))).expect("summary");
    serde_json::from_str(&text).expect("JSON")
}

/// A span of whole days keeps its last day in every time scale: 2041-03-01
/// to 2041-09-30 is 213 days, so 214 daily departures. (Converted to TDB, a
/// UTC or TT span is whole days plus the change of the periodic TDB - TT
/// term, a few ms, which must not drop the last day.)
#[test]
fn spans_in_utc_tt_and_tai_keep_their_last_day() {
    let d = Dir::new("span-scales");
    for scale in ["TDB", "UTC", "TT", "TAI"] {
        let span = format!("2041-03-01 {scale}..2041-09-30 {scale}");
        let out = format!("o-{scale}");
        d.run(&[
            "sweep",
            "Teodra",
            "Kesh",
            "--depart",
            &span,
            "--tof-days",
            "150..300",
            "--step-days",
            "1,50",
            "--skip",
            "grid,chart,windows",
            "--quiet",
            "--out",
            &out,
        ])
        .ok();
        let s = summary(&d, &out);
        assert_eq!(
            s["depart_axis"]["count"], 214,
            "{scale}: {}",
            s["depart_axis"]
        );
    }
}

// ---------------------------------------------------------------------
// Dates one way: every date column of every CSV and JSON output.

/// The Julian date (TDB) of a date column, read by an independent strict
/// ISO 8601 parser (the `time` crate, exactly `YYYY-MM-DDThh:mm:ss`, no
/// fraction, no zone) and its Julian day number (the day count that starts
/// at noon: JD = JDN - 0.5 + seconds of the day / 86400).
fn strict_jd(date: &str) -> f64 {
    let format = time::macros::format_description!("[year]-[month]-[day]T[hour]:[minute]:[second]");
    let t = time::PrimitiveDateTime::parse(date, &format)
        .unwrap_or_else(|e| panic!("{date:?} is not YYYY-MM-DDThh:mm:ss: {e}"));
    let seconds =
        f64::from(t.hour()) * 3600.0 + f64::from(t.minute()) * 60.0 + f64::from(t.second());
    f64::from(t.date().to_julian_day()) - 0.5 + seconds / 86400.0
}

/// Half a second, the rounding of a date to the second, plus the JD's
/// printed rounding cannot add since the date is made from the printed JD;
/// 1e-9 day covers the float reading of the JD.
const HALF_SECOND_DAYS: f64 = 0.5 / 86400.0 + 1e-9;

fn looks_like_date(s: &str) -> bool {
    let b = s.as_bytes();
    b.len() >= 10 && b[..4].iter().all(u8::is_ascii_digit) && b[4] == b'-'
}

/// An opportunity label: `YYYY-MM-DD`, optionally with one letter.
fn check_label(where_: &str, label: &str) {
    let (date, rest) = label.split_at(label.len().min(10));
    assert!(
        rest.len() <= 1 && rest.chars().all(|c| c.is_ascii_lowercase()),
        "{where_}: opportunity label {label:?}"
    );
    strict_jd(&format!("{date}T00:00:00"));
}

/// Check one date against its Julian date; counts the checks.
fn check_pair(where_: &str, date: &str, jd: f64, checked: &mut usize) {
    let from_date = strict_jd(date);
    assert!(
        (from_date - jd).abs() <= HALF_SECOND_DAYS,
        "{where_}: {date} is JD {from_date}, the file says {jd} ({} s apart)",
        (from_date - jd) * 86400.0
    );
    *checked += 1;
}

/// Every `X_date` string of a JSON value against its `X_jd_tdb`; axes'
/// `start`/`end` against `start_jd_tdb`/`end_jd_tdb`; labels in one form;
/// no other string that looks like a date.
fn check_json(where_: &str, v: &serde_json::Value, checked: &mut usize) {
    match v {
        serde_json::Value::Array(items) => {
            for item in items {
                check_json(where_, item, checked);
            }
        }
        serde_json::Value::Object(map) => {
            for (k, val) in map {
                let partner = if let Some(stem) = k.strip_suffix("_date") {
                    Some(format!("{stem}_jd_tdb"))
                } else if (k == "start" || k == "end") && map.contains_key(&format!("{k}_jd_tdb")) {
                    Some(format!("{k}_jd_tdb"))
                } else {
                    None
                };
                match (val, partner) {
                    (serde_json::Value::String(s), Some(p)) => {
                        let jd = map
                            .get(&p)
                            .and_then(serde_json::Value::as_f64)
                            .unwrap_or_else(|| panic!("{where_}: {k} has no {p} beside it"));
                        check_pair(&format!("{where_} {k}"), s, jd, checked);
                    }
                    (serde_json::Value::Null, Some(p)) => {
                        assert!(
                            map.get(&p).is_none_or(serde_json::Value::is_null),
                            "{where_}: {p} without {k}"
                        );
                    }
                    (serde_json::Value::String(s), None) if k == "opportunity" => {
                        check_label(where_, s)
                    }
                    (serde_json::Value::String(s), None) => {
                        assert!(
                            !looks_like_date(s),
                            "{where_}: {k} = {s:?} is a date without its JD"
                        );
                    }
                    _ => check_json(where_, val, checked),
                }
            }
        }
        _ => {}
    }
}

/// Every `X_date` column of a CSV file against its `X_jd_tdb` column.
fn check_csv(where_: &str, text: &str, checked: &mut usize) {
    let mut r = csv::Reader::from_reader(text.as_bytes());
    let header: Vec<String> = r
        .headers()
        .expect("header")
        .iter()
        .map(String::from)
        .collect();
    let col = |name: &str| header.iter().position(|h| h == name);
    for rec in r.records() {
        let rec = rec.expect("CSV row");
        for (i, name) in header.iter().enumerate() {
            let cell = &rec[i];
            if let Some(stem) = name.strip_suffix("_date") {
                let j = col(&format!("{stem}_jd_tdb"))
                    .unwrap_or_else(|| panic!("{where_}: {name} has no {stem}_jd_tdb column"));
                if cell.is_empty() {
                    assert!(rec[j].is_empty(), "{where_}: {stem}_jd_tdb without {name}");
                    continue;
                }
                let jd: f64 = rec[j].parse().expect("JD is a number");
                check_pair(&format!("{where_} {name}"), cell, jd, checked);
            } else if name == "opportunity" {
                check_label(where_, cell);
            } else {
                assert!(
                    !looks_like_date(cell),
                    "{where_}: {name} = {cell:?} is a date without its JD"
                );
            }
        }
    }
}

/// Every output file below `dir` (CSV and JSON).
fn check_outputs(d: &Dir, dir: &str, checked: &mut usize) {
    for rel in crate::util::tree(&d.join(dir)) {
        let path = d.join(dir).join(&rel);
        let text = std::fs::read_to_string(&path).unwrap_or_default();
        let where_ = format!("{dir}/{rel}");
        if rel.ends_with(".csv") {
            check_csv(&where_, &text, checked);
        } else if rel.ends_with(".json") && !rel.ends_with("run-info.json") {
            let v: serde_json::Value = serde_json::from_str(&text).expect("JSON");
            check_json(&where_, &v, checked);
        }
    }
}

/// Dates one way (issue 9): every date column of every CSV and JSON
/// output, and of the JSON printed by every command, reads with a strict
/// ISO parser as `YYYY-MM-DDThh:mm:ss` and lies within 0.5 s of the Julian
/// date beside it; opportunity labels are `YYYY-MM-DD` text.
#[test]
fn every_date_column_parses_strictly_and_matches_its_julian_date() {
    let d = Dir::new("dates");
    let mut checked = 0usize;
    // A sweep with multi-revolution layers (grid.csv, windows.csv, summary).
    d.run(&[
        "sweep",
        "Teodra",
        "Kesh",
        "--depart",
        "2032-05-01 UTC..2032-09-30 UTC",
        "--tof-days",
        "150..450",
        "--step-days",
        "7",
        "--revs",
        "1",
        "--quiet",
        "--out",
        "sw",
    ])
    .ok();
    check_outputs(&d, "sw", &mut checked);
    // A window scan with launch periods (span-windows.*, daily tables).
    d.run(&[
        "windows",
        "Teodra",
        "Kesh",
        "--span",
        "2030-01-01..2034-06-01",
        "--max-c3",
        "16",
        "--launch-period-days",
        "7",
        "--out",
        "wi/span.csv",
    ])
    .ok();
    check_outputs(&d, "wi", &mut checked);
    // A moon system: opportunities every few days.
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("examples/moon-tour");
    for name in ["study.toml", "durrah-moons.toml"] {
        std::fs::copy(root.join(name), d.join(name)).expect("copy example");
    }
    d.run(&["run", "study.toml", "--quiet", "--out", "moon"])
        .ok();
    check_outputs(&d, "moon", &mut checked);
    // JSON on stdout.
    for args in [
        vec![
            "transfer",
            "Teodra",
            "Kesh",
            "--depart",
            "2032-07-22T18:41:00",
            "--arrive",
            "2033-02-24 UTC",
            "--json",
        ],
        vec!["bodies", "--json", "--at", "2031-06-01T06:00:00 TT"],
        vec![
            "windows",
            "Teodra",
            "Kesh",
            "--span",
            "2032-01-01..2033-01-01",
            "--max-c3",
            "16",
            "--launch-period-days",
            "3",
            "--json",
        ],
        vec![
            "sweep",
            "--depart",
            "2032-06-01..2032-08-01",
            "--tof-days",
            "150..400",
            "--step-days",
            "10",
            "--json",
            "--quiet",
            "--out",
            "js",
        ],
    ] {
        let r = d.run(&args).ok();
        let v: serde_json::Value = serde_json::from_str(&r.stdout).expect("JSON on stdout");
        check_json(&args.join(" "), &v, &mut checked);
    }
    // Not vacuous: thousands of grid rows and every kind of table.
    assert!(checked > 5000, "{checked} dates checked");
}

/// The strict parser of the date test: J2000.0 = 2000-01-01T12:00:00 is JD
/// 2451545.0 (IAU definition), and the forms the issue complained of (a
/// bare date, a fraction, a zone) are refused, so the test above can fail.
#[test]
fn strict_date_parser_anchors() {
    assert!((strict_jd("2000-01-01T12:00:00") - 2451545.0).abs() < 1e-12);
    for bad in [
        "2032-03-01",
        "2032-03-01T00:00:00.5",
        "2032-03-01T00:00:00Z",
        "2032-03-01 00:00:00",
    ] {
        assert!(
            std::panic::catch_unwind(|| strict_jd(bad)).is_err(),
            "{bad} accepted"
        );
    }
}

// ---------------------------------------------------------------------
// Sanity flags.

/// A Teodra -> Ashkel arc of 353.5 deg swings round the star inside its
/// radius (checked by propagation in transfer::flags); `transfer` prints it
/// with the flag and warns on stderr.
#[test]
fn transfer_flags_and_warns_on_periapsis_inside() {
    let d = Dir::new("flag-peri");
    let r = d
        .run(&[
            "transfer",
            "Teodra",
            "Ashkel",
            "--depart",
            "2031-01-01",
            "--arrive",
            "2031-06-05",
        ])
        .ok();
    assert!(r.stdout.contains("periapsis-inside"), "{}", r.stdout);
    assert!(
        r.stderr.contains("synodic: warning:") && r.stderr.contains("inside its radius"),
        "{}",
        r.stderr
    );
    let r = d
        .run(&[
            "transfer",
            "Teodra",
            "Ashkel",
            "--depart",
            "2031-01-01",
            "--arrive",
            "2031-06-05",
            "--json",
        ])
        .ok();
    let v: serde_json::Value = serde_json::from_str(&r.stdout).expect("JSON");
    assert_eq!(v["arcs"][0]["flags"], "periapsis-inside");
}

/// A one-second transfer between planets is not a number to quote: the
/// arc is flagged `relativistic` and a warning states the threshold.
#[test]
fn one_second_transfer_is_flagged_relativistic() {
    let d = Dir::new("flag-fast");
    let r = d
        .run(&[
            "transfer",
            "Teodra",
            "Kesh",
            "--depart",
            "2032-07-22T00:00:00",
            "--arrive",
            "2032-07-22T00:00:01",
        ])
        .ok();
    assert!(r.stdout.contains("relativistic"), "{}", r.stdout);
    assert!(
        r.stderr.contains("1 % of the speed of light (2998 km/s)"),
        "{}",
        r.stderr
    );
}

/// Flagged cells stay in the grid (with their flag) but are never optima
/// unless asked: a grid of 1 to 9 second transfers is all `relativistic`,
/// so it has no minima and no refined optima, until --allow-flagged.
#[test]
fn flagged_cells_are_kept_but_not_optima_unless_allowed() {
    let d = Dir::new("flag-grid");
    let common = [
        "sweep",
        "Teodra",
        "Kesh",
        "--depart",
        "2032-07-01..2032-07-05",
        "--tof-days",
        "0.00001157..0.0001042",
        "--step-days",
        "1,0.00001157",
        "--quiet",
        "--skip",
        "chart",
    ];
    let mut strict = common.to_vec();
    strict.extend(["--out", "strict"]);
    // Exit 1: it ran, but no cell may be an optimum.
    let r = d.run(&strict);
    assert_eq!(r.code, 1, "{}", r.stderr);
    let grid = std::fs::read_to_string(d.join("strict/grid.csv")).expect("grid");
    let rows: Vec<&str> = grid.lines().skip(1).collect();
    assert!(
        rows.len() >= 40
            && rows
                .iter()
                .all(|l| l.ends_with(",ok,hyperbolic;relativistic")),
        "{}",
        rows[0]
    );
    let s = summary(&d, "strict");
    assert_eq!(
        s["minima"].as_array().map(Vec::len),
        Some(0),
        "{}",
        s["minima"]
    );
    let windows = std::fs::read_to_string(d.join("strict/windows.csv")).expect("windows");
    assert_eq!(windows.lines().count(), 1, "{windows}");

    let mut allowed = common.to_vec();
    allowed.extend(["--out", "allowed", "--allow-flagged"]);
    d.run(&allowed).ok();
    let s = summary(&d, "allowed");
    let minima = s["minima"].as_array().expect("minima");
    assert!(!minima.is_empty());
    assert!(minima.iter().all(|m| m["flags"]
        .as_str()
        .is_some_and(|f| f.contains("relativistic"))));
    let windows = std::fs::read_to_string(d.join("allowed/windows.csv")).expect("windows");
    assert!(
        windows
            .lines()
            .nth(1)
            .is_some_and(|l| l.contains("relativistic")),
        "{windows}"
    );
    // The choice is recorded in the resolved study, so a repeat agrees.
    let study = std::fs::read_to_string(d.join("allowed/study.toml")).expect("study");
    assert!(study.contains("allow_flagged = true"), "{study}");
}

/// Grid minima on a limit of the grid carry the `edge` flag: a departure
/// span that ends before the C3 minimum puts it on the last row.
#[test]
fn grid_minima_on_a_limit_are_flagged_edge() {
    let d = Dir::new("edge-minima");
    d.run(&[
        "sweep",
        "Teodra",
        "Kesh",
        "--depart",
        "2032-04-01..2032-05-15",
        "--tof-days",
        "150..450",
        "--step-days",
        "5",
        "--quiet",
        "--skip",
        "chart,grid",
        "--out",
        "o",
    ])
    .ok();
    let s = summary(&d, "o");
    let c3 = s["minima"]
        .as_array()
        .expect("minima")
        .iter()
        .find(|m| m["objective"] == "c3" && m["type"] == "I")
        .expect("a Type I C3 minimum");
    // The last departure of the axis: 2032-04-01 + 8 x 5 days.
    assert_eq!(c3["depart_date"], "2032-05-11T00:00:00", "{c3}");
    assert!(
        c3["flags"].as_str().is_some_and(|f| f.contains("edge")),
        "{c3}"
    );
}

// ---------------------------------------------------------------------
// Cross-checks a user can make: bodies --at, synodic periods.

const STANDISH: &str = include_str!("../fixtures/standish-table1.toml");

/// `bodies --at` prints states a user can compare with any ephemeris.
/// Source: NASA Mars Exploration Program, Earth-Mars centre distance at the
/// 2003 close approach, 2003-08-27 09:51 UT: 55,758,006 km; the Standish
/// Table 1 model agrees within 0.2 % (barycentre offset and the table's
/// stated errors). The celestial (EME2000) components are the system
/// (ecliptic) ones rotated about x by the obliquity, 84381.406 arcsec
/// (IAU 2006). Tolerance 1e-9 relative: printed JSON round trip.
#[test]
fn bodies_at_prints_states_in_both_frames() {
    let d = Dir::new("bodies-at");
    d.write("standish.toml", STANDISH);
    let r = d
        .run(&[
            "bodies",
            "--system",
            "standish.toml",
            "--at",
            "2003-08-27T09:51:00 UTC",
            "--json",
        ])
        .ok();
    let v: serde_json::Value = serde_json::from_str(&r.stdout).expect("JSON");
    let states = v["at"]["states"].as_array().expect("states");
    let vec3 = |s: &serde_json::Value, key: &str| -> [f64; 3] {
        let a = s[key].as_array().expect(key);
        [0, 1, 2].map(|i| a[i].as_f64().expect("number"))
    };
    let find = |name: &str| states.iter().find(|s| s["name"] == name).expect(name);
    let (earth, mars) = (find("Earth-Moon Barycenter"), find("Mars"));
    let (e, m) = (vec3(earth, "r_km"), vec3(mars, "r_km"));
    let dist = ((m[0] - e[0]).powi(2) + (m[1] - e[1]).powi(2) + (m[2] - e[2]).powi(2)).sqrt();
    assert!((dist / 55_758_006.0 - 1.0).abs() < 2e-3, "{dist}");
    let (s, c) = (84381.406f64 / 3600.0).to_radians().sin_cos();
    for body in states {
        for (sys_key, cel_key) in [("r_km", "celestial_r_km"), ("v_km_s", "celestial_v_km_s")] {
            let (x, q) = (vec3(body, sys_key), vec3(body, cel_key));
            let want = [x[0], c * x[1] - s * x[2], s * x[1] + c * x[2]];
            let scale = (x[0] * x[0] + x[1] * x[1] + x[2] * x[2]).sqrt();
            for i in 0..3 {
                assert!(
                    (q[i] - want[i]).abs() <= 1e-9 * scale,
                    "{} {cel_key}",
                    body["name"]
                );
            }
        }
    }
    // Without a [frame] there is no celestial copy of the states.
    let r = d.run(&["bodies", "--system", "standish.toml"]).ok();
    assert!(
        r.stdout.contains("lon peri") && r.stdout.contains("arg peri"),
        "{}",
        r.stdout
    );
}

/// `bodies` shows the synodic period of a prograde and a retrograde body
/// of equal period as half that period (relative angular rate 2n).
#[test]
fn bodies_shows_retrograde_synodic_periods() {
    let d = Dir::new("bodies-retro");
    d.write(
        "retro.toml",
        "name = \"r\"\nepoch = \"2030-01-01\"\n[central]\nname = \"S\"\nmu_km3_s2 = 1.3e11\n\
         [[body]]\nname = \"Fore\"\na_au = 1.0\ne = 0.0\ni_deg = 0.0\nnode_deg = 0.0\n\
         lon_peri_deg = 0.0\nmean_lon_deg = 0.0\n\
         [[body]]\nname = \"Back\"\na_au = 1.0\ne = 0.0\ni_deg = 180.0\nnode_deg = 0.0\n\
         lon_peri_deg = 0.0\nmean_lon_deg = 90.0\n",
    );
    let r = d.run(&["bodies", "--system", "retro.toml", "--json"]).ok();
    let v: serde_json::Value = serde_json::from_str(&r.stdout).expect("JSON");
    let fore = &v["bodies"][0];
    let period = fore["period_days"].as_f64().expect("period");
    let synodic = fore["synodic_days"][0]["days"].as_f64().expect("finite");
    assert!(
        (synodic / (period / 2.0) - 1.0).abs() < 1e-12,
        "{synodic} vs {period}"
    );
    assert_eq!(v["bodies"][1]["retrograde"], true);
}

/// Ridge rows of a window table say their launch period was not computed,
/// not "closed" (the iskra example has ridge rows under a C3 ceiling).
#[test]
fn ridge_rows_say_not_computed() {
    let d = Dir::new("ridge-rows");
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("examples/iskra-rendezvous");
    std::fs::copy(root.join("study.toml"), d.join("study.toml")).expect("copy");
    let r = d.run(&["run", "study.toml", "--out", "o"]).ok();
    // Rows of the best-window table start with their opportunity's date.
    let ridge: Vec<&str> = r
        .stdout
        .lines()
        .filter(|l| l.starts_with("20") && (l.ends_with(" ridge") || l.contains(" ridge;")))
        .collect();
    assert!(!ridge.is_empty(), "{}", r.stdout);
    for l in ridge {
        assert!(
            l.contains("not computed at the ridge") && !l.contains("closed"),
            "{l}"
        );
    }
}
