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
        let unit: StressUnit = self.unit.parse().map_err(StudyError::Unit)?;
        let sign = if self.compression_positive { -1.0 } else { 1.0 };
        StressTensor::from_components(self.components, unit, sign).map_err(StudyError::Tensor)
    }
}

/// Where a load case's stress comes from. Every kind is kept as typed, with its units, and
/// converted to the tensor the rest of the program uses.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
pub enum CaseInput {
    /// A tensor typed component by component.
    Tensor(TypedTensor),
    /// In-situ stresses, compression positive: vertical, maximum and minimum horizontal, and the
    /// maximum's azimuth clockwise from north (x = east, y = north, z = up).
    InSitu(InSituInput),
    /// Principal values and the trend/plunge of the σ1 and σ3 axes.
    Principal(PrincipalInput),
    /// A three-gauge strain rosette on a free surface (plane stress).
    Rosette(RosetteInput),
    /// Plane stress σx, σy, τxy.
    PlaneStress(PlaneStressInput),
    /// One row of an imported finite-element table: its six components as read, and where
    /// they came from. Edited in the grid, it becomes an ordinary typed tensor.
    TableRow(TableRowInput),
}

/// A table row as imported.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct TableRowInput {
    /// The table file, as it was named when imported.
    pub file: String,
    /// Its line number (1-based).
    pub line: u64,
    /// The row's first carried column (an element or node id), if any.
    #[serde(default)]
    pub id: String,
    /// The components in the project's unit and convention at import.
    pub stress: TypedTensor,
}

/// In-situ stresses as typed (compression positive).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct InSituInput {
    /// Unit of the stresses.
    pub unit: String,
    /// Vertical stress Sv.
    pub sv: f64,
    /// Maximum horizontal stress SHmax.
    pub shmax: f64,
    /// Minimum horizontal stress Shmin.
    pub shmin: f64,
    /// Azimuth of SHmax, degrees clockwise from north.
    pub azimuth_deg: f64,
}

/// Principal values and axes as typed.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct PrincipalInput {
    /// Unit of the values.
    pub unit: String,
    /// Whether the values are compression positive.
    #[serde(default)]
    pub compression_positive: bool,
    /// s1 ≥ s2 ≥ s3 in that convention.
    pub values: [f64; 3],
    /// Trend and plunge of the σ1 axis, degrees.
    pub axis1: [f64; 2],
    /// Trend and plunge of the σ3 axis, degrees.
    pub axis3: [f64; 2],
}

/// A rosette as read.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct RosetteInput {
    /// Gauge angles counter-clockwise from x, degrees.
    pub angles_deg: [f64; 3],
    /// Readings in `strain_unit`.
    pub strains: [f64; 3],
    /// "microstrain" or "strain".
    pub strain_unit: String,
    /// Young's modulus in `modulus_unit`.
    pub modulus: f64,
    /// Unit of the modulus (a stress unit).
    pub modulus_unit: String,
    /// Poisson's ratio.
    pub poisson: f64,
}

/// Plane stress as typed.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct PlaneStressInput {
    /// Unit of the stresses.
    pub unit: String,
    /// Whether they are compression positive.
    #[serde(default)]
    pub compression_positive: bool,
    /// σx.
    pub sx: f64,
    /// σy.
    pub sy: f64,
    /// τxy.
    pub txy: f64,
}

/// The kinds of load-case input, for menus.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum InputKind {
    /// Six components.
    Tensor,
    /// In-situ stresses.
    InSitu,
    /// Principal values and axes.
    Principal,
    /// A strain rosette.
    Rosette,
    /// Plane stress.
    PlaneStress,
}

/// What a number of an input is, for labels and units in forms.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum FieldKind {
    /// A stress in the input's unit.
    Stress,
    /// An angle, degrees.
    Degrees,
    /// A strain reading in the input's strain unit.
    Strain,
    /// The modulus in its unit.
    Modulus,
    /// Dimensionless.
    Ratio,
}

