//! One project, one answer: nothing is computed from a value nobody entered, the
//! pressure-sensitive criteria use effective stress whenever a pore pressure is given, the
//! strength-reduction factor agrees with its definition (by hand and by bisection), and every
//! ranking puts states that fail at any scale or have no frictional capacity first and states
//! that never reach the surface last.

#![allow(
    clippy::unwrap_used,
    reason = "a test that cannot compute its reference should panic loudly"
)]

mod common;

use planewise::mechanics::criteria::{
    self, Condition, Criterion, DruckerPragerFit, MohrCoulomb, Strengths,
};
use planewise::mechanics::search::{Measure, SearchSettings, worst_plane};
use planewise::mechanics::{PlaneNormal, SignConvention, StressTensor};
use proptest::prelude::*;

const MPA: f64 = 1e6;

fn temp(name: &str) -> std::path::PathBuf {
    let dir = std::env::temp_dir().join(format!("planewise-one-answer-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    dir.join(name)
}

fn json(args: &[&str]) -> serde_json::Value {
    serde_json::from_slice(&common::planewise_ok(args).stdout).unwrap()
}

/// The state of the example (principal values −15, −35, −70 MPa in a general
/// orientation, tension positive).
const EXAMPLE: &str = "xx=-25.848888922,yy=-30.0167247251,zz=-64.1343863529,xy=10.804815086,yz=3.05683195668,zx=-14.4124106954";

#[test]
fn a_new_project_carries_no_plane_strength_and_says_not_checked() {
    let file = temp("new.json");
    let _ = std::fs::remove_file(&file);
    let f = file.to_str().unwrap();
    common::planewise_ok(&["project", "new", f, "--unit", "psi"]);
    common::planewise_ok(&[
        "project",
        "add-case",
        f,
        "--name",
        "a",
        "--stress",
        "xx=100,xy=40",
    ]);
    let saved = std::fs::read_to_string(&file).unwrap();
    assert!(
        !saved.contains("5000000"),
        "a hidden cohesion was saved: {saved}"
    );
    // A pore pressure makes the fault check appear; its Coulomb part is not checked.
    let mut v: serde_json::Value = serde_json::from_str(&saved).unwrap();
    v["measure"]["pore_pressure_pa"] = serde_json::json!(1e5);
    std::fs::write(&file, serde_json::to_string(&v).unwrap()).unwrap();
    let j = json(&["analyze", "--project", f, "--case", "a", "--json"]);
    let fault = &j["plane"]["fault"];
    assert!(fault["mohr_coulomb_utilization"].is_null(), "{fault}");
    assert!(fault["pore_pressure_to_slip"].is_null(), "{fault}");
    assert!(
        fault["coulomb_not_checked"]
            .as_str()
            .unwrap()
            .contains("needs the planes' cohesion and friction angle")
    );
    let report = temp("new.html");
    common::planewise_ok(&["report", "--project", f, "--out", report.to_str().unwrap()]);
    let html = std::fs::read_to_string(&report).unwrap();
    assert!(!html.contains("725.189"), "the old default shown in psi");
    assert!(html.contains("Coulomb U and Δp: not checked") || !html.contains("Named faults"));
    assert!(
        html.contains("not checked: needs the planes&#39; cohesion and friction angle")
            || html.contains("not checked: needs the planes' cohesion and friction angle"),
        "the Coulomb row does not say what it needs"
    );
}

#[test]
fn a_version_1_file_loses_only_the_old_default_plane_strength() {
    let demo = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/assets/demo-bracket-project.json"
    ))
    .unwrap();
    let mut v: serde_json::Value = serde_json::from_str(&demo).unwrap();
    v["format_version"] = serde_json::json!(1);
    for (name, c, phi, kept) in [
        ("old-default.json", 5e6, 30.0, false),
        ("entered.json", 2e6, 35.0, true),
    ] {
        v["measure"] = serde_json::json!({"measure": "shear", "pore_pressure_pa": 0.0,
            "cohesion_pa": c, "friction_angle_deg": phi});
        let file = temp(name);
        std::fs::write(&file, serde_json::to_string(&v).unwrap()).unwrap();
        let (p, warnings) = planewise::study::load(&file).unwrap();
        assert_eq!(p.measure.plane_strength().is_some(), kept, "{name}");
        assert_eq!(!warnings.is_empty(), !kept, "{name}: {warnings:?}");
    }
}

