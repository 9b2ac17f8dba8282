//! The sources of an evaluation: the main sheet and the sheets it includes, laid end to end in
//! one offset space (each file has a base offset), so a `Span` stays two integers and still
//! says which file it is in. Loading included files is the front end's job, behind the
//! `IncludeLoader` trait: the evaluator itself never touches the file system.

use crate::syntax::Span;

/// One source text and where it starts in the shared offset space.
#[derive(Debug, Clone)]
pub struct SourceFile {
    /// What to call it in messages: a path as the user gave it, or `<stdin>`.
    pub label: String,
    pub text: String,
    pub base: usize,
    /// Byte offset (within `text`) where each line starts, for line and column look-ups.
    line_starts: Vec<usize>,
}

impl SourceFile {
    /// 1-based line and column (in characters) of a byte offset within this file's text.
    pub fn line_column(&self, offset: usize) -> (usize, usize) {
        let offset = offset.min(self.text.len());
        let line = self
            .line_starts
            .partition_point(|start| *start <= offset)
            .max(1);
        let start = self.line_starts[line - 1];
        let column = self
            .text
            .get(start..offset)
            .map_or(1, |before| before.chars().count() + 1);
        (line, column)
    }
}

/// All sources of one evaluation; the first is the main sheet.
#[derive(Debug, Clone, Default)]
pub struct SourceMap {
    files: Vec<SourceFile>,
}

impl SourceMap {
    /// Adds a file after the last one; returns its index.
    pub fn add(&mut self, label: &str, text: &str) -> usize {
        let base = self
            .files
            .last()
            .map_or(0, |last| last.base + last.text.len() + 1);
        let line_starts = std::iter::once(0)
            .chain(text.match_indices('\n').map(|(position, _)| position + 1))
            .collect();
        self.files.push(SourceFile {
            label: label.to_string(),
            text: text.to_string(),
            base,
            line_starts,
        });
        self.files.len() - 1
    }

    pub fn files(&self) -> &[SourceFile] {
        &self.files
    }

    pub fn file(&self, index: usize) -> Option<&SourceFile> {
        self.files.get(index)
    }

    /// The index of the file holding `offset`.
    pub fn file_index_of(&self, offset: usize) -> usize {
        self.files
            .iter()
            .rposition(|file| file.base <= offset)
            .unwrap_or(0)
    }

    /// File label, line and column of an offset of the shared space.
    pub fn locate(&self, offset: usize) -> (&str, usize, usize) {
        match self.files.get(self.file_index_of(offset)) {
            Some(file) => {
                let (line, column) = file.line_column(offset - file.base);
                (file.label.as_str(), line, column)
            }
            None => ("", 1, 1),
        }
    }

    /// The text under a span (empty if the span is not in one file).
    pub fn text_of(&self, span: Span) -> &str {
        let Some(file) = self.files.get(self.file_index_of(span.start)) else {
            return "";
        };
        let start = span.start - file.base;
        let end = span.end.saturating_sub(file.base);
        file.text.get(start..end).unwrap_or_default()
    }
}

/// A sheet brought in by `include`.
#[derive(Debug, Clone)]
pub struct LoadedSheet {
    /// The label for messages (the path as resolved, relative where possible).
    pub label: String,
    /// A key that is the same however the file is reached (its canonical path), for cycles.
    pub key: String,
    pub text: String,
}

/// Deepest chain of includes (a sheet including a sheet including …) accepted: far beyond
/// any real project, and it keeps loading linear and off the stack's edge.
pub const INCLUDE_DEPTH_LIMIT: usize = 64;

/// Loads included sheets for the evaluator, applying the front end's rules (paths relative to
/// the including sheet, no leaving its folder tree unless allowed).
pub trait IncludeLoader {
    /// Loads `path` as written in an include line of the sheet labelled `from`.
    fn load(&mut self, path: &str, from: &str) -> Result<LoadedSheet, String>;

    /// Loads the data file `path` of a `column … from` line of the sheet labelled `from`: as
    /// an include unless the loader treats data files apart (a larger size limit).
    fn load_data(&mut self, path: &str, from: &str) -> Result<LoadedSheet, String> {
        self.load(path, from)
    }

    /// The cycle key of the main sheet (labelled `label`), comparable with `LoadedSheet::key`.
    fn main_key(&self, label: &str) -> String {
        label.to_string()
    }
}

/// For sheets with no file behind them (`eval`, tests): every include is refused.
pub struct NoIncludes;

impl IncludeLoader for NoIncludes {
    fn load(&mut self, _path: &str, _from: &str) -> Result<LoadedSheet, String> {
        Err("includes are only available in sheets read from a file".to_string())
    }
}

#[cfg(test)]
mod tests {
    use super::SourceMap;

    #[test]
    fn lines_and_columns_are_one_based_characters_in_each_file() {
        let mut sources = SourceMap::default();
        sources.add("main.fxs", "a = 1\nρ = 2 m\n");
        let second = sources.add("shared.fxs", "b = 3\n");
        assert_eq!(sources.locate(0), ("main.fxs", 1, 1));
        assert_eq!(sources.locate(6), ("main.fxs", 2, 1));
        // `=` after the two-byte ρ and a space is the third character.
        assert_eq!(sources.locate(9), ("main.fxs", 2, 3));
        let base = sources
            .file(second)
            .map(|file| file.base)
            .unwrap_or_default();
        assert_eq!(sources.locate(base + 4), ("shared.fxs", 1, 5));
    }
}
