//! Why a study operation cannot be done: one variant per reason, each message naming what is
//! wrong and where.

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
    /// An input (in-situ, principal axes, rosette, plane stress) that gives no tensor.
    #[error(transparent)]
    Input(#[from] crate::mechanics::inputs::InputError),
    /// A stress unit nobody knows.
    #[error(transparent)]
    Unit(#[from] crate::mechanics::units::UnknownUnit),
    /// A strain unit nobody knows.
    #[error("unknown strain unit '{0}' (expected microstrain or strain)")]
    StrainUnit(String),
    /// Components that make no tensor (not finite, beyond the largest stress).
    #[error(transparent)]
    Tensor(#[from] crate::mechanics::tensor::TensorError),
    /// A load case whose input gives no tensor.
    #[error("load case '{case}': {cause}")]
    CaseTensor {
        /// The load case.
        case: String,
        /// Why.
        cause: Box<StudyError>,
    },
    /// A combination without terms.
    #[error("combination '{0}' has no terms")]
    EmptyCombination(String),
    /// A combination's factor that is not a finite number.
    #[error("combination '{combination}': the factor of '{case}' is not a finite number")]
    FactorNotFinite {
        /// The combination.
        combination: String,
        /// The term's load case.
        case: String,
    },
    /// A combination whose sum is no tensor (beyond the largest stress).
    #[error("combination '{combination}': {cause}")]
    CombinationTensor {
        /// The combination.
        combination: String,
        /// Why.
        cause: crate::mechanics::tensor::TensorError,
    },
    /// A fault whose dip and dip direction give no plane.
    #[error("fault '{name}': {cause}")]
    Fault {
        /// The fault.
        name: String,
        /// Why.
        cause: crate::mechanics::plane::PlaneError,
    },
    /// Two faults of one name.
    #[error("faults: the name '{0}' is used twice")]
    DuplicateFault(String),
    /// Strengths that are not usable.
    #[error("material: {0}")]
    Material(crate::mechanics::criteria::CriterionError),
    /// The worst-plane measure's pore pressure is not a finite stress.
    #[error("measure: pore_pressure_pa must be a finite stress")]
    PorePressure,
    /// The worst-plane measure's cohesion or friction angle is not usable.
    #[error("measure: the planes' {0}")]
    MeasureMaterial(crate::mechanics::criteria::CriterionError),
    /// A note that is not usable (the key and what is wrong with it).
    #[error("annotations[{index}].{what}")]
    Annotation {
        /// Its place in the list.
        index: usize,
        /// The key and what is wrong.
        what: String,
    },
    /// A note pinned to a point of another figure.
    #[error("a note on the {0} is pinned to another figure's point")]
    NoteOnOtherFigure(&'static str),
    /// An empty name of a case or combination.
    #[error("a name must not be empty")]
    EmptyName,
    /// A name holding '=' or ',' (they separate the terms of a combination on the command line).
    #[error("name '{0}' must not contain '=' or ','")]
    NameWithSeparator(String),
    /// The worst-plane search could not run.
    #[error(transparent)]
    Search(#[from] crate::mechanics::search::SearchError),
    /// An empty project name.
    #[error("a project name must not be empty")]
    EmptyProjectName,
    /// A combination's tensor edited as if it were typed.
    #[error("'{0}' is a combination: edit its load cases or factors, or make a load case from it")]
    CombinationNotTyped(String),
    /// A combination's input changed as if it were a load case.
    #[error("'{0}' is a combination")]
    NotALoadCase(String),
    /// A load case given by another input kind edited as a tensor.
    #[error("'{name}' is given as {kind}: edit that input")]
    OtherInput {
        /// The load case.
        name: String,
        /// Its input kind, in words.
        kind: &'static str,
    },
    /// A load case that holds no tensor input.
    #[error("'{0}': not a tensor input")]
    NotATensor(String),
    /// A load case's new input that gives no tensor.
    #[error("'{name}': {cause}")]
    EditedInput {
        /// The load case.
        name: String,
        /// Why.
        cause: Box<StudyError>,
    },
    /// A combination added before any load case.
    #[error("add a load case before a combination")]
    NoCaseForCombination,
    /// A project without load cases where one is needed.
    #[error("the project has no load case")]
    NoLoadCase,
    /// Deleting the last load case.
    #[error("a project keeps at least one load case")]
    LastLoadCase,
    /// Deleting the only term of a combination.
    #[error(
        "'{case}' is the only term of combination '{combination}': delete or change that combination first"
    )]
    OnlyTerm {
        /// The load case.
        case: String,
        /// The combination.
        combination: String,
    },
    /// A state that cannot be shown, with the reason already written (a derived result's
    /// problem).
    #[error("{0}")]
    Unusable(String),
}
