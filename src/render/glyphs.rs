//! Text as placed glyphs: each line of styled runs shaped with rustybuzz (the
//! shaper the layout measured with) and set the way an SVG renderer sets the
//! `<text>` that [`super::svg`] writes for it, so PNG and PDF put every glyph
//! where a viewer of the SVG sees it. A line is shaped as a whole in each
//! face it uses (kerning across a style change is kept, as SVG renderers do
//! for `<tspan>`s); each glyph is scaled to its run's size and raised or
//! lowered by its run's baseline shift, the line placed by its anchor and
//! turned by the text's rotation.

use crate::font::{self, Face};
use crate::layout::rich::{SCRIPT_SCALE, SUB_DROP, SUPER_RISE};
use crate::layout::text::{LINE_HEIGHT, PT_MM};
use crate::layout::{Anchor, Run, Script, Text};
use tiny_skia::Transform;

/// A glyph placed on the page.
pub(super) struct Placed {
    /// The face it is drawn from.
    pub face: Face,
    /// Its glyph id in that face.
    pub glyph: u16,
    /// From font units (y up) to page mm (y down).
    pub transform: Transform,
    /// The characters it shows (a ligature's all; empty for the second and
    /// later glyphs of a character), for a PDF's text extraction.
    pub text: String,
}

/// Every glyph of `t`, in order.
pub(super) fn place(t: &Text) -> Vec<Placed> {
    let em = t.size_pt * PT_MM;
    let turn = if t.rotation == 0.0 {
        Transform::identity()
    } else {
        Transform::from_rotate_at(t.rotation as f32, t.x as f32, t.y as f32)
    };
    // As written to SVG: text with a styled run keeps its spaces.
    let preserve = t.lines.iter().flatten().any(|r| !r.is_plain());
    let mut placed = Vec::new();
    for (i, line) in t.lines.iter().enumerate() {
        let baseline = t.y + i as f64 * LINE_HEIGHT * em;
        place_line(
            line,
            preserve,
            em,
            t.x,
            baseline,
            t.anchor,
            turn,
            &mut placed,
        );
    }
    placed
}

/// A run's face, size (mm per em) and baseline offset (mm, down positive).
fn run_style(r: &Run, em: f64) -> (Face, f64, f64) {
    let face = if r.italic {
        Face::Italic
    } else {
        Face::Regular
    };
    match r.script {
        Script::Normal => (face, em, 0.0),
        Script::Super => (face, SCRIPT_SCALE * em, -SUPER_RISE * em),
        Script::Sub => (face, SCRIPT_SCALE * em, SUB_DROP * em),
    }
}

/// The characters of runs as an SVG reader sees them: line breaks and tabs
/// are spaces, characters XML forbids are U+FFFD, and in text without styled runs (written without
/// `xml:space="preserve"`) runs of spaces are one space and the ends trimmed.
fn svg_text(text: &str, preserve: bool) -> String {
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        let c = match c {
            '\r' | '\n' | '\t' => ' ',
            // What the SVG writer puts for a character XML forbids.
            c if !super::xml::is_xml_char(c) => '\u{FFFD}',
            c => c,
        };
        if !preserve && c == ' ' && (out.is_empty() || out.ends_with(' ')) {
            continue;
        }
        out.push(c);
    }
    if !preserve && out.ends_with(' ') {
        out.pop();
    }
    out
}

