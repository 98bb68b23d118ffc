//! Stiff, adaptive, implicit integration of a [`Network`] with diffsol's BDF
//! (variable order 1–5, the NDF variant) and the network's analytic Jacobian.
//!
//! Rate constants from 1e-10 to 1e13 s⁻¹ share one system, so the first steps
//! may be far below 1e-16 s; diffsol's default smallest step (machine epsilon,
//! in seconds) would abort there, so it is set to 1e-30 s.
//!
//! Small systems use a dense Jacobian and dense LU (nalgebra); from
//! [`SPARSE_FROM`] states on, a sparse Jacobian and faer's sparse LU, whose
//! cost grows with the number of reactions rather than with the cube of the
//! number of states. The network is handed to diffsol as its own equations
//! ([`Equations`]) rather than through the closure builder: the builder finds
//! a sparse pattern by probing every column at once (N² numbers, most of the
//! memory of a 1000-state run), while the pattern is known from the reactions
//! ([`Network::jacobian_pattern`]); the values are filled by column colouring.

use super::SimulateError;
use super::network::Network;
use diffsol::matrix::sparsity::MatrixSparsity;
use diffsol::{
    ConstantOp, FaerContext, FaerSparseMat, FaerVec, JacobianColoring, LaError, LaLinearOp, Matrix,
    MatrixCommon, NalgebraLU, NalgebraMat, NonLinearOp, NonLinearOpJacobian, OdeBuilder,
    OdeEquations, OdeEquationsRef, OdeSolverMethod, Op, ParameterisedOp, UnitCallable, Vector,
};
use diffsol_la::LinearSolver;
use faer::dyn_stack::{MemBuffer, MemStack};
use faer::sparse::linalg::lu::{LuRef, NumericLu, SymbolicLu, factorize_symbolic_lu};
use faer::{Conj, Par};
use std::cell::RefCell;

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
        let total: f64 = x0
            .iter()
            .map(|v: &f64| v.abs())
            .sum::<f64>()
            .max(f64::MIN_POSITIVE);
        let atol = tol.atol_fraction * total;
        let fail = |t: f64, h: f64, e: &dyn std::fmt::Display| SimulateError::Integrator {
            time_s: t,
            step_s: h,
            message: e.to_string(),
        };
        let equations = Equations::<$m>::new(net, x0).map_err(|e| fail(0.0, 0.0, &e))?;
        let mut problem = OdeBuilder::<$m>::new()
            .rtol(tol.rtol)
            .atol([atol])
            .h0(initial_step(net, x0, t_end))
            .build_from_eqn(equations)
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
        Linear::Sparse => bdf!(FaerSparseMat<f64>, SparseLu, net, x0, t_end, tol, observe),
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

/// The network as diffsol equations: dx/dt = f(x) with the analytic Jacobian,
/// no parameters and no mass matrix.
struct Equations<'a, M: Matrix<T = f64>> {
    net: &'a Network,
    x0: &'a [f64],
    /// The (empty) parameter vector diffsol asks for.
    p: M::V,
    /// Pattern and colouring of a sparse Jacobian; `None` for a dense one,
    /// which is filled column by column.
    sparsity: Option<M::Sparsity>,
    coloring: Option<JacobianColoring<M>>,
    ctx: M::C,
}

impl<'a, M: Matrix<T = f64>> Equations<'a, M> {
    fn new(net: &'a Network, x0: &'a [f64]) -> Result<Self, diffsol::LaError> {
        let ctx = M::C::default();
        let n = net.dim();
        let (sparsity, coloring) = if M::is_sparse() {
            let pattern = net.jacobian_pattern();
            let sparsity = M::Sparsity::try_from_indices(n, n, pattern.clone())?;
            let coloring = JacobianColoring::new(&sparsity, &pattern, ctx.clone());
            (Some(sparsity), Some(coloring))
        } else {
            (None, None)
        };
        Ok(Equations {
            net,
            x0,
            p: M::V::zeros(0, ctx.clone()),
            sparsity,
            coloring,
            ctx,
        })
    }
}

/// The right-hand side f(x) as diffsol's operator.
struct Rhs<'b, 'a, M: Matrix<T = f64>>(&'b Equations<'a, M>);

/// The initial state as diffsol's operator.
struct Init<'b, 'a, M: Matrix<T = f64>>(&'b Equations<'a, M>);

