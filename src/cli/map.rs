//! `planewise map`: every plane orientation on a lower-hemisphere equal-area projection,
//! coloured by a measure, as SVG or PNG.

use clap::Args;

use super::args::MeasureArgs;
use super::{ArgError, CliError, PlaneArgs, StressArgs, values};
use crate::mechanics::search::worst_plane;
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
    #[command(flatten)]
    pub output: super::args::FigureOutArgs,
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
    args.output.check(&args.stress)?;
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
        search: Some(settings),
        worst: Some(worst),
        map_range,
        ..input.figure(plane, view.as_ref())
    };
    args.output.write(
        view.as_ref(),
        &figure,
        crate::study::annotations::FigureKind::Map,
        [w, h],
        |h, sizes| figures::map(&figure, &settings, resolution, w, h, sizes),
    )
}
