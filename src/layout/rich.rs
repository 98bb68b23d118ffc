//! Measuring and breaking lines of styled runs (see [`super::markup`]): each
//! run is measured with [`super::text`] in its own face and size, so a label
//! with subscripts is placed by the width it really has.
//!
//! A line of one upright run measures exactly as [`text::block_box`] does, so
//! labels without markup are placed as before.

use super::scene::{Anchor, Rect, RichLine, Run, Script};
use super::text;
use crate::font::Face;

/// Size of a sub- or superscript relative to the text around it.
pub const SCRIPT_SCALE: f64 = 0.7;
/// How far a superscript's baseline is raised, in em of the surrounding text.
pub const SUPER_RISE: f64 = 0.35;
/// How far a subscript's baseline is lowered, in em of the surrounding text.
pub const SUB_DROP: f64 = 0.18;

/// Font size of `run` inside text of `size_pt`.
pub fn run_size(run: &Run, size_pt: f64) -> f64 {
    match run.script {
        Script::Normal => size_pt,
        Script::Sub | Script::Super => size_pt * SCRIPT_SCALE,
    }
}

/// Width of one line of runs in mm.
pub fn width_mm(line: &[Run], size_pt: f64) -> f64 {
    line.iter()
        .map(|r| {
            let face = if r.italic {
                Face::Italic
            } else {
                Face::Regular
            };
            text::width_mm_in(&r.text, run_size(r, size_pt), face)
        })
        .sum()
}

/// Height above and depth below the baseline of `line`, in em: raised
/// superscripts reach higher than capitals, lowered subscripts deeper.
fn extent_em(line: &[Run]) -> (f64, f64) {
    let mut up: f64 = text::ASCENT;
    let mut down: f64 = text::DESCENT;
    for r in line {
        match r.script {
            Script::Normal => {}
            Script::Super => up = up.max(SUPER_RISE + SCRIPT_SCALE * text::ASCENT),
            Script::Sub => down = down.max(SUB_DROP + SCRIPT_SCALE * text::DESCENT),
        }
    }
    (up, down)
}

/// The bounding box of `lines` whose first baseline is at `(x, y)`, rotated
/// by `rotation` degrees (clockwise) about `(x, y)`.
pub fn block_box(
    x: f64,
    y: f64,
    lines: &[RichLine],
    size_pt: f64,
    anchor: Anchor,
    rotation: f64,
) -> Rect {
    let em = size_pt * text::PT_MM;
    let w = lines
        .iter()
        .map(|l| width_mm(l, size_pt))
        .fold(0.0, f64::max);
    let n = lines.len().max(1) as f64;
    let up = lines.first().map_or(text::ASCENT, |l| extent_em(l).0);
    let down = lines.last().map_or(text::DESCENT, |l| extent_em(l).1);
    let x0 = match anchor {
        Anchor::Start => x,
        Anchor::Middle => x - w / 2.0,
        Anchor::End => x - w,
    };
    let upright = Rect {
        x0,
        y0: y - up * em,
        x1: x0 + w,
        y1: y + (n - 1.0) * text::LINE_HEIGHT * em + down * em,
    };
    if rotation == 0.0 {
        upright
    } else {
        rotated(&upright, (x, y), rotation)
    }
}

/// The axis-aligned box around `r` turned by `degrees` about `centre`.
fn rotated(r: &Rect, centre: (f64, f64), degrees: f64) -> Rect {
    let (s, c) = degrees.to_radians().sin_cos();
    let mut out = Rect {
        x0: f64::INFINITY,
        y0: f64::INFINITY,
        x1: f64::NEG_INFINITY,
        y1: f64::NEG_INFINITY,
    };
    for (px, py) in [(r.x0, r.y0), (r.x1, r.y0), (r.x0, r.y1), (r.x1, r.y1)] {
        let (dx, dy) = (px - centre.0, py - centre.1);
        let (rx, ry) = (centre.0 + dx * c - dy * s, centre.1 + dx * s + dy * c);
        out.x0 = out.x0.min(rx);
        out.x1 = out.x1.max(rx);
        out.y0 = out.y0.min(ry);
        out.y1 = out.y1.max(ry);
    }
    out
}

/// The characters of a line without styling.
pub fn plain(line: &[Run]) -> String {
    line.iter().map(|r| r.text.as_str()).collect()
}

