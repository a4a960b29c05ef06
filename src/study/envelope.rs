//! The envelope: one measure over every load case and combination, sorted worst first, with
//! the governing one named.

use super::error::StudyError;
use super::model::Project;
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

    /// The name a person reads, in the trade's spelling (the key stays for the command line).
    #[must_use]
    pub fn label(self) -> String {
        match self {
            Self::VonMises => "von Mises stress".to_owned(),
            Self::Tresca => "Tresca stress".to_owned(),
            Self::MaxShear => "largest shear stress".to_owned(),
            Self::Sigma1 => "σ1".to_owned(),
            Self::Sigma3 => "σ3".to_owned(),
            Self::Plane(m) => format!("worst plane: {}", m.label()),
            Self::Utilization(c) => format!("utilization: {}", c.label()),
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
    /// The governing row's name (the first row), if it has a number or fails at any scale.
    pub governing: Option<String>,
    /// How many rows stand in each condition.
    pub counts: ConditionCounts,
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

impl MeasureValue {
    /// How the value reads, whatever the measure's kind: [`Condition::Defined`] with a number;
    /// fails at any scale or no frictional capacity (worst of all); never reaches the surface
    /// (best of all); undefined; not checked.
    #[must_use]
    pub fn standing(&self) -> Condition {
        standing(self.value, self.condition, self.verdict)
    }
}

/// See [`MeasureValue::standing`].
#[must_use]
pub fn standing(
    value: Option<f64>,
    condition: Option<WorstCondition>,
    verdict: Option<Condition>,
) -> Condition {
    match (verdict, condition) {
        (Some(c), _) => c,
        (None, Some(WorstCondition::EffectiveTension)) => Condition::EffectiveTension,
        (None, Some(WorstCondition::Undefined)) => Condition::Undefined,
        _ if value.is_some() => Condition::Defined,
        _ => Condition::Undefined,
    }
}

/// Where a state stands in a ranking, larger worse: every ranking (the envelope, `batch`, the
/// Table tab, the report) orders by this. States that fail at any scale or have no frictional
/// capacity rank worst, above every number; then the numbers (worst first: the largest, or the
/// smallest for σ3 and normal-min); then states that never reach the surface (safe at any
/// scale); then undefined values; then what is not checked.
#[derive(Clone, Copy, Debug)]
pub struct RankKey {
    tier: u8,
    key: f64,
}

impl RankKey {
    /// The key of `value` read as `standing` under `measure`.
    #[must_use]
    pub fn new(measure: EnvelopeMeasure, value: Option<f64>, standing: Condition) -> Self {
        let (tier, key) = match (standing, value) {
            (Condition::FailsAtAnyScale | Condition::EffectiveTension, _) => (4, 0.0),
            (Condition::Defined, Some(v)) if measure.worst_is_smallest() => (3, -v),
            (Condition::Defined, Some(v)) => (3, v),
            (Condition::NeverReaches, _) => (2, 0.0),
            (Condition::Undefined | Condition::Defined, _) => (1, 0.0),
            (Condition::NotChecked, _) => (0, 0.0),
        };
        Self { tier, key }
    }

    /// The key of a threshold value (for "at or beyond").
    #[must_use]
    pub fn threshold(measure: EnvelopeMeasure, value: f64) -> Self {
        Self::new(measure, Some(value), Condition::Defined)
    }

    /// Whether this is at or beyond `threshold` (a state failing at any scale or without
    /// frictional capacity always is; never-reaching, undefined and unchecked states never are).
    #[must_use]
    pub fn at_or_beyond(&self, threshold: &Self) -> bool {
        self.tier == 4 || (self.tier == 3 && self.key >= threshold.key)
    }
}

/// Total order, larger worse.
impl Ord for RankKey {
    fn cmp(&self, other: &Self) -> std::cmp::Ordering {
        self.tier
            .cmp(&other.tier)
            .then(self.key.total_cmp(&other.key))
    }
}

impl PartialOrd for RankKey {
    fn partial_cmp(&self, other: &Self) -> Option<std::cmp::Ordering> {
        Some(self.cmp(other))
    }
}

impl PartialEq for RankKey {
    fn eq(&self, other: &Self) -> bool {
        self.cmp(other) == std::cmp::Ordering::Equal
    }
}

impl Eq for RankKey {}

/// How many states of a ranking stand in each condition.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, serde::Serialize)]
pub struct ConditionCounts {
    /// With a number.
    pub defined: u64,
    /// Outside a zero-strength surface at any scale (worst).
    pub fails_at_any_scale: u64,
    /// Zero or tensile effective normal stress on some plane: no frictional capacity (worst).
    pub no_frictional_capacity: u64,
    /// Never reaches the surface when scaled (best).
    pub never_reaches: u64,
    /// The measure is undefined for the state.
    pub undefined: u64,
    /// The criterion's strengths are not given.
    pub not_checked: u64,
}

impl ConditionCounts {
    /// Counts one state.
    pub fn add(&mut self, standing: Condition) {
        match standing {
            Condition::Defined => self.defined += 1,
            Condition::FailsAtAnyScale => self.fails_at_any_scale += 1,
            Condition::EffectiveTension => self.no_frictional_capacity += 1,
            Condition::NeverReaches => self.never_reaches += 1,
            Condition::Undefined => self.undefined += 1,
            Condition::NotChecked => self.not_checked += 1,
        }
    }

    /// Adds another count.
    pub fn merge(&mut self, other: &Self) {
        self.defined += other.defined;
        self.fails_at_any_scale += other.fails_at_any_scale;
        self.no_frictional_capacity += other.no_frictional_capacity;
        self.never_reaches += other.never_reaches;
        self.undefined += other.undefined;
        self.not_checked += other.not_checked;
    }

    /// One line for summaries: "4 rows: 2 with a value, 1 fail at any scale, …" (zero counts
    /// left out).
    #[must_use]
    pub fn text(&self, noun: &str) -> String {
        let total = self.defined
            + self.fails_at_any_scale
            + self.no_frictional_capacity
            + self.never_reaches
            + self.undefined
            + self.not_checked;
        let parts: Vec<String> = [
            (self.defined, "with a value"),
            (self.fails_at_any_scale, "fail at any scale"),
            (self.no_frictional_capacity, "without frictional capacity"),
            (self.never_reaches, "never reach the surface"),
            (self.undefined, "undefined"),
            (self.not_checked, "not checked"),
        ]
        .into_iter()
        .filter(|(n, _)| *n > 0)
        .map(|(n, what)| format!("{n} {what}"))
        .collect();
        format!("{total} {noun}: {}", parts.join(", "))
    }
}

/// The words for a value that is not a number, by its standing.
#[must_use]
pub fn standing_text(standing: Condition) -> &'static str {
    match standing {
        Condition::Defined => "",
        Condition::FailsAtAnyScale => "fails at any scale (zero strength, outside the surface)",
        Condition::EffectiveTension => {
            "no frictional capacity (zero or tensile effective normal stress)"
        }
        Condition::NeverReaches => "never reaches the surface (safe at any scale)",
        Condition::Undefined => "undefined for this state",
        Condition::NotChecked => "not checked (strengths not given)",
    }
}

/// The words for a strength-reduction factor that is not a number, by its condition.
#[must_use]
pub fn reduction_text(condition: Condition) -> &'static str {
    match condition {
        Condition::NeverReaches => "infinite (no shear demand: no reduction reaches the surface)",
        Condition::FailsAtAnyScale | Condition::EffectiveTension => {
            "none (beyond the envelope's apex in tension: no reduction puts the state inside)"
        }
        _ => "undefined",
    }
}

