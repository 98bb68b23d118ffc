//! Collision-checked placement of text. Every text gets a list of candidate
//! positions in order of preference; the first one that fits (inside the
//! page, clear of every placed text and bar) wins, with a penalty for each
//! connector it would cover. If no nearby spot fits, a wider search moves the
//! text away and the caller draws a leader line back to its bar.

use super::scene::{Anchor, Rect, RichLine, Run};
use super::{rich, text};
use std::sync::OnceLock;

/// Gap kept between any two texts, and between a text and a bar, in mm.
pub const CLEARANCE: f64 = 0.3;
/// Cost of covering one connector, in mm of displacement.
const CROSSING_COST: f64 = 5.0;
/// How far (mm) a value or label may sit from its bar's line and still read
/// as attached to it without a leader line.
pub const ATTACH_MM: f64 = 2.0;

/// True when a text box `r` reads as belonging to the bar `(x0, x1, y)`:
/// it overlaps the bar horizontally and its near edge is within
/// [`ATTACH_MM`] of the bar's line, not counting the bar's own other texts
/// (`own`) stacked in between (a label over its value reads as one block).
pub fn attached(r: &Rect, bar: (f64, f64, f64), own: &[Rect]) -> bool {
    let (x0, x1, y) = bar;
    let overlaps = |a: &Rect| a.x1 > x0 && a.x0 < x1;
    let above = r.y1 <= y;
    let mut gap = if above { y - r.y1 } else { r.y0 - y }.max(0.0);
    for o in own.iter().filter(|o| overlaps(o)) {
        let between = if above {
            o.y0 >= r.y1 - 1e-9 && o.y1 <= y + 1e-9
        } else {
            o.y1 <= r.y0 + 1e-9 && o.y0 >= y - 1e-9
        };
        if between {
            gap -= o.y1 - o.y0 + CLEARANCE;
        }
    }
    overlaps(r) && gap <= ATTACH_MM
}

/// A possible position for a text block.
#[derive(Debug, Clone, PartialEq)]
pub struct Candidate {
    /// x of the anchor, mm.
    pub x: f64,
    /// First baseline, mm.
    pub y: f64,
    /// The lines as they would be set.
    pub lines: Vec<RichLine>,
    /// Font size in pt.
    pub size_pt: f64,
    /// Horizontal alignment.
    pub anchor: Anchor,
    /// True when the text is far from its owner and needs a leader line.
    pub leader: bool,
    /// Preference cost (lower is better), in mm of displacement.
    pub cost: f64,
}

impl Candidate {
    /// The box the text would occupy.
    pub fn bbox(&self) -> Rect {
        rich::block_box(self.x, self.y, &self.lines, self.size_pt, self.anchor, 0.0)
    }
}

/// Obstacles on the page.
#[derive(Debug, Clone)]
pub struct Placer {
    /// Where text may go at all.
    pub bounds: Rect,
    /// Boxes no text may touch (placed texts, bars, axis zone).
    pub blocked: Vec<Rect>,
    /// Segments a text should preferably not cover (connectors, leaders).
    pub segments: Vec<((f64, f64), (f64, f64))>,
    /// Leaders drawn so far: no later text may cover one (a leader through
    /// a text seems to point at it).
    pub leaders: Vec<((f64, f64), (f64, f64))>,
}

impl Placer {
    /// True when `r` fits: inside the bounds and clear of every blocked box.
    pub fn fits(&self, r: &Rect) -> bool {
        self.bounds.contains(r)
            && self
                .blocked
                .iter()
                .all(|b| !b.intersects(&r.inflate(CLEARANCE)))
            && self
                .leaders
                .iter()
                .all(|(a, b)| !segment_hits_rect(*a, *b, r))
    }

    /// How many soft segments cross `r`. The box's edges are glyph side
    /// bearings and line spacing: a connector that only clips them does not
    /// touch the ink.
    pub fn crossings(&self, r: &Rect) -> usize {
        let ink = r.inflate(-0.25);
        self.segments
            .iter()
            .filter(|(a, b)| segment_hits_rect(*a, *b, &ink))
            .count()
    }

    /// The best fitting candidate: lowest preference cost + crossing
    /// penalty; `candidates` must be sorted by cost.
    ///
    /// `origin` is where a leader line would start (the bar), anywhere
    /// within `reach` of it horizontally (along the bar); a candidate whose
    /// leader would cut through a placed text or bar is rejected.
    pub fn choose_from(
        &self,
        candidates: &[Candidate],
        origin: (f64, f64),
        reach: f64,
    ) -> Option<Candidate> {
        self.choose(candidates, origin, reach, false)
    }

