//! The window's panels. Every panel has one shape, [`Panel`]: it reads the project and the
//! shown case's derived results ([`Reads`]) and answers with [`Command`]s, changing in place only
//! the view-only [`Settings`] ([`Writes`]); its own fields hold only what is being typed or
//! animated. No mechanics is computed here beyond what a panel shows. The floating windows
//! (export, path entry, About, Keys and mouse, questions) draw on the context instead of a
//! panel's area and take what they show as arguments.

pub mod cases_panel;
pub mod envelope_panel;
pub mod export_panel;
pub mod fatigue_panel;
pub mod faults_panel;
pub mod file_prompt;
pub mod input_panel;
pub mod map_panel;
pub mod mohr_panel;
pub mod notes_panel;
pub mod plane_panel;
pub mod questions;
pub mod results_panel;
pub mod stress_panel;
pub mod table_panel;
pub mod verdict_panel;
pub mod view_panel;
pub mod walkthrough_panel;

use crate::picture::draw::camera::{Projection, ViewPreset};
use crate::study::{Derived, Project};
use crate::window::keys::{Act, keys_text};
use crate::window::session::{Command, Settings, Status};

/// What a panel reads: the project (lists, names, notes, material) and the shown case's
/// derived results.
#[derive(Clone, Copy)]
pub struct Reads<'a> {
    /// The open project.
    pub project: &'a Project,
    /// The shown case's results.
    pub d: &'a Derived,
}

/// What a panel may change: the commands it returns (every change of the project is a
/// [`Command::Edit`], which is what makes undo work) and the view-only settings.
pub struct Writes<'a> {
    /// The commands, applied at the end of the frame.
    pub commands: &'a mut Vec<Command>,
    /// Layers, camera, tab and the other view settings kept between runs.
    pub settings: &'a mut Settings,
}

/// The one shape of a panel drawn in a side panel or the central area.
pub trait Panel {
    /// Draws the panel into `ui` from `reads`, answering through `writes`.
    fn ui(&mut self, ui: &mut egui::Ui, reads: Reads<'_>, writes: &mut Writes<'_>);
}

/// A menu entry with its keys from the bindings table (written for the platform: ⌘ on macOS);
/// whether it was clicked.
fn item(ui: &mut egui::Ui, text: &str, act: Act) -> bool {
    ui.add(egui::Button::new(text).shortcut_text(keys_text(ui.ctx(), act)))
        .clicked()
}

/// A horizontal bar of `size`, filled to `fraction` of its width (none for `None`) in `color`,
/// with an optional tick at `tick` of its width, labelled `tick_label` under it in body text.
/// Returns the bar's rectangle.
pub fn bar(
    ui: &mut egui::Ui,
    size: egui::Vec2,
    fraction: Option<f64>,
    color: egui::Color32,
    tick: Option<f32>,
    tick_label: Option<&str>,
) -> egui::Rect {
    let font = egui::TextStyle::Body.resolve(ui.style());
    let below = if tick_label.is_some() {
        ui.text_style_height(&egui::TextStyle::Body) + 2.0
    } else {
        0.0
    };
    let (whole, _) =
        ui.allocate_exact_size(egui::vec2(size.x, size.y + below), egui::Sense::hover());
    let rect = egui::Rect::from_min_size(whole.min, size);
    if let (Some(t), Some(label)) = (tick, tick_label) {
        ui.painter().text(
            egui::pos2(rect.left() + rect.width() * t, rect.bottom() + 2.0),
            egui::Align2::CENTER_TOP,
            label,
            font,
            ui.visuals().text_color(),
        );
    }
    let painter = ui.painter_at(rect.expand(2.0));
    painter.rect_stroke(
        rect,
        2.0,
        egui::Stroke::new(1.0, ui.visuals().weak_text_color()),
        egui::StrokeKind::Inside,
    );
    if let Some(f) = fraction {
        let mut filled = rect;
        filled.set_width(rect.width() * f.clamp(0.0, 1.0) as f32);
        painter.rect_filled(filled, 2.0, color);
    }
    if let Some(t) = tick {
        let x = rect.left() + rect.width() * t;
        painter.line_segment(
            [
                egui::pos2(x, rect.top() - 2.0),
                egui::pos2(x, rect.bottom() + 2.0),
            ],
            egui::Stroke::new(1.5, ui.visuals().text_color()),
        );
    }
    rect
}

