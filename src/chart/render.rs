//! Drawing a [`ChartSpec`] with plotters, once for SVG and PNG.
//!
//! Layout is computed in logical pixels of the requested image size; the
//! [`Pen`] scales every quantity (coordinates, strokes, dashes, fonts) to
//! the backend, which is twice the logical size for both formats: the PNG
//! is box-filtered back down (the bitmap backend draws without
//! anti-aliasing), the SVG keeps the doubled `viewBox` and the requested
//! `width`/`height`, which gives it half-pixel coordinates.
//!
//! In the SVG each data line carries a `class` (`c3`, `vinf`, `tof`,
//! `ridge`, `c3max`, `panel`; `legend` for the legend's samples) so that
//! tools and tests can find them; dashes are `stroke-dasharray` there and
//! drawn dash by dash in the PNG.

use std::sync::OnceLock;

use contour::ContourBuilder;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};
use plotters::style::{FontStyle, FontTransform};

use super::calendar::{civil_from_days_j2000, date_label_tdb, days_j2000_from_civil};
use super::isolines::{extend_one_sample, isolines, Isoline, Lattice};
use super::levels::{c3_levels, explicit_levels, format_level, nice_ceil, vinf_levels};
use super::panel::Panel;
use super::{ChartError, ChartSpec};
use crate::lambert::Branch;
use crate::sweep::{CellStatus, Grid, SecondAxis};
use crate::transfer::Endpoints;

/// Default PNG width, px.
pub const DEFAULT_WIDTH_PX: u32 = 1800;
/// Default PNG height, px.
pub const DEFAULT_HEIGHT_PX: u32 = 1350;
/// Backend pixels per logical pixel.
const SUPERSAMPLE: u32 = 2;
/// The layout's reference size, logical px; other sizes scale from it.
const REF_W: f64 = 1800.0;
const REF_H: f64 = 1350.0;
/// Image sides accepted, px.
const MIN_SIDE_PX: u32 = 200;
const MAX_SIDE_PX: u32 = 10_000;

/// DejaVu Sans (Bitstream Vera licence; see fonts/LICENSE-DejaVu.txt).
static FONT_TTF: &[u8] = include_bytes!("fonts/DejaVuSans.ttf");
const FAMILY: &str = "sans-serif";
/// Font sizes in this file are nominal; plotters' size is this much larger
/// for text that reads at design-review distance.
const FONT_SCALE: f64 = 1.18;

/// Caption printed under every chart.
pub(crate) const CAPTION: &str =
    "patched-conic, mean-element ephemerides; preliminary design figures";

// Palette: blue and orange stay apart under the common colour-vision
// deficiencies; the other line kinds differ by dash pattern as well as hue.
pub(crate) const INK: RGBColor = RGBColor(0x22, 0x22, 0x2a);
pub(crate) const MUTED: RGBColor = RGBColor(0x5c, 0x5f, 0x66);
pub(crate) const C3_RGB: RGBColor = RGBColor(0x1d, 0x3f, 0x8f);
pub(crate) const VINF_RGB: RGBColor = RGBColor(0xc2, 0x5a, 0x00);
pub(crate) const TOF_RGB: RGBColor = RGBColor(0x8c, 0x8c, 0x8c);
pub(crate) const RIDGE_RGB: RGBColor = RGBColor(0x6a, 0x2c, 0x91);
pub(crate) const LIMIT_RGB: RGBColor = RGBColor(0x1f, 0x7a, 0x5c);
pub(crate) const SHADE_RGB: RGBColor = RGBColor(0xd9, 0xf0, 0xe3);
pub(crate) const MASK_RGB: RGBColor = RGBColor(0xe3, 0xe3, 0xe3);
pub(crate) const GRIDLINE_RGB: RGBColor = RGBColor(0xea, 0xea, 0xea);
pub(crate) const FRAME_RGB: RGBColor = RGBColor(0x44, 0x44, 0x44);
pub(crate) const MARKER_RGB: RGBColor = RGBColor(0xff, 0xc8, 0x2e);
/// A panel's single contour family: a deep teal, away from the C3 blue,
/// the v-infinity orange, the ridge purple and the limit green in hue and
/// lightness.
pub(crate) const PANEL_RGB: RGBColor = RGBColor(0x00, 0x7d, 0x8a);
pub(crate) const PAPER: RGBColor = RGBColor(0xff, 0xff, 0xff);

/// The kinds of line the chart draws.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Line {
    C3,
    Vinf,
    Tof,
    Ridge,
    Limit,
    /// The contour family of a panel.
    Panel,
}

impl Line {
    const ALL: [Line; 6] = [
        Line::C3,
        Line::Vinf,
        Line::Tof,
        Line::Ridge,
        Line::Limit,
        Line::Panel,
    ];

    fn class(self) -> &'static str {
        match self {
            Line::C3 => "c3",
            Line::Vinf => "vinf",
            Line::Tof => "tof",
            Line::Ridge => "ridge",
            Line::Limit => "c3max",
            Line::Panel => "panel",
        }
    }

    fn colour(self) -> RGBColor {
        match self {
            Line::C3 => C3_RGB,
            Line::Vinf => VINF_RGB,
            Line::Tof => TOF_RGB,
            Line::Ridge => RIDGE_RGB,
            Line::Limit => LIMIT_RGB,
            Line::Panel => PANEL_RGB,
        }
    }

    /// The same hue one step off in blue: legend samples look the same but
    /// are not counted as data lines in the SVG.
    fn legend_colour(self) -> RGBColor {
        let RGBColor(r, g, b) = self.colour();
        RGBColor(r, g, if b == 0xff { 0xfe } else { b + 1 })
    }

    /// Stroke width, logical px.
    fn width_px(self) -> f64 {
        match self {
            Line::C3 => 1.6,
            Line::Vinf => 1.5,
            Line::Tof => 1.0,
            Line::Ridge => 2.2,
            Line::Limit => 2.4,
            Line::Panel => 1.6,
        }
    }

    /// Dash (on, off), logical px; `None` = solid.
    fn dash_px(self) -> Option<(f64, f64)> {
        match self {
            Line::C3 | Line::Limit | Line::Panel => None,
            Line::Vinf => Some((11.0, 6.0)),
            Line::Tof => Some((2.0, 5.0)),
            Line::Ridge => Some((22.0, 5.0)),
        }
    }
}

/// A rectangle in logical px, y down.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct Rect {
    pub(crate) x0: f64,
    pub(crate) y0: f64,
    pub(crate) x1: f64,
    pub(crate) y1: f64,
}

