//! The calculation report: one self-contained HTML file for a whole project that a checker can
//! read, print to A4 or Letter and sign. Styles inline, figures as inline SVG, no scripts and no
//! external requests; every text that comes from the user or a file is escaped.

use std::fmt::Write as _;

use crate::mechanics::criteria::{Condition, Outcome, Verdict};
use crate::mechanics::search::worst_plane;
use crate::mechanics::{Component, StressUnit};
use crate::output::results::ResultRow;
use crate::picture::draw::svg::escape;
use crate::picture::figures::{self, FigureInput};
use crate::study::annotations::FigureKind;
use crate::study::{Derived, EnvelopeMeasure, FieldKind, Project, StudyError, envelope};
use crate::text::format::readable;

/// The figures a report can carry for each case.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum ReportFigure {
    /// The 3D view.
    #[value(name = "3d")]
    View3d,
    /// The orientation map of the project's measure.
    Map,
    /// The Mohr circles.
    Mohr,
}

/// What goes into the report.
#[derive(Clone, Debug, PartialEq)]
pub struct ReportOptions {
    /// Cases and combinations to report (empty: all, cases first).
    pub cases: Vec<String>,
    /// Figures per case.
    pub figures: Vec<ReportFigure>,
    /// The date and time printed in the title block (ISO 8601 with its offset).
    pub date: String,
    /// The project file checked, when the report is of a file as saved: its name and SHA-256.
    pub source: Option<SourceFile>,
    /// Load cases as tables: their section (inputs, combinations, top points, counts).
    pub tables: Option<TablesSection>,
}

impl TablesSection {
    /// The section of `points` ranked as `ranked` by `measure` (`each_case_alone`: no
    /// combinations were given; `threshold` in Pa for stress measures), read as `reading`
    /// says; each table's SHA-256 read from its file; principal values in `convention`. The
    /// 50 worst points (or groups' worst points) are listed.
    pub fn of(
        points: &crate::study::table::Points,
        ranked: &crate::study::table::RankedPoints,
        reading: String,
        measure: EnvelopeMeasure,
        each_case_alone: bool,
        threshold: Option<f64>,
        convention: crate::mechanics::SignConvention,
    ) -> Result<Self, String> {
        let mut inputs = Vec::new();
        for t in &points.tables {
            let file = SourceFile::read(std::path::Path::new(&t.file))
                .map_err(|e| format!("{}: {e}", t.file))?;
            inputs.push((t.case.clone(), file, t.rows, t.bad_count));
        }
        let terms = |c: &crate::study::table::PointCombination| {
            points
                .cases
                .iter()
                .zip(&c.factors)
                .filter(|(_, f)| **f != 0.0)
                .map(|(case, f)| format!("{} × {case}", readable(*f, 4)))
                .collect::<Vec<_>>()
                .join(" + ")
        };
        let listed: Vec<&crate::study::table::PointRow> = if ranked.groups.is_empty() {
            ranked.rows.iter().take(50).collect()
        } else {
            ranked.groups.iter().map(|g| &g.worst).take(50).collect()
        };
        Ok(Self {
            inputs,
            reading,
            measure,
            combinations: ranked
                .combinations
                .iter()
                .zip(&ranked.governs)
                .map(|(c, &n)| (c.name.clone(), terms(c), n))
                .collect(),
            each_case_alone,
            points: ranked.points,
            left_out: points.unmatched_count,
            counts: ranked.counts.text("points"),
            threshold: threshold.map(|v| (v, ranked.at_or_beyond)),
            top: listed
                .iter()
                .map(|r| TopPoint {
                    point: r.row.line,
                    ids: points.id_text(usize::try_from(r.row.line.saturating_sub(1)).unwrap_or(0)),
                    combination: ranked.combinations[r.combination].name.clone(),
                    value: r.row.value,
                    standing: r.row.standing,
                    principal: crate::mechanics::principal::principal_values_in(
                        &r.row.tensor,
                        convention,
                    ),
                })
                .collect(),
            worst_shown_as: None,
        })
    }
}

/// One of the worst points of load cases as tables.
#[derive(Clone, Debug, PartialEq)]
pub struct TopPoint {
    /// Its number, in the order the tables first name it.
    pub point: u64,
    /// Its ids, `element=12, ip=3`.
    pub ids: String,
    /// Its governing combination.
    pub combination: String,
    /// The measure's value there (Pa for stress measures).
    pub value: Option<f64>,
    /// How the value reads.
    pub standing: Condition,
    /// Its principal values, Pa, in the report's convention.
    pub principal: [f64; 3],
}

