//! Polynomial interpolation of tabulated states: Lagrange and Hermite.
//!
//! Both work on a small window of nodes around the requested time; the
//! caller picks the window ([`window`]) and shifts the abscissae so that
//! they are small numbers near zero (better conditioning).

/// First index of the `n` consecutive nodes centred on `x` among the
/// sorted `xs` (clamped so the window stays inside the table).
///
/// With `xs[i] <= x < xs[i + 1]`, the window is `i + 1 - n/2 .. i + 1 + n/2`
/// for even `n` (as many nodes on each side) and one more on the left for
/// odd `n`. Requires `1 <= n <= xs.len()`.
pub(crate) fn window(xs: &[f64], x: f64, n: usize) -> usize {
    let above = xs.partition_point(|&v| v <= x); // first node after x
    let left = above.saturating_sub(1);
    let start = (left + 1).saturating_sub(n.div_ceil(2));
    start.min(xs.len() - n)
}

/// The Lagrange interpolating polynomial through `(xs[j], ys[j])`,
/// evaluated at `x`, for `K` values at once.
///
/// # Method
/// Barycentric formula of the second kind (Berrut & Trefethen,
/// "Barycentric Lagrange Interpolation", SIAM Review 46(3), 2004, eq. 4.2):
/// `p(x) = sum(w_j f_j / (x - x_j)) / sum(w_j / (x - x_j))` with weights
/// `w_j = 1 / prod_{k != j} (x_j - x_k)`; at a node the node's value is
/// returned. The polynomial has degree `xs.len() - 1`.
///
/// # Units
/// Any consistent units; the abscissae must be distinct.
// Exact equality is the point: only an exact node hit divides by zero.
#[allow(clippy::float_cmp)]
pub(crate) fn lagrange<const K: usize>(xs: &[f64], ys: &[[f64; K]], x: f64) -> [f64; K] {
    if let Some(j) = xs.iter().position(|&xj| xj == x) {
        return ys[j];
    }
    let mut num = [0.0; K];
    let mut den = 0.0;
    for (j, &xj) in xs.iter().enumerate() {
        let w: f64 = xs
            .iter()
            .enumerate()
            .filter(|&(k, _)| k != j)
            .map(|(_, &xk)| xj - xk)
            .product();
        let c = 1.0 / (w * (x - xj));
        den += c;
        for (n, y) in num.iter_mut().zip(ys[j].iter()) {
            *n += c * y;
        }
    }
    num.map(|n| n / den)
}

