//! The desktop program: the app shell, the session state panels read and change through
//! commands, autosave, native dialogs and the panels themselves ([`ui`]). Above everything but
//! the command line, which starts it.

pub mod app;
pub mod autosave;
pub mod dialogs;
pub mod keys;
pub mod session;
pub mod ui;
