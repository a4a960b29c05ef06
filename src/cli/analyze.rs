//! `planewise analyze`: the stress state and, optionally, one plane, as text or JSON.

use std::fmt::Write as _;

use clap::Args;

use super::args::StrengthArgs;
use nalgebra::Vector3;
use serde::Serialize;

use super::{ArgError, CliError, PlaneArgs, StressArgs, StressInput};
use crate::mechanics::criteria::{self, Condition, Outcome};
use crate::mechanics::{Component, PlaneStress};
use crate::study::Derived;
use crate::text::format::{clean, sig, with_unit};

/// "passes", "fails" or "not-checked".
#[must_use]
pub fn outcome_key(outcome: Outcome) -> &'static str {
    match outcome {
        Outcome::Passes => "passes",
        Outcome::Fails => "fails",
        Outcome::NotChecked => "not-checked",
    }
}

/// Arguments of `planewise analyze`.
#[derive(Debug, Clone, Args)]
pub struct AnalyzeArgs {
    #[command(flatten)]
    pub stress: StressArgs,
    #[command(flatten)]
    pub plane: PlaneArgs,
    #[command(flatten)]
    pub strengths: StrengthArgs,
    /// A named plane to check as a fault, NAME=DIP/DIPDIRECTION in degrees (repeat for more).
    #[arg(long, value_name = "NAME=DIP/DIPDIR", allow_hyphen_values = true)]
    pub fault: Vec<String>,
    /// A named fault by strike and dip with the right-hand rule, NAME=STRIKE/DIP (dip direction
    /// = strike + 90°; repeat for more).
    #[arg(long, value_name = "NAME=STRIKE/DIP", allow_hyphen_values = true)]
    pub fault_strike: Vec<String>,
    /// Print one JSON object instead of the table.
    #[arg(long)]
    pub json: bool,
}

/// The JSON contract of `planewise analyze --json`: every stress in the input unit and chosen
/// convention; undefined values are null.
#[derive(Debug, Serialize)]
pub struct AnalyzeJson {
    pub unit: String,
    pub convention: String,
    pub stress: StressJson,
    pub principal: PrincipalJson,
    pub invariants: InvariantsJson,
    pub mean_stress: f64,
    pub von_mises: f64,
    pub tresca: f64,
    pub max_shear: f64,
    /// The normals of the planes of largest shear, (n1 ± n3)/√2; null for a state without shear
    /// (hydrostatic: every plane carries the same stress and no shear).
    pub max_shear_normals: Option<[[f64; 3]; 2]>,
    pub octahedral: OctahedralJson,
    pub lode_angle_deg: Option<f64>,
    pub triaxiality: Option<f64>,
    /// For a plane-stress state (σzz = σyz = σzx = 0): the in-plane principal stresses and the
    /// angle of the larger from x (counter-clockwise, tension positive; null when equal).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub in_plane: Option<InPlaneJson>,
    /// Every criterion under proportional loading, in a fixed order; see [`CriterionJson`].
    pub criteria: Vec<CriterionJson>,
    /// The failing or most utilized criterion, if any was checked.
    pub governing_criterion: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub plane: Option<PlaneJson>,
    /// With --fault / --fault-strike (or the project's faults): each named plane's fault
    /// check, highest slip tendency first (planes with no frictional capacity first of all).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub faults: Vec<NamedFaultJson>,
    /// With --project: the file and the load case or combination.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub project: Option<ProjectRefJson>,
    /// With --project: the values the command line set over the project's (argument names).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub from_command_line: Vec<String>,
    /// The pore pressure (compression positive) the checks use; null when none is given.
    pub pore_pressure: Option<f64>,
    /// Whose c and φ the Coulomb checks of planes use: "planes" (their own) or "material";
    /// null when neither is given (those checks are not checked).
    pub plane_strength_from: Option<crate::study::model::PlaneStrengthSource>,
    /// What each safety measure means.
    pub definitions: DefinitionsJson,
}

/// Where the state came from.
#[derive(Debug, Serialize)]
pub struct ProjectRefJson {
    pub file: String,
    pub case: String,
}

/// The definitions of the safety measures, as printed beside them.
#[derive(Debug, Serialize)]
pub struct DefinitionsJson {
    pub factor_of_safety: &'static str,
    pub strength_reduction_factor: &'static str,
    pub mobilized_friction_angle: &'static str,
}

impl Default for DefinitionsJson {
    fn default() -> Self {
        use criteria::definitions::{MOBILIZED, PROPORTIONAL, REDUCTION};
        Self {
            factor_of_safety: PROPORTIONAL,
            strength_reduction_factor: REDUCTION,
            mobilized_friction_angle: MOBILIZED,
        }
    }
}

