//! What the front doors (`cli` for files, `repl` for sessions) share, so that neither imports
//! the other: reading included sheets and data files from disk under the folder sandbox, and
//! the standard streams (tolerant of a closed pipe, standard error buffered), the exit codes,
//! and the size limits of every file read.

pub mod includes;
pub mod limits;
pub mod streams;

/// The exit codes of every command and of a scripted session.
pub mod exit {
    pub const OK: u8 = 0;
    pub const CHECK_FAILED: u8 = 1;
    pub const USAGE: u8 = 2;
    pub const SHEET_ERROR: u8 = 3;
}
