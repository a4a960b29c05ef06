//! The orientation map as a figure: the equal-area disc coloured by the measure, a labelled
//! colour bar, north and east, the principal axes, the current plane and the worst planes.

use std::sync::Arc;

use nalgebra::Vector3;

use super::{Anchor, Frame, Prim, Sizes, marker};
use crate::mechanics::PlaneNormal;
use crate::mechanics::stereonet::{OrientationMap, project_pole, viridis};
use crate::scene::style;

/// What is marked on the map besides the colours.
#[derive(Clone, Debug, PartialEq)]
pub struct MapMarks {
    /// Principal directions σ1, σ2, σ3 (in the display convention's order).
    pub principal: [Vector3<f64>; 3],
    /// The current cut plane.
    pub plane: Option<PlaneNormal>,
    /// The worst planes.
    pub worst: Vec<PlaneNormal>,
}

/// Where the disc sits in a `width` × `height` figure: centre and radius in pixels.
#[must_use]
pub fn disc_geometry(width: f32, height: f32) -> ([f32; 2], f32) {
    // Leave room on the right for the colour bar and its labels at screen text sizes.
    let r = (0.40 * height).min(0.30 * width);
    ([0.08 * width + r, 0.5 * height + 0.02 * height], r)
}

/// Pixel position of map point (X east, Y north).
fn to_px(centre: [f32; 2], r: f32, xy: [f64; 2]) -> [f32; 2] {
    [centre[0] + xy[0] as f32 * r, centre[1] - xy[1] as f32 * r]
}

