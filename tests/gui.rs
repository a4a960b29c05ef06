//! The window's behaviour through egui_kittest: no renderer, no display; widgets are found by
//! their accessible names, typed into and clicked, and the app's state is checked.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

mod common;

use common::NoDialogs;
use egui::accesskit::Role;
use egui_kittest::Harness;
use egui_kittest::kittest::{Queryable as _, by};
use planewise::mechanics::{
    Analysis, Component, PlaneNormal, SignConvention, StressTensor, StressUnit,
};
use planewise::study::{CaseInput, Derived, LoadCase, Project, TypedTensor};
use planewise::window::app::{PlanewiseApp, Settings};

/// A one-case project for these tests. Its numbers are a fixture, not check values: every
/// check compares the window with the mechanics core or with itself.
fn fixture() -> Project {
    let mut p = Project::new("fixture", StressUnit::MPa, SignConvention::TensionPositive);
    p.add_case(
        LoadCase {
            unknown: planewise::study::unknown::UnknownKeys::new(),
            name: "fillet".to_owned(),
            description: String::new(),
            input: CaseInput::Tensor(TypedTensor {
                unit: "MPa".to_owned(),
                compression_positive: false,
                components: [120.0, -35.0, 15.0, 48.0, -12.0, 22.0],
            }),
        },
        false,
    )
    .unwrap();
    p.plane = PlaneNormal::from_vector(nalgebra::Vector3::new(1.0, 0.5, 0.3)).unwrap();
    p
}

fn fixture_tensor() -> StressTensor {
    fixture().tensor("fillet").unwrap()
}

fn harness() -> Harness<'static, PlanewiseApp> {
    harness_on(PlanewiseApp::new(
        fixture(),
        None,
        Settings::default(),
        Box::new(NoDialogs),
    ))
}

fn harness_on(app: PlanewiseApp) -> Harness<'static, PlanewiseApp> {
    let mut h = Harness::builder()
        .with_size(egui::vec2(1280.0, 1400.0))
        .build_ui_state(|ui, app: &mut PlanewiseApp| app.show(ui), app);
    h.run();
    h
}

fn mpa(app: &PlanewiseApp, comp: Component) -> f64 {
    app.tensor().component_pa(comp) / 1e6
}

/// The text field whose accessible name (its tooltip) starts with `name`.
fn input<'a>(h: &'a Harness<'static, PlanewiseApp>, name: &'a str) -> egui_kittest::Node<'a> {
    h.get(by().role(Role::TextInput).predicate(move |n| {
        n.label().is_some_and(|l| {
            l == name || l.starts_with(&format!("{name} ")) || l.starts_with(&format!("{name}:"))
        })
    }))
}

/// Replaces the text of the field named `name` with `text`.
fn type_into(h: &mut Harness<'static, PlanewiseApp>, name: &str, text: &str) {
    input(h, name).focus();
    h.run();
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::A);
    h.key_press(egui::Key::Backspace);
    h.run();
    if !text.is_empty() {
        input(h, name).type_text(text);
        h.run();
    }
}

/// One Ctrl+Z brings back the demo's plane.
fn undo_restores_the_demo_plane(h: &mut Harness<'static, PlanewiseApp>) {
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert_eq!(h.state().project.plane, fixture().plane);
}

#[test]
fn typing_a_cell_changes_the_results_and_its_mirror() {
    let mut h = harness();
    let before = Analysis::new(&h.state().tensor(), SignConvention::TensionPositive).von_mises_pa;
    type_into(&mut h, "σxy", "10");
    assert!((mpa(h.state(), Component::Xy) - 10.0).abs() < 1e-12);
    let after = Analysis::new(&h.state().tensor(), SignConvention::TensionPositive).von_mises_pa;
    assert!(
        (after - before).abs() > 1.0,
        "von Mises did not follow the edit"
    );
    // The results panel shows the new von Mises value.
    let shown = format!("{} MPa", planewise::text::format::sig(after / 1e6, 6));
    assert!(
        h.query_by_label(&shown).is_some(),
        "results panel does not show {shown}"
    );
    // The mirror cell σyx shows the same value once the edited cell loses focus.
    h.key_press(egui::Key::Tab);
    h.run();
    let mirror = input(&h, "σyx");
    assert_eq!(mirror.value().as_deref(), Some("10"));
}

