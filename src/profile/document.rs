//! Reads the TOML tree into plain records with spans ([`RawProfile`]),
//! checking keys and value types but not yet how the pieces fit together.
//!
//! Anything that cannot be read is reported and left out (or left `None`), so
//! one bad value does not hide the problems after it.

use std::ops::Range;

use toml::de::{DeTable, DeValue};

use crate::diag::Diagnostic;
use crate::model::Kind;
use crate::profile::fields::{self, Key, Value};
use crate::units::{EnergyUnit, Temperature};

/// Temperature used when the file does not give one: 25 °C, the usual
/// reference temperature of tabulated free energies.
pub const DEFAULT_TEMPERATURE_K: f64 = 298.15;

const TOP_KEYS: [&str; 8] = [
    "title",
    "temperature",
    "unit",
    "zero",
    "start",
    "states",
    "ts",
    "path",
];
const STATE_KEYS: [&str; 5] = ["g", "h", "s", "label", "product"];
const TS_KEYS: [&str; 4] = ["g", "h", "s", "label"];
const PATH_KEYS: [&str; 3] = ["name", "via", "cycle"];
const NOT_YET_ENERGY: &str = "give the free energy as g, e.g. { g = 17.9 }, or enthalpy and \
     entropy as h and s; electronic energies (e) come in a later version";

/// A string value with where it was written.
#[derive(Debug, Clone)]
pub(crate) struct Located {
    pub text: String,
    pub span: Range<usize>,
}

/// One entry of `[states]` or `[ts]`.
#[derive(Debug, Clone)]
pub(crate) struct RawPoint {
    pub id: String,
    pub id_span: Range<usize>,
    pub kind: Kind,
    /// `None` when g is missing or unreadable (already reported).
    pub g: Option<f64>,
    /// The span of the g value (the id when g is missing).
    pub g_span: Range<usize>,
    pub label: Option<String>,
    pub product: Option<bool>,
    /// Enthalpy and entropy as written (h in the file's unit, s in cal/(mol·K)
    /// for kcal/mol, J/(mol·K) for kJ/mol, the unit per K for eV and hartree),
    /// when given instead of g. `g` then holds h − T·s at the file's temperature.
    pub hs: Option<(f64, f64)>,
}

/// One `[[path]]` table.
#[derive(Debug, Clone)]
pub(crate) struct RawPath {
    pub name: Option<Located>,
    /// `None` when `via` is missing or unreadable (already reported).
    pub via: Option<Vec<Located>>,
    /// `cycle = true`: one turnover of a catalytic cycle, with where it is written.
    pub cycle: Option<(bool, Range<usize>)>,
}

/// The whole file, read but not yet cross-checked.
#[derive(Debug, Clone, Default)]
pub(crate) struct RawProfile {
    pub title: Option<String>,
    pub temperature: Option<Temperature>,
    pub unit: Option<(EnergyUnit, Range<usize>)>,
    pub zero: Option<Located>,
    /// `start`: the state(s) the material starts in, for selectivity.
    pub start: Option<Vec<Located>>,
    /// Where `[states]` is written, for file-wide warnings.
    pub states_span: Option<Range<usize>>,
    pub points: Vec<RawPoint>,
    pub paths: Vec<RawPath>,
    /// Whether any `path` key was present (even if unreadable).
    pub has_path_key: bool,
}

/// Reads the top-level table, appending every problem to `errors`.
pub(crate) fn read(root: &DeTable<'_>, errors: &mut Vec<Diagnostic>) -> RawProfile {
    let mut raw = RawProfile::default();
    let mut unit_seen = false;
    for (key, value) in fields::entries(root) {
        match key.get_ref().as_ref() {
            "title" => {
                raw.title = fields::string(value, "the title", "title = \"My mechanism\"", errors)
                    .map(str::to_string)
            }
            "temperature" => raw.temperature = read_temperature(value, errors),
            "unit" => {
                unit_seen = true;
                raw.unit = read_unit(value, errors);
            }
            "zero" => {
                raw.zero =
                    fields::string(value, "zero", "zero = \"start\"", errors).map(|s| Located {
                        text: s.to_string(),
                        span: value.span(),
                    })
            }
            "start" => raw.start = read_id_list(value, "start", "start = \"rot-a\"", errors),
            "states" => {
                raw.states_span = Some(value.span());
                read_points(value, Kind::Minimum, &mut raw.points, errors);
            }
            "ts" => read_points(value, Kind::TransitionState, &mut raw.points, errors),
            "path" => {
                raw.has_path_key = true;
                read_paths(value, &mut raw.paths, errors);
            }
            _ => errors.push(fields::unknown_key(key, "at the top level", &TOP_KEYS)),
        }
    }
    if !unit_seen {
        errors.push(
            Diagnostic::error(
                fields::file_start(),
                "the profile does not say which energy unit it uses",
            )
            .with_help("add unit = \"kcal/mol\" at the top (or \"kJ/mol\", \"eV\", \"hartree\")"),
        );
    }
    raw
}

