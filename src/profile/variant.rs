//! `[[variant]]`: the same mechanism with some energies changed — an
//! isotopologue, another catalyst or solvent — without copying the file.
//! Changes are given as new energies (`g`), as shifts (`shift`), or for a
//! primary H/D isotope effect as the zero-point energy lost with one C–H
//! stretch at the listed transition states (`zpe`).

use std::ops::Range;

use toml::de::{DeTable, DeValue};

use crate::diag::Diagnostic;
use crate::model::{Kind, Variant};
use crate::profile::document::RawPoint;
use crate::profile::fields::{self, Value};
use crate::units::{AVOGADRO, EnergyUnit, PLANCK, SPEED_OF_LIGHT};

const KEYS: [&str; 5] = ["name", "label", "g", "shift", "zpe"];
const ZPE_KEYS: [&str; 2] = ["ts", "stretch"];

/// Atomic masses in u (NIST, AME2016): ¹²C, ¹H, ²H.
const MASS_C: f64 = 12.0;
const MASS_H: f64 = 1.007_825_032_23;
const MASS_D: f64 = 2.014_101_778_12;

/// One change as written: the id, where it is, and the kind of change.
#[derive(Debug, Clone)]
enum Change {
    /// A new free energy (file unit).
    G(f64),
    /// A shift of the energy (file unit).
    Shift(f64),
    /// A shift by the zero-point energy of one C–H stretch (cm⁻¹) replaced by C–D.
    Zpe(f64),
}

/// One `[[variant]]` table as written.
#[derive(Debug, Clone)]
pub(crate) struct RawVariant {
    name: Option<(String, Range<usize>)>,
    /// Legend text for figures.
    label: Option<String>,
    span: Range<usize>,
    changes: Vec<(String, Range<usize>, Change)>,
}

/// ΔZPE of replacing one C–H stretch of wavenumber ν_H (cm⁻¹) by C–D, in J/mol:
/// ½·h·c·(ν_H − ν_D)·NA with ν_D = ν_H·√(μ_CH/μ_CD) (harmonic oscillator,
/// reduced masses from the atomic masses; Westheimer, Chem. Rev. 1961, 61, 265).
pub fn zero_point_difference(stretch_cm: f64) -> f64 {
    let nu_d = deuterium_stretch(stretch_cm);
    0.5 * PLANCK * SPEED_OF_LIGHT * 100.0 * (stretch_cm - nu_d) * AVOGADRO
}

/// The C–D stretch (cm⁻¹) of a C–H stretch ν_H: ν_H·√(μ_CH/μ_CD).
pub fn deuterium_stretch(stretch_cm: f64) -> f64 {
    let mu = |m: f64| MASS_C * m / (MASS_C + m);
    stretch_cm * (mu(MASS_H) / mu(MASS_D)).sqrt()
}

/// Reads the `variant` array of tables.
pub(crate) fn read(value: &Value<'_>, errors: &mut Vec<Diagnostic>) -> Vec<RawVariant> {
    let help = "write each variant as its own table, e.g.\n[[variant]]\nname = \"D\"\nzpe = { ts = \"ts-h\", stretch = 2900 }";
    fields::array_of_tables(value, "variant", help, errors)
        .into_iter()
        .enumerate()
        .map(|(i, (table, span))| read_one(table, span, i + 1, errors))
        .collect()
}

fn read_one(
    table: &DeTable<'_>,
    span: Range<usize>,
    number: usize,
    errors: &mut Vec<Diagnostic>,
) -> RawVariant {
    let mut v = RawVariant {
        name: None,
        label: None,
        span,
        changes: Vec::new(),
    };
    for (k, val) in fields::entries(table) {
        match k.get_ref().as_ref() {
            "name" => {
                v.name = fields::string(val, "the variant name", "name = \"D\"", errors)
                    .map(|s| (s.to_string(), val.span()))
            }
            "label" => {
                v.label = fields::string(val, "the variant label", "label = \"C–D\"", errors)
                    .map(str::to_string)
            }
            key @ ("g" | "shift") => {
                let DeValue::Table(t) = val.get_ref() else {
                    errors.push(
                        Diagnostic::error(
                            val.span(),
                            format!(
                                "{key} must be a table of ids, found {}",
                                fields::kind_of(val.get_ref())
                            ),
                        )
                        .with_help(format!("e.g. {key} = {{ ts-1 = 21.3 }}")),
                    );
                    continue;
                };
                for (id, x) in fields::entries(t) {
                    let what = format!("the {key} of '{}' in variant {number}", id.get_ref());
                    if let Some(x) = fields::finite_number(x, &what, errors) {
                        let change = if key == "g" {
                            Change::G(x)
                        } else {
                            Change::Shift(x)
                        };
                        v.changes
                            .push((id.get_ref().to_string(), id.span(), change));
                    }
                }
            }
            "zpe" => read_zpe(val, &mut v, errors),
            _ => errors.push(fields::unknown_key(
                k,
                &format!("in variant {number}"),
                &KEYS,
            )),
        }
    }
    v
}

