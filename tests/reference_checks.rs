//! eyrie's constants and Eyring kinetics against check values computed outside
//! the project: `tests/reference/*.toml`, written by `tests/reference/generate.py`
//! (mpmath/numpy/scipy, versions in each file's `[meta]`; sources named per entry,
//! CODATA 2018 and the Eyring equation for the entries checked here).
//!
//! Every entry of the files read here is either checked or named in a skip list
//! with the reason, so a new entry cannot be silently ignored.

use crate::common::{self, Check};

use eyrie::kinetics::{barrier_for_half_life, barrier_for_rate, rate_constant};
use eyrie::units::{self, EnergyUnit, Temperature};
use std::collections::BTreeSet;

/// The checks of a reference file, each held to its `tolerance`.
fn load(file: &str) -> Vec<Check> {
    common::reference_checks(&common::reference_table(file), &["tolerance"])
}

fn temperature(c: &Check) -> Temperature {
    Temperature::kelvin(c.input("temperature_k")).unwrap()
}

fn unit(c: &Check) -> EnergyUnit {
    EnergyUnit::parse(c.inputs["unit"].as_str().unwrap()).unwrap()
}

#[test]
fn constants_match_codata_2018() {
    // Source: CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 2021, 93, 025010) and the
    // thermochemical calorie, as tabulated in tests/reference/constants.toml.
    let kcal = EnergyUnit::KcalPerMol;
    let mut checked = 0;
    for c in load("constants.toml") {
        let t = || Temperature::kelvin(c.input("temperature_k")).unwrap();
        let got = match c.id.as_str() {
            "const-kB" => units::BOLTZMANN,
            "const-c" => units::SPEED_OF_LIGHT,
            "const-atm" => units::ATMOSPHERE,
            "const-bar" => units::BAR,
            // L·atm and L·bar: R × 1000 L/m³ / p.
            "const-R-L-atm" => units::GAS_CONSTANT * 1000.0 / units::ATMOSPHERE,
            "const-R-L-bar" => units::GAS_CONSTANT * 1000.0 / units::BAR,
            "const-c2" => units::PLANCK * units::SPEED_OF_LIGHT / units::BOLTZMANN * 100.0,
            "const-wavenumber-kcal" => kcal.per_wavenumber(),
            "const-wavenumber-kJ" => EnergyUnit::KjPerMol.per_wavenumber(),
            "const-h" => units::PLANCK,
            "const-NA" => units::AVOGADRO,
            "const-e" => units::ELEMENTARY_CHARGE,
            "const-cal" => units::CALORIE,
            "const-R" => units::GAS_CONSTANT,
            "const-R-kcal" => kcal.from_j_per_mol(units::GAS_CONSTANT),
            "const-hartree-kJ" | "const-hartree-kJ-unrounded" => {
                EnergyUnit::Hartree.convert(1.0, EnergyUnit::KjPerMol)
            }
            "const-hartree-kcal" => EnergyUnit::Hartree.convert(1.0, kcal),
            "const-eV-kJ" => EnergyUnit::Ev.convert(1.0, EnergyUnit::KjPerMol),
            "const-eV-kcal" => EnergyUnit::Ev.convert(1.0, kcal),
            id if id.starts_with("const-kT_h-") => t().frequency_factor(),
            id if id.starts_with("const-RTln10-") => {
                let u = if id.ends_with("kJ") {
                    EnergyUnit::KjPerMol
                } else {
                    kcal
                };
                t().rt(u) * std::f64::consts::LN_10
            }
            id if id.starts_with("const-RT-") => {
                let u = if id.ends_with("kJ") {
                    EnergyUnit::KjPerMol
                } else {
                    kcal
                };
                t().rt(u)
            }
            other => panic!("reference entry {other} is neither checked nor skipped"),
        };
        c.assert_close(got);
        checked += 1;
    }
    assert_eq!(checked, 31, "number of constants checked");
}

