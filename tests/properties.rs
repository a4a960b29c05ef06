//! Laws every stress state obeys, checked on random tensors from 1e-3 to 1e9 Pa (proptest), and
//! the principal solver cross-checked against nalgebra's general symmetric eigen-solver.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

use nalgebra::{Matrix3, Rotation3, SymmetricEigen, Vector3};
use planewise::mechanics::{
    Analysis, PlaneNormal, PlaneStress, SignConvention, StressTensor, principal,
    principal_values_into, principal_values_pa,
};
use proptest::prelude::*;

/// Random tensors: a magnitude 10^k Pa with k uniform in [−3, 9], times components in [−1, 1];
/// half of the cases are built from chosen principal values (some nearly repeated, some with a
/// large mean and a tiny deviator) in a random frame, where solvers are most often wrong.
fn tensor() -> impl Strategy<Value = StressTensor> {
    let general = (-3.0..9.0_f64, prop::array::uniform6(-1.0..1.0_f64)).prop_map(|(k, c)| {
        let m = 10f64.powf(k);
        StressTensor::from_pa(c.map(|v| v * m)).unwrap()
    });
    let structured = (
        -3.0..9.0_f64,
        prop::array::uniform3(-1.0..1.0_f64),
        0usize..4,
        prop::array::uniform3(-std::f64::consts::PI..std::f64::consts::PI),
    )
        .prop_map(|(k, v, kind, euler)| {
            let m = 10f64.powf(k);
            let d = match kind {
                0 => [v[0], v[0], v[1]],                          // exactly repeated pair
                1 => [v[0], v[0] * (1.0 + 1e-9), v[1]],           // nearly repeated pair
                2 => [1.0 + 1e-7 * v[0], 1.0 + 1e-7 * v[1], 1.0], // large mean, tiny deviator
                _ => [v[0], v[1], v[2]],
            };
            let q = Rotation3::from_euler_angles(euler[0], euler[1], euler[2]).into_inner();
            let s = q * Matrix3::from_diagonal(&Vector3::from(d.map(|x| x * m))) * q.transpose();
            StressTensor::from_matrix_pa(&s).unwrap()
        });
    prop_oneof![general, structured]
}

fn rotation() -> impl Strategy<Value = Matrix3<f64>> {
    prop::array::uniform3(-std::f64::consts::PI..std::f64::consts::PI)
        .prop_map(|e| Rotation3::from_euler_angles(e[0], e[1], e[2]).into_inner())
}

fn unit_normal() -> impl Strategy<Value = PlaneNormal> {
    prop::array::uniform3(-1.0..1.0_f64)
        .prop_filter("not too short", |v| Vector3::from(*v).norm() > 1e-3)
        .prop_map(|v| PlaneNormal::from_vector(Vector3::from(v)).unwrap())
}

