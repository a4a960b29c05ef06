//! The results of one stress state and plane as labelled rows: what the results panel shows,
//! what "Copy results" puts on the clipboard, and (later) what reports print.

use std::fmt::Write as _;

use crate::mechanics::{
    Analysis, PlaneNormal, PlaneStress, SignConvention, StressTensor, StressUnit,
};
use crate::text::format::readable;

/// A result's value as computed: stresses in pascals, angles in degrees, directions as unit
/// vectors. Formatted only at the edges (panel, clipboard, reports) in the unit asked for.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Value {
    /// A stress, Pa.
    Stress(f64),
    /// A power of a stress (invariants), Pa^k.
    StressPower(f64, i32),
    /// A traction vector, Pa.
    StressVector([f64; 3]),
    /// A unit direction.
    Direction([f64; 3]),
    /// An angle, degrees; `None` where undefined.
    Angle(Option<f64>),
    /// Dip and dip direction, degrees.
    DipPair(f64, f64),
    /// A dimensionless number; `None` where undefined.
    Ratio(Option<f64>),
    /// No value, with the reason.
    Undefined(&'static str),
}

impl Value {
    /// The number(s), with a true minus sign, and the unit, apart (the unit is empty for
    /// directions and ratios).
    #[must_use]
    pub fn parts(&self, unit: StressUnit) -> (String, String) {
        let u = unit.pascals();
        let sym = unit.symbol();
        let undefined = || ("undefined".to_owned(), String::new());
        match *self {
            Self::Stress(pa) if pa.is_finite() => (readable(pa / u, 6), sym.to_owned()),
            Self::StressPower(v, k) if v.is_finite() => {
                let power = match k {
                    2 => "²",
                    3 => "³",
                    _ => "",
                };
                (readable(v / u.powi(k), 6), format!("{sym}{power}"))
            }
            Self::StressVector(v) => (vector(&(nalgebra::Vector3::from(v) / u)), sym.to_owned()),
            Self::Direction(v) => (vector(&nalgebra::Vector3::from(v)), String::new()),
            Self::Angle(Some(deg)) if deg.is_finite() => (readable(deg, 6), "°".to_owned()),
            Self::DipPair(dip, dd) => (
                format!("{} / {}", readable(dip, 4), readable(dd, 4)),
                "°".to_owned(),
            ),
            Self::Ratio(Some(r)) if r.is_finite() => (readable(r, 5), String::new()),
            Self::Undefined(why) => (format!("undefined ({why})"), String::new()),
            _ => undefined(),
        }
    }

    /// Number and unit together, as the panel shows it.
    #[must_use]
    pub fn text(&self, unit: StressUnit) -> String {
        let (number, unit) = self.parts(unit);
        match (unit.as_str(), self) {
            ("", _) => number,
            (_, Self::DipPair(..)) => number.replace(" / ", "° / ") + "°",
            ("°", _) => format!("{number}°"),
            (u, _) => format!("{number} {u}"),
        }
    }
}

/// One line of results.
#[derive(Clone, Debug, PartialEq)]
pub struct ResultRow {
    /// Section heading the row belongs to.
    pub group: &'static str,
    /// Quantity.
    pub name: String,
    /// The value as computed.
    pub value: Value,
    /// The formula, for tooltips.
    pub formula: &'static str,
}

fn vector(v: &nalgebra::Vector3<f64>) -> String {
    format!(
        "({}, {}, {})",
        readable(v.x, 5),
        readable(v.y, 5),
        readable(v.z, 5)
    )
}

