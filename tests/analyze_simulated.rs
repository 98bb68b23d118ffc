//! `analyze` checks its closed-form product fractions against the simulation
//! (`selectivity.simulated`, `limit_agrees`, `limit_error`).

use crate::common;

use eyrie::report::{AnalysisReport, SelectivityReport};

fn selectivity(text: &str) -> SelectivityReport {
    let model = eyrie::profile::parse(text).expect("valid profile").model;
    AnalysisReport::new(&model, &eyrie::kinetics::analyze(&model))
        .with_simulation_check(&model)
        .selectivity
        .expect("two products")
}

/// Seeman's scheme A ⇌ B, A → C, B → D from pure A (the systems of
/// tests/reference/winstein_holness.toml). C and D lie 8 and 7 kcal/mol below
/// A, so their way back (26 and 24.2 kcal/mol) is 1e7 times slower than their
/// formation: irreversible as in the reference.
fn seeman(ts_ab: f64) -> String {
    format!(
        "unit = \"kcal/mol\"\ntemperature = 298.15\nzero = \"a\"\nstart = \"a\"\n\
         [states]\na = 0.0\nb = 1.0\nc = -8.0\nd = -7.0\n\
         [ts]\nts-ab = {ts_ab:?}\nts-ac = 18.0\nts-bd = 17.2\n\
         [[path]]\nvia = [\"a\", \"ts-ab\", \"b\"]\n\
         [[path]]\nvia = [\"a\", \"ts-ac\", \"c\"]\n\
         [[path]]\nvia = [\"b\", \"ts-bd\", \"d\"]\n"
    )
}

/// A `[[check]]` value of tests/reference/winstein_holness.toml.
fn reference(id: &str) -> f64 {
    let text =
        std::fs::read_to_string(common::repo("tests/reference/winstein_holness.toml")).unwrap();
    let doc: toml::Table = text.parse().unwrap();
    doc["check"]
        .as_array()
        .unwrap()
        .iter()
        .find(|c| c["id"].as_str() == Some(id))
        .unwrap_or_else(|| panic!("no {id}"))["value"]
        .as_float()
        .unwrap()
}

/// Seeman's system with TS(AB) at `ts_ab`: the regime `analyze` names, and the
/// simulated final fraction of D against the reference value `id`. The run
/// stops at 99.99 % conversion, so it may differ by at most the 1e-4 still
/// unconverted. The closed form must agree within the margin.
fn seeman_case(ts_ab: f64, regime: &str, id: &str) -> SelectivityReport {
    let want = reference(id);
    let s = selectivity(&seeman(ts_ab));
    assert_eq!(s.regime, regime);
    let d = s.simulated.as_ref().expect("simulated")["d"];
    assert!((d - want).abs() < 1e-4, "{d} vs {want}");
    assert_eq!(s.limit_agrees, Some(true), "{:?}", s.limit_error);
    assert_eq!(
        s.simulation_stopped,
        Some(eyrie::simulate::Stopped::Conversion)
    );
    s
}

#[test]
fn seeman_intermediate_interconversion_equals_the_simulation() {
    // Seeman, Chem. Rev. 1983, 83, 83: the exact first-order final fraction of D
    // from pure A with TS(AB) = 17.5 kcal/mol (written by generate.py).
    let s = seeman_case(
        17.5,
        "intermediate",
        "wh-intermediate-pureA-final-fraction-D",
    );
    // The exact partition (the closed form analyze reports here) is exact.
    let want = reference("wh-intermediate-pureA-final-fraction-D");
    assert!((s.products["d"] - want).abs() < 1e-9);
    assert!(s.limit_error.unwrap() < 0.01, "{:?}", s.limit_error);
}

#[test]
fn curtin_hammett_limit_agrees_with_the_simulation() {
    // Fast interconversion, TS(AB) = 8 kcal/mol: Seeman's exact fraction
    // (wh-fast-pureA-final-fraction-D); the Curtin–Hammett limit within the
    // margin, 0.1 kcal/mol in the file's unit (common practice: below what
    // computed energies resolve).
    let s = seeman_case(8.0, "curtin-hammett", "wh-fast-pureA-final-fraction-D");
    assert!((s.limit_margin - 0.1).abs() < 1e-12);
}

