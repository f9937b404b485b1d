//! Derivative-free minimisation in two variables (Nelder-Mead), and
//! golden-section search in one.

/// Result of a minimisation: the best point, its value and the work done.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Minimum2 {
    /// Best point found.
    pub x: [f64; 2],
    /// Objective there.
    pub value: f64,
    /// Objective evaluations used.
    pub evaluations: u32,
    /// Whether the simplex shrank below the tolerance (else the
    /// evaluation cap stopped it).
    pub converged: bool,
}

/// Minimise `f` from `start` with a first simplex of edge `step` along each
/// axis, until every vertex lies within `tol` of the best in both
/// coordinates, or `max_evals` evaluations.
///
/// `f` may return `f64::INFINITY` (or NaN, treated as infinity) outside
/// the feasible region; the best vertex never gets worse than `f(start)`.
///
/// # Method
/// Nelder & Mead (1965), "A simplex method for function minimization",
/// *The Computer Journal* 7(4), 308-313, with the standard coefficients
/// (reflection 1, expansion 2, contraction 1/2, shrink 1/2) and the
/// inside/outside contraction of Lagarias et al. (1998), *SIAM J. Optim.*
/// 9(1), 112-147, section 2.
pub fn nelder_mead<F>(
    mut f: F,
    start: [f64; 2],
    step: [f64; 2],
    tol: f64,
    max_evals: u32,
) -> Minimum2
where
    F: FnMut([f64; 2]) -> f64,
{
    let mut evals = 0u32;
    let mut eval = |x: [f64; 2]| {
        evals += 1;
        let v = f(x);
        if v.is_nan() {
            f64::INFINITY
        } else {
            v
        }
    };
    let mut pts = [
        start,
        [start[0] + step[0], start[1]],
        [start[0], start[1] + step[1]],
    ];
    let mut vals = [eval(pts[0]), eval(pts[1]), eval(pts[2])];
    let mut converged = false;
    let mut used = 3u32;
    while used < max_evals {
        // Order best .. worst.
        let mut order = [0usize, 1, 2];
        order.sort_by(|&a, &b| vals[a].total_cmp(&vals[b]));
        pts = [pts[order[0]], pts[order[1]], pts[order[2]]];
        vals = [vals[order[0]], vals[order[1]], vals[order[2]]];
        let spread = (1..3)
            .map(|k| {
                (pts[k][0] - pts[0][0])
                    .abs()
                    .max((pts[k][1] - pts[0][1]).abs())
            })
            .fold(0.0, f64::max);
        if spread < tol && vals[0].is_finite() {
            converged = true;
            break;
        }
        let centroid = [(pts[0][0] + pts[1][0]) / 2.0, (pts[0][1] + pts[1][1]) / 2.0];
        let along = |t: f64| {
            [
                centroid[0] + t * (pts[2][0] - centroid[0]),
                centroid[1] + t * (pts[2][1] - centroid[1]),
            ]
        };
        let xr = along(-1.0);
        let fr = eval(xr);
        used += 1;
        if fr < vals[0] {
            let xe = along(-2.0);
            let fe = eval(xe);
            used += 1;
            if fe < fr {
                pts[2] = xe;
                vals[2] = fe;
            } else {
                pts[2] = xr;
                vals[2] = fr;
            }
            continue;
        }
        if fr < vals[1] {
            pts[2] = xr;
            vals[2] = fr;
            continue;
        }
        // Contract: outside if the reflection beat the worst, else inside.
        let (xc, fc) = if fr < vals[2] {
            let x = along(-0.5);
            (x, eval(x))
        } else {
            let x = along(0.5);
            (x, eval(x))
        };
        used += 1;
        if fc < vals[2].min(fr) {
            pts[2] = xc;
            vals[2] = fc;
            continue;
        }
        // Shrink towards the best vertex.
        for k in 1..3 {
            pts[k] = [
                pts[0][0] + 0.5 * (pts[k][0] - pts[0][0]),
                pts[0][1] + 0.5 * (pts[k][1] - pts[0][1]),
            ];
            vals[k] = eval(pts[k]);
            used += 1;
        }
    }
    let best = (0..3)
        .min_by(|&a, &b| vals[a].total_cmp(&vals[b]))
        .unwrap_or(0);
    Minimum2 {
        x: pts[best],
        value: vals[best],
        evaluations: evals,
        converged,
    }
}

/// Minimise a unimodal `f` on `[lo, hi]` to an interval of width `tol`.
/// Returns `(x, f(x))` of the best point evaluated.
///
/// # Method
/// Golden-section search (Kiefer 1953, "Sequential minimax search for a
/// maximum", *Proc. AMS* 4(3), 502-506).
pub fn golden<F>(mut f: F, lo: f64, hi: f64, tol: f64) -> (f64, f64)
where
    F: FnMut(f64) -> f64,
{
    let inv_phi = (5f64.sqrt() - 1.0) / 2.0;
    let (mut a, mut b) = (lo, hi);
    let mut c = b - inv_phi * (b - a);
    let mut d = a + inv_phi * (b - a);
    let clean = |v: f64| if v.is_nan() { f64::INFINITY } else { v };
    let (mut fc, mut fd) = (clean(f(c)), clean(f(d)));
    let mut best = if fc <= fd { (c, fc) } else { (d, fd) };
    let mut guard = 0;
    while (b - a).abs() > tol && guard < 200 {
        guard += 1;
        if fc <= fd {
            b = d;
            d = c;
            fd = fc;
            c = b - inv_phi * (b - a);
            fc = clean(f(c));
            if fc < best.1 {
                best = (c, fc);
            }
        } else {
            a = c;
            c = d;
            fc = fd;
            d = a + inv_phi * (b - a);
            fd = clean(f(d));
            if fd < best.1 {
                best = (d, fd);
            }
        }
    }
    best
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Rosenbrock's banana function, minimum 0 at (1, 1): Rosenbrock
    /// (1960), "An automatic method for finding the greatest or least value
    /// of a function", *The Computer Journal* 3(3), 175-184.
    #[test]
    fn nelder_mead_finds_rosenbrock_minimum() {
        let f = |x: [f64; 2]| 100.0 * (x[1] - x[0] * x[0]).powi(2) + (1.0 - x[0]).powi(2);
        let m = nelder_mead(f, [-1.2, 1.0], [0.1, 0.1], 1e-9, 5000);
        assert!(m.converged);
        assert!(
            (m.x[0] - 1.0).abs() < 1e-6 && (m.x[1] - 1.0).abs() < 1e-6,
            "{m:?}"
        );
    }

    #[test]
    fn nelder_mead_respects_infeasible_regions_and_never_worsens() {
        // Minimum of the unconstrained bowl at (3, 3) lies outside x < 2.
        let f = |x: [f64; 2]| {
            if x[0] >= 2.0 {
                f64::INFINITY
            } else {
                (x[0] - 3.0).powi(2) + (x[1] - 3.0).powi(2)
            }
        };
        let start = [0.0, 0.0];
        let m = nelder_mead(f, start, [0.5, 0.5], 1e-8, 4000);
        assert!(m.value <= f(start));
        assert!(m.x[0] < 2.0 && m.x[0] > 1.99, "{m:?}");
        assert!((m.x[1] - 3.0).abs() < 1e-4, "{m:?}");
    }

    #[test]
    fn golden_section_finds_parabola_vertex() {
        let (x, v) = golden(|x| (x - 0.3).powi(2) + 2.0, -1.0, 4.0, 1e-10);
        assert!((x - 0.3).abs() < 1e-8);
        assert!((v - 2.0).abs() < 1e-12);
    }
}