/// Sizes and context shared by the equations and their operators.
macro_rules! op_of_network {
    ($ty:ty, $eqn:ident => $get:expr) => {
        impl<M: Matrix<T = f64>> Op for $ty {
            type T = f64;
            type V = M::V;
            type M = M;
            type C = M::C;
            fn nstates(&self) -> usize {
                let $eqn = self;
                $get.net.dim()
            }
            fn nout(&self) -> usize {
                let $eqn = self;
                $get.net.dim()
            }
            fn nparams(&self) -> usize {
                0
            }
            fn context(&self) -> &M::C {
                let $eqn = self;
                &$get.ctx
            }
        }
    };
}
op_of_network!(Equations<'_, M>, e => e);
op_of_network!(Rhs<'_, '_, M>, r => r.0);
op_of_network!(Init<'_, '_, M>, i => i.0);

impl<M: Matrix<T = f64>> NonLinearOp for Rhs<'_, '_, M> {
    fn call_inplace(&self, x: &M::V, _t: f64, y: &mut M::V) {
        y.for_each_batch_host([x], |y, [x], _| self.0.net.rhs(x, y));
    }
}

impl<M: Matrix<T = f64>> NonLinearOpJacobian for Rhs<'_, '_, M> {
    fn jac_mul_inplace(&self, x: &M::V, _t: f64, v: &M::V, y: &mut M::V) {
        y.for_each_batch_host([x, v], |y, [x, v], _| self.0.net.jac_mul(x, v, y));
    }
    fn jacobian_inplace(&self, x: &M::V, t: f64, y: &mut M) {
        match &self.0.coloring {
            Some(coloring) => coloring.jacobian_inplace(self, x, t, y),
            None => self._default_jacobian_inplace(x, t, y),
        }
    }
    fn jacobian_sparsity(&self) -> Option<M::Sparsity> {
        self.0.sparsity.clone()
    }
}

impl<M: Matrix<T = f64>> ConstantOp for Init<'_, '_, M> {
    fn call_inplace(&self, _t: f64, y: &mut M::V) {
        y.for_each_batch_host([], |y, [], _| y.copy_from_slice(self.0.x0));
    }
}

impl<'b, 'a, M: Matrix<T = f64>> OdeEquationsRef<'b> for Equations<'a, M> {
    type Mass = ParameterisedOp<'b, UnitCallable<M>>;
    type Rhs = Rhs<'b, 'a, M>;
    type Root = ParameterisedOp<'b, UnitCallable<M>>;
    type Init = Init<'b, 'a, M>;
    type Out = ParameterisedOp<'b, UnitCallable<M>>;
    type Reset = ParameterisedOp<'b, UnitCallable<M>>;
}

impl<'a, M: Matrix<T = f64>> OdeEquations for Equations<'a, M> {
    fn rhs(&self) -> Rhs<'_, 'a, M> {
        Rhs(self)
    }
    fn mass(&self) -> Option<ParameterisedOp<'_, UnitCallable<M>>> {
        None
    }
    fn init(&self) -> Init<'_, 'a, M> {
        Init(self)
    }
    fn set_params(&mut self, p: &M::V) {
        self.p.copy_from(p);
    }
    fn get_params(&self, p: &mut M::V) {
        p.copy_from(&self.p);
    }
}

/// faer's sparse LU (fill-reducing column order, partial pivoting), as
/// diffsol's `FaerSparseLU` runs it, but solving on a column-major view of
/// the right-hand side. diffsol hands faer a one-column view whose strides
/// send faer's row permutations through a copy per element: a fifth of a
/// 1000-state run.
#[derive(Default)]
struct SparseLu {
    factors: Option<SparseFactors>,
}

/// The matrix, its factorisation, and faer's scratch, allocated once.
struct SparseFactors {
    a: FaerSparseMat<f64>,
    symbolic: SymbolicLu<usize>,
    numeric: NumericLu<usize, f64>,
    factor_scratch: MemBuffer,
    solve_scratch: RefCell<MemBuffer>,
}

impl SparseLu {
    fn solve(&self, b: &mut FaerVec<f64>, transpose: bool) -> Result<(), LaError> {
        let Some(f) = &self.factors else {
            return Err(LaError::Other("sparse LU used before factorisation".into()));
        };
        let lu = LuRef::new_unchecked(&f.symbolic, &f.numeric);
        let mut scratch = f.solve_scratch.borrow_mut();
        b.for_each_batch_host([], |x, [], _| {
            let n = x.len();
            let rhs = faer::MatMut::from_column_major_slice_mut(x, n, 1);
            let stack = MemStack::new(&mut scratch);
            if transpose {
                lu.solve_transpose_in_place_with_conj(Conj::No, rhs, Par::Seq, stack);
            } else {
                lu.solve_in_place_with_conj(Conj::No, rhs, Par::Seq, stack);
            }
        });
        Ok(())
    }
}

impl LinearSolver<FaerSparseMat<f64>> for SparseLu {
    fn set_sparsity<C>(&mut self, op: &C)
    where
        C: LaLinearOp<V = FaerVec<f64>, T = f64, M = FaerSparseMat<f64>, C = FaerContext>,
    {
        let a =
            FaerSparseMat::new_from_sparsity(op.nrows(), op.ncols(), op.sparsity(), *op.context());
        // As diffsol's own sparse LU: the trait gives no way to report an
        // error here, and the pattern comes from `Network::jacobian_pattern`.
        let symbolic = factorize_symbolic_lu(a.inner()[0].symbolic(), Default::default())
            .expect("symbolic LU of the Jacobian pattern");
        let factor_scratch = MemBuffer::new(
            symbolic.factorize_numeric_lu_scratch::<f64>(Par::Seq, Default::default()),
        );
        let solve_scratch = RefCell::new(MemBuffer::new(
            symbolic
                .solve_in_place_scratch::<f64>(1, Par::Seq)
                .or(symbolic.solve_transpose_in_place_scratch::<f64>(1, Par::Seq)),
        ));
        self.factors = Some(SparseFactors {
            a,
            symbolic,
            numeric: NumericLu::new(),
            factor_scratch,
            solve_scratch,
        });
    }

    fn set_linearisation<C>(&mut self, op: &C)
    where
        C: LaLinearOp<V = FaerVec<f64>, T = f64, M = FaerSparseMat<f64>, C = FaerContext>,
    {
        let f = self.factors.as_mut().expect("set_sparsity comes first");
        op.matrix_inplace(&mut f.a);
        f.symbolic
            .factorize_numeric_lu(
                &mut f.numeric,
                f.a.inner()[0].as_ref(),
                Par::Seq,
                MemStack::new(&mut f.factor_scratch),
                Default::default(),
            )
            .expect("numeric LU of the Newton matrix");
    }

    fn solve_in_place(&self, b: &mut FaerVec<f64>) -> Result<(), LaError> {
        self.solve(b, false)
    }

    fn solve_transpose_in_place(&self, b: &mut FaerVec<f64>) -> Result<(), LaError> {
        self.solve(b, true)
    }
}
