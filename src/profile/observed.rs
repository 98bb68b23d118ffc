//! `[[observed]]`: measurements stated in the profile, read with spans and
//! resolved to the model's products, paths, transition states and cycles.

use std::ops::Range;

use toml::de::{DeTable, DeValue};

use crate::diag::Diagnostic;
use crate::model::{Kind, Observation, ObservedKind, Target};
use crate::profile::document::{Located, RawPoint};
use crate::profile::fields::{self, Value};
use crate::profile::network::ResolvedPath;
use crate::profile::suggest;
use crate::units::{EnergyUnit, Temperature};

const KEYS: [&str; 11] = [
    "kind",
    "name",
    "products",
    "path",
    "ts",
    "cycle",
    "value",
    "uncertainty",
    "tolerance",
    "temperature",
    "variant",
];
const KINDS: [&str; 6] = ["ratio", "ee", "rate", "half-life", "tof", "kie"];

/// Default tolerance when a measurement gives none: 1 kcal/mol, about the
/// accuracy of a good DFT barrier (common practice).
pub(crate) const DEFAULT_TOLERANCE_KCAL: f64 = 1.0;

/// One `[[observed]]` table as written.
#[derive(Debug, Clone, Default)]
pub(crate) struct RawObservation {
    span: Range<usize>,
    kind: Option<(ObservedKind, Range<usize>)>,
    name: Option<String>,
    products: Option<Vec<Located>>,
    path: Option<Located>,
    ts: Option<Located>,
    cycle: Option<Located>,
    value: Option<(f64, Range<usize>)>,
    uncertainty: Option<f64>,
    tolerance: Option<f64>,
    temperature: Option<Temperature>,
    variant: Option<Located>,
}

/// Reads the `observed` array of tables.
pub(crate) fn read(value: &Value<'_>, errors: &mut Vec<Diagnostic>) -> Vec<RawObservation> {
    let help = "write each measurement as its own table:\n[[observed]]\nkind = \"ratio\"\n\
                products = [\"pa\", \"pb\"]\nvalue = 4.0\ntolerance = 1.0";
    fields::array_of_tables(value, "observed", help, errors)
        .into_iter()
        .enumerate()
        .map(|(i, (table, span))| read_one(table, span, i + 1, errors))
        .collect()
}

fn located(
    value: &Value<'_>,
    what: &str,
    example: &str,
    errors: &mut Vec<Diagnostic>,
) -> Option<Located> {
    fields::string(value, what, example, errors).map(|s| Located {
        text: s.to_string(),
        span: value.span(),
    })
}

fn read_one(
    table: &DeTable<'_>,
    span: Range<usize>,
    number: usize,
    errors: &mut Vec<Diagnostic>,
) -> RawObservation {
    let mut o = RawObservation {
        span: span.clone(),
        ..Default::default()
    };
    let mut raw_value: Option<&Value<'_>> = None;
    let mut raw_uncertainty: Option<&Value<'_>> = None;
    for (k, v) in fields::entries(table) {
        match k.get_ref().as_ref() {
            "kind" => {
                let Some(text) = fields::string(v, "kind", "kind = \"ratio\"", errors) else {
                    continue;
                };
                o.kind = match text {
                    "ratio" | "dr" => Some(ObservedKind::Ratio),
                    "ee" | "de" => Some(ObservedKind::Ee),
                    "rate" => Some(ObservedKind::Rate),
                    "half-life" => Some(ObservedKind::HalfLife),
                    "tof" => Some(ObservedKind::Tof),
                    "kie" => Some(ObservedKind::Kie),
                    other => {
                        let hint = suggest::nearest(other, KINDS.iter().copied())
                            .map(|s| format!("did you mean '{s}'? "))
                            .unwrap_or_default();
                        errors.push(
                            Diagnostic::error(
                                v.span(),
                                format!("unknown kind of measurement '{other}'"),
                            )
                            .with_help(format!(
                                "{hint}use one of: ratio, ee, rate, half-life, tof, kie"
                            )),
                        );
                        None
                    }
                }
                .map(|kind| (kind, v.span()));
            }
            "name" => {
                o.name = fields::string(v, "the name", "name = \"ratio in THF\"", errors)
                    .map(str::to_string)
            }
            "products" => o.products = read_products(v, errors),
            "path" => o.path = located(v, "path", "path = \"stepwise\"", errors),
            "ts" => o.ts = located(v, "ts", "ts = \"ts-ion\"", errors),
            "cycle" => o.cycle = located(v, "cycle", "cycle = \"turnover\"", errors),
            "value" => raw_value = Some(v),
            "uncertainty" => raw_uncertainty = Some(v),
            "tolerance" => {
                o.tolerance = fields::finite_number(v, "the tolerance", errors);
                if let Some(t) = o.tolerance
                    && t < 0.0
                {
                    errors.push(
                        Diagnostic::error(v.span(), format!("the tolerance must not be negative, found {t}"))
                            .with_help("give the allowed error of the deciding energy in the file's unit, e.g. tolerance = 1.0"),
                    );
                    o.tolerance = None;
                }
            }
            "temperature" => o.temperature = crate::profile::document::read_temperature(v, errors),
            "variant" => o.variant = located(v, "variant", "variant = \"D\"", errors),
            _ => errors.push(fields::unknown_key(
                k,
                &format!("in observation {number}"),
                &KEYS,
            )),
        }
    }
    let kind = o.kind.as_ref().map(|(k, _)| *k);
    if let Some(v) = raw_value {
        o.value = read_value(v, kind, errors).map(|x| (x, v.span()));
    } else {
        errors.push(
            Diagnostic::error(span.clone(), format!("observation {number} has no value"))
                .with_help("add what was measured, e.g. value = 4.0 (a ratio 4:1), value = 92 (ee in %), value = \"2 h\" (a half-life)"),
        );
    }
    if let Some(v) = raw_uncertainty {
        o.uncertainty = read_value(v, kind, errors);
    }
    if o.kind.is_none() && !table.iter().any(|(k, _)| k.get_ref().as_ref() == "kind") {
        errors.push(
            Diagnostic::error(span, format!("observation {number} has no kind"))
                .with_help("say what was measured: kind = \"ratio\", \"ee\", \"rate\", \"half-life\" or \"tof\""),
        );
    }
    o
}

