//! The mechanics core: pure functions of a stress tensor, a plane and settings.
//! No I/O and no GUI types live here.

pub mod analysis;
pub mod criteria;
pub mod fatigue;
pub mod inputs;
pub mod invariants;
pub mod mohr;
pub mod plane;
pub mod principal;
pub mod search;
pub mod stereonet;
pub mod tensor;
pub mod units;

pub use analysis::Analysis;
pub use plane::{PlaneError, PlaneNormal, PlaneStress};
pub use principal::{Principal, principal, principal_values_into, principal_values_pa};
pub use tensor::{Component, StressTensor, TensorError};
pub use units::{SignConvention, StressUnit};
