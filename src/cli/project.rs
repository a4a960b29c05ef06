//! `planewise project …`: create a project file, add load cases and combinations, show it.
//! Every change reads the file, checks the whole change, and only then writes the file
//! atomically; bad input leaves the file as it was.

use std::fmt::Write as _;
use std::path::{Path, PathBuf};

use clap::{Args, Subcommand};

use super::{ArgError, CliError, values};
use crate::mechanics::{SignConvention, StressUnit};
use crate::study::{self, CaseInput, Combination, LoadCase, Project, TypedTensor};
use crate::text::format::sig;
use crate::text::parse;

/// Arguments of `planewise project`.
#[derive(Debug, Clone, Args)]
pub struct ProjectArgs {
    /// What to do with the project file.
    #[command(subcommand)]
    pub action: ProjectAction,
}

/// The project actions.
#[derive(Debug, Clone, Subcommand)]
pub enum ProjectAction {
    /// Create a new, empty project file (refuses to overwrite one).
    New(NewArgs),
    /// Add a load case (a stress tensor typed in the project's unit and convention).
    AddCase(AddCaseArgs),
    /// Add a factored combination Σ factor × case tensor.
    Combine(CombineArgs),
    /// Add the combinations of EN 1990 expression (6.10) generated from the load cases declared
    /// as permanent and variable actions with your partial and combination factors (each
    /// variable action leading in turn, each permanent action unfavourable and favourable).
    GenerateCombinations(GenerateArgs),
    /// List the cases and combinations with their tensors.
    Show(ShowArgs),
    /// Set the material's name and strengths (stresses in the project's unit); what is not
    /// given stays as it was, --clear removes values.
    SetMaterial(SetMaterialArgs),
    /// Set the pore pressure (compression positive, in the project's unit; 0 removes it).
    SetPorePressure(SetPorePressureArgs),
    /// Set or clear the planes' Coulomb strength (cohesion and friction), used by the fault
    /// checks and the mohr-coulomb worst plane.
    SetPlaneStrength(SetPlaneStrengthArgs),
    /// Set the cut plane.
    SetCutPlane(SetCutPlaneArgs),
    /// Set the worst-plane measure.
    SetMeasure(SetMeasureArgs),
    /// Add a named plane checked as a fault.
    AddFault(AddFaultArgs),
    /// Remove a named fault.
    RemoveFault(RemoveFaultArgs),
    /// Set the project's revision (printed in every report).
    SetRevision(SetRevisionArgs),
}

/// `project set-revision`.
#[derive(Debug, Clone, Args)]
pub struct SetRevisionArgs {
    /// The project file.
    pub file: PathBuf,
    /// The revision, free text (e.g. "B, issued for checking").
    pub revision: String,
}

/// `project set-material`.
#[derive(Debug, Clone, Args)]
pub struct SetMaterialArgs {
    /// The project file.
    pub file: PathBuf,
    /// The material's name.
    #[arg(long)]
    pub name: Option<String>,
    #[command(flatten)]
    pub strengths: super::args::StrengthArgs,
    /// Remove these values: yield-strength, tensile-strength, compressive-strength, cohesion,
    /// friction (comma-separated).
    #[arg(long, value_name = "LIST", value_delimiter = ',')]
    pub clear: Vec<String>,
}

/// `project set-pore-pressure`.
#[derive(Debug, Clone, Args)]
pub struct SetPorePressureArgs {
    /// The project file.
    pub file: PathBuf,
    /// The pore pressure in the project's unit, compression positive (0: none).
    #[arg(allow_hyphen_values = true)]
    pub value: String,
}

/// `project set-plane-strength`.
#[derive(Debug, Clone, Args)]
pub struct SetPlaneStrengthArgs {
    /// The project file.
    pub file: PathBuf,
    /// The planes' cohesion c in the project's unit.
    #[arg(
        long,
        value_name = "C",
        allow_hyphen_values = true,
        required_unless_present = "clear"
    )]
    pub cohesion: Option<String>,
    /// The planes' friction angle φ, degrees.
    #[arg(long, value_name = "DEG", allow_hyphen_values = true)]
    pub friction_angle: Option<String>,
    /// The planes' friction coefficient μ instead (φ = atan μ).
    #[arg(long, value_name = "MU", allow_hyphen_values = true)]
    pub friction_coefficient: Option<String>,
    /// Remove the planes' strength (their Coulomb checks become "not checked").
    #[arg(long, conflicts_with_all = ["cohesion", "friction_angle", "friction_coefficient"])]
    pub clear: bool,
}

