//! Command dispatch: the commands panels, menus and keys return, applied to the project (one
//! undoable edit each), the history and the view settings; leaving a project after the
//! unsaved-changes question.

use super::{DialogPurpose, FollowUp, PlanewiseApp};
use crate::picture::draw::camera::Camera;
use crate::study;
use crate::study::Derived;
use crate::study::Edit;
use crate::study::Project;
use crate::window::session::Answer;
use crate::window::session::Coalesce;
use crate::window::session::Command;
use crate::window::session::Leaving;
use crate::window::session::UNTITLED;
use crate::window::ui::file_prompt::PromptPurpose;

impl PlanewiseApp {
    /// Does what the unsaved-changes question was about (or what needed no question).
    pub(super) fn go(&mut self, what: Leaving) {
        self.leaving = None;
        match what {
            Leaving::New => {
                let mut project = Project::new(
                    UNTITLED,
                    self.project.unit().unwrap_or_default(),
                    self.project.convention(),
                );
                if let Ok(p) = Edit::AddCase.apply(&project) {
                    project = p;
                }
                self.replace_project(project, None);
                self.set_status("New project with one load case (zero stress)", false);
            }
            Leaving::Open => self.follow_up = Some(FollowUp::OpenDialog),
            Leaving::OpenPath(path) => self.open_path(&path),
            Leaving::Demo => {
                self.replace_project(Project::demo(), None);
                self.set_status("Opened the demo project (an invented scenario)", false);
            }
            Leaving::Quit => {
                self.close_allowed = true;
                if let Some(dir) = &self.autosave_dir {
                    crate::window::autosave::clear(dir);
                }
                self.follow_up = Some(FollowUp::Close);
            }
        }
    }

    /// Goes ahead at once when nothing is unsaved; asks first otherwise.
    pub(super) fn leave(&mut self, what: Leaving) {
        if self.dirty() {
            self.leaving = Some(what);
        } else {
            self.go(what);
        }
    }

    /// Applies one command.
    pub fn apply(&mut self, ctx: &egui::Context, command: Command) {
        match command {
            Command::Edit { edit, coalesce } => self.edit(&edit, coalesce),
            Command::Undo => self.step_history(true),
            Command::Redo => self.step_history(false),
            Command::SetView(preset) => {
                let projection = self.settings.camera.projection;
                self.settings.camera = Camera {
                    projection,
                    ..Camera::from_preset(preset)
                };
            }
            Command::NewProject => self.leave(Leaving::New),
            Command::OpenProject => self.leave(Leaving::Open),
            Command::OpenPath(path) => {
                if self.file_prompt.purpose == Some(PromptPurpose::Open) {
                    // Typed in the path entry, after any question was answered.
                    self.open_path(&path);
                } else {
                    self.leave(Leaving::OpenPath(path));
                }
            }
            Command::OpenDemo => self.leave(Leaving::Demo),
            Command::Save => match self.file.clone() {
                Some(path) => self.save_to(&path),
                None => self.start_dialog(ctx, DialogPurpose::SaveProject),
            },
            Command::SaveAs => self.start_dialog(ctx, DialogPurpose::SaveProject),
            Command::SaveTo(path) => self.save_to(&path),
            Command::ExportReport => self.start_dialog(ctx, DialogPurpose::Report),
            Command::ReportTo(path) => self.report_to(&path),
            Command::CopyTable(table, format) => {
                ctx.copy_text(table.write(format));
                self.set_status("Table copied", false);
            }
            Command::CopyResults(format) => {
                let d = Derived::new(&self.project);
                let mut rows = crate::output::results::shown_rows(&d);
                rows.extend(crate::output::results::verdict_rows(&d.verdicts));
                ctx.copy_text(
                    crate::output::results::table(&rows, d.unit, d.convention).write(format),
                );
                self.set_status("Results copied (value and unit in separate columns)", false);
            }
            Command::CopyFigure => match crate::picture::draw::png::to_pixmap(
                &crate::picture::caution::with_caution(&self.export_frame()),
            ) {
                Ok(pixmap) => {
                    let image = egui::ColorImage::from_rgba_premultiplied(
                        [pixmap.width() as usize, pixmap.height() as usize],
                        pixmap.data(),
                    );
                    ctx.copy_image(image);
                    self.set_status(
                        "Figure copied to the clipboard (where the platform allows images)",
                        false,
                    );
                }
                Err(e) => self.set_status(format!("Copy figure failed: {e}"), true),
            },
            Command::OpenExport => self.export_panel.open = true,
            Command::ExportWithDialog => self.start_dialog(ctx, DialogPurpose::Figure),
            Command::ExportTo(path) => self.export_to(&path),
            Command::ShowAbout => self.help.about = true,
            Command::ShowKeys => self.help.keys = true,
            Command::Answer(answer) => self.answer(ctx, answer),
            Command::ToggleInputs => self.settings.show_inputs = !self.settings.show_inputs,
            Command::ToggleResults => self.settings.show_results = !self.settings.show_results,
            Command::ImportTable => self.start_dialog(ctx, DialogPurpose::Table),
        }
        self.follow_up(ctx);
    }

