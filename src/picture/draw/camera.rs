//! The orbiting camera: where the eye is, and how world points map to the screen.

use nalgebra::{Point3, Vector3};
use serde::{Deserialize, Serialize};

/// Orthographic or perspective projection.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize, Default)]
pub enum Projection {
    /// Parallel lines stay parallel; sizes do not depend on depth.
    #[default]
    Orthographic,
    /// Nearer things look larger.
    Perspective,
}

/// Named view directions.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub enum ViewPreset {
    /// Eye off every symmetry axis, a little above (yaw −35°, pitch 20°): near and far corners
    /// of the cube stand apart, so it reads one way round. The start view.
    ThreeQuarter,
    /// Eye along (1, 1, 1).
    Isometric,
    /// Eye on +x looking back at the origin.
    PosX,
    /// Eye on −x.
    NegX,
    /// Eye on +y.
    PosY,
    /// Eye on −y.
    NegY,
    /// Eye on +z (looking down).
    PosZ,
    /// Eye on −z (looking up).
    NegZ,
}

impl ViewPreset {
    /// All presets in menu order.
    pub const ALL: [Self; 8] = [
        Self::ThreeQuarter,
        Self::Isometric,
        Self::PosX,
        Self::NegX,
        Self::PosY,
        Self::NegY,
        Self::PosZ,
        Self::NegZ,
    ];

    /// The command-line key (`iso`, `x`, `-x`, …).
    #[must_use]
    pub fn key(self) -> &'static str {
        match self {
            Self::ThreeQuarter => "three-quarter",
            Self::Isometric => "iso",
            Self::PosX => "x",
            Self::NegX => "-x",
            Self::PosY => "y",
            Self::NegY => "-y",
            Self::PosZ => "z",
            Self::NegZ => "-z",
        }
    }

    /// Parses a command-line key.
    #[must_use]
    pub fn from_key(key: &str) -> Option<Self> {
        Self::ALL.into_iter().find(|p| p.key() == key.trim())
    }

    /// Menu text.
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            Self::ThreeQuarter => "Three-quarter",
            Self::Isometric => "Isometric",
            Self::PosX => "From +x",
            Self::NegX => "From −x",
            Self::PosY => "From +y",
            Self::NegY => "From −y",
            Self::PosZ => "From +z (top)",
            Self::NegZ => "From −z (bottom)",
        }
    }

    /// Yaw (about z, from +x towards +y) and pitch (elevation) of the eye, in degrees.
    #[must_use]
    pub fn yaw_pitch_deg(self) -> (f64, f64) {
        let iso_pitch = (1.0 / 2.0_f64.sqrt()).atan().to_degrees();
        match self {
            Self::ThreeQuarter => (-35.0, 20.0),
            Self::Isometric => (45.0, iso_pitch),
            Self::PosX => (0.0, 0.0),
            Self::NegX => (180.0, 0.0),
            Self::PosY => (90.0, 0.0),
            Self::NegY => (270.0, 0.0),
            Self::PosZ => (-90.0, 90.0),
            Self::NegZ => (-90.0, -90.0),
        }
    }
}

/// An eye orbiting the origin.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct Camera {
    /// Eye azimuth about +z from +x towards +y, degrees.
    pub yaw_deg: f64,
    /// Eye elevation above the x–y plane, degrees, in [−90, 90].
    pub pitch_deg: f64,
    /// Magnification: 1 fits the cube and its arrows in the view.
    pub zoom: f64,
    /// Screen offset of the origin from the view's centre, as fractions of the view's height.
    pub pan: [f64; 2],
    /// Projection.
    pub projection: Projection,
}

impl Default for Camera {
    /// The three-quarter view: off-axis, so the cube does not read as a flat hexagon.
    fn default() -> Self {
        Self::from_preset(ViewPreset::ThreeQuarter)
    }
}

/// Distance of a perspective eye from the origin, in cube edges.
const EYE_DISTANCE: f64 = 4.0;

/// A point projected to the screen: pixel position and depth (larger is farther).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Projected {
    /// Pixels from the left edge.
    pub x: f64,
    /// Pixels from the top edge.
    pub y: f64,
    /// Distance along the view direction; larger is farther from the eye.
    pub depth: f64,
}

/// The camera fixed to one viewport size, ready to project points.
#[derive(Clone, Copy, Debug)]
pub struct ScreenFromWorld {
    right: Vector3<f64>,
    up: Vector3<f64>,
    forward: Vector3<f64>,
    centre: [f64; 2],
    pixels_per_unit: f64,
    perspective: bool,
}

impl Camera {
    /// The camera for a preset view.
    #[must_use]
    pub fn from_preset(preset: ViewPreset) -> Self {
        let (yaw_deg, pitch_deg) = preset.yaw_pitch_deg();
        Self {
            yaw_deg,
            pitch_deg,
            zoom: 1.0,
            pan: [0.0, 0.0],
            projection: Projection::Orthographic,
        }
    }

