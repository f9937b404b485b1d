//! The departure x arrival grid sweep, in parallel.
//!
//! A sweep solves Lambert's problem for every pair of a departure axis and
//! an arrival (or time-of-flight) axis and stores, per cell and solution
//! layer, the figures of [`crate::transfer::Figures`] in a compact
//! [`Grid`]. Body states are computed once per date, not once per cell.
//! Rows (one departure date each) run in parallel on a rayon pool; each
//! row writes only its own contiguous block, so any thread count gives the
//! same grid bit for bit.

mod grid;
mod minima;

pub use grid::{
    layers_for, Axis, AxisError, CellStatus, Grid, Layer, SecondAxis, BYTES_PER_CELL_LAYER,
};
pub use minima::{grid_minima, grid_minima_with, GridMinimum, Objective};

use nalgebra::Vector3;
use rayon::prelude::*;

use crate::ephemeris::System;
use crate::lambert::{self, Branch, Direction, LambertError, LambertProblem, LambertSolution};
use crate::orbit::State;
use crate::transfer::{ArcFlags, Endpoints, SECONDS_PER_DAY};

/// Everything that defines a sweep.
#[derive(Debug, Clone)]
pub struct SweepSpec {
    /// Departure body index in the system.
    pub from: usize,
    /// Arrival body index in the system.
    pub to: usize,
    /// Departure dates, days past J2000 TDB.
    pub depart: Axis,
    /// Arrival dates (days past J2000 TDB) or times of flight (days).
    pub second: Axis,
    /// What `second` counts.
    pub second_kind: SecondAxis,
    /// Highest number of complete revolutions to solve for.
    pub max_revs: u32,
    /// Parking and capture orbits, asymptote frames.
    pub ends: Endpoints,
}

impl SweepSpec {
    /// Solution layers this sweep produces.
    pub fn layers(&self) -> Vec<Layer> {
        layers_for(self.max_revs)
    }

    /// Cells per layer.
    pub fn cells(&self) -> usize {
        self.depart.count.saturating_mul(self.second.count)
    }

    /// Estimated memory of the result grid and state tables, bytes.
    pub fn memory_estimate_bytes(&self) -> u128 {
        let cells = self.cells() as u128;
        let layers = self.layers().len() as u128;
        let states = (self.depart.count + self.second.count) as u128 * 48;
        cells * layers * BYTES_PER_CELL_LAYER as u128 + states
    }
}

/// Why a sweep did not run.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum SweepError {
    /// The grid would need more memory than allowed.
    #[error(
        "the grid needs about {needed_mib} MiB, over the limit of {limit_mib} MiB: \
         use a larger step, a shorter span or fewer revolutions, or raise the limit"
    )]
    TooLarge {
        /// Estimated need, MiB.
        needed_mib: u128,
        /// The limit, MiB.
        limit_mib: u128,
    },
    /// The thread pool could not be built.
    #[error("cannot start {threads} worker threads: {message}")]
    Threads {
        /// Requested threads.
        threads: usize,
        /// What rayon said.
        message: String,
    },
}

/// Run options that do not change the result.
#[derive(Debug, Clone, Copy, Default)]
pub struct RunOptions {
    /// Worker threads; `None` runs on the caller's rayon pool (the global
    /// one, one thread per core, unless the caller installed another).
    pub threads: Option<usize>,
    /// Refuse grids whose estimate exceeds this many bytes.
    pub memory_limit_bytes: Option<u128>,
}

/// Body states on an evenly spaced lattice of epochs.
struct StateTable {
    states: Vec<State>,
}

impl StateTable {
    fn new(system: &System, body: usize, axis: &Axis) -> StateTable {
        StateTable {
            states: (0..axis.count)
                .map(|i| system.state_at_days(body, axis.value(i)))
                .collect(),
        }
    }
}

/// Sweep the grid. `on_row` is called once per finished departure row,
/// from worker threads (for progress bars).
///
/// # Errors
/// [`SweepError::TooLarge`] before allocating when the estimate exceeds the
/// limit; [`SweepError::Threads`] when the pool cannot start.
pub fn sweep<F>(
    system: &System,
    spec: &SweepSpec,
    opts: RunOptions,
    on_row: F,
) -> Result<Grid, SweepError>
where
    F: Fn() + Sync,
{
    if let Some(limit) = opts.memory_limit_bytes {
        let need = spec.memory_estimate_bytes();
        if need > limit {
            return Err(SweepError::TooLarge {
                needed_mib: need.div_ceil(1 << 20),
                limit_mib: limit >> 20,
            });
        }
    }
    let Some(threads) = opts.threads else {
        // The caller's pool (rayon's global one by default): building a
        // pool costs tens of milliseconds of thread start-up per sweep.
        return Ok(sweep_in_pool(system, spec, &on_row));
    };
    let pool = rayon::ThreadPoolBuilder::new()
        .num_threads(threads)
        .build()
        .map_err(|e| SweepError::Threads {
            threads,
            message: e.to_string(),
        })?;
    Ok(pool.install(|| sweep_in_pool(system, spec, &on_row)))
}

