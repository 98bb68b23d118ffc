//! Degrees of rate control and of selectivity control, by central finite
//! differences on the simulation.
//!
//! The degree of rate control of a state or TS i is
//! X_i = ∂ln r / ∂(−G_i/RT), every other energy held (Campbell; Stegelmann,
//! Andreasen & Campbell, J. Am. Chem. Soc. 2009, 131, 8077). Transition states
//! give Campbell's kinetic degrees, minima his thermodynamic ones. What r is:
//!
//! - a profile with a closed catalytic cycle: the steady-state turnover (the
//!   sum over closed cycles, per catalyst), solved directly as the linear
//!   steady state ([`super::steady`]) without integrating;
//! - any other profile: the rate of product formation d[P]/dt at the moment
//!   half of the starting material is converted. A fixed conversion, not a
//!   fixed time, makes r a property of the network rather than of how long one
//!   waited, and keeps the sum rules exact; the initial rate would be zero
//!   whenever the product lies more than one step from the start.
//!
//! Sum rules (Stegelmann et al. 2009): lowering every TS (and the top of every
//! barrierless step) by δ multiplies every rate constant by e^δ, which only
//! rescales time, so Σ X over the TSs = 1; lowering every minimum slows every
//! step by e^−δ, so Σ X over the states = −1 (for a cycle these are the
//! catalyst states, whose coverages sum to one). Both are reported and checked.
//! The top of a barrierless step counts as a TS of its own, named "a→b".
//!
//! The degree of selectivity control is X_S,i = ∂ln S / ∂(−G_i/RT), S the final
//! fraction of the major product. Its sums over TSs and over states are zero.

use super::SimulateError;
use super::network::Network;
use super::run::{Options, Stopped, simulate_network, turnover};
use super::until::Until;
use crate::kinetics;
use crate::model::{Kind, Model, PointId};
use rayon::prelude::*;

/// The finite-difference step, in units of RT: G_i is moved by ±δ·RT.
///
/// The central difference has a truncation error δ²/6·|∂³ln r/∂x³|; for a
/// cycle ln r is minus a log-sum-exp of the energies, whose third derivative
/// in one energy is X(1 − X)(1 − 2X), at most 0.1, so about 2e-8 at δ = 1e-3
/// (observed against the energetic span closed form: below 4e-7). Noise in r of relative size ε adds
/// about ε/δ: ε ≈ 1e-12 for the steady-state LU solve, ε ≈ 1e-10 (the relative
/// tolerance) for an integrated run, so at most 1e-7. The two balance near
/// δ = (3ε)^(1/3) ≈ 1e-3 for the integrated case; both errors lie four orders
/// below the 1e-3 at which the sum rule is checked.
pub const DELTA_RT: f64 = 1e-3;

/// Tolerance of the sum-rule check (Σ over TSs = 1, Σ over states = −1).
pub const SUM_TOLERANCE: f64 = 1e-3;

/// The conversion of the starting material at which the rate of a profile
/// without a cycle is taken.
pub const RATE_AT_CONVERSION: f64 = 0.5;

/// What an energy perturbation moves.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Target {
    /// A point of the model (a TS or a minimum).
    Point(PointId),
    /// The top of a barrierless step between two minima (network reaction
    /// index, from, to).
    Barrierless(usize, PointId, PointId),
}

impl Target {
    /// The name used in reports: the point's id, or "a→b" for a barrierless
    /// step (as the energetic span report names it).
    pub fn name(&self, model: &Model) -> String {
        match *self {
            Target::Point(p) => model.point(p).id.clone(),
            Target::Barrierless(_, a, b) => {
                format!("{}→{}", model.point(a).id, model.point(b).id)
            }
        }
    }

    /// Whether it is TS-like (a TS or the top of a barrierless step).
    pub fn is_ts(&self, model: &Model) -> bool {
        match *self {
            Target::Point(p) => model.point(p).kind == Kind::TransitionState,
            Target::Barrierless(..) => true,
        }
    }
}

