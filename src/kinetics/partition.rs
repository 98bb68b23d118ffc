//! Where a first-order network sends its material in the end: the
//! probability that a molecule starting in one state is finally trapped in
//! each absorbing state (a product), for any mix of fast and slow steps.
//!
//! States are eliminated one at a time and their rates redistributed to their
//! neighbours (the state-reduction idea of Grassmann, Taksar & Heyman, Oper.
//! Res. 1985, 33, 1107). Every operation adds or multiplies positive numbers,
//! so rate constants from 1e-10 to 1e13 s⁻¹ in one network lose no accuracy to
//! cancellation, unlike a linear solve of the rate matrix.

use std::collections::BTreeMap;

/// A first-order network: `n` states, rate constants between them (s⁻¹).
#[derive(Debug, Clone, Default)]
pub struct Network {
    /// Outgoing rate constants of each state: target → k.
    out: Vec<BTreeMap<usize, f64>>,
}

impl Network {
    /// A network of `n` states and no steps.
    pub fn new(n: usize) -> Network {
        Network {
            out: vec![BTreeMap::new(); n],
        }
    }

    /// Adds a first-order step `from → to` with rate constant `k` (parallel steps add).
    pub fn add(&mut self, from: usize, to: usize, k: f64) {
        if from != to && k > 0.0 {
            *self.out[from].entry(to).or_insert(0.0) += k;
        }
    }

    /// Final fractions of material in each absorbing state, starting from
    /// `start`. `absorbing[i]` marks the trap states (their outgoing steps are
    /// ignored: product formation is treated as irreversible). Returns one
    /// fraction per state (zero for non-absorbing states); all zero when no
    /// trap is reachable from `start`.
    pub fn absorption(&self, start: usize, absorbing: &[bool]) -> Vec<f64> {
        let n = self.out.len();
        let mut out: Vec<BTreeMap<usize, f64>> = (0..n)
            .map(|i| {
                if absorbing[i] {
                    BTreeMap::new()
                } else {
                    self.out[i].clone()
                }
            })
            .collect();
        // Incoming adjacency, kept in step with `out` during elimination.
        let mut inc: Vec<BTreeMap<usize, ()>> = vec![BTreeMap::new(); n];
        for (i, targets) in out.iter().enumerate() {
            for &j in targets.keys() {
                inc[j].insert(i, ());
            }
        }
        for k in 0..n {
            if k == start || absorbing[k] {
                continue;
            }
            let targets = std::mem::take(&mut out[k]);
            let total: f64 = targets.values().sum();
            let sources: Vec<usize> = std::mem::take(&mut inc[k]).into_keys().collect();
            for &j in targets.keys() {
                inc[j].remove(&k);
            }
            for i in sources {
                let Some(r_ik) = out[i].remove(&k) else {
                    continue;
                };
                if total == 0.0 {
                    continue; // k is a dead end that traps nothing
                }
                for (&j, &r_kj) in &targets {
                    if j == i {
                        continue; // a return to i does not change where i's material ends up
                    }
                    *out[i].entry(j).or_insert(0.0) += r_ik * r_kj / total;
                    inc[j].insert(i, ());
                }
            }
        }
        let mut fractions = vec![0.0; n];
        let to_traps: f64 = out[start]
            .iter()
            .filter(|(j, _)| absorbing[**j])
            .map(|(_, k)| k)
            .sum();
        if absorbing[start] {
            fractions[start] = 1.0;
        } else if to_traps > 0.0 {
            for (&j, &k) in &out[start] {
                if absorbing[j] {
                    fractions[j] = k / to_traps;
                }
            }
        }
        fractions
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Seeman's closed form for A ⇌ B, A → C, B → D from pure A:
    /// [D]/[C] = k_B·k₁ / (k_A·(k₋₁ + k_B)) (Seeman, Chem. Rev. 1983, 83, 83).
    #[test]
    fn two_interconverting_reactants_match_the_closed_form() {
        for (k1, k_1, ka, kb) in [
            (1e12, 3e11, 2.0, 7.0),
            (1.0, 0.5, 0.3, 0.9),
            (1e-8, 1e-7, 1e3, 1e2),
            (5e12, 1e-9, 1e-3, 4e4),
        ] {
            let mut net = Network::new(4); // A, B, C, D
            net.add(0, 1, k1);
            net.add(1, 0, k_1);
            net.add(0, 2, ka);
            net.add(1, 3, kb);
            let f = net.absorption(0, &[false, false, true, true]);
            let want = kb * k1 / (ka * (k_1 + kb));
            assert!(
                (f[3] / f[2] / want - 1.0).abs() < 1e-12,
                "{k1} {k_1} {ka} {kb}"
            );
            assert!((f[2] + f[3] - 1.0).abs() < 1e-14);
        }
    }

    #[test]
    fn a_chain_sends_everything_to_its_end() {
        // closed form: a linear chain with one trap has absorption probability 1.
        let mut net = Network::new(4);
        for i in 0..3 {
            net.add(i, i + 1, 1e3);
            net.add(i + 1, i, 1e9);
        }
        let f = net.absorption(0, &[false, false, false, true]);
        assert!((f[3] - 1.0).abs() < 1e-14);
    }

    #[test]
    fn no_reachable_trap_gives_nothing() {
        let mut net = Network::new(3);
        net.add(0, 1, 1.0);
        let f = net.absorption(0, &[false, false, true]);
        assert_eq!(f, vec![0.0, 0.0, 0.0]);
    }
}