#[test]
fn eyring_rate_constants_and_half_lives() {
    // Source: closed form, Eyring equation (Eyring, J. Chem. Phys. 1935, 3, 107) with
    // CODATA 2018 constants, as tabulated in tests/reference/eyring.toml.
    let skipped: BTreeSet<&str> = [
        // Second-order constants with the 1 mol/L standard state come with bimolecular
        // steps (a later issue).
        "eyring-k2-298.15K-15kcal",
    ]
    .into();
    let mut checked = 0;
    for c in load("eyring.toml") {
        let id = c.id.as_str();
        if skipped.contains(id) {
            continue;
        }
        let got = if id.starts_with("eyring-k-") || id.starts_with("eyring-thalf-") {
            let k = rate_constant(c.input("dg"), unit(&c), temperature(&c), c.input("kappa"));
            if id.starts_with("eyring-k-") {
                k.per_second()
            } else {
                k.half_life_s()
            }
        } else if id.starts_with("eyring-barrier-for-k") {
            barrier_for_rate(c.input("k"), EnergyUnit::KcalPerMol, temperature(&c))
        } else if id.starts_with("eyring-barrier-for-thalf") {
            barrier_for_half_life(c.input("t_half_s"), EnergyUnit::KcalPerMol, temperature(&c))
        } else {
            panic!("reference entry {id} is neither checked nor skipped");
        };
        c.assert_close(got);
        checked += 1;
    }
    assert_eq!(checked, 47, "number of Eyring entries checked");
}

#[test]
fn temperatures_in_the_forms_chemists_write() {
    // closed form: T/K = t/°C + 273.15 (definition of the Celsius scale).
    for (text, k) in [
        ("25 C", 298.15),
        ("-78 C", 195.15),
        ("298.15 K", 298.15),
        ("310", 310.0),
        ("0 °C", 273.15),
    ] {
        let t = Temperature::parse(text).unwrap();
        assert!((t.k() - k).abs() < 1e-9, "{text} → {}", t.k());
    }
    for bad in ["-300 C", "0", "0 K", "warm", "nan", ""] {
        assert!(Temperature::parse(bad).is_err(), "{bad} should be refused");
    }
}

#[test]
fn energetic_span_of_the_reference_cycles() {
    // Source: energetic span model (Kozuch & Shaik, J. Phys. Chem. A 2008, 112, 6032;
    // Acc. Chem. Res. 2011, 44, 101), exact formula; cycles A–E and their values in
    // tests/reference/energetic_span.toml, each TOF cross-checked there against the
    // linear mass-action steady state (numpy).
    use eyrie::kinetics::span::energetic_span;
    let doc = common::reference_table("energetic_span.toml");
    let floats = common::floats;
    let strings = |v: &toml::Value| -> Vec<String> {
        v.as_array()
            .unwrap()
            .iter()
            .map(|x| x.as_str().unwrap().to_string())
            .collect()
    };
    let mut checked = 0;
    for cycle in doc["cycle"].as_array().unwrap() {
        let name = cycle["name"].as_str().unwrap();
        let unit = EnergyUnit::parse(cycle["unit"].as_str().unwrap()).unwrap();
        let t = Temperature::kelvin(cycle["temperature_k"].as_float().unwrap()).unwrap();
        let (ints, tss) = (strings(&cycle["intermediates"]), strings(&cycle["ts"]));
        let span = energetic_span(
            &floats(&cycle["intermediate_g"]),
            &floats(&cycle["ts_g"]),
            cycle["dgr"].as_float().unwrap(),
            unit,
            t,
        )
        .unwrap();
        for c in doc["check"].as_array().unwrap() {
            let id = c["id"].as_str().unwrap();
            let Some(what) = id.strip_prefix(&format!("esm-{name}-")) else {
                continue;
            };
            let tol = c["tolerance"].as_table().unwrap();
            let close = |got: f64| {
                let value = c["value"].as_float().unwrap();
                let rel = tol.get("rel").and_then(|v| v.as_float()).unwrap_or(0.0);
                let abs = tol.get("abs").and_then(|v| v.as_float()).unwrap_or(0.0);
                assert!(
                    (got - value).abs() <= (rel * value.abs()).max(abs),
                    "{id}: got {got:e}, reference {value:e}"
                );
            };
            let det = span.determining.as_ref();
            match what {
                "tof" => {
                    close(span.tof);
                    // The wrong δG′ convention gives trap_value; we must not.
                    let trap = c["trap_value"].as_float().unwrap();
                    assert!(
                        (span.tof / trap - 1.0).abs() > 1e-6,
                        "{id}: reproduces the trap value"
                    );
                }
                "tdi" => assert_eq!(ints[det.unwrap().tdi], c["value"].as_str().unwrap(), "{id}"),
                "tdts" => assert_eq!(tss[det.unwrap().tdts], c["value"].as_str().unwrap(), "{id}"),
                "tdts-position" => {
                    let got = if det.unwrap().tdts_before_tdi {
                        "before"
                    } else {
                        "after"
                    };
                    assert_eq!(got, c["value"].as_str().unwrap(), "{id}");
                }
                "span" => close(det.unwrap().span),
                "tof-approx" => close(det.unwrap().tof_approx),
                x if x.starts_with("xtof-") => {
                    let state = &x["xtof-".len()..];
                    let got = match tss.iter().position(|s| s == state) {
                        Some(i) => span.ts_control[i],
                        None => {
                            span.intermediate_control[ints.iter().position(|s| s == state).unwrap()]
                        }
                    };
                    close(got);
                }
                other => panic!("{id}: check kind {other} is not handled"),
            }
            checked += 1;
        }
        if cycle["dgr"].as_float().unwrap() > 0.0 {
            assert!(
                span.tof < 0.0,
                "cycle {name}: endergonic cycles run backwards"
            );
            assert!(span.determining.is_none());
        }
    }
    assert_eq!(checked, 55, "energetic-span entries checked");
}

