//! Where annotations of computed numbers go: the arrow, bracket and guide
//! lines of each, and the mark their text is placed beside. The numbers are
//! already formatted in the [`super::Annotation`]; placement of the text
//! joins the same collision checks as every other text.

use super::scene::{Colour, Item, Line, Rect, Role, Tag};
use super::{Annotation, Style, text};

/// Where the stationary points sit on the page.
pub struct Geometry<'a> {
    /// Bar centres, mm.
    pub x: &'a [f64],
    /// Bar heights, mm.
    pub y: &'a [f64],
    /// Bar lengths, mm.
    pub bar_w: &'a [f64],
    /// Point ids, for tags.
    pub ids: &'a [String],
    /// Which points are drawn.
    pub drawable: &'a [bool],
    /// Left and right edge of the plot, mm.
    pub plot: (f64, f64),
    /// Bars drawn for no point of the profile (variants): (left, right, y).
    pub others: &'a [(f64, f64, f64)],
}

/// An annotation's drawing, with what the placement must respect.
pub struct Drawn {
    /// Lines to draw.
    pub items: Vec<Item>,
    /// Boxes no text may cover (arrow shafts, brackets).
    pub hard: Vec<Rect>,
    /// Segments texts should preferably not cover (guides).
    pub soft: Vec<((f64, f64), (f64, f64))>,
    /// The vertical mark the text goes beside: (x, top, bottom).
    pub mark: (f64, f64, f64),
}

/// Length of an arrowhead, mm.
const HEAD: f64 = 0.9;
/// Gap between a guide's end and the mark, mm.
const GUIDE_GAP: f64 = 0.0;

/// The possible drawings of `a`, preferred first (the caller takes the
/// first whose text finds a clear spot); empty when its points are not drawn
/// or the annotation has no height to show.
pub fn draw(a: &Annotation, g: &Geometry<'_>, style: &Style) -> Vec<Drawn> {
    let ok = |i: usize| i < g.drawable.len() && g.drawable[i];
    let half_t = style.bar_pt * text::PT_MM / 2.0;
    match *a {
        Annotation::Barrier { from, to, .. }
        | Annotation::Span {
            tdi: from,
            tdts: to,
            ..
        } => {
            if !ok(from) || !ok(to) || g.y[from] - g.y[to] < 2.0 * half_t + 0.5 {
                return Vec::new();
            }
            let tag = Some(Tag::Point(g.ids[to].clone()));
            // At the TS (its centre, else just beside either end of its
            // bar), else over the minimum with a guide from the TS: each
            // place where the arrow crosses no other bar.
            let beside = |p: usize| {
                let half = g.bar_w[p] / 2.0;
                [g.x[p], g.x[p] - half - 0.8, g.x[p] + half + 0.8]
            };
            let within = |p: usize, x: f64| (x - g.x[p]).abs() <= g.bar_w[p] / 2.0;
            let mut out: Vec<Drawn> = Vec::new();
            for x in beside(to).into_iter().chain(beside(from)) {
                let top = if within(to, x) {
                    g.y[to] + half_t
                } else {
                    g.y[to]
                };
                let bottom = g.y[from];
                let seen = out.iter().any(|d| (d.mark.0 - x).abs() < 0.5);
                if seen || crosses_bar(g, x, top, bottom, &[from, to]) {
                    continue;
                }
                let mut d = Drawn {
                    items: double_arrow(x, top, bottom, style.ink, style, tag.clone()),
                    hard: vec![Rect {
                        x0: x - 0.45,
                        y0: top,
                        x1: x + 0.45,
                        y1: bottom,
                    }],
                    soft: Vec::new(),
                    mark: (x, top, bottom),
                };
                guide(&mut d, g, to, x, style, tag.clone());
                guide(&mut d, g, from, x, style, tag.clone());
                out.push(d);
            }
            out
        }
        Annotation::Difference { a, b, .. } => {
            if !ok(a) || !ok(b) || a == b {
                return Vec::new();
            }
            let (hi, lo) = if g.y[a] <= g.y[b] { (a, b) } else { (b, a) };
            let right = (g.x[a] + g.bar_w[a] / 2.0).max(g.x[b] + g.bar_w[b] / 2.0) + 1.2;
            let left = (g.x[a] - g.bar_w[a] / 2.0).min(g.x[b] - g.bar_w[b] / 2.0) - 1.2;
            // Right of both bars unless that leaves no room for the text.
            let sides = if right + 8.0 < g.plot.1 || left - 8.0 < g.plot.0 {
                [(right, -0.8), (left, 0.8)]
            } else {
                [(left, 0.8), (right, -0.8)]
            };
            let (top, bottom) = (g.y[hi], g.y[lo]);
            let tag = Some(Tag::Point(g.ids[hi].clone()));
            sides
                .into_iter()
                .map(|(x, tick)| {
                    let mut d = Drawn {
                        items: vec![line(
                            vec![(x + tick, top), (x, top), (x, bottom), (x + tick, bottom)],
                            style.ink,
                            style.annotation_pt,
                            None,
                            tag.clone(),
                        )],
                        hard: vec![Rect {
                            x0: x.min(x + tick) - 0.2,
                            y0: top - 0.2,
                            x1: x.max(x + tick) + 0.2,
                            y1: bottom + 0.2,
                        }],
                        soft: Vec::new(),
                        mark: (x, top, bottom),
                    };
                    guide(&mut d, g, hi, x, style, tag.clone());
                    guide(&mut d, g, lo, x, style, tag.clone());
                    d
                })
                .collect()
        }
    }
}

