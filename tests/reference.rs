//! Reference values from outside the project, each with its source beside it.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

use planewise::mechanics::criteria::{
    self, Condition, Criterion, DruckerPragerFit, MohrCoulomb, Strengths,
};

/// The utilization of `criterion` for `t` with `strengths` (panics when undefined).
fn u(t: &StressTensor, criterion: Criterion, strengths: &Strengths) -> f64 {
    criteria::verdict(t, criterion, strengths)
        .utilization
        .unwrap()
}

fn cohesive(m: &MohrCoulomb, fit: DruckerPragerFit) -> Strengths {
    Strengths {
        cohesion_pa: Some(m.cohesion_pa),
        friction_angle_deg: Some(m.friction_angle_deg),
        dp_fit: fit,
        ..Strengths::default()
    }
}
use planewise::mechanics::{
    Analysis, PlaneNormal, PlaneStress, SignConvention, StressTensor, StressUnit,
};

const MPA: f64 = 1e6;

fn mpa(c: [f64; 6]) -> StressTensor {
    StressTensor::from_components(c, StressUnit::MPa, 1.0).unwrap()
}

fn close(actual: f64, expected: f64, tol: f64, what: &str) {
    assert!(
        (actual - expected).abs() <= tol,
        "{what}: got {actual}, expected {expected}"
    );
}

#[test]
fn uniaxial_tension_100_mpa() {
    // Closed form: σ = diag(100, 0, 0) MPa. von Mises = Tresca = 100; octahedral shear
    // √2/3 · 100 = 47.140452079103168; triaxiality 1/3; Lode angle 0° (cosine form).
    let a = Analysis::new(
        &mpa([100.0, 0.0, 0.0, 0.0, 0.0, 0.0]),
        SignConvention::TensionPositive,
    );
    close(a.von_mises_pa / MPA, 100.0, 1e-12, "von Mises");
    close(a.tresca_pa / MPA, 100.0, 1e-12, "Tresca");
    close(
        a.octahedral_shear_pa / MPA,
        47.140_452_079_103_168,
        1e-12,
        "octahedral shear",
    );
    close(
        a.octahedral_normal_pa / MPA,
        100.0 / 3.0,
        1e-12,
        "octahedral normal",
    );
    close(a.triaxiality.unwrap(), 1.0 / 3.0, 1e-15, "triaxiality");
    close(a.lode_angle_deg.unwrap(), 0.0, 1e-12, "Lode angle");
    // In compression-positive the same state is uniaxial compression: θ = 60°, η = −1/3.
    let c = Analysis::new(
        &mpa([100.0, 0.0, 0.0, 0.0, 0.0, 0.0]),
        SignConvention::CompressionPositive,
    );
    close(
        c.lode_angle_deg.unwrap(),
        60.0,
        1e-12,
        "Lode angle, compression-positive",
    );
    close(
        c.principal.values_pa[2] / MPA,
        -100.0,
        1e-12,
        "σ3, compression-positive",
    );
}

#[test]
fn pure_shear_50_mpa() {
    // Closed form: τxy = 50 MPa gives principal 50, 0, −50; von Mises √3 · 50 = 86.602540378443865;
    // Lode angle 30° (J3 = 0).
    let a = Analysis::new(
        &mpa([0.0, 0.0, 0.0, 50.0, 0.0, 0.0]),
        SignConvention::TensionPositive,
    );
    let [s1, s2, s3] = a.principal.values_pa.map(|v| v / MPA);
    close(s1, 50.0, 1e-12, "σ1");
    close(s2, 0.0, 1e-12, "σ2");
    close(s3, -50.0, 1e-12, "σ3");
    close(
        a.von_mises_pa / MPA,
        86.602_540_378_443_865,
        1e-12,
        "von Mises",
    );
    close(a.lode_angle_deg.unwrap(), 30.0, 1e-12, "Lode angle");
    close(a.triaxiality.unwrap(), 0.0, 1e-15, "triaxiality");
}

