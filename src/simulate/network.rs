//! The mass-action system a profile implies: one concentration per minimum,
//! one reversible first-order reaction per elementary step.
//!
//! The right-hand side is assembled as the net flux of each step (forward
//! minus reverse), taken from one state and given to the other. Summing a
//! rate matrix times the concentrations instead cancels terms of size
//! k·x ≈ 1e12 against each other in a fast pre-equilibrium and loses mass;
//! flux pairs conserve it to rounding by construction.

use crate::kinetics::Analysis;
use crate::model::{Kind, Model, PointId};

/// One reversible first-order step `from ⇌ to`.
#[derive(Debug, Clone, PartialEq)]
pub struct Reaction {
    /// Species index the forward direction consumes.
    pub from: usize,
    /// Species index the forward direction produces.
    pub to: usize,
    /// The transition state, `None` for a barrierless step.
    pub ts: Option<PointId>,
    /// Forward rate constant, s⁻¹.
    pub kf: f64,
    /// Reverse rate constant, s⁻¹.
    pub kr: f64,
    /// For the last step of a catalytic cycle: the species that counts the
    /// product released (it receives the net flux but gives nothing back, as
    /// the catalyst itself returns to the cycle's first state).
    pub counter: Option<usize>,
}

/// A species of the simulation: one minimum of the model.
#[derive(Debug, Clone, PartialEq)]
pub struct Species {
    /// The minimum it stands for.
    pub point: PointId,
    /// True for the regenerated-catalyst state of a cycle, whose value is the
    /// product released so far rather than a concentration of catalyst.
    pub counter: bool,
    /// True when the model marks the state as a product.
    pub product: bool,
    /// True for states of a catalytic cycle (they hold the catalyst).
    pub in_cycle: bool,
}

/// The ODE system dx/dt = f(x) of a model, first order in every state.
#[derive(Debug, Clone, PartialEq)]
pub struct Network {
    /// Species in model point order (minima only).
    pub species: Vec<Species>,
    /// Reactions in model step order.
    pub reactions: Vec<Reaction>,
    /// For each closed catalytic cycle, its reactions in turnover order (the
    /// closing one last).
    pub cycles: Vec<Vec<usize>>,
}

impl Network {
    /// Builds the system from a model and its analysis (so the simulation uses
    /// exactly the rate constants, κ included, that `analyze` reports).
    ///
    /// A `cycle = true` path whose last state takes part in no other step is
    /// closed: its last step returns the catalyst to the first state and the
    /// last state counts the product released (substrate in excess, folded
    /// into the energies as pseudo-first order).
    pub fn new(model: &Model, analysis: &Analysis) -> Network {
        let mut index = vec![usize::MAX; model.points().len()];
        let mut species = Vec::new();
        for (id, p) in model.points().iter().enumerate() {
            if p.kind == Kind::Minimum {
                index[id] = species.len();
                species.push(Species {
                    point: id,
                    counter: false,
                    product: p.product,
                    in_cycle: false,
                });
            }
        }
        // Cycle ends that can be closed: regenerated catalyst → first state.
        let mut closing: Vec<(PointId, PointId)> = Vec::new(); // (end, first)
        for path in model.paths().iter().filter(|p| p.cycle) {
            let minima: Vec<PointId> = path
                .via
                .iter()
                .copied()
                .filter(|&i| model.point(i).kind == Kind::Minimum)
                .collect();
            let (Some(&first), Some(&end)) = (minima.first(), minima.last()) else {
                continue;
            };
            let uses = model
                .steps()
                .iter()
                .filter(|s| s.from == end || s.to == end)
                .count();
            for &m in &minima {
                species[index[m]].in_cycle = true;
            }
            if uses == 1 && first != end {
                closing.push((end, first));
                species[index[end]].counter = true;
            }
        }
        let reactions = analysis
            .steps
            .iter()
            .map(|sk| {
                let s = sk.step;
                let close = |p: PointId| closing.iter().find(|c| c.0 == p).map(|c| c.1);
                let (mut from, mut to, mut counter) = (s.from, s.to, None);
                let (mut kf, mut kr) = (sk.k_forward.per_second(), sk.k_reverse.per_second());
                if let Some(first) = close(to) {
                    counter = Some(index[to]);
                    to = first;
                } else if let Some(first) = close(from) {
                    // Written from the regenerated catalyst: turn it round.
                    counter = Some(index[from]);
                    from = to;
                    to = first;
                    std::mem::swap(&mut kf, &mut kr);
                }
                Reaction {
                    from: index[from],
                    to: index[to],
                    ts: s.ts,
                    kf,
                    kr,
                    counter,
                }
            })
            .collect::<Vec<Reaction>>();
        let cycles = model
            .paths()
            .iter()
            .filter(|p| p.cycle)
            .filter_map(|p| {
                let end = *p
                    .via
                    .iter()
                    .rev()
                    .find(|&&i| model.point(i).kind == Kind::Minimum)?;
                closing.iter().find(|c| c.0 == end)?;
                path_reactions(model, &p.via, analysis)
            })
            .collect();
        Network {
            species,
            reactions,
            cycles,
        }
    }

