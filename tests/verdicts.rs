//! Criteria under proportional loading and the fault check: the factor of safety puts the state
//! on each criterion's surface, the Drucker–Prager fits sit where their published definitions
//! say, Mohr–Coulomb in principal form agrees with the plane-by-plane Coulomb search, and the
//! fault numbers follow their published definitions. Plus `analyze`'s criteria contract.

#![allow(
    clippy::unwrap_used,
    reason = "a test that cannot compute its reference should panic loudly"
)]

mod common;

use nalgebra::{Matrix3, Rotation3, Vector3};
use planewise::mechanics::criteria::{
    self, Condition, Criterion, DruckerPragerFit, MohrCoulomb, Outcome, Strengths,
};
use planewise::mechanics::search::{Measure, SearchSettings, worst_plane};
use planewise::mechanics::{PlaneNormal, SignConvention, StressTensor};
use proptest::prelude::*;

const MPA: f64 = 1e6;

fn scaled(t: &StressTensor, k: f64) -> StressTensor {
    StressTensor::from_pa(t.components_pa().map(|v| k * v)).unwrap()
}

fn state() -> impl Strategy<Value = StressTensor> {
    prop::array::uniform6(-200.0..200.0_f64)
        .prop_map(|c| StressTensor::from_pa(c.map(|v| v * MPA)).unwrap())
}

fn strengths() -> impl Strategy<Value = Strengths> {
    (
        (50.0..500.0_f64, 1.0..50.0_f64, 20.0..300.0_f64),
        (0.5..30.0_f64, 0.0..50.0_f64, 0usize..4),
    )
        .prop_map(|((fy, ft, fc), (c, phi, fit))| Strengths {
            yield_strength_pa: Some(fy * MPA),
            tensile_strength_pa: Some(ft * MPA),
            compressive_strength_pa: Some(fc * MPA),
            cohesion_pa: Some(c * MPA),
            friction_angle_deg: Some(phi),
            dp_fit: DruckerPragerFit::ALL[fit],
        })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(300))]

    /// The definition of the factor of safety under proportional loading: the state multiplied
    /// by it lies on the criterion's surface (U = 1), for every criterion.
    #[test]
    fn the_factor_of_safety_times_the_state_lies_on_the_surface(t in state(), s in strengths()) {
        for v in criteria::verdicts(&t, &s, 0.0) {
            match (v.condition, v.factor_of_safety) {
                (Condition::Defined, Some(f)) => {
                    let on = criteria::verdict(&scaled(&t, f), v.criterion, &s);
                    prop_assert!((on.utilization.unwrap() - 1.0).abs() < 1e-9,
                        "{:?}: U at FoS × state = {:?}", v.criterion, on.utilization);
                    prop_assert!((v.utilization.unwrap() * f - 1.0).abs() < 1e-12);
                }
                (Condition::NeverReaches, _) => {
                    // Scaling up never reaches the surface: still inside at ×1000.
                    let far = criteria::verdict(&scaled(&t, 1000.0), v.criterion, &s);
                    prop_assert!(far.outcome() == Outcome::Passes, "{:?}", v.criterion);
                }
                (c, f) => prop_assert!(false, "{:?}: unexpected {c:?} {f:?}", v.criterion),
            }
        }
    }

    /// Mohr–Coulomb in principal stresses is the same criterion as Coulomb's τ = c + σn tan φ on
    /// the worst plane (Labuz & Zang 2012): at FoS × state the plane search's worst
    /// utilization is 1.
    #[test]
    fn principal_mohr_coulomb_agrees_with_the_worst_plane(t in state(), s in strengths()) {
        let v = criteria::verdict(&t, Criterion::MohrCoulomb, &s);
        if let Some(f) = v.factor_of_safety {
            let on = scaled(&t, f);
            let search = SearchSettings {
                measure: Measure::MohrCoulomb,
                convention: SignConvention::CompressionPositive,
                pore_pressure_pa: 0.0,
                material: s.mohr_coulomb().unwrap().ok(),
            };
            let worst = worst_plane(&on, &search).unwrap();
            if let Some(w) = worst.value {
                prop_assert!((w - 1.0).abs() < 1e-6, "plane-wise worst {w}");
            }
        }
    }

    /// The circumscribed cone (compression meridian) lies outside the Mohr–Coulomb hexagon and
    /// the inscribed one inside (Chen & Han 1988, §5.4): their utilizations bracket MC's.
    #[test]
    fn drucker_prager_cones_bracket_mohr_coulomb(t in state(), s in strengths()) {
        let mc = criteria::verdict(&t, Criterion::MohrCoulomb, &s);
        let with = |fit| criteria::verdict(&t, Criterion::DruckerPrager, &Strengths { dp_fit: fit, ..s });
        let outer = with(DruckerPragerFit::CompressionMeridian);
        let inner = with(DruckerPragerFit::Inscribed);
        if let (Some(m), Some(o), Some(i)) = (mc.utilization, outer.utilization, inner.utilization) {
            prop_assert!(o <= m * (1.0 + 1e-9) + 1e-12, "outer {o} > MC {m}");
            prop_assert!(i >= m * (1.0 - 1e-9) - 1e-12, "inscribed {i} < MC {m}");
        }
    }
}

