//! The evaluation's diagnostics as the protocol's: the same messages, codes and spans as `run`.
//! A diagnostic in an included sheet is published for that sheet's file, and repeated on the
//! include line that brought it in, so it is seen from the sheet being edited.

use super::document::Document;
use super::position::LineIndex;
use crate::eval::{LineResult, Severity};
use crate::syntax::Span;
use lsp_types::{
    Diagnostic, DiagnosticRelatedInformation, DiagnosticSeverity, Location, NumberOrString, Range,
    Uri,
};

/// The name editors show as the diagnostics' source.
const SOURCE: &str = "fluxsheet";

/// Every file's diagnostics, the document's first (possibly empty, to clear old ones).
pub fn diagnostics(document: &Document) -> Vec<(Uri, Vec<Diagnostic>)> {
    let sources = &document.evaluation.sources;
    let mut by_file: Vec<(usize, Vec<Diagnostic>)> = vec![(0, Vec::new())];
    for diagnostic in &document.evaluation.diagnostics {
        let file = sources.file_index_of(diagnostic.span.start);
        let Some(converted) = convert(document, diagnostic) else {
            continue;
        };
        if file != 0 {
            let shown_on = include_line_for(document, file);
            let (label, line, _) = sources.locate(diagnostic.span.start);
            let mut repeated = converted.clone();
            repeated.range = shown_on;
            repeated.message = format!("in `{label}` line {line}: {}", converted.message);
            by_file[0].1.push(repeated);
        }
        match by_file.iter_mut().find(|(index, _)| *index == file) {
            Some((_, list)) => list.push(converted),
            None => by_file.push((file, vec![converted])),
        }
    }
    by_file
        .into_iter()
        .filter_map(|(file, list)| Some((document.file_uri(file)?, list)))
        .collect()
}

fn convert(document: &Document, diagnostic: &crate::eval::Diagnostic) -> Option<Diagnostic> {
    let mut message = diagnostic.message.clone();
    if let Some(help) = &diagnostic.help {
        message.push_str("\nhelp: ");
        message.push_str(help);
    }
    let related: Vec<DiagnosticRelatedInformation> = diagnostic
        .labels
        .iter()
        .filter_map(|(span, text)| {
            Some(DiagnosticRelatedInformation {
                location: location(document, *span)?,
                message: text.clone(),
            })
        })
        .collect();
    Some(Diagnostic {
        range: range_in_file(document, diagnostic.span),
        severity: Some(match diagnostic.severity {
            Severity::Error => DiagnosticSeverity::ERROR,
            Severity::Warning => DiagnosticSeverity::WARNING,
        }),
        code: diagnostic
            .code
            .map(|code| NumberOrString::String(code.to_string())),
        source: Some(SOURCE.to_string()),
        message,
        related_information: (!related.is_empty()).then_some(related),
        ..Diagnostic::default()
    })
}

/// The range of a span within the file that holds it (the document's own line index for the
/// document, so a sheet with many diagnostics is not scanned once per diagnostic).
pub fn range_in_file(document: &Document, span: Span) -> Range {
    let sources = &document.evaluation.sources;
    let (index, _, range) = crate::render::snippet::place(sources, span);
    match sources.file(index) {
        Some(_) if index == 0 => document.index.range(&document.text, range),
        Some(file) => LineIndex::new(&file.text).range(&file.text, range),
        None => Range::default(),
    }
}

/// A span as a location in whichever file holds it.
pub fn location(document: &Document, span: Span) -> Option<Location> {
    let file = document.evaluation.sources.file_index_of(span.start);
    Some(Location::new(
        document.file_uri(file)?,
        range_in_file(document, span),
    ))
}

/// The document's include line that brought in source file `file` (directly, or the first
/// include line when it came through another included sheet).
fn include_line_for(document: &Document, file: usize) -> Range {
    let label = document
        .evaluation
        .sources
        .file(file)
        .map(|file| file.label.as_str())
        .unwrap_or_default();
    let includes: Vec<usize> = document
        .evaluation
        .lines
        .iter()
        .filter_map(|line| match &line.result {
            LineResult::Include { file } if file == label => Some(line.number),
            _ => None,
        })
        .chain(
            document
                .evaluation
                .lines
                .iter()
                .filter(|line| matches!(line.result, LineResult::Include { .. }))
                .map(|line| line.number),
        )
        .collect();
    let line = includes.first().map_or(0, |number| number - 1);
    let start = document.index.line_start(line).unwrap_or(0);
    let end = document.index.line_end(&document.text, line);
    document.index.range(&document.text, start..end)
}
