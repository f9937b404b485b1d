//! End-to-end checks of the rendered charts on the analytic sample grids
//! ([`super::samples`]): where lines lie follows from the grids' closed
//! forms, and the golden SVGs catch any unintended change of bytes.

use super::geometry::{layout, Map};
use super::levels::format_level;
use super::samples::{
    analytic_centre_days as dc, analytic_grid, analytic_spec as spec, golden_charts, panel_grid,
    synthetic_grid,
};
use super::style::{
    C3_RGB, CAPTION, INK, MARKER_RGB, MASK_RGB, PANEL_RGB, PAPER, RIDGE_RGB, SHADE_RGB, VINF_RGB,
};
use super::{
    render_panel_png, render_panel_svg, render_png, render_svg, Chart, ChartError, ChartSpec,
    Panel, Slide, DEFAULT_HEIGHT_PX, DEFAULT_WIDTH_PX,
};
use crate::sweep::{Grid, SecondAxis};
use crate::transfer::Endpoints;
use plotters::style::RGBColor;

/// `(class, points)` of every polyline.
pub(super) fn polylines(svg: &str) -> Vec<(String, Vec<(f64, f64)>)> {
    let attr = |tag: &str, name: &str| -> Option<String> {
        let key = format!(" {name}=\"");
        let a = tag.find(&key)? + key.len();
        let b = tag[a..].find('"')? + a;
        Some(tag[a..b].to_string())
    };
    svg.lines()
        .filter(|l| l.starts_with("<polyline"))
        .map(|l| {
            let class = attr(l, "class").unwrap_or_default();
            let pts = attr(l, "points")
                .unwrap_or_default()
                .split_whitespace()
                .filter_map(|p| {
                    let (x, y) = p.split_once(',')?;
                    Some((x.parse().ok()?, y.parse().ok()?))
                })
                .collect();
            (class, pts)
        })
        .collect()
}

/// Data coordinates to logical px on a chart of the default size, built
/// from the grid's axes and the layout (not from the chart's own map).
fn default_map(g: &Grid) -> Map {
    Map {
        xmin: g.depart.start_days,
        xmax: g.depart.end_days(),
        ymin: g.second.start_days,
        ymax: g.second.end_days(),
        plot: layout(DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX).plot,
    }
}

/// Contents of every `<text>` element, trimmed.
fn texts(svg: &str) -> Vec<String> {
    let mut out = Vec::new();
    let mut rest = svg;
    while let Some(a) = rest.find("<text") {
        let Some(open_end) = rest[a..].find('>') else {
            break;
        };
        let body = a + open_end + 1;
        let Some(close) = rest[body..].find("</text>") else {
            break;
        };
        out.push(rest[body..body + close].trim().to_string());
        rest = &rest[body + close..];
    }
    out
}

fn count(lines: &[(String, Vec<(f64, f64)>)], class: &str) -> usize {
    lines.iter().filter(|(c, _)| c == class).count()
}

#[test]
fn svg_is_balanced_and_sized() {
    let g = analytic_grid(SecondAxis::Arrival);
    let svg = render_svg(&spec(&g)).expect("svg");
    assert!(svg.starts_with("<svg"));
    assert!(svg.contains("width=\"1800\" height=\"1350\""));
    assert!(svg.contains("viewBox=\"0 0 3600 2700\""));
    assert!(svg.trim_end().ends_with("</svg>"));
    // Balanced: every opened element is closed, in order.
    let mut stack: Vec<String> = Vec::new();
    let mut rest = svg.as_str();
    while let Some(a) = rest.find('<') {
        let b = rest[a..].find('>').expect("tag ends") + a;
        let tag = &rest[a + 1..b];
        if let Some(name) = tag.strip_prefix('/') {
            assert_eq!(stack.pop().as_deref(), Some(name), "close {name}");
        } else if !tag.ends_with('/') {
            stack.push(tag.split_whitespace().next().expect("name").to_string());
        }
        rest = &rest[b + 1..];
    }
    assert!(stack.is_empty(), "unclosed {stack:?}");
    // Text is text, in the sans-serif family.
    assert!(svg.contains("font-family=\"sans-serif\""));
}

