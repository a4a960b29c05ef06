//! Failure criteria and fault-reactivation measures.
//!
//! Criteria ([`verdict`]) are judged under proportional loading: the factor of safety is the
//! number every stress component must be multiplied by to reach the criterion's surface, and
//! the utilization is its inverse. Each criterion is written as demand ≤ strength with a demand
//! that scales with the stresses, so U = demand / strength. Where scaling never reaches the
//! surface (demand ≤ 0, e.g. hydrostatic compression under Mohr–Coulomb), or the strength is
//! zero (a cohesionless material), nothing is divided: the [`Condition`] says so. A criterion
//! without its strengths is [`Condition::NotChecked`], never "passes".
//!
//! Plane measures (slip and dilation tendency) and the [`fault_check`] use compression-positive
//! effective stress σn′ = σn − p. Inputs are always the stored, tension-positive tensor.

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

/// How the state stands against a criterion or measure.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Condition {
    /// The utilization is defined.
    Defined,
    /// The strengths the criterion needs are not given: not checked (never "passes").
    NotChecked,
    /// Scaling every stress component up never reaches the criterion's surface (hydrostatic
    /// compression under a pressure-dependent criterion, for example): passes at any scale, no
    /// factor of safety.
    NeverReaches,
    /// The criterion's strength is zero (a cohesionless Mohr–Coulomb or Drucker–Prager material)
    /// and the state is outside it: fails at any scale, no factor of safety.
    FailsAtAnyScale,
    /// The effective normal stress on the plane is zero or tensile: the plane would open; a
    /// frictional ratio is not defined.
    EffectiveTension,
    /// The measure is undefined for this state (for example dilation tendency when σ1 = σ3).
    Undefined,
}

impl Condition {
    /// The key, as JSON and CSV outputs write it (the serde name).
    #[must_use]
    pub fn key(self) -> &'static str {
        match self {
            Self::Defined => "defined",
            Self::NotChecked => "not-checked",
            Self::NeverReaches => "never-reaches",
            Self::FailsAtAnyScale => "fails-at-any-scale",
            Self::EffectiveTension => "effective-tension",
            Self::Undefined => "undefined",
        }
    }
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

    /// True when the measure is met or exceeded (U ≥ 1), or the plane would open.
    #[must_use]
    pub fn fails(&self) -> bool {
        match self.condition {
            Condition::Defined => self.utilization.is_some_and(|u| u >= 1.0),
            Condition::EffectiveTension | Condition::FailsAtAnyScale => true,
            Condition::NotChecked | Condition::NeverReaches | Condition::Undefined => false,
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

/// The ways of fitting a Drucker–Prager cone √J2 + α I1 = k (tension positive) to a
/// Mohr–Coulomb material, each named by what it matches (Chen & Han, Plasticity for Structural
/// Engineers, 1988, §5.4, eqs. 5.4.10–5.4.12 and the plane-strain match; Drucker & Prager 1952).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize, Default)]
#[serde(rename_all = "kebab-case")]
pub enum DruckerPragerFit {
    /// Circumscribed cone through the compression meridian (the hexagon's outer apices):
    /// α = 2 sin φ / (√3 (3 − sin φ)), k = 6 c cos φ / (√3 (3 − sin φ)).
    #[default]
    CompressionMeridian,
    /// Cone through the tension meridian (the hexagon's inner apices):
    /// α = 2 sin φ / (√3 (3 + sin φ)), k = 6 c cos φ / (√3 (3 + sin φ)).
    TensionMeridian,
    /// Cone inscribed in the hexagon in the deviatoric section:
    /// α = sin φ / (√3 √(3 + sin² φ)), k = √3 c cos φ / √(3 + sin² φ).
    Inscribed,
    /// The same collapse load as Mohr–Coulomb in plane strain with associated flow:
    /// α = tan φ / √(9 + 12 tan² φ), k = 3 c / √(9 + 12 tan² φ) — algebraically the inscribed
    /// cone (the tests check the identity), listed under the name engineers look for.
    PlaneStrain,
}

impl DruckerPragerFit {
    /// All fits, in menu order.
    pub const ALL: [Self; 4] = [
        Self::CompressionMeridian,
        Self::TensionMeridian,
        Self::Inscribed,
        Self::PlaneStrain,
    ];

    /// The command-line and file key.
    #[must_use]
    pub fn key(self) -> &'static str {
        match self {
            Self::CompressionMeridian => "compression-meridian",
            Self::TensionMeridian => "tension-meridian",
            Self::Inscribed => "inscribed",
            Self::PlaneStrain => "plane-strain",
        }
    }

    /// Name as shown to users.
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            Self::CompressionMeridian => "matches MC on the compression meridian (outer cone)",
            Self::TensionMeridian => "matches MC on the tension meridian (inner cone)",
            Self::Inscribed => "inscribed in the MC hexagon (deviatoric section)",
            Self::PlaneStrain => "matches MC in plane strain (associated flow)",
        }
    }

    /// α (dimensionless) and k (Pa) of √J2 + α I1 = k, tension positive.
    #[must_use]
    pub fn alpha_k(self, material: &MohrCoulomb) -> (f64, f64) {
        let phi = material.friction_angle_deg.to_radians();
        let (s, c) = phi.sin_cos();
        let coh = material.cohesion_pa;
        let r3 = 3.0_f64.sqrt();
        match self {
            Self::CompressionMeridian => {
                (2.0 * s / (r3 * (3.0 - s)), 6.0 * coh * c / (r3 * (3.0 - s)))
            }
            Self::TensionMeridian => (2.0 * s / (r3 * (3.0 + s)), 6.0 * coh * c / (r3 * (3.0 + s))),
            Self::Inscribed => {
                let d = (3.0 + s * s).sqrt();
                (s / (r3 * d), r3 * coh * c / d)
            }
            Self::PlaneStrain => {
                let t = phi.tan();
                let d = (9.0 + 12.0 * t * t).sqrt();
                (t / d, 3.0 * coh / d)
            }
        }
    }
}

