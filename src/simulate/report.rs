//! A simulation as serialisable data with ids resolved: the JSON contract of
//! `eyrie simulate --json` (docs/simulation.md). Maps are ordered by state id
//! so the same input gives the same bytes.

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
        }
    }
}