/// The report's section on load cases as tables, as `planewise batch` ranked them.
#[derive(Clone, Debug, PartialEq)]
pub struct TablesSection {
    /// Each table: its load case (empty for a long table) and its file with its SHA-256, rows
    /// read and bad rows skipped.
    pub inputs: Vec<(String, SourceFile, u64, u64)>,
    /// How the tables were read: unit, convention, columns, plane stress, ids, case column.
    pub reading: String,
    /// The measure points are ranked by.
    pub measure: EnvelopeMeasure,
    /// Each combination: its name, its terms written out and how many points it governs.
    pub combinations: Vec<(String, String, u64)>,
    /// No combinations were given: each case alone was enveloped.
    pub each_case_alone: bool,
    /// Points ranked, and points left out as unmatched.
    pub points: u64,
    /// Points left out (missing from a case or met twice in one).
    pub left_out: u64,
    /// How many points stand in each condition, as text.
    pub counts: String,
    /// The threshold (Pa for stress measures) and how many points are at or beyond it.
    pub threshold: Option<(f64, u64)>,
    /// The worst points.
    pub top: Vec<TopPoint>,
    /// Which case or combination of the report shows the worst point (its tensors replace the
    /// project's cases of the tables' names in this report).
    pub worst_shown_as: Option<String>,
}

/// A project file as the report identifies it.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct SourceFile {
    /// The file's name as given.
    pub name: String,
    /// SHA-256 of its bytes, lower-case hexadecimal.
    pub sha256: String,
}

impl SourceFile {
    /// Reads `path` and hashes its bytes.
    pub fn read(path: &std::path::Path) -> std::io::Result<Self> {
        use sha2::Digest as _;
        let bytes = std::fs::read(path)?;
        let digest = sha2::Sha256::digest(&bytes);
        Ok(Self {
            name: path.display().to_string(),
            sha256: digest.iter().fold(String::with_capacity(64), |mut s, b| {
                let _ = write!(s, "{b:02x}");
                s
            }),
        })
    }
}

/// The commit the program was built from ("unknown" outside a git work tree; "+changes" when
/// built from a changed tree).
pub const BUILD_COMMIT: &str = env!("PLANEWISE_COMMIT");

impl Default for ReportOptions {
    fn default() -> Self {
        Self {
            cases: Vec::new(),
            figures: vec![ReportFigure::View3d, ReportFigure::Mohr],
            date: now_iso8601(),
            source: None,
            tables: None,
        }
    }
}

/// Today's date from the system clock, YYYY-MM-DD (UTC).
#[must_use]
pub fn today() -> String {
    let seconds = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map_or(0, |d| d.as_secs());
    date_of(seconds / 86_400)
}

/// The date and time now, ISO 8601 in UTC with its offset: `2026-12-03T14:05:09+00:00`.
#[must_use]
pub fn now_iso8601() -> String {
    let seconds = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map_or(0, |d| d.as_secs());
    let s = seconds % 86_400;
    format!(
        "{}T{:02}:{:02}:{:02}+00:00",
        date_of(seconds / 86_400),
        s / 3600,
        s / 60 % 60,
        s % 60
    )
}

/// The civil date of `days` since 1970-01-01.
fn date_of(days: u64) -> String {
    // Civil date from days since 1970-01-01 (H. Hinnant's algorithm, public domain).
    let z = days.cast_signed() + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z - era * 146_097;
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    format!("{y:04}-{m:02}-{d:02}")
}

