//! Text metrics from the bundled font ([`crate::font`]): exact shaped widths,
//! and the line breaks the placement may try for a long label.
//!
//! Widths come from the same font and shaper that draw the PNG and the PDF,
//! so text that does not overlap in the layout does not overlap on the page.
//! SVG viewers that lack the font fall back to narrower ones (the
//! `font-family` list names only such), so the layout holds there too.

use super::scene::{Anchor, Rect};
use crate::font::{self, Face};

/// Millimetres per typographic point.
pub const PT_MM: f64 = 25.4 / 72.0;
/// Height above the baseline that glyphs may reach, in em (the bundled font's
/// capitals, digits, Greek, brackets, ‡ and superscripts stay below; only
/// accented capitals reach higher).
pub const ASCENT: f64 = 0.80;
/// Depth below the baseline that glyphs may reach, in em.
pub const DESCENT: f64 = 0.24;
/// Baseline-to-baseline distance of multi-line text, in em.
pub const LINE_HEIGHT: f64 = 1.15;

/// Advance width of `c` in em, in the upright face.
pub fn char_em(c: char) -> f64 {
    font::advance_em(c, Face::Regular)
}

/// Width of one line of upright text in mm at `size_pt`.
pub fn width_mm(line: &str, size_pt: f64) -> f64 {
    width_mm_in(line, size_pt, Face::Regular)
}

/// Width of one line of text set in `face`, in mm at `size_pt`.
pub fn width_mm_in(line: &str, size_pt: f64, face: Face) -> f64 {
    font::width_em(line, face) * size_pt * PT_MM
}

/// The bounding box of a block of lines whose first baseline is at `(x, y)`,
/// rotated by `rotation` degrees (clockwise) about `(x, y)`.
pub fn block_box(
    x: f64,
    y: f64,
    lines: &[String],
    size_pt: f64,
    anchor: Anchor,
    rotation: f64,
) -> Rect {
    let em = size_pt * PT_MM;
    let w = lines
        .iter()
        .map(|l| width_mm(l, size_pt))
        .fold(0.0, f64::max);
    let n = lines.len().max(1) as f64;
    let x0 = match anchor {
        Anchor::Start => x,
        Anchor::Middle => x - w / 2.0,
        Anchor::End => x - w,
    };
    let upright = Rect {
        x0,
        y0: y - ASCENT * em,
        x1: x0 + w,
        y1: y + (n - 1.0) * LINE_HEIGHT * em + DESCENT * em,
    };
    if rotation == 0.0 {
        return upright;
    }
    let (s, c) = rotation.to_radians().sin_cos();
    let corners = [
        (upright.x0, upright.y0),
        (upright.x1, upright.y0),
        (upright.x0, upright.y1),
        (upright.x1, upright.y1),
    ];
    let mut r = Rect {
        x0: f64::INFINITY,
        y0: f64::INFINITY,
        x1: f64::NEG_INFINITY,
        y1: f64::NEG_INFINITY,
    };
    for (px, py) in corners {
        let (dx, dy) = (px - x, py - y);
        let (rx, ry) = (x + dx * c - dy * s, y + dx * s + dy * c);
        r.x0 = r.x0.min(rx);
        r.x1 = r.x1.max(rx);
        r.y0 = r.y0.min(ry);
        r.y1 = r.y1.max(ry);
    }
    r
}