fn read_temperature(value: &Value<'_>, errors: &mut Vec<Diagnostic>) -> Option<Temperature> {
    let help = "write a number in kelvin (temperature = 298.15) or text with a unit \
                (temperature = \"25 C\", \"-78 C\", \"298.15 K\")";
    let result = match value.get_ref() {
        DeValue::String(s) => Temperature::parse(s),
        other => match fields::as_number(other) {
            Some(k) => Temperature::try_kelvin(k),
            None => {
                errors.push(
                    Diagnostic::error(
                        value.span(),
                        format!(
                            "the temperature must be a number or text, found {}",
                            fields::kind_of(other)
                        ),
                    )
                    .with_help(help),
                );
                return None;
            }
        },
    };
    match result {
        Ok(t) => Some(t),
        Err(e) => {
            errors.push(Diagnostic::error(value.span(), e.to_string()).with_help(help));
            None
        }
    }
}

fn read_unit(
    value: &Value<'_>,
    errors: &mut Vec<Diagnostic>,
) -> Option<(EnergyUnit, Range<usize>)> {
    let text = fields::string(value, "the unit", "unit = \"kcal/mol\"", errors)?;
    match EnergyUnit::parse(text) {
        Some(unit) => Some((unit, value.span())),
        None => {
            let names: Vec<&str> = EnergyUnit::ALL.iter().map(|u| u.name()).collect();
            let mut help = format!("use one of: {}", names.join(", "));
            if let Some(s) = crate::profile::suggest::nearest(text, names.iter().copied()) {
                help = format!("did you mean '{s}'? {help}");
            }
            errors.push(
                Diagnostic::error(value.span(), format!("unknown energy unit '{text}'"))
                    .with_help(help),
            );
            None
        }
    }
}

fn read_points(
    value: &Value<'_>,
    kind: Kind,
    out: &mut Vec<RawPoint>,
    errors: &mut Vec<Diagnostic>,
) {
    let (section, example) = match kind {
        Kind::Minimum => ("[states]", "[states]\nstart = 0.0"),
        Kind::TransitionState => ("[ts]", "[ts]\nts-1 = 24.6"),
    };
    let DeValue::Table(table) = value.get_ref() else {
        errors.push(
            Diagnostic::error(
                value.span(),
                format!(
                    "{section} must be a table of ids, found {}",
                    fields::kind_of(value.get_ref())
                ),
            )
            .with_help(format!(
                "write it as a table header with one id per line:\n{example}"
            )),
        );
        return;
    };
    for (key, entry) in fields::entries(table) {
        if let Some(point) = read_point(key, entry, kind, errors) {
            out.push(point);
        }
    }
}

