//! The command line: `planewise analyze` and the other subcommands.
//!
//! Every value argument is taken as text and parsed here, so that a bad value is reported with
//! the argument's name and what is wrong, on one line, with exit status 2 and nothing on stdout.

pub mod analyze;
pub mod batch;
pub mod envelope;
pub mod explain;
pub mod figure;
pub mod map;
pub mod mohr;
pub mod project;
pub mod report;
pub mod rosette;
pub mod values;
pub mod worst_plane;

use std::path::Path;

use clap::{Args, Parser, Subcommand};

use crate::mechanics::{PlaneNormal, SignConvention, StressTensor, StressUnit};
use crate::text::parse;

const CONVENTIONS: &str = "\
Conventions: stresses are tension-positive unless --compression-positive is given, in which case \
the components you type and every stress printed are compression-positive and σ1 is the most \
compressive principal stress. Axes x, y, z are right-handed; for dip and dip direction x = east, \
y = north, z = up, and the dip direction is measured clockwise from north. The traction \
t = σ·n is what the material on the side n points into exerts on the material behind the \
plane; the shear direction is its tangential part in tension-positive physics whatever the \
convention (with n pointing up: the hanging wall's slip). The rake is the angle in the plane \
from strike (dip direction − 90°) to that slip, −180° to 180°, reverse +90°, normal −90° \
(Aki & Richards 1980). Triaxiality is σm/σvM on the tension-positive mean stress.

Planewise is an aid for engineers. Check inputs and results independently; design decisions \
follow the applicable codes and licensed engineering practice.";

/// The caution alone, after the help of subcommands that take no stress convention.
const CAUTION: &str = "\
Planewise is an aid for engineers. Check inputs and results independently; design decisions \
follow the applicable codes and licensed engineering practice.";

/// The program's command line.
#[derive(Debug, Parser)]
#[command(name = "planewise", version, about = "Stress at a point: principal stresses, tractions, criteria.", after_long_help = CAUTION)]
pub struct Cli {
    /// What to do; without a subcommand the desktop window opens.
    #[command(subcommand)]
    pub command: Option<Command>,
    /// Open the window on the demo project (or --project), write a PNG of it to PATH once the
    /// first frame is complete, and exit (for README images and smoke tests).
    #[arg(long, value_name = "PATH")]
    pub screenshot: Option<std::path::PathBuf>,
    /// The picture the window opens on.
    #[arg(long, value_name = "TAB")]
    pub tab: Option<crate::window::session::Central>,
    /// Open the window on this project file.
    #[arg(long, value_name = "FILE")]
    pub project: Option<std::path::PathBuf>,
    /// Open the window's Table tab on this finite-element table: its preview and column
    /// mapping; choose the table's unit there, then read and rank it.
    #[arg(long, value_name = "FILE")]
    pub table: Option<std::path::PathBuf>,
    /// The unit of the --table file's components; given, the table is read and ranked at once
    /// (von Mises, tension positive; change them in the tab).
    #[arg(long, value_name = "UNIT", requires = "table", value_parser = values::unit)]
    pub table_unit: Option<StressUnit>,
}

/// The subcommands.
#[derive(Debug, Subcommand)]
pub enum Command {
    /// Principal stresses, invariants, equivalent stresses and (optionally) the traction on one plane.
    #[command(after_long_help = CONVENTIONS)]
    Analyze(analyze::AnalyzeArgs),
    /// The annotated 3D view (cube, tractions, cut plane, principal axes) as SVG or PNG.
    #[command(after_long_help = CONVENTIONS)]
    Figure(figure::FigureArgs),
    /// The plane orientation(s) on which a measure (shear, slip tendency, Mohr–Coulomb…) is
    /// largest, or smallest for normal-min.
    #[command(after_long_help = CONVENTIONS)]
    WorstPlane(worst_plane::WorstPlaneArgs),
    /// Every plane orientation on an equal-area projection, coloured by a measure, as SVG or PNG.
    #[command(after_long_help = CONVENTIONS)]
    Map(map::MapArgs),
    /// The three Mohr circles with the admissible region, the cut plane's point, the worst planes
    /// of a measure and the Mohr–Coulomb envelope, as SVG or PNG.
    #[command(after_long_help = CONVENTIONS)]
    Mohr(mohr::MohrArgs),
    /// Create a project file and add load cases and factored combinations to it.
    #[command(after_long_help = CAUTION)]
    Project(project::ProjectArgs),
    /// One measure over every load case and combination of a project, worst first.
    #[command(after_long_help = CAUTION)]
    Envelope(envelope::EnvelopeArgs),
    /// Three strain-gauge readings on a free surface: strains, principal strains and angle, and
    /// the plane-stress state with its analysis.
    #[command(after_long_help = CAUTION)]
    Rosette(rosette::RosetteArgs),
    /// The calculation report of a project: one self-contained HTML file to print and sign.
    #[command(after_long_help = CAUTION)]
    Report(report::ReportArgs),
    /// The walk-through of a load case (element, cut plane, principal and largest-shear planes,
    /// worst plane, verdict) as numbered annotated figures and an HTML page with the captions.
    #[command(after_long_help = CONVENTIONS)]
    Explain(explain::ExplainArgs),
    /// A finite-element result table (one stress state per row) ranked by a measure, worst
    /// first, streaming: the top N or every row, as CSV or JSON.
    #[command(after_long_help = CONVENTIONS)]
    Batch(batch::BatchArgs),
}

