//! The window on a project, through egui_kittest: load cases, combinations, the envelope, undo
//! of structural edits, saving through the in-window path entry, the unsaved-changes question
//! and the autosaved working copy.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

mod common;

use common::{NoDialogs, type_into};

use std::path::PathBuf;

use egui::accesskit::Role;
use egui_kittest::Harness;
use egui_kittest::kittest::{Queryable as _, by};
use planewise::mechanics::{Analysis, Component, SignConvention};
use planewise::study::Project;
use planewise::window::app::{PlanewiseApp, Settings};

fn harness_on(app: PlanewiseApp) -> Harness<'static, PlanewiseApp> {
    let mut h = Harness::builder()
        .with_size(egui::vec2(1280.0, 1400.0))
        .build_ui_state(|ui, app: &mut PlanewiseApp| app.show(ui), app);
    h.run();
    h
}

fn demo() -> Harness<'static, PlanewiseApp> {
    harness_on(PlanewiseApp::demo(Box::new(NoDialogs)))
}

fn temp(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("planewise-gui-project-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    dir.join(name)
}

/// Replaces the text of the field whose accessible name starts with `name`.
/// Chooses the Table tab's unit as a user does: the picker, then the unit.
fn choose_table_unit(h: &mut Harness<'static, PlanewiseApp>, unit: &str) {
    h.get_by_label("table unit").click();
    h.run();
    h.get_all_by_label(unit).last().unwrap().click();
    h.run();
    assert_eq!(
        h.state()
            .table_panel
            .unit
            .map(planewise::mechanics::StressUnit::symbol),
        Some(unit),
        "the unit picker did not take {unit}"
    );
}

fn leave_text_field(h: &mut Harness<'static, PlanewiseApp>) {
    h.key_press(egui::Key::Escape);
    h.run();
}

#[test]
fn add_a_case_edit_it_combine_and_the_envelope_marks_the_governing_row() {
    let mut h = demo();
    h.get_by_label("+ load case").click();
    h.run();
    assert_eq!(h.state().project.active, "case 1");
    type_into(&mut h, "σxx", "400");
    assert!((h.state().tensor().component_pa(Component::Xx) - 400e6).abs() < 1e-3);
    leave_text_field(&mut h);
    h.get_by_label("+ combination").click();
    h.run();
    let combination = h.state().project.active.clone();
    assert_eq!(combination, "combination 1");
    // Every case with factor 1: its tensor is the plain sum (superposition of tensors).
    let p = &h.state().project;
    let mut sum = [0.0; 6];
    for case in &p.cases {
        for (s, v) in sum
            .iter_mut()
            .zip(p.tensor(&case.name).unwrap().components_pa())
        {
            *s += v;
        }
    }
    let got = h.state().tensor().components_pa();
    for (a, b) in got.iter().zip(sum) {
        assert!(
            (a - b).abs() <= 1e-6 * b.abs().max(1.0),
            "{got:?} vs {sum:?}"
        );
    }

    h.get_by_label("Envelope").click();
    h.run();
    // The governing row is the largest von Mises over every case and combination, found here by
    // a plain loop over the project.
    let p = &h.state().project;
    let worst = p
        .names()
        .into_iter()
        .map(|(n, _)| {
            let vm =
                Analysis::new(&p.tensor(n).unwrap(), SignConvention::TensionPositive).von_mises_pa;
            (n.to_owned(), vm)
        })
        .max_by(|a, b| a.1.total_cmp(&b.1))
        .unwrap();
    h.get_by_label(&format!("{}  ◆ governs", worst.0));
    // Clicking a row shows it (the envelope's row is drawn after the cases list).
    assert_eq!(h.get_all_by_label("dead").count(), 2);
    h.get_all_by_label("dead").last().unwrap().click();
    h.run();
    assert_eq!(h.state().project.active, "dead");
}

#[test]
fn combination_factors_and_terms_are_edited_in_the_window() {
    let mut h = demo();
    assert_eq!(h.state().project.active, "ULS 1");
    // Remove the second term (live) of ULS 1: the combination is then 1.35 × dead.
    assert_eq!(h.get_all_by_label("✕").count(), 2);
    h.get_all_by_label("✕").nth(1).unwrap().click();
    h.run();
    let p = &h.state().project;
    let dead = p.tensor("dead").unwrap().components_pa();
    let uls = p.tensor("ULS 1").unwrap().components_pa();
    for (u, d) in uls.iter().zip(dead) {
        assert!((u - 1.35 * d).abs() <= 1e-9 * d.abs().max(1.0));
    }
    // One undo step brings the term back.
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert_eq!(h.state().project, Project::demo());
}

#[test]
fn undo_restores_a_deleted_case_and_its_terms() {
    let mut h = demo();
    h.get_by_label("thermal").click();
    h.run();
    h.get_by_label("Delete").click();
    h.run();
    let p = &h.state().project;
    assert!(p.case("thermal").is_none());
    assert!(
        p.combination("ULS 2")
            .unwrap()
            .terms
            .iter()
            .all(|t| t.case != "thermal")
    );
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    let p = &h.state().project;
    assert!(p.case("thermal").is_some());
    assert_eq!(p.combination("ULS 2"), Project::demo().combination("ULS 2"));
    // Once live is gone, dead is the only term of ULS 1: deleting it is refused with a message.
    h.get_by_label("live").click();
    h.run();
    h.get_by_label("Delete").click();
    h.run();
    assert!(h.state().project.case("live").is_none());
    h.get_by_label("dead").click();
    h.run();
    h.get_by_label("Delete").click();
    h.run();
    assert!(h.state().project.case("dead").is_some());
    let status = h.state().status.clone().unwrap();
    assert!(
        status.error && status.text.contains("only term"),
        "{status:?}"
    );
}

#[test]
fn save_through_the_path_entry_writes_a_file_the_command_line_reads() {
    let mut h = demo();
    h.get_by_label("dead").click();
    h.run();
    // Showing another case is navigation: no question on leaving, no undo step.
    assert!(!h.state().dirty());
    assert!(!h.state().history.can_undo());
    type_into(&mut h, "σxx", "41");
    leave_text_field(&mut h);
    assert!(h.state().dirty());
    assert!(h.state().title().starts_with("● "), "{}", h.state().title());
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::S);
    // The dialog runs on a worker thread; wait for its answer.
    for _ in 0..2000 {
        h.step();
        if h.state().file_prompt.purpose.is_some() {
            break;
        }
        std::thread::sleep(std::time::Duration::from_millis(5));
    }
    h.run();
    h.get_by_label_contains("No file dialog is available (test machine");
    let path = temp("saved.json");
    let _ = std::fs::remove_file(&path);
    type_into(&mut h, "Project file path", path.to_str().unwrap());
    h.get_by_label("Save").click();
    h.run();
    assert!(!h.state().dirty(), "{:?}", h.state().status);
    assert_eq!(h.state().file.as_deref(), Some(path.as_path()));
    assert!(!h.state().title().starts_with('●'));
    assert_eq!(h.state().settings.recent.first(), Some(&path));

    let out = common::planewise(&["project", "show", path.to_str().unwrap(), "--json"]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let shown: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let text = shown.to_string();
    for name in ["dead", "live", "thermal", "ULS 1", "ULS 2"] {
        assert!(text.contains(name), "{name} missing in {text}");
    }
    // The saved file loads back equal to the window's project.
    let (loaded, warnings) = planewise::study::load(&path).unwrap();
    assert!(warnings.is_empty());
    assert_eq!(loaded, h.state().project);
}

#[test]
fn leaving_with_unsaved_changes_asks_first() {
    let mut h = demo();
    h.get_by_label("dead").click();
    h.run();
    type_into(&mut h, "σxx", "41");
    leave_text_field(&mut h);
    let edited = h.state().project.clone();
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::N);
    h.run();
    h.get_by_label_contains("has changes that are not saved");
    h.get_by_label("Cancel").click();
    h.run();
    assert_eq!(h.state().project, edited);
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::N);
    h.run();
    h.get_by_label("Don't save").click();
    h.run();
    let p = &h.state().project;
    assert_eq!(p.name, planewise::window::app::UNTITLED);
    assert_eq!(p.cases.len(), 1);
    assert!(!h.state().dirty());
    assert!(!h.state().history.can_undo());
}

