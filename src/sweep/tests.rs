//! Checks of the sweep against closed forms and independent recomputation.

use approx::assert_relative_eq;
use nalgebra::Vector3;

use super::*;
use crate::ephemeris::{System, AU_KM};
use crate::orbit::propagate;
use crate::time::Epoch;

/// Two circular, coplanar orbits at 1 and 1.524 au (the radii of Curtis
/// 2010, Example 8.4) around a body with the Sun's GM (IAU 2009). Invented
/// bodies; shared with the other modules' tests.
const TWO_CIRCLES: &str = include_str!("../../tests/fixtures/two-circles.toml");

fn two_circles() -> System {
    System::from_toml_str(TWO_CIRCLES, "two-circles.toml").expect("test system parses")
}

fn run(system: &System, spec: &SweepSpec, threads: Option<usize>) -> Grid {
    sweep(
        system,
        spec,
        RunOptions {
            threads,
            memory_limit_bytes: None,
        },
        || {},
    )
    .expect("sweep runs")
}

fn min_c3(grid: &Grid) -> (f64, usize, usize) {
    let m = grid_minima(grid, &Endpoints::bare(), Objective::C3)
        .into_iter()
        .min_by(|a, b| a.value.total_cmp(&b.value))
        .expect("some cell solved");
    (m.value, m.i, m.j)
}

/// The grid minimum of C3 between two circular coplanar orbits approaches
/// the Hohmann value as the step shrinks, at the Hohmann time of flight.
///
/// Closed form from vis-viva (Curtis 2010, *Orbital Mechanics for
/// Engineering Students*, section 6.2): departure excess speed
/// `sqrt(mu/r1) (sqrt(2 r2 / (r1 + r2)) - 1)`, transfer time
/// `pi sqrt(((r1 + r2)/2)^3 / mu)`. The grid misses the optimum by
/// O(step^2), so the error must shrink with the step and end below 1e-5
/// relative at a 1/16-day step.
#[test]
fn grid_minimum_converges_to_hohmann() {
    let system = two_circles();
    let mu = system.central.mu_km3_s2;
    let (r1, r2) = (AU_KM, 1.524 * AU_KM);
    let v_dep = (mu / r1).sqrt() * ((2.0 * r2 / (r1 + r2)).sqrt() - 1.0);
    let c3_hohmann = v_dep * v_dep;
    let t_hohmann = std::f64::consts::PI * ((0.5 * (r1 + r2)).powi(3) / mu).sqrt() / 86_400.0;
    // Coarse: a whole synodic period of departures.
    let start = system.epoch.days_since_j2000_tdb();
    let mut spec = SweepSpec {
        from: 0,
        to: 1,
        depart: Axis::spanning(start, start + 800.0, 4.0).expect("axis"),
        second: Axis::spanning(150.0, 400.0, 4.0).expect("axis"),
        second_kind: SecondAxis::TimeOfFlight,
        max_revs: 0,
        ends: Endpoints::bare(),
    };
    let grid = run(&system, &spec, None);
    let (mut best, mut i, mut j) = min_c3(&grid);
    let mut centre = (grid.depart.value(i), grid.second.value(j));
    let mut last_err = (best - c3_hohmann) / c3_hohmann;
    assert!(last_err >= -1e-12, "below Hohmann: {last_err}");
    for step in [1.0, 0.25, 0.0625] {
        spec.depart =
            Axis::spanning(centre.0 - 8.0 * step, centre.0 + 8.0 * step, step).expect("axis");
        spec.second =
            Axis::spanning(centre.1 - 8.0 * step, centre.1 + 8.0 * step, step).expect("axis");
        let grid = run(&system, &spec, None);
        (best, i, j) = min_c3(&grid);
        centre = (grid.depart.value(i), grid.second.value(j));
        let err = (best - c3_hohmann) / c3_hohmann;
        assert!(err >= -1e-9, "grid minimum below the Hohmann bound: {err}");
        assert!(
            err <= last_err + 1e-12,
            "error grew: {err} after {last_err}"
        );
        last_err = err;
    }
    assert!(last_err < 1e-5, "relative C3 error {last_err}");
    assert!(
        (centre.1 - t_hohmann).abs() < 0.5,
        "tof {} vs {t_hohmann}",
        centre.1
    );
}

