//! Draws a [`crate::layout::Scene`]; never sees a profile.
//!
//! Each output format is one module that reads only the scene, so a new
//! format (PNG, PDF) is a new module, not a change to the layout.

mod svg;
mod xml;

pub use svg::to_svg;
