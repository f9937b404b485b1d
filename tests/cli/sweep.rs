//! `synodic sweep` end to end.

use crate::util::Dir;

const HEADER: &str = "depart_jd_tdb,arrive_jd_tdb,depart_date,arrive_date,tof_days,revs,branch,type,transfer_angle_deg,c3_km2_s2,vinf_depart_km_s,dla_deg,rla_deg,vinf_arrive_km_s,arrive_dec_deg,arrive_ra_deg,dv_depart_km_s,dv_arrive_km_s,dv_total_km_s,status,flags";

#[test]
fn demo_study_writes_grid_and_summary() {
    let d = Dir::new("demo");
    let r = d.run(&["sweep"]).ok();
    assert!(r.stdout.contains("Teodra -> Kesh"), "{}", r.stdout);
    assert!(r.stdout.contains("preliminary") || r.stdout.contains("Preliminary"));
    let files = d.files("synodic-out");
    assert!(files.contains(&"grid.csv".to_string()), "{files:?}");
    assert!(files.contains(&"summary.json".to_string()), "{files:?}");
    let grid = std::fs::read_to_string(d.join("synodic-out/grid.csv")).expect("grid");
    let mut lines = grid.lines();
    assert_eq!(lines.next(), Some(HEADER));
    let rows: Vec<&str> = lines.collect();
    assert!(rows.iter().filter(|l| l.contains(",ok,")).count() > 1000);
    let s: serde_json::Value = serde_json::from_str(
        &std::fs::read_to_string(d.join("synodic-out/summary.json")).expect("summary"),
    )
    .expect("JSON");
    assert_eq!(s["from"], "Teodra");
    assert_eq!(
        s["provenance"]["system_sha256"].as_str().map(str::len),
        Some(64)
    );
    assert_eq!(
        s["provenance"]["study_sha256"].as_str().map(str::len),
        Some(64)
    );
    let rows_total = s["grid"]["rows"].as_u64().expect("rows");
    assert_eq!(rows_total as usize, rows.len());
    let minima = s["minima"].as_array().expect("minima");
    assert!(minima
        .iter()
        .any(|m| m["objective"] == "c3" && m["type"] == "I"));
}

#[test]
fn thread_count_does_not_change_a_byte() {
    let d = Dir::new("threads");
    let common = [
        "sweep",
        "Teodra",
        "Kesh",
        "--depart",
        "2031-01-01..2031-04-30",
        "--tof-days",
        "100..400",
        "--step-days",
        "3",
        "--revs",
        "1",
        "--quiet",
    ];
    let mut one = common.to_vec();
    one.extend(["--threads", "1", "--out", "one"]);
    let mut two = common.to_vec();
    two.extend(["--threads", "2", "--out", "two"]);
    d.run(&one).ok();
    d.run(&two).ok();
    for f in [
        "grid.csv",
        "summary.json",
        "chart.svg",
        "chart-1rev-left.svg",
        "chart-1rev-right.svg",
    ] {
        let a = std::fs::read(d.join(&format!("one/{f}"))).expect("one");
        let b = std::fs::read(d.join(&format!("two/{f}"))).expect("two");
        assert!(a == b, "{f} differs between --threads 1 and 2");
    }
    let grid = std::fs::read_to_string(d.join("one/grid.csv")).expect("grid");
    assert!(grid.contains(",1,left,") && grid.contains(",1,right,"));
}

#[test]
fn skip_grid_leaves_it_out() {
    let d = Dir::new("skip");
    d.run(&["sweep", "--skip", "grid", "--quiet"]).ok();
    assert_eq!(
        d.files("synodic-out"),
        [
            "chart.png",
            "chart.svg",
            "run-info.json",
            "study.toml",
            "summary.json",
            "windows.csv"
        ]
    );
}

#[test]
fn oversized_grid_is_refused_before_allocating() {
    let d = Dir::new("huge");
    let r = d.run(&[
        "sweep",
        "Teodra",
        "Kesh",
        "--depart",
        "2031-01-01..2040-12-31",
        "--arrive",
        "2031-06-01..2045-12-31",
        "--step-days",
        "0.01",
        "--revs",
        "3",
    ]);
    let r = r.bad_input(&["MiB", "larger step"]);
    assert!(r.stdout.is_empty());
    assert!(d.files("").is_empty(), "{:?}", d.files(""));
}

