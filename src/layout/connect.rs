//! Connectors between consecutive stationary points of a path: dashed
//! straight lines, or smooth curves.
//!
//! A smooth connector is one cubic Bézier from bar end to bar end whose
//! control points lie at the height of their own end, a third of the way
//! across. Its height is then a weighted mean of the two end heights with
//! weights that move monotonically from one end to the other, so the curve
//! leaves and meets each bar horizontally and never overshoots the two
//! energies it joins.

/// How connectors are drawn.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Connector {
    /// Straight lines from bar end to bar end (dashed per path).
    #[default]
    Straight,
    /// Smooth curves with a horizontal tangent at every bar end.
    Smooth,
}

/// Fraction of the horizontal distance at which the control points sit.
const HANDLE: f64 = 0.4;

/// The Bézier control points of a smooth connector from `a` to `b`.
pub fn smooth(a: (f64, f64), b: (f64, f64)) -> [(f64, f64); 3] {
    let dx = b.0 - a.0;
    [(a.0 + HANDLE * dx, a.1), (b.0 - HANDLE * dx, b.1), b]
}

/// The point at parameter `t` of the cubic from `a` with `c`.
pub fn bezier_at(a: (f64, f64), c: &[(f64, f64); 3], t: f64) -> (f64, f64) {
    let u = 1.0 - t;
    let w = [u * u * u, 3.0 * u * u * t, 3.0 * u * t * t, t * t * t];
    (
        w[0] * a.0 + w[1] * c[0].0 + w[2] * c[1].0 + w[3] * c[2].0,
        w[0] * a.1 + w[1] * c[0].1 + w[2] * c[1].1 + w[3] * c[2].1,
    )
}

/// How many straight pieces stand for a connector in collision checks: 24
/// keep the chords within about 0.05 mm of a steep curve (12 let a text's
/// ink touch it).
pub const CHORDS: usize = 24;

/// The curve as `n` straight pieces (for collision checks).
pub fn flatten(a: (f64, f64), c: &[(f64, f64); 3], n: usize) -> Vec<((f64, f64), (f64, f64))> {
    let n = n.max(1);
    (0..n)
        .map(|k| {
            (
                bezier_at(a, c, k as f64 / n as f64),
                bezier_at(a, c, (k + 1) as f64 / n as f64),
            )
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ends_are_horizontal_and_there_is_no_overshoot() {
        // Closed form: B'(0) = 3(P1 − P0), B'(1) = 3(P3 − P2); both have zero
        // height change when P1, P2 share their end's height.
        for (a, b) in [
            ((0.0, 10.0), (12.0, 2.0)),
            ((5.0, 1.0), (6.0, 40.0)),
            ((3.0, 7.0), (1.0, 7.5)),
        ] {
            let c = smooth(a, b);
            assert_eq!(c[0].1, a.1);
            assert_eq!(c[1].1, b.1);
            let (lo, hi) = (a.1.min(b.1), a.1.max(b.1));
            let mut last = a.1;
            for k in 0..=200 {
                let (_, y) = bezier_at(a, &c, k as f64 / 200.0);
                assert!(y >= lo - 1e-12 && y <= hi + 1e-12);
                // Monotone from one end to the other.
                assert!((y - last) * (b.1 - a.1) >= -1e-12);
                last = y;
            }
        }
    }
}
