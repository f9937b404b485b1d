//! PDF output: any chart's SVG converted to a one-page vector PDF with
//! the embedded font, for slide tools that take PDF.
//!
//! The conversion is the `svg2pdf` crate's (with `usvg` parsing the SVG);
//! text stays text, set in the same DejaVu Sans the PNG uses, embedded as
//! a subset. The page is the SVG's size at [`PDF_PX_PER_INCH`]: a
//! 1800 x 1350 px chart becomes a 12 x 9 in page.

use std::sync::{Arc, OnceLock};

use svg2pdf::usvg::{fontdb, Options, Tree};
use svg2pdf::{ConversionOptions, PageOptions};

use super::encode::FONT_TTF;
use super::ChartError;

/// Image px per inch of PDF page: the reference chart (1800 x 1350 px)
/// is a 12 x 9 in slide (common practice, no source).
pub const PDF_PX_PER_INCH: f32 = 150.0;

/// The embedded font's family name, to which the SVG's `sans-serif`
/// resolves.
const FONT_NAME: &str = "DejaVu Sans";

/// A font database holding only the embedded font, once per process.
fn fonts() -> Arc<fontdb::Database> {
    static DB: OnceLock<Arc<fontdb::Database>> = OnceLock::new();
    DB.get_or_init(|| {
        let mut db = fontdb::Database::new();
        db.load_font_data(FONT_TTF.to_vec());
        db.set_sans_serif_family(FONT_NAME);
        Arc::new(db)
    })
    .clone()
}

/// `svg` (one of this module's charts, or any SVG whose text asks for
/// `sans-serif`) as a one-page PDF at [`PDF_PX_PER_INCH`].
///
/// # Errors
/// [`ChartError::Pdf`] if the SVG cannot be parsed or converted.
pub fn svg_to_pdf(svg: &str) -> Result<Vec<u8>, ChartError> {
    let options = Options {
        fontdb: fonts(),
        font_family: FONT_NAME.to_string(),
        ..Options::default()
    };
    let tree = Tree::from_str(svg, &options).map_err(|e| ChartError::Pdf(e.to_string()))?;
    svg2pdf::to_pdf(
        &tree,
        ConversionOptions::default(),
        PageOptions {
            dpi: PDF_PX_PER_INCH,
        },
    )
    .map_err(|e| ChartError::Pdf(e.to_string()))
}
