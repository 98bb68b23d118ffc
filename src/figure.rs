//! Chooses what the diagram shows for a model: the bridge from the validated
//! model to the layout's [`DiagramSpec`]. Numbers are formatted here, with the
//! same rule as the tables, so the figure and the text agree.

use crate::format;
use crate::layout::{DiagramSpec, ShownPath, ShownPoint};
use crate::model::Model;

/// The diagram content for `model`: every point at its energy, every path.
pub fn diagram_spec(model: &Model) -> DiagramSpec {
    let unit = model.unit();
    let decimals = unit.display_decimals();
    DiagramSpec {
        title: model.title().map(str::to_string),
        axis_label: format!("ΔG ({})", unit.axis_name()),
        points: model
            .points()
            .iter()
            .map(|p| ShownPoint {
                id: p.id.clone(),
                label: p.label.clone(),
                kind: p.kind,
                value: p.g,
                value_text: format::energy(p.g, decimals, true),
            })
            .collect(),
        paths: model
            .paths()
            .iter()
            .map(|p| ShownPath {
                name: p.name.clone(),
                via: p.via.clone(),
            })
            .collect(),
    }
}
