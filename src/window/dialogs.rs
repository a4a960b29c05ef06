//! Native file dialogs, behind a trait so tests never open one, and with a way to tell "the user
//! cancelled" from "no dialog could open".
//!
//! On Linux rfd asks the desktop portal over D-Bus and, failing that, runs zenity; when both
//! fail it logs an error and returns nothing, exactly as for a cancel. A machine without a
//! portal would then ignore "Save" silently. So the native dialog runs with rfd's log records
//! captured for its own thread: an error record from rfd means no dialog could open, and the
//! window offers its own path entry instead.

use std::cell::RefCell;
use std::path::{Path, PathBuf};
use std::sync::OnceLock;

/// What a save dialog gave back.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum DialogOutcome {
    /// The user chose this path.
    Chosen(PathBuf),
    /// The user closed the dialog without choosing.
    Cancelled,
    /// No dialog could open; the text says why.
    Unavailable(String),
}

/// Native dialogs. Calls may block until the user answers, so the window calls them on a
/// worker thread, never on its own.
pub trait Dialogs: Send + Sync {
    /// Asks where to save a figure.
    fn save_figure(&self, suggested_name: &str) -> DialogOutcome;
    /// Asks which project file to open.
    fn open_project(&self) -> DialogOutcome;
    /// Asks where to save the project.
    fn save_project(&self, suggested_name: &str) -> DialogOutcome;
    /// Asks where to write the calculation report.
    fn save_report(&self, suggested_name: &str) -> DialogOutcome;
    /// Asks which finite-element table to import (by default: no dialog, so the Table tab's
    /// path field is used).
    fn open_table(&self) -> DialogOutcome {
        DialogOutcome::Unavailable("no file dialog here".to_owned())
    }
}

/// Dialogs through the desktop portal or zenity (rfd).
pub struct NativeDialogs;

impl Dialogs for NativeDialogs {
    fn save_figure(&self, suggested_name: &str) -> DialogOutcome {
        native(|| {
            rfd::FileDialog::new()
                .add_filter("PNG image", &["png"])
                .add_filter("SVG drawing", &["svg"])
                .set_file_name(suggested_name)
                .save_file()
        })
    }

    fn open_project(&self) -> DialogOutcome {
        native(|| {
            rfd::FileDialog::new()
                .add_filter("Planewise project", &["json"])
                .pick_file()
        })
    }

    fn save_project(&self, suggested_name: &str) -> DialogOutcome {
        native(|| {
            rfd::FileDialog::new()
                .add_filter("Planewise project", &["json"])
                .set_file_name(suggested_name)
                .save_file()
        })
    }

    fn save_report(&self, suggested_name: &str) -> DialogOutcome {
        native(|| {
            rfd::FileDialog::new()
                .add_filter("HTML report", &["html"])
                .set_file_name(suggested_name)
                .save_file()
        })
    }

    fn open_table(&self) -> DialogOutcome {
        native(|| {
            rfd::FileDialog::new()
                .add_filter("Result table", &["csv", "tsv", "txt", "dat"])
                .add_filter("Any file", &["*"])
                .pick_file()
        })
    }
}

/// Runs one native dialog with rfd's error records captured, telling a cancel from a dialog
/// that could not open.
fn native(show: impl FnOnce() -> Option<PathBuf>) -> DialogOutcome {
    if let Some(why) = missing_dialog_service() {
        return DialogOutcome::Unavailable(why);
    }
    install_capture();
    CAPTURED.with(|c| *c.borrow_mut() = Some(Vec::new()));
    let chosen = show();
    let errors = CAPTURED.with(|c| c.borrow_mut().take()).unwrap_or_default();
    match chosen {
        Some(path) => DialogOutcome::Chosen(path),
        None if !errors.is_empty() => DialogOutcome::Unavailable(format!(
            "the system file dialog could not open ({})",
            errors.join("; ")
        )),
        None => DialogOutcome::Cancelled,
    }
}

/// Why no dialog can open at all, when that is plain without trying: no D-Bus session bus for
/// the portal and no zenity on the PATH.
fn missing_dialog_service() -> Option<String> {
    if !cfg!(target_os = "linux") {
        return None;
    }
    let bus = std::env::var_os("DBUS_SESSION_BUS_ADDRESS").is_some()
        || std::env::var_os("XDG_RUNTIME_DIR")
            .is_some_and(|dir| Path::new(&dir).join("bus").exists());
    let zenity = std::env::var_os("PATH")
        .is_some_and(|paths| std::env::split_paths(&paths).any(|p| p.join("zenity").is_file()));
    (!bus && !zenity)
        .then(|| "no desktop portal (no D-Bus session bus) and no zenity were found".to_owned())
}

thread_local! {
    /// rfd's warning and error records on this thread while a dialog runs (`None` otherwise).
    static CAPTURED: RefCell<Option<Vec<String>>> = const { RefCell::new(None) };
}

/// Keeps rfd's error records for the thread that is showing a dialog; drops every other record
/// (the program has no log output of its own).
struct Capture;

impl log::Log for Capture {
    fn enabled(&self, metadata: &log::Metadata<'_>) -> bool {
        metadata.level() <= log::Level::Error && metadata.target().starts_with("rfd")
    }

    fn log(&self, record: &log::Record<'_>) {
        if self.enabled(record.metadata()) {
            CAPTURED.with(|c| {
                if let Some(list) = c.borrow_mut().as_mut() {
                    list.push(record.args().to_string());
                }
            });
        }
    }

    fn flush(&self) {}
}

fn install_capture() {
    static INSTALLED: OnceLock<()> = OnceLock::new();
    INSTALLED.get_or_init(|| {
        // If a logger is already installed, a failed dialog reads as a cancel, as before.
        if log::set_logger(&Capture).is_ok() {
            log::set_max_level(log::LevelFilter::Error);
        }
    });
}

/// Where the in-window path entry starts: the suggested name in the current folder.
#[must_use]
pub fn fallback_path(suggested_name: &str) -> PathBuf {
    std::env::current_dir()
        .unwrap_or_else(|_| PathBuf::from("."))
        .join(suggested_name)
}
