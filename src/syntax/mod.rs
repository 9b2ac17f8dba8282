//! Syntax: text to syntax tree, with spans and errors as values.
//!
//! The grammar lives in `grammar/worksheet.pest`; pest's `Rule` and pairs never leave this
//! module. A sheet is parsed line by line, so every syntax error of a sheet is reported in one
//! run and the other lines still evaluate.

pub mod ast;
mod build;
pub mod error;
pub mod span;

pub use ast::*;
pub use build::{
    parse_expression, parse_line, parse_set_value, parse_sheet, parse_sheet_at, parse_sheet_with,
    parse_unit, ParsedSheet, BYTE_ORDER_MARK, UNIT_EXPONENT_LIMIT,
};
pub use error::SyntaxError;
pub use span::Span;

mod parser {
    #[derive(pest_derive::Parser)]
    #[grammar = "../grammar/worksheet.pest"]
    pub(crate) struct WorksheetParser;
}