#[test]
fn selectivity_conversions() {
    // Source: closed forms r = exp(ΔΔG‡/RT), ee = (r − 1)/(r + 1), Boltzmann weights
    // of the product-determining TSs (Curtin–Hammett limit), as tabulated in
    // tests/reference/selectivity.toml.
    use eyrie::convert::{Conversion, Given};
    use eyrie::kinetics::selectivity::boltzmann_fractions;
    let kcal = EnergyUnit::KcalPerMol;
    // ΔΔH‡ and ΔΔS‡ of the isoselective entries, as a profile with h and s: one
    // reactant, two product-forming TSs (TS2 − TS1 = 1.5 kcal/mol, 5 cal/(mol·K)).
    let iso = eyrie::profile::parse(
        "unit = \"kcal/mol\"\nzero = \"a\"\n[states]\na = { h = 0.0, s = 0.0 }\n\
         p1 = { h = -10.0, s = 0.0 }\np2 = { h = -9.0, s = 0.0 }\n[ts]\n\
         ts1 = { h = 20.0, s = 0.0 }\nts2 = { h = 21.5, s = 5.0 }\n\
         [[path]]\nvia = [\"a\", \"ts1\", \"p1\"]\n[[path]]\nvia = [\"a\", \"ts2\", \"p2\"]\n",
    )
    .expect("valid profile")
    .model;
    let (p1, p2) = (iso.find("p1").unwrap(), iso.find("p2").unwrap());
    let t298 = Temperature::kelvin(298.15).unwrap();
    let mut checked = 0;
    for c in load("selectivity.toml") {
        let id = c.id.as_str();
        let t = || {
            c.inputs
                .get("temperature_k")
                .map_or(t298, |_| temperature(&c))
        };
        let got = if id.starts_with("ratio-to-ddg-") {
            let conv = Conversion::new(Given::Ratio(c.input("ratio")), t());
            if id.ends_with("-kJ") {
                conv.ddg_kj_mol
            } else {
                conv.ddg_kcal_mol
            }
        } else if id.starts_with("ee-to-ddg-") {
            Conversion::new(Given::Excess(c.input("ee_percent")), t()).ddg_kcal_mol
        } else if id.starts_with("ratio-to-ee-") {
            Conversion::new(Given::Ratio(c.input("ratio")), t298).ee_percent
        } else if id.starts_with("ee-to-ratio-") {
            Conversion::new(Given::Excess(c.input("ee_percent")), t298).ratio
        } else if id.starts_with("ddg-to-ratio-") || id.starts_with("ddg-to-ee-") {
            let conv = Conversion::new(Given::Energy(c.input("ddg"), unit(&c)), t());
            if id.starts_with("ddg-to-ratio-") {
                conv.ratio
            } else {
                conv.ee_percent
            }
        } else if id == "isoselective-temperature" {
            use eyrie::kinetics::sweep::isoselective;
            let (lo, hi) = (
                Temperature::kelvin(150.0).unwrap(),
                Temperature::kelvin(450.0).unwrap(),
            );
            let roots = isoselective(&iso, p1, p2, lo, hi, 31);
            assert_eq!(roots.len(), 1, "{roots:?}");
            roots[0]
        } else if id.starts_with("isoselective-ratio-") {
            use eyrie::kinetics::sweep::sweep;
            let row = sweep(&iso, &[t()]).remove(0).unwrap();
            let f = |p| row.products.iter().find(|(q, _)| *q == p).unwrap().1;
            f(p1) / f(p2)
        } else if id.starts_with("ch-distribution-") {
            let tss = c.inputs["ts_g"].as_table().unwrap();
            let names: Vec<&String> = tss.keys().collect();
            let g: Vec<f64> = tss.values().map(|v| v.as_float().unwrap()).collect();
            let want = c.inputs["product_ts"].as_str().unwrap();
            let i = names.iter().position(|n| *n == want).unwrap();
            boltzmann_fractions(&g, kcal, t())[i]
        } else {
            panic!("reference entry {id} is neither checked nor skipped");
        };
        c.assert_close(got);
        checked += 1;
    }
    assert_eq!(checked, 50, "selectivity entries checked");
}

