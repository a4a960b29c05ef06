//! The study: a project's load cases, factored combinations and their envelope — the model that
//! the command line uses today and the window and reports are to share. No egui here.
//!
//! TODO(study): the window still keeps its own one-tensor document; moving it onto [`Project`]
//! (cases list, combinations editor, envelope view, File → Open/Save) is the next step.

pub mod envelope;
pub mod file;
pub mod model;

pub use envelope::{Envelope, EnvelopeMeasure, EnvelopeRow, envelope};
pub use file::{FORMAT_VERSION, FileError, load, save};
pub use model::{CaseInput, Combination, LoadCase, Project, StudyError, Term, TypedTensor};