/// The criteria a stress state is checked against.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Criterion {
    /// von Mises (distortion energy).
    VonMises,
    /// Tresca (maximum shear).
    Tresca,
    /// Rankine (maximum principal stress).
    Rankine,
    /// Mohr–Coulomb in principal stresses.
    MohrCoulomb,
    /// Drucker–Prager with a chosen fit to Mohr–Coulomb.
    DruckerPrager,
}

impl Criterion {
    /// All criteria, in the order they are listed.
    pub const ALL: [Self; 5] = [
        Self::VonMises,
        Self::Tresca,
        Self::Rankine,
        Self::MohrCoulomb,
        Self::DruckerPrager,
    ];

    /// The JSON and command-line key.
    #[must_use]
    pub fn key(self) -> &'static str {
        match self {
            Self::VonMises => "von-mises",
            Self::Tresca => "tresca",
            Self::Rankine => "rankine",
            Self::MohrCoulomb => "mohr-coulomb",
            Self::DruckerPrager => "drucker-prager",
        }
    }

    /// Name as shown to users.
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            Self::VonMises => "von Mises",
            Self::Tresca => "Tresca",
            Self::Rankine => "Rankine (max principal stress)",
            Self::MohrCoulomb => "Mohr–Coulomb",
            Self::DruckerPrager => "Drucker–Prager",
        }
    }

    /// The formula with its source, for tooltips, help and reports.
    #[must_use]
    pub fn formula(self) -> &'static str {
        match self {
            Self::VonMises => {
                "√(3 J2) ≤ f_y (von Mises 1913; e.g. Shigley's Mechanical Engineering Design, §5-5)"
            }
            Self::Tresca => {
                "σ1 − σ3 ≤ f_y (Tresca 1864; e.g. Shigley's Mechanical Engineering Design, §5-4)"
            }
            Self::Rankine => {
                "σ1 ≤ f_t and −σ3 ≤ f_c, tension positive; the larger ratio governs (Rankine 1857; e.g. Chen & Han 1988, §2.3)"
            }
            Self::MohrCoulomb => {
                "(σ1 − σ3) + (σ1 + σ3) sin φ ≤ 2 c cos φ, tension positive, no tension cut-off (Labuz & Zang, Rock Mech. Rock Eng. 45:975, 2012)"
            }
            Self::DruckerPrager => {
                "√J2 + α I1 ≤ k, tension positive, α and k from c and φ by the chosen fit (Chen & Han 1988, §5.4)"
            }
        }
    }

    /// The strengths the criterion needs.
    #[must_use]
    pub fn needs(self) -> &'static str {
        match self {
            Self::VonMises | Self::Tresca => "yield strength",
            Self::Rankine => "tensile and/or compressive strength",
            Self::MohrCoulomb | Self::DruckerPrager => "cohesion and friction angle",
        }
    }
}

