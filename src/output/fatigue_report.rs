//! The fatigue calculation report: one self-contained HTML page for a history judged on its
//! critical plane (inputs with their SHA-256, material and constants with their derivation,
//! the criterion, the critical plane, utilization and factor of safety, finite life, the path
//! figure and the orientation map, and the cautions). Styles are the calculation report's.

use std::fmt::Write as _;

use super::report::{BUILD_COMMIT, STYLE, SourceFile, css_string};
use crate::picture::draw::svg::escape;
use crate::study::fatigue::{FATIGUE_CAUTION, FatigueSetup, Judged, LIFE_METHOD, LoadedHistory};
use crate::text::format::sig;

/// A table of the report: its heading and rows of (label, value), both plain text.
#[derive(Clone, Debug, PartialEq)]
pub struct Section {
    /// Heading.
    pub heading: String,
    /// Rows: label, value.
    pub rows: Vec<(String, String)>,
    /// A paragraph under the table (plain text; empty for none).
    pub note: String,
}

/// Everything the page shows, already in words and numbers with their units.
#[derive(Clone, Debug, PartialEq)]
pub struct FatigueReport {
    /// What is judged (a title).
    pub title: String,
    /// ISO 8601 date and time.
    pub date: String,
    /// The input files: their role and the file with its hash.
    pub inputs: Vec<(String, SourceFile)>,
    /// Sections in order.
    pub sections: Vec<Section>,
    /// Figures as SVG documents, with their captions.
    pub figures: Vec<(String, String)>,
    /// The fatigue caution (besides the program's).
    pub caution: String,
}

