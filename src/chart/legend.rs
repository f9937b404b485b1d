//! Legend boxes: one row per item a chart draws, a sample (line, patch or
//! marker) and its text; text that does not fit beside its sample wraps
//! onto a second line, so it never runs over the sample or out of the box.

use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

use super::geometry::Rect;
use super::pen::{MarkerLook, Pen};
use super::style::{
    Line, INK, LEGEND_BORDER_RGB, LEGEND_TEXT_PX, MUTED, PAPER, SMALL_TEXT_PX, THIN_STROKE_PX,
};
use super::ChartError;

// At the reference size, logical px (chosen by eye; no source).
/// Height of a one-line row.
const ROW_PX: f64 = 40.0;
/// Extra height of each further line of a wrapped row.
const WRAP_LINE_PX: f64 = 22.0;
/// Width of a row's sample.
const SAMPLE_PX: f64 = 46.0;
/// Padding inside the box.
const PAD_PX: f64 = 16.0;
/// Height of the note under the rows.
const NOTE_PX: f64 = 30.0;
/// Half the height of a patch sample.
const PATCH_HALF_PX: f64 = 11.0;
/// Gap between a sample and its text.
const TEXT_GAP_PX: f64 = 12.0;
/// Line samples are this much thicker than the lines they show.
const EXTRA_STROKE_PX: f64 = 0.4;

/// How a legend row shows its item.
#[derive(Debug, Clone, Copy)]
pub(crate) enum Sample {
    /// A line of one of the chart's kinds.
    Kind(Line),
    /// A line of any colour, stroke (logical px) and dash.
    Line(RGBColor, f64, Option<(f64, f64)>),
    /// A filled patch, optionally edged on top with a line kind.
    Patch(RGBColor, Option<Line>),
    /// A patch with a line kind drawn through its middle.
    Band(RGBColor, Line),
    /// A marker of the given size (logical px at the reference size).
    Marker(MarkerLook, f64),
}

/// One legend row.
#[derive(Debug, Clone)]
pub(crate) struct Row {
    pub(crate) sample: Sample,
    pub(crate) text: String,
}

impl Row {
    pub(crate) fn new(sample: Sample, text: impl Into<String>) -> Row {
        Row {
            sample,
            text: text.into(),
        }
    }
}

/// `text` broken at spaces into lines of at most `width` logical px.
fn wrap<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    text: &str,
    size_px: f64,
    width: f64,
) -> Result<Vec<String>, ChartError> {
    let mut lines: Vec<String> = Vec::new();
    let mut cur = String::new();
    for word in text.split(' ') {
        let trial = if cur.is_empty() {
            word.to_string()
        } else {
            format!("{cur} {word}")
        };
        if !cur.is_empty() && pen.text_size(&trial, size_px)?.0 > width {
            lines.push(std::mem::replace(&mut cur, word.to_string()));
        } else {
            cur = trial;
        }
    }
    lines.push(cur);
    Ok(lines)
}

/// Draws a legend box from `(x0, y0)` to the right edge `x1`: its rows
/// and an optional note under them. Returns the box.
///
/// # Errors
/// [`ChartError::Draw`] if the backend fails.
pub(crate) fn legend_box<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    (x0, y0, x1): (f64, f64, f64),
    rows: &[Row],
    note: Option<&str>,
) -> Result<Rect, ChartError> {
    let k = pen.k;
    let pad = PAD_PX * k;
    let sample_w = SAMPLE_PX * k;
    let text_x = x0 + pad + sample_w + TEXT_GAP_PX * k;
    let room = x1 - pad - text_x;
    let mut wrapped = Vec::with_capacity(rows.len());
    let mut height = pad * 2.0;
    for row in rows {
        let lines = wrap(pen, &row.text, LEGEND_TEXT_PX, room)?;
        height += ROW_PX * k + WRAP_LINE_PX * k * (lines.len() as f64 - 1.0);
        wrapped.push(lines);
    }
    let note_lines = match note {
        Some(n) => wrap(pen, n, SMALL_TEXT_PX, x1 - x0 - 2.0 * pad)?,
        None => Vec::new(),
    };
    height += NOTE_PX * k * note_lines.len() as f64;
    let frame = Rect {
        x0,
        y0,
        x1,
        y1: y0 + height,
    };
    pen.rect(frame, PAPER, Some((LEGEND_BORDER_RGB, THIN_STROKE_PX)))?;
    let mut top = y0 + pad;
    for (row, lines) in rows.iter().zip(&wrapped) {
        let h = ROW_PX * k + WRAP_LINE_PX * k * (lines.len() as f64 - 1.0);
        let cy = top + h / 2.0;
        sample(pen, row.sample, (x0 + pad, cy), sample_w)?;
        let first = cy - WRAP_LINE_PX * k * (lines.len() as f64 - 1.0) / 2.0;
        for (n, line) in lines.iter().enumerate() {
            pen.text(
                line,
                (text_x, first + WRAP_LINE_PX * k * n as f64),
                LEGEND_TEXT_PX,
                &INK,
                (HPos::Left, VPos::Center),
            )?;
        }
        top += h;
    }
    for (n, line) in note_lines.iter().enumerate() {
        pen.text(
            line,
            (x0 + pad, top + NOTE_PX * k * (n as f64 + 0.5)),
            SMALL_TEXT_PX,
            &MUTED,
            (HPos::Left, VPos::Center),
        )?;
    }
    Ok(frame)
}

/// One sample, `width` wide, starting at `sx` on the row's centre line.
fn sample<DB: DrawingBackend>(
    pen: &Pen<'_, DB>,
    sample: Sample,
    (sx, cy): (f64, f64),
    width: f64,
) -> Result<(), ChartError> {
    let half = PATCH_HALF_PX * pen.k;
    let patch = Rect {
        x0: sx,
        y0: cy - half,
        x1: sx + width,
        y1: cy + half,
    };
    match sample {
        Sample::Kind(l) => pen.line(
            &[(sx, cy), (sx + width, cy)],
            l.legend_colour(),
            l.width_px() + EXTRA_STROKE_PX,
            l.dash_px(),
        ),
        Sample::Line(colour, w, dash) => pen.line(&[(sx, cy), (sx + width, cy)], colour, w, dash),
        Sample::Patch(c, edge) => {
            pen.rect(patch, c, None)?;
            match edge {
                Some(l) => pen.line(
                    &[(patch.x0, patch.y0), (patch.x1, patch.y0)],
                    l.legend_colour(),
                    l.width_px(),
                    l.dash_px(),
                ),
                None => Ok(()),
            }
        }
        Sample::Band(c, l) => {
            pen.rect(patch, c, None)?;
            pen.line(
                &[(sx, cy), (sx + width, cy)],
                l.legend_colour(),
                l.width_px() + EXTRA_STROKE_PX,
                l.dash_px(),
            )
        }
        Sample::Marker(look, r_px) => pen.marker((sx + width / 2.0, cy), r_px * pen.k, look),
    }
}
