//! What the BDF stepper needs from a network: its right-hand side, its
//! analytic Jacobian J, and the Newton matrix I − cJ factorised and solved
//! with.
//!
//! J lives on the pattern read off the reactions
//! ([`Network::jacobian_pattern`], plus the diagonal) and the Newton matrix
//! goes to the sparse LU of [`super::sparse_lu`], at every size: its cost
//! grows with the number of reactions rather than with the cube of the
//! number of states, and its pivots come from exact column sums, which keeps
//! them accurate where c·k passes 1/ε. A dense J with nalgebra's LU is kept
//! as an independent check of the sparse one (tests, benchmarks); its
//! pivots lose that accuracy in long runs with fast equilibria.

use super::network::Network;
use super::sparse_lu::SparseFactors;
use faer::sparse::{SparseColMat, SymbolicSparseColMat};
use nalgebra::{DMatrix, DVectorViewMut, Dyn, LU};

/// The right-hand side of a network, with its first-order steps packed.
pub(super) struct Rhs<'a> {
    net: &'a Network,
    /// The first-order steps without a counter (nearly all), packed; `others`
    /// are the rest, by index.
    simple: Vec<Simple>,
    others: Vec<usize>,
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

impl<'a> Rhs<'a> {
    pub(super) fn new(net: &'a Network) -> Self {
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
        Rhs {
            net,
            simple,
            others,
        }
    }

    /// True when every step is first order: the Jacobian is then constant.
    pub(super) fn is_linear(&self) -> bool {
        self.net.coreactants.is_empty()
    }

    /// [`Network::rhs`], with the simple steps from their packed copy (the
    /// same arithmetic, summed in another order).
    pub(super) fn eval(&self, x: &[f64], y: &mut [f64]) {
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

/// The Jacobian and the factorised Newton matrix I − cJ.
pub(super) struct Newton<'a> {
    net: &'a Network,
    /// J's values: dense column-major n × n, or on the sparse pattern.
    jac: Vec<f64>,
    /// Where each of [`Network::jacobian_terms`]' terms goes in `jac`.
    plan: Vec<usize>,
    /// J's column sums ([`Network::jacobian_column_sums`]) and those of
    /// I − cJ, for the sparse LU's pivots.
    jac_sums: Vec<f64>,
    sums: Vec<f64>,
    matrix: Matrix,
    /// Factorisations (new pivots or the old ones).
    pub(super) factorisations: usize,
}

enum Matrix {
    Dense(Option<LU<f64, Dyn, Dyn>>),
    Sparse {
        factors: Box<SparseFactors>,
        /// Positions of the diagonal in the pattern.
        diagonal: Vec<usize>,
    },
}

impl<'a> Newton<'a> {
    /// Storage for the Jacobian of `net`, sparse or dense.
    pub(super) fn new(net: &'a Network, sparse: bool) -> Result<Self, String> {
        let n = net.dim();
        let mut plan = Vec::new();
        let zeros = vec![0.0; n];
        if !sparse {
            net.jacobian_terms(&zeros, |row, column, _| plan.push(row + column * n));
            return Ok(Newton {
                net,
                jac: vec![0.0; n * n],
                plan,
                jac_sums: vec![0.0; n],
                sums: vec![0.0; n],
                matrix: Matrix::Dense(None),
                factorisations: 0,
            });
        }
        let mut pattern = net.jacobian_pattern();
        pattern.extend((0..n).map(|i| (i, i)));
        pattern.sort_unstable_by_key(|&(row, column)| (column, row));
        pattern.dedup();
        let mut col_ptr = vec![0usize; n + 1];
        for &(_, column) in &pattern {
            col_ptr[column + 1] += 1;
        }
        for j in 0..n {
            col_ptr[j + 1] += col_ptr[j];
        }
        let row_idx: Vec<usize> = pattern.iter().map(|&(row, _)| row).collect();
        let position = |row: usize, column: usize| {
            let start = col_ptr[column];
            start
                + row_idx[start..col_ptr[column + 1]]
                    .binary_search(&row)
                    .expect("every term is in the pattern")
        };
        net.jacobian_terms(&zeros, |row, column, _| plan.push(position(row, column)));
        let diagonal: Vec<usize> = (0..n).map(|i| position(i, i)).collect();
        let nnz = row_idx.len();
        let symbolic = SymbolicSparseColMat::new_checked(n, n, col_ptr, None, row_idx);
        let factors = SparseFactors::new(SparseColMat::new(symbolic, vec![0.0; nnz]))?;
        Ok(Newton {
            net,
            jac: vec![0.0; nnz],
            plan,
            jac_sums: vec![0.0; n],
            sums: vec![0.0; n],
            matrix: Matrix::Sparse {
                factors: Box::new(factors),
                diagonal,
            },
            factorisations: 0,
        })
    }

    /// J at `x`.
    pub(super) fn jacobian(&mut self, x: &[f64]) {
        self.jac.fill(0.0);
        let (jac, plan) = (&mut self.jac, &self.plan);
        let mut p = 0;
        self.net.jacobian_terms(x, |_, _, value| {
            jac[plan[p]] += value;
            p += 1;
        });
        self.net.jacobian_column_sums(x, &mut self.jac_sums);
    }

    /// Factorises I − cJ with the last J.
    pub(super) fn factorise(&mut self, c: f64) -> Result<(), String> {
        self.factorisations += 1;
        let n = self.net.dim();
        match &mut self.matrix {
            Matrix::Dense(lu) => {
                let jac = &self.jac;
                let m = DMatrix::from_fn(n, n, |i, j| {
                    let identity = if i == j { 1.0 } else { 0.0 };
                    identity - c * jac[i + j * n]
                });
                let factors = m.lu();
                if !factors.is_invertible() {
                    return Err("the Newton matrix is singular".into());
                }
                *lu = Some(factors);
                Ok(())
            }
            Matrix::Sparse { factors, diagonal } => {
                let a = factors.a.val_mut();
                for (a, j) in a.iter_mut().zip(&self.jac) {
                    *a = -c * j;
                }
                for &d in diagonal.iter() {
                    a[d] += 1.0;
                }
                for (s, e) in self.sums.iter_mut().zip(&self.jac_sums) {
                    *s = 1.0 - c * e;
                }
                factors.factorise(&self.sums)
            }
        }
    }

    /// x ← (I − cJ)⁻¹ x with the last factorisation.
    pub(super) fn solve(&self, x: &mut [f64]) {
        match &self.matrix {
            Matrix::Dense(lu) => {
                let n = x.len();
                let lu = lu.as_ref().expect("factorised before solving");
                lu.solve_mut(&mut DVectorViewMut::from_slice(x, n));
            }
            Matrix::Sparse { factors, .. } => factors.solve(x, false),
        }
    }
}
