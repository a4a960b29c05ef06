//! `planewise rosette`: three strain-gauge readings on a free surface → strains, principal
//! strains and their angle, and the plane-stress state with its full analysis.

use std::fmt::Write as _;

use clap::Args;
use serde::Serialize;

use super::analyze::{AnalyzeJson, state_json, to_text};
use super::{ArgError, CliError, StressInput, values};
use crate::mechanics::inputs::Rosette;
use crate::mechanics::{SignConvention, StressUnit};
use crate::text::format::{clean, sig};
use crate::text::parse;

/// The unit of the readings.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum StrainUnit {
    /// 1e-6 strain.
    Microstrain,
    /// Plain strain (m/m).
    Strain,
}

/// Arguments of `planewise rosette`.
#[derive(Debug, Clone, Args)]
pub struct RosetteArgs {
    /// Gauge angles counter-clockwise from x, degrees: three numbers, e.g. 0,45,90
    /// (rectangular) or 0,60,120 (delta).
    #[arg(
        long,
        value_name = "A,B,C",
        default_value = "0,45,90",
        allow_hyphen_values = true
    )]
    pub angles: String,
    /// The three readings, in --strain-unit.
    #[arg(long, value_name = "EA,EB,EC", allow_hyphen_values = true)]
    pub strains: String,
    /// Unit of the readings.
    #[arg(long, value_name = "UNIT", default_value = "microstrain")]
    pub strain_unit: StrainUnit,
    /// Young's modulus with its unit, e.g. 70GPa or 200000MPa.
    #[arg(long, value_name = "E", allow_hyphen_values = true)]
    pub modulus: String,
    /// Poisson's ratio, −1 < ν < 0.5.
    #[arg(long, value_name = "NU", allow_hyphen_values = true)]
    pub poisson: String,
    /// Unit of the stresses printed.
    #[arg(long, value_name = "UNIT", default_value = "MPa", value_parser = values::unit)]
    pub unit: StressUnit,
    /// Print one JSON object instead of the table.
    #[arg(long)]
    pub json: bool,
}

/// The JSON contract of `planewise rosette --json`.
#[derive(Debug, Serialize)]
pub struct RosetteJson {
    /// Unit of the strains below: always "microstrain".
    pub strain_unit: &'static str,
    pub epsilon_x: f64,
    pub epsilon_y: f64,
    pub gamma_xy: f64,
    pub principal_strains: [f64; 2],
    /// Angle of ε1 from x, counter-clockwise, degrees; null when every direction strains alike.
    pub principal_angle_deg: Option<f64>,
    /// The plane-stress state (σz = τyz = τzx = 0), analysed as `analyze --json` would.
    pub stress: AnalyzeJson,
}

/// A number followed by a stress unit, e.g. `70GPa` or `70 GPa`, in pascals.
fn modulus(text: &str) -> Result<f64, ArgError> {
    let (value, unit) = modulus_as_typed(text)?;
    Ok(unit.to_pa(value))
}

/// A modulus as typed: the number and its stress unit (`70GPa` → 70, GPa).
pub fn modulus_as_typed(text: &str) -> Result<(f64, StressUnit), ArgError> {
    let t = text.trim();
    let split = t
        .find(|c: char| c.is_ascii_alphabetic() && c != 'e' && c != 'E')
        .ok_or_else(|| {
            ArgError::new(
                "--modulus",
                format!("'{t}' needs a unit, e.g. 70GPa or 200000MPa"),
            )
        })?;
    let (number, unit) = t.split_at(split);
    let unit: StressUnit = unit
        .trim()
        .parse()
        .map_err(|e| ArgError::new("--modulus", e))?;
    let value = parse::number(number).map_err(|e| ArgError::new("--modulus", e))?;
    Ok((value, unit))
}

/// Runs the subcommand.
pub fn run(args: &RosetteArgs) -> Result<String, CliError> {
    let angles_deg = parse::numbers::<3>(&args.angles).map_err(|e| ArgError::new("--angles", e))?;
    let readings = parse::numbers::<3>(&args.strains).map_err(|e| ArgError::new("--strains", e))?;
    let factor = match args.strain_unit {
        StrainUnit::Microstrain => 1e-6,
        StrainUnit::Strain => 1.0,
    };
    let poisson = parse::number(&args.poisson).map_err(|e| ArgError::new("--poisson", e))?;
    let rosette = Rosette {
        angles_deg,
        strains: readings.map(|e| e * factor),
        modulus_pa: modulus(&args.modulus)?,
        poisson,
    };
    let solved = rosette.solve().map_err(|e| {
        use crate::mechanics::inputs::InputError;
        let arg = match e {
            InputError::Gauges(_) => "--angles",
            InputError::Modulus => "--modulus",
            InputError::Poisson(_) => "--poisson",
            _ => "--strains",
        };
        ArgError::new(arg, e)
    })?;
    let micro = |e: f64| clean(e * 1e6);
    let input = StressInput {
        tensor: solved.stress,
        unit: args.unit,
        convention: SignConvention::TensionPositive,
    };
    let json = RosetteJson {
        strain_unit: "microstrain",
        epsilon_x: micro(solved.strains[0]),
        epsilon_y: micro(solved.strains[1]),
        gamma_xy: micro(solved.strains[2]),
        principal_strains: solved.principal.map(micro),
        principal_angle_deg: solved.angle_deg.map(clean),
        stress: state_json(&input),
    };
    if args.json {
        let mut text = serde_json::to_string_pretty(&json).map_err(anyhow::Error::from)?;
        text.push('\n');
        return Ok(text);
    }
    let mut s = String::new();
    let _ = writeln!(
        s,
        "Rosette at {}°, {}°, {}° (plane stress at a free surface; E = {} GPa, ν = {})",
        sig(angles_deg[0], 6),
        sig(angles_deg[1], 6),
        sig(angles_deg[2], 6),
        sig(rosette.modulus_pa / 1e9, 6),
        sig(poisson, 4)
    );
    let _ = writeln!(
        s,
        "  εx {} µε, εy {} µε, γxy {} µε",
        sig(json.epsilon_x, 6),
        sig(json.epsilon_y, 6),
        sig(json.gamma_xy, 6)
    );
    let _ = writeln!(
        s,
        "  principal strains ε1 {} µε, ε2 {} µε; {}",
        sig(json.principal_strains[0], 6),
        sig(json.principal_strains[1], 6),
        json.principal_angle_deg.map_or_else(
            || "direction undefined (every direction strains alike)".to_owned(),
            |a| format!("ε1 at {}° from x (counter-clockwise)", sig(a, 5))
        )
    );
    s.push_str(&to_text(&json.stress));
    Ok(s)
}