#[test]
fn svg_holds_one_line_per_level_and_their_labels() {
    let g = analytic_grid(SecondAxis::Arrival);
    let svg = render_svg(&spec(&g)).expect("svg");
    let lines = polylines(&svg);
    // Each C3 level is a ring (C3 = 10 also cut by the blank block)
    // that crosses the 180-degree line (tof = 250 d) twice: the band
    // around the line cuts it into two pieces. So does the C3 limit
    // line (C3 = 25). The v-infinity rings (centred on tof = 300 d)
    // reach the band too.
    assert_eq!(count(&lines, "c3"), 6);
    assert!(count(&lines, "vinf") >= 2);
    assert_eq!(count(&lines, "c3max"), 2);
    // The 180-degree line, cut in two by the blank block.
    assert_eq!(count(&lines, "ridge"), 2);
    assert!(count(&lines, "tof") >= 3);
    // v-infinity lines are dashed, C3 lines are not.
    assert!(svg.contains("class=\"vinf\" fill=\"none\" opacity=\"1\" stroke-dasharray="));
    assert!(!svg.contains("class=\"c3\" fill=\"none\" opacity=\"1\" stroke-dasharray="));
    let t = texts(&svg);
    for label in ["10", "20", "30", "3.5", "4.5", "Type I", "Type II"] {
        assert!(t.iter().any(|x| x == label), "label {label} missing: {t:?}");
    }
    assert!(t.iter().any(|x| x.ends_with(" d")), "time-of-flight label");
    // The callout quotes C3 and arrival v-infinity (3.5422 km/s, the
    // closed form of samples::analytic_spec) over the dates.
    assert!(
        t.contains(&"Type I · C3 5.00 · v∞ 3.54".to_string()),
        "{t:?}"
    );
    assert!(t.contains(&"2031-07-20 → 2032-04-05".to_string()));
    assert!(t.contains(&"Teodra → Kesh, 2031 opportunity".to_string()));
    // The subtitle ends with the grid steps (2 d across, 3 d up).
    assert!(
        t.contains(&"Veyra system (invented), departures 2031 · grid steps 2 d × 3 d".to_string())
    );
    // Blank cells told apart: late departures before the first arrival
    // date, unsolved short flights and the block.
    assert!(
        t.iter()
            .filter(|x| *x == "Arrival before departure")
            .count()
            >= 1
    );
    assert!(t.contains(&"No solution".to_string()));
    assert!(t.contains(&CAPTION.to_string()));
    assert!(t.contains(&"Departure date (TDB)".to_string()));
    assert!(t.contains(&"Arrival date (TDB)".to_string()));
    assert!(t.contains(&"C3 ≤ 25 km²/s²".to_string()));
    assert!(t.iter().any(|x| x == "25"), "limit line labelled");
    // Date ticks on both axes.
    for d in ["2031-01-01", "2031-07-01", "2032-01-01"] {
        assert!(t.iter().any(|x| x == d), "tick {d} missing");
    }
    assert!(t.iter().any(|x| x == "2032-07-01"), "arrival tick");
}

#[test]
fn ridge_follows_the_180_degree_crossing_only() {
    let g = analytic_grid(SecondAxis::Arrival);
    let svg = render_svg(&spec(&g)).expect("svg");
    let map = default_map(&g);
    let mut n = 0;
    for (class, pts) in polylines(&svg) {
        if class != "ridge" {
            continue;
        }
        for (x, y) in pts {
            let tof = map.data_y(y / 2.0) - map.data_x(x / 2.0);
            // Not at the wrap (tof = 550): at tof = 250, within a pixel
            // (about 0.6 days) and the grid step.
            assert!((tof - 250.0).abs() < 4.0, "ridge at tof {tof}");
            n += 1;
        }
    }
    assert!(n > 10);
}

