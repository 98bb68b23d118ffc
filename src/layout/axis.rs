//! Nice tick values for the energy axis: 1-2-5 steps, about six ticks that
//! cover the data, so a reader can interpolate any bar by eye.

/// Tick positions on the energy axis.
#[derive(Debug, Clone, PartialEq)]
pub struct Ticks {
    /// Tick values, ascending; the first and last bound the axis.
    pub values: Vec<f64>,
    /// Distance between ticks.
    pub step: f64,
    /// Decimals that show the step exactly (0 for steps ≥ 1).
    pub decimals: usize,
}

/// Ticks covering `[lo, hi]`. Non-finite input or an empty range still gives
/// a usable axis (a flat profile is drawn around its single energy).
pub fn nice_ticks(lo: f64, hi: f64) -> Ticks {
    let (mut lo, mut hi) = if lo.is_finite() && hi.is_finite() {
        (lo.min(hi), lo.max(hi))
    } else {
        (0.0, 0.0)
    };
    let scale = lo.abs().max(hi.abs());
    if hi - lo <= scale * 1e-9 || hi - lo < 1e-12 {
        let pad = if scale > 0.0 { scale * 0.1 } else { 1.0 };
        lo -= pad;
        hi += pad;
    }
    let span = hi - lo;
    let base = span.log10().floor() as i32;
    let mut best: Option<(f64, Ticks)> = None;
    for exp in base - 2..=base + 1 {
        for m in [1.0, 2.0, 5.0] {
            let step = m * 10f64.powi(exp);
            let first = (lo / step).floor();
            let last = (hi / step).ceil();
            let n = (last - first).round() as i64 + 1;
            if !(2..=50).contains(&n) {
                continue;
            }
            let waste = (last - first) * step / span;
            let count_penalty = if (4..=9).contains(&n) {
                0.1 * (n as f64 - 6.0).abs()
            } else {
                10.0 + (n as f64 - 6.0).abs()
            };
            let cost = waste + count_penalty;
            if best.as_ref().is_none_or(|(c, _)| cost < *c - 1e-12) {
                let values = (0..n).map(|k| (first + k as f64) * step).collect();
                best = Some((
                    cost,
                    Ticks {
                        values,
                        step,
                        decimals: (-exp).max(0) as usize,
                    },
                ));
            }
        }
    }
    best.map(|(_, t)| t).unwrap_or(Ticks {
        values: vec![lo, hi],
        step: span,
        decimals: 1,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn close(a: &[f64], b: &[f64]) -> bool {
        a.len() == b.len() && a.iter().zip(b).all(|(x, y)| (x - y).abs() < 1e-9)
    }

    #[test]
    fn demo_range_gets_steps_of_ten() {
        let t = nice_ticks(-15.8, 27.3);
        assert!(
            close(&t.values, &[-20.0, -10.0, 0.0, 10.0, 20.0, 30.0]),
            "{t:?}"
        );
        assert_eq!(t.decimals, 0);
    }

    #[test]
    fn ticks_cover_data_with_sensible_counts() {
        for (lo, hi) in [
            (-61.0, 72.5),
            (-8.2, 19.4),
            (0.0, 1.0),
            (9.8, 10.3),
            (-0.004, 0.003),
            (-250.0, 1200.0),
            (3.0, 3.0001),
        ] {
            let t = nice_ticks(lo, hi);
            let n = t.values.len();
            assert!((4..=9).contains(&n), "{lo}..{hi}: {t:?}");
            assert!(
                t.values[0] <= lo + 1e-9 && t.values[n - 1] >= hi - 1e-9,
                "{t:?}"
            );
            let m = t.step / 10f64.powf(t.step.log10().floor());
            assert!(
                [1.0, 2.0, 5.0].iter().any(|x| (m - x).abs() < 1e-6),
                "{t:?}"
            );
        }
    }

    #[test]
    fn decimals_follow_the_step() {
        assert_eq!(nice_ticks(9.8, 10.3).decimals, 1);
        assert_eq!(nice_ticks(-0.004, 0.003).decimals, 3);
    }

    #[test]
    fn degenerate_ranges_still_give_an_axis() {
        for (lo, hi) in [
            (5.0, 5.0),
            (0.0, 0.0),
            (f64::NAN, 1.0),
            (-3.0, f64::INFINITY),
        ] {
            let t = nice_ticks(lo, hi);
            assert!(t.values.len() >= 2, "{t:?}");
            assert!(t.values.iter().all(|v| v.is_finite()));
        }
        let t = nice_ticks(5.0, 5.0);
        assert!(t.values[0] < 5.0 && *t.values.last().unwrap() > 5.0);
    }
}
