//! Draws a [`crate::layout::Scene`]; never sees a profile.
//!
//! Each output format is one module that reads only the scene, so a new
//! format is a new module, not a change to the layout. All three draw what
//! the SVG describes: PNG (`raster`) and PDF (`pdf`) are made from the scene
//! itself, not by reading the SVG back, with text placed by `glyphs` where an
//! SVG renderer sets it (checked against resvg drawing our SVG in the tests).

mod glyphs;
mod pdf;
mod png;
mod raster;
mod svg;
mod xml;

pub use pdf::to_pdf;
pub use png::{MAX_PIXELS, pixel_size, to_png};
pub use svg::to_svg;

/// Why a PNG or PDF could not be made.
#[derive(Debug, thiserror::Error)]
pub enum RenderError {
    /// The image would have no pixels or too many.
    #[error(
        "a {width_px} × {height_px} pixel image is outside what eyrie draws \
         (at most {MAX_PIXELS} pixels): lower the resolution or the size"
    )]
    Size {
        /// Requested width in pixels.
        width_px: u64,
        /// Requested height in pixels.
        height_px: u64,
    },
    /// PNG encoding failed.
    #[error("PNG encoding failed: {0}")]
    Png(String),
    /// PDF writing failed.
    #[error("PDF writing failed: {0}")]
    Pdf(String),
}

/// A dash list as SVG's `stroke-dasharray` reads it, so PNG and PDF dash
/// exactly as the SVG does: `None` (solid) for a negative or non-finite length
/// or an all-zero list, and an odd-length list repeated to make it even.
fn dash_lengths(dash: &[f64]) -> Option<Vec<f32>> {
    if dash.iter().any(|d| !(d.is_finite() && *d >= 0.0)) || dash.iter().sum::<f64>() <= 0.0 {
        return None;
    }
    let mut list: Vec<f32> = dash.iter().map(|&d| d as f32).collect();
    if list.len() % 2 == 1 {
        list.extend_from_within(..);
    }
    Some(list)
}

impl RenderError {
    fn png(e: ::png::EncodingError) -> Self {
        RenderError::Png(e.to_string())
    }

    fn io(e: std::io::Error) -> Self {
        RenderError::Png(e.to_string())
    }
}
