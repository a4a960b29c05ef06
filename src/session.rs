//! The window's session state that panels read and edit through commands: the document (what
//! undo acts on), display settings, the measure choice, and the commands panels return. No
//! egui here, so panels depend on this module and not on the app shell.
//!
//! TODO(study): `Document` is to become a `study::Project` with its active case (issue 9).

use std::path::PathBuf;

use serde::{Deserialize, Serialize};

use crate::draw::camera::{Camera, ViewPreset};
use crate::mechanics::criteria::MohrCoulomb;
use crate::mechanics::search::{Measure, SearchSettings};
use crate::mechanics::{PlaneNormal, SignConvention, StressTensor, StressUnit};
use crate::scene::{FaceChoice, Layers};

/// The name a document gets once it is no longer the demo.
pub const UNTITLED: &str = "Untitled";

/// The part of the state that undo and redo act on.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Document {
    /// A name for the load case, shown in the title.
    pub name: String,
    /// The stress state.
    pub tensor: StressTensor,
    /// The cut plane.
    pub plane: PlaneNormal,
}

impl Default for Document {
    fn default() -> Self {
        Self::demo()
    }
}

impl Document {
    /// The built-in demo: an invented scenario, not data from any real part.
    #[must_use]
    pub fn demo() -> Self {
        let tensor = StressTensor::from_components(
            [120.0, -35.0, 15.0, 48.0, -12.0, 22.0],
            StressUnit::MPa,
            1.0,
        )
        .unwrap_or_default();
        let plane = PlaneNormal::from_vector(nalgebra::Vector3::new(1.0, 0.5, 0.3))
            .unwrap_or(PlaneNormal::X);
        Self {
            name: "Demo (invented scenario): fillet of a steel bracket".to_owned(),
            tensor,
            plane,
        }
    }
}

/// Display settings; saved, but not part of undo.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct Settings {
    /// Unit of every stress shown and typed.
    pub unit: StressUnit,
    /// Sign convention of every stress shown and typed.
    pub convention: SignConvention,
    /// Layers of the 3D view.
    pub layers: Layers,
    /// Faces with traction arrows.
    pub faces: FaceChoice,
    /// The 3D view's camera.
    pub camera: Camera,
    /// Size of exported figures, pixels.
    pub export_size: [u32; 2],
    /// The measure for the worst-plane search and the orientation map.
    pub measure: MeasureChoice,
    /// Which picture the central area shows.
    pub central: Central,
    /// Draw the Mohr–Coulomb envelope on the Mohr circles.
    pub mohr_envelope: bool,
}

/// The pictures the central area can show (`--tab 3d|map|mohr`).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize, Default, clap::ValueEnum)]
pub enum Central {
    /// The 3D view.
    #[default]
    #[value(name = "3d")]
    View3d,
    /// The orientation map.
    Map,
    /// The Mohr circles.
    Mohr,
}

impl Default for Settings {
    fn default() -> Self {
        Self {
            unit: StressUnit::MPa,
            convention: SignConvention::TensionPositive,
            layers: Layers::default(),
            faces: FaceChoice::FacingViewer,
            camera: Camera::default(),
            export_size: [1600, 1200],
            measure: MeasureChoice::default(),
            central: Central::View3d,
            mohr_envelope: false,
        }
    }
}

/// Edits that follow each other in the same field merge into one undo step.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Coalesce {
    /// Typing in one grid cell (row, column of the upper triangle).
    Cell(usize, usize),
    /// Typing in the plane's normal fields.
    PlaneVector,
    /// Typing in the dip fields.
    PlaneDip,
    /// Dragging the angle sliders.
    PlaneAngles,
    /// One drag in the Mohr diagram (the drag's serial number).
    MohrDrag(u64),
    /// One drag of the normal's handle in the 3D view (the drag's serial number).
    NormalHandle(u64),
}

/// What a panel asks for; applied by the app after the frame.
#[must_use]
#[derive(Clone, Debug, PartialEq)]
pub enum Command {
    /// Replace the document (undoable).
    Edit {
        /// The new document.
        document: Document,
        /// Merge with the previous edit of the same field.
        coalesce: Option<Coalesce>,
    },
    /// Undo the last edit.
    Undo,
    /// Redo the last undone edit.
    Redo,
    /// Go back to the demo load case and default settings (undoable for the document).
    ResetToDemo,
    /// Change the display unit.
    SetUnit(StressUnit),
    /// Change the sign convention.
    SetConvention(SignConvention),
    /// Look from a preset direction.
    SetView(ViewPreset),
    /// Put the results on the clipboard as tab-separated text.
    CopyResults,
    /// Put the figure on the clipboard as an image.
    CopyFigure,
    /// Open the export window.
    OpenExport,
    /// Ask for a file name, then export the figure there.
    ExportWithDialog,
    /// Export the figure to this path.
    ExportTo(PathBuf),
    /// Show the About window.
    ShowAbout,
}

/// A message in the status bar.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Status {
    /// Text.
    pub text: String,
    /// Whether it reports a failure.
    pub error: bool,
}

/// The measure and its parameters as the user set them (stresses in pascals).
#[derive(Clone, Copy, Debug, PartialEq, serde::Serialize, serde::Deserialize)]
#[serde(default)]
pub struct MeasureChoice {
    /// The measure.
    pub measure: Measure,
    /// Pore pressure, Pa (compression positive).
    pub pore_pressure_pa: f64,
    /// Cohesion, Pa.
    pub cohesion_pa: f64,
    /// Friction angle, degrees.
    pub friction_angle_deg: f64,
}

impl Default for MeasureChoice {
    fn default() -> Self {
        Self {
            measure: Measure::Shear,
            pore_pressure_pa: 0.0,
            cohesion_pa: 5e6,
            friction_angle_deg: 30.0,
        }
    }
}

impl MeasureChoice {
    /// The search settings in the display convention.
    #[must_use]
    pub fn settings(&self, settings: &Settings) -> SearchSettings {
        SearchSettings {
            measure: self.measure,
            convention: settings.convention,
            pore_pressure_pa: self.pore_pressure_pa,
            material: MohrCoulomb::new(self.cohesion_pa, self.friction_angle_deg).ok(),
        }
    }
}
