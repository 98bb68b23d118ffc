//! The `analyze` result as plain, serialisable data with ids resolved to
//! names: what `--json` prints and what scripts rely on.
//!
//! Field names are fixed by the project's JSON documentation
//! (`docs/json.md`); add fields, never rename them.

use crate::kinetics::Analysis;
use crate::model::Model;
use serde::Serialize;

/// Top-level `analyze --json` object.
#[derive(Debug, Clone, Serialize)]
pub struct AnalysisReport {
    /// The profile's title, or null.
    pub title: Option<String>,
    /// Temperature of every number below, in K.
    pub temperature_k: f64,
    /// Unit of every energy below ("kcal/mol", "kJ/mol", "eV", "hartree").
    pub unit: &'static str,
    /// The state reported at 0, or null when energies are as written.
    pub zero: Option<String>,
    /// Tunnelling correction in use: "none", "wigner" or "bell".
    pub tunnelling: &'static str,
    /// Pressure standard state the energies were converted from ("1 atm", "1 bar"),
    /// or null when they are already at 1 mol/L.
    pub standard_state: Option<&'static str>,
    /// Free co-reactants and their concentrations (mol/L) folded into the energies.
    pub coreactants: std::collections::BTreeMap<String, f64>,
    /// Every stationary point with its (shifted) energy.
    pub points: Vec<PointReport>,
    /// Every elementary step.
    pub steps: Vec<StepReport>,
    /// Every path's apparent barrier.
    pub paths: Vec<PathReport>,
    /// Which barriers decide the product ratio; null with fewer than two products.
    pub selectivity: Option<SelectivityReport>,
    /// The energetic span analysis of every `cycle = true` path.
    pub cycles: Vec<CycleReport>,
    /// Monte Carlo intervals, when the profile states an uncertainty.
    pub uncertainty: Option<UncertaintyReport>,
    /// The same numbers for every `[[variant]]`, side by side.
    pub variants: Vec<VariantReport>,
}

/// One variant's key numbers beside the profile's.
#[derive(Debug, Clone, Serialize)]
pub struct VariantReport {
    /// Variant name.
    pub name: String,
    /// Per path: barrier, rate and the kinetic isotope (or variant) effect.
    pub paths: Vec<VariantPath>,
    /// Product id → final fraction in the variant (null with fewer than two products).
    pub products: Option<std::collections::BTreeMap<String, f64>>,
    /// Per cycle: TOF of the variant, s⁻¹.
    pub cycles: Vec<VariantCycle>,
}

/// A path in a variant.
#[derive(Debug, Clone, Serialize)]
pub struct VariantPath {
    /// Path name.
    pub name: String,
    /// Apparent barrier in the variant, in `unit`.
    pub apparent_barrier: f64,
    /// Apparent rate constant in the variant, s⁻¹.
    pub k_apparent: f64,
    /// k(profile) / k(variant): the KIE for an isotopologue variant.
    pub kie: f64,
}

/// A cycle in a variant.
#[derive(Debug, Clone, Serialize)]
pub struct VariantCycle {
    /// Path name.
    pub name: String,
    /// TOF in the variant, s⁻¹.
    pub tof: f64,
}

/// A central interval with its median.
#[derive(Debug, Clone, Copy, Serialize)]
pub struct IntervalReport {
    /// Lower bound.
    pub low: f64,
    /// Median.
    pub median: f64,
    /// Upper bound.
    pub high: f64,
}

impl From<crate::kinetics::uncertainty::Interval> for IntervalReport {
    fn from(i: crate::kinetics::uncertainty::Interval) -> Self {
        IntervalReport {
            low: i.low,
            median: i.median,
            high: i.high,
        }
    }
}

