//! Rasterises a [`Frame`] to PNG through its SVG, with the bundled font, so the picture is the
//! same on every machine and needs no GPU or window.

use super::Frame;
use super::svg::{FONT_FAMILY, to_svg};

/// The font bundled for exports (DejaVu Sans; licence in assets/fonts).
pub static FONT: &[u8] = include_bytes!("../../../assets/fonts/DejaVuSans.ttf");

/// Why a PNG could not be made.
#[derive(Debug, thiserror::Error)]
pub enum PngError {
    /// The requested size is zero or too large for one image.
    #[error("image size {0}×{1} is not usable (each side 1 to 16384 pixels)")]
    Size(u32, u32),
    /// The SVG could not be read back (a bug, reported rather than hidden).
    #[error("internal SVG error: {0}")]
    Svg(String),
    /// PNG encoding failed.
    #[error("PNG encoding failed: {0}")]
    Encode(String),
}

/// Renders `frame` to RGBA pixels (premultiplied alpha, as tiny-skia keeps them).
pub fn to_pixmap(frame: &Frame) -> Result<resvg::tiny_skia::Pixmap, PngError> {
    let (w, h) = (frame.width.round() as u32, frame.height.round() as u32);
    if w == 0 || h == 0 || w > 16_384 || h > 16_384 {
        return Err(PngError::Size(w, h));
    }
    let svg = to_svg(frame, "Planewise figure");
    let mut options = resvg::usvg::Options {
        font_family: FONT_FAMILY.to_owned(),
        ..resvg::usvg::Options::default()
    };
    options.fontdb_mut().load_font_data(FONT.to_vec());
    let tree =
        resvg::usvg::Tree::from_str(&svg, &options).map_err(|e| PngError::Svg(e.to_string()))?;
    let mut pixmap = resvg::tiny_skia::Pixmap::new(w, h).ok_or(PngError::Size(w, h))?;
    resvg::render(
        &tree,
        resvg::tiny_skia::Transform::identity(),
        &mut pixmap.as_mut(),
    );
    Ok(pixmap)
}

/// Renders `frame` as PNG bytes.
pub fn to_png(frame: &Frame) -> Result<Vec<u8>, PngError> {
    to_pixmap(frame)?
        .encode_png()
        .map_err(|e| PngError::Encode(e.to_string()))
}

/// Encodes straight-alpha RGBA pixels (as a window screenshot gives them) as PNG.
pub fn encode_rgba(width: u32, height: u32, rgba: &[u8]) -> Result<Vec<u8>, PngError> {
    let size =
        resvg::tiny_skia::IntSize::from_wh(width, height).ok_or(PngError::Size(width, height))?;
    // Premultiply: tiny-skia stores premultiplied colour.
    let premultiplied: Vec<u8> = rgba
        .chunks_exact(4)
        .flat_map(|p| {
            let a = u16::from(p[3]);
            let m = |c: u8| ((u16::from(c) * a + 127) / 255) as u8;
            [m(p[0]), m(p[1]), m(p[2]), p[3]]
        })
        .collect();
    let pixmap = resvg::tiny_skia::Pixmap::from_vec(premultiplied, size)
        .ok_or(PngError::Size(width, height))?;
    pixmap
        .encode_png()
        .map_err(|e| PngError::Encode(e.to_string()))
}
