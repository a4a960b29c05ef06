//! Stress invariants and the quantities derived from them.

use super::principal::Principal;

/// Invariants of the stress tensor and of its deviator, in powers of pascals.
///
/// Definitions (e.g. Chen & Han, Plasticity for Structural Engineers, 1988, §2.2):
/// I1 = tr σ; I2 = ½[(tr σ)² − tr σ²] = σ1σ2 + σ2σ3 + σ3σ1; I3 = det σ = σ1σ2σ3;
/// s = σ − (I1/3) I; J2 = ½ s:s; J3 = det s.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Invariants {
    /// I1, Pa.
    pub i1: f64,
    /// I2, Pa².
    pub i2: f64,
    /// I3, Pa³.
    pub i3: f64,
    /// J2, Pa² (never negative).
    pub j2: f64,
    /// J3, Pa³.
    pub j3: f64,
}

impl Invariants {
    /// The invariants from the principal values. I1, I2, I3 come from the full values; J2 and
    /// J3 from the deviator's own principal values ([`Principal::deviatoric_pa`]), so they keep
    /// their digits when the mean stress is many orders larger than the deviator.
    #[must_use]
    #[inline]
    pub fn from_principal(p: &Principal) -> Self {
        let [s1, s2, s3] = p.values_pa;
        let [d1, d2, d3] = p.deviatoric_pa;
        // J2 = 1/6 [(s1−s2)² + (s2−s3)² + (s3−s1)²] on the deviatoric values: free of the mean,
        // and of any rounding in their sum.
        let j2 = ((d1 - d2).powi(2) + (d2 - d3).powi(2) + (d3 - d1).powi(2)) / 6.0;
        Self {
            i1: 3.0 * p.mean_pa,
            i2: s1 * s2 + s2 * s3 + s3 * s1,
            i3: s1 * s2 * s3,
            j2,
            j3: d1 * d2 * d3,
        }
    }
}
