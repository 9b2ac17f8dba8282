//! Evaluation of a sheet: definitions in dependency order, then shown expressions and checks.
//!
//! Every independent error is collected; a line whose inputs failed is skipped quietly (its
//! cause is already reported), and every other line still evaluates. Nothing here panics on
//! user input or prints: the result is a value the front ends render.

use super::data::DataTable;
use super::diagnostic::Diagnostic;
use super::error::{EvalError, EvalErrorKind, Operation};
use super::function::{CallError, Library, Provenance};
use super::order::dependency_order;
use super::sources::{IncludeLoader, NoIncludes, SourceMap};
use super::value::{Column, Labels, OffsetScale, Quantity, TemperatureKind, Value};
use crate::syntax::{
    parse_sheet_at, BinaryOperator, Check, Comparison, Definition, Expression, ExpressionKind,
    FunctionDefinition, Line, LineKind, Span, UnitExpression, UnitExpressionKind,
};
use crate::units::{Dimension, Exponent, TemperatureRole, Unit, UnitError};
use rustc_hash::FxHashMap as HashMap;
use std::sync::Arc;

/// Relative rounding allowance of every check written without `within`: sides closer than this
/// count as equal (so `<=` passes and `<` fails at the boundary).
pub const ROUNDING_ALLOWANCE: f64 = 1e-9;

/// Everything a run of a sheet produced.
#[derive(Debug, Clone)]
pub struct Evaluation {
    /// The main sheet's lines (lines of included sheets are evaluated but not listed).
    pub lines: Vec<LineOutcome>,
    /// The main sheet and every sheet it included; diagnostics' spans point into these.
    pub sources: SourceMap,
    pub diagnostics: Vec<Diagnostic>,
    pub provenance: Provenance,
    /// Every built-in call that got its arguments evaluated, in evaluation order (for checks
    /// on the values passed, such as the plausibility warnings).
    pub calls: Vec<CallRecord>,
}

/// A built-in call and the values of its arguments.
#[derive(Debug, Clone)]
pub struct CallRecord {
    pub function: String,
    /// The whole call.
    pub span: Span,
    /// Each argument's span and value.
    pub arguments: Vec<(Span, Value)>,
}

impl Evaluation {
    pub fn has_errors(&self) -> bool {
        self.diagnostics
            .iter()
            .any(|diagnostic| diagnostic.severity == super::Severity::Error)
    }

    pub fn failed_checks(&self) -> usize {
        self.lines
            .iter()
            .filter(|line| matches!(&line.result, LineResult::Check(check) if !check.passed))
            .count()
    }
}

/// One source line and what became of it.
#[derive(Debug, Clone)]
pub struct LineOutcome {
    pub number: usize,
    pub name: Option<String>,
    /// The expression's source text (empty for headings and comments).
    pub expression: String,
    pub comment: Option<String>,
    pub result: LineResult,
    /// How the value was found, where that is worth saying (a solve's iterations).
    pub note: Option<String>,
}

#[derive(Debug, Clone)]
pub enum LineResult {
    Blank,
    Comment,
    Heading(String),
    Value(Shown),
    /// Boxed: a check outcome is the largest result and the rarest.
    Check(Box<CheckOutcome>),
    /// The line has an error of its own (reported in the diagnostics).
    Error,
    /// Not evaluated because a line it needs has an error; names that line.
    Skipped {
        because_of: String,
    },
    /// A function definition, with its parameters as written.
    Function {
        signature: String,
    },
    /// An include line and the sheet it brought in.
    Include {
        file: String,
    },
    /// A plot line's data, ready to draw.
    Plot(Box<PlotOutcome>),
}

/// The data of a `plot` line: columns in display units, with axis labels that carry them.
#[derive(Debug, Clone, PartialEq)]
pub struct PlotOutcome {
    pub title: Option<String>,
    /// `T_site [degC]`
    pub x_label: String,
    /// `K_site [m/s]`, or the unit alone under several series: `[m/s]`
    pub y_label: String,
    pub x: Vec<f64>,
    /// Each series' name and values, all in the first series' unit.
    pub series: Vec<(String, Vec<f64>)>,
    pub log_x: bool,
    pub log_y: bool,
}

/// A line's value with the unit it is shown in.
#[derive(Debug, Clone, PartialEq)]
pub enum Shown {
    Scalar(ShownValue),
    /// Boxed: a column's unit conversion is large, and most lines are scalars.
    Column(Box<ShownColumn>),
    /// A column of text (sample names) from a data file.
    Labels(Labels),
}

/// A column with the unit it is shown in. The numbers are converted when read, so showing a
/// column of a million rows costs no second copy.
#[derive(Debug, Clone, PartialEq)]
pub struct ShownColumn {
    pub column: Column,
    /// Display unit as written, or the preferred SI unit.
    pub unit: String,
    /// The unit's conversion; `None` for SI.
    conversion: Option<Unit>,
}

impl ShownColumn {
    pub fn len(&self) -> usize {
        self.column.len()
    }

    pub fn is_empty(&self) -> bool {
        self.column.is_empty()
    }

    /// Row `row` (0-based) in the display unit.
    pub fn shown(&self, row: usize) -> f64 {
        let value = self.column.values[row];
        match &self.conversion {
            Some(unit) => unit.from_si(value),
            None => value,
        }
    }

    /// Every row in the display unit.
    pub fn shown_values(&self) -> impl Iterator<Item = f64> + '_ {
        (0..self.len()).map(|row| self.shown(row))
    }

    /// Row `row` as a scalar shown value.
    pub fn row(&self, row: usize) -> ShownValue {
        ShownValue {
            quantity: self.column.quantity(row),
            unit: self.unit.clone(),
            value: self.shown(row),
        }
    }
}

impl Shown {
    /// The value in SI.
    pub fn value(&self) -> Value {
        match self {
            Shown::Scalar(shown) => Value::Scalar(shown.quantity),
            Shown::Column(shown) => Value::Column(shown.column.clone()),
            Shown::Labels(labels) => Value::Labels(labels.clone()),
        }
    }

    pub fn as_scalar(&self) -> Option<&ShownValue> {
        match self {
            Shown::Scalar(shown) => Some(shown),
            _ => None,
        }
    }

    /// The unit it is shown in (empty for text).
    pub fn unit(&self) -> &str {
        match self {
            Shown::Scalar(shown) => &shown.unit,
            Shown::Column(shown) => &shown.unit,
            Shown::Labels(_) => "",
        }
    }

    /// The number of rows: `None` for a scalar.
    pub fn rows(&self) -> Option<usize> {
        match self {
            Shown::Scalar(_) => None,
            Shown::Column(shown) => Some(shown.len()),
            Shown::Labels(labels) => Some(labels.texts.len()),
        }
    }
}

/// A single value with the unit it is shown in.
#[derive(Debug, Clone, PartialEq)]
pub struct ShownValue {
    pub quantity: Quantity,
    /// Display unit as written (`ft/d`), or the preferred SI unit.
    pub unit: String,
    /// The value in that unit.
    pub value: f64,
}

#[derive(Debug, Clone, PartialEq)]
pub struct CheckOutcome {
    pub passed: bool,
    pub comparison: Comparison,
    pub left: ShownValue,
    pub right: ShownValue,
    /// The tolerance as written (`1 %`), when given.
    pub tolerance: Option<String>,
    pub message: Option<String>,
    /// For a check over columns: how many rows, how many failed, and which row `left` and
    /// `right` show (the first that failed, or the closest to failing).
    pub rows: Option<CheckRows>,
}

#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CheckRows {
    pub total: usize,
    pub failed: usize,
    /// 1-based.
    pub shown_row: usize,
}

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
}

