//! The 3D view: a toolbar (view presets, projection, layers) and the CPU-rendered picture,
//! which the user turns by dragging.

use crate::mechanics::PlaneNormal;
use crate::picture::draw::camera::{Camera, Projection, ViewPreset};
use crate::picture::draw::{Sizes, egui_backend, render};
use crate::picture::scene::{FaceChoice, Layers, NORMAL_LENGTH, Scene, SceneInput};
use crate::study::annotations::{Annotation, FigureKind, Pin};
use crate::study::{Derived, Edit};
use crate::window::session::{Coalesce, Command, Settings};

use super::notes_panel;

/// How the 3D view is driven (the "?" in its corner; Help → Keys and mouse lists it too).
pub const VIEW_HELP: &str = "3D view: drag to orbit, right-drag to pan, scroll to zoom, double-click to reset. Drag the white handle at the tip of n to turn the cut plane. Keys 1–8: view presets.";

/// Radius of the sphere new notes in the 3D view are pinned on, world units (inside the
/// cube's corners, outside its face centres).
const NOTE_SPHERE: f64 = 0.6;

/// How close (pixels) a press must be to the normal's handle to grab it.
pub const HANDLE_GRAB_PX: f32 = 12.0;

/// Checkboxes for the layers.
pub fn layers_ui(ui: &mut egui::Ui, layers: &mut Layers) {
    ui.checkbox(&mut layers.cube, "Cube");
    ui.checkbox(&mut layers.face_tractions, "Face tractions");
    ui.checkbox(&mut layers.element, "Stress element")
        .on_hover_text(
            "Signed components on each face: σii along the normal (out for tension, in for compression), τij along the face in direction j. Looking down an axis (keys 6, 7 for z) shows the plane element and its copy turned to the in-plane principal directions, tan 2θp = 2τxy / (σx − σy).",
        );
    ui.checkbox(&mut layers.traction_field, "Traction over all directions")
        .on_hover_text(
            "t = σ·n at the tips of normals spread evenly over a sphere; red where t·n > 0 (tension), blue where t·n < 0. The traction lies along n only in the principal directions.",
        );
    ui.checkbox(&mut layers.cut_plane, "Cut plane");
    ui.checkbox(&mut layers.ellipsoid, "Traction ellipsoid");
    ui.checkbox(&mut layers.principal_axes, "Principal axes");
    ui.checkbox(&mut layers.labels, "Value labels");
    ui.checkbox(&mut layers.triad, "Axis triad");
    ui.checkbox(&mut layers.legend, "Legend");
    ui.checkbox(&mut layers.worst_planes, "Worst planes")
        .on_hover_text(
            "Outlines and normals of the worst planes for the measure chosen under Worst plane",
        );
}

fn faces_ui(ui: &mut egui::Ui, faces: &mut FaceChoice) {
    ui.label("Which cube faces carry their traction arrows.");
    ui.weak("Facing the viewer: the three faces you see, following the view as it turns. Untick to choose faces one by one (the hidden ones are drawn behind).");
    let mut facing = matches!(faces, FaceChoice::FacingViewer);
    if ui
        .checkbox(&mut facing, "Faces facing the viewer")
        .changed()
    {
        *faces = if facing {
            FaceChoice::FacingViewer
        } else {
            FaceChoice::Chosen([true, false, true, false, true, false])
        };
    }
    if let FaceChoice::Chosen(which) = faces {
        for (i, face) in crate::picture::scene::Face::ALL.into_iter().enumerate() {
            ui.checkbox(&mut which[i], format!("{} face", face.label()));
        }
    }
}

/// The normals of the worst planes for the chosen measure when the worst-planes layer is on
/// (empty otherwise, or when the measure cannot be evaluated).
#[must_use]
pub fn worst_normals(d: &Derived, settings: &Settings) -> Vec<PlaneNormal> {
    if !settings.layers.worst_planes {
        return Vec::new();
    }
    d.worst_normals()
}

/// The 3D view tab.
pub struct ViewPanel;