#[test]
fn lines_keep_out_of_the_band_around_180_degrees() {
    // The 180-degree line is tof = 250 d: in px, the straight line
    // through the map of (d, d + 250). Grid steps: 2 d across (6.1 px at
    // the reference size), 3 d up (5.4 px), so the band reaches three
    // steps, 18.3 px, either side (more than its 12 px minimum). Lines
    // stop where a sample inside the band neighbours one outside, within
    // one step of the edge.
    let g = analytic_grid(SecondAxis::Arrival);
    let map = default_map(&g);
    let step_px = map.px(g.depart.start_days + 2.0) - map.px(g.depart.start_days);
    let half = (crate::chart::BAND_STEPS * step_px).max(crate::chart::BAND_MIN_PX);
    let d0 = dc() - 100.0;
    let (a, b) = (
        (map.px(d0), map.py(d0 + 250.0)),
        (map.px(d0 + 200.0), map.py(d0 + 450.0)),
    );
    let dist = |p: (f64, f64)| {
        let (ux, uy) = (b.0 - a.0, b.1 - a.1);
        ((p.0 - a.0) * uy - (p.1 - a.1) * ux).abs() / ux.hypot(uy)
    };
    let svg = render_svg(&spec(&g)).expect("svg");
    let mut near = 0;
    for (class, pts) in polylines(&svg) {
        if !["c3", "vinf", "c3max"].contains(&class.as_str()) {
            continue;
        }
        for (x, y) in pts {
            let d = dist((x / 2.0, y / 2.0));
            assert!(
                d >= half - step_px,
                "{class} line {d} px from the 180-degree line"
            );
            if d < half + step_px {
                near += 1;
            }
        }
    }
    assert!(near > 4, "lines reach the band: {near}");
    // The line itself is drawn, once per piece.
    assert!(svg.contains("class=\"ridge\""));
}

#[test]
fn levels_outside_the_data_are_left_out_and_reported() {
    // The analytic C3 field spans 5 to about 600 km²/s² on this grid:
    // levels 2 and 700 lie outside it.
    let g = analytic_grid(SecondAxis::Arrival);
    let mut s = spec(&g);
    s.c3_levels = Some(vec![2.0, 10.0, 700.0]);
    s.vinf_levels = Some(vec![100.0]);
    let chart = Chart::window(&s).expect("chart");
    let w = chart.warnings();
    assert_eq!(w.len(), 2, "{w:?}");
    let text = w[0].to_string();
    assert!(
        text.starts_with("C3 levels 2, 700 km²/s² outside the chart's data (5 to "),
        "{text}"
    );
    assert!(
        w[1].to_string()
            .starts_with("arrival v∞ level 100 km/s outside"),
        "{}",
        w[1]
    );
    let svg = chart.svg().expect("svg");
    let t = texts(&svg);
    // No v-infinity line is drawn: the legend does not list one.
    assert!(!t.iter().any(|x| x == "Arrival v∞, km/s"), "{t:?}");
    assert!(t.iter().any(|x| x == "Departure C3, km²/s²"));
    assert_eq!(count(&polylines(&svg), "vinf"), 0);
    // Automatic levels give no warning.
    let auto = ChartSpec {
        c3_levels: None,
        vinf_levels: None,
        ..spec(&g)
    };
    assert!(Chart::window(&auto).expect("chart").warnings().is_empty());
}

