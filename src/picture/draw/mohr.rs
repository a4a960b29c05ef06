//! The Mohr diagram as a figure: the three circles with the admissible region shaded, the cut
//! plane's and the worst planes' points, the Mohr–Coulomb envelope when a material is set, and
//! axes with units and the sign convention. The same frame goes to the screen, SVG and PNG.

use super::chart;
use super::frame::{Anchor, Frame, Prim, Sizes, marker};
use super::place::{Label, Pinned, draw_notes, place_all};
use crate::mechanics::criteria::MohrCoulomb;
use crate::mechanics::mohr::{Circle, MohrCircles};
use crate::mechanics::search::{SearchResult, WorstCondition, WorstPlane};
use crate::mechanics::{PlaneNormal, SignConvention, StressTensor, StressUnit};
use crate::picture::scene::style::{self, Rgba};
use crate::text::format::{dip_text, readable};

/// A Mohr–Coulomb envelope with its pore pressure (compression-positive effective stress, as
/// in the worst-plane measure).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Envelope {
    /// Cohesion and friction angle.
    pub material: MohrCoulomb,
    /// Pore pressure p, Pa, compression positive.
    pub pore_pressure_pa: f64,
}

impl Envelope {
    /// The envelope's shear strength τ = c + (σn,c − p) tan φ at a normal stress given in
    /// `convention` (σn,c is the compression-positive normal stress), Pa; negative beyond the
    /// envelope's apex.
    #[must_use]
    pub fn shear_strength_pa(&self, normal_stress_pa: f64, convention: SignConvention) -> f64 {
        // Back to tension positive, then negated: compression positive.
        let compressive = -convention.sign() * normal_stress_pa;
        self.material
            .shear_strength_pa(compressive - self.pore_pressure_pa)
    }
}

/// A marked point of the diagram.
#[derive(Clone, Debug, PartialEq)]
pub struct MohrPoint {
    /// Normal stress, Pa, in the diagram's convention.
    pub normal_stress_pa: f64,
    /// Shear stress, Pa (≥ 0).
    pub shear_stress_pa: f64,
    /// What the point is (for hover text and labels).
    pub name: String,
}

impl MohrPoint {
    /// The point of the plane with normal `normal`, named `what` plus its dip and dip direction.
    #[must_use]
    pub fn of_plane(
        circles: &MohrCircles,
        tensor: &StressTensor,
        normal: PlaneNormal,
        what: &str,
    ) -> Self {
        let (normal_stress_pa, shear_stress_pa) = circles.point(tensor, normal);
        let (dip, dip_direction) = normal.dip_deg();
        Self {
            normal_stress_pa,
            shear_stress_pa,
            name: format!("{what}: {}", dip_text(dip, dip_direction)),
        }
    }
}

/// The legend text for the worst planes of `result`: the measure's key, and a warning when the
/// worst planes are those without frictional capacity.
#[must_use]
pub fn worst_label(result: &SearchResult) -> String {
    let key = result.measure.key();
    match (result.condition, result.cone) {
        (WorstCondition::EffectiveTension, _) => {
            format!("{key}: effective tension, no frictional capacity")
        }
        (WorstCondition::EveryPlane, _) => format!("{key}: every plane alike"),
        (WorstCondition::Cone, Some(cone)) => format!(
            "{key}: a cone of planes at {}° to its axis",
            readable(cone.half_angle_deg, 4)
        ),
        _ => key.to_owned(),
    }
}

/// The points of worst planes (their stresses are already in the display convention).
#[must_use]
pub fn worst_points(planes: &[WorstPlane]) -> Vec<MohrPoint> {
    planes
        .iter()
        .enumerate()
        .map(|(i, p)| MohrPoint {
            normal_stress_pa: p.normal_stress_pa,
            shear_stress_pa: p.shear_stress_pa,
            name: format!(
                "worst plane {}: {}",
                i + 1,
                dip_text(p.dip_deg, p.dip_direction_deg)
            ),
        })
        .collect()
}