impl super::Panel for ViewPanel {
    fn ui(&mut self, ui: &mut egui::Ui, reads: super::Reads<'_>, writes: &mut super::Writes<'_>) {
        view_ui(
            ui,
            reads.d,
            &reads.project.annotations,
            writes.settings,
            writes.commands,
        );
    }
}

/// Draws the toolbar and the view; camera moves change `settings.camera` directly (the view
/// is not part of undo).
fn view_ui(
    ui: &mut egui::Ui,
    d: &Derived,
    notes: &[Annotation],
    settings: &mut Settings,
    out: &mut Vec<Command>,
) {
    notes_panel::notes_bar(ui, &d.name, FigureKind::View3d, notes, out);
    ui.horizontal_wrapped(|ui| {
        for (i, preset) in ViewPreset::ALL.into_iter().enumerate() {
            let text = match preset {
                ViewPreset::ThreeQuarter => "¾".to_owned(),
                ViewPreset::Isometric => "iso".to_owned(),
                other => other.key().replace('-', "−"),
            };
            if ui
                .selectable_label(false, text)
                .on_hover_text(format!("{} (key {})", preset.label(), i + 1))
                .clicked()
            {
                out.push(Command::SetView(preset));
            }
        }
        ui.separator();
        let cam = &mut settings.camera;
        ui.selectable_value(&mut cam.projection, Projection::Orthographic, "ortho");
        ui.selectable_value(&mut cam.projection, Projection::Perspective, "persp");
        ui.separator();
        ui.menu_button("Layers", |ui| layers_ui(ui, &mut settings.layers));
        ui.menu_button("Faces", |ui| faces_ui(ui, &mut settings.faces))
            .response
            .on_hover_text("Which cube faces carry traction arrows");
        if ui
            .button("Export…")
            .on_hover_text("Export figure (Ctrl+E)")
            .clicked()
        {
            out.push(Command::OpenExport);
        }
    });

    let size = ui.available_size().max(egui::vec2(64.0, 64.0));
    let (rect, response) = ui.allocate_exact_size(size, egui::Sense::click_and_drag());
    response.widget_info(|| egui::WidgetInfo::labeled(egui::Role::Image, true, "3D view picture"));
    let worst = worst_normals(d, settings);
    let marked = settings.fatigue_plane.clone();
    let input = |settings: &Settings| SceneInput {
        tensor: &d.tensor,
        plane: d.plane,
        unit: d.unit,
        convention: d.convention,
        layers: settings.layers,
        faces: settings.faces,
        worst_planes: &worst,
        marked_plane: marked.as_ref().map(|(n, label)| (*n, label.as_str())),
    };

    // The normal's handle: where it is on screen now, and whether a drag holds it.
    let handle_id = response.id.with("normal-handle");
    let camera_before = settings.camera;
    // A legend that would cover the drawing folds into the Key button (bottom right).
    let key_id = response.id.with("legend-open");
    let key_open = ui.data(|d| d.get_temp::<bool>(key_id).unwrap_or(false));
    let fold = |mut scene: Scene| {
        if !key_open
            && !crate::picture::draw::legend_fits(
                &scene,
                rect.width(),
                rect.height(),
                Sizes::default(),
            )
        {
            scene.legend = None;
        }
        scene
    };
    let built = Scene::build(&input(settings), &settings.camera.towards_eye());
    let folds =
        !crate::picture::draw::legend_fits(&built, rect.width(), rect.height(), Sizes::default());
    let scene = fold(built);
    let view = crate::picture::draw::view_for(
        &scene,
        &settings.camera,
        rect.width(),
        rect.height(),
        Sizes::default(),
    );
    let handle_px = settings.layers.cut_plane.then(|| {
        let p = view.project(&nalgebra::Point3::from(d.plane.vector() * NORMAL_LENGTH));
        rect.min + egui::vec2(p.x as f32, p.y as f32)
    });
    let near_handle = |pos: Option<egui::Pos2>| matches!((pos, handle_px), (Some(p), Some(h)) if p.distance(h) <= HANDLE_GRAB_PX);
    if response.drag_started_by(egui::PointerButton::Primary) {
        let grabbed = near_handle(response.interact_pointer_pos());
        ui.data_mut(|d| d.insert_temp(handle_id, grabbed));
    }
    let holding = ui.data(|d| d.get_temp::<bool>(handle_id).unwrap_or(false));
    if response.drag_stopped() {
        ui.data_mut(|d| d.remove::<bool>(handle_id));
    }
    if holding || near_handle(response.hover_pos()) {
        ui.ctx().set_cursor_icon(if holding {
            egui::CursorIcon::Grabbing
        } else {
            egui::CursorIcon::Grab
        });
    }

    // Notes: pinned to world points on a sphere inside the cube's corners.
    let shown = notes_panel::on_screen(&d.name, FigureKind::View3d, notes, |pin| match pin {
        Pin::Space { at } => {
            let p = view.project(&nalgebra::Point3::from(*at));
            Some([p.x as f32, p.y as f32])
        }
        _ => None,
    });
    let pin_at = |at: [f32; 2]| {
        view.sphere_direction_at(f64::from(at[0]), f64::from(at[1]), NOTE_SPHERE)
            .map(|d| Pin::Space {
                at: (d * NOTE_SPHERE).into(),
            })
    };
    let on_notes = !holding
        && notes_panel::handle_pointer(
            ui,
            &response,
            rect,
            &d.name,
            FigureKind::View3d,
            notes,
            &shown,
            Sizes::default().text,
            pin_at,
            out,
        );

    let serial = super::drag_serial(ui, &response);
    if on_notes {
        // The pointer pins or moves a note: the camera and the plane stay.
    } else if holding && response.dragged_by(egui::PointerButton::Primary) {
        if let Some(pos) = response.interact_pointer_pos() {
            let local = pos - rect.min;
            if let Some(direction) =
                view.sphere_direction_at(f64::from(local.x), f64::from(local.y), NORMAL_LENGTH)
                && let Ok(plane) = PlaneNormal::from_vector(direction)
            {
                out.push(Command::Edit {
                    edit: Edit::SetPlane(plane),
                    // One undo step per drag.
                    coalesce: Some(Coalesce::NormalHandle(serial)),
                });
            }
        }
    } else {
        let cam = &mut settings.camera;
        if response.dragged_by(egui::PointerButton::Primary) {
            let d = response.drag_delta();
            cam.orbit(-f64::from(d.x) * 0.4, f64::from(d.y) * 0.4);
        }
        if response.dragged_by(egui::PointerButton::Secondary) {
            let d = response.drag_delta();
            cam.pan[0] += f64::from(d.x) / f64::from(rect.height().max(1.0));
            cam.pan[1] += f64::from(d.y) / f64::from(rect.height().max(1.0));
        }
        if response.hovered() {
            let scroll = ui.input(|i| i.smooth_scroll_delta.y);
            if scroll != 0.0 {
                cam.zoom = (cam.zoom * (f64::from(scroll) * 0.003).exp()).clamp(0.1, 20.0);
            }
        }
        if response.double_clicked() {
            *cam = Camera {
                projection: cam.projection,
                ..Camera::default()
            };
        }
    }

    // Rebuild only when the camera moved this frame (faces facing the viewer follow the orbit).
    let mut scene = if settings.camera == camera_before {
        scene
    } else {
        fold(Scene::build(
            &input(settings),
            &settings.camera.towards_eye(),
        ))
    };
    scene.notes = crate::picture::figures::space_notes(&d.notes);
    let frame = render(
        &scene,
        &settings.camera,
        rect.width(),
        rect.height(),
        Sizes::default(),
    );
    let shapes = egui_backend::shapes(&frame, rect, ui.ctx());
    ui.painter_at(rect).extend(shapes);
    // The help sits on a "?" in the picture's lower right corner (free of the legend, the
    // axes and the labels), never over the tabs and tools above the picture.
    super::corner_controls(ui, rect, VIEW_HELP, "3D view help", folds, key_id);
}
