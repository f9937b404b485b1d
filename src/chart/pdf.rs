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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::chart::samples::{analytic_grid, analytic_spec};
    use crate::chart::Chart;
    use crate::sweep::SecondAxis;

    /// The text after `key` up to the end of its line.
    fn after<'a>(pdf: &'a str, key: &str) -> Option<&'a str> {
        let at = pdf.find(key)? + key.len();
        pdf[at..].lines().next()
    }

    /// Checks the file structure of ISO 32000-1 (PDF 1.7): header,
    /// `startxref` pointing at a cross-reference table (7.5.4) whose
    /// in-use entries each point at the start of their object, a trailer
    /// with the table's size and a root, one page of the expected media
    /// box, and an embedded TrueType subset of DejaVu Sans (9.6.4: six
    /// capital letters and `+` before the name).
    fn check_structure(bytes: &[u8], media_box: &str) {
        // Stream contents are binary; the structure is ASCII.
        let pdf = String::from_utf8_lossy(bytes);
        assert!(pdf.starts_with("%PDF-1."), "header");
        assert!(pdf.trim_end().ends_with("%%EOF"), "trailer end");
        let start: usize = after(&pdf, "startxref\n")
            .and_then(|l| l.trim().parse().ok())
            .expect("startxref offset");
        let table = &bytes[start..];
        assert!(table.starts_with(b"xref"), "startxref points at the table");
        let text = String::from_utf8_lossy(table);
        let mut lines = text.lines().skip(1);
        let sub: Vec<usize> = lines
            .next()
            .expect("subsection")
            .split_whitespace()
            .map(|n| n.parse().expect("number"))
            .collect();
        assert_eq!(sub[0], 0);
        let mut in_use = 0;
        for i in 0..sub[1] {
            let e: Vec<&str> = lines.next().expect("entry").split_whitespace().collect();
            if e[2] == "n" {
                let off: usize = e[0].parse().expect("offset");
                let head = format!("{i} {} obj", e[1].trim_start_matches('0').max("0"));
                assert!(
                    bytes[off..].starts_with(head.as_bytes()),
                    "entry {i} points at {:?}",
                    String::from_utf8_lossy(&bytes[off..off + 12])
                );
                in_use += 1;
            }
        }
        assert!(in_use >= 8, "{in_use} objects");
        let trailer = &text[text.find("trailer").expect("trailer")..];
        assert!(trailer.contains(&format!("/Size {}", sub[1])), "{trailer}");
        assert!(trailer.contains("/Root "), "{trailer}");
        assert_eq!(pdf.matches("/Type /Page\n").count(), 1, "one page");
        assert!(pdf.contains("/Count 1"));
        assert!(
            pdf.contains(&format!("/MediaBox [{media_box}]")),
            "page size"
        );
        assert!(pdf.contains("/FontFile2 "), "font embedded");
        let name = after(&pdf, "/BaseFont /").expect("font name");
        let (tag, family) = name.split_once('+').expect("subset tag");
        assert!(
            tag.len() == 6 && tag.chars().all(|c| c.is_ascii_uppercase()),
            "{name}"
        );
        assert_eq!(family, "DejaVuSans");
    }

    #[test]
    fn chart_pdf_is_a_one_page_pdf_with_the_font_embedded() {
        let g = analytic_grid(SecondAxis::Arrival);
        let spec = analytic_spec(&g);
        let chart = Chart::window(&spec).expect("chart");
        let pdf = chart.pdf().expect("pdf");
        // 1800 x 1350 px at 150 px per inch: 12 x 9 in, 864 x 648 pt.
        check_structure(&pdf, "0 0 864 648");
        assert!(matches!(svg_to_pdf("<svg"), Err(ChartError::Pdf(_))));
    }

    /// `(width, height, RGB)` of a PNG.
    fn decode(bytes: &[u8]) -> (u32, u32, Vec<u8>) {
        let mut reader = png::Decoder::new(std::io::Cursor::new(bytes))
            .read_info()
            .expect("png header");
        let mut buf = vec![0u8; reader.output_buffer_size().expect("size")];
        let info = reader.next_frame(&mut buf).expect("frame");
        buf.truncate(info.buffer_size());
        let rgb = match info.color_type {
            png::ColorType::Rgb => buf,
            png::ColorType::Rgba => buf
                .chunks_exact(4)
                .flat_map(|p| [p[0], p[1], p[2]])
                .collect(),
            other => panic!("colour type {other:?}"),
        };
        (info.width, info.height, rgb)
    }

    /// Poppler (an independent PDF reader, Debian's poppler-utils)
    /// renders the PDF at 50 dpi into the picture our own PNG pipeline
    /// draws at the same size, within the differences of two
    /// rasterisers (anti-aliasing, hinting). Skipped, with a message,
    /// where `pdftoppm` is not installed.
    #[test]
    fn poppler_renders_the_pdf_like_the_png() {
        let probe = std::process::Command::new("pdftoppm").arg("-v").output();
        if probe.is_err() {
            eprintln!("skipped: pdftoppm (Debian package poppler-utils) is not installed");
            return;
        }
        let g = analytic_grid(SecondAxis::Arrival);
        let spec = analytic_spec(&g);
        let chart = Chart::window(&spec).expect("chart");
        let dir = std::env::temp_dir().join(format!("synodic-pdf-{}", std::process::id()));
        std::fs::create_dir_all(&dir).expect("temp dir");
        let pdf_path = dir.join("chart.pdf");
        std::fs::write(&pdf_path, chart.pdf().expect("pdf")).expect("write pdf");
        let out = std::process::Command::new("pdftoppm")
            .args(["-png", "-r", "50", "-singlefile"])
            .arg(&pdf_path)
            .arg(dir.join("page"))
            .output()
            .expect("run pdftoppm");
        assert!(
            out.status.success(),
            "{}",
            String::from_utf8_lossy(&out.stderr)
        );
        let page = std::fs::read(dir.join("page.png")).expect("rendered page");
        let _ = std::fs::remove_dir_all(&dir);
        // 12 x 9 in at 50 dpi.
        let (w, h, theirs) = decode(&page);
        assert_eq!((w, h), (600, 450));
        let (_, _, ours) = decode(&chart.png(600, 450).expect("png"));
        // Dark pixels (text, lines, frame): about 9,100 here; the same
        // chart without its text has about 4,900, fewer than 2 % of the
        // page (5,400).
        let inked = theirs
            .chunks_exact(3)
            .filter(|p| p.iter().any(|&c| c < 200))
            .count();
        assert!(inked > 600 * 450 / 50, "blank page: {inked} dark pixels");
        // Mean grey of 10 x 10 px blocks: the two rasterisers' edge
        // differences average out, the content (lines, fills, text
        // runs) stays. Measured: 1.4 grey levels apart here, where a
        // blank page would be 8.6 from ours.
        let blocks = |rgb: &[u8]| -> Vec<f64> {
            let mut out = vec![0.0; 60 * 45];
            for (i, p) in rgb.chunks_exact(3).enumerate() {
                let (x, y) = (i % 600, i / 600);
                let grey = p.iter().map(|&c| f64::from(c)).sum::<f64>() / 3.0;
                out[(y / 10) * 60 + x / 10] += grey / 100.0;
            }
            out
        };
        let (a, b) = (blocks(&theirs), blocks(&ours));
        let diff = a.iter().zip(&b).map(|(x, y)| (x - y).abs()).sum::<f64>() / a.len() as f64;
        let blank = b.iter().map(|y| 255.0 - y).sum::<f64>() / b.len() as f64;
        eprintln!("poppler vs png: {diff:.2} grey levels per block (blank page: {blank:.2})");
        assert!(diff < 2.0, "mean block difference {diff}");
    }
}
