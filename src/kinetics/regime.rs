//! Which barriers decide the product ratio: the Curtin–Hammett regime
//! analysis of a network.
//!
//! The minima that are not products form the *pool*; the steps that leave the
//! pool for a product are the *channels*. The pool states that feed a channel
//! must interconvert for the Curtin–Hammett principle to hold. The comparison
//! is made on transition-state energies from one reference (the profile's), so
//! it reads as the difference of two TS energies:
//!
//! - **Curtin–Hammett**: the highest TS needed to interconvert the feeding
//!   states lies below the lowest channel TS by at least the threshold; the
//!   ratio follows the channel TS energies alone (Boltzmann weights).
//! - **kinetic quench**: every feeding state's own channels lie below the
//!   lowest TS that would take it to another feeding state, by at least the
//!   threshold; each state's material goes to its own products, so the ratio
//!   follows the starting populations.
//! - **intermediate**: neither holds. The fractions then come from the exact
//!   partition of the first-order network ([`super::partition`]), with
//!   product formation treated as irreversible.
//!
//! The threshold is a rate factor of 100 (RT·ln 100, 2.73 kcal/mol at
//! 298.15 K): at that margin the limiting formula is within about 1 % of the
//! exact partition (common practice for "much faster").

use super::eyring::rate_constant;
use super::partition::Network;
use crate::model::{Kind, Model, PointId};

/// The rate factor that counts as "much faster" (common practice).
pub const RATE_FACTOR: f64 = 100.0;

/// The three regimes; their names are the JSON values.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub enum Regime {
    /// Interconversion much faster than product formation.
    #[serde(rename = "curtin-hammett")]
    CurtinHammett,
    /// Interconversion much slower than product formation.
    #[serde(rename = "kinetic-quench")]
    KineticQuench,
    /// Comparable rates.
    #[serde(rename = "intermediate")]
    Intermediate,
}

impl Regime {
    /// The JSON spelling.
    pub fn name(self) -> &'static str {
        match self {
            Regime::CurtinHammett => "curtin-hammett",
            Regime::KineticQuench => "kinetic-quench",
            Regime::Intermediate => "intermediate",
        }
    }
}

/// A step that leaves the pool for a product.
#[derive(Debug, Clone, PartialEq)]
pub struct Channel {
    /// The pool state it leaves.
    pub from: PointId,
    /// The product it forms.
    pub product: PointId,
    /// Its transition state (`None`: barrierless).
    pub ts: Option<PointId>,
    /// The highest energy on the step, in the model's unit (a TS's energy minus
    /// RT·ln κ when it carries a transmission coefficient).
    pub top: f64,
}

/// The regime analysis of a model.
#[derive(Debug, Clone, PartialEq)]
pub struct Selectivity {
    /// The regime.
    pub regime: Regime,
    /// Final fraction of each product reached from the start (summing to 1).
    pub products: Vec<(PointId, f64)>,
    /// The deciding energy difference, in the model's unit: the ΔΔG‡ between the
    /// two lowest channel TSs (Curtin–Hammett), between the start's own two lowest
    /// channels (quench), or RT·ln of the major/second product ratio (intermediate).
    pub ddg: f64,
    /// The margin that decided the regime (positive: by how much the deciding
    /// comparison was met), in the model's unit.
    pub margin: f64,
    /// The threshold RT·ln 100 in the model's unit.
    pub threshold: f64,
    /// The starting state(s).
    pub start: Vec<PointId>,
    /// All channels.
    pub channels: Vec<Channel>,
    /// The reason in words, with the numbers that decide it.
    pub reason: String,
}

