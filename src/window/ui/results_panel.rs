//! The results panel: every number with its unit; hovering shows the formula.

use crate::study::Derived;
use crate::window::session::Command;

/// The results section: every number with its unit and formula.
pub struct ResultsPanel;

impl super::Panel for ResultsPanel {
    fn ui(&mut self, ui: &mut egui::Ui, reads: super::Reads<'_>, writes: &mut super::Writes<'_>) {
        results_ui(ui, reads.d, writes.commands);
    }
}

/// Draws the results.
fn results_ui(ui: &mut egui::Ui, d: &Derived, out: &mut Vec<Command>) {
    ui.horizontal_wrapped(|ui| {
        ui.heading("Results");
        if ui
            .button("Copy")
            .on_hover_text(
                "Copy as tab-separated text, values and units in separate columns (Ctrl+Shift+C)",
            )
            .clicked()
        {
            out.push(Command::CopyResults(
                crate::output::results::CopyFormat::Tsv,
            ));
        }
        super::copy_as_ui(ui, out, Command::CopyResults);
    });
    ui.label(format!("{}, {}", d.unit, d.convention.key()));
    let all = crate::output::results::shown_rows(d);
    let mut group = "";
    let mut grid_rows: Vec<&crate::output::results::ResultRow> = Vec::new();
    let unit = d.unit;
    let flush =
        |ui: &mut egui::Ui, title: &str, items: &mut Vec<&crate::output::results::ResultRow>| {
            if items.is_empty() {
                return;
            }
            ui.add_space(4.0);
            ui.strong(title);
            egui::Grid::new(("results", title))
                .num_columns(2)
                .striped(true)
                .show(ui, |ui| {
                    for row in items.drain(..) {
                        // The value wraps, so a narrow panel shows every value whole.
                        ui.add(egui::Label::new(&row.name).extend())
                            .on_hover_text(row.formula);
                        ui.add(
                            egui::Label::new(egui::RichText::new(row.value.text(unit)).monospace())
                                .wrap(),
                        )
                        .on_hover_text(row.formula);
                        ui.end_row();
                    }
                });
        };
    for row in &all {
        if row.group != group {
            flush(ui, group, &mut grid_rows);
            group = row.group;
        }
        grid_rows.push(row);
    }
    flush(ui, group, &mut grid_rows);
}