/// `project set-cut-plane`.
#[derive(Debug, Clone, Args)]
pub struct SetCutPlaneArgs {
    /// The project file.
    pub file: PathBuf,
    #[command(flatten)]
    pub plane: super::PlaneArgs,
}

/// `project set-measure`.
#[derive(Debug, Clone, Args)]
pub struct SetMeasureArgs {
    /// The project file.
    pub file: PathBuf,
    /// The worst-plane measure.
    pub measure: crate::mechanics::search::Measure,
}

/// `project add-fault`.
#[derive(Debug, Clone, Args)]
pub struct AddFaultArgs {
    /// The project file.
    pub file: PathBuf,
    /// NAME=DIP/DIPDIRECTION in degrees.
    #[arg(long, value_name = "NAME=DIP/DIPDIR", allow_hyphen_values = true)]
    pub fault: Vec<String>,
    /// NAME=STRIKE/DIP by the right-hand rule.
    #[arg(long, value_name = "NAME=STRIKE/DIP", allow_hyphen_values = true)]
    pub fault_strike: Vec<String>,
}

/// `project remove-fault`.
#[derive(Debug, Clone, Args)]
pub struct RemoveFaultArgs {
    /// The project file.
    pub file: PathBuf,
    /// The fault's name.
    #[arg(long)]
    pub name: String,
}

/// `project new`.
#[derive(Debug, Clone, Args)]
pub struct NewArgs {
    /// The project file to create (.json).
    pub file: PathBuf,
    /// The project's name.
    #[arg(long, default_value = "Untitled")]
    pub name: String,
    /// Unit of the project's stresses: Pa, kPa, MPa (N/mm²), GPa, bar, psi or ksi.
    #[arg(long, default_value = "MPa", value_parser = values::unit)]
    pub unit: StressUnit,
    /// The project's stresses are compression-positive (geomechanics).
    #[arg(long)]
    pub compression_positive: bool,
}

/// `project add-case`.
#[derive(Debug, Clone, Args)]
pub struct AddCaseArgs {
    /// The project file.
    pub file: PathBuf,
    /// The load case's name (unique among cases and combinations).
    #[arg(long)]
    pub name: String,
    /// Components as key=value pairs in the project's unit and convention (or one of the other
    /// inputs below).
    #[arg(long, value_name = "KEY=VALUE,…", allow_hyphen_values = true)]
    pub stress: Option<String>,
    #[command(flatten)]
    pub other: super::InputArgs,
    /// Plane stress instead of --stress: sx=…,sy=…,txy=… in the project's unit and convention.
    #[arg(long, value_name = "KEY=VALUE,…", allow_hyphen_values = true)]
    pub plane_stress: Option<String>,
    /// A strain rosette instead of --stress: the three readings EA,EB,EC (with --modulus and
    /// --poisson; plane stress on a free surface).
    #[arg(long, value_name = "EA,EB,EC", allow_hyphen_values = true, requires_all = ["modulus", "poisson"])]
    pub rosette: Option<String>,
    /// The rosette's gauge angles, degrees counter-clockwise from x.
    #[arg(
        long,
        value_name = "A,B,C",
        default_value = "0,45,90",
        allow_hyphen_values = true
    )]
    pub gauge_angles: String,
    /// Unit of the rosette's readings: microstrain or strain.
    #[arg(long, value_name = "UNIT", default_value = "microstrain")]
    pub strain_unit: String,
    /// The rosette's Young's modulus with its unit, e.g. 200GPa.
    #[arg(long, value_name = "E", allow_hyphen_values = true)]
    pub modulus: Option<String>,
    /// The rosette's Poisson's ratio.
    #[arg(long, value_name = "NU", allow_hyphen_values = true)]
    pub poisson: Option<String>,
    /// Free text.
    #[arg(long, default_value = "")]
    pub description: String,
    /// Replace the case of the same name instead of refusing.
    #[arg(long)]
    pub replace: bool,
}

/// `project combine`.
#[derive(Debug, Clone, Args)]
pub struct CombineArgs {
    /// The project file.
    pub file: PathBuf,
    /// The combination's name (unique among cases and combinations).
    #[arg(long)]
    pub name: String,
    /// Terms as CASE=FACTOR pairs, e.g. dead=1.35,live=1.5 (factors may be negative or zero).
    #[arg(long, value_name = "CASE=FACTOR,…", allow_hyphen_values = true)]
    pub factors: String,
    /// Replace the combination of the same name instead of refusing.
    #[arg(long)]
    pub replace: bool,
}

