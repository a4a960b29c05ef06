//! Stress-based criteria for long fatigue life on a plane, and their constants calibrated from
//! the fully reversed bending (or tension) fatigue limit f₋₁ and torsion fatigue limit t₋₁.
//!
//! Each criterion is "a shear amplitude plus a coefficient times a normal (or hydrostatic)
//! stress, at most a limit": value ≤ limit. Forms as in Socie & Marquis, Multiaxial Fatigue
//! (SAE, 2000), ch. 5, and Papuga et al. 2021 (Materials 14:206); the calibrations below are
//! derived here from the two limit tests on Mohr's circle (derived, no published value quoted):
//!
//! - Findley (1959): max over planes of τa + k·σn,max ≤ f*. Fully reversed torsion t on a plane
//!   at angle θ to the shear plane gives τa = t cos 2θ, σn,max = t |sin 2θ|, maximum t√(1+k²);
//!   fully reversed bending f gives τa = (f/2) sin 2θ, σn,max = (f/2)(1 + cos 2θ), maximum
//!   (f/2)(√(1+k²) + k). Equal at the limits: k = (2 − r)/(2√(r − 1)) with r = f/t in (1, 2],
//!   and f* = t√(1+k²).
//! - Matake (1977): on the plane of largest τa, τa + μ·σn,max ≤ t. Torsion: τa = t, σn = 0.
//!   Bending: τa = f/2 on the 45° plane with σn,max = f/2, so μ = 2t/f − 1.
//! - McDiarmid (1991, case A form): on the plane of largest τa, τa + t·σn,max/(2σu) ≤ t, with σu
//!   the ultimate tensile strength.
//! - Dang Van (1989), written on planes as in Papuga et al. 2021: on each plane the mesoscopic
//!   shear is τ(t) − c, with c the centre of the path's amplitude circle; max over planes and
//!   time of |τ(t) − c| + α·σH(t) ≤ β. Torsion: β = t. Bending: f/2 + α f/3 = t, so
//!   α = 3t/f − 3/2. (The per-plane centre stands in for the centre of the smallest hypersphere
//!   around the deviatoric path; the two agree for proportional loading.)
//!
//! Stresses are tension positive and in pascals. Every criterion is linear in the stresses, so
//! scaling the history by s scales its value by s: the factor of safety is limit / value.

use super::circle::{Circle, PathMethod};
use super::history::PlanePath;

/// A long-life criterion.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Criterion {
    /// τa + k σn,max, maximised over planes.
    Findley,
    /// τa + μ σn,max on the plane of largest τa.
    Matake,
    /// τa + t σn,max / (2σu) on the plane of largest τa.
    McDiarmid,
    /// |τ(t) − c| + α σH(t), maximised over planes and time.
    DangVan,
}

impl Criterion {
    /// All criteria, in menu order.
    pub const ALL: [Self; 4] = [Self::Findley, Self::Matake, Self::McDiarmid, Self::DangVan];

    /// The command-line and file key.
    #[must_use]
    pub fn key(self) -> &'static str {
        match self {
            Self::Findley => "findley",
            Self::Matake => "matake",
            Self::McDiarmid => "mcdiarmid",
            Self::DangVan => "dang-van",
        }
    }

    /// The name a person reads.
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            Self::Findley => "Findley",
            Self::Matake => "Matake",
            Self::McDiarmid => "McDiarmid",
            Self::DangVan => "Dang Van",
        }
    }

    /// The criterion of a key.
    #[must_use]
    pub fn from_key(key: &str) -> Option<Self> {
        Self::ALL.into_iter().find(|c| c.key() == key)
    }

    /// The inequality in words and symbols.
    #[must_use]
    pub fn definition(self) -> &'static str {
        match self {
            Self::Findley => "max over planes of (τa + k·σn,max) ≤ f*",
            Self::Matake => "on the plane of largest τa: τa + μ·σn,max ≤ t₋₁",
            Self::McDiarmid => "on the plane of largest τa: τa + t₋₁·σn,max/(2σu) ≤ t₋₁",
            Self::DangVan => "max over planes and time of (|τ(t) − c| + α·σH(t)) ≤ β",
        }
    }

    /// Symbol of the stress coefficient.
    #[must_use]
    pub fn coefficient_symbol(self) -> &'static str {
        match self {
            Self::Findley => "k",
            Self::Matake => "μ",
            Self::McDiarmid => "t₋₁/(2σu)",
            Self::DangVan => "α",
        }
    }

    /// Symbol of the limit.
    #[must_use]
    pub fn limit_symbol(self) -> &'static str {
        match self {
            Self::Findley => "f*",
            Self::Matake | Self::McDiarmid => "t₋₁",
            Self::DangVan => "β",
        }
    }

    /// Whether the critical plane is the one of largest shear amplitude (the value is then read
    /// there), rather than the one of largest value.
    #[must_use]
    pub fn plane_of_largest_shear(self) -> bool {
        matches!(self, Self::Matake | Self::McDiarmid)
    }
}