/// One named fault.
#[derive(Debug, Serialize)]
pub struct NamedFaultJson {
    pub name: String,
    pub dip_deg: f64,
    pub dip_direction_deg: f64,
    #[serde(flatten)]
    pub check: FaultJson,
}

/// In-plane principal stresses of a plane-stress state.
#[derive(Debug, Serialize)]
pub struct InPlaneJson {
    /// The larger and smaller in-plane principal stress (in the chosen convention's sign).
    pub values: [f64; 2],
    /// Angle of the larger tension-positive one from x, counter-clockwise, degrees.
    pub angle_deg: Option<f64>,
}

/// One criterion: demand and strength in the stress unit, utilization = demand / strength and
/// factor of safety = strength / demand (the factor on every stress component that reaches the
/// criterion's surface); null with a `condition` where not defined.
#[derive(Debug, Serialize)]
pub struct CriterionJson {
    pub name: String,
    pub governing_stress: Option<f64>,
    pub strength: Option<f64>,
    pub utilization: Option<f64>,
    pub factor_of_safety: Option<f64>,
    /// "defined", "not-checked", "never-reaches" or "fails-at-any-scale".
    pub condition: Condition,
    /// "passes", "fails" or "not-checked".
    pub outcome: String,
    pub note: String,
    /// The stress judged: total, effective (σ′ = σ + p·I) or unaffected by the pore pressure.
    pub stress_basis: String,
    /// Mohr–Coulomb and Drucker–Prager: c and tan φ divided by this reach the surface.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub strength_reduction_factor: Option<f64>,
    /// Mohr–Coulomb and Drucker–Prager: atan(tan φ / F), degrees.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub mobilized_friction_angle_deg: Option<f64>,
    /// Mohr–Coulomb and Drucker–Prager: how the strength-reduction factor reads.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub strength_reduction_condition: Option<Condition>,
}

/// The plane as a fault (compression-positive effective stress σn′ = σn − p).
#[derive(Debug, Serialize)]
pub struct FaultJson {
    pub pore_pressure: f64,
    pub effective_normal_stress: f64,
    pub shear_stress: f64,
    pub slip_tendency: Option<f64>,
    pub slip_tendency_condition: Condition,
    pub dilation_tendency: Option<f64>,
    /// τ / (c + σn′ tan φ) with the planes' c and φ; null when not checked.
    pub mohr_coulomb_utilization: Option<f64>,
    /// "not checked: needs the planes' cohesion and friction angle" when they are not given.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub coulomb_not_checked: Option<String>,
    /// The Coulomb check's factor of safety under proportional loading (σ and p scaled).
    pub coulomb_factor_of_safety: Option<f64>,
    /// (c + σn′ tan φ) / τ: c and tan φ divided by this bring the plane to slip.
    pub coulomb_strength_reduction_factor: Option<f64>,
    /// atan(tan φ / F), degrees.
    pub coulomb_mobilized_friction_angle_deg: Option<f64>,
    /// The pore-pressure increase that brings the plane to slip (negative: already beyond).
    pub pore_pressure_to_slip: Option<f64>,
    pub rake_deg: Option<f64>,
}

/// The six components.
#[derive(Debug, Serialize)]
pub struct StressJson {
    pub xx: f64,
    pub yy: f64,
    pub zz: f64,
    pub xy: f64,
    pub yz: f64,
    pub zx: f64,
}

/// σ1 ≥ σ2 ≥ σ3 and their unit directions (right-handed).
#[derive(Debug, Serialize)]
pub struct PrincipalJson {
    pub values: [f64; 3],
    pub directions: [[f64; 3]; 3],
    /// When two principal values differ by less than 1e-6 of the state's magnitude: their
    /// directions are ill-determined (any pair in their plane is as good).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub note: Option<String>,
}

/// I1 (unit), I2 (unit²), I3 (unit³), J2 (unit²), J3 (unit³).
#[derive(Debug, Serialize)]
pub struct InvariantsJson {
    pub i1: f64,
    pub i2: f64,
    pub i3: f64,
    pub j2: f64,
    pub j3: f64,
}

/// Octahedral normal and shear stress.
#[derive(Debug, Serialize)]
pub struct OctahedralJson {
    pub normal: f64,
    pub shear: f64,
}

/// The stress on the requested plane.
#[derive(Debug, Serialize)]
pub struct PlaneJson {
    pub normal: [f64; 3],
    pub traction: [f64; 3],
    pub normal_stress: f64,
    pub shear_stress: f64,
    /// Unit direction of the shear traction exerted on the material behind the plane by the
    /// material the normal points into (tension-positive physics, whatever the convention).
    pub shear_direction: Option<[f64; 3]>,
    /// Rake of the hanging wall's slip in the plane (Aki & Richards), degrees; null when the
    /// shear is negligible or the plane is horizontal.
    pub rake_deg: Option<f64>,
    /// With --pore-pressure or --cohesion: the plane as a fault.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub fault: Option<FaultJson>,
}

