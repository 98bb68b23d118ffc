//! Bimolecular steps with a co-reactant: a step that leaves a state where
//! the co-reactant W is free (`with`) for one where it is not consumes W, at
//! rate k₂·[A]·[W]. Checked against the closed-form integrated rate laws of
//! A + W → P and against `analyze`'s pseudo-first-order constant in the excess
//! limit; the co-reactant's free + bound amount is conserved.

use eyrie::simulate::integrate::{Flow, Linear, Tolerances, integrate_with};
use eyrie::simulate::{Initial, Network, Options, Simulation, Stopped, Until, simulate};

const T: f64 = 298.15;

/// Eyring k = kB·T/h·exp(−ΔG‡/RT) at 298.15 K for a barrier in kcal/mol, with
/// CODATA 2018 constants (exact SI values of kB and h, R = NA·kB; 1 kcal =
/// 4184 J, thermochemical calorie).
fn eyring(barrier_kcal: f64) -> f64 {
    let kb = 1.380_649e-23;
    let h = 6.626_070_15e-34;
    let r = 8.314_462_618;
    kb * T / h * (-barrier_kcal * 4184.0 / (r * T)).exp()
}

/// A (W free) → P through a TS `barrier` kcal/mol above A at 1 mol/L of W;
/// the product lies `dg` kcal/mol from A (W bound in P). W is stated at
/// `c` mol/L.
fn profile(c: f64, barrier: f64, dg: f64) -> eyrie::model::Model {
    let text = format!(
        "unit = \"kcal/mol\"\ntemperature = {T}\nzero = \"A\"\n[coreactants]\nW = {c}\n\
         [states]\nA = {{ g = 0.0, with = [\"W\"] }}\nP = {{ g = {dg}, product = true }}\n\
         [ts]\nTS = {barrier}\n[[path]]\nvia = [\"A\", \"TS\", \"P\"]\n"
    );
    eyrie::profile::parse(&text).unwrap().model
}

fn run(model: &eyrie::model::Model, a0: f64, until: Until) -> Simulation {
    let options = Options {
        until,
        initial: Initial::Given(vec![("A".into(), a0)]),
        ..Options::default()
    };
    simulate(model, &options, &mut |_, _| {}).unwrap()
}

/// Index of A, P and W in the state vector.
fn indices(sim: &Simulation) -> (usize, usize, usize) {
    let net = &sim.network;
    assert_eq!(net.coreactants.len(), 1, "W is tracked");
    (0, 1, net.free(0))
}

#[test]
fn excess_co_reactant_is_pseudo_first_order_as_analyze_reports() {
    // [W]0/[A]0 = 1e5: the exact law ln(W·A0/(A·W0)) = (W0 − A0)·k2·t differs from
    // exp(−k2·W0·t) by at most A0·k2·t + ln(W0/W) ≈ 2·(A0/W0)·ln 100 ≈ 1e-4 (closed form).
    let model = profile(1.0, 20.0, -15.0);
    let k_analyze = eyrie::kinetics::analyze(&model).steps[0]
        .k_forward
        .per_second();
    let k2 = eyring(20.0);
    assert!(
        (k_analyze / (k2 * 1.0) - 1.0).abs() < 1e-9,
        "analyze k = k2·c"
    );
    let sim = run(&model, 1e-5, Until::Default);
    assert_eq!(sim.stopped, Stopped::Conversion);
    let (a, _, _) = indices(&sim);
    for s in sim.samples.iter().skip(1) {
        let expected = 1e-5 * (-k_analyze * s.t).exp();
        let rel = (s.x[a] - expected).abs() / expected;
        assert!(
            rel < 2e-4,
            "t = {:e}: {} vs {expected} ({rel:e})",
            s.t,
            s.x[a]
        );
    }
    // The same profile with W at 0.1 mol/L: analyze's k is k2·0.1 and the
    // simulation follows it (W still in 1e4-fold excess).
    let model = profile(0.1, 20.0, -15.0);
    let k_analyze = eyrie::kinetics::analyze(&model).steps[0]
        .k_forward
        .per_second();
    assert!((k_analyze / (k2 * 0.1) - 1.0).abs() < 1e-9);
    let sim = run(&model, 1e-5, Until::Default);
    let last = sim.last();
    let expected = 1e-5 * (-k_analyze * last.t).exp();
    assert!(
        (last.x[0] / expected - 1.0).abs() < 2e-3,
        "{} vs {expected}",
        last.x[0]
    );
}