#[test]
fn the_autosaved_working_copy_is_offered_back_after_a_crash() {
    let dir = temp("autosave");
    let _ = std::fs::remove_dir_all(&dir);
    let mut app = PlanewiseApp::demo(Box::new(NoDialogs));
    app.set_autosave_dir(Some(dir.clone()));
    let mut h = harness_on(app);
    h.get_by_label("dead").click();
    h.run();
    type_into(&mut h, "σxx", "41");
    leave_text_field(&mut h);
    // Nothing is written before the interval has passed…
    h.state_mut().autosave(1.0);
    assert!(planewise::window::autosave::read(&dir).unwrap().is_none());
    // …and the working copy after it.
    h.state_mut()
        .autosave(planewise::window::autosave::INTERVAL_S + 1.0);
    let edited = h.state().project.clone();
    let copy = planewise::window::autosave::read(&dir).unwrap().unwrap();
    assert_eq!(copy.project, edited);
    drop(h); // the "crash": no clean exit, so the copy stays

    let mut app = PlanewiseApp::new(
        Project::demo(),
        None,
        Settings::default(),
        Box::new(NoDialogs),
    );
    app.set_autosave_dir(Some(dir.clone()));
    app.recovery = planewise::window::autosave::read(&dir).unwrap();
    // Closing the window while the question is open keeps the working copy.
    assert!(
        app.close_requested(),
        "nothing unsaved: the window may close"
    );
    assert!(
        planewise::window::autosave::read(&dir).unwrap().is_some(),
        "the working copy was deleted"
    );
    let mut h = harness_on(app);
    h.get_by_label_contains("did not close normally");
    h.get_by_label("Recover").click();
    h.run();
    assert_eq!(h.state().project, edited);
    assert!(h.state().dirty(), "recovered work counts as unsaved");
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn the_window_refuses_a_bad_project_file_in_one_line_before_opening() {
    let path = temp("not-a-project.json");
    std::fs::write(&path, "{ this is not json").unwrap();
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_planewise"))
        .arg("--project")
        .arg(&path)
        .env_remove("DISPLAY")
        .env_remove("WAYLAND_DISPLAY")
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(1));
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert_eq!(stderr.trim_end().lines().count(), 1, "{stderr}");
    assert!(stderr.contains("not-a-project.json"), "{stderr}");
    assert!(stderr.contains("not a Planewise project file"), "{stderr}");
    // The file is left as it was.
    assert_eq!(
        std::fs::read_to_string(&path).unwrap(),
        "{ this is not json"
    );
}