fn sweep_in_pool<F: Fn() + Sync>(system: &System, spec: &SweepSpec, on_row: &F) -> Grid {
    let layers = spec.layers();
    let mut grid = Grid::zeroed(spec.depart, spec.second, spec.second_kind, layers);
    let dep_states = StateTable::new(system, spec.from, &spec.depart);
    // Arrival states: on the arrival axis, or, for time of flight, on the
    // lattice of departure + time of flight when the departure step is a
    // whole multiple of the time-of-flight step; otherwise per cell.
    let arrivals = Arrivals::new(system, spec);
    let ctx = RowContext {
        spec,
        system,
        mu: system.central.mu_km3_s2,
        radius_km: system.central.radius_km,
        n_layers: grid.layers.len(),
        dep_states: &dep_states.states,
        arrivals: &arrivals,
    };
    let row_len = spec.second.count * grid.layers.len();
    if row_len == 0 {
        return grid;
    }
    (
        grid.vinf_depart_km_s.par_chunks_mut(row_len),
        grid.vinf_arrive_km_s.par_chunks_mut(row_len),
        grid.depart_dir.par_chunks_mut(row_len),
        grid.arrive_dir.par_chunks_mut(row_len),
        grid.transfer_angle_deg.par_chunks_mut(row_len),
        grid.status.par_chunks_mut(row_len),
        grid.flags.par_chunks_mut(row_len),
    )
        .into_par_iter()
        .enumerate()
        .for_each(|(i, (vd, va, dd, ad, ang, st, fl))| {
            let mut row = RowOut {
                vd,
                va,
                dd,
                ad,
                ang,
                st,
                fl,
            };
            ctx.fill_row(i, &mut row);
            on_row();
        });
    grid
}

enum Arrivals {
    /// States on the arrival axis (or on a time-of-flight lattice): the
    /// state of cell (i, j) is `states[i * stride + j]`.
    Table { states: Vec<State>, stride: usize },
    /// Computed per cell.
    PerCell,
}

impl Arrivals {
    fn new(system: &System, spec: &SweepSpec) -> Arrivals {
        match spec.second_kind {
            SecondAxis::Arrival => Arrivals::Table {
                states: StateTable::new(system, spec.to, &spec.second).states,
                stride: 0,
            },
            SecondAxis::TimeOfFlight => {
                let ratio = spec.depart.step_days / spec.second.step_days;
                let k = ratio.round();
                if k >= 1.0 && (ratio - k).abs() < 1e-9 && spec.depart.count > 0 {
                    let k = k as usize;
                    let count = (spec.depart.count - 1) * k + spec.second.count;
                    let lattice = Axis {
                        start_days: spec.depart.start_days + spec.second.start_days,
                        step_days: spec.second.step_days,
                        count,
                    };
                    Arrivals::Table {
                        states: StateTable::new(system, spec.to, &lattice).states,
                        stride: k,
                    }
                } else {
                    Arrivals::PerCell
                }
            }
        }
    }
}

struct RowContext<'a> {
    spec: &'a SweepSpec,
    system: &'a System,
    mu: f64,
    /// Central body radius, km: the periapsis check runs only with one.
    radius_km: Option<f64>,
    n_layers: usize,
    dep_states: &'a [State],
    arrivals: &'a Arrivals,
}

struct RowOut<'a> {
    vd: &'a mut [f64],
    va: &'a mut [f64],
    dd: &'a mut [[f32; 3]],
    ad: &'a mut [[f32; 3]],
    ang: &'a mut [f32],
    st: &'a mut [u8],
    fl: &'a mut [u8],
}