fn read_zpe(value: &Value<'_>, v: &mut RawVariant, errors: &mut Vec<Diagnostic>) {
    let help =
        "e.g. zpe = { ts = \"ts-h\", stretch = 2900 }: the C–H stretch (cm⁻¹) lost at that TS";
    let DeValue::Table(t) = value.get_ref() else {
        errors.push(Diagnostic::error(value.span(), "zpe must be a table").with_help(help));
        return;
    };
    let mut ids = Vec::new();
    let mut stretch = None;
    for (k, x) in fields::entries(t) {
        match k.get_ref().as_ref() {
            "ts" => match x.get_ref() {
                DeValue::String(s) => ids.push((s.to_string(), x.span())),
                DeValue::Array(items) => {
                    for i in items.iter() {
                        if let Some(s) = fields::string(i, "each TS id", "\"ts-h\"", errors) {
                            ids.push((s.to_string(), i.span()));
                        }
                    }
                }
                other => errors.push(
                    Diagnostic::error(
                        x.span(),
                        format!(
                            "ts must be an id or a list of ids, found {}",
                            fields::kind_of(other)
                        ),
                    )
                    .with_help(help),
                ),
            },
            "stretch" => {
                stretch = fields::finite_number(x, "the C–H stretch", errors);
                if let Some(s) = stretch
                    && !(500.0..=5000.0).contains(&s)
                {
                    errors.push(
                        Diagnostic::error(
                            x.span(),
                            format!("the C–H stretch {s} cm⁻¹ is outside 500–5000 cm⁻¹"),
                        )
                        .with_help("C–H stretches lie near 2800–3100 cm⁻¹, e.g. stretch = 2900"),
                    );
                    stretch = None;
                }
            }
            _ => errors.push(fields::unknown_key(k, "in zpe", &ZPE_KEYS)),
        }
    }
    match stretch {
        Some(s) => {
            for (id, span) in ids {
                v.changes.push((id, span, Change::Zpe(s)));
            }
        }
        None if !t.iter().any(|(k, _)| k.get_ref().as_ref() == "stretch") => errors.push(
            Diagnostic::error(value.span(), "zpe needs the stretch that is lost").with_help(help),
        ),
        None => {}
    }
}

/// Resolves ids and turns every change into a shift in the file's unit. `g`
/// gives the energy each point has at the file's temperature (h/s points too).
pub(crate) fn resolve(
    raw: Vec<RawVariant>,
    points: &[RawPoint],
    unit: Option<EnergyUnit>,
    errors: &mut Vec<Diagnostic>,
) -> Vec<Variant> {
    let Some(unit) = unit else { return Vec::new() };
    let mut out: Vec<Variant> = Vec::new();
    for (n, v) in raw.into_iter().enumerate() {
        let name = match v.name {
            Some((name, span)) => {
                if out.iter().any(|o| o.name == name) {
                    errors.push(
                        Diagnostic::error(span, format!("two variants are named '{name}'"))
                            .with_help("give each variant its own name"),
                    );
                }
                name
            }
            None => {
                errors.push(
                    Diagnostic::error(v.span.clone(), format!("variant {} has no name", n + 1))
                        .with_help(
                            "add name = \"…\"; reports and kind = \"kie\" observations use it",
                        ),
                );
                format!("variant {}", n + 1)
            }
        };
        let mut shifts = Vec::new();
        for (id, span, change) in v.changes {
            let Some(i) = points.iter().position(|p| p.id == id) else {
                let item = crate::profile::document::Located { text: id, span };
                errors.push(crate::profile::network::unknown_id(&item, points));
                continue;
            };
            let shift = match change {
                Change::G(g) => points[i].g.map(|g0| g - g0),
                Change::Shift(d) => Some(d),
                Change::Zpe(stretch) => {
                    if points[i].kind != Kind::TransitionState {
                        errors.push(
                            Diagnostic::error(
                                span,
                                format!("zpe applies to transition states; '{id}' is a state"),
                            )
                            .with_help("list the TS at which the C–H bond is broken"),
                        );
                        continue;
                    }
                    Some(unit.from_j_per_mol(zero_point_difference(stretch)))
                }
            };
            if let Some(d) = shift {
                shifts.push((i, d));
            }
        }
        out.push(Variant {
            name,
            label: v.label,
            shifts,
        });
    }
    out
}
