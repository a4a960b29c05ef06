//! Mohr's circles of a 3D stress state, and the way back from a point of the Mohr diagram to a
//! plane.
//!
//! With principal stresses σ1 ≥ σ2 ≥ σ3 (in the display convention) and a plane whose normal
//! has squared direction cosines a, b, c in the principal frame (a + b + c = 1):
//!
//! σn = σ1 a + σ2 b + σ3 c,  σn² + τ² = σ1² a + σ2² b + σ3² c.
//!
//! Solving these three linear equations for a, b, c gives (Mohr 1882; e.g. Jaeger, Cook &
//! Zimmerman, Fundamentals of Rock Mechanics, 4th ed., 2007, §2.7):
//!
//! a = (τ² + (σn − σ2)(σn − σ3)) / ((σ1 − σ2)(σ1 − σ3)), and cyclically for b and c.
//!
//! Because a, b, c ≥ 0, every plane's point (σn, τ) lies inside the circle through σ1 and σ3
//! and outside the circles through σ1, σ2 and σ2, σ3: the admissible region.

use nalgebra::Vector3;

use super::analysis::Analysis;
use super::plane::{NEGLIGIBLE_RELATIVE, PlaneNormal, PlaneStress};
use super::tensor::StressTensor;
use super::units::SignConvention;

/// One Mohr circle: centre on the σn axis and radius, Pa.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Circle {
    /// Centre (σi + σj)/2, Pa.
    pub centre_pa: f64,
    /// Radius (σi − σj)/2 ≥ 0, Pa.
    pub radius_pa: f64,
}

impl Circle {
    fn through(a: f64, b: f64) -> Self {
        Self {
            centre_pa: 0.5 * (a + b),
            radius_pa: 0.5 * (a - b).abs(),
        }
    }

    /// Signed squared distance from the circle: negative inside, positive outside, Pa².
    fn power(&self, normal_stress_pa: f64, shear_stress_pa: f64) -> f64 {
        let dx = normal_stress_pa - self.centre_pa;
        dx * dx + shear_stress_pa * shear_stress_pa - self.radius_pa * self.radius_pa
    }
}

/// The three Mohr circles of a state, in one sign convention.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct MohrCircles {
    /// Convention of every stress here.
    pub convention: SignConvention,
    /// Principal stresses σ1 ≥ σ2 ≥ σ3, Pa.
    pub principal_pa: [f64; 3],
    /// Principal directions, unit vectors, in the order of `principal_pa`.
    pub directions: [Vector3<f64>; 3],
}

impl MohrCircles {
    /// The circles of `tensor` seen in `convention`.
    #[must_use]
    pub fn new(tensor: &StressTensor, convention: SignConvention) -> Self {
        let principal = Analysis::new(tensor, convention).principal;
        Self {
            convention,
            principal_pa: principal.values_pa,
            directions: principal.directions,
        }
    }

    /// The outer circle through σ1 and σ3.
    #[must_use]
    pub fn outer(&self) -> Circle {
        let [s1, _, s3] = self.principal_pa;
        Circle::through(s1, s3)
    }

    /// The two inner circles, through σ1 and σ2, and through σ2 and σ3.
    #[must_use]
    pub fn inner(&self) -> [Circle; 2] {
        let [s1, s2, s3] = self.principal_pa;
        [Circle::through(s1, s2), Circle::through(s2, s3)]
    }

    /// A stress scale for tolerances: the largest principal magnitude (1 Pa when all are zero).
    fn scale_pa(&self) -> f64 {
        self.principal_pa
            .iter()
            .fold(0.0_f64, |m, v| m.max(v.abs()))
            .max(1.0)
    }