impl Rect {
    fn centred(cx: f64, cy: f64, w: f64, h: f64) -> Rect {
        Rect {
            x0: cx - w / 2.0,
            y0: cy - h / 2.0,
            x1: cx + w / 2.0,
            y1: cy + h / 2.0,
        }
    }
    fn overlaps(&self, o: &Rect) -> bool {
        self.x0 < o.x1 && o.x0 < self.x1 && self.y0 < o.y1 && o.y0 < self.y1
    }
    fn contains(&self, o: &Rect) -> bool {
        o.x0 >= self.x0 && o.x1 <= self.x1 && o.y0 >= self.y0 && o.y1 <= self.y1
    }
    fn inset(&self, d: f64) -> Rect {
        Rect {
            x0: self.x0 + d,
            y0: self.y0 + d,
            x1: self.x1 - d,
            y1: self.y1 - d,
        }
    }
}

/// Data coordinates to logical px.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Map {
    pub(crate) xmin: f64,
    pub(crate) xmax: f64,
    pub(crate) ymin: f64,
    pub(crate) ymax: f64,
    pub(crate) plot: Rect,
}

impl Map {
    pub(crate) fn px(&self, x: f64) -> f64 {
        self.plot.x0 + (x - self.xmin) / (self.xmax - self.xmin) * (self.plot.x1 - self.plot.x0)
    }
    pub(crate) fn py(&self, y: f64) -> f64 {
        self.plot.y1 - (y - self.ymin) / (self.ymax - self.ymin) * (self.plot.y1 - self.plot.y0)
    }
    pub(crate) fn data_x(&self, px: f64) -> f64 {
        self.xmin + (px - self.plot.x0) / (self.plot.x1 - self.plot.x0) * (self.xmax - self.xmin)
    }
    pub(crate) fn data_y(&self, py: f64) -> f64 {
        self.ymin + (self.plot.y1 - py) / (self.plot.y1 - self.plot.y0) * (self.ymax - self.ymin)
    }
}

/// Where everything goes, logical px.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Layout {
    pub(crate) w: f64,
    pub(crate) h: f64,
    /// Scale of fonts, strokes and margins relative to 1800 x 1350.
    pub(crate) k: f64,
    pub(crate) plot: Rect,
}

pub(crate) fn layout(width_px: u32, height_px: u32) -> Layout {
    let (w, h) = (f64::from(width_px), f64::from(height_px));
    let k = (w / REF_W).min(h / REF_H);
    Layout {
        w,
        h,
        k,
        plot: Rect {
            x0: 175.0 * k,
            y0: 128.0 * k,
            x1: w - 410.0 * k,
            y1: h - 150.0 * k,
        },
    }
}

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

