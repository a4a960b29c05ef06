//! [`Scene::build`]: the layers of the 3D picture from the tensor, the cut plane and the
//! settings, each in world units (the face tractions, the element, the traction field, the
//! cut plane and its traction, the ellipsoid, the principal axes, the worst planes, labels
//! and legend).

use nalgebra::{Point3, Vector3};

use super::geometry::{cube_corners, cube_edges, cut_polygon, ellipsoid_mesh, field_normals};
use super::style::{self, Rgba};
use super::{
    AXIS_REACH, Arrow, FIELD_NORMALS, FIELD_RADIUS, FIELD_SCALE, Face, FaceChoice, Handle, Label,
    Layers, Legend, LegendEntry, NORMAL_LENGTH, Polygon, ROTATED_ELEMENT_OFFSET, Scene, SceneInput,
    Segment, component_name,
};
use crate::mechanics::{Analysis, PlaneNormal, PlaneStress, SignConvention};
use crate::text::format::readable;

/// Arrow helper that skips zero-length arrows (a zero traction draws nothing).
fn push_arrow(
    arrows: &mut Vec<Arrow>,
    from: Point3<f64>,
    vector: Vector3<f64>,
    color: Rgba,
    width_px: f32,
) {
    if vector.norm() > 1e-9 {
        arrows.push(Arrow {
            from,
            to: from + vector,
            color,
            width_px,
        });
    }
}

/// The traction on a plane at `at` and its normal and shear parts, `scale` world units per
/// pascal; the traction `widths[0]` pixels wide, the parts `widths[1]`.
fn push_traction(
    arrows: &mut Vec<Arrow>,
    at: Point3<f64>,
    ps: &PlaneStress,
    scale: f64,
    widths: [f32; 2],
) {
    push_arrow(
        arrows,
        at,
        ps.traction_pa * scale,
        style::TRACTION,
        widths[0],
    );
    push_arrow(
        arrows,
        at,
        ps.normal_traction_pa() * scale,
        style::NORMAL_PART,
        widths[1],
    );
    push_arrow(
        arrows,
        at,
        ps.shear_traction_pa() * scale,
        style::SHEAR_PART,
        widths[1],
    );
}

/// What every layer needs to know while the scene is built.
struct Context<'a> {
    input: &'a SceneInput<'a>,
    physical: Analysis,
    shown: Analysis,
    max_abs_pa: f64,
}

impl Context<'_> {
    /// A stress in the display unit, with the unit (no sign change).
    fn value(&self, pa: f64) -> String {
        format!(
            "{} {}",
            readable(self.input.unit.from_pa(pa), 4),
            self.input.unit.symbol()
        )
    }
}

impl Scene {
    /// Builds the scene. `towards_viewer` is a unit vector from the origin towards the eye; it
    /// decides which faces count as facing the viewer.
    #[must_use]
    pub fn build(input: &SceneInput<'_>, towards_viewer: &Vector3<f64>) -> Self {
        let physical = Analysis::new(input.tensor, SignConvention::TensionPositive);
        let shown = Analysis::new(input.tensor, input.convention);
        let max_abs_pa = physical
            .principal
            .values_pa
            .iter()
            .fold(0.0_f64, |m, v| m.max(v.abs()));
        let cx = Context {
            input,
            physical,
            shown,
            max_abs_pa,
        };
        let layers = input.layers;
        let mut scene = Self {
            arrow_scale_per_pa: if max_abs_pa > 0.0 {
                style::LONGEST_ARROW / max_abs_pa
            } else {
                0.0
            },
            triad: layers.triad,
            ..Self::default()
        };
        if layers.cube {
            scene.add_cube();
        }
        if layers.face_tractions {
            scene.add_face_tractions(&cx, towards_viewer);
        }
        if layers.element {
            scene.add_element(&cx, towards_viewer);
        }
        if layers.traction_field {
            scene.add_traction_field(&cx);
        }
        if layers.cut_plane {
            scene.add_cut_plane(&cx);
        }
        if layers.ellipsoid && scene.arrow_scale_per_pa > 0.0 {
            let semi = cx
                .physical
                .principal
                .values_pa
                .map(|v| v.abs() * scene.arrow_scale_per_pa);
            scene.meshes.push(ellipsoid_mesh(
                semi,
                cx.physical.principal.directions,
                style::ELLIPSOID,
            ));
        }
        if layers.principal_axes {
            scene.add_principal_axes(&cx);
        }
        scene.add_marked_plane(&cx);
        if layers.worst_planes {
            scene.add_worst_planes(&cx);
        }
        if layers.legend {
            scene.add_legend(&cx);
        }
        scene
    }

