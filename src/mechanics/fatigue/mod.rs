//! Fatigue on the critical plane: a stress history at a point, what it does on each plane (the
//! normal stress σn(t) and the shear path τ(t) in the plane), long-life criteria scored over
//! every plane, and finite life by rainflow counting and Miner's rule.

pub mod circle;
pub mod criteria;
pub mod critical;
pub mod history;
pub mod life;
pub mod rainflow;

pub use circle::{Circle, PathMethod};
pub use criteria::{Constants, ConstantsError, Criterion, FatigueLimits, Limit, PlaneValue};
pub use critical::{CriticalPlane, SearchSettings, critical_plane};
pub use history::{HistoryError, PlaneAxes, PlanePath, StressHistory};
pub use life::{DamagePlane, SnCurve, SnError, damage_plane};
