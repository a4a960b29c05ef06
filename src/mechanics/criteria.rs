//! Failure criteria and fault-reactivation measures.
//!
//! Each criterion gives a utilization U = demand / capacity (U ≥ 1 means the criterion is met
//! or exceeded) and the factor of safety 1/U. Inputs are the stored, tension-positive tensor;
//! conventions used inside a formula are stated beside it. Where the capacity at the current
//! mean or effective normal stress is zero or negative (a state beyond the apex of a
//! pressure-dependent criterion, or a plane whose effective normal stress is tensile) nothing is
//! divided by it: the result says so in its [`Condition`] and has no utilization.

use serde::{Deserialize, Serialize};

use super::analysis::Analysis;
use super::plane::{PlaneNormal, PlaneStress};
use super::tensor::StressTensor;
use super::units::SignConvention;

/// Why criterion parameters are unusable.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum CriterionError {
    /// A strength must be positive and finite.
    #[error("{0} must be a positive, finite stress")]
    Strength(&'static str),
    /// Cohesion must be zero or positive and finite.
    #[error("cohesion must be zero or a positive, finite stress")]
    Cohesion,
    /// The friction angle must lie in [0°, 90°).
    #[error("friction angle {0}° is outside 0° to 90° (90° excluded)")]
    FrictionAngle(f64),
    /// A pore pressure must be finite.
    #[error("pore pressure must be a finite stress")]
    PorePressure,
}

/// How the state stands against a criterion.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Condition {
    /// The utilization is defined.
    Defined,
    /// The mean stress is so tensile that the criterion's capacity is zero or negative (beyond
    /// the apex of the cone or of the Mohr–Coulomb envelope): failing, no utilization.
    BeyondApex,
    /// The effective normal stress on the plane is zero or tensile: the plane would open; a
    /// frictional ratio is not defined.
    EffectiveTension,
    /// The measure is undefined for this state (for example dilation tendency when σ1 = σ3).
    Undefined,
}

/// The result of checking one criterion or measure.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Check {
    /// Demand / capacity (dimensionless), when defined.
    pub utilization: Option<f64>,
    /// Whether the utilization is defined, and if not, why.
    pub condition: Condition,
}

impl Check {
    fn defined(utilization: f64) -> Self {
        Self {
            utilization: Some(utilization),
            condition: Condition::Defined,
        }
    }

    fn not_defined(condition: Condition) -> Self {
        Self {
            utilization: None,
            condition,
        }
    }

    /// The factor of safety 1 / U; `None` when U is undefined or zero (no demand).
    #[must_use]
    pub fn factor_of_safety(&self) -> Option<f64> {
        self.utilization.filter(|u| *u > 0.0).map(|u| 1.0 / u)
    }

    /// True when the state meets or exceeds the criterion, including beyond-apex states.
    #[must_use]
    pub fn fails(&self) -> bool {
        match self.condition {
            Condition::Defined => self.utilization.is_some_and(|u| u >= 1.0),
            Condition::BeyondApex | Condition::EffectiveTension => true,
            Condition::Undefined => false,
        }
    }
}

fn positive(value_pa: f64, what: &'static str) -> Result<f64, CriterionError> {
    if value_pa.is_finite() && value_pa > 0.0 {
        Ok(value_pa)
    } else {
        Err(CriterionError::Strength(what))
    }
}

/// Cohesion c ≥ 0 (Pa) and friction angle φ (degrees, 0 ≤ φ < 90) of a Mohr–Coulomb material.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub struct MohrCoulomb {
    /// Cohesion c, Pa.
    pub cohesion_pa: f64,
    /// Friction angle φ, degrees.
    pub friction_angle_deg: f64,
}

impl MohrCoulomb {
    /// Validates the parameters.
    pub fn new(cohesion_pa: f64, friction_angle_deg: f64) -> Result<Self, CriterionError> {
        if !(cohesion_pa.is_finite() && cohesion_pa >= 0.0) {
            return Err(CriterionError::Cohesion);
        }
        if !(friction_angle_deg.is_finite() && (0.0..90.0).contains(&friction_angle_deg)) {
            return Err(CriterionError::FrictionAngle(friction_angle_deg));
        }
        Ok(Self {
            cohesion_pa,
            friction_angle_deg,
        })
    }

