//! The Mohr diagram: the way from a point back to a plane (against published closed forms and
//! as a law on random states), the figure's layout, and `planewise mohr`.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

mod common;

use nalgebra::{Matrix3, Rotation3, Vector3};
use planewise::mechanics::criteria::MohrCoulomb;
use planewise::mechanics::mohr::MohrCircles;
use planewise::mechanics::{PlaneNormal, SignConvention, StressTensor, StressUnit};
use planewise::picture::draw::Sizes;
use planewise::picture::draw::mohr::{Envelope, MohrFigure, MohrLayout, MohrPoint, mohr_frame};
use proptest::prelude::*;

fn mpa(c: [f64; 6]) -> StressTensor {
    StressTensor::from_components(c, StressUnit::MPa, 1.0).unwrap()
}

/// A state with distinct principal values 80, 20, −50 MPa in a turned frame (invented numbers).
fn turned() -> StressTensor {
    let q = Rotation3::from_euler_angles(0.3, -0.7, 1.1).into_inner();
    let s = q * Matrix3::from_diagonal(&Vector3::new(80e6, 20e6, -50e6)) * q.transpose();
    StressTensor::from_matrix_pa(&s).unwrap()
}

#[test]
fn the_octahedral_point_gives_equal_direction_cosines() {
    // The octahedral plane (equal direction cosines 1/√3 in the principal frame) carries
    // σ_oct = (σ1 + σ2 + σ3)/3 and τ_oct = ⅓ √((σ1 − σ2)² + (σ2 − σ3)² + (σ3 − σ1)²)
    // (Timoshenko & Goodier, Theory of Elasticity, 3rd ed., 1970, §77).
    let t = turned();
    let m = MohrCircles::new(&t, SignConvention::TensionPositive);
    let [s1, s2, s3]: [f64; 3] = [80e6, 20e6, -50e6];
    let oct_n = (s1 + s2 + s3) / 3.0;
    let oct_t = ((s1 - s2).powi(2) + (s2 - s3).powi(2) + (s3 - s1).powi(2)).sqrt() / 3.0;
    let a = m.cosines_at(oct_n, oct_t, [1.0, 1.0, 1.0]).unwrap();
    for v in a {
        assert!((v - 1.0 / 3.0).abs() < 1e-9, "{a:?}");
    }
    assert!(m.is_admissible(oct_n, oct_t, 1e-12));
}

#[test]
fn the_top_of_the_outer_circle_is_the_maximum_shear_plane() {
    // τ_max = (σ1 − σ3)/2 acts on planes with normals (n1 ± n3)/√2, at σn = (σ1 + σ3)/2
    // (common practice, no source).
    let t = turned();
    let m = MohrCircles::new(&t, SignConvention::TensionPositive);
    let outer = m.outer();
    assert!((outer.centre_pa - 15e6).abs() < 1e-6 && (outer.radius_pa - 65e6).abs() < 1e-6);
    let [d1, _, d3] = m.directions;
    let near = PlaneNormal::from_vector(d1 + d3).unwrap();
    let n = m.plane_at(outer.centre_pa, outer.radius_pa, near).unwrap();
    assert!(
        (n.vector() - near.vector()).norm() < 1e-6,
        "{:?}",
        n.vector()
    );
}

#[test]
fn compression_positive_mirrors_the_diagram() {
    let t = turned();
    let tp = MohrCircles::new(&t, SignConvention::TensionPositive);
    let cp = MohrCircles::new(&t, SignConvention::CompressionPositive);
    for (got, want) in cp.principal_pa.iter().zip([50e6, -20e6, -80e6]) {
        assert!((got - want).abs() < 1e-6, "{:?}", cp.principal_pa);
    }
    let n = PlaneNormal::from_vector(Vector3::new(0.2, 0.5, -0.8)).unwrap();
    let (a, b) = (tp.point(&t, n), cp.point(&t, n));
    assert!((a.0 + b.0).abs() < 1e-6 && (a.1 - b.1).abs() < 1e-6);
    // The envelope's strength depends on the compressive normal stress whichever way it is shown.
    let env = Envelope {
        material: MohrCoulomb::new(5e6, 30.0).unwrap(),
        pore_pressure_pa: 1e6,
    };
    let tan30 = 30f64.to_radians().tan();
    let expected = 5e6 + (20e6 - 1e6) * tan30;
    assert!(
        (env.shear_strength_pa(-20e6, SignConvention::TensionPositive) - expected).abs() < 1e-6
    );
    assert!(
        (env.shear_strength_pa(20e6, SignConvention::CompressionPositive) - expected).abs() < 1e-6
    );
}