#[test]
fn pressure_sensitive_criteria_use_effective_stress() {
    let j = json(&[
        "analyze",
        "--stress",
        EXAMPLE,
        "--cohesion",
        "10",
        "--friction-angle",
        "30",
        "--pore-pressure",
        "20",
        "--normal",
        "1,0,0",
        "--json",
    ]);
    let mc = j["criteria"]
        .as_array()
        .unwrap()
        .iter()
        .find(|c| c["name"] == "mohr-coulomb")
        .unwrap();
    // Worked by hand: σ′ = σ + p·I has principal values 5, −15, −50 MPa; Mohr–Coulomb's demand
    // (σ1′ − σ3′) + (σ1′ + σ3′) sin 30° = 55 − 22.5 = 32.5 MPa against 2 c cos φ = 17.3205 MPa
    // (Labuz & Zang 2012): U = 1.876388.
    let by_hand = 32.5 / (20.0 * 30.0_f64.to_radians().cos());
    assert!(
        (mc["utilization"].as_f64().unwrap() - by_hand).abs() < 1e-9,
        "{mc}"
    );
    assert_eq!(mc["outcome"], "fails");
    // The plane check beside it is on effective stress too, and the 1.35 stands.
    let plane_u = j["plane"]["fault"]["mohr_coulomb_utilization"]
        .as_f64()
        .unwrap();
    assert!((plane_u - 1.3466).abs() < 1e-4, "{plane_u}");
    // The plane's utilization cannot exceed the worst plane's (the principal form).
    assert!(plane_u <= by_hand);
}

fn scaled(t: &StressTensor, k: f64) -> StressTensor {
    StressTensor::from_pa(t.components_pa().map(|v| k * v)).unwrap()
}

fn state() -> impl Strategy<Value = StressTensor> {
    prop::array::uniform6(-200.0..200.0_f64)
        .prop_map(|c| StressTensor::from_pa(c.map(|v| v * MPA)).unwrap())
}

/// Bisection for the F at which `fails(F)` changes from false to true (monotone in F), in
/// [1e-6, 1e6].
fn bisect(fails: impl Fn(f64) -> bool) -> Option<f64> {
    let (mut lo, mut hi) = (1e-6_f64, 1e6_f64);
    if fails(lo) || !fails(hi) {
        return None;
    }
    for _ in 0..200 {
        let mid = (lo * hi).sqrt();
        if fails(mid) {
            hi = mid;
        } else {
            lo = mid;
        }
    }
    Some((lo * hi).sqrt())
}

