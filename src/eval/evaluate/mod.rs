//! Evaluation of a sheet: definitions in dependency order, then shown expressions and checks.
//!
//! Every independent error is collected; a line whose inputs failed is skipped quietly (its
//! cause is already reported), and every other line still evaluates. Nothing here panics on
//! user input or prints: the result is a value the front ends render.
//!
//! The parts: `result` (what an evaluation gives), `load` (a sheet with its includes and data
//! files), `sheet` (the sheet evaluator), `calculator` (expressions against a scope, shared with
//! sessions), `calls`, `values`, `checks`, `plots`, and `arithmetic` (the dimension and
//! temperature rules).

mod arithmetic;
mod calculator;
mod calls;
mod checks;
mod distributions;
mod load;
mod plots;
mod result;
mod sampled;
mod sheet;
mod values;

pub(crate) use arithmetic::*;
pub(crate) use calculator::*;
pub use result::*;
pub use sampled::NOTHING_TO_SAMPLE;
pub use sheet::*;
