//! The window's Fatigue tab through egui_kittest: a history typed in as a user does, judged, the
//! same numbers as `planewise fatigue`, the critical plane made the cut plane in one undo step,
//! and a bad input said in the tab without losing what was typed.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

mod common;

use std::fmt::Write as _;

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

/// Opens the Fatigue tab and types the history file, its unit and the two fatigue limits.
fn fill(h: &mut Harness<'static, PlanewiseApp>, history: &str) {
    h.get_by_label("Fatigue").click();
    h.run();
    type_into(h, "A CSV", history);
    h.get_by_label("fatigue unit").click();
    h.run();
    h.get_all_by_label("MPa").last().unwrap().click();
    h.run();
    type_into(h, "Fully reversed bending", "320");
    type_into(h, "Fully reversed torsion", "200");
}

/// `planewise fatigue ARGS` with the tab's limits (f₋₁ 320, t₋₁ 200 MPa) as JSON.
fn fatigue_json(args: &[&str]) -> serde_json::Value {
    let mut full = vec!["fatigue"];
    full.extend_from_slice(args);
    full.extend(["--bending-limit", "320", "--torsion-limit", "200", "--json"]);
    serde_json::from_slice(&planewise_ok(&full).stdout).unwrap()
}

#[test]
fn a_history_typed_in_is_judged_as_on_the_command_line() {
    let mut h = demo();
    fill(&mut h, HISTORY);
    h.get_by_label("Judge").click();
    h.run();
    let cli = fatigue_json(&["--history", HISTORY]);
    let shown = format!(
        "Utilization {}",
        planewise::text::format::sig(cli["utilization"].as_f64().unwrap(), 4)
    );
    h.get_by_label_contains(&shown);
    let (_, _, judged) = h.state().fatigue_panel.answer.as_ref().unwrap();
    let normal = judged.plane.normal;
    // The critical plane is marked in the 3D view, named, until the box says not to.
    let (marked, label) = h.state().settings.fatigue_plane.clone().unwrap();
    assert!((marked.vector() - nalgebra::Vector3::from(normal)).norm() < 1e-12);
    assert_eq!(label, "Findley critical plane");
    h.get_by_label("3D view").click();
    h.run();
    h.get_by_label("Fatigue").click();
    h.run();
    h.get_by_label("mark it in the 3D view").click();
    h.run();
    assert_eq!(h.state().settings.fatigue_plane, None);
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

#[test]
fn many_points_from_load_case_tables_ranked_in_the_tab_as_on_the_command_line() {
    // Two invented load-case tables (values made up for the test) and a factor history.
    let dir = std::env::temp_dir().join(format!("planewise-gui-fatigue-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let bending = dir.join("bending.csv");
    let torsion = dir.join("torsion.csv");
    let factors = dir.join("factors.csv");
    std::fs::write(
        &bending,
        "node,xx,yy,zz,xy,yz,zx\n1,100,0,0,0,0,0\n2,220,0,0,0,0,0\n3,150,20,0,10,0,0\n",
    )
    .unwrap();
    std::fs::write(
        &torsion,
        "node,xx,yy,zz,xy,yz,zx\n3,0,0,0,60,0,5\n1,0,0,0,100,0,0\n2,0,0,0,90,0,0\n",
    )
    .unwrap();
    let mut text = String::from("step,bending,torsion\n");
    for i in 0..=24 {
        let w = 2.0 * std::f64::consts::PI * f64::from(i) / 24.0;
        writeln!(text, "{i},{},{}", w.sin(), 0.3 + (w - 1.0).sin()).unwrap();
    }
    std::fs::write(&factors, text).unwrap();
    let cli = fatigue_json(&[
        "--case-table",
        &format!("bending={}", bending.display()),
        "--case-table",
        &format!("torsion={}", torsion.display()),
        "--ids",
        "node",
        "--factors",
        factors.to_str().unwrap(),
    ]);
    let mut h = demo();
    fill(&mut h, factors.to_str().unwrap());
    h.get_by_label("Many points").click();
    h.run();
    type_into(&mut h, "id columns", "node");
    type_into(&mut h, "load case 1", "bending");
    type_into(&mut h, "table 1's path", bending.to_str().unwrap());
    h.get_by_label("+ table").click();
    h.run();
    type_into(&mut h, "load case 2", "torsion");
    type_into(&mut h, "table 2's path", torsion.to_str().unwrap());
    h.get_by_label("Rank the points").click();
    // While the ranking runs the spinner repaints every frame: step frame by frame (run()
    // waits for a settled frame) until the answer arrives.
    for _ in 0..600 {
        h.step();
        if h.state().fatigue_panel.many.ranked.is_some()
            || h.state().fatigue_panel.many.message.is_some()
        {
            break;
        }
        std::thread::sleep(std::time::Duration::from_millis(20));
    }
    h.run();
    let panel = &h.state().fatigue_panel;
    assert_eq!(panel.many.message, None);
    let ranked = panel.many.ranked.as_ref().unwrap();
    let listed = cli["listed"].as_array().unwrap();
    assert_eq!(ranked.judged.len(), listed.len());
    for ((p, j), row) in ranked.judged.iter().zip(listed) {
        assert_eq!(
            ranked.source.ids(*p),
            vec![row["ids"]["node"].as_str().unwrap()]
        );
        assert!((j.plane.utilization - row["utilization"].as_f64().unwrap()).abs() < 1e-9);
    }
    // Show makes the worst point the tab's point.
    h.get_all_by_label("Show").next().unwrap().click();
    h.run();
    let (loaded, _, judged) = h.state().fatigue_panel.answer.as_ref().unwrap();
    assert!(loaded.text.starts_with("point node="), "{}", loaded.text);
    assert!((judged.plane.utilization - listed[0]["utilization"].as_f64().unwrap()).abs() < 1e-9);
}
