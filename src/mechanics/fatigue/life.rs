//! Finite life on the critical plane (Findley's parameter, rainflow, Basquin, Palmgren–Miner).
//!
//! On a plane the shear path τ(t) is two-dimensional, and rainflow counts a scalar. So the path
//! is resolved on directions in the plane every 15° over half a turn (τ_d(t) = τ(t)·d; the other
//! half turn gives the same cycles with opposite sign), each resolved history is rainflow
//! counted (ASTM E1049-85), and every cycle gets Findley's parameter
//! P = τa + k·σn,max, with σn,max the largest normal stress on the plane between the cycle's two
//! reversals: the criterion's own mean-stress term. P is turned into the fully reversed torsion
//! amplitude that has the same parameter, τeq = P / √(1 + k²) (fully reversed torsion τa gives
//! P = τa √(1 + k²) on its critical plane; see criteria.rs), and the torsion S–N curve in
//! Basquin's form τa = τ'f (2N)^b gives the cycles to failure N. Miner's sum over the cycles is
//! the damage of one repeat of the history; the life is 1/D repeats. The plane's damage is the
//! largest over its directions, and the critical plane is the plane of largest damage.
//!
//! With an endurance limit, cycles whose τeq is below it do no damage (a cut-off: unconservative
//! under variable amplitude, where cycles below the limit can still grow a crack); without one,
//! Basquin's line is followed to every amplitude.

use nalgebra::Vector3;

use super::critical::{SearchSettings, search};
use super::history::{PlaneAxes, PlanePath, StressHistory};
use super::rainflow;
use crate::mechanics::PlaneNormal;
use crate::mechanics::stereonet::{OrientationMap, orientation_map_of};

/// A torsion S–N curve: τa = τ'f (2N)^b, with an optional endurance limit.
#[derive(Clone, Copy, Debug, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct SnCurve {
    /// Fatigue strength coefficient τ'f, Pa.
    pub coefficient_pa: f64,
    /// Fatigue strength exponent b (negative).
    pub exponent: f64,
    /// Shear amplitude below which cycles do no damage, Pa.
    pub endurance_pa: Option<f64>,
}

/// Why an S–N curve cannot be used.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SnError {
    /// Coefficient not positive.
    #[error("the S–N coefficient τ'f must be a positive stress")]
    Coefficient,
    /// Exponent not negative.
    #[error("the S–N exponent b must be negative (it is {0})")]
    Exponent(f64),
    /// Endurance limit not positive.
    #[error("the endurance limit must be a positive stress")]
    Endurance,
}

impl SnCurve {
    /// Checks the curve.
    pub fn new(
        coefficient_pa: f64,
        exponent: f64,
        endurance_pa: Option<f64>,
    ) -> Result<Self, SnError> {
        if !(coefficient_pa.is_finite() && coefficient_pa > 0.0) {
            return Err(SnError::Coefficient);
        }
        if !(exponent.is_finite() && exponent < 0.0) {
            return Err(SnError::Exponent(exponent));
        }
        if let Some(e) = endurance_pa
            && !(e.is_finite() && e > 0.0)
        {
            return Err(SnError::Endurance);
        }
        Ok(Self {
            coefficient_pa,
            exponent,
            endurance_pa,
        })
    }

    /// Cycles to failure at shear amplitude `amplitude_pa` (infinite below the endurance limit
    /// or at zero amplitude).
    #[must_use]
    pub fn cycles_to_failure(&self, amplitude_pa: f64) -> f64 {
        if amplitude_pa <= 0.0 || self.endurance_pa.is_some_and(|e| amplitude_pa < e) {
            return f64::INFINITY;
        }
        0.5 * (amplitude_pa / self.coefficient_pa).powf(1.0 / self.exponent)
    }
}

/// The cycle of one plane that does the most damage.
#[derive(Clone, Copy, Debug, PartialEq, serde::Serialize)]
pub struct WorstCycle {
    /// Step of its first reversal.
    pub from: usize,
    /// Step of its second reversal.
    pub to: usize,
    /// Direction in the plane (degrees from the plane's first axis) it was counted on.
    pub direction_deg: f64,
    /// Shear amplitude, Pa.
    pub amplitude_pa: f64,
    /// Largest normal stress between its reversals, Pa.
    pub sigma_n_max_pa: f64,
    /// Equivalent fully reversed torsion amplitude, Pa.
    pub equivalent_pa: f64,
    /// 1 or ½.
    pub count: f64,
    /// Its damage.
    pub damage: f64,
}

/// Damage of one repeat of the history on one plane.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PlaneDamage {
    /// Miner's sum (the largest over the plane's directions).
    pub damage: f64,
    /// Direction of that sum, degrees from the plane's first axis.
    pub direction_deg: f64,
    /// Its most damaging cycle, if any cycle was counted.
    pub worst: Option<WorstCycle>,
}

/// Largest value over index ranges in O(1) after O(n log n) set-up.
struct RangeMax {
    levels: Vec<Vec<f64>>,
}

impl RangeMax {
    fn new(values: &[f64]) -> Self {
        let mut levels = vec![values.to_vec()];
        let mut width = 1;
        while 2 * width <= values.len() {
            let prev = &levels[levels.len() - 1];
            let next: Vec<f64> = (0..=values.len() - 2 * width)
                .map(|i| prev[i].max(prev[i + width]))
                .collect();
            levels.push(next);
            width *= 2;
        }
        Self { levels }
    }

    /// Largest value over `a..=b` (either order).
    fn max(&self, a: usize, b: usize) -> f64 {
        let (lo, hi) = (a.min(b), a.max(b));
        let level = (usize::BITS - 1 - (hi - lo + 1).leading_zeros()) as usize;
        let row = &self.levels[level];
        row[lo].max(row[hi + 1 - (1 << level)])
    }
}

