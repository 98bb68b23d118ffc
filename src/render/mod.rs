//! Draws a [`crate::layout::Scene`]; never sees a profile.
//!
//! Each output format is one module that reads only the scene, so a new
//! format is a new module, not a change to the layout. PNG is drawn from the
//! scene itself (`raster`, the way an SVG renderer draws the SVG, checked
//! against resvg in the tests); PDF is made from the SVG text (parsed by usvg
//! against the bundled font only), so all three formats show the same picture.

mod pdf;
mod png;
mod raster;
mod svg;
mod tree;
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
    /// The SVG could not be read back (a bug in eyrie).
    #[error("the SVG written by eyrie could not be read back: {0}")]
    Svg(String),
    /// PNG encoding failed.
    #[error("PNG encoding failed: {0}")]
    Png(String),
    /// PDF conversion failed.
    #[error("PDF conversion failed: {0}")]
    Pdf(String),
}

impl RenderError {
    fn png(e: ::png::EncodingError) -> Self {
        RenderError::Png(e.to_string())
    }

    fn io(e: std::io::Error) -> Self {
        RenderError::Png(e.to_string())
    }
}
