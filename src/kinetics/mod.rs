//! Pure kinetics over a validated model: never prints, never writes files.
//!
//! - [`cycle`]: a `cycle = true` path as intermediates and TSs for the energetic span model.
//! - [`check`]: each measurement beside its prediction, the error as an energy.
//! - [`corrections`]: tunnelling (Wigner, Bell), standard state, pseudo-first order.
//! - [`eyring`]: rate constants and half-lives from barriers, in log space.
//! - [`analysis`]: every step's barriers and rate constants in both
//!   directions, and every path's apparent barrier.
//! - [`partition`]: final product fractions of a first-order network from any start.
//! - [`regime`]: Curtin–Hammett, kinetic-quench or intermediate, and the product fractions.
//! - [`selectivity`]: ratio ↔ ee ↔ ΔΔG‡ and Curtin–Hammett Boltzmann weights.
//! - [`span`]: the energetic span model of a catalytic cycle.
//! - [`sweep`]: selectivity across temperatures; the isoselective temperature.
//! - [`uncertainty`]: Monte Carlo intervals from the energies' σ.
//! - [`winstein_holness`]: exact solution of A ⇌ B, A → C, B → D.

pub mod analysis;
pub mod check;
pub mod corrections;
pub mod cycle;
pub mod eyring;
pub mod partition;
pub mod regime;
pub mod selectivity;
pub mod span;
pub mod sweep;
pub mod uncertainty;
pub mod winstein_holness;

pub use analysis::{Analysis, PathBarrier, StepKinetics, analyze};
pub use eyring::{RateConstant, barrier_for_half_life, barrier_for_rate, rate_constant};
