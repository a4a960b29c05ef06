//! The Mohr circles tab: the three circles with the admissible region, the cut plane's and the
//! worst planes' points and, on request, the Mohr–Coulomb envelope. Hovering a point names its
//! plane; clicking or dragging inside the shaded region moves the cut plane to a plane with
//! that (σn, τ).

use crate::mechanics::search::Measure;
use crate::picture::draw::mohr::{MohrFigure, MohrLayout, MohrPoint, mohr_frame};
use crate::picture::draw::{Sizes, egui_backend};
use crate::picture::figures::FigureInput;
use crate::study::annotations::{Annotation, FigureKind, Pin};
use crate::study::{Derived, Edit};
use crate::text::format::readable;
use crate::window::session::{Coalesce, Command, Settings};

use super::notes_panel;

/// The figure for the current state, as the tab and its export show it.
#[must_use]
pub fn figure(d: &Derived, settings: &Settings) -> MohrFigure {
    crate::picture::figures::mohr_figure(&FigureInput::from_derived(d, settings.mohr_envelope))
}

/// The point of `figure` within `radius_px` of `at` (the cut plane first), if any.
#[must_use]
pub fn point_near<'a>(
    figure: &'a MohrFigure,
    layout: &MohrLayout,
    at: [f32; 2],
    radius_px: f32,
) -> Option<&'a MohrPoint> {
    figure.plane.iter().chain(&figure.worst).find(|p| {
        let q = layout.to_px(p.normal_stress_pa, p.shear_stress_pa);
        (q[0] - at[0]).hypot(q[1] - at[1]) <= radius_px
    })
}

/// The Mohr-circles tab.
pub struct MohrPanel;

impl super::Panel for MohrPanel {
    fn ui(&mut self, ui: &mut egui::Ui, reads: super::Reads<'_>, writes: &mut super::Writes<'_>) {
        mohr_ui(
            ui,
            reads.d,
            &reads.project.annotations,
            writes.settings,
            writes.commands,
        );
    }
}

/// The Mohr tab.
fn mohr_ui(
    ui: &mut egui::Ui,
    d: &Derived,
    notes: &[Annotation],
    settings: &mut Settings,
    out: &mut Vec<Command>,
) {
    ui.horizontal_wrapped(|ui| {
        ui.checkbox(&mut settings.mohr_envelope, "Mohr–Coulomb envelope")
            .on_hover_text(
                "Draw τ = c + (σn − p) tan φ (compression positive); always drawn when the worst-plane measure is mohr-coulomb",
            );
        if settings.mohr_envelope || d.measure.measure == Measure::MohrCoulomb {
            let mut edited = d.measure;
            super::map_panel::material_ui(ui, &mut edited, d.unit, true, true);
            if edited != d.measure {
                out.push(Command::Edit {
                    edit: Edit::SetMeasure(edited),
                    coalesce: Some(Coalesce::MeasureFields),
                });
            }
        }
    });
    notes_panel::notes_bar(ui, &d.name, FigureKind::Mohr, notes, out);
    let figure = figure(d, settings);
    let size = (ui.available_size() - egui::vec2(0.0, super::readout_height(ui)))
        .max(egui::vec2(240.0, 180.0));
    let (rect, response) = ui.allocate_exact_size(size, egui::Sense::click_and_drag());
    let frame = mohr_frame(
        &figure,
        rect.width() as u32,
        rect.height() as u32,
        Sizes::default(),
    );
    ui.painter_at(rect)
        .extend(egui_backend::shapes(&frame, rect, ui.ctx()));
    let layout = MohrLayout::new(
        &figure,
        rect.width().floor(),
        rect.height().floor(),
        Sizes::default(),
    );
    let local = |pos: egui::Pos2| [pos.x - rect.min.x, pos.y - rect.min.y];
    let unit = d.unit;
    let stress = |pa: f64| format!("{} {unit}", readable(unit.from_pa(pa), 5));

    let hover = response.hover_pos().map(local);
    let text = match hover {
        Some(at) => {
            if let Some(p) = point_near(&figure, &layout, at, 9.0) {
                format!(
                    "{}; σn = {}, τ = {}",
                    p.name,
                    stress(p.normal_stress_pa),
                    stress(p.shear_stress_pa)
                )
            } else {
                let (sn, tau) = layout.from_px(at);
                if layout.contains(at) && figure.circles.is_admissible(sn, tau, 1e-9) {
                    format!(
                        "σn = {}, τ = {}: click or drag to put the cut plane here",
                        stress(sn),
                        stress(tau)
                    )
                } else {
                    format!(
                        "σn = {}, τ = {}: no plane has this point (outside the shaded region)",
                        stress(sn),
                        stress(tau)
                    )
                }
            }
        }
        None => "Mohr circles: hover a point to name its plane; click or drag in the shaded region to move the cut plane.".to_owned(),
    };
    // Under the picture, not a tooltip over the tools above it.
    let response = super::readout(ui, response, "Mohr circles picture", &text);

    // Notes: pinned at (σn, τ) tension positive, drawn in the shown convention.
    let sign = d.convention.sign();
    let shown = notes_panel::on_screen(&d.name, FigureKind::Mohr, notes, |pin| match pin {
        Pin::Mohr {
            normal_stress_pa,
            shear_stress_pa,
        } => Some(layout.to_px(sign * normal_stress_pa, *shear_stress_pa)),
        _ => None,
    });
    let pin_at = |at: [f32; 2]| {
        layout.contains(at).then(|| {
            let (sn, tau) = layout.from_px(at);
            Pin::Mohr {
                normal_stress_pa: sign * sn,
                shear_stress_pa: tau.max(0.0),
            }
        })
    };
    if notes_panel::handle_pointer(
        ui,
        &response,
        rect,
        &d.name,
        FigureKind::Mohr,
        notes,
        &shown,
        Sizes::default().text,
        pin_at,
        out,
    ) {
        return;
    }

    let dragging = response.dragged_by(egui::PointerButton::Primary)
        && response.drag_delta() != egui::Vec2::ZERO;
    let serial = super::drag_serial(ui, &response);
    if (response.clicked() || dragging)
        && let Some(at) = response.interact_pointer_pos().map(local)
    {
        let (sn, tau) = layout.from_px(at);
        if let Some(plane) = figure.circles.plane_at(sn, tau.max(0.0), d.plane) {
            // One undo step per drag; a click is a step of its own.
            let coalesce = dragging.then_some(Coalesce::MohrDrag(serial));
            out.push(Command::Edit {
                edit: Edit::SetPlane(plane),
                coalesce,
            });
        }
    }
}
