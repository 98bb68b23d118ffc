//! Stiff, adaptive, implicit integration of a [`Network`] with diffsol's BDF
//! (variable order 1–5, the NDF variant) and the network's analytic Jacobian.
//!
//! Rate constants from 1e-10 to 1e13 s⁻¹ share one system, so the first steps
//! may be far below 1e-16 s; diffsol's default smallest step (machine epsilon,
//! in seconds) would abort there, so it is set to 1e-30 s.

use super::SimulateError;
use super::network::Network;
use diffsol::{NalgebraLU, NalgebraMat, OdeBuilder, OdeSolverMethod, Vector};

/// Error control of the integrator.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Tolerances {
    /// Relative tolerance per state.
    pub rtol: f64,
    /// Absolute tolerance, as a fraction of the total amount of material.
    pub atol_fraction: f64,
}

impl Default for Tolerances {
    /// Tight enough that integrated values meet closed forms to 1e-6 relative.
    fn default() -> Self {
        Tolerances {
            rtol: 1e-10,
            atol_fraction: 1e-14,
        }
    }
}

/// What the observer wants after each accepted step.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Flow {
    /// Keep going.
    Continue,
    /// Stop here.
    Stop,
}

/// One accepted step as the observer sees it.
pub struct StepView<'a> {
    /// Time at the start of the step, s.
    pub t_prev: f64,
    /// Time reached, s.
    pub t: f64,
    /// Concentrations at `t`.
    pub x: &'a [f64],
    interpolate: &'a dyn Fn(f64) -> Result<Vec<f64>, SimulateError>,
}

impl StepView<'_> {
    /// Concentrations at a time inside the step just taken (`t_prev..=t`).
    pub fn at(&self, t: f64) -> Result<Vec<f64>, SimulateError> {
        (self.interpolate)(t)
    }
}

/// Largest number of steps before giving up (a safeguard; real runs take a
/// few hundred).
const MAX_STEPS: usize = 200_000;

/// Integrates from `x0` at t = 0 until `t_end` or until `observe` says stop.
/// Returns the time reached and the concentrations there.
pub fn integrate(
    net: &Network,
    x0: &[f64],
    t_end: f64,
    tol: Tolerances,
    observe: &mut dyn FnMut(&StepView<'_>) -> Result<Flow, SimulateError>,
) -> Result<(f64, Vec<f64>), SimulateError> {
    let n = net.len();
    let total: f64 = x0
        .iter()
        .map(|v| v.abs())
        .sum::<f64>()
        .max(f64::MIN_POSITIVE);
    let atol = tol.atol_fraction * total;
    let init = x0.to_vec();
    let fail = |t: f64, h: f64, e: &dyn std::fmt::Display| SimulateError::Integrator {
        time_s: t,
        step_s: h,
        message: e.to_string(),
    };
    let mut problem = OdeBuilder::<NalgebraMat<f64>>::new()
        .rtol(tol.rtol)
        .atol([atol])
        .h0(initial_step(net, x0, t_end))
        .rhs_implicit(
            |x: &[f64], _p: &[f64], _t: f64, y: &mut [f64]| net.rhs(x, y),
            |_x: &[f64], _p: &[f64], _t: f64, v: &[f64], y: &mut [f64]| net.jac_mul(v, y),
        )
        .init(
            move |_p: &[f64], _t: f64, y: &mut [f64]| y.copy_from_slice(&init),
            n,
        )
        .build()
        .map_err(|e| fail(0.0, 0.0, &e))?;
    problem.ode_options.min_timestep = 1e-30;
    problem.ode_options.max_number_timesteps = MAX_STEPS;
    let mut solver = problem
        .bdf::<NalgebraLU<f64>>()
        .map_err(|e| fail(0.0, 0.0, &e))?;
    solver
        .set_stop_time(t_end)
        .map_err(|e| fail(0.0, 0.0, &e))?;
    let mut t_prev = 0.0;
    for _ in 0..MAX_STEPS {
        let reason = solver.step().map_err(|e| {
            let s = solver.state();
            fail(s.t, s.h, &e)
        })?;
        let (t, x) = {
            let s = solver.state();
            (s.t, s.y.clone_as_vec())
        };
        let interpolate = |tq: f64| -> Result<Vec<f64>, SimulateError> {
            if tq >= t {
                return Ok(x.clone());
            }
            solver
                .interpolate(tq)
                .map(|v| v.clone_as_vec())
                .map_err(|e| fail(tq, t - t_prev, &e))
        };
        let view = StepView {
            t_prev,
            t,
            x: &x,
            interpolate: &interpolate,
        };
        let flow = observe(&view)?;
        if flow == Flow::Stop || matches!(reason, diffsol::OdeSolverStopReason::TstopReached) {
            return Ok((t, x));
        }
        t_prev = t;
    }
    let s = solver.state();
    Err(SimulateError::TooManySteps {
        steps: MAX_STEPS,
        time_s: s.t,
        step_s: s.h,
    })
}

/// A first step small enough for the fastest reaction that is active at the
/// start (a tenth of its time constant), so the solver's start-up is cheap.
fn initial_step(net: &Network, x0: &[f64], t_end: f64) -> f64 {
    let fastest = net
        .reactions
        .iter()
        .filter(|r| x0[r.from] != 0.0 || x0[r.to] != 0.0)
        .map(|r| r.kf.max(r.kr))
        .fold(0.0_f64, f64::max);
    let h = if fastest > 0.0 { 0.1 / fastest } else { t_end };
    h.min(t_end * 1e-3).max(1e-30)
}
