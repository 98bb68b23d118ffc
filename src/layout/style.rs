//! The look of a figure: page size, fonts, line widths and colours. Sizes are
//! in the units journals state them in (mm for the page, pt for type and
//! lines) so a figure can be made at its final printed size.

use super::connect::Connector;
use super::scene::Colour;
use crate::model::{Dash, FigureHints, PathStyle};

/// Okabe, M. & Ito, K. (2008) "Color Universal Design (CUD): how to make
/// figures and presentations that are friendly to colorblind people",
/// <https://jfly.uni-koeln.de/color/>. Ordered so that neighbouring paths also
/// differ in lightness (they stay apart in greyscale); the yellow of the
/// original set is left out because it vanishes on white paper.
pub const OKABE_ITO: [Colour; 7] = [
    Colour::hex(0x0072B2), // blue
    Colour::hex(0xD55E00), // vermillion
    Colour::hex(0x009E73), // bluish green
    Colour::hex(0xCC79A7), // reddish purple
    Colour::hex(0x000000), // black
    Colour::hex(0xE69F00), // orange
    Colour::hex(0x56B4E9), // sky blue
];

/// Settings for one figure. `Default` is a single journal column.
#[derive(Debug, Clone, PartialEq)]
pub struct Style {
    /// Page width in mm (85 mm is a single column in most journals).
    pub width_mm: f64,
    /// Page height in mm.
    pub height_mm: f64,
    /// Font family list written into the figure.
    pub font_family: String,
    /// Size of point labels in pt.
    pub label_pt: f64,
    /// Size of energy values in pt.
    pub value_pt: f64,
    /// Size of tick numbers and the x caption in pt.
    pub tick_pt: f64,
    /// Size of the y-axis title in pt.
    pub axis_label_pt: f64,
    /// Smallest size the placement may shrink a label or value to, in pt
    /// (5 pt is about the smallest type journals accept at final size).
    pub min_text_pt: f64,
    /// Stroke of the energy bars in pt.
    pub bar_pt: f64,
    /// Stroke of the connectors in pt.
    pub connector_pt: f64,
    /// Stroke of the axis and ticks in pt.
    pub axis_pt: f64,
    /// Preferred length of an energy bar in mm (shortened when columns are narrow).
    pub bar_width_mm: f64,
    /// One colour per path, reused cyclically.
    pub palette: Vec<Colour>,
    /// One dash pattern per path (mm), reused cyclically, so paths stay
    /// distinct in greyscale print.
    pub dashes: Vec<Vec<f64>>,
    /// Colour of text, axis and points on no path.
    pub ink: Colour,
    /// Colour of leader lines.
    pub leader: Colour,
    /// Caption under the plot (`None` to omit).
    pub x_caption: Option<String>,
    /// Empty border around everything, in mm.
    pub margin_mm: f64,
    /// Straight or smooth connectors.
    pub connector: Connector,
    /// Draw a thin line at zero energy.
    pub zero_line: bool,
    /// Cut the energy axis when a state lies far below the rest (rule in
    /// `layout::vertical`).
    pub axis_break: bool,
    /// Stroke of annotation arrows and brackets in pt.
    pub annotation_pt: f64,
    /// Size of annotation texts in pt.
    pub annotation_text_pt: f64,
    /// Colour of the band behind rate-determining bars (light, so it reads
    /// as emphasis in greyscale too).
    pub highlight: Colour,
    /// Colour of the zero line.
    pub zero_colour: Colour,
    /// Per-path overrides of colour, dash and width (by path index).
    pub path_looks: Vec<PathStyle>,
    /// Gap between neighbouring bars as a multiple of the bar length, when
    /// the profile sets it; otherwise bars take at most 65 % of a column.
    pub bar_gap: Option<f64>,
}

impl Default for Style {
    fn default() -> Self {
        Style {
            width_mm: 85.0,
            height_mm: 65.0,
            // The bundled font, whose widths the layout measures with.
            font_family: crate::font::FONT_FAMILY_LIST.into(),
            label_pt: 7.0,
            value_pt: 7.0,
            tick_pt: 7.0,
            axis_label_pt: 8.0,
            min_text_pt: 5.0,
            bar_pt: 2.0,
            connector_pt: 0.75,
            axis_pt: 0.6,
            bar_width_mm: 6.0,
            palette: OKABE_ITO.to_vec(),
            dashes: vec![
                vec![1.2, 0.8],
                vec![0.4, 0.6],
                vec![2.4, 0.6, 0.4, 0.6],
                vec![2.4, 1.2],
                vec![0.8, 0.8, 0.8, 1.6],
            ],
            ink: Colour::hex(0x000000),
            leader: Colour::hex(0x808080),
            x_caption: Some("reaction coordinate".into()),
            margin_mm: 1.0,
            connector: Connector::Straight,
            zero_line: false,
            axis_break: false,
            annotation_pt: 0.5,
            annotation_text_pt: 6.5,
            highlight: Colour::hex(0xD9D9D9),
            zero_colour: Colour::hex(0xBFBFBF),
            path_looks: Vec::new(),
            bar_gap: None,
        }
    }
}

