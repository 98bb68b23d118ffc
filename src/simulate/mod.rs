//! Microkinetic simulation: the mass-action kinetics a profile implies,
//! integrated in time.
//!
//! Closed forms cover the limits (Curtin–Hammett, kinetic quench, the
//! energetic span steady state); the simulation answers every regime in
//! between, with the same rate constants [`crate::kinetics::analyze`] reports.
//! Every step is first order in the model's states; a step that consumes a
//! co-reactant (`with`) is also first order in it, k₂·[A]·[W], with the
//! co-reactant tracked from its `[coreactants]` concentration, so the
//! simulation equals `analyze`'s pseudo-first-order kinetics while the
//! co-reactant is in excess and follows mass action when it runs low. Like the
//! rest of the computing core it never prints or writes files.
//!
//! - [`network`]: species, reactions, net-flux right-hand side and Jacobian.
//! - [`integrate`]: stiff adaptive variable-order NDF/BDF integration
//!   (Shampine & Reichelt 1997); `newton` holds the right-hand side, the
//!   analytic Jacobian and the Newton matrix, dense LU for small systems and
//!   `sparse_lu` (faer's ordering and first factorisation, then
//!   refactorisation on kept pivots) for large ones.
//! - [`initial`], [`until`]: where the material starts, when to stop.
//! - [`run`]: one simulation and its summary.
//! - [`report`]: the JSON contract.
//! - [`steady`]: the exact steady state a run has approached.
//! - [`control`]: degrees of rate and selectivity control (finite differences).
//! - [`fractions`]: final product fractions for `analyze`, checked against
//!   the closed-form limits.

pub mod control;
pub mod fractions;
pub mod initial;
pub mod integrate;
pub mod network;
mod newton;
pub mod report;
pub mod run;
mod sparse_lu;
pub mod steady;
pub mod until;

pub use control::{RateControl, SelectivityControl, rate_control, selectivity_control};
pub use fractions::{Simulated, simulated_fractions};
pub use initial::Initial;
pub use integrate::Tolerances;
pub use network::Network;
pub use run::{Options, Simulation, Stopped, simulate, simulate_network};
pub use until::Until;

/// Why a simulation could not be run or finished.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SimulateError {
    /// The integrator gave up.
    #[error("the integrator stopped at t = {time_s:e} s (step {step_s:e} s): {message}")]
    Integrator {
        /// Time reached, s.
        time_s: f64,
        /// Last step size, s.
        step_s: f64,
        /// The integrator's reason.
        message: String,
    },
    /// The safeguard on the number of steps was hit.
    #[error(
        "no end after {steps} steps (t = {time_s:e} s, step {step_s:e} s); give a shorter --until"
    )]
    TooManySteps {
        /// Steps taken.
        steps: usize,
        /// Time reached, s.
        time_s: f64,
        /// Last step size, s.
        step_s: f64,
    },
    /// `--until` could not be read.
    #[error("cannot read --until '{text}': {why}")]
    BadUntil {
        /// What was given.
        text: String,
        /// What is wrong.
        why: String,
    },
    /// An initial concentration could not be read.
    #[error("cannot read the initial concentration '{text}': {why}")]
    BadInitial {
        /// What was given.
        text: String,
        /// What is wrong.
        why: String,
    },
    /// An initial condition names a state the profile does not have.
    #[error("no state '{id}' in the profile")]
    UnknownState {
        /// The id given.
        id: String,
    },
    /// An initial condition names a transition state.
    #[error("'{id}' is a transition state; material can only start in a state (minimum)")]
    NotAMinimum {
        /// The id given.
        id: String,
    },
    /// Every initial concentration is zero.
    #[error("every initial concentration is zero; nothing to simulate")]
    NoMaterial,
    /// A conversion was asked for, but no material starts outside products and catalyst states.
    #[error(
        "a conversion needs starting material outside the products and the catalytic cycle; give a time instead (e.g. --until '1 h')"
    )]
    NoConversion,
    /// A degree of rate control has no rate to differentiate.
    #[error("no degree of rate control: {0}")]
    NoRateControl(String),
    /// The network is larger than a check by simulation is run for.
    #[error("{states} states, above the {limit} simulated for this check")]
    TooLarge {
        /// States (minima) in the network.
        states: usize,
        /// The limit.
        limit: usize,
    },
}