/// Directions in the plane that the shear path is resolved on, degrees.
pub const DIRECTIONS_DEG: [f64; 12] = [
    0.0, 15.0, 30.0, 45.0, 60.0, 75.0, 90.0, 105.0, 120.0, 135.0, 150.0, 165.0,
];

/// The damage of one repeat of the path on one plane, with Findley coefficient `k`.
#[must_use]
pub fn plane_damage(path: &PlanePath, k: f64, sn: &SnCurve) -> PlaneDamage {
    let normal_max = RangeMax::new(&path.sigma_n);
    let root = k.mul_add(k, 1.0).sqrt();
    let mut best = PlaneDamage {
        damage: 0.0,
        direction_deg: 0.0,
        worst: None,
    };
    let mut resolved = Vec::with_capacity(path.tau.len());
    for direction_deg in DIRECTIONS_DEG {
        let (s, c) = direction_deg.to_radians().sin_cos();
        resolved.clear();
        resolved.extend(path.tau.iter().map(|t| c * t[0] + s * t[1]));
        let mut damage = 0.0;
        let mut worst: Option<WorstCycle> = None;
        for cycle in rainflow::count(&resolved) {
            let sigma_n_max_pa = normal_max.max(cycle.from, cycle.to);
            let amplitude_pa = cycle.amplitude();
            let equivalent_pa = k.mul_add(sigma_n_max_pa, amplitude_pa) / root;
            let d = cycle.count / sn.cycles_to_failure(equivalent_pa);
            damage += d;
            if worst.is_none_or(|w| d > w.damage) {
                worst = Some(WorstCycle {
                    from: cycle.from,
                    to: cycle.to,
                    direction_deg,
                    amplitude_pa,
                    sigma_n_max_pa,
                    equivalent_pa,
                    count: cycle.count,
                    damage: d,
                });
            }
        }
        if damage > best.damage || best.worst.is_none() {
            best = PlaneDamage {
                damage,
                direction_deg,
                worst,
            };
        }
    }
    best
}

/// The plane of largest damage.
#[derive(Clone, Debug, PartialEq)]
pub struct DamagePlane {
    /// Upward unit normal.
    pub normal: [f64; 3],
    /// Dip, degrees.
    pub dip_deg: f64,
    /// Dip direction, degrees.
    pub dip_direction_deg: f64,
    /// The plane's in-plane axes.
    pub axes: PlaneAxes,
    /// Its damage per repeat of the history.
    pub damage: PlaneDamage,
    /// Repeats of the history to failure (`None` when nothing does damage).
    pub life_repeats: Option<f64>,
    /// Planes evaluated.
    pub evaluations: usize,
}

/// Searches the plane of largest damage under Findley's parameter with coefficient `k`.
#[must_use]
pub fn damage_plane(
    history: &StressHistory,
    k: f64,
    sn: &SnCurve,
    settings: &SearchSettings,
) -> DamagePlane {
    let mut path = PlanePath::default();
    let mut at = |n: &Vector3<f64>| {
        path.fill(history, &PlaneAxes::of(*n));
        plane_damage(&path, k, sn)
    };
    // Damages span decades: compare them on a log scale, ties to a relative 1e-9.
    let (n, _, evaluations) = search(settings, 1.0, |n| {
        let d = at(n).damage;
        (if d > 0.0 { d.ln() } else { f64::NEG_INFINITY }, 0.0)
    });
    let damage = at(&n);
    let (dip_deg, dip_direction_deg) =
        PlaneNormal::from_vector(n).map_or((0.0, 0.0), |p| p.dip_deg());
    DamagePlane {
        normal: [n.x, n.y, n.z],
        dip_deg,
        dip_direction_deg,
        axes: PlaneAxes::of(n),
        damage,
        life_repeats: (damage.damage > 0.0).then(|| 1.0 / damage.damage),
        evaluations,
    }
}

/// Damage per repeat on every plane, as an orientation map.
#[must_use]
pub fn damage_map(history: &StressHistory, k: f64, sn: &SnCurve, size: usize) -> OrientationMap {
    let mut path = PlanePath::default();
    orientation_map_of(size, |pole| {
        path.fill(history, &PlaneAxes::of(*pole));
        Some(plane_damage(&path, k, sn).damage)
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn range_max_matches_a_scan() {
        let v: Vec<f64> = (0..37).map(|i| f64::from((i * 17) % 23) - 5.0).collect();
        let r = RangeMax::new(&v);
        for a in 0..v.len() {
            for b in 0..v.len() {
                let (lo, hi) = (a.min(b), a.max(b));
                let scan = v[lo..=hi].iter().copied().fold(f64::NEG_INFINITY, f64::max);
                assert_eq!(r.max(a, b), scan);
            }
        }
    }

    #[test]
    fn basquin_and_its_endurance_limit() {
        // τa = τ'f (2N)^b with τ'f = 1000, b = −0.1: at τa = 500, 2N = 2^10, N = 512
        // (worked by hand).
        let sn = SnCurve::new(1000.0, -0.1, None).unwrap();
        assert!((sn.cycles_to_failure(500.0) - 512.0).abs() < 1e-9);
        let cut = SnCurve::new(1000.0, -0.1, Some(400.0)).unwrap();
        assert!(cut.cycles_to_failure(399.0).is_infinite());
        assert!((cut.cycles_to_failure(500.0) - 512.0).abs() < 1e-9);
        assert!(SnCurve::new(1000.0, 0.1, None).is_err());
    }
}
