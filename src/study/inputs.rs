//! The ways a load case's stress is given, kept as the user typed them: a tensor, in-situ
//! stresses, principal values and axes, a strain rosette, plane stress, a finite-element table
//! row; each turned into pascals only by [`CaseInput::tensor`]. [`InputKind::fields`] drives the
//! window's form and the report's input table.

use serde::{Deserialize, Serialize};

use super::error::StudyError;
use crate::mechanics::{StressTensor, StressUnit};

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
    /// Its line number (1-based); 0 for a point of joined load-case tables, which `id` names.
    pub line: u64,
    /// The row's first carried column (an element or node id), if any; for a point of joined
    /// tables its ids (`element=12, ip=3`).
    #[serde(default)]
    pub id: String,
    /// The components in the project's unit and convention at import.
    pub stress: TypedTensor,
}

impl TableRowInput {
    /// Where in the table the stress was taken: `line 17 (E12)`, or for a point of joined
    /// load-case tables `the point element=12, ip=3 (tables joined on their ids)`.
    #[must_use]
    pub fn place(&self) -> String {
        match (self.line, self.id.is_empty()) {
            (0, _) => format!("the point {} (tables joined on their ids)", self.id),
            (line, true) => format!("line {line}"),
            (line, false) => format!("line {line} ({})", self.id),
        }
    }
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