impl InputKind {
    /// Every kind, in menu order.
    pub const ALL: [Self; 5] = [
        Self::Tensor,
        Self::InSitu,
        Self::Principal,
        Self::Rosette,
        Self::PlaneStress,
    ];

    /// Name as shown.
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            Self::Tensor => "six components",
            Self::InSitu => "in-situ stresses",
            Self::Principal => "principal values and axes",
            Self::Rosette => "strain rosette",
            Self::PlaneStress => "plane stress",
        }
    }

    /// The numbers of this kind: label and what they are.
    #[must_use]
    pub fn fields(self) -> &'static [(&'static str, FieldKind)] {
        use FieldKind::{Degrees, Modulus, Ratio, Strain, Stress};
        match self {
            Self::Tensor => &[
                ("σxx", Stress),
                ("σyy", Stress),
                ("σzz", Stress),
                ("σxy", Stress),
                ("σyz", Stress),
                ("σzx", Stress),
            ],
            Self::InSitu => &[
                ("Sv (vertical)", Stress),
                ("SHmax", Stress),
                ("Shmin", Stress),
                ("SHmax azimuth (from north)", Degrees),
            ],
            Self::Principal => &[
                ("s1", Stress),
                ("s2", Stress),
                ("s3", Stress),
                ("σ1 axis trend", Degrees),
                ("σ1 axis plunge", Degrees),
                ("σ3 axis trend", Degrees),
                ("σ3 axis plunge", Degrees),
            ],
            Self::Rosette => &[
                ("gauge a angle", Degrees),
                ("gauge b angle", Degrees),
                ("gauge c angle", Degrees),
                ("gauge a reading", Strain),
                ("gauge b reading", Strain),
                ("gauge c reading", Strain),
                ("Young's modulus E", Modulus),
                ("Poisson's ratio ν", Ratio),
            ],
            Self::PlaneStress => &[("σx", Stress), ("σy", Stress), ("τxy", Stress)],
        }
    }

    /// A new input of this kind with zero stresses (a rectangular rosette with E = 200 GPa and
    /// ν = 0.3, typical of steel, as a starting point) in `unit` and `convention`.
    #[must_use]
    pub fn blank(self, unit: StressUnit, compression_positive: bool) -> CaseInput {
        let unit = unit.symbol().to_owned();
        match self {
            Self::Tensor => CaseInput::Tensor(TypedTensor {
                unit,
                compression_positive,
                components: [0.0; 6],
            }),
            Self::InSitu => CaseInput::InSitu(InSituInput {
                unit,
                sv: 0.0,
                shmax: 0.0,
                shmin: 0.0,
                azimuth_deg: 0.0,
            }),
            Self::Principal => CaseInput::Principal(PrincipalInput {
                unit,
                compression_positive,
                values: [0.0; 3],
                axis1: [0.0, 0.0],
                axis3: [90.0, 0.0],
            }),
            Self::Rosette => CaseInput::Rosette(RosetteInput {
                angles_deg: [0.0, 45.0, 90.0],
                strains: [0.0; 3],
                strain_unit: "microstrain".to_owned(),
                modulus: 200.0,
                modulus_unit: "GPa".to_owned(),
                poisson: 0.3,
            }),
            Self::PlaneStress => CaseInput::PlaneStress(PlaneStressInput {
                unit,
                compression_positive,
                sx: 0.0,
                sy: 0.0,
                txy: 0.0,
            }),
        }
    }
}

fn parse_unit(unit: &str) -> Result<StressUnit, StudyError> {
    unit.parse().map_err(StudyError::Unit)
}

fn strain_factor(unit: &str) -> Result<f64, StudyError> {
    match unit {
        "microstrain" | "µε" => Ok(1e-6),
        "strain" => Ok(1.0),
        other => Err(StudyError::StrainUnit(other.to_owned())),
    }
}