#[test]
fn winstein_holness_exact_solution() {
    // Source: exact first-order solution of A ⇌ B, A → C, B → D (Seeman, Chem. Rev.
    // 1983, 83, 83; Winstein & Holness, J. Am. Chem. Soc. 1955, 77, 5562), as tabulated
    // in tests/reference/winstein_holness.toml (cross-checked there with scipy solve_ivp
    // and expm). Rate constants come from eyrie's Eyring function.
    use eyrie::kinetics::winstein_holness::TwoPools;
    let doc = common::reference_table("winstein_holness.toml");
    let systems = doc["system"].as_array().unwrap();
    let setup = |name: &str| {
        let s = systems
            .iter()
            .find(|s| s["name"].as_str() == Some(name))
            .unwrap();
        let g = |k: &str| s[k].as_float().unwrap();
        let unit = EnergyUnit::parse(s["unit"].as_str().unwrap()).unwrap();
        let t = Temperature::kelvin(g("temperature_k")).unwrap();
        let k = |dg: f64| rate_constant(dg, unit, t, 1.0).per_second();
        let pools = TwoPools {
            k1: k(g("g_TS_AB") - g("g_A")),
            k_1: k(g("g_TS_AB") - g("g_B")),
            ka: k(g("g_TS_AC") - g("g_A")),
            kb: k(g("g_TS_BD") - g("g_B")),
        };
        let start = if s["start"].as_str() == Some("pure A") {
            (1.0, 0.0)
        } else {
            let xb = pools.k1 / (pools.k1 + pools.k_1);
            (1.0 - xb, xb)
        };
        (pools, start, unit, t, s.clone())
    };
    let mut checked = 0;
    for c in load("winstein_holness.toml") {
        let id = c.id.as_str();
        let got = if id == "wh-curtin-hammett-limit" || id == "wh-quench-limit-equilibrium-start" {
            let (_, (a0, b0), unit, t, s) = setup("fast-boltzmann");
            let g = |k: &str| s[k].as_float().unwrap();
            if id == "wh-curtin-hammett-limit" {
                (-(g("g_TS_BD") - g("g_TS_AC")) / t.rt(unit)).exp()
            } else {
                b0 / a0
            }
        } else {
            // Ids: wh-<regime>-<what> with inputs.system naming the system.
            let system = c.inputs["system"].as_str().unwrap().to_string();
            let (p, (a0, b0), _, _, _) = setup(&system);
            let regime = system.split('-').next().unwrap();
            let what = id.strip_prefix(&format!("wh-{regime}-")).unwrap();
            let what = what
                .strip_prefix("boltzmann-")
                .or_else(|| what.strip_prefix("pureA-"))
                .unwrap_or(what);
            match what {
                "k1" => p.k1,
                "k-1" => p.k_1,
                "kA" => p.ka,
                "kB" => p.kb,
                "lambda-fast" => p.eigenvalues().0,
                "lambda-slow" => p.eigenvalues().1,
                "k-observed" => p.k_observed(),
                "final-ratio" => {
                    // The same number by network state reduction (an independent route).
                    use eyrie::kinetics::partition::Network;
                    let mut net = Network::new(4);
                    net.add(0, 1, p.k1);
                    net.add(1, 0, p.k_1);
                    net.add(0, 2, p.ka);
                    net.add(1, 3, p.kb);
                    let traps = [false, false, true, true];
                    let (fa, fb) = (net.absorption(0, &traps), net.absorption(1, &traps));
                    let into_c = a0 * fa[2] + b0 * fb[2];
                    let into_d = a0 * fa[3] + b0 * fb[3];
                    c.assert_close(into_d / into_c);
                    p.final_ratio(a0, b0)
                }
                "final-fraction-D" => {
                    let r = p.final_ratio(a0, b0);
                    r / (1.0 + r)
                }
                w if w.starts_with("conc-") => {
                    let x = p.at(c.input("time_s"), a0, b0);
                    match &w[5..6] {
                        "A" => x.a,
                        "B" => x.b,
                        "C" => x.c,
                        _ => x.d,
                    }
                }
                other => panic!("{id}: unhandled quantity {other}"),
            }
        };
        c.assert_close(got);
        checked += 1;
    }
    assert_eq!(checked, 45, "Winstein–Holness entries checked");
}

