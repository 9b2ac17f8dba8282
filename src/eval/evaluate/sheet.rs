//! The sheet evaluator: definitions in dependency order, then shown expressions, checks and
//! plots, with every independent error collected.
//!
//! Just over 800 lines: ordering, evaluating each line and collecting errors are one pass
//! over one sheet, kept together.

use super::load::Loaded;
use super::*;
use crate::eval::diagnostic::Diagnostic;
use crate::eval::error::{EvalError, EvalErrorKind};
use crate::eval::function::Library;
use crate::eval::order::dependency_order;
use crate::eval::sources::{IncludeLoader, NoIncludes, SourceMap};
use crate::eval::value::Value;
use crate::syntax::{Definition, Expression, FunctionDefinition, Line, LineKind};
use rustc_hash::FxHashMap as HashMap;

/// Evaluates a sheet that has no file behind it (includes are refused).
pub fn evaluate_sheet(source: &str, library: &dyn Library) -> Evaluation {
    evaluate("<sheet>", source, library, &mut NoIncludes)
}

/// What a run may change about a sheet: the longest column, and `--set` overrides.
#[derive(Debug, Clone)]
pub struct Settings {
    pub max_rows: usize,
    /// The most rows all column-valued lines may hold together.
    pub max_total_rows: usize,
    /// `(name, value text)`: the value replaces the line `name` for this run.
    pub overrides: Vec<(String, String)>,
    /// The cell separator of every data file (`--data-delimiter`); `None` finds each file's.
    pub data_delimiter: Option<u8>,
    /// Threads the sheet may use to parse and to compute long columns: every core by default,
    /// one when `check` already runs a sheet on each core.
    pub threads: usize,
    /// `run --samples N`: sample the sheet's distributions.
    pub sampling: Option<crate::eval::uncertainty::Sampling>,
}

impl Default for Settings {
    fn default() -> Settings {
        Settings {
            max_rows: crate::eval::columns::DEFAULT_MAX_ROWS,
            max_total_rows: crate::eval::columns::DEFAULT_MAX_TOTAL_ROWS,
            overrides: Vec::new(),
            data_delimiter: None,
            threads: available_cores(),
            sampling: None,
        }
    }
}

/// The cores this process may use, asked once (the answer reads the cgroup limits).
pub fn available_cores() -> usize {
    static CORES: std::sync::OnceLock<usize> = std::sync::OnceLock::new();
    *CORES.get_or_init(|| std::thread::available_parallelism().map_or(1, usize::from))
}

/// The code of the diagnostic for a `--set` that names no line (a command-line error).
pub const UNKNOWN_OVERRIDE: &str = "unknown-override";

/// Evaluates a sheet, loading its includes and data files through `loader`.
pub fn evaluate(
    label: &str,
    source: &str,
    library: &dyn Library,
    loader: &mut dyn IncludeLoader,
) -> Evaluation {
    evaluate_with(label, source, library, loader, &Settings::default())
}

/// Evaluates a sheet with run settings; with `settings.sampling`, samples it
/// (`run --samples N`) and adds the summary.
pub fn evaluate_with(
    label: &str,
    source: &str,
    library: &dyn Library,
    loader: &mut dyn IncludeLoader,
    settings: &Settings,
) -> Evaluation {
    let mut prepared = prepare(label, source, loader, settings);
    let (mut evaluation, uncertain) = evaluate_prepared(&prepared, library, settings, None);
    // The evaluation holds the sources (warnings quote them); sampling borrows them back.
    std::mem::swap(&mut evaluation.sources, &mut prepared.sources);
    // Warnings only on a sheet without errors: an error can hide a use or a value.
    if !evaluation.has_errors() {
        let warnings = crate::eval::warnings::sheet_warnings(
            &prepared.lines[..prepared.main_lines],
            &evaluation,
            library,
        );
        evaluation.diagnostics.extend(warnings);
        evaluation
            .diagnostics
            .sort_by_key(|diagnostic| diagnostic.span.start);
    }
    match &settings.sampling {
        Some(sampling) if !evaluation.has_errors() => {
            std::mem::swap(&mut evaluation.sources, &mut prepared.sources);
            super::sampled::sample(
                &prepared,
                library,
                settings,
                sampling,
                uncertain,
                &mut evaluation,
            );
            std::mem::swap(&mut evaluation.sources, &mut prepared.sources);
        }
        None if !uncertain.is_empty() => {
            super::sampled::note_checks_at_medians(&prepared, &mut evaluation);
        }
        _ => {}
    }
    evaluation
}