/// Places the glyphs of one line whose baseline starts at `(x, y)` before
/// anchoring.
#[allow(clippy::too_many_arguments)]
fn place_line(
    line: &[Run],
    preserve: bool,
    em: f64,
    x: f64,
    y: f64,
    anchor: Anchor,
    turn: Transform,
    placed: &mut Vec<Placed>,
) {
    // The whole line, and where each run starts in it (bytes). Without
    // styled runs every run looks the same and the line is one piece of SVG
    // text, its spaces collapsed as a whole.
    let mut text = String::new();
    let mut starts = Vec::with_capacity(line.len());
    if preserve {
        for r in line {
            starts.push(text.len());
            text.push_str(&svg_text(&r.text, true));
        }
    } else {
        starts.push(0);
        text = svg_text(&crate::layout::rich::plain(line), false);
    }
    if text.is_empty() {
        return;
    }
    let run_at = |byte: usize| starts.partition_point(|&s| s <= byte).saturating_sub(1);
    // Shaped once per face the line uses; each glyph is taken from the
    // shaping in its own run's face.
    let mut faces: Vec<(Face, rustybuzz::GlyphBuffer)> = Vec::new();
    for r in line {
        let face = run_style(r, em).0;
        if !faces.iter().any(|(f, _)| *f == face) {
            faces.push((face, font::shape(&text, face)));
        }
    }
    let first = &faces[0].1;
    // Different faces could cut the text into different glyphs (never seen
    // with the bundled faces): then each run is shaped on its own.
    let aligned = faces.iter().all(|(_, b)| {
        b.len() == first.len()
            && b.glyph_infos()
                .iter()
                .zip(first.glyph_infos())
                .all(|(p, q)| p.cluster == q.cluster)
    });
    let mut glyphs: Vec<Glyph> = Vec::new();
    if aligned {
        for i in 0..first.len() {
            let cluster = first.glyph_infos()[i].cluster as usize;
            let run = &line[run_at(cluster)];
            let (face, size, shift) = run_style(run, em);
            let buffer = &faces
                .iter()
                .find(|(f, _)| *f == face)
                .expect("shaped above")
                .1;
            glyphs.push(Glyph::new(buffer, i, cluster, face, size, shift));
        }
    } else {
        // Only reached with styled runs, so each run has its start.
        for (r, &start) in line.iter().zip(&starts) {
            let (face, size, shift) = run_style(r, em);
            let piece = svg_text(&r.text, preserve);
            let buffer = font::shape(&piece, face);
            for i in 0..buffer.len() {
                let cluster = start + buffer.glyph_infos()[i].cluster as usize;
                glyphs.push(Glyph::new(&buffer, i, cluster, face, size, shift));
            }
        }
    }
    // Clusters (glyphs sharing a character) advance by their widest glyph,
    // their glyphs placed one after the other inside (as resvg does).
    let mut clusters: Vec<(usize, usize, f64)> = Vec::new(); // (first glyph, end, advance mm)
    let mut i = 0;
    while i < glyphs.len() {
        let end = i + glyphs[i..]
            .iter()
            .take_while(|g| g.cluster == glyphs[i].cluster)
            .count();
        let advance = glyphs[i..end]
            .iter()
            .map(|g| g.advance as f64 * g.scale())
            .fold(0.0, f64::max);
        clusters.push((i, end, advance));
        i = end;
    }
    let total: f64 = clusters.iter().map(|c| c.2).sum();
    let mut pen = match anchor {
        Anchor::Start => x,
        Anchor::Middle => x - total / 2.0,
        Anchor::End => x - total,
    };
    for (k, &(from, end, advance)) in clusters.iter().enumerate() {
        let next = clusters
            .get(k + 1)
            .map_or(text.len(), |c| glyphs[c.0].cluster);
        let mut chars = text.get(glyphs[from].cluster..next).unwrap_or("");
        let mut inside = 0i64;
        for g in &glyphs[from..end] {
            let s = g.scale();
            let gx = pen + (inside + i64::from(g.dx)) as f64 * s;
            let gy = y + g.shift - f64::from(g.dy) * s;
            // Font units (y up) → page mm (y down) about the glyph origin.
            let transform = turn.pre_concat(Transform::from_row(
                s as f32, 0.0, 0.0, -s as f32, gx as f32, gy as f32,
            ));
            placed.push(Placed {
                face: g.face,
                glyph: g.id,
                transform,
                text: std::mem::take(&mut chars).to_string(),
            });
            inside += i64::from(g.advance);
        }
        pen += advance;
    }
}

/// One shaped glyph with the style of its run.
struct Glyph {
    id: u16,
    cluster: usize,
    advance: i32,
    dx: i32,
    dy: i32,
    face: Face,
    /// Em size in mm.
    size: f64,
    /// Baseline offset in mm.
    shift: f64,
}

impl Glyph {
    fn new(
        buffer: &rustybuzz::GlyphBuffer,
        i: usize,
        cluster: usize,
        face: Face,
        size: f64,
        shift: f64,
    ) -> Glyph {
        let (info, pos) = (buffer.glyph_infos()[i], buffer.glyph_positions()[i]);
        Glyph {
            id: info.glyph_id as u16,
            cluster,
            advance: pos.x_advance,
            dx: pos.x_offset,
            dy: pos.y_offset,
            face,
            size,
            shift,
        }
    }