#[test]
fn tunnelling_corrections() {
    // Source: Wigner κ = 1 + u²/24 (Wigner, Z. Phys. Chem. B 1932, 19, 203); Bell's
    // truncated κ = (u/2)/sin(u/2), valid for u < 2π (Bell, The Tunnel Effect in
    // Chemistry, 1980); values in tests/reference/tunnelling.toml.
    use eyrie::kinetics::corrections::{bell, bell_limit_cm, tunnelling_u, wigner};
    let doc = common::reference_table("tunnelling.toml");
    let mut checked = 0;
    for (c, raw) in load("tunnelling.toml")
        .into_iter()
        .zip(doc["check"].as_array().unwrap())
    {
        let id = c.id.as_str();
        let t = temperature(&c);
        let nu = || c.input("imaginary_frequency_cm");
        if id.starts_with("tunnel-bell-")
            && raw.get("valid").and_then(|v| v.as_bool()) == Some(false)
        {
            let err = bell(nu(), t).expect_err(id);
            assert!(err.to_string().contains("cm⁻¹"), "{id}: {err}");
            checked += 1;
            continue;
        }
        let got = if id.starts_with("tunnel-u-") {
            tunnelling_u(nu(), t)
        } else if id.starts_with("tunnel-wigner-") {
            wigner(nu(), t)
        } else if id.starts_with("tunnel-bell-limit-") {
            bell_limit_cm(t)
        } else if id.starts_with("tunnel-bell-minus-wigner-") {
            bell(nu(), t).unwrap() - wigner(nu(), t)
        } else if id.starts_with("tunnel-bell-") {
            bell(nu(), t).unwrap()
        } else if id.starts_with("tunnel-k-wigner-") {
            let kappa = wigner(nu(), t);
            rate_constant(c.input("dg"), unit(&c), t, kappa).per_second()
        } else {
            panic!("reference entry {id} is neither checked nor skipped");
        };
        c.assert_close(got);
        checked += 1;
    }
    assert_eq!(checked, 23, "tunnelling entries checked");
}