/// A material's strengths; any may be missing, and a criterion without its strengths is not
/// checked. Stresses in pascals (positive numbers), the friction angle in degrees.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize, Default)]
#[serde(default)]
pub struct Strengths {
    /// Yield strength f_y (von Mises, Tresca), Pa.
    pub yield_strength_pa: Option<f64>,
    /// Tensile strength f_t (Rankine), Pa.
    pub tensile_strength_pa: Option<f64>,
    /// Compressive strength f_c as a positive number (Rankine), Pa.
    pub compressive_strength_pa: Option<f64>,
    /// Cohesion c (Mohr–Coulomb, Drucker–Prager), Pa.
    pub cohesion_pa: Option<f64>,
    /// Friction angle φ (Mohr–Coulomb, Drucker–Prager), degrees.
    pub friction_angle_deg: Option<f64>,
    /// How Drucker–Prager is fitted to c and φ.
    pub dp_fit: DruckerPragerFit,
}

impl Strengths {
    /// Checks every value that is given.
    pub fn validate(&self) -> Result<(), CriterionError> {
        for (value, what) in [
            (self.yield_strength_pa, "yield strength"),
            (self.tensile_strength_pa, "tensile strength"),
            (self.compressive_strength_pa, "compressive strength"),
        ] {
            if let Some(v) = value {
                positive(v, what)?;
            }
        }
        // Each of c and φ on its own, so that a lone bad value is refused too.
        if let Some(c) = self.cohesion_pa {
            MohrCoulomb::new(c, 0.0)?;
        }
        if let Some(phi) = self.friction_angle_deg {
            MohrCoulomb::new(0.0, phi)?;
        }
        self.mohr_coulomb().transpose().map(|_| ())
    }

    /// Whether `criterion` has the strengths it needs (else it is not checked, whatever the
    /// state).
    #[must_use]
    pub fn checks(&self, criterion: Criterion) -> bool {
        // Whether a criterion is checked does not depend on the state: ask `verdict` itself.
        verdict(&StressTensor::default(), criterion, self).condition != Condition::NotChecked
    }

    /// The Mohr–Coulomb material, when both cohesion and friction angle are given.
    #[must_use]
    pub fn mohr_coulomb(&self) -> Option<Result<MohrCoulomb, CriterionError>> {
        match (self.cohesion_pa, self.friction_angle_deg) {
            (Some(c), Some(phi)) => Some(MohrCoulomb::new(c, phi)),
            _ => None,
        }
    }
}

/// One criterion's verdict under proportional loading: the factor of safety is the number every
/// stress component must be multiplied by to reach the criterion's surface, and the utilization
/// is its inverse (demand / strength, both at the current state).
#[derive(Clone, Debug, PartialEq)]
pub struct Verdict {
    /// The criterion.
    pub criterion: Criterion,
    /// The demand the criterion compares (√(3 J2); σ1 − σ3; σ1 or −σ3; the Mohr–Coulomb and
    /// Drucker–Prager left-hand sides), Pa; `None` when not checked.
    pub governing_stress_pa: Option<f64>,
    /// The strength it is compared with, Pa; `None` when not checked.
    pub strength_pa: Option<f64>,
    /// demand / strength; `None` where not defined (see `condition`).
    pub utilization: Option<f64>,
    /// strength / demand; `None` where not defined, and for a state with no demand.
    pub factor_of_safety: Option<f64>,
    /// Whether the numbers are defined, and if not, why.
    pub condition: Condition,
    /// What governs (Rankine: tension or compression), or what is missing when not checked.
    pub note: String,
    /// Which stress the criterion was judged on (total, effective, or unaffected by the pore
    /// pressure).
    pub basis: StressBasis,
    /// For Mohr–Coulomb and Drucker–Prager: the strength-reduction factor and the mobilized
    /// friction angle (`None` for the other criteria and when not checked).
    pub reduction: Option<Reduction>,
}

