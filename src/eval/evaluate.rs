//! Evaluation of a sheet: definitions in dependency order, then shown expressions and checks.
//!
//! Every independent error is collected; a line whose inputs failed is skipped quietly (its
//! cause is already reported), and every other line still evaluates. Nothing here panics on
//! user input or prints: the result is a value the front ends render.

use super::diagnostic::Diagnostic;
use super::error::{EvalError, EvalErrorKind, Operation};
use super::function::{CallError, Library, Provenance};
use super::order::dependency_order;
use super::sources::{IncludeLoader, NoIncludes, SourceMap};
use super::value::{Quantity, TemperatureKind};
use crate::syntax::{
    parse_sheet_at, BinaryOperator, Check, Comparison, Expression, ExpressionKind,
    FunctionDefinition, Line, LineKind, Span, UnitExpression, UnitExpressionKind,
};
use crate::units::{Exponent, TemperatureRole, Unit, UnitError};
use rustc_hash::FxHashMap as HashMap;

/// Relative tolerance of `==` and `!=` checks written without `within`.
pub const DEFAULT_EQUALITY_TOLERANCE: f64 = 1e-9;

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
    pub arguments: Vec<(Span, Quantity)>,
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
}

#[derive(Debug, Clone)]
pub enum LineResult {
    Blank,
    Comment,
    Heading(String),
    Value(ShownValue),
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
}

/// A value with the unit it is shown in.
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
}

/// Evaluates a sheet that has no file behind it (includes are refused).
pub fn evaluate_sheet(source: &str, library: &dyn Library) -> Evaluation {
    evaluate("<sheet>", source, library, &mut NoIncludes)
}

/// Evaluates a sheet, loading its includes through `loader`.
pub fn evaluate(
    label: &str,
    source: &str,
    library: &dyn Library,
    loader: &mut dyn IncludeLoader,
) -> Evaluation {
    let mut loaded = Loaded::default();
    let main = loaded.sources.add(label, source);
    loaded.load(
        main,
        &mut vec![(loader.main_key(label), label.to_string())],
        loader,
    );
    let Loaded {
        sources,
        lines,
        errors,
        diagnostics,
        includes,
        main_lines,
    } = loaded;
    let mut evaluator = Evaluator::new(&sources, &lines, library);
    evaluator
        .diagnostics
        .extend(errors.iter().map(Diagnostic::from));
    evaluator.diagnostics.extend(diagnostics);
    for (index, file) in includes {
        evaluator.results[index] = Some(LineResult::Include { file });
    }
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
}

