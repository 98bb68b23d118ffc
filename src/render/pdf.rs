//! PDF output: the SVG converted by svg2pdf into vector paths and real text
//! (selectable, searchable) in the bundled font, embedded as a subset. The
//! page is the figure's size in mm; the file has no date or other varying
//! metadata, so the same figure always gives the same bytes.

use super::RenderError;
use crate::layout::Scene;

/// The scene as a one-page PDF file.
pub fn to_pdf(scene: &Scene) -> Result<Vec<u8>, RenderError> {
    let tree = super::tree::parse(&super::to_svg(scene))?;
    let options = svg2pdf::ConversionOptions {
        compress: true,
        embed_text: true,
        ..svg2pdf::ConversionOptions::default()
    };
    // usvg sizes the tree in CSS pixels (96 per inch); at svg2pdf's default of
    // 72 the page would come out a third too large.
    let page = svg2pdf::PageOptions { dpi: 96.0 };
    svg2pdf::to_pdf(&tree, options, page).map_err(|e| RenderError::Pdf(e.to_string()))
}
