//! Readable charts: no two text labels of a chart overlap, none runs into
//! a legend box or off the image, on the golden SVGs, the committed
//! example charts and charts of real sweeps of the demo system.
//!
//! The boxes come from the SVG as written (what a viewer renders), not
//! from the chart code: each `<text>`'s position, anchor, `dy` and
//! `font-size`, and the width of its string measured with the embedded
//! font's own metrics (advances and kerning of DejaVu Sans, read with
//! `ab_glyph`, a general-purpose font reader). Vertically a box runs from
//! the font's ascender to its descender around the baseline. Units follow
//! the SVG specification (SVG 1.1, section 10.5: `dy` shifts the
//! baseline; CSS 2.1, section 4.3.2: `em` is the font size and, where a
//! renderer does not read the x-height, `1ex = 0.5em`).

use std::path::{Path, PathBuf};

use ab_glyph::{Font, FontRef};

use crate::util::Dir;

/// DejaVu Sans, the font the charts embed.
fn font() -> FontRef<'static> {
    static TTF: &[u8] = include_bytes!("../../src/chart/fonts/DejaVuSans.ttf");
    FontRef::try_from_slice(TTF).expect("the embedded font parses")
}

/// An axis-aligned box in SVG user units.
#[derive(Debug, Clone, Copy)]
struct Box2 {
    x0: f64,
    y0: f64,
    x1: f64,
    y1: f64,
}

impl Box2 {
    fn overlaps(&self, o: &Box2) -> bool {
        self.x0 < o.x1 && o.x0 < self.x1 && self.y0 < o.y1 && o.y0 < self.y1
    }
    fn contains(&self, o: &Box2) -> bool {
        o.x0 >= self.x0 && o.x1 <= self.x1 && o.y0 >= self.y0 && o.y1 <= self.y1
    }
}

/// The value of attribute `name` in a tag's text.
fn attr<'a>(tag: &'a str, name: &str) -> Option<&'a str> {
    let key = format!(" {name}=\"");
    let a = tag.find(&key)? + key.len();
    let b = tag[a..].find('"')? + a;
    Some(&tag[a..b])
}

/// XML's predefined entities.
fn unescape(s: &str) -> String {
    s.replace("&lt;", "<")
        .replace("&gt;", ">")
        .replace("&quot;", "\"")
        .replace("&apos;", "'")
        .replace("&amp;", "&")
}

/// Width of `text` at `size` (CSS px per em), advances plus kerning.
fn width(font: &FontRef<'_>, text: &str, size: f64) -> f64 {
    let upem = f64::from(font.units_per_em().expect("units per em"));
    let mut w = 0.0;
    let mut prev = None;
    for c in text.chars() {
        let id = font.glyph_id(c);
        if let Some(p) = prev {
            w += f64::from(font.kern_unscaled(p, id));
        }
        w += f64::from(font.h_advance_unscaled(id));
        prev = Some(id);
    }
    w * size / upem
}

/// A `dy` length in user units: `em`, `ex` (half an em) or a number.
fn length(v: &str, size: f64) -> f64 {
    if let Some(n) = v.strip_suffix("em") {
        n.parse::<f64>().unwrap_or(0.0) * size
    } else if let Some(n) = v.strip_suffix("ex") {
        n.parse::<f64>().unwrap_or(0.0) * size * 0.5
    } else {
        v.parse().unwrap_or(0.0)
    }
}

/// Every `<text>` with its box.
fn text_boxes(svg: &str) -> Vec<(String, Box2)> {
    let font = font();
    let upem = f64::from(font.units_per_em().expect("units per em"));
    let (asc, desc) = (
        f64::from(font.ascent_unscaled()) / upem,
        f64::from(font.descent_unscaled()) / upem,
    );
    let mut out = Vec::new();
    let mut rest = svg;
    while let Some(a) = rest.find("<text") {
        let open_end = rest[a..].find('>').expect("text tag ends") + a;
        let tag = &rest[a..open_end];
        let close = rest[open_end..].find("</text>").expect("text closes") + open_end;
        let text = unescape(rest[open_end + 1..close].trim());
        rest = &rest[close..];
        let num = |n: &str| attr(tag, n).and_then(|v| v.parse::<f64>().ok());
        let (Some(x), Some(y), Some(size)) = (num("x"), num("y"), num("font-size")) else {
            panic!("text without x, y or font-size: {tag}");
        };
        let base = y + attr(tag, "dy").map_or(0.0, |d| length(d, size));
        let w = width(&font, &text, size);
        let x0 = match attr(tag, "text-anchor") {
            Some("middle") => x - w / 2.0,
            Some("end") => x - w,
            _ => x,
        };
        let b = Box2 {
            x0,
            y0: base - asc * size,
            x1: x0 + w,
            y1: base - desc * size,
        };
        // rotate(270, cx, cy): (u, v) -> (cx + (v - cy), cy - (u - cx)).
        let b = match attr(tag, "transform") {
            Some(t) if t.starts_with("rotate(270") => {
                let (cx, cy) = (x, y);
                let xs = [cx + (b.y0 - cy), cx + (b.y1 - cy)];
                let ys = [cy - (b.x0 - cx), cy - (b.x1 - cx)];
                Box2 {
                    x0: xs[0].min(xs[1]),
                    y0: ys[0].min(ys[1]),
                    x1: xs[0].max(xs[1]),
                    y1: ys[0].max(ys[1]),
                }
            }
            Some(t) => panic!("unexpected text transform {t}"),
            None => b,
        };
        if !text.is_empty() {
            out.push((text, b));
        }
    }
    out
}