/// `project generate-combinations`.
#[derive(Debug, Clone, Args)]
pub struct GenerateArgs {
    /// The project file.
    pub file: PathBuf,
    /// A permanent action: its load case, γG,sup (unfavourable) and γG,inf (favourable), e.g.
    /// dead:1.35:1.0. Repeat for each.
    #[arg(long, value_name = "CASE:SUP:INF")]
    pub permanent: Vec<String>,
    /// A variable action: its load case, γQ and ψ0, e.g. live:1.5:0.7. Repeat for each.
    #[arg(long, value_name = "CASE:GAMMA:PSI0")]
    pub variable: Vec<String>,
    /// Replace combinations of the same names instead of refusing.
    #[arg(long)]
    pub replace: bool,
}

fn generate_combinations(a: &GenerateArgs) -> Result<String, CliError> {
    use crate::study::actions::{ActionKind, fundamental_combinations};
    let mut project = load(&a.file)?;
    let actions = super::args::actions_of(&a.permanent, &a.variable)?;
    for action in &actions {
        if !project.cases.iter().any(|c| c.name == action.case) {
            let arg = match action.kind {
                ActionKind::Permanent { .. } => "--permanent",
                ActionKind::Variable { .. } => "--variable",
            };
            return Err(ArgError::new(
                arg,
                format!("'{}' is not a load case of the project", action.case),
            )
            .into());
        }
    }
    let all = fundamental_combinations(&actions).map_err(|e| {
        ArgError::new(
            if a.permanent.is_empty() {
                "--variable"
            } else {
                "--permanent"
            },
            e,
        )
    })?;
    let count = all.len();
    for combination in all {
        project
            .add_combination(combination, a.replace)
            .map_err(|e| match e {
                crate::study::StudyError::Duplicate(_) => ArgError::new(
                    "--replace",
                    format!("{e}; give --replace to write the generated combinations over it"),
                ),
                other => ArgError::new("FILE", other),
            })?;
    }
    save(&a.file, &project)?;
    Ok(format!(
        "wrote {}: {count} combinations of EN 1990 expression (6.10) from {} actions; the factors are yours, check them against the code that applies\n",
        a.file.display(),
        actions.len()
    ))
}

/// `project show`.
#[derive(Debug, Clone, Args)]
pub struct ShowArgs {
    /// The project file.
    pub file: PathBuf,
    /// Print the file's content as one JSON object.
    #[arg(long)]
    pub json: bool,
}

pub(super) fn load(file: &Path) -> Result<Project, ArgError> {
    study::load(file)
        .map(|(p, _)| p)
        .map_err(|e| ArgError::new("FILE", e))
}

fn save(file: &Path, project: &Project) -> Result<(), CliError> {
    study::save(file, project).map_err(|e| CliError::Other(anyhow::anyhow!("{e}")))
}