/// Which stress a criterion is judged on.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
#[serde(rename_all = "kebab-case", tag = "kind")]
pub enum StressBasis {
    /// Total stress (no pore pressure given).
    Total,
    /// Effective stress σ′ = σ + p·I (tension positive; p compression positive), Pa: the
    /// pressure-sensitive criteria (Rankine, Mohr–Coulomb, Drucker–Prager) when a pore pressure
    /// is given (Terzaghi's principle of effective stress).
    Effective {
        /// The pore pressure p, Pa.
        pore_pressure_pa: f64,
    },
    /// A pore pressure is given but the criterion depends only on the deviatoric stress
    /// (von Mises, Tresca), which a pressure p·I does not change.
    Unaffected,
}
// Its words (`StressBasis::text`) are written in `crate::text::format`, the room that formats
// numbers for people.

/// The strength-reduction reading of a pressure-sensitive criterion: the factor F by which the
/// cohesion and tan φ are both divided until the state lies on the criterion's surface (the
/// shear-strength reduction of geotechnical practice, e.g. Griffiths & Lane, Géotechnique
/// 49(3):387, 1999), and the friction angle mobilized at that point, φm = atan(tan φ / F)
/// (with the cohesion c / F). F > 1: safe by that margin; F < 1: beyond the surface.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Reduction {
    /// F, when defined (see `condition`).
    pub factor: Option<f64>,
    /// φm = atan(tan φ / F), degrees, when F is defined.
    pub mobilized_friction_deg: Option<f64>,
    /// [`Condition::Defined`]; [`Condition::NeverReaches`] when no reduction reaches the surface
    /// (no shear: F = ∞); [`Condition::FailsAtAnyScale`] when no F puts the state inside (it lies
    /// beyond the envelope's apex in tension).
    pub condition: Condition,
}

impl Reduction {
    fn defined(factor: f64, tan_phi: f64) -> Self {
        let factor = factor.max(0.0);
        Self {
            factor: Some(factor),
            mobilized_friction_deg: Some(if factor > 0.0 {
                (tan_phi / factor).atan().to_degrees()
            } else {
                90.0
            }),
            condition: Condition::Defined,
        }
    }

    fn not_defined(condition: Condition) -> Self {
        Self {
            factor: None,
            mobilized_friction_deg: None,
            condition,
        }
    }
}

/// The definition of each safety measure, printed beside it wherever it appears.
pub mod definitions {
    /// The proportional-loading factor of safety.
    pub const PROPORTIONAL: &str = "factor of safety (proportional loading): the number every stress component (and the pore pressure) is multiplied by to reach the criterion's surface; 1 / utilization";
    /// The strength-reduction factor.
    pub const REDUCTION: &str = "strength-reduction factor: the number c and tan φ are both divided by until the state reaches the surface";
    /// The mobilized friction angle.
    pub const MOBILIZED: &str = "mobilized friction angle: φm = atan(tan φ / F) at the strength-reduction factor F (with c / F)";
}

/// Relative tolerance below which a stress difference counts as zero (round-off of the
/// eigenvalues and of sums of stresses of magnitude `scale`).
pub const RELATIVE_TOLERANCE: f64 = 1e-9;

/// Pass, fail or not checked.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Outcome {
    /// Utilization below 1, or the surface is never reached.
    Passes,
    /// Utilization 1 or more, or fails at any scale.
    Fails,
    /// Strengths missing.
    NotChecked,
}

impl Verdict {
    /// The outcome.
    #[must_use]
    pub fn outcome(&self) -> Outcome {
        match self.condition {
            Condition::NotChecked => Outcome::NotChecked,
            Condition::FailsAtAnyScale | Condition::EffectiveTension => Outcome::Fails,
            _ if self.utilization.is_some_and(|u| u >= 1.0) => Outcome::Fails,
            _ => Outcome::Passes,
        }
    }

    fn not_checked(criterion: Criterion, note: String) -> Self {
        Self {
            criterion,
            governing_stress_pa: None,
            strength_pa: None,
            utilization: None,
            factor_of_safety: None,
            condition: Condition::NotChecked,
            note,
            basis: StressBasis::Total,
            reduction: None,
        }
    }

