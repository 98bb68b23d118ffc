//! Figure keys of a profile: a path's `colour`, `dash` and `width`, a point's
//! `column`, and the `[figure]` table (`spacing`, `bar_width`). Each value is
//! checked where it is written; pinned columns are checked against the paths
//! once those are resolved.

use std::collections::HashSet;
use std::ops::Range;

use toml::de::DeValue;

use crate::diag::Diagnostic;
use crate::model::{Dash, PathStyle, PointId};
use crate::profile::document::RawPoint;
use crate::profile::fields::{self, Key, Value};
use crate::profile::network::ResolvedPath;

const FIGURE_KEYS: [&str; 2] = ["spacing", "bar_width"];
/// Highest column a point may be pinned to (1-based); beyond it the bars are
/// too narrow to see on any page.
pub(crate) const MAX_COLUMN: f64 = 200.0;

/// The `[figure]` table as written.
#[derive(Debug, Clone, Default)]
pub(crate) struct RawFigure {
    pub spacing: Option<f64>,
    pub bar_width_mm: Option<f64>,
}

/// Reads one figure key of a `[[path]]` table into `style`. Returns false when
/// `key` is not a figure key.
pub(crate) fn read_path_key(
    key: &Key<'_>,
    value: &Value<'_>,
    path: usize,
    style: &mut PathStyle,
    errors: &mut Vec<Diagnostic>,
) -> bool {
    match key.get_ref().as_ref() {
        "colour" | "color" => {
            if style.colour.is_some() {
                errors.push(
                    Diagnostic::error(key.span(), format!("path {path} gives its colour twice"))
                        .with_help("write either colour or color, once"),
                );
            }
            style.colour = read_colour(value, errors);
        }
        "dash" => style.dash = read_dash(value, errors),
        "width" => style.width_pt = read_width(value, errors),
        _ => return false,
    }
    true
}

/// `colour = "#0072B2"`: a hex colour, six digits (or three, `#07B`).
fn read_colour(value: &Value<'_>, errors: &mut Vec<Diagnostic>) -> Option<u32> {
    let text = fields::string(value, "the colour", "colour = \"#0072B2\"", errors)?;
    match parse_hex(text) {
        Some(rgb) => Some(rgb),
        None => {
            errors.push(
                Diagnostic::error(value.span(), format!("cannot read the colour '{text}'"))
                    .with_help(
                        "write it as # and six hex digits (red, green, blue), e.g. colour = \"#0072B2\" \
                         (blue) or \"#D55E00\" (vermillion); \"#07B\" is short for \"#0077BB\"",
                    ),
            );
            None
        }
    }
}

/// `#RRGGBB` or `#RGB` as 0xRRGGBB.
fn parse_hex(text: &str) -> Option<u32> {
    let digits = text.trim().strip_prefix('#')?;
    if !digits.chars().all(|c| c.is_ascii_hexdigit()) {
        return None;
    }
    match digits.len() {
        6 => u32::from_str_radix(digits, 16).ok(),
        3 => {
            let doubled: String = digits.chars().flat_map(|c| [c, c]).collect();
            u32::from_str_radix(&doubled, 16).ok()
        }
        _ => None,
    }
}

/// `dash = "dotted"`: one of the named patterns.
fn read_dash(value: &Value<'_>, errors: &mut Vec<Diagnostic>) -> Option<Dash> {
    let text = fields::string(value, "the dash pattern", "dash = \"dotted\"", errors)?;
    if let Some(d) = Dash::from_name(text) {
        return Some(d);
    }
    let names: Vec<&str> = Dash::ALL.iter().map(|d| d.name()).collect();
    let mut help = format!("use one of: {}", names.join(", "));
    if let Some(s) = crate::profile::suggest::nearest(text, names.iter().copied()) {
        help = format!("did you mean '{s}'? {help}");
    }
    errors.push(
        Diagnostic::error(value.span(), format!("unknown dash pattern '{text}'")).with_help(help),
    );
    None
}

/// A number with an optional unit suffix (`1.2`, `"1.2 pt"`), within `range`.
fn measure(
    value: &Value<'_>,
    what: &str,
    unit: &str,
    range: (f64, f64),
    example: &str,
    errors: &mut Vec<Diagnostic>,
) -> Option<f64> {
    let help = format!(
        "write a number of {unit} from {} to {}, e.g. {example}",
        range.0, range.1
    );
    let x = match value.get_ref() {
        DeValue::String(s) => match s.trim().trim_end_matches(unit).trim().parse::<f64>() {
            Ok(x) if x.is_finite() => x,
            _ => {
                errors.push(
                    Diagnostic::error(value.span(), format!("cannot read {what} '{s}'"))
                        .with_help(help),
                );
                return None;
            }
        },
        _ => fields::finite_number(value, what, errors)?,
    };
    if (range.0..=range.1).contains(&x) {
        Some(x)
    } else {
        errors.push(
            Diagnostic::error(
                value.span(),
                format!(
                    "{what} is {x} {unit}, outside {}–{} {unit}",
                    range.0, range.1
                ),
            )
            .with_help(help),
        );
        None
    }
}