#[test]
fn window_export_and_the_command_line_give_identical_svg_for_a_project() {
    use planewise::window::app::Central;
    let project_path = temp("same-figures.json");
    let mut project = Project::demo();
    // A measure with a material, so that the map, the worst planes and the Mohr envelope all
    // depend on what the project stores.
    project.measure.measure = planewise::mechanics::search::Measure::MohrCoulomb;
    project.measure.pore_pressure_pa = 2e6;
    project.measure.cohesion_pa = Some(5e6);
    project.measure.friction_angle_deg = Some(30.0);
    planewise::study::save(&project_path, &project).unwrap();
    let (project, _) = planewise::study::load(&project_path).unwrap();
    let mut app = PlanewiseApp::new(
        project,
        Some(project_path.clone()),
        Settings::default(),
        Box::new(NoDialogs),
    );
    for (tab, subcommand) in [
        (Central::View3d, "figure"),
        (Central::Map, "map"),
        (Central::Mohr, "mohr"),
    ] {
        app.settings.central = tab;
        let from_window = temp(&format!("window-{subcommand}.svg"));
        app.export_to(&from_window);
        assert!(
            app.status.as_ref().is_some_and(|s| !s.error),
            "{:?}",
            app.status
        );
        let from_cli = temp(&format!("cli-{subcommand}.svg"));
        let out = common::planewise(&[
            subcommand,
            "--project",
            project_path.to_str().unwrap(),
            "--case",
            "ULS 1",
            "--size",
            "1600x1200",
            "--out",
            from_cli.to_str().unwrap(),
        ]);
        assert!(
            out.status.success(),
            "{}",
            String::from_utf8_lossy(&out.stderr)
        );
        let a = std::fs::read_to_string(&from_window).unwrap();
        let b = std::fs::read_to_string(&from_cli).unwrap();
        assert!(
            a == b,
            "{subcommand}: the window's SVG and the command line's differ"
        );
        assert!(
            a.contains("ULS 1"),
            "{subcommand}: the title names the case"
        );
    }
    // With a title block, too (the window's export settings, the command line's --title).
    app.settings.central = Central::Mohr;
    app.settings.title_block = true;
    "Bracket <check>".clone_into(&mut app.settings.figure_title);
    let from_window = temp("window-titled.svg");
    app.export_to(&from_window);
    let from_cli = temp("cli-titled.svg");
    let out = common::planewise(&[
        "mohr",
        "--project",
        project_path.to_str().unwrap(),
        "--case",
        "ULS 1",
        "--size",
        "1600x1200",
        "--title",
        "Bracket <check>",
        "--out",
        from_cli.to_str().unwrap(),
    ]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let a = std::fs::read_to_string(&from_window).unwrap();
    assert!(
        a == std::fs::read_to_string(&from_cli).unwrap(),
        "titled figures differ"
    );
    assert!(a.contains("Bracket &lt;check&gt;"));
}

#[test]
fn the_shown_state_is_analysed_once_per_change_not_per_frame() {
    let mut h = demo();
    for _ in 0..5 {
        h.step();
    }
    let before = h.state().derived.computations;
    for _ in 0..10 {
        h.step();
    }
    assert_eq!(
        h.state().derived.computations,
        before,
        "recomputed without a change"
    );
    h.get_by_label("+y face").click();
    h.run();
    assert_eq!(h.state().derived.computations, before + 1);
}

#[test]
fn the_measure_and_material_are_undoable_project_edits() {
    let mut h = demo();
    let before = h.state().project.measure;
    h.get_by_label("worst-plane measure").click();
    h.run();
    h.get_by_label("Mohr–Coulomb utilization of planes").click();
    h.run();
    assert_eq!(
        h.state().project.measure.measure,
        planewise::mechanics::search::Measure::MohrCoulomb
    );
    assert!(h.state().dirty());
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert_eq!(h.state().project.measure, before);
    assert!(!h.state().dirty());
}

#[test]
fn the_material_editor_changes_the_verdict_in_one_undo_step() {
    let mut h = demo();
    // The demo's invented steel: von Mises and Tresca checked, the rest not.
    h.get_by_label_contains("needs the tensile and/or compressive strength");
    let before = h.state().project.material.clone();
    type_into(&mut h, "f_y yield", "100");
    let fy = h.state().project.material.strengths.yield_strength_pa;
    assert_eq!(fy, Some(100e6));
    // ULS 1's von Mises (189 MPa) now exceeds the yield strength: fails.
    assert!(h.query_all_by_label_contains("fails").count() >= 1);
    leave_text_field(&mut h);
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert_eq!(h.state().project.material, before);
    // Text that is not a number keeps the last valid material and says why.
    type_into(&mut h, "f_t tensile", "strong");
    assert_eq!(h.state().project.material, before);
    h.get_by_label_contains("the last valid material is kept");
}

#[test]
fn a_load_case_given_as_in_situ_stresses_is_typed_in_its_form() {
    let mut h = demo();
    h.get_by_label("+ from other input").click();
    h.run();
    h.get_by_label("in-situ stresses").click();
    h.run();
    assert_eq!(h.state().project.active, "case 1");
    for (field, value) in [
        ("Sv (vertical)", "50"),
        ("SHmax (", "40"),
        ("Shmin", "30"),
        ("SHmax azimuth", "30"),
    ] {
        type_into(&mut h, field, value);
    }
    // The tensor follows the form: σzz = −Sv tension positive (see tests/inputs.rs for the
    // full hand rotation).
    let t = h.state().tensor();
    assert!((t.component_pa(Component::Zz) + 50e6).abs() < 1e-6);
    assert!((t.component_pa(Component::Xx) + 32.5e6).abs() < 1e-6);
    h.get_by_label_contains("the grid shows the tensor it gives, read-only");
    h.key_press(egui::Key::Escape);
    h.run();
    // Changing the kind to six components keeps the stresses, in one undo step.
    h.get_by_label("Load case input kind").click();
    h.run();
    h.get_by_label("six components").click();
    h.run();
    let after = h.state().tensor();
    assert!((after.component_pa(Component::Xx) - t.component_pa(Component::Xx)).abs() < 1e-3);
    assert_eq!(
        h.state().project.case("case 1").unwrap().input.kind(),
        planewise::study::InputKind::Tensor
    );
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert_eq!(
        h.state().project.case("case 1").unwrap().input.kind(),
        planewise::study::InputKind::InSitu
    );
}

#[test]
fn faults_are_added_from_the_cut_plane_edited_and_sorted() {
    let mut h = demo();
    h.get_by_label("Faults").click();
    h.run();
    h.get_by_label("+ fault from the cut plane").click();
    h.run();
    h.get_by_label("+ fault from the cut plane").click();
    h.run();
    assert_eq!(h.state().project.faults.len(), 2);
    // Make the second one horizontal by typing its dip.
    type_into(&mut h, "Fault 2 dip", "0");
    let f = &h.state().project.faults[1];
    assert_eq!(f.dip_deg, 0.0);
    // The table's numbers are the fault check's (σn′ compression positive).
    let d = planewise::study::Derived::new(&h.state().project);
    assert_eq!(d.faults.len(), 2);
    assert!(d.faults.iter().all(|(_, c)| c.is_some()));
    // A dip beyond 90° is refused and the last valid faults kept.
    let before = h.state().project.faults.clone();
    type_into(&mut h, "Fault 1 dip", "95");
    assert_eq!(h.state().project.faults, before);
    h.get_by_label_contains("the last valid faults are kept");
    // Sorting by a column does not change the project.
    h.key_press(egui::Key::Escape);
    h.run();
    h.get(by().role(Role::Button).label("slip tendency"))
        .click();
    h.run();
    assert_eq!(h.state().project.faults.len(), 2);
    h.get(by().role(Role::Button).label("slip tendency ▼"));
}

#[test]
fn file_export_report_writes_the_html_through_the_path_entry() {
    let mut h = demo();
    h.get_by_label("File").click();
    h.run();
    h.get_by_label("Export report…").click();
    for _ in 0..2000 {
        h.step();
        if h.state().file_prompt.purpose.is_some() {
            break;
        }
        std::thread::sleep(std::time::Duration::from_millis(5));
    }
    h.run();
    let path = temp("window-report.html");
    let _ = std::fs::remove_file(&path);
    type_into(&mut h, "Project file path", path.to_str().unwrap());
    h.get_by_label("Write report").click();
    h.run();
    let text = std::fs::read_to_string(&path).unwrap();
    assert!(text.starts_with("<!DOCTYPE html>"));
    assert!(text.contains("Calculation report: Demo (invented scenario)"));
    assert!(h.state().status.as_ref().is_some_and(|s| !s.error));
}

#[test]
fn results_verdicts_and_envelope_copy_as_markdown_and_csv() {
    let mut h = demo();
    let copied = |h: &Harness<'static, PlanewiseApp>| -> String {
        h.output()
            .platform_output
            .commands
            .iter()
            .find_map(|c| match c {
                egui::OutputCommand::CopyText(t) => Some(t.clone()),
                _ => None,
            })
            .unwrap_or_default()
    };
    // The results panel's Copy as… is the last of the three on screen (verdict, results).
    let menus = h.get_all_by_label("Copy as…").count();
    assert_eq!(menus, 2);
    h.get_all_by_label("Copy as…").nth(1).unwrap().click();
    h.run();
    h.get_by_label("Markdown table").click();
    h.step();
    let md = copied(&h);
    assert!(md.contains("| group | quantity | value | unit |"), "{md}");
    assert!(
        md.contains("| Equivalent stresses | von Mises | 188.996 | MPa |"),
        "{md}"
    );
    h.run();
    // The verdict as CSV.
    h.get_all_by_label("Copy as…").next().unwrap().click();
    h.run();
    h.get_by_label("CSV").click();
    h.step();
    let csv = copied(&h);
    assert!(
        csv.starts_with(
            "criterion,outcome,demand,strength,unit,utilization,factor of safety,strength-reduction factor,mobilized friction angle (°),stress judged,note\n"
        ),
        "{csv}"
    );
    assert!(csv.contains("von Mises,passes,188.996,275,MPa,"), "{csv}");
}

