//! Principal stresses and directions of a symmetric 3×3 tensor.
//!
//! Method: the mean stress is removed, so that a large mean stress with a tiny deviator keeps its
//! digits (the deviator is also rescaled if it is so small or large that its products would leave
//! the normal range of f64). The eigenvalues of the deviator come from the trigonometric solution
//! of the characteristic cubic (Smith, "Eigenvalues of a symmetric 3 × 3 matrix", Communications of the ACM 4(4):168,
//! 1961). That solution loses accuracy when two roots nearly coincide, so then — and always when
//! directions are wanted — the isolated eigenvalue's direction is found from cross products of the
//! rows of (B − λI) and the remaining pair from the exact 2×2 problem on the plane orthogonal to it
//! (Eberly, "A Robust Eigensolver for 3 × 3 Symmetric Matrices", Geometric Tools, 2014). This
//! keeps the directions orthonormal for repeated and nearly repeated values.

use nalgebra::{Matrix3, Vector3};

use super::SignConvention;
use super::tensor::StressTensor;

/// Principal stresses σ1 ≥ σ2 ≥ σ3 with their unit directions.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Principal {
    /// σ1 ≥ σ2 ≥ σ3 in pascals, in the sign of the tensor that was solved.
    pub values_pa: [f64; 3],
    /// Mean stress σm = tr σ / 3, Pa, from the components (not from the rounded σi).
    pub mean_pa: f64,
    /// Principal values of the deviator, σi − σm, Pa, solved from the deviator itself: a state
    /// whose mean is many orders above its deviator keeps the deviator's digits here, where
    /// differences of `values_pa` would lose them. Every deviatoric quantity (J2, J3, von
    /// Mises, Tresca, maximum shear) is computed from these.
    pub deviatoric_pa: [f64; 3],
    /// Unit directions n1, n2, n3 of σ1, σ2, σ3; orthonormal and right-handed (n1 × n2 = n3).
    /// n1 and n2 have their largest component positive (so a diagonal tensor gives +x, +y, +z
    /// in some order); n3 = n1 × n2 then fixes the sign of the third. With repeated values any
    /// orthonormal basis of the repeated space is valid.
    pub directions: [Vector3<f64>; 3],
}

/// Beyond this |cos 3θ| the trigonometric roots are refined by deflation. At the threshold,
/// sin 3θ ≥ 0.014, which bounds the trigonometric roots' error to about 70 ulp of the deviator.
const NEAR_REPEATED_COS3: f64 = 1.0 - 1e-4;

/// The mean stress and the deviator, scaled only where products of three components could
/// leave the range where f64 keeps full precision.
struct Scaled {
    mean_pa: f64,
    /// Largest |component| of the deviator, in pascals; zero for a hydrostatic tensor.
    max_abs_pa: f64,
    /// Pascals per unit of `b` (1 unless the deviator is extremely small or large).
    unit_pa: f64,
    /// The deviator in units of `unit_pa`.
    b: Matrix3<f64>,
}

impl Scaled {
    #[inline]
    fn new(t: &StressTensor) -> Self {
        let mean_pa = t.mean_pa();
        let [xx, yy, zz, xy, yz, zx] = t.components_pa();
        let dev = [xx - mean_pa, yy - mean_pa, zz - mean_pa, xy, yz, zx];
        let max_abs_pa = dev.iter().fold(0.0_f64, |m, v| m.max(v.abs()));
        // Squared cross products of rows reach the fourth power of a component: inside
        // [1e-60, 1e60] they stay normal f64 numbers, so no scaling (and no division) is needed.
        let unit_pa = if max_abs_pa > 0.0 && !(1e-60..=1e60).contains(&max_abs_pa) {
            max_abs_pa
        } else {
            1.0
        };
        let [a, b, c, d, e, f] = if unit_pa == 1.0 {
            dev
        } else {
            dev.map(|v| v / unit_pa)
        };
        Self {
            mean_pa,
            max_abs_pa,
            unit_pa,
            b: Matrix3::new(a, d, f, d, b, e, f, e, c),
        }
    }

