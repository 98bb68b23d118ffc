//! Stiff, adaptive, implicit integration of a [`Network`] with diffsol's BDF
//! (variable order 1–5, the NDF variant) and the network's analytic Jacobian.
//!
//! Rate constants from 1e-10 to 1e13 s⁻¹ share one system, so the first steps
//! may be far below 1e-16 s; diffsol's default smallest step (machine epsilon,
//! in seconds) would abort there, so it is set to 1e-30 s.
//!
//! Small systems use a dense Jacobian and dense LU (nalgebra); from
//! [`SPARSE_FROM`] states on, a sparse Jacobian (its pattern found by diffsol
//! from NaN probes of [`Network::jac_mul`], filled by column colouring) and
//! faer's sparse LU, whose cost grows with the number of reactions rather
//! than with the cube of the number of states.

use super::SimulateError;
use super::network::Network;
use diffsol::{
    FaerSparseLU, FaerSparseMat, NalgebraLU, NalgebraMat, OdeBuilder, OdeSolverMethod, Vector,
};

/// Size (ODE dimension) from which the sparse Jacobian and LU are used.
/// Below it dense LU of a tiny matrix is cheaper than sparse bookkeeping.
pub const SPARSE_FROM: usize = 40;

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

/// One BDF run with matrix type `$m` and linear solver `$ls`. A macro rather
/// than a generic function: diffsol's builder and solver bounds differ per
/// matrix type and would have to be spelled out in full.
macro_rules! bdf {
    ($m:ty, $ls:ty, $net:expr, $x0:expr, $t_end:expr, $tol:expr, $observe:expr) => {{
        let (net, x0, t_end, tol, observe) = ($net, $x0, $t_end, $tol, $observe);
        let n = net.dim();
        let total: f64 = x0
            .iter()
            .map(|v: &f64| v.abs())
            .sum::<f64>()
            .max(f64::MIN_POSITIVE);
        let atol = tol.atol_fraction * total;
        let init = x0.to_vec();
        let fail = |t: f64, h: f64, e: &dyn std::fmt::Display| SimulateError::Integrator {
            time_s: t,
            step_s: h,
            message: e.to_string(),
        };
        let mut problem = OdeBuilder::<$m>::new()
            .rtol(tol.rtol)
            .atol([atol])
            .h0(initial_step(net, x0, t_end))
            .rhs_implicit(
                |x: &[f64], _p: &[f64], _t: f64, y: &mut [f64]| net.rhs(x, y),
                |x: &[f64], _p: &[f64], _t: f64, v: &[f64], y: &mut [f64]| net.jac_mul(x, v, y),
            )
            .init(
                move |_p: &[f64], _t: f64, y: &mut [f64]| y.copy_from_slice(&init),
                n,
            )
            .build()
            .map_err(|e| fail(0.0, 0.0, &e))?;
        problem.ode_options.min_timestep = 1e-30;
        problem.ode_options.max_number_timesteps = MAX_STEPS;
        let mut solver = problem.bdf::<$ls>().map_err(|e| fail(0.0, 0.0, &e))?;
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
    }};
}

/// Integrates from `x0` (the full state: species, then co-reactants) at
/// t = 0 until `t_end` or until `observe` says stop. Returns the time reached
/// and the state there.
pub fn integrate(
    net: &Network,
    x0: &[f64],
    t_end: f64,
    tol: Tolerances,
    observe: &mut dyn FnMut(&StepView<'_>) -> Result<Flow, SimulateError>,
) -> Result<(f64, Vec<f64>), SimulateError> {
    integrate_with(Linear::for_size(net.dim()), net, x0, t_end, tol, observe)
}

/// How the Newton iterations store the Jacobian and solve with it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Linear {
    /// Dense matrix, dense LU (nalgebra).
    Dense,
    /// Sparse matrix, sparse LU (faer).
    Sparse,
}

impl Linear {
    /// The choice [`integrate`] makes for an ODE of dimension `dim`.
    pub fn for_size(dim: usize) -> Linear {
        if dim >= SPARSE_FROM {
            Linear::Sparse
        } else {
            Linear::Dense
        }
    }
}

/// [`integrate`] with the linear algebra chosen by the caller (benchmarks and
/// the test that both give the same answer).
pub fn integrate_with(
    linear: Linear,
    net: &Network,
    x0: &[f64],
    t_end: f64,
    tol: Tolerances,
    observe: &mut dyn FnMut(&StepView<'_>) -> Result<Flow, SimulateError>,
) -> Result<(f64, Vec<f64>), SimulateError> {
    match linear {
        Linear::Sparse => bdf!(
            FaerSparseMat<f64>,
            FaerSparseLU<f64>,
            net,
            x0,
            t_end,
            tol,
            observe
        ),
        Linear::Dense => bdf!(
            NalgebraMat<f64>,
            NalgebraLU<f64>,
            net,
            x0,
            t_end,
            tol,
            observe
        ),
    }
}

/// A first step small enough for the fastest reaction that is active at the
/// start (a tenth of its time constant), so the solver's start-up is cheap.
fn initial_step(net: &Network, x0: &[f64], t_end: f64) -> f64 {
    // Rate constants at the starting co-reactant concentrations.
    let first_order = net.frozen(x0);
    let fastest = first_order
        .reactions
        .iter()
        .filter(|r| x0[r.from] != 0.0 || x0[r.to] != 0.0)
        .map(|r| r.kf.max(r.kr))
        .fold(0.0_f64, f64::max);
    let h = if fastest > 0.0 { 0.1 / fastest } else { t_end };
    h.min(t_end * 1e-3).max(1e-30)
}
