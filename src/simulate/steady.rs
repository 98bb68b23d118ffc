//! The exact steady state near a simulated state: the linear system
//! f(x) = 0 with each connected part's total fixed at its simulated value,
//! solved by LU. The integrator approaches the steady state; this step removes
//! its last tolerance-sized residue so that small net fluxes beside large
//! gross fluxes (a turnover beside a fast pre-equilibrium) are resolved.

use super::network::Network;
use nalgebra::{DMatrix, DVector};

/// The steady state with the same total in every connected part as `x`
/// (counters keep their values); `None` if the system is singular.
pub fn polish(net: &Network, x: &[f64]) -> Option<Vec<f64>> {
    let n = net.len();
    let mut a = DMatrix::<f64>::zeros(n, n);
    for r in &net.reactions {
        // d x_from/dt −= kf x_from − kr x_to; d x_to/dt += the same.
        a[(r.from, r.from)] -= r.kf;
        a[(r.from, r.to)] += r.kr;
        a[(r.to, r.from)] += r.kf;
        a[(r.to, r.to)] -= r.kr;
    }
    let mut b = DVector::<f64>::zeros(n);
    let part = net.components();
    for i in 0..n {
        if net.species[i].counter {
            // Keep counters as they are: x_i = value.
            a.row_mut(i).fill(0.0);
            a[(i, i)] = 1.0;
            b[i] = x[i];
        } else if part[i] == i {
            // First species of its part: the part's total instead of its balance.
            a.row_mut(i).fill(0.0);
            for j in (0..n).filter(|&j| part[j] == i && !net.species[j].counter) {
                a[(i, j)] = 1.0;
                b[i] += x[j];
            }
        }
    }
    // Counters' columns only feed counters' rows, which are fixed above.
    for i in (0..n).filter(|&i| net.species[i].counter) {
        for j in (0..n).filter(|&j| j != i) {
            a[(j, i)] = 0.0;
        }
    }
    let solution = a.lu().solve(&b)?;
    solution
        .iter()
        .all(|v| v.is_finite())
        .then(|| solution.iter().copied().collect())
}
