//! Turns a [`Scene`] into a [`Frame`]: projected, lit and depth-ordered 2D primitives in pixel
//! coordinates, which the back ends (egui painter, SVG, PNG) draw in order without further
//! thought.
//!
//! Depth order is a painter's algorithm organised around the planes in the picture: the cube's
//! faces that face away from the eye are drawn first (front faces are left open so nothing is
//! tinted wrongly), then everything on the far side of the cut plane from the eye, back to
//! front, then the cut plane, then everything on the near side, back to front, then labels,
//! the normal's handle, legend and triad on top. Lines and arrow shafts are cut into short
//! pieces so that each piece sorts on its own depth.

pub mod camera;
pub mod chart;
pub mod egui_backend;
pub mod frame;
pub mod history;
pub mod map;
pub mod mohr;
pub mod pixels;
pub mod place;
pub mod png;
pub mod svg;

use nalgebra::{Point3, Vector3};

use crate::picture::scene::style::{self, Rgba};
use crate::picture::scene::{Scene, Segment};
use camera::{Camera, ScreenFromWorld};
pub use frame::{
    Anchor, Frame, PRINT_FONT_PT, PRINT_WIDTH_MM, Pos, Prim, Sizes, marker, regular_polygon,
};

/// Longest world length of one sorted piece of a line or shaft.
const PIECE: f64 = 0.06;

#[derive(Clone, Copy, PartialEq, Eq)]
enum Side {
    Far,
    Near,
}

struct Item {
    depth: f64,
    side: Side,
    prim: Prim,
}

fn pos(p: &camera::Projected) -> Pos {
    [p.x as f32, p.y as f32]
}

