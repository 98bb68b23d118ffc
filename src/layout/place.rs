//! Collision-checked placement of text. Every text gets a list of candidate
//! positions in order of preference (over or under its bar, slid along it,
//! stacked with its other text, beside an end); the cheapest one that fits
//! (inside the page, clear of every placed text and bar, crossed by no line)
//! wins. If no nearby spot fits, a search within [`RING_RADIUS`] moves the
//! text away and the caller draws a leader line back to its bar, which
//! itself crosses no text, bar or line. A text with no such spot is left
//! out (and the caller says so) rather than drawn through a line.

use super::scene::{Anchor, Rect, RichLine, Run};
use super::{rich, text};
use std::sync::{Arc, OnceLock};

/// A straight stroke from one point to another, mm.
pub type Segment = ((f64, f64), (f64, f64));

/// Gap kept between any two texts, and between a text and a bar, in mm.
pub const CLEARANCE: f64 = 0.3;
/// How far (mm) a value or label may sit from its bar's line and still read
/// as attached to it without a leader line.
pub const ATTACH_MM: f64 = 2.0;
/// How far (mm) a text level with its bar may sit beside the bar's end and
/// still read as attached to it.
pub const BESIDE_MM: f64 = 1.0;

/// True when a text box `r` reads as belonging to the bar `(x0, x1, y)`:
/// it overlaps the bar horizontally and its near edge is within
/// [`ATTACH_MM`] of the bar's line, not counting the bar's own other texts
/// (`own`) stacked in between (a label over its value reads as one block).
///
/// A text level with the bar (its box spans the bar's line) right beside
/// either end, within [`BESIDE_MM`], reads as attached too.
pub fn attached(r: &Rect, bar: (f64, f64, f64), own: &[Rect]) -> bool {
    let (x0, x1, y) = bar;
    let side_gap = (r.x0 - x1).max(x0 - r.x1);
    if r.y0 < y && r.y1 > y && (-1e-9..=BESIDE_MM).contains(&side_gap) {
        return true;
    }
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
    /// The lines as they would be set (shared by the candidates that
    /// differ only by position: hundreds per text).
    pub lines: Arc<Vec<RichLine>>,
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

/// Whom a text belongs to: where a leader to it would start, and the bar
/// it must read as attached to without one.
#[derive(Debug, Clone)]
pub struct Owner<'a> {
    /// Where a leader starts (the bar's edge under or over its centre).
    pub origin: (f64, f64),
    /// How far along the bar (mm either side of `origin`) a leader may start.
    pub reach: f64,
    /// The bar `(left, right, y)`, if the text belongs to one.
    pub bar: Option<(f64, f64, f64)>,
    /// The owner's texts placed already (a label stacked over its value).
    pub own: &'a [Rect],
    /// Half the bar's drawn thickness, mm (a leader starts at its edge).
    pub half: f64,
}

/// A chosen spot, and whether a leader must lead to it.
#[derive(Debug, Clone, PartialEq)]
pub struct Chosen {
    /// Where the text goes.
    pub candidate: Candidate,
    /// It does not read as attached to its owner: draw a leader.
    pub leader: bool,
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
    /// Faint reference lines among `segments` (the zero line, annotations'
    /// dotted guides) that a leader may cross: they belong to no state, so
    /// crossing one leads a reader nowhere wrong. Texts still avoid them.
    pub guides: Vec<((f64, f64), (f64, f64))>,
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