    /// Roots of the deviator's characteristic cubic λ³ − J2 λ − J3 = 0 in descending order,
    /// and cos 3θ = J3 / (2 p³) with p = √(J2/3).
    ///
    /// The roots are 2p cos(θ + 2πk/3) (Smith 1961). Instead of acos and cos, the trisection
    /// cos θ = 1 − d is solved for the root farther from the others, where d in [0, 1 − √3/2]
    /// satisfies 4d³ − 12d² + 9d = 1 − |cos 3θ| (the triple-angle identity written in d, which
    /// keeps small d, and so sin θ = √(d(2 − d)), to full relative precision).
    #[inline]
    fn trig_eigenvalues(&self) -> ([f64; 3], f64) {
        let b = &self.b;
        let j2 = deviator_j2([
            b[(0, 0)],
            b[(1, 1)],
            b[(2, 2)],
            b[(0, 1)],
            b[(1, 2)],
            b[(0, 2)],
        ]);
        if j2 <= 0.0 {
            return ([0.0; 3], 1.0);
        }
        cubic_roots(j2, b.determinant())
    }
}

/// J2 = ½ s:s of a deviator given as xx, yy, zz, xy, yz, zx.
#[inline]
fn deviator_j2([a, b, c, d, e, f]: [f64; 6]) -> f64 {
    0.5 * (a * a + b * b + c * c) + d * d + e * e + f * f
}

/// J3 = det s of a deviator given as xx, yy, zz, xy, yz, zx.
#[inline]
fn deviator_j3([a, b, c, d, e, f]: [f64; 6]) -> f64 {
    a * (b * c - e * e) - d * (d * c - e * f) + f * (d * e - b * f)
}

/// Roots of λ³ − J2 λ − J3 = 0 (J2 > 0) in descending order, and cos 3θ (see
/// `Scaled::trig_eigenvalues`). Branch-free, so that the batch path can run it on several
/// tensors side by side.
#[inline]
fn cubic_roots(j2: f64, j3: f64) -> ([f64; 3], f64) {
    let p = (j2 / 3.0).sqrt();
    // Rounding may push cos 3θ just outside [−1, 1].
    let cos3 = (j3 / (2.0 * p * p * p)).clamp(-1.0, 1.0);
    let q = 1.0 - cos3.abs();
    // Degree-8 Chebyshev fit of d/q on [0, 1] (9e-9 relative error), evaluated in Estrin's
    // scheme to keep the dependency chain short, then one Newton step (measured against
    // asin-based reference values: 9e-16 relative).
    let q2 = q * q;
    let q4 = q2 * q2;
    let low = (0.111_111_112_492_340_49 + 0.016_460_784_692_985_4 * q)
        + q2 * (0.004_270_201_531_624_106 + 0.001_331_984_819_783_434_3 * q);
    let high = (0.000_583_251_151_162_893_3 - 0.000_090_809_809_388_839_58 * q)
        + q2 * (0.000_474_152_368_658_059_36 - 0.000_299_544_588_276_074 * q);
    let mut d = q * (low + q4 * (high + q4 * 0.000_133_461_666_415_402));
    let g = ((4.0 * d - 12.0) * d + 9.0) * d - q;
    let slope = (12.0 * d - 24.0) * d + 9.0;
    d -= g / slope;
    let c = 1.0 - d;
    let s = (d * (2.0 - d)).max(0.0).sqrt();
    let r3 = 3.0_f64.sqrt();
    let roots = if cos3 >= 0.0 {
        [2.0 * p * c, p * (r3 * s - c), -p * (c + r3 * s)]
    } else {
        [p * (c + r3 * s), p * (c - r3 * s), -2.0 * p * c]
    };
    (roots, cos3)
}

/// Tensors solved side by side in [`principal_values_into`].
const LANES: usize = 4;

