//! Captions and pinned notes: kept in the project file, following renames, leaving with a
//! deleted case, refused when they name nothing, drawn at their pin in every figure (in the
//! shown sign convention), and written into exports, `planewise mohr --project` and the report,
//! escaped. Numbers here are an invented fixture, not check values.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

mod common;

use common::planewise_ok;
use planewise::mechanics::{SignConvention, StressUnit};
use planewise::picture::draw::mohr::MohrLayout;
use planewise::picture::draw::{Prim, Sizes};
use planewise::picture::figures::{self, FigureInput};
use planewise::study::annotations::{Annotation, FigureKind, Pin};
use planewise::study::{CaseInput, Derived, Edit, LoadCase, Project, TypedTensor};

fn project() -> Project {
    let mut p = Project::new(
        "Invented notes test",
        StressUnit::MPa,
        SignConvention::TensionPositive,
    );
    p.add_case(
        LoadCase {
            unknown: planewise::study::unknown::UnknownKeys::new(),
            name: "lift".to_owned(),
            description: String::new(),
            input: CaseInput::Tensor(TypedTensor {
                unit: "MPa".to_owned(),
                compression_positive: false,
                components: [80.0, -20.0, 10.0, 30.0, 0.0, 5.0],
            }),
        },
        false,
    )
    .unwrap();
    p.annotations = vec![
        Annotation::note(
            "lift",
            Pin::Mohr {
                normal_stress_pa: -10e6,
                shear_stress_pa: 20e6,
            },
            "weld toe <b>&</b> \"Ω\"",
        ),
        Annotation::note(
            "lift",
            Pin::Pole {
                normal: [0.0, 0.6, -0.8],
            },
            "joint set J2",
        ),
        Annotation::note(
            "lift",
            Pin::Space {
                at: [0.3, 0.3, 0.4],
            },
            "corner",
        ),
        Annotation::caption("lift", FigureKind::Mohr, "Lifting lug, invented <script>"),
    ];
    p
}

