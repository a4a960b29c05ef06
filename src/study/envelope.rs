//! The envelope: one measure over every load case and combination, sorted worst first, with
//! the governing one named.

use super::model::{Project, StudyError};
use crate::mechanics::Analysis;
use crate::mechanics::criteria::{self, Condition, Criterion};
use crate::mechanics::search::{Measure, SearchSettings, WorstCondition, WorstPlane, worst_plane};

/// What the envelope ranks.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
pub enum EnvelopeMeasure {
    /// von Mises equivalent stress.
    VonMises,
    /// Tresca equivalent stress σ1 − σ3.
    Tresca,
    /// Maximum shear stress (σ1 − σ3) / 2.
    MaxShear,
    /// The largest principal stress σ1 (in the project's convention); worst is largest.
    Sigma1,
    /// The smallest principal stress σ3 (in the project's convention); worst is smallest.
    Sigma3,
    /// A worst-plane measure: its worst value over every plane.
    Plane(Measure),
    /// A criterion's utilization with the project's material (proportional loading).
    Utilization(Criterion),
}

impl EnvelopeMeasure {
    /// Every measure, in menu and help order.
    pub const ALL: [Self; 17] = [
        Self::VonMises,
        Self::Tresca,
        Self::MaxShear,
        Self::Sigma1,
        Self::Sigma3,
        Self::Plane(Measure::ALL[0]),
        Self::Plane(Measure::ALL[1]),
        Self::Plane(Measure::ALL[2]),
        Self::Plane(Measure::ALL[3]),
        Self::Plane(Measure::ALL[4]),
        Self::Plane(Measure::ALL[5]),
        Self::Plane(Measure::ALL[6]),
        Self::Utilization(Criterion::VonMises),
        Self::Utilization(Criterion::Tresca),
        Self::Utilization(Criterion::Rankine),
        Self::Utilization(Criterion::MohrCoulomb),
        Self::Utilization(Criterion::DruckerPrager),
    ];

    /// Parses a key.
    #[must_use]
    pub fn from_key(key: &str) -> Option<Self> {
        Self::ALL.into_iter().find(|m| m.key() == key.trim())
    }

    /// The key.
    #[must_use]
    pub fn key(self) -> &'static str {
        match self {
            Self::VonMises => "von-mises",
            Self::Tresca => "tresca",
            Self::MaxShear => "max-shear",
            Self::Sigma1 => "sigma1",
            Self::Sigma3 => "sigma3",
            Self::Plane(m) => m.key(),
            Self::Utilization(c) => match c {
                Criterion::VonMises => "utilization-von-mises",
                Criterion::Tresca => "utilization-tresca",
                Criterion::Rankine => "utilization-rankine",
                Criterion::MohrCoulomb => "utilization-mohr-coulomb",
                Criterion::DruckerPrager => "utilization-drucker-prager",
            },
        }
    }

    /// The worst-plane measure, if it is one.
    #[must_use]
    pub fn plane(self) -> Option<Measure> {
        match self {
            Self::Plane(m) => Some(m),
            _ => None,
        }
    }

    /// Whether the value is a stress (else a ratio).
    #[must_use]
    pub fn is_stress(self) -> bool {
        match self {
            Self::Plane(m) => m.is_stress(),
            Self::Utilization(_) => false,
            _ => true,
        }
    }

    /// Whether the worst value is the smallest.
    #[must_use]
    pub fn worst_is_smallest(self) -> bool {
        match self {
            Self::Sigma3 => true,
            Self::Plane(m) => m.worst_is_smallest(),
            _ => false,
        }
    }
}

/// One case or combination in the envelope.
#[derive(Clone, Debug, PartialEq)]
pub struct EnvelopeRow {
    /// Its name.
    pub name: String,
    /// Whether it is a combination.
    pub combination: bool,
    /// The value (Pa for stresses, in the project's convention; else dimensionless); `None`
    /// where undefined (see `condition`).
    pub value: Option<f64>,
    /// For worst-plane measures, how to read the value and planes.
    pub condition: Option<WorstCondition>,
    /// For worst-plane measures, the worst planes.
    pub planes: Vec<WorstPlane>,
    /// For criterion utilizations, how to read the value (not checked, never reaches…).
    pub verdict: Option<Condition>,
}

