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

use super::isolines::{extend_one_sample, isolines, Isoline, Lattice};
use super::levels::{c3_levels, explicit_levels, format_level, nice_ceil, vinf_levels};
use super::panel::Panel;
use super::{date_label_tdb, days_j2000_from_civil, ChartError, ChartSpec};
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
const TOF_RGB: RGBColor = RGBColor(0x8c, 0x8c, 0x8c);
const RIDGE_RGB: RGBColor = RGBColor(0x6a, 0x2c, 0x91);
pub(crate) const LIMIT_RGB: RGBColor = RGBColor(0x1f, 0x7a, 0x5c);
const SHADE_RGB: RGBColor = RGBColor(0xd9, 0xf0, 0xe3);
const MASK_RGB: RGBColor = RGBColor(0xe3, 0xe3, 0xe3);
pub(crate) const GRIDLINE_RGB: RGBColor = RGBColor(0xea, 0xea, 0xea);
const FRAME_RGB: RGBColor = RGBColor(0x44, 0x44, 0x44);
const MARKER_RGB: RGBColor = RGBColor(0xff, 0xc8, 0x2e);
/// A panel's single contour family: a deep teal, away from the C3 blue,
/// the v-infinity orange, the ridge purple and the limit green in hue and
/// lightness.
pub(crate) const PANEL_RGB: RGBColor = RGBColor(0x00, 0x7d, 0x8a);
const PAPER: RGBColor = RGBColor(0xff, 0xff, 0xff);

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
    fn data_x(&self, px: f64) -> f64 {
        self.xmin + (px - self.plot.x0) / (self.plot.x1 - self.plot.x0) * (self.xmax - self.xmin)
    }
    fn data_y(&self, py: f64) -> f64 {
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
    let (y0, m0, _) = super::civil_from_days_j2000(lo);
    let (y1, m1, _) = super::civil_from_days_j2000(hi);
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
    use crate::chart::{render_panel_png, render_panel_svg, synthetic_grid, Marker};
    use crate::sweep::{layers_for, Axis};

    /// Centre of the analytic window, days past J2000 TDB.
    fn dc() -> f64 {
        days_j2000_from_civil(2031, 1, 1) + 200.0
    }

    /// A 200 x 200 arrival-date grid with analytic fields:
    /// C3 = 5 + 20 (u^2 + v^2), u = (d - dc) / 80, v = (tof - 260) / 90;
    /// v-infinity = 3 + 2 (u'^2 + v'^2) around another centre; the transfer
    /// angle crosses 180 deg at tof = 250 days and wraps past 360 at
    /// tof = 550 days. No solution for tof < 80 days nor in a block at
    /// d - dc in [30, 50], tof in [240, 280] (which the C3 = 10 line and
    /// the 180-degree line cross).
    fn analytic_grid(kind: SecondAxis) -> Grid {
        let start = days_j2000_from_civil(2031, 1, 1);
        let depart = Axis {
            start_days: start,
            step_days: 2.0,
            count: 200,
        };
        let second = match kind {
            SecondAxis::Arrival => Axis {
                start_days: start + 100.0,
                step_days: 3.0,
                count: 200,
            },
            SecondAxis::TimeOfFlight => Axis {
                start_days: 60.0,
                step_days: 3.0,
                count: 200,
            },
        };
        let mut g = Grid::new(depart, second, kind, layers_for(0));
        for i in 0..200 {
            for j in 0..200 {
                let (d, a) = g.dates_days(i, j);
                let tof = a - d;
                let idx = g.index(i, j, 0);
                let in_block =
                    (30.0..=50.0).contains(&(d - dc())) && (240.0..=280.0).contains(&tof);
                if tof < 80.0 || in_block {
                    continue;
                }
                let u = (d - dc()) / 80.0;
                let v = (tof - 260.0) / 90.0;
                let c3 = 5.0 + 20.0 * (u * u + v * v);
                let u2 = (d - dc() + 30.0) / 90.0;
                let v2 = (tof - 300.0) / 100.0;
                g.vinf_depart_km_s[idx] = c3.sqrt();
                g.vinf_arrive_km_s[idx] = 3.0 + 2.0 * (u2 * u2 + v2 * v2);
                g.transfer_angle_deg[idx] = (180.0 + 0.6 * (tof - 250.0)).rem_euclid(360.0) as f32;
                g.status[idx] = CellStatus::Ok as u8;
            }
        }
        g
    }

    fn spec(grid: &Grid) -> ChartSpec<'_> {
        ChartSpec {
            grid,
            layer: 0,
            title: "Teodra → Kesh, 2031 opportunity".to_string(),
            subtitle: "Veyra system (invented), departures 2031".to_string(),
            c3_levels: Some(vec![30.0, 10.0, 20.0]),
            vinf_levels: Some(vec![3.5, 4.5]),
            markers: vec![Marker {
                depart_days: dc(),
                second: match grid.second_kind {
                    SecondAxis::Arrival => dc() + 260.0,
                    SecondAxis::TimeOfFlight => 260.0,
                },
                label: "C3 5.00 · 2031-07-20 → 2032-04-05".to_string(),
            }],
            max_c3: Some(25.0),
        }
    }

    /// `(class, points)` of every polyline.
    fn polylines(svg: &str) -> Vec<(String, Vec<(f64, f64)>)> {
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
        // Each C3 and v-infinity level is one ring or arc on this grid.
        assert_eq!(count(&lines, "c3"), 3);
        assert_eq!(count(&lines, "vinf"), 2);
        // The C3 limit line (C3 = 25) and the 180-degree line, cut in two
        // by the blank block.
        assert_eq!(count(&lines, "c3max"), 1);
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
        assert!(t.contains(&"C3 5.00 · 2031-07-20 → 2032-04-05".to_string()));
        assert!(t.contains(&"Teodra → Kesh, 2031 opportunity".to_string()));
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
        let lay = layout(DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX);
        let map = Map {
            xmin: g.depart.start_days,
            xmax: g.depart.end_days(),
            ymin: g.second.start_days,
            ymax: g.second.end_days(),
            plot: lay.plot,
        };
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
    fn blank_cells_carry_no_lines() {
        let g = analytic_grid(SecondAxis::Arrival);
        let svg = render_svg(&spec(&g)).expect("svg");
        let lay = layout(DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX);
        let map = Map {
            xmin: g.depart.start_days,
            xmax: g.depart.end_days(),
            ymin: g.second.start_days,
            ymax: g.second.end_days(),
            plot: lay.plot,
        };
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
                let inside =
                    d > 30.0 + 3.0 && d < 50.0 - 3.0 && tof > 240.0 + 6.0 && tof < 280.0 - 6.0;
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
        let lines = polylines(&render_svg(&s).expect("svg"));
        assert_eq!(count(&lines, "c3"), 2);
        assert_eq!(count(&lines, "c3max"), 1);
        s.max_c3 = None;
        let svg = render_svg(&s).expect("svg");
        let lines = polylines(&svg);
        assert_eq!(count(&lines, "c3"), 3);
        assert_eq!(count(&lines, "c3max"), 0);
        assert!(!texts(&svg).iter().any(|t| t.starts_with("C3 ≤")));
    }

    #[test]
    fn time_of_flight_charts_have_no_diagonals() {
        let g = analytic_grid(SecondAxis::TimeOfFlight);
        let svg = render_svg(&spec(&g)).expect("svg");
        let lines = polylines(&svg);
        assert_eq!(count(&lines, "tof"), 0);
        assert_eq!(count(&lines, "c3"), 3);
        let t = texts(&svg);
        assert!(t.contains(&"Time of flight, days".to_string()));
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

    /// The analytic arrival-date grid with asymptote directions filled:
    /// DLA = -47 + 94 x deg, x = (d - first departure) / 398 days (linear
    /// in the departure date); arrival declination = -25 + 50 y deg,
    /// y = (a - first arrival) / 597 days (linear in the arrival date).
    fn panel_grid() -> Grid {
        let mut g = analytic_grid(SecondAxis::Arrival);
        let (d0, a0) = g.dates_days(0, 0);
        let unit = |dec_deg: f64| {
            let r = dec_deg.to_radians();
            [r.cos() as f32, 0.0, r.sin() as f32]
        };
        for i in 0..200 {
            for j in 0..200 {
                let (d, a) = g.dates_days(i, j);
                let idx = g.index(i, j, 0);
                g.depart_dir[idx] = unit(-47.0 + 94.0 * (d - d0) / 398.0);
                g.arrive_dir[idx] = unit(-25.0 + 50.0 * (a - a0) / 597.0);
            }
        }
        g
    }

    /// What every panel shares: the frame, no C3 or v-infinity family, no
    /// C3 limit, the panel's legend and title.
    fn check_panel_frame(svg: &str, panel: Panel) -> Vec<(String, Vec<(f64, f64)>)> {
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
            "C3 5.00 · 2031-07-20 → 2032-04-05",
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
        let lines = check_panel_frame(&svg, Panel::Dla);
        // DLA spans -47..47 deg: lines every 10 deg from -40 to 40, each a
        // vertical line; the 10-degree line is cut in two by the blank
        // block (DLA 7.3..12 deg there).
        assert_eq!(count(&lines, "panel"), 10);
        let t = texts(&svg);
        for l in [-40, -30, -20, -10, 0, 10, 20, 30, 40] {
            let label = format!("{l}°");
            assert!(t.contains(&label), "label {label} missing: {t:?}");
        }
        assert!(!t.iter().any(|x| x == "50°" || x == "-50°"));
        // Vertical: every point of a line sits at the departure date of
        // its level.
        let lay = layout(DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX);
        let d0 = g.depart.start_days;
        let map = Map {
            xmin: d0,
            xmax: g.depart.end_days(),
            ymin: g.second.start_days,
            ymax: g.second.end_days(),
            plot: lay.plot,
        };
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
        let lines = check_panel_frame(&svg, Panel::ArriveDec);
        // -25..25 deg: every 5 deg from -20 to 20, horizontal lines; the
        // 10-degree line is cut in two by the blank block.
        assert_eq!(count(&lines, "panel"), 10);
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
        let lines = check_panel_frame(&svg, Panel::DvTotal);
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
        // One ring per level (the 3 and 3.5 rings run through the blank
        // block and come out as one arc each).
        assert_eq!(count(&lines, "panel"), levels.len());
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
            let bytes =
                render_panel_png(&spec(&g), panel, &Endpoints::bare(), 900, 675).expect("png");
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
        let lay = layout(DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX);
        let map = Map {
            xmin: g.depart.start_days,
            xmax: g.depart.end_days(),
            ymin: g.second.start_days,
            ymax: g.second.end_days(),
            plot: lay.plot,
        };
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
            assert!(texts(&svg).iter().any(|t| t == panel.legend()));
        }
    }

    /// Writes `/tmp/panel-<name>.png` for each panel from the synthetic and
    /// the analytic grids, for a visual check:
    /// `cargo test --release --lib write_panel_examples -- --ignored`.
    #[test]
    #[ignore]
    fn write_panel_examples() {
        let g = panel_grid();
        for panel in Panel::ALL {
            let png_bytes = render_panel_png(
                &spec(&g),
                panel,
                &Endpoints::bare(),
                DEFAULT_WIDTH_PX,
                DEFAULT_HEIGHT_PX,
            )
            .expect("png");
            std::fs::write(format!("/tmp/panel-{}.png", panel.name()), png_bytes).expect("write");
            let svg = render_panel_svg(&spec(&g), panel, &Endpoints::bare()).expect("svg");
            std::fs::write(format!("/tmp/panel-{}.svg", panel.name()), svg).expect("write");
            let small =
                render_panel_png(&spec(&g), panel, &Endpoints::bare(), 800, 600).expect("png");
            std::fs::write(format!("/tmp/panel-{}-small.png", panel.name()), small).expect("write");
        }
    }

    /// The main chart's SVG for the fixed specs kept under
    /// `src/chart/testdata/`: `(file name, svg)`.
    fn main_chart_fixtures() -> Vec<(&'static str, String)> {
        let g = analytic_grid(SecondAxis::Arrival);
        let a = render_svg(&spec(&g)).expect("svg");
        let g = analytic_grid(SecondAxis::TimeOfFlight);
        let t = render_svg(&spec(&g)).expect("svg");
        let g = synthetic_grid(80);
        let mut s = spec(&g);
        s.c3_levels = None;
        s.vinf_levels = None;
        s.max_c3 = Some(20.0);
        let y = render_svg(&s).expect("svg");
        vec![
            ("main-arrival.svg", a),
            ("main-tof.svg", t),
            ("main-synthetic.svg", y),
        ]
    }

    /// The main transfer-window chart is byte-identical to the saved copies
    /// (taken before the panels were added to the renderer).
    #[test]
    fn main_chart_matches_saved_svg() {
        let saved = [
            include_str!("testdata/main-arrival.svg"),
            include_str!("testdata/main-tof.svg"),
            include_str!("testdata/main-synthetic.svg"),
        ];
        for ((name, now), old) in main_chart_fixtures().iter().zip(saved) {
            assert_eq!(now.len(), old.len(), "{name}: length changed");
            assert!(now == old, "{name}: content changed");
        }
    }

    /// Rewrites the saved copies (only when the main chart is meant to
    /// change): `cargo test --release --lib write_main_fixtures -- --ignored`.
    #[test]
    #[ignore]
    fn write_main_fixtures() {
        let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("src/chart/testdata");
        std::fs::create_dir_all(&dir).expect("mkdir");
        for (name, svg) in main_chart_fixtures() {
            std::fs::write(dir.join(name), svg).expect("write");
        }
    }

    /// Writes `/tmp/chart-example.png` and `.svg` from the synthetic grid
    /// for a visual check: `cargo test --release --lib write_example -- --ignored`.
    #[test]
    #[ignore]
    fn write_example() {
        let g = synthetic_grid(400);
        let best = (0..g.cells())
            .filter(|&i| g.status[i] == 0)
            .min_by(|&a, &b| g.c3_km2_s2(a).total_cmp(&g.c3_km2_s2(b)))
            .expect("ok cells");
        let (i, j) = (best / g.second.count, best % g.second.count);
        let (d, a) = g.dates_days(i, j);
        let s = ChartSpec {
            grid: &g,
            layer: 0,
            title: "Teodra → Kesh, 2031 opportunity".to_string(),
            subtitle: "Veyra system (invented) · departures 2031-01-01 to 2032-02-05".to_string(),
            c3_levels: None,
            vinf_levels: None,
            markers: vec![Marker {
                depart_days: d,
                second: a,
                label: format!(
                    "C3 {:.2} · {} → {}",
                    g.c3_km2_s2(best),
                    date_label_tdb(d),
                    date_label_tdb(a)
                ),
            }],
            max_c3: Some(20.0),
        };
        let t0 = std::time::Instant::now();
        let png_bytes = render_png(&s, DEFAULT_WIDTH_PX, DEFAULT_HEIGHT_PX).expect("png");
        eprintln!("png {:?}", t0.elapsed());
        std::fs::write("/tmp/chart-example.png", png_bytes).expect("write");
        std::fs::write("/tmp/chart-example.svg", render_svg(&s).expect("svg")).expect("write");
        let g = analytic_grid(SecondAxis::TimeOfFlight);
        let png_bytes = render_png(&spec(&g), 1200, 900).expect("png");
        std::fs::write("/tmp/chart-example-tof.png", png_bytes).expect("write");
    }
}
