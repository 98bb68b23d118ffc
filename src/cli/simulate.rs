//! `eyrie simulate`: integrates the mass-action kinetics of a profile and
//! prints the outcome (table or JSON) and writes the time course (CSV).

use super::error::CliError;
use super::files;
use eyrie::format;
use eyrie::model::Model;
use eyrie::simulate::{self, Initial, Options, Simulation, Stopped, Until};
use std::io::IsTerminal;
use std::path::{Path, PathBuf};

/// Model predictions and thermal safety: printed with every run.
pub const CAUTION: &str = "Caution: these are model predictions from computed energies; they do not \
replace experimental thermal-safety assessment (heat release, runaway) before scale-up.";

/// Options of `eyrie simulate`.
#[derive(Debug, clap::Args)]
pub struct SimulateArgs {
    /// The profile file (TOML; see docs/profile-format.md).
    pub profile: PathBuf,
    /// When to stop: a time ("2 h", "30 min", "1e4 s") or a conversion of the
    /// starting material ("99%"). Default: 99 % conversion or equilibrium
    /// (for a catalytic cycle: its steady state), whichever comes first.
    #[arg(long, value_name = "RULE")]
    pub until: Option<String>,
    /// Initial concentrations in mol/L, e.g. "sub=1,cat=0.01"; states not named
    /// start empty. Default: 1 mol/L of the reference state (zero, else start).
    #[arg(long, value_name = "ID=CONC,...", conflicts_with = "boltzmann")]
    pub initial: Option<String>,
    /// Start with 1 mol/L spread over these states (conformers) by their
    /// Boltzmann weights, e.g. "rot-e,rot-z".
    #[arg(long, value_name = "ID,ID,...")]
    pub boltzmann: Option<String>,
    /// Print machine-readable JSON (time_s, final, products, …; docs/simulation.md).
    #[arg(long)]
    pub json: bool,
    /// Degrees of rate and selectivity control for a profile without a
    /// catalytic cycle too (r = d[P]/dt at 50 % conversion); a cycle always
    /// gets its degrees of rate control, at steady state.
    #[arg(long)]
    pub rate_control: bool,
    /// Write the time course as CSV (time in s, then one column per state) to
    /// FILE, or alone on stdout when no FILE is given.
    #[arg(long, value_name = "FILE", num_args = 0..=1, default_missing_value = "-")]
    pub csv: Option<PathBuf>,
    /// With --plot: time on a log10 axis (in s, from the first sample after t = 0).
    #[arg(long, requires = "plot")]
    pub log_time: bool,
    // --plot: concentration (mol/L) against time of every state that ever
    // exceeds 1e-3 of the total (cli/plot.rs).
    #[command(flatten)]
    pub plot: super::plot::PlotArgs,
    #[command(flatten)]
    pub conditions: super::Conditions,
}

/// Runs the simulation and writes what was asked for.
pub fn run(args: &SimulateArgs) -> Result<(), CliError> {
    let usage = |e: simulate::SimulateError| CliError::Usage(e.to_string());
    let until = match &args.until {
        Some(text) => Until::parse(text).map_err(usage)?,
        None => Until::Default,
    };
    let initial = match (&args.initial, &args.boltzmann) {
        (Some(text), _) => Initial::parse_given(text).map_err(usage)?,
        (None, Some(ids)) => Initial::Boltzmann(
            ids.split(',')
                .map(|s| s.trim().to_string())
                .filter(|s| !s.is_empty())
                .collect(),
            1.0,
        ),
        (None, None) => Initial::Reference,
    };
    let plot = args.plot.resolve()?;
    let (parsed, warnings) = files::load(&args.profile)?;
    eprint!("{warnings}");
    let model = args.conditions.apply(parsed.model);
    let options = Options {
        until,
        initial,
        ..Options::default()
    };
    let sim =
        with_progress(|progress| simulate::simulate(&model, &options, progress)).map_err(usage)?;
    if let Some(target) = &plot {
        target.write(&eyrie::charts::concentrations(&model, &sim, args.log_time))?;
    }
    let controls = Controls::new(&model, &options, &sim, args.rate_control);
    let csv_to_stdout = args.csv.as_deref() == Some(Path::new("-"));
    if let Some(path) = args.csv.as_deref().filter(|_| !csv_to_stdout) {
        files::write_atomic(path, csv(&model, &sim).as_bytes())?;
    }
    if csv_to_stdout {
        print!("{}", csv(&model, &sim));
    } else if args.json {
        let report = eyrie::simulate::report::SimulationReport::new(&model, &sim);
        let report = match &controls.rate {
            Some(rc) => report.with_rate_control(&model, rc),
            None => report,
        }
        .with_selectivity_control(&model, &controls.selectivity);
        println!(
            "{}",
            serde_json::to_string_pretty(&report).expect("plain data")
        );
        eprintln!("{CAUTION}");
    } else {
        print!("{}", table(&model, &sim, &controls));
    }
    Ok(())
}

