//! Diagnostics drawn as source snippets (file:line:column, the line, an underline) through
//! codespan-reporting, and the line/column arithmetic shared with JSON output.

use crate::eval::{Diagnostic, Severity};
use codespan_reporting::diagnostic::{Diagnostic as Snippet, Label};
use codespan_reporting::files::SimpleFile;
use codespan_reporting::term::{self, termcolor::WriteColor, Config};

/// 1-based line and column (in characters) of a byte offset.
pub fn locate(source: &str, offset: usize) -> (usize, usize) {
    let offset = offset.min(source.len());
    let before = source.get(..offset).unwrap_or(source);
    let line = before.matches('\n').count() + 1;
    let line_start = before.rfind('\n').map_or(0, |position| position + 1);
    let column = before[line_start..].chars().count() + 1;
    (line, column)
}

/// Lines longer than this (in bytes) are not drawn in snippets.
const LONGEST_LINE_SHOWN: usize = 1_000;

fn line_length_at(source: &str, offset: usize) -> usize {
    let offset = offset.min(source.len());
    let start = source
        .get(..offset)
        .and_then(|before| before.rfind('\n'))
        .map_or(0, |position| position + 1);
    let end = source
        .get(offset..)
        .and_then(|after| after.find('\n'))
        .map_or(source.len(), |position| offset + position);
    end - start
}

/// Writes every diagnostic as a snippet of `source`.
pub fn write_diagnostics(
    writer: &mut dyn WriteColor,
    file_name: &str,
    source: &str,
    diagnostics: &[Diagnostic],
) -> std::io::Result<()> {
    let file = SimpleFile::new(file_name, source);
    let config = Config::default();
    for diagnostic in diagnostics {
        let snippet = match diagnostic.severity {
            Severity::Error => Snippet::error(),
            Severity::Warning => Snippet::warning(),
        };
        let clamp = |span: crate::syntax::Span| {
            let start = span.start.min(source.len());
            start..span.end.clamp(start, source.len())
        };
        let mut notes = Vec::new();
        let mut labels = Vec::new();
        if line_length_at(source, diagnostic.span.start) > LONGEST_LINE_SHOWN {
            // Drawing a huge line helps no one and is slow; say where it is instead.
            let (line, column) = locate(source, diagnostic.span.start);
            notes.push(format!(
                "at {file_name}:{line}:{column} (line too long to show)"
            ));
        } else {
            labels.push(Label::primary((), clamp(diagnostic.span)));
            for (span, message) in &diagnostic.labels {
                labels.push(Label::secondary((), clamp(*span)).with_message(message));
            }
        }
        if let Some(help) = &diagnostic.help {
            notes.push(format!("help: {help}"));
        }
        let snippet = match diagnostic.code {
            Some(code) => snippet.with_code(code),
            None => snippet,
        };
        let snippet = snippet
            .with_message(&diagnostic.message)
            .with_labels(labels)
            .with_notes(notes);
        term::emit(writer, &config, &file, &snippet)
            .map_err(|error| std::io::Error::other(error.to_string()))?;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::locate;

    #[test]
    fn lines_and_columns_are_one_based_characters() {
        let source = "a = 1\nρ = 2 m\n";
        assert_eq!(locate(source, 0), (1, 1));
        assert_eq!(locate(source, 6), (2, 1));
        // `=` after the two-byte ρ and a space is the third character.
        assert_eq!(locate(source, 9), (2, 3));
    }
}