    /// The verdict for a demand that scales with the stresses and a fixed strength. A demand
    /// within [`RELATIVE_TOLERANCE`] × `scale_pa` of zero is zero: a state on a zero-strength
    /// surface (a cohesionless cone) is on it at every scale (U = 1), not failing or passing on
    /// round-off.
    fn proportional(
        criterion: Criterion,
        demand_pa: f64,
        strength_pa: f64,
        scale_pa: f64,
        note: String,
    ) -> Self {
        let tolerance = RELATIVE_TOLERANCE * scale_pa.abs().max(strength_pa.abs());
        let demand_pa = if demand_pa.abs() <= tolerance {
            0.0
        } else {
            demand_pa
        };
        let (utilization, factor_of_safety, condition) = if strength_pa > tolerance {
            if demand_pa > 0.0 {
                (
                    Some(demand_pa / strength_pa),
                    Some(strength_pa / demand_pa),
                    Condition::Defined,
                )
            } else if demand_pa == 0.0 {
                (Some(0.0), None, Condition::Defined)
            } else {
                (None, None, Condition::NeverReaches)
            }
        } else if demand_pa > 0.0 {
            (None, None, Condition::FailsAtAnyScale)
        } else if demand_pa == 0.0 {
            // Zero strength and zero demand: on the surface, and there at every scale.
            (Some(1.0), Some(1.0), Condition::Defined)
        } else {
            (None, None, Condition::NeverReaches)
        };
        Self {
            criterion,
            governing_stress_pa: Some(demand_pa),
            strength_pa: Some(strength_pa),
            utilization,
            factor_of_safety,
            condition,
            note,
            basis: StressBasis::Total,
            reduction: None,
        }
    }
}

/// The strength-reduction factor of Mohr–Coulomb for principal stresses `s1 ≥ s3` (tension
/// positive, effective). With the Mohr circle's centre s = −(σ1 + σ3)/2 and radius
/// r = (σ1 − σ3)/2 (compression positive), the circle touches τ = (c + σ tan φ)/F when
/// r √(F² + tan² φ) = c + s tan φ, so F = √(((c + s tan φ)/r)² − tan² φ) — worked from the
/// tangency condition r = c cos φ + s sin φ (Labuz & Zang 2012, eq. 3) with c/F and tan φ/F.
#[must_use]
pub fn mohr_coulomb_reduction(m: &MohrCoulomb, s1: f64, s3: f64) -> Reduction {
    let tan_phi = m.friction_angle_deg.to_radians().tan();
    let c = m.cohesion_pa;
    let s = -(s1 + s3) / 2.0;
    let r = (s1 - s3) / 2.0;
    let tolerance = RELATIVE_TOLERANCE * s1.abs().max(s3.abs()).max(c);
    // The least compressive principal stress beyond the apex σ = −c / tan φ: no reduction helps.
    if c + (s - r) * tan_phi < -tolerance * tan_phi.max(1.0) {
        return Reduction::not_defined(Condition::FailsAtAnyScale);
    }
    if r <= tolerance {
        return Reduction::not_defined(Condition::NeverReaches);
    }
    let ratio = ((c + s * tan_phi) / r).max(tan_phi);
    Reduction::defined((ratio * ratio - tan_phi * tan_phi).max(0.0).sqrt(), tan_phi)
}

