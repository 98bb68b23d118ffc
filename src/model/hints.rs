//! What a profile says about its own figure: per-path line style, pinned
//! columns and spacing. Pure data read by `figure`; nothing here changes a
//! computed number.

/// A line pattern with a name a user can write (`dash = "dotted"`).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Dash {
    /// An unbroken line.
    Solid,
    /// Long dashes.
    Dashed,
    /// Dots.
    Dotted,
    /// Alternating dash and dot.
    DashDot,
}

impl Dash {
    /// Every pattern, in documentation order.
    pub const ALL: [Dash; 4] = [Dash::Solid, Dash::Dashed, Dash::Dotted, Dash::DashDot];

    /// The name used in profiles and the docs.
    pub fn name(self) -> &'static str {
        match self {
            Dash::Solid => "solid",
            Dash::Dashed => "dashed",
            Dash::Dotted => "dotted",
            Dash::DashDot => "dash-dot",
        }
    }

    /// The pattern called `name` (case and `_`/`-` insensitive).
    pub fn from_name(name: &str) -> Option<Dash> {
        let name = name.trim().to_ascii_lowercase().replace('_', "-");
        Dash::ALL.into_iter().find(|d| d.name() == name)
    }
}

/// A `[[path]]` table's own line style; `None` keeps the figure's default.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct PathStyle {
    /// Colour as 0xRRGGBB.
    pub colour: Option<u32>,
    /// Line pattern of the connectors.
    pub dash: Option<Dash>,
    /// Connector stroke in pt.
    pub width_pt: Option<f64>,
}

/// Figure settings from the profile.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct FigureHints {
    /// One style per path (same order as the model's paths; may be empty).
    pub paths: Vec<PathStyle>,
    /// The column each point is pinned to, 0-based (same order as the points;
    /// may be empty). The file writes them 1-based.
    pub columns: Vec<Option<usize>>,
    /// Gap between neighbouring bars as a multiple of the bar length.
    pub spacing: Option<f64>,
    /// Length of the energy bars in mm.
    pub bar_width_mm: Option<f64>,
}

impl FigureHints {
    /// The style of path `i` (default when the file gives none).
    pub fn path(&self, i: usize) -> PathStyle {
        self.paths.get(i).copied().unwrap_or_default()
    }

    /// The pinned column of point `i`, 0-based.
    pub fn column(&self, i: usize) -> Option<usize> {
        self.columns.get(i).copied().flatten()
    }
}
