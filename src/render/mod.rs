//! Output: a sheet's results as a terminal table, Markdown, CSV or JSON, and diagnostics as
//! source snippets. Everything writes into a writer it is handed; nothing here opens files.

pub mod csv;
pub mod json;
pub mod plot;
pub mod print;
pub mod report;
pub mod snippet;
pub mod spread;
pub mod spread_chart;
pub mod table;
pub mod text_table;
pub mod working;

pub use crate::numeric::{format_significant, write_significant};
pub use snippet::write_diagnostics;

/// Output formats of `--format`.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Format {
    Table,
    Markdown,
    Csv,
    Json,
}

/// How numbers and tables are drawn.
#[derive(Debug, Clone, Copy)]
pub struct RenderOptions {
    pub format: Format,
    /// Significant figures of displayed values.
    pub digits: u32,
    /// Columns of text a terminal table may use (`None`: as wide as its contents). Markdown,
    /// CSV and JSON always carry whole texts.
    pub width: Option<usize>,
}

/// The caution that goes with every report and the README.
pub const CAUTION: &str = "Results are engineering estimates that depend on the inputs and formulations used. \
They must be checked by a qualified person and do not replace local codes, regulations or licensed professional practice.";