#[test]
fn bad_text_shows_an_error_and_keeps_the_state() {
    for bad in ["abc", "1e999", ""] {
        let mut h = harness();
        let before = h.state().project.clone();
        type_into(&mut h, "σzz", bad);
        assert_eq!(h.state().project, before, "{bad:?} changed the state");
        let error = h.state().stress_panel.first_error().unwrap_or_default();
        assert!(error.starts_with("σzz:"), "{bad:?}: error '{error}'");
        // The message names the cell and the value analysed in its place.
        let before_zz = mpa(h.state(), Component::Zz);
        let said = format!(
            "analysed with the last valid value, σzz = {} MPa",
            planewise::text::format::sig(before_zz, 8).replace('-', "−")
        );
        assert!(
            h.query_by_label_contains(&said).is_some(),
            "{bad:?}: no message '{said}' on screen"
        );
    }
}

/// A cell shows a true minus sign and reads both it and the hyphen-minus.
#[test]
fn a_cell_reads_a_true_minus_sign() {
    let mut h = harness();
    type_into(&mut h, "σyy", "−42.5");
    assert_eq!(h.state().stress_panel.first_error(), None);
    assert!((mpa(h.state(), Component::Yy) + 42.5).abs() < 1e-12);
}

/// A cell holds one number, so a decimal comma reads as the decimal point it is.
#[test]
fn a_decimal_comma_in_a_cell_reads_as_a_decimal_point() {
    let mut h = harness();
    type_into(&mut h, "σxx", "12,5");
    assert_eq!(h.state().stress_panel.first_error(), None);
    assert!((mpa(h.state(), Component::Xx) - 12.5).abs() < 1e-12);
    // Two commas are no number: flagged, and the value in use said.
    type_into(&mut h, "σxx", "1,2,5");
    assert!(h.state().stress_panel.first_error().is_some());
    assert!((mpa(h.state(), Component::Xx) - 12.5).abs() < 1e-12);
    assert!(
        h.query_by_label_contains("analysed with the last valid value, σxx = 12.5 MPa")
            .is_some()
    );
}

#[test]
fn undo_restores_the_previous_state_and_redo_reapplies() {
    let mut h = harness();
    let original = h.state().project.clone();
    type_into(&mut h, "σxx", "5");
    type_into(&mut h, "σyy", "7");
    let edited = h.state().project.clone();
    assert_ne!(edited, original);
    // Leave the text field so the shortcut reaches the app.
    h.key_press(egui::Key::Escape);
    h.run();
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert!(
        (mpa(h.state(), Component::Yy) - -35.0).abs() < 1e-12,
        "σyy not undone"
    );
    assert!(
        (mpa(h.state(), Component::Xx) - 5.0).abs() < 1e-12,
        "σxx undone too early"
    );
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert_eq!(h.state().project, original);
    h.key_press_modifiers(
        egui::Modifiers::COMMAND | egui::Modifiers::SHIFT,
        egui::Key::Z,
    );
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Y);
    h.run();
    assert_eq!(h.state().project, edited);
}

#[test]
fn face_and_principal_plane_buttons_set_the_plane() {
    let mut h = harness();
    h.get_by_label("+y face").click();
    h.run();
    assert_eq!(h.state().project.plane.vector(), nalgebra::Vector3::y());
    h.get_by_label("σ1 plane").click();
    h.run();
    let n1 = Analysis::new(&h.state().tensor(), SignConvention::TensionPositive)
        .principal
        .directions[0];
    assert!((h.state().project.plane.vector() - n1).norm() < 1e-12);
    h.get_by_label("max shear A").click();
    h.run();
    let a = Analysis::new(&h.state().tensor(), SignConvention::TensionPositive);
    let expected = a.max_shear_normals[0];
    assert!((h.state().project.plane.vector() - expected).norm() < 1e-12);
    // Plane changes are undoable too.
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert!((h.state().project.plane.vector() - n1).norm() < 1e-12);
}

