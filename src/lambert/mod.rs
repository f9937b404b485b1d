//! Lambert's two-point boundary-value problem.
//!
//! Given two position vectors, a time of flight and a gravitational
//! parameter, find the two-body arc (its velocities at both ends) that
//! connects them. The sweep calls [`solve_zero_rev`] for every cell of a
//! departure/arrival grid; [`solve_zero_rev_batch`] solves a slice of
//! problems in SIMD lanes with the same results bit for bit; [`solve`]
//! and [`solve_revs`] add the multi-revolution solutions; [`cases`] is the
//! seeded problem set the benchmarks and tests share.
//!
//! # Method
//! D. Izzo, "Revisiting Lambert's problem", Celestial Mechanics and
//! Dynamical Astronomy 121 (2015) 1-15, DOI 10.1007/s10569-014-9587-y:
//! a single non-dimensional variable `x`, Householder iterations from
//! analytic initial guesses, and a velocity reconstruction that has no
//! singularity at 180 degrees. Deviations from the printed algorithm, all
//! for accuracy, robustness or speed:
//! - `lambda` from half-angle identities: `lambda = sqrt(r1 r2)
//!   cos(theta/2) / s` with `|cos(theta/2)| = |r1_hat + r2_hat| / 2`,
//!   instead of `sqrt(1 - c/s)`, which loses about half the digits near
//!   180 degrees; the transfer angle from the same half-angles;
//! - between the anchors `T0 = T(0)` and `T1 = T(1)` the initial guess is
//!   the linear interpolation `x0 = (T0 - T)/(T0 - T1)` (the printed
//!   formula for that range is reported wrong);
//! - Householder iterations stop at a last correction below `3e-4`
//!   (relative to `min(1, 1 + x)`): the update is of order four, so the
//!   root is then at rounding;
//! - the careful path (below) keeps every iterate in the domain (`x > -1`,
//!   and inside the branch's bracket for multiple revolutions) by a
//!   bisection safeguard;
//! - near the parabola `T(x)` comes from its power series (see
//!   `izzo.rs`), free of the closed form's cancellation.
//!
//! Zero revolutions run first on a fast path written once for one problem
//! or a pack of SIMD lanes (`fast.rs`); it declines invalid, degenerate
//! and rare cases to the careful path (`solver.rs`), which reports typed
//! errors. Every transcendental function in the solver is this crate's
//! own kernel (`kernels/`), within about one ulp, so results do not
//! depend on the platform's C library, and scalar and SIMD paths agree
//! bit for bit.
//!
//! # Conventions
//! - **Direction**: [`Direction::Prograde`] means the transfer's angular
//!   momentum has a positive component along the reference normal (the
//!   problem's `reference_normal`, default +z of the input frame). When
//!   `r1 x r2` is exactly perpendicular to the normal, "prograde" takes
//!   the short way.
//! - **Transfer angle**: measured from `r1` to `r2` in the direction of
//!   motion, in `[0, 2 pi)`; above `pi` is the long way (the
//!   mission-design "Type II").
//! - **Near 180 degrees** (within [`ANGLE_TOLERANCE_RAD`]) the plane of
//!   `r1` and `r2` is undefined (or ill-conditioned): the transfer plane
//!   is then spanned by `r1` and the part of the reference normal
//!   perpendicular to `r1`, and any out-of-plane part of `r2` (at most
//!   `1e-6 |r2|`) is ignored. If that part of the normal is (nearly) zero
//!   the problem fails with [`LambertError::UndefinedPlane`].
//! - **Near 0 / 360 degrees** (within [`ANGLE_TOLERANCE_RAD`]):
//!   [`LambertError::Collinear`].
//! - **Order of solutions** from [`solve`]: by revolutions ascending;
//!   for each `M > 0`, [`Branch::Left`] before [`Branch::Right`].
//!
//! # Units
//! Any consistent set: the positions' length unit, the time of flight's
//! time unit, and `mu` in length^3/time^2 (synodic uses km, s, km^3/s^2);
//! velocities come out in length/time.

mod batch;
pub mod cases;
mod fast;
mod izzo;
mod kernels;
mod lanes;
mod solver;
#[cfg(test)]
mod tests;
mod types;

pub use batch::{solve_zero_rev_batch, solve_zero_rev_batch_on, BatchError, Lanes};
pub use solver::{solve, solve_each_rev, solve_revs, solve_zero_rev};
pub use types::{
    Branch, Direction, LambertError, LambertProblem, LambertSolution, ANGLE_TOLERANCE_RAD,
};