#[test]
fn equal_concentrations_follow_the_second_order_law() {
    // 1/[A] = 1/[A]0 + k2·t for [A]0 = [W]0 (second-order integrated rate law, closed form).
    let c = 0.5;
    let model = profile(c, 19.0, -15.0);
    let k2 = eyring(19.0);
    let sim = run(&model, c, Until::Default);
    assert_eq!(sim.stopped, Stopped::Conversion);
    let (a, _, w) = indices(&sim);
    for s in sim.samples.iter().skip(1) {
        let expected = 1.0 / (1.0 / c + k2 * s.t);
        assert!(
            (s.x[a] / expected - 1.0).abs() < 1e-6,
            "t = {:e}: {} vs {expected}",
            s.t,
            s.x[a]
        );
        assert!((s.x[w] - s.x[a]).abs() < 1e-12, "W and A fall together");
    }
    // 99 % conversion of A at t = 99/(k2·[A]0) (the same law solved for t).
    let t99 = 99.0 / (k2 * c);
    assert!(
        (sim.time_s() / t99 - 1.0).abs() < 1e-6,
        "{} vs {t99}",
        sim.time_s()
    );
}

#[test]
fn unequal_concentrations_follow_the_mixed_second_order_law() {
    // ln([W][A]0/([A][W]0)) = ([W]0 − [A]0)·k2·t (second-order integrated rate
    // law for A + W → P with [A]0 ≠ [W]0, closed form).
    let (a0, w0) = (0.3, 0.5);
    let model = profile(w0, 19.5, -15.0);
    let k2 = eyring(19.5);
    let sim = run(&model, a0, Until::Default);
    let (a, p, w) = indices(&sim);
    let mut checked = 0;
    for s in sim.samples.iter().skip(1) {
        let lhs = (s.x[w] * a0 / (s.x[a] * w0)).ln();
        let rhs = (w0 - a0) * k2 * s.t;
        if rhs > 1e-3 {
            assert!(
                (lhs / rhs - 1.0).abs() < 1e-6,
                "t = {:e}: {lhs} vs {rhs}",
                s.t
            );
            checked += 1;
        }
        // Mass balance: A + P and W + P (W bound in P) are conserved (1e-9, the
        // bound the simulation promises).
        assert!((s.x[a] + s.x[p] - a0).abs() < 1e-9 * a0);
        assert!((s.x[w] + s.x[p] - w0).abs() < 1e-9 * w0);
    }
    assert!(checked > 10, "only {checked} samples checked");
    assert!(sim.mass_error < 1e-9, "{:e}", sim.mass_error);
}

#[test]
fn reversible_bimolecular_step_reaches_the_1_molar_equilibrium_constant() {
    // A + W ⇌ P: [P]/([A][W]) = exp(−ΔG°/RT) with ΔG° at the 1 mol/L standard
    // state (definition of K; CODATA 2018 R). ΔG° = −1 kcal/mol, W stated at 0.2.
    let model = profile(0.2, 15.0, -1.0);
    let sim = run(&model, 0.1, Until::Time(1e6));
    let (a, p, w) = indices(&sim);
    let x = &sim.last().x;
    let k = (1.0 * 4184.0 / (8.314_462_618 * T)).exp();
    let q = x[p] / (x[a] * x[w]);
    assert!((q / k - 1.0).abs() < 1e-6, "Q = {q}, K = {k}");
    assert!(sim.mass_error < 1e-9, "{:e}", sim.mass_error);
}

