//! Variants drawn over the base profile on the same axes: each variant's bars
//! where its energies differ, and its connectors along the base paths wherever
//! a step touches a changed point, in a colour and dash of its own. Points a
//! variant leaves unchanged are the base bars; drawing them again would hide
//! the base under the variant's colour.

use std::borrow::Cow;

use super::place::Placer;
use super::scene::{Curve, Item, Line, Role, Tag};
use super::{Connector, DiagramSpec, ShownPath, Style, connect, text};

/// One variant as the figure shows it.
#[derive(Debug, Clone, PartialEq)]
pub struct Overlay {
    /// Legend text (the variant's label).
    pub name: String,
    /// The points whose energy differs from the base: index into
    /// [`DiagramSpec::points`], energy in the axis unit, and the formatted
    /// value to print (empty for none).
    pub changed: Vec<(usize, f64, String)>,
}

impl Overlay {
    /// The variant's energy of point `i`, if it differs from the base.
    fn value(&self, i: usize) -> Option<f64> {
        self.changed
            .iter()
            .find(|(p, v, _)| *p == i && v.is_finite())
            .map(|(_, v, _)| *v)
    }
}

/// Style index of overlay `k`: after the base paths, so it takes the next
/// colour and dash of the palette.
pub(super) fn style_index(spec: &DiagramSpec, k: usize) -> usize {
    spec.paths.len() + k
}

/// The spec the legend reads: the base paths, then one row per overlay (a
/// row is listed when its path draws a point, so it borrows the first
/// drawable base point).
pub(super) fn legend_spec(spec: &DiagramSpec) -> Cow<'_, DiagramSpec> {
    if spec.overlays.is_empty() {
        return Cow::Borrowed(spec);
    }
    let mut s = spec.clone();
    let anchor: Vec<usize> = spec
        .points
        .iter()
        .position(|p| p.value.is_finite())
        .into_iter()
        .collect();
    s.paths.extend(spec.overlays.iter().map(|o| ShownPath {
        name: o.name.clone(),
        via: anchor.clone(),
    }));
    Cow::Owned(s)
}

/// The energies the axis must cover for the overlays.
pub(super) fn values(spec: &DiagramSpec) -> impl Iterator<Item = f64> + '_ {
    spec.overlays
        .iter()
        .flat_map(|o| o.changed.iter().map(|c| c.1))
        .filter(|v| v.is_finite())
}

/// Where the base points stand, for drawing the overlays.
pub(super) struct Frame<'a> {
    /// Paths as drawn (drawable points only).
    pub paths: &'a [(usize, Vec<usize>)],
    /// Bar centres, mm.
    pub x: &'a [f64],
    /// Base bar heights, mm.
    pub y: &'a [f64],
    /// Bar lengths, mm.
    pub bar_w: &'a [f64],
    /// Whether each base point is drawn.
    pub drawable: &'a [bool],
}

/// The overlays' connectors and bars. Their bars are blocked for text and
/// their connectors join the segments texts avoid.
pub(super) fn draw(
    spec: &DiagramSpec,
    frame: &Frame<'_>,
    y_of: &dyn Fn(f64) -> f64,
    style: &Style,
    placer: &mut Placer,
) -> Vec<Item> {
    let mut connectors = Vec::new();
    let mut bars = Vec::new();
    let half = style.bar_pt * text::PT_MM / 2.0;
    for (k, o) in spec.overlays.iter().enumerate() {
        let si = style_index(spec, k);
        let tag = Some(Tag::Path(o.name.clone()));
        let y = |i: usize| o.value(i).map_or(frame.y[i], y_of);
        let mut drawn: Vec<(usize, usize)> = Vec::new();
        for (_, via) in frame.paths {
            for w in via.windows(2) {
                let (a, b) = (w[0], w[1]);
                let key = (a.min(b), a.max(b));
                if (o.value(a).is_none() && o.value(b).is_none()) || drawn.contains(&key) {
                    continue;
                }
                drawn.push(key);
                let (xa, xb) = (frame.x[a], frame.x[b]);
                let dir = if xb >= xa { 1.0 } else { -1.0 };
                let from = (xa + dir * frame.bar_w[a] / 2.0, y(a));
                let to = (xb - dir * frame.bar_w[b] / 2.0, y(b));
                connectors.push(connector(from, to, style, si, tag.clone(), placer));
            }
        }
        for &(i, v, _) in &o.changed {
            if i >= frame.x.len() || !frame.drawable[i] || !v.is_finite() {
                continue;
            }
            let (x, yv, w) = (frame.x[i], y_of(v), frame.bar_w[i]);
            bars.push(Item::Line(Line {
                points: vec![(x - w / 2.0, yv), (x + w / 2.0, yv)],
                colour: style.path_colour(si),
                width_pt: style.bar_pt,
                dash: None,
                role: Role::Bar,
                tag: tag.clone(),
            }));
            placer.block(super::Rect {
                x0: x - w / 2.0,
                y0: yv - half,
                x1: x + w / 2.0,
                y1: yv + half,
            });
        }
    }
    connectors.extend(bars);
    connectors
}

/// One connector of style index `si`, its course registered with the placer.
fn connector(
    from: (f64, f64),
    to: (f64, f64),
    style: &Style,
    si: usize,
    tag: Option<Tag>,
    placer: &mut Placer,
) -> Item {
    let (colour, width_pt, dash) = (
        style.path_colour(si),
        style.path_width(si),
        style.path_dash(si),
    );
    match style.connector {
        Connector::Straight => {
            placer.segments.push((from, to));
            Item::Line(Line {
                points: vec![from, to],
                colour,
                width_pt,
                dash,
                role: Role::Connector,
                tag,
            })
        }
        Connector::Smooth => {
            let c = connect::smooth(from, to);
            placer
                .segments
                .extend(connect::flatten(from, &c, connect::CHORDS));
            Item::Curve(Curve {
                start: from,
                segments: vec![c],
                colour,
                width_pt,
                dash,
                role: Role::Connector,
                tag,
            })
        }
    }
}

/// Gives each variant's values its colour (they are placed as values tagged
/// with the variant's name), so a reader can tell which bar a number is for.
pub(super) fn colour_values(items: &mut [Item], spec: &DiagramSpec, style: &Style) {
    for item in items {
        let Item::Text(t) = item else { continue };
        let Some(Tag::Path(name)) = &t.tag else {
            continue;
        };
        if t.role != Role::Value {
            continue;
        }
        if let Some(k) = spec.overlays.iter().position(|o| &o.name == name) {
            t.colour = style.path_colour(style_index(spec, k));
        }
    }
}
