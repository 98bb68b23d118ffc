//! Integration time alone, for `benches/simulate.sh`: builds the network of a
//! profile as `eyrie simulate` does, then times only the integrator from the
//! reference state over [0, T], T being the time the default `simulate` run
//! reaches (99 % conversion or equilibrium). Prints one line of JSON:
//! {"states", "t_end_s", "linear", "seconds" (median of the repeats),
//! "best_seconds" (the fastest: least disturbed by other work), and the
//! solver's work as scipy counts it: "steps", "rejected", "newton",
//! "nfev", "njev", "nlu"}.
//!
//!     cargo run --release --example simulate_timing -- FILE [REPEATS] [dense|sparse]

use eyrie::simulate::integrate::{Counts, Flow, Linear, Tolerances, integrate_with};
use eyrie::simulate::{Initial, Network, Options, simulate};
use std::time::Instant;

fn main() {
    let args: Vec<String> = std::env::args().collect();
    let Some(file) = args.get(1) else {
        eprintln!("usage: simulate_timing FILE [REPEATS] [dense|sparse]");
        std::process::exit(2);
    };
    let repeats: usize = args.get(2).and_then(|r| r.parse().ok()).unwrap_or(5).max(1);
    let text = std::fs::read_to_string(file).unwrap_or_else(|e| {
        eprintln!("{file}: {e}");
        std::process::exit(2)
    });
    let model = match eyrie::profile::parse(&text) {
        Ok(parsed) => parsed.model,
        Err(_) => {
            eprintln!("{file}: not a valid profile (run eyrie analyze on it for the errors)");
            std::process::exit(2)
        }
    };
    let t_end = match simulate(&model, &Options::default(), &mut |_, _| {}) {
        Ok(sim) => sim.time_s(),
        Err(e) => {
            eprintln!("{file}: {e}");
            std::process::exit(1)
        }
    };
    let net = Network::new(&model, &eyrie::kinetics::analyze(&model));
    let by_point = Initial::Reference.resolve(&model).expect("reference state");
    let species: Vec<f64> = net.species.iter().map(|s| by_point[s.point]).collect();
    let x0 = net.state(&species);
    // Sparse, as `simulate` uses it, unless "dense" asks for the check.
    let linear = match args.get(3).map(String::as_str) {
        Some("dense") => Linear::Dense,
        _ => Linear::Sparse,
    };
    let mut times = Vec::new();
    let mut counts = Counts::default();
    for _ in 0..repeats {
        let start = Instant::now();
        integrate_with(
            linear,
            &net,
            &x0,
            t_end,
            Tolerances::default(),
            &mut |view| {
                counts = view.counts;
                Ok(Flow::Continue)
            },
        )
        .unwrap_or_else(|e| {
            eprintln!("{file}: {e}");
            std::process::exit(1)
        });
        times.push(start.elapsed().as_secs_f64());
    }
    times.sort_by(f64::total_cmp);
    println!(
        "{{\"states\": {}, \"t_end_s\": {t_end:e}, \"linear\": \"{linear:?}\", \"seconds\": {:e}, \"best_seconds\": {:e}, \"steps\": {}, \"rejected\": {}, \"newton\": {}, \"nfev\": {}, \"njev\": {}, \"nlu\": {}}}",
        net.dim(),
        times[times.len() / 2],
        times[0],
        counts.steps,
        counts.rejected,
        counts.newton_iterations,
        counts.rhs,
        counts.jacobians,
        counts.factorisations,
    );
}
