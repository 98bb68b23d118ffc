//! Sparse LU of the Newton matrix, made for the integrator's pattern of use:
//! one sparsity pattern for the whole run, a new factorisation every few
//! steps, a solve every Newton iteration.
//!
//! - Column order: approximate minimum degree (faer's AMD) of the pattern
//!   A + Aᵀ, found once. A reaction network's Jacobian is structurally
//!   symmetric (a step couples its two states both ways), and on it minimum
//!   degree leaves a tree-shaped network with no fill at all; faer's default
//!   for LU (COLAMD) targets unsymmetric patterns and fills more.
//! - The first factorisation is faer's left-looking sparse LU with partial
//!   pivoting. Later ones refactorise with the same pivots and pattern (as
//!   KLU's refactorisation does: Davis & Palamadai Natarajan, ACM TOMS
//!   2010), a plain loop over known entries; a pivot smaller than a tenth of
//!   the largest entry below it (the threshold test of threshold partial
//!   pivoting) sends the matrix back to faer for new pivots. The Newton
//!   matrix I − cJ of a first-order network is column diagonally dominant,
//!   so its pivots never move.
//! - Solves run on the factors as flat lists of updates in pivot order
//!   (L, then U scaled by its diagonal), one multiply-add per entry, where
//!   faer's generic kernels spend most of their time per column.

use faer::dyn_stack::{MemBuffer, MemStack};
use faer::perm::PermRef;
use faer::sparse::SparseColMat;
use faer::sparse::linalg::amd;
use faer::sparse::linalg::lu::simplicial::{self, SimplicialLu};
use std::cell::RefCell;

/// Threshold of the pivot test of a refactorisation (common practice for
/// threshold partial pivoting, e.g. UMFPACK's default 0.1).
const PIVOT_THRESHOLD: f64 = 0.1;