/// A unit vector's components, round-off below 1e-9 printed as 0.
fn arr(v: &Vector3<f64>) -> [f64; 3] {
    [v.x, v.y, v.z].map(|c| crate::text::format::clean_relative(c, 1.0))
}

/// The note on nearly repeated principal values `[σ1, σ2, σ3]` (Pa), if any.
fn repeated_note(values: [f64; 3]) -> Option<String> {
    let scale = values[0].abs().max(values[2].abs());
    let close = |a: f64, b: f64| (a - b).abs() <= 1e-6 * scale;
    let which = match (close(values[0], values[1]), close(values[1], values[2])) {
        (true, true) => {
            "σ1, σ2 and σ3 are equal (to 1e-6 of the magnitude): every direction is principal"
        }
        (true, false) => {
            "σ1 and σ2 differ by less than 1e-6 of the magnitude: their directions are ill-determined (any pair in their plane)"
        }
        (false, true) => {
            "σ2 and σ3 differ by less than 1e-6 of the magnitude: their directions are ill-determined (any pair in their plane)"
        }
        (false, false) => return None,
    };
    (scale > 0.0).then(|| which.to_owned())
}

fn fault_json(
    f: &criteria::FaultCheck,
    pore_pressure_pa: f64,
    st: &impl Fn(f64) -> f64,
) -> FaultJson {
    FaultJson {
        pore_pressure: st(pore_pressure_pa),
        effective_normal_stress: st(f.effective_normal_stress_pa),
        shear_stress: st(f.shear_stress_pa),
        slip_tendency: f.slip_tendency.utilization.map(clean),
        slip_tendency_condition: f.slip_tendency.condition,
        dilation_tendency: f.dilation_tendency.utilization.map(clean),
        mohr_coulomb_utilization: f.mohr_coulomb.and_then(|c| c.utilization).map(clean),
        coulomb_not_checked: f.mohr_coulomb.is_none().then(|| {
            format!(
                "not checked: needs {}",
                crate::study::MeasureChoice::PLANE_STRENGTH_NEEDED
            )
        }),
        coulomb_factor_of_safety: f
            .coulomb_proportional
            .and_then(|c| c.factor_of_safety())
            .map(clean),
        coulomb_strength_reduction_factor: f.coulomb_reduction.and_then(|r| r.factor).map(clean),
        coulomb_mobilized_friction_angle_deg: f
            .coulomb_reduction
            .and_then(|r| r.mobilized_friction_deg)
            .map(clean),
        pore_pressure_to_slip: f.pore_pressure_to_slip_pa.map(st),
        rake_deg: f.rake_deg.map(clean),
    }
}

/// `NAME=A/B` → (name, a, b).
fn named_pair(arg: &'static str, text: &str) -> Result<(String, f64, f64), ArgError> {
    let bad = || ArgError::new(arg, format!("'{text}' is not NAME=NUMBER/NUMBER"));
    let (name, pair) = text.rsplit_once('=').ok_or_else(bad)?;
    let (a, b) = pair.split_once('/').ok_or_else(bad)?;
    let number = |t: &str| {
        crate::text::parse::number(t).map_err(|e| ArgError::new(arg, format!("{name}: {e}")))
    };
    let name = name.trim();
    if name.is_empty() {
        return Err(bad());
    }
    Ok((name.to_owned(), number(a)?, number(b)?))
}

/// The faults given with --fault and --fault-strike.
pub fn read_faults(
    dip: &[String],
    strike: &[String],
) -> Result<Vec<crate::study::FaultPlane>, ArgError> {
    let mut out = Vec::new();
    for text in dip {
        let (name, dip_deg, dip_direction_deg) = named_pair("--fault", text)?;
        out.push(crate::study::FaultPlane {
            unknown: crate::study::unknown::UnknownKeys::new(),
            name,
            dip_deg,
            dip_direction_deg,
        });
    }
    for text in strike {
        let (name, strike_deg, dip_deg) = named_pair("--fault-strike", text)?;
        out.push(crate::study::FaultPlane {
            unknown: crate::study::unknown::UnknownKeys::new(),
            name,
            dip_deg,
            dip_direction_deg: (strike_deg + 90.0).rem_euclid(360.0),
        });
    }
    for f in &out {
        f.normal().map_err(|e| {
            ArgError::new(
                if dip.is_empty() {
                    "--fault-strike"
                } else {
                    "--fault"
                },
                e,
            )
        })?;
    }
    Ok(out)
}

