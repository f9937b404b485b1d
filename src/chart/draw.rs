//! Drawing a [`Plan`] with plotters, generic over the backend (SVG or
//! bitmap), in the order the layers stack: regions, grid lines, lines of
//! constant time of flight, contours, frame and axes, markers and labels,
//! titles and legend.
//!
//! Layout is in logical px of the requested image size; the [`Pen`]
//! scales every quantity (coordinates, strokes, dashes, fonts) to the
//! backend's px.

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};
use plotters::style::{FontStyle, FontTransform};

use super::calendar::date_label_tdb;
use super::geometry::{clip_polygon, dashes, longest, Layout, Map, Placer, Rect};
use super::isolines::Isoline;
use super::levels::format_level;
use super::plan::{Plan, Ticks};
use super::style::{
    Line, AXIS_TITLE_TEXT_PX, C3_RGB, CAPTION, CAPTION_TEXT_PX, FONT_FAMILY, FONT_SCALE, FRAME_RGB,
    FRAME_STROKE_PX, GRIDLINE_RGB, INK, LEGEND_BORDER_RGB, LEGEND_TEXT_PX, LIMIT_RGB,
    LINE_LABEL_TEXT_PX, MARKER_RADIUS_PX, MARKER_RGB, MARKER_STROKE_PX, MARKER_TEXT_PX, MASK_RGB,
    MUTED, PANEL_RGB, PAPER, REGION_TEXT_PX, RIDGE_RGB, SHADE_RGB, SMALL_TEXT_PX, SUBTITLE_TEXT_PX,
    THIN_STROKE_PX, TICK_STROKE_PX, TICK_TEXT_PX, TITLE_TEXT_PX, VINF_RGB,
};
use super::{draw_err, ChartError, Marker};
use crate::lambert::Branch;
use crate::sweep::{Grid, SecondAxis};

// Positions and paddings at the reference size, logical px (chosen by
// eye; no source).
/// Length of a tick outside the frame.
const TICK_LENGTH_PX: f64 = 7.0;
/// Gap between a tick and its label.
const TICK_LABEL_GAP_PX: f64 = 6.0;
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
/// Labels keep this far inside the plot frame.
const LABEL_INSET_PX: f64 = 3.0;
/// A marker keeps labels out of a square this many radii wide.
const MARKER_KEEP_OUT_RADII: f64 = 2.4;
/// Padding of a label's white box around its text (x, y).
const LABEL_PAD_PX: (f64, f64) = (8.0, 4.0);
/// Padding of the Type I/II names' boxes (x, y).
const REGION_LABEL_PAD_PX: (f64, f64) = (10.0, 6.0);
/// Padding of a marker's annotation box (x, y).
const MARKER_BOX_PAD_PX: (f64, f64) = (14.0, 10.0);
/// The legend's left edge right of the plot.
const LEGEND_GAP_PX: f64 = 34.0;
/// The legend's right edge from the image's right edge.
const LEGEND_RIGHT_PX: f64 = 26.0;
/// Height of one legend row.
const LEGEND_ROW_PX: f64 = 40.0;
/// Width of a legend row's line or patch sample.
const LEGEND_SAMPLE_PX: f64 = 46.0;
/// Padding inside the legend box.
const LEGEND_PAD_PX: f64 = 16.0;
/// Room below the rows for the "Solutions" note.
const LEGEND_NOTE_PX: f64 = 34.0;
/// Half the height of a legend patch.
const LEGEND_PATCH_HALF_PX: f64 = 11.0;
/// Gap between a legend sample and its text.
const LEGEND_TEXT_GAP_PX: f64 = 12.0;
/// Legend line samples are this much thicker than the lines they show.
const LEGEND_EXTRA_STROKE_PX: f64 = 0.4;

/// One drawing surface: logical px in, backend px out.
struct Pen<'a, DB: DrawingBackend> {
    area: &'a DrawingArea<DB, Shift>,
    /// Backend px per logical px.
    s: f64,
    /// Scale of strokes and dashes (the layout's `k`).
    k: f64,
    /// The backend draws dashes itself (SVG, via `stroke-dasharray`).
    native_dash: bool,
}

