//! `eyrie sweep`: the product distribution across a temperature range, and the
//! isoselective temperature where the two main products form equally.

use super::error::CliError;
use super::files;
use super::plot::PlotArgs;
use eyrie::kinetics::sweep::{isoselective, sweep, temperatures};
use eyrie::units::Temperature;
use serde::Serialize;
use std::collections::BTreeMap;
use std::path::Path;

#[derive(Serialize)]
struct Row {
    temperature_k: f64,
    regime: &'static str,
    products: BTreeMap<String, f64>,
}

#[derive(Serialize)]
struct Iso {
    products: [String; 2],
    temperature_k: f64,
}

#[derive(Serialize)]
struct SweepReport {
    rows: Vec<Row>,
    isoselective: Vec<Iso>,
}

/// Runs the sweep from `from` to `to` in `steps` temperatures and prints it.
pub fn run(
    path: &Path,
    from: Temperature,
    to: Temperature,
    steps: usize,
    json: bool,
    plot: &PlotArgs,
) -> Result<(), CliError> {
    let plot = plot.resolve()?;
    if steps < 2 {
        return Err(CliError::Usage(
            "--steps must be at least 2 (the two ends of the range)".into(),
        ));
    }
    let (parsed, warnings) = files::load(path)?;
    eprint!("{warnings}");
    let model = parsed.model;
    let temps = temperatures(from, to, steps);
    let rows: Vec<_> = sweep(&model, &temps).into_iter().flatten().collect();
    let Some(first) = rows.first() else {
        return Err(CliError::Usage(format!(
            "{}: fewer than two products can form, so there is no selectivity to follow",
            path.display()
        )));
    };
    let id = |p: usize| model.point(p).id.clone();
    // The two main products at the first temperature name the ratio column.
    let mut ranked = first.products.clone();
    ranked.sort_by(|a, b| b.1.total_cmp(&a.1).then(a.0.cmp(&b.0)));
    let (a, b) = (ranked[0].0, ranked[1].0);
    let (lo, hi) = if from.k() <= to.k() {
        (from, to)
    } else {
        (to, from)
    };
    let iso: Vec<Iso> = isoselective(&model, a, b, lo, hi, steps.max(50))
        .into_iter()
        .map(|t| Iso {
            products: [id(a), id(b)],
            temperature_k: t,
        })
        .collect();
    let report = SweepReport {
        rows: rows
            .iter()
            .map(|r| Row {
                temperature_k: r.temperature.k(),
                regime: r.regime.name(),
                products: r.products.iter().map(|&(p, f)| (id(p), f)).collect(),
            })
            .collect(),
        isoselective: iso,
    };
    if let Some(target) = &plot {
        let products: Vec<usize> = first.products.iter().map(|(p, _)| *p).collect();
        let iso: Vec<Temperature> = report
            .isoselective
            .iter()
            .filter_map(|i| Temperature::kelvin(i.temperature_k))
            .collect();
        target.write(&eyrie::charts::selectivity(&model, &rows, &products, &iso))?;
    }
    if json {
        println!(
            "{}",
            serde_json::to_string_pretty(&report).expect("plain data serialises")
        );
        return Ok(());
    }
    let products: Vec<usize> = first.products.iter().map(|(p, _)| *p).collect();
    let mut out = format!("{:>8}  {:>7}  {:<15}", "T/K", "T/°C", "regime");
    for &p in &products {
        out += &format!("  {:>9}", id(p));
    }
    out += &format!("  {:>12}\n", format!("{}:{}", id(a), id(b)));
    for r in &rows {
        let t = r.temperature;
        out += &format!(
            "{:>8.2}  {:>7.1}  {:<15}",
            t.k(),
            t.celsius(),
            r.regime.name()
        );
        let f = |p: usize| {
            r.products
                .iter()
                .find(|(q, _)| *q == p)
                .map_or(0.0, |x| x.1)
        };
        for &p in &products {
            out += &format!("  {:>7.1} %", 100.0 * f(p));
        }
        out += &format!("  {:>12}\n", eyrie::format::scientific(f(a) / f(b)));
    }
    if report.isoselective.is_empty() {
        out += &format!(
            "\nno isoselective temperature for {}:{} between {} and {}\n",
            id(a),
            id(b),
            lo,
            hi
        );
    }
    for i in &report.isoselective {
        let t = Temperature::kelvin(i.temperature_k).expect("inside the range");
        out += &format!(
            "\nisoselective temperature ({}:{} = 1:1): {t}; the major product changes there\n",
            i.products[0], i.products[1]
        );
    }
    print!("{out}");
    Ok(())
}