#[test]
fn a_zero_normal_is_rejected_with_a_message() {
    let mut h = harness();
    type_into(&mut h, "nx", "0");
    type_into(&mut h, "ny", "0");
    // (0, 0, nz) is still a plane; making nz zero too must be refused and keep it.
    let before = h.state().project.plane;
    type_into(&mut h, "nz", "0");
    assert_eq!(h.state().project.plane, before);
    assert!(
        h.query_by_label_contains("the normal vector is zero")
            .is_some()
    );
}

#[test]
fn pasting_six_numbers_fills_the_grid() {
    let mut h = harness();
    input(&h, "Paste").focus();
    h.run();
    input(&h, "Paste").type_text("1\t2 3;4,5 6");
    h.run();
    h.get_by_label("Fill grid").click();
    h.run();
    let got: Vec<f64> = Component::ALL.iter().map(|c| mpa(h.state(), *c)).collect();
    assert_eq!(got, vec![1.0, 2.0, 3.0, 4.0, 5.0, 6.0]);
    assert_eq!(input(&h, "σzy").value().as_deref(), Some("5"));
}

#[test]
fn compression_positive_shows_negated_cells() {
    let mut h = harness();
    h.get_by_label("compression +").click();
    h.run();
    // A true minus sign, as every number a person reads in the window.
    assert_eq!(input(&h, "σxx").value().as_deref(), Some("−120"));
    // Typing in the compression-positive convention stores the physical (tension-positive) value.
    type_into(&mut h, "σxx", "30");
    assert!((mpa(h.state(), Component::Xx) - -30.0).abs() < 1e-12);
}