/// Projects, lights and orders `scene` for a `width` × `height` pixel view seen by `camera`.
#[must_use]
pub fn render(scene: &Scene, camera: &Camera, width: f32, height: f32, sizes: Sizes) -> Frame {
    let view = view_for(scene, camera, width, height, sizes);
    let eye = view.towards_eye();
    let mut frame = Frame {
        width,
        height,
        background: style::BACKGROUND,
        prims: Vec::new(),
    };

    // The cut plane is the last polygon with an outline (see Scene::build); cube faces have none.
    let cut = scene.polygons.iter().find(|p| p.outline.is_some());
    let cut_normal = cut.and_then(|p| plane_normal(&p.points));
    let side_of = |p: &Point3<f64>| -> Side {
        match cut_normal {
            Some(n) if n.dot(&p.coords) * n.dot(&eye) < 0.0 => Side::Far,
            _ => Side::Near,
        }
    };

    // Back cube faces first.
    let mut back: Vec<Item> = Vec::new();
    for poly in scene.polygons.iter().filter(|p| p.outline.is_none()) {
        let Some(n) = plane_normal(&poly.points) else {
            continue;
        };
        let centroid = centroid(&poly.points);
        let outward = if n.dot(&centroid.coords) >= 0.0 {
            n
        } else {
            -n
        };
        if outward.dot(&eye) < 0.0 {
            back.push(Item {
                depth: view.project(&centroid).depth,
                side: Side::Far,
                prim: Prim::Polygon {
                    points: poly.points.iter().map(|p| pos(&view.project(p))).collect(),
                    fill: poly.fill.shaded(0.9 + 0.1 * outward.dot(&eye).abs()),
                    outline: None,
                },
            });
        }
    }

    let mut items: Vec<Item> = Vec::new();
    for seg in &scene.segments {
        push_line(&mut items, &view, seg, sizes, &side_of);
    }
    for mesh in &scene.meshes {
        for tri in &mesh.triangles {
            let [a, b, c] = tri.map(|i| mesh.vertices[i as usize]);
            let n = (b - a).cross(&(c - a));
            let area = n.norm();
            if area < 1e-12 {
                continue;
            }
            let centroid = Point3::from((a.coords + b.coords + c.coords) / 3.0);
            let fill = lit(mesh.color, n / area, &centroid, &eye);
            items.push(Item {
                depth: view.project(&centroid).depth,
                side: side_of(&centroid),
                prim: Prim::Polygon {
                    points: vec![
                        pos(&view.project(&a)),
                        pos(&view.project(&b)),
                        pos(&view.project(&c)),
                    ],
                    fill,
                    outline: None,
                },
            });
        }
    }
    for arrow in &scene.arrows {
        push_arrow(&mut items, &view, arrow, sizes, &side_of);
    }

    back.sort_by(|a, b| b.depth.total_cmp(&a.depth));
    items.sort_by(|a, b| b.depth.total_cmp(&a.depth));
    frame.prims.extend(back.into_iter().map(|i| i.prim));
    let (far, near): (Vec<Item>, Vec<Item>) = items.into_iter().partition(|i| i.side == Side::Far);
    frame.prims.extend(far.into_iter().map(|i| i.prim));
    if let Some(cut) = cut {
        frame.prims.push(Prim::Polygon {
            points: cut.points.iter().map(|p| pos(&view.project(p))).collect(),
            fill: cut.fill,
            outline: cut.outline.map(|c| (c, 1.2 * sizes.line)),
        });
    }
    frame.prims.extend(near.into_iter().map(|i| i.prim));

    // Handles, triad and legend go on top; labels are placed around them and the geometry.
    let mut top = Frame {
        prims: Vec::new(),
        ..frame.clone()
    };
    // Handles are grips for the pointer: always on top, labels included, so they can be seen
    // and grabbed from every view.
    for handle in &scene.handles {
        let p = view.project(&handle.at);
        top.prims.push(Prim::Polygon {
            points: regular_polygon(pos(&p), handle.radius_px * sizes.line, 20),
            fill: handle.fill,
            outline: Some((handle.outline, 1.8 * sizes.line)),
        });
    }
    if scene.triad {
        push_triad(&mut top, &view, sizes);
    }
    if let Some(legend) = &scene.legend {
        push_legend(&mut top, legend, &view, sizes);
    }
    let notes: Vec<place::Pinned<Pos>> = scene
        .notes
        .iter()
        .map(|n| place::Pinned {
            pin: pos(&view.project(&n.pin)),
            text: n.text.clone(),
            offset: n.offset,
        })
        .collect();
    place::draw_notes(&mut frame, &notes, sizes);
    let mut placer = place::Placer::new(&frame, sizes.line);
    placer.avoid(&top.prims);
    push_labels(&mut frame, &mut placer, scene, &view, sizes);
    frame.prims.append(&mut top.prims);
    frame
}

/// A surface triangle's fill: Lambert shading from [`light_direction`] on the outward side
/// (meshes are closed surfaces about the origin) over some ambient light, and a rim — more
/// opaque and a little lighter where the surface turns away from the eye — so a semi-transparent
/// ellipsoid reads as a solid.
fn lit(color: Rgba, unit_normal: Vector3<f64>, centroid: &Point3<f64>, eye: &Vector3<f64>) -> Rgba {
    let outward = if unit_normal.dot(&centroid.coords) >= 0.0 {
        unit_normal
    } else {
        -unit_normal
    };
    let lambert = outward.dot(&light_direction(eye)).max(0.0);
    let rim = (1.0 - outward.dot(eye).abs()).powi(3);
    let shade = 0.5 + 0.5 * lambert + 0.2 * rim;
    let alpha = (f64::from(color.a) + 150.0 * rim).min(235.0);
    color.shaded(shade).with_alpha(alpha as u8)
}

/// The projection `render` uses for `scene` in a `width` × `height` view: the scene's sphere
/// fitted into the part of the view the legend leaves free — beside it when the view is wide
/// enough, below it when it is tall enough, else the whole view (the legend then covers a
/// corner). The window uses the same projection to hit-test what it draws.
#[must_use]
pub fn view_for(
    scene: &Scene,
    camera: &Camera,
    width: f32,
    height: f32,
    sizes: Sizes,
) -> ScreenFromWorld {
    let (w, h) = (f64::from(width), f64::from(height));
    let r = scene.radius();
    let area = picture_area(scene, w, h, sizes);
    let view = camera.screen_from_world(area[2], area[3], r);
    // The focus at the area's centre (panning keeps working from there).
    let f = view.project(&scene.focus);
    let o = view.project(&Point3::origin());
    view.shifted(area[0] + o.x - f.x, area[1] + o.y - f.y)
}