    /// Millimetres per font unit.
    fn scale(&self) -> f64 {
        self.size / f64::from(font::face(self.face).units_per_em())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::layout::{Colour, Role, text};

    fn label(lines: Vec<Vec<Run>>, anchor: Anchor, rotation: f64) -> Text {
        Text {
            x: 50.0,
            y: 20.0,
            lines,
            size_pt: 7.0,
            anchor,
            colour: Colour::hex(0),
            rotation,
            role: Role::Label,
            tag: None,
        }
    }

    /// Where glyph `p`'s origin (font units 0, 0) lands on the page.
    fn origin(p: &Placed) -> (f32, f32) {
        (p.transform.tx, p.transform.ty)
    }

    #[test]
    fn anchors_use_the_width_the_layout_measured() {
        // SVG text-anchor: the line's advance is centred on x (middle) or
        // ends at x (end); the layout measures that advance with the same
        // shaper, so its width is the distance the glyphs span.
        let s = "TS-recombination";
        let w = text::width_mm(s, 7.0) as f32;
        let middle = place(&label(vec![vec![Run::plain(s)]], Anchor::Middle, 0.0));
        assert_eq!(middle.len(), s.chars().count());
        assert!((origin(&middle[0]).0 - (50.0 - w / 2.0)).abs() < 1e-4);
        let end = place(&label(vec![vec![Run::plain(s)]], Anchor::End, 0.0));
        assert!((origin(&end[0]).0 - (50.0 - w)).abs() < 1e-4);
        for p in &end {
            assert_eq!(origin(p).1, 20.0, "on the baseline");
        }
        // Every glyph carries its character, for the PDF's text layer.
        let chars: String = end.iter().map(|p| p.text.as_str()).collect();
        assert_eq!(chars, s);
    }

    #[test]
    fn scripts_are_smaller_and_shifted_and_lines_stack() {
        let em = 7.0 * PT_MM;
        let runs = vec![
            Run::plain("H"),
            Run {
                text: "2".into(),
                script: Script::Sub,
                italic: false,
            },
            Run::plain("O"),
        ];
        let placed = place(&label(
            vec![runs, vec![Run::plain("x")]],
            Anchor::Start,
            0.0,
        ));
        assert_eq!(placed.len(), 4);
        let per_em = font::face(Face::Regular).units_per_em() as f64;
        let scale = |p: &Placed| f64::from(p.transform.sx) * per_em;
        assert!((scale(&placed[0]) - em).abs() < 1e-5);
        assert!((scale(&placed[1]) - SCRIPT_SCALE * em).abs() < 1e-5);
        let y = |p: &Placed| f64::from(origin(p).1);
        assert!((y(&placed[1]) - (20.0 + SUB_DROP * em)).abs() < 1e-4);
        assert!((y(&placed[2]) - 20.0).abs() < 1e-4, "back on the baseline");
        assert!((y(&placed[3]) - (20.0 + LINE_HEIGHT * em)).abs() < 1e-4);
        assert!(
            (origin(&placed[3]).0 - 50.0).abs() < 1e-4,
            "second line at x"
        );
    }

    #[test]
    fn rotation_turns_about_the_anchor_point() {
        // rotate(-90 x y): a point d along the baseline goes to (x, y - d).
        let s = "ΔG";
        let flat = place(&label(vec![vec![Run::plain(s)]], Anchor::Start, 0.0));
        let up = place(&label(vec![vec![Run::plain(s)]], Anchor::Start, -90.0));
        let d = origin(&flat[1]).0 - 50.0;
        assert!((origin(&up[1]).0 - 50.0).abs() < 1e-4);
        assert!((origin(&up[1]).1 - (20.0 - d)).abs() < 1e-4);
    }

    #[test]
    fn spaces_collapse_as_svg_readers_collapse_them() {
        assert_eq!(svg_text("  a \t b\n", false), "a b");
        assert_eq!(svg_text(" a\tb ", true), " a b ");
        assert_eq!(svg_text("a\u{1}b", true), "a\u{FFFD}b");
    }
}
