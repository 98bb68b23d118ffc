//! The mass-action system a profile implies: one concentration per minimum,
//! one reversible reaction per elementary step, and one concentration per
//! co-reactant that a step consumes.
//!
//! A step is first order in its states; it is also first order in each
//! co-reactant it consumes (free in the state it leaves, not in the state it
//! reaches), which makes it bimolecular: rate = k₂·[A]·[W]. The rate constants
//! are the pseudo-first-order ones `analyze` reports, k = k₂·c, where c is the
//! `[coreactants]` concentration; a bimolecular rate is written
//! k·[A]·([W]/c), so the simulation equals `analyze` whenever [W] stays at c
//! (the excess limit) and k₂ = k/c is the Eyring constant at the 1 mol/L
//! standard state.
//!
//! The right-hand side is assembled as the net flux of each step (forward
//! minus reverse), taken from one state and given to the other. Summing a
//! rate matrix times the concentrations instead cancels terms of size
//! k·x ≈ 1e12 against each other in a fast pre-equilibrium and loses mass;
//! flux pairs conserve it to rounding by construction.

use crate::kinetics::Analysis;
use crate::model::{Kind, Model, PointId};

/// One reversible step `from ⇌ to`, first order in each side's state and in
/// the co-reactants that side consumes.
#[derive(Debug, Clone, PartialEq)]
pub struct Reaction {
    /// Species index the forward direction consumes.
    pub from: usize,
    /// Species index the forward direction produces.
    pub to: usize,
    /// The transition state, `None` for a barrierless step.
    pub ts: Option<PointId>,
    /// Forward rate constant, s⁻¹ (pseudo-first order at the stated
    /// concentration of the co-reactants the forward direction consumes).
    pub kf: f64,
    /// Reverse rate constant, s⁻¹ (likewise for the reverse direction).
    pub kr: f64,
    /// Co-reactants (indices into [`Network::coreactants`]) the forward
    /// direction consumes and the reverse direction releases.
    pub forward_with: Vec<usize>,
    /// Co-reactants the reverse direction consumes and the forward releases.
    pub reverse_with: Vec<usize>,
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

/// Workspace of [`Network::settled_in`]: net rates, gross fluxes and the
/// rate-constant scale of each state.
#[derive(Debug, Clone, Default)]
pub struct SettledWork {
    dx: Vec<f64>,
    gross: Vec<f64>,
    kscale: Vec<f64>,
}

/// A co-reactant that some step consumes: a species of its own, after the
/// minima in the state vector.
#[derive(Debug, Clone, PartialEq)]
pub struct Coreactant {
    /// Its name in `[coreactants]`.
    pub name: String,
    /// Its `[coreactants]` concentration, mol/L: the initial value, and the
    /// concentration at which `kf`/`kr` are pseudo-first order.
    pub stated: f64,
}

/// The ODE system dx/dt = f(x) of a model. The state vector holds the
/// minima ([`Network::species`]) then the co-reactants.
#[derive(Debug, Clone, PartialEq)]
pub struct Network {
    /// Species in model point order (minima only).
    pub species: Vec<Species>,
    /// Co-reactants consumed by some step, in order of first use.
    pub coreactants: Vec<Coreactant>,
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
    /// last state counts the product released. A substrate in excess is
    /// folded into the energies as pseudo-first order; one listed with `with`
    /// on the cycle's states is consumed as a co-reactant instead.
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
        let mut coreactants: Vec<Coreactant> = Vec::new();
        let reactions = analysis
            .steps
            .iter()
            .map(|sk| {
                let s = sk.step;
                let close = |p: PointId| closing.iter().find(|c| c.0 == p).map(|c| c.1);
                let (mut from, mut to, mut counter) = (s.from, s.to, None);
                let (mut kf, mut kr) = (sk.k_forward.per_second(), sk.k_reverse.per_second());
                let mut forward_with = consumed(model, s.from, s.to, &mut coreactants);
                let mut reverse_with = consumed(model, s.to, s.from, &mut coreactants);
                if let Some(first) = close(to) {
                    counter = Some(index[to]);
                    to = first;
                } else if let Some(first) = close(from) {
                    // Written from the regenerated catalyst: turn it round.
                    counter = Some(index[from]);
                    from = to;
                    to = first;
                    std::mem::swap(&mut kf, &mut kr);
                    std::mem::swap(&mut forward_with, &mut reverse_with);
                }
                Reaction {
                    from: index[from],
                    to: index[to],
                    ts: s.ts,
                    kf,
                    kr,
                    forward_with,
                    reverse_with,
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
            coreactants,
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

    /// Number of species (minima), the first entries of the state vector.
    pub fn len(&self) -> usize {
        self.species.len()
    }

    /// True when the model has no minimum (never for a validated model).
    pub fn is_empty(&self) -> bool {
        self.species.is_empty()
    }

    /// The ODE's dimension: species, then co-reactants.
    pub fn dim(&self) -> usize {
        self.species.len() + self.coreactants.len()
    }

    /// Index in the state vector of co-reactant `w`.
    pub fn free(&self, w: usize) -> usize {
        self.species.len() + w
    }

    /// The initial state vector: `species` (one per minimum) then each
    /// co-reactant at its stated concentration.
    pub fn state(&self, species: &[f64]) -> Vec<f64> {
        let mut x = species.to_vec();
        x.extend(self.coreactants.iter().map(|c| c.stated));
        x
    }

    /// Forward and reverse rates of reaction `r`, mol L⁻¹ s⁻¹.
    pub fn rates(&self, r: &Reaction, x: &[f64]) -> (f64, f64) {
        let side = |k: f64, s: usize, with: &[usize]| {
            with.iter().fold(k * x[s], |acc, &w| {
                acc * x[self.free(w)] / self.coreactants[w].stated
            })
        };
        (
            side(r.kf, r.from, &r.forward_with),
            side(r.kr, r.to, &r.reverse_with),
        )
    }

    /// Net flux (forward − reverse) of every reaction, mol L⁻¹ s⁻¹.
    pub fn fluxes(&self, x: &[f64]) -> Vec<f64> {
        self.reactions
            .iter()
            .map(|r| {
                let (f, b) = self.rates(r, x);
                f - b
            })
            .collect()
    }

    /// Adds the net flux `net` of reaction `r` to dx/dt in `y`: taken from
    /// one side, given to the other, co-reactants consumed and released.
    fn apply(&self, r: &Reaction, net: f64, y: &mut [f64]) {
        self.apply_first_order(r, net, y);
        for &w in &r.forward_with {
            y[self.free(w)] -= net;
        }
        for &w in &r.reverse_with {
            y[self.free(w)] += net;
        }
    }

    /// dx/dt into `y`, as the net flux of each step moved from one state to
    /// the other.
    pub fn rhs(&self, x: &[f64], y: &mut [f64]) {
        y.fill(0.0);
        for r in &self.reactions {
            self.add_flux(r, x, y);
        }
    }

    /// Adds the net flux of reaction `r` at `x` to dx/dt in `y` (one term of
    /// [`Network::rhs`]).
    #[inline]
    pub fn add_flux(&self, r: &Reaction, x: &[f64], y: &mut [f64]) {
        if r.forward_with.is_empty() && r.reverse_with.is_empty() {
            // The common first-order step, without the co-reactant loops
            // (the same arithmetic as `rates` and `apply`).
            self.apply_first_order(r, r.kf * x[r.from] - r.kr * x[r.to], y);
        } else {
            let (f, b) = self.rates(r, x);
            self.apply(r, f - b, y);
        }
    }

    /// [`Network::apply`] for a step without co-reactants.
    #[inline]
    fn apply_first_order(&self, r: &Reaction, net: f64, y: &mut [f64]) {
        y[r.from] -= net;
        y[r.to] += net;
        if let Some(c) = r.counter {
            y[c] += net;
        }
    }

    /// The analytic Jacobian at `x` times a vector, J·v into `y`: each net
    /// flux differentiated along `v` (product rule over the state and the
    /// co-reactants of each side), distributed as in [`Network::rhs`]. Every
    /// entry of `v` a rate depends on is read even where its coefficient is
    /// zero, so a NaN probe finds the full sparsity pattern.
    pub fn jac_mul(&self, x: &[f64], v: &[f64], y: &mut [f64]) {
        let along = |k: f64, s: usize, with: &[usize]| {
            let (mut value, mut d) = (k * x[s], k * v[s]);
            for &w in with {
                let c = self.coreactants[w].stated;
                let (xw, vw) = (x[self.free(w)] / c, v[self.free(w)] / c);
                d = d * xw + value * vw;
                value *= xw;
            }
            d
        };
        y.fill(0.0);
        for r in &self.reactions {
            if r.forward_with.is_empty() && r.reverse_with.is_empty() {
                self.apply_first_order(r, r.kf * v[r.from] - r.kr * v[r.to], y);
            } else {
                let net = along(r.kf, r.from, &r.forward_with) - along(r.kr, r.to, &r.reverse_with);
                self.apply(r, net, y);
            }
        }
    }

    /// Every term of the analytic Jacobian at `x`, as `term(row, column,
    /// value)`: each reaction's net flux differentiated by each state it
    /// reads (product rule, as [`Network::jac_mul`]), given to each state its
    /// flux changes. Terms come in the same order at every `x` (reaction
    /// order), so a caller can find where each one goes once and then only
    /// add; terms on one entry are to be summed. Used for the Jacobian
    /// itself, where `jac_mul` would take one pass per column.
    pub fn jacobian_terms(&self, x: &[f64], mut term: impl FnMut(usize, usize, f64)) {
        self.flux_derivatives(x, |r, c, d| {
            term(r.from, c, -d);
            term(r.to, c, d);
            if let Some(counter) = r.counter {
                term(counter, c, d);
            }
            for &w in &r.forward_with {
                term(self.free(w), c, -d);
            }
            for &w in &r.reverse_with {
                term(self.free(w), c, d);
            }
        });
    }

    /// The column sums of the Jacobian at `x` into `out`: Σᵢ ∂fᵢ/∂x_c, the
    /// rate at which total material changes with x_c. A step that takes
    /// from one state what it gives to another contributes exactly zero (it
    /// is not summed from its ± terms, which would leave rounding of the
    /// size of its rate constant); only counters and co-reactants make it
    /// non-zero. The LU of the Newton matrix uses it to compute pivots
    /// without cancellation (see `sparse_lu`).
    pub fn jacobian_column_sums(&self, x: &[f64], out: &mut [f64]) {
        out.fill(0.0);
        self.flux_derivatives(x, |r, c, d| {
            let gained = r.counter.is_some() as usize + r.reverse_with.len();
            let lost = r.forward_with.len();
            if gained != lost {
                out[c] += (gained as f64 - lost as f64) * d;
            }
        });
    }

    /// ∂(net flux of r)/∂x_c for every reaction r and every state c it reads
    /// (each once), in reaction order.
    fn flux_derivatives(&self, x: &[f64], mut each: impl FnMut(&Reaction, usize, f64)) {
        // ∂/∂x_c of k·x_s·Π(x_w/c_w): the product rule along the unit vector e_c.
        let side = |k: f64, s: usize, with: &[usize], c: usize| {
            let (mut value, mut d) = (k * x[s], if s == c { k } else { 0.0 });
            for &w in with {
                let stated = self.coreactants[w].stated;
                let dw = if self.free(w) == c { 1.0 / stated } else { 0.0 };
                let xw = x[self.free(w)] / stated;
                d = d * xw + value * dw;
                value *= xw;
            }
            d
        };
        for r in &self.reactions {
            let reads = [r.from, r.to].into_iter().chain(
                r.forward_with
                    .iter()
                    .chain(&r.reverse_with)
                    .map(|&w| self.free(w)),
            );
            for (i, c) in reads.clone().enumerate() {
                if reads.clone().position(|other| other == c) != Some(i) {
                    continue; // already differentiated by this state
                }
                let d =
                    side(r.kf, r.from, &r.forward_with, c) - side(r.kr, r.to, &r.reverse_with, c);
                each(r, c, d);
            }
        }
    }

    /// Every entry of the Jacobian that can be non-zero, as (row, column),
    /// sorted by column then row: each state a rate reads (its side's state
    /// and co-reactants) against each state its flux changes. The same set a
    /// NaN probe of [`Network::jac_mul`] finds, known without the probe.
    pub fn jacobian_pattern(&self) -> Vec<(usize, usize)> {
        let mut out = Vec::new();
        for r in &self.reactions {
            let coreactants = r.forward_with.iter().chain(&r.reverse_with);
            let reads: Vec<usize> = [r.from, r.to]
                .into_iter()
                .chain(coreactants.map(|&w| self.free(w)))
                .collect();
            for &column in &reads {
                for &row in reads.iter().chain(&r.counter) {
                    out.push((row, column));
                }
            }
        }
        out.sort_unstable_by_key(|&(row, column)| (column, row));
        out.dedup();
        out
    }

    /// The first-order network with every co-reactant held at its value in
    /// `x` (folded into the rate constants): what the catalyst states see
    /// at one moment, for the exact steady state of a cycle.
    pub fn frozen(&self, x: &[f64]) -> Network {
        let mut out = self.clone();
        let factor = |with: &[usize]| -> f64 {
            with.iter()
                .map(|&w| x[self.free(w)] / self.coreactants[w].stated)
                .product()
        };
        for r in &mut out.reactions {
            r.kf *= factor(&r.forward_with);
            r.kr *= factor(&r.reverse_with);
            r.forward_with.clear();
            r.reverse_with.clear();
        }
        out.coreactants.clear();
        out
    }

    /// Units of co-reactant `w` bound in each species (free + bound is
    /// conserved): +1 across every step that consumes it. For a counter, the
    /// units one turnover's product carries away. `None` if the profile's
    /// steps disagree (two routes to one state consume different amounts).
    pub fn bound(&self, w: usize) -> Option<Vec<f64>> {
        let n = self.len();
        let delta = |r: &Reaction| {
            let count = |with: &[usize]| with.iter().filter(|&&u| u == w).count() as f64;
            count(&r.forward_with) - count(&r.reverse_with)
        };
        let mut content: Vec<Option<f64>> = vec![None; n];
        // Closing steps of cycles are set after the rest: their `to` is the
        // cycle's first state, their difference goes to the counter.
        let open: Vec<&Reaction> = self
            .reactions
            .iter()
            .filter(|r| r.counter.is_none())
            .collect();
        for start in 0..n {
            if content[start].is_some() {
                continue;
            }
            content[start] = Some(0.0);
            let mut stack = vec![start];
            while let Some(i) = stack.pop() {
                let here = content[i]?;
                for r in &open {
                    let (j, value) = if r.from == i {
                        (r.to, here + delta(r))
                    } else if r.to == i {
                        (r.from, here - delta(r))
                    } else {
                        continue;
                    };
                    match content[j] {
                        None => {
                            content[j] = Some(value);
                            stack.push(j);
                        }
                        Some(c) if (c - value).abs() > 0.5 => return None,
                        Some(_) => {}
                    }
                }
            }
        }
        let mut out: Vec<f64> = content.into_iter().map(|c| c.unwrap_or(0.0)).collect();
        for r in self.reactions.iter().filter(|r| r.counter.is_some()) {
            let c = r.counter.expect("filtered");
            out[c] = out[r.from] + delta(r) - out[r.to];
        }
        Some(out)
    }

    /// Free plus bound amount of co-reactant `w` (see [`Network::bound`]).
    pub fn coreactant_total(&self, w: usize, bound: &[f64], x: &[f64]) -> f64 {
        x[self.free(w)] + bound.iter().zip(x).map(|(n, v)| n * v).sum::<f64>()
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
        self.settled_in(x, rel, atol, &mut SettledWork::default())
    }

    /// [`Network::settled`] with its workspace kept by the caller: asked
    /// after every step, it then allocates nothing, and takes one pass over
    /// the reactions (the net rates are summed as [`Network::rhs`] sums them,
    /// in the same pass as the gross fluxes).
    pub fn settled_in(&self, x: &[f64], rel: f64, atol: f64, work: &mut SettledWork) -> bool {
        let n = self.dim();
        if work.kscale.len() != n {
            work.kscale = vec![0.0; n];
            for r in &self.reactions {
                for i in self.sides(r) {
                    work.kscale[i] += r.kf + r.kr;
                }
            }
        }
        work.dx.clear();
        work.dx.resize(n, 0.0);
        work.gross.clear();
        work.gross.resize(n, 0.0);
        for r in &self.reactions {
            let (f, b) = self.rates(r, x);
            self.apply(r, f - b, &mut work.dx);
            for i in self.sides(r) {
                work.gross[i] += f.abs() + b.abs();
            }
        }
        let (dx, gross, kscale) = (&work.dx, &work.gross, &work.kscale);
        (0..n)
            .filter(|&i| i >= self.len() || !self.species[i].counter)
            .all(|i| dx[i].abs() <= rel * gross[i] + atol * kscale[i])
    }

    /// The states a reaction's rates read: its two sides and the
    /// co-reactants either direction consumes.
    fn sides(&self, r: &Reaction) -> impl Iterator<Item = usize> {
        [r.from, r.to].into_iter().chain(
            r.forward_with
                .iter()
                .chain(&r.reverse_with)
                .map(|&w| self.free(w)),
        )
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

/// The co-reactants free in state `a` but not in state `b`: consumed going
/// from `a` to `b`. Each is registered in `coreactants` on first use.
fn consumed(
    model: &Model,
    a: PointId,
    b: PointId,
    coreactants: &mut Vec<Coreactant>,
) -> Vec<usize> {
    let after = model.extras(b).with;
    model
        .extras(a)
        .with
        .into_iter()
        .filter(|(name, _)| !after.iter().any(|(other, _)| other == name))
        .map(|(name, stated)| {
            coreactants
                .iter()
                .position(|c| c.name == name)
                .unwrap_or_else(|| {
                    coreactants.push(Coreactant { name, stated });
                    coreactants.len() - 1
                })
        })
        .collect()
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

#[cfg(test)]
mod tests {
    use super::*;

    /// Two species and a counter, one co-reactant consumed forward and one
    /// released: every kind of entry the pattern has to cover.
    fn network() -> Network {
        let species = |point| Species {
            point,
            counter: point == 2,
            product: false,
            in_cycle: true,
        };
        let reaction = |from, to, forward_with, reverse_with, counter| Reaction {
            from,
            to,
            ts: None,
            kf: 2.0,
            // A zero rate constant still makes an entry of the pattern.
            kr: 0.0,
            forward_with,
            reverse_with,
            counter,
        };
        let coreactant = |name: &str| Coreactant {
            name: name.into(),
            stated: 0.5,
        };
        Network {
            species: (0..3).map(species).collect(),
            coreactants: vec![coreactant("W"), coreactant("B")],
            reactions: vec![
                reaction(0, 1, vec![0], vec![], None),
                reaction(1, 0, vec![], vec![1], Some(2)),
            ],
            cycles: vec![vec![0, 1]],
        }
    }

    #[test]
    fn jacobian_pattern_is_what_a_nan_probe_of_jac_mul_finds() {
        // Source: closed form — the documented contract of `jac_mul`, which
        // reads every entry a rate depends on, so a NaN in column j reaches
        // exactly the rows of column j of the pattern.
        let net = network();
        let n = net.dim();
        let x = vec![1.0; n];
        let mut probed = Vec::new();
        for j in 0..n {
            let mut v = vec![0.0; n];
            v[j] = f64::NAN;
            let mut y = vec![0.0; n];
            net.jac_mul(&x, &v, &mut y);
            probed.extend((0..n).filter(|&i| y[i].is_nan()).map(|i| (i, j)));
        }
        assert_eq!(net.jacobian_pattern(), probed);
        // The counter's row and the co-reactants' columns (W is state 3, B 4).
        assert!(probed.contains(&(2, 1)) && probed.contains(&(2, 4)));
        assert!(probed.contains(&(0, 3)) && probed.contains(&(1, 4)));
    }

    #[test]
    fn jacobian_terms_and_column_sums_match_the_columns_of_jac_mul() {
        // Source: closed form — column j of the Jacobian is J·e_j, which
        // `jac_mul` computes by the product rule; the terms, summed per
        // entry, must give the same matrix, on entries of the pattern only.
        let mut net = network();
        net.reactions[1].kr = 0.7;
        let n = net.dim();
        let x: Vec<f64> = (0..n).map(|i| 0.3 + 0.25 * i as f64).collect();
        let mut summed = vec![0.0; n * n];
        let pattern = net.jacobian_pattern();
        net.jacobian_terms(&x, |row, column, value| {
            assert!(pattern.contains(&(row, column)), "({row}, {column})");
            summed[row + column * n] += value;
        });
        let mut sums = vec![0.0; n];
        net.jacobian_column_sums(&x, &mut sums);
        for j in 0..n {
            let mut e = vec![0.0; n];
            e[j] = 1.0;
            let mut column = vec![0.0; n];
            net.jac_mul(&x, &e, &mut column);
            let total: f64 = column.iter().sum();
            assert!(
                (sums[j] - total).abs() <= 1e-14,
                "column {j}: {} vs {total}",
                sums[j]
            );
            for i in 0..n {
                let got = summed[i + j * n];
                assert!(
                    (got - column[i]).abs() <= 1e-15 * column[i].abs().max(1.0),
                    "({i}, {j}): {got} vs {}",
                    column[i]
                );
            }
        }
    }
}
