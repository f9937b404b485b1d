//! The sweep's axes and its compact struct-of-arrays result grid.

use crate::lambert::Branch;
use crate::time::Epoch;
use crate::transfer::{dec_ra_deg_of_unit, ArcFlags, TransferType};

/// An evenly spaced axis of dates or durations.
///
/// # Units
/// `start_days` is days past J2000 TDB for a date axis, or days for a
/// time-of-flight axis; `step_days` in days.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Axis {
    /// First value.
    pub start_days: f64,
    /// Spacing between values, > 0.
    pub step_days: f64,
    /// Number of values, >= 1.
    pub count: usize,
}

impl Axis {
    /// The axis from `start` to `end` (inclusive where the step lands on
    /// it) every `step_days`.
    ///
    /// # Errors
    /// A non-positive or non-finite step, or `end` before `start`.
    pub fn spanning(start_days: f64, end_days: f64, step_days: f64) -> Result<Axis, AxisError> {
        if !(step_days.is_finite() && step_days > 0.0) {
            return Err(AxisError::Step { step_days });
        }
        if !(start_days.is_finite() && end_days.is_finite()) || end_days < start_days {
            return Err(AxisError::Span {
                start_days,
                end_days,
            });
        }
        // A hair of tolerance so that 0..10 step 0.1 includes 10, and
        // SPAN_SLACK_DAYS so that a span given in UTC or TT keeps its last
        // day: converted to TDB, its two ends differ by whole days plus the
        // change of the periodic TDB - TT term between them (a few ms).
        let count = ((end_days - start_days + SPAN_SLACK_DAYS) / step_days * (1.0 + 1e-12)).floor()
            as usize
            + 1;
        Ok(Axis {
            start_days,
            step_days,
            count,
        })
    }

    /// The `i`-th value.
    #[inline]
    pub fn value(&self, i: usize) -> f64 {
        self.start_days + i as f64 * self.step_days
    }

    /// The last value.
    pub fn end_days(&self) -> f64 {
        self.value(self.count.saturating_sub(1))
    }

    /// All values.
    pub fn values(&self) -> Vec<f64> {
        (0..self.count).map(|i| self.value(i)).collect()
    }
}

/// How far (days) an axis may fall short of landing on its end and still
/// include it: 10 ms, over the 3.3 ms peak-to-peak of the periodic
/// TDB - TT term (amplitude 1.66 ms; Fairhead & Bretagnon 1990, from
/// memory), which makes a UTC or TT span a few ms longer or shorter than
/// whole TDB days.
const SPAN_SLACK_DAYS: f64 = 0.01 / 86_400.0;

/// Why an axis could not be built.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum AxisError {
    /// The step must be a finite number of days > 0.
    #[error("step must be a number of days > 0, got {step_days}")]
    Step {
        /// The rejected step, days.
        step_days: f64,
    },
    /// The span ends before it starts, or is not finite.
    #[error("span ends before it starts ({start_days} .. {end_days} days)")]
    Span {
        /// Start, days.
        start_days: f64,
        /// End, days.
        end_days: f64,
    },
}

/// What the second axis of a sweep counts.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SecondAxis {
    /// Arrival dates (days past J2000 TDB).
    Arrival,
    /// Times of flight (days).
    TimeOfFlight,
}

/// Outcome of one cell of one solution layer.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
#[repr(u8)]
pub enum CellStatus {
    /// Solved; every figure is valid.
    Ok = 0,
    /// No arc exists (arrival not after departure, no solution with this
    /// many revolutions, or degenerate geometry).
    NoSolution = 1,
    /// The solver hit its iteration limit.
    NotConverged = 2,
}

impl CellStatus {
    /// The status as written in files: `ok`, `no solution`, `not converged`.
    pub fn as_str(&self) -> &'static str {
        match self {
            CellStatus::Ok => "ok",
            CellStatus::NoSolution => "no solution",
            CellStatus::NotConverged => "not converged",
        }
    }

    pub(crate) fn from_u8(v: u8) -> CellStatus {
        match v {
            0 => CellStatus::Ok,
            2 => CellStatus::NotConverged,
            _ => CellStatus::NoSolution,
        }
    }
}

/// One solution layer: which revolution count and branch it holds.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Layer {
    /// Complete revolutions.
    pub revs: u32,
    /// Branch (single for zero revolutions).
    pub branch: Branch,
}

