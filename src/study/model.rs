//! Projects, load cases and combinations.

use serde::{Deserialize, Serialize};

use crate::mechanics::criteria::{MohrCoulomb, Strengths};
use crate::mechanics::search::{Measure, SearchSettings};
use crate::mechanics::{PlaneNormal, SignConvention, StressTensor, StressUnit};

/// A stress tensor as the user typed it: six components in a unit and a sign convention.
/// Kept as typed (not converted to pascals) so that a file shows the numbers its author wrote.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct TypedTensor {
    /// Unit symbol, exactly as SI writes it (Pa, kPa, MPa, GPa, bar, psi, ksi).
    pub unit: String,
    /// Whether the components are compression-positive.
    #[serde(default)]
    pub compression_positive: bool,
    /// xx, yy, zz, xy, yz, zx in `unit`.
    pub components: [f64; 6],
}

impl TypedTensor {
    /// The tensor in pascals, tension positive.
    pub fn tensor(&self) -> Result<StressTensor, StudyError> {
        let unit: StressUnit =
            self.unit
                .parse()
                .map_err(|e: crate::mechanics::units::UnknownUnit| {
                    StudyError::Invalid(e.to_string())
                })?;
        let sign = if self.compression_positive { -1.0 } else { 1.0 };
        StressTensor::from_components(self.components, unit, sign)
            .map_err(|e| StudyError::Invalid(e.to_string()))
    }
}

/// Where a load case's stress comes from. Only typed tensors today; rosettes, in-situ stresses
/// and table rows come later as further variants.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
pub enum CaseInput {
    /// A tensor typed component by component.
    Tensor(TypedTensor),
}

/// One load case (dead, live, wind, a test's load step…).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct LoadCase {
    /// Unique among cases and combinations.
    pub name: String,
    /// Free text.
    #[serde(default)]
    pub description: String,
    /// The stress.
    pub input: CaseInput,
}

/// One term of a combination: a load case times a factor.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Term {
    /// The load case's name.
    pub case: String,
    /// The factor (any finite number; negative and zero allowed).
    pub factor: f64,
}

/// A factored combination Σ factor × case tensor.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Combination {
    /// Unique among cases and combinations.
    pub name: String,
    /// The terms.
    pub terms: Vec<Term>,
}

/// The worst-plane measure and its parameters as the user set them (stresses in pascals).
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct MeasureChoice {
    /// The measure.
    pub measure: Measure,
    /// Pore pressure, Pa (compression positive).
    pub pore_pressure_pa: f64,
    /// Cohesion, Pa.
    pub cohesion_pa: f64,
    /// Friction angle, degrees.
    pub friction_angle_deg: f64,
}

impl Default for MeasureChoice {
    fn default() -> Self {
        Self {
            measure: Measure::Shear,
            pore_pressure_pa: 0.0,
            cohesion_pa: 5e6,
            friction_angle_deg: 30.0,
        }
    }
}

impl MeasureChoice {
    /// The search settings in `convention`.
    #[must_use]
    pub fn settings(&self, convention: SignConvention) -> SearchSettings {
        SearchSettings {
            measure: self.measure,
            convention,
            pore_pressure_pa: self.pore_pressure_pa,
            material: MohrCoulomb::new(self.cohesion_pa, self.friction_angle_deg).ok(),
        }
    }
}

/// The material the criteria check against: a name and its strengths (any may be missing).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize, Default)]
#[serde(default)]
pub struct Material {
    /// Name shown in the verdict and reports.
    pub name: String,
    /// Strengths, Pa, and the Drucker–Prager fit.
    #[serde(flatten)]
    pub strengths: Strengths,
}

fn default_plane() -> PlaneNormal {
    PlaneNormal::X
}

/// A project: load cases and combinations, with the unit and convention its numbers are shown
/// in, the case or combination being looked at, its cut plane and the worst-plane measure.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Project {
    /// Name shown in titles and reports.
    pub name: String,
    /// Unit of every stress shown.
    #[serde(default = "default_unit")]
    pub unit: String,
    /// Whether stresses are shown compression-positive.
    #[serde(default)]
    pub compression_positive: bool,
    /// Load cases.
    #[serde(default)]
    pub cases: Vec<LoadCase>,
    /// Combinations.
    #[serde(default)]
    pub combinations: Vec<Combination>,
    /// Free text.
    #[serde(default)]
    pub notes: String,
    /// The case or combination the window shows (empty or unknown: the first one).
    #[serde(default)]
    pub active: String,
    /// The cut plane.
    #[serde(default = "default_plane")]
    pub plane: PlaneNormal,
    /// The worst-plane measure, pore pressure and the planes' (discontinuities') cohesion and
    /// friction angle.
    #[serde(default)]
    pub measure: MeasureChoice,
    /// The material the criteria check against.
    #[serde(default)]
    pub material: Material,
}

