//! Rate constants of every step and the apparent barrier of every path.

use crate::kinetics::eyring::{RateConstant, rate_constant};
use crate::model::{Kind, Model, PointId, Step};
use crate::units::{EnergyUnit, Temperature};

/// One elementary step with its barriers (in the model's unit) and Eyring rate
/// constants in both directions.
#[derive(Debug, Clone, PartialEq)]
pub struct StepKinetics {
    /// The step, oriented as first written in the file.
    pub step: Step,
    /// G(TS) − G(from); for a barrierless step, the rise to `to` if uphill, else 0.
    pub barrier_forward: f64,
    /// G(TS) − G(to); for a barrierless step, the rise to `from` if uphill, else 0.
    pub barrier_reverse: f64,
    /// Forward rate constant (κ = 1).
    pub k_forward: RateConstant,
    /// Reverse rate constant; the same TS and κ, so microscopic reversibility holds.
    pub k_reverse: RateConstant,
    /// The transmission coefficient applied in both directions: the TS's `kappa`
    /// times its tunnelling correction (1 for a barrierless step).
    pub kappa: f64,
    /// Why the requested tunnelling correction was replaced, if it was.
    pub kappa_note: Option<String>,
}

/// The apparent barrier of one path: the largest rise from a minimum to a
/// later transition state on that path, i.e. the energetic span of a linear
/// sequence (Kozuch & Shaik, Acc. Chem. Res. 2011, 44, 101).
#[derive(Debug, Clone, PartialEq)]
pub struct PathBarrier {
    /// Index of the path in [`Model::paths`].
    pub path: usize,
    /// The barrier in the model's unit.
    pub apparent_barrier: f64,
    /// The minimum it is measured from.
    pub determining_state: PointId,
    /// The TS it is measured to; `None` when the path has no TS (all steps
    /// barrierless), and the barrier is then the largest rise to a later minimum.
    pub determining_ts: Option<PointId>,
}

/// Everything `analyze` reports for a model at its temperature.
#[derive(Debug, Clone, PartialEq)]
pub struct Analysis {
    /// Temperature used.
    pub temperature: Temperature,
    /// Unit of every barrier.
    pub unit: EnergyUnit,
    /// One entry per step, in model order.
    pub steps: Vec<StepKinetics>,
    /// One entry per path, in model order.
    pub paths: Vec<PathBarrier>,
}

/// Computes step kinetics and path barriers at the model's temperature.
pub fn analyze(model: &Model) -> Analysis {
    let t = model.temperature();
    let unit = model.unit();
    let steps = model
        .steps()
        .iter()
        .map(|s| step_kinetics(model, *s, t, unit))
        .collect();
    let paths = (0..model.paths().len())
        .map(|i| path_barrier(model, i))
        .collect();
    Analysis {
        temperature: t,
        unit,
        steps,
        paths,
    }
}

fn step_kinetics(model: &Model, step: Step, t: Temperature, unit: EnergyUnit) -> StepKinetics {
    let g = |p: PointId| model.point(p).g;
    let (forward, reverse) = match step.ts {
        Some(ts) => (g(ts) - g(step.from), g(ts) - g(step.to)),
        None => {
            let rise = g(step.to) - g(step.from);
            (rise.max(0.0), (-rise).max(0.0))
        }
    };
    let (kappa, kappa_note) = step.ts.map_or((1.0, None), |ts| transmission(model, ts, t));
    StepKinetics {
        step,
        barrier_forward: forward,
        barrier_reverse: reverse,
        k_forward: rate_constant(forward, unit, t, kappa),
        k_reverse: rate_constant(reverse, unit, t, kappa),
        kappa,
        kappa_note,
    }
}