/// The Walk-through tab: → steps forward, ← back, Esc leaves; each step's picture is the step's
/// camera, layers and plane (the exported figure equals the one `planewise explain` draws for
/// that step), and the project's own cut plane is left alone.
#[test]
fn the_walkthrough_steps_with_the_keys_and_shows_each_steps_plane_and_view() {
    use planewise::output::walkthrough::{StepKind, steps};
    use planewise::picture::figures;
    use planewise::study::Derived;
    let mut h = demo();
    let plane_before = h.state().project.plane;
    h.get_by_label("Walk-through").click();
    h.run();
    let d = Derived::new(&h.state().project);
    let all = steps(&d);
    assert_eq!(h.state().walkthrough_panel.step, 0);
    let figure_of = |h: &Harness<'static, PlanewiseApp>, i: usize| {
        let [w, hh] = h.state().settings.export_size;
        let sizes = planewise::picture::draw::Sizes::for_export(w as f32, hh as f32);
        let lines = vec![format!("{}. {}", i + 1, all[i].title), all[i].text.clone()];
        figures::titled(&lines, sizes.text, [w, hh], |hh| {
            planewise::output::walkthrough::step_figure(&d, &all[i], w, hh, sizes)
        })
    };
    for (key, expected) in [
        (egui::Key::ArrowRight, 1),
        (egui::Key::ArrowRight, 2),
        (egui::Key::Space, 3),
        (egui::Key::ArrowLeft, 2),
    ] {
        h.key_press(key);
        h.run();
        assert_eq!(h.state().walkthrough_panel.step, expected, "after {key:?}");
        // The "?" in the picture's corner says where one is.
        h.get_by_label("walk-through help").hover();
        h.run_steps(30);
        assert!(
            h.query_by_label_contains(&format!("Walk-through step {} of 6", expected + 1))
                .is_some()
        );
        assert_eq!(h.state().export_frame(), figure_of(&h, expected));
    }
    // Step 3 shows the σ1 principal plane, not the project's cut plane, which stays.
    assert_eq!(all[2].kind, StepKind::Principal);
    assert_ne!(all[2].plane, plane_before);
    assert_eq!(h.state().project.plane, plane_before);
    h.key_press(egui::Key::Escape);
    h.run();
    assert_eq!(
        h.state().settings.central,
        planewise::window::session::Central::View3d
    );
}