fn scale(t: &StressTensor) -> f64 {
    let [s1, _, s3] = principal_values_pa(t);
    s1.abs().max(s3.abs())
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(1000))]

    /// Invariants and equivalent stresses do not depend on the axes: σ' = Q σ Qᵀ.
    #[test]
    fn invariants_unchanged_by_rotation(t in tensor(), q in rotation()) {
        let r = t.rotated(&q).unwrap();
        let (a, b) = (Analysis::new(&t, SignConvention::TensionPositive), Analysis::new(&r, SignConvention::TensionPositive));
        let s = scale(&t);
        let tol = 1e-12 * s;
        prop_assert!((a.invariants.i1 - b.invariants.i1).abs() <= 3.0 * tol);
        prop_assert!((a.invariants.i2 - b.invariants.i2).abs() <= 3.0 * tol * s);
        prop_assert!((a.invariants.i3 - b.invariants.i3).abs() <= 3.0 * tol * s * s);
        prop_assert!((a.invariants.j2 - b.invariants.j2).abs() <= 3.0 * tol * s);
        prop_assert!((a.invariants.j3 - b.invariants.j3).abs() <= 3.0 * tol * s * s);
        prop_assert!((a.von_mises_pa - b.von_mises_pa).abs() <= 3.0 * tol);
        prop_assert!((a.tresca_pa - b.tresca_pa).abs() <= 3.0 * tol);
        prop_assert!((a.octahedral_shear_pa - b.octahedral_shear_pa).abs() <= 3.0 * tol);
    }

    /// Spectral reconstruction σ = Σ σi ni niᵀ, within 1e-12 of the largest |σi|, and the
    /// directions are an ordered, orthonormal, right-handed set.
    #[test]
    fn reconstruction_from_principal_parts(t in tensor()) {
        let p = principal(&t);
        let [s1, s2, s3] = p.values_pa;
        prop_assert!(s1 >= s2 && s2 >= s3);
        let mut m = Matrix3::zeros();
        for (v, n) in p.values_pa.iter().zip(&p.directions) {
            m += n * n.transpose() * *v;
        }
        let s = scale(&t);
        prop_assert!((m - t.matrix_pa()).amax() <= 1e-12 * s, "error {} of {}", (m - t.matrix_pa()).amax(), s);
        let [n1, n2, n3] = p.directions;
        prop_assert!((n1.cross(&n2) - n3).amax() < 1e-12);
        for n in p.directions { prop_assert!((n.norm() - 1.0).abs() < 1e-14); }
    }

    /// Cauchy's formula is linear: t(−n) = −t(n), with the same σn and τ.
    #[test]
    fn traction_is_odd_in_the_normal(t in tensor(), n in unit_normal()) {
        let a = PlaneStress::new(&t, n, SignConvention::TensionPositive);
        let b = PlaneStress::new(&t, n.flipped(), SignConvention::TensionPositive);
        prop_assert_eq!(a.traction_pa, -b.traction_pa);
        prop_assert!((a.normal_stress_pa - b.normal_stress_pa).abs() <= 1e-14 * scale(&t));
        prop_assert!((a.shear_stress_pa - b.shear_stress_pa).abs() <= 1e-14 * scale(&t));
    }

    /// Every plane's (σn, τ) lies inside the largest Mohr circle and outside the two smaller
    /// ones (Mohr 1900; e.g. Jaeger, Cook & Zimmerman, Fundamentals of Rock Mechanics, §2.7).
    #[test]
    fn mohr_point_in_admissible_region(t in tensor(), n in unit_normal()) {
        let [s1, s2, s3] = principal_values_pa(&t);
        let ps = PlaneStress::new(&t, n, SignConvention::TensionPositive);
        let (sn, tau) = (ps.normal_stress_pa, ps.shear_stress_pa);
        let s = scale(&t);
        let tol = 1e-10 * s * s;
        let power = |a: f64, b: f64| (sn - 0.5 * (a + b)).powi(2) + tau * tau - (0.5 * (a - b)).powi(2);
        prop_assert!(power(s1, s3) <= tol, "outside the largest circle");
        prop_assert!(power(s1, s2) >= -tol, "inside the σ1–σ2 circle");
        prop_assert!(power(s2, s3) >= -tol, "inside the σ2–σ3 circle");
    }

    /// The principal values agree with nalgebra's general symmetric eigen-solver, a reference
    /// library (QR iteration on the tridiagonal form).
    #[test]
    fn agrees_with_nalgebra(t in tensor()) {
        let mut reference: Vec<f64> = SymmetricEigen::new(t.matrix_pa()).eigenvalues.iter().copied().collect();
        reference.sort_by(|a, b| b.total_cmp(a));
        let ours = principal_values_pa(&t);
        let full = principal(&t).values_pa;
        let s = scale(&t);
        for i in 0..3 {
            prop_assert!((ours[i] - reference[i]).abs() <= 1e-12 * s, "{ours:?} vs {reference:?}");
            prop_assert!((full[i] - reference[i]).abs() <= 1e-12 * s, "{full:?} vs {reference:?}");
        }
    }

    /// Changing the convention negates and reverses the principal values.
    #[test]
    fn compression_positive_reverses_order(t in tensor()) {
        let a = Analysis::new(&t, SignConvention::TensionPositive);
        let c = Analysis::new(&t, SignConvention::CompressionPositive);
        let s = scale(&t);
        for i in 0..3 {
            prop_assert!((a.principal.values_pa[i] + c.principal.values_pa[2 - i]).abs() <= 1e-13 * s);
        }
        prop_assert!((a.von_mises_pa - c.von_mises_pa).abs() <= 1e-13 * s);
    }

    /// The batch path gives what the single-tensor path gives, lane by lane and in the remainder.
    #[test]
    fn batch_matches_single(ts in prop::collection::vec(tensor(), 0..11)) {
        let mut out = vec![[f64::NAN; 3]; ts.len()];
        principal_values_into(&ts, &mut out);
        for (t, o) in ts.iter().zip(&out) {
            let single = principal_values_pa(t);
            for i in 0..3 {
                prop_assert!((o[i] - single[i]).abs() <= 1e-13 * scale(t), "{o:?} vs {single:?}");
            }
        }
    }
}