    /// [`Placer::choose_from`] for a text that must not cover any segment
    /// (an annotation's number read across a connector is easily misread):
    /// a crossing rules a spot out instead of adding a penalty, and the
    /// search with a leader goes no farther than [`CLEAR_RING_RADIUS`].
    pub fn choose_clear(
        &self,
        candidates: &[Candidate],
        origin: (f64, f64),
        reach: f64,
    ) -> Option<Candidate> {
        self.choose(candidates, origin, reach, true)
    }

    fn choose(
        &self,
        candidates: &[Candidate],
        origin: (f64, f64),
        reach: f64,
        clear: bool,
    ) -> Option<Candidate> {
        // Total cost of a text at box `r`, or `None` where it may not go.
        let cost_at = |r: &Rect, needs_leader: bool, cost: f64| -> Option<f64> {
            if !self.fits(r) {
                return None;
            }
            if needs_leader {
                let (origin, to) = leader(origin, reach, r);
                let cuts = self.leader_cuts(origin, to);
                // A clear text's leader crosses no line either: a reader
                // follows it to the wrong owner.
                let crosses = clear
                    && self
                        .segments
                        .iter()
                        .any(|&(a, b)| segments_cross(origin, to, a, b));
                if cuts || crosses {
                    return None;
                }
            }
            let crossings = self.crossings(r);
            if clear && crossings > 0 {
                return None;
            }
            Some(cost + CROSSING_COST * crossings as f64)
        };
        // Measuring text is the slow part: candidates differ mostly by
        // position, so each setting is measured once and shifted.
        let mut shapes: Vec<(&Candidate, Rect)> = Vec::new();
        let mut best: Option<(f64, Candidate)> = None;
        for c in candidates {
            if best.as_ref().is_some_and(|(cost, _)| c.cost >= *cost) {
                break; // sorted by cost: nothing later can beat it
            }
            let same = |s: &&Candidate| {
                s.size_pt == c.size_pt && s.anchor == c.anchor && s.lines == c.lines
            };
            let r = match shapes.iter().find(|(s, _)| same(s)) {
                Some((s, r)) => shifted(r, c.x - s.x, c.y - s.y),
                None => {
                    let r = c.bbox();
                    shapes.push((c, r));
                    r
                }
            };
            if let Some(total) = cost_at(&r, c.leader, c.cost)
                && best.as_ref().is_none_or(|(b, _)| total < *b)
            {
                best = Some((total, c.clone()));
            }
        }
        // The search ring around the origin (far away, with a leader), tried
        // one spot at a time and only while it can still win: most texts
        // never get here.
        let first = candidates.first()?;
        let size = candidates
            .iter()
            .map(|c| c.size_pt)
            .fold(first.size_pt, f64::min);
        // At the smallest size, the narrowest setting (most lines).
        let narrowest = candidates
            .iter()
            .filter(|c| c.size_pt == size)
            .max_by_key(|c| c.lines.len())
            .unwrap_or(first);
        let extra = (first.size_pt - size).max(0.0) * PER_PT_SMALLER;
        let em = size * text::PT_MM;
        let dy0 = (text::ASCENT - text::DESCENT) * em / 2.0;
        let shape = rich::block_box(0.0, 0.0, &narrowest.lines, size, Anchor::Middle, 0.0);
        for &(dx, dy, d) in ring_offsets() {
            let cost = d + extra;
            if best.as_ref().is_some_and(|(b, _)| cost >= *b) || (clear && d > CLEAR_RING_COST) {
                break;
            }
            let (x, y) = (origin.0 + dx, origin.1 + dy + dy0);
            if let Some(total) = cost_at(&shifted(&shape, x, y), true, cost)
                && best.as_ref().is_none_or(|(b, _)| total < *b)
            {
                let c = Candidate {
                    x,
                    y,
                    lines: narrowest.lines.clone(),
                    size_pt: size,
                    anchor: Anchor::Middle,
                    leader: true,
                    cost,
                };
                best = Some((total, c));
            }
        }
        best.map(|(_, c)| c)
    }

    #[cfg(test)]
    fn choose_at(&self, candidates: &[Candidate]) -> Option<Candidate> {
        self.choose_from(candidates, (40.0, 30.0), 0.0)
    }

