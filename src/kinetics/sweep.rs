//! Selectivity across a temperature range, and the isoselective temperature
//! where two products form equally fast (ΔΔG‡(T) = ΔΔH‡ − T·ΔΔS‡ = 0).

use super::regime::{Regime, selectivity};
use crate::model::{Model, PointId};
use crate::units::Temperature;

/// The selectivity at one temperature.
#[derive(Debug, Clone, PartialEq)]
pub struct SweepRow {
    /// Temperature.
    pub temperature: Temperature,
    /// The regime at this temperature.
    pub regime: Regime,
    /// Final product fractions (summing to 1).
    pub products: Vec<(PointId, f64)>,
}

/// `n` evenly spaced temperatures from `from` to `to` (inclusive; n ≥ 2).
pub fn temperatures(from: Temperature, to: Temperature, n: usize) -> Vec<Temperature> {
    let n = n.max(2);
    (0..n)
        .filter_map(|i| {
            let x = i as f64 / (n - 1) as f64;
            Temperature::kelvin(from.k() + x * (to.k() - from.k()))
        })
        .collect()
}

/// The selectivity analysis at each temperature; `None` where there are fewer
/// than two products.
pub fn sweep(model: &Model, temps: &[Temperature]) -> Vec<Option<SweepRow>> {
    let start = (!model.start().is_empty()).then(|| model.start());
    temps
        .iter()
        .map(|&t| {
            let m = model.clone().with_temperature(t);
            selectivity(&m, start).map(|s| SweepRow {
                temperature: t,
                regime: s.regime,
                products: s.products,
            })
        })
        .collect()
}

/// ln([a]/[b]) of the final product amounts at temperature `t`.
fn log_ratio(model: &Model, a: PointId, b: PointId, t: Temperature) -> Option<f64> {
    let start = (!model.start().is_empty()).then(|| model.start());
    let m = model.clone().with_temperature(t);
    let s = selectivity(&m, start)?;
    let f = |p: PointId| s.products.iter().find(|(q, _)| *q == p).map(|(_, f)| *f);
    Some((f(a)? / f(b)?).ln())
}

/// Temperatures in [lo, hi] where products `a` and `b` form in equal amounts:
/// sign changes of ln([a]/[b]) on a grid of `grid` points, each refined by
/// bisection to 1e-9 K.
pub fn isoselective(
    model: &Model,
    a: PointId,
    b: PointId,
    lo: Temperature,
    hi: Temperature,
    grid: usize,
) -> Vec<f64> {
    let temps = temperatures(lo, hi, grid);
    let values: Vec<Option<f64>> = temps.iter().map(|&t| log_ratio(model, a, b, t)).collect();
    let mut roots = Vec::new();
    for i in 1..temps.len() {
        let (Some(y0), Some(y1)) = (values[i - 1], values[i]) else {
            continue;
        };
        if y0 == 0.0 {
            roots.push(temps[i - 1].k());
            continue;
        }
        if y0.signum() == y1.signum() {
            continue;
        }
        let (mut x0, mut x1, mut f0) = (temps[i - 1].k(), temps[i].k(), y0);
        while x1 - x0 > 1e-9 {
            let mid = 0.5 * (x0 + x1);
            let Some(fm) = Temperature::kelvin(mid).and_then(|t| log_ratio(model, a, b, t)) else {
                break;
            };
            if fm.signum() == f0.signum() {
                x0 = mid;
                f0 = fm;
            } else {
                x1 = mid;
            }
        }
        roots.push(0.5 * (x0 + x1));
    }
    if let (Some(Some(y)), Some(t)) = (values.last(), temps.last())
        && *y == 0.0
    {
        roots.push(t.k());
    }
    roots
}
