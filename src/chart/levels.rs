//! Contour levels: automatic "nice" ladders, or an explicit list fitted
//! to the data.
//!
//! A transfer-window field is a bowl: low and flat around the window,
//! steep far from it. Evenly spaced levels either miss the window's shape
//! or pile up into a dark band far away. The automatic ladder therefore
//! starts at least half a small round step above the field's minimum and widens the
//! step along the 1-2-5 sequence every two levels, up to the lowest of
//!
//! * [`TOP_MULTIPLE`] times the minimum (for C3, v-infinity and delta-v,
//!   the range a design trade looks at: common practice, no source),
//! * the field's 60 % quantile (so that the steep outskirts of a small
//!   grid stay readable),
//!
//! but never below a twentieth of the way from the minimum to that quantile
//! (a minimum near zero would otherwise leave no room), and never more
//! than [`MAX_C3_LINES`] lines.

/// Most C3 lines an automatic ladder draws.
pub const MAX_C3_LINES: usize = 12;

/// Most arrival v-infinity lines an automatic ladder draws (fewer than for
/// C3: they are an overlay).
pub const MAX_VINF_LINES: usize = 8;

/// The automatic ladder stops at this multiple of the field's minimum
/// (when the minimum is positive).
pub const TOP_MULTIPLE: f64 = 4.0;

/// Fraction of the field's samples that the automatic ladder covers at
/// most: its top level is at most this quantile.
const COVER_QUANTILE: f64 = 0.6;

/// The ladder reaches at least this fraction of the way from the minimum
/// to the quantile.
const FLOOR_FRACTION: f64 = 0.05;

/// Levels taken at each step size before the step widens.
const LEVELS_PER_STEP: usize = 2;

/// Number of smallest steps the covered range is divided into.
const FINEST_DIVISIONS: f64 = 40.0;

/// The smallest of 1, 2 or 5 times a power of ten that is >= `x` (> 0).
pub(crate) fn nice_ceil(x: f64) -> f64 {
    let p = 10f64.powf(x.log10().floor());
    for m in [1.0, 2.0, 5.0, 10.0] {
        if m * p >= x * (1.0 - 1e-12) {
            return m * p;
        }
    }
    10.0 * p
}

/// The next step after `s` in the 1-2-5 sequence.
fn next_nice(s: f64) -> f64 {
    let p = 10f64.powf(s.log10().floor());
    let m = s / p;
    if m < 1.5 {
        2.0 * p
    } else if m < 3.5 {
        5.0 * p
    } else {
        10.0 * p
    }
}

/// Rounds away float noise from a multiple of `step` (so 0.30000000000000004
/// prints as 0.3).
fn snap(v: f64, step: f64) -> f64 {
    let p = 10f64.powf(step.log10().floor() - 3.0);
    (v / p).round() * p
}

/// An automatic ladder of at most `max_lines` levels for `values` (NaN
/// ignored): nice round numbers above the minimum, denser near it, up to
/// the top the module docs describe.
///
/// Empty when there are no finite values, the field is flat, or
/// `max_lines` is 0.
///
/// # Properties
/// Levels are finite, strictly increasing, all above the minimum and at
/// most the top (the first level is always drawn when the field is not
/// flat); successive gaps never shrink.
pub fn auto_levels(values: impl IntoIterator<Item = f64>, max_lines: usize) -> Vec<f64> {
    let mut v: Vec<f64> = values.into_iter().filter(|x| x.is_finite()).collect();
    if v.is_empty() || max_lines == 0 {
        return Vec::new();
    }
    let k = ((v.len() - 1) as f64 * COVER_QUANTILE).round() as usize;
    let (_, q, _) = v.select_nth_unstable_by(k, f64::total_cmp);
    let quantile = *q;
    let min = v.iter().copied().fold(f64::INFINITY, f64::min);
    let max = v.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    if quantile <= min {
        // Quantile at the minimum (a mostly flat field): use the full range.
        if max > min {
            return auto_from(min, max, max_lines);
        }
        return Vec::new();
    }
    auto_from(min, ladder_top(min, quantile), max_lines)
}

