//! The export window: figure size, then save through the native dialog or copy to the clipboard.
//! Where no native dialog can open (no desktop portal, no zenity), the window offers its own
//! path entry and says why.

use std::path::PathBuf;

use crate::window::session::{Command, Settings};

/// The in-window path entry offered when no native dialog can open.
#[derive(Debug, Default)]
pub struct PathEntry {
    /// The path being typed.
    pub path: String,
    /// Why the native dialog could not open.
    pub reason: String,
}

/// Export window state.
#[derive(Debug, Default)]
pub struct ExportPanel {
    /// Whether the window is open.
    pub open: bool,
    /// The path entry, once a native dialog has failed to open.
    pub path_entry: Option<PathEntry>,
    /// The last export's failure, shown until the next export succeeds.
    pub error: Option<String>,
}

impl ExportPanel {
    /// Offers the in-window path entry, starting at `path`.
    pub fn offer_path_entry(&mut self, path: &std::path::Path, reason: String) {
        let keep = self.path_entry.as_ref().map(|e| e.path.clone());
        self.path_entry = Some(PathEntry {
            path: keep.unwrap_or_else(|| path.display().to_string()),
            reason,
        });
    }

    /// Draws the window when open. `dialog_open`: a native dialog is waiting for the user.
    pub fn ui(
        &mut self,
        ctx: &egui::Context,
        settings: &mut Settings,
        dialog_open: bool,
        out: &mut Vec<Command>,
    ) {
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
                ui.checkbox(&mut settings.title_block, "Title block")
                    .on_hover_text(
                        "Below the picture: the title, project and case, the tensor with its unit and convention, pore pressure and material where used, program version and date",
                    );
                if settings.title_block {
                    ui.add(
                        egui::TextEdit::singleline(&mut settings.figure_title)
                            .hint_text("title (optional)")
                            .desired_width(260.0),
                    )
                    .on_hover_text("Figure title: the title block's first line");
                }
                ui.weak("Text is 8.5 pt when the figure is printed 16 cm wide.");
                ui.horizontal(|ui| {
                    if ui
                        .add_enabled(!dialog_open, egui::Button::new("Save as PNG or SVG…"))
                        .on_hover_text("Opens the system's file dialog")
                        .clicked()
                    {
                        out.push(Command::ExportWithDialog);
                    }
                    if ui.button("Copy figure").clicked() {
                        out.push(Command::CopyFigure);
                    }
                });
                if dialog_open {
                    ui.horizontal(|ui| {
                        ui.spinner();
                        ui.label("Waiting for the file dialog…");
                    });
                }
                self.path_entry_ui(ui, out);
                if let Some(e) = &self.error {
                    ui.colored_label(ui.visuals().error_fg_color, format!("⚠ {e}"));
                }
                ui.weak("The format follows the file name's ending (.png or .svg).");
            });
        self.open = open;
    }

    fn path_entry_ui(&mut self, ui: &mut egui::Ui, out: &mut Vec<Command>) {
        let Some(entry) = &mut self.path_entry else {
            return;
        };
        ui.separator();
        ui.label(format!(
            "No file dialog could open ({}). Type where to save instead:",
            entry.reason
        ));
        let mut save = false;
        ui.horizontal(|ui| {
            let response = ui
                .add(egui::TextEdit::singleline(&mut entry.path).desired_width(320.0))
                .on_hover_text("Path of the figure file, ending in .png or .svg");
            save |= response.lost_focus() && ui.input(|i| i.key_pressed(egui::Key::Enter));
            save |= ui
                .button("Save")
                .on_hover_text("Write the figure to this path")
                .clicked();
        });
        if save {
            let path = entry.path.trim();
            if path.is_empty() {
                self.error = Some("type a path ending in .png or .svg".to_owned());
            } else {
                out.push(Command::ExportTo(PathBuf::from(path)));
            }
        }
    }
}
