//! `planewise analyze`: the stress state and, optionally, one plane, as text or JSON.

use std::fmt::Write as _;

use clap::Args;
use nalgebra::Vector3;
use serde::Serialize;

use super::{ArgError, CliError, PlaneArgs, StressArgs, StressInput};
use crate::format::{clean, sig, with_unit};
use crate::mechanics::criteria::{self, Condition, DruckerPragerFit, Outcome, Strengths};
use crate::mechanics::{Analysis, Component, PlaneNormal, PlaneStress, StressUnit};

/// "passes", "fails" or "not-checked".
#[must_use]
pub fn outcome_key(outcome: Outcome) -> &'static str {
    match outcome {
        Outcome::Passes => "passes",
        Outcome::Fails => "fails",
        Outcome::NotChecked => "not-checked",
    }
}

/// The material for the criteria and the plane's fault check (stresses in the stress unit).
#[derive(Debug, Clone, Args)]
pub struct StrengthArgs {
    /// Yield strength f_y, for von Mises and Tresca.
    #[arg(long, value_name = "V", allow_hyphen_values = true)]
    pub yield_strength: Option<String>,
    /// Tensile strength f_t (a positive number), for Rankine.
    #[arg(long, value_name = "V", allow_hyphen_values = true)]
    pub tensile_strength: Option<String>,
    /// Compressive strength f_c (a positive number), for Rankine.
    #[arg(long, value_name = "V", allow_hyphen_values = true)]
    pub compressive_strength: Option<String>,
    /// Cohesion c, for Mohr–Coulomb, Drucker–Prager and the plane's fault check.
    #[arg(long, value_name = "C", allow_hyphen_values = true)]
    pub cohesion: Option<String>,
    /// Friction angle φ in degrees, with --cohesion.
    #[arg(long, value_name = "DEG", allow_hyphen_values = true)]
    pub friction_angle: Option<String>,
    /// How Drucker–Prager is fitted to c and φ.
    #[arg(long, value_name = "FIT")]
    pub dp_fit: Option<DruckerPragerFit>,
    /// Pore pressure p (compression positive) for the plane's fault check.
    #[arg(long, value_name = "P", allow_hyphen_values = true)]
    pub pore_pressure: Option<String>,
}

impl StrengthArgs {
    /// The strengths (Pa) and pore pressure (Pa, if given); a value nothing uses, or one out of
    /// range, is bad input naming its argument.
    pub fn read(
        &self,
        unit: StressUnit,
        plane: bool,
    ) -> Result<(Strengths, Option<f64>), ArgError> {
        let stress = |name: &'static str, text: &Option<String>| {
            text.as_deref()
                .map(|t| super::stress_value(name, t, unit))
                .transpose()
        };
        let friction = self
            .friction_angle
            .as_deref()
            .map(|t| crate::parse::number(t).map_err(|e| ArgError::new("--friction-angle", e)))
            .transpose()?;
        let strengths = Strengths {
            yield_strength_pa: stress("--yield-strength", &self.yield_strength)?,
            tensile_strength_pa: stress("--tensile-strength", &self.tensile_strength)?,
            compressive_strength_pa: stress("--compressive-strength", &self.compressive_strength)?,
            cohesion_pa: stress("--cohesion", &self.cohesion)?,
            friction_angle_deg: friction,
            dp_fit: self.dp_fit.unwrap_or_default(),
        };
        super::worst_plane::pair_material(strengths.cohesion_pa, strengths.friction_angle_deg)?;
        if self.dp_fit.is_some() && strengths.cohesion_pa.is_none() {
            return Err(ArgError::new(
                "--dp-fit",
                "applies only with --cohesion and --friction-angle",
            ));
        }
        for (value, name) in [
            (strengths.yield_strength_pa, "--yield-strength"),
            (strengths.tensile_strength_pa, "--tensile-strength"),
            (strengths.compressive_strength_pa, "--compressive-strength"),
        ] {
            if value.is_some_and(|v| v <= 0.0) {
                return Err(ArgError::new(name, "must be a positive stress"));
            }
        }
        let pore = stress("--pore-pressure", &self.pore_pressure)?;
        if pore.is_some() && !plane {
            return Err(ArgError::new(
                "--pore-pressure",
                "applies to the fault checks: give --normal (or --dip and --dip-direction) or --fault",
            ));
        }
        Ok((strengths, pore))
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
    pub max_shear_normals: [[f64; 3]; 2],
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
    /// With --fault / --fault-strike: each named plane's fault check, highest slip tendency
    /// first (planes with no frictional capacity first of all).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub faults: Vec<NamedFaultJson>,
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
    pub mohr_coulomb_utilization: Option<f64>,
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

fn arr(v: &Vector3<f64>) -> [f64; 3] {
    [v.x, v.y, v.z].map(clean)
}

/// What `analyze` checks besides the state: the material's strengths, the pore pressure for
/// the fault checks, and named faults.
#[derive(Debug, Clone, Default)]
pub struct Checks {
    /// The strengths.
    pub strengths: Strengths,
    /// The pore pressure, Pa, if given.
    pub pore_pressure_pa: Option<f64>,
    /// Named faults.
    pub faults: Vec<crate::study::FaultPlane>,
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
        pore_pressure_to_slip: f.pore_pressure_to_slip_pa.map(st),
        rake_deg: f.rake_deg.map(clean),
    }
}