impl Default for Settings {
    fn default() -> Settings {
        Settings {
            max_rows: super::columns::DEFAULT_MAX_ROWS,
            max_total_rows: super::columns::DEFAULT_MAX_TOTAL_ROWS,
            overrides: Vec::new(),
        }
    }
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

/// Evaluates a sheet with run settings.
pub fn evaluate_with(
    label: &str,
    source: &str,
    library: &dyn Library,
    loader: &mut dyn IncludeLoader,
    settings: &Settings,
) -> Evaluation {
    let mut loaded = Loaded {
        max_rows: settings.max_rows,
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
    let mut evaluator = Evaluator::new(&sources, &lines, library);
    evaluator.calculator.max_rows = settings.max_rows;
    evaluator.calculator.row_budget = super::columns::RowBudget::new(settings.max_total_rows);
    evaluator.calculator.data_files = data_files;
    evaluator
        .diagnostics
        .extend(errors.iter().map(Diagnostic::from));
    evaluator.diagnostics.extend(diagnostics);
    for (index, file) in includes {
        evaluator.results[index] = Some(LineResult::Include { file });
    }
    evaluator.overrides = overrides;
    evaluator.run();
    let mut evaluation = evaluator.finish(main_lines);
    evaluation.sources = sources;
    // Warnings only on a sheet without errors: an error can hide a use or a value.
    if !evaluation.has_errors() {
        let warnings = super::warnings::sheet_warnings(&lines[..main_lines], &evaluation, library);
        evaluation.diagnostics.extend(warnings);
        evaluation
            .diagnostics
            .sort_by_key(|diagnostic| diagnostic.span.start);
    }
    evaluation
}

/// The lines of a sheet and of everything it includes, before evaluation.
#[derive(Default)]
struct Loaded {
    sources: SourceMap,
    lines: Vec<Line>,
    errors: Vec<crate::syntax::SyntaxError>,
    diagnostics: Vec<Diagnostic>,
    /// Include lines that loaded, with the label of the sheet they brought in.
    includes: Vec<(usize, String)>,
    /// How many of `lines` belong to the main sheet (they come first).
    main_lines: usize,
    /// Data files read by `column … from` lines, by the start of each line's expression.
    data_files: HashMap<usize, Result<Arc<DataTable>, EvalError>>,
    /// Each data file read so far, by its loader key, so a file is parsed once.
    tables: HashMap<String, Result<Arc<DataTable>, String>>,
    max_rows: usize,
}

impl Loaded {
    /// Reads the data files named by the lines from `first` on, of the sheet `label`.
    fn load_data_files(&mut self, first: usize, label: &str, loader: &mut dyn IncludeLoader) {
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
                        super::data::read_table(path, &file.text, self.max_rows).map(Arc::new)
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
    fn load(
        &mut self,
        index: usize,
        chain: &mut Vec<(String, String)>,
        loader: &mut dyn IncludeLoader,
    ) {
        let Some(file) = self.sources.file(index) else {
            return;
        };
        let (label, parsed) = (file.label.clone(), parse_sheet_at(&file.text, file.base));
        let first = self.lines.len();
        self.lines.extend(parsed.sheet.lines);
        self.errors.extend(parsed.errors);
        if index == 0 {
            self.main_lines = self.lines.len();
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
                Ok(sheet) => {
                    self.includes.push((line, sheet.label.clone()));
                    // A sheet reached twice (two includes of one constants file) loads once.
                    if self
                        .sources
                        .files()
                        .iter()
                        .any(|known| known.label == sheet.label)
                    {
                        continue;
                    }
                    let included = self.sources.add(&sheet.label, &sheet.text);
                    chain.push((sheet.key, sheet.label));
                    self.load(included, chain, loader);
                    chain.pop();
                }
            }
        }
    }
}

/// The state of a definition during evaluation.
#[derive(Debug, Clone)]
enum Slot {
    Pending,
    Ready(Shown),
    /// Failed or skipped.
    Failed,
}

/// Why an expression produced no value.
pub(crate) enum Failure {
    Error(EvalError),
    /// A line it needs failed; that line's name.
    Upstream(String),
}

impl From<EvalError> for Failure {
    fn from(error: EvalError) -> Failure {
        Failure::Error(error)
    }
}

/// The names an expression can refer to besides built-ins: a sheet's definitions and
/// functions, or a session's lines.
pub(crate) trait Scope {
    /// `None` if no line defines `name`; `Some(None)` if one does but it has no value (it failed
    /// or is not evaluated yet).
    fn lookup(&self, name: &str) -> Option<Option<&Shown>>;
    /// The definition of a named line, for a solve that re-evaluates it.
    fn definition(&self, name: &str) -> Option<&Definition>;
    /// Every defined name, for "did you mean".
    fn for_each_defined(&self, visit: &mut dyn FnMut(&str));
    /// A function defined by the sheet: `Some(None)` if it exists but was refused.
    fn sheet_function(&self, _name: &str) -> Option<Option<&FunctionDefinition>> {
        None
    }
}

/// A sheet's definitions and functions during one run.
struct SheetScope<'s, 'a> {
    lines: &'a [Line],
    definitions: &'s HashMap<&'a str, usize>,
    functions: &'s HashMap<&'a str, usize>,
    refused_functions: &'s [usize],
    slots: &'s [Slot],
    results: &'s [Option<LineResult>],
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

/// Evaluates expressions, calls sheet functions, shows values in units and decides checks
/// against a `Scope`. It keeps the provenance of the calls it made, a record of built-in calls
/// and a cache of resolved units, so it is reused across the lines of a sheet or the entries of
/// a session.
pub(crate) struct Calculator<'l> {
    library: &'l dyn Library,
    pub(crate) provenance: Provenance,
    pub(crate) calls: Vec<CallRecord>,
    unit_cache: HashMap<String, Unit>,
    /// Parameter values of the sheet functions being called, innermost last.
    parameters: Vec<Vec<(String, Value)>>,
    /// The longest column allowed.
    pub(crate) max_rows: usize,
    /// The rows the sheet's column-valued lines hold together, against `--max-total-rows`.
    pub(crate) row_budget: super::columns::RowBudget,
    /// The data files the sheet reads, by the span of the path in each `column … from` line.
    pub(crate) data_files: HashMap<usize, Result<Arc<DataTable>, EvalError>>,
    /// Notes on how values were found (a solve's iterations), by expression span start.
    pub(crate) notes: HashMap<usize, String>,
    /// Data files handed to a session, by the path as written.
    pub(crate) data_by_path: HashMap<String, Result<Arc<DataTable>, String>>,
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

struct Evaluator<'a> {
    sources: &'a SourceMap,
    lines: &'a [Line],
    /// Name -> index into `lines` of its (first) definition.
    definitions: HashMap<&'a str, usize>,
    /// Function name -> index into `lines` of its definition.
    functions: HashMap<&'a str, usize>,
    /// Functions refused (recursive): calls to them are skipped quietly.
    refused_functions: Vec<usize>,
    slots: Vec<Slot>,
    results: Vec<Option<LineResult>>,
    diagnostics: Vec<Diagnostic>,
    calculator: Calculator<'a>,
    /// `--set` values, by the name of the line they replace.
    overrides: Vec<(String, Expression)>,
    /// Lines whose value came from `--set`, with the sheet's own expression text.
    overridden: HashMap<usize, String>,
}

impl<'a> Evaluator<'a> {
    fn new(sources: &'a SourceMap, lines: &'a [Line], library: &'a dyn Library) -> Evaluator<'a> {
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
            overrides: Vec::new(),
            overridden: HashMap::default(),
        }
    }

    fn run(&mut self) {
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
                    for line in self.globals_used(&definition.expression) {
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
    fn collect_definitions(&mut self) {
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
    fn check_overrides(&mut self) {
        for (name, expression) in &self.overrides {
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
    fn refuse_recursive_functions(&mut self) {
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
    fn globals_used(&self, expression: &'a Expression) -> Vec<usize> {
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

    fn report_cycle(&mut self, members: Vec<usize>) {
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
            self.diagnostics.push(diagnostic);
        }
        for member in members {
            self.slots[member] = Slot::Failed;
            self.results[member] = Some(LineResult::Error);
        }
    }

    fn first_failed_dependency(&self, line_index: usize) -> Option<String> {
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

    fn evaluate_definition(&mut self, index: usize) {
        let LineKind::Definition(definition) = &self.lines[index].kind else {
            return;
        };
        let replacement = self
            .overrides
            .iter()
            .find(|(name, _)| *name == definition.name.text)
            .map(|(_, expression)| expression.clone());
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
                // it replaces.
                let original = calculator.expression(&definition.expression, &scope);
                let given = calculator.expression(replacement, &scope);
                match (original, given) {
                    (Ok(original), Ok(given)) if original.dimension() != given.dimension() => {
                        let describe = |value: &Value| match value.dimension() {
                            Some(dimension) => super::function::describe_dimension(&dimension),
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

    fn evaluate_other(&mut self, index: usize) {
        let line = &self.lines[index];
        let result = match &line.kind {
            LineKind::Blank => LineResult::Blank,
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

    fn settle(&mut self, index: usize, outcome: Result<Shown, Failure>) {
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

    fn failure_result(&mut self, failure: Failure) -> LineResult {
        match failure {
            Failure::Error(error) => {
                self.diagnostics.push(error.to_diagnostic());
                LineResult::Error
            }
            Failure::Upstream(name) => LineResult::Skipped { because_of: name },
        }
    }

    fn finish(self, main_lines: usize) -> Evaluation {
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
                let (name, expression) = match &line.kind {
                    LineKind::Definition(definition) if overridden.contains_key(&index) => {
                        let given = overrides
                            .iter()
                            .find(|(name, _)| *name == definition.name.text)
                            .map_or(String::new(), |(_, expression)| {
                                text_of(sources, expression.span)
                            });
                        (Some(definition.name.text.clone()), given)
                    }
                    LineKind::Definition(definition) => (
                        Some(definition.name.text.clone()),
                        text_of(sources, definition.expression.span),
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
        Evaluation {
            lines,
            sources: SourceMap::default(),
            diagnostics,
            provenance: self.calculator.provenance,
            calls: self.calculator.calls,
        }
    }
}

impl<'l> Calculator<'l> {
    pub(crate) fn new(library: &'l dyn Library) -> Calculator<'l> {
        Calculator {
            library,
            provenance: Provenance::default(),
            calls: Vec::new(),
            unit_cache: HashMap::default(),
            parameters: Vec::new(),
            max_rows: super::columns::DEFAULT_MAX_ROWS,
            row_budget: super::columns::RowBudget::new(super::columns::DEFAULT_MAX_TOTAL_ROWS),
            data_files: HashMap::default(),
            notes: HashMap::default(),
            data_by_path: HashMap::default(),
        }
    }

    /// The value of an expression; names resolve through the parameters of the function being
    /// called, then `scope`, then the library.
    pub(crate) fn expression(
        &mut self,
        expression: &Expression,
        scope: &dyn Scope,
    ) -> Result<Value, Failure> {
        let span = expression.span;
        let value = match &expression.kind {
            ExpressionKind::Quantity { digits, unit } => {
                Value::Scalar(self.literal(digits, unit.as_ref(), span)?)
            }
            ExpressionKind::List { items, unit } => self.list(items, unit.as_ref(), span)?,
            ExpressionKind::Range(range) => self.range(range, span, scope)?,
            ExpressionKind::FileColumn {
                header,
                path,
                path_span,
            } => self.file_column(header, path, *path_span, span)?,
            ExpressionKind::Solve(solve) => self.solve(solve, span, scope)?,
            ExpressionKind::Name(name) => self.name(name, span, scope)?,
            ExpressionKind::Call {
                function,
                arguments,
            } if scope.sheet_function(&function.text).is_some() => {
                self.call_sheet_function(function, arguments, span, scope)?
            }
            ExpressionKind::Call {
                function,
                arguments,
            } => self.call_builtin(function, arguments, span, scope)?,
            ExpressionKind::Negate(inner) => {
                let value = self.expression(inner, scope)?;
                super::columns::negate(value, span)
                    .map_err(|error| point_at_operand(error, inner))?
            }
            ExpressionKind::Binary {
                operator,
                left,
                right,
            } => {
                let left_value = self.expression(left, scope)?;
                let right_value = self.expression(right, scope)?;
                super::columns::combine(*operator, &left_value, &right_value, span, right.span)
                    .map_err(|error| {
                        name_offset_operand(error, [(left, &left_value), (right, &right_value)])
                    })?
            }
        };
        if let Value::Scalar(quantity) = &value {
            if !quantity.value.is_finite() {
                return Err(EvalError::new(EvalErrorKind::NotFinite, span).into());
            }
        }
        Ok(value)
    }

    /// An expression that must give one value (a range's ends, a tolerance, a bracket).
    pub(crate) fn scalar(
        &mut self,
        expression: &Expression,
        what: &'static str,
        scope: &dyn Scope,
    ) -> Result<Quantity, Failure> {
        match self.expression(expression, scope)? {
            Value::Scalar(quantity) => Ok(quantity),
            _ => Err(EvalError::new(EvalErrorKind::ScalarNeeded { what }, expression.span).into()),
        }
    }

    /// A call of a built-in: whole-column functions get the values as they are; others are
    /// applied row by row, with the dimensions checked on the first row only.
    fn call_builtin(
        &mut self,
        function: &crate::syntax::Name,
        arguments: &[Expression],
        span: Span,
        scope: &dyn Scope,
    ) -> Result<Value, Failure> {
        let Some(callee) = self.library.function(&function.text) else {
            let kind = if scope.lookup(&function.text).is_some()
                || self.library.constant(&function.text).is_some()
            {
                EvalErrorKind::NameCalledAsFunction {
                    name: function.text.clone(),
                }
            } else {
                EvalErrorKind::UnknownFunction {
                    name: function.text.clone(),
                    suggestion: self.suggest(&function.text, scope),
                }
            };
            return Err(EvalError::new(kind, function.span).into());
        };
        let mut values = Vec::with_capacity(arguments.len());
        for argument in arguments {
            let value = self.expression(argument, scope)?;
            if !callee.takes_absolute_temperature() {
                let shape = match &value {
                    Value::Scalar(quantity) => Some(*quantity),
                    Value::Column(column) => Some(column.shape()),
                    Value::Labels(_) => None,
                };
                if let Some(shape) = shape {
                    let operation = format!("passed to `{}`", function.text);
                    refuse_offset_temperature(&shape, &operation, argument.span)
                        .map_err(|error| point_at_operand(error, argument))?;
                }
            }
            values.push(value);
        }
        self.calls.push(CallRecord {
            function: function.text.clone(),
            span,
            arguments: arguments
                .iter()
                .map(|argument| argument.span)
                .zip(values.iter().cloned())
                .collect(),
        });
        let call_error = |error: CallError| {
            let at = match &error {
                CallError::WrongDimension { argument, .. } => Some(*argument),
                CallError::Domain { argument, .. } | CallError::OutOfRange { argument, .. } => {
                    *argument
                }
                CallError::ArgumentCount { .. } => None,
            };
            let error_span = at
                .and_then(|index| arguments.get(index))
                .map_or(span, |argument| argument.span);
            EvalError::new(
                EvalErrorKind::Call {
                    function: function.text.clone(),
                    error,
                },
                error_span,
            )
        };
        if let Some(result) = callee.call_values(&values, &mut self.provenance) {
            return result.map_err(|error| call_error(error).into());
        }
        let mut rows = None;
        let mut first_column = 0;
        for (index, value) in values.iter().enumerate() {
            if let Value::Labels(labels) = value {
                let kind = EvalErrorKind::TextInArithmetic {
                    origin: labels.origin.to_string(),
                };
                return Err(EvalError::new(kind, arguments[index].span).into());
            }
            if let Some(length) = value.rows() {
                match rows {
                    None => (rows, first_column) = (Some(length), index),
                    Some(earlier) if earlier != length => {
                        let kind = EvalErrorKind::ColumnLengths {
                            left_rows: earlier,
                            left_origin: super::columns::origin(&values[first_column]).to_string(),
                            right_rows: length,
                            right_origin: super::columns::origin(value).to_string(),
                        };
                        return Err(EvalError::new(kind, arguments[index].span)
                            .with_label(arguments[first_column].span, format!("{earlier} rows"))
                            .into());
                    }
                    Some(_) => {}
                }
            }
        }
        let row_one = |value: &Value| {
            value
                .quantity_at(0)
                .unwrap_or(Quantity::dimensionless(f64::NAN))
        };
        let Some(rows) = rows else {
            // All single values, the common case: short calls pass them on the stack.
            let mut buffer = [Quantity::dimensionless(0.0); SHORT_CALL];
            let owned: Vec<Quantity>;
            let scalars: &[Quantity] = if values.len() <= SHORT_CALL {
                for (slot, value) in buffer.iter_mut().zip(&values) {
                    *slot = row_one(value);
                }
                &buffer[..values.len()]
            } else {
                owned = values.iter().map(row_one).collect();
                &owned
            };
            return callee
                .call(scalars, &mut self.provenance)
                .map(Value::Scalar)
                .map_err(|error| call_error(error).into());
        };
        let first_row: Vec<Quantity> = values.iter().map(row_one).collect();
        let origin: Arc<str> = Arc::from(super::columns::origin(&values[first_column]));
        if rows == 0 {
            return Err(EvalError::new(
                EvalErrorKind::BadRange {
                    message: "a column with no rows".to_string(),
                },
                span,
            )
            .into());
        }
        let shape = callee
            .call(&first_row, &mut self.provenance)
            .map_err(|error| call_error(error).in_row(0, &origin))?;
        let columns: Vec<super::columns::Rows> =
            values.iter().map(super::columns::Rows::of).collect();
        let mut results = Vec::with_capacity(rows);
        results.push(shape.value);
        let mut row_values = first_row;
        let failed = if let Some(kernel) = callee.row_kernel(&row_values) {
            let mut numbers: Vec<f64> = row_values.iter().map(|quantity| quantity.value).collect();
            (1..rows).find_map(|row| {
                for (number, column) in numbers.iter_mut().zip(&columns) {
                    *number = column.at(row);
                }
                match kernel(&numbers) {
                    Ok(value) if value.is_finite() => {
                        results.push(value);
                        None
                    }
                    Ok(_) => Some((row, None)),
                    Err(error) => Some((row, Some(error))),
                }
            })
        } else {
            let provenance = &mut self.provenance;
            (1..rows).find_map(|row| {
                for (quantity, column) in row_values.iter_mut().zip(&columns) {
                    quantity.value = column.at(row);
                }
                match callee.call(&row_values, provenance) {
                    Ok(value) if value.value.is_finite() => {
                        results.push(value.value);
                        None
                    }
                    Ok(_) => Some((row, None)),
                    Err(error) => Some((row, Some(error))),
                }
            })
        };
        if let Some((row, error)) = failed {
            let error = match error {
                Some(error) => call_error(error),
                None => EvalError::new(EvalErrorKind::NotFinite, span),
            };
            return Err(error.in_row(row, &origin).into());
        }
        Ok(Value::Column(Column {
            values: Arc::new(results),
            dimension: shape.dimension,
            temperature: shape.temperature,
            origin,
        }))
    }

    fn literal(
        &mut self,
        digits: &str,
        unit: Option<&UnitExpression>,
        span: Span,
    ) -> Result<Quantity, Failure> {
        let number: f64 = digits.parse().unwrap_or(f64::INFINITY);
        let Some(unit_expression) = unit else {
            return Ok(Quantity::dimensionless(number));
        };
        let unit = self.unit(unit_expression)?;
        let temperature = literal_temperature(&unit);
        let value = unit.to_si(number, Some(digits));
        if !value.is_finite() {
            return Err(EvalError::new(EvalErrorKind::NotFinite, span).into());
        }
        let quantity = Quantity {
            value,
            dimension: unit.dimension,
            temperature,
        };
        refuse_below_absolute_zero(&quantity, unit.is_absolute_temperature(), span)?;
        Ok(quantity)
    }

    /// `{12, 40, 150} mD`: each number converted exactly, like a literal.
    fn list(
        &mut self,
        items: &[String],
        unit: Option<&UnitExpression>,
        span: Span,
    ) -> Result<Value, Failure> {
        let mut values = Vec::with_capacity(items.len());
        let mut shape = Quantity::dimensionless(0.0);
        for item in items {
            let digits = item.trim_start_matches('+');
            shape = self.literal(digits, unit, span)?;
            values.push(shape.value);
        }
        Ok(Value::Column(Column {
            values: Arc::new(values),
            dimension: shape.dimension,
            temperature: shape.temperature,
            origin: Arc::from(""),
        }))
    }

    /// `from to to step s` or `from to to count n [log]`.
    fn range(
        &mut self,
        range: &crate::syntax::Range,
        span: Span,
        scope: &dyn Scope,
    ) -> Result<Value, Failure> {
        use super::columns::{allocate_rows, check_rows, spaced, stepped};
        use crate::syntax::Spacing;
        let from = self.scalar(&range.from, "the start of a range", scope)?;
        let to = self.scalar(&range.to, "the end of a range", scope)?;
        let bad = |message: String, at: Span| -> Failure {
            EvalError::new(EvalErrorKind::BadRange { message }, at).into()
        };
        if from.dimension != to.dimension {
            return Err(EvalError::new(
                EvalErrorKind::DimensionMismatch {
                    operation: Operation::Compare,
                    left: from.dimension,
                    right: to.dimension,
                },
                range.from.span.to(range.to.span),
            )
            .into());
        }
        let values = match &range.spacing {
            Spacing::Step(step_expression) => {
                let step = self.scalar(step_expression, "the step of a range", scope)?;
                if step.dimension != from.dimension {
                    return Err(bad(
                        format!(
                            "the step must have the dimension of the ends ({}), found {}",
                            from.dimension, step.dimension
                        ),
                        step_expression.span,
                    ));
                }
                if step.is_absolute_temperature() {
                    return Err(bad(
                        "a step is a temperature difference: write `5 K` or `5 delta_degC`"
                            .to_string(),
                        step_expression.span,
                    ));
                }
                let span_of_range = to.value - from.value;
                if step.value == 0.0
                    || (span_of_range != 0.0 && step.value.signum() != span_of_range.signum())
                {
                    return Err(bad(
                        "the step must be non-zero and go from the start towards the end"
                            .to_string(),
                        step_expression.span,
                    ));
                }
                let steps = (span_of_range / step.value * (1.0 + 1e-12) + 1e-9).floor() + 1.0;
                let rows = check_rows(steps, self.max_rows, span)?;
                self.row_budget.check(rows, span)?;
                stepped(
                    from.value,
                    to.value,
                    rows,
                    step.value,
                    allocate_rows(rows, span)?,
                )
            }
            Spacing::Count { count, logarithmic } => {
                let number = self.scalar(count, "the count of a range", scope)?;
                if !number.dimension.is_dimensionless()
                    || number.value.fract() != 0.0
                    || number.value < 2.0
                {
                    return Err(bad(
                        "the count must be a whole number of at least 2".to_string(),
                        count.span,
                    ));
                }
                let rows = check_rows(number.value, self.max_rows, count.span)?;
                if *logarithmic && (from.value <= 0.0 || to.value <= 0.0) {
                    return Err(bad(
                        "a logarithmic range needs both ends above zero".to_string(),
                        range.from.span.to(range.to.span),
                    ));
                }
                self.row_budget.check(rows, count.span)?;
                let values = allocate_rows(rows, count.span)?;
                spaced(from.value, to.value, rows, *logarithmic, values)
            }
        };
        Ok(Value::Column(Column {
            values: Arc::new(values),
            dimension: from.dimension,
            temperature: from.temperature,
            origin: Arc::from(""),
        }))
    }

    /// `column k from "file.csv"`: the file was read and checked when the sheet loaded (or,
    /// in a session, when the entry or sheet naming it was read).
    fn file_column(
        &mut self,
        header: &crate::syntax::Name,
        path: &str,
        path_span: Span,
        span: Span,
    ) -> Result<Value, Failure> {
        let table = match (
            self.data_files.get(&span.start),
            self.data_by_path.get(path),
        ) {
            (Some(Ok(table)), _) | (None, Some(Ok(table))) => table.clone(),
            (Some(Err(error)), _) => return Err(error.clone().into()),
            (None, Some(Err(message))) => {
                let kind = EvalErrorKind::DataFile {
                    message: message.clone(),
                };
                return Err(EvalError::new(kind, path_span).into());
            }
            (None, None) => {
                return Err(EvalError::new(
                    EvalErrorKind::DataFile {
                        message: "data files are read only in sheets run from a file".to_string(),
                    },
                    span,
                )
                .into())
            }
        };
        table
            .column(&header.text)
            .map(|column| column.value.clone())
            .ok_or_else(|| {
                let names: Vec<String> = table
                    .columns
                    .iter()
                    .map(|column| format!("`{}`", column.name))
                    .collect();
                EvalError::new(
                    EvalErrorKind::DataFile {
                        message: format!(
                            "`{}` has no column `{}`; its columns are {}",
                            table.label,
                            header.text,
                            names.join(", ")
                        ),
                    },
                    header.span,
                )
                .into()
            })
    }

    fn name(&mut self, name: &str, span: Span, scope: &dyn Scope) -> Result<Value, Failure> {
        if let Some(parameters) = self.parameters.last() {
            if let Some((_, value)) = parameters.iter().find(|(parameter, _)| parameter == name) {
                return Ok(value.clone());
            }
        }
        if let Some(slot) = scope.lookup(name) {
            return match slot {
                Some(shown) => Ok(shown.value()),
                None => Err(Failure::Upstream(name.to_string())),
            };
        }
        if let Some(constant) = self.library.constant(name) {
            return Ok(Value::Scalar(constant.quantity));
        }
        let kind = if self.library.function(name).is_some() {
            EvalErrorKind::FunctionUsedAsValue {
                name: name.to_string(),
            }
        } else {
            EvalErrorKind::UnknownName {
                name: name.to_string(),
                suggestion: self.suggest(name, scope),
            }
        };
        Err(EvalError::new(kind, span).into())
    }

    /// The closest sheet or built-in name, for "did you mean".
    fn suggest(&self, name: &str, scope: &dyn Scope) -> Option<String> {
        let mut defined = Vec::new();
        scope.for_each_defined(&mut |candidate| defined.push(candidate.to_string()));
        let library_names = self.library.names();
        let candidates = defined
            .iter()
            .map(String::as_str)
            .chain(library_names.iter().copied());
        crate::suggest::closest(name, candidates, 0.8).map(str::to_string)
    }

    fn unit(&mut self, expression: &UnitExpression) -> Result<Unit, EvalError> {
        if let Some(unit) = self.unit_cache.get(expression.text.as_str()) {
            return Ok(unit.clone());
        }
        let unit = resolve_unit(expression)?;
        self.unit_cache
            .insert(expression.text.clone(), unit.clone());
        Ok(unit)
    }

    /// A line's value in its display unit: the expression evaluated, then shown.
    pub(crate) fn line_value(
        &mut self,
        expression: &Expression,
        declared: Option<&UnitExpression>,
        scope: &dyn Scope,
    ) -> Result<Shown, Failure> {
        let value = self.expression(expression, scope)?;
        self.shown(value, declared, expression, scope)
            .map_err(Failure::from)
    }

    /// Converts a value to its display unit: the declared one (checked), a literal's own unit,
    /// a bare name's line's unit, or the preferred SI unit.
    pub(crate) fn shown(
        &mut self,
        value: Value,
        declared: Option<&UnitExpression>,
        expression: &Expression,
        scope: &dyn Scope,
    ) -> Result<Shown, EvalError> {
        if let Some(unit_expression) = written_unit(expression, declared, scope) {
            let unit = self.unit(unit_expression)?;
            return present(
                value,
                Some((&unit, &unit_expression.text)),
                unit_expression.span,
            );
        }
        // A data-file column shows in its header's unit.
        if let ExpressionKind::FileColumn { header, path, .. } = &expression.kind {
            let table = match (
                self.data_files.get(&expression.span.start),
                self.data_by_path.get(path),
            ) {
                (Some(Ok(table)), _) | (None, Some(Ok(table))) => Some(table.clone()),
                _ => None,
            };
            let written = table.and_then(|table| {
                table
                    .column(&header.text)
                    .and_then(|column| column.unit.clone())
            });
            if let Some(text) = written {
                let unit = crate::syntax::parse_unit(&text)
                    .ok()
                    .and_then(|unit| resolve_unit(&unit).ok());
                if let Some(unit) = unit {
                    return present(value, Some((&unit, &text)), expression.span);
                }
            }
        }
        // A bare name (`y = x`, or `x` alone) shows in the unit its own line shows in, and a
        // solve's result in its unknown's.
        let like = match &expression.kind {
            ExpressionKind::Name(name) => Some(name),
            ExpressionKind::Solve(solve) => Some(&solve.unknown.text),
            _ => None,
        };
        if let Some(name) = like {
            if let Some(shown) = shown_like(&value, name, scope, expression.span) {
                return Ok(shown);
            }
        }
        present(value, None, expression.span)
    }

    /// The unit a check shows both sides in: the right side's if it has one of its own.
    fn shown_for_check(
        &mut self,
        quantity: Quantity,
        sides: [&Expression; 2],
        scope: &dyn Scope,
    ) -> Result<ShownValue, EvalError> {
        let value = Value::Scalar(quantity);
        for side in sides {
            let shown = match &side.kind {
                ExpressionKind::Quantity { unit: Some(_), .. }
                | ExpressionKind::List { unit: Some(_), .. } => {
                    Some(self.shown(value.clone(), None, side, scope)?)
                }
                ExpressionKind::Name(name) => shown_like(&value, name, scope, side.span),
                _ => None,
            };
            if let Some(Shown::Scalar(shown)) = shown {
                return Ok(shown);
            }
        }
        Ok(ShownValue {
            quantity,
            unit: quantity.dimension.preferred_si_unit(),
            value: quantity.value,
        })
    }

    /// Decides a check line. Over columns, every row must pass; the outcome shows the first
    /// row that failed, or the row closest to failing.
    pub(crate) fn check(
        &mut self,
        check: &Check,
        scope: &dyn Scope,
    ) -> Result<CheckOutcome, Failure> {
        let left = self.expression(&check.left, scope)?;
        let right = self.expression(&check.right, scope)?;
        let both = check.left.span.to(check.right.span);
        let rows = super::columns::common_rows(&left, &right, both)?;
        let (left_dimension, right_dimension) = (left.dimension(), right.dimension());
        if left_dimension != right_dimension {
            return Err(EvalError::new(
                EvalErrorKind::DimensionMismatch {
                    operation: Operation::Compare,
                    left: left_dimension.unwrap_or(Dimension::dimensionless()),
                    right: right_dimension.unwrap_or(Dimension::dimensionless()),
                },
                both,
            )
            .into());
        }
        let tolerance = match &check.tolerance {
            None => None,
            Some(tolerance) => {
                let value = self.scalar(tolerance, "a tolerance", scope)?;
                if value.value < 0.0 {
                    return Err(
                        EvalError::new(EvalErrorKind::NegativeTolerance, tolerance.span).into(),
                    );
                }
                if value.dimension.is_dimensionless() {
                    Some((value.value, true))
                } else if Some(value.dimension) == right_dimension {
                    Some((value.value, false))
                } else {
                    return Err(EvalError::new(
                        EvalErrorKind::ToleranceDimension {
                            found: value.dimension,
                            sides: right_dimension.unwrap_or(Dimension::dimensionless()),
                        },
                        tolerance.span,
                    )
                    .into());
                }
            }
        };
        // How far row values are from failing: a check passes at a margin of zero or more
        // (strict comparisons need more than zero).
        // Without a tolerance, sides within the rounding allowance count as equal, for every
        // comparison alike: `0.3 m + 0.3 m + 0.3 m >= 0.9 m` passes and `0.3 m + 0.6 m < 0.9 m`
        // fails, as they do on paper.
        let comparison = check.comparison;
        let margin = |l: f64, r: f64| {
            let (allowance, rounding) = match tolerance {
                None => (ROUNDING_ALLOWANCE * r.abs().max(l.abs()), true),
                Some((fraction, true)) => (fraction * r.abs(), false),
                Some((absolute, false)) => (absolute, false),
            };
            match comparison {
                Comparison::Less if rounding => r - allowance - l,
                Comparison::Greater if rounding => l - (r + allowance),
                Comparison::Less | Comparison::LessOrEqual => r + allowance - l,
                Comparison::Greater | Comparison::GreaterOrEqual => l - (r - allowance),
                Comparison::Equal => allowance - (l - r).abs(),
                Comparison::NotEqual => (l - r).abs() - allowance,
            }
        };
        let passes = |margin: f64| match comparison {
            Comparison::Less | Comparison::Greater | Comparison::NotEqual => margin > 0.0,
            _ => margin >= 0.0,
        };
        let (a, b) = (
            super::columns::Rows::of(&left),
            super::columns::Rows::of(&right),
        );
        let (shown_row, summary) = match rows {
            None => (0, None),
            Some(total) => {
                let mut failed = 0;
                let mut first_failed = None;
                let mut closest = (0, f64::INFINITY);
                for row in 0..total {
                    let row_margin = margin(a.at(row), b.at(row));
                    if !passes(row_margin) {
                        failed += 1;
                        first_failed.get_or_insert(row);
                    }
                    if row_margin < closest.1 {
                        closest = (row, row_margin);
                    }
                }
                let shown_row = first_failed.unwrap_or(closest.0);
                let summary = CheckRows {
                    total,
                    failed,
                    shown_row: shown_row + 1,
                };
                (shown_row, Some(summary))
            }
        };
        let passed = match summary {
            Some(summary) => summary.failed == 0,
            None => passes(margin(a.at(0), b.at(0))),
        };
        let sides = [&check.right, &check.left];
        let (Some(left_row), Some(right_row)) =
            (left.quantity_at(shown_row), right.quantity_at(shown_row))
        else {
            return Err(EvalError::new(EvalErrorKind::NotFinite, both).into());
        };
        let right_shown = self.shown_for_check(right_row, sides, scope)?;
        let left_shown = self.shown_for_check(left_row, sides, scope)?;
        Ok(CheckOutcome {
            passed,
            comparison: check.comparison,
            left: left_shown,
            right: right_shown,
            tolerance: check.tolerance_text.clone(),
            message: check.message.clone(),
            rows: summary,
        })
    }

    /// Gathers a plot line's columns: every series the length of the x column, all series of one
    /// dimension (shown in the first series' unit).
    pub(crate) fn plot(
        &mut self,
        plot: &crate::syntax::Plot,
        scope: &dyn Scope,
    ) -> Result<PlotOutcome, Failure> {
        let column = |name: &crate::syntax::Name| -> Result<ShownColumn, Failure> {
            match scope.lookup(&name.text) {
                None => Err(EvalError::new(
                    EvalErrorKind::UnknownName {
                        name: name.text.clone(),
                        suggestion: None,
                    },
                    name.span,
                )
                .into()),
                Some(None) => Err(Failure::Upstream(name.text.clone())),
                Some(Some(Shown::Column(column))) => Ok(column.as_ref().clone()),
                Some(Some(_)) => Err(EvalError::new(
                    EvalErrorKind::Plot {
                        message: format!(
                            "`{}` is not a column of numbers; a plot draws columns",
                            name.text
                        ),
                    },
                    name.span,
                )
                .into()),
            }
        };
        let x = column(&plot.against)?;
        let mut series: Vec<(String, Vec<f64>)> = Vec::new();
        let mut first: Option<(ShownColumn, Unit)> = None;
        for name in &plot.series {
            let shown = column(name)?;
            if shown.len() != x.len() {
                return Err(EvalError::new(
                    EvalErrorKind::ColumnLengths {
                        left_rows: shown.len(),
                        left_origin: name.text.clone(),
                        right_rows: x.len(),
                        right_origin: plot.against.text.clone(),
                    },
                    name.span,
                )
                .into());
            }
            let values = match &first {
                None => {
                    let unit = crate::syntax::parse_unit(&shown.unit)
                        .ok()
                        .and_then(|expression| resolve_unit(&expression).ok())
                        .unwrap_or_else(Unit::dimensionless);
                    let values = shown.shown_values().collect();
                    first = Some((shown, unit));
                    values
                }
                Some((reference, unit)) => {
                    if reference.column.dimension != shown.column.dimension {
                        return Err(EvalError::new(
                            EvalErrorKind::Plot {
                                message: format!(
                                    "`{}` is {} but `{}` is {}: series on one chart share a dimension",
                                    name.text,
                                    super::function::describe_dimension(&shown.column.dimension),
                                    plot.series[0].text,
                                    super::function::describe_dimension(&reference.column.dimension)
                                ),
                            },
                            name.span,
                        )
                        .into());
                    }
                    if reference.unit == shown.unit {
                        shown.shown_values().collect()
                    } else {
                        shown
                            .column
                            .values
                            .iter()
                            .map(|value| unit.from_si(*value))
                            .collect()
                    }
                }
            };
            series.push((name.text.clone(), values));
        }
        let y_unit = first
            .as_ref()
            .map_or(String::new(), |(shown, _)| shown.unit.clone());
        let with_unit = |name: &str, unit: &str| match unit {
            "1" | "" => name.to_string(),
            unit => format!("{name} [{unit}]"),
        };
        let y_label = match series.as_slice() {
            [(name, _)] => with_unit(name, &y_unit),
            _ => with_unit("", &y_unit).trim().to_string(),
        };
        Ok(PlotOutcome {
            title: plot.title.clone(),
            x_label: with_unit(&plot.against.text, &x.unit),
            y_label,
            x: x.shown_values().collect(),
            series,
            log_x: plot.log_x,
            log_y: plot.log_y,
        })
    }

    /// Resolves a function's declared units once at its definition; returns its signature.
    pub(crate) fn check_function_units(
        &mut self,
        function: &FunctionDefinition,
    ) -> Result<String, EvalError> {
        let mut parameters = Vec::new();
        for parameter in &function.parameters {
            match &parameter.unit {
                Some(unit) => {
                    self.unit(unit)?;
                    parameters.push(format!("{} [{}]", parameter.name.text, unit.text));
                }
                None => parameters.push(parameter.name.text.clone()),
            }
        }
        let mut signature = format!("{}({})", function.name.text, parameters.join(", "));
        if let Some(unit) = &function.result_unit {
            self.unit(unit)?;
            signature.push_str(&format!(" [{}]", unit.text));
        }
        Ok(signature)
    }

    /// Calls a function defined in the sheet: arguments checked against declared dimensions,
    /// the body evaluated with the parameters bound, errors pointing at call and definition.
    fn call_sheet_function(
        &mut self,
        name: &crate::syntax::Name,
        arguments: &[Expression],
        span: Span,
        scope: &dyn Scope,
    ) -> Result<Value, Failure> {
        let Some(Some(definition)) = scope.sheet_function(&name.text) else {
            return Err(Failure::Upstream(name.text.clone()));
        };
        let defined_here =
            |error: EvalError| error.with_label(definition.name.span, "defined here");
        if arguments.len() != definition.parameters.len() {
            let kind = EvalErrorKind::SheetFunctionArguments {
                function: name.text.clone(),
                expected: definition.parameters.len(),
                found: arguments.len(),
            };
            return Err(defined_here(EvalError::new(kind, span)).into());
        }
        let mut bound = Vec::with_capacity(arguments.len());
        for (argument, parameter) in arguments.iter().zip(&definition.parameters) {
            let value = self.expression(argument, scope)?;
            if let Some(unit) = &parameter.unit {
                let unit = self.unit(unit)?;
                if Some(unit.dimension) != value.dimension() {
                    let kind = EvalErrorKind::ParameterDimension {
                        function: name.text.clone(),
                        parameter: parameter.name.text.clone(),
                        expected: unit.dimension,
                        found: value.dimension().unwrap_or(Dimension::dimensionless()),
                    };
                    let error = EvalError::new(kind, argument.span)
                        .with_label(parameter.name.span, "declared here");
                    return Err(error.into());
                }
            }
            bound.push((parameter.name.text.clone(), value));
        }
        if self.parameters.len() >= CALL_DEPTH_LIMIT {
            return Err(Failure::Upstream(name.text.clone()));
        }
        self.parameters.push(bound);
        let result = self.expression(&definition.body, scope);
        self.parameters.pop();
        let value = result.map_err(|failure| match failure {
            Failure::Error(error) => {
                Failure::Error(error.with_label(span, format!("in this call of `{}`", name.text)))
            }
            upstream => upstream,
        })?;
        if let Some(unit) = &definition.result_unit {
            let unit = self.unit(unit)?;
            if Some(unit.dimension) != value.dimension() {
                let kind = EvalErrorKind::ResultDimension {
                    function: name.text.clone(),
                    expected: unit.dimension,
                    found: value.dimension().unwrap_or(Dimension::dimensionless()),
                };
                return Err(EvalError::new(kind, span)
                    .with_label(unit_span(definition), "declared here")
                    .into());
            }
        }
        Ok(value)
    }
}

/// A column made on this line (a list, a range, a data-file column) is named after the line, so that
/// errors about its rows and length say where it came from.
pub(crate) fn with_origin(shown: Shown, name: &str) -> Shown {
    match shown {
        Shown::Column(mut shown) if shown.column.origin.is_empty() => {
            shown.column.origin = Arc::from(name);
            Shown::Column(shown)
        }
        Shown::Labels(mut labels) if labels.origin.is_empty() => {
            labels.origin = Arc::from(name);
            Shown::Labels(labels)
        }
        other => other,
    }
}

/// `value` in the unit the line named `name` shows in, when that works (same dimension and
/// temperature rules).
fn shown_like(value: &Value, name: &str, scope: &dyn Scope, span: Span) -> Option<Shown> {
    let Some(Some(line)) = scope.lookup(name) else {
        return None;
    };
    let text = line.unit();
    let expression = crate::syntax::parse_unit(text).ok()?;
    let unit = resolve_unit(&expression).ok()?;
    present(value.clone(), Some((&unit, text)), span).ok()
}

/// The unit written for a value: the declared one, a literal's or list's own, a range's start's,
/// or the result unit of the sheet function it calls.
fn written_unit<'e>(
    expression: &'e Expression,
    declared: Option<&'e UnitExpression>,
    scope: &'e dyn Scope,
) -> Option<&'e UnitExpression> {
    if declared.is_some() {
        return declared;
    }
    match &expression.kind {
        ExpressionKind::Quantity { unit, .. } | ExpressionKind::List { unit, .. } => unit.as_ref(),
        ExpressionKind::Range(range) => written_unit(&range.from, None, scope),
        ExpressionKind::Call { function, .. } => scope
            .sheet_function(&function.text)
            .flatten()
            .and_then(|definition| definition.result_unit.as_ref()),
        _ => None,
    }
}

/// A value in a unit (`None`: the preferred SI unit), with the dimension and temperature rules
/// enforced once and every shown number checked to be finite.
fn present(value: Value, unit: Option<(&Unit, &str)>, span: Span) -> Result<Shown, EvalError> {
    match value {
        Value::Scalar(quantity) => Ok(Shown::Scalar(match unit {
            Some((unit, text)) => show_in(quantity, unit, text, span)?,
            None => ShownValue {
                quantity,
                unit: quantity.dimension.preferred_si_unit(),
                value: quantity.value,
            },
        })),
        Value::Column(column) => {
            let (unit_text, conversion) = match unit {
                Some((unit, text)) => {
                    show_in(column.shape(), unit, text, span)?;
                    (text.to_string(), Some(unit.clone()))
                }
                None => (column.dimension.preferred_si_unit(), None),
            };
            let shown = ShownColumn {
                column,
                unit: unit_text,
                conversion,
            };
            if let Some(row) = (0..shown.len()).find(|row| !shown.shown(*row).is_finite()) {
                let origin = shown.column.origin.to_string();
                return Err(EvalError::new(EvalErrorKind::NotFinite, span).in_row(row, &origin));
            }
            Ok(Shown::Column(Box::new(shown)))
        }
        Value::Labels(labels) => match unit {
            Some(_) => Err(EvalError::new(
                EvalErrorKind::TextInArithmetic {
                    origin: labels.origin.to_string(),
                },
                span,
            )),
            None => Ok(Shown::Labels(labels)),
        },
    }
}

/// Calls with at most this many arguments pass them on the stack.
const SHORT_CALL: usize = 8;

/// Nesting of sheet-function calls beyond which a call is refused (recursion is refused at
/// definition, so only a pathological chain of distinct functions reaches it).
const CALL_DEPTH_LIMIT: usize = 64;

fn text_of(sources: &SourceMap, span: Span) -> String {
    sources.text_of(span).to_string()
}

/// Builds a unit from its written form. A lone absolute scale keeps its offset; anything
/// compound treats degrees as differences.
pub fn resolve_unit(expression: &UnitExpression) -> Result<Unit, EvalError> {
    let at = |error: UnitError, span: Span| match error {
        UnitError::Unknown {
            symbol,
            suggestions,
        } => EvalError::new(
            EvalErrorKind::UnknownUnit {
                symbol,
                suggestions,
            },
            span,
        ),
        UnitError::CaseOnly {
            symbol,
            reading,
            suggestion,
            suggestion_name,
        } => EvalError::new(
            EvalErrorKind::CaseOnlyUnit {
                symbol,
                reading,
                suggestion,
                suggestion_name,
            },
            span,
        ),
        UnitError::ExponentOverflow => EvalError::new(EvalErrorKind::ExponentOverflow, span),
    };
    match &expression.kind {
        UnitExpressionKind::Symbol(symbol) => {
            Unit::lookup(symbol).map_err(|error| at(error, expression.span))
        }
        UnitExpressionKind::One => Ok(Unit::dimensionless()),
        UnitExpressionKind::Product(left, right) => resolve_unit(left)?
            .multiply(&resolve_unit(right)?)
            .map_err(|error| at(error, expression.span)),
        UnitExpressionKind::Quotient(left, right) => resolve_unit(left)?
            .divide(&resolve_unit(right)?)
            .map_err(|error| at(error, expression.span)),
        UnitExpressionKind::Power {
            base,
            numerator,
            denominator,
        } => resolve_unit(base)?
            .power(Exponent::new(*numerator, *denominator))
            .map_err(|error| at(error, expression.span)),
    }
}

/// A quantity in a given unit, with the dimension and temperature rules enforced.
pub fn show_in(
    quantity: Quantity,
    unit: &Unit,
    unit_text: &str,
    span: Span,
) -> Result<ShownValue, EvalError> {
    if unit.dimension != quantity.dimension {
        return Err(EvalError::new(
            EvalErrorKind::DisplayUnitMismatch {
                unit: unit_text.to_string(),
                unit_dimension: unit.dimension,
                value_dimension: quantity.dimension,
            },
            span,
        ));
    }
    if unit.is_absolute_temperature() && quantity.is_temperature_difference() {
        return Err(EvalError::new(
            EvalErrorKind::DifferenceShownAsAbsolute {
                unit: unit_text.to_string(),
            },
            span,
        ));
    }
    if unit.temperature == TemperatureRole::Difference && quantity.is_absolute_temperature() {
        return Err(EvalError::new(
            EvalErrorKind::AbsoluteShownAsDifference {
                unit: unit_text.to_string(),
            },
            span,
        ));
    }
    refuse_below_absolute_zero(&quantity, unit.is_absolute_temperature(), span)?;
    let value = unit.from_si(quantity.value);
    if !value.is_finite() {
        return Err(EvalError::new(EvalErrorKind::NotFinite, span));
    }
    Ok(ShownValue {
        quantity,
        unit: unit_text.to_string(),
        value,
    })
}

pub(crate) fn binary(
    operator: BinaryOperator,
    left: Quantity,
    right: Quantity,
    span: Span,
    right_span: Span,
) -> Result<Quantity, EvalError> {
    use TemperatureKind::Unspecified;
    let error = |kind| EvalError::new(kind, span);
    let overflow = |_| error(EvalErrorKind::ExponentOverflow);
    match operator {
        BinaryOperator::Add | BinaryOperator::Subtract => {
            let adding = operator == BinaryOperator::Add;
            if left.dimension != right.dimension {
                let operation = if adding {
                    Operation::Add
                } else {
                    Operation::Subtract
                };
                return Err(error(EvalErrorKind::DimensionMismatch {
                    operation,
                    left: left.dimension,
                    right: right.dimension,
                }));
            }
            let temperature = if left.dimension.is_temperature() {
                sum_temperature(adding, left.temperature, right.temperature).map_err(error)?
            } else {
                Unspecified
            };
            let value = if adding {
                left.value + right.value
            } else {
                left.value - right.value
            };
            let sum = Quantity {
                value,
                dimension: left.dimension,
                temperature,
            };
            refuse_below_absolute_zero(&sum, false, span)?;
            Ok(sum)
        }
        BinaryOperator::Multiply => {
            refuse_offset_temperature(&left, "multiplied", span)?;
            refuse_offset_temperature(&right, "multiplied", span)?;
            let dimension = left
                .dimension
                .multiply(&right.dimension)
                .map_err(overflow)?;
            Ok(Quantity {
                value: left.value * right.value,
                dimension,
                temperature: scaled_temperature(&left, &right),
            })
        }
        BinaryOperator::Divide => {
            refuse_offset_temperature(&left, "divided", span)?;
            refuse_offset_temperature(&right, "divided by", span)?;
            if right.value == 0.0 {
                return Err(EvalError::new(EvalErrorKind::DivisionByZero, right_span));
            }
            let dimension = left.dimension.divide(&right.dimension).map_err(overflow)?;
            let temperature = if right.dimension.is_dimensionless() {
                scaled_temperature(&left, &right)
            } else {
                Unspecified
            };
            Ok(Quantity {
                value: left.value / right.value,
                dimension,
                temperature,
            })
        }
        BinaryOperator::Power => {
            if !right.dimension.is_dimensionless() {
                return Err(EvalError::new(
                    EvalErrorKind::ExponentNotDimensionless {
                        found: right.dimension,
                    },
                    right_span,
                ));
            }
            refuse_offset_temperature(&left, "raised to a power", span)?;
            let dimension = if left.dimension.is_dimensionless() {
                left.dimension
            } else {
                let exponent = simple_fraction(right.value).ok_or_else(|| {
                    EvalError::new(
                        EvalErrorKind::ExponentNotRational { value: right.value },
                        right_span,
                    )
                })?;
                left.dimension.power(exponent).map_err(overflow)?
            };
            if left.value == 0.0 && right.value < 0.0 {
                return Err(error(EvalErrorKind::DivisionByZero));
            }
            let value = left.value.powf(right.value);
            if value.is_nan() {
                return Err(error(EvalErrorKind::Call {
                    function: "^".to_string(),
                    error: CallError::Domain {
                        argument: None,
                        message: "a negative number has no real fractional power".to_string(),
                    },
                }));
            }
            Ok(Quantity::new(value, dimension))
        }
    }
}

/// Points an offset-temperature error at the operand that caused it and names it as written,
/// so the suggested fix (`kelvin(dT)`) is in the user's own words.
fn name_offset_operand(error: EvalError, operands: [(&Expression, &Value); 2]) -> EvalError {
    let offending = operands.into_iter().find(|(_, value)| match value {
        Value::Scalar(quantity) => quantity.is_absolute_temperature(),
        Value::Column(column) => column.shape().is_absolute_temperature(),
        Value::Labels(_) => false,
    });
    match offending {
        Some((expression, _)) => point_at_operand(error, expression),
        None => error,
    }
}

/// An offset-temperature error about `expression`: pointed at it, naming it as written.
fn point_at_operand(mut error: EvalError, expression: &Expression) -> EvalError {
    if let EvalErrorKind::OffsetTemperature { operand, .. } = error.kind.as_mut() {
        *operand = written_operand(expression);
        error.span = expression.span;
    }
    error
}

/// A name or a literal as the user wrote it (`dT`, `10 degC`); `None` for anything longer.
fn written_operand(expression: &Expression) -> Option<String> {
    match &expression.kind {
        ExpressionKind::Name(name) => Some(name.clone()),
        ExpressionKind::Quantity {
            digits,
            unit: Some(unit),
        } => Some(format!("{digits} {}", unit.text)),
        _ => None,
    }
}

/// The kind of `left ± right` for two temperatures: absolute minus absolute is a difference,
/// absolute plus or minus a difference stays absolute on its scale, two absolutes never add.
fn sum_temperature(
    adding: bool,
    left: TemperatureKind,
    right: TemperatureKind,
) -> Result<TemperatureKind, EvalErrorKind> {
    use TemperatureKind::{Absolute, Difference, Unspecified};
    Ok(match (adding, left, right) {
        (true, Absolute(_), Absolute(_)) => return Err(EvalErrorKind::AbsoluteTemperatureSum),
        (true, Absolute(scale), _) | (true, _, Absolute(scale)) => Absolute(scale),
        (false, Absolute(_) | Unspecified, Absolute(_)) => Difference,
        (false, Difference, Absolute(_)) => return Err(EvalErrorKind::AbsoluteFromDifference),
        (false, Absolute(scale), _) => Absolute(scale),
        (_, Difference, _) | (_, _, Difference) => Difference,
        _ => Unspecified,
    })
}

/// The kind of temperature a literal in `unit` is: `degC` and `degF` alone are absolute on
/// their offset scale; `K` and `degR` start at absolute zero, so they multiply as written.
pub(crate) fn literal_temperature(unit: &Unit) -> TemperatureKind {
    match (unit.temperature, &unit.offset) {
        (TemperatureRole::Absolute, Some(_)) => {
            TemperatureKind::Absolute(OffsetScale::of_degree(unit.factor.value()))
        }
        (TemperatureRole::Difference, _) => TemperatureKind::Difference,
        _ => TemperatureKind::Unspecified,
    }
}

/// An absolute temperature from an offset scale never enters a product, quotient or power as
/// kelvin: 60 degC times something is not 333.15 K times it unless the user says so.
pub(crate) fn refuse_offset_temperature(
    quantity: &Quantity,
    operation: &str,
    span: Span,
) -> Result<(), EvalError> {
    match quantity.offset_scale() {
        Some(scale) => Err(EvalError::new(
            EvalErrorKind::OffsetTemperature {
                operand: None,
                scale,
                kelvin: quantity.value,
                operation: operation.to_string(),
            },
            span,
        )),
        None => Ok(()),
    }
}

/// Nothing is colder than absolute zero: refuses an absolute temperature (or a value about
/// to be shown on an absolute scale, `shown_absolute`) below 0 K.
pub(crate) fn refuse_below_absolute_zero(
    quantity: &Quantity,
    shown_absolute: bool,
    span: Span,
) -> Result<(), EvalError> {
    let absolute = shown_absolute || quantity.is_absolute_temperature();
    if absolute && quantity.dimension.is_temperature() && quantity.value < 0.0 {
        return Err(EvalError::new(
            EvalErrorKind::BelowAbsoluteZero {
                kelvin: quantity.value,
                scale: quantity.offset_scale(),
            },
            span,
        ));
    }
    Ok(())
}

/// Scaling a temperature difference by a number keeps it a difference; anything else that
/// multiplies a temperature is a plain kelvin quantity.
fn scaled_temperature(left: &Quantity, right: &Quantity) -> TemperatureKind {
    if left.is_temperature_difference() && right.dimension.is_dimensionless()
        || right.is_temperature_difference() && left.dimension.is_dimensionless()
    {
        TemperatureKind::Difference
    } else {
        TemperatureKind::Unspecified
    }
}

/// The fraction n/d (d <= 12) equal to `value` within rounding, for powers of units.
fn simple_fraction(value: f64) -> Option<Exponent> {
    (1..=12).find_map(|denominator| {
        let numerator = value * f64::from(denominator);
        let rounded = numerator.round();
        ((numerator - rounded).abs() < 1e-9 && rounded.abs() <= 1_000.0)
            .then(|| Exponent::new(rounded as i32, denominator))
    })
}

/// Where a function declares its result unit (or its name, if it declares none).
fn unit_span(function: &FunctionDefinition) -> Span {
    function
        .result_unit
        .as_ref()
        .map_or(function.name.span, |unit| unit.span)
}
