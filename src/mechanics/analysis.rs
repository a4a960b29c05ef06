//! Everything about one stress state that does not depend on a plane.

use nalgebra::Vector3;

use super::invariants::Invariants;
use super::plane::NEGLIGIBLE_RELATIVE;
use super::principal::{Principal, principal};
use super::tensor::StressTensor;
use super::units::SignConvention;

/// The analysis of a stress state, with every stress in pascals expressed in `convention`.
///
/// In the compression-positive convention the tensor is negated before it is analysed, so σ1
/// is the most compressive principal stress, I1 and J3 change sign, and the Lode angle θ becomes
/// 60° − θ. Equivalent stresses (von Mises, Tresca) do not depend on the convention.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Analysis {
    /// The convention every signed value here is in.
    pub convention: SignConvention,
    /// σ1 ≥ σ2 ≥ σ3 and their directions.
    pub principal: Principal,
    /// I1, I2, I3, J2, J3.
    pub invariants: Invariants,
    /// Mean stress I1 / 3, Pa.
    pub mean_stress_pa: f64,
    /// von Mises equivalent stress √(3 J2), Pa (von Mises 1913).
    pub von_mises_pa: f64,
    /// Tresca equivalent stress σ1 − σ3 (the diameter of the largest Mohr circle), Pa.
    pub tresca_pa: f64,
    /// Maximum shear stress (σ1 − σ3) / 2, Pa.
    pub max_shear_pa: f64,
    /// Unit normals of the two maximum-shear planes, (n1 + n3)/√2 and (n1 − n3)/√2.
    pub max_shear_normals: [Vector3<f64>; 2],
    /// Octahedral normal stress I1 / 3, Pa.
    pub octahedral_normal_pa: f64,
    /// Octahedral shear stress √(2 J2 / 3), Pa.
    pub octahedral_shear_pa: f64,
    /// Lode angle θ in degrees, 0° ≤ θ ≤ 60°, with cos 3θ = (3√3/2) J3 / J2^{3/2}
    /// (0° for uniaxial tension, 60° for uniaxial compression in the tension-positive
    /// convention). `None` when J2 is negligible.
    pub lode_angle_deg: Option<f64>,
    /// Stress triaxiality η = σm / σvM with the tension-positive mean stress, whatever the
    /// display convention (so it is negative under compression, as fracture mechanics defines
    /// it; e.g. Bao & Wierzbicki, IJMS 46:81, 2004). `None` when J2 is negligible.
    pub triaxiality: Option<f64>,
}

impl Analysis {
    /// Analyses `t` (tension positive, as stored) in `convention`.
    #[must_use]
    pub fn new(t: &StressTensor, convention: SignConvention) -> Self {
        let shown = match convention {
            SignConvention::TensionPositive => *t,
            SignConvention::CompressionPositive => t.scaled_down(-1.0),
        };
        let principal = principal(&shown);
        let invariants = Invariants::from_principal(&principal);
        let [s1, _, s3] = principal.values_pa;
        // Every deviatoric quantity from the deviator's own principal values (see
        // `Principal::deviatoric_pa`), never from differences of the full values.
        let [d1, d2, d3] = principal.deviatoric_pa;
        let [n1, _, n3] = principal.directions;
        let von_mises_pa = (3.0 * invariants.j2).sqrt();
        let mean_stress_pa = principal.mean_pa;
        let scale = s1.abs().max(s3.abs());
        let deviator_negligible =
            von_mises_pa <= NEGLIGIBLE_RELATIVE * scale || von_mises_pa == 0.0;
        // Lode angle in its tangent form, which is exact at both ends of the range where the
        // cosine form is ill-conditioned: tan θ = √3 (σ2 − σ3) / (2σ1 − σ2 − σ3). It is the same
        // angle as cos 3θ = (3√3/2) J3 / J2^{3/2} (Nayak & Zienkiewicz, IJNME 4:579, 1972).
        let lode_angle_deg = (!deviator_negligible).then(|| {
            (3.0_f64.sqrt() * (d2 - d3))
                .atan2(2.0 * d1 - d2 - d3)
                .to_degrees()
                .clamp(0.0, 60.0)
        });
        // Tension-positive mean whatever the display convention (see the field's doc).
        let triaxiality =
            (!deviator_negligible).then(|| convention.sign() * mean_stress_pa / von_mises_pa);
        let sqrt_half = std::f64::consts::FRAC_1_SQRT_2;
        Self {
            convention,
            principal,
            invariants,
            mean_stress_pa,
            von_mises_pa,
            tresca_pa: d1 - d3,
            max_shear_pa: 0.5 * (d1 - d3),
            max_shear_normals: [(n1 + n3) * sqrt_half, (n1 - n3) * sqrt_half],
            octahedral_normal_pa: mean_stress_pa,
            // √(2 J2 / 3) = σvM √2 / 3, without a second square root.
            octahedral_shear_pa: von_mises_pa * (std::f64::consts::SQRT_2 / 3.0),
            lode_angle_deg,
            triaxiality,
        }
    }
}
