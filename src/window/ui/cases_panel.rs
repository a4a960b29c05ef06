//! The project panel: the load cases and combinations of the project (click one to show it),
//! with tools to add, duplicate, rename, move and delete them, a case's description, and the
//! terms of a combination (case × factor). Every change is a study edit, so undo reaches it.

use crate::study::model::terms_text;
use crate::study::{Derived, Edit, InputKind, Project, Term};
use crate::window::session::{Coalesce, Command};

/// Text being typed in the panel.
#[derive(Debug, Default)]
pub struct CasesPanel {
    /// The item the name field was filled from.
    name_for: String,
    /// The name field.
    name: String,
}

fn edit(out: &mut Vec<Command>, edit: Edit, coalesce: Option<Coalesce>) {
    out.push(Command::Edit { edit, coalesce });
}

impl CasesPanel {
    /// Draws the panel.
    fn show(&mut self, ui: &mut egui::Ui, project: &Project, d: &Derived, out: &mut Vec<Command>) {
        ui.heading("Load cases");
        for case in &project.cases {
            let shown = case.name == d.name;
            let response = ui.selectable_label(shown, &case.name).on_hover_text(
                if case.description.is_empty() {
                    "A load case: click to show it; the grid edits it".to_owned()
                } else {
                    case.description.clone()
                },
            );
            if response.clicked() && !shown {
                edit(out, Edit::Activate(case.name.clone()), None);
            }
        }
        ui.horizontal(|ui| {
            if ui
                .small_button("+ load case")
                .on_hover_text("Adds a load case with a zero stress state and shows it")
                .clicked()
            {
                edit(out, Edit::AddCase, None);
            }
            ui.menu_button("+ from other input", |ui| {
                for kind in InputKind::ALL.into_iter().skip(1) {
                    if ui.button(kind.label()).clicked() {
                        edit(out, Edit::AddCaseOfKind(kind), None);
                        ui.close();
                    }
                }
            })
            .response
            .on_hover_text(
                "A load case given as in-situ stresses, principal values and axes, a strain rosette or plane stress",
            );
        });
        ui.add_space(4.0);
        ui.strong("Combinations");
        if project.combinations.is_empty() {
            ui.weak("none yet");
        }
        for combination in &project.combinations {
            let shown = combination.name == d.name;
            let response = ui
                .selectable_label(shown, &combination.name)
                .on_hover_text(format!(
                    "Σ factor × case tensor = {}",
                    terms_text(&combination.terms)
                ));
            if response.clicked() && !shown {
                edit(out, Edit::Activate(combination.name.clone()), None);
            }
        }
        if ui
            .small_button("+ combination")
            .on_hover_text("Adds a combination of every load case with factor 1 and shows it")
            .clicked()
        {
            edit(out, Edit::AddCombination, None);
        }
        ui.add_space(4.0);
        self.item_tools_ui(ui, project, d, out);
    }

