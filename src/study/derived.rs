//! What every panel reads about the shown case or combination, computed once per change of the
//! project: its tensor, the analysis in the display convention and the worst-plane search.
//! Before this, each panel searched for itself, two or three times a frame.

use super::annotations::Annotation;
use super::inputs::CaseInput;
use super::model::{FaultPlane, MeasureChoice, Project};
use crate::mechanics::criteria::{self, FaultCheck, Verdict};
use crate::mechanics::search::{SearchError, SearchResult, SearchSettings, worst_plane};
use crate::mechanics::{Analysis, PlaneNormal, SignConvention, StressTensor, StressUnit};

/// The shown state and its results.
#[derive(Clone, Debug, PartialEq)]
pub struct Derived {
    /// The case or combination shown.
    pub name: String,
    /// Whether it is a combination (its tensor is a sum, not typed).
    pub combination: bool,
    /// Its tensor (pascals, tension positive).
    pub tensor: StressTensor,
    /// The cut plane.
    pub plane: PlaneNormal,
    /// Display unit.
    pub unit: StressUnit,
    /// Display convention.
    pub convention: SignConvention,
    /// The measure as the user set it.
    pub measure: MeasureChoice,
    /// The search settings in the display convention (with [`Project::plane_strength`]).
    pub search: SearchSettings,
    /// Whose c and φ the Coulomb checks of planes use (`None`: not checked).
    pub plane_strength_from: Option<super::model::PlaneStrengthSource>,
    /// Principal stresses, invariants and equivalent stresses in the display convention.
    pub analysis: Analysis,
    /// The worst planes for the measure.
    pub worst: Result<SearchResult, SearchError>,
    /// The material's verdicts, governing first.
    pub verdicts: Vec<Verdict>,
    /// The material's name.
    pub material_name: String,
    /// The cut plane as a fault, with the worst-plane section's pore pressure and plane
    /// cohesion and friction.
    pub fault: Option<FaultCheck>,
    /// The named faults with their checks (`None` where the plane is unusable).
    pub faults: Vec<(FaultPlane, Option<FaultCheck>)>,
    /// The shown load case's input as typed (`None` for a combination).
    pub input: Option<CaseInput>,
    /// Why the tensor could not be formed, if so (the zero tensor is shown meanwhile).
    pub problem: Option<String>,
    /// Its captions and pinned notes, on every figure.
    pub notes: Vec<Annotation>,
}

impl Derived {
    /// Computes everything for the project's shown case or combination.
    #[must_use]
    pub fn new(project: &Project) -> Self {
        Self::of(project, project.active_name().unwrap_or_default())
    }

    /// Computes everything for the case or combination `name` of `project` (whichever is
    /// active): the report's way through every case without copying the project for each.
    #[must_use]
    pub fn of(project: &Project, name: &str) -> Self {
        let unit = project.unit().unwrap_or(StressUnit::MPa);
        let convention = project.convention();
        let name = name.to_owned();
        let (tensor, problem) = match project.tensor(&name) {
            Ok(t) => (t, None),
            Err(e) => (StressTensor::default(), Some(e.to_string())),
        };
        let search = project.search_settings();
        // Pressure-sensitive criteria on effective stress whenever a pore pressure is given.
        let mut verdicts = criteria::verdicts(
            &tensor,
            &project.material.strengths,
            project.measure.pore_pressure_pa,
        );
        criteria::governing_first(&mut verdicts);
        let fault = criteria::fault_check(
            &tensor,
            project.plane,
            project.measure.pore_pressure_pa,
            search.material.as_ref(),
        )
        .ok();
        let faults = project
            .faults
            .iter()
            .map(|f| {
                let check = f.normal().ok().and_then(|n| {
                    criteria::fault_check(
                        &tensor,
                        n,
                        project.measure.pore_pressure_pa,
                        search.material.as_ref(),
                    )
                    .ok()
                });
                (f.clone(), check)
            })
            .collect();
        Self {
            notes: project
                .annotations
                .iter()
                .filter(|a| a.case == name)
                .cloned()
                .collect(),
            faults,
            input: project.case(&name).map(|c| c.input.clone()),
            verdicts,
            material_name: project.material.name.clone(),
            fault,
            combination: project.is_combination(&name),
            name,
            plane: project.plane,
            unit,
            convention,
            measure: project.measure,
            plane_strength_from: project.plane_strength().map(|(_, from)| from),
            analysis: Analysis::new(&tensor, convention),
            worst: worst_plane(&tensor, &search),
            search,
            tensor,
            problem,
        }
    }

    /// The worst planes' normals (empty when the search cannot run).
    #[must_use]
    pub fn worst_normals(&self) -> Vec<PlaneNormal> {
        self.worst
            .as_ref()
            .map(SearchResult::normals)
            .unwrap_or_default()
    }
}

/// Keeps the derived results of the last project it was given, recomputing only on change.
#[derive(Debug, Default)]
pub struct DerivedCache {
    key: Option<Project>,
    value: Option<Derived>,
    /// How many times the results were computed (tests read it to prove one search per change).
    pub computations: u64,
}

impl DerivedCache {
    /// The results for `project`.
    pub fn get(&mut self, project: &Project) -> &Derived {
        if self.key.as_ref() != Some(project) || self.value.is_none() {
            self.key = Some(project.clone());
            self.computations += 1;
            self.value = Some(Derived::new(project));
        }
        self.value.get_or_insert_with(|| Derived::new(project))
    }
}