fn reduced(m: &MohrCoulomb, f: f64) -> (f64, f64) {
    (
        m.cohesion_pa / f,
        (m.friction_angle_deg.to_radians().tan() / f)
            .atan()
            .to_degrees(),
    )
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]

    /// With a pore pressure, the Mohr–Coulomb verdict is the Coulomb search on effective
    /// stress: at the factor of safety, σ and p scaled together put the worst plane on
    /// τ = c + σn′ tan φ (Labuz & Zang 2012; Terzaghi's effective stress).
    #[test]
    fn mohr_coulomb_with_pore_pressure_agrees_with_the_worst_plane(
        t in state(), p in -50.0..80.0_f64, c in 0.5..30.0_f64, phi in 0.0..50.0_f64,
    ) {
        let s = Strengths {
            cohesion_pa: Some(c * MPA),
            friction_angle_deg: Some(phi),
            ..Strengths::default()
        };
        let v = criteria::verdict_with_pore_pressure(&t, Criterion::MohrCoulomb, &s, p * MPA);
        if let Some(f) = v.factor_of_safety {
            let search = SearchSettings {
                measure: Measure::MohrCoulomb,
                convention: SignConvention::CompressionPositive,
                pore_pressure_pa: f * p * MPA,
                material: s.mohr_coulomb().unwrap().ok(),
            };
            let worst = worst_plane(&scaled(&t, f), &search).unwrap();
            if let Some(w) = worst.value {
                prop_assert!((w - 1.0).abs() < 1e-6, "plane-wise worst {w}");
            }
        }
    }

    /// The strength-reduction factor is the F found by bisection on its definition: with c/F
    /// and atan(tan φ / F) the state's utilization crosses 1 — for Mohr–Coulomb and every
    /// Drucker–Prager fit.
    #[test]
    fn the_strength_reduction_factor_is_the_bisected_one(
        t in state(), c in 0.5..30.0_f64, phi in 5.0..50.0_f64, fit in 0usize..4,
    ) {
        let m = MohrCoulomb::new(c * MPA, phi).unwrap();
        for criterion in [Criterion::MohrCoulomb, Criterion::DruckerPrager] {
            let with = |f: f64| {
                let (cf, phif) = reduced(&m, f);
                Strengths {
                    cohesion_pa: Some(cf),
                    friction_angle_deg: Some(phif),
                    dp_fit: DruckerPragerFit::ALL[fit],
                    ..Strengths::default()
                }
            };
            let r = criteria::verdict(&t, criterion, &with(1.0)).reduction.unwrap();
            let fails = |f: f64| {
                let v = criteria::verdict(&t, criterion, &with(f));
                v.condition == Condition::FailsAtAnyScale || v.utilization.is_some_and(|u| u >= 1.0)
            };
            match (r.condition, bisect(fails)) {
                (Condition::Defined, Some(f)) => {
                    let mine = r.factor.unwrap();
                    prop_assert!((mine - f).abs() <= 1e-6 * f, "{criterion:?}: {mine} vs {f}");
                    let m_phi = (phi.to_radians().tan() / mine).atan().to_degrees();
                    prop_assert!((r.mobilized_friction_deg.unwrap() - m_phi).abs() < 1e-9);
                }
                (Condition::NeverReaches, None) => prop_assert!(!fails(1e6)),
                (Condition::FailsAtAnyScale, None) => prop_assert!(fails(1e-6)),
                (cond, found) => prop_assert!(false, "{criterion:?}: {cond:?} but bisection {found:?}"),
            }
        }
    }

    /// The Coulomb plane check's strength-reduction factor against bisection on
    /// τ = (c + σn′ tan φ)/F, and its proportional factor against σ and p scaled together.
    #[test]
    fn the_plane_check_factors_follow_their_definitions(
        t in state(), p in -20.0..60.0_f64, c in 0.5..20.0_f64, phi in 5.0..45.0_f64,
        dip in 0.0..90.0_f64, dd in 0.0..360.0_f64,
    ) {
        let n = PlaneNormal::from_dip(dip, dd).unwrap();
        let m = MohrCoulomb::new(c * MPA, phi).unwrap();
        let check = criteria::fault_check(&t, n, p * MPA, Some(&m)).unwrap();
        let r = check.coulomb_reduction.unwrap();
        let fails = |f: f64| {
            let (cf, phif) = reduced(&m, f);
            let mf = MohrCoulomb::new(cf, phif).unwrap();
            let u = criteria::fault_check(&t, n, p * MPA, Some(&mf)).unwrap().mohr_coulomb.unwrap();
            u.condition == Condition::EffectiveTension || u.utilization.is_some_and(|x| x >= 1.0)
        };
        if let (Condition::Defined, Some(f)) = (r.condition, bisect(fails)) {
            prop_assert!((r.factor.unwrap() - f).abs() <= 1e-6 * f);
        }
        if let Some(lambda) = check.coulomb_proportional.and_then(|c| c.factor_of_safety()) {
            let on = criteria::fault_check(&scaled(&t, lambda), n, lambda * p * MPA, Some(&m)).unwrap();
            prop_assert!((on.mohr_coulomb.unwrap().utilization.unwrap() - 1.0).abs() < 1e-9);
        }
    }
}