fn read_products(value: &Value<'_>, errors: &mut Vec<Diagnostic>) -> Option<Vec<Located>> {
    let help = "name the two products, first over second, e.g. products = [\"pa\", \"pb\"]";
    let DeValue::Array(items) = value.get_ref() else {
        errors.push(
            Diagnostic::error(
                value.span(),
                format!(
                    "products must be a list of two ids, found {}",
                    fields::kind_of(value.get_ref())
                ),
            )
            .with_help(help),
        );
        return None;
    };
    let ids: Option<Vec<Located>> = items
        .iter()
        .map(|i| located(i, "each product", "\"pa\"", errors))
        .collect();
    let ids = ids?;
    if ids.len() != 2 {
        errors.push(
            Diagnostic::error(
                value.span(),
                format!("products must name exactly two states, found {}", ids.len()),
            )
            .with_help(help),
        );
        return None;
    }
    Some(ids)
}

/// A measured value: a number, or for half-lives also a duration text.
fn read_value(
    value: &Value<'_>,
    kind: Option<ObservedKind>,
    errors: &mut Vec<Diagnostic>,
) -> Option<f64> {
    let x = match (value.get_ref(), kind) {
        (DeValue::String(s), Some(ObservedKind::HalfLife)) => {
            match crate::units::parse_duration_s(s) {
                Some(x) => x,
                None => {
                    errors.push(
                    Diagnostic::error(value.span(), format!("cannot read the half-life '{s}'"))
                        .with_help("write a duration, e.g. \"2 h\", \"30 min\", \"45 s\", \"3 d\", or a number of seconds"),
                );
                    return None;
                }
            }
        }
        _ => fields::finite_number(value, "the measured value", errors)?,
    };
    let ok = match kind {
        Some(ObservedKind::Ee) => x.abs() < 100.0,
        _ => x > 0.0,
    };
    if !ok {
        let help = match kind {
            Some(ObservedKind::Ee) => {
                "an ee (or de) lies between -100 and 100 % (exclusive); 100 % has no finite ratio"
            }
            _ => "ratios, rate constants, half-lives and TOFs are positive numbers",
        };
        errors.push(
            Diagnostic::error(
                value.span(),
                format!("the measured value {x} is out of range"),
            )
            .with_help(help),
        );
        return None;
    }
    Some(x)
}

