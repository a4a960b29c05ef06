//! `planewise worst-plane`: the plane orientation(s) where a measure is largest (smallest for
//! normal-min).

use std::fmt::Write as _;

use clap::Args;
use serde::Serialize;

use super::args::MeasureArgs;
use super::{ArgError, CliError, StressArgs};
use crate::mechanics::PlaneStress;
use crate::mechanics::search::{Measure, WorstCondition, worst_plane};
use crate::text::format::{clean, sig};

/// Arguments of `planewise worst-plane`.
#[derive(Debug, Clone, Args)]
pub struct WorstPlaneArgs {
    #[command(flatten)]
    pub stress: StressArgs,
    #[command(flatten)]
    pub measure: MeasureArgs,
    /// Print one JSON object instead of the table.
    #[arg(long)]
    pub json: bool,
}

/// The JSON contract: stresses in the input unit and display convention.
#[derive(Debug, Serialize)]
pub struct WorstPlaneJson {
    pub measure: String,
    /// Unit of the planes' stresses.
    pub unit: String,
    /// Unit of `value`: the stress unit for stress measures, null for dimensionless ones.
    pub value_unit: Option<String>,
    pub convention: String,
    /// The worst value, the measure itself (for normal-min the smallest normal stress); null
    /// when some plane has no frictional capacity left or the measure is undefined.
    pub value: Option<f64>,
    /// "defined", "effective-tension", "undefined", "every-plane" or "cone".
    pub condition: WorstCondition,
    /// With "cone": every plane whose normal makes `half_angle_deg` with `axis` is worst.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub cone: Option<ConeJson>,
    pub planes: Vec<PlaneJson>,
}

/// A cone of worst normals.
#[derive(Debug, Serialize)]
pub struct ConeJson {
    /// Unit axis, z ≥ 0.
    pub axis: [f64; 3],
    /// Angle between each worst normal and the axis, degrees.
    pub half_angle_deg: f64,
}

/// One plane.
#[derive(Debug, Serialize)]
pub struct PlaneJson {
    pub normal: [f64; 3],
    pub dip_deg: f64,
    pub dip_direction_deg: f64,
    pub normal_stress: f64,
    pub shear_stress: f64,
    /// Rake of the hanging wall's slip (Aki & Richards), degrees; null without shear or strike.
    pub rake_deg: Option<f64>,
}

/// What the condition says in the text output, after the value.
fn condition_text(condition: WorstCondition, cone: Option<&ConeJson>, measure: Measure) -> String {
    match (condition, cone) {
        (WorstCondition::EveryPlane, _) => {
            "every plane carries the same stress (hydrostatic state); one plane is listed"
                .to_owned()
        }
        (WorstCondition::Cone, Some(c)) => format!(
            "attained on a cone of planes: every normal at {}° from the axis ({}, {}, {}); representatives listed",
            sig(c.half_angle_deg, 5),
            sig(c.axis[0], 6),
            sig(c.axis[1], 6),
            sig(c.axis[2], 6)
        ),
        (WorstCondition::EffectiveTension, _) => format!(
            "planes with zero or tensile effective normal stress have no frictional capacity ({} undefined); the plane normal to the least compressive principal stress, which has the least effective normal stress, is listed",
            measure.key()
        ),
        _ => String::new(),
    }
}

/// Runs the subcommand.
pub fn run(args: &WorstPlaneArgs) -> Result<String, CliError> {
    let input = args.stress.read()?;
    let settings = args
        .measure
        .read(&input, args.stress.project_view()?.as_ref())?;
    let measure = settings.measure;
    let unit = input.unit;
    let result =
        worst_plane(&input.tensor, &settings).map_err(|e| ArgError::new("--measure", e))?;
    let u = unit.pascals();
    let scale = input.tensor.max_abs_component_pa();
    let json = WorstPlaneJson {
        measure: measure.key().to_owned(),
        unit: unit.symbol().to_owned(),
        value_unit: measure.is_stress().then(|| unit.symbol().to_owned()),
        convention: input.convention.key().to_owned(),
        value: result
            .value
            .map(|v| clean(if measure.is_stress() { v / u } else { v })),
        condition: result.condition,
        cone: result.cone.map(|c| ConeJson {
            axis: c.axis.map(clean).into(),
            half_angle_deg: clean(c.half_angle_deg),
        }),
        planes: result
            .planes
            .iter()
            .map(|p| {
                let n = p.normal.vector();
                let rake_deg =
                    PlaneStress::new(&input.tensor, p.normal, input.convention).rake_deg();
                // Planes found numerically carry what the search resolves, no more.
                let resolve = |v: f64| {
                    if matches!(measure, Measure::SlipTendency | Measure::MohrCoulomb) {
                        crate::text::format::resolved(v)
                    } else {
                        v
                    }
                };
                PlaneJson {
                    normal: [n.x, n.y, n.z]
                        .map(|c| resolve(crate::text::format::clean_relative(c, 1.0))),
                    dip_deg: crate::text::format::angle(p.dip_deg, false),
                    dip_direction_deg: crate::text::format::angle(p.dip_direction_deg, true),
                    normal_stress: resolve(clean(
                        crate::text::format::clean_relative(p.normal_stress_pa, scale) / u,
                    )),
                    shear_stress: resolve(clean(
                        crate::text::format::clean_relative(p.shear_stress_pa, scale) / u,
                    )),
                    rake_deg: rake_deg.map(clean),
                }
            })
            .collect(),
    };
    if args.json {
        let mut text = serde_json::to_string_pretty(&json).map_err(anyhow::Error::from)?;
        text.push('\n');
        return Ok(text);
    }
    let mut s = String::new();
    let value = match json.value {
        Some(v) if measure.is_stress() => format!("{} {}", sig(v, 6), json.unit),
        Some(v) => format!("{} (dimensionless)", sig(v, 6)),
        None => "undefined".to_owned(),
    };
    let heading = if measure.is_stress() {
        format!("{}, {}", json.unit, json.convention)
    } else {
        format!("a ratio; stresses in {}, {}", json.unit, json.convention)
    };
    let _ = writeln!(s, "Worst plane for {} ({heading}): {value}", json.measure);
    let note = condition_text(json.condition, json.cone.as_ref(), measure);
    if !note.is_empty() {
        let _ = writeln!(s, "  {note}");
    }
    for p in &json.planes {
        let rake = p
            .rake_deg
            .map_or_else(|| "undefined".to_owned(), |r| format!("{}°", sig(r, 5)));
        let _ = writeln!(
            s,
            "  normal ({}, {}, {})  dip {}° / dip direction {}°  σn {} {u}  τ {} {u}  rake {rake}",
            sig(p.normal[0], 6),
            sig(p.normal[1], 6),
            sig(p.normal[2], 6),
            sig(p.dip_deg, 5),
            sig(p.dip_direction_deg, 5),
            sig(p.normal_stress, 6),
            sig(p.shear_stress, 6),
            u = json.unit
        );
    }
    Ok(s)
}