impl<DB: DrawingBackend> Pen<'_, DB> {
    fn at(&self, p: (f64, f64)) -> (i32, i32) {
        ((p.0 * self.s).round() as i32, (p.1 * self.s).round() as i32)
    }

    fn stroke(&self, colour: RGBColor, width_px: f64) -> ShapeStyle {
        ShapeStyle {
            color: colour.to_rgba(),
            filled: false,
            stroke_width: ((width_px * self.k * self.s).round() as u32).max(1),
        }
    }

    /// A polyline in logical px, solid or dashed.
    fn line(
        &self,
        pts: &[(f64, f64)],
        colour: RGBColor,
        width_px: f64,
        dash_px: Option<(f64, f64)>,
    ) -> Result<(), ChartError> {
        if pts.len() < 2 {
            return Ok(());
        }
        let style = self.stroke(colour, width_px);
        match dash_px {
            Some((on, off)) if !self.native_dash => {
                for dash in dashes(pts, on * self.k, off * self.k) {
                    let v: Vec<(i32, i32)> = dash.iter().map(|&p| self.at(p)).collect();
                    self.area
                        .draw(&PathElement::new(v, style))
                        .map_err(draw_err)?;
                }
            }
            _ => {
                let mut v: Vec<(i32, i32)> = Vec::with_capacity(pts.len());
                for &p in pts {
                    let q = self.at(p);
                    if v.last() != Some(&q) {
                        v.push(q);
                    }
                }
                if v.len() >= 2 {
                    self.area
                        .draw(&PathElement::new(v, style))
                        .map_err(draw_err)?;
                }
            }
        }
        Ok(())
    }

    /// A line of one of the chart's kinds.
    fn kind_line(&self, pts: &[(f64, f64)], kind: Line) -> Result<(), ChartError> {
        self.line(pts, kind.colour(), kind.width_px(), kind.dash_px())
    }

    fn fill(&self, pts: &[(f64, f64)], colour: RGBColor) -> Result<(), ChartError> {
        if pts.len() < 3 {
            return Ok(());
        }
        let v: Vec<(i32, i32)> = pts.iter().map(|&p| self.at(p)).collect();
        self.area
            .draw(&Polygon::new(v, colour.filled()))
            .map_err(draw_err)
    }

    fn rect(
        &self,
        r: Rect,
        fill: RGBColor,
        border: Option<(RGBColor, f64)>,
    ) -> Result<(), ChartError> {
        let (a, b) = (self.at((r.x0, r.y0)), self.at((r.x1, r.y1)));
        self.area
            .draw(&Rectangle::new([a, b], fill.filled()))
            .map_err(draw_err)?;
        if let Some((c, w)) = border {
            self.area
                .draw(&Rectangle::new([a, b], self.stroke(c, w)))
                .map_err(draw_err)?;
        }
        Ok(())
    }

    /// A marker: a filled diamond of half-diagonal `r` logical px.
    fn diamond(&self, (x, y): (f64, f64), r: f64) -> Result<(), ChartError> {
        let d = [(x, y - r), (x + r, y), (x, y + r), (x - r, y)];
        self.fill(&d, MARKER_RGB)?;
        self.line(&[d[0], d[1], d[2], d[3], d[0]], INK, MARKER_STROKE_PX, None)
    }

    fn font(&self, size_px: f64) -> FontDesc<'static> {
        FontDesc::new(
            FontFamily::Name(FONT_FAMILY),
            size_px * FONT_SCALE * self.k * self.s,
            FontStyle::Normal,
        )
    }

    /// Text anchored at `p` (logical px); `size_px` is scaled by `k`.
    fn text(
        &self,
        text: &str,
        p: (f64, f64),
        size_px: f64,
        colour: &RGBColor,
        anchor: (HPos, VPos),
    ) -> Result<(), ChartError> {
        let style = TextStyle::from(self.font(size_px))
            .color(colour)
            .pos(Pos::new(anchor.0, anchor.1));
        self.area
            .draw_text(text, &style, self.at(p))
            .map_err(draw_err)
    }

    fn text_up(
        &self,
        text: &str,
        p: (f64, f64),
        size_px: f64,
        colour: &RGBColor,
    ) -> Result<(), ChartError> {
        let style = TextStyle::from(self.font(size_px).transform(FontTransform::Rotate270))
            .color(colour)
            .pos(Pos::new(HPos::Center, VPos::Center));
        self.area
            .draw_text(text, &style, self.at(p))
            .map_err(draw_err)
    }

    /// Width and height of `text`, logical px.
    fn text_size(&self, text: &str, size_px: f64) -> Result<(f64, f64), ChartError> {
        let style = TextStyle::from(self.font(size_px));
        let (w, h) = self
            .area
            .estimate_text_size(text, &style)
            .map_err(draw_err)?;
        Ok((f64::from(w) / self.s, f64::from(h) / self.s))
    }

    /// The box of `text` with `pad` (x, y) logical px around it, scaled.
    fn text_box(
        &self,
        text: &str,
        size_px: f64,
        pad: (f64, f64),
    ) -> Result<(f64, f64), ChartError> {
        let (tw, th) = self.text_size(text, size_px)?;
        Ok((tw + pad.0 * self.k, th + pad.1 * self.k))
    }
}