    /// Whether (σn, τ) lies in the admissible region (inside the outer circle, outside both
    /// inner ones, τ ≥ 0), within `relative_tolerance` of the state's largest stress.
    #[must_use]
    pub fn is_admissible(
        &self,
        normal_stress_pa: f64,
        shear_stress_pa: f64,
        relative_tolerance: f64,
    ) -> bool {
        let tol = relative_tolerance * self.scale_pa();
        // Powers are squared distances times (distance + 2 r); compare with a tolerance of the
        // same dimension.
        let tol2 = tol * (tol + 4.0 * self.outer().radius_pa);
        let [inner_a, inner_b] = self.inner();
        shear_stress_pa >= -tol
            && self.outer().power(normal_stress_pa, shear_stress_pa) <= tol2
            && inner_a.power(normal_stress_pa, shear_stress_pa) >= -tol2
            && inner_b.power(normal_stress_pa, shear_stress_pa) >= -tol2
    }

    /// The point (σn, τ) of the plane with normal `normal`, Pa, in this convention.
    #[must_use]
    pub fn point(&self, tensor: &StressTensor, normal: PlaneNormal) -> (f64, f64) {
        let ps = PlaneStress::new(tensor, normal, self.convention);
        (ps.normal_stress_pa, ps.shear_stress_pa)
    }

    /// Squared direction cosines (a, b, c) in the principal frame of the planes whose Mohr
    /// point is (σn, τ); `None` outside the admissible region (beyond a small tolerance). Points
    /// just outside are moved onto the region's edge. For repeated principal values the split
    /// between the repeated directions is not fixed by (σn, τ); it is taken in the ratio
    /// `hint` has (the squared cosines of a plane nearby).
    #[must_use]
    pub fn cosines_at(
        &self,
        normal_stress_pa: f64,
        shear_stress_pa: f64,
        hint: [f64; 3],
    ) -> Option<[f64; 3]> {
        let [s1, s2, s3] = self.principal_pa;
        let scale = self.scale_pa();
        let gap = |x: f64, y: f64| (x - y).abs() > NEGLIGIBLE_RELATIVE * scale;
        let (sn, tau2) = (normal_stress_pa, shear_stress_pa * shear_stress_pa);
        let split = |total: f64, h: [f64; 2]| -> [f64; 2] {
            let sum = h[0] + h[1];
            if sum > 0.0 {
                [total * h[0] / sum, total * h[1] / sum]
            } else {
                [0.5 * total, 0.5 * total]
            }
        };
        let raw = match (gap(s1, s2), gap(s2, s3)) {
            (true, true) => [
                (tau2 + (sn - s2) * (sn - s3)) / ((s1 - s2) * (s1 - s3)),
                (tau2 + (sn - s3) * (sn - s1)) / ((s2 - s3) * (s2 - s1)),
                (tau2 + (sn - s1) * (sn - s2)) / ((s3 - s1) * (s3 - s2)),
            ],
            // σ1 = σ2: the circle through σ1, σ3 is the only one; σn fixes c.
            (false, true) => {
                let c = (s1 - sn) / (s1 - s3);
                let [a, b] = split(1.0 - c, [hint[0], hint[1]]);
                [a, b, c]
            }
            // σ2 = σ3: σn fixes a.
            (true, false) => {
                let a = (sn - s3) / (s1 - s3);
                let [b, c] = split(1.0 - a, [hint[1], hint[2]]);
                [a, b, c]
            }
            // Hydrostatic: every plane is the same point.
            (false, false) => hint,
        };
        // Points a little outside (a click on an edge, rounding) land on the edge; a point
        // clearly outside has no plane.
        if raw.iter().any(|v| !v.is_finite() || *v < -0.02) {
            return None;
        }
        let clamped = raw.map(|v| v.max(0.0));
        let sum: f64 = clamped.iter().sum();
        (sum > 0.0).then(|| clamped.map(|v| v / sum))
    }

