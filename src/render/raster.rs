//! The scene drawn straight onto a tiny-skia pixmap, without writing SVG text
//! and parsing it back: the PNG's pixels.
//!
//! It draws what [`super::svg`] describes, the way an SVG renderer (resvg)
//! draws it: strokes with butt caps, miter joins (limit 4) and the scene's
//! dash patterns; text as the bundled font's glyph outlines, placed by
//! [`super::glyphs`]. Glyph outlines are read once per (face, glyph) and
//! kept in font units.
//!
//! Everything is prepared once for the page's resolution ([`Page::new`]):
//! strokes dashed and outlined, text turned into pixel coverage (exact-area
//! rasterising of the glyph outlines, several times faster than tiny-skia's
//! scan converter for the many small curves of text). The page is then
//! painted band by band ([`Page::draw`]) without repeating any of that.

use crate::font::{self, Face};
use crate::layout::text::PT_MM;
use crate::layout::{Colour, Curve, Item, Line, Scene, Text};
use std::cell::RefCell;
use std::collections::HashMap;
use tiny_skia::{FillRule, Paint, Path, PathBuilder, PathSegment, PixmapMut, Stroke, Transform};

/// SVG's default miter limit (`stroke-miterlimit`), which the SVG output
/// leaves unset.
const MITER_LIMIT: f32 = 4.0;

/// A scene ready to draw at one resolution: strokes as paths in page
/// millimetres, text as coverage in pixels, in painting order.
pub(super) struct Page {
    ops: Vec<Op>,
    /// Page mm to pixels.
    scale: Transform,
}

/// One thing to paint.
enum Op {
    /// A filled outline (text, or a stroke already turned into its outline).
    Fill(Path, Colour),
    /// A stroke thin enough to be drawn as a hairline at the scale it was
    /// prepared for (tiny-skia draws those specially), kept as a stroke.
    Stroke(Path, Colour, Stroke),
    /// Text: how much of each pixel its glyphs cover, glyph by glyph.
    Coverage(Vec<Coverage>, Colour),
}

impl Page {
    /// Prepares `scene` for drawing with `scale` (mm to pixels, without the
    /// offset of a band): strokes are outlined as precisely as it needs.
    pub(super) fn new(scene: &Scene, transform: Transform) -> Page {
        // tiny-skia's measure of how far a transform magnifies.
        let scale = (transform.sx.hypot(transform.kx)).max(transform.ky.hypot(transform.sy));
        let mut ops = Vec::with_capacity(scene.items.len());
        // One coverage grid for every text, grown as needed (a fresh large
        // buffer per text is fresh pages for the kernel to fault in).
        let mut grid = ab_glyph_rasterizer::Rasterizer::new(0, 0);
        for item in &scene.items {
            let op = match item {
                Item::Line(l) => {
                    line_path(l).and_then(|p| stroked(p, l.colour, l.width_pt, &l.dash, scale))
                }
                Item::Curve(c) => {
                    curve_path(c).and_then(|p| stroked(p, c.colour, c.width_pt, &c.dash, scale))
                }
                Item::Text(t) => Some(Op::Coverage(
                    text_coverage(t, transform, &mut grid),
                    t.colour,
                )),
            };
            ops.extend(op);
        }
        Page {
            ops,
            scale: transform,
        }
    }

    /// Paints the page onto `pixmap`, whose top row is the page's row
    /// `first_row` (tiny-skia skips what falls outside the pixmap).
    pub(super) fn draw(&self, pixmap: &mut PixmapMut, first_row: u32) {
        let transform = self.scale.post_translate(0.0, -(first_row as f32));
        for op in &self.ops {
            match op {
                Op::Coverage(glyphs, colour) => {
                    for g in glyphs {
                        g.paint(pixmap, first_row, *colour);
                    }
                }
                Op::Fill(path, colour) => {
                    pixmap.fill_path(path, &paint(*colour), FillRule::Winding, transform, None);
                }
                Op::Stroke(path, colour, stroke) => {
                    pixmap.stroke_path(path, &paint(*colour), stroke, transform, None);
                }
            }
        }
    }
}

/// An opaque, anti-aliased solid paint.
fn paint(c: Colour) -> Paint<'static> {
    let mut paint = Paint::default();
    paint.set_color_rgba8(c.r, c.g, c.b, 255);
    paint.anti_alias = true;
    paint
}

fn line_path(l: &Line) -> Option<Path> {
    let (first, rest) = l.points.split_first()?;
    if rest.is_empty() {
        return None;
    }
    let mut pb = PathBuilder::with_capacity(l.points.len(), l.points.len());
    pb.move_to(first.0 as f32, first.1 as f32);
    for &(x, y) in rest {
        pb.line_to(x as f32, y as f32);
    }
    pb.finish()
}

