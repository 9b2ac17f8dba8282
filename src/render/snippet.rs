//! Diagnostics drawn as source snippets (file:line:column, the line, an underline) through
//! codespan-reporting. Spans may point
//! into any file of the evaluation's `SourceMap` (an included sheet, say).

use crate::eval::{Diagnostic, Severity, SourceMap};
use crate::syntax::Span;
use codespan_reporting::diagnostic::{Diagnostic as Snippet, Label};
use codespan_reporting::files::SimpleFiles;
use codespan_reporting::term::{self, termcolor::WriteColor, Config};

/// Lines longer than this (in bytes) are not drawn in snippets.
const LONGEST_LINE_SHOWN: usize = 1_000;

/// Where a span of the shared offset space is: file index, label, and the span within it.
pub fn place(sources: &SourceMap, span: Span) -> (usize, &str, std::ops::Range<usize>) {
    let index = sources.file_index_of(span.start);
    match sources.file(index) {
        Some(file) => {
            let start = span.start.saturating_sub(file.base).min(file.text.len());
            let end = span
                .end
                .saturating_sub(file.base)
                .clamp(start, file.text.len());
            (index, file.label.as_str(), start..end)
        }
        None => (0, "", 0..0),
    }
}

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

/// Writes every diagnostic as a snippet of the file it points into.
pub fn write_diagnostics(
    writer: &mut dyn WriteColor,
    sources: &SourceMap,
    diagnostics: &[Diagnostic],
) -> std::io::Result<()> {
    let mut files = SimpleFiles::new();
    for file in sources.files() {
        files.add(file.label.clone(), file.text.clone());
    }
    let config = Config::default();
    for diagnostic in diagnostics {
        let snippet = match diagnostic.severity {
            Severity::Error => Snippet::error(),
            Severity::Warning => Snippet::warning(),
        };
        let mut notes = Vec::new();
        let mut labels = Vec::new();
        let (file, label, range) = place(sources, diagnostic.span);
        let text = sources.file(file).map_or("", |source| source.text.as_str());
        if line_length_at(text, range.start) > LONGEST_LINE_SHOWN {
            // Drawing a huge line helps no one and is slow; say where it is instead.
            let (_, line, column) = sources.locate(diagnostic.span.start);
            notes.push(format!(
                "at {label}:{line}:{column} (line too long to show)"
            ));
        } else {
            labels.push(Label::primary(file, range));
            for (span, message) in &diagnostic.labels {
                let (other_file, _, other_range) = place(sources, *span);
                labels.push(Label::secondary(other_file, other_range).with_message(message));
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
        term::emit(writer, &config, &files, &snippet)
            .map_err(|error| std::io::Error::other(error.to_string()))?;
    }
    Ok(())
}
