//! The walk-through: six steps whose sentences carry the state's numbers, equal to those of
//! `planewise analyze --json` to the digits shown; `planewise explain` writes six numbered
//! figures and an HTML page with the captions; no texts overlap in its figures.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

mod common;

use common::{planewise, planewise_ok};
use planewise::output::walkthrough::{StepKind, steps};
use planewise::picture::draw::Sizes;
use planewise::picture::draw::place::overlapping_texts;
use planewise::study::{Derived, Project};
use planewise::text::format::sig;

fn demo_case(name: &str) -> Derived {
    let mut p = Project::demo();
    name.clone_into(&mut p.active);
    Derived::new(&p)
}

/// The principal values `analyze --json` prints for the demo's ULS 1, shown to 4 digits.
fn principal_from_analyze() -> Vec<String> {
    let out = planewise_ok(&[
        "analyze",
        "--project",
        "assets/demo-bracket-project.json",
        "--case",
        "ULS 1",
        "--json",
    ]);
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    v["principal"]["values"]
        .as_array()
        .unwrap()
        .iter()
        // Written for a person: a true minus sign.
        .map(|x| format!("{} MPa", sig(x.as_f64().unwrap(), 4).replace('-', "−")))
        .collect()
}

#[test]
fn the_six_steps_speak_the_numbers_of_analyze() {
    let d = demo_case("ULS 1");
    let all = steps(&d);
    let kinds: Vec<StepKind> = all.iter().map(|s| s.kind).collect();
    assert_eq!(
        kinds,
        [
            StepKind::Element,
            StepKind::CutPlane,
            StepKind::Principal,
            StepKind::MaxShear,
            StepKind::Worst,
            StepKind::Verdict
        ]
    );
    let principal = principal_from_analyze();
    let text = &all[2].text;
    for p in &principal {
        assert!(text.contains(p.as_str()), "{p} not in {text}");
    }
    // The principal step shows the σ1 plane: no shear on it.
    let plane = all[2].plane;
    let ps = planewise::mechanics::PlaneStress::new(
        &d.tensor,
        plane,
        planewise::mechanics::SignConvention::TensionPositive,
    );
    assert!(ps.shear_stress_pa < 1e-6 * ps.traction_pa.norm());
    // The largest-shear step's plane carries τmax = (σ1 − σ3)/2 (common practice, no source
    // needed: the radius of the largest Mohr circle).
    let ps = planewise::mechanics::PlaneStress::new(
        &d.tensor,
        all[3].plane,
        planewise::mechanics::SignConvention::TensionPositive,
    );
    let [s1, _, s3] = d.analysis.principal.values_pa;
    assert!((ps.shear_stress_pa - 0.5 * (s1 - s3)).abs() < 1e-6 * s1.abs());
    // The element step names every component; the verdict step says pass or fail.
    assert!(all[0].text.contains("σxx = 133.8 MPa"), "{}", all[0].text);
    assert!(all[5].text.contains("it passes"), "{}", all[5].text);
}

#[test]
fn no_texts_overlap_in_the_walkthrough_figures() {
    let mut bad = Vec::new();
    for name in ["dead", "live", "thermal", "ULS 1", "ULS 2"] {
        let d = demo_case(name);
        for step in steps(&d) {
            let (w, h) = (1280, 900);
            let sizes = Sizes::for_export(w as f32, h as f32);
            let lines = vec![step.title.clone(), step.text.clone()];
            let frame = planewise::picture::caution::with_caution(
                &planewise::picture::figures::titled(&lines, sizes.text, [w, h], |h| {
                    planewise::output::walkthrough::step_figure(&d, &step, w, h, sizes)
                }),
            );
            for (a, b) in overlapping_texts(&frame) {
                bad.push(format!("{name}, {:?}: {a:?} overlaps {b:?}", step.kind));
            }
        }
    }
    assert!(bad.is_empty(), "{}", bad.join("\n"));
}

