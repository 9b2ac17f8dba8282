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

use super::table::{entry, unit_cell, Entry};
use super::write_significant;
use crate::eval::{Evaluation, LineResult, Shown};
use std::borrow::Cow;
use std::io::{self, Write};

/// The header of the layout above.
pub const CSV_HEADER: [&str; 6] = ["line", "name", "row", "value", "unit", "expression"];

/// Writes the whole sheet in the layout above, numbers to `digits` significant figures.
/// Records are written by hand (RFC 4180 quoting, `quoted`): a column's rows share every
/// field but the row number and the value, so each row costs one number formatted.
pub fn write_sheet(out: &mut dyn Write, evaluation: &Evaluation, digits: u32) -> io::Result<()> {
    let mut out = io::BufWriter::with_capacity(1 << 16, out);
    let mut record = String::with_capacity(256);
    record.push_str(&CSV_HEADER.join(","));
    record.push('\n');
    out.write_all(record.as_bytes())?;
    let mut row_number = itoa::Buffer::new();
    for line in &evaluation.lines {
        let Some(Entry::Row(row)) = entry(line, digits) else {
            continue;
        };
        let column = match &line.result {
            LineResult::Value(shown) if shown.rows().is_some() => shown,
            _ => {
                record.clear();
                for (index, field) in [
                    &row.line,
                    &row.name,
                    "",
                    &row.value,
                    &row.unit,
                    &row.expression,
                ]
                .into_iter()
                .enumerate()
                {
                    if index > 0 {
                        record.push(',');
                    }
                    record.push_str(&quoted(field));
                }
                record.push('\n');
                out.write_all(record.as_bytes())?;
                continue;
            }
        };
        // `line,name,` before the row number, `,unit,` after the value.
        let before = format!("{},{},", quoted(&row.line), quoted(&row.name));
        let unit = format!(",{},", quoted(&unit_cell(column.unit())));
        for index in 0..column.rows().unwrap_or(0) {
            record.clear();
            record.push_str(&before);
            record.push_str(row_number.format(index + 1));
            record.push(',');
            match column {
                Shown::Column(values) => {
                    write_significant(&mut record, values.shown(index), digits)
                }
                Shown::Labels(labels) => record.push_str(&quoted(&labels.texts[index])),
                Shown::Scalar(scalar) => write_significant(&mut record, scalar.value, digits),
            }
            record.push_str(&unit);
            if index == 0 {
                record.push_str(&quoted(&row.expression));
            }
            record.push('\n');
            out.write_all(record.as_bytes())?;
        }
    }
    out.flush()
}

/// A field as RFC 4180 writes it: in double quotes, with its quotes doubled, when it holds a
/// comma, a quote or a line break (or starts or ends with a space, which readers may trim).
fn quoted(field: &str) -> Cow<'_, str> {
    let needs_quotes =
        field.contains([',', '"', '\n', '\r']) || field.starts_with(' ') || field.ends_with(' ');
    if needs_quotes {
        Cow::Owned(format!("\"{}\"", field.replace('"', "\"\"")))
    } else {
        Cow::Borrowed(field)
    }
}

#[cfg(test)]
mod tests {
    use super::quoted;

    #[test]
    fn fields_are_quoted_only_when_a_reader_needs_it() {
        assert_eq!(quoted("4.05e-6"), "4.05e-6");
        assert_eq!(
            quoted("hydraulic_conductivity(k, T)"),
            "\"hydraulic_conductivity(k, T)\""
        );
        assert_eq!(quoted("say \"hi\""), "\"say \"\"hi\"\"\"");
        assert_eq!(quoted("two\nlines"), "\"two\nlines\"");
        assert_eq!(quoted(""), "");
    }
}
