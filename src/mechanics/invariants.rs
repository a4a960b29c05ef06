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
    /// The invariants from the principal values (exact for the solved values; no cancellation
    /// beyond that of the principal values themselves).
    #[must_use]
    pub fn from_principal(p: &Principal) -> Self {
        let [s1, s2, s3] = p.values_pa;
        let mean = (s1 + s2 + s3) / 3.0;
        let [d1, d2, d3] = [s1 - mean, s2 - mean, s3 - mean];
        // J2 from the differences of principal values: 1/6 [(σ1−σ2)² + (σ2−σ3)² + (σ3−σ1)²],
        // which is free of the mean stress and so keeps tiny deviators with a large mean.
        let j2 = ((s1 - s2).powi(2) + (s2 - s3).powi(2) + (s3 - s1).powi(2)) / 6.0;
        Self {
            i1: s1 + s2 + s3,
            i2: s1 * s2 + s2 * s3 + s3 * s1,
            i3: s1 * s2 * s3,
            j2,
            j3: d1 * d2 * d3,
        }
    }
}
