//! What leaves the program: result rows (one list shared by the panels, copies and the report),
//! the calculation report, the walk-through's steps and the export of figures to files. Above
//! the pictures, below the window and the command line.

pub mod export;
pub mod fatigue_report;
pub mod report;
pub mod results;
pub mod walkthrough;
