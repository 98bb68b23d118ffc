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

const TOP_KEYS: [&str; 15] = [
    "title",
    "temperature",
    "unit",
    "zero",
    "start",
    "tunnelling",
    "standard_state",
    "coreactants",
    "states",
    "ts",
    "path",
    "observed",
    "uncertainty",
    "variant",
    "figure",
];
const STATE_KEYS: [&str; 9] = [
    "g", "h", "s", "label", "product", "species", "with", "sigma", "column",
];
const TS_KEYS: [&str; 9] = [
    "g",
    "h",
    "s",
    "label",
    "species",
    "imaginary_frequency",
    "kappa",
    "sigma",
    "column",
];
const UNCERTAINTY_KEYS: [&str; 5] = ["sigma", "systematic", "samples", "seed", "level"];
const PATH_KEYS: [&str; 7] = ["name", "via", "cycle", "colour", "color", "dash", "width"];
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
    /// `species`: separate molecules in this state (standard-state correction).
    pub species: Option<u32>,
    /// `with`: free co-reactants present in this state.
    pub with: Vec<Located>,
    /// `imaginary_frequency` in cm⁻¹ (magnitude).
    pub imaginary_frequency: Option<f64>,
    /// `kappa`: explicit transmission coefficient.
    pub kappa: Option<f64>,
    /// `sigma`: this point's energy uncertainty, in the file's unit.
    pub sigma: Option<f64>,
    /// `column`: the figure column it is pinned to (0-based), with where.
    pub column: Option<(usize, Range<usize>)>,
}

/// The `[uncertainty]` table as written.
#[derive(Debug, Clone, Default)]
pub(crate) struct RawUncertainty {
    pub sigma: Option<f64>,
    pub systematic: Option<f64>,
    pub samples: Option<usize>,
    pub seed: Option<u64>,
    pub level: Option<f64>,
}

