//! An interactive session: a sheet that grows one entry at a time.
//!
//! Over 800 lines: entries, redefinition with dependents, loading a sheet with its includes and
//! data files, and saving, all over one table of kept lines; tests at the foot.
//!
//! Each kept line is parsed once, when it is entered, and keeps its value. The session knows
//! which lines refer to which names, so an entry costs parsing that one line and evaluating it;
//! redefining a name re-evaluates only the lines that depend on it, directly or through other
//! lines, in dependency order. Unlike a sheet file, a session allows a name to be redefined: the
//! new definition replaces the old one in place. A redefinition that would make a circular
//! definition is refused, and the old definition stays.
//!
//! `_` stands for the last result. In an entry it is replaced, before the entry is kept, by the
//! name of the line that produced that result, or by its value and unit when it came from a
//! bare expression, so a saved session is a sheet that runs on its own.
//!
//! A loaded sheet's includes are followed through the front end's `IncludeLoader`: the included
//! sheets' lines join the session so that their names and functions can be used, but they are
//! not listed or saved (the `include` line is), and a session entry cannot redefine them, just
//! as a sheet defines a name once across its includes.
//!
//! Expressions are evaluated by the same `Calculator` as sheet files. Nothing here prints or
//! touches files.

use super::diagnostic::Diagnostic;
use super::error::{EvalError, EvalErrorKind};
use super::evaluate::{with_origin, Calculator, Failure, LineResult, Scope, Shown};
use super::function::Library;
use super::order::{dependency_order, shortest_cycle_through};
use super::sources::IncludeLoader;
use crate::syntax::{parse_line, FunctionDefinition, Line, LineKind, Span};
use std::collections::HashMap;

/// The name that holds the last result.
pub const LAST_RESULT: &str = "_";

/// A line the session keeps: its text, its syntax tree and its current result.
#[derive(Debug, Clone)]
pub struct SessionLine {
    text: String,
    line: Line,
    result: LineResult,
    /// Errors of this line's own, with spans into `text`.
    diagnostics: Vec<Diagnostic>,
    /// The names its expressions refer to, without repeats.
    references: Vec<String>,
    /// The label of the included sheet it comes from; `None` for the session's own lines.
    included_from: Option<String>,
}

impl SessionLine {
    /// The line as it would be written in a sheet.
    pub fn text(&self) -> &str {
        &self.text
    }

    /// The name it defines, if it is a definition.
    pub fn name(&self) -> Option<&str> {
        line_name(&self.line)
    }

    pub fn kind(&self) -> &LineKind {
        &self.line.kind
    }

    pub fn result(&self) -> &LineResult {
        &self.result
    }

    /// The line's own errors; their spans point into `text()`.
    pub fn diagnostics(&self) -> &[Diagnostic] {
        &self.diagnostics
    }

    /// The names it refers to.
    pub fn references(&self) -> &[String] {
        &self.references
    }

    /// The label of the included sheet this line comes from, if it is not the session's own:
    /// such lines are neither listed nor saved.
    pub fn included_from(&self) -> Option<&str> {
        self.included_from.as_deref()
    }

    /// The line's value, when it has one.
    pub fn value(&self) -> Option<&Shown> {
        match &self.result {
            LineResult::Value(value) => Some(value),
            _ => None,
        }
    }
}

/// What became of one entry.
#[derive(Debug, Clone)]
pub struct EntryReport {
    /// The entry as evaluated (after `_` was replaced); diagnostics point into it.
    pub text: String,
    pub outcome: Outcome,
    /// Errors of the entry itself.
    pub diagnostics: Vec<Diagnostic>,
    /// Lines evaluated again because they depend on the entry, in the order they were evaluated.
    pub recomputed: Vec<usize>,
}

#[derive(Debug, Clone, PartialEq)]
pub enum Outcome {
    /// Nothing to do (a blank entry).
    Nothing,
    /// A bare expression: shown, not kept.
    Shown(Shown),
    /// Kept as a new line at this index.
    Added(usize),
    /// Replaced the definition at this index, whose text was `previous`.
    Replaced { index: usize, previous: String },
    /// Not kept; the reasons are in the diagnostics. The session is unchanged.
    Refused,
}

/// What loading a sheet into the session did.
#[derive(Debug, Clone, Default)]
pub struct LoadReport {
    /// The lines the sheet added or replaced, in sheet order: (line number in the sheet,
    /// index in the session).
    pub kept: Vec<(usize, usize)>,
    /// The lines of the sheets it included, in load order: (sheet label, line number in that
    /// sheet, index in the session).
    pub included: Vec<(String, usize, usize)>,
    /// Definitions of the sheet that replaced an earlier one: (index, name).
    pub replaced: Vec<(usize, String)>,
    /// Lines that did not parse, or defined a name twice across the sheet and its includes,
    /// and were left out: (sheet label, line number in that sheet, its text, the error with a
    /// span into that text).
    pub rejected: Vec<(String, usize, String, Diagnostic)>,
    /// Lines of the session evaluated again because they depend on the sheet's definitions.
    pub recomputed: Vec<usize>,
}

/// The state of one `load`: what it did so far, and what it has seen.
struct Loading {
    report: LoadReport,
    /// The lines to evaluate once every sheet is in.
    seeds: Vec<usize>,
    /// Names defined so far by this load: (sheet label, line number, from an included sheet).
    defined: HashMap<String, (String, usize, bool)>,
    /// Cycle keys and labels of the sheets on the way to the one being loaded.
    chain: Vec<(String, String)>,
    /// Cycle keys of the sheets included so far: each loads once.
    loaded_keys: std::collections::HashSet<String>,
}

