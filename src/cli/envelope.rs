//! `planewise envelope`: one measure over every load case and combination of a project, sorted
//! worst first, with the governing one named.

use std::fmt::Write as _;
use std::path::PathBuf;

use clap::Args;
use serde::Serialize;

use super::args::MaterialArgs;
use super::{ArgError, CliError};
use crate::mechanics::criteria::Criterion;
use crate::mechanics::search::WorstCondition;
use crate::study::{self, EnvelopeMeasure};
use crate::text::format::{clean, sig};

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
    /// The governing case or combination (the first row, when it has a number or fails at
    /// any scale); null otherwise.
    pub governing: Option<String>,
    /// How many rows stand in each condition.
    pub conditions: study::envelope::ConditionCounts,
    /// The pore pressure used (compression positive; effective stress for worst-plane measures
    /// and the pressure-sensitive criteria); null when none is given.
    pub pore_pressure: Option<f64>,
    /// The values the command line set over the project's (argument names).
    pub from_command_line: Vec<String>,
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
    /// How the value reads, whatever the measure: "defined", "fails-at-any-scale",
    /// "effective-tension" (no frictional capacity), "never-reaches", "undefined" or
    /// "not-checked". Rows are ranked by it first (see the README).
    pub standing: crate::mechanics::criteria::Condition,
}

/// The project with what the command line sets over it, and the names of those arguments.
fn with_overrides(
    args: &EnvelopeArgs,
    mut project: study::Project,
    unit: crate::mechanics::StressUnit,
) -> Result<(study::Project, Vec<String>), ArgError> {
    let mut from_command_line = Vec::new();
    let given = &args.material;
    let (pore_used, strength_used) = match args.measure {
        EnvelopeMeasure::Plane(m) => (m.uses_friction(), m.uses_material()),
        EnvelopeMeasure::Utilization(c) => (
            c != Criterion::VonMises && c != Criterion::Tresca,
            matches!(c, Criterion::MohrCoulomb | Criterion::DruckerPrager),
        ),
        _ => (false, false),
    };
    let refuse = |name: &'static str, what: &str| {
        Err(ArgError::new(
            name,
            format!(
                "applies only to {what} (the measure is {})",
                args.measure.key()
            ),
        ))
    };
    if given.pore_pressure.is_some() && !pore_used {
        return refuse(
            "--pore-pressure",
            "slip-tendency, mohr-coulomb and the utilizations of rankine, mohr-coulomb and drucker-prager",
        );
    }
    for (text, name) in [
        (&given.cohesion, "--cohesion"),
        (&given.friction_angle, "--friction-angle"),
    ] {
        if text.is_some() && !strength_used {
            return refuse(
                name,
                "mohr-coulomb and the utilizations of mohr-coulomb and drucker-prager",
            );
        }
    }
    let stress = |name: &'static str, text: &Option<String>| {
        text.as_deref()
            .map(|t| super::stress_value(name, t, unit))
            .transpose()
    };
    if let Some(p) = stress("--pore-pressure", &given.pore_pressure)? {
        project.measure.pore_pressure_pa = p;
        from_command_line.push("--pore-pressure".to_owned());
    }
    let friction = super::friction_deg(
        given.friction_angle.as_deref(),
        given.friction_coefficient.as_deref(),
    )?;
    if let Some(m) = super::args::pair_material(stress("--cohesion", &given.cohesion)?, friction)? {
        // One strength set typed once: the planes' and the material's.
        project.measure.cohesion_pa = Some(m.cohesion_pa);
        project.measure.friction_angle_deg = Some(m.friction_angle_deg);
        project.material.strengths.cohesion_pa = Some(m.cohesion_pa);
        project.material.strengths.friction_angle_deg = Some(m.friction_angle_deg);
        from_command_line.extend(["--cohesion".to_owned(), "--friction-angle".to_owned()]);
    }
    Ok((project, from_command_line))
}

/// Runs the subcommand: the project's pore pressure, planes' strength and material, with what
/// the command line sets over them.
pub fn run(args: &EnvelopeArgs) -> Result<String, CliError> {
    let measure = args.measure;
    let (project, _) = study::load(&args.project).map_err(|e| ArgError::new("--project", e))?;
    let unit = project.unit().map_err(|e| ArgError::new("--project", e))?;
    let convention = project.convention();
    let (project, from_command_line) = with_overrides(args, project, unit)?;
    let settings = project.search_settings();
    if let Some(m) = measure.plane()
        && m.uses_material()
        && settings.material.is_none()
    {
        return Err(ArgError::new(
            "--measure",
            "mohr-coulomb needs a cohesion and friction angle: the project has none for the planes or the material (set them with `planewise project set-plane-strength` or `set-material`) and no --cohesion and --friction-angle are given",
        )
        .into());
    }
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
                        .map(|p| {
                            [
                                crate::text::format::angle(p.dip_deg, false),
                                crate::text::format::angle(p.dip_direction_deg, true),
                            ]
                        })
                        .collect()
                }),
                criterion_condition: r.verdict,
                standing: r.standing(),
            })
            .collect(),
        governing: env.governing.clone(),
        conditions: env.counts,
        pore_pressure: (project.measure.pore_pressure_pa != 0.0)
            .then(|| clean(unit.from_pa(project.measure.pore_pressure_pa))),
        from_command_line,
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
    if let Some(p) = json.pore_pressure {
        let _ = writeln!(
            s,
            "  pore pressure p = {} {} (effective stress)",
            sig(p, 6),
            json.unit
        );
    }
    if !json.from_command_line.is_empty() {
        let _ = writeln!(
            s,
            "  from the command line (over the project's values): {}",
            json.from_command_line.join(", ")
        );
    }
    let _ = writeln!(s, "  {}", env.counts.text("rows"));
    // Names padded to the longest (at least 16): generated combination names are long.
    let width = json
        .rows
        .iter()
        .map(|r| r.name.chars().count())
        .max()
        .unwrap_or(0)
        .max(16);
    for (i, r) in json.rows.iter().enumerate() {
        let row = &env.rows[i];
        let value = match r.value {
            Some(v) if measure.is_stress() => format!("{} {}", sig(v, 6), json.unit),
            Some(v) => sig(v, 6),
            None => study::envelope::standing_text(row.standing()).to_owned(),
        };
        let mark = if i == 0 && json.governing.is_some() {
            "  ← governs"
        } else {
            ""
        };
        let _ = writeln!(s, "  {:<width$} {:<12} {value}{mark}", r.name, r.kind);
    }
    Ok(s)
}