/// One `[[path]]` table.
#[derive(Debug, Clone)]
pub(crate) struct RawPath {
    pub name: Option<Located>,
    /// `None` when `via` is missing or unreadable (already reported).
    pub via: Option<Vec<Located>>,
    /// `cycle = true`: one turnover of a catalytic cycle, with where it is written.
    pub cycle: Option<(bool, Range<usize>)>,
    /// `colour`, `dash`, `width`: how the path is drawn.
    pub style: crate::model::PathStyle,
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
    /// `tunnelling`: the correction to apply to TSs with an imaginary frequency.
    pub tunnelling: Option<crate::model::Tunnelling>,
    /// `standard_state`: the pressure standard state of the energies, if not 1 mol/L.
    pub standard_state: Option<crate::kinetics::corrections::PressureStandard>,
    /// `[coreactants]`: name → concentration in mol/L, with where each is written.
    pub coreactants: Vec<(Located, f64)>,
    /// `[[variant]]`: changed copies of the mechanism, not yet resolved.
    pub variants: Vec<crate::profile::variant::RawVariant>,
    /// `[uncertainty]`, when present.
    pub uncertainty: Option<RawUncertainty>,
    /// `[[observed]]`: measurements, not yet resolved.
    pub observed: Vec<crate::profile::observed::RawObservation>,
    /// Where `[states]` is written, for file-wide warnings.
    pub states_span: Option<Range<usize>>,
    pub points: Vec<RawPoint>,
    pub paths: Vec<RawPath>,
    /// Whether any `path` key was present (even if unreadable).
    pub has_path_key: bool,
    /// `[figure]`: spacing and bar width.
    pub figure: crate::profile::figure::RawFigure,
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
            "tunnelling" => raw.tunnelling = read_tunnelling(value, errors),
            "standard_state" => raw.standard_state = read_standard_state(value, errors),
            "coreactants" => raw.coreactants = read_coreactants(value, errors),
            "observed" => raw.observed = crate::profile::observed::read(value, errors),
            "uncertainty" => raw.uncertainty = read_uncertainty(value, errors),
            "variant" => raw.variants = crate::profile::variant::read(value, errors),
            "figure" => raw.figure = crate::profile::figure::read_table(value, errors),
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

pub(crate) fn read_temperature(
    value: &Value<'_>,
    errors: &mut Vec<Diagnostic>,
) -> Option<Temperature> {
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
        species: None,
        with: Vec::new(),
        imaginary_frequency: None,
        kappa: None,
        sigma: None,
        column: None,
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
                    ("species", _) => point.species = read_species(v, &id, errors),
                    ("with", Kind::Minimum) => {
                        point.with = read_id_list(v, "with", "with = \"water\"", errors).unwrap_or_default()
                    }
                    ("imaginary_frequency", Kind::TransitionState) => {
                        point.imaginary_frequency = read_frequency(v, &id, errors)
                    }
                    ("kappa", Kind::TransitionState) => point.kappa = read_kappa(v, &id, errors),
                    ("sigma", _) => point.sigma = non_negative(v, &format!("sigma of '{id}'"), errors),
                    ("column", _) => point.column = crate::profile::figure::read_column(v, &id, errors),
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
        style: crate::model::PathStyle::default(),
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
            _ if crate::profile::figure::read_path_key(k, v, number, &mut path.style, errors) => {}
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

fn read_tunnelling(
    value: &Value<'_>,
    errors: &mut Vec<Diagnostic>,
) -> Option<crate::model::Tunnelling> {
    use crate::model::Tunnelling;
    let text = fields::string(value, "tunnelling", "tunnelling = \"wigner\"", errors)?;
    match text.trim().to_ascii_lowercase().as_str() {
        "none" => Some(Tunnelling::None),
        "wigner" => Some(Tunnelling::Wigner),
        "bell" => Some(Tunnelling::Bell),
        _ => {
            errors.push(
                Diagnostic::error(value.span(), format!("unknown tunnelling correction '{text}'"))
                    .with_help("use \"wigner\", \"bell\" or \"none\" (each TS then needs its imaginary_frequency)"),
            );
            None
        }
    }
}

fn read_standard_state(
    value: &Value<'_>,
    errors: &mut Vec<Diagnostic>,
) -> Option<crate::kinetics::corrections::PressureStandard> {
    use crate::kinetics::corrections::PressureStandard;
    let text = fields::string(
        value,
        "standard_state",
        "standard_state = \"1 atm\"",
        errors,
    )?;
    let t: String = text
        .to_ascii_lowercase()
        .chars()
        .filter(|c| !c.is_whitespace())
        .collect();
    match t.as_str() {
        "1atm" | "atm" => Some(PressureStandard::Atmosphere),
        "1bar" | "bar" => Some(PressureStandard::Bar),
        "1m" | "1mol/l" | "m" | "mol/l" => None,
        _ => {
            errors.push(
                Diagnostic::error(value.span(), format!("unknown standard state '{text}'"))
                    .with_help("write the standard state your energies were computed at: \"1 atm\" (most gas-phase \
                                quantum-chemistry output), \"1 bar\", or \"1 M\" (no correction)"),
            );
            None
        }
    }
}

fn read_coreactants(value: &Value<'_>, errors: &mut Vec<Diagnostic>) -> Vec<(Located, f64)> {
    let DeValue::Table(table) = value.get_ref() else {
        errors.push(
            Diagnostic::error(value.span(), format!("[coreactants] must be a table, found {}", fields::kind_of(value.get_ref())))
                .with_help("list each co-reactant with its concentration in mol/L:\n[coreactants]\nwater = 0.5"),
        );
        return Vec::new();
    };
    let mut out = Vec::new();
    for (k, v) in fields::entries(table) {
        let name = k.get_ref().to_string();
        let what = format!("the concentration of '{name}'");
        let c = match v.get_ref() {
            DeValue::String(s) => {
                let t = s.trim();
                let number = t
                    .strip_suffix("mol/L")
                    .or_else(|| t.strip_suffix("M"))
                    .unwrap_or(t)
                    .trim()
                    .parse::<f64>()
                    .ok();
                if number.is_none() {
                    errors.push(
                        Diagnostic::error(v.span(), format!("cannot read {what}: '{s}'"))
                            .with_help(format!(
                                "write a number in mol/L, e.g. {name} = 0.5 or {name} = \"0.5 M\""
                            )),
                    );
                }
                number
            }
            _ => fields::finite_number(v, &what, errors),
        };
        let Some(c) = c else { continue };
        if !(c.is_finite() && c > 0.0) {
            errors.push(
                Diagnostic::error(v.span(), format!("{what} must be above 0 mol/L, found {c}"))
                    .with_help("give the concentration during the reaction in mol/L, e.g. 0.5"),
            );
            continue;
        }
        out.push((
            Located {
                text: name,
                span: k.span(),
            },
            c,
        ));
    }
    out
}

fn read_species(value: &Value<'_>, id: &str, errors: &mut Vec<Diagnostic>) -> Option<u32> {
    let n = fields::finite_number(value, &format!("species of '{id}'"), errors)?;
    if (1.0..=100.0).contains(&n) && n.fract() == 0.0 {
        Some(n as u32)
    } else {
        errors.push(
            Diagnostic::error(value.span(), format!("species of '{id}' must be a whole number from 1, found {n}"))
                .with_help("count the separate molecules this state stands for, e.g. species = 2 for \"catalyst + substrate\""),
        );
        None
    }
}

fn read_frequency(value: &Value<'_>, id: &str, errors: &mut Vec<Diagnostic>) -> Option<f64> {
    let what = format!("the imaginary frequency of '{id}'");
    let nu = match value.get_ref() {
        DeValue::String(s) => {
            let t = s
                .trim()
                .trim_end_matches("cm-1")
                .trim_end_matches("cm⁻¹")
                .trim();
            let t = t.strip_suffix('i').unwrap_or(t).trim();
            match t.parse::<f64>() {
                Ok(v) if v.is_finite() => v,
                _ => {
                    errors.push(
                        Diagnostic::error(value.span(), format!("cannot read {what}: '{s}'"))
                            .with_help("write the wavenumber in cm⁻¹, e.g. imaginary_frequency = 1250 (or \"1250i\")"),
                    );
                    return None;
                }
            }
        }
        _ => fields::finite_number(value, &what, errors)?,
    };
    let nu = nu.abs();
    if nu == 0.0 || nu > 5000.0 {
        errors.push(
            Diagnostic::error(
                value.span(),
                format!("{what} is {nu} cm⁻¹, outside 0–5000 cm⁻¹"),
            )
            .with_help(
                "give the magnitude of the TS's single imaginary frequency in cm⁻¹, e.g. 1250",
            ),
        );
        return None;
    }
    Some(nu)
}

fn read_kappa(value: &Value<'_>, id: &str, errors: &mut Vec<Diagnostic>) -> Option<f64> {
    let k = fields::finite_number(value, &format!("kappa of '{id}'"), errors)?;
    if k > 0.0 {
        Some(k)
    } else {
        errors.push(
            Diagnostic::error(value.span(), format!("kappa of '{id}' must be above 0, found {k}"))
                .with_help("the transmission coefficient multiplies the Eyring rate; 1 means none, e.g. kappa = 0.5"),
        );
        None
    }
}

/// A finite number ≥ 0, or an error at the value.
fn non_negative(value: &Value<'_>, what: &str, errors: &mut Vec<Diagnostic>) -> Option<f64> {
    let x = fields::finite_number(value, what, errors)?;
    if x >= 0.0 {
        Some(x)
    } else {
        errors.push(
            Diagnostic::error(
                value.span(),
                format!("{what} must not be negative, found {x}"),
            )
            .with_help(
                "an uncertainty is a standard deviation in the file's unit, e.g. sigma = 1.5",
            ),
        );
        None
    }
}

fn read_uncertainty(value: &Value<'_>, errors: &mut Vec<Diagnostic>) -> Option<RawUncertainty> {
    let example = "sigma = 1.5\nsamples = 10000\nseed = 1";
    let table = fields::section(value, "uncertainty", example, errors)?;
    let mut u = RawUncertainty::default();
    for (k, v) in fields::entries(table) {
        match k.get_ref().as_ref() {
            "sigma" => u.sigma = non_negative(v, "sigma", errors),
            "systematic" => u.systematic = non_negative(v, "systematic", errors),
            "samples" => {
                let n = fields::finite_number(v, "samples", errors);
                match n {
                    Some(n) if (10.0..=1e8).contains(&n) && n.fract() == 0.0 => {
                        u.samples = Some(n as usize)
                    }
                    Some(n) => errors.push(
                        Diagnostic::error(
                            v.span(),
                            format!(
                                "samples must be a whole number from 10 to 100 000 000, found {n}"
                            ),
                        )
                        .with_help(
                            "10 000 gives intervals good to about a percent; e.g. samples = 10000",
                        ),
                    ),
                    None => {}
                }
            }
            "seed" => {
                let n = fields::finite_number(v, "seed", errors);
                match n {
                    Some(n) if n >= 0.0 && n.fract() == 0.0 && n < 9.0e15 => u.seed = Some(n as u64),
                    Some(n) => errors.push(
                        Diagnostic::error(v.span(), format!("seed must be a whole number ≥ 0, found {n}"))
                            .with_help("any whole number; the same seed gives the same intervals, e.g. seed = 1"),
                    ),
                    None => {}
                }
            }
            "level" => {
                let x = fields::finite_number(v, "level", errors);
                match x {
                    Some(x) if x > 0.0 && x < 1.0 => u.level = Some(x),
                    Some(x) => errors.push(
                        Diagnostic::error(
                            v.span(),
                            format!("level must lie between 0 and 1, found {x}"),
                        )
                        .with_help("the central probability of the intervals, e.g. level = 0.95"),
                    ),
                    None => {}
                }
            }
            _ => errors.push(fields::unknown_key(
                k,
                "in [uncertainty]",
                &UNCERTAINTY_KEYS,
            )),
        }
    }
    Some(u)
}
