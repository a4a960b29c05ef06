//! File flows: native dialogs on a worker thread (with the in-window path entry as fallback),
//! opening, saving, the report and figure exports, autosave of the working copy, and closing.

use std::path::Path;
use std::path::PathBuf;
use std::sync::Arc;

use super::{DialogPurpose, PlanewiseApp, SUGGESTED_FIGURE_NAME};
use crate::study;
use crate::study::Project;
use crate::window::dialogs::DialogOutcome;
use crate::window::session::Central;
use crate::window::session::Leaving;
use crate::window::ui::file_prompt::PromptPurpose;

impl PlanewiseApp {
    /// The file name the project's save dialog suggests.
    pub(super) fn suggested_project_name(&self) -> String {
        let stem: String = self
            .project
            .name
            .chars()
            .map(|c| {
                if c.is_alphanumeric() || c == '-' {
                    c
                } else {
                    '-'
                }
            })
            .collect();
        let stem = stem.trim_matches('-');
        let stem = if stem.is_empty() { "project" } else { stem };
        format!("{}.json", stem.chars().take(60).collect::<String>())
    }

    /// Opens a native dialog on a worker thread, so the window keeps drawing meanwhile.
    pub(super) fn start_dialog(&mut self, ctx: &egui::Context, purpose: DialogPurpose) {
        if self.pending_dialog.is_some() {
            return;
        }
        let (tx, rx) = std::sync::mpsc::channel();
        let dialogs = Arc::clone(&self.dialogs);
        let repaint = ctx.clone();
        let project_name = self.suggested_project_name();
        let spawned = std::thread::Builder::new()
            .name("file-dialog".into())
            .spawn(move || {
                let outcome = match purpose {
                    DialogPurpose::Figure => dialogs.save_figure(SUGGESTED_FIGURE_NAME),
                    DialogPurpose::OpenProject => dialogs.open_project(),
                    DialogPurpose::Table => dialogs.open_table(),
                    DialogPurpose::SaveProject => dialogs.save_project(&project_name),
                    DialogPurpose::Report => {
                        dialogs.save_report(&project_name.replace(".json", "-report.html"))
                    }
                };
                let _ = tx.send(outcome);
                repaint.request_repaint();
            });
        match spawned {
            Ok(_) => self.pending_dialog = Some((purpose, rx)),
            Err(e) => self.dialog_answered(purpose, DialogOutcome::Unavailable(e.to_string())),
        }
    }

    /// Picks up the dialog's answer, if it has come.
    pub(super) fn poll_dialog(&mut self) {
        let Some((purpose, rx)) = &self.pending_dialog else {
            return;
        };
        let purpose = *purpose;
        let outcome = match rx.try_recv() {
            Ok(outcome) => outcome,
            Err(std::sync::mpsc::TryRecvError::Empty) => return,
            Err(std::sync::mpsc::TryRecvError::Disconnected) => {
                DialogOutcome::Unavailable("the file dialog ended without an answer".to_owned())
            }
        };
        self.pending_dialog = None;
        self.dialog_answered(purpose, outcome);
    }

    pub(super) fn dialog_answered(&mut self, purpose: DialogPurpose, outcome: DialogOutcome) {
        match (purpose, outcome) {
            (DialogPurpose::Figure, DialogOutcome::Chosen(path)) => self.export_to(&path),
            (DialogPurpose::OpenProject, DialogOutcome::Chosen(path)) => self.open_path(&path),
            (DialogPurpose::SaveProject, DialogOutcome::Chosen(path)) => self.save_to(&path),
            (DialogPurpose::Report, DialogOutcome::Chosen(path)) => self.report_to(&path),
            (DialogPurpose::Table, DialogOutcome::Chosen(path)) => {
                self.settings.central = Central::Table;
                self.table_panel.load_preview(&path.display().to_string());
            }
            (DialogPurpose::Table, DialogOutcome::Unavailable(why)) => {
                self.settings.central = Central::Table;
                self.set_status(
                    format!("No file dialog ({why}): type the table's path in the Table tab"),
                    false,
                );
            }
            (DialogPurpose::SaveProject, DialogOutcome::Cancelled) => self.after_save = None,
            (_, DialogOutcome::Cancelled) => {}
            (DialogPurpose::Figure, DialogOutcome::Unavailable(why)) => {
                self.export_panel.open = true;
                self.export_panel.offer_path_entry(
                    &crate::window::dialogs::fallback_path(SUGGESTED_FIGURE_NAME),
                    why.clone(),
                );
                self.set_status(
                    format!("No file dialog ({why}): type the path in the export window"),
                    true,
                );
            }
            (project_purpose, DialogOutcome::Unavailable(why)) => {
                let (prompt, suggested) = if project_purpose == DialogPurpose::OpenProject {
                    (
                        PromptPurpose::Open,
                        crate::window::dialogs::fallback_path(""),
                    )
                } else if project_purpose == DialogPurpose::Report {
                    let name = self
                        .suggested_project_name()
                        .replace(".json", "-report.html");
                    (
                        PromptPurpose::Report,
                        crate::window::dialogs::fallback_path(&name),
                    )
                } else {
                    let name = self.suggested_project_name();
                    let path = self
                        .file
                        .clone()
                        .unwrap_or_else(|| crate::window::dialogs::fallback_path(&name));
                    (PromptPurpose::SaveAs, path)
                };
                self.file_prompt.offer(prompt, &suggested, why.clone());
                self.set_status(format!("No file dialog ({why}): type the path"), true);
            }
        }
    }