/// Waits (up to a few seconds of real time) for the Table tab's background read to end.
fn wait_for_table(h: &mut Harness<'static, PlanewiseApp>) {
    for _ in 0..200 {
        // While the read runs the tab repaints for its progress bar: step frame by frame
        // (`run` would insist on settling), and settle once the read has ended.
        h.step();
        if !h.state().table_panel.reading() {
            h.run();
            return;
        }
        std::thread::sleep(std::time::Duration::from_millis(20));
    }
    panic!("the table read did not end");
}

/// File → Import table…: with no file dialog the Table tab's path field takes the path; the
/// preview finds the columns; the read ranks in the background; clicking a row makes it a load
/// case shown at once, with the row's stress.
#[test]
fn an_imported_table_ranks_and_a_clicked_row_becomes_the_shown_case() {
    let path = temp("import.csv");
    // An invented table: three rows, von Mises 10, 300 and 120 MPa (uniaxial, common practice).
    std::fs::write(
        &path,
        "node,xx,yy,zz,xy,yz,zx\nN1,10,0,0,0,0,0\nN2,300,0,0,0,0,0\nN3,0,120,0,0,0,0\n",
    )
    .unwrap();
    let mut h = demo();
    h.get_by_label("File").click();
    h.run();
    h.get_by_label("Import table…").click();
    // The dialog answers from its own thread: step until it has.
    h.run_steps(8);
    assert_eq!(
        h.state().settings.central,
        planewise::window::session::Central::Table
    );
    type_into(&mut h, "Table file path", path.to_str().unwrap());
    h.get_by_label("Preview").click();
    h.run();
    // No unit, no ranking: a table does not say its unit.
    h.get_by_label("Read and rank").click();
    h.run();
    assert!(!h.state().table_panel.reading());
    assert!(h.state().table_panel.ranked.is_none());
    assert!(
        h.query_by_label("Choose the unit to read the table")
            .is_some()
    );
    choose_table_unit(&mut h, "MPa");
    h.get_by_label("Read and rank").click();
    wait_for_table(&mut h);
    let ranked = h.state().table_panel.ranked.clone().unwrap();
    let order: Vec<&str> = ranked.rows.iter().map(|r| r.carried[0].as_str()).collect();
    assert_eq!(order, ["N2", "N3", "N1"]);
    h.get_by_label_contains("Row on line 3:").click();
    h.run();
    let p = &h.state().project;
    assert_eq!(p.active, "row 3 of import.csv");
    let t = p.tensor(&p.active).unwrap();
    assert!((t.component_pa(Component::Xx) - 300e6).abs() < 1e-3);
    // A case of kind "table row": it remembers the file, the line and the id, and survives the
    // project file.
    let case = p.case(&p.active).unwrap();
    let planewise::study::CaseInput::TableRow(row) = &case.input else {
        panic!("not a table row: {:?}", case.input);
    };
    assert_eq!((row.line, row.id.as_str()), (3, "N2"));
    assert_eq!(row.file, path.to_str().unwrap());
    let saved = temp("with-row.json");
    planewise::study::save(&saved, p).unwrap();
    assert_eq!(planewise::study::load(&saved).unwrap().0, *p);
    // One undo step takes the new case away again.
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert!(h.state().project.case("row 3 of import.csv").is_none());
}

/// Cancel stops a long read: nothing is kept and the tab says so.
#[test]
fn cancel_stops_a_long_table_read() {
    use std::io::Write;
    let path = temp("long.csv");
    let mut f = std::io::BufWriter::new(std::fs::File::create(&path).unwrap());
    writeln!(f, "id,xx,yy,zz,xy,yz,zx").unwrap();
    for i in 0..1_500_000u32 {
        writeln!(f, "{i},{},{},3,4,5,6", i % 97, i % 89).unwrap();
    }
    drop(f);
    let mut h = demo();
    h.get_by_label("Table").click();
    h.run();
    type_into(&mut h, "Table file path", path.to_str().unwrap());
    choose_table_unit(&mut h, "MPa");
    h.get_by_label("Read and rank").click();
    h.run();
    assert!(h.state().table_panel.reading());
    h.get_by_label("Cancel").click();
    wait_for_table(&mut h);
    assert!(h.state().table_panel.ranked.is_none());
    assert!(
        h.state()
            .table_panel
            .message
            .as_deref()
            .is_some_and(|m| m.contains("cancelled"))
    );
}

#[test]
fn a_value_typed_in_ksi_is_saved_as_typed() {
    use planewise::mechanics::StressUnit;
    use planewise::study::{CaseInput, LoadCase, TypedTensor};
    // An invented state typed in ksi.
    let mut project = Project::new(
        "Invented: ksi",
        StressUnit::Ksi,
        SignConvention::TensionPositive,
    );
    project.cases.push(LoadCase {
        unknown: planewise::study::unknown::UnknownKeys::new(),
        name: "a".to_owned(),
        description: String::new(),
        input: CaseInput::Tensor(TypedTensor {
            unit: "ksi".to_owned(),
            compression_positive: false,
            components: [1.1, -0.7, 0.3, 0.13, 0.0, 0.0],
        }),
    });
    let mut h = harness_on(PlanewiseApp::new(
        project,
        None,
        Settings::default(),
        Box::new(NoDialogs),
    ));
    type_into(&mut h, "σxx", "0.21");
    leave_text_field(&mut h);
    let path = temp("ksi.json");
    h.state_mut().save_to(&path);
    h.run();
    let saved: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(&path).unwrap()).unwrap();
    let components = &saved["cases"][0]["input"]["components"];
    assert_eq!(saved["cases"][0]["input"]["unit"], "ksi");
    // Exactly as typed: no trip through pascals.
    assert_eq!(components[0].as_f64(), Some(0.21), "{components}");
    assert_eq!(components[3].as_f64(), Some(0.13), "{components}");
    let (read, _) = planewise::study::load(&path).unwrap();
    let CaseInput::Tensor(t) = &read.cases[0].input else {
        panic!("not a tensor");
    };
    assert_eq!(t.components[0], 0.21);
}

