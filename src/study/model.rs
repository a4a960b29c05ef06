//! Projects, load cases and combinations.

use serde::{Deserialize, Serialize};

use crate::mechanics::{SignConvention, StressTensor, StressUnit};

/// A stress tensor as the user typed it: six components in a unit and a sign convention.
/// Kept as typed (not converted to pascals) so that a file shows the numbers its author wrote.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct TypedTensor {
    /// Unit symbol, exactly as SI writes it (Pa, kPa, MPa, GPa, psi, ksi).
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

/// A project: load cases and combinations, with the unit and convention its numbers are shown in.
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
        }
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

    fn name_used(&self, name: &str) -> bool {
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
    /// existing cases.
    pub fn validate(&self) -> Result<(), StudyError> {
        self.unit()?;
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

fn check_name(name: &str) -> Result<(), StudyError> {
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