fn figure_for(t: &StressTensor, envelope: Option<Envelope>) -> MohrFigure {
    let circles = MohrCircles::new(t, SignConvention::TensionPositive);
    MohrFigure {
        circles,
        unit: StressUnit::MPa,
        plane: Some(MohrPoint::of_plane(
            &circles,
            t,
            PlaneNormal::X,
            "cut plane",
        )),
        worst: Vec::new(),
        worst_label: String::new(),
        envelope,
        notes: Vec::new(),
    }
}

#[test]
fn the_layout_keeps_circles_round_and_everything_in_the_plot() {
    let t = turned();
    let fig = figure_for(&t, None);
    for (w, h) in [(1200.0, 800.0), (500.0, 900.0), (1600.0, 300.0)] {
        let l = MohrLayout::new(&fig, w, h, Sizes::for_export(w, h));
        let outer = fig.circles.outer();
        let c = l.to_px(outer.centre_pa, 0.0);
        let right = l.to_px(outer.centre_pa + outer.radius_pa, 0.0);
        let top = l.to_px(outer.centre_pa, outer.radius_pa);
        // Same scale on both axes.
        assert!(((right[0] - c[0]) - (c[1] - top[1])).abs() < 0.01);
        for p in [l.to_px(-50e6, 0.0), l.to_px(80e6, 0.0), top] {
            assert!(l.contains(p), "{p:?} outside {:?} for {w}x{h}", l.plot);
        }
        // Pixel positions map back to stresses.
        let (sn, tau) = l.from_px(top);
        assert!((sn - outer.centre_pa).abs() < 1e-3 * outer.radius_pa);
        assert!((tau - outer.radius_pa).abs() < 1e-3 * outer.radius_pa);
    }
    // A hydrostatic state (one point) still gets a usable layout.
    let h = mpa([5.0, 5.0, 5.0, 0.0, 0.0, 0.0]);
    let l = MohrLayout::new(&figure_for(&h, None), 800.0, 600.0, Sizes::default());
    assert!(l.px_per_pa.is_finite() && l.px_per_pa > 0.0);
    assert!(l.contains(l.to_px(5e6, 0.0)));
}

#[test]
fn the_envelope_is_drawn_only_when_a_material_is_set() {
    let t = turned();
    let colour = planewise::picture::draw::mohr::ENVELOPE.hex();
    let without = planewise::picture::draw::svg::to_svg(
        &mohr_frame(&figure_for(&t, None), 900, 600, Sizes::default()),
        "",
    );
    assert!(!without.contains(&colour));
    let env = Envelope {
        material: MohrCoulomb::new(10e6, 35.0).unwrap(),
        pore_pressure_pa: 0.0,
    };
    let with = planewise::picture::draw::svg::to_svg(
        &mohr_frame(&figure_for(&t, Some(env)), 900, 600, Sizes::default()),
        "",
    );
    assert!(with.contains(&colour), "no envelope line");
    assert!(with.contains("Mohr circles: σ1 = 80 MPa"), "title");
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(1000))]

    /// Every plane's point is admissible, and the plane found from its point (on the same side
    /// of each principal direction) carries the same (σn, τ): the direction-cosine formulas of
    /// Jaeger, Cook & Zimmerman (Fundamentals of Rock Mechanics, 4th ed., 2007, §2.7) invert
    /// the traction law.
    #[test]
    fn a_point_leads_back_to_a_plane_with_that_point(
        c in prop::array::uniform6(-1.0..1.0_f64),
        v in prop::array::uniform3(-1.0..1.0_f64),
        k in -3.0..9.0_f64,
        compression_positive in any::<bool>(),
    ) {
        prop_assume!(Vector3::from(v).norm() > 1e-3);
        let m = 10f64.powf(k);
        let t = StressTensor::from_pa(c.map(|x| x * m)).unwrap();
        let convention = if compression_positive {
            SignConvention::CompressionPositive
        } else {
            SignConvention::TensionPositive
        };
        let circles = MohrCircles::new(&t, convention);
        let n = PlaneNormal::from_vector(Vector3::from(v)).unwrap();
        let (sn, tau) = circles.point(&t, n);
        prop_assert!(circles.is_admissible(sn, tau, 1e-9));
        let back = circles.plane_at(sn, tau, n).unwrap();
        let (sn2, tau2) = circles.point(&t, back);
        let scale = circles.principal_pa.iter().fold(0.0_f64, |a, b| a.max(b.abs()));
        prop_assert!((sn - sn2).abs() <= 1e-6 * scale, "σn {sn} vs {sn2}");
        prop_assert!((tau - tau2).abs() <= 1e-6 * scale, "τ {tau} vs {tau2}");
    }
}

