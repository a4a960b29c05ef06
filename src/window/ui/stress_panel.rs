//! The stress-state panel: the 3×3 grid, unit, sign convention, presets and paste.

use crate::mechanics::{Component, SignConvention, StressTensor, StressUnit};
use crate::study::{Derived, Edit};
use crate::text::format::readable;
use crate::text::parse;
use crate::window::session::{Coalesce, Command};

/// Grid editing state: the text in each cell and what is wrong with it.
#[derive(Debug, Default)]
pub struct StressPanel {
    cells: [[String; 3]; 3],
    errors: [[Option<String>; 3]; 3],
    /// What the cell texts were made from; when the state differs, cells are refreshed.
    shown: Option<(StressTensor, StressUnit, SignConvention)>,
    paste: String,
    paste_error: Option<String>,
}

const AXES: [&str; 3] = ["x", "y", "z"];

/// The name of a cell, e.g. σxy.
#[must_use]
pub fn cell_name(row: usize, col: usize) -> String {
    format!("σ{}{}", AXES[row], AXES[col])
}

/// Presets, with magnitudes of 100 in the display unit.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Preset {
    /// σxx = 100.
    UniaxialTension,
    /// σxx = −100.
    UniaxialCompression,
    /// σxx = σyy = 100.
    EquibiaxialTension,
    /// σxy = 100.
    PureShear,
    /// σxx = σyy = σzz = −100.
    Hydrostatic,
}

impl Preset {
    /// All presets, in button order.
    pub const ALL: [Self; 5] = [
        Self::UniaxialTension,
        Self::UniaxialCompression,
        Self::EquibiaxialTension,
        Self::PureShear,
        Self::Hydrostatic,
    ];

    /// Button text.
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            Self::UniaxialTension => "Uniaxial tension",
            Self::UniaxialCompression => "Uniaxial compression",
            Self::EquibiaxialTension => "Equibiaxial tension",
            Self::PureShear => "Pure shear",
            Self::Hydrostatic => "Hydrostatic compression",
        }
    }

    /// Components xx … zx, tension positive, in units of the display unit.
    #[must_use]
    pub fn components(self) -> [f64; 6] {
        match self {
            Self::UniaxialTension => [100.0, 0.0, 0.0, 0.0, 0.0, 0.0],
            Self::UniaxialCompression => [-100.0, 0.0, 0.0, 0.0, 0.0, 0.0],
            Self::EquibiaxialTension => [100.0, 100.0, 0.0, 0.0, 0.0, 0.0],
            Self::PureShear => [0.0, 0.0, 0.0, 100.0, 0.0, 0.0],
            Self::Hydrostatic => [-100.0, -100.0, -100.0, 0.0, 0.0, 0.0],
        }
    }
}

impl StressPanel {
    /// Forget edits in progress and show the document again.
    pub fn reset(&mut self) {
        self.shown = None;
        self.errors = Default::default();
    }

    /// The first cell error, as "σxy: 'abc' is not a number".
    #[must_use]
    pub fn first_error(&self) -> Option<String> {
        for r in 0..3 {
            for c in 0..3 {
                if let Some(e) = &self.errors[r][c] {
                    return Some(format!("{}: {e}", cell_name(r, c)));
                }
            }
        }
        None
    }

    fn refresh(&mut self, ui: &egui::Ui, ids: &[[egui::Id; 3]; 3], d: &Derived) {
        let key = (d.tensor, d.unit, d.convention);
        let force = self.shown.is_none();
        if self.shown == Some(key) {
            return;
        }
        self.shown = Some(key);
        let sign = d.convention.sign();
        for r in 0..3 {
            for c in 0..3 {
                let focused = ui.memory(|m| m.has_focus(ids[r][c]));
                if !force && (focused || self.errors[r][c].is_some()) {
                    continue;
                }
                let Some(comp) = Component::at(r, c) else {
                    continue;
                };
                let value = sign * d.unit.from_pa(d.tensor.component_pa(comp));
                self.cells[r][c] = readable(value, 8);
                self.errors[r][c] = None;
            }
        }
    }

