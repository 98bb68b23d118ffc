//! Energy checks and the shift to the `zero` state: plausibility of the
//! values (mixed absolute/relative numbers, a wrong unit), and the chemically
//! odd case of a transition state below a minimum it connects.

use std::ops::Range;

use crate::diag::Diagnostic;
use crate::model::{Kind, PointId, Step};
use crate::profile::document::{Located, RawPoint};
use crate::profile::suggest;
use crate::units::EnergyUnit;

/// Largest distance from the reference state, in kcal/mol, that can still be
/// one mechanism's free-energy profile. Bond energies are ~100 kcal/mol; a
/// thousand means absolute and relative numbers are mixed, or the unit is wrong.
pub(crate) const ABSURD_KCAL: f64 = 1000.0;

/// Hartree values larger than this in magnitude are total energies of
/// molecules (tens to thousands of Eh), not relative ones.
const ABSOLUTE_HARTREE: f64 = 1.0;

/// Finds the `zero` state; it must be a minimum.
pub(crate) fn resolve_zero(
    zero: Option<&Located>,
    points: &[RawPoint],
    errors: &mut Vec<Diagnostic>,
) -> Option<PointId> {
    let zero = zero?;
    match points.iter().position(|p| p.id == zero.text) {
        Some(i) if points[i].kind == Kind::Minimum => Some(i),
        Some(_) => {
            errors.push(
                Diagnostic::error(zero.span.clone(), format!("zero must name a state, but '{}' is a transition state", zero.text))
                    .with_help("energies are given relative to a minimum: use the reactant (or any id from [states])"),
            );
            None
        }
        None => {
            let states = points
                .iter()
                .filter(|p| p.kind == Kind::Minimum)
                .map(|p| p.id.as_str());
            let help = match suggest::nearest(&zero.text, states) {
                Some(s) => format!("did you mean '{s}'?"),
                None => "use an id from [states], usually the reactant".to_string(),
            };
            errors.push(
                Diagnostic::error(
                    zero.span.clone(),
                    format!("zero names '{}', which is not in [states]", zero.text),
                )
                .with_help(help),
            );
            None
        }
    }
}

/// Checks the energies are plausible and returns them shifted so the `zero`
/// state is 0 (as written when there is no zero). `reference` is the state
/// distances are measured from: the zero state, else the first state of the
/// first path.
pub(crate) fn check_and_shift(
    g: &[f64],
    points: &[RawPoint],
    (unit, unit_span): (EnergyUnit, Range<usize>),
    zero: Option<PointId>,
    reference: PointId,
    errors: &mut Vec<Diagnostic>,
    warnings: &mut Vec<Diagnostic>,
) -> Vec<f64> {
    let g_ref = g[reference];
    for (i, p) in points.iter().enumerate() {
        let distance = g[i] - g_ref;
        let kcal = unit.convert(distance, EnergyUnit::KcalPerMol);
        if kcal.abs() > ABSURD_KCAL {
            let side = if distance > 0.0 { "above" } else { "below" };
            errors.push(
                Diagnostic::error(
                    p.g_span.clone(),
                    format!(
                        "'{}' lies {} {unit} {side} '{}'{}, far beyond any reaction profile",
                        p.id,
                        energy(distance.abs(), unit),
                        points[reference].id,
                        if unit == EnergyUnit::KcalPerMol {
                            String::new()
                        } else {
                            format!(" ({:.0} kcal/mol)", kcal.abs())
                        }
                    ),
                )
                .with_related(points[reference].g_span.clone(), "measured from this energy")
                .with_help(format!(
                    "absolute and relative energies look mixed, or the unit is wrong: write all energies \
                     the same way, in {unit} (absolute energies are fine with zero = \"<a state>\")"
                )),
            );
        }
    }
    if unit == EnergyUnit::Hartree
        && zero.is_none()
        && let Some(big) = g.iter().position(|v| v.abs() > ABSOLUTE_HARTREE)
    {
        warnings.push(
            Diagnostic::warning(
                unit_span,
                format!(
                    "energies look absolute ('{}' = {} hartree) and are shown as written",
                    points[big].id, g[big]
                ),
            )
            .with_help(format!(
                "set zero = \"{}\" to show and report energies relative to that state",
                points[reference].id
            )),
        );
    }
    match zero {
        Some(z) => g.iter().map(|v| v - g[z]).collect(),
        None => g.to_vec(),
    }
}

/// Warns once for every transition state that lies below a minimum it joins.
pub(crate) fn ts_below_minimum(
    steps: &[Step],
    points: &[RawPoint],
    g: &[f64],
    unit: EnergyUnit,
    warnings: &mut Vec<Diagnostic>,
) {
    let mut warned: Vec<(PointId, PointId)> = Vec::new();
    for step in steps {
        let Some(ts) = step.ts else { continue };
        for minimum in [step.from, step.to] {
            let gap = g[minimum] - g[ts];
            if gap > 0.0 && !warned.contains(&(ts, minimum)) {
                warned.push((ts, minimum));
                warnings.push(
                    Diagnostic::warning(
                        points[ts].g_span.clone(),
                        format!(
                            "transition state '{}' lies {} {unit} below '{}', a minimum it connects",
                            points[ts].id,
                            energy(gap, unit),
                            points[minimum].id
                        ),
                    )
                    .with_related(points[minimum].g_span.clone(), format!("energy of '{}'", points[minimum].id))
                    .with_help(
                        "a transition state should be higher than both minima it joins; check the two energies, \
                         the ids in the path, or whether the step is really barrierless (list the two states next to each other)",
                    ),
                );
            }
        }
    }
}

/// A positive energy difference with the unit's usual decimals, or more when
/// those would round it to zero.
fn energy(value: f64, unit: EnergyUnit) -> String {
    let mut decimals = unit.display_decimals();
    while decimals < 8
        && format!("{value:.decimals$}")
            .trim_start_matches(['0', '.'])
            .is_empty()
    {
        decimals += 1;
    }
    format!("{value:.decimals$}")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn small_differences_keep_enough_decimals() {
        assert_eq!(energy(2.04, EnergyUnit::KcalPerMol), "2.0");
        assert_eq!(energy(0.04, EnergyUnit::KcalPerMol), "0.04");
        assert_eq!(energy(0.0123, EnergyUnit::Hartree), "0.0123");
        assert_eq!(energy(0.00001, EnergyUnit::Hartree), "0.00001");
    }
}
