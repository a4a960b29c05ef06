//! The critical plane: the plane whose history scores worst, found by a coarse sweep of the
//! hemisphere of normals refined by a compass search on the sphere from the best cells.
//!
//! A plane and its flipped normal are the same plane, so normals are reported with z ≥ 0 (the
//! upward normal of the dip/dip-direction convention). A history has no principal frame that
//! holds for every step, so unlike the static search this one cannot reduce to an octant.

use nalgebra::Vector3;

use super::circle::PathMethod;
use super::criteria::{Constants, PlaneValue, evaluate};
use super::history::{PlaneAxes, PlanePath, StressHistory, hydrostatic_pa};
use crate::mechanics::PlaneNormal;
use crate::mechanics::stereonet::{OrientationMap, orientation_map_of};

/// How finely the hemisphere is searched.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SearchSettings {
    /// Spacing of the coarse sweep, degrees (between rings and along each ring).
    pub coarse_step_deg: f64,
    /// How many of the best coarse normals are refined.
    pub starts: usize,
    /// The compass search stops when its step is below this, degrees.
    pub tolerance_deg: f64,
}

impl Default for SearchSettings {
    fn default() -> Self {
        Self {
            coarse_step_deg: 10.0,
            starts: 4,
            tolerance_deg: 0.01,
        }
    }
}

/// A score compared first on `.0`, then (when `.0` ties to round-off) on `.1`.
type Score = (f64, f64);

fn better(a: Score, b: Score, scale: f64) -> bool {
    let tie = 1e-12 * scale.max(f64::MIN_POSITIVE);
    if a.0 > b.0 + tie {
        true
    } else if a.0 >= b.0 - tie {
        a.1 > b.1 + tie
    } else {
        false
    }
}

/// Upward unit normals of the coarse sweep: the pole, then rings every `step` degrees from it
/// with about 360 sin θ / step normals each (the horizontal ring only over half a turn, since
/// its normals' opposites are the same planes).
#[must_use]
pub fn sweep(step_deg: f64) -> Vec<Vector3<f64>> {
    let step = step_deg.clamp(0.5, 45.0);
    let mut out = vec![Vector3::z()];
    let rings = (90.0 / step).round().max(1.0) as usize;
    for ring in 1..=rings {
        let theta = (90.0 * ring as f64 / rings as f64).to_radians();
        let turn = if ring == rings { 180.0 } else { 360.0 };
        let count = ((turn * theta.sin() / step).round() as usize).max(1);
        for j in 0..count {
            let phi = (turn * j as f64 / count as f64).to_radians();
            out.push(Vector3::new(
                theta.sin() * phi.cos(),
                theta.sin() * phi.sin(),
                theta.cos(),
            ));
        }
    }
    out
}

/// The best normal for `score` (larger is worse for the part), with its score and the number of
/// planes evaluated. `scale` sets the round-off tolerance of ties.
pub fn search<F: FnMut(&Vector3<f64>) -> Score>(
    settings: &SearchSettings,
    scale: f64,
    mut score: F,
) -> (Vector3<f64>, Score, usize) {
    let coarse = sweep(settings.coarse_step_deg);
    let mut scored: Vec<(Vector3<f64>, Score)> = coarse.iter().map(|n| (*n, score(n))).collect();
    let mut evaluations = scored.len();
    scored.sort_by(|a, b| b.1.0.total_cmp(&a.1.0).then(b.1.1.total_cmp(&a.1.1)));
    let mut best = scored[0];
    for &(start, start_score) in scored.iter().take(settings.starts.max(1)) {
        let (n, s, used) = refine(start, start_score, settings, scale, &mut score);
        evaluations += used;
        if better(s, best.1, scale) {
            best = (n, s);
        }
    }
    let n = if best.0.z < 0.0 { -best.0 } else { best.0 };
    (n, best.1, evaluations)
}

fn refine<F: FnMut(&Vector3<f64>) -> Score>(
    mut n: Vector3<f64>,
    mut s: Score,
    settings: &SearchSettings,
    scale: f64,
    score: &mut F,
) -> (Vector3<f64>, Score, usize) {
    let mut step = 0.5 * settings.coarse_step_deg;
    let mut used = 0;
    while step >= settings.tolerance_deg {
        let axes = PlaneAxes::of(n);
        let h = step.to_radians().tan();
        let mut moved = false;
        for d in [axes.a, -axes.a, axes.b, -axes.b] {
            let trial = (n + h * d).normalize();
            let t = score(&trial);
            used += 1;
            if better(t, s, scale) {
                n = trial;
                s = t;
                moved = true;
                break;
            }
        }
        if !moved {
            step *= 0.5;
        }
    }
    (n, s, used)
}

/// The criterion's critical plane of a history.
#[derive(Clone, Debug, PartialEq)]
pub struct CriticalPlane {
    /// Upward unit normal (z ≥ 0).
    pub normal: [f64; 3],
    /// Dip and dip direction, degrees.
    pub dip_deg: f64,
    /// Dip direction, degrees clockwise from north (y).
    pub dip_direction_deg: f64,
    /// The plane's in-plane axes (the shear path is drawn in them).
    pub axes: PlaneAxes,
    /// The criterion on that plane.
    pub value: PlaneValue,
    /// Value ÷ limit.
    pub utilization: f64,
    /// Planes evaluated by the search.
    pub evaluations: usize,
}