/// A triaxial state on a meridian, scaled onto the MC surface.
fn on_mc_surface(m: &MohrCoulomb, principal: [f64; 3]) -> StressTensor {
    let s = Strengths {
        cohesion_pa: Some(m.cohesion_pa),
        friction_angle_deg: Some(m.friction_angle_deg),
        ..Strengths::default()
    };
    let t = StressTensor::diagonal_pa(principal[0], principal[1], principal[2]).unwrap();
    let f = criteria::verdict(&t, Criterion::MohrCoulomb, &s)
        .factor_of_safety
        .unwrap();
    // A general orientation, so nothing depends on the axes.
    let q = Rotation3::from_euler_angles(0.3, -0.7, 1.1).into_inner();
    let d = Matrix3::from_diagonal(&Vector3::from(principal.map(|v| v * f)));
    StressTensor::from_matrix_pa(&(q * d * q.transpose())).unwrap()
}

#[test]
fn each_drucker_prager_fit_matches_what_it_is_named_for() {
    for phi in [10.0, 20.0, 30.0, 40.0] {
        let m = MohrCoulomb::new(4.0 * MPA, phi).unwrap();
        let u = |t: &StressTensor, fit| {
            let s = Strengths {
                cohesion_pa: Some(m.cohesion_pa),
                friction_angle_deg: Some(phi),
                dp_fit: fit,
                ..Strengths::default()
            };
            criteria::verdict(t, Criterion::DruckerPrager, &s)
                .utilization
                .unwrap()
        };
        // Compression meridian: σ1 = σ2 > σ3 (tension positive), e.g. confined compression.
        for confining in [0.0, -5.0, -20.0] {
            let t = on_mc_surface(
                &m,
                [confining * MPA, confining * MPA, (confining - 100.0) * MPA],
            );
            let got = u(&t, DruckerPragerFit::CompressionMeridian);
            assert!(
                (got - 1.0).abs() < 1e-12,
                "φ {phi}: compression meridian U {got}"
            );
        }
        // Tension meridian: σ1 > σ2 = σ3.
        for confining in [0.0, -5.0, -20.0] {
            let t = on_mc_surface(
                &m,
                [(confining + 100.0) * MPA, confining * MPA, confining * MPA],
            );
            let got = u(&t, DruckerPragerFit::TensionMeridian);
            assert!(
                (got - 1.0).abs() < 1e-12,
                "φ {phi}: tension meridian U {got}"
            );
        }
        // Plane strain with associated flow, tan φ / √(9 + 12 tan² φ) and 3c / √(9 + 12 tan² φ)
        // (Chen & Han 1988), is algebraically the inscribed cone.
        let (a1, k1) = DruckerPragerFit::PlaneStrain.alpha_k(&m);
        let (a2, k2) = DruckerPragerFit::Inscribed.alpha_k(&m);
        assert!((a1 - a2).abs() < 1e-15 && (k1 - k2).abs() < 1e-6, "φ {phi}");
    }
    // Published closed forms at φ = 30°, c = 1 (Chen & Han 1988, §5.4; values worked by hand
    // from the formulas): outer α = 1/(2.5√3) = 0.23094, k = 1.2 c.
    let m = MohrCoulomb::new(1.0, 30.0).unwrap();
    let (a, k) = DruckerPragerFit::CompressionMeridian.alpha_k(&m);
    assert!((a - 0.230_940_107_675_850_3).abs() < 1e-12 && (k - 1.2).abs() < 1e-12);
    let (a, k) = DruckerPragerFit::TensionMeridian.alpha_k(&m);
    assert!((a - 1.0 / (3.5 * 3.0_f64.sqrt())).abs() < 1e-12 && (k - 6.0 / 7.0).abs() < 1e-12);
}

