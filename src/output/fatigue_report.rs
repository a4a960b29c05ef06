//! The fatigue calculation report: one self-contained HTML page for a history judged on its
//! critical plane (inputs with their SHA-256, material and constants with their derivation,
//! the criterion, the critical plane, utilization and factor of safety, finite life, the path
//! figure and the orientation map, and the cautions). Styles are the calculation report's.

use std::fmt::Write as _;

use super::report::{BUILD_COMMIT, STYLE, SourceFile, css_string};
use crate::picture::draw::svg::escape;

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
