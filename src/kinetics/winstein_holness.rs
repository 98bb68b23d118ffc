//! The exact first-order solution of two interconverting reactants that each
//! give their own product: A ⇌ B (k₁, k₋₁), A → C (k_A), B → D (k_B)
//! (Seeman, Chem. Rev. 1983, 83, 83; Winstein & Holness, J. Am. Chem. Soc.
//! 1955, 77, 5562). It decides Curtin–Hammett questions without a simulation
//! wherever the scheme applies, and is the closed form the simulator is tested
//! against.

/// Rate constants of the scheme, s⁻¹.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TwoPools {
    /// A → B.
    pub k1: f64,
    /// B → A.
    pub k_1: f64,
    /// A → C.
    pub ka: f64,
    /// B → D.
    pub kb: f64,
}

/// Concentrations (mol/L) of A, B, C and D at one time.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Composition {
    /// Reactant A.
    pub a: f64,
    /// Reactant B.
    pub b: f64,
    /// Product of A.
    pub c: f64,
    /// Product of B.
    pub d: f64,
}

impl TwoPools {
    /// The two eigenvalues (fast, slow) of the rate matrix, both negative.
    /// The slow one is det M / λ_fast: the textbook (tr M + √disc)/2 cancels
    /// and is only good to ~3e-9 when interconversion is fast.
    pub fn eigenvalues(&self) -> (f64, f64) {
        let m00 = -(self.k1 + self.ka);
        let m11 = -(self.k_1 + self.kb);
        let disc = ((m00 - m11).powi(2) + 4.0 * self.k1 * self.k_1).sqrt();
        let fast = (m00 + m11 - disc) / 2.0;
        let det = self.ka * self.k_1 + self.ka * self.kb + self.k1 * self.kb;
        (fast, det / fast)
    }

    /// Final [D]/[C] from initial amounts a0, b0, from ∫₀^∞ x dt = −M⁻¹x₀.
    pub fn final_ratio(&self, a0: f64, b0: f64) -> f64 {
        let (k1, k_1, ka, kb) = (self.k1, self.k_1, self.ka, self.kb);
        kb * (k1 * a0 + (k1 + ka) * b0) / (ka * ((k_1 + kb) * a0 + k_1 * b0))
    }

    /// Winstein–Holness observed rate constant x_A·k_A + x_B·k_B with the
    /// equilibrium fractions x of A and B.
    pub fn k_observed(&self) -> f64 {
        let xa = self.k_1 / (self.k1 + self.k_1);
        xa * self.ka + (1.0 - xa) * self.kb
    }

    /// Composition at time `t` (s) from [A]₀ = a0, [B]₀ = b0, no products,
    /// by Sylvester's formula for exp(Mt) and its integral.
    pub fn at(&self, t: f64, a0: f64, b0: f64) -> Composition {
        let (l1, l2) = self.eigenvalues();
        let m = [
            [-(self.k1 + self.ka), self.k_1],
            [self.k1, -(self.k_1 + self.kb)],
        ];
        // (M − λI)x₀ for both eigenvalues.
        let apply = |l: f64| {
            [
                (m[0][0] - l) * a0 + m[0][1] * b0,
                m[1][0] * a0 + (m[1][1] - l) * b0,
            ]
        };
        let (p2, p1) = (apply(l2), apply(l1));
        let d = l1 - l2;
        let e1 = (l1 * t).exp();
        let e2 = (l2 * t).exp();
        // ∫₀ᵗ e^{λs} ds = expm1(λt)/λ, accurate for small λt.
        let i1 = (l1 * t).exp_m1() / l1;
        let i2 = (l2 * t).exp_m1() / l2;
        let x = |k: usize| (e1 * p2[k] - e2 * p1[k]) / d;
        let integral = |k: usize| (i1 * p2[k] - i2 * p1[k]) / d;
        Composition {
            a: x(0),
            b: x(1),
            c: self.ka * integral(0),
            d: self.kb * integral(1),
        }
    }
}