    /// True when a soft segment crosses `r` (see [`Placer::crossings`]).
    pub fn crossed(&self, r: &Rect) -> bool {
        let ink = r.inflate(-0.25);
        self.segments
            .iter()
            .any(|(a, b)| segment_hits_rect(*a, *b, &ink))
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

    /// The best fitting candidate (lowest preference cost; `candidates`
    /// must be sorted by cost) that covers no segment and whose leader, if
    /// it needs one, crosses no line but guides: a number or a name read
    /// across a line is easily misread, and a leader across a line points
    /// at the wrong owner. The search with a leader goes no farther than
    /// `ring` mm from the owner (0: none).
    pub fn choose_clear(
        &self,
        candidates: &[Candidate],
        owner: &Owner<'_>,
        ring: f64,
    ) -> Option<Chosen> {
        // Total cost of a text at box `r` and whether it needs a leader, or
        // `None` where it may not go. A text that does not read as attached
        // to its bar needs a leader, wherever it was proposed.
        let cost_at = |r: &Rect, leader_asked: bool, cost: f64| -> Option<(f64, bool)> {
            if !self.fits(r) {
                return None;
            }
            if self.crossed(r) {
                return None;
            }
            let needs_leader =
                leader_asked || owner.bar.is_some_and(|b| !attached(r, b, owner.own));
            if needs_leader {
                // Level with its bar but not right beside it, a text's
                // leader would run along the bar or a connector.
                if owner.bar.is_some_and(|(_, _, y)| r.y0 < y && y < r.y1) {
                    return None;
                }
                let (origin, to) = owner.leader_to(r);
                if self.leader_cuts(origin, to) {
                    return None;
                }
                if self
                    .segments
                    .iter()
                    .filter(|s| !self.guides.contains(s))
                    .any(|&(a, b)| segments_cross(origin, to, a, b))
                {
                    return None;
                }
            }
            // A near spot that needs a leader anyway is dearer than sliding
            // along the bar to one that does not.
            let stray = if needs_leader && !leader_asked {
                STRAY_COST
            } else {
                0.0
            };
            Some((cost + stray, needs_leader))
        };
        // Measuring text is the slow part: candidates differ mostly by
        // position, so each setting is measured once and shifted.
        let mut shapes: Vec<(&Candidate, Rect)> = Vec::new();
        let mut best: Option<(f64, Chosen)> = None;
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
            if let Some((total, leader)) = cost_at(&r, c.leader, c.cost)
                && best.as_ref().is_none_or(|(b, _)| total < *b)
            {
                best = Some((
                    total,
                    Chosen {
                        candidate: c.clone(),
                        leader,
                    },
                ));
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
            // Sorted by cost, which grows with the distance.
            if best.as_ref().is_some_and(|(b, _)| cost >= *b) || dx.hypot(dy) > ring + 1e-9 {
                break;
            }
            let (x, y) = (owner.origin.0 + dx, owner.origin.1 + dy + dy0);
            if let Some((total, _)) = cost_at(&shifted(&shape, x, y), true, cost)
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
                best = Some((
                    total,
                    Chosen {
                        candidate: c,
                        leader: true,
                    },
                ));
            }
        }
        best.map(|(_, c)| c)
    }

    #[cfg(test)]
    fn choose_at(&self, candidates: &[Candidate]) -> Option<Candidate> {
        let owner = Owner {
            origin: (40.0, 30.0),
            reach: 0.0,
            bar: None,
            own: &[],
            half: 0.0,
        };
        self.choose_clear(candidates, &owner, RING_RADIUS)
            .map(|c| c.candidate)
    }

