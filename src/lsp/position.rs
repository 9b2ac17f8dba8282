//! Positions: the protocol counts lines and UTF-16 code units, the engine counts bytes. A
//! `LineIndex` converts between them for one text.

use lsp_types::{Position, Range};

/// Where each line of a text starts, for conversions in both directions.
#[derive(Debug, Clone)]
pub struct LineIndex {
    line_starts: Vec<usize>,
}

impl LineIndex {
    pub fn new(text: &str) -> LineIndex {
        let line_starts = std::iter::once(0)
            .chain(text.match_indices('\n').map(|(position, _)| position + 1))
            .collect();
        LineIndex { line_starts }
    }

    /// The protocol position of a byte offset (clamped to the text).
    pub fn position(&self, text: &str, offset: usize) -> Position {
        let offset = floor_char_boundary(text, offset.min(text.len()));
        let line = self.line_starts.partition_point(|start| *start <= offset) - 1;
        let start = self.line_starts[line];
        let character = utf16_length(&text[start..offset]);
        Position::new(saturate(line), saturate(character))
    }

    pub fn range(&self, text: &str, span: std::ops::Range<usize>) -> Range {
        Range::new(
            self.position(text, span.start),
            self.position(text, span.end),
        )
    }

    /// The byte offset of a protocol position; a position past a line's end is its end, and
    /// one past the last line is the end of the text.
    pub fn offset(&self, text: &str, position: Position) -> usize {
        let Some(start) = self.line_starts.get(position.line as usize).copied() else {
            return text.len();
        };
        let end = self.line_end(text, position.line as usize);
        let mut units = 0usize;
        for (index, character) in text[start..end].char_indices() {
            if units >= position.character as usize {
                return start + index;
            }
            units += character.len_utf16();
        }
        end
    }

    /// The byte offset where line `line` (0-based) ends, before its line break.
    pub fn line_end(&self, text: &str, line: usize) -> usize {
        let end = self
            .line_starts
            .get(line + 1)
            .map_or(text.len(), |next| next - 1);
        let start = self.line_starts.get(line).copied().unwrap_or(text.len());
        if end > start && text.as_bytes().get(end - 1) == Some(&b'\r') {
            end - 1
        } else {
            end.max(start)
        }
    }

    /// The byte offset where line `line` (0-based) starts.
    pub fn line_start(&self, line: usize) -> Option<usize> {
        self.line_starts.get(line).copied()
    }

    pub fn line_count(&self) -> usize {
        self.line_starts.len()
    }
}

fn utf16_length(text: &str) -> usize {
    text.chars().map(char::len_utf16).sum()
}

fn floor_char_boundary(text: &str, mut offset: usize) -> usize {
    while !text.is_char_boundary(offset) {
        offset -= 1;
    }
    offset
}

fn saturate(value: usize) -> u32 {
    u32::try_from(value).unwrap_or(u32::MAX)
}

#[cfg(test)]
mod tests {
    use super::LineIndex;
    use lsp_types::Position;

    #[test]
    fn offsets_and_positions_count_utf16_units_per_line() {
        let text = "a = 1\nρ = 2 m\r\n𝜇 = 3\n";
        let index = LineIndex::new(text);
        // `=` after the two-byte ρ and a space: character 2 of line 1.
        let equals = text.find("= 2").unwrap_or_default();
        assert_eq!(index.position(text, equals), Position::new(1, 2));
        assert_eq!(index.offset(text, Position::new(1, 2)), equals);
        // 𝜇 is two UTF-16 units: `=` is at character 3.
        let second = text.find("= 3").unwrap_or_default();
        assert_eq!(index.position(text, second), Position::new(2, 3));
        assert_eq!(index.offset(text, Position::new(2, 3)), second);
        // Past the end of a line is its end (before `\r\n`); past the last line, the text's.
        assert_eq!(
            index.offset(text, Position::new(1, 99)),
            text.find('\r').unwrap_or_default()
        );
        assert_eq!(index.offset(text, Position::new(9, 0)), text.len());
    }
}