/// `--case` names nothing in the project: said with the names it has.
#[must_use]
pub fn no_such_case(project: &crate::study::Project, case: &str) -> ArgError {
    const SHOWN: usize = 12;
    let names: Vec<&str> = project
        .cases
        .iter()
        .map(|c| c.name.as_str())
        .chain(project.combinations.iter().map(|c| c.name.as_str()))
        .collect();
    let list = if names.is_empty() {
        "the project has none".to_owned()
    } else if names.len() > SHOWN {
        format!(
            "the project has {}, … ({} in all; planewise project show lists them)",
            names[..SHOWN].join(", "),
            names.len()
        )
    } else {
        format!("the project has {}", names.join(", "))
    };
    ArgError::new(
        "--case",
        format!("no load case or combination named '{case}' ({list})"),
    )
}

/// The names of every subcommand, for messages (from the command definitions).
#[must_use]
pub fn subcommand_names() -> Vec<String> {
    use clap::CommandFactory as _;
    Cli::command()
        .get_subcommands()
        .map(|c| c.get_name().to_owned())
        .collect()
}

/// The stress state, as every subcommand takes it.
#[derive(Debug, Clone, Args)]
pub struct StressArgs {
    /// Components as key=value pairs, e.g. xx=120,yy=-35,zz=15,xy=48,yz=-12,zx=22. Omitted
    /// components are 0; yx, zy, xz are accepted for xy, yz, zx. Or --project with --case.
    #[arg(long, value_name = "KEY=VALUE,…", allow_hyphen_values = true)]
    pub stress: Option<String>,
    /// Unit of every stress typed and printed, exactly as written: Pa, kPa, MPa, GPa, bar, psi
    /// or ksi (N/mm² and N/mm2 are read as MPa).
    /// [default: MPa, or the project's unit with --project]
    #[arg(long, value_name = "UNIT", value_parser = values::unit)]
    pub unit: Option<StressUnit>,
    /// Stresses typed and printed are compression-positive (geomechanics).
    #[arg(long)]
    pub compression_positive: bool,
    #[command(flatten)]
    pub other: InputArgs,
    /// Take the state from this project file (with --case) instead of --stress.
    #[arg(long, value_name = "FILE", requires = "case")]
    pub project: Option<std::path::PathBuf>,
    /// The load case or combination of --project.
    #[arg(long, value_name = "NAME", requires = "project")]
    pub case: Option<String>,
}

impl StressArgs {
    /// The unit given with `--unit`, or `default`.
    #[must_use]
    pub fn unit_or(&self, default: StressUnit) -> StressUnit {
        self.unit.unwrap_or(default)
    }

    /// The state of load case or combination `case` of the project in `file` (shown in the
    /// project's unit and convention unless `--unit` or `--compression-positive` say otherwise);
    /// `--stress` must then be absent.
    pub fn read_from_project(&self, file: &Path, case: &str) -> Result<StressInput, ArgError> {
        if self.stress.is_some() {
            return Err(ArgError::new(
                "--stress",
                "cannot be given together with --project",
            ));
        }
        if self.other.any() {
            return Err(ArgError::new(
                "--project",
                "cannot be given together with --in-situ or --principal",
            ));
        }
        let (project, _) = crate::study::load(file).map_err(|e| ArgError::new("--project", e))?;
        let tensor = project.tensor(case).map_err(|e| {
            if project.name_used(case) {
                ArgError::new("--case", e)
            } else {
                no_such_case(&project, case)
            }
        })?;
        let project_unit = project.unit().map_err(|e| ArgError::new("--project", e))?;
        let convention = if self.compression_positive {
            SignConvention::CompressionPositive
        } else {
            project.convention()
        };
        Ok(StressInput {
            tensor,
            unit: self.unit_or(project_unit),
            convention,
        })
    }
}