/// All rows for `tensor` and the cut plane `plane`, with stresses in `convention`.
#[must_use]
pub fn rows(
    tensor: &StressTensor,
    plane: PlaneNormal,
    convention: SignConvention,
) -> Vec<ResultRow> {
    let a = Analysis::new(tensor, convention);
    let stress = Value::Stress;
    let mut out = Vec::with_capacity(32);
    let mut push = |group, name: String, value: Value, formula| {
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
            Value::Direction((*d).into()),
            "Unit eigenvector of σi; n1 × n2 = n3",
        );
    }
    let inv = &a.invariants;
    push(
        "Invariants",
        "I1".into(),
        Value::Stress(inv.i1),
        "I1 = tr σ = σ1 + σ2 + σ3",
    );
    push(
        "Invariants",
        "I2".into(),
        Value::StressPower(inv.i2, 2),
        "I2 = ½[(tr σ)² − tr σ²] = σ1σ2 + σ2σ3 + σ3σ1",
    );
    push(
        "Invariants",
        "I3".into(),
        Value::StressPower(inv.i3, 3),
        "I3 = det σ = σ1σ2σ3",
    );
    push(
        "Invariants",
        "J2".into(),
        Value::StressPower(inv.j2, 2),
        "J2 = ½ s:s, s = σ − (I1/3) I",
    );
    push(
        "Invariants",
        "J3".into(),
        Value::StressPower(inv.j3, 3),
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
        Value::Angle(a.lode_angle_deg),
        "cos 3θ = (3√3/2) J3 / J2^1.5, 0° ≤ θ ≤ 60°; undefined when J2 = 0",
    );
    push(
        "Equivalent stresses",
        "triaxiality".into(),
        Value::Ratio(a.triaxiality),
        "η = σm / σvM with the tension-positive mean stress in either convention (negative in compression); undefined when J2 = 0",
    );
    let ps = PlaneStress::new(tensor, plane, convention);
    let (dip, dd) = plane.dip_deg();
    push(
        "Cut plane",
        "normal n".into(),
        Value::Direction(plane.vector().into()),
        "Unit normal of the cut plane",
    );
    push(
        "Cut plane",
        "dip / dip direction".into(),
        Value::DipPair(dip, dd),
        "x = east, y = north, z = up; n = (sin δ sin α, sin δ cos α, cos δ)",
    );
    push(
        "Cut plane",
        "traction t".into(),
        Value::StressVector(ps.traction_pa.into()),
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
            .map_or(Value::Undefined("no shear"), |d| Value::Direction(d.into())),
        "Direction of the shear traction on the material behind the plane from the material n points into, in tension-positive physics whatever the convention: (t − σn n) / τ with tension-positive t",
    );
    push(
        "Cut plane",
        "rake".into(),
        Value::Angle(ps.rake_deg()),
        "Angle in the plane from strike (dip direction − 90°) to the hanging wall's slip, counter-clockwise seen from above: +90° reverse, −90° normal, 0° left-lateral, 180° right-lateral (Aki & Richards 1980); undefined without shear or for a horizontal plane",
    );
    out
}

/// How a table is put on the clipboard.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum CopyFormat {
    /// Tab-separated (spreadsheets).
    Tsv,
    /// A Markdown table (notes, issue trackers).
    Markdown,
    /// Comma-separated values (RFC 4180 quoting).
    Csv,
}

/// A table of text cells with a title line; written as TSV, Markdown or CSV.
#[derive(Clone, Debug, PartialEq)]
pub struct TextTable {
    /// What the table is (unit and convention included).
    pub title: String,
    /// Column names.
    pub header: Vec<String>,
    /// Cells.
    pub rows: Vec<Vec<String>>,
}

fn csv_cell(text: &str) -> String {
    if text.contains([',', '"', '\n', '\r']) {
        format!("\"{}\"", text.replace('"', "\"\""))
    } else {
        text.to_owned()
    }
}

/// A cell for a spreadsheet: a number shown with a true minus sign gets the hyphen-minus
/// spreadsheets read as negative; other text is left as it is.
fn for_spreadsheet(cell: &str) -> std::borrow::Cow<'_, str> {
    let hyphen = cell.replace('−', "-");
    if hyphen != cell && hyphen.trim().parse::<f64>().is_ok() {
        std::borrow::Cow::Owned(hyphen)
    } else {
        std::borrow::Cow::Borrowed(cell)
    }
}

impl TextTable {
    /// The table in `format`.
    #[must_use]
    pub fn write(&self, format: CopyFormat) -> String {
        let mut s = String::new();
        match format {
            CopyFormat::Tsv => {
                let _ = writeln!(s, "{}", self.title);
                for row in std::iter::once(&self.header).chain(&self.rows) {
                    let cells: Vec<_> = row.iter().map(|c| for_spreadsheet(c)).collect();
                    let _ = writeln!(s, "{}", cells.join("\t"));
                }
            }
            CopyFormat::Markdown => {
                let cell = |t: &str| t.replace('|', "\\|");
                let _ = writeln!(s, "{}\n", self.title);
                let _ = writeln!(
                    s,
                    "| {} |",
                    self.header
                        .iter()
                        .map(|h| cell(h))
                        .collect::<Vec<_>>()
                        .join(" | ")
                );
                let _ = writeln!(s, "|{}", " --- |".repeat(self.header.len()));
                for row in &self.rows {
                    let _ = writeln!(
                        s,
                        "| {} |",
                        row.iter().map(|c| cell(c)).collect::<Vec<_>>().join(" | ")
                    );
                }
            }
            CopyFormat::Csv => {
                for row in std::iter::once(&self.header).chain(&self.rows) {
                    let _ = writeln!(
                        s,
                        "{}",
                        row.iter()
                            .map(|c| csv_cell(&for_spreadsheet(c)))
                            .collect::<Vec<_>>()
                            .join(",")
                    );
                }
            }
        }
        s
    }
}

