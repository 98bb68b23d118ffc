//! Chooses what the diagram shows for a model: the bridge from the validated
//! model to the layout's [`DiagramSpec`]. Numbers are computed by the
//! kinetics library and formatted here, with the same rule as the tables, so
//! the figure and the text agree.

use crate::format;
use crate::kinetics;
use crate::layout::{Annotation, Connector, DiagramSpec, Overlay, ShownPath, ShownPoint, Style};
use crate::model::{Kind, Model, PointId};

/// An annotation of computed numbers the figure may carry.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum AnnotationKind {
    /// ΔG‡ arrow of each path's apparent barrier (determining minimum → TS).
    Barriers,
    /// ΔΔG‡ bracket between the two lowest competing product-forming TSs,
    /// with the predicted product ratio.
    Selectivity,
    /// Emphasis on the determining minimum and TS of the slowest path.
    RateDetermining,
    /// Energetic span TDI → TDTS of each catalytic cycle, with δE and TOF.
    Span,
}

impl AnnotationKind {
    /// Every kind, in documentation order.
    pub const ALL: [AnnotationKind; 4] = [
        AnnotationKind::Barriers,
        AnnotationKind::Selectivity,
        AnnotationKind::RateDetermining,
        AnnotationKind::Span,
    ];

    /// The name used on the command line and in the docs.
    pub fn name(self) -> &'static str {
        match self {
            AnnotationKind::Barriers => "barriers",
            AnnotationKind::Selectivity => "selectivity",
            AnnotationKind::RateDetermining => "rate-determining",
            AnnotationKind::Span => "span",
        }
    }

    /// The kind called `name`.
    pub fn from_name(name: &str) -> Option<AnnotationKind> {
        AnnotationKind::ALL.into_iter().find(|k| k.name() == name)
    }
}

/// Everything a user may choose about a figure. `Default` is a plain
/// single-column diagram without annotations.
#[derive(Debug, Clone, PartialEq)]
pub struct FigureOptions {
    /// Annotations to draw (order does not matter; repeats are ignored).
    pub annotations: Vec<AnnotationKind>,
    /// Straight or smooth connectors.
    pub connector: Connector,
    /// A thin line at zero energy.
    pub zero_line: bool,
    /// Cut the axis when a state lies far below the rest.
    pub axis_break: bool,
    /// Decimals of every energy shown (`None`: the unit's usual number).
    pub decimals: Option<usize>,
    /// Style preset name (see [`crate::layout::PRESETS`]).
    pub preset: String,
    /// Variants to draw over the profile (indices into `Model::variants`;
    /// out-of-range indices are skipped).
    pub variants: Vec<usize>,
}

impl Default for FigureOptions {
    fn default() -> Self {
        FigureOptions {
            annotations: Vec::new(),
            connector: Connector::Straight,
            zero_line: false,
            axis_break: false,
            decimals: None,
            preset: "article".into(),
            variants: Vec::new(),
        }
    }
}

impl FigureOptions {
    /// Every annotation on, smooth connectors, zero line and axis break:
    /// the gallery's settings.
    pub fn annotated() -> FigureOptions {
        FigureOptions {
            annotations: AnnotationKind::ALL.to_vec(),
            connector: Connector::Smooth,
            zero_line: true,
            axis_break: true,
            ..FigureOptions::default()
        }
    }

    /// The layout style: the preset with these options applied. The error
    /// names the presets there are.
    pub fn style(&self) -> Result<Style, String> {
        let mut style = Style::preset(&self.preset).ok_or_else(|| {
            let names: Vec<&str> = crate::layout::PRESETS.iter().map(|p| p.0).collect();
            format!(
                "unknown style '{}': choose one of {}",
                self.preset,
                names.join(", ")
            )
        })?;
        style.connector = self.connector;
        style.zero_line = self.zero_line;
        style.axis_break = self.axis_break;
        Ok(style)
    }

    fn shows(&self, kind: AnnotationKind) -> bool {
        self.annotations.contains(&kind)
    }
}

