//! Plane geometry of a chart, in logical px (y down): the layout, the map
//! from data coordinates, polygon clipping, dashes, and where labels go.
//!
//! Nothing here draws; the drawing module measures text and hands the
//! boxes to a [`Placer`], which finds room for them without overlaps.

use super::isolines::Lattice;

/// The layout's reference width, logical px; other sizes scale from it.
/// With [`REF_HEIGHT_PX`] a 4:3 slide, 12 x 9 in at 150 px per inch
/// (common practice, no source).
pub(crate) const REF_WIDTH_PX: f64 = 1800.0;
/// The layout's reference height, logical px.
pub(crate) const REF_HEIGHT_PX: f64 = 1350.0;

// Margins around the plot at the reference size, logical px (chosen by
// eye; no source): the y tick labels and axis title on the left, title
// and subtitle on top, the legend column on the right, the x tick labels,
// axis title and caption below.
const PLOT_LEFT_PX: f64 = 175.0;
const PLOT_TOP_PX: f64 = 128.0;
const PLOT_RIGHT_PX: f64 = 410.0;
const PLOT_BOTTOM_PX: f64 = 150.0;

/// Points of a polyline closer than this to the previous one are dropped,
/// logical px: half a pixel is below what the PNG shows.
const SIMPLIFY_PX: f64 = 0.5;

/// A rectangle in logical px, y down.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct Rect {
    pub(crate) x0: f64,
    pub(crate) y0: f64,
    pub(crate) x1: f64,
    pub(crate) y1: f64,
}

