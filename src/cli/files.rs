//! Reading profiles and writing outputs. Outputs are written atomically
//! (a temporary file in the same folder, then a rename), so a build script
//! interrupted mid-run never finds a half-written figure.

use super::error::CliError;
use eyrie::diag::Source;
use eyrie::profile::{self, Parsed};
use std::io::Write;
use std::path::Path;

/// Reads and validates a profile; warnings are returned rendered, for the caller to print.
pub fn load(path: &Path) -> Result<(Parsed, String), CliError> {
    let bytes = std::fs::read(path).map_err(|source| CliError::Io {
        action: "read",
        path: path.to_path_buf(),
        source,
    })?;
    let text = String::from_utf8(bytes).map_err(|e| {
        CliError::Usage(format!(
            "{}: the file is not UTF-8 text (invalid byte at offset {}); save it as UTF-8",
            path.display(),
            e.utf8_error().valid_up_to()
        ))
    })?;
    let source = Source {
        name: path.display().to_string(),
        text,
    };
    match profile::parse(&source.text) {
        Ok(parsed) => {
            let warnings = source.render(&parsed.warnings);
            Ok((parsed, warnings))
        }
        Err(diagnostics) => Err(CliError::Invalid {
            rendered: source.render(&diagnostics),
        }),
    }
}

/// Writes `bytes` to `path` atomically: a sibling temporary file, flushed to
/// disk, then renamed over the target. On failure the temporary file is removed
/// and the target is left as it was.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> Result<(), CliError> {
    let io_error = |source| CliError::Io {
        action: "write",
        path: path.to_path_buf(),
        source,
    };
    let dir = match path.parent() {
        Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
        _ => std::path::PathBuf::from("."),
    };
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| "output".into());
    let temp = dir.join(format!(".{name}.{}.tmp", std::process::id()));
    let result = (|| {
        let mut file = std::fs::File::create(&temp)?;
        file.write_all(bytes)?;
        file.sync_all()?;
        std::fs::rename(&temp, path)
    })();
    if let Err(e) = result {
        let _ = std::fs::remove_file(&temp);
        return Err(io_error(e));
    }
    Ok(())
}

/// The profiles named on the command line: files as given, folders replaced by
/// the `*.toml` files directly inside them, in name order (so runs are
/// reproducible).
pub fn expand(inputs: &[std::path::PathBuf]) -> Result<Vec<std::path::PathBuf>, CliError> {
    let mut out = Vec::new();
    for input in inputs {
        if input.is_dir() {
            let entries = std::fs::read_dir(input).map_err(|source| CliError::Io {
                action: "read",
                path: input.clone(),
                source,
            })?;
            let mut found: Vec<_> = entries
                .filter_map(|e| e.ok().map(|e| e.path()))
                .filter(|p| p.is_file() && p.extension().is_some_and(|e| e == "toml"))
                .collect();
            found.sort();
            out.extend(found);
        } else {
            out.push(input.clone());
        }
    }
    Ok(out)
}
