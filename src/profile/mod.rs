//! Reads profile text (TOML) into a validated [`crate::model::Model`].
//!
//! The stage runs in four passes, each in its own module, and every pass
//! keeps going after a problem so the user sees all of them at once:
//!
//! 1. [`syntax`] — TOML text to a spanned tree (or located syntax errors);
//! 2. [`document`] — keys and value types, into plain records with spans;
//! 3. [`network`] — unique ids, path shapes, steps and products;
//! 4. [`energy`] — plausibility of the energies and the shift to `zero`.
//!
//! No file I/O happens here: the caller reads the file and renders the
//! diagnostics with [`crate::diag::Source`].

mod document;
mod energy;
mod fields;
mod figure;
mod network;
mod observed;
mod suggest;
mod syntax;
mod variant;

use crate::diag::Diagnostic;
use crate::model::{Kind, Model, Path, Point, Thermo};
use crate::units::Temperature;

pub use document::DEFAULT_TEMPERATURE_K;
pub use variant::{deuterium_stretch, zero_point_difference};

/// A profile that passed validation, with the warnings it raised.
#[derive(Debug, Clone)]
pub struct Parsed {
    /// The validated model.
    pub model: Model,
    /// Chemically odd but usable input (sorted by position in the file).
    pub warnings: Vec<Diagnostic>,
}

