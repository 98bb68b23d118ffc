//! Measured against predicted: each `[[observed]]` value beside the number
//! the barriers predict, with the error expressed as the energy that decides
//! it (a ΔΔG‡ for a ratio, a ΔG‡ for a rate), because that is what a chemist
//! can judge against the accuracy of the method.

use super::analysis::{analyze, path_barrier, transmission};
use super::cycle::analyze_cycle;
use super::eyring::rate_constant;
use super::regime::selectivity;
use crate::model::{Model, Observation, ObservedKind, PointId, Target};
use crate::units::Temperature;

/// One observation compared with its prediction.
#[derive(Debug, Clone, PartialEq)]
pub struct Comparison {
    /// Index into [`Model::observations`].
    pub index: usize,
    /// What the numbers are, in words: "pa:pb", "k(stepwise)", "TOF(turnover)".
    pub quantity: String,
    /// The predicted value, in the observation's terms (ratio, ee %, s⁻¹, s).
    pub predicted: f64,
    /// The measured value.
    pub observed: f64,
    /// Deciding energy predicted minus the one the measurement implies, in the
    /// model's unit (positive: the predicted barrier or ΔΔG‡ is too large).
    /// Infinite when the prediction has no such product or turnover.
    pub energy_error: f64,
    /// The smallest |energy error| within the measurement's uncertainty.
    pub closest_error: f64,
    /// Allowed |energy error|, in the model's unit.
    pub tolerance: f64,
    /// Whether the closest error is within the tolerance.
    pub consistent: bool,
    /// Temperature of the comparison.
    pub temperature: Temperature,
}

/// Compares every observation of `model` with the prediction at its temperature.
pub fn check(model: &Model) -> Vec<Comparison> {
    model
        .observations()
        .iter()
        .enumerate()
        .map(|(i, o)| compare(model, i, o))
        .collect()
}

/// ln of the predicted value and of what would match `x` in the same terms,
/// mapped to "energy" as RT·ln; a single monotonic map for every kind.
fn energy_of(kind: ObservedKind, x: f64, rt: f64) -> f64 {
    match kind {
        // ΔΔG‡ = RT·ln r.
        ObservedKind::Ratio => rt * x.ln(),
        ObservedKind::Ee => rt * ((100.0 + x) / (100.0 - x)).ln(),
        // ΔG‡ = −RT·ln k + const (the constant cancels in differences).
        ObservedKind::Rate | ObservedKind::Tof => -rt * x.ln(),
        // k = ln 2 / t½, so ΔG‡ = RT·ln t½ + const.
        ObservedKind::HalfLife => rt * x.ln(),
        // KIE = k_H/k_D = exp(ΔΔG‡/RT).
        ObservedKind::Kie => rt * x.ln(),
    }
}

