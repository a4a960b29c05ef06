//! Fatigue on the critical plane: long-life criteria in closed form for proportional loading,
//! the path methods on a non-harmonic path, the search against brute force, and Miner's sum for
//! block loading worked by hand.
//!
//! The closed forms are derived here from Mohr's circle and each criterion's definition (see
//! src/mechanics/fatigue/criteria.rs); they are "derived, no published value" unless a source is
//! named beside them.

#![allow(clippy::unwrap_used, reason = "tests")]

mod common;

use std::f64::consts::PI;

use nalgebra::Vector3;
use planewise::mechanics::fatigue::critical::{sweep, value_on};
use planewise::mechanics::fatigue::life::damage_plane;
use planewise::mechanics::fatigue::{
    Constants, Criterion, FatigueLimits, PathMethod, SearchSettings, SnCurve, StressHistory,
    critical_plane,
};
use proptest::prelude::*;

const MPA: f64 = 1e6;

/// A steel-like pair of limits (invented for the tests): f₋₁ = 300 MPa, t₋₁ = 200 MPa,
/// σu = 700 MPa.
fn limits() -> FatigueLimits {
    FatigueLimits {
        bending_pa: Some(300.0 * MPA),
        torsion_pa: 200.0 * MPA,
        tensile_strength_pa: Some(700.0 * MPA),
    }
}

/// Fully reversed in-phase σxx = σa sin ωt, τxy = τa sin ωt over one period (`steps` samples).
fn in_phase(sigma_a: f64, tau_a: f64, steps: usize) -> StressHistory {
    out_of_phase(sigma_a, tau_a, 0.0, steps)
}

/// σxx = σa sin ωt, τxy = τa sin(ωt − δ) (δ in degrees).
fn out_of_phase(sigma_a: f64, tau_a: f64, delta_deg: f64, steps: usize) -> StressHistory {
    let time: Vec<f64> = (0..=steps).map(|i| i as f64 / steps as f64).collect();
    let tensors = time
        .iter()
        .map(|t| {
            let w = 2.0 * PI * t;
            [
                sigma_a * w.sin(),
                0.0,
                0.0,
                tau_a * (w - delta_deg.to_radians()).sin(),
                0.0,
                0.0,
            ]
        })
        .collect();
    StressHistory::new(time, tensors).unwrap()
}

fn utilization(criterion: Criterion, h: &StressHistory, method: PathMethod) -> f64 {
    let c = Constants::derive(criterion, &limits()).unwrap();
    critical_plane(h, &c, method, &SearchSettings::default()).utilization
}

#[test]
fn each_criterion_sits_at_its_limit_in_both_calibration_tests() {
    // Fully reversed torsion at t₋₁ and tension at f₋₁ (a quarter-degree sampling of the
    // period hits the peaks exactly): utilization 1 by the calibration (derived).
    let torsion = in_phase(0.0, 200.0 * MPA, 360);
    let tension = in_phase(300.0 * MPA, 0.0, 360);
    for criterion in [Criterion::Findley, Criterion::Matake, Criterion::DangVan] {
        for method in [PathMethod::Circle, PathMethod::Chord] {
            for (name, h) in [("torsion", &torsion), ("tension", &tension)] {
                let u = utilization(criterion, h, method);
                // Matake's value is read on the plane of largest τa, where τa is flat (second
                // order in the plane's error) but σn is not (first order): the search ties τa
                // to a relative 1e-9, which leaves the value good to about 1e-5.
                let tolerance = if criterion.plane_of_largest_shear() {
                    1e-5
                } else {
                    1e-6
                };
                assert!(
                    (u - 1.0).abs() < tolerance,
                    "{criterion:?} {method:?} {name}: {u}"
                );
            }
        }
    }
    // McDiarmid is calibrated on torsion only.
    let u = utilization(Criterion::McDiarmid, &torsion, PathMethod::Circle);
    assert!((u - 1.0).abs() < 1e-6, "{u}");
}