/// The legend boxes: rectangles edged in the legend's grey.
fn legend_boxes(svg: &str) -> Vec<Box2> {
    svg.lines()
        .filter(|l| l.starts_with("<rect") && attr(l, "stroke") == Some("#B0B0B0"))
        .map(|l| {
            let n = |k: &str| {
                attr(l, k)
                    .and_then(|v| v.parse::<f64>().ok())
                    .expect("rect")
            };
            Box2 {
                x0: n("x"),
                y0: n("y"),
                x1: n("x") + n("width"),
                y1: n("y") + n("height"),
            }
        })
        .collect()
}

/// The SVG's drawing area (its `viewBox`).
fn view_box(svg: &str) -> Box2 {
    let v: Vec<f64> = attr(svg, "viewBox")
        .expect("viewBox")
        .split_whitespace()
        .map(|n| n.parse().expect("number"))
        .collect();
    Box2 {
        x0: v[0],
        y0: v[1],
        x1: v[0] + v[2],
        y1: v[1] + v[3],
    }
}

/// No two labels overlap; each lies inside the image and either wholly
/// inside a legend box (the legend's own text) or clear of it. Returns
/// the number of labels checked.
fn assert_readable(name: &str, svg: &str) -> usize {
    let boxes = text_boxes(svg);
    let legends = legend_boxes(svg);
    let image = view_box(svg);
    for (i, (t, b)) in boxes.iter().enumerate() {
        assert!(image.contains(b), "{name}: {t:?} {b:?} leaves the image");
        for l in &legends {
            assert!(
                l.contains(b) || !l.overlaps(b),
                "{name}: {t:?} {b:?} runs into the legend {l:?}"
            );
        }
        for (u, c) in &boxes[i + 1..] {
            assert!(!b.overlaps(c), "{name}: {t:?} {b:?} overlaps {u:?} {c:?}");
        }
    }
    boxes.len()
}

/// The SVG files directly in `dir`.
fn svgs(dir: &Path) -> Vec<PathBuf> {
    let mut v: Vec<PathBuf> = std::fs::read_dir(dir)
        .expect("folder")
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|e| e == "svg"))
        .collect();
    v.sort();
    v
}

fn check_all(paths: &[PathBuf]) {
    assert!(!paths.is_empty());
    for p in paths {
        let svg = std::fs::read_to_string(p).expect("read svg");
        let n = assert_readable(&p.display().to_string(), &svg);
        assert!(n >= 15, "{}: only {n} labels", p.display());
        assert!(!legend_boxes(&svg).is_empty(), "{}: no legend", p.display());
    }
}

#[test]
fn measured_boxes_match_the_font() {
    // DejaVu Sans: 2048 units per em; "0" advances 1303 units (the
    // font's hmtx table; digits share one width), so "10" at 20 px is
    // 2 * 1303 / 2048 * 20 = 25.45 px wide.
    let f = font();
    assert!((width(&f, "10", 20.0) - 25.449).abs() < 0.01);
    let b = text_boxes(
        r#"<text x="100" y="50" dy="0.76em" text-anchor="middle" font-size="20">10</text>"#,
    );
    assert_eq!(b.len(), 1);
    assert!((b[0].1.x0 - (100.0 - 12.72)).abs() < 0.01, "{:?}", b[0]);
    assert!(b[0].1.y0 < 50.0 + 15.2 && b[0].1.y1 > 50.0 + 15.2);
    // Two labels side by side with a gap are apart; shifted onto each
    // other they overlap.
    let two = |dx: f64| {
        format!(
            r#"<svg viewBox="0 0 400 200"><text x="100" y="50" font-size="20">10</text><text x="{}" y="50" font-size="20">20</text></svg>"#,
            100.0 + dx
        )
    };
    assert_eq!(assert_readable("apart", &two(30.0)), 2);
    let overlapping = std::panic::catch_unwind(|| assert_readable("onto", &two(20.0)));
    assert!(overlapping.is_err());
}