    fn add_cube(&mut self) {
        let corners = cube_corners();
        for face in Face::ALL {
            let n = face.normal();
            let mut pts: Vec<Point3<f64>> = corners
                .iter()
                .copied()
                .filter(|c| (c.coords.dot(&n) - 0.5).abs() < 1e-12)
                .collect();
            let centre = n * 0.5;
            let (u, v) = crate::mechanics::principal::orthogonal_complement(&n);
            pts.sort_by(|p, q| {
                let (dp, dq) = (p.coords - centre, q.coords - centre);
                v.dot(&dp)
                    .atan2(u.dot(&dp))
                    .total_cmp(&v.dot(&dq).atan2(u.dot(&dq)))
            });
            self.polygons.push(Polygon {
                points: pts,
                fill: style::CUBE_FACE,
                outline: None,
            });
        }
        for (a, b) in cube_edges() {
            self.segments.push(Segment {
                a: corners[a],
                b: corners[b],
                color: style::CUBE_EDGE,
                width_px: 1.2,
            });
        }
    }

    fn add_face_tractions(&mut self, cx: &Context<'_>, towards_viewer: &Vector3<f64>) {
        let t = cx.input.tensor;
        for (i, face) in Face::ALL.into_iter().enumerate() {
            let n = face.normal();
            let shown_face = match cx.input.faces {
                FaceChoice::FacingViewer => n.dot(towards_viewer) > 1e-9,
                FaceChoice::Chosen(which) => which[i],
            };
            if !shown_face {
                continue;
            }
            let Ok(normal) = PlaneNormal::from_vector(n) else {
                continue;
            };
            let ps = PlaneStress::new(t, normal, SignConvention::TensionPositive);
            let centre = Point3::from(n * 0.5);
            let s = self.arrow_scale_per_pa;
            push_traction(&mut self.arrows, centre, &ps, s, [2.6, 1.8]);
            if cx.input.layers.labels && ps.traction_pa.norm() > 0.0 {
                self.labels.push(Label {
                    at: centre + ps.traction_pa * s,
                    text: format!("{}: |t| {}", face.label(), cx.value(ps.traction_pa.norm())),
                    color: style::TRACTION,
                });
            }
        }
    }

    /// The stress element: on each face, the normal component along the face normal (outward
    /// for tension, pointing in for compression) and the two shear components along the face,
    /// each labelled with its name and signed value; faces turned away are drawn faintly and
    /// unlabelled. Looking straight down an axis, the four faces seen edge-on make the plane
    /// element, and the element turned to the in-plane principal directions is drawn beside it.
    fn add_element(&mut self, cx: &Context<'_>, towards_viewer: &Vector3<f64>) {
        let m = cx.input.tensor.matrix_pa();
        let s = self.arrow_scale_per_pa;
        let sign = cx.input.convention.sign();
        let labels = cx.input.layers.labels;
        let along = |v: &Vector3<f64>| v.dot(towards_viewer);
        // The axis the eye looks down, if any.
        let axis_view = (0..3).find(|&k| along(&Vector3::ith(k, 1.0)).abs() > 0.999);
        for face in Face::ALL {
            let n = face.normal();
            let i = face.axis();
            let out = n[i];
            let facing = along(&n);
            let (shown, faint) = match axis_view {
                // The plane element: faces seen edge-on, in full.
                Some(k) => (i != k, false),
                None => (true, facing < -1e-9),
            };
            if !shown {
                continue;
            }
            let centre = Point3::from(n * 0.5);
            for j in 0..3 {
                if axis_view == Some(j) {
                    // Along the line of sight: nothing to see.
                    continue;
                }
                let comp = m[(i, j)];
                let v = Vector3::ith(j, out * comp * s);
                if v.norm() <= 1e-9 {
                    continue;
                }
                let (color, from, to) = if i == j {
                    let color = if comp > 0.0 {
                        style::TENSION
                    } else {
                        style::COMPRESSION
                    };
                    // Tension pulls out of the face; compression pushes in onto it.
                    if comp > 0.0 {
                        (color, centre, centre + v)
                    } else {
                        (color, centre - v, centre)
                    }
                } else {
                    (style::SHEAR_PART, centre, centre + v)
                };
                self.arrows.push(Arrow {
                    from,
                    to,
                    color: if faint { color.with_alpha(80) } else { color },
                    width_px: if i == j { 2.6 } else { 2.2 },
                });
                // The plane element names each component once, on the faces facing +x, +y, +z.
                if labels && !faint && (axis_view.is_none() || out > 0.0) {
                    let name = component_name(i, j);
                    self.labels.push(Label {
                        at: if i == j && comp < 0.0 { from } else { to },
                        text: format!("{name} = {}", cx.value(sign * comp)),
                        color,
                    });
                }
            }
        }
        if let Some(k) = axis_view {
            self.add_rotated_element(cx, k);
            self.focus = Point3::from(Vector3::ith((k + 1) % 3, 0.5 * ROTATED_ELEMENT_OFFSET));
        }
    }

