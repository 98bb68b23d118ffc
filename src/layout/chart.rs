//! A general XY line chart (product fractions over temperature, concentrations
//! over time) laid out into the same [`Scene`] as the diagrams, so the same
//! renderers draw it with the same font, type sizes, palette and dashes.
//!
//! Like the diagram layout, it receives the numbers it shows and computes no
//! kinetics. Points that cannot be drawn are dropped: non-finite coordinates
//! anywhere, and zero or negative values on a log10 axis; a series line is
//! broken where a point was dropped.

use super::legend::{self, Entry};
use super::place::{self, CLEARANCE};
use super::scene::{Anchor, Item, Line, Rect, RichLine, Role, Scene, Tag, Text};
use super::{Style, axis, markup, rich, text};

/// How an axis maps values to positions.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum AxisScale {
    /// Equal steps for equal differences, 1-2-5 ticks.
    #[default]
    Linear,
    /// Equal steps for equal ratios, ticks at every decade labelled 10ⁿ.
    Log10,
}

/// One line of the chart.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Series {
    /// Name in the legend, in the label markup ([`markup`]).
    pub name: String,
    /// (x, y) in data units, in drawing order.
    pub points: Vec<(f64, f64)>,
}

/// A vertical line at a value of x with a label above the plot (e.g. an
/// isoselective temperature).
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Marker {
    /// Position in x data units.
    pub x: f64,
    /// Label in the label markup.
    pub label: String,
}

/// Everything a chart shows, computed and formatted before layout.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct ChartSpec {
    /// Carried into the scene as metadata (not drawn, as for diagrams).
    pub title: Option<String>,
    /// Title under the x axis, in the label markup, unit included.
    pub x_title: String,
    /// Title beside the y axis, in the label markup, unit included.
    pub y_title: String,
    /// Scale of the x axis.
    pub x_scale: AxisScale,
    /// Scale of the y axis.
    pub y_scale: AxisScale,
    /// Values the y axis must reach besides the data (e.g. 0 and 100 for
    /// percentages), so a flat series is not blown up to the full height.
    pub y_include: Vec<f64>,
    /// The lines, in drawing and legend order.
    pub series: Vec<Series>,
    /// Vertical marker lines; those outside the x range are left out.
    pub markers: Vec<Marker>,
}

/// One tick of an axis.
#[derive(Debug, Clone, PartialEq)]
pub struct Tick {
    /// Position in data units.
    pub value: f64,
    /// The number shown, in the label markup (`10^{-3}` on log axes).
    pub label: String,
}

/// Ticks covering `[lo, hi]` on `scale`. Linear: the 1-2-5 ticks of the
/// energy axis. Log10: every decade from the one at or below `lo` to the one
/// at or above `hi` (non-positive bounds are the caller's to drop).
pub fn ticks(scale: AxisScale, lo: f64, hi: f64) -> Vec<Tick> {
    match scale {
        AxisScale::Linear => {
            let t = axis::nice_ticks(lo, hi);
            t.values
                .iter()
                .map(|&v| Tick {
                    value: v,
                    label: crate::format::energy(v, t.decimals, true),
                })
                .collect()
        }
        AxisScale::Log10 => {
            let (a, b) = decades(lo, hi);
            (a..=b)
                .map(|n| Tick {
                    value: 10f64.powi(n),
                    label: format!("10^{{{n}}}"),
                })
                .collect()
        }
    }
}

/// First and last decade exponents covering `[lo, hi]`, at least one decade.
fn decades(lo: f64, hi: f64) -> (i32, i32) {
    let ok = |v: f64| v.is_finite() && v > 0.0;
    let (lo, hi) = match (ok(lo), ok(hi)) {
        (true, true) => (lo.min(hi), lo.max(hi)),
        (true, false) => (lo, lo),
        (false, true) => (hi, hi),
        (false, false) => (1.0, 10.0),
    };
    // A hair of slack so 1e2 computed as 99.999999 still ends at 10².
    let a = (lo.log10() + 1e-9).floor() as i32;
    let b = (hi.log10() - 1e-9).ceil() as i32;
    (a, b.max(a + 1))
}