#[test]
fn slide_controls_override_titles_and_crop() {
    let g = analytic_grid(SecondAxis::Arrival);
    let mut s = spec(&g);
    let start = g.depart.start_days;
    s.slide = Slide {
        title: Some("Cargo window, 2031".to_string()),
        subtitle: Some("Design review 3".to_string()),
        crop_depart_days: Some((start + 100.0, start + 300.0)),
        crop_second_days: Some((start + 300.0, start + 500.0)),
    };
    let svg = render_svg(&s).expect("svg");
    let t = texts(&svg);
    assert!(t.contains(&"Cargo window, 2031".to_string()));
    assert!(t.contains(&"Design review 3".to_string()));
    assert!(!t.iter().any(|x| x.contains("grid step")));
    // The axes end at the window: ticks inside it only (2031-04-11 to
    // 2031-10-28 across, 2031-10-28 to 2032-05-15 up).
    assert!(t.contains(&"2031-05-01".to_string()));
    assert!(!t.contains(&"2031-01-01".to_string()));
    // Every line lies inside the window.
    let map = Map {
        xmin: start + 100.0,
        xmax: start + 300.0,
        ymin: start + 300.0,
        ymax: start + 500.0,
        plot: layout(DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX).plot,
    };
    let lines = polylines(&svg);
    assert!(count(&lines, "c3") > 0);
    for (class, pts) in lines {
        if class == "c3" || class == "vinf" {
            for (x, y) in pts {
                let (d, a) = (map.data_x(x / 2.0), map.data_y(y / 2.0));
                assert!(d >= start + 99.9 && d <= start + 300.1, "{d}");
                assert!(a >= start + 299.9 && a <= start + 500.1, "{a}");
            }
        }
    }
    // A panel keeps the overridden title as it is.
    let svg = render_panel_svg(&s, Panel::Dla, &Endpoints::bare()).expect("svg");
    assert!(texts(&svg).contains(&"Cargo window, 2031".to_string()));
    // A window without two samples is an error naming the axis.
    s.slide.crop_second_days = Some((start - 50.0, start - 10.0));
    let e = render_svg(&s).expect_err("outside");
    assert!(e.to_string().starts_with("the arrival crop window"), "{e}");
}

#[test]
fn blank_cells_carry_no_lines() {
    let g = analytic_grid(SecondAxis::Arrival);
    let svg = render_svg(&spec(&g)).expect("svg");
    let map = default_map(&g);
    let mut near_block = 0;
    for (class, pts) in polylines(&svg) {
        if !["c3", "vinf", "ridge", "c3max"].contains(&class.as_str()) {
            continue;
        }
        for (x, y) in pts {
            let d = map.data_x(x / 2.0) - dc();
            let tof = map.data_y(y / 2.0) - map.data_x(x / 2.0);
            // Inside the block by more than a cell (2 days across,
            // 3 days up, so up to 5 days in time of flight).
            let inside = d > 30.0 + 3.0 && d < 50.0 - 3.0 && tof > 240.0 + 6.0 && tof < 280.0 - 6.0;
            assert!(
                !inside,
                "{class} line inside the blank block at d {d}, tof {tof}"
            );
            assert!(
                tof > 80.0 - 6.0,
                "{class} line in the blank corner, tof {tof}"
            );
            if (d - 30.0).abs() < 4.0 && tof > 240.0 && tof < 280.0 {
                near_block += 1;
            }
        }
    }
    assert!(near_block > 0, "lines reach the block's edge");
}

#[test]
fn a_c3_level_at_the_limit_is_drawn_once() {
    let g = analytic_grid(SecondAxis::Arrival);
    let mut s = spec(&g);
    s.max_c3 = Some(20.0);
    // Two rings left (10 and 30), each in two pieces either side of the
    // band around the 180-degree line; the limit ring likewise.
    let lines = polylines(&render_svg(&s).expect("svg"));
    assert_eq!(count(&lines, "c3"), 4);
    assert_eq!(count(&lines, "c3max"), 2);
    s.max_c3 = None;
    let svg = render_svg(&s).expect("svg");
    let lines = polylines(&svg);
    assert_eq!(count(&lines, "c3"), 6);
    assert_eq!(count(&lines, "c3max"), 0);
    assert!(!texts(&svg).iter().any(|t| t.starts_with("C3 ≤")));
}