/// The state given some other way than six components.
#[derive(Debug, Clone, Args, Default)]
pub struct InputArgs {
    /// In-situ stresses instead of --stress, compression positive in the stress unit:
    /// sv=…,shmax=…,shmin=…,azimuth=DEG (SHmax's azimuth clockwise from north; x = east,
    /// y = north, z = up).
    #[arg(long, value_name = "KEY=VALUE,…", allow_hyphen_values = true)]
    pub in_situ: Option<String>,
    /// Principal values instead of --stress: s1=…,s2=…,s3=… (s1 ≥ s2 ≥ s3 in the chosen
    /// convention); needs --axes.
    #[arg(
        long,
        value_name = "KEY=VALUE,…",
        allow_hyphen_values = true,
        requires = "axes"
    )]
    pub principal: Option<String>,
    /// The σ1 and σ3 axes for --principal: 1=TREND/PLUNGE,3=TREND/PLUNGE in degrees (trend
    /// clockwise from north, plunge down); σ2 completes a right-handed set.
    #[arg(long, value_name = "1=T/P,3=T/P", requires = "principal")]
    pub axes: Option<String>,
}

impl InputArgs {
    /// The input and its tensor, if one of these forms is given (stresses in `unit`; principal
    /// values in the convention `compression_positive` says).
    pub fn read(
        &self,
        unit: StressUnit,
        compression_positive: bool,
    ) -> Result<Option<(crate::study::CaseInput, StressTensor)>, ArgError> {
        use crate::study::{CaseInput, InSituInput, PrincipalInput};
        let input = if let Some(text) = &self.in_situ {
            let [sv, shmax, shmin, azimuth_deg] =
                parse::key_list(text, ["sv", "shmax", "shmin", "azimuth"])
                    .map_err(|e| ArgError::new("--in-situ", e))?;
            CaseInput::InSitu(InSituInput {
                unit: unit.symbol().to_owned(),
                sv,
                shmax,
                shmin,
                azimuth_deg,
            })
        } else if let Some(text) = &self.principal {
            let values = parse::key_list(text, ["s1", "s2", "s3"])
                .map_err(|e| ArgError::new("--principal", e))?;
            let axes = self.axes.as_deref().unwrap_or_default();
            let mut found: [Option<[f64; 2]>; 2] = [None, None];
            for item in axes.split(',').map(str::trim).filter(|s| !s.is_empty()) {
                let bad = || {
                    ArgError::new(
                        "--axes",
                        format!("'{item}' is not 1=TREND/PLUNGE or 3=TREND/PLUNGE"),
                    )
                };
                let (key, value) = item.split_once('=').ok_or_else(bad)?;
                let (trend, plunge) = value.split_once('/').ok_or_else(bad)?;
                let i = match key.trim() {
                    "1" => 0,
                    "3" => 1,
                    _ => return Err(bad()),
                };
                let number = |t: &str| parse::number(t).map_err(|e| ArgError::new("--axes", e));
                found[i] = Some([number(trend)?, number(plunge)?]);
            }
            let [Some(axis1), Some(axis3)] = found else {
                return Err(ArgError::new(
                    "--axes",
                    "needs both 1=TREND/PLUNGE and 3=TREND/PLUNGE",
                ));
            };
            CaseInput::Principal(PrincipalInput {
                unit: unit.symbol().to_owned(),
                compression_positive,
                values,
                axis1,
                axis3,
            })
        } else {
            return Ok(None);
        };
        let tensor = input.tensor().map_err(|e| {
            use crate::mechanics::inputs::InputError;
            let arg = match &e {
                _ if self.in_situ.is_some() => "--in-situ",
                crate::study::StudyError::Input(
                    InputError::NotPerpendicular(_) | InputError::Plunge(_),
                ) => "--axes",
                _ => "--principal",
            };
            ArgError::new(arg, e)
        })?;
        Ok(Some((input, tensor)))
    }

    /// Whether any form is given.
    #[must_use]
    pub fn any(&self) -> bool {
        self.in_situ.is_some() || self.principal.is_some()
    }
}

