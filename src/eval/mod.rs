//! Evaluation: values, dependency order, evaluation of a sheet, and diagnostics.
//!
//! `eval` defines the interface built-in functions implement (`function`), but knows no
//! built-in itself; the front ends hand it a `Library`. It does no I/O.

pub mod columns;
pub mod data;
pub mod diagnostic;
pub mod error;
pub mod evaluate;
mod fit;
pub mod function;
pub mod order;
pub mod session;
mod solve;
pub mod sources;
pub mod uncertainty;
pub mod value;
pub mod warnings;

pub use diagnostic::{Diagnostic, Severity};
pub use error::{EvalError, EvalErrorKind};
pub use evaluate::{
    available_cores, evaluate, evaluate_sheet, evaluate_with, CallRecord, CheckOutcome, Evaluation,
    LineOutcome, LineResult, PlotOutcome, Settings, Shown, ShownColumn, ShownValue,
    NOTHING_TO_SAMPLE, UNKNOWN_OVERRIDE,
};
pub use function::{CallError, Constant, Formulation, Function, Library, Provenance};
pub use sources::{
    IncludeLoader, LoadedSheet, NoIncludes, SourceFile, SourceMap, INCLUDE_DEPTH_LIMIT,
};
pub use value::{Column, Labels, Quantity, TemperatureKind, Value};