/// Resolves the raw observations against points and paths.
pub(crate) fn resolve(
    raw: Vec<RawObservation>,
    points: &[RawPoint],
    paths: &[ResolvedPath],
    variants: &[crate::model::Variant],
    unit: Option<EnergyUnit>,
    errors: &mut Vec<Diagnostic>,
) -> Vec<Observation> {
    let mut out = Vec::new();
    for o in raw {
        // Targets are checked even when the value was unreadable, so every
        // problem of the table is reported in one pass.
        let Some((kind, kind_span)) = o.kind else {
            continue;
        };
        let point = |l: &Located, errors: &mut Vec<Diagnostic>| -> Option<usize> {
            let found = points.iter().position(|p| p.id == l.text);
            if found.is_none() {
                errors.push(crate::profile::network::unknown_id(l, points));
            }
            found
        };
        let path_index = |l: &Located, errors: &mut Vec<Diagnostic>| -> Option<usize> {
            match paths.iter().position(|p| p.name == l.text) {
                Some(i) => Some(i),
                None => {
                    let help =
                        match suggest::nearest(&l.text, paths.iter().map(|p| p.name.as_str())) {
                            Some(s) => format!("did you mean '{s}'?"),
                            None => "use the name of a [[path]]".into(),
                        };
                    errors.push(
                        Diagnostic::error(l.span.clone(), format!("no path is named '{}'", l.text))
                            .with_help(help),
                    );
                    None
                }
            }
        };
        let target = match kind {
            ObservedKind::Ratio | ObservedKind::Ee => {
                let Some(ids) = &o.products else {
                    errors.push(
                        Diagnostic::error(
                            kind_span,
                            format!("a measured {} needs the two products", kind.name()),
                        )
                        .with_help("add products = [\"pa\", \"pb\"], first over second"),
                    );
                    continue;
                };
                let (Some(a), Some(b)) = (point(&ids[0], errors), point(&ids[1], errors)) else {
                    continue;
                };
                for (i, l) in [(a, &ids[0]), (b, &ids[1])] {
                    if points[i].kind != Kind::Minimum {
                        errors.push(
                            Diagnostic::error(
                                l.span.clone(),
                                format!("'{}' is a transition state, not a product", l.text),
                            )
                            .with_help("name the two product states from [states]"),
                        );
                    }
                }
                if a == b {
                    errors.push(
                        Diagnostic::error(
                            ids[1].span.clone(),
                            "the two products are the same state",
                        )
                        .with_help("name two different products"),
                    );
                    continue;
                }
                Target::Products(a, b)
            }
            ObservedKind::Rate | ObservedKind::HalfLife | ObservedKind::Kie => {
                match (&o.path, &o.ts) {
                    (Some(p), None) => match path_index(p, errors) {
                        Some(i) => Target::Path(i),
                        None => continue,
                    },
                    (None, Some(t)) => match point(t, errors) {
                        Some(i) if points[i].kind == Kind::TransitionState => Target::Ts(i),
                        Some(_) => {
                            errors.push(
                            Diagnostic::error(t.span.clone(), format!("'{}' is a state, not a transition state", t.text))
                                .with_help("name the TS of the step that was measured, or use path = \"…\""),
                        );
                            continue;
                        }
                        None => continue,
                    },
                    _ => {
                        errors.push(
                        Diagnostic::error(kind_span, format!("a measured {} needs either path or ts (not both)", kind.name()))
                            .with_help("path = \"stepwise\" compares with the path's apparent rate; ts = \"ts-ion\" with the rate of that step"),
                    );
                        continue;
                    }
                }
            }
            ObservedKind::Tof => {
                let Some(c) = &o.cycle else {
                    errors.push(
                        Diagnostic::error(
                            kind_span,
                            "a measured tof needs the cycle it belongs to",
                        )
                        .with_help("add cycle = \"<name of a [[path]] with cycle = true>\""),
                    );
                    continue;
                };
                match path_index(c, errors) {
                    Some(i) if paths[i].cycle => Target::Cycle(i),
                    Some(_) => {
                        errors.push(
                            Diagnostic::error(
                                c.span.clone(),
                                format!("path '{}' is not a catalytic cycle", c.text),
                            )
                            .with_help(
                                "mark it with cycle = true, or compare a rate with kind = \"rate\"",
                            ),
                        );
                        continue;
                    }
                    None => continue,
                }
            }
        };
        let tolerance = o.tolerance.unwrap_or_else(|| {
            unit.map_or(DEFAULT_TOLERANCE_KCAL, |u| {
                EnergyUnit::KcalPerMol.convert(DEFAULT_TOLERANCE_KCAL, u)
            })
        });
        let variant = match (kind, &o.variant) {
            (ObservedKind::Kie, Some(v)) => match variants.iter().position(|x| x.name == v.text) {
                Some(i) => Some(i),
                None => {
                    let help =
                        match suggest::nearest(&v.text, variants.iter().map(|x| x.name.as_str())) {
                            Some(s) => format!("did you mean '{s}'?"),
                            None => {
                                "name a [[variant]] of this profile, e.g. the deuterated one".into()
                            }
                        };
                    errors.push(
                        Diagnostic::error(
                            v.span.clone(),
                            format!("no variant is named '{}'", v.text),
                        )
                        .with_help(help),
                    );
                    continue;
                }
            },
            (ObservedKind::Kie, None) => {
                errors.push(
                    Diagnostic::error(
                        kind_span,
                        "a measured kie needs the variant it compares with",
                    )
                    .with_help(
                        "add variant = \"D\" (a [[variant]] name): KIE = k(profile) / k(variant)",
                    ),
                );
                continue;
            }
            (_, Some(v)) => {
                errors.push(
                    Diagnostic::error(v.span.clone(), "variant applies to kind = \"kie\" only")
                        .with_help("remove it, or make the measurement a kie"),
                );
                continue;
            }
            (_, None) => None,
        };
        let Some((value, _)) = o.value else { continue };
        out.push(Observation {
            name: o.name,
            kind,
            target,
            value,
            uncertainty: o.uncertainty.map(f64::abs),
            tolerance,
            variant,
            temperature: o.temperature,
            span: o.span,
        });
    }
    out
}