/// The demo with the table at `path` read in MPa and ranked by `measure` in the Table tab.
fn table_ranked(
    path: &std::path::Path,
    measure: planewise::study::EnvelopeMeasure,
) -> Harness<'static, PlanewiseApp> {
    let mut h = demo();
    h.state_mut().settings.central = planewise::window::session::Central::Table;
    h.state_mut().table_panel.measure = measure;
    h.run();
    type_into(&mut h, "Table file path", path.to_str().unwrap());
    h.get_by_label("Preview").click();
    h.run();
    choose_table_unit(&mut h, "MPa");
    h.get_by_label("Read and rank").click();
    wait_for_table(&mut h);
    h
}

/// The Table tab ranks conditions as batch and the envelope do: a row without frictional
/// capacity first, above every number, and the tab counts each condition.
#[test]
fn the_table_tab_ranks_rows_without_frictional_capacity_first() {
    let path = temp("conditions.csv");
    // Invented rows: B has effective tension (σ3 = 5 MPa > p = 0).
    std::fs::write(
        &path,
        "id,xx,yy,zz,xy,yz,zx\nA,-10,-20,-30,0,0,0\nB,5,-20,-30,0,0,0\nC,-10,-11,-60,0,0,0\nD,-50,-50,-50,0,0,0\n",
    )
    .unwrap();
    let mut h = table_ranked(
        &path,
        planewise::study::EnvelopeMeasure::Plane(
            planewise::mechanics::search::Measure::SlipTendency,
        ),
    );
    let ranked = h.state().table_panel.ranked.clone().unwrap();
    assert_eq!(ranked.rows[0].carried[0], "B");
    assert_eq!(ranked.counts.no_frictional_capacity, 1);
    h.run();
    assert!(
        h.query_by_label_contains("1 without frictional capacity")
            .is_some()
    );
    assert!(h.query_by_label("no frictional capacity").is_some());
}

#[test]
fn an_unreadable_working_copy_is_kept_aside_and_said() {
    let dir = temp("autosave-unreadable");
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    std::fs::write(
        dir.join("working-copy.json"),
        "{ \"format_version\": 2, \"name\": ",
    )
    .unwrap();
    let app = PlanewiseApp::start(None, None, Some(dir.clone()));
    let status = app.status.clone().unwrap();
    assert!(
        status.error && status.text.contains("kept at"),
        "{status:?}"
    );
    let kept: Vec<_> = std::fs::read_dir(&dir)
        .unwrap()
        .flatten()
        .filter(|e| {
            e.file_name()
                .to_string_lossy()
                .starts_with("working-copy.unreadable-")
        })
        .collect();
    assert_eq!(kept.len(), 1);
    assert_eq!(
        std::fs::read_to_string(kept[0].path()).unwrap(),
        "{ \"format_version\": 2, \"name\": "
    );
    assert!(app.recovery.is_none());
}

/// The Envelope tab counts each condition, as batch and the Table tab do.
#[test]
fn the_envelope_tab_counts_conditions() {
    let mut h = demo();
    h.state_mut().settings.central = planewise::window::session::Central::Envelope;
    h.run();
    // The invented demo: three cases and two combinations, all with a von Mises value.
    assert!(h.query_by_label("5 rows: 5 with a value").is_some());
}

/// `--table FILE` opens the preview and waits for the unit: nothing is ranked in a guessed unit.
#[test]
fn a_table_given_at_start_waits_for_its_unit() {
    let path = temp("start-table.csv");
    std::fs::write(&path, "id,xx,yy,zz,xy,yz,zx\nA,1,2,3,4,5,6\n").unwrap();
    let mut app = PlanewiseApp::demo(Box::new(NoDialogs));
    app.open_table(&path);
    let mut h = harness_on(app);
    h.run_steps(4);
    assert_eq!(
        h.state().settings.central,
        planewise::window::session::Central::Table
    );
    assert!(!h.state().table_panel.reading());
    assert!(h.state().table_panel.ranked.is_none());
    assert!(
        h.query_by_label("Choose the unit to read the table")
            .is_some()
    );
}

/// Each column header stands over its own column's cells, however long the header's words
/// (the ranked measure's name is the longest).
#[test]
fn table_headers_stand_over_their_columns() {
    let path = temp("aligned.csv");
    // Invented: each component a different number, so each cell is found by its text.
    std::fs::write(
        &path,
        "element id,xx,yy,zz,xy,yz,zx\nE1,11.5,22.5,33.5,44.5,55.5,66.5\n",
    )
    .unwrap();
    let mut h = table_ranked(
        &path,
        planewise::study::EnvelopeMeasure::Utilization(
            planewise::mechanics::criteria::Criterion::VonMises,
        ),
    );
    h.run();
    for (header, cell) in [
        ("element id", "E1"),
        ("xx (MPa)", "11.5"),
        ("yy (MPa)", "22.5"),
        ("zz (MPa)", "33.5"),
        ("xy (MPa)", "44.5"),
        ("yz (MPa)", "55.5"),
        ("zx (MPa)", "66.5"),
    ] {
        // The list's header is a sort button; its cell is the lowest text of that value (the
        // preview above shows the raw fields too).
        let head = h.get(by().role(Role::Button).label(header)).rect();
        let value = h
            .get_all_by_label(cell)
            .map(|n| n.rect())
            .max_by(|a, b| a.top().total_cmp(&b.top()))
            .unwrap();
        assert!(
            value.left() >= head.left() - 1.0 && value.right() <= head.right() + 1.0,
            "{header}: header {head:?}, its cell {value:?}"
        );
    }
}

/// The 3D view's help sits on a "?" inside the picture and shows there, once, below the tabs
/// and tools (it used to be the whole picture's tooltip, drawn over the tab row).
#[test]
fn the_view_help_covers_no_control() {
    let mut h = demo();
    let tab = h.get_by_label("3D view").rect();
    h.get_by_label("3D view help").hover();
    h.run_steps(30);
    let shown: Vec<egui::Rect> = h
        .get_all_by_label_contains("drag to orbit")
        .map(|n| n.rect())
        .collect();
    assert_eq!(shown.len(), 1, "one help text, not the picture's as well");
    assert!(
        shown[0].top() > tab.bottom(),
        "the help {:?} covers the tabs {tab:?}",
        shown[0]
    );
}

