//! fluxsheet: plain-text calculation sheets with units for the linear transport laws of porous
//! media (Darcy, Fick, Fourier, Ohm).
//!
//! Layers, each using only those before it: `syntax` and `units` → `eval` → `library` →
//! `render`. The front ends (`cli`, `repl`, and `front`, which they share) are the only code that
//! touches files or the terminal.

pub mod cli;
pub mod eval;
pub mod front;
pub mod library;
pub mod numeric;
pub mod render;
pub mod repl;
pub mod suggest;
pub mod syntax;
pub mod units;
