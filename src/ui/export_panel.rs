//! The export window: figure size, then save through the native dialog or copy to the clipboard.

use crate::app::{Command, Settings};

/// Export window state.
#[derive(Debug, Default)]
pub struct ExportPanel {
    /// Whether the window is open.
    pub open: bool,
}

impl ExportPanel {
    /// Draws the window when open.
    pub fn ui(&mut self, ctx: &egui::Context, settings: &mut Settings, out: &mut Vec<Command>) {
        let mut open = self.open;
        egui::Window::new("Export figure")
            .open(&mut open)
            .collapsible(false)
            .show(ctx, |ui| {
                ui.label("The current view with its labels and legend, at a size of its own.");
                ui.horizontal(|ui| {
                    ui.label("Width");
                    ui.add(
                        egui::DragValue::new(&mut settings.export_size[0])
                            .range(16..=16384)
                            .suffix(" px"),
                    );
                    ui.label("Height");
                    ui.add(
                        egui::DragValue::new(&mut settings.export_size[1])
                            .range(16..=16384)
                            .suffix(" px"),
                    );
                });
                ui.horizontal(|ui| {
                    for (w, h) in [(1600, 1200), (1920, 1080), (3840, 2160)] {
                        if ui.small_button(format!("{w}×{h}")).clicked() {
                            settings.export_size = [w, h];
                        }
                    }
                });
                ui.horizontal(|ui| {
                    if ui.button("Save as PNG or SVG…").clicked() {
                        out.push(Command::ExportWithDialog);
                    }
                    if ui.button("Copy figure").clicked() {
                        out.push(Command::CopyFigure);
                    }
                });
                ui.small("The format follows the file name's ending (.png or .svg).");
            });
        self.open = open;
    }
}