/// Threads do not change a bit of the grid (rows are written to disjoint
/// blocks; rayon's indexed iteration keeps order).
#[test]
fn one_thread_and_two_give_identical_grids() {
    let system = System::demo();
    let from = system.find("Teodra").expect("demo body");
    let to = system.find("Kesh").expect("demo body");
    let start = Epoch::parse("2031-01-01")
        .expect("date")
        .days_since_j2000_tdb();
    let spec = SweepSpec {
        from,
        to,
        depart: Axis::spanning(start, start + 120.0, 3.0).expect("axis"),
        second: Axis::spanning(start + 100.0, start + 500.0, 5.0).expect("axis"),
        second_kind: SecondAxis::Arrival,
        max_revs: 1,
        ends: Endpoints::bare(),
    };
    let a = run(&system, &spec, Some(1));
    let b = run(&system, &spec, Some(2));
    assert!(a.status == b.status);
    let same = |x: &[f64], y: &[f64]| x.iter().zip(y).all(|(p, q)| p.to_bits() == q.to_bits());
    assert!(same(&a.vinf_depart_km_s, &b.vinf_depart_km_s));
    assert!(same(&a.vinf_arrive_km_s, &b.vinf_arrive_km_s));
}

/// Sampled cells: an independent Lambert solve for the cell's dates, whose
/// arc propagated by universal variables reaches the arrival body, has the
/// excess speeds the grid stored; DLA and the arrival declination agree
/// with the excess-velocity vectors and the bodies' poles.
#[test]
fn sampled_cells_match_propagated_arcs() {
    let system = System::demo();
    let from = system.find("Teodra").expect("demo body");
    let to = system.find("Kesh").expect("demo body");
    let start = Epoch::parse("2031-01-01")
        .expect("date")
        .days_since_j2000_tdb();
    let ends = Endpoints::new(&system.bodies[from], &system.bodies[to], None, None)
        .expect("no orbits asked");
    let spec = SweepSpec {
        from,
        to,
        depart: Axis::spanning(start, start + 200.0, 10.0).expect("axis"),
        second: Axis::spanning(80.0, 480.0, 20.0).expect("axis"),
        second_kind: SecondAxis::TimeOfFlight,
        max_revs: 0,
        ends,
    };
    let grid = run(&system, &spec, None);
    let mut checked = 0;
    for (i, j) in [(0, 0), (3, 5), (7, 11), (12, 19), (20, 2), (15, 15)] {
        let idx = grid.index(i, j, 0);
        if grid.status_at(idx) != CellStatus::Ok {
            continue;
        }
        let (d, a) = grid.dates_days(i, j);
        let s1 = system.state_at_days(from, d);
        let s2 = system.state_at_days(to, a);
        let tof_s = (a - d) * 86_400.0;
        let sol = lambert::solve_zero_rev(
            &s1.r_km,
            &s2.r_km,
            tof_s,
            system.central.mu_km3_s2,
            Direction::Prograde,
            Some(&s1.r_km.cross(&s1.v_km_s)),
        )
        .expect("solvable cell");
        let end = propagate(
            &State {
                r_km: s1.r_km,
                v_km_s: sol.v1,
            },
            tof_s,
            system.central.mu_km3_s2,
        )
        .expect("propagates");
        assert_relative_eq!(end.r_km, s2.r_km, max_relative = 1e-8);
        let vinf_d: Vector3<f64> = sol.v1 - s1.v_km_s;
        let vinf_a: Vector3<f64> = sol.v2 - s2.v_km_s;
        assert_relative_eq!(
            grid.vinf_depart_km_s[idx],
            vinf_d.norm(),
            max_relative = 1e-12
        );
        assert_relative_eq!(
            grid.vinf_arrive_km_s[idx],
            vinf_a.norm(),
            max_relative = 1e-12
        );
        // Declinations straight from the definition: asin(v . pole / |v|).
        let pole = |b: usize| {
            let p = system.bodies[b].pole.expect("demo bodies have poles");
            let (lon, lat) = (p.lon_deg.to_radians(), p.lat_deg.to_radians());
            Vector3::new(lat.cos() * lon.cos(), lat.cos() * lon.sin(), lat.sin())
        };
        let dla = (vinf_d.dot(&pole(from)) / vinf_d.norm())
            .asin()
            .to_degrees();
        let dec = (vinf_a.dot(&pole(to)) / vinf_a.norm()).asin().to_degrees();
        // Stored as f32: 1e-4 deg covers the rounding.
        assert!((grid.dla_deg(idx) - dla).abs() < 1e-4);
        assert!((grid.arrive_dec_deg(idx) - dec).abs() < 1e-4);
        checked += 1;
    }
    assert!(checked >= 4, "only {checked} sampled cells solved");
}