impl CaseInput {
    /// The kind.
    #[must_use]
    pub fn kind(&self) -> InputKind {
        match self {
            Self::Tensor(_) | Self::TableRow(_) => InputKind::Tensor,
            Self::InSitu(_) => InputKind::InSitu,
            Self::Principal(_) => InputKind::Principal,
            Self::Rosette(_) => InputKind::Rosette,
            Self::PlaneStress(_) => InputKind::PlaneStress,
        }
    }

    /// The numbers as typed, in the order of [`InputKind::fields`].
    #[must_use]
    pub fn numbers(&self) -> Vec<f64> {
        match self {
            Self::Tensor(t) | Self::TableRow(TableRowInput { stress: t, .. }) => {
                t.components.to_vec()
            }
            Self::InSitu(i) => vec![i.sv, i.shmax, i.shmin, i.azimuth_deg],
            Self::Principal(p) => {
                let mut v = p.values.to_vec();
                v.extend(p.axis1);
                v.extend(p.axis3);
                v
            }
            Self::Rosette(r) => {
                let mut v = r.angles_deg.to_vec();
                v.extend(r.strains);
                v.extend([r.modulus, r.poisson]);
                v
            }
            Self::PlaneStress(p) => vec![p.sx, p.sy, p.txy],
        }
    }

    /// The same input with new numbers (as many as [`InputKind::fields`]; units kept).
    #[must_use]
    pub fn with_numbers(&self, v: &[f64]) -> Self {
        let at = |i: usize| v.get(i).copied().unwrap_or(0.0);
        let mut out = self.clone();
        match &mut out {
            Self::Tensor(t) | Self::TableRow(TableRowInput { stress: t, .. }) => {
                t.components = std::array::from_fn(at);
            }
            Self::InSitu(i) => {
                [i.sv, i.shmax, i.shmin, i.azimuth_deg] = [at(0), at(1), at(2), at(3)];
            }
            Self::Principal(p) => {
                p.values = [at(0), at(1), at(2)];
                p.axis1 = [at(3), at(4)];
                p.axis3 = [at(5), at(6)];
            }
            Self::Rosette(r) => {
                r.angles_deg = [at(0), at(1), at(2)];
                r.strains = [at(3), at(4), at(5)];
                r.modulus = at(6);
                r.poisson = at(7);
            }
            Self::PlaneStress(p) => [p.sx, p.sy, p.txy] = [at(0), at(1), at(2)],
        }
        out
    }

    /// Units of the stress, strain and modulus fields, for labels.
    #[must_use]
    pub fn units(&self) -> (String, String, String) {
        match self {
            Self::Tensor(t) | Self::TableRow(TableRowInput { stress: t, .. }) => {
                (t.unit.clone(), String::new(), String::new())
            }
            Self::InSitu(i) => (i.unit.clone(), String::new(), String::new()),
            Self::Principal(p) => (p.unit.clone(), String::new(), String::new()),
            Self::Rosette(r) => (String::new(), r.strain_unit.clone(), r.modulus_unit.clone()),
            Self::PlaneStress(p) => (p.unit.clone(), String::new(), String::new()),
        }
    }

    /// Whether stresses are typed compression positive (in-situ stresses always are).
    #[must_use]
    pub fn compression_positive(&self) -> bool {
        match self {
            Self::Tensor(t) | Self::TableRow(TableRowInput { stress: t, .. }) => {
                t.compression_positive
            }
            Self::InSitu(_) => true,
            Self::Principal(p) => p.compression_positive,
            Self::Rosette(_) => false,
            Self::PlaneStress(p) => p.compression_positive,
        }
    }