/// The part of a `w` × `h` view the picture gets — left, top, width, height: beside the
/// legend when the view is wide enough, below it when it is tall enough, else the whole view.
fn picture_area(scene: &Scene, w: f64, h: f64, sizes: Sizes) -> [f64; 4] {
    let Some(legend) = &scene.legend else {
        return [0.0, 0.0, w, h];
    };
    let [lw, lh] = legend_size(legend, sizes).map(f64::from);
    // The picture wants a roughly square area; take the side that leaves it the most room.
    let beside = (w - lw).min(h);
    let below = w.min(h - lh);
    let whole = 0.7 * w.min(h);
    if beside >= below && beside >= whole {
        [lw, 0.0, w - lw, h]
    } else if below >= whole {
        [0.0, lh, w, h - lh]
    } else {
        [0.0, 0.0, w, h]
    }
}

/// Whether the legend fits beside or below the picture in a `width` × `height` view (when it
/// does not, the window folds it into a button instead of covering the drawing).
#[must_use]
pub fn legend_fits(scene: &Scene, width: f32, height: f32, sizes: Sizes) -> bool {
    let (w, h) = (f64::from(width), f64::from(height));
    scene.legend.is_none() || picture_area(scene, w, h, sizes) != [0.0, 0.0, w, h]
}

/// Width and height in pixels the legend takes in the top-left corner, margins included.
fn legend_size(legend: &crate::picture::scene::Legend, sizes: Sizes) -> [f32; 2] {
    let step = sizes.text * 1.45;
    let widest_line = legend
        .lines
        .iter()
        .map(|l| place::text_width(l, sizes.text))
        .chain(
            legend
                .entries
                .iter()
                .map(|e| 26.0 * sizes.line + place::text_width(&e.text, sizes.text)),
        )
        .chain(std::iter::once(
            place::text_width(
                &format!("= {} (arrow scale)", legend.scale_bar_text),
                sizes.text,
            ) + 70.0 * sizes.line,
        ))
        .fold(0.0_f32, f32::max);
    let rows = legend.lines.len() + legend.entries.len() + 1;
    [
        widest_line + 24.0 * sizes.line,
        16.0 * sizes.line + rows as f32 * step,
    ]
}

/// A fixed light a little above and to the left of the eye.
fn light_direction(eye: &Vector3<f64>) -> Vector3<f64> {
    let l = eye + Vector3::new(0.0, 0.0, 0.5);
    l.try_normalize(1e-12).unwrap_or(*eye)
}

fn centroid(points: &[Point3<f64>]) -> Point3<f64> {
    let sum = points.iter().fold(Vector3::zeros(), |s, p| s + p.coords);
    Point3::from(sum / points.len().max(1) as f64)
}

/// Unit normal of a planar polygon (Newell's method), if it has area.
fn plane_normal(points: &[Point3<f64>]) -> Option<Vector3<f64>> {
    let mut n = Vector3::zeros();
    for (i, p) in points.iter().enumerate() {
        let q = points[(i + 1) % points.len()];
        n += p.coords.cross(&q.coords);
    }
    n.try_normalize(1e-12)
}

fn push_line(
    items: &mut Vec<Item>,
    view: &ScreenFromWorld,
    seg: &Segment,
    sizes: Sizes,
    side_of: &dyn Fn(&Point3<f64>) -> Side,
) {
    let pieces = ((seg.b - seg.a).norm() / PIECE).ceil().max(1.0) as usize;
    for k in 0..pieces {
        let t0 = k as f64 / pieces as f64;
        let t1 = (k + 1) as f64 / pieces as f64;
        let a = seg.a + (seg.b - seg.a) * t0;
        let b = seg.a + (seg.b - seg.a) * t1;
        let mid = Point3::from((a.coords + b.coords) / 2.0);
        items.push(Item {
            depth: view.project(&mid).depth,
            side: side_of(&mid),
            prim: Prim::Line {
                a: pos(&view.project(&a)),
                b: pos(&view.project(&b)),
                width: seg.width_px * sizes.line,
                color: seg.color,
            },
        });
    }
}

