//! The calculation report, read back with an HTML parser: inputs, principal values, von Mises,
//! each criterion's utilization and the caution are there with the numbers `analyze --json`
//! gives; figures are inline SVG; nothing points to the web; nothing from a project file can
//! become markup or script.

#![allow(
    clippy::unwrap_used,
    reason = "a test that cannot compute its reference should panic loudly"
)]

mod common;

use planewise::output::report::{ReportFigure, ReportOptions, html};
use planewise::study::{CaseInput, Combination, LoadCase, Project, Term, TypedTensor};
use planewise::text::format::readable;
use scraper::{Html, Selector};

fn text_of(doc: &Html) -> String {
    doc.root_element().text().collect::<Vec<_>>().join(" ")
}

fn options() -> ReportOptions {
    ReportOptions {
        cases: Vec::new(),
        figures: vec![ReportFigure::View3d, ReportFigure::Map, ReportFigure::Mohr],
        date: "2026-12-02".to_owned(),
        source: None,
        tables: None,
    }
}

#[test]
fn the_report_holds_the_numbers_analyze_gives() {
    let project = Project::demo();
    let report = html(&project, &options()).unwrap();
    let doc = Html::parse_document(&report);
    let text = text_of(&doc);
    assert!(text.contains(planewise::SAFETY_NOTE), "no caution");
    for heading in [
        "Prepared by",
        "Checked by",
        "Scope and cautions",
        "Conventions and units",
        "Envelope",
        "Formulas and sources",
    ] {
        assert!(text.contains(heading), "missing {heading}");
    }
    let path = std::env::temp_dir().join(format!("planewise-report-{}.json", std::process::id()));
    planewise::study::save(&path, &project).unwrap();
    for (name, _) in project.names() {
        let out = common::planewise(&[
            "analyze",
            "--project",
            path.to_str().unwrap(),
            "--case",
            name,
            "--yield-strength",
            "275",
            "--json",
        ]);
        assert!(
            out.status.success(),
            "{}",
            String::from_utf8_lossy(&out.stderr)
        );
        let j: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
        // Every principal value, von Mises and the von Mises utilization, as the report prints
        // them (six significant digits, a true minus sign).
        for v in j["principal"]["values"].as_array().unwrap() {
            let shown = readable(v.as_f64().unwrap(), 6);
            assert!(text.contains(&shown), "{name}: σ {shown} missing");
        }
        let vm = readable(j["von_mises"].as_f64().unwrap(), 6);
        assert!(text.contains(&vm), "{name}: von Mises {vm} missing");
        let u = j["criteria"]
            .as_array()
            .unwrap()
            .iter()
            .find(|c| c["name"] == "von-mises")
            .unwrap()["utilization"]
            .as_f64()
            .unwrap();
        assert!(
            text.contains(&readable(u, 6)),
            "{name}: utilization {u} missing"
        );
        // Typed input values of load cases.
        if let Some(case) = project.case(name) {
            for v in case.input.numbers() {
                assert!(text.contains(&readable(v, 10)), "{name}: input {v} missing");
            }
        }
    }
    // Numbers in the tables are written with a true minus sign (U+2212), never a hyphen.
    for cell in doc.select(&Selector::parse("td.num").unwrap()) {
        let t: String = cell.text().collect();
        assert!(!t.contains('-'), "hyphen-minus in the number cell {t:?}");
    }
    // Figures are inline SVG, three per case and combination.
    let svgs = doc.select(&Selector::parse("figure svg").unwrap()).count();
    assert_eq!(svgs, 3 * project.names().len());
    assert!(!report.contains("http://") && !report.contains("https://"));
    assert!(!report.to_lowercase().contains("<script"));
    let _ = std::fs::remove_file(path);
}

#[test]
fn text_from_a_project_file_stays_text() {
    let hostile = "<script>alert('x')</script> & \"quoted\" Ünïcødé 応力 <b>bold</b>";
    let mut p = Project::new(
        hostile,
        planewise::mechanics::StressUnit::MPa,
        planewise::mechanics::SignConvention::TensionPositive,
    );
    p.notes = hostile.to_owned();
    p.material.name = hostile.to_owned();
    p.add_case(
        LoadCase {
            unknown: planewise::study::unknown::UnknownKeys::new(),
            name: "case <i>1</i> & \"a\"".to_owned(),
            description: hostile.to_owned(),
            input: CaseInput::Tensor(TypedTensor {
                unit: "MPa".to_owned(),
                compression_positive: false,
                components: [10.0, 0.0, 0.0, 0.0, 0.0, 0.0],
            }),
        },
        false,
    )
    .unwrap();
    p.add_combination(
        Combination {
            unknown: planewise::study::unknown::UnknownKeys::new(),
            name: "combo <svg onload>".to_owned(),
            terms: vec![Term {
                unknown: planewise::study::unknown::UnknownKeys::new(),
                case: "case <i>1</i> & \"a\"".to_owned(),
                factor: 1.5,
            }],
        },
        false,
    )
    .unwrap();
    let report = html(&p, &options()).unwrap();
    assert!(
        !report.to_lowercase().contains("<script"),
        "a script element got through"
    );
    assert!(!report.contains("<b>bold"), "markup got through");
    assert!(!report.contains("<svg onload"), "markup got through");
    assert!(!report.contains("<i>1"), "markup got through");
    let doc = Html::parse_document(&report);
    let text = text_of(&doc);
    // The text reads as typed.
    assert!(
        text.contains(hostile),
        "the project name does not read as typed"
    );
    assert!(text.contains("combo <svg onload>"));
    assert!(doc.select(&Selector::parse("b").unwrap()).next().is_none());
    assert!(
        doc.select(&Selector::parse("script").unwrap())
            .next()
            .is_none()
    );
}

#[test]
fn the_command_line_writes_the_report_and_refuses_bad_input() {
    let out = std::env::temp_dir().join(format!("planewise-report-{}.html", std::process::id()));
    let r = common::planewise(&[
        "report",
        "--project",
        "assets/demo-bracket-project.json",
        "--out",
        out.to_str().unwrap(),
        "--cases",
        "ULS 1,dead",
        "--figures",
        "mohr",
    ]);
    assert!(r.status.success(), "{}", String::from_utf8_lossy(&r.stderr));
    let text = std::fs::read_to_string(&out).unwrap();
    let doc = Html::parse_document(&text);
    let cases: Vec<String> = doc
        .select(&Selector::parse("section.case h2").unwrap())
        .map(|h| h.text().collect())
        .collect();
    assert_eq!(cases, ["Combination: ULS 1", "Load case: dead"]);
    common::assert_bad_input(
        "report",
        &[
            (
                &[
                    "--project",
                    "assets/demo-bracket-project.json",
                    "--out",
                    "r.pdf",
                ],
                "--out",
            ),
            (
                &[
                    "--project",
                    "assets/demo-bracket-project.json",
                    "--out",
                    "r.html",
                    "--cases",
                    "wind",
                ],
                "--cases",
            ),
            (
                &["--project", "no-such.json", "--out", "r.html"],
                "--project",
            ),
            (
                &[
                    "--project",
                    "assets/demo-bracket-project.json",
                    "--out",
                    "r.html",
                    "--figures",
                    "pie",
                ],
                "--figures",
            ),
        ],
    );
    let _ = std::fs::remove_file(out);
}