/// What a project gives the figure and plane subcommands besides the tensor: its name and the
/// case for titles, and the saved cut plane and measure, used wherever the command line does not
/// say otherwise — so `figure|map|mohr --project F --case C` draw what the window shows.
#[derive(Debug, Clone)]
pub struct ProjectView {
    /// The project's name.
    pub name: String,
    /// The load case or combination.
    pub case: String,
    /// The saved cut plane.
    pub plane: crate::mechanics::PlaneNormal,
    /// The saved measure, pore pressure and the planes' strength as saved.
    pub measure: crate::study::MeasureChoice,
    /// The search settings the window uses (the planes' c and φ, else the material's).
    pub search: crate::mechanics::search::SearchSettings,
    /// The case's captions and pinned notes.
    pub notes: Vec<crate::study::annotations::Annotation>,
}

impl ProjectView {
    /// The figure title (project, case and the caution).
    #[must_use]
    pub fn title(view: Option<&Self>) -> String {
        crate::picture::figures::title(view.map(|v| (v.name.as_str(), v.case.as_str())))
    }
}

impl StressArgs {
    /// The project's names, cut plane and measure with `--project`, else `None`.
    pub fn project_view(&self) -> Result<Option<ProjectView>, ArgError> {
        let (Some(file), Some(case)) = (&self.project, &self.case) else {
            return Ok(None);
        };
        let (project, _) = crate::study::load(file).map_err(|e| ArgError::new("--project", e))?;
        let search = project.search_settings();
        Ok(Some(ProjectView {
            search,
            name: project.name,
            case: case.clone(),
            plane: project.plane,
            measure: project.measure,
            notes: project
                .annotations
                .iter()
                .filter(|a| &a.case == case)
                .cloned()
                .collect(),
        }))
    }
}

/// The figure `build` draws at a height, with the figure's captions and the title block (when
/// `title` asks for one) below it; the whole keeps `height` pixels.
pub fn titled(
    title: &values::TitleArgs,
    view: Option<&ProjectView>,
    figure: &crate::picture::figures::FigureInput,
    kind: crate::study::annotations::FigureKind,
    text_px: f32,
    size: [u32; 2],
    build: impl Fn(u32) -> crate::picture::draw::Frame,
) -> crate::picture::draw::Frame {
    use crate::picture::figures;
    let mut lines = figure.captions(kind);
    if title.wanted() {
        lines.extend(figures::title_block_lines(
            title.title.as_deref(),
            view.map(|v| (v.name.as_str(), v.case.as_str())),
            figure,
            &crate::output::report::today(),
        ));
    }
    figures::titled(&lines, text_px, size, build)
}

/// The tensor, unit and convention read from [`StressArgs`].
#[derive(Debug, Clone, Copy)]
pub struct StressInput {
    /// The tensor, stored tension-positive in pascals.
    pub tensor: StressTensor,
    /// The unit of every stress typed and printed.
    pub unit: StressUnit,
    /// The sign convention of every stress typed and printed.
    pub convention: SignConvention,
}

impl StressArgs {
    /// Reads and checks the arguments.
    pub fn read(&self) -> Result<StressInput, ArgError> {
        if let (Some(file), Some(case)) = (&self.project, &self.case) {
            return self.read_from_project(file, case);
        }
        let unit = self.unit_or(StressUnit::MPa);
        let convention = if self.compression_positive {
            SignConvention::CompressionPositive
        } else {
            SignConvention::TensionPositive
        };
        if self.other.any() {
            if self.stress.is_some() {
                return Err(ArgError::new(
                    "--stress",
                    "cannot be given together with --in-situ or --principal",
                ));
            }
            let (_, tensor) = self
                .other
                .read(unit, self.compression_positive)?
                .ok_or_else(|| ArgError::new("--stress", "is required"))?;
            return Ok(StressInput {
                tensor,
                unit,
                convention,
            });
        }
        let Some(stress) = &self.stress else {
            return Err(ArgError::new(
                "--stress",
                "is required (key=value pairs such as xx=120,xy=-35), or --in-situ, --principal with --axes, or --project with --case",
            ));
        };
        let values = parse::stress_list(stress).map_err(|e| ArgError::new("--stress", e))?;
        let tensor = StressTensor::from_components(values, unit, convention.sign())
            .map_err(|e| ArgError::new("--stress", e))?;
        Ok(StressInput {
            tensor,
            unit,
            convention,
        })
    }
}

/// Parses a stress typed in `unit` (pore pressure, cohesion) and converts it to pascals; the
/// same limit as the tensor's components applies.
pub fn stress_value(arg: &'static str, text: &str, unit: StressUnit) -> Result<f64, ArgError> {
    let value = parse::number(text).map_err(|e| ArgError::new(arg, e))?;
    let pa = unit.to_pa(value);
    // `parse::number` only returns finite numbers, so the product is finite or ±inf.
    if pa.abs() > crate::mechanics::tensor::MAX_STRESS_PA {
        return Err(ArgError::new(
            arg,
            format!(
                "'{}' is out of range (magnitude above 1e30 Pa)",
                text.trim()
            ),
        ));
    }
    Ok(pa)
}

