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
