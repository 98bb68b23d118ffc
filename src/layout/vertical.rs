//! The energy scale: nice ticks over the data and the mapping from energy to
//! page height, optionally with a break in the axis.
//!
//! Break rule: when the largest gap between neighbouring energies is at least
//! 40 % of the whole range, lies below every other point but at most a
//! third of them (e.g. a very exergonic product), and would save at least
//! two tick steps, the empty stretch is cut out. Both parts keep the same mm
//! per energy unit, so drawn barriers stay comparable; a mark on the axis
//! shows the cut.

use super::axis::{self, Ticks};

/// Page gap left at an axis break, mm.
pub const BREAK_GAP_MM: f64 = 3.0;

/// One continuous stretch of the axis.
#[derive(Debug, Clone, PartialEq)]
pub struct Band {
    /// Lowest energy shown.
    pub t0: f64,
    /// Highest energy shown.
    pub t1: f64,
    /// Tick values in this band.
    pub ticks: Vec<f64>,
}

/// Energy → page height.
#[derive(Debug, Clone, PartialEq)]
pub struct Scale {
    /// Bands from the top of the page down (one, or two at a break).
    pub bands: Vec<Band>,
    /// Decimals of the tick labels.
    pub decimals: usize,
    /// Page y of the top of the axis.
    pub top: f64,
    /// Page y of the bottom of the axis.
    pub bottom: f64,
    mm_per_unit: f64,
}

impl Scale {
    /// The scale for `values` between page heights `top` and `bottom`.
    pub fn new(values: &[f64], allow_break: bool, top: f64, bottom: f64) -> Scale {
        let lo = values.iter().copied().fold(f64::INFINITY, f64::min);
        let hi = values.iter().copied().fold(f64::NEG_INFINITY, f64::max);
        let whole = if values.is_empty() {
            axis::nice_ticks(0.0, 0.0)
        } else {
            axis::nice_ticks(lo, hi)
        };
        let split = if allow_break { break_at(values) } else { None };
        let mut decimals = whole.decimals;
        let bands = match split {
            Some((lower_hi, upper_lo)) => {
                let upper = axis::nice_ticks(upper_lo, hi);
                decimals = upper.decimals;
                let step = upper.step;
                let l0 = (lo / step).floor() * step;
                let l1 = ((lower_hi / step).ceil() * step).max(l0 + step);
                if upper.values[0] - l1 >= 2.0 * step - 1e-9 {
                    let n = ((l1 - l0) / step).round() as usize;
                    let lower = Band {
                        t0: l0,
                        t1: l1,
                        ticks: (0..=n).map(|k| l0 + k as f64 * step).collect(),
                    };
                    vec![band(&upper), lower]
                } else {
                    decimals = whole.decimals;
                    vec![band(&whole)]
                }
            }
            None => vec![band(&whole)],
        };
        let span: f64 = bands.iter().map(|b| b.t1 - b.t0).sum();
        let gaps = (bands.len() - 1) as f64 * BREAK_GAP_MM;
        let mm_per_unit = ((bottom - top - gaps).max(1.0)) / span;
        Scale {
            bands,
            decimals,
            top,
            bottom,
            mm_per_unit,
        }
    }

    /// Page y of energy `v` (values inside the cut go to its nearer edge).
    pub fn y(&self, v: f64) -> f64 {
        let mut y0 = self.top;
        for (i, b) in self.bands.iter().enumerate() {
            match self.bands.get(i + 1) {
                Some(next) if v < b.t0 => {
                    if v > next.t1 {
                        return y0 + (b.t1 - b.t0) * self.mm_per_unit;
                    }
                }
                _ => return y0 + (b.t1 - v) * self.mm_per_unit,
            }
            y0 += (b.t1 - b.t0) * self.mm_per_unit + BREAK_GAP_MM;
        }
        self.bottom
    }

    /// Page y ranges of the bands, top first: (top, bottom).
    pub fn band_spans(&self) -> Vec<(f64, f64)> {
        self.bands
            .iter()
            .map(|b| (self.y(b.t1), self.y(b.t0)))
            .collect()
    }

    /// True when `v` lies on a drawn part of the axis.
    pub fn shows(&self, v: f64) -> bool {
        self.bands
            .iter()
            .any(|b| v >= b.t0 - 1e-9 && v <= b.t1 + 1e-9)
    }

    /// Every tick value, top band first.
    pub fn ticks(&self) -> impl Iterator<Item = f64> + '_ {
        self.bands.iter().flat_map(|b| b.ticks.iter().copied())
    }

    /// Page y of each break mark.
    pub fn breaks(&self) -> Vec<f64> {
        let spans = self.band_spans();
        spans.windows(2).map(|w| (w[0].1 + w[1].0) / 2.0).collect()
    }
}

fn band(t: &Ticks) -> Band {
    Band {
        t0: t.values[0],
        t1: *t.values.last().unwrap_or(&t.values[0]),
        ticks: t.values.clone(),
    }
}

/// Where to cut the axis, as (highest energy below the cut, lowest above),
/// following the rule in the module notes.
pub fn break_at(values: &[f64]) -> Option<(f64, f64)> {
    let mut v: Vec<f64> = values.iter().copied().filter(|x| x.is_finite()).collect();
    v.sort_by(f64::total_cmp);
    let n = v.len();
    if n < 3 {
        return None;
    }
    let range = v[n - 1] - v[0];
    if range <= 0.0 {
        return None;
    }
    let (i, gap) = v
        .windows(2)
        .enumerate()
        .map(|(i, w)| (i, w[1] - w[0]))
        .fold((0, f64::NEG_INFINITY), |a, b| if b.1 > a.1 { b } else { a });
    let below = i + 1;
    (gap >= 0.4 * range && below <= (n / 3).max(1)).then(|| (v[i], v[i + 1]))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn far_low_product_breaks_the_axis() {
        // Invented: five states between 0 and 30, a product at −95.
        let values = [0.0, 12.0, 30.0, 5.0, 22.0, -95.0];
        assert_eq!(break_at(&values), Some((-95.0, 0.0)));
        let s = Scale::new(&values, true, 10.0, 60.0);
        assert_eq!(s.bands.len(), 2);
        // Same mm per unit on both sides of the cut.
        let upper = s.y(0.0) - s.y(1.0);
        let lower = s.y(s.bands[1].t0) - s.y(s.bands[1].t0 + 1.0);
        assert!((upper - lower).abs() < 1e-9);
        // Monotone: lower energy, lower on the page.
        assert!(s.y(-95.0) > s.y(0.0) && s.y(0.0) > s.y(30.0));
        assert!((s.y(s.bands[0].t1) - 10.0).abs() < 1e-9);
        assert!((s.y(s.bands[1].t0) - 60.0).abs() < 1e-9);
        assert_eq!(s.breaks().len(), 1);
    }

    #[test]
    fn ordinary_profiles_keep_one_band() {
        for values in [
            vec![0.0, 14.2, -15.8, -4.1, 27.3, 25.1, 17.5, 19.6],
            vec![0.0, 1.0],
            vec![],
            // A big gap, but half the points lie below it: not an outlier.
            vec![-50.0, -48.0, 0.0, 2.0],
        ] {
            let s = Scale::new(&values, true, 10.0, 60.0);
            assert_eq!(s.bands.len(), 1, "{values:?}");
        }
        let s = Scale::new(&[0.0, 10.0, 20.0, -95.0], false, 10.0, 60.0);
        assert_eq!(s.bands.len(), 1);
        assert!((s.y(s.bands[0].t0) - 60.0).abs() < 1e-9);
    }
}
