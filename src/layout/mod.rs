//! Places the numbers to show on the page: from a [`DiagramSpec`] (what to
//! draw, with every number already computed and formatted) to a [`Scene`]
//! (positioned lines and text in millimetres).
//!
//! Layout never computes kinetics and never reads a profile; the renderer
//! never sees anything but the scene.

mod annotate;
mod axis;
pub mod chart;
mod columns;
pub mod connect;
mod legend;
pub mod markup;
mod overlay;
mod place;
pub mod rich;
mod scene;
mod style;
pub mod text;
mod vertical;

pub use chart::{AxisScale, ChartSpec, Marker, Series, layout_chart};
pub use connect::Connector;
pub use overlay::Overlay;
pub use place::{ATTACH_MM, segment_hits_rect};
pub use scene::{
    Anchor, Colour, Curve, Item, Line, Rect, RichLine, Role, Run, Scene, Script, Tag, Text,
};
pub use style::{OKABE_ITO, PRESETS, Style};

use crate::model::Kind;
use place::{Placer, Request, Side};
use std::sync::Arc;

/// One stationary point as it is to be shown.
#[derive(Debug, Clone, PartialEq)]
pub struct ShownPoint {
    /// The file id; tags the scene items drawn for this point.
    pub id: String,
    /// Text under the bar, in the label markup ([`markup`]).
    pub label: String,
    /// Minimum or TS (drawn alike for now; kept for styling).
    pub kind: Kind,
    /// Vertical position, in the axis unit.
    pub value: f64,
    /// The formatted number shown above the bar.
    pub value_text: String,
}

/// One path to draw: indices into [`DiagramSpec::points`].
#[derive(Debug, Clone, PartialEq)]
pub struct ShownPath {
    /// Path name (for the legend and tags).
    pub name: String,
    /// Points in order.
    pub via: Vec<usize>,
}

/// A computed number drawn onto the diagram; indices point into
/// [`DiagramSpec::points`], texts are formatted and may use the label markup.
#[derive(Debug, Clone, PartialEq)]
pub enum Annotation {
    /// A double-headed arrow from minimum `from` up to TS `to`, e.g. ΔG‡.
    Barrier {
        /// The minimum the barrier is measured from.
        from: usize,
        /// The transition state.
        to: usize,
        /// Lines beside the arrow.
        lines: Vec<String>,
    },
    /// A bracket between two competing TSs, e.g. ΔΔG‡ and the predicted ratio.
    Difference {
        /// One TS.
        a: usize,
        /// The other TS.
        b: usize,
        /// Lines beside the bracket.
        lines: Vec<String>,
    },
    /// The energetic span of a cycle: TDI up to TDTS, with δE and the TOF.
    Span {
        /// TOF-determining intermediate.
        tdi: usize,
        /// TOF-determining transition state.
        tdts: usize,
        /// Lines beside the arrow.
        lines: Vec<String>,
    },
}

impl Annotation {
    /// The text lines of the annotation.
    pub fn lines(&self) -> &[String] {
        match self {
            Annotation::Barrier { lines, .. }
            | Annotation::Difference { lines, .. }
            | Annotation::Span { lines, .. } => lines,
        }
    }
}

/// Everything the diagram shows, computed and formatted before layout.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct DiagramSpec {
    /// Figure title, if any.
    pub title: Option<String>,
    /// The y-axis label, e.g. "ΔG (kcal mol⁻¹)".
    pub axis_label: String,
    /// Stationary points.
    pub points: Vec<ShownPoint>,
    /// Paths in drawing order.
    pub paths: Vec<ShownPath>,
    /// Annotations of computed numbers, in drawing order.
    pub annotations: Vec<Annotation>,
    /// Points to emphasise (the rate-determining states).
    pub highlight: Vec<usize>,
    /// The profile's own settings: path looks, pinned columns, spacing.
    pub hints: crate::model::FigureHints,
    /// Variants drawn over the base profile, in legend order.
    pub overlays: Vec<Overlay>,
}

/// Lays out `spec` on a page of `style`'s size.
///
/// Steps: energy scale (nice ticks, optional axis break) → columns from the
/// path graph → bars, connectors and annotation marks → collision-checked
/// placement of values, labels and annotation texts → a legend where it
/// covers nothing. If no such spot is left for the legend, the page is laid
/// out again with a strip reserved for it at the top.
/// Never panics: non-finite energies and out-of-range indices are skipped,
/// and an empty spec gives an empty axis.
///
/// When some text finds no free spot at the style's sizes, the whole figure
/// is laid out again with smaller type, step by step down to
/// [`smallest_pt`] (6 pt for the 7 pt article type), so a crowded figure
/// shrinks uniformly. A text that still
/// finds no free spot is left out rather than drawn over another; see
/// [`layout_report`] for what was left out.
pub fn layout(spec: &DiagramSpec, style: &Style) -> Scene {
    layout_report(spec, style).0
}

/// What a page too small for its figure had to leave out.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Crowding {
    /// Texts (values, labels, annotations) that found no free spot.
    pub left_out: Vec<String>,
    /// The figure had annotations (fewer of them would help).
    pub annotated: bool,
}