    /// The plane element of the plane normal to axis `k`, turned to its in-plane principal
    /// directions, drawn beside the cube with its principal stresses and angle.
    fn add_rotated_element(&mut self, cx: &Context<'_>, k: usize) {
        let m = cx.input.tensor.matrix_pa();
        let (a, b) = ((k + 1) % 3, (k + 2) % 3);
        let (s1, s2, angle) =
            crate::mechanics::inputs::in_plane_principal(m[(a, a)], m[(b, b)], m[(a, b)]);
        let theta = angle.unwrap_or(0.0).to_radians();
        let (ea, eb) = (Vector3::ith(a, 1.0), Vector3::ith(b, 1.0));
        let p = ea * theta.cos() + eb * theta.sin();
        let q = -ea * theta.sin() + eb * theta.cos();
        let centre = Point3::from(ea * ROTATED_ELEMENT_OFFSET);
        let half = 0.3;
        let corners = [(1.0, 1.0), (-1.0, 1.0), (-1.0, -1.0), (1.0, -1.0)]
            .map(|(u, v)| centre + p * (u * half) + q * (v * half));
        for c in 0..4 {
            self.segments.push(Segment {
                a: corners[c],
                b: corners[(c + 1) % 4],
                color: style::CUBE_EDGE,
                width_px: 1.4,
            });
        }
        // The reference axis the angle is measured from.
        self.segments.push(Segment {
            a: centre,
            b: centre + ea * (half + 0.15),
            color: style::CUBE_EDGE.with_alpha(140),
            width_px: 1.0,
        });
        let s = self.arrow_scale_per_pa;
        let sign = cx.input.convention.sign();
        for (value, dir, name) in [(s1, p, "I"), (s2, q, "II")] {
            let color = if value > 0.0 {
                style::TENSION
            } else {
                style::COMPRESSION
            };
            for end in [1.0, -1.0] {
                let edge = centre + dir * (end * half);
                let v = dir * (end * value * s);
                if v.norm() <= 1e-9 {
                    continue;
                }
                let (from, to) = if value > 0.0 {
                    (edge, edge + v)
                } else {
                    (edge - v, edge)
                };
                self.arrows.push(Arrow {
                    from,
                    to,
                    color,
                    width_px: 2.4,
                });
                if end > 0.0 && cx.input.layers.labels {
                    self.labels.push(Label {
                        at: if value > 0.0 { to } else { from },
                        text: format!("σ{name} = {}", cx.value(sign * value)),
                        color,
                    });
                }
            }
        }
        if cx.input.layers.labels {
            let axis = ['x', 'y', 'z'];
            self.labels.push(Label {
                at: centre + ea * (half + 0.15),
                text: match angle {
                    Some(deg) => format!("θp = {}° from {}", readable(deg, 3), axis[a]),
                    None => "every in-plane direction is principal".to_owned(),
                },
                color: style::INK,
            });
        }
    }

