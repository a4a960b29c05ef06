//! A load history on one plane as a figure: on the left the shear path τ(t) in the plane's own
//! axes with its amplitude circle (radius τa, centre the mean shear), on the right σn(t) and
//! |τ(t)| against time, the governing cycle's span shaded.

use super::chart::{self, stress_ticks};
use super::frame::{Anchor, Frame, Prim, Sizes, marker};
use crate::mechanics::fatigue::Circle;
use crate::mechanics::{SignConvention, StressUnit};
use crate::picture::scene::style;
use crate::text::format::{distinct_digits, readable};

/// What the path figure shows.
#[derive(Clone, Debug, PartialEq)]
pub struct PathFigure {
    /// First key line (which plane, which criterion).
    pub title: String,
    /// Times (or steps).
    pub time: Vec<f64>,
    /// What the time axis is (the history's first column's name).
    pub time_label: String,
    /// Shear vector at each step in the plane's axes (a along strike, b up the dip), Pa.
    pub tau: Vec<[f64; 2]>,
    /// Normal stress at each step, Pa, tension positive.
    pub sigma_n: Vec<f64>,
    /// The amplitude circle.
    pub circle: Circle,
    /// How the circle was had, in a few words.
    pub method: &'static str,
    /// Unit shown.
    pub unit: StressUnit,
    /// Convention of σn shown.
    pub convention: SignConvention,
    /// Steps of the governing cycle (shaded on the time axis), if any.
    pub governing: Option<(usize, usize)>,
}

/// Axis box: left, top, width, height in pixels.
#[derive(Clone, Copy)]
struct Box2 {
    x: f32,
    y: f32,
    w: f32,
    h: f32,
}

fn line(frame: &mut Frame, a: [f32; 2], b: [f32; 2], width: f32, color: style::Rgba) {
    frame.prims.push(Prim::Line { a, b, width, color });
}

fn text(frame: &mut Frame, at: [f32; 2], t: String, size: f32, anchor: Anchor) {
    frame.prims.push(Prim::Text {
        at,
        text: t,
        size,
        color: style::INK,
        anchor,
        halo: true,
    });
}

/// Draws the frame of an axis box with ticks at `xs` and `ys` (positions in pixels with their
/// labels).
fn axes(
    frame: &mut Frame,
    b: Box2,
    xs: &[(f32, String)],
    ys: &[(f32, String)],
    labels: [&str; 2],
    sizes: Sizes,
) {
    let w = 1.2 * sizes.line;
    let grid = style::NEUTRAL.with_alpha(60);
    for (x, label) in xs {
        line(frame, [*x, b.y], [*x, b.y + b.h], 0.8 * sizes.line, grid);
        text(
            frame,
            [*x, b.y + b.h + 0.9 * sizes.text],
            label.clone(),
            sizes.text,
            Anchor::Center,
        );
    }
    for (y, label) in ys {
        line(frame, [b.x, *y], [b.x + b.w, *y], 0.8 * sizes.line, grid);
        text(
            frame,
            [b.x - 0.4 * sizes.text, *y],
            label.clone(),
            sizes.text,
            Anchor::RightCenter,
        );
    }
    for (a, c) in [
        ([b.x, b.y], [b.x + b.w, b.y]),
        ([b.x + b.w, b.y], [b.x + b.w, b.y + b.h]),
        ([b.x + b.w, b.y + b.h], [b.x, b.y + b.h]),
        ([b.x, b.y + b.h], [b.x, b.y]),
    ] {
        line(frame, a, c, w, style::INK);
    }
    text(
        frame,
        [b.x + 0.5 * b.w, b.y + b.h + 2.1 * sizes.text],
        labels[0].to_owned(),
        sizes.text,
        Anchor::Center,
    );
    text(
        frame,
        [b.x, b.y - 0.9 * sizes.text],
        labels[1].to_owned(),
        sizes.text,
        Anchor::LeftCenter,
    );
}

fn tick_labels(ticks: &[f64], unit: Option<StressUnit>) -> Vec<String> {
    let shown: Vec<f64> = ticks
        .iter()
        .map(|v| unit.map_or(*v, |u| u.from_pa(*v)))
        .collect();
    let digits = distinct_digits(&shown, 4);
    shown.iter().map(|v| readable(*v, digits)).collect()
}