/// The envelope: rows sorted worst first.
#[derive(Clone, Debug, PartialEq)]
pub struct Envelope {
    /// The measure.
    pub measure: EnvelopeMeasure,
    /// Worst first.
    pub rows: Vec<EnvelopeRow>,
    /// The governing row's name (the first row), if any row has a value to rank by.
    pub governing: Option<String>,
}

/// A measure's value for one state, with how to read it.
#[derive(Clone, Debug, PartialEq)]
pub struct MeasureValue {
    /// The value (Pa for stresses, in `convention`; else dimensionless); `None` where
    /// undefined.
    pub value: Option<f64>,
    /// For worst-plane measures, how to read the value and planes.
    pub condition: Option<WorstCondition>,
    /// For worst-plane measures, the worst planes.
    pub planes: Vec<WorstPlane>,
    /// For criterion utilizations, how to read the value.
    pub verdict: Option<Condition>,
}

/// `measure` for the state `tensor` shown in `convention`: worst-plane measures with the pore
/// pressure and material of `plane_settings`, utilizations with `strengths`. The envelope and
/// `planewise batch` both evaluate through this.
pub fn measure_value(
    tensor: &crate::mechanics::StressTensor,
    measure: EnvelopeMeasure,
    convention: crate::mechanics::SignConvention,
    plane_settings: &SearchSettings,
    strengths: &criteria::Strengths,
) -> Result<MeasureValue, StudyError> {
    Ok(match measure {
        EnvelopeMeasure::Plane(m) => {
            let settings = SearchSettings {
                measure: m,
                convention,
                ..*plane_settings
            };
            let r =
                worst_plane(tensor, &settings).map_err(|e| StudyError::Invalid(e.to_string()))?;
            MeasureValue {
                value: r.value,
                condition: Some(r.condition),
                planes: r.planes,
                verdict: None,
            }
        }
        EnvelopeMeasure::Utilization(c) => {
            let v = criteria::verdict(tensor, c, strengths);
            MeasureValue {
                value: v.utilization,
                condition: None,
                planes: Vec::new(),
                verdict: Some(v.condition),
            }
        }
        other => {
            let a = Analysis::new(tensor, convention);
            let v = match other {
                EnvelopeMeasure::VonMises => a.von_mises_pa,
                EnvelopeMeasure::Tresca => a.tresca_pa,
                EnvelopeMeasure::MaxShear => a.max_shear_pa,
                EnvelopeMeasure::Sigma1 => a.principal.values_pa[0],
                _ => a.principal.values_pa[2],
            };
            MeasureValue {
                value: Some(v),
                condition: None,
                planes: Vec::new(),
                verdict: None,
            }
        }
    })
}

/// The envelope of `measure` over every case and combination of `project`. `plane_settings`
/// gives the pore pressure and material of worst-plane measures (its measure and convention are
/// overwritten).
pub fn envelope(
    project: &Project,
    measure: EnvelopeMeasure,
    plane_settings: &SearchSettings,
) -> Result<Envelope, StudyError> {
    let convention = project.convention();
    let mut rows = Vec::new();
    for (name, combination) in project.names() {
        let tensor = project.tensor(name)?;
        let v = measure_value(
            &tensor,
            measure,
            convention,
            plane_settings,
            &project.material.strengths,
        )?;
        rows.push(EnvelopeRow {
            name: name.to_owned(),
            combination,
            value: v.value,
            condition: v.condition,
            planes: v.planes,
            verdict: v.verdict,
        });
    }
    rows.sort_by(|a, b| rank(measure, b).total_cmp(&rank(measure, a)));
    // Nothing governs when even the first row has no value to rank by (every criterion not
    // checked, every value undefined).
    let governing = rows
        .first()
        .filter(|r| rank(measure, r) > f64::NEG_INFINITY)
        .map(|r| r.name.clone());
    Ok(Envelope {
        measure,
        rows,
        governing,
    })
}

/// Larger is worse. Planes without frictional capacity and states outside a zero-strength
/// criterion at any scale are worst of all; an undefined value (dilation tendency of an
/// isotropic state, a criterion not checked or never reached) least.
fn rank(measure: EnvelopeMeasure, row: &EnvelopeRow) -> f64 {
    match (row.value, row.condition, row.verdict) {
        (Some(v), ..) if measure.worst_is_smallest() => -v,
        (Some(v), ..) => v,
        (None, Some(WorstCondition::EffectiveTension), _)
        | (None, _, Some(Condition::FailsAtAnyScale)) => f64::INFINITY,
        (None, ..) => f64::NEG_INFINITY,
    }
}