    /// Draws the panel.
    fn show(&mut self, ui: &mut egui::Ui, d: &Derived, out: &mut Vec<Command>) {
        ui.heading("Stress state");
        ui.horizontal(|ui| {
            ui.label("Unit");
            let mut unit = d.unit;
            egui::ComboBox::from_id_salt("unit")
                .selected_text(unit.symbol())
                .show_ui(ui, |ui| {
                    for u in StressUnit::ALL {
                        let text = if u == StressUnit::MPa {
                            "MPa (= N/mm²)"
                        } else {
                            u.symbol()
                        };
                        ui.selectable_value(&mut unit, u, text);
                    }
                })
                .response
                .on_hover_text("Changes the numbers shown, not the physical state");
            if unit != d.unit {
                out.push(Command::Edit {
                    edit: Edit::SetUnit(unit),
                    coalesce: None,
                });
            }
        });
        ui.horizontal(|ui| {
            let mut conv = d.convention;
            ui.radio_value(&mut conv, SignConvention::TensionPositive, "tension +")
                .on_hover_text("Tension positive (solid mechanics, finite-element output)");
            ui.radio_value(
                &mut conv,
                SignConvention::CompressionPositive,
                "compression +",
            )
            .on_hover_text("Compression positive (geomechanics): σ1 is the most compressive");
            if conv != d.convention {
                out.push(Command::Edit {
                    edit: Edit::SetConvention(conv),
                    coalesce: None,
                });
            }
        });

        let ids: [[egui::Id; 3]; 3] = std::array::from_fn(|r| {
            std::array::from_fn(|c| egui::Id::unique(("stress-cell", r, c)))
        });
        self.refresh(ui, &ids, d);
        if d.combination {
            ui.label(format!(
                "'{}' is a combination: its tensor is the factored sum of its load cases, shown here read-only.",
                d.name
            ));
        }
        let derived_input = d
            .input
            .as_ref()
            .filter(|i| i.kind() != crate::study::InputKind::Tensor);
        if let Some(input) = derived_input {
            ui.label(format!(
                "Given as {}: the grid shows the tensor it gives, read-only.",
                input.kind().label()
            ));
        }
        ui.add_enabled_ui(!d.combination && derived_input.is_none(), |ui| {
            self.grid_ui(ui, &ids, d, out);
        });
        if derived_input.is_some() {
            return;
        }
        if d.combination {
            if ui
                .button("Make a load case from it")
                .on_hover_text("Adds a load case holding this combination's summed tensor, to edit")
                .clicked()
            {
                out.push(Command::Edit {
                    edit: Edit::CaseFromActive,
                    coalesce: None,
                });
            }
            return;
        }
        if d.tensor.components_pa() == [0.0; 6] {
            ui.colored_label(
                ui.visuals().warn_fg_color,
                "This load case is all zeros, so the cube carries nothing yet: type its components in the grid, paste six numbers below, or start from a preset.",
            );
        }
        // Each cell that does not read, with the value analysed in its place.
        for r in 0..3 {
            for c in 0..3 {
                let (Some(e), Some(comp)) = (&self.errors[r][c], Component::at(r, c)) else {
                    continue;
                };
                let used = d.convention.sign() * d.unit.from_pa(d.tensor.component_pa(comp));
                let name = cell_name(r, c);
                ui.colored_label(
                    ui.visuals().error_fg_color,
                    format!(
                        "⚠ {name}: {e}; analysed with the last valid value, {name} = {} {}",
                        readable(used, 8),
                        d.unit
                    ),
                );
            }
        }
        ui.label(format!(
            "σij in {} ({}); off-diagonal cells edit their mirror too.",
            d.unit,
            d.convention.key()
        ));

        ui.horizontal_wrapped(|ui| {
            for preset in Preset::ALL {
                if ui.small_button(preset.label()).clicked() {
                    // Presets are tension positive; typed in the shown convention.
                    let sign = d.convention.sign();
                    let components = preset.components().map(|v| sign * v);
                    if StressTensor::from_components(components, d.unit, sign).is_ok() {
                        out.push(Command::Edit {
                            edit: Edit::SetComponents(components),
                            coalesce: None,
                        });
                        self.reset();
                    }
                }
            }
        });

        ui.horizontal(|ui| {
            let edit = egui::TextEdit::singleline(&mut self.paste)
                .hint_text("Paste six numbers: xx yy zz xy yz zx")
                .desired_width(210.0);
            let response = ui.add(edit).on_hover_text(
                "Paste six numbers in the order xx yy zz xy yz zx, then press Enter or Fill grid",
            );
            let enter = response.lost_focus() && ui.input(|i| i.key_pressed(egui::Key::Enter));
            if ui
                .button("Fill grid")
                .on_hover_text("Separated by spaces, tabs, commas or semicolons")
                .clicked()
                || enter
            {
                self.fill_from_paste(d, out);
            }
        });
        if let Some(e) = &self.paste_error {
            ui.colored_label(ui.visuals().error_fg_color, format!("⚠ pasted text: {e}"));
        }
    }

