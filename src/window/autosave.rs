//! The working copy of the open project, written every 30 s while it has unsaved changes to
//! the app's data folder, so that work survives a crash. A clean exit or a save removes it; its
//! presence at start means the last run did not end cleanly, and the window offers it back.

use std::path::{Path, PathBuf};
use std::time::SystemTime;

use crate::study::{self, FileError, Project};

/// Seconds between writes of the working copy.
pub const INTERVAL_S: f64 = 30.0;

const COPY: &str = "working-copy.json";
const SOURCE: &str = "working-copy-source.txt";

/// An autosaved working copy.
#[derive(Clone, Debug, PartialEq)]
pub struct WorkingCopy {
    /// The project as it was.
    pub project: Project,
    /// The file it came from, if it had one.
    pub source: Option<PathBuf>,
    /// When it was written.
    pub written: Option<SystemTime>,
}

/// Writes the working copy (atomically, as every project file).
pub fn write(dir: &Path, project: &Project, source: Option<&Path>) -> Result<(), FileError> {
    std::fs::create_dir_all(dir).map_err(|cause| FileError::Io {
        path: dir.to_owned(),
        cause,
    })?;
    let text = source.map(|p| p.display().to_string()).unwrap_or_default();
    crate::study::atomic::write_atomic(&dir.join(SOURCE), text.as_bytes()).map_err(|e| {
        FileError::Io {
            path: e.path,
            cause: e.cause,
        }
    })?;
    study::save(&dir.join(COPY), project)
}

/// The working copy left in `dir`, if there is one. One that cannot be read (garbage, cut
/// short, a newer format) is never deleted: it is renamed aside and the error says where, so
/// the window can tell the user.
pub fn read(dir: &Path) -> Result<Option<WorkingCopy>, String> {
    let path = dir.join(COPY);
    if !path.exists() {
        return Ok(None);
    }
    let project = match study::load(&path) {
        Ok((project, _)) => project,
        Err(e) => {
            let stamp = SystemTime::now()
                .duration_since(SystemTime::UNIX_EPOCH)
                .map_or(0, |d| d.as_secs());
            let aside = dir.join(format!("working-copy.unreadable-{stamp}.json"));
            return Err(match std::fs::rename(&path, &aside) {
                Ok(()) => format!(
                    "The working copy the last run left could not be read ({e}); it is kept at {}",
                    aside.display()
                ),
                Err(r) => format!(
                    "The working copy the last run left could not be read ({e}) nor set aside ({r}); it is still at {}",
                    path.display()
                ),
            });
        }
    };
    let source = std::fs::read_to_string(dir.join(SOURCE))
        .ok()
        .map(|s| s.trim().to_owned())
        .filter(|s| !s.is_empty())
        .map(PathBuf::from);
    let written = std::fs::metadata(&path).and_then(|m| m.modified()).ok();
    Ok(Some(WorkingCopy {
        project,
        source,
        written,
    }))
}

/// Removes the working copy (after a save or a clean exit).
pub fn clear(dir: &Path) {
    let _ = std::fs::remove_file(dir.join(COPY));
    let _ = std::fs::remove_file(dir.join(SOURCE));
}

/// "3 min ago", for the recovery question.
#[must_use]
pub fn age_text(written: Option<SystemTime>) -> String {
    let Some(age) = written.and_then(|t| t.elapsed().ok()) else {
        return "at an unknown time".to_owned();
    };
    let s = age.as_secs();
    match s {
        0..=59 => format!("{s} s ago"),
        60..=3599 => format!("{} min ago", s / 60),
        3600..=172_799 => format!("{} h ago", s / 3600),
        _ => format!("{} days ago", s / 86_400),
    }
}
