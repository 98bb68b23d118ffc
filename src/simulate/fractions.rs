//! Final product fractions by simulation, as `analyze` uses them: the exact
//! answer in every regime, and the check of the closed-form limits against it.
//!
//! The closed forms of [`crate::kinetics::regime`] take product formation as
//! irreversible and, in the two limits, one rate as infinitely faster than the
//! other. The simulation makes neither assumption: every step runs both ways,
//! from the same start, to completion (or to equilibrium when products revert).

use super::SimulateError;
use super::initial::Initial;
use super::network::Network;
use super::run::{Options, Stopped, simulate_network};
use super::until::Until;
use crate::kinetics;
use crate::model::{Model, PointId};
use crate::units::EnergyUnit;

/// Largest network (states) simulated for `analyze`; beyond it the check is
/// skipped with a note (a run costs about the cube of the size per step).
pub const MAX_STATES: usize = 200;

/// The conversion of the starting material a run goes to: 99.99 %, so the
/// fractions are those of the reaction's end (the last 0.01 % can move a
/// fraction by at most 1e-4, a ratio of products above 1 % by at most 1 %,
/// 0.006 kcal/mol at 298 K), not those of a later slow equilibration of the
/// products, which `eyrie simulate` reports as drift. A product not 5.5
/// kcal/mol (RT·ln 10⁴) below the pool at 298 K is in equilibrium with it:
/// the run then ends at equilibrium, and that ratio is the answer.
pub const END_CONVERSION: f64 = 0.9999;

/// A closed form agrees with the simulation when no product ratio differs by
/// more than the factor this free energy gives at T (0.1 kcal/mol, a factor of
/// 1.18 at 298 K: below what computed energies resolve, common practice).
pub const AGREEMENT_KCAL_PER_MOL: f64 = 0.1;

/// Products below this fraction in both results are left out of the
/// comparison: a ratio of two traces means nothing to a chemist.
pub const COMPARED_FROM: f64 = 0.01;

/// Fractions are floored here before logarithms (a closed-form limit gives
/// exactly zero for products it rules out).
const FLOOR: f64 = 1e-12;

/// The simulated outcome from a start.
#[derive(Debug, Clone, PartialEq)]
pub struct Simulated {
    /// Final fraction of all product, per product state (summing to 1).
    pub products: Vec<(PointId, f64)>,
    /// Why the run stopped (conversion: complete; equilibrium: products
    /// revert; time-limit: the fractions are of the product formed so far).
    pub stopped: Stopped,
    /// Time reached, s.
    pub time_s: f64,
}

/// Simulates `model` from `start` (1 mol/L shared equally, as the regime
/// analysis weighs its starts) to completion or equilibrium.
pub fn simulated_fractions(model: &Model, start: &[PointId]) -> Result<Simulated, SimulateError> {
    let net = Network::new(model, &kinetics::analyze(model));
    if net.len() > MAX_STATES {
        return Err(SimulateError::TooLarge {
            states: net.len(),
            limit: MAX_STATES,
        });
    }
    let share = 1.0 / start.len().max(1) as f64;
    let has_pool = net
        .species
        .iter()
        .enumerate()
        .any(|(i, s)| start.contains(&s.point) && net.in_pool(i));
    let options = Options {
        until: if has_pool {
            Until::Conversion(END_CONVERSION)
        } else {
            Until::Default
        },
        initial: Initial::Given(
            start
                .iter()
                .map(|&p| (model.point(p).id.clone(), share))
                .collect(),
        ),
        ..Options::default()
    };
    let sim = simulate_network(model, net, &options, &mut |_, _| {})?;
    Ok(Simulated {
        products: sim.products.iter().map(|&(p, _, f)| (p, f)).collect(),
        stopped: sim.stopped,
        time_s: sim.time_s(),
    })
}

/// The agreement margin in `unit`.
pub fn agreement_margin(unit: EnergyUnit) -> f64 {
    EnergyUnit::KcalPerMol.convert(AGREEMENT_KCAL_PER_MOL, unit)
}

/// How far a closed-form result is from the simulated one, as a free energy
/// (`rt` in the unit wanted): the largest RT·|ln| of the factor by which any
/// ratio of two products differs between them, over the products holding at
/// least [`COMPARED_FROM`] in either. This is the error in the ΔΔG‡ a chemist
/// would read off the ratio; 0 with fewer than two such products.
pub fn limit_error(closed: &[(PointId, f64)], simulated: &[(PointId, f64)], rt: f64) -> f64 {
    let get =
        |list: &[(PointId, f64)], p: PointId| list.iter().find(|q| q.0 == p).map_or(0.0, |q| q.1);
    let mut ids: Vec<PointId> = closed.iter().chain(simulated).map(|q| q.0).collect();
    ids.sort_unstable();
    ids.dedup();
    let logs: Vec<f64> = ids
        .into_iter()
        .map(|p| (get(closed, p), get(simulated, p)))
        .filter(|&(c, s)| c.max(s) >= COMPARED_FROM)
        .map(|(c, s)| (c.max(FLOOR) / s.max(FLOOR)).ln())
        .collect();
    if logs.len() < 2 {
        return 0.0;
    }
    let hi = logs.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    let lo = logs.iter().copied().fold(f64::INFINITY, f64::min);
    rt * (hi - lo)
}

#[cfg(test)]
mod tests {
    use super::limit_error;

    #[test]
    fn error_is_the_ratio_factor_as_an_energy() {
        // closed form: 80:20 vs 50:50 differ by a ratio factor of 4, RT·ln 4.
        let e = limit_error(&[(1, 0.8), (2, 0.2)], &[(1, 0.5), (2, 0.5)], 0.6);
        assert!((e - 0.6 * 4f64.ln()).abs() < 1e-12);
        // Traces (< 1 %) are not compared; one product left: no ratio.
        assert_eq!(
            limit_error(&[(1, 1.0)], &[(1, 0.999), (2, 0.001)], 0.6),
            0.0
        );
        // A product the limit rules out (0) but that forms: a large error.
        assert!(limit_error(&[(1, 1.0), (2, 0.0)], &[(1, 0.7), (2, 0.3)], 0.6) > 10.0);
    }
}