/// Monte Carlo intervals of the predicted quantities.
#[derive(Debug, Clone, Serialize)]
pub struct UncertaintyReport {
    /// Samples drawn.
    pub samples: usize,
    /// Seed of the random stream (same seed, same numbers).
    pub seed: u64,
    /// Central probability of every interval, e.g. 0.95.
    pub level: f64,
    /// Per path: apparent barrier (`unit`) and rate constant (s⁻¹).
    pub paths: Vec<PathInterval>,
    /// Product id → interval of its final fraction.
    pub products: std::collections::BTreeMap<String, IntervalReport>,
    /// Interval of the nominal major over second product ratio.
    pub ratio: Option<RatioInterval>,
    /// Per cycle: interval of the TOF (s⁻¹).
    pub cycles: Vec<CycleInterval>,
    /// Per observation (in file order): the share of samples in which it is consistent.
    pub probability_consistent: Vec<f64>,
}

/// A path's intervals.
#[derive(Debug, Clone, Serialize)]
pub struct PathInterval {
    /// Path name.
    pub name: String,
    /// Apparent barrier, in `unit`.
    pub barrier: IntervalReport,
    /// Apparent rate constant, s⁻¹.
    pub k: IntervalReport,
}

/// The product ratio's interval.
#[derive(Debug, Clone, Serialize)]
pub struct RatioInterval {
    /// The nominal major product.
    pub major: String,
    /// The nominal second product.
    pub minor: String,
    /// Interval of [major]/[minor].
    #[serde(flatten)]
    pub interval: IntervalReport,
}

/// A cycle's TOF interval.
#[derive(Debug, Clone, Serialize)]
pub struct CycleInterval {
    /// Path name.
    pub name: String,
    /// TOF, s⁻¹.
    pub tof: IntervalReport,
}

impl UncertaintyReport {
    /// Names the Monte Carlo result's quantities.
    pub fn new(model: &Model, mc: &crate::kinetics::uncertainty::McResult) -> UncertaintyReport {
        let id = |p: usize| model.point(p).id.clone();
        UncertaintyReport {
            samples: mc.samples,
            seed: mc.seed,
            level: mc.level,
            paths: model
                .paths()
                .iter()
                .enumerate()
                .map(|(i, p)| PathInterval {
                    name: p.name.clone(),
                    barrier: mc.path_barriers[i].into(),
                    k: mc.path_rates[i].into(),
                })
                .collect(),
            products: mc
                .products
                .iter()
                .map(|(p, i)| (id(*p), (*i).into()))
                .collect(),
            ratio: mc.ratio.map(|(a, b, i)| RatioInterval {
                major: id(a),
                minor: id(b),
                interval: i.into(),
            }),
            cycles: mc
                .cycles
                .iter()
                .map(|(c, i)| CycleInterval {
                    name: model.paths()[*c].name.clone(),
                    tof: (*i).into(),
                })
                .collect(),
            probability_consistent: mc.consistent.clone(),
        }
    }
}

/// One catalytic cycle by the energetic span model.
#[derive(Debug, Clone, Serialize)]
pub struct CycleReport {
    /// Path name.
    pub name: String,
    /// TOF-determining intermediate (null when the cycle runs backwards).
    pub tdi: Option<String>,
    /// TOF-determining TS ("a→b" for a barrierless step; null when backwards).
    pub tdts: Option<String>,
    /// Energetic span δE, in `unit` (null when backwards).
    pub span: Option<f64>,
    /// Whether the TDTS comes before the TDI in the turnover (δE then includes ΔGr).
    pub tdts_before_tdi: Option<bool>,
    /// Turnover frequency, s⁻¹ (negative: the cycle runs backwards).
    pub tof: f64,
    /// (kB·T/h)·e^(−δE/RT), s⁻¹, for orientation only.
    pub tof_approx: Option<f64>,
    /// Reaction free energy of one turnover, in `unit`.
    pub dgr: f64,
    /// Degree of TOF control of every intermediate and TS.
    pub tof_control: std::collections::BTreeMap<String, f64>,
}