/// Principal values of many tensors: `out[i]` = [`principal_values_pa`]`(&tensors[i])` for
/// every index both slices have.
///
/// One tensor's solution is a long chain of dependent operations (square roots, divisions), so
/// a single call leaves most of the processor idle. Here four tensors go through each step
/// together; lanes that need care (nearly repeated roots, hydrostatic states, extreme
/// magnitudes) are redone by the single-tensor path, so the results are the same.
pub fn principal_values_into(tensors: &[StressTensor], out: &mut [[f64; 3]]) {
    let n = tensors.len().min(out.len());
    let (tensors, out) = (&tensors[..n], &mut out[..n]);
    let mut chunks = tensors.chunks_exact(LANES).zip(out.chunks_exact_mut(LANES));
    for (ts, os) in &mut chunks {
        let comps: [[f64; 6]; LANES] = std::array::from_fn(|i| ts[i].components_pa());
        let mean: [f64; LANES] =
            std::array::from_fn(|i| (comps[i][0] + comps[i][1] + comps[i][2]) / 3.0);
        let dev: [[f64; 6]; LANES] = std::array::from_fn(|i| {
            let [xx, yy, zz, xy, yz, zx] = comps[i];
            [xx - mean[i], yy - mean[i], zz - mean[i], xy, yz, zx]
        });
        let j2: [f64; LANES] = std::array::from_fn(|i| deviator_j2(dev[i]));
        let j3: [f64; LANES] = std::array::from_fn(|i| deviator_j3(dev[i]));
        // Keep the lanes branch-free; a lane with J2 outside the range where the unscaled
        // formulas are exact to working precision is flagged and redone below.
        let solved: [([f64; 3], f64); LANES] =
            std::array::from_fn(|i| cubic_roots(j2[i].max(1e-300), j3[i]));
        for i in 0..LANES {
            let (roots, cos3) = solved[i];
            let plain = (1e-100..=1e100).contains(&j2[i]) && cos3.abs() <= NEAR_REPEATED_COS3;
            os[i] = if plain {
                add_mean(roots, mean[i])
            } else {
                principal_values_pa(&ts[i])
            };
        }
    }
    let rest = n - n % LANES;
    for (t, o) in tensors[rest..].iter().zip(&mut out[rest..]) {
        *o = principal_values_pa(t);
    }
}

/// Principal stresses σ1 ≥ σ2 ≥ σ3 of `t` shown in `convention`, pascals (values only; in the
/// compression-positive convention σ1 is the most compressive).
#[must_use]
pub fn principal_values_in(t: &StressTensor, convention: SignConvention) -> [f64; 3] {
    let [s1, s2, s3] = principal_values_pa(t);
    match convention {
        SignConvention::TensionPositive => [s1, s2, s3],
        SignConvention::CompressionPositive => [-s3, -s2, -s1],
    }
}

/// Principal stresses σ1 ≥ σ2 ≥ σ3 of `t` in pascals (values only; the fast path).
#[must_use]
pub fn principal_values_pa(t: &StressTensor) -> [f64; 3] {
    let s = Scaled::new(t);
    if s.max_abs_pa == 0.0 {
        return [s.mean_pa; 3];
    }
    let (l, cos3) = s.trig_eigenvalues();
    let l = if cos3.abs() > NEAR_REPEATED_COS3 {
        solve_with_vectors(&s, l).values_pa
    } else {
        l.map(|v| v * s.unit_pa)
    };
    add_mean(l, s.mean_pa)
}

/// Principal stresses and directions of `t`.
#[must_use]
#[inline]
pub fn principal(t: &StressTensor) -> Principal {
    let s = Scaled::new(t);
    if s.max_abs_pa == 0.0 {
        return Principal {
            values_pa: [s.mean_pa; 3],
            mean_pa: s.mean_pa,
            deviatoric_pa: [0.0; 3],
            directions: [Vector3::x(), Vector3::y(), Vector3::z()],
        };
    }
    let (l, _) = s.trig_eigenvalues();
    let mut p = solve_with_vectors(&s, l);
    p.mean_pa = s.mean_pa;
    p.deviatoric_pa = p.values_pa;
    p.values_pa = add_mean(p.values_pa, s.mean_pa);
    p.directions = canonical_signs(p.directions);
    p
}

/// The largest component of `v` made positive (the first of equal ones, within rounding).
#[inline]
fn largest_positive(v: Vector3<f64>) -> (Vector3<f64>, bool) {
    let m = v.amax();
    let first = v.iter().find(|c| c.abs() >= m * (1.0 - 1e-12)).copied();
    if first.is_some_and(|c| c < 0.0) {
        (-v, true)
    } else {
        (v, false)
    }
}

