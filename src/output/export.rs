//! Writing exported files: format from the file name, written atomically (a temporary file in
//! the same folder, then a rename) so a failed export never leaves half a file behind.

use std::path::{Path, PathBuf};

use crate::picture::draw::{Anchor, Frame, Prim, png, svg};

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

/// The caution's text size and lines at the foot of a `width` × `height` figure: at least
/// 6.5 pt when the figure is printed at the default print width; one line when it fits, else
/// two.
fn caution_lines(width: f32, height: f32) -> (f32, Vec<String>) {
    let note = crate::SAFETY_NOTE;
    let fits = |text: &str, size: f32| crate::picture::draw::place::text_width(text, size) <= width - size;
    let legible = 6.5 * 25.4 / 72.0 / crate::picture::draw::PRINT_WIDTH_MM * width;
    // The size at which the note just fits on one line.
    let one_line = width / (crate::picture::draw::place::text_width(note, 1.0) + 1.0);
    if one_line >= legible && fits(note, one_line.min(height / 70.0)) {
        return (one_line.min(height / 70.0).max(5.0), vec![note.to_owned()]);
    }
    let mid = note.len() / 2;
    let split = note[..mid].rfind(' ').unwrap_or(mid);
    let (a, b) = note.split_at(split);
    let (a, b) = (a.trim(), b.trim());
    let longest =
        crate::picture::draw::place::text_width(a, 1.0).max(crate::picture::draw::place::text_width(b, 1.0));
    let size = legible.min(width / (longest + 1.0)).max(5.0);
    (size, vec![a.to_owned(), b.to_owned()])
}

/// Pixels the caution takes at the foot of a `width` × `height` figure; figures leave this
/// strip free (see [`crate::picture::figures::titled`]) so the caution covers nothing.
#[must_use]
pub fn caution_height(width: f32, height: f32) -> f32 {
    let (size, lines) = caution_lines(width, height);
    (lines.len() as f32 - 1.0) * 1.25 * size + 1.6 * size
}

/// `frame` with the caution ([`crate::SAFETY_NOTE`]) printed small at its foot, as every
/// exported or copied figure carries it.
#[must_use]
pub fn with_caution(frame: &Frame) -> Frame {
    let mut out = frame.clone();
    let (size, lines) = caution_lines(frame.width, frame.height);
    let n = lines.len() as f32;
    for (i, line) in lines.into_iter().enumerate() {
        out.prims.push(Prim::Text {
            at: [
                0.5 * size,
                frame.height - 0.8 * size - (n - 1.0 - i as f32) * 1.25 * size,
            ],
            text: line,
            size,
            color: crate::picture::scene::style::INK,
            anchor: Anchor::LeftCenter,
            halo: true,
        });
    }
    out
}

/// The bytes of `frame` in `format`, with the caution at its foot.
pub fn encode(frame: &Frame, format: ImageFormat, title: &str) -> Result<Vec<u8>, ExportError> {
    let frame = with_caution(frame);
    Ok(match format {
        ImageFormat::Svg => svg::to_svg(&frame, title).into_bytes(),
        ImageFormat::Png => png::to_png(&frame)?,
    })
}

/// Writes `bytes` to `path` atomically: a temporary file in the same folder, synced, then
/// renamed over the old one, so a crash leaves the old file or the new one. The new file keeps
/// the old one's permissions; a symbolic link is written through to its target; a read-only
/// file or anything that is not a regular file (a device, a pipe) is refused and left as it was;
/// temporaries that killed writes left beside the file are removed.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> Result<(), ExportError> {
    write_atomic_with(path, |w| w.write_all(bytes))
}