/// A measure with what it needs to evaluate a state: the one evaluation every ranking (the
/// envelope, `planewise batch`, the Table tab, the report) goes through, and its rank key.
#[derive(Clone, Copy, Debug)]
pub struct Ranking<'a> {
    /// What to rank by.
    pub measure: EnvelopeMeasure,
    /// The convention values are reported in (σ1, σ3 and normal stresses).
    pub convention: crate::mechanics::SignConvention,
    /// Pore pressure and Coulomb strength of worst-plane measures; its pore pressure also puts
    /// the pressure-sensitive criteria on effective stress.
    pub plane_settings: &'a SearchSettings,
    /// Strengths of criterion utilizations.
    pub strengths: &'a criteria::Strengths,
}

impl Ranking<'_> {
    /// The measure's value for the state `tensor` (stored, tension positive) and how it reads:
    /// closed forms for the equivalent and principal stresses, the worst-plane search for plane
    /// measures, the verdict (with the pore pressure: effective stress for the
    /// pressure-sensitive criteria) for utilizations.
    pub fn evaluate(
        &self,
        tensor: &crate::mechanics::StressTensor,
    ) -> Result<MeasureValue, StudyError> {
        let number = |v: f64| MeasureValue {
            value: Some(v),
            condition: None,
            planes: Vec::new(),
            verdict: None,
        };
        Ok(match self.measure {
            EnvelopeMeasure::VonMises => {
                let [xx, yy, zz, xy, yz, zx] = tensor.components_pa();
                number(
                    (0.5 * ((xx - yy).powi(2) + (yy - zz).powi(2) + (zz - xx).powi(2))
                        + 3.0 * (xy * xy + yz * yz + zx * zx))
                        .sqrt(),
                )
            }
            EnvelopeMeasure::Tresca | EnvelopeMeasure::MaxShear => {
                let [s1, _, s3] = crate::mechanics::principal::principal_values_pa(tensor);
                let tresca = s1 - s3;
                number(if self.measure == EnvelopeMeasure::Tresca {
                    tresca
                } else {
                    0.5 * tresca
                })
            }
            EnvelopeMeasure::Sigma1 | EnvelopeMeasure::Sigma3 => {
                let [first, _, last] =
                    crate::mechanics::principal::principal_values_in(tensor, self.convention);
                number(if self.measure == EnvelopeMeasure::Sigma1 {
                    first
                } else {
                    last
                })
            }
            EnvelopeMeasure::Plane(m) => {
                let settings = SearchSettings {
                    measure: m,
                    convention: self.convention,
                    ..*self.plane_settings
                };
                let r = worst_plane(tensor, &settings).map_err(StudyError::Search)?;
                MeasureValue {
                    value: r.value,
                    condition: Some(r.condition),
                    planes: r.planes,
                    verdict: None,
                }
            }
            EnvelopeMeasure::Utilization(c) => {
                let v = criteria::verdict_with_pore_pressure(
                    tensor,
                    c,
                    self.strengths,
                    self.plane_settings.pore_pressure_pa,
                );
                MeasureValue {
                    value: v.utilization,
                    condition: None,
                    planes: Vec::new(),
                    verdict: Some(v.condition),
                }
            }
        })
    }

    /// The place of `value` in the ranking (larger worse).
    #[must_use]
    pub fn key(&self, value: &MeasureValue) -> RankKey {
        RankKey::new(self.measure, value.value, value.standing())
    }
}