/// The degrees of control due: always for a closed cycle, otherwise when asked.
struct Controls {
    rate: Option<Result<simulate::RateControl, simulate::SimulateError>>,
    selectivity: Option<simulate::SelectivityControl>,
}

impl Controls {
    fn new(model: &Model, options: &Options, sim: &Simulation, asked: bool) -> Controls {
        let cycle = !sim.network.cycles.is_empty();
        let selectivity =
            match (asked && !cycle).then(|| simulate::selectivity_control(model, options)) {
                Some(Ok(sc)) => sc,
                Some(Err(e)) => {
                    eprintln!("note: no degree of selectivity control: {e}");
                    None
                }
                None => None,
            };
        Controls {
            rate: (cycle || asked).then(|| simulate::rate_control(model, options)),
            selectivity,
        }
    }
}

/// Degrees of control with |X| ≥ 0.01, largest first, one per line.
fn control_block(model: &Model, controls: &Controls) -> String {
    let list = |degrees: &[(simulate::control::Target, f64)]| {
        let mut shown: Vec<(String, f64)> = degrees
            .iter()
            .filter(|d| d.1.abs() >= 0.01)
            .map(|(t, x)| (t.name(model), *x))
            .collect();
        shown.sort_by(|a, b| b.1.abs().total_cmp(&a.1.abs()).then(a.0.cmp(&b.0)));
        let width = shown.iter().map(|s| s.0.chars().count()).max().unwrap_or(0);
        shown
            .iter()
            .map(|(id, x)| format!("  {id:<width$}  {x:+.2}\n"))
            .collect::<String>()
    };
    let mut out = String::new();
    match &controls.rate {
        Some(Ok(rc)) => {
            let r = match rc.rate {
                simulate::control::Rate::Turnover => "steady-state turnover",
                simulate::control::Rate::ProductFormation => "d[P]/dt at 50 % conversion",
            };
            out.push_str(&format!(
                "\nDegree of rate control (X = ∂ln r/∂(−G/RT), r = {r}), |X| ≥ 0.01:\n"
            ));
            out.push_str(&list(&rc.degrees));
            let holds = if rc.sum_rule_holds() {
                "the sum rules hold"
            } else {
                "the sum rules do NOT hold: treat these values with care"
            };
            out.push_str(&format!(
                "  sum over TSs {:.3}, over states {:.3} ({holds})\n",
                rc.sum_ts, rc.sum_states
            ));
        }
        Some(Err(e)) => out.push_str(&format!("\n{e}\n")),
        None => {}
    }
    if let Some(sc) = &controls.selectivity {
        out.push_str(&format!(
            "\nDegree of selectivity control toward {} ({:.1} %), |X| ≥ 0.01:\n",
            model.point(sc.product).id,
            sc.selectivity * 100.0
        ));
        out.push_str(&list(&sc.degrees));
    }
    out
}

/// Runs `f` with a progress callback that draws a bar on stderr, only when
/// stderr is a terminal and the run has lasted more than half a second.
fn with_progress<T>(f: impl FnOnce(&mut dyn FnMut(f64, Option<f64>)) -> T) -> T {
    let terminal = std::io::stderr().is_terminal();
    let started = std::time::Instant::now();
    let mut bar: Option<indicatif::ProgressBar> = None;
    let mut progress = |t: f64, conversion: Option<f64>| {
        if !terminal || started.elapsed().as_millis() < 500 {
            return;
        }
        let b = bar.get_or_insert_with(|| {
            let b = indicatif::ProgressBar::new(1000);
            b.set_style(
                indicatif::ProgressStyle::with_template("simulating {bar:30} {msg}")
                    .expect("valid template"),
            );
            b
        });
        if let Some(c) = conversion {
            b.set_position((c.clamp(0.0, 1.0) * 1000.0) as u64);
        }
        b.set_message(format!("t = {}", format::duration(t)));
    };
    let out = f(&mut progress);
    if let Some(b) = bar {
        b.finish_and_clear();
    }
    out
}

