//! The symmetric Cauchy stress tensor.

use nalgebra::{Matrix3, Vector3};
use serde::{Deserialize, Serialize};

use super::units::StressUnit;

/// Largest stress magnitude accepted, in pascals. It is far beyond any physical stress (1e30 Pa
/// is twenty orders above the strength of any material) and keeps every invariant, up to the cube
/// of a stress, inside the range of f64 so that no result overflows to infinity.
pub const MAX_STRESS_PA: f64 = 1e30;

/// The six independent components, in the order the program uses everywhere
/// (grid, CLI `--stress`, paste, files): xx, yy, zz, xy, yz, zx.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum Component {
    Xx,
    Yy,
    Zz,
    Xy,
    Yz,
    Zx,
}

impl Component {
    /// All six in the canonical order.
    pub const ALL: [Self; 6] = [Self::Xx, Self::Yy, Self::Zz, Self::Xy, Self::Yz, Self::Zx];

    /// The key used on the command line and in JSON.
    #[must_use]
    pub fn key(self) -> &'static str {
        match self {
            Self::Xx => "xx",
            Self::Yy => "yy",
            Self::Zz => "zz",
            Self::Xy => "xy",
            Self::Yz => "yz",
            Self::Zx => "zx",
        }
    }

    /// Row and column of this component in the 3×3 matrix (the upper or diagonal entry).
    #[must_use]
    pub fn index(self) -> (usize, usize) {
        match self {
            Self::Xx => (0, 0),
            Self::Yy => (1, 1),
            Self::Zz => (2, 2),
            Self::Xy => (0, 1),
            Self::Yz => (1, 2),
            Self::Zx => (0, 2),
        }
    }

    /// The component at row `row`, column `col` of the matrix (symmetric: (1, 0) is xy).
    #[must_use]
    pub fn at(row: usize, col: usize) -> Option<Self> {
        let (r, c) = if row <= col { (row, col) } else { (col, row) };
        Self::ALL.into_iter().find(|comp| comp.index() == (r, c))
    }

    /// Parses a key, accepting the mirrored spellings `yx`, `zy`, `xz` (case-insensitive).
    #[must_use]
    pub fn parse_key(text: &str) -> Option<Self> {
        Some(match text.trim().to_ascii_lowercase().as_str() {
            "xx" => Self::Xx,
            "yy" => Self::Yy,
            "zz" => Self::Zz,
            "xy" | "yx" => Self::Xy,
            "yz" | "zy" => Self::Yz,
            "zx" | "xz" => Self::Zx,
            _ => return None,
        })
    }
}

/// Why a set of components cannot form a stress tensor.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum TensorError {
    /// The component is NaN or infinite (for example text like "1e999").
    #[error("component {} is not a finite number", .0.key())]
    NonFinite(Component),
    /// The component's magnitude exceeds [`MAX_STRESS_PA`].
    #[error("component {} is out of range (magnitude above 1e30 Pa)", .0.key())]
    OutOfRange(Component),
    /// A finite number typed in a unit that exceeds the limit once converted to pascals.
    #[error("component {} = {typed} {unit} exceeds the limit of 1e30 Pa once converted to pascals", .component.key())]
    OutOfRangeAfterConversion {
        /// The component.
        component: Component,
        /// The number as typed.
        typed: f64,
        /// Its unit.
        unit: &'static str,
    },
}

/// A symmetric Cauchy stress tensor, stored in pascals, tension positive, in right-handed
/// x, y, z axes. Only finite values of magnitude up to [`MAX_STRESS_PA`] can be stored.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(try_from = "RawTensor", into = "RawTensor")]
pub struct StressTensor {
    components_pa: [f64; 6],
}

/// The serialised form: the six components in pascals, tension positive.
#[derive(Clone, Copy, Debug, Serialize, Deserialize)]
#[expect(clippy::struct_field_names, reason = "file keys say their unit")]
struct RawTensor {
    xx_pa: f64,
    yy_pa: f64,
    zz_pa: f64,
    xy_pa: f64,
    yz_pa: f64,
    zx_pa: f64,
}

