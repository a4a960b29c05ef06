//! The orientation map tab and the worst-plane controls: every plane's pole on the equal-area
//! net coloured by the chosen measure; hover names the plane and its value; a click sets the cut
//! plane.

use crate::mechanics::PlaneNormal;
use crate::mechanics::search::{Measure, WorstCondition};
use crate::mechanics::stereonet::{pole_at, project_pole};
use crate::picture::draw::egui_backend;
use crate::picture::draw::map::{MapMeasure, disc_geometry, to_px};
use crate::study::annotations::{Annotation, FigureKind, Pin};
use crate::study::{Derived, Edit, MeasureChoice};
use crate::text::format::{dip_text, readable};
use crate::window::session::{Coalesce, Command};

use super::notes_panel;

/// Value text for a measure.
fn value_text(measure: Measure, v: f64, d: &Derived) -> String {
    MapMeasure {
        measure: measure.into(),
        unit: d.unit,
        convention: d.convention,
    }
    .value_text(v, 5)
}

/// Pore pressure (when `pore`) and cohesion and friction angle (when `material`), edited in the
/// display unit. Shared by the worst-plane controls and the Mohr tab.
pub fn material_ui(
    ui: &mut egui::Ui,
    choice: &mut MeasureChoice,
    unit: crate::mechanics::StressUnit,
    pore: bool,
    material: bool,
) {
    if pore {
        let mut p = unit.from_pa(choice.pore_pressure_pa);
        ui.horizontal(|ui| {
            ui.label("pore pressure p");
            ui.add(
                egui::DragValue::new(&mut p)
                    .speed(0.1)
                    .suffix(format!(" {unit}")),
            )
            .on_hover_text("Compression positive; effective normal stress σn' = σn − p");
        });
        choice.pore_pressure_pa = unit.to_pa(p);
    }
    if material {
        // The planes' strength is the user's to give: nothing is assumed until the box is ticked.
        let mut given = choice.cohesion_pa.is_some() || choice.friction_angle_deg.is_some();
        ui.checkbox(&mut given, "the planes' c and φ are given")
            .on_hover_text("Cohesion and friction angle of the planes (joints, faults) for the Coulomb checks; unticked, those checks are not checked");
        if given {
            let mut c = unit.from_pa(choice.cohesion_pa.unwrap_or(0.0));
            let mut phi = choice.friction_angle_deg.unwrap_or(0.0);
            ui.horizontal(|ui| {
                ui.label("cohesion c");
                ui.add(
                    egui::DragValue::new(&mut c)
                        .speed(0.1)
                        .range(0.0..=f64::MAX)
                        .suffix(format!(" {unit}")),
                )
                .on_hover_text(
                    "Coulomb cohesion c of the planes (shear strength at zero effective normal stress)",
                );
                ui.label("friction φ");
                ui.add(
                    egui::DragValue::new(&mut phi)
                        .speed(0.2)
                        .range(0.0..=89.0)
                        .suffix("°"),
                )
                .on_hover_text(format!(
                    "Coulomb friction angle φ of the planes, degrees (μ = tan φ = {})",
                    crate::text::format::readable(phi.to_radians().tan(), 4)
                ));
            });
            choice.cohesion_pa = Some(unit.to_pa(c));
            choice.friction_angle_deg = Some(phi);
            ui.weak("U = τ / (c + (σn − p) tan φ), compression positive");
        } else {
            choice.cohesion_pa = None;
            choice.friction_angle_deg = None;
            ui.weak("not given: the material's c and φ are used when it has them; otherwise the Coulomb checks of planes are not checked");
        }
    }
}

/// A picker of the worst-plane measure, named `label` (for the left panel and the map tab).
fn measure_picker(ui: &mut egui::Ui, label: &str, measure: &mut Measure) {
    egui::ComboBox::from_id_salt(("planewise-measure", label))
        .selected_text(measure.label())
        .show_ui(ui, |ui| {
            for m in Measure::ALL {
                ui.selectable_value(measure, m, m.label());
            }
        })
        .response
        .widget_info(|| egui::WidgetInfo::labeled(egui::Role::ComboBox, true, label));
}

/// The worst-plane section of the left panel: the measure and its parameters.
pub struct WorstPlanePanel;

impl super::Panel for WorstPlanePanel {
    fn ui(&mut self, ui: &mut egui::Ui, reads: super::Reads<'_>, writes: &mut super::Writes<'_>) {
        worst_plane_ui(ui, reads.d, writes.commands);
    }
}