/// Signs users expect: n1 and n2 with their largest component positive, n3 flipped with them so
/// the set stays right-handed (n1 × n2 = n3).
#[inline]
fn canonical_signs([n1, n2, n3]: [Vector3<f64>; 3]) -> [Vector3<f64>; 3] {
    let (n1, f1) = largest_positive(n1);
    let (n2, f2) = largest_positive(n2);
    [n1, n2, if f1 == f2 { n3 } else { -n3 }]
}

/// Adds the mean stress back to deviatoric values. A sum that is zero to working precision is
/// made exactly zero, so that a plane-stress state reports 0 rather than 4e-15 (the values are
/// only known to a few ulp of the largest one anyway).
#[inline]
fn add_mean(deviatoric_pa: [f64; 3], mean_pa: f64) -> [f64; 3] {
    let values = deviatoric_pa.map(|v| v + mean_pa);
    // The values are in descending order, so the largest magnitude is at one end.
    let scale = values[0].abs().max(values[2].abs());
    values.map(|v| {
        if v.abs() <= 16.0 * f64::EPSILON * scale {
            0.0
        } else {
            v
        }
    })
}

/// Directions, and the values refined, for the scaled deviator `s.b` with trigonometric
/// eigenvalues `l` (descending). Returned values are deviatoric, in pascals (in `values_pa`;
/// the caller fills in the mean and the other fields).
#[inline]
fn solve_with_vectors(s: &Scaled, l: [f64; 3]) -> Principal {
    let b = &s.b;
    // Start from the eigenvalue farthest from the other two: it is simple (unless the deviator
    // is zero, handled by the caller), so B − λI has rank two and its rows' cross products give
    // its direction reliably.
    let largest_isolated = l[0] - l[1] >= l[1] - l[2];
    let l_iso = if largest_isolated { l[0] } else { l[2] };
    let n_iso = isolated_direction(b, l_iso);

    // The other two are the eigenpairs of B restricted to the plane orthogonal to n_iso.
    let (u, v) = orthogonal_complement(&n_iso);
    let bu = b * u;
    let bv = b * v;
    let (m00, m01, m11) = (u.dot(&bu), u.dot(&bv), v.dot(&bv));
    let half_diff = 0.5 * (m00 - m11);
    // Entries are at most ~1e60 in magnitude here, so squares cannot overflow: plain sqrt is
    // safe and much cheaper than hypot.
    let h = (half_diff * half_diff + m01 * m01).sqrt();
    let mid = 0.5 * (m00 + m11);
    let (hi, lo) = (mid + h, mid - h);
    // Eigenvector of the larger root in (u, v) coordinates, from whichever form has no
    // cancellation.
    let (cu, cv) = if half_diff >= 0.0 {
        (half_diff + h, m01)
    } else {
        (m01, -half_diff + h)
    };
    let norm = (cu * cu + cv * cv).sqrt();
    let (cu, cv) = if norm > 0.0 {
        (cu / norm, cv / norm)
    } else {
        (1.0, 0.0)
    };
    let n_hi = u * cu + v * cv;
    let n_lo = v * cu - u * cv;

    // With (u, v, n_iso) right-handed, both orders below are right-handed by construction:
    // n_iso × n_hi = n_lo and n_hi × n_lo = n_iso.
    let mut pairs = if largest_isolated {
        [(l_iso, n_iso), (hi, n_hi), (lo, n_lo)]
    } else {
        [(hi, n_hi), (lo, n_lo), (l_iso, n_iso)]
    };
    // Rounding can only misorder values that are equal to working precision; keep the promise
    // with a three-element sorting network, and restore handedness if it swapped anything.
    let mut swaps = 0;
    for (i, j) in [(0, 1), (1, 2), (0, 1)] {
        if pairs[i].0 < pairs[j].0 {
            pairs.swap(i, j);
            swaps += 1;
        }
    }
    let [(v1, n1), (v2, n2), (v3, mut n3)] = pairs;
    if swaps % 2 == 1 {
        n3 = -n3;
    }
    Principal {
        values_pa: [v1, v2, v3].map(|x| x * s.unit_pa),
        mean_pa: 0.0,
        deviatoric_pa: [0.0; 3],
        directions: [n1, n2, n3],
    }
}

