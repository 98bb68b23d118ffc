//! Degrees of rate control and of selectivity control from the simulation
//! (`eyrie::simulate::control`), against closed forms.

use crate::common;

use eyrie::model::Model;
use eyrie::simulate::control::{RateControl, Target};
use eyrie::simulate::{Options, rate_control, selectivity_control};
use rand::{RngExt, SeedableRng};

fn model(text: &str) -> Model {
    eyrie::profile::parse(text)
        .unwrap_or_else(|e| panic!("profile is valid: {e:?}\n{text}"))
        .model
}

/// X of the target named `id` (point id, or "a→b").
fn x(model: &Model, rc: &[(Target, f64)], id: &str) -> f64 {
    rc.iter()
        .find(|(t, _)| t.name(model) == id)
        .unwrap_or_else(|| panic!("no degree for {id}"))
        .1
}

/// A `cycle = true` profile: intermediates i0…, TSs t0… (`None`: barrierless),
/// the regenerated catalyst `cat-p` at G(i0) + ΔGr.
fn cycle_text(ints: &[f64], tss: &[Option<f64>], dgr: f64, unit: &str, t: f64) -> String {
    let mut s = format!("unit = \"{unit}\"\ntemperature = {t:?}\n[states]\n");
    for (i, g) in ints.iter().enumerate() {
        s += &format!("i{i} = {g:?}\n");
    }
    s += &format!("cat-p = {:?}\n[ts]\n", ints[0] + dgr);
    for (i, g) in tss.iter().enumerate() {
        if let Some(g) = g {
            s += &format!("t{i} = {g:?}\n");
        }
    }
    let mut via: Vec<String> = Vec::new();
    for (i, ts) in tss.iter().enumerate() {
        via.push(format!("\"i{i}\""));
        if ts.is_some() {
            via.push(format!("\"t{i}\""));
        }
    }
    via.push("\"cat-p\"".into());
    s += &format!(
        "[[path]]\nname = \"c\"\ncycle = true\nvia = [{}]\n",
        via.join(", ")
    );
    s
}

/// The simulated DRC of a cycle against the energetic span model's degree of
/// TOF control (Kozuch & Shaik, Acc. Chem. Res. 2011, 44, 101: a closed form,
/// computed independently in `kinetics::span`): X(TS) = its TOF control,
/// X(intermediate) = − its TOF control (the span model reports the magnitude;
/// Campbell's thermodynamic degree of a stabilised intermediate is negative).
/// Returns the largest absolute difference.
fn compare_with_span(text: &str) -> f64 {
    let m = model(text);
    let rc = rate_control(&m, &Options::default()).expect("rate control");
    let cycle = eyrie::kinetics::cycle::analyze_cycle(&m, 0).expect("a cycle");
    let mut worst: f64 = 0.0;
    for (i, t) in cycle.ts.iter().enumerate() {
        let got = x(&m, &rc.degrees, &t.name(&m));
        worst = worst.max((got - cycle.span.ts_control[i]).abs());
    }
    for (i, &p) in cycle.intermediates.iter().enumerate() {
        let got = x(&m, &rc.degrees, &m.point(p).id);
        worst = worst.max((got + cycle.span.intermediate_control[i]).abs());
    }
    // The regenerated catalyst is not a state of its own: nothing to perturb.
    assert!(rc.degrees.iter().all(|(t, _)| t.name(&m) != "cat-p"));
    assert_sum_rule(&rc);
    worst
}

/// Stegelmann, Andreasen & Campbell, JACS 2009, 131, 8077: Σ X over the TSs
/// is 1 and over the states −1 (uniform shifts only rescale time).
fn assert_sum_rule(rc: &RateControl) {
    assert!((rc.sum_ts - 1.0).abs() < 1e-6, "Σ TS = {}", rc.sum_ts);
    assert!(
        (rc.sum_states + 1.0).abs() < 1e-6,
        "Σ states = {}",
        rc.sum_states
    );
    assert!(rc.sum_rule_holds());
}

#[test]
fn reference_cycles_match_the_energetic_span_model() {
    // The worked cycles of tests/reference/energetic_span.toml (generate.py).
    let doc = common::reference_table("energetic_span.toml");
    let floats = common::floats;
    let cycles = doc["cycle"].as_array().unwrap();
    assert!(cycles.len() >= 4);
    for c in cycles {
        let ints = floats(&c["intermediate_g"]);
        let tss: Vec<Option<f64>> = floats(&c["ts_g"]).into_iter().map(Some).collect();
        let profile = cycle_text(
            &ints,
            &tss,
            c["dgr"].as_float().unwrap(),
            c["unit"].as_str().unwrap(),
            c["temperature_k"].as_float().unwrap(),
        );
        let worst = compare_with_span(&profile);
        assert!(worst < 1e-3, "cycle {}: off by {worst}", c["name"]);
        eprintln!(
            "cycle {}: largest |X(simulated) − X(span)| {worst:e}",
            c["name"]
        );
    }
}