    /// The 3×3 grid of cells.
    fn grid_ui(
        &mut self,
        ui: &mut egui::Ui,
        ids: &[[egui::Id; 3]; 3],
        d: &Derived,
        out: &mut Vec<Command>,
    ) {
        // Three cells and the row names fit the panel: narrower cells in a narrow panel.
        let width = ((ui.available_width() - 24.0) / 3.0 - 8.0).clamp(44.0, 78.0);
        egui::Grid::new("stress-grid")
            .spacing([6.0, 4.0])
            .show(ui, |ui| {
                ui.label("");
                for a in AXES {
                    ui.label(a);
                }
                ui.end_row();
                for r in 0..3 {
                    ui.label(AXES[r]);
                    for c in 0..3 {
                        self.cell_ui(ui, width, ids[r][c], r, c, d, out);
                    }
                    ui.end_row();
                }
            });
    }

    fn fill_from_paste(&mut self, d: &Derived, out: &mut Vec<Command>) {
        match parse::numbers::<6>(&self.paste) {
            Ok(values) => {
                match StressTensor::from_components(values, d.unit, d.convention.sign()) {
                    Ok(_) => {
                        out.push(Command::Edit {
                            edit: Edit::SetComponents(values),
                            coalesce: None,
                        });
                        self.paste_error = None;
                        self.paste.clear();
                        self.reset();
                    }
                    Err(e) => self.paste_error = Some(e.to_string()),
                }
            }
            Err(e) => self.paste_error = Some(e.to_string()),
        }
    }

    #[expect(
        clippy::too_many_arguments,
        reason = "one cell's context, passed through"
    )]
    fn cell_ui(
        &mut self,
        ui: &mut egui::Ui,
        width: f32,
        id: egui::Id,
        r: usize,
        c: usize,
        d: &Derived,
        out: &mut Vec<Command>,
    ) {
        let name = cell_name(r, c);
        let error = self.errors[r][c].clone();
        let mut edit = egui::TextEdit::singleline(&mut self.cells[r][c])
            .id(id)
            .hint_text(name.clone())
            .desired_width(width)
            .min_size(egui::vec2(width, 0.0));
        if error.is_some() {
            edit = edit.background_color(ui.visuals().error_fg_color.gamma_multiply(0.25));
        }
        let response = ui.add(edit);
        let tip = match &error {
            Some(e) => format!("{name}: {e}"),
            None => format!(
                "{name} in {}; σ{}{} = σ{}{}",
                d.unit, AXES[r], AXES[c], AXES[c], AXES[r]
            ),
        };
        let response = response.on_hover_text(tip);
        if !response.changed() {
            return;
        }
        let Some(comp) = Component::at(r, c) else {
            return;
        };
        let (mr, mc) = (c, r);
        match parse::cell_number(&self.cells[r][c]) {
            Ok(value) => {
                let pa = d.convention.sign() * d.unit.to_pa(value);
                match d.tensor.with_component_pa(comp, pa) {
                    Ok(_) => {
                        self.errors[r][c] = None;
                        self.errors[mr][mc] = None;
                        let (ur, uc) = comp.index();
                        out.push(Command::Edit {
                            edit: Edit::SetComponent(comp, value),
                            coalesce: Some(Coalesce::Cell(ur, uc)),
                        });
                    }
                    Err(e) => self.errors[r][c] = Some(e.to_string()),
                }
            }
            Err(e) => self.errors[r][c] = Some(e.to_string()),
        }
    }
}

impl super::Panel for StressPanel {
    fn ui(&mut self, ui: &mut egui::Ui, reads: super::Reads<'_>, writes: &mut super::Writes<'_>) {
        self.show(ui, reads.d, writes.commands);
    }
}
