//! The worst-plane search against brute force, its closed forms against the numerical search,
//! and `planewise worst-plane` from outside.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

mod common;

use nalgebra::{Matrix3, Rotation3, Vector3};
use planewise::mechanics::criteria::{self, MohrCoulomb};
use planewise::mechanics::search::{
    Measure, SearchSettings, WorstCondition, numerical_value, worst_plane,
};
use planewise::mechanics::{PlaneNormal, PlaneStress, SignConvention, StressTensor};
use proptest::prelude::*;

const MPA: f64 = 1e6;

/// The measure on one plane, computed the plain way (Cauchy's formula through `PlaneStress` and
/// the criteria functions), independently of the search's principal-frame formulas.
fn measure_at(t: &StressTensor, n: PlaneNormal, s: &SearchSettings) -> Option<f64> {
    let tp = PlaneStress::new(t, n, SignConvention::TensionPositive);
    let shown = PlaneStress::new(t, n, s.convention);
    let cp = PlaneStress::new(t, n, SignConvention::CompressionPositive);
    match s.measure {
        Measure::Shear => Some(tp.shear_stress_pa),
        Measure::NormalMax | Measure::NormalMin => Some(shown.normal_stress_pa),
        Measure::Traction => Some(tp.traction_pa.norm()),
        Measure::SlipTendency => {
            criteria::slip_tendency(t, n, s.pore_pressure_pa)
                .unwrap()
                .utilization
        }
        Measure::DilationTendency => criteria::dilation_tendency(t, n).utilization,
        Measure::MohrCoulomb => {
            let m = s.material.unwrap();
            let capacity = m.cohesion_pa
                + (cp.normal_stress_pa - s.pore_pressure_pa)
                    * m.friction_angle_deg.to_radians().tan();
            (capacity > 0.0).then(|| cp.shear_stress_pa / capacity)
        }
    }
}

/// Brute force: 20,000 normals spread over the hemisphere (a Fibonacci lattice), then repeated
/// zooms of a 21×21 patch around the best sample. No knowledge of principal frames. Returns the
/// worst value: the largest, or for normal-min the smallest.
fn brute_force(t: &StressTensor, s: &SearchSettings) -> f64 {
    let sign = if s.measure.worst_is_smallest() {
        -1.0
    } else {
        1.0
    };
    sign * brute_force_rank(t, s, sign)
}

fn brute_force_rank(t: &StressTensor, s: &SearchSettings, sign: f64) -> f64 {
    let f = |v: Vector3<f64>| {
        PlaneNormal::from_vector(v)
            .ok()
            .and_then(|n| measure_at(t, n, s))
            .map_or(f64::NEG_INFINITY, |v| sign * v)
    };
    let count: u32 = 20_000;
    let golden = std::f64::consts::PI * (3.0 - 5.0_f64.sqrt());
    let (mut best_v, mut best_n) = (f64::NEG_INFINITY, Vector3::z());
    for i in 0..count {
        let z = 1.0 - (f64::from(i) + 0.5) / f64::from(count);
        let r = (1.0 - z * z).sqrt();
        let n = Vector3::new(
            r * (golden * f64::from(i)).cos(),
            r * (golden * f64::from(i)).sin(),
            z,
        );
        let v = f(n);
        if v > best_v {
            (best_v, best_n) = (v, n);
        }
    }
    let mut radius = 0.05;
    for _ in 0..26 {
        let (u, w) = planewise::mechanics::principal::orthogonal_complement(&best_n);
        let centre = best_n;
        for i in -10..=10 {
            for k in -10..=10 {
                let n = (centre
                    + u * (radius * f64::from(i) / 10.0)
                    + w * (radius * f64::from(k) / 10.0))
                    .normalize();
                let v = f(n);
                if v > best_v {
                    (best_v, best_n) = (v, n);
                }
            }
        }
        radius /= 4.0;
    }
    best_v
}

/// Compressive states (tension-positive storage: all principal values negative) in a random
/// frame, as faults and joints at depth see them.
fn compressive() -> impl Strategy<Value = StressTensor> {
    (
        prop::array::uniform3(1.0..100.0_f64),
        prop::array::uniform3(-3.2..3.2_f64),
    )
        .prop_map(|(u, e)| {
            let q = Rotation3::from_euler_angles(e[0], e[1], e[2]).into_inner();
            let d = Matrix3::from_diagonal(&Vector3::from(u.map(|x| -x * MPA)));
            StressTensor::from_matrix_pa(&(q * d * q.transpose())).unwrap()
        })
}

fn general() -> impl Strategy<Value = StressTensor> {
    prop::array::uniform6(-100.0..100.0_f64)
        .prop_map(|c| StressTensor::from_pa(c.map(|v| v * MPA)).unwrap())
}

