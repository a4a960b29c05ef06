//! The cut-plane panel: the normal as a vector, as two angles, or as dip / dip direction, and
//! buttons for the cube faces, principal planes and maximum-shear planes.

use nalgebra::Vector3;

use crate::mechanics::{Analysis, PlaneNormal, SignConvention};
use crate::study::{Derived, Edit};
use crate::text::format::readable;
use crate::text::parse;
use crate::window::session::{Coalesce, Command};

/// Plane entry state.
#[derive(Debug, Default)]
pub struct PlanePanel {
    vector: [String; 3],
    dip: String,
    dip_direction: String,
    /// The plane the texts were made from.
    shown: Option<PlaneNormal>,
    vector_error: Option<String>,
    dip_error: Option<String>,
}

impl PlanePanel {
    /// Show the document's plane again, dropping edits in progress.
    pub fn reset(&mut self) {
        self.shown = None;
        self.vector_error = None;
        self.dip_error = None;
    }

    fn refresh(&mut self, ui: &egui::Ui, ids: &[egui::Id; 5], plane: PlaneNormal) {
        if self.shown == Some(plane) {
            return;
        }
        let force = self.shown.is_none();
        self.shown = Some(plane);
        let focused = |id: egui::Id| !force && ui.memory(|m| m.has_focus(id));
        let v = plane.vector();
        if !(ids[..3].iter().any(|id| focused(*id)) || (!force && self.vector_error.is_some())) {
            self.vector = [readable(v.x, 6), readable(v.y, 6), readable(v.z, 6)];
        }
        let (dip, dd) = plane.dip_deg();
        if !(focused(ids[3]) || focused(ids[4]) || (!force && self.dip_error.is_some())) {
            self.dip = readable(dip, 6);
            self.dip_direction = readable(dd, 6);
        }
    }