/// The friction angle φ in degrees from `--friction-angle DEG` or `--friction-coefficient MU`
/// (φ = atan μ; one or the other, not both).
pub fn friction_deg(
    angle: Option<&str>,
    coefficient: Option<&str>,
) -> Result<Option<f64>, ArgError> {
    match (angle, coefficient) {
        (Some(_), Some(_)) => Err(ArgError::new(
            "--friction-coefficient",
            "give the friction angle or the friction coefficient, not both",
        )),
        (Some(t), None) => parse::number(t)
            .map(Some)
            .map_err(|e| ArgError::new("--friction-angle", e)),
        (None, Some(t)) => {
            let mu = parse::number(t).map_err(|e| ArgError::new("--friction-coefficient", e))?;
            if mu < 0.0 {
                return Err(ArgError::new(
                    "--friction-coefficient",
                    format!("μ = {mu} must be zero or positive"),
                ));
            }
            Ok(Some(mu.atan().to_degrees()))
        }
        (None, None) => Ok(None),
    }
}

/// A plane given by its normal or by dip and dip direction.
#[derive(Debug, Clone, Args)]
pub struct PlaneArgs {
    /// The plane's normal as x,y,z (normalised; need not be unit length).
    #[arg(long, value_name = "X,Y,Z", allow_hyphen_values = true, conflicts_with_all = ["dip", "dip_direction"])]
    pub normal: Option<String>,
    /// The plane's dip in degrees, 0 (horizontal) to 90 (vertical); needs --dip-direction.
    #[arg(
        long,
        value_name = "DEG",
        allow_hyphen_values = true,
        requires = "dip_direction"
    )]
    pub dip: Option<String>,
    /// The plane's dip direction in degrees clockwise from north (x = east, y = north, z = up).
    #[arg(long, value_name = "DEG", allow_hyphen_values = true, requires = "dip")]
    pub dip_direction: Option<String>,
}

impl PlaneArgs {
    /// The plane, if one was given.
    pub fn read(&self) -> Result<Option<PlaneNormal>, ArgError> {
        if let Some(text) = &self.normal {
            let v = parse::numbers::<3>(text).map_err(|e| ArgError::new("--normal", e))?;
            return PlaneNormal::from_vector(v.into())
                .map(Some)
                .map_err(|e| ArgError::new("--normal", e));
        }
        let (Some(dip), Some(dd)) = (&self.dip, &self.dip_direction) else {
            return Ok(None);
        };
        let dip = parse::number(dip).map_err(|e| ArgError::new("--dip", e))?;
        let dd = parse::number(dd).map_err(|e| ArgError::new("--dip-direction", e))?;
        PlaneNormal::from_dip(dip, dd)
            .map(Some)
            .map_err(|e| ArgError::new("--dip", e))
    }
}

/// A command-line argument that cannot be used: which one, and why.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[error("{arg}: {message}")]
pub struct ArgError {
    /// The argument's name as typed, e.g. `--stress`.
    pub arg: &'static str,
    /// What is wrong.
    pub message: String,
}

impl ArgError {
    /// An error for argument `arg`.
    pub fn new(arg: &'static str, error: impl std::fmt::Display) -> Self {
        Self {
            arg,
            message: error.to_string(),
        }
    }
}

/// How a subcommand ended badly.
#[derive(Debug, thiserror::Error)]
pub enum CliError {
    /// Bad input: exit status 2.
    #[error(transparent)]
    Arg(#[from] ArgError),
    /// Anything else (a file that could not be written…): exit status 1.
    #[error(transparent)]
    Other(#[from] anyhow::Error),
}

/// Runs a subcommand and returns what it prints on stdout.
pub fn run(command: &Command) -> Result<String, CliError> {
    match command {
        Command::Analyze(args) => analyze::run(args),
        Command::Figure(args) => figure::run(args),
        Command::WorstPlane(args) => worst_plane::run(args),
        Command::Map(args) => map::run(args),
        Command::Mohr(args) => mohr::run(args),
        Command::Project(args) => project::run(args),
        Command::Envelope(args) => envelope::run(args),
        Command::Rosette(args) => rosette::run(args),
        Command::Report(args) => report::run(args),
        Command::Explain(args) => explain::run(args),
        Command::Batch(args) => batch::run(args),
    }
}