/// Memory is estimated before allocating and oversized grids refused.
#[test]
fn oversized_grids_are_refused() {
    let system = two_circles();
    let spec = SweepSpec {
        from: 0,
        to: 1,
        depart: Axis::spanning(0.0, 100_000.0, 0.01).expect("axis"),
        second: Axis::spanning(1.0, 1000.0, 0.01).expect("axis"),
        second_kind: SecondAxis::TimeOfFlight,
        max_revs: 0,
        ends: Endpoints::bare(),
    };
    let err = sweep(
        &system,
        &spec,
        RunOptions {
            threads: None,
            memory_limit_bytes: Some(4 << 30),
        },
        || {},
    )
    .expect_err("too large");
    assert!(matches!(err, SweepError::TooLarge { .. }));
    assert!(err.to_string().contains("MiB"));
}

#[test]
fn axes_include_their_end() {
    let a = Axis::spanning(0.0, 10.0, 0.1).expect("axis");
    assert_eq!(a.count, 101);
    assert!(Axis::spanning(0.0, 1.0, 0.0).is_err());
    assert!(Axis::spanning(1.0, 0.0, 1.0).is_err());
}

/// With revolutions allowed, the best layer of a cell is the solved layer
/// with the lowest objective; a cell where no arc exists has none.
#[test]
fn best_layer_picks_the_lowest_solved_layer() {
    let system = System::demo();
    let from = system.find("Teodra").expect("demo body");
    let to = system.find("Kesh").expect("demo body");
    let start = Epoch::parse("2031-01-01")
        .expect("date")
        .days_since_j2000_tdb();
    let spec = SweepSpec {
        from,
        to,
        depart: Axis::spanning(start, start + 60.0, 20.0).expect("axis"),
        second: Axis::spanning(50.0, 1500.0, 50.0).expect("axis"),
        second_kind: SecondAxis::TimeOfFlight,
        max_revs: 2,
        ends: Endpoints::bare(),
    };
    let grid = run(&system, &spec, None);
    let mut multi = 0;
    for i in 0..grid.depart.count {
        for j in 0..grid.second.count {
            let best = grid.best_layer(i, j, Objective::C3, &spec.ends);
            let solved: Vec<usize> = (0..grid.layers.len())
                .filter(|&l| grid.status_at(grid.index(i, j, l)) == CellStatus::Ok)
                .collect();
            match best {
                None => assert!(solved.is_empty()),
                Some(b) => {
                    let v = grid.c3_km2_s2(grid.index(i, j, b));
                    for &l in &solved {
                        assert!(v <= grid.c3_km2_s2(grid.index(i, j, l)));
                    }
                    if grid.layers[b].revs > 0 {
                        multi += 1;
                    }
                }
            }
        }
    }
    assert!(
        multi > 0,
        "some cell should be best on a multi-revolution arc"
    );
}
