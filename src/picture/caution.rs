//! The caution strip: [`crate::SAFETY_NOTE`] printed small at the foot of every exported or
//! copied figure, at least 6.5 pt when printed at the default width. Figures leave its strip
//! free ([`caution_height`]) so it covers nothing.

use crate::picture::draw::place::text_width;
use crate::picture::draw::{Anchor, Frame, PRINT_WIDTH_MM, Prim};

/// The caution's text size and lines at the foot of a `width` × `height` figure: at least
/// 6.5 pt when the figure is printed at the default print width; one line when it fits, else
/// two.
fn caution_lines(width: f32, height: f32) -> (f32, Vec<String>) {
    let note = crate::SAFETY_NOTE;
    let fits = |text: &str, size: f32| text_width(text, size) <= width - size;
    let legible = 6.5 * 25.4 / 72.0 / PRINT_WIDTH_MM * width;
    // The size at which the note just fits on one line.
    let one_line = width / (text_width(note, 1.0) + 1.0);
    if one_line >= legible && fits(note, one_line.min(height / 70.0)) {
        return (one_line.min(height / 70.0).max(5.0), vec![note.to_owned()]);
    }
    let mid = note.len() / 2;
    let split = note[..mid].rfind(' ').unwrap_or(mid);
    let (a, b) = note.split_at(split);
    let (a, b) = (a.trim(), b.trim());
    let longest = text_width(a, 1.0).max(text_width(b, 1.0));
    let size = legible.min(width / (longest + 1.0)).max(5.0);
    (size, vec![a.to_owned(), b.to_owned()])
}

/// Pixels the caution takes at the foot of a `width` × `height` figure; figures leave this
/// strip free (see [`crate::picture::figures::titled`]) so the caution covers nothing.
#[must_use]
pub fn caution_height(width: f32, height: f32) -> f32 {
    let (size, lines) = caution_lines(width, height);
    (lines.len() as f32 - 1.0) * 1.25 * size + 1.6 * size
}

/// `frame` with the caution ([`crate::SAFETY_NOTE`]) printed small at its foot, as every
/// exported or copied figure carries it.
#[must_use]
pub fn with_caution(frame: &Frame) -> Frame {
    let mut out = frame.clone();
    let (size, lines) = caution_lines(frame.width, frame.height);
    let n = lines.len() as f32;
    for (i, line) in lines.into_iter().enumerate() {
        out.prims.push(Prim::Text {
            at: [
                0.5 * size,
                frame.height - 0.8 * size - (n - 1.0 - i as f32) * 1.25 * size,
            ],
            text: line,
            size,
            color: crate::picture::scene::style::INK,
            anchor: Anchor::LeftCenter,
            halo: true,
        });
    }
    out
}
