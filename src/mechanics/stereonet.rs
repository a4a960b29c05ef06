//! The lower-hemisphere equal-area (Lambert azimuthal, "Schmidt net") projection of plane poles,
//! and orientation maps: a measure evaluated for every plane orientation on that projection.
//!
//! Geographic axes: x = east, y = north, z = up. A plane's pole is its downward unit normal p
//! (p_z ≤ 0). The projection maps it to the unit disc (east right, north up):
//! (X, Y) = (p_x, p_y) / √(1 − p_z), so radius = √2 sin(θ/2) with θ the pole's angle from the
//! nadir (Snyder, Map Projections — A Working Manual, USGS Professional Paper 1395, 1987,
//! §24, eq. 24-2 with the sphere's radius scaled so the equator maps to radius 1). The inverse is
//! p_z = X² + Y² − 1, (p_x, p_y) = (X, Y) √(2 − X² − Y²). Equal area: every patch of the disc
//! covers twice its area of the hemisphere (2π over π).

use nalgebra::Vector3;

use super::search::SearchSettings;
use super::{PlaneNormal, StressTensor};

/// Map coordinates (X east, Y north, in the unit disc) of the pole of the plane with normal `n`
/// (either sign).
#[must_use]
pub fn project_pole(n: &PlaneNormal) -> [f64; 2] {
    let v = n.vector();
    let p = if v.z > 0.0 { -v } else { v };
    let k = 1.0 / (1.0 - p.z).sqrt();
    [p.x * k, p.y * k]
}

/// The downward pole at map point (X, Y), or `None` outside the unit disc.
#[must_use]
pub fn pole_at(x: f64, y: f64) -> Option<Vector3<f64>> {
    let r2 = x * x + y * y;
    // Also refuses NaN.
    if r2.is_nan() || r2 > 1.0 {
        return None;
    }
    let k = (2.0 - r2).sqrt();
    Some(Vector3::new(x * k, y * k, r2 - 1.0))
}

/// A measure on a square grid over the disc.
#[derive(Clone, Debug, PartialEq)]
pub struct OrientationMap {
    /// Cells per side.
    pub size: usize,
    /// Row-major values, row 0 at the top (north); `None` outside the disc or where the measure
    /// is undefined (no capacity, effective tension).
    pub values: Vec<Option<f64>>,
    /// Smallest and largest defined value.
    pub range: Option<(f64, f64)>,
}

/// Evaluates the measure of `settings` for the plane at every cell centre of a `size` × `size`
/// grid over the disc.
#[must_use]
pub fn orientation_map(
    tensor: &StressTensor,
    settings: &SearchSettings,
    size: usize,
) -> OrientationMap {
    let objective = super::search::Objective::new(tensor, settings);
    orientation_map_of(size, |pole| objective.at_normal(pole))
}

/// Evaluates `value` for the pole at every cell centre of a `size` × `size` grid over the disc
/// (`None` where it is undefined).
pub fn orientation_map_of<F: FnMut(&Vector3<f64>) -> Option<f64>>(
    size: usize,
    mut value: F,
) -> OrientationMap {
    let mut values = Vec::with_capacity(size * size);
    let mut range: Option<(f64, f64)> = None;
    let step = 2.0 / size as f64;
    for row in 0..size {
        let y = 1.0 - (row as f64 + 0.5) * step;
        for col in 0..size {
            let x = -1.0 + (col as f64 + 0.5) * step;
            let v = pole_at(x, y).and_then(|pole| value(&pole));
            if let Some(v) = v {
                range = Some(range.map_or((v, v), |(lo, hi)| (lo.min(v), hi.max(v))));
            }
            values.push(v);
        }
    }
    OrientationMap {
        size,
        values,
        range,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn projection_round_trips() {
        for (dip, dd) in [
            (0.0, 0.0),
            (30.0, 45.0),
            (60.0, 90.0),
            (89.0, 300.0),
            (90.0, 180.0),
        ] {
            let n = PlaneNormal::from_dip(dip, dd).unwrap();
            let [x, y] = project_pole(&n);
            assert!(x * x + y * y <= 1.0 + 1e-12);
            let pole = pole_at(x.clamp(-1.0, 1.0), y.clamp(-1.0, 1.0)).unwrap();
            assert!(
                (pole.dot(&n.vector()).abs() - 1.0).abs() < 1e-12,
                "{dip}/{dd}"
            );
        }
        // A horizontal plane's pole is the centre; a vertical plane's pole lies on the rim.
        let [x, y] = project_pole(&PlaneNormal::Z);
        assert!(x.abs() < 1e-15 && y.abs() < 1e-15);
        let [x, y] = project_pole(&PlaneNormal::from_dip(90.0, 90.0).unwrap());
        assert!((x.hypot(y) - 1.0).abs() < 1e-12);
        assert!(pole_at(0.8, 0.8).is_none());
    }
}
