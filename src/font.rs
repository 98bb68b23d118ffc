//! The one typeface every figure is drawn in, bundled in the binary.
//!
//! DejaVu Sans (regular and oblique, Bitstream Vera licence, see
//! `assets/fonts/`) covers Latin, Greek, ‡, the minus sign, superscript and
//! subscript digits and signs, ·, ° and arrows such as ⇌, so no fallback font
//! is ever needed. The layout measures text here, with the same shaper
//! (rustybuzz) that draws the PNG and the PDF, so the widths it plans with are
//! the widths that get drawn: exactly, kerning included.

use std::cell::RefCell;
use std::collections::HashMap;
use std::sync::OnceLock;

/// The family name of the bundled font.
pub const FAMILY: &str = "DejaVu Sans";

/// The `font-family` list written into SVG files: the bundled font first, then
/// fonts that are narrower than it (so the layout still holds in a viewer that
/// lacks DejaVu Sans), then the generic family.
pub const FONT_FAMILY_LIST: &str = "'DejaVu Sans', Arial, Helvetica, sans-serif";

/// DejaVu Sans Book, 2.37.
pub static REGULAR: &[u8] = include_bytes!("../assets/fonts/DejaVuSans.ttf");

/// DejaVu Sans Oblique, 2.37 (used for italic text).
pub static ITALIC: &[u8] = include_bytes!("../assets/fonts/DejaVuSans-Oblique.ttf");

/// Which face of the bundled font a run of text is set in.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Default)]
pub enum Face {
    /// Upright text.
    #[default]
    Regular = 0,
    /// Italic text (`font-style="italic"` in SVG; DejaVu Sans Oblique).
    Italic = 1,
}

/// The parsed face, for shaping and (through its `ttf_parser` methods) glyph
/// outlines.
pub(crate) fn face(which: Face) -> &'static rustybuzz::Face<'static> {
    static REGULAR_FACE: OnceLock<rustybuzz::Face<'static>> = OnceLock::new();
    static ITALIC_FACE: OnceLock<rustybuzz::Face<'static>> = OnceLock::new();
    let (cell, data) = match which {
        Face::Regular => (&REGULAR_FACE, REGULAR),
        Face::Italic => (&ITALIC_FACE, ITALIC),
    };
    cell.get_or_init(|| rustybuzz::Face::from_slice(data, 0).expect("the bundled font parses"))
}

fn per_em(face: &rustybuzz::Face<'_>) -> f64 {
    f64::from(face.units_per_em())
}

/// Advance width of `c` alone, in em. A character the font lacks is drawn as
/// the font's missing-glyph box and measured as such.
pub fn advance_em(c: char, which: Face) -> f64 {
    let f = face(which);
    let glyph = f
        .glyph_index(c)
        .unwrap_or(rustybuzz::ttf_parser::GlyphId(0));
    f64::from(f.glyph_hor_advance(glyph).unwrap_or(0)) / per_em(f)
}

/// Width of one line of text in em, shaped left to right as resvg and the
/// PNG and PDF writers shape it (default OpenType features, so kerning
/// applies).
///
/// The layout measures the same few labels hundreds of times while it tries
/// candidate spots and line breaks, so widths are remembered per thread (and
/// the shaping plan per script): a pure function of the text and the face,
/// so the result is the same as shaping afresh.
pub fn width_em(text: &str, which: Face) -> f64 {
    if text.is_empty() {
        return 0.0;
    }
    WIDTHS.with(|cell| {
        let mut widths = cell.borrow_mut();
        let widths = &mut widths[which as usize];
        if let Some(&w) = widths.get(text) {
            return w;
        }
        let w = shaped_width_em(text, which);
        if widths.len() >= MAX_REMEMBERED {
            widths.clear();
        }
        widths.insert(text.to_string(), w);
        w
    })
}

/// How many widths a thread remembers per face before it starts over (a long
/// `eyrie watch` session must not grow without bound).
const MAX_REMEMBERED: usize = 4096;

type Plans = Vec<(Face, Option<rustybuzz::Script>, rustybuzz::ShapePlan)>;

thread_local! {
    /// Shaped widths in em by text, one map per face (indexed by `Face as usize`).
    static WIDTHS: RefCell<[HashMap<String, f64>; 2]> = RefCell::default();
    /// Shaping plans by face and script.
    static PLANS: RefCell<Plans> = const { RefCell::new(Vec::new()) };
}

