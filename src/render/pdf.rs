//! PDF output, written straight from the scene with pdf-writer: vector
//! strokes as the SVG describes them, and text as real text (selectable,
//! searchable: a ToUnicode map gives every glyph its characters) in the
//! bundled font, embedded as a subset (subsetter). Glyphs are placed by
//! [`super::glyphs`], exactly where the PNG draws them. The page is the
//! figure's size in mm; the file has no date or other varying metadata, so
//! the same figure always gives the same bytes.

use super::RenderError;
use super::glyphs::{self, Placed};
use crate::font::{self, Face};
use crate::layout::text::PT_MM;
use crate::layout::{Colour, Item, Scene};
use pdf_writer::types::{CidFontType, FontFlags, SystemInfo, UnicodeCmap};
use pdf_writer::{Content, Filter, Finish, Name, Pdf, Rect, Ref, Str};
use std::collections::BTreeMap;

/// Points per millimetre.
const PT_PER_MM: f32 = (72.0 / 25.4) as f32;

/// SVG's default miter limit, which the SVG output leaves unset (PDF's own
/// default is 10).
const MITER_LIMIT: f32 = 4.0;

/// zlib compression level for the PDF's streams. Demo: level 1 gives
/// 18.8 kB for 1.7 M more instructions than fdeflate's 47 kB (which only
/// codes runs of zeros and fixed literals, so a font barely shrinks); level
/// 6 gives 15.5 kB for 4.9 M.
const LEVEL: u8 = 1;

const SYSTEM_INFO: SystemInfo = SystemInfo {
    registry: Str(b"Adobe"),
    ordering: Str(b"Identity"),
    supplement: 0,
};

/// The glyphs of one face used on the page.
#[derive(Default)]
struct Used {
    /// Old glyph id → new (subset) id, in order of first use.
    remapper: subsetter::GlyphRemapper,
    /// New glyph id → the characters it shows.
    text: BTreeMap<u16, String>,
    /// Whether any text is set in this face.
    any: bool,
}

/// The scene as a one-page PDF file.
pub fn to_pdf(scene: &Scene) -> Result<Vec<u8>, RenderError> {
    let (w_pt, h_pt) = (
        (scene.width_mm / 25.4 * 72.0) as f32,
        (scene.height_mm / 25.4 * 72.0) as f32,
    );
    let mut used: [Used; 2] = Default::default();
    let mut content = Content::new();
    // Page mm with y down (the scene's) → PDF points with y up.
    content.transform([PT_PER_MM, 0.0, 0.0, -PT_PER_MM, 0.0, h_pt]);
    content.set_miter_limit(MITER_LIMIT);
    for item in &scene.items {
        match item {
            Item::Line(l)
                if l.points.len() >= 2
                    && stroke_style(&mut content, l.colour, l.width_pt, &l.dash) =>
            {
                let (x, y) = l.points[0];
                content.move_to(x as f32, y as f32);
                for &(x, y) in &l.points[1..] {
                    content.line_to(x as f32, y as f32);
                }
                content.stroke();
            }
            Item::Curve(c)
                if !c.segments.is_empty()
                    && stroke_style(&mut content, c.colour, c.width_pt, &c.dash) =>
            {
                content.move_to(c.start.0 as f32, c.start.1 as f32);
                for [(x1, y1), (x2, y2), (x, y)] in &c.segments {
                    content.cubic_to(
                        *x1 as f32, *y1 as f32, *x2 as f32, *y2 as f32, *x as f32, *y as f32,
                    );
                }
                content.stroke();
            }
            Item::Text(t) => {
                let placed = glyphs::place(t);
                if !placed.is_empty() {
                    text(&mut content, &placed, t.colour, &mut used);
                }
            }
            _ => {}
        }
    }

    let mut pdf = Pdf::new();
    let mut next = 1;
    let mut alloc = || {
        next += 1;
        Ref::new(next - 1)
    };
    let (catalog, pages, page, contents) = (alloc(), alloc(), alloc(), alloc());
    pdf.catalog(catalog).pages(pages);
    pdf.pages(pages).kids([page]).count(1);
    let mut fonts = Vec::new();
    for (i, u) in used.iter().enumerate() {
        if u.any {
            fonts.push((font_name(i), alloc(), i));
        }
    }
    {
        let mut p = pdf.page(page);
        p.media_box(Rect::new(0.0, 0.0, w_pt, h_pt))
            .parent(pages)
            .contents(contents);
        let mut resources = p.resources();
        let mut dict = resources.fonts();
        for (name, id, _) in &fonts {
            dict.pair(Name(name.as_bytes()), *id);
        }
    }
    let data = deflate(&content.finish());
    pdf.stream(contents, &data).filter(Filter::FlateDecode);
    for (_, id, i) in fonts {
        let face = if i == 0 { Face::Regular } else { Face::Italic };
        write_font(&mut pdf, id, face, &used[i], &mut alloc)?;
    }
    Ok(pdf.finish())
}

/// `data` as a zlib stream (PDF's FlateDecode).
fn deflate(data: &[u8]) -> Vec<u8> {
    miniz_oxide::deflate::compress_to_vec_zlib(data, LEVEL)
}

/// The resource name of face number `i`.
fn font_name(i: usize) -> String {
    format!("F{i}")
}

/// Sets colour, width and dash for a stroke; false when nothing is drawn (no
/// width, as in SVG).
fn stroke_style(content: &mut Content, c: Colour, width_pt: f64, dash: &Option<Vec<f64>>) -> bool {
    let width = (width_pt * PT_MM) as f32;
    if !(width > 0.0 && width.is_finite()) {
        return false;
    }
    content.set_stroke_rgb(unit(c.r), unit(c.g), unit(c.b));
    content.set_line_width(width);
    let pattern = dash
        .as_deref()
        .and_then(super::dash_lengths)
        .unwrap_or_default();
    content.set_dash_pattern(pattern, 0.0);
    true
}