/// The top of the automatic ladder for a field with minimum `min` and
/// 60 % quantile `quantile` (> `min`).
fn ladder_top(min: f64, quantile: f64) -> f64 {
    let floor = min + FLOOR_FRACTION * (quantile - min);
    if min > 0.0 {
        quantile.min((TOP_MULTIPLE * min).max(floor))
    } else {
        quantile
    }
}

fn auto_from(min: f64, top: f64, max_lines: usize) -> Vec<f64> {
    let mut step = nice_ceil((top - min) / FINEST_DIVISIONS);
    let mut out: Vec<f64> = Vec::new();
    let mut at_step = 0;
    // The first level sits at least half a step above the minimum.
    let mut last = min + 0.5 * step - step * 1e-9;
    while out.len() < max_lines {
        // Smallest multiple of the step strictly above the last level.
        let mut next = snap(((last / step).floor() + 1.0) * step, step);
        if next <= last {
            next = snap(next + step, step);
        }
        if next > top && !out.is_empty() {
            break;
        }
        // Gaps may not shrink when the step has just widened.
        if let [.., a, b] = out[..] {
            if next - b < (b - a) * (1.0 - 1e-9) {
                last = next;
                continue;
            }
        }
        out.push(next);
        last = next;
        at_step += 1;
        if at_step == LEVELS_PER_STEP {
            step = next_nice(step);
            at_step = 0;
        }
    }
    out
}

/// Evenly spaced round levels strictly inside the range of `values` (NaN
/// ignored), at most `max_lines` of them: the step is the smallest of 1, 2
/// or 5 times a power of ten that keeps within the cap. For fields without
/// a minimum worth crowding around, such as angles.
///
/// Empty when there are no finite values, the field is flat, or
/// `max_lines` is 0.
///
/// # Properties
/// Levels are finite, strictly increasing, multiples of one step, all
/// strictly between the field's minimum and maximum.
pub fn even_levels(values: impl IntoIterator<Item = f64>, max_lines: usize) -> Vec<f64> {
    let (min, max) = values
        .into_iter()
        .filter(|x| x.is_finite())
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), x| {
            (a.min(x), b.max(x))
        });
    // No finite values leave min = inf, max = -inf.
    if max_lines == 0 || max <= min {
        return Vec::new();
    }
    let mut step = nice_ceil((max - min) / (max_lines as f64 + 1.0));
    loop {
        let first = (min / step).floor() + 1.0;
        let last = (max / step).ceil() - 1.0;
        let n = last - first + 1.0;
        if n <= max_lines as f64 {
            return (0..n.max(0.0) as usize)
                .map(|i| snap((first + i as f64) * step, step))
                .filter(|l| *l > min && *l < max)
                .collect();
        }
        step = next_nice(step);
    }
}

/// C3 levels, km^2/s^2: automatic (at most [`MAX_C3_LINES`]) from the
/// field's values.
pub fn c3_levels(c3_km2_s2: impl IntoIterator<Item = f64>) -> Vec<f64> {
    auto_levels(c3_km2_s2, MAX_C3_LINES)
}

/// Arrival v-infinity levels, km/s: automatic (at most [`MAX_VINF_LINES`]).
pub fn vinf_levels(vinf_km_s: impl IntoIterator<Item = f64>) -> Vec<f64> {
    auto_levels(vinf_km_s, MAX_VINF_LINES)
}

/// An explicit list made usable: non-finite entries dropped, sorted
/// ascending, duplicates removed.
///
/// [`fit_levels`] then sets aside those outside the data.
pub fn explicit_levels(levels: &[f64]) -> Vec<f64> {
    let mut v: Vec<f64> = levels.iter().copied().filter(|x| x.is_finite()).collect();
    v.sort_by(f64::total_cmp);
    v.dedup_by(|a, b| (*a - *b).abs() <= 1e-12 * (1.0 + b.abs()));
    v
}

