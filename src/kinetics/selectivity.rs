//! Product ratios, enantiomeric (or diastereomeric) excess and the free-energy
//! differences behind them: r = exp(ΔΔG‡/RT), ee = (r − 1)/(r + 1) =
//! tanh(ΔΔG‡/2RT), and under the Curtin–Hammett limit Boltzmann weights of the
//! product-determining transition states.

use crate::units::{EnergyUnit, Temperature};

/// ΔΔG‡ (in `unit`) that gives the product ratio `ratio` (major over minor) at `t`.
pub fn ddg_from_ratio(ratio: f64, unit: EnergyUnit, t: Temperature) -> f64 {
    t.rt(unit) * ratio.ln()
}

/// Product ratio (major over minor) for a ΔΔG‡ in `unit` at `t`.
pub fn ratio_from_ddg(ddg: f64, unit: EnergyUnit, t: Temperature) -> f64 {
    (ddg / t.rt(unit)).exp()
}

/// ee (or de) in percent for a ratio r: 100·(r − 1)/(r + 1).
pub fn ee_from_ratio(ratio: f64) -> f64 {
    100.0 * (ratio - 1.0) / (ratio + 1.0)
}

/// ee (or de) in percent for a ΔΔG‡, as 100·tanh(ΔΔG‡/2RT): exact to the last
/// digit even where the ratio itself is huge.
pub fn ee_from_ddg(ddg: f64, unit: EnergyUnit, t: Temperature) -> f64 {
    100.0 * (ddg / (2.0 * t.rt(unit))).tanh()
}

/// Ratio (major over minor) for an ee in percent: (100 + ee)/(100 − ee).
pub fn ratio_from_ee(ee_percent: f64) -> f64 {
    (100.0 + ee_percent) / (100.0 - ee_percent)
}

/// Fractions of product formed through each competing TS when all of them are
/// reached from one pool in fast equilibrium (the Curtin–Hammett limit):
/// Boltzmann weights of the TS free energies, summing to 1.
pub fn boltzmann_fractions(g: &[f64], unit: EnergyUnit, t: Temperature) -> Vec<f64> {
    let rt = t.rt(unit);
    let lowest = g.iter().copied().fold(f64::INFINITY, f64::min);
    let weights: Vec<f64> = g.iter().map(|x| (-(x - lowest) / rt).exp()).collect();
    let total: f64 = weights.iter().sum();
    weights.iter().map(|w| w / total).collect()
}
