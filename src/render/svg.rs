//! SVG output. User units are millimetres (`viewBox` equals the page size in
//! mm), so coordinates in the file are the scene's; type sizes and stroke
//! widths are converted from pt. Text stays `<text>` (editable in any vector
//! editor), and every item carries its role as `class` and its owner as
//! `data-id` (a point) or `data-path` (a path).

use super::xml::{escape, escape_into, num};
use crate::layout::rich::{SCRIPT_SCALE, SUB_DROP, SUPER_RISE};
use crate::layout::text::PT_MM;
use crate::layout::{Anchor, Colour, Curve, Item, Line, Run, Scene, Script, Tag, Text};
use std::fmt::Write;

/// The scene as a standalone SVG document.
pub fn to_svg(scene: &Scene) -> String {
    let mut out = String::with_capacity(4096 + 256 * scene.items.len());
    let (w, h) = (num(scene.width_mm), num(scene.height_mm));
    out.push_str("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n");
    let _ = writeln!(
        out,
        "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" width=\"{w}mm\" height=\"{h}mm\" viewBox=\"0 0 {w} {h}\" font-family=\"{}\">",
        escape(&scene.font_family)
    );
    if let Some(title) = &scene.title {
        out.push_str("<title>");
        escape_into(&mut out, title);
        out.push_str("</title>\n");
    }
    let _ = writeln!(
        out,
        "<rect class=\"background\" x=\"0\" y=\"0\" width=\"{w}\" height=\"{h}\" fill=\"#ffffff\"/>"
    );
    for item in &scene.items {
        match item {
            Item::Line(l) => line(&mut out, l),
            Item::Text(t) => text(&mut out, t),
            Item::Curve(c) => curve(&mut out, c),
        }
    }
    out.push_str("</svg>\n");
    out
}

fn colour(c: Colour) -> String {
    format!("#{:02x}{:02x}{:02x}", c.r, c.g, c.b)
}

fn tag(out: &mut String, tag: &Option<Tag>) {
    match tag {
        Some(Tag::Point(id)) => {
            out.push_str(" data-id=\"");
            escape_into(out, id);
            out.push('"');
        }
        Some(Tag::Path(name)) => {
            out.push_str(" data-path=\"");
            escape_into(out, name);
            out.push('"');
        }
        None => {}
    }
}

fn line(out: &mut String, l: &Line) {
    if l.points.len() < 2 {
        return;
    }
    if l.points.len() == 2 {
        let ((x1, y1), (x2, y2)) = (l.points[0], l.points[1]);
        let _ = write!(
            out,
            "<line class=\"{}\" x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\"",
            l.role.class(),
            num(x1),
            num(y1),
            num(x2),
            num(y2)
        );
    } else {
        let pts: Vec<String> = l
            .points
            .iter()
            .map(|&(x, y)| format!("{},{}", num(x), num(y)))
            .collect();
        let _ = write!(
            out,
            "<polyline class=\"{}\" points=\"{}\" fill=\"none\"",
            l.role.class(),
            pts.join(" ")
        );
    }
    stroke(out, l.colour, l.width_pt, &l.dash);
    tag(out, &l.tag);
    out.push_str("/>\n");
}

/// Stroke colour, width and dash attributes.
fn stroke(out: &mut String, c: Colour, width_pt: f64, dash: &Option<Vec<f64>>) {
    let _ = write!(
        out,
        " stroke=\"{}\" stroke-width=\"{}\"",
        colour(c),
        num(width_pt * PT_MM)
    );
    if let Some(dash) = dash {
        let d: Vec<String> = dash.iter().map(|&v| num(v)).collect();
        let _ = write!(out, " stroke-dasharray=\"{}\"", d.join(" "));
    }
}

/// A curve as one `<path>` of cubic segments.
fn curve(out: &mut String, c: &Curve) {
    if c.segments.is_empty() {
        return;
    }
    let _ = write!(
        out,
        "<path class=\"{}\" d=\"M{},{}",
        c.role.class(),
        num(c.start.0),
        num(c.start.1)
    );
    for seg in &c.segments {
        out.push_str(" C");
        for (i, (x, y)) in seg.iter().enumerate() {
            let _ = write!(
                out,
                "{}{},{}",
                if i == 0 { "" } else { " " },
                num(*x),
                num(*y)
            );
        }
    }
    out.push_str("\" fill=\"none\"");
    stroke(out, c.colour, c.width_pt, &c.dash);
    tag(out, &c.tag);
    out.push_str("/>\n");
}

fn text(out: &mut String, t: &Text) {
    let anchor = match t.anchor {
        Anchor::Start => "start",
        Anchor::Middle => "middle",
        Anchor::End => "end",
    };
    let _ = write!(
        out,
        "<text class=\"{}\" x=\"{}\" y=\"{}\" font-size=\"{}\" text-anchor=\"{}\" fill=\"{}\"",
        t.role.class(),
        num(t.x),
        num(t.y),
        num(t.size_pt * PT_MM),
        anchor,
        colour(t.colour)
    );
    if t.rotation != 0.0 {
        let _ = write!(
            out,
            " transform=\"rotate({} {} {})\"",
            num(t.rotation),
            num(t.x),
            num(t.y)
        );
    }
    tag(out, &t.tag);
    // Styled runs are separate nodes: keep the spaces at their edges.
    if t.lines.iter().flatten().any(|r| !r.is_plain()) {
        out.push_str(" xml:space=\"preserve\"");
    }
    out.push('>');
    let em = t.size_pt * PT_MM;
    let line_dy = crate::layout::text::LINE_HEIGHT * em;
    // Baseline offset of the last run written, relative to its line's baseline.
    let mut shift = 0.0;
    if t.lines.len() == 1 {
        runs(out, &t.lines[0], em, &mut shift);
    } else {
        for (i, l) in t.lines.iter().enumerate() {
            let dy = if i == 0 { 0.0 } else { line_dy } - shift;
            shift = 0.0;
            let dy = if i == 0 { "0".to_string() } else { num(dy) };
            let _ = write!(out, "<tspan x=\"{}\" dy=\"{dy}\">", num(t.x));
            runs(out, l, em, &mut shift);
            out.push_str("</tspan>");
        }
    }
    out.push_str("</text>\n");
}

/// The runs of one line. An upright baseline run is bare text (so labels
/// without markup are written as they always were); others are `<tspan>`s
/// moved with `dy` (understood by every SVG reader), with no whitespace
/// between them.
fn runs(out: &mut String, line: &[Run], em: f64, shift: &mut f64) {
    for r in line {
        let target = match r.script {
            Script::Normal => 0.0,
            Script::Super => -SUPER_RISE * em,
            Script::Sub => SUB_DROP * em,
        };
        if r.is_plain() && *shift == 0.0 {
            escape_into(out, &r.text);
            continue;
        }
        out.push_str("<tspan");
        if target != *shift {
            let _ = write!(out, " dy=\"{}\"", num(target - *shift));
            *shift = target;
        }
        if r.script != Script::Normal {
            let _ = write!(out, " font-size=\"{}\"", num(SCRIPT_SCALE * em));
        }
        if r.italic {
            out.push_str(" font-style=\"italic\"");
        }
        out.push('>');
        escape_into(out, &r.text);
        out.push_str("</tspan>");
    }
}