fn curve_path(c: &Curve) -> Option<Path> {
    if c.segments.is_empty() {
        return None;
    }
    let mut pb = PathBuilder::with_capacity(1 + c.segments.len(), 1 + 3 * c.segments.len());
    pb.move_to(c.start.0 as f32, c.start.1 as f32);
    for [(x1, y1), (x2, y2), (x, y)] in &c.segments {
        pb.cubic_to(
            *x1 as f32, *y1 as f32, *x2 as f32, *y2 as f32, *x as f32, *y as f32,
        );
    }
    pb.finish()
}

/// The stroke of `path` as it will be painted at `scale` px/mm: its outline
/// (dashed first), so bands only fill it, or the stroke itself when it is a
/// hairline (at most a pixel wide), which tiny-skia draws with a coverage
/// rule of its own. `None` when nothing is drawn (no width, as in SVG).
fn stroked(
    path: Path,
    colour: Colour,
    width_pt: f64,
    dash: &Option<Vec<f64>>,
    scale: f32,
) -> Option<Op> {
    let width = (width_pt * PT_MM) as f32;
    if !(width > 0.0 && width.is_finite()) {
        return None;
    }
    let mut stroke = Stroke {
        width,
        miter_limit: MITER_LIMIT,
        ..Stroke::default()
    };
    stroke.dash = dash.as_deref().and_then(dash_pattern);
    if width * scale <= 1.0 {
        return Some(Op::Stroke(path, colour, stroke));
    }
    // What `PixmapMut::stroke_path` does for a stroke wider than a pixel,
    // done once instead of once per band.
    let res_scale = scale;
    let path = match stroke.dash.take() {
        Some(d) => path.dash(&d, res_scale)?,
        None => path,
    };
    Some(Op::Fill(path.stroke(&stroke, res_scale)?, colour))
}

/// The scene's dash list as tiny-skia dashes it (see [`super::dash_lengths`]).
fn dash_pattern(dash: &[f64]) -> Option<tiny_skia::StrokeDash> {
    tiny_skia::StrokeDash::new(super::dash_lengths(dash)?, 0.0)
}

/// The coverage of every glyph of `t` drawn with `transform` (mm to
/// pixels), one tight block per glyph: far fewer pixels to fill and paint
/// than one block around the whole text.
fn text_coverage(
    t: &Text,
    transform: Transform,
    grid: &mut ab_glyph_rasterizer::Rasterizer,
) -> Vec<Coverage> {
    let placed = super::glyphs::place(t);
    OUTLINES.with(|cell| {
        let mut outlines = cell.borrow_mut();
        if outlines.len() >= MAX_OUTLINES {
            outlines.clear();
        }
        placed
            .iter()
            .filter_map(|p| {
                let outline = outlines
                    .entry((p.face, p.glyph))
                    .or_insert_with(|| outline(p.face, p.glyph));
                let path = outline.as_ref()?;
                Coverage::new(path, transform.pre_concat(p.transform), grid)
            })
            .collect()
    })
}

/// How many glyph outlines a thread keeps before it starts over.
const MAX_OUTLINES: usize = 4096;

thread_local! {
    /// Glyph outlines in font units by face and glyph id (`None`: no ink).
    static OUTLINES: RefCell<HashMap<(Face, u16), Option<Path>>> = RefCell::default();
}

/// The outline of `glyph` in font units, or `None` for a glyph without ink.
fn outline(face: Face, glyph: u16) -> Option<Path> {
    struct Builder(PathBuilder);
    impl rustybuzz::ttf_parser::OutlineBuilder for Builder {
        fn move_to(&mut self, x: f32, y: f32) {
            self.0.move_to(x, y);
        }
        fn line_to(&mut self, x: f32, y: f32) {
            self.0.line_to(x, y);
        }
        fn quad_to(&mut self, x1: f32, y1: f32, x: f32, y: f32) {
            self.0.quad_to(x1, y1, x, y);
        }
        fn curve_to(&mut self, x1: f32, y1: f32, x2: f32, y2: f32, x: f32, y: f32) {
            self.0.cubic_to(x1, y1, x2, y2, x, y);
        }
        fn close(&mut self) {
            self.0.close();
        }
    }
    let mut b = Builder(PathBuilder::new());
    font::face(face).outline_glyph(rustybuzz::ttf_parser::GlyphId(glyph), &mut b)?;
    b.0.finish()
}

/// The coverage of a filled outline over a block of pixels, 0–255 each,
/// computed once as exact areas (ab_glyph_rasterizer, the font-rs method):
/// text is most of a figure's edges, and this is several times faster than
/// scan-converting every glyph in every band, with edges as smooth.
struct Coverage {
    /// Left column of the block on the page.
    x0: i64,
    /// Top row of the block on the page.
    y0: i64,
    /// Width of the block in pixels.
    w: usize,
    /// Coverage, row by row.
    alpha: Vec<u8>,
}