/// Draws an axis box of time across (`t0` to `t1`) and stress up (`mid` ± `span`/2, Pa) with
/// about `count` round ticks on each.
#[expect(
    clippy::too_many_arguments,
    reason = "one axis box, its two ranges and its labels"
)]
fn time_stress_axes(
    frame: &mut Frame,
    b: Box2,
    (t0, t1): (f64, f64),
    (mid, span): (f64, f64),
    unit: StressUnit,
    count: f64,
    labels: [&str; 2],
    sizes: Sizes,
) {
    let tx = |t: f64| b.x + ((t - t0) / (t1 - t0)) as f32 * b.w;
    let vy = |v: f64| b.y + (0.5 - (v - mid) / span) as f32 * b.h;
    let tt = chart::round_ticks(t0, t1, count);
    let ts: Vec<(f32, String)> = tt
        .iter()
        .map(|v| tx(*v))
        .zip(tick_labels(&tt, None))
        .collect();
    let vt = stress_ticks(mid - 0.5 * span, mid + 0.5 * span, count, unit);
    let vs: Vec<(f32, String)> = vt
        .iter()
        .map(|v| vy(*v))
        .zip(tick_labels(&vt, Some(unit)))
        .collect();
    axes(frame, b, &ts, &vs, labels, sizes);
}

/// The figure, `width` × `height` pixels.
#[must_use]
pub fn path_frame(fig: &PathFigure, width: u32, height: u32, sizes: Sizes) -> Frame {
    let (w, h) = (width as f32, height as f32);
    let mut frame = Frame {
        width: w,
        height: h,
        background: style::BACKGROUND,
        prims: Vec::new(),
    };
    let u = fig.unit;
    let sym = u.symbol();
    let sign = fig.convention.sign();
    let c = fig.circle;
    let mean = c.centre_resolved();
    let key_lines = [
        (fig.title.clone(), style::INK),
        (
            format!(
                "Left: the shear path τ(t) on the plane (◇ its start) and its {}",
                fig.method
            ),
            style::SHEAR_PART,
        ),
        (
            format!(
                "τa {} {sym} (the circle's radius); ● mean shear ({}, {}) {sym}",
                readable(u.from_pa(c.radius), 4),
                readable(u.from_pa(mean[0]), 4),
                readable(u.from_pa(mean[1]), 4),
            ),
            style::WORST_PLANE,
        ),
    ];
    let top = 16.0 * sizes.line + 4.0 * 1.45 * sizes.text + 1.8 * sizes.text;
    // Room for the tick labels and the axis names, and the caution's strip at the foot.
    let bottom = 3.6 * sizes.text + crate::picture::caution::caution_height(w, h);
    let left_margin = 4.5 * sizes.text;
    let side = (h - top - bottom).min(0.42 * w).max(16.0);
    // Left: the path, equal scales on both axes, the circle and its centre.
    let pb = Box2 {
        x: left_margin,
        y: top,
        w: side,
        h: side,
    };
    let mut lo = [c.centre[0] - c.radius, c.centre[1] - c.radius];
    let mut hi = [c.centre[0] + c.radius, c.centre[1] + c.radius];
    for p in &fig.tau {
        for k in 0..2 {
            lo[k] = lo[k].min(p[k]);
            hi[k] = hi[k].max(p[k]);
        }
    }
    let span = (hi[0] - lo[0]).max(hi[1] - lo[1]).max(1e-30) * 1.15;
    let mid = [0.5 * (lo[0] + hi[0]), 0.5 * (lo[1] + hi[1])];
    let to_px = |p: [f64; 2]| {
        [
            pb.x + ((p[0] - mid[0]) / span + 0.5) as f32 * pb.w,
            pb.y + (0.5 - (p[1] - mid[1]) / span) as f32 * pb.h,
        ]
    };
    let xt = stress_ticks(mid[0] - 0.5 * span, mid[0] + 0.5 * span, 4.0, u);
    let yt = stress_ticks(mid[1] - 0.5 * span, mid[1] + 0.5 * span, 4.0, u);
    let xs: Vec<(f32, String)> = xt
        .iter()
        .map(|v| to_px([*v, mid[1]])[0])
        .zip(tick_labels(&xt, Some(u)))
        .collect();
    let ys: Vec<(f32, String)> = yt
        .iter()
        .map(|v| to_px([mid[0], *v])[1])
        .zip(tick_labels(&yt, Some(u)))
        .collect();
    let xlabel = format!("τ along a (the strike), {sym}");
    let ylabel = format!("τ along b (up the dip), {sym}");
    axes(&mut frame, pb, &xs, &ys, [&xlabel, &ylabel], sizes);
    let ring: Vec<[f32; 2]> = (0..=120)
        .map(|i| {
            let a = std::f64::consts::TAU * f64::from(i) / 120.0;
            to_px([
                c.centre[0] + c.radius * a.cos(),
                c.centre[1] + c.radius * a.sin(),
            ])
        })
        .collect();
    for pair in ring.windows(2) {
        line(
            &mut frame,
            pair[0],
            pair[1],
            1.6 * sizes.line,
            style::WORST_PLANE,
        );
    }
    let pts: Vec<[f32; 2]> = fig.tau.iter().map(|p| to_px(*p)).collect();
    for pair in pts.windows(2) {
        line(
            &mut frame,
            pair[0],
            pair[1],
            2.0 * sizes.line,
            style::SHEAR_PART,
        );
    }
    let centre = to_px(c.centre);
    line(
        &mut frame,
        centre,
        to_px([c.centre[0] + c.radius, c.centre[1]]),
        1.2 * sizes.line,
        style::WORST_PLANE,
    );
    frame
        .prims
        .push(marker(centre, 4.0 * sizes.line, 12, style::WORST_PLANE));
    if let Some(first) = pts.first() {
        frame
            .prims
            .push(marker(*first, 4.0 * sizes.line, 4, style::HALO));
    }
    // Right: σn(t) and |τ(t)| against time.
    let tb = Box2 {
        x: pb.x + pb.w + 5.5 * sizes.text,
        y: top,
        w: (w - (pb.x + pb.w + 5.5 * sizes.text) - 2.0 * sizes.text).max(16.0),
        h: side,
    };
    let t0 = fig.time.first().copied().unwrap_or(0.0);
    let t1 = fig.time.last().copied().unwrap_or(1.0).max(t0 + 1e-30);
    let mag: Vec<f64> = fig.tau.iter().map(|p| p[0].hypot(p[1])).collect();
    let shown_n: Vec<f64> = fig.sigma_n.iter().map(|v| sign * v).collect();
    let vmin = shown_n.iter().chain(&mag).copied().fold(0.0_f64, f64::min);
    let vmax = shown_n.iter().chain(&mag).copied().fold(0.0_f64, f64::max);
    let vspan = (vmax - vmin).max(1e-30) * 1.1;
    let vmid = 0.5 * (vmax + vmin);
    let tx = |t: f64| tb.x + ((t - t0) / (t1 - t0)) as f32 * tb.w;
    let vy = |v: f64| tb.y + (0.5 - (v - vmid) / vspan) as f32 * tb.h;
    if let Some((a, b)) = fig.governing {
        let (a, b) = (a.min(b), a.max(b));
        if let (Some(ta), Some(tb_)) = (fig.time.get(a), fig.time.get(b)) {
            frame.prims.push(Prim::Polygon {
                points: vec![
                    [tx(*ta), tb.y],
                    [tx(*tb_), tb.y],
                    [tx(*tb_), tb.y + tb.h],
                    [tx(*ta), tb.y + tb.h],
                ],
                fill: style::WORST_PLANE.with_alpha(40),
                outline: None,
            });
        }
    }
    let vlabel = format!("σn and |τ|, {sym}");
    time_stress_axes(
        &mut frame,
        tb,
        (t0, t1),
        (vmid, vspan),
        u,
        5.0,
        [&fig.time_label, &vlabel],
        sizes,
    );
    for (values, color) in [(&shown_n, style::NORMAL_PART), (&mag, style::SHEAR_PART)] {
        let pts: Vec<[f32; 2]> = fig
            .time
            .iter()
            .zip(values.iter())
            .map(|(t, v)| [tx(*t), vy(*v)])
            .collect();
        for pair in pts.windows(2) {
            line(&mut frame, pair[0], pair[1], 1.8 * sizes.line, color);
        }
    }
    let mut lines = key_lines.to_vec();
    lines.push((
        format!(
            "Right: σn(t) ({}) teal, |τ(t)| orange{}",
            fig.convention.key(),
            if fig.governing.is_some() {
                "; shaded: governing cycle"
            } else {
                ""
            }
        ),
        style::INK,
    ));
    chart::key(&mut frame, lines, sizes);
    frame
}