#[test]
fn catalyst_loading_in_a_cycle_consumes_the_substrate() {
    // cat (S free) → cat·S → cat (product released): 1 mol% catalyst, S at
    // 1 mol/L. Catalyst is conserved, S free + S in cat·S + product released
    // is conserved (mass balance, 1e-9), and the run stops at 99 % conversion of S.
    let text = "unit = \"kcal/mol\"\ntemperature = 298.15\n[coreactants]\nS = 1.0\n\
                [states]\ncat = { g = 0.0, with = [\"S\"] }\ncatS = -2.0\nrelease = -12.0\n\
                [ts]\nTS1 = 12.0\nTS2 = 17.0\n\
                [[path]]\ncycle = true\nvia = [\"cat\", \"TS1\", \"catS\", \"TS2\", \"release\"]\n";
    let model = eyrie::profile::parse(text).unwrap().model;
    let options = Options {
        initial: Initial::Given(vec![("cat".into(), 0.01)]),
        ..Options::default()
    };
    let sim = simulate(&model, &options, &mut |_, _| {}).unwrap();
    assert_eq!(sim.stopped, Stopped::Conversion);
    assert!((sim.conversion.unwrap() - 0.99).abs() < 1e-9);
    let net = &sim.network;
    let s_free = net.free(0);
    let id = |name: &str| {
        net.species
            .iter()
            .position(|s| model.point(s.point).id == name)
            .unwrap()
    };
    let (cat, cat_s, released) = (id("cat"), id("catS"), id("release"));
    for s in &sim.samples {
        assert!((s.x[cat] + s.x[cat_s] - 0.01).abs() < 1e-9 * 0.01);
        let s_total = s.x[s_free] + s.x[cat_s] + s.x[released];
        assert!((s_total - 1.0).abs() < 1e-9, "t = {:e}: {s_total}", s.t);
    }
    assert!(sim.mass_error < 1e-9);
    // Given S explicitly (0.5 mol/L): 99 % of it converted, into product released
    // or still on the catalyst (mass balance).
    let options = Options {
        initial: Initial::Given(vec![("cat".into(), 0.01), ("S".into(), 0.5)]),
        ..Options::default()
    };
    let sim = simulate(&model, &options, &mut |_, _| {}).unwrap();
    let last = sim.last();
    assert!((last.x[s_free] - 0.01 * 0.5).abs() < 1e-9);
    assert!((last.x[released] + last.x[cat_s] - 0.99 * 0.5).abs() < 1e-9);
}

#[test]
fn sparse_and_dense_jacobians_give_the_same_course() {
    // The same bimolecular system integrated with dense and sparse LU agrees to
    // the integrator's tolerance (rtol 1e-10; 1e-8 allows for the steps each takes).
    let model = profile(0.4, 19.0, -3.0);
    let net = Network::new(&model, &eyrie::kinetics::analyze(&model));
    let x0 = net.state(&[0.25, 0.0]);
    let end = |linear| {
        integrate_with(linear, &net, &x0, 5e3, Tolerances::default(), &mut |_| {
            Ok(Flow::Continue)
        })
        .unwrap()
    };
    let (td, dense) = end(Linear::Dense);
    let (ts, sparse) = end(Linear::Sparse);
    assert_eq!(td, ts);
    for (d, s) in dense.iter().zip(&sparse) {
        assert!((d - s).abs() <= 1e-8 * d.abs().max(1e-12), "{d} vs {s}");
    }
}

use crate::common;

#[test]
fn command_line_shows_the_co_reactant_in_csv_json_and_initial() {
    // Shape of the output (no numbers from outside): the CSV has one column per
    // state and one for W, every row as long as the header; the JSON lists W's
    // final free concentration; --initial W=… sets where it starts.
    let dir = tempfile::tempdir().unwrap();
    let text = "unit = \"kcal/mol\"\nzero = \"A\"\n[coreactants]\nW = 0.5\n[states]\n\
                A = { g = 0.0, with = [\"W\"] }\nP = { g = -15.0, product = true }\n\
                [ts]\nTS = 19.0\n[[path]]\nvia = [\"A\", \"TS\", \"P\"]\n";
    let file = common::write(dir.path(), "aw.toml", text);
    let file = file.to_str().unwrap();
    let out = common::eyrie(&["simulate", file, "--csv"], dir.path());
    assert_eq!(out.status.code(), Some(0));
    let csv = String::from_utf8(out.stdout).unwrap();
    let mut lines = csv.lines();
    assert_eq!(lines.next(), Some("time_s,A,P,W"));
    let first: Vec<f64> = lines
        .next()
        .unwrap()
        .split(',')
        .map(|v| v.parse().unwrap())
        .collect();
    assert_eq!(first, vec![0.0, 1.0, 0.0, 0.5]);
    assert!(csv.lines().all(|l| l.split(',').count() == 4));
    let out = common::eyrie(
        &["simulate", file, "--json", "--initial", "A=0.2,W=0.3"],
        dir.path(),
    );
    assert_eq!(out.status.code(), Some(0));
    let json: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let w = json["coreactants"]["W"].as_f64().unwrap();
    let p = json["final"]["P"].as_f64().unwrap();
    // W starts at 0.3 and loses what P gains (mass balance).
    assert!((w + p - 0.3).abs() < 1e-9, "W {w}, P {p}");
    assert!(json["mass_error"].as_f64().unwrap() < 1e-9);
}
