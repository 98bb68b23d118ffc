//! The SVG text parsed into a usvg tree (svg2pdf's own usvg), with every
//! `font-family` resolved to the bundled font: no system font is ever loaded,
//! so the PDF comes out the same on every machine.

use super::RenderError;
use std::sync::{Arc, OnceLock};
use svg2pdf::usvg::{self, fontdb};

/// A font database holding only the bundled faces, also standing in for every
/// generic family (`sans-serif`, `serif`, …).
fn fonts() -> Arc<fontdb::Database> {
    static DB: OnceLock<Arc<fontdb::Database>> = OnceLock::new();
    DB.get_or_init(|| {
        let mut db = fontdb::Database::new();
        // The bundled bytes themselves, not a copy (1.4 MB per process).
        for face in [crate::font::REGULAR, crate::font::ITALIC] {
            db.load_font_source(fontdb::Source::Binary(Arc::new(face)));
        }
        let family = crate::font::FAMILY;
        db.set_sans_serif_family(family);
        db.set_serif_family(family);
        db.set_monospace_family(family);
        db.set_cursive_family(family);
        db.set_fantasy_family(family);
        Arc::new(db)
    })
    .clone()
}

/// Parses an SVG written by [`super::to_svg`].
pub(super) fn parse(svg: &str) -> Result<usvg::Tree, RenderError> {
    let options = usvg::Options {
        font_family: crate::font::FAMILY.to_string(),
        fontdb: fonts(),
        ..usvg::Options::default()
    };
    usvg::Tree::from_str(svg, &options).map_err(|e| RenderError::Svg(e.to_string()))
}