fn read_point(
    key: &Key<'_>,
    value: &Value<'_>,
    kind: Kind,
    errors: &mut Vec<Diagnostic>,
) -> Option<RawPoint> {
    let id = key.get_ref().to_string();
    let noun = match kind {
        Kind::Minimum => "state",
        Kind::TransitionState => "transition state",
    };
    if id.trim().is_empty() {
        errors.push(
            Diagnostic::error(key.span(), format!("a {noun} id cannot be empty"))
                .with_help("give it a short name, e.g. ipair or ts-ion"),
        );
        return None;
    }
    let mut point = RawPoint {
        id: id.clone(),
        id_span: key.span(),
        kind,
        g: None,
        g_span: key.span(),
        label: None,
        product: None,
        hs: None,
    };
    let what_g = format!("the free energy g of '{id}'");
    match value.get_ref() {
        DeValue::Integer(_) | DeValue::Float(_) => {
            point.g = fields::finite_number(value, &what_g, errors);
            point.g_span = value.span();
        }
        DeValue::Table(table) => {
            let mut has_g = false;
            let mut reserved = false;
            let mut h: Option<(Option<f64>, Range<usize>)> = None;
            let mut s: Option<(Option<f64>, Range<usize>)> = None;
            let place = format!("in {noun} '{id}'");
            for (k, v) in fields::entries(table) {
                match (k.get_ref().as_ref(), kind) {
                    ("g", _) => {
                        has_g = true;
                        point.g = fields::finite_number(v, &what_g, errors);
                        point.g_span = v.span();
                    }
                    ("h", _) => {
                        let what = format!("the enthalpy h of '{id}'");
                        h = Some((fields::finite_number(v, &what, errors), v.span()));
                    }
                    ("s", _) => {
                        let what = format!("the entropy s of '{id}'");
                        s = Some((fields::finite_number(v, &what, errors), v.span()));
                    }
                    ("label", _) => {
                        point.label = fields::string(v, &format!("the label of '{id}'"), "label = \"ion pair\"", errors)
                            .map(str::to_string)
                    }
                    ("product", Kind::Minimum) => {
                        point.product = fields::boolean(v, &format!("product of '{id}'"), errors)
                    }
                    ("product", Kind::TransitionState) => errors.push(
                        Diagnostic::error(k.span(), format!("'product' applies to states, not to transition state '{id}'"))
                            .with_help("remove it; only minima in [states] can be products"),
                    ),
                    ("e", _) => {
                        reserved = true;
                        errors.push(fields::reserved(k, NOT_YET_ENERGY));
                    }
                    _ => errors.push(fields::unknown_key(
                        k,
                        &place,
                        if kind == Kind::Minimum { &STATE_KEYS } else { &TS_KEYS },
                    )),
                }
            }
            match (has_g, h, s) {
                (true, None, None) => {}
                (true, Some((_, span)), _) | (true, None, Some((_, span))) => errors.push(
                    Diagnostic::error(span, format!("{noun} '{id}' gives both g and h/s"))
                        .with_help("give either the free energy g, or the enthalpy h with the entropy s (g = h − T·s is then computed at each temperature)"),
                ),
                (false, Some((h, h_span)), Some((s, _))) => {
                    point.g_span = h_span;
                    // Readable values only; a bad one was reported where it was read.
                    if let (Some(h), Some(s)) = (h, s) {
                        point.hs = Some((h, s));
                    }
                }
                (false, Some((_, span)), None) => errors.push(
                    Diagnostic::error(span, format!("{noun} '{id}' gives h without s"))
                        .with_help("add the entropy, e.g. s = -12.5 (cal/(mol·K) with kcal/mol, J/(mol·K) with kJ/mol), or give g instead"),
                ),
                (false, None, Some((_, span))) => errors.push(
                    Diagnostic::error(span, format!("{noun} '{id}' gives s without h"))
                        .with_help("add the enthalpy h in the file's unit, or give g instead"),
                ),
                (false, None, None) if !reserved => errors.push(
                    Diagnostic::error(key.span(), format!("{noun} '{id}' has no free energy g"))
                        .with_help(format!("add it, e.g. {id} = {{ g = 0.0 }}, or give h and s")),
                ),
                (false, None, None) => {}
            }
        }
        other => errors.push(
            Diagnostic::error(
                value.span(),
                format!("{noun} '{id}' must be a number or a table, found {}", fields::kind_of(other)),
            )
            .with_help(format!(
                "write its free energy, e.g. {id} = 17.9, or a table, e.g. {id} = {{ g = 17.9, label = \"ion pair\" }}"
            )),
        ),
    }
    Some(point)
}

fn read_paths(value: &Value<'_>, out: &mut Vec<RawPath>, errors: &mut Vec<Diagnostic>) {
    let help = "write each path as its own table with double brackets:\n[[path]]\nname = \"main\"\nvia  = [\"start\", \"ts-1\", \"product\"]";
    let DeValue::Array(items) = value.get_ref() else {
        let message = match value.get_ref() {
            DeValue::Table(_) => "paths are written [[path]], with double brackets".to_string(),
            other => format!(
                "path must be a list of [[path]] tables, found {}",
                fields::kind_of(other)
            ),
        };
        errors.push(Diagnostic::error(value.span(), message).with_help(help));
        return;
    };
    if items.is_empty() {
        errors.push(Diagnostic::error(value.span(), "the list of paths is empty").with_help(help));
    }
    for item in items.iter() {
        let DeValue::Table(table) = item.get_ref() else {
            errors.push(
                Diagnostic::error(
                    item.span(),
                    format!(
                        "each path must be a table, found {}",
                        fields::kind_of(item.get_ref())
                    ),
                )
                .with_help(help),
            );
            continue;
        };
        out.push(read_path(table, item.span(), out.len() + 1, errors));
    }
}

