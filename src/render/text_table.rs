//! Box-drawn terminal tables written row by row: the sheet's table and its column tables. A
//! column of ten million rows is measured in one pass and written in a second, so drawing it
//! holds one row at a time, never the whole table (a table crate keeps every cell, several
//! hundred bytes a row). The look is comfy-table's `UTF8_FULL_CONDENSED`, which the small
//! fixed listings (`units`, `functions`, `properties`) still draw with.

use std::io::{self, Write};
use unicode_width::UnicodeWidthStr;

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Align {
    Left,
    Right,
}

/// The widths and alignments of a table's columns, learned by `measure` before any row is
/// written.
#[derive(Debug, Clone)]
pub struct TextTable {
    widths: Vec<usize>,
    aligns: Vec<Align>,
}

impl TextTable {
    /// A table as wide as its header; `aligns` gives each column's alignment (missing ones are
    /// left-aligned).
    pub fn new<S: AsRef<str>>(header: &[S], aligns: &[Align]) -> TextTable {
        let mut table = TextTable {
            widths: vec![0; header.len()],
            aligns: (0..header.len())
                .map(|index| aligns.get(index).copied().unwrap_or(Align::Left))
                .collect(),
        };
        table.measure(header);
        table
    }

    /// Widens the columns to fit a row (each line of a cell that holds line breaks).
    pub fn measure<S: AsRef<str>>(&mut self, cells: &[S]) {
        for (width, cell) in self.widths.iter_mut().zip(cells) {
            for line in cell.as_ref().split('\n') {
                *width = (*width).max(line.width());
            }
        }
    }

    pub fn write_top(&self, out: &mut dyn Write) -> io::Result<()> {
        self.write_rule(out, '┌', '─', '┬', '┐')
    }

    /// The header row and the double rule under it.
    pub fn write_header<S: AsRef<str>>(&self, out: &mut dyn Write, header: &[S]) -> io::Result<()> {
        self.write_row(out, header)?;
        self.write_rule(out, '╞', '═', '╪', '╡')
    }

    pub fn write_bottom(&self, out: &mut dyn Write) -> io::Result<()> {
        self.write_rule(out, '└', '─', '┴', '┘')
    }

    /// One row; a cell with line breaks makes the row as many lines tall. Cells wider than
    /// measured are written whole (the table is then ragged, never cut).
    pub fn write_row<S: AsRef<str>>(&self, out: &mut dyn Write, cells: &[S]) -> io::Result<()> {
        let height = cells
            .iter()
            .map(|cell| cell.as_ref().split('\n').count())
            .max()
            .unwrap_or(1);
        for line_index in 0..height {
            write!(out, "│")?;
            for (column, width) in self.widths.iter().enumerate() {
                if column > 0 {
                    write!(out, "┆")?;
                }
                let text = cells
                    .get(column)
                    .and_then(|cell| cell.as_ref().split('\n').nth(line_index))
                    .unwrap_or("");
                let padding = width.saturating_sub(text.width());
                match self.aligns[column] {
                    Align::Left => write!(out, " {text}{:padding$} ", "")?,
                    Align::Right => write!(out, " {:padding$}{text} ", "")?,
                }
            }
            writeln!(out, "│")?;
        }
        Ok(())
    }

    fn write_rule(
        &self,
        out: &mut dyn Write,
        left: char,
        line: char,
        joint: char,
        right: char,
    ) -> io::Result<()> {
        let mut rule = String::new();
        rule.push(left);
        for (index, width) in self.widths.iter().enumerate() {
            if index > 0 {
                rule.push(joint);
            }
            rule.extend(std::iter::repeat_n(line, width + 2));
        }
        rule.push(right);
        writeln!(out, "{rule}")
    }
}

#[cfg(test)]
mod tests {
    use super::{Align, TextTable};

    /// Draws a whole table the way the sheet renderer does: measure every row, then write.
    fn drawn(header: &[&str], rows: &[Vec<&str>], aligns: &[Align]) -> String {
        let mut table = TextTable::new(header, aligns);
        for row in rows {
            table.measure(row);
        }
        let mut out = Vec::new();
        table.write_top(&mut out).unwrap();
        table.write_header(&mut out, header).unwrap();
        for row in rows {
            table.write_row(&mut out, row).unwrap();
        }
        table.write_bottom(&mut out).unwrap();
        String::from_utf8(out).unwrap()
    }

    /// The same table drawn by comfy-table with the preset the listings use.
    fn drawn_by_comfy_table(header: &[&str], rows: &[Vec<&str>], aligns: &[Align]) -> String {
        let mut table = comfy_table::Table::new();
        table
            .load_preset(comfy_table::presets::UTF8_FULL_CONDENSED)
            .set_content_arrangement(comfy_table::ContentArrangement::Disabled);
        table.set_header(header.to_vec());
        for row in rows {
            table.add_row(row.clone());
        }
        for (index, align) in aligns.iter().enumerate() {
            if let (Some(column), Align::Right) = (table.column_mut(index), align) {
                column.set_cell_alignment(comfy_table::CellAlignment::Right);
            }
        }
        format!("{table}\n")
    }

    #[test]
    fn rows_written_one_at_a_time_look_like_the_listings() {
        /// Header, rows and alignments of one table.
        type Case<'a> = (&'a [&'a str], Vec<Vec<&'a str>>, &'a [Align]);
        let cases: [Case; 3] = [
            (
                &["line", "name", "value", "unit", "expression"],
                vec![
                    vec!["1", "ρ_w", "998", "kg/m^3", "998 kg/m^3"],
                    vec!["", "", "", "", "## 水 heading"],
                    vec!["12", "K", "4.05e-6", "", "k * ρ_w * g0 / μ"],
                ],
                &[],
            ),
            (
                &["row", "T [degC]", "sample"],
                vec![
                    vec!["1", "-40", "A-1"],
                    vec!["10", "0.0001234", "two\nlines"],
                ],
                &[Align::Right, Align::Right, Align::Right],
            ),
            (&["row", "empty"], vec![vec!["1", ""]], &[Align::Right]),
        ];
        for (header, rows, aligns) in cases {
            assert_eq!(
                drawn(header, &rows, aligns),
                drawn_by_comfy_table(header, &rows, aligns),
                "{header:?}"
            );
        }
    }
}
