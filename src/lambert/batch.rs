//! Zero-revolution Lambert problems in batches: several problems advanced
//! together in SIMD lanes, with the same results, bit for bit, as
//! [`solve_zero_rev`](super::solve_zero_rev) on each.
//!
//! # Method
//! The fast path of `fast.rs` (Izzo 2015, see [`crate::lambert`]) runs on
//! a pack of problems, one per lane: geometry, initial guess, Householder
//! iterations in lock step (a lane that has converged keeps its root while
//! the others go on; the pack stops when no lane is active) and the
//! velocities. Every operation is the scalar one lane by lane (see
//! `lanes/mod.rs`: correctly rounded or exact, no fused multiply-add),
//! branches become per-lane selections, and the transcendental functions
//! are this crate's kernels (`kernels/mod.rs`), the same code on `f64` and
//! on packs. Lanes the fast path declines (invalid or degenerate input, a
//! step away from the root, the iteration cap) and the last problems that
//! do not fill a pack are solved by [`solve_zero_rev`](super::solve_zero_rev) itself, so the two
//! agree on every problem whatever the CPU: the test
//! `batch_equals_scalar_bitwise` checks 100,000 problems on every lane
//! set this CPU has.
//!
//! # Lane sets
//! Chosen at run time ([`Lanes::detect`]): AVX-512F, AVX2, SSE2 (the
//! x86-64 baseline); elsewhere, or on request, plain arrays of 4 lanes
//! ([`Lanes::Portable`]). The x86 sets run two registers side by side
//! (16, 8 and 4 lanes): the solver waits on divisions, square roots and
//! polynomial chains, and two independent chains keep the CPU busy
//! (measured per solve on SSE2: 114 ns with one register, 83 ns with
//! two).

use super::fast::{self, Pack};
use super::lanes::{Pair, Portable, Real};
use super::solver::{fast_to_solution, zero_rev_of};
use super::types::{LambertError, LambertProblem, LambertSolution};

#[cfg(target_arch = "x86_64")]
use super::lanes::{F64x2, F64x4, F64x8};

/// A set of SIMD lanes the batch solver can run on.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
#[non_exhaustive]
pub enum Lanes {
    /// Plain arrays of 4 `f64`: any CPU.
    Portable,
    /// x86-64 SSE2 registers (every x86-64 CPU): 4 lanes in two
    /// registers.
    Sse2,
    /// x86-64 AVX2 registers: 8 lanes in two registers.
    Avx2,
    /// x86-64 AVX-512F registers: 16 lanes in two registers.
    Avx512,
}

impl Lanes {
    /// The widest lane set this CPU runs.
    pub fn detect() -> Lanes {
        *Lanes::available()
            .last()
            .expect("the portable lanes are always available")
    }

    /// Every lane set this CPU runs, narrowest first (always starting with
    /// [`Lanes::Portable`]).
    pub fn available() -> Vec<Lanes> {
        [Lanes::Portable, Lanes::Sse2, Lanes::Avx2, Lanes::Avx512]
            .into_iter()
            .filter(|l| l.is_available())
            .collect()
    }

    /// Whether this CPU runs this lane set.
    pub fn is_available(self) -> bool {
        match self {
            Lanes::Portable => true,
            #[cfg(target_arch = "x86_64")]
            Lanes::Sse2 => true,
            #[cfg(target_arch = "x86_64")]
            Lanes::Avx2 => std::arch::is_x86_feature_detected!("avx2"),
            #[cfg(target_arch = "x86_64")]
            Lanes::Avx512 => std::arch::is_x86_feature_detected!("avx512f"),
            #[cfg(not(target_arch = "x86_64"))]
            _ => false,
        }
    }

    /// Problems solved together.
    pub fn count(self) -> usize {
        match self {
            Lanes::Portable | Lanes::Sse2 => 4,
            Lanes::Avx2 => 8,
            Lanes::Avx512 => 16,
        }
    }
}

/// Why a batch was not solved (problems in a batch fail one by one, in
/// their results).
#[derive(Debug, Clone, Copy, PartialEq, Eq, thiserror::Error)]
#[non_exhaustive]
pub enum BatchError {
    /// The result slice does not match the problem slice.
    #[error("{problems} problems but room for {results} results")]
    LengthMismatch {
        /// Problems given.
        problems: usize,
        /// Result slots given.
        results: usize,
    },
    /// The requested lane set does not run on this CPU.
    #[error("this CPU cannot run the {lanes:?} lanes")]
    Unavailable {
        /// The lane set asked for.
        lanes: Lanes,
    },
}