/// The worst-plane controls (in the cut-plane column).
fn worst_plane_ui(ui: &mut egui::Ui, d: &Derived, out: &mut Vec<Command>) {
    ui.heading("Worst plane");
    let mut edited = d.measure;
    let choice = &mut edited;
    ui.horizontal(|ui| {
        ui.label("measure");
        measure_picker(ui, "worst-plane measure", &mut choice.measure);
    });
    let unit = d.unit;
    let needs_pore = matches!(choice.measure, Measure::SlipTendency | Measure::MohrCoulomb);
    let needs_material = choice.measure == Measure::MohrCoulomb;
    material_ui(ui, choice, unit, needs_pore, needs_material);
    if edited != d.measure {
        out.push(Command::Edit {
            edit: Edit::SetMeasure(edited),
            coalesce: Some(Coalesce::MeasureFields),
        });
    }
    let search = d.search;
    match &d.worst {
        Ok(result) => {
            let text = match (result.value, result.condition) {
                (Some(v), _) => value_text(search.measure, v, d),
                (None, WorstCondition::EffectiveTension) => {
                    "undefined — planes with no frictional capacity exist (effective tension)"
                        .to_owned()
                }
                (None, _) => "undefined for this state".to_owned(),
            };
            let which = if search.measure.worst_is_smallest() {
                "smallest"
            } else {
                "worst"
            };
            ui.label(format!("{which} value: {text}"))
                .on_hover_text(measure_formula(search.measure));
            ui.label(match (result.condition, result.cone) {
                (WorstCondition::EveryPlane, _) => {
                    "every plane carries the same stress (hydrostatic)".to_owned()
                }
                (WorstCondition::Cone, Some(cone)) => format!(
                    "a cone of planes attains it: normals at {}° to the axis; {} shown",
                    readable(cone.half_angle_deg, 4),
                    result.planes.len()
                ),
                (WorstCondition::EffectiveTension, _) => {
                    "the plane normal to the least compressive stress is shown".to_owned()
                }
                _ => format!("{} plane(s) attain it", result.planes.len()),
            });
            ui.horizontal_wrapped(|ui| {
                for (i, p) in result.planes.iter().enumerate() {
                    let rake =
                        crate::mechanics::PlaneStress::new(&d.tensor, p.normal, d.convention)
                            .rake_deg()
                            .map_or_else(
                                || "undefined".to_owned(),
                                |r| format!("{}°", readable(r, 4)),
                            );
                    let tip = format!(
                        "{}, σn {}, τ {}, rake {rake}",
                        dip_text(p.dip_deg, p.dip_direction_deg),
                        value_text(Measure::Shear, p.normal_stress_pa, d),
                        value_text(Measure::Shear, p.shear_stress_pa, d)
                    );
                    if ui
                        .small_button(format!("go to worst plane {}", i + 1))
                        .on_hover_text(tip)
                        .clicked()
                    {
                        out.push(Command::Edit {
                            edit: Edit::SetPlane(p.normal),
                            coalesce: None,
                        });
                    }
                }
            });
        }
        Err(e) => {
            ui.colored_label(ui.visuals().error_fg_color, format!("⚠ {e}"));
        }
    }
}

/// The measure's formula, for tooltips.
fn measure_formula(measure: Measure) -> &'static str {
    match measure {
        Measure::Shear => "τ = |t − σn n|; largest on normals (n1 ± n3)/√2",
        Measure::NormalMax => "σn = n·σ·n; largest on the plane normal to n1",
        Measure::NormalMin => "σn = n·σ·n; smallest on the plane normal to n3",
        Measure::Traction => {
            "|t| = |σ·n|; largest normal to the principal stress of largest magnitude"
        }
        Measure::SlipTendency => {
            "Ts = τ / (σn − p), compression positive (Morris et al. 1996); dimensionless"
        }
        Measure::DilationTendency => {
            "Td = (σ1 − σn) / (σ1 − σ3), compression positive (Ferrill et al. 1999); dimensionless"
        }
        Measure::MohrCoulomb => "U = τ / (c + (σn − p) tan φ), compression positive; dimensionless",
    }
}

/// The orientation-map figure for the current state at `width` × `height` pixels (the tab and
/// its export).
#[must_use]
pub fn map_figure(
    d: &Derived,
    resolution: usize,
    width: u32,
    height: u32,
    sizes: crate::picture::draw::Sizes,
) -> crate::picture::draw::Frame {
    crate::picture::figures::map(
        &crate::picture::figures::FigureInput::from_derived(d, false),
        &d.search,
        resolution,
        width,
        height,
        sizes,
    )
}

