//! The orientation map as a figure: the equal-area disc coloured by the measure, a labelled
//! colour bar, north and east, the principal axes, the current plane and the worst planes.

use crate::picture::scene::style;
use std::sync::Arc;

use nalgebra::Vector3;

use super::chart::{self, viridis};
use super::frame::{Anchor, Frame, Prim, Sizes, marker};
use super::place::{Label, Pinned, draw_notes, place_all};
use crate::mechanics::search::{Cone, Measure, cone_normals};
use crate::mechanics::stereonet::{OrientationMap, project_pole};
use crate::mechanics::{PlaneNormal, SignConvention, StressUnit};
use crate::text::format::{distinct_digits, readable};

/// What is marked on the map besides the colours.
#[derive(Clone, Debug, PartialEq)]
pub struct MapMarks {
    /// Colours span this range instead of the data's (values beyond take the end colours).
    pub colour_range: Option<(f64, f64)>,
    /// Principal directions σ1, σ2, σ3 (in the display convention's order); none for a
    /// history, which has no fixed principal frame.
    pub principal: Option<[Vector3<f64>; 3]>,
    /// The current cut plane.
    pub plane: Option<PlaneNormal>,
    /// The worst planes.
    pub worst: Vec<PlaneNormal>,
    /// A cone of worst planes (two equal principal values): its poles are drawn as a circle.
    pub cone: Option<Cone>,
    /// The measure on the cut plane (`None`: undefined there, or no cut plane).
    pub plane_value: Option<f64>,
    /// The worst value.
    pub worst_value: Option<f64>,
    /// The user's notes pinned to poles.
    pub notes: Vec<Pinned<PlaneNormal>>,
}

/// What the map is coloured by.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum MapQuantity {
    /// A measure of the stress on a plane (the worst-plane measures).
    Plane(Measure),
    /// A fatigue criterion's value ÷ its limit over a load history.
    Utilization {
        /// The criterion's name.
        criterion: &'static str,
    },
    /// Miner's damage per repeat of a load history, as its base-10 logarithm.
    LogDamage,
}

impl From<Measure> for MapQuantity {
    fn from(m: Measure) -> Self {
        Self::Plane(m)
    }
}

impl MapQuantity {
    /// Whether values are stresses (in pascals).
    #[must_use]
    pub fn is_stress(self) -> bool {
        matches!(self, Self::Plane(m) if m.is_stress())
    }

    /// Whether some planes may be blank for want of frictional capacity.
    #[must_use]
    pub fn uses_friction(self) -> bool {
        matches!(self, Self::Plane(m) if m.uses_friction())
    }

    /// What the triangles mark.
    #[must_use]
    pub fn worst_name(self) -> &'static str {
        match self {
            Self::Plane(_) => "worst planes",
            Self::Utilization { .. } | Self::LogDamage => "critical plane",
        }
    }
}

/// What the map shows and in which unit and convention.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct MapMeasure {
    /// The quantity.
    pub measure: MapQuantity,
    /// Unit of stress measures.
    pub unit: StressUnit,
    /// Display convention (normal-max, normal-min).
    pub convention: SignConvention,
}

impl MapMeasure {
    /// The map's title, the same in the window and in `planewise map`.
    #[must_use]
    pub fn title(&self) -> String {
        match self.measure {
            MapQuantity::Plane(measure) if measure.is_stress() => format!(
                "Orientation map: {} ({}, {})",
                measure.key(),
                self.unit.symbol(),
                match measure {
                    Measure::NormalMax | Measure::NormalMin => self.convention.key(),
                    _ => "magnitude",
                }
            ),
            MapQuantity::Plane(measure) => format!(
                "Orientation map: {} (dimensionless; compression-positive effective stress)",
                measure.key()
            ),
            MapQuantity::Utilization { criterion } => format!(
                "Orientation map: {criterion} utilization over the history (value ÷ limit, dimensionless)"
            ),
            MapQuantity::LogDamage => {
                "Orientation map: log₁₀ of the damage per repeat of the history (Miner's sum)"
                    .to_owned()
            }
        }
    }

