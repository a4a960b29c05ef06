//! Planes through the point: unit normals, dip / dip direction, and the traction on a plane.

use nalgebra::Vector3;
use serde::{Deserialize, Serialize};

use super::tensor::StressTensor;
use super::units::SignConvention;

/// Below this fraction of the tensor's largest stress magnitude a shear stress or a deviator
/// counts as zero: it is then at the level of f64 rounding of the inputs (common practice, no
/// source).
pub const NEGLIGIBLE_RELATIVE: f64 = 1e-12;

/// Why a plane cannot be built.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum PlaneError {
    /// All three components are zero (or too small to normalise).
    #[error("the normal vector is zero")]
    ZeroNormal,
    /// A component or angle is NaN or infinite.
    #[error("{0} is not a finite number")]
    NonFinite(&'static str),
    /// Dip outside 0°..=90°.
    #[error("dip {0}° is outside 0° to 90°")]
    DipOutOfRange(f64),
}

/// The unit normal of a plane through the point. n and −n describe the same plane; the sign
/// chosen matters only for the sign of the traction vector (t(−n) = −t(n)).
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(try_from = "[f64; 3]", into = "[f64; 3]")]
pub struct PlaneNormal(Vector3<f64>);

impl TryFrom<[f64; 3]> for PlaneNormal {
    type Error = PlaneError;
    fn try_from(v: [f64; 3]) -> Result<Self, Self::Error> {
        Self::from_vector(Vector3::from(v))
    }
}

impl From<PlaneNormal> for [f64; 3] {
    fn from(n: PlaneNormal) -> Self {
        n.0.into()
    }
}

impl PlaneNormal {
    /// The +x face normal.
    pub const X: Self = Self(Vector3::new(1.0, 0.0, 0.0));
    /// The +y face normal.
    pub const Y: Self = Self(Vector3::new(0.0, 1.0, 0.0));
    /// The +z face normal.
    pub const Z: Self = Self(Vector3::new(0.0, 0.0, 1.0));

    /// Normalises any finite, non-zero vector.
    pub fn from_vector(v: Vector3<f64>) -> Result<Self, PlaneError> {
        if !v.iter().all(|c| c.is_finite()) {
            return Err(PlaneError::NonFinite("normal"));
        }
        // Scale first so that tiny or huge components normalise without underflow or overflow.
        let m = v.amax();
        if m == 0.0 {
            return Err(PlaneError::ZeroNormal);
        }
        let w = v / m;
        Ok(Self(w / w.norm()))
    }

    /// The plane of dip `dip_deg` (0° horizontal to 90° vertical) dipping towards
    /// `dip_direction_deg`, clockwise from north. Axes: x = east, y = north, z = up; the
    /// upward normal is (sin δ sin α, sin δ cos α, cos δ) (common practice in structural geology,
    /// e.g. Fossen, Structural Geology, 2016, ch. 2).
    pub fn from_dip(dip_deg: f64, dip_direction_deg: f64) -> Result<Self, PlaneError> {
        if !dip_deg.is_finite() {
            return Err(PlaneError::NonFinite("dip"));
        }
        if !dip_direction_deg.is_finite() {
            return Err(PlaneError::NonFinite("dip direction"));
        }
        if !(0.0..=90.0).contains(&dip_deg) {
            return Err(PlaneError::DipOutOfRange(dip_deg));
        }
        let (sd, cd) = dip_deg.to_radians().sin_cos();
        let (sa, ca) = dip_direction_deg.to_radians().sin_cos();
        Ok(Self(Vector3::new(sd * sa, sd * ca, cd)))
    }

