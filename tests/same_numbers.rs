//! One project, one answer: for every load case and combination of the demo project and of a
//! project with a material, a pore pressure, a cut plane, the planes' strength and named faults
//! (built with the `project` subcommands), `analyze --project --case --json`, the calculation
//! report, `envelope --json` and the window's verdict give the same numbers to the digits each
//! shows.

#![allow(
    clippy::unwrap_used,
    reason = "a test that cannot compute its reference should panic loudly"
)]

mod common;

use common::NoDialogs;
use egui_kittest::Harness;
use egui_kittest::kittest::Queryable as _;
use planewise::text::format::sig;
use planewise::window::app::{PlanewiseApp, Settings};
use scraper::{Html, Selector};

fn temp(name: &str) -> std::path::PathBuf {
    let dir = std::env::temp_dir().join(format!("planewise-same-numbers-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    dir.join(name)
}

/// A project with everything a check can read, built as a user would from the command line
/// (an invented scenario).
fn rich_project() -> std::path::PathBuf {
    let file = temp("rich.json");
    let _ = std::fs::remove_file(&file);
    let f = file.to_str().unwrap();
    for args in [
        vec![
            "project",
            "new",
            f,
            "--name",
            "Invented: rock slope anchor block",
        ],
        vec![
            "project",
            "add-case",
            f,
            "--name",
            "gravity",
            "--in-situ",
            "sv=30,shmax=24,shmin=15,azimuth=40",
        ],
        vec![
            "project",
            "add-case",
            f,
            "--name",
            "anchor",
            "--stress",
            "xx=-4,yy=2,zz=-1,xy=3,yz=-1.5,zx=2",
        ],
        vec![
            "project",
            "add-case",
            f,
            "--name",
            "gauge",
            "--rosette",
            "-120,-40,60",
            "--modulus",
            "30GPa",
            "--poisson",
            "0.25",
        ],
        vec![
            "project",
            "add-case",
            f,
            "--name",
            "slab",
            "--plane-stress",
            "sx=-8,sy=-3,txy=4",
        ],
        vec![
            "project",
            "combine",
            f,
            "--name",
            "service",
            "--factors",
            "gravity=1,anchor=1.5",
        ],
        vec![
            "project",
            "combine",
            f,
            "--name",
            "uplift",
            "--factors",
            "gravity=-0.4,anchor=2",
        ],
        vec![
            "project",
            "set-material",
            f,
            "--name",
            "invented sandstone",
            "--cohesion",
            "6",
            "--friction-angle",
            "35",
            "--tensile-strength",
            "2",
            "--compressive-strength",
            "40",
            "--yield-strength",
            "30",
        ],
        vec!["project", "set-pore-pressure", f, "8"],
        vec![
            "project",
            "set-plane-strength",
            f,
            "--cohesion",
            "0.5",
            "--friction-coefficient",
            "0.6",
        ],
        vec![
            "project",
            "set-cut-plane",
            f,
            "--dip",
            "55",
            "--dip-direction",
            "210",
        ],
        vec!["project", "set-measure", f, "slip-tendency"],
        vec![
            "project",
            "add-fault",
            f,
            "--fault",
            "J1=70/30",
            "--fault-strike",
            "bedding=100/12",
        ],
    ] {
        common::planewise_ok(&args);
    }
    file
}

fn demo_project() -> std::path::PathBuf {
    let file = temp("demo.json");
    planewise::study::save(&file, &planewise::study::Project::demo()).unwrap();
    file
}

fn json(args: &[&str]) -> serde_json::Value {
    serde_json::from_slice(&common::planewise_ok(args).stdout).unwrap()
}

fn cell(v: &serde_json::Value) -> String {
    v.as_f64().map_or_else(|| "—".to_owned(), |x| sig(x, 6))
}

/// Each case section of the report: its name and the verdict table's rows (criterion label →
/// utilization, factor of safety, strength-reduction factor cells).
/// A case section's verdict rows: criterion label and its [utilization, factor of safety,
/// strength-reduction factor] cells.
type VerdictCells = Vec<(String, [String; 3])>;

fn report_verdicts(html: &str) -> Vec<(String, VerdictCells)> {
    let doc = Html::parse_document(html);
    let section = Selector::parse("section.case").unwrap();
    let h2 = Selector::parse("h2").unwrap();
    let table = Selector::parse("table").unwrap();
    let tr = Selector::parse("tr").unwrap();
    let td = Selector::parse("td").unwrap();
    let th = Selector::parse("th").unwrap();
    let text = |e: scraper::ElementRef<'_>| e.text().collect::<String>();
    doc.select(&section)
        .map(|s| {
            let heading = text(s.select(&h2).next().unwrap());
            let name = heading.split_once(": ").unwrap().1.to_owned();
            let verdict = s
                .select(&table)
                .find(|t| t.select(&th).any(|h| text(h) == "stress judged"))
                .unwrap();
            let rows = verdict
                .select(&tr)
                .skip(1)
                .map(|r| {
                    let cells: Vec<String> = r.select(&td).map(text).collect();
                    let label = cells[0].split('[').next().unwrap().to_owned();
                    (
                        label,
                        [cells[5].clone(), cells[6].clone(), cells[7].clone()],
                    )
                })
                .collect();
            (name, rows)
        })
        .collect()
}

#[test]
fn analyze_the_report_the_envelope_and_the_window_agree() {
    for file in [rich_project(), demo_project()] {
        let f = file.to_str().unwrap();
        let (project, _) = planewise::study::load(&file).unwrap();
        let report = temp("same.html");
        common::planewise_ok(&["report", "--project", f, "--out", report.to_str().unwrap()]);
        let sections = report_verdicts(&std::fs::read_to_string(&report).unwrap());
        let envelope =
            |measure: &str| json(&["envelope", "--project", f, "--measure", measure, "--json"]);
        let von_mises = envelope("von-mises");
        let app = PlanewiseApp::new(
            project.clone(),
            Some(file.clone()),
            Settings::default(),
            Box::new(NoDialogs),
        );
        let mut h = Harness::builder()
            .with_size(egui::vec2(1600.0, 2400.0))
            .build_ui_state(|ui, app: &mut PlanewiseApp| app.show(ui), app);
        let names: Vec<String> = project
            .names()
            .iter()
            .map(|(n, _)| (*n).to_owned())
            .collect();
        assert_eq!(sections.len(), names.len());
        for name in &names {
            let a = json(&["analyze", "--project", f, "--case", name, "--json"]);
            // The report's verdict table.
            let (_, rows) = sections.iter().find(|(n, _)| n == name).unwrap();
            for c in a["criteria"].as_array().unwrap() {
                let label = planewise::mechanics::criteria::Criterion::ALL
                    .iter()
                    .find(|k| k.key() == c["name"])
                    .unwrap()
                    .label();
                let (_, [u, fos, srf]) = rows.iter().find(|(l, _)| l == label).unwrap();
                if c["condition"] == "defined" {
                    assert_eq!(
                        *u,
                        cell(&c["utilization"]),
                        "{f} {name} {label} utilization"
                    );
                }
                assert_eq!(
                    *fos,
                    cell(&c["factor_of_safety"]),
                    "{f} {name} {label} factor of safety"
                );
                if c["strength_reduction_factor"].is_number() {
                    assert_eq!(
                        *srf,
                        cell(&c["strength_reduction_factor"]),
                        "{f} {name} {label} F"
                    );
                }
                // The envelope of the criterion's utilization, when it is checked.
                if c["condition"] != "not-checked" {
                    let env = envelope(&format!("utilization-{}", c["name"].as_str().unwrap()));
                    let row = env["rows"]
                        .as_array()
                        .unwrap()
                        .iter()
                        .find(|r| r["name"] == *name)
                        .unwrap();
                    assert_eq!(
                        cell(&row["value"]),
                        cell(&c["utilization"]),
                        "{f} {name} envelope {label}"
                    );
                }
            }
            let row = von_mises["rows"]
                .as_array()
                .unwrap()
                .iter()
                .find(|r| r["name"] == *name)
                .unwrap();
            assert_eq!(
                cell(&row["value"]),
                cell(&a["von_mises"]),
                "{f} {name} von Mises"
            );
            // The window's verdict rows for the same case (three digits there).
            name.clone_into(&mut h.state_mut().project.active);
            h.run();
            for c in a["criteria"].as_array().unwrap() {
                if let (Some(u), Some(fos)) =
                    (c["utilization"].as_f64(), c["factor_of_safety"].as_f64())
                {
                    let shown = format!("U {} · factor of safety {}", sig(u, 3), sig(fos, 3));
                    assert!(
                        h.query_by_label(&shown).is_some(),
                        "{f} {name}: the window lacks '{shown}'"
                    );
                }
                if let (Some(r), Some(phi)) = (
                    c["strength_reduction_factor"].as_f64(),
                    c["mobilized_friction_angle_deg"].as_f64(),
                ) {
                    let shown = format!(
                        "strength reduction F {} · mobilized φ {}°",
                        sig(r, 3),
                        sig(phi, 3)
                    );
                    assert!(
                        h.query_by_label(&shown).is_some(),
                        "{f} {name}: the window lacks '{shown}'"
                    );
                }
            }
        }
    }
}