/// The search's value is at least the brute force's, and every plane it names attains it. With
/// `close`, the two must also agree to 1e-9: the brute force reaches the maximum.
fn check(t: &StressTensor, s: &SearchSettings, close: bool) -> Result<(), TestCaseError> {
    let result = worst_plane(t, s).unwrap();
    if result.condition != WorstCondition::Defined {
        return Ok(());
    }
    let ours = result.value.unwrap();
    let sampled = brute_force(t, s);
    let scale = if s.measure.is_stress() {
        100.0 * MPA
    } else {
        1.0
    };
    let sign = if s.measure.worst_is_smallest() {
        -1.0
    } else {
        1.0
    };
    prop_assert!(
        sign * ours >= sign * sampled - 1e-12 * scale,
        "{:?}: search {ours} below sampled {sampled}",
        s.measure
    );
    prop_assert!(
        !close || (ours - sampled).abs() <= 1e-9 * sampled.abs().max(1e-3 * scale),
        "{:?}: {ours} vs {sampled}",
        s.measure
    );
    prop_assert!(!result.planes.is_empty());
    for p in &result.planes {
        let v = measure_at(t, p.normal, s).unwrap();
        prop_assert!(
            (v - ours).abs() <= 1e-9 * ours.abs().max(1e-3 * scale),
            "{:?}: plane gives {v}, value {ours}",
            s.measure
        );
    }
    Ok(())
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(24))]

    #[test]
    fn numerical_measures_match_brute_force(
        t in compressive(),
        p_frac in 0.0..0.5_f64,
        c in 0.0..10.0_f64,
        phi in 10.0..45.0_f64,
    ) {
        // Two nearly equal principal stresses make the worst planes an almost-flat ridge around
        // a cone: the brute force's zoom then stops wherever it met the ridge, up to ~1e-5 below
        // the maximum (proptest found 95.41 and 95.26 MPa). There the search is only held to
        // beating the brute force and attaining its value; closeness is asserted when the
        // principal stresses are at least 5 % apart.
        let values = planewise::mechanics::principal_values_pa(&t);
        let spread = values[2].abs().max(values[0].abs());
        let close = (values[1] - values[0]).abs() > 0.05 * spread
            && (values[2] - values[1]).abs() > 0.05 * spread;
        let least = values[0].abs();
        let pore = p_frac * least;
        for measure in [Measure::SlipTendency, Measure::MohrCoulomb] {
            let s = SearchSettings {
                measure,
                convention: SignConvention::CompressionPositive,
                pore_pressure_pa: pore,
                material: Some(MohrCoulomb::new(c * MPA, phi).unwrap()),
            };
            check(&t, &s, close)?;
        }
    }

    #[test]
    fn closed_form_measures_match_brute_force_and_the_numerical_search(t in general()) {
        for measure in [Measure::Shear, Measure::NormalMax, Measure::NormalMin, Measure::Traction, Measure::DilationTendency] {
            for convention in [SignConvention::TensionPositive, SignConvention::CompressionPositive] {
                let s = SearchSettings { measure, convention, pore_pressure_pa: 0.0, material: None };
                // The traction magnitude has a near-flat ridge between two principal directions
                // whose |σi| are nearly equal: the brute force's zoom can stop ~1e-8 below the
                // maximum there (proptest found 133510336.58 vs 133510335.49 Pa), as for the
                // numerical measures above; the search is then held to beating it.
                let mut magnitudes = planewise::mechanics::principal_values_pa(&t).map(f64::abs);
                magnitudes.sort_by(|a, b| b.total_cmp(a));
                let close = measure != Measure::Traction || magnitudes[0] - magnitudes[1] > 0.05 * magnitudes[0];
                check(&t, &s, close)?;
                let closed = worst_plane(&t, &s).unwrap().value.unwrap();
                let numeric = numerical_value(&t, &s).unwrap();
                let scale = if measure.is_stress() { 100.0 * MPA } else { 1.0 };
                prop_assert!((closed - numeric).abs() <= 1e-9 * closed.abs().max(1e-3 * scale), "{measure:?}: closed {closed} vs numerical {numeric}");
            }
        }
    }
}

#[test]
fn max_shear_planes_are_the_two_closed_form_normals() {
    // σ = diag(100, 40, −20) MPa: τmax = 60 MPa on normals (x ± z)/√2 (closed form).
    let t = StressTensor::diagonal_pa(100.0 * MPA, 40.0 * MPA, -20.0 * MPA).unwrap();
    let s = SearchSettings {
        measure: Measure::Shear,
        convention: SignConvention::TensionPositive,
        pore_pressure_pa: 0.0,
        material: None,
    };
    let r = worst_plane(&t, &s).unwrap();
    assert!((r.value.unwrap() - 60.0 * MPA).abs() < 1e-6);
    assert_eq!(r.planes.len(), 2);
    for p in &r.planes {
        let n = p.normal.vector();
        assert!((n.x.abs() - std::f64::consts::FRAC_1_SQRT_2).abs() < 1e-12 && n.y.abs() < 1e-12);
    }
}