/// Everything the Mohr figure shows.
#[derive(Clone, Debug, PartialEq)]
pub struct MohrFigure {
    /// The circles (their convention is the diagram's).
    pub circles: MohrCircles,
    /// Unit of the axes.
    pub unit: StressUnit,
    /// The cut plane's point.
    pub plane: Option<MohrPoint>,
    /// The worst planes' points (duplicates are drawn once).
    pub worst: Vec<MohrPoint>,
    /// What the worst planes are worst for (legend).
    pub worst_label: String,
    /// The Mohr–Coulomb envelope, when cohesion and friction angle are set.
    pub envelope: Option<Envelope>,
    /// The user's notes pinned to (σn, τ) points, Pa, σn in the diagram's convention.
    pub notes: Vec<Pinned<(f64, f64)>>,
}

/// Where the data sit in the picture: a linear map with the same scale on both axes, so that
/// circles stay round.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct MohrLayout {
    /// Plot area, pixels: left, top, right, bottom.
    pub plot: [f32; 4],
    /// σn at the plot's left edge, Pa.
    pub normal_min_pa: f64,
    /// σn at the plot's right edge, Pa.
    pub normal_max_pa: f64,
    /// τ at the plot's top edge, Pa (τ = 0 at the bottom edge).
    pub shear_max_pa: f64,
    /// Pixels per pascal, both axes.
    pub px_per_pa: f64,
}

impl MohrLayout {
    /// The layout for `figure` in a `width` × `height` picture with text and lines of `sizes`.
    #[must_use]
    pub fn new(figure: &MohrFigure, width: f32, height: f32, sizes: Sizes) -> Self {
        let k = sizes.line;
        let plot = [
            78.0 * k,
            (legend(figure, width, sizes).len() as f32 + 1.6) * 1.45 * sizes.text + 20.0 * k,
            width - 28.0 * k,
            height - 52.0 * k,
        ];
        let [s1, _, s3] = figure.circles.principal_pa;
        let scale = s1.abs().max(s3.abs());
        let mut span = (s1 - s3).max(1e-3 * scale).max(1.0);
        let (mut lo, mut hi) = (s3 - 0.1 * span, s1 + 0.1 * span);
        // Show σn = 0 when it is near: the reader then sees what is tension and compression.
        if lo > 0.0 && lo < 0.8 * span {
            lo = -0.04 * span;
        }
        if hi < 0.0 && -hi < 0.8 * span {
            hi = 0.04 * span;
        }
        span = hi - lo;
        let mut top = 0.5 * (s1 - s3) * 1.3;
        if top <= 0.0 {
            top = 0.3 * span;
        }
        let (pw, ph) = (
            f64::from((plot[2] - plot[0]).max(10.0)),
            f64::from((plot[3] - plot[1]).max(10.0)),
        );
        let px_per_pa = (pw / span).min(ph / top);
        // Fill the plot: widen σn about its centre and raise τ's top.
        let mid = 0.5 * (lo + hi);
        let half = 0.5 * pw / px_per_pa;
        Self {
            plot,
            normal_min_pa: mid - half,
            normal_max_pa: mid + half,
            shear_max_pa: ph / px_per_pa,
            px_per_pa,
        }
    }

    /// Pixel position of (σn, τ).
    #[must_use]
    pub fn to_px(&self, normal_stress_pa: f64, shear_stress_pa: f64) -> [f32; 2] {
        [
            self.plot[0] + ((normal_stress_pa - self.normal_min_pa) * self.px_per_pa) as f32,
            self.plot[3] - (shear_stress_pa * self.px_per_pa) as f32,
        ]
    }

    /// (σn, τ) at a pixel position.
    #[must_use]
    pub fn from_px(&self, at: [f32; 2]) -> (f64, f64) {
        (
            self.normal_min_pa + f64::from(at[0] - self.plot[0]) / self.px_per_pa,
            f64::from(self.plot[3] - at[1]) / self.px_per_pa,
        )
    }

    /// Whether a pixel position is inside the plot area.
    #[must_use]
    pub fn contains(&self, at: [f32; 2]) -> bool {
        (self.plot[0]..=self.plot[2]).contains(&at[0])
            && (self.plot[1]..=self.plot[3]).contains(&at[1])
    }
}

/// The Mohr–Coulomb envelope's colour.
pub const ENVELOPE: Rgba = Rgba::rgb(110, 60, 20);
/// The admissible region's shade.
const REGION: Rgba = Rgba::rgb(176, 196, 222);
/// Light grid lines.
const GRID: Rgba = Rgba::rgb(120, 128, 140).with_alpha(60);