impl Style {
    fn look(&self, i: usize) -> PathStyle {
        self.path_looks.get(i).copied().unwrap_or_default()
    }

    /// The colour of path number `i`.
    pub fn path_colour(&self, i: usize) -> Colour {
        if let Some(c) = self.look(i).colour {
            Colour::hex(c)
        } else if self.palette.is_empty() {
            self.ink
        } else {
            self.palette[i % self.palette.len()]
        }
    }

    /// The dash pattern of path number `i`. A named pattern scales with the
    /// path's stroke, so a heavier line keeps its look.
    pub fn path_dash(&self, i: usize) -> Option<Vec<f64>> {
        if let Some(d) = self.look(i).dash {
            let k = self.path_width(i) / Style::default().connector_pt;
            let pattern: &[f64] = match d {
                Dash::Solid => return None,
                Dash::Dashed => &[2.4, 1.2],
                Dash::Dotted => &[0.4, 0.6],
                Dash::DashDot => &[2.4, 0.6, 0.4, 0.6],
            };
            return Some(pattern.iter().map(|v| v * k).collect());
        }
        if self.dashes.is_empty() {
            None
        } else {
            Some(self.dashes[i % self.dashes.len()].clone())
        }
    }

    /// The connector stroke of path number `i`, in pt.
    pub fn path_width(&self, i: usize) -> f64 {
        self.look(i).width_pt.unwrap_or(self.connector_pt)
    }

    /// Length of an energy bar in a column `col_w` mm wide: the preferred
    /// length, shortened so the gap to the next bar keeps its share.
    pub fn bar_length(&self, col_w: f64) -> f64 {
        match self.bar_gap {
            Some(gap) => self.bar_width_mm.min(col_w / (1.0 + gap)),
            None => self.bar_width_mm.min(0.65 * col_w),
        }
    }

    /// The style with the profile's own settings applied. A `spacing` without
    /// a `bar_width` lets bars grow with their columns.
    pub fn with_hints(&self, hints: &FigureHints) -> Style {
        let mut s = self.clone();
        s.path_looks = hints.paths.clone();
        s.bar_gap = hints.spacing;
        match (hints.bar_width_mm, hints.spacing) {
            (Some(w), _) => s.bar_width_mm = w,
            (None, Some(_)) => s.bar_width_mm = s.width_mm,
            (None, None) => {}
        }
        s
    }
}

/// Preset names with what they are for, for help texts and docs.
pub const PRESETS: &[(&str, &str)] = &[
    ("article", "single journal column: 85 × 65 mm, 7 pt type"),
    (
        "article-wide",
        "double journal column: 175 × 90 mm, 8 pt type",
    ),
    ("slide", "a slide: 240 × 135 mm, 14 pt type, heavier lines"),
    (
        "poster",
        "a poster panel: 300 × 200 mm, 22 pt type, heavy lines",
    ),
];

impl Style {
    /// The preset called `name` (see [`PRESETS`]); `None` for an unknown name.
    pub fn preset(name: &str) -> Option<Style> {
        let base = Style::default();
        // (width, height, type pt, line factor)
        let (w, h, pt, k) = match name {
            "article" => return Some(base),
            "article-wide" => (175.0, 90.0, 8.0, 1.0),
            "slide" => (240.0, 135.0, 14.0, 2.0),
            "poster" => (300.0, 200.0, 22.0, 2.8),
            _ => return None,
        };
        let f = pt / base.label_pt;
        Some(Style {
            width_mm: w,
            height_mm: h,
            label_pt: pt,
            value_pt: pt,
            tick_pt: pt,
            axis_label_pt: pt + 1.0,
            min_text_pt: base.min_text_pt * f,
            annotation_text_pt: base.annotation_text_pt * f,
            bar_pt: base.bar_pt * k,
            connector_pt: base.connector_pt * k,
            axis_pt: base.axis_pt * k,
            annotation_pt: base.annotation_pt * k,
            bar_width_mm: base.bar_width_mm * f.sqrt() * 1.5,
            dashes: base
                .dashes
                .iter()
                .map(|d| d.iter().map(|v| v * k).collect())
                .collect(),
            margin_mm: base.margin_mm * k,
            ..base
        })
    }
}