/// An axis: data range and the page span it maps to.
#[derive(Debug, Clone)]
struct Axis {
    scale: AxisScale,
    ticks: Vec<Tick>,
    /// First and last tick in the mapped space (log10 of the value on a log axis).
    lo: f64,
    hi: f64,
    /// Page positions of `lo` and `hi`, mm.
    p0: f64,
    p1: f64,
}

impl Axis {
    fn new(scale: AxisScale, values: &[f64]) -> Axis {
        let lo = values.iter().copied().fold(f64::INFINITY, f64::min);
        let hi = values.iter().copied().fold(f64::NEG_INFINITY, f64::max);
        let ticks = ticks(scale, lo, hi);
        let map = |v: f64| match scale {
            AxisScale::Linear => v,
            AxisScale::Log10 => v.log10(),
        };
        let lo = map(ticks.first().map_or(0.0, |t| t.value));
        let hi = map(ticks.last().map_or(1.0, |t| t.value));
        Axis {
            scale,
            ticks,
            lo,
            hi,
            p0: 0.0,
            p1: 1.0,
        }
    }

    /// Page position of `v`; `None` where it cannot be drawn.
    fn pos(&self, v: f64) -> Option<f64> {
        let m = match self.scale {
            AxisScale::Linear => v,
            AxisScale::Log10 if v > 0.0 => v.log10(),
            AxisScale::Log10 => return None,
        };
        if !m.is_finite() || self.hi <= self.lo {
            return None;
        }
        Some(self.p0 + (m - self.lo) / (self.hi - self.lo) * (self.p1 - self.p0))
    }

    /// Minor ticks: 2…9 within each decade of a log axis spanning few
    /// decades (more would be a grey smear); none on a linear axis.
    fn minor(&self) -> Vec<f64> {
        if self.scale != AxisScale::Log10 || self.hi - self.lo > 6.0 {
            return Vec::new();
        }
        let (a, b) = (self.lo.round() as i32, self.hi.round() as i32);
        (a..b)
            .flat_map(|n| (2..10).map(move |k| k as f64 * 10f64.powi(n)))
            .collect()
    }
}

/// True when `v` can be placed on an axis of `scale`.
fn drawable(v: f64, scale: AxisScale) -> bool {
    v.is_finite() && (scale == AxisScale::Linear || v > 0.0)
}

/// Lays out `spec` on a page of `style`'s size.
///
/// The legend goes into the plot corner with the fewest data points under
/// it (ties: fewest lines crossing it, then top right, top left, bottom
/// right, bottom left); when every corner covers data, the middles of the
/// right, left, top and bottom edges are tried, and when those do too it
/// moves to a strip above the plot. Never panics: an empty spec gives empty
/// axes.
pub fn layout_chart(spec: &ChartSpec, style: &Style) -> Scene {
    let entries: Vec<Entry> = spec
        .series
        .iter()
        .enumerate()
        .map(|(i, s)| Entry {
            name: s.name.clone(),
            label: markup::parse(&s.name),
            colour: style.path_colour(i),
            dash: series_dash(style, i),
        })
        .collect();
    let (scene, fits) = build(spec, style, &entries, false);
    if fits {
        scene
    } else {
        build(spec, style, &entries, true).0
    }
}

/// The first series is drawn solid (the eye follows it as the reference);
/// the others take the style's dash patterns in order, as diagram paths do.
fn series_dash(style: &Style, i: usize) -> Option<Vec<f64>> {
    if i == 0 { None } else { style.path_dash(i - 1) }
}

/// A one-line text of markup at a fixed place (axis numbers and titles).
#[allow(clippy::too_many_arguments)]
fn label(
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
        lines: vec![markup::parse(s)],
        ..super::fixed_text(x, y, "", size_pt, anchor, rotation, role, style)
    }
}

/// An axis or tick stroke in ink.
fn stroke(points: Vec<(f64, f64)>, style: &Style, width_pt: f64, role: Role) -> Item {
    super::plain_line(points, style.ink, width_pt, role)
}