/// "Copy as" buttons for a table: TSV, Markdown and CSV; pushes what `make` gives.
pub fn copy_as_ui(
    ui: &mut egui::Ui,
    out: &mut Vec<Command>,
    make: impl Fn(crate::output::results::CopyFormat) -> Command,
) {
    use crate::output::results::CopyFormat;
    ui.menu_button("Copy as…", |ui| {
        for (format, label, tip) in [
            (CopyFormat::Tsv, "Tab-separated", "For spreadsheets"),
            (
                CopyFormat::Markdown,
                "Markdown table",
                "For notes and issue trackers",
            ),
            (
                CopyFormat::Csv,
                "CSV",
                "Comma-separated, quoted where needed",
            ),
        ] {
            if ui.button(label).on_hover_text(tip).clicked() {
                out.push(make(format));
                ui.close();
            }
        }
    });
}

/// A number that stays the same for the whole of one drag on `response` and differs between
/// drags, so that the edits of one drag merge into one undo step and the next drag starts
/// another.
#[must_use]
pub fn drag_serial(ui: &egui::Ui, response: &egui::Response) -> u64 {
    let key = response.id.with("drag-serial");
    if response.drag_started() {
        let counter = egui::Id::unique("planewise-drag-counter");
        let next = ui.data_mut(|d| {
            let c = d.get_temp_mut_or_default::<u64>(counter);
            *c += 1;
            *c
        });
        ui.data_mut(|d| d.insert_temp(key, next));
    }
    ui.data(|d| d.get_temp::<u64>(key).unwrap_or(0))
}

/// The menu bar. `can_undo` / `can_redo` enable the Edit entries.
pub fn menus_ui(
    ui: &mut egui::Ui,
    settings: &mut Settings,
    (can_undo, can_redo): (bool, bool),
    out: &mut Vec<Command>,
) {
    egui::Panel::top("menus").show(ui, |ui| {
        egui::MenuBar::new().ui(ui, |ui| {
            ui.menu_button("File", |ui| {
                if item(ui, "New project", Act::NewProject) {
                    out.push(Command::NewProject);
                }
                if item(ui, "Open project…", Act::OpenProject) {
                    out.push(Command::OpenProject);
                }
                ui.add_enabled_ui(!settings.recent.is_empty(), |ui| {
                    ui.menu_button("Open recent", |ui| {
                        for path in &settings.recent {
                            let name = path.file_name().map_or_else(
                                || path.display().to_string(),
                                |n| n.to_string_lossy().into_owned(),
                            );
                            if ui
                                .button(name)
                                .on_hover_text(path.display().to_string())
                                .clicked()
                            {
                                out.push(Command::OpenPath(path.clone()));
                            }
                        }
                    });
                });
                if ui
                    .button("Open demo project")
                    .on_hover_text(
                        "The built-in invented bracket: three load cases and two combinations",
                    )
                    .clicked()
                {
                    out.push(Command::OpenDemo);
                }
                ui.separator();
                if item(ui, "Save", Act::Save) {
                    out.push(Command::Save);
                }
                if item(ui, "Save as…", Act::SaveAs) {
                    out.push(Command::SaveAs);
                }
                ui.separator();
                if ui
                    .button("Import table…")
                    .on_hover_text("A finite-element result table (CSV, TSV, text) to rank and pick from")
                    .clicked()
                {
                    out.push(Command::ImportTable);
                }
                if ui
                    .button("Export report…")
                    .on_hover_text("The calculation report of the whole project: one HTML file to print and sign")
                    .clicked()
                {
                    out.push(Command::ExportReport);
                }
                if item(ui, "Export figure…", Act::ExportFigure) {
                    out.push(Command::OpenExport);
                }
                if ui.button("Copy figure").clicked() {
                    out.push(Command::CopyFigure);
                }
                if item(ui, "Copy results", Act::CopyResults) {
                    out.push(Command::CopyResults(crate::output::results::CopyFormat::Tsv));
                }
                ui.separator();
                if ui.button("Quit").clicked() {
                    ui.send_viewport_cmd(egui::ViewportCommand::Close);
                }
            });
            ui.menu_button("Edit", |ui| {
                let undo = egui::Button::new("Undo").shortcut_text(keys_text(ui.ctx(), Act::Undo));
                if ui.add_enabled(can_undo, undo).clicked() {
                    out.push(Command::Undo);
                }
                let redo = egui::Button::new("Redo").shortcut_text(keys_text(ui.ctx(), Act::Redo));
                if ui.add_enabled(can_redo, redo).clicked() {
                    out.push(Command::Redo);
                }
            });
            ui.menu_button("View", |ui| {
                for preset in ViewPreset::ALL {
                    let button = egui::Button::new(preset.label())
                        .shortcut_text(keys_text(ui.ctx(), Act::View(preset)));
                    if ui.add(button).clicked() {
                        out.push(Command::SetView(preset));
                    }
                }
                ui.separator();
                let cam = &mut settings.camera;
                ui.radio_value(
                    &mut cam.projection,
                    Projection::Orthographic,
                    "Orthographic",
                );
                ui.radio_value(&mut cam.projection, Projection::Perspective, "Perspective");
                ui.separator();
                view_panel::layers_ui(ui, &mut settings.layers);
                ui.separator();
                ui.checkbox(&mut settings.show_inputs, "Inputs panel (left)")
                    .on_hover_text(format!(
                        "Load cases, stress, cut plane and measure ({})",
                        keys_text(ui.ctx(), Act::LeftPanel)
                    ));
                ui.checkbox(&mut settings.show_results, "Results panel (right)")
                    .on_hover_text(format!(
                        "Verdict, material and results ({})",
                        keys_text(ui.ctx(), Act::RightPanel)
                    ));
                ui.checkbox(&mut settings.dark, "Dark panels")
                    .on_hover_text(
                        "Light is the default, for projectors and printouts; figures stay on white either way",
                    );
            });
            ui.menu_button("Help", |ui| {
                if ui.button("Keys and mouse").clicked() {
                    out.push(Command::ShowKeys);
                }
                if ui.button("About Planewise").clicked() {
                    out.push(Command::ShowAbout);
                }
            });
        });
    });
}

