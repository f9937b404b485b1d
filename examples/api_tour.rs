//! A tour of synodic's library API on the built-in, invented demo system:
//! one transfer, a grid sweep, its refined optima and a chart.
//!
//! Run: `cargo run --release --example api_tour` (writes `api-tour.svg`).
//!
//! Figures are preliminary patched-conic design values.

use synodic::chart::{render_svg, ChartSpec, Marker, MarkerFigures};
use synodic::ephemeris::System;
use synodic::sweep::{sweep, Axis, Objective, RunOptions, SecondAxis, SweepSpec};
use synodic::time::Epoch;
use synodic::transfer::{arcs_between, Endpoints, Leg};
use synodic::windows::{optima_of_grid, Borders, Bounds};

fn main() -> Result<(), synodic::Error> {
    let system = System::demo();
    let (from, to) = (system.find("Teodra")?, system.find("Kesh")?);

    // One transfer, with a 200 km parking orbit and no capture.
    let ends = Endpoints::new(&system.bodies[from], &system.bodies[to], Some(200.0), None)?;
    let depart = Epoch::parse("2032-07-22")?;
    let arrive = Epoch::parse("2033-02-24")?;
    for (f, _) in arcs_between(&system, from, to, &depart, &arrive, &ends, 0)? {
        println!(
            "{} -> {}: Type {}, C3 {:.3} km^2/s^2, DLA {:.2} deg, v-infinity in {:.3} km/s",
            depart.date_tdb(),
            arrive.date_tdb(),
            f.kind,
            f.c3_km2_s2,
            f.dla_deg,
            f.vinf_arrive_km_s
        );
    }

    // A grid around it: departures every 2 days, flights of 120-480 days.
    let d0 = depart.days_since_j2000_tdb();
    let spec = SweepSpec {
        from,
        to,
        depart: Axis::spanning(d0 - 120.0, d0 + 120.0, 2.0)?,
        second: Axis::spanning(120.0, 480.0, 2.0)?,
        second_kind: SecondAxis::TimeOfFlight,
        max_revs: 0,
        ends,
    };
    let grid = sweep(&system, &spec, RunOptions::default(), || {})?;

    // Refined optima per Type.
    let leg = Leg {
        system: &system,
        from,
        to,
        ends,
        allow_flagged: false,
    };
    let bounds = Bounds {
        depart: (spec.depart.start_days, spec.depart.end_days()),
        arrive: None,
        tof: Some((spec.second.start_days, spec.second.end_days())),
    };
    let borders = Borders {
        depart_lo: true,
        depart_hi: true,
    };
    let optima = optima_of_grid(&leg, &grid, Objective::C3, &bounds, borders);
    for o in &optima {
        println!(
            "optimum Type {}: depart {}, {:.1} days, C3 {:.4} (grid {:.4})",
            o.kind,
            Epoch::from_days_since_j2000_tdb(o.depart_days).date_tdb(),
            o.arrive_days - o.depart_days,
            o.value,
            o.grid_value
        );
    }

    // The chart.
    let markers = optima
        .iter()
        .map(|o| Marker {
            depart_days: o.depart_days,
            second: o.arrive_days - o.depart_days,
            kind: o.kind,
            name: format!("Type {}", o.kind),
            figures: MarkerFigures {
                c3_km2_s2: Some(o.figures.c3_km2_s2),
                vinf_arrive_km_s: Some(o.figures.vinf_arrive_km_s),
                ..MarkerFigures::default()
            },
        })
        .collect();
    let svg = render_svg(&ChartSpec {
        title: "Teodra → Kesh".to_string(),
        subtitle: "API tour".to_string(),
        markers,
        max_c3: Some(14.0),
        ..ChartSpec::new(&grid)
    })?;
    std::fs::write("api-tour.svg", svg).map_err(|e| synodic::Error::Other(e.to_string()))?;
    println!("wrote api-tour.svg");
    Ok(())
}
