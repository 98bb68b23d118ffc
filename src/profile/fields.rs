//! Typed reading of single TOML values, each failure a located diagnostic.
//!
//! Every reader takes the value's span with it, so an error underlines the
//! offending value itself, and returns `None` after recording the problem:
//! the caller carries on and more problems are found in the same pass.

use std::ops::Range;

use toml::Spanned;
use toml::de::{DeString, DeTable, DeValue};

use crate::diag::Diagnostic;
use crate::profile::suggest;

/// A key as written, with the span of the key token.
pub(crate) type Key<'i> = Spanned<DeString<'i>>;
/// A value as written, with the span of the value.
pub(crate) type Value<'i> = Spanned<DeValue<'i>>;

/// The entries of a table in file order (toml's map is sorted by name).
pub(crate) fn entries<'a, 'i>(table: &'a DeTable<'i>) -> Vec<(&'a Key<'i>, &'a Value<'i>)> {
    let mut all: Vec<_> = table.iter().collect();
    all.sort_by_key(|(k, _)| k.span().start);
    all
}

/// What a value is, in words for the "found …" part of a type error.
pub(crate) fn kind_of(value: &DeValue<'_>) -> &'static str {
    match value {
        DeValue::String(_) => "text (a string)",
        DeValue::Integer(_) | DeValue::Float(_) => "a number",
        DeValue::Boolean(_) => "true/false",
        DeValue::Datetime(_) => "a date or time",
        DeValue::Array(_) => "a list [ … ]",
        DeValue::Table(_) => "a table { … }",
    }
}

/// The numeric value of an integer or float, or `None` if `value` is not a
/// number. Non-finite values (nan, inf, overflowing exponents) come back as
/// they are, for the caller to refuse with its own words.
pub(crate) fn as_number(value: &DeValue<'_>) -> Option<f64> {
    match value {
        DeValue::Integer(i) => {
            let digits = i.as_str().replace('_', "");
            match i64::from_str_radix(&digits, i.radix()) {
                Ok(n) => Some(n as f64),
                // Beyond i64: still a number, just a very large one.
                Err(_) => digits.parse::<f64>().ok().or(Some(f64::INFINITY)),
            }
        }
        DeValue::Float(f) => f.as_str().replace('_', "").parse::<f64>().ok(),
        _ => None,
    }
}

/// A finite number, or an error at the value. `what` names the quantity,
/// e.g. "the free energy g of 'ts-ion'".
pub(crate) fn finite_number(
    value: &Value<'_>,
    what: &str,
    errors: &mut Vec<Diagnostic>,
) -> Option<f64> {
    match as_number(value.get_ref()) {
        Some(n) if n.is_finite() => Some(n),
        Some(_) => {
            errors.push(
                Diagnostic::error(value.span(), format!("{what} is not a finite number"))
                    .with_help("energies must be ordinary numbers; nan, inf and overflowing values like 1e400 cannot be used"),
            );
            None
        }
        None => {
            let mut d = Diagnostic::error(
                value.span(),
                format!(
                    "{what} must be a number, found {}",
                    kind_of(value.get_ref())
                ),
            );
            d = d.with_help(match value.get_ref() {
                DeValue::String(_) => "remove the quotes around the number, e.g. g = 17.9",
                _ => "write a plain number, e.g. g = 17.9",
            });
            errors.push(d);
            None
        }
    }
}

/// A string, or an error at the value.
pub(crate) fn string<'a>(
    value: &'a Value<'_>,
    what: &str,
    example: &str,
    errors: &mut Vec<Diagnostic>,
) -> Option<&'a str> {
    match value.get_ref() {
        DeValue::String(s) => Some(s.as_ref()),
        other => {
            errors.push(
                Diagnostic::error(
                    value.span(),
                    format!("{what} must be text in quotes, found {}", kind_of(other)),
                )
                .with_help(format!("write it in double quotes, e.g. {example}")),
            );
            None
        }
    }
}

/// A boolean, or an error at the value.
pub(crate) fn boolean(value: &Value<'_>, what: &str, errors: &mut Vec<Diagnostic>) -> Option<bool> {
    match value.get_ref() {
        DeValue::Boolean(b) => Some(*b),
        other => {
            errors.push(
                Diagnostic::error(
                    value.span(),
                    format!("{what} must be true or false, found {}", kind_of(other)),
                )
                .with_help("write true or false without quotes"),
            );
            None
        }
    }
}

/// The table a `[name]` section holds, or an error at the value with
/// `example` as the fix.
pub(crate) fn section<'a, 'i>(
    value: &'a Value<'i>,
    name: &str,
    example: &str,
    errors: &mut Vec<Diagnostic>,
) -> Option<&'a DeTable<'i>> {
    match value.get_ref() {
        DeValue::Table(table) => Some(table),
        other => {
            errors.push(
                Diagnostic::error(
                    value.span(),
                    format!("[{name}] must be a table, found {}", kind_of(other)),
                )
                .with_help(format!("e.g.\n[{name}]\n{example}")),
            );
            None
        }
    }
}

/// Keys reserved for the next versions of the format: recognised, but refused
/// with a clear "not yet supported" rather than ignored.
pub(crate) fn reserved(key: &Key<'_>, help: &str) -> Diagnostic {
    Diagnostic::error(
        key.span(),
        format!("'{}' is not yet supported in this version", key.get_ref()),
    )
    .with_help(help.to_string())
}

/// An unknown key: names it, suggests the nearest allowed key and lists them all.
pub(crate) fn unknown_key(key: &Key<'_>, place: &str, allowed: &[&str]) -> Diagnostic {
    let name = key.get_ref().as_ref();
    let list = allowed.join(", ");
    let help = match suggest::nearest(name, allowed.iter().copied()) {
        Some(s) => format!("did you mean '{s}'? the keys allowed {place} are: {list}"),
        None => format!("the keys allowed {place} are: {list}"),
    };
    Diagnostic::error(key.span(), format!("unknown key '{name}' {place}")).with_help(help)
}

/// An empty span at the start of the file, for things that are missing
/// altogether (there is nothing to underline).
pub(crate) fn file_start() -> Range<usize> {
    0..0
}

/// The tables of an array of tables (`[[observed]]`, `[[variant]]`), each with
/// its span; anything else is reported with `help` and left out.
pub(crate) fn array_of_tables<'a, 'i>(
    value: &'a Value<'i>,
    name: &str,
    help: &str,
    errors: &mut Vec<Diagnostic>,
) -> Vec<(&'a DeTable<'i>, Range<usize>)> {
    let DeValue::Array(items) = value.get_ref() else {
        errors.push(
            Diagnostic::error(
                value.span(),
                format!("{name} tables are written [[{name}]], with double brackets"),
            )
            .with_help(help.to_string()),
        );
        return Vec::new();
    };
    let mut out = Vec::new();
    for item in items.iter() {
        match item.get_ref() {
            DeValue::Table(table) => out.push((table, item.span())),
            other => errors.push(
                Diagnostic::error(
                    item.span(),
                    format!("each [[{name}]] must be a table, found {}", kind_of(other)),
                )
                .with_help(help.to_string()),
            ),
        }
    }
    out
}
