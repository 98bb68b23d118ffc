//! Places the numbers to show on the page: from a [`DiagramSpec`] (what to
//! draw, with every number already computed and formatted) to a [`Scene`]
//! (positioned lines and text in millimetres).
//!
//! Layout never computes kinetics and never reads a profile; the renderer
//! never sees anything but the scene.

use crate::model::Kind;

/// One stationary point as it is to be shown.
#[derive(Debug, Clone, PartialEq)]
pub struct ShownPoint {
    /// The file id; tags the scene items drawn for this point.
    pub id: String,
    /// Text under the bar.
    pub label: String,
    /// Minimum or TS (drawn alike for now; kept for styling).
    pub kind: Kind,
    /// Vertical position, in the axis unit.
    pub value: f64,
    /// The formatted number shown above the bar.
    pub value_text: String,
}

/// One path to draw: indices into [`DiagramSpec::points`].
#[derive(Debug, Clone, PartialEq)]
pub struct ShownPath {
    /// Path name (for the legend and tags).
    pub name: String,
    /// Points in order.
    pub via: Vec<usize>,
}

/// Everything the diagram shows, computed and formatted before layout.
#[derive(Debug, Clone, PartialEq)]
pub struct DiagramSpec {
    /// Figure title, if any.
    pub title: Option<String>,
    /// The y-axis label, e.g. "ΔG (kcal mol⁻¹)".
    pub axis_label: String,
    /// Stationary points.
    pub points: Vec<ShownPoint>,
    /// Paths in drawing order.
    pub paths: Vec<ShownPath>,
}
