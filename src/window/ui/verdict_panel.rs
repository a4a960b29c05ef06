//! The verdict: each criterion passes, fails or is not checked, governing first, with a
//! utilization bar, the factor of safety and the formula in the tooltip; and the material
//! editor whose strengths it uses (an empty field is a strength not given).

use std::fmt::Write as _;

use crate::mechanics::criteria::{Condition, DruckerPragerFit, Outcome, Verdict};
use crate::study::{Derived, Edit, Material};
use crate::text::format::readable;
use crate::text::parse;
use crate::window::session::Command;

/// Colours of the outcomes.
const PASS: egui::Color32 = egui::Color32::from_rgb(60, 150, 80);
const FAIL: egui::Color32 = egui::Color32::from_rgb(200, 60, 50);

/// The verdict section: each criterion governing first, with its bar and numbers.
pub struct VerdictPanel;

impl super::Panel for VerdictPanel {
    fn ui(&mut self, ui: &mut egui::Ui, reads: super::Reads<'_>, writes: &mut super::Writes<'_>) {
        verdict_ui(ui, reads.d, writes.commands);
    }
}

impl super::Panel for MaterialPanel {
    fn ui(&mut self, ui: &mut egui::Ui, reads: super::Reads<'_>, writes: &mut super::Writes<'_>) {
        self.show(ui, &reads.project.material, reads.d, writes.commands);
    }
}

/// Draws the verdict section.
fn verdict_ui(ui: &mut egui::Ui, d: &Derived, out: &mut Vec<Command>) {
    let title = if d.material_name.is_empty() {
        "Verdict".to_owned()
    } else {
        format!("Verdict — {}", d.material_name)
    };
    ui.heading(title).on_hover_text(
        "Proportional loading: the factor of safety is the factor on every stress component that reaches the criterion's surface; utilization = 1 / factor",
    );
    let stress = |v: Option<f64>| {
        v.map(|x| readable(d.unit.from_pa(x), 6))
            .unwrap_or_default()
    };
    let table = crate::output::results::TextTable {
        title: format!("Planewise verdict, {}, proportional loading", d.unit),
        header: [
            "criterion",
            "outcome",
            "demand",
            "strength",
            "unit",
            "utilization",
            "factor of safety",
            "strength-reduction factor",
            "mobilized friction angle (°)",
            "stress judged",
            "note",
        ]
        .map(str::to_owned)
        .to_vec(),
        rows: d
            .verdicts
            .iter()
            .map(|v| {
                vec![
                    v.criterion.label().to_owned(),
                    match v.outcome() {
                        Outcome::Passes => "passes",
                        Outcome::Fails => "fails",
                        Outcome::NotChecked => "not checked",
                    }
                    .to_owned(),
                    stress(v.governing_stress_pa),
                    stress(v.strength_pa),
                    d.unit.to_string(),
                    v.utilization.map(|u| readable(u, 6)).unwrap_or_default(),
                    v.factor_of_safety
                        .map(|f| readable(f, 6))
                        .unwrap_or_default(),
                    v.reduction
                        .and_then(|r| r.factor)
                        .map(|f| readable(f, 6))
                        .unwrap_or_default(),
                    v.reduction
                        .and_then(|r| r.mobilized_friction_deg)
                        .map(|f| readable(f, 6))
                        .unwrap_or_default(),
                    if v.condition == Condition::NotChecked {
                        String::new()
                    } else {
                        v.basis.text(d.unit)
                    },
                    v.note.clone(),
                ]
            })
            .collect(),
    };
    super::copy_as_ui(ui, out, |f| Command::CopyTable(table.clone(), f));
    for v in &d.verdicts {
        verdict_row(ui, v, d);
    }
    if d.verdicts
        .iter()
        .all(|v| v.outcome() == Outcome::NotChecked)
    {
        ui.weak("No strengths given: enter the material below to check the criteria.");
    }
}

