//! `eyrie check`: do the barriers explain what was measured? Compares every
//! `[[observed]]` value of one or more profiles with its prediction and exits
//! 1 when any disagrees beyond its tolerance — a test a build script can run.

use super::error::{CliError, Exit};
use super::files;
use eyrie::format;
use eyrie::kinetics::check::{Comparison, check};
use eyrie::model::{Model, ObservedKind};
use serde::Serialize;
use std::path::{Path, PathBuf};

/// One observation in `check --json`.
#[derive(Debug, Serialize)]
struct Entry {
    file: String,
    name: Option<String>,
    kind: &'static str,
    quantity: String,
    predicted: f64,
    observed: f64,
    energy_error: f64,
    unit: &'static str,
    tolerance: f64,
    consistent: bool,
    /// Share of Monte Carlo samples in which the observation is consistent, when
    /// the profile states an uncertainty.
    probability_consistent: Option<f64>,
    temperature_k: f64,
}

/// Checks every profile and prints the result; the exit code is the worst seen
/// (2 or 3 over 1 over 0).
pub fn run(inputs: &[PathBuf], json: bool) -> Result<Exit, CliError> {
    let files = files::expand(inputs)?;
    let mut entries = Vec::new();
    let mut worst = Exit::Success;
    let mut text = String::new();
    for path in &files {
        match check_file(path) {
            Ok((model, comparisons, warnings)) => {
                let mc = super::uncertainty::run(&model, &super::uncertainty::McArgs::default());
                eprint!("{warnings}");
                if comparisons.is_empty() {
                    eprintln!("{}: no [[observed]] measurements to check", path.display());
                }
                for c in &comparisons {
                    if !c.consistent {
                        worst = worst.max(Exit::Disagreed);
                    }
                    let p = mc.as_ref().map(|m| m.consistent[c.index]);
                    text += &describe(path, &model, c);
                    if let Some(p) = p {
                        text += &format!(
                            "    probability consistent given the energies' uncertainty: {:.0} %\n",
                            100.0 * p
                        );
                    }
                    let mut e = entry(path, &model, c);
                    e.probability_consistent = p;
                    entries.push(e);
                }
            }
            Err(e) => {
                // One bad file is reported by name; the others still run.
                e.report();
                worst = worst.max(e.exit());
            }
        }
    }
    if json {
        println!(
            "{}",
            serde_json::to_string_pretty(&entries).expect("plain data serialises")
        );
    } else {
        print!("{text}");
        let bad = entries.iter().filter(|e| !e.consistent).count();
        if !entries.is_empty() {
            println!(
                "{} of {} measurement(s) consistent with the barriers",
                entries.len() - bad,
                entries.len()
            );
        }
    }
    Ok(worst)
}

fn check_file(path: &Path) -> Result<(Model, Vec<Comparison>, String), CliError> {
    let (parsed, warnings) = files::load(path)?;
    let comparisons = check(&parsed.model);
    Ok((parsed.model, comparisons, warnings))
}

fn entry(path: &Path, model: &Model, c: &Comparison) -> Entry {
    let o = &model.observations()[c.index];
    Entry {
        file: path.display().to_string(),
        name: o.name.clone(),
        kind: o.kind.name(),
        quantity: c.quantity.clone(),
        predicted: c.predicted,
        observed: c.observed,
        energy_error: c.energy_error,
        unit: model.unit().name(),
        tolerance: c.tolerance,
        consistent: c.consistent,
        probability_consistent: None,
        temperature_k: c.temperature.k(),
    }
}

/// "predicted 12:1, observed 4:1 → the deciding ΔΔG‡ is off by 0.65 kcal/mol;
/// tolerance 1.0 → consistent".
fn describe(path: &Path, model: &Model, c: &Comparison) -> String {
    let o = &model.observations()[c.index];
    let unit = model.unit();
    let e = |v: f64| format::energy(v, unit.display_decimals() + 1, false);
    let show = |v: f64| match o.kind {
        ObservedKind::Ratio => {
            if v >= 1.0 {
                format!("{}:1", format::scientific(v))
            } else {
                format!("1:{}", format::scientific(1.0 / v))
            }
        }
        ObservedKind::Ee => format!("{v:.1} % ee"),
        ObservedKind::Rate | ObservedKind::Tof => format!("{} s⁻¹", format::scientific(v)),
        ObservedKind::HalfLife => format::duration(v),
        ObservedKind::Kie => format!("KIE {v:.2}"),
    };
    let energy = match o.kind {
        ObservedKind::Ratio | ObservedKind::Ee => "the deciding ΔΔG‡",
        ObservedKind::Kie => "the isotopic ΔΔG‡",
        ObservedKind::Tof => "the energetic span",
        _ => "the barrier",
    };
    let label = o.name.as_deref().unwrap_or(&c.quantity);
    let verdict = if c.consistent {
        "consistent"
    } else {
        "INCONSISTENT"
    };
    let error = if c.energy_error.is_finite() {
        let direction = if c.energy_error > 0.0 {
            "too high"
        } else {
            "too low"
        };
        format!(
            "{energy} is off by {} {unit} (predicted {direction})",
            e(c.energy_error.abs())
        )
    } else {
        "the prediction does not form it at all".to_string()
    };
    let within = match o.uncertainty {
        Some(_) if c.energy_error.is_finite() => {
            format!(
                ", {} within the measurement's uncertainty",
                e(c.closest_error)
            )
        }
        _ => String::new(),
    };
    format!(
        "{}: {label} at {:.2} K: predicted {}, observed {} → {error}{within}; tolerance {} → {verdict}\n",
        path.display(),
        c.temperature.k(),
        show(c.predicted),
        show(c.observed),
        e(c.tolerance),
    )
}