impl Rect {
    /// The `w` x `h` rectangle centred on `(cx, cy)`.
    pub(crate) fn centred(cx: f64, cy: f64, w: f64, h: f64) -> Rect {
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
    /// The rectangle shrunk by `d` on every side.
    pub(crate) fn inset(&self, d: f64) -> Rect {
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
    /// The lattice's sampled rectangle onto `plot`.
    pub(crate) fn of_lattice(lat: &Lattice, plot: Rect) -> Map {
        Map {
            xmin: lat.x0,
            xmax: lat.x_last(),
            ymin: lat.y0,
            ymax: lat.y_last(),
            plot,
        }
    }
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
    /// A polyline in data coordinates as logical px, without points
    /// closer than half a pixel.
    pub(crate) fn polyline_px(&self, pts: &[(f64, f64)]) -> Vec<(f64, f64)> {
        let v: Vec<(f64, f64)> = pts.iter().map(|&(x, y)| (self.px(x), self.py(y))).collect();
        simplify(&v, SIMPLIFY_PX)
    }
}

/// Where everything goes, logical px.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Layout {
    pub(crate) w: f64,
    pub(crate) h: f64,
    /// Scale of fonts, strokes and margins relative to the reference size.
    pub(crate) k: f64,
    pub(crate) plot: Rect,
}

/// The layout of a `width_px` x `height_px` chart: the reference layout
/// scaled by the smaller of the two ratios, the plot taking what the
/// margins leave.
pub(crate) fn layout(width_px: u32, height_px: u32) -> Layout {
    let (w, h) = (f64::from(width_px), f64::from(height_px));
    let k = (w / REF_WIDTH_PX).min(h / REF_HEIGHT_PX);
    Layout {
        w,
        h,
        k,
        plot: Rect {
            x0: PLOT_LEFT_PX * k,
            y0: PLOT_TOP_PX * k,
            x1: w - PLOT_RIGHT_PX * k,
            y1: h - PLOT_BOTTOM_PX * k,
        },
    }
}

/// Splits a polyline into dashes of `on` px separated by gaps of `off` px.
pub(crate) fn dashes(pts: &[(f64, f64)], on: f64, off: f64) -> Vec<Vec<(f64, f64)>> {
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

/// Clips a polygon to a rectangle.
///
/// # Method
/// Sutherland-Hodgman: the polygon is clipped against each of the four
/// edges in turn (I. E. Sutherland and G. W. Hodgman, "Reentrant polygon
/// clipping", Communications of the ACM 17(1), 1974).
pub(crate) fn clip_polygon(pts: &[(f64, f64)], r: &Rect) -> Vec<(f64, f64)> {
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

/// The point at arc length `s` along a polyline and the unit direction of
/// its segment there; `cum` is [`cumulative`] of `pts`.
pub(crate) fn point_at(pts: &[(f64, f64)], cum: &[f64], s: f64) -> ((f64, f64), (f64, f64)) {
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

/// Arc length from the first point to each point of a polyline.
pub(crate) fn cumulative(pts: &[(f64, f64)]) -> Vec<f64> {
    let mut cum = Vec::with_capacity(pts.len());
    let mut acc = 0.0;
    cum.push(0.0);
    for w in pts.windows(2) {
        acc += ((w[1].0 - w[0].0).powi(2) + (w[1].1 - w[0].1).powi(2)).sqrt();
        cum.push(acc);
    }
    cum
}

/// The longest of several polylines (the last of equals), if any.
pub(crate) fn longest<T>(pieces: &[(T, Vec<(f64, f64)>)]) -> Option<&[(f64, f64)]> {
    let length = |p: &[(f64, f64)]| cumulative(p).last().copied().unwrap_or(0.0);
    pieces
        .iter()
        .max_by(|a, b| length(&a.1).total_cmp(&length(&b.1)))
        .map(|(_, pts)| pts.as_slice())
}

// Label placement at the reference size, logical px (chosen by eye; no
// source).
/// One label per this much contour length, at most [`MAX_LABELS_PER_LINE`].
const LINE_LABEL_SPACING_PX: f64 = 650.0;
/// Most labels on one contour piece.
const MAX_LABELS_PER_LINE: usize = 3;
/// A piece shorter than this many label boxes is not labelled.
const MIN_LINE_LENGTH_IN_LABELS: f64 = 2.5;
/// Gap between a marker and its annotation box.
const MARKER_BOX_GAP_PX: f64 = 14.0;
/// Extra gap of the annotation boxes centred above or below a marker.
const MARKER_BOX_EXTRA_GAP_PX: f64 = 8.0;
/// Distances from the 180-degree line tried for the Type I/II names.
const REGION_LABEL_DISTANCES_PX: [f64; 3] = [55.0, 85.0, 120.0];

/// Rectangles already taken by labels and markers, within bounds.
pub(crate) struct Placer {
    bounds: Rect,
    taken: Vec<Rect>,
}

impl Placer {
    /// Nothing taken yet; labels must lie within `bounds`.
    pub(crate) fn new(bounds: Rect) -> Placer {
        Placer {
            bounds,
            taken: Vec::new(),
        }
    }

    /// Marks `r` as taken whatever it overlaps (a marker).
    pub(crate) fn reserve(&mut self, r: Rect) {
        self.taken.push(r);
    }

    /// Takes `r` if it lies within the bounds and overlaps nothing taken.
    pub(crate) fn try_take(&mut self, r: Rect) -> bool {
        if !self.bounds.contains(&r) || self.taken.iter().any(|t| t.overlaps(&r)) {
            return false;
        }
        self.taken.push(r);
        true
    }

    /// Centres of the `(w, h)` label boxes taken along a polyline: one per
    /// [`LINE_LABEL_SPACING_PX`] (between 1 and 3), each near the middle
    /// of its share of the line and kept off its ends; none when the line
    /// is shorter than 2.5 boxes.
    pub(crate) fn along_line(
        &mut self,
        pts: &[(f64, f64)],
        (bw, bh): (f64, f64),
        k: f64,
    ) -> Vec<(f64, f64)> {
        let mut out = Vec::new();
        if pts.len() < 2 {
            return out;
        }
        let cum = cumulative(pts);
        let len = cum[cum.len() - 1];
        if len < MIN_LINE_LENGTH_IN_LABELS * bw {
            return out;
        }
        let wanted =
            ((len / (LINE_LABEL_SPACING_PX * k)).floor() as usize).clamp(1, MAX_LABELS_PER_LINE);
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
                if self.try_take(Rect::centred(p.0, p.1, bw, bh)) {
                    out.push(p);
                    break;
                }
            }
        }
        out
    }

    /// A `(w, h)` box beside the marker at `(x, y)`: above right, below
    /// right, above left, below left, centred above, centred below,
    /// whichever is free first; then the same farther out (2.5 and 5
    /// gaps), each shifted to lie within the bounds.
    pub(crate) fn beside_point(
        &mut self,
        (x, y): (f64, f64),
        (bw, bh): (f64, f64),
        k: f64,
    ) -> Option<Rect> {
        let extra = MARKER_BOX_EXTRA_GAP_PX * k;
        let b = self.bounds;
        for (ring, reach) in [1.0, 2.5, 5.0].into_iter().enumerate() {
            let g = MARKER_BOX_GAP_PX * k * reach;
            let candidates = [
                (x + g, y - g - bh),
                (x + g, y + g),
                (x - g - bw, y - g - bh),
                (x - g - bw, y + g),
                (x - bw / 2.0, y - g - extra - bh),
                (x - bw / 2.0, y + g + extra),
            ];
            for (x0, y0) in candidates {
                let (x0, y0) = if ring > 0 {
                    (x0.min(b.x1 - bw).max(b.x0), y0.min(b.y1 - bh).max(b.y0))
                } else {
                    (x0, y0)
                };
                let r = Rect {
                    x0,
                    y0,
                    x1: x0 + bw,
                    y1: y0 + bh,
                };
                // A shifted box still leaves the marker clear.
                let m = MARKER_BOX_GAP_PX * k * 0.5;
                let clear =
                    ring == 0 || !(x > r.x0 - m && x < r.x1 + m && y > r.y0 - m && y < r.y1 + m);
                if clear && self.try_take(r) {
                    return Some(r);
                }
            }
        }
        None
    }

    /// The centre of a `(w, h)` box on the segment `a`-`b`, tried from
    /// near `b` towards `a`.
    pub(crate) fn along_segment(
        &mut self,
        a: (f64, f64),
        b: (f64, f64),
        (bw, bh): (f64, f64),
    ) -> Option<(f64, f64)> {
        [
            0.9, 0.82, 0.74, 0.66, 0.58, 0.5, 0.42, 0.34, 0.26, 0.18, 0.1,
        ]
        .into_iter()
        .map(|t| (a.0 + t * (b.0 - a.0), a.1 + t * (b.1 - a.1)))
        .find(|p| self.try_take(Rect::centred(p.0, p.1, bw, bh)))
    }

    /// Names for the two sides of a polyline: `side_of(p)` says which side
    /// (0 or 1) a point lies on, or `None` where unknown; `boxes[side]` is
    /// the `(w, h)` of that side's name. Tries points at a few distances
    /// along the normal of a few places of the line, and returns
    /// `(side, centre)` for each side placed (each at most once).
    pub(crate) fn either_side(
        &mut self,
        pts: &[(f64, f64)],
        k: f64,
        boxes: [(f64, f64); 2],
        side_of: impl Fn((f64, f64)) -> Option<usize>,
    ) -> Vec<(usize, (f64, f64))> {
        let mut out = Vec::new();
        if pts.len() < 2 {
            return out;
        }
        let cum = cumulative(pts);
        let len = cum[cum.len() - 1];
        let mut done = [false, false];
        for t in [0.5, 0.35, 0.65, 0.2, 0.8] {
            let (p, dir) = point_at(pts, &cum, t * len);
            let normal = (-dir.1, dir.0);
            for d in REGION_LABEL_DISTANCES_PX.map(|d| d * k) {
                for sgn in [1.0, -1.0] {
                    let q = (p.0 + sgn * d * normal.0, p.1 + sgn * d * normal.1);
                    let Some(side) = side_of(q) else {
                        continue;
                    };
                    if done[side] {
                        continue;
                    }
                    let (w, h) = boxes[side];
                    if self.try_take(Rect::centred(q.0, q.1, w, h)) {
                        out.push((side, q));
                        done[side] = true;
                    }
                    if done[0] && done[1] {
                        return out;
                    }
                }
            }
        }
        out
    }
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

    fn bounds() -> Rect {
        Rect {
            x0: 0.0,
            y0: 0.0,
            x1: 400.0,
            y1: 300.0,
        }
    }

    /// Every rectangle taken lies within the bounds and overlaps no other
    /// (checked here by separating sides, not with `Rect`'s own tests).
    fn assert_disjoint_within(p: &Placer) {
        let b = p.bounds;
        for (i, r) in p.taken.iter().enumerate() {
            let inside = r.x0 >= b.x0 && r.x1 <= b.x1 && r.y0 >= b.y0 && r.y1 <= b.y1;
            assert!(inside, "{r:?} outside");
            for o in &p.taken[i + 1..] {
                let apart = r.x1 <= o.x0 || o.x1 <= r.x0 || r.y1 <= o.y0 || o.y1 <= r.y0;
                assert!(apart, "{r:?} overlaps {o:?}");
            }
        }
    }

    #[test]
    fn labels_on_crossing_lines_never_overlap() {
        let mut p = Placer::new(bounds());
        p.reserve(Rect::centred(200.0, 150.0, 20.0, 20.0));
        let mut placed = 0;
        // A fan of lines through the reserved centre, longer than the
        // bounds, and a ring around it.
        for n in 0..12 {
            let a = f64::from(n) * std::f64::consts::PI / 12.0;
            let (c, s) = (a.cos(), a.sin());
            let line = [
                (200.0 - 300.0 * c, 150.0 - 300.0 * s),
                (200.0 + 300.0 * c, 150.0 + 300.0 * s),
            ];
            placed += p.along_line(&line, (40.0, 16.0), 0.3).len();
        }
        let ring: Vec<(f64, f64)> = (0..=64)
            .map(|i| {
                let a = f64::from(i) * std::f64::consts::TAU / 64.0;
                (200.0 + 100.0 * a.cos(), 150.0 + 100.0 * a.sin())
            })
            .collect();
        placed += p.along_line(&ring, (40.0, 16.0), 0.3).len();
        assert!(placed >= 6, "only {placed} labels placed");
        assert_eq!(p.taken.len(), placed + 1);
        assert_disjoint_within(&p);
        // A line shorter than 2.5 boxes gets no label.
        assert!(p
            .along_line(&[(10.0, 10.0), (100.0, 10.0)], (40.0, 16.0), 1.0)
            .is_empty());
    }

    #[test]
    fn marker_boxes_and_region_names_keep_clear() {
        let mut p = Placer::new(bounds());
        let marker = Rect::centred(200.0, 150.0, 20.0, 20.0);
        p.reserve(marker);
        let first = p.beside_point((200.0, 150.0), (80.0, 20.0), 1.0);
        let second = p.beside_point((200.0, 150.0), (80.0, 20.0), 1.0);
        let (a, b) = (first.expect("room"), second.expect("room"));
        assert!(!a.overlaps(&marker) && !b.overlaps(&marker));
        // The first box sits up and right of the marker, the second below.
        assert!(a.x0 > 200.0 && a.y1 < 150.0, "{a:?}");
        assert!(b.y0 > 150.0, "{b:?}");
        // Names either side of a horizontal line at y = 60: side 1 below.
        let line = [(0.0, 60.0), (400.0, 60.0)];
        let sides = p.either_side(&line, 0.5, [(30.0, 12.0), (40.0, 12.0)], |q| {
            Some(usize::from(q.1 > 60.0))
        });
        assert_eq!(sides.len(), 2, "{sides:?}");
        for (side, q) in &sides {
            assert_eq!(*side == 1, q.1 > 60.0, "{sides:?}");
        }
        assert_disjoint_within(&p);
    }
}
