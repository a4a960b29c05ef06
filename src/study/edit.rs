//! Every change of a project as a value. The window sends each through one path (one undo step
//! each); the command line's `project` subcommands use the same model functions.

use super::annotations::Annotation;
use super::error::StudyError;
use super::inputs::{CaseInput, InputKind, TypedTensor};
use super::model::{
    Combination, FaultPlane, LoadCase, Material, MeasureChoice, Project, Term, check_name,
};
use crate::mechanics::{Component, PlaneNormal, SignConvention, StressUnit};

/// One change of a project.
#[derive(Clone, Debug, PartialEq)]
pub enum Edit {
    /// The active load case's six components as typed, in the project's unit and convention
    /// (xx, yy, zz, xy, yz, zx), stored as typed: the study converts them to pascals, nothing
    /// else does, so a value typed in ksi is saved as typed.
    SetComponents([f64; 6]),
    /// One component of the active load case as typed in the project's unit and convention;
    /// the others stay as they were typed.
    SetComponent(Component, f64),
    /// The active load case's input (same or another kind).
    SetInput(CaseInput),
    /// A new load case whose input is of this kind (zero stresses), shown at once.
    AddCaseOfKind(InputKind),
    /// The cut plane.
    SetPlane(PlaneNormal),
    /// The worst-plane measure, pore pressure and the planes' cohesion and friction.
    SetMeasure(MeasureChoice),
    /// The material the criteria check against.
    SetMaterial(Box<Material>),
    /// The named fault planes.
    SetFaults(Vec<FaultPlane>),
    /// Every caption and pinned note (each names its case and figure).
    SetAnnotations(Vec<Annotation>),
    /// The unit every stress is shown and typed in.
    SetUnit(StressUnit),
    /// The sign convention every stress is shown and typed in.
    SetConvention(SignConvention),
    /// The project's name.
    SetName(String),
    /// Show this case or combination.
    Activate(String),
    /// A new load case with a zero stress, shown at once.
    AddCase,
    /// Where the load cases come from as tables (None: nowhere).
    SetLoadCaseTables(Option<Box<crate::study::LoadCaseTables>>),
    /// A load case taken from a row of an imported table (replacing a case of the same name),
    /// shown at once.
    AddTableRow(Box<LoadCase>),
    /// The load cases of one point of joined load-case tables (each replacing a case of the
    /// same name), then `show` shown (the point's governing combination when the project has
    /// it, else its first case).
    AddTablePoint {
        /// One load case per table case.
        cases: Vec<LoadCase>,
        /// What to show afterwards.
        show: String,
    },
    /// A copy of a case or combination, shown at once.
    Duplicate(String),
    /// The active combination's summed tensor as a new load case.
    CaseFromActive,
    /// A new name for a case or combination (combinations follow a renamed case).
    Rename {
        /// The old name.
        from: String,
        /// The new name.
        to: String,
    },
    /// Remove a case (and its terms in combinations) or a combination.
    Delete(String),
    /// Move a case or combination one place up or down in its list.
    Move {
        /// Which.
        name: String,
        /// Up (towards the start) or down.
        up: bool,
    },
    /// A new combination of every case with factor 1, shown at once.
    AddCombination,
    /// A combination's terms.
    SetTerms {
        /// The combination.
        name: String,
        /// Its new terms.
        terms: Vec<Term>,
    },
    /// A case's description.
    SetDescription {
        /// The case.
        name: String,
        /// The text.
        text: String,
    },
    /// Replace the whole project (reset to the demo).
    Replace(Box<Project>),
}

/// The active load case's typed tensor in the project's unit and convention, ready to be
/// edited: kept as typed when it already is in them, else converted once (a table row becomes
/// an ordinary typed tensor). Refused for a combination or another input kind.
fn typed_tensor(p: &mut Project) -> Result<&mut TypedTensor, StudyError> {
    let name = active(p)?;
    let unit = p.unit()?;
    let sign = p.convention().sign();
    let compression_positive = p.compression_positive;
    let case = p
        .cases
        .iter_mut()
        .find(|c| c.name == name)
        .ok_or_else(|| StudyError::CombinationNotTyped(name.clone()))?;
    if case.input.kind() != InputKind::Tensor {
        return Err(StudyError::OtherInput {
            name: name.clone(),
            kind: case.input.kind().label(),
        });
    }
    let as_typed = match &case.input {
        CaseInput::Tensor(t)
            if t.unit == unit.symbol() && t.compression_positive == compression_positive =>
        {
            t.components
        }
        other => other
            .tensor()?
            .components_pa()
            .map(|v| sign * unit.from_pa(v)),
    };
    case.input = CaseInput::Tensor(TypedTensor {
        unit: unit.symbol().to_owned(),
        compression_positive,
        components: as_typed,
    });
    match &mut case.input {
        CaseInput::Tensor(t) => Ok(t),
        _ => Err(StudyError::NotATensor(name.clone())),
    }
}

