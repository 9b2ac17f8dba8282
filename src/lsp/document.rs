//! An open sheet: its text, the evaluation of that text, and (on demand) the syntax trees of it
//! and of every sheet it includes, for hovers, definitions and the outline.
//!
//! Every edit re-evaluates the whole sheet with the same loader and sandbox as `run`, so the
//! diagnostics are `run`'s exactly; `benches/engine.rs` (`lsp_keystroke`) measures that this
//! stays well inside a keystroke on a 1 000-line sheet.

use super::position::LineIndex;
use super::uri::{path_of, uri_of};
use crate::eval::{evaluate, Evaluation, LineOutcome, NoIncludes};
use crate::front::includes::FileIncludeLoader;
use crate::library::Builtins;
use crate::syntax::{parse_sheet_at, Line};
use lsp_types::{TextDocumentContentChangeEvent, Uri};
use std::cell::OnceCell;
use std::path::PathBuf;

pub struct Document {
    pub uri: Uri,
    pub version: i32,
    pub text: String,
    /// The file behind the document, for includes and data files; `None` for an unsaved buffer.
    path: Option<PathBuf>,
    pub index: LineIndex,
    pub evaluation: Evaluation,
    /// The lines of the sheet and of its includes, parsed when first asked for, with spans in
    /// the evaluation's shared offset space.
    syntax: OnceCell<Vec<Line>>,
}

impl Document {
    pub fn open(uri: Uri, text: String, version: i32) -> Document {
        let path = path_of(&uri);
        let evaluation = evaluate_text(&uri, path.as_ref(), &text);
        Document {
            index: LineIndex::new(&text),
            uri,
            version,
            text,
            path,
            evaluation,
            syntax: OnceCell::new(),
        }
    }

    /// Applies the editor's changes in order, then re-evaluates.
    pub fn change(&mut self, version: i32, changes: Vec<TextDocumentContentChangeEvent>) {
        for change in changes {
            match change.range {
                Some(range) => {
                    let start = self.index.offset(&self.text, range.start);
                    let end = self.index.offset(&self.text, range.end).max(start);
                    self.text.replace_range(start..end, &change.text);
                }
                None => self.text = change.text,
            }
            self.index = LineIndex::new(&self.text);
        }
        self.version = version;
        self.reevaluate();
    }

    /// Evaluates the text again (after an edit, or when an included file was saved).
    pub fn reevaluate(&mut self) {
        self.evaluation = evaluate_text(&self.uri, self.path.as_ref(), &self.text);
        self.syntax = OnceCell::new();
    }

    /// The lines of this sheet and of every sheet it includes.
    pub fn syntax(&self) -> &[Line] {
        self.syntax.get_or_init(|| {
            self.evaluation
                .sources
                .files()
                .iter()
                .filter(|file| !file.label.starts_with("--set "))
                .flat_map(|file| parse_sheet_at(&file.text, file.base).sheet.lines)
                .collect()
        })
    }

    /// The outcome of this sheet's line `line` (0-based).
    pub fn outcome(&self, line: usize) -> Option<&LineOutcome> {
        self.evaluation
            .lines
            .iter()
            .find(|outcome| outcome.number == line + 1)
    }

    /// The URI of the evaluation's source file `file` (0 is this document).
    pub fn file_uri(&self, file: usize) -> Option<Uri> {
        if file == 0 {
            return Some(self.uri.clone());
        }
        let label = &self.evaluation.sources.file(file)?.label;
        let path = std::fs::canonicalize(label).unwrap_or_else(|_| PathBuf::from(label));
        uri_of(&path)
    }
}

/// Evaluates a document as `run` evaluates a file: includes and data files through the file
/// loader and its folder sandbox, or refused for a buffer with no file.
fn evaluate_text(uri: &Uri, path: Option<&PathBuf>, text: &str) -> Evaluation {
    let library = Builtins::standard();
    match path {
        Some(path) => {
            let label = path.to_string_lossy();
            let mut loader = FileIncludeLoader::new(&label, Some(path), false);
            evaluate(&label, text, library, &mut loader)
        }
        None => evaluate(uri.as_str(), text, library, &mut NoIncludes),
    }
}