#[test]
fn scaling_that_never_reaches_the_surface_says_so() {
    let cohesive = Strengths {
        yield_strength_pa: Some(250.0 * MPA),
        cohesion_pa: Some(5.0 * MPA),
        friction_angle_deg: Some(30.0),
        ..Strengths::default()
    };
    // Hydrostatic compression: no deviator, so von Mises has no demand (U = 0, no factor), and
    // the pressure-dependent criteria are never reached by scaling.
    let h = StressTensor::diagonal_pa(-50.0 * MPA, -50.0 * MPA, -50.0 * MPA).unwrap();
    let vm = criteria::verdict(&h, Criterion::VonMises, &cohesive);
    assert_eq!((vm.utilization, vm.factor_of_safety), (Some(0.0), None));
    for c in [Criterion::MohrCoulomb, Criterion::DruckerPrager] {
        let v = criteria::verdict(&h, c, &cohesive);
        assert_eq!(v.condition, Condition::NeverReaches, "{c:?}");
        assert_eq!((v.utilization, v.factor_of_safety), (None, None));
        assert_eq!(v.outcome(), Outcome::Passes);
    }
    // A cohesionless material and a state with shear: outside at any scale.
    let sand = Strengths {
        cohesion_pa: Some(0.0),
        friction_angle_deg: Some(30.0),
        ..Strengths::default()
    };
    let shear = StressTensor::from_pa([0.0, 0.0, 0.0, 10.0 * MPA, 0.0, 0.0]).unwrap();
    let v = criteria::verdict(&shear, Criterion::MohrCoulomb, &sand);
    assert_eq!(v.condition, Condition::FailsAtAnyScale);
    assert_eq!(v.outcome(), Outcome::Fails);
}

#[test]
fn fault_check_follows_the_published_definitions() {
    // Principal stresses 30, 20, 10 MPa compression along x, y, z; the plane with normal
    // (1, 1, 0)/√2: σn = 25 MPa, τ = 5 MPa (Mohr's circle by hand). p = 5 MPa: σn′ = 20 MPa.
    let t = StressTensor::diagonal_pa(-30.0 * MPA, -20.0 * MPA, -10.0 * MPA).unwrap();
    let n = PlaneNormal::from_vector(Vector3::new(1.0, 1.0, 0.0)).unwrap();
    let m = MohrCoulomb::new(1.0 * MPA, 30.0).unwrap();
    let f = criteria::fault_check(&t, n, 5.0 * MPA, Some(&m)).unwrap();
    let close = |a: f64, b: f64, what: &str| assert!((a - b).abs() < 1e-9, "{what}: {a} vs {b}");
    close(f.effective_normal_stress_pa / MPA, 20.0, "σn′");
    close(f.shear_stress_pa / MPA, 5.0, "τ");
    // Slip tendency τ/σn′ (Morris et al. 1996) = 0.25.
    close(f.slip_tendency.utilization.unwrap(), 0.25, "Ts");
    // Dilation tendency (σ1 − σn)/(σ1 − σ3) (Ferrill et al. 1999) = (30 − 25)/20 = 0.25.
    close(f.dilation_tendency.utilization.unwrap(), 0.25, "Td");
    // Coulomb: τ/(c + σn′ tan φ) = 5/(1 + 20 tan 30°).
    let tan = 30.0_f64.to_radians().tan();
    close(
        f.mohr_coulomb.unwrap().utilization.unwrap(),
        5.0 / (1.0 + 20.0 * tan),
        "U",
    );
    // Δp = σn′ − (τ − c)/tan φ = 20 − 4/tan 30° MPa; at p + Δp the plane is on the envelope.
    let dp = f.pore_pressure_to_slip_pa.unwrap();
    close(dp / MPA, 20.0 - 4.0 / tan, "Δp");
    let at_slip = criteria::fault_check(&t, n, 5.0 * MPA + dp, Some(&m)).unwrap();
    close(
        at_slip.mohr_coulomb.unwrap().utilization.unwrap(),
        1.0,
        "U at p + Δp",
    );
    // With φ = 0 pore pressure does not change the strength: no Δp.
    let clay = MohrCoulomb::new(1.0 * MPA, 0.0).unwrap();
    let f0 = criteria::fault_check(&t, n, 0.0, Some(&clay)).unwrap();
    assert_eq!(f0.pore_pressure_to_slip_pa, None);
}

