//! The key of path names: a line sample in each path's colour and dash, then
//! its name. Shown only when there is more than one path, placed where it
//! covers no text, no bar and as few connectors as possible.

use super::place::Placer;
use super::scene::{Anchor, Colour, Item, Line, Rect, RichLine, Role, Run, Tag, Text};
use super::{DiagramSpec, Style, rich, text};

/// One legend row.
#[derive(Debug, Clone, PartialEq)]
pub struct Entry {
    /// Path name.
    pub name: String,
    /// The name as drawn (plain for path names; charts pass parsed markup).
    pub label: RichLine,
    /// Path colour.
    pub colour: Colour,
    /// Path dash pattern.
    pub dash: Option<Vec<f64>>,
}

/// The region a floating legend may use, mm.
#[derive(Debug, Clone, Copy)]
pub struct Area {
    /// Left.
    pub x0: f64,
    /// Right.
    pub x1: f64,
    /// Top.
    pub y0: f64,
    /// Bottom.
    pub y1: f64,
}

/// Length of the line sample, mm.
const SAMPLE: f64 = 5.0;
/// Gap between sample and name, mm.
const GAP: f64 = 1.0;

/// Entries for the paths that draw at least one point, in path order.
pub fn entries(spec: &DiagramSpec, style: &Style) -> Vec<Entry> {
    spec.paths
        .iter()
        .enumerate()
        .filter(|(_, p)| {
            p.via
                .iter()
                .any(|&v| v < spec.points.len() && spec.points[v].value.is_finite())
        })
        .map(|(i, p)| Entry {
            name: p.name.clone(),
            label: vec![Run::plain(p.name.clone())],
            colour: style.path_colour(i),
            dash: style.path_dash(i),
        })
        .collect()
}

fn row_height(style: &Style) -> f64 {
    style.tick_pt * text::PT_MM * text::LINE_HEIGHT + 0.3
}

fn entry_width(e: &Entry, style: &Style) -> f64 {
    SAMPLE + GAP + rich::width_mm(&e.label, style.tick_pt)
}

/// Items of one entry whose row's top-left corner is `(x, y)`.
fn entry_items(e: &Entry, style: &Style, x: f64, y: f64) -> [Item; 2] {
    let em = style.tick_pt * text::PT_MM;
    let baseline =
        y + (row_height(style) - (text::ASCENT + text::DESCENT) * em) / 2.0 + text::ASCENT * em;
    let mid = baseline - (text::ASCENT - text::DESCENT) / 2.0 * em;
    [
        Item::Line(Line {
            points: vec![(x, mid), (x + SAMPLE, mid)],
            colour: e.colour,
            width_pt: style.connector_pt * 1.3,
            dash: e.dash.clone(),
            role: Role::LegendSample,
            tag: Some(Tag::Path(e.name.clone())),
        }),
        Item::Text(Text {
            x: x + SAMPLE + GAP,
            y: baseline,
            lines: vec![e.label.clone()],
            size_pt: style.tick_pt,
            anchor: Anchor::Start,
            colour: style.ink,
            rotation: 0.0,
            role: Role::LegendText,
            tag: Some(Tag::Path(e.name.clone())),
        }),
    ]
}

/// Rows of a horizontal legend flowing over `width`: entry indices per row.
fn flow(entries: &[Entry], style: &Style, width: f64) -> Vec<Vec<usize>> {
    let mut rows: Vec<Vec<usize>> = vec![Vec::new()];
    let mut used = 0.0;
    for (i, e) in entries.iter().enumerate() {
        let w = entry_width(e, style) + 2.5;
        if used + w > width && !rows.last().unwrap().is_empty() {
            rows.push(Vec::new());
            used = 0.0;
        }
        rows.last_mut().unwrap().push(i);
        used += w;
    }
    rows
}

/// Height of the strip a horizontal legend needs across a full page width.
pub fn strip_height(entries: &[Entry], style: &Style) -> f64 {
    // The plot area is narrower than the page; flowing over 70 % of the page
    // is a safe upper bound on the rows needed.
    flow(entries, style, style.width_mm * 0.7).len() as f64 * row_height(style) + 0.5
}

/// A horizontal legend in a strip reserved at the top of the page.
pub fn in_strip(entries: &[Entry], style: &Style, x0: f64, x1: f64, top: f64) -> Vec<Item> {
    let mut items = Vec::new();
    for (r, row) in flow(entries, style, x1 - x0).iter().enumerate() {
        let mut x = x0;
        for &i in row {
            items.extend(entry_items(
                &entries[i],
                style,
                x,
                top + r as f64 * row_height(style),
            ));
            x += entry_width(&entries[i], style) + 2.5;
        }
    }
    items
}

/// A vertical legend inside `area` where it fits; corners are preferred,
/// then any spot clear of connectors, then the spot crossing fewest.
pub fn floating(
    entries: &[Entry],
    style: &Style,
    area: &Area,
    placer: &Placer,
) -> Option<Vec<Item>> {
    let (w, h) = block_size(entries, style);
    if area.x1 - area.x0 < w || area.y1 - area.y0 < h {
        return None;
    }
    let pad = 0.5;
    let (xl, xr) = (area.x0 + pad, area.x1 - w - pad);
    let (yt, yb) = (area.y0 + pad, area.y1 - h - pad);
    let mut spots = vec![(xr, yt), (xl, yt), (xr, yb), (xl, yb)];
    let step = 1.0;
    let nx = ((xr - xl) / step).floor().max(0.0) as usize;
    let ny = ((yb - yt) / step).floor().max(0.0) as usize;
    let mut grid = Vec::new();
    for iy in 0..=ny {
        for ix in 0..=nx {
            let (gx, gy) = (xr - ix as f64 * step, yt + iy as f64 * step);
            grid.push(((ix + iy) as f64, gx, gy));
        }
    }
    grid.sort_by(|a, b| a.0.total_cmp(&b.0));
    spots.extend(grid.into_iter().map(|(_, gx, gy)| (gx, gy)));
    let mut best: Option<(usize, f64, f64)> = None;
    for (gx, gy) in spots {
        let r = Rect {
            x0: gx,
            y0: gy,
            x1: gx + w,
            y1: gy + h,
        };
        if !placer.fits(&r) {
            continue;
        }
        let crossings = placer.crossings(&r);
        if best.is_none_or(|(c, _, _)| crossings < c) {
            best = Some((crossings, gx, gy));
            if crossings == 0 {
                break;
            }
        }
    }
    let (_, bx, by) = best?;
    Some(block(entries, style, bx, by))
}

/// Width and height of the vertical legend block, mm.
pub(super) fn block_size(entries: &[Entry], style: &Style) -> (f64, f64) {
    let w = entries
        .iter()
        .map(|e| entry_width(e, style))
        .fold(0.0, f64::max);
    (w, entries.len() as f64 * row_height(style))
}

/// The vertical legend block with its top-left corner at `(x, y)`.
pub(super) fn block(entries: &[Entry], style: &Style, x: f64, y: f64) -> Vec<Item> {
    let mut items = Vec::new();
    for (i, e) in entries.iter().enumerate() {
        items.extend(entry_items(e, style, x, y + i as f64 * row_height(style)));
    }
    items
}