/// The envelope of `measure` over every case and combination of `project`. `plane_settings`
/// gives the pore pressure and material of worst-plane measures (its measure and convention are
/// overwritten).
pub fn envelope(
    project: &Project,
    measure: EnvelopeMeasure,
    plane_settings: &SearchSettings,
) -> Result<Envelope, StudyError> {
    let ranking = Ranking {
        measure,
        convention: project.convention(),
        plane_settings,
        strengths: &project.material.strengths,
    };
    let mut rows = Vec::new();
    for (name, combination, tensor) in project.all_tensors() {
        let v = ranking.evaluate(&tensor?)?;
        rows.push(EnvelopeRow {
            name: name.to_owned(),
            combination,
            value: v.value,
            condition: v.condition,
            planes: v.planes,
            verdict: v.verdict,
        });
    }
    rows.sort_by_key(|r| std::cmp::Reverse(r.key(measure)));
    let mut counts = ConditionCounts::default();
    for r in &rows {
        counts.add(r.standing());
    }
    // A row governs when it has a number or fails at any scale; nothing governs when the first
    // row never reaches the surface, is undefined or is not checked.
    let governing = rows
        .first()
        .filter(|r| {
            matches!(
                r.standing(),
                Condition::Defined | Condition::FailsAtAnyScale | Condition::EffectiveTension
            ) && (r.value.is_some() || r.standing() != Condition::Defined)
        })
        .map(|r| r.name.clone());
    Ok(Envelope {
        measure,
        rows,
        governing,
        counts,
    })
}

impl EnvelopeRow {
    /// How the row's value reads (see [`MeasureValue::standing`]).
    #[must_use]
    pub fn standing(&self) -> Condition {
        standing(self.value, self.condition, self.verdict)
    }

    /// Its place in the ranking.
    #[must_use]
    pub fn key(&self, measure: EnvelopeMeasure) -> RankKey {
        RankKey::new(measure, self.value, self.standing())
    }
}
