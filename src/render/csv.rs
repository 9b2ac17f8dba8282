//! A sheet as one CSV table that any CSV reader takes whole, whatever mix of single values and
//! columns of different lengths the sheet holds: one record per value.
//!
//! ```text
//! line,name,row,value,unit,expression
//! 3,k,,420,mD,420 mD
//! 4,T,1,10,degC,10 degC to 30 degC step 10 K
//! 4,T,2,20,degC,
//! 4,T,3,30,degC,
//! 6,check,,passed,,4.05e-6 m/s < 1e-4 m/s
//! ```
//!
//! `row` is empty for a single value and counts from 1 for a column's rows; the expression is
//! written once, on a column's first row. Checks, includes, plots and lines with errors keep
//! their word in `value` (`passed`, `FAILED`, `error`, `-` for a line not evaluated). Rows
//! are written as they are formatted, through one reused buffer: memory does not grow with
//! the row count.

use super::table::{entry, unit_cell, Entry, HEADER};
use super::write_significant;
use crate::eval::{Evaluation, LineResult, Shown};
use std::io::{self, Write};

/// The header of the layout above.
pub const CSV_HEADER: [&str; 6] = ["line", "name", "row", "value", "unit", "expression"];

/// Writes the whole sheet in the layout above, numbers to `digits` significant figures.
pub fn write_sheet(out: &mut dyn Write, evaluation: &Evaluation, digits: u32) -> io::Result<()> {
    debug_assert_eq!(HEADER.len() + 1, CSV_HEADER.len());
    let mut writer = ::csv::Writer::from_writer(out);
    let csv_error = |error: ::csv::Error| io::Error::other(error.to_string());
    writer.write_record(CSV_HEADER).map_err(csv_error)?;
    let mut number = String::new();
    let mut row_text = String::new();
    for line in &evaluation.lines {
        let column = match &line.result {
            LineResult::Value(shown) if shown.rows().is_some() => Some(shown),
            _ => None,
        };
        let Some(Entry::Row(row)) = entry(line, digits) else {
            continue;
        };
        let Some(shown) = column else {
            writer
                .write_record([
                    &row.line,
                    &row.name,
                    "",
                    &row.value,
                    &row.unit,
                    &row.expression,
                ])
                .map_err(csv_error)?;
            continue;
        };
        let unit = unit_cell(shown.unit());
        for index in 0..shown.rows().unwrap_or(0) {
            number.clear();
            match shown {
                Shown::Column(column) => write_significant(&mut number, column.shown(index), digits),
                Shown::Labels(labels) => number.push_str(&labels.texts[index]),
                Shown::Scalar(scalar) => write_significant(&mut number, scalar.value, digits),
            }
            row_text.clear();
            {
                use std::fmt::Write as _;
                let _ = write!(row_text, "{}", index + 1);
            }
            let expression = if index == 0 { row.expression.as_str() } else { "" };
            for field in [
                row.line.as_str(),
                row.name.as_str(),
                row_text.as_str(),
                number.as_str(),
                unit.as_str(),
                expression,
            ] {
                writer.write_field(field).map_err(csv_error)?;
            }
            writer.write_record(None::<&[u8]>).map_err(csv_error)?;
        }
    }
    writer.flush()
}