/// What of the study `analyze` prints besides the state.
#[derive(Debug, Clone, Default)]
pub struct Shown {
    /// Print the cut plane's section.
    pub plane: bool,
    /// Print the cut plane's fault check (a pore pressure or the planes' c and φ is given).
    pub fault: bool,
    /// With --project: the file and case.
    pub project: Option<(String, String)>,
    /// The values the command line set over the project's.
    pub from_command_line: Vec<String>,
}

/// The JSON object of the study's shown state: every number from [`Derived`], the one result
/// model the window, the report and the envelope read too.
#[must_use]
pub fn to_json(d: &Derived, shown: &Shown) -> AnalyzeJson {
    let u = d.unit.pascals();
    let sign = d.convention.sign();
    let a = &d.analysis;
    let tensor = &d.tensor;
    // Every number through `clean`: a value typed in psi comes back as typed.
    let scale = a.principal.values_pa[0]
        .abs()
        .max(a.principal.values_pa[2].abs())
        .max(tensor.max_abs_component_pa());
    // Round-off below 1e-9 of the state's magnitude prints as 0 (no −7.85e-17, no −0).
    let st = |pa: f64| crate::text::format::clean_relative(pa, scale) / u;
    let st = |pa: f64| clean(st(pa));
    let power =
        |v: f64, k: i32| clean(crate::text::format::clean_relative(v, scale.powi(k)) / u.powi(k));
    let c = tensor.components_pa().map(|v| st(sign * v));
    let inv = &a.invariants;
    // `d.verdicts` is governing first; the JSON lists criteria in their fixed order.
    let mut verdicts = d.verdicts.clone();
    verdicts.sort_by_key(|v| {
        criteria::Criterion::ALL
            .iter()
            .position(|c| *c == v.criterion)
    });
    let governing = d
        .verdicts
        .first()
        .filter(|v| v.outcome() != Outcome::NotChecked)
        .map(|v| v.criterion.key().to_owned());
    let p = d.measure.pore_pressure_pa;
    AnalyzeJson {
        unit: d.unit.symbol().to_owned(),
        convention: d.convention.key().to_owned(),
        stress: StressJson {
            xx: c[0],
            yy: c[1],
            zz: c[2],
            xy: c[3],
            yz: c[4],
            zx: c[5],
        },
        principal: PrincipalJson {
            values: a.principal.values_pa.map(st),
            directions: a.principal.directions.map(|d| arr(&d)),
            note: repeated_note(a.principal.values_pa),
        },
        invariants: InvariantsJson {
            i1: st(inv.i1),
            i2: power(inv.i2, 2),
            i3: power(inv.i3, 3),
            j2: power(inv.j2, 2),
            j3: power(inv.j3, 3),
        },
        mean_stress: st(a.mean_stress_pa),
        von_mises: st(a.von_mises_pa),
        tresca: st(a.tresca_pa),
        max_shear: st(a.max_shear_pa),
        max_shear_normals: (a.max_shear_pa > criteria::RELATIVE_TOLERANCE * scale)
            .then(|| a.max_shear_normals.map(|n| arr(&n))),
        octahedral: OctahedralJson {
            normal: st(a.octahedral_normal_pa),
            shear: st(a.octahedral_shear_pa),
        },
        lode_angle_deg: a.lode_angle_deg.map(clean),
        triaxiality: a.triaxiality.map(clean),
        in_plane: {
            let [xx, yy, zz, xy, yz, zx] = tensor.components_pa();
            let tol = criteria::RELATIVE_TOLERANCE * scale;
            (zz.abs() <= tol && yz.abs() <= tol && zx.abs() <= tol).then(|| {
                let (a, b, angle) = crate::mechanics::inputs::in_plane_principal(xx, yy, xy);
                let mut values = [st(sign * a), st(sign * b)];
                values.sort_by(|p, q| q.total_cmp(p));
                InPlaneJson {
                    values,
                    angle_deg: angle.map(clean),
                }
            })
        },
        criteria: verdicts
            .iter()
            .map(|v| CriterionJson {
                name: v.criterion.key().to_owned(),
                governing_stress: v.governing_stress_pa.map(st),
                strength: v.strength_pa.map(st),
                utilization: v.utilization.map(clean),
                factor_of_safety: v.factor_of_safety.map(clean),
                condition: v.condition,
                outcome: outcome_key(v.outcome()).to_owned(),
                note: v.note.clone(),
                stress_basis: v.basis.text(d.unit),
                strength_reduction_factor: v.reduction.and_then(|r| r.factor).map(clean),
                mobilized_friction_angle_deg: v
                    .reduction
                    .and_then(|r| r.mobilized_friction_deg)
                    .map(clean),
                strength_reduction_condition: v.reduction.map(|r| r.condition),
            })
            .collect(),
        governing_criterion: governing,
        faults: {
            let mut rows: Vec<(crate::study::envelope::RankKey, NamedFaultJson)> = d
                .faults
                .iter()
                .filter_map(|(f, check)| {
                    let c = check.as_ref()?;
                    let key = crate::study::envelope::RankKey::new(
                        crate::study::EnvelopeMeasure::Plane(
                            crate::mechanics::search::Measure::SlipTendency,
                        ),
                        c.slip_tendency.utilization,
                        c.slip_tendency.condition,
                    );
                    Some((
                        key,
                        NamedFaultJson {
                            name: f.name.clone(),
                            dip_deg: clean(f.dip_deg),
                            dip_direction_deg: clean(f.dip_direction_deg),
                            check: fault_json(c, p, &st),
                        },
                    ))
                })
                .collect();
            rows.sort_by_key(|r| std::cmp::Reverse(r.0));
            rows.into_iter().map(|(_, r)| r).collect()
        },
        plane: shown.plane.then(|| {
            let n = d.plane;
            let ps = PlaneStress::new(tensor, n, d.convention);
            PlaneJson {
                normal: arr(&n.vector()),
                traction: arr(&(ps.traction_pa / u)),
                normal_stress: st(ps.normal_stress_pa),
                shear_stress: st(ps.shear_stress_pa),
                shear_direction: ps.shear_direction.map(|d| arr(&d)),
                rake_deg: ps.rake_deg().map(clean),
                fault: shown
                    .fault
                    .then_some(d.fault.as_ref())
                    .flatten()
                    .map(|f| fault_json(f, p, &st)),
            }
        }),
        project: shown.project.as_ref().map(|(file, case)| ProjectRefJson {
            file: file.clone(),
            case: case.clone(),
        }),
        from_command_line: shown.from_command_line.clone(),
        pore_pressure: (p != 0.0).then(|| st(p)),
        plane_strength_from: d.plane_strength_from,
        definitions: DefinitionsJson::default(),
    }
}