/// The chart holds labelled C3 and v-infinity contours for the levels
/// asked, the optimum markers and dated axes; the PNG decodes at review
/// size. `synodic chart` redraws it from the saved files alone.
#[test]
fn charts_are_written_and_redrawn_from_saved_files() {
    let d = Dir::new("chart");
    d.run(&[
        "sweep",
        "--quiet",
        "--c3-levels",
        "13,14,16,20",
        "--vinf-levels",
        "2.5,3,4",
        "--max-c3",
        "14",
    ])
    .ok();
    let svg = std::fs::read_to_string(d.join("synodic-out/chart.svg")).expect("svg");
    assert!(svg.trim_start().starts_with("<svg"));
    assert!(
        svg.matches("class=\"vinf\"").count() >= 3,
        "v-infinity paths"
    );
    assert!(svg.matches("class=\"c3\"").count() >= 3, "C3 paths");
    let labels = texts(&svg);
    for label in [
        "13",
        "16",
        "20",
        "2.5",
        "4",
        "Teodra → Kesh",
        "Type I",
        "2032-08-01",
    ] {
        assert!(
            labels.iter().any(|t| t == label),
            "missing {label} in {labels:?}"
        );
    }
    assert!(
        labels.iter().any(|t| t.starts_with("Type I · C3 12.8")),
        "optimum marker label in {labels:?}"
    );
    let png = std::fs::read(d.join("synodic-out/chart.png")).expect("png");
    assert_eq!(&png[1..4], b"PNG");
    let w = u32::from_be_bytes([png[16], png[17], png[18], png[19]]);
    let h = u32::from_be_bytes([png[20], png[21], png[22], png[23]]);
    assert!(w >= 1600 && h >= 1200, "{w}x{h}");
    std::fs::remove_file(d.join("synodic-out/chart.svg")).expect("rm");
    let r = d
        .run(&[
            "chart",
            "synodic-out",
            "--c3-levels",
            "13,14,16,20",
            "--out",
            "synodic-out/again.svg",
        ])
        .ok();
    assert!(r.stdout.contains("again.svg"));
    let again = std::fs::read_to_string(d.join("synodic-out/again.svg")).expect("redrawn");
    assert!(again.matches("class=\"c3\"").count() >= 3);
    assert!(
        texts(&again).iter().any(|t| t.starts_with("Type I · C3")),
        "markers come back from windows.csv"
    );
}

/// Extra panels come out as their own charts, from a sweep or redrawn from
/// the saved files; an unknown panel name is refused before any work.
#[test]
fn extra_panels_are_drawn() {
    let d = Dir::new("panels");
    d.run(&["sweep", "--quiet", "--show", "dla,arrive-dec,dv-total"])
        .ok();
    for name in ["dla", "arrive-dec", "dv-total"] {
        let svg = std::fs::read_to_string(d.join(&format!("synodic-out/chart-{name}.svg")))
            .expect("panel svg");
        assert!(svg.matches("class=\"panel\"").count() >= 3, "{name}");
        assert_eq!(svg.matches("class=\"c3\"").count(), 0, "{name}");
        assert!(d.join(&format!("synodic-out/chart-{name}.png")).exists());
    }
    let dla = texts(&std::fs::read_to_string(d.join("synodic-out/chart-dla.svg")).expect("svg"));
    assert!(dla.iter().any(|t| t.starts_with("DLA")), "{dla:?}");
    d.run(&[
        "chart",
        "synodic-out",
        "--show",
        "arrive-dec",
        "--out",
        "redrawn.svg",
    ])
    .ok();
    let redrawn = std::fs::read_to_string(d.join("redrawn.svg")).expect("redrawn");
    assert!(redrawn.matches("class=\"panel\"").count() >= 3);
    let e = Dir::new("panels-bad");
    e.run(&["sweep", "--quiet", "--show", "rla"])
        .bad_input(&["--show", "rla", "dla"]);
    assert!(e.files("").is_empty());
}

/// The text content of every `<text>` element of an SVG.
fn texts(svg: &str) -> Vec<String> {
    svg.split("</text>")
        .filter_map(|chunk| chunk.rsplit_once("<text").map(|(_, t)| t))
        .filter_map(|t| t.split_once('>').map(|(_, body)| body.trim().to_string()))
        .collect()
}