impl Edit {
    /// The project after this edit, or why it cannot be made (the project is not changed).
    pub fn apply(&self, project: &Project) -> Result<Project, StudyError> {
        let mut p = project.clone();
        match self {
            Self::SetComponents(values) => {
                let typed = typed_tensor(&mut p)?;
                typed.components = *values;
                typed.tensor()?;
            }
            Self::SetComponent(component, value) => {
                let typed = typed_tensor(&mut p)?;
                // Components are stored in Component::ALL order (xx, yy, zz, xy, yz, zx).
                let i = Component::ALL
                    .iter()
                    .position(|c| c == component)
                    .unwrap_or_default();
                typed.components[i] = *value;
                typed.tensor()?;
            }
            Self::SetInput(input) => {
                let name = active(&p)?;
                input.tensor().map_err(|e| StudyError::EditedInput {
                    name: name.clone(),
                    cause: Box::new(e),
                })?;
                let case = p
                    .cases
                    .iter_mut()
                    .find(|c| c.name == name)
                    .ok_or_else(|| StudyError::NotALoadCase(name.clone()))?;
                case.input = input.clone();
            }
            Self::AddCaseOfKind(kind) => {
                let name = p.unused_name("case");
                let input = kind.blank(p.unit()?, p.compression_positive);
                p.cases.push(LoadCase {
                    unknown: crate::study::unknown::UnknownKeys::new(),
                    name: name.clone(),
                    description: String::new(),
                    input,
                });
                p.active = name;
            }
            Self::SetFaults(faults) => {
                for f in faults {
                    f.normal()?;
                }
                p.faults.clone_from(faults);
            }
            Self::SetAnnotations(annotations) => {
                for a in annotations {
                    if !p.name_used(&a.case) {
                        return Err(StudyError::Unknown(a.case.clone()));
                    }
                    if a.pin.is_some_and(|pin| pin.figure() != a.figure) {
                        return Err(StudyError::NoteOnOtherFigure(a.figure.label()));
                    }
                }
                p.annotations.clone_from(annotations);
            }
            Self::SetPlane(plane) => p.plane = *plane,
            Self::SetMeasure(choice) => p.measure = *choice,
            Self::SetMaterial(material) => {
                material
                    .strengths
                    .validate()
                    .map_err(StudyError::Material)?;
                p.material = (**material).clone();
            }
            Self::SetUnit(unit) => unit.symbol().clone_into(&mut p.unit),
            Self::SetConvention(c) => {
                p.compression_positive = *c == SignConvention::CompressionPositive;
            }
            Self::SetName(name) => {
                if name.trim().is_empty() {
                    return Err(StudyError::EmptyProjectName);
                }
                name.clone_into(&mut p.name);
            }
            Self::Activate(name) => {
                if !p.name_used(name) {
                    return Err(StudyError::Unknown(name.clone()));
                }
                name.clone_into(&mut p.active);
            }
            Self::AddTableRow(case) => {
                if p.is_combination(&case.name) {
                    return Err(StudyError::Duplicate(case.name.clone()));
                }
                p.add_case((**case).clone(), true)?;
                p.active.clone_from(&case.name);
            }
            Self::AddTablePoint { cases, show } => {
                for case in cases {
                    if p.is_combination(&case.name) {
                        return Err(StudyError::Duplicate(case.name.clone()));
                    }
                    p.add_case(case.clone(), true)?;
                }
                if p.name_used(show) {
                    p.active.clone_from(show);
                } else if let Some(first) = cases.first() {
                    p.active.clone_from(&first.name);
                }
            }
            Self::SetLoadCaseTables(t) => {
                p.load_case_tables = t.as_deref().cloned();
            }
            Self::AddCase => {
                let name = p.unused_name("case");
                let unit = p.unit()?;
                p.cases.push(LoadCase {
                    unknown: crate::study::unknown::UnknownKeys::new(),
                    name: name.clone(),
                    description: String::new(),
                    input: CaseInput::Tensor(TypedTensor {
                        unit: unit.symbol().to_owned(),
                        compression_positive: p.compression_positive,
                        components: [0.0; 6],
                    }),
                });
                p.active = name;
            }
            Self::Duplicate(name) => {
                let copy = copy_name(&p, name);
                if let Some(i) = p.cases.iter().position(|c| &c.name == name) {
                    let mut case = p.cases[i].clone();
                    case.name.clone_from(&copy);
                    p.cases.insert(i + 1, case);
                } else if let Some(i) = p.combinations.iter().position(|c| &c.name == name) {
                    let mut combination = p.combinations[i].clone();
                    combination.name.clone_from(&copy);
                    p.combinations.insert(i + 1, combination);
                } else {
                    return Err(StudyError::Unknown(name.clone()));
                }
                p.active = copy;
            }
            Self::CaseFromActive => {
                let name = active(&p)?;
                let tensor = p.tensor(&name)?;
                let case_name = copy_name(&p, &format!("{name} as case"));
                let unit = p.unit()?;
                let sign = p.convention().sign();
                p.cases.push(LoadCase {
                    unknown: crate::study::unknown::UnknownKeys::new(),
                    name: case_name.clone(),
                    description: format!("The summed tensor of '{name}', made a load case"),
                    input: CaseInput::Tensor(TypedTensor {
                        unit: unit.symbol().to_owned(),
                        compression_positive: p.compression_positive,
                        components: tensor.components_pa().map(|v| sign * unit.from_pa(v)),
                    }),
                });
                p.active = case_name;
            }
            Self::Rename { from, to } => rename(&mut p, from, to)?,
            Self::Delete(name) => delete(&mut p, name)?,
            Self::Move { name, up } => {
                fn shift<T>(list: &mut [T], i: usize, up: bool) {
                    let j = if up { i.checked_sub(1) } else { Some(i + 1) };
                    if let Some(j) = j.filter(|&j| j < list.len()) {
                        list.swap(i, j);
                    }
                }
                if let Some(i) = p.cases.iter().position(|c| &c.name == name) {
                    shift(&mut p.cases, i, *up);
                } else if let Some(i) = p.combinations.iter().position(|c| &c.name == name) {
                    shift(&mut p.combinations, i, *up);
                } else {
                    return Err(StudyError::Unknown(name.clone()));
                }
            }
            Self::AddCombination => {
                if p.cases.is_empty() {
                    return Err(StudyError::NoCaseForCombination);
                }
                let name = p.unused_name("combination");
                let terms = p
                    .cases
                    .iter()
                    .map(|c| Term {
                        unknown: crate::study::unknown::UnknownKeys::new(),
                        case: c.name.clone(),
                        factor: 1.0,
                    })
                    .collect();
                p.add_combination(
                    Combination {
                        unknown: crate::study::unknown::UnknownKeys::new(),
                        name: name.clone(),
                        terms,
                    },
                    false,
                )?;
                p.active = name;
            }
            Self::SetTerms { name, terms } => {
                if !p.is_combination(name) {
                    return Err(StudyError::Unknown(name.clone()));
                }
                p.add_combination(
                    Combination {
                        unknown: crate::study::unknown::UnknownKeys::new(),
                        name: name.clone(),
                        terms: terms.clone(),
                    },
                    true,
                )?;
            }
            Self::SetDescription { name, text } => {
                let case = p
                    .cases
                    .iter_mut()
                    .find(|c| &c.name == name)
                    .ok_or_else(|| StudyError::Unknown(name.clone()))?;
                text.clone_into(&mut case.description);
            }
            Self::Replace(project) => p = (**project).clone(),
        }
        Ok(p)
    }
}

