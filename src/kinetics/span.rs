//! The energetic span model of a catalytic cycle (Kozuch & Shaik, J. Phys.
//! Chem. A 2008, 112, 6032; Acc. Chem. Res. 2011, 44, 101).
//!
//! Numbering: TS i joins intermediate i to intermediate i+1; the last TS leads
//! to the first intermediate of the next turnover, lower by −ΔGr. With this
//! numbering the correction δG′ᵢⱼ = ΔGr applies when TS i comes *at or after*
//! intermediate j in the turnover (i ≥ j). The literature's "i > j" belongs to a
//! numbering where TS i leads *into* intermediate i; used here it gives a TOF
//! that is wrong by 3–10× on cycles whose TDTS precedes the TDI.

use crate::units::{EnergyUnit, Temperature};

/// The result of the energetic span model for one cycle.
#[derive(Debug, Clone, PartialEq)]
pub struct Span {
    /// Turnover frequency in s⁻¹ at standard-state concentrations; negative when
    /// the cycle is endergonic (it then runs backwards), zero when ΔGr = 0.
    pub tof: f64,
    /// Degree of TOF control of each TS (sums to 1).
    pub ts_control: Vec<f64>,
    /// Degree of TOF control of each intermediate (sums to 1).
    pub intermediate_control: Vec<f64>,
    /// The TOF-determining states, when the cycle runs forwards (ΔGr < 0).
    pub determining: Option<Determining>,
}

/// The TDI/TDTS pair and the energetic span they define.
#[derive(Debug, Clone, PartialEq)]
pub struct Determining {
    /// Index of the TOF-determining intermediate (largest degree of TOF control).
    pub tdi: usize,
    /// Index of the TOF-determining TS (largest degree of TOF control).
    pub tdts: usize,
    /// Whether the TDTS comes before the TDI in the turnover (then δE includes ΔGr).
    pub tdts_before_tdi: bool,
    /// δE in the input unit: T_TDTS − I_TDI, plus ΔGr when the TDTS comes first.
    pub span: f64,
    /// The rough estimate (kB·T/h)·e^(−δE/RT), s⁻¹; for reporting only.
    pub tof_approx: f64,
}

// Index loops mirror the Σᵢⱼ of the published formula.
#[allow(clippy::needless_range_loop)]
/// Applies the energetic span model to a cycle of n intermediates and n TSs
/// (energies in `unit`, any common reference) with reaction free energy `dgr`.
/// Returns `None` if the two lists differ in length or are empty.
pub fn energetic_span(
    intermediates: &[f64],
    ts: &[f64],
    dgr: f64,
    unit: EnergyUnit,
    t: Temperature,
) -> Option<Span> {
    let n = intermediates.len();
    if n == 0 || ts.len() != n {
        return None;
    }
    let rt = t.rt(unit);
    // Exponents of every term; summed in log space so spans of 50 kcal/mol and
    // more neither overflow nor lose the small terms' share.
    let exponent = |i: usize, j: usize| {
        let correction = if i >= j { dgr } else { 0.0 };
        (ts[i] - intermediates[j] - correction) / rt
    };
    let largest = (0..n)
        .flat_map(|i| (0..n).map(move |j| (i, j)))
        .map(|(i, j)| exponent(i, j))
        .fold(f64::NEG_INFINITY, f64::max);
    let mut ts_control = vec![0.0; n];
    let mut intermediate_control = vec![0.0; n];
    let mut total = 0.0;
    for i in 0..n {
        for j in 0..n {
            let w = (exponent(i, j) - largest).exp();
            ts_control[i] += w;
            intermediate_control[j] += w;
            total += w;
        }
    }
    ts_control.iter_mut().for_each(|x| *x /= total);
    intermediate_control.iter_mut().for_each(|x| *x /= total);

    let driving = (-dgr / rt).exp_m1();
    let tof = if driving == 0.0 {
        0.0
    } else {
        driving.signum()
            * (t.frequency_factor().ln() + driving.abs().ln() - largest - total.ln()).exp()
    };

    let determining = (dgr < 0.0).then(|| {
        let tdts = argmax(&ts_control);
        let tdi = argmax(&intermediate_control);
        let tdts_before_tdi = tdts < tdi;
        let span = ts[tdts] - intermediates[tdi] + if tdts_before_tdi { dgr } else { 0.0 };
        Determining {
            tdi,
            tdts,
            tdts_before_tdi,
            span,
            tof_approx: t.frequency_factor() * (-span / rt).exp(),
        }
    });
    Some(Span {
        tof,
        ts_control,
        intermediate_control,
        determining,
    })
}

/// Index of the largest value; the first on ties.
fn argmax(values: &[f64]) -> usize {
    let mut best = 0;
    for (i, v) in values.iter().enumerate() {
        if *v > values[best] {
            best = i;
        }
    }
    best
}