/// A sheet with its includes and data files loaded and parsed, ready to be evaluated (once,
/// or once per block of samples).
pub(super) struct Prepared {
    pub(super) sources: SourceMap,
    pub(super) lines: Vec<Line>,
    /// Syntax and loading errors.
    pub(super) diagnostics: Vec<Diagnostic>,
    pub(super) includes: Vec<(usize, String)>,
    pub(super) main_lines: usize,
    pub(super) data_files:
        HashMap<usize, Result<std::sync::Arc<crate::eval::data::DataTable>, EvalError>>,
    pub(super) overrides: Vec<(String, Expression)>,
}

pub(super) fn prepare(
    label: &str,
    source: &str,
    loader: &mut dyn IncludeLoader,
    settings: &Settings,
) -> Prepared {
    let mut loaded = Loaded {
        max_rows: settings.max_rows,
        data_delimiter: settings.data_delimiter,
        threads: settings.threads,
        ..Loaded::default()
    };
    let main = loaded.sources.add(label, source);
    loaded.load(
        main,
        &mut vec![(loader.main_key(label), label.to_string())],
        loader,
    );
    let mut overrides = Vec::new();
    for (name, text) in &settings.overrides {
        let file = loaded.sources.add(&format!("--set {name}"), text);
        let base = loaded.sources.file(file).map_or(0, |file| file.base);
        match crate::syntax::parse_set_value(text, base) {
            Ok(expression) => overrides.push((name.clone(), expression)),
            Err(error) => loaded.errors.push(error),
        }
    }
    let Loaded {
        sources,
        lines,
        errors,
        diagnostics,
        includes,
        main_lines,
        data_files,
        ..
    } = loaded;
    let mut all_diagnostics: Vec<Diagnostic> = errors.iter().map(Diagnostic::from).collect();
    all_diagnostics.extend(diagnostics);
    Prepared {
        sources,
        lines,
        diagnostics: all_diagnostics,
        includes,
        main_lines,
        data_files,
        overrides,
    }
}

/// One evaluation of a prepared sheet, with the distributions it met; with `block`, its
/// distributions give that block's samples. The evaluation's `sources` are left empty for the
/// caller to fill.
pub(super) fn evaluate_prepared(
    prepared: &Prepared,
    library: &dyn Library,
    settings: &Settings,
    block: Option<std::sync::Arc<crate::eval::uncertainty::BlockScores>>,
) -> (Evaluation, Vec<crate::eval::uncertainty::UncertainInput>) {
    let mut evaluator = Evaluator::new(&prepared.sources, &prepared.lines, library);
    evaluator.calculator.max_rows = settings.max_rows;
    evaluator.calculator.threads = settings.threads;
    evaluator.calculator.row_budget = crate::eval::columns::RowBudget::new(settings.max_total_rows);
    evaluator.calculator.data_files = prepared.data_files.clone();
    evaluator.first_sample = block.as_ref().map(|block| block.first_sample);
    evaluator.calculator.sampling = block;
    evaluator
        .diagnostics
        .extend(prepared.diagnostics.iter().cloned());
    for (index, file) in &prepared.includes {
        evaluator.results[*index] = Some(LineResult::Include { file: file.clone() });
    }
    evaluator.overrides = &prepared.overrides;
    evaluator.run();
    let uncertain = std::mem::take(&mut evaluator.calculator.uncertain);
    (evaluator.finish(prepared.main_lines), uncertain)
}
/// The state of a definition during evaluation.
#[derive(Debug, Clone)]
pub(super) enum Slot {
    Pending,
    Ready(Shown),
    /// Failed or skipped.
    Failed,
}
/// A sheet's definitions and functions during one run.
pub(super) struct SheetScope<'s, 'a> {
    pub(super) lines: &'a [Line],
    pub(super) definitions: &'s HashMap<&'a str, usize>,
    pub(super) functions: &'s HashMap<&'a str, usize>,
    pub(super) refused_functions: &'s [usize],
    pub(super) slots: &'s [Slot],
    pub(super) results: &'s [Option<LineResult>],
}

