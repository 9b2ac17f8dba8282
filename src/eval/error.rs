//! Evaluation errors: a kind holding the data its message needs, and the span of the failing
//! expression. All wording is in the one `Display` below.

use super::diagnostic::Diagnostic;
use super::function::{describe_dimension, CallError};
use crate::syntax::Span;
use crate::units::Dimension;
use std::fmt;

#[derive(Debug, Clone, PartialEq)]
pub struct EvalError {
    /// Boxed so that `Result<_, EvalError>` stays small on the evaluator's hot path.
    pub kind: Box<EvalErrorKind>,
    pub span: Span,
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
    Call {
        function: String,
        error: CallError,
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
        }
    }

    /// The diagnostic: message, extra labels and a help line where one helps.
    pub fn to_diagnostic(&self) -> Diagnostic {
        let diagnostic = Diagnostic::error(self.to_string(), self.span);
        match self.kind.as_ref() {
            EvalErrorKind::DuplicateDefinition { first_span, .. } => {
                diagnostic.with_label(*first_span, "first defined here")
            }
            EvalErrorKind::UnknownName { suggestion, .. } | EvalErrorKind::UnknownFunction { suggestion, .. } => {
                diagnostic.with_help(suggestion.as_ref().map(|name| format!("did you mean `{name}`?")))
            }
            EvalErrorKind::UnknownUnit { suggestions, .. } if !suggestions.is_empty() => {
                let list = suggestions.iter().map(|symbol| format!("`{symbol}`")).collect::<Vec<_>>();
                diagnostic.with_help(Some(format!("did you mean {}? (`fluxsheet units` lists them all)", list.join(", "))))
            }
            EvalErrorKind::UnknownUnit { .. } => diagnostic.with_help(Some(
                "`fluxsheet units` lists the known units; a product of a number and a name needs `*`".to_string(),
            )),
            EvalErrorKind::DifferenceShownAsAbsolute { .. } => diagnostic.with_help(Some(
                "a temperature difference shows in `[K]` or `[delta_degC]`".to_string(),
            )),
            EvalErrorKind::AbsoluteShownAsDifference { .. } => diagnostic
                .with_help(Some("an absolute temperature shows in `[degC]`, `[degF]` or `[K]`".to_string())),
            EvalErrorKind::AbsoluteTemperatureSum => diagnostic.with_help(Some(
                "subtract them for a difference, or add a difference such as `5 delta_degC`".to_string(),
            )),
            _ => diagnostic,
        }
    }
}

/// `a velocity (m/s)`, the wording of dimension errors.
fn with_unit(dimension: &Dimension) -> String {
    match dimension.quantity_name() {
        Some("dimensionless") => "a dimensionless number".to_string(),
        Some(name) => {
            let article = if name.starts_with(['a', 'e', 'i', 'o', 'u']) {
                "an"
            } else {
                "a"
            };
            format!("{article} {name} ({})", dimension.preferred_si_unit())
        }
        None => format!(
            "a quantity of dimension {dimension} ({})",
            dimension.preferred_si_unit()
        ),
    }
}

impl fmt::Display for EvalError {
    fn fmt(&self, formatter: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self.kind.as_ref() {
            EvalErrorKind::UnknownName { name, .. } => write!(formatter, "unknown name `{name}`"),
            EvalErrorKind::UnknownFunction { name, .. } => write!(formatter, "unknown function `{name}`"),
            EvalErrorKind::FunctionUsedAsValue { name } => {
                write!(formatter, "`{name}` is a function; call it with arguments, e.g. `{name}(x)`")
            }
            EvalErrorKind::NameCalledAsFunction { name } => {
                write!(formatter, "`{name}` is a value, not a function; use `*` to multiply")
            }
            EvalErrorKind::UnknownUnit { symbol, .. } => write!(formatter, "unknown unit `{symbol}`"),
            EvalErrorKind::DuplicateDefinition { name, first_line, .. } => {
                write!(formatter, "`{name}` is already defined on line {first_line}")
            }
            EvalErrorKind::Cycle { path } => {
                write!(formatter, "circular definition: {}", path.iter().map(|name| format!("`{name}`")).collect::<Vec<_>>().join(" -> "))
            }
            EvalErrorKind::DimensionMismatch { operation, left, right } => match operation {
                Operation::Add => write!(formatter, "cannot add {} to {}", with_unit(right), with_unit(left)),
                Operation::Subtract => {
                    write!(formatter, "cannot subtract {} from {}", with_unit(right), with_unit(left))
                }
                Operation::Compare => write!(formatter, "cannot compare {} with {}", with_unit(left), with_unit(right)),
            },
            EvalErrorKind::DisplayUnitMismatch { unit, unit_dimension, value_dimension } => write!(
                formatter,
                "cannot show {} in `{unit}`, which is {}",
                with_unit(value_dimension),
                describe_dimension(unit_dimension)
            ),
            EvalErrorKind::ExponentNotDimensionless { found } => {
                write!(formatter, "an exponent must be dimensionless, found {}", with_unit(found))
            }
            EvalErrorKind::ExponentNotRational { value } => write!(
                formatter,
                "a quantity with a unit can only be raised to a simple fraction (such as 2, -1 or 1/2), not {value}"
            ),
            EvalErrorKind::ExponentOverflow => formatter.write_str("the unit's exponents grow too large"),
            EvalErrorKind::DivisionByZero => formatter.write_str("division by zero"),
            EvalErrorKind::NotFinite => formatter.write_str("the result is not a finite number (overflow)"),
            EvalErrorKind::AbsoluteTemperatureSum => formatter.write_str("cannot add two absolute temperatures"),
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
                with_unit(sides),
                with_unit(found)
            ),
            EvalErrorKind::NegativeTolerance => formatter.write_str("a tolerance cannot be negative"),
            EvalErrorKind::Call { function, error } => write!(formatter, "`{function}`: {error}"),
        }
    }
}