/// The upper half (τ ≥ 0) of `circle` as `steps` + 1 pixel positions from σn = centre + r
/// round to centre − r.
fn upper_half(layout: &MohrLayout, circle: &Circle, steps: u32) -> Vec<[f32; 2]> {
    (0..=steps)
        .map(|i| {
            let a = std::f64::consts::PI * f64::from(i) / f64::from(steps);
            layout.to_px(
                circle.centre_pa + circle.radius_pa * a.cos(),
                circle.radius_pa * a.sin(),
            )
        })
        .collect()
}

fn half_disc(layout: &MohrLayout, circle: &Circle, fill: Rgba) -> Option<Prim> {
    (circle.radius_pa * layout.px_per_pa >= 0.5).then(|| Prim::Polygon {
        points: upper_half(layout, circle, 72),
        fill,
        outline: None,
    })
}

fn arc(frame: &mut Frame, layout: &MohrLayout, circle: &Circle, width: f32, color: Rgba) {
    for pair in upper_half(layout, circle, 96).windows(2) {
        frame.prims.push(Prim::Line {
            a: pair[0],
            b: pair[1],
            width,
            color,
        });
    }
}

/// Tick labels in `unit` with enough digits to tell neighbours apart.
fn tick_labels(ticks_pa: &[f64], unit: StressUnit) -> Vec<String> {
    let shown: Vec<f64> = ticks_pa.iter().map(|&v| unit.from_pa(v)).collect();
    let digits = crate::text::format::distinct_digits(&shown, 4);
    shown.iter().map(|&v| readable(v, digits)).collect()
}

/// The σn ticks and their labels: about seven, fewer when a narrow picture would set the
/// labels (of `size` pixels) closer than one text height apart.
fn fitting_ticks(layout: &MohrLayout, size: f32, unit: StressUnit) -> (Vec<f64>, Vec<String>) {
    let mut target = 7.0;
    loop {
        let ticks = chart::stress_ticks(layout.normal_min_pa, layout.normal_max_pa, target, unit);
        let labels = tick_labels(&ticks, unit);
        let spacing = match ticks.as_slice() {
            [a, b, ..] => layout.to_px(*b, 0.0)[0] - layout.to_px(*a, 0.0)[0],
            _ => f32::INFINITY,
        };
        let widest = labels
            .iter()
            .map(|l| super::place::text_width(l, size))
            .fold(0.0, f32::max);
        if widest + size <= spacing || target <= 2.0 {
            return (ticks, labels);
        }
        target -= 1.0;
    }
}