#[test]
fn time_of_flight_charts_have_no_diagonals() {
    let g = analytic_grid(SecondAxis::TimeOfFlight);
    let svg = render_svg(&spec(&g)).expect("svg");
    let lines = polylines(&svg);
    assert_eq!(count(&lines, "tof"), 0);
    assert_eq!(count(&lines, "c3"), 6);
    let t = texts(&svg);
    assert!(t.contains(&"Time of flight, days".to_string()));
    // Flights of 60 days and more: nothing arrives before departure.
    assert!(!t.iter().any(|x| x == "Arrival before departure"), "{t:?}");
    assert!(t.iter().any(|x| x == "300"), "tof ticks: {t:?}");
}

#[test]
fn automatic_levels_are_drawn_and_labelled() {
    let g = synthetic_grid(120);
    let mut s = spec(&g);
    s.c3_levels = None;
    s.vinf_levels = None;
    s.markers.clear();
    let svg = render_svg(&s).expect("svg");
    let lines = polylines(&svg);
    let c3: Vec<f64> = crate::chart::levels::c3_levels(
        (0..g.cells())
            .filter(|&i| g.status[i] == 0)
            .map(|i| g.c3_km2_s2(i)),
    );
    assert!(count(&lines, "c3") >= c3.len() / 2);
    let t = texts(&svg);
    let labelled = c3.iter().filter(|l| t.contains(&format_level(**l))).count();
    assert!(
        labelled * 2 >= c3.len(),
        "{labelled} of {} levels labelled",
        c3.len()
    );
}

#[test]
fn bad_requests_are_errors() {
    let g = analytic_grid(SecondAxis::Arrival);
    let mut s = spec(&g);
    assert!(matches!(
        render_png(&s, 100, 1350),
        Err(ChartError::ImageSize { .. })
    ));
    s.layer = 3;
    assert_eq!(
        render_svg(&s).expect_err("no layer 3"),
        ChartError::NoSuchLayer {
            layer: 3,
            layers: 1
        }
    );
}

/// `(width, height, RGB bytes)` of a PNG.
fn decode(png_bytes: &[u8]) -> (u32, u32, Vec<u8>) {
    let dec = png::Decoder::new(std::io::Cursor::new(png_bytes));
    let mut reader = dec.read_info().expect("png header");
    let mut buf = vec![0u8; reader.output_buffer_size().expect("size")];
    let info = reader.next_frame(&mut buf).expect("png frame");
    assert_eq!(info.color_type, png::ColorType::Rgb);
    buf.truncate(info.buffer_size());
    (info.width, info.height, buf)
}

#[test]
fn png_decodes_at_the_requested_size_and_is_not_blank() {
    let g = analytic_grid(SecondAxis::Arrival);
    for (w, h) in [(DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX), (640, 480)] {
        let bytes = render_png(&spec(&g), w, h).expect("png");
        let (pw, ph, rgb) = decode(&bytes);
        assert_eq!((pw, ph), (w, h));
        let mut colours = std::collections::HashSet::new();
        for p in rgb.chunks_exact(3) {
            colours.insert((p[0], p[1], p[2]));
        }
        assert!(colours.len() > 50, "only {} colours", colours.len());
        let has = |c: RGBColor| {
            rgb.chunks_exact(3).any(|p| {
                (i32::from(p[0]) - i32::from(c.0)).abs() <= 2
                    && (i32::from(p[1]) - i32::from(c.1)).abs() <= 2
                    && (i32::from(p[2]) - i32::from(c.2)).abs() <= 2
            })
        };
        // Fills at every size; thin lines keep their pure colour only
        // where they are wide enough (the default size).
        for c in [MASK_RGB, SHADE_RGB, MARKER_RGB, PAPER] {
            assert!(has(c), "colour {c:?} missing at {w} x {h}");
        }
        if w == DEFAULT_WIDTH_PX {
            for c in [C3_RGB, VINF_RGB, RIDGE_RGB, INK] {
                assert!(has(c), "colour {c:?} missing at {w} x {h}");
            }
        }
    }
}

