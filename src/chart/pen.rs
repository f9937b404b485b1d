//! The drawing primitives every chart uses: a [`Pen`] takes logical px
//! (the layout's units) and draws with plotters on any backend, scaling
//! coordinates, strokes, dashes and fonts to the backend's px.

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};
use plotters::style::{FontStyle, FontTransform};

use super::geometry::{dashes, Map, Rect};
use super::style::{
    Line, CAPTION, CAPTION_TEXT_PX, FONT_FAMILY, FONT_SCALE, FRAME_RGB, FRAME_STROKE_PX,
    GRIDLINE_RGB, INK, MARKER_STROKE_PX, MUTED, SUBTITLE_TEXT_PX, THIN_STROKE_PX, TICK_STROKE_PX,
    TICK_TEXT_PX, TITLE_TEXT_PX,
};

// At the reference size, logical px (chosen by eye; no source).
/// Length of a tick outside the frame.
const TICK_LENGTH_PX: f64 = 7.0;
/// Gap between a tick and its label.
const TICK_LABEL_GAP_PX: f64 = 6.0;
use super::{draw_err, ChartError};
use crate::transfer::TransferType;

/// One drawing surface: logical px in, backend px out.
pub(crate) struct Pen<'a, DB: DrawingBackend> {
    pub(crate) area: &'a DrawingArea<DB, Shift>,
    /// Backend px per logical px.
    pub(crate) s: f64,
    /// Scale of strokes, dashes and text (the layout's `k`).
    pub(crate) k: f64,
    /// The backend draws dashes itself (SVG, via `stroke-dasharray`).
    pub(crate) native_dash: bool,
}

/// How a marker looks: its shape follows the Type, its fill the state.
#[derive(Debug, Clone, Copy)]
pub(crate) struct MarkerLook {
    /// Type I: a circle; Type II: a triangle pointing up.
    pub(crate) kind: TransferType,
    /// Fill colour; `None` draws the outline only (hollow).
    pub(crate) fill: Option<RGBColor>,
    /// Outline colour.
    pub(crate) edge: RGBColor,
    /// Outline stroke, logical px.
    pub(crate) edge_px: f64,
}

impl MarkerLook {
    /// A filled marker of `fill` outlined in ink.
    pub(crate) fn filled(kind: TransferType, fill: RGBColor) -> MarkerLook {
        MarkerLook {
            kind,
            fill: Some(fill),
            edge: INK,
            edge_px: MARKER_STROKE_PX,
        }
    }
}