fn verdict_row(ui: &mut egui::Ui, v: &Verdict, d: &Derived) {
    let (mark, color, word) = match v.outcome() {
        Outcome::Passes => ("✔", PASS, "passes"),
        Outcome::Fails => ("✖", FAIL, "fails"),
        Outcome::NotChecked => ("–", ui.visuals().weak_text_color(), "not checked"),
    };
    let numbers = match (v.condition, v.utilization, v.factor_of_safety) {
        (Condition::Defined, Some(u), Some(f)) => {
            format!("U {} · factor of safety {}", readable(u, 3), readable(f, 3))
        }
        (Condition::Defined, Some(u), None) => format!("U {} · no stress to scale", readable(u, 3)),
        (Condition::NeverReaches, ..) => "never reaches the surface when scaled".to_owned(),
        (Condition::FailsAtAnyScale, ..) => "outside at any scale (zero strength)".to_owned(),
        _ => format!("needs the {}", v.criterion.needs()),
    };
    let stress = |pa: f64| format!("{} {}", readable(d.unit.from_pa(pa), 5), d.unit);
    let mut tip = format!("{}\n{}", v.criterion.label(), v.criterion.formula());
    if let (Some(g), Some(s)) = (v.governing_stress_pa, v.strength_pa) {
        let _ = write!(tip, "\ndemand {} vs strength {}", stress(g), stress(s));
    }
    if !v.note.is_empty() {
        tip.push('\n');
        tip.push_str(&v.note);
    }
    if v.condition != Condition::NotChecked {
        let _ = write!(tip, "\non {}", v.basis.text(d.unit));
    }
    let _ = write!(
        tip,
        "\n{}",
        crate::mechanics::criteria::definitions::PROPORTIONAL
    );
    let reduction = v
        .reduction
        .map(|r| match (r.factor, r.mobilized_friction_deg) {
            (Some(f), Some(phi)) => format!(
                "strength reduction F {} · mobilized φ {}°",
                readable(f, 3),
                readable(phi, 3)
            ),
            _ => format!(
                "strength reduction: {}",
                crate::study::envelope::reduction_text(r.condition)
            ),
        });
    if reduction.is_some() {
        let _ = write!(
            tip,
            "\n{}\n{}",
            crate::mechanics::criteria::definitions::REDUCTION,
            crate::mechanics::criteria::definitions::MOBILIZED
        );
    }
    // Wrapped, not cut: "Rankine (max principal stress)" is long for a narrow panel.
    ui.horizontal_wrapped(|ui| {
        ui.colored_label(color, format!("{mark} {word}"))
            .on_hover_text(&tip);
        ui.add(egui::Label::new(v.criterion.label()).wrap())
            .on_hover_text(&tip);
    });
    // Wrapped too: the numbers go under the bar when the panel is narrow.
    ui.horizontal_wrapped(|ui| {
        if v.outcome() != Outcome::NotChecked {
            // Full width at U = 1.5, a tick at U = 1.
            super::bar(
                ui,
                egui::vec2(90.0, 10.0),
                v.utilization.map(|u| u / 1.5),
                color,
                Some(1.0 / 1.5),
                Some("U = 1"),
            );
        }
        ui.add(egui::Label::new(numbers).wrap()).on_hover_text(&tip);
    });
    if let Some(text) = reduction {
        ui.add(egui::Label::new(text).wrap()).on_hover_text(&tip);
    }
    if matches!(
        v.basis,
        crate::mechanics::criteria::StressBasis::Effective { .. }
    ) {
        ui.label(format!("on {}", v.basis.text(d.unit)))
            .on_hover_text(&tip);
    }
}

/// The material editor's text fields.
#[derive(Debug, Default)]
pub struct MaterialPanel {
    shown: Option<(Material, crate::mechanics::StressUnit)>,
    /// The material this panel last sent (its own edits do not rewrite the text being typed).
    sent: Option<Material>,
    name: String,
    fields: [String; 5],
    error: Option<String>,
}

/// Field names, in the order of [`MaterialPanel::fields`].
/// Short labels (the symbol first, so the field fits beside it in a narrow panel) and what
/// each strength is and serves, for the tooltip.
const FIELDS: [(&str, &str); 5] = [
    ("f_y yield", "yield strength; von Mises and Tresca"),
    (
        "f_t tensile",
        "tensile strength; Rankine, a positive number",
    ),
    (
        "f_c compressive",
        "compressive strength; Rankine, a positive number",
    ),
    (
        "c cohesion",
        "cohesion; Mohr–Coulomb and Drucker–Prager, with φ",
    ),
    (
        "φ friction angle",
        "friction angle in degrees; Mohr–Coulomb and Drucker–Prager, with c",
    ),
];

