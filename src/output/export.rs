//! Writing exported figures: the format from the file name, the caution at the foot, written
//! atomically ([`crate::study::atomic`]) so a failed export never leaves half a file behind.

use std::path::{Path, PathBuf};

use crate::picture::draw::{Frame, png, svg};

/// Picture formats we write.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ImageFormat {
    /// Scalable vector graphics.
    Svg,
    /// Portable network graphics.
    Png,
}

/// Why an export failed.
#[derive(Debug, thiserror::Error)]
pub enum ExportError {
    /// The file name does not end in .svg or .png.
    #[error("'{0}' must end in .svg or .png")]
    Extension(String),
    /// Rendering failed.
    #[error(transparent)]
    Png(#[from] png::PngError),
    /// Writing failed.
    #[error("could not write '{path}': {cause}")]
    Io {
        /// The file.
        path: PathBuf,
        /// The operating system's error. Not marked as the error's source on purpose: the
        /// message already says it, and an error chain would print it a second time.
        cause: std::io::Error,
    },
}

impl From<crate::study::atomic::WriteError> for ExportError {
    fn from(e: crate::study::atomic::WriteError) -> Self {
        Self::Io {
            path: e.path,
            cause: e.cause,
        }
    }
}

impl ImageFormat {
    /// The format a path's extension names.
    pub fn from_path(path: &Path) -> Result<Self, ExportError> {
        match path
            .extension()
            .and_then(|e| e.to_str())
            .map(str::to_ascii_lowercase)
            .as_deref()
        {
            Some("svg") => Ok(Self::Svg),
            Some("png") => Ok(Self::Png),
            _ => Err(ExportError::Extension(path.display().to_string())),
        }
    }
}

/// The bytes of `frame` in `format`, with the caution at its foot.
pub fn encode(frame: &Frame, format: ImageFormat, title: &str) -> Result<Vec<u8>, ExportError> {
    let frame = crate::picture::caution::with_caution(frame);
    Ok(match format {
        ImageFormat::Svg => svg::to_svg(&frame, title).into_bytes(),
        ImageFormat::Png => png::to_png(&frame)?,
    })
}

/// Encodes `frame` in the format the path names and writes it atomically.
pub fn write_figure(path: &Path, frame: &Frame, title: &str) -> Result<(), ExportError> {
    let format = ImageFormat::from_path(path)?;
    Ok(crate::study::atomic::write_atomic(
        path,
        &encode(frame, format, title)?,
    )?)
}