/// The measure of the map in the window's unit and convention.
fn map_measure(d: &Derived) -> MapMeasure {
    MapMeasure {
        measure: d.search.measure.into(),
        unit: d.unit,
        convention: d.convention,
    }
}

/// The orientation-map tab.
pub struct MapPanel;

impl super::Panel for MapPanel {
    fn ui(&mut self, ui: &mut egui::Ui, reads: super::Reads<'_>, writes: &mut super::Writes<'_>) {
        map_ui(ui, reads.d, &reads.project.annotations, writes.commands);
    }
}

/// The orientation map tab.
fn map_ui(ui: &mut egui::Ui, d: &Derived, notes: &[Annotation], out: &mut Vec<Command>) {
    notes_panel::notes_bar(ui, &d.name, FigureKind::Map, notes, out);
    // The measure with the map it colours (its parameters stay in the Worst plane section).
    ui.horizontal(|ui| {
        ui.label("Coloured by");
        let mut choice = d.measure;
        measure_picker(ui, "map measure", &mut choice.measure);
        if choice != d.measure {
            out.push(Command::Edit {
                edit: Edit::SetMeasure(choice),
                coalesce: None,
            });
        }
        if matches!(choice.measure, Measure::SlipTendency | Measure::MohrCoulomb) {
            ui.weak("pore pressure and the planes' c, φ: Worst plane section, left");
        }
    });
    let search = d.search;
    let size = (ui.available_size() - egui::vec2(0.0, super::readout_height(ui)))
        .max(egui::vec2(200.0, 160.0));
    let (rect, response) = ui.allocate_exact_size(size, egui::Sense::click_and_drag());
    let frame = map_figure(
        d,
        128,
        rect.width() as u32,
        rect.height() as u32,
        crate::picture::draw::Sizes::default(),
    );
    let what = map_measure(d);
    let label = |v: f64| what.value_text(v, 5);
    ui.painter_at(rect)
        .extend(egui_backend::shapes(&frame, rect, ui.ctx()));

    let (centre, r) = disc_geometry(
        rect.width(),
        rect.height(),
        crate::picture::draw::Sizes::default(),
    );
    let to_map = |pos: egui::Pos2| {
        let x = f64::from((pos.x - rect.min.x - centre[0]) / r);
        let y = f64::from(-(pos.y - rect.min.y - centre[1]) / r);
        pole_at(x, y).and_then(|pole| PlaneNormal::from_vector(pole).ok())
    };
    let hover = response.hover_pos().and_then(to_map);
    let readout = match hover {
        Some(n) => {
            let (dip, dd) = n.dip_deg();
            let value = crate::mechanics::search::Objective::new(&d.tensor, &search)
                .at_normal(&n.vector())
                .map_or_else(|| "undefined (no frictional capacity)".to_owned(), label);
            format!(
                "pole of {}: {} = {value}. Click to make it the cut plane.",
                dip_text(dip, dd),
                search.measure.key()
            )
        }
        None => {
            "Orientation map: hover a pole for its plane and value; click to set the cut plane."
                .to_owned()
        }
    };
    // The pointer's plane, under the picture: never over the tools above it.
    let response = super::readout(ui, response, "orientation map picture", &readout);
    let shown = notes_panel::on_screen(&d.name, FigureKind::Map, notes, |pin| match pin {
        Pin::Pole { normal } => PlaneNormal::from_vector(nalgebra::Vector3::from(*normal))
            .ok()
            .map(|n| to_px(centre, r, project_pole(&n))),
        _ => None,
    });
    let pin_at = |at: [f32; 2]| {
        to_map(rect.min + egui::vec2(at[0], at[1])).map(|n| Pin::Pole {
            normal: n.vector().into(),
        })
    };
    let used = notes_panel::handle_pointer(
        ui,
        &response,
        rect,
        &d.name,
        FigureKind::Map,
        notes,
        &shown,
        crate::picture::draw::Sizes::default().text,
        pin_at,
        out,
    );
    if !used
        && response.clicked()
        && let Some(n) = response.interact_pointer_pos().and_then(to_map)
    {
        out.push(Command::Edit {
            edit: Edit::SetPlane(n),
            coalesce: None,
        });
    }
}