fn temp(name: &str) -> std::path::PathBuf {
    let dir = std::env::temp_dir().join(format!("planewise-notes-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    dir.join(name)
}

fn texts(frame: &planewise::picture::draw::Frame) -> Vec<(String, [f32; 2])> {
    frame
        .prims
        .iter()
        .filter_map(|p| match p {
            Prim::Text { text, at, .. } => Some((text.clone(), *at)),
            _ => None,
        })
        .collect()
}

#[test]
fn notes_round_trip_through_the_file_follow_renames_and_leave_with_their_case() {
    let p = project();
    let path = temp("notes.planewise.json");
    planewise::study::save(&path, &p).unwrap();
    let (back, warnings) = planewise::study::load(&path).unwrap();
    assert!(warnings.is_empty(), "{warnings:?}");
    assert_eq!(back, p);

    let renamed = Edit::Rename {
        from: "lift".into(),
        to: "lift 2 t".into(),
    }
    .apply(&p)
    .unwrap();
    assert!(renamed.annotations.iter().all(|a| a.case == "lift 2 t"));

    let mut two = p.clone();
    two.add_case(
        LoadCase {
            unknown: planewise::study::unknown::UnknownKeys::new(),
            name: "wind".to_owned(),
            description: String::new(),
            input: CaseInput::Tensor(TypedTensor {
                unit: "MPa".to_owned(),
                compression_positive: false,
                components: [0.0; 6],
            }),
        },
        false,
    )
    .unwrap();
    let deleted = Edit::Delete("lift".into()).apply(&two).unwrap();
    assert!(deleted.annotations.is_empty());
}

#[test]
fn notes_that_name_nothing_or_the_wrong_figure_are_refused() {
    let p = project();
    let stray = Annotation::caption("no such case", FigureKind::Map, "x");
    assert!(Edit::SetAnnotations(vec![stray]).apply(&p).is_err());
    let mut crossed = Annotation::note(
        "lift",
        Pin::Pole {
            normal: [0.0, 0.0, 1.0],
        },
        "x",
    );
    crossed.figure = FigureKind::Mohr;
    assert!(Edit::SetAnnotations(vec![crossed]).apply(&p).is_err());
}

#[test]
fn a_mohr_note_sits_at_its_stress_point_in_either_sign_convention() {
    for compression_positive in [false, true] {
        let mut p = project();
        p.compression_positive = compression_positive;
        let d = Derived::new(&p);
        let input = FigureInput::from_derived(&d, false);
        let (w, h) = (1100, 750);
        let frame = figures::mohr(&input, w, h, Sizes::default());
        let layout = MohrLayout::new(
            &figures::mohr_figure(&input),
            w as f32,
            h as f32,
            Sizes::default(),
        );
        // Pinned at σn = −10 MPa tension positive: +10 MPa on a compression-positive diagram.
        let shown_sn = if compression_positive { 10e6 } else { -10e6 };
        let pin = layout.to_px(shown_sn, 20e6);
        let text = Sizes::default().text;
        let (_, at) = texts(&frame)
            .into_iter()
            .find(|(t, _)| t.starts_with("weld toe"))
            .unwrap();
        let expected = [pin[0] + 1.5 * text, pin[1] - 2.0 * text];
        assert!(
            (at[0] - expected[0]).abs() < 0.01 && (at[1] - expected[1]).abs() < 0.01,
            "note at {at:?}, expected {expected:?}"
        );
        // Each note goes on its own figure only.
        assert!(!texts(&frame).iter().any(|(t, _)| t == "joint set J2"));
        let map = figures::map(&input, &d.search, 64, w, h, Sizes::default());
        assert!(texts(&map).iter().any(|(t, _)| t == "joint set J2"));
        let view = figures::view_3d(
            &input,
            planewise::picture::scene::Layers::default(),
            planewise::picture::scene::FaceChoice::default(),
            &planewise::picture::draw::camera::Camera::default(),
            w,
            h,
            Sizes::default(),
        );
        assert!(texts(&view).iter().any(|(t, _)| t == "corner"));
    }
}

#[test]
fn the_command_line_and_the_report_write_notes_and_captions_escaped() {
    let path = temp("cli-notes.planewise.json");
    planewise::study::save(&path, &project()).unwrap();
    let svg = temp("notes-mohr.svg");
    planewise_ok(&[
        "mohr",
        "--project",
        path.to_str().unwrap(),
        "--case",
        "lift",
        "--out",
        svg.to_str().unwrap(),
    ]);
    let text = std::fs::read_to_string(&svg).unwrap();
    assert!(
        text.contains("weld toe &lt;b&gt;&amp;&lt;/b&gt; &quot;Ω&quot;"),
        "{text}"
    );
    assert!(text.contains("Lifting lug, invented &lt;script&gt;"));
    assert!(!text.contains("<script"));

    let report = planewise::output::report::html(
        &project(),
        &planewise::output::report::ReportOptions {
            cases: Vec::new(),
            figures: vec![planewise::output::report::ReportFigure::Mohr],
            date: "2026-12-03".into(),
            source: None,
            tables: None,
        },
    )
    .unwrap();
    assert!(report.contains("Lifting lug, invented &lt;script&gt;"));
    assert!(report.contains("weld toe &lt;b&gt;"));
    assert!(!report.contains("<script"));
}

/// A load case taken from a table row says where it came from in the report, escaped.
#[test]
fn the_report_names_a_table_rows_file_and_line() {
    let mut p = project();
    p.add_case(
        LoadCase {
            unknown: planewise::study::unknown::UnknownKeys::new(),
            name: "row 7 of mesh.csv".to_owned(),
            description: String::new(),
            input: CaseInput::TableRow(planewise::study::TableRowInput {
                file: "runs/<b>mesh</b>.csv".into(),
                line: 7,
                id: "E&5".into(),
                stress: TypedTensor {
                    unit: "MPa".to_owned(),
                    compression_positive: false,
                    components: [1.0, 2.0, 3.0, 0.0, 0.0, 0.0],
                },
            }),
        },
        false,
    )
    .unwrap();
    let report = planewise::output::report::html(
        &p,
        &planewise::output::report::ReportOptions {
            cases: vec!["row 7 of mesh.csv".into()],
            figures: Vec::new(),
            date: "2026-12-03".into(),
            source: None,
            tables: None,
        },
    )
    .unwrap();
    assert!(
        report.contains("Taken from the table runs/&lt;b&gt;mesh&lt;/b&gt;.csv, line 7 (E&amp;5)."),
        "{report}"
    );
}