/// The strength-reduction factor of Drucker–Prager √J2 + α I1 = k with α and k from c/F and
/// φ_F = atan(tan φ / F) by `fit`. Every fit's apex lies at I1 = k/α = 3c / tan φ whatever F, so
/// the reduced cones are nested and F follows from the α the state needs,
/// α_F = √J2 / (3c/tan φ − I1), by inverting the fit's α(φ) (worked from Chen & Han 1988,
/// §5.4). With φ = 0 (α = 0), F = k / √J2.
#[must_use]
pub fn drucker_prager_reduction(
    m: &MohrCoulomb,
    fit: DruckerPragerFit,
    i1_pa: f64,
    j2_pa2: f64,
) -> Reduction {
    let tan_phi = m.friction_angle_deg.to_radians().tan();
    let root_j2 = j2_pa2.max(0.0).sqrt();
    let tolerance = RELATIVE_TOLERANCE * i1_pa.abs().max(root_j2).max(m.cohesion_pa);
    if tan_phi == 0.0 {
        let (_, k) = fit.alpha_k(m);
        return if root_j2 <= tolerance {
            Reduction::not_defined(Condition::NeverReaches)
        } else {
            Reduction::defined(k / root_j2, 0.0)
        };
    }
    let apex = 3.0 * m.cohesion_pa / tan_phi;
    let room = apex - i1_pa;
    if room <= tolerance {
        return if root_j2 <= tolerance && room >= -tolerance {
            // At the apex itself: on the surface for every F.
            Reduction::defined(1.0, tan_phi)
        } else {
            Reduction::not_defined(Condition::FailsAtAnyScale)
        };
    }
    if root_j2 <= tolerance {
        return Reduction::not_defined(Condition::NeverReaches);
    }
    let alpha = root_j2 / room;
    let r3 = 3.0_f64.sqrt();
    // sin φ_F or tan φ_F from α; beyond the widest cone (φ_F → 90°) no F puts the state inside.
    let tan_from_sin = |s: f64| (s < 1.0).then(|| s / (1.0 - s * s).sqrt());
    let tan_f = match fit {
        DruckerPragerFit::CompressionMeridian => {
            tan_from_sin(3.0 * r3 * alpha / (2.0 + r3 * alpha))
        }
        DruckerPragerFit::TensionMeridian => (r3 * alpha < 2.0)
            .then(|| 3.0 * r3 * alpha / (2.0 - r3 * alpha))
            .and_then(tan_from_sin),
        DruckerPragerFit::Inscribed => (3.0 * alpha * alpha < 1.0)
            .then(|| (9.0 * alpha * alpha / (1.0 - 3.0 * alpha * alpha)).sqrt())
            .and_then(tan_from_sin),
        DruckerPragerFit::PlaneStrain => (12.0 * alpha * alpha < 1.0)
            .then(|| (9.0 * alpha * alpha / (1.0 - 12.0 * alpha * alpha)).sqrt()),
    };
    match tan_f {
        Some(t) if t > 0.0 => Reduction::defined(tan_phi / t, tan_phi),
        _ => Reduction::not_defined(Condition::FailsAtAnyScale),
    }
}

/// The verdict of `criterion` for the stored (tension-positive) tensor `t` on total stress (no
/// pore pressure). Strengths must have passed [`Strengths::validate`]; an invalid one counts as
/// missing.
#[must_use]
pub fn verdict(t: &StressTensor, criterion: Criterion, strengths: &Strengths) -> Verdict {
    verdict_with_pore_pressure(t, criterion, strengths, 0.0)
}

/// The verdict of `criterion` with pore pressure `pore_pressure_pa` (compression positive):
/// the pressure-sensitive criteria (Rankine, Mohr–Coulomb, Drucker–Prager) are judged on the
/// effective stress σ′ = σ + p·I (tension positive), von Mises and Tresca on σ (a pressure does
/// not change them). A pore pressure of zero means none is given: total stress.
#[must_use]
pub fn verdict_with_pore_pressure(
    t: &StressTensor,
    criterion: Criterion,
    strengths: &Strengths,
    pore_pressure_pa: f64,
) -> Verdict {
    let pressure_sensitive = !matches!(criterion, Criterion::VonMises | Criterion::Tresca);
    let given = pore_pressure_pa != 0.0 && pore_pressure_pa.is_finite();
    let basis = match (given, pressure_sensitive) {
        (false, _) => StressBasis::Total,
        (true, true) => StressBasis::Effective { pore_pressure_pa },
        (true, false) => StressBasis::Unaffected,
    };
    let effective;
    let t = if matches!(basis, StressBasis::Effective { .. }) {
        let [xx, yy, zz, xy, yz, zx] = t.components_pa();
        let p = pore_pressure_pa;
        effective = StressTensor::from_pa([xx + p, yy + p, zz + p, xy, yz, zx]).unwrap_or(*t);
        &effective
    } else {
        t
    };
    let mut v = verdict_on(t, criterion, strengths);
    if v.condition != Condition::NotChecked {
        v.basis = basis;
    }
    v
}

