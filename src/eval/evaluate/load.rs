//! Loading a sheet and its includes and data files into one source map, in include order.

use crate::eval::data::DataTable;
use crate::eval::diagnostic::Diagnostic;
use crate::eval::error::{EvalError, EvalErrorKind};
use crate::eval::sources::{IncludeLoader, SourceMap, INCLUDE_DEPTH_LIMIT};
use crate::syntax::{parse_sheet_with, ExpressionKind, Line, LineKind, Span};
use rustc_hash::FxHashMap as HashMap;
use std::sync::Arc;

/// The lines of a sheet and of everything it includes, before evaluation.
#[derive(Default)]
pub(super) struct Loaded {
    pub(super) sources: SourceMap,
    pub(super) lines: Vec<Line>,
    pub(super) errors: Vec<crate::syntax::SyntaxError>,
    pub(super) diagnostics: Vec<Diagnostic>,
    /// Include lines that loaded, with the label of the sheet they brought in.
    pub(super) includes: Vec<(usize, String)>,
    /// How many of `lines` belong to the main sheet (they come first).
    pub(super) main_lines: usize,
    /// Data files read by `column … from` lines, by the start of each line's expression.
    pub(super) data_files: HashMap<usize, Result<Arc<DataTable>, EvalError>>,
    /// Each data file read so far, by its loader key, so a file is parsed once.
    pub(super) tables: HashMap<String, Result<Arc<DataTable>, String>>,
    /// The label of each sheet loaded so far, by its loader key (a canonical path): a sheet
    /// reached by two spellings (`c.fxs`, `sub/../c.fxs`) loads once.
    pub(super) sheets: HashMap<String, String>,
    pub(super) max_rows: usize,
    pub(super) data_delimiter: Option<u8>,
    /// Threads for parsing (`Settings::threads`).
    pub(super) threads: usize,
}

impl Loaded {
    /// Reads the data files named by the lines from `first` on, of the sheet `label`.
    pub(super) fn load_data_files(
        &mut self,
        first: usize,
        label: &str,
        loader: &mut dyn IncludeLoader,
    ) {
        for line in &self.lines[first..] {
            let LineKind::Definition(definition) = &line.kind else {
                continue;
            };
            let ExpressionKind::FileColumn {
                path, path_span, ..
            } = &definition.expression.kind
            else {
                continue;
            };
            let table = match loader.load_data(path, label) {
                Err(message) => Err(message),
                Ok(file) => self
                    .tables
                    .entry(file.key.clone())
                    .or_insert_with(|| {
                        crate::eval::data::read_table_with(
                            path,
                            &file.text,
                            self.max_rows,
                            self.data_delimiter,
                        )
                        .map(Arc::new)
                    })
                    .clone(),
            };
            let table = table
                .map_err(|message| EvalError::new(EvalErrorKind::DataFile { message }, *path_span));
            self.data_files
                .insert(definition.expression.span.start, table);
        }
    }

    /// Parses file `index`, then the sheets it includes (each once; a cycle is an error).
    /// `chain` holds the (key, label) of each sheet on the way here.
    pub(super) fn load(
        &mut self,
        index: usize,
        chain: &mut Vec<(String, String)>,
        loader: &mut dyn IncludeLoader,
    ) {
        let Some(file) = self.sources.file(index) else {
            return;
        };
        let (label, parsed) = (
            file.label.clone(),
            parse_sheet_with(&file.text, file.base, self.threads),
        );
        let first = self.lines.len();
        self.lines.extend(parsed.sheet.lines);
        self.errors.extend(parsed.errors);
        if index == 0 {
            self.main_lines = self.lines.len();
            if let Some((key, label)) = chain.first() {
                self.sheets.insert(key.clone(), label.clone());
            }
        }
        self.load_data_files(first, &label, loader);
        let includes: Vec<(usize, String, Span)> = (first..self.lines.len())
            .filter_map(|line| match &self.lines[line].kind {
                LineKind::Include(include) => Some((line, include.path.clone(), include.path_span)),
                _ => None,
            })
            .collect();
        for (line, path, span) in includes {
            match loader.load(&path, &label) {
                Err(message) => {
                    let error = EvalError::new(EvalErrorKind::Include { message }, span);
                    self.diagnostics.push(error.to_diagnostic());
                }
                Ok(sheet) if chain.iter().any(|(key, _)| *key == sheet.key) => {
                    let mut cycle: Vec<String> =
                        chain.iter().map(|(_, label)| label.clone()).collect();
                    cycle.push(sheet.label);
                    let error = EvalError::new(EvalErrorKind::IncludeCycle { chain: cycle }, span);
                    self.diagnostics.push(error.to_diagnostic());
                }
                Ok(_) if chain.len() > INCLUDE_DEPTH_LIMIT => {
                    let limit = INCLUDE_DEPTH_LIMIT;
                    let error = EvalError::new(EvalErrorKind::IncludeTooDeep { limit }, span);
                    self.diagnostics.push(error.to_diagnostic());
                }
                Ok(sheet) => {
                    // A sheet reached twice (two includes of one constants file) loads once.
                    if let Some(known) = self.sheets.get(&sheet.key) {
                        self.includes.push((line, known.clone()));
                        continue;
                    }
                    self.includes.push((line, sheet.label.clone()));
                    self.sheets.insert(sheet.key.clone(), sheet.label.clone());
                    let included = self.sources.add(&sheet.label, &sheet.text);
                    chain.push((sheet.key, sheet.label));
                    self.load(included, chain, loader);
                    chain.pop();
                }
            }
        }
    }
}
