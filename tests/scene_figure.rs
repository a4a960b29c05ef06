//! The 3D scene as data, its depth order, and the exported figures.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

use nalgebra::{Point3, Vector3};
use planewise::mechanics::{
    Analysis, PlaneNormal, PlaneStress, SignConvention, StressTensor, StressUnit,
};
use planewise::picture::draw::camera::{Camera, ViewPreset};
use planewise::picture::draw::{Prim, Sizes, figure, png, render, svg};
use planewise::picture::scene::style::{self, Rgba};
use planewise::picture::scene::{
    Arrow, FaceChoice, Layers, Scene, SceneInput, Segment, cut_polygon,
};
use proptest::prelude::*;

fn demo_tensor() -> StressTensor {
    StressTensor::from_components(
        [120.0, -35.0, 15.0, 48.0, -12.0, 22.0],
        StressUnit::MPa,
        1.0,
    )
    .unwrap()
}

fn only(layers: impl Fn(&mut Layers)) -> Layers {
    let mut l = Layers::none();
    layers(&mut l);
    l
}

fn input(t: &StressTensor, layers: Layers) -> SceneInput<'_> {
    SceneInput {
        tensor: t,
        plane: PlaneNormal::from_vector(Vector3::new(1.0, 0.5, 0.3)).unwrap(),
        unit: StressUnit::MPa,
        convention: SignConvention::TensionPositive,
        layers,
        faces: FaceChoice::Chosen([true; 6]),
        worst_planes: &[],
        marked_plane: None,
    }
}

#[test]
fn face_traction_tips_are_the_scaled_tractions() {
    let t = demo_tensor();
    let scene = Scene::build(
        &input(&t, only(|l| l.face_tractions = true)),
        &Vector3::new(1.0, 1.0, 1.0).normalize(),
    );
    let s = scene.arrow_scale_per_pa;
    assert!(s > 0.0);
    for n in [
        Vector3::x(),
        -Vector3::x(),
        Vector3::y(),
        -Vector3::y(),
        Vector3::z(),
        -Vector3::z(),
    ] {
        // Cauchy: t = σ n (tension positive, physical vectors).
        let traction = t.matrix_pa() * n;
        let centre = Point3::from(n * 0.5);
        let found = scene.arrows.iter().any(|a| {
            a.color == style::TRACTION
                && (a.from - centre).norm() < 1e-12
                && ((a.to - a.from) - traction * s).norm() < 1e-12
        });
        assert!(found, "no traction arrow with tip σn on face {n}");
        // The normal and shear parts add up to the total.
        let ps = PlaneStress::new(
            &t,
            PlaneNormal::from_vector(n).unwrap(),
            SignConvention::TensionPositive,
        );
        let sum = ps.normal_traction_pa() + ps.shear_traction_pa();
        assert!((sum - traction).norm() < 1e-6);
    }
}

#[test]
fn ellipsoid_axes_are_the_principal_stresses() {
    let t = demo_tensor();
    let scene = Scene::build(&input(&t, only(|l| l.ellipsoid = true)), &Vector3::z());
    let a = Analysis::new(&t, SignConvention::TensionPositive);
    let s = scene.arrow_scale_per_pa;
    let mesh = &scene.meshes[0];
    let semi = a.principal.values_pa.map(|v| v.abs() * s);
    for (axis, d) in semi.iter().zip(a.principal.directions) {
        // The farthest vertex along each principal direction reaches the semi-axis |σi|·scale.
        let reach = mesh
            .vertices
            .iter()
            .map(|p| p.coords.dot(&d).abs())
            .fold(0.0, f64::max);
        assert!(
            (reach - axis).abs() < 0.01 * axis,
            "reach {reach} vs semi-axis {axis}"
        );
    }
    // Every vertex lies on the ellipsoid Σ (p·ni / ai)² = 1 (Lamé's stress ellipsoid).
    for p in &mesh.vertices {
        let q: f64 = (0..3)
            .map(|i| (p.coords.dot(&a.principal.directions[i]) / semi[i]).powi(2))
            .sum();
        assert!((q - 1.0).abs() < 1e-9, "vertex off the ellipsoid: {q}");
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(500))]

    /// The cut polygon lies in the plane, inside the cube, and is convex and in order.
    #[test]
    fn cut_polygon_lies_in_the_plane_and_the_cube(v in prop::array::uniform3(-1.0..1.0_f64)) {
        prop_assume!(Vector3::from(v).norm() > 1e-3);
        let n = Vector3::from(v).normalize();
        let poly = cut_polygon(&n);
        prop_assert!((3..=6).contains(&poly.len()), "{} vertices", poly.len());
        for p in &poly {
            prop_assert!(n.dot(&p.coords).abs() < 1e-12);
            prop_assert!(p.coords.amax() <= 0.5 + 1e-12);
        }
        // Consecutive edges turn the same way about n (convex, ordered).
        for i in 0..poly.len() {
            let a = poly[i];
            let b = poly[(i + 1) % poly.len()];
            let c = poly[(i + 2) % poly.len()];
            prop_assert!((b - a).cross(&(c - b)).dot(&n) >= -1e-12);
        }
    }
}

