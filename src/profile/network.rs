//! How the points fit together: unique ids, paths that alternate minima and
//! transition states correctly, the elementary steps they imply, and which
//! states are products.

use std::collections::{HashMap, HashSet};
use std::ops::Range;

use crate::diag::Diagnostic;
use crate::model::{Kind, PointId, Step};
use crate::profile::document::{Located, RawPath, RawPoint};
use crate::profile::suggest;

/// A path whose ids all resolved and whose shape passed every check.
#[derive(Debug, Clone)]
pub(crate) struct ResolvedPath {
    pub name: String,
    pub via: Vec<PointId>,
    pub cycle: bool,
    /// How the file asks the path to be drawn.
    pub style: crate::model::PathStyle,
}

/// Orders the points as the model does (states, then transition states, each
/// in file order) and drops every repeated id after reporting it at the
/// repetition, pointing back at the first definition.
pub(crate) fn unique_points(mut raw: Vec<RawPoint>, errors: &mut Vec<Diagnostic>) -> Vec<RawPoint> {
    raw.sort_by_key(|p| p.id_span.start);
    let mut first: HashMap<String, (Range<usize>, Kind)> = HashMap::new();
    let mut kept = Vec::new();
    for point in raw {
        if let Some((span, kind)) = first.get(&point.id) {
            let (here, there) = (table_name(point.kind), table_name(*kind));
            errors.push(
                Diagnostic::error(
                    point.id_span.clone(),
                    format!("id '{}' is used twice, in {there} and in {here}", point.id),
                )
                .with_related(span.clone(), "first defined here")
                .with_help("every state and transition state needs its own id; rename one of them"),
            );
            continue;
        }
        first.insert(point.id.clone(), (point.id_span.clone(), point.kind));
        kept.push(point);
    }
    // Stable: file order within each kind.
    kept.sort_by_key(|p| p.kind == Kind::TransitionState);
    kept
}

fn table_name(kind: Kind) -> &'static str {
    match kind {
        Kind::Minimum => "[states]",
        Kind::TransitionState => "[ts]",
    }
}

/// Resolves every path's ids and checks its shape. Returns the paths that
/// passed, and whether all did (file-wide warnings are only meaningful then).
pub(crate) fn resolve_paths(
    points: &[RawPoint],
    raw: &[RawPath],
    errors: &mut Vec<Diagnostic>,
) -> (Vec<ResolvedPath>, bool) {
    let index: HashMap<&str, PointId> = points
        .iter()
        .enumerate()
        .map(|(i, p)| (p.id.as_str(), i))
        .collect();
    let mut all_ok = true;
    let mut names: HashMap<String, Range<usize>> = HashMap::new();
    // Each TS joins exactly one pair of minima: the first pair seen, and where.
    let mut joins: HashMap<PointId, ([PointId; 2], Range<usize>)> = HashMap::new();
    let mut resolved = Vec::new();
    for (n, path) in raw.iter().enumerate() {
        let name = match &path.name {
            Some(Located { text, span }) if text.trim().is_empty() => {
                errors.push(
                    Diagnostic::error(span.clone(), "a path name cannot be empty")
                        .with_help("give it a short name, e.g. name = \"stepwise\", or delete the line to get \"path N\""),
                );
                all_ok = false;
                format!("path {}", n + 1)
            }
            Some(Located { text, span }) => {
                if let Some(first) = names.get(text) {
                    errors.push(
                        Diagnostic::error(span.clone(), format!("two paths are named '{text}'"))
                            .with_related(first.clone(), "first used here")
                            .with_help("give each path its own name; the name labels the path in tables and figures"),
                    );
                    all_ok = false;
                } else {
                    names.insert(text.clone(), span.clone());
                }
                text.clone()
            }
            None => format!("path {}", n + 1),
        };
        let Some(via) = &path.via else {
            all_ok = false;
            continue;
        };
        let mut ids = Vec::with_capacity(via.len());
        for item in via {
            match index.get(item.text.as_str()) {
                Some(&i) => ids.push(i),
                None => errors.push(unknown_id(item, points)),
            }
        }
        if ids.len() != via.len() || !check_shape(&name, via, &ids, points, &mut joins, errors) {
            all_ok = false;
            continue;
        }
        let cycle = match path.cycle {
            Some((true, ref span)) => {
                if ids.first() == ids.last() {
                    errors.push(
                        Diagnostic::error(span.clone(), format!("cycle '{name}' starts and ends at the same state"))
                            .with_help("end the turnover at the regenerated catalyst with the product released: a state of its own, \
                                        lower than the first by the reaction free energy, e.g. cat-p = -12.0"),
                    );
                    all_ok = false;
                }
                true
            }
            _ => false,
        };
        resolved.push(ResolvedPath {
            name,
            via: ids,
            cycle,
            style: path.style,
        });
    }
    (resolved, all_ok)
}