    /// True when a leader from `origin` (on its bar) to `to` would cut
    /// through a placed text or another bar.
    pub fn leader_cuts(&self, origin: (f64, f64), to: (f64, f64)) -> bool {
        // Starting on its own bar's edge and leaving it is no cut: the
        // check starts a hair along the way (every other box counts, even
        // one that reaches the starting point).
        let len = (to.0 - origin.0).hypot(to.1 - origin.1);
        if len < 1e-9 {
            return false;
        }
        let t = (0.02 / len).min(1.0);
        let from = (
            origin.0 + t * (to.0 - origin.0),
            origin.1 + t * (to.1 - origin.1),
        );
        self.blocked.iter().any(|b| segment_hits_rect(from, to, b))
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

impl Owner<'_> {
    /// The leader to the box `r`: from the bar's edge facing the box (top
    /// for a box above the bar), under or over the box's centre as far as
    /// `reach` allows, to the box's nearest point.
    pub fn leader_to(&self, r: &Rect) -> ((f64, f64), (f64, f64)) {
        let centre = (r.x0 + r.x1) / 2.0;
        let x = centre.clamp(self.origin.0 - self.reach, self.origin.0 + self.reach);
        let y = match self.bar {
            Some((_, _, y)) if r.y1 <= y => y - self.half,
            Some((_, _, y)) if r.y0 >= y => y + self.half,
            _ => self.origin.1,
        };
        ((x, y), r.nearest(x, y))
    }
}

/// True when segments p–q and a–b cross (proper intersection; touching
/// ends do not count, so a leader may start where a connector ends).
pub fn segments_cross(p: (f64, f64), q: (f64, f64), a: (f64, f64), b: (f64, f64)) -> bool {
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
    /// Half the bar's length, mm (a text may also sit beside an end).
    pub half_width: f64,
    /// Preferred size, pt.
    pub size_pt: f64,
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
pub const RING_RADIUS: f64 = 12.0;

/// Candidates for `req`, best first. Each gets a preference cost: distance
/// moved from the default spot, plus fixed costs for switching side,
/// stacking past the other text, breaking lines and shrinking. The search
/// ring around the bar (far away, with a leader line) is added lazily by
/// [`Placer::choose_clear`].
pub fn candidates(req: &Request<'_>) -> Vec<Candidate> {
    // One size: a text smaller than its neighbours looks out of place; a
    // crowded figure shrinks as a whole instead (see `layout`).
    let sizes = [req.size_pt];
    let other = match req.side {
        Side::Above => Side::Below,
        Side::Below => Side::Above,
    };
    let mut out: Vec<(f64, Candidate)> = Vec::new();
    let gap = 0.35;
    // Fine steps: the room beside a neighbour's bar or the page's edge is
    // often only a little wider than the text.
    let nudges: Vec<f64> = (0..=48)
        .map(|k| if k % 2 == 0 { k as f64 } else { -(k as f64 + 1.0) } * 0.0125)
        .collect();
    for (side, stack) in [(req.side, 0usize), (other, 0), (other, 1), (req.side, 1)] {
        for &size in &sizes {
            let em = size * text::PT_MM;
            for lines in breaks_of(req, size).into_iter().map(Arc::new) {
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
    // Level with the bar, beside either end (where no connector leaves it):
    // on one line, centred on the bar's line.
    for &size in &sizes {
        let em = size * text::PT_MM;
        let lines = Arc::new(vec![req.text.to_vec()]);
        let y = req.y + (text::ASCENT - text::DESCENT) * em / 2.0;
        let gap = CLEARANCE + 0.35;
        for (anchor, x) in [
            (Anchor::Start, req.x + req.half_width + gap),
            (Anchor::End, req.x - req.half_width - gap),
        ] {
            out.push((
                BESIDE_COST,
                Candidate {
                    x,
                    y,
                    lines: lines.clone(),
                    size_pt: size,
                    anchor,
                    leader: false,
                    cost: 0.0,
                },
            ));
        }
    }
    // Stable sort: equal costs keep generation order, so output is deterministic.
    out.sort_by(|a, b| a.0.total_cmp(&b.0));
    out.into_iter()
        .map(|(cost, c)| Candidate { cost, ..c })
        .collect()
}

/// Extra cost of a near spot that does not read as attached to its bar
/// (it needs a leader).
const STRAY_COST: f64 = 4.0;

/// Cost of a text beside its bar's end instead of over or under it.
const BESIDE_COST: f64 = 4.0;

/// Offsets of the search ring for a text that needs a leader line, with
/// their cost, cheapest (nearest) first: a 0.8 mm grid within
/// [`RING_RADIUS`].
fn ring_offsets() -> &'static [(f64, f64, f64)] {
    static OFFSETS: OnceLock<Vec<(f64, f64, f64)>> = OnceLock::new();
    OFFSETS.get_or_init(|| {
        let mut out = Vec::new();
        let step = 0.8;
        let reach = (RING_RADIUS / step).ceil() as i32;
        for iy in -reach..=reach {
            for ix in -reach..=reach {
                let (dx, dy) = (ix as f64 * step, iy as f64 * step);
                let d = dx.hypot(dy);
                if (2.0..=RING_RADIUS).contains(&d) {
                    out.push((dx, dy, FAR_AWAY + d));
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
/// connectors). [`Placer::choose_clear`] adds the far-away ring.
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
    for (extra, set) in settings.into_iter().map(Arc::new).enumerate() {
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
            guides: Vec::new(),
        }
    }

    fn req(text: &str, side: Side) -> Request<'static> {
        let runs: &'static [Run] = Box::leak(vec![Run::plain(text)].into_boxed_slice());
        Request {
            x: 40.0,
            y: 30.0,
            half_thickness: 0.35,
            half_width: 3.0,
            side,
            text: runs,
            size_pt: 7.0,
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
