//! The window's behaviour through egui_kittest: no renderer, no display; widgets are found by
//! their accessible names, typed into and clicked, and the app's state is checked.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

use std::path::PathBuf;

use egui::accesskit::Role;
use egui_kittest::Harness;
use egui_kittest::kittest::{Queryable as _, by};
use planewise::app::{Dialogs, PlanewiseApp};
use planewise::mechanics::{Analysis, Component, SignConvention};

/// Tests never open a native dialog.
struct NoDialogs;

impl Dialogs for NoDialogs {
    fn save_figure(&self, _suggested_name: &str) -> Option<PathBuf> {
        None
    }
}

fn harness() -> Harness<'static, PlanewiseApp> {
    let app = PlanewiseApp::demo(Box::new(NoDialogs));
    let mut h = Harness::builder()
        .with_size(egui::vec2(1280.0, 1400.0))
        .build_ui_state(|ui, app: &mut PlanewiseApp| app.show(ui), app);
    h.run();
    h
}

fn mpa(app: &PlanewiseApp, comp: Component) -> f64 {
    app.document.tensor.component_pa(comp) / 1e6
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

#[test]
fn typing_a_cell_changes_the_results_and_its_mirror() {
    let mut h = harness();
    let before =
        Analysis::new(&h.state().document.tensor, SignConvention::TensionPositive).von_mises_pa;
    type_into(&mut h, "σxy", "10");
    assert!((mpa(h.state(), Component::Xy) - 10.0).abs() < 1e-12);
    let after =
        Analysis::new(&h.state().document.tensor, SignConvention::TensionPositive).von_mises_pa;
    assert!(
        (after - before).abs() > 1.0,
        "von Mises did not follow the edit"
    );
    // The results panel shows the new von Mises value.
    let shown = format!("{} MPa", planewise::format::sig(after / 1e6, 6));
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
        let before = h.state().document.clone();
        type_into(&mut h, "σzz", bad);
        assert_eq!(h.state().document, before, "{bad:?} changed the state");
        let error = h.state().stress_panel.first_error().unwrap_or_default();
        assert!(error.starts_with("σzz:"), "{bad:?}: error '{error}'");
        assert!(
            h.query_by_label_contains("the last valid state is kept")
                .is_some(),
            "{bad:?}: no message on screen"
        );
    }
}

#[test]
fn undo_restores_the_previous_state_and_redo_reapplies() {
    let mut h = harness();
    let original = h.state().document.clone();
    type_into(&mut h, "σxx", "5");
    type_into(&mut h, "σyy", "7");
    let edited = h.state().document.clone();
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
    assert_eq!(h.state().document, original);
    h.key_press_modifiers(
        egui::Modifiers::COMMAND | egui::Modifiers::SHIFT,
        egui::Key::Z,
    );
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Y);
    h.run();
    assert_eq!(h.state().document, edited);
}

#[test]
fn face_and_principal_plane_buttons_set_the_plane() {
    let mut h = harness();
    h.get_by_label("+y face").click();
    h.run();
    assert_eq!(h.state().document.plane.vector(), nalgebra::Vector3::y());
    h.get_by_label("σ1 plane").click();
    h.run();
    let n1 = Analysis::new(&h.state().document.tensor, SignConvention::TensionPositive)
        .principal
        .directions[0];
    assert!((h.state().document.plane.vector() - n1).norm() < 1e-12);
    h.get_by_label("max shear A").click();
    h.run();
    let a = Analysis::new(&h.state().document.tensor, SignConvention::TensionPositive);
    let expected = a.max_shear_normals[0];
    assert!((h.state().document.plane.vector() - expected).norm() < 1e-12);
    // Plane changes are undoable too.
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert!((h.state().document.plane.vector() - n1).norm() < 1e-12);
}

#[test]
fn a_zero_normal_is_rejected_with_a_message() {
    let mut h = harness();
    type_into(&mut h, "nx", "0");
    type_into(&mut h, "ny", "0");
    // (0, 0, nz) is still a plane; making nz zero too must be refused and keep it.
    let before = h.state().document.plane;
    type_into(&mut h, "nz", "0");
    assert_eq!(h.state().document.plane, before);
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
    assert_eq!(input(&h, "σxx").value().as_deref(), Some("-120"));
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
    h.state_mut()
        .apply(&ctx, planewise::app::Command::ExportTo(path.clone()));
    let written = std::fs::read_to_string(&path).unwrap();
    let expected = planewise::draw::svg::to_svg(&h.state().export_frame(), "");
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
    let rect = h.get_by_label_contains("hover a pole").rect();
    let (centre, r) = planewise::draw::map::disc_geometry(rect.width(), rect.height());
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
    let got = h.state().document.plane.vector();
    assert!(
        (got.dot(&expected).abs() - 1.0).abs() < 1e-3,
        "plane {got} vs pole {expected}"
    );
    // The map's plane change is undoable like any other.
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert_eq!(
        h.state().document.plane,
        planewise::app::Document::demo().plane
    );
}

#[test]
fn go_to_worst_plane_sets_a_worst_plane() {
    let mut h = harness();
    h.get_by_label("go to worst plane 1").click();
    h.run();
    let a = Analysis::new(&h.state().document.tensor, SignConvention::TensionPositive);
    let n = h.state().document.plane.vector();
    let expected = a.max_shear_normals;
    assert!(
        expected
            .iter()
            .any(|e| (e.dot(&n).abs() - 1.0).abs() < 1e-9),
        "plane {n} is not a max-shear plane"
    );
}