/// Runs the action.
pub fn run(args: &ProjectArgs) -> Result<String, CliError> {
    match &args.action {
        ProjectAction::New(a) => {
            let unit = a.unit;
            if a.file.exists() {
                return Err(ArgError::new(
                    "FILE",
                    format!("{} already exists; not overwritten", a.file.display()),
                )
                .into());
            }
            let convention = if a.compression_positive {
                SignConvention::CompressionPositive
            } else {
                SignConvention::TensionPositive
            };
            save(&a.file, &Project::new(&a.name, unit, convention))?;
            Ok(format!("wrote {}\n", a.file.display()))
        }
        ProjectAction::AddCase(a) => {
            let mut project = load(&a.file)?;
            let unit = project.unit().map_err(|e| ArgError::new("FILE", e))?;
            let extra = extra_input(a, &project)?;
            let given = [a.stress.is_some(), a.other.any(), extra.is_some()]
                .iter()
                .filter(|g| **g)
                .count();
            if given > 1 {
                return Err(ArgError::new(
                    "--stress",
                    "give one input: --stress, --in-situ, --principal, --plane-stress or --rosette",
                )
                .into());
            }
            let other = a.other.read(unit, project.compression_positive)?;
            let input = match (extra, &a.stress, other) {
                (Some(input), ..) | (None, None, Some((input, _))) => input,
                (None, Some(_), Some(_)) => {
                    return Err(ArgError::new(
                        "--stress",
                        "cannot be given together with --in-situ or --principal",
                    )
                    .into());
                }
                (None, Some(stress), None) => CaseInput::Tensor(TypedTensor {
                    unit: project.unit.clone(),
                    compression_positive: project.compression_positive,
                    components: parse::stress_list(stress)
                        .map_err(|e| ArgError::new("--stress", e))?,
                }),
                (None, None, None) => {
                    return Err(ArgError::new(
                        "--stress",
                        "is required (or --in-situ, --principal with --axes, --plane-stress or --rosette)",
                    )
                    .into());
                }
            };
            let case = LoadCase {
                unknown: crate::study::unknown::UnknownKeys::new(),
                name: a.name.trim().to_owned(),
                description: a.description.clone(),
                input,
            };
            // A name that is taken or malformed is the name's fault; anything else is the input's.
            let input_arg = if a.stress.is_some() {
                "--stress"
            } else if a.plane_stress.is_some() {
                "--plane-stress"
            } else if a.rosette.is_some() {
                "--rosette"
            } else if a.other.in_situ.is_some() {
                "--in-situ"
            } else {
                "--principal"
            };
            project.add_case(case, a.replace).map_err(|e| match e {
                study::StudyError::Duplicate(_)
                | study::StudyError::EmptyName
                | study::StudyError::EmptyProjectName
                | study::StudyError::NameWithSeparator(_) => ArgError::new("--name", e),
                other => ArgError::new(input_arg, other),
            })?;
            save(&a.file, &project)?;
            Ok(format!("wrote {}\n", a.file.display()))
        }
        ProjectAction::Combine(a) => {
            let mut project = load(&a.file)?;
            let terms = super::args::terms_of("--factors", &a.factors)?;
            let name = a.name.trim().to_owned();
            if terms.iter().any(|t| t.case == name) {
                return Err(ArgError::new(
                    "--factors",
                    format!("combination '{name}' names itself"),
                )
                .into());
            }
            project
                .add_combination(
                    Combination {
                        unknown: crate::study::unknown::UnknownKeys::new(),
                        name,
                        terms,
                    },
                    a.replace,
                )
                .map_err(|e| ArgError::new("--factors", e))?;
            save(&a.file, &project)?;
            Ok(format!("wrote {}\n", a.file.display()))
        }
        ProjectAction::GenerateCombinations(a) => generate_combinations(a),
        ProjectAction::SetMaterial(a) => set_material(a),
        ProjectAction::SetPorePressure(a) => {
            let mut project = load(&a.file)?;
            let unit = project.unit().map_err(|e| ArgError::new("FILE", e))?;
            project.measure.pore_pressure_pa = super::stress_value("VALUE", &a.value, unit)?;
            save(&a.file, &project)?;
            Ok(format!(
                "wrote {}: pore pressure {} {unit}\n",
                a.file.display(),
                sig(unit.from_pa(project.measure.pore_pressure_pa), 6)
            ))
        }
        ProjectAction::SetPlaneStrength(a) => {
            let mut project = load(&a.file)?;
            let unit = project.unit().map_err(|e| ArgError::new("FILE", e))?;
            if a.clear {
                project.measure.cohesion_pa = None;
                project.measure.friction_angle_deg = None;
                save(&a.file, &project)?;
                return Ok(format!(
                    "wrote {}: the planes' strength removed (their Coulomb checks are not checked)\n",
                    a.file.display()
                ));
            }
            let cohesion = a
                .cohesion
                .as_deref()
                .map(|t| super::stress_value("--cohesion", t, unit))
                .transpose()?;
            let friction = super::friction_deg(
                a.friction_angle.as_deref(),
                a.friction_coefficient.as_deref(),
            )?;
            let m = super::args::pair_material(cohesion, friction)?
                .ok_or_else(|| ArgError::new("--cohesion", "is required (or --clear)"))?;
            project.measure.cohesion_pa = Some(m.cohesion_pa);
            project.measure.friction_angle_deg = Some(m.friction_angle_deg);
            save(&a.file, &project)?;
            Ok(format!(
                "wrote {}: the planes' cohesion {} {unit}, friction angle {}° (μ = {})\n",
                a.file.display(),
                sig(unit.from_pa(m.cohesion_pa), 6),
                sig(m.friction_angle_deg, 6),
                sig(m.friction_angle_deg.to_radians().tan(), 6)
            ))
        }
        ProjectAction::SetCutPlane(a) => {
            let mut project = load(&a.file)?;
            project.plane = a.plane.read()?.ok_or_else(|| {
                ArgError::new("--normal", "is required (or --dip and --dip-direction)")
            })?;
            save(&a.file, &project)?;
            let (dip, dd) = project.plane.dip_deg();
            Ok(format!(
                "wrote {}: cut plane dip {}° / dip direction {}°\n",
                a.file.display(),
                sig(dip, 6),
                sig(dd, 6)
            ))
        }
        ProjectAction::SetMeasure(a) => {
            let mut project = load(&a.file)?;
            project.measure.measure = a.measure;
            save(&a.file, &project)?;
            Ok(format!(
                "wrote {}: worst-plane measure {}\n",
                a.file.display(),
                a.measure.key()
            ))
        }
        ProjectAction::AddFault(a) => {
            let mut project = load(&a.file)?;
            let faults = super::analyze::read_faults(&a.fault, &a.fault_strike)?;
            if faults.is_empty() {
                return Err(ArgError::new("--fault", "is required (or --fault-strike)").into());
            }
            for f in faults {
                if project.faults.iter().any(|g| g.name == f.name) {
                    return Err(ArgError::new(
                        "--fault",
                        format!("a fault named '{}' exists already", f.name),
                    )
                    .into());
                }
                project.faults.push(f);
            }
            save(&a.file, &project)?;
            Ok(format!("wrote {}\n", a.file.display()))
        }
        ProjectAction::RemoveFault(a) => {
            let mut project = load(&a.file)?;
            let before = project.faults.len();
            project.faults.retain(|f| f.name != a.name);
            if project.faults.len() == before {
                return Err(ArgError::new("--name", format!("no fault named '{}'", a.name)).into());
            }
            save(&a.file, &project)?;
            Ok(format!("wrote {}\n", a.file.display()))
        }
        ProjectAction::SetRevision(a) => {
            let mut project = load(&a.file)?;
            a.revision.trim().clone_into(&mut project.revision);
            save(&a.file, &project)?;
            Ok(format!(
                "wrote {}: revision {}\n",
                a.file.display(),
                project.revision
            ))
        }
        ProjectAction::Show(a) => {
            let (project, warnings) = study::load(&a.file).map_err(|e| ArgError::new("FILE", e))?;
            for w in warnings {
                eprintln!("planewise: warning: {w}");
            }
            if a.json {
                let mut text = std::fs::read_to_string(&a.file).map_err(anyhow::Error::from)?;
                if !text.ends_with('\n') {
                    text.push('\n');
                }
                return Ok(text);
            }
            show_text(&project)
        }
    }
}