/// The material's fatigue limits, Pa (amplitudes of fully reversed tests).
#[derive(Clone, Copy, Debug, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct FatigueLimits {
    /// Fully reversed bending (or tension–compression) fatigue limit f₋₁ (McDiarmid does not
    /// read it).
    pub bending_pa: Option<f64>,
    /// Fully reversed torsion fatigue limit t₋₁.
    pub torsion_pa: f64,
    /// Ultimate tensile strength σu (McDiarmid only).
    pub tensile_strength_pa: Option<f64>,
}

/// One of the material's fatigue limits.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Limit {
    /// f₋₁.
    Bending,
    /// t₋₁.
    Torsion,
    /// σu.
    TensileStrength,
}

impl Limit {
    /// Its name in words.
    #[must_use]
    pub fn what(self) -> &'static str {
        match self {
            Self::Bending => "the bending fatigue limit f₋₁",
            Self::Torsion => "the torsion fatigue limit t₋₁",
            Self::TensileStrength => "the tensile strength σu",
        }
    }
}

/// Why constants cannot be had.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ConstantsError {
    /// A given constant that is not a usable number.
    #[error("{0} must be a positive number")]
    NotPositive(&'static str),
    /// A limit that is not a positive finite number.
    #[error("{} must be a positive number", .0.what())]
    LimitNotPositive(Limit),
    /// A limit the criterion needs and was not given.
    #[error("{criterion} needs {}", .limit.what())]
    Missing {
        criterion: &'static str,
        limit: Limit,
    },
    /// The limits' ratio is outside what the criterion can be calibrated to.
    #[error(
        "{criterion} needs a bending-to-torsion limit ratio f₋₁/t₋₁ {range}; these limits give {ratio:.3}"
    )]
    Ratio {
        criterion: &'static str,
        range: &'static str,
        ratio: f64,
    },
}

impl ConstantsError {
    /// The limit the error is about, if it is about one.
    #[must_use]
    pub fn limit(&self) -> Option<Limit> {
        match self {
            Self::LimitNotPositive(l) | Self::Missing { limit: l, .. } => Some(*l),
            Self::Ratio { .. } => Some(Limit::Bending),
            Self::NotPositive(_) => None,
        }
    }
}

/// A criterion's two constants, and how they were had.
#[derive(Clone, Debug, PartialEq, serde::Serialize)]
pub struct Constants {
    /// The criterion.
    pub criterion: Criterion,
    /// The stress coefficient (k, μ, t₋₁/(2σu), α), dimensionless.
    pub coefficient: f64,
    /// The limit (f*, t₋₁, β), Pa.
    pub limit_pa: f64,
    /// How they were had, in words (formula and numbers, unit-free).
    pub derivation: String,
}

fn positive(v: f64) -> bool {
    v.is_finite() && v > 0.0
}

/// The limit `limit` of `value`, given and positive.
fn limit_of(criterion: Criterion, value: Option<f64>, limit: Limit) -> Result<f64, ConstantsError> {
    match value {
        None => Err(ConstantsError::Missing {
            criterion: criterion.label(),
            limit,
        }),
        Some(v) if positive(v) => Ok(v),
        Some(_) => Err(ConstantsError::LimitNotPositive(limit)),
    }
}