/// The Curtin–Hammett regime analysis.
#[derive(Debug, Clone, Serialize)]
pub struct SelectivityReport {
    /// "curtin-hammett", "kinetic-quench" or "intermediate".
    pub regime: &'static str,
    /// Final fraction of each product (summing to 1).
    pub products: std::collections::BTreeMap<String, f64>,
    /// The deciding energy difference, in `unit`.
    pub ddg: f64,
    /// By how much the deciding comparison was met, in `unit`.
    pub margin: f64,
    /// The threshold used: RT·ln 100 (a rate factor of 100), in `unit`.
    pub threshold: f64,
    /// The starting state(s).
    pub start: Vec<String>,
    /// The reason in words, with the numbers that decide it.
    pub reason: String,
    /// Product id → final fraction from the mass-action simulation from the
    /// same start (every step reversible, run to completion or equilibrium);
    /// null when not simulated (`simulation_note` says why).
    pub simulated: Option<std::collections::BTreeMap<String, f64>>,
    /// Why the simulation stopped: "conversion" (complete), "equilibrium"
    /// (products revert), "time-limit"; null when not simulated.
    pub simulation_stopped: Option<crate::simulate::Stopped>,
    /// Whether `products` agrees with `simulated` within `limit_margin`; null
    /// when not simulated.
    pub limit_agrees: Option<bool>,
    /// The largest RT·|ln| of the factor by which a ratio of two products
    /// (each ≥ 1 % in either result) differs between `products` and
    /// `simulated`: the error of the ΔΔG‡ read off the ratio, in `unit`; null
    /// when not simulated.
    pub limit_error: Option<f64>,
    /// The agreement margin: 0.1 kcal/mol, in `unit`.
    pub limit_margin: f64,
    /// Why there is no simulation (e.g. a network above 200 states), or null.
    pub simulation_note: Option<String>,
}

impl SelectivityReport {
    /// The closed-form analysis (unchecked: see [`Self::check_by_simulation`]).
    fn new(model: &Model, s: &crate::kinetics::regime::Selectivity) -> SelectivityReport {
        let id = |p: usize| model.point(p).id.clone();
        SelectivityReport {
            regime: s.regime.name(),
            products: s.products.iter().map(|&(p, f)| (id(p), f)).collect(),
            ddg: s.ddg,
            margin: s.margin,
            threshold: s.threshold,
            start: s.start.iter().map(|&p| id(p)).collect(),
            reason: s.reason.clone(),
            simulated: None,
            simulation_stopped: None,
            limit_agrees: None,
            limit_error: None,
            limit_margin: crate::simulate::fractions::agreement_margin(model.unit()),
            simulation_note: None,
        }
    }

    /// Simulates `model` from the same start and fills in `simulated` and how
    /// far the closed form is from it (or `simulation_note`, why not).
    pub fn check_by_simulation(&mut self, model: &Model) {
        use crate::simulate::fractions::{limit_error, simulated_fractions};
        let point = |id: &String| model.find(id).expect("ids come from this model");
        let start: Vec<usize> = self.start.iter().map(point).collect();
        let closed: Vec<(usize, f64)> = self.products.iter().map(|(k, &f)| (point(k), f)).collect();
        match simulated_fractions(model, &start) {
            Ok(sim) => {
                let rt = model.temperature().rt(model.unit());
                let error = limit_error(&closed, &sim.products, rt);
                self.simulated = Some(
                    sim.products
                        .iter()
                        .map(|&(p, f)| (model.point(p).id.clone(), f))
                        .collect(),
                );
                self.simulation_stopped = Some(sim.stopped);
                self.limit_agrees = Some(error <= self.limit_margin);
                self.limit_error = Some(error);
            }
            Err(e) => self.simulation_note = Some(format!("not simulated: {e}")),
        }
    }
}

impl AnalysisReport {
    /// The same report with the selectivity checked by simulation (what
    /// `analyze` shows; `watch` and `export` skip it, as they show only the
    /// closed form and must stay quick).
    pub fn with_simulation_check(mut self, model: &Model) -> AnalysisReport {
        if let Some(s) = &mut self.selectivity {
            s.check_by_simulation(model);
        }
        self
    }
}