/// The layers of a sweep with up to `max_revs` revolutions: zero
/// revolutions first, then for each M the left and right branches.
pub fn layers_for(max_revs: u32) -> Vec<Layer> {
    let mut v = vec![Layer {
        revs: 0,
        branch: Branch::Single,
    }];
    for m in 1..=max_revs {
        v.push(Layer {
            revs: m,
            branch: Branch::Left,
        });
        v.push(Layer {
            revs: m,
            branch: Branch::Right,
        });
    }
    v
}

/// Bytes of grid storage per cell and layer (see [`Grid`]).
pub const BYTES_PER_CELL_LAYER: usize = 2 * 8 + 2 * 3 * 4 + 4 + 1 + 1;

/// Result of a sweep, as a struct of arrays.
///
/// Cell `(i, j)` (departure `i`, second-axis value `j`) of layer `l` sits at
/// index `(i * n_second + j) * n_layers + l` of every array, so one
/// departure row is a contiguous block. Speeds are stored as f64;
/// asymptote directions as f32 unit vectors in the bodies' equator frames
/// (angles good to about 1e-5 deg, far below what mean elements support)
/// and the transfer angle as f32. C3, DLA, RLA, declinations, delta-v and
/// time of flight are derived on reading, not stored; sanity flags
/// ([`ArcFlags`]) take one byte: [`BYTES_PER_CELL_LAYER`] = 46 bytes.
#[derive(Debug, Clone, PartialEq)]
pub struct Grid {
    /// Departure dates.
    pub depart: Axis,
    /// Arrival dates or times of flight.
    pub second: Axis,
    /// What [`Grid::second`] counts.
    pub second_kind: SecondAxis,
    /// Solution layers.
    pub layers: Vec<Layer>,
    /// Departure hyperbolic excess speed, km/s.
    pub vinf_depart_km_s: Vec<f64>,
    /// Arrival hyperbolic excess speed, km/s.
    pub vinf_arrive_km_s: Vec<f64>,
    /// Unit vector of the outgoing asymptote in the departure body's
    /// equator frame (DLA and RLA follow: [`Grid::dla_deg`]).
    pub depart_dir: Vec<[f32; 3]>,
    /// Unit vector of the incoming asymptote in the arrival body's equator
    /// frame ([`Grid::arrive_dec_deg`]).
    pub arrive_dir: Vec<[f32; 3]>,
    /// Transfer angle in the direction of motion, deg in [0, 360).
    pub transfer_angle_deg: Vec<f32>,
    /// [`CellStatus`] as u8.
    pub status: Vec<u8>,
    /// [`ArcFlags`] bits of ok cells (0 otherwise).
    pub flags: Vec<u8>,
}

impl Grid {
    /// An empty (all "no solution") grid for the given axes and layers, to
    /// be filled by a sweep or read back from a file.
    pub fn new(depart: Axis, second: Axis, second_kind: SecondAxis, layers: Vec<Layer>) -> Grid {
        let n = depart.count * second.count * layers.len();
        Grid {
            depart,
            second,
            second_kind,
            layers,
            vinf_depart_km_s: vec![f64::NAN; n],
            vinf_arrive_km_s: vec![f64::NAN; n],
            depart_dir: vec![[f32::NAN; 3]; n],
            arrive_dir: vec![[f32::NAN; 3]; n],
            transfer_angle_deg: vec![f32::NAN; n],
            status: vec![CellStatus::NoSolution as u8; n],
            flags: vec![0; n],
        }
    }

    /// A grid whose arrays are zero (a freshly mapped, lazily zeroed
    /// allocation), for a sweep that writes every cell: the pages are then
    /// first touched by the worker threads, not by one thread up front.
    pub(crate) fn zeroed(
        depart: Axis,
        second: Axis,
        second_kind: SecondAxis,
        layers: Vec<Layer>,
    ) -> Grid {
        let n = depart.count * second.count * layers.len();
        Grid {
            depart,
            second,
            second_kind,
            layers,
            vinf_depart_km_s: vec![0.0; n],
            vinf_arrive_km_s: vec![0.0; n],
            depart_dir: vec![[0.0; 3]; n],
            arrive_dir: vec![[0.0; 3]; n],
            transfer_angle_deg: vec![0.0; n],
            status: vec![0; n],
            flags: vec![0; n],
        }
    }

