//! The microkinetic simulation against closed forms computed outside the
//! project: `tests/reference/*.toml`, written by `tests/reference/generate.py`
//! (numpy/scipy/mpmath, versions in each file's `[meta]`). Integrated values
//! are held to each entry's `tolerance_ode`.
//!
//! Profiles are built from the reference inputs; rate constants given as k
//! are turned into barriers with the Eyring equation, and products lie
//! 60 kcal/mol below their precursors so that the reverse steps (k·e^−101)
//! do not matter at these tolerances.

use crate::common::{self, Check};
use eyrie::kinetics::barrier_for_rate;
use eyrie::simulate::{Initial, Options, Until, simulate};
use eyrie::units::{EnergyUnit, Temperature};

/// A reference file and its checks, each held to its `tolerance_ode` (or
/// `tolerance` where the entry has no integrated value).
fn load(file: &str) -> (toml::Table, Vec<Check>) {
    let doc = common::reference_table(file);
    let checks = common::reference_checks(&doc, &["tolerance_ode", "tolerance"]);
    (doc, checks)
}

fn table<'a>(doc: &'a toml::Table, kind: &str, name: &str) -> &'a toml::Table {
    doc[kind]
        .as_array()
        .unwrap()
        .iter()
        .map(|t| t.as_table().unwrap())
        .find(|t| t["name"].as_str() == Some(name))
        .unwrap()
}

fn num(t: &toml::Table, key: &str) -> f64 {
    t[key].as_float().unwrap()
}

/// Final concentrations by state id after simulating `until`.
fn run(profile: &str, initial: Initial, until: Until) -> Vec<(String, f64)> {
    let model = eyrie::profile::parse(profile).unwrap().model;
    let options = Options {
        until,
        initial,
        ..Options::default()
    };
    let sim = simulate(&model, &options, &mut |_, _| {}).unwrap();
    assert!(sim.mass_error < 1e-9, "mass error {:e}", sim.mass_error);
    sim.network
        .species
        .iter()
        .zip(&sim.last().x)
        .map(|(s, &v)| (model.point(s.point).id.clone(), v))
        .collect()
}

fn get(x: &[(String, f64)], id: &str) -> f64 {
    x.iter().find(|(i, _)| i == id).unwrap().1
}

fn barrier(k: f64) -> f64 {
    barrier_for_rate(
        k,
        EnergyUnit::KcalPerMol,
        Temperature::kelvin(298.15).unwrap(),
    )
}

/// Bateman, Proc. Cambridge Philos. Soc. 1910, 15, 423: A → B → C; every
/// case of bateman.toml (distinct, k₁ = k₂, k₂/k₁ − 1 = 1e-9, stiff 1e4 vs 1e-2 s⁻¹).
#[test]
fn bateman_time_courses() {
    let (doc, checks) = load("bateman.toml");
    let mut n = 0;
    for c in checks.iter().filter(|c| c.inputs.contains_key("time_s")) {
        let Some(case) = c.inputs["case"]
            .as_str()
            .filter(|_| c.id.starts_with("bateman-"))
        else {
            continue;
        };
        let t = table(&doc, "bateman_case", case);
        let (k1, k2) = (num(t, "k1_per_s"), num(t, "k2_per_s"));
        let profile = format!(
            "unit = \"kcal/mol\"\ntemperature = 298.15\n[states]\nA = 0.0\nB = -60.0\nC = -120.0\n\
             [ts]\nT1 = {:e}\nT2 = {:e}\n[[path]]\nvia = [\"A\", \"T1\", \"B\", \"T2\", \"C\"]\n",
            barrier(k1),
            -60.0 + barrier(k2)
        );
        let time = c.inputs["time_s"].as_float().unwrap();
        let x = run(&profile, Initial::Reference, Until::Time(time));
        let species = c.id.split('-').rev().nth(1).unwrap();
        c.assert_close(get(&x, species));
        n += 1;
    }
    assert!(n >= 30, "only {n} Bateman entries checked");
}

/// Seeman, Chem. Rev. 1983, 83, 83: exact A ⇌ B, A → C, B → D; final ratios at
/// fast, intermediate and slow interconversion from a Boltzmann start and from
/// pure A, and the time course at 0.5, 2 and 10 s.
#[test]
fn winstein_holness_ratios_and_time_courses() {
    let (doc, checks) = load("winstein_holness.toml");
    let mut n = 0;
    for c in &checks {
        let Some(name) = c.inputs.get("system").and_then(|v| v.as_str()) else {
            continue;
        };
        if name == "all" {
            continue; // an entry about every system at once (regime labels)
        }
        let s = table(&doc, "system", name);
        let profile = format!(
            "unit = \"kcal/mol\"\ntemperature = {}\n[states]\nA = {}\nB = {}\nC = -60.0\nD = -60.0\n\
             [ts]\nTAB = {}\nTAC = {}\nTBD = {}\n\
             [[path]]\nvia = [\"A\", \"TAB\", \"B\"]\n[[path]]\nvia = [\"A\", \"TAC\", \"C\"]\n\
             [[path]]\nvia = [\"B\", \"TBD\", \"D\"]\n",
            num(s, "temperature_k"),
            num(s, "g_A"),
            num(s, "g_B"),
            num(s, "g_TS_AB"),
            num(s, "g_TS_AC"),
            num(s, "g_TS_BD")
        );
        let initial = if s["start"].as_str() == Some("Boltzmann") {
            Initial::Boltzmann(vec!["A".into(), "B".into()], 1.0)
        } else {
            Initial::Given(vec![("A".into(), 1.0)])
        };
        if let Some(time) = c.inputs.get("time_s").and_then(|v| v.as_float()) {
            let x = run(&profile, initial, Until::Time(time));
            let species =
                c.id.split("-conc-")
                    .nth(1)
                    .unwrap()
                    .split('-')
                    .next()
                    .unwrap();
            c.assert_close(get(&x, species));
            n += 1;
        } else if c.id.ends_with("final-ratio") || c.id.ends_with("final-fraction-D") {
            // 1e-12 of the material left in A and B: the ratio is final to 1e-12.
            let x = run(&profile, initial, Until::Conversion(1.0 - 1e-12));
            let (cc, dd) = (get(&x, "C"), get(&x, "D"));
            let got = if c.id.ends_with("ratio") {
                dd / cc
            } else {
                dd / (cc + dd)
            };
            c.assert_close(got);
            n += 1;
        }
    }
    assert!(n >= 24, "only {n} Winstein–Holness entries checked");
}

