//! Running the Monte Carlo uncertainty analysis from the CLI: the sample-count
//! and seed overrides, and a progress bar on a terminal.

use eyrie::kinetics::uncertainty::{McResult, monte_carlo};
use eyrie::model::Model;
use std::io::IsTerminal;

/// Options of the uncertainty analysis (used when the profile has `[uncertainty]`
/// or `sigma` keys).
#[derive(Debug, Clone, Default, clap::Args)]
pub struct McArgs {
    /// Number of Monte Carlo samples, overriding the profile's `samples`.
    #[arg(long, value_name = "N")]
    pub samples: Option<usize>,
    /// Seed of the random numbers, overriding the profile's `seed` (the same seed
    /// always gives the same intervals).
    #[arg(long, value_name = "S")]
    pub seed: Option<u64>,
}

/// The Monte Carlo result for `model`, or `None` when it states no uncertainty.
/// Shows a progress bar when standard error is a terminal and the run is long.
pub fn run(model: &Model, args: &McArgs) -> Option<McResult> {
    let mut model = model.clone();
    model = model.with_monte_carlo(args.samples, args.seed);
    let total = model.uncertainty()?.samples;
    let bar = (std::io::stderr().is_terminal() && total >= 20_000).then(|| {
        let bar = indicatif::ProgressBar::new(total as u64);
        bar.set_message("Monte Carlo samples");
        bar
    });
    let progress = |done: usize| {
        if let Some(b) = &bar {
            b.set_position(done as u64);
        }
    };
    let result = monte_carlo(&model, &progress);
    if let Some(b) = bar {
        b.finish_and_clear();
    }
    result
}