fn default_unit() -> String {
    "MPa".to_owned()
}

/// Why a study operation cannot be done.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum StudyError {
    /// No case or combination of that name.
    #[error("no load case or combination named '{0}'")]
    Unknown(String),
    /// A name already used.
    #[error("the name '{0}' is already used by a load case or combination")]
    Duplicate(String),
    /// A combination names something that is not a load case.
    #[error("combination '{combination}': '{case}' is not a load case")]
    BadTerm {
        /// The combination.
        combination: String,
        /// The term's name.
        case: String,
    },
    /// Anything else that is wrong with the data.
    #[error("{0}")]
    Invalid(String),
}

impl Project {
    /// An empty project.
    #[must_use]
    pub fn new(name: &str, unit: StressUnit, convention: SignConvention) -> Self {
        Self {
            name: name.to_owned(),
            unit: unit.symbol().to_owned(),
            compression_positive: convention == SignConvention::CompressionPositive,
            cases: Vec::new(),
            combinations: Vec::new(),
            notes: String::new(),
            active: String::new(),
            plane: default_plane(),
            measure: MeasureChoice::default(),
            material: Material::default(),
        }
    }

    /// The built-in demo project (an invented scenario, said so in its name and notes).
    #[must_use]
    pub fn demo() -> Self {
        serde_json::from_str::<serde_json::Value>(DEMO_JSON)
            .ok()
            .and_then(|mut v| {
                v.as_object_mut()?.remove("format_version");
                serde_json::from_value(v).ok()
            })
            .unwrap_or_else(|| Self::new("Demo", StressUnit::MPa, SignConvention::TensionPositive))
    }

    /// The name of the case or combination shown: `active` when it names one, else the first
    /// case, else the first combination.
    #[must_use]
    pub fn active_name(&self) -> Option<&str> {
        if self.name_used(&self.active) {
            return Some(&self.active);
        }
        self.names().first().map(|(n, _)| *n)
    }

    /// The load case of that name.
    #[must_use]
    pub fn case(&self, name: &str) -> Option<&LoadCase> {
        self.cases.iter().find(|c| c.name == name)
    }

    /// The combination of that name.
    #[must_use]
    pub fn combination(&self, name: &str) -> Option<&Combination> {
        self.combinations.iter().find(|c| c.name == name)
    }

    /// Whether `name` is a combination.
    #[must_use]
    pub fn is_combination(&self, name: &str) -> bool {
        self.combination(name).is_some()
    }

    /// A name not used yet: `stem 1`, `stem 2`, …
    #[must_use]
    pub fn unused_name(&self, stem: &str) -> String {
        // One of the first n + 1 numbers is free when n names are used.
        (1..=self.names().len() + 1)
            .map(|i| format!("{stem} {i}"))
            .find(|n| !self.name_used(n))
            .unwrap_or_else(|| stem.to_owned())
    }

    /// The display unit.
    pub fn unit(&self) -> Result<StressUnit, StudyError> {
        self.unit
            .parse()
            .map_err(|e: crate::mechanics::units::UnknownUnit| StudyError::Invalid(e.to_string()))
    }

    /// The display convention.
    #[must_use]
    pub fn convention(&self) -> SignConvention {
        if self.compression_positive {
            SignConvention::CompressionPositive
        } else {
            SignConvention::TensionPositive
        }
    }

    /// Whether a case or combination has this name.
    #[must_use]
    pub fn name_used(&self, name: &str) -> bool {
        self.cases.iter().any(|c| c.name == name)
            || self.combinations.iter().any(|c| c.name == name)
    }

    /// Adds a load case, or with `replace` replaces the case of the same name.
    pub fn add_case(&mut self, case: LoadCase, replace: bool) -> Result<(), StudyError> {
        check_name(&case.name)?;
        case_tensor(&case)?;
        if let Some(i) = self.cases.iter().position(|c| c.name == case.name) {
            if !replace {
                return Err(StudyError::Duplicate(case.name));
            }
            self.cases[i] = case;
            return Ok(());
        }
        if self.name_used(&case.name) {
            return Err(StudyError::Duplicate(case.name));
        }
        self.cases.push(case);
        Ok(())
    }

