//! The charts of results (pure data for [`crate::layout::chart`]): what
//! `eyrie sweep --plot` and `eyrie simulate --plot` draw, built from the
//! numbers those commands computed, as [`crate::figure`] does for diagrams.

use crate::kinetics::sweep::SweepRow;
use crate::layout::{AxisScale, ChartSpec, Marker, Series};
use crate::model::{Model, PointId};
use crate::simulate::Simulation;
use crate::simulate::run::Sample;
use crate::units::Temperature;

/// Product fractions (%) against temperature in °C, the unit chemists set a
/// bath to, one line per product (its label), a marker at each isoselective
/// temperature.
pub fn selectivity(
    model: &Model,
    rows: &[SweepRow],
    products: &[PointId],
    isoselective: &[Temperature],
) -> ChartSpec {
    let series = products
        .iter()
        .map(|&p| Series {
            name: model.point(p).label.clone(),
            points: rows
                .iter()
                .map(|r| {
                    let f = r
                        .products
                        .iter()
                        .find(|(q, _)| *q == p)
                        .map_or(0.0, |x| x.1);
                    (r.temperature.celsius(), 100.0 * f)
                })
                .collect(),
        })
        .collect();
    let markers = isoselective
        .iter()
        .map(|t| Marker {
            x: t.celsius(),
            label: format!("isoselective: {:.1} °C", t.celsius()),
        })
        .collect();
    ChartSpec {
        title: model.title().map(str::to_string),
        x_title: "temperature (°C)".into(),
        y_title: "share of product (%)".into(),
        x_scale: AxisScale::Linear,
        y_scale: AxisScale::Linear,
        y_include: vec![0.0, 100.0],
        series,
        markers,
    }
}

/// States drawn in a concentration chart reach at least this fraction of the
/// total initial concentration at some time; the rest would lie on the axis.
pub const SHOWN_FRACTION: f64 = 1e-3;

/// Time units for a linear time axis, shortest first.
const TIME_UNITS: [(&str, f64); 7] = [
    ("ns", 1e-9),
    ("µs", 1e-6),
    ("ms", 1e-3),
    ("s", 1.0),
    ("min", 60.0),
    ("h", 3600.0),
    ("d", 86400.0),
];

/// The largest unit in which `t_end` is still at least 3, so the ticks read
/// as 0, 20, 40 min rather than 0, 0.2, 0.4 h or 0, 1200, 2400 s.
fn time_unit(t_end: f64) -> (&'static str, f64) {
    TIME_UNITS
        .iter()
        .rev()
        .find(|(_, f)| t_end / f >= 3.0)
        .copied()
        .unwrap_or(TIME_UNITS[3])
}

/// A co-reactant starting above this multiple of the states' material is
/// left out of the concentration chart.
const EXCESS: f64 = 10.0;

/// Concentration (mol/L) against time of every state that ever exceeds
/// [`SHOWN_FRACTION`] of the total, from the simulation's samples. On a log
/// time axis (seconds) the course starts one decade before anything has
/// changed by that fraction: the integrator's first steps (1e-12 s and less)
/// would otherwise spread a flat line over most of the width.
pub fn concentrations(model: &Model, sim: &Simulation, log_time: bool) -> ChartSpec {
    let n = sim.network.species.len();
    // The states' material; a co-reactant in excess would swamp it.
    let total: f64 = sim.samples.first().map_or(0.0, |s| s.x[..n].iter().sum());
    let t_start = if log_time {
        log_start(&sim.samples, SHOWN_FRACTION * total)
    } else {
        0.0
    };
    let (unit, factor) = if log_time {
        ("s", 1.0)
    } else {
        time_unit(sim.time_s())
    };
    let course = |i: usize| -> Vec<(f64, f64)> {
        sim.samples
            .iter()
            .filter(|p| !log_time || (p.t > 0.0 && p.t >= t_start))
            .map(|p| (p.t / factor, p.x[i]))
            .collect()
    };
    let states = sim
        .network
        .species
        .iter()
        .enumerate()
        .filter(|(i, _)| {
            let peak = sim.samples.iter().map(|s| s.x[*i]).fold(0.0, f64::max);
            peak > SHOWN_FRACTION * total
        })
        .map(|(i, s)| {
            let label = &model.point(s.point).label;
            Series {
                name: if s.counter {
                    format!("{label} (released)")
                } else {
                    label.clone()
                },
                points: course(i),
            }
        });
    // A consumed co-reactant is drawn unless it starts in large excess
    // (more than EXCESS times the states' material), where it stays flat
    // and would only compress the other lines.
    let coreactants = sim
        .network
        .coreactants
        .iter()
        .enumerate()
        .filter(|(w, _)| {
            let start = sim
                .samples
                .first()
                .map_or(0.0, |s| s.x[sim.network.free(*w)]);
            start <= EXCESS * total
        })
        .map(|(w, c)| Series {
            name: c.name.clone(),
            points: course(sim.network.free(w)),
        });
    let series = states.chain(coreactants).collect();
    ChartSpec {
        title: model.title().map(str::to_string),
        x_title: format!("time ({unit})"),
        y_title: "concentration (mol L^-1)".into(),
        x_scale: if log_time {
            AxisScale::Log10
        } else {
            AxisScale::Linear
        },
        y_scale: AxisScale::Linear,
        y_include: vec![0.0],
        series,
        markers: Vec::new(),
    }
}

/// One decade before the first sample at which some concentration has moved
/// by more than `threshold` from where it started (0 when nothing moves).
fn log_start(samples: &[Sample], threshold: f64) -> f64 {
    let Some(first) = samples.first() else {
        return 0.0;
    };
    samples
        .iter()
        .find(|s| {
            s.t > 0.0
                && s.x
                    .iter()
                    .zip(&first.x)
                    .any(|(x, x0)| (x - x0).abs() > threshold)
        })
        .map_or(0.0, |s| s.t / 10.0)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn log_time_starts_a_decade_before_the_first_change() {
        let at = |t: f64, a: f64| Sample {
            t,
            x: vec![a, 1.0 - a],
        };
        // Nothing moves by more than 1e-3 before t = 2 s.
        let samples = [
            at(0.0, 1.0),
            at(1e-12, 1.0),
            at(1e-6, 0.9999),
            at(2.0, 0.99),
            at(50.0, 0.5),
        ];
        assert_eq!(log_start(&samples, 1e-3), 0.2);
        assert_eq!(log_start(&samples[..2], 1e-3), 0.0);
    }

    #[test]
    fn time_units_keep_numbers_readable() {
        // From the rule in time_unit: largest unit with at least 3 of it.
        assert_eq!(time_unit(90.0).0, "s");
        assert_eq!(time_unit(300.0).0, "min");
        assert_eq!(time_unit(7200.0).0, "min");
        assert_eq!(time_unit(3.0 * 3600.0).0, "h");
        assert_eq!(time_unit(2e-5).0, "µs");
        assert_eq!(time_unit(0.0).0, "s");
    }
}
