//! Monte Carlo propagation of the energies' uncertainty: every point's energy
//! is drawn from a normal distribution (its σ, plus a shift shared by all
//! transition states for a method's systematic error), and every predicted
//! quantity is recomputed for each sample.
//!
//! Samples are drawn in fixed chunks, each from its own ChaCha stream of the
//! one seed, and processed in parallel: the result depends on the seed only,
//! not on the number of threads.

use super::analysis::{path_barrier, transmission};
use super::check::check;
use super::cycle::analyze_cycle;
use super::eyring::rate_constant;
use super::regime::selectivity;
use crate::model::{Kind, Model, PointId};
use rand::SeedableRng;
use rand_chacha::ChaCha8Rng;
use rand_distr::{Distribution, StandardNormal};
use rayon::prelude::*;

/// Samples per chunk (one random stream each).
const CHUNK: usize = 1024;

/// A central interval and the median of a sampled quantity.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Interval {
    /// Lower bound ((1 − level)/2 quantile).
    pub low: f64,
    /// Median.
    pub median: f64,
    /// Upper bound ((1 + level)/2 quantile).
    pub high: f64,
}

/// Intervals of every predicted quantity.
#[derive(Debug, Clone, PartialEq)]
pub struct McResult {
    /// Number of samples drawn.
    pub samples: usize,
    /// The seed used.
    pub seed: u64,
    /// Central probability of the intervals.
    pub level: f64,
    /// Each path's apparent barrier (model unit).
    pub path_barriers: Vec<Interval>,
    /// Each path's apparent rate constant (s⁻¹).
    pub path_rates: Vec<Interval>,
    /// Final fraction of each product of the nominal selectivity analysis.
    pub products: Vec<(PointId, Interval)>,
    /// Ratio of the nominal major product over the second one.
    pub ratio: Option<(PointId, PointId, Interval)>,
    /// TOF (s⁻¹) of each cycle, by path index.
    pub cycles: Vec<(usize, Interval)>,
    /// Probability that each observation is consistent (share of samples).
    pub consistent: Vec<f64>,
}

/// One sample's numbers, in a fixed order.
struct Sample {
    barriers: Vec<f64>,
    rates: Vec<f64>,
    fractions: Vec<f64>,
    tofs: Vec<f64>,
    consistent: Vec<bool>,
}