impl Loaded {
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
    Ready(ShownValue),
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
    fn lookup(&self, name: &str) -> Option<Option<&ShownValue>>;
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
    fn lookup(&self, name: &str) -> Option<Option<&ShownValue>> {
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
    parameters: Vec<Vec<(String, Quantity)>>,
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
        }
    }

    fn run(&mut self) {
        self.collect_definitions();
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
        let scope = sheet_scope!(self);
        let calculator = &mut self.calculator;
        let outcome = calculator.line_value(
            &definition.expression,
            definition.display_unit.as_ref(),
            &scope,
        );
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
        };
        self.results[index] = Some(result);
    }

    fn settle(&mut self, index: usize, outcome: Result<ShownValue, Failure>) {
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
        let lines = self
            .lines
            .iter()
            .zip(self.results)
            .take(main_lines)
            .map(|(line, result)| {
                let (name, expression) = match &line.kind {
                    LineKind::Definition(definition) => (
                        Some(definition.name.text.clone()),
                        text_of(sources, definition.expression.span),
                    ),
                    LineKind::Display(display) => (None, text_of(sources, display.expression.span)),
                    LineKind::Function(function) => (
                        Some(function.name.text.clone()),
                        text_of(sources, function.body.span),
                    ),
                    LineKind::Check(_) | LineKind::Invalid | LineKind::Include(_) => {
                        (None, text_of(sources, line.span).trim().to_string())
                    }
                    _ => (None, String::new()),
                };
                LineOutcome {
                    number: line.number,
                    name,
                    expression,
                    comment: line.comment.clone(),
                    result: result.unwrap_or(LineResult::Error),
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
        }
    }

    /// The value of an expression; names resolve through the parameters of the function being
    /// called, then `scope`, then the library.
    pub(crate) fn expression(
        &mut self,
        expression: &Expression,
        scope: &dyn Scope,
    ) -> Result<Quantity, Failure> {
        let span = expression.span;
        let quantity = match &expression.kind {
            ExpressionKind::Quantity { digits, unit } => {
                self.literal(digits, unit.as_ref(), span)?
            }
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
            } => {
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
                    values.push(self.expression(argument, scope)?);
                }
                self.calls.push(CallRecord {
                    function: function.text.clone(),
                    span,
                    arguments: arguments
                        .iter()
                        .map(|argument| argument.span)
                        .zip(values.iter().copied())
                        .collect(),
                });
                callee
                    .call(&values, &mut self.provenance)
                    .map_err(|error| {
                        let at = match &error {
                            CallError::WrongDimension { argument, .. } => Some(*argument),
                            CallError::Domain { argument, .. }
                            | CallError::OutOfRange { argument, .. } => *argument,
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
                    })?
            }
            ExpressionKind::Negate(inner) => {
                let value = self.expression(inner, scope)?;
                let temperature = match value.temperature {
                    TemperatureKind::Difference => TemperatureKind::Difference,
                    _ => TemperatureKind::Unspecified,
                };
                Quantity {
                    value: -value.value,
                    temperature,
                    ..value
                }
            }
            ExpressionKind::Binary {
                operator,
                left,
                right,
            } => {
                let left_value = self.expression(left, scope)?;
                let right_value = self.expression(right, scope)?;
                binary(*operator, left_value, right_value, span, right.span)?
            }
        };
        if !quantity.value.is_finite() {
            return Err(EvalError::new(EvalErrorKind::NotFinite, span).into());
        }
        Ok(quantity)
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
        let temperature = match unit.temperature {
            TemperatureRole::Absolute => TemperatureKind::Absolute,
            TemperatureRole::Difference => TemperatureKind::Difference,
            TemperatureRole::None => TemperatureKind::Unspecified,
        };
        let value = unit.to_si(number, Some(digits));
        if !value.is_finite() {
            return Err(EvalError::new(EvalErrorKind::NotFinite, span).into());
        }
        Ok(Quantity {
            value,
            dimension: unit.dimension,
            temperature,
        })
    }

    fn name(&mut self, name: &str, span: Span, scope: &dyn Scope) -> Result<Quantity, Failure> {
        if let Some(parameters) = self.parameters.last() {
            if let Some((_, value)) = parameters.iter().find(|(parameter, _)| parameter == name) {
                return Ok(*value);
            }
        }
        if let Some(slot) = scope.lookup(name) {
            return match slot {
                Some(shown) => Ok(shown.quantity),
                None => Err(Failure::Upstream(name.to_string())),
            };
        }
        if let Some(constant) = self.library.constant(name) {
            return Ok(constant.quantity);
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
    ) -> Result<ShownValue, Failure> {
        let quantity = self.expression(expression, scope)?;
        self.shown(quantity, declared, expression, scope)
            .map_err(Failure::from)
    }

    /// Converts a value to its display unit: the declared one (checked), a literal's own unit,
    /// or the preferred SI unit.
    pub(crate) fn shown(
        &mut self,
        quantity: Quantity,
        declared: Option<&UnitExpression>,
        expression: &Expression,
        scope: &dyn Scope,
    ) -> Result<ShownValue, EvalError> {
        let written = match (&expression.kind, declared) {
            (_, Some(declared)) => Some(declared),
            (
                ExpressionKind::Quantity {
                    unit: Some(unit), ..
                },
                None,
            ) => Some(unit),
            // A call of a sheet function that declares its result unit shows in that unit.
            (ExpressionKind::Call { function, .. }, None) => scope
                .sheet_function(&function.text)
                .flatten()
                .and_then(|definition| definition.result_unit.as_ref()),
            _ => None,
        };
        let Some(unit_expression) = written else {
            // A bare name (`y = x`, or `x` alone) shows in the unit its own line shows in.
            if let ExpressionKind::Name(name) = &expression.kind {
                if let Some(shown) = shown_like(quantity, name, scope, expression.span) {
                    return Ok(shown);
                }
            }
            return Ok(ShownValue {
                quantity,
                unit: quantity.dimension.preferred_si_unit(),
                value: quantity.value,
            });
        };
        let unit = self.unit(unit_expression)?;
        show_in(quantity, &unit, &unit_expression.text, unit_expression.span)
    }

    /// The unit a check shows both sides in: the right side's if it has one of its own.
    fn shown_for_check(
        &mut self,
        quantity: Quantity,
        sides: [&Expression; 2],
        scope: &dyn Scope,
    ) -> Result<ShownValue, EvalError> {
        for side in sides {
            match &side.kind {
                ExpressionKind::Quantity { unit: Some(_), .. } => {
                    return self.shown(quantity, None, side, scope)
                }
                ExpressionKind::Name(name) => {
                    if let Some(shown) = shown_like(quantity, name, scope, side.span) {
                        return Ok(shown);
                    }
                }
                _ => {}
            }
        }
        Ok(ShownValue {
            quantity,
            unit: quantity.dimension.preferred_si_unit(),
            value: quantity.value,
        })
    }

    /// Decides a check line.
    pub(crate) fn check(
        &mut self,
        check: &Check,
        scope: &dyn Scope,
    ) -> Result<CheckOutcome, Failure> {
        let left = self.expression(&check.left, scope)?;
        let right = self.expression(&check.right, scope)?;
        if left.dimension != right.dimension {
            return Err(EvalError::new(
                EvalErrorKind::DimensionMismatch {
                    operation: Operation::Compare,
                    left: left.dimension,
                    right: right.dimension,
                },
                check.left.span.to(check.right.span),
            )
            .into());
        }
        let allowance = match &check.tolerance {
            None if matches!(check.comparison, Comparison::Equal | Comparison::NotEqual) => {
                DEFAULT_EQUALITY_TOLERANCE * right.value.abs().max(left.value.abs())
            }
            None => 0.0,
            Some(tolerance) => {
                let value = self.expression(tolerance, scope)?;
                if value.value < 0.0 {
                    return Err(
                        EvalError::new(EvalErrorKind::NegativeTolerance, tolerance.span).into(),
                    );
                }
                if value.dimension.is_dimensionless() {
                    value.value * right.value.abs()
                } else if value.dimension == right.dimension {
                    value.value
                } else {
                    return Err(EvalError::new(
                        EvalErrorKind::ToleranceDimension {
                            found: value.dimension,
                            sides: right.dimension,
                        },
                        tolerance.span,
                    )
                    .into());
                }
            }
        };
        let (l, r) = (left.value, right.value);
        let passed = match check.comparison {
            Comparison::Less => l < r + allowance,
            Comparison::LessOrEqual => l <= r + allowance,
            Comparison::Greater => l > r - allowance,
            Comparison::GreaterOrEqual => l >= r - allowance,
            Comparison::Equal => (l - r).abs() <= allowance,
            Comparison::NotEqual => (l - r).abs() > allowance,
        };
        let right_shown = self.shown_for_check(right, [&check.right, &check.left], scope)?;
        let left_shown = self.shown_for_check(left, [&check.right, &check.left], scope)?;
        Ok(CheckOutcome {
            passed,
            comparison: check.comparison,
            left: left_shown,
            right: right_shown,
            tolerance: check.tolerance_text.clone(),
            message: check.message.clone(),
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
    ) -> Result<Quantity, Failure> {
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
                if unit.dimension != value.dimension {
                    let kind = EvalErrorKind::ParameterDimension {
                        function: name.text.clone(),
                        parameter: parameter.name.text.clone(),
                        expected: unit.dimension,
                        found: value.dimension,
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
            if unit.dimension != value.dimension {
                let kind = EvalErrorKind::ResultDimension {
                    function: name.text.clone(),
                    expected: unit.dimension,
                    found: value.dimension,
                };
                return Err(EvalError::new(kind, span)
                    .with_label(unit_span(definition), "declared here")
                    .into());
            }
        }
        Ok(value)
    }
}

/// `quantity` in the unit the line named `name` shows in, when that works (same dimension and
/// temperature rules).
fn shown_like(quantity: Quantity, name: &str, scope: &dyn Scope, span: Span) -> Option<ShownValue> {
    let Some(Some(line)) = scope.lookup(name) else {
        return None;
    };
    let expression = crate::syntax::parse_unit(&line.unit).ok()?;
    let unit = resolve_unit(&expression).ok()?;
    show_in(quantity, &unit, &line.unit, span).ok()
}

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

fn binary(
    operator: BinaryOperator,
    left: Quantity,
    right: Quantity,
    span: Span,
    right_span: Span,
) -> Result<Quantity, EvalError> {
    use TemperatureKind::{Absolute, Difference, Unspecified};
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
                match (adding, left.temperature, right.temperature) {
                    (true, Absolute, Absolute) => {
                        return Err(error(EvalErrorKind::AbsoluteTemperatureSum))
                    }
                    (true, Absolute, _) | (true, _, Absolute) => Absolute,
                    (false, Absolute | Unspecified, Absolute) => Difference,
                    (false, Difference, Absolute) => {
                        return Err(error(EvalErrorKind::AbsoluteFromDifference))
                    }
                    (false, Absolute, _) => Absolute,
                    (_, Difference, _) | (_, _, Difference) => Difference,
                    _ => Unspecified,
                }
            } else {
                Unspecified
            };
            let value = if adding {
                left.value + right.value
            } else {
                left.value - right.value
            };
            Ok(Quantity {
                value,
                dimension: left.dimension,
                temperature,
            })
        }
        BinaryOperator::Multiply => {
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
