//! What the 3D picture contains, as plain data in world units (the cube has edge 1 and its
//! centre at the origin; x, y, z right-handed, z up). Built from the tensor, the plane and the
//! layer settings; no drawing and no GUI types here.

mod build;
mod geometry;
pub mod style;

pub use geometry::{component_name, cut_polygon, field_normals};

use nalgebra::{Point3, Vector3};
use serde::{Deserialize, Serialize};

use crate::mechanics::{PlaneNormal, SignConvention, StressTensor, StressUnit};
use style::Rgba;

/// Which parts of the picture are drawn.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(default)]
#[expect(
    clippy::struct_excessive_bools,
    reason = "one switch per layer, as the user sees them"
)]
pub struct Layers {
    /// The unit cube's faces and edges.
    pub cube: bool,
    /// Traction arrows on the chosen cube faces.
    pub face_tractions: bool,
    /// The cut plane with its normal and traction.
    pub cut_plane: bool,
    /// The traction ellipsoid.
    pub ellipsoid: bool,
    /// The principal axes.
    pub principal_axes: bool,
    /// Value labels next to arrows.
    pub labels: bool,
    /// The x, y, z triad in the corner.
    pub triad: bool,
    /// The legend (arrow scale, unit, convention, colours).
    pub legend: bool,
    /// The worst planes of the chosen measure (outline and normal).
    pub worst_planes: bool,
    /// The stress element: signed component arrows on the cube's faces.
    pub element: bool,
    /// The traction at the tips of normals spread over the sphere.
    pub traction_field: bool,
}

impl Default for Layers {
    fn default() -> Self {
        Self {
            cube: true,
            face_tractions: true,
            cut_plane: true,
            ellipsoid: false,
            principal_axes: true,
            labels: true,
            triad: true,
            legend: true,
            worst_planes: false,
            element: false,
            traction_field: false,
        }
    }
}

impl Layers {
    /// Every layer switched off (a starting point for choosing a few).
    #[must_use]
    pub fn none() -> Self {
        Self {
            cube: false,
            face_tractions: false,
            cut_plane: false,
            ellipsoid: false,
            principal_axes: false,
            labels: false,
            triad: false,
            legend: false,
            worst_planes: false,
            element: false,
            traction_field: false,
        }
    }
}

/// The six cube faces, by outward normal.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum Face {
    /// +x
    PosX,
    /// −x
    NegX,
    /// +y
    PosY,
    /// −y
    NegY,
    /// +z
    PosZ,
    /// −z
    NegZ,
}

impl Face {
    /// All faces.
    pub const ALL: [Self; 6] = [
        Self::PosX,
        Self::NegX,
        Self::PosY,
        Self::NegY,
        Self::PosZ,
        Self::NegZ,
    ];

    /// Outward unit normal.
    #[must_use]
    pub fn normal(self) -> Vector3<f64> {
        match self {
            Self::PosX => Vector3::x(),
            Self::NegX => -Vector3::x(),
            Self::PosY => Vector3::y(),
            Self::NegY => -Vector3::y(),
            Self::PosZ => Vector3::z(),
            Self::NegZ => -Vector3::z(),
        }
    }

    /// Index of the axis the face is normal to (0 = x, 1 = y, 2 = z).
    #[must_use]
    pub fn axis(self) -> usize {
        match self {
            Self::PosX | Self::NegX => 0,
            Self::PosY | Self::NegY => 1,
            Self::PosZ | Self::NegZ => 2,
        }
    }

    /// Short name, e.g. "+x".
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            Self::PosX => "+x",
            Self::NegX => "−x",
            Self::PosY => "+y",
            Self::NegY => "−y",
            Self::PosZ => "+z",
            Self::NegZ => "−z",
        }
    }
}

/// Which faces carry traction arrows.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize, Default)]
pub enum FaceChoice {
    /// The three faces turned towards the viewer (changes as the view turns).
    #[default]
    FacingViewer,
    /// A fixed set, in the order of [`Face::ALL`].
    Chosen([bool; 6]),
}

/// Everything the scene is built from.
#[derive(Clone, Copy, Debug)]
pub struct SceneInput<'a> {
    /// The stress state (stored, tension positive).
    pub tensor: &'a StressTensor,
    /// The cut plane.
    pub plane: PlaneNormal,
    /// Unit of labels.
    pub unit: StressUnit,
    /// Sign convention of labels (arrows are physical vectors and do not change).
    pub convention: SignConvention,
    /// Layers to draw.
    pub layers: Layers,
    /// Faces with traction arrows.
    pub faces: FaceChoice,
    /// The worst planes of the chosen measure, drawn when that layer is on.
    pub worst_planes: &'a [PlaneNormal],
    /// A plane marked by another study (the Fatigue tab's critical plane), with its label;
    /// drawn whenever given.
    pub marked_plane: Option<(PlaneNormal, &'a str)>,
}

/// An arrow from `from` to `to` (world units).
#[derive(Clone, Debug, PartialEq)]
pub struct Arrow {
    /// Tail.
    pub from: Point3<f64>,
    /// Tip.
    pub to: Point3<f64>,
    /// Colour.
    pub color: Rgba,
    /// Shaft width in pixels at the reference size.
    pub width_px: f32,
}

/// A flat, convex polygon (world units), filled and optionally outlined.
#[derive(Clone, Debug, PartialEq)]
pub struct Polygon {
    /// Vertices in order around the polygon.
    pub points: Vec<Point3<f64>>,
    /// Fill colour (alpha for translucency).
    pub fill: Rgba,
    /// Outline colour, if any.
    pub outline: Option<Rgba>,
}

