//! `planewise envelope`: one measure over every load case and combination of a project, sorted
//! worst first, with the governing one named.

use std::fmt::Write as _;
use std::path::PathBuf;

use clap::Args;
use serde::Serialize;

use super::worst_plane::MaterialArgs;
use super::{ArgError, CliError};
use crate::format::{clean, sig};
use crate::mechanics::search::{SearchSettings, WorstCondition};
use crate::study::{self, EnvelopeMeasure};

/// Arguments of `planewise envelope`.
#[derive(Debug, Clone, Args)]
pub struct EnvelopeArgs {
    /// The project file.
    #[arg(long, value_name = "FILE")]
    pub project: PathBuf,
    /// An equivalent or principal stress, or a worst-plane measure (its worst value over every
    /// plane).
    #[arg(long, value_name = "MEASURE")]
    pub measure: EnvelopeMeasure,
    #[command(flatten)]
    pub material: MaterialArgs,
    /// Print one JSON object instead of the table.
    #[arg(long)]
    pub json: bool,
}

/// The JSON contract.
#[derive(Debug, Serialize)]
pub struct EnvelopeJson {
    pub measure: String,
    /// Unit of stresses (values of stress measures, planes' σn and τ).
    pub unit: String,
    pub convention: String,
    /// Worst first.
    pub rows: Vec<RowJson>,
    /// The governing case or combination (the first row); null for an empty project.
    pub governing: Option<String>,
}

/// One case or combination.
#[derive(Debug, Serialize)]
pub struct RowJson {
    pub name: String,
    /// "case" or "combination".
    pub kind: &'static str,
    /// The value (stress unit for stress measures, else dimensionless); null where undefined.
    pub value: Option<f64>,
    /// For worst-plane measures: the search's condition.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub condition: Option<WorstCondition>,
    /// For worst-plane measures: dip and dip direction of each worst plane, degrees.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub planes: Option<Vec<[f64; 2]>>,
    /// For criterion utilizations (with the project's material): "defined", "not-checked",
    /// "never-reaches" or "fails-at-any-scale".
    #[serde(skip_serializing_if = "Option::is_none")]
    pub criterion_condition: Option<crate::mechanics::criteria::Condition>,
}

/// Runs the subcommand.
pub fn run(args: &EnvelopeArgs) -> Result<String, CliError> {
    let measure = args.measure;
    let (project, _) = study::load(&args.project).map_err(|e| ArgError::new("--project", e))?;
    let unit = project.unit().map_err(|e| ArgError::new("--project", e))?;
    let convention = project.convention();
    let plane_measure = measure.plane();
    let (pore_pressure_pa, material) = args.material.read(unit, plane_measure, false)?;
    if let Some(m) = plane_measure
        && m.uses_material()
        && material.is_none()
    {
        return Err(ArgError::new(
            "--measure",
            "mohr-coulomb needs --cohesion and --friction-angle",
        )
        .into());
    }
    let settings = SearchSettings {
        measure: plane_measure.unwrap_or(crate::mechanics::search::Measure::Shear),
        convention,
        pore_pressure_pa,
        material,
    };
    let env =
        study::envelope(&project, measure, &settings).map_err(|e| ArgError::new("--project", e))?;
    let u = unit.pascals();
    let json = EnvelopeJson {
        measure: measure.key().to_owned(),
        unit: unit.symbol().to_owned(),
        convention: convention.key().to_owned(),
        rows: env
            .rows
            .iter()
            .map(|r| RowJson {
                name: r.name.clone(),
                kind: if r.combination { "combination" } else { "case" },
                value: r
                    .value
                    .map(|v| clean(if measure.is_stress() { v / u } else { v })),
                condition: r.condition,
                planes: r.condition.map(|_| {
                    r.planes
                        .iter()
                        .map(|p| [clean(p.dip_deg), clean(p.dip_direction_deg)])
                        .collect()
                }),
                criterion_condition: r.verdict,
            })
            .collect(),
        governing: env.governing.clone(),
    };
    if args.json {
        let mut text = serde_json::to_string_pretty(&json).map_err(anyhow::Error::from)?;
        text.push('\n');
        return Ok(text);
    }
    let mut s = String::new();
    let what = if measure.is_stress() {
        format!("{}, {}", json.unit, json.convention)
    } else {
        "dimensionless".to_owned()
    };
    let _ = writeln!(
        s,
        "Envelope of {} ({what}) over {} load cases and combinations, worst first",
        json.measure,
        json.rows.len()
    );
    for (i, r) in json.rows.iter().enumerate() {
        use crate::mechanics::criteria::Condition;
        let value = match (r.value, r.condition, r.criterion_condition) {
            (Some(v), ..) if measure.is_stress() => format!("{} {}", sig(v, 6), json.unit),
            (Some(v), ..) => sig(v, 6),
            (None, Some(WorstCondition::EffectiveTension), _) => {
                "undefined (no frictional capacity)".to_owned()
            }
            (None, _, Some(Condition::NotChecked)) => {
                "not checked (the project's material lacks the strengths)".to_owned()
            }
            (None, _, Some(Condition::NeverReaches)) => "never reaches the surface".to_owned(),
            (None, _, Some(Condition::FailsAtAnyScale)) => "fails at any scale".to_owned(),
            (None, ..) => "undefined".to_owned(),
        };
        let mark = if i == 0 && json.governing.is_some() {
            "  ← governs"
        } else {
            ""
        };
        let _ = writeln!(s, "  {:<16} {:<12} {value}{mark}", r.name, r.kind);
    }
    Ok(s)
}
