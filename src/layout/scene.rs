//! The scene: plain, positioned drawing data in millimetres. It is the only
//! thing a renderer sees, so it carries everything needed to draw (colours,
//! widths, font sizes) and nothing about chemistry.

use super::rich;

/// An sRGB colour.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Colour {
    /// Red, 0–255.
    pub r: u8,
    /// Green, 0–255.
    pub g: u8,
    /// Blue, 0–255.
    pub b: u8,
}

impl Colour {
    /// A colour from a 0xRRGGBB literal, so palettes read like their sources.
    pub const fn hex(rgb: u32) -> Colour {
        Colour {
            r: ((rgb >> 16) & 0xff) as u8,
            g: ((rgb >> 8) & 0xff) as u8,
            b: (rgb & 0xff) as u8,
        }
    }
}

/// An axis-aligned rectangle in mm (y grows downwards, as on the page).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Rect {
    /// Left edge.
    pub x0: f64,
    /// Top edge.
    pub y0: f64,
    /// Right edge.
    pub x1: f64,
    /// Bottom edge.
    pub y1: f64,
}

impl Rect {
    /// True when the interiors overlap (touching edges do not count).
    pub fn intersects(&self, other: &Rect) -> bool {
        self.x0 < other.x1 && other.x0 < self.x1 && self.y0 < other.y1 && other.y0 < self.y1
    }

    /// The rectangle grown by `d` on every side.
    pub fn inflate(&self, d: f64) -> Rect {
        Rect {
            x0: self.x0 - d,
            y0: self.y0 - d,
            x1: self.x1 + d,
            y1: self.y1 + d,
        }
    }

    /// True when `other` lies entirely inside `self`.
    pub fn contains(&self, other: &Rect) -> bool {
        other.x0 >= self.x0 && other.x1 <= self.x1 && other.y0 >= self.y0 && other.y1 <= self.y1
    }

    /// The point of the rectangle nearest to `(x, y)`.
    pub fn nearest(&self, x: f64, y: f64) -> (f64, f64) {
        (x.clamp(self.x0, self.x1), y.clamp(self.y0, self.y1))
    }
}

/// What a scene item belongs to, so an SVG can be restyled or scripted by id.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Tag {
    /// A stationary point, by its file id.
    Point(String),
    /// A path, by its name.
    Path(String),
}

/// The role of an item in the figure; renderers turn it into a class name.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Role {
    /// The horizontal bar of a stationary point.
    Bar,
    /// A dashed line joining two consecutive points of a path.
    Connector,
    /// A thin line from a displaced text back to its bar.
    Leader,
    /// The y axis line.
    Axis,
    /// A tick mark on the y axis.
    Tick,
    /// A tick number.
    TickLabel,
    /// The y axis title.
    AxisLabel,
    /// The energy printed above a bar.
    Value,
    /// The name printed below a bar.
    Label,
    /// The x caption ("reaction coordinate").
    Caption,
    /// The line sample of a legend entry.
    LegendSample,
    /// The path name of a legend entry.
    LegendText,
    /// The thin horizontal line at zero energy.
    ZeroLine,
    /// The zigzag marking a break in the energy axis.
    AxisBreak,
    /// The band behind a rate-determining bar.
    Highlight,
    /// An arrow, bracket or guide of an annotation.
    Annotation,
    /// The text of an annotation (ΔG‡, ΔΔG‡ and ratio, δE and TOF).
    AnnotationText,
}

impl Role {
    /// A stable, CSS-friendly name.
    pub fn class(self) -> &'static str {
        match self {
            Role::Bar => "bar",
            Role::Connector => "connector",
            Role::Leader => "leader",
            Role::Axis => "axis",
            Role::Tick => "tick",
            Role::TickLabel => "tick-label",
            Role::AxisLabel => "axis-label",
            Role::Value => "value",
            Role::Label => "label",
            Role::Caption => "caption",
            Role::LegendSample => "legend-sample",
            Role::LegendText => "legend-text",
            Role::ZeroLine => "zero-line",
            Role::AxisBreak => "axis-break",
            Role::Highlight => "highlight",
            Role::Annotation => "annotation",
            Role::AnnotationText => "annotation-text",
        }
    }
}

/// A straight line or polyline.
#[derive(Debug, Clone, PartialEq)]
pub struct Line {
    /// Vertices in mm; at least two.
    pub points: Vec<(f64, f64)>,
    /// Stroke colour.
    pub colour: Colour,
    /// Stroke width in pt (journals specify line widths in points).
    pub width_pt: f64,
    /// Dash pattern in mm (on, off, …); `None` is solid.
    pub dash: Option<Vec<f64>>,
    /// What the line is.
    pub role: Role,
    /// What it belongs to.
    pub tag: Option<Tag>,
}

/// A smooth line: cubic Bézier segments from `start`.
#[derive(Debug, Clone, PartialEq)]
pub struct Curve {
    /// Where the curve begins, mm.
    pub start: (f64, f64),
    /// Segments as (first control, second control, end point), mm.
    pub segments: Vec<[(f64, f64); 3]>,
    /// Stroke colour.
    pub colour: Colour,
    /// Stroke width in pt.
    pub width_pt: f64,
    /// Dash pattern in mm; `None` is solid.
    pub dash: Option<Vec<f64>>,
    /// What the curve is.
    pub role: Role,
    /// What it belongs to.
    pub tag: Option<Tag>,
}