#[test]
fn the_strength_reduction_factor_worked_by_hand() {
    // The state with p = 20 MPa, c = 10 MPa, φ = 30°: σ1′ = 5, σ3′ = −50 MPa, so the
    // circle's centre (compression positive) s = 22.5 MPa and radius r = 27.5 MPa.
    // F = √(((c + s tan φ)/r)² − tan² φ) = √((22.990381/27.5)² − 1/3) = √(0.698919 − 0.333333)
    //   = 0.604637; φm = atan(0.577350/0.604637) = 43.68° (worked by hand from the tangency
    // condition r = c cos φ + s sin φ).
    let t = StressTensor::diagonal_pa(5.0 * MPA, -15.0 * MPA, -50.0 * MPA).unwrap();
    let s = Strengths {
        cohesion_pa: Some(10.0 * MPA),
        friction_angle_deg: Some(30.0),
        ..Strengths::default()
    };
    let r = criteria::verdict(&t, Criterion::MohrCoulomb, &s)
        .reduction
        .unwrap();
    assert!((r.factor.unwrap() - 0.604_637).abs() < 1e-6, "{r:?}");
    assert!(
        (r.mobilized_friction_deg.unwrap() - 43.68).abs() < 0.01,
        "{r:?}"
    );
    // A cohesionless state exactly on the cone (σ = −10, −20, −30 MPa, φ = 30°: demand
    // 20 − 40 sin 30° = 0): on the surface, U = 1 and F = 1, not "fails" on round-off.
    let on = StressTensor::diagonal_pa(-10.0 * MPA, -20.0 * MPA, -30.0 * MPA).unwrap();
    let sand = Strengths {
        cohesion_pa: Some(0.0),
        friction_angle_deg: Some(30.0),
        ..Strengths::default()
    };
    for rotated in [
        on,
        on.rotated(&nalgebra::Rotation3::from_euler_angles(0.3, -0.7, 1.1).into_inner())
            .unwrap(),
    ] {
        let v = criteria::verdict(&rotated, Criterion::MohrCoulomb, &sand);
        assert_eq!(v.utilization, Some(1.0), "{v:?}");
        assert!(
            (v.reduction.unwrap().factor.unwrap() - 1.0).abs() < 1e-9,
            "{v:?}"
        );
    }
}

const SMALL: &str = "id,xx,yy,zz,xy,yz,zx\nA,-10,-20,-30,0,0,0\nB,5,-20,-30,0,0,0\nC,-10,-11,-60,0,0,0\nD,-50,-50,-50,0,0,0\n";

fn batch(extra: &[&str]) -> serde_json::Value {
    let file = temp("small.csv");
    std::fs::write(&file, SMALL).unwrap();
    let mut args = vec![
        "batch",
        file.to_str().unwrap(),
        "--unit",
        "MPa",
        "--json",
        "--quiet",
    ];
    args.extend_from_slice(extra);
    json(&args)
}

fn ids(j: &serde_json::Value) -> Vec<String> {
    j["rows"]
        .as_array()
        .unwrap()
        .iter()
        .map(|r| r["carried"]["id"].as_str().unwrap().to_owned())
        .collect()
}

#[test]
fn rankings_put_failing_states_first_and_never_reaching_states_last() {
    // B has effective tension (σ3 = 5 MPa > p = 0): no frictional capacity, worst of all.
    let j = batch(&[
        "--rank",
        "slip-tendency",
        "--pore-pressure",
        "0",
        "--top",
        "2",
    ]);
    assert_eq!(ids(&j)[0], "B", "{j}");
    assert_eq!(j["rows"][0]["condition"], "effective-tension");
    assert_eq!(j["conditions"]["no_frictional_capacity"], 1);
    // D is hydrostatic: no shear on any plane, slip tendency 0 (defined, least of all).
    assert_eq!(j["conditions"]["defined"], 3, "{}", j["conditions"]);
    // Cohesionless Mohr–Coulomb: B and C fail at any scale, A lies on the cone (U = 1), D
    // (hydrostatic compression) never reaches it — as `analyze` says of each.
    let j = batch(&[
        "--rank",
        "utilization-mohr-coulomb",
        "--cohesion",
        "0",
        "--friction-angle",
        "30",
    ]);
    assert_eq!(ids(&j), ["B", "C", "A", "D"], "{j}");
    let conditions: Vec<&str> = j["rows"]
        .as_array()
        .unwrap()
        .iter()
        .map(|r| r["condition"].as_str().unwrap())
        .collect();
    assert_eq!(
        conditions,
        [
            "fails-at-any-scale",
            "fails-at-any-scale",
            "defined",
            "never-reaches"
        ]
    );
    for (id, outcome) in [
        ("A", "fails"),
        ("B", "fails"),
        ("C", "fails"),
        ("D", "passes"),
    ] {
        let row = SMALL.lines().find(|l| l.starts_with(id)).unwrap();
        let c: Vec<&str> = row.split(',').skip(1).collect();
        let stress = format!(
            "xx={},yy={},zz={},xy={},yz={},zx={}",
            c[0], c[1], c[2], c[3], c[4], c[5]
        );
        let a = json(&[
            "analyze",
            "--stress",
            &stress,
            "--cohesion",
            "0",
            "--friction-angle",
            "30",
            "--json",
        ]);
        let mc = a["criteria"]
            .as_array()
            .unwrap()
            .iter()
            .find(|c| c["name"] == "mohr-coulomb")
            .unwrap()
            .clone();
        assert_eq!(mc["outcome"], outcome, "{id}: {mc}");
    }
    // --at-or-beyond lists every row at or past the threshold, failing ones always.
    let j = batch(&[
        "--rank",
        "utilization-mohr-coulomb",
        "--cohesion",
        "0",
        "--friction-angle",
        "30",
        "--at-or-beyond",
        "1",
    ]);
    assert_eq!(ids(&j), ["B", "C", "A"]);
    assert_eq!(j["rows_at_or_beyond"], 3);
    let j = batch(&["--rank", "von-mises", "--at-or-beyond", "40"]);
    assert_eq!(ids(&j), ["C"], "{j}");
}

