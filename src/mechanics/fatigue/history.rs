//! A stress history at a point, and what it does on one plane: the normal stress σn(t) and the
//! shear vector τ(t) in the plane's own 2-D axes.

use nalgebra::Vector3;

use super::super::tensor::{MAX_STRESS_PA, StressTensor};

/// Why a history cannot be used.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum HistoryError {
    /// Fewer than two steps: nothing changes.
    #[error("a history needs at least two steps (it has {0})")]
    TooShort(usize),
    /// Times that do not increase.
    #[error("step {step}: time {time} does not come after the step before ({before})")]
    TimeNotIncreasing { step: usize, time: f64, before: f64 },
    /// A value that is not a finite number or is beyond any stress.
    #[error("step {step}: {what} is not a usable number ({value})")]
    Unusable {
        step: usize,
        what: &'static str,
        value: f64,
    },
    /// Factor rows that do not match the load cases.
    #[error("step {step}: {got} factors for {cases} load cases")]
    FactorCount {
        step: usize,
        got: usize,
        cases: usize,
    },
}

/// The stress at a point at each step of a history: tension positive, pascals, components in
/// the order xx, yy, zz, xy, yz, zx.
#[derive(Clone, Debug, PartialEq)]
pub struct StressHistory {
    time: Vec<f64>,
    tensors_pa: Vec<[f64; 6]>,
}

const COMPONENT_NAMES: [&str; 6] = ["xx", "yy", "zz", "xy", "yz", "zx"];

impl StressHistory {
    /// A history from its times (strictly increasing) and tensors (same length, at least two).
    pub fn new(time: Vec<f64>, tensors_pa: Vec<[f64; 6]>) -> Result<Self, HistoryError> {
        if tensors_pa.len() < 2 {
            return Err(HistoryError::TooShort(tensors_pa.len()));
        }
        debug_assert_eq!(time.len(), tensors_pa.len());
        for (step, (t, c)) in time.iter().zip(&tensors_pa).enumerate() {
            if !t.is_finite() {
                return Err(HistoryError::Unusable {
                    step: step + 1,
                    what: "time",
                    value: *t,
                });
            }
            if step > 0 && *t <= time[step - 1] {
                return Err(HistoryError::TimeNotIncreasing {
                    step: step + 1,
                    time: *t,
                    before: time[step - 1],
                });
            }
            for (v, what) in c.iter().zip(COMPONENT_NAMES) {
                if !v.is_finite() || v.abs() > MAX_STRESS_PA {
                    return Err(HistoryError::Unusable {
                        step: step + 1,
                        what,
                        value: *v,
                    });
                }
            }
        }
        Ok(Self { time, tensors_pa })
    }

    /// σ(t) = Σ fᵢ(t) σᵢ: load cases (`cases`) scaled by factors in time (`factors[step][case]`).
    pub fn from_factors(
        cases: &[StressTensor],
        time: Vec<f64>,
        factors: &[Vec<f64>],
    ) -> Result<Self, HistoryError> {
        let mut tensors = Vec::with_capacity(factors.len());
        for (step, row) in factors.iter().enumerate() {
            if row.len() != cases.len() {
                return Err(HistoryError::FactorCount {
                    step: step + 1,
                    got: row.len(),
                    cases: cases.len(),
                });
            }
            let mut sum = [0.0; 6];
            for (f, case) in row.iter().zip(cases) {
                if !f.is_finite() {
                    return Err(HistoryError::Unusable {
                        step: step + 1,
                        what: "factor",
                        value: *f,
                    });
                }
                for (s, c) in sum.iter_mut().zip(case.components_pa()) {
                    *s += f * c;
                }
            }
            tensors.push(sum);
        }
        Self::new(time, tensors)
    }

    /// Times (or step numbers), increasing.
    #[must_use]
    pub fn time(&self) -> &[f64] {
        &self.time
    }

    /// Tensors in pascals (xx, yy, zz, xy, yz, zx), tension positive.
    #[must_use]
    pub fn tensors_pa(&self) -> &[[f64; 6]] {
        &self.tensors_pa
    }

    /// Number of steps.
    #[must_use]
    pub fn len(&self) -> usize {
        self.tensors_pa.len()
    }

    /// Never true (a history has at least two steps); here for the convention.
    #[must_use]
    pub fn is_empty(&self) -> bool {
        self.tensors_pa.is_empty()
    }

    /// The largest magnitude of any component at any step (a scale for tolerances).
    #[must_use]
    pub fn scale_pa(&self) -> f64 {
        self.tensors_pa
            .iter()
            .flatten()
            .fold(0.0_f64, |m, v| m.max(v.abs()))
    }
}

/// A plane's unit normal and two in-plane unit axes (a, b, n right-handed). The axes are fixed
/// functions of the normal, so a path drawn in them is the same every time the plane is asked.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PlaneAxes {
    /// Unit normal.
    pub n: Vector3<f64>,
    /// First in-plane axis: horizontal (along the plane's strike) unless the plane is
    /// horizontal, then east.
    pub a: Vector3<f64>,
    /// Second in-plane axis, b = n × a, so that (a, b, n) is right-handed.
    pub b: Vector3<f64>,
}

impl PlaneAxes {
    /// Axes for the unit normal `n` (its length is not checked).
    #[must_use]
    pub fn of(n: Vector3<f64>) -> Self {
        let up = Vector3::z();
        let strike = up.cross(&n);
        let a = if strike.norm() < 1e-9 {
            Vector3::x()
        } else {
            strike.normalize()
        };
        let b = n.cross(&a);
        Self { n, a, b }
    }
}

