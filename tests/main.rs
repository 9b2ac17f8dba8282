// Test helpers unwrap freely: a failure there is a test failure with its message.
#![allow(clippy::unwrap_used)]

//! The single integration-test binary: drives the built `fluxsheet` and the library API.
//!
//! - `checker`: check lines, `check` over folders, warnings, reports, `--against`.
//! - `cli`: commands, formats, exit codes and the JSON contract.
//! - `errors`: each error class on a small sheet, its exit code and rendered message.
//! - `fitting`: `fit` lines recover known parameters from synthetic records; refusals.
//! - `worksheets`: every demo sheet runs clean, with pinned values computed independently.
//! - `package`: the checker's package: working, input hashes, title block, sign-off,
//!   `--against` across edits and moved folders, the project folder sandbox.
//! - `reference`: unit factors against NIST SP 811 and the `uom` crate.
//! - `robust_inputs`: the table of bad inputs (exit code and message for each), outputs that
//!   never replace inputs, session saves that lose no line, closed pipes, signals.
//! - `robustness`: generated input never panics; hostile nesting is refused.
//! - `transport`: transport and well functions on sheets: trade units, references, refusals.
//! - `trust_warnings`: warnings only where a mistake is likely; formulations cited by every relation.
//! - `output_width`: `run`, `functions` and `units` fit terminals of 80 and 100 columns.
//! - `lsp`: the language server over stdio as an editor drives it, and Neovim headless.
//! - `repl`: the interactive session, scripted over stdin and on a pseudo-terminal.
//! - `trust`: no silent wrong numbers: temperatures, absolute zero, check boundaries, domains,
//!   letter case of units, and an oracle over random sheets.
//! - `trust_front`: solve precision over wide brackets, sessions loading sheets with includes,
//!   expressions starting with a minus sign on the command line.
//! - `robust_memory`: the row and file-size limits as errors, and long columns streamed.
//! - `uncertainty`: distributions sampled by `run --samples`: statistics against closed forms
//!   and regenerated samples, reproducibility across threads, refusals.
//! - `fuzz_corpus`: the committed fuzz corpus replayed through the fuzz targets' entry points.

mod checker;
mod cli;
mod columns;
mod errors;
mod fitting;
mod fuzz_corpus;
mod includes;
mod lsp;
mod output_width;
mod package;
mod plot;
mod properties;
mod reference;
mod repl;
mod robust_inputs;
mod robust_memory;
mod robustness;
mod transport;
mod trust;
mod trust_front;
mod trust_warnings;
mod uncertainty;
mod util;
mod worksheets;
mod wrong_attempts;
