//! The study layer: combinations superpose tensors, the envelope finds the governing case, the
//! project file round-trips and refuses what it cannot read, and `planewise project`,
//! `analyze --project` and `envelope` from outside.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

mod common;

use std::path::{Path, PathBuf};

use common::{assert_bad_input, planewise};
use planewise::mechanics::search::{Measure, SearchSettings};
use planewise::mechanics::{Analysis, SignConvention, StressTensor, StressUnit};
use planewise::study::{
    self, CaseInput, Combination, EnvelopeMeasure, LoadCase, Project, Term, TypedTensor,
};
use proptest::prelude::*;

fn case(name: &str, c: [f64; 6]) -> LoadCase {
    LoadCase {
        unknown: planewise::study::unknown::UnknownKeys::new(),
        name: name.to_owned(),
        description: String::new(),
        input: CaseInput::Tensor(TypedTensor {
            unit: "MPa".to_owned(),
            compression_positive: false,
            components: c,
        }),
    }
}

fn temp(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("planewise-study-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    dir.join(name)
}

fn no_plane() -> SearchSettings {
    SearchSettings {
        measure: Measure::Shear,
        convention: SignConvention::TensionPositive,
        pore_pressure_pa: 0.0,
        material: None,
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]

    /// Law: a combination's analysis is the analysis of the hand-summed tensor Σ fᵢ σᵢ
    /// (linear superposition of Cauchy stress; common practice, no source).
    #[test]
    fn combinations_superpose_tensors(
        a in prop::array::uniform6(-200.0..200.0_f64),
        b in prop::array::uniform6(-200.0..200.0_f64),
        fa in -2.0..2.0_f64,
        fb in -2.0..2.0_f64,
    ) {
        let mut p = Project::new("law", StressUnit::MPa, SignConvention::TensionPositive);
        p.add_case(case("a", a), false).unwrap();
        p.add_case(case("b", b), false).unwrap();
        p.add_combination(Combination { unknown: planewise::study::unknown::UnknownKeys::new(), name: "c".into(), terms: vec![
            Term { unknown: planewise::study::unknown::UnknownKeys::new(), case: "a".into(), factor: fa }, Term { unknown: planewise::study::unknown::UnknownKeys::new(), case: "b".into(), factor: fb }] }, false).unwrap();
        let sum: [f64; 6] = std::array::from_fn(|i| (fa * a[i] + fb * b[i]) * 1e6);
        let hand = Analysis::new(&StressTensor::from_pa(sum).unwrap(), SignConvention::TensionPositive);
        let ours = Analysis::new(&p.tensor("c").unwrap(), SignConvention::TensionPositive);
        for (x, y) in ours.principal.values_pa.iter().zip(hand.principal.values_pa) {
            prop_assert!((x - y).abs() <= 1e-9 * 1e6 * 800.0, "{x} vs {y}");
        }
        prop_assert!((ours.von_mises_pa - hand.von_mises_pa).abs() <= 1e-6);
    }

    /// Law: the envelope's governing row is the true worst over every case and combination
    /// (compared with a plain loop).
    #[test]
    fn the_envelope_governs_with_the_true_worst(
        cases in prop::collection::vec(prop::array::uniform6(-100.0..100.0_f64), 1..5),
        factor in -1.5..1.5_f64,
    ) {
        let mut p = Project::new("law", StressUnit::MPa, SignConvention::TensionPositive);
        for (i, c) in cases.iter().enumerate() {
            p.add_case(case(&format!("c{i}"), *c), false).unwrap();
        }
        p.add_combination(Combination { unknown: planewise::study::unknown::UnknownKeys::new(), name: "k".into(), terms: vec![Term { unknown: planewise::study::unknown::UnknownKeys::new(), case: "c0".into(), factor }] }, false).unwrap();
        for measure in [EnvelopeMeasure::VonMises, EnvelopeMeasure::Sigma3, EnvelopeMeasure::Plane(Measure::NormalMin)] {
            let env = study::envelope(&p, measure, &no_plane()).unwrap();
            let value = |name: &str| {
                let a = Analysis::new(&p.tensor(name).unwrap(), SignConvention::TensionPositive);
                match measure {
                    EnvelopeMeasure::VonMises => a.von_mises_pa,
                    _ => a.principal.values_pa[2],
                }
            };
            let names: Vec<&str> = p.names().into_iter().map(|(n, _)| n).collect();
            let brute = names.iter().map(|n| value(n)).fold(
                if measure == EnvelopeMeasure::VonMises { f64::NEG_INFINITY } else { f64::INFINITY },
                |m, v| if measure == EnvelopeMeasure::VonMises { m.max(v) } else { m.min(v) });
            let governing = env.governing.clone().unwrap();
            prop_assert!((value(&governing) - brute).abs() <= 1e-6, "{measure:?}: {governing}");
            prop_assert_eq!(env.rows.len(), names.len());
        }
    }
}

fn bracket() -> Project {
    let mut p = Project::new(
        "Invented bracket",
        StressUnit::MPa,
        SignConvention::TensionPositive,
    );
    p.add_case(case("dead", [40.0, -10.0, 0.0, 12.0, 0.0, 0.0]), false)
        .unwrap();
    p.add_case(case("live", [60.0, 5.0, 0.0, 30.0, 0.0, 0.0]), false)
        .unwrap();
    p.add_combination(
        Combination {
            unknown: planewise::study::unknown::UnknownKeys::new(),
            name: "ULS".into(),
            terms: vec![
                Term {
                    unknown: planewise::study::unknown::UnknownKeys::new(),
                    case: "dead".into(),
                    factor: 1.35,
                },
                Term {
                    unknown: planewise::study::unknown::UnknownKeys::new(),
                    case: "live".into(),
                    factor: 1.5,
                },
            ],
        },
        false,
    )
    .unwrap();
    p
}

#[test]
fn the_file_round_trips_and_refuses_what_it_cannot_read() {
    let path = temp("round.json");
    let p = bracket();
    study::save(&path, &p).unwrap();
    let (back, warnings) = study::load(&path).unwrap();
    assert_eq!(back, p);
    assert!(warnings.is_empty());
    // A file without the optional keys, and with a key this version does not know, loads with
    // a warning.
    let minimal = temp("minimal.json");
    std::fs::write(
        &minimal,
        r#"{"format_version": 1, "name": "m", "extra": 3}"#,
    )
    .unwrap();
    let (m, warnings) = study::load(&minimal).unwrap();
    assert_eq!(m.unit, "MPa");
    assert_eq!(warnings.len(), 1);
    assert!(warnings[0].contains("extra"));
    // A file as the first release of format 1 wrote it (before the shown case, the cut plane and
    // the measure were kept) loads with their defaults, and saving it back keeps its cases.
    let early = temp("early.json");
    std::fs::write(
        &early,
        r#"{"format_version": 1, "name": "early", "unit": "kPa", "compression_positive": true,
            "cases": [{"name": "a", "input": {"kind": "tensor", "unit": "kPa",
                       "compression_positive": true, "components": [1, 2, 3, 0, 0, 0]}}],
            "combinations": [{"name": "c", "terms": [{"case": "a", "factor": 2}]}],
            "notes": ""}"#,
    )
    .unwrap();
    let (e, warnings) = study::load(&early).unwrap();
    assert!(warnings.is_empty(), "{warnings:?}");
    assert_eq!(e.active_name(), Some("a"));
    assert_eq!(e.plane, planewise::mechanics::PlaneNormal::X);
    assert_eq!(e.measure, study::MeasureChoice::default());
    // Compression-positive kPa as typed: σxx = −1 kPa stored tension positive.
    let xx = e.tensor("c").unwrap().components_pa()[0];
    assert!((xx - -2000.0).abs() < 1e-9, "{xx}");
    study::save(&early, &e).unwrap();
    assert_eq!(study::load(&early).unwrap().0, e);
    // Refused, each with a message that names the file, and the file left as it was.
    let text = std::fs::read_to_string(&path).unwrap();
    for (name, content, says) in [
        ("empty.json", String::new(), "empty"),
        ("truncated.json", text[..text.len() / 2].to_owned(), "line"),
        (
            "not-json.json",
            "dead=1".to_owned(),
            "not a Planewise project",
        ),
        (
            "future.json",
            text.replace(
                &format!("\"format_version\": {}", study::FORMAT_VERSION),
                "\"format_version\": 99",
            ),
            "newer",
        ),
        (
            "unknown-case.json",
            text.replace("\"case\": \"live\"", "\"case\": \"wind\""),
            "'wind' is not a load case",
        ),
    ] {
        let f = temp(name);
        std::fs::write(&f, &content).unwrap();
        let e = study::load(&f).unwrap_err().to_string();
        assert!(e.contains(name) && e.contains(says), "{name}: {e}");
        assert_eq!(std::fs::read_to_string(&f).unwrap(), content);
    }
}

