//! The window's Fatigue tab through egui_kittest: a history typed in as a user does, judged, the
//! same numbers as `planewise fatigue`, the critical plane made the cut plane in one undo step,
//! and a bad input said in the tab without losing what was typed.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

mod common;

use common::{NoDialogs, planewise_ok, type_into};

use egui_kittest::Harness;
use egui_kittest::kittest::Queryable as _;
use planewise::window::app::PlanewiseApp;

fn demo() -> Harness<'static, PlanewiseApp> {
    let mut h = Harness::builder()
        .with_size(egui::vec2(1280.0, 1400.0))
        .build_ui_state(
            |ui, app: &mut PlanewiseApp| app.show(ui),
            PlanewiseApp::demo(Box::new(NoDialogs)),
        );
    h.run();
    h
}

const HISTORY: &str = "examples/fatigue-shaft/history.csv";

fn fill(h: &mut Harness<'static, PlanewiseApp>) {
    h.get_by_label("Fatigue").click();
    h.run();
    type_into(h, "A CSV", HISTORY);
    h.get_by_label("fatigue unit").click();
    h.run();
    h.get_all_by_label("MPa").last().unwrap().click();
    h.run();
    type_into(h, "Fully reversed bending", "320");
    type_into(h, "Fully reversed torsion", "200");
}

#[test]
fn a_history_typed_in_is_judged_as_on_the_command_line() {
    let mut h = demo();
    fill(&mut h);
    h.get_by_label("Judge").click();
    h.run();
    let cli: serde_json::Value = serde_json::from_slice(
        &planewise_ok(&[
            "fatigue",
            "--history",
            HISTORY,
            "--bending-limit",
            "320",
            "--torsion-limit",
            "200",
            "--json",
        ])
        .stdout,
    )
    .unwrap();
    let shown = format!(
        "Utilization {}",
        planewise::text::format::sig(cli["utilization"].as_f64().unwrap(), 4)
    );
    h.get_by_label_contains(&shown);
    let (_, _, judged) = h.state().fatigue_panel.answer.as_ref().unwrap();
    let normal = judged.plane.normal;
    // The critical plane becomes the cut plane, and one undo takes it back.
    let before = h.state().project.plane;
    h.get_by_label("Make it the cut plane").click();
    h.run();
    let now = h.state().project.plane.vector();
    assert!((now - nalgebra::Vector3::from(normal)).norm() < 1e-9);
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert_eq!(h.state().project.plane, before);
}

#[test]
fn a_missing_unit_or_bad_limit_is_said_and_nothing_typed_is_lost() {
    let mut h = demo();
    h.get_by_label("Fatigue").click();
    h.run();
    type_into(&mut h, "A CSV", HISTORY);
    h.get_by_label("Judge").click();
    h.run();
    h.get_by_label_contains("choose the unit");
    h.get_by_label("fatigue unit").click();
    h.run();
    h.get_all_by_label("MPa").last().unwrap().click();
    h.run();
    type_into(&mut h, "Fully reversed bending", "320");
    type_into(&mut h, "Fully reversed torsion", "abc");
    h.get_by_label("Judge").click();
    h.run();
    h.get_by_label_contains("t₋₁, the torsion fatigue limit");
    assert!(h.state().fatigue_panel.answer.is_none());
    assert_eq!(h.state().fatigue_panel.path, HISTORY);
    assert_eq!(h.state().fatigue_panel.bending, "320");
}