fn verdict_on(t: &StressTensor, criterion: Criterion, strengths: &Strengths) -> Verdict {
    let a = Analysis::new(t, SignConvention::TensionPositive);
    let [s1, _, s3] = a.principal.values_pa;
    let scale = s1.abs().max(s3.abs());
    let valid = |v: Option<f64>| v.filter(|x| x.is_finite() && *x > 0.0);
    let missing = || format!("not checked: needs the {}", criterion.needs());
    match criterion {
        Criterion::VonMises | Criterion::Tresca => {
            let Some(fy) = valid(strengths.yield_strength_pa) else {
                return Verdict::not_checked(criterion, missing());
            };
            let demand = if criterion == Criterion::VonMises {
                a.von_mises_pa
            } else {
                a.tresca_pa
            };
            Verdict::proportional(criterion, demand, fy, scale, String::new())
        }
        Criterion::Rankine => {
            let ft = valid(strengths.tensile_strength_pa);
            let fc = valid(strengths.compressive_strength_pa);
            let sides = [
                ft.map(|f| (s1, f, "tension governs (σ1 vs f_t)")),
                fc.map(|f| (-s3, f, "compression governs (−σ3 vs f_c)")),
            ];
            let Some((demand, strength, which)) = sides
                .into_iter()
                .flatten()
                .max_by(|a, b| (a.0 / a.1).total_cmp(&(b.0 / b.1)))
            else {
                return Verdict::not_checked(criterion, missing());
            };
            let mut note = which.to_owned();
            if ft.is_none() {
                note.push_str("; tension side not checked (no tensile strength)");
            } else if fc.is_none() {
                note.push_str("; compression side not checked (no compressive strength)");
            }
            Verdict::proportional(criterion, demand, strength, scale, note)
        }
        Criterion::MohrCoulomb | Criterion::DruckerPrager => {
            let Some(Ok(m)) = strengths.mohr_coulomb() else {
                return Verdict::not_checked(criterion, missing());
            };
            if criterion == Criterion::MohrCoulomb {
                let (sin_phi, cos_phi) = m.friction_angle_deg.to_radians().sin_cos();
                let demand = (s1 - s3) + (s1 + s3) * sin_phi;
                let mut v = Verdict::proportional(
                    criterion,
                    demand,
                    2.0 * m.cohesion_pa * cos_phi,
                    scale,
                    String::new(),
                );
                v.reduction = Some(mohr_coulomb_reduction(&m, s1, s3));
                v
            } else {
                let (alpha, k) = strengths.dp_fit.alpha_k(&m);
                let demand = a.invariants.j2.max(0.0).sqrt() + alpha * a.invariants.i1;
                let mut v = Verdict::proportional(
                    criterion,
                    demand,
                    k,
                    scale.max(a.invariants.i1.abs()),
                    format!("fit: {}", strengths.dp_fit.label()),
                );
                v.reduction = Some(drucker_prager_reduction(
                    &m,
                    strengths.dp_fit,
                    a.invariants.i1,
                    a.invariants.j2,
                ));
                v
            }
        }
    }
}

/// Every criterion's verdict, in [`Criterion::ALL`] order, with pore pressure
/// `pore_pressure_pa` (0: none; see [`verdict_with_pore_pressure`]).
#[must_use]
pub fn verdicts(t: &StressTensor, strengths: &Strengths, pore_pressure_pa: f64) -> Vec<Verdict> {
    Criterion::ALL
        .iter()
        .map(|&c| verdict_with_pore_pressure(t, c, strengths, pore_pressure_pa))
        .collect()
}

/// The verdicts ordered governing first: failing before passing, higher utilization first,
/// not checked last.
pub fn governing_first(verdicts: &mut [Verdict]) {
    let rank = |v: &Verdict| match (v.outcome(), v.utilization) {
        (Outcome::Fails, u) => (0, -u.unwrap_or(f64::INFINITY)),
        (Outcome::Passes, Some(u)) => (1, -u),
        (Outcome::Passes, None) => (2, 0.0),
        (Outcome::NotChecked, _) => (3, 0.0),
    };
    verdicts.sort_by(|a, b| {
        let (ra, ua) = rank(a);
        let (rb, ub) = rank(b);
        ra.cmp(&rb).then(ua.total_cmp(&ub))
    });
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

/// Everything a geomechanics engineer asks of one fault plane, compression positive with
/// effective normal stress σn′ = σn − p.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct FaultCheck {
    /// Effective normal stress σn′ = σn − p, Pa (compression positive).
    pub effective_normal_stress_pa: f64,
    /// Shear stress τ, Pa.
    pub shear_stress_pa: f64,
    /// Slip tendency τ / σn′ (Morris et al. 1996).
    pub slip_tendency: Check,
    /// Dilation tendency (σ1 − σn) / (σ1 − σ3) (Ferrill et al. 1999).
    pub dilation_tendency: Check,
    /// Mohr–Coulomb utilization τ / (c + σn′ tan φ), when c and φ are given.
    pub mohr_coulomb: Option<Check>,
    /// The Coulomb check's factor of safety under proportional loading (σ and p scaled
    /// together): λ = c / (τ − σn′ tan φ), with how to read it; `None` without c and φ.
    pub coulomb_proportional: Option<Check>,
    /// The Coulomb check's strength-reduction factor F = (c + σn′ tan φ) / τ (= 1 / U on one
    /// plane) and the mobilized friction angle; `None` without c and φ.
    pub coulomb_reduction: Option<Reduction>,
    /// The pore-pressure increase that brings the plane to slip, Δp = σn′ − (τ − c) / tan φ, Pa
    /// (negative: the plane is already beyond slip); `None` without c and φ, or with φ = 0 (pore
    /// pressure then does not change the strength).
    pub pore_pressure_to_slip_pa: Option<f64>,
    /// Rake of the slip sense (Aki & Richards 1980), degrees; `None` without shear or for a
    /// horizontal plane.
    pub rake_deg: Option<f64>,
}