fn read_path(
    table: &DeTable<'_>,
    span: Range<usize>,
    number: usize,
    errors: &mut Vec<Diagnostic>,
) -> RawPath {
    let mut path = RawPath {
        name: None,
        via: None,
        cycle: None,
    };
    let mut has_via = false;
    for (k, v) in fields::entries(table) {
        match k.get_ref().as_ref() {
            "name" => {
                path.name =
                    fields::string(v, "the path name", "name = \"stepwise\"", errors).map(|s| {
                        Located {
                            text: s.to_string(),
                            span: v.span(),
                        }
                    })
            }
            "via" => {
                has_via = true;
                path.via = read_via(v, errors);
            }
            "cycle" => {
                path.cycle = fields::boolean(v, "cycle", errors).map(|b| (b, v.span()));
            }
            _ => errors.push(fields::unknown_key(
                k,
                &format!("in path {number}"),
                &PATH_KEYS,
            )),
        }
    }
    if !has_via {
        errors.push(
            Diagnostic::error(span, format!("path {number} has no via list"))
                .with_help("add the chain of ids, e.g. via = [\"start\", \"ts-1\", \"product\"]"),
        );
    }
    path
}

fn read_via(value: &Value<'_>, errors: &mut Vec<Diagnostic>) -> Option<Vec<Located>> {
    let example = "via = [\"start\", \"ts-1\", \"product\"]";
    let DeValue::Array(items) = value.get_ref() else {
        errors.push(
            Diagnostic::error(
                value.span(),
                format!(
                    "via must be a list of ids, found {}",
                    fields::kind_of(value.get_ref())
                ),
            )
            .with_help(format!("write it in square brackets, e.g. {example}")),
        );
        return None;
    };
    let mut ids = Vec::new();
    let mut ok = true;
    for item in items.iter() {
        match item.get_ref() {
            DeValue::String(s) => ids.push(Located {
                text: s.to_string(),
                span: item.span(),
            }),
            other => {
                ok = false;
                errors.push(
                    Diagnostic::error(
                        item.span(),
                        format!(
                            "each entry of via must be an id in quotes, found {}",
                            fields::kind_of(other)
                        ),
                    )
                    .with_help(format!(
                        "name states and transition states by their ids, e.g. {example}"
                    )),
                );
            }
        }
    }
    if ok && ids.len() < 2 {
        errors.push(
            Diagnostic::error(
                value.span(),
                format!(
                    "a path needs at least two points, this one has {}",
                    ids.len()
                ),
            )
            .with_help(format!(
                "list the chain from the first minimum to the last, e.g. {example}"
            )),
        );
        return None;
    }
    ok.then_some(ids)
}

/// Reads one id or a list of ids (`start = "a"` or `start = ["a", "b"]`).
fn read_id_list(
    value: &Value<'_>,
    what: &str,
    example: &str,
    errors: &mut Vec<Diagnostic>,
) -> Option<Vec<Located>> {
    let one = |item: &Value<'_>, errors: &mut Vec<Diagnostic>| match item.get_ref() {
        DeValue::String(s) => Some(Located {
            text: s.to_string(),
            span: item.span(),
        }),
        other => {
            errors.push(
                Diagnostic::error(
                    item.span(),
                    format!(
                        "{what} must name states by their ids in quotes, found {}",
                        fields::kind_of(other)
                    ),
                )
                .with_help(format!(
                    "e.g. {example}, or a list: {what} = [\"rot-a\", \"rot-b\"]"
                )),
            );
            None
        }
    };
    match value.get_ref() {
        DeValue::Array(items) => {
            let ids: Vec<Option<Located>> = items.iter().map(|i| one(i, errors)).collect();
            if ids.is_empty() {
                errors.push(
                    Diagnostic::error(value.span(), format!("the {what} list is empty")).with_help(
                        format!("name at least one state, e.g. {example}, or delete the line"),
                    ),
                );
                return None;
            }
            ids.into_iter().collect()
        }
        _ => one(value, errors).map(|l| vec![l]),
    }
}
