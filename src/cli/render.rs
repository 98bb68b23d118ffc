//! `eyrie render`: the reaction-coordinate diagram of a profile.

use super::error::CliError;
use super::files;
use std::path::{Path, PathBuf};

/// Renders `path` to `output` (default: the input's stem with `.svg`, in the
/// current folder).
pub fn run(
    path: &Path,
    output: Option<PathBuf>,
    conditions: &super::Conditions,
) -> Result<(), CliError> {
    let output = output.unwrap_or_else(|| default_output(path));
    let extension = output
        .extension()
        .map(|e| e.to_string_lossy().to_ascii_lowercase())
        .unwrap_or_default();
    if extension != "svg" {
        return Err(CliError::Usage(format!(
            "cannot write '{}': only SVG output is available in this version (name the output *.svg)",
            output.display()
        )));
    }
    let (parsed, warnings) = files::load(path)?;
    eprint!("{warnings}");
    let model = conditions.apply(parsed.model);
    let spec = eyrie::figure::diagram_spec(&model);
    let scene = eyrie::layout::layout(&spec, &eyrie::layout::Style::default());
    let svg = eyrie::render::to_svg(&scene);
    files::write_atomic(&output, svg.as_bytes())?;
    eprintln!("wrote {}", output.display());
    Ok(())
}

fn default_output(input: &Path) -> PathBuf {
    let stem = input
        .file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_else(|| "figure".into());
    PathBuf::from(format!("{stem}.svg"))
}
