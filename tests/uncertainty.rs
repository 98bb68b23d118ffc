//! Monte Carlo intervals against a closed-form case, and reproducibility.
//!
//! One reactant, two product-forming TSs, every energy with σ = 1 kcal/mol: the
//! ratio is exp(ΔΔG‡/RT) with ΔΔG‡ ~ N(1.3, √2 kcal/mol) (the reactant's own
//! draw cancels), so ln(ratio) is normal and its quantiles are closed form.

use crate::common::{PAIR, RT_298_KCAL as RT};
use eyrie::kinetics::uncertainty::monte_carlo;
use eyrie::profile::parse;

fn profile(samples: usize, seed: u64) -> String {
    format!(
        r#"{PAIR}[uncertainty]
sigma = 1.0
samples = {samples}
seed = {seed}
[[observed]]
kind = "ratio"
products = ["pb", "pa"]
value = 4.0
tolerance = 1.0
"#
    )
}

/// Standard normal CDF via erfc, Abramowitz & Stegun 7.1.26 (|error| < 1.5e-7).
fn phi(x: f64) -> f64 {
    let z = x.abs() / std::f64::consts::SQRT_2;
    let t = 1.0 / (1.0 + 0.3275911 * z);
    let poly = t
        * (0.254829592
            + t * (-0.284496736 + t * (1.421413741 + t * (-1.453152027 + t * 1.061405429))));
    let erfc = poly * (-z * z).exp();
    if x >= 0.0 {
        1.0 - 0.5 * erfc
    } else {
        0.5 * erfc
    }
}

#[test]
fn ratio_interval_matches_the_lognormal_closed_form() {
    let model = parse(&profile(20_000, 7)).unwrap().model;
    let mc = monte_carlo(&model, &|_| {}).expect("uncertainty stated");
    assert_eq!(mc.samples, 20_000);
    let (major, minor, ratio) = mc.ratio.expect("two products");
    assert_eq!(model.point(major).id, "pb");
    assert_eq!(model.point(minor).id, "pa");
    // closed form: ln r ~ N(1.3/RT, √2/RT); 95 % quantiles at ±1.959964 σ.
    let (mu, s) = (1.3 / RT, std::f64::consts::SQRT_2 / RT);
    let z = 1.959963984540054;
    // Sampling error of a 2.5 % quantile with 20 000 draws is about 0.019 σ; allow 0.1 σ.
    for (got, want) in [
        (ratio.median, mu),
        (ratio.low, mu - z * s),
        (ratio.high, mu + z * s),
    ] {
        assert!((got.ln() - want).abs() < 0.1 * s, "ln {got} vs {want}");
    }
    // Probability that the observed 4:1 is within 1.0 kcal/mol of the sampled ΔΔG‡:
    // P(RT·ln 4 − 1 ≤ ΔΔG‡ ≤ RT·ln 4 + 1) for ΔΔG‡ ~ N(1.3, √2).
    let centre = RT * 4f64.ln();
    let sd = std::f64::consts::SQRT_2;
    let want = phi((centre + 1.0 - 1.3) / sd) - phi((centre - 1.0 - 1.3) / sd);
    assert!(
        (mc.consistent[0] - want).abs() < 0.02,
        "{} vs {want}",
        mc.consistent[0]
    );
}

#[test]
fn the_same_seed_gives_the_same_numbers() {
    let run = |seed| {
        let model = parse(&profile(3_000, seed)).unwrap().model;
        monte_carlo(&model, &|_| {}).unwrap()
    };
    let (a, b, c) = (run(11), run(11), run(12));
    assert_eq!(a, b, "reproducible with a seed");
    assert_ne!(a.ratio, c.ratio, "another seed draws other numbers");
}

#[test]
fn no_uncertainty_no_monte_carlo() {
    let text = profile(100, 1).replace("[uncertainty]\nsigma = 1.0\nsamples = 100\nseed = 1\n", "");
    let model = parse(&text).unwrap().model;
    assert!(monte_carlo(&model, &|_| {}).is_none());
}