/// Text from a file made safe for a terminal: control characters (escape sequences among them)
/// shown as `\u{…}` instead of acting on the terminal.
fn terminal_safe(text: &str) -> String {
    text.chars()
        .map(|c| {
            if c.is_control() {
                format!("\\u{{{:x}}}", u32::from(c))
            } else {
                c.to_string()
            }
        })
        .collect()
}

fn show_text(project: &Project) -> Result<String, CliError> {
    let unit = project.unit().map_err(|e| ArgError::new("FILE", e))?;
    let convention = project.convention();
    let mut s = String::new();
    let _ = writeln!(
        s,
        "Project: {} ({unit}, {convention}; components xx, yy, zz, xy, yz, zx)",
        terminal_safe(&project.name)
    );
    let _ = writeln!(s, "Load cases:");
    let tensors = project.all_tensors();
    for (case, (_, _, t)) in project.cases.iter().zip(&tensors) {
        let t = t.clone().map_err(|e| ArgError::new("FILE", e))?;
        let c = t
            .components_pa()
            .map(|v| sig(convention.sign() * unit.from_pa(v), 6));
        let _ = writeln!(
            s,
            "  {:<16} {}  {}",
            terminal_safe(&case.name),
            c.join(", "),
            terminal_safe(&case.description)
        );
    }
    let _ = writeln!(s, "Combinations (Σ factor × case tensor):");
    // Names padded to the longest (at least 16), so long generated names stay apart from
    // their terms.
    let width = project
        .combinations
        .iter()
        .map(|c| terminal_safe(&c.name).chars().count())
        .max()
        .unwrap_or(0)
        .max(16);
    for comb in &project.combinations {
        let terms: Vec<String> = comb
            .terms
            .iter()
            .map(|t| format!("{} × {}", sig(t.factor, 6), terminal_safe(&t.case)))
            .collect();
        let _ = writeln!(
            s,
            "  {:<width$} {}",
            terminal_safe(&comb.name),
            terms.join(" + ")
        );
    }
    Ok(s)
}