    /// The tensor in pascals, tension positive.
    pub fn tensor(&self) -> Result<StressTensor, StudyError> {
        use crate::mechanics::inputs;
        match self {
            Self::Tensor(t) | Self::TableRow(TableRowInput { stress: t, .. }) => t.tensor(),
            Self::InSitu(i) => {
                let u = parse_unit(&i.unit)?;
                inputs::in_situ(
                    u.to_pa(i.sv),
                    u.to_pa(i.shmax),
                    u.to_pa(i.shmin),
                    i.azimuth_deg,
                )
                .map_err(StudyError::from)
            }
            Self::Principal(p) => {
                let u = parse_unit(&p.unit)?;
                let sign = if p.compression_positive { -1.0 } else { 1.0 };
                inputs::principal_axes(
                    p.values.map(|v| u.to_pa(v)),
                    sign,
                    (p.axis1[0], p.axis1[1]),
                    (p.axis3[0], p.axis3[1]),
                )
                .map_err(StudyError::from)
            }
            Self::Rosette(r) => Self::rosette(r).map(|s| s.stress),
            Self::PlaneStress(p) => {
                let u = parse_unit(&p.unit)?;
                let sign = if p.compression_positive { -1.0 } else { 1.0 };
                inputs::plane_stress(
                    sign * u.to_pa(p.sx),
                    sign * u.to_pa(p.sy),
                    sign * u.to_pa(p.txy),
                )
                .map_err(StudyError::from)
            }
        }
    }

    fn rosette(r: &RosetteInput) -> Result<crate::mechanics::inputs::RosetteResult, StudyError> {
        let factor = strain_factor(&r.strain_unit)?;
        let modulus = parse_unit(&r.modulus_unit)?.to_pa(r.modulus);
        crate::mechanics::inputs::Rosette {
            angles_deg: r.angles_deg,
            strains: r.strains.map(|e| e * factor),
            modulus_pa: modulus,
            poisson: r.poisson,
        }
        .solve()
        .map_err(StudyError::from)
    }

    /// For a rosette: εx, εy, γxy, the principal strains and the angle of ε1 (strain, not
    /// microstrain); `None` for other kinds or a rosette that cannot be solved.
    #[must_use]
    pub fn rosette_result(&self) -> Option<crate::mechanics::inputs::RosetteResult> {
        match self {
            Self::Rosette(r) => Self::rosette(r).ok(),
            _ => None,
        }
    }
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
    /// Keys this version does not know, kept as read and written back.
    #[serde(flatten, default, skip_serializing_if = "serde_json::Map::is_empty")]
    pub unknown: UnknownKeys,
}

/// Keys of a project file this version of Planewise does not know (written by a newer one, or
/// by hand): kept as they were read, written back on save, and named in one warning.
pub type UnknownKeys = serde_json::Map<String, serde_json::Value>;

/// Unknown keys inside the objects this version knows but keeps no map of its own for (a
/// case's input, the measure, a note's pin…): what the file held less what the project writes
/// back, kept so that a save writes them back where they were.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct UnknownInside {
    /// Keys of this object this version does not know, with their values.
    pub keys: UnknownKeys,
    /// Keys not written back whose value is empty (null, "", [] or {}): most are known keys
    /// left out when empty (a caption's pin, an empty revision); restored, never warned about.
    pub empty: UnknownKeys,
    /// Known keys whose objects or lists hold unknown keys.
    pub within: std::collections::BTreeMap<String, UnknownInside>,
    /// The items of a list holding unknown keys: found again by their `name` where they have
    /// one, else by place (then only while the list keeps its length).
    pub items: Vec<(ItemAt, UnknownInside)>,
    /// The list's length when it was read.
    pub length: usize,
    /// The object's `kind` when it was read (a case input): an object of another kind now
    /// takes none of the old kind's keys.
    pub kind: Option<serde_json::Value>,
}

/// Where an item of a list is found again.
#[derive(Clone, Debug, PartialEq)]
pub enum ItemAt {
    /// By its `name`.
    Name(String),
    /// By its place.
    Index(usize),
}