    /// True when a leader from `origin` (on its bar) to `to` would cut
    /// through a placed text or another bar.
    pub fn leader_cuts(&self, origin: (f64, f64), to: (f64, f64)) -> bool {
        let at = Rect {
            x0: origin.0,
            y0: origin.1,
            x1: origin.0,
            y1: origin.1,
        };
        self.blocked
            .iter()
            .any(|b| !b.inflate(0.05).contains(&at) && segment_hits_rect(origin, to, b))
    }

    /// Marks `r` as taken.
    pub fn block(&mut self, r: Rect) {
        self.blocked.push(r);
    }
}

/// `r` moved by `(dx, dy)`.
fn shifted(r: &Rect, dx: f64, dy: f64) -> Rect {
    Rect {
        x0: r.x0 + dx,
        y0: r.y0 + dy,
        x1: r.x1 + dx,
        y1: r.y1 + dy,
    }
}

/// The leader from a bar at `origin` (± `reach` along it) to the box `r`:
/// from the bar point below or above the box's nearest edge, to the box.
pub fn leader(origin: (f64, f64), reach: f64, r: &Rect) -> ((f64, f64), (f64, f64)) {
    let centre = (r.x0 + r.x1) / 2.0;
    let from = (centre.clamp(origin.0 - reach, origin.0 + reach), origin.1);
    (from, r.nearest(from.0, from.1))
}

/// True when segments p–q and a–b cross (proper intersection; touching
/// ends do not count, so a leader may start where a connector ends).
fn segments_cross(p: (f64, f64), q: (f64, f64), a: (f64, f64), b: (f64, f64)) -> bool {
    let side = |o: (f64, f64), u: (f64, f64), v: (f64, f64)| {
        (u.0 - o.0) * (v.1 - o.1) - (u.1 - o.1) * (v.0 - o.0)
    };
    let (d1, d2) = (side(a, b, p), side(a, b, q));
    let (d3, d4) = (side(p, q, a), side(p, q, b));
    d1 * d2 < 0.0 && d3 * d4 < 0.0
}

/// True when the segment a–b passes through the interior of `r`
/// (Liang–Barsky clipping).
pub fn segment_hits_rect(a: (f64, f64), b: (f64, f64), r: &Rect) -> bool {
    let (dx, dy) = (b.0 - a.0, b.1 - a.1);
    let mut t0: f64 = 0.0;
    let mut t1: f64 = 1.0;
    for (p, q) in [
        (-dx, a.0 - r.x0),
        (dx, r.x1 - a.0),
        (-dy, a.1 - r.y0),
        (dy, r.y1 - a.1),
    ] {
        if p == 0.0 {
            if q <= 0.0 {
                return false;
            }
        } else {
            let t = q / p;
            if p < 0.0 {
                t0 = t0.max(t);
            } else {
                t1 = t1.min(t);
            }
        }
    }
    t0 < t1
}

/// Where a text block sits relative to its bar.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Side {
    /// Above the bar.
    Above,
    /// Below the bar.
    Below,
}

/// What to place and where it belongs.
#[derive(Debug, Clone)]
pub struct Request<'a> {
    /// Centre of the bar, mm.
    pub x: f64,
    /// Height of the bar, mm.
    pub y: f64,
    /// Half the bar's stroke, mm (texts keep clear of it).
    pub half_thickness: f64,
    /// Preferred side.
    pub side: Side,
    /// The text as styled runs.
    pub text: &'a [Run],
    /// Preferred size, pt.
    pub size_pt: f64,
    /// Smallest allowed size, pt.
    pub min_pt: f64,
    /// Whether line breaks may be tried.
    pub breakable: bool,
}

/// Preference costs, in "mm of displacement" so they add up with distance.
const OTHER_SIDE: f64 = 2.0;
/// Above its own other text; dearer than the other side of the bar.
const STACK_LEVEL: f64 = 3.0;
const EXTRA_LINE: f64 = 2.0;
/// Shrinking one text alone makes it look out of place: dearer than moving
/// it, so the whole figure shrinks instead (see `layout`) unless only a
/// smaller size fits.
const PER_PT_SMALLER: f64 = 6.0;
const FAR_AWAY: f64 = 8.0;
/// How far (mm) a text may be moved from its bar, with a leader line;
/// farther, it no longer reads as belonging to its bar.
const RING_RADIUS: f64 = 12.0;
/// How far (mm) a text that must stay clear of lines may move from its mark,
/// with a leader: an annotation's number much farther than this reads as
/// belonging to something else, so it is left out instead.
const CLEAR_RING_RADIUS: f64 = RING_RADIUS;
/// The ring cost of a spot at [`CLEAR_RING_RADIUS`] (ring costs grow with
/// the distance and are sorted, so the search stops there).
const CLEAR_RING_COST: f64 = FAR_AWAY + CLEAR_RING_RADIUS;
/// The last resort before a text is left out: anywhere this near, at a
/// cost that puts it after every nearer spot.
const LAST_RESORT_RADIUS: f64 = 32.0;