/// The rows as a table: group, quantity, value and unit in separate columns (so a spreadsheet
/// reads the numbers), titled with the unit and convention.
#[must_use]
pub fn table(rows: &[ResultRow], unit: StressUnit, convention: SignConvention) -> TextTable {
    TextTable {
        title: format!("Planewise results, unit {unit}, {convention}"),
        header: ["group", "quantity", "value", "unit"]
            .map(str::to_owned)
            .to_vec(),
        rows: rows
            .iter()
            .map(|r| {
                let (number, u) = r.value.parts(unit);
                vec![r.group.to_owned(), r.name.clone(), number, u]
            })
            .collect(),
    }
}

/// The rows as tab-separated text (see [`table`]).
#[must_use]
pub fn to_tsv(rows: &[ResultRow], unit: StressUnit, convention: SignConvention) -> String {
    table(rows, unit, convention).write(CopyFormat::Tsv)
}

/// Every result row of the shown state: the state and cut plane, and the cut plane as a fault
/// when it is checked as one (the panel, copies and the report all list these).
#[must_use]
pub fn shown_rows(d: &crate::study::Derived) -> Vec<ResultRow> {
    let mut all = rows(&d.tensor, d.plane, d.convention);
    if let Some(f) = &d.fault {
        all.extend(fault_rows(f, d.measure.pore_pressure_pa));
    }
    all
}

/// The cut plane as a fault (compression-positive effective stress), for the panel and copies.
#[must_use]
pub fn fault_rows(
    f: &crate::mechanics::criteria::FaultCheck,
    pore_pressure_pa: f64,
) -> Vec<ResultRow> {
    let group = "Cut plane as a fault";
    let row = |name: &str, value: Value, formula: &'static str| ResultRow {
        group,
        name: name.to_owned(),
        value,
        formula,
    };
    let mut out = vec![
        row(
            "pore pressure p",
            Value::Stress(pore_pressure_pa),
            "From the worst-plane section; compression positive",
        ),
        row(
            "effective σn′",
            Value::Stress(f.effective_normal_stress_pa),
            "σn′ = σn − p, compression positive (Terzaghi's effective stress)",
        ),
        row(
            "slip tendency",
            Value::Ratio(f.slip_tendency.utilization),
            "Ts = τ / σn′ (Morris, Ferrill & Henderson 1996); undefined when σn′ ≤ 0",
        ),
        row(
            "dilation tendency",
            Value::Ratio(f.dilation_tendency.utilization),
            "Td = (σ1 − σn) / (σ1 − σ3), compression positive (Ferrill et al. 1999)",
        ),
        row(
            "rake",
            Value::Angle(f.rake_deg),
            "Angle in the plane from strike to the hanging wall's slip, reverse +90°, normal −90° (Aki & Richards 1980)",
        ),
    ];
    match (f.mohr_coulomb, f.coulomb_reduction) {
        (Some(u), Some(r)) => {
            out.push(row(
                "Coulomb utilization",
                Value::Ratio(u.utilization),
                "U = τ / (c + σn′ tan φ) with the planes' c and φ",
            ));
            out.push(row(
                "Coulomb factor of safety",
                f.coulomb_proportional.map_or(Value::Undefined("not checked"), |c| {
                    c.factor_of_safety()
                        .map_or(Value::Undefined(standing_word(c.condition)), |x| {
                            Value::Ratio(Some(x))
                        })
                }),
                "Proportional loading: σ and p multiplied by λ = c / (τ − σn′ tan φ) bring the plane onto τ = c + σn′ tan φ",
            ));
            out.push(row(
                "Coulomb strength-reduction factor",
                r.factor
                    .map_or(Value::Undefined(standing_word(r.condition)), |x| {
                        Value::Ratio(Some(x))
                    }),
                "F = (c + σn′ tan φ) / τ: c and tan φ divided by F bring the plane to slip",
            ));
            out.push(row(
                "mobilized friction angle",
                Value::Angle(r.mobilized_friction_deg),
                "φm = atan(tan φ / F) at the strength-reduction factor F",
            ));
            out.push(row(
                "Δp to slip",
                f.pore_pressure_to_slip_pa
                    .map_or(Value::Undefined("needs φ > 0"), Value::Stress),
                "Δp = σn′ − (τ − c) / tan φ: the pore-pressure rise that brings the plane onto τ = c + σn′ tan φ (negative: already beyond)",
            ));
        }
        _ => out.push(row(
            "Coulomb check",
            Value::Undefined("not checked: needs the planes' cohesion and friction angle"),
            "U = τ / (c + σn′ tan φ) needs the planes' c and φ (Planes section)",
        )),
    }
    out
}

