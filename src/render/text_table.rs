//! The terminal tables of fluxsheet, in one look of our own: no frame, columns two spaces
//! apart, a rule under each header cell, sections as a titled rule. Every terminal table
//! (a sheet's lines, its columns, the listings of `units`, `functions` and `properties`) is
//! drawn here.
//!
//! A table is measured first (`measure` on every row), fitted to a width (`fit`: the columns
//! allowed to wrap give up space, widest first, down to their floor), then written row by
//! row. Nothing holds the rows: a column of ten million rows is measured in one pass and
//! written in a second.
//!
//! ```text
//! line  name            value  unit  expression
//! ────  ───────  ────────────  ────  ──────────────────────────────
//! ── Clay liner ──────────────────────────────────────────────────
//!    5  k_clay          0.012  mD    0.012 mD
//!    6  K_liner     9.147e-11  m/s   site_K(k_clay)
//! ```

use std::io::{self, Write};
use unicode_width::{UnicodeWidthChar, UnicodeWidthStr};

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Align {
    Left,
    Right,
}

/// Spaces between two columns.
const GAP: usize = 2;
/// The narrowest width a table is fitted to; below it every column would wrap to nothing.
pub const NARROWEST: usize = 20;

/// The widths and alignments of a table's columns, learned by `measure` before any row is
/// written, then fitted to the terminal by `fit`.
#[derive(Debug, Clone)]
pub struct TextTable {
    widths: Vec<usize>,
    /// How narrow each column may be made before its cells must wrap.
    floors: Vec<usize>,
    aligns: Vec<Align>,
}

impl TextTable {
    /// A table as wide as its header; `aligns` gives each column's alignment (missing ones are
    /// left-aligned). No column wraps until `set_floor` allows it.
    pub fn new<S: AsRef<str>>(header: &[S], aligns: &[Align]) -> TextTable {
        let mut table = TextTable {
            widths: vec![0; header.len()],
            floors: vec![usize::MAX; header.len()],
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

    /// Lets column `index` be drawn as narrow as `floor`, its longer cells wrapped.
    pub fn set_floor(&mut self, index: usize, floor: usize) {
        if let Some(slot) = self.floors.get_mut(index) {
            *slot = floor.max(1);
        }
    }

    /// The measured width of each column.
    pub fn widths(&self) -> &[usize] {
        &self.widths
    }

    /// The width of the widest line the table writes.
    pub fn total_width(&self) -> usize {
        self.widths.iter().sum::<usize>() + GAP * self.widths.len().saturating_sub(1)
    }

    /// A table of some of the columns, in the order given (a wide column table drawn in
    /// blocks).
    pub fn select(&self, columns: &[usize]) -> TextTable {
        let pick = |values: &[usize]| columns.iter().map(|index| values[*index]).collect();
        TextTable {
            widths: pick(&self.widths),
            floors: pick(&self.floors),
            aligns: columns.iter().map(|index| self.aligns[*index]).collect(),
        }
    }

    /// Narrows the table to `width` columns of text: first the columns that may wrap, widest
    /// first, down to their floors; then, if that is not enough, any column. `None` leaves the
    /// table as measured.
    pub fn fit(&mut self, width: Option<usize>) {
        let Some(width) = width else {
            return;
        };
        let width = width.max(NARROWEST);
        for respect_floors in [true, false] {
            while self.total_width() > width {
                let narrowest = |index: usize| {
                    if respect_floors {
                        self.floors[index]
                    } else {
                        1
                    }
                };
                let widest = (0..self.widths.len())
                    .filter(|index| self.widths[*index] > narrowest(*index))
                    .max_by_key(|index| (self.widths[*index] - narrowest(*index), *index));
                match widest {
                    Some(index) => self.widths[index] -= 1,
                    None => break,
                }
            }
        }
    }

    /// The header row and the rule under each header cell.
    pub fn write_header<S: AsRef<str>>(&self, out: &mut dyn Write, header: &[S]) -> io::Result<()> {
        self.write_row(out, header)?;
        let rules: Vec<String> = self.widths.iter().map(|width| "─".repeat(*width)).collect();
        self.write_row(out, &rules)
    }

    /// A section title as a rule across the table: `── Clay liner ─────`.
    pub fn write_section(&self, out: &mut dyn Write, title: &str) -> io::Result<()> {
        let width = self.total_width().max(NARROWEST);
        let lines = wrap(title, width.saturating_sub(4).max(1));
        for (index, line) in lines.iter().enumerate() {
            if index + 1 < lines.len() {
                writeln!(out, "── {line}")?;
            } else {
                let rest = width.saturating_sub(line.width() + 4);
                writeln!(out, "── {line} {}", "─".repeat(rest))?;
            }
        }
        Ok(())
    }

    /// One row; a cell wider than its column, or holding line breaks, wraps onto as many lines
    /// as it needs. Trailing spaces are not written.
    pub fn write_row<S: AsRef<str>>(&self, out: &mut dyn Write, cells: &[S]) -> io::Result<()> {
        let fits = |(cell, width): (&S, &usize)| {
            let cell = cell.as_ref();
            !cell.contains('\n') && (cell.len() <= *width || cell.width() <= *width)
        };
        if cells.len() == self.widths.len() && cells.iter().zip(&self.widths).all(fits) {
            return self.write_line(out, cells.iter().map(AsRef::as_ref));
        }
        let wrapped: Vec<Vec<String>> = self
            .widths
            .iter()
            .enumerate()
            .map(|(index, width)| {
                let cell = cells.get(index).map_or("", |cell| cell.as_ref());
                if cell.width() <= *width && !cell.contains('\n') {
                    vec![cell.to_string()]
                } else {
                    wrap(cell, *width)
                }
            })
            .collect();
        let height = wrapped.iter().map(Vec::len).max().unwrap_or(1).max(1);
        for line_index in 0..height {
            let texts = wrapped
                .iter()
                .map(|lines| lines.get(line_index).map_or("", String::as_str));
            self.write_line(out, texts)?;
        }
        Ok(())
    }

    /// One line of text, each cell already no wider than its column.
    fn write_line<'t>(
        &self,
        out: &mut dyn Write,
        texts: impl Iterator<Item = &'t str>,
    ) -> io::Result<()> {
        const SPACES: &str = "                                                                ";
        let pad = |line: &mut String, mut count: usize| {
            while count > 0 {
                let step = count.min(SPACES.len());
                line.push_str(&SPACES[..step]);
                count -= step;
            }
        };
        let mut line = String::with_capacity(self.total_width() + 1);
        for (column, (text, width)) in texts.zip(&self.widths).enumerate() {
            if column > 0 {
                line.push_str("  ");
            }
            let text_width = if text.is_ascii() {
                text.len()
            } else {
                text.width()
            };
            let padding = width.saturating_sub(text_width);
            match self.aligns[column] {
                Align::Left => {
                    line.push_str(text);
                    pad(&mut line, padding);
                }
                Align::Right => {
                    pad(&mut line, padding);
                    line.push_str(text);
                }
            }
        }
        let kept = line.trim_end().len();
        line.truncate(kept);
        line.push('\n');
        out.write_all(line.as_bytes())
    }
}

/// Text broken into lines no wider than `width`: at its own line breaks, then between words,
/// and inside a word only when the word alone is wider.
pub fn wrap(text: &str, width: usize) -> Vec<String> {
    let width = width.max(1);
    let mut lines = Vec::new();
    for paragraph in text.split('\n') {
        let mut line = String::new();
        for word in paragraph.split(' ') {
            let line_width = line.width();
            if line.is_empty() && line_width == 0 && word.width() <= width {
                line.push_str(word);
            } else if line_width + 1 + word.width() <= width {
                line.push(' ');
                line.push_str(word);
            } else {
                if !line.is_empty() {
                    lines.push(std::mem::take(&mut line));
                }
                // A word wider than the column is cut where it reaches the edge.
                for character in word.chars() {
                    let character_width = character.width().unwrap_or(0);
                    if line.width() + character_width > width && !line.is_empty() {
                        lines.push(std::mem::take(&mut line));
                    }
                    line.push(character);
                }
            }
        }
        lines.push(line);
    }
    lines
}

#[cfg(test)]
mod tests {
    use super::{wrap, Align, TextTable};
    use unicode_width::UnicodeWidthStr;

