//! TOML syntax: turns the text into a spanned document tree, or into located
//! diagnostics when the text is not valid TOML.
//!
//! toml's own messages are terse ("invalid key"); here they are reworded for
//! people who do not write TOML every day, and a duplicated key also points at
//! its first definition.

use std::ops::Range;

use toml::Spanned;
use toml::de::{DeTable, DeValue};

use crate::diag::Diagnostic;

/// Parses `text` as TOML. On failure returns every syntax error toml's
/// recovering parser found, one per location.
pub(crate) fn parse_toml(text: &str) -> Result<DeTable<'_>, Vec<Diagnostic>> {
    let (root, errors) = DeTable::parse_recoverable(text);
    if errors.is_empty() {
        return Ok(root.into_inner());
    }
    let root = root.into_inner();
    // Only the first syntax error is trustworthy: after it, the recovering
    // parser's guesses (an unclosed quote swallowing the next lines) produce
    // follow-on errors that would send the user to the wrong place. Duplicate
    // keys are the exception: they never confuse the parser, so all are shown.
    let mut diagnostics: Vec<Diagnostic> = Vec::new();
    let mut sorted: Vec<_> = errors.iter().collect();
    sorted.sort_by_key(|e| e.span().map_or(0, |s| s.start));
    let mut first_other = true;
    for error in sorted {
        let span = error.span().unwrap_or(0..0);
        if diagnostics.iter().any(|d| d.span.start == span.start) {
            continue; // the recovering parser can report one place twice
        }
        let duplicate = error.message().starts_with("duplicate key");
        if !duplicate && !first_other {
            continue;
        }
        first_other &= duplicate;
        diagnostics.push(describe(text, &root, error.message(), span));
    }
    Err(diagnostics)
}

fn describe(text: &str, root: &DeTable<'_>, message: &str, span: Range<usize>) -> Diagnostic {
    if message.starts_with("duplicate key") {
        let key = text
            .get(span.clone())
            .unwrap_or("")
            .trim_matches(['"', '\'']);
        let mut d = Diagnostic::error(span.clone(), format!("'{key}' is defined twice")).with_help(
            "each key (and each state or TS id) may appear only once in a table; \
                 rename or delete one of them",
        );
        if let Some(first) =
            earlier_key(root, key, span.start).or_else(|| earlier_line(text, key, span.start))
        {
            d = d.with_related(first, "first defined here");
        }
        return d;
    }
    if message.contains("basic string") || message.contains("literal string") {
        return Diagnostic::error(span, "this text value has no closing quote").with_help(
            "end it with the same quote it starts with on the same line, e.g. label = \"ion pair\"",
        );
    }
    let help = if message.contains("expected `=`") {
        "write each entry as key = value, e.g. start = 0.0"
    } else if message.contains("string") || message.contains("invalid") {
        "text values need double quotes, e.g. label = \"ion pair\"; each line is key = value"
    } else {
        "each line is key = value, a [table] header, or a [[path]] header; \
         see docs/profile-format.md"
    };
    Diagnostic::error(span, format!("this is not valid TOML: {message}")).with_help(help)
}

/// A textual fallback for a table header written twice (toml keeps only the
/// second header's position): the last earlier line that starts with `[key]`
/// or `key =`.
fn earlier_line(text: &str, key: &str, before: usize) -> Option<Range<usize>> {
    if key.is_empty() {
        return None;
    }
    let mut found = None;
    let mut offset = 0;
    for line in text.get(..before)?.split_inclusive('\n') {
        let trimmed = line.trim_start();
        let indent = line.len() - trimmed.len();
        let inner = trimmed.trim_start_matches('[').trim_start();
        if let Some(after) = inner.strip_prefix(key) {
            let after = after.trim_start();
            if after.starts_with(']') || after.starts_with('=') || after.starts_with('.') {
                let start = offset + indent + (trimmed.len() - inner.len());
                found = Some(start..start + key.len());
            }
        }
        offset += line.len();
    }
    found
}

/// The nearest definition of `key` before `before`, anywhere in the document:
/// the one a duplicate collides with in every realistic file.
fn earlier_key(table: &DeTable<'_>, key: &str, before: usize) -> Option<Range<usize>> {
    let mut best: Option<Range<usize>> = None;
    let mut consider = |span: Range<usize>| {
        if span.start < before && best.as_ref().is_none_or(|b| span.start > b.start) {
            best = Some(span);
        }
    };
    for (k, v) in table.iter() {
        if k.get_ref().as_ref() == key {
            consider(k.span());
        }
        if let Some(found) = earlier_in_value(v, key, before) {
            consider(found);
        }
    }
    best
}

fn earlier_in_value(
    value: &Spanned<DeValue<'_>>,
    key: &str,
    before: usize,
) -> Option<Range<usize>> {
    match value.get_ref() {
        DeValue::Table(t) => earlier_key(t, key, before),
        DeValue::Array(items) => items
            .iter()
            .filter_map(|item| earlier_in_value(item, key, before))
            .max_by_key(|span| span.start),
        _ => None,
    }
}
