//! The integrator at the extremes: rate constants from 1e-10 to 1e13 s⁻¹ in
//! one system. Checks are conservation laws (mass balance, to 1e-9 relative,
//! the bound the issue sets) and non-negativity within the absolute tolerance.

use eyrie::simulate::{Initial, Options, Stopped, Until, simulate};

/// Barrier (kcal/mol, 298.15 K) that gives k, by the Eyring equation.
fn barrier(k: f64) -> f64 {
    eyrie::kinetics::barrier_for_rate(
        k,
        eyrie::units::EnergyUnit::KcalPerMol,
        eyrie::units::Temperature::kelvin(298.15).unwrap(),
    )
}

fn profile() -> String {
    // A ⇌ B at 1e13 s⁻¹ forward (a barrier of ~0.4 kcal/mol), B → C at 1e-10 s⁻¹,
    // A → D at 1e-2 s⁻¹, and C ⇌ E at 1e12 s⁻¹.
    format!(
        "unit = \"kcal/mol\"\ntemperature = 298.15\n[states]\nA = 0.0\nB = 0.3\nC = -10.0\nD = -20.0\nE = -9.5\n\
         [ts]\nTAB = {}\nTBC = {}\nTAD = {}\nTCE = {}\n\
         [[path]]\nvia = [\"A\", \"TAB\", \"B\", \"TBC\", \"C\", \"TCE\", \"E\"]\n\
         [[path]]\nvia = [\"A\", \"TAD\", \"D\"]\n",
        barrier(1e13),
        0.3 + barrier(1e-10),
        barrier(1e-2),
        -10.0 + barrier(1e12)
    )
}

#[test]
fn mass_is_conserved_across_23_decades_of_rate_constants() {
    let model = eyrie::profile::parse(&profile()).unwrap().model;
    for until in [Until::Default, Until::Time(1e-12), Until::Time(1e12)] {
        let sim = simulate(
            &model,
            &Options {
                until,
                ..Options::default()
            },
            &mut |_, _| {},
        )
        .unwrap();
        assert!(
            sim.mass_error < 1e-9,
            "{until:?}: mass error {:e}",
            sim.mass_error
        );
        assert!(
            sim.most_negative > -1e-12,
            "{until:?}: {:e}",
            sim.most_negative
        );
        for s in &sim.samples {
            let total: f64 = s.x.iter().sum();
            assert!((total - 1.0).abs() < 1e-9, "t = {:e}: total {total}", s.t);
        }
    }
    // Default: 99 % conversion happens through A → D (t99 = ln 100 / k_eff).
    let sim = simulate(&model, &Options::default(), &mut |_, _| {}).unwrap();
    assert_eq!(sim.stopped, Stopped::Conversion);
}

/// A fast pre-equilibrium (k ≈ 1e12 s⁻¹ both ways) ahead of a slow step: the
/// regime where a rate-matrix formulation loses mass. The pre-equilibrium
/// ratio after 1 ms is exp(−ΔG/RT) (definition of K), and material is kept.
#[test]
fn fast_pre_equilibrium_keeps_mass_and_its_ratio() {
    let text = format!(
        "unit = \"kcal/mol\"\ntemperature = 298.15\n[states]\nA = 0.0\nI = 0.5\nP = -30.0\n[ts]\n\
         T1 = {}\nT2 = 20.0\n[[path]]\nvia = [\"A\", \"T1\", \"I\", \"T2\", \"P\"]\n",
        barrier(1e12)
    );
    let model = eyrie::profile::parse(&text).unwrap().model;
    let options = Options {
        until: Until::Time(1e-3),
        initial: Initial::Given(vec![("A".into(), 1.0)]),
        ..Options::default()
    };
    let sim = simulate(&model, &options, &mut |_, _| {}).unwrap();
    assert!(sim.mass_error < 1e-12, "{:e}", sim.mass_error);
    let x = &sim.last().x;
    let rt = eyrie::units::Temperature::kelvin(298.15)
        .unwrap()
        .rt(eyrie::units::EnergyUnit::KcalPerMol);
    let k = (-0.5_f64 / rt).exp();
    assert!(
        ((x[1] / x[0]) / k - 1.0).abs() < 1e-6,
        "ratio {} vs {k}",
        x[1] / x[0]
    );
}
