//! Drawing a [`Plan`] with plotters, generic over the backend (SVG or
//! bitmap), in the order the layers stack: regions, grid lines, lines of
//! constant time of flight, contours, the 180-degree line, frame and
//! axes, markers and labels, titles and legend.
//!
//! Layout is in logical px of the requested image size; the [`Pen`]
//! scales every quantity (coordinates, strokes, dashes, fonts) to the
//! backend's px.

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

use super::geometry::{clip_polygon, Layout, Map};
use super::isolines::Isoline;
use super::labels::{marker_look, markers_and_labels, Contours, Traced};
use super::legend::{legend_box, Row, Sample};
use super::levels::format_level;
use super::pen::Pen;
use super::plan::{Plan, Ticks};
use super::style::{
    Line, AXIS_TITLE_TEXT_PX, BAND_RGB, BEFORE_RGB, INK, MARKER_RADIUS_PX, MASK_RGB, PAPER,
    SHADE_RGB,
};
use super::{draw_err, ChartError};
use crate::lambert::Branch;
use crate::sweep::{Grid, SecondAxis};
use crate::transfer::TransferType;

// Positions at the reference size, logical px (chosen by eye; no
// source).
/// Top of the departure-axis title below the plot.
const X_TITLE_BELOW_PLOT_PX: f64 = 58.0;
/// Centre of the (rotated) second-axis title from the image's left edge.
const Y_TITLE_X_PX: f64 = 24.0;
/// Top of the title from the image's top edge.
const TITLE_TOP_PX: f64 = 30.0;
/// Top of the subtitle from the image's top edge.
const SUBTITLE_TOP_PX: f64 = 78.0;
/// Bottom of the caption from the image's bottom edge.
const CAPTION_BOTTOM_PX: f64 = 22.0;
/// The legend's left edge right of the plot.
const LEGEND_GAP_PX: f64 = 34.0;
/// The legend's right edge from the image's right edge.
const LEGEND_RIGHT_PX: f64 = 26.0;
/// Width of the paper-coloured halo under the 180-degree line.
const RIDGE_HALO_PX: f64 = 6.0;

/// Draws the whole chart on `area`, whose backend has `s` px per logical
/// px (logical size `lay.w` x `lay.h`). With `native_dash` the backend
/// draws dashes itself (the SVG's `stroke-dasharray`).
///
/// # Errors
/// [`ChartError::Draw`] if the backend fails.
pub(crate) fn chart<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    plan: &Plan<'_, '_>,
    lay: &Layout,
    s: f64,
    native_dash: bool,
) -> Result<(), ChartError> {
    let pen = Pen {
        area,
        s,
        k: lay.k,
        native_dash,
    };
    let map = plan.map(lay.plot);
    area.fill(&PAPER).map_err(draw_err)?;
    regions(&pen, plan, &map)?;
    let ticks = plan.ticks(&map, lay.k);
    pen.gridlines(&map, &ticks.x.at, &ticks.y)?;
    let tof = tof_lines(&pen, plan, &map)?;
    let contours = contours(&pen, plan, &map)?;
    axes(&pen, plan, &map, &ticks)?;
    markers_and_labels(&pen, plan, &map, &contours, &tof)?;
    titles(&pen, plan, lay)?;
    let x0 = lay.plot.x1 + LEGEND_GAP_PX * lay.k;
    let x1 = lay.w - LEGEND_RIGHT_PX * lay.k;
    let note = format!("Solutions: {}", layer_name(plan.spec.grid, plan.spec.layer));
    legend_box(
        &pen,
        (x0, lay.plot.y0, x1),
        &legend_rows(plan, &contours),
        Some(&note),
    )?;
    Ok(())
}

/// The band around the 180-degree line, the feasible shade, then the
/// cells without a solution and the region before departure over them.
fn regions<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    plan: &Plan<'_, '_>,
    map: &Map,
) -> Result<(), ChartError> {
    let plot = map.plot;
    for (fill, regions) in [
        (BAND_RGB, &plan.band),
        (SHADE_RGB, &plan.shade),
        (MASK_RGB, &plan.unsolved),
    ] {
        for (ext, holes) in regions.iter() {
            pen.fill(&clip_polygon(&map.polyline_px(ext), &plot), fill)?;
            for hole in holes {
                pen.fill(&clip_polygon(&map.polyline_px(hole), &plot), PAPER)?;
            }
        }
    }
    pen.fill(
        &clip_polygon(&map.polyline_px(&plan.before), &plot),
        BEFORE_RGB,
    )
}

/// The plan's lines of constant time of flight, labelled "N d".
fn tof_lines<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    plan: &Plan<'_, '_>,
    map: &Map,
) -> Result<Traced, ChartError> {
    let mut out = Vec::new();
    for l in &plan.tof {
        let seg = vec![
            (map.px(l.from.0), map.py(l.from.1)),
            (map.px(l.to.0), map.py(l.to.1)),
        ];
        pen.kind_line(&seg, Line::Tof)?;
        out.push((format!("{} d", format_level(l.days)), seg));
    }
    Ok(out)
}

/// One contour family in logical px with each piece's label text.
fn trace(map: &Map, lines: &[Isoline], text: impl Fn(f64) -> String) -> Traced {
    let mut out = Vec::new();
    for l in lines {
        let text = text(l.level);
        for piece in &l.pieces {
            let px = map.polyline_px(piece);
            if px.len() >= 2 {
                out.push((text.clone(), px));
            }
        }
    }
    out
}