/// The status bar: the last message, and the conventions in force.
pub fn status_bar_ui(ui: &mut egui::Ui, d: &Derived, status: Option<&Status>) {
    egui::Panel::bottom("status").show(ui, |ui| {
        ui.horizontal(|ui| {
            let kind = if d.combination {
                "combination"
            } else {
                "load case"
            };
            ui.label(format!(
                "{kind} '{}' · {} · {} · x, y, z right-handed",
                d.name,
                d.unit,
                d.convention.key()
            ));
            ui.separator();
            if let Some(status) = status {
                let color = if status.error {
                    ui.visuals().error_fg_color
                } else {
                    ui.visuals().text_color()
                };
                ui.colored_label(color, &status.text);
            } else {
                // Wrapped onto a second line where the window is narrow, never cut.
                ui.add(egui::Label::new(egui::RichText::new(crate::SAFETY_NOTE).weak()).wrap());
            }
        });
    });
}

/// Side of the "?" help button in a picture's corner, points.
pub const HELP_BUTTON: f32 = 22.0;

/// The corner controls of a picture in `rect`: a "?" whose tooltip is `help` (named
/// `help_name`), and, when the legend `folds`, a Key button beside it that shows or hides the
/// legend (its state under `key_id`).
pub fn corner_controls(
    ui: &mut egui::Ui,
    rect: egui::Rect,
    help: &str,
    help_name: &str,
    folds: bool,
    key_id: egui::Id,
) {
    let at = egui::Rect::from_min_size(
        rect.right_bottom() - egui::vec2(HELP_BUTTON + 6.0, HELP_BUTTON + 6.0),
        egui::vec2(HELP_BUTTON, HELP_BUTTON),
    );
    ui.put(at, egui::Button::new("?").small())
        .on_hover_text(help)
        .widget_info(|| egui::WidgetInfo::labeled(egui::Role::Button, true, help_name));
    if folds {
        let key_open = ui.data(|d| d.get_temp::<bool>(key_id).unwrap_or(false));
        let at = egui::Rect::from_min_size(
            rect.right_bottom() - egui::vec2(64.0 + HELP_BUTTON + 6.0, 30.0),
            egui::vec2(56.0, 22.0),
        );
        let text = if key_open { "Hide key" } else { "Key" };
        if ui
            .put(at, egui::Button::new(text))
            .on_hover_text("The legend (unit, convention, arrow scale, colours): folded because it would cover the picture at this size")
            .clicked()
        {
            ui.data_mut(|d| d.insert_temp(key_id, !key_open));
        }
    }
}