/// What every panel shares: the frame, no C3 or v-infinity family, no
/// C3 limit, the panel's legend and title.
fn check_panel_frame(svg: &str, panel: Panel, callout: &str) -> Vec<(String, Vec<(f64, f64)>)> {
    let lines = polylines(svg);
    for class in ["c3", "vinf", "c3max"] {
        assert_eq!(count(&lines, class), 0, "{class} lines on a panel");
    }
    assert!(!svg.contains("class=\"c3\""));
    assert!(!svg.contains("class=\"vinf\""));
    assert_eq!(count(&lines, "ridge"), 2);
    assert!(count(&lines, "tof") >= 3);
    // Solid lines of their own colour.
    assert!(svg.contains("class=\"panel\" fill=\"none\" opacity=\"1\" stroke=\"#007D8A\""));
    let t = texts(svg);
    for want in [
        panel.legend(),
        "Type I",
        "Type II",
        callout,
        "2031-07-20 → 2032-04-05",
        "Departure date (TDB)",
        "Arrival date (TDB)",
        "No solution",
        CAPTION,
    ] {
        assert!(t.iter().any(|x| x == want), "{want} missing: {t:?}");
    }
    let title = format!("Teodra → Kesh, 2031 opportunity — {}", panel.title_suffix());
    assert!(t.contains(&title), "{title} missing");
    for gone in ["Departure C3, km²/s²", "Arrival v∞, km/s", "C3 ≤ 25 km²/s²"] {
        assert!(!t.iter().any(|x| x == gone), "{gone} on a panel");
    }
    lines
}

#[test]
fn dla_panel_draws_one_labelled_family() {
    let g = panel_grid();
    let svg = render_panel_svg(&spec(&g), Panel::Dla, &Endpoints::bare()).expect("svg");
    // The callout quotes the marker's DLA (0.236 deg), not its C3.
    let lines = check_panel_frame(&svg, Panel::Dla, "Type I · DLA 0.2°");
    // DLA spans -47..47 deg: lines every 10 deg from -40 to 40, each a
    // vertical line crossing the 180-degree line (tof = 250 d) once,
    // where the band around it cuts it in two (the 10-degree line's cut
    // merges with the blank block, which lies on the 180-degree line).
    assert_eq!(count(&lines, "panel"), 18);
    let t = texts(&svg);
    for l in [-40, -30, -20, -10, 0, 10, 20, 30, 40] {
        let label = format!("{l}°");
        assert!(t.contains(&label), "label {label} missing: {t:?}");
    }
    assert!(!t.iter().any(|x| x == "50°" || x == "-50°"));
    // Vertical: every point of a line sits at the departure date of
    // its level.
    let d0 = g.depart.start_days;
    let map = default_map(&g);
    for (class, pts) in &lines {
        if class != "panel" {
            continue;
        }
        let dla: Vec<f64> = pts
            .iter()
            .map(|p| -47.0 + 94.0 * (map.data_x(p.0 / 2.0) - d0) / 398.0)
            .collect();
        let level = (dla[0] / 10.0).round() * 10.0;
        assert!(dla.iter().all(|v| (v - level).abs() < 0.3), "{dla:?}");
    }
}

#[test]
fn arrival_declination_panel_draws_one_labelled_family() {
    let g = panel_grid();
    let svg = render_panel_svg(&spec(&g), Panel::ArriveDec, &Endpoints::bare()).expect("svg");
    let lines = check_panel_frame(&svg, Panel::ArriveDec, "Type I · arrival dec 5.2°");
    // -25..25 deg: every 5 deg from -20 to 20, horizontal lines, those
    // arriving 250 days or more after the first departure (from -10 deg
    // up) cut by the band around the 180-degree line.
    assert!(
        count(&lines, "panel") >= 9 + 6,
        "{}",
        count(&lines, "panel")
    );
    let t = texts(&svg);
    for l in [-20, -15, -10, -5, 0, 5, 10, 15, 20] {
        let label = format!("{l}°");
        assert!(t.contains(&label), "label {label} missing: {t:?}");
    }
}

