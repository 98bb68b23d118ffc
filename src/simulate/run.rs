//! One simulation from a model: build the network, integrate until the stop
//! rule is met, and summarise (final distribution, product fractions, times
//! to 50/90/99 % conversion, drift of the product ratio).

use super::SimulateError;
use super::initial::Initial;
use super::integrate::{Flow, StepView, Tolerances, integrate};
use super::network::{Network, SettledWork};
use super::until::Until;
use crate::kinetics;
use crate::model::{Model, PointId};

/// How to simulate.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Options {
    /// When to stop.
    pub until: Until,
    /// Where the material starts.
    pub initial: Initial,
    /// Integrator error control.
    pub tolerances: Tolerances,
}

/// Why the run stopped.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Stopped {
    /// The requested (or default 99 %) conversion was reached.
    Conversion,
    /// Nothing changes any more: equilibrium, or a cycle's steady state.
    Equilibrium,
    /// The requested time was reached.
    Time,
    /// [`TIME_LIMIT_S`] passed without conversion or equilibrium.
    TimeLimit,
}

/// Longest simulated time when no time is given: about 32 million years.
pub const TIME_LIMIT_S: f64 = 1e15;

/// Conversions whose times are reported.
pub const MILESTONES: [f64; 3] = [0.5, 0.9, 0.99];

/// Below this fraction of the final amount of product, fractions are not yet
/// meaningful for the drift check.
const DRIFT_FROM: f64 = 0.05;

/// Relative imbalance below which a state counts as settled.
const SETTLED_REL: f64 = 1e-9;

/// One recorded point of the time course.
#[derive(Debug, Clone, PartialEq)]
pub struct Sample {
    /// Time, s.
    pub t: f64,
    /// The state: concentration per species (product released so far for a
    /// counter), then per co-reactant ([`Network::coreactants`]), mol/L.
    pub x: Vec<f64>,
}

/// The result of one simulation.
#[derive(Debug, Clone, PartialEq)]
pub struct Simulation {
    /// The system that was integrated.
    pub network: Network,
    /// The time course: t = 0 and every accepted step.
    pub samples: Vec<Sample>,
    /// Why it stopped.
    pub stopped: Stopped,
    /// Time to each of [`MILESTONES`], when reached (`None` without a pool of
    /// starting material, e.g. a catalytic cycle alone).
    pub milestones: Vec<(f64, Option<f64>)>,
    /// Conversion of the starting material at the end (`None` without a pool).
    pub conversion: Option<f64>,
    /// (product point, amount in mol/L, fraction of all product) at the end.
    pub products: Vec<(PointId, f64, f64)>,
    /// Largest change of any product's fraction once 5 % of the final product
    /// had formed: non-zero when products interconvert or form reversibly.
    pub ratio_drift: f64,
    /// |total(end) − total(0)| / total(0), mass balance of the integration.
    pub mass_error: f64,
    /// The most negative concentration met (0 if none), mol/L.
    pub most_negative: f64,
    /// Turnover frequency (s⁻¹, per catalyst) of each closed cycle at the end:
    /// (regenerated-catalyst point, TOF).
    pub turnover: Vec<(PointId, f64)>,
}

impl Simulation {
    /// The last sample.
    pub fn last(&self) -> &Sample {
        self.samples.last().expect("t = 0 is always recorded")
    }
    /// The time reached, s.
    pub fn time_s(&self) -> f64 {
        self.last().t
    }
}

/// Runs a simulation; `progress(t, conversion)` is called after every step.
pub fn simulate(
    model: &Model,
    options: &Options,
    progress: &mut dyn FnMut(f64, Option<f64>),
) -> Result<Simulation, SimulateError> {
    let network = Network::new(model, &kinetics::analyze(model));
    simulate_network(model, network, options, progress)
}