#[test]
fn nearer_of_two_overlapping_primitives_is_drawn_last() {
    // Two segments crossing the view centre at different depths, seen from +x: the one at
    // x = +0.4 is nearer the eye than the one at x = −0.4.
    let near = Rgba::rgb(1, 2, 3);
    let far = Rgba::rgb(4, 5, 6);
    for flip in [false, true] {
        let mut scene = Scene::default();
        let mut segs = vec![
            Segment {
                a: Point3::new(0.4, -0.3, 0.0),
                b: Point3::new(0.4, 0.3, 0.0),
                color: near,
                width_px: 4.0,
            },
            Segment {
                a: Point3::new(-0.4, 0.0, -0.3),
                b: Point3::new(-0.4, 0.0, 0.3),
                color: far,
                width_px: 4.0,
            },
        ];
        if flip {
            segs.reverse();
        }
        scene.segments = segs;
        let frame = render(
            &scene,
            &Camera::from_preset(ViewPreset::PosX),
            400.0,
            400.0,
            Sizes::default(),
        );
        let colors: Vec<Rgba> = frame
            .prims
            .iter()
            .filter_map(|p| match p {
                Prim::Line { color, .. } => Some(*color),
                _ => None,
            })
            .collect();
        let last_far = colors.iter().rposition(|c| *c == far).unwrap();
        let first_near = colors.iter().position(|c| *c == near).unwrap();
        assert!(
            first_near > last_far,
            "near pieces must follow all far pieces (input flipped: {flip})"
        );
    }
    // The same holds for an arrow on either side of the cut plane: seen from +x with the plane
    // x = 0, an arrow at x = −0.3 is drawn before the plane, one at x = +0.3 after it.
    let mut scene = Scene::default();
    scene.polygons.push(planewise::picture::scene::Polygon {
        points: cut_polygon(&Vector3::x()),
        fill: style::CUT_PLANE,
        outline: Some(style::PLANE_NORMAL),
    });
    for (x, c) in [(-0.3, far), (0.3, near)] {
        scene.arrows.push(Arrow {
            from: Point3::new(x, 0.0, -0.2),
            to: Point3::new(x, 0.0, 0.2),
            color: c,
            width_px: 2.0,
        });
    }
    let frame = render(
        &scene,
        &Camera::from_preset(ViewPreset::PosX),
        400.0,
        400.0,
        Sizes::default(),
    );
    let index_of = |want: Rgba| {
        frame
            .prims
            .iter()
            .position(|p| matches!(p, Prim::Line { color, .. } if *color == want))
            .unwrap()
    };
    let plane_index = frame
        .prims
        .iter()
        .position(|p| {
            matches!(
                p,
                Prim::Polygon {
                    outline: Some(_),
                    ..
                }
            )
        })
        .unwrap();
    assert!(index_of(far) < plane_index && plane_index < index_of(near));
}

#[test]
fn zero_tensor_draws_without_dividing_by_zero() {
    let t = StressTensor::ZERO;
    let scene = Scene::build(&input(&t, Layers::default()), &Vector3::z());
    assert_eq!(scene.arrow_scale_per_pa, 0.0);
    let frame = render(&scene, &Camera::default(), 800.0, 600.0, Sizes::default());
    let finite = |p: &[f32; 2]| p[0].is_finite() && p[1].is_finite();
    for prim in &frame.prims {
        match prim {
            Prim::Polygon { points, .. } => assert!(points.iter().all(finite)),
            Prim::Line { a, b, .. } => assert!(finite(a) && finite(b)),
            Prim::Text { at, .. } | Prim::Image { at, .. } => assert!(finite(at)),
        }
    }
}