/// Short words for a condition, for [`Value::Undefined`] and table cells.
#[must_use]
pub fn standing_word(c: crate::mechanics::criteria::Condition) -> &'static str {
    use crate::mechanics::criteria::Condition;
    match c {
        Condition::NeverReaches => "never reaches the surface",
        Condition::FailsAtAnyScale => "fails at any scale",
        Condition::EffectiveTension => "no frictional capacity",
        Condition::NotChecked => "not checked",
        Condition::Defined | Condition::Undefined => "undefined",
    }
}

/// The verdicts as rows: utilization, the factor of safety, and for Mohr–Coulomb and
/// Drucker–Prager the strength-reduction factor and mobilized friction angle, each with its
/// definition.
#[must_use]
pub fn verdict_rows(verdicts: &[crate::mechanics::criteria::Verdict]) -> Vec<ResultRow> {
    use crate::mechanics::criteria::{Condition, definitions};
    let mut out = Vec::new();
    for v in verdicts {
        out.push(ResultRow {
            group: "Verdict",
            name: format!("{} utilization", v.criterion.label()),
            value: match v.condition {
                Condition::Defined => Value::Ratio(v.utilization),
                c => Value::Undefined(standing_word(c)),
            },
            formula: v.criterion.formula(),
        });
        out.push(ResultRow {
            group: "Verdict",
            name: format!("{} factor of safety", v.criterion.label()),
            value: Value::Ratio(v.factor_of_safety),
            formula: definitions::PROPORTIONAL,
        });
        if let Some(r) = v.reduction {
            out.push(ResultRow {
                group: "Verdict",
                name: format!("{} strength-reduction factor", v.criterion.label()),
                value: r
                    .factor
                    .map_or(Value::Undefined(standing_word(r.condition)), |x| {
                        Value::Ratio(Some(x))
                    }),
                formula: definitions::REDUCTION,
            });
            out.push(ResultRow {
                group: "Verdict",
                name: format!("{} mobilized friction angle", v.criterion.label()),
                value: Value::Angle(r.mobilized_friction_deg),
                formula: definitions::MOBILIZED,
            });
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn rows_are_typed_and_formatted_only_at_the_edge() {
        // Uniaxial tension σxx = 100 MPa: σ1 = 100 MPa, I2 = 0, von Mises = 100 MPa (common
        // practice, no source).
        let t =
            StressTensor::from_components([100.0, 0.0, 0.0, 0.0, 0.0, 0.0], StressUnit::MPa, 1.0)
                .unwrap_or_default();
        let rows = rows(&t, PlaneNormal::X, SignConvention::TensionPositive);
        let find = |name: &str| rows.iter().find(|r| r.name == name).map(|r| r.value);
        assert_eq!(find("σ1"), Some(Value::Stress(100e6)));
        let vm = find("von Mises").unwrap_or(Value::Undefined("missing"));
        assert_eq!(
            vm.parts(StressUnit::KPa),
            ("100000".to_owned(), "kPa".to_owned())
        );
        assert_eq!(vm.text(StressUnit::MPa), "100 MPa");
        let j2 = find("J2").unwrap_or(Value::Undefined("missing"));
        assert_eq!(j2.parts(StressUnit::MPa).1, "MPa²");
        let tsv = to_tsv(&rows, StressUnit::MPa, SignConvention::TensionPositive);
        assert!(tsv.contains("Principal stresses\tσ1\t100\tMPa\n"), "{tsv}");
        assert!(
            tsv.contains("Cut plane\tshear direction\tundefined (no shear)\t\n"),
            "{tsv}"
        );
    }
}