/// The six components of a history against time, each curve named at its end (colours alone
/// do not carry it): normal components in the axis colours, shear components darker.
#[must_use]
pub fn components_frame(
    time: &[f64],
    tensors_pa: &[[f64; 6]],
    time_label: &str,
    unit: StressUnit,
    convention: SignConvention,
    [width, height]: [u32; 2],
    sizes: Sizes,
) -> Frame {
    const NAMES: [&str; 6] = ["σxx", "σyy", "σzz", "τxy", "τyz", "τzx"];
    let colors = [
        style::AXES[0],
        style::AXES[1],
        style::AXES[2],
        style::Rgba::rgb(120, 40, 40),
        style::Rgba::rgb(30, 90, 40),
        style::Rgba::rgb(30, 50, 120),
    ];
    let (w, h) = (width as f32, height as f32);
    let mut frame = Frame {
        width: w,
        height: h,
        background: style::BACKGROUND,
        prims: Vec::new(),
    };
    let sign = convention.sign();
    let top = 16.0 * sizes.line + 2.0 * 1.45 * sizes.text + 1.8 * sizes.text;
    let bottom = 3.6 * sizes.text + crate::picture::caution::caution_height(w, h);
    let b = Box2 {
        x: 4.5 * sizes.text,
        y: top,
        w: (w - 4.5 * sizes.text - 4.0 * sizes.text).max(16.0),
        h: (h - top - bottom).max(16.0),
    };
    let t0 = time.first().copied().unwrap_or(0.0);
    let t1 = time.last().copied().unwrap_or(1.0).max(t0 + 1e-30);
    // The display convention flips every component (a shear's sign follows the axes' pairing).
    let shown = |v: f64, _k: usize| sign * v;
    let (mut lo, mut hi) = (0.0_f64, 0.0_f64);
    for t in tensors_pa {
        for (k, v) in t.iter().enumerate() {
            lo = lo.min(shown(*v, k));
            hi = hi.max(shown(*v, k));
        }
    }
    let span = (hi - lo).max(1e-30) * 1.1;
    let mid = 0.5 * (hi + lo);
    let tx = |t: f64| b.x + ((t - t0) / (t1 - t0)) as f32 * b.w;
    let vy = |v: f64| b.y + (0.5 - (v - mid) / span) as f32 * b.h;
    let vlabel = format!("stress, {}", unit.symbol());
    time_stress_axes(
        &mut frame,
        b,
        (t0, t1),
        (mid, span),
        unit,
        6.0,
        [time_label, &vlabel],
        sizes,
    );
    // Components that are zero at every step are named in the key, not drawn.
    let scale = hi.max(-lo);
    let zero: Vec<bool> = (0..6)
        .map(|k| tensors_pa.iter().all(|s| s[k].abs() <= 1e-12 * scale))
        .collect();
    let mut ends: Vec<(f32, usize)> = Vec::new();
    for k in (0..6).filter(|k| !zero[*k]) {
        let pts: Vec<[f32; 2]> = time
            .iter()
            .zip(tensors_pa)
            .map(|(t, s)| [tx(*t), vy(shown(s[k], k))])
            .collect();
        for pair in pts.windows(2) {
            line(&mut frame, pair[0], pair[1], 1.8 * sizes.line, colors[k]);
        }
        if let Some(end) = pts.last() {
            ends.push((end[1], k));
        }
    }
    // The names at the curves' ends, pushed apart where the ends meet.
    ends.sort_by(|a, c| a.0.total_cmp(&c.0));
    let gap = 1.15 * sizes.text;
    for i in 1..ends.len() {
        if ends[i].0 < ends[i - 1].0 + gap {
            ends[i].0 = ends[i - 1].0 + gap;
        }
    }
    for (y, k) in ends {
        frame.prims.push(Prim::Text {
            at: [b.x + b.w + 0.3 * sizes.text, y],
            text: NAMES[k].to_owned(),
            size: sizes.text,
            color: colors[k],
            anchor: Anchor::LeftCenter,
            halo: true,
        });
    }
    let zero_names: Vec<&str> = (0..6).filter(|k| zero[*k]).map(|k| NAMES[k]).collect();
    chart::key(
        &mut frame,
        [
            (
                format!(
                    "The history's six components against {time_label} ({}, {})",
                    unit.symbol(),
                    convention.key()
                ),
                style::INK,
            ),
            (
                if zero_names.is_empty() {
                    "Each curve is named at its end".to_owned()
                } else {
                    format!(
                        "Each curve is named at its end; zero at every step: {}",
                        zero_names.join(", ")
                    )
                },
                style::INK,
            ),
        ],
        sizes,
    );
    frame
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_figure_draws_the_path_the_circle_and_both_curves() {
        let n = 40;
        let time: Vec<f64> = (0..n).map(f64::from).collect();
        let tau: Vec<[f64; 2]> = time
            .iter()
            .map(|t| [50e6 * (0.3 * t).sin(), 20e6 * (0.3 * t).cos()])
            .collect();
        let fig = PathFigure {
            title: "test".into(),
            sigma_n: time.iter().map(|t| 10e6 * (0.3 * t).sin()).collect(),
            time,
            time_label: "time, s".into(),
            tau,
            circle: Circle {
                centre: [0.0, 0.0],
                radius: 50e6,
            },
            method: "circle",
            unit: StressUnit::MPa,
            convention: SignConvention::TensionPositive,
            governing: Some((3, 12)),
        };
        let f = path_frame(&fig, 1200, 700, Sizes::for_export(1200.0, 700.0));
        let lines = f
            .prims
            .iter()
            .filter(|p| matches!(p, Prim::Line { .. }))
            .count();
        // 120 circle segments + 39 path segments + 2 × 39 curve segments at least.
        assert!(lines > 120 + 39 + 78, "{lines}");
        assert!(f.prims.iter().all(|p| match p {
            Prim::Line { a, b, .. } => a.iter().chain(b).all(|v| v.is_finite()),
            _ => true,
        }));
    }
}