pub(super) const STYLE: &str = r#"
body { font-family: "DejaVu Sans", Arial, sans-serif; font-size: 10pt; color: #1e232b; margin: 0 auto; max-width: 190mm; line-height: 1.35; }
h1 { font-size: 17pt; margin: 0 0 2mm 0; }
h2 { font-size: 13pt; margin: 6mm 0 2mm 0; border-bottom: 1px solid #888; }
h3 { font-size: 11pt; margin: 4mm 0 1mm 0; }
table { border-collapse: collapse; margin: 1mm 0 3mm 0; }
th, td { border: 1px solid #bbb; padding: 0.8mm 2mm; text-align: left; vertical-align: top; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
.caution { border: 2px solid #b33; padding: 2mm 3mm; background: #fff4f2; }
.sign-off { width: 100%; } .sign-off td { width: 33%; height: 9mm; }
.fails { color: #b3261e; font-weight: bold; }
.passes { color: #2e7d3e; }
.not-checked { color: #666; }
sup { font-size: 7pt; color: #555; }
figure { margin: 2mm 0; break-inside: avoid; }
figure svg { width: 100%; height: auto; border: 1px solid #ccc; }
figcaption { font-size: 8.5pt; color: #444; }
.case { break-before: page; }
.footnotes li { font-size: 8.5pt; }
@page { margin: 16mm 14mm 16mm 14mm; @bottom-right { content: "page " counter(page) " of " counter(pages); font-size: 8pt; } }
@media print { body { max-width: none; } a { color: inherit; } }
"#;

/// Numbered formulas, each printed once at the end and referred to by its number.
#[derive(Default)]
struct Footnotes(Vec<&'static str>);

impl Footnotes {
    fn mark(&mut self, formula: &'static str) -> String {
        if formula.is_empty() {
            return String::new();
        }
        let n = if let Some(i) = self.0.iter().position(|f| *f == formula) {
            i + 1
        } else {
            self.0.push(formula);
            self.0.len()
        };
        format!("<sup>[{n}]</sup>")
    }
}

/// The report for `project` as one HTML document.
pub fn html(project: &Project, options: &ReportOptions) -> Result<String, StudyError> {
    let unit = project.unit()?;
    let convention = project.convention();
    let names: Vec<String> = if options.cases.is_empty() {
        project
            .names()
            .iter()
            .map(|(n, _)| (*n).to_owned())
            .collect()
    } else {
        for n in &options.cases {
            if !project.name_used(n) {
                return Err(StudyError::Unknown(n.clone()));
            }
        }
        options.cases.clone()
    };
    let mut notes = Footnotes::default();
    let mut s = String::with_capacity(200_000);
    let title = escape(&project.name);
    let _ = write!(
        s,
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n<title>Calculation report — {title}</title>\n<style>{STYLE}@page {{ @top-center {{ content: \"{header}\"; font-size: 8pt; color: #555; }} }}</style>\n</head>\n<body>\n",
        header = css_string(&format!("Planewise calculation report — {}", project.name)),
    );
    // Title and sign-off.
    let _ = write!(
        s,
        "<header>\n<h1>Calculation report: {title}</h1>\n<p>Made with Planewise {} on {}. Unit of every stress: {unit}; sign convention: {}.</p>\n",
        env!("CARGO_PKG_VERSION"),
        escape(&options.date),
        convention.key()
    );
    let (file, sha) = options.source.as_ref().map_or_else(
        || {
            (
                "not a saved file (unsaved changes, or made in memory)".to_owned(),
                "—".to_owned(),
            )
        },
        |f| (escape(&f.name), f.sha256.clone()),
    );
    let _ = write!(
        s,
        "<table class=\"identity\">\n<tr><th>project file</th><td>{file}</td></tr>\n<tr><th>SHA-256 of the file</th><td><code>{sha}</code></td></tr>\n<tr><th>revision</th><td>{}</td></tr>\n<tr><th>program</th><td>Planewise {} (build {})</td></tr>\n<tr><th>made</th><td>{}</td></tr>\n</table>\n",
        if project.revision.is_empty() {
            "(none given)".to_owned()
        } else {
            escape(&project.revision)
        },
        env!("CARGO_PKG_VERSION"),
        escape(BUILD_COMMIT),
        escape(&options.date)
    );
    s.push_str("<table class=\"sign-off\"><tr><th>Prepared by</th><th>Checked by</th><th>Date</th></tr><tr><td></td><td></td><td></td></tr></table>\n</header>\n");
    // Scope and cautions.
    let _ = write!(
        s,
        "<section>\n<h2>Scope and cautions</h2>\n<p class=\"caution\"><strong>Caution.</strong> {}</p>\n<p>This report states the stress at one point for each load case and combination listed, and how it stands against the criteria for which the material's strengths are given. It is an aid for engineers: check every input against its source and every result independently; design decisions follow the applicable design codes and licensed engineering practice. A criterion whose strengths are not given is reported as not checked, never as passing.</p>\n",
        escape(crate::SAFETY_NOTE)
    );
    if !project.notes.is_empty() {
        let _ = writeln!(
            s,
            "<p><strong>Project notes.</strong> {}</p>",
            escape(&project.notes)
        );
    }
    s.push_str("</section>\n");
    conventions(&mut s, unit, convention.key());
    material(&mut s, project, unit, &mut notes);
    if let Some(t) = &options.tables {
        tables_section(&mut s, t, unit, &mut notes);
    }
    envelopes(&mut s, project, unit, &mut notes)?;
    for name in &names {
        case_section(&mut s, project, name, unit, options, &mut notes)?;
    }
    // Formulas and sources.
    s.push_str("<section class=\"footnotes\">\n<h2>Formulas and sources</h2>\n<ol>\n");
    for f in &notes.0 {
        let _ = writeln!(s, "<li>{}</li>", escape(f));
    }
    s.push_str("</ol>\n</section>\n</body>\n</html>\n");
    Ok(s)
}

/// A CSS string literal's content (quotes and backslashes escaped, no markup possible there).
pub(super) fn css_string(text: &str) -> String {
    text.chars()
        .filter(|c| !c.is_control())
        .map(|c| match c {
            '"' => "\\\"".to_owned(),
            '\\' => "\\\\".to_owned(),
            '<' => "\\3c ".to_owned(),
            other => other.to_string(),
        })
        .collect()
}

fn conventions(s: &mut String, unit: StressUnit, convention: &str) {
    let _ = write!(
        s,
        "<section>\n<h2>Conventions and units</h2>\n<ul>\n<li>Stresses in {unit}, shown {convention}; stored in pascals, tension positive, in right-handed x, y, z axes (x = east, y = north, z = up for dips and azimuths).</li>\n<li>Principal stresses σ1 ≥ σ2 ≥ σ3 in the convention shown; directions are unit vectors (n1, n2 with their largest component positive, n3 = n1 × n2).</li>\n<li>The traction t = σ·n acts on the material behind the plane from the material n points into. Fault checks are compression positive with effective normal stress σn′ = σn − p.</li>\n<li>Criteria are judged under proportional loading: the factor of safety is the number every stress component must be multiplied by to reach the criterion's surface; the utilization is its inverse.</li>\n<li>Numbers are printed to six significant digits; the same numbers, to fifteen, come from <code>planewise analyze --project … --case … --json</code>.</li>\n</ul>\n</section>\n"
    );
}

fn material(s: &mut String, project: &Project, unit: StressUnit, notes: &mut Footnotes) {
    let m = &project.material;
    let st = &m.strengths;
    let stress = |v: Option<f64>| {
        v.map_or_else(
            || "not given".to_owned(),
            |x| format!("{} {unit}", readable(unit.from_pa(x), 6)),
        )
    };
    let _ = write!(
        s,
        "<section>\n<h2>Material</h2>\n<p>{}</p>\n<table>\n<tr><th>yield strength f<sub>y</sub></th><td class=\"num\">{}</td></tr>\n<tr><th>tensile strength f<sub>t</sub></th><td class=\"num\">{}</td></tr>\n<tr><th>compressive strength f<sub>c</sub></th><td class=\"num\">{}</td></tr>\n<tr><th>cohesion c</th><td class=\"num\">{}</td></tr>\n<tr><th>friction angle φ</th><td class=\"num\">{}</td></tr>\n<tr><th>Drucker–Prager fit</th><td>{}{}</td></tr>\n</table>\n",
        if m.name.is_empty() { "(no name given)".to_owned() } else { escape(&m.name) },
        stress(st.yield_strength_pa),
        stress(st.tensile_strength_pa),
        stress(st.compressive_strength_pa),
        stress(st.cohesion_pa),
        st.friction_angle_deg.map_or_else(|| "not given".to_owned(), |v| format!("{}°", readable(v, 6))),
        escape(st.dp_fit.label()),
        notes.mark("Drucker–Prager fits to Mohr–Coulomb: Chen & Han, Plasticity for Structural Engineers, 1988, §5.4"),
    );
    let mc = &project.measure;
    let pore = if mc.pore_pressure_pa == 0.0 {
        "none given: total stress throughout".to_owned()
    } else {
        format!(
            "p = {} {unit} (compression positive): fault checks and worst planes use σn′ = σn − p; Rankine, Mohr–Coulomb and Drucker–Prager use σ′ = σ + p·I (tension positive); von Mises and Tresca are unaffected",
            readable(unit.from_pa(mc.pore_pressure_pa), 6)
        )
    };
    let planes = match project.plane_strength() {
        Some((m, from)) => format!(
            "cohesion {} {unit}, friction angle {}° (μ = tan φ = {}): {}, used for the Coulomb checks of the cut plane, the named faults and the mohr-coulomb worst plane",
            readable(unit.from_pa(m.cohesion_pa), 6),
            readable(m.friction_angle_deg, 6),
            readable(m.friction_angle_deg.to_radians().tan(), 6),
            from.text()
        ),
        None => format!(
            "not given: the Coulomb checks of planes are not checked (they need {})",
            crate::study::MeasureChoice::PLANE_STRENGTH_NEEDED
        ),
    };
    let _ = write!(
        s,
        "<table>\n<tr><th>worst-plane measure</th><td>{}</td></tr>\n<tr><th>pore pressure</th><td>{}</td></tr>\n<tr><th>the planes' strength</th><td>{}</td></tr>\n</table>\n</section>\n",
        escape(mc.measure.key()),
        escape(&pore),
        escape(&planes)
    );
}

fn envelopes(
    s: &mut String,
    project: &Project,
    unit: StressUnit,
    notes: &mut Footnotes,
) -> Result<(), StudyError> {
    s.push_str("<section>\n<h2>Envelope</h2>\n");
    let settings = project.search_settings();
    let mut measures = vec![EnvelopeMeasure::VonMises];
    for c in crate::mechanics::criteria::Criterion::ALL {
        if project.material.strengths.checks(c) {
            measures.push(EnvelopeMeasure::Utilization(c));
        }
    }
    for measure in measures {
        let env = envelope(project, measure, &settings)?;
        let (what, formula) = match measure {
            EnvelopeMeasure::Utilization(c) => (format!("utilization, {}", c.label()), c.formula()),
            _ => ("von Mises stress".to_owned(), "σvM = √(3 J2)"),
        };
        let _ = write!(
            s,
            "<h3>By {}{}</h3>\n<table>\n<tr><th>#</th><th>case or combination</th><th>kind</th><th>value</th></tr>\n",
            escape(&what),
            notes.mark(formula)
        );
        for (i, r) in env.rows.iter().enumerate() {
            let value = match r.value {
                Some(v) if measure.is_stress() => {
                    format!("{} {unit}", readable(unit.from_pa(v), 6))
                }
                Some(v) => readable(v, 6),
                None => crate::study::envelope::standing_text(r.standing()).to_owned(),
            };
            let governs = if env.governing.as_deref() == Some(r.name.as_str()) {
                " <strong>(governs)</strong>"
            } else {
                ""
            };
            let _ = writeln!(
                s,
                "<tr><td class=\"num\">{}</td><td>{}{governs}</td><td>{}</td><td class=\"num\">{value}</td></tr>",
                i + 1,
                escape(&r.name),
                if r.combination {
                    "combination"
                } else {
                    "load case"
                }
            );
        }
        s.push_str("</table>\n");
    }
    s.push_str("</section>\n");
    Ok(())
}

/// Load cases as tables: the files with their SHA-256, how they were read, the combinations,
/// the counts and the worst points with their governing combination.
fn tables_section(s: &mut String, t: &TablesSection, unit: StressUnit, notes: &mut Footnotes) {
    let shown = |v: f64| {
        if t.measure.is_stress() {
            format!("{} {unit}", readable(unit.from_pa(v), 6))
        } else {
            readable(v, 6)
        }
    };
    let _ = write!(
        s,
        "<section>\n<h2>Load cases as tables</h2>\n<p>Finite-element results read as one table per load case, joined on their ids; at every point each combination's tensor is Σ factor × case tensor{}, the combination with the worst {} governs the point, and the points are ranked by that value.</p>\n<table>\n<tr><th>load case</th><th>file</th><th>SHA-256</th><th>rows read</th><th>bad rows skipped</th></tr>\n",
        notes.mark("Tensors superpose; principal values do not (common practice, no source)."),
        escape(&t.measure.label())
    );
    for (case, file, rows, bad) in &t.inputs {
        let _ = writeln!(
            s,
            "<tr><td>{}</td><td>{}</td><td><code>{}</code></td><td class=\"num\">{rows}</td><td class=\"num\">{bad}</td></tr>",
            if case.is_empty() {
                "(named by the case column)".to_owned()
            } else {
                escape(case)
            },
            escape(&file.name),
            file.sha256
        );
    }
    let _ = writeln!(s, "</table>\n<p>Read as: {}.</p>", escape(&t.reading));
    if t.each_case_alone {
        s.push_str(
            "<p>No combinations were given: each load case alone (factor 1) is enveloped.</p>\n",
        );
    }
    s.push_str("<table>\n<tr><th>combination</th><th>terms</th><th>points it governs</th></tr>\n");
    for (name, terms, n) in &t.combinations {
        let _ = writeln!(
            s,
            "<tr><td>{}</td><td>{}</td><td class=\"num\">{n}</td></tr>",
            escape(name),
            escape(terms)
        );
    }
    let _ = writeln!(
        s,
        "</table>\n<p>{} points ranked{}; {}{}.</p>",
        t.points,
        if t.left_out > 0 {
            format!(
                ", {} left out (missing from a load case or met twice in one)",
                t.left_out
            )
        } else {
            String::new()
        },
        escape(&t.counts),
        t.threshold.map_or_else(String::new, |(v, n)| format!(
            "; {n} at or beyond {}",
            shown(v)
        ))
    );
    let _ = write!(
        s,
        "<h3>The worst points</h3>\n<table>\n<tr><th>#</th><th>point</th><th>ids</th><th>governing combination</th><th>{}</th><th>σ1</th><th>σ2</th><th>σ3</th></tr>\n",
        escape(&t.measure.label())
    );
    for (i, top) in t.top.iter().enumerate() {
        let value = top.value.map_or_else(
            || crate::study::envelope::standing_text(top.standing).to_owned(),
            shown,
        );
        let p = top
            .principal
            .map(|v| format!("{} {unit}", readable(unit.from_pa(v), 5)));
        let _ = writeln!(
            s,
            "<tr><td class=\"num\">{}</td><td class=\"num\">{}</td><td>{}</td><td>{}</td><td class=\"num\">{value}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td></tr>",
            i + 1,
            top.point,
            escape(&top.ids),
            escape(&top.combination),
            p[0],
            p[1],
            p[2]
        );
    }
    s.push_str("</table>\n");
    if let Some(name) = &t.worst_shown_as {
        let _ = writeln!(
            s,
            "<p>The worst point's load-case tensors stand in for the project's cases of the same names in this report (the project file is not changed); its governing combination is reported in full below as <strong>{}</strong>.</p>",
            escape(name)
        );
    }
    s.push_str("</section>\n");
}

fn row_table(s: &mut String, rows: &[ResultRow], unit: StressUnit, notes: &mut Footnotes) {
    let mut group = "";
    for r in rows {
        if r.group != group {
            if !group.is_empty() {
                s.push_str("</table>\n");
            }
            group = r.group;
            let _ = write!(s, "<h3>{}</h3>\n<table>\n", escape(group));
        }
        let (number, u) = r.value.parts(unit);
        let _ = writeln!(
            s,
            "<tr><th>{}{}</th><td class=\"num\">{}</td><td>{}</td></tr>",
            escape(&r.name),
            notes.mark(r.formula),
            escape(&number),
            escape(&u)
        );
    }
    if !group.is_empty() {
        s.push_str("</table>\n");
    }
}

fn verdict_table(s: &mut String, verdicts: &[Verdict], unit: StressUnit, notes: &mut Footnotes) {
    use crate::mechanics::criteria::definitions;
    let _ = writeln!(
        s,
        "<h3>Verdict</h3>\n<table>\n<tr><th>criterion</th><th>outcome</th><th>stress judged</th><th>demand</th><th>strength</th><th>utilization</th><th>factor of safety{}</th><th>strength-reduction factor{}</th><th>mobilized friction angle{}</th><th>note</th></tr>",
        notes.mark(definitions::PROPORTIONAL),
        notes.mark(definitions::REDUCTION),
        notes.mark(definitions::MOBILIZED)
    );
    let stress = |v: Option<f64>| {
        v.map_or_else(
            || "—".to_owned(),
            |x| format!("{} {unit}", readable(unit.from_pa(x), 6)),
        )
    };
    for v in verdicts {
        let (class, word) = match v.outcome() {
            Outcome::Passes => ("passes", "passes"),
            Outcome::Fails => ("fails", "fails"),
            Outcome::NotChecked => ("not-checked", "not checked"),
        };
        let u = match (v.utilization, v.condition) {
            (Some(u), _) => readable(u, 6),
            (None, Condition::NotChecked) => "—".to_owned(),
            (None, c) => crate::study::envelope::standing_text(c).to_owned(),
        };
        let (reduction, mobilized) = match v.reduction {
            Some(r) => match (r.factor, r.mobilized_friction_deg) {
                (Some(f), Some(phi)) => (readable(f, 6), format!("{}°", readable(phi, 6))),
                _ => (
                    crate::study::envelope::reduction_text(r.condition).to_owned(),
                    "—".to_owned(),
                ),
            },
            None => ("—".to_owned(), "—".to_owned()),
        };
        let basis = if v.condition == Condition::NotChecked {
            "—".to_owned()
        } else {
            v.basis.text(unit)
        };
        let _ = writeln!(
            s,
            "<tr><td>{}{}</td><td class=\"{class}\">{word}</td><td>{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{u}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td>{}</td></tr>",
            escape(v.criterion.label()),
            notes.mark(v.criterion.formula()),
            escape(&basis),
            stress(v.governing_stress_pa),
            stress(v.strength_pa),
            v.factor_of_safety
                .map_or_else(|| "—".to_owned(), |f| readable(f, 6)),
            escape(&reduction),
            escape(&mobilized),
            escape(&v.note)
        );
    }
    s.push_str("</table>\n");
}

fn case_section(
    s: &mut String,
    project: &Project,
    name: &str,
    unit: StressUnit,
    options: &ReportOptions,
    notes: &mut Footnotes,
) -> Result<(), StudyError> {
    let d = Derived::of(project, name);
    if let Some(problem) = &d.problem {
        return Err(StudyError::Unusable(problem.clone()));
    }
    let kind = if d.combination {
        "Combination"
    } else {
        "Load case"
    };
    let _ = write!(
        s,
        "<section class=\"case\">\n<h2>{kind}: {}</h2>\n",
        escape(name)
    );
    // Inputs as typed.
    if let Some(case) = project.case(name) {
        if !case.description.is_empty() {
            let _ = writeln!(s, "<p>{}</p>", escape(&case.description));
        }
        let input = &case.input;
        if let crate::study::CaseInput::TableRow(row) = input {
            let _ = writeln!(
                s,
                "<p>Taken from the table {}, {}.</p>",
                escape(&row.file),
                escape(&row.place())
            );
        }
        let (stress_unit, strain_unit, modulus_unit) = input.units();
        let _ = write!(
            s,
            "<h3>Input as typed: {}{}</h3>\n<table>\n",
            escape(input.kind().label()),
            if input.compression_positive() {
                " (compression positive)"
            } else {
                " (tension positive)"
            }
        );
        for ((label, what), v) in input.kind().fields().iter().zip(input.numbers()) {
            let u = match what {
                FieldKind::Stress => stress_unit.clone(),
                FieldKind::Degrees => "°".to_owned(),
                FieldKind::Strain => strain_unit.clone(),
                FieldKind::Modulus => modulus_unit.clone(),
                FieldKind::Ratio => String::new(),
            };
            let _ = writeln!(
                s,
                "<tr><th>{}</th><td class=\"num\">{}</td><td>{}</td></tr>",
                escape(label),
                readable(v, 10),
                escape(&u)
            );
        }
        s.push_str("</table>\n");
    } else if let Some(c) = project.combination(name) {
        let _ = write!(
            s,
            "<h3>Combination{}</h3>\n<p>{} = {}</p>\n",
            notes.mark("A combination's tensor is Σ factor × case tensor; principal stresses do not superpose, tensors do"),
            escape(name),
            escape(&crate::study::model::terms_text(&c.terms))
        );
    }
    // The tensor.
    let sign = d.convention.sign();
    let comp = |c: Component| readable(sign * unit.from_pa(d.tensor.component_pa(c)), 6);
    let _ = write!(
        s,
        "<h3>Stress tensor ({unit}, {})</h3>\n<table>\n<tr><th></th><th>x</th><th>y</th><th>z</th></tr>\n<tr><th>x</th><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td></tr>\n<tr><th>y</th><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td></tr>\n<tr><th>z</th><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td></tr>\n</table>\n",
        d.convention.key(),
        comp(Component::Xx),
        comp(Component::Xy),
        comp(Component::Zx),
        comp(Component::Xy),
        comp(Component::Yy),
        comp(Component::Yz),
        comp(Component::Zx),
        comp(Component::Yz),
        comp(Component::Zz),
    );
    row_table(s, &crate::output::results::shown_rows(&d), unit, notes);
    verdict_table(s, &d.verdicts, unit, notes);
    // Named faults.
    if !d.faults.is_empty() {
        let _ = write!(
            s,
            "<h3>Named faults{}</h3>\n<table>\n<tr><th>name</th><th>dip / dip direction</th><th>σn′</th><th>τ</th><th>slip tendency</th><th>dilation tendency</th><th>rake{}</th><th>Coulomb U</th><th>Δp to slip</th></tr>\n",
            notes.mark("Slip tendency τ/σn′ (Morris et al. 1996); dilation tendency (σ1 − σn)/(σ1 − σ3) (Ferrill et al. 1999); Δp = σn′ − (τ − c)/tan φ"),
            notes.mark("Rake: the angle in the plane from strike (dip direction − 90°) to the hanging wall's slip, reverse +90°, normal −90° (Aki & Richards 1980)")
        );
        if d.search.material.is_none() {
            let _ = writeln!(
                s,
                "<p>Coulomb U and Δp: not checked (needs {}).</p>",
                crate::study::MeasureChoice::PLANE_STRENGTH_NEEDED
            );
        }
        let st = |v: f64| format!("{} {unit}", readable(unit.from_pa(v), 6));
        let r = |v: Option<f64>| v.map_or_else(|| "undefined".to_owned(), |x| readable(x, 6));
        for (f, c) in &d.faults {
            let cells = c.as_ref().map_or_else(
                || "<td colspan=\"7\">—</td>".to_owned(),
                |c| {
                    let (u, dp) = if c.mohr_coulomb.is_some() {
                        (
                            r(c.mohr_coulomb.and_then(|m| m.utilization)),
                            c.pore_pressure_to_slip_pa
                                .map_or_else(|| "undefined".to_owned(), st),
                        )
                    } else {
                        ("not checked".to_owned(), "not checked".to_owned())
                    };
                    format!(
                        "<td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{u}</td><td class=\"num\">{dp}</td>",
                        st(c.effective_normal_stress_pa),
                        st(c.shear_stress_pa),
                        r(c.slip_tendency.utilization),
                        r(c.dilation_tendency.utilization),
                        c.rake_deg.map_or_else(|| "undefined".to_owned(), |x| format!("{}°", readable(x, 5))),
                    )
                },
            );
            let _ = writeln!(
                s,
                "<tr><td>{}</td><td class=\"num\">{}° / {}°</td>{cells}</tr>",
                escape(&f.name),
                readable(f.dip_deg, 5),
                readable(f.dip_direction_deg, 5)
            );
        }
        s.push_str("</table>\n");
    }
    // Worst planes.
    if let Ok(w) = worst_plane(&d.tensor, &d.search) {
        let value = w.value.map_or_else(
            || "undefined (see the condition)".to_owned(),
            |v| {
                if w.measure.is_stress() {
                    format!("{} {unit}", readable(unit.from_pa(v), 6))
                } else {
                    readable(v, 6)
                }
            },
        );
        let _ = write!(
            s,
            "<h3>Worst planes for {}</h3>\n<p>Worst value {value} ({}); ",
            escape(w.measure.key()),
            serde_json::to_value(w.condition)
                .ok()
                .and_then(|v| v.as_str().map(str::to_owned))
                .unwrap_or_default()
        );
        let planes: Vec<String> = w
            .planes
            .iter()
            .map(|p| {
                format!(
                    "{}° / {}°",
                    readable(p.dip_deg, 5),
                    readable(p.dip_direction_deg, 5)
                )
            })
            .collect();
        let _ = writeln!(
            s,
            "planes (dip / dip direction): {}.</p>",
            planes.join(", ")
        );
    }
    // Figures.
    let input = FigureInput::from_derived(&d, false);
    for figure in &options.figures {
        let (w, h) = (1100, 750);
        let sizes = crate::picture::draw::Sizes::for_export(w as f32, h as f32);
        let caption = match figure {
            ReportFigure::View3d => {
                "3D view: unit cube with face tractions, the cut plane and its traction, principal axes"
            }
            ReportFigure::Map => {
                "Orientation map of the worst-plane measure (lower-hemisphere equal-area poles)"
            }
            ReportFigure::Mohr => "Mohr circles with the cut plane's and the worst planes' points",
        };
        // No title block (the page says what the figure is), but the caution's strip kept free.
        let frame = figures::titled(&[], sizes.text, [w, h], |h| match figure {
            ReportFigure::View3d => figures::view_3d(
                &input,
                crate::picture::scene::Layers::default(),
                crate::picture::scene::FaceChoice::FacingViewer,
                &crate::picture::draw::camera::Camera::default(),
                w,
                h,
                sizes,
            ),
            ReportFigure::Map => figures::map(&input, &d.search, 128, w, h, sizes),
            ReportFigure::Mohr => figures::mohr(&input, w, h, sizes),
        });
        let svg = inline_svg(&crate::picture::draw::svg::to_svg(
            &crate::picture::caution::with_caution(&frame),
            &format!("{} — {name}", project.name),
        ));
        let kind = match figure {
            ReportFigure::View3d => FigureKind::View3d,
            ReportFigure::Map => FigureKind::Map,
            ReportFigure::Mohr => FigureKind::Mohr,
        };
        let own: String = input
            .captions(kind)
            .iter()
            .fold(String::new(), |mut acc, c| {
                acc.push(' ');
                acc.push_str(&escape(c));
                acc
            });
        let _ = write!(
            s,
            "<figure>\n{svg}<figcaption>{} — {caption}.{own}</figcaption>\n</figure>\n",
            escape(name),
        );
    }
    s.push_str("</section>\n");
    Ok(())
}

/// An SVG document made fit to sit inside HTML: no XML declaration and no namespace URL (HTML
/// puts `<svg>` in its namespace itself), so the report holds no web address at all.
pub(super) fn inline_svg(svg: &str) -> String {
    svg.lines()
        .filter(|l| !l.starts_with("<?xml"))
        .map(|l| l.replace(r#" xmlns="http://www.w3.org/2000/svg""#, ""))
        .collect::<Vec<_>>()
        .join("\n")
        + "\n"
}