    /// A value as the colour bar and hover text print it: with the unit for stress measures,
    /// without for ratios.
    #[must_use]
    pub fn value_text(&self, value: f64, digits: usize) -> String {
        if self.measure.is_stress() {
            format!(
                "{} {}",
                readable(self.unit.from_pa(value), digits),
                self.unit.symbol()
            )
        } else {
            readable(value, digits)
        }
    }
}

/// Where the disc sits in a `width` × `height` figure with text of `sizes`: centre and radius
/// in pixels, below the four legend lines and the north label, with room for the colour bar's
/// labels on the right and the south tick and the caution at the foot.
#[must_use]
pub fn disc_geometry(width: f32, height: f32, sizes: Sizes) -> ([f32; 2], f32) {
    let top = 16.0 * sizes.line + 4.0 * 1.45 * sizes.text + 1.6 * sizes.text;
    let bottom = 2.8 * sizes.text;
    let r = (0.5 * (height - top - bottom)).min(0.30 * width).max(8.0);
    ([0.08 * width + r, top + r], r)
}

/// Pixel position of map point (X east, Y north).
#[must_use]
pub fn to_px(centre: [f32; 2], r: f32, xy: [f64; 2]) -> [f32; 2] {
    [centre[0] + xy[0] as f32 * r, centre[1] - xy[1] as f32 * r]
}

