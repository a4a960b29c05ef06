//! Planewise: the stress state at a point — principal stresses and directions, tractions on any
//! plane, failure criteria — as a library, a command-line tool and a desktop program.
//!
//! Conventions: stresses are stored in pascals as f64, tension positive, in right-handed x, y, z
//! axes; see [`mechanics::units`] for display units and the compression-positive convention.

pub mod cli;
pub mod format;
pub mod mechanics;
pub mod parse;