pub(crate) fn unknown_id(item: &Located, points: &[RawPoint]) -> Diagnostic {
    let d = Diagnostic::error(
        item.span.clone(),
        format!("unknown id '{}': it is not in [states] or [ts]", item.text),
    );
    match suggest::nearest(&item.text, points.iter().map(|p| p.id.as_str())) {
        Some(s) => d.with_help(format!("did you mean '{s}'?")),
        None => d.with_help(format!(
            "add it to [states] (a minimum) or [ts] (a transition state), e.g. {} = 0.0",
            quote_key(&item.text)
        )),
    }
}

/// A TOML key as it must be written: bare when it only uses A-Z a-z 0-9 _ -.
fn quote_key(id: &str) -> String {
    if !id.is_empty()
        && id
            .chars()
            .all(|c| c.is_ascii_alphanumeric() || c == '_' || c == '-')
    {
        id.to_string()
    } else {
        format!("{id:?}")
    }
}

/// Checks one fully resolved chain. Reports each problem at the offending
/// element; returns whether the chain is usable.
fn check_shape(
    name: &str,
    via: &[Located],
    ids: &[PointId],
    points: &[RawPoint],
    joins: &mut HashMap<PointId, ([PointId; 2], Range<usize>)>,
    errors: &mut Vec<Diagnostic>,
) -> bool {
    let before = errors.len();
    let is_ts = |i: PointId| points[i].kind == Kind::TransitionState;
    let last = ids.len() - 1;
    if is_ts(ids[0]) {
        errors.push(
            Diagnostic::error(via[0].span.clone(), format!("path '{name}' starts with transition state '{}'", via[0].text))
                .with_help("a path runs from a minimum to a minimum; put the state the TS is reached from before it"),
        );
    }
    if is_ts(ids[last]) {
        errors.push(
            Diagnostic::error(
                via[last].span.clone(),
                format!(
                    "path '{name}' ends with transition state '{}'",
                    via[last].text
                ),
            )
            .with_help(
                "a path runs from a minimum to a minimum; add the state the TS leads to after it",
            ),
        );
    }
    for k in 1..ids.len() {
        let (a, b) = (ids[k - 1], ids[k]);
        if a == b {
            errors.push(
                Diagnostic::error(
                    via[k].span.clone(),
                    format!("'{}' follows itself in path '{name}'", via[k].text),
                )
                .with_help("remove the repeated id; a step joins two different points"),
            );
        } else if is_ts(a) && is_ts(b) {
            errors.push(
                Diagnostic::error(
                    via[k].span.clone(),
                    format!("transition state '{}' follows transition state '{}' in path '{name}'", via[k].text, via[k - 1].text),
                )
                .with_help("put the minimum (intermediate) that lies between the two transition states into the path"),
            );
        }
    }
    for k in 1..last {
        let ts = ids[k];
        let (a, b) = (ids[k - 1], ids[k + 1]);
        if !is_ts(ts) || is_ts(a) || is_ts(b) || a == ts || b == ts {
            continue;
        }
        if a == b {
            errors.push(
                Diagnostic::error(
                    via[k].span.clone(),
                    format!(
                        "transition state '{}' leads from '{}' back to itself",
                        via[k].text, points[a].id
                    ),
                )
                .with_help(
                    "a transition state joins two different minima; check the ids on either side",
                ),
            );
            continue;
        }
        let pair = if a < b { [a, b] } else { [b, a] };
        match joins.get(&ts) {
            Some((first, _)) if *first == pair => {}
            Some((first, span)) => errors.push(
                Diagnostic::error(
                    via[k].span.clone(),
                    format!(
                        "transition state '{}' joins '{}' and '{}' here, but '{}' and '{}' elsewhere",
                        via[k].text, points[a].id, points[b].id, points[first[0]].id, points[first[1]].id
                    ),
                )
                .with_related(span.clone(), "first used here")
                .with_help("a transition state connects exactly two minima; give the other step its own transition state id"),
            ),
            None => {
                joins.insert(ts, (pair, via[k].span.clone()));
            }
        }
    }
    errors.len() == before
}

