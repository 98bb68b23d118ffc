//! Collision-checked placement of text. Every text gets a list of candidate
//! positions in order of preference; the first one that fits (inside the
//! page, clear of every placed text and bar) wins, with a penalty for each
//! connector it would cover. If no nearby spot fits, a wider search moves the
//! text away and the caller draws a leader line back to its bar.

use super::scene::{Anchor, Rect, RichLine, Run};
use super::{rich, text};

/// Gap kept between any two texts, and between a text and a bar, in mm.
pub const CLEARANCE: f64 = 0.3;
/// Cost of covering one connector, in mm of displacement.
const CROSSING_COST: f64 = 4.0;

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
}

impl Placer {
    /// True when `r` fits: inside the bounds and clear of every blocked box.
    pub fn fits(&self, r: &Rect) -> bool {
        self.bounds.contains(r)
            && self
                .blocked
                .iter()
                .all(|b| !b.intersects(&r.inflate(CLEARANCE)))
    }

    /// How many soft segments cross `r`.
    pub fn crossings(&self, r: &Rect) -> usize {
        self.segments
            .iter()
            .filter(|(a, b)| segment_hits_rect(*a, *b, r))
            .count()
    }

    /// The best fitting candidate: lowest preference cost + crossing penalty; `candidates` must be sorted by cost.
    ///
    /// `origin` is where a leader line would start (the bar); a candidate
    /// whose leader would cut through a placed text or bar is rejected.
    pub fn choose<'a>(
        &self,
        candidates: &'a [Candidate],
        origin: (f64, f64),
    ) -> Option<&'a Candidate> {
        let mut best: Option<(f64, &Candidate)> = None;
        for c in candidates {
            if best.is_some_and(|(cost, _)| c.cost >= cost) {
                break; // sorted by cost: nothing later can beat it
            }
            let r = c.bbox();
            if !self.fits(&r) {
                continue;
            }
            if c.leader {
                let to = r.nearest(origin.0, origin.1);
                let cuts = self.blocked.iter().any(|b| {
                    !b.inflate(0.05).contains(&Rect {
                        x0: origin.0,
                        y0: origin.1,
                        x1: origin.0,
                        y1: origin.1,
                    }) && segment_hits_rect(origin, to, b)
                });
                if cuts {
                    continue;
                }
            }
            let cost = c.cost + CROSSING_COST * self.crossings(&r) as f64;
            if best.is_none_or(|(b, _)| cost < b) {
                best = Some((cost, c));
            }
        }
        best.map(|(_, c)| c)
    }

    #[cfg(test)]
    fn choose_at<'a>(&self, candidates: &'a [Candidate]) -> Option<&'a Candidate> {
        self.choose(candidates, (40.0, 30.0))
    }

    /// Marks `r` as taken.
    pub fn block(&mut self, r: Rect) {
        self.blocked.push(r);
    }
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
const STACK_LEVEL: f64 = 1.5;
const EXTRA_LINE: f64 = 2.0;
const PER_PT_SMALLER: f64 = 3.0;
const FAR_AWAY: f64 = 8.0;
/// How far (mm) a text may be moved from its bar, with a leader line.
const RING_RADIUS: f64 = 18.0;

/// Candidates for `req`, best first. Each gets a preference cost: distance
/// moved from the default spot, plus fixed costs for switching side,
/// stacking past the other text, breaking lines and shrinking; finally a
/// search ring around the bar (far away, with a leader line).
pub fn candidates(req: &Request<'_>) -> Vec<Candidate> {
    let mut sizes = vec![req.size_pt];
    for f in [0.9, 0.8, 0.7] {
        let s = (req.size_pt * f * 10.0).round() / 10.0;
        if s >= req.min_pt - 1e-9 && s < *sizes.last().unwrap() {
            sizes.push(s);
        }
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
    // Wider search: rings of growing radius at the smallest size and
    // narrowest breaking, with a leader line.
    let size = *sizes.last().unwrap();
    let lines = breaks_of(req, size).pop().unwrap_or_default();
    out.extend(ring(
        req.x,
        req.y,
        &lines,
        size,
        (req.size_pt - size) * PER_PT_SMALLER,
    ));
    // Stable sort: equal costs keep generation order, so output is deterministic.
    out.sort_by(|a, b| a.0.total_cmp(&b.0));
    out.into_iter()
        .map(|(cost, c)| Candidate { cost, ..c })
        .collect()
}

/// Far-away positions around `(x, y)` (text centred on each), for a text
/// that needs a leader line: a grid within [`RING_RADIUS`], nearest first.
fn ring(x: f64, y: f64, lines: &[RichLine], size: f64, extra: f64) -> Vec<(f64, Candidate)> {
    let em = size * text::PT_MM;
    let step = 0.8;
    let reach = (RING_RADIUS / step).ceil() as i32;
    let mut out = Vec::new();
    for iy in -reach..=reach {
        for ix in -reach..=reach {
            let (dx, dy) = (ix as f64 * step, iy as f64 * step);
            let d = (dx * dx + dy * dy).sqrt();
            if !(2.0..=RING_RADIUS).contains(&d) {
                continue;
            }
            out.push((
                FAR_AWAY + d + extra,
                Candidate {
                    x: x + dx,
                    y: y + dy + (text::ASCENT - text::DESCENT) * em / 2.0,
                    lines: lines.to_vec(),
                    size_pt: size,
                    anchor: Anchor::Middle,
                    leader: true,
                    cost: 0.0,
                },
            ));
        }
    }
    out
}

/// Candidates for a text block beside a vertical mark (an arrow or bracket)
/// from `y_top` to `y_bottom` at `x`: right of it first, then left, centred
/// on the mark's middle and sliding along it; then far away with a leader.
pub fn beside(x: f64, y_top: f64, y_bottom: f64, lines: &[RichLine], size: f64) -> Vec<Candidate> {
    let em = size * text::PT_MM;
    let n = lines.len().max(1) as f64;
    // Baseline of the first line that centres the block on height `yc`.
    let block_h = (n - 1.0) * text::LINE_HEIGHT * em;
    let first_baseline = |yc: f64| yc - block_h / 2.0 + (text::ASCENT - text::DESCENT) * em / 2.0;
    let gap = 0.6;
    let len = (y_bottom - y_top).abs();
    let mut out: Vec<(f64, Candidate)> = Vec::new();
    for (side, anchor, dx) in [(0.0, Anchor::Start, gap), (OTHER_SIDE, Anchor::End, -gap)] {
        for f in [0.5, 0.4, 0.6, 0.3, 0.7, 0.2, 0.8, 0.1, 0.9, 0.0, 1.0] {
            let yc = y_top + f * (y_bottom - y_top);
            out.push((
                side + (f - 0.5f64).abs() * len,
                Candidate {
                    x: x + dx,
                    y: first_baseline(yc),
                    lines: lines.to_vec(),
                    size_pt: size,
                    anchor,
                    leader: false,
                    cost: 0.0,
                },
            ));
        }
    }
    out.extend(ring(x, (y_top + y_bottom) / 2.0, lines, size, 0.0));
    out.sort_by(|a, b| a.0.total_cmp(&b.0));
    out.into_iter()
        .map(|(cost, c)| Candidate { cost, ..c })
        .collect()
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
        assert_eq!(chosen, &c[0]);
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
