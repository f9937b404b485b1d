//! Markers and every text inside the plot: marker callouts, contour
//! labels, the Type I/II names, the name of the region before departure
//! and the time-of-flight labels, placed greedily by one [`Placer`] so
//! that no two overlap, none covers a marker or the 180-degree line, and
//! all stay inside the plot (the legend and tick labels lie outside it).

use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

use super::geometry::{cumulative, longest, point_at, Map, Placer, Rect};
use super::panel::Panel;
use super::pen::{MarkerLook, Pen};
use super::plan::Plan;
use super::style::{
    C3_RGB, INK, LIMIT_RGB, LINE_LABEL_TEXT_PX, MARKER_RADIUS_PX, MARKER_RGB, MARKER_TEXT_PX,
    MUTED, PANEL_RGB, PAPER, REGION_TEXT_PX, RIDGE_RGB, SMALL_TEXT_PX, THIN_STROKE_PX, VINF_RGB,
};
use super::{ChartError, Marker, MarkerFigures};
use crate::chart::calendar::date_label_tdb;
use crate::transfer::TransferType;

// At the reference size, logical px (chosen by eye; no source).
/// Labels keep this far inside the plot frame.
const LABEL_INSET_PX: f64 = 3.0;
/// A marker keeps labels out of a square this many radii wide.
const MARKER_KEEP_OUT_RADII: f64 = 2.4;
/// Padding of a label's white box around its text (x, y).
const LABEL_PAD_PX: (f64, f64) = (8.0, 4.0);
/// Padding of the Type I/II names' boxes (x, y).
const REGION_LABEL_PAD_PX: (f64, f64) = (10.0, 6.0);
/// Padding of a callout's box (x, y).
const CALLOUT_PAD_PX: (f64, f64) = (14.0, 10.0);
/// Distance between the two lines of a callout.
const CALLOUT_LINE_PX: f64 = 22.0;
/// Labels keep this far from the 180-degree line.
const RIDGE_KEEP_OUT_PX: f64 = 7.0;

/// Drawn lines in logical px, each with the text of its label.
pub(crate) type Traced = Vec<(String, Vec<(f64, f64)>)>;

/// The contour families as drawn, the input of label placement.
pub(crate) struct Contours {
    pub(crate) ridge: Traced,
    pub(crate) vinf: Traced,
    pub(crate) c3: Traced,
    pub(crate) limit: Traced,
    pub(crate) panel: Traced,
}

/// A label to draw: text centred in a white box.
struct Label {
    text: String,
    centre: (f64, f64),
    colour: RGBColor,
    size_px: f64,
}

/// A callout to draw: one or two lines of text in a framed box, with a
/// leader line from its marker.
struct Callout {
    frame: Rect,
    lines: Vec<String>,
    marker: (f64, f64),
}

/// The point of `r` nearest to `p`.
fn nearest_on(r: &Rect, p: (f64, f64)) -> (f64, f64) {
    (p.0.clamp(r.x0, r.x1), p.1.clamp(r.y0, r.y1))
}

/// How the window chart draws a marker of `kind`.
pub(crate) fn marker_look(kind: TransferType) -> MarkerLook {
    MarkerLook::filled(kind, MARKER_RGB)
}

/// What a callout quotes on this chart: C3 and arrival v-infinity on the
/// main chart, the panel's own quantity on a panel; unknown figures are
/// left out.
fn quoted(panel: Option<Panel>, f: &MarkerFigures) -> Vec<String> {
    let mut out = Vec::new();
    let mut add = |v: Option<f64>, text: &dyn Fn(f64) -> String| {
        if let Some(v) = v.filter(|v| v.is_finite()) {
            out.push(text(v));
        }
    };
    match panel {
        None => {
            add(f.c3_km2_s2, &|v| format!("C3 {v:.2}"));
            add(f.vinf_arrive_km_s, &|v| format!("v∞ {v:.2}"));
        }
        Some(Panel::Dla) => add(f.dla_deg, &|v| format!("DLA {v:.1}°")),
        Some(Panel::ArriveDec) => add(f.arrive_dec_deg, &|v| format!("arrival dec {v:.1}°")),
        Some(Panel::DvTotal) => add(f.dv_total_km_s, &|v| format!("Δv {v:.2}")),
    }
    out
}

