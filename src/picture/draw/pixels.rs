//! PNG bytes from pixels: the encoder both the PNG export (pixels rasterised from a frame) and
//! the SVG writer (an image embedded in a frame, such as a window screenshot) use.

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