#[test]
fn svg_parses_and_png_has_the_requested_size() {
    let t = demo_tensor();
    let camera = Camera::default();
    let frame = figure(&input(&t, Layers::default()), &camera, 640, 480);
    let text = svg::to_svg(&frame, "test & <check>");
    let tree = resvg::usvg::Tree::from_str(&text, &resvg::usvg::Options::default()).unwrap();
    assert_eq!(tree.size().width(), 640.0);
    let bytes = png::to_png(&frame).unwrap();
    // PNG signature, then the IHDR chunk's width and height (PNG specification, ISO/IEC 15948).
    assert_eq!(&bytes[..8], b"\x89PNG\r\n\x1a\n");
    let w = u32::from_be_bytes(bytes[16..20].try_into().unwrap());
    let h = u32::from_be_bytes(bytes[20..24].try_into().unwrap());
    assert_eq!((w, h), (640, 480));
}

#[test]
fn the_sigma1_arrow_tip_has_the_arrows_colour() {
    let t = demo_tensor();
    let camera = Camera::default();
    let (w, h) = (1200u32, 900u32);
    let inp = input(&t, only(|l| l.principal_axes = true));
    let frame = figure(&inp, &camera, w, h);
    let pixmap = png::to_pixmap(&frame).unwrap();
    // Where the σ1 arrow (tension: pointing outwards along +n1) ends on screen.
    let scene = Scene::build(&inp, &camera.towards_eye());
    let arrow = scene
        .arrows
        .iter()
        .find(|a| a.color == style::TENSION)
        .unwrap();
    let view = camera.screen_from_world(f64::from(w), f64::from(h), scene.radius());
    let tip = view.project(&arrow.to);
    let tail = view.project(&arrow.from);
    let (dx, dy) = (tip.x - tail.x, tip.y - tail.y);
    let len = dx.hypot(dy);
    // A few pixels back from the tip, inside the filled head.
    let (x, y) = (
        (tip.x - 5.0 * dx / len).round() as u32,
        (tip.y - 5.0 * dy / len).round() as u32,
    );
    let px = pixmap.pixel(x, y).unwrap().demultiply();
    let c = style::TENSION;
    let close = |a: u8, b: u8| a.abs_diff(b) <= 12;
    assert!(
        close(px.red(), c.r) && close(px.green(), c.g) && close(px.blue(), c.b),
        "pixel ({x}, {y}) is {:?}, expected {:?}",
        (px.red(), px.green(), px.blue()),
        c
    );
}

#[test]
fn the_normal_handle_sits_at_the_tip_of_the_normal() {
    let t = demo_tensor();
    let scene = Scene::build(&input(&t, only(|l| l.cut_plane = true)), &Vector3::z());
    let n = PlaneNormal::from_vector(Vector3::new(1.0, 0.5, 0.3)).unwrap();
    assert_eq!(scene.handles.len(), 1);
    let tip = Point3::from(n.vector() * planewise::picture::scene::NORMAL_LENGTH);
    assert!((scene.handles[0].at - tip).norm() < 1e-12);
    // The normal arrow ends there too.
    assert!(scene.arrows.iter().any(|a| (a.to - tip).norm() < 1e-12));
    // No cut plane, no handle.
    let scene = Scene::build(&input(&t, only(|l| l.cube = true)), &Vector3::z());
    assert!(scene.handles.is_empty());
}

#[test]
fn worst_planes_are_outlined_in_their_planes_on_the_cube() {
    let t = demo_tensor();
    let worst = [
        PlaneNormal::from_vector(Vector3::new(1.0, 0.0, 1.0)).unwrap(),
        PlaneNormal::from_vector(Vector3::new(-1.0, 0.0, 1.0)).unwrap(),
    ];
    let scene_input = SceneInput {
        worst_planes: &worst,
        marked_plane: None,
        ..input(&t, only(|l| l.worst_planes = true))
    };
    let scene = Scene::build(&scene_input, &Vector3::z());
    let outline: Vec<&Segment> = scene
        .segments
        .iter()
        .filter(|s| s.color == style::WORST_PLANE)
        .collect();
    // Each plane through the centre at 45° cuts the cube in a rectangle: 4 edges each.
    assert_eq!(outline.len(), 8);
    for s in &outline {
        let on_some_plane = worst.iter().any(|n| {
            n.vector().dot(&s.a.coords).abs() < 1e-12 && n.vector().dot(&s.b.coords).abs() < 1e-12
        });
        assert!(on_some_plane);
        for p in [s.a, s.b] {
            let max = p.coords.amax();
            assert!(
                (max - 0.5).abs() < 1e-12,
                "{p} is not on the cube's surface"
            );
        }
    }
    // The layer off draws nothing of them even with planes given.
    let off = SceneInput {
        worst_planes: &worst,
        marked_plane: None,
        ..input(&t, only(|l| l.cube = true))
    };
    let scene = Scene::build(&off, &Vector3::z());
    assert!(!scene.segments.iter().any(|s| s.color == style::WORST_PLANE));
}