/// The time course: time in s, then one column per state id, then one per
/// co-reactant consumed by a step (free concentration).
fn csv(model: &Model, sim: &Simulation) -> String {
    let ids: Vec<&str> = sim
        .network
        .species
        .iter()
        .map(|s| model.point(s.point).id.as_str())
        .chain(sim.network.coreactants.iter().map(|c| c.name.as_str()))
        .collect();
    let mut out = format!("time_s,{}\n", ids.join(","));
    for s in &sim.samples {
        out.push_str(&format!("{:e}", s.t));
        for v in &s.x {
            out.push_str(&format!(",{:e}", v));
        }
        out.push('\n');
    }
    out
}

/// The human-readable summary.
fn table(model: &Model, sim: &Simulation, controls: &Controls) -> String {
    let mut out = String::new();
    if let Some(title) = model.title() {
        out.push_str(&format!("{title}\n"));
    }
    let order = if sim.network.coreactants.is_empty() {
        "every step first order"
    } else {
        "steps that consume a co-reactant second order, k2·[A]·[W], the rest first order"
    };
    out.push_str(&format!(
        "T = {}; {order}, both directions (Eyring, as in analyze)\n",
        model.temperature()
    ));
    let why = match sim.stopped {
        Stopped::Conversion => "conversion reached",
        Stopped::Equilibrium => "equilibrium (or the cycle's steady state) reached",
        Stopped::Time => "the requested time",
        Stopped::TimeLimit => "time limit, neither conversion nor equilibrium reached",
    };
    out.push_str(&format!(
        "stopped at t = {} ({why})\n",
        format::duration(sim.time_s())
    ));
    if let Some(c) = sim.conversion {
        let times: Vec<String> = sim
            .milestones
            .iter()
            .map(|(m, t)| {
                let t = t.map_or("not reached".to_string(), format::duration);
                format!("{:.0} % {t}", m * 100.0)
            })
            .collect();
        out.push_str(&format!(
            "conversion {:.2} %; time to {}\n",
            c * 100.0,
            times.join(", ")
        ));
    }
    out.push_str("\nfinal concentrations (mol/L)\n");
    let width = sim
        .network
        .species
        .iter()
        .map(|s| model.point(s.point).id.chars().count())
        .max()
        .unwrap_or(0);
    for (s, v) in sim.network.species.iter().zip(&sim.last().x) {
        let note = if s.counter {
            "  (product released)"
        } else {
            ""
        };
        out.push_str(&format!(
            "  {:<width$}  {}{note}\n",
            model.point(s.point).id,
            format::scientific(shown(*v))
        ));
    }
    for (c, v) in sim
        .network
        .coreactants
        .iter()
        .zip(&sim.last().x[sim.network.len()..])
    {
        out.push_str(&format!(
            "  {:<width$}  {}  (free co-reactant)\n",
            c.name,
            format::scientific(shown(*v))
        ));
    }
    if sim.products.iter().any(|p| p.1 > 0.0) {
        let list: Vec<String> = sim
            .products
            .iter()
            .map(|(p, _, f)| format!("{} {:.1} %", model.point(*p).id, f * 100.0))
            .collect();
        out.push_str(&format!("\nproducts: {}\n", list.join(", ")));
        if sim.products.len() > 1 {
            if sim.ratio_drift > DRIFT_SHOWN {
                out.push_str(&format!(
                    "the product ratio drifts in time: fractions changed by up to {:.1} points \
                     after 5 % of the product had formed (reversible or interconverting products)\n",
                    sim.ratio_drift * 100.0
                ));
            } else {
                out.push_str("the product ratio is constant in time\n");
            }
        }
    }
    for (p, tof) in &sim.turnover {
        out.push_str(&format!(
            "cycle ending at {}: TOF {} s⁻¹ at steady state\n",
            model.point(*p).id,
            format::scientific(*tof)
        ));
    }
    let block = control_block(model, controls);
    if !block.is_empty() {
        out.push_str(&block);
        out.push('\n');
    }
    out.push_str(&format!(
        "mass balance {:.0e} (relative)\n\n{CAUTION}\n",
        sim.mass_error
    ));
    out
}

/// Drift of product fractions below this (0.1 points) counts as constant.
pub const DRIFT_SHOWN: f64 = 1e-3;

/// Values below the integrator's absolute tolerance are shown as 0.
fn shown(v: f64) -> f64 {
    if v.abs() < 1e-14 { 0.0 } else { v }
}