/// The figure at `width` × `height` pixels, with text and lines of `sizes` (on screen the
/// default sizes; in exports [`Sizes::for_export`]).
#[must_use]
pub fn mohr_frame(figure: &MohrFigure, width: u32, height: u32, sizes: Sizes) -> Frame {
    let (w, h) = (width as f32, height as f32);
    let layout = MohrLayout::new(figure, w, h, sizes);
    let unit = figure.unit;
    let convention = figure.circles.convention;
    let mut frame = Frame {
        width: w,
        height: h,
        background: style::BACKGROUND,
        prims: Vec::new(),
    };
    let [left, top, right, bottom] = layout.plot;
    let text = |frame: &mut Frame, at: [f32; 2], t: String, anchor: Anchor, color: Rgba| {
        frame.prims.push(Prim::Text {
            at,
            text: t,
            size: sizes.text,
            color,
            anchor,
            halo: true,
        });
    };

    // The admissible region: the outer half-disc less the two inner ones.
    let outer = figure.circles.outer();
    let inner = figure.circles.inner();
    frame
        .prims
        .extend(half_disc(&layout, &outer, REGION.with_alpha(150)));
    for c in &inner {
        frame.prims.extend(half_disc(&layout, c, style::BACKGROUND));
    }

    // Grid and tick labels.
    let (x_ticks, x_labels) = fitting_ticks(&layout, 0.9 * sizes.text, unit);
    for (&x, label) in x_ticks.iter().zip(x_labels) {
        let [px, _] = layout.to_px(x, 0.0);
        frame.prims.push(Prim::Line {
            a: [px, top],
            b: [px, bottom],
            width: sizes.line,
            color: GRID,
        });
        frame.prims.push(Prim::Text {
            at: [px, bottom + 12.0 * sizes.line],
            text: label,
            size: 0.9 * sizes.text,
            color: style::INK,
            anchor: Anchor::Center,
            halo: false,
        });
    }
    // τ ticks: the same step as σn (one scale on both axes), from 0 up.
    let step = x_ticks.windows(2).next().map_or(0.0, |p| p[1] - p[0]);
    if step > 0.0 {
        let count = (layout.shear_max_pa / step).floor() as usize;
        let y_ticks: Vec<f64> = (1..=count).map(|k| k as f64 * step).collect();
        for (&y, label) in y_ticks.iter().zip(tick_labels(&y_ticks, unit)) {
            let [_, py] = layout.to_px(0.0, y);
            frame.prims.push(Prim::Line {
                a: [left, py],
                b: [right, py],
                width: sizes.line,
                color: GRID,
            });
            frame.prims.push(Prim::Text {
                at: [left - 6.0 * sizes.line, py],
                text: label,
                size: 0.9 * sizes.text,
                color: style::INK,
                anchor: Anchor::RightCenter,
                halo: false,
            });
        }
    }
    // Axes: σn along τ = 0; the τ axis at σn = 0 when it is in view, else the left edge.
    frame.prims.push(Prim::Line {
        a: [left, bottom],
        b: [right, bottom],
        width: 1.4 * sizes.line,
        color: style::INK,
    });
    let zero_x = if (layout.normal_min_pa..=layout.normal_max_pa).contains(&0.0) {
        layout.to_px(0.0, 0.0)[0]
    } else {
        left
    };
    frame.prims.push(Prim::Line {
        a: [zero_x, top],
        b: [zero_x, bottom],
        width: 1.4 * sizes.line,
        color: style::INK,
    });
    let sym = unit.symbol();
    text(
        &mut frame,
        [right, bottom + 30.0 * sizes.line],
        format!("σn ({sym}), {} →", convention.key()),
        Anchor::RightCenter,
        style::INK,
    );
    text(
        &mut frame,
        [zero_x + 6.0 * sizes.line, top + 8.0 * sizes.line],
        format!("↑ τ ({sym})"),
        Anchor::LeftCenter,
        style::INK,
    );

    // Point labels, placed last around everything else.
    let mut labels: Vec<Label> = Vec::new();

    // Circles.
    arc(&mut frame, &layout, &outer, 2.2 * sizes.line, style::INK);
    for c in &inner {
        arc(&mut frame, &layout, c, 1.6 * sizes.line, style::INK);
    }
    for (i, s) in figure.circles.principal_pa.iter().enumerate() {
        let at = layout.to_px(*s, 0.0);
        frame.prims.push(Prim::Line {
            a: [at[0], at[1] - 5.0 * sizes.line],
            b: [at[0], at[1] + 5.0 * sizes.line],
            width: 2.0 * sizes.line,
            color: style::INK,
        });
        labels.push(Label {
            point: [at[0], at[1] - 5.0 * sizes.line],
            gap: 4.0 * sizes.line,
            text: format!("σ{}", i + 1),
            size: sizes.text,
            color: style::INK,
            prefer: [0.0, -1.0],
        });
    }

    // The envelope, clipped to the plot.
    if let Some(env) = figure.envelope {
        let xs = [layout.normal_min_pa, layout.normal_max_pa];
        let ys = xs.map(|x| env.shear_strength_pa(x, convention));
        // τ(σn) is linear: clip the segment to 0 ≤ τ ≤ top.
        let mut ends = Vec::new();
        for (x, y) in xs.iter().zip(ys) {
            if (0.0..=layout.shear_max_pa).contains(&y) {
                ends.push((*x, y));
            }
        }
        for limit in [0.0, layout.shear_max_pa] {
            if (ys[0] - limit) * (ys[1] - limit) < 0.0 {
                let t = (limit - ys[0]) / (ys[1] - ys[0]);
                ends.push((xs[0] + t * (xs[1] - xs[0]), limit));
            }
        }
        if let [a, b, ..] = ends[..] {
            frame.prims.push(Prim::Line {
                a: layout.to_px(a.0, a.1),
                b: layout.to_px(b.0, b.1),
                width: 2.4 * sizes.line,
                color: ENVELOPE,
            });
        }
    }

    // Points: worst planes (triangles), then the cut plane (disc) on top.
    let mut drawn: Vec<[f32; 2]> = Vec::new();
    for p in &figure.worst {
        let at = layout.to_px(p.normal_stress_pa, p.shear_stress_pa);
        if drawn
            .iter()
            .any(|q| (q[0] - at[0]).hypot(q[1] - at[1]) < 1.0)
        {
            continue;
        }
        drawn.push(at);
        frame
            .prims
            .push(marker(at, 8.0 * sizes.line, 3, style::WORST_PLANE));
    }
    if let Some(p) = &figure.plane {
        let at = layout.to_px(p.normal_stress_pa, p.shear_stress_pa);
        frame
            .prims
            .push(marker(at, 6.5 * sizes.line, 16, style::PLANE_NORMAL));
        labels.push(Label {
            point: at,
            gap: 8.0 * sizes.line,
            text: "cut plane".to_owned(),
            size: sizes.text,
            color: style::PLANE_NORMAL,
            prefer: [1.0, -1.0],
        });
    }

    // Title, conventions and key.
    chart::key(&mut frame, legend(figure, w, sizes), sizes);
    let notes: Vec<Pinned<[f32; 2]>> = figure
        .notes
        .iter()
        .map(|n| n.pinned_at(|&(sn, tau)| layout.to_px(sn, tau)))
        .collect();
    draw_notes(&mut frame, &notes, sizes);
    place_all(&mut frame, &labels, sizes.line);
    frame
}