/// Ways to set `label`: on one line, then its most balanced two- and
/// three-line breaks (at spaces, or after a hyphen), narrowest last.
/// Breaking is the first remedy for a label wider than its column.
pub fn line_breaks(label: &str, size_pt: f64) -> Vec<Vec<String>> {
    // Pieces end at a break opportunity; a space is dropped at the break.
    let mut pieces: Vec<(String, bool)> = Vec::new(); // (text, ends with a dropped space)
    let mut current = String::new();
    // Inside brackets a hyphen ties a formula together ("(η²-H₂)"): no break.
    let mut depth = 0usize;
    for c in label.chars() {
        match c {
            '(' | '[' | '{' => depth += 1,
            ')' | ']' | '}' => depth = depth.saturating_sub(1),
            _ => {}
        }
        if c == ' ' {
            pieces.push((std::mem::take(&mut current), true));
        } else {
            current.push(c);
            // Break after a hyphen only after a real word: "TS-" alone on a
            // line reads as a stray prefix.
            if c == '-' && depth == 0 && current.chars().count() > 4 {
                pieces.push((std::mem::take(&mut current), false));
            }
        }
    }
    pieces.push((current, false));
    let join = |range: &[(String, bool)]| -> String {
        let mut s = String::new();
        for (i, (p, space)) in range.iter().enumerate() {
            s.push_str(p);
            if *space && i + 1 < range.len() {
                s.push(' ');
            }
        }
        s
    };
    let mut options = vec![vec![label.to_string()]];
    let n = pieces.len();
    let widest = |lines: &[String]| {
        lines
            .iter()
            .map(|l| width_mm(l, size_pt))
            .fold(0.0, f64::max)
    };
    let usable = |lines: &[String]| lines.iter().all(|l| !l.trim().is_empty());
    let mut best2: Option<(f64, Vec<String>)> = None;
    for i in 1..n {
        let lines = vec![join(&pieces[..i]), join(&pieces[i..])];
        if usable(&lines) {
            let w = widest(&lines);
            if best2.as_ref().is_none_or(|(bw, _)| w < *bw) {
                best2 = Some((w, lines));
            }
        }
    }
    let mut best3: Option<(f64, Vec<String>)> = None;
    if n <= 40 {
        for i in 1..n {
            for j in i + 1..n {
                let lines = vec![join(&pieces[..i]), join(&pieces[i..j]), join(&pieces[j..])];
                if usable(&lines) {
                    let w = widest(&lines);
                    if best3.as_ref().is_none_or(|(bw, _)| w < *bw) {
                        best3 = Some((w, lines));
                    }
                }
            }
        }
    }
    let one = width_mm(label, size_pt);
    // A break is only worth offering when it makes the block clearly narrower.
    if let Some((w2, l2)) = best2.filter(|(w2, _)| *w2 < one * 0.9) {
        options.push(l2);
        if let Some((_, l3)) = best3.filter(|(w3, _)| *w3 < w2 * 0.9) {
            options.push(l3);
        }
    }
    options
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn widths_scale_with_size_and_length() {
        let a = width_mm("radical pair", 7.0);
        assert!((width_mm("radical pair", 14.0) - 2.0 * a).abs() < 1e-9);
        assert!(width_mm("radical pair radical pair", 7.0) > 2.0 * a);
        assert!(width_mm("WWW", 7.0) > width_mm("iii", 7.0) * 2.0);
        // "TS-recombination": its advance widths in DejaVu Sans's hmtx table
        // add up to 8.843 em (read with fontTools 4); kerning of "TS" takes a
        // little off. 7 pt = 2.469 mm.
        let w = width_mm("TS-recombination", 7.0);
        assert!(w < 8.843 * 7.0 * PT_MM && w > 8.75 * 7.0 * PT_MM, "{w}");
        assert!(width_mm_in("TS-recombination", 7.0, Face::Italic) > 0.9 * w);
    }

    #[test]
    fn ascent_and_descent_bound_the_ink_of_label_characters() {
        let chars = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789\
                     ()[]{}αβγδΔεζηθκλμνξπρστφχψωΓΘΛΞΣΦΨΩ‡†−⁻⁰¹²³⁴⁵⁶⁷⁸⁹⁺₀₁₂₃₄₅₆₇₈₉₊₋·°⇌→±×–—|@";
        for face in [Face::Regular, Face::Italic] {
            for c in chars.chars() {
                if let Some((top, bottom)) = crate::font::ink_extent_em(c, face) {
                    assert!(top <= ASCENT && bottom >= -DESCENT, "{c}: {top} {bottom}");
                }
            }
        }
    }

    #[test]
    fn breaks_are_balanced_and_keep_every_character() {
        let opts = line_breaks("rearranged ketone product", 7.0);
        assert_eq!(opts[0], vec!["rearranged ketone product"]);
        assert_eq!(opts[1], vec!["rearranged", "ketone product"]);
        let opts = line_breaks("radical-pair recombination", 7.0);
        assert_eq!(opts[1], vec!["radical-pair", "recombination"]);
        let opts = line_breaks("ortho-quinone-methide", 7.0);
        assert_eq!(opts[1], vec!["ortho-quinone-", "methide"]);
        assert_eq!(line_breaks("TS-recombination", 7.0).len(), 1);
        // A hyphen inside brackets belongs to a formula (common practice in
        // typesetting: a formula is never split at its internal hyphen).
        assert_eq!(line_breaks("[Ir](η²-H₂)H", 7.0).len(), 1);
        let opts = line_breaks("trans-[Ru(cis-dppe)]", 7.0);
        assert_eq!(opts[1], vec!["trans-", "[Ru(cis-dppe)]"]);
        assert_eq!(line_breaks("pair", 7.0).len(), 1);
        assert_eq!(line_breaks("", 7.0), vec![vec![String::new()]]);
    }

    #[test]
    fn rotated_box_swaps_extent() {
        let lines = vec!["ΔG (kcal mol⁻¹)".to_string()];
        let flat = block_box(10.0, 30.0, &lines, 8.0, Anchor::Middle, 0.0);
        let up = block_box(10.0, 30.0, &lines, 8.0, Anchor::Middle, -90.0);
        assert!(((up.y1 - up.y0) - (flat.x1 - flat.x0)).abs() < 1e-9);
        assert!(((up.x1 - up.x0) - (flat.y1 - flat.y0)).abs() < 1e-9);
        assert!(up.y0 < 30.0 && up.y1 > 30.0);
    }
}