#[test]
fn the_normal_handle_is_drawn_over_the_labels() {
    let t = demo_tensor();
    let frame = render(
        &Scene::build(
            &input(
                &t,
                only(|l| {
                    l.cut_plane = true;
                    l.labels = true;
                }),
            ),
            &Camera::default().towards_eye(),
        ),
        &Camera::default(),
        800.0,
        600.0,
        Sizes::default(),
    );
    let handle = frame
        .prims
        .iter()
        .position(|p| matches!(p, Prim::Polygon { outline: Some((c, _)), fill, .. } if *c == style::PLANE_NORMAL && *fill == Rgba::rgb(255, 255, 255)))
        .expect("no handle drawn");
    let last_text = frame
        .prims
        .iter()
        .rposition(|p| matches!(p, Prim::Text { .. }))
        .unwrap();
    assert!(handle > last_text, "a label covers the handle");
}

/// The stress element: on every face the arrows leaving or reaching the face centre are
/// t_j = σ_ij n_i along each axis j (Cauchy's definition of the components, any mechanics
/// text, e.g. Gere & Goodno, Mechanics of Materials, §7.2), so the normal arrow's signed
/// length along the outward normal is σ_ii and the shear arrows are the off-diagonal
/// components; tension arrows start on the face and point out, compression arrows end on it.
#[test]
fn element_arrows_are_the_signed_components_on_each_face() {
    use planewise::picture::scene::Face;
    let t = demo_tensor();
    let components = [
        [120.0, 48.0, 22.0],
        [48.0, -35.0, -12.0],
        [22.0, -12.0, 15.0],
    ];
    let eye = Vector3::new(1.0, 0.8, 0.6).normalize();
    let scene = Scene::build(&input(&t, only(|l| l.element = true)), &eye);
    let s = scene.arrow_scale_per_pa * 1e6;
    for face in Face::ALL {
        let n = face.normal();
        let i = face.axis();
        let centre = Point3::from(n * 0.5);
        let mut drawn: Vec<Vector3<f64>> = scene
            .arrows
            .iter()
            .filter(|a| (a.from - centre).norm() < 1e-12 || (a.to - centre).norm() < 1e-12)
            .map(|a| a.to - a.from)
            .collect();
        assert_eq!(drawn.len(), 3, "{face:?}");
        for j in 0..3 {
            let expected = Vector3::ith(j, n[i] * components[i][j] * s);
            let k = drawn
                .iter()
                .position(|v| (v - expected).norm() < 1e-9)
                .unwrap_or_else(|| panic!("{face:?}: no arrow {expected} among {drawn:?}"));
            drawn.remove(k);
        }
        // σxx = 120 MPa pulls: its arrow starts on the ±x faces; σyy = −35 MPa pushes: its
        // arrow ends on the ±y faces.
        let normal = scene
            .arrows
            .iter()
            .find(|a| {
                ((a.to - a.from).normalize().dot(&n)).abs() > 0.999
                    && ((a.from - centre).norm() < 1e-12 || (a.to - centre).norm() < 1e-12)
            })
            .unwrap();
        if components[i][i] > 0.0 {
            assert!((normal.from - centre).norm() < 1e-12, "{face:?}");
            assert!((normal.to - normal.from).dot(&n) > 0.0);
        } else {
            assert!((normal.to - centre).norm() < 1e-12, "{face:?}");
            assert!((normal.to - normal.from).dot(&n) < 0.0);
        }
    }
}

/// Looking down z, the element is the plane element with its turned copy: the in-plane
/// principal stresses (σx + σy)/2 ± √(((σx − σy)/2)² + τxy²) and tan 2θp = 2τxy/(σx − σy)
/// (Gere & Goodno, Mechanics of Materials, eqs. 7-17 and 7-11): 133.7 MPa, −48.66 MPa and
/// 15.88° for σx = 120, σy = −35, τxy = 48 MPa.
#[test]
fn looking_down_z_the_element_is_the_plane_element_with_its_principal_copy() {
    let t = demo_tensor();
    let scene = Scene::build(
        &input(
            &t,
            only(|l| {
                l.element = true;
                l.labels = true;
            }),
        ),
        &Vector3::z(),
    );
    let texts: Vec<&str> = scene.labels.iter().map(|l| l.text.as_str()).collect();
    for expected in [
        "σxx = 120 MPa",
        "σyy = −35 MPa",
        "τxy = 48 MPa",
        "τyx = 48 MPa",
        "σI = 133.7 MPa",
        "σII = −48.66 MPa",
        "θp = 15.9° from x",
    ] {
        assert!(texts.contains(&expected), "{expected} not in {texts:?}");
    }
    // Nothing along the line of sight, and no σzz or τ·z labels.
    assert!(!texts.iter().any(|t| t.contains('z')), "{texts:?}");
    assert!(scene.arrows.iter().all(|a| (a.to - a.from).z.abs() < 1e-12));
}

