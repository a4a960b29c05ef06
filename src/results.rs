//! The results of one stress state and plane as labelled rows: what the results panel shows,
//! what "Copy results" puts on the clipboard, and (later) what reports print.

use std::fmt::Write as _;

use crate::format::{sig, with_unit};
use crate::mechanics::{
    Analysis, PlaneNormal, PlaneStress, SignConvention, StressTensor, StressUnit,
};

/// One line of results.
#[derive(Clone, Debug, PartialEq)]
pub struct ResultRow {
    /// Section heading the row belongs to.
    pub group: &'static str,
    /// Quantity.
    pub name: String,
    /// Value with unit, or "undefined".
    pub value: String,
    /// The formula, for tooltips.
    pub formula: &'static str,
}

fn vector(v: &nalgebra::Vector3<f64>) -> String {
    format!("({}, {}, {})", sig(v.x, 5), sig(v.y, 5), sig(v.z, 5))
}

/// All rows for `tensor` and the cut plane `plane`, with stresses in `unit` and `convention`.
#[must_use]
pub fn rows(
    tensor: &StressTensor,
    plane: PlaneNormal,
    unit: StressUnit,
    convention: SignConvention,
) -> Vec<ResultRow> {
    let a = Analysis::new(tensor, convention);
    let u = unit.pascals();
    let sym = unit.symbol();
    let stress = |pa: f64| with_unit(Some(pa / u), sym);
    let mut out = Vec::with_capacity(32);
    let mut push = |group, name: String, value: String, formula| {
        out.push(ResultRow {
            group,
            name,
            value,
            formula,
        });
    };
    let principal_formula =
        "Eigenvalues of σ, ordered σ1 ≥ σ2 ≥ σ3 (in the chosen sign convention)";
    for (i, (v, d)) in a
        .principal
        .values_pa
        .iter()
        .zip(&a.principal.directions)
        .enumerate()
    {
        push(
            "Principal stresses",
            format!("σ{}", i + 1),
            stress(*v),
            principal_formula,
        );
        push(
            "Principal stresses",
            format!("n{}", i + 1),
            vector(d),
            "Unit eigenvector of σi; n1 × n2 = n3",
        );
    }
    let inv = &a.invariants;
    let sq = format!("{sym}²");
    let cu = format!("{sym}³");
    push(
        "Invariants",
        "I1".into(),
        with_unit(Some(inv.i1 / u), sym),
        "I1 = tr σ = σ1 + σ2 + σ3",
    );
    push(
        "Invariants",
        "I2".into(),
        with_unit(Some(inv.i2 / (u * u)), &sq),
        "I2 = ½[(tr σ)² − tr σ²] = σ1σ2 + σ2σ3 + σ3σ1",
    );
    push(
        "Invariants",
        "I3".into(),
        with_unit(Some(inv.i3 / (u * u * u)), &cu),
        "I3 = det σ = σ1σ2σ3",
    );
    push(
        "Invariants",
        "J2".into(),
        with_unit(Some(inv.j2 / (u * u)), &sq),
        "J2 = ½ s:s, s = σ − (I1/3) I",
    );
    push(
        "Invariants",
        "J3".into(),
        with_unit(Some(inv.j3 / (u * u * u)), &cu),
        "J3 = det s",
    );
    push(
        "Equivalent stresses",
        "mean stress".into(),
        stress(a.mean_stress_pa),
        "σm = I1 / 3",
    );
    push(
        "Equivalent stresses",
        "von Mises".into(),
        stress(a.von_mises_pa),
        "σvM = √(3 J2)",
    );
    push(
        "Equivalent stresses",
        "Tresca".into(),
        stress(a.tresca_pa),
        "σ1 − σ3",
    );
    push(
        "Equivalent stresses",
        "max shear".into(),
        stress(a.max_shear_pa),
        "τmax = (σ1 − σ3) / 2, on planes with normals (n1 ± n3)/√2",
    );
    push(
        "Equivalent stresses",
        "octahedral normal".into(),
        stress(a.octahedral_normal_pa),
        "σoct = I1 / 3",
    );
    push(
        "Equivalent stresses",
        "octahedral shear".into(),
        stress(a.octahedral_shear_pa),
        "τoct = √(2 J2 / 3)",
    );
    push(
        "Equivalent stresses",
        "Lode angle".into(),
        with_unit(a.lode_angle_deg, "°"),
        "cos 3θ = (3√3/2) J3 / J2^1.5, 0° ≤ θ ≤ 60°; undefined when J2 = 0",
    );
    push(
        "Equivalent stresses",
        "triaxiality".into(),
        a.triaxiality
            .map_or_else(|| "undefined".to_owned(), |t| sig(t, 5)),
        "η = σm / σvM with the tension-positive mean stress in either convention (negative in compression); undefined when J2 = 0",
    );
    let ps = PlaneStress::new(tensor, plane, convention);
    let (dip, dd) = plane.dip_deg();
    push(
        "Cut plane",
        "normal n".into(),
        vector(&plane.vector()),
        "Unit normal of the cut plane",
    );
    push(
        "Cut plane",
        "dip / dip direction".into(),
        format!("{}° / {}°", sig(dip, 4), sig(dd, 4)),
        "x = east, y = north, z = up; n = (sin δ sin α, sin δ cos α, cos δ)",
    );
    push(
        "Cut plane",
        "traction t".into(),
        format!("{} {sym}", vector(&(ps.traction_pa / u))),
        "t = σ·n (Cauchy): the traction the material n points into exerts on the material behind the plane, with σ as shown",
    );
    push(
        "Cut plane",
        "normal stress σn".into(),
        stress(ps.normal_stress_pa),
        "σn = t · n",
    );
    push(
        "Cut plane",
        "shear stress τ".into(),
        stress(ps.shear_stress_pa),
        "τ = |t − σn n|",
    );
    push(
        "Cut plane",
        "shear direction".into(),
        ps.shear_direction
            .map_or_else(|| "undefined (no shear)".to_owned(), |d| vector(&d)),
        "Direction of the shear traction on the material behind the plane from the material n points into, in tension-positive physics whatever the convention: (t − σn n) / τ with tension-positive t",
    );
    push(
        "Cut plane",
        "rake".into(),
        with_unit(ps.rake_deg(), "°"),
        "Angle in the plane from strike (dip direction − 90°) to the hanging wall's slip, counter-clockwise seen from above: +90° reverse, −90° normal, 0° left-lateral, 180° right-lateral (Aki & Richards 1980); undefined without shear or for a horizontal plane",
    );
    out
}

/// The rows as tab-separated text with a header naming the unit and convention.
#[must_use]
pub fn to_tsv(rows: &[ResultRow], unit: StressUnit, convention: SignConvention) -> String {
    let mut s = format!("Planewise results\tunit {unit}\t{convention}\n");
    for r in rows {
        let _ = writeln!(s, "{}\t{}\t{}", r.group, r.name, r.value);
    }
    s
}
