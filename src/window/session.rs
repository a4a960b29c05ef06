//! The window's session state that panels read and change through commands: display settings
//! (not part of undo) and the commands panels return. The project itself, what undo acts on,
//! is [`crate::study::Project`]. No egui here, so panels depend on this module and the study,
//! not on the app shell.

use std::path::PathBuf;

use serde::{Deserialize, Serialize};

use crate::picture::draw::camera::{Camera, ViewPreset};
use crate::picture::scene::{FaceChoice, Layers};
use crate::study::{Edit, EnvelopeMeasure};

/// The name the demo project gets once its stresses are changed: it is no longer the invented
/// scenario.
pub const UNTITLED: &str = "Untitled";

/// Display settings; saved, but not part of undo.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default)]
#[expect(
    clippy::struct_excessive_bools,
    reason = "independent display switches, each a checkbox the user sees"
)]
pub struct Settings {
    /// Layers of the 3D view.
    pub layers: Layers,
    /// Faces with traction arrows.
    pub faces: FaceChoice,
    /// The 3D view's camera.
    pub camera: Camera,
    /// Size of exported figures, pixels.
    pub export_size: [u32; 2],
    /// Which picture the central area shows.
    pub central: Central,
    /// Draw the Mohr–Coulomb envelope on the Mohr circles.
    pub mohr_envelope: bool,
    /// What the envelope view ranks by.
    pub envelope_measure: EnvelopeMeasure,
    /// Project files opened or saved lately, newest first.
    pub recent: Vec<PathBuf>,
    /// Exported and copied figures carry a title block.
    pub title_block: bool,
    /// The title block's first line.
    pub figure_title: String,
    /// The inputs panel (cases, stress, plane) is shown.
    pub show_inputs: bool,
    /// The results panel (verdict, material, results) is shown.
    pub show_results: bool,
    /// Dark panels instead of the light default (the figures stay on paper white).
    pub dark: bool,
    /// The Fatigue tab's critical plane, marked in the 3D view while the tab asks (never
    /// saved: it belongs to a history read in this run).
    #[serde(skip)]
    pub fatigue_plane: Option<(crate::mechanics::PlaneNormal, String)>,
}

/// How many recent files File → Open recent lists.
pub const RECENT_LIMIT: usize = 8;

impl Settings {
    /// Puts `path` first in the recent files.
    pub fn remember(&mut self, path: &std::path::Path) {
        self.recent.retain(|p| p != path);
        self.recent.insert(0, path.to_owned());
        self.recent.truncate(RECENT_LIMIT);
    }
}

/// The pictures the central area can show (the command line's `--tab` takes their keys).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize, Default)]
pub enum Central {
    /// The 3D view.
    #[default]
    View3d,
    /// The orientation map.
    Map,
    /// The Mohr circles.
    Mohr,
    /// The envelope over every case and combination.
    Envelope,
    /// Named planes checked as faults.
    Faults,
    /// The walk-through of the shown case.
    Walkthrough,
    /// An imported finite-element table, ranked.
    Table,
    /// A load history judged on its critical plane.
    Fatigue,
}

impl Central {
    /// Every tab, in the order the window shows them.
    pub const ALL: [Self; 8] = [
        Self::View3d,
        Self::Map,
        Self::Mohr,
        Self::Envelope,
        Self::Faults,
        Self::Walkthrough,
        Self::Table,
        Self::Fatigue,
    ];

    /// The name `--tab` takes.
    #[must_use]
    pub fn key(self) -> &'static str {
        match self {
            Self::View3d => "3d",
            Self::Map => "map",
            Self::Mohr => "mohr",
            Self::Envelope => "envelope",
            Self::Faults => "faults",
            Self::Walkthrough => "walkthrough",
            Self::Table => "table",
            Self::Fatigue => "fatigue",
        }
    }

    /// What the tab shows, in words.
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            Self::View3d => "The 3D view",
            Self::Map => "The orientation map",
            Self::Mohr => "The Mohr circles",
            Self::Envelope => "The envelope over every case and combination",
            Self::Faults => "Named planes checked as faults",
            Self::Walkthrough => "The walk-through of the shown case",
            Self::Table => "An imported finite-element table, ranked",
            Self::Fatigue => "A load history judged on its critical plane",
        }
    }
}

