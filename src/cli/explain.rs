//! `planewise explain`: the walk-through of a load case as a folder of numbered annotated
//! figures and one HTML page with the captions, to show a colleague or put in a report.

use std::fmt::Write as _;
use std::path::PathBuf;

use clap::Args;

use super::{ArgError, CliError, PlaneArgs, StressArgs, values};
use crate::output::export::ImageFormat;
use crate::output::walkthrough::steps;
use crate::picture::draw::svg::escape;
use crate::picture::figures;
use crate::study::{Derived, Project};

/// Arguments of `planewise explain`.
#[derive(Debug, Clone, Args)]
pub struct ExplainArgs {
    #[command(flatten)]
    pub stress: StressArgs,
    #[command(flatten)]
    pub plane: PlaneArgs,
    /// The folder to write the figures and index.html into (created if missing).
    #[arg(long, value_name = "DIR")]
    pub out: PathBuf,
    /// Figure size in pixels, WIDTHxHEIGHT.
    #[arg(long, value_name = "WxH", default_value = "1280x900", value_parser = values::size, allow_hyphen_values = true)]
    pub size: (u32, u32),
    /// Figure format: svg or png.
    #[arg(long, value_name = "FORMAT", default_value = "svg")]
    pub format: String,
    /// Replace files of the same names already in the folder (without it, existing files are
    /// left alone and nothing is written).
    #[arg(long)]
    pub replace: bool,
}

/// The project the walk-through explains: the named case of `--project`, or a one-case project
/// holding the typed `--stress` (its cut plane from `--normal`/`--dip` when given).
fn state(args: &ExplainArgs) -> Result<Project, ArgError> {
    let plane = args.plane.read()?;
    let mut project = if let (Some(file), Some(case)) = (&args.stress.project, &args.stress.case) {
        let (mut p, _) = crate::study::load(file).map_err(|e| ArgError::new("--project", e))?;
        if !p.name_used(case) {
            return Err(super::no_such_case(&p, case));
        }
        p.active.clone_from(case);
        p
    } else {
        // The same one-case project `analyze --stress` reads (typed in pascals: nothing lost).
        super::analyze::ad_hoc_project(&args.stress.read()?)
    };
    if let Some(n) = plane {
        project.plane = n;
    }
    Ok(project)
}

/// Runs the subcommand; prints the files written.
pub fn run(args: &ExplainArgs) -> Result<String, CliError> {
    let format = match args.format.trim().to_ascii_lowercase().as_str() {
        "svg" => ImageFormat::Svg,
        "png" => ImageFormat::Png,
        other => {
            return Err(ArgError::new("--format", format!("'{other}' is not svg or png")).into());
        }
    };
    let ext = match format {
        ImageFormat::Svg => "svg",
        ImageFormat::Png => "png",
    };
    let project = state(args)?;
    let d = Derived::new(&project);
    if let Some(problem) = &d.problem {
        return Err(ArgError::new("--case", problem).into());
    }
    // Every file this run writes: refused over an input always, over an existing file unless
    // --replace — before anything is written.
    let names: Vec<String> = steps(&d)
        .iter()
        .enumerate()
        .map(|(i, step)| format!("{:02}-{}.{ext}", i + 1, step.kind.slug()))
        .chain(std::iter::once("index.html".to_owned()))
        .collect();
    for name in &names {
        let path = args.out.join(name);
        if let Some(input) = &args.stress.project {
            crate::study::atomic::not_an_input(&path, &[input.as_path()])
                .map_err(|e| ArgError::new("--out", e))?;
        }
        if !args.replace && path.exists() {
            return Err(ArgError::new(
                "--out",
                format!(
                    "{} exists already: nothing written (give --replace to replace the walk-through's files)",
                    path.display()
                ),
            )
            .into());
        }
    }
    // A folder that cannot be made is a failure to write (exit 1), as for every other command.
    std::fs::create_dir_all(&args.out)
        .map_err(|e| anyhow::anyhow!("could not make {}: {e}", args.out.display()))?;
    let (w, h) = args.size;
    let sizes = crate::picture::draw::Sizes::for_export(w as f32, h as f32);
    let title = format!("{} — {}", project.name, d.name);
    let mut html = String::new();
    let _ = write!(
        html,
        "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>Walk-through: {}</title>\n<style>body{{font-family:sans-serif;max-width:60rem;margin:2rem auto;line-height:1.45;color:#22262e}} img{{width:100%;border:1px solid #ccc}} .caution{{border:1px solid #b33;padding:.5rem 1rem;background:#fdf3f3}}</style></head><body>\n<h1>Walk-through: {}</h1>\n<p class=\"caution\">{}</p>\n",
        escape(&title),
        escape(&title),
        escape(crate::SAFETY_NOTE)
    );
    let mut written = Vec::new();
    for (i, step) in steps(&d).iter().enumerate() {
        let heading = format!("{}. {}", i + 1, step.title);
        let lines = vec![heading.clone(), step.text.clone()];
        let frame = figures::titled(&lines, sizes.text, [w, h], |h| {
            crate::output::walkthrough::step_figure(&d, step, w, h, sizes)
        });
        let name = format!("{:02}-{}.{ext}", i + 1, step.kind.slug());
        let path = args.out.join(&name);
        crate::output::export::write_figure(&path, &frame, &title).map_err(anyhow::Error::from)?;
        let _ = write!(
            html,
            "<section>\n<h2>{}</h2>\n<img src=\"{}\" alt=\"{}\">\n<p>{}</p>\n</section>\n",
            escape(&heading),
            escape(&name),
            escape(&step.title),
            escape(&step.text)
        );
        written.push(path);
    }
    html.push_str("</body></html>\n");
    let index = args.out.join("index.html");
    crate::study::atomic::write_atomic(&index, html.as_bytes()).map_err(anyhow::Error::from)?;
    written.push(index);
    let mut said = String::new();
    for p in &written {
        let _ = writeln!(said, "wrote {}", p.display());
    }
    Ok(said)
}