impl RowOut<'_> {
    #[inline]
    fn put(
        &mut self,
        k: usize,
        ends: &Endpoints,
        vinf_depart: &Vector3<f64>,
        vinf_arrive: &Vector3<f64>,
        transfer_angle_rad: f64,
        flags: ArcFlags,
    ) {
        self.fl[k] = flags.bits();
        let (vd, dd) = ends.depart_frame.length_and_unit(vinf_depart);
        let (va, ad) = ends.arrive_frame.length_and_unit(vinf_arrive);
        self.vd[k] = vd;
        self.va[k] = va;
        self.dd[k] = dd;
        self.ad[k] = ad;
        // The solver reports the angle in [0, 2 pi) already.
        self.ang[k] = transfer_angle_rad.to_degrees() as f32;
        self.st[k] = CellStatus::Ok as u8;
    }

    /// Every array is written, so the grid can start zeroed (see
    /// [`Grid::zeroed`]).
    #[inline]
    fn fail(&mut self, k: usize, status: CellStatus) {
        self.vd[k] = f64::NAN;
        self.va[k] = f64::NAN;
        self.dd[k] = [f32::NAN; 3];
        self.ad[k] = [f32::NAN; 3];
        self.ang[k] = f32::NAN;
        self.st[k] = status as u8;
        self.fl[k] = 0;
    }
}

/// Map a solver error to the cell status it stands for.
fn status_of(err: &LambertError) -> CellStatus {
    if matches!(err, LambertError::NotConverged { .. }) {
        CellStatus::NotConverged
    } else {
        CellStatus::NoSolution
    }
}

impl RowContext<'_> {
    fn fill_row(&self, i: usize, row: &mut RowOut<'_>) {
        let spec = self.spec;
        let s1 = &self.dep_states[i];
        let normal: Vector3<f64> = s1.r_km.cross(&s1.v_km_s);
        let r1_km = s1.r_km.norm();
        let flags = |sol: &LambertSolution| {
            ArcFlags::of_arc(
                &s1.r_km,
                r1_km,
                &sol.v1,
                &sol.v2,
                sol.transfer_angle_rad,
                sol.revs,
                self.mu,
                self.radius_km,
            )
        };
        let dep_days = spec.depart.value(i);
        for j in 0..spec.second.count {
            let (arr_days, tof_days) = match spec.second_kind {
                SecondAxis::Arrival => {
                    let a = spec.second.value(j);
                    (a, a - dep_days)
                }
                SecondAxis::TimeOfFlight => {
                    let t = spec.second.value(j);
                    (dep_days + t, t)
                }
            };
            let base = j * self.n_layers;
            if tof_days.is_nan() || tof_days <= 0.0 {
                for l in 0..self.n_layers {
                    row.fail(base + l, CellStatus::NoSolution);
                }
                continue;
            }
            let per_cell;
            let s2 = match self.arrivals {
                Arrivals::Table { states, stride } => &states[i * stride + j],
                Arrivals::PerCell => {
                    per_cell = self.system.state_at_days(spec.to, arr_days);
                    &per_cell
                }
            };
            let tof_s = tof_days * SECONDS_PER_DAY;
            match lambert::solve_zero_rev(
                &s1.r_km,
                &s2.r_km,
                tof_s,
                self.mu,
                Direction::Prograde,
                Some(&normal),
            ) {
                Ok(sol) => row.put(
                    base,
                    &spec.ends,
                    &(sol.v1 - s1.v_km_s),
                    &(sol.v2 - s2.v_km_s),
                    sol.transfer_angle_rad,
                    flags(&sol),
                ),
                Err(e) => row.fail(base, status_of(&e)),
            }
            if spec.max_revs == 0 {
                continue;
            }
            let problem = LambertProblem {
                r1: s1.r_km,
                r2: s2.r_km,
                tof: tof_s,
                mu: self.mu,
                direction: Direction::Prograde,
                max_revs: spec.max_revs,
                reference_normal: Some(normal),
            };
            let per_rev = match lambert::solve_each_rev(&problem) {
                Ok(per_rev) => per_rev,
                Err(e) => {
                    for l in 1..self.n_layers {
                        row.fail(base + l, status_of(&e));
                    }
                    continue;
                }
            };
            for (m, result) in (1..=spec.max_revs).zip(per_rev) {
                let l_left = base + 2 * m as usize - 1;
                match result {
                    Ok(sols) => {
                        for sol in &sols {
                            let k = layer_slot(l_left, sol);
                            row.put(
                                k,
                                &spec.ends,
                                &(sol.v1 - s1.v_km_s),
                                &(sol.v2 - s2.v_km_s),
                                sol.transfer_angle_rad,
                                flags(sol),
                            );
                        }
                    }
                    Err(e) => {
                        let st = status_of(&e);
                        row.fail(l_left, st);
                        row.fail(l_left + 1, st);
                    }
                }
            }
        }
    }
}

#[inline]
fn layer_slot(left_slot: usize, sol: &LambertSolution) -> usize {
    match sol.branch {
        Branch::Right => left_slot + 1,
        _ => left_slot,
    }
}

#[cfg(test)]
mod tests;
