//! fluxsheet: plain-text calculation sheets with units for the linear transport laws of porous
//! media (Darcy, Fick, Fourier, Ohm).
//!
//! Layers, each using only those before it: `syntax` and `units` → `eval` → `library` →
//! `render`. The front ends (`cli`, `repl`, `lsp`, and `front`, which they share) are the only
//! code that touches files, the terminal or an editor's connection.
//!
//! # Using the engine from Rust
//!
//! The public API is small: evaluate a sheet's text against the standard library of relations,
//! then read each line's value (in SI and in its display unit), the checks and the diagnostics.
//!
//! ```
//! use fluxsheet::{evaluate_sheet, Builtins, LineResult, Shown};
//!
//! let sheet = "k = 420 mD\nK [m/s] = hydraulic_conductivity(k, 20 degC)\ncheck K < 1e-4 m/s\n";
//! let evaluation = evaluate_sheet(sheet, Builtins::standard());
//! assert!(evaluation.diagnostics.is_empty());
//! let conductivity = evaluation
//!     .lines
//!     .iter()
//!     .find(|line| line.name.as_deref() == Some("K"))
//!     .and_then(|line| match &line.result {
//!         LineResult::Value(Shown::Scalar(shown)) => Some(shown),
//!         _ => None,
//!     })
//!     .expect("K has a value");
//! assert_eq!(conductivity.unit, "m/s");
//! // 420 mD of water at 20 degC: about 4.05e-6 m/s.
//! assert!((conductivity.value - 4.05e-6).abs() < 0.01e-6);
//! ```
//!
//! `evaluate` takes a file name and an `IncludeLoader` for sheets with includes and data
//! files; `eval::session::Session` is the incremental form behind the interactive session.

#[doc(hidden)]
pub mod cli;
pub mod eval;
#[doc(hidden)]
pub mod front;
pub mod library;
#[doc(hidden)]
pub mod lsp;
pub mod numeric;
pub mod render;
#[doc(hidden)]
pub mod repl;
pub mod suggest;
pub mod syntax;
pub mod units;

pub use eval::{
    evaluate, evaluate_sheet, CheckOutcome, Diagnostic, Evaluation, IncludeLoader, LineOutcome,
    LineResult, Quantity, Severity, Shown, ShownValue,
};
pub use library::Builtins;