    /// Shear strength τ_f = c + σn' tan φ on a plane with effective normal stress σn'
    /// (compression positive), Pa; negative beyond the envelope's apex (Coulomb 1776; Labuz &
    /// Zang, Rock Mech. Rock Eng. 45:975, 2012, eq. 1).
    #[must_use]
    pub fn shear_strength_pa(&self, effective_normal_stress_pa: f64) -> f64 {
        self.cohesion_pa + effective_normal_stress_pa * self.friction_angle_deg.to_radians().tan()
    }

    /// Uniaxial compressive strength 2c cos φ / (1 − sin φ), Pa (Labuz & Zang, "Mohr–Coulomb
    /// failure criterion", Rock Mech. Rock Eng. 45:975, 2012, eq. 7).
    #[must_use]
    pub fn uniaxial_compressive_strength_pa(&self) -> f64 {
        let (s, c) = self.friction_angle_deg.to_radians().sin_cos();
        2.0 * self.cohesion_pa * c / (1.0 - s)
    }

    /// Uniaxial tensile strength implied by the envelope, 2c cos φ / (1 + sin φ), Pa (same
    /// source; real materials usually need a separate tension cut-off).
    #[must_use]
    pub fn uniaxial_tensile_strength_pa(&self) -> f64 {
        let (s, c) = self.friction_angle_deg.to_radians().sin_cos();
        2.0 * self.cohesion_pa * c / (1.0 + s)
    }
}

/// von Mises: U = σ_vM / f_y (von Mises 1913; the distortion-energy criterion).
pub fn von_mises(t: &StressTensor, yield_strength_pa: f64) -> Result<Check, CriterionError> {
    let fy = positive(yield_strength_pa, "yield strength")?;
    let a = Analysis::new(t, SignConvention::TensionPositive);
    Ok(Check::defined(a.von_mises_pa / fy))
}

/// Tresca: U = (σ1 − σ3) / f_y (Tresca 1864; maximum shear stress = f_y / 2).
pub fn tresca(t: &StressTensor, yield_strength_pa: f64) -> Result<Check, CriterionError> {
    let fy = positive(yield_strength_pa, "yield strength")?;
    let a = Analysis::new(t, SignConvention::TensionPositive);
    Ok(Check::defined(a.tresca_pa / fy))
}

/// Rankine (maximum principal stress): U = max(σ1 / f_t, −σ3 / f_c, 0), tension positive,
/// with tensile strength f_t and compressive strength f_c both given as positive numbers.
pub fn rankine(
    t: &StressTensor,
    tensile_strength_pa: f64,
    compressive_strength_pa: f64,
) -> Result<Check, CriterionError> {
    let ft = positive(tensile_strength_pa, "tensile strength")?;
    let fc = positive(compressive_strength_pa, "compressive strength")?;
    let [s1, _, s3] = Analysis::new(t, SignConvention::TensionPositive)
        .principal
        .values_pa;
    Ok(Check::defined((s1 / ft).max(-s3 / fc).max(0.0)))
}

/// Mohr–Coulomb in principal stresses. Tension positive, σm = (σ1 + σ3)/2, τm = (σ1 − σ3)/2:
/// failure when τm = c cos φ − σm sin φ (Labuz & Zang 2012, eq. 4 written tension-positive), so
/// U = τm / (c cos φ − σm sin φ). With φ = 0 this is Tresca with f_y = 2c.
#[must_use]
pub fn mohr_coulomb(t: &StressTensor, material: &MohrCoulomb) -> Check {
    let [s1, _, s3] = Analysis::new(t, SignConvention::TensionPositive)
        .principal
        .values_pa;
    let (sin_phi, cos_phi) = material.friction_angle_deg.to_radians().sin_cos();
    let tau_m = 0.5 * (s1 - s3);
    let sigma_m = 0.5 * (s1 + s3);
    let capacity = material.cohesion_pa * cos_phi - sigma_m * sin_phi;
    if capacity <= 0.0 {
        return Check::not_defined(Condition::BeyondApex);
    }
    Check::defined(tau_m / capacity)
}