/// The page.
#[must_use]
pub fn html(r: &FatigueReport) -> String {
    let mut s = String::with_capacity(100_000);
    let title = escape(&r.title);
    let _ = write!(
        s,
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n<title>Fatigue report — {title}</title>\n<style>{STYLE}@page {{ @top-center {{ content: \"{header}\"; font-size: 8pt; color: #555; }} }}</style>\n</head>\n<body>\n",
        header = css_string(&format!("Planewise fatigue report — {}", r.title)),
    );
    let _ = write!(
        s,
        "<header>\n<h1>Fatigue on the critical plane: {title}</h1>\n<p>Made with Planewise {} (build {}) on {}.</p>\n<table class=\"identity\">\n",
        env!("CARGO_PKG_VERSION"),
        escape(BUILD_COMMIT),
        escape(&r.date)
    );
    for (role, f) in &r.inputs {
        let _ = writeln!(
            s,
            "<tr><th>{}</th><td>{}<br><code>SHA-256 {}</code></td></tr>",
            escape(role),
            escape(&f.name),
            escape(&f.sha256)
        );
    }
    s.push_str("</table>\n<table class=\"sign-off\"><tr><th>Prepared by</th><th>Checked by</th><th>Date</th></tr><tr><td></td><td></td><td></td></tr></table>\n</header>\n");
    let _ = write!(
        s,
        "<section>\n<h2>Scope and cautions</h2>\n<p class=\"caution\"><strong>Caution.</strong> {}</p>\n<p class=\"caution\">{}</p>\n<p>This report states how one load history at one point stands against a stress-based criterion for long fatigue life, searched over every plane through the point, and (when an S–N curve is given) the damage and life by rainflow counting and Miner's rule. It is an aid for engineers: check every input against its source and every result independently.</p>\n</section>\n",
        escape(crate::SAFETY_NOTE),
        escape(&r.caution)
    );
    for sec in &r.sections {
        let _ = write!(
            s,
            "<section>\n<h2>{}</h2>\n<table class=\"rows\">\n",
            escape(&sec.heading)
        );
        for (label, value) in &sec.rows {
            let _ = writeln!(
                s,
                "<tr><th>{}</th><td>{}</td></tr>",
                escape(label),
                escape(value)
            );
        }
        s.push_str("</table>\n");
        if !sec.note.is_empty() {
            let _ = writeln!(s, "<p>{}</p>", escape(&sec.note));
        }
        s.push_str("</section>\n");
    }
    for (caption, svg) in &r.figures {
        let _ = write!(
            s,
            "<section class=\"figure\">\n<figure>\n{}<figcaption>{}</figcaption>\n</figure>\n</section>\n",
            super::report::inline_svg(svg),
            escape(caption)
        );
    }
    s.push_str("</body>\n</html>\n");
    s
}

/// A searched plane in words: dip and dip direction to four digits and its unit normal to the
/// four decimals the search resolves (about 0.01°).
#[must_use]
pub fn plane_text(dip_deg: f64, dip_direction_deg: f64, normal: [f64; 3]) -> String {
    format!(
        "dip {}° / dip direction {}°, normal {}",
        sig(dip_deg, 4),
        sig(dip_direction_deg, 4),
        normal_text(normal)
    )
}

fn normal_text(n: [f64; 3]) -> String {
    let c = |v: f64| {
        let r = format!("{v:.4}");
        if r == "-0.0000" {
            "0.0000".to_owned()
        } else {
            r
        }
    };
    format!("({}, {}, {})", c(n[0]), c(n[1]), c(n[2]))
}

/// The report of one point's fatigue study (`resolution`: map cells per side; `date`: ISO 8601).
pub fn of(
    loaded: &LoadedHistory,
    setup: &FatigueSetup,
    judged: &Judged,
    resolution: usize,
    date: &str,
) -> Result<FatigueReport, String> {
    use crate::output::export::{ImageFormat, encode};
    use crate::picture::draw::Sizes;
    use crate::picture::figures;
    let u = setup.unit;
    let sym = u.symbol();
    let c = &setup.constants;
    let criterion = c.criterion;
    let history = &loaded.history;
    let time = |step: usize| sig(history.time()[step], 6);
    let mut inputs = Vec::new();
    for (role, file) in &loaded.files {
        let read = SourceFile::read(file).map_err(|e| format!("{}: {e}", file.display()))?;
        inputs.push((role.clone(), read));
    }
    let stress = |v: f64| format!("{} {sym}", sig(u.from_pa(v), 6));
    let mut material = Vec::new();
    if let Some(l) = &setup.limits {
        if let Some(f) = l.bending_pa {
            material.push((
                "f₋₁, fully reversed bending fatigue limit".to_owned(),
                stress(f),
            ));
        }
        material.push((
            "t₋₁, fully reversed torsion fatigue limit".to_owned(),
            stress(l.torsion_pa),
        ));
        if let Some(t) = l.tensile_strength_pa {
            material.push(("σu, tensile strength".to_owned(), stress(t)));
        }
    }
    material.push((
        format!("{} (coefficient)", criterion.coefficient_symbol()),
        sig(c.coefficient, 6),
    ));
    material.push((
        format!("{} (limit)", criterion.limit_symbol()),
        stress(c.limit_pa),
    ));
    material.push((
        "how the constants were had".to_owned(),
        c.derivation.clone(),
    ));
    let p = &judged.plane;
    let v = &p.value;
    let mean = v.circle.centre_resolved();
    let mut sections = vec![
        Section {
            heading: "Load history".to_owned(),
            rows: vec![
                ("source".to_owned(), loaded.text.clone()),
                ("steps".to_owned(), history.len().to_string()),
                (
                    format!("{} (first column)", loaded.time_name),
                    format!("{} to {}", time(0), time(history.len() - 1)),
                ),
                (
                    "unit and convention".to_owned(),
                    format!(
                        "{sym}, {} (σn in the criteria is tension-positive)",
                        setup.convention.key()
                    ),
                ),
            ],
            note: String::new(),
        },
        Section {
            heading: "Material and the criterion's constants".to_owned(),
            rows: material,
            note: "Calibrations derived on Mohr's circle from the two fatigue-limit tests so that the criterion gives utilization 1 in both (Planewise's src/mechanics/fatigue/criteria.rs); forms as in Socie & Marquis, Multiaxial Fatigue (SAE, 2000).".to_owned(),
        },
        Section {
            heading: "Criterion and critical plane".to_owned(),
            rows: vec![
                (
                    "criterion".to_owned(),
                    format!("{} — {}", criterion.label(), criterion.definition()),
                ),
                ("shear amplitude".to_owned(), setup.method.label().to_owned()),
                (
                    "critical plane".to_owned(),
                    plane_text(p.dip_deg, p.dip_direction_deg, p.normal),
                ),
                ("τa, shear amplitude".to_owned(), stress(v.tau_amplitude_pa)),
                (
                    "mean shear (a, b)".to_owned(),
                    format!(
                        "({}, {}) {sym}",
                        sig(u.from_pa(mean[0]), 4),
                        sig(u.from_pa(mean[1]), 4)
                    ),
                ),
                ("σn,max".to_owned(), stress(v.sigma_n_max_pa)),
                (
                    "value".to_owned(),
                    format!(
                        "{} (at {} {})",
                        stress(v.value_pa),
                        loaded.time_name,
                        time(v.step)
                    ),
                ),
                ("utilization = value ÷ limit".to_owned(), sig(p.utilization, 4)),
                (
                    "factor of safety = limit ÷ value".to_owned(),
                    p.factor_of_safety().map_or_else(
                        || "undefined (the value is not positive)".to_owned(),
                        |f| sig(f, 4),
                    ),
                ),
                (
                    "planes evaluated".to_owned(),
                    (p.evaluations + judged.life.as_ref().map_or(0, |l| l.evaluations)).to_string(),
                ),
            ],
            note: "The factor of safety is the factor on the whole history that reaches the limit (every criterion scales with the stresses).".to_owned(),
        },
    ];
    if let (Some(l), Some(sn)) = (&judged.life, &setup.sn) {
        let mut rows = vec![
            (
                "S–N curve (torsion)".to_owned(),
                format!(
                    "τa = τ'f (2N)^b, τ'f {}, b {}",
                    stress(sn.coefficient_pa),
                    sig(sn.exponent, 4)
                ),
            ),
            (
                "endurance limit".to_owned(),
                sn.endurance_pa.map_or_else(
                    || "none: Basquin's line below every amplitude".to_owned(),
                    |e| format!("{}: cycles below it do no damage (a cut-off)", stress(e)),
                ),
            ),
            ("method".to_owned(), LIFE_METHOD.to_owned()),
            (
                "plane of largest damage".to_owned(),
                plane_text(l.dip_deg, l.dip_direction_deg, l.normal),
            ),
            (
                "damage per repeat (Miner)".to_owned(),
                sig(l.damage.damage, 4),
            ),
            (
                "life".to_owned(),
                l.life_repeats.map_or_else(
                    || "unlimited (no cycle does damage)".to_owned(),
                    |n| format!("{} repeats of the history", sig(n, 4)),
                ),
            ),
        ];
        if let Some(g) = &l.damage.worst {
            rows.push((
                "governing cycle".to_owned(),
                format!(
                    "{} {} to {}; τa {}, σn,max {}, τeq {}; {} cycle; damage {}",
                    loaded.time_name,
                    time(g.from.min(g.to)),
                    time(g.from.max(g.to)),
                    stress(g.amplitude_pa),
                    stress(g.sigma_n_max_pa),
                    stress(g.equivalent_pa),
                    if g.count < 1.0 { "half" } else { "full" },
                    sig(g.damage, 4)
                ),
            ));
        }
        sections.push(Section {
            heading: "Finite life".to_owned(),
            rows,
            note: "Rainflow counting per ASTM E1049-85; Palmgren–Miner summation. Miner's rule ignores load sequence; the S–N curve must be of the material in its condition.".to_owned(),
        });
    }
    let svg = |frame: &crate::picture::draw::Frame, title: &str| -> Result<String, String> {
        let bytes = encode(frame, ImageFormat::Svg, title).map_err(|e| e.to_string())?;
        Ok(String::from_utf8_lossy(&bytes).into_owned())
    };
    let path = figures::fatigue_path(
        loaded,
        setup,
        judged,
        None,
        [1400, 760],
        Sizes::for_export(1400.0, 760.0),
    );
    let (map, map_title) = figures::fatigue_map(
        loaded,
        setup,
        judged,
        resolution,
        None,
        [1200, 900],
        Sizes::for_export(1200.0, 900.0),
    );
    Ok(FatigueReport {
        title: loaded.text.clone(),
        date: date.to_owned(),
        inputs,
        sections,
        figures: vec![
            (
                "The history: its six components against time.".to_owned(),
                svg(
                    &crate::picture::draw::history::components_frame(
                        history.time(),
                        history.tensors_pa(),
                        &loaded.time_name,
                        u,
                        setup.convention,
                        [1400, 560],
                        Sizes::for_export(1400.0, 560.0),
                    ),
                    "The history's components",
                )?,
            ),
            (
                "The critical plane's shear path in its own axes with the amplitude circle, and σn(t), |τ(t)| against time (the governing cycle shaded when finite life is computed).".to_owned(),
                svg(&path, "Shear path on the critical plane")?,
            ),
            (
                format!("{map_title}; the critical plane marked."),
                svg(&map, &map_title)?,
            ),
        ],
        caution: FATIGUE_CAUTION.to_owned(),
    })
}