    /// Tools for the shown case or combination.
    fn item_tools_ui(
        &mut self,
        ui: &mut egui::Ui,
        project: &Project,
        d: &Derived,
        out: &mut Vec<Command>,
    ) {
        let name = d.name.clone();
        if name.is_empty() {
            return;
        }
        if self.name_for != name {
            self.name_for.clone_from(&name);
            self.name.clone_from(&name);
        }
        let kind = if d.combination {
            "Combination"
        } else {
            "Load case"
        };
        ui.group(|ui| {
            ui.horizontal(|ui| {
                ui.label(format!("{kind} name"));
                let response = ui.add(
                    egui::TextEdit::singleline(&mut self.name)
                        .desired_width(120.0)
                        .hint_text("name"),
                );
                let response = response.on_hover_text("Type a new name and press Enter");
                if response.lost_focus() && self.name != name {
                    edit(
                        out,
                        Edit::Rename {
                            from: name.clone(),
                            to: self.name.clone(),
                        },
                        None,
                    );
                    self.name_for.clear();
                }
            });
            ui.horizontal_wrapped(|ui| {
                if ui.small_button("↑").on_hover_text("Move up").clicked() {
                    edit(
                        out,
                        Edit::Move {
                            name: name.clone(),
                            up: true,
                        },
                        None,
                    );
                }
                if ui.small_button("↓").on_hover_text("Move down").clicked() {
                    edit(
                        out,
                        Edit::Move {
                            name: name.clone(),
                            up: false,
                        },
                        None,
                    );
                }
                if ui
                    .small_button("Duplicate")
                    .on_hover_text("A copy, shown at once")
                    .clicked()
                {
                    edit(out, Edit::Duplicate(name.clone()), None);
                }
                let tip = if d.combination {
                    "Delete this combination (undo brings it back)"
                } else {
                    "Delete this load case and its terms in combinations (undo brings it back)"
                };
                if ui.small_button("Delete").on_hover_text(tip).clicked() {
                    edit(out, Edit::Delete(name.clone()), None);
                }
            });
            if let Some(case) = project.case(&name) {
                let mut text = case.description.clone();
                ui.add(
                    egui::TextEdit::multiline(&mut text)
                        .desired_rows(1)
                        .desired_width(f32::INFINITY)
                        .hint_text("description (where the load comes from)"),
                );
                if text != case.description {
                    edit(
                        out,
                        Edit::SetDescription {
                            name: name.clone(),
                            text,
                        },
                        Some(Coalesce::Description),
                    );
                }
            }
            if let Some(combination) = project.combination(&name) {
                terms_ui(ui, project, &name, &combination.terms, out);
            }
        });
    }
}

/// The terms of a combination: one row per term (case, factor, remove) and a button to add one.
fn terms_ui(
    ui: &mut egui::Ui,
    project: &Project,
    name: &str,
    terms: &[Term],
    out: &mut Vec<Command>,
) {
    let mut edited = terms.to_vec();
    let mut remove = None;
    let mut coalesce = None;
    let can_remove = edited.len() > 1;
    egui::Grid::new("combination-terms")
        .num_columns(3)
        .spacing([6.0, 3.0])
        .show(ui, |ui| {
            for (i, term) in edited.iter_mut().enumerate() {
                let response = ui.add(
                    // Written as the formula under the terms writes it (1.5, not 1.50).
                    egui::DragValue::new(&mut term.factor)
                        .speed(0.05)
                        .custom_formatter(|v, _| crate::text::format::readable(v, 6))
                        .custom_parser(|t| crate::text::parse::number(t).ok())
                        .prefix("× "),
                );
                let response = response.on_hover_text(format!(
                    "Factor of '{}' (any number; negative and zero allowed)",
                    term.case
                ));
                if response.changed() {
                    coalesce = Some(Coalesce::Factors);
                }
                let picked = egui::ComboBox::from_id_salt(("term-case", i))
                    .selected_text(&term.case)
                    .show_ui(ui, |ui| {
                        for case in &project.cases {
                            ui.selectable_value(&mut term.case, case.name.clone(), &case.name);
                        }
                    });
                let label = format!("Load case of term {}", i + 1);
                picked
                    .response
                    .widget_info(|| egui::WidgetInfo::labeled(egui::Role::ComboBox, true, &label));
                if ui
                    .add_enabled(can_remove, egui::Button::new("✕").small())
                    .on_hover_text("Remove this term")
                    .on_disabled_hover_text("A combination keeps at least one term")
                    .clicked()
                {
                    remove = Some(i);
                }
                ui.end_row();
            }
        });
    if let Some(i) = remove {
        edited.remove(i);
        coalesce = None;
    }
    if ui
        .small_button("+ term")
        .on_hover_text("Adds the first load case with factor 1")
        .clicked()
        && let Some(first) = project.cases.first()
    {
        edited.push(Term {
            unknown: crate::study::unknown::UnknownKeys::new(),
            case: first.name.clone(),
            factor: 1.0,
        });
        coalesce = None;
    }
    ui.label(format!("{name} = {}", terms_text(&edited)));
    if edited != terms {
        edit(
            out,
            Edit::SetTerms {
                name: name.to_owned(),
                terms: edited,
            },
            coalesce,
        );
    }
}

impl super::Panel for CasesPanel {
    fn ui(&mut self, ui: &mut egui::Ui, reads: super::Reads<'_>, writes: &mut super::Writes<'_>) {
        self.show(ui, reads.project, reads.d, writes.commands);
    }
}