/// Drawn lines in logical px, each with the text of its label.
type Traced = Vec<(String, Vec<(f64, f64)>)>;

/// The contour families as drawn.
struct Contours {
    ridge: Traced,
    vinf: Traced,
    c3: Traced,
    limit: Traced,
    panel: Traced,
}

/// A label to draw: text centred in a white box.
struct Label {
    text: String,
    centre: (f64, f64),
    colour: RGBColor,
    size_px: f64,
}

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
    gridlines(&pen, &map, &ticks)?;
    let tof = tof_lines(&pen, plan, &map)?;
    let contours = contours(&pen, plan, &map)?;
    axes(&pen, plan, &map, &ticks)?;
    markers_and_labels(&pen, plan, &map, &contours, &tof)?;
    titles(&pen, plan, lay)?;
    legend(&pen, plan, lay)
}

/// The feasible shade, then the blank (no-solution) cells over it.
fn regions<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    plan: &Plan<'_, '_>,
    map: &Map,
) -> Result<(), ChartError> {
    let plot = map.plot;
    for (fill, regions) in [(SHADE_RGB, &plan.shade), (MASK_RGB, &plan.mask)] {
        for (ext, holes) in regions.iter() {
            pen.fill(&clip_polygon(&map.polyline_px(ext), &plot), fill)?;
            for hole in holes {
                pen.fill(&clip_polygon(&map.polyline_px(hole), &plot), PAPER)?;
            }
        }
    }
    Ok(())
}

fn gridlines<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    map: &Map,
    ticks: &Ticks,
) -> Result<(), ChartError> {
    let plot = map.plot;
    for &t in &ticks.x {
        let x = map.px(t);
        pen.line(
            &[(x, plot.y0), (x, plot.y1)],
            GRIDLINE_RGB,
            THIN_STROKE_PX,
            None,
        )?;
    }
    for &t in &ticks.y {
        let y = map.py(t);
        pen.line(
            &[(plot.x0, y), (plot.x1, y)],
            GRIDLINE_RGB,
            THIN_STROKE_PX,
            None,
        )?;
    }
    Ok(())
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

/// One contour family; `text` prints a level for its label.
fn trace<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    map: &Map,
    lines: &[Isoline],
    kind: Line,
    text: impl Fn(f64) -> String,
) -> Result<Traced, ChartError> {
    let mut out = Vec::new();
    for l in lines {
        let text = text(l.level);
        for piece in &l.pieces {
            let px = map.polyline_px(piece);
            pen.kind_line(&px, kind)?;
            out.push((text.clone(), px));
        }
    }
    Ok(out)
}

