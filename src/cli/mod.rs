//! Command-line interface: argument definitions, dispatch to one module per
//! command, and the single place where errors are printed and turned into
//! exit codes.

mod analyze;
mod check;
mod convert;
mod error;
mod export;
mod files;
mod plot;
mod render;
mod simulate;
mod sweep;
mod uncertainty;
mod watch;

use clap::{Parser, Subcommand};
use error::{CliError, Exit};
use eyrie::units::{EnergyUnit, Temperature};
use std::path::PathBuf;
use std::process::ExitCode;

const SHORT_USAGE: &str = "\
eyrie — kinetics and reaction-coordinate diagrams from a profile file

  eyrie analyze PROFILE.toml          rate constants, half-lives, rate-limiting states
  eyrie render PROFILE.toml -o fig.pdf   the energy diagram (.svg, .png or .pdf)
  eyrie watch PROFILE.toml -o fig.svg    redraw it on every save of the profile
  eyrie convert 95:5                  ratio ↔ ee ↔ ΔΔG‡ at 25 °C

More: eyrie --help, eyrie help analyze, docs/profile-format.md";

/// Kinetics and reaction-coordinate diagrams from a declarative profile of
/// free energies.
#[derive(Debug, Parser)]
#[command(name = "eyrie", version, about, long_about = None)]
#[command(
    after_help = "Exit codes: 0 success; 1 a check disagreed with a measurement; \
2 invalid input file or usage; 3 a file could not be read or written."
)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Debug, Subcommand)]
enum Command {
    /// Eyring rate constants and half-lives of every step in both directions,
    /// and the apparent barrier of every path with the states that set it.
    Analyze {
        /// The profile file (TOML; see docs/profile-format.md), or several files or
        /// folders of *.toml profiles (then JSON is a list of {file, report}).
        #[arg(required = true)]
        profiles: Vec<PathBuf>,
        /// Print machine-readable JSON instead of the table (fields in docs/json.md).
        #[arg(long)]
        json: bool,
        #[command(flatten)]
        conditions: Conditions,
        #[command(flatten)]
        monte_carlo: uncertainty::McArgs,
    },
    /// Draw the reaction-coordinate (free-energy) diagram of a profile as SVG,
    /// PNG or PDF, at a journal's column width.
    Render {
        /// The profile file (TOML; see docs/profile-format.md). Several files or
        /// folders render in one run: -o then names the output folder and each
        /// figure takes its profile's name, in the --format format.
        #[arg(required = true)]
        profiles: Vec<PathBuf>,
        /// With several profiles: skip those whose figure is newer than the profile
        /// (as make does; options are not compared).
        #[arg(long)]
        skip_unchanged: bool,
        #[command(flatten)]
        figure: render::FigureOptions,
        #[command(flatten)]
        conditions: Conditions,
    },
    /// Redraw the diagram every time the profile is saved, and print each path's
    /// apparent barrier; keep it running beside your editor. While the file has a
    /// mistake, the error is shown and the last good figure stays. Ctrl-C stops it.
    Watch {
        /// The profile file (TOML; see docs/profile-format.md).
        profile: PathBuf,
        #[command(flatten)]
        figure: render::FigureOptions,
        #[command(flatten)]
        conditions: Conditions,
    },
    /// Product distribution across a temperature range, and the isoselective
    /// temperature where the two main products form equally fast. Energies given
    /// as h and s change with temperature; g values do not. --plot draws the
    /// product shares (%) against temperature (°C) with the isoselective
    /// temperature marked.
    Sweep {
        /// The profile file (TOML; see docs/profile-format.md).
        profile: PathBuf,
        /// Lowest temperature: "-78 C", "195.15 K", or a number in kelvin.
        #[arg(long, value_name = "T", allow_hyphen_values = true,
              value_parser = parse_temperature)]
        from: Temperature,
        /// Highest temperature, in the same forms.
        #[arg(long, value_name = "T", allow_hyphen_values = true,
              value_parser = parse_temperature)]
        to: Temperature,
        /// Number of temperatures in the table, ends included.
        #[arg(long, default_value_t = 9)]
        steps: usize,
        /// Print machine-readable JSON (rows[] with temperature_k, regime, products;
        /// isoselective[] with products and temperature_k).
        #[arg(long)]
        json: bool,
        #[command(flatten)]
        plot: plot::PlotArgs,
    },
    /// Compare the measurements stated in profiles ([[observed]]: ratios, ee,
    /// rates, half-lives, TOFs) with what the barriers predict. Exits 1 when any
    /// disagrees beyond its tolerance, 0 when all agree; takes files or folders.
    Check {
        /// Profile files, or folders of *.toml profiles.
        #[arg(required = true)]
        profiles: Vec<PathBuf>,
        /// Print machine-readable JSON: one entry per observation (file, kind,
        /// predicted, observed, energy_error, consistent, …).
        #[arg(long)]
        json: bool,
    },
    /// Integrate the mass-action kinetics of the profile in time (every step
    /// both ways): final distribution, product ratio, time to 50/90/99 %
    /// conversion, turnover of cycles; the time course as CSV.
    Simulate(simulate::SimulateArgs),
    /// Write the computed numbers (barriers, rate constants, half-lives, ratio,
    /// TOF, intervals) for the manuscript: a LaTeX file defining \eyrie{key}, a
    /// Markdown table, or CSV — the same digits the figure and tables show.
    Export {
        /// The profile file (TOML; see docs/profile-format.md).
        profile: PathBuf,
        /// The file to write: numbers.tex, numbers.md or numbers.csv. Without it the
        /// numbers are printed.
        #[arg(short, long, value_name = "FILE")]
        output: Option<PathBuf>,
        /// tex, md or csv (default: from the output's extension, else md).
        #[arg(long, value_name = "FORMAT")]
        format: Option<String>,
        #[command(flatten)]
        conditions: Conditions,
        #[command(flatten)]
        monte_carlo: uncertainty::McArgs,
    },
    /// Convert a selectivity between its three forms at one temperature: a
    /// product ratio (95:5 or 19), an ee or de (90%ee, 80%de), or a free-energy
    /// difference ΔΔG‡ (1.8 kcal/mol, 7 kJ/mol).
    Convert {
        /// The value to convert, e.g. 95:5, 4, 90%ee, 1.8 kcal/mol.
        #[arg(allow_hyphen_values = true)]
        value: String,
        /// Print machine-readable JSON (ratio, ee_percent, ddg_kcal_mol, ddg_kj_mol,
        /// temperature_k).
        #[arg(long)]
        json: bool,
        /// Temperature of the conversion: "25 C", "-78 C", "298.15 K", or a number
        /// in kelvin. Default 25 °C.
        #[arg(long, short = 'T', value_name = "T", allow_hyphen_values = true,
              value_parser = parse_temperature)]
        temperature: Option<Temperature>,
    },
}