/// v-infinity, C3, the C3 limit and a panel's family, then the
/// 180-degree line once on a paper-coloured halo, so that it reads
/// clearly wherever another line ends near it.
fn contours<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    plan: &Plan<'_, '_>,
    map: &Map,
) -> Result<Contours, ChartError> {
    let out = Contours {
        ridge: trace(map, &plan.ridge, format_level),
        vinf: trace(map, &plan.vinf, format_level),
        c3: trace(map, &plan.c3, format_level),
        limit: trace(map, &plan.limit, format_level),
        panel: match &plan.panel {
            Some((panel, lines)) => trace(map, lines, |l| panel.level_text(l)),
            None => Vec::new(),
        },
    };
    for (family, kind) in [
        (&out.vinf, Line::Vinf),
        (&out.c3, Line::C3),
        (&out.limit, Line::Limit),
        (&out.panel, Line::Panel),
    ] {
        for (_, px) in family {
            pen.kind_line(px, kind)?;
        }
    }
    for (_, px) in &out.ridge {
        pen.line(px, PAPER, RIDGE_HALO_PX, None)?;
        pen.kind_line(px, Line::Ridge)?;
    }
    Ok(out)
}

/// Frame, ticks with their labels, axis titles.
fn axes<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    plan: &Plan<'_, '_>,
    map: &Map,
    ticks: &Ticks,
) -> Result<(), ChartError> {
    let (plot, k) = (map.plot, pen.k);
    let second = plan.spec.grid.second_kind;
    let x: Vec<(f64, String)> = ticks.x.at.iter().map(|&t| (t, ticks.x.label(t))).collect();
    let y: Vec<(f64, String)> = ticks
        .y
        .iter()
        .map(|&t| match &ticks.y_dates {
            Some(d) => (t, d.label(t)),
            None => (t, format_level(t)),
        })
        .collect();
    pen.frame_and_ticks(map, &x, &y)?;
    pen.text(
        "Departure date (TDB)",
        (
            (plot.x0 + plot.x1) / 2.0,
            plot.y1 + X_TITLE_BELOW_PLOT_PX * k,
        ),
        AXIS_TITLE_TEXT_PX,
        &INK,
        (HPos::Center, VPos::Top),
    )?;
    let y_title = match second {
        SecondAxis::Arrival => "Arrival date (TDB)",
        SecondAxis::TimeOfFlight => "Time of flight, days",
    };
    pen.text_up(
        y_title,
        (Y_TITLE_X_PX * k, (plot.y0 + plot.y1) / 2.0),
        AXIS_TITLE_TEXT_PX,
        &INK,
    )
}

/// Title, subtitle and caption.
fn titles<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    plan: &Plan<'_, '_>,
    lay: &Layout,
) -> Result<(), ChartError> {
    let k = lay.k;
    pen.headings(
        (&plan.title, &plan.subtitle),
        lay.plot.x0,
        (TITLE_TOP_PX * k, SUBTITLE_TOP_PX * k),
        lay.h - CAPTION_BOTTOM_PX * k,
    )
}

/// The legend's rows: what the chart draws, in a fixed order, and
/// nothing it does not draw.
fn legend_rows(plan: &Plan<'_, '_>, drawn: &Contours) -> Vec<Row> {
    let mut rows = Vec::new();
    match &plan.panel {
        None => {
            if !drawn.c3.is_empty() {
                rows.push(Row::new(Sample::Kind(Line::C3), "Departure C3, km²/s²"));
            }
            if !drawn.vinf.is_empty() {
                rows.push(Row::new(Sample::Kind(Line::Vinf), "Arrival v∞, km/s"));
            }
        }
        Some((panel, _)) => {
            if !drawn.panel.is_empty() {
                rows.push(Row::new(Sample::Kind(Line::Panel), panel.legend()));
            }
        }
    }
    if !plan.tof.is_empty() {
        rows.push(Row::new(Sample::Kind(Line::Tof), "Time of flight, days"));
    }
    if !drawn.ridge.is_empty() {
        let sample = if plan.band.is_empty() {
            Sample::Kind(Line::Ridge)
        } else {
            Sample::Band(BAND_RGB, Line::Ridge)
        };
        rows.push(Row::new(sample, "Type I / II boundary (180°)"));
        if !plan.band.is_empty() {
            rows.push(Row::new(
                Sample::Patch(BAND_RGB, None),
                "Near 180°: no contours",
            ));
        }
    }
    if let Some(max) = plan.max_c3 {
        if !plan.shade.is_empty() || !drawn.limit.is_empty() {
            rows.push(Row::new(
                Sample::Patch(SHADE_RGB, Some(Line::Limit)),
                format!("C3 ≤ {} km²/s²", format_level(max)),
            ));
        }
    }
    if !plan.unsolved.is_empty() {
        rows.push(Row::new(Sample::Patch(MASK_RGB, None), "No solution"));
    }
    if !plan.before.is_empty() {
        rows.push(Row::new(
            Sample::Patch(BEFORE_RGB, None),
            "Arrival before departure",
        ));
    }
    for kind in [TransferType::I, TransferType::II] {
        if plan.spec.markers.iter().any(|m| m.kind == kind) {
            rows.push(Row::new(
                Sample::Marker(marker_look(kind), MARKER_RADIUS_PX),
                format!("Marked transfer, Type {kind}"),
            ));
        }
    }
    rows
}

/// "zero revolutions", "1 revolution, left branch" and so on.
fn layer_name(grid: &Grid, layer: usize) -> String {
    match grid.layers.get(layer) {
        Some(l) if l.revs == 0 => "zero revolutions".to_string(),
        Some(l) => {
            let branch = match l.branch {
                Branch::Left => ", left branch",
                Branch::Right => ", right branch",
                Branch::Single => "",
            };
            let s = if l.revs == 1 { "" } else { "s" };
            format!("{} revolution{s}{branch}", l.revs)
        }
        None => String::new(),
    }
}