/// The traction field: each arrow starts at a sampled normal's tip and is σ·n there (Cauchy's
/// formula, computed here with nalgebra's matrix product), all at one scale, coloured by the
/// sign of its normal part; the normals cover the sphere evenly (their mean is near zero).
#[test]
fn traction_field_arrows_are_sigma_times_n() {
    let t = demo_tensor();
    let m = t.matrix_pa();
    let scene = Scene::build(
        &input(&t, only(|l| l.traction_field = true)),
        &Vector3::new(1.0, 1.0, 1.0).normalize(),
    );
    assert!(scene.arrows.len() >= 100, "{}", scene.arrows.len());
    let mut scale = None;
    let mut mean = Vector3::zeros();
    for a in &scene.arrows {
        let n = a.from.coords.normalize();
        mean += n;
        let expected = m * n;
        let k = *scale.get_or_insert((a.to - a.from).norm() / expected.norm());
        assert!(((a.to - a.from) - expected * k).norm() < 1e-9 * (1.0 + k * expected.norm()));
        let colour = if expected.dot(&n) >= 0.0 {
            style::TENSION
        } else {
            style::COMPRESSION
        };
        assert_eq!(a.color.with_alpha(255), colour);
    }
    assert!((mean / scene.arrows.len() as f64).norm() < 0.02);
}

/// The traction ellipsoid's vertices lie on Σ (x·dᵢ / aᵢ)² = 1 with semi-axes aᵢ = |σᵢ| × the
/// arrow scale along the principal directions dᵢ, both taken from nalgebra's symmetric eigen
/// solver (a reference library, not the program's own solver).
#[test]
fn ellipsoid_vertices_lie_on_the_surface_with_semi_axes_the_principal_magnitudes() {
    let t = demo_tensor();
    let scene = Scene::build(
        &input(&t, only(|l| l.ellipsoid = true)),
        &Vector3::new(1.0, 1.0, 1.0).normalize(),
    );
    let eigen = nalgebra::SymmetricEigen::new(t.matrix_pa());
    let mesh = &scene.meshes[0];
    for v in &mesh.vertices {
        let sum: f64 = (0..3)
            .map(|i| {
                let d = eigen.eigenvectors.column(i);
                let a = eigen.eigenvalues[i].abs() * scene.arrow_scale_per_pa;
                (v.coords.dot(&d) / a).powi(2)
            })
            .sum();
        assert!((sum - 1.0).abs() < 1e-9, "{v}: {sum}");
    }
}

#[test]
fn a_marked_plane_is_drawn_named_and_in_the_key() {
    // The Fatigue tab's critical plane: its outline lies in the plane through the centre, its
    // name is a label at the tip of its normal, and the key names it.
    let t = demo_tensor();
    let n = PlaneNormal::from_vector(Vector3::new(0.0, 0.6, 0.8)).unwrap();
    let plain = Scene::build(
        &input(&t, only(|l| l.legend = true)),
        &Vector3::new(1.0, 1.0, 1.0),
    );
    let marked = Scene::build(
        &SceneInput {
            marked_plane: Some((n, "Findley critical plane")),
            ..input(&t, only(|l| l.legend = true))
        },
        &Vector3::new(1.0, 1.0, 1.0),
    );
    let added = &marked.segments[plain.segments.len()..];
    assert!(!added.is_empty());
    for s in added {
        assert!(s.a.coords.dot(&n.vector()).abs() < 1e-9);
        assert!(s.b.coords.dot(&n.vector()).abs() < 1e-9);
    }
    assert!(
        marked
            .labels
            .iter()
            .any(|l| l.text == "Findley critical plane")
    );
    assert!(
        marked
            .legend
            .as_ref()
            .unwrap()
            .entries
            .iter()
            .any(|e| e.text.starts_with("Findley critical plane"))
    );
}
