//! Rasterises a [`Frame`] to PNG through its SVG, with the bundled font, so the picture is the
//! same on every machine and needs no GPU or window.

use super::frame::Frame;
pub use super::pixels::{PngError, encode_rgba};
use super::svg::{FONT_FAMILY, to_svg};

/// The font bundled for exports (DejaVu Sans; licence in assets/fonts).
pub static FONT: &[u8] = include_bytes!("../../../assets/fonts/DejaVuSans.ttf");

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