    /// Traction vectors at the tips of [`FIELD_NORMALS`] unit normals spread evenly over the
    /// sphere, coloured by the sign of their normal part: traction is along the normal only in
    /// the principal directions.
    fn add_traction_field(&mut self, cx: &Context<'_>) {
        let s = self.arrow_scale_per_pa * FIELD_SCALE;
        for n in field_normals(FIELD_NORMALS) {
            let t = cx.input.tensor.traction_pa(&n);
            let color = if t.dot(&n) >= 0.0 {
                style::TENSION
            } else {
                style::COMPRESSION
            };
            push_arrow(
                &mut self.arrows,
                Point3::from(n * FIELD_RADIUS),
                t * s,
                color.with_alpha(200),
                1.1,
            );
        }
    }

    fn add_cut_plane(&mut self, cx: &Context<'_>) {
        let t = cx.input.tensor;
        let sign = cx.input.convention.sign();
        let n = cx.input.plane.vector();
        self.polygons.push(Polygon {
            points: cut_polygon(&n),
            fill: style::CUT_PLANE,
            outline: Some(style::PLANE_NORMAL),
        });
        let origin = Point3::origin();
        push_arrow(
            &mut self.arrows,
            origin,
            n * NORMAL_LENGTH,
            style::PLANE_NORMAL,
            1.6,
        );
        self.handles.push(Handle {
            at: origin + n * NORMAL_LENGTH,
            fill: Rgba::rgb(255, 255, 255),
            outline: style::PLANE_NORMAL,
            radius_px: 5.5,
        });
        let ps = PlaneStress::new(t, cx.input.plane, SignConvention::TensionPositive);
        let s = self.arrow_scale_per_pa;
        push_traction(&mut self.arrows, origin, &ps, s, [3.0, 2.2]);
        if cx.input.layers.labels {
            self.labels.push(Label {
                at: origin + n * (NORMAL_LENGTH + 0.03),
                text: "n".to_owned(),
                color: style::PLANE_NORMAL,
            });
            if ps.traction_pa.norm() > 0.0 {
                self.labels.push(Label {
                    at: origin + ps.normal_traction_pa() * s,
                    text: format!("σn {}", cx.value(sign * ps.normal_stress_pa)),
                    color: style::NORMAL_PART,
                });
            }
            if ps.shear_stress_pa > 0.0 {
                self.labels.push(Label {
                    at: origin + ps.shear_traction_pa() * s,
                    text: format!("τ {}", cx.value(ps.shear_stress_pa)),
                    color: style::SHEAR_PART,
                });
            }
        }
    }

    fn add_principal_axes(&mut self, cx: &Context<'_>) {
        for (i, (v, d)) in cx
            .physical
            .principal
            .values_pa
            .iter()
            .zip(cx.physical.principal.directions)
            .enumerate()
        {
            let len = v.abs() * self.arrow_scale_per_pa;
            let (color, outward) = if *v > 0.0 {
                (style::TENSION, true)
            } else if *v < 0.0 {
                (style::COMPRESSION, false)
            } else {
                (style::NEUTRAL, true)
            };
            // A thin line marks the axis through the cube; the stress arrows stand just
            // outside the cube's corners so the centre stays readable. Tension pulls:
            // arrows point away from the cube at both ends. Compression pushes: arrows point
            // in towards the cube.
            self.segments.push(Segment {
                a: Point3::from(d * -AXIS_REACH),
                b: Point3::from(d * AXIS_REACH),
                color: color.with_alpha(150),
                width_px: 1.0,
            });
            for end in [1.0, -1.0] {
                let tip_dir = d * end;
                let (from, vec) = if outward {
                    (Point3::from(tip_dir * AXIS_REACH), tip_dir * len)
                } else {
                    (Point3::from(tip_dir * (AXIS_REACH + len)), -tip_dir * len)
                };
                push_arrow(&mut self.arrows, from, vec, color, 2.4);
            }
            if cx.input.layers.labels && len > 0.0 {
                // The displayed index follows the convention: in compression-positive σ1 is
                // the most compressive, i.e. the physical σ3.
                let shown_index = match cx.input.convention {
                    SignConvention::TensionPositive => i,
                    SignConvention::CompressionPositive => 2 - i,
                };
                self.labels.push(Label {
                    at: Point3::from(d * (AXIS_REACH + len + 0.02)),
                    text: format!(
                        "σ{} {}",
                        shown_index + 1,
                        cx.value(cx.shown.principal.values_pa[shown_index])
                    ),
                    color,
                });
            }
        }
    }