/// The diagram content for `model`: every point at its energy, every path,
/// and the annotations `options` asks for.
pub fn diagram_spec(model: &Model, options: &FigureOptions) -> DiagramSpec {
    let unit = model.unit();
    let decimals = options.decimals.unwrap_or(unit.display_decimals()).min(6);
    let energy = |v: f64| format::energy(v, decimals, true);
    let mut spec = DiagramSpec {
        title: model.title().map(str::to_string),
        axis_label: format!("ΔG ({})", unit.axis_name()),
        points: model
            .points()
            .iter()
            .map(|p| ShownPoint {
                id: p.id.clone(),
                label: p.label.clone(),
                kind: p.kind,
                value: p.g,
                value_text: energy(p.g),
            })
            .collect(),
        paths: model
            .paths()
            .iter()
            .map(|p| ShownPath {
                name: p.name.clone(),
                via: p.via.clone(),
            })
            .collect(),
        hints: model.figure_hints().clone(),
        overlays: options
            .variants
            .iter()
            .filter(|&&i| i < model.variants().len())
            .map(|&i| overlay(model, i, &energy))
            .collect(),
        ..DiagramSpec::default()
    };
    let need_analysis =
        options.shows(AnnotationKind::Barriers) || options.shows(AnnotationKind::RateDetermining);
    let analysis = need_analysis.then(|| kinetics::analyze(model));
    let spans = if options.shows(AnnotationKind::Span) {
        cycle_spans(model, &energy)
    } else {
        Vec::new()
    };
    if let (true, Some(a)) = (options.shows(AnnotationKind::Barriers), &analysis) {
        for b in &a.paths {
            // A cycle with its span drawn needs no second arrow.
            if spans.iter().any(|(path, _)| *path == b.path) {
                continue;
            }
            let Some(ts) = b.determining_ts else { continue };
            let from = b.determining_state;
            let exists = spec.annotations.iter().any(
                |x| matches!(x, Annotation::Barrier { from: f, to: t, .. } if *f == from && *t == ts),
            );
            if !exists && b.apparent_barrier > 0.0 {
                spec.annotations.push(Annotation::Barrier {
                    from,
                    to: ts,
                    lines: vec![format!("Δ*G*^‡ = {}", energy(b.apparent_barrier))],
                });
            }
        }
    }
    spec.annotations
        .extend(spans.into_iter().map(|(_, annotation)| annotation));
    if options.shows(AnnotationKind::Selectivity) {
        spec.annotations.extend(selectivity_bracket(model, &energy));
    }
    if let (true, Some(a)) = (options.shows(AnnotationKind::RateDetermining), &analysis) {
        let slowest = a
            .paths
            .iter()
            .filter(|b| b.apparent_barrier.is_finite())
            .max_by(|x, y| x.apparent_barrier.total_cmp(&y.apparent_barrier));
        if let Some(b) = slowest {
            spec.highlight.push(b.determining_state);
            spec.highlight.extend(b.determining_ts);
        }
    }
    spec
}

/// Variant `i` as an overlay: the points whose shown energy differs from the
/// profile's, with the variant's value. Differences too small to change the
/// printed number are not drawn: the bars would coincide.
fn overlay(model: &Model, i: usize, energy: &dyn Fn(f64) -> String) -> Overlay {
    let v = &model.variants()[i];
    let changed = model.variant(i);
    Overlay {
        name: v.label.clone().unwrap_or_else(|| v.name.clone()),
        changed: model
            .points()
            .iter()
            .zip(changed.points())
            .enumerate()
            .filter(|(_, (a, b))| energy(a.g) != energy(b.g))
            .map(|(p, (_, b))| (p, b.g, energy(b.g)))
            .collect(),
    }
}

