//! The stress states engineers start from besides six components, converted to the tensor every
//! other part of the program uses: in-situ stresses (a vertical stress and two horizontal ones
//! with an azimuth), principal values with the trends and plunges of their axes, strain-gauge
//! rosettes on a free surface, and plane stress. Axes: x = east, y = north, z = up.

use nalgebra::{Matrix3, Vector3};

use super::tensor::{StressTensor, TensorError};

/// Why an input cannot become a tensor.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum InputError {
    /// Two axes are not perpendicular enough.
    #[error("the σ1 and σ3 axes are {0:.2}° apart, not 90° (more than 0.5° off)")]
    NotPerpendicular(f64),
    /// A plunge outside 0..=90°.
    #[error("plunge {0}° is outside 0° to 90°")]
    Plunge(f64),
    /// Gauges at angles that do not determine the strains.
    #[error(
        "the gauge angles {0:?}° do not determine the strains (two gauges along the same line, 180° apart or repeated)"
    )]
    Gauges([f64; 3]),
    /// Young's modulus must be positive.
    #[error("Young's modulus must be a positive, finite stress")]
    Modulus,
    /// Poisson's ratio outside (−1, 0.5).
    #[error("Poisson's ratio {0} is outside −1 to 0.5 (both excluded)")]
    Poisson(f64),
    /// A number that is not finite.
    #[error("{0} must be a finite number")]
    NotFinite(&'static str),
    /// The principal values are not ordered σ1 ≥ σ2 ≥ σ3.
    #[error("principal values must be ordered s1 ≥ s2 ≥ s3 in the convention they are typed in")]
    Order,
    /// SHmax below Shmin: the names say which horizontal stress is the larger.
    #[error(
        "SHmax ({shmax}) is below Shmin ({shmin}): SHmax is the larger horizontal stress — swap them (and give the azimuth of the larger)"
    )]
    HorizontalOrder {
        /// SHmax as typed.
        shmax: f64,
        /// Shmin as typed.
        shmin: f64,
    },
    /// The resulting tensor is out of range.
    #[error(transparent)]
    Tensor(#[from] TensorError),
}

/// The unit vector of a line with `trend` (clockwise from north) and `plunge` (down from the
/// horizontal), degrees; x = east, y = north, z = up (common practice in structural geology,
/// e.g. Fossen, Structural Geology, 2016, ch. 2).
pub fn axis(trend_deg: f64, plunge_deg: f64) -> Result<Vector3<f64>, InputError> {
    if !(trend_deg.is_finite() && plunge_deg.is_finite()) {
        return Err(InputError::NotFinite("trend and plunge"));
    }
    if !(0.0..=90.0).contains(&plunge_deg) {
        return Err(InputError::Plunge(plunge_deg));
    }
    let (t, p) = (trend_deg.to_radians(), plunge_deg.to_radians());
    Ok(Vector3::new(p.cos() * t.sin(), p.cos() * t.cos(), -p.sin()))
}

fn from_frame(values_pa: [f64; 3], axes: [Vector3<f64>; 3]) -> Result<StressTensor, InputError> {
    let mut m = Matrix3::zeros();
    for (v, a) in values_pa.iter().zip(axes) {
        m += *v * a * a.transpose();
    }
    Ok(StressTensor::from_matrix_pa(&m)?)
}

/// In-situ stresses, compression positive as typed (Pa): vertical Sv, maximum and minimum
/// horizontal SHmax and Shmin, SHmax's azimuth clockwise from north. The tensor (tension
/// positive) is −(Sv e_z e_zᵀ + SHmax h hᵀ + Shmin k kᵀ) with h = (sin α, cos α, 0) and
/// k = (cos α, −sin α, 0) (the Andersonian frame; e.g. Zoback, Reservoir Geomechanics, 2007,
/// ch. 1).
pub fn in_situ(
    sv_pa: f64,
    shmax_pa: f64,
    shmin_pa: f64,
    azimuth_deg: f64,
) -> Result<StressTensor, InputError> {
    if ![sv_pa, shmax_pa, shmin_pa, azimuth_deg]
        .iter()
        .all(|v| v.is_finite())
    {
        return Err(InputError::NotFinite("in-situ stresses and azimuth"));
    }
    if shmax_pa < shmin_pa {
        return Err(InputError::HorizontalOrder {
            shmax: shmax_pa,
            shmin: shmin_pa,
        });
    }
    let a = azimuth_deg.to_radians();
    let h = Vector3::new(a.sin(), a.cos(), 0.0);
    let k = Vector3::new(a.cos(), -a.sin(), 0.0);
    from_frame([-sv_pa, -shmax_pa, -shmin_pa], [Vector3::z(), h, k])
}

/// Principal values s1 ≥ s2 ≥ s3 (Pa, in the convention they are typed in: `sign` = +1 for
/// tension positive, −1 for compression positive) with the σ1 and σ3 axes as trend/plunge;
/// σ2 completes the right-handed set n2 = n3 × n1. Axes within 0.5° of perpendicular are made
/// exactly perpendicular (σ3's axis is adjusted); beyond that it is an error saying by how much.
pub fn principal_axes(
    values: [f64; 3],
    sign: f64,
    axis1: (f64, f64),
    axis3: (f64, f64),
) -> Result<StressTensor, InputError> {
    if !values.iter().all(|v| v.is_finite()) {
        return Err(InputError::NotFinite("principal values"));
    }
    if !(values[0] >= values[1] && values[1] >= values[2]) {
        return Err(InputError::Order);
    }
    let n1 = axis(axis1.0, axis1.1)?;
    let n3 = axis(axis3.0, axis3.1)?;
    let angle = n1.dot(&n3).clamp(-1.0, 1.0).acos().to_degrees();
    if (angle - 90.0).abs() > 0.5 {
        return Err(InputError::NotPerpendicular(angle));
    }
    let n3 = (n3 - n1 * n1.dot(&n3)).normalize();
    let n2 = n3.cross(&n1);
    from_frame(values.map(|v| sign * v), [n1, n2, n3])
}

