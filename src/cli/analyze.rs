//! `eyrie analyze`: rate constants of every step and the apparent barrier of
//! every path, as a table or as JSON.

use super::error::CliError;
use super::files;
use eyrie::format;
use eyrie::kinetics;
use eyrie::report::AnalysisReport;
use eyrie::units::Temperature;
use std::path::Path;

/// Runs the analysis and prints it.
pub fn run(
    inputs: &[std::path::PathBuf],
    conditions: &super::Conditions,
    monte_carlo: &super::uncertainty::McArgs,
    json: bool,
) -> Result<(), CliError> {
    let paths = files::expand(inputs)?;
    if let [path] = &paths[..]
        && !inputs[0].is_dir()
    {
        let report = analyze_file(path, conditions, monte_carlo)?;
        if json {
            let text = serde_json::to_string_pretty(&report).expect("report is plain data");
            println!("{text}");
        } else {
            print!("{}", table(&report, report_decimals(&report)));
        }
        return Ok(());
    }
    // Several profiles: each is analysed on its own; a bad one is reported by
    // name, the rest still run, and the exit code is the worst seen.
    let mut worst = super::error::Exit::Success;
    let mut reports = Vec::new();
    for path in &paths {
        match analyze_file(path, conditions, monte_carlo) {
            Ok(report) => {
                if !json {
                    println!("== {} ==", path.display());
                    println!("{}", table(&report, report_decimals(&report)));
                }
                reports.push(
                    serde_json::json!({ "file": path.display().to_string(), "report": report }),
                );
            }
            Err(e) => {
                e.report();
                worst = worst.max(e.exit());
            }
        }
    }
    if json {
        let text = serde_json::to_string_pretty(&reports).expect("report is plain data");
        println!("{text}");
    }
    eprintln!("analysed {} of {} profile(s)", reports.len(), paths.len());
    match worst {
        super::error::Exit::Success => Ok(()),
        code => Err(CliError::Finished(code)),
    }
}

fn report_decimals(r: &AnalysisReport) -> usize {
    eyrie::units::EnergyUnit::parse(r.unit).map_or(1, |u| u.display_decimals())
}

fn analyze_file(
    path: &Path,
    conditions: &super::Conditions,
    monte_carlo: &super::uncertainty::McArgs,
) -> Result<AnalysisReport, CliError> {
    let (parsed, warnings) = files::load(path)?;
    eprint!("{warnings}");
    let model = conditions.apply(parsed.model);
    let analysis = kinetics::analyze(&model);
    let mut report = AnalysisReport::new(&model, &analysis).with_simulation_check(&model);
    report.uncertainty = super::uncertainty::run(&model, monte_carlo)
        .map(|mc| eyrie::report::UncertaintyReport::new(&model, &mc));
    Ok(report)
}