/// Candidates for `req`, best first. Each gets a preference cost: distance
/// moved from the default spot, plus fixed costs for switching side,
/// stacking past the other text, breaking lines and shrinking. The search
/// ring around the bar (far away, with a leader line) is added lazily by
/// [`Placer::choose_from`].
pub fn candidates(req: &Request<'_>) -> Vec<Candidate> {
    let mut sizes = vec![req.size_pt];
    // One step only: a text much smaller than its neighbours looks out of
    // place; the whole figure shrinks instead (see `layout`).
    let smaller = (req.size_pt * 0.9 * 10.0).round() / 10.0;
    if smaller >= req.min_pt - 1e-9 && smaller < req.size_pt {
        sizes.push(smaller);
    }
    let other = match req.side {
        Side::Above => Side::Below,
        Side::Below => Side::Above,
    };
    let mut out: Vec<(f64, Candidate)> = Vec::new();
    let gap = 0.35;
    let nudges = [0.0, -0.15, 0.15, -0.3, 0.3, -0.45, 0.45, -0.6, 0.6];
    for (side, stack) in [(req.side, 0usize), (other, 0), (other, 1), (req.side, 1)] {
        for &size in &sizes {
            let em = size * text::PT_MM;
            for lines in &breaks_of(req, size) {
                let w = lines
                    .iter()
                    .map(|l| rich::width_mm(l, size))
                    .fold(0.0, f64::max);
                let n = lines.len() as f64;
                // One stack level is one line of the other text (value or label).
                let offset = gap + stack as f64 * (text::LINE_HEIGHT * em + 0.6);
                let base = if side == req.side { 0.0 } else { OTHER_SIDE }
                    + stack as f64 * STACK_LEVEL
                    + (n - 1.0) * EXTRA_LINE
                    + (req.size_pt - size) * PER_PT_SMALLER;
                for &f in &nudges {
                    let y = match side {
                        Side::Above => {
                            req.y
                                - req.half_thickness
                                - offset
                                - text::DESCENT * em
                                - (n - 1.0) * text::LINE_HEIGHT * em
                        }
                        Side::Below => req.y + req.half_thickness + offset + text::ASCENT * em,
                    };
                    out.push((
                        base + (f * w).abs(),
                        Candidate {
                            x: req.x + f * w,
                            y,
                            lines: lines.clone(),
                            size_pt: size,
                            anchor: Anchor::Middle,
                            leader: false,
                            cost: 0.0,
                        },
                    ));
                }
            }
        }
    }
    // Stable sort: equal costs keep generation order, so output is deterministic.
    out.sort_by(|a, b| a.0.total_cmp(&b.0));
    out.into_iter()
        .map(|(cost, c)| Candidate { cost, ..c })
        .collect()
}

/// Offsets of the search ring for a text that needs a leader line, with
/// their cost, cheapest first: a fine grid within [`RING_RADIUS`], then a
/// coarser one out to [`LAST_RESORT_RADIUS`] after every nearer spot.
fn ring_offsets() -> &'static [(f64, f64, f64)] {
    static OFFSETS: OnceLock<Vec<(f64, f64, f64)>> = OnceLock::new();
    OFFSETS.get_or_init(|| {
        let mut out = Vec::new();
        for (lo, hi, step, tier) in [
            (2.0, RING_RADIUS, 0.8, 0.0),
            (RING_RADIUS, LAST_RESORT_RADIUS, 1.6, 2.0 * RING_RADIUS),
        ] {
            let reach = (hi / step).ceil() as i32;
            for iy in -reach..=reach {
                for ix in -reach..=reach {
                    let (dx, dy) = (ix as f64 * step, iy as f64 * step);
                    let d = (dx * dx + dy * dy).sqrt();
                    let inside = if tier > 0.0 { d > lo } else { d >= lo };
                    if inside && d <= hi {
                        out.push((dx, dy, FAR_AWAY + tier + d));
                    }
                }
            }
        }
        // Stable sort: equal costs keep generation order (deterministic).
        out.sort_by(|a, b| a.2.total_cmp(&b.2));
        out
    })
}

