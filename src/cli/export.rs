//! `eyrie export`: the computed numbers as a LaTeX macro file, a Markdown
//! table or CSV, for the manuscript and its SI.

use super::error::CliError;
use super::files;
use eyrie::export::{csv, latex, markdown, quantities};
use eyrie::kinetics;
use eyrie::report::{AnalysisReport, UncertaintyReport};
use std::path::{Path, PathBuf};

/// Writes the numbers of `path` to `output` (format from its extension:
/// .tex, .md, .csv), or prints them in `format` when there is no output.
pub fn run(
    path: &Path,
    output: Option<&PathBuf>,
    format: Option<&str>,
    conditions: &super::Conditions,
    monte_carlo: &super::uncertainty::McArgs,
) -> Result<(), CliError> {
    let kind = match (output, format) {
        (_, Some(f)) => f.to_ascii_lowercase(),
        (Some(o), None) => o
            .extension()
            .map(|e| e.to_string_lossy().to_ascii_lowercase())
            .unwrap_or_default(),
        (None, None) => "md".into(),
    };
    if !matches!(kind.as_str(), "tex" | "md" | "csv") {
        return Err(CliError::Usage(format!(
            "cannot export as '{kind}': use a .tex, .md or .csv output (or --format tex|md|csv)"
        )));
    }
    let (parsed, warnings) = files::load(path)?;
    eprint!("{warnings}");
    let model = conditions.apply(parsed.model);
    let mut report = AnalysisReport::new(&model, &kinetics::analyze(&model));
    report.uncertainty =
        super::uncertainty::run(&model, monte_carlo).map(|mc| UncertaintyReport::new(&model, &mc));
    let q = quantities(&report, model.unit().display_decimals());
    let text = match kind.as_str() {
        "tex" => latex(&q, &path.display().to_string()),
        "csv" => csv(&q),
        _ => markdown(&q),
    };
    match output {
        Some(o) => {
            files::write_atomic(o, text.as_bytes())?;
            eprintln!("wrote {} ({} numbers)", o.display(), q.len());
        }
        None => print!("{text}"),
    }
    Ok(())
}