impl CriticalPlane {
    /// Limit ÷ value: the factor the whole history could be scaled by to reach the limit (the
    /// criteria are linear in the stresses); `None` when the value is not positive.
    #[must_use]
    pub fn factor_of_safety(&self) -> Option<f64> {
        (self.utilization > 0.0).then(|| 1.0 / self.utilization)
    }
}

/// What a plane scores: the value, or (Matake, McDiarmid) the shear amplitude first and the
/// value on ties.
fn plane_score(constants: &Constants, v: &PlaneValue) -> Score {
    if constants.criterion.plane_of_largest_shear() {
        (v.tau_amplitude_pa, v.value_pa)
    } else {
        (v.value_pa, v.tau_amplitude_pa)
    }
}

/// Everything a plane's evaluation needs, with its buffers.
struct Evaluator<'a> {
    history: &'a StressHistory,
    constants: &'a Constants,
    method: PathMethod,
    hydrostatic: Vec<f64>,
    path: PlanePath,
}

impl<'a> Evaluator<'a> {
    fn new(history: &'a StressHistory, constants: &'a Constants, method: PathMethod) -> Self {
        Self {
            history,
            constants,
            method,
            hydrostatic: hydrostatic_pa(history),
            path: PlanePath::default(),
        }
    }

    fn at(&mut self, n: &Vector3<f64>) -> PlaneValue {
        self.path.fill(self.history, &PlaneAxes::of(*n));
        evaluate(self.constants, self.method, &self.path, &self.hydrostatic)
    }
}

/// Searches the critical plane of `history` under `constants`' criterion.
#[must_use]
pub fn critical_plane(
    history: &StressHistory,
    constants: &Constants,
    method: PathMethod,
    settings: &SearchSettings,
) -> CriticalPlane {
    let mut ev = Evaluator::new(history, constants, method);
    // Matake and McDiarmid read their value on the plane of largest τa, which is flat there
    // (second order in the plane's error) while σn is not (first order): their search goes on
    // to 1e-4° so that the value is good to about 1e-6.
    let tight = SearchSettings {
        tolerance_deg: settings.tolerance_deg.min(1e-4),
        ..*settings
    };
    let settings = if constants.criterion.plane_of_largest_shear() {
        &tight
    } else {
        settings
    };
    let (n, _, evaluations) = search(settings, history.scale_pa(), |n| {
        let v = ev.at(n);
        plane_score(constants, &v)
    });
    let value = ev.at(&n);
    let (dip_deg, dip_direction_deg) =
        PlaneNormal::from_vector(n).map_or((0.0, 0.0), |p| p.dip_deg());
    CriticalPlane {
        normal: [n.x, n.y, n.z],
        dip_deg,
        dip_direction_deg,
        axes: PlaneAxes::of(n),
        value,
        utilization: value.value_pa / constants.limit_pa,
        evaluations,
    }
}

/// The criterion's value ÷ limit on every plane, as an orientation map of `size` cells a side.
#[must_use]
pub fn utilization_map(
    history: &StressHistory,
    constants: &Constants,
    method: PathMethod,
    size: usize,
) -> OrientationMap {
    let mut ev = Evaluator::new(history, constants, method);
    orientation_map_of(size, |pole| Some(ev.at(pole).value_pa / constants.limit_pa))
}

/// The criterion's value on the plane of unit normal `n`.
#[must_use]
pub fn value_on(
    history: &StressHistory,
    constants: &Constants,
    method: PathMethod,
    n: &Vector3<f64>,
) -> PlaneValue {
    Evaluator::new(history, constants, method).at(n)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_sweep_covers_the_hemisphere_evenly() {
        let normals = sweep(10.0);
        assert!(
            normals
                .iter()
                .all(|n| (n.norm() - 1.0).abs() < 1e-12 && n.z >= -1e-12)
        );
        // Every upward unit vector is within ~ one step of a swept normal (either sign).
        let mut worst = 0.0_f64;
        for i in 0..=30 {
            for j in 0..72 {
                let (t, p) = (
                    (3.0 * f64::from(i)).to_radians(),
                    (5.0 * f64::from(j)).to_radians(),
                );
                let v = Vector3::new(t.sin() * p.cos(), t.sin() * p.sin(), t.cos());
                let nearest = normals
                    .iter()
                    .map(|n| n.dot(&v).abs().min(1.0).acos().to_degrees())
                    .fold(f64::INFINITY, f64::min);
                worst = worst.max(nearest);
            }
        }
        assert!(worst < 10.0, "farthest direction {worst}°");
    }

    #[test]
    fn the_search_finds_a_smooth_maximum_to_its_tolerance() {
        let target = Vector3::new(0.3, -0.5, 0.8).normalize();
        let settings = SearchSettings::default();
        let (n, s, _) = search(&settings, 1.0, |n| (n.dot(&target).abs(), 0.0));
        assert!(n.dot(&target).acos().to_degrees() < 0.05, "{n:?}");
        assert!(s.0 > 1.0 - 1e-6);
    }
}