#[test]
fn random_cycles_match_the_energetic_span_model() {
    // Seeded random cycles (2–6 intermediates, exergonic and endergonic, some
    // with a barrierless step whose top is the higher minimum) against the
    // energetic span closed form, as above.
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(2009);
    let mut worst: f64 = 0.0;
    for _ in 0..12 {
        let n = rng.random_range(2..7usize);
        let mut ints: Vec<f64> = (0..n).map(|_| rng.random_range(-12.0..8.0)).collect();
        ints[0] = 0.0;
        let dgr = if rng.random_bool(0.8) {
            rng.random_range(-30.0..-1.0)
        } else {
            rng.random_range(1.0..6.0)
        };
        let barrierless = rng.random_range(0..2 * n); // ≥ n: none
        let tss: Vec<Option<f64>> = (0..n)
            .map(|i| {
                let next = if i + 1 < n {
                    ints[i + 1]
                } else {
                    ints[0] + dgr
                };
                (i != barrierless).then(|| ints[i].max(next) + rng.random_range(3.0..22.0))
            })
            .collect();
        let t = rng.random_range(250.0..400.0);
        let text = cycle_text(&ints, &tss, dgr, "kcal/mol", t);
        let w = compare_with_span(&text);
        assert!(w < 1e-3, "off by {w}\n{text}");
        worst = worst.max(w);
    }
    eprintln!("largest |X(simulated) − X(span)| over random cycles: {worst:e}");
}

#[test]
fn one_irreversible_step_is_fully_rate_controlling() {
    // Closed form: A → P, r = k[A] with k = (kB·T/h)·e^(−(G‡ − G_A)/RT), so
    // ∂ln r/∂(−G‡/RT) = 1 and ∂ln r/∂(−G_A/RT) = −1; P (40 kcal/mol below)
    // does not return.
    let m = model(
        "unit = \"kcal/mol\"\n[states]\na = 0.0\np = -40.0\n[ts]\nts = 21.0\n\
         [[path]]\nvia = [\"a\", \"ts\", \"p\"]\n",
    );
    let rc = rate_control(&m, &Options::default()).unwrap();
    assert!((x(&m, &rc.degrees, "ts") - 1.0).abs() < 1e-6);
    assert!((x(&m, &rc.degrees, "a") + 1.0).abs() < 1e-6);
    assert!(x(&m, &rc.degrees, "p").abs() < 1e-6);
    assert_sum_rule(&rc);
}

#[test]
fn pre_equilibrium_puts_the_control_on_the_second_ts() {
    // Closed form of the pre-equilibrium rate law for A ⇌ I → P:
    // r = k₂·K/(1 + K)·([A] + [I]) with K = e^(−(G_I − G_A)/RT), so
    // X(ts2) = 1, X(ts1) = 0, X(I) = −K/(1 + K), X(A) = −1/(1 + K)
    // (the states' degrees are minus their share of the pool). Here
    // k₁ ≈ 1e9 s⁻¹ against k₂ ≈ 0.4 s⁻¹, so the approximation holds to 1e-9.
    let m = model(
        "unit = \"kcal/mol\"\ntemperature = 298.15\n[states]\na = 0.0\ni = 1.0\np = -30.0\n\
         [ts]\nts1 = 5.0\nts2 = 19.0\n\
         [[path]]\nvia = [\"a\", \"ts1\", \"i\", \"ts2\", \"p\"]\n",
    );
    let rc = rate_control(&m, &Options::default()).unwrap();
    // RT at 298.15 K in kcal/mol (CODATA 2018 R, thermochemical calorie).
    let rt: f64 = 8.314462618 * 298.15 / 4184.0;
    let k = (-1.0 / rt).exp();
    assert!((x(&m, &rc.degrees, "ts2") - 1.0).abs() < 1e-6);
    assert!(x(&m, &rc.degrees, "ts1").abs() < 1e-6);
    assert!((x(&m, &rc.degrees, "i") + k / (1.0 + k)).abs() < 1e-6);
    assert!((x(&m, &rc.degrees, "a") + 1.0 / (1.0 + k)).abs() < 1e-6);
    assert_sum_rule(&rc);
}

