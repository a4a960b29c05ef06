//! `planewise mohr`: the Mohr circles of a state as SVG or PNG, with the cut plane's point, the
//! worst planes of a measure and the Mohr–Coulomb envelope.

use clap::Args;

use super::args::{MaterialArgs, search_settings_in};
use super::{ArgError, CliError, PlaneArgs, StressArgs, values};
use crate::mechanics::search::{Measure, worst_plane};
use crate::picture::draw::mohr::Envelope;
use crate::picture::figures::{self, FigureInput};

/// Arguments of `planewise mohr`.
#[derive(Debug, Clone, Args)]
pub struct MohrArgs {
    #[command(flatten)]
    pub stress: StressArgs,
    #[command(flatten)]
    pub plane: PlaneArgs,
    /// Mark the worst planes for this measure. [default with --project: the project's]
    #[arg(long, value_name = "MEASURE")]
    pub measure: Option<Measure>,
    /// Draws the Mohr–Coulomb envelope when --cohesion and --friction-angle are given.
    #[command(flatten)]
    pub material: MaterialArgs,
    #[command(flatten)]
    pub output: super::args::FigureOutArgs,
    /// Image size in pixels, WIDTHxHEIGHT.
    #[arg(long, value_name = "WxH", default_value = "1200x800", value_parser = values::size, allow_hyphen_values = true)]
    pub size: (u32, u32),
}

/// Runs the subcommand. With `--project`, the project's cut plane, measure and (for the
/// mohr-coulomb measure) material are used where the command line does not give them.
pub fn run(args: &MohrArgs) -> Result<String, CliError> {
    let input = args.stress.read()?;
    let view = args.stress.project_view()?;
    let plane = args.plane.read()?.or(view.as_ref().map(|v| v.plane));
    let measure = match (&args.measure, &view) {
        (Some(m), _) => Some(*m),
        (None, Some(v)) => Some(v.measure.measure),
        (None, None) => None,
    };
    let from_project = view.as_ref().filter(|_| !args.material.any());
    let envelope = if let Some(v) = from_project {
        // As the window: the project's material draws the envelope for its mohr-coulomb measure.
        (measure == Some(Measure::MohrCoulomb))
            .then_some(v.search.material)
            .flatten()
            .map(|material| Envelope {
                material,
                pore_pressure_pa: v.measure.pore_pressure_pa,
            })
    } else {
        let (pore_pressure_pa, material) = args.material.read(input.unit, measure, true)?;
        material.map(|material| Envelope {
            material,
            pore_pressure_pa,
        })
    };
    let (w, h) = args.size;
    args.output.check(&args.stress)?;
    let (search, worst) = match measure {
        Some(measure) => {
            let settings =
                search_settings_in(measure, &args.material, &input, true, view.as_ref())?;
            let result =
                worst_plane(&input.tensor, &settings).map_err(|e| ArgError::new("--measure", e))?;
            (Some(settings), Some(result))
        }
        None => (None, None),
    };
    let figure = FigureInput {
        search,
        worst,
        envelope,
        ..input.figure(plane, view.as_ref())
    };
    args.output.write(
        view.as_ref(),
        &figure,
        crate::study::annotations::FigureKind::Mohr,
        [w, h],
        |h, sizes| figures::mohr(&figure, w, h, sizes),
    )
}
