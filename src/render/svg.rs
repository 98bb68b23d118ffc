//! SVG output. User units are millimetres (`viewBox` equals the page size in
//! mm), so coordinates in the file are the scene's; type sizes and stroke
//! widths are converted from pt. Text stays `<text>` (editable in any vector
//! editor), and every item carries its role as `class` and its owner as
//! `data-id` (a point) or `data-path` (a path).

use super::xml::{escape, escape_into, num};
use crate::layout::text::PT_MM;
use crate::layout::{Anchor, Colour, Item, Line, Scene, Tag, Text};
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
    let _ = write!(
        out,
        " stroke=\"{}\" stroke-width=\"{}\"",
        colour(l.colour),
        num(l.width_pt * PT_MM)
    );
    if let Some(dash) = &l.dash {
        let d: Vec<String> = dash.iter().map(|&v| num(v)).collect();
        let _ = write!(out, " stroke-dasharray=\"{}\"", d.join(" "));
    }
    tag(out, &l.tag);
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
    out.push('>');
    if t.lines.len() == 1 {
        escape_into(out, &t.lines[0]);
    } else {
        let dy = num(crate::layout::text::LINE_HEIGHT * t.size_pt * PT_MM);
        for (i, l) in t.lines.iter().enumerate() {
            let _ = write!(
                out,
                "<tspan x=\"{}\" dy=\"{}\">",
                num(t.x),
                if i == 0 { "0" } else { &dy }
            );
            escape_into(out, l);
            out.push_str("</tspan>");
        }
    }
    out.push_str("</text>\n");
}
