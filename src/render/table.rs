//! A sheet's results as rows: line, name, value, unit, expression. Headings start sections;
//! checks show both sides in one unit; failed and skipped lines say so instead of a number.

use super::text_table::{Align, TextTable};
use super::{format_significant, write_significant, Format, RenderOptions};
use crate::eval::{CheckOutcome, Evaluation, Formulation, LineOutcome, LineResult, Shown};
use std::io::{self, Write};
use unicode_width::UnicodeWidthStr;

/// One printable row, before formatting.
pub(super) struct Row {
    pub(super) line: String,
    pub(super) name: String,
    pub(super) value: String,
    pub(super) unit: String,
    pub(super) expression: String,
}

pub(super) enum Entry {
    Heading(String),
    Row(Row),
}

/// Longest expression text the terminal table shows, wrapped over several lines (a fit's
/// report of two parameters is about 250 characters); longer text is cut with an ellipsis.
/// Markdown, CSV and JSON carry the whole text.
const LONGEST_EXPRESSION: usize = 480;

/// `text` cut to `longest` characters, the last one an ellipsis when anything was cut.
pub fn shortened(text: &str, longest: usize) -> String {
    if text.chars().count() <= longest {
        return text.to_string();
    }
    let mut cut: String = text.chars().take(longest.saturating_sub(1)).collect();
    cut.push('…');
    cut
}

pub(super) const HEADER: [&str; 5] = ["line", "name", "value", "unit", "expression"];

