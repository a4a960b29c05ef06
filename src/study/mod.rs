//! The study: a project's load cases, factored combinations, cut plane and measure, the edits
//! that change it, undo and redo, the results every panel reads, the envelope and the project
//! file. The window and the command line are both front ends of it. No egui here.

pub mod actions;
pub mod annotations;
pub mod atomic;
pub mod derived;
pub mod edit;
pub mod envelope;
pub mod error;
pub mod fatigue;
pub mod file;
pub mod history;
pub mod inputs;
pub mod load_history;
pub mod model;
pub mod table;
pub mod unknown;

pub use derived::{Derived, DerivedCache};
pub use edit::Edit;
pub use history::History;

pub use envelope::{Envelope, EnvelopeMeasure, EnvelopeRow, envelope};
pub use error::StudyError;
pub use file::{FORMAT_VERSION, FileError, load, save};
pub use inputs::{
    CaseInput, FieldKind, InSituInput, InputKind, PlaneStressInput, PrincipalInput, RosetteInput,
    TableRowInput, TypedTensor,
};
pub use model::{
    CaseTableFile, Combination, FaultPlane, LoadCase, LoadCaseTables, Material, MeasureChoice,
    Project, Term,
};
