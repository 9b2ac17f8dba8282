//! Evaluation errors: a kind holding the data its message needs, and the span of the failing
//! expression. All wording is in the one `Display` below.

use super::diagnostic::Diagnostic;
use super::function::CallError;
use super::value::OffsetScale;
use crate::syntax::Span;
use crate::units::Dimension;
use std::fmt;

#[derive(Debug, Clone, PartialEq)]
pub struct EvalError {
    /// Boxed so that `Result<_, EvalError>` stays small on the evaluator's hot path.
    pub kind: Box<EvalErrorKind>,
    pub span: Span,
    /// Other places worth showing: a function's definition for an error in a call.
    pub labels: Vec<(Span, String)>,
    /// The row of a column the error happened in: 1-based row and the column's origin line
    /// (boxed: rare, and errors travel the evaluator's hot path).
    pub row: Option<Box<(usize, String)>>,
    /// The rows are samples of `run --samples` (and `row` counts over all of them).
    pub in_samples: bool,
}

#[derive(Debug, Clone, PartialEq)]
pub enum EvalErrorKind {
    UnknownName {
        name: String,
        suggestion: Option<String>,
    },
    UnknownFunction {
        name: String,
        suggestion: Option<String>,
    },
    FunctionUsedAsValue {
        name: String,
    },
    NameCalledAsFunction {
        name: String,
    },
    UnknownUnit {
        symbol: String,
        suggestions: Vec<String>,
    },
    /// `a`, `ton`: a spelling the trade uses for more than one unit.
    AmbiguousUnit {
        symbol: String,
        choices: Vec<(String, String)>,
    },
    /// `PA`: a prefixed reading (peta-ampere) that exists only because of case, beside `Pa`.
    CaseOnlyUnit {
        symbol: String,
        reading: String,
        suggestion: String,
        suggestion_name: String,
    },
    DuplicateDefinition {
        name: String,
        first_line: usize,
        first_span: Span,
    },
    Cycle {
        path: Vec<String>,
    },
    DimensionMismatch {
        operation: Operation,
        left: Dimension,
        right: Dimension,
    },
    DisplayUnitMismatch {
        unit: String,
        unit_dimension: Dimension,
        value_dimension: Dimension,
    },
    ExponentNotDimensionless {
        found: Dimension,
    },
    ExponentNotRational {
        value: f64,
    },
    ExponentOverflow,
    DivisionByZero,
    NotFinite,
    AbsoluteTemperatureSum,
    AbsoluteFromDifference,
    /// An absolute temperature from an offset scale (`60 degC`) multiplied, divided, raised to
    /// a power, negated or passed to a function that does not take a temperature.
    OffsetTemperature {
        /// The operand as written (`dT`, `10 degC`), when it is a name or a literal.
        operand: Option<String>,
        scale: OffsetScale,
        kelvin: f64,
        /// What was done to it: `multiplied`, `divided`, `passed to `sqrt``.
        operation: String,
    },
    /// An absolute temperature below 0 K, made or shown.
    BelowAbsoluteZero {
        kelvin: f64,
        /// The scale it was written on, to say it back in the user's numbers.
        scale: Option<OffsetScale>,
    },
    DifferenceShownAsAbsolute {
        unit: String,
    },
    AbsoluteShownAsDifference {
        unit: String,
    },
    ToleranceDimension {
        found: Dimension,
        sides: Dimension,
    },
    NegativeTolerance,
    /// A relative tolerance of 100 % or more: any value of the right sign would pass.
    ToleranceTooLarge,
    Call {
        function: String,
        error: CallError,
    },
    SheetFunctionArguments {
        function: String,
        expected: usize,
        found: usize,
    },
    ParameterDimension {
        function: String,
        parameter: String,
        expected: Dimension,
        found: Dimension,
    },
    ResultDimension {
        function: String,
        expected: Dimension,
        found: Dimension,
    },
    RecursiveFunction {
        path: Vec<String>,
    },
    Include {
        message: String,
    },
    /// An include chain deeper than [`super::INCLUDE_DEPTH_LIMIT`].
    IncludeTooDeep {
        limit: usize,
    },
    IncludeCycle {
        chain: Vec<String>,
    },
    /// Two columns of different lengths in one operation.
    ColumnLengths {
        left_rows: usize,
        left_origin: String,
        right_rows: usize,
        right_origin: String,
    },
    /// A text column (sample names) used as a number.
    TextInArithmetic {
        origin: String,
    },
    /// A column where one value is needed (a range's end, an exponent with a unit, ...).
    ScalarNeeded {
        what: &'static str,
    },
    BadRange {
        message: String,
    },
    TooManyRows {
        rows: f64,
        limit: usize,
    },
    /// A column that would take the sheet's columns past their total row limit.
    TooManyRowsInAll {
        rows: usize,
        kept: usize,
        limit: usize,
    },
    /// A column the allocator refused: the machine has no memory for it.
    NoMemoryForColumn {
        rows: usize,
    },
    /// A data file that cannot be read, or a bad cell in it.
    DataFile {
        message: String,
    },
    Solve {
        message: String,
    },
    /// A `fit` line that cannot run or cannot give an answer.
    Fit {
        message: String,
    },
    /// A `--set` override that names no input line, or has the wrong dimension.
    Override {
        message: String,
    },
    Plot {
        message: String,
    },
    /// A distribution whose parameters do not make one (wrong dimensions, order, signs).
    Distribution {
        message: String,
    },
    /// Something a sampled sheet cannot hold: the rows of its columns are the samples.
    NotWithSamples {
        what: &'static str,
    },
}