/// Unit direction of the simple eigenvalue `lambda` of symmetric `b`: the longest cross product
/// of two rows of b − λI.
#[inline]
fn isolated_direction(b: &Matrix3<f64>, lambda: f64) -> Vector3<f64> {
    let m = b - Matrix3::identity() * lambda;
    let r0 = m.row(0).transpose();
    let r1 = m.row(1).transpose();
    let r2 = m.row(2).transpose();
    let c = [r0.cross(&r1), r0.cross(&r2), r1.cross(&r2)];
    let n2 = c.map(|v| v.norm_squared());
    let best = if n2[0] >= n2[1] && n2[0] >= n2[2] {
        0
    } else if n2[1] >= n2[2] {
        1
    } else {
        2
    };
    if n2[best] > 0.0 {
        c[best] / n2[best].sqrt()
    } else {
        Vector3::x()
    }
}

/// Two unit vectors that complete unit `w` to a right-handed orthonormal basis (u, v, w).
#[must_use]
#[inline]
pub fn orthogonal_complement(w: &Vector3<f64>) -> (Vector3<f64>, Vector3<f64>) {
    let u = if w.x.abs() > w.y.abs() {
        Vector3::new(-w.z, 0.0, w.x) / (w.x * w.x + w.z * w.z).sqrt()
    } else {
        Vector3::new(0.0, w.z, -w.y) / (w.y * w.y + w.z * w.z).sqrt()
    };
    let v = w.cross(&u);
    (u, v)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn check_basis(p: &Principal) {
        let [n1, n2, n3] = p.directions;
        for n in p.directions {
            assert!((n.norm() - 1.0).abs() < 1e-14);
        }
        assert!(
            n1.dot(&n2).abs() < 1e-14 && n2.dot(&n3).abs() < 1e-14 && n1.dot(&n3).abs() < 1e-14
        );
        assert!((n1.cross(&n2) - n3).norm() < 1e-14, "right-handed");
    }

    #[test]
    fn repeated_values_give_an_orthonormal_basis() {
        // Axisymmetric state: σ2 = σ3 (common practice, no source).
        let t = StressTensor::from_pa([5.0, 1.0, 1.0, 0.0, 0.0, 0.0]).unwrap();
        let p = principal(&t);
        for (v, e) in p.values_pa.iter().zip([5.0, 1.0, 1.0]) {
            assert!((v - e).abs() < 4.0 * f64::EPSILON * 5.0, "{v} vs {e}");
        }
        assert!((p.directions[0].x.abs() - 1.0).abs() < 1e-15);
        check_basis(&p);
        let t = StressTensor::from_pa([1.0, 1.0, -3.0, 0.0, 0.0, 0.0]).unwrap();
        let p = principal(&t);
        check_basis(&p);
        assert!((p.directions[2].z.abs() - 1.0).abs() < 1e-15);
    }

    #[test]
    fn hydrostatic_is_exact() {
        let t = StressTensor::from_pa([-7.0, -7.0, -7.0, 0.0, 0.0, 0.0]).unwrap();
        assert_eq!(principal_values_pa(&t), [-7.0; 3]);
        check_basis(&principal(&t));
    }

    #[test]
    fn nearly_repeated_pair_keeps_its_gap() {
        // Values 2, −1, −1 − 1e-9 in a rotated frame: the trigonometric roots alone would carry
        // errors near 1e-8 here; the refined ones must be good to working precision.
        let q = nalgebra::Rotation3::from_euler_angles(0.3, -0.7, 1.1).into_inner();
        let d = Matrix3::from_diagonal(&Vector3::new(2.0, -1.0, -1.0 - 1e-9));
        let t = StressTensor::from_matrix_pa(&(q * d * q.transpose())).unwrap();
        let v = principal_values_pa(&t);
        assert!((v[0] - 2.0).abs() < 1e-14);
        assert!((v[1] + 1.0).abs() < 1e-14);
        assert!((v[2] + 1.0 + 1e-9).abs() < 1e-14);
        let p = principal(&t);
        check_basis(&p);
        assert!((p.directions[0].abs() - q.column(0).abs()).norm() < 1e-13);
    }
}
