//! `planewise project …`: create a project file, add load cases and combinations, show it.
//! Every change reads the file, checks the whole change, and only then writes the file
//! atomically; bad input leaves the file as it was.

use std::fmt::Write as _;
use std::path::{Path, PathBuf};

use clap::{Args, Subcommand};

use super::{ArgError, CliError, values};
use crate::format::sig;
use crate::mechanics::{SignConvention, StressUnit};
use crate::parse;
use crate::study::{self, CaseInput, Combination, LoadCase, Project, Term, TypedTensor};

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
    /// List the cases and combinations with their tensors.
    Show(ShowArgs),
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

/// `project show`.
#[derive(Debug, Clone, Args)]
pub struct ShowArgs {
    /// The project file.
    pub file: PathBuf,
    /// Print the file's content as one JSON object.
    #[arg(long)]
    pub json: bool,
}

fn load(file: &Path) -> Result<Project, ArgError> {
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
            let input = match (&a.stress, a.other.read(unit, project.compression_positive)?) {
                (Some(_), Some(_)) => {
                    return Err(ArgError::new(
                        "--stress",
                        "cannot be given together with --in-situ or --principal",
                    )
                    .into());
                }
                (None, Some((input, _))) => input,
                (Some(stress), None) => CaseInput::Tensor(TypedTensor {
                    unit: project.unit.clone(),
                    compression_positive: project.compression_positive,
                    components: parse::stress_list(stress)
                        .map_err(|e| ArgError::new("--stress", e))?,
                }),
                (None, None) => {
                    return Err(ArgError::new(
                        "--stress",
                        "is required (or --in-situ, or --principal with --axes)",
                    )
                    .into());
                }
            };
            let case = LoadCase {
                name: a.name.trim().to_owned(),
                description: a.description.clone(),
                input,
            };
            project
                .add_case(case, a.replace)
                .map_err(|e| ArgError::new("--name", e))?;
            save(&a.file, &project)?;
            Ok(format!("wrote {}\n", a.file.display()))
        }
        ProjectAction::Combine(a) => {
            let mut project = load(&a.file)?;
            let mut terms = Vec::new();
            for item in a
                .factors
                .split(',')
                .map(str::trim)
                .filter(|s| !s.is_empty())
            {
                let Some((case, factor)) = item.rsplit_once('=') else {
                    return Err(ArgError::new(
                        "--factors",
                        format!("item '{item}' is not of the form CASE=FACTOR"),
                    )
                    .into());
                };
                let factor = parse::number(factor).map_err(|e| {
                    ArgError::new("--factors", format!("factor of '{}' {e}", case.trim()))
                })?;
                terms.push(Term {
                    case: case.trim().to_owned(),
                    factor,
                });
            }
            if terms.is_empty() {
                return Err(ArgError::new("--factors", "no terms given").into());
            }
            let name = a.name.trim().to_owned();
            if terms.iter().any(|t| t.case == name) {
                return Err(ArgError::new(
                    "--factors",
                    format!("combination '{name}' names itself"),
                )
                .into());
            }
            project
                .add_combination(Combination { name, terms }, a.replace)
                .map_err(|e| ArgError::new("--factors", e))?;
            save(&a.file, &project)?;
            Ok(format!("wrote {}\n", a.file.display()))
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

fn show_text(project: &Project) -> Result<String, CliError> {
    let unit = project.unit().map_err(|e| ArgError::new("FILE", e))?;
    let convention = project.convention();
    let mut s = String::new();
    let _ = writeln!(
        s,
        "Project: {} ({unit}, {convention}; components xx, yy, zz, xy, yz, zx)",
        project.name
    );
    let _ = writeln!(s, "Load cases:");
    for case in &project.cases {
        let t = project
            .tensor(&case.name)
            .map_err(|e| ArgError::new("FILE", e))?;
        let c = t
            .components_pa()
            .map(|v| sig(convention.sign() * unit.from_pa(v), 6));
        let _ = writeln!(
            s,
            "  {:<16} {}  {}",
            case.name,
            c.join(", "),
            case.description
        );
    }
    let _ = writeln!(s, "Combinations (Σ factor × case tensor):");
    for comb in &project.combinations {
        let terms: Vec<String> = comb
            .terms
            .iter()
            .map(|t| format!("{} × {}", sig(t.factor, 6), t.case))
            .collect();
        let _ = writeln!(s, "  {:<16} {}", comb.name, terms.join(" + "));
    }
    Ok(s)
}