/// Runs the Monte Carlo analysis the model's `[uncertainty]` asks for; `None`
/// when the model states no uncertainty. `progress` is called with the number
/// of samples done (from several threads).
pub fn monte_carlo(model: &Model, progress: &(dyn Fn(usize) + Sync)) -> Option<McResult> {
    let u = model.uncertainty()?;
    let start = (!model.start().is_empty()).then(|| model.start().to_vec());
    let nominal = selectivity(model, start.as_deref());
    let products: Vec<PointId> = nominal
        .as_ref()
        .map(|s| s.products.iter().map(|(p, _)| *p).collect())
        .unwrap_or_default();
    let cycles: Vec<usize> = (0..model.paths().len())
        .filter(|&p| model.paths()[p].cycle)
        .collect();
    let is_ts: Vec<bool> = model
        .points()
        .iter()
        .map(|p| p.kind == Kind::TransitionState)
        .collect();
    let t = model.temperature();
    let one = |rng: &mut ChaCha8Rng| -> Sample {
        let z0: f64 = StandardNormal.sample(rng);
        let systematic = u.systematic * z0;
        let offsets: Vec<f64> = u
            .sigma
            .iter()
            .zip(&is_ts)
            .map(|(s, ts)| {
                let z: f64 = StandardNormal.sample(rng);
                s * z + if *ts { systematic } else { 0.0 }
            })
            .collect();
        let m = model.perturbed(&offsets);
        let (mut barriers, mut rates) = (Vec::new(), Vec::new());
        for p in 0..m.paths().len() {
            let b = path_barrier(&m, p);
            let kappa = b.determining_ts.map_or(1.0, |ts| transmission(&m, ts, t).0);
            barriers.push(b.apparent_barrier);
            rates.push(rate_constant(b.apparent_barrier, m.unit(), t, kappa).per_second());
        }
        let sel = selectivity(&m, start.as_deref());
        let fractions = products
            .iter()
            .map(|p| {
                sel.as_ref()
                    .and_then(|s| s.products.iter().find(|(q, _)| q == p))
                    .map_or(0.0, |x| x.1)
            })
            .collect();
        let tofs = cycles
            .iter()
            .map(|&c| analyze_cycle(&m, c).map_or(f64::NAN, |a| a.span.tof))
            .collect();
        let consistent = check(&m).iter().map(|c| c.consistent).collect();
        Sample {
            barriers,
            rates,
            fractions,
            tofs,
            consistent,
        }
    };
    let chunks = u.samples.div_ceil(CHUNK);
    let done = std::sync::atomic::AtomicUsize::new(0);
    let samples: Vec<Sample> = (0..chunks)
        .into_par_iter()
        .flat_map_iter(|c| {
            let mut rng = ChaCha8Rng::seed_from_u64(u.seed);
            rng.set_stream(c as u64);
            let n = CHUNK.min(u.samples - c * CHUNK);
            let out: Vec<Sample> = (0..n).map(|_| one(&mut rng)).collect();
            let total = done.fetch_add(n, std::sync::atomic::Ordering::Relaxed) + n;
            progress(total);
            out
        })
        .collect();

    let level = u.level;
    let interval = |values: Vec<f64>| quantiles(values, level);
    let column = |f: &dyn Fn(&Sample) -> f64| -> Vec<f64> { samples.iter().map(f).collect() };
    let n_paths = model.paths().len();
    let ratio = nominal.as_ref().and_then(|s| {
        let mut ranked = s.products.clone();
        ranked.sort_by(|a, b| b.1.total_cmp(&a.1).then(a.0.cmp(&b.0)));
        let (a, b) = (ranked.first()?.0, ranked.get(1)?.0);
        let (ia, ib) = (
            products.iter().position(|p| *p == a)?,
            products.iter().position(|p| *p == b)?,
        );
        Some((
            a,
            b,
            interval(column(&|s| s.fractions[ia] / s.fractions[ib])),
        ))
    });
    Some(McResult {
        samples: samples.len(),
        seed: u.seed,
        level,
        path_barriers: (0..n_paths)
            .map(|p| interval(column(&|s| s.barriers[p])))
            .collect(),
        path_rates: (0..n_paths)
            .map(|p| interval(column(&|s| s.rates[p])))
            .collect(),
        products: products
            .iter()
            .enumerate()
            .map(|(i, &p)| (p, interval(column(&|s| s.fractions[i]))))
            .collect(),
        ratio,
        cycles: cycles
            .iter()
            .enumerate()
            .map(|(i, &c)| (c, interval(column(&|s| s.tofs[i]))))
            .collect(),
        consistent: (0..model.observations().len())
            .map(|o| {
                samples.iter().filter(|s| s.consistent[o]).count() as f64 / samples.len() as f64
            })
            .collect(),
    })
}

/// Median and central `level` interval by sorting (NaN sorts last and is
/// ignored).
fn quantiles(mut values: Vec<f64>, level: f64) -> Interval {
    values.retain(|v| !v.is_nan());
    values.sort_by(f64::total_cmp);
    if values.is_empty() {
        return Interval {
            low: f64::NAN,
            median: f64::NAN,
            high: f64::NAN,
        };
    }
    let at = |q: f64| {
        // Linear interpolation between order statistics (the common "type 7" rule).
        let x = q * (values.len() - 1) as f64;
        let (i, frac) = (x.floor() as usize, x - x.floor());
        let next = values[(i + 1).min(values.len() - 1)];
        values[i] + frac * (next - values[i])
    };
    Interval {
        low: at((1.0 - level) / 2.0),
        median: at(0.5),
        high: at((1.0 + level) / 2.0),
    }
}