#[test]
fn slip_tendency_worked_example_is_not_exceeded() {
    // Compression-positive E/N/U 20, 40, 50 MPa (the worked example in tests/reference.rs): the
    // dip 60° / dip direction 090° plane has Ts = 0.4724; the worst plane can only be higher,
    // and lies in the σ1–σ3 plane (y = 0 here), as Morris et al. (1996) note for the maximum.
    let t = StressTensor::diagonal_pa(-20.0 * MPA, -40.0 * MPA, -50.0 * MPA).unwrap();
    let s = SearchSettings {
        measure: Measure::SlipTendency,
        convention: SignConvention::CompressionPositive,
        pore_pressure_pa: 0.0,
        material: None,
    };
    let r = worst_plane(&t, &s).unwrap();
    assert!(r.value.unwrap() >= 0.472_377_492_973_330_17);
    // Closed form for the maximum over planes containing σ1 and σ3: Ts = (σ1 − σ3) / (2√(σ1σ3))
    // (from tan of the Mohr envelope touching the largest circle; derived by hand).
    let expected = (50.0 - 20.0) / (2.0 * (50.0_f64 * 20.0).sqrt());
    assert!(
        (r.value.unwrap() - expected).abs() < 1e-12,
        "{} vs {expected}",
        r.value.unwrap()
    );
    assert_eq!(r.planes.len(), 2, "two symmetric planes");
    for p in &r.planes {
        assert!(p.normal.vector().y.abs() < 1e-9);
    }
}

#[test]
fn effective_tension_is_reported_not_divided_by() {
    // Pore pressure above the least compressive stress: planes normal to it would open.
    let t = StressTensor::diagonal_pa(-20.0 * MPA, -40.0 * MPA, -50.0 * MPA).unwrap();
    let s = SearchSettings {
        measure: Measure::SlipTendency,
        convention: SignConvention::CompressionPositive,
        pore_pressure_pa: 25.0 * MPA,
        material: None,
    };
    let r = worst_plane(&t, &s).unwrap();
    assert_eq!(r.condition, WorstCondition::EffectiveTension);
    assert_eq!(r.value, None);
    assert_eq!(r.planes.len(), 1);
    assert!(
        (r.planes[0].normal.vector().x.abs() - 1.0).abs() < 1e-12,
        "the plane normal to the least compressive stress"
    );
}

mod cli {
    use crate::common::planewise;

    #[test]
    fn json_contract() {
        let out = planewise(&[
            "worst-plane",
            "--stress",
            "xx=20,yy=40,zz=50",
            "--compression-positive",
            "--measure",
            "mohr-coulomb",
            "--cohesion",
            "5",
            "--friction-angle",
            "30",
            "--pore-pressure",
            "10",
            "--json",
        ]);
        assert!(
            out.status.success(),
            "{}",
            String::from_utf8_lossy(&out.stderr)
        );
        let j: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
        assert_eq!(j["measure"], "mohr-coulomb");
        assert!(j["value"].as_f64().unwrap() > 0.0);
        let planes = j["planes"].as_array().unwrap();
        assert!(!planes.is_empty());
        for key in [
            "normal",
            "dip_deg",
            "dip_direction_deg",
            "normal_stress",
            "shear_stress",
        ] {
            assert!(planes[0].get(key).is_some(), "missing {key}");
        }
        let out = planewise(&[
            "worst-plane",
            "--stress",
            "xx=100,yy=40,zz=-20",
            "--measure",
            "shear",
            "--json",
        ]);
        let j: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
        assert!((j["value"].as_f64().unwrap() - 60.0).abs() < 1e-9);
    }

    #[test]
    fn bad_input_exits_2_with_one_line() {
        let cases: &[(&[&str], &str)] = &[
            (&["--stress", "xx=1", "--measure", "wobble"], "--measure"),
            (
                &["--stress", "xx=1", "--measure", "mohr-coulomb"],
                "--measure",
            ),
            (
                &[
                    "--stress",
                    "xx=1",
                    "--measure",
                    "mohr-coulomb",
                    "--cohesion",
                    "5",
                ],
                "--friction-angle",
            ),
            (
                &[
                    "--stress",
                    "xx=1",
                    "--measure",
                    "mohr-coulomb",
                    "--cohesion",
                    "5",
                    "--friction-angle",
                    "95",
                ],
                "--friction-angle",
            ),
            (
                &[
                    "--stress",
                    "xx=1",
                    "--measure",
                    "mohr-coulomb",
                    "--cohesion",
                    "-5",
                    "--friction-angle",
                    "30",
                ],
                "--cohesion",
            ),
            (
                &[
                    "--stress",
                    "xx=1",
                    "--measure",
                    "slip-tendency",
                    "--pore-pressure",
                    "abc",
                ],
                "--pore-pressure",
            ),
            (&["--stress", "xx=nan", "--measure", "shear"], "--stress"),
        ];
        super::common::assert_bad_input("worst-plane", cases);
    }
}