/// The human-readable report.
fn table(r: &AnalysisReport, decimals: usize) -> String {
    let e = |v: f64| format::energy(v, decimals, false);
    let mut out = String::new();
    if let Some(title) = &r.title {
        out.push_str(&format!("{title}\n"));
    }
    let t = Temperature::kelvin(r.temperature_k).expect("validated temperature");
    let reference = match &r.zero {
        Some(z) => format!("relative to {z}"),
        None => "as written".to_string(),
    };
    let any_kappa = r.steps.iter().any(|s| s.kappa != 1.0);
    let kappa = match (r.tunnelling, any_kappa) {
        ("none", false) => "κ = 1".to_string(),
        ("none", true) => "κ as given per TS".to_string(),
        (name, _) => format!("κ with {name} tunnelling"),
    };
    out.push_str(&format!(
        "T = {t}; energies in {} {reference}; Eyring, {kappa}\n",
        r.unit
    ));
    if let Some(p) = r.standard_state {
        out.push_str(&format!(
            "energies converted from the {p} to the 1 mol/L standard state (per species)\n"
        ));
    }
    if !r.coreactants.is_empty() {
        let list: Vec<String> = r
            .coreactants
            .iter()
            .map(|(n, c)| format!("{n} {} mol/L", format::scientific(*c)))
            .collect();
        out.push_str(&format!(
            "free co-reactants at {} folded into the energies (pseudo-first order)\n",
            list.join(", ")
        ));
    }
    out.push('\n');

    let names: Vec<String> = r
        .steps
        .iter()
        .map(|s| match &s.ts {
            Some(ts) => format!("{} → {} via {ts}", s.from, s.to),
            None => format!("{} → {} (no barrier)", s.from, s.to),
        })
        .collect();
    let width = names
        .iter()
        .map(|n| n.chars().count())
        .max()
        .unwrap_or(4)
        .max(4);
    out.push_str(&format!(
        "{:<width$}  {:>8}  {:>8}  {:>10}  {:>10}  {:>10}  {:>10}\n",
        "step", "ΔG‡ fwd", "ΔG‡ rev", "k fwd/s⁻¹", "k rev/s⁻¹", "t½ fwd", "t½ rev"
    ));
    let notes: Vec<&String> = r
        .steps
        .iter()
        .filter_map(|s| s.kappa_note.as_ref())
        .collect();
    for (name, s) in names.iter().zip(&r.steps) {
        out.push_str(&format!(
            "{:<width$}  {:>8}  {:>8}  {:>10}  {:>10}  {:>10}  {:>10}\n",
            name,
            e(s.barrier_forward),
            e(s.barrier_reverse),
            format::scientific(s.k_forward),
            format::scientific(s.k_reverse),
            format::duration(s.half_life_forward_s),
            format::duration(s.half_life_reverse_s),
        ));
    }
    if any_kappa {
        for (name, s) in names.iter().zip(&r.steps) {
            if s.kappa != 1.0 {
                out.push_str(&format!("  κ({name}) = {:.3}\n", s.kappa));
            }
        }
    }
    for n in notes {
        out.push_str(&format!("  note: {n}\n"));
    }

    out.push('\n');
    let width = r
        .paths
        .iter()
        .map(|p| p.name.chars().count())
        .max()
        .unwrap_or(4)
        .max(4);
    out.push_str(&format!(
        "{:<width$}  {:>8}  {:<30}  {:>10}  {:>10}\n",
        "path", "barrier", "set by", "k/s⁻¹", "t½"
    ));
    for p in &r.paths {
        let set_by = match &p.determining_ts {
            Some(ts) => format!("{} → {ts}", p.determining_state),
            None => format!("{} (no TS on path)", p.determining_state),
        };
        out.push_str(&format!(
            "{:<width$}  {:>8}  {:<30}  {:>10}  {:>10}\n",
            p.name,
            e(p.apparent_barrier),
            set_by,
            format::scientific(p.k_apparent),
            format::duration(p.half_life_s),
        ));
    }
    for c in &r.cycles {
        out.push('\n');
        out.push_str(&format!(
            "cycle {}: ΔGr = {} {}, TOF = {} s⁻¹ (energetic span model)\n",
            c.name,
            e(c.dgr),
            r.unit,
            format::scientific(c.tof)
        ));
        match (&c.tdi, &c.tdts, c.span) {
            (Some(tdi), Some(tdts), Some(span)) => {
                let order = if c.tdts_before_tdi == Some(true) {
                    " (TDTS before TDI: δE includes ΔGr)"
                } else {
                    ""
                };
                out.push_str(&format!(
                    "  TDI {tdi}, TDTS {tdts}: δE = {} {}{order}\n",
                    e(span),
                    r.unit
                ));
            }
            _ => out
                .push_str("  ΔGr > 0: at standard-state concentrations the cycle runs backwards\n"),
        }
        let mut control: Vec<(&String, &f64)> = c.tof_control.iter().collect();
        control.sort_by(|a, b| b.1.total_cmp(a.1).then(a.0.cmp(b.0)));
        let shown: Vec<String> = control
            .iter()
            .filter(|(_, x)| **x >= 0.01)
            .map(|(id, x)| format!("{id} {:.2}", x))
            .collect();
        out.push_str(&format!(
            "  degree of TOF control (≥ 0.01): {}\n",
            shown.join(", ")
        ));
    }
    for v in &r.variants {
        out.push('\n');
        out.push_str(&format!("variant {}:\n", v.name));
        for p in &v.paths {
            out.push_str(&format!(
                "  {}: barrier {} {}, k {} s⁻¹, k(profile)/k({}) = {}\n",
                p.name,
                e(p.apparent_barrier),
                r.unit,
                format::scientific(p.k_apparent),
                v.name,
                format::scientific(p.kie)
            ));
        }
        if let Some(products) = &v.products {
            let shares: Vec<String> = products
                .iter()
                .map(|(id, f)| format!("{id} {:.1} %", 100.0 * f))
                .collect();
            out.push_str(&format!("  products: {}\n", shares.join(", ")));
        }
        for c in &v.cycles {
            out.push_str(&format!(
                "  TOF({}) = {} s⁻¹\n",
                c.name,
                format::scientific(c.tof)
            ));
        }
    }
    if let Some(u) = &r.uncertainty {
        let pct = 100.0 * u.level;
        out.push('\n');
        out.push_str(&format!(
            "uncertainty: {pct:.0} % intervals from {} Monte Carlo samples (seed {})\n",
            u.samples, u.seed
        ));
        let iv = |i: &eyrie::report::IntervalReport, f: &dyn Fn(f64) -> String| {
            format!("{} [{} – {}]", f(i.median), f(i.low), f(i.high))
        };
        for p in &u.paths {
            out.push_str(&format!(
                "  {}: barrier {} {}, k {} s⁻¹\n",
                p.name,
                iv(&p.barrier, &|v| e(v)),
                r.unit,
                iv(&p.k, &|v| format::scientific(v))
            ));
        }
        if let Some(ratio) = &u.ratio {
            out.push_str(&format!(
                "  {}:{} = {}\n",
                ratio.major,
                ratio.minor,
                iv(&ratio.interval, &|v| format::scientific(v))
            ));
        }
        for c in &u.cycles {
            out.push_str(&format!(
                "  TOF({}) = {} s⁻¹\n",
                c.name,
                iv(&c.tof, &|v| format::scientific(v))
            ));
        }
    }
    if let Some(sel) = &r.selectivity {
        out.push('\n');
        out.push_str(&format!(
            "selectivity from {}: {}\n",
            sel.start.join(" + "),
            sel.regime
        ));
        let mut products: Vec<(&String, &f64)> = sel.products.iter().collect();
        products.sort_by(|a, b| b.1.total_cmp(a.1));
        // A long tail of minor products is summarised, not listed.
        const SHOWN: usize = 6;
        let mut shares: Vec<String> = products
            .iter()
            .take(SHOWN)
            .map(|(id, f)| format!("{id} {:.1} %", *f * 100.0))
            .collect();
        if products.len() > SHOWN {
            let rest: f64 = products[SHOWN..].iter().map(|(_, f)| **f).sum();
            shares.push(format!(
                "{} more together {:.1} % (all in --json)",
                products.len() - SHOWN,
                rest * 100.0
            ));
        }
        out.push_str(&format!("  products: {}\n", shares.join(", ")));
        let what = if sel.regime == "intermediate" {
            "effective ΔΔG‡ (RT·ln of the ratio)"
        } else {
            "deciding ΔΔG‡"
        };
        out.push_str(&format!("  {what}: {} {}\n", e(sel.ddg), r.unit));
        out.push_str(&format!("  why: {}\n", sel.reason));
        out.push_str(&simulated_lines(sel, &e, r.unit));
    }
    out
}