    /// The plane whose Mohr point is (σn, τ), on the same side of each principal direction as
    /// `near` (of the eight such planes, the one closest to `near`); `None` outside the
    /// admissible region.
    #[must_use]
    pub fn plane_at(
        &self,
        normal_stress_pa: f64,
        shear_stress_pa: f64,
        near: PlaneNormal,
    ) -> Option<PlaneNormal> {
        let cosines = self.directions.map(|d| d.dot(&near.vector()));
        let hint = cosines.map(|c| c * c);
        let squared = self.cosines_at(normal_stress_pa, shear_stress_pa, hint)?;
        let n = self
            .directions
            .iter()
            .zip(squared.iter().zip(cosines))
            .fold(Vector3::zeros(), |n, (d, (sq, c))| {
                n + d * (sq.sqrt() * if c < 0.0 { -1.0 } else { 1.0 })
            });
        PlaneNormal::from_vector(n).ok()
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::mechanics::StressUnit;

    fn state() -> StressTensor {
        StressTensor::from_components(
            [120.0, -35.0, 15.0, 48.0, -12.0, 22.0],
            StressUnit::MPa,
            1.0,
        )
        .unwrap()
    }

    #[test]
    fn principal_planes_sit_on_the_axis_at_the_principal_values() {
        let t = state();
        let m = MohrCircles::new(&t, SignConvention::TensionPositive);
        for (d, s) in m.directions.iter().zip(m.principal_pa) {
            let (sn, tau) = m.point(&t, PlaneNormal::from_vector(*d).unwrap());
            assert!((sn - s).abs() < 1e-6 && tau < 1e-6, "{sn} {tau} {s}");
        }
    }

    #[test]
    fn plane_at_returns_a_plane_with_that_point() {
        let t = state();
        for convention in [
            SignConvention::TensionPositive,
            SignConvention::CompressionPositive,
        ] {
            let m = MohrCircles::new(&t, convention);
            let n = PlaneNormal::from_vector(Vector3::new(0.3, -0.7, 0.4)).unwrap();
            let (sn, tau) = m.point(&t, n);
            let back = m.plane_at(sn, tau, n).unwrap();
            let (sn2, tau2) = m.point(&t, back);
            assert!((sn - sn2).abs() < 1e-3 && (tau - tau2).abs() < 1e-3);
            // Same octant as the hint, so the same plane.
            assert!((back.vector() - n.vector()).norm() < 1e-9);
        }
    }

    #[test]
    fn points_outside_the_region_have_no_plane() {
        let t = state();
        let m = MohrCircles::new(&t, SignConvention::TensionPositive);
        let outer = m.outer();
        // Far above the outer circle.
        assert!(
            m.plane_at(
                outer.centre_pa,
                2.0 * outer.radius_pa,
                PlaneNormal::from_vector(Vector3::new(1.0, 1.0, 1.0)).unwrap()
            )
            .is_none()
        );
        assert!(!m.is_admissible(outer.centre_pa, 2.0 * outer.radius_pa, 1e-9));
        // The centre of an inner circle is inside it, so not admissible.
        let [inner, _] = m.inner();
        assert!(!m.is_admissible(inner.centre_pa, 0.1 * inner.radius_pa, 1e-9));
    }

    #[test]
    fn repeated_values_keep_the_hint_split() {
        // Axisymmetric: σ1 = σ2 = 10, σ3 = −20 (MPa).
        let t =
            StressTensor::from_components([10.0, 10.0, -20.0, 0.0, 0.0, 0.0], StressUnit::MPa, 1.0)
                .unwrap();
        let m = MohrCircles::new(&t, SignConvention::TensionPositive);
        let near = PlaneNormal::from_vector(Vector3::new(1.0, 0.0, 1.0)).unwrap();
        let (sn, tau) = m.point(&t, near);
        let back = m.plane_at(sn, tau, near).unwrap();
        let (sn2, tau2) = m.point(&t, back);
        assert!((sn - sn2).abs() < 1e-3 && (tau - tau2).abs() < 1e-3);
        // Hydrostatic: every plane is one point; the hint comes back.
        let h = StressTensor::from_components([5.0, 5.0, 5.0, 0.0, 0.0, 0.0], StressUnit::MPa, 1.0)
            .unwrap();
        let m = MohrCircles::new(&h, SignConvention::TensionPositive);
        let back = m.plane_at(5e6, 0.0, near).unwrap();
        assert!((back.vector() - near.vector()).norm() < 1e-12);
    }
}