#[test]
fn golden_charts_have_no_overlapping_labels() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("src/chart/testdata");
    check_all(&svgs(&dir));
}

#[test]
fn example_charts_have_no_overlapping_labels() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("examples");
    for ex in ["cargo-runs", "iskra-rendezvous", "moon-tour"] {
        check_all(&svgs(&root.join(ex).join("out")));
    }
}

#[test]
fn real_sweeps_have_no_overlapping_labels() {
    // The demo system with the committed examples' settings, every panel
    // drawn: the cargo runs' window at 2-day steps, and the Iskra
    // rendezvous on a time-of-flight axis with one revolution.
    let d = Dir::new("labels");
    d.write(
        "cargo.toml",
        r#"system = "demo"
out = "cargo"
[[pair]]
from = "Teodra"
to = "Kesh"
[sweep]
depart = "2032-03-01..2032-10-31"
arrive = "2032-07-01..2033-12-31"
step_days = [2.0]
[limits]
max_c3_km2_s2 = 16.0
[chart]
show = ["dla", "arrive-dec", "dv-total"]
[outputs]
grid = false
"#,
    );
    d.write(
        "iskra.toml",
        r#"system = "demo"
out = "iskra"
[[pair]]
from = "Teodra"
to = "Iskra"
[sweep]
depart = "2031-06-01..2032-06-01"
tof_days = [120.0, 1500.0]
step_days = [3.0, 6.0]
revs = 1
[limits]
max_c3_km2_s2 = 45.0
[chart]
show = ["dla"]
[outputs]
grid = false
"#,
    );
    d.run(&["run", "cargo.toml"]).ok();
    d.run(&["run", "iskra.toml"]).ok();
    let mut paths = svgs(&d.join("cargo"));
    paths.extend(svgs(&d.join("iskra")));
    assert!(paths.len() >= 6, "{paths:?}");
    check_all(&paths);
}

#[test]
fn every_opportunity_marked_and_pages_stay_readable() {
    use synodic::chart::{
        page_svg, synthetic_grid, Chart, ChartSpec, Marker, MarkerFigures, Panel,
    };
    use synodic::transfer::{Endpoints, TransferType};
    // Twelve marked transfers across a synthetic window (one per
    // opportunity and Type, as a long sweep would have): every one is
    // drawn, the callouts that fit are placed, and nothing overlaps.
    let g = synthetic_grid(200);
    let markers: Vec<Marker> = (0..12)
        .map(|n| {
            let (i, j) = (10 + 15 * n, 80 + 10 * n);
            let (d, a) = g.dates_days(i, j);
            let idx = g.index(i, j, 0);
            Marker {
                depart_days: d,
                second: a,
                kind: if n % 2 == 0 {
                    TransferType::I
                } else {
                    TransferType::II
                },
                name: format!("Opportunity {}", n + 1),
                figures: MarkerFigures {
                    c3_km2_s2: Some(g.c3_km2_s2(idx)),
                    vinf_arrive_km_s: Some(g.vinf_arrive_km_s[idx]),
                    dv_total_km_s: Some(g.vinf_depart_km_s[idx]),
                    ..MarkerFigures::default()
                },
            }
        })
        .collect();
    let spec = ChartSpec {
        title: "Teodra → Kesh".to_string(),
        markers,
        max_c3: Some(20.0),
        ..ChartSpec::new(&g)
    };
    let main = Chart::window(&spec).expect("chart");
    let svg = main.svg().expect("svg");
    assert_readable("many markers", &svg);
    // Marker fills: the twelve, and one legend sample per Type.
    assert_eq!(svg.matches("fill=\"#FFC82E\"").count(), 12 + 2);
    // Callouts: rectangles framed in ink.
    let callouts = svg
        .lines()
        .filter(|l| l.starts_with("<rect") && attr(l, "stroke") == Some("#22222A"))
        .count();
    assert!(callouts >= 6, "{callouts} callouts for 12 markers");
    // The same charts on one page, two across.
    let bare = Endpoints::bare();
    let dv = Chart::panel(&spec, Panel::DvTotal, &bare).expect("panel");
    let page = page_svg("Teodra → Kesh, 2031", &[&main, &dv, &main], 2).expect("page");
    assert!(
        page.contains("width=\"3600\" height=\"2790\""),
        "2 x 2 cells"
    );
    assert!(assert_readable("page", &page) > 3 * 15);
    assert_eq!(legend_boxes(&page).len(), 3);
}