/// The three usual ways of fitting a Drucker–Prager cone to a Mohr–Coulomb hexagon
/// (Chen & Han, Plasticity for Structural Engineers, 1988, §5.4; Drucker & Prager 1952).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum DruckerPragerFit {
    /// Circumscribed cone through the compressive meridian (outer apices):
    /// α = 2 sin φ / (√3 (3 − sin φ)), k = 6 c cos φ / (√3 (3 − sin φ)).
    CompressiveMeridian,
    /// Cone through the tensile meridian (inner apices):
    /// α = 2 sin φ / (√3 (3 + sin φ)), k = 6 c cos φ / (√3 (3 + sin φ)).
    TensileMeridian,
    /// Cone inscribed in the hexagon (also the plane-strain match):
    /// α = sin φ / (√3 √(3 + sin² φ)), k = √3 c cos φ / √(3 + sin² φ).
    Inscribed,
}

impl DruckerPragerFit {
    /// All fits, in menu order.
    pub const ALL: [Self; 3] = [
        Self::CompressiveMeridian,
        Self::TensileMeridian,
        Self::Inscribed,
    ];

    /// Name as shown to users.
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            Self::CompressiveMeridian => "outer (compressive meridian)",
            Self::TensileMeridian => "inner (tensile meridian)",
            Self::Inscribed => "inscribed",
        }
    }

    /// α (dimensionless) and k (Pa) of √J2 + α I1 = k, tension positive.
    #[must_use]
    pub fn alpha_k(self, material: &MohrCoulomb) -> (f64, f64) {
        let (s, c) = material.friction_angle_deg.to_radians().sin_cos();
        let coh = material.cohesion_pa;
        let r3 = 3.0_f64.sqrt();
        match self {
            Self::CompressiveMeridian => {
                (2.0 * s / (r3 * (3.0 - s)), 6.0 * coh * c / (r3 * (3.0 - s)))
            }
            Self::TensileMeridian => (2.0 * s / (r3 * (3.0 + s)), 6.0 * coh * c / (r3 * (3.0 + s))),
            Self::Inscribed => {
                let d = (3.0 + s * s).sqrt();
                (s / (r3 * d), r3 * coh * c / d)
            }
        }
    }
}

/// Drucker–Prager: failure when √J2 + α I1 = k (tension positive), so
/// U = √J2 / (k − α I1).
#[must_use]
pub fn drucker_prager(t: &StressTensor, material: &MohrCoulomb, fit: DruckerPragerFit) -> Check {
    let a = Analysis::new(t, SignConvention::TensionPositive);
    let (alpha, k) = fit.alpha_k(material);
    let capacity = k - alpha * a.invariants.i1;
    if capacity <= 0.0 {
        return Check::not_defined(Condition::BeyondApex);
    }
    Check::defined(a.invariants.j2.sqrt() / capacity)
}

/// Slip tendency T_s = τ / (σn − p) on a plane, compression positive, with pore pressure p
/// (Morris, Ferrill & Henderson, "Slip-tendency analysis and fault reactivation", Geology
/// 24(3):275, 1996; effective stress after Terzaghi). When σn − p ≤ 0 the plane's effective
/// normal stress is tensile or zero: [`Condition::EffectiveTension`], no value.
pub fn slip_tendency(
    t: &StressTensor,
    normal: PlaneNormal,
    pore_pressure_pa: f64,
) -> Result<Check, CriterionError> {
    if !pore_pressure_pa.is_finite() {
        return Err(CriterionError::PorePressure);
    }
    let ps = PlaneStress::new(t, normal, SignConvention::CompressionPositive);
    let effective = ps.normal_stress_pa - pore_pressure_pa;
    if effective <= 0.0 {
        return Ok(Check::not_defined(Condition::EffectiveTension));
    }
    Ok(Check::defined(ps.shear_stress_pa / effective))
}

/// Dilation tendency T_d = (σ1 − σn) / (σ1 − σ3), compression positive, in [0, 1] (Ferrill et al.,
/// "Dilational fault slip and pit chain formation on Mars", GSA Today 9(5):1, 1999). Undefined
/// when σ1 = σ3 (an isotropic state has no preferred plane).
#[must_use]
pub fn dilation_tendency(t: &StressTensor, normal: PlaneNormal) -> Check {
    let a = Analysis::new(t, SignConvention::CompressionPositive);
    let [s1, _, s3] = a.principal.values_pa;
    if a.lode_angle_deg.is_none() {
        return Check::not_defined(Condition::Undefined);
    }
    let ps = PlaneStress::new(t, normal, SignConvention::CompressionPositive);
    Check::defined(((s1 - ps.normal_stress_pa) / (s1 - s3)).clamp(0.0, 1.0))
}
