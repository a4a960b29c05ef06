//! The window's layout: menus, status bar, the side panels, the tabs of the central area and the
//! floating windows, drawn each frame; the commands they return are applied at the end.

use super::PlanewiseApp;
use crate::window::session::Central;
use crate::window::ui;
use crate::window::ui::map_panel::{MapPanel, WorstPlanePanel};
use crate::window::ui::mohr_panel::MohrPanel;
use crate::window::ui::results_panel::ResultsPanel;
use crate::window::ui::verdict_panel::VerdictPanel;
use crate::window::ui::view_panel::ViewPanel;
use crate::window::ui::{Panel, Reads, Writes};

impl PlanewiseApp {
    /// Draws the whole window into `ui` and applies what the user asked for. Used by the real
    /// window and by the interaction tests.
    pub fn show(&mut self, ui: &mut egui::Ui) {
        let ctx = ui.ctx().clone();
        self.install_fonts(&ctx);
        self.poll_dialog();
        if ctx.input(|i| i.viewport().close_requested()) && !self.close_requested() {
            ctx.send_viewport_cmd(egui::ViewportCommand::CancelClose);
        }
        let mut commands = Self::shortcuts(&ctx);
        let history = (self.history.can_undo(), self.history.can_redo());
        let d = self.derived.get(&self.project).clone();
        ui::menus_ui(ui, &mut self.settings, history, &mut commands);
        ui::status_bar_ui(ui, &d, self.status.as_ref());
        let theme = if self.settings.dark {
            egui::ThemePreference::Dark
        } else {
            egui::ThemePreference::Light
        };
        if ctx.options(|o| o.theme_preference) != theme {
            ctx.set_theme(theme);
        }
        // Presenting the walk-through: the picture and its words only.
        let presenting =
            self.walkthrough_panel.presenting && self.settings.central == Central::Walkthrough;
        // Each side panel takes at most a quarter of the window, so the picture keeps at least
        // half of it; wider content scrolls inside the panel.
        let side_max = (ui.available_width() * 0.25).max(180.0);
        let reads = Reads {
            project: &self.project,
            d: &d,
        };
        let mut writes = Writes {
            commands: &mut commands,
            settings: &mut self.settings,
        };
        if !presenting && writes.settings.show_inputs {
            egui::Panel::left("stress-state")
                .resizable(true)
                .default_size(330.0)
                .size_range(180.0..=side_max)
                .show(ui, |ui| {
                    egui::ScrollArea::both().show(ui, |ui| {
                        self.cases_panel.ui(ui, reads, &mut writes);
                        self.input_panel.ui(ui, reads, &mut writes);
                        ui.separator();
                        self.stress_panel.ui(ui, reads, &mut writes);
                        ui.separator();
                        self.plane_panel.ui(ui, reads, &mut writes);
                        ui.separator();
                        WorstPlanePanel.ui(ui, reads, &mut writes);
                    });
                });
        }
        if !presenting && writes.settings.show_results {
            egui::Panel::right("results")
                .resizable(true)
                .default_size(330.0)
                .size_range(180.0..=side_max)
                .show(ui, |ui| {
                    egui::ScrollArea::both().show(ui, |ui| {
                        VerdictPanel.ui(ui, reads, &mut writes);
                        egui::CollapsingHeader::new("Material")
                            .default_open(true)
                            .show(ui, |ui| {
                                self.material_panel.ui(ui, reads, &mut writes);
                            });
                        ui.separator();
                        ResultsPanel.ui(ui, reads, &mut writes);
                    });
                });
        }
        egui::CentralPanel::default().show(ui, |ui| {
            let central = &mut writes.settings.central;
            ui.horizontal_wrapped(|ui| {
                ui.selectable_value(central, Central::View3d, "3D view");
                ui.selectable_value(central, Central::Map, "Orientation map");
                ui.selectable_value(central, Central::Mohr, "Mohr circles");
                ui.selectable_value(central, Central::Envelope, "Envelope");
                ui.selectable_value(central, Central::Faults, "Faults");
                ui.selectable_value(central, Central::Walkthrough, "Walk-through")
                    .on_hover_text(
                        "The shown case explained step by step (→ / Space, ←, Esc, F11)",
                    );
                ui.selectable_value(central, Central::Table, "Table")
                    .on_hover_text("A finite-element result table, ranked (File → Import table…)");
                ui.selectable_value(central, Central::Fatigue, "Fatigue")
                    .on_hover_text("A load history judged on its critical plane: criteria, life, the shear path and the map");
            });
            let panel: &mut dyn Panel = match writes.settings.central {
                Central::View3d => &mut ViewPanel,
                Central::Map => &mut MapPanel,
                Central::Mohr => &mut MohrPanel,
                Central::Faults => &mut self.faults_panel,
                Central::Walkthrough => &mut self.walkthrough_panel,
                Central::Table => &mut self.table_panel,
                Central::Fatigue => &mut self.fatigue_panel,
                Central::Envelope => &mut self.envelope_panel,
            };
            panel.ui(ui, reads, &mut writes);
        });
        let dialog_open = self.pending_dialog.is_some();
        self.export_panel
            .ui(&ctx, &mut self.settings, dialog_open, &mut commands);
        self.file_prompt.ui(&ctx, &mut commands);
        ui::about_ui(&ctx, &mut self.help.about);
        ui::keys_ui(&ctx, &mut self.help.keys);
        ui::questions::questions_ui(
            &ctx,
            &self.project.name,
            self.leaving.as_ref(),
            self.recovery.as_ref(),
            &mut commands,
        );
        for command in commands {
            self.apply(&ctx, command);
        }
        self.follow_up(&ctx);
        let now = ctx.input(|i| i.time);
        self.autosave(now);
        if self.autosave_dir.is_some() && self.dirty() {
            ctx.request_repaint_after(std::time::Duration::from_secs_f64(
                crate::window::autosave::INTERVAL_S,
            ));
        }
        self.frames += 1;
        if self.frames >= 3
            && let Some(marker) = self.start_marker.take()
        {
            let _ = std::fs::remove_file(marker);
        }
    }
}
