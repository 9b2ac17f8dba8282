//! The editor front door: `fluxsheet lsp`, a language server over standard input and output.
//! Editors get each line's value and unit as an inlay hint, the same diagnostics as `run`
//! (included sheets and data files too), hovers on names, built-ins and units, completion,
//! go to definition across includes and the outline of headings and named lines.
//!
//! Beside `cli` and `repl`, and like them built on `front` (the include loader and its folder
//! sandbox); it imports neither. The protocol crates do the framing and the message types:
//! `lsp-server` reads and writes messages, `lsp-types` shapes them. The loop is synchronous:
//! a full evaluation of a 1 000-line sheet fits well inside a keystroke (see `benches/`).

mod completion;
mod diagnostics;
mod document;
mod hover;
mod inlay;
mod navigation;
mod position;
mod server;
mod transport;
mod uri;

pub use document::Document;
pub use server::{capabilities, run, Server};