fn run_ok(args: &[&str]) -> String {
    let out = planewise(args);
    assert!(
        out.status.success(),
        "{args:?}: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    String::from_utf8(out.stdout).unwrap()
}

fn make_project(path: &Path) {
    let f = path.to_str().unwrap();
    let _ = std::fs::remove_file(path);
    run_ok(&["project", "new", f, "--name", "Invented bracket"]);
    run_ok(&[
        "project",
        "add-case",
        f,
        "--name",
        "dead",
        "--stress",
        "xx=40,yy=-10,xy=12",
    ]);
    run_ok(&[
        "project",
        "add-case",
        f,
        "--name",
        "live",
        "--stress",
        "xx=60,yy=5,xy=30",
    ]);
    run_ok(&[
        "project",
        "combine",
        f,
        "--name",
        "ULS",
        "--factors",
        "dead=1.35,live=1.5",
    ]);
    run_ok(&[
        "project",
        "combine",
        f,
        "--name",
        "uplift",
        "--factors",
        "dead=0.9,live=-1",
    ]);
}

#[test]
fn cli_builds_a_project_and_analyses_its_combinations() {
    let path = temp("cli.json");
    make_project(&path);
    let f = path.to_str().unwrap();
    let shown = run_ok(&["project", "show", f]);
    assert!(
        shown.contains("ULS") && shown.contains("1.35 × dead"),
        "{shown}"
    );
    // analyze --project --case equals analyze of the hand-summed tensor.
    let combo: serde_json::Value = serde_json::from_str(&run_ok(&[
        "analyze",
        "--project",
        f,
        "--case",
        "ULS",
        "--json",
    ]))
    .unwrap();
    let hand: serde_json::Value = serde_json::from_str(&run_ok(&[
        "analyze",
        "--stress",
        "xx=144,yy=-6,xy=61.2",
        "--json",
    ]))
    .unwrap();
    for i in 0..3 {
        let (a, b) = (
            combo["principal"]["values"][i].as_f64().unwrap(),
            hand["principal"]["values"][i].as_f64().unwrap(),
        );
        assert!((a - b).abs() < 1e-9, "{a} vs {b}");
    }
    let env: serde_json::Value = serde_json::from_str(&run_ok(&[
        "envelope",
        "--project",
        f,
        "--measure",
        "von-mises",
        "--json",
    ]))
    .unwrap();
    assert_eq!(env["governing"], "ULS");
    assert_eq!(env["rows"].as_array().unwrap().len(), 4);
    assert_eq!(env["rows"][0]["kind"], "combination");
    let values: Vec<f64> = env["rows"]
        .as_array()
        .unwrap()
        .iter()
        .map(|r| r["value"].as_f64().unwrap())
        .collect();
    assert!(values.windows(2).all(|w| w[0] >= w[1]), "{values:?}");
    let env: serde_json::Value = serde_json::from_str(&run_ok(&[
        "envelope",
        "--project",
        f,
        "--measure",
        "shear",
        "--json",
    ]))
    .unwrap();
    assert!(env["rows"][0]["planes"].as_array().is_some());
    let text = run_ok(&["envelope", "--project", f, "--measure", "sigma3"]);
    assert!(text.contains("← governs"), "{text}");
    // Every state-taking subcommand reads a case or combination the same way, and gives the
    // same result as for the hand-summed tensor.
    let worst = |state: &[&str]| {
        let mut args = vec!["worst-plane", "--measure", "shear", "--json"];
        args.extend_from_slice(state);
        let j: serde_json::Value = serde_json::from_str(&run_ok(&args)).unwrap();
        j["value"].as_f64().unwrap()
    };
    let a = worst(&["--project", f, "--case", "ULS"]);
    let b = worst(&["--stress", "xx=144,yy=-6,xy=61.2"]);
    assert!((a - b).abs() < 1e-9, "{a} vs {b}");
    let svg = temp("uls.svg");
    for sub in [&["figure"][..], &["map", "--measure", "shear"], &["mohr"]] {
        let mut args = sub.to_vec();
        args.extend_from_slice(&[
            "--project",
            f,
            "--case",
            "ULS",
            "--out",
            svg.to_str().unwrap(),
        ]);
        run_ok(&args);
        assert!(std::fs::read_to_string(&svg).unwrap().contains("<svg"));
    }
}

#[test]
fn cli_bad_input_names_the_file_and_leaves_it_alone() {
    let path = temp("bad.json");
    make_project(&path);
    let f = path.to_str().unwrap();
    let before = std::fs::read(&path).unwrap();
    let missing = temp("missing.json");
    let missing = missing.to_str().unwrap();
    assert_bad_input(
        "project",
        &[
            (
                &["add-case", missing, "--name", "x", "--stress", "xx=1"],
                "missing.json",
            ),
            (
                &["add-case", f, "--name", "dead", "--stress", "xx=1"],
                "already used",
            ),
            (&["add-case", f, "--name", "x", "--stress", ""], "--stress"),
            (
                &["combine", f, "--name", "c", "--factors", "wind=1"],
                "'wind' is not a load case",
            ),
            (
                &["combine", f, "--name", "c", "--factors", "c=1"],
                "names itself",
            ),
            (
                &["combine", f, "--name", "c2", "--factors", "ULS=1"],
                "'ULS' is not a load case",
            ),
            (
                &["combine", f, "--name", "c", "--factors", "dead=abc"],
                "--factors",
            ),
            (&["new", f], "already exists"),
        ],
    );
    assert_bad_input(
        "analyze",
        &[
            (
                &["--project", f, "--case", "wind"],
                "no load case or combination named 'wind'",
            ),
            (&["--project", missing, "--case", "dead"], "missing.json"),
            (
                &["--project", f, "--case", "dead", "--stress", "xx=1"],
                "--stress",
            ),
        ],
    );
    assert_bad_input(
        "envelope",
        &[
            (&["--project", f, "--measure", "wobble"], "--measure"),
            (&["--project", f, "--measure", "mohr-coulomb"], "--measure"),
            (
                &["--project", f, "--measure", "shear", "--pore-pressure", "3"],
                "--pore-pressure",
            ),
        ],
    );
    assert_eq!(
        std::fs::read(&path).unwrap(),
        before,
        "the file was changed"
    );
    let future = temp("future-cli.json");
    std::fs::write(&future, "{\"format_version\": 7, \"name\": \"x\"}").unwrap();
    assert_bad_input("project", &[(&["show", future.to_str().unwrap()], "newer")]);
}

#[test]
fn a_save_killed_at_any_moment_leaves_a_file_that_loads() {
    let path = temp("killed.json");
    make_project(&path);
    let f = path.to_str().unwrap();
    for i in 0..30_u64 {
        let mut child = std::process::Command::new(env!("CARGO_BIN_EXE_planewise"))
            .args([
                "project",
                "add-case",
                f,
                "--name",
                "dead",
                "--replace",
                "--stress",
                &format!("xx={i},xy=3"),
            ])
            .stdout(std::process::Stdio::null())
            .spawn()
            .unwrap();
        // Kill after 0 to ~3 ms: before, during or after the write.
        std::thread::sleep(std::time::Duration::from_micros((i * 997) % 3000));
        let _ = child.kill();
        let _ = child.wait();
        let (p, _) = study::load(&path).unwrap();
        assert_eq!(p.cases.len(), 2);
    }
}