/// Triangles sharing a colour (world units), lit per triangle.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct TriMesh {
    /// Vertex positions.
    pub vertices: Vec<Point3<f64>>,
    /// Vertex indices, three per triangle.
    pub triangles: Vec<[u32; 3]>,
    /// Colour before lighting.
    pub color: Rgba,
}

/// A straight line (world units).
#[derive(Clone, Debug, PartialEq)]
pub struct Segment {
    /// One end.
    pub a: Point3<f64>,
    /// Other end.
    pub b: Point3<f64>,
    /// Colour.
    pub color: Rgba,
    /// Width in pixels at the reference size.
    pub width_px: f32,
}

/// Text anchored at a world point, drawn on top of the geometry.
#[derive(Clone, Debug, PartialEq)]
pub struct Label {
    /// Anchor.
    pub at: Point3<f64>,
    /// Text, with unit.
    pub text: String,
    /// Colour.
    pub color: Rgba,
}

/// One entry of the legend: a colour swatch and what it means.
#[derive(Clone, Debug, PartialEq)]
pub struct LegendEntry {
    /// Swatch colour.
    pub color: Rgba,
    /// Meaning.
    pub text: String,
}

/// The legend, drawn in a corner of the view.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Legend {
    /// Lines of text above the swatches (scale, unit, convention).
    pub lines: Vec<String>,
    /// World length of the scale bar.
    pub scale_bar_world: f64,
    /// What the scale bar stands for, with unit.
    pub scale_bar_text: String,
    /// Colour key.
    pub entries: Vec<LegendEntry>,
}

/// A round grip drawn at a world point on top of the geometry at its depth (the normal's
/// handle, which the user drags).
#[derive(Clone, Debug, PartialEq)]
pub struct Handle {
    /// Centre.
    pub at: Point3<f64>,
    /// Fill.
    pub fill: Rgba,
    /// Outline.
    pub outline: Rgba,
    /// Radius in pixels at the reference size.
    pub radius_px: f32,
}

/// Length of the cut plane's unit-normal arrow in the picture, world units; the handle sits at
/// its tip.
pub const NORMAL_LENGTH: f64 = 0.45;

/// The whole 3D picture.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Scene {
    /// Filled polygons (cube faces, cut plane).
    pub polygons: Vec<Polygon>,
    /// Shaded meshes (ellipsoid).
    pub meshes: Vec<TriMesh>,
    /// Lines (cube edges).
    pub segments: Vec<Segment>,
    /// Arrows (tractions, principal axes, plane normal).
    pub arrows: Vec<Arrow>,
    /// Grips the user can drag.
    pub handles: Vec<Handle>,
    /// Value labels.
    pub labels: Vec<Label>,
    /// Legend, when that layer is on.
    pub legend: Option<Legend>,
    /// Whether to draw the axis triad.
    pub triad: bool,
    /// World units per pascal for arrow lengths (0 for a zero tensor).
    pub arrow_scale_per_pa: f64,
    /// The point the view centres on (the origin, but for the plane element with its turned
    /// copy beside it, the middle of the two).
    pub focus: Point3<f64>,
    /// The user's notes pinned to world points (set by the caller after building).
    pub notes: Vec<Pinned<Point3<f64>>>,
}

impl Scene {
    /// Radius of a sphere about [`Scene::focus`] holding everything drawn (at least the
    /// cube's), so the view can fit the picture without depending on the view direction.
    #[must_use]
    pub fn radius(&self) -> f64 {
        let f = self.focus;
        let mut r: f64 = 0.87 + f.coords.norm();
        let mut grow = |p: &Point3<f64>| r = r.max((p - f).norm());
        for a in &self.arrows {
            grow(&a.from);
            grow(&a.to);
        }
        for s in &self.segments {
            grow(&s.a);
            grow(&s.b);
        }
        for m in &self.meshes {
            m.vertices.iter().for_each(&mut grow);
        }
        r
    }
}

/// Distance from the centre at which principal-stress arrows start: just past the cube's
/// corners (√3/2 ≈ 0.866).
const AXIS_REACH: f64 = 0.9;

/// How far beside the cube the turned plane element sits, world units.
pub const ROTATED_ELEMENT_OFFSET: f64 = 2.0;
/// How many normals the traction field samples.
pub const FIELD_NORMALS: usize = 240;
/// Radius of the sphere the traction field's arrows start on, world units.
pub const FIELD_RADIUS: f64 = 0.75;
/// The traction field's arrows are this fraction of the face arrows' scale.
pub const FIELD_SCALE: f64 = 0.45;

/// A user's note: words pinned to a point `P` of a figure (pixels once placed in a picture).
#[derive(Clone, Debug, PartialEq)]
pub struct Pinned<P> {
    /// The point it is pinned to.
    pub pin: P,
    /// The words (one line).
    pub text: String,
    /// Where the words sit from the pin, in multiples of the text size (x right, y down).
    pub offset: [f32; 2],
}

impl<P> Pinned<P> {
    /// The same note pinned at `f` of its pin (a figure's coordinates to pixels).
    pub fn pinned_at<Q>(&self, f: impl Fn(&P) -> Q) -> Pinned<Q> {
        Pinned {
            pin: f(&self.pin),
            text: self.text.clone(),
            offset: self.offset,
        }
    }
}