/// The figure of `map`, a map of `what`.
#[must_use]
pub fn map_frame(
    map: &OrientationMap,
    marks: &MapMarks,
    what: &MapMeasure,
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
    let (centre, r) = disc_geometry(w, h, sizes);
    let (lo, hi) = marks.colour_range.or(map.range).unwrap_or((0.0, 1.0));
    // A uniform map (every plane alike) has one colour and one label, not an invented range.
    let uniform = hi - lo <= 1e-12 * lo.abs().max(hi.abs());
    let span = if uniform { 1.0 } else { hi - lo };
    // The coloured cells, as one image (transparent outside the disc and where undefined).
    let mut rgba = vec![0u8; map.size * map.size * 4];
    for (i, v) in map.values.iter().enumerate() {
        if let Some(v) = v {
            // A uniform map takes the colour bar's middle, where its one label sits.
            let t = if uniform { 0.5 } else { (v - lo) / span };
            let [cr, cg, cb] = viridis(t);
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
    // The cone of worst planes, as the small circle of its poles (broken where it crosses the
    // rim, since a pole that leaves the lower hemisphere comes back on the opposite side).
    if let Some(cone) = &marks.cone {
        let points: Vec<[f32; 2]> = cone_normals(cone, 240)
            .iter()
            .filter_map(|n| PlaneNormal::from_vector(*n).ok())
            .map(|n| to_px(centre, r, project_pole(&n)))
            .collect();
        let closed = points.iter().chain(points.first());
        for (a, b) in points.iter().zip(closed.skip(1)) {
            if (a[0] - b[0]).hypot(a[1] - b[1]) < 0.5 * r {
                frame.prims.push(Prim::Line {
                    a: *a,
                    b: *b,
                    width: 2.4 * sizes.line,
                    color: style::WORST_PLANE,
                });
            }
        }
    }
    // Mark labels, placed last around everything else.
    let mut labels: Vec<Label> = Vec::new();
    // Marks: principal axes (white diamonds), current plane (disc), worst planes (triangles).
    for (i, d) in marks.principal.iter().flatten().enumerate() {
        if let Ok(n) = PlaneNormal::from_vector(*d) {
            let at = to_px(centre, r, project_pole(&n));
            frame
                .prims
                .push(marker(at, 5.0 * sizes.line, 4, style::HALO));
            labels.push(Label {
                point: at,
                gap: 7.0 * sizes.line,
                text: format!("σ{}", i + 1),
                size: sizes.text,
                color: style::INK,
                prefer: [1.0, -1.0],
            });
        }
    }
    if let Some(n) = marks.plane {
        let at = to_px(centre, r, project_pole(&n));
        frame
            .prims
            .push(marker(at, 6.0 * sizes.line, 12, style::PLANE_NORMAL));
        labels.push(Label {
            point: at,
            gap: 8.0 * sizes.line,
            text: "cut plane".into(),
            size: sizes.text,
            color: style::INK,
            prefer: [1.0, 1.0],
        });
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
        let t = if uniform {
            0.5
        } else {
            1.0 - i as f64 / (steps - 1) as f64
        };
        let [cr, cg, cb] = viridis(t);
        bar[i * 4..i * 4 + 4].copy_from_slice(&[cr, cg, cb, 255]);
    }
    frame.prims.push(Prim::Image {
        at: [bar_x, bar_top],
        size: [bar_w, bar_h],
        pixels: [1, steps as u32],
        rgba: Arc::new(bar),
    });
    // Round ticks in the unit shown (stresses) or as plain numbers (ratios).
    let to_shown = |v: f64| {
        if what.measure.is_stress() {
            what.unit.from_pa(v)
        } else {
            v
        }
    };
    let label_values: Vec<f64> = if uniform {
        vec![lo]
    } else if what.measure.is_stress() {
        chart::stress_ticks(lo, lo + span, 4.0, what.unit)
    } else {
        chart::round_ticks(lo, lo + span, 4.0)
    };
    let shown: Vec<f64> = label_values.iter().map(|&v| to_shown(v)).collect();
    let digits = distinct_digits(&shown, 4);
    for &v in &label_values {
        let f = if uniform {
            0.5
        } else {
            ((v - lo) / span) as f32
        };
        let y = bar_top + bar_h * (1.0 - f);
        frame.prims.push(Prim::Line {
            a: [bar_x + bar_w, y],
            b: [bar_x + bar_w + tick, y],
            width: 1.2 * sizes.line,
            color: style::INK,
        });
        let v = if map.range.is_some() {
            what.value_text(v, digits)
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
    let blank = if what.measure.uses_friction() {
        "; blank: undefined (no frictional capacity)"
    } else {
        ""
    };
    let worst_key = if marks.cone.is_some() {
        format!("▲ {} (line: their cone)", what.measure.worst_name())
    } else {
        format!("▲ {}", what.measure.worst_name())
    };
    let lines = [
        what.title(),
        "Poles to planes, lower-hemisphere equal-area projection; x = east, y = north, z = up"
            .to_owned(),
        match map.range {
            Some((a, _)) if uniform => {
                format!("every plane: {}", what.value_text(a, digits))
            }
            Some((a, b)) => format!(
                "range {} to {}{blank}{}",
                what.value_text(a, digits),
                what.value_text(b, digits),
                marks
                    .colour_range
                    .map_or_else(String::new, |(c, d)| format!(
                        "; colours span {} to {}",
                        what.value_text(c, digits),
                        what.value_text(d, digits)
                    ))
            ),
            None => "the measure is undefined for every plane".to_owned(),
        },
        format!(
            "{}{}{}   {worst_key}{}",
            if marks.principal.is_some() {
                "◇ principal axes   "
            } else {
                ""
            },
            // The static map always names the cut plane (its legend is the same with and
            // without one); a history's map only when it has one.
            if marks.plane.is_some() || marks.principal.is_some() {
                "● cut plane"
            } else {
                ""
            },
            marks.plane.map_or_else(String::new, |_| format!(
                ": {}",
                marks
                    .plane_value
                    .map_or_else(|| "undefined".to_owned(), |v| what.value_text(v, 4))
            )),
            marks
                .worst_value
                .map_or_else(String::new, |v| format!(": {}", what.value_text(v, 4)))
        ),
    ];
    chart::key(
        &mut frame,
        lines.into_iter().map(|l| (l, style::INK)),
        sizes,
    );
    let notes: Vec<Pinned<[f32; 2]>> = marks
        .notes
        .iter()
        .map(|n| n.pinned_at(|p| to_px(centre, r, project_pole(p))))
        .collect();
    draw_notes(&mut frame, &notes, sizes);
    place_all(&mut frame, &labels, sizes.line);
    frame
}
