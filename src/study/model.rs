//! Projects, load cases and combinations.

use serde::{Deserialize, Serialize};

use super::error::StudyError;
use super::inputs::CaseInput;
use super::unknown::{UnknownInside, UnknownKeys};
use crate::mechanics::criteria::{MohrCoulomb, Strengths};
use crate::mechanics::search::{Measure, SearchSettings};
use crate::mechanics::{PlaneNormal, SignConvention, StressTensor, StressUnit};

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
    /// Keys this version does not know, kept as read and written back.
    #[serde(flatten, default, skip_serializing_if = "serde_json::Map::is_empty")]
    pub unknown: UnknownKeys,
}

/// One term of a combination: a load case times a factor.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Term {
    /// The load case's name.
    pub case: String,
    /// The factor (any finite number; negative and zero allowed).
    pub factor: f64,
    /// Keys this version does not know, kept as read.
    #[serde(flatten, default, skip_serializing_if = "serde_json::Map::is_empty")]
    pub unknown: UnknownKeys,
}

/// A factored combination Σ factor × case tensor.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Combination {
    /// Unique among cases and combinations.
    pub name: String,
    /// The terms.
    pub terms: Vec<Term>,
    /// Keys this version does not know, kept as read.
    #[serde(flatten, default, skip_serializing_if = "serde_json::Map::is_empty")]
    pub unknown: UnknownKeys,
}

/// The worst-plane measure and its parameters as the user set them (stresses in pascals).
/// Nothing here has a value the user did not give: the planes' cohesion and friction angle are
/// absent until set, and every check that needs them says "not checked" meanwhile.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct MeasureChoice {
    /// The measure.
    pub measure: Measure,
    /// Pore pressure, Pa (compression positive); 0 when none is given.
    pub pore_pressure_pa: f64,
    /// The planes' (discontinuities') cohesion, Pa, when given.
    pub cohesion_pa: Option<f64>,
    /// The planes' friction angle, degrees, when given.
    pub friction_angle_deg: Option<f64>,
}

impl Default for MeasureChoice {
    fn default() -> Self {
        Self {
            measure: Measure::Shear,
            pore_pressure_pa: 0.0,
            cohesion_pa: None,
            friction_angle_deg: None,
        }
    }
}

impl MeasureChoice {
    /// The search settings in `convention` (no material when the planes' c and φ are not both
    /// given, or not valid).
    #[must_use]
    pub fn settings(&self, convention: SignConvention) -> SearchSettings {
        SearchSettings {
            measure: self.measure,
            convention,
            pore_pressure_pa: self.pore_pressure_pa,
            material: self.plane_strength(),
        }
    }

    /// The planes' Coulomb strength, when both c and φ are given and valid.
    #[must_use]
    pub fn plane_strength(&self) -> Option<MohrCoulomb> {
        MohrCoulomb::new(self.cohesion_pa?, self.friction_angle_deg?).ok()
    }

    /// What the Coulomb checks of planes lack, as the words after "not checked: needs".
    pub const PLANE_STRENGTH_NEEDED: &'static str =
        "the planes' cohesion and friction angle (or the material's)";
}

/// Whose cohesion and friction angle the Coulomb checks of planes use.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum PlaneStrengthSource {
    /// The planes' own (set for the discontinuities).
    Planes,
    /// The material's, since the planes' are not given (intact material: one strength set).
    Material,
}

impl PlaneStrengthSource {
    /// Words for outputs.
    #[must_use]
    pub fn text(self) -> &'static str {
        match self {
            Self::Planes => "the planes' own c and φ",
            Self::Material => "the material's c and φ (no separate strength given for the planes)",
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
    /// Keys this version does not know, kept as read.
    #[serde(flatten, default, skip_serializing_if = "serde_json::Map::is_empty")]
    pub unknown: UnknownKeys,
}

/// A named plane checked as a fault (a joint, a fault, a bedding plane…).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct FaultPlane {
    /// Its name.
    pub name: String,
    /// Dip, degrees (0 horizontal to 90 vertical).
    pub dip_deg: f64,
    /// Dip direction, degrees clockwise from north.
    pub dip_direction_deg: f64,
    /// Keys this version does not know, kept as read.
    #[serde(flatten, default, skip_serializing_if = "serde_json::Map::is_empty")]
    pub unknown: UnknownKeys,
}