impl Scope for SheetScope<'_, '_> {
    fn definition(&self, name: &str) -> Option<&Definition> {
        match &self.lines[*self.definitions.get(name)?].kind {
            LineKind::Definition(definition) => Some(definition),
            _ => None,
        }
    }

    fn lookup(&self, name: &str) -> Option<Option<&Shown>> {
        self.definitions
            .get(name)
            .map(|index| match &self.slots[*index] {
                Slot::Ready(shown) => Some(shown),
                Slot::Failed | Slot::Pending => None,
            })
    }

    fn for_each_defined(&self, visit: &mut dyn FnMut(&str)) {
        for name in self.definitions.keys().chain(self.functions.keys()) {
            visit(name);
        }
    }

    fn sheet_function(&self, name: &str) -> Option<Option<&FunctionDefinition>> {
        let index = *self.functions.get(name)?;
        let refused = self.refused_functions.contains(&index)
            || matches!(self.results[index], Some(LineResult::Error));
        match &self.lines[index].kind {
            LineKind::Function(definition) if !refused => Some(Some(definition)),
            _ => Some(None),
        }
    }
}
/// Builds the scope of a sheet from the evaluator's fields (a macro so that the calculator can
/// be borrowed mutably beside it).
macro_rules! sheet_scope {
    ($evaluator:expr) => {
        SheetScope {
            lines: $evaluator.lines,
            definitions: &$evaluator.definitions,
            functions: &$evaluator.functions,
            refused_functions: &$evaluator.refused_functions,
            slots: &$evaluator.slots,
            results: &$evaluator.results,
        }
    };
}

pub(super) struct Evaluator<'a> {
    pub(super) sources: &'a SourceMap,
    pub(super) lines: &'a [Line],
    /// Name -> index into `lines` of its (first) definition.
    pub(super) definitions: HashMap<&'a str, usize>,
    /// Function name -> index into `lines` of its definition.
    pub(super) functions: HashMap<&'a str, usize>,
    /// Functions refused (recursive): calls to them are skipped quietly.
    pub(super) refused_functions: Vec<usize>,
    pub(super) slots: Vec<Slot>,
    pub(super) results: Vec<Option<LineResult>>,
    pub(super) diagnostics: Vec<Diagnostic>,
    pub(super) calculator: Calculator<'a>,
    /// `--set` values, by the name of the line they replace.
    pub(super) overrides: &'a [(String, Expression)],
    /// Lines whose value came from `--set`, with the sheet's own expression text.
    pub(super) overridden: HashMap<usize, String>,
    /// With `run --samples`: the 0-based number of this block's first sample, so that an
    /// error in a row names its sample.
    pub(super) first_sample: Option<usize>,
}