#[test]
fn beer_johnston_plane_stress() {
    // Beer & Johnston, Mechanics of Materials, Example 7.01 (from memory, confirmed by the closed
    // form σ = (σx + σy)/2 ± √(((σx − σy)/2)² + τ²) = 20 ± 50): σx = 50, σy = −10, τxy = 40 MPa
    // gives principal 70, 0, −30 MPa, σ1 along (2, 1, 0)/√5.
    let a = Analysis::new(
        &mpa([50.0, -10.0, 0.0, 40.0, 0.0, 0.0]),
        SignConvention::TensionPositive,
    );
    let [s1, s2, s3] = a.principal.values_pa.map(|v| v / MPA);
    close(s1, 70.0, 1e-12, "σ1");
    close(s2, 0.0, 1e-12, "σ2");
    close(s3, -30.0, 1e-12, "σ3");
    let n1 = a.principal.directions[0];
    let expected = nalgebra::Vector3::new(2.0, 1.0, 0.0) / 5.0_f64.sqrt();
    assert!(
        (n1 - expected).norm() < 1e-12 || (n1 + expected).norm() < 1e-12,
        "n1 = {n1}"
    );
    // Plane-stress von Mises √(σx² − σxσy + σy² + 3τ²) = √7900 (common textbook form, e.g.
    // Shigley's Mechanical Engineering Design, eq. 5-15).
    close(a.von_mises_pa / MPA, 7900.0_f64.sqrt(), 1e-12, "von Mises");
    close(a.max_shear_pa / MPA, 50.0, 1e-12, "max shear");
}

#[test]
fn slip_and_dilation_tendency() {
    // Compression-positive east, north, up stresses 20, 40, 50 MPa; plane dip 60°, dip direction
    // 090°. Worked by hand from the definitions: Morris, Ferrill & Henderson 1996, Geology
    // 24(3):275 (slip tendency τ/σn'); Ferrill et al. 1999, GSA Today 9(5) (dilation tendency).
    let t = StressTensor::from_components([20.0, 40.0, 50.0, 0.0, 0.0, 0.0], StressUnit::MPa, -1.0)
        .unwrap();
    let n = PlaneNormal::from_dip(60.0, 90.0).unwrap();
    let ps = PlaneStress::new(&t, n, SignConvention::CompressionPositive);
    close(ps.normal_stress_pa / MPA, 27.5, 1e-12, "σn");
    close(ps.shear_stress_pa / MPA, 12.990_381_056_766_580, 1e-12, "τ");
    let ts = criteria::slip_tendency(&t, n, 0.0).unwrap();
    close(
        ts.utilization.unwrap(),
        0.472_377_492_973_330_17,
        1e-14,
        "slip tendency",
    );
    let td = criteria::dilation_tendency(&t, n);
    close(td.utilization.unwrap(), 0.75, 1e-14, "dilation tendency");
    let ts_p = criteria::slip_tendency(&t, n, 10.0 * MPA).unwrap();
    close(
        ts_p.utilization.unwrap(),
        0.742_307_488_958_090_27,
        1e-14,
        "slip tendency, p = 10 MPa",
    );
    // A pore pressure above σn leaves the plane in effective tension: reported, not divided by.
    let open = criteria::slip_tendency(&t, n, 30.0 * MPA).unwrap();
    assert_eq!(open.condition, Condition::EffectiveTension);
    assert_eq!(open.utilization, None);
    assert!(open.fails());
}

#[test]
fn mohr_coulomb_uniaxial_compressive_strength() {
    // Labuz & Zang 2012, Rock Mech. Rock Eng. 45:975: UCS = 2c cos φ / (1 − sin φ); c = 5 MPa,
    // φ = 30° gives 17.320508075688773 MPa.
    let m = MohrCoulomb::new(5.0 * MPA, 30.0).unwrap();
    close(
        m.uniaxial_compressive_strength_pa() / MPA,
        17.320_508_075_688_773,
        1e-12,
        "UCS",
    );
    // The same source's tensile strength 2c cos φ / (1 + sin φ) = 5.7735026918962576 MPa.
    close(
        m.uniaxial_tensile_strength_pa() / MPA,
        5.773_502_691_896_257_6,
        1e-12,
        "UTS",
    );
    // A uniaxial compression of exactly the UCS sits on the envelope: U = 1.
    let ucs = m.uniaxial_compressive_strength_pa();
    let t = StressTensor::from_pa([0.0, 0.0, -ucs, 0.0, 0.0, 0.0]).unwrap();
    let outer_fit = cohesive(&m, DruckerPragerFit::CompressionMeridian);
    close(
        u(&t, Criterion::MohrCoulomb, &outer_fit),
        1.0,
        1e-12,
        "U at UCS",
    );
    // Drucker–Prager fits (Chen & Han 1988, §5.4): the outer cone passes through the compression
    // meridian, where uniaxial compression lies; the inner cone through the tension meridian,
    // where uniaxial tension lies.
    close(
        u(&t, Criterion::DruckerPrager, &outer_fit),
        1.0,
        1e-12,
        "outer DP at UCS",
    );
    let uts = m.uniaxial_tensile_strength_pa();
    let tension = StressTensor::from_pa([uts, 0.0, 0.0, 0.0, 0.0, 0.0]).unwrap();
    let inner_fit = cohesive(&m, DruckerPragerFit::TensionMeridian);
    close(
        u(&tension, Criterion::DruckerPrager, &inner_fit),
        1.0,
        1e-12,
        "inner DP at UTS",
    );
    close(
        u(&tension, Criterion::MohrCoulomb, &inner_fit),
        1.0,
        1e-12,
        "MC at UTS",
    );
    // Equitriaxial tension at 1.01 × the apex c / tan φ (Labuz & Zang 2012): the apex is on the
    // surface, so proportional scaling gives U = 1.01 and the state fails.
    let apex = 5.0 * MPA / 30.0_f64.to_radians().tan();
    let beyond =
        StressTensor::from_pa([1.01 * apex, 1.01 * apex, 1.01 * apex, 0.0, 0.0, 0.0]).unwrap();
    let v = criteria::verdict(&beyond, Criterion::MohrCoulomb, &outer_fit);
    close(v.utilization.unwrap(), 1.01, 1e-12, "MC beyond the apex");
    assert_eq!(v.outcome(), criteria::Outcome::Fails);
}