    /// Adds a combination, or with `replace` replaces the combination of the same name.
    pub fn add_combination(
        &mut self,
        combination: Combination,
        replace: bool,
    ) -> Result<(), StudyError> {
        check_name(&combination.name)?;
        if let Some(i) = self
            .combinations
            .iter()
            .position(|c| c.name == combination.name)
        {
            if !replace {
                return Err(StudyError::Duplicate(combination.name));
            }
            self.check_combination(&combination)?;
            self.combinations[i] = combination;
            return Ok(());
        }
        if self.name_used(&combination.name) {
            return Err(StudyError::Duplicate(combination.name));
        }
        self.check_combination(&combination)?;
        self.combinations.push(combination);
        Ok(())
    }

    fn check_combination(&self, combination: &Combination) -> Result<(), StudyError> {
        if combination.terms.is_empty() {
            return Err(StudyError::Invalid(format!(
                "combination '{}' has no terms",
                combination.name
            )));
        }
        for term in &combination.terms {
            if !self.cases.iter().any(|c| c.name == term.case) {
                return Err(StudyError::BadTerm {
                    combination: combination.name.clone(),
                    case: term.case.clone(),
                });
            }
            if !term.factor.is_finite() {
                return Err(StudyError::Invalid(format!(
                    "combination '{}': the factor of '{}' is not a finite number",
                    combination.name, term.case
                )));
            }
        }
        self.combination_tensor(combination).map(|_| ())
    }

    /// Checks everything a loaded file promises: unique names, valid tensors, combinations of
    /// existing cases, a usable material.
    pub fn validate(&self) -> Result<(), StudyError> {
        self.unit()?;
        self.material
            .strengths
            .validate()
            .map_err(|e| StudyError::Invalid(format!("material: {e}")))?;
        let mut names: Vec<&str> = Vec::new();
        for name in self
            .cases
            .iter()
            .map(|c| c.name.as_str())
            .chain(self.combinations.iter().map(|c| c.name.as_str()))
        {
            check_name(name)?;
            if names.contains(&name) {
                return Err(StudyError::Duplicate(name.to_owned()));
            }
            names.push(name);
        }
        for case in &self.cases {
            case_tensor(case)?;
        }
        for combination in &self.combinations {
            self.check_combination(combination)?;
        }
        Ok(())
    }

    /// The tensor of a load case or combination (pascals, tension positive). A combination's
    /// tensor is Σ factor × case tensor: principal stresses do not superpose, tensors do.
    pub fn tensor(&self, name: &str) -> Result<StressTensor, StudyError> {
        if let Some(case) = self.cases.iter().find(|c| c.name == name) {
            return case_tensor(case);
        }
        if let Some(combination) = self.combinations.iter().find(|c| c.name == name) {
            return self.combination_tensor(combination);
        }
        Err(StudyError::Unknown(name.to_owned()))
    }

    fn combination_tensor(&self, combination: &Combination) -> Result<StressTensor, StudyError> {
        let mut sum = [0.0; 6];
        for term in &combination.terms {
            let case = self
                .cases
                .iter()
                .find(|c| c.name == term.case)
                .ok_or_else(|| StudyError::BadTerm {
                    combination: combination.name.clone(),
                    case: term.case.clone(),
                })?;
            let t = case_tensor(case)?.components_pa();
            for (s, v) in sum.iter_mut().zip(t) {
                *s += term.factor * v;
            }
        }
        StressTensor::from_pa(sum)
            .map_err(|e| StudyError::Invalid(format!("combination '{}': {e}", combination.name)))
    }

    /// Every case and combination name, cases first, in file order.
    #[must_use]
    pub fn names(&self) -> Vec<(&str, bool)> {
        self.cases
            .iter()
            .map(|c| (c.name.as_str(), false))
            .chain(self.combinations.iter().map(|c| (c.name.as_str(), true)))
            .collect()
    }
}

fn case_tensor(case: &LoadCase) -> Result<StressTensor, StudyError> {
    match &case.input {
        CaseInput::Tensor(t) => t
            .tensor()
            .map_err(|e| StudyError::Invalid(format!("load case '{}': {e}", case.name))),
    }
}

/// The demo project's file, built in.
const DEMO_JSON: &str = include_str!("../../assets/demo-bracket-project.json");

pub(crate) fn check_name(name: &str) -> Result<(), StudyError> {
    if name.trim().is_empty() {
        return Err(StudyError::Invalid("a name must not be empty".to_owned()));
    }
    if name.contains(['=', ',']) {
        return Err(StudyError::Invalid(format!(
            "name '{name}' must not contain '=' or ','"
        )));
    }
    Ok(())
}