/// `NAME=A/B` → (name, a, b).
fn named_pair(arg: &'static str, text: &str) -> Result<(String, f64, f64), ArgError> {
    let bad = || ArgError::new(arg, format!("'{text}' is not NAME=NUMBER/NUMBER"));
    let (name, pair) = text.rsplit_once('=').ok_or_else(bad)?;
    let (a, b) = pair.split_once('/').ok_or_else(bad)?;
    let number =
        |t: &str| crate::parse::number(t).map_err(|e| ArgError::new(arg, format!("{name}: {e}")));
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
            name,
            dip_deg,
            dip_direction_deg,
        });
    }
    for text in strike {
        let (name, strike_deg, dip_deg) = named_pair("--fault-strike", text)?;
        out.push(crate::study::FaultPlane {
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

/// Builds the JSON object for a state and optional plane.
#[must_use]
pub fn to_json(input: &StressInput, plane: Option<PlaneNormal>, checks: &Checks) -> AnalyzeJson {
    let u = input.unit.pascals();
    let sign = input.convention.sign();
    let a = Analysis::new(&input.tensor, input.convention);
    // Every number through `clean`: a value typed in psi comes back as typed.
    let st = |pa: f64| clean(pa / u);
    let c = input.tensor.components_pa().map(|v| st(sign * v));
    let inv = &a.invariants;
    let verdicts = criteria::verdicts(&input.tensor, &checks.strengths);
    let mut ordered = verdicts.clone();
    criteria::governing_first(&mut ordered);
    let governing = ordered
        .first()
        .filter(|v| v.outcome() != Outcome::NotChecked)
        .map(|v| v.criterion.key().to_owned());
    let material = checks.strengths.mohr_coulomb().and_then(Result::ok);
    let fault_wanted = checks.pore_pressure_pa.is_some() || material.is_some();
    AnalyzeJson {
        unit: input.unit.symbol().to_owned(),
        convention: input.convention.key().to_owned(),
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
        },
        invariants: InvariantsJson {
            i1: st(inv.i1),
            i2: clean(inv.i2 / (u * u)),
            i3: clean(inv.i3 / (u * u * u)),
            j2: clean(inv.j2 / (u * u)),
            j3: clean(inv.j3 / (u * u * u)),
        },
        mean_stress: st(a.mean_stress_pa),
        von_mises: st(a.von_mises_pa),
        tresca: st(a.tresca_pa),
        max_shear: st(a.max_shear_pa),
        max_shear_normals: a.max_shear_normals.map(|n| arr(&n)),
        octahedral: OctahedralJson {
            normal: st(a.octahedral_normal_pa),
            shear: st(a.octahedral_shear_pa),
        },
        lode_angle_deg: a.lode_angle_deg.map(clean),
        triaxiality: a.triaxiality.map(clean),
        in_plane: {
            let [xx, yy, zz, xy, yz, zx] = input.tensor.components_pa();
            (zz == 0.0 && yz == 0.0 && zx == 0.0).then(|| {
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
            })
            .collect(),
        governing_criterion: governing,
        faults: {
            let p = checks.pore_pressure_pa.unwrap_or(0.0);
            let mut rows: Vec<NamedFaultJson> = checks
                .faults
                .iter()
                .filter_map(|f| {
                    let n = f.normal().ok()?;
                    let c = criteria::fault_check(&input.tensor, n, p, material.as_ref()).ok()?;
                    Some(NamedFaultJson {
                        name: f.name.clone(),
                        dip_deg: clean(f.dip_deg),
                        dip_direction_deg: clean(f.dip_direction_deg),
                        check: fault_json(&c, p, &st),
                    })
                })
                .collect();
            let rank =
                |r: &NamedFaultJson| match (r.check.slip_tendency, r.check.slip_tendency_condition)
                {
                    (Some(v), _) => v,
                    (None, Condition::EffectiveTension) => f64::INFINITY,
                    (None, _) => f64::NEG_INFINITY,
                };
            rows.sort_by(|a, b| rank(b).total_cmp(&rank(a)));
            rows
        },
        plane: plane.map(|n| {
            let ps = PlaneStress::new(&input.tensor, n, input.convention);
            PlaneJson {
                normal: arr(&n.vector()),
                traction: arr(&(ps.traction_pa / u)),
                normal_stress: st(ps.normal_stress_pa),
                shear_stress: st(ps.shear_stress_pa),
                shear_direction: ps.shear_direction.map(|d| arr(&d)),
                rake_deg: ps.rake_deg().map(clean),
                fault: fault_wanted
                    .then(|| {
                        let p = checks.pore_pressure_pa.unwrap_or(0.0);
                        criteria::fault_check(&input.tensor, n, p, material.as_ref()).ok()
                    })
                    .flatten()
                    .map(|f| fault_json(&f, checks.pore_pressure_pa.unwrap_or(0.0), &st)),
            }
        }),
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
    let _ = writeln!(
        s,
        "  max-shear plane normals {} and {}",
        vec_text(&j.max_shear_normals[0]),
        vec_text(&j.max_shear_normals[1])
    );
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
                "Fault check (compression positive, σn′ = σn − p, p = {})",
                with_unit(Some(f.pore_pressure), u)
            );
            let _ = writeln!(
                s,
                "  {:<23} {}",
                "effective normal σn′",
                with_unit(Some(f.effective_normal_stress), u)
            );
            let _ = writeln!(
                s,
                "  {:<23} {}",
                "slip tendency τ/σn′",
                ratio(f.slip_tendency)
            );
            let _ = writeln!(
                s,
                "  {:<23} {}",
                "dilation tendency",
                ratio(f.dilation_tendency)
            );
            if f.mohr_coulomb_utilization.is_some() || f.pore_pressure_to_slip.is_some() {
                let _ = writeln!(
                    s,
                    "  {:<23} {}",
                    "Mohr–Coulomb U",
                    ratio(f.mohr_coulomb_utilization)
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
            "Faults (compression positive, σn′ = σn − p), highest slip tendency first"
        );
        let ratio = |v: Option<f64>| v.map_or_else(|| "undefined".to_owned(), |x| sig(x, 4));
        for f in &j.faults {
            let _ = writeln!(
                s,
                "  {:<12} dip {:>5}° / {:>6}°  σn′ {:<14} τ {:<14} Ts {:<9} Td {:<9} U {:<9} Δp {}",
                f.name,
                sig(f.dip_deg, 4),
                sig(f.dip_direction_deg, 5),
                with_unit(Some(f.check.effective_normal_stress), u),
                with_unit(Some(f.check.shear_stress), u),
                ratio(f.check.slip_tendency),
                ratio(f.check.dilation_tendency),
                ratio(f.check.mohr_coulomb_utilization),
                with_unit(f.check.pore_pressure_to_slip, u)
            );
        }
    }
    s
}

/// Runs the subcommand.
pub fn run(args: &AnalyzeArgs) -> Result<String, CliError> {
    let input = args.stress.read()?;
    let plane = args.plane.read()?;
    let faults = read_faults(&args.fault, &args.fault_strike)?;
    let (strengths, pore_pressure_pa) = args
        .strengths
        .read(input.unit, plane.is_some() || !faults.is_empty())?;
    let json = to_json(
        &input,
        plane,
        &Checks {
            strengths,
            pore_pressure_pa,
            faults,
        },
    );
    if args.json {
        let mut text = serde_json::to_string_pretty(&json).map_err(anyhow::Error::from)?;
        text.push('\n');
        Ok(text)
    } else {
        Ok(to_text(&json))
    }
}
