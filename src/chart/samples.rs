//! Analytic sample grids and the charts kept as golden files.
//!
//! Benchmarks, the chart tests and `examples/chart_fixtures.rs` draw the
//! same grids, so they live here rather than in one test module. The grids
//! are invented smooth fields over the invented Veyra dates, not sweep
//! results: each field is a closed form, so a test can say where a line
//! must lie without running the code under test.
//!
//! The golden files under `src/chart/testdata/` are [`golden_charts`]
//! rendered once and committed; `examples/chart_fixtures.rs` rewrites them
//! when a chart is meant to change.

use super::calendar::days_j2000_from_civil;
use super::{
    render_panel_svg, render_svg, ChartError, ChartSpec, Marker, MarkerFigures, OverviewPoint,
    OverviewSpec, Panel,
};
use crate::sweep::{layers_for, Axis, CellStatus, Grid, Objective, SecondAxis};
use crate::transfer::{Endpoints, TransferType};

/// Samples along each axis of [`analytic_grid`].
const ANALYTIC_N: usize = 200;

/// A synthetic `n x n` zero-revolution grid with analytic fields, for
/// benchmarks and examples: departures over 400 days from 2031-01-01,
/// arrivals 90 to 700 days after the first departure; two C3 bowls either
/// side of a 180-degree ridge, arrival v-infinity in another bowl, and no
/// solution for flights shorter than 60 days.
pub fn synthetic_grid(n: usize) -> Grid {
    let n = n.max(2);
    let start = days_j2000_from_civil(2031, 1, 1);
    let depart = Axis {
        start_days: start,
        step_days: 400.0 / (n as f64 - 1.0),
        count: n,
    };
    let second = Axis {
        start_days: start + 90.0,
        step_days: 610.0 / (n as f64 - 1.0),
        count: n,
    };
    let mut g = Grid::new(depart, second, SecondAxis::Arrival, layers_for(0));
    for i in 0..n {
        for j in 0..n {
            let (d, a) = g.dates_days(i, j);
            let idx = g.index(i, j, 0);
            let tof = a - d;
            if tof < 60.0 {
                continue;
            }
            // 0..1 across the departures.
            let x = (d - start) / 400.0;
            // The Type I/II ridge: tof = 300 - 60 x days.
            let ridge_tof = 300.0 - 60.0 * x;
            let angle = (180.0 + 0.55 * (tof - ridge_tof)).rem_euclid(360.0);
            let near = (angle - 180.0).abs().max(0.0);
            let u1 = (x - 0.35) / 0.18;
            let v1 = (tof - 210.0) / 70.0;
            let u2 = (x - 0.55) / 0.22;
            let v2 = (tof - 420.0) / 110.0;
            let bowl1 = 9.1 + 14.0 * (u1 * u1 + v1 * v1 + 0.6 * u1 * v1);
            let bowl2 = 12.4 + 11.0 * (u2 * u2 + v2 * v2 - 0.5 * u2 * v2);
            let c3 = bowl1.min(bowl2) + 90.0 / (near + 2.5);
            let w1 = (x - 0.45) / 0.3;
            let w2 = (tof - 330.0) / 160.0;
            let vinf = 2.6 + 2.2 * (w1 * w1 + w2 * w2) + 6.0 / (near + 4.0);
            g.vinf_depart_km_s[idx] = c3.sqrt();
            g.vinf_arrive_km_s[idx] = vinf;
            g.transfer_angle_deg[idx] = angle as f32;
            g.status[idx] = CellStatus::Ok as u8;
        }
    }
    g
}

/// Centre of [`analytic_grid`]'s C3 bowl in departure, days past J2000
/// TDB (2031-07-20 00:00 TDB).
pub fn analytic_centre_days() -> f64 {
    days_j2000_from_civil(2031, 1, 1) + 200.0
}