/// The operation that found two dimensions at odds.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Operation {
    Add,
    Subtract,
    Compare,
}

impl EvalError {
    pub fn new(kind: EvalErrorKind, span: Span) -> EvalError {
        EvalError {
            kind: Box::new(kind),
            span,
            labels: Vec::new(),
            row: None,
            in_samples: false,
        }
    }

    /// Marks the error as happening in row `row` (0-based) of the column from `origin`.
    pub fn in_row(mut self, row: usize, origin: &str) -> EvalError {
        if self.row.is_none() {
            self.row = Some(Box::new((row + 1, origin.to_string())));
        }
        self
    }

    /// Marks the rows as samples of `run --samples`, the first of this block being sample
    /// `first_sample + 1`.
    pub fn in_samples(mut self, first_sample: usize) -> EvalError {
        if let Some(row) = self.row.as_mut() {
            row.0 += first_sample;
        }
        self.in_samples = true;
        self
    }

    pub fn with_label(mut self, span: Span, message: impl Into<String>) -> EvalError {
        self.labels.push((span, message.into()));
        self
    }

    /// The diagnostic: message, extra labels and a help line where one helps.
    pub fn to_diagnostic(&self) -> Diagnostic {
        let mut diagnostic = Diagnostic::error(self.to_string(), self.span);
        for (span, message) in &self.labels {
            diagnostic = diagnostic.with_label(*span, message.clone());
        }
        match self.kind.as_ref() {
            EvalErrorKind::DuplicateDefinition { first_span, .. } => {
                diagnostic.with_label(*first_span, "first defined here")
            }
            EvalErrorKind::UnknownName { suggestion, .. } | EvalErrorKind::UnknownFunction { suggestion, .. } => {
                diagnostic.with_help(suggestion.as_ref().map(|name| format!("did you mean `{name}`?")))
            }
            EvalErrorKind::UnknownUnit { suggestions, .. } if !suggestions.is_empty() => {
                let list = suggestions.iter().map(|symbol| format!("`{symbol}`")).collect::<Vec<_>>();
                diagnostic.with_help(Some(format!("did you mean {}? (`fluxsheet units` lists them all); a product of a number and a name needs `*`", list.join(", "))))
            }
            EvalErrorKind::CaseOnlyUnit { suggestion, suggestion_name, .. } => diagnostic.with_help(Some(format!(
                "did you mean `{suggestion}` ({suggestion_name})? Unit symbols are case-sensitive; if the prefixed unit is really meant, write the power of ten times the base unit"
            ))),
            EvalErrorKind::UnknownUnit { .. } => diagnostic.with_help(Some(
                "`fluxsheet units` lists the known units; a product of a number and a name needs `*`".to_string(),
            )),
            EvalErrorKind::DifferenceShownAsAbsolute { .. } => diagnostic.with_help(Some(
                "a temperature difference shows in `[K]` or `[delta_degC]`".to_string(),
            )),
            EvalErrorKind::AbsoluteShownAsDifference { .. } => diagnostic
                .with_help(Some("an absolute temperature shows in `[degC]`, `[degF]` or `[K]`".to_string())),
            EvalErrorKind::OffsetTemperature { operand, scale, kelvin, .. } => {
                let written = message_number(scale.from_kelvin(*kelvin));
                let difference = match scale {
                    OffsetScale::Celsius => format!("`{written} K` or `{written} delta_degC`"),
                    OffsetScale::Fahrenheit => format!("`{written} delta_degF`"),
                };
                let absolute = match operand {
                    Some(operand) => format!("`kelvin({operand})` ({} K)", message_number(*kelvin)),
                    None => "`kelvin(…)` around it".to_string(),
                };
                diagnostic.with_help(Some(format!(
                    "for a temperature difference of {written} degrees write {difference}; for the absolute temperature in kelvin write {absolute}"
                )))
            }
            EvalErrorKind::BelowAbsoluteZero { .. } => diagnostic.with_help(Some(
                "absolute zero is 0 K, -273.15 degC or -459.67 degF; a temperature difference is written `5 K` or `5 delta_degC`".to_string(),
            )),
            EvalErrorKind::AbsoluteTemperatureSum => diagnostic.with_help(Some(
                "subtract them for a difference, or add a difference such as `5 delta_degC`".to_string(),
            )),
            _ => diagnostic,
        }
    }
}

