//! The window's questions, as modal dialogs: "save the changes first?" before leaving a project
//! with unsaved changes, and the offer to recover the autosaved working copy after a crash.
//! The answers go back as [`Command::Answer`].

use crate::window::autosave::WorkingCopy;
use crate::window::session::{Answer, Command, Leaving};

/// Draws the questions that are open: `leaving` the project named `project_name`, and the
/// `recovery` offer.
pub fn questions_ui(
    ctx: &egui::Context,
    project_name: &str,
    leaving: Option<&Leaving>,
    recovery: Option<&WorkingCopy>,
    out: &mut Vec<Command>,
) {
    if let Some(what) = leaving {
        let verb = match what {
            Leaving::New => "starting a new project",
            Leaving::Open | Leaving::OpenPath(_) => "opening another project",
            Leaving::Demo => "opening the demo project",
            Leaving::Quit => "closing Planewise",
        };
        egui::Modal::new(egui::Id::unique("unsaved-changes")).show(ctx, |ui| {
            ui.heading("Unsaved changes");
            ui.label(format!(
                "'{project_name}' has changes that are not saved. Save them before {verb}?"
            ));
            ui.horizontal(|ui| {
                if ui.button("Save").clicked() {
                    out.push(Command::Answer(Answer::SaveFirst));
                }
                if ui.button("Don't save").clicked() {
                    out.push(Command::Answer(Answer::DontSave));
                }
                if ui.button("Cancel").clicked() {
                    out.push(Command::Answer(Answer::Stay));
                }
            });
        });
    }
    if let Some(copy) = recovery {
        egui::Modal::new(egui::Id::unique("recovery")).show(ctx, |ui| {
            ui.heading("Recover unsaved work?");
            ui.label(format!(
                "Planewise did not close normally last time. A working copy of '{}'{} was autosaved {}.",
                copy.project.name,
                copy.source
                    .as_ref()
                    .map(|p| format!(" ({})", p.display()))
                    .unwrap_or_default(),
                crate::window::autosave::age_text(copy.written)
            ));
            ui.horizontal(|ui| {
                if ui.button("Recover").clicked() {
                    out.push(Command::Answer(Answer::Recover));
                }
                if ui.button("Discard").clicked() {
                    out.push(Command::Answer(Answer::DiscardRecovery));
                }
            });
        });
    }
}