    /// Opens a project file; a failure is said and changes nothing.
    pub fn open_path(&mut self, path: &Path) {
        match study::load(path) {
            Ok((project, warnings)) => {
                self.replace_project(project, Some(path.to_owned()));
                self.settings.remember(path);
                self.file_prompt.close();
                if warnings.is_empty() {
                    self.set_status(format!("Opened {}", path.display()), false);
                } else {
                    self.set_status(
                        format!("Opened {} ({})", path.display(), warnings.join("; ")),
                        true,
                    );
                }
            }
            Err(e) => {
                self.file_prompt.error = Some(e.to_string());
                self.set_status(format!("Not opened: {e}"), true);
            }
        }
    }

    /// Saves the project to `path`; on success the file becomes the project's file, and what
    /// waited for the save (new, open, quit) goes ahead.
    pub fn save_to(&mut self, path: &Path) {
        match study::save(path, &self.project) {
            Ok(()) => {
                self.file = Some(path.to_owned());
                self.clean = self.project.clone();
                self.settings.remember(path);
                self.file_prompt.close();
                if let Some(dir) = &self.autosave_dir {
                    crate::window::autosave::clear(dir);
                }
                self.set_status(format!("Saved {}", path.display()), false);
                if let Some(next) = self.after_save.take() {
                    self.go(next);
                }
            }
            Err(e) => {
                self.after_save = None;
                self.file_prompt.error = Some(e.to_string());
                self.set_status(format!("Not saved: {e}"), true);
            }
        }
    }

    /// Writes the calculation report of the whole project to `path` (HTML, atomically).
    pub fn report_to(&mut self, path: &Path) {
        // The file is named (with its SHA-256) only when the report is of it as saved.
        let source = self
            .file
            .as_ref()
            .filter(|_| !self.dirty())
            .and_then(|f| crate::output::report::SourceFile::read(f).ok());
        // The Table tab's last joined read, when there is one, gives the tables section.
        let tables = self
            .table_panel
            .report_section(self.project.convention())
            .transpose();
        let written = tables
            .and_then(|tables| {
                let options = crate::output::report::ReportOptions {
                    source,
                    tables,
                    ..crate::output::report::ReportOptions::default()
                };
                crate::output::report::html(&self.project, &options).map_err(|e| e.to_string())
            })
            .and_then(|text| {
                crate::study::atomic::write_atomic(path, text.as_bytes()).map_err(|e| e.to_string())
            });
        match written {
            Ok(()) => {
                self.file_prompt.close();
                self.set_status(format!("Report written to {}", path.display()), false);
            }
            Err(e) => {
                self.file_prompt.error = Some(e.clone());
                self.set_status(format!("Report not written: {e}"), true);
            }
        }
    }

    /// A project replaces the open one: no undo across projects.
    pub(super) fn replace_project(&mut self, project: Project, file: Option<PathBuf>) {
        self.clean = project.clone();
        self.project = project;
        self.file = file;
        self.history.clear();
        self.after_external_change();
    }

    /// Exports the figure to `path` (format from the extension). A failure is said in the
    /// status bar and in the export window.
    pub fn export_to(&mut self, path: &Path) {
        let frame = self.export_frame();
        match crate::output::export::write_figure(path, &frame, &self.export_title()) {
            Ok(()) => {
                self.export_panel.error = None;
                self.set_status(format!("Figure written to {}", path.display()), false);
            }
            Err(e) => {
                self.export_panel.error = Some(e.to_string());
                self.set_status(format!("Export failed: {e}"), true);
            }
        }
    }

    /// Writes the working copy when it has unsaved changes and the interval has passed since
    /// the last write (`now` in seconds on the window's clock; called every frame).
    pub fn autosave(&mut self, now: f64) {
        let Some(dir) = self.autosave_dir.clone() else {
            return;
        };
        if !self.dirty()
            || now - self.last_autosave.0 < crate::window::autosave::INTERVAL_S
            || self.last_autosave.1.as_ref() == Some(&self.project)
        {
            return;
        }
        self.last_autosave = (now, Some(self.project.clone()));
        if let Err(e) = crate::window::autosave::write(&dir, &self.project, self.file.as_deref()) {
            self.set_status(format!("Autosave failed: {e}"), true);
        }
    }

    /// The window is asked to close: `false` when it must stay open to ask about unsaved
    /// changes. On a close, the working copy is removed — but only once the user has answered
    /// the recovery question (closing while it is open keeps the copy for the next start).
    pub fn close_requested(&mut self) -> bool {
        if self.dirty() && !self.close_allowed {
            self.leaving = Some(Leaving::Quit);
            return false;
        }
        if self.recovery.is_none()
            && let Some(dir) = &self.autosave_dir
        {
            crate::window::autosave::clear(dir);
        }
        true
    }
}