    /// Connected part of each species (a representative index); counters
    /// stand alone, as nothing flows out of them.
    pub fn components(&self) -> Vec<usize> {
        let mut parent: Vec<usize> = (0..self.len()).collect();
        fn root(p: &mut [usize], mut i: usize) -> usize {
            while p[i] != i {
                p[i] = p[p[i]];
                i = p[i];
            }
            i
        }
        for r in &self.reactions {
            let (a, b) = (root(&mut parent, r.from), root(&mut parent, r.to));
            parent[a.max(b)] = a.min(b);
        }
        (0..self.len()).map(|i| root(&mut parent, i)).collect()
    }

    /// Number of species (the ODE's dimension).
    pub fn len(&self) -> usize {
        self.species.len()
    }

    /// True when the model has no minimum (never for a validated model).
    pub fn is_empty(&self) -> bool {
        self.species.is_empty()
    }

    /// Net flux (forward − reverse) of every reaction, mol L⁻¹ s⁻¹.
    pub fn fluxes(&self, x: &[f64]) -> Vec<f64> {
        self.reactions
            .iter()
            .map(|r| r.kf * x[r.from] - r.kr * x[r.to])
            .collect()
    }

    /// dx/dt into `y`, as the net flux of each step moved from one state to
    /// the other.
    pub fn rhs(&self, x: &[f64], y: &mut [f64]) {
        y.iter_mut().for_each(|v| *v = 0.0);
        for r in &self.reactions {
            let net = r.kf * x[r.from] - r.kr * x[r.to];
            y[r.from] -= net;
            y[r.to] += net;
            if let Some(c) = r.counter {
                y[c] += net;
            }
        }
    }

    /// The analytic Jacobian times a vector, J·v into `y` (the system is
    /// linear, so this is the right-hand side applied to `v`).
    pub fn jac_mul(&self, v: &[f64], y: &mut [f64]) {
        self.rhs(v, y);
    }

    /// The conserved amount: every species except product counters.
    pub fn total(&self, x: &[f64]) -> f64 {
        self.species
            .iter()
            .zip(x)
            .filter(|(s, _)| !s.counter)
            .map(|(_, v)| v)
            .sum()
    }

    /// Species that are the starting material's pool for conversion: neither
    /// products nor counters nor catalyst states.
    pub fn in_pool(&self, i: usize) -> bool {
        let s = &self.species[i];
        !s.product && !s.counter && !s.in_cycle
    }

    /// Whether nothing changes any more: every state's net rate of change is
    /// negligible beside the gross flux through it (equilibrium, or the steady
    /// state of a catalytic cycle). `atol` is the concentration below which a
    /// state counts as empty.
    pub fn settled(&self, x: &[f64], rel: f64, atol: f64) -> bool {
        let n = self.len();
        let mut dx = vec![0.0; n];
        let mut gross = vec![0.0; n];
        let mut kscale = vec![0.0; n];
        for r in &self.reactions {
            let (f, b) = (r.kf * x[r.from], r.kr * x[r.to]);
            dx[r.from] -= f - b;
            dx[r.to] += f - b;
            for i in [r.from, r.to] {
                gross[i] += f.abs() + b.abs();
                kscale[i] += r.kf + r.kr;
            }
        }
        (0..n)
            .filter(|&i| !self.species[i].counter)
            .all(|i| dx[i].abs() <= rel * gross[i] + atol * kscale[i])
    }

    /// The same network with point `point` lowered by `delta_rt` (in units of
    /// RT), every other energy held: the perturbation of a degree of rate
    /// control. A TS speeds up both directions of its steps by e^δ; a minimum
    /// slows the steps that leave it by e^−δ. The top of a barrierless step is
    /// held too (it is perturbed on its own, in [`super::control`]), so
    /// that TS-like and state-like controls stay separate and each sum rule
    /// holds. A cycle's first state stands for the regenerated catalyst as well
    /// (the closing step's reverse leaves it), so both move together and ΔGr
    /// is unchanged; a counter's own point changes nothing.
    pub fn stabilised(&self, model: &Model, point: PointId, delta_rt: f64) -> Network {
        let f = delta_rt.exp();
        let mut out = self.clone();
        let is_ts = model.point(point).kind == Kind::TransitionState;
        for r in &mut out.reactions {
            if is_ts {
                if r.ts == Some(point) {
                    r.kf *= f;
                    r.kr *= f;
                }
                continue;
            }
            if self.species[r.from].point == point {
                r.kf /= f;
            }
            if self.species[r.to].point == point {
                r.kr /= f;
            }
        }
        out
    }
}

/// The reactions (indices into the analysis' steps) along a path, in order.
fn path_reactions(model: &Model, via: &[PointId], analysis: &Analysis) -> Option<Vec<usize>> {
    let mut out = Vec::new();
    let mut previous: Option<PointId> = None;
    let mut ts = None;
    for &id in via {
        if model.point(id).kind == Kind::TransitionState {
            ts = Some(id);
            continue;
        }
        if let Some(a) = previous {
            let found = analysis.steps.iter().position(|sk| {
                let s = sk.step;
                s.ts == ts && ((s.from == a && s.to == id) || (s.from == id && s.to == a))
            })?;
            out.push(found);
        }
        previous = Some(id);
        ts = None;
    }
    Some(out)
}