pub(crate) fn draw_err<E: std::fmt::Display>(e: E) -> ChartError {
    ChartError::Draw(e.to_string())
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
                let scaled: Vec<(f64, f64)> = pts.iter().map(|p| (p.0, p.1)).collect();
                for dash in dashes(&scaled, on * self.k, off * self.k) {
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

    fn font(&self, size_px: f64) -> FontDesc<'static> {
        FontDesc::new(
            FontFamily::Name(FAMILY),
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
}

/// Splits a polyline into dashes of `on` px separated by gaps of `off` px.
fn dashes(pts: &[(f64, f64)], on: f64, off: f64) -> Vec<Vec<(f64, f64)>> {
    let mut out = Vec::new();
    if pts.len() < 2 || on <= 0.0 || off < 0.0 {
        return out;
    }
    let mut cur = vec![pts[0]];
    let mut drawing = true;
    let mut left = on;
    for w in pts.windows(2) {
        let mut pos = w[0];
        let b = w[1];
        loop {
            let rem = ((b.0 - pos.0).powi(2) + (b.1 - pos.1).powi(2)).sqrt();
            if rem >= left && rem > 0.0 {
                let t = left / rem;
                let p = (pos.0 + (b.0 - pos.0) * t, pos.1 + (b.1 - pos.1) * t);
                if drawing {
                    cur.push(p);
                    out.push(std::mem::take(&mut cur));
                } else {
                    cur = vec![p];
                }
                drawing = !drawing;
                left = if drawing { on } else { off };
                pos = p;
            } else {
                left -= rem;
                if drawing {
                    cur.push(b);
                }
                break;
            }
        }
    }
    if drawing && cur.len() >= 2 {
        out.push(cur);
    }
    out
}

/// Drops points closer than `min_px` to the previous kept point (the last
/// point is always kept).
fn simplify(pts: &[(f64, f64)], min_px: f64) -> Vec<(f64, f64)> {
    let mut out: Vec<(f64, f64)> = Vec::with_capacity(pts.len());
    let min2 = min_px * min_px;
    for (i, &p) in pts.iter().enumerate() {
        match out.last() {
            Some(&q) if i + 1 < pts.len() => {
                if (p.0 - q.0).powi(2) + (p.1 - q.1).powi(2) >= min2 {
                    out.push(p);
                }
            }
            _ => out.push(p),
        }
    }
    out
}

/// Sutherland-Hodgman clipping of a polygon to a rectangle.
fn clip_polygon(pts: &[(f64, f64)], r: &Rect) -> Vec<(f64, f64)> {
    type Edge = (
        fn(&(f64, f64), &Rect) -> bool,
        fn((f64, f64), (f64, f64), &Rect) -> (f64, f64),
    );
    fn lerp_x(a: (f64, f64), b: (f64, f64), x: f64) -> (f64, f64) {
        let t = (x - a.0) / (b.0 - a.0);
        (x, a.1 + t * (b.1 - a.1))
    }
    fn lerp_y(a: (f64, f64), b: (f64, f64), y: f64) -> (f64, f64) {
        let t = (y - a.1) / (b.1 - a.1);
        (a.0 + t * (b.0 - a.0), y)
    }
    let edges: [Edge; 4] = [
        (|p, r| p.0 >= r.x0, |a, b, r| lerp_x(a, b, r.x0)),
        (|p, r| p.0 <= r.x1, |a, b, r| lerp_x(a, b, r.x1)),
        (|p, r| p.1 >= r.y0, |a, b, r| lerp_y(a, b, r.y0)),
        (|p, r| p.1 <= r.y1, |a, b, r| lerp_y(a, b, r.y1)),
    ];
    let mut poly = pts.to_vec();
    for (inside, cut) in edges {
        if poly.is_empty() {
            break;
        }
        let input = std::mem::take(&mut poly);
        let mut prev = input[input.len() - 1];
        for &cur in &input {
            match (inside(&cur, r), inside(&prev, r)) {
                (true, true) => poly.push(cur),
                (true, false) => {
                    poly.push(cut(prev, cur, r));
                    poly.push(cur);
                }
                (false, true) => poly.push(cut(prev, cur, r)),
                (false, false) => {}
            }
            prev = cur;
        }
    }
    poly
}

/// Rectangles already taken by labels and markers.
struct Placer {
    bounds: Rect,
    taken: Vec<Rect>,
}

impl Placer {
    fn try_take(&mut self, r: Rect) -> bool {
        if !self.bounds.contains(&r) || self.taken.iter().any(|t| t.overlaps(&r)) {
            return false;
        }
        self.taken.push(r);
        true
    }
}

/// The layer's fields, row-major on the chart's lattice (x = departure).
struct Fields {
    lattice: Lattice,
    c3: Vec<f64>,
    vinf: Vec<f64>,
    /// Transfer angle - 180 deg within 90 deg of 180, NaN elsewhere.
    ridge: Vec<f64>,
    angle_deg: Vec<f64>,
    masked: Vec<bool>,
}

fn fields(grid: &Grid, layer: usize) -> Result<Fields, ChartError> {
    if layer >= grid.layers.len() {
        return Err(ChartError::NoSuchLayer {
            layer,
            layers: grid.layers.len(),
        });
    }
    let (nx, ny) = (grid.depart.count, grid.second.count);
    let lattice = Lattice {
        nx,
        ny,
        x0: grid.depart.start_days,
        dx: grid.depart.step_days,
        y0: grid.second.start_days,
        dy: grid.second.step_days,
    };
    let n = nx * ny;
    if nx < 2 || ny < 2 {
        return Err(ChartError::GridTooSmall { nx, ny });
    }
    let needed = grid.index(nx - 1, ny - 1, layer) + 1;
    let arrays = [
        grid.vinf_depart_km_s.len(),
        grid.vinf_arrive_km_s.len(),
        grid.transfer_angle_deg.len(),
        grid.status.len(),
    ];
    if let Some(&got) = arrays.iter().find(|&&len| len < needed) {
        return Err(ChartError::FieldSize {
            expected: nx * ny * grid.layers.len(),
            got,
        });
    }
    let mut f = Fields {
        lattice,
        c3: vec![f64::NAN; n],
        vinf: vec![f64::NAN; n],
        ridge: vec![f64::NAN; n],
        angle_deg: vec![f64::NAN; n],
        masked: vec![true; n],
    };
    for i in 0..nx {
        for j in 0..ny {
            let idx = grid.index(i, j, layer);
            if grid.status[idx] != CellStatus::Ok as u8 {
                continue;
            }
            let k = j * nx + i;
            let c3 = grid.c3_km2_s2(idx);
            let vinf = grid.vinf_arrive_km_s[idx];
            let angle = f64::from(grid.transfer_angle_deg[idx]);
            f.masked[k] = false;
            f.c3[k] = if c3.is_finite() { c3 } else { f64::NAN };
            f.vinf[k] = if vinf.is_finite() { vinf } else { f64::NAN };
            if angle.is_finite() {
                f.angle_deg[k] = angle;
                // Only the 180-degree crossing: the 0/360 wrap is NaN here.
                if (angle - 180.0).abs() < 90.0 {
                    f.ridge[k] = angle - 180.0;
                }
            }
        }
    }
    Ok(f)
}

/// A filled region in data coordinates: exterior ring and holes.
type Region = (Vec<(f64, f64)>, Vec<Vec<(f64, f64)>>);

/// Filled regions (polygons with holes) where `values >= threshold`,
/// in data coordinates. NaN samples count as below.
fn regions(values: &[f64], lat: &Lattice, threshold: f64) -> Result<Vec<Region>, ChartError> {
    let v: Vec<f64> = values
        .iter()
        .map(|&x| if x.is_finite() { x } else { f64::MIN })
        .collect();
    let contours = ContourBuilder::new(lat.nx, lat.ny, true)
        .x_origin(lat.x0 - 0.5 * lat.dx)
        .y_origin(lat.y0 - 0.5 * lat.dy)
        .x_step(lat.dx)
        .y_step(lat.dy)
        .contours(&v, &[threshold])
        .map_err(|e| ChartError::Contour(format!("{:?}", e.kind())))?;
    let mut out = Vec::new();
    for c in &contours {
        for poly in c.geometry().0.iter() {
            let ext = poly.exterior().coords().map(|c| (c.x, c.y)).collect();
            let holes = poly
                .interiors()
                .iter()
                .map(|ls| ls.coords().map(|c| (c.x, c.y)).collect())
                .collect();
            out.push((ext, holes));
        }
    }
    Ok(out)
}

/// Tick positions (days past J2000 TDB) at calendar boundaries, at most
/// `max_ticks` of them.
fn date_ticks(lo: f64, hi: f64, max_ticks: usize) -> Vec<f64> {
    let (y0, m0, _) = civil_from_days_j2000(lo);
    let (y1, m1, _) = civil_from_days_j2000(hi);
    let first = y0 * 12 + i64::from(m0) - 1;
    let last = y1 * 12 + i64::from(m1) - 1;
    for step in [1i64, 2, 3, 4, 6, 12, 24, 60, 120] {
        let mut ticks = Vec::new();
        for mi in first..=last {
            if mi.rem_euclid(step) != 0 {
                continue;
            }
            let d = days_j2000_from_civil(mi.div_euclid(12), (mi.rem_euclid(12) + 1) as u32, 1);
            if d >= lo - 1e-9 && d <= hi + 1e-9 {
                ticks.push(d);
            }
        }
        if ticks.len() <= max_ticks && (ticks.len() >= 3 || step == 1) {
            if ticks.len() >= 3 {
                return ticks;
            }
            break;
        }
    }
    // Short spans: every n days at midnight TDB.
    let span = hi - lo;
    let step = [1.0, 2.0, 5.0, 7.0, 10.0, 15.0, 30.0]
        .into_iter()
        .find(|s| span / s <= max_ticks as f64)
        .unwrap_or(30.0);
    let mut t = ((lo + 0.5) / step).ceil() * step - 0.5;
    let mut ticks = Vec::new();
    while t <= hi + 1e-9 {
        ticks.push(t);
        t += step;
    }
    ticks
}

/// Round-number ticks between `lo` and `hi`, at most about `max_ticks`.
fn number_ticks(lo: f64, hi: f64, max_ticks: usize) -> Vec<f64> {
    let step = nice_ceil((hi - lo) / max_ticks.max(1) as f64);
    let mut t = (lo / step).ceil() * step;
    let mut out = Vec::new();
    while t <= hi + 1e-9 * step {
        out.push(t);
        t += step;
    }
    out
}

/// A field whose 0.5 isoline outlines the masked samples: every masked
/// sample is above 0.5 and every unmasked one below, while a 3 x 3 box
/// average sets how far above or below, so that staircase edges of the
/// mask come out as straight diagonals instead of steps.
fn mask_field(masked: &[bool], nx: usize, ny: usize) -> Vec<f64> {
    let mut out = vec![0.0; nx * ny];
    for iy in 0..ny {
        for ix in 0..nx {
            let mut sum = 0.0;
            let mut n = 0.0;
            for jy in iy.saturating_sub(1)..=(iy + 1).min(ny - 1) {
                for jx in ix.saturating_sub(1)..=(ix + 1).min(nx - 1) {
                    sum += if masked[jy * nx + jx] { 1.0 } else { 0.0 };
                    n += 1.0;
                }
            }
            let avg: f64 = sum / n;
            out[iy * nx + ix] = if masked[iy * nx + ix] {
                avg.max(0.55)
            } else {
                avg.min(0.45)
            };
        }
    }
    out
}

/// What a chart contours.
#[derive(Debug, Clone, Copy)]
pub(crate) enum Contours<'e> {
    /// The transfer-window chart: C3, arrival v-infinity, the C3 limit.
    Window,
    /// One panel quantity; the endpoints turn excess speeds into delta-v.
    Panel(Panel, &'e Endpoints),
}

/// Everything that decides what is drawn, shared by both formats.
struct Plan<'s, 'g> {
    spec: &'s ChartSpec<'g>,
    /// The title as drawn.
    title: String,
    fields: Fields,
    map: Map,
    c3: Vec<Isoline>,
    vinf: Vec<Isoline>,
    /// The panel drawn and its lines (`None` on the main chart).
    panel: Option<(Panel, Vec<Isoline>)>,
    ridge: Vec<Isoline>,
    limit: Vec<Isoline>,
    shade: Vec<Region>,
    mask: Vec<Region>,
}

/// The panel's field on the chart's lattice: the quantity at every solved
/// cell, NaN elsewhere.
fn panel_field(spec: &ChartSpec<'_>, lat: &Lattice, panel: Panel, ends: &Endpoints) -> Vec<f64> {
    let grid = spec.grid;
    let mut out = vec![f64::NAN; lat.nx * lat.ny];
    for i in 0..lat.nx {
        for j in 0..lat.ny {
            let idx = grid.index(i, j, spec.layer);
            if grid.status[idx] != CellStatus::Ok as u8 {
                continue;
            }
            let v = panel.value(grid, idx, ends);
            if v.is_finite() {
                out[j * lat.nx + i] = v;
            }
        }
    }
    out
}

fn plan<'s, 'g>(
    spec: &'s ChartSpec<'g>,
    lay: &Layout,
    contours: Contours<'_>,
) -> Result<Plan<'s, 'g>, ChartError> {
    let fields = fields(spec.grid, spec.layer)?;
    let lat = fields.lattice;
    let ridge = isolines(&fields.ridge, &lat, &[0.0])?;
    let (title, c3, vinf, panel, max_c3) = match contours {
        Contours::Window => {
            let c3_lv = match &spec.c3_levels {
                Some(v) => explicit_levels(v),
                None => c3_levels(fields.c3.iter().copied()),
            };
            let vinf_lv = match &spec.vinf_levels {
                Some(v) => explicit_levels(v),
                None => vinf_levels(fields.vinf.iter().copied()),
            };
            // A C3 level equal to the shaded limit is drawn once, as the limit.
            let c3_lv: Vec<f64> = match spec.max_c3 {
                Some(max) => c3_lv
                    .into_iter()
                    .filter(|l| (l - max).abs() > 1e-9 * (1.0 + max.abs()))
                    .collect(),
                None => c3_lv,
            };
            let c3 = isolines(&fields.c3, &lat, &c3_lv)?;
            let vinf = isolines(&fields.vinf, &lat, &vinf_lv)?;
            (spec.title.clone(), c3, vinf, None, spec.max_c3)
        }
        Contours::Panel(panel, ends) => {
            let field = panel_field(spec, &lat, panel, ends);
            let levels = panel.levels(field.iter().copied());
            let lines = isolines(&field, &lat, &levels)?;
            let title = if spec.title.is_empty() {
                panel.title_suffix().to_string()
            } else {
                format!("{} — {}", spec.title, panel.title_suffix())
            };
            (title, Vec::new(), Vec::new(), Some((panel, lines)), None)
        }
    };
    let (limit, shade) = match max_c3 {
        Some(max) if max.is_finite() => {
            let lim = isolines(&fields.c3, &lat, &[max])?;
            // C3 <= max as -C3 >= -max, extended one sample into the mask
            // (the mask is painted over it).
            let neg: Vec<f64> = extend_one_sample(&fields.c3, lat.nx, lat.ny)
                .iter()
                .map(|c| -c)
                .collect();
            (lim, regions(&neg, &lat, -max)?)
        }
        _ => (Vec::new(), Vec::new()),
    };
    let mask_field = mask_field(&fields.masked, lat.nx, lat.ny);
    let mask = if fields.masked.iter().any(|&m| m) {
        regions(&mask_field, &lat, 0.5)?
    } else {
        Vec::new()
    };
    let map = Map {
        xmin: lat.x0,
        xmax: lat.x_last(),
        ymin: lat.y0,
        ymax: lat.y_last(),
        plot: lay.plot,
    };
    Ok(Plan {
        spec,
        title,
        fields,
        map,
        c3,
        vinf,
        panel,
        ridge,
        limit,
        shade,
        mask,
    })
}

impl Plan<'_, '_> {
    fn to_px(&self, pts: &[(f64, f64)]) -> Vec<(f64, f64)> {
        let v: Vec<(f64, f64)> = pts
            .iter()
            .map(|&(x, y)| (self.map.px(x), self.map.py(y)))
            .collect();
        simplify(&v, 0.5)
    }

    fn angle_at_px(&self, p: (f64, f64)) -> Option<f64> {
        let lat = &self.fields.lattice;
        let x = self.map.data_x(p.0);
        let y = self.map.data_y(p.1);
        let ix = ((x - lat.x0) / lat.dx).round();
        let iy = ((y - lat.y0) / lat.dy).round();
        if ix < 0.0 || iy < 0.0 || ix >= lat.nx as f64 || iy >= lat.ny as f64 {
            return None;
        }
        let a = self.fields.angle_deg[iy as usize * lat.nx + ix as usize];
        a.is_finite().then_some(a)
    }
}

/// Arc-length positions along a polyline: the point and the direction.
fn point_at(pts: &[(f64, f64)], cum: &[f64], s: f64) -> ((f64, f64), (f64, f64)) {
    let k = cum.partition_point(|&c| c < s).clamp(1, pts.len() - 1);
    let (a, b) = (pts[k - 1], pts[k]);
    let seg = cum[k] - cum[k - 1];
    let t = if seg > 0.0 {
        ((s - cum[k - 1]) / seg).clamp(0.0, 1.0)
    } else {
        0.0
    };
    let len = seg.max(1e-12);
    (
        (a.0 + t * (b.0 - a.0), a.1 + t * (b.1 - a.1)),
        ((b.0 - a.0) / len, (b.1 - a.1) / len),
    )
}

fn cumulative(pts: &[(f64, f64)]) -> Vec<f64> {
    let mut cum = Vec::with_capacity(pts.len());
    let mut acc = 0.0;
    cum.push(0.0);
    for w in pts.windows(2) {
        acc += ((w[1].0 - w[0].0).powi(2) + (w[1].1 - w[0].1).powi(2)).sqrt();
        cum.push(acc);
    }
    cum
}

/// A label to draw: text centred in a white box.
struct Label {
    text: String,
    centre: (f64, f64),
    colour: RGBColor,
    size_px: f64,
}

const LABEL_PX: f64 = 15.0;

/// Places labels on the pieces of isolines, greedily, without overlaps.
fn place_line_labels<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    placer: &mut Placer,
    pieces: &[(String, Vec<(f64, f64)>)],
    colour: RGBColor,
    k: f64,
    out: &mut Vec<Label>,
) -> Result<(), ChartError> {
    for (text, pts) in pieces {
        if pts.len() < 2 {
            continue;
        }
        let (tw, th) = pen.text_size(text, LABEL_PX)?;
        let (bw, bh) = (tw + 8.0 * k, th + 4.0 * k);
        let cum = cumulative(pts);
        let len = cum[cum.len() - 1];
        if len < 2.5 * bw {
            continue;
        }
        let wanted = ((len / (650.0 * k)).floor() as usize).clamp(1, 3);
        for slot in 0..wanted {
            let centre_t = (slot as f64 + 0.5) / wanted as f64;
            let half = 0.5 / wanted as f64;
            for off in [
                0.0, 0.08, -0.08, 0.16, -0.16, 0.24, -0.24, 0.32, -0.32, 0.4, -0.4,
            ] {
                let t = centre_t + off * half * 2.0;
                if !(0.05..=0.95).contains(&t) || (t - centre_t).abs() > half {
                    continue;
                }
                let (p, _) = point_at(pts, &cum, t * len);
                let r = Rect::centred(p.0, p.1, bw, bh);
                if placer.try_take(r) {
                    out.push(Label {
                        text: text.clone(),
                        centre: p,
                        colour,
                        size_px: LABEL_PX,
                    });
                    break;
                }
            }
        }
    }
    Ok(())
}

/// Draws the whole chart on `area` (logical size `lay.w` x `lay.h`).
fn draw<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    plan: &Plan<'_, '_>,
    lay: &Layout,
    native_dash: bool,
) -> Result<(), ChartError> {
    let k = lay.k;
    let pen = Pen {
        area,
        s: f64::from(SUPERSAMPLE),
        k,
        native_dash,
    };
    let spec = plan.spec;
    let grid = spec.grid;
    let map = &plan.map;
    let plot = lay.plot;
    area.fill(&PAPER).map_err(draw_err)?;

    // 1. Regions: feasible shade, then the blank (no-solution) cells.
    for (fill, regions) in [(SHADE_RGB, &plan.shade), (MASK_RGB, &plan.mask)] {
        for (ext, holes) in regions.iter() {
            pen.fill(&clip_polygon(&plan.to_px(ext), &plot), fill)?;
            for hole in holes {
                pen.fill(&clip_polygon(&plan.to_px(hole), &plot), PAPER)?;
            }
        }
    }

    // 2. Grid lines and ticks.
    let x_ticks = date_ticks(
        map.xmin,
        map.xmax,
        ((plot.x1 - plot.x0) / (150.0 * k)) as usize,
    );
    let y_ticks = match grid.second_kind {
        SecondAxis::Arrival => date_ticks(
            map.ymin,
            map.ymax,
            ((plot.y1 - plot.y0) / (80.0 * k)) as usize,
        ),
        SecondAxis::TimeOfFlight => number_ticks(
            map.ymin,
            map.ymax,
            ((plot.y1 - plot.y0) / (90.0 * k)) as usize,
        ),
    };
    for &t in &x_ticks {
        let x = map.px(t);
        pen.line(&[(x, plot.y0), (x, plot.y1)], GRIDLINE_RGB, 1.0, None)?;
    }
    for &t in &y_ticks {
        let y = map.py(t);
        pen.line(&[(plot.x0, y), (plot.x1, y)], GRIDLINE_RGB, 1.0, None)?;
    }

    // 3. Lines of constant time of flight (arrival-date charts only).
    let mut tof_lines: Vec<(String, Vec<(f64, f64)>)> = Vec::new();
    if grid.second_kind == SecondAxis::Arrival {
        let lo = (map.ymin - map.xmax).max(0.0);
        let hi = map.ymax - map.xmin;
        if hi > lo {
            let step = nice_ceil((hi - lo) / 7.0);
            let mut t = (lo / step).floor() * step + step;
            while t < hi {
                let a = map.xmin.max(map.ymin - t);
                let b = map.xmax.min(map.ymax - t);
                if b > a {
                    let seg = vec![(map.px(a), map.py(a + t)), (map.px(b), map.py(b + t))];
                    pen.line(
                        &seg,
                        Line::Tof.colour(),
                        Line::Tof.width_px(),
                        Line::Tof.dash_px(),
                    )?;
                    tof_lines.push((format!("{} d", format_level(t)), seg));
                }
                t += step;
            }
        }
    }

    // 4. Contours: ridge, v-infinity, C3, the C3 limit.
    let draw_iso = |lines: &[Isoline],
                    kind: Line,
                    out: &mut Vec<(String, Vec<(f64, f64)>)>|
     -> Result<(), ChartError> {
        for l in lines {
            let text = format_level(l.level);
            for piece in &l.pieces {
                let px = plan.to_px(piece);
                pen.line(&px, kind.colour(), kind.width_px(), kind.dash_px())?;
                out.push((text.clone(), px));
            }
        }
        Ok(())
    };
    let mut ridge_px = Vec::new();
    let mut vinf_px = Vec::new();
    let mut c3_px = Vec::new();
    let mut limit_px = Vec::new();
    draw_iso(&plan.ridge, Line::Ridge, &mut ridge_px)?;
    draw_iso(&plan.vinf, Line::Vinf, &mut vinf_px)?;
    draw_iso(&plan.c3, Line::C3, &mut c3_px)?;
    draw_iso(&plan.limit, Line::Limit, &mut limit_px)?;
    let mut panel_px = Vec::new();
    if let Some((panel, lines)) = &plan.panel {
        let kind = Line::Panel;
        for l in lines {
            let text = panel.level_text(l.level);
            for piece in &l.pieces {
                let px = plan.to_px(piece);
                pen.line(&px, kind.colour(), kind.width_px(), kind.dash_px())?;
                panel_px.push((text.clone(), px));
            }
        }
    }

    // 5. Frame, ticks and axis labels.
    pen.line(
        &[
            (plot.x0, plot.y0),
            (plot.x1, plot.y0),
            (plot.x1, plot.y1),
            (plot.x0, plot.y1),
            (plot.x0, plot.y0),
        ],
        FRAME_RGB,
        1.4,
        None,
    )?;
    let tick = 7.0 * k;
    for &t in &x_ticks {
        let x = map.px(t);
        pen.line(&[(x, plot.y1), (x, plot.y1 + tick)], FRAME_RGB, 1.2, None)?;
        pen.text(
            &date_label_tdb(t),
            (x, plot.y1 + tick + 6.0 * k),
            17.0,
            &INK,
            (HPos::Center, VPos::Top),
        )?;
    }
    for &t in &y_ticks {
        let y = map.py(t);
        pen.line(&[(plot.x0 - tick, y), (plot.x0, y)], FRAME_RGB, 1.2, None)?;
        let text = match grid.second_kind {
            SecondAxis::Arrival => date_label_tdb(t),
            SecondAxis::TimeOfFlight => format_level(t),
        };
        pen.text(
            &text,
            (plot.x0 - tick - 6.0 * k, y),
            17.0,
            &INK,
            (HPos::Right, VPos::Center),
        )?;
    }
    pen.text(
        "Departure date (TDB)",
        ((plot.x0 + plot.x1) / 2.0, plot.y1 + 58.0 * k),
        20.0,
        &INK,
        (HPos::Center, VPos::Top),
    )?;
    let y_title = match grid.second_kind {
        SecondAxis::Arrival => "Arrival date (TDB)",
        SecondAxis::TimeOfFlight => "Time of flight, days",
    };
    pen.text_up(y_title, (24.0 * k, (plot.y0 + plot.y1) / 2.0), 20.0, &INK)?;

    // 6. Markers, then labels placed greedily around them.
    let mut placer = Placer {
        bounds: plot.inset(3.0 * k),
        taken: Vec::new(),
    };
    let r_mark = 9.0 * k;
    let mut marks = Vec::new();
    for m in &spec.markers {
        let (x, y) = (map.px(m.depart_days), map.py(m.second));
        if !(x.is_finite() && y.is_finite())
            || x < plot.x0
            || x > plot.x1
            || y < plot.y0
            || y > plot.y1
        {
            continue;
        }
        placer
            .taken
            .push(Rect::centred(x, y, 2.4 * r_mark, 2.4 * r_mark));
        marks.push((m, (x, y)));
    }
    let mut labels: Vec<Label> = Vec::new();
    let mut boxed: Vec<(Rect, String)> = Vec::new();
    for (m, (x, y)) in &marks {
        let (tw, th) = pen.text_size(&m.label, 16.0)?;
        let (bw, bh) = (tw + 14.0 * k, th + 10.0 * k);
        let g = 14.0 * k;
        let candidates = [
            (x + g, y - g - bh),
            (x + g, y + g),
            (x - g - bw, y - g - bh),
            (x - g - bw, y + g),
            (x - bw / 2.0, y - g - 8.0 * k - bh),
            (x - bw / 2.0, y + g + 8.0 * k),
        ];
        for (x0, y0) in candidates {
            let r = Rect {
                x0,
                y0,
                x1: x0 + bw,
                y1: y0 + bh,
            };
            if placer.try_take(r) {
                boxed.push((r, m.label.clone()));
                break;
            }
        }
    }
    place_line_labels(&pen, &mut placer, &limit_px, LIMIT_RGB, k, &mut labels)?;
    place_line_labels(&pen, &mut placer, &c3_px, C3_RGB, k, &mut labels)?;
    place_line_labels(&pen, &mut placer, &vinf_px, VINF_RGB, k, &mut labels)?;
    place_line_labels(&pen, &mut placer, &panel_px, PANEL_RGB, k, &mut labels)?;

    // Type I / Type II either side of the longest ridge piece.
    if let Some((_, pts)) = ridge_px.iter().max_by(|a, b| {
        cumulative(&a.1)
            .last()
            .copied()
            .unwrap_or(0.0)
            .total_cmp(&cumulative(&b.1).last().copied().unwrap_or(0.0))
    }) {
        if pts.len() >= 2 {
            let cum = cumulative(pts);
            let len = cum[cum.len() - 1];
            let mut done = [false, false];
            'outer: for t in [0.5, 0.35, 0.65, 0.2, 0.8] {
                let (p, dir) = point_at(pts, &cum, t * len);
                let normal = (-dir.1, dir.0);
                for d in [55.0 * k, 85.0 * k, 120.0 * k] {
                    for sgn in [1.0, -1.0] {
                        let q = (p.0 + sgn * d * normal.0, p.1 + sgn * d * normal.1);
                        let Some(a) = plan.angle_at_px(q) else {
                            continue;
                        };
                        let which = usize::from(a >= 180.0);
                        if done[which] {
                            continue;
                        }
                        let text = if which == 0 { "Type I" } else { "Type II" };
                        let (tw, th) = pen.text_size(text, 17.0)?;
                        if placer.try_take(Rect::centred(q.0, q.1, tw + 10.0 * k, th + 6.0 * k)) {
                            labels.push(Label {
                                text: text.to_string(),
                                centre: q,
                                colour: RIDGE_RGB,
                                size_px: 17.0,
                            });
                            done[which] = true;
                        }
                        if done[0] && done[1] {
                            break 'outer;
                        }
                    }
                }
            }
        }
    }
    // Time-of-flight labels near the top or right end of each diagonal.
    for (text, seg) in &tof_lines {
        let (tw, th) = pen.text_size(text, 14.0)?;
        let (a, b) = (seg[0], seg[1]);
        for t in [
            0.9, 0.82, 0.74, 0.66, 0.58, 0.5, 0.42, 0.34, 0.26, 0.18, 0.1,
        ] {
            let p = (a.0 + t * (b.0 - a.0), a.1 + t * (b.1 - a.1));
            if placer.try_take(Rect::centred(p.0, p.1, tw + 8.0 * k, th + 4.0 * k)) {
                labels.push(Label {
                    text: text.clone(),
                    centre: p,
                    colour: MUTED,
                    size_px: 14.0,
                });
                break;
            }
        }
    }
    for l in &labels {
        let (tw, th) = pen.text_size(&l.text, l.size_px)?;
        let r = Rect::centred(l.centre.0, l.centre.1, tw + 8.0 * k, th + 4.0 * k);
        pen.rect(r, PAPER, None)?;
        pen.text(
            &l.text,
            l.centre,
            l.size_px,
            &l.colour,
            (HPos::Center, VPos::Center),
        )?;
    }
    for (_, (x, y)) in &marks {
        let d = [
            (*x, y - r_mark),
            (x + r_mark, *y),
            (*x, y + r_mark),
            (x - r_mark, *y),
        ];
        pen.fill(&d, MARKER_RGB)?;
        pen.line(&[d[0], d[1], d[2], d[3], d[0]], INK, 1.6, None)?;
    }
    for (r, text) in &boxed {
        pen.rect(*r, PAPER, Some((INK, 1.0)))?;
        pen.text(
            text,
            ((r.x0 + r.x1) / 2.0, (r.y0 + r.y1) / 2.0),
            16.0,
            &INK,
            (HPos::Center, VPos::Center),
        )?;
    }

    // 7. Title, subtitle, legend, caption.
    pen.text(
        &plan.title,
        (plot.x0, 30.0 * k),
        32.0,
        &INK,
        (HPos::Left, VPos::Top),
    )?;
    pen.text(
        &spec.subtitle,
        (plot.x0, 78.0 * k),
        20.0,
        &MUTED,
        (HPos::Left, VPos::Top),
    )?;
    pen.text(
        CAPTION,
        (plot.x0, lay.h - 22.0 * k),
        15.0,
        &MUTED,
        (HPos::Left, VPos::Bottom),
    )?;
    draw_legend(&pen, plan, lay)?;
    Ok(())
}

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