#[test]
fn explain_writes_numbered_figures_and_a_page_with_the_captions() {
    let dir = std::env::temp_dir().join(format!("planewise-explain-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    planewise_ok(&[
        "explain",
        "--project",
        "assets/demo-bracket-project.json",
        "--case",
        "ULS 1",
        "--out",
        dir.to_str().unwrap(),
    ]);
    for name in [
        "01-element.svg",
        "02-cut-plane.svg",
        "03-principal-planes.svg",
        "04-largest-shear.svg",
        "05-worst-plane.svg",
        "06-verdict.svg",
    ] {
        let svg = std::fs::read_to_string(dir.join(name)).unwrap();
        assert!(
            svg.starts_with("<?xml") || svg.starts_with("<svg"),
            "{name}"
        );
        assert!(svg.contains("Planewise is an aid for engineers"), "{name}");
    }
    let html = std::fs::read_to_string(dir.join("index.html")).unwrap();
    for p in principal_from_analyze() {
        assert!(html.contains(&p), "{p} not in the page");
    }
    assert!(html.contains("src=\"03-principal-planes.svg\""));
    assert!(!html.contains("<script"));

    // From --stress too, and bad input named.
    planewise_ok(&[
        "explain",
        "--stress",
        "xx=50",
        "--out",
        dir.join("uniaxial").to_str().unwrap(),
        "--format",
        "png",
    ]);
    assert!(dir.join("uniaxial/06-verdict.png").exists());
    let out = planewise(&[
        "explain",
        "--project",
        "assets/demo-bracket-project.json",
        "--case",
        "no such case",
        "--out",
        dir.to_str().unwrap(),
    ]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("--case"));
}

/// Each step's camera shows the vectors it talks about near full length: in orthographic
/// projection a unit vector v is seen sqrt(1 − (e·v)²) long, e towards the eye; at least 60 %
/// for the plane's normal, its shear direction and the traction (cut plane, largest shear,
/// worst plane) and for σ1's and σ3's directions (principal planes), for every demo case and
/// combination. The traction t = σ·n and τ = t − σn·n: Cauchy's formula (any mechanics text).
#[test]
fn each_step_sees_its_vectors_near_full_length() {
    use planewise::mechanics::PlaneNormal;
    let project = Project::demo();
    let names: Vec<String> = project
        .cases
        .iter()
        .map(|c| c.name.clone())
        .chain(project.combinations.iter().map(|c| c.name.clone()))
        .collect();
    let seen = |e: &nalgebra::Vector3<f64>, v: &nalgebra::Vector3<f64>| {
        let u = v.normalize();
        (1.0 - e.dot(&u).powi(2)).max(0.0).sqrt()
    };
    for name in &names {
        let d = demo_case(name);
        let m = d.tensor.matrix_pa();
        let plane_vectors = |n: &PlaneNormal| {
            let n = n.vector();
            let t = m * n;
            let tau = t - n * n.dot(&t);
            let mut out = vec![("n", n), ("t", t)];
            // A shear below 1e-6 of the traction has no direction to see.
            if tau.norm() > 1e-6 * t.norm() {
                out.push(("τ", tau));
            }
            out
        };
        for step in steps(&d) {
            let e = step.camera.towards_eye();
            let vectors: Vec<(&str, nalgebra::Vector3<f64>)> = match step.kind {
                StepKind::CutPlane | StepKind::MaxShear | StepKind::Worst => {
                    plane_vectors(&step.plane)
                }
                StepKind::Principal => vec![
                    ("n1", d.analysis.principal.directions[0]),
                    ("n3", d.analysis.principal.directions[2]),
                ],
                _ => continue,
            };
            for (what, v) in vectors {
                if v.norm() == 0.0 {
                    continue;
                }
                let fraction = seen(&e, &v);
                assert!(
                    fraction >= 0.6,
                    "{name}, step {:?}: {what} seen at {:.0} % of its length",
                    step.kind,
                    100.0 * fraction
                );
            }
        }
    }
}

/// The worst-plane step says each quantity once (with the shear measure, τ is the value; the
/// step does not repeat it), and names the measure as the trade writes it.
#[test]
fn the_worst_plane_step_says_each_quantity_once() {
    for name in ["dead", "ULS 1"] {
        let d = demo_case(name);
        let step = steps(&d)
            .into_iter()
            .find(|s| s.kind == StepKind::Worst)
            .unwrap();
        assert_eq!(
            d.search.measure,
            planewise::mechanics::search::Measure::Shear
        );
        assert_eq!(step.text.matches("τ =").count(), 1, "{}", step.text);
        assert_eq!(step.text.matches("σn =").count(), 1, "{}", step.text);
        assert!(step.title.contains("shear stress τ"), "{}", step.title);
    }
}