#[test]
fn sum_rule_holds_with_comparable_rates() {
    // Stegelmann et al. 2009 sum rules on a branched network where no step
    // dominates (A ⇌ B at 17.5, A → C at 18.0, B → D at 17.2 kcal/mol; the
    // Seeman intermediate case of tests/reference/winstein_holness.toml).
    let m = model(SEEMAN);
    let rc = rate_control(&m, &Options::default()).unwrap();
    assert_sum_rule(&rc);
    // Each of the three TSs carries a share.
    for ts in ["ts-ab", "ts-ac", "ts-bd"] {
        assert!(x(&m, &rc.degrees, ts) > 0.01, "{ts}");
    }
}

const SEEMAN: &str = "unit = \"kcal/mol\"\ntemperature = 298.15\nzero = \"a\"\nstart = \"a\"\n\
    [states]\na = 0.0\nb = 1.0\nc = -8.0\nd = -7.0\n\
    [ts]\nts-ab = 17.5\nts-ac = 18.0\nts-bd = 17.2\n\
    [[path]]\nvia = [\"a\", \"ts-ab\", \"b\"]\n\
    [[path]]\nvia = [\"a\", \"ts-ac\", \"c\"]\n\
    [[path]]\nvia = [\"b\", \"ts-bd\", \"d\"]\n";

#[test]
fn selectivity_control_of_two_competing_channels() {
    // Closed form: A → Pa (k_a), A → Pb (k_b), S = k_a/(k_a + k_b) at every
    // time. ∂ln S/∂ln k_a = 1 − S and ∂ln S/∂ln k_b = −(1 − S); lowering a TS
    // by δ·RT multiplies its k by e^δ, so X_S(ts-a) = 1 − S, X_S(ts-b) = −(1 − S),
    // and X_S(A) = 0 (both channels slow alike).
    let m = model(
        "unit = \"kcal/mol\"\ntemperature = 298.15\n[states]\na = 0.0\npa = -25.0\npb = -25.0\n\
         [ts]\nts-a = 18.0\nts-b = 18.8\n\
         [[path]]\nvia = [\"a\", \"ts-a\", \"pa\"]\n[[path]]\nvia = [\"a\", \"ts-b\", \"pb\"]\n",
    );
    let sc = selectivity_control(&m, &Options::default())
        .unwrap()
        .expect("two products");
    assert_eq!(m.point(sc.product).id, "pa");
    let rt: f64 = 8.314462618 * 298.15 / 4184.0; // CODATA 2018 R, thermochemical calorie
    let s = 1.0 / (1.0 + (-0.8 / rt).exp());
    assert!(
        (sc.selectivity - s).abs() < 1e-6,
        "{} vs {s}",
        sc.selectivity
    );
    assert!((x(&m, &sc.degrees, "ts-a") - (1.0 - s)).abs() < 1e-4);
    assert!((x(&m, &sc.degrees, "ts-b") + (1.0 - s)).abs() < 1e-4);
    assert!(x(&m, &sc.degrees, "a").abs() < 1e-4);
}

#[test]
fn no_rate_without_conversion() {
    // A reversible step that stops at equilibrium below 50 % conversion has no
    // rate at half conversion: a clear error, not a number (K = e^(−2/RT) ≈ 0.03).
    let m = model(
        "unit = \"kcal/mol\"\n[states]\na = 0.0\np = 2.0\n[ts]\nts = 15.0\n\
         [[path]]\nvia = [\"a\", \"ts\", \"p\"]\n",
    );
    let e = rate_control(&m, &Options::default()).unwrap_err();
    assert!(e.to_string().contains("50 % conversion"), "{e}");
}

#[test]
fn simulate_reports_rate_control_for_a_cycle_by_default() {
    // The demo cycle's degrees against its energetic span TOF control (closed
    // form, Kozuch & Shaik 2011), as `analyze` reports it, through the binary.
    let dir = tempfile::tempdir().unwrap();
    let profile = common::repo("profiles/catalytic-cycle.toml");
    let out = common::eyrie(&["simulate", "--json", &profile], dir.path());
    assert!(out.status.success());
    let json: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let rc = json["rate_control"]
        .as_object()
        .expect("rate_control for a cycle");
    assert!((json["rate_control_sum"].as_f64().unwrap() - 1.0).abs() < 1e-6);
    assert_eq!(json["rate_control_basis"]["rate"], "turnover");
    assert_eq!(json["rate_control_basis"]["sum_rule_holds"], true);
    assert!(json["selectivity_control"].is_null());
    let m = model(&std::fs::read_to_string(&profile).unwrap());
    let cycle = eyrie::kinetics::cycle::analyze_cycle(&m, 0).unwrap();
    for (i, t) in cycle.ts.iter().enumerate() {
        let got = rc[&t.name(&m)].as_f64().unwrap();
        assert!(
            (got - cycle.span.ts_control[i]).abs() < 1e-3,
            "{}",
            t.name(&m)
        );
    }
}