/// One stationary point.
#[derive(Debug, Clone, Serialize)]
pub struct PointReport {
    /// File id.
    pub id: String,
    /// Label as drawn.
    pub label: String,
    /// "minimum" or "transition_state".
    pub kind: crate::model::Kind,
    /// Free energy relative to `zero`, in `unit`.
    pub g: f64,
    /// Whether this state is a product.
    pub product: bool,
}

/// One step in both directions.
#[derive(Debug, Clone, Serialize)]
pub struct StepReport {
    /// Minimum the step starts from.
    pub from: String,
    /// Minimum the step leads to.
    pub to: String,
    /// Transition state, or null for a barrierless step.
    pub ts: Option<String>,
    /// ΔG‡ forward, in `unit`.
    pub barrier_forward: f64,
    /// ΔG‡ reverse, in `unit`.
    pub barrier_reverse: f64,
    /// Eyring k forward, s⁻¹ (κ = 1).
    pub k_forward: f64,
    /// Eyring k reverse, s⁻¹ (κ = 1).
    pub k_reverse: f64,
    /// ln 2 / k_forward, s.
    pub half_life_forward_s: f64,
    /// ln 2 / k_reverse, s.
    pub half_life_reverse_s: f64,
    /// Transmission coefficient κ used in both directions (explicit kappa × tunnelling).
    pub kappa: f64,
    /// Why a requested tunnelling correction was replaced, or null.
    pub kappa_note: Option<String>,
}

/// One path's apparent barrier.
#[derive(Debug, Clone, Serialize)]
pub struct PathReport {
    /// Path name.
    pub name: String,
    /// Largest rise from a minimum to a later TS on the path, in `unit`.
    pub apparent_barrier: f64,
    /// The minimum it starts from.
    pub determining_state: String,
    /// The TS it reaches (null when the path has no TS).
    pub determining_ts: Option<String>,
    /// Eyring k for the apparent barrier, s⁻¹.
    pub k_apparent: f64,
    /// ln 2 / k_apparent, s.
    pub half_life_s: f64,
}

impl AnalysisReport {
    /// Resolves the analysis of `model` into names and plain numbers.
    pub fn new(model: &Model, analysis: &Analysis) -> AnalysisReport {
        let id = |p: usize| model.point(p).id.clone();
        let points = model
            .points()
            .iter()
            .map(|p| PointReport {
                id: p.id.clone(),
                label: p.label.clone(),
                kind: p.kind,
                g: p.g,
                product: p.product,
            })
            .collect();
        let steps = analysis
            .steps
            .iter()
            .map(|s| StepReport {
                from: id(s.step.from),
                to: id(s.step.to),
                ts: s.step.ts.map(id),
                barrier_forward: s.barrier_forward,
                barrier_reverse: s.barrier_reverse,
                k_forward: s.k_forward.per_second(),
                k_reverse: s.k_reverse.per_second(),
                half_life_forward_s: s.k_forward.half_life_s(),
                half_life_reverse_s: s.k_reverse.half_life_s(),
                kappa: s.kappa,
                kappa_note: s.kappa_note.clone(),
            })
            .collect();
        let paths = analysis
            .paths
            .iter()
            .map(|p| {
                // The determining TS's transmission coefficient applies to the
                // apparent rate as it does to its own step.
                let kappa = p.determining_ts.map_or(1.0, |ts| {
                    crate::kinetics::analysis::transmission(model, ts, analysis.temperature).0
                });
                let k = crate::kinetics::rate_constant(
                    p.apparent_barrier,
                    analysis.unit,
                    analysis.temperature,
                    kappa,
                );
                PathReport {
                    name: model.paths()[p.path].name.clone(),
                    apparent_barrier: p.apparent_barrier,
                    determining_state: id(p.determining_state),
                    determining_ts: p.determining_ts.map(id),
                    k_apparent: k.per_second(),
                    half_life_s: k.half_life_s(),
                }
            })
            .collect();
        let start = (!model.start().is_empty()).then(|| model.start());
        let selectivity = crate::kinetics::regime::selectivity(model, start)
            .map(|s| SelectivityReport::new(model, &s));
        AnalysisReport {
            title: model.title().map(str::to_string),
            temperature_k: analysis.temperature.k(),
            unit: analysis.unit.name(),
            zero: model.zero().map(id),
            tunnelling: match model.tunnelling() {
                crate::model::Tunnelling::None => "none",
                crate::model::Tunnelling::Wigner => "wigner",
                crate::model::Tunnelling::Bell => "bell",
            },
            standard_state: model.standard_state().map(|p| match p {
                crate::kinetics::corrections::PressureStandard::Atmosphere => "1 atm",
                crate::kinetics::corrections::PressureStandard::Bar => "1 bar",
            }),
            coreactants: (0..model.points().len())
                .flat_map(|i| model.extras(i).with)
                .collect(),
            points,
            steps,
            paths,
            selectivity,
            cycles: (0..model.paths().len())
                .filter_map(|p| crate::kinetics::cycle::analyze_cycle(model, p))
                .map(|c| CycleReport::new(model, &c))
                .collect(),
            uncertainty: None,
            variants: (0..model.variants().len())
                .map(|v| VariantReport::new(model, v, &paths_k(model)))
                .collect(),
        }
    }
}