/// `levels` split into those inside the range of the finite `values`
/// (strictly between the minimum and the maximum, where a line can be
/// drawn) and those outside, with the range (`None` without finite
/// values, when every level is outside).
pub fn fit_levels(
    levels: &[f64],
    values: impl IntoIterator<Item = f64>,
) -> (Vec<f64>, Vec<f64>, Option<(f64, f64)>) {
    let (min, max) = values
        .into_iter()
        .filter(|x| x.is_finite())
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), x| {
            (a.min(x), b.max(x))
        });
    let range = (min <= max).then_some((min, max));
    let (inside, outside) = levels
        .iter()
        .partition(|&&l| range.is_some_and(|(lo, hi)| l > lo && l < hi));
    (inside, outside, range)
}

/// A level as printed on a chart: at most three decimals, trailing zeros
/// dropped (`10`, `2.5`, `0.125`).
pub fn format_level(v: f64) -> String {
    let s = format!("{v:.3}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s == "-0" {
        "0".to_string()
    } else {
        s.to_string()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A bowl with minimum 9.12 rising to about 250: like a C3 field.
    fn bowl() -> Vec<f64> {
        let mut v = Vec::new();
        for i in 0..100 {
            for j in 0..100 {
                let x = (i as f64 - 40.0) / 10.0;
                let y = (j as f64 - 55.0) / 12.0;
                v.push(9.12 + 4.0 * (x * x + y * y) + 0.5 * (x * x * y * y));
            }
        }
        v
    }

    fn check_ladder(levels: &[f64], values: &[f64], cap: usize) {
        let min = values.iter().copied().fold(f64::INFINITY, f64::min);
        assert!(!levels.is_empty());
        assert!(levels.len() <= cap, "{levels:?}");
        assert!(levels[0] > min);
        for w in levels.windows(2) {
            assert!(w[1] > w[0], "increasing: {levels:?}");
        }
        for w in levels.windows(3) {
            assert!(
                w[2] - w[1] >= (w[1] - w[0]) * (1.0 - 1e-9),
                "denser near the minimum: {levels:?}"
            );
        }
        // The first level sits close to the minimum, relative to the span.
        let last = levels[levels.len() - 1];
        assert!(levels[0] - min < 0.2 * (last - min), "{levels:?}");
        // Nice numbers: print with at most two decimals.
        for l in levels {
            let s = format_level(*l);
            let decimals = s.split('.').nth(1).map_or(0, str::len);
            assert!(decimals <= 2, "{s}");
        }
    }

    #[test]
    fn c3_ladder_is_nice_capped_and_dense_near_minimum() {
        let v = bowl();
        let l = c3_levels(v.iter().copied());
        check_ladder(&l, &v, MAX_C3_LINES);
        assert!(l.len() >= 5, "{l:?}");
        // Stops at the 60 % quantile, not at the far corners.
        let mut s = v.clone();
        s.sort_by(f64::total_cmp);
        let q = s[(0.6 * (s.len() - 1) as f64).round() as usize];
        assert!(*l.last().expect("levels") <= q + 1e-9);
        // The window itself gets lines: the first is within 1 of the minimum.
        assert!(l[0] - 9.12 <= 1.0 + 1e-9, "{l:?}");
    }

    #[test]
    fn ladder_stops_at_a_multiple_of_the_minimum_on_a_steep_field() {
        // A fine grid reaching far from the window: a bowl from 12 that
        // climbs past 600 in the corners. The ladder covers the window
        // (from just above 12 to at most 4 x 12 = 48) instead of bundles
        // of lines out to the quantile (about 280 here).
        let v: Vec<f64> = (0..400)
            .flat_map(|i| {
                (0..400).map(move |j| {
                    let x = (f64::from(i) - 200.0) / 40.0;
                    let y = (f64::from(j) - 200.0) / 40.0;
                    12.0 + 24.0 * (x * x + y * y)
                })
            })
            .collect();
        let l = c3_levels(v.iter().copied());
        check_ladder(&l, &v, MAX_C3_LINES);
        assert!(*l.last().expect("levels") <= TOP_MULTIPLE * 12.0, "{l:?}");
        assert!(l.len() >= 5, "{l:?}");
        assert!(l[0] > 12.0 && l[0] <= 14.0, "{l:?}");
        // A minimum near zero still gets a ladder: a twentieth of the way
        // to the quantile (about 460) at least.
        let v: Vec<f64> = v.iter().map(|c| c - 11.99).collect();
        let l = c3_levels(v.iter().copied());
        assert!(l.len() >= 5 && *l.last().expect("levels") >= 20.0, "{l:?}");
    }

    #[test]
    fn levels_outside_the_data_are_set_aside() {
        let v = [12.5, f64::NAN, 30.0, 95.25];
        let (inside, outside, range) = fit_levels(&[10.0, 12.5, 16.0, 90.0, 100.0], v);
        assert_eq!(inside, vec![16.0, 90.0]);
        assert_eq!(outside, vec![10.0, 12.5, 100.0]);
        assert_eq!(range, Some((12.5, 95.25)));
        let (inside, outside, range) = fit_levels(&[1.0], [f64::NAN]);
        assert!(inside.is_empty() && range.is_none());
        assert_eq!(outside, vec![1.0]);
    }

    #[test]
    fn vinf_ladder_in_km_s() {
        let v: Vec<f64> = bowl().iter().map(|c| 2.6 + (c - 9.12) / 40.0).collect();
        let l = vinf_levels(v.iter().copied());
        check_ladder(&l, &v, MAX_VINF_LINES);
        assert!(l.len() >= 4, "{l:?}");
    }

    #[test]
    fn nan_ignored_and_degenerate_fields_give_no_levels() {
        assert!(c3_levels(std::iter::empty()).is_empty());
        assert!(c3_levels([f64::NAN, f64::NAN]).is_empty());
        assert!(c3_levels([5.0; 10]).is_empty());
        let mut v = bowl();
        v.extend([f64::NAN; 50]);
        let l = c3_levels(v.iter().copied());
        assert!(l.iter().all(|x| x.is_finite()));
        assert_eq!(auto_levels(v.iter().copied(), 0), Vec::<f64>::new());
    }

    #[test]
    fn even_ladder_spans_the_range_with_one_round_step() {
        // -47.3 .. 58.9 deg: every 10 deg from -40 to 50.
        let v: Vec<f64> = (0..=100)
            .map(|i| -47.3 + 106.2 * f64::from(i) / 100.0)
            .chain([f64::NAN])
            .collect();
        let l = even_levels(v.iter().copied(), 12);
        assert_eq!(l.len(), 10, "{l:?}");
        assert!((l[0] + 40.0).abs() < 1e-9 && (l[9] - 50.0).abs() < 1e-9);
        // A tighter cap widens the step along 1-2-5.
        let l = even_levels(v.iter().copied(), 5);
        assert_eq!(l, vec![-40.0, -20.0, 0.0, 20.0, 40.0]);
        // A narrow range gets fine steps.
        let l = even_levels([0.12, 0.31], 12);
        assert!(l.len() >= 5 && l.len() <= 12, "{l:?}");
        assert!(l.iter().all(|x| format_level(*x).len() <= 4), "{l:?}");
        assert!(even_levels([3.0; 4], 12).is_empty());
        assert!(even_levels([f64::NAN], 12).is_empty());
        assert!(even_levels([0.0, 1.0], 0).is_empty());
    }

    #[test]
    fn explicit_list_is_cleaned() {
        let l = explicit_levels(&[20.0, f64::NAN, 10.0, 15.0, 10.0, f64::INFINITY]);
        assert_eq!(l.len(), 3);
        for (a, b) in l.iter().zip([10.0, 15.0, 20.0]) {
            assert!((a - b).abs() < 1e-12);
        }
    }

    #[test]
    fn nice_steps() {
        assert!((nice_ceil(1.7) - 2.0).abs() < 1e-12);
        assert!((nice_ceil(0.031) - 0.05).abs() < 1e-12);
        assert!((nice_ceil(7.0) - 10.0).abs() < 1e-12);
        assert!((next_nice(2.0) - 5.0).abs() < 1e-12);
        assert!((next_nice(5.0) - 10.0).abs() < 1e-12);
        assert!((next_nice(0.1) - 0.2).abs() < 1e-12);
    }

    #[test]
    fn level_formatting() {
        assert_eq!(format_level(10.0), "10");
        assert_eq!(format_level(2.5), "2.5");
        assert_eq!(format_level(0.30000000000000004), "0.3");
        assert_eq!(format_level(-0.0001), "0");
    }
}