/// `width = 1.2` or `"1.2 pt"`: connector stroke in pt.
fn read_width(value: &Value<'_>, errors: &mut Vec<Diagnostic>) -> Option<f64> {
    measure(
        value,
        "the line width",
        "pt",
        (0.1, 6.0),
        "width = \"1.2 pt\"",
        errors,
    )
}

/// `column = 3`: the column a point is pinned to, 1-based as written; 0-based
/// with the value's span as returned.
pub(crate) fn read_column(
    value: &Value<'_>,
    id: &str,
    errors: &mut Vec<Diagnostic>,
) -> Option<(usize, Range<usize>)> {
    let n = fields::finite_number(value, &format!("the column of '{id}'"), errors)?;
    if (1.0..=MAX_COLUMN).contains(&n) && n.fract() == 0.0 {
        Some((n as usize - 1, value.span()))
    } else {
        errors.push(
            Diagnostic::error(
                value.span(),
                format!(
                    "the column of '{id}' must be a whole number from 1 to {MAX_COLUMN}, found {n}"
                ),
            )
            .with_help("columns count from 1 at the left of the figure, e.g. column = 3"),
        );
        None
    }
}

/// The `[figure]` table.
pub(crate) fn read_table(value: &Value<'_>, errors: &mut Vec<Diagnostic>) -> RawFigure {
    let mut out = RawFigure::default();
    let example = "spacing = 1.5\nbar_width = \"8 mm\"";
    let Some(table) = fields::section(value, "figure", example, errors) else {
        return out;
    };
    for (k, v) in fields::entries(table) {
        match k.get_ref().as_ref() {
            "spacing" => {
                out.spacing = measure(
                    v,
                    "the spacing",
                    "bar lengths",
                    (0.1, 10.0),
                    "spacing = 1.5",
                    errors,
                )
            }
            "bar_width" => {
                out.bar_width_mm = measure(
                    v,
                    "the bar width",
                    "mm",
                    (0.5, 60.0),
                    "bar_width = \"8 mm\"",
                    errors,
                )
            }
            _ => errors.push(fields::unknown_key(k, "in [figure]", &FIGURE_KEYS)),
        }
    }
    out
}

/// Pinned columns must increase along every path: a point pinned at or left of
/// a pinned point it follows (directly or through other points) is reported
/// at its `column`, pointing back at the other pin.
pub(crate) fn check_pins(
    points: &[RawPoint],
    paths: &[ResolvedPath],
    errors: &mut Vec<Diagnostic>,
) {
    let n = points.len();
    if !points.iter().any(|p| p.column.is_some()) {
        return;
    }
    let mut succ: Vec<Vec<PointId>> = vec![Vec::new(); n];
    for path in paths {
        for w in path.via.windows(2) {
            if w[0] < n && w[1] < n && !succ[w[0]].contains(&w[1]) {
                succ[w[0]].push(w[1]);
            }
        }
    }
    // Column 1 is the left edge: nothing can stand before it.
    for (b, pb) in points.iter().enumerate() {
        let Some((0, ref span)) = pb.column else {
            continue;
        };
        if let Some(a) = (0..n).find(|&a| succ[a].contains(&b)) {
            errors.push(
                Diagnostic::error(
                    span.clone(),
                    format!(
                        "'{}' is pinned to column 1, but '{}' comes before it on a path",
                        pb.id, points[a].id
                    ),
                )
                .with_help("column 1 is the left edge of the figure; pin it to a later column, or remove the pin"),
            );
        }
    }
    let mut reported: HashSet<(PointId, PointId)> = HashSet::new();
    for (a, pa) in points.iter().enumerate() {
        let Some((ca, ref span_a)) = pa.column else {
            continue;
        };
        // Everything reachable from a, each once.
        let mut seen = vec![false; n];
        let mut stack = succ[a].clone();
        while let Some(b) = stack.pop() {
            if std::mem::replace(&mut seen[b], true) {
                continue;
            }
            stack.extend(succ[b].iter().copied());
            let Some((cb, ref span_b)) = points[b].column else {
                continue;
            };
            if b == a || cb > ca || !reported.insert((a.min(b), a.max(b))) {
                continue;
            }
            errors.push(
                Diagnostic::error(
                    span_b.clone(),
                    format!(
                        "'{}' is pinned to column {}, but it comes after '{}' (column {}) on a path",
                        points[b].id,
                        cb + 1,
                        pa.id,
                        ca + 1
                    ),
                )
                .with_related(span_a.clone(), "pinned here")
                .with_help(format!(
                    "a point stands right of the points before it: give '{}' a column above {}, \
                     or remove one of the two pins",
                    points[b].id,
                    ca + 1
                )),
            );
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn hex_colours_long_and_short() {
        assert_eq!(parse_hex("#0072B2"), Some(0x0072B2));
        assert_eq!(parse_hex(" #d55e00 "), Some(0xD55E00));
        assert_eq!(parse_hex("#07B"), Some(0x0077BB));
        assert_eq!(parse_hex("0072B2"), None);
        assert_eq!(parse_hex("#0072B"), None);
        assert_eq!(parse_hex("#GG0000"), None);
        assert_eq!(parse_hex("#+12345"), None);
    }
}