/// Runs a simulation of a given network of `model` (e.g. one with a point's
/// energy perturbed, for degrees of rate control).
pub fn simulate_network(
    model: &Model,
    network: Network,
    options: &Options,
    progress: &mut dyn FnMut(f64, Option<f64>),
) -> Result<Simulation, SimulateError> {
    let by_point = options.initial.resolve(model)?;
    let species: Vec<f64> = network.species.iter().map(|s| by_point[s.point]).collect();
    let mut x0 = network.state(&species);
    for (w, c) in network.coreactants.iter().enumerate() {
        if let Some(given) = options.initial.coreactant(&c.name) {
            x0[network.free(w)] = given;
        }
    }
    let pool_at = pool_of(&network, &x0);
    let pool = |x: &[f64]| pool_at.iter().map(|&i| x[i]).sum::<f64>();
    let pool0: f64 = pool(&x0);
    let has_pool = pool0 > 0.0;
    let target = match options.until {
        Until::Conversion(c) => {
            if !has_pool {
                return Err(SimulateError::NoConversion);
            }
            Some(c)
        }
        Until::Default if has_pool => Some(MILESTONES[2]),
        _ => None,
    };
    let t_end = match options.until {
        Until::Time(t) => t,
        _ => TIME_LIMIT_S,
    };
    let conversion = |x: &[f64]| 1.0 - pool(x) / pool0;
    let atol = options.tolerances.atol_fraction * network.total(&x0);
    let mut samples = vec![Sample {
        t: 0.0,
        x: x0.clone(),
    }];
    let mut milestones: Vec<(f64, Option<f64>)> = MILESTONES.iter().map(|&m| (m, None)).collect();
    let mut stopped = if matches!(options.until, Until::Time(_)) {
        Stopped::Time
    } else {
        Stopped::TimeLimit
    };
    let mut settled_work = SettledWork::default();
    let mut observe = |step: &StepView<'_>| -> Result<Flow, SimulateError> {
        let mut flow = Flow::Continue;
        let mut x = step.x.to_vec();
        let mut t = step.t;
        if has_pool {
            let c = conversion(step.x);
            for m in milestones.iter_mut().filter(|m| m.1.is_none() && c >= m.0) {
                m.1 = Some(crossing(step, m.0, &conversion)?);
            }
            if let Some(goal) = target.filter(|&g| c >= g) {
                t = crossing(step, goal, &conversion)?;
                x = step.at(t)?;
                stopped = Stopped::Conversion;
                flow = Flow::Stop;
            }
        }
        if flow == Flow::Continue
            && !matches!(options.until, Until::Time(_))
            && network.settled_in(step.x, SETTLED_REL, atol, &mut settled_work)
        {
            stopped = Stopped::Equilibrium;
            flow = Flow::Stop;
        }
        progress(t, has_pool.then(|| conversion(&x)));
        samples.push(Sample { t, x });
        Ok(flow)
    };
    integrate(&network, &x0, t_end, options.tolerances, &mut observe)?;
    let last = samples.last().expect("t = 0 recorded").x.clone();
    let mass_error = mass_error(&network, &x0, &last);
    let most_negative = samples
        .iter()
        .flat_map(|s| s.x.iter().copied())
        .fold(0.0_f64, f64::min);
    let products = product_fractions(&network, &last);
    let ratio_drift = drift(&network, &samples, &products);
    let turnover = turnover(&network, &last);
    Ok(Simulation {
        conversion: has_pool.then(|| conversion(&last)),
        network,
        samples,
        stopped,
        milestones,
        products,
        ratio_drift,
        mass_error,
        most_negative,
        turnover,
    })
}

/// The entries of the state whose loss is the conversion: the starting pool
/// of states (not product, not catalyst, not counter) when material starts
/// there; otherwise (all material in a catalytic cycle) the co-reactant a
/// step consumes that starts lowest — the substrate at a catalyst loading.
fn pool_of(net: &Network, x0: &[f64]) -> Vec<usize> {
    let states: Vec<usize> = (0..net.len()).filter(|&i| net.in_pool(i)).collect();
    if states.iter().any(|&i| x0[i] > 0.0) {
        return states;
    }
    (0..net.coreactants.len())
        .filter(|&w| net.reactions.iter().any(|r| r.forward_with.contains(&w)))
        .map(|w| net.free(w))
        .filter(|&i| x0[i] > 0.0)
        .min_by(|&a, &b| x0[a].total_cmp(&x0[b]))
        .into_iter()
        .collect()
}

/// The largest relative change of a conserved amount between `x0` and `x`:
/// the material of the states (counters aside), and each co-reactant free
/// plus bound (when the steps give it a consistent bound content).
fn mass_error(net: &Network, x0: &[f64], x: &[f64]) -> f64 {
    let relative = |a: f64, b: f64| if a > 0.0 { (b - a).abs() / a } else { 0.0 };
    let material = relative(net.total(x0), net.total(x));
    (0..net.coreactants.len())
        .filter_map(|w| net.bound(w).map(|n| (w, n)))
        .map(|(w, n)| {
            relative(
                net.coreactant_total(w, &n, x0),
                net.coreactant_total(w, &n, x),
            )
        })
        .fold(material, f64::max)
}