/// Candidates for a text block beside a vertical mark (an arrow or bracket)
/// from `y_top` to `y_bottom` at `x`: right of it first, then left, centred
/// on the mark's middle and sliding along it; then the same with each
/// "name = value" line broken after the "=" (narrower, to fit between
/// connectors). [`Placer::choose_from`] adds the far-away ring.
pub fn beside(x: f64, y_top: f64, y_bottom: f64, lines: &[RichLine], size: f64) -> Vec<Candidate> {
    let em = size * text::PT_MM;
    // Whole, then the widest line broken, then every line.
    let mut settings = vec![lines.to_vec()];
    let widest = (0..lines.len()).max_by(|&a, &b| {
        rich::width_mm(&lines[a], size).total_cmp(&rich::width_mm(&lines[b], size))
    });
    let mut one = Vec::new();
    for (i, l) in lines.iter().enumerate() {
        if Some(i) == widest {
            one.extend(break_after_equals(l));
        } else {
            one.push(l.clone());
        }
    }
    let all: Vec<RichLine> = lines.iter().flat_map(break_after_equals).collect();
    for set in [one, all] {
        if !settings.contains(&set) {
            settings.push(set);
        }
    }
    // Clear of the mark's blocked box (half its 0.9 mm) and the clearance.
    let gap = 0.45 + CLEARANCE + 0.1;
    let len = (y_bottom - y_top).abs();
    let mut out: Vec<(f64, Candidate)> = Vec::new();
    for (extra, set) in settings.iter().enumerate() {
        let n = set.len().max(1) as f64;
        // Baseline of the first line that centres the block on height `yc`.
        let block_h = (n - 1.0) * text::LINE_HEIGHT * em;
        let first_baseline =
            |yc: f64| yc - block_h / 2.0 + (text::ASCENT - text::DESCENT) * em / 2.0;
        for (side, anchor, dx) in [(0.0, Anchor::Start, gap), (OTHER_SIDE, Anchor::End, -gap)] {
            for f in [0.5, 0.4, 0.6, 0.3, 0.7, 0.2, 0.8, 0.1, 0.9, 0.0, 1.0] {
                let yc = y_top + f * (y_bottom - y_top);
                out.push((
                    side + (f - 0.5f64).abs() * len + extra as f64 * EXTRA_LINE,
                    Candidate {
                        x: x + dx,
                        y: first_baseline(yc),
                        lines: set.clone(),
                        size_pt: size,
                        anchor,
                        leader: false,
                        cost: 0.0,
                    },
                ));
            }
        }
        // Under the mark's foot or over its head, where the connectors
        // beside it often leave no room.
        let below = y_bottom.max(y_top) + gap + text::ASCENT * em;
        let above = y_top.min(y_bottom) - gap - text::DESCENT * em - block_h;
        for (end, y) in [(END_COST, below), (END_COST + 0.5, above)] {
            for (anchor, dx) in [
                (Anchor::Middle, 0.0f64),
                (Anchor::End, 1.5),
                (Anchor::Start, -1.5),
            ] {
                out.push((
                    end + dx.abs() + extra as f64 * EXTRA_LINE,
                    Candidate {
                        x: x + dx,
                        y,
                        lines: set.clone(),
                        size_pt: size,
                        anchor,
                        leader: false,
                        cost: 0.0,
                    },
                ));
            }
        }
    }
    out.sort_by(|a, b| a.0.total_cmp(&b.0));
    out.into_iter()
        .map(|(cost, c)| Candidate { cost, ..c })
        .collect()
}

/// Cost of a text under or over its mark instead of beside it.
const END_COST: f64 = 4.0;

/// `line` broken after its first "= " ("ΔG‡ =" / "20.0"), or kept whole.
fn break_after_equals(line: &RichLine) -> Vec<RichLine> {
    for (i, run) in line.iter().enumerate() {
        if let Some(at) = run.text.find("= ") {
            let mut head: RichLine = line[..i].to_vec();
            let mut tail: RichLine = Vec::new();
            let (a, b) = run.text.split_at(at + 1);
            head.push(Run {
                text: a.to_string(),
                ..run.clone()
            });
            let rest = b.trim_start();
            if !rest.is_empty() {
                tail.push(Run {
                    text: rest.to_string(),
                    ..run.clone()
                });
            }
            tail.extend(line[i + 1..].iter().cloned());
            if tail.is_empty() {
                break;
            }
            return vec![head, tail];
        }
    }
    vec![line.clone()]
}

