//! Colours and sizes of the 3D picture. Our own palette: warm for tension, cool for compression,
//! dark ink for total tractions, teal for normal parts and amber for shear parts.

use serde::{Deserialize, Serialize};

/// An sRGB colour with straight (not premultiplied) alpha.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize, Default)]
pub struct Rgba {
    /// Red, 0–255.
    pub r: u8,
    /// Green, 0–255.
    pub g: u8,
    /// Blue, 0–255.
    pub b: u8,
    /// Opacity, 0 (clear) to 255 (opaque).
    pub a: u8,
}

impl Rgba {
    /// An opaque colour.
    #[must_use]
    pub const fn rgb(r: u8, g: u8, b: u8) -> Self {
        Self { r, g, b, a: 255 }
    }

    /// The same colour with opacity `a`.
    #[must_use]
    pub const fn with_alpha(self, a: u8) -> Self {
        Self { a, ..self }
    }

    /// The colour with its red, green and blue scaled by `factor` (shading), clamped to 255.
    #[must_use]
    pub fn shaded(self, factor: f64) -> Self {
        let f = |c: u8| (f64::from(c) * factor).round().clamp(0.0, 255.0) as u8;
        Self {
            r: f(self.r),
            g: f(self.g),
            b: f(self.b),
            a: self.a,
        }
    }

    /// `#rrggbb`.
    #[must_use]
    pub fn hex(self) -> String {
        format!("#{:02x}{:02x}{:02x}", self.r, self.g, self.b)
    }
}

/// Background of the view and of exported figures.
pub const BACKGROUND: Rgba = Rgba::rgb(250, 250, 247);
/// Text and outlines.
pub const INK: Rgba = Rgba::rgb(34, 38, 46);
/// Total traction arrows.
pub const TRACTION: Rgba = Rgba::rgb(45, 45, 60);
/// Normal part of a traction.
pub const NORMAL_PART: Rgba = Rgba::rgb(0, 128, 128);
/// Shear part of a traction.
pub const SHEAR_PART: Rgba = Rgba::rgb(204, 122, 0);
/// A principal axis in tension.
pub const TENSION: Rgba = Rgba::rgb(200, 44, 44);
/// A principal axis in compression.
pub const COMPRESSION: Rgba = Rgba::rgb(40, 92, 200);
/// A principal axis with zero stress.
pub const NEUTRAL: Rgba = Rgba::rgb(120, 120, 120);
/// Cube faces.
pub const CUBE_FACE: Rgba = Rgba::rgb(196, 204, 214).with_alpha(70);
/// Cube edges.
pub const CUBE_EDGE: Rgba = Rgba::rgb(90, 98, 110);
/// The cut plane.
pub const CUT_PLANE: Rgba = Rgba::rgb(120, 190, 150).with_alpha(110);
/// The cut plane's unit normal.
pub const PLANE_NORMAL: Rgba = Rgba::rgb(21, 161, 98);
/// Worst planes (3D outlines, map and Mohr markers).
pub const WORST_PLANE: Rgba = Rgba::rgb(132, 30, 98);
/// The traction ellipsoid.
/// Halo behind marks drawn over the orientation map's colours.
pub const HALO: Rgba = Rgba::rgb(255, 255, 255);
/// The traction ellipsoid.
pub const ELLIPSOID: Rgba = Rgba::rgb(170, 140, 210).with_alpha(70);
/// Axis triad colours for x, y, z.
pub const AXES: [Rgba; 3] = [
    Rgba::rgb(190, 60, 60),
    Rgba::rgb(50, 150, 60),
    Rgba::rgb(50, 90, 200),
];

/// Length, in cube edges, of the arrow for the largest principal stress magnitude.
pub const LONGEST_ARROW: f64 = 0.5;