impl UnknownInside {
    /// What `read` (the file's JSON) holds that `known` (the same project written back) does
    /// not; `None` when nothing.
    #[must_use]
    pub fn between(read: &serde_json::Value, known: &serde_json::Value) -> Option<Self> {
        use serde_json::Value;
        let mut out = Self::default();
        match (read, known) {
            (Value::Object(r), Value::Object(k)) => {
                out.kind = r.get("kind").cloned();
                for (key, value) in r {
                    let empty = match value {
                        Value::Null => true,
                        Value::String(t) => t.is_empty(),
                        Value::Array(a) => a.is_empty(),
                        Value::Object(o) => o.is_empty(),
                        _ => false,
                    };
                    match k.get(key) {
                        None if empty => {
                            out.empty.insert(key.clone(), value.clone());
                        }
                        None => {
                            out.keys.insert(key.clone(), value.clone());
                        }
                        Some(known) => {
                            if let Some(inside) = Self::between(value, known) {
                                out.within.insert(key.clone(), inside);
                            }
                        }
                    }
                }
            }
            (Value::Array(r), Value::Array(k)) => {
                out.length = r.len();
                for (i, (value, known)) in r.iter().zip(k).enumerate() {
                    if let Some(inside) = Self::between(value, known) {
                        let at = value
                            .get("name")
                            .and_then(Value::as_str)
                            .map_or(ItemAt::Index(i), |n| ItemAt::Name(n.to_owned()));
                        out.items.push((at, inside));
                    }
                }
            }
            _ => {}
        }
        (!out.keys.is_empty()
            || !out.empty.is_empty()
            || !out.within.is_empty()
            || !out.items.is_empty())
        .then_some(out)
    }

    /// Writes the kept keys back into `value` (the project as it is now): into the same object
    /// while its `kind` is unchanged; never over a key the project writes.
    pub fn restore(&self, value: &mut serde_json::Value) {
        use serde_json::Value;
        match value {
            Value::Object(map) => {
                if self.kind.is_some() && map.get("kind") != self.kind.as_ref() {
                    return;
                }
                for (key, v) in self.keys.iter().chain(&self.empty) {
                    map.entry(key.clone()).or_insert_with(|| v.clone());
                }
                for (key, inside) in &self.within {
                    if let Some(target) = map.get_mut(key) {
                        inside.restore(target);
                    }
                }
            }
            Value::Array(items) => {
                let same_length = items.len() == self.length;
                for (at, inside) in &self.items {
                    let target = match at {
                        ItemAt::Name(n) => items
                            .iter_mut()
                            .find(|v| v.get("name").and_then(Value::as_str) == Some(n)),
                        ItemAt::Index(i) if same_length => items.get_mut(*i),
                        ItemAt::Index(_) => None,
                    };
                    if let Some(target) = target {
                        inside.restore(target);
                    }
                }
            }
            _ => {}
        }
    }

    /// Where each kept key sits (`measure.colour`, `cases[2].input.gauge_factor`), under
    /// `place`.
    pub fn paths(&self, place: &str, out: &mut Vec<String>) {
        let join = |k: &str| {
            if place.is_empty() {
                k.to_owned()
            } else {
                format!("{place}.{k}")
            }
        };
        out.extend(self.keys.keys().map(|k| join(k)));
        for (k, inside) in &self.within {
            inside.paths(&join(k), out);
        }
        for (at, inside) in &self.items {
            let here = match at {
                ItemAt::Name(n) => format!("{place}[{n:?}]"),
                ItemAt::Index(i) => format!("{place}[{i}]"),
            };
            inside.paths(&here, out);
        }
    }
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
    /// Top-level keys this version does not know, kept as read and written back.
    #[serde(flatten, default, skip_serializing_if = "serde_json::Map::is_empty")]
    pub unknown: UnknownKeys,
    /// Unknown keys inside known objects (a case's input, the measure…), as the file held them;
    /// set by [`crate::study::file::load`] and written back by its save.
    #[serde(skip)]
    pub unknown_inside: Option<Box<UnknownInside>>,
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
