//! A sheet's results as rows: line, name, value, unit, expression. Headings start sections;
//! checks show both sides in one unit; failed and skipped lines say so instead of a number.

use super::text_table::{Align, TextTable};
use super::{format_significant, Format, RenderOptions};
use crate::eval::{CheckOutcome, Evaluation, LineResult, Shown};
use std::io::{self, Write};

/// One printable row, before formatting.
struct Row {
    line: String,
    name: String,
    value: String,
    unit: String,
    expression: String,
}

enum Entry {
    Heading(String),
    Row(Row),
}

/// Longest expression text shown in a cell; longer text is cut with an ellipsis.
const LONGEST_EXPRESSION: usize = 120;

fn shortened(text: &str) -> String {
    if text.chars().count() <= LONGEST_EXPRESSION {
        return text.to_string();
    }
    let mut cut: String = text.chars().take(LONGEST_EXPRESSION - 1).collect();
    cut.push('…');
    cut
}

const HEADER: [&str; 5] = ["line", "name", "value", "unit", "expression"];

/// A unit as shown in a cell: blank for a plain number.
fn unit_cell(unit: &str) -> String {
    if unit == "1" {
        String::new()
    } else {
        unit.to_string()
    }
}

fn with_unit(value: f64, unit: &str, digits: u32) -> String {
    let number = format_significant(value, digits);
    match unit_cell(unit).as_str() {
        "" => number,
        unit => format!("{number} {unit}"),
    }
}

/// Both sides of a check in one unit, e.g. `4.05e-6 m/s > 9.16e-7 m/s within 1 %`.
pub fn check_text(check: &CheckOutcome, digits: u32) -> String {
    let mut text = format!(
        "{} {} {}",
        with_unit(check.left.value, &check.left.unit, digits),
        check.comparison.symbol(),
        with_unit(check.right.value, &check.right.unit, digits),
    );
    if let Some(tolerance) = &check.tolerance {
        text.push_str(&format!(" within {tolerance}"));
    }
    if let Some(rows) = &check.rows {
        if rows.failed == 0 {
            text.push_str(&format!(
                " (all {} rows pass; closest is row {})",
                rows.total, rows.shown_row
            ));
        } else {
            text.push_str(&format!(
                " ({} of {} rows fail; first is row {})",
                rows.failed, rows.total, rows.shown_row
            ));
        }
    }
    if let Some(message) = &check.message {
        text.push_str(&format!(": {message}"));
    }
    text
}

/// A line's value cell: the number, or for a column its row count (the rows are in the column
/// table below).
pub fn value_cell(shown: &Shown, digits: u32) -> String {
    match shown {
        Shown::Scalar(shown) => format_significant(shown.value, digits),
        _ => format!("{} rows", shown.rows().unwrap_or(0)),
    }
}

/// The column-valued lines of a sheet, grouped by length: one table per group, a row per
/// element and a column per line.
pub struct ColumnTable<'e> {
    pub rows: usize,
    /// Each column's header (`K [m/s]`) and value.
    pub columns: Vec<(String, &'e Shown)>,
}

impl ColumnTable<'_> {
    pub fn header(&self) -> Vec<String> {
        std::iter::once("row".to_string())
            .chain(self.columns.iter().map(|(header, _)| header.clone()))
            .collect()
    }

    /// The cells of row `row` (0-based).
    pub fn cells(&self, row: usize, digits: u32) -> Vec<String> {
        std::iter::once((row + 1).to_string())
            .chain(self.columns.iter().map(|(_, shown)| match shown {
                Shown::Column(column) => format_significant(column.shown(row), digits),
                Shown::Labels(labels) => labels.texts[row].clone(),
                Shown::Scalar(scalar) => format_significant(scalar.value, digits),
            }))
            .collect()
    }
}