    /// The normal from a polar angle θ from +z and an azimuth φ from +x towards +y, in degrees.
    pub fn from_spherical(polar_deg: f64, azimuth_deg: f64) -> Result<Self, PlaneError> {
        if !polar_deg.is_finite() || !azimuth_deg.is_finite() {
            return Err(PlaneError::NonFinite("angle"));
        }
        let (st, ct) = polar_deg.to_radians().sin_cos();
        let (sp, cp) = azimuth_deg.to_radians().sin_cos();
        Ok(Self(Vector3::new(st * cp, st * sp, ct)))
    }

    /// Polar angle from +z and azimuth from +x towards +y, in degrees (azimuth in [0, 360)).
    #[must_use]
    pub fn spherical_deg(&self) -> (f64, f64) {
        let n = self.0;
        let polar = n.z.clamp(-1.0, 1.0).acos().to_degrees();
        let azimuth = n.y.atan2(n.x).to_degrees().rem_euclid(360.0);
        (polar, azimuth)
    }

    /// Dip and dip direction of the plane, in degrees: dip in [0, 90], dip direction in
    /// [0, 360) clockwise from north. The sign of the normal does not matter. For a horizontal
    /// plane the dip direction is arbitrary and reported as 0.
    #[must_use]
    pub fn dip_deg(&self) -> (f64, f64) {
        let n = if self.0.z < 0.0 { -self.0 } else { self.0 };
        let horizontal = n.x.hypot(n.y);
        let dip = horizontal.atan2(n.z).to_degrees();
        let dip_direction = if horizontal == 0.0 {
            0.0
        } else {
            n.x.atan2(n.y).to_degrees().rem_euclid(360.0)
        };
        // rem_euclid can return 360.0 itself for tiny negative inputs.
        (
            dip,
            if dip_direction >= 360.0 {
                0.0
            } else {
                dip_direction
            },
        )
    }

    /// The unit vector.
    #[must_use]
    pub fn vector(&self) -> Vector3<f64> {
        self.0
    }

    /// The opposite normal (same plane).
    #[must_use]
    pub fn flipped(&self) -> Self {
        Self(-self.0)
    }
}

/// The stress on one plane.
///
/// Which side is which (common practice, no source): t = σ·n is the traction that the material
/// on the side n points into exerts on the material behind the plane (the side n points away
/// from). The shear direction is the direction of its tangential part in tension-positive
/// physics, whatever the display convention: the way the material in front of the plane is
/// pushed to slide relative to the material behind it. With n pointing up, that is the
/// hanging wall's slip relative to the footwall (slip parallel to the resolved shear stress, the
/// Wallace–Bott assumption).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PlaneStress {
    /// The plane's unit normal.
    pub normal: PlaneNormal,
    /// Traction t = σ·n, in pascals, with σ as shown in the convention that was used (so
    /// σn = t · n holds in that convention).
    pub traction_pa: Vector3<f64>,
    /// Normal stress σn = t · n, in pascals, in the convention that was used.
    pub normal_stress_pa: f64,
    /// Shear stress magnitude τ = |t − σn n| (≥ 0), in pascals; zero when negligible.
    pub shear_stress_pa: f64,
    /// Unit direction of the shear traction in the plane, independent of the display convention
    /// (see the type's doc); `None` when the shear is negligible.
    pub shear_direction: Option<Vector3<f64>>,
}

impl PlaneStress {
    /// The stress on the plane of normal `normal`, with tensor `t` expressed in `convention`
    /// (compression-positive negates the traction and the normal stress, not the shear
    /// direction).
    #[must_use]
    pub fn new(t: &StressTensor, normal: PlaneNormal, convention: SignConvention) -> Self {
        let n = normal.vector();
        let physical_pa = t.traction_pa(&n);
        let traction_pa = physical_pa * convention.sign();
        let normal_stress_pa = traction_pa.dot(&n);
        // The shear vector is formed directly; √(|t|² − σn²) would cancel badly when the shear
        // is small next to the normal stress.
        let shear = physical_pa - n * physical_pa.dot(&n);
        let magnitude = shear.norm();
        let scale = t.max_abs_component_pa();
        let (shear_stress_pa, shear_direction) =
            if magnitude <= NEGLIGIBLE_RELATIVE * scale || magnitude == 0.0 {
                (0.0, None)
            } else {
                (magnitude, Some(shear / magnitude))
            };
        Self {
            normal,
            traction_pa,
            normal_stress_pa,
            shear_stress_pa,
            shear_direction,
        }
    }