/// The first hour: Help lists every key and mouse gesture from the bindings; a new load case
/// says how to fill it; the empty Table tab has Browse and says which header names it reads;
/// the map's measure sits with the map.
#[test]
fn a_newcomer_is_told_where_to_go() {
    let mut h = demo();
    h.get_by_label("Help").click();
    h.run();
    h.get_by_label("Keys and mouse").click();
    h.run();
    let keys = planewise::window::keys::list(&h.ctx);
    assert!(keys.len() >= 18, "{keys:?}");
    for (key, what) in &keys {
        assert!(h.query_by_label(key).is_some(), "{key} not listed");
        assert!(h.query_by_label(what).is_some(), "{what} not listed");
    }
    assert!(h.query_by_label("3D view: Three-quarter").is_some());
    assert!(h.query_by_label("Turn the cut plane").is_some());
    h.state_mut().help.keys = false;
    h.run();

    // A new load case is all zeros: the stress panel says what to do.
    h.get_by_label("+ load case").click();
    h.run();
    assert!(
        h.query_by_label_contains("This load case is all zeros")
            .is_some()
    );
    type_into(&mut h, "σxx", "5");
    assert!(
        h.query_by_label_contains("This load case is all zeros")
            .is_none()
    );
    leave_text_field(&mut h);

    // The empty Table tab.
    h.state_mut().settings.central = planewise::window::session::Central::Table;
    h.run();
    assert!(h.query_by_label("Browse…").is_some());
    assert!(
        h.query_by_label_contains("found by their header names")
            .is_some()
    );

    // The map's measure, with the map.
    h.state_mut().settings.central = planewise::window::session::Central::Map;
    h.run();
    h.get_by_label("map measure").click();
    h.run();
    h.get_all_by_label("slip tendency").last().unwrap().click();
    h.run();
    assert_eq!(
        h.state().project.measure.measure,
        planewise::mechanics::search::Measure::SlipTendency
    );
}

/// In a small window the walk-through's legend folds into a Key button (as the 3D view's
/// does) instead of being drawn over the cube; the Key shows it again.
#[test]
fn a_small_window_folds_the_walkthrough_legend() {
    let mut app = PlanewiseApp::demo(Box::new(NoDialogs));
    app.settings.central = planewise::window::session::Central::Walkthrough;
    let mut h = Harness::builder()
        .with_size(egui::vec2(1024.0, 640.0))
        .build_ui_state(|ui, app: &mut PlanewiseApp| app.show(ui), app);
    h.run();
    assert!(
        h.query_by_label("Key").is_some(),
        "no Key button at 1024x640"
    );
    h.get_by_label("Key").click();
    h.run();
    assert!(h.query_by_label("Hide key").is_some());
}

/// Presenting (F11) enlarges every panel's text by the window's zoom, not only the picture's,
/// and Esc gives the zoom back.
#[test]
fn presenting_enlarges_everything_and_leaving_restores_it() {
    let mut h = demo();
    h.state_mut().settings.central = planewise::window::session::Central::Walkthrough;
    h.run();
    let before = h.ctx.zoom_factor();
    h.key_press(egui::Key::F11);
    h.run();
    assert!(h.state().walkthrough_panel.presenting);
    assert!((h.ctx.zoom_factor() - 1.5 * before).abs() < 1e-6);
    h.key_press(egui::Key::Escape);
    h.run();
    assert!(!h.state().walkthrough_panel.presenting);
    assert!((h.ctx.zoom_factor() - before).abs() < 1e-6);
}

/// At 1024 × 640 the verdict's numbers and notes wrap inside the results panel instead of
/// running past the window's edge (the panel scrolls sideways only for what cannot wrap).
#[test]
fn a_small_window_wraps_the_verdict_inside_its_panel() {
    let app = PlanewiseApp::demo(Box::new(NoDialogs));
    let mut h = Harness::builder()
        .with_size(egui::vec2(1024.0, 640.0))
        .build_ui_state(|ui, app: &mut PlanewiseApp| app.show(ui), app);
    h.run();
    let mut seen = 0;
    for text in ["factor of safety", "needs the"] {
        for node in h.query_all_by_label_contains(text) {
            seen += 1;
            let r = node.rect();
            assert!(
                r.max.x <= 1024.0 - 4.0,
                "a line with {text:?} ends at x = {} in a 1024 px window",
                r.max.x
            );
        }
    }
    assert!(seen >= 3, "only {seen} verdict lines found");
}

/// The keys come from one table: F9 and F10 hide and show the side panels through it, and a
/// digit turns the 3D view to its preset only while no text field has the keyboard.
#[test]
fn the_bindings_table_drives_the_panel_and_view_keys() {
    use planewise::picture::draw::camera::ViewPreset;
    use planewise::window::keys::{Act, Chord, binding};
    let mut h = demo();
    let key = |act| match binding(act).chords[0] {
        Chord::Key(k) => k,
        Chord::Shortcut(s) => s.logical_key,
    };
    h.key_press(key(Act::LeftPanel));
    h.run();
    assert!(!h.state().settings.show_inputs);
    h.key_press(key(Act::LeftPanel));
    h.key_press(key(Act::RightPanel));
    h.run();
    assert!(h.state().settings.show_inputs && !h.state().settings.show_results);
    let iso = ViewPreset::ALL[1];
    h.key_press(key(Act::View(iso)));
    h.run();
    let (yaw, pitch) = iso.yaw_pitch_deg();
    let camera = h.state().settings.camera;
    assert!(
        (camera.yaw_deg - yaw).abs() < 1e-9 && (camera.pitch_deg - pitch).abs() < 1e-9,
        "{camera:?}"
    );
}

