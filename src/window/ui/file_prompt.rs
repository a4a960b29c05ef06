//! The window's own path entry for opening and saving projects, offered when no native file
//! dialog can open (no desktop portal, no zenity) — the same fallback the figure export has.

use std::path::{Path, PathBuf};

use crate::window::session::Command;

/// What the typed path is for.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum PromptPurpose {
    /// Open a project file.
    Open,
    /// Save the project to a file.
    SaveAs,
    /// Write the calculation report.
    Report,
}

/// The path entry's state.
#[derive(Debug, Default)]
pub struct FilePrompt {
    /// Shown while `Some`.
    pub purpose: Option<PromptPurpose>,
    /// The typed path.
    pub path: String,
    /// Why no dialog opened.
    pub why: String,
    /// The last failure to open or save there.
    pub error: Option<String>,
}

impl FilePrompt {
    /// Shows the entry for `purpose`, starting from `suggested`.
    pub fn offer(&mut self, purpose: PromptPurpose, suggested: &Path, why: String) {
        self.purpose = Some(purpose);
        self.path = suggested.display().to_string();
        self.why = why;
        self.error = None;
    }

    /// Closes the entry (the file was opened or saved).
    pub fn close(&mut self) {
        self.purpose = None;
        self.error = None;
    }

    /// Draws the entry while it is wanted.
    pub fn ui(&mut self, ctx: &egui::Context, out: &mut Vec<Command>) {
        let Some(purpose) = self.purpose else {
            return;
        };
        let (title, action) = match purpose {
            PromptPurpose::Open => ("Open project", "Open"),
            PromptPurpose::SaveAs => ("Save project as", "Save"),
            PromptPurpose::Report => ("Export calculation report", "Write report"),
        };
        let mut open = true;
        egui::Window::new(title)
            .open(&mut open)
            .collapsible(false)
            .resizable(false)
            .show(ctx, |ui| {
                ui.label(format!("No file dialog is available ({}).", self.why));
                ui.label(if purpose == PromptPurpose::Report {
                    "Type the report's path (.html):"
                } else {
                    "Type the project file's path:"
                });
                let response = ui.add(
                    egui::TextEdit::singleline(&mut self.path)
                        .desired_width(420.0)
                        .hint_text("path/to/project.json"),
                );
                let response = response.on_hover_text(
                    "Project file path (a relative path starts in the folder Planewise was started from)",
                );
                let enter = response.lost_focus() && ui.input(|i| i.key_pressed(egui::Key::Enter));
                if let Some(e) = &self.error {
                    ui.colored_label(ui.visuals().error_fg_color, format!("⚠ {e}"));
                }
                ui.horizontal(|ui| {
                    if ui.button(action).clicked() || enter {
                        let path = PathBuf::from(self.path.trim());
                        out.push(match purpose {
                            PromptPurpose::Open => Command::OpenPath(path),
                            PromptPurpose::SaveAs => Command::SaveTo(path),
                            PromptPurpose::Report => Command::ReportTo(path),
                        });
                    }
                    if ui.button("Cancel").clicked() {
                        self.purpose = None;
                    }
                });
            });
        if !open {
            self.purpose = None;
        }
    }
}