#[test]
fn hydrostatic_minus_10_mpa() {
    // Closed form: a hydrostatic state has no deviator, so von Mises is 0 and no plane carries
    // shear; the Lode angle and triaxiality (0/0) are undefined.
    let t = mpa([-10.0, -10.0, -10.0, 0.0, 0.0, 0.0]);
    let a = Analysis::new(&t, SignConvention::TensionPositive);
    assert_eq!(a.von_mises_pa, 0.0);
    assert_eq!(a.lode_angle_deg, None);
    assert_eq!(a.triaxiality, None);
    for v in [[1.0, 2.0, 3.0], [0.0, 0.0, 1.0], [-1.0, 0.3, 0.2]] {
        let n = PlaneNormal::from_vector(v.into()).unwrap();
        let ps = PlaneStress::new(&t, n, SignConvention::TensionPositive);
        assert_eq!(ps.shear_stress_pa, 0.0);
        assert_eq!(ps.shear_direction, None);
        close(ps.normal_stress_pa / MPA, -10.0, 1e-12, "σn");
    }
    assert_eq!(
        criteria::dilation_tendency(&t, PlaneNormal::Z).condition,
        Condition::Undefined
    );
}

#[test]
fn von_mises_tresca_and_rankine_checks() {
    // Pure shear τ against f_y: von Mises yields at τ = f_y/√3, Tresca at τ = f_y/2 (common
    // practice, e.g. Shigley's Mechanical Engineering Design, §5-4 and §5-5).
    let fy = 250.0 * MPA;
    let steel = Strengths {
        yield_strength_pa: Some(fy),
        ..Strengths::default()
    };
    let t = StressTensor::from_pa([0.0, 0.0, 0.0, fy / 3.0_f64.sqrt(), 0.0, 0.0]).unwrap();
    close(
        u(&t, Criterion::VonMises, &steel),
        1.0,
        1e-12,
        "von Mises U",
    );
    let t = StressTensor::from_pa([0.0, 0.0, 0.0, fy / 2.0, 0.0, 0.0]).unwrap();
    let tr = criteria::verdict(&t, Criterion::Tresca, &steel);
    close(tr.utilization.unwrap(), 1.0, 1e-12, "Tresca U");
    close(tr.factor_of_safety.unwrap(), 1.0, 1e-12, "Tresca FoS");
    // Rankine: σ1 = 30 against f_t = 60 → 0.5; σ3 = −90 against f_c = 100 → 0.9 governs.
    let t = mpa([30.0, 0.0, -90.0, 0.0, 0.0, 0.0]);
    let brittle = Strengths {
        tensile_strength_pa: Some(60.0 * MPA),
        compressive_strength_pa: Some(100.0 * MPA),
        ..Strengths::default()
    };
    let r = criteria::verdict(&t, Criterion::Rankine, &brittle);
    close(r.utilization.unwrap(), 0.9, 1e-12, "Rankine U");
    assert!(r.note.starts_with("compression governs"), "{}", r.note);
    let bad = Strengths {
        yield_strength_pa: Some(0.0),
        ..Strengths::default()
    };
    assert!(bad.validate().is_err());
    assert!(MohrCoulomb::new(1.0, 90.0).is_err());
    // Without strengths nothing is checked, and nothing passes.
    let none = criteria::verdict(&t, Criterion::VonMises, &Strengths::default());
    assert_eq!(none.condition, Condition::NotChecked);
    assert_eq!(none.outcome(), criteria::Outcome::NotChecked);
}
