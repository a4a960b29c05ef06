//! `planewise report`: the calculation report of a project as one self-contained HTML file.

use std::path::PathBuf;

use clap::Args;

use super::{ArgError, CliError};
use crate::output::report::{ReportFigure, ReportOptions, html};

/// Arguments of `planewise report`.
#[derive(Debug, Clone, Args)]
pub struct ReportArgs {
    /// The project file.
    #[arg(long, value_name = "FILE")]
    pub project: PathBuf,
    /// The HTML file to write.
    #[arg(long, value_name = "FILE")]
    pub out: PathBuf,
    /// Cases and combinations to report, comma-separated (default: all).
    #[arg(long, value_name = "NAME,…", value_delimiter = ',')]
    pub cases: Vec<String>,
    /// Figures per case, comma-separated.
    #[arg(
        long,
        value_name = "LIST",
        value_delimiter = ',',
        default_value = "3d,mohr"
    )]
    pub figures: Vec<ReportFigure>,
}

/// Runs the subcommand.
pub fn run(args: &ReportArgs) -> Result<String, CliError> {
    let (project, _) =
        crate::study::load(&args.project).map_err(|e| ArgError::new("--project", e))?;
    let ext = args.out.extension().and_then(|e| e.to_str()).unwrap_or("");
    if !ext.eq_ignore_ascii_case("html") && !ext.eq_ignore_ascii_case("htm") {
        return Err(ArgError::new("--out", "the report is HTML: name the file .html").into());
    }
    crate::study::atomic::not_an_input(&args.out, &[args.project.as_path()])
        .map_err(|e| ArgError::new("--out", e))?;
    let source = crate::output::report::SourceFile::read(&args.project)
        .map_err(|e| ArgError::new("--project", format!("{}: {e}", args.project.display())))?;
    let options = ReportOptions {
        cases: args.cases.iter().map(|c| c.trim().to_owned()).collect(),
        figures: args.figures.clone(),
        source: Some(source),
        ..ReportOptions::default()
    };
    let text = html(&project, &options).map_err(|e| ArgError::new("--cases", e))?;
    crate::study::atomic::write_atomic(&args.out, text.as_bytes()).map_err(anyhow::Error::from)?;
    Ok(format!("wrote {}\n", args.out.display()))
}
