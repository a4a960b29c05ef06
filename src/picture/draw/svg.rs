//! Writes a [`Frame`] as SVG. Text uses the bundled DejaVu Sans font by name, so the PNG path
//! (which loads that font) and any viewer with the font show the same picture.

use std::fmt::Write as _;

use super::frame::{Anchor, Frame, Prim};
use crate::picture::scene::style::Rgba;

/// The font family named in exported SVG text.
pub const FONT_FAMILY: &str = "DejaVu Sans";

/// Text made safe inside XML and HTML elements and attribute values.
#[must_use]
pub fn escape(text: &str) -> String {
    use std::fmt::Write as _;
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#39;"),
            '\t' | '\n' | '\r' => out.push(c),
            // Characters XML 1.0 forbids (C0 controls, U+FFFE, U+FFFF) and C1 controls: a
            // visible replacement, so one pasted vertical tab cannot make the file unreadable.
            '\u{0}'..='\u{1f}' | '\u{7f}'..='\u{9f}' | '\u{fffe}' | '\u{ffff}' => {
                out.push('\u{fffd}');
            }
            // Bidirectional embeddings, overrides and isolates would reorder the text around
            // them without showing why: shown as their code point instead.
            '\u{202a}'..='\u{202e}' | '\u{2066}'..='\u{2069}' => {
                let _ = write!(out, "[U+{:04X}]", u32::from(c));
            }
            _ => out.push(c),
        }
    }
    out
}

fn paint(attr: &str, c: Rgba) -> String {
    if c.a == 255 {
        format!(r#"{attr}="{}""#, c.hex())
    } else {
        format!(
            r#"{attr}="{}" {attr}-opacity="{:.3}""#,
            c.hex(),
            f32::from(c.a) / 255.0
        )
    }
}

/// The SVG document for `frame`, with an optional title (for example the load case and the
/// safety caution) in its metadata.
#[must_use]
pub fn to_svg(frame: &Frame, title: &str) -> String {
    let (w, h) = (frame.width, frame.height);
    let mut s = String::with_capacity(64 * frame.prims.len() + 512);
    let _ = writeln!(
        s,
        r#"<svg xmlns="http://www.w3.org/2000/svg" width="{w}" height="{h}" viewBox="0 0 {w} {h}">"#
    );
    let _ = writeln!(s, "<title>{}</title>", escape(title));
    let _ = writeln!(
        s,
        r#"<rect width="{w}" height="{h}" {}/>"#,
        paint("fill", frame.background)
    );
    for prim in &frame.prims {
        match prim {
            Prim::Polygon {
                points,
                fill,
                outline,
            } => {
                let pts: Vec<String> = points
                    .iter()
                    .map(|p| format!("{:.2},{:.2}", p[0], p[1]))
                    .collect();
                let stroke = outline.map_or_else(
                    || r#"stroke="none""#.to_owned(),
                    |(c, width)| {
                        format!(
                            r#"{} stroke-width="{width:.2}" stroke-linejoin="round""#,
                            paint("stroke", c)
                        )
                    },
                );
                let _ = writeln!(
                    s,
                    r#"<polygon points="{}" {} {stroke}/>"#,
                    pts.join(" "),
                    paint("fill", *fill)
                );
            }
            Prim::Image {
                at,
                size,
                pixels,
                rgba,
            } => {
                if let Ok(png) = super::pixels::encode_rgba(pixels[0], pixels[1], rgba) {
                    let _ = writeln!(
                        s,
                        r#"<image x="{:.2}" y="{:.2}" width="{:.2}" height="{:.2}" preserveAspectRatio="none" image-rendering="optimizeSpeed" href="data:image/png;base64,{}"/>"#,
                        at[0],
                        at[1],
                        size[0],
                        size[1],
                        base64(&png)
                    );
                }
            }
            Prim::Line { a, b, width, color } => {
                let _ = writeln!(
                    s,
                    r#"<line x1="{:.2}" y1="{:.2}" x2="{:.2}" y2="{:.2}" {} stroke-width="{width:.2}" stroke-linecap="round"/>"#,
                    a[0],
                    a[1],
                    b[0],
                    b[1],
                    paint("stroke", *color)
                );
            }
            Prim::Text {
                at,
                text,
                size,
                color,
                anchor,
                halo,
            } => {
                let align = match anchor {
                    Anchor::LeftCenter => "start",
                    Anchor::RightCenter => "end",
                    Anchor::Center => "middle",
                };
                let halo = if *halo {
                    format!(
                        r#" stroke="{}" stroke-width="{:.2}" stroke-linejoin="round" paint-order="stroke""#,
                        frame.background.hex(),
                        0.3 * size
                    )
                } else {
                    String::new()
                };
                // Place the baseline so that the text's middle sits on `at` (about 0.35 em below).
                let _ = writeln!(
                    s,
                    r#"<text x="{:.2}" y="{:.2}" font-family="{FONT_FAMILY}" font-size="{size:.2}" text-anchor="{align}" {}{halo}>{}</text>"#,
                    at[0],
                    at[1] + 0.35 * size,
                    paint("fill", *color),
                    escape(text)
                );
            }
        }
    }
    s.push_str("</svg>\n");
    // In debug builds (every test run, and the binary the tests drive) each SVG written is read
    // back by a strict XML parser: a character XML forbids cannot slip through unnoticed.
    debug_assert!(
        resvg::usvg::roxmltree::Document::parse(&s).is_ok(),
        "the SVG written is not well-formed XML"
    );
    s
}

/// Standard base64 (RFC 4648, section 4) with padding, by the `base64` crate.
#[must_use]
pub fn base64(bytes: &[u8]) -> String {
    use base64::Engine as _;
    base64::engine::general_purpose::STANDARD.encode(bytes)
}

#[cfg(test)]
mod tests {
    #[test]
    fn base64_matches_rfc4648_test_vectors() {
        // RFC 4648, section 10.
        for (input, output) in [
            ("", ""),
            ("f", "Zg=="),
            ("fo", "Zm8="),
            ("foo", "Zm9v"),
            ("foob", "Zm9vYg=="),
            ("fooba", "Zm9vYmE="),
            ("foobar", "Zm9vYmFy"),
        ] {
            assert_eq!(super::base64(input.as_bytes()), output);
        }
    }
}