/// The ΔΔG‡ bracket between the two lowest product-forming TSs that lead to
/// different products, with the predicted ratio of those products.
fn selectivity_bracket(model: &Model, energy: &dyn Fn(f64) -> String) -> Option<Annotation> {
    let start = (!model.start().is_empty()).then(|| model.start());
    let sel = kinetics::regime::selectivity(model, start)?;
    let mut channels: Vec<_> = sel.channels.iter().filter(|c| c.ts.is_some()).collect();
    channels.sort_by(|a, b| a.top.total_cmp(&b.top));
    let first = channels.first()?;
    let second = channels.iter().find(|c| c.product != first.product)?;
    let (a, b) = (first.ts?, second.ts?);
    let fraction = |p: PointId| {
        sel.products
            .iter()
            .find(|(q, _)| *q == p)
            .map_or(0.0, |(_, f)| *f)
    };
    let ddg = model.point(b).g - model.point(a).g;
    let mut lines = vec![format!("ΔΔ*G*^‡ = {}", energy(ddg))];
    if let Some(r) = ratio(fraction(first.product), fraction(second.product)) {
        // Only under Curtin–Hammett does the ratio follow from the bracketed ΔΔG‡
        // alone; otherwise say so, or the two numbers seem to disagree.
        lines.push(match sel.regime {
            kinetics::regime::Regime::CurtinHammett => r,
            kinetics::regime::Regime::KineticQuench => format!("{r} (kinetic quench)"),
            kinetics::regime::Regime::Intermediate => format!("{r} (not Curtin–Hammett)"),
        });
    }
    Some(Annotation::Difference { a, b, lines })
}

/// "9:1"-style ratio of two fractions, larger first; whole numbers from 10:1
/// on, one decimal below (dropped when it is zero).
pub fn ratio(major: f64, minor: f64) -> Option<String> {
    if !(major.is_finite() && minor.is_finite()) || major <= 0.0 || minor < 0.0 {
        return None;
    }
    let (hi, lo) = if major >= minor {
        (major, minor)
    } else {
        (minor, major)
    };
    if lo <= 0.0 || hi / lo >= 1e4 {
        return Some(">9999:1".into());
    }
    let r = hi / lo;
    let text = if r >= 9.95 {
        format!("{r:.0}")
    } else {
        let t = format!("{r:.1}");
        t.strip_suffix(".0").map(str::to_string).unwrap_or(t)
    };
    Some(format!("{text}:1"))
}

/// The energetic span annotation of each catalytic cycle, with its path index.
fn cycle_spans(model: &Model, energy: &dyn Fn(f64) -> String) -> Vec<(usize, Annotation)> {
    let mut out = Vec::new();
    for path in 0..model.paths().len() {
        let Some(c) = kinetics::cycle::analyze_cycle(model, path) else {
            continue;
        };
        let Some(d) = &c.span.determining else {
            continue;
        };
        let (Some(&tdi), Some(ts)) = (c.intermediates.get(d.tdi), c.ts.get(d.tdts)) else {
            continue;
        };
        let tdts = match *ts {
            kinetics::cycle::CycleTs::Ts(id) => id,
            kinetics::cycle::CycleTs::Barrierless(a, b) => {
                if model.point(a).g >= model.point(b).g {
                    a
                } else {
                    b
                }
            }
        };
        if model.point(tdts).kind != Kind::TransitionState
            && model.point(tdts).g <= model.point(tdi).g
        {
            continue;
        }
        out.push((
            path,
            Annotation::Span {
                tdi,
                tdts,
                lines: vec![
                    format!("δ*E* = {}", energy(d.span)),
                    format!("TOF = {} s^-1", format::scientific_markup(c.span.tof)),
                ],
            },
        ));
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ratios_read_like_chemists_write_them() {
        assert_eq!(ratio(0.9, 0.1).as_deref(), Some("9:1"));
        assert_eq!(ratio(0.1, 0.9).as_deref(), Some("9:1"));
        assert_eq!(ratio(0.75, 0.25).as_deref(), Some("3:1"));
        assert_eq!(ratio(0.7, 0.3).as_deref(), Some("2.3:1"));
        assert_eq!(ratio(0.96, 0.04).as_deref(), Some("24:1"));
        assert_eq!(ratio(1.0, 0.0).as_deref(), Some(">9999:1"));
        assert_eq!(ratio(f64::NAN, 0.5), None);
    }

    #[test]
    fn names_round_trip_and_presets_resolve() {
        for k in AnnotationKind::ALL {
            assert_eq!(AnnotationKind::from_name(k.name()), Some(k));
        }
        assert!(FigureOptions::default().style().is_ok());
        let bad = FigureOptions {
            preset: "glossy".into(),
            ..FigureOptions::default()
        };
        assert!(bad.style().unwrap_err().contains("article"));
    }
}
