//! A load case's input when it is not six components: in-situ stresses, principal values and
//! axes, a strain rosette or plane stress, typed in a form; the grid below shows the tensor it
//! gives, read-only. The kind can be changed (one undoable step).

use crate::mechanics::inputs::in_plane_principal;
use crate::mechanics::{Component, StressTensor};
use crate::study::{CaseInput, Derived, Edit, FieldKind, InputKind, PlaneStressInput, TypedTensor};
use crate::text::format::readable;
use crate::text::parse;
use crate::window::session::{Coalesce, Command};

/// The form's text.
#[derive(Debug, Default)]
pub struct InputPanel {
    shown: Option<CaseInput>,
    sent: Option<CaseInput>,
    fields: Vec<String>,
    error: Option<String>,
}

impl InputPanel {
    fn refresh(&mut self, input: &CaseInput) {
        if self.shown.as_ref() == Some(input) {
            return;
        }
        let own = self.sent.as_ref() == Some(input)
            && self
                .shown
                .as_ref()
                .is_some_and(|s| s.kind() == input.kind());
        self.shown = Some(input.clone());
        if !own {
            self.fields = input.numbers().iter().map(|v| readable(*v, 10)).collect();
            self.error = None;
        }
    }

    /// Draws the kind selector and, for kinds other than six components, the form.
    fn show(&mut self, ui: &mut egui::Ui, d: &Derived, out: &mut Vec<Command>) {
        let Some(input) = &d.input else {
            return;
        };
        self.refresh(input);
        let kind = input.kind();
        let mut chosen = kind;
        ui.horizontal(|ui| {
            ui.label("given as");
            let response = egui::ComboBox::from_id_salt("input-kind")
                .selected_text(kind.label())
                .show_ui(ui, |ui| {
                    for k in InputKind::ALL {
                        ui.selectable_value(&mut chosen, k, k.label());
                    }
                })
                .response;
            response.widget_info(|| {
                egui::WidgetInfo::labeled(egui::Role::ComboBox, true, "Load case input kind")
            });
            response.on_hover_text(
                "How this load case is given. Changing it replaces the input (six components and plane stress keep the current stresses; undo brings the old input back).",
            );
        });
        if chosen != kind {
            out.push(Command::Edit {
                edit: Edit::SetInput(converted(chosen, &d.tensor, d)),
                coalesce: None,
            });
            return;
        }
        if let CaseInput::TableRow(row) = input {
            ui.label(format!(
                "From the table {}, {} (editing the stress makes it a typed tensor).",
                row.file,
                row.place()
            ));
        }
        if kind == InputKind::Tensor {
            return;
        }
        let (stress_unit, strain_unit, modulus_unit) = input.units();
        let mut changed = false;
        egui::Grid::new("input-fields")
            .num_columns(2)
            .spacing([6.0, 3.0])
            .show(ui, |ui| {
                for (i, (label, what)) in kind.fields().iter().enumerate() {
                    let unit = match what {
                        FieldKind::Stress => stress_unit.clone(),
                        FieldKind::Degrees => "°".to_owned(),
                        FieldKind::Strain => strain_unit.clone(),
                        FieldKind::Modulus => modulus_unit.clone(),
                        FieldKind::Ratio => String::new(),
                    };
                    ui.label(if unit.is_empty() {
                        (*label).to_owned()
                    } else {
                        format!("{label} ({unit})")
                    });
                    if let Some(text) = self.fields.get_mut(i) {
                        changed |= ui
                            .add(
                                egui::TextEdit::singleline(text)
                                    .id_salt(("input-field", i))
                                    .desired_width(90.0),
                            )
                            .on_hover_text(field_tip(kind, label))
                            .changed();
                    }
                    ui.end_row();
                }
            });
        if changed {
            match self.parse(input) {
                Ok(next) => {
                    self.error = None;
                    if &next != input {
                        self.sent = Some(next.clone());
                        out.push(Command::Edit {
                            edit: Edit::SetInput(next),
                            coalesce: Some(Coalesce::InputFields),
                        });
                    }
                }
                Err(e) => self.error = Some(e),
            }
        }
        if let Some(e) = &self.error {
            ui.colored_label(
                ui.visuals().error_fg_color,
                format!("⚠ {e} — the last valid input is kept"),
            );
        }
        derived_lines(ui, input, d);
    }