impl FaultPlane {
    /// The plane's upward normal.
    pub fn normal(&self) -> Result<PlaneNormal, StudyError> {
        PlaneNormal::from_dip(self.dip_deg, self.dip_direction_deg).map_err(|cause| {
            StudyError::Fault {
                name: self.name.clone(),
                cause,
            }
        })
    }

    /// Strike by the right-hand rule (dip direction − 90°), degrees in [0, 360).
    #[must_use]
    pub fn strike_deg(&self) -> f64 {
        (self.dip_direction_deg - 90.0).rem_euclid(360.0)
    }
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
    /// The revision the user gives the project (printed in every report; free text).
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub revision: String,
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
    /// Named planes checked as faults with the worst-plane section's pore pressure and plane
    /// cohesion and friction.
    #[serde(default)]
    pub faults: Vec<FaultPlane>,
    /// Captions and pinned notes on the figures, per load case or combination.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub annotations: Vec<super::annotations::Annotation>,
    /// Load cases as tables: the finite-element tables the load cases come from at every
    /// point, and how to read them (the window's Table tab and `planewise batch --project`).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub load_case_tables: Option<LoadCaseTables>,
    /// Top-level keys this version does not know, kept as read and written back.
    #[serde(flatten, default, skip_serializing_if = "serde_json::Map::is_empty")]
    pub unknown: UnknownKeys,
    /// Unknown keys inside known objects (a case's input, the measure…), as the file held them;
    /// set by [`crate::study::file::load`] and written back by its save.
    #[serde(skip)]
    pub unknown_inside: Option<Box<UnknownInside>>,
}

/// Load cases as tables: one table per load case (or one long table with a case column), the
/// id columns that join them and how their components are read. Paths are as given; a relative
/// one is read from the project file's folder.
#[derive(Clone, Debug, Default, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct LoadCaseTables {
    /// The tables: a load case and its file (one long table: its only file, case empty).
    pub tables: Vec<CaseTableFile>,
    /// The id columns that name a point in every table.
    pub ids: Vec<String>,
    /// One long table: the column naming each row's load case.
    #[serde(skip_serializing_if = "String::is_empty")]
    pub case_column: String,
    /// The components' unit (a symbol: MPa, psi…); the tables do not say.
    pub unit: String,
    /// The components are written compression positive.
    pub compression_positive: bool,
    /// Component (xx … zx) → column name, for components not found by their header names.
    #[serde(skip_serializing_if = "std::collections::BTreeMap::is_empty")]
    pub columns: std::collections::BTreeMap<String, String>,
    /// The tables hold xx, yy and xy only; zz, yz and zx are zero (the user says so).
    pub plane_stress: bool,
    /// Numbers are written with a decimal comma.
    pub decimal_comma: bool,
    /// Keys this version does not know, kept as read.
    #[serde(flatten, skip_serializing_if = "serde_json::Map::is_empty")]
    pub unknown: UnknownKeys,
}

/// One load-case table of [`LoadCaseTables`].
#[derive(Clone, Debug, Default, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct CaseTableFile {
    /// The load case (empty for a long table).
    pub case: String,
    /// The file, as given.
    pub file: String,
    /// Keys this version does not know, kept as read.
    #[serde(flatten, skip_serializing_if = "serde_json::Map::is_empty")]
    pub unknown: UnknownKeys,
}