    /// The normal part of the traction, σn n, in pascals, in the convention that was used.
    #[must_use]
    pub fn normal_traction_pa(&self) -> Vector3<f64> {
        self.normal.vector() * self.normal_stress_pa
    }

    /// The shear part of the traction, τ s, in pascals, in tension-positive physics (zero when
    /// negligible).
    #[must_use]
    pub fn shear_traction_pa(&self) -> Vector3<f64> {
        self.shear_direction
            .map_or_else(Vector3::zeros, |s| s * self.shear_stress_pa)
    }

    /// The rake of the slip direction in the plane, degrees in (−180°, 180°]: the angle from the
    /// strike direction (dip direction − 90°, right-hand rule) to the hanging wall's slip,
    /// counter-clockwise seen from the hanging wall; +90° reverse, −90° normal, 0° left-lateral,
    /// 180° right-lateral (Aki & Richards, Quantitative Seismology, 1980, §4.2; from memory).
    /// The slip is the shear direction for the upward normal (see the type's doc). `None` when
    /// the shear is negligible or the plane is horizontal (no strike).
    #[must_use]
    pub fn rake_deg(&self) -> Option<f64> {
        let direction = self.shear_direction?;
        let n = self.normal.vector();
        // The upward normal points into the hanging wall; the same choice as `dip_deg`.
        let (n_up, slip) = if n.z < 0.0 {
            (-n, -direction)
        } else {
            (n, direction)
        };
        let horizontal = n_up.x.hypot(n_up.y);
        if horizontal <= 1e-9 {
            return None;
        }
        let strike = Vector3::new(-n_up.y, n_up.x, 0.0) / horizontal;
        let across = n_up.cross(&strike);
        let rake = slip.dot(&across).atan2(slip.dot(&strike)).to_degrees();
        Some(if rake <= -180.0 { 180.0 } else { rake })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dip_round_trip() {
        for (dip, dd) in [
            (60.0, 90.0),
            (0.0, 0.0),
            (90.0, 270.0),
            (35.0, 123.0),
            (89.0, 359.0),
        ] {
            let n = PlaneNormal::from_dip(dip, dd).unwrap();
            let (d2, dd2) = n.dip_deg();
            assert!((d2 - dip).abs() < 1e-12, "{dip} {d2}");
            assert!((dd2 - dd).abs() < 1e-9, "{dd} {dd2}");
            let (d3, dd3) = n.flipped().dip_deg();
            assert!((d3 - dip).abs() < 1e-12 && (dd3 - dd2).abs() < 1e-9);
        }
        // A negative dip direction is the same as adding 360°.
        let a = PlaneNormal::from_dip(40.0, -30.0).unwrap();
        let b = PlaneNormal::from_dip(40.0, 330.0).unwrap();
        assert!((a.vector() - b.vector()).norm() < 1e-15);
        assert_eq!(
            PlaneNormal::from_dip(91.0, 0.0),
            Err(PlaneError::DipOutOfRange(91.0))
        );
    }

    #[test]
    fn zero_and_tiny_normals() {
        assert_eq!(
            PlaneNormal::from_vector(Vector3::zeros()),
            Err(PlaneError::ZeroNormal)
        );
        let n = PlaneNormal::from_vector(Vector3::new(1e-310, 0.0, 1e-310)).unwrap();
        assert!((n.vector().norm() - 1.0).abs() < 1e-15);
        assert!(PlaneNormal::from_vector(Vector3::new(f64::NAN, 0.0, 1.0)).is_err());
    }
}
