//! `planewise figure`: the annotated 3D view written as SVG or PNG, with no window or GPU.

use clap::Args;

use super::args::{MaterialArgs, no_material, search_settings_in};
use super::{ArgError, CliError, PlaneArgs, StressArgs, values};
use crate::mechanics::search::{Measure, worst_plane};
use crate::picture::draw::camera::{Camera, Projection, ViewPreset};
use crate::picture::figures::{self, FigureInput};
use crate::picture::scene::{FaceChoice, Layers};

/// Arguments of `planewise figure`.
#[derive(Debug, Clone, Args)]
pub struct FigureArgs {
    #[command(flatten)]
    pub stress: StressArgs,
    #[command(flatten)]
    pub plane: PlaneArgs,
    #[command(flatten)]
    pub output: super::args::FigureOutArgs,
    /// Image size in pixels, WIDTHxHEIGHT.
    #[arg(long, value_name = "WxH", default_value = "1600x1200", value_parser = values::size, allow_hyphen_values = true)]
    pub size: (u32, u32),
    /// View direction (the eye's side).
    #[arg(
        long,
        value_name = "VIEW",
        default_value = "three-quarter",
        allow_hyphen_values = true
    )]
    pub view: ViewPreset,
    /// Perspective instead of orthographic projection.
    #[arg(long)]
    pub perspective: bool,
    /// Layers to draw, comma-separated. Default: all but the ellipsoid (plane only when a
    /// plane is given).
    #[arg(long, value_name = "LIST", value_delimiter = ',')]
    pub layers: Option<Vec<values::Layer>>,
    /// Also draw the worst planes for this measure.
    #[arg(long, value_name = "MEASURE")]
    pub measure: Option<Measure>,
    #[command(flatten)]
    pub material: MaterialArgs,
}

/// Runs the subcommand; prints the path written.
pub fn run(args: &FigureArgs) -> Result<String, CliError> {
    let input = args.stress.read()?;
    let view = args.stress.project_view()?;
    let plane = args.plane.read()?.or(view.as_ref().map(|v| v.plane));
    let (w, h) = args.size;
    let preset = args.view;
    args.output.check(&args.stress)?;
    let mut layers = match &args.layers {
        Some(list) => values::layers(list),
        None => Layers::default(),
    };
    let mut camera = Camera::from_preset(preset);
    if args.perspective {
        camera.projection = Projection::Perspective;
    }
    let (search, worst) = if let Some(measure) = args.measure {
        let settings = search_settings_in(measure, &args.material, &input, false, view.as_ref())?;
        layers.worst_planes = true;
        let result =
            worst_plane(&input.tensor, &settings).map_err(|e| ArgError::new("--measure", e))?;
        (Some(settings), Some(result))
    } else {
        no_material(&args.material, &input)?;
        (None, None)
    };
    let figure = FigureInput {
        search,
        worst,
        ..input.figure(plane, view.as_ref())
    };
    args.output.write(
        view.as_ref(),
        &figure,
        crate::study::annotations::FigureKind::View3d,
        [w, h],
        |h, sizes| {
            figures::view_3d(
                &figure,
                layers,
                FaceChoice::FacingViewer,
                &camera,
                w,
                h,
                sizes,
            )
        },
    )
}