impl CycleReport {
    fn new(model: &Model, c: &crate::kinetics::cycle::CycleAnalysis) -> CycleReport {
        let id = |p: usize| model.point(p).id.clone();
        let det = c.span.determining.as_ref();
        let mut tof_control = std::collections::BTreeMap::new();
        for (i, &p) in c.intermediates.iter().enumerate() {
            tof_control.insert(id(p), c.span.intermediate_control[i]);
        }
        for (i, t) in c.ts.iter().enumerate() {
            tof_control.insert(t.name(model), c.span.ts_control[i]);
        }
        CycleReport {
            name: model.paths()[c.path].name.clone(),
            tdi: det.map(|d| id(c.intermediates[d.tdi])),
            tdts: det.map(|d| c.ts[d.tdts].name(model)),
            span: det.map(|d| d.span),
            tdts_before_tdi: det.map(|d| d.tdts_before_tdi),
            tof: c.span.tof,
            tof_approx: det.map(|d| d.tof_approx),
            dgr: c.dgr,
            tof_control,
        }
    }
}

/// Each path's apparent rate constant (with its determining TS's κ), s⁻¹.
fn paths_k(model: &Model) -> Vec<f64> {
    let t = model.temperature();
    (0..model.paths().len())
        .map(|p| {
            let b = crate::kinetics::analysis::path_barrier(model, p);
            let kappa = b.determining_ts.map_or(1.0, |ts| {
                crate::kinetics::analysis::transmission(model, ts, t).0
            });
            crate::kinetics::rate_constant(b.apparent_barrier, model.unit(), t, kappa).per_second()
        })
        .collect()
}

impl VariantReport {
    fn new(model: &Model, v: usize, base_k: &[f64]) -> VariantReport {
        let m = model.variant(v);
        let k = paths_k(&m);
        let start = (!m.start().is_empty()).then(|| m.start());
        VariantReport {
            name: model.variants()[v].name.clone(),
            paths: (0..m.paths().len())
                .map(|p| VariantPath {
                    name: m.paths()[p].name.clone(),
                    apparent_barrier: crate::kinetics::analysis::path_barrier(&m, p)
                        .apparent_barrier,
                    k_apparent: k[p],
                    kie: base_k[p] / k[p],
                })
                .collect(),
            products: crate::kinetics::regime::selectivity(&m, start).map(|s| {
                s.products
                    .iter()
                    .map(|&(p, f)| (m.point(p).id.clone(), f))
                    .collect()
            }),
            cycles: (0..m.paths().len())
                .filter_map(|p| crate::kinetics::cycle::analyze_cycle(&m, p))
                .map(|c| VariantCycle {
                    name: m.paths()[c.path].name.clone(),
                    tof: c.span.tof,
                })
                .collect(),
        }
    }
}