/// The callout texts of a marker, longest first: name and figures over
/// the dates; then the figures alone.
fn callout_texts(plan: &Plan<'_, '_>, m: &Marker) -> Vec<Vec<String>> {
    let figures = quoted(plan.panel.as_ref().map(|p| p.0), &m.figures);
    let mut head = vec![m.name.clone()];
    head.extend(figures.iter().cloned());
    let dates = format!(
        "{} → {}",
        date_label_tdb(m.depart_days),
        date_label_tdb(plan.arrival_days(m.depart_days, m.second))
    );
    let mut out = vec![vec![head.join(" · "), dates]];
    if !figures.is_empty() {
        out.push(vec![figures.join(" · ")]);
    }
    out
}

/// Keeps labels off the 180-degree line: small squares along it.
fn reserve_line(placer: &mut Placer, pts: &[(f64, f64)], half: f64) {
    if pts.len() < 2 {
        return;
    }
    let cum = cumulative(pts);
    let len = cum[cum.len() - 1];
    let n = (len / half).ceil().max(1.0) as usize;
    for i in 0..=n {
        let (p, _) = point_at(pts, &cum, len * i as f64 / n as f64);
        placer.reserve(Rect::centred(p.0, p.1, 2.0 * half, 2.0 * half));
    }
}

/// Markers with their callouts, and the labels of contours, of the Type
/// I/II regions, of the region before departure and of the
/// time-of-flight lines, placed greedily without overlaps: markers and
/// the 180-degree line first, then the callouts (each marker in the
/// spec's order, the full callout if it fits, else the figures alone,
/// else none), then the labels in that order.
pub(crate) fn markers_and_labels<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    plan: &Plan<'_, '_>,
    map: &Map,
    contours: &Contours,
    tof: &Traced,
) -> Result<(), ChartError> {
    let (plot, k) = (map.plot, pen.k);
    let mut placer = Placer::new(plot.inset(LABEL_INSET_PX * k));
    let r_mark = MARKER_RADIUS_PX * k;
    let marks = markers_in_plot(&plan.spec.markers, map);
    for (_, p) in &marks {
        let side = MARKER_KEEP_OUT_RADII * r_mark;
        placer.reserve(Rect::centred(p.0, p.1, side, side));
    }
    for (_, pts) in &contours.ridge {
        reserve_line(&mut placer, pts, RIDGE_KEEP_OUT_PX * k);
    }
    let mut callouts: Vec<Callout> = Vec::new();
    for (m, p) in &marks {
        for lines in callout_texts(plan, m) {
            let mut w: f64 = 0.0;
            for l in &lines {
                w = w.max(pen.text_size(l, MARKER_TEXT_PX)?.0);
            }
            let h = pen.text_size(&lines[0], MARKER_TEXT_PX)?.1
                + CALLOUT_LINE_PX * k * (lines.len() as f64 - 1.0);
            let size = (w + CALLOUT_PAD_PX.0 * k, h + CALLOUT_PAD_PX.1 * k);
            if let Some(frame) = placer.beside_point(*p, size, k) {
                callouts.push(Callout {
                    frame,
                    lines,
                    marker: *p,
                });
                break;
            }
        }
    }
    let mut labels: Vec<Label> = Vec::new();
    for (pieces, colour) in [
        (&contours.limit, LIMIT_RGB),
        (&contours.c3, C3_RGB),
        (&contours.vinf, VINF_RGB),
        (&contours.panel, PANEL_RGB),
    ] {
        line_labels(pen, &mut placer, pieces, colour, &mut labels)?;
    }
    region_labels(pen, plan, map, &contours.ridge, &mut placer, &mut labels)?;
    before_label(pen, plan, map, &mut placer, &mut labels)?;
    for (text, seg) in tof {
        let size = pen.text_box(text, SMALL_TEXT_PX, LABEL_PAD_PX)?;
        if let Some(centre) = placer.along_segment(seg[0], seg[1], size) {
            labels.push(Label {
                text: text.clone(),
                centre,
                colour: MUTED,
                size_px: SMALL_TEXT_PX,
            });
        }
    }
    for l in &labels {
        let (w, h) = pen.text_box(&l.text, l.size_px, LABEL_PAD_PX)?;
        pen.rect(Rect::centred(l.centre.0, l.centre.1, w, h), PAPER, None)?;
        pen.text(
            &l.text,
            l.centre,
            l.size_px,
            &l.colour,
            (HPos::Center, VPos::Center),
        )?;
    }
    for c in &callouts {
        let end = nearest_on(&c.frame, c.marker);
        pen.line(&[c.marker, end], INK, THIN_STROKE_PX, None)?;
    }
    for (m, p) in &marks {
        pen.marker(*p, r_mark, marker_look(m.kind))?;
    }
    for c in &callouts {
        pen.rect(c.frame, PAPER, Some((INK, THIN_STROKE_PX)))?;
        let cx = (c.frame.x0 + c.frame.x1) / 2.0;
        let cy = (c.frame.y0 + c.frame.y1) / 2.0;
        let first = cy - CALLOUT_LINE_PX * k * (c.lines.len() as f64 - 1.0) / 2.0;
        for (n, line) in c.lines.iter().enumerate() {
            let colour = if n == 0 { INK } else { MUTED };
            pen.text(
                line,
                (cx, first + CALLOUT_LINE_PX * k * n as f64),
                MARKER_TEXT_PX,
                &colour,
                (HPos::Center, VPos::Center),
            )?;
        }
    }
    Ok(())
}