impl TryFrom<RawTensor> for StressTensor {
    type Error = TensorError;

    fn try_from(raw: RawTensor) -> Result<Self, Self::Error> {
        Self::from_pa([
            raw.xx_pa, raw.yy_pa, raw.zz_pa, raw.xy_pa, raw.yz_pa, raw.zx_pa,
        ])
    }
}

impl From<StressTensor> for RawTensor {
    fn from(t: StressTensor) -> Self {
        let [xx_pa, yy_pa, zz_pa, xy_pa, yz_pa, zx_pa] = t.components_pa;
        Self {
            xx_pa,
            yy_pa,
            zz_pa,
            xy_pa,
            yz_pa,
            zx_pa,
        }
    }
}

impl Default for StressTensor {
    fn default() -> Self {
        Self::ZERO
    }
}

impl StressTensor {
    /// The zero tensor.
    pub const ZERO: Self = Self {
        components_pa: [0.0; 6],
    };

    /// Builds a tensor from xx, yy, zz, xy, yz, zx in pascals, tension positive.
    pub fn from_pa(components_pa: [f64; 6]) -> Result<Self, TensorError> {
        for (value, comp) in components_pa.iter().zip(Component::ALL) {
            if !value.is_finite() {
                return Err(TensorError::NonFinite(comp));
            }
            if value.abs() > MAX_STRESS_PA {
                return Err(TensorError::OutOfRange(comp));
            }
        }
        Ok(Self { components_pa })
    }

    /// Builds a tensor from xx, yy, zz, xy, yz, zx given in `unit`, with `sign` = +1 for
    /// tension-positive values or −1 for compression-positive ones.
    pub fn from_components(
        components: [f64; 6],
        unit: StressUnit,
        sign: f64,
    ) -> Result<Self, TensorError> {
        // Check the typed numbers first so that "1e999" is reported as not finite, not as
        // out of range after conversion.
        for (value, comp) in components.iter().zip(Component::ALL) {
            if !value.is_finite() {
                return Err(TensorError::NonFinite(comp));
            }
            let pa = unit.to_pa(*value);
            if !pa.is_finite() || pa.abs() > MAX_STRESS_PA {
                return Err(TensorError::OutOfRangeAfterConversion {
                    component: comp,
                    typed: *value,
                    unit: unit.symbol(),
                });
            }
        }
        Self::from_pa(components.map(|v| sign * unit.to_pa(v)))
    }

    /// Builds a tensor from a symmetric matrix in pascals (the upper triangle is read).
    pub fn from_matrix_pa(m: &Matrix3<f64>) -> Result<Self, TensorError> {
        Self::from_pa([
            m[(0, 0)],
            m[(1, 1)],
            m[(2, 2)],
            m[(0, 1)],
            m[(1, 2)],
            m[(0, 2)],
        ])
    }

    /// A diagonal tensor (principal stresses along x, y, z), in pascals.
    pub fn diagonal_pa(xx: f64, yy: f64, zz: f64) -> Result<Self, TensorError> {
        Self::from_pa([xx, yy, zz, 0.0, 0.0, 0.0])
    }

    /// xx, yy, zz, xy, yz, zx in pascals, tension positive.
    #[must_use]
    pub fn components_pa(&self) -> [f64; 6] {
        self.components_pa
    }

    /// One component in pascals, tension positive.
    #[must_use]
    pub fn component_pa(&self, comp: Component) -> f64 {
        self.components_pa[comp as usize]
    }

    /// The same tensor with one component replaced (in pascals).
    pub fn with_component_pa(&self, comp: Component, value_pa: f64) -> Result<Self, TensorError> {
        let mut c = self.components_pa;
        c[comp as usize] = value_pa;
        Self::from_pa(c)
    }

