//! `--plot FILE` of `eyrie sweep` and `eyrie simulate`: an XY chart of the
//! command's results, written through the same encoders, page sizes and
//! atomic writer as `eyrie render`. The table or JSON is printed as usual;
//! the chart is an extra.

use super::error::CliError;
use super::files;
use super::render::{self, Format, Size};
use eyrie::layout::{AxisScale, ChartSpec, Series, Style};
use eyrie::model::Model;
use eyrie::simulate::Simulation;
use eyrie::simulate::run::Sample;
use std::path::PathBuf;

/// Chart output options, shared by the commands that draw one.
#[derive(Debug, Clone, clap::Args)]
pub(crate) struct PlotArgs {
    /// Also draw the results as a chart to FILE; its extension chooses the format:
    /// .svg, .png (at --dpi) or .pdf, as for `eyrie render`. The table or JSON is
    /// printed as usual.
    #[arg(long, value_name = "FILE")]
    pub plot: Option<PathBuf>,
    /// Page and type size of the chart, as for `eyrie render`: single (85 × 65 mm,
    /// 7 pt), double (175 × 90 mm, 8 pt), slide or poster.
    #[arg(
        long,
        value_enum,
        default_value = "single",
        value_name = "SIZE",
        requires = "plot"
    )]
    size: Size,
    /// Chart width in mm (default from --size).
    #[arg(long, value_name = "MM", value_parser = render::parse_mm, requires = "plot")]
    width: Option<f64>,
    /// Chart height in mm (default from --size).
    #[arg(long, value_name = "MM", value_parser = render::parse_mm, requires = "plot")]
    height: Option<f64>,
    /// Resolution of a PNG chart in dots per inch.
    #[arg(long, value_name = "N", default_value_t = 600,
          value_parser = clap::value_parser!(u32).range(50..=4800), requires = "plot")]
    dpi: u32,
}

/// A checked chart output: where, in which format, at which size.
#[derive(Debug, Clone)]
pub(crate) struct PlotTarget {
    output: PathBuf,
    format: Format,
    style: Style,
    dpi: u32,
}

impl PlotArgs {
    /// Checks the options before any work is done (a bad extension or size
    /// fails with exit code 2 and writes nothing); `None` without --plot.
    pub fn resolve(&self) -> Result<Option<PlotTarget>, CliError> {
        let Some(output) = &self.plot else {
            return Ok(None);
        };
        let format = Format::of(output)?;
        let mut style = Style::preset(self.size.preset()).expect("every --size names a preset");
        style.width_mm = self.width.unwrap_or(style.width_mm);
        style.height_mm = self.height.unwrap_or(style.height_mm);
        render::check_resolution(format, &style, self.dpi)?;
        Ok(Some(PlotTarget {
            output: output.clone(),
            format,
            style,
            dpi: self.dpi,
        }))
    }
}

impl PlotTarget {
    /// Lays out `spec` and replaces the output file atomically.
    pub fn write(&self, spec: &ChartSpec) -> Result<(), CliError> {
        let scene = eyrie::layout::layout_chart(spec, &self.style);
        files::write_atomic(
            &self.output,
            &render::encode(&scene, self.format, self.dpi)?,
        )?;
        eprintln!("wrote {}", self.output.display());
        Ok(())
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