/// The markers inside the plot, with their positions in logical px.
fn markers_in_plot<'m>(markers: &'m [Marker], map: &Map) -> Vec<(&'m Marker, (f64, f64))> {
    let plot = map.plot;
    markers
        .iter()
        .filter_map(|m| {
            let (x, y) = (map.px(m.depart_days), map.py(m.second));
            let inside = x.is_finite()
                && y.is_finite()
                && x >= plot.x0
                && x <= plot.x1
                && y >= plot.y0
                && y <= plot.y1;
            inside.then_some((m, (x, y)))
        })
        .collect()
}

/// Labels on the pieces of one contour family.
fn line_labels<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    placer: &mut Placer,
    pieces: &Traced,
    colour: RGBColor,
    out: &mut Vec<Label>,
) -> Result<(), ChartError> {
    for (text, pts) in pieces {
        if pts.len() < 2 {
            continue;
        }
        let size = pen.text_box(text, LINE_LABEL_TEXT_PX, LABEL_PAD_PX)?;
        for centre in placer.along_line(pts, size, pen.k) {
            out.push(Label {
                text: text.clone(),
                centre,
                colour,
                size_px: LINE_LABEL_TEXT_PX,
            });
        }
    }
    Ok(())
}

/// "Type I" and "Type II" either side of the longest piece of the
/// 180-degree line, on the side whose transfer angle says so.
fn region_labels<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    plan: &Plan<'_, '_>,
    map: &Map,
    ridge: &Traced,
    placer: &mut Placer,
    out: &mut Vec<Label>,
) -> Result<(), ChartError> {
    const NAMES: [&str; 2] = ["Type I", "Type II"];
    let Some(pts) = longest(ridge) else {
        return Ok(());
    };
    let boxes = [
        pen.text_box(NAMES[0], REGION_TEXT_PX, REGION_LABEL_PAD_PX)?,
        pen.text_box(NAMES[1], REGION_TEXT_PX, REGION_LABEL_PAD_PX)?,
    ];
    let side_of = |q: (f64, f64)| {
        let angle = plan.angle_at(map.data_x(q.0), map.data_y(q.1))?;
        Some(usize::from(angle >= 180.0))
    };
    for (side, centre) in placer.either_side(pts, pen.k, boxes, side_of) {
        out.push(Label {
            text: NAMES[side].to_string(),
            centre,
            colour: RIDGE_RGB,
            size_px: REGION_TEXT_PX,
        });
    }
    Ok(())
}