    /// Acts on the answer to the unsaved-changes question or the recovery offer.
    pub(super) fn answer(&mut self, ctx: &egui::Context, answer: Answer) {
        match answer {
            Answer::SaveFirst => {
                if let Some(what) = self.leaving.take() {
                    self.after_save = Some(what);
                    self.apply(ctx, Command::Save);
                }
            }
            Answer::DontSave => {
                if let Some(what) = self.leaving.clone() {
                    self.go(what);
                }
            }
            Answer::Stay => self.leaving = None,
            Answer::Recover => {
                let Some(copy) = self.recovery.take() else {
                    return;
                };
                let clean = copy
                    .source
                    .as_ref()
                    .and_then(|p| study::load(p).ok())
                    .map(|(p, _)| p);
                self.replace_project(copy.project.clone(), copy.source.clone());
                // Recovered work is unsaved until the user saves it.
                self.clean = clean.unwrap_or_else(|| {
                    Project::new(
                        "",
                        crate::mechanics::StressUnit::MPa,
                        crate::mechanics::SignConvention::TensionPositive,
                    )
                });
                self.set_status(
                    "Recovered the autosaved working copy; save it to keep it",
                    false,
                );
            }
            Answer::DiscardRecovery => {
                self.recovery = None;
                if let Some(dir) = &self.autosave_dir {
                    crate::window::autosave::clear(dir);
                }
            }
        }
    }

    /// What `go` left to do with the context: show the open dialog, close the window.
    pub(super) fn follow_up(&mut self, ctx: &egui::Context) {
        match self.follow_up.take() {
            Some(FollowUp::OpenDialog) => self.start_dialog(ctx, DialogPurpose::OpenProject),
            Some(FollowUp::Close) => ctx.send_viewport_cmd(egui::ViewportCommand::Close),
            None => {}
        }
    }

    /// One study edit: one undo step (or merged into the last), or a message saying why not.
    pub(super) fn edit(&mut self, edit: &Edit, coalesce: Option<Coalesce>) {
        match edit.apply(&self.project) {
            Ok(mut next) => {
                // Once the demo's stresses are changed, the project is no longer the invented
                // scenario: do not keep its name.
                let demo = Project::demo();
                if next.name == demo.name
                    && (next.cases != demo.cases || next.combinations != demo.combinations)
                {
                    UNTITLED.clone_into(&mut next.name);
                }
                if next != self.project {
                    // Showing another case is navigation, not a change: no undo step of its
                    // own (undo of a later edit comes back to the case it was made on).
                    if matches!(edit, Edit::Activate(_)) {
                        self.history.break_run();
                    } else {
                        self.history.record(&self.project, coalesce);
                    }
                    self.project = next;
                }
                if !matches!(
                    edit,
                    Edit::SetComponents(_)
                        | Edit::SetComponent(..)
                        | Edit::SetPlane(_)
                        | Edit::SetMeasure(_)
                ) {
                    self.after_external_change();
                }
            }
            Err(e) => self.set_status(format!("Not changed: {e}"), true),
        }
    }

    /// Moves one step back (undo) or forward (redo) through the history.
    pub(super) fn step_history(&mut self, back: bool) {
        let current = self.project.clone();
        let to = if back {
            self.history.undo(current)
        } else {
            self.history.redo(current)
        };
        if let Some(project) = to {
            self.project = project;
            self.after_external_change();
        }
    }

    /// The grid and plane fields show the project again (after undo, presets, unit changes).
    pub(super) fn after_external_change(&mut self) {
        self.stress_panel.reset();
        self.plane_panel.reset();
    }

    /// The commands of the window-wide keys pressed this frame ([`crate::window::keys`]).
    pub(super) fn shortcuts(ctx: &egui::Context) -> Vec<Command> {
        use crate::window::keys::{Scope, pressed};
        pressed(ctx, Scope::Window)
            .into_iter()
            .chain(pressed(ctx, Scope::NoTextField))
            .filter_map(crate::window::keys::Act::command)
            .collect()
    }
}