/// The envelope's row names, worst first.
fn row_names(j: &serde_json::Value) -> Vec<&str> {
    j["rows"]
        .as_array()
        .unwrap()
        .iter()
        .map(|r| r["name"].as_str().unwrap())
        .collect()
}

#[test]
fn the_envelope_ranks_by_the_same_rule() {
    let file = temp("ranked.json");
    let _ = std::fs::remove_file(&file);
    let f = file.to_str().unwrap();
    common::planewise_ok(&["project", "new", f]);
    for line in SMALL.lines().skip(1) {
        let c: Vec<&str> = line.split(',').collect();
        let stress = format!(
            "xx={},yy={},zz={},xy={},yz={},zx={}",
            c[1], c[2], c[3], c[4], c[5], c[6]
        );
        common::planewise_ok(&[
            "project", "add-case", f, "--name", c[0], "--stress", &stress,
        ]);
    }
    let j = json(&[
        "envelope",
        "--project",
        f,
        "--measure",
        "slip-tendency",
        "--json",
    ]);
    let names = row_names(&j);
    assert_eq!(names[0], "B", "{j}");
    assert_eq!(j["governing"], "B");
    assert_eq!(*names.last().unwrap(), "D", "no shear, least: {j}");
    assert_eq!(j["rows"][0]["standing"], "effective-tension");
    let j = json(&[
        "envelope",
        "--project",
        f,
        "--measure",
        "utilization-mohr-coulomb",
        "--cohesion",
        "0",
        "--friction-angle",
        "30",
        "--json",
    ]);
    let names = row_names(&j);
    assert_eq!(names, ["B", "C", "A", "D"], "{j}");
    assert_eq!(j["conditions"]["fails_at_any_scale"], 2);
    assert_eq!(j["conditions"]["never_reaches"], 1);
    assert_eq!(
        j["from_command_line"],
        serde_json::json!(["--cohesion", "--friction-angle"])
    );
}

#[test]
fn the_table_reader_ranks_by_the_same_rule() {
    use planewise::study::EnvelopeMeasure;
    use planewise::study::table::{Measure as TableMeasure, TableOptions, rank};
    let settings = SearchSettings::plain(Measure::SlipTendency, SignConvention::TensionPositive);
    let strengths = Strengths::default();
    let measure = TableMeasure {
        measure: EnvelopeMeasure::Plane(Measure::SlipTendency),
        convention: SignConvention::TensionPositive,
        plane_settings: &settings,
        strengths: &strengths,
    };
    let options = TableOptions {
        top: Some(2),
        ..TableOptions::new(
            planewise::mechanics::StressUnit::MPa,
            SignConvention::TensionPositive,
        )
    };
    let ranked = rank(SMALL.as_bytes(), "small.csv", &options, &measure, |_| true).unwrap();
    assert_eq!(ranked.rows[0].carried[0], "B");
    assert_eq!(ranked.rows[0].standing, Condition::EffectiveTension);
    assert_eq!(ranked.counts.no_frictional_capacity, 1);
    assert_eq!(ranked.counts.defined, 3);
}