#[test]
fn export_to_a_path_writes_the_same_figure_as_the_command_line() {
    let mut h = harness();
    let dir = std::env::temp_dir().join(format!("planewise-gui-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("window.svg");
    let ctx = h.ctx.clone();
    h.state_mut().apply(
        &ctx,
        planewise::window::app::Command::ExportTo(path.clone()),
    );
    let written = std::fs::read_to_string(&path).unwrap();
    let expected = planewise::picture::draw::svg::to_svg(
        &planewise::picture::caution::with_caution(&h.state().export_frame()),
        "",
    );
    // The caution is printed on the figure itself (on one or two lines), not only in its
    // metadata.
    let texts: Vec<&str> = written
        .split("</text>")
        .filter_map(|t| t.rsplit_once('>').map(|(_, text)| text))
        .collect();
    assert!(
        texts.join(" ").contains(planewise::SAFETY_NOTE),
        "the caution is not printed on the figure"
    );
    // Same primitives; only the title differs.
    let body = |s: &str| {
        s.lines()
            .filter(|l| !l.starts_with("<title>"))
            .collect::<Vec<_>>()
            .join("\n")
    };
    assert_eq!(body(&written), body(&expected));
    assert!(h.state().status.as_ref().is_some_and(|s| !s.error));
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn clicking_the_orientation_map_sets_the_plane() {
    let mut h = harness();
    h.get_by_label("Orientation map").click();
    h.run();
    let rect = h.get_by_label("orientation map picture").rect();
    let (centre, r) = planewise::picture::draw::map::disc_geometry(
        rect.width(),
        rect.height(),
        planewise::picture::draw::Sizes::default(),
    );
    // Half way from the centre to the east rim.
    let pos = rect.min + egui::vec2(centre[0] + 0.5 * r, centre[1]);
    h.event(egui::Event::PointerMoved(pos));
    h.event(egui::Event::PointerButton {
        pos,
        button: egui::PointerButton::Primary,
        pressed: true,
        modifiers: egui::Modifiers::NONE,
    });
    h.event(egui::Event::PointerButton {
        pos,
        button: egui::PointerButton::Primary,
        pressed: false,
        modifiers: egui::Modifiers::NONE,
    });
    h.run();
    let expected = planewise::mechanics::stereonet::pole_at(0.5, 0.0).unwrap();
    let got = h.state().project.plane.vector();
    assert!(
        (got.dot(&expected).abs() - 1.0).abs() < 1e-3,
        "plane {got} vs pole {expected}"
    );
    // The map's plane change is undoable like any other.
    undo_restores_the_demo_plane(&mut h);
}

#[test]
fn go_to_worst_plane_sets_a_worst_plane() {
    let mut h = harness();
    h.get_by_label("go to worst plane 1").click();
    h.run();
    let a = Analysis::new(&h.state().tensor(), SignConvention::TensionPositive);
    let n = h.state().project.plane.vector();
    let expected = a.max_shear_normals;
    assert!(
        expected
            .iter()
            .any(|e| (e.dot(&n).abs() - 1.0).abs() < 1e-9),
        "plane {n} is not a max-shear plane"
    );
}

fn press_move_release(h: &mut Harness<'static, PlanewiseApp>, from: egui::Pos2, to: egui::Pos2) {
    h.event(egui::Event::PointerMoved(from));
    h.run();
    h.event(egui::Event::PointerButton {
        pos: from,
        button: egui::PointerButton::Primary,
        pressed: true,
        modifiers: egui::Modifiers::NONE,
    });
    h.run();
    for k in 1..=8 {
        let p = from + (to - from) * (k as f32 / 8.0);
        h.event(egui::Event::PointerMoved(p));
        h.run();
    }
    h.event(egui::Event::PointerButton {
        pos: to,
        button: egui::PointerButton::Primary,
        pressed: false,
        modifiers: egui::Modifiers::NONE,
    });
    h.run();
}

/// A primary click at `pos` (moved there first), then the frames it causes.
fn click_at(h: &mut Harness<'static, PlanewiseApp>, pos: egui::Pos2) {
    h.event(egui::Event::PointerMoved(pos));
    for pressed in [true, false] {
        h.event(egui::Event::PointerButton {
            pos,
            button: egui::PointerButton::Primary,
            pressed,
            modifiers: egui::Modifiers::NONE,
        });
    }
    h.run();
}

/// The Mohr tab's layout for the app's state in `rect`.
fn mohr_layout(
    h: &Harness<'static, PlanewiseApp>,
    rect: egui::Rect,
) -> planewise::picture::draw::mohr::MohrLayout {
    let figure = planewise::window::ui::mohr_panel::figure(
        &Derived::new(&h.state().project),
        &h.state().settings,
    );
    planewise::picture::draw::mohr::MohrLayout::new(
        &figure,
        rect.width().floor(),
        rect.height().floor(),
        planewise::picture::draw::Sizes::default(),
    )
}

#[test]
fn clicking_the_mohr_diagram_moves_the_plane_to_that_point() {
    use planewise::mechanics::PlaneNormal;
    use planewise::mechanics::mohr::MohrCircles;
    let mut h = harness();
    h.get_by_label("Mohr circles").click();
    h.run();
    let rect = h.get_by_label("Mohr circles picture").rect();
    let layout = mohr_layout(&h, rect);
    // Aim at the point of the horizontal plane.
    let t = h.state().tensor();
    let circles = MohrCircles::new(&t, SignConvention::TensionPositive);
    let (sn, tau) = circles.point(&t, PlaneNormal::Z);
    let at = layout.to_px(sn, tau);
    let pos = rect.min + egui::vec2(at[0], at[1]);
    click_at(&mut h, pos);
    // The new plane's point is drawn under the pointer. The side panels grow and shrink a few
    // pixels with the width of the numbers they show, which rescales the picture a little after
    // the click, so allow a few pixels.
    let (sn2, tau2) = circles.point(&t, h.state().project.plane);
    h.event(egui::Event::PointerGone);
    h.run();
    let rect_now = h.get_by_label("Mohr circles picture").rect();
    let layout_now = mohr_layout(&h, rect_now);
    let drawn = rect_now.min + egui::Vec2::from(layout_now.to_px(sn2, tau2));
    assert!(
        drawn.distance(pos) < 6.0,
        "point drawn at {drawn:?}, clicked at {pos:?}"
    );
    assert_ne!(h.state().project.plane, fixture().plane);
    undo_restores_the_demo_plane(&mut h);
}

#[test]
fn dragging_the_normal_handle_turns_the_plane_in_one_undo_step() {
    use planewise::picture::scene::{NORMAL_LENGTH, Scene};
    let mut h = harness();
    let rect = h.get_by_label("3D view picture").rect();
    let app = h.state();
    let camera = app.settings.camera;
    let d = Derived::new(&app.project);
    let scene = Scene::build(&app.scene_input(&d, &[]), &camera.towards_eye());
    let view = planewise::picture::draw::view_for(
        &scene,
        &camera,
        rect.width(),
        rect.height(),
        planewise::picture::draw::Sizes::default(),
    );
    let tip = view.project(&nalgebra::Point3::from(
        app.project.plane.vector() * NORMAL_LENGTH,
    ));
    let origin = view.project(&nalgebra::Point3::origin());
    let from = rect.min + egui::vec2(tip.x as f32, tip.y as f32);
    // Straight up from the centre of the picture, well inside the handle's sphere.
    let target = [
        origin.x,
        origin.y - 0.5 * NORMAL_LENGTH * view.pixels_per_unit(),
    ];
    let to = rect.min + egui::vec2(target[0] as f32, target[1] as f32);
    press_move_release(&mut h, from, to);
    let expected = view
        .sphere_direction_at(target[0], target[1], NORMAL_LENGTH)
        .unwrap();
    let got = h.state().project.plane.vector();
    assert!((got - expected).norm() < 0.02, "plane {got} vs {expected}");
    // The drag turned the plane, not the camera.
    assert_eq!(h.state().settings.camera, camera);
    // One undo step for the whole drag.
    undo_restores_the_demo_plane(&mut h);
    // A drag that starts away from the handle orbits instead.
    let away = rect.min + egui::vec2(20.0, rect.height() - 20.0);
    press_move_release(&mut h, away, away + egui::vec2(60.0, 0.0));
    assert_eq!(h.state().project.plane, fixture().plane);
    assert_ne!(h.state().settings.camera, camera);
}

/// Runs frames until `done` holds (the dialog answers on a worker thread), for up to 10 s.
fn run_until(h: &mut Harness<'static, PlanewiseApp>, done: impl Fn(&PlanewiseApp) -> bool) {
    for _ in 0..2000 {
        // Single steps: while the dialog is pending the window shows a spinner, which keeps
        // asking for repaints, so `run` would never settle.
        h.step();
        if done(h.state()) {
            h.run();
            return;
        }
        std::thread::sleep(std::time::Duration::from_millis(5));
    }
    panic!("condition not reached");
}

#[test]
fn without_a_file_dialog_the_window_offers_a_path_entry_that_saves() {
    let mut h = harness();
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::E);
    h.run();
    h.get_by_label("Save as PNG or SVG…").click();
    h.step();
    run_until(&mut h, |app| app.export_panel.path_entry.is_some());
    assert!(!h.state().dialog_open());
    // The reason is said, and a path field with the suggested name is offered.
    h.get_by_label_contains("No file dialog could open (test machine: no desktop portal)");
    let entry = h.state().export_panel.path_entry.as_ref().unwrap();
    assert!(
        entry.path.ends_with("planewise-figure.png"),
        "{}",
        entry.path
    );

    let dir = std::env::temp_dir().join(format!("planewise-fallback-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("typed.svg");
    type_into(&mut h, PATH_FIELD, path.to_str().unwrap());
    h.get_by_label("Save").click();
    h.run();
    let written = std::fs::read_to_string(&path).unwrap();
    assert!(written.starts_with("<?xml") || written.starts_with("<svg"));
    assert!(h.state().status.as_ref().is_some_and(|s| !s.error));

    // A path that cannot be written shows the error in the window, and keeps the entry.
    type_into(&mut h, PATH_FIELD, "/nonexistent-planewise/x.svg");
    h.get_by_label("Save").click();
    h.run();
    assert!(h.state().export_panel.error.is_some());
    // Said twice: in the export window and in the status bar.
    assert_eq!(h.query_all_by_label_contains("could not write").count(), 2);
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn editing_the_demo_renames_it_and_undo_brings_the_name_back() {
    let mut h = harness_on(PlanewiseApp::demo(Box::new(NoDialogs)));
    let demo_name = Project::demo().name;
    assert_eq!(h.state().project.name, demo_name);
    // The demo opens on a combination; show a load case to edit it.
    h.get_by_label("dead").click();
    h.run();
    type_into(&mut h, "σxx", "80");
    assert_eq!(h.state().project.name, planewise::window::app::UNTITLED);
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert_eq!(h.state().project.name, demo_name);
}

#[test]
fn the_status_bar_says_the_same_caution_as_the_readme() {
    let h = harness();
    h.get_by_label(planewise::SAFETY_NOTE);
    let readme =
        std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/README.md")).unwrap();
    let readme: String = readme
        .lines()
        .map(|l| l.trim_start_matches('>').trim())
        .collect::<Vec<_>>()
        .join(" ");
    assert!(
        readme.contains(planewise::SAFETY_NOTE),
        "README's caution differs from SAFETY_NOTE"
    );
}

/// The accessible name of the export window's path field.
const PATH_FIELD: &str = "Path of the figure file, ending in .png or .svg";

/// Undo's first key in the bindings table.
fn undo_shortcut() -> egui::KeyboardShortcut {
    use planewise::window::keys::{Act, Chord, binding};
    match binding(Act::Undo).chords[0] {
        Chord::Shortcut(s) => s,
        Chord::Key(k) => panic!("undo is a plain key {k:?}"),
    }
}

#[test]
fn menu_shortcut_text_comes_from_the_bindings() {
    let mut h = harness();
    h.get_by_label("Edit").click();
    h.run();
    let undo_key = undo_shortcut();
    let undo = h.ctx.format_shortcut(&undo_key);
    assert!(!undo.is_empty());
    assert!(h.query_all_by_label_contains(&undo).count() >= 1, "{undo}");
    // The binding the menu names is the one the window obeys.
    type_into(&mut h, "σxx", "80");
    h.key_press_modifiers(undo_key.modifiers, undo_key.logical_key);
    h.run();
    assert_eq!(h.state().tensor(), fixture_tensor());
}

#[test]
fn a_note_pinned_on_the_mohr_diagram_moves_by_dragging_and_undo_takes_each_step_back() {
    use planewise::study::annotations::{Pin, default_offset};
    let mut h = harness();
    h.get_by_label("Mohr circles").click();
    h.run();
    h.get_by_label("Pin a note").click();
    h.run();
    let rect = h.get_by_label("Mohr circles picture").rect();
    let plane_before = h.state().project.plane;
    let pos = rect.center();
    click_at(&mut h, pos);
    // One note, on the Mohr diagram of the shown case, pinned where the click was; the click
    // pinned a note and did not move the cut plane.
    let notes = h.state().project.annotations.clone();
    assert_eq!(notes.len(), 1, "{notes:?}");
    assert_eq!(notes[0].case, "fillet");
    assert_eq!(notes[0].offset, default_offset());
    assert_eq!(h.state().project.plane, plane_before);
    let Some(Pin::Mohr {
        normal_stress_pa,
        shear_stress_pa,
    }) = notes[0].pin
    else {
        panic!("not a Mohr pin: {:?}", notes[0].pin);
    };
    let layout = mohr_layout(&h, rect);
    let pinned = rect.min + egui::Vec2::from(layout.to_px(normal_stress_pa, shear_stress_pa));
    assert!(
        pinned.distance(pos) < 1.0,
        "pinned at {pinned:?}, clicked {pos:?}"
    );

    // Drag the note's text (it starts 1.5 text sizes right of and 2 above the pin).
    let text = planewise::picture::draw::Sizes::default().text;
    let grab = pinned + egui::vec2(default_offset()[0] * text + 8.0, default_offset()[1] * text);
    press_move_release(&mut h, grab, grab + egui::vec2(60.0, 40.0));
    let moved = h.state().project.annotations[0].offset;
    let expected = [
        default_offset()[0] + 60.0 / text,
        default_offset()[1] + 40.0 / text,
    ];
    assert!(
        (moved[0] - expected[0]).abs() < 0.05 && (moved[1] - expected[1]).abs() < 0.05,
        "offset {moved:?}, expected {expected:?}"
    );
    assert_eq!(
        h.state().project.plane,
        plane_before,
        "the drag moved the plane"
    );

    // Undo: the whole drag is one step, then the note goes.
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert_eq!(h.state().project.annotations[0].offset, default_offset());
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert!(h.state().project.annotations.is_empty());
}