#[test]
fn standard_state_and_pseudo_first_order() {
    // Source: closed form G(1 mol/L) − G(p°) = RT·ln(c°RT/p°) per species, and the
    // pseudo-first-order shift −RT·ln(c/c°); values in tests/reference/standard_state.toml.
    use eyrie::kinetics::corrections::{
        PressureStandard, pseudo_first_order_shift, standard_state_shift,
    };
    let kcal = EnergyUnit::KcalPerMol;
    let mut checked = 0;
    for c in load("standard_state.toml") {
        let id = c.id.as_str();
        let t = || temperature(&c);
        let got = if id.starts_with("stdstate-atm-to-molar-") {
            let u = if id.ends_with("kJ") {
                EnergyUnit::KjPerMol
            } else {
                kcal
            };
            standard_state_shift(PressureStandard::Atmosphere, t(), u)
        } else if id.starts_with("stdstate-bar-to-molar-") {
            standard_state_shift(PressureStandard::Bar, t(), kcal)
        } else if id == "stdstate-molar-volume-298.15K-atm" {
            units::GAS_CONSTANT * t().k() / units::ATMOSPHERE * 1000.0
        } else if id == "stdstate-bimolecular-barrier-298.15K" {
            let dn = c.inputs["molecularity_change"].as_integer().unwrap() as f64;
            c.input("dg_1atm") + dn * standard_state_shift(PressureStandard::Atmosphere, t(), kcal)
        } else if id == "stdstate-unimolecular-shift" {
            let dn = c.inputs["molecularity_change"].as_integer().unwrap() as f64;
            let t298 = Temperature::kelvin(298.15).unwrap();
            dn * standard_state_shift(PressureStandard::Atmosphere, t298, kcal)
        } else if id.starts_with("pseudo-first-order-shift-") {
            pseudo_first_order_shift(c.input("concentration_mol_per_l"), t(), kcal)
        } else if id == "pseudo-first-order-k-298.15K" {
            let shift = pseudo_first_order_shift(c.input("concentration_mol_per_l"), t(), kcal);
            rate_constant(c.input("dg") + shift, unit(&c), t(), 1.0).per_second()
        } else {
            panic!("reference entry {id} is neither checked nor skipped");
        };
        c.assert_close(got);
        checked += 1;
    }
    assert_eq!(checked, 15, "standard-state entries checked");
}

#[test]
fn kinetic_isotope_effects_from_a_zero_point_variant() {
    // Source: semiclassical zero-point KIE, one C–H stretch lost at the TS,
    // KIE = exp(hc(ν_H − ν_D)/2kBT), ν_D = ν_H·√(μ_CH/μ_CD) (Westheimer, Chem. Rev. 1961,
    // 61, 265; NIST atomic masses), as tabulated in tests/reference/kie.toml. The KIE is
    // computed the way users get it: a profile with a [[variant]] zpe block.
    use eyrie::profile::{deuterium_stretch, parse, zero_point_difference};
    use eyrie::report::AnalysisReport;
    let skipped: BTreeSet<&str> = [
        // Reduced masses are intermediates of ν_D, which is checked.
        "kie-mu-CH",
        "kie-mu-CD",
        // The √2 shortcut (ν_D = ν_H/√2) is a rule eyrie does not use.
        "kie-semiclassical-2900cm-298.15K-sqrt2",
    ]
    .into();
    let kie_of = |nu: f64, t: f64| {
        let text = format!(
            "unit = \"kcal/mol\"\ntemperature = {t}\n[states]\na = 0.0\nb = -10.0\n[ts]\nts-h = 20.0\n\
             [[path]]\nname = \"p\"\nvia = [\"a\", \"ts-h\", \"b\"]\n\
             [[variant]]\nname = \"D\"\nzpe = {{ ts = \"ts-h\", stretch = {nu} }}\n"
        );
        let model = parse(&text).unwrap().model;
        let report = AnalysisReport::new(&model, &eyrie::kinetics::analyze(&model));
        report.variants[0].paths[0].kie
    };
    let mut checked = 0;
    for c in load("kie.toml") {
        let id = c.id.as_str();
        if skipped.contains(id) {
            continue;
        }
        let got = if id.starts_with("kie-nuD-") {
            deuterium_stretch(c.input("nu_H_cm"))
        } else if id.starts_with("kie-dzpe-") {
            EnergyUnit::KcalPerMol.from_j_per_mol(zero_point_difference(c.input("nu_H_cm")))
        } else if id.starts_with("kie-semiclassical-") {
            kie_of(c.input("nu_H_cm"), c.input("temperature_k"))
        } else if id.starts_with("kie-from-ddg-") {
            eyrie::kinetics::selectivity::ratio_from_ddg(c.input("ddg"), unit(&c), temperature(&c))
        } else {
            panic!("reference entry {id} is neither checked nor skipped");
        };
        c.assert_close(got);
        checked += 1;
    }
    assert_eq!(checked, 8, "KIE entries checked");
    // common practice: the largest primary H/D KIE is about 7 at 25 °C
    // (tests/reference/rules_of_thumb.toml, rot-max-primary-kie, ±1).
    let kie = kie_of(3000.0, 298.15);
    assert!((kie - 7.0).abs() <= 1.0, "{kie}");
}