/// The last result, for `_`.
#[derive(Debug, Clone)]
enum Last {
    /// A kept definition's name.
    Name(String),
    /// A bare expression's value.
    Value(Shown),
}

/// A growing sheet with its values and dependency graph.
pub struct Session<'l> {
    calculator: Calculator<'l>,
    lines: Vec<SessionLine>,
    /// Name -> index of the line that defines it.
    by_name: HashMap<String, usize>,
    /// Name -> indices of the lines that refer to it (defined or not yet).
    referrers: HashMap<String, Vec<usize>>,
    last: Option<Last>,
    modified: bool,
}

/// The session's names as the calculator sees them.
struct SessionScope<'s> {
    lines: &'s [SessionLine],
    by_name: &'s HashMap<String, usize>,
}

impl Scope for SessionScope<'_> {
    fn definition(&self, name: &str) -> Option<&crate::syntax::Definition> {
        match self.lines.get(*self.by_name.get(name)?)?.kind() {
            LineKind::Definition(definition) => Some(definition),
            _ => None,
        }
    }

    fn lookup(&self, name: &str) -> Option<Option<&Shown>> {
        let line = self.lines.get(*self.by_name.get(name)?)?;
        match line.kind() {
            LineKind::Function(_) => None,
            _ => Some(line.value()),
        }
    }

    fn sheet_function(&self, name: &str) -> Option<Option<&FunctionDefinition>> {
        let line = self.lines.get(*self.by_name.get(name)?)?;
        match (line.kind(), line.result()) {
            (LineKind::Function(_), LineResult::Error) => Some(None),
            (LineKind::Function(function), _) => Some(Some(function)),
            _ => None,
        }
    }

    fn for_each_defined(&self, visit: &mut dyn FnMut(&str)) {
        for name in self.by_name.keys() {
            visit(name);
        }
    }
}