impl<DB: DrawingBackend> Pen<'_, DB> {
    /// A point in logical px as backend px.
    pub(crate) fn at(&self, p: (f64, f64)) -> (i32, i32) {
        ((p.0 * self.s).round() as i32, (p.1 * self.s).round() as i32)
    }

    fn stroke(&self, colour: RGBColor, width_px: f64) -> ShapeStyle {
        ShapeStyle {
            color: colour.to_rgba(),
            filled: false,
            stroke_width: ((width_px * self.k * self.s).round() as u32).max(1),
        }
    }

    /// A polyline in logical px, solid or dashed (`dash_px` at the
    /// reference size, scaled by `k`).
    pub(crate) fn line(
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
    pub(crate) fn kind_line(&self, pts: &[(f64, f64)], kind: Line) -> Result<(), ChartError> {
        self.line(pts, kind.colour(), kind.width_px(), kind.dash_px())
    }

    /// A filled polygon in logical px.
    pub(crate) fn fill(&self, pts: &[(f64, f64)], colour: RGBColor) -> Result<(), ChartError> {
        if pts.len() < 3 {
            return Ok(());
        }
        let v: Vec<(i32, i32)> = pts.iter().map(|&p| self.at(p)).collect();
        self.area
            .draw(&Polygon::new(v, colour.filled()))
            .map_err(draw_err)
    }

    /// A filled rectangle, optionally with a border `(colour, width_px)`.
    pub(crate) fn rect(
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

    /// A marker of size `r` logical px (a circle's radius; a triangle of
    /// the same area) centred on `p`.
    pub(crate) fn marker(&self, p: (f64, f64), r: f64, look: MarkerLook) -> Result<(), ChartError> {
        let outline: Vec<(f64, f64)> = match look.kind {
            TransferType::I => (0..=32)
                .map(|i| {
                    let a = f64::from(i) * std::f64::consts::TAU / 32.0;
                    (p.0 + r * a.cos(), p.1 + r * a.sin())
                })
                .collect(),
            TransferType::II => {
                // Equilateral, centroid on p, area pi r^2: side
                // a = r sqrt(4 pi / sqrt 3), circumradius a / sqrt 3.
                let side = r * (4.0 * std::f64::consts::PI / 3f64.sqrt()).sqrt();
                let rc = side / 3f64.sqrt();
                let v = |deg: f64| {
                    let a = deg.to_radians();
                    (p.0 + rc * a.cos(), p.1 - rc * a.sin())
                };
                vec![v(90.0), v(210.0), v(330.0), v(90.0)]
            }
        };
        if let Some(fill) = look.fill {
            self.fill(&outline, fill)?;
        }
        self.line(&outline, look.edge, look.edge_px, None)
    }

    fn font(&self, size_px: f64) -> FontDesc<'static> {
        FontDesc::new(
            FontFamily::Name(FONT_FAMILY),
            size_px * FONT_SCALE * self.k * self.s,
            FontStyle::Normal,
        )
    }

    /// Text anchored at `p` (logical px); `size_px` is scaled by `k`.
    pub(crate) fn text(
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

    /// Text turned a quarter left (reading upwards), centred on `p`.
    pub(crate) fn text_up(
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
    pub(crate) fn text_size(&self, text: &str, size_px: f64) -> Result<(f64, f64), ChartError> {
        let style = TextStyle::from(self.font(size_px));
        let (w, h) = self
            .area
            .estimate_text_size(text, &style)
            .map_err(draw_err)?;
        Ok((f64::from(w) / self.s, f64::from(h) / self.s))
    }

    /// The box of `text` with `pad` (x, y) logical px around it, scaled.
    pub(crate) fn text_box(
        &self,
        text: &str,
        size_px: f64,
        pad: (f64, f64),
    ) -> Result<(f64, f64), ChartError> {
        let (tw, th) = self.text_size(text, size_px)?;
        Ok((tw + pad.0 * self.k, th + pad.1 * self.k))
    }

    /// Grid lines of a plot at the ticks `x` (data across) and `y` (up).
    pub(crate) fn gridlines(&self, map: &Map, x: &[f64], y: &[f64]) -> Result<(), ChartError> {
        let plot = map.plot;
        for &t in x {
            let px = map.px(t);
            self.line(
                &[(px, plot.y0), (px, plot.y1)],
                GRIDLINE_RGB,
                THIN_STROKE_PX,
                None,
            )?;
        }
        for &t in y {
            let py = map.py(t);
            self.line(
                &[(plot.x0, py), (plot.x1, py)],
                GRIDLINE_RGB,
                THIN_STROKE_PX,
                None,
            )?;
        }
        Ok(())
    }

    /// The plot's frame, and ticks with their labels below it (`x`) and
    /// left of it (`y`): `(position in data, label)`.
    pub(crate) fn frame_and_ticks(
        &self,
        map: &Map,
        x: &[(f64, String)],
        y: &[(f64, String)],
    ) -> Result<(), ChartError> {
        let (plot, k) = (map.plot, self.k);
        let corners = [
            (plot.x0, plot.y0),
            (plot.x1, plot.y0),
            (plot.x1, plot.y1),
            (plot.x0, plot.y1),
            (plot.x0, plot.y0),
        ];
        self.line(&corners, FRAME_RGB, FRAME_STROKE_PX, None)?;
        let tick = TICK_LENGTH_PX * k;
        for (t, label) in x {
            let px = map.px(*t);
            let end = plot.y1 + tick;
            self.line(&[(px, plot.y1), (px, end)], FRAME_RGB, TICK_STROKE_PX, None)?;
            self.text(
                label,
                (px, end + TICK_LABEL_GAP_PX * k),
                TICK_TEXT_PX,
                &INK,
                (HPos::Center, VPos::Top),
            )?;
        }
        for (t, label) in y {
            let py = map.py(*t);
            let end = plot.x0 - tick;
            self.line(&[(end, py), (plot.x0, py)], FRAME_RGB, TICK_STROKE_PX, None)?;
            self.text(
                label,
                (end - TICK_LABEL_GAP_PX * k, py),
                TICK_TEXT_PX,
                &INK,
                (HPos::Right, VPos::Center),
            )?;
        }
        Ok(())
    }

    /// Title and subtitle from their tops at `x`, and the caption with
    /// its bottom at `caption_bottom` (logical px).
    pub(crate) fn headings(
        &self,
        (title, subtitle): (&str, &str),
        x: f64,
        (title_top, subtitle_top): (f64, f64),
        caption_bottom: f64,
    ) -> Result<(), ChartError> {
        let top = (HPos::Left, VPos::Top);
        self.text(title, (x, title_top), TITLE_TEXT_PX, &INK, top)?;
        self.text(subtitle, (x, subtitle_top), SUBTITLE_TEXT_PX, &MUTED, top)?;
        self.text(
            CAPTION,
            (x, caption_bottom),
            CAPTION_TEXT_PX,
            &MUTED,
            (HPos::Left, VPos::Bottom),
        )
    }
}
