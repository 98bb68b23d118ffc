//! Located problems in a profile file, and their rendering as
//! `file:line:column` messages with the source line underlined.
//!
//! Parsing and validation collect *every* problem as a [`Diagnostic`] instead
//! of stopping at the first, so a chemist fixes a file in one pass.

use std::ops::Range;

/// How bad a problem is: errors stop the run, warnings are printed and the run goes on.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Severity {
    /// Chemically odd but usable input.
    Warning,
    /// Input that cannot be used.
    Error,
}

/// One located problem.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Diagnostic {
    /// Error or warning.
    pub severity: Severity,
    /// Byte range in the source text (empty range = a position).
    pub span: Range<usize>,
    /// What is wrong, in plain words, lower-case start.
    pub message: String,
    /// How to fix it, when there is a useful suggestion.
    pub help: Option<String>,
    /// Other places that explain the problem (e.g. "first defined here"),
    /// drawn as secondary underlines in the same excerpt.
    pub related: Vec<(Range<usize>, String)>,
}

impl Diagnostic {
    /// An error at `span`.
    pub fn error(span: Range<usize>, message: impl Into<String>) -> Diagnostic {
        Diagnostic {
            severity: Severity::Error,
            span,
            message: message.into(),
            help: None,
            related: Vec::new(),
        }
    }

    /// A warning at `span`.
    pub fn warning(span: Range<usize>, message: impl Into<String>) -> Diagnostic {
        Diagnostic {
            severity: Severity::Warning,
            span,
            message: message.into(),
            help: None,
            related: Vec::new(),
        }
    }

    /// Adds a suggestion of how to fix the problem.
    pub fn with_help(mut self, help: impl Into<String>) -> Diagnostic {
        self.help = Some(help.into());
        self
    }

    /// Points at another place that explains the problem, e.g. where a
    /// duplicated id was first defined.
    pub fn with_related(mut self, span: Range<usize>, note: impl Into<String>) -> Diagnostic {
        self.related.push((span, note.into()));
        self
    }

    /// Whether this is an error (as opposed to a warning).
    pub fn is_error(&self) -> bool {
        self.severity == Severity::Error
    }
}

/// A named source text, kept so diagnostics can be shown with their line.
#[derive(Debug, Clone)]
pub struct Source {
    /// The name shown in messages, usually the path as given by the user.
    pub name: String,
    /// The full text.
    pub text: String,
}

impl Source {
    /// 1-based line and column (in characters) of a byte offset.
    pub fn line_column(&self, offset: usize) -> (usize, usize) {
        let offset = offset.min(self.text.len());
        let mut cut = offset;
        while !self.text.is_char_boundary(cut) {
            cut -= 1;
        }
        let before = &self.text[..cut];
        let line = before.matches('\n').count() + 1;
        let line_start = before.rfind('\n').map_or(0, |i| i + 1);
        let column = before[line_start..].chars().count() + 1;
        (line, column)
    }

    /// Renders diagnostics as plain text (no colour, so output is stable in logs and tests):
    /// a `file:line:column: error: message` header, the source line with the span
    /// underlined, and a `help:` line.
    pub fn render(&self, diagnostics: &[Diagnostic]) -> String {
        use codespan_reporting::diagnostic::{Diagnostic as CsDiag, Label};
        use codespan_reporting::files::SimpleFile;
        use codespan_reporting::term::{self, Config, DisplayStyle};

        let file = SimpleFile::new(self.name.as_str(), self.text.as_str());
        let config = Config {
            display_style: DisplayStyle::Rich,
            ..Config::default()
        };
        let mut out = String::new();
        for d in diagnostics {
            let (line, column) = self.line_column(d.span.start);
            // The one-line header puts file:line:column first, the form editors and
            // build tools recognise; codespan then draws the excerpt.
            let word = if d.is_error() { "error" } else { "warning" };
            out.push_str(&format!(
                "{}:{}:{}: {}: {}\n",
                self.name, line, column, word, d.message
            ));
            let span = clamp_span(&self.text, d.span.clone());
            let mut cs = if d.is_error() {
                CsDiag::error()
            } else {
                CsDiag::warning()
            };
            let mut labels = vec![Label::primary((), span)];
            for (related, note) in &d.related {
                labels.push(
                    Label::secondary((), clamp_span(&self.text, related.clone()))
                        .with_message(note.as_str()),
                );
            }
            cs = cs.with_labels(labels);
            if let Some(help) = &d.help {
                cs = cs.with_notes(vec![format!("help: {help}")]);
            }
            let mut buffer = String::new();
            if term::emit_to_string(&mut buffer, &config, &file, &cs).is_ok() {
                // Drop codespan's own empty header line; ours above carries the location.
                for l in buffer.lines().skip_while(|l| {
                    l.trim().is_empty() || l.starts_with("error") || l.starts_with("warning")
                }) {
                    // Trailing blanks from the excerpt's alignment carry no meaning
                    // and make expected-output files fragile.
                    out.push_str(l.trim_end());
                    out.push('\n');
                }
            }
        }
        out
    }
}

fn clamp_span(text: &str, span: Range<usize>) -> Range<usize> {
    let mut start = span.start.min(text.len());
    while !text.is_char_boundary(start) {
        start -= 1;
    }
    let mut end = span.end.clamp(start, text.len());
    while !text.is_char_boundary(end) {
        end += 1;
    }
    start..end
}
