//! Grid minima of a design objective, per solution layer and Type.

use crate::transfer::{ArcFlags, Endpoints, TransferType};

use super::grid::Grid;

/// What a design minimises.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Objective {
    /// Departure C3, km^2/s^2.
    C3,
    /// Arrival v-infinity, km/s.
    VinfArrive,
    /// Total delta-v (departure injection plus capture), km/s.
    DvTotal,
    /// Departure C3 plus arrival v-infinity squared, km^2/s^2.
    C3PlusVinf,
}

impl Objective {
    /// All objectives, in the order reports list them.
    pub const ALL: [Objective; 4] = [
        Objective::C3,
        Objective::VinfArrive,
        Objective::DvTotal,
        Objective::C3PlusVinf,
    ];

    /// The name used on the command line and in files.
    pub fn name(&self) -> &'static str {
        match self {
            Objective::C3 => "c3",
            Objective::VinfArrive => "vinf-arrive",
            Objective::DvTotal => "dv-total",
            Objective::C3PlusVinf => "c3+vinf",
        }
    }

    /// Parse a name as printed by [`Objective::name`].
    pub fn from_name(name: &str) -> Option<Objective> {
        Objective::ALL.into_iter().find(|o| o.name() == name)
    }

    /// The objective's value from the two excess speeds (km/s).
    #[inline]
    pub fn value(&self, ends: &Endpoints, vinf_depart_km_s: f64, vinf_arrive_km_s: f64) -> f64 {
        match self {
            Objective::C3 => vinf_depart_km_s * vinf_depart_km_s,
            Objective::VinfArrive => vinf_arrive_km_s,
            Objective::DvTotal => ends.dv_total_km_s(vinf_depart_km_s, vinf_arrive_km_s),
            Objective::C3PlusVinf => {
                vinf_depart_km_s * vinf_depart_km_s + vinf_arrive_km_s * vinf_arrive_km_s
            }
        }
    }
}

/// The lowest objective value among a group of cells.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GridMinimum {
    /// Layer index into [`Grid::layers`].
    pub layer: usize,
    /// Transfer type of the group.
    pub kind: TransferType,
    /// Departure index.
    pub i: usize,
    /// Second-axis index.
    pub j: usize,
    /// Objective value there.
    pub value: f64,
    /// The cell lies on a limit of the grid (first or last value of either
    /// axis): the true minimum may lie beyond it.
    pub edge: bool,
    /// The cell's sanity flags.
    pub flags: ArcFlags,
}

/// The minimum of `objective` over the ok cells of each (layer, Type)
/// group, in layer order then Type I before II, passing over cells flagged
/// `periapsis-inside` or `relativistic` ([`grid_minima_with`] with
/// `allow_flagged = false`).
pub fn grid_minima(grid: &Grid, ends: &Endpoints, objective: Objective) -> Vec<GridMinimum> {
    grid_minima_with(grid, ends, objective, false)
}

/// The minimum of `objective` over the usable cells ([`Grid::usable`]) of
/// each (layer, Type) group, in layer order then Type I before II. Groups
/// without a usable cell are left out. Ties keep the first cell in
/// storage order.
pub fn grid_minima_with(
    grid: &Grid,
    ends: &Endpoints,
    objective: Objective,
    allow_flagged: bool,
) -> Vec<GridMinimum> {
    let nl = grid.layers.len();
    let (last_i, last_j) = (
        grid.depart.count.saturating_sub(1),
        grid.second.count.saturating_sub(1),
    );
    let mut best: Vec<[Option<GridMinimum>; 2]> = vec![[None, None]; nl];
    for i in 0..grid.depart.count {
        for j in 0..grid.second.count {
            for (l, slot) in best.iter_mut().enumerate() {
                let idx = grid.index(i, j, l);
                if !grid.usable(idx, allow_flagged) {
                    continue;
                }
                let v =
                    objective.value(ends, grid.vinf_depart_km_s[idx], grid.vinf_arrive_km_s[idx]);
                let kind = grid.kind_at(idx);
                let k = usize::from(kind == TransferType::II);
                if slot[k].is_none_or(|b| v < b.value) {
                    slot[k] = Some(GridMinimum {
                        layer: l,
                        kind,
                        i,
                        j,
                        value: v,
                        edge: i == 0 || j == 0 || i == last_i || j == last_j,
                        flags: grid.flags_at(idx),
                    });
                }
            }
        }
    }
    best.into_iter().flatten().flatten().collect()
}
