//! Corrections declared in a profile (tunnelling, kappa, standard state,
//! co-reactant concentrations) reach the rate constants with the reference
//! values of tests/reference/{tunnelling,standard_state}.toml.

use eyrie::kinetics::analyze;
use eyrie::profile::parse;

fn step_of(text: &str) -> (eyrie::kinetics::StepKinetics, eyrie::model::Model) {
    let model = parse(text).expect("valid profile").model;
    let a = analyze(&model);
    (a.steps[0].clone(), model)
}

const BODY: &str = r#"
[states]
a = 0.0
b = -5.0
[ts]
t = { g = 20.0, imaginary_frequency = 1000, kappa = 0.5 }
[[path]]
via = ["a", "t", "b"]
"#;

#[test]
fn wigner_and_bell_multiply_the_explicit_kappa() {
    // Wigner κ(1000i cm⁻¹, 298.15 K) = 1.97029999756167 (Wigner 1932; reference
    // tunnel-wigner-1000cm-298.15K); Bell κ = 3.62321492861661 (Bell 1980; reference
    // tunnel-bell-1000cm-298.15K).
    for (name, want) in [
        ("wigner", 1.97029999756167),
        ("bell", 3.62321492861661),
        ("none", 1.0),
    ] {
        let (step, _) = step_of(&format!(
            "unit = \"kcal/mol\"\ntunnelling = \"{name}\"\n{BODY}"
        ));
        assert!(
            (step.kappa / (0.5 * want) - 1.0).abs() < 1e-9,
            "{name}: {}",
            step.kappa
        );
        assert!(step.kappa_note.is_none());
        // κ scales both directions alike (microscopic reversibility).
        let ratio = (step.k_forward.ln() - step.k_reverse.ln()).exp();
        let (kb, na, t): (f64, f64, f64) = (1.380649e-23, 6.02214076e23, 298.15);
        let k_eq = (5.0 * 4184.0 / (na * kb * t)).exp(); // closed form: exp(−ΔG/RT)
        assert!((ratio / k_eq - 1.0).abs() < 1e-9);
    }
}

#[test]
fn bell_beyond_its_limit_falls_back_to_wigner_with_a_note() {
    // 1500i cm⁻¹ at 298.15 K is beyond Bell's u < 2π (limit 1302 cm⁻¹, reference
    // tunnel-bell-limit-298.15K); Wigner κ = 3.18317499451376 (tunnel-wigner-1500cm-298.15K).
    let text = format!(
        "unit = \"kcal/mol\"\ntunnelling = \"bell\"\n{}",
        BODY.replace(
            "imaginary_frequency = 1000, kappa = 0.5",
            "imaginary_frequency = \"1500i\""
        )
    );
    let (step, _) = step_of(&text);
    assert!((step.kappa / 3.18317499451376 - 1.0).abs() < 1e-9);
    let note = step.kappa_note.expect("a note says Bell was replaced");
    assert!(note.contains("1302") && note.contains("Wigner"), "{note}");
}

#[test]
fn standard_state_and_coreactant_shift_the_barrier() {
    // closed form: 1 atm → 1 mol/L is +1.89432844549415 kcal/mol per species at 298.15 K
    // (reference stdstate-atm-to-molar-298.15K-kcal); a co-reactant at 0.1 mol/L raises
    // the barrier by RT·ln 10 = 1.36424701303424 kcal/mol (pseudo-first-order-shift-0.1M).
    let text = r#"unit = "kcal/mol"
standard_state = "1 atm"
[coreactants]
water = 0.1
[states]
a = { g = 0.0, species = 2, with = ["water"] }
b = -5.0
[ts]
t = 20.0
[[path]]
via = ["a", "t", "b"]
"#;
    let (step, _) = step_of(text);
    let want = 20.0 - 1.89432844549415 + 1.36424701303424;
    assert!(
        (step.barrier_forward - want).abs() < 1e-9,
        "{}",
        step.barrier_forward
    );
    // The reverse (unimolecular, no co-reactant freed) is unchanged.
    assert!((step.barrier_reverse - 25.0).abs() < 1e-9);
}

#[test]
fn corrections_follow_a_new_temperature() {
    // closed form: 1 atm → 1 mol/L is +2.53723533486608 kcal/mol per species at 373.15 K
    // (reference stdstate-atm-to-molar-373.15K-kcal).
    let text = "unit = \"kcal/mol\"\nstandard_state = \"1 atm\"\n[states]\na = { g = 0.0, species = 2 }\nb = -5.0\n[ts]\nt = 20.0\n[[path]]\nvia = [\"a\", \"t\", \"b\"]\n";
    let model = parse(text).unwrap().model;
    let hot = model.with_temperature(eyrie::units::Temperature::kelvin(373.15).unwrap());
    let step = &analyze(&hot).steps[0];
    assert!((step.barrier_forward - (20.0 - 2.53723533486608)).abs() < 1e-9);
}

#[test]
fn a_missing_frequency_is_a_warning_when_tunnelling_is_asked_for() {
    let text = "unit = \"kcal/mol\"\ntunnelling = \"wigner\"\n[states]\na = 0.0\nb = -5.0\n[ts]\nt = 20.0\n[[path]]\nvia = [\"a\", \"t\", \"b\"]\n";
    let parsed = parse(text).unwrap();
    assert_eq!(parsed.warnings.len(), 1);
    assert!(parsed.warnings[0].message.contains("imaginary_frequency"));
}