/// The plane-stress or rosette input of `add-case`, if one is given.
fn extra_input(a: &AddCaseArgs, project: &Project) -> Result<Option<CaseInput>, ArgError> {
    if let Some(text) = &a.plane_stress {
        let [sx, sy, txy] = parse::key_list(text, ["sx", "sy", "txy"])
            .map_err(|e| ArgError::new("--plane-stress", e))?;
        return Ok(Some(CaseInput::PlaneStress(study::PlaneStressInput {
            unit: project.unit.clone(),
            compression_positive: project.compression_positive,
            sx,
            sy,
            txy,
        })));
    }
    let Some(readings) = &a.rosette else {
        return Ok(None);
    };
    let strains = parse::numbers::<3>(readings).map_err(|e| ArgError::new("--rosette", e))?;
    let angles_deg =
        parse::numbers::<3>(&a.gauge_angles).map_err(|e| ArgError::new("--gauge-angles", e))?;
    let (modulus, modulus_unit) =
        super::rosette::modulus_as_typed(a.modulus.as_deref().unwrap_or_default())?;
    let input = CaseInput::Rosette(study::RosetteInput {
        angles_deg,
        strains,
        strain_unit: a.strain_unit.trim().to_owned(),
        modulus,
        modulus_unit: modulus_unit.symbol().to_owned(),
        poisson: parse::number(a.poisson.as_deref().unwrap_or_default())
            .map_err(|e| ArgError::new("--poisson", e))?,
    });
    input.tensor().map_err(|e| ArgError::new("--rosette", e))?;
    Ok(Some(input))
}

/// `project set-material`.
fn set_material(a: &SetMaterialArgs) -> Result<String, CliError> {
    let mut project = load(&a.file)?;
    let unit = project.unit().map_err(|e| ArgError::new("FILE", e))?;
    let (given, _) = a.strengths.read(unit, true)?;
    if a.strengths.pore_pressure.is_some() {
        return Err(ArgError::new(
            "--pore-pressure",
            "is the project's, not the material's: use `planewise project set-pore-pressure`",
        )
        .into());
    }
    let m = &mut project.material;
    if let Some(name) = &a.name {
        name.trim().clone_into(&mut m.name);
    }
    let s = &mut m.strengths;
    for (value, target) in [
        (given.yield_strength_pa, &mut s.yield_strength_pa),
        (given.tensile_strength_pa, &mut s.tensile_strength_pa),
        (
            given.compressive_strength_pa,
            &mut s.compressive_strength_pa,
        ),
        (given.cohesion_pa, &mut s.cohesion_pa),
        (given.friction_angle_deg, &mut s.friction_angle_deg),
    ] {
        if value.is_some() {
            *target = value;
        }
    }
    if let Some(fit) = a.strengths.dp_fit {
        s.dp_fit = fit;
    }
    for key in a.clear.iter().map(|k| k.trim()) {
        match key {
            "yield-strength" => s.yield_strength_pa = None,
            "tensile-strength" => s.tensile_strength_pa = None,
            "compressive-strength" => s.compressive_strength_pa = None,
            "cohesion" => s.cohesion_pa = None,
            "friction" | "friction-angle" => s.friction_angle_deg = None,
            other => {
                return Err(ArgError::new(
                    "--clear",
                    format!(
                        "'{other}' is not one of yield-strength, tensile-strength, compressive-strength, cohesion, friction"
                    ),
                )
                .into());
            }
        }
    }
    if s.cohesion_pa.is_some() != s.friction_angle_deg.is_some() {
        return Err(ArgError::new(
            "--cohesion",
            "the material's cohesion and friction angle go together (Mohr–Coulomb and Drucker–Prager need both)",
        )
        .into());
    }
    save(&a.file, &project)?;
    let text = |v: Option<f64>| {
        v.map_or_else(
            || "not given".to_owned(),
            |x| format!("{} {unit}", sig(unit.from_pa(x), 6)),
        )
    };
    let s = &project.material.strengths;
    Ok(format!(
        "wrote {}: yield {}, tensile {}, compressive {}, cohesion {}, friction {}\n",
        a.file.display(),
        text(s.yield_strength_pa),
        text(s.tensile_strength_pa),
        text(s.compressive_strength_pa),
        text(s.cohesion_pa),
        s.friction_angle_deg.map_or_else(
            || "not given".to_owned(),
            |phi| format!("{}° (μ = {})", sig(phi, 6), sig(phi.to_radians().tan(), 6))
        )
    ))
}