    /// Draws a whole table the way the sheet renderer does: measure every row, fit, write.
    fn drawn(header: &[&str], rows: &[Vec<&str>], floors: &[usize], width: usize) -> String {
        let mut table = TextTable::new(header, &[Align::Right]);
        for row in rows {
            table.measure(row);
        }
        for (index, floor) in floors.iter().enumerate() {
            table.set_floor(index, *floor);
        }
        table.fit(Some(width));
        let mut out = Vec::new();
        table.write_header(&mut out, header).unwrap();
        table.write_section(&mut out, "水 heading").unwrap();
        for row in rows {
            table.write_row(&mut out, row).unwrap();
        }
        String::from_utf8(out).unwrap()
    }

    #[test]
    fn a_table_that_fits_is_drawn_as_measured() {
        let text = drawn(
            &["line", "name", "expression"],
            &[vec!["1", "ρ_w", "998 kg/m^3"], vec!["12", "K", "k * ρ_w"]],
            &[],
            100,
        );
        assert_eq!(
            text,
            "line  name  expression\n\
             ────  ────  ──────────\n\
             ── 水 heading ────────\n   \
             1  ρ_w   998 kg/m^3\n  \
             12  K     k * ρ_w\n"
        );
    }

    #[test]
    fn wrapping_columns_give_way_and_no_line_is_wider_than_asked() {
        let long = "porous_fick_flux(n_clay, D_eff, (c_base - c_top) / t_liner) + 水水水水水水";
        for width in [20, 24, 30, 40, 80] {
            let text = drawn(
                &["line", "name", "expression"],
                &[vec!["1", "a_rather_long_name", long]],
                &[4, 6, 10],
                width,
            );
            for line in text.lines() {
                assert!(line.width() <= width, "{width}: `{line}`\n{text}");
            }
            // The expression loses no character to the wrapping.
            // The last column starts where the rule under the header starts its last run.
            let rule: Vec<char> = text
                .lines()
                .find(|line| line.starts_with('─'))
                .unwrap_or("")
                .chars()
                .collect();
            let expression_column = rule.iter().rposition(|c| *c == ' ').map_or(0, |at| at + 1);
            let kept: String = text
                .lines()
                .skip_while(|line| !line.starts_with("── "))
                .skip(1)
                .flat_map(|line| line.chars().skip(expression_column))
                .filter(|character| !character.is_whitespace())
                .collect();
            let written: String = long.chars().filter(|c| !c.is_whitespace()).collect();
            assert_eq!(kept, written, "{width}\n{text}");
        }
    }

    #[test]
    fn wrap_breaks_between_words_and_inside_a_word_only_when_needed() {
        assert_eq!(wrap("a bb ccc", 4), ["a bb", "ccc"]);
        assert_eq!(wrap("abcdefgh", 3), ["abc", "def", "gh"]);
        assert_eq!(wrap("one\ntwo three", 5), ["one", "two", "three"]);
        assert_eq!(wrap("", 5), [""]);
        assert_eq!(wrap("水水水", 4), ["水水", "水"]);
    }
}