impl Coverage {
    /// The coverage of `path` mapped by `ts` into page pixels (closed
    /// contours, non-zero winding as glyphs are drawn), or `None` when it has
    /// no area.
    fn new(
        path: &Path,
        ts: Transform,
        r: &mut ab_glyph_rasterizer::Rasterizer,
    ) -> Option<Coverage> {
        use ab_glyph_rasterizer::{Point, Rasterizer, point};
        let map = |p: tiny_skia::Point| {
            let mut q = [p];
            ts.map_points(&mut q);
            q[0]
        };
        // The mapped corners of the outline's box bound the mapped outline
        // (an affine map keeps a Bézier inside its control points' hull).
        let b = path.bounds();
        let corners = [
            map(tiny_skia::Point::from_xy(b.left(), b.top())),
            map(tiny_skia::Point::from_xy(b.right(), b.top())),
            map(tiny_skia::Point::from_xy(b.left(), b.bottom())),
            map(tiny_skia::Point::from_xy(b.right(), b.bottom())),
        ];
        let (mut left, mut top, mut right, mut bottom) = (f32::MAX, f32::MAX, f32::MIN, f32::MIN);
        for c in corners {
            left = left.min(c.x);
            top = top.min(c.y);
            right = right.max(c.x);
            bottom = bottom.max(c.y);
        }
        if !(left.is_finite() && top.is_finite() && right.is_finite() && bottom.is_finite()) {
            return None;
        }
        // One spare pixel on every side: the rasterizer may touch the pixel
        // right of an edge.
        let x0 = left.floor() as i64 - 1;
        let y0 = top.floor() as i64 - 1;
        let w = (right.ceil() as i64 - x0 + 2) as usize;
        let h = (bottom.ceil() as i64 - y0 + 2) as usize;
        if w.checked_mul(h).is_none_or(|n| n > 1 << 28) {
            return None;
        }
        r.reset(w, h);
        let at = |p: tiny_skia::Point| {
            let p = map(p);
            point(p.x - x0 as f32, p.y - y0 as f32)
        };
        let (mut start, mut last): (Option<Point>, Point) = (None, point(0.0, 0.0));
        let close = |r: &mut Rasterizer, start: Option<Point>, last: Point| {
            if let Some(s) = start.filter(|s| *s != last) {
                r.draw_line(last, s);
            }
        };
        for seg in path.segments() {
            match seg {
                PathSegment::MoveTo(p) => {
                    close(r, start, last);
                    last = at(p);
                    start = Some(last);
                }
                PathSegment::LineTo(p) => {
                    let p = at(p);
                    r.draw_line(last, p);
                    last = p;
                }
                PathSegment::QuadTo(p1, p) => {
                    let p = at(p);
                    r.draw_quad(last, at(p1), p);
                    last = p;
                }
                PathSegment::CubicTo(p1, p2, p) => {
                    let p = at(p);
                    r.draw_cubic(last, at(p1), at(p2), p);
                    last = p;
                }
                PathSegment::Close => {
                    close(r, start, last);
                    last = start.unwrap_or(last);
                }
            }
        }
        close(r, start, last);
        let mut alpha = vec![0u8; w * h];
        r.for_each_pixel(|i, a| alpha[i] = (a.min(1.0) * 255.0 + 0.5) as u8);
        Some(Coverage { x0, y0, w, alpha })
    }

    /// Paints `colour` over the part of `pixmap` (whose top row is page row
    /// `first_row`) the block covers, each pixel in proportion to its
    /// coverage: source-over of an opaque colour, as tiny-skia paints.
    fn paint(&self, pixmap: &mut PixmapMut, first_row: u32, colour: Colour) {
        let (pw, ph) = (pixmap.width() as i64, pixmap.height() as i64);
        let h = (self.alpha.len() / self.w) as i64;
        let top = self.y0 - i64::from(first_row);
        let rows = top.max(0)..(top + h).min(ph);
        let cols = self.x0.max(0)..(self.x0 + self.w as i64).min(pw);
        if rows.is_empty() || cols.is_empty() {
            return;
        }
        let data = pixmap.data_mut();
        let src = [
            u32::from(colour.r),
            u32::from(colour.g),
            u32::from(colour.b),
        ];
        for y in rows {
            let line = &self.alpha[(y - top) as usize * self.w..][..self.w];
            let row = &mut data[(y * pw) as usize * 4..][..pw as usize * 4];
            for x in cols.clone() {
                let a = u32::from(line[(x - self.x0) as usize]);
                if a == 0 {
                    continue;
                }
                let px = &mut row[x as usize * 4..][..3];
                for (d, s) in px.iter_mut().zip(src) {
                    *d = ((s * a + u32::from(*d) * (255 - a) + 127) / 255) as u8;
                }
            }
        }
    }
}