/// A 200 x 200 grid with analytic fields, on an arrival-date or a
/// time-of-flight second axis:
///
/// * C3 = 5 + 20 (u^2 + v^2) km^2/s^2, u = (d - dc) / 80,
///   v = (tof - 260) / 90, with dc = [`analytic_centre_days`] and d, tof
///   in days;
/// * arrival v-infinity = 3 + 2 (u'^2 + v'^2) km/s,
///   u' = (d - dc + 30) / 90, v' = (tof - 300) / 100;
/// * the transfer angle 180 + 0.6 (tof - 250) deg, wrapped into 0..360:
///   it crosses 180 deg at tof = 250 days and wraps past 360 at
///   tof = 550 days;
/// * no solution for tof < 80 days nor in a block at d - dc in [30, 50],
///   tof in [240, 280] (which the C3 = 10 line and the 180-degree line
///   cross).
///
/// Departures start on 2031-01-01 every 2 days; the second axis holds
/// arrivals every 3 days from 100 days after that, or times of flight
/// every 3 days from 60 days.
pub fn analytic_grid(kind: SecondAxis) -> Grid {
    let start = days_j2000_from_civil(2031, 1, 1);
    let dc = analytic_centre_days();
    let depart = Axis {
        start_days: start,
        step_days: 2.0,
        count: ANALYTIC_N,
    };
    let second = match kind {
        SecondAxis::Arrival => Axis {
            start_days: start + 100.0,
            step_days: 3.0,
            count: ANALYTIC_N,
        },
        SecondAxis::TimeOfFlight => Axis {
            start_days: 60.0,
            step_days: 3.0,
            count: ANALYTIC_N,
        },
    };
    let mut g = Grid::new(depart, second, kind, layers_for(0));
    for i in 0..ANALYTIC_N {
        for j in 0..ANALYTIC_N {
            let (d, a) = g.dates_days(i, j);
            let tof = a - d;
            let idx = g.index(i, j, 0);
            let in_block = (30.0..=50.0).contains(&(d - dc)) && (240.0..=280.0).contains(&tof);
            if tof < 80.0 || in_block {
                continue;
            }
            let u = (d - dc) / 80.0;
            let v = (tof - 260.0) / 90.0;
            let c3 = 5.0 + 20.0 * (u * u + v * v);
            let u2 = (d - dc + 30.0) / 90.0;
            let v2 = (tof - 300.0) / 100.0;
            g.vinf_depart_km_s[idx] = c3.sqrt();
            g.vinf_arrive_km_s[idx] = 3.0 + 2.0 * (u2 * u2 + v2 * v2);
            g.transfer_angle_deg[idx] = (180.0 + 0.6 * (tof - 250.0)).rem_euclid(360.0) as f32;
            g.status[idx] = CellStatus::Ok as u8;
        }
    }
    g
}

/// [`analytic_grid`] on arrival dates with the asymptote directions
/// filled: DLA = -47 + 94 x deg, x = (d - first departure) / 398 days
/// (linear in the departure date); arrival declination = -25 + 50 y deg,
/// y = (a - first arrival) / 597 days (linear in the arrival date).
pub fn panel_grid() -> Grid {
    let mut g = analytic_grid(SecondAxis::Arrival);
    let (d0, a0) = g.dates_days(0, 0);
    let unit = |dec_deg: f64| {
        let r = dec_deg.to_radians();
        [r.cos() as f32, 0.0, r.sin() as f32]
    };
    for i in 0..ANALYTIC_N {
        for j in 0..ANALYTIC_N {
            let (d, a) = g.dates_days(i, j);
            let idx = g.index(i, j, 0);
            g.depart_dir[idx] = unit(-47.0 + 94.0 * (d - d0) / 398.0);
            g.arrive_dir[idx] = unit(-25.0 + 50.0 * (a - a0) / 597.0);
        }
    }
    g
}