/// True when drawing `d` crosses none of the `blocked` boxes (placed texts,
/// bars): its marks may touch bars only at their ends, its guides only where
/// they start.
pub fn clear_of(d: &Drawn, blocked: &[Rect], leaders: &[super::place::Segment]) -> bool {
    let leader_clear = leaders.iter().all(|&(p, q)| {
        d.hard
            .iter()
            .all(|h| !super::place::segment_hits_rect(p, q, h))
            && d.soft
                .iter()
                .all(|&(a, z)| !super::place::segments_cross(p, q, a, z))
    });
    let marks_clear = d.hard.iter().all(|h| {
        let inner = Rect {
            y0: h.y0 + 0.6,
            y1: h.y1 - 0.6,
            ..*h
        };
        blocked.iter().all(|b| !b.intersects(&inner))
    });
    let point = |(x, y): (f64, f64)| Rect {
        x0: x,
        y0: y,
        x1: x,
        y1: y,
    };
    leader_clear
        && marks_clear
        && d.soft.iter().all(|&(a, z)| {
            blocked.iter().all(|b| {
                b.inflate(0.05).contains(&point(a))
                    || !super::place::segment_hits_rect(a, z, &b.inflate(-0.05))
            })
        })
}

/// True when a vertical line at `x` from `top` to `bottom` passes through
/// the bar of a point other than `except`, or through a variant's bar.
fn crosses_bar(g: &Geometry<'_>, x: f64, top: f64, bottom: f64, except: &[usize]) -> bool {
    let hits = |x0: f64, x1: f64, y: f64| {
        x >= x0 - 0.3 && x <= x1 + 0.3 && y > top - 0.3 && y < bottom + 0.3
    };
    (0..g.x.len()).any(|i| {
        g.drawable[i]
            && !except.contains(&i)
            && hits(g.x[i] - g.bar_w[i] / 2.0, g.x[i] + g.bar_w[i] / 2.0, g.y[i])
    }) || g.others.iter().any(|&(x0, x1, y)| hits(x0, x1, y))
}

/// A dotted guide at point `p`'s height from its bar to `x`, if the bar does
/// not already reach it.
fn guide(d: &mut Drawn, g: &Geometry<'_>, p: usize, x: f64, style: &Style, tag: Option<Tag>) {
    let (l, r) = (g.x[p] - g.bar_w[p] / 2.0, g.x[p] + g.bar_w[p] / 2.0);
    let y = g.y[p];
    let from = if x > r {
        r
    } else if x < l {
        l
    } else {
        return;
    };
    let to = if x > from {
        x + GUIDE_GAP
    } else {
        x - GUIDE_GAP
    };
    d.soft.push(((from, y), (to, y)));
    d.items.push(line(
        vec![(from, y), (to, y)],
        style.leader,
        style.annotation_pt * 0.8,
        Some(vec![0.3, 0.5]),
        tag,
    ));
}

/// A vertical double-headed arrow from `top` to `bottom` at `x`: a shaft and
/// two open heads (lines only, so every format draws them alike).
pub fn double_arrow(
    x: f64,
    top: f64,
    bottom: f64,
    colour: Colour,
    style: &Style,
    tag: Option<Tag>,
) -> Vec<Item> {
    let head = HEAD.min((bottom - top) / 3.0);
    let half = head * 0.55;
    let w = style.annotation_pt;
    vec![
        line(vec![(x, top), (x, bottom)], colour, w, None, tag.clone()),
        line(
            vec![(x - half, top + head), (x, top), (x + half, top + head)],
            colour,
            w,
            None,
            tag.clone(),
        ),
        line(
            vec![
                (x - half, bottom - head),
                (x, bottom),
                (x + half, bottom - head),
            ],
            colour,
            w,
            None,
            tag,
        ),
    ]
}

fn line(
    points: Vec<(f64, f64)>,
    colour: Colour,
    width_pt: f64,
    dash: Option<Vec<f64>>,
    tag: Option<Tag>,
) -> Item {
    Item::Line(Line {
        points,
        colour,
        width_pt,
        dash,
        role: Role::Annotation,
        tag,
    })
}