impl Default for Settings {
    fn default() -> Self {
        Self {
            layers: Layers::default(),
            faces: FaceChoice::FacingViewer,
            camera: Camera::default(),
            export_size: [1600, 1200],
            central: Central::View3d,
            mohr_envelope: false,
            envelope_measure: EnvelopeMeasure::VonMises,
            recent: Vec::new(),
            title_block: false,
            figure_title: String::new(),
            show_inputs: true,
            show_results: true,
            dark: false,
            fatigue_plane: None,
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
    /// Typing in the measure fields.
    MeasureFields,
    /// Typing in the material editor.
    MaterialFields,
    /// Typing in the faults table.
    FaultFields,
    /// Typing in a load case's input form (in-situ, principal axes, rosette, plane stress).
    InputFields,
    /// Typing a combination's factors.
    Factors,
    /// Typing a case's description.
    Description,
    /// Typing a figure's caption.
    Caption,
    /// Typing a note's text (its index among the annotations).
    NoteText(usize),
    /// One drag of a note's text (the drag's serial number).
    NoteDrag(u64),
}

/// What a panel asks for; applied by the app after the frame.
#[must_use]
#[derive(Clone, Debug, PartialEq)]
pub enum Command {
    /// Change the project (one undoable step, or merged into the last with `coalesce`).
    Edit {
        /// The change.
        edit: Edit,
        /// Merge with the previous edit of the same field.
        coalesce: Option<Coalesce>,
    },
    /// Undo the last edit.
    Undo,
    /// Redo the last undone edit.
    Redo,
    /// Look from a preset direction.
    SetView(ViewPreset),
    /// Start a new project (asks first when there are unsaved changes).
    NewProject,
    /// Ask for a project file and open it (asks first when there are unsaved changes).
    OpenProject,
    /// Open this project file (asks first when there are unsaved changes).
    OpenPath(PathBuf),
    /// Open the built-in demo project (asks first when there are unsaved changes).
    OpenDemo,
    /// Save to the project's file, or ask for one.
    Save,
    /// Ask for a file name and save there.
    SaveAs,
    /// Save to this path.
    SaveTo(PathBuf),
    /// Ask for a file name and write the calculation report there.
    ExportReport,
    /// Ask for a finite-element table to import (a file dialog, else the Table tab's path
    /// field).
    ImportTable,
    /// Write the calculation report to this path.
    ReportTo(PathBuf),
    /// Put the results on the clipboard as tab-separated text.
    CopyResults(crate::output::results::CopyFormat),
    /// Put this table on the clipboard.
    CopyTable(
        crate::output::results::TextTable,
        crate::output::results::CopyFormat,
    ),
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
    /// Open Help → Keys and mouse.
    ShowKeys,
    /// The user answered a question.
    Answer(Answer),
    /// Show or hide the left panel (inputs).
    ToggleInputs,
    /// Show or hide the right panel (verdict and results).
    ToggleResults,
}

/// What waits for the answer to "save the changes first?".
#[derive(Clone, Debug, PartialEq)]
pub enum Leaving {
    /// Start a new project.
    New,
    /// Ask for a project file to open.
    Open,
    /// Open this file.
    OpenPath(PathBuf),
    /// Open the demo project.
    Demo,
    /// Close the window.
    Quit,
}

/// An answer to one of the window's questions (unsaved changes, recovery).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Answer {
    /// Save the changes, then do what was asked.
    SaveFirst,
    /// Do what was asked without saving.
    DontSave,
    /// Do nothing; keep the project open.
    Stay,
    /// Open the autosaved working copy.
    Recover,
    /// Throw the working copy away.
    DiscardRecovery,
}

/// A message in the status bar.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Status {
    /// Text.
    pub text: String,
    /// Whether it reports a failure.
    pub error: bool,
}