/// What the rate r of a degree of rate control is.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Rate {
    /// Steady-state turnover of the closed cycles, s⁻¹ per catalyst.
    Turnover,
    /// d[P]/dt (all products) at [`RATE_AT_CONVERSION`], mol L⁻¹ s⁻¹.
    ProductFormation,
}

/// Degrees of rate control of every TS, barrierless step and state.
#[derive(Debug, Clone, PartialEq)]
pub struct RateControl {
    /// What r is.
    pub rate: Rate,
    /// r itself, unperturbed (s⁻¹ or mol L⁻¹ s⁻¹; see [`Rate`]).
    pub value: f64,
    /// X of every target, TSs first in model order, then barrierless tops,
    /// then states.
    pub degrees: Vec<(Target, f64)>,
    /// Σ X over the TSs and barrierless tops (1 by the sum rule).
    pub sum_ts: f64,
    /// Σ X over the states (−1 by the sum rule).
    pub sum_states: f64,
}

impl RateControl {
    /// Whether both sum rules hold to [`SUM_TOLERANCE`].
    pub fn sum_rule_holds(&self) -> bool {
        (self.sum_ts - 1.0).abs() <= SUM_TOLERANCE && (self.sum_states + 1.0).abs() <= SUM_TOLERANCE
    }
}

/// Degrees of selectivity control toward the major product.
#[derive(Debug, Clone, PartialEq)]
pub struct SelectivityControl {
    /// The major product at the end of the unperturbed run.
    pub product: PointId,
    /// Its final fraction of all product, S.
    pub selectivity: f64,
    /// X_S of every target, in the order of [`RateControl::degrees`].
    pub degrees: Vec<(Target, f64)>,
}

/// Everything whose energy can be moved: TSs (model order), the tops of
/// barrierless steps, then the states (counters excluded: a regenerated
/// catalyst moves with its cycle's first state).
fn targets(model: &Model, net: &Network) -> Vec<Target> {
    let ts = (0..model.points().len())
        .filter(|&p| model.point(p).kind == Kind::TransitionState)
        .map(Target::Point);
    let tops = net
        .reactions
        .iter()
        .enumerate()
        .filter(|(_, r)| r.ts.is_none())
        .map(|(j, r)| {
            // A cycle's closing step leads to the regenerated catalyst.
            let to = r.counter.unwrap_or(r.to);
            Target::Barrierless(j, net.species[r.from].point, net.species[to].point)
        });
    let states = net
        .species
        .iter()
        .filter(|s| !s.counter)
        .map(|s| Target::Point(s.point));
    ts.chain(tops).chain(states).collect()
}

/// The network with `target` lowered by `delta_rt` (units of RT).
fn perturbed(model: &Model, net: &Network, target: Target, delta_rt: f64) -> Network {
    match target {
        Target::Point(p) => net.stabilised(model, p, delta_rt),
        Target::Barrierless(j, ..) => {
            let f = delta_rt.exp();
            let mut out = net.clone();
            out.reactions[j].kf *= f;
            out.reactions[j].kr *= f;
            out
        }
    }
}

/// A positive quantity of a network whose logarithmic derivatives are taken.
type Quantity<'a> = dyn Fn(&Network) -> Result<f64, SimulateError> + Sync + 'a;

/// ∂ln q/∂(−G/RT) of every target by central differences, in parallel (each
/// target is independent, so the result does not depend on the schedule).
fn degrees(
    model: &Model,
    net: &Network,
    q: &Quantity<'_>,
) -> Result<Vec<(Target, f64)>, SimulateError> {
    targets(model, net)
        .into_par_iter()
        .map(|t| {
            let up = q(&perturbed(model, net, t, DELTA_RT))?;
            let down = q(&perturbed(model, net, t, -DELTA_RT))?;
            Ok((t, (up.abs().ln() - down.abs().ln()) / (2.0 * DELTA_RT)))
        })
        .collect()
}

