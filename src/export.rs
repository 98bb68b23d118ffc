//! Numbers for the manuscript: the computed quantities as named values, written
//! as a LaTeX macro file, a Markdown table or CSV, all through the one
//! formatting rule of [`crate::format`], so the text cites exactly what the
//! figure shows.

use crate::format;
use crate::report::AnalysisReport;

/// One exported number.
#[derive(Debug, Clone, PartialEq)]
pub struct Quantity {
    /// Stable key, e.g. `path.stepwise.barrier`.
    pub key: String,
    /// What it is, in words.
    pub description: String,
    /// The number as printed (plain text).
    pub text: String,
    /// The number as LaTeX (×10ⁿ typeset).
    pub latex: String,
    /// Unit, in plain text ("kcal/mol", "s⁻¹", "" for none).
    pub unit: String,
}

fn energy(key: String, description: String, v: f64, r: &AnalysisReport, d: usize) -> Quantity {
    let text = format::energy(v, d, false);
    Quantity {
        key,
        description,
        latex: text.replace('-', "\\textminus{}"),
        text,
        unit: r.unit.to_string(),
    }
}

fn rate(key: String, description: String, v: f64, unit: &str) -> Quantity {
    Quantity {
        key,
        description,
        text: format::scientific(v),
        latex: latex_scientific(v),
        unit: unit.to_string(),
    }
}

/// 2.16e-3 → `\ensuremath{2.16\times10^{-3}}`, which typesets in running
/// text and inside `$…$` alike; plain numbers stay plain.
fn latex_scientific(v: f64) -> String {
    let text = format::scientific(v);
    match text.split_once('e') {
        Some((mantissa, exp)) => {
            let exp = exp.trim_start_matches('+');
            format!("\\ensuremath{{{mantissa}\\times10^{{{exp}}}}}")
        }
        None => text.replace('-', "\\textminus{}"),
    }
}

/// A key part that is safe in a LaTeX control-sequence name, a CSV cell and a
/// Markdown code span: letters, digits, `-`, `_` kept; anything else becomes `-`.
fn part(name: &str) -> String {
    name.chars()
        .map(|c| {
            if c.is_alphanumeric() || c == '-' || c == '_' {
                c
            } else {
                '-'
            }
        })
        .collect()
}

