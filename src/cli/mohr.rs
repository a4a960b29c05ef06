//! `planewise mohr`: the Mohr circles of a state as SVG or PNG, with the cut plane's point, the
//! worst planes of a measure and the Mohr–Coulomb envelope.

use std::path::PathBuf;

use clap::Args;

use super::figure::parse_size;
use super::worst_plane::{MaterialArgs, parse_measure, search_settings};
use super::{ArgError, CliError, PlaneArgs, StressArgs};
use crate::draw::Sizes;
use crate::draw::mohr::{Envelope, MohrFigure, MohrPoint, mohr_frame, worst_label, worst_points};
use crate::export::{self, ImageFormat};
use crate::mechanics::mohr::MohrCircles;
use crate::mechanics::search::worst_plane;

/// Arguments of `planewise mohr`.
#[derive(Debug, Clone, Args)]
pub struct MohrArgs {
    #[command(flatten)]
    pub stress: StressArgs,
    #[command(flatten)]
    pub plane: PlaneArgs,
    /// Mark the worst planes for this measure (shear, normal-max, normal-min, traction,
    /// slip-tendency, dilation-tendency, mohr-coulomb).
    #[arg(long, value_name = "MEASURE")]
    pub measure: Option<String>,
    /// Draws the Mohr–Coulomb envelope when --cohesion and --friction-angle are given.
    #[command(flatten)]
    pub material: MaterialArgs,
    /// Output file; .svg or .png.
    #[arg(long, value_name = "FILE")]
    pub out: PathBuf,
    /// Image size in pixels, WIDTHxHEIGHT.
    #[arg(long, value_name = "WxH", default_value = "1200x800")]
    pub size: String,
}

/// Runs the subcommand.
pub fn run(args: &MohrArgs) -> Result<String, CliError> {
    let input = args.stress.read()?;
    let plane = args.plane.read()?;
    let measure = args.measure.as_deref().map(parse_measure).transpose()?;
    let (pore_pressure_pa, material) = args.material.read(input.unit, measure, true)?;
    let (w, h) = parse_size(&args.size)?;
    ImageFormat::from_path(&args.out).map_err(|e| ArgError::new("--out", e))?;
    let circles = MohrCircles::new(&input.tensor, input.convention);
    let (worst, worst_label) = match measure {
        Some(measure) => {
            let settings = search_settings(measure, &args.material, &input, true)?;
            let result =
                worst_plane(&input.tensor, &settings).map_err(|e| ArgError::new("--measure", e))?;
            (worst_points(&result.planes), worst_label(&result))
        }
        None => (Vec::new(), String::new()),
    };
    let figure = MohrFigure {
        circles,
        unit: input.unit,
        plane: plane.map(|n| MohrPoint::of_plane(&circles, &input.tensor, n, "cut plane")),
        worst,
        worst_label,
        envelope: material.map(|material| Envelope {
            material,
            pore_pressure_pa,
        }),
    };
    let frame = mohr_frame(&figure, w, h, Sizes::for_export(w as f32, h as f32));
    export::write_figure(&args.out, &frame, crate::SAFETY_NOTE).map_err(anyhow::Error::from)?;
    Ok(format!("wrote {}\n", args.out.display()))
}