impl Crowding {
    /// A one-line warning naming what was left out and which option gives
    /// the figure room, or `None` when everything fitted.
    pub fn warning(&self, style: &Style) -> Option<String> {
        if self.left_out.is_empty() {
            return None;
        }
        let shown: Vec<String> = self
            .left_out
            .iter()
            .take(4)
            .map(|t| format!("'{t}'"))
            .collect();
        let more = match self.left_out.len() {
            n if n > 4 => format!(" and {} more", n - 4),
            _ => String::new(),
        };
        let mut help = if style.width_mm < 170.0 {
            "use --size double (175 mm wide)".to_string()
        } else {
            "use a larger --width/--height".to_string()
        };
        if self.annotated {
            help.push_str(", or fewer --annotate items");
        }
        Some(format!(
            "the {:.0} × {:.0} mm figure cannot hold every text legibly: \
             left out {}{more}; {help}",
            style.width_mm,
            style.height_mm,
            shown.join(", ")
        ))
    }
}

/// [`layout`], also telling what did not fit.
pub fn layout_report(spec: &DiagramSpec, style: &Style) -> (Scene, Crowding) {
    let style = &style.with_hints(&spec.hints);
    let floor = smallest_pt(style);
    let mut best: Option<(Scene, Crowding)> = None;
    let mut tried: Vec<[f64; 3]> = Vec::new();
    for scale in [1.0, 0.93, 6.0 / 7.0, 0.79, 0.72] {
        let mut s = style.clone();
        for size in [&mut s.label_pt, &mut s.value_pt, &mut s.annotation_text_pt] {
            *size = (*size * scale).max(floor.min(*size));
        }
        // Below the floor every further step is the same pass.
        let sizes = [s.label_pt, s.value_pt, s.annotation_text_pt];
        if tried.contains(&sizes) {
            continue;
        }
        tried.push(sizes);
        // Values and labels come first: while one of them finds no spot,
        // the least important annotation gives up its room.
        // If that does not help (a page too small even for its labels), all
        // annotations stay.
        let once = |spec: &DiagramSpec, first: &[(Role, usize)]| {
            let (scene, fit) = build(spec, &s, 0.0, first);
            if fit.legend {
                return (scene, fit);
            }
            let entries = legend::entries(&overlay::legend_spec(spec), &s);
            build(spec, &s, legend::strip_height(&entries, &s), first)
        };
        // Placement is greedy: a label that found no spot may find one when
        // it goes before the neighbours that took its room (they then look
        // for theirs around it).
        let pass = |spec: &DiagramSpec| {
            let mut first: Vec<(Role, usize)> = Vec::new();
            let (mut scene, mut fit) = once(spec, &first);
            let mut last = fit.missing.clone();
            for _ in 0..REORDER_TRIES {
                let new: Vec<(Role, usize)> = last
                    .iter()
                    .copied()
                    .filter(|i| !first.contains(i))
                    .collect();
                if new.is_empty() {
                    break;
                }
                first.extend(new);
                let (sc, f) = once(spec, &first);
                last = f.missing.clone();
                if f.left_out.len() < fit.left_out.len() {
                    (scene, fit) = (sc, f);
                }
            }
            (scene, fit)
        };
        let (mut scene, mut fit) = pass(spec);
        let mut left_out: Vec<String> = Vec::new();
        if fit.points_left_out > 0 {
            // Leave out annotations, least important first, until values and
            // labels fit; then take back, most important first, each one
            // that still lets them fit.
            let with = |keep: &[bool]| DiagramSpec {
                annotations: spec
                    .annotations
                    .iter()
                    .zip(keep)
                    .filter(|(_, k)| **k)
                    .map(|(a, _)| a.clone())
                    .collect(),
                ..spec.clone()
            };
            let mut keep = vec![true; spec.annotations.len()];
            let mut dropped = Vec::new();
            let mut fitted = None;
            while let Some(k) = least_important(&spec.annotations, &keep) {
                keep[k] = false;
                dropped.push(k);
                let (sc, f) = pass(&with(&keep));
                if f.points_left_out == 0 {
                    fitted = Some((sc, f));
                    break;
                }
            }
            if let Some((mut sc, mut f)) = fitted {
                for &k in dropped.iter().rev().skip(1) {
                    keep[k] = true;
                    let (sc2, f2) = pass(&with(&keep));
                    if f2.points_left_out == 0 {
                        (sc, f) = (sc2, f2);
                    } else {
                        keep[k] = false;
                    }
                }
                left_out = (0..keep.len())
                    .filter(|&k| !keep[k])
                    .map(|k| plain_lines(spec.annotations[k].lines()))
                    .collect();
                (scene, fit) = (sc, f);
            }
        }
        left_out.extend(fit.left_out);
        if left_out.is_empty() {
            return (scene, Crowding::default());
        }
        // Keep the pass that left out least (the larger type on a tie).
        if best
            .as_ref()
            .is_none_or(|(_, c)| left_out.len() < c.left_out.len())
        {
            let annotated = !spec.annotations.is_empty();
            best = Some((
                scene,
                Crowding {
                    left_out,
                    annotated,
                },
            ));
        }
    }
    best.expect("at least one pass")
}