    fn parse(&self, input: &CaseInput) -> Result<CaseInput, String> {
        let labels = input.kind().fields();
        let mut values = Vec::with_capacity(labels.len());
        for (text, (label, _)) in self.fields.iter().zip(labels) {
            values.push(parse::number(text).map_err(|e| format!("{label}: {e}"))?);
        }
        let next = input.with_numbers(&values);
        next.tensor().map_err(|e| e.to_string())?;
        Ok(next)
    }
}

fn field_tip(kind: InputKind, label: &str) -> String {
    let convention = match kind {
        InputKind::InSitu => "compression positive; x = east, y = north, z = up",
        InputKind::Principal => {
            "s1 ≥ s2 ≥ s3 in the project's convention; trend clockwise from north, plunge down from horizontal; σ2 completes a right-handed set; axes within 0.5° of perpendicular are squared up"
        }
        InputKind::Rosette => {
            "plane stress at a free surface; gauge angles counter-clockwise from x; ε(θ) = εx cos²θ + εy sin²θ + γxy sinθ cosθ"
        }
        InputKind::PlaneStress => "σz = τyz = τzx = 0",
        InputKind::Tensor => "",
    };
    format!("{label} ({convention})")
}

/// What the form gives besides the tensor: rosette strains and principal angles.
fn derived_lines(ui: &mut egui::Ui, input: &CaseInput, d: &Derived) {
    if let Some(r) = input.rosette_result() {
        let micro = |e: f64| format!("{} µε", readable(e * 1e6, 5));
        ui.weak(format!(
            "εx {}, εy {}, γxy {}; ε1 {}, ε2 {}",
            micro(r.strains[0]),
            micro(r.strains[1]),
            micro(r.strains[2]),
            micro(r.principal[0]),
            micro(r.principal[1])
        ));
        ui.weak(match r.angle_deg {
            Some(a) => format!("ε1 at {}° from x (counter-clockwise)", readable(a, 4)),
            None => "ε1 direction undefined: every direction strains alike".to_owned(),
        });
    }
    if matches!(input.kind(), InputKind::Rosette | InputKind::PlaneStress) {
        let c = d.tensor.components_pa();
        let (s1, s2, angle) = in_plane_principal(c[0], c[1], c[3]);
        let shown = |pa: f64| {
            format!(
                "{} {}",
                readable(d.unit.from_pa(d.convention.sign() * pa), 5),
                d.unit
            )
        };
        ui.weak(format!(
            "in-plane principal stresses {} and {}; {}",
            shown(s1),
            shown(s2),
            angle.map_or_else(
                || "direction undefined (equal in every direction)".to_owned(),
                |a| format!(
                    "the larger (tension positive) at {}° from x",
                    readable(a, 4)
                )
            )
        ));
    }
}

/// A new input of `kind` for the current state: six components and plane stress carry the
/// current stresses over (plane stress drops the out-of-plane ones); other kinds start blank.
fn converted(kind: InputKind, tensor: &StressTensor, d: &Derived) -> CaseInput {
    let sign = d.convention.sign();
    let shown = |comp: Component| sign * d.unit.from_pa(tensor.component_pa(comp));
    let compression_positive = sign < 0.0;
    match kind {
        InputKind::Tensor => CaseInput::Tensor(TypedTensor {
            unit: d.unit.symbol().to_owned(),
            compression_positive,
            components: Component::ALL.map(shown),
        }),
        InputKind::PlaneStress => CaseInput::PlaneStress(PlaneStressInput {
            unit: d.unit.symbol().to_owned(),
            compression_positive,
            sx: shown(Component::Xx),
            sy: shown(Component::Yy),
            txy: shown(Component::Xy),
        }),
        other => other.blank(d.unit, compression_positive),
    }
}

impl super::Panel for InputPanel {
    fn ui(&mut self, ui: &mut egui::Ui, reads: super::Reads<'_>, writes: &mut super::Writes<'_>) {
        self.show(ui, reads.d, writes.commands);
    }
}
