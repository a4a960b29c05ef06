//! Pictures: the scene (plain data: what is in the 3D view, in pascals and model space), the
//! drawing back ends (projection, label placement, SVG, PNG, egui) and the figures built from a
//! study (3D view, orientation map, Mohr diagram, charts, the caution strip). Above the study,
//! below the outputs and the window.

pub mod caution;
pub mod draw;
pub mod figures;
pub mod scene;
