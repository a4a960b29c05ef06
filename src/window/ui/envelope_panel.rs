//! The envelope tab: one measure over every load case and combination, worst first, with the
//! governing one marked and a bar per row to compare at a glance. Clicking a row shows it.

use crate::picture::draw::map::MapMeasure;
use crate::study::{Derived, Edit, Envelope, EnvelopeMeasure, Project, envelope};
use crate::text::format::dip_text;
use crate::window::session::{Command, Settings};

/// The last envelope computed and what it was computed from.
#[derive(Debug, Default)]
pub struct EnvelopePanel {
    cache: Option<((Project, EnvelopeMeasure), Result<Envelope, String>)>,
}

/// Every measure the envelope can rank by, in menu order.
#[must_use]
pub fn measures() -> Vec<EnvelopeMeasure> {
    EnvelopeMeasure::ALL.to_vec()
}

impl EnvelopePanel {
    /// The envelope for `project` and `measure`, computed once per change.
    pub fn envelope(
        &mut self,
        project: &Project,
        measure: EnvelopeMeasure,
    ) -> &Result<Envelope, String> {
        let fresh = matches!(&self.cache, Some((key, _)) if key.0 == *project && key.1 == measure);
        if !fresh {
            let result =
                envelope(project, measure, &project.search_settings()).map_err(|e| e.to_string());
            self.cache = Some(((project.clone(), measure), result));
        }
        match &self.cache {
            Some((_, result)) => result,
            None => &EMPTY,
        }
    }