fn active(p: &Project) -> Result<String, StudyError> {
    p.active_name()
        .map(str::to_owned)
        .ok_or(StudyError::NoLoadCase)
}

/// `name (copy)`, `name (copy 2)`, … whichever is free.
fn copy_name(p: &Project, name: &str) -> String {
    std::iter::once(format!("{name} (copy)"))
        .chain((2..=p.names().len() + 2).map(|i| format!("{name} (copy {i})")))
        .find(|n| !p.name_used(n))
        .unwrap_or_default()
}

fn rename(p: &mut Project, from: &str, to: &str) -> Result<(), StudyError> {
    let to = to.trim();
    if from == to {
        return Ok(());
    }
    check_name(to)?;
    if p.name_used(to) {
        return Err(StudyError::Duplicate(to.to_owned()));
    }
    if let Some(case) = p.cases.iter_mut().find(|c| c.name == from) {
        to.clone_into(&mut case.name);
        for term in p.combinations.iter_mut().flat_map(|c| c.terms.iter_mut()) {
            if term.case == from {
                to.clone_into(&mut term.case);
            }
        }
    } else if let Some(combination) = p.combinations.iter_mut().find(|c| c.name == from) {
        to.clone_into(&mut combination.name);
    } else {
        return Err(StudyError::Unknown(from.to_owned()));
    }
    if p.active == from {
        to.clone_into(&mut p.active);
    }
    for a in p.annotations.iter_mut().filter(|a| a.case == from) {
        to.clone_into(&mut a.case);
    }
    Ok(())
}

fn delete(p: &mut Project, name: &str) -> Result<(), StudyError> {
    let shown = p.active_name().map(str::to_owned);
    if let Some(i) = p.cases.iter().position(|c| c.name == name) {
        if p.cases.len() == 1 {
            return Err(StudyError::LastLoadCase);
        }
        for combination in &mut p.combinations {
            combination.terms.retain(|t| t.case != name);
            if combination.terms.is_empty() {
                return Err(StudyError::OnlyTerm {
                    case: name.to_owned(),
                    combination: combination.name.clone(),
                });
            }
        }
        p.cases.remove(i);
    } else if let Some(i) = p.combinations.iter().position(|c| c.name == name) {
        p.combinations.remove(i);
    } else {
        return Err(StudyError::Unknown(name.to_owned()));
    }
    // Its captions and notes go with it (undo brings them back).
    p.annotations.retain(|a| a.case != name);
    if shown.as_deref() == Some(name) {
        // Show the first load case instead.
        p.active = p
            .cases
            .iter()
            .map(|c| c.name.clone())
            .next()
            .unwrap_or_default();
    }
    Ok(())
}
