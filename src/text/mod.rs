//! Text in and out: numbers and lists typed by users ([`parse`]) and numbers written for them
//! ([`format`](mod@format)). Above the mechanics (it knows units and components), below everything that
//! shows or reads a number.

pub mod format;
pub mod parse;
