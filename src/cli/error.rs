//! Failures the CLI reports, each with its documented exit code.

use std::path::PathBuf;

/// Documented exit codes (README, "Exit codes").
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub enum Exit {
    /// Everything ran and every check agreed.
    Success = 0,
    /// A check ran and disagreed with an observation.
    Disagreed = 1,
    /// Invalid input file or invalid command-line usage.
    Invalid = 2,
    /// An input could not be read or an output could not be written.
    Io = 3,
}

/// Why a command failed.
#[derive(Debug, thiserror::Error)]
pub enum CliError {
    /// The profile has errors; the text holds the rendered diagnostics.
    #[error("{rendered}")]
    Invalid {
        /// Diagnostics as printed, with file:line:column.
        rendered: String,
    },
    /// The command line asks for something eyrie cannot do.
    #[error("{0}")]
    Usage(String),
    /// The command ran and printed its own report; exit with this code
    /// (e.g. `check` found a disagreement, or a batch met a bad file).
    #[error("")]
    Finished(Exit),
    /// Reading or writing a file failed.
    #[error("cannot {action} '{}': {source}", path.display())]
    Io {
        /// "read" or "write".
        action: &'static str,
        /// The file.
        path: PathBuf,
        /// The operating system's reason.
        source: std::io::Error,
    },
}

impl CliError {
    /// The exit code this failure maps to.
    pub fn exit(&self) -> Exit {
        match self {
            CliError::Invalid { .. } | CliError::Usage(_) => Exit::Invalid,
            CliError::Io { .. } => Exit::Io,
            CliError::Finished(code) => *code,
        }
    }

    /// Prints the error once, in the form users see: rendered diagnostics as
    /// they are, anything else as one `error:` line; nothing for `Finished`.
    pub fn report(&self) {
        match self {
            CliError::Invalid { rendered } => eprint!("{rendered}"),
            CliError::Finished(_) => {}
            other => eprintln!("error: {other}"),
        }
    }
}