/// Solves every problem of `problems` into the same slot of `out`, on the
/// widest lanes this CPU has: `out[i]` is exactly what
/// [`solve_zero_rev`](super::solve_zero_rev) returns for `problems[i]` (`max_revs` is ignored).
///
/// # Method
/// See the module docs.
///
/// # Units
/// As [`LambertProblem`].
///
/// # Errors
/// [`BatchError::LengthMismatch`] when the slices differ in length (nothing
/// is solved). Each problem's own failure is its result.
pub fn solve_zero_rev_batch(
    problems: &[LambertProblem],
    out: &mut [Result<LambertSolution, LambertError>],
) -> Result<(), BatchError> {
    solve_zero_rev_batch_on(Lanes::detect(), problems, out)
}

/// [`solve_zero_rev_batch`] on the given lane set (for comparisons and
/// benchmarks); the results are the same on every lane set.
///
/// # Errors
/// As [`solve_zero_rev_batch`], and [`BatchError::Unavailable`] when this
/// CPU does not run `lanes`.
pub fn solve_zero_rev_batch_on(
    lanes: Lanes,
    problems: &[LambertProblem],
    out: &mut [Result<LambertSolution, LambertError>],
) -> Result<(), BatchError> {
    if problems.len() != out.len() {
        return Err(BatchError::LengthMismatch {
            problems: problems.len(),
            results: out.len(),
        });
    }
    if !lanes.is_available() {
        return Err(BatchError::Unavailable { lanes });
    }
    match lanes {
        #[cfg(target_arch = "x86_64")]
        Lanes::Sse2 => run::<Pair<F64x2>>(problems, out),
        // SAFETY (both): the CPU has the extension (checked above).
        #[cfg(target_arch = "x86_64")]
        Lanes::Avx2 => unsafe { run_avx2(problems, out) },
        #[cfg(target_arch = "x86_64")]
        Lanes::Avx512 => unsafe { run_avx512(problems, out) },
        _ => run::<Portable<4>>(problems, out),
    }
    Ok(())
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
fn run_avx2(problems: &[LambertProblem], out: &mut [Result<LambertSolution, LambertError>]) {
    run::<Pair<F64x4>>(problems, out);
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx512f")]
fn run_avx512(problems: &[LambertProblem], out: &mut [Result<LambertSolution, LambertError>]) {
    run::<Pair<F64x8>>(problems, out);
}

/// Full packs on the lanes, the rest one by one.
#[inline(always)]
fn run<R: Real>(problems: &[LambertProblem], out: &mut [Result<LambertSolution, LambertError>]) {
    let n = R::LANES;
    let full = problems.len() / n * n;
    for (ps, os) in problems[..full]
        .chunks_exact(n)
        .zip(out[..full].chunks_exact_mut(n))
    {
        solve_pack::<R>(ps, os);
    }
    for (p, o) in problems[full..].iter().zip(&mut out[full..]) {
        *o = zero_rev_of(p);
    }
}

/// Widest pack: the size of the staging buffers.
const MAX_LANES: usize = 16;

/// One pack: `ps.len() == R::LANES`.
#[inline(always)]
fn solve_pack<R: Real>(ps: &[LambertProblem], os: &mut [Result<LambertSolution, LambertError>]) {
    // Gather, one lane set at a time (no staging buffer to clear).
    let lane = |f: &dyn Fn(&LambertProblem) -> f64| {
        let mut v = [0.0; MAX_LANES];
        for (vi, p) in v.iter_mut().zip(ps) {
            *vi = f(p);
        }
        R::load(&v)
    };
    let normal =
        |p: &LambertProblem, k: usize| p.reference_normal.map_or(f64::from(k == 2), |n| n[k]);
    let pack = Pack {
        r1: [lane(&|p| p.r1.x), lane(&|p| p.r1.y), lane(&|p| p.r1.z)],
        r2: [lane(&|p| p.r2.x), lane(&|p| p.r2.y), lane(&|p| p.r2.z)],
        tof: lane(&|p| p.tof),
        mu: lane(&|p| p.mu),
        sense: lane(&|p| p.direction.sense()),
        normal: [
            lane(&|p| normal(p, 0)),
            lane(&|p| normal(p, 1)),
            lane(&|p| normal(p, 2)),
        ],
    };
    let sol = fast::zero_rev(&pack);
    let mut res = [[0.0; MAX_LANES]; 8];
    for (k, v) in sol.v1.iter().chain(&sol.v2).enumerate() {
        v.store(&mut res[k]);
    }
    sol.theta.store(&mut res[6]);
    sol.iterations.store(&mut res[7]);
    let mut done = [false; MAX_LANES];
    R::mask_store(sol.done, &mut done);
    for (i, (p, o)) in ps.iter().zip(os.iter_mut()).enumerate() {
        *o = if done[i] {
            Ok(fast_to_solution(&fast::PackSolution {
                v1: [res[0][i], res[1][i], res[2][i]],
                v2: [res[3][i], res[4][i], res[5][i]],
                theta: res[6][i],
                iterations: res[7][i],
                done: true,
            }))
        } else {
            zero_rev_of(p)
        };
    }
}

#[cfg(test)]
mod tests;