/// The coefficients c of u·σ·v = Σ c_k σ_k over the components (xx, yy, zz, xy, yz, zx).
fn bilinear(u: &Vector3<f64>, v: &Vector3<f64>) -> [f64; 6] {
    [
        u.x * v.x,
        u.y * v.y,
        u.z * v.z,
        u.x * v.y + u.y * v.x,
        u.y * v.z + u.z * v.y,
        u.z * v.x + u.x * v.z,
    ]
}

fn dot6(c: &[f64; 6], s: &[f64; 6]) -> f64 {
    c[0] * s[0] + c[1] * s[1] + c[2] * s[2] + c[3] * s[3] + c[4] * s[4] + c[5] * s[5]
}

/// The history seen on one plane, in buffers that are reused from plane to plane.
#[derive(Clone, Debug, Default)]
pub struct PlanePath {
    /// Normal stress at each step, Pa, tension positive.
    pub sigma_n: Vec<f64>,
    /// Shear vector at each step in the plane's axes (a, b), Pa.
    pub tau: Vec<[f64; 2]>,
}

impl PlanePath {
    /// Fills the buffers with the history on the plane of `axes`.
    pub fn fill(&mut self, history: &StressHistory, axes: &PlaneAxes) {
        let cn = bilinear(&axes.n, &axes.n);
        let ca = bilinear(&axes.a, &axes.n);
        let cb = bilinear(&axes.b, &axes.n);
        self.sigma_n.clear();
        self.tau.clear();
        for s in history.tensors_pa() {
            self.sigma_n.push(dot6(&cn, s));
            self.tau.push([dot6(&ca, s), dot6(&cb, s)]);
        }
    }

    /// The path of `history` on the plane of `axes`.
    #[must_use]
    pub fn of(history: &StressHistory, axes: &PlaneAxes) -> Self {
        let mut p = Self::default();
        p.fill(history, axes);
        p
    }
}

/// Hydrostatic stress (σxx + σyy + σzz)/3 at each step, Pa.
#[must_use]
pub fn hydrostatic_pa(history: &StressHistory) -> Vec<f64> {
    history
        .tensors_pa()
        .iter()
        .map(|s| (s[0] + s[1] + s[2]) / 3.0)
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_plane_path_is_the_traction_split_into_normal_and_shear() {
        let s = [30e6, -10e6, 5e6, 12e6, -4e6, 7e6];
        let h = StressHistory::new(vec![0.0, 1.0], vec![s, [0.0; 6]]).unwrap();
        let t = StressTensor::from_pa(s).unwrap();
        let n = Vector3::new(1.0, 2.0, -2.0).normalize();
        let axes = PlaneAxes::of(n);
        assert!((axes.a.cross(&axes.b) - n).norm() < 1e-12, "right-handed");
        let path = PlanePath::of(&h, &axes);
        let traction = t.traction_pa(&n);
        let sn = traction.dot(&n);
        let shear = traction - sn * n;
        assert!((path.sigma_n[0] - sn).abs() < 1e-6);
        assert!((path.tau[0][0] - shear.dot(&axes.a)).abs() < 1e-6);
        assert!((path.tau[0][1] - shear.dot(&axes.b)).abs() < 1e-6);
        assert!((path.tau[0][0].hypot(path.tau[0][1]) - shear.norm()).abs() < 1e-6);
        assert_eq!(path.tau[1], [0.0, 0.0]);
    }

    #[test]
    fn histories_refuse_what_they_cannot_use() {
        assert_eq!(
            StressHistory::new(vec![0.0], vec![[0.0; 6]]),
            Err(HistoryError::TooShort(1))
        );
        assert!(matches!(
            StressHistory::new(vec![0.0, 0.0], vec![[0.0; 6]; 2]),
            Err(HistoryError::TimeNotIncreasing { step: 2, .. })
        ));
        assert!(matches!(
            StressHistory::new(
                vec![0.0, 1.0],
                vec![[0.0; 6], [f64::NAN, 0.0, 0.0, 0.0, 0.0, 0.0]]
            ),
            Err(HistoryError::Unusable {
                step: 2,
                what: "xx",
                ..
            })
        ));
        let case = StressTensor::from_pa([1.0, 0.0, 0.0, 0.0, 0.0, 0.0]).unwrap();
        assert!(matches!(
            StressHistory::from_factors(&[case], vec![0.0, 1.0], &[vec![1.0], vec![1.0, 2.0]]),
            Err(HistoryError::FactorCount {
                step: 2,
                got: 2,
                cases: 1
            })
        ));
    }

    #[test]
    fn factors_on_load_cases_sum_by_hand() {
        let a = StressTensor::from_pa([10.0, 0.0, 0.0, 2.0, 0.0, 0.0]).unwrap();
        let b = StressTensor::from_pa([0.0, 4.0, 0.0, 0.0, 0.0, -1.0]).unwrap();
        let h = StressHistory::from_factors(
            &[a, b],
            vec![0.0, 1.0],
            &[vec![1.0, 0.5], vec![-2.0, 3.0]],
        )
        .unwrap();
        assert_eq!(h.tensors_pa()[0], [10.0, 2.0, 0.0, 2.0, 0.0, -0.5]);
        assert_eq!(h.tensors_pa()[1], [-20.0, 12.0, 0.0, -4.0, 0.0, -3.0]);
    }
}
