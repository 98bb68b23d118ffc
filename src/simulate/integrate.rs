//! Stiff, adaptive, implicit integration of a [`Network`]: variable-order
//! (1–5) numerical differentiation formulas in backward-difference form, the
//! NDF method of Shampine & Reichelt (SIAM J. Sci. Comput. 18, 1997, the
//! method of MATLAB's ode15s and of scipy's `BDF`), with the network's
//! analytic Jacobian and a modified Newton iteration on I − cJ (our sparse
//! LU, see [`super::newton`]).
//!
//! Why not a crate: diffsol's BDF (used here before) solved every case, but
//! at 1000 states it spent about half of its time in its own bookkeeping
//! (a weighted norm with a division per element in a serial loop, 30 %;
//! history updates through generic matrix kernels, 17 %), around a
//! right-hand side and a sparse solve of a few microseconds each; and its
//! step-size controller keeps a step until it can at least double, which
//! took 25 % more steps than scipy's BDF. The stepper below follows the
//! published method and scipy's choices (orders, coefficients, step and
//! order selection), on flat slices; it departs in a few places, each said
//! where it is: the Newton iteration may stop after one correction (always
//! for a first-order network, whose f is linear; otherwise when the last
//! measured convergence rate shows it has converged, Hairer & Wanner,
//! Solving ODEs II, §IV.8); the Newton matrix is refactorised whenever
//! c = h/α changes (refactorisation on kept pivots is cheap), so the
//! iteration never runs with a stale c; a step is not grown by less than
//! 20 %; the Newton weights are those of the last accepted step.
//!
//! Rate constants from 1e-10 to 1e13 s⁻¹ share one system, so the first steps
//! may be far below 1e-16 s: the smallest step is relative to the time
//! reached (ten units in the last place of t), as in scipy, not absolute.

use super::SimulateError;
use super::network::Network;
use super::newton::{Newton, Rhs};

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
    history: &'a History,
}