/// Vertical position of a run of text.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Script {
    /// On the baseline, full size.
    Normal,
    /// Lowered and smaller.
    Sub,
    /// Raised and smaller.
    Super,
}

/// A piece of a text line in one style.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Run {
    /// The characters, as shown.
    pub text: String,
    /// Baseline position and size.
    pub script: Script,
    /// Set in the italic face.
    pub italic: bool,
}

impl Run {
    /// An upright run on the baseline.
    pub fn plain(text: impl Into<String>) -> Run {
        Run {
            text: text.into(),
            script: Script::Normal,
            italic: false,
        }
    }

    /// True for an upright run on the baseline.
    pub fn is_plain(&self) -> bool {
        self.script == Script::Normal && !self.italic
    }
}

/// One line of text as styled runs.
pub type RichLine = Vec<Run>;

/// Horizontal alignment of text relative to its x position.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Anchor {
    /// x is the left end.
    Start,
    /// x is the centre.
    Middle,
    /// x is the right end.
    End,
}

/// A text block of one or more lines.
#[derive(Debug, Clone, PartialEq)]
pub struct Text {
    /// x position in mm (meaning set by `anchor`).
    pub x: f64,
    /// Baseline of the first line, in mm.
    pub y: f64,
    /// Lines of styled runs, top to bottom; the layout breaks long labels itself.
    pub lines: Vec<RichLine>,
    /// Font size in pt.
    pub size_pt: f64,
    /// Horizontal alignment.
    pub anchor: Anchor,
    /// Fill colour.
    pub colour: Colour,
    /// Rotation in degrees about `(x, y)`, clockwise as in SVG; 0 is upright.
    pub rotation: f64,
    /// What the text is.
    pub role: Role,
    /// What it belongs to.
    pub tag: Option<Tag>,
}

impl Text {
    /// The estimated bounding box on the page (rotation included), from the
    /// same width table the layout used to place it.
    pub fn bbox(&self) -> Rect {
        rich::block_box(
            self.x,
            self.y,
            &self.lines,
            self.size_pt,
            self.anchor,
            self.rotation,
        )
    }

    /// The lines without styling, for searching and tests.
    pub fn plain_lines(&self) -> Vec<String> {
        self.lines.iter().map(|l| rich::plain(l)).collect()
    }
}

/// One drawable item.
#[derive(Debug, Clone, PartialEq)]
pub enum Item {
    /// A line or polyline.
    Line(Line),
    /// A text block.
    Text(Text),
    /// A smooth curve.
    Curve(Curve),
}

/// A laid-out figure: page size plus items in drawing order.
#[derive(Debug, Clone, PartialEq)]
pub struct Scene {
    /// Page width in mm.
    pub width_mm: f64,
    /// Page height in mm.
    pub height_mm: f64,
    /// Not drawn (journals put titles in the caption); carried as metadata.
    pub title: Option<String>,
    /// Font family list for every text.
    pub font_family: String,
    /// Items, painted in order.
    pub items: Vec<Item>,
}

impl Scene {
    /// Every text item, in drawing order.
    pub fn texts(&self) -> impl Iterator<Item = &Text> {
        self.items.iter().filter_map(|item| match item {
            Item::Text(t) => Some(t),
            _ => None,
        })
    }

    /// Every line item, in drawing order.
    pub fn lines(&self) -> impl Iterator<Item = &Line> {
        self.items.iter().filter_map(|item| match item {
            Item::Line(l) => Some(l),
            _ => None,
        })
    }

    /// Every curve, in drawing order.
    pub fn curves(&self) -> impl Iterator<Item = &Curve> {
        self.items.iter().filter_map(|item| match item {
            Item::Curve(c) => Some(c),
            _ => None,
        })
    }

    /// The straight pieces of every line and curve drawn in `role` (curves
    /// as the placement sees them, [`super::connect::CHORDS`] chords each),
    /// for checks that texts keep clear of them.
    pub fn strokes(&self, role: Role) -> Vec<((f64, f64), (f64, f64))> {
        let mut out = Vec::new();
        for item in &self.items {
            match item {
                Item::Line(l) if l.role == role => {
                    out.extend(l.points.windows(2).map(|w| (w[0], w[1])));
                }
                Item::Curve(c) if c.role == role => {
                    let mut from = c.start;
                    for seg in &c.segments {
                        out.extend(super::connect::flatten(from, seg, super::connect::CHORDS));
                        from = seg[2];
                    }
                }
                _ => {}
            }
        }
        out
    }

    /// The estimated bounding box of every text, in drawing order, so tests
    /// (and later stages) can check that no two texts overlap.
    pub fn text_boxes(&self) -> Vec<Rect> {
        self.texts().map(Text::bbox).collect()
    }

    /// Pairs of texts whose boxes overlap (indices into [`Scene::text_boxes`]).
    pub fn overlapping_texts(&self) -> Vec<(usize, usize)> {
        let boxes = self.text_boxes();
        let mut out = Vec::new();
        for i in 0..boxes.len() {
            for j in i + 1..boxes.len() {
                if boxes[i].intersects(&boxes[j]) {
                    out.push((i, j));
                }
            }
        }
        out
    }
}