impl<'a> Evaluator<'a> {
    pub(super) fn new(
        sources: &'a SourceMap,
        lines: &'a [Line],
        library: &'a dyn Library,
    ) -> Evaluator<'a> {
        Evaluator {
            sources,
            lines,
            definitions: HashMap::default(),
            functions: HashMap::default(),
            refused_functions: Vec::new(),
            slots: vec![Slot::Pending; lines.len()],
            results: vec![None; lines.len()],
            diagnostics: Vec::new(),
            calculator: Calculator::new(library),
            overrides: &[],
            overridden: HashMap::default(),
            first_sample: None,
        }
    }

    pub(super) fn run(&mut self) {
        self.collect_definitions();
        self.check_overrides();
        self.refuse_recursive_functions();
        let definition_lines: Vec<usize> = self.definitions.values().copied().collect::<Vec<_>>();
        let mut definition_lines = definition_lines;
        definition_lines.sort_unstable();
        let node_of: HashMap<usize, usize> = definition_lines
            .iter()
            .enumerate()
            .map(|(node, line)| (*line, node))
            .collect();
        let dependencies: Vec<Vec<usize>> = definition_lines
            .iter()
            .map(|line_index| {
                let mut needs = Vec::new();
                if let LineKind::Definition(definition) = &self.lines[*line_index].kind {
                    // A `--set` value's names are needed too; its own name is the sheet's value
                    // (`--set k=k*2`), and a cycle through another line is reported as one.
                    let replacement_needs = self
                        .replacement_for(&definition.name.text)
                        .map(|replacement| self.globals_used(replacement))
                        .unwrap_or_default()
                        .into_iter()
                        .filter(|line| line != line_index);
                    let used = self.globals_used(&definition.expression);
                    for line in used.into_iter().chain(replacement_needs) {
                        let node = node_of[&line];
                        if !needs.contains(&node) {
                            needs.push(node);
                        }
                    }
                }
                needs
            })
            .collect();
        let order = dependency_order(&dependencies);
        for cycle in &order.cycles {
            self.report_cycle(cycle.iter().map(|node| definition_lines[*node]).collect());
        }
        for node in &order.sequence {
            self.evaluate_definition(definition_lines[*node]);
        }
        for node in &order.blocked {
            let line_index = definition_lines[*node];
            if self.results[line_index].is_none() {
                let cause = self.first_failed_dependency(line_index).unwrap_or_default();
                self.slots[line_index] = Slot::Failed;
                self.results[line_index] = Some(LineResult::Skipped { because_of: cause });
            }
        }
        for index in 0..self.lines.len() {
            if self.results[index].is_none() {
                self.evaluate_other(index);
            }
        }
    }

    /// Records each name's line (values and functions share one namespace); a second
    /// definition is an error naming both.
    pub(super) fn collect_definitions(&mut self) {
        for (index, line) in self.lines.iter().enumerate() {
            let (name, is_function) = match &line.kind {
                LineKind::Definition(definition) => (&definition.name, false),
                LineKind::Function(function) => (&function.name, true),
                _ => continue,
            };
            let earlier = self
                .definitions
                .get(name.text.as_str())
                .or_else(|| self.functions.get(name.text.as_str()));
            match earlier {
                Some(first) => {
                    let first_line = &self.lines[*first];
                    let first_span = match &first_line.kind {
                        LineKind::Definition(first_definition) => first_definition.name.span,
                        LineKind::Function(first_function) => first_function.name.span,
                        _ => first_line.span,
                    };
                    let definition = name;
                    let error = EvalError::new(
                        EvalErrorKind::DuplicateDefinition {
                            name: definition.text.clone(),
                            first_line: first_line.number,
                            first_span,
                        },
                        definition.span,
                    );
                    self.diagnostics.push(error.to_diagnostic());
                    self.results[index] = Some(LineResult::Error);
                }
                None if is_function => {
                    self.functions.insert(name.text.as_str(), index);
                }
                None => {
                    self.definitions.insert(name.text.as_str(), index);
                }
            }
        }
    }

    /// A `--set` must name a value line of the sheet (a command-line error otherwise).
    pub(super) fn check_overrides(&mut self) {
        for (name, expression) in self.overrides {
            if self.definitions.contains_key(name.as_str()) {
                continue;
            }
            let mut names: Vec<&str> = self.definitions.keys().copied().collect();
            names.sort_unstable();
            let suggestion = crate::suggest::closest(name, names.iter().copied(), 0.8);
            let message = format!("`--set {name}=…`: the sheet has no line named `{name}`");
            let mut diagnostic = Diagnostic::error(message, expression.span)
                .with_help(suggestion.map(|close| format!("did you mean `{close}`?")));
            diagnostic.code = Some(UNKNOWN_OVERRIDE);
            self.diagnostics.push(diagnostic);
        }
    }

    /// A function that calls itself, directly or through others, is refused at its definition.
    pub(super) fn refuse_recursive_functions(&mut self) {
        let mut function_lines: Vec<usize> = self.functions.values().copied().collect();
        function_lines.sort_unstable();
        let node_of: HashMap<usize, usize> = function_lines
            .iter()
            .enumerate()
            .map(|(node, line)| (*line, node))
            .collect();
        let calls: Vec<Vec<usize>> = function_lines
            .iter()
            .map(|line| {
                let mut called = Vec::new();
                if let LineKind::Function(function) = &self.lines[*line].kind {
                    function.body.for_each_call(&mut |name, _| {
                        if let Some(callee) = self.functions.get(name) {
                            if !called.contains(&node_of[callee]) {
                                called.push(node_of[callee]);
                            }
                        }
                    });
                }
                called
            })
            .collect();
        let order = dependency_order(&calls);
        for cycle in &order.cycles {
            let names: Vec<String> = cycle
                .iter()
                .chain(cycle.first())
                .filter_map(|node| match &self.lines[function_lines[*node]].kind {
                    LineKind::Function(function) => Some(function.name.text.clone()),
                    _ => None,
                })
                .collect();
            for node in cycle {
                let line = function_lines[*node];
                if let LineKind::Function(function) = &self.lines[line].kind {
                    let kind = EvalErrorKind::RecursiveFunction {
                        path: names.clone(),
                    };
                    self.diagnostics
                        .push(EvalError::new(kind, function.name.span).to_diagnostic());
                }
                self.results[line] = Some(LineResult::Error);
            }
        }
        self.refused_functions = order
            .blocked
            .iter()
            .map(|node| function_lines[*node])
            .collect();
    }

    /// The definitions an expression needs: the names it uses, and those used by the bodies
    /// of the sheet functions it calls (and of the functions they call).
    pub(super) fn globals_used(&self, expression: &'a Expression) -> Vec<usize> {
        let mut needed = Vec::new();
        let mut visited_functions = Vec::new();
        let mut pending: Vec<(&'a Expression, Option<&'a FunctionDefinition>)> =
            vec![(expression, None)];
        while let Some((current, inside)) = pending.pop() {
            current.for_each_name(&mut |name, _| {
                let is_parameter = inside.is_some_and(|function| {
                    function
                        .parameters
                        .iter()
                        .any(|parameter| parameter.name.text == name)
                });
                if let (false, Some(line)) = (is_parameter, self.definitions.get(name)) {
                    if !needed.contains(line) {
                        needed.push(*line);
                    }
                }
            });
            current.for_each_call(&mut |name, _| {
                if let Some(line) = self.functions.get(name) {
                    if !visited_functions.contains(line) {
                        visited_functions.push(*line);
                        if let LineKind::Function(function) = &self.lines[*line].kind {
                            pending.push((&function.body, Some(function)));
                        }
                    }
                }
            });
        }
        needed
    }

    pub(super) fn report_cycle(&mut self, members: Vec<usize>) {
        let names: Vec<String> = members
            .iter()
            .chain(members.first())
            .filter_map(|index| match &self.lines[*index].kind {
                LineKind::Definition(definition) => Some(definition.name.text.clone()),
                _ => None,
            })
            .collect();
        let Some(first) = members.iter().min().copied() else {
            return;
        };
        if let LineKind::Definition(definition) = &self.lines[first].kind {
            let mut diagnostic = EvalError::new(
                EvalErrorKind::Cycle {
                    path: names.clone(),
                },
                definition.name.span,
            )
            .to_diagnostic();
            for member in members.iter().filter(|member| **member != first) {
                if let LineKind::Definition(other) = &self.lines[*member].kind {
                    diagnostic = diagnostic.with_label(other.name.span, "part of the cycle");
                }
            }
            let overridden = names
                .iter()
                .find(|name| self.replacement_for(name).is_some());
            if let Some(name) = overridden {
                diagnostic = diagnostic.with_help(Some(format!(
                    "the cycle goes through the value given by `--set {name}=…`"
                )));
            }
            self.diagnostics.push(diagnostic);
        }
        for member in members {
            self.slots[member] = Slot::Failed;
            self.results[member] = Some(LineResult::Error);
        }
    }

    pub(super) fn first_failed_dependency(&self, line_index: usize) -> Option<String> {
        let LineKind::Definition(definition) = &self.lines[line_index].kind else {
            return None;
        };
        let mut cause = None;
        definition.expression.for_each_name(&mut |name, _| {
            if cause.is_none() {
                if let Some(line) = self.definitions.get(name) {
                    if matches!(self.slots[*line], Slot::Failed) || self.results[*line].is_none() {
                        cause = Some(name.to_string());
                    }
                }
            }
        });
        cause
    }

    /// The `--set` value that replaces line `name`, if any.
    pub(super) fn replacement_for(&self, name: &str) -> Option<&'a Expression> {
        let overrides: &'a [(String, Expression)] = self.overrides;
        overrides
            .iter()
            .find(|(overridden, _)| overridden == name)
            .map(|(_, expression)| expression)
    }

    pub(super) fn evaluate_definition(&mut self, index: usize) {
        let LineKind::Definition(definition) = &self.lines[index].kind else {
            return;
        };
        let replacement = self.replacement_for(&definition.name.text);
        let scope = sheet_scope!(self);
        let calculator = &mut self.calculator;
        let outcome = match &replacement {
            None => calculator.line_value(
                &definition.expression,
                definition.display_unit.as_ref(),
                &scope,
            ),
            Some(replacement) => {
                // The value given on the command line must have the dimension of the one
                // it replaces; inside it, the line's own name is the sheet's value.
                let sheet_value = calculator.line_value(
                    &definition.expression,
                    definition.display_unit.as_ref(),
                    &scope,
                );
                let original = sheet_value.as_ref().ok().map(Shown::value);
                let own_value: HashMap<String, Shown> = sheet_value
                    .iter()
                    .map(|shown| (definition.name.text.clone(), shown.clone()))
                    .collect();
                let scope = crate::eval::solve::Overlay {
                    base: &scope,
                    values: &own_value,
                };
                let given = calculator.expression(replacement, &scope);
                match (original, given) {
                    (Some(original), Ok(given)) if original.dimension() != given.dimension() => {
                        let describe = |value: &Value| match value.dimension() {
                            Some(dimension) => dimension.phrase(),
                            None => "text".to_string(),
                        };
                        let message = format!(
                            "`--set {}`: the sheet's line is {}, the value given is {}",
                            definition.name.text,
                            describe(&original),
                            describe(&given)
                        );
                        Err(
                            EvalError::new(EvalErrorKind::Override { message }, replacement.span)
                                .with_label(definition.expression.span, "the sheet's value")
                                .into(),
                        )
                    }
                    (_, Err(failure)) => Err(failure),
                    (_, Ok(given)) => calculator
                        .shown(given, definition.display_unit.as_ref(), replacement, &scope)
                        .map_err(Failure::from),
                }
            }
        };
        if replacement.is_some() {
            let text = text_of(self.sources, definition.expression.span);
            self.overridden.insert(index, text);
        }
        let outcome = outcome.map(|shown| with_origin(shown, &definition.name.text));
        self.settle(index, outcome);
    }

    pub(super) fn evaluate_other(&mut self, index: usize) {
        let line = &self.lines[index];
        let result = match &line.kind {
            // A title-block field has no value: the evaluation lists it in `fields`.
            LineKind::Blank | LineKind::Field(_) => LineResult::Blank,
            LineKind::Comment => LineResult::Comment,
            LineKind::Heading(text) => LineResult::Heading(text.clone()),
            LineKind::Invalid | LineKind::Definition(_) | LineKind::Include(_) => LineResult::Error,
            LineKind::Function(function) => match self.calculator.check_function_units(function) {
                Ok(signature) => LineResult::Function { signature },
                Err(error) => {
                    self.diagnostics.push(error.to_diagnostic());
                    LineResult::Error
                }
            },
            LineKind::Display(display) => {
                let scope = sheet_scope!(self);
                let calculator = &mut self.calculator;
                let outcome = calculator.line_value(
                    &display.expression,
                    display.display_unit.as_ref(),
                    &scope,
                );
                return self.settle(index, outcome);
            }
            LineKind::Check(check) => match self.calculator.check(check, &sheet_scope!(self)) {
                Ok(outcome) => LineResult::Check(Box::new(outcome)),
                Err(failure) => self.failure_result(failure),
            },
            LineKind::Plot(plot) => match self.calculator.plot(plot, &sheet_scope!(self)) {
                Ok(outcome) => LineResult::Plot(Box::new(outcome)),
                Err(failure) => self.failure_result(failure),
            },
        };
        self.results[index] = Some(result);
    }

    pub(super) fn settle(&mut self, index: usize, outcome: Result<Shown, Failure>) {
        let span = self.lines[index].span;
        let outcome = outcome.and_then(|shown| {
            self.calculator.row_budget.keep(&shown.value(), span)?;
            Ok(shown)
        });
        match outcome {
            Ok(shown) => {
                self.slots[index] = Slot::Ready(shown.clone());
                self.results[index] = Some(LineResult::Value(shown));
            }
            Err(failure) => {
                self.slots[index] = Slot::Failed;
                let result = self.failure_result(failure);
                self.results[index] = Some(result);
            }
        }
    }

    pub(super) fn failure_result(&mut self, failure: Failure) -> LineResult {
        match failure {
            Failure::Error(error) => {
                let error = match self.first_sample {
                    Some(first_sample) => error.in_samples(first_sample),
                    None => error,
                };
                self.diagnostics.push(error.to_diagnostic());
                LineResult::Error
            }
            Failure::Upstream(name) => LineResult::Skipped { because_of: name },
        }
    }

    pub(super) fn finish(self, main_lines: usize) -> Evaluation {
        let sources = self.sources;
        let notes = &self.calculator.notes;
        let overrides = &self.overrides;
        let overridden = &self.overridden;
        let lines = self
            .lines
            .iter()
            .zip(self.results)
            .take(main_lines)
            .enumerate()
            .map(|(index, (line, result))| {
                // The expression evaluated (a `--set` value in place of the sheet's), whose
                // text the outcome keeps and whose span the working re-parses it at.
                let evaluated: Option<&Expression> = match &line.kind {
                    LineKind::Definition(definition) => Some(
                        overrides
                            .iter()
                            .filter(|_| overridden.contains_key(&index))
                            .find(|(name, _)| *name == definition.name.text)
                            .map_or(&definition.expression, |(_, expression)| expression),
                    ),
                    LineKind::Display(display) => Some(&display.expression),
                    _ => None,
                };
                let (name, expression) = match &line.kind {
                    LineKind::Definition(definition) => (
                        Some(definition.name.text.clone()),
                        evaluated.map_or(String::new(), |expression| {
                            text_of(sources, expression.span)
                        }),
                    ),
                    LineKind::Display(display) => (None, text_of(sources, display.expression.span)),
                    LineKind::Function(function) => (
                        Some(function.name.text.clone()),
                        text_of(sources, function.body.span),
                    ),
                    LineKind::Check(_)
                    | LineKind::Invalid
                    | LineKind::Include(_)
                    | LineKind::Plot(_) => (None, text_of(sources, line.span).trim().to_string()),
                    _ => (None, String::new()),
                };
                LineOutcome {
                    number: line.number,
                    name,
                    expression,
                    expression_span: evaluated.map(|expression| expression.span),
                    comment: line.comment.clone(),
                    result: result.unwrap_or(LineResult::Error),
                    note: match &line.kind {
                        _ if overridden.contains_key(&index) => Some(format!(
                            "set on the command line; the sheet has `{}`",
                            overridden[&index]
                        )),
                        LineKind::Definition(definition) => {
                            notes.get(&definition.expression.span.start).cloned()
                        }
                        _ => None,
                    },
                }
            })
            .collect();
        let mut diagnostics = self.diagnostics;
        diagnostics.sort_by_key(|diagnostic| diagnostic.span.start);
        let fields = self.lines[..main_lines]
            .iter()
            .filter_map(|line| match &line.kind {
                LineKind::Field(field) => Some(field.clone()),
                _ => None,
            })
            .collect();
        // The values of included sheets, for showing the working of lines that use them.
        let included_values = self.lines[main_lines..]
            .iter()
            .zip(&self.slots[main_lines..])
            .filter_map(|(line, slot)| match (&line.kind, slot) {
                (LineKind::Definition(definition), Slot::Ready(shown)) => {
                    Some((definition.name.text.clone(), shown.clone()))
                }
                _ => None,
            })
            .collect();
        Evaluation {
            lines,
            sources: SourceMap::default(),
            diagnostics,
            provenance: self.calculator.provenance,
            calls: self.calculator.calls,
            fields,
            included_values,
            samples: None,
        }
    }
}