/// The Hermite interpolating polynomial matching values `ys` and first
/// derivatives `dys` at the nodes `xs`, and its derivative, at `x`.
///
/// # Method
/// Newton's divided differences on doubled nodes
/// `z_{2i} = z_{2i+1} = x_i`, with the first divided difference of a
/// doubled pair set to the derivative (Burden & Faires, *Numerical
/// Analysis*, 9th ed., sect. 3.4, Algorithm 3.3). The polynomial has degree
/// `2 xs.len() - 1`; the Newton form is evaluated with its derivative by
/// Horner's rule.
///
/// # Units
/// `dys` in units of `ys` per unit of `xs`; the returned derivative too.
pub(crate) fn hermite(xs: &[f64], ys: &[f64], dys: &[f64], x: f64) -> (f64, f64) {
    let m = 2 * xs.len();
    let z: Vec<f64> = xs.iter().flat_map(|&v| [v, v]).collect();
    // q holds one column of the divided-difference table at a time;
    // coef[k] = f[z_0, ..., z_k].
    let mut q: Vec<f64> = ys.iter().flat_map(|&v| [v, v]).collect();
    let mut coef = vec![0.0; m];
    coef[0] = q[0];
    for k in 1..m {
        for i in (k..m).rev() {
            q[i] = if k == 1 && i % 2 == 1 {
                dys[i / 2]
            } else {
                (q[i] - q[i - 1]) / (z[i] - z[i - k])
            };
        }
        coef[k] = q[k];
    }
    // Horner: p = c0 + (x - z0)(c1 + (x - z1)(c2 + ...)).
    let (mut p, mut dp) = (coef[m - 1], 0.0);
    for k in (0..m - 1).rev() {
        dp = dp * (x - z[k]) + p;
        p = p * (x - z[k]) + coef[k];
    }
    (p, dp)
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// Uniqueness of the interpolating polynomial (any numerical analysis
    /// text, e.g. Burden & Faires sect. 3.1, Theorem 3.2): n nodes
    /// reproduce any polynomial of degree n - 1 exactly (to rounding).
    #[test]
    fn lagrange_reproduces_polynomials() {
        let p = |x: f64| 3.0 - 2.0 * x + 0.5 * x.powi(3) - 0.01 * x.powi(5);
        let xs = [-2.5, -1.0, 0.0, 0.7, 2.0, 3.1];
        let ys: Vec<[f64; 2]> = xs.iter().map(|&x| [p(x), -p(x)]).collect();
        for x in [-2.0, 0.3, 1.234, 2.9] {
            let got = lagrange(&xs, &ys, x);
            assert_relative_eq!(got[0], p(x), epsilon = 1e-12);
            assert_relative_eq!(got[1], -p(x), epsilon = 1e-12);
        }
        assert_eq!(lagrange(&xs, &ys, 0.7)[0].to_bits(), p(0.7).to_bits());
    }

    /// Hermite interpolation with n nodes reproduces polynomials of degree
    /// 2n - 1 and their derivatives (Burden & Faires, sect. 3.4,
    /// Theorem 3.9).
    #[test]
    fn hermite_reproduces_polynomials() {
        let p = |x: f64| 1.0 + x - 0.3 * x.powi(2) + 0.2 * x.powi(4) - 0.05 * x.powi(5);
        let dp = |x: f64| 1.0 - 0.6 * x + 0.8 * x.powi(3) - 0.25 * x.powi(4);
        let xs = [-1.0, 0.5, 2.0];
        let ys: Vec<f64> = xs.iter().map(|&x| p(x)).collect();
        let dys: Vec<f64> = xs.iter().map(|&x| dp(x)).collect();
        for x in [-0.7, 0.0, 0.5, 1.3, 1.99] {
            let (v, d) = hermite(&xs, &ys, &dys, x);
            assert_relative_eq!(v, p(x), epsilon = 1e-12);
            assert_relative_eq!(d, dp(x), epsilon = 1e-12);
        }
    }

    /// Interpolation error theorem (Burden & Faires, Theorem 3.3):
    /// |f(x) - p(x)| <= max|f^(n)| / n! * prod |x - x_i|. For sin, the
    /// n-th derivative is bounded by 1. The error must stay under the
    /// bound and not be far below it (the bound is nearly sharp here), so
    /// a wrong node choice or weight fails.
    #[test]
    fn lagrange_error_follows_the_theorem() {
        let xs: Vec<f64> = (0..8).map(|i| 0.1 * i as f64).collect();
        let ys: Vec<[f64; 1]> = xs.iter().map(|&x| [x.sin()]).collect();
        let x = 0.35;
        let err = (lagrange(&xs, &ys, x)[0] - x.sin()).abs();
        let bound: f64 =
            xs.iter().map(|&xi| (x - xi).abs()).product::<f64>() / (1..=8).product::<u64>() as f64;
        assert!(err <= bound, "{err} > {bound}");
        assert!(err > 0.05 * bound, "{err} far below {bound}");
    }

    #[test]
    fn windows_stay_centred_and_inside() {
        let xs: Vec<f64> = (0..10).map(f64::from).collect();
        assert_eq!(window(&xs, 4.5, 4), 3); // 3 4 | 5 6
        assert_eq!(window(&xs, 4.0, 4), 3); // at a node: that node is left
        assert_eq!(window(&xs, 4.5, 3), 3); // 3 4 | 5
        assert_eq!(window(&xs, 0.2, 6), 0);
        assert_eq!(window(&xs, 8.9, 6), 4);
        assert_eq!(window(&xs, 9.0, 2), 8);
        assert_eq!(window(&xs, -1.0, 2), 0);
    }
}