#[test]
fn in_phase_tension_torsion_in_closed_form() {
    // σxx = σa sin ωt, τxy = τa sin ωt. On a plane whose normal lies in the xy plane the path is
    // a segment; with R = √((σa/2)² + τa²) and ψ = 2φ + δ (sin δ = σa/(2R)) its shear amplitude
    // is R|cos ψ| and its largest normal stress |σa/2 + R sin ψ| (Mohr's circle). Hence
    // (derived, no published value):
    //   Findley:   max over ψ of R|cos ψ| + k(σa/2 + R sin ψ) = R√(1 + k²) + kσa/2
    //   Matake:    on ψ = 0: R + μσa/2;  McDiarmid: R + t₋₁/(2σu)·σa/2
    //   Dang Van:  at the peak, the largest shear R and σH = σa/3: R + ασa/3
    let (sa, ta) = (180.0 * MPA, 90.0 * MPA);
    let h = in_phase(sa, ta, 360);
    let r = (0.25 * sa * sa + ta * ta).sqrt();
    for criterion in Criterion::ALL {
        let c = Constants::derive(criterion, &limits()).unwrap();
        let k = c.coefficient;
        let expected = match criterion {
            Criterion::Findley => r * (1.0 + k * k).sqrt() + 0.5 * k * sa,
            Criterion::Matake | Criterion::McDiarmid => r + 0.5 * k * sa,
            Criterion::DangVan => r + k * sa / 3.0,
        };
        let got = critical_plane(&h, &c, PathMethod::Circle, &SearchSettings::default());
        assert!(
            (got.value.value_pa - expected).abs() < 1e-6 * expected,
            "{criterion:?}: {} vs {expected}",
            got.value.value_pa
        );
        assert!((got.utilization - expected / c.limit_pa).abs() < 1e-6);
        // The critical plane contains z (the intermediate principal direction, zero stress).
        assert!(
            got.normal[2].abs() < 1e-3,
            "{criterion:?}: {:?}",
            got.normal
        );
    }
}

#[test]
fn a_triangular_shear_path_separates_circle_and_chord_by_root3_over_2() {
    // Shear on the horizontal plane (τzx, τyz) traced around an equilateral triangle of side
    // 200 MPa, no normal stress: the circle's radius is side/√3, the chord's half-length side/2
    // (derived, no published value; Bernasconi & Papadopoulos 2005 show the chord falling short
    // on such paths).
    let side = 200.0 * MPA;
    let corners = [
        [0.0, 0.0],
        [side, 0.0],
        [0.5 * side, 0.5 * side * 3f64.sqrt()],
    ];
    let mut tensors = Vec::new();
    for e in 0..3 {
        let (a, b) = (corners[e], corners[(e + 1) % 3]);
        for k in 0..30 {
            let t = f64::from(k) / 30.0;
            let (zx, yz) = (a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1]));
            tensors.push([0.0, 0.0, 0.0, 0.0, yz, zx]);
        }
    }
    let time = (0..tensors.len()).map(|i| i as f64).collect();
    let h = StressHistory::new(time, tensors).unwrap();
    let c = Constants::derive(Criterion::Matake, &limits()).unwrap();
    let z = Vector3::z();
    let circle = value_on(&h, &c, PathMethod::Circle, &z);
    let chord = value_on(&h, &c, PathMethod::Chord, &z);
    assert!((circle.tau_amplitude_pa - side / 3f64.sqrt()).abs() < 1e-6);
    assert!((chord.tau_amplitude_pa - 0.5 * side).abs() < 1e-6);
    assert!((chord.tau_amplitude_pa / circle.tau_amplitude_pa - 3f64.sqrt() / 2.0).abs() < 1e-12);
}