#[test]
fn kinetic_quench_limit_agrees_with_the_simulation() {
    // Slow interconversion, TS(AB) = 26 kcal/mol: from pure A essentially all C
    // (Seeman's slow limit; exact fraction wh-slow-pureA-final-fraction-D).
    seeman_case(26.0, "kinetic-quench", "wh-slow-pureA-final-fraction-D");
}

/// A → C fast but reversible (C only 1 kcal/mol below A), A → D slow and
/// irreversible (D 10 kcal/mol below).
const REVERSIBLE: &str = "unit = \"kcal/mol\"\ntemperature = 298.15\nzero = \"a\"\n\
    [states]\na = 0.0\nc = -1.0\nd = -10.0\n\
    [ts]\nts-c = 15.0\nts-d = 19.0\n\
    [[path]]\nvia = [\"a\", \"ts-c\", \"c\"]\n\
    [[path]]\nvia = [\"a\", \"ts-d\", \"d\"]\n";

#[test]
fn reversible_product_makes_the_limit_wrong_and_the_flag_fires() {
    // The closed form takes C as irreversible: C:D = e^(4/RT) ≈ 860 (one
    // reacting state, the competing TSs 4 kcal/mol apart). In fact C returns to
    // A (16 kcal/mol back against 19 to D) and stays in equilibrium with it,
    // [C]/[A] = K = e^(1/RT) (pre-equilibrium closed form), while everything
    // drains to D: at 99.99 % conversion [A] = 1e-4, so the fraction of C is
    // about K·1e-4 ≈ 5.4e-4.
    let s = selectivity(REVERSIBLE);
    assert_eq!(s.regime, "curtin-hammett");
    assert!(s.products["c"] > 0.99, "closed form: C major");
    let sim = s.simulated.as_ref().unwrap();
    let rt: f64 = 8.314462618 * 298.15 / 4184.0; // CODATA 2018 R, thermochemical calorie
    let k = (1.0 / rt).exp();
    let c = sim["c"];
    assert!((c / (k * 1e-4) - 1.0).abs() < 0.05, "{c}");
    assert_eq!(s.limit_agrees, Some(false));
    assert!(s.limit_error.unwrap() > 5.0, "{:?}", s.limit_error);
}

#[test]
fn cli_says_it_in_words_and_json() {
    let dir = tempfile::tempdir().unwrap();
    let path = common::write(dir.path(), "rev.toml", REVERSIBLE);
    let p = path.to_str().unwrap();
    let out = common::eyrie(&["analyze", p], dir.path());
    assert!(out.status.success());
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(text.contains("the Curtin–Hammett limit is off"), "{text}");
    assert!(text.contains("use the simulated fractions"), "{text}");
    let out = common::eyrie(&["analyze", "--json", p], dir.path());
    let json: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let sel = &json["selectivity"];
    assert_eq!(sel["limit_agrees"], false);
    assert!(sel["limit_error"].as_f64().unwrap() > 5.0);
    assert_eq!(sel["simulation_stopped"], "conversion");
    assert!(sel["simulated"]["d"].as_f64().unwrap() > 0.99);
    assert!(sel["simulation_note"].is_null());
}

#[test]
fn large_networks_are_not_simulated_with_a_note() {
    // 201 intermediates in a chain before two products: above the 200 states
    // simulated for the check (a stated limit, not a measurement).
    let n = 201;
    let mut s = String::from("unit = \"kcal/mol\"\n[states]\n");
    for i in 0..n {
        s += &format!("s{i} = 0.0\n");
    }
    s += "p = -20.0\nq = -20.0\n[ts]\n";
    for i in 0..n - 1 {
        s += &format!("t{i} = 5.0\n");
    }
    s += "tp = 18.0\ntq = 19.0\n";
    for i in 0..n - 1 {
        s += &format!("[[path]]\nvia = [\"s{i}\", \"t{i}\", \"s{}\"]\n", i + 1);
    }
    s += &format!("[[path]]\nvia = [\"s{}\", \"tp\", \"p\"]\n", n - 1);
    s += &format!("[[path]]\nvia = [\"s{}\", \"tq\", \"q\"]\n", n - 1);
    let sel = selectivity(&s);
    assert!(sel.simulated.is_none());
    assert_eq!(sel.limit_agrees, None);
    let note = sel.simulation_note.unwrap();
    assert!(note.contains("203 states, above the 200"), "{note}");
}
