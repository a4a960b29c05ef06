//! The command line: `planewise analyze` and the other subcommands.
//!
//! Every value argument is taken as text and parsed here, so that a bad value is reported with
//! the argument's name and what is wrong, on one line, with exit status 2 and nothing on stdout.

pub mod analyze;
pub mod args;
pub mod batch;
pub mod cycles;
pub mod envelope;
pub mod explain;
pub mod fatigue;
pub mod figure;
pub mod map;
pub mod mohr;
pub mod project;
pub mod report;
pub mod rosette;
pub mod values;
pub mod worst_plane;

pub use args::{
    InputArgs, PlaneArgs, ProjectView, StressArgs, StressInput, friction_deg, stress_value,
};

use clap::{Parser, Subcommand};

use crate::mechanics::StressUnit;

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
    /// Load cases as tables: the id columns the --table file and the --table-case files join
    /// on (e.g. element,ip).
    #[arg(long, value_name = "COLUMN,…", requires = "table")]
    pub table_ids: Option<String>,
    /// The load case of the --table file, with --table-ids.
    #[arg(long, value_name = "CASE", requires = "table_ids")]
    pub table_as: Option<String>,
    /// Another load-case table, CASE=FILE, with --table-ids. Repeat for each.
    #[arg(long, value_name = "CASE=FILE", requires = "table_ids")]
    pub table_case: Vec<String>,
    /// Open the window's Fatigue tab on this history (time, then the six components) and judge
    /// it with --fatigue-unit and --fatigue-limits.
    #[arg(long, value_name = "FILE", requires_all = ["fatigue_unit", "fatigue_limits"])]
    pub fatigue_history: Option<String>,
    /// The unit of the --fatigue-history file.
    #[arg(long, value_name = "UNIT", requires = "fatigue_history", value_parser = values::unit)]
    pub fatigue_unit: Option<StressUnit>,
    /// The fully reversed bending and torsion fatigue limits f₋₁,t₋₁ in --fatigue-unit.
    #[arg(long, value_name = "F,T", requires = "fatigue_history")]
    pub fatigue_limits: Option<String>,
    /// Finite life in the Fatigue tab: the torsion S–N curve τ'f,b.
    #[arg(
        long,
        value_name = "TAUF,B",
        requires = "fatigue_history",
        allow_hyphen_values = true
    )]
    pub fatigue_sn: Option<String>,
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
    /// A load history judged on its critical plane: Findley, Matake, McDiarmid or Dang Van
    /// from the fatigue limits, and finite life by rainflow and Miner's rule; one point, or
    /// every point of load-case tables ranked.
    #[command(after_long_help = CONVENTIONS)]
    Fatigue(fatigue::FatigueArgs),
    /// Rainflow counting (ASTM E1049-85) of one column of a CSV: ranges, means and counts.
    #[command(after_long_help = CAUTION)]
    Cycles(cycles::CyclesArgs),
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
        Command::Fatigue(args) => fatigue::run(args),
        Command::Cycles(args) => cycles::run(args),
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