/// A project of one load case holding `input`'s tensor (typed in pascals, so nothing is lost to
/// a unit round trip), shown in its unit and convention, with nothing to check it against: the
/// study behind `analyze --stress` and `rosette`.
#[must_use]
pub fn ad_hoc_project(input: &StressInput) -> crate::study::Project {
    let mut project = crate::study::Project::new("command line", input.unit, input.convention);
    project.cases.push(crate::study::LoadCase {
        unknown: crate::study::unknown::UnknownKeys::new(),
        name: "state".to_owned(),
        description: String::new(),
        input: crate::study::CaseInput::Tensor(crate::study::TypedTensor {
            unit: "Pa".to_owned(),
            compression_positive: false,
            components: input.tensor.components_pa(),
        }),
    });
    project
}

/// The JSON of a state alone (no plane, no material): `rosette` prints this.
#[must_use]
pub fn state_json(input: &StressInput) -> AnalyzeJson {
    to_json(&Derived::new(&ad_hoc_project(input)), &Shown::default())
}

/// Slip tendency as printed: the number, or why there is none.
fn slip_text(f: &FaultJson) -> String {
    match (f.slip_tendency, f.slip_tendency_condition) {
        (Some(v), _) => sig(v, 5),
        (None, Condition::EffectiveTension) => "no capacity (σn′ ≤ 0)".to_owned(),
        _ => "undefined".to_owned(),
    }
}

fn vec_text(v: &[f64; 3]) -> String {
    format!("({}, {}, {})", sig(v[0], 6), sig(v[1], 6), sig(v[2], 6))
}

