//! The equal-area projection and the orientation map.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

mod common;

use planewise::mechanics::search::{Measure, SearchSettings, worst_plane};
use planewise::mechanics::stereonet::{orientation_map, pole_at, project_pole};
use planewise::mechanics::{PlaneNormal, SignConvention, StressTensor};
use proptest::prelude::*;

proptest! {
    #![proptest_config(ProptestConfig::with_cases(1000))]

    /// Lambert's azimuthal projection preserves area: the inverse map from the unit disc to the
    /// lower hemisphere has a constant area factor 2π / π = 2 (Snyder, Map Projections — A
    /// Working Manual, USGS PP 1395, 1987, §24: the projection is equal-area).
    #[test]
    fn inverse_projection_has_constant_area_factor(r in 0.0..0.95_f64, a in 0.0..std::f64::consts::TAU) {
        let (x, y) = (r * a.cos(), r * a.sin());
        let h = 1e-6;
        let px = (pole_at(x + h, y).unwrap() - pole_at(x - h, y).unwrap()) / (2.0 * h);
        let py = (pole_at(x, y + h).unwrap() - pole_at(x, y - h).unwrap()) / (2.0 * h);
        let factor = px.cross(&py).norm();
        prop_assert!((factor - 2.0).abs() < 1e-6, "area factor {factor}");
    }

    /// Projecting a pole and mapping it back gives the same plane.
    #[test]
    fn projection_round_trips(v in prop::array::uniform3(-1.0..1.0_f64)) {
        prop_assume!(nalgebra::Vector3::from(v).norm() > 1e-3);
        let n = PlaneNormal::from_vector(v.into()).unwrap();
        let [x, y] = project_pole(&n);
        let r = x.hypot(y);
        prop_assert!(r <= 1.0 + 1e-12);
        let scale = if r > 1.0 { 1.0 / r } else { 1.0 };
        let p = pole_at(x * scale, y * scale).unwrap();
        prop_assert!((p.dot(&n.vector()).abs() - 1.0).abs() < 1e-10);
        prop_assert!(p.z <= 0.0, "lower hemisphere");
    }
}

#[test]
fn map_never_exceeds_the_worst_plane_and_comes_close_to_it() {
    let t = StressTensor::from_pa([-20e6, -40e6, -50e6, 5e6, -3e6, 8e6]).unwrap();
    for measure in [
        Measure::Shear,
        Measure::SlipTendency,
        Measure::Traction,
        Measure::NormalMax,
    ] {
        let s = SearchSettings {
            measure,
            convention: SignConvention::CompressionPositive,
            pore_pressure_pa: 5e6,
            material: None,
        };
        let worst = worst_plane(&t, &s).unwrap().value.unwrap();
        let map = orientation_map(&t, &s, 256);
        let (_, hi) = map.range.unwrap();
        assert!(
            hi <= worst * (1.0 + 1e-12),
            "{measure:?}: map {hi} above worst {worst}"
        );
        assert!(
            hi >= worst * 0.99,
            "{measure:?}: map {hi} far below worst {worst}"
        );
        let inside = map.values.iter().filter(|v| v.is_some()).count();
        // The disc fills π/4 of the square.
        let expected = std::f64::consts::FRAC_PI_4 * 256.0 * 256.0;
        assert!((inside as f64 - expected).abs() < 0.01 * expected);
    }
}

#[test]
fn map_command_writes_a_figure_and_rejects_bad_input() {
    let dir = std::env::temp_dir().join(format!("planewise-map-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let out = dir.join("map.png");
    let run = common::planewise;
    let o = run(&[
        "map",
        "--stress",
        "xx=20,yy=40,zz=50",
        "--compression-positive",
        "--measure",
        "slip-tendency",
        "--out",
        out.to_str().unwrap(),
        "--size",
        "400x300",
        "--resolution",
        "64",
    ]);
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let bytes = std::fs::read(&out).unwrap();
    assert_eq!(u32::from_be_bytes(bytes[16..20].try_into().unwrap()), 400);
    let o = run(&[
        "map",
        "--stress",
        "xx=1",
        "--measure",
        "shear",
        "--out",
        out.to_str().unwrap(),
        "--resolution",
        "5",
    ]);
    assert_eq!(o.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&o.stderr).contains("--resolution"));
    let svg = dir.join("map.svg");
    let o = run(&[
        "map",
        "--stress",
        "xx=1,yy=2",
        "--measure",
        "shear",
        "--out",
        svg.to_str().unwrap(),
        "--resolution",
        "32",
    ]);
    assert!(o.status.success());
    let text = std::fs::read_to_string(&svg).unwrap();
    assert!(text.contains("data:image/png;base64,"));
    resvg::usvg::Tree::from_str(&text, &resvg::usvg::Options::default()).unwrap();
    let _ = std::fs::remove_dir_all(&dir);
}