/// Ways to set `runs`: the break points [`text::line_breaks`] finds in the
/// plain text, applied to the runs (styles are kept across the break).
pub fn line_breaks(runs: &[Run], size_pt: f64) -> Vec<Vec<RichLine>> {
    let whole = plain(runs);
    let chars: Vec<char> = whole.chars().collect();
    let mut out = Vec::new();
    for option in text::line_breaks(&whole, size_pt) {
        let mut lines = Vec::new();
        let mut pos = 0;
        for l in &option {
            let n = l.chars().count();
            lines.push(slice(runs, pos, pos + n));
            pos += n;
            if chars.get(pos) == Some(&' ') {
                pos += 1;
            }
        }
        // Keep an option only if it maps back onto the runs character for character.
        if lines.iter().map(|l| plain(l)).collect::<Vec<_>>() == option {
            out.push(lines);
        }
    }
    if out.is_empty() {
        out.push(vec![runs.to_vec()]);
    }
    out
}

/// The runs covering characters `from..to` of the whole line.
fn slice(runs: &[Run], from: usize, to: usize) -> RichLine {
    let mut out = Vec::new();
    let mut at = 0;
    for r in runs {
        let n = r.text.chars().count();
        let (a, b) = (from.max(at), to.min(at + n));
        if a < b {
            out.push(Run {
                text: r.text.chars().skip(a - at).take(b - a).collect(),
                ..r.clone()
            });
        }
        at += n;
    }
    out
}

#[cfg(test)]
mod tests {
    use super::super::markup::parse;
    use super::*;

    #[test]
    fn plain_lines_measure_as_before() {
        for s in ["radical pair", "TS-recombination", "ΔG (kcal mol⁻¹)"] {
            let plain_box = text::block_box(3.0, 9.0, &[s.to_string()], 7.0, Anchor::Middle, 0.0);
            let rich_box = block_box(3.0, 9.0, &[vec![Run::plain(s)]], 7.0, Anchor::Middle, 0.0);
            assert_eq!(plain_box, rich_box, "{s}");
            let a = text::block_box(3.0, 9.0, &[s.to_string()], 8.0, Anchor::Middle, -90.0);
            let b = block_box(3.0, 9.0, &[vec![Run::plain(s)]], 8.0, Anchor::Middle, -90.0);
            for (p, q) in [(a.x0, b.x0), (a.y0, b.y0), (a.x1, b.x1), (a.y1, b.y1)] {
                assert!((p - q).abs() < 1e-9);
            }
        }
    }

    #[test]
    fn scripts_are_narrower_and_extend_the_box() {
        let h2o = parse("H_2O");
        let plain_w = text::width_mm("H2O", 7.0);
        assert!(width_mm(&h2o, 7.0) < plain_w);
        // The subscript digit is set at 70 % size (this module's SCRIPT_SCALE).
        let expected =
            text::width_mm("H", 7.0) + text::width_mm("2", 4.9) + text::width_mm("O", 7.0);
        assert!((width_mm(&h2o, 7.0) - expected).abs() < 1e-9);
        let flat = block_box(
            0.0,
            10.0,
            &[vec![Run::plain("HO")]],
            7.0,
            Anchor::Start,
            0.0,
        );
        let sub = block_box(0.0, 10.0, &[h2o], 7.0, Anchor::Start, 0.0);
        let sup = block_box(0.0, 10.0, &[parse("Nu^-")], 7.0, Anchor::Start, 0.0);
        assert!(sub.y1 > flat.y1 && sub.y0 == flat.y0);
        assert!(sup.y0 < flat.y0 && sup.y1 == flat.y1);
    }

    #[test]
    fn breaks_keep_styles() {
        let runs = parse("*cis*-configured CH_3 adduct");
        let options = line_breaks(&runs, 7.0);
        assert_eq!(plain(&options[0][0]), "cis-configured CH3 adduct");
        let two = options.get(1).expect("a two-line option");
        let joined: Vec<String> = two.iter().map(|l| plain(l)).collect();
        assert_eq!(joined.join(" "), "cis-configured CH3 adduct");
        assert!(two[0][0].italic);
        assert!(two.iter().flatten().any(|r| r.script == Script::Sub));
    }
}