/// Height to leave under a picture for its [`readout`]: two lines of body text.
#[must_use]
pub fn readout_height(ui: &egui::Ui) -> f32 {
    2.0 * ui.text_style_height(&egui::TextStyle::Body) + ui.spacing().item_spacing.y
}

/// A picture's live readout (what the pointer is on), written on the lines under the picture
/// (room left by [`readout_height`]) instead of in a tooltip over the tools above it or over the
/// picture's own labels. The picture is named `name` for assistive technology.
pub fn readout(
    ui: &mut egui::Ui,
    response: egui::Response,
    name: &str,
    text: &str,
) -> egui::Response {
    ui.add(egui::Label::new(text).wrap());
    response.widget_info(|| egui::WidgetInfo::labeled(egui::Role::Image, true, name));
    response
}

/// Help → Keys and mouse: every binding, written from [`crate::window::keys`].
pub fn keys_ui(ctx: &egui::Context, open: &mut bool) {
    egui::Window::new("Keys and mouse")
        .open(open)
        .collapsible(false)
        .show(ctx, |ui| {
            egui::Grid::new("planewise-keys")
                .num_columns(2)
                .striped(true)
                .show(ui, |ui| {
                    for (key, what) in crate::window::keys::list(ctx) {
                        ui.strong(key);
                        ui.label(what);
                        ui.end_row();
                    }
                    for (gesture, what) in crate::window::keys::MOUSE {
                        ui.strong(gesture);
                        ui.label(what);
                        ui.end_row();
                    }
                });
            ui.weak("Digit keys and the walk-through's keys act when no text field has the keyboard (press Esc to leave a field).");
        });
}

/// The About window.
pub fn about_ui(ctx: &egui::Context, open: &mut bool) {
    egui::Window::new("About Planewise").open(open).collapsible(false).show(ctx, |ui| {
        ui.heading(format!("Planewise {}", env!("CARGO_PKG_VERSION")));
        ui.label("The stress state at a point, for engineers who check and explain it. What it does today:");
        for line in [
            "principal stresses and directions, invariants, equivalent stresses, the traction and its normal and shear parts on any plane;",
            "a 3D view of the cube, the cut plane, the traction ellipsoid, the principal axes, the stress element and the traction field;",
            "the worst planes for a measure, the orientation map and the Mohr circles;",
            "verdicts against von Mises, Tresca, Rankine, Mohr–Coulomb and Drucker–Prager (on effective stress with pore pressure), and slip checks of named faults;",
            "projects of load cases and factored combinations, with an envelope; inputs as tensors, in-situ stresses, principal axes, strain rosettes or plane stress;",
            "finite-element tables ranked by any measure;",
            "a walk-through of a load case, annotated figures, and a calculation report to print;",
            "the same from the command line: analyze, figure, worst-plane, map, mohr, envelope, project, rosette, report, explain, batch.",
        ] {
            ui.label(format!("• {line}"));
        }
        ui.add_space(6.0);
        ui.strong("Caution");
        ui.label(crate::SAFETY_NOTE);
        ui.add_space(6.0);
        ui.strong("Conventions");
        ui.label("Stresses are stored in pascals, tension positive, in right-handed x, y, z axes. In the compression-positive convention every stress shown or typed is negated, and σ1 is the most compressive. Dip / dip direction: x = east, y = north, z = up; dip direction clockwise from north.");
        ui.add_space(6.0);
        ui.label("The demo project is an invented scenario, not data from a real part; its combination factors are illustrative only.");
    });
}
