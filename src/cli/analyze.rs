//! `planewise analyze`: the stress state and, optionally, one plane, as text or JSON.

use std::fmt::Write as _;

use clap::Args;
use nalgebra::Vector3;
use serde::Serialize;

use super::{CliError, PlaneArgs, StressArgs, StressInput};
use crate::format::{clean, sig, with_unit};
use crate::mechanics::{Analysis, Component, PlaneNormal, PlaneStress};

/// Arguments of `planewise analyze`.
#[derive(Debug, Clone, Args)]
pub struct AnalyzeArgs {
    #[command(flatten)]
    pub stress: StressArgs,
    #[command(flatten)]
    pub plane: PlaneArgs,
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
    #[serde(skip_serializing_if = "Option::is_none")]
    pub plane: Option<PlaneJson>,
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
}

fn arr(v: &Vector3<f64>) -> [f64; 3] {
    [v.x, v.y, v.z].map(clean)
}

/// Builds the JSON object for a state and optional plane.
#[must_use]
pub fn to_json(input: &StressInput, plane: Option<PlaneNormal>) -> AnalyzeJson {
    let u = input.unit.pascals();
    let sign = input.convention.sign();
    let a = Analysis::new(&input.tensor, input.convention);
    // Every number through `clean`: a value typed in psi comes back as typed.
    let st = |pa: f64| clean(pa / u);
    let c = input.tensor.components_pa().map(|v| st(sign * v));
    let inv = &a.invariants;
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
        plane: plane.map(|n| {
            let ps = PlaneStress::new(&input.tensor, n, input.convention);
            PlaneJson {
                normal: arr(&n.vector()),
                traction: arr(&(ps.traction_pa / u)),
                normal_stress: st(ps.normal_stress_pa),
                shear_stress: st(ps.shear_stress_pa),
                shear_direction: ps.shear_direction.map(|d| arr(&d)),
                rake_deg: ps.rake_deg().map(clean),
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
    }
    s
}

/// Runs the subcommand.
pub fn run(args: &AnalyzeArgs) -> Result<String, CliError> {
    let input = args.stress.read()?;
    let plane = args.plane.read()?;
    let json = to_json(&input, plane);
    if args.json {
        let mut text = serde_json::to_string_pretty(&json).map_err(anyhow::Error::from)?;
        text.push('\n');
        Ok(text)
    } else {
        Ok(to_text(&json))
    }
}