/// The key above the diagram, each line in its colour, broken to fit `width` pixels.
fn legend(figure: &MohrFigure, width: f32, sizes: Sizes) -> Vec<(String, Rgba)> {
    let unit = figure.unit;
    let sym = unit.symbol();
    let convention = figure.circles.convention;
    let value = |pa: f64| readable(unit.from_pa(pa), 4);
    let [s1, s2, s3] = figure.circles.principal_pa;
    let mut lines = vec![
        format!(
            "Mohr circles: σ1 = {} {sym}, σ2 = {} {sym}, σ3 = {} {sym}",
            value(s1),
            value(s2),
            value(s3)
        ),
        format!(
            "σn {}, τ ≥ 0; shaded: the (σn, τ) of every plane through the point",
            convention.key()
        ),
    ];
    let cut = figure.plane.as_ref().map_or_else(String::new, |p| {
        format!(
            ": σn = {} {sym}, τ = {} {sym}",
            value(p.normal_stress_pa),
            value(p.shear_stress_pa)
        )
    });
    lines.push(if figure.worst.is_empty() {
        format!("● cut plane{cut}")
    } else {
        format!("● cut plane{cut}   ▲ worst planes ({})", figure.worst_label)
    });
    if let Some(env) = figure.envelope {
        lines.push(format!(
            "— Mohr–Coulomb envelope τ = c + (σn − p) tan φ, compression positive: c = {} {sym}, φ = {}°, p = {} {sym}; {}",
            value(env.material.cohesion_pa),
            readable(env.material.friction_angle_deg, 4),
            value(env.pore_pressure_pa),
            if crosses(figure, &env) {
                "the largest circle crosses it: some planes exceed it"
            } else {
                "no circle reaches it"
            }
        ));
    }
    let room = width - 24.0 * sizes.line;
    lines
        .iter()
        .enumerate()
        .flat_map(|(i, line)| {
            let color = if i == 3 { ENVELOPE } else { style::INK };
            super::place::wrap(line, room, sizes.text)
                .into_iter()
                .map(move |l| (l, color))
        })
        .collect()
}

/// Whether the largest Mohr circle reaches above the Mohr–Coulomb line, i.e. some plane's
/// (σn, τ) lies beyond the envelope (compression-positive effective stress inside).
fn crosses(figure: &MohrFigure, env: &Envelope) -> bool {
    let [a, _, c] = figure.circles.principal_pa;
    // In compression-positive effective stress the circle spans σ′ between the extremes.
    let sign = figure.circles.convention.sign();
    let (p, q) = (
        -sign * a - env.pore_pressure_pa,
        -sign * c - env.pore_pressure_pa,
    );
    let centre = 0.5 * (p + q);
    let radius = 0.5 * (p - q).abs();
    let (sin_phi, cos_phi) = env.material.friction_angle_deg.to_radians().sin_cos();
    // Distance from the centre to the line τ = c + σ′ tan φ, compared with the radius.
    let distance = env.material.cohesion_pa * cos_phi + centre * sin_phi;
    radius >= distance
}
