//! Label placement: the text boxes the placement pass measures hold the glyphs the exported font
//! draws, and no two texts of the demo figures overlap — the 3D view from each of the seven
//! view presets, the orientation map and the Mohr circles, at window and export sizes, for every
//! load case and combination of the invented demo project.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

use planewise::picture::draw::camera::{Camera, ViewPreset};
use planewise::picture::draw::place::{overlapping_texts, text_width};
use planewise::picture::draw::{Frame, Prim, Sizes};
use planewise::picture::figures::{self, FigureInput};
use planewise::picture::scene::{FaceChoice, Layers};
use planewise::study::derived::Derived;
use planewise::study::model::Project;
use skrifa::MetadataProvider;
use skrifa::instance::{LocationRef, Size};

/// The advance width of `text` at `size` pixels in the bundled DejaVu Sans, from the font
/// file's own horizontal metrics (no kerning: the exports' SVG text is not kerned by resvg's
/// default either, and kerning only narrows).
fn dejavu_width(text: &str, size: f32) -> f32 {
    let font = skrifa::FontRef::new(planewise::picture::draw::png::FONT).unwrap();
    let metrics = font.glyph_metrics(Size::new(size), LocationRef::default());
    let charmap = font.charmap();
    text.chars()
        .map(|c| {
            let glyph = charmap
                .map(c)
                .unwrap_or_else(|| panic!("{c:?} not in the font"));
            metrics.advance_width(glyph).unwrap()
        })
        .sum()
}

/// Every text the figures draw, from the demo frames.
fn all_texts(frames: &[Frame]) -> Vec<(String, f32)> {
    let mut out = Vec::new();
    for f in frames {
        for p in &f.prims {
            if let Prim::Text { text, size, .. } = p {
                out.push((text.clone(), *size));
            }
        }
    }
    out
}

fn demo_states() -> Vec<(String, Derived)> {
    let project = Project::demo();
    let names: Vec<String> = project
        .names()
        .into_iter()
        .map(|(n, _)| n.to_owned())
        .collect();
    names
        .into_iter()
        .map(|name| {
            let mut p = project.clone();
            p.active.clone_from(&name);
            (name, Derived::new(&p))
        })
        .collect()
}

/// The demo figures at `width` × `height` with `sizes`: the 3D view from every preset with
/// every layer on (worst planes too), the map and the Mohr circles. Exported ones (`export`)
/// go through the export path: the caution's strip kept free, then the caution.
fn demo_frames(width: u32, height: u32, sizes: Sizes, export: bool) -> Vec<(String, Frame)> {
    let finish = |build: &dyn Fn(u32) -> Frame| {
        if export {
            planewise::picture::caution::with_caution(&figures::titled(
                &[],
                sizes.text,
                [width, height],
                build,
            ))
        } else {
            build(height)
        }
    };
    let mut out = Vec::new();
    for (name, d) in demo_states() {
        let input = FigureInput::from_derived(&d, true);
        let layers = Layers {
            worst_planes: true,
            ..Layers::default()
        };
        for preset in ViewPreset::ALL {
            let camera = Camera::from_preset(preset);
            out.push((
                format!("{name}, 3D view from {}", preset.key()),
                finish(&|h| {
                    figures::view_3d(
                        &input,
                        layers,
                        FaceChoice::default(),
                        &camera,
                        width,
                        h,
                        sizes,
                    )
                }),
            ));
        }
        let search = d.search;
        out.push((
            format!("{name}, map"),
            finish(&|h| figures::map(&input, &search, 96, width, h, sizes)),
        ));
        out.push((
            format!("{name}, Mohr"),
            finish(&|h| figures::mohr(&input, width, h, sizes)),
        ));
    }
    out
}

#[test]
fn measured_text_boxes_hold_the_exported_glyphs() {
    let frames: Vec<Frame> = demo_frames(1600, 1000, Sizes::for_export(1600.0, 1000.0), true)
        .into_iter()
        .map(|(_, f)| f)
        .collect();
    let texts = all_texts(&frames);
    assert!(texts.len() > 100, "{} texts", texts.len());
    for (text, size) in texts {
        let font = dejavu_width(&text, size);
        let ours = text_width(&text, size);
        // Never narrower than the font; not so wide that boxes push labels needlessly far.
        assert!(
            ours >= font,
            "{text:?}: measured {ours} px < font {font} px"
        );
        assert!(
            ours <= 1.3 * font + size,
            "{text:?}: measured {ours} px ≫ font {font} px"
        );
    }
}

fn assert_no_overlaps(width: u32, height: u32, sizes: Sizes, export: bool) {
    let mut bad = Vec::new();
    for (what, frame) in demo_frames(width, height, sizes, export) {
        for (a, b) in overlapping_texts(&frame) {
            bad.push(format!("{what}: {a:?} overlaps {b:?}"));
        }
    }
    assert!(bad.is_empty(), "{}", bad.join("\n"));
}

#[test]
fn no_two_texts_overlap_in_the_window_sized_demo_figures() {
    assert_no_overlaps(1100, 750, Sizes::default(), false);
}

#[test]
fn no_two_texts_overlap_in_the_exported_demo_figures_caution_included() {
    assert_no_overlaps(1600, 1000, Sizes::for_export(1600.0, 1000.0), true);
    assert_no_overlaps(1100, 750, Sizes::for_export(1100.0, 750.0), true);
}