#[test]
fn circle_and_chord_agree_on_every_plane_under_proportional_loading() {
    // Proportional loading draws a segment on every plane, whose circle is the one on its
    // length: both methods give the same amplitude and centre (derived, no published value).
    let h = in_phase(180.0 * MPA, 90.0 * MPA, 360);
    let c = Constants::derive(Criterion::DangVan, &limits()).unwrap();
    for n in sweep(5.0) {
        let a = value_on(&h, &c, PathMethod::Circle, &n);
        let b = value_on(&h, &c, PathMethod::Chord, &n);
        assert!(
            (a.tau_amplitude_pa - b.tau_amplitude_pa).abs() < 1e-6 * MPA,
            "{n:?}"
        );
        assert!((a.value_pa - b.value_pa).abs() < 1e-6 * MPA, "{n:?}");
    }
}

#[test]
fn dang_van_on_a_hand_built_history() {
    // Pure shear τxy alternating 0 → 100 → −100 → 0 MPa with a mean pressure step: σxx = σyy =
    // σzz = p at the step where τxy = 100 (p = 60 MPa) and 0 elsewhere. On the planes of
    // largest shear (normals x and y) the path is a segment from −100 to 100 MPa, centre 0, so
    // the mesoscopic shear is 100 MPa at the step with σH = 60 MPa: value 100 + 60α MPa (worked
    // by hand). The hydrostatic part adds no shear on any plane, and on no other plane is the
    // shear larger.
    let tensors = vec![
        [0.0; 6],
        [60.0 * MPA, 60.0 * MPA, 60.0 * MPA, 100.0 * MPA, 0.0, 0.0],
        [0.0, 0.0, 0.0, -100.0 * MPA, 0.0, 0.0],
        [0.0; 6],
    ];
    let h = StressHistory::new(vec![0.0, 1.0, 2.0, 3.0], tensors).unwrap();
    let c = Constants::derive(Criterion::DangVan, &limits()).unwrap();
    let got = critical_plane(&h, &c, PathMethod::Circle, &SearchSettings::default());
    let expected = 100.0 * MPA + c.coefficient * 60.0 * MPA;
    assert!(
        (got.value.value_pa - expected).abs() < 1e-6 * expected,
        "{got:?}"
    );
    assert_eq!(got.value.step, 1);
}

#[test]
fn miner_sum_for_block_loading_worked_by_hand() {
    // Torsion τxy: one cycle of 150 MPa amplitude around eight of 100 MPa. Rainflow (ASTM
    // E1049-85) counts the eight small cycles and one large one (two half cycles). On Findley's
    // critical plane a fully reversed torsion cycle of amplitude τ has P = τ√(1 + k²), so its
    // equivalent amplitude is τ itself. With τ'f = 500 MPa, b = −0.1 (invented curve),
    // N(τ) = ½(τ/τ'f)^(1/b) and D = 1/N(150) + 8/N(100) (worked by hand).
    let (big, small) = (150.0 * MPA, 100.0 * MPA);
    let mut values = vec![big, -big];
    for _ in 0..8 {
        values.extend([small, -small]);
    }
    values.push(big);
    let time = (0..values.len()).map(|i| i as f64).collect();
    let tensors = values
        .iter()
        .map(|v| [0.0, 0.0, 0.0, *v, 0.0, 0.0])
        .collect();
    let h = StressHistory::new(time, tensors).unwrap();
    let sn = SnCurve::new(500.0 * MPA, -0.1, None).unwrap();
    let k = Constants::derive(Criterion::Findley, &limits())
        .unwrap()
        .coefficient;
    let n = |tau: f64| 0.5 * (tau / (500.0 * MPA)).powf(-10.0);
    let expected = 1.0 / n(big) + 8.0 / n(small);
    let got = damage_plane(&h, k, &sn, &SearchSettings::default());
    assert!(
        (got.damage.damage - expected).abs() < 1e-6 * expected,
        "{} vs {expected}",
        got.damage.damage
    );
    assert!((got.life_repeats.unwrap() - 1.0 / expected).abs() < 1e-6 / expected);
    let worst = got.damage.worst.unwrap();
    assert!((worst.equivalent_pa - big).abs() < 1e-6 * big, "{worst:?}");
    // With the endurance limit above the small cycles, only the large one does damage.
    let cut = SnCurve::new(500.0 * MPA, -0.1, Some(120.0 * MPA)).unwrap();
    let got = damage_plane(&h, k, &cut, &SearchSettings::default());
    assert!((got.damage.damage - 1.0 / n(big)).abs() < 1e-6 / n(big));
}