/// The elementary steps of the chains, each pair of minima and TS once
/// (either direction), in the orientation and order first written.
pub(crate) fn derive_steps(paths: &[ResolvedPath], points: &[RawPoint]) -> Vec<Step> {
    let mut seen: HashSet<(PointId, Option<PointId>, PointId)> = HashSet::new();
    let mut steps = Vec::new();
    for path in paths {
        let via = &path.via;
        let mut i = 0;
        while i + 1 < via.len() {
            let step = if points[via[i + 1]].kind == Kind::TransitionState {
                match via.get(i + 2) {
                    Some(&to) => Step {
                        from: via[i],
                        ts: Some(via[i + 1]),
                        to,
                    },
                    None => break, // excluded by the shape check
                }
            } else {
                Step {
                    from: via[i],
                    ts: None,
                    to: via[i + 1],
                }
            };
            i += if step.ts.is_some() { 2 } else { 1 };
            let key = (step.from.min(step.to), step.ts, step.from.max(step.to));
            if seen.insert(key) {
                steps.push(step);
            }
        }
    }
    steps
}

/// Product flags, one per point: a state that ends some path and starts none,
/// unless the file says `product = true/false`. Transition states never are.
pub(crate) fn products(paths: &[ResolvedPath], points: &[RawPoint]) -> Vec<bool> {
    let starts: HashSet<PointId> = paths
        .iter()
        .filter_map(|p| p.via.first().copied())
        .collect();
    let ends: HashSet<PointId> = paths.iter().filter_map(|p| p.via.last().copied()).collect();
    points
        .iter()
        .enumerate()
        .map(|(i, p)| match p.kind {
            Kind::TransitionState => false,
            Kind::Minimum => p
                .product
                .unwrap_or(ends.contains(&i) && !starts.contains(&i)),
        })
        .collect()
}

/// Resolves `start` ids; each must be a state (a minimum).
pub(crate) fn resolve_start(
    ids: &[Located],
    points: &[RawPoint],
    errors: &mut Vec<Diagnostic>,
) -> Vec<PointId> {
    let mut out = Vec::new();
    for item in ids {
        match points.iter().position(|p| p.id == item.text) {
            Some(i) if points[i].kind == Kind::Minimum => out.push(i),
            Some(_) => errors.push(
                Diagnostic::error(
                    item.span.clone(),
                    format!("start names '{}', a transition state", item.text),
                )
                .with_help("material starts in minima: name states from [states]"),
            ),
            None => errors.push(unknown_id(item, points)),
        }
    }
    out
}

/// Per-point extras: co-reactants named in `with` must be listed in
/// `[coreactants]`; a tunnelling correction needs each TS's imaginary frequency.
pub(crate) fn resolve_extras(
    points: &[RawPoint],
    coreactants: &[(Located, f64)],
    tunnelling: crate::model::Tunnelling,
    errors: &mut Vec<Diagnostic>,
    warnings: &mut Vec<Diagnostic>,
) -> Vec<crate::model::PointExtras> {
    use crate::model::{PointExtras, Tunnelling};
    let mut out = Vec::new();
    for p in points {
        let mut with = Vec::new();
        for name in &p.with {
            match coreactants.iter().find(|(c, _)| c.text == name.text) {
                Some((_, conc)) => with.push((name.text.clone(), *conc)),
                None => {
                    let known = coreactants.iter().map(|(c, _)| c.text.as_str());
                    let help = match crate::profile::suggest::nearest(&name.text, known) {
                        Some(s) => format!("did you mean '{s}'?"),
                        None => format!(
                            "list it with its concentration in mol/L:\n[coreactants]\n{} = 0.5",
                            name.text
                        ),
                    };
                    errors.push(
                        Diagnostic::error(
                            name.span.clone(),
                            format!("co-reactant '{}' is not in [coreactants]", name.text),
                        )
                        .with_help(help),
                    );
                }
            }
        }
        if tunnelling != Tunnelling::None
            && p.kind == Kind::TransitionState
            && p.imaginary_frequency.is_none()
        {
            warnings.push(
                Diagnostic::warning(p.id_span.clone(), format!("transition state '{}' has no imaginary_frequency: no tunnelling correction for it", p.id))
                    .with_help(format!("add it in cm⁻¹, e.g. {} = {{ g = 20.0, imaginary_frequency = 1250 }}", p.id)),
            );
        }
        out.push(PointExtras {
            imaginary_frequency: p.imaginary_frequency,
            kappa: p.kappa.unwrap_or(1.0),
            species: p.species.unwrap_or(1),
            with,
        });
    }
    out
}