#[test]
fn analyze_reports_every_criterion_and_the_fault() {
    let out = common::planewise(&[
        "analyze",
        "--stress",
        "xx=-30,yy=-20,zz=-10",
        "--normal",
        "1,1,0",
        "--yield-strength",
        "250",
        "--cohesion",
        "1",
        "--friction-angle",
        "30",
        "--pore-pressure",
        "5",
        "--json",
    ]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let j: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let criteria = j["criteria"].as_array().unwrap();
    let names: Vec<&str> = criteria
        .iter()
        .map(|c| c["name"].as_str().unwrap())
        .collect();
    assert_eq!(
        names,
        [
            "von-mises",
            "tresca",
            "rankine",
            "mohr-coulomb",
            "drucker-prager"
        ]
    );
    let by = |n: &str| criteria.iter().find(|c| c["name"] == n).unwrap();
    // von Mises of principal stresses −30, −20, −10: √(((10)² + (10)² + (20)²)/2) = √300 MPa
    // (closed form), against 250 MPa.
    let vm = by("von-mises");
    assert!((vm["governing_stress"].as_f64().unwrap() - 300.0_f64.sqrt()).abs() < 1e-9);
    assert!((vm["utilization"].as_f64().unwrap() - 300.0_f64.sqrt() / 250.0).abs() < 1e-12);
    assert_eq!(vm["outcome"], "passes");
    // No tensile or compressive strength: Rankine is not checked, with null numbers.
    let r = by("rankine");
    assert_eq!(r["condition"], "not-checked");
    assert!(r["utilization"].is_null() && r["factor_of_safety"].is_null());
    // Mohr–Coulomb on effective stress (p = 5 MPa given): σ′ = σ + p·I = −25, −15, −5 MPa, so
    // the demand (σ1′ − σ3′) + (σ1′ + σ3′) sin φ = 20 − 30 × 0.5 = 5 MPa against
    // 2 c cos φ = √3 MPa (worked by hand; Labuz & Zang 2012's form). On total stress it would
    // have been 20 − 40 × 0.5 = 0.
    let mc = by("mohr-coulomb");
    assert!((mc["governing_stress"].as_f64().unwrap() - 5.0).abs() < 1e-9);
    assert!((mc["strength"].as_f64().unwrap() - 3.0_f64.sqrt()).abs() < 1e-9);
    assert!(
        mc["stress_basis"]
            .as_str()
            .unwrap()
            .starts_with("effective stress")
    );
    assert!(
        vm["stress_basis"]
            .as_str()
            .unwrap()
            .starts_with("unaffected")
    );
    let fault = &j["plane"]["fault"];
    assert!((fault["slip_tendency"].as_f64().unwrap() - 0.25).abs() < 1e-12);
    assert!((fault["dilation_tendency"].as_f64().unwrap() - 0.25).abs() < 1e-12);
    let tan = 30.0_f64.to_radians().tan();
    assert!((fault["pore_pressure_to_slip"].as_f64().unwrap() - (20.0 - 4.0 / tan)).abs() < 1e-9);
}

#[test]
fn analyze_refuses_strengths_it_cannot_use() {
    let with = |extra: &[&'static str]| -> Vec<&'static str> {
        let mut v: Vec<&'static str> = vec!["--stress", "xx=1"];
        v.extend_from_slice(extra);
        v
    };
    let cases: Vec<(Vec<&str>, &str)> = vec![
        (with(&["--yield-strength", "-5"]), "--yield-strength"),
        (with(&["--yield-strength", "abc"]), "--yield-strength"),
        (with(&["--cohesion", "2"]), "--friction-angle"),
        (
            with(&["--cohesion", "2", "--friction-angle", "95"]),
            "--friction-angle",
        ),
        (with(&["--dp-fit", "inscribed"]), "--dp-fit"),
        (with(&["--dp-fit", "round"]), "--dp-fit"),
        (with(&["--pore-pressure", "3"]), "--pore-pressure"),
    ];
    let borrowed: Vec<(&[&str], &str)> = cases.iter().map(|(a, n)| (a.as_slice(), *n)).collect();
    common::assert_bad_input("analyze", &borrowed);
}

#[test]
fn the_envelope_ranks_by_a_criterions_utilization() {
    use planewise::study::{EnvelopeMeasure, Project, envelope};
    let mut project = Project::demo();
    let plane = project.measure.settings(project.convention());
    // The demo's material has a yield strength only: von Mises is ranked, the governing row
    // is the largest von Mises utilization found by a plain loop.
    let env = envelope(
        &project,
        EnvelopeMeasure::Utilization(Criterion::VonMises),
        &plane,
    )
    .unwrap();
    let worst = project
        .names()
        .into_iter()
        .map(|(n, _)| {
            let t = project.tensor(n).unwrap();
            let u = criteria::verdict(&t, Criterion::VonMises, &project.material.strengths)
                .utilization
                .unwrap();
            (n.to_owned(), u)
        })
        .max_by(|a, b| a.1.total_cmp(&b.1))
        .unwrap();
    assert_eq!(env.governing.as_deref(), Some(worst.0.as_str()));
    assert!((env.rows[0].value.unwrap() - worst.1).abs() < 1e-15);
    // Rankine is not checked without tensile or compressive strength: nothing governs.
    let env = envelope(
        &project,
        EnvelopeMeasure::Utilization(Criterion::Rankine),
        &plane,
    )
    .unwrap();
    assert_eq!(env.governing, None);
    assert!(
        env.rows
            .iter()
            .all(|r| r.verdict == Some(Condition::NotChecked))
    );
    // Give it a tensile strength and it ranks.
    project.material.strengths.tensile_strength_pa = Some(100.0 * MPA);
    let env = envelope(
        &project,
        EnvelopeMeasure::Utilization(Criterion::Rankine),
        &plane,
    )
    .unwrap();
    assert!(env.governing.is_some());
}

#[test]
fn named_faults_are_checked_at_once_and_sorted() {
    // The same principal stresses as above; F2 by strike/dip with the right-hand rule
    // (strike 45°, dip 90° → dip direction 135°, normal (1, −1, 0)/√2): σn = 25, τ = 5 MPa.
    let out = common::planewise(&[
        "analyze",
        "--stress",
        "xx=-30,yy=-20,zz=-10",
        "--fault",
        "F1=90/90",
        "--fault-strike",
        "F2=45/90",
        "--cohesion",
        "1",
        "--friction-angle",
        "30",
        "--pore-pressure",
        "5",
        "--json",
    ]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let j: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let faults = j["faults"].as_array().unwrap();
    assert_eq!(faults[0]["name"], "F2", "highest slip tendency first");
    assert!((faults[0]["dip_direction_deg"].as_f64().unwrap() - 135.0).abs() < 1e-12);
    assert!((faults[0]["slip_tendency"].as_f64().unwrap() - 0.25).abs() < 1e-12);
    // F1 is the x face: σn = 30 MPa, no shear: slip tendency 0.
    assert!(faults[1]["slip_tendency"].as_f64().unwrap().abs() < 1e-12);
    common::assert_bad_input(
        "analyze",
        &[
            (&["--stress", "xx=1", "--fault", "F1=95/10"], "--fault"),
            (&["--stress", "xx=1", "--fault", "F1"], "--fault"),
            (
                &["--stress", "xx=1", "--fault-strike", "F=10/x"],
                "--fault-strike",
            ),
        ],
    );
}