/// Plane stress: σx, σy, τxy (Pa, tension positive), σz = τyz = τzx = 0.
pub fn plane_stress(sx_pa: f64, sy_pa: f64, txy_pa: f64) -> Result<StressTensor, InputError> {
    Ok(StressTensor::from_pa([
        sx_pa, sy_pa, 0.0, txy_pa, 0.0, 0.0,
    ])?)
}

/// In-plane principal values and the angle of the first from x (counter-clockwise, degrees) of a
/// 2D strain or stress (x, y, xy with the shear as a tensor component); the angle is `None`
/// when the state is isotropic in the plane.
#[must_use]
pub fn in_plane_principal(x: f64, y: f64, xy: f64) -> (f64, f64, Option<f64>) {
    let centre = 0.5 * (x + y);
    let radius = (0.5 * (x - y)).hypot(xy);
    let scale = x.abs().max(y.abs()).max(xy.abs());
    let angle = (radius > 1e-12 * scale).then(|| 0.5 * (2.0 * xy).atan2(x - y).to_degrees());
    (centre + radius, centre - radius, angle)
}

/// A three-gauge rosette on a free surface (plane stress, linear elastic, isotropic).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Rosette {
    /// Gauge angles counter-clockwise from x, degrees.
    pub angles_deg: [f64; 3],
    /// Readings, strain (not microstrain).
    pub strains: [f64; 3],
    /// Young's modulus, Pa.
    pub modulus_pa: f64,
    /// Poisson's ratio.
    pub poisson: f64,
}

/// What a rosette gives.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct RosetteResult {
    /// εx, εy and the engineering shear strain γxy.
    pub strains: [f64; 3],
    /// Principal strains ε1 ≥ ε2 in the plane.
    pub principal: [f64; 2],
    /// Angle of ε1 from x, counter-clockwise, degrees; `None` when all directions are alike.
    pub angle_deg: Option<f64>,
    /// The plane-stress tensor (σz = τyz = τzx = 0).
    pub stress: StressTensor,
}

impl Rosette {
    /// εx, εy, γxy from the readings: ε(θ) = εx cos²θ + εy sin²θ + γxy sin θ cos θ per gauge
    /// (strain transformation; e.g. Hibbeler, Mechanics of Materials, §10.3), then the
    /// plane-stress Hooke's law σx = E (εx + ν εy) / (1 − ν²), σy = E (εy + ν εx) / (1 − ν²),
    /// τxy = E γxy / (2 (1 + ν)).
    pub fn solve(&self) -> Result<RosetteResult, InputError> {
        let finite = self
            .angles_deg
            .iter()
            .chain(&self.strains)
            .all(|v| v.is_finite());
        if !finite {
            return Err(InputError::NotFinite("gauge angles and readings"));
        }
        if !(self.modulus_pa.is_finite() && self.modulus_pa > 0.0) {
            return Err(InputError::Modulus);
        }
        if !(self.poisson.is_finite() && self.poisson > -1.0 && self.poisson < 0.5) {
            return Err(InputError::Poisson(self.poisson));
        }
        let row = |deg: f64| {
            let (s, c) = deg.to_radians().sin_cos();
            [c * c, s * s, s * c]
        };
        let rows = self.angles_deg.map(row);
        let a = Matrix3::from_row_slice(&rows.concat());
        // A singular system means two gauges along one line (angles equal modulo 180°).
        let det = a.determinant();
        let lu = a.lu();
        let solved = (det.abs() > 1e-9)
            .then(|| lu.solve(&Vector3::from(self.strains)))
            .flatten()
            .ok_or(InputError::Gauges(self.angles_deg))?;
        let [ex, ey, gxy] = [solved.x, solved.y, solved.z];
        let (e1, e2, angle_deg) = in_plane_principal(ex, ey, 0.5 * gxy);
        let (e, nu) = (self.modulus_pa, self.poisson);
        let k = e / (1.0 - nu * nu);
        let stress = plane_stress(
            k * (ex + nu * ey),
            k * (ey + nu * ex),
            e / (2.0 * (1.0 + nu)) * gxy,
        )?;
        Ok(RosetteResult {
            strains: [ex, ey, gxy],
            principal: [e1, e2],
            angle_deg,
            stress,
        })
    }

    /// The readings a plane-stress tensor would give on these gauges (the inverse of
    /// [`Rosette::solve`]), for round-trip checks.
    #[must_use]
    pub fn readings(&self, stress: &StressTensor) -> [f64; 3] {
        let [sx, sy, _, txy, _, _] = stress.components_pa();
        let (e, nu) = (self.modulus_pa, self.poisson);
        let ex = (sx - nu * sy) / e;
        let ey = (sy - nu * sx) / e;
        let gxy = 2.0 * (1.0 + nu) * txy / e;
        self.angles_deg.map(|deg| {
            let (s, c) = deg.to_radians().sin_cos();
            ex * c * c + ey * s * s + gxy * s * c
        })
    }
}