/// κ of a transition state at `t`: its explicit `kappa` times the tunnelling
/// correction the model asks for. Bell's form beyond its validity (u ≥ 2π) is
/// replaced by Wigner's, with a note saying so.
pub fn transmission(model: &Model, ts: PointId, t: Temperature) -> (f64, Option<String>) {
    use crate::kinetics::corrections::{bell, wigner};
    use crate::model::Tunnelling;
    let extras = model.extras(ts);
    let Some(nu) = extras.imaginary_frequency else {
        return (extras.kappa, None);
    };
    match model.tunnelling() {
        Tunnelling::None => (extras.kappa, None),
        Tunnelling::Wigner => (extras.kappa * wigner(nu, t), None),
        Tunnelling::Bell => match bell(nu, t) {
            Ok(k) => (extras.kappa * k, None),
            Err(e) => (
                extras.kappa * wigner(nu, t),
                Some(format!(
                    "{}: {e}; Wigner's correction used instead",
                    model.point(ts).id
                )),
            ),
        },
    }
}

/// The largest G(TS) − G(minimum) with the TS after the minimum; ties go to
/// the earliest pair, so the answer does not depend on float noise order.
pub fn path_barrier(model: &Model, path: usize) -> PathBarrier {
    let via = &model.paths()[path].via;
    let kinds: Vec<Kind> = via.iter().map(|&p| model.point(p).kind).collect();
    let g: Vec<f64> = via.iter().map(|&p| model.point(p).g).collect();
    let (a, c) = apparent_barrier(&kinds, &g);
    PathBarrier {
        path,
        apparent_barrier: g[c] - g[a],
        determining_state: via[a],
        determining_ts: (kinds[c] == Kind::TransitionState).then_some(via[c]),
    }
}

/// Indices (minimum, later TS) of the largest rise along a chain; when the
/// chain has no TS, (minimum, later minimum). Chains from a validated model
/// start with a minimum and have at least two points.
pub fn apparent_barrier(kinds: &[Kind], g: &[f64]) -> (usize, usize) {
    let has_ts = kinds.contains(&Kind::TransitionState);
    let mut best: Option<(f64, usize, usize)> = None;
    for a in 0..g.len() {
        if kinds[a] != Kind::Minimum {
            continue;
        }
        for c in a + 1..g.len() {
            let eligible = if has_ts {
                kinds[c] == Kind::TransitionState
            } else {
                true
            };
            if eligible && best.is_none_or(|(rise, _, _)| g[c] - g[a] > rise) {
                best = Some((g[c] - g[a], a, c));
            }
        }
    }
    best.map_or((0, g.len().saturating_sub(1)), |(_, a, c)| (a, c))
}

#[cfg(test)]
mod tests {
    use super::*;
    use Kind::{Minimum as M, TransitionState as T};

    #[test]
    fn linear_paths_from_the_reference_set() {
        // definition: apparent barrier = largest G(TS) − G(minimum) with the TS after
        // the minimum (Kozuch & Shaik, Acc. Chem. Res. 2011, 44, 101); profiles P1–P3
        // and their answers from tests/reference/energetic_span.toml.
        let p1 = [0.0, 15.0, -5.0, 12.0, 3.0, 20.0, -10.0];
        assert_eq!(apparent_barrier(&[M, T, M, T, M, T, M], &p1), (2, 5)); // Int1 → TSc, 25
        let p2 = [0.0, 22.0, -3.0, 18.0, -12.0];
        assert_eq!(apparent_barrier(&[M, T, M, T, M], &p2), (0, 1)); // R → TSa, 22
        let p3 = [0.0, 10.0, -8.0, -6.0, 14.0, -20.0];
        assert_eq!(apparent_barrier(&[M, T, M, M, T, M], &p3), (2, 4)); // Int1 → TSb, 22
    }

    #[test]
    fn chain_without_ts_uses_the_largest_rise() {
        // definition as above, with barrierless steps only: the rise to a later minimum.
        assert_eq!(apparent_barrier(&[M, M, M], &[0.0, 3.0, -1.0]), (0, 1));
    }
}