impl MaterialPanel {
    fn refresh(&mut self, m: &Material, unit: crate::mechanics::StressUnit) {
        if self.shown.as_ref() == Some(&(m.clone(), unit)) {
            return;
        }
        let own =
            self.sent.as_ref() == Some(m) && self.shown.as_ref().is_some_and(|(_, u)| *u == unit);
        self.shown = Some((m.clone(), unit));
        if own {
            return;
        }
        let s = &m.strengths;
        let stress = |v: Option<f64>| v.map(|x| readable(unit.from_pa(x), 8)).unwrap_or_default();
        self.name.clone_from(&m.name);
        self.fields = [
            stress(s.yield_strength_pa),
            stress(s.tensile_strength_pa),
            stress(s.compressive_strength_pa),
            stress(s.cohesion_pa),
            s.friction_angle_deg
                .map(|v| readable(v, 8))
                .unwrap_or_default(),
        ];
        self.error = None;
    }

    /// Draws the editor; a valid change becomes one undoable edit.
    fn show(
        &mut self,
        ui: &mut egui::Ui,
        material: &Material,
        d: &Derived,
        out: &mut Vec<Command>,
    ) {
        self.refresh(material, d.unit);
        let mut changed = false;
        // The name on a row of its own, as wide as the panel: names are long.
        ui.horizontal(|ui| {
            ui.label("name");
            changed |= ui
                .add(
                    egui::TextEdit::singleline(&mut self.name)
                        .id_salt("material-name")
                        .desired_width((ui.available_width() - 4.0).max(80.0)),
                )
                .on_hover_text("Material name (shown in the verdict)")
                .changed();
        });
        egui::Grid::new("material-fields")
            .num_columns(2)
            .spacing([6.0, 4.0])
            .show(ui, |ui| {
                for (i, (name, tip)) in FIELDS.iter().enumerate() {
                    let suffix = if i == 4 {
                        "°".to_owned()
                    } else {
                        d.unit.to_string()
                    };
                    ui.label(format!("{name} ({suffix})"));
                    changed |= ui
                        .add(
                            // Fixed ids: the verdict above changes its rows while typing, and
                            // automatic ids would move and drop the keyboard focus.
                            egui::TextEdit::singleline(&mut self.fields[i])
                                .id_salt(("material-field", i))
                                .desired_width(ui.available_width().clamp(48.0, 80.0))
                                .hint_text("none"),
                        )
                        .on_hover_text(format!("{name}: {tip}; leave empty if not known"))
                        .changed();
                    ui.end_row();
                }
            });
        let mut fit = material.strengths.dp_fit;
        ui.horizontal_wrapped(|ui| {
            ui.label("Drucker–Prager fit");
            let response = egui::ComboBox::from_id_salt("dp-fit")
                .selected_text(fit.key())
                .show_ui(ui, |ui| {
                    for f in DruckerPragerFit::ALL {
                        ui.selectable_value(&mut fit, f, f.key())
                            .on_hover_text(f.label());
                    }
                })
                .response;
            response.widget_info(|| {
                egui::WidgetInfo::labeled(egui::Role::ComboBox, true, "Drucker–Prager fit")
            });
            response.on_hover_text(fit.label());
        });
        changed |= fit != material.strengths.dp_fit;
        if let Some(e) = &self.error {
            ui.colored_label(
                ui.visuals().error_fg_color,
                format!("⚠ {e} — the last valid material is kept"),
            );
        }
        if changed {
            match self.parse(material, fit, d.unit) {
                Ok(m) => {
                    self.error = None;
                    if &m != material {
                        self.sent = Some(m.clone());
                        out.push(Command::Edit {
                            edit: Edit::SetMaterial(Box::new(m)),
                            coalesce: Some(crate::window::session::Coalesce::MaterialFields),
                        });
                    }
                }
                Err(e) => self.error = Some(e),
            }
        }
    }

    fn parse(
        &self,
        material: &Material,
        fit: DruckerPragerFit,
        unit: crate::mechanics::StressUnit,
    ) -> Result<Material, String> {
        let value = |i: usize| -> Result<Option<f64>, String> {
            let text = self.fields[i].trim();
            if text.is_empty() {
                return Ok(None);
            }
            parse::number(text)
                .map(Some)
                .map_err(|e| format!("{}: {e}", FIELDS[i].0))
        };
        let stress = |i: usize| value(i).map(|v| v.map(|x| unit.to_pa(x)));
        let mut m = material.clone();
        self.name.trim().clone_into(&mut m.name);
        m.strengths.yield_strength_pa = stress(0)?;
        m.strengths.tensile_strength_pa = stress(1)?;
        m.strengths.compressive_strength_pa = stress(2)?;
        m.strengths.cohesion_pa = stress(3)?;
        m.strengths.friction_angle_deg = value(4)?;
        m.strengths.dp_fit = fit;
        m.strengths.validate().map_err(|e| e.to_string())?;
        Ok(m)
    }
}