#[test]
fn the_same_history_from_components_and_from_load_case_factors() {
    use planewise::mechanics::StressTensor;
    let bending = StressTensor::from_pa([200.0 * MPA, 0.0, 0.0, 0.0, 0.0, 0.0]).unwrap();
    let torsion = StressTensor::from_pa([0.0, 0.0, 0.0, 120.0 * MPA, 0.0, 0.0]).unwrap();
    let steps = 72;
    let time: Vec<f64> = (0..=steps)
        .map(|i| f64::from(i) / f64::from(steps))
        .collect();
    let factors: Vec<Vec<f64>> = time
        .iter()
        .map(|t| {
            let w = 2.0 * PI * t;
            vec![w.sin(), (w - PI / 2.0).sin()]
        })
        .collect();
    let by_factors = StressHistory::from_factors(&[bending, torsion], time, &factors).unwrap();
    let by_components = out_of_phase(200.0 * MPA, 120.0 * MPA, 90.0, steps as usize);
    for (a, b) in by_factors
        .tensors_pa()
        .iter()
        .zip(by_components.tensors_pa())
    {
        for (x, y) in a.iter().zip(b) {
            assert!((x - y).abs() < 1e-6);
        }
    }
    let c = Constants::derive(Criterion::Findley, &limits()).unwrap();
    let s = SearchSettings::default();
    let a = critical_plane(&by_factors, &c, PathMethod::Circle, &s);
    let b = critical_plane(&by_components, &c, PathMethod::Circle, &s);
    assert!((a.utilization - b.utilization).abs() < 1e-9);
}

/// The largest score over a fine sweep of the hemisphere (1°), with the criterion's plane rule.
fn brute_force(h: &StressHistory, c: &Constants) -> f64 {
    let normals = sweep(1.0);
    let values: Vec<_> = normals
        .iter()
        .map(|n| value_on(h, c, PathMethod::Circle, n))
        .collect();
    if c.criterion.plane_of_largest_shear() {
        let top = values
            .iter()
            .map(|v| v.tau_amplitude_pa)
            .fold(f64::NEG_INFINITY, f64::max);
        values
            .iter()
            .filter(|v| v.tau_amplitude_pa >= top * (1.0 - 1e-4))
            .map(|v| v.value_pa)
            .fold(f64::NEG_INFINITY, f64::max)
    } else {
        values
            .iter()
            .map(|v| v.value_pa)
            .fold(f64::NEG_INFINITY, f64::max)
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(12))]

    /// Findley's plane is at least as bad as the best of a 1° sweep; Matake's plane has the
    /// largest shear amplitude of the sweep (to the sweep's resolution).
    #[test]
    fn the_critical_plane_beats_a_fine_brute_force_sweep(
        steps in prop::collection::vec(prop::array::uniform6(-200.0f64..200.0), 3..12)
    ) {
        let time = (0..steps.len()).map(|i| i as f64).collect();
        let tensors = steps.iter().map(|s| s.map(|v| v * MPA)).collect();
        let h = StressHistory::new(time, tensors).unwrap();
        let scale = h.scale_pa();
        for criterion in [Criterion::Findley, Criterion::Matake] {
            let c = Constants::derive(criterion, &limits()).unwrap();
            let got = critical_plane(&h, &c, PathMethod::Circle, &SearchSettings::default());
            let brute = brute_force(&h, &c);
            if criterion == Criterion::Findley {
                prop_assert!(got.value.value_pa >= brute - 1e-9 * scale, "{criterion:?}: {} < {brute}", got.value.value_pa);
            } else {
                let top = sweep(1.0).iter()
                    .map(|n| value_on(&h, &c, PathMethod::Circle, n).tau_amplitude_pa)
                    .fold(f64::NEG_INFINITY, f64::max);
                prop_assert!(got.value.tau_amplitude_pa >= top - 1e-9 * scale);
            }
        }
    }
}