fn compare(model: &Model, index: usize, o: &Observation) -> Comparison {
    let t = o.temperature.unwrap_or(model.temperature());
    let m = model.clone().with_temperature(t);
    let rt = t.rt(m.unit());
    let name = |p: PointId| m.point(p).id.clone();
    if let (ObservedKind::Kie, Some(v)) = (o.kind, o.variant) {
        let heavy = model.variant(v).with_temperature(t);
        let k = |m: &Model| target_rate(m, o.target, t);
        let (label, kh) = k(&m);
        let (_, kd) = k(&heavy);
        let quantity = format!("KIE {label} ({})", m.variants()[v].name);
        return finish(index, o, quantity, kh / kd, rt, t);
    }
    let (quantity, predicted) = match o.target {
        Target::Products(a, b) => {
            let start = (!m.start().is_empty()).then(|| m.start());
            let fractions = selectivity(&m, start)
                .map(|s| s.products)
                .unwrap_or_default();
            let f = |p: PointId| fractions.iter().find(|(q, _)| *q == p).map_or(0.0, |x| x.1);
            let r = f(a) / f(b);
            let value = match o.kind {
                ObservedKind::Ee => 100.0 * (r - 1.0) / (r + 1.0),
                _ => r,
            };
            (format!("{}:{}", name(a), name(b)), value)
        }
        Target::Path(p) => {
            let b = path_barrier(&m, p);
            let kappa = b.determining_ts.map_or(1.0, |ts| transmission(&m, ts, t).0);
            let k = rate_constant(b.apparent_barrier, m.unit(), t, kappa);
            let label = &m.paths()[p].name;
            match o.kind {
                ObservedKind::HalfLife => (format!("t½({label})"), k.half_life_s()),
                _ => (format!("k({label})"), k.per_second()),
            }
        }
        Target::Ts(ts) => {
            let a = analyze(&m);
            let step = a.steps.iter().find(|s| s.step.ts == Some(ts));
            let k = step.map(|s| s.k_forward);
            let label = match step {
                Some(s) => format!("{} → {}", name(s.step.from), name(s.step.to)),
                None => name(ts),
            };
            match (o.kind, k) {
                (ObservedKind::HalfLife, Some(k)) => (format!("t½({label})"), k.half_life_s()),
                (_, Some(k)) => (format!("k({label})"), k.per_second()),
                (_, None) => (format!("k({label})"), f64::NAN),
            }
        }
        Target::Cycle(p) => {
            let tof = analyze_cycle(&m, p).map_or(f64::NAN, |c| c.span.tof);
            (format!("TOF({})", m.paths()[p].name), tof)
        }
    };
    finish(index, o, quantity, predicted, rt, t)
}

/// The rate constant (s⁻¹) a rate-type observation refers to, and its label.
fn target_rate(m: &Model, target: Target, t: Temperature) -> (String, f64) {
    let name = |p: PointId| m.point(p).id.clone();
    match target {
        Target::Path(p) => {
            let b = path_barrier(m, p);
            let kappa = b.determining_ts.map_or(1.0, |ts| transmission(m, ts, t).0);
            let k = rate_constant(b.apparent_barrier, m.unit(), t, kappa);
            (format!("k({})", m.paths()[p].name), k.per_second())
        }
        Target::Ts(ts) => {
            let a = analyze(m);
            match a.steps.iter().find(|s| s.step.ts == Some(ts)) {
                Some(s) => (
                    format!("k({} → {})", name(s.step.from), name(s.step.to)),
                    s.k_forward.per_second(),
                ),
                None => (format!("k({})", name(ts)), f64::NAN),
            }
        }
        _ => (String::new(), f64::NAN),
    }
}

/// The comparison once the prediction is known.
fn finish(
    index: usize,
    o: &Observation,
    quantity: String,
    predicted: f64,
    rt: f64,
    t: Temperature,
) -> Comparison {
    let valid = match o.kind {
        ObservedKind::Ee => predicted.is_finite() && predicted.abs() < 100.0,
        _ => predicted.is_finite() && predicted > 0.0,
    };
    let error_at = |x: f64| {
        if valid {
            energy_of(o.kind, predicted, rt) - energy_of(o.kind, x, rt)
        } else {
            f64::INFINITY
        }
    };
    let energy_error = error_at(o.value);
    let closest_error = match o.uncertainty {
        Some(u) if valid => {
            let (lo, hi) = match o.kind {
                ObservedKind::Ee => (
                    (o.value - u).max(-99.999_999),
                    (o.value + u).min(99.999_999),
                ),
                _ => ((o.value - u).max(o.value * 1e-12), o.value + u),
            };
            let (e1, e2) = (error_at(lo), error_at(hi));
            if e1.signum() != e2.signum() {
                0.0
            } else {
                e1.abs().min(e2.abs())
            }
        }
        _ => energy_error.abs(),
    };
    Comparison {
        index,
        quantity,
        predicted,
        observed: o.value,
        energy_error,
        closest_error,
        tolerance: o.tolerance,
        consistent: closest_error <= o.tolerance,
        temperature: t,
    }
}