#[test]
fn total_dv_panel_is_denser_near_the_minimum() {
    let g = panel_grid();
    let svg = render_panel_svg(&spec(&g), Panel::DvTotal, &Endpoints::bare()).expect("svg");
    // sqrt(5) km/s at the marker.
    let lines = check_panel_frame(&svg, Panel::DvTotal, "Type I · Δv 2.24");
    // Without burns to count, total delta-v is the departure excess
    // speed sqrt(C3): a bowl from sqrt(5) = 2.24 km/s.
    // Levels start just above it with 0.2 km/s steps and widen.
    let levels = [2.4, 2.6, 3.0, 3.5, 4.0, 5.0, 6.0, 8.0];
    let t = texts(&svg);
    for l in levels {
        assert!(t.contains(&format_level(l)), "label {l} missing: {t:?}");
    }
    for absent in ["2.2", "2.8", "4.5", "7", "10"] {
        assert!(!t.iter().any(|x| x == absent), "{absent} drawn: {t:?}");
    }
    assert!(!t.iter().any(|x| x.ends_with('°')), "no degrees");
    // At least one piece per level (the rings cross the 180-degree
    // line, whose band cuts them).
    assert!(count(&lines, "panel") >= levels.len());
}

#[test]
fn total_dv_panel_counts_the_burns() {
    let g = panel_grid();
    let bare = render_panel_svg(&spec(&g), Panel::DvTotal, &Endpoints::bare()).expect("svg");
    let ends = Endpoints {
        parking: Some(crate::transfer::ParkingOrbit {
            mu_km3_s2: 398_600.0,
            radius_km: 6_578.0,
        }),
        ..Endpoints::bare()
    };
    let burn = render_panel_svg(&spec(&g), Panel::DvTotal, &ends).expect("svg");
    assert_ne!(bare, burn);
    // Injection from a low orbit: the minimum is about 3.6 km/s.
    let t = texts(&burn);
    assert!(!t.iter().any(|x| x == "2.4"), "{t:?}");
    assert!(count(&polylines(&burn), "panel") >= 5);
}

#[test]
fn panels_leave_the_main_chart_alone_and_render_as_png() {
    let g = panel_grid();
    let before = render_svg(&spec(&g)).expect("svg");
    for panel in Panel::ALL {
        let bytes = render_panel_png(&spec(&g), panel, &Endpoints::bare(), 900, 675).expect("png");
        let (w, h, rgb) = decode(&bytes);
        assert_eq!((w, h), (900, 675));
        let near = |c: RGBColor, tol: i32| {
            rgb.chunks_exact(3).any(|p| {
                (i32::from(p[0]) - i32::from(c.0)).abs() <= tol
                    && (i32::from(p[1]) - i32::from(c.1)).abs() <= tol
                    && (i32::from(p[2]) - i32::from(c.2)).abs() <= tol
            })
        };
        for c in [MASK_RGB, MARKER_RGB, PAPER] {
            assert!(near(c, 2), "{c:?} missing on {}", panel.name());
        }
        // No C3 limit shading on a panel.
        assert!(!near(SHADE_RGB, 0), "shade on {}", panel.name());
        let big = render_panel_png(
            &spec(&g),
            panel,
            &Endpoints::bare(),
            DEFAULT_WIDTH_PX,
            DEFAULT_HEIGHT_PX,
        )
        .expect("png");
        let (_, _, rgb) = decode(&big);
        assert!(
            rgb.chunks_exact(3)
                .any(|p| (p[0], p[1], p[2]) == (PANEL_RGB.0, PANEL_RGB.1, PANEL_RGB.2)),
            "panel colour missing on {}",
            panel.name()
        );
    }
    assert!(matches!(
        render_panel_png(&spec(&g), Panel::Dla, &Endpoints::bare(), 100, 100),
        Err(ChartError::ImageSize { .. })
    ));
    let mut s = spec(&g);
    s.layer = 2;
    assert!(matches!(
        render_panel_svg(&s, Panel::Dla, &Endpoints::bare()),
        Err(ChartError::NoSuchLayer { .. })
    ));
    assert_eq!(render_svg(&spec(&g)).expect("svg"), before);
}