/// The spec the chart tests draw [`analytic_grid`] with: explicit C3
/// levels 10, 20, 30 (given out of order), v-infinity levels 3.5 and 4.5,
/// a C3 limit of 25 and one Type I marker at the C3 minimum with its
/// figures from the closed forms (C3 5, v-infinity 3 + 2 (1/3)^2 +
/// 2 (0.4)^2 = 3.5422 km/s; DLA and arrival declination of
/// [`panel_grid`]: -47 + 94 * 200 / 398 = 0.236 deg and
/// -25 + 50 * 360 / 597 = 5.151 deg; without burns, total delta-v is
/// sqrt(5) = 2.236 km/s).
pub fn analytic_spec(grid: &Grid) -> ChartSpec<'_> {
    let dc = analytic_centre_days();
    ChartSpec {
        title: "Teodra → Kesh, 2031 opportunity".to_string(),
        subtitle: "Veyra system (invented), departures 2031".to_string(),
        c3_levels: Some(vec![30.0, 10.0, 20.0]),
        vinf_levels: Some(vec![3.5, 4.5]),
        markers: vec![Marker {
            depart_days: dc,
            second: match grid.second_kind {
                SecondAxis::Arrival => dc + 260.0,
                SecondAxis::TimeOfFlight => 260.0,
            },
            kind: TransferType::I,
            name: "Type I".to_string(),
            figures: MarkerFigures {
                c3_km2_s2: Some(5.0),
                vinf_arrive_km_s: Some(3.0 + 2.0 / 9.0 + 2.0 * 0.16),
                dla_deg: Some(-47.0 + 94.0 * 200.0 / 398.0),
                arrive_dec_deg: Some(-25.0 + 50.0 * 360.0 / 597.0),
                dv_total_km_s: Some(5f64.sqrt()),
            },
        }],
        max_c3: Some(25.0),
        ..ChartSpec::new(grid)
    }
}

/// A span overview of ten invented optima, a Type I and a Type II every
/// 780 days from 11,000 days past J2000 TDB; the last pair is flagged
/// `edge`; C3 ceiling 11 km^2/s^2; the span 2030-01-01 to 2040-01-01;
/// best C3.
pub fn overview_spec() -> OverviewSpec {
    let points = (0..5)
        .flat_map(|k| {
            [TransferType::I, TransferType::II].map(|kind| OverviewPoint {
                depart_days: 11_000.0 + 780.0 * f64::from(k),
                kind,
                c3_km2_s2: 9.0
                    + f64::from(k % 3)
                    + if kind == TransferType::II { 0.5 } else { 0.0 },
                vinf_arrive_km_s: 3.0 + 0.2 * f64::from(k),
                flags: if k == 4 {
                    vec!["edge".to_string()]
                } else {
                    Vec::new()
                },
            })
        })
        .collect();
    OverviewSpec {
        title: "Teodra → Kesh, 2030-2040".to_string(),
        subtitle: "Veyra system (invented)".to_string(),
        points,
        max_c3: Some(11.0),
        span_days: Some((
            days_j2000_from_civil(2030, 1, 1),
            days_j2000_from_civil(2040, 1, 1),
        )),
        objective: Some(Objective::C3),
    }
}

/// The charts kept under `src/chart/testdata/`: `(file name, SVG)`.
///
/// The main chart on [`analytic_grid`] with both second axes and on an
/// 80 x 80 [`synthetic_grid`] with automatic levels, and each [`Panel`] on
/// [`panel_grid`].
///
/// # Errors
/// Whatever rendering returns ([`ChartError`]).
pub fn golden_charts() -> Result<Vec<(String, String)>, ChartError> {
    let mut out = Vec::new();
    let g = analytic_grid(SecondAxis::Arrival);
    out.push((
        "main-arrival.svg".to_string(),
        render_svg(&analytic_spec(&g))?,
    ));
    let g = analytic_grid(SecondAxis::TimeOfFlight);
    out.push(("main-tof.svg".to_string(), render_svg(&analytic_spec(&g))?));
    let g = synthetic_grid(80);
    let mut s = analytic_spec(&g);
    s.c3_levels = None;
    s.vinf_levels = None;
    s.max_c3 = Some(20.0);
    out.push(("main-synthetic.svg".to_string(), render_svg(&s)?));
    let g = panel_grid();
    for panel in Panel::ALL {
        let svg = render_panel_svg(&analytic_spec(&g), panel, &Endpoints::bare())?;
        out.push((format!("panel-{}.svg", panel.name()), svg));
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn synthetic_grid_has_ok_and_masked_cells() {
        let g = synthetic_grid(50);
        let counts = g.status_counts();
        assert!(counts[0].1 > 1000 && counts[1].1 > 10, "{counts:?}");
        let ok = g.index(25, 40, 0);
        assert_eq!(g.status_at(ok), CellStatus::Ok);
        assert!(g.c3_km2_s2(ok).is_finite());
    }
}