/// The ways `req`'s text may be set at `size`: one line, or its breaks.
fn breaks_of(req: &Request<'_>, size: f64) -> Vec<Vec<RichLine>> {
    if req.breakable {
        rich::line_breaks(req.text, size)
    } else {
        vec![vec![req.text.to_vec()]]
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn placer() -> Placer {
        Placer {
            bounds: Rect {
                x0: 0.0,
                y0: 0.0,
                x1: 85.0,
                y1: 65.0,
            },
            blocked: Vec::new(),
            segments: Vec::new(),
            leaders: Vec::new(),
        }
    }

    fn req(text: &str, side: Side) -> Request<'static> {
        let runs: &'static [Run] = Box::leak(vec![Run::plain(text)].into_boxed_slice());
        Request {
            x: 40.0,
            y: 30.0,
            half_thickness: 0.35,
            side,
            text: runs,
            size_pt: 7.0,
            min_pt: 5.0,
            breakable: true,
        }
    }

    #[test]
    fn free_page_takes_the_preferred_spot() {
        let p = placer();
        let c = candidates(&req("radical pair", Side::Below));
        let chosen = p.choose_at(&c).unwrap();
        assert_eq!(chosen, c[0]);
        assert!(chosen.bbox().y0 > 30.35);
        let c = candidates(&req("+14.2", Side::Above));
        assert!(p.choose_at(&c).unwrap().bbox().y1 < 29.65);
    }

    #[test]
    fn a_taken_spot_moves_the_text_and_never_overlaps() {
        let mut p = placer();
        let first = candidates(&req("radical pair", Side::Below));
        let a = p.choose_at(&first).unwrap().bbox();
        p.block(a);
        // The same text again cannot go on top of the first.
        let again = p.choose_at(&first).unwrap().bbox();
        assert!(!again.intersects(&a));
        p.block(again);
        let mut placed = 2;
        while let Some(c) = p.choose_at(&first) {
            let r = c.bbox();
            assert!(p.blocked.iter().all(|b| !b.intersects(&r)));
            p.block(r);
            placed += 1;
        }
        // Several copies fit around the bar before leaders would cut through
        // the earlier ones.
        assert!(placed >= 5, "{placed}");
    }

    #[test]
    fn connectors_push_text_aside() {
        let mut p = placer();
        let c = candidates(&req("TS-recombination", Side::Below));
        let default = c[0].bbox();
        // A connector straight through the default spot.
        p.segments.push((
            (default.x0 - 1.0, default.y1),
            (default.x1 + 1.0, default.y0),
        ));
        let chosen = p.choose_at(&c).unwrap().bbox();
        assert_ne!(chosen, default);
        assert_eq!(p.crossings(&chosen), 0);
    }

    #[test]
    fn nothing_fits_in_a_full_page() {
        let mut p = placer();
        p.block(Rect {
            x0: 0.0,
            y0: 0.0,
            x1: 85.0,
            y1: 65.0,
        });
        assert!(p.choose_at(&candidates(&req("x", Side::Above))).is_none());
    }

    #[test]
    fn segments_cross_only_properly() {
        // Closed form: the diagonals of a square cross at its centre.
        assert!(segments_cross(
            (0.0, 0.0),
            (2.0, 2.0),
            (0.0, 2.0),
            (2.0, 0.0)
        ));
        assert!(!segments_cross(
            (0.0, 0.0),
            (1.0, 1.0),
            (0.0, 2.0),
            (2.0, 2.0)
        ));
        // Meeting at an end point is not a crossing.
        assert!(!segments_cross(
            (0.0, 0.0),
            (1.0, 1.0),
            (1.0, 1.0),
            (2.0, 0.0)
        ));
    }

    #[test]
    fn segment_rect_intersection() {
        let r = Rect {
            x0: 0.0,
            y0: 0.0,
            x1: 2.0,
            y1: 1.0,
        };
        assert!(segment_hits_rect((-1.0, 0.5), (3.0, 0.5), &r));
        assert!(segment_hits_rect((1.0, 0.5), (1.0, 0.6), &r));
        assert!(!segment_hits_rect((-1.0, 2.0), (3.0, 2.0), &r));
        assert!(!segment_hits_rect((-1.0, -1.0), (-0.5, 3.0), &r));
    }
}