/// One pass, with the legend in a strip above the plot or inside it; the
/// flag is false when no spot inside the plot was free of data.
fn build(spec: &ChartSpec, style: &Style, entries: &[Entry], on_top: bool) -> (Scene, bool) {
    let (xs, ys) = (spec.x_scale, spec.y_scale);
    // Each series as runs of consecutive drawable points.
    let runs: Vec<Vec<Vec<(f64, f64)>>> = spec
        .series
        .iter()
        .map(|s| {
            let mut out: Vec<Vec<(f64, f64)>> = vec![Vec::new()];
            for &(x, y) in &s.points {
                if drawable(x, xs) && drawable(y, ys) {
                    out.last_mut().expect("never empty").push((x, y));
                } else if !out.last().expect("never empty").is_empty() {
                    out.push(Vec::new());
                }
            }
            out.retain(|r| !r.is_empty());
            out
        })
        .collect();
    let all = runs.iter().flatten().flatten();
    let x_values: Vec<f64> = all.clone().map(|p| p.0).collect();
    let mut y_values: Vec<f64> = all.map(|p| p.1).collect();
    y_values.extend(spec.y_include.iter().copied().filter(|&v| drawable(v, ys)));
    let mut xa = Axis::new(xs, &x_values);
    let mut ya = Axis::new(ys, &y_values);

    let m = style.margin_mm;
    let em = |pt: f64| pt * text::PT_MM;
    let text_h = |pt: f64| em(pt) * (text::ASCENT + text::DESCENT);
    // Tick marks and their gap to the numbers grow with the type (1 mm and
    // 0.6 mm at 7 pt).
    let tick_len = 0.4 * em(style.tick_pt);
    let gap = 0.25 * em(style.tick_pt);
    let parsed = |t: &Tick| markup::parse(&t.label);
    let y_tick_w = ya
        .ticks
        .iter()
        .map(|t| rich::width_mm(&parsed(t), style.tick_pt))
        .fold(0.0, f64::max);
    let x_first_w = xa
        .ticks
        .first()
        .map_or(0.0, |t| rich::width_mm(&parsed(t), style.tick_pt));
    let x_last_w = xa
        .ticks
        .last()
        .map_or(0.0, |t| rich::width_mm(&parsed(t), style.tick_pt));
    // How far tick labels reach above and below their baseline (the
    // superscripts of 10ⁿ reach above capitals).
    let reach = |a: &Axis| {
        a.ticks.iter().fold(
            (
                text::ASCENT * em(style.tick_pt),
                text::DESCENT * em(style.tick_pt),
            ),
            |(up, down), t| {
                let b = rich::block_box(0.0, 0.0, &[parsed(t)], style.tick_pt, Anchor::Start, 0.0);
                (up.max(-b.y0), down.max(b.y1))
            },
        )
    };
    let (x_up, x_down) = reach(&xa);
    let (y_up, y_down) = reach(&ya);
    let has_y_title = !spec.y_title.trim().is_empty();
    let has_x_title = !spec.x_title.trim().is_empty();
    // The y title's reach across its baseline (a superscript, as in L⁻¹,
    // reaches above capitals), turned on its side.
    let y_title_box = rich::block_box(
        0.0,
        0.0,
        &[markup::parse(&spec.y_title)],
        style.axis_label_pt,
        Anchor::Start,
        0.0,
    );
    let y_title_w = if has_y_title {
        y_title_box.y1 - y_title_box.y0 + 1.0
    } else {
        0.0
    };

    let x0 = (m + y_title_w + y_tick_w + gap + tick_len).max(m + x_first_w / 2.0);
    let x1 = (style.width_mm - m - x_last_w / 2.0).max(x0 + 1.0);
    xa.p0 = x0;
    xa.p1 = x1;
    // A legend above the plot flows over the plot's width.
    let strip_items = if on_top && !entries.is_empty() {
        legend::in_strip(entries, style, x0, x1, m)
    } else {
        Vec::new()
    };
    let strip = strip_items
        .iter()
        .filter_map(|i| match i {
            Item::Text(t) => Some(t.bbox().y1 - m + 0.5),
            _ => None,
        })
        .fold(0.0, f64::max);

    // Marker labels above the plot, in as many rows as they need.
    let mut markers: Vec<(f64, RichLine)> = spec
        .markers
        .iter()
        .filter(|mk| drawable(mk.x, xs))
        .filter_map(|mk| {
            let p = xa.pos(mk.x)?;
            (p >= x0 - 1e-9 && p <= x1 + 1e-9).then(|| (p, markup::parse(&mk.label)))
        })
        .collect();
    markers.sort_by(|a, b| a.0.total_cmp(&b.0));
    let mpt = style.annotation_text_pt;
    let row_h = text::LINE_HEIGHT * em(mpt) + 0.4;
    let mut row_end: Vec<f64> = Vec::new();
    let mut marker_texts = Vec::new();
    for (p, runs) in &markers {
        let w = rich::width_mm(runs, mpt);
        let left = (p - w / 2.0).clamp(m, (style.width_mm - m - w).max(m));
        let row = match row_end.iter().position(|&e| e + 1.0 <= left) {
            Some(r) => r,
            None => {
                row_end.push(f64::NEG_INFINITY);
                row_end.len() - 1
            }
        };
        row_end[row] = left + w;
        marker_texts.push((*p, row, left, runs.clone()));
    }
    let marker_h = row_end.len() as f64 * row_h;
    // Tick labels are centred on their tick by the digits' middle.
    let centre = (text::ASCENT - text::DESCENT) / 2.0 * em(style.tick_pt);
    let y0 = m + strip + marker_h + (y_up - centre) + 0.3;
    let x_title_h = if has_x_title {
        text_h(style.axis_label_pt) + 0.8
    } else {
        0.0
    };
    // The x numbers start below the lowest y number, which reaches under the
    // axis line, so the first ones of both axes never touch in the corner.
    let x_drop = (tick_len + gap).max(centre + y_down + CLEARANCE);
    let y1 = (style.height_mm - m - x_title_h - x_down - x_up - x_drop).max(y0 + 1.0);
    // Page y grows downwards: the lowest value sits at the bottom.
    ya.p0 = y1;
    ya.p1 = y0;

    let mut items: Vec<Item> = Vec::new();
    let mut texts: Vec<Text> = Vec::new();
    // Axes: left and bottom, ticks outside.
    items.push(stroke(
        vec![(x0, y0), (x0, y1), (x1, y1)],
        style,
        style.axis_pt,
        Role::Axis,
    ));
    for t in &ya.ticks {
        let Some(py) = ya.pos(t.value) else { continue };
        items.push(stroke(
            vec![(x0 - tick_len, py), (x0, py)],
            style,
            style.axis_pt,
            Role::Tick,
        ));
        texts.push(label(
            x0 - tick_len - gap,
            py + centre,
            &t.label,
            style.tick_pt,
            Anchor::End,
            0.0,
            Role::TickLabel,
            style,
        ));
    }
    let x_labels: Vec<Text> = xa
        .ticks
        .iter()
        .filter_map(|t| {
            let px = xa.pos(t.value)?;
            items.push(stroke(
                vec![(px, y1), (px, y1 + tick_len)],
                style,
                style.axis_pt,
                Role::Tick,
            ));
            Some(label(
                px,
                y1 + x_drop + x_up,
                &t.label,
                style.tick_pt,
                Anchor::Middle,
                0.0,
                Role::TickLabel,
                style,
            ))
        })
        .collect();
    texts.extend(thinned(x_labels));
    for (a, vertical) in [(&ya, true), (&xa, false)] {
        for v in a.minor() {
            let Some(p) = a.pos(v) else { continue };
            let seg = if vertical {
                vec![(x0 - tick_len * 0.6, p), (x0, p)]
            } else {
                vec![(p, y1), (p, y1 + tick_len * 0.6)]
            };
            items.push(stroke(seg, style, style.axis_pt * 0.7, Role::Tick));
        }
    }
    if has_y_title {
        texts.push(label(
            m - y_title_box.y0,
            (y0 + y1) / 2.0,
            &spec.y_title,
            style.axis_label_pt,
            Anchor::Middle,
            -90.0,
            Role::AxisLabel,
            style,
        ));
    }
    if has_x_title {
        texts.push(label(
            (x0 + x1) / 2.0,
            style.height_mm - m - text::DESCENT * em(style.axis_label_pt),
            &spec.x_title,
            style.axis_label_pt,
            Anchor::Middle,
            0.0,
            Role::AxisLabel,
            style,
        ));
    }

    // Marker lines under the data, labels above the plot.
    let mut segments: Vec<((f64, f64), (f64, f64))> = Vec::new();
    for (p, row, left, runs) in marker_texts {
        items.push(Item::Line(Line {
            points: vec![(p, y0), (p, y1)],
            colour: style.leader,
            width_pt: style.axis_pt,
            dash: Some(vec![1.0, 0.8]),
            role: Role::Annotation,
            tag: None,
        }));
        segments.push(((p, y0), (p, y1)));
        texts.push(Text {
            x: left,
            y: m + strip + row as f64 * row_h + text::ASCENT * em(mpt),
            lines: vec![runs],
            size_pt: mpt,
            anchor: Anchor::Start,
            colour: style.ink,
            rotation: 0.0,
            role: Role::AnnotationText,
            tag: None,
        });
    }

    // Data.
    let mut vertices: Vec<(f64, f64)> = Vec::new();
    for (i, series) in runs.iter().enumerate() {
        for run in series {
            let pts: Vec<(f64, f64)> = run
                .iter()
                .filter_map(|&(x, y)| Some((xa.pos(x)?, ya.pos(y)?)))
                .collect();
            vertices.extend(&pts);
            segments.extend(pts.windows(2).map(|w| (w[0], w[1])));
            if pts.len() < 2 {
                continue;
            }
            items.push(Item::Line(Line {
                points: pts,
                colour: style.path_colour(i),
                width_pt: style.connector_pt * 1.3,
                dash: series_dash(style, i),
                role: Role::Connector,
                tag: Some(Tag::Path(spec.series[i].name.clone())),
            }));
        }
    }
    items.extend(texts.into_iter().map(Item::Text));

    // Legend.
    let mut fits = true;
    if !entries.is_empty() {
        if on_top {
            items.extend(strip_items);
        } else {
            let (w, h) = legend::block_size(entries, style);
            let pad = 1.0;
            let (left, right) = (x0 + pad + tick_len, x1 - pad - w);
            let (top, bottom) = (y0 + pad, y1 - pad - h);
            let (mid_x, mid_y) = ((x0 + x1 - w) / 2.0, (y0 + y1 - h) / 2.0);
            let corners = [
                (right, top),
                (left, top),
                (right, bottom),
                (left, bottom),
                (right, mid_y),
                (left, mid_y),
                (mid_x, top),
                (mid_x, bottom),
            ];
            let plot = Rect { x0, y0, x1, y1 };
            let best = corners
                .iter()
                .enumerate()
                .map(|(k, &(cx, cy))| {
                    let r = Rect {
                        x0: cx,
                        y0: cy,
                        x1: cx + w,
                        y1: cy + h,
                    };
                    let zone = r.inflate(CLEARANCE);
                    let under = vertices
                        .iter()
                        .filter(|&&(vx, vy)| {
                            vx >= zone.x0 && vx <= zone.x1 && vy >= zone.y0 && vy <= zone.y1
                        })
                        .count();
                    let crossing = segments
                        .iter()
                        .filter(|(a, b)| place::segment_hits_rect(*a, *b, &zone))
                        .count();
                    (plot.contains(&r), under, crossing, k, cx, cy)
                })
                .filter(|c| c.0)
                .min_by_key(|c| (c.1, c.2, c.3));
            match best {
                Some((_, 0, 0, _, cx, cy)) => items.extend(legend::block(entries, style, cx, cy)),
                _ => fits = false,
            }
        }
    }

    let scene = Scene {
        width_mm: style.width_mm,
        height_mm: style.height_mm,
        title: spec.title.clone(),
        font_family: style.font_family.clone(),
        items,
    };
    (scene, fits)
}

/// Tick labels along x, every second (third, …) one kept when neighbours
/// would touch; the tick marks stay.
fn thinned(labels: Vec<Text>) -> Vec<Text> {
    for every in 1..=labels.len().max(1) {
        let kept: Vec<&Text> = labels.iter().step_by(every).collect();
        let clear = kept
            .windows(2)
            .all(|w| !w[0].bbox().inflate(CLEARANCE).intersects(&w[1].bbox()));
        if clear {
            return kept.into_iter().cloned().collect();
        }
    }
    labels.into_iter().take(1).collect()
}
