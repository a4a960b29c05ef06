//! Every number and label the engineer reads is right: the sign of normal-min, deviatoric
//! precision under a large mean stress, the shear direction and rake, degenerate states, and
//! bad input that must be refused.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

mod common;

use common::{assert_bad_input, planewise};
use nalgebra::Vector3;
use planewise::mechanics::search::{Measure, SearchSettings, WorstCondition, worst_plane};
use planewise::mechanics::{Analysis, PlaneNormal, PlaneStress, SignConvention, StressTensor};

const MPA: f64 = 1e6;

fn json(args: &[&str]) -> serde_json::Value {
    let out = planewise(args);
    assert!(
        out.status.success(),
        "{args:?}: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).unwrap()
}

fn settings(measure: Measure) -> SearchSettings {
    SearchSettings {
        measure,
        convention: SignConvention::TensionPositive,
        pore_pressure_pa: 0.0,
        material: None,
    }
}

// ---------------------------------------------------------------------------------------------
// 1. normal-min reports the smallest normal stress itself.

#[test]
fn normal_min_value_is_the_smallest_normal_stress() {
    // σ = diag(250, −100, 0) MPa: the smallest normal stress is σ3 = −100 MPa on the plane
    // normal to y (closed form: σn = n·σ·n is smallest on n3; common practice, no source).
    let j = json(&[
        "worst-plane",
        "--stress",
        "xx=250,yy=-100",
        "--measure",
        "normal-min",
        "--json",
    ]);
    assert_eq!(j["value"].as_f64(), Some(-100.0));
    assert_eq!(j["value_unit"], "MPa");
    let planes = j["planes"].as_array().unwrap();
    assert_eq!(planes.len(), 1);
    assert_eq!(planes[0]["normal_stress"].as_f64(), Some(-100.0));
    let text = planewise(&[
        "worst-plane",
        "--stress",
        "xx=250,yy=-100",
        "--measure",
        "normal-min",
    ]);
    let text = String::from_utf8_lossy(&text.stdout);
    assert!(text.contains(": -100 MPa"), "{text}");
    // Compression positive: the same plane, now σn = +100 MPa as shown, and still the smallest
    // shown value is the one reported (σ = −250 on x is smaller).
    let j = json(&[
        "worst-plane",
        "--stress",
        "xx=-250,yy=100",
        "--compression-positive",
        "--measure",
        "normal-min",
        "--json",
    ]);
    assert_eq!(j["value"].as_f64(), Some(-250.0));
}

// ---------------------------------------------------------------------------------------------
// 2. Deviatoric quantities keep their digits under a large mean stress.

#[test]
fn deviatoric_results_keep_their_digits_under_a_large_mean() {
    // Mean 1e9 Pa, deviator of order 1e-3 Pa. The diagonal is chosen so that every sum in the
    // mean is exact in f64 ((1e9 + 2⁻⁹) + (1e9 − 2⁻⁹) = 2e9 exactly; 3e9 / 3 = 1e9), so the
    // deviator s is exactly diag(2⁻⁹, −2⁻⁹, 0) plus the shear components. Reference values:
    // exact arithmetic of that deviator, J2 = ½ s:s, J3 = det s (Chen & Han, Plasticity for
    // Structural Engineers, 1988, §2.2), σvM = √(3 J2), τoct = √(2 J2 / 3).
    let h = 2.0_f64.powi(-9);
    let (xy, yz, zx) = (3e-3, -1e-3, 2e-3);
    let t = StressTensor::from_pa([1e9 + h, 1e9 - h, 1e9, xy, yz, zx]).unwrap();
    let (a, b, c) = (h, -h, 0.0);
    let j2 = 0.5 * (a * a + b * b + c * c) + xy * xy + yz * yz + zx * zx;
    let j3 = a * (b * c - yz * yz) - xy * (xy * c - yz * zx) + zx * (xy * yz - b * zx);
    let an = Analysis::new(&t, SignConvention::TensionPositive);
    let rel = |x: f64, e: f64| (x - e).abs() / e.abs();
    assert!(rel(an.invariants.j2, j2) < 1e-12, "J2 {}", an.invariants.j2);
    assert!(rel(an.invariants.j3, j3) < 1e-11, "J3 {}", an.invariants.j3);
    assert!(rel(an.von_mises_pa, (3.0 * j2).sqrt()) < 1e-12);
    assert!(rel(an.octahedral_shear_pa, (2.0 * j2 / 3.0).sqrt()) < 1e-12);
    // Tresca and the maximum shear against the deviator's eigenvalues from nalgebra's solver
    // (a general-purpose reference library), run on the deviator alone.
    let dev = nalgebra::Matrix3::new(a, xy, zx, xy, b, yz, zx, yz, c);
    let eig = nalgebra::SymmetricEigen::new(dev).eigenvalues;
    let spread = eig.max() - eig.min();
    assert!(rel(an.tresca_pa, spread) < 1e-12, "Tresca {}", an.tresca_pa);
    assert!(rel(an.max_shear_pa, 0.5 * spread) < 1e-12);
    // Compression positive: the same magnitudes.
    let cp = Analysis::new(&t, SignConvention::CompressionPositive);
    assert!(rel(cp.von_mises_pa, (3.0 * j2).sqrt()) < 1e-12);
    assert!(rel(cp.tresca_pa, spread) < 1e-12);
    // Shear on a plane: τ from the worst-plane search matches the maximum shear.
    let r = worst_plane(&t, &settings(Measure::Shear)).unwrap();
    assert!(rel(r.value.unwrap(), 0.5 * spread) < 1e-9);
}

// ---------------------------------------------------------------------------------------------
// 3. Shear direction and rake.

/// Tension-positive tensor from compression-positive E, N, U stresses (x = east, y = north,
/// z = up), in MPa.
fn geo(east: f64, north: f64, up: f64) -> StressTensor {
    StressTensor::diagonal_pa(-east * MPA, -north * MPA, -up * MPA).unwrap()
}

fn rake(t: &StressTensor, dip: f64, dip_direction: f64) -> f64 {
    let n = PlaneNormal::from_dip(dip, dip_direction).unwrap();
    let tp = PlaneStress::new(t, n, SignConvention::TensionPositive);
    let cp = PlaneStress::new(t, n, SignConvention::CompressionPositive);
    assert_eq!(
        tp.shear_direction, cp.shear_direction,
        "shear direction must not depend on the display convention"
    );
    // The flipped normal names the same plane and the same slip.
    let flipped = PlaneStress::new(t, n.flipped(), SignConvention::TensionPositive);
    let r = tp.rake_deg().unwrap();
    assert!((flipped.rake_deg().unwrap() - r).abs() < 1e-9);
    r
}

#[test]
fn rake_follows_the_published_convention() {
    // Aki & Richards (1980), Quantitative Seismology, §4.2 (convention from memory): rake from
    // the strike (right-hand rule) to the hanging wall's slip; −90° pure normal slip, +90° pure
    // reverse slip, 0° or ±180° pure strike slip. Anderson's faulting regimes (Anderson, The
    // Dynamics of Faulting, 1951) give which regime slips how.

    // Normal regime: vertical stress largest (compression positive: Sv = 60, SHmax = 40 along
    // east, Shmin = 20 along north). A plane striking along SHmax (east–west), dipping 60° to
    // the north (dip direction 0°): pure normal slip.
    let t = geo(40.0, 20.0, 60.0);
    assert!((rake(&t, 60.0, 0.0) + 90.0).abs() < 1e-9);
    // The same plane dipping to the south: still normal slip.
    assert!((rake(&t, 60.0, 180.0) + 90.0).abs() < 1e-9);

    // Thrust regime: both horizontal stresses above the vertical (SHmax = 60 east, Shmin = 40
    // north, Sv = 20). A plane striking perpendicular to SHmax (north–south), dipping 30° east:
    // pure reverse slip.
    let t = geo(60.0, 40.0, 20.0);
    assert!((rake(&t, 30.0, 90.0) - 90.0).abs() < 1e-9);
    assert!((rake(&t, 30.0, 270.0) - 90.0).abs() < 1e-9);

    // Strike-slip regime: SHmax = 60 east, Sv = 40, Shmin = 20 north. A vertical plane striking
    // 30° (60° from SHmax) carries pure strike slip: 0° or ±180°.
    let t = geo(60.0, 20.0, 40.0);
    let r = rake(&t, 90.0, 120.0);
    assert!(r.abs() < 1e-9 || (r.abs() - 180.0).abs() < 1e-9, "rake {r}");
    // Turned the other way (strike 150°, 60° from SHmax on the other side), the opposite sense.
    let r2 = rake(&t, 90.0, 60.0);
    assert!(
        r2.abs() < 1e-9 || (r2.abs() - 180.0).abs() < 1e-9,
        "rake {r2}"
    );
    assert!((r - r2).abs() > 179.0, "{r} and {r2}");
}

#[test]
fn shear_direction_points_the_way_the_material_in_front_slides() {
    // Simple shear σxy = τ > 0 (tension positive) on the plane with normal +x: the traction on
    // the +x face is (0, τ, 0), so the material on the +x side is pushed towards +y (Cauchy's
    // formula; common practice, no source). Same answer in both conventions.
    let t = StressTensor::from_pa([0.0, 0.0, 0.0, 5e6, 0.0, 0.0]).unwrap();
    for convention in [
        SignConvention::TensionPositive,
        SignConvention::CompressionPositive,
    ] {
        let ps = PlaneStress::new(&t, PlaneNormal::X, convention);
        let d = ps.shear_direction.unwrap();
        assert!((d - Vector3::y()).norm() < 1e-15, "{convention:?}: {d}");
    }
}

#[test]
fn rake_in_json_and_null_when_undefined() {
    let j = json(&[
        "analyze",
        "--stress",
        "xx=40,yy=20,zz=60",
        "--compression-positive",
        "--dip",
        "60",
        "--dip-direction",
        "0",
        "--json",
    ]);
    assert!((j["plane"]["rake_deg"].as_f64().unwrap() + 90.0).abs() < 1e-9);
    // Horizontal plane: no strike, rake null.
    let j = json(&[
        "analyze",
        "--stress",
        "xx=40,yy=20,zz=60,zx=5",
        "--normal",
        "0,0,1",
        "--json",
    ]);
    assert!(j["plane"]["rake_deg"].is_null());
    // Principal plane: no shear, rake null.
    let j = json(&[
        "analyze",
        "--stress",
        "xx=40,yy=20,zz=60",
        "--normal",
        "1,0,0",
        "--json",
    ]);
    assert!(j["plane"]["rake_deg"].is_null());
    assert!(j["plane"]["shear_direction"].is_null());
    let j = json(&[
        "worst-plane",
        "--stress",
        "xx=40,yy=20,zz=60",
        "--compression-positive",
        "--measure",
        "slip-tendency",
        "--json",
    ]);
    for p in j["planes"].as_array().unwrap() {
        assert!((p["rake_deg"].as_f64().unwrap() + 90.0).abs() < 1e-6, "{p}");
    }
}

// ---------------------------------------------------------------------------------------------
// 4. Labels.

#[test]
fn triaxiality_is_tension_positive_in_either_convention() {
    // Uniaxial compression −100 MPa: η = σm / σvM = (−100/3) / 100 = −1/3 (Bao & Wierzbicki,
    // IJMS 46:81, 2004, define η on tension-positive stresses).
    for flag in [&[][..], &["--compression-positive"][..]] {
        let stress = if flag.is_empty() { "xx=-100" } else { "xx=100" };
        let mut args = vec!["analyze", "--stress", stress, "--json"];
        args.extend_from_slice(flag);
        let j = json(&args);
        assert!(
            (j["triaxiality"].as_f64().unwrap() + 1.0 / 3.0).abs() < 1e-12,
            "{flag:?}: {}",
            j["triaxiality"]
        );
    }
}

#[test]
fn diagonal_tensor_directions_point_the_positive_way() {
    // diag(30, 20, 10): n1 = +x, n2 = +y, n3 = +z (common practice, no source).
    let j = json(&["analyze", "--stress", "xx=30,yy=20,zz=10", "--json"]);
    assert_eq!(
        j["principal"]["directions"],
        serde_json::json!([[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]])
    );
    // diag(10, 30, 20): n1 = +y, n2 = +z, and right-handed n3 = n1 × n2 = +x.
    let j = json(&["analyze", "--stress", "xx=10,yy=30,zz=20", "--json"]);
    assert_eq!(
        j["principal"]["directions"],
        serde_json::json!([[0.0, 1.0, 0.0], [0.0, 0.0, 1.0], [1.0, 0.0, 0.0]])
    );
}

#[test]
fn psi_and_ksi_are_echoed_as_typed() {
    let j = json(&[
        "analyze",
        "--stress",
        "xx=30,yy=-12.5,xy=0.1",
        "--unit",
        "ksi",
        "--json",
    ]);
    assert_eq!(j["stress"]["xx"].as_f64(), Some(30.0));
    assert_eq!(j["stress"]["yy"].as_f64(), Some(-12.5));
    assert_eq!(j["stress"]["xy"].as_f64(), Some(0.1));
    let j = json(&["analyze", "--stress", "xx=4500", "--unit", "psi", "--json"]);
    assert_eq!(j["stress"]["xx"].as_f64(), Some(4500.0));
    assert_eq!(j["principal"]["values"][0].as_f64(), Some(4500.0));
    assert_eq!(j["von_mises"].as_f64(), Some(4500.0));
}

#[test]
fn text_labels_say_what_they_are() {
    let out = planewise(&["analyze", "--stress", "xx=10,xy=3", "--normal", "1,1,0"]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("traction t = σ·n"), "{text}");
    assert!(!text.contains("t = σn"), "{text}");
    // A dimensionless measure carries no stress unit as its value.
    let out = planewise(&[
        "worst-plane",
        "--stress",
        "xx=20,yy=40,zz=50",
        "--compression-positive",
        "--measure",
        "slip-tendency",
    ]);
    let text = String::from_utf8_lossy(&out.stdout);
    let first = text.lines().next().unwrap();
    assert!(first.ends_with("(dimensionless)"), "{first}");
    let j = json(&[
        "worst-plane",
        "--stress",
        "xx=20,yy=40,zz=50",
        "--compression-positive",
        "--measure",
        "slip-tendency",
        "--json",
    ]);
    assert!(j["value_unit"].is_null());
}

// ---------------------------------------------------------------------------------------------
// 5. Degenerate states are said, not listed.

#[test]
fn hydrostatic_state_is_every_plane() {
    for measure in ["shear", "normal-max", "normal-min", "traction"] {
        let j = json(&[
            "worst-plane",
            "--stress",
            "xx=-50,yy=-50,zz=-50",
            "--measure",
            measure,
            "--json",
        ]);
        assert_eq!(j["condition"], "every-plane", "{measure}");
        assert_eq!(j["planes"].as_array().unwrap().len(), 1, "{measure}");
    }
    let j = json(&[
        "worst-plane",
        "--stress",
        "xx=-50,yy=-50,zz=-50",
        "--measure",
        "dilation-tendency",
        "--json",
    ]);
    assert_eq!(j["condition"], "undefined");
    assert!(j["value"].is_null());
}

#[test]
fn axisymmetric_states_give_cones() {
    // Uniaxial tension 100 MPa along x: the maximum shear, 50 MPa, acts on every plane whose
    // normal is at 45° to x (Timoshenko & Goodier, Theory of Elasticity, §77; from memory).
    let j = json(&[
        "worst-plane",
        "--stress",
        "xx=100",
        "--measure",
        "shear",
        "--json",
    ]);
    assert_eq!(j["condition"], "cone");
    assert!((j["value"].as_f64().unwrap() - 50.0).abs() < 1e-12);
    assert!((j["cone"]["half_angle_deg"].as_f64().unwrap() - 45.0).abs() < 1e-9);
    assert!((j["cone"]["axis"][0].as_f64().unwrap().abs() - 1.0).abs() < 1e-12);
    assert!(!j["planes"].as_array().unwrap().is_empty());
    // Equibiaxial tension in x and y: the largest normal stress acts on every vertical plane
    // (a 90° cone about z); the smallest on the single horizontal plane.
    let j = json(&[
        "worst-plane",
        "--stress",
        "xx=100,yy=100",
        "--measure",
        "normal-max",
        "--json",
    ]);
    assert_eq!(j["condition"], "cone");
    assert!((j["cone"]["half_angle_deg"].as_f64().unwrap() - 90.0).abs() < 1e-9);
    assert!((j["cone"]["axis"][2].as_f64().unwrap() - 1.0).abs() < 1e-12);
    let j = json(&[
        "worst-plane",
        "--stress",
        "xx=100,yy=100",
        "--measure",
        "normal-min",
        "--json",
    ]);
    assert_eq!(j["condition"], "defined");
    assert_eq!(j["planes"].as_array().unwrap().len(), 1);
    // Slip tendency of an axisymmetric compressive state: a cone about the distinct axis; every
    // normal on the cone gives the reported value, which is the closed-form maximum.
    let t = geo(20.0, 20.0, 50.0);
    let s = SearchSettings {
        measure: Measure::SlipTendency,
        convention: SignConvention::CompressionPositive,
        pore_pressure_pa: 0.0,
        material: None,
    };
    let r = worst_plane(&t, &s).unwrap();
    assert_eq!(r.condition, WorstCondition::Cone);
    let cone = r.cone.unwrap();
    let value = r.value.unwrap();
    // Closed form for the maximum (see tests/search.rs): Ts = (σ1 − σ3) / (2√(σ1σ3)).
    let expected = (50.0 - 20.0) / (2.0 * (50.0_f64 * 20.0).sqrt());
    assert!((value - expected).abs() < 1e-9);
    for n in planewise::mechanics::search::cone_normals(&cone, 12) {
        let n = PlaneNormal::from_vector(n).unwrap();
        let v = planewise::mechanics::criteria::slip_tendency(&t, n, 0.0)
            .unwrap()
            .utilization
            .unwrap();
        assert!((v - value).abs() < 1e-9, "{v} vs {value}");
    }
}

#[test]
fn effective_tension_message_lists_what_it_promises() {
    let out = planewise(&[
        "worst-plane",
        "--stress",
        "xx=20,yy=40,zz=50",
        "--compression-positive",
        "--measure",
        "slip-tendency",
        "--pore-pressure",
        "25",
    ]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        text.contains("the plane normal to the least compressive principal stress"),
        "{text}"
    );
    // And exactly that plane is listed.
    assert_eq!(text.lines().filter(|l| l.contains("normal (")).count(), 1);
}

// ---------------------------------------------------------------------------------------------
// 6. Bad input that used to be accepted.

#[test]
fn bad_input_is_refused_with_the_argument_named() {
    assert_bad_input(
        "analyze",
        &[
            (&["--stress", ""], "--stress"),
            (&["--stress", " , "], "--stress"),
            (&["--stress", "xx=1e-400"], "--stress"),
            (&["--stress", "xx=1", "--unit", "mPa"], "--unit"),
            (&["--stress", "xx=1", "--unit", "mpa"], "--unit"),
            (&["--stress", "xx=1", "--unit", "KSI"], "--unit"),
        ],
    );
    assert_bad_input(
        "worst-plane",
        &[
            (
                &[
                    "--stress",
                    "xx=1",
                    "--measure",
                    "shear",
                    "--pore-pressure",
                    "5",
                ],
                "--pore-pressure",
            ),
            (
                &[
                    "--stress",
                    "xx=1",
                    "--measure",
                    "slip-tendency",
                    "--cohesion",
                    "5",
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
                    "--friction-angle",
                    "30",
                ],
                "--friction-angle",
            ),
            (
                &[
                    "--stress",
                    "xx=1",
                    "--measure",
                    "slip-tendency",
                    "--pore-pressure",
                    "1e40",
                ],
                "--pore-pressure",
            ),
            (
                &[
                    "--stress",
                    "xx=1",
                    "--measure",
                    "mohr-coulomb",
                    "--cohesion",
                    "2e24",
                    "--friction-angle",
                    "30",
                ],
                "--cohesion",
            ),
        ],
    );
    let dir = std::env::temp_dir();
    let out = dir.join("planewise-bad-input.svg");
    let out = out.to_str().unwrap();
    assert_bad_input(
        "figure",
        &[
            (
                &["--stress", "xx=1", "--cohesion", "5", "--out", out],
                "--cohesion",
            ),
            (
                &["--stress", "xx=1", "--pore-pressure", "5", "--out", out],
                "--pore-pressure",
            ),
        ],
    );
    assert_bad_input(
        "mohr",
        &[(
            &["--stress", "xx=1", "--pore-pressure", "5", "--out", out],
            "--pore-pressure",
        )],
    );
    // Still accepted: the envelope uses cohesion, friction and pore pressure without a measure.
    let ok = planewise(&[
        "mohr",
        "--stress",
        "xx=-10,yy=-30",
        "--cohesion",
        "5",
        "--friction-angle",
        "30",
        "--pore-pressure",
        "2",
        "--out",
        out,
    ]);
    assert!(
        ok.status.success(),
        "{}",
        String::from_utf8_lossy(&ok.stderr)
    );
    // N/mm² is MPa.
    let j = json(&["analyze", "--stress", "xx=7", "--unit", "N/mm²", "--json"]);
    assert_eq!(j["unit"], "MPa");
}

#[test]
fn a_write_failure_names_the_os_error_once() {
    let out = planewise(&[
        "figure",
        "--stress",
        "xx=1",
        "--out",
        "/nonexistent-planewise-dir/fig.svg",
    ]);
    assert_eq!(out.status.code(), Some(1));
    assert!(out.stdout.is_empty());
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert_eq!(stderr.trim_end().lines().count(), 1, "{stderr}");
    assert_eq!(stderr.matches("os error").count(), 1, "{stderr}");
}