#[test]
fn batch_out_is_a_plain_csv_with_the_header_first() {
    let file = temp("plain.csv");
    std::fs::write(&file, SMALL).unwrap();
    for rank in ["sigma1", "von-mises", "slip-tendency"] {
        let out = temp(&format!("plain-{rank}.csv"));
        common::planewise_ok(&[
            "batch",
            file.to_str().unwrap(),
            "--unit",
            "MPa",
            "--rank",
            rank,
            "--quiet",
            "--out",
            out.to_str().unwrap(),
        ]);
        let mut reader = csv::Reader::from_path(&out).unwrap();
        let header: Vec<String> = reader
            .headers()
            .unwrap()
            .iter()
            .map(str::to_owned)
            .collect();
        assert_eq!(header[0], "line", "{header:?}");
        assert!(header.contains(&"xx_MPa".to_owned()), "{header:?}");
        let mut unique = header.clone();
        unique.sort();
        unique.dedup();
        assert_eq!(
            unique.len(),
            header.len(),
            "{rank}: a column twice: {header:?}"
        );
        assert_eq!(reader.records().count(), 4);
    }
}

#[test]
fn without_the_planes_own_strength_the_material_s_is_the_one_strength_set() {
    let file = temp("one-set.json");
    let _ = std::fs::remove_file(&file);
    let f = file.to_str().unwrap();
    for args in [
        vec!["project", "new", f],
        vec![
            "project",
            "add-case",
            f,
            "--name",
            "a",
            "--stress",
            "xx=-10,yy=-20,zz=-40,xy=5",
        ],
        vec![
            "project",
            "set-material",
            f,
            "--cohesion",
            "3",
            "--friction-angle",
            "30",
        ],
        vec!["project", "set-pore-pressure", f, "5"],
    ] {
        common::planewise_ok(&args);
    }
    let j = json(&["analyze", "--project", f, "--case", "a", "--json"]);
    assert_eq!(j["plane_strength_from"], "material");
    // The cut plane is the project's default x face: σn = −10 MPa, τ = 5 MPa (σxy), so with
    // p = 5 MPa, σn′ = 5 MPa and U = 5 / (3 + 5 tan 30°) = 0.849365 (worked by hand).
    let u = j["plane"]["fault"]["mohr_coulomb_utilization"]
        .as_f64()
        .unwrap();
    assert!(
        (u - 5.0 / (3.0 + 5.0 * 30.0_f64.to_radians().tan())).abs() < 1e-12,
        "{u}"
    );
    // The mohr-coulomb envelope runs on the same strength, not refused.
    let env = json(&[
        "envelope",
        "--project",
        f,
        "--measure",
        "mohr-coulomb",
        "--json",
    ]);
    assert!(env["rows"][0]["value"].as_f64().unwrap() >= u);
    // Setting the planes' own strength replaces it for the planes only.
    common::planewise_ok(&[
        "project",
        "set-plane-strength",
        f,
        "--cohesion",
        "0",
        "--friction-coefficient",
        "0.6",
    ]);
    let j = json(&["analyze", "--project", f, "--case", "a", "--json"]);
    assert_eq!(j["plane_strength_from"], "planes");
    let u = j["plane"]["fault"]["mohr_coulomb_utilization"]
        .as_f64()
        .unwrap();
    assert!((u - 5.0 / (5.0 * 0.6)).abs() < 1e-12, "{u}");
}