/// Reversible A ⇌ B: the long-time ratio is K = exp(−ΔG/RT) (definition of
/// the equilibrium constant; bateman.toml `equilibrium-reversible-*`), and
/// [B] at one relaxation time follows the closed form.
#[test]
fn reversible_step_reaches_exp_minus_dg_over_rt() {
    let (doc, checks) = load("bateman.toml");
    let case = table(&doc, "equilibrium_case", "reversible");
    let profile = format!(
        "unit = \"kcal/mol\"\ntemperature = {}\n[states]\nA = {}\nB = {}\n[ts]\nTS = {}\n\
         [[path]]\nvia = [\"A\", \"TS\", \"B\"]\n",
        num(case, "temperature_k"),
        num(case, "g_A"),
        num(case, "g_B"),
        num(case, "g_TS")
    );
    let by_id = |id: &str| checks.iter().find(|c| c.id == id).unwrap();
    // Default rule: stops at equilibrium (99 % conversion is out of reach).
    let x = run(&profile, Initial::Reference, Until::Default);
    by_id("equilibrium-reversible-K-simulated").assert_close(get(&x, "B") / get(&x, "A"));
    let c = by_id("equilibrium-reversible-B-at-tau");
    let x = run(
        &profile,
        Initial::Reference,
        Until::Time(c.inputs["time_s"].as_float().unwrap()),
    );
    c.assert_close(get(&x, "B"));
}

/// Energetic span model (Kozuch & Shaik, J. Phys. Chem. A 2008, 112, 6032):
/// the steady-state turnover of every cycle in energetic_span.toml (including
/// the endergonic one, whose TOF is negative) equals the exact TOF.
#[test]
fn cycle_steady_state_turnover_is_the_energetic_span_tof() {
    let (doc, checks) = load("energetic_span.toml");
    for cycle in doc["cycle"].as_array().unwrap() {
        let cy = cycle.as_table().unwrap();
        let name = cy["name"].as_str().unwrap();
        let sim = simulate_cycle(cy);
        let c = checks
            .iter()
            .find(|c| c.id == format!("esm-{name}-tof"))
            .unwrap();
        assert_eq!(sim.turnover.len(), 1);
        let tof = sim.turnover[0].1;
        let rel = ((tof - c.value) / c.value).abs();
        // The integrated steady state (relative imbalance 1e-9 when the run
        // stops) against the closed form; tolerance_ode of the time courses.
        assert!(
            rel < 1e-6,
            "cycle {name}: TOF {tof:e} vs {:e} (rel {rel:e})",
            c.value
        );
    }
}

/// A profile text for one reference cycle; the regenerated catalyst `Ireg`
/// lies at G(I0) + ΔGr.
pub fn cycle_profile(cy: &toml::Table) -> String {
    let ints: Vec<&str> = cy["intermediates"]
        .as_array()
        .unwrap()
        .iter()
        .map(|v| v.as_str().unwrap())
        .collect();
    let tss: Vec<&str> = cy["ts"]
        .as_array()
        .unwrap()
        .iter()
        .map(|v| v.as_str().unwrap())
        .collect();
    let gi: Vec<f64> = cy["intermediate_g"]
        .as_array()
        .unwrap()
        .iter()
        .map(|v| v.as_float().unwrap())
        .collect();
    let gt: Vec<f64> = cy["ts_g"]
        .as_array()
        .unwrap()
        .iter()
        .map(|v| v.as_float().unwrap())
        .collect();
    let mut text = format!(
        "unit = \"{}\"\ntemperature = {}\nzero = \"I0\"\n[states]\n",
        cy["unit"].as_str().unwrap(),
        num(cy, "temperature_k")
    );
    for (i, g) in ints.iter().zip(&gi) {
        text += &format!("{i} = {g}\n");
    }
    text += &format!("Ireg = {}\n[ts]\n", gi[0] + num(cy, "dgr"));
    for (t, g) in tss.iter().zip(&gt) {
        text += &format!("{t} = {g}\n");
    }
    let mut via = Vec::new();
    for (i, t) in ints.iter().zip(&tss) {
        via.push(format!("\"{i}\""));
        via.push(format!("\"{t}\""));
    }
    via.push("\"Ireg\"".into());
    text += &format!("[[path]]\ncycle = true\nvia = [{}]\n", via.join(", "));
    text
}

fn simulate_cycle(cy: &toml::Table) -> eyrie::simulate::Simulation {
    let model = eyrie::profile::parse(&cycle_profile(cy)).unwrap().model;
    let sim = simulate(&model, &Options::default(), &mut |_, _| {}).unwrap();
    assert!(sim.mass_error < 1e-9);
    sim
}