impl StepView<'_> {
    /// Concentrations at a time inside the step just taken (`t_prev..=t`).
    pub fn at(&self, t: f64) -> Result<Vec<f64>, SimulateError> {
        Ok(self.history.interpolate(t))
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

/// Highest order of the formulas (NDF5 is not A(α)-stable enough beyond).
const MAX_ORDER: usize = 5;
/// Newton iterations per attempt before the attempt counts as failed
/// (scipy's `NEWTON_MAXITER`).
const NEWTON_MAXITER: usize = 4;
/// Bounds of the step-size factor at a change (scipy's `MIN_FACTOR`,
/// `MAX_FACTOR`).
const MIN_FACTOR: f64 = 0.2;
const MAX_FACTOR: f64 = 10.0;
/// Smallest growth of the step worth a change at an unchanged order.
const MIN_GROWTH: f64 = 1.2;
/// States per block of the history loops (a few vector registers).
const BLOCK: usize = 8;
/// κ of the NDFs (Shampine & Reichelt 1997, Table 1; order 5 is plain BDF).
const KAPPA: [f64; MAX_ORDER + 1] = [0.0, -0.1850, -1.0 / 9.0, -0.0823, -0.0415, 0.0];

/// How the observer's results tie to the interpolant: the step's backward
/// differences, its size and order.
struct History {
    n: usize,
    /// Rows 0..=MAX_ORDER+2 of n entries: D⁰y (the solution), ∇y, ∇²y, …
    /// scaled by powers of h (Shampine & Reichelt's difference array).
    d: Vec<f64>,
    t: f64,
    h: f64,
    order: usize,
}

impl History {
    fn row(&self, k: usize) -> &[f64] {
        &self.d[k * self.n..(k + 1) * self.n]
    }

    /// y_predict = Σⱼ≤ₖ Dⱼ and ψ = Σ₁≤ⱼ≤ₖ gⱼ·Dⱼ (k the order), in blocks of
    /// [`BLOCK`] states kept in registers across the rows: one read of each
    /// difference and one write of each result (row-by-row passes would
    /// read and write both sums k times, and stall where their addresses
    /// alias modulo 4 KiB).
    fn predict(&self, g: &[f64; MAX_ORDER + 1], y: &mut [f64], psi: &mut [f64]) {
        let full = self.n / BLOCK * BLOCK;
        for start in (0..full).step_by(BLOCK) {
            self.predict_block::<BLOCK>(start, g, y, psi);
        }
        for start in full..self.n {
            self.predict_block::<1>(start, g, y, psi);
        }
    }

    fn predict_block<const L: usize>(
        &self,
        start: usize,
        g: &[f64; MAX_ORDER + 1],
        y: &mut [f64],
        psi: &mut [f64],
    ) {
        let n = self.n;
        let mut p = [0.0; L];
        let mut s = [0.0; L];
        p.copy_from_slice(&self.d[start..start + L]);
        for (j, &gj) in g.iter().enumerate().take(self.order + 1).skip(1) {
            let row = &self.d[j * n + start..j * n + start + L];
            for k in 0..L {
                p[k] += row[k];
                s[k] += gj * row[k];
            }
        }
        y[start..start + L].copy_from_slice(&p);
        psi[start..start + L].copy_from_slice(&s);
    }

    /// The differences of an accepted step with correction d = y − y_predict
    /// (scipy's update of D): D_{k+2} = d − D_{k+1}, D_{k+1} = d, then
    /// Dᵢ += Dᵢ₊₁ downwards; by blocks, as [`History::predict`].
    fn accept(&mut self, dsum: &[f64]) {
        let full = self.n / BLOCK * BLOCK;
        for start in (0..full).step_by(BLOCK) {
            self.accept_block::<BLOCK>(start, dsum);
        }
        for start in full..self.n {
            self.accept_block::<1>(start, dsum);
        }
    }

    fn accept_block<const L: usize>(&mut self, start: usize, dsum: &[f64]) {
        let (n, order) = (self.n, self.order);
        let mut r = [0.0; L];
        r.copy_from_slice(&dsum[start..start + L]);
        let (lo, hi) = self.d.split_at_mut((order + 2) * n);
        let next = &mut lo[(order + 1) * n + start..(order + 1) * n + start + L];
        for ((e, dn), rk) in hi[start..start + L].iter_mut().zip(next.iter_mut()).zip(&r) {
            *e = rk - *dn;
            *dn = *rk;
        }
        for i in (0..=order).rev() {
            for (x, rk) in lo[i * n + start..i * n + start + L]
                .iter_mut()
                .zip(r.iter_mut())
            {
                *rk += *x;
                *x = *rk;
            }
        }
    }

    /// The interpolating polynomial of the last step at `t` (scipy's
    /// `BdfDenseOutput`): y(t) = D₀ + Σⱼ Dⱼ₊₁ Πᵢ≤ⱼ (t − tₙ + i h)/((i + 1) h).
    fn interpolate(&self, t: f64) -> Vec<f64> {
        let mut y = self.row(0).to_vec();
        let mut p = 1.0;
        for j in 0..self.order {
            p *= (t - (self.t - self.h * j as f64)) / (self.h * (j + 1) as f64);
            for (yi, dj) in y.iter_mut().zip(self.row(j + 1)) {
                *yi += p * dj;
            }
        }
        y
    }

    /// Rescales the differences for a step `factor` times the last
    /// (Shampine & Reichelt 1997, §3.2; scipy's `change_D`): D ← (RU)ᵀ D
    /// over rows 0..=order.
    #[allow(clippy::needless_range_loop)] // matrix indices, as in the paper
    fn change_step(&mut self, factor: f64) {
        let order = self.order;
        let r = difference_change(order, factor);
        let u = difference_change(order, 1.0);
        let mut ru = [[0.0; MAX_ORDER + 1]; MAX_ORDER + 1];
        for i in 0..=order {
            for j in 0..=order {
                ru[i][j] = (0..=order).map(|k| r[i][k] * u[k][j]).sum();
            }
        }
        let full = self.n / BLOCK * BLOCK;
        for start in (0..full).step_by(BLOCK) {
            self.change_block::<BLOCK>(start, &ru);
        }
        for start in full..self.n {
            self.change_block::<1>(start, &ru);
        }
    }

    /// D ← (RU)ᵀ D on `L` states from `start`, the old rows held in
    /// registers (one read and one write per entry).
    #[allow(clippy::needless_range_loop)] // matrix indices, as in the paper
    fn change_block<const L: usize>(
        &mut self,
        start: usize,
        ru: &[[f64; MAX_ORDER + 1]; MAX_ORDER + 1],
    ) {
        let (n, order) = (self.n, self.order);
        let mut old = [[0.0; L]; MAX_ORDER + 1];
        for i in 0..=order {
            old[i].copy_from_slice(&self.d[i * n + start..i * n + start + L]);
        }
        for k in 0..=order {
            let mut out = [0.0; L];
            for i in 0..=order {
                let w = ru[i][k];
                for l in 0..L {
                    out[l] += w * old[i][l];
                }
            }
            self.d[k * n + start..k * n + start + L].copy_from_slice(&out);
        }
    }
}

/// The matrix R of Shampine & Reichelt 1997 (§3.2), scipy's `compute_R`:
/// R[i][j] = Πₗ₌₁..ᵢ (l − 1 − factor·j)/l, R[0][j] = 1.
#[allow(clippy::needless_range_loop)] // matrix indices, as in the paper
fn difference_change(order: usize, factor: f64) -> [[f64; MAX_ORDER + 1]; MAX_ORDER + 1] {
    let mut r = [[0.0; MAX_ORDER + 1]; MAX_ORDER + 1];
    for j in 0..=order {
        r[0][j] = 1.0;
    }
    for i in 1..=order {
        for j in 1..=order {
            r[i][j] = r[i - 1][j] * (i as f64 - 1.0 - factor * j as f64) / i as f64;
        }
    }
    r
}

/// √(mean of (vᵢ·wᵢ)²): the weighted RMS norm of error control with
/// wᵢ = 1/(atol + rtol·|yᵢ|). Four partial sums, so the loop vectorises.
fn rms(v: &[f64], w: &[f64]) -> f64 {
    let mut s = [0.0; 4];
    let (vc, wc) = (v.chunks_exact(4), w.chunks_exact(4));
    let (vr, wr) = (vc.remainder(), wc.remainder());
    for (a, b) in vc.zip(wc) {
        for k in 0..4 {
            let e = a[k] * b[k];
            s[k] += e * e;
        }
    }
    let tail: f64 = vr.iter().zip(wr).map(|(a, b)| (a * b) * (a * b)).sum();
    ((s[0] + s[1] + s[2] + s[3] + tail) / v.len().max(1) as f64).sqrt()
}

/// wᵢ = 1/(atol + rtol·|yᵢ|).
fn weights(y: &[f64], atol: f64, rtol: f64, w: &mut [f64]) {
    for (wi, yi) in w.iter_mut().zip(y) {
        *wi = 1.0 / (atol + rtol * yi.abs());
    }
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
    integrate_with(Linear::Sparse, net, x0, t_end, tol, observe)
}

/// How the Newton iterations store the Jacobian and solve with it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Linear {
    /// Dense matrix, dense LU (nalgebra): a check of the sparse one; its
    /// pivots lose accuracy once c·k passes 1/ε (long runs with fast
    /// equilibria).
    Dense,
    /// Sparse matrix, sparse LU (faer's ordering and first factorisation,
    /// then refactorisation with GTH pivots): what [`integrate`] uses at
    /// every size (at 10 states it is also the faster of the two).
    Sparse,
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
    let fail = |t: f64, h: f64, message: String| SimulateError::Integrator {
        time_s: t,
        step_s: h,
        message,
    };
    let n = net.dim();
    let rhs = Rhs::new(net);
    let mut newton = Newton::new(net, linear == Linear::Sparse).map_err(|e| fail(0.0, 0.0, e))?;
    let total: f64 = x0
        .iter()
        .map(|v| v.abs())
        .sum::<f64>()
        .max(f64::MIN_POSITIVE);
    let (rtol, atol) = (tol.rtol, tol.atol_fraction * total);
    // Newton's stopping tolerance on the weighted norm of the correction
    // (scipy's `newton_tol`; the floor keeps it above rounding at tight rtol).
    let newton_tol = (10.0 * f64::EPSILON / rtol).max(0.03_f64.min(rtol.sqrt()));
    let gamma: [f64; MAX_ORDER + 1] =
        std::array::from_fn(|k| (1..=k).map(|j| 1.0 / j as f64).sum());
    let alpha: [f64; MAX_ORDER + 1] = std::array::from_fn(|k| (1.0 - KAPPA[k]) * gamma[k]);
    let error_const: [f64; MAX_ORDER + 2] = std::array::from_fn(|k| {
        KAPPA.get(k).copied().unwrap_or(0.0) * gamma.get(k).copied().unwrap_or(0.0)
            + 1.0 / (k + 1) as f64
    });

    let mut counts = Counts::default();
    let mut f = vec![0.0; n];
    rhs.eval(x0, &mut f);
    counts.rhs += 1;
    let mut h = initial_step(net, x0, t_end);
    let mut hist = History {
        n,
        d: vec![0.0; (MAX_ORDER + 3) * n],
        t: 0.0,
        h,
        order: 1,
    };
    hist.d[..n].copy_from_slice(x0);
    for (d, fi) in hist.d[n..2 * n].iter_mut().zip(&f) {
        *d = fi * h;
    }
    newton.jacobian(x0);
    counts.jacobians += 1;
    // A linear network's Jacobian is exact everywhere; otherwise it is
    // refreshed when Newton fails to converge with an old one.
    let mut jac_current = true;
    let linear_net = rhs.is_linear();
    // c = h/α of the last factorisation (NaN: none).
    let mut c_lu = f64::NAN;
    // Last measured Newton contraction as θ/(1 − θ) (Hairer & Wanner's
    // FACCON); infinite until measured.
    let mut eta = f64::INFINITY;
    let mut n_equal_steps = 0usize;

    let mut y_predict = vec![0.0; n];
    let mut psi = vec![0.0; n];
    let mut y = vec![0.0; n];
    let mut dsum = vec![0.0; n];
    let mut dy = vec![0.0; n];
    let mut w = vec![0.0; n];
    let mut w_newton = vec![0.0; n];
    weights(x0, atol, rtol, &mut w_newton);

    for _ in 0..MAX_STEPS {
        let t = hist.t;
        let min_step = 10.0 * (next_up(t) - t);
        if h < min_step {
            hist.change_step(min_step / h);
            h = min_step;
            n_equal_steps = 0;
        }
        let mut safety;
        let mut error_norm;
        let mut t_new;
        loop {
            if h < min_step {
                return Err(fail(t, h, "step size below the resolution of t".into()));
            }
            t_new = t + h;
            if t_new >= t_end {
                t_new = t_end;
                hist.change_step((t_new - t) / h);
                n_equal_steps = 0;
            }
            h = t_new - t;
            hist.h = h;
            let order = hist.order;
            // Prediction, its weights, and ψ (the history term of the NDF).
            let g: [f64; MAX_ORDER + 1] = std::array::from_fn(|j| gamma[j] / alpha[order]);
            hist.predict(&g, &mut y_predict, &mut psi);
            let c = h / alpha[order];
            let mut converged = false;
            let mut iterations;
            loop {
                if c != c_lu {
                    newton.factorise(c).map_err(|e| fail(t, h, e))?;
                    c_lu = c;
                }
                // Newton on y = y_predict + d: (I − cJ) Δ = c f(y) − ψ − d,
                // from d = 0 (the first pass written out, without a copy).
                let mut norm_old: Option<f64> = None;
                iterations = 0;
                for k in 0..NEWTON_MAXITER {
                    rhs.eval(if k == 0 { &y_predict } else { &y }, &mut f);
                    counts.rhs += 1;
                    iterations = k + 1;
                    if k == 0 {
                        for ((o, fi), s) in dy.iter_mut().zip(&f).zip(&psi) {
                            *o = c * fi - s;
                        }
                    } else {
                        for ((o, fi), (s, d)) in dy.iter_mut().zip(&f).zip(psi.iter().zip(&dsum)) {
                            *o = c * fi - s - d;
                        }
                    }
                    newton.solve(&mut dy);
                    // A linear network converges in one iteration (below);
                    // its correction needs no norm (an overflow shows in the
                    // error norm).
                    let norm = if linear_net { 0.0 } else { rms(&dy, &w_newton) };
                    if !norm.is_finite() {
                        break; // an overflow in f or in the solve
                    }
                    let rate = norm_old.map(|old| norm / old);
                    // A correction already below the tolerance is accepted
                    // whatever the rate: near a steady state both corrections
                    // are rounding noise, and their ratio means nothing.
                    let tiny = rate.is_some() && norm <= newton_tol;
                    if let Some(rate) = rate
                        && !tiny
                        && (rate >= 1.0
                            || rate.powi((NEWTON_MAXITER - k) as i32) / (1.0 - rate) * norm
                                > newton_tol)
                    {
                        break;
                    }
                    if k == 0 {
                        std::mem::swap(&mut dsum, &mut dy);
                        for ((yi, di), p) in y.iter_mut().zip(&dsum).zip(&y_predict) {
                            *yi = p + di;
                        }
                    } else {
                        for ((yi, di), o) in y.iter_mut().zip(dsum.iter_mut()).zip(&dy) {
                            *yi += o;
                            *di += o;
                        }
                    }
                    match rate {
                        Some(rate) if rate < 1.0 => eta = rate / (1.0 - rate),
                        // At the rounding floor: as good as converged at once.
                        Some(_) => eta = 1e4 * f64::EPSILON,
                        // Hairer & Wanner (§IV.8): the contraction of the last
                        // measured iteration, let to grow towards 1 while it
                        // is not measured again.
                        None => eta = eta.max(1e4 * f64::EPSILON).powf(0.8),
                    }
                    // A first-order network's f is linear and its Jacobian
                    // exact, and the matrix is factorised at this c: one
                    // iteration is a direct solve of the implicit equation
                    // (as for a linear implicit problem in SUNDIALS' ARKODE).
                    if norm == 0.0 || tiny || linear_net || eta * norm < newton_tol {
                        converged = true;
                        break;
                    }
                    norm_old = Some(norm);
                }
                counts.newton_iterations += iterations;
                if converged || jac_current {
                    break;
                }
                newton.jacobian(&y_predict);
                counts.jacobians += 1;
                jac_current = true;
                c_lu = f64::NAN;
            }
            if converged {
                weights(&y, atol, rtol, &mut w);
                error_norm = error_const[order] * rms(&dsum, &w);
                converged = error_norm.is_finite();
            } else {
                error_norm = f64::INFINITY;
            }
            if !converged {
                // Newton failed with a current Jacobian (or the result
                // overflowed): halve the step.
                hist.change_step(0.5);
                h *= 0.5;
                n_equal_steps = 0;
                eta = f64::INFINITY;
                continue;
            }
            safety =
                0.9 * (2 * NEWTON_MAXITER + 1) as f64 / (2 * NEWTON_MAXITER + iterations) as f64;
            if error_norm > 1.0 {
                let factor = MIN_FACTOR.max(safety * error_norm.powf(-1.0 / (order + 1) as f64));
                hist.change_step(factor);
                h *= factor;
                n_equal_steps = 0;
                counts.rejected += 1;
                continue;
            }
            break;
        }

        // Accepted: the differences of the new point (scipy's update of D).
        counts.steps += 1;
        n_equal_steps += 1;
        let order = hist.order;
        hist.accept(&dsum);
        let t_prev = t;
        hist.t = t_new;
        if !linear_net {
            jac_current = false;
        }
        counts.factorisations = newton.factorisations;
        let view = StepView {
            t_prev,
            t: t_new,
            x: hist.row(0),
            counts,
            history: &hist,
        };
        let flow = observe(&view)?;
        // The weights of the accepted y serve the next step's Newton
        // iterations (as CVODE's, fixed over a step; scipy takes them from
        // the prediction, one more pass with a division per state).
        std::mem::swap(&mut w_newton, &mut w);
        if flow == Flow::Stop || t_new >= t_end {
            return Ok((t_new, hist.row(0).to_vec()));
        }

        // Order and step size for what follows, once the order has been
        // used for order + 1 steps: the one that allows the longest step.
        if n_equal_steps < order + 1 {
            continue;
        }
        let error_m = if order > 1 {
            error_const[order - 1] * rms(hist.row(order), &w_newton)
        } else {
            f64::INFINITY
        };
        let error_p = if order < MAX_ORDER {
            error_const[order + 1] * rms(hist.row(order + 2), &w_newton)
        } else {
            f64::INFINITY
        };
        let factors = [
            error_m.powf(-1.0 / order as f64),
            error_norm.powf(-1.0 / (order + 1) as f64),
            error_p.powf(-1.0 / (order + 2) as f64),
        ];
        let mut best = 1;
        for k in [0, 2] {
            if factors[k] > factors[best] {
                best = k;
            }
        }
        let factor = MAX_FACTOR.min(safety * factors[best]);
        // A small gain at the same order is not taken (a departure from
        // scipy, which changes h at every chance): each change costs a
        // rescaling of the differences and a new factorisation, and
        // growth by less than 20 % saves fewer steps than that (at 1000
        // states: 6 % more steps, 41 % fewer factorisations).
        if best == 1 && (1.0..MIN_GROWTH).contains(&factor) {
            n_equal_steps = 0;
            continue;
        }
        hist.order = order + best - 1;
        hist.change_step(factor);
        h *= factor;
        n_equal_steps = 0;
    }
    Err(SimulateError::TooManySteps {
        steps: MAX_STEPS,
        time_s: hist.t,
        step_s: h,
    })
}

/// The next representable f64 above `t` (t ≥ 0).
fn next_up(t: f64) -> f64 {
    if t == 0.0 {
        f64::from_bits(1)
    } else {
        f64::from_bits(t.to_bits() + 1)
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
