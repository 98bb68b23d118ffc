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
use faer::perm::PermRef;
use faer::sparse::linalg::amd;
use faer::sparse::linalg::lu::simplicial::{self, SimplicialLu};
use std::cell::{Cell, RefCell};

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
    /// The solver's work so far.
    pub counts: Counts,
    interpolate: &'a dyn Fn(f64) -> Result<Vec<f64>, SimulateError>,
}

impl StepView<'_> {
    /// Concentrations at a time inside the step just taken (`t_prev..=t`).
    pub fn at(&self, t: f64) -> Result<Vec<f64>, SimulateError> {
        (self.interpolate)(t)
    }
}

/// The integrator's work up to a step: what to compare with another solver
/// (scipy's `nfev`, `njev`, `nlu`) when tuning.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct Counts {
    /// Accepted steps.
    pub steps: usize,
    /// Rejected steps (local error too large).
    pub rejected: usize,
    /// Newton iterations, over all attempts.
    pub newton_iterations: usize,
    /// Right-hand side evaluations (the Jacobian is analytic and takes
    /// none).
    pub rhs: usize,
    /// Evaluations of the Jacobian of the right-hand side.
    pub jacobians: usize,
    /// LU factorisations of the Newton matrix.
    pub factorisations: usize,
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
            let stats = solver.get_statistics();
            let counts = Counts {
                steps: stats.number_of_steps,
                rejected: stats.number_of_error_test_failures,
                newton_iterations: stats.number_of_nonlinear_solver_iterations,
                rhs: solver.problem().eqn.rhs_calls.get(),
                jacobians: solver.problem().eqn.jacobian_calls.get(),
                factorisations: stats.number_of_linear_solver_setups,
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
                counts,
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
    /// The first-order steps without a counter (nearly all), packed for the
    /// right-hand side; `others` are the rest, by index.
    simple: Vec<Simple>,
    others: Vec<usize>,
    ctx: M::C,
    /// Work done, for [`Counts`].
    rhs_calls: Cell<usize>,
    jacobian_calls: Cell<usize>,
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
        let mut simple = Vec::new();
        let mut others = Vec::new();
        for (i, r) in net.reactions.iter().enumerate() {
            if r.forward_with.is_empty() && r.reverse_with.is_empty() && r.counter.is_none() {
                simple.push(Simple {
                    from: r.from,
                    to: r.to,
                    kf: r.kf,
                    kr: r.kr,
                });
            } else {
                others.push(i);
            }
        }
        Ok(Equations {
            net,
            x0,
            simple,
            others,
            p: M::V::zeros(0, ctx.clone()),
            sparsity,
            coloring,
            ctx,
            rhs_calls: Cell::new(0),
            jacobian_calls: Cell::new(0),
        })
    }
}

/// A first-order step `from ⇌ to` without co-reactants or counter: 32 bytes
/// where a [`super::network::Reaction`] takes over a hundred, so the
/// right-hand side of a large network streams through a quarter of the
/// memory.
#[derive(Debug, Clone, Copy)]
struct Simple {
    from: usize,
    to: usize,
    kf: f64,
    kr: f64,
}

impl<M: Matrix<T = f64>> Equations<'_, M> {
    /// [`Network::rhs`], with the simple steps from their packed copy (the
    /// same arithmetic, summed in another order).
    fn rhs(&self, x: &[f64], y: &mut [f64]) {
        y.fill(0.0);
        for r in &self.simple {
            let net = r.kf * x[r.from] - r.kr * x[r.to];
            y[r.from] -= net;
            y[r.to] += net;
        }
        for &i in &self.others {
            self.net.add_flux(&self.net.reactions[i], x, y);
        }
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
        self.0.rhs_calls.set(self.0.rhs_calls.get() + 1);
        y.for_each_batch_host([x], |y, [x], _| self.0.rhs(x, y));
    }
}