    /// Unit vector from the origin towards the eye.
    #[must_use]
    pub fn towards_eye(&self) -> Vector3<f64> {
        let (sy, cy) = self.yaw_deg.to_radians().sin_cos();
        let (sp, cp) = self.pitch_deg.clamp(-90.0, 90.0).to_radians().sin_cos();
        Vector3::new(cp * cy, cp * sy, sp)
    }

    /// Turns the eye by screen drag amounts (degrees).
    pub fn orbit(&mut self, yaw_by_deg: f64, pitch_by_deg: f64) {
        self.yaw_deg = (self.yaw_deg + yaw_by_deg).rem_euclid(360.0);
        self.pitch_deg = (self.pitch_deg + pitch_by_deg).clamp(-90.0, 90.0);
    }

    /// The projection for a `width` × `height` pixel viewport in which a sphere of
    /// `fit_radius` world units about the origin just fits at zoom 1.
    #[must_use]
    pub fn screen_from_world(&self, width: f64, height: f64, fit_radius: f64) -> ScreenFromWorld {
        let forward = -self.towards_eye();
        let (sy, cy) = self.yaw_deg.to_radians().sin_cos();
        // The horizontal right vector depends on yaw only, so it stays defined looking straight
        // down or up.
        let right = Vector3::new(-sy, cy, 0.0);
        let up = right.cross(&forward);
        let size = width.min(height).max(1.0);
        ScreenFromWorld {
            right,
            up,
            forward,
            centre: [
                width / 2.0 + self.pan[0] * height,
                height / 2.0 + self.pan[1] * height,
            ],
            pixels_per_unit: size / (2.1 * fit_radius.max(0.5)) * self.zoom.clamp(0.05, 50.0),
            perspective: self.projection == Projection::Perspective,
        }
    }
}

impl ScreenFromWorld {
    /// The same projection moved `dx`, `dy` pixels on screen.
    #[must_use]
    pub fn shifted(self, dx: f64, dy: f64) -> Self {
        Self {
            centre: [self.centre[0] + dx, self.centre[1] + dy],
            ..self
        }
    }

    /// Projects a world point.
    #[must_use]
    pub fn project(&self, p: &Point3<f64>) -> Projected {
        let v = p.coords;
        let x = v.dot(&self.right);
        let y = v.dot(&self.up);
        let depth = v.dot(&self.forward);
        let k = if self.perspective {
            // Eye at distance EYE_DISTANCE; points never get closer than 0.2 of it.
            EYE_DISTANCE / (EYE_DISTANCE + depth).max(0.2 * EYE_DISTANCE)
        } else {
            1.0
        };
        Projected {
            x: self.centre[0] + x * k * self.pixels_per_unit,
            y: self.centre[1] - y * k * self.pixels_per_unit,
            depth,
        }
    }

    /// Unit vector towards the eye (for lighting and back-face tests).
    #[must_use]
    pub fn towards_eye(&self) -> Vector3<f64> {
        -self.forward
    }

    /// Screen-space direction (x right, y down, unit length per world unit at zoom 1 in
    /// orthographic projection) of a world direction; used for the axis triad.
    #[must_use]
    pub fn screen_direction(&self, d: &Vector3<f64>) -> [f64; 2] {
        [d.dot(&self.right), -d.dot(&self.up)]
    }

    /// The unit direction from the origin to the point of the sphere of `radius` (world units)
    /// about the origin that is seen at pixel (`x`, `y`): the half of the sphere facing the eye,
    /// or, off the sphere's outline, the nearest point of the outline. `None` only for a
    /// degenerate view (the pixel at the projected origin with nothing to pick).
    #[must_use]
    pub fn sphere_direction_at(&self, x: f64, y: f64, radius: f64) -> Option<Vector3<f64>> {
        let (dx, dy) = (x - self.centre[0], self.centre[1] - y);
        // Perspective scale depends on depth, which depends on the answer: iterate (it
        // contracts quickly because the eye is four cube edges away).
        let mut depth = 0.0;
        let mut point = Vector3::zeros();
        for _ in 0..if self.perspective { 12 } else { 1 } {
            let k = if self.perspective {
                EYE_DISTANCE / (EYE_DISTANCE + depth).max(0.2 * EYE_DISTANCE)
            } else {
                1.0
            };
            let (u, v) = (
                dx / (k * self.pixels_per_unit),
                dy / (k * self.pixels_per_unit),
            );
            let r2 = u * u + v * v;
            if r2 <= radius * radius {
                // Nearer the eye is smaller depth (forward points away from the eye).
                depth = -(radius * radius - r2).sqrt();
                point = self.right * u + self.up * v + self.forward * depth;
            } else {
                depth = 0.0;
                point = (self.right * u + self.up * v) * (radius / r2.sqrt());
            }
        }
        point.try_normalize(1e-12)
    }

    /// Pixels per world unit at depth 0.
    #[must_use]
    pub fn pixels_per_unit(&self) -> f64 {
        self.pixels_per_unit
    }
}