/// The kept annotation to leave out first: a barrier arrow (one per path, the
/// most numerous) before the selectivity bracket before an energetic span,
/// the later one first among equals.
fn least_important(annotations: &[Annotation], keep: &[bool]) -> Option<usize> {
    let rank = |a: &Annotation| match a {
        Annotation::Barrier { .. } => 0,
        Annotation::Difference { .. } => 1,
        Annotation::Span { .. } => 2,
    };
    (0..annotations.len())
        .rev()
        .filter(|&i| keep[i])
        .min_by_key(|&i| rank(&annotations[i]))
}

/// Markup lines as one plain string, for messages.
fn plain_lines(lines: &[String]) -> String {
    let plain: Vec<String> = lines
        .iter()
        .map(|l| rich::plain(&markup::parse(l)))
        .collect();
    plain.join(" ")
}

/// The smallest type a crowded figure may use, in pt: the preset's
/// `min_text_pt`, but never below 6 pt. Smaller type at final size is hard
/// to read, and shrinking a figure's type only moves its texts into its
/// lines: the placement leaves the last-placed texts (annotations) out and
/// the warning names a larger size instead.
pub fn smallest_pt(style: &Style) -> f64 {
    style.min_text_pt.max(MIN_LEGIBLE_PT)
}

/// See [`smallest_pt`].
pub const MIN_LEGIBLE_PT: f64 = 6.0;

/// Extra room (mm) kept beside a placed text, on top of the clearance: with
/// it, neighbouring texts on one line stand 1.5 mm apart, about two word
/// spaces at 7 pt.
const WORD_GAP: f64 = 1.2;

/// How far (mm) an annotation's text may move from its mark, with a short
/// leader, when no spot right beside it is clear: farther, it reads as
/// belonging to something else.
const ANNOTATION_RING: f64 = 6.0;

/// How many times a pass is redone with the texts that found no spot
/// placed first.
const REORDER_TRIES: usize = 3;

/// Extra width (in columns) a column gets for each side-by-side slot past
/// the first.
const SLOT_WIDTH: f64 = 1.0;

/// Thickness of the band behind a highlighted bar, in bar thicknesses.
const HIGHLIGHT: f64 = 2.2;

/// What fitted in one pass.
struct Fit {
    /// Texts that found no free spot (and were left out).
    left_out: Vec<String>,
    /// How many of them are values or labels (not annotation texts).
    points_left_out: usize,
    /// The values and labels (by point) that found no spot.
    missing: Vec<(Role, usize)>,
    /// The legend (if needed) found a free spot.
    legend: bool,
}

/// A one-line upright text at a fixed place (axis texts).
#[allow(clippy::too_many_arguments)]
pub(super) fn fixed_text(
    x: f64,
    y: f64,
    s: &str,
    size_pt: f64,
    anchor: Anchor,
    rotation: f64,
    role: Role,
    style: &Style,
) -> Text {
    Text {
        x,
        y,
        lines: vec![vec![Run::plain(s)]],
        size_pt,
        anchor,
        colour: style.ink,
        rotation,
        role,
        tag: None,
    }
}

/// A straight untagged line.
pub(super) fn plain_line(
    points: Vec<(f64, f64)>,
    colour: Colour,
    width_pt: f64,
    role: Role,
) -> Item {
    Item::Line(Line {
        points,
        colour,
        width_pt,
        dash: None,
        role,
        tag: None,
    })
}