    fn add_worst_planes(&mut self, cx: &Context<'_>) {
        for (i, plane) in cx.input.worst_planes.iter().enumerate() {
            let n = plane.vector();
            self.add_plane_outline(&n, style::WORST_PLANE, 2.0, 0.8);
            if cx.input.layers.labels {
                self.labels.push(Label {
                    at: Point3::from(n * (0.8 * NORMAL_LENGTH + 0.03)),
                    text: format!("worst {}", i + 1),
                    color: style::WORST_PLANE,
                });
            }
        }
    }

    /// A plane's outline in the cube, `width_px` wide, and its normal from the centre,
    /// `reach` normal lengths long (its shaft 0.7 of the outline's width), in `color`.
    fn add_plane_outline(&mut self, n: &Vector3<f64>, color: Rgba, width_px: f32, reach: f64) {
        let outline = cut_polygon(n);
        for (k, a) in outline.iter().enumerate() {
            let b = outline[(k + 1) % outline.len()];
            self.segments.push(Segment {
                a: *a,
                b,
                color,
                width_px,
            });
        }
        push_arrow(
            &mut self.arrows,
            Point3::origin(),
            n * (reach * NORMAL_LENGTH),
            color,
            0.7 * width_px,
        );
    }

    /// A plane another study marks (the Fatigue tab's critical plane): outline, normal arrow
    /// and its label, in ink so it stands apart from the cut plane and the worst planes.
    fn add_marked_plane(&mut self, cx: &Context<'_>) {
        let Some((plane, label)) = cx.input.marked_plane else {
            return;
        };
        let n = plane.vector();
        self.add_plane_outline(&n, style::INK, 2.4, 0.9);
        self.labels.push(Label {
            at: Point3::from(n * (0.9 * NORMAL_LENGTH + 0.04)),
            text: label.to_owned(),
            color: style::INK,
        });
    }

    fn add_legend(&mut self, cx: &Context<'_>) {
        let sym = cx.input.unit.symbol();
        // Round in the display unit (500 psi, not a converted round number of pascals).
        let unit = cx.input.unit;
        let bar_pa = unit.to_pa(crate::text::format::round_step(
            unit.from_pa(cx.max_abs_pa * 0.5),
        ));
        self.legend = Some(Legend {
            lines: vec![
                format!("Stress unit: {sym}"),
                format!("Convention: {}", cx.input.convention.key()),
            ],
            scale_bar_world: bar_pa * self.arrow_scale_per_pa,
            scale_bar_text: if bar_pa > 0.0 {
                cx.value(bar_pa)
            } else {
                "zero stress".to_owned()
            },
            entries: {
                let mut entries =
                    legend_entries(cx.input.layers, !cx.input.worst_planes.is_empty());
                if let Some((_, label)) = cx.input.marked_plane {
                    entries.push(LegendEntry {
                        color: style::INK,
                        text: format!("{label} (outline, normal)"),
                    });
                }
                entries
            },
        });
    }
}

/// The colour key for the layers that are drawn.
fn legend_entries(layers: Layers, worst_planes: bool) -> Vec<LegendEntry> {
    let entry = |color, text: &str| LegendEntry {
        color,
        text: text.to_owned(),
    };
    let mut out = Vec::new();
    if layers.face_tractions || layers.cut_plane {
        out.push(entry(style::TRACTION, "traction t = σ·n"));
        out.push(entry(style::NORMAL_PART, "normal part σn·n"));
        out.push(entry(style::SHEAR_PART, "shear part τ"));
    }
    if layers.principal_axes || layers.element || layers.traction_field {
        out.push(entry(style::TENSION, "tension (pulls out of a face)"));
        out.push(entry(
            style::COMPRESSION,
            "compression (pushes onto a face)",
        ));
    }
    if layers.element && !(layers.face_tractions || layers.cut_plane) {
        out.push(entry(
            style::SHEAR_PART,
            "shear component τij (face i, direction j)",
        ));
    }
    if layers.cut_plane {
        out.push(entry(style::PLANE_NORMAL, "cut plane, normal n"));
    }
    if layers.worst_planes && worst_planes {
        out.push(entry(style::WORST_PLANE, "worst planes (outline, normal)"));
    }
    if layers.ellipsoid {
        out.push(entry(
            style::ELLIPSOID.with_alpha(255),
            "traction ellipsoid",
        ));
    }
    out
}