    /// Draws the panel.
    fn show(&mut self, ui: &mut egui::Ui, d: &Derived, out: &mut Vec<Command>) {
        ui.heading("Cut plane");
        let ids: [egui::Id; 5] = std::array::from_fn(|i| egui::Id::unique(("plane-field", i)));
        self.refresh(ui, &ids, d.plane);
        let set = |plane: PlaneNormal, coalesce: Option<Coalesce>, out: &mut Vec<Command>| {
            out.push(Command::Edit {
                edit: Edit::SetPlane(plane),
                coalesce,
            });
        };

        ui.label("Normal vector (normalised for you)");
        let mut changed = false;
        ui.horizontal(|ui| {
            for (i, name) in ["nx", "ny", "nz"].iter().enumerate() {
                let edit = egui::TextEdit::singleline(&mut self.vector[i])
                    .id(ids[i])
                    .hint_text(*name)
                    .desired_width(80.0);
                changed |= ui
                    .add(edit)
                    .on_hover_text(format!("{name}: component of the plane's normal"))
                    .changed();
            }
        });
        if changed {
            let parsed: Result<Vec<f64>, _> =
                self.vector.iter().map(|t| parse::number(t)).collect();
            match parsed {
                Ok(v) => match PlaneNormal::from_vector(Vector3::new(v[0], v[1], v[2])) {
                    Ok(plane) => {
                        self.vector_error = None;
                        set(plane, Some(Coalesce::PlaneVector), out);
                    }
                    Err(e) => self.vector_error = Some(e.to_string()),
                },
                Err(e) => self.vector_error = Some(format!("a component {e}")),
            }
        }
        if let Some(e) = &self.vector_error {
            ui.colored_label(
                ui.visuals().error_fg_color,
                format!("⚠ normal: {e} — plane unchanged"),
            );
        }

        ui.label("Angles of the normal");
        let (mut polar, mut azimuth) = d.plane.spherical_deg();
        let polar_changed = ui
            .add(
                egui::Slider::new(&mut polar, 0.0..=180.0)
                    .suffix("°")
                    .text("θ from +z"),
            )
            .on_hover_text("n = (sin θ cos φ, sin θ sin φ, cos θ)")
            .changed();
        let azimuth_changed = ui
            .add(
                egui::Slider::new(&mut azimuth, 0.0..=360.0)
                    .suffix("°")
                    .text("φ from +x"),
            )
            .on_hover_text("n = (sin θ cos φ, sin θ sin φ, cos θ)")
            .changed();
        if (polar_changed || azimuth_changed)
            && let Ok(plane) = PlaneNormal::from_spherical(polar, azimuth)
        {
            set(plane, Some(Coalesce::PlaneAngles), out);
        }

        ui.label("Dip / dip direction");
        ui.weak("x = east, y = north, z = up");
        let mut dip_changed = false;
        ui.horizontal(|ui| {
            let edit = egui::TextEdit::singleline(&mut self.dip)
                .id(ids[3])
                .hint_text("dip °")
                .desired_width(70.0);
            dip_changed |= ui
                .add(edit)
                .on_hover_text("Dip, 0° (horizontal) to 90° (vertical)")
                .changed();
            let edit = egui::TextEdit::singleline(&mut self.dip_direction)
                .id(ids[4])
                .hint_text("dip direction °")
                .desired_width(70.0);
            dip_changed |= ui
                .add(edit)
                .on_hover_text(
                    "Dip direction, clockwise from north; n = (sin δ sin α, sin δ cos α, cos δ)",
                )
                .changed();
        });
        if dip_changed {
            let plane = parse::number(&self.dip)
                .map_err(|e| format!("dip {e}"))
                .and_then(|d| {
                    parse::number(&self.dip_direction)
                        .map(|a| (d, a))
                        .map_err(|e| format!("dip direction {e}"))
                })
                .and_then(|(d, a)| PlaneNormal::from_dip(d, a).map_err(|e| e.to_string()));
            match plane {
                Ok(plane) => {
                    self.dip_error = None;
                    set(plane, Some(Coalesce::PlaneDip), out);
                }
                Err(e) => self.dip_error = Some(e),
            }
        }
        if let Some(e) = &self.dip_error {
            ui.colored_label(
                ui.visuals().error_fg_color,
                format!("⚠ {e} — plane unchanged"),
            );
        }

        ui.label("Set the plane to");
        ui.horizontal_wrapped(|ui| {
            let faces = [
                ("+x face", Vector3::x()),
                ("−x face", -Vector3::x()),
                ("+y face", Vector3::y()),
                ("−y face", -Vector3::y()),
                ("+z face", Vector3::z()),
                ("−z face", -Vector3::z()),
            ];
            for (name, v) in faces {
                if ui.small_button(name).clicked()
                    && let Ok(plane) = PlaneNormal::from_vector(v)
                {
                    set(plane, None, out);
                    self.reset();
                }
            }
        });
        let a = Analysis::new(&d.tensor, SignConvention::TensionPositive);
        let shown = &d.analysis;
        ui.horizontal_wrapped(|ui| {
            for (i, n) in shown.principal.directions.iter().enumerate() {
                let label = format!("σ{} plane", i + 1);
                if ui
                    .small_button(&label)
                    .on_hover_text(format!("Normal n{} (principal direction)", i + 1))
                    .clicked()
                    && let Ok(plane) = PlaneNormal::from_vector(*n)
                {
                    set(plane, None, out);
                    self.reset();
                }
            }
            for (i, n) in a.max_shear_normals.iter().enumerate() {
                let label = format!("max shear {}", if i == 0 { "A" } else { "B" });
                let tip = if i == 0 {
                    "Normal (n1 + n3)/√2"
                } else {
                    "Normal (n1 − n3)/√2"
                };
                if ui.small_button(&label).on_hover_text(tip).clicked()
                    && let Ok(plane) = PlaneNormal::from_vector(*n)
                {
                    set(plane, None, out);
                    self.reset();
                }
            }
        });
    }
}

impl super::Panel for PlanePanel {
    fn ui(&mut self, ui: &mut egui::Ui, reads: super::Reads<'_>, writes: &mut super::Writes<'_>) {
        self.show(ui, reads.d, writes.commands);
    }
}