/// The figure. `value_label` formats a value with its unit; `title` names the measure.
#[must_use]
pub fn map_frame(
    map: &OrientationMap,
    marks: &MapMarks,
    title: &str,
    value_label: &dyn Fn(f64) -> String,
    width: u32,
    height: u32,
    sizes: Sizes,
) -> Frame {
    let (w, h) = (width as f32, height as f32);
    let mut frame = Frame {
        width: w,
        height: h,
        background: style::BACKGROUND,
        prims: Vec::new(),
    };
    let (centre, r) = disc_geometry(w, h);
    let (lo, hi) = map.range.unwrap_or((0.0, 1.0));
    let span = if hi > lo { hi - lo } else { 1.0 };
    // The coloured cells, as one image (transparent outside the disc and where undefined).
    let mut rgba = vec![0u8; map.size * map.size * 4];
    for (i, v) in map.values.iter().enumerate() {
        if let Some(v) = v {
            let [cr, cg, cb] = viridis((v - lo) / span);
            rgba[i * 4..i * 4 + 4].copy_from_slice(&[cr, cg, cb, 255]);
        }
    }
    frame.prims.push(Prim::Image {
        at: [centre[0] - r, centre[1] - r],
        size: [2.0 * r, 2.0 * r],
        pixels: [map.size as u32, map.size as u32],
        rgba: Arc::new(rgba),
    });
    // Rim, north and east.
    let rim: Vec<[f32; 2]> = (0..=120)
        .map(|i| {
            let a = std::f32::consts::TAU * i as f32 / 120.0;
            [centre[0] + r * a.cos(), centre[1] + r * a.sin()]
        })
        .collect();
    for pair in rim.windows(2) {
        frame.prims.push(Prim::Line {
            a: pair[0],
            b: pair[1],
            width: 1.4 * sizes.line,
            color: style::INK,
        });
    }
    let text = |frame: &mut Frame, at: [f32; 2], t: String, anchor: Anchor| {
        frame.prims.push(Prim::Text {
            at,
            text: t,
            size: sizes.text,
            color: style::INK,
            anchor,
            halo: true,
        });
    };
    text(
        &mut frame,
        [centre[0], centre[1] - r - 1.2 * sizes.text],
        "N".into(),
        Anchor::Center,
    );
    text(
        &mut frame,
        [centre[0] + r + 0.9 * sizes.text, centre[1]],
        "E".into(),
        Anchor::Center,
    );
    let tick = 6.0 * sizes.line;
    for (a, b) in [
        ([0.0, -r], [0.0, -r - tick]),
        ([r, 0.0], [r + tick, 0.0]),
        ([0.0, r], [0.0, r + tick]),
        ([-r, 0.0], [-r - tick, 0.0]),
    ] {
        frame.prims.push(Prim::Line {
            a: [centre[0] + a[0], centre[1] + a[1]],
            b: [centre[0] + b[0], centre[1] + b[1]],
            width: 1.4 * sizes.line,
            color: style::INK,
        });
    }
    // Marks: principal axes (squares), current plane (ring-like hexagon), worst planes (stars
    // drawn as diamonds).
    for (i, d) in marks.principal.iter().enumerate() {
        if let Ok(n) = PlaneNormal::from_vector(*d) {
            let at = to_px(centre, r, project_pole(&n));
            frame.prims.push(marker(
                at,
                5.0 * sizes.line,
                4,
                style::Rgba::rgb(255, 255, 255),
            ));
            text(
                &mut frame,
                [at[0] + 8.0 * sizes.line, at[1] - 8.0 * sizes.line],
                format!("σ{}", i + 1),
                Anchor::LeftCenter,
            );
        }
    }
    if let Some(n) = marks.plane {
        let at = to_px(centre, r, project_pole(&n));
        frame
            .prims
            .push(marker(at, 6.0 * sizes.line, 12, style::PLANE_NORMAL));
        text(
            &mut frame,
            [at[0] + 9.0 * sizes.line, at[1] + 9.0 * sizes.line],
            "cut plane".into(),
            Anchor::LeftCenter,
        );
    }
    for n in &marks.worst {
        let at = to_px(centre, r, project_pole(n));
        frame
            .prims
            .push(marker(at, 7.0 * sizes.line, 3, style::WORST_PLANE));
    }
    // Colour bar.
    let bar_x = centre[0] + r + 0.10 * w.min(h);
    let bar_top = centre[1] - r;
    let bar_h = 2.0 * r;
    let bar_w = 0.035 * w.min(h);
    let steps = 128usize;
    let mut bar = vec![0u8; steps * 4];
    for i in 0..steps {
        let [cr, cg, cb] = viridis(1.0 - i as f64 / (steps - 1) as f64);
        bar[i * 4..i * 4 + 4].copy_from_slice(&[cr, cg, cb, 255]);
    }
    frame.prims.push(Prim::Image {
        at: [bar_x, bar_top],
        size: [bar_w, bar_h],
        pixels: [1, steps as u32],
        rgba: Arc::new(bar),
    });
    for k in 0..=4 {
        let f = k as f32 / 4.0;
        let y = bar_top + bar_h * (1.0 - f);
        frame.prims.push(Prim::Line {
            a: [bar_x + bar_w, y],
            b: [bar_x + bar_w + tick, y],
            width: 1.2 * sizes.line,
            color: style::INK,
        });
        let v = if map.range.is_some() {
            value_label(lo + span * f64::from(f))
        } else {
            "undefined".to_owned()
        };
        text(
            &mut frame,
            [bar_x + bar_w + tick + 4.0 * sizes.line, y],
            v,
            Anchor::LeftCenter,
        );
    }
    // Title and conventions.
    let x0 = 12.0 * sizes.line;
    let mut y = 16.0 * sizes.line;
    for line in [
        title.to_owned(),
        "Poles to planes, lower-hemisphere equal-area projection; x = east, y = north, z = up"
            .to_owned(),
        match map.range {
            Some((a, b)) => format!(
                "range {} to {}; blank: undefined (no frictional capacity)",
                value_label(a),
                value_label(b)
            ),
            None => "the measure is undefined for every plane".to_owned(),
        },
        "□ principal axes   ● cut plane   ▲ worst planes".to_owned(),
    ] {
        frame.prims.push(Prim::Text {
            at: [x0, y],
            text: line,
            size: sizes.text,
            color: style::INK,
            anchor: Anchor::LeftCenter,
            halo: false,
        });
        y += sizes.text * 1.45;
    }
    frame
}
