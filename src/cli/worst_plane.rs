//! `planewise worst-plane`: the plane orientation(s) where a measure is largest.

use std::fmt::Write as _;

use clap::Args;
use serde::Serialize;

use super::{ArgError, CliError, StressArgs, StressInput};
use crate::format::sig;
use crate::mechanics::criteria::{Condition, CriterionError, MohrCoulomb};
use crate::mechanics::search::{Measure, SearchSettings, worst_plane};
use crate::parse;

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
}

impl MaterialArgs {
    /// The pore pressure (Pa, 0 when not given) and the material, if both cohesion and friction
    /// angle are given (stresses in `input.unit`).
    pub fn read(&self, input: &StressInput) -> Result<(f64, Option<MohrCoulomb>), ArgError> {
        let unit = input.unit;
        let stress_arg =
            |name: &'static str, text: &Option<String>| -> Result<Option<f64>, ArgError> {
                text.as_deref()
                    .map(|t| {
                        parse::number(t)
                            .map(|v| unit.to_pa(v))
                            .map_err(|e| ArgError::new(name, e))
                    })
                    .transpose()
            };
        let pore_pressure_pa = stress_arg("--pore-pressure", &self.pore_pressure)?.unwrap_or(0.0);
        let cohesion_pa = stress_arg("--cohesion", &self.cohesion)?;
        let friction = self
            .friction_angle
            .as_deref()
            .map(|t| parse::number(t).map_err(|e| ArgError::new("--friction-angle", e)))
            .transpose()?;
        let material = match (cohesion_pa, friction) {
            (Some(c), Some(phi)) => Some(MohrCoulomb::new(c, phi).map_err(|e| {
                let arg = if matches!(e, CriterionError::Cohesion) {
                    "--cohesion"
                } else {
                    "--friction-angle"
                };
                ArgError::new(arg, e)
            })?),
            (None, None) => None,
            (Some(_), None) => {
                return Err(ArgError::new(
                    "--friction-angle",
                    "is needed together with --cohesion",
                ));
            }
            (None, Some(_)) => {
                return Err(ArgError::new(
                    "--cohesion",
                    "is needed together with --friction-angle",
                ));
            }
        };
        Ok((pore_pressure_pa, material))
    }
}

/// Parses a measure key; the error names `--measure` and lists the keys.
pub fn parse_measure(key: &str) -> Result<Measure, ArgError> {
    Measure::from_key(key).ok_or_else(|| {
        ArgError::new(
            "--measure",
            format!(
                "unknown measure '{key}' (expected shear, normal-max, normal-min, traction, slip-tendency, dilation-tendency, mohr-coulomb)"
            ),
        )
    })
}

/// The search settings for `measure`; mohr-coulomb without a material is bad input.
pub fn search_settings(
    measure: Measure,
    material: &MaterialArgs,
    input: &StressInput,
) -> Result<SearchSettings, ArgError> {
    let (pore_pressure_pa, material) = material.read(input)?;
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

/// The measure and its parameters, shared by `worst-plane` and `map`.
#[derive(Debug, Clone, Args)]
pub struct MeasureArgs {
    /// shear, normal-max, normal-min, traction, slip-tendency, dilation-tendency or mohr-coulomb.
    #[arg(long, value_name = "MEASURE")]
    pub measure: String,
    #[command(flatten)]
    pub material: MaterialArgs,
}

impl MeasureArgs {
    /// Reads the measure and its parameters (stresses in `input.unit`).
    pub fn read(&self, input: &StressInput) -> Result<SearchSettings, ArgError> {
        search_settings(parse_measure(&self.measure)?, &self.material, input)
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
    pub unit: String,
    pub convention: String,
    /// The worst value (input unit for stress measures, dimensionless otherwise); null when some
    /// plane has no frictional capacity left or the measure is undefined.
    pub value: Option<f64>,
    /// "defined", "effective-tension" or "undefined".
    pub condition: Condition,
    pub planes: Vec<PlaneJson>,
}

/// One plane.
#[derive(Debug, Serialize)]
pub struct PlaneJson {
    pub normal: [f64; 3],
    pub dip_deg: f64,
    pub dip_direction_deg: f64,
    pub normal_stress: f64,
    pub shear_stress: f64,
}

/// Runs the subcommand.
pub fn run(args: &WorstPlaneArgs) -> Result<String, CliError> {
    let input = args.stress.read()?;
    let settings = args.measure.read(&input)?;
    let measure = settings.measure;
    let unit = input.unit;
    let result =
        worst_plane(&input.tensor, &settings).map_err(|e| ArgError::new("--measure", e))?;
    let u = unit.pascals();
    let json = WorstPlaneJson {
        measure: measure.key().to_owned(),
        unit: unit.symbol().to_owned(),
        convention: input.convention.key().to_owned(),
        value: result
            .value
            .map(|v| if measure.is_stress() { v / u } else { v }),
        condition: result.condition,
        planes: result
            .planes
            .iter()
            .map(|p| {
                let n = p.normal.vector();
                PlaneJson {
                    normal: [n.x, n.y, n.z],
                    dip_deg: p.dip_deg,
                    dip_direction_deg: p.dip_direction_deg,
                    normal_stress: p.normal_stress_pa / u,
                    shear_stress: p.shear_stress_pa / u,
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
    let value = match (json.value, json.condition) {
        (Some(v), _) if measure.is_stress() => format!("{} {}", sig(v, 6), json.unit),
        (Some(v), _) => sig(v, 6),
        (None, Condition::EffectiveTension) => "undefined: some planes have zero or tensile effective normal stress (no frictional capacity); those are listed".to_owned(),
        (None, _) => "undefined for this state".to_owned(),
    };
    let _ = writeln!(
        s,
        "Worst plane for {} ({}, {}): {value}",
        json.measure, json.unit, json.convention
    );
    for p in &json.planes {
        let _ = writeln!(
            s,
            "  normal ({}, {}, {})  dip {}° / dip direction {}°  σn {} {u}  τ {} {u}",
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
