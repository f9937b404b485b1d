//! Checks of the sweep against closed forms and independent recomputation.

use approx::assert_relative_eq;
use nalgebra::Vector3;

use super::*;
use crate::ephemeris::{System, AU_KM};
use crate::orbit::propagate;
use crate::time::Epoch;
use crate::transfer::{EquatorFrame, TransferType};

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

/// Sampled cells checked without the Lambert solver: the departure
/// velocity rebuilt from what the grid stored (excess speed and asymptote
/// direction in the departure body's equator frame, plus the body's
/// velocity), propagated by universal variables (Bate, Mueller & White
/// 1971, ch. 4) for the cell's time of flight, reaches the arrival body's
/// position; the arrival velocity rebuilt the same way has the departure
/// velocity's energy and angular momentum (two-body invariants); the
/// stored transfer angle is the angle from r1 to r2 in the direction of
/// motion; DLA and the arrival declination are asin(v . pole / |v|).
///
/// Tolerances: the directions are stored as f32 unit vectors, so each
/// rebuilt velocity may be off by 1.2e-7 |vinf|: the invariants are held
/// to that error times |v| (energy) or |r| (angular momentum); the
/// propagated position (that error over the flight, a few hundred km at
/// most) to 1e-6 of the orbit radius; angles to 1e-4 deg.
#[test]
fn sampled_cells_match_propagated_arcs() {
    let system = System::demo();
    let from = system.find("Teodra").expect("demo body");
    let to = system.find("Kesh").expect("demo body");
    let mu = system.central.mu_km3_s2;
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
    let in_frame = |f: &EquatorFrame, u: [f32; 3]| -> Vector3<f64> {
        f.x * f64::from(u[0]) + f.y * f64::from(u[1]) + f.z * f64::from(u[2])
    };
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
        let vinf_d =
            in_frame(&ends.depart_frame, grid.depart_dir[idx]) * grid.vinf_depart_km_s[idx];
        let vinf_a =
            in_frame(&ends.arrive_frame, grid.arrive_dir[idx]) * grid.vinf_arrive_km_s[idx];
        let v1 = s1.v_km_s + vinf_d;
        let v2 = s2.v_km_s + vinf_a;
        let end = propagate(
            &State {
                r_km: s1.r_km,
                v_km_s: v1,
            },
            tof_s,
            mu,
        )
        .expect("propagates");
        assert_relative_eq!(
            end.r_km,
            s2.r_km,
            max_relative = 1e-6,
            epsilon = 1e-6 * s2.r_km.norm()
        );
        // f32 directions: each rebuilt velocity is off by up to
        // 1.2e-7 |vinf| (two f32 roundings of a unit vector).
        let dv = 1.2e-7 * (vinf_d.norm() + vinf_a.norm());
        let energy = |r: &Vector3<f64>, v: &Vector3<f64>| 0.5 * v.norm_squared() - mu / r.norm();
        let e_tol = dv * v1.norm().max(v2.norm());
        let (e1, e2) = (energy(&s1.r_km, &v1), energy(&s2.r_km, &v2));
        assert!(
            (e1 - e2).abs() < e_tol,
            "energy {e1} vs {e2} (limit {e_tol})"
        );
        let h1 = s1.r_km.cross(&v1);
        let h_tol = dv * s1.r_km.norm().max(s2.r_km.norm());
        assert!((h1 - s2.r_km.cross(&v2)).norm() < h_tol, "angular momentum");
        // The transfer angle from the two positions and the motion's sense.
        let cos = s1.r_km.dot(&s2.r_km) / (s1.r_km.norm() * s2.r_km.norm());
        let mut angle = cos.clamp(-1.0, 1.0).acos().to_degrees();
        if s1.r_km.cross(&s2.r_km).dot(&h1) < 0.0 {
            angle = 360.0 - angle;
        }
        assert!((f64::from(grid.transfer_angle_deg[idx]) - angle).abs() < 1e-4);
        let want_kind = if angle < 180.0 {
            TransferType::I
        } else {
            TransferType::II
        };
        assert_eq!(grid.kind_at(idx), want_kind);
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

/// An axis from 0 to 10 days in 0.1-day steps has 101 values, the first
/// 0 and the last 10 (to rounding, 1e-12 day), the k-th k / 10.
#[test]
fn axes_include_their_end() {
    let a = Axis::spanning(0.0, 10.0, 0.1).expect("axis");
    assert_eq!(a.count, 101);
    assert!(a.value(0).abs() < 1e-12);
    assert!((a.value(100) - 10.0).abs() < 1e-12);
    assert!((a.value(37) - 3.7).abs() < 1e-12);
    let b = Axis::spanning(9000.5, 9010.5, 2.5).expect("axis");
    assert_eq!(b.count, 5);
    assert!((b.value(0) - 9000.5).abs() < 1e-12);
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