/// Every quantity of an analysis report, in a fixed order.
pub fn quantities(r: &AnalysisReport, decimals: usize) -> Vec<Quantity> {
    let mut out = vec![
        Quantity {
            key: "temperature.K".into(),
            description: "temperature".into(),
            text: format!("{:.2}", r.temperature_k),
            latex: format!("{:.2}", r.temperature_k),
            unit: "K".into(),
        },
        Quantity {
            key: "temperature.C".into(),
            description: "temperature".into(),
            text: format::energy(r.temperature_k - crate::units::CELSIUS_OFFSET, 1, false),
            latex: format::energy(r.temperature_k - crate::units::CELSIUS_OFFSET, 1, false)
                .replace('-', "\\textminus{}"),
            unit: "°C".into(),
        },
    ];
    for p in &r.paths {
        let n = &part(&p.name);
        out.push(energy(
            format!("path.{n}.barrier"),
            format!("apparent barrier of path {n}"),
            p.apparent_barrier,
            r,
            decimals,
        ));
        out.push(rate(
            format!("path.{n}.k"),
            format!("apparent rate constant of path {n}"),
            p.k_apparent,
            "s⁻¹",
        ));
        let t = format::duration(p.half_life_s);
        out.push(Quantity {
            key: format!("path.{n}.halflife"),
            description: format!("half-life of path {n}"),
            latex: t.replace('µ', "\\textmu{}"),
            text: t,
            unit: String::new(),
        });
    }
    for s in &r.steps {
        let id = match &s.ts {
            Some(ts) => part(ts),
            None => format!("{}-{}", part(&s.from), part(&s.to)),
        };
        out.push(energy(
            format!("step.{id}.forward"),
            format!("barrier {} → {}", s.from, s.to),
            s.barrier_forward,
            r,
            decimals,
        ));
        out.push(energy(
            format!("step.{id}.reverse"),
            format!("barrier {} → {}", s.to, s.from),
            s.barrier_reverse,
            r,
            decimals,
        ));
        out.push(rate(
            format!("step.{id}.kforward"),
            format!("k {} → {}", s.from, s.to),
            s.k_forward,
            "s⁻¹",
        ));
        out.push(rate(
            format!("step.{id}.kreverse"),
            format!("k {} → {}", s.to, s.from),
            s.k_reverse,
            "s⁻¹",
        ));
    }
    if let Some(sel) = &r.selectivity {
        out.push(Quantity {
            key: "selectivity.regime".into(),
            description: "selectivity regime".into(),
            text: sel.regime.into(),
            latex: sel.regime.into(),
            unit: String::new(),
        });
        out.push(energy(
            "selectivity.ddg".into(),
            "deciding ΔΔG‡".into(),
            sel.ddg,
            r,
            decimals,
        ));
        let mut ranked: Vec<(&String, &f64)> = sel.products.iter().collect();
        ranked.sort_by(|a, b| b.1.total_cmp(a.1).then(a.0.cmp(b.0)));
        if let [(a, fa), (b, fb), ..] = ranked[..] {
            let ratio = fa / fb;
            out.push(Quantity {
                key: "selectivity.ratio".into(),
                description: format!("product ratio {a}:{b}"),
                text: format!("{}:1", format::scientific(ratio)),
                latex: format!("{}:1", latex_scientific(ratio)),
                unit: String::new(),
            });
        }
        for (id, f) in &sel.products {
            let id = part(id);
            let pct = format!("{:.1}", 100.0 * f);
            out.push(Quantity {
                key: format!("product.{id}.percent"),
                description: format!("share of product {id}"),
                latex: pct.clone(),
                text: pct,
                unit: "%".into(),
            });
        }
    }
    for c in &r.cycles {
        let n = &part(&c.name);
        out.push(rate(
            format!("cycle.{n}.tof"),
            format!("TOF of cycle {n}"),
            c.tof,
            "s⁻¹",
        ));
        if let Some(span) = c.span {
            out.push(energy(
                format!("cycle.{n}.span"),
                format!("energetic span of cycle {n}"),
                span,
                r,
                decimals,
            ));
        }
    }
    if let Some(u) = &r.uncertainty {
        let pct = (100.0 * u.level).round();
        for p in &u.paths {
            let n = &part(&p.name);
            for (which, v) in [("low", p.k.low), ("high", p.k.high)] {
                out.push(rate(
                    format!("path.{n}.k.{which}"),
                    format!("{pct} % interval of k, path {n} ({which})"),
                    v,
                    "s⁻¹",
                ));
            }
        }
        if let Some(ratio) = &u.ratio {
            for (which, v) in [("low", ratio.interval.low), ("high", ratio.interval.high)] {
                out.push(rate(
                    format!("selectivity.ratio.{which}"),
                    format!("{pct} % interval of the ratio ({which})"),
                    v,
                    "",
                ));
            }
        }
    }
    out
}

/// A LaTeX file defining `\eyrie{key}` for every quantity (any key works,
/// dashes and dots included): `\eyrie{path.stepwise.barrier}` prints 25.1.
pub fn latex(q: &[Quantity], source: &str) -> String {
    let mut out = format!(
        "% Numbers computed by eyrie from {source}; regenerate, do not edit.\n\
         % Use \\eyrie{{key}} in the text, e.g. \\eyrie{{path.main.barrier}}.\n\
         \\providecommand{{\\eyrie}}[1]{{\\csname eyrie@#1\\endcsname}}\n"
    );
    for x in q {
        out += &format!(
            "\\expandafter\\def\\csname eyrie@{}\\endcsname{{{}}} % {}{}\n",
            x.key,
            x.latex,
            x.description.replace(['\n', '\r'], " "),
            if x.unit.is_empty() {
                String::new()
            } else {
                format!(", {}", x.unit)
            }
        );
    }
    out
}

/// A Markdown table of every quantity.
pub fn markdown(q: &[Quantity]) -> String {
    let mut out = String::from("| key | quantity | value | unit |\n|---|---|---:|---|\n");
    for x in q {
        out += &format!(
            "| `{}` | {} | {} | {} |\n",
            x.key,
            x.description.replace('|', "\\|"),
            x.text,
            x.unit
        );
    }
    out
}

/// CSV (RFC 4180 quoting) of every quantity.
pub fn csv(q: &[Quantity]) -> String {
    let field = |s: &str| {
        if s.contains([',', '"', '\n']) {
            format!("\"{}\"", s.replace('"', "\"\""))
        } else {
            s.to_string()
        }
    };
    let mut out = String::from("key,quantity,value,unit\n");
    for x in q {
        out += &format!(
            "{},{},{},{}\n",
            field(&x.key),
            field(&x.description),
            field(&x.text),
            field(&x.unit)
        );
    }
    out
}