#[test]
fn the_report_identifies_what_it_checked() {
    let file = temp("identified.json");
    let _ = std::fs::remove_file(&file);
    let f = file.to_str().unwrap();
    for args in [
        vec!["project", "new", f, "--name", "Invented: identified"],
        vec![
            "project",
            "add-case",
            f,
            "--name",
            "a",
            "--stress",
            "xx=-10,yy=-20,zz=-40,xy=5",
        ],
        vec!["project", "set-revision", f, "C, issued for checking"],
        vec![
            "project",
            "set-plane-strength",
            f,
            "--cohesion",
            "1",
            "--friction-angle",
            "30",
        ],
        vec!["project", "add-fault", f, "--fault", "F1=60/120"],
    ] {
        common::planewise_ok(&args);
    }
    let out = temp("identified.html");
    common::planewise_ok(&["report", "--project", f, "--out", out.to_str().unwrap()]);
    let html = std::fs::read_to_string(&out).unwrap();
    // SHA-256 from coreutils' sha256sum, an implementation outside the project.
    let sum = std::process::Command::new("sha256sum")
        .arg(&file)
        .output()
        .unwrap();
    let sum = String::from_utf8_lossy(&sum.stdout);
    let sha = sum.split_whitespace().next().unwrap();
    assert_eq!(sha.len(), 64);
    assert!(
        html.contains(sha),
        "the report lacks the file's SHA-256 {sha}"
    );
    assert!(html.contains("identified.json"));
    assert!(html.contains("C, issued for checking"));
    assert!(html.contains(&format!("Planewise {}", env!("CARGO_PKG_VERSION"))));
    assert!(html.contains("(build "), "no build commit");
    // ISO 8601 date and time with its offset.
    let made = html.split("<th>made</th><td>").nth(1).unwrap();
    let made = &made[..made.find('<').unwrap()];
    let b = made.as_bytes();
    assert_eq!(made.len(), 25, "{made}");
    assert!(
        b[4] == b'-' && b[7] == b'-' && b[10] == b'T' && b[13] == b':' && &made[19..] == "+00:00",
        "{made}"
    );
    // The fault table carries the rake.
    assert!(html.contains("<th>rake"), "no rake column");
    let text =
        String::from_utf8(common::planewise_ok(&["analyze", "--project", f, "--case", "a"]).stdout)
            .unwrap();
    let fault_line = text
        .lines()
        .find(|l| l.trim_start().starts_with("F1"))
        .unwrap();
    assert!(fault_line.contains("rake"), "{fault_line}");
}

#[test]
fn round_off_prints_as_zero_and_repeated_roots_are_said() {
    // A general plane-stress state: σ2 = 0 exactly (the z direction), printed 0, not 1e-15.
    let j = json(&["analyze", "--stress", "xx=50,yy=-20,xy=30,zx=0", "--json"]);
    let values = j["principal"]["values"].as_array().unwrap();
    assert_eq!(values[1].as_f64(), Some(0.0), "{values:?}");
    for d in j["principal"]["directions"].as_array().unwrap() {
        for c in d.as_array().unwrap() {
            let c = c.as_f64().unwrap();
            assert!(c == 0.0 || c.abs() > 1e-9, "round-off in a direction: {c}");
        }
    }
    // Hydrostatic: no planes of largest shear, and the repeated roots are said.
    let j = json(&["analyze", "--stress", "xx=-30,yy=-30,zz=-30", "--json"]);
    assert!(
        j["max_shear_normals"].is_null(),
        "{}",
        j["max_shear_normals"]
    );
    assert!(j["principal"]["note"].as_str().unwrap().contains("equal"));
    let j = json(&["analyze", "--stress", "xx=10,yy=10.0000001,zz=3", "--json"]);
    assert!(
        j["principal"]["note"]
            .as_str()
            .unwrap()
            .contains("ill-determined")
    );
    let j = json(&["analyze", "--stress", "xx=10,yy=8,zz=3", "--json"]);
    assert!(j["principal"]["note"].is_null());
    // A numerical worst plane prints what the search resolves (no dip 60.0000000821544).
    let j = json(&[
        "worst-plane",
        "--stress",
        "xx=-30,yy=-10,zz=-20,xy=4",
        "--measure",
        "slip-tendency",
        "--json",
    ]);
    for p in j["planes"].as_array().unwrap() {
        for key in ["dip_deg", "dip_direction_deg"] {
            let v = p[key].as_f64().unwrap();
            assert_eq!(v, (v * 1e6).round() / 1e6, "{key} {v}");
        }
        let sn = p["normal_stress"].as_f64().unwrap();
        // Worked by hand: the σ1–σ3 circle (compression positive) has centre c = 20 MPa and
        // radius r = √(10² + 4²); the tangent from the origin touches it at
        // σn = (c² − r²)/c = (400 − 116)/20 = 14.2 MPa (compression).
        assert_eq!(sn, -14.2, "σn on the worst plane");
    }
}
