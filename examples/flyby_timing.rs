//! Wall-clock timing of two gravity-assist searches on the Standish
//! Table 1 test fixture (real planets' mean elements, test data only):
//! Earth-Moon barycentre -> Venus -> Mars over one year of departures and
//! Earth-Moon barycentre -> Venus -> Earth-Moon barycentre -> Jupiter over
//! two years, both at 1-day steps, with the grid stage's pruning counts;
//! then the second with a wider Venus -> EMB leg.
//!
//! Run: `cargo run --release --example flyby_timing [THREADS]`
//! (THREADS: rayon threads, default all cores). The criterion benchmark
//! `cargo bench --bench flyby` measures the same searches.
//!
//! Figures are preliminary patched-conic design values.

use std::time::Instant;

use synodic::ephemeris::System;
use synodic::flyby::{search_sequence, SearchResult, SequenceSpec};
use synodic::time::Epoch;

fn main() -> Result<(), Box<dyn std::error::Error>> {
    if let Some(threads) = std::env::args().nth(1) {
        let threads: usize = threads
            .parse()
            .map_err(|_| format!("THREADS must be a whole number, got \"{threads}\""))?;
        rayon::ThreadPoolBuilder::new()
            .num_threads(threads)
            .build_global()?;
    }
    let system = System::from_toml_str(
        include_str!("../tests/fixtures/standish-flyby.toml"),
        "tests/fixtures/standish-flyby.toml",
    )?;
    let [emb, venus, mars, jupiter] =
        ["Earth-Moon Barycenter", "Venus", "Mars", "Jupiter"].map(|n| system.find(n));
    let (emb, venus, mars, jupiter) = (emb?, venus?, mars?, jupiter?);
    let first = Epoch::parse("2030-01-01")?;

    let evm = SequenceSpec::new(vec![emb, venus, mars], first, first.plus_days(365.0), 1.0);
    run(&system, "EMB-Venus-Mars, 1 year", &evm)?;

    let evej = SequenceSpec::new(
        vec![emb, venus, emb, jupiter],
        first,
        first.plus_days(730.0),
        1.0,
    );
    run(&system, "EMB-Venus-EMB-Jupiter, 2 years", &evej)?;

    // The same with the Venus -> EMB leg widened to 150-700 days and one
    // revolution allowed on it, where Venus-Earth gravity-assist routes to
    // Jupiter with a low launch C3 lie.
    let mut wide = evej.clone();
    wide.tof_days = vec![None, Some((150.0, 700.0)), None];
    wide.max_revs = vec![0, 1, 0];
    wide.c3_max_km2_s2 = Some(40.0);
    wide.max_flyby_dv_km_s = 2.0;
    run(
        &system,
        "EMB-Venus-EMB-Jupiter, 2 years, Venus-EMB 150-700 days with up to 1 revolution, C3 <= 40, flyby impulse <= 2 km/s",
        &wide,
    )?;
    Ok(())
}

fn run(
    system: &System,
    label: &str,
    spec: &SequenceSpec,
) -> Result<(), Box<dyn std::error::Error>> {
    let t = Instant::now();
    let found = search_sequence(system, spec)?;
    let secs = t.elapsed().as_secs_f64();
    report(system, label, secs, &found);
    Ok(())
}

fn report(system: &System, label: &str, secs: f64, found: &SearchResult) {
    let s = &found.stats;
    println!(
        "{label}: {secs:.2} s on {} threads",
        rayon::current_num_threads()
    );
    println!(
        "  arcs: {} solved, {} kept; flyby pairs: {} possible, {} examined, {} feasible; chains: {}",
        s.arcs_solved, s.arcs_kept, s.pairs_possible, s.pairs_examined, s.pairs_feasible, s.chains
    );
    if s.pairs_possible > 0 {
        println!(
            "  pruning: {:.2e} of the possible pairs examined, {:.2e} kept",
            s.pairs_examined as f64 / s.pairs_possible as f64,
            s.pairs_feasible as f64 / s.pairs_possible as f64
        );
    }
    for t in &found.trajectories {
        let names: Vec<&str> = t
            .bodies
            .iter()
            .map(|&b| system.bodies[b].name.as_str())
            .collect();
        let dates: Vec<String> = t.encounters.iter().map(|e| e.date_tdb()).collect();
        let flybys: Vec<String> = t
            .flybys
            .iter()
            .map(|f| {
                format!(
                    "{:.3}/{:.3} km/s turn {:.1} deg alt {:.0} km dv {:.4} {}",
                    f.vinf_in_km_s,
                    f.vinf_out_km_s,
                    f.turn_deg,
                    f.altitude_km,
                    f.dv_km_s,
                    f.verdict.as_str()
                )
            })
            .collect();
        println!(
            "  {} | {} | C3 {:.2} | arrive {:.3} km/s | total {:.4} km/s (grid {:.4}){} | {}",
            names.join("-"),
            dates.join(" "),
            t.c3_km2_s2,
            t.vinf_arrive_km_s,
            t.dv_total_km_s,
            t.grid_total_km_s,
            if t.converged { "" } else { " not converged" },
            flybys.join("; ")
        );
    }
}
