//! Writing a file atomically (a temporary file in the same folder, synced, then renamed over the
//! old one), and refusing an output that is one of the inputs. The project file, the autosave,
//! exported figures, reports and rankings are all written this way.

use std::path::Path;

/// A file could not be written; the old one, if any, is as it was.
#[derive(Debug, thiserror::Error)]
#[error("could not write '{}': {cause}", path.display())]
pub struct WriteError {
    /// The file.
    pub path: std::path::PathBuf,
    /// The operating system's error (or why the file was refused). Not marked as the error's
    /// source on purpose: the message already says it, and an error chain would print it twice.
    pub cause: std::io::Error,
}

/// Writes `bytes` to `path` atomically: a temporary file in the same folder, synced, then
/// renamed over the old one, so a crash leaves the old file or the new one. The new file keeps
/// the old one's permissions; a symbolic link is written through to its target; a read-only
/// file or anything that is not a regular file (a device, a pipe) is refused and left as it was;
/// temporaries that killed writes left beside the file are removed.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> Result<(), WriteError> {
    write_atomic_with(path, |w| w.write_all(bytes))
}

/// [`write_atomic`] with the content written by `write` (through a buffer), for outputs made
/// as they are written instead of held whole; an error from `write` leaves the old file.
pub fn write_atomic_with(
    path: &Path,
    write: impl FnOnce(&mut dyn std::io::Write) -> std::io::Result<()>,
) -> Result<(), WriteError> {
    let refuse = |why: String| WriteError {
        path: path.to_owned(),
        cause: std::io::Error::other(why),
    };
    // A symbolic link is written through: its target gets the new content, the link stays.
    let target = match std::fs::symlink_metadata(path) {
        Ok(m) if m.file_type().is_symlink() => {
            std::fs::canonicalize(path).map_err(|cause| WriteError {
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
    let io = |cause| WriteError {
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
