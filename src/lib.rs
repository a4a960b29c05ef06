//! Planewise: the stress state at a point — principal stresses and directions, tractions on any
//! plane, failure criteria — as a library, a command-line tool and a desktop program.
//!
//! Conventions: stresses are stored in pascals as f64, tension positive, in right-handed x, y, z
//! axes; see [`mechanics::units`] for display units and the compression-positive convention.

pub mod cli;
pub mod mechanics;
pub mod output;
pub mod picture;
pub mod study;
pub mod text;
pub mod window;

/// The caution every output that can feed a decision carries (README, About, reports, figures).
pub const SAFETY_NOTE: &str = "Planewise is an aid for engineers, not a substitute for engineering \
judgement. Check every input and result independently; design decisions follow the applicable \
design codes and licensed engineering practice.";