/// Load cases as tables in the window: two tables (one per case, rows in other orders) joined
/// on their ids, the project's combination applied at every point, the points listed worst
/// first with their governing combination; a clicked point becomes the project's load cases of
/// those names, so its combination shows that point's summed tensor (1.35 × Gk + 1.5 × Qk,
/// summed here by hand; the factors are the test's own).
#[test]
fn joined_load_case_tables_list_points_and_a_clicked_point_feeds_the_combination() {
    use planewise::study::{CaseInput, Combination, LoadCase, Term, TypedTensor};
    let dead = temp("joined-dead.csv");
    let live = temp("joined-live.csv");
    // Invented tables: element 1 and 2, integration points 1 and 2, MPa.
    std::fs::write(
        &dead,
        "element,ip,xx,yy,zz,xy,yz,zx\n1,1,10,0,0,0,0,0\n1,2,20,0,0,0,0,0\n2,1,30,0,0,5,0,0\n2,2,40,0,0,0,0,0\n",
    )
    .unwrap();
    std::fs::write(
        &live,
        "element,ip,xx,yy,zz,xy,yz,zx\n2,2,1,0,0,0,0,0\n2,1,60,0,0,0,0,0\n1,2,2,0,0,0,0,0\n1,1,3,0,0,0,0,0\n",
    )
    .unwrap();
    let mut h = demo();
    {
        let p = &mut h.state_mut().project;
        let zero = |name: &str| LoadCase {
            unknown: planewise::study::unknown::UnknownKeys::new(),
            name: name.to_owned(),
            description: String::new(),
            input: CaseInput::Tensor(TypedTensor {
                unit: "MPa".to_owned(),
                compression_positive: false,
                components: [0.0; 6],
            }),
        };
        p.add_case(zero("Gk"), false).unwrap();
        p.add_case(zero("Qk"), false).unwrap();
        let term = |case: &str, factor| Term {
            case: case.to_owned(),
            factor,
            unknown: planewise::study::unknown::UnknownKeys::new(),
        };
        p.add_combination(
            Combination {
                name: "ULS-tables".to_owned(),
                terms: vec![term("Gk", 1.35), term("Qk", 1.5)],
                unknown: planewise::study::unknown::UnknownKeys::new(),
            },
            false,
        )
        .unwrap();
    }
    h.state_mut().settings.central = planewise::window::session::Central::Table;
    h.run();
    type_into(&mut h, "Table file path", dead.to_str().unwrap());
    h.get_by_label("Load cases as tables").click();
    h.run();
    type_into(&mut h, "Id columns", "element, ip");
    type_into(&mut h, "Load case of this table", "Gk");
    h.get_by_label("Add a load-case table").click();
    h.run();
    type_into(&mut h, "Load case of table 2", "Qk");
    type_into(&mut h, "Table 2 path", live.to_str().unwrap());
    choose_table_unit(&mut h, "MPa");
    h.get_by_label("Read and rank").click();
    wait_for_table(&mut h);
    let ranked = h.state().table_panel.ranked.clone().unwrap();
    // Von Mises under ULS, by hand: (2,1): xx = 1.35·30 + 1.5·60 = 130.5, xy = 6.75;
    // (2,2): 55.5; (1,2): 30; (1,1): 18.
    let order: Vec<(&str, &str, &str)> = ranked
        .rows
        .iter()
        .map(|r| {
            (
                r.carried[1].as_str(),
                r.carried[2].as_str(),
                r.carried[0].as_str(),
            )
        })
        .collect();
    assert_eq!(
        order,
        [
            ("2", "1", "ULS-tables"),
            ("2", "2", "ULS-tables"),
            ("1", "2", "ULS-tables"),
            ("1", "1", "ULS-tables")
        ]
    );
    let worst = ranked.rows[0].value.unwrap();
    let expected = (130.5f64.powi(2) + 3.0 * 6.75f64.powi(2)).sqrt() * 1e6;
    assert!((worst - expected).abs() < 1e-3, "{worst} vs {expected}");
    assert!(
        h.query_by_label_contains("the project's 1 combinations of these cases")
            .is_some()
    );
    // The project keeps where its load cases come from.
    let kept = h.state().project.load_case_tables.clone().unwrap();
    assert_eq!(kept.ids, ["element", "ip"]);
    assert_eq!(kept.unit, "MPa");
    let cases: Vec<&str> = kept.tables.iter().map(|t| t.case.as_str()).collect();
    assert_eq!(cases, ["Gk", "Qk"]);
    // Point 3 (element 2, ip 1, the third met in the dead table) is the worst: click it.
    h.get_by_label_contains("Point 3: click").click();
    h.run();
    let p = &h.state().project;
    assert_eq!(p.active, "ULS-tables");
    let t = p.tensor("ULS-tables").unwrap();
    assert!((t.component_pa(Component::Xx) - 130.5e6).abs() < 1e-3);
    assert!((t.component_pa(Component::Xy) - 6.75e6).abs() < 1e-3);
    let case = p.case("Qk").unwrap();
    let CaseInput::TableRow(row) = &case.input else {
        panic!("not from a table: {:?}", case.input);
    };
    assert_eq!(row.id, "element=2, ip=1");
    assert_eq!(row.file, live.to_str().unwrap());
    // The window's report carries the tables section of this read.
    let report = temp("joined-report.html");
    h.state_mut().report_to(&report);
    let html = std::fs::read_to_string(&report).unwrap();
    assert!(html.contains("Load cases as tables"), "no tables section");
    assert!(html.contains("joined-live.csv") && html.contains("ULS-tables"));
    // One undo step puts both cases back.
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    let p = &h.state().project;
    assert_eq!(p.tensor("Gk").unwrap().component_pa(Component::Xx), 0.0);
    assert_eq!(p.tensor("Qk").unwrap().component_pa(Component::Xx), 0.0);
}