fn shaped_width_em(text: &str, which: Face) -> f64 {
    let f = face(which);
    let shaped = shape(text, which);
    let units: i64 = shaped
        .glyph_positions()
        .iter()
        .map(|p| i64::from(p.x_advance))
        .sum();
    units as f64 / per_em(f)
}

/// Shapes `text` with a plan made once per face and script, exactly as
/// `rustybuzz::shape` would make it (direction left to right, no language, no
/// extra features): the glyphs the PNG draws are the ones the layout measured.
pub(crate) fn shape(text: &str, which: Face) -> rustybuzz::GlyphBuffer {
    let f = face(which);
    let mut buffer = rustybuzz::UnicodeBuffer::new();
    buffer.push_str(text);
    buffer.set_direction(rustybuzz::Direction::LeftToRight);
    buffer.guess_segment_properties();
    // The guess never settles on "unknown": that value means no script.
    let script = Some(buffer.script()).filter(|s| *s != rustybuzz::script::UNKNOWN);
    PLANS.with(|cell| {
        let mut plans = cell.borrow_mut();
        let i = match plans
            .iter()
            .position(|(w, s, _)| *w == which && *s == script)
        {
            Some(i) => i,
            None => {
                let plan = rustybuzz::ShapePlan::new(
                    f,
                    rustybuzz::Direction::LeftToRight,
                    script,
                    None,
                    &[],
                );
                plans.push((which, script, plan));
                plans.len() - 1
            }
        };
        rustybuzz::shape_with_plan(f, &plans[i].2, buffer)
    })
}

/// Whether the bundled font has a glyph for `c` (else it draws a box).
pub fn covers(c: char) -> bool {
    face(Face::Regular).glyph_index(c).is_some()
}

/// Highest and lowest ink of `c` relative to the baseline, in em (up is
/// positive), or `None` for a character without outline (a space).
pub fn ink_extent_em(c: char, which: Face) -> Option<(f64, f64)> {
    let f = face(which);
    let bbox = f.glyph_bounding_box(f.glyph_index(c)?)?;
    let em = per_em(f);
    Some((f64::from(bbox.y_max) / em, f64::from(bbox.y_min) / em))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn covers_what_mechanism_labels_use() {
        for c in "AZaz09αβγδΔεκμνπσφχψωΩ‡†−⁻⁰¹²³⁴⁵⁶⁷⁸⁹⁺₀₁₂₃₄₅₆₇₈₉₊₋·°⇌→±×–—".chars()
        {
            assert!(covers(c), "{c} (U+{:04X}) is missing", c as u32);
        }
        assert!(!covers('\u{E000}'));
    }

    #[test]
    fn widths_are_the_font_advances() {
        // DejaVu Sans has 2048 units per em; digits advance 1303 units, the
        // space 651 (from the font's hmtx table, read with fontTools 4).
        assert!((advance_em('0', Face::Regular) - 1303.0 / 2048.0).abs() < 1e-12);
        assert!((advance_em(' ', Face::Regular) - 651.0 / 2048.0).abs() < 1e-12);
        // Without kerning pairs, the shaped width is the sum of advances.
        let sum: f64 = "12.5".chars().map(|c| advance_em(c, Face::Regular)).sum();
        assert!((width_em("12.5", Face::Regular) - sum).abs() < 1e-12);
        // Kerning pulls "AV" together: shaped width below the advance sum.
        let av: f64 = "AV".chars().map(|c| advance_em(c, Face::Regular)).sum();
        assert!(width_em("AV", Face::Regular) < av);
        assert_eq!(width_em("", Face::Italic), 0.0);
    }

    #[test]
    fn remembered_widths_equal_fresh_shaping() {
        // rustybuzz's own `shape` (its plan made for each call) is the
        // reference; asked twice, so the second answer comes from memory.
        for text in [
            "AV",
            "TS-recombination",
            "−15.8",
            "ΔG‡",
            "12 + ΔΔG",
            "αβ Wa",
            "‡",
        ] {
            for which in [Face::Regular, Face::Italic] {
                let f = face(which);
                let mut buffer = rustybuzz::UnicodeBuffer::new();
                buffer.push_str(text);
                buffer.set_direction(rustybuzz::Direction::LeftToRight);
                let shaped = rustybuzz::shape(f, &[], buffer);
                let units: i64 = shaped
                    .glyph_positions()
                    .iter()
                    .map(|p| i64::from(p.x_advance))
                    .sum();
                let fresh = units as f64 / per_em(f);
                assert_eq!(width_em(text, which), fresh, "{text}");
                assert_eq!(width_em(text, which), fresh, "{text}, remembered");
            }
        }
    }
}