impl Constants {
    /// The constants calibrated from the fatigue limits (see the module's text).
    pub fn derive(criterion: Criterion, limits: &FatigueLimits) -> Result<Self, ConstantsError> {
        let t = limit_of(criterion, Some(limits.torsion_pa), Limit::Torsion)?;
        // Every criterion but McDiarmid is calibrated on both tests.
        let r = if criterion == Criterion::McDiarmid {
            f64::NAN
        } else {
            limit_of(criterion, limits.bending_pa, Limit::Bending)? / t
        };
        let ratio = |range| ConstantsError::Ratio {
            criterion: criterion.label(),
            range,
            ratio: r,
        };
        let (coefficient, limit_pa, derivation) = match criterion {
            Criterion::Findley => {
                if !(r > 1.0 && r <= 2.0) {
                    return Err(ratio("above 1 and at most 2"));
                }
                let k = (2.0 - r) / (2.0 * (r - 1.0).sqrt());
                let limit = t * k.mul_add(k, 1.0).sqrt();
                (
                    k,
                    limit,
                    format!(
                        "r = f₋₁/t₋₁ = {r:.4}; k = (2 − r)/(2√(r − 1)) = {k:.4}; f* = t₋₁√(1 + k²)"
                    ),
                )
            }
            Criterion::Matake => {
                if !(1.0..=2.0).contains(&r) {
                    return Err(ratio("from 1 to 2"));
                }
                let mu = 2.0 / r - 1.0;
                (mu, t, format!("μ = 2t₋₁/f₋₁ − 1 = {mu:.4}; limit t₋₁"))
            }
            Criterion::McDiarmid => {
                let su = limit_of(
                    criterion,
                    limits.tensile_strength_pa,
                    Limit::TensileStrength,
                )?;
                let c = t / (2.0 * su);
                (
                    c,
                    t,
                    format!("coefficient t₋₁/(2σu) = {c:.4}; limit t₋₁ (f₋₁ not used)"),
                )
            }
            Criterion::DangVan => {
                if !(1.0..=2.0).contains(&r) {
                    return Err(ratio("from 1 to 2"));
                }
                let alpha = 3.0 / r - 1.5;
                (
                    alpha,
                    t,
                    format!("α = 3t₋₁/f₋₁ − 3/2 = {alpha:.4}; β = t₋₁"),
                )
            }
        };
        Ok(Self {
            criterion,
            coefficient,
            limit_pa,
            derivation,
        })
    }

    /// Constants the user has (coefficient dimensionless, limit in pascals).
    pub fn given(
        criterion: Criterion,
        coefficient: f64,
        limit_pa: f64,
    ) -> Result<Self, ConstantsError> {
        if !coefficient.is_finite() {
            return Err(ConstantsError::NotPositive("the coefficient"));
        }
        if !positive(limit_pa) {
            return Err(ConstantsError::NotPositive("the limit"));
        }
        Ok(Self {
            criterion,
            coefficient,
            limit_pa,
            derivation: "given by the user".to_owned(),
        })
    }
}

/// The criterion's view of one plane.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PlaneValue {
    /// Shear amplitude τa (the amplitude circle's radius), Pa.
    pub tau_amplitude_pa: f64,
    /// The amplitude circle (centre = mean shear vector in the plane's axes), Pa.
    pub circle: Circle,
    /// Largest normal stress over the history, Pa, tension positive.
    pub sigma_n_max_pa: f64,
    /// The criterion's value (same unit as stress), Pa.
    pub value_pa: f64,
    /// Step at which the value is reached (Dang Van; the step of σn,max otherwise).
    pub step: usize,
}