/// [`write_atomic`] with the content written by `write` (through a buffer), for outputs made
/// as they are written instead of held whole; an error from `write` leaves the old file.
pub fn write_atomic_with(
    path: &Path,
    write: impl FnOnce(&mut dyn std::io::Write) -> std::io::Result<()>,
) -> Result<(), ExportError> {
    let refuse = |why: String| ExportError::Io {
        path: path.to_owned(),
        cause: std::io::Error::other(why),
    };
    // A symbolic link is written through: its target gets the new content, the link stays.
    let target = match std::fs::symlink_metadata(path) {
        Ok(m) if m.file_type().is_symlink() => {
            std::fs::canonicalize(path).map_err(|cause| ExportError::Io {
                path: path.to_owned(),
                cause,
            })?
        }
        _ => path.to_owned(),
    };
    let existing = std::fs::metadata(&target).ok();
    if let Some(m) = &existing {
        if !m.is_file() {
            return Err(refuse(
                "not a regular file (a device, pipe or folder); nothing written".to_owned(),
            ));
        }
        if m.permissions().readonly() {
            return Err(refuse(
                "the file is read-only; nothing written (make it writable first if it should change)"
                    .to_owned(),
            ));
        }
    }
    let path = target.as_path();
    let io = |cause| ExportError::Io {
        path: path.to_owned(),
        cause,
    };
    let dir = path
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
    let name = path
        .file_name()
        .map_or_else(|| "figure".into(), |n| n.to_string_lossy().into_owned());
    remove_stale_temporaries(dir, &name);
    let tmp = dir.join(format!(".{name}.{}.tmp", std::process::id()));
    let result = std::fs::File::create(&tmp).and_then(|f| {
        let mut buffered = std::io::BufWriter::with_capacity(1 << 16, f);
        write(&mut buffered)?;
        let f = buffered
            .into_inner()
            .map_err(std::io::IntoInnerError::into_error)?;
        // The replaced file's permissions carry over to the new one.
        if let Some(m) = &existing {
            f.set_permissions(m.permissions())?;
        }
        f.sync_all()
    });
    if let Err(e) = result {
        let _ = std::fs::remove_file(&tmp);
        return Err(io(e));
    }
    std::fs::rename(&tmp, path).map_err(|e| {
        let _ = std::fs::remove_file(&tmp);
        io(e)
    })
}

/// Removes temporary files of our own naming (`.NAME.PID.tmp`) beside `name` that a process
/// no longer running left behind (a write killed half-way).
fn remove_stale_temporaries(dir: &Path, name: &str) {
    let Ok(entries) = std::fs::read_dir(dir) else {
        return;
    };
    let prefix = format!(".{name}.");
    for entry in entries.flatten() {
        let file = entry.file_name();
        let Some(rest) = file
            .to_str()
            .and_then(|f| f.strip_prefix(&prefix))
            .and_then(|r| r.strip_suffix(".tmp"))
        else {
            continue;
        };
        let Ok(pid) = rest.parse::<u32>() else {
            continue;
        };
        // Whether the writer still runs is known only where /proc lists processes; elsewhere
        // every temporary is left alone.
        let alive = pid == std::process::id()
            || !cfg!(target_os = "linux")
            || Path::new(&format!("/proc/{pid}")).exists();
        if !alive {
            let _ = std::fs::remove_file(entry.path());
        }
    }
}

/// Whether `a` and `b` are the same existing file: by device and inode on Unix (so two
/// spellings, a symbolic link or a hard link of one file are the same file), by canonical path
/// elsewhere. A path that does not exist is no file.
#[must_use]
pub fn same_file(a: &Path, b: &Path) -> bool {
    #[cfg(unix)]
    {
        use std::os::unix::fs::MetadataExt as _;
        match (std::fs::metadata(a), std::fs::metadata(b)) {
            (Ok(x), Ok(y)) => x.dev() == y.dev() && x.ino() == y.ino(),
            _ => false,
        }
    }
    #[cfg(not(unix))]
    {
        match (a.canonicalize(), b.canonicalize()) {
            (Ok(x), Ok(y)) => x == y,
            _ => false,
        }
    }
}

/// Refuses an output that is one of the command's inputs (the same file, however spelled):
/// writing it would destroy the input.
pub fn not_an_input(out: &Path, inputs: &[&Path]) -> Result<(), String> {
    match inputs.iter().find(|input| same_file(out, input)) {
        Some(input) => Err(format!(
            "{} is the input {}: writing there would destroy it; choose another output",
            out.display(),
            input.display()
        )),
        None => Ok(()),
    }
}

/// Encodes `frame` in the format the path names and writes it atomically.
pub fn write_figure(path: &Path, frame: &Frame, title: &str) -> Result<(), ExportError> {
    let format = ImageFormat::from_path(path)?;
    write_atomic(path, &encode(frame, format, title)?)
}
