//! A simulation as serialisable data with ids resolved: the JSON contract of
//! `eyrie simulate --json` (docs/simulation.md). Maps are ordered by state id
//! so the same input gives the same bytes.

use super::SimulateError;
use super::control::{self, Rate, RateControl, SelectivityControl};
use super::run::{Simulation, Stopped};
use crate::model::Model;
use std::collections::BTreeMap;

/// The JSON report.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct SimulationReport {
    /// Temperature, K.
    pub temperature_k: f64,
    /// The time reached, s.
    pub time_s: f64,
    /// Why the run stopped.
    pub stopped: Stopped,
    /// Final concentration of every state, mol/L (for a cycle's regenerated
    /// catalyst: product released so far).
    #[serde(rename = "final")]
    pub final_: BTreeMap<String, f64>,
    /// Final free concentration of each co-reactant a step consumes, mol/L
    /// (absent when no step consumes one).
    #[serde(skip_serializing_if = "BTreeMap::is_empty")]
    pub coreactants: BTreeMap<String, f64>,
    /// Fraction of all product formed, per product state.
    pub products: BTreeMap<String, f64>,
    /// Conversion of the starting material at the end (null without one).
    pub conversion: Option<f64>,
    /// Time to 50, 90 and 99 % conversion, s (null when not reached).
    pub time_to_conversion_s: BTreeMap<String, Option<f64>>,
    /// Largest change of a product fraction after 5 % of the product formed.
    pub ratio_drift: f64,
    /// TOF (s⁻¹) of each closed cycle at the end, by regenerated-catalyst id.
    pub turnover_per_s: BTreeMap<String, f64>,
    /// Relative mass balance error of the integration.
    pub mass_error: f64,
    /// Degree of rate control X = ∂ln r/∂(−G/RT) of every TS, barrierless
    /// step ("a→b") and state (by id); null when not computed (a profile
    /// without a cycle, unless asked for).
    pub rate_control: Option<BTreeMap<String, f64>>,
    /// Σ X over the TSs and barrierless steps (1 by the sum rule).
    pub rate_control_sum: Option<f64>,
    /// What r is, and the sum-rule check; null when not computed.
    pub rate_control_basis: Option<RateControlBasis>,
    /// Why the degrees of rate control could not be computed, or null.
    pub rate_control_note: Option<String>,
    /// Degree of selectivity control ∂ln S/∂(−G/RT) toward the major product
    /// (by id); null unless asked for and two products form.
    pub selectivity_control: Option<BTreeMap<String, f64>>,
    /// The major product S refers to; null with `selectivity_control`.
    pub selectivity_control_product: Option<String>,
}

/// What the rate in a degree of rate control is, and its sum rules.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct RateControlBasis {
    /// "turnover" (steady state of the closed cycles) or "product-formation"
    /// (d[P]/dt at 50 % conversion of the starting material).
    pub rate: &'static str,
    /// r, in `rate_unit`.
    pub value: f64,
    /// "s⁻¹" (per catalyst) or "mol L⁻¹ s⁻¹".
    pub rate_unit: &'static str,
    /// Σ X over the states (−1 by the sum rule).
    pub sum_states: f64,
    /// Whether Σ over TSs = 1 and Σ over states = −1, to `sum_tolerance`.
    pub sum_rule_holds: bool,
    /// The tolerance of that check.
    pub sum_tolerance: f64,
    /// The finite-difference step, in units of RT.
    pub step_rt: f64,
}

impl SimulationReport {
    /// Resolves ids and collects the summary.
    pub fn new(model: &Model, sim: &Simulation) -> SimulationReport {
        let id = |p: usize| model.point(p).id.clone();
        SimulationReport {
            temperature_k: model.temperature().k(),
            time_s: sim.time_s(),
            stopped: sim.stopped,
            final_: sim
                .network
                .species
                .iter()
                .zip(&sim.last().x)
                .map(|(s, &v)| (id(s.point), v))
                .collect(),
            coreactants: sim
                .network
                .coreactants
                .iter()
                .zip(&sim.last().x[sim.network.len()..])
                .map(|(c, &v)| (c.name.clone(), v))
                .collect(),
            products: sim.products.iter().map(|&(p, _, f)| (id(p), f)).collect(),
            conversion: sim.conversion,
            time_to_conversion_s: sim
                .milestones
                .iter()
                .map(|&(m, t)| (format!("{:.0}%", m * 100.0), t))
                .collect(),
            ratio_drift: sim.ratio_drift,
            turnover_per_s: sim.turnover.iter().map(|&(p, t)| (id(p), t)).collect(),
            mass_error: sim.mass_error,
            rate_control: None,
            rate_control_sum: None,
            rate_control_basis: None,
            rate_control_note: None,
            selectivity_control: None,
            selectivity_control_product: None,
        }
    }

    /// Adds the degrees of rate control (or why there are none).
    pub fn with_rate_control(
        mut self,
        model: &Model,
        rc: &Result<RateControl, SimulateError>,
    ) -> SimulationReport {
        match rc {
            Ok(rc) => {
                self.rate_control = Some(by_name(model, &rc.degrees));
                self.rate_control_sum = Some(rc.sum_ts);
                let (rate, rate_unit) = match rc.rate {
                    Rate::Turnover => ("turnover", "s⁻¹"),
                    Rate::ProductFormation => ("product-formation", "mol L⁻¹ s⁻¹"),
                };
                self.rate_control_basis = Some(RateControlBasis {
                    rate,
                    value: rc.value,
                    rate_unit,
                    sum_states: rc.sum_states,
                    sum_rule_holds: rc.sum_rule_holds(),
                    sum_tolerance: control::SUM_TOLERANCE,
                    step_rt: control::DELTA_RT,
                });
            }
            Err(e) => self.rate_control_note = Some(e.to_string()),
        }
        self
    }

    /// Adds the degrees of selectivity control, when two products form.
    pub fn with_selectivity_control(
        mut self,
        model: &Model,
        sc: &Option<SelectivityControl>,
    ) -> SimulationReport {
        if let Some(sc) = sc {
            self.selectivity_control = Some(by_name(model, &sc.degrees));
            self.selectivity_control_product = Some(model.point(sc.product).id.clone());
        }
        self
    }
}

/// Degrees keyed by target name (sorted, for the same bytes every run).
fn by_name(model: &Model, degrees: &[(control::Target, f64)]) -> BTreeMap<String, f64> {
    degrees.iter().map(|(t, x)| (t.name(model), *x)).collect()
}
