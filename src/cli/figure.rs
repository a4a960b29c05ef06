//! `planewise figure`: the annotated 3D view written as SVG or PNG, with no window or GPU.

use std::path::PathBuf;

use clap::Args;

use super::worst_plane::{MaterialArgs, no_material, parse_measure, search_settings_in};
use super::{ArgError, CliError, PlaneArgs, ProjectView, StressArgs};
use crate::draw::camera::{Camera, Projection, ViewPreset};
use crate::export::{self, ImageFormat};
use crate::mechanics::search::worst_plane;
use crate::scene::{FaceChoice, Layers};
use crate::study::figures::{self, FigureInput};

/// Arguments of `planewise figure`.
#[derive(Debug, Clone, Args)]
pub struct FigureArgs {
    #[command(flatten)]
    pub stress: StressArgs,
    #[command(flatten)]
    pub plane: PlaneArgs,
    /// Output file; .svg or .png.
    #[arg(long, value_name = "FILE")]
    pub out: PathBuf,
    /// Image size in pixels, WIDTHxHEIGHT.
    #[arg(long, value_name = "WxH", default_value = "1600x1200")]
    pub size: String,
    /// View direction: iso, x, -x, y, -y, z or -z (the eye's side).
    #[arg(
        long,
        value_name = "VIEW",
        default_value = "iso",
        allow_hyphen_values = true
    )]
    pub view: String,
    /// Perspective instead of orthographic projection.
    #[arg(long)]
    pub perspective: bool,
    /// Layers to draw, comma-separated from: cube, faces, plane, ellipsoid, axes, labels,
    /// triad, legend. Default: all but the ellipsoid (plane only when a plane is given).
    #[arg(long, value_name = "LIST")]
    pub layers: Option<String>,
    /// Also draw the worst planes for this measure (shear, normal-max, normal-min, traction,
    /// slip-tendency, dilation-tendency, mohr-coulomb).
    #[arg(long, value_name = "MEASURE")]
    pub measure: Option<String>,
    #[command(flatten)]
    pub material: MaterialArgs,
}

/// Parses `WIDTHxHEIGHT`.
pub fn parse_size(text: &str) -> Result<(u32, u32), ArgError> {
    let bad = || {
        ArgError::new(
            "--size",
            format!("'{text}' is not WIDTHxHEIGHT with each side 16 to 16384 pixels"),
        )
    };
    let (w, h) = text.trim().split_once(['x', 'X', '×']).ok_or_else(bad)?;
    let w: u32 = w.trim().parse().map_err(|_| bad())?;
    let h: u32 = h.trim().parse().map_err(|_| bad())?;
    if !(16..=16_384).contains(&w) || !(16..=16_384).contains(&h) {
        return Err(bad());
    }
    Ok((w, h))
}

/// Parses a layer list.
pub fn parse_layers(text: &str) -> Result<Layers, ArgError> {
    let mut l = Layers::none();
    for name in text.split(',').map(str::trim).filter(|s| !s.is_empty()) {
        let flag = match name {
            "cube" => &mut l.cube,
            "faces" => &mut l.face_tractions,
            "plane" => &mut l.cut_plane,
            "ellipsoid" => &mut l.ellipsoid,
            "axes" => &mut l.principal_axes,
            "labels" => &mut l.labels,
            "triad" => &mut l.triad,
            "legend" => &mut l.legend,
            other => {
                return Err(ArgError::new(
                    "--layers",
                    format!(
                        "unknown layer '{other}' (expected cube, faces, plane, ellipsoid, axes, labels, triad, legend)"
                    ),
                ));
            }
        };
        *flag = true;
    }
    Ok(l)
}

/// Runs the subcommand; prints the path written.
pub fn run(args: &FigureArgs) -> Result<String, CliError> {
    let input = args.stress.read()?;
    let view = args.stress.project_view()?;
    let plane = args.plane.read()?.or(view.as_ref().map(|v| v.plane));
    let (w, h) = parse_size(&args.size)?;
    let preset = ViewPreset::from_key(&args.view).ok_or_else(|| {
        ArgError::new(
            "--view",
            format!(
                "unknown view '{}' (expected iso, x, -x, y, -y, z, -z)",
                args.view
            ),
        )
    })?;
    ImageFormat::from_path(&args.out).map_err(|e| ArgError::new("--out", e))?;
    let mut layers = match &args.layers {
        Some(list) => parse_layers(list)?,
        None => Layers::default(),
    };
    let mut camera = Camera::from_preset(preset);
    if args.perspective {
        camera.projection = Projection::Perspective;
    }
    let (search, worst) = if let Some(key) = &args.measure {
        let settings = search_settings_in(
            parse_measure(key)?,
            &args.material,
            &input,
            false,
            view.as_ref(),
        )?;
        layers.worst_planes = true;
        let result =
            worst_plane(&input.tensor, &settings).map_err(|e| ArgError::new("--measure", e))?;
        (Some(settings), Some(result))
    } else {
        no_material(&args.material, &input)?;
        (None, None)
    };
    let figure = FigureInput {
        tensor: input.tensor,
        unit: input.unit,
        convention: input.convention,
        plane,
        search,
        worst,
        envelope: None,
    };
    let frame = figures::view_3d(&figure, layers, FaceChoice::FacingViewer, &camera, w, h);
    export::write_figure(&args.out, &frame, &ProjectView::title(view.as_ref()))
        .map_err(anyhow::Error::from)?;
    Ok(format!("wrote {}\n", args.out.display()))
}