/// The readable table.
#[must_use]
pub fn to_text(j: &AnalyzeJson) -> String {
    let u = j.unit.as_str();
    let mut s = String::new();
    if let Some(p) = &j.project {
        let _ = writeln!(s, "Project {}, {}", p.file, p.case);
        if !j.from_command_line.is_empty() {
            let _ = writeln!(
                s,
                "  from the command line (over the project's values): {}",
                j.from_command_line.join(", ")
            );
        }
    }
    let _ = writeln!(
        s,
        "Stress state ({u}, {}; x, y, z right-handed)",
        j.convention
    );
    let c = [
        j.stress.xx,
        j.stress.yy,
        j.stress.zz,
        j.stress.xy,
        j.stress.yz,
        j.stress.zx,
    ];
    for (comp, v) in Component::ALL.iter().zip(c) {
        let _ = writeln!(s, "  σ{:<22} {}", comp.key(), with_unit(Some(v), u));
    }
    let _ = writeln!(s, "Principal stresses (σ1 ≥ σ2 ≥ σ3) and unit directions");
    for (i, (v, d)) in j
        .principal
        .values
        .iter()
        .zip(&j.principal.directions)
        .enumerate()
    {
        let _ = writeln!(
            s,
            "  σ{:<22} {:<18} n{} = {}",
            i + 1,
            with_unit(Some(*v), u),
            i + 1,
            vec_text(d)
        );
    }
    if let Some(note) = &j.principal.note {
        let _ = writeln!(s, "  note: {note}");
    }
    let rows: [(&str, String); 13] = [
        ("I1", with_unit(Some(j.invariants.i1), u)),
        ("I2", with_unit(Some(j.invariants.i2), &format!("{u}²"))),
        ("I3", with_unit(Some(j.invariants.i3), &format!("{u}³"))),
        ("J2", with_unit(Some(j.invariants.j2), &format!("{u}²"))),
        ("J3", with_unit(Some(j.invariants.j3), &format!("{u}³"))),
        ("mean stress", with_unit(Some(j.mean_stress), u)),
        ("von Mises", with_unit(Some(j.von_mises), u)),
        ("Tresca (σ1 − σ3)", with_unit(Some(j.tresca), u)),
        ("max shear", with_unit(Some(j.max_shear), u)),
        ("octahedral normal", with_unit(Some(j.octahedral.normal), u)),
        ("octahedral shear", with_unit(Some(j.octahedral.shear), u)),
        ("Lode angle", with_unit(j.lode_angle_deg, "°")),
        (
            "triaxiality",
            j.triaxiality
                .map_or_else(|| "undefined".to_owned(), |t| sig(t, 6)),
        ),
    ];
    let _ = writeln!(s, "Invariants and equivalent stresses");
    for (name, value) in rows {
        let _ = writeln!(s, "  {name:<23} {value}");
    }
    match &j.max_shear_normals {
        Some([a, b]) => {
            let _ = writeln!(
                s,
                "  max-shear plane normals {} and {}",
                vec_text(a),
                vec_text(b)
            );
        }
        None => {
            let _ = writeln!(
                s,
                "  max-shear planes        none: no plane carries shear (hydrostatic state)"
            );
        }
    }
    if let Some(p) = &j.in_plane {
        let _ = writeln!(
            s,
            "  {:<23} {} and {}; {}",
            "in-plane principal",
            with_unit(Some(p.values[0]), u),
            with_unit(Some(p.values[1]), u),
            p.angle_deg.map_or_else(
                || "direction undefined (equal in the plane)".to_owned(),
                |a| format!("the larger (tension positive) at {}° from x", sig(a, 5))
            )
        );
    }
    let _ = writeln!(
        s,
        "Criteria (proportional loading: factor of safety = the factor on every stress that reaches the surface; utilization = 1 / factor)"
    );
    if let Some(p) = j.pore_pressure {
        let _ = writeln!(
            s,
            "  pore pressure p = {}: Rankine, Mohr–Coulomb and Drucker–Prager on effective stress σ′ = σ + p·I (tension positive); von Mises and Tresca unaffected",
            with_unit(Some(p), u)
        );
    }
    for c in &j.criteria {
        let numbers = match (c.utilization, c.factor_of_safety) {
            (Some(u), Some(f)) => format!("U = {}, factor of safety {}", sig(u, 4), sig(f, 4)),
            (Some(u), None) => format!("U = {}, no stress to scale", sig(u, 4)),
            _ => match c.condition {
                Condition::NeverReaches => "never reaches the surface when scaled".to_owned(),
                Condition::FailsAtAnyScale => {
                    "outside the surface at any scale (zero strength)".to_owned()
                }
                _ => String::new(),
            },
        };
        let demand = match (c.governing_stress, c.strength) {
            (Some(d), Some(f)) => {
                format!(" ({} vs {})", with_unit(Some(d), u), with_unit(Some(f), u))
            }
            _ => String::new(),
        };
        let note = if c.note.is_empty() {
            String::new()
        } else {
            format!("; {}", c.note)
        };
        let _ = writeln!(
            s,
            "  {:<23} {:<11} {numbers}{demand}{note}",
            c.name, c.outcome
        );
        if let Some(condition) = c.strength_reduction_condition {
            let reduction = match (c.strength_reduction_factor, c.mobilized_friction_angle_deg) {
                (Some(f), Some(phi)) => format!(
                    "strength-reduction factor {} (c and tan φ divided by it reach the surface), mobilized friction angle {}°",
                    sig(f, 4),
                    sig(phi, 4)
                ),
                _ => format!(
                    "strength-reduction factor: {}",
                    crate::study::envelope::reduction_text(condition)
                ),
            };
            let _ = writeln!(s, "  {:<23} {:<11} {reduction}", "", "");
        }
    }
    if let Some(p) = &j.plane {
        let _ = writeln!(s, "Plane with unit normal {}", vec_text(&p.normal));
        let _ = writeln!(
            s,
            "  {:<23} {} {u}",
            "traction t = σ·n",
            vec_text(&p.traction)
        );
        let _ = writeln!(
            s,
            "  {:<23} {}",
            "normal stress",
            with_unit(Some(p.normal_stress), u)
        );
        let _ = writeln!(
            s,
            "  {:<23} {}",
            "shear stress",
            with_unit(Some(p.shear_stress), u)
        );
        let dir = p
            .shear_direction
            .as_ref()
            .map_or_else(|| "undefined (no shear)".to_owned(), vec_text);
        let _ = writeln!(s, "  {:<23} {dir}", "shear direction");
        let rake = p.rake_deg.map_or_else(
            || "undefined (no shear, or a horizontal plane)".to_owned(),
            |r| format!("{}°", sig(r, 5)),
        );
        let _ = writeln!(s, "  {:<23} {rake}", "rake");
        let _ = writeln!(
            s,
            "  (shear direction: the shear on the material behind the plane from the material n points into, tension-positive physics; rake: the hanging wall's slip from strike, Aki & Richards, reverse +90°)"
        );
        if let Some(f) = &p.fault {
            let ratio = |v: Option<f64>| v.map_or_else(|| "undefined".to_owned(), |x| sig(x, 5));
            let _ = writeln!(
                s,
                "Fault check (compression positive, σn′ = σn − p, p = {}; Coulomb with {})",
                with_unit(Some(f.pore_pressure), u),
                j.plane_strength_from.map_or(
                    "no c and φ given",
                    crate::study::model::PlaneStrengthSource::text
                )
            );
            let _ = writeln!(
                s,
                "  ({}; {})",
                j.definitions.factor_of_safety, j.definitions.strength_reduction_factor
            );
            let _ = writeln!(
                s,
                "  {:<23} {}",
                "effective normal σn′",
                with_unit(Some(f.effective_normal_stress), u)
            );
            let _ = writeln!(s, "  {:<23} {}", "slip tendency τ/σn′", slip_text(f));
            let _ = writeln!(
                s,
                "  {:<23} {}",
                "dilation tendency",
                ratio(f.dilation_tendency)
            );
            if let Some(why) = &f.coulomb_not_checked {
                let _ = writeln!(s, "  {:<23} {why}", "Coulomb check");
            } else {
                let _ = writeln!(
                    s,
                    "  {:<23} {}",
                    "Coulomb U τ/(c+σn′tanφ)",
                    ratio(f.mohr_coulomb_utilization)
                );
                let _ = writeln!(
                    s,
                    "  {:<23} {} (proportional loading, σ and p scaled)",
                    "factor of safety",
                    ratio(f.coulomb_factor_of_safety)
                );
                let _ = writeln!(
                    s,
                    "  {:<23} {} (c and tan φ divided by it reach slip); mobilized φ {}",
                    "strength reduction",
                    ratio(f.coulomb_strength_reduction_factor),
                    f.coulomb_mobilized_friction_angle_deg
                        .map_or_else(|| "undefined".to_owned(), |a| format!("{}°", sig(a, 5)))
                );
                let _ = writeln!(
                    s,
                    "  {:<23} {}",
                    "Δp to slip",
                    with_unit(f.pore_pressure_to_slip, u)
                );
            }
        }
    }
    if !j.faults.is_empty() {
        let _ = writeln!(
            s,
            "Faults (compression positive, σn′ = σn − p), highest slip tendency first; rake of the hanging wall's slip (Aki & Richards)"
        );
        if let Some(why) = j
            .faults
            .first()
            .and_then(|f| f.check.coulomb_not_checked.as_ref())
        {
            let _ = writeln!(s, "  Coulomb check {why}");
        }
        let ratio = |v: Option<f64>| v.map_or_else(|| "undefined".to_owned(), |x| sig(x, 4));
        for f in &j.faults {
            let coulomb = if f.check.coulomb_not_checked.is_some() {
                "U not checked".to_owned()
            } else {
                format!(
                    "U {:<9} Δp {}",
                    ratio(f.check.mohr_coulomb_utilization),
                    with_unit(f.check.pore_pressure_to_slip, u)
                )
            };
            let _ = writeln!(
                s,
                "  {:<12} dip {:>5}° / {:>6}°  σn′ {:<14} τ {:<14} Ts {:<9} Td {:<9} rake {:<9} {coulomb}",
                f.name,
                sig(f.dip_deg, 4),
                sig(f.dip_direction_deg, 5),
                with_unit(Some(f.check.effective_normal_stress), u),
                with_unit(Some(f.check.shear_stress), u),
                slip_text(&f.check),
                ratio(f.check.dilation_tendency),
                with_unit(f.check.rake_deg, "°"),
            );
        }
    }
    s
}