impl fmt::Display for EvalError {
    fn fmt(&self, formatter: &mut fmt::Formatter<'_>) -> fmt::Result {
        self.kind.fmt(formatter)?;
        match self.row.as_deref() {
            Some((sample, _)) if self.in_samples => write!(formatter, " (in sample {sample})"),
            Some((row, origin)) if origin.is_empty() => write!(formatter, " (in row {row})"),
            Some((row, origin)) => write!(formatter, " (in row {row} of `{origin}`)"),
            None => Ok(()),
        }
    }
}

impl fmt::Display for EvalErrorKind {
    fn fmt(&self, formatter: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            EvalErrorKind::UnknownName { name, .. } => write!(formatter, "unknown name `{name}`"),
            EvalErrorKind::UnknownFunction { name, .. } => write!(formatter, "unknown function `{name}`"),
            EvalErrorKind::FunctionUsedAsValue { name } => {
                write!(formatter, "`{name}` is a function; call it with arguments, e.g. `{name}(x)`")
            }
            EvalErrorKind::NameCalledAsFunction { name } => {
                write!(formatter, "`{name}` is a value, not a function; use `*` to multiply")
            }
            EvalErrorKind::UnknownUnit { symbol, .. } => write!(formatter, "unknown unit `{symbol}`"),
            EvalErrorKind::AmbiguousUnit { symbol, choices } => write!(
                formatter,
                "`{symbol}` means more than one unit in the trade: write {}",
                choices
                    .iter()
                    .map(|(choice, meaning)| format!("`{choice}` for {meaning}"))
                    .collect::<Vec<_>>()
                    .join(" or ")
            ),
            EvalErrorKind::CaseOnlyUnit { symbol, reading, .. } => write!(
                formatter,
                "unit `{symbol}` would be read as {reading}: it differs from a catalog unit only by letter case"
            ),
            EvalErrorKind::DuplicateDefinition { name, first_line, .. } => {
                write!(formatter, "`{name}` is already defined on line {first_line}")
            }
            EvalErrorKind::Cycle { path } => {
                write!(formatter, "circular definition: {}", path.iter().map(|name| format!("`{name}`")).collect::<Vec<_>>().join(" -> "))
            }
            EvalErrorKind::DimensionMismatch { operation, left, right } => match operation {
                Operation::Add => write!(formatter, "cannot add {} to {}", right.phrase(), left.phrase()),
                Operation::Subtract => {
                    write!(formatter, "cannot subtract {} from {}", right.phrase(), left.phrase())
                }
                Operation::Compare => write!(formatter, "cannot compare {} with {}", left.phrase(), right.phrase()),
            },
            EvalErrorKind::DisplayUnitMismatch { unit, unit_dimension, value_dimension } => write!(
                formatter,
                "cannot show {} in `{unit}`, which is {}",
                value_dimension.phrase(),
                unit_dimension.phrase()
            ),
            EvalErrorKind::ExponentNotDimensionless { found } => {
                write!(formatter, "an exponent must be dimensionless, found {}", found.phrase())
            }
            EvalErrorKind::ExponentNotRational { value } => write!(
                formatter,
                "a quantity with a unit can only be raised to a simple fraction (such as 2, -1 or 1/2), not {value}"
            ),
            EvalErrorKind::ExponentOverflow => formatter.write_str("the unit's exponents grow too large"),
            EvalErrorKind::DivisionByZero => formatter.write_str("division by zero"),
            EvalErrorKind::NotFinite => formatter.write_str("the result is not a finite number (overflow)"),
            EvalErrorKind::AbsoluteTemperatureSum => formatter.write_str("cannot add two absolute temperatures"),
            EvalErrorKind::OffsetTemperature { operand, scale, kelvin, operation } => {
                let written = format!("{} {}", message_number(scale.from_kelvin(*kelvin)), scale.symbol());
                let named = match operand {
                    Some(operand) if *operand != written => format!(" (`{operand}`)"),
                    _ => String::new(),
                };
                write!(
                    formatter,
                    "an absolute temperature of {written}{named} cannot be {operation} as if it were {} K: say whether a difference or kelvin is meant",
                    message_number(*kelvin)
                )
            }
            EvalErrorKind::BelowAbsoluteZero { kelvin, scale } => match scale {
                Some(scale) => write!(
                    formatter,
                    "{} {} is below absolute zero ({} K)",
                    message_number(scale.from_kelvin(*kelvin)),
                    scale.symbol(),
                    message_number(*kelvin)
                ),
                None => write!(formatter, "{} K is below absolute zero", message_number(*kelvin)),
            },
            EvalErrorKind::AbsoluteFromDifference => {
                formatter.write_str("cannot subtract an absolute temperature from a temperature difference")
            }
            EvalErrorKind::DifferenceShownAsAbsolute { unit } => {
                write!(formatter, "a temperature difference cannot be shown in `{unit}`, an absolute scale")
            }
            EvalErrorKind::AbsoluteShownAsDifference { unit } => {
                write!(formatter, "an absolute temperature cannot be shown in `{unit}`, a difference unit")
            }
            EvalErrorKind::ToleranceDimension { found, sides } => write!(
                formatter,
                "a tolerance must be a fraction (`1 %`) or {}, found {}",
                sides.phrase(),
                found.phrase()
            ),
            EvalErrorKind::NegativeTolerance => formatter.write_str("a tolerance cannot be negative"),
            EvalErrorKind::ToleranceTooLarge => formatter.write_str(
                "a relative tolerance must be below 100 %: a larger one lets any value of the right sign pass (give an absolute tolerance with a unit instead)",
            ),
            EvalErrorKind::Call { function, error } => write!(formatter, "`{function}`: {error}"),
            EvalErrorKind::SheetFunctionArguments { function, expected, found } => {
                write!(formatter, "`{function}` takes {expected} argument(s), but {found} were given")
            }
            EvalErrorKind::ParameterDimension { function, parameter, expected, found } => write!(
                formatter,
                "`{function}`: parameter `{parameter}` must be {}, found {}",
                expected.phrase(),
                found.phrase()
            ),
            EvalErrorKind::ResultDimension { function, expected, found } => write!(
                formatter,
                "`{function}` should give {}, but its body gives {}",
                expected.phrase(),
                found.phrase()
            ),
            EvalErrorKind::RecursiveFunction { path } => write!(
                formatter,
                "recursive function: {} (a function may not call itself)",
                path.iter().map(|name| format!("`{name}`")).collect::<Vec<_>>().join(" -> ")
            ),
            EvalErrorKind::Include { message } => write!(formatter, "cannot include: {message}"),
            EvalErrorKind::IncludeTooDeep { limit } => write!(
                formatter,
                "includes are nested more than {limit} sheets deep, the limit"
            ),
            EvalErrorKind::IncludeCycle { chain } => write!(
                formatter,
                "include cycle: {}",
                chain.iter().map(|name| format!("`{name}`")).collect::<Vec<_>>().join(" includes ")
            ),
            EvalErrorKind::ColumnLengths { left_rows, left_origin, right_rows, right_origin } => {
                // A list or range written in place has no line to name.
                let from = |origin: &str| match origin {
                    "" => String::new(),
                    origin => format!(" (from `{origin}`)"),
                };
                write!(
                    formatter,
                    "columns of different lengths: {left_rows} rows{} and {right_rows} rows{}",
                    from(left_origin),
                    from(right_origin)
                )
            }
            EvalErrorKind::TextInArithmetic { origin } => {
                write!(formatter, "`{origin}` is a column of text; only numbers take part in calculations")
            }
            EvalErrorKind::ScalarNeeded { what } => write!(formatter, "{what} must be a single value, not a column"),
            EvalErrorKind::BadRange { message }
            | EvalErrorKind::DataFile { message }
            | EvalErrorKind::Solve { message }
            | EvalErrorKind::Fit { message }
            | EvalErrorKind::Override { message }
            | EvalErrorKind::Plot { message }
            | EvalErrorKind::Distribution { message } => formatter.write_str(message),
            EvalErrorKind::NotWithSamples { what } => write!(
                formatter,
                "{what} cannot be sampled with `--samples` yet: the rows of a sampled sheet's columns are its samples"
            ),
            EvalErrorKind::TooManyRows { rows, limit } => write!(
                formatter,
                "a column of {rows} rows is longer than the limit of {limit} rows (raise it with `--max-rows`)"
            ),
            EvalErrorKind::TooManyRowsInAll { rows, kept, limit } => write!(
                formatter,
                "a column of {rows} rows would take the sheet's columns to {} rows in all, over the limit of {limit} (raise it with `--max-total-rows`)",
                kept.saturating_add(*rows)
            ),
            EvalErrorKind::NoMemoryForColumn { rows } => write!(
                formatter,
                "not enough memory for a column of {rows} rows"
            ),
        }
    }
}

pub use crate::numeric::message_number;
