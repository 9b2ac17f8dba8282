//! What the front doors (`cli` for files, `repl` for sessions) share, so that neither imports
//! the other: reading included sheets and data files from disk under the folder sandbox, and
//! the standard streams (tolerant of a closed pipe, standard error buffered), and the size
//! limits of every file read.

pub mod includes;
pub mod limits;
pub mod streams;