/// Analyses the product selectivity of `model` from `start` (default: the lowest
/// minimum of the pool connected to products). `None` when the model has fewer
/// than two products reachable from the start.
pub fn selectivity(model: &Model, start: Option<&[PointId]>) -> Option<Selectivity> {
    let unit = model.unit();
    let t = model.temperature();
    let threshold = t.rt(unit) * RATE_FACTOR.ln();
    let g = |p: PointId| model.point(p).g;
    let name = |p: PointId| model.point(p).id.clone();
    let fmt = |v: f64| crate::format::energy(v, unit.display_decimals(), false);
    let in_pool = |p: PointId| model.point(p).kind == Kind::Minimum && !model.point(p).product;

    // The top of a step: its TS energy, lowered by RT·ln κ when the TS carries a
    // transmission coefficient (tunnelling, explicit kappa), so every comparison
    // and rate below sees the same effective barrier.
    let step_top = |s: &crate::model::Step| match s.ts {
        Some(ts) => {
            let kappa = super::analysis::transmission(model, ts, t).0;
            g(ts) - t.rt(unit) * kappa.ln()
        }
        None => g(s.from).max(g(s.to)),
    };
    // Channels and pool edges (with the top energy of each step).
    let mut channels = Vec::new();
    let mut pool_edges: Vec<(PointId, PointId, f64)> = Vec::new();
    for s in model.steps() {
        let top = step_top(s);
        match (in_pool(s.from), in_pool(s.to)) {
            (true, true) => pool_edges.push((s.from, s.to, top)),
            (true, false) => channels.push(Channel {
                from: s.from,
                product: s.to,
                ts: s.ts,
                top,
            }),
            (false, true) => channels.push(Channel {
                from: s.to,
                product: s.from,
                ts: s.ts,
                top,
            }),
            (false, false) => {}
        }
    }

    // Minimax ("lowest highest point") energy from every pool state to every other,
    // by a Dijkstra-like search over the pool graph; small networks, dense is fine.
    let n = model.points().len();
    let mut adjacent: Vec<Vec<(PointId, f64)>> = vec![Vec::new(); n];
    for &(a, b, top) in &pool_edges {
        adjacent[a].push((b, top));
        adjacent[b].push((a, top));
    }
    // Minimax Dijkstra with a heap: the lowest possible highest point on the
    // way from `from` to every pool state (∞ where unreachable).
    let bottleneck = |from: PointId| -> Vec<f64> {
        use std::cmp::Reverse;
        use std::collections::BinaryHeap;
        // Energies are finite, so the total order is the numeric one.
        struct Key(f64);
        impl PartialEq for Key {
            fn eq(&self, other: &Self) -> bool {
                self.cmp(other).is_eq()
            }
        }
        impl Eq for Key {}
        impl PartialOrd for Key {
            fn partial_cmp(&self, other: &Self) -> Option<std::cmp::Ordering> {
                Some(self.cmp(other))
            }
        }
        impl Ord for Key {
            fn cmp(&self, other: &Self) -> std::cmp::Ordering {
                self.0.total_cmp(&other.0)
            }
        }
        let mut best = vec![f64::INFINITY; n];
        best[from] = g(from);
        let mut heap = BinaryHeap::new();
        heap.push(Reverse((Key(best[from]), from)));
        while let Some(Reverse((Key(level), u))) = heap.pop() {
            if level > best[u] {
                continue;
            }
            for &(v, top) in &adjacent[u] {
                let through = level.max(top);
                if through < best[v] {
                    best[v] = through;
                    heap.push(Reverse((Key(through), v)));
                }
            }
        }
        best
    };

    let start: Vec<PointId> = match start {
        Some(s) => s.to_vec(),
        None => {
            // Pool states connected to a feeder: one search per connected part.
            let mut part = vec![usize::MAX; n];
            for p in (0..n).filter(|&p| in_pool(p)) {
                if part[p] == usize::MAX {
                    let reach = bottleneck(p);
                    for (q, r) in reach.iter().enumerate() {
                        if r.is_finite() {
                            part[q] = p;
                        }
                    }
                }
            }
            let fed: std::collections::BTreeSet<usize> =
                channels.iter().map(|c| part[c.from]).collect();
            let candidates: Vec<PointId> = (0..n)
                .filter(|&p| in_pool(p) && fed.contains(&part[p]))
                .collect();
            let lowest = candidates
                .into_iter()
                .min_by(|&a, &b| g(a).total_cmp(&g(b)).then(a.cmp(&b)))?;
            vec![lowest]
        }
    };

    // Channels reachable from the start through the pool.
    let reach: Vec<Vec<f64>> = start.iter().map(|&s| bottleneck(s)).collect();
    let reachable = |p: PointId| reach.iter().any(|r| r[p].is_finite());
    let live: Vec<&Channel> = channels.iter().filter(|c| reachable(c.from)).collect();
    let mut products: Vec<PointId> = live.iter().map(|c| c.product).collect();
    products.sort_unstable();
    products.dedup();
    if products.len() < 2 {
        return None;
    }
    let mut feeders: Vec<PointId> = live.iter().map(|c| c.from).collect();
    feeders.sort_unstable();
    feeders.dedup();

    // Highest TS needed to bring all feeders (and starts) into one equilibrium.
    let members: Vec<PointId> = feeders.iter().chain(&start).copied().collect();
    let hub = members[0];
    let hub_reach = bottleneck(hub);
    let interconversion = members
        .iter()
        .map(|&m| hub_reach[m])
        .fold(f64::NEG_INFINITY, f64::max);
    let lowest_channel = live.iter().map(|c| c.top).fold(f64::INFINITY, f64::min);
    let ch_margin = lowest_channel - interconversion;

    // Quench: for every feeder, its own lowest channel lies below the lowest TS that
    // leads to any other feeder.
    let quench_margin = feeders
        .iter()
        .map(|&f| {
            let own = live
                .iter()
                .filter(|c| c.from == f)
                .map(|c| c.top)
                .fold(f64::INFINITY, f64::min);
            let r = bottleneck(f);
            let escape = feeders
                .iter()
                .filter(|&&o| o != f)
                .map(|&o| r[o])
                .fold(f64::INFINITY, f64::min);
            escape - own
        })
        .fold(f64::INFINITY, f64::min);

    let kt = |top: f64| (-(top) / t.rt(unit)).exp();
    let mut fractions: Vec<(PointId, f64)> = products.iter().map(|&p| (p, 0.0)).collect();
    let add = |fr: &mut Vec<(PointId, f64)>, p: PointId, w: f64| {
        if let Some(e) = fr.iter_mut().find(|(q, _)| *q == p) {
            e.1 += w;
        }
    };
    let single_state = feeders.len() == 1 && start.iter().all(|s| *s == feeders[0]);
    let (regime, margin) = if single_state || ch_margin >= threshold {
        // Boltzmann weights of the channel tops, relative to the lowest.
        for c in &live {
            add(&mut fractions, c.product, kt(c.top - lowest_channel));
        }
        (Regime::CurtinHammett, ch_margin)
    } else if quench_margin >= threshold {
        // Each start's material goes through its own channels only.
        let w = 1.0 / start.len() as f64;
        for &s in &start {
            let own: Vec<&&Channel> = live.iter().filter(|c| c.from == s).collect();
            let low = own.iter().map(|c| c.top).fold(f64::INFINITY, f64::min);
            let total: f64 = own.iter().map(|c| kt(c.top - low)).sum();
            for c in own {
                add(&mut fractions, c.product, w * kt(c.top - low) / total);
            }
        }
        (Regime::KineticQuench, quench_margin)
    } else {
        let mut net = Network::new(n);
        for s in model.steps() {
            let top = step_top(s);
            net.add(
                s.from,
                s.to,
                rate_constant(top - g(s.from), unit, t, 1.0).per_second(),
            );
            net.add(
                s.to,
                s.from,
                rate_constant(top - g(s.to), unit, t, 1.0).per_second(),
            );
        }
        let traps: Vec<bool> = (0..n).map(|p| model.point(p).product).collect();
        let w = 1.0 / start.len() as f64;
        for &s in &start {
            let f = net.absorption(s, &traps);
            for &p in &products {
                add(&mut fractions, p, w * f[p]);
            }
        }
        (Regime::Intermediate, ch_margin.max(quench_margin))
    };
    let total: f64 = fractions.iter().map(|(_, f)| f).sum();
    fractions.iter_mut().for_each(|(_, f)| *f /= total);

    let mut sorted = fractions.clone();
    sorted.sort_by(|a, b| b.1.total_cmp(&a.1));
    let (major, second) = (sorted[0], sorted[1]);
    let ddg = match regime {
        Regime::CurtinHammett => {
            let mut tops: Vec<f64> = live.iter().map(|c| c.top).collect();
            tops.sort_by(f64::total_cmp);
            tops[1] - tops[0]
        }
        Regime::KineticQuench => {
            // The ratio is set by where the material starts: the free-energy gap
            // between the two lowest feeding states decides it from an equilibrated start.
            let mut gs: Vec<f64> = feeders.iter().map(|&f| g(f)).collect();
            gs.sort_by(f64::total_cmp);
            gs[1] - gs[0]
        }
        Regime::Intermediate => t.rt(unit) * (major.1 / second.1).ln(),
    };
    let u = unit.name();
    let reason = match regime {
        Regime::CurtinHammett if single_state => format!(
            "one reacting state ({}): the ratio follows the competing TS energies alone; \
             the two lowest differ by {} {u}",
            name(feeders[0]),
            fmt(ddg)
        ),
        Regime::CurtinHammett => format!(
            "interconversion (highest TS {} {u}) lies {} {u} below the lowest product-forming \
             TS ({} {u}), beyond the {} {u} threshold (a rate factor of 100): the ratio follows \
             the product-forming TS energies",
            fmt(interconversion),
            fmt(ch_margin),
            fmt(lowest_channel),
            fmt(threshold)
        ),
        Regime::KineticQuench => format!(
            "each state forms its products at least {} {u} below any TS that interconverts it \
             (threshold {} {u}): the ratio follows the starting populations (here all in {}; \
             the two lowest feeding states differ by {} {u})",
            fmt(quench_margin),
            fmt(threshold),
            start
                .iter()
                .map(|&s| name(s))
                .collect::<Vec<_>>()
                .join(", "),
            fmt(ddg)
        ),
        Regime::Intermediate => format!(
            "neither limit holds: interconverting the reacting states needs a TS at {} {u}, \
             not {} {u} (a rate factor of 100) below the lowest product-forming TS ({} {u}), \
             and not every state forms its products that far below its way to the others; \
             fractions from the exact first-order partition of the network from {}, \
             product formation taken as irreversible",
            fmt(interconversion),
            fmt(threshold),
            fmt(lowest_channel),
            start
                .iter()
                .map(|&s| name(s))
                .collect::<Vec<_>>()
                .join(", "),
        ),
    };
    Some(Selectivity {
        regime,
        products: fractions,
        ddg,
        margin,
        threshold,
        start,
        channels,
        reason,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{Path, Point, Step};
    use crate::units::{EnergyUnit, Temperature};

    /// A conformer pair A ⇌ B (via ts-ab), A → C (ts-ac), B → D (ts-bd).
    fn pair(g_ab: f64) -> Model {
        let p = |id: &str, kind, g, product| Point {
            id: id.into(),
            label: id.into(),
            kind,
            g,
            product,
        };
        use Kind::{Minimum as M, TransitionState as T};
        Model {
            title: None,
            temperature: Temperature::kelvin(298.15).unwrap(),
            unit: EnergyUnit::KcalPerMol,
            zero: Some(0),
            points: vec![
                p("a", M, 0.0, false),
                p("b", M, 1.0, false),
                p("c", M, -8.0, true),
                p("d", M, -7.0, true),
                p("ts-ab", T, g_ab, false),
                p("ts-ac", T, 18.0, false),
                p("ts-bd", T, 17.2, false),
            ],
            steps: vec![
                Step {
                    from: 0,
                    ts: Some(4),
                    to: 1,
                },
                Step {
                    from: 0,
                    ts: Some(5),
                    to: 2,
                },
                Step {
                    from: 1,
                    ts: Some(6),
                    to: 3,
                },
            ],
            paths: vec![
                Path {
                    name: "ab".into(),
                    via: vec![0, 4, 1],
                    cycle: false,
                },
                Path {
                    name: "ac".into(),
                    via: vec![0, 5, 2],
                    cycle: false,
                },
                Path {
                    name: "bd".into(),
                    via: vec![1, 6, 3],
                    cycle: false,
                },
            ],
            start: vec![],
            thermo: vec![],
            extras: vec![],
            tunnelling: Default::default(),
            standard_state: None,
            observations: vec![],
            uncertainty: None,
            offsets: vec![],
            variants: vec![],
            figure: Default::default(),
        }
    }

    fn fraction(s: &Selectivity, p: PointId) -> f64 {
        s.products.iter().find(|(q, _)| *q == p).unwrap().1
    }

    #[test]
    fn fast_interconversion_is_curtin_hammett() {
        // closed form: Curtin–Hammett limit [D]/[C] = exp(−(G‡BD − G‡AC)/RT) = 3.85837175164995
        // at 298.15 K (tests/reference/winstein_holness.toml, wh-curtin-hammett-limit).
        let s = selectivity(&pair(8.0), None).unwrap();
        assert_eq!(s.regime, Regime::CurtinHammett);
        assert!((fraction(&s, 3) / fraction(&s, 2) / 3.85837175164995 - 1.0).abs() < 1e-9);
        assert!((s.ddg - 0.8).abs() < 1e-12);
        assert!(s.margin > s.threshold);
    }

    #[test]
    fn slow_interconversion_is_a_kinetic_quench() {
        // From pure A with interconversion at 26 kcal/mol: A forms C only (Seeman's
        // slow limit; the exact final [D]/[C] is 1.37e-6, tests/reference wh-slow-pureA).
        let s = selectivity(&pair(26.0), None).unwrap();
        assert_eq!(s.regime, Regime::KineticQuench);
        assert_eq!(s.start, vec![0]);
        assert!((fraction(&s, 2) - 1.0).abs() < 1e-12);
        assert!(
            (s.ddg - 1.0).abs() < 1e-12,
            "population gap between a and b"
        );
    }

    #[test]
    fn comparable_rates_use_the_exact_partition() {
        // Exact first-order final ratio [D]/[C] from pure A for TS(AB) = 17.5 kcal/mol:
        // 1.45094626308481 (Seeman, Chem. Rev. 1983; tests/reference/winstein_holness.toml,
        // wh-intermediate-pureA-final-ratio).
        let s = selectivity(&pair(17.5), None).unwrap();
        assert_eq!(s.regime, Regime::Intermediate);
        let ratio = fraction(&s, 3) / fraction(&s, 2);
        assert!((ratio / 1.45094626308481 - 1.0).abs() < 1e-9, "{ratio}");
        let sum: f64 = s.products.iter().map(|(_, f)| f).sum();
        assert!((sum - 1.0).abs() < 1e-12);
    }
}