fn push_arrow(
    items: &mut Vec<Item>,
    view: &ScreenFromWorld,
    arrow: &crate::picture::scene::Arrow,
    sizes: Sizes,
    side_of: &dyn Fn(&Point3<f64>) -> Side,
) {
    let tail = view.project(&arrow.from);
    let tip = view.project(&arrow.to);
    let (dx, dy) = (tip.x - tail.x, tip.y - tail.y);
    let screen_len = dx.hypot(dy);
    let width = f64::from(arrow.width_px * sizes.line);
    let head_len = (4.5 * width).min(0.45 * screen_len);
    // The shaft stops where the head begins, measured as a fraction of the world arrow.
    let head_frac = if screen_len > 0.0 {
        head_len / screen_len
    } else {
        0.0
    };
    let shaft_end = arrow.from + (arrow.to - arrow.from) * (1.0 - head_frac);
    push_line(
        items,
        view,
        &Segment {
            a: arrow.from,
            b: shaft_end,
            color: arrow.color,
            width_px: arrow.width_px,
        },
        sizes,
        side_of,
    );
    if screen_len > 0.5 {
        let (ux, uy) = (dx / screen_len, dy / screen_len);
        let half = 1.8 * width;
        let base = (tip.x - ux * head_len, tip.y - uy * head_len);
        let points = vec![
            [tip.x as f32, tip.y as f32],
            [(base.0 - uy * half) as f32, (base.1 + ux * half) as f32],
            [(base.0 + uy * half) as f32, (base.1 - ux * half) as f32],
        ];
        items.push(Item {
            depth: tip.depth,
            side: side_of(&arrow.to),
            prim: Prim::Polygon {
                points,
                fill: arrow.color,
                outline: None,
            },
        });
    }
}

fn push_labels(
    frame: &mut Frame,
    placer: &mut place::Placer,
    scene: &Scene,
    view: &ScreenFromWorld,
    sizes: Sizes,
) {
    let centre = view.project(&Point3::origin());
    for label in &scene.labels {
        let p = view.project(&label.at);
        // First try the side away from the picture's centre, so the text runs off the arrow
        // tip instead of back across the arrow.
        let away = [(p.x - centre.x) as f32, (p.y - centre.y) as f32];
        placer.draw(
            &mut frame.prims,
            &place::Label {
                point: pos(&p),
                gap: 6.0 * sizes.line,
                text: label.text.clone(),
                size: sizes.text,
                color: label.color,
                prefer: if away[0].abs() < 1.0 {
                    [1.0, 0.0]
                } else {
                    away
                },
            },
            sizes.line,
        );
    }
}