fn unit(v: u8) -> f32 {
    f32::from(v) / 255.0
}

/// One text item: each glyph shown at its own place (font size 1, the text
/// matrix maps the em square onto the page), so positions are exactly those
/// of the PNG whatever the PDF reader's idea of kerning.
fn text(content: &mut Content, placed: &[Placed], colour: Colour, used: &mut [Used; 2]) {
    content.set_fill_rgb(unit(colour.r), unit(colour.g), unit(colour.b));
    content.begin_text();
    let mut current = None;
    for p in placed {
        let i = p.face as usize;
        if current != Some(i) {
            content.set_font(Name(font_name(i).as_bytes()), 1.0);
            current = Some(i);
        }
        let u = &mut used[i];
        u.any = true;
        let cid = u.remapper.remap(p.glyph);
        if !p.text.is_empty() {
            u.text.entry(cid).or_insert_with(|| p.text.clone());
        }
        // Font units → page: the em square is 1 text-space unit.
        let per_em = font::face(p.face).units_per_em() as f32;
        let m = p.transform.pre_scale(per_em, per_em);
        content.set_text_matrix([m.sx, m.ky, m.kx, m.sy, m.tx, m.ty]);
        content.show(Str(&cid.to_be_bytes()));
    }
    content.end_text();
}

/// The font objects of one face: a Type 0 font over a CID TrueType font with
/// glyph widths, descriptor, subset font program and ToUnicode map.
fn write_font(
    pdf: &mut Pdf,
    type0: Ref,
    face: Face,
    used: &Used,
    alloc: &mut impl FnMut() -> Ref,
) -> Result<(), RenderError> {
    let (cid, descriptor, cmap_id, program) = (alloc(), alloc(), alloc(), alloc());
    let ttf = font::face(face);
    let per_em = ttf.units_per_em() as f32;
    let to_1000 = |v: f32| v / per_em * 1000.0;
    let name = format!("{}+{}", subset_tag(used), postscript_name(face));

    pdf.type0_font(type0)
        .base_font(Name(name.as_bytes()))
        .encoding_predefined(Name(b"Identity-H"))
        .descendant_font(cid)
        .to_unicode(cmap_id);

    let mut c = pdf.cid_font(cid);
    c.subtype(CidFontType::Type2)
        .base_font(Name(name.as_bytes()))
        .system_info(SYSTEM_INFO)
        .font_descriptor(descriptor)
        .default_width(0.0)
        .cid_to_gid_map_predefined(Name(b"Identity"));
    let widths: Vec<f32> = used
        .remapper
        .remapped_gids()
        .map(|g| {
            to_1000(f32::from(
                ttf.glyph_hor_advance(rustybuzz::ttf_parser::GlyphId(g))
                    .unwrap_or(0),
            ))
        })
        .collect();
    c.widths().consecutive(0, widths);
    c.finish();

    let bbox = ttf.global_bounding_box();
    let mut flags = FontFlags::SYMBOLIC;
    if face == Face::Italic {
        flags |= FontFlags::ITALIC;
    }
    let ascent = to_1000(f32::from(ttf.ascender()));
    pdf.font_descriptor(descriptor)
        .name(Name(name.as_bytes()))
        .flags(flags)
        .bbox(Rect::new(
            to_1000(f32::from(bbox.x_min)),
            to_1000(f32::from(bbox.y_min)),
            to_1000(f32::from(bbox.x_max)),
            to_1000(f32::from(bbox.y_max)),
        ))
        .italic_angle(ttf.italic_angle())
        .ascent(ascent)
        .descent(to_1000(f32::from(ttf.descender())))
        .cap_height(
            ttf.capital_height()
                .map_or(ascent, |h| to_1000(f32::from(h))),
        )
        .stem_v(10.0 + 0.244 * (f32::from(ttf.weight().to_number()) - 50.0))
        .font_file2(program);

    let mut cmap = UnicodeCmap::new(Name(b"Custom"), SYSTEM_INFO);
    for (&g, chars) in &used.text {
        cmap.pair_with_multiple(g, chars.chars());
    }
    pdf.cmap(cmap_id, &cmap.finish());

    let data = match face {
        Face::Regular => font::REGULAR,
        Face::Italic => font::ITALIC,
    };
    let subset = subsetter::subset(data, 0, &used.remapper)
        .map_err(|e| RenderError::Pdf(format!("the bundled font could not be subset: {e}")))?;
    pdf.stream(program, &deflate(&subset))
        .filter(Filter::FlateDecode);
    Ok(())
}

/// The PostScript name of the bundled face.
fn postscript_name(face: Face) -> &'static str {
    match face {
        Face::Regular => "DejaVuSans",
        Face::Italic => "DejaVuSans-Oblique",
    }
}

/// The six capital letters a subset font's name starts with (PDF 1.7,
/// 9.6.4), made from the glyphs it holds (FNV-1a), so the same figure always
/// names it the same.
fn subset_tag(used: &Used) -> String {
    let mut hash: u64 = 0xcbf2_9ce4_8422_2325;
    for g in used.remapper.remapped_gids() {
        for b in g.to_be_bytes() {
            hash = (hash ^ u64::from(b)).wrapping_mul(0x0000_0100_0000_01b3);
        }
    }
    (0..6)
        .map(|i| char::from(b'A' + ((hash >> (i * 5)) % 26) as u8))
        .collect()
}
