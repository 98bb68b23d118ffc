//! A `cycle = true` path as the energetic span model sees it: the
//! intermediates and transition states of one turnover, and the reaction free
//! energy from the first state to the regenerated catalyst.

use super::span::{Span, energetic_span};
use crate::model::{Kind, Model, PointId};

/// A TS of the cycle: a real transition state, or the top of a barrierless step
/// (its energy is the higher of the two minima).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum CycleTs {
    /// A transition state of the model.
    Ts(PointId),
    /// A step between adjacent minima with no TS: (from, to).
    Barrierless(PointId, PointId),
}

/// One catalytic cycle and its energetic span analysis.
#[derive(Debug, Clone, PartialEq)]
pub struct CycleAnalysis {
    /// Index of the path in [`Model::paths`].
    pub path: usize,
    /// Intermediates I₀…Iₙ₋₁ (the regenerated catalyst is not one of them).
    pub intermediates: Vec<PointId>,
    /// TS i joins intermediate i to i+1 (the last leads to the regenerated catalyst).
    pub ts: Vec<CycleTs>,
    /// ΔGr = G(regenerated catalyst) − G(first state), in the model's unit.
    pub dgr: f64,
    /// The energetic span model's result.
    pub span: Span,
}

/// Analyses path `path` as a catalytic cycle; `None` unless it is marked
/// `cycle = true`.
pub fn analyze_cycle(model: &Model, path: usize) -> Option<CycleAnalysis> {
    let p = &model.paths()[path];
    if !p.cycle {
        return None;
    }
    let g = |i: PointId| model.point(i).g;
    let mut intermediates = Vec::new();
    let mut ts = Vec::new();
    let mut pending_ts = None;
    let mut previous: Option<PointId> = None;
    for &id in &p.via {
        match model.point(id).kind {
            Kind::TransitionState => pending_ts = Some(id),
            Kind::Minimum => {
                if let Some(prev) = previous {
                    ts.push(match pending_ts.take() {
                        Some(t) => CycleTs::Ts(t),
                        None => CycleTs::Barrierless(prev, id),
                    });
                }
                intermediates.push(id);
                previous = Some(id);
            }
        }
    }
    let catalyst = intermediates.pop()?; // the regenerated catalyst
    let dgr = g(catalyst) - g(*intermediates.first()?);
    let ts_g: Vec<f64> = ts
        .iter()
        .map(|t| match *t {
            // A transmission coefficient acts as a lower effective TS energy.
            CycleTs::Ts(id) => {
                let kappa = super::analysis::transmission(model, id, model.temperature()).0;
                g(id) - model.temperature().rt(model.unit()) * kappa.ln()
            }
            CycleTs::Barrierless(a, b) => g(a).max(g(b)),
        })
        .collect();
    let int_g: Vec<f64> = intermediates.iter().map(|&i| g(i)).collect();
    let span = energetic_span(&int_g, &ts_g, dgr, model.unit(), model.temperature())?;
    Some(CycleAnalysis {
        path,
        intermediates,
        ts,
        dgr,
        span,
    })
}

impl CycleTs {
    /// The name used in reports: the TS id, or "a→b" for a barrierless step.
    pub fn name(&self, model: &Model) -> String {
        match *self {
            CycleTs::Ts(id) => model.point(id).id.clone(),
            CycleTs::Barrierless(a, b) => {
                format!("{}→{}", model.point(a).id, model.point(b).id)
            }
        }
    }
}