#[test]
fn cli_writes_svg_and_png() {
    let dir = std::env::temp_dir().join(format!("planewise-mohr-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let svg = dir.join("mohr.svg");
    let out = common::planewise(&[
        "mohr",
        "--stress",
        "xx=120,yy=-35,zz=15,xy=48,yz=-12,zx=22",
        "--normal",
        "1,0.5,0",
        "--measure",
        "mohr-coulomb",
        "--cohesion",
        "10",
        "--friction-angle",
        "30",
        "--out",
        svg.to_str().unwrap(),
    ]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = std::fs::read_to_string(&svg).unwrap();
    assert!(text.contains("Mohr circles"));
    assert!(text.contains("cut plane"));
    // σ1 = 136 MPa of tension is beyond the envelope's apex (c / tan φ = 17.3 MPa): the worst
    // planes are those without frictional capacity, and the key says so.
    // The key's lines are wrapped to the figure's width: read its words in order.
    let words: Vec<&str> = text
        .split("</text>")
        .filter_map(|t| t.rsplit_once('>').map(|(_, w)| w))
        .collect();
    assert!(
        words
            .join(" ")
            .contains("worst planes (mohr-coulomb: effective tension"),
        "{words:?}"
    );
    assert!(text.contains(&planewise::picture::draw::mohr::ENVELOPE.hex()));
    let png = dir.join("mohr.png");
    let out = common::planewise(&[
        "mohr",
        "--stress",
        "xx=10,yy=-20",
        "--size",
        "320x200",
        "--out",
        png.to_str().unwrap(),
    ]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let bytes = std::fs::read(&png).unwrap();
    assert_eq!(&bytes[1..4], b"PNG");
    assert_eq!(u32::from_be_bytes(bytes[16..20].try_into().unwrap()), 320);
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn cli_bad_input() {
    common::assert_bad_input(
        "mohr",
        &[
            (
                &["--stress", "xx=1", "--out", "m.svg", "--measure", "wobble"],
                "--measure",
            ),
            (
                &["--stress", "xx=1", "--out", "m.svg", "--cohesion", "3"],
                "--friction-angle",
            ),
            (
                &[
                    "--stress",
                    "xx=1",
                    "--out",
                    "m.svg",
                    "--measure",
                    "mohr-coulomb",
                ],
                "--measure",
            ),
            (&["--stress", "xx=1", "--out", "m.txt"], "--out"),
            (
                &["--stress", "xx=1", "--out", "m.svg", "--normal", "0,0,0"],
                "--normal",
            ),
            (
                &["--stress", "xx=1", "--out", "m.svg", "--size", "10x10"],
                "--size",
            ),
            (&["--stress", "xx=nan", "--out", "m.svg"], "--stress"),
        ],
    );
}

/// The σn tick labels of a Mohr frame: the small texts centred below the plot.
fn tick_labels(figure: &MohrFigure) -> Vec<String> {
    let frame = mohr_frame(figure, 1200, 800, Sizes::default());
    let mut ticks: Vec<(f32, String)> = frame
        .prims
        .iter()
        .filter_map(|p| match p {
            planewise::picture::draw::Prim::Text {
                at, text, anchor, ..
            } if *anchor == planewise::picture::draw::Anchor::Center
                && planewise::text::parse::number(text).is_ok() =>
            {
                Some((at[0], text.replace('−', "-")))
            }
            _ => None,
        })
        .collect();
    ticks.sort_by(|a, b| a.0.total_cmp(&b.0));
    ticks.into_iter().map(|(_, t)| t).collect()
}

#[test]
fn ticks_are_round_in_the_users_unit_and_tell_neighbours_apart() {
    // 1, 2 or 5 × 10^k steps in psi (common practice for axis ticks, no source).
    let t = StressTensor::from_components(
        [4500.0, -1300.0, 700.0, 900.0, 0.0, 0.0],
        StressUnit::Psi,
        1.0,
    )
    .unwrap();
    let mut figure = figure_for(&t, None);
    figure.unit = StressUnit::Psi;
    let labels = tick_labels(&figure);
    assert!(labels.len() >= 4, "{labels:?}");
    let values: Vec<f64> = labels.iter().map(|l| l.parse().unwrap()).collect();
    let step = values[1] - values[0];
    let mantissa = step / 10f64.powf(step.log10().floor());
    assert!(
        [1.0, 2.0, 5.0].iter().any(|m| (mantissa - m).abs() < 1e-9),
        "step {step} in {labels:?}"
    );
    for v in &values {
        assert!(
            ((v / step) - (v / step).round()).abs() < 1e-9,
            "{v} is not a multiple of {step}"
        );
    }
    // A hydrostatic state and a state whose circles are tiny next to the mean: no two
    // neighbouring labels alike.
    for c in [
        [-100.0, -100.0, -100.0, 0.0, 0.0, 0.0],
        [100.0, 100.01, 99.99, 0.0, 0.0, 0.0],
    ] {
        let labels = tick_labels(&figure_for(&mpa(c), None));
        assert!(labels.len() >= 2, "{c:?}: {labels:?}");
        for w in labels.windows(2) {
            assert_ne!(w[0], w[1], "{c:?}: {labels:?}");
        }
    }
}

#[test]
fn the_mohr_figure_writes_the_cut_plane_values_and_whether_the_envelope_is_crossed() {
    // Uniaxial compression 100 MPa against c = 10 MPa, φ = 30°: the uniaxial compressive
    // strength 2c cos φ / (1 − sin φ) = 34.64 MPa is exceeded (Labuz & Zang 2012), so the largest
    // circle crosses the envelope; at 20 MPa it does not.
    let dir = std::env::temp_dir().join(format!("planewise-mohr-cross-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    for (stress, crosses) in [("xx=-100", true), ("xx=-20", false)] {
        let out = dir.join("m.svg");
        let r = common::planewise(&[
            "mohr",
            "--stress",
            stress,
            "--normal",
            "1,0,0",
            "--cohesion",
            "10",
            "--friction-angle",
            "30",
            "--out",
            out.to_str().unwrap(),
        ]);
        assert!(r.status.success(), "{}", String::from_utf8_lossy(&r.stderr));
        let svg = std::fs::read_to_string(&out).unwrap();
        assert_eq!(
            svg.contains("the largest circle crosses it"),
            crosses,
            "{stress}"
        );
        assert_eq!(svg.contains("no circle reaches it"), !crosses, "{stress}");
        // The cut plane (the x face) carries σn = σxx and no shear.
        // Figures write a true minus sign.
        let sxx = stress.trim_start_matches("xx=").replace('-', "−");
        assert!(
            svg.contains(&format!("● cut plane: σn = {sxx} MPa, τ = 0 MPa")),
            "{stress}"
        );
    }
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn tick_labels_stay_apart_in_a_narrow_picture() {
    // The demo-like state of the window at 1024 × 640 drew "−100−80−60−40" as one word. At
    // every width from a thumbnail up, neighbouring σn tick labels (the numbers centred under
    // the plot) keep a gap.
    let figure = figure_for(&mpa([153.9, 17.0, -61.8, 0.0, 0.0, 0.0]), None);
    for width in [300, 360, 420, 480, 560, 700, 900, 1200] {
        let frame = mohr_frame(&figure, width, width * 2 / 3, Sizes::default());
        let mut boxes: Vec<_> = planewise::picture::draw::place::text_boxes(&frame)
            .into_iter()
            .filter(|(text, _)| planewise::text::parse::number(text).is_ok())
            .collect();
        // The σn ticks are the lowest row of numbers (the τ ticks stand in a column).
        let row = boxes.iter().map(|(_, r)| r.min[1]).fold(f32::MIN, f32::max);
        boxes.retain(|(_, r)| (r.min[1] - row).abs() < 1.0);
        boxes.sort_by(|a, b| a.1.min[0].total_cmp(&b.1.min[0]));
        assert!(boxes.len() >= 2, "{width}: {boxes:?}");
        for pair in boxes.windows(2) {
            assert!(
                pair[1].1.min[0] - pair[0].1.max[0] >= 4.0,
                "{width} px: {:?} and {:?} touch",
                pair[0].0,
                pair[1].0
            );
        }
    }
}