/// The fault check of the plane with normal `normal` (Morris et al. 1996; Ferrill et al. 1999;
/// Δp from the Coulomb criterion τ = c + (σn − p) tan φ solved for p, e.g. Zoback, Reservoir
/// Geomechanics, 2007, §4).
pub fn fault_check(
    t: &StressTensor,
    normal: PlaneNormal,
    pore_pressure_pa: f64,
    material: Option<&MohrCoulomb>,
) -> Result<FaultCheck, CriterionError> {
    let slip = slip_tendency(t, normal, pore_pressure_pa)?;
    let ps = PlaneStress::new(t, normal, SignConvention::CompressionPositive);
    let effective = ps.normal_stress_pa - pore_pressure_pa;
    let tau = ps.shear_stress_pa;
    let scale = ps
        .normal_stress_pa
        .abs()
        .max(tau)
        .max(pore_pressure_pa.abs());
    let (mohr_coulomb, to_slip, proportional, reduction) = match material {
        Some(m) => {
            let tolerance = RELATIVE_TOLERANCE * scale.max(m.cohesion_pa);
            let capacity = m.shear_strength_pa(effective);
            let check = if capacity > tolerance {
                Check::defined(tau / capacity)
            } else {
                Check::not_defined(Condition::EffectiveTension)
            };
            let tan_phi = m.friction_angle_deg.to_radians().tan();
            let dp = (tan_phi > 0.0).then(|| effective - (tau - m.cohesion_pa) / tan_phi);
            // Scaling σ and p by λ scales τ and σn′: λ τ = c + λ σn′ tan φ.
            let excess = tau - effective * tan_phi;
            let proportional = if excess > tolerance {
                if m.cohesion_pa > tolerance {
                    Check::defined(excess / m.cohesion_pa)
                } else {
                    Check::not_defined(Condition::FailsAtAnyScale)
                }
            } else if excess >= -tolerance && m.cohesion_pa <= tolerance {
                Check::defined(1.0)
            } else {
                Check::not_defined(Condition::NeverReaches)
            };
            let reduction = if capacity <= tolerance {
                if capacity >= -tolerance && tau <= tolerance {
                    Reduction::defined(1.0, tan_phi)
                } else {
                    Reduction::not_defined(Condition::FailsAtAnyScale)
                }
            } else if tau <= tolerance {
                Reduction::not_defined(Condition::NeverReaches)
            } else {
                Reduction::defined(capacity / tau, tan_phi)
            };
            (Some(check), dp, Some(proportional), Some(reduction))
        }
        None => (None, None, None, None),
    };
    Ok(FaultCheck {
        effective_normal_stress_pa: effective,
        shear_stress_pa: tau,
        slip_tendency: slip,
        dilation_tendency: dilation_tendency(t, normal),
        mohr_coulomb,
        coulomb_proportional: proportional,
        coulomb_reduction: reduction,
        pore_pressure_to_slip_pa: to_slip,
        rake_deg: PlaneStress::new(t, normal, SignConvention::TensionPositive).rake_deg(),
    })
}

#[cfg(test)]
mod tests {
    use super::Condition;

    #[test]
    fn condition_keys_are_the_serde_names() {
        for c in [
            Condition::Defined,
            Condition::NotChecked,
            Condition::NeverReaches,
            Condition::FailsAtAnyScale,
            Condition::EffectiveTension,
            Condition::Undefined,
        ] {
            assert_eq!(serde_json::to_value(c).ok(), Some(c.key().into()));
        }
    }
}