/// The time inside the step at which the conversion reaches `goal`, by
/// bisection on the integrator's interpolant (conversion rises monotonically
/// within a step for the mass-action systems eyrie builds).
fn crossing(
    step: &StepView<'_>,
    goal: f64,
    conversion: &dyn Fn(&[f64]) -> f64,
) -> Result<f64, SimulateError> {
    let (mut lo, mut hi) = (step.t_prev, step.t);
    for _ in 0..100 {
        let mid = 0.5 * (lo + hi);
        if mid <= lo || mid >= hi {
            break;
        }
        if conversion(&step.at(mid)?) >= goal {
            hi = mid;
        } else {
            lo = mid;
        }
    }
    Ok(hi)
}

/// (product, amount, fraction of all product) for every product species.
pub fn product_fractions(net: &Network, x: &[f64]) -> Vec<(PointId, f64, f64)> {
    let amounts: Vec<(PointId, f64)> = net
        .species
        .iter()
        .zip(x)
        .filter(|(s, _)| s.product || s.counter)
        .map(|(s, &v)| (s.point, v.max(0.0)))
        .collect();
    let sum: f64 = amounts.iter().map(|a| a.1).sum();
    amounts
        .into_iter()
        .map(|(p, a)| (p, a, if sum > 0.0 { a / sum } else { 0.0 }))
        .collect()
}

fn drift(net: &Network, samples: &[Sample], end: &[(PointId, f64, f64)]) -> f64 {
    let final_total: f64 = end.iter().map(|p| p.1).sum();
    if end.len() < 2 || final_total <= 0.0 {
        return 0.0;
    }
    let mut lo = vec![f64::INFINITY; end.len()];
    let mut hi = vec![f64::NEG_INFINITY; end.len()];
    for s in samples {
        let f = product_fractions(net, &s.x);
        if f.iter().map(|p| p.1).sum::<f64>() < DRIFT_FROM * final_total {
            continue;
        }
        for (i, p) in f.iter().enumerate() {
            lo[i] = lo[i].min(p.2);
            hi[i] = hi[i].max(p.2);
        }
    }
    lo.iter()
        .zip(&hi)
        .map(|(a, b)| b - a)
        .filter(|d| d.is_finite())
        .fold(0.0, f64::max)
}

/// TOF of each closed cycle (regenerated-catalyst point, s⁻¹ per catalyst),
/// from the exact steady state that the run has reached.
///
/// At steady state every step of an unbranched cycle carries the same net
/// flux; it is read at the step with the smallest gross flux, where forward
/// and reverse do not nearly cancel (beside a fast pre-equilibrium they agree
/// to 1e-9 and more, below the integrator's resolution).
///
/// Co-reactants are held at their values in `x` (stated values when `x`
/// holds the species only): the catalyst's steady state at that moment.
pub fn turnover(net: &Network, x: &[f64]) -> Vec<(PointId, f64)> {
    if net.cycles.is_empty() {
        // No cycle, no turnover: skip the steady-state solve (dense LU).
        return Vec::new();
    }
    let full = if x.len() >= net.dim() {
        x.to_vec()
    } else {
        net.state(&x[..net.len()])
    };
    let net = &net.frozen(&full);
    let x = &full[..net.len()];
    let ss = super::steady::polish(net, x).unwrap_or_else(|| x.to_vec());
    let part = net.components();
    net.cycles
        .iter()
        .filter_map(|cycle| {
            let closing = &net.reactions[*cycle.last()?];
            let counter = closing.counter?;
            let catalyst: f64 = (0..net.len())
                .filter(|&i| part[i] == part[closing.to] && !net.species[i].counter)
                .map(|i| ss[i])
                .sum();
            let gross = |r: &super::network::Reaction| r.kf * ss[r.from] + r.kr * ss[r.to];
            let r = cycle
                .iter()
                .map(|&j| &net.reactions[j])
                .min_by(|a, b| gross(a).total_cmp(&gross(b)))?;
            let mut flux = r.kf * ss[r.from] - r.kr * ss[r.to];
            // Reactions may be written against the turnover direction.
            if !forward_in_cycle(net, cycle, r) {
                flux = -flux;
            }
            Some((net.species[counter].point, flux / catalyst))
        })
        .collect()
}

/// Whether reaction `r` runs forward in the turnover direction of `cycle`.
fn forward_in_cycle(net: &Network, cycle: &[usize], r: &super::network::Reaction) -> bool {
    // Follow the cycle from the closing reaction's target (its first state).
    let mut at = net.reactions[*cycle.last().expect("non-empty")].to;
    for &j in cycle {
        let q = &net.reactions[j];
        let fwd = q.from == at;
        if std::ptr::eq(q, r) {
            return fwd;
        }
        at = if fwd { q.to } else { q.from };
    }
    true
}
