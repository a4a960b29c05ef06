//! The project file: JSON with our own schema and a `format_version`, written atomically.
//!
//! ```json
//! { "format_version": 2, "name": "…", "unit": "MPa", "compression_positive": false,
//!   "cases": [ { "name": "dead", "description": "…",
//!                "input": { "kind": "tensor", "unit": "MPa", "compression_positive": false,
//!                           "components": [xx, yy, zz, xy, yz, zx] } } ],
//!   "combinations": [ { "name": "ULS", "terms": [ { "case": "dead", "factor": 1.35 } ] } ],
//!   "notes": "", "active": "ULS", "plane": [nx, ny, nz],
//!   "measure": { "measure": "shear", "pore_pressure_pa": 0, "cohesion_pa": null,
//!                "friction_angle_deg": null } }
//! ```
//!
//! A load case's `input` may also be `{ "kind": "table-row", "file": "mesh.csv", "line": 1043,
//! "id": "E17", "stress": { "unit": "MPa", "compression_positive": false, "components": […] } }`:
//! a row picked from an imported table.
//!
//! `"material": { "name": "…", "yield_strength_pa": 2.35e8, "tensile_strength_pa": null, …,
//! "dp_fit": "compression-meridian" }` holds the criteria's strengths (null: not given).
//!
//! `"faults": [{ "name": "F1", "dip_deg": 60, "dip_direction_deg": 120 }]` lists named planes
//! checked as faults.
//!
//! `"annotations": [{ "case": "ULS", "figure": "mohr", "text": "…", "pin": { "on": "mohr",
//! "normal_stress_pa": -2e7, "shear_stress_pa": 1e7 }, "offset": [1.5, -2] }]` holds captions
//! (no `pin`) and notes pinned to a figure's point (`"on"`: `mohr`, `pole` with a `normal`,
//! `space` with an `at`).
//!
//! Keys this version does not know (at the top level, in a case, a combination, a term, the
//! material or a fault) are kept as read and written back, and named in one warning.
//!
//! `active`, `plane`, `measure`, `material`, `faults` and `annotations` were added within
//! version 1 and are optional (the first case, the x face and the shear measure when absent),
//! so files written before them load.

use std::path::{Path, PathBuf};

use serde::{Deserialize, Serialize};

use super::error::StudyError;
use super::model::Project;

/// The version this program writes; files with a larger number are refused.
///
/// Version 2: the planes' cohesion and friction angle in `measure` may be null (not given). A
/// version-1 file always carried a pair there, and the pair 5 MPa / 30° was the program's
/// default, not necessarily a value anyone entered; such a pair is dropped on reading (with a
/// warning), so no check rests on it.
pub const FORMAT_VERSION: u32 = 2;

/// The largest project file read (256 MiB): far above any real project (100,000 load cases
/// take about 30 MB), and a stop for a file that is not one.
pub const MAX_FILE_BYTES: u64 = 256 << 20;

/// The planes' cohesion (Pa) and friction angle (degrees) that version 1 put in every project.
const OLD_DEFAULT_PLANE_STRENGTH: (f64, f64) = (5e6, 30.0);

#[derive(Serialize, Deserialize)]
struct OnDisk {
    format_version: u32,
    #[serde(flatten)]
    project: Project,
}

/// Why a project file cannot be read or written.
#[derive(Debug, thiserror::Error)]
pub enum FileError {
    /// The file could not be read or written.
    #[error("{}: {cause}", .path.display())]
    Io {
        /// The file.
        path: PathBuf,
        /// The operating system's error.
        cause: std::io::Error,
    },
    /// The file is empty.
    #[error("{}: the file is empty", .0.display())]
    Empty(PathBuf),
    /// Not JSON, or not our schema.
    #[error("{}: {message}", .path.display())]
    Malformed {
        /// The file.
        path: PathBuf,
        /// What is wrong, with line and column where JSON says so.
        message: String,
    },
    /// Written by a newer program.
    #[error("{}: format version {found} is newer than this Planewise reads ({FORMAT_VERSION}); update Planewise", .path.display())]
    Future {
        /// The file.
        path: PathBuf,
        /// The file's version.
        found: u64,
    },
    /// The content is inconsistent (unknown case in a combination, duplicate name…).
    #[error("{}: {source}", .path.display())]
    Study {
        /// The file.
        path: PathBuf,
        /// What is wrong.
        source: StudyError,
    },
}