impl<M: Matrix<T = f64>> NonLinearOpJacobian for Rhs<'_, '_, M> {
    fn jac_mul_inplace(&self, x: &M::V, _t: f64, v: &M::V, y: &mut M::V) {
        y.for_each_batch_host([x, v], |y, [x, v], _| self.0.net.jac_mul(x, v, y));
    }
    fn jacobian_inplace(&self, x: &M::V, t: f64, y: &mut M) {
        self.0.jacobian_calls.set(self.0.jacobian_calls.get() + 1);
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

/// Sparse LU of the Newton matrix, made for the integrator's pattern of use:
/// one sparsity pattern for the whole run, a new factorisation every few
/// steps, a solve every Newton iteration.
///
/// - Column order: approximate minimum degree (faer's AMD) of the pattern
///   A + Aᵀ, found once. A reaction network's Jacobian is structurally
///   symmetric (a step couples its two states both ways), and on it minimum
///   degree leaves a tree-shaped network with no fill at all; faer's default
///   for LU (COLAMD) targets unsymmetric patterns and fills more.
/// - The first factorisation is faer's left-looking sparse LU with partial
///   pivoting. Later ones refactorise with the same pivots and pattern (as
///   KLU's refactorisation does: Davis & Palamadai Natarajan, ACM TOMS
///   2010), a plain loop over known entries; a pivot smaller than a tenth of
///   the largest entry below it (the threshold test of threshold partial
///   pivoting) sends the matrix back to faer for new pivots. The Newton
///   matrix I − cJ of a first-order network is column diagonally dominant,
///   so its pivots never move.
/// - Solves run on the factors as flat lists of updates in pivot order
///   (L, then U scaled by its diagonal), one multiply-add per entry, where
///   faer's generic kernels spend most of their time per column.
#[derive(Default)]
struct SparseLu {
    factors: Option<SparseFactors>,
}

/// Threshold of the pivot test of a refactorisation (common practice for
/// threshold partial pivoting, e.g. UMFPACK's default 0.1).
const PIVOT_THRESHOLD: f64 = 0.1;

/// The matrix, the orderings, the factors and their workspace, allocated
/// once.
struct SparseFactors {
    a: FaerSparseMat<f64>,
    col_fwd: Vec<usize>,
    col_inv: Vec<usize>,
    lu: SimplicialLu<usize, f64>,
    row_fwd: Vec<usize>,
    row_inv: Vec<usize>,
    scratch: MemBuffer,
    /// Pattern and values of the factors in pivot order; empty until faer
    /// has factorised once.
    l_ptr: Vec<usize>,
    l_row: Vec<usize>,
    l_val: Vec<f64>,
    /// Strictly upper part of U by column, rows ascending.
    u_ptr: Vec<usize>,
    u_row: Vec<usize>,
    u_val: Vec<f64>,
    u_diag: Vec<f64>,
    /// Dense column of the refactorisation, zero between columns.
    x: Vec<f64>,
    /// The solve's lists: `l_ops` by pivot of the source ascending, `w_ops`
    /// (U with each row divided by its pivot) descending, and 1/diag(U) by
    /// row.
    l_ops: Vec<Update>,
    w_ops: Vec<Update>,
    d_inv: Vec<f64>,
    /// True when rows were pivoted in column order (no reordering left).
    same_order: bool,
    work: RefCell<Vec<f64>>,
    /// Factorisations by faer (new pivots) and refactorisations.
    pivoted: usize,
    refactored: usize,
}

/// Applies the updates in order. Along a chain of states each update reads
/// the value the one before it wrote; that value is carried in a register
/// rather than read back from memory, which takes the store-to-load latency
/// off the chain (the solve of a long chain is a sequence of dependent
/// multiply-adds, bound by latency rather than by their number).
#[inline]
fn apply(ops: &[Update], x: &mut [f64]) {
    let (mut last, mut value) = (u32::MAX, 0.0);
    for u in ops {
        let source = if u.source == last {
            value
        } else {
            x[u.source as usize]
        };
        let t = &mut x[u.target as usize];
        *t -= u.value * source;
        (last, value) = (u.target, *t);
    }
}

/// One entry of a triangular solve: y[target] −= value · y[source].
#[derive(Debug, Clone, Copy)]
struct Update {
    target: u32,
    source: u32,
    value: f64,
}

impl SparseFactors {
    /// Minimum degree column order of the pattern of `a` (with its
    /// transpose), and room for the factors.
    fn new(a: FaerSparseMat<f64>) -> Result<Self, LaError> {
        let n = a.nrows();
        if u32::try_from(n).is_err() {
            return Err(LaError::Other(format!("{n} states are too many")));
        }
        let pattern = a.inner()[0].symbolic();
        let nnz = pattern.compute_nnz();
        let mut col_fwd = vec![0usize; n];
        let mut col_inv = vec![0usize; n];
        let mut order_scratch = MemBuffer::new(amd::order_maybe_unsorted_scratch::<usize>(n, nnz));
        amd::order_maybe_unsorted(
            &mut col_fwd,
            &mut col_inv,
            pattern,
            amd::Control::default(),
            MemStack::new(&mut order_scratch),
        )
        .map_err(|e| LaError::Other(format!("ordering the Jacobian pattern: {e:?}")))?;
        let scratch = MemBuffer::new(simplicial::factorize_simplicial_numeric_lu_scratch::<
            usize,
            f64,
        >(n, n));
        Ok(SparseFactors {
            a,
            col_fwd,
            col_inv,
            lu: SimplicialLu::new(),
            row_fwd: vec![0; n],
            row_inv: vec![0; n],
            scratch,
            l_ptr: Vec::new(),
            l_row: Vec::new(),
            l_val: Vec::new(),
            u_ptr: Vec::new(),
            u_row: Vec::new(),
            u_val: Vec::new(),
            u_diag: Vec::new(),
            x: vec![0.0; n],
            l_ops: Vec::new(),
            w_ops: Vec::new(),
            d_inv: Vec::new(),
            same_order: false,
            work: RefCell::new(vec![0.0; n]),
            pivoted: 0,
            refactored: 0,
        })
    }

    /// Factorises the matrix now in `a`: with the last pivots if they pass
    /// the threshold test, else by faer with new ones.
    fn factorise(&mut self) -> Result<(), LaError> {
        if self.l_ptr.is_empty() || !self.refactorise() {
            self.pivot()?;
        }
        self.make_ops();
        Ok(())
    }

    /// faer's factorisation with partial pivoting; keeps its pattern and
    /// values in pivot order.
    fn pivot(&mut self) -> Result<(), LaError> {
        let col_perm = PermRef::new_checked(&self.col_fwd, &self.col_inv, self.col_fwd.len());
        simplicial::factorize_simplicial_numeric_lu(
            &mut self.row_fwd,
            &mut self.row_inv,
            &mut self.lu,
            self.a.inner()[0].as_ref(),
            col_perm,
            MemStack::new(&mut self.scratch),
        )
        .map_err(|e| LaError::Other(format!("LU of the Newton matrix: {e:?}")))?;
        self.pivoted += 1;
        let n = self.lu.ncols();
        let l = self.lu.l_factor_unsorted();
        let u = self.lu.u_factor_unsorted();
        let (l_col, l_row, l_val) = (l.symbolic().col_ptr(), l.symbolic().row_idx(), l.val());
        let (u_col, u_row, u_val) = (u.symbolic().col_ptr(), u.symbolic().row_idx(), u.val());
        for v in [
            &mut self.l_ptr,
            &mut self.l_row,
            &mut self.u_ptr,
            &mut self.u_row,
        ] {
            v.clear();
        }
        for v in [&mut self.l_val, &mut self.u_val, &mut self.u_diag] {
            v.clear();
        }
        self.l_ptr.push(0);
        self.u_ptr.push(0);
        let mut column: Vec<(usize, f64)> = Vec::new();
        for j in 0..n {
            // L's unit diagonal and U's pivot are kept apart.
            for k in l_col[j]..l_col[j + 1] {
                if l_row[k] != j {
                    self.l_row.push(l_row[k]);
                    self.l_val.push(l_val[k]);
                }
            }
            column.clear();
            let mut diag = 0.0;
            for k in u_col[j]..u_col[j + 1] {
                if u_row[k] == j {
                    diag = u_val[k];
                } else {
                    column.push((u_row[k], u_val[k]));
                }
            }
            // Ascending rows: the order the refactorisation applies them.
            column.sort_unstable_by_key(|&(row, _)| row);
            self.u_row.extend(column.iter().map(|&(row, _)| row));
            self.u_val.extend(column.iter().map(|&(_, value)| value));
            self.l_ptr.push(self.l_row.len());
            self.u_ptr.push(self.u_row.len());
            self.u_diag.push(diag);
        }
        Ok(())
    }

    /// Left-looking LU of `a` on the last pattern and pivots. False (values
    /// left half-made, to be replaced by [`Self::pivot`]) when a pivot fails
    /// the threshold test.
    fn refactorise(&mut self) -> bool {
        let a = self.a.inner()[0].as_ref();
        let (a_col, a_row, a_val) = (a.symbolic().col_ptr(), a.symbolic().row_idx(), a.val());
        let x = &mut self.x;
        let mut ok = true;
        for j in 0..self.col_fwd.len() {
            let c = self.col_fwd[j];
            for k in a_col[c]..a_col[c + 1] {
                x[self.row_inv[a_row[k]]] = a_val[k];
            }
            for p in self.u_ptr[j]..self.u_ptr[j + 1] {
                let k = self.u_row[p];
                let ukj = x[k];
                x[k] = 0.0;
                self.u_val[p] = ukj;
                for q in self.l_ptr[k]..self.l_ptr[k + 1] {
                    x[self.l_row[q]] -= self.l_val[q] * ukj;
                }
            }
            let diag = x[j];
            x[j] = 0.0;
            let mut largest = 0.0_f64;
            for q in self.l_ptr[j]..self.l_ptr[j + 1] {
                let i = self.l_row[q];
                largest = largest.max(x[i].abs());
                self.l_val[q] = x[i] / diag;
                x[i] = 0.0;
            }
            self.u_diag[j] = diag;
            if !(diag.abs() >= PIVOT_THRESHOLD * largest && diag != 0.0) {
                ok = false;
            }
        }
        if ok {
            self.refactored += 1;
        }
        ok
    }

    /// The solve's update lists from the factors, with pivot positions
    /// replaced by the rows they stand for, so the solve works in place.
    fn make_ops(&mut self) {
        let n = self.u_diag.len();
        let row = |p: usize| self.row_fwd[p] as u32;
        self.l_ops.clear();
        self.w_ops.clear();
        for j in 0..n {
            for q in self.l_ptr[j]..self.l_ptr[j + 1] {
                self.l_ops.push(Update {
                    target: row(self.l_row[q]),
                    source: row(j),
                    value: self.l_val[q],
                });
            }
        }
        for j in (0..n).rev() {
            for p in self.u_ptr[j]..self.u_ptr[j + 1] {
                let k = self.u_row[p];
                self.w_ops.push(Update {
                    target: row(k),
                    source: row(j),
                    value: self.u_val[p] / self.u_diag[k],
                });
            }
        }
        self.d_inv.clear();
        self.d_inv.resize(n, 0.0);
        for (p, d) in self.u_diag.iter().enumerate() {
            self.d_inv[self.row_fwd[p]] = 1.0 / d;
        }
        self.same_order = self.row_fwd == self.col_fwd;
    }

    /// x ← A⁻¹ x (or A⁻ᵀ x). With W = D⁻¹U (D the pivots),
    /// A = Pᵀ L D W Qᵀ; the updates act on x where the row pivoted at each
    /// position lives, so only the column order is left to apply, and not
    /// even that when the pivots kept the diagonal (`same_order`).
    fn solve(&self, x: &mut [f64], transpose: bool) {
        if transpose {
            self.reorder(x, &self.col_fwd, &self.row_fwd);
            for u in self.w_ops.iter().rev() {
                x[u.source as usize] -= u.value * x[u.target as usize];
            }
            for (xi, d) in x.iter_mut().zip(&self.d_inv) {
                *xi *= d;
            }
            for u in self.l_ops.iter().rev() {
                x[u.source as usize] -= u.value * x[u.target as usize];
            }
        } else {
            apply(&self.l_ops, x);
            for (xi, d) in x.iter_mut().zip(&self.d_inv) {
                *xi *= d;
            }
            apply(&self.w_ops, x);
            self.reorder(x, &self.row_fwd, &self.col_fwd);
        }
    }

    /// x[to[p]] ← x[from[p]] for every position p.
    fn reorder(&self, x: &mut [f64], from: &[usize], to: &[usize]) {
        if self.same_order {
            return;
        }
        let mut y = self.work.borrow_mut();
        for (yp, &f) in y.iter_mut().zip(from) {
            *yp = x[f];
        }
        for (&yp, &t) in y.iter().zip(to) {
            x[t] = yp;
        }
    }
}

impl SparseLu {
    fn solve(&self, b: &mut FaerVec<f64>, transpose: bool) -> Result<(), LaError> {
        let Some(f) = &self.factors else {
            return Err(LaError::Other("sparse LU used before factorisation".into()));
        };
        b.for_each_batch_host([], |x, [], _| f.solve(x, transpose));
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
        self.factors = Some(SparseFactors::new(a).expect("ordering of the Jacobian pattern"));
    }

    fn set_linearisation<C>(&mut self, op: &C)
    where
        C: LaLinearOp<V = FaerVec<f64>, T = f64, M = FaerSparseMat<f64>, C = FaerContext>,
    {
        let f = self.factors.as_mut().expect("set_sparsity comes first");
        op.matrix_inplace(&mut f.a);
        f.factorise().expect("numeric LU of the Newton matrix");
    }

    fn solve_in_place(&self, b: &mut FaerVec<f64>) -> Result<(), LaError> {
        self.solve(b, false)
    }

    fn solve_transpose_in_place(&self, b: &mut FaerVec<f64>) -> Result<(), LaError> {
        self.solve(b, true)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A deterministic sparse pattern of size `n`: the diagonal, a chain,
    /// and scattered couplings both ways (a network's Jacobian is
    /// structurally symmetric), from a linear congruential sequence.
    fn pattern(n: usize) -> Vec<(usize, usize)> {
        let mut seed: u64 = 12345;
        let mut next = move || {
            seed = seed.wrapping_mul(6_364_136_223_846_793_005).wrapping_add(1);
            (seed >> 33) as usize
        };
        let mut out: Vec<(usize, usize)> = (0..n).map(|i| (i, i)).collect();
        for i in 0..n - 1 {
            out.extend([(i, i + 1), (i + 1, i)]);
        }
        for _ in 0..n {
            let (i, j) = (next() % n, next() % n);
            if i != j {
                out.extend([(i, j), (j, i)]);
            }
        }
        out.sort_unstable_by_key(|&(i, j)| (j, i));
        out.dedup();
        out
    }

    /// Values on `pattern`: `I − cJ` of a first-order network (off-diagonal
    /// rates k ≥ 0 leaving column j, its diagonal 1 + c Σk) when `dominant`;
    /// otherwise the same with the diagonal shrunk to 1e-3 in every third
    /// column, which partial pivoting has to move.
    fn values(pattern: &[(usize, usize)], c: f64, dominant: bool) -> Vec<f64> {
        let n = pattern.iter().map(|p| p.0).max().unwrap() + 1;
        let rate = |i: usize, j: usize| 1.0 + ((i * 7 + j * 13) % 10) as f64;
        let mut out_of = vec![0.0; n];
        for &(i, j) in pattern {
            if i != j {
                out_of[j] += rate(i, j);
            }
        }
        pattern
            .iter()
            .map(|&(i, j)| match (i == j, dominant || j % 3 != 0) {
                (false, _) => -c * rate(i, j),
                (true, true) => 1.0 + c * out_of[j],
                (true, false) => 1e-3,
            })
            .collect()
    }

    fn matrix(pattern: &[(usize, usize)], values: Vec<f64>) -> FaerSparseMat<f64> {
        let n = pattern.iter().map(|p| p.0).max().unwrap() + 1;
        FaerSparseMat::try_from_triplets(n, n, pattern.to_vec(), values, FaerContext::default())
            .unwrap()
    }

    /// Solves with the factors, A x = b and Aᵀ x = b, and checks the
    /// normwise backward error |b − A x|∞ / (‖A‖∞ |x|∞ + |b|∞) (common
    /// practice for judging a linear solve; a stable LU gives a small
    /// multiple of the unit roundoff whatever the conditioning).
    fn check_solves(f: &SparseFactors, pattern: &[(usize, usize)], values: &[f64]) {
        let n = f.col_fwd.len();
        let b: Vec<f64> = (0..n)
            .map(|i| 1.0 + (i % 5) as f64 - 0.3 * i as f64)
            .collect();
        for transpose in [false, true] {
            let mut x = b.clone();
            f.solve(&mut x, transpose);
            let mut residual = b.clone();
            let mut row_sums = vec![0.0; n];
            for (&(i, j), &v) in pattern.iter().zip(values) {
                let (i, j) = if transpose { (j, i) } else { (i, j) };
                residual[i] -= v * x[j];
                row_sums[i] += v.abs();
            }
            let max = |v: &[f64]| v.iter().fold(0.0_f64, |m, x| m.max(x.abs()));
            let error = max(&residual) / (max(&row_sums) * max(&x) + max(&b));
            assert!(
                error < 1e-14,
                "transpose {transpose}: backward error {error:e}"
            );
        }
    }

    #[test]
    fn sparse_lu_refactorises_a_dominant_matrix_and_repivots_when_it_must() {
        let n = 40;
        let p = pattern(n);
        let first = values(&p, 0.5, true);
        let mut f = SparseFactors::new(matrix(&p, first.clone())).unwrap();
        f.factorise().unwrap();
        check_solves(&f, &p, &first);
        assert_eq!((f.pivoted, f.refactored), (1, 0));

        // A new step size: same pattern, the pivots stay (column dominance).
        let second = values(&p, 3e4, true);
        f.a = matrix(&p, second.clone());
        f.factorise().unwrap();
        check_solves(&f, &p, &second);
        assert_eq!((f.pivoted, f.refactored), (1, 1));

        // Small diagonals: the old pivots fail the threshold test.
        let third = values(&p, 2.0, false);
        f.a = matrix(&p, third.clone());
        f.factorise().unwrap();
        check_solves(&f, &p, &third);
        assert_eq!((f.pivoted, f.refactored), (2, 1));
    }
}