    /// The full symmetric 3×3 matrix in pascals.
    #[must_use]
    pub fn matrix_pa(&self) -> Matrix3<f64> {
        let [xx, yy, zz, xy, yz, zx] = self.components_pa;
        Matrix3::new(xx, xy, zx, xy, yy, yz, zx, yz, zz)
    }

    /// The largest magnitude of any component, in pascals.
    #[must_use]
    pub fn max_abs_component_pa(&self) -> f64 {
        self.components_pa
            .iter()
            .fold(0.0_f64, |m, v| m.max(v.abs()))
    }

    /// Mean (hydrostatic) stress tr σ / 3, in pascals.
    #[must_use]
    pub fn mean_pa(&self) -> f64 {
        let [xx, yy, zz, ..] = self.components_pa;
        (xx + yy + zz) / 3.0
    }

    /// The tensor multiplied by a factor (for example −1 to change sign convention). Scaling is
    /// only offered by factors of magnitude at most one, so the result is always valid.
    #[must_use]
    pub fn scaled_down(&self, factor: f64) -> Self {
        debug_assert!(factor.abs() <= 1.0);
        let factor = if factor.is_finite() {
            factor.clamp(-1.0, 1.0)
        } else {
            0.0
        };
        Self {
            components_pa: self.components_pa.map(|v| v * factor),
        }
    }

    /// The traction vector t = σ n on the plane of unit normal `normal`, in pascals
    /// (Cauchy's formula).
    #[must_use]
    pub fn traction_pa(&self, normal: &Vector3<f64>) -> Vector3<f64> {
        self.matrix_pa() * normal
    }

    /// The tensor expressed in rotated axes: σ' = Q σ Qᵀ, where the rows of `q` are the new
    /// axes written in the old ones. `q` must be orthogonal; for a proper rotation keep det = +1.
    pub fn rotated(&self, q: &Matrix3<f64>) -> Result<Self, TensorError> {
        Self::from_matrix_pa(&(q * self.matrix_pa() * q.transpose()))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn rejects_non_finite_and_huge() {
        assert_eq!(
            StressTensor::from_components(
                [1.0, f64::NAN, 0.0, 0.0, 0.0, 0.0],
                StressUnit::MPa,
                1.0
            ),
            Err(TensorError::NonFinite(Component::Yy))
        );
        assert_eq!(
            StressTensor::from_components([0.0, 0.0, 0.0, 0.0, 0.0, 1e300], StressUnit::Ksi, 1.0),
            Err(TensorError::OutOfRangeAfterConversion {
                component: Component::Zx,
                typed: 1e300,
                unit: "ksi"
            })
        );
    }

    #[test]
    fn mirrored_keys_and_matrix_positions() {
        assert_eq!(Component::parse_key("YX"), Some(Component::Xy));
        assert_eq!(Component::parse_key("xz"), Some(Component::Zx));
        assert_eq!(Component::parse_key("xw"), None);
        assert_eq!(Component::at(2, 1), Some(Component::Yz));
        let t = StressTensor::from_pa([1.0, 2.0, 3.0, 4.0, 5.0, 6.0]).unwrap();
        let m = t.matrix_pa();
        assert_eq!(m, m.transpose());
        for comp in Component::ALL {
            let (r, c) = comp.index();
            assert_eq!(m[(r, c)], t.component_pa(comp));
        }
    }

    #[test]
    fn serde_round_trip_rejects_nan() {
        let t = StressTensor::from_pa([1.0, -2.0, 3.5, 4.0, 0.0, -6.0]).unwrap();
        let text = serde_json::to_string(&t).unwrap();
        let back: StressTensor = serde_json::from_str(&text).unwrap();
        assert_eq!(back, t);
        let bad = r#"{"xx_pa":1e999,"yy_pa":0,"zz_pa":0,"xy_pa":0,"yz_pa":0,"zx_pa":0}"#;
        assert!(serde_json::from_str::<StressTensor>(bad).is_err());
    }
}