/// The study `analyze` reads: the project's (with --project), with what the command line sets
/// over it, or one made of the command line's state and checks.
fn study(args: &AnalyzeArgs) -> Result<(crate::study::Project, Shown), ArgError> {
    let plane = args.plane.read()?;
    let faults = read_faults(&args.fault, &args.fault_strike)?;
    let mut from_command_line: Vec<String> = Vec::new();
    let (mut project, project_ref) = if let (Some(file), Some(case)) =
        (&args.stress.project, &args.stress.case)
    {
        if args.stress.stress.is_some() || args.stress.other.any() {
            return Err(ArgError::new(
                "--project",
                "takes the state from the file: give --stress, --in-situ or --principal without it",
            ));
        }
        let (mut project, _) =
            crate::study::load(file).map_err(|e| ArgError::new("--project", e))?;
        if !project.name_used(case) {
            return Err(super::no_such_case(&project, case));
        }
        case.clone_into(&mut project.active);
        if let Some(unit) = args.stress.unit {
            unit.symbol().clone_into(&mut project.unit);
            from_command_line.push("--unit".to_owned());
        }
        if args.stress.compression_positive {
            project.compression_positive = true;
            from_command_line.push("--compression-positive".to_owned());
        }
        (project, Some((file.display().to_string(), case.clone())))
    } else {
        let input = args.stress.read()?;
        (ad_hoc_project(&input), None)
    };
    let unit = project.unit().map_err(|e| ArgError::new("--project", e))?;
    let has_plane = plane.is_some() || project_ref.is_some();
    let (strengths, pore_pressure_pa) = args.strengths.read(
        unit,
        has_plane || !faults.is_empty() || !project.faults.is_empty(),
    )?;
    // Each given value replaces the project's; --cohesion and --friction-angle are the
    // material's and the planes' alike (one strength set typed once).
    let given = &args.strengths;
    let m = &mut project.material.strengths;
    for (text, target, value, name) in [
        (
            &given.yield_strength,
            &mut m.yield_strength_pa,
            strengths.yield_strength_pa,
            "--yield-strength",
        ),
        (
            &given.tensile_strength,
            &mut m.tensile_strength_pa,
            strengths.tensile_strength_pa,
            "--tensile-strength",
        ),
        (
            &given.compressive_strength,
            &mut m.compressive_strength_pa,
            strengths.compressive_strength_pa,
            "--compressive-strength",
        ),
        (
            &given.cohesion,
            &mut m.cohesion_pa,
            strengths.cohesion_pa,
            "--cohesion",
        ),
    ] {
        if text.is_some() {
            *target = value;
            from_command_line.push(name.to_owned());
        }
    }
    if given.friction_angle.is_some() || given.friction_coefficient.is_some() {
        m.friction_angle_deg = strengths.friction_angle_deg;
        from_command_line.push(if given.friction_angle.is_some() {
            "--friction-angle".to_owned()
        } else {
            "--friction-coefficient".to_owned()
        });
    }
    if let Some(fit) = given.dp_fit {
        m.dp_fit = fit;
        from_command_line.push("--dp-fit".to_owned());
    }
    if given.cohesion.is_some() {
        project.measure.cohesion_pa = strengths.cohesion_pa;
        project.measure.friction_angle_deg = strengths.friction_angle_deg;
    }
    if let Some(p) = pore_pressure_pa {
        project.measure.pore_pressure_pa = p;
        from_command_line.push("--pore-pressure".to_owned());
    }
    if let Some(n) = plane {
        project.plane = n;
        from_command_line.push(if args.plane.normal.is_some() {
            "--normal".to_owned()
        } else {
            "--dip/--dip-direction".to_owned()
        });
    }
    if !faults.is_empty() {
        project.faults = faults;
        from_command_line.push("--fault/--fault-strike".to_owned());
    }
    let fault = pore_pressure_pa.is_some()
        || project.measure.pore_pressure_pa != 0.0
        || project.plane_strength().is_some();
    if project_ref.is_none() {
        // Without a project nothing overrides anything.
        from_command_line.clear();
    }
    Ok((
        project,
        Shown {
            plane: has_plane,
            fault,
            project: project_ref,
            from_command_line,
        },
    ))
}

/// Runs the subcommand.
pub fn run(args: &AnalyzeArgs) -> Result<String, CliError> {
    let (project, shown) = study(args)?;
    let d = Derived::new(&project);
    if let Some(problem) = &d.problem {
        return Err(ArgError::new("--project", problem).into());
    }
    let json = to_json(&d, &shown);
    if args.json {
        let mut text = serde_json::to_string_pretty(&json).map_err(anyhow::Error::from)?;
        text.push('\n');
        Ok(text)
    } else {
        Ok(to_text(&json))
    }
}