#[test]
fn panel_lines_stay_out_of_blank_cells() {
    let g = panel_grid();
    let map = default_map(&g);
    for panel in Panel::ALL {
        let svg = render_panel_svg(&spec(&g), panel, &Endpoints::bare()).expect("svg");
        let mut n = 0;
        for (class, pts) in polylines(&svg) {
            if class != "panel" {
                continue;
            }
            for (x, y) in pts {
                let d = map.data_x(x / 2.0) - dc();
                let tof = map.data_y(y / 2.0) - map.data_x(x / 2.0);
                let inside =
                    d > 30.0 + 3.0 && d < 50.0 - 3.0 && tof > 240.0 + 6.0 && tof < 280.0 - 6.0;
                assert!(!inside, "{} line in the block", panel.name());
                assert!(
                    tof > 80.0 - 6.0,
                    "{} line in the blank corner",
                    panel.name()
                );
                n += 1;
            }
        }
        assert!(n > 20, "{}: {n} points", panel.name());
    }
}

#[test]
fn panels_on_time_of_flight_grids_and_fields_without_values() {
    // Time-of-flight axis: no diagonals, the panel's lines still drawn.
    let mut g = analytic_grid(SecondAxis::TimeOfFlight);
    for idx in 0..g.cells() {
        g.depart_dir[idx] = [0.6, 0.0, 0.8];
    }
    let svg = render_panel_svg(&spec(&g), Panel::DvTotal, &Endpoints::bare()).expect("svg");
    let lines = polylines(&svg);
    assert_eq!(count(&lines, "tof"), 0);
    assert!(count(&lines, "panel") >= 5);
    // A flat DLA (53.13 deg everywhere) and an unknown arrival
    // direction (NaN) give no lines, but still a chart.
    for panel in [Panel::Dla, Panel::ArriveDec] {
        let svg = render_panel_svg(&spec(&g), panel, &Endpoints::bare()).expect("svg");
        assert_eq!(count(&polylines(&svg), "panel"), 0);
        // Nothing drawn, nothing listed; the title still names it.
        let t = texts(&svg);
        assert!(!t.iter().any(|t| t == panel.legend()));
        assert!(t.iter().any(|t| t.ends_with(panel.title_suffix())));
    }
}

/// The golden SVGs under `src/chart/testdata/`, byte for byte. They were
/// drawn by this code (so they guard against unintended change, not
/// against a wrong chart: the tests above do that); after a deliberate
/// change, regenerate them with
/// `cargo run --release --example chart_fixtures -- golden` and say why in
/// the commit.
#[test]
fn charts_match_the_golden_svgs() {
    let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("src/chart/testdata");
    let charts = golden_charts().expect("golden charts render");
    assert_eq!(charts.len(), 6);
    for (name, now) in &charts {
        let saved = std::fs::read_to_string(dir.join(name))
            .unwrap_or_else(|e| panic!("{name}: cannot read the golden copy: {e}"));
        if let Some((n, (a, b))) = saved
            .lines()
            .zip(now.lines())
            .enumerate()
            .find(|(_, (a, b))| a != b)
        {
            panic!("{name}: line {} differs\n saved: {a}\n   now: {b}", n + 1);
        }
        assert_eq!(now.len(), saved.len(), "{name}: length changed");
        assert!(now == &saved, "{name}: content changed");
    }
}