pub fn column_tables(evaluation: &Evaluation) -> Vec<ColumnTable<'_>> {
    let mut tables: Vec<ColumnTable> = Vec::new();
    for line in &evaluation.lines {
        let LineResult::Value(shown) = &line.result else {
            continue;
        };
        let Some(rows) = shown.rows() else {
            continue;
        };
        let name = line
            .name
            .clone()
            .unwrap_or_else(|| format!("line {}", line.number));
        let header = match unit_cell(shown.unit()).as_str() {
            "" => name,
            unit => format!("{name} [{unit}]"),
        };
        match tables.iter_mut().find(|table| table.rows == rows) {
            Some(table) => table.columns.push((header, shown)),
            None => tables.push(ColumnTable {
                rows,
                columns: vec![(header, shown)],
            }),
        }
    }
    tables
}

fn entries(evaluation: &Evaluation, digits: u32) -> Vec<Entry> {
    let mut entries = Vec::new();
    for line in &evaluation.lines {
        let row = |value: String, unit: String, expression: String| {
            Entry::Row(Row {
                line: line.number.to_string(),
                name: line.name.clone().unwrap_or_default(),
                value,
                unit,
                expression: shortened(&expression),
            })
        };
        match &line.result {
            LineResult::Blank | LineResult::Comment => {}
            LineResult::Heading(text) => entries.push(Entry::Heading(text.clone())),
            LineResult::Value(shown) => entries.push(row(
                value_cell(shown, digits),
                unit_cell(shown.unit()),
                match &line.note {
                    Some(note) => format!("{}  ({note})", line.expression),
                    None => line.expression.clone(),
                },
            )),
            LineResult::Check(check) => entries.push(Entry::Row(Row {
                line: line.number.to_string(),
                name: "check".to_string(),
                value: if check.passed { "passed" } else { "FAILED" }.to_string(),
                unit: String::new(),
                expression: check_text(check, digits),
            })),
            LineResult::Function { signature } => entries.push(row(
                "function".to_string(),
                String::new(),
                format!("{signature} = {}", line.expression),
            )),
            LineResult::Plot(_) => entries.push(Entry::Row(Row {
                line: line.number.to_string(),
                name: "plot".to_string(),
                value: String::new(),
                unit: String::new(),
                expression: shortened(&line.expression),
            })),
            LineResult::Include { file } => entries.push(Entry::Row(Row {
                line: line.number.to_string(),
                name: "include".to_string(),
                value: String::new(),
                unit: String::new(),
                expression: file.clone(),
            })),
            LineResult::Error => entries.push(row(
                "error".to_string(),
                String::new(),
                line.expression.clone(),
            )),
            LineResult::Skipped { because_of } => entries.push(row(
                "-".to_string(),
                String::new(),
                format!(
                    "{}  (not evaluated: `{because_of}` has an error)",
                    line.expression
                ),
            )),
        }
    }
    entries
}

/// Writes the results of one sheet in a text format (table, Markdown or CSV).
pub fn write_sheet(
    out: &mut dyn Write,
    evaluation: &Evaluation,
    options: RenderOptions,
) -> io::Result<()> {
    let entries = entries(evaluation, options.digits);
    match options.format {
        Format::Csv => write_csv(out, &entries),
        Format::Markdown => write_markdown(out, &entries),
        Format::Table | Format::Json => write_table(out, &entries),
    }?;
    for table in column_tables(evaluation) {
        writeln!(out)?;
        match options.format {
            Format::Csv => write_column_csv(out, &table, options.digits),
            Format::Markdown => write_column_markdown(out, &table, options.digits),
            Format::Table | Format::Json => write_column_table(out, &table, options.digits),
        }?;
    }
    if options.format != Format::Csv {
        write_sources(out, evaluation, options.format)?;
    }
    Ok(())
}

/// The sheet's table, measured over every entry, then written row by row.
fn write_table(out: &mut dyn Write, entries: &[Entry]) -> io::Result<()> {
    let cells = |entry: &Entry| -> [String; 5] {
        match entry {
            Entry::Heading(text) => [
                String::new(),
                String::new(),
                String::new(),
                String::new(),
                format!("## {text}"),
            ],
            Entry::Row(row) => [
                row.line.clone(),
                row.name.clone(),
                row.value.clone(),
                row.unit.clone(),
                row.expression.clone(),
            ],
        }
    };
    let mut table = TextTable::new(&HEADER, &[]);
    for entry in entries {
        table.measure(&cells(entry));
    }
    table.write_top(out)?;
    table.write_header(out, &HEADER)?;
    for entry in entries {
        table.write_row(out, &cells(entry))?;
    }
    table.write_bottom(out)
}