    /// Draws the tab.
    fn show(
        &mut self,
        ui: &mut egui::Ui,
        project: &Project,
        d: &Derived,
        settings: &mut Settings,
        out: &mut Vec<Command>,
    ) {
        ui.horizontal_wrapped(|ui| {
            ui.label("Rank every load case and combination by");
            egui::ComboBox::from_id_salt("envelope-measure")
                .selected_text(settings.envelope_measure.label())
                .show_ui(ui, |ui| {
                    for m in measures() {
                        ui.selectable_value(&mut settings.envelope_measure, m, m.label());
                    }
                })
                .response
                .widget_info(|| {
                    egui::WidgetInfo::labeled(egui::Role::ComboBox, true, "Envelope measure")
                });
            ui.weak("(worst first; click a row to show it)");
        });
        let measure = settings.envelope_measure;
        if matches!(measure, EnvelopeMeasure::Plane(m) if m.uses_friction()) {
            let strength = project.plane_strength().map_or_else(
                || "no c and φ given".to_owned(),
                |(m, _)| {
                    format!(
                        "c = {} {unit}, φ = {}°",
                        crate::text::format::readable(d.unit.from_pa(m.cohesion_pa), 5),
                        crate::text::format::readable(m.friction_angle_deg, 5),
                        unit = d.unit
                    )
                },
            );
            ui.weak(format!(
                "Pore pressure and the planes' strength from the worst-plane settings: p = {} {unit}, {strength}",
                crate::text::format::readable(d.unit.from_pa(project.measure.pore_pressure_pa), 5),
                unit = d.unit
            ));
        }
        if let EnvelopeMeasure::Utilization(c) = measure {
            let name = if project.material.name.is_empty() {
                "the project's material".to_owned()
            } else {
                format!("'{}'", project.material.name)
            };
            ui.weak(format!(
                "Utilization under proportional loading with {name}: {}",
                c.formula()
            ));
        }
        let shown = MapMeasure {
            measure: measure
                .plane()
                .unwrap_or(crate::mechanics::search::Measure::Shear)
                .into(),
            unit: d.unit,
            convention: d.convention,
        };
        let value_text = |v: f64| {
            if measure.is_stress() {
                format!(
                    "{} {}",
                    crate::text::format::readable(d.unit.from_pa(v), 6),
                    d.unit
                )
            } else if matches!(measure, EnvelopeMeasure::Utilization(_)) {
                format!("U = {}", crate::text::format::readable(v, 4))
            } else {
                shown.value_text(v, 4)
            }
        };
        let result = self.envelope(project, measure);
        let env = match result {
            Ok(env) => env.clone(),
            Err(e) => {
                ui.colored_label(ui.visuals().error_fg_color, format!("⚠ {e}"));
                return;
            }
        };
        ui.weak(env.counts.text("rows"))
            .on_hover_text("Failing at any scale or without frictional capacity ranks worst, above every number; never reaching the surface ranks best; then undefined, then not checked");
        let table = crate::output::results::TextTable {
            title: format!(
                "Planewise envelope of {}, {}",
                measure.label(),
                d.convention.key()
            ),
            header: [
                "rank",
                "case or combination",
                "kind",
                "value",
                "unit",
                "governs",
            ]
            .map(str::to_owned)
            .to_vec(),
            rows: env
                .rows
                .iter()
                .enumerate()
                .map(|(i, r)| {
                    let (value, unit) = match r.value {
                        Some(v) if measure.is_stress() => (
                            crate::text::format::readable(d.unit.from_pa(v), 6),
                            d.unit.to_string(),
                        ),
                        Some(v) => (crate::text::format::readable(v, 6), String::new()),
                        None => (
                            crate::output::results::standing_word(r.standing()).to_owned(),
                            String::new(),
                        ),
                    };
                    let kind = if r.combination {
                        "combination"
                    } else {
                        "load case"
                    };
                    let governs = env.governing.as_deref() == Some(r.name.as_str());
                    vec![
                        (i + 1).to_string(),
                        r.name.clone(),
                        kind.to_owned(),
                        value,
                        unit,
                        if governs { "yes" } else { "" }.to_owned(),
                    ]
                })
                .collect(),
        };
        ui.horizontal(|ui| {
            super::copy_as_ui(ui, out, |f| Command::CopyTable(table.clone(), f));
        });
        let planes = matches!(measure, EnvelopeMeasure::Plane(_));
        let largest = env
            .rows
            .iter()
            .filter_map(|r| r.value)
            .map(f64::abs)
            .fold(0.0, f64::max);
        egui::ScrollArea::vertical().show(ui, |ui| {
            egui::Grid::new("envelope-rows")
                .num_columns(if planes { 6 } else { 5 })
                .striped(true)
                .spacing([12.0, 6.0])
                .show(ui, |ui| {
                    let heads = [
                        "#",
                        "case or combination",
                        "kind",
                        "value",
                        "",
                        "worst plane",
                    ];
                    for head in &heads[..if planes { 6 } else { 5 }] {
                        ui.strong(*head);
                    }
                    ui.end_row();
                    for (i, row) in env.rows.iter().enumerate() {
                        ui.label(format!("{}", i + 1));
                        let governs = env.governing.as_deref() == Some(row.name.as_str());
                        let text = if governs {
                            egui::RichText::new(format!("{}  ◆ governs", row.name)).strong()
                        } else {
                            egui::RichText::new(&row.name)
                        };
                        if ui
                            .selectable_label(row.name == d.name, text)
                            .on_hover_text("Show this one in every view")
                            .clicked()
                            && row.name != d.name
                        {
                            out.push(Command::Edit {
                                edit: Edit::Activate(row.name.clone()),
                                coalesce: None,
                            });
                        }
                        ui.label(if row.combination {
                            "combination"
                        } else {
                            "load case"
                        });
                        // One rule for every ranking's words (study::envelope::standing_text).
                        match row.value {
                            Some(v) => {
                                ui.monospace(value_text(v));
                            }
                            None => {
                                ui.label(crate::study::envelope::standing_text(row.standing()));
                            }
                        }
                        let color = if governs {
                            egui::Color32::from_rgb(200, 70, 50)
                        } else {
                            egui::Color32::from_rgb(90, 130, 190)
                        };
                        super::bar(
                            ui,
                            egui::vec2(120.0, 12.0),
                            row.value.map(|v| v.abs() / largest.max(f64::MIN_POSITIVE)),
                            color,
                            None,
                            None,
                        );
                        if planes {
                            let first = row
                                .planes
                                .first()
                                .map(|p| dip_text(p.dip_deg, p.dip_direction_deg))
                                .unwrap_or_default();
                            let more = row.planes.len().saturating_sub(1);
                            if more > 0 {
                                ui.label(format!("{first} (+{more} equivalent)"));
                            } else {
                                ui.label(first);
                            }
                        }
                        ui.end_row();
                    }
                });
        });
    }
}

static EMPTY: Result<Envelope, String> = Err(String::new());

impl super::Panel for EnvelopePanel {
    fn ui(&mut self, ui: &mut egui::Ui, reads: super::Reads<'_>, writes: &mut super::Writes<'_>) {
        self.show(ui, reads.project, reads.d, writes.settings, writes.commands);
    }
}