/// The ridge, v-infinity, C3, the C3 limit and a panel's family, in that
/// order.
fn contours<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    plan: &Plan<'_, '_>,
    map: &Map,
) -> Result<Contours, ChartError> {
    let ridge = trace(pen, map, &plan.ridge, Line::Ridge, format_level)?;
    let vinf = trace(pen, map, &plan.vinf, Line::Vinf, format_level)?;
    let c3 = trace(pen, map, &plan.c3, Line::C3, format_level)?;
    let limit = trace(pen, map, &plan.limit, Line::Limit, format_level)?;
    let panel = match &plan.panel {
        Some((panel, lines)) => trace(pen, map, lines, Line::Panel, |l| panel.level_text(l))?,
        None => Vec::new(),
    };
    Ok(Contours {
        ridge,
        vinf,
        c3,
        limit,
        panel,
    })
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
    pen.line(
        &[
            (plot.x0, plot.y0),
            (plot.x1, plot.y0),
            (plot.x1, plot.y1),
            (plot.x0, plot.y1),
            (plot.x0, plot.y0),
        ],
        FRAME_RGB,
        FRAME_STROKE_PX,
        None,
    )?;
    let tick = TICK_LENGTH_PX * k;
    for &t in &ticks.x {
        let x = map.px(t);
        let end = plot.y1 + tick;
        pen.line(&[(x, plot.y1), (x, end)], FRAME_RGB, TICK_STROKE_PX, None)?;
        pen.text(
            &date_label_tdb(t),
            (x, end + TICK_LABEL_GAP_PX * k),
            TICK_TEXT_PX,
            &INK,
            (HPos::Center, VPos::Top),
        )?;
    }
    for &t in &ticks.y {
        let y = map.py(t);
        let end = plot.x0 - tick;
        pen.line(&[(end, y), (plot.x0, y)], FRAME_RGB, TICK_STROKE_PX, None)?;
        let text = match second {
            SecondAxis::Arrival => date_label_tdb(t),
            SecondAxis::TimeOfFlight => format_level(t),
        };
        pen.text(
            &text,
            (end - TICK_LABEL_GAP_PX * k, y),
            TICK_TEXT_PX,
            &INK,
            (HPos::Right, VPos::Center),
        )?;
    }
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

/// Markers with their annotation boxes, and the labels of contours, of
/// the Type I/II regions and of the time-of-flight lines, placed greedily
/// without overlaps: markers first, then their boxes, then the labels in
/// that order.
fn markers_and_labels<DB: DrawingBackend>(
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
    let mut boxed: Vec<(Rect, &str)> = Vec::new();
    for (m, p) in &marks {
        let size = pen.text_box(&m.label, MARKER_TEXT_PX, MARKER_BOX_PAD_PX)?;
        if let Some(r) = placer.beside_point(*p, size, k) {
            boxed.push((r, &m.label));
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
    for (_, p) in &marks {
        pen.diamond(*p, r_mark)?;
    }
    for (r, text) in &boxed {
        pen.rect(*r, PAPER, Some((INK, THIN_STROKE_PX)))?;
        pen.text(
            text,
            ((r.x0 + r.x1) / 2.0, (r.y0 + r.y1) / 2.0),
            MARKER_TEXT_PX,
            &INK,
            (HPos::Center, VPos::Center),
        )?;
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

/// Title, subtitle and caption.
fn titles<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    plan: &Plan<'_, '_>,
    lay: &Layout,
) -> Result<(), ChartError> {
    let (x0, k) = (lay.plot.x0, lay.k);
    pen.text(
        &plan.title,
        (x0, TITLE_TOP_PX * k),
        TITLE_TEXT_PX,
        &INK,
        (HPos::Left, VPos::Top),
    )?;
    pen.text(
        &plan.spec.subtitle,
        (x0, SUBTITLE_TOP_PX * k),
        SUBTITLE_TEXT_PX,
        &MUTED,
        (HPos::Left, VPos::Top),
    )?;
    pen.text(
        CAPTION,
        (x0, lay.h - CAPTION_BOTTOM_PX * k),
        CAPTION_TEXT_PX,
        &MUTED,
        (HPos::Left, VPos::Bottom),
    )
}

/// How the legend shows one row's item.
enum Sample {
    Line(Line),
    /// A filled patch, optionally edged with a line kind.
    Patch(RGBColor, Option<Line>),
    Marker,
}

/// The legend's rows: what the chart draws, in a fixed order.
fn legend_rows(plan: &Plan<'_, '_>) -> Vec<(Sample, String)> {
    let spec = plan.spec;
    let mut rows: Vec<(Sample, String)> = match &plan.panel {
        None => vec![
            (Sample::Line(Line::C3), "Departure C3, km²/s²".to_string()),
            (Sample::Line(Line::Vinf), "Arrival v∞, km/s".to_string()),
        ],
        Some((panel, _)) => vec![(Sample::Line(Line::Panel), panel.legend().to_string())],
    };
    if spec.grid.second_kind == SecondAxis::Arrival {
        rows.push((Sample::Line(Line::Tof), "Time of flight, days".to_string()));
    }
    if plan.ridge.iter().any(|l| !l.pieces.is_empty()) {
        rows.push((
            Sample::Line(Line::Ridge),
            "Type I / II boundary (180°)".to_string(),
        ));
    }
    if let Some(max) = spec
        .max_c3
        .filter(|m| m.is_finite() && plan.panel.is_none())
    {
        rows.push((
            Sample::Patch(SHADE_RGB, Some(Line::Limit)),
            format!("C3 ≤ {} km²/s²", format_level(max)),
        ));
    }
    if !plan.mask.is_empty() {
        rows.push((Sample::Patch(MASK_RGB, None), "No solution".to_string()));
    }
    if !spec.markers.is_empty() {
        rows.push((Sample::Marker, "Marked transfer".to_string()));
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

/// The legend box right of the plot: one row per item drawn, then which
/// solutions the chart shows.
fn legend<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    plan: &Plan<'_, '_>,
    lay: &Layout,
) -> Result<(), ChartError> {
    let k = lay.k;
    let x0 = lay.plot.x1 + LEGEND_GAP_PX * k;
    let x1 = lay.w - LEGEND_RIGHT_PX * k;
    let row = LEGEND_ROW_PX * k;
    let sample_w = LEGEND_SAMPLE_PX * k;
    let rows = legend_rows(plan);
    let y0 = lay.plot.y0;
    let pad = LEGEND_PAD_PX * k;
    let height = pad * 2.0 + row * rows.len() as f64 + LEGEND_NOTE_PX * k;
    pen.rect(
        Rect {
            x0,
            y0,
            x1,
            y1: y0 + height,
        },
        PAPER,
        Some((LEGEND_BORDER_RGB, THIN_STROKE_PX)),
    )?;
    for (n, (sample, text)) in rows.iter().enumerate() {
        let cy = y0 + pad + row * (n as f64 + 0.5);
        let sx = x0 + pad;
        match sample {
            Sample::Line(l) => {
                pen.line(
                    &[(sx, cy), (sx + sample_w, cy)],
                    l.legend_colour(),
                    l.width_px() + LEGEND_EXTRA_STROKE_PX,
                    l.dash_px(),
                )?;
            }
            Sample::Patch(c, edge) => {
                let half = LEGEND_PATCH_HALF_PX * k;
                let r = Rect {
                    x0: sx,
                    y0: cy - half,
                    x1: sx + sample_w,
                    y1: cy + half,
                };
                pen.rect(r, *c, None)?;
                if let Some(l) = edge {
                    pen.line(
                        &[(r.x0, r.y0), (r.x1, r.y0)],
                        l.legend_colour(),
                        l.width_px(),
                        l.dash_px(),
                    )?;
                }
            }
            Sample::Marker => pen.diamond((sx + sample_w / 2.0, cy), MARKER_RADIUS_PX * k)?,
        }
        pen.text(
            text,
            (sx + sample_w + LEGEND_TEXT_GAP_PX * k, cy),
            LEGEND_TEXT_PX,
            &INK,
            (HPos::Left, VPos::Center),
        )?;
    }
    let name = layer_name(plan.spec.grid, plan.spec.layer);
    pen.text(
        &format!("Solutions: {name}"),
        (x0 + pad, y0 + height - pad - 4.0 * k),
        SMALL_TEXT_PX,
        &MUTED,
        (HPos::Left, VPos::Bottom),
    )
}
