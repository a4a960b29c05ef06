//! `planewise worst-plane`: the plane orientation(s) where a measure is largest (smallest for
//! normal-min).

use std::fmt::Write as _;

use clap::Args;
use serde::Serialize;

use super::{ArgError, CliError, ProjectView, StressArgs, StressInput};
use crate::mechanics::criteria::{CriterionError, MohrCoulomb};
use crate::mechanics::search::{Measure, SearchSettings, WorstCondition, worst_plane};
use crate::mechanics::{PlaneStress, StressUnit};
use crate::text::format::{clean, sig};

/// Pore pressure and Mohr–Coulomb material, shared by `worst-plane`, `map` and `mohr`.
#[derive(Debug, Clone, Args)]
pub struct MaterialArgs {
    /// Pore pressure p in the stress unit (compression positive), for slip-tendency and
    /// mohr-coulomb.
    #[arg(long, value_name = "P", allow_hyphen_values = true)]
    pub pore_pressure: Option<String>,
    /// Cohesion c in the stress unit, for mohr-coulomb.
    #[arg(long, value_name = "C", allow_hyphen_values = true)]
    pub cohesion: Option<String>,
    /// Friction angle φ in degrees, for mohr-coulomb.
    #[arg(long, value_name = "DEG", allow_hyphen_values = true)]
    pub friction_angle: Option<String>,
    /// Friction coefficient μ instead of --friction-angle (φ = atan μ).
    #[arg(long, value_name = "MU", allow_hyphen_values = true)]
    pub friction_coefficient: Option<String>,
}

impl MaterialArgs {
    /// Whether any of the three was given.
    pub(crate) fn any(&self) -> bool {
        self.pore_pressure.is_some()
            || self.cohesion.is_some()
            || self.friction_angle.is_some()
            || self.friction_coefficient.is_some()
    }

    /// The pore pressure (Pa, 0 when not given) and the material, if both cohesion and friction
    /// angle are given (stresses in `unit`). `measure` is the measure in use, if any;
    /// `envelope` says whether the command also draws a Mohr–Coulomb envelope from the material.
    /// An argument that nothing uses is bad input, not silently ignored.
    pub fn read(
        &self,
        unit: StressUnit,
        measure: Option<Measure>,
        envelope: bool,
    ) -> Result<(f64, Option<MohrCoulomb>), ArgError> {
        let stress_arg =
            |name: &'static str, text: &Option<String>| -> Result<Option<f64>, ArgError> {
                text.as_deref()
                    .map(|t| super::stress_value(name, t, unit))
                    .transpose()
            };
        let pore_pressure_pa = stress_arg("--pore-pressure", &self.pore_pressure)?;
        let cohesion_pa = stress_arg("--cohesion", &self.cohesion)?;
        let friction = super::friction_deg(
            self.friction_angle.as_deref(),
            self.friction_coefficient.as_deref(),
        )?;
        let measure_text = measure.map_or_else(
            || "no --measure is given".to_owned(),
            |m| format!("the measure is {}", m.key()),
        );
        let material_used = measure.is_some_and(Measure::uses_material) || envelope;
        if !material_used {
            for (given, name) in [
                (cohesion_pa.is_some(), "--cohesion"),
                (friction.is_some(), "--friction-angle"),
            ] {
                if given {
                    return Err(ArgError::new(
                        name,
                        format!("applies only to --measure mohr-coulomb ({measure_text})"),
                    ));
                }
            }
        }
        let material = pair_material(cohesion_pa, friction)?;
        let pore_used =
            measure.is_some_and(Measure::uses_friction) || (envelope && material.is_some());
        if pore_pressure_pa.is_some() && !pore_used {
            let also = if envelope {
                " or to the Mohr–Coulomb envelope (--cohesion and --friction-angle)"
            } else {
                ""
            };
            return Err(ArgError::new(
                "--pore-pressure",
                format!(
                    "applies only to --measure slip-tendency or mohr-coulomb{also} ({measure_text})"
                ),
            ));
        }
        Ok((pore_pressure_pa.unwrap_or(0.0), material))
    }
}