fn draw_legend<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    plan: &Plan<'_, '_>,
    lay: &Layout,
) -> Result<(), ChartError> {
    let k = lay.k;
    let spec = plan.spec;
    let x0 = lay.plot.x1 + 34.0 * k;
    let x1 = lay.w - 26.0 * k;
    let row = 40.0 * k;
    let sample_w = 46.0 * k;
    enum Sample {
        Line(Line),
        Patch(RGBColor, Option<Line>),
        Marker,
    }
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
    let y0 = lay.plot.y0;
    let pad = 16.0 * k;
    let height = pad * 2.0 + row * rows.len() as f64 + 34.0 * k;
    pen.rect(
        Rect {
            x0,
            y0,
            x1,
            y1: y0 + height,
        },
        PAPER,
        Some((RGBColor(0xb0, 0xb0, 0xb0), 1.0)),
    )?;
    for (n, (sample, text)) in rows.iter().enumerate() {
        let cy = y0 + pad + row * (n as f64 + 0.5);
        let sx = x0 + pad;
        match sample {
            Sample::Line(l) => {
                pen.line(
                    &[(sx, cy), (sx + sample_w, cy)],
                    l.legend_colour(),
                    l.width_px() + 0.4,
                    l.dash_px(),
                )?;
            }
            Sample::Patch(c, edge) => {
                let r = Rect {
                    x0: sx,
                    y0: cy - 11.0 * k,
                    x1: sx + sample_w,
                    y1: cy + 11.0 * k,
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
            Sample::Marker => {
                let (x, r) = (sx + sample_w / 2.0, 9.0 * k);
                let d = [(x, cy - r), (x + r, cy), (x, cy + r), (x - r, cy)];
                pen.fill(&d, MARKER_RGB)?;
                pen.line(&[d[0], d[1], d[2], d[3], d[0]], INK, 1.6, None)?;
            }
        }
        pen.text(
            text,
            (sx + sample_w + 12.0 * k, cy),
            16.0,
            &INK,
            (HPos::Left, VPos::Center),
        )?;
    }
    let name = layer_name(spec.grid, spec.layer);
    pen.text(
        &format!("Solutions: {name}"),
        (x0 + pad, y0 + height - pad - 4.0 * k),
        14.0,
        &MUTED,
        (HPos::Left, VPos::Bottom),
    )?;
    Ok(())
}

pub(crate) fn check_size(width_px: u32, height_px: u32) -> Result<(), ChartError> {
    let ok = |s: u32| (MIN_SIDE_PX..=MAX_SIDE_PX).contains(&s);
    if ok(width_px) && ok(height_px) {
        Ok(())
    } else {
        Err(ChartError::ImageSize {
            width_px,
            height_px,
        })
    }
}

pub(crate) fn ensure_font() -> Result<(), ChartError> {
    static REGISTERED: OnceLock<bool> = OnceLock::new();
    let ok = *REGISTERED.get_or_init(|| {
        plotters::style::register_font(FAMILY, FontStyle::Normal, FONT_TTF).is_ok()
    });
    if ok {
        Ok(())
    } else {
        Err(ChartError::Font)
    }
}

/// The chart as an SVG document (1800 x 1350 px; text stays text).
///
/// Data lines carry a `class`: `c3`, `vinf`, `tof`, `ridge`, `c3max`.
///
/// # Errors
/// [`ChartError::NoSuchLayer`], [`ChartError::GridTooSmall`] and friends
/// for an unusable grid; [`ChartError::Draw`] if drawing fails.
pub fn render_svg(spec: &ChartSpec) -> Result<String, ChartError> {
    svg_sized(spec, Contours::Window, DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX)
}

pub(crate) fn svg_sized(
    spec: &ChartSpec,
    contours: Contours<'_>,
    width_px: u32,
    height_px: u32,
) -> Result<String, ChartError> {
    check_size(width_px, height_px)?;
    ensure_font()?;
    let lay = layout(width_px, height_px);
    let plan = plan(spec, &lay, contours)?;
    let (bw, bh) = (width_px * SUPERSAMPLE, height_px * SUPERSAMPLE);
    let mut svg = String::new();
    {
        let area = SVGBackend::with_string(&mut svg, (bw, bh)).into_drawing_area();
        draw(&area, &plan, &lay, true)?;
        area.present().map_err(draw_err)?;
    }
    // Requested size outside, doubled coordinates inside.
    svg = svg.replacen(
        &format!("width=\"{bw}\" height=\"{bh}\""),
        &format!("width=\"{width_px}\" height=\"{height_px}\""),
        1,
    );
    let s = f64::from(SUPERSAMPLE) * lay.k;
    for kind in Line::ALL {
        let dash = kind
            .dash_px()
            .map(|(on, off)| {
                format!(
                    " stroke-dasharray=\"{} {}\"",
                    fmt_num(on * s),
                    fmt_num(off * s)
                )
            })
            .unwrap_or_default();
        for (colour, class) in [
            (kind.colour(), kind.class()),
            (kind.legend_colour(), "legend"),
        ] {
            let RGBColor(r, g, b) = colour;
            let from =
                format!("<polyline fill=\"none\" opacity=\"1\" stroke=\"#{r:02X}{g:02X}{b:02X}\"");
            let to = format!("<polyline class=\"{class}\" fill=\"none\" opacity=\"1\"{dash} stroke=\"#{r:02X}{g:02X}{b:02X}\"");
            svg = svg.replace(&from, &to);
        }
    }
    Ok(svg.replace("<polyline ", "<polyline stroke-linejoin=\"round\" "))
}

fn fmt_num(v: f64) -> String {
    format_level(v)
}

/// The chart as PNG bytes of `width_px` x `height_px` (the default is
/// [`DEFAULT_WIDTH_PX`] x [`DEFAULT_HEIGHT_PX`]), RGB, 8 bits.
///
/// Drawn at twice the size and box-filtered down for smooth lines.
///
/// # Errors
/// [`ChartError::ImageSize`] for sides outside 200..=10000 px;
/// [`ChartError::NoSuchLayer`], [`ChartError::GridTooSmall`] and friends
/// for an unusable grid; [`ChartError::Draw`] or [`ChartError::Png`] if
/// drawing or encoding fails.
pub fn render_png(spec: &ChartSpec, width_px: u32, height_px: u32) -> Result<Vec<u8>, ChartError> {
    png_sized(spec, Contours::Window, width_px, height_px)
}

pub(crate) fn png_sized(
    spec: &ChartSpec,
    contours: Contours<'_>,
    width_px: u32,
    height_px: u32,
) -> Result<Vec<u8>, ChartError> {
    check_size(width_px, height_px)?;
    ensure_font()?;
    let lay = layout(width_px, height_px);
    let plan = plan(spec, &lay, contours)?;
    let (bw, bh) = (width_px * SUPERSAMPLE, height_px * SUPERSAMPLE);
    let mut big = vec![255u8; bw as usize * bh as usize * 3];
    {
        let area = BitMapBackend::with_buffer(&mut big, (bw, bh)).into_drawing_area();
        draw(&area, &plan, &lay, false)?;
        area.present().map_err(draw_err)?;
    }
    encode_png(
        &downsample_2x(&big, width_px as usize, height_px as usize),
        width_px,
        height_px,
    )
}

/// Encode an 8-bit RGB buffer as PNG.
pub(crate) fn encode_png(rgb: &[u8], width_px: u32, height_px: u32) -> Result<Vec<u8>, ChartError> {
    let mut out = Vec::new();
    {
        let mut enc = png::Encoder::new(&mut out, width_px, height_px);
        enc.set_color(png::ColorType::Rgb);
        enc.set_depth(png::BitDepth::Eight);
        enc.set_compression(png::Compression::Fast);
        let mut w = enc
            .write_header()
            .map_err(|e| ChartError::Png(e.to_string()))?;
        w.write_image_data(rgb)
            .map_err(|e| ChartError::Png(e.to_string()))?;
        w.finish().map_err(|e| ChartError::Png(e.to_string()))?;
    }
    Ok(out)
}

/// 2x2 box filter: RGB of `2w x 2h` to `w x h`.
pub(crate) fn downsample_2x(big: &[u8], w: usize, h: usize) -> Vec<u8> {
    let bw = 2 * w;
    let mut out = vec![0u8; w * h * 3];
    for y in 0..h {
        let r0 = 2 * y * bw * 3;
        let r1 = (2 * y + 1) * bw * 3;
        for x in 0..w {
            for c in 0..3 {
                let i = 2 * x * 3 + c;
                let sum = u32::from(big[r0 + i])
                    + u32::from(big[r0 + i + 3])
                    + u32::from(big[r1 + i])
                    + u32::from(big[r1 + i + 3]);
                out[(y * w + x) * 3 + c] = ((sum + 2) / 4) as u8;
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dashes_split_by_length() {
        let d = dashes(&[(0.0, 0.0), (10.0, 0.0), (10.0, 10.0)], 4.0, 2.0);
        // 20 px: on 0-4, 6-10, 12-16, 18-20.
        assert_eq!(d.len(), 4);
        let len = |v: &Vec<(f64, f64)>| cumulative(v).last().copied().unwrap_or(0.0);
        assert!((len(&d[0]) - 4.0).abs() < 1e-9);
        assert!((len(&d[1]) - 4.0).abs() < 1e-9);
        assert!((len(&d[3]) - 2.0).abs() < 1e-9);
        assert!((d[2][0].1 - 2.0).abs() < 1e-9 && (d[2][0].0 - 10.0).abs() < 1e-9);
    }

    #[test]
    fn polygons_clip_to_the_plot() {
        let r = Rect {
            x0: 0.0,
            y0: 0.0,
            x1: 10.0,
            y1: 10.0,
        };
        let c = clip_polygon(&[(-5.0, 5.0), (5.0, -5.0), (15.0, 5.0), (5.0, 15.0)], &r);
        assert!(c
            .iter()
            .all(|p| p.0 >= -1e-9 && p.0 <= 10.0 + 1e-9 && p.1 >= -1e-9 && p.1 <= 10.0 + 1e-9));
        assert_eq!(c.len(), 8);
        assert!(clip_polygon(&[(20.0, 20.0), (30.0, 20.0), (25.0, 30.0)], &r).is_empty());
    }

    #[test]
    fn date_ticks_fall_on_month_starts() {
        let lo = days_j2000_from_civil(2031, 1, 10);
        let hi = days_j2000_from_civil(2031, 12, 20);
        let t = date_ticks(lo, hi, 8);
        assert!(t.len() >= 3 && t.len() <= 8, "{t:?}");
        for d in &t {
            assert!(date_label_tdb(*d).ends_with("-01"));
            assert!(*d >= lo && *d <= hi);
        }
        // Short spans fall back to days.
        let t = date_ticks(lo, lo + 20.0, 8);
        assert!(t.len() >= 3 && t.len() <= 8, "{t:?}");
    }
}