/// Degrees of rate control of `model` (see the module documentation for what
/// r is). `options.initial` says where the material starts for a profile
/// without a cycle; the stop rule is not used (r is taken at 50 % conversion).
pub fn rate_control(model: &Model, options: &Options) -> Result<RateControl, SimulateError> {
    let net = Network::new(model, &kinetics::analyze(model));
    let (rate, q): (Rate, Box<Quantity<'_>>) = if net.cycles.is_empty() {
        let options = Options {
            until: Until::Conversion(RATE_AT_CONVERSION),
            ..options.clone()
        };
        (
            Rate::ProductFormation,
            Box::new(move |n: &Network| product_formation(model, n, &options)),
        )
    } else {
        (Rate::Turnover, Box::new(steady_turnover))
    };
    let value = q(&net)?;
    let degrees = degrees(model, &net, &*q)?;
    let sum = |ts: bool| {
        degrees
            .iter()
            .filter(|(t, _)| t.is_ts(model) == ts)
            .map(|d| d.1)
            .sum()
    };
    Ok(RateControl {
        rate,
        value,
        sum_ts: sum(true),
        sum_states: sum(false),
        degrees,
    })
}

/// Degrees of selectivity control toward the major product at the end of a
/// run with `options`; `None` when fewer than two products form.
pub fn selectivity_control(
    model: &Model,
    options: &Options,
) -> Result<Option<SelectivityControl>, SimulateError> {
    let net = Network::new(model, &kinetics::analyze(model));
    let end = |n: &Network| -> Result<Vec<(PointId, f64, f64)>, SimulateError> {
        Ok(simulate_network(model, n.clone(), options, &mut |_, _| {})?.products)
    };
    let products = end(&net)?;
    if products.iter().filter(|p| p.1 > 0.0).count() < 2 {
        return Ok(None);
    }
    let (product, _, selectivity) = products
        .iter()
        .copied()
        .max_by(|a, b| a.2.total_cmp(&b.2).then(b.0.cmp(&a.0)))
        .expect("two products");
    let share = |n: &Network| -> Result<f64, SimulateError> {
        let p = end(n)?;
        Ok(p.iter().find(|q| q.0 == product).map_or(0.0, |q| q.2))
    };
    Ok(Some(SelectivityControl {
        product,
        selectivity,
        degrees: degrees(model, &net, &share)?,
    }))
}

/// Total steady-state turnover of the closed cycles, per catalyst (one unit of
/// catalyst in each cycle's first state; [`turnover`] solves the steady state
/// directly rather than integrating towards it).
fn steady_turnover(net: &Network) -> Result<f64, SimulateError> {
    let mut x = vec![0.0; net.len()];
    for cycle in &net.cycles {
        if let Some(&last) = cycle.last() {
            x[net.reactions[last].to] = 1.0;
        }
    }
    let r: f64 = turnover(net, &x).iter().map(|t| t.1).sum();
    if !(r.is_finite() && r != 0.0) {
        return Err(SimulateError::NoRateControl(
            "the cycle has no steady turnover (the catalyst ends outside it)".to_string(),
        ));
    }
    Ok(r)
}

/// d[P]/dt summed over the products (and cycle counters) when the starting
/// material reaches [`RATE_AT_CONVERSION`].
fn product_formation(
    model: &Model,
    net: &Network,
    options: &Options,
) -> Result<f64, SimulateError> {
    let sim = simulate_network(model, net.clone(), options, &mut |_, _| {})?;
    if sim.stopped != Stopped::Conversion {
        return Err(SimulateError::NoRateControl(format!(
            "the starting material does not reach {:.0} % conversion (the run ends at {:.1} %)",
            RATE_AT_CONVERSION * 100.0,
            sim.conversion.unwrap_or(0.0) * 100.0
        )));
    }
    let x = &sim.last().x;
    let mut dx = vec![0.0; x.len()];
    net.rhs(x, &mut dx);
    let r: f64 = net
        .species
        .iter()
        .zip(&dx)
        .filter(|(s, _)| s.product || s.counter)
        .map(|(_, v)| v)
        .sum();
    if !(r.is_finite() && r > 0.0) {
        return Err(SimulateError::NoRateControl(
            "no product forms at 50 % conversion".to_string(),
        ));
    }
    Ok(r)
}