/// Options that change the conditions every number is computed at.
#[derive(Debug, clap::Args)]
pub(crate) struct Conditions {
    /// Reaction temperature, overriding the profile's: "25 C", "-78 C", "298.15 K",
    /// or a number in kelvin.
    #[arg(long, short = 'T', value_name = "T", allow_hyphen_values = true,
          value_parser = parse_temperature)]
    temperature: Option<Temperature>,
    /// Report and draw energies in this unit instead of the profile's: kcal/mol,
    /// kJ/mol, eV or hartree (e.g. absolute hartree inputs shown in kcal/mol).
    #[arg(long, value_name = "UNIT", value_parser = parse_unit)]
    unit: Option<EnergyUnit>,
}

impl Conditions {
    /// Applies the overrides to a freshly loaded model.
    fn apply(&self, mut model: eyrie::model::Model) -> eyrie::model::Model {
        if let Some(t) = self.temperature {
            model = model.with_temperature(t);
        }
        if let Some(u) = self.unit {
            model = model.with_unit(u);
        }
        model
    }
}

fn parse_unit(text: &str) -> Result<EnergyUnit, String> {
    EnergyUnit::parse(text)
        .ok_or_else(|| format!("unknown unit '{text}' (use kcal/mol, kJ/mol, eV or hartree)"))
}

fn parse_temperature(text: &str) -> Result<Temperature, String> {
    Temperature::parse(text).map_err(|e| e.to_string())
}

/// Parses the command line, runs the command, prints any error once, and
/// returns the documented exit code.
pub fn main() -> ExitCode {
    if std::env::args_os().len() <= 1 {
        eprintln!("{SHORT_USAGE}");
        return ExitCode::from(Exit::Invalid as u8);
    }
    let cli = match Cli::try_parse() {
        Ok(cli) => cli,
        Err(e) => {
            // clap prints help and version to stdout (exit 0) and usage errors to stderr (2).
            let _ = e.print();
            return ExitCode::from(if e.use_stderr() {
                Exit::Invalid as u8
            } else {
                0
            });
        }
    };
    match run(cli) {
        Ok(()) => ExitCode::from(Exit::Success as u8),
        Err(e) => {
            e.report();
            ExitCode::from(e.exit() as u8)
        }
    }
}

fn run(cli: Cli) -> Result<(), CliError> {
    match cli.command {
        Command::Analyze {
            profiles,
            json,
            conditions,
            monte_carlo,
        } => analyze::run(&profiles, &conditions, &monte_carlo, json),
        Command::Render {
            profiles,
            skip_unchanged,
            figure,
            conditions,
        } => render::run_all(&profiles, skip_unchanged, &figure, &conditions),
        Command::Watch {
            profile,
            figure,
            conditions,
        } => watch::run(&profile, &figure, &conditions),
        Command::Sweep {
            profile,
            from,
            to,
            steps,
            json,
            plot,
        } => sweep::run(&profile, from, to, steps, json, &plot),
        Command::Check { profiles, json } => match check::run(&profiles, json)? {
            Exit::Success => Ok(()),
            code => Err(CliError::Finished(code)),
        },
        Command::Simulate(args) => simulate::run(&args),
        Command::Export {
            profile,
            output,
            format,
            conditions,
            monte_carlo,
        } => export::run(
            &profile,
            output.as_ref(),
            format.as_deref(),
            &conditions,
            &monte_carlo,
        ),
        Command::Convert {
            value,
            json,
            temperature,
        } => convert::run(&value, temperature, json),
    }
}

#[cfg(test)]
mod tests {
    #[test]
    fn command_definitions_are_consistent() {
        use clap::CommandFactory;
        super::Cli::command().debug_assert();
    }
}