fn markdown_cell(text: &str) -> String {
    text.replace('|', "\\|")
}

fn write_markdown(out: &mut dyn Write, entries: &[Entry]) -> io::Result<()> {
    let mut table_open = false;
    for entry in entries {
        match entry {
            Entry::Heading(text) => {
                if table_open {
                    writeln!(out)?;
                }
                writeln!(out, "### {}\n", text)?;
                table_open = false;
            }
            Entry::Row(row) => {
                if !table_open {
                    writeln!(out, "| {} |", HEADER.join(" | "))?;
                    writeln!(out, "|---:|---|---:|---|---|")?;
                    table_open = true;
                }
                writeln!(
                    out,
                    "| {} | {} | {} | {} | `{}` |",
                    row.line,
                    markdown_cell(&row.name),
                    markdown_cell(&row.value),
                    markdown_cell(&row.unit),
                    markdown_cell(&row.expression)
                )?;
            }
        }
    }
    Ok(())
}

fn write_csv(out: &mut dyn Write, entries: &[Entry]) -> io::Result<()> {
    let mut writer = csv::Writer::from_writer(out);
    let csv_error = |error: csv::Error| io::Error::other(error.to_string());
    writer.write_record(HEADER).map_err(csv_error)?;
    for entry in entries {
        if let Entry::Row(row) = entry {
            writer
                .write_record([&row.line, &row.name, &row.value, &row.unit, &row.expression])
                .map_err(csv_error)?;
        }
    }
    writer.flush()
}

/// Two passes over the rows, one to measure and one to write, so that a column of millions of
/// rows is never held as text.
fn write_column_table(out: &mut dyn Write, table: &ColumnTable, digits: u32) -> io::Result<()> {
    let header = table.header();
    let mut drawn = TextTable::new(&header, &vec![Align::Right; header.len()]);
    for row in 0..table.rows {
        drawn.measure(&table.cells(row, digits));
    }
    drawn.write_top(out)?;
    drawn.write_header(out, &header)?;
    for row in 0..table.rows {
        drawn.write_row(out, &table.cells(row, digits))?;
    }
    drawn.write_bottom(out)
}

/// Written row by row, so a column of millions of rows needs no second copy.
fn write_column_markdown(out: &mut dyn Write, table: &ColumnTable, digits: u32) -> io::Result<()> {
    let header = table.header();
    writeln!(
        out,
        "| {} |",
        header
            .iter()
            .map(|cell| markdown_cell(cell))
            .collect::<Vec<_>>()
            .join(" | ")
    )?;
    writeln!(out, "|{}", "---:|".repeat(header.len()))?;
    for row in 0..table.rows {
        let cells = table.cells(row, digits);
        writeln!(
            out,
            "| {} |",
            cells
                .iter()
                .map(|cell| markdown_cell(cell))
                .collect::<Vec<_>>()
                .join(" | ")
        )?;
    }
    Ok(())
}

/// Written row by row, so a column of millions of rows needs no second copy.
fn write_column_csv(out: &mut dyn Write, table: &ColumnTable, digits: u32) -> io::Result<()> {
    let mut writer = csv::Writer::from_writer(out);
    let csv_error = |error: csv::Error| io::Error::other(error.to_string());
    writer.write_record(table.header()).map_err(csv_error)?;
    for row in 0..table.rows {
        writer
            .write_record(table.cells(row, digits))
            .map_err(csv_error)?;
    }
    writer.flush()
}

/// One line per formulation the sheet used, under the table.
fn write_sources(out: &mut dyn Write, evaluation: &Evaluation, format: Format) -> io::Result<()> {
    let used = evaluation.provenance.formulations();
    if used.is_empty() {
        return Ok(());
    }
    let bullet = if format == Format::Markdown {
        "- "
    } else {
        "  "
    };
    writeln!(out, "\nFormulations used:")?;
    for formulation in used {
        writeln!(
            out,
            "{bullet}{}: {} [valid: {}]",
            formulation.title, formulation.citation, formulation.validity
        )?;
    }
    Ok(())
}