fn push_triad(frame: &mut Frame, view: &ScreenFromWorld, sizes: Sizes) {
    let len = 30.0 * f64::from(sizes.line);
    let origin = [50.0 * sizes.line, frame.height - 54.0 * sizes.line];
    let axes = [
        ("x", Vector3::x()),
        ("y", Vector3::y()),
        ("z", Vector3::z()),
    ];
    // Labels beyond the axes' tips, pushed apart where two axes point almost the same way on
    // screen (an eye between +x and −y, low down, sees x and y both going right).
    let mut labels: [[f32; 2]; 3] = std::array::from_fn(|i| {
        let [sx, sy] = view.screen_direction(&axes[i].1);
        [
            origin[0] + (sx * len * 1.3) as f32,
            origin[1] + (sy * len * 1.3) as f32,
        ]
    });
    let apart = 1.3 * sizes.text;
    for _ in 0..4 {
        for (a, b) in [(0, 1), (0, 2), (1, 2)] {
            let d = [labels[b][0] - labels[a][0], labels[b][1] - labels[a][1]];
            let dist = d[0].hypot(d[1]);
            if dist >= apart {
                continue;
            }
            let dir = if dist > 1e-3 {
                [d[0] / dist, d[1] / dist]
            } else {
                [0.0, 1.0]
            };
            let push = 0.5 * (apart - dist);
            labels[a] = [labels[a][0] - dir[0] * push, labels[a][1] - dir[1] * push];
            labels[b] = [labels[b][0] + dir[0] * push, labels[b][1] + dir[1] * push];
        }
    }
    // Draw the axis pointing most away from the viewer first.
    let mut order: Vec<usize> = vec![0, 1, 2];
    let eye = view.towards_eye();
    order.sort_by(|&a, &b| axes[a].1.dot(&eye).total_cmp(&axes[b].1.dot(&eye)));
    for i in order {
        let (name, d) = &axes[i];
        let [sx, sy] = view.screen_direction(d);
        let end = [origin[0] + (sx * len) as f32, origin[1] + (sy * len) as f32];
        frame.prims.push(Prim::Line {
            a: origin,
            b: end,
            width: 2.0 * sizes.line,
            color: style::AXES[i],
        });
        frame.prims.push(Prim::Text {
            at: labels[i],
            text: (*name).to_owned(),
            size: sizes.text,
            color: style::AXES[i],
            anchor: Anchor::Center,
            halo: false,
        });
    }
}

fn push_legend(
    frame: &mut Frame,
    legend: &crate::picture::scene::Legend,
    view: &ScreenFromWorld,
    sizes: Sizes,
) {
    let x = 12.0 * sizes.line;
    let mut y = 16.0 * sizes.line;
    let step = sizes.text * 1.45;
    for line in &legend.lines {
        frame.prims.push(Prim::Text {
            at: [x, y],
            text: line.clone(),
            size: sizes.text,
            color: style::INK,
            anchor: Anchor::LeftCenter,
            halo: false,
        });
        y += step;
    }
    // The scale bar: the world length of `scale_bar_text`, in pixels at depth 0.
    let bar = (legend.scale_bar_world * view.pixels_per_unit()) as f32;
    if bar > 0.0 {
        frame.prims.push(Prim::Line {
            a: [x, y],
            b: [x + bar, y],
            width: 3.0 * sizes.line,
            color: style::TRACTION,
        });
        frame.prims.push(Prim::Text {
            at: [x + bar + 8.0 * sizes.line, y],
            text: format!("= {} (arrow scale)", legend.scale_bar_text),
            size: sizes.text,
            color: style::INK,
            anchor: Anchor::LeftCenter,
            halo: false,
        });
    } else {
        frame.prims.push(Prim::Text {
            at: [x, y],
            text: format!("arrow scale: {}", legend.scale_bar_text),
            size: sizes.text,
            color: style::INK,
            anchor: Anchor::LeftCenter,
            halo: false,
        });
    }
    y += step;
    for entry in &legend.entries {
        frame.prims.push(Prim::Line {
            a: [x, y],
            b: [x + 18.0 * sizes.line, y],
            width: 4.0 * sizes.line,
            color: entry.color,
        });
        frame.prims.push(Prim::Text {
            at: [x + 26.0 * sizes.line, y],
            text: entry.text.clone(),
            size: sizes.text,
            color: style::INK,
            anchor: Anchor::LeftCenter,
            halo: false,
        });
        y += step;
    }
}

/// The exported figure for a state: the same scene and frame code as the window, at
/// `width` × `height` pixels with sizes scaled to match.
#[must_use]
pub fn figure(
    input: &crate::picture::scene::SceneInput<'_>,
    camera: &Camera,
    width: u32,
    height: u32,
) -> Frame {
    let scene = Scene::build(input, &camera.towards_eye());
    let (w, h) = (width as f32, height as f32);
    render(&scene, camera, w, h, Sizes::for_export(w, h))
}