/// One laid-out pass.
fn build(
    spec: &DiagramSpec,
    style: &Style,
    legend_strip: f64,
    first: &[(Role, usize)],
) -> (Scene, Fit) {
    let n = spec.points.len();
    let drawable: Vec<bool> = spec.points.iter().map(|p| p.value.is_finite()).collect();
    // Paths restricted to drawable points, keeping each path's own index
    // (its colour and dash) and dropping repeats of the same point in a row.
    let paths: Vec<(usize, Vec<usize>)> = spec
        .paths
        .iter()
        .enumerate()
        .map(|(i, p)| {
            let mut via: Vec<usize> = Vec::new();
            for &v in &p.via {
                if v < n && drawable[v] && via.last() != Some(&v) {
                    via.push(v);
                }
            }
            (i, via)
        })
        .collect();
    let mut colour: Vec<Option<usize>> = vec![None; n];
    for (i, via) in &paths {
        for &v in via {
            colour[v].get_or_insert(*i);
        }
    }

    let values: Vec<f64> = (0..n)
        .filter(|&i| drawable[i])
        .map(|i| spec.points[i].value)
        .chain(overlay::values(spec))
        .collect();
    let m = style.margin_mm;
    let em = |pt: f64| pt * text::PT_MM;
    let text_h = |pt: f64| em(pt) * (text::ASCENT + text::DESCENT);
    let caption_h = match &style.x_caption {
        Some(c) if !c.is_empty() => text_h(style.tick_pt) + 0.5,
        _ => 0.0,
    };
    // Room for a value and a label stacked above the highest bar.
    let top_y =
        m + legend_strip + text_h(style.value_pt) + text::LINE_HEIGHT * em(style.label_pt) + 1.0;
    let bottom_y = (style.height_mm
        - m
        - caption_h
        - text_h(style.label_pt)
        - 0.65
        - style.bar_pt * text::PT_MM / 2.0 * HIGHLIGHT)
        .max(top_y + 1.0);
    let scale = vertical::Scale::new(&values, style.axis_break, top_y, bottom_y);
    let tick_values: Vec<f64> = scale.ticks().collect();
    let tick_texts: Vec<String> = tick_values
        .iter()
        .map(|&t| crate::format::energy(t, scale.decimals, true))
        .collect();
    let tick_w = tick_texts
        .iter()
        .map(|t| text::width_mm(t, style.tick_pt))
        .fold(0.0, f64::max);
    let tick_len = 1.0;
    let axis_x = m + text_h(style.axis_label_pt) + 1.0 + tick_w + 0.6 + tick_len;
    let plot_x0 = axis_x + 1.0;
    let plot_x1 = (style.width_mm - m).max(plot_x0 + 1.0);
    let y_of = |v: f64| scale.y(v);

    let y: Vec<f64> = (0..n)
        .map(|i| {
            if drawable[i] {
                y_of(spec.points[i].value)
            } else {
                0.0
            }
        })
        .collect();
    // Horizontal positions. Two points crowd one column when the value
    // over the lower one reaches the label (up to two lines) under the other.
    let above = text_h(style.value_pt) + 0.6;
    let below = text_h(style.label_pt) + text::LINE_HEIGHT * em(style.label_pt) + 0.6;
    let crowd = |a: usize, b: usize| (y[a] - y[b]).abs() < above + below;
    let mut cols = columns::assign(
        n,
        &paths.iter().map(|(_, v)| v.clone()).collect::<Vec<_>>(),
        &spec.hints.columns,
        &crowd,
    );
    let mut next = cols.iter().flatten().fold(-1.0f64, |a, &c| a.max(c.ceil())) + 1.0;
    for i in 0..n {
        if drawable[i] && cols[i].is_none() {
            cols[i] = Some(next);
            next += 1.0;
        }
    }
    let ncols = next.max(1.0);
    // Points sharing a column whose texts would stack into each other get
    // side-by-side sub-slots, and their column gets wider (see
    // `SLOT_WIDTH`): branches fanning out from one state would otherwise
    // squeeze their bars and texts into one column's width.
    let up = text_h(style.value_pt) + 0.6;
    let down = text_h(style.label_pt) + 0.6;
    let mut order: Vec<usize> = (0..n).filter(|&i| cols[i].is_some()).collect();
    order.sort_by(|&a, &b| {
        cols[a]
            .unwrap()
            .total_cmp(&cols[b].unwrap())
            .then(a.cmp(&b))
    });
    // (members with their slot, number of slots, mean column)
    type Cluster = (Vec<(usize, usize)>, usize, f64);
    let mut clusters: Vec<Cluster> = Vec::new();
    let mut start = 0;
    while start < order.len() {
        let mut end = start + 1;
        while end < order.len() && cols[order[end]].unwrap() - cols[order[end - 1]].unwrap() < 0.75
        {
            end += 1;
        }
        let mut cluster: Vec<usize> = order[start..end].to_vec();
        cluster.sort_by(|&a, &b| y[a].total_cmp(&y[b]).then(a.cmp(&b)));
        let mut slot_bottom: Vec<f64> = Vec::new();
        let mut members = Vec::new();
        for &p in &cluster {
            let top = y[p] - up;
            let s = match slot_bottom.iter().position(|&b| b <= top) {
                Some(s) => s,
                None => {
                    slot_bottom.push(f64::NEG_INFINITY);
                    slot_bottom.len() - 1
                }
            };
            slot_bottom[s] = y[p] + down;
            members.push((p, s));
        }
        // Slots left to right in the order of their points' own columns, so
        // a path through the cluster does not double back.
        let k = slot_bottom.len();
        let mut slot_col: Vec<(f64, usize)> = (0..k)
            .map(|s| {
                let own: Vec<f64> = members
                    .iter()
                    .filter(|m| m.1 == s)
                    .map(|m| cols[m.0].unwrap())
                    .collect();
                (own.iter().sum::<f64>() / own.len() as f64, s)
            })
            .collect();
        slot_col.sort_by(|a, b| a.0.total_cmp(&b.0).then(a.1.cmp(&b.1)));
        let mut rank = vec![0; k];
        for (r, &(_, s)) in slot_col.iter().enumerate() {
            rank[s] = r;
        }
        for m in &mut members {
            m.1 = rank[m.1];
        }
        let mean = cluster.iter().map(|&p| cols[p].unwrap()).sum::<f64>() / cluster.len() as f64;
        clusters.push((members, k, mean));
        start = end;
    }
    // Width of each column cell, in plain columns.
    let cells = ncols.ceil() as usize;
    let mut weight = vec![1.0f64; cells.max(1)];
    let last_cell = weight.len() - 1;
    let cell_of = |c: f64| (c.max(0.0).floor() as usize).min(last_cell);
    for (_, k, mean) in &clusters {
        let w = 1.0 + SLOT_WIDTH * (*k as f64 - 1.0);
        let cell = cell_of(*mean);
        weight[cell] = weight[cell].max(w);
    }
    let col_w = (plot_x1 - plot_x0) / weight.iter().sum::<f64>();
    let before: Vec<f64> = weight
        .iter()
        .scan(0.0, |acc, w| {
            let b = *acc;
            *acc += w;
            Some(b)
        })
        .collect();
    // x of column coordinate `c` (a cell's centre is at c + 0.5).
    let x_at = |c: f64| {
        let cell = cell_of(c);
        plot_x0 + col_w * (before[cell] + (c - cell as f64).clamp(0.0, 1.0) * weight[cell])
    };
    let base_bar = style.bar_length(col_w);
    let mut x = vec![0.0; n];
    let mut bar_w = vec![base_bar; n];
    for i in 0..n {
        if let Some(c) = cols[i] {
            x[i] = x_at(c + 0.5);
        }
    }
    for (members, k, mean) in &clusters {
        if *k > 1 {
            // Slots share the cluster's mean position, so they stay inside
            // the column cell (and the page) whatever their own columns.
            let centre = x_at(mean + 0.5);
            let sub = col_w * weight[cell_of(*mean)] / *k as f64;
            for &(p, s) in members {
                x[p] = centre + (s as f64 - (*k as f64 - 1.0) / 2.0) * sub;
                bar_w[p] = bar_w[p].min(0.8 * sub);
            }
        }
    }

    let mut items: Vec<Item> = Vec::new();
    // Every line a text must keep clear of (connectors added below).
    let mut segments = Vec::new();
    let mut guides = Vec::new();
    // Zero line, under everything.
    if style.zero_line && !values.is_empty() && scale.shows(0.0) {
        segments.push(((plot_x0, y_of(0.0)), (plot_x1, y_of(0.0))));
        guides.push(((plot_x0, y_of(0.0)), (plot_x1, y_of(0.0))));
        items.push(plain_line(
            vec![(plot_x0, y_of(0.0)), (plot_x1, y_of(0.0))],
            style.zero_colour,
            style.axis_pt * 0.6,
            Role::ZeroLine,
        ));
    }
    // Axis: one stroke per band, a break mark between bands.
    for (y0, y1) in scale.band_spans() {
        items.push(plain_line(
            vec![(axis_x, y0), (axis_x, y1)],
            style.ink,
            style.axis_pt,
            Role::Axis,
        ));
    }
    for yb in scale.breaks() {
        // Two parallel slanted strokes across the axis, the cut between them.
        for dy in [-0.6, 0.6] {
            segments.push(((axis_x - 1.0, yb + dy + 0.5), (axis_x + 1.0, yb + dy - 0.5)));
            items.push(plain_line(
                vec![(axis_x - 1.0, yb + dy + 0.5), (axis_x + 1.0, yb + dy - 0.5)],
                style.ink,
                style.axis_pt,
                Role::AxisBreak,
            ));
        }
    }
    let mut fixed_texts: Vec<Text> = Vec::new();
    for (t, label) in tick_values.iter().zip(&tick_texts) {
        let ty = y_of(*t);
        items.push(plain_line(
            vec![(axis_x - tick_len, ty), (axis_x, ty)],
            style.ink,
            style.axis_pt,
            Role::Tick,
        ));
        let t = fixed_text(
            axis_x - tick_len - 0.6,
            ty + (text::ASCENT - text::DESCENT) / 2.0 * em(style.tick_pt),
            label,
            style.tick_pt,
            Anchor::End,
            0.0,
            Role::TickLabel,
            style,
        );
        // Near an axis break two ticks may come close: the mark stays, the
        // number that would touch the one above is left out.
        let b = t.bbox().inflate(place::CLEARANCE);
        if !fixed_texts.iter().any(|f| f.bbox().intersects(&b)) {
            fixed_texts.push(t);
        }
    }
    if !spec.axis_label.is_empty() {
        fixed_texts.push(fixed_text(
            m + text::ASCENT * em(style.axis_label_pt),
            (scale.top + scale.bottom) / 2.0,
            &spec.axis_label,
            style.axis_label_pt,
            Anchor::Middle,
            -90.0,
            Role::AxisLabel,
            style,
        ));
    }
    if let Some(caption) = style.x_caption.as_ref().filter(|c| !c.is_empty()) {
        fixed_texts.push(fixed_text(
            (plot_x0 + plot_x1) / 2.0,
            style.height_mm - m - text::DESCENT * em(style.tick_pt),
            caption,
            style.tick_pt,
            Anchor::Middle,
            0.0,
            Role::Caption,
            style,
        ));
    }

    // Connectors: each unordered pair of points once, in its first path's style.
    let mut drawn: Vec<(usize, usize)> = Vec::new();
    for (pi, via) in &paths {
        for w in via.windows(2) {
            let (a, b) = (w[0], w[1]);
            let key = (a.min(b), a.max(b));
            if drawn.contains(&key) {
                continue;
            }
            drawn.push(key);
            let (from, to) = if x[b] >= x[a] {
                ((x[a] + bar_w[a] / 2.0, y[a]), (x[b] - bar_w[b] / 2.0, y[b]))
            } else {
                ((x[a] - bar_w[a] / 2.0, y[a]), (x[b] + bar_w[b] / 2.0, y[b]))
            };
            let tag = Some(Tag::Path(spec.paths[*pi].name.clone()));
            match style.connector {
                Connector::Straight => {
                    segments.push((from, to));
                    items.push(Item::Line(Line {
                        points: vec![from, to],
                        colour: style.path_colour(*pi),
                        width_pt: style.path_width(*pi),
                        dash: style.path_dash(*pi),
                        role: Role::Connector,
                        tag,
                    }));
                }
                Connector::Smooth => {
                    let c = connect::smooth(from, to);
                    segments.extend(connect::flatten(from, &c, connect::CHORDS));
                    items.push(Item::Curve(Curve {
                        start: from,
                        segments: vec![c],
                        colour: style.path_colour(*pi),
                        width_pt: style.path_width(*pi),
                        dash: style.path_dash(*pi),
                        role: Role::Connector,
                        tag,
                    }));
                }
            }
        }
    }

    // Bars, with a band behind the highlighted ones.
    let half_t = style.bar_pt * text::PT_MM / 2.0;
    let mut placer = Placer {
        bounds: Rect {
            x0: axis_x + 0.3,
            y0: m + legend_strip,
            x1: style.width_mm - m,
            // Nothing goes beside the x caption: it would read as part of it.
            y1: style.height_mm - m - caption_h,
        },
        blocked: fixed_texts.iter().map(Text::bbox).collect(),
        segments,
        leaders: Vec::new(),
        guides,
    };
    let mut bars = Vec::new();
    for i in 0..n {
        if !drawable[i] {
            continue;
        }
        let tag = Some(Tag::Point(spec.points[i].id.clone()));
        let mut half = half_t;
        if spec.highlight.contains(&i) {
            let pad = 0.5;
            half = half_t * HIGHLIGHT;
            bars.push(Item::Line(Line {
                points: vec![
                    (x[i] - bar_w[i] / 2.0 - pad, y[i]),
                    (x[i] + bar_w[i] / 2.0 + pad, y[i]),
                ],
                colour: style.highlight,
                width_pt: style.bar_pt * HIGHLIGHT,
                dash: None,
                role: Role::Highlight,
                tag: tag.clone(),
            }));
        }
        let c = colour[i].map_or(style.ink, |p| style.path_colour(p));
        bars.push(Item::Line(Line {
            points: vec![(x[i] - bar_w[i] / 2.0, y[i]), (x[i] + bar_w[i] / 2.0, y[i])],
            colour: c,
            width_pt: style.bar_pt,
            dash: None,
            role: Role::Bar,
            tag,
        }));
        placer.block(Rect {
            x0: x[i] - bar_w[i] / 2.0,
            y0: y[i] - half,
            x1: x[i] + bar_w[i] / 2.0,
            y1: y[i] + half,
        });
    }
    let frame = overlay::Frame {
        paths: &paths,
        x: &x,
        y: &y,
        bar_w: &bar_w,
        drawable: &drawable,
    };
    let overlay_items = overlay::draw(spec, &frame, &y_of, style, &mut placer);

    // Annotation marks block text before any text is placed.
    let ids: Vec<String> = spec.points.iter().map(|p| p.id.clone()).collect();
    let variant_bars: Vec<(f64, f64, f64)> = spec
        .overlays
        .iter()
        .flat_map(|o| &o.changed)
        .filter(|(i, v, _)| *i < n && drawable[*i] && v.is_finite())
        .map(|&(i, v, _)| (x[i] - bar_w[i] / 2.0, x[i] + bar_w[i] / 2.0, y_of(v)))
        .collect();
    let geometry = annotate::Geometry {
        others: &variant_bars,
        x: &x,
        y: &y,
        bar_w: &bar_w,
        ids: &ids,
        drawable: &drawable,
        plot: (plot_x0, plot_x1),
    };
    let mut marks = Vec::new();
    let mut annotation_items = Vec::new();
    for a in &spec.annotations {
        let alternatives = annotate::draw(a, &geometry, style);
        // The preferred drawing keeps values and labels away; another one
        // is tried when its text finds no clear spot.
        if let Some(d) = alternatives.first() {
            placer.blocked.extend(d.hard.iter().copied());
            placer.segments.extend(d.soft.iter().copied());
            placer.guides.extend(d.soft.iter().copied());
            marks.push((a, alternatives));
        }
    }

    // Values first (short, and the number a reader looks for), then labels,
    // then annotation texts beside their marks.
    let mut by_x: Vec<usize> = (0..n).filter(|&i| drawable[i]).collect();
    by_x.sort_by(|&a, &b| {
        x[a].total_cmp(&x[b])
            .then(y[a].total_cmp(&y[b]))
            .then(a.cmp(&b))
    });
    let mut leaders = Vec::new();
    let mut placed_texts = Vec::new();
    let mut left_out = Vec::new();
    let mut points_left_out = 0;
    let mut missing = Vec::new();
    let mut settle = |placer: &mut Placer,
                      cands: &[place::Candidate],
                      origin: (f64, f64),
                      bar: Option<(f64, f64, f64)>,
                      half: f64,
                      ring: f64,
                      role: Role,
                      tag: Option<Tag>| {
        // A leader may start anywhere along the bar but its last quarter.
        let reach = bar.map_or(0.0, |(x0, x1, _)| (x1 - x0) / 4.0);
        let own: Vec<Rect> = placed_texts
            .iter()
            .filter_map(|t| match t {
                Item::Text(t) if t.tag.is_some() && t.tag == tag => Some(t.bbox()),
                _ => None,
            })
            .collect();
        let owner = place::Owner {
            origin,
            reach,
            bar,
            own: &own,
            half,
        };
        // A text read across a line is easily misread, and a leader across
        // a line points at the wrong owner: every text goes only where no
        // connector, guide, zero line or leader crosses it or its leader.
        let Some(chosen) = placer.choose_clear(cands, &owner, ring) else {
            // No clear spot: left out (and reported, with the option that
            // gives the figure room) rather than drawn through a line.
            let lines: Vec<String> = cands
                .first()
                .map(|c| c.lines.iter().map(|l| rich::plain(l)).collect())
                .unwrap_or_default();
            return Err(lines.join(" "));
        };
        let needs_leader = chosen.leader;
        let chosen = chosen.candidate;
        let r = chosen.bbox();
        // Side by side, two texts need more than a word space between them
        // or they read as one ("bicyclic adduct open adduct").
        placer.block(Rect {
            x0: r.x0 - WORD_GAP,
            x1: r.x1 + WORD_GAP,
            ..r
        });
        // A text that no longer sits right over (or under) its bar gets a
        // leader line back to its owner.
        if needs_leader {
            let (origin, to) = owner.leader_to(&r);
            placer.segments.push((origin, to));
            placer.leaders.push((origin, to));
            leaders.push(Item::Line(Line {
                points: vec![origin, to],
                colour: style.leader,
                width_pt: style.connector_pt * 0.6,
                dash: None,
                role: Role::Leader,
                tag: tag.clone(),
            }));
        }
        placed_texts.push(Item::Text(Text {
            x: chosen.x,
            y: chosen.y,
            lines: Arc::unwrap_or_clone(chosen.lines),
            size_pt: chosen.size_pt,
            anchor: chosen.anchor,
            colour: style.ink,
            rotation: 0.0,
            role,
            tag,
        }));
        Ok(())
    };
    // Annotation texts first, beside their marks: the numbers the figure
    // was asked to show; values and labels find their spots around them.
    for (a, alternatives) in marks {
        let lines: Vec<RichLine> = a.lines().iter().map(|l| markup::parse(l)).collect();
        if lines.iter().all(|l| rich::plain(l).trim().is_empty()) {
            annotation_items.extend(alternatives[0].items.iter().cloned());
            continue;
        }
        // Each drawing on its own: the preferred one's obstacles go, and an
        // alternative must cross no placed text or bar.
        let first = &alternatives[0];
        placer.blocked.retain(|r| !first.hard.contains(r));
        placer.segments.retain(|s| !first.soft.contains(s));
        // Beside its mark first, in any of the drawings; only then a spot
        // a little away with a short leader.
        let mut shown = None;
        'search: for ring in [0.0, ANNOTATION_RING] {
            for (k, d) in alternatives.iter().enumerate() {
                if k > 0 && !annotate::clear_of(d, &placer.blocked, &placer.leaders) {
                    continue;
                }
                let (nb, ns) = (placer.blocked.len(), placer.segments.len());
                placer.blocked.extend(d.hard.iter().copied());
                placer.segments.extend(d.soft.iter().copied());
                placer.guides.extend(d.soft.iter().copied());
                let (mx, top, bottom) = d.mark;
                let cands = place::beside(mx, top, bottom, &lines, style.annotation_text_pt);
                let origin = (mx, (top + bottom) / 2.0);
                let owner = place::Owner {
                    origin,
                    reach: 0.0,
                    bar: None,
                    own: &[],
                    half: 0.0,
                };
                if placer.choose_clear(&cands, &owner, ring).is_some() {
                    shown = Some((d, cands, origin, ring));
                    break 'search;
                }
                placer.blocked.truncate(nb);
                placer.segments.truncate(ns);
            }
        }
        match shown {
            // The spot just found is chosen again (same state, same choice).
            Some((d, cands, origin, ring))
                if settle(
                    &mut placer,
                    &cands,
                    origin,
                    None,
                    0.0,
                    ring,
                    Role::AnnotationText,
                    None,
                )
                .is_ok() =>
            {
                annotation_items.extend(d.items.iter().cloned());
            }
            _ => left_out.push(plain_lines(a.lines())),
        }
    }

    // Values, then labels, left to right; texts that found no spot in an
    // earlier pass go first (a label then takes the side its value would
    // have taken, and the value the other).
    let mut early: Vec<(Role, usize)> = Vec::new();
    for &(r, i) in first.iter().filter(|(_, i)| by_x.contains(i)) {
        // A label's value right after it, on whichever side is left.
        for job in [(r, i), (Role::Value, i)] {
            if !early.contains(&job) {
                early.push(job);
            }
        }
    }
    let jobs: Vec<(Role, usize)> = early
        .iter()
        .copied()
        .chain(
            [Role::Value, Role::Label]
                .into_iter()
                .flat_map(|r| by_x.iter().map(move |&i| (r, i)))
                .filter(|job| !early.contains(job)),
        )
        .collect();
    {
        for (role, i) in jobs {
            let side = if role == Role::Value {
                Side::Above
            } else {
                Side::Below
            };
            let p = &spec.points[i];
            let (runs, size) = match role {
                Role::Value => (vec![Run::plain(p.value_text.clone())], style.value_pt),
                _ => (markup::parse(&p.label), style.label_pt),
            };
            if rich::plain(&runs).trim().is_empty() {
                continue;
            }
            // A highlighted bar is thicker: its texts keep clear of the band.
            let half = if spec.highlight.contains(&i) {
                half_t * HIGHLIGHT
            } else {
                half_t
            };
            let req = Request {
                x: x[i],
                y: y[i],
                half_thickness: half,
                half_width: bar_w[i] / 2.0,
                side,
                text: &runs,
                size_pt: size,
                breakable: role == Role::Label,
            };
            let cands = place::candidates(&req);
            let origin = match side {
                Side::Above => (x[i], y[i] - half),
                Side::Below => (x[i], y[i] + half),
            };
            let bar = (x[i] - bar_w[i] / 2.0, x[i] + bar_w[i] / 2.0, y[i]);
            let placed = settle(
                &mut placer,
                &cands,
                origin,
                Some(bar),
                half,
                place::RING_RADIUS,
                role,
                Some(Tag::Point(p.id.clone())),
            );
            if let Err(text) = placed {
                left_out.push(text);
                points_left_out += 1;
                missing.push((role, i));
            }
        }
    }
    // Each variant's values beside its own bars, tagged with its name.
    for o in &spec.overlays {
        for (i, v, value_text) in &o.changed {
            if *i >= n || !drawable[*i] || !v.is_finite() || value_text.trim().is_empty() {
                continue;
            }
            let runs = vec![Run::plain(value_text.clone())];
            let (vx, vy) = (x[*i], y_of(*v));
            let side = if *v >= spec.points[*i].value {
                Side::Above
            } else {
                Side::Below
            };
            let req = Request {
                x: vx,
                y: vy,
                half_thickness: half_t,
                half_width: bar_w[*i] / 2.0,
                side,
                text: &runs,
                size_pt: style.value_pt,
                breakable: false,
            };
            let origin = match side {
                Side::Above => (vx, vy - half_t),
                Side::Below => (vx, vy + half_t),
            };
            let bar = (vx - bar_w[*i] / 2.0, vx + bar_w[*i] / 2.0, vy);
            let tag = Some(Tag::Path(o.name.clone()));
            let placed = settle(
                &mut placer,
                &place::candidates(&req),
                origin,
                Some(bar),
                half_t,
                place::RING_RADIUS,
                Role::Value,
                tag,
            );
            if let Err(text) = placed {
                left_out.push(text);
                points_left_out += 1;
            }
        }
    }
    overlay::colour_values(&mut placed_texts, spec, style);
    items.extend(annotation_items);
    items.extend(leaders);
    items.extend(overlay_items);
    items.extend(bars);
    items.extend(fixed_texts.into_iter().map(Item::Text));
    items.extend(placed_texts);

    let entries = legend::entries(&overlay::legend_spec(spec), style);
    let mut legend_ok = true;
    if entries.len() > 1 {
        let area = legend::Area {
            x0: plot_x0,
            x1: plot_x1,
            y0: m,
            y1: style.height_mm - m - caption_h,
        };
        let drawn = if legend_strip > 0.0 {
            Some(legend::in_strip(&entries, style, plot_x0, plot_x1, m))
        } else {
            legend::floating(&entries, style, &area, &placer)
        };
        match drawn {
            Some(legend_items) => items.extend(legend_items),
            None => legend_ok = false,
        }
    }

    (
        Scene {
            width_mm: style.width_mm,
            height_mm: style.height_mm,
            title: spec.title.clone(),
            font_family: style.font_family.clone(),
            items,
        },
        Fit {
            left_out,
            points_left_out,
            missing,
            legend: legend_ok,
        },
    )
}