/// The matrix, the orderings, the factors and their workspace, allocated
/// once.
pub(super) struct SparseFactors {
    /// The matrix to factorise: its values are set by the caller before
    /// [`SparseFactors::factorise`].
    pub(super) a: SparseColMat<usize, f64>,
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
    /// Column sums of the Schur complement at each pivot (NaN where the
    /// GTH pivot was not used).
    sigma: Vec<f64>,
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
    pub(super) pivoted: usize,
    pub(super) refactored: usize,
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
    pub(super) fn new(a: SparseColMat<usize, f64>) -> Result<Self, String> {
        let n = a.nrows();
        if u32::try_from(n).is_err() {
            return Err(format!("{n} states are too many"));
        }
        let pattern = a.symbolic();
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
        .map_err(|e| format!("ordering the Jacobian pattern: {e:?}"))?;
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
            sigma: vec![f64::NAN; n],
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
    ///
    /// `column_sums` are the sums of the columns of `a`, computed without
    /// cancellation by the caller: where the matrix is an M-matrix (the
    /// Newton matrix I − cJ of a first-order network: off-diagonal entries
    /// ≤ 0, column sums exactly 1), pivots are computed from them as in the
    /// GTH algorithm (Grassmann, Taksar & Heyman, Oper. Res. 1985): the pivot
    /// is the column sum of the Schur complement minus its off-diagonal
    /// entries, all terms of one sign. The usual update subtracts numbers of
    /// size c·k ≈ 1e17 to leave a pivot of order 1 — pure rounding once
    /// c·k passes 1/ε, as it does in long runs with fast equilibria.
    pub(super) fn factorise(&mut self, column_sums: &[f64]) -> Result<(), String> {
        if self.l_ptr.is_empty() {
            self.pivot_on_diagonal()?;
            if self.refactorise(column_sums) {
                self.make_ops();
                return Ok(());
            }
        }
        if !self.refactorise(column_sums) {
            self.pivot()?;
            // Again on faer's pivots, for pivots without cancellation (and
            // faer's own values if those fail the threshold test).
            if !self.refactorise(column_sums) {
                self.pivot()?;
            }
            self.make_ops();
        } else {
            self.update_ops();
        }
        Ok(())
    }

    /// The pattern of the factors with pivots on the diagonal, from faer's
    /// factorisation of a strictly column diagonally dominant matrix of the
    /// same pattern (partial pivoting then keeps every pivot on the
    /// diagonal); the values are refactorised after. Faer on the matrix
    /// itself could take an off-diagonal pivot where the diagonal ties with
    /// it in rounding (1 + 1e18 against −1e18), which the GTH pivots of an
    /// M-matrix need on the diagonal.
    fn pivot_on_diagonal(&mut self) -> Result<(), String> {
        let values = self.a.val().to_vec();
        {
            let n = self.col_fwd.len();
            let col_ptr = self.a.symbolic().col_ptr().to_vec();
            let row_idx = self.a.symbolic().row_idx().to_vec();
            let a = self.a.val_mut();
            for j in 0..n {
                let range = col_ptr[j]..col_ptr[j + 1];
                let off: f64 = range
                    .clone()
                    .filter(|&k| row_idx[k] != j)
                    .map(|k| a[k].abs())
                    .sum();
                for k in range {
                    if row_idx[k] == j {
                        a[k] = 2.0 * off + 1.0;
                    }
                }
            }
        }
        let result = self.pivot();
        self.a.val_mut().copy_from_slice(&values);
        result
    }

    /// faer's factorisation with partial pivoting; keeps its pattern and
    /// values in pivot order.
    fn pivot(&mut self) -> Result<(), String> {
        let col_perm = PermRef::new_checked(&self.col_fwd, &self.col_inv, self.col_fwd.len());
        simplicial::factorize_simplicial_numeric_lu(
            &mut self.row_fwd,
            &mut self.row_inv,
            &mut self.lu,
            self.a.as_ref(),
            col_perm,
            MemStack::new(&mut self.scratch),
        )
        .map_err(|e| format!("LU of the Newton matrix: {e:?}"))?;
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
    fn refactorise(&mut self, column_sums: &[f64]) -> bool {
        let a = self.a.as_ref();
        let (a_col, a_row, a_val) = (a.symbolic().col_ptr(), a.symbolic().row_idx(), a.val());
        // Plain slices: through `self` every store would make the compiler
        // reload each vector's pointer and length.
        let (x, col_fwd, row_inv) = (&mut self.x[..], &self.col_fwd[..], &self.row_inv[..]);
        let (u_ptr, u_row, u_val) = (&self.u_ptr[..], &self.u_row[..], &mut self.u_val[..]);
        let (l_ptr, l_row, l_val) = (&self.l_ptr[..], &self.l_row[..], &mut self.l_val[..]);
        let (u_diag, sigma) = (&mut self.u_diag[..], &mut self.sigma[..]);
        let mut ok = true;
        for (j, &c) in col_fwd.iter().enumerate() {
            for k in a_col[c]..a_col[c + 1] {
                x[row_inv[a_row[k]]] = a_val[k];
            }
            // σ: the sum of the column over the rows not yet eliminated,
            // σⱼ ← σⱼ − (u_kj/u_kk)·σₖ per elimination; `sign_ok` while every
            // term has one sign (NaN when not, so that it is not used).
            let mut s = column_sums[c];
            let mut sign_ok = s >= 0.0;
            for p in u_ptr[j]..u_ptr[j + 1] {
                let k = u_row[p];
                let ukj = x[k];
                x[k] = 0.0;
                u_val[p] = ukj;
                for q in l_ptr[k]..l_ptr[k + 1] {
                    x[l_row[q]] -= l_val[q] * ukj;
                }
                s -= ukj / u_diag[k] * sigma[k];
                sign_ok &= ukj <= 0.0 && !sigma[k].is_nan();
            }
            let mut diag = x[j];
            x[j] = 0.0;
            let (mut largest, mut off) = (0.0_f64, 0.0);
            for q in l_ptr[j]..l_ptr[j + 1] {
                let v = x[l_row[q]];
                largest = largest.max(v.abs());
                off += v;
                sign_ok &= v <= 0.0;
            }
            if sign_ok {
                diag = s - off; // GTH: no cancellation
                sigma[j] = s;
            } else {
                sigma[j] = f64::NAN;
            }
            for q in l_ptr[j]..l_ptr[j + 1] {
                let i = l_row[q];
                l_val[q] = x[i] / diag;
                x[i] = 0.0;
            }
            u_diag[j] = diag;
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

    /// The values of the solve's lists after a refactorisation (same
    /// pattern and pivots, so the same order as [`Self::make_ops`] built).
    fn update_ops(&mut self) {
        for (op, &v) in self.l_ops.iter_mut().zip(&self.l_val) {
            op.value = v;
        }
        let (u_ptr, u_row, u_val) = (&self.u_ptr[..], &self.u_row[..], &self.u_val[..]);
        let (u_diag, d_inv) = (&self.u_diag[..], &mut self.d_inv[..]);
        let mut ops = self.w_ops.iter_mut();
        for j in (0..u_diag.len()).rev() {
            for p in u_ptr[j]..u_ptr[j + 1] {
                let op = ops.next().expect("same pattern as make_ops");
                op.value = u_val[p] / u_diag[u_row[p]];
            }
        }
        for (&row, d) in self.row_fwd.iter().zip(u_diag) {
            d_inv[row] = 1.0 / d;
        }
    }

    /// x ← A⁻¹ x (or A⁻ᵀ x). With W = D⁻¹U (D the pivots),
    /// A = Pᵀ L D W Qᵀ; the updates act on x where the row pivoted at each
    /// position lives, so only the column order is left to apply, and not
    /// even that when the pivots kept the diagonal (`same_order`).
    pub(super) fn solve(&self, x: &mut [f64], transpose: bool) {
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

    /// Plain column sums of a test matrix (its entries are of moderate
    /// size, so summing them loses nothing that matters here).
    fn column_sums(pattern: &[(usize, usize)], a: &SparseColMat<usize, f64>) -> Vec<f64> {
        let n = a.ncols();
        let mut out = vec![0.0; n];
        for (&(_, j), v) in pattern.iter().zip(a.val()) {
            out[j] += v;
        }
        out
    }

    fn matrix(pattern: &[(usize, usize)], values: Vec<f64>) -> SparseColMat<usize, f64> {
        let n = pattern.iter().map(|p| p.0).max().unwrap() + 1;
        let triplets: Vec<faer::sparse::Triplet<usize, usize, f64>> = pattern
            .iter()
            .zip(values)
            .map(|(&(i, j), v)| faer::sparse::Triplet::new(i, j, v))
            .collect();
        SparseColMat::try_new_from_triplets(n, n, &triplets).unwrap()
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
        f.factorise(&column_sums(&p, &f.a)).unwrap();
        check_solves(&f, &p, &first);
        // faer's pivots, then the values again on them (GTH pivots).
        assert_eq!((f.pivoted, f.refactored), (1, 1));

        // A new step size: same pattern, the pivots stay (column dominance).
        let second = values(&p, 3e4, true);
        f.a = matrix(&p, second.clone());
        f.factorise(&column_sums(&p, &f.a)).unwrap();
        check_solves(&f, &p, &second);
        assert_eq!((f.pivoted, f.refactored), (1, 2));

        // Small diagonals: the old pivots fail the threshold test.
        let third = values(&p, 2.0, false);
        f.a = matrix(&p, third.clone());
        f.factorise(&column_sums(&p, &f.a)).unwrap();
        check_solves(&f, &p, &third);
        assert_eq!((f.pivoted, f.refactored), (2, 3));
    }

    #[test]
    fn pivots_stay_exact_when_c_times_k_passes_one_over_epsilon() {
        // A ⇌ B with k = 1e13 and 1.66e13 s⁻¹ at c = 1e5 s: M = I − cJ =
        // [[1 + a, −b], [−a, 1 + b]], a = c·kf = 1e18, b = c·kr. Closed form:
        // det M = 1 + a + b, M⁻¹·(1, 0) = (1 + b, a)/det. Elimination by
        // subtraction leaves the second pivot 1 + b/(1 + a) as rounding of
        // numbers near 1.66e18 (0 or a multiple of 256); the GTH pivot
        // from the column sums (exactly 1) keeps it.
        let (a, b) = (1e18, 1.66e18);
        let p = vec![(0, 0), (1, 0), (0, 1), (1, 1)];
        let values = vec![1.0 + a, -a, -b, 1.0 + b];
        let mut f = SparseFactors::new(matrix(&p, values)).unwrap();
        f.factorise(&[1.0, 1.0]).unwrap();
        let mut x = vec![1.0, 0.0];
        f.solve(&mut x, false);
        let det = 1.0 + a + b;
        let exact = [(1.0 + b) / det, a / det];
        for (got, want) in x.iter().zip(exact) {
            assert!((got / want - 1.0).abs() < 1e-14, "{x:?} vs {exact:?}");
        }
    }
}