#[test]
fn rate_control_on_request_for_a_profile_without_a_cycle() {
    let dir = tempfile::tempdir().unwrap();
    let profile = common::repo("profiles/conformers.toml");
    let plain = common::eyrie(&["simulate", "--json", &profile], dir.path());
    let json: serde_json::Value = serde_json::from_slice(&plain.stdout).unwrap();
    assert!(json["rate_control"].is_null(), "not asked for");
    let out = common::eyrie(
        &["simulate", "--rate-control", "--json", &profile],
        dir.path(),
    );
    let json: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(json["rate_control_basis"]["rate"], "product-formation");
    // Selectivity control sums to zero over the TSs (uniform TS shifts only
    // rescale time; Stegelmann et al. 2009's argument applied to S).
    let sc = json["selectivity_control"].as_object().unwrap();
    let ts_sum: f64 = ["ts-a", "ts-b", "ts-rot"]
        .iter()
        .map(|k| sc[*k].as_f64().unwrap())
        .sum();
    assert!(ts_sum.abs() < 1e-4, "{ts_sum}");
    let text = common::eyrie(&["simulate", "--rate-control", &profile], dir.path());
    let text = String::from_utf8(text.stdout).unwrap();
    assert!(text.contains("Degree of rate control"), "{text}");
    assert!(
        text.contains("Degree of selectivity control toward prod-b"),
        "{text}"
    );
    assert!(text.contains("the sum rules hold"), "{text}");
}

#[test]
fn pre_equilibrium_with_a_consumed_coreactant() {
    // Closed-form derivation: A + W ⇌ I (fast, consumes W), I → P (slow).
    // At 50 % conversion of the pool [A] + [I] from [A]₀ = 1 M, [W]₀ = w₀:
    // [A] + [I] = α = 1/2 and [W] = β − [I] with β = w₀ − 1/2 (W is bound
    // in I and spent in P = 1/2). The pre-equilibrium [I] = K(α − [I])(β − [I]),
    // K = e^(−(G_I − G_A)/RT) per mol/L (1 mol/L standard state), fixes [I];
    // r = k₂[I]. Differentiating the quadratic, g = ∂ln[I]/∂ln K =
    // 1/(1 + K(α + β − 2[I])). Lowering I by δ multiplies K by e^δ and k₂ by
    // e^−δ; lowering A divides K by e^δ; so X(ts2) = 1, X(ts1) = 0,
    // X(I) = g − 1, X(A) = −g (states sum to −1). k₁ ≈ 1e9 s⁻¹ against
    // k₂ ≈ 0.4 s⁻¹: the pre-equilibrium holds to about 1e-9.
    let w0 = 2.0;
    let m = model(&format!(
        "unit = \"kcal/mol\"\ntemperature = 298.15\nzero = \"a\"\n[coreactants]\nW = {w0:?}\n\
         [states]\na = {{ g = 0.0, with = [\"W\"] }}\ni = 1.0\np = {{ g = -30.0, product = true }}\n\
         [ts]\nts1 = 5.0\nts2 = 19.0\n\
         [[path]]\nvia = [\"a\", \"ts1\", \"i\", \"ts2\", \"p\"]\n"
    ));
    let rc = rate_control(&m, &Options::default()).unwrap();
    // RT at 298.15 K in kcal/mol (CODATA 2018 R, thermochemical calorie).
    let rt: f64 = 8.314462618 * 298.15 / 4184.0;
    let k = (-1.0 / rt).exp();
    let (alpha, beta) = (0.5, w0 - 0.5);
    let b = k * (alpha + beta) + 1.0;
    let i = (b - (b * b - 4.0 * k * k * alpha * beta).sqrt()) / (2.0 * k);
    let g = 1.0 / (1.0 + k * (alpha + beta - 2.0 * i));
    assert!((x(&m, &rc.degrees, "ts2") - 1.0).abs() < 1e-6);
    assert!(x(&m, &rc.degrees, "ts1").abs() < 1e-6);
    assert!(
        (x(&m, &rc.degrees, "i") - (g - 1.0)).abs() < 1e-6,
        "{:?}",
        rc.degrees
    );
    assert!(
        (x(&m, &rc.degrees, "a") + g).abs() < 1e-6,
        "{:?}",
        rc.degrees
    );
    // Unlike the first-order pre-equilibrium (X(A) = −1/(1 + K) ≈ −0.84
    // here), the co-reactant's depletion moves the share.
    assert!((g - 1.0 / (1.0 + k)).abs() > 0.05);
    assert_sum_rule(&rc);
}
