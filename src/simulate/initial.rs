//! Where the material starts: the reference state at 1 mol/L by default,
//! concentrations given by the user, or a Boltzmann distribution over a set
//! of conformers. Co-reactants that steps consume start at their
//! `[coreactants]` concentration unless `--initial` names them too.

use super::SimulateError;
use crate::model::{Kind, Model, PointId};

/// The initial condition, before it is resolved against a model.
#[derive(Debug, Clone, PartialEq, Default)]
pub enum Initial {
    /// 1 mol/L in the reference state: the `zero` state, else the `start`
    /// states (shared equally), else the first state of the first path.
    #[default]
    Reference,
    /// Concentrations in mol/L by state id (or co-reactant name); states not
    /// named start empty, co-reactants not named at their stated value.
    Given(Vec<(String, f64)>),
    /// `total` mol/L spread over these states by Boltzmann weights exp(−G/RT).
    Boltzmann(Vec<String>, f64),
}

impl Initial {
    /// Reads `id=conc,id=conc` (mol/L).
    pub fn parse_given(text: &str) -> Result<Initial, SimulateError> {
        let mut out = Vec::new();
        for item in text.split(',').map(str::trim).filter(|s| !s.is_empty()) {
            let (id, value) = item
                .split_once('=')
                .ok_or_else(|| SimulateError::BadInitial {
                    text: item.to_string(),
                    why: "write id=concentration in mol/L, e.g. cat=0.01".into(),
                })?;
            let c: f64 = value
                .trim()
                .parse()
                .map_err(|_| SimulateError::BadInitial {
                    text: item.to_string(),
                    why: "the concentration is not a number (mol/L)".into(),
                })?;
            if !(c.is_finite() && c >= 0.0) {
                return Err(SimulateError::BadInitial {
                    text: item.to_string(),
                    why: "a concentration must be zero or positive".into(),
                });
            }
            out.push((id.trim().to_string(), c));
        }
        if out.is_empty() {
            return Err(SimulateError::BadInitial {
                text: text.to_string(),
                why: "no state given".into(),
            });
        }
        Ok(Initial::Given(out))
    }

    /// The initial concentration given for co-reactant `name`, if any.
    pub fn coreactant(&self, name: &str) -> Option<f64> {
        match self {
            Initial::Given(list) => list.iter().rev().find(|(id, _)| id == name).map(|e| e.1),
            _ => None,
        }
    }

    /// Concentrations per model point (zero for TSs and unnamed states).
    pub fn resolve(&self, model: &Model) -> Result<Vec<f64>, SimulateError> {
        let mut x = vec![0.0; model.points().len()];
        match self {
            Initial::Reference => {
                let states = reference_states(model);
                let share = 1.0 / states.len() as f64;
                for s in states {
                    x[s] += share;
                }
            }
            Initial::Given(list) => {
                for (id, c) in list {
                    if model.find(id).is_none() && is_coreactant(model, id) {
                        continue;
                    }
                    x[minimum(model, id)?] += c;
                }
            }
            Initial::Boltzmann(ids, total) => {
                let rt = model.temperature().rt(model.unit());
                let points = ids
                    .iter()
                    .map(|id| minimum(model, id))
                    .collect::<Result<Vec<_>, _>>()?;
                let g_min = points
                    .iter()
                    .map(|&p| model.point(p).g)
                    .fold(f64::INFINITY, f64::min);
                let w: Vec<f64> = points
                    .iter()
                    .map(|&p| (-(model.point(p).g - g_min) / rt).exp())
                    .collect();
                let sum: f64 = w.iter().sum();
                for (&p, wi) in points.iter().zip(&w) {
                    x[p] += total * wi / sum;
                }
            }
        }
        if x.iter().sum::<f64>() <= 0.0 {
            return Err(SimulateError::NoMaterial);
        }
        Ok(x)
    }
}

/// The reference state(s): `zero`, else `start`, else the first state of the
/// first path.
pub fn reference_states(model: &Model) -> Vec<PointId> {
    if let Some(z) = model.zero() {
        return vec![z];
    }
    if !model.start().is_empty() {
        return model.start().to_vec();
    }
    vec![model.paths()[0].via[0]]
}

/// Whether some state lists `name` as a free co-reactant.
fn is_coreactant(model: &Model, name: &str) -> bool {
    (0..model.points().len()).any(|p| model.extras(p).with.iter().any(|(w, _)| w == name))
}

fn minimum(model: &Model, id: &str) -> Result<PointId, SimulateError> {
    let p = model
        .find(id)
        .ok_or_else(|| SimulateError::UnknownState { id: id.to_string() })?;
    if model.point(p).kind != Kind::Minimum {
        return Err(SimulateError::NotAMinimum { id: id.to_string() });
    }
    Ok(p)
}