/// A unit as shown in a cell: blank for a plain number.
pub(super) fn unit_cell(unit: &str) -> String {
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
        let (plural, singular) = if rows.sampled {
            ("samples", "sample")
        } else {
            ("rows", "row")
        };
        if rows.failed == 0 {
            text.push_str(&format!(
                " (all {} {plural} pass; closest is {singular} {})",
                rows.total, rows.shown_row
            ));
        } else {
            text.push_str(&format!(
                " ({} of {} {plural} fail; first is {singular} {})",
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

    /// The cells of row `row` (0-based) written into `cells`, reusing its strings.
    pub fn cells_into(&self, row: usize, digits: u32, cells: &mut Vec<String>) {
        cells.resize(self.columns.len() + 1, String::new());
        for cell in cells.iter_mut() {
            cell.clear();
        }
        use std::fmt::Write as _;
        let _ = write!(cells[0], "{}", row + 1);
        for ((_, shown), cell) in self.columns.iter().zip(cells.iter_mut().skip(1)) {
            match shown {
                Shown::Column(column) => write_significant(cell, column.shown(row), digits),
                Shown::Labels(labels) => cell.push_str(&labels.texts[row]),
                Shown::Scalar(scalar) => write_significant(cell, scalar.value, digits),
            }
        }
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
    evaluation
        .lines
        .iter()
        .filter_map(|line| entry(line, digits))
        .collect()
}

/// A line as a row of the sheet's table (or a heading); nothing for blank and comment lines.
pub(super) fn entry(line: &LineOutcome, digits: u32) -> Option<Entry> {
    {
        let row = |value: String, unit: String, expression: String| {
            Entry::Row(Row {
                line: line.number.to_string(),
                name: line.name.clone().unwrap_or_default(),
                value,
                unit,
                expression,
            })
        };
        match &line.result {
            LineResult::Blank | LineResult::Comment => None,
            LineResult::Heading(text) => Some(Entry::Heading(text.clone())),
            LineResult::Value(shown) => Some(row(
                value_cell(shown, digits),
                unit_cell(shown.unit()),
                match &line.note {
                    Some(note) => format!("{}  ({note})", line.expression),
                    None => line.expression.clone(),
                },
            )),
            LineResult::Check(check) => Some(Entry::Row(Row {
                line: line.number.to_string(),
                name: "check".to_string(),
                value: if check.passed { "passed" } else { "FAILED" }.to_string(),
                unit: String::new(),
                expression: check_text(check, digits),
            })),
            LineResult::Function { signature } => Some(row(
                "function".to_string(),
                String::new(),
                format!("{signature} = {}", line.expression),
            )),
            LineResult::Plot(_) => Some(Entry::Row(Row {
                line: line.number.to_string(),
                name: "plot".to_string(),
                value: String::new(),
                unit: String::new(),
                expression: line.expression.clone(),
            })),
            LineResult::Include { file } => Some(Entry::Row(Row {
                line: line.number.to_string(),
                name: "include".to_string(),
                value: String::new(),
                unit: String::new(),
                expression: file.clone(),
            })),
            LineResult::Error => Some(row(
                "error".to_string(),
                String::new(),
                line.expression.clone(),
            )),
            LineResult::Skipped { because_of } => Some(row(
                "-".to_string(),
                String::new(),
                format!(
                    "{}  (not evaluated: `{because_of}` has an error)",
                    line.expression
                ),
            )),
        }
    }
}

/// Writes the results of one sheet in a text format (table, Markdown or CSV).
pub fn write_sheet(
    out: &mut dyn Write,
    evaluation: &Evaluation,
    options: RenderOptions,
) -> io::Result<()> {
    if options.format == Format::Csv {
        return super::csv::write_sheet(out, evaluation, options.digits);
    }
    // Standard output is line-buffered: rows go out in large blocks instead.
    let mut buffered = io::BufWriter::with_capacity(1 << 16, out);
    let out: &mut dyn Write = &mut buffered;
    let entries = entries(evaluation, options.digits);
    match options.format {
        Format::Markdown => write_markdown(out, &entries),
        _ => write_table(out, &entries, options.width),
    }?;
    for table in column_tables(evaluation) {
        writeln!(out)?;
        match options.format {
            Format::Markdown => write_column_markdown(out, &table, options.digits),
            _ => write_column_table(out, &table, options),
        }?;
    }
    write_sources(out, evaluation, options)?;
    buffered.flush()
}

/// The sheet's table, measured over every entry, fitted to the width, then written row by row.
fn write_table(out: &mut dyn Write, entries: &[Entry], width: Option<usize>) -> io::Result<()> {
    let cells = |row: &Row| -> [String; 5] {
        [
            row.line.clone(),
            row.name.clone(),
            row.value.clone(),
            row.unit.clone(),
            shortened(&row.expression, LONGEST_EXPRESSION),
        ]
    };
    let mut table = TextTable::new(
        &HEADER,
        &[
            Align::Right,
            Align::Left,
            Align::Right,
            Align::Left,
            Align::Left,
        ],
    );
    for entry in entries {
        if let Entry::Row(row) = entry {
            table.measure(&cells(row));
        }
    }
    // The expression gives way first, then long names and units; numbers never wrap.
    let measured = table.widths().to_vec();
    table.set_floor(1, measured[1].min(12));
    table.set_floor(3, measured[3].min(10));
    table.set_floor(4, measured[4].min(24));
    table.fit(width);
    table.write_header(out, &HEADER)?;
    for entry in entries {
        match entry {
            Entry::Heading(text) => table.write_section(out, text)?,
            Entry::Row(row) => table.write_row(out, &cells(row))?,
        }
    }
    Ok(())
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

/// Two passes over the rows, one to measure and one to write, so that a column of millions of
/// rows is never held as text. A table wider than the terminal is drawn in blocks of columns,
/// each with the row numbers, one after another.
fn write_column_table(
    out: &mut dyn Write,
    table: &ColumnTable,
    options: RenderOptions,
) -> io::Result<()> {
    let header = table.header();
    let aligns = vec![Align::Right; header.len()];
    // The rows alone first: their widths are each column's floor (numbers never wrap; a long
    // header does, between words).
    let blank: Vec<&str> = vec![""; header.len()];
    let mut drawn = TextTable::new(&blank, &aligns);
    let mut cells = Vec::new();
    for row in 0..table.rows {
        table.cells_into(row, options.digits, &mut cells);
        drawn.measure(&cells);
    }
    // A header wraps between its words (`K_site` over `[m/s]`), never inside one; a column of
    // text (labels) may wrap too, down to a dozen characters.
    let floors: Vec<usize> = drawn
        .widths()
        .iter()
        .zip(&header)
        .enumerate()
        .map(|(index, (data, title))| {
            let longest_word = title.split(' ').map(|word| word.width()).max().unwrap_or(0);
            let data = match table.columns.get(index.wrapping_sub(1)) {
                Some((_, Shown::Labels(_))) => (*data).min(12),
                _ => *data,
            };
            data.max(longest_word)
        })
        .collect();
    drawn.measure(&header);
    for (index, floor) in floors.iter().enumerate() {
        drawn.set_floor(index, *floor);
    }
    for (block_index, block) in column_blocks(&drawn, &floors, options.width)
        .iter()
        .enumerate()
    {
        if block_index > 0 {
            writeln!(out)?;
        }
        let mut part = drawn.select(block);
        part.fit(options.width);
        let whole = block.len() == header.len();
        let pick = |all: &[String]| -> Vec<String> {
            block.iter().map(|index| all[*index].clone()).collect()
        };
        part.write_header(out, &pick(&header))?;
        for row in 0..table.rows {
            table.cells_into(row, options.digits, &mut cells);
            if whole {
                part.write_row(out, &cells)?;
            } else {
                part.write_row(out, &pick(&cells))?;
            }
        }
    }
    Ok(())
}

/// The columns of each block of a column table: the row number, then as many columns as fit
/// in `width` at their floors (always at least one).
fn column_blocks(table: &TextTable, floors: &[usize], width: Option<usize>) -> Vec<Vec<usize>> {
    let count = table.widths().len();
    let Some(width) = width else {
        return vec![(0..count).collect()];
    };
    let width = width.max(super::text_table::NARROWEST);
    let mut blocks = Vec::new();
    let mut block = vec![0];
    let mut used = floors.first().copied().unwrap_or(0);
    for index in 1..count {
        let needed = 2 + floors[index];
        if block.len() > 1 && used + needed > width {
            blocks.push(std::mem::replace(&mut block, vec![0]));
            used = floors[0];
        }
        block.push(index);
        used += needed;
    }
    blocks.push(block);
    blocks
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
    let mut cells = Vec::new();
    let mut line = String::new();
    for row in 0..table.rows {
        table.cells_into(row, digits, &mut cells);
        line.clear();
        line.push('|');
        for cell in &cells {
            line.push(' ');
            if cell.contains('|') {
                line.push_str(&markdown_cell(cell));
            } else {
                line.push_str(cell);
            }
            line.push_str(" |");
        }
        line.push('\n');
        out.write_all(line.as_bytes())?;
    }
    Ok(())
}

/// One line per formulation the sheet used, under the table. The terminal shows each
/// formulation's id and title on one line; Markdown, JSON, reports and
/// `fluxsheet functions ID` carry the citation and the range of validity.
fn write_sources(
    out: &mut dyn Write,
    evaluation: &Evaluation,
    options: RenderOptions,
) -> io::Result<()> {
    write_formulations(out, evaluation.provenance.formulations(), options)
}

/// The "Formulations used" footer of `run` and `properties`: id and title on one line each in
/// the terminal, the full citation in Markdown.
pub fn write_formulations(
    out: &mut dyn Write,
    used: &[&Formulation],
    options: RenderOptions,
) -> io::Result<()> {
    if used.is_empty() {
        return Ok(());
    }
    writeln!(out, "\nFormulations used:")?;
    if options.format == Format::Markdown {
        for formulation in used {
            writeln!(
                out,
                "- `{}` {}: {} [valid: {}]",
                formulation.id,
                markdown_cell(formulation.title),
                markdown_cell(formulation.citation),
                markdown_cell(formulation.validity)
            )?;
        }
        return Ok(());
    }
    let id_width = used
        .iter()
        .map(|formulation| formulation.id.chars().count())
        .max()
        .unwrap_or(0);
    let width = options.width.unwrap_or(usize::MAX);
    for formulation in used {
        let line = format!("  {:id_width$}  {}", formulation.id, formulation.title);
        writeln!(out, "{}", shortened(&line, width))?;
    }
    let hint = "Citations and ranges: `fluxsheet functions ID`, or the JSON and report outputs.";
    for line in super::text_table::wrap(hint, width) {
        writeln!(out, "{line}")?;
    }
    Ok(())
}