/// Reads a project. Returns it with warnings (unknown keys that were ignored).
pub fn load(path: &Path) -> Result<(Project, Vec<String>), FileError> {
    let io = |cause| FileError::Io {
        path: path.to_owned(),
        cause,
    };
    // Only regular files of a sane size: a device or pipe (`/dev/zero`) would never end.
    let meta = std::fs::metadata(path).map_err(io)?;
    if !meta.is_file() {
        return Err(io(std::io::Error::other(
            "not a regular file (a device, pipe or folder)",
        )));
    }
    if meta.len() > MAX_FILE_BYTES {
        return Err(io(std::io::Error::other(format!(
            "{} bytes is above the {MAX_FILE_BYTES}-byte limit of a project file",
            meta.len()
        ))));
    }
    let text = std::fs::read_to_string(path).map_err(io)?;
    // A byte-order mark some editors put first is not part of the JSON.
    let text = text.strip_prefix('\u{feff}').unwrap_or(&text);
    if text.trim().is_empty() {
        return Err(FileError::Empty(path.to_owned()));
    }
    let malformed = |message: String| FileError::Malformed {
        path: path.to_owned(),
        message,
    };
    let value: serde_json::Value = serde_json::from_str(text).map_err(|e| {
        malformed(format!(
            "not a Planewise project file (JSON error at line {}, column {}: {e})",
            e.line(),
            e.column()
        ))
    })?;
    let Some(object) = value.as_object() else {
        return Err(malformed(
            "not a Planewise project file (expected a JSON object)".to_owned(),
        ));
    };
    let Some(version) = object
        .get("format_version")
        .and_then(serde_json::Value::as_u64)
    else {
        return Err(malformed(
            "not a Planewise project file (no format_version)".to_owned(),
        ));
    };
    if version == 0 {
        return Err(malformed(
            "format_version 0 is not a Planewise project file version (they start at 1)".to_owned(),
        ));
    }
    if version > u64::from(FORMAT_VERSION) {
        return Err(FileError::Future {
            path: path.to_owned(),
            found: version,
        });
    }
    let mut warnings: Vec<String> = Vec::new();
    let mut on_disk: OnDisk =
        serde_json::from_value(value.clone()).map_err(|e| malformed(e.to_string()))?;
    // Unknown keys inside objects without a map of their own: the file less what is written.
    let known = serde_json::to_value(&on_disk).map_err(|e| malformed(e.to_string()))?;
    on_disk.project.unknown_inside =
        crate::study::unknown::UnknownInside::between(&value, &known).map(Box::new);
    let unknown = on_disk.project.unknown_keys();
    if !unknown.is_empty() {
        warnings.push(format!(
            "{}: keys this version does not know are kept as they are and written back: {}",
            path.display(),
            unknown.join(", ")
        ));
    }
    let m = &mut on_disk.project.measure;
    if version < 2
        && (m.cohesion_pa, m.friction_angle_deg)
            == (
                Some(OLD_DEFAULT_PLANE_STRENGTH.0),
                Some(OLD_DEFAULT_PLANE_STRENGTH.1),
            )
    {
        m.cohesion_pa = None;
        m.friction_angle_deg = None;
        warnings.push(format!(
            "{}: the planes' cohesion 5 MPa and friction angle 30° were the defaults of format version 1, not necessarily entered; they are dropped (Coulomb checks of planes are not checked until you set them again)",
            path.display()
        ));
    }
    on_disk
        .project
        .validate()
        .map_err(|source| FileError::Study {
            path: path.to_owned(),
            source,
        })?;
    Ok((on_disk.project, warnings))
}

/// Writes a project atomically: a temporary file in the same folder, synced, then renamed over
/// the old one, so a crash or a killed process leaves either the old file or the new one.
pub fn save(path: &Path, project: &Project) -> Result<(), FileError> {
    project.validate().map_err(|source| FileError::Study {
        path: path.to_owned(),
        source,
    })?;
    let on_disk = OnDisk {
        format_version: FORMAT_VERSION,
        project: project.clone(),
    };
    let malformed = |e: serde_json::Error| FileError::Malformed {
        path: path.to_owned(),
        message: e.to_string(),
    };
    let mut value = serde_json::to_value(&on_disk).map_err(malformed)?;
    if let Some(inside) = &project.unknown_inside {
        inside.restore(&mut value);
    }
    let mut text = serde_json::to_string_pretty(&value).map_err(malformed)?;
    text.push('\n');
    crate::study::atomic::write_atomic(path, text.as_bytes()).map_err(|e| FileError::Io {
        path: e.path,
        cause: e.cause,
    })
}