/// The Mohr–Coulomb material from --cohesion and --friction-angle, which go together; an
/// out-of-range value is bad input naming its argument.
pub fn pair_material(
    cohesion_pa: Option<f64>,
    friction_deg: Option<f64>,
) -> Result<Option<MohrCoulomb>, ArgError> {
    match (cohesion_pa, friction_deg) {
        (Some(c), Some(phi)) => MohrCoulomb::new(c, phi).map(Some).map_err(|e| {
            let arg = if matches!(e, CriterionError::Cohesion) {
                "--cohesion"
            } else {
                "--friction-angle"
            };
            ArgError::new(arg, e)
        }),
        (None, None) => Ok(None),
        (Some(_), None) => Err(ArgError::new(
            "--friction-angle",
            "is needed together with --cohesion",
        )),
        (None, Some(_)) => Err(ArgError::new(
            "--cohesion",
            "is needed together with --friction-angle",
        )),
    }
}

/// The search settings for `measure`; mohr-coulomb without a material, or a material argument
/// the measure does not use, is bad input. `envelope`: the command also draws the Mohr–Coulomb
/// envelope from the material.
pub fn search_settings(
    measure: Measure,
    material: &MaterialArgs,
    input: &StressInput,
    envelope: bool,
) -> Result<SearchSettings, ArgError> {
    let (pore_pressure_pa, material) = material.read(input.unit, Some(measure), envelope)?;
    if measure == Measure::MohrCoulomb && material.is_none() {
        return Err(ArgError::new(
            "--measure",
            "mohr-coulomb needs --cohesion and --friction-angle",
        ));
    }
    Ok(SearchSettings {
        measure,
        convention: input.convention,
        pore_pressure_pa,
        material,
    })
}

/// Like [`search_settings`]; with `--project`, the project's pore pressure and Coulomb strength
/// (as the window uses them) where the command line gives none.
pub fn search_settings_in(
    measure: Measure,
    material: &MaterialArgs,
    input: &StressInput,
    envelope: bool,
    view: Option<&ProjectView>,
) -> Result<SearchSettings, ArgError> {
    let Some(v) = view else {
        return search_settings(measure, material, input, envelope);
    };
    let mut settings = SearchSettings {
        measure,
        convention: input.convention,
        ..v.search
    };
    if material.any() {
        let (pore_pressure_pa, strength) = material.read(input.unit, Some(measure), envelope)?;
        if material.pore_pressure.is_some() {
            settings.pore_pressure_pa = pore_pressure_pa;
        }
        if strength.is_some() {
            settings.material = strength;
        }
    }
    if measure == Measure::MohrCoulomb && settings.material.is_none() {
        return Err(ArgError::new(
            "--measure",
            "mohr-coulomb needs a cohesion and friction angle: the project has none for the planes or the material, and no --cohesion and --friction-angle are given",
        ));
    }
    Ok(settings)
}

/// Refuses material arguments when no measure uses them (commands whose measure is optional).
pub fn no_material(material: &MaterialArgs, input: &StressInput) -> Result<(), ArgError> {
    if material.any() {
        material.read(input.unit, None, false)?;
    }
    Ok(())
}

/// The measure and its parameters, shared by `worst-plane` and `map`.
#[derive(Debug, Clone, Args)]
pub struct MeasureArgs {
    /// What makes a plane worst. [default with --project: the project's measure, pore
    /// pressure and material]
    #[arg(long, value_name = "MEASURE")]
    pub measure: Option<Measure>,
    #[command(flatten)]
    pub material: MaterialArgs,
}

impl MeasureArgs {
    /// Reads the measure and its parameters (stresses in `input.unit`); with a project, what
    /// the command line leaves out comes from it.
    pub fn read(
        &self,
        input: &StressInput,
        view: Option<&ProjectView>,
    ) -> Result<SearchSettings, ArgError> {
        let measure = match (&self.measure, view) {
            (Some(m), _) => *m,
            (None, Some(v)) => v.measure.measure,
            (None, None) => {
                let keys: Vec<&str> = Measure::ALL.iter().map(|m| m.key()).collect();
                return Err(ArgError::new(
                    "--measure",
                    format!("is required (one of {})", keys.join(", ")),
                ));
            }
        };
        search_settings_in(measure, &self.material, input, false, view)
    }
}

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