impl<'l> Session<'l> {
    pub fn new(library: &'l dyn Library) -> Session<'l> {
        Session {
            calculator: Calculator::new(library),
            lines: Vec::new(),
            by_name: HashMap::new(),
            referrers: HashMap::new(),
            last: None,
            modified: false,
        }
    }

    /// Sets the longest column entries may make (`--max-rows` of `run`); by default
    /// `DEFAULT_MAX_ROWS`. Applies to entries and data files provided from now on.
    pub fn set_max_rows(&mut self, max_rows: usize) {
        self.calculator.max_rows = max_rows;
    }

    /// The kept lines, in sheet order, with those of included sheets.
    pub fn lines(&self) -> &[SessionLine] {
        &self.lines
    }

    /// The session's own lines, in sheet order: those it lists and saves (not the lines of
    /// included sheets).
    pub fn own_lines(&self) -> impl Iterator<Item = &SessionLine> {
        self.lines
            .iter()
            .filter(|line| line.included_from.is_none())
    }

    pub fn line(&self, index: usize) -> Option<&SessionLine> {
        self.lines.get(index)
    }

    /// The line that defines `name`.
    pub fn definition(&self, name: &str) -> Option<&SessionLine> {
        self.by_name
            .get(name)
            .and_then(|index| self.lines.get(*index))
    }

    /// Names the session defines, sorted.
    pub fn names(&self) -> Vec<&str> {
        let mut names: Vec<&str> = self.by_name.keys().map(String::as_str).collect();
        names.sort_unstable();
        names
    }

    /// Names of the definitions that refer to `name`, sorted.
    pub fn used_by(&self, name: &str) -> Vec<&str> {
        let mut names: Vec<&str> = self
            .referrers
            .get(name)
            .into_iter()
            .flatten()
            .filter_map(|index| self.lines.get(*index).and_then(SessionLine::name))
            .collect();
        names.sort_unstable();
        names.dedup();
        names
    }

    /// Hands the session a data file that `column … from "path"` entries read (`text` is the
    /// file's content, or why it could not be read). Front ends read files; the session does no
    /// I/O.
    pub fn provide_data_file(&mut self, path: &str, text: Result<String, String>) {
        let table = text.and_then(|text| {
            super::data::read_table(path, &text, self.calculator.max_rows).map(std::sync::Arc::new)
        });
        self.calculator.data_by_path.insert(path.to_string(), table);
    }

    /// The last result, if any.
    pub fn last_result(&self) -> Option<&Shown> {
        match &self.last {
            Some(Last::Value(value)) => Some(value),
            Some(Last::Name(name)) => self.definition(name).and_then(SessionLine::value),
            None => None,
        }
    }

    /// Whether lines were kept or changed since the session was created, loaded into while
    /// empty, saved or cleared.
    pub fn is_modified(&self) -> bool {
        self.modified
    }

    /// Records that the session's lines are saved.
    pub fn mark_saved(&mut self) {
        self.modified = false;
    }

    /// How many lines are definitions.
    pub fn definition_count(&self) -> usize {
        self.by_name.len()
    }

    /// The session as a sheet: every kept line, in order, ready for `fluxsheet run`.
    pub fn to_sheet(&self) -> String {
        let mut sheet = String::new();
        for line in self.own_lines() {
            sheet.push_str(&line.text);
            sheet.push('\n');
        }
        sheet
    }

    /// Forgets every line and the last result.
    pub fn clear(&mut self) {
        self.lines.clear();
        self.by_name.clear();
        self.referrers.clear();
        self.last = None;
        self.modified = false;
    }

    /// Takes one entry: a sheet line or a bare expression.
    pub fn enter(&mut self, text: &str) -> EntryReport {
        let text = text.trim_end_matches(['\r', '\n']);
        let refused = |text: String, diagnostic: Diagnostic| EntryReport {
            text,
            outcome: Outcome::Refused,
            diagnostics: vec![diagnostic],
            recomputed: Vec::new(),
        };
        let line = match parse_line(text, self.lines.len() + 1, 0) {
            Ok(line) => line,
            Err(error) => return refused(text.to_string(), Diagnostic::from(&error)),
        };
        let (text, line) = match self.replace_last_result(text, line) {
            Ok(replaced) => replaced,
            Err(diagnostic) => return refused(text.to_string(), diagnostic),
        };
        let mut report = EntryReport {
            text,
            outcome: Outcome::Nothing,
            diagnostics: Vec::new(),
            recomputed: Vec::new(),
        };
        match &line.kind {
            LineKind::Blank | LineKind::Invalid => {}
            LineKind::Include(_) => {
                let message = "includes are not available in a session; `:load` the sheet instead";
                report.outcome = Outcome::Refused;
                report
                    .diagnostics
                    .push(Diagnostic::error(message, line.span));
            }
            LineKind::Comment | LineKind::Heading(_) | LineKind::Field(_) => {
                let index = self.push(report.text.clone(), line);
                report.outcome = Outcome::Added(index);
            }
            LineKind::Display(display) => {
                let scope = SessionScope {
                    lines: &self.lines,
                    by_name: &self.by_name,
                };
                let outcome = self.calculator.line_value(
                    &display.expression,
                    display.display_unit.as_ref(),
                    &scope,
                );
                match outcome {
                    Ok(value) => {
                        self.last = Some(Last::Value(value.clone()));
                        report.outcome = Outcome::Shown(value);
                    }
                    Err(failure) => {
                        report.outcome = Outcome::Refused;
                        report
                            .diagnostics
                            .push(failure_diagnostic(failure, display.expression.span));
                    }
                }
            }
            LineKind::Check(_) | LineKind::Plot(_) => self.keep_new(line, &mut report),
            LineKind::Definition(_) | LineKind::Function(_) => {
                let Some((name, name_span)) = line_name_and_span(&line) else {
                    return report;
                };
                let name = name.to_string();
                if name == LAST_RESULT && !self.by_name.contains_key(LAST_RESULT) {
                    let message = format!(
                        "`{LAST_RESULT}` holds the last result and cannot be defined; choose another name"
                    );
                    report.outcome = Outcome::Refused;
                    report
                        .diagnostics
                        .push(Diagnostic::error(message, name_span));
                    return report;
                }
                if let Some(sheet) = self.definition(&name).and_then(SessionLine::included_from) {
                    let message = format!(
                        "`{name}` is defined in the included sheet `{sheet}`, and a sheet defines a name once: change it there and `:load` again, or choose another name"
                    );
                    report.outcome = Outcome::Refused;
                    report
                        .diagnostics
                        .push(Diagnostic::error(message, name_span));
                    return report;
                }
                if let Some(path) = self.cycle_through(&name, &references_of(&line)) {
                    let mut diagnostic =
                        EvalError::new(EvalErrorKind::Cycle { path }, name_span).to_diagnostic();
                    if self.by_name.contains_key(&name) {
                        diagnostic = diagnostic
                            .with_help(Some(format!("the definition of `{name}` is unchanged")));
                    }
                    report.outcome = Outcome::Refused;
                    report.diagnostics.push(diagnostic);
                    return report;
                }
                match self.by_name.get(&name).copied() {
                    None => self.keep_new(line, &mut report),
                    Some(index) => self.keep_replacement(index, line, &mut report),
                }
                if matches!(report.outcome, Outcome::Added(_) | Outcome::Replaced { .. })
                    && self
                        .definition(&name)
                        .and_then(SessionLine::value)
                        .is_some()
                {
                    self.last = Some(Last::Name(name));
                }
            }
        }
        report
    }

    /// Adds a sheet's lines: definitions of names the session has replace them, the rest are
    /// added at the end; then everything they affect is evaluated in dependency order. The
    /// sheet is labelled `label` for `loader`, which reads its includes and data files under
    /// the front end's rules.
    pub fn load(
        &mut self,
        label: &str,
        source: &str,
        loader: &mut dyn IncludeLoader,
    ) -> LoadReport {
        let was_clean = self.lines.is_empty() && !self.modified;
        let mut loading = Loading {
            report: LoadReport::default(),
            seeds: Vec::new(),
            defined: HashMap::new(),
            chain: vec![(loader.main_key(label), label.to_string())],
            loaded_keys: std::collections::HashSet::new(),
        };
        self.load_sheet(label, source, None, loader, &mut loading);
        let Loading {
            mut report, seeds, ..
        } = loading;
        let order = self.evaluate_with_dependents(&seeds);
        let seeded: std::collections::HashSet<usize> = seeds.iter().copied().collect();
        report.recomputed = order
            .into_iter()
            .filter(|index| !seeded.contains(index))
            .collect();
        // Loaded into a clean, empty session, the session is the sheet.
        self.modified = !was_clean || !report.replaced.is_empty();
        report
    }

    /// Adds the lines of one sheet, following its includes where they stand. `included_from`
    /// is the sheet's label when it is an included one.
    fn load_sheet(
        &mut self,
        label: &str,
        source: &str,
        included_from: Option<&str>,
        loader: &mut dyn IncludeLoader,
        loading: &mut Loading,
    ) {
        let source = source
            .strip_prefix(crate::syntax::BYTE_ORDER_MARK)
            .unwrap_or(source);
        let mut raw_lines: Vec<&str> = source.split('\n').collect();
        if source.ends_with('\n') {
            raw_lines.pop();
        }
        for (position, raw_line) in raw_lines.iter().enumerate() {
            let number = position + 1;
            let text = raw_line.strip_suffix('\r').unwrap_or(raw_line);
            let line = match parse_line(text, number, 0) {
                Ok(line) => line,
                Err(error) => {
                    let diagnostic = Diagnostic::from(&error);
                    loading.report.rejected.push((
                        label.to_string(),
                        number,
                        text.to_string(),
                        diagnostic,
                    ));
                    continue;
                }
            };
            if let Some((name, span)) = line_name_and_span(&line) {
                let earlier = loading.defined.get(name);
                if let Some((earlier_label, earlier_number, earlier_included)) = earlier {
                    // Within one sheet a later definition replaces an earlier one, as typed
                    // entries do; across a sheet and its includes a name is defined once.
                    if *earlier_included || included_from.is_some() {
                        let message = format!(
                            "`{name}` is already defined at {earlier_label}:{earlier_number}; a sheet and the sheets it includes define a name once"
                        );
                        loading.report.rejected.push((
                            label.to_string(),
                            number,
                            text.to_string(),
                            Diagnostic::error(message, span),
                        ));
                        continue;
                    }
                }
                loading.defined.insert(
                    name.to_string(),
                    (label.to_string(), number, included_from.is_some()),
                );
            }
            self.provide_data_files_of(&line, label, loader);
            let include = match &line.kind {
                LineKind::Include(include) => Some((include.path.clone(), include.path_span)),
                _ => None,
            };
            let existing = line_name(&line).and_then(|name| self.by_name.get(name).copied());
            let index = match existing {
                Some(index) => {
                    let name = line_name(&line).unwrap_or_default().to_string();
                    self.replace(index, text.to_string(), line);
                    loading.report.replaced.push((index, name));
                    index
                }
                None => self.push(text.to_string(), line),
            };
            self.lines[index].included_from = included_from.map(str::to_string);
            match included_from {
                Some(sheet) => loading
                    .report
                    .included
                    .push((sheet.to_string(), number, index)),
                None => loading.report.kept.push((number, index)),
            }
            loading.seeds.push(index);
            if let Some((path, span)) = include {
                self.follow_include(index, &path, span, label, loader, loading);
            }
        }
    }

    /// Loads the sheet an `include` line at `index` names and records the outcome as that
    /// line's result: the included sheet's label, or the error (each sheet loads once; a cycle
    /// is an error).
    fn follow_include(
        &mut self,
        index: usize,
        path: &str,
        span: Span,
        from: &str,
        loader: &mut dyn IncludeLoader,
        loading: &mut Loading,
    ) {
        let failure = match loader.load(path, from) {
            Err(message) => Some(EvalError::new(EvalErrorKind::Include { message }, span)),
            Ok(sheet) if loading.chain.iter().any(|(key, _)| *key == sheet.key) => {
                let mut chain: Vec<String> = loading
                    .chain
                    .iter()
                    .map(|(_, label)| label.clone())
                    .collect();
                chain.push(sheet.label);
                Some(EvalError::new(EvalErrorKind::IncludeCycle { chain }, span))
            }
            Ok(_) if loading.chain.len() > super::INCLUDE_DEPTH_LIMIT => {
                let limit = super::INCLUDE_DEPTH_LIMIT;
                Some(EvalError::new(
                    EvalErrorKind::IncludeTooDeep { limit },
                    span,
                ))
            }
            Ok(sheet) => {
                self.lines[index].result = LineResult::Include {
                    file: sheet.label.clone(),
                };
                if loading.loaded_keys.insert(sheet.key.clone()) {
                    loading.chain.push((sheet.key, sheet.label.clone()));
                    self.load_sheet(
                        &sheet.label,
                        &sheet.text,
                        Some(&sheet.label),
                        loader,
                        loading,
                    );
                    loading.chain.pop();
                }
                None
            }
        };
        if let Some(error) = failure {
            let line = &mut self.lines[index];
            line.result = LineResult::Error;
            line.diagnostics = vec![error.to_diagnostic()];
        }
    }

    /// Reads the data file a `column … from` line names, relative to the sheet `label`.
    fn provide_data_files_of(&mut self, line: &Line, label: &str, loader: &mut dyn IncludeLoader) {
        let LineKind::Definition(definition) = &line.kind else {
            return;
        };
        if let crate::syntax::ExpressionKind::FileColumn { path, .. } = &definition.expression.kind
        {
            let text = loader.load_data(path, label).map(|file| file.text);
            self.provide_data_file(path, text);
        }
    }

    // ----- keeping lines -----

    /// Evaluates an entry against the session as it is; `None` (with the diagnostics in the
    /// report) if it fails on its own. Entries are checked for cycles before, so a line's own
    /// old value never takes part.
    fn evaluate_entry(&mut self, line: &Line, report: &mut EntryReport) -> Option<LineResult> {
        let scope = SessionScope {
            lines: &self.lines,
            by_name: &self.by_name,
        };
        let (result, diagnostics) = evaluate_line(&mut self.calculator, &scope, line);
        if matches!(result, LineResult::Error) {
            report.diagnostics = diagnostics;
            report.outcome = Outcome::Refused;
            return None;
        }
        Some(result)
    }

    fn keep_new(&mut self, line: Line, report: &mut EntryReport) {
        let Some(result) = self.evaluate_entry(&line, report) else {
            return;
        };
        let index = self.push(report.text.clone(), line);
        self.lines[index].result = result;
        report.outcome = Outcome::Added(index);
        report.recomputed = self.evaluate_dependents(index);
    }

    fn keep_replacement(&mut self, index: usize, line: Line, report: &mut EntryReport) {
        let Some(result) = self.evaluate_entry(&line, report) else {
            return;
        };
        let previous = self.replace(index, report.text.clone(), line);
        self.lines[index].result = result;
        report.outcome = Outcome::Replaced { index, previous };
        report.recomputed = self.evaluate_dependents(index);
    }

    /// Evaluates the lines that depend on line `index` (already evaluated), in order.
    fn evaluate_dependents(&mut self, index: usize) -> Vec<usize> {
        let Some(name) = self.lines[index].name() else {
            return Vec::new();
        };
        let Some(referrers) = self.referrers.get(name) else {
            return Vec::new();
        };
        let referrers = referrers.clone();
        self.evaluate_with_dependents(&referrers)
    }

    /// Appends a line (not yet evaluated) and indexes its names.
    fn push(&mut self, text: String, line: Line) -> usize {
        let index = self.lines.len();
        let references = references_of(&line);
        for name in &references {
            self.referrers.entry(name.clone()).or_default().push(index);
        }
        if let Some(name) = line_name(&line) {
            self.by_name.insert(name.to_string(), index);
        }
        let result = initial_result(&line);
        self.lines.push(SessionLine {
            text,
            line,
            result,
            diagnostics: Vec::new(),
            references,
            included_from: None,
        });
        if !matches!(self.lines[index].line.kind, LineKind::Blank) {
            self.modified = true;
        }
        index
    }

    /// Replaces the line at `index`, keeping its place; returns the old text.
    fn replace(&mut self, index: usize, text: String, line: Line) -> String {
        let references = references_of(&line);
        let result = initial_result(&line);
        let old = std::mem::replace(
            &mut self.lines[index],
            SessionLine {
                text,
                line,
                result,
                diagnostics: Vec::new(),
                references,
                included_from: None,
            },
        );
        self.unindex(index, &old);
        for name in self.lines[index].references.clone() {
            self.referrers.entry(name).or_default().push(index);
        }
        if let Some(name) = self.lines[index].name().map(str::to_string) {
            self.by_name.insert(name, index);
        }
        self.modified = true;
        old.text
    }

    /// Removes a line's entries from the name indexes.
    fn unindex(&mut self, index: usize, line: &SessionLine) {
        for name in &line.references {
            if let Some(list) = self.referrers.get_mut(name) {
                list.retain(|referrer| *referrer != index);
                if list.is_empty() {
                    self.referrers.remove(name);
                }
            }
        }
        if let Some(name) = line.name() {
            if self.by_name.get(name) == Some(&index) {
                self.by_name.remove(name);
            }
        }
    }

    // ----- evaluation -----

    /// Evaluates `seeds` and every line that depends on them, directly or not, in dependency
    /// order; returns the indices in the order they were evaluated. The work is proportional to
    /// the lines affected, not to the session.
    fn evaluate_with_dependents(&mut self, seeds: &[usize]) -> Vec<usize> {
        // The affected lines, each with a node number.
        let mut node_of: HashMap<usize, usize> = HashMap::new();
        let mut members: Vec<usize> = Vec::new();
        for seed in seeds {
            if *seed < self.lines.len() && !node_of.contains_key(seed) {
                node_of.insert(*seed, members.len());
                members.push(*seed);
            }
        }
        let mut next = 0;
        while next < members.len() {
            let index = members[next];
            next += 1;
            let Some(name) = self.lines[index].name() else {
                continue;
            };
            for referrer in self.referrers.get(name).into_iter().flatten() {
                if !node_of.contains_key(referrer) {
                    node_of.insert(*referrer, members.len());
                    members.push(*referrer);
                }
            }
        }
        let dependencies: Vec<Vec<usize>> = members
            .iter()
            .map(|index| {
                let mut needs = Vec::new();
                for name in &self.lines[*index].references {
                    if let Some(node) = self.by_name.get(name).and_then(|line| node_of.get(line)) {
                        if !needs.contains(node) {
                            needs.push(*node);
                        }
                    }
                }
                needs
            })
            .collect();
        let order = dependency_order(&dependencies);
        let mut evaluated = Vec::with_capacity(members.len());
        for node in &order.sequence {
            let index = members[*node];
            let scope = SessionScope {
                lines: &self.lines,
                by_name: &self.by_name,
            };
            let line = &self.lines[index];
            // An include line's result was settled when its sheet was loaded.
            if matches!(line.line.kind, LineKind::Include(_)) {
                evaluated.push(index);
                continue;
            }
            let (result, diagnostics) = evaluate_line(&mut self.calculator, &scope, &line.line);
            let line = &mut self.lines[index];
            line.result = result;
            line.diagnostics = diagnostics;
            evaluated.push(index);
        }
        let mut in_cycle = vec![false; members.len()];
        for cycle in &order.cycles {
            let names: Vec<String> = cycle
                .iter()
                .chain(cycle.first())
                .filter_map(|node| self.lines[members[*node]].name().map(str::to_string))
                .collect();
            for node in cycle {
                in_cycle[*node] = true;
                let line = &mut self.lines[members[*node]];
                let span = line_name_and_span(&line.line)
                    .map_or(Span::new(0, line.text.len()), |(_, span)| span);
                line.result = LineResult::Error;
                line.diagnostics = vec![EvalError::new(
                    EvalErrorKind::Cycle {
                        path: names.clone(),
                    },
                    span,
                )
                .to_diagnostic()];
            }
        }
        for node in &order.blocked {
            let index = members[*node];
            if in_cycle[*node] {
                evaluated.push(index);
                continue;
            }
            let cause = self.lines[index]
                .references
                .iter()
                .find(|name| {
                    self.by_name
                        .get(name.as_str())
                        .is_some_and(|line| self.lines[*line].value().is_none())
                })
                .cloned()
                .unwrap_or_default();
            let line = &mut self.lines[index];
            line.result = LineResult::Skipped { because_of: cause };
            line.diagnostics.clear();
            evaluated.push(index);
        }
        evaluated
    }

    /// If defining `name` with these references would close a loop, the loop as names from
    /// `name` back to `name`: `order::shortest_cycle_through` walks from the new definition
    /// (a node number no line has) to the lines that depend on it, so the check costs nothing
    /// for a new name and no more than the recomputation for a redefinition.
    fn cycle_through(&self, name: &str, references: &[String]) -> Option<Vec<String>> {
        const NEW_DEFINITION: usize = usize::MAX;
        let name_of = |node: usize| match node {
            NEW_DEFINITION => Some(name),
            line => self.lines.get(line).and_then(SessionLine::name),
        };
        let cycle = shortest_cycle_through(
            NEW_DEFINITION,
            |node, dependents| {
                let Some(needed) = name_of(node) else {
                    return;
                };
                for referrer in self.referrers.get(needed).into_iter().flatten() {
                    // Only named lines can be needed in turn; the old definition of `name` is
                    // the one being replaced.
                    if name_of(*referrer).is_some_and(|dependent| dependent != name) {
                        dependents.push(*referrer);
                    }
                }
            },
            |node| {
                name_of(node)
                    .is_some_and(|needed| references.iter().any(|reference| reference == needed))
            },
        )?;
        let mut path: Vec<String> = cycle
            .iter()
            .filter_map(|node| name_of(*node).map(str::to_string))
            .collect();
        path.push(name.to_string());
        Some(path)
    }

    /// Replaces `_` in an entry by the last result's name or value, unless the session defines
    /// `_` itself.
    fn replace_last_result(&self, text: &str, line: Line) -> Result<(String, Line), Diagnostic> {
        if self.by_name.contains_key(LAST_RESULT) {
            return Ok((text.to_string(), line));
        }
        let mut spans = Vec::new();
        for expression in line.expressions() {
            expression.for_each_name(&mut |name, span| {
                if name == LAST_RESULT {
                    spans.push(span);
                }
            });
        }
        if spans.is_empty() {
            return Ok((text.to_string(), line));
        }
        let replacement = match &self.last {
            Some(Last::Name(name)) => name.clone(),
            Some(Last::Value(value)) => literal_text(value).ok_or_else(|| {
                Diagnostic::error(
                    format!("`{LAST_RESULT}` holds text, which cannot stand in an expression"),
                    spans[0],
                )
            })?,
            None => {
                return Err(Diagnostic::error(
                    format!("`{LAST_RESULT}` has no value yet: it holds the last result"),
                    spans[0],
                ))
            }
        };
        spans.sort_by_key(|span| span.start);
        let mut replaced = String::with_capacity(text.len() + replacement.len());
        let mut copied = 0;
        for span in spans {
            replaced.push_str(text.get(copied..span.start).unwrap_or_default());
            replaced.push_str(&replacement);
            copied = span.end;
        }
        replaced.push_str(text.get(copied..).unwrap_or_default());
        let line =
            parse_line(&replaced, line.number, 0).map_err(|error| Diagnostic::from(&error))?;
        Ok((replaced, line))
    }
}

/// A value written back as a literal that reads as the same quantity: `(4.05e-6 m/s)`, or
/// `({1e0, 2e0} m)` for a column. Text has no literal.
fn literal_text(value: &Shown) -> Option<String> {
    let (number, unit) = match value {
        Shown::Scalar(shown) => (format!("{:e}", shown.value), &shown.unit),
        Shown::Column(shown) => {
            let items: Vec<String> = shown
                .shown_values()
                .map(|item| format!("{item:e}"))
                .collect();
            (format!("{{{}}}", items.join(", ")), &shown.unit)
        }
        Shown::Labels(_) => return None,
    };
    Some(if unit == "1" {
        format!("({number})")
    } else {
        format!("({number} {unit})")
    })
}

/// The name a line defines: a value or a sheet function.
fn line_name(line: &Line) -> Option<&str> {
    line_name_and_span(line).map(|(name, _)| name)
}

fn line_name_and_span(line: &Line) -> Option<(&str, Span)> {
    match &line.kind {
        LineKind::Definition(definition) => {
            Some((definition.name.text.as_str(), definition.name.span))
        }
        LineKind::Function(function) => Some((function.name.text.as_str(), function.name.span)),
        _ => None,
    }
}

/// A line's result before it is evaluated (final for lines without expressions).
fn initial_result(line: &Line) -> LineResult {
    match &line.kind {
        LineKind::Blank => LineResult::Blank,
        LineKind::Comment => LineResult::Comment,
        LineKind::Heading(text) => LineResult::Heading(text.clone()),
        _ => LineResult::Skipped {
            because_of: String::new(),
        },
    }
}

/// The names a line refers to, without repeats, in order of appearance.
/// The names and sheet functions a line refers to (a function's own parameters excluded),
/// without repeats, in order of appearance.
fn references_of(line: &Line) -> Vec<String> {
    let parameters: Vec<&str> = match &line.kind {
        LineKind::Function(function) => function
            .parameters
            .iter()
            .map(|parameter| parameter.name.text.as_str())
            .collect(),
        _ => Vec::new(),
    };
    let mut names: Vec<String> = Vec::new();
    let mut add = |name: &str| {
        if !parameters.contains(&name) && !names.iter().any(|known| known == name) {
            names.push(name.to_string());
        }
    };
    for expression in line.expressions() {
        expression.for_each_name(&mut |name, _| add(name));
        expression.for_each_call(&mut |name, _| add(name));
    }
    if let LineKind::Plot(plot) = &line.kind {
        for name in plot.series.iter().chain([&plot.against]) {
            add(&name.text);
        }
    }
    names
}

/// Evaluates one line against the session.
fn evaluate_line(
    calculator: &mut Calculator<'_>,
    scope: &dyn Scope,
    line: &Line,
) -> (LineResult, Vec<Diagnostic>) {
    let outcome = match &line.kind {
        LineKind::Blank => return (LineResult::Blank, Vec::new()),
        LineKind::Comment => return (LineResult::Comment, Vec::new()),
        LineKind::Heading(heading) => return (LineResult::Heading(heading.clone()), Vec::new()),
        // A title-block field is kept and saved with the session, and has no value.
        LineKind::Field(_) => return (LineResult::Blank, Vec::new()),
        // Settled when its sheet is loaded (see `follow_include`); refused as an entry.
        LineKind::Include(_) => {
            let message = "an include is followed when its sheet is loaded: `:load` the sheet";
            return (
                LineResult::Error,
                vec![Diagnostic::error(message, line.span)],
            );
        }
        LineKind::Invalid => {
            let message = "this line cannot be read as a sheet line";
            return (
                LineResult::Error,
                vec![Diagnostic::error(message, line.span)],
            );
        }
        LineKind::Plot(plot) => calculator
            .plot(plot, scope)
            .map(|outcome| LineResult::Plot(Box::new(outcome))),
        LineKind::Function(function) => calculator
            .check_function_units(function)
            .map(|signature| LineResult::Function { signature })
            .map_err(Failure::from),
        LineKind::Definition(definition) => calculator
            .line_value(
                &definition.expression,
                definition.display_unit.as_ref(),
                scope,
            )
            .map(|shown| LineResult::Value(with_origin(shown, &definition.name.text))),
        LineKind::Display(display) => calculator
            .line_value(&display.expression, display.display_unit.as_ref(), scope)
            .map(LineResult::Value),
        LineKind::Check(check) => calculator
            .check(check, scope)
            .map(|outcome| LineResult::Check(Box::new(outcome))),
    };
    match outcome {
        Ok(result) => (result, Vec::new()),
        Err(Failure::Error(error)) => (LineResult::Error, vec![error.to_diagnostic()]),
        Err(Failure::Upstream(name)) => (LineResult::Skipped { because_of: name }, Vec::new()),
    }
}

/// A failure of a bare expression as a diagnostic: a name without a value is an error there.
fn failure_diagnostic(failure: Failure, span: Span) -> Diagnostic {
    match failure {
        Failure::Error(error) => error.to_diagnostic(),
        Failure::Upstream(name) => Diagnostic::error(
            format!("`{name}` has no value: its line has an error or depends on one"),
            span,
        ),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::library::Builtins;

    fn value(session: &Session, name: &str) -> f64 {
        session
            .definition(name)
            .and_then(SessionLine::value)
            .and_then(Shown::as_scalar)
            .map(|shown| shown.value)
            .unwrap_or(f64::NAN)
    }

    #[test]
    fn definitions_and_bare_expressions() {
        let mut session = Session::new(Builtins::standard());
        assert!(matches!(
            session.enter("a = 2 m").outcome,
            Outcome::Added(0)
        ));
        let report = session.enter("a * 3 [cm]");
        match report.outcome {
            Outcome::Shown(Shown::Scalar(shown)) => {
                assert_eq!((shown.value, shown.unit.as_str()), (600.0, "cm"))
            }
            other => panic!("{other:?}"),
        }
        assert_eq!(session.lines().len(), 1);
    }

    #[test]
    fn redefinition_recomputes_dependents_in_order() {
        let mut session = Session::new(Builtins::standard());
        session.enter("a = 2 m");
        session.enter("b = a * 3");
        session.enter("c = b + a");
        session.enter("d = 1 s");
        let report = session.enter("a = 10 m");
        assert!(matches!(report.outcome, Outcome::Replaced { index: 0, .. }));
        assert_eq!(report.recomputed, vec![1, 2]);
        assert_eq!(value(&session, "b"), 30.0);
        assert_eq!(value(&session, "c"), 40.0);
        assert_eq!(session.lines().len(), 4);
    }

    #[test]
    fn a_cycle_is_refused_and_the_old_definition_kept() {
        let mut session = Session::new(Builtins::standard());
        session.enter("a = 2 m");
        session.enter("b = a * 3");
        let report = session.enter("a = b / 3");
        assert_eq!(report.outcome, Outcome::Refused);
        assert_eq!(
            report.diagnostics[0].message,
            "circular definition: `a` -> `b` -> `a`"
        );
        assert_eq!(
            session.definition("a").map(SessionLine::text),
            Some("a = 2 m")
        );
        let report = session.enter("e = e + 1");
        assert_eq!(report.outcome, Outcome::Refused);
        assert!(session.definition("e").is_none());
    }

    #[test]
    fn a_longer_cycle_is_named_in_dependency_order() {
        let mut session = Session::new(Builtins::standard());
        for entry in ["a = 1 m", "b = a * 2", "c = b + a", "d = c * 2"] {
            session.enter(entry);
        }
        let report = session.enter("a = d - b");
        assert_eq!(
            report.diagnostics[0].message,
            "circular definition: `a` -> `b` -> `a`"
        );
        let report = session.enter("a = d / 4");
        assert_eq!(
            report.diagnostics[0].message,
            "circular definition: `a` -> `d` -> `c` -> `a`"
        );
        assert_eq!(value(&session, "d"), 6.0);
    }

    #[test]
    fn failing_entries_change_nothing() {
        let mut session = Session::new(Builtins::standard());
        session.enter("a = 2 m");
        assert_eq!(session.enter("b = a + 1 s").outcome, Outcome::Refused);
        assert_eq!(session.enter("a = 1 s +").outcome, Outcome::Refused);
        assert_eq!(session.enter("a = 2 m + 1 s").outcome, Outcome::Refused);
        assert_eq!(session.enter("zz * 2").outcome, Outcome::Refused);
        assert_eq!(session.lines().len(), 1);
        assert_eq!(value(&session, "a"), 2.0);
        assert!(session.definition("b").is_none());
    }

    #[test]
    fn a_redefinition_that_breaks_a_dependent_is_kept_and_the_dependent_reports() {
        let mut session = Session::new(Builtins::standard());
        session.enter("a = 2 m");
        session.enter("b = a + 1 m");
        session.enter("c = b * 2");
        let report = session.enter("a = 2 s");
        assert!(matches!(report.outcome, Outcome::Replaced { .. }));
        assert_eq!(report.recomputed, vec![1, 2]);
        assert!(matches!(session.lines()[1].result(), LineResult::Error));
        assert!(matches!(
            session.lines()[2].result(),
            LineResult::Skipped { because_of } if because_of == "b"
        ));
        session.enter("a = 5 m");
        assert_eq!(value(&session, "c"), 12.0);
    }

    #[test]
    fn underscore_is_the_last_result() {
        let mut session = Session::new(Builtins::standard());
        assert_eq!(session.enter("_ * 2").outcome, Outcome::Refused);
        session.enter("a = 2 m");
        session.enter("b = _ * 3");
        assert_eq!(
            session.definition("b").map(SessionLine::text),
            Some("b = a * 3")
        );
        session.enter("4 ft [m]");
        session.enter("c = _");
        assert_eq!(value(&session, "c"), 1.2192);
        let last = session.last_result().and_then(Shown::as_scalar);
        assert_eq!(last.map(|shown| shown.value), Some(1.2192));
        assert_eq!(session.enter("_ = 3").outcome, Outcome::Refused);
    }

    #[test]
    fn loading_a_sheet_with_forward_references_and_new_definitions_later() {
        let mut session = Session::new(Builtins::standard());
        let report = session.load(
            "<sheet>",
            "b = a * 2\na = 3 m\nc = missing + 1 m\nd = (\n",
            &mut super::super::sources::NoIncludes,
        );
        assert_eq!(report.kept, vec![(1, 0), (2, 1), (3, 2)]);
        assert_eq!(report.rejected.len(), 1);
        assert_eq!(value(&session, "b"), 6.0);
        assert!(matches!(session.lines()[2].result(), LineResult::Error));
        assert!(!session.is_modified());
        let report = session.enter("missing = 1 m");
        assert_eq!(report.recomputed, vec![2]);
        assert_eq!(value(&session, "c"), 2.0);
        assert!(session.is_modified());
    }

    #[test]
    fn saved_text_is_the_kept_lines() {
        let mut session = Session::new(Builtins::standard());
        session.enter("## site");
        session.enter("a = 2 m # depth");
        session.enter("a [cm]");
        session.enter("check a > 1 m");
        session.enter("a = 3 m");
        assert_eq!(session.to_sheet(), "## site\na = 3 m\ncheck a > 1 m\n");
    }
}