fn default_unit() -> String {
    "MPa".to_owned()
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
            revision: String::new(),
            active: String::new(),
            plane: default_plane(),
            measure: MeasureChoice::default(),
            material: Material::default(),
            faults: Vec::new(),
            annotations: Vec::new(),
            load_case_tables: None,
            unknown: UnknownKeys::new(),
            unknown_inside: None,
        }
    }

    /// Every key of the file this version does not know, with where it sits
    /// (`cases[2].colour`), for the one warning a load gives.
    #[must_use]
    pub fn unknown_keys(&self) -> Vec<String> {
        let mut out: Vec<String> = self.unknown.keys().cloned().collect();
        let mut add = |place: String, map: &UnknownKeys| {
            out.extend(map.keys().map(|k| format!("{place}.{k}")));
        };
        add("material".to_owned(), &self.material.unknown);
        for (i, c) in self.cases.iter().enumerate() {
            add(format!("cases[{i}]"), &c.unknown);
        }
        for (i, c) in self.combinations.iter().enumerate() {
            add(format!("combinations[{i}]"), &c.unknown);
            for (j, t) in c.terms.iter().enumerate() {
                add(format!("combinations[{i}].terms[{j}]"), &t.unknown);
            }
        }
        for (i, f) in self.faults.iter().enumerate() {
            add(format!("faults[{i}]"), &f.unknown);
        }
        if let Some(inside) = &self.unknown_inside {
            inside.paths("", &mut out);
        }
        out
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
        self.unit.parse().map_err(StudyError::Unit)
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
        check_combination_with(combination, &self.case_index())
    }

    /// The load cases by name (for lookups in loops over many cases and combinations).
    fn case_index(&self) -> std::collections::HashMap<&str, &LoadCase> {
        self.cases.iter().map(|c| (c.name.as_str(), c)).collect()
    }

    /// Every case and combination with its tensor, cases first, in file order: one pass with a
    /// name index (linear in the project's size, for listings and envelopes of big projects).
    #[must_use]
    pub fn all_tensors(&self) -> Vec<(&str, bool, Result<StressTensor, StudyError>)> {
        let index = self.case_index();
        self.cases
            .iter()
            .map(|c| (c.name.as_str(), false, case_tensor(c)))
            .chain(
                self.combinations
                    .iter()
                    .map(|c| (c.name.as_str(), true, combination_tensor_with(c, &index))),
            )
            .collect()
    }

    /// Checks everything a loaded file promises: unique names, valid tensors, combinations of
    /// existing cases, a usable material.
    pub fn validate(&self) -> Result<(), StudyError> {
        self.unit()?;
        self.material
            .strengths
            .validate()
            .map_err(StudyError::Material)?;
        let m = &self.measure;
        if !(m.pore_pressure_pa.is_finite()
            && m.pore_pressure_pa.abs() <= crate::mechanics::tensor::MAX_STRESS_PA)
        {
            return Err(StudyError::PorePressure);
        }
        if let Some(c) = m.cohesion_pa {
            MohrCoulomb::new(c, m.friction_angle_deg.unwrap_or(0.0))
                .map_err(StudyError::MeasureMaterial)?;
        }
        if let Some(phi) = m.friction_angle_deg {
            MohrCoulomb::new(m.cohesion_pa.unwrap_or(0.0), phi)
                .map_err(StudyError::MeasureMaterial)?;
        }
        for (i, fault) in self.faults.iter().enumerate() {
            fault.normal()?;
            if self.faults[..i].iter().any(|f| f.name == fault.name) {
                return Err(StudyError::DuplicateFault(fault.name.clone()));
            }
        }
        for (i, a) in self.annotations.iter().enumerate() {
            a.validate()
                .map_err(|what| StudyError::Annotation { index: i, what })?;
        }
        let mut names: std::collections::HashSet<&str> = std::collections::HashSet::new();
        for name in self
            .cases
            .iter()
            .map(|c| c.name.as_str())
            .chain(self.combinations.iter().map(|c| c.name.as_str()))
        {
            check_name(name)?;
            if !names.insert(name) {
                return Err(StudyError::Duplicate(name.to_owned()));
            }
        }
        for case in &self.cases {
            case_tensor(case)?;
        }
        let index = self.case_index();
        for combination in &self.combinations {
            check_combination_with(combination, &index)?;
        }
        Ok(())
    }

    /// The Coulomb strength the checks of planes (the cut plane, named faults, the mohr-coulomb
    /// worst plane) use: the planes' own c and φ when given, else the material's, else none
    /// (those checks are then "not checked").
    #[must_use]
    pub fn plane_strength(&self) -> Option<(MohrCoulomb, PlaneStrengthSource)> {
        if let Some(m) = self.measure.plane_strength() {
            return Some((m, PlaneStrengthSource::Planes));
        }
        self.material
            .strengths
            .mohr_coulomb()
            .and_then(Result::ok)
            .map(|m| (m, PlaneStrengthSource::Material))
    }

    /// The worst-plane search settings: the measure, pore pressure and [`Self::plane_strength`],
    /// shown in the project's convention.
    #[must_use]
    pub fn search_settings(&self) -> SearchSettings {
        SearchSettings {
            material: self.plane_strength().map(|(m, _)| m),
            ..self.measure.settings(self.convention())
        }
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
        combination_tensor_with(combination, &self.case_index())
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

/// Checks a combination's terms (cases that exist, finite factors) and its tensor, the cases
/// looked up in `index`.
fn check_combination_with(
    combination: &Combination,
    index: &std::collections::HashMap<&str, &LoadCase>,
) -> Result<(), StudyError> {
    if combination.terms.is_empty() {
        return Err(StudyError::EmptyCombination(combination.name.clone()));
    }
    for term in &combination.terms {
        if !index.contains_key(term.case.as_str()) {
            return Err(StudyError::BadTerm {
                combination: combination.name.clone(),
                case: term.case.clone(),
            });
        }
        if !term.factor.is_finite() {
            return Err(StudyError::FactorNotFinite {
                combination: combination.name.clone(),
                case: term.case.clone(),
            });
        }
    }
    combination_tensor_with(combination, index).map(|_| ())
}

/// Σ factor × case tensor, the cases looked up in `index`.
fn combination_tensor_with(
    combination: &Combination,
    index: &std::collections::HashMap<&str, &LoadCase>,
) -> Result<StressTensor, StudyError> {
    let mut sum = [0.0; 6];
    for term in &combination.terms {
        let case = index
            .get(term.case.as_str())
            .ok_or_else(|| StudyError::BadTerm {
                combination: combination.name.clone(),
                case: term.case.clone(),
            })?;
        let t = case_tensor(case)?.components_pa();
        for (s, v) in sum.iter_mut().zip(t) {
            *s += term.factor * v;
        }
    }
    StressTensor::from_pa(sum).map_err(|cause| StudyError::CombinationTensor {
        combination: combination.name.clone(),
        cause,
    })
}

fn case_tensor(case: &LoadCase) -> Result<StressTensor, StudyError> {
    case.input.tensor().map_err(|e| StudyError::CaseTensor {
        case: case.name.clone(),
        cause: Box::new(e),
    })
}

/// The demo project's file, built in.
const DEMO_JSON: &str = include_str!("../../assets/demo-bracket-project.json");

pub(crate) fn check_name(name: &str) -> Result<(), StudyError> {
    if name.trim().is_empty() {
        return Err(StudyError::EmptyName);
    }
    if name.contains(['=', ',']) {
        return Err(StudyError::NameWithSeparator(name.to_owned()));
    }
    Ok(())
}

/// A combination's terms as text: "1.35 × dead + 1.5 × live".
#[must_use]
pub fn terms_text(terms: &[Term]) -> String {
    use std::fmt::Write as _;
    let mut text = String::new();
    for (i, t) in terms.iter().enumerate() {
        let factor = crate::text::format::sig(t.factor.abs(), 6);
        let sign = match (i, t.factor < 0.0) {
            (0, true) => "−",
            (0, false) => "",
            (_, true) => " − ",
            (_, false) => " + ",
        };
        let _ = write!(text, "{sign}{factor} × {}", t.case);
    }
    text
}