    /// Number of cells per layer.
    pub fn cells(&self) -> usize {
        self.depart.count * self.second.count
    }

    /// Array index of cell `(i, j)` in layer `l`.
    #[inline]
    pub fn index(&self, i: usize, j: usize, l: usize) -> usize {
        (i * self.second.count + j) * self.layers.len() + l
    }

    /// Departure and arrival dates (days past J2000 TDB) of cell `(i, j)`.
    #[inline]
    pub fn dates_days(&self, i: usize, j: usize) -> (f64, f64) {
        let d = self.depart.value(i);
        match self.second_kind {
            SecondAxis::Arrival => (d, self.second.value(j)),
            SecondAxis::TimeOfFlight => (d, d + self.second.value(j)),
        }
    }

    /// DLA at an index, deg (NaN unless the status is ok).
    pub fn dla_deg(&self, idx: usize) -> f64 {
        dec_ra_deg_of_unit(self.depart_dir[idx]).0
    }

    /// RLA at an index, deg in [0, 360).
    pub fn rla_deg(&self, idx: usize) -> f64 {
        dec_ra_deg_of_unit(self.depart_dir[idx]).1
    }

    /// Declination of the arrival asymptote at an index, deg.
    pub fn arrive_dec_deg(&self, idx: usize) -> f64 {
        dec_ra_deg_of_unit(self.arrive_dir[idx]).0
    }

    /// Right ascension of the arrival asymptote at an index, deg.
    pub fn arrive_ra_deg(&self, idx: usize) -> f64 {
        dec_ra_deg_of_unit(self.arrive_dir[idx]).1
    }

    /// Status of a cell.
    pub fn status_at(&self, idx: usize) -> CellStatus {
        CellStatus::from_u8(self.status[idx])
    }

    /// Sanity flags of a cell (none unless its status is ok).
    pub fn flags_at(&self, idx: usize) -> ArcFlags {
        ArcFlags::from_bits(self.flags[idx])
    }

    /// Whether a cell is solved and may be an optimum: ok, and not flagged
    /// `periapsis-inside` or `relativistic` unless `allow_flagged`.
    #[inline]
    pub fn usable(&self, idx: usize, allow_flagged: bool) -> bool {
        self.status[idx] == CellStatus::Ok as u8
            && (allow_flagged || !self.flags_at(idx).excludes())
    }

    /// C3 at an index, km^2/s^2 (NaN unless the status is ok).
    #[inline]
    pub fn c3_km2_s2(&self, idx: usize) -> f64 {
        let v = self.vinf_depart_km_s[idx];
        v * v
    }

    /// Transfer type at an index (the stored angle lies in [0, 360)).
    #[inline]
    pub fn kind_at(&self, idx: usize) -> TransferType {
        if self.transfer_angle_deg[idx] < 180.0 {
            TransferType::I
        } else {
            TransferType::II
        }
    }

    /// The layer whose ok solution minimises `objective` at cell `(i, j)`
    /// (ties keep the lower layer), or `None` when no layer solved it.
    pub fn best_layer(
        &self,
        i: usize,
        j: usize,
        objective: super::Objective,
        ends: &crate::transfer::Endpoints,
    ) -> Option<usize> {
        (0..self.layers.len())
            .filter(|&l| self.status[self.index(i, j, l)] == CellStatus::Ok as u8)
            .map(|l| {
                let idx = self.index(i, j, l);
                let v =
                    objective.value(ends, self.vinf_depart_km_s[idx], self.vinf_arrive_km_s[idx]);
                (l, v)
            })
            .min_by(|a, b| a.1.total_cmp(&b.1).then(a.0.cmp(&b.0)))
            .map(|(l, _)| l)
    }

    /// Counts of cells by status over every layer.
    pub fn status_counts(&self) -> [(CellStatus, usize); 3] {
        let mut c = [0usize; 3];
        for &s in &self.status {
            c[usize::from(s.min(2))] += 1;
        }
        [
            (CellStatus::Ok, c[0]),
            (CellStatus::NoSolution, c[1]),
            (CellStatus::NotConverged, c[2]),
        ]
    }

    /// Epoch of departure index `i`.
    pub fn depart_epoch(&self, i: usize) -> Epoch {
        Epoch::from_days_since_j2000_tdb(self.depart.value(i))
    }
}