mod cli {
    //! `planewise fatigue` and `planewise cycles` from the command line.

    use std::fmt::Write as _;

    use super::common::{assert_bad_input, planewise_ok};

    const SHAFT: &str = "examples/fatigue-shaft";

    fn folder() -> std::path::PathBuf {
        static CALLS: std::sync::atomic::AtomicUsize = std::sync::atomic::AtomicUsize::new(0);
        let call = CALLS.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
        let dir =
            std::env::temp_dir().join(format!("planewise-fatigue-{}-{call}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        dir
    }

    fn json(args: &[&str]) -> serde_json::Value {
        let mut full = vec!["fatigue"];
        full.extend_from_slice(args);
        full.push("--json");
        serde_json::from_slice(&planewise_ok(&full).stdout).unwrap()
    }

    const LIMITS: [&str; 4] = ["--bending-limit", "320", "--torsion-limit", "200"];

    #[test]
    fn components_and_factors_on_a_project_give_one_answer() {
        let history = format!("{SHAFT}/history.csv");
        let project = format!("{SHAFT}/project.json");
        let factors = format!("{SHAFT}/factors.csv");
        let mut a_args = vec!["--history", history.as_str()];
        a_args.extend(LIMITS);
        let mut b_args = vec!["--project", project.as_str(), "--factors", factors.as_str()];
        b_args.extend(LIMITS);
        let a = json(&a_args);
        let b = json(&b_args);
        let u = |v: &serde_json::Value| v["utilization"].as_f64().unwrap();
        // The example's history file holds six significant digits.
        assert!((u(&a) - u(&b)).abs() < 1e-5, "{} vs {}", u(&a), u(&b));
        assert_eq!(a["time_column"], "angle_deg");
        assert_eq!(a["constants"]["coefficient_symbol"], "k");
        assert!(a["caution"].as_str().unwrap().contains("surface finish"));
    }

    #[test]
    fn units_and_conventions_do_not_change_the_answer() {
        let dir = folder();
        let text = std::fs::read_to_string(format!("{SHAFT}/history.csv")).unwrap();
        // The same history in kPa and compression positive.
        let mut converted = String::new();
        for line in text.lines() {
            if line.starts_with('#') || line.starts_with("angle") {
                converted.push_str(line);
            } else {
                let mut f = line.split(',');
                let t = f.next().unwrap();
                converted.push_str(t);
                for v in f {
                    let v: f64 = v.parse().unwrap();
                    write!(converted, ",{}", -1000.0 * v).unwrap();
                }
            }
            converted.push('\n');
        }
        let kpa = dir.join("kpa.csv");
        std::fs::write(&kpa, converted).unwrap();
        let mpa = format!("{SHAFT}/history.csv");
        let mut a_args = vec!["--history", mpa.as_str()];
        a_args.extend(LIMITS);
        let a = json(&a_args);
        let b = json(&[
            "--history",
            kpa.to_str().unwrap(),
            "--unit",
            "kPa",
            "--compression-positive",
            "--bending-limit",
            "320000",
            "--torsion-limit",
            "200000",
        ]);
        let u = |v: &serde_json::Value| v["utilization"].as_f64().unwrap();
        assert!((u(&a) - u(&b)).abs() < 1e-9);
        let value = |v: &serde_json::Value| v["critical_plane"]["value"].as_f64().unwrap();
        assert!((1000.0 * value(&a) - value(&b)).abs() < 1e-3);
        assert_eq!(b["unit"], "kPa");
        assert_eq!(b["convention"], "compression-positive");
    }

    #[test]
    fn finite_life_figures_and_text() {
        let dir = folder();
        let (map, path) = (dir.join("map.svg"), dir.join("path.svg"));
        let history = format!("{SHAFT}/history.csv");
        let out = planewise_ok(&[
            "fatigue",
            "--history",
            &history,
            "--bending-limit",
            "320",
            "--torsion-limit",
            "200",
            "--sn",
            "550,-0.08",
            "--map",
            map.to_str().unwrap(),
            "--path-figure",
            path.to_str().unwrap(),
            "--resolution",
            "32",
        ]);
        let text = String::from_utf8(out.stdout).unwrap();
        for expected in [
            "Critical plane: dip",
            "Utilization",
            "factor of safety",
            "Damage per repeat",
            "Governing cycle: angle_deg",
            "Defer to the applicable design code",
        ] {
            assert!(text.contains(expected), "{expected}: {text}");
        }
        for f in [&map, &path] {
            let svg = std::fs::read_to_string(f).unwrap();
            roxmltree::Document::parse(&svg).unwrap();
        }
        assert!(
            std::fs::read_to_string(&map)
                .unwrap()
                .contains("log₁₀ of the damage")
        );
    }

    #[test]
    fn the_fatigue_report_names_its_inputs_and_states_the_result() {
        use sha2::Digest as _;
        let dir = folder();
        let report = dir.join("fatigue.html");
        let history = format!("{SHAFT}/history.csv");
        let mut args = vec!["--history", history.as_str()];
        args.extend(LIMITS);
        args.extend(["--sn", "550,-0.08"]);
        let result = json(&args);
        let mut full = vec!["fatigue"];
        full.extend(&args);
        full.extend(["--resolution", "24", "--report", report.to_str().unwrap()]);
        planewise_ok(&full);
        let html = std::fs::read_to_string(&report).unwrap();
        let page = scraper::Html::parse_document(&html);
        let text: String = page.root_element().text().collect();
        // The history file's SHA-256, checked with the sha2 crate.
        let digest = sha2::Sha256::digest(std::fs::read(&history).unwrap());
        let hex = digest.iter().fold(String::new(), |mut s, b| {
            write!(s, "{b:02x}").unwrap();
            s
        });
        assert!(text.contains(&hex), "no SHA-256 {hex}");
        let utilization = format!("{:.4}", result["utilization"].as_f64().unwrap());
        for expected in [
            "Material and the criterion's constants",
            "k = (2 − r)/(2√(r − 1))",
            "Criterion and critical plane",
            utilization.as_str(),
            "Finite life",
            "repeats of the history",
            "surface finish",
            "Prepared by",
        ] {
            assert!(text.contains(expected), "{expected}");
        }
        let svgs = page
            .select(&scraper::Selector::parse("figure svg").unwrap())
            .count();
        assert_eq!(svgs, 3, "the components, the path figure and the map");
        assert!(!html.contains("http"), "no web address in the report");
    }

    #[test]
    fn bad_fatigue_arguments_name_themselves() {
        let dir = folder();
        let missing = dir.join("missing.csv");
        std::fs::write(&missing, "t,xx,yy,zz,xy\n0,1,2,3,4\n1,2,3,4,5\n").unwrap();
        let missing = missing.to_str().unwrap().to_owned();
        let h = format!("{SHAFT}/history.csv");
        let h = h.as_str();
        assert_bad_input(
            "fatigue",
            &[
                (
                    &["--bending-limit", "320", "--torsion-limit", "200"],
                    "--history",
                ),
                (
                    &["--history", h, "--torsion-limit", "200"],
                    "--bending-limit",
                ),
                (
                    &[
                        "--history",
                        h,
                        "--bending-limit",
                        "320",
                        "--torsion-limit",
                        "100",
                    ],
                    "--bending-limit",
                ),
                (
                    &[
                        "--history",
                        h,
                        "--bending-limit",
                        "320",
                        "--torsion-limit",
                        "200",
                        "--criterion",
                        "nope",
                    ],
                    "--criterion",
                ),
                (
                    &[
                        "--history",
                        h,
                        "--bending-limit",
                        "320",
                        "--torsion-limit",
                        "200",
                        "--path",
                        "square",
                    ],
                    "--path",
                ),
                (
                    &[
                        "--history",
                        h,
                        "--bending-limit",
                        "320",
                        "--torsion-limit",
                        "200",
                        "--criterion",
                        "matake",
                        "--sn",
                        "500,-0.1",
                    ],
                    "--sn",
                ),
                (
                    &[
                        "--history",
                        h,
                        "--bending-limit",
                        "320",
                        "--torsion-limit",
                        "200",
                        "--sn",
                        "500,0.1",
                    ],
                    "--sn",
                ),
                (
                    &[
                        "--history",
                        h,
                        "--torsion-limit",
                        "200",
                        "--criterion",
                        "mcdiarmid",
                    ],
                    "--tensile-strength",
                ),
                (
                    &[
                        "--history",
                        &missing,
                        "--bending-limit",
                        "320",
                        "--torsion-limit",
                        "200",
                    ],
                    "no column for yz, zx",
                ),
                (
                    &[
                        "--history",
                        h,
                        "--bending-limit",
                        "320",
                        "--torsion-limit",
                        "200",
                        "--map",
                        "x.txt",
                    ],
                    "--map",
                ),
                (
                    &[
                        "--history",
                        h,
                        "--bending-limit",
                        "320",
                        "--torsion-limit",
                        "200",
                        "--path-figure",
                        h,
                    ],
                    "--path-figure",
                ),
            ],
        );
    }

    #[test]
    fn every_point_of_load_case_tables_ranked_by_utilization() {
        // Two invented load-case tables (bending and torsion per unit factor) at three points and
        // a factor history; each point's answer equals `--history` of its hand-summed tensors.
        let dir = folder();
        std::fs::write(
            dir.join("bending.csv"),
            "node,xx,yy,zz,xy,yz,zx\n1,100,0,0,0,0,0\n2,220,0,0,0,0,0\n3,150,20,0,10,0,0\n",
        )
        .unwrap();
        std::fs::write(
            dir.join("torsion.csv"),
            "node,xx,yy,zz,xy,yz,zx\n3,0,0,0,60,0,5\n1,0,0,0,100,0,0\n2,0,0,0,90,0,0\n",
        )
        .unwrap();
        let steps = 24;
        let mut factors = String::from("step,bending,torsion\n");
        let mut rows = Vec::new();
        for i in 0..=steps {
            let w = 2.0 * std::f64::consts::PI * f64::from(i) / f64::from(steps);
            let (fb, ft) = (w.sin(), 0.3 + (w - 1.0).sin());
            writeln!(factors, "{i},{fb},{ft}").unwrap();
            rows.push((i, fb, ft));
        }
        std::fs::write(dir.join("factors.csv"), factors).unwrap();
        let cases = [
            (
                "1",
                [100.0, 0.0, 0.0, 0.0, 0.0, 0.0],
                [0.0, 0.0, 0.0, 100.0, 0.0, 0.0],
            ),
            (
                "2",
                [220.0, 0.0, 0.0, 0.0, 0.0, 0.0],
                [0.0, 0.0, 0.0, 90.0, 0.0, 0.0],
            ),
            (
                "3",
                [150.0, 20.0, 0.0, 10.0, 0.0, 0.0],
                [0.0, 0.0, 0.0, 60.0, 0.0, 5.0],
            ),
        ];
        let mut expected = Vec::new();
        for (id, b, t) in cases {
            let mut text = String::from("step,xx,yy,zz,xy,yz,zx\n");
            for (i, fb, ft) in &rows {
                write!(text, "{i}").unwrap();
                for k in 0..6 {
                    write!(text, ",{}", fb * b[k] + ft * t[k]).unwrap();
                }
                text.push('\n');
            }
            let file = dir.join(format!("point{id}.csv"));
            std::fs::write(&file, text).unwrap();
            let mut args = vec!["--history", file.to_str().unwrap()];
            args.extend(LIMITS);
            expected.push((id, json(&args)["utilization"].as_f64().unwrap()));
        }
        expected.sort_by(|a, b| b.1.total_cmp(&a.1));
        let bending = format!("bending={}", dir.join("bending.csv").display());
        let torsion = format!("torsion={}", dir.join("torsion.csv").display());
        let f = dir.join("factors.csv");
        let mut args = vec![
            "--case-table",
            bending.as_str(),
            "--case-table",
            torsion.as_str(),
            "--ids",
            "node",
            "--factors",
            f.to_str().unwrap(),
        ];
        args.extend(LIMITS);
        let got = json(&args);
        let listed = got["listed"].as_array().unwrap();
        assert_eq!(listed.len(), 3);
        for ((id, u), row) in expected.iter().zip(listed) {
            assert_eq!(row["ids"]["node"], *id);
            assert!((row["utilization"].as_f64().unwrap() - u).abs() < 1e-9);
        }
        // --above keeps those at or above it.
        let threshold = format!("{}", expected[1].1 - 1e-9);
        args.extend(["--above", threshold.as_str()]);
        assert_eq!(json(&args)["listed"].as_array().unwrap().len(), 2);
        // The same histories as one long table, a history per point (rows of the points
        // interleaved), rank the same.
        let mut long = String::from("node,step,xx,yy,zz,xy,yz,zx\n");
        for (i, fb, ft) in &rows {
            for (id, b, t) in &cases {
                write!(long, "{id},{i}").unwrap();
                for k in 0..6 {
                    write!(long, ",{}", fb * b[k] + ft * t[k]).unwrap();
                }
                long.push('\n');
            }
        }
        let long_file = dir.join("long.csv");
        std::fs::write(&long_file, long).unwrap();
        let mut args = vec![
            "--histories",
            long_file.to_str().unwrap(),
            "--ids",
            "node",
            "--time-column",
            "step",
        ];
        args.extend(LIMITS);
        let got = json(&args);
        assert_eq!(got["steps"], 25);
        for ((id, u), row) in expected.iter().zip(got["listed"].as_array().unwrap()) {
            assert_eq!(row["ids"]["node"], *id);
            assert!((row["utilization"].as_f64().unwrap() - u).abs() < 1e-9);
        }
    }

    #[test]
    fn cycles_counts_the_astm_example() {
        // ASTM E1049-85 (2017) §5.4.4 example history (the standard's worked example, the same
        // as the rainflow package's tests): ranges 3 (½), 4 (1½), 6 (½), 8 (1), 9 (½).
        let dir = folder();
        let f = dir.join("astm.csv");
        std::fs::write(
            &f,
            "t,load\n0,-2\n1,1\n2,-3\n3,5\n4,-1\n5,3\n6,-4\n7,4\n8,-2\n",
        )
        .unwrap();
        let out = planewise_ok(&["cycles", f.to_str().unwrap(), "--column", "load", "--json"]);
        let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
        let mut by_range = std::collections::BTreeMap::<i64, f64>::new();
        for c in v["cycles"].as_array().unwrap() {
            *by_range
                .entry(c["range"].as_f64().unwrap().round() as i64)
                .or_default() += c["count"].as_f64().unwrap();
        }
        let got: Vec<(i64, f64)> = by_range.into_iter().collect();
        assert_eq!(got, vec![(3, 0.5), (4, 1.5), (6, 0.5), (8, 1.0), (9, 0.5)]);
        assert_bad_input(
            "cycles",
            &[(
                &[f.to_str().unwrap(), "--column", "strain"],
                "no column 'strain'",
            )],
        );
    }
}