/// Parses and validates profile text. `Err` holds every error found (and any
/// warnings), sorted by span start.
pub fn parse(text: &str) -> Result<Parsed, Vec<Diagnostic>> {
    let root = syntax::parse_toml(text).map_err(sorted)?;
    let mut errors = Vec::new();
    let mut warnings = Vec::new();

    let mut raw = document::read(&root, &mut errors);
    // Points given as h and s get g = h − T·s at the file's temperature, so the
    // checks below see the free energies that will be used.
    let t_file = raw.temperature.map_or(DEFAULT_TEMPERATURE_K, |t| t.k());
    if let Some((unit, _)) = raw.unit {
        for p in &mut raw.points {
            if let Some((h, s)) = p.hs {
                p.g = Some(h - t_file * unit.entropy_per_kelvin(s));
            }
        }
    }
    let points = network::unique_points(raw.points, &mut errors);
    let states_broken = errors
        .iter()
        .any(|d| Some(&d.span) == raw.states_span.as_ref());
    if !points.iter().any(|p| p.kind == Kind::Minimum) && !states_broken {
        let span = raw.states_span.clone().unwrap_or(fields::file_start());
        errors.push(
            Diagnostic::error(span, "the profile has no states (minima)")
                .with_help("list reactants, intermediates and products under [states], e.g.\n[states]\nstart = 0.0\nproduct = -12.0"),
        );
    }
    if raw.paths.is_empty() && !raw.has_path_key {
        errors.push(Diagnostic::error(fields::file_start(), "the profile has no [[path]]").with_help(
            "add at least one path, the chain of ids from a minimum through transition states to a minimum, e.g.\n\
             [[path]]\nname = \"main\"\nvia  = [\"start\", \"ts-1\", \"product\"]",
        ));
    }
    let (paths, paths_ok) = network::resolve_paths(&points, &raw.paths, &mut errors);
    figure::check_pins(&points, &paths, &mut errors);
    let zero = energy::resolve_zero(raw.zero.as_ref(), &points, &mut errors);
    let start = network::resolve_start(raw.start.as_deref().unwrap_or(&[]), &points, &mut errors);
    let variants = variant::resolve(
        std::mem::take(&mut raw.variants),
        &points,
        raw.unit.as_ref().map(|(u, _)| *u),
        &mut errors,
    );
    let observations = observed::resolve(
        std::mem::take(&mut raw.observed),
        &points,
        &paths,
        &variants,
        raw.unit.as_ref().map(|(u, _)| *u),
        &mut errors,
    );
    let extras = network::resolve_extras(
        &points,
        &raw.coreactants,
        raw.tunnelling.unwrap_or_default(),
        &mut errors,
        &mut warnings,
    );

    let steps = network::derive_steps(&paths, &points);
    let products = network::products(&paths, &points);
    // File-wide warnings only make sense once every path was understood.
    if paths_ok && !paths.is_empty() {
        unused_points(&points, &paths, &mut warnings);
        if !products.iter().any(|&p| p) && !points.is_empty() {
            let span = raw.states_span.clone().unwrap_or(fields::file_start());
            warnings.push(
                Diagnostic::warning(span, "no state is a product: every state that ends a path also starts one")
                    .with_help("mark the product state with product = true, e.g. prod = { g = -10.0, product = true }"),
            );
        }
    }

    // Energies are checked only when every one was readable and a unit is known.
    let g: Option<Vec<f64>> = points.iter().map(|p| p.g).collect();
    let reference = zero
        .or_else(|| paths.first().map(|p| p.via[0]))
        .or_else(|| points.iter().position(|p| p.kind == Kind::Minimum));
    let shifted = match (&g, &raw.unit, reference) {
        (Some(g), Some((unit, unit_span)), Some(reference)) => {
            let shifted = energy::check_and_shift(
                g,
                &points,
                (*unit, unit_span.clone()),
                zero,
                reference,
                &mut errors,
                &mut warnings,
            );
            energy::ts_below_minimum(&steps, &points, g, *unit, &mut warnings);
            Some(shifted)
        }
        _ => None,
    };

    let (Some(shifted), Some((unit, _)), true) = (shifted, raw.unit, errors.is_empty()) else {
        if errors.is_empty() {
            // Unreachable by construction; never panic, say so instead.
            errors.push(Diagnostic::error(
                fields::file_start(),
                "the profile could not be read completely",
            ));
        }
        errors.extend(warnings);
        return Err(sorted(errors));
    };
    let temperature = raw
        .temperature
        .or_else(|| Temperature::kelvin(DEFAULT_TEMPERATURE_K));
    let Some(temperature) = temperature else {
        return Err(vec![Diagnostic::error(
            fields::file_start(),
            "no usable temperature",
        )]);
    };
    let model_points = points
        .iter()
        .enumerate()
        .map(|(i, p)| Point {
            id: p.id.clone(),
            label: p.label.clone().unwrap_or_else(|| p.id.clone()),
            kind: p.kind,
            g: shifted[i],
            product: products[i],
        })
        .collect();
    let thermo = points
        .iter()
        .zip(&g.unwrap_or_default())
        .map(|(p, &g)| match p.hs {
            Some((h, s)) => Thermo::Enthalpy {
                h,
                s: unit.entropy_per_kelvin(s),
            },
            None => Thermo::Fixed(g),
        })
        .collect();
    let uncertainty =
        (raw.uncertainty.is_some() || points.iter().any(|p| p.sigma.is_some())).then(|| {
            let u = raw.uncertainty.clone().unwrap_or_default();
            let default = u.sigma.unwrap_or(0.0);
            crate::model::Uncertainty {
                sigma: points.iter().map(|p| p.sigma.unwrap_or(default)).collect(),
                systematic: u.systematic.unwrap_or(0.0),
                samples: u.samples.unwrap_or(10_000),
                seed: u.seed.unwrap_or(1),
                level: u.level.unwrap_or(0.95),
            }
        });
    let figure = crate::model::FigureHints {
        paths: paths.iter().map(|p| p.style).collect(),
        columns: points
            .iter()
            .map(|p| p.column.as_ref().map(|c| c.0))
            .collect(),
        spacing: raw.figure.spacing,
        bar_width_mm: raw.figure.bar_width_mm,
    };
    let model = Model {
        title: raw.title,
        temperature,
        unit,
        zero,
        points: model_points,
        steps,
        paths: paths
            .into_iter()
            .map(|p| Path {
                name: p.name,
                via: p.via,
                cycle: p.cycle,
            })
            .collect(),
        start,
        thermo,
        extras,
        tunnelling: raw.tunnelling.unwrap_or_default(),
        standard_state: raw.standard_state,
        observations,
        uncertainty,
        offsets: Vec::new(),
        variants,
        figure,
    };
    let mut model = model;
    model.refresh();
    Ok(Parsed {
        model,
        warnings: sorted(warnings),
    })
}

fn unused_points(
    points: &[document::RawPoint],
    paths: &[network::ResolvedPath],
    warnings: &mut Vec<Diagnostic>,
) {
    for (i, p) in points.iter().enumerate() {
        if paths.iter().any(|path| path.via.contains(&i)) {
            continue;
        }
        let noun = match p.kind {
            Kind::Minimum => "state",
            Kind::TransitionState => "transition state",
        };
        warnings.push(
            Diagnostic::warning(p.id_span.clone(), format!("{noun} '{}' is on no path", p.id))
                .with_help("add it to the via list of a [[path]], or delete it if it is not part of the mechanism; it is left out of steps and figures"),
        );
    }
}

/// Diagnostics in file order (stable, so equal positions keep their order).
fn sorted(mut diagnostics: Vec<Diagnostic>) -> Vec<Diagnostic> {
    diagnostics.sort_by_key(|d| (d.span.start, d.span.end));
    diagnostics
}

#[cfg(test)]
mod tests;