/// Evaluates the criterion on one plane's path; `hydrostatic` (σH at each step) is read by Dang
/// Van only.
#[must_use]
pub fn evaluate(
    constants: &Constants,
    method: PathMethod,
    path: &PlanePath,
    hydrostatic: &[f64],
) -> PlaneValue {
    let circle = method.circle(&path.tau);
    let (step, sigma_n_max_pa) =
        path.sigma_n
            .iter()
            .copied()
            .enumerate()
            .fold((0, f64::NEG_INFINITY), |best, (i, v)| {
                if v > best.1 { (i, v) } else { best }
            });
    let k = constants.coefficient;
    let (value_pa, step) = match constants.criterion {
        Criterion::Findley | Criterion::Matake | Criterion::McDiarmid => {
            (k.mul_add(sigma_n_max_pa, circle.radius), step)
        }
        Criterion::DangVan => path
            .tau
            .iter()
            .zip(hydrostatic)
            .enumerate()
            .map(|(i, (tau, h))| {
                let meso = (tau[0] - circle.centre[0]).hypot(tau[1] - circle.centre[1]);
                (k.mul_add(*h, meso), i)
            })
            .fold(
                (f64::NEG_INFINITY, 0),
                |best, v| if v.0 > best.0 { v } else { best },
            ),
    };
    PlaneValue {
        tau_amplitude_pa: circle.radius,
        circle,
        sigma_n_max_pa,
        value_pa,
        step,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const MPA: f64 = 1e6;

    #[test]
    fn calibrations_reproduce_both_limit_tests() {
        // Bending 300 MPa, torsion 200 MPa (r = 1.5): each criterion's value in either test,
        // at its own critical plane, equals its limit (derived on Mohr's circle, see the module).
        let limits = FatigueLimits {
            bending_pa: Some(300.0 * MPA),
            torsion_pa: 200.0 * MPA,
            tensile_strength_pa: Some(700.0 * MPA),
        };
        let (f, t) = (300.0 * MPA, limits.torsion_pa);
        let c = Constants::derive(Criterion::Findley, &limits).unwrap();
        let k = c.coefficient;
        assert!((k - 0.5 / (2.0 * 0.5f64.sqrt())).abs() < 1e-12);
        assert!((t * (1.0 + k * k).sqrt() - c.limit_pa).abs() < 1e-6);
        assert!((0.5 * f * ((1.0 + k * k).sqrt() + k) - c.limit_pa).abs() < 1e-3);
        let m = Constants::derive(Criterion::Matake, &limits).unwrap();
        assert!((0.5 * f * (1.0 + m.coefficient) - t).abs() < 1e-3);
        let d = Constants::derive(Criterion::DangVan, &limits).unwrap();
        assert!((0.5 * f + d.coefficient * f / 3.0 - t).abs() < 1e-3);
        let mc = Constants::derive(Criterion::McDiarmid, &limits).unwrap();
        assert!((mc.coefficient - 200.0 / 1400.0).abs() < 1e-12);
    }

    #[test]
    fn limits_outside_the_calibration_are_refused() {
        let limits = FatigueLimits {
            bending_pa: Some(100.0),
            torsion_pa: 120.0,
            tensile_strength_pa: None,
        };
        assert!(matches!(
            Constants::derive(Criterion::Findley, &limits),
            Err(ConstantsError::Ratio { .. })
        ));
        assert_eq!(
            Constants::derive(Criterion::McDiarmid, &limits),
            Err(ConstantsError::Missing {
                criterion: "McDiarmid",
                limit: Limit::TensileStrength
            })
        );
        let bad = FatigueLimits {
            bending_pa: Some(f64::NAN),
            ..limits
        };
        assert!(matches!(
            Constants::derive(Criterion::Matake, &bad),
            Err(ConstantsError::LimitNotPositive(Limit::Bending))
        ));
        // McDiarmid reads t₋₁ and σu only; the others need f₋₁ and say so.
        let no_bending = FatigueLimits {
            bending_pa: None,
            torsion_pa: 120.0,
            tensile_strength_pa: Some(500.0),
        };
        assert!(Constants::derive(Criterion::McDiarmid, &no_bending).is_ok());
        let e = Constants::derive(Criterion::Findley, &no_bending).unwrap_err();
        assert_eq!(e.limit(), Some(Limit::Bending));
        assert_eq!(e.to_string(), "Findley needs the bending fatigue limit f₋₁");
    }
}
