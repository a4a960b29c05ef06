//! `planewise map`: every plane orientation on a lower-hemisphere equal-area projection,
//! coloured by a measure, as SVG or PNG.

use std::path::PathBuf;

use clap::Args;

use super::worst_plane::MeasureArgs;
use super::{ArgError, CliError, PlaneArgs, ProjectView, StressArgs, values};
use crate::mechanics::search::worst_plane;
use crate::output::export::{self, ImageFormat};
use crate::picture::figures::{self, FigureInput};

/// Arguments of `planewise map`.
#[derive(Debug, Clone, Args)]
pub struct MapArgs {
    #[command(flatten)]
    pub stress: StressArgs,
    #[command(flatten)]
    pub measure: MeasureArgs,
    #[command(flatten)]
    pub plane: PlaneArgs,
    /// Output file; .svg or .png.
    #[arg(long, value_name = "FILE")]
    pub out: PathBuf,
    #[command(flatten)]
    pub print: values::PrintArgs,
    #[command(flatten)]
    pub title: values::TitleArgs,
    /// Image size in pixels, WIDTHxHEIGHT.
    #[arg(long, value_name = "WxH", default_value = "1200x900", value_parser = values::size, allow_hyphen_values = true)]
    pub size: (u32, u32),
    /// Colour the map from MIN to MAX (in the stress unit for stress measures) instead of the
    /// data's range, so one extreme value does not flatten the map.
    #[arg(long, value_name = "MIN,MAX", allow_hyphen_values = true)]
    pub range: Option<String>,
    /// Map cells per side (16 to 1024).
    #[arg(long, value_name = "N", default_value = "256", value_parser = clap::value_parser!(u16).range(16..=1024), allow_hyphen_values = true)]
    pub resolution: u16,
}

/// Runs the subcommand.
pub fn run(args: &MapArgs) -> Result<String, CliError> {
    let input = args.stress.read()?;
    let view = args.stress.project_view()?;
    let settings = args.measure.read(&input, view.as_ref())?;
    let plane = args.plane.read()?.or(view.as_ref().map(|v| v.plane));
    let (w, h) = args.size;
    let resolution = usize::from(args.resolution);
    ImageFormat::from_path(&args.out).map_err(|e| ArgError::new("--out", e))?;
    if let Some(project) = &args.stress.project {
        crate::study::atomic::not_an_input(&args.out, &[project.as_path()])
            .map_err(|e| ArgError::new("--out", e))?;
    }
    let worst = worst_plane(&input.tensor, &settings).map_err(|e| ArgError::new("--measure", e))?;
    let map_range = args
        .range
        .as_deref()
        .map(|text| {
            let [a, b] =
                crate::text::parse::numbers::<2>(text).map_err(|e| ArgError::new("--range", e))?;
            if a >= b {
                return Err(ArgError::new("--range", "MIN must be below MAX"));
            }
            let to = |v: f64| {
                if settings.measure.is_stress() {
                    // Map values are already in the display convention.
                    input.unit.to_pa(v)
                } else {
                    v
                }
            };
            Ok((to(a), to(b)))
        })
        .transpose()?;
    let figure = FigureInput {
        tensor: input.tensor,
        unit: input.unit,
        convention: input.convention,
        plane,
        search: Some(settings),
        worst: Some(worst),
        envelope: None,
        map_range,
        notes: view.as_ref().map(|v| v.notes.clone()).unwrap_or_default(),
    };
    let sizes = args.print.sizes(w, h);
    let frame = super::titled(
        &args.title,
        view.as_ref(),
        &figure,
        crate::study::annotations::FigureKind::Map,
        sizes.text,
        [w, h],
        |h| figures::map(&figure, &settings, resolution, w, h, sizes),
    );
    export::write_figure(&args.out, &frame, &ProjectView::title(view.as_ref()))
        .map_err(anyhow::Error::from)?;
    Ok(format!("wrote {}\n", args.out.display()))
}