/// What the simulation says about the closed-form fractions, in words.
fn simulated_lines(
    sel: &eyrie::report::SelectivityReport,
    e: &dyn Fn(f64) -> String,
    unit: &str,
) -> String {
    let (Some(sim), Some(stopped), Some(agrees), Some(error)) = (
        &sel.simulated,
        sel.simulation_stopped,
        sel.limit_agrees,
        sel.limit_error,
    ) else {
        return sel
            .simulation_note
            .as_ref()
            .map_or(String::new(), |n| format!("  simulation: {n}\n"));
    };
    let mut shares: Vec<(&String, &f64)> = sim.iter().collect();
    shares.sort_by(|a, b| b.1.total_cmp(a.1).then(a.0.cmp(b.0)));
    let list: Vec<String> = shares
        .iter()
        .take(6)
        .map(|(id, f)| format!("{id} {:.1} %", *f * 100.0))
        .collect();
    let until = match stopped {
        eyrie::simulate::Stopped::Equilibrium => "to equilibrium, products forming reversibly",
        eyrie::simulate::Stopped::TimeLimit => {
            "until 1e15 s without using up the starting material; product formed so far"
        }
        _ => "to 99.99 % conversion",
    };
    let closed = match sel.regime {
        "curtin-hammett" => "the Curtin–Hammett limit",
        "kinetic-quench" => "the kinetic-quench limit",
        _ => "the partition with irreversible product formation",
    };
    let verdict = if agrees {
        format!(
            "{closed} agrees (product ratios within {} {unit})",
            e(sel.limit_margin)
        )
    } else {
        format!(
            "{closed} is off: a product ratio differs by a factor worth {} {unit} of ΔΔG‡ \
             (more than {} {unit}); use the simulated fractions",
            e(error),
            e(sel.limit_margin)
        )
    };
    format!(
        "  simulated (every step both ways, {until}): {}\n  {verdict}\n",
        list.join(", ")
    )
}
