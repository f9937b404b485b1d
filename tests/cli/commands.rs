//! `bodies`, `lambert` and `transfer` as a user runs them.

use crate::util::Dir;

#[test]
fn bodies_lists_the_demo_system() {
    let d = Dir::new("bodies");
    let r = d.run(&["bodies"]).ok();
    for name in ["Teodra", "Kesh", "Iskra"] {
        assert!(r.stdout.contains(name), "{}", r.stdout);
    }
    assert!(r.stdout.contains("Synodic periods"));
    let j = d.run(&["bodies", "--json"]).ok();
    let v: serde_json::Value = serde_json::from_str(&j.stdout).expect("valid JSON");
    let bodies = v["bodies"].as_array().expect("bodies array");
    assert!(bodies.len() >= 6);
    // Kepler's third law, T = 2 pi sqrt(a^3 / mu), recomputed from the
    // printed a and GM (au per IAU 2012 Resolution B2).
    let mu = v["central_mu_km3_s2"].as_f64().expect("mu");
    for b in bodies {
        let a_km = b["a_au"].as_f64().expect("a") * 149_597_870.7;
        let t_days = std::f64::consts::TAU * (a_km.powi(3) / mu).sqrt() / 86_400.0;
        let printed = b["period_days"].as_f64().expect("period");
        assert!((printed - t_days).abs() < 1e-9 * t_days, "{b}");
    }
}

/// Source: Curtis (2010), *Orbital Mechanics for Engineering Students*,
/// Example 5.2 (REFERENCES.md 1.1): five significant figures printed, so
/// the tolerance is 1e-4 relative.
#[test]
fn lambert_reproduces_curtis_example_5_2() {
    let d = Dir::new("lambert");
    let r = d
        .run(&[
            "lambert",
            "--mu",
            "398600",
            "--r1",
            "5000,10000,2100",
            "--r2",
            "-14600,2500,7000",
            "--tof",
            "3600",
            "--json",
        ])
        .ok();
    let v: serde_json::Value = serde_json::from_str(&r.stdout).expect("JSON");
    let s = &v[0];
    let v1: Vec<f64> = s["v1"]
        .as_array()
        .expect("v1")
        .iter()
        .map(|x| x.as_f64().expect("num"))
        .collect();
    let v2: Vec<f64> = s["v2"]
        .as_array()
        .expect("v2")
        .iter()
        .map(|x| x.as_f64().expect("num"))
        .collect();
    let want1 = [-5.9925, 1.9254, 3.2456];
    let want2 = [-3.3125, -4.1966, -0.38529];
    for k in 0..3 {
        assert!(
            (v1[k] - want1[k]).abs() < 1e-4 * want1[k].abs().max(1.0),
            "{v1:?}"
        );
        assert!(
            (v2[k] - want2[k]).abs() < 1e-4 * want2[k].abs().max(1.0),
            "{v2:?}"
        );
    }
    // Curtis Example 5.3 (from memory, REFERENCES.md 1.1): a ~ 20000 km.
    let a = s["a"].as_f64().expect("a");
    assert!((a - 20_000.0).abs() < 100.0, "a = {a}");
}

/// Der, *Astrodynamics 102*, case II (REFERENCES.md 1.3): one-revolution
/// solutions exist on both branches, a two-revolution solution does not.
/// A malformed row is reported by line and the others are still solved.
#[test]
fn lambert_batch_solves_good_rows_and_reports_bad_ones() {
    let d = Dir::new("batch");
    let der2 = "398600.4418,22592.145603,-1599.915239,-19783.950506,1922.067697,4054.157051,-8925.727465,36000";
    let input = format!(
        "id,mu,r1x,r1y,r1z,r2x,r2y,r2z,tof,revs,prograde\n\
         curtis,398600,5000,10000,2100,-14600,2500,7000,3600,0,1\n\
         broken,398600,5000,ten,2100,-14600,2500,7000,3600,0,1\n\
         der2-1,{der2},1,1\n\
         der2-2,{der2},2,1\n"
    );
    d.write("in.csv", &input);
    let r = d.run(&["lambert", "--batch", "in.csv", "--out", "out.csv"]);
    let r = r.bad_input(&["in.csv", "line 3", "r1y"]);
    assert!(r.stderr.contains("malformed"), "{}", r.stderr);
    let out = std::fs::read_to_string(d.join("out.csv")).expect("output written");
    let lines: Vec<&str> = out.lines().collect();
    assert_eq!(lines[0], "id,revs,branch,v1x,v1y,v1z,v2x,v2y,v2z,status");
    assert!(lines
        .iter()
        .any(|l| l.starts_with("curtis,0,single,") && l.ends_with(",ok")));
    assert_eq!(
        lines
            .iter()
            .filter(|l| l.starts_with("der2-1,1,") && l.ends_with(",ok"))
            .count(),
        2
    );
    let two: Vec<&&str> = lines.iter().filter(|l| l.starts_with("der2-2,")).collect();
    assert_eq!(two.len(), 1, "{out}");
    assert!(two[0].starts_with("der2-2,2,,,,,,,,"), "{}", two[0]);
    assert!(!lines.iter().any(|l| l.starts_with("broken")));
    // 17 significant digits: d.dddddddddddddddde±x
    let curtis = lines.iter().find(|l| l.starts_with("curtis")).expect("row");
    let v1x = curtis.split(',').nth(3).expect("v1x");
    let mantissa = v1x
        .trim_start_matches('-')
        .split('e')
        .next()
        .expect("mantissa");
    assert_eq!(mantissa.len(), 18, "{v1x}");
}

#[test]
fn transfer_between_demo_bodies() {
    let d = Dir::new("transfer");
    let r = d
        .run(&[
            "transfer",
            "Teodra",
            "Kesh",
            "--depart",
            "2031-03-01",
            "--arrive",
            "2031-11-15",
            "--json",
        ])
        .ok();
    let v: serde_json::Value = serde_json::from_str(&r.stdout).expect("JSON");
    let arc = &v["arcs"][0];
    let c3 = arc["c3_km2_s2"].as_f64().expect("c3");
    let vinf = arc["vinf_depart_km_s"].as_f64().expect("vinf");
    assert!((c3 - vinf * vinf).abs() < 1e-9 * c3.max(1.0));
    assert!(["I", "II"].contains(&arc["type"].as_str().expect("type")));
    let text = d
        .run(&[
            "transfer",
            "teodra",
            "kesh",
            "--depart",
            "2031-03-01",
            "--arrive",
            "2031-11-15",
        ])
        .ok();
    assert!(text.stdout.contains("C3"), "{}", text.stdout);
}

/// A quoted id spanning two lines does not shift the line numbers of
/// later rows.
#[test]
fn batch_line_numbers_count_lines_inside_quoted_fields() {
    let d = Dir::new("batch-quoted");
    d.write(
        "in.csv",
        "id,mu,r1x,r1y,r1z,r2x,r2y,r2z,tof,revs,prograde\n\
         \"two\nlines\",398600,5000,10000,2100,-14600,2500,7000,3600,0,1\n\
         bad,398600,x,10000,2100,-14600,2500,7000,3600,0,1\n",
    );
    d.run(&["lambert", "--batch", "in.csv", "--out", "out.csv"])
        .bad_input(&["in.csv: line 4:", "r1x"]);
    let out = std::fs::read_to_string(d.join("out.csv")).expect("written");
    assert!(out.contains("\"two\nlines\",0,single,"), "{out}");
}