/// Whether `p` lies inside the convex polygon `poly` (either winding).
fn inside_convex(poly: &[(f64, f64)], p: (f64, f64)) -> bool {
    let n = poly.len();
    let mut side: Option<bool> = None;
    for i in 0..n {
        let (a, b) = (poly[i], poly[(i + 1) % n]);
        let cross = (b.0 - a.0) * (p.1 - a.1) - (b.1 - a.1) * (p.0 - a.0);
        if cross.abs() < 1e-12 {
            continue;
        }
        match side {
            None => side = Some(cross > 0.0),
            Some(left) if left != (cross > 0.0) => return false,
            Some(_) => {}
        }
    }
    true
}

/// "Arrival before departure" inside its region, where a box fits: at the
/// region's centroid or part of the way towards one of its corners.
fn before_label<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    plan: &Plan<'_, '_>,
    map: &Map,
    placer: &mut Placer,
    out: &mut Vec<Label>,
) -> Result<(), ChartError> {
    const TEXT: &str = "Arrival before departure";
    let poly = super::geometry::clip_polygon(&map.polyline_px(&plan.before), &map.plot);
    if poly.len() < 3 {
        return Ok(());
    }
    let (w, h) = pen.text_box(TEXT, REGION_TEXT_PX, REGION_LABEL_PAD_PX)?;
    let n = poly.len() as f64;
    let c = (
        poly.iter().map(|p| p.0).sum::<f64>() / n,
        poly.iter().map(|p| p.1).sum::<f64>() / n,
    );
    let mut candidates = vec![c];
    for t in [0.3, 0.5, 0.7] {
        candidates.extend(
            poly.iter()
                .map(|v| (c.0 + t * (v.0 - c.0), c.1 + t * (v.1 - c.1))),
        );
    }
    for q in candidates {
        let r = Rect::centred(q.0, q.1, w, h);
        let corners = [(r.x0, r.y0), (r.x1, r.y0), (r.x1, r.y1), (r.x0, r.y1)];
        if corners.iter().all(|&p| inside_convex(&poly, p)) && placer.try_take(r) {
            out.push(Label {
                text: TEXT.to_string(),
                centre: q,
                colour: MUTED,
                size_px: REGION_TEXT_PX,
            });
            break;
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn callouts_quote_the_chart_quantity() {
        let f = MarkerFigures {
            c3_km2_s2: Some(12.866),
            vinf_arrive_km_s: Some(2.412),
            dla_deg: Some(-7.04),
            arrive_dec_deg: None,
            dv_total_km_s: Some(5.5),
        };
        assert_eq!(quoted(None, &f), ["C3 12.87", "v∞ 2.41"]);
        assert_eq!(quoted(Some(Panel::Dla), &f), ["DLA -7.0°"]);
        assert!(quoted(Some(Panel::ArriveDec), &f).is_empty());
        assert_eq!(quoted(Some(Panel::DvTotal), &f), ["Δv 5.50"]);
    }

    #[test]
    fn convex_inside_test() {
        let tri = [(0.0, 0.0), (10.0, 0.0), (10.0, 10.0)];
        assert!(inside_convex(&tri, (8.0, 2.0)));
        assert!(!inside_convex(&tri, (2.0, 8.0)));
        let rev: Vec<(f64, f64)> = tri.iter().rev().copied().collect();
        assert!(inside_convex(&rev, (8.0, 2.0)));
    }
}
