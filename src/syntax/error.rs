//! Syntax errors: where the text stopped making sense and what would have been accepted there.

use super::span::Span;
use std::fmt;

#[derive(Debug, Clone, PartialEq)]
pub struct SyntaxError {
    pub kind: SyntaxErrorKind,
    pub span: Span,
}

#[derive(Debug, Clone, PartialEq)]
pub enum SyntaxErrorKind {
    /// The parser expected one of these (already in user words) and found something else.
    Unexpected {
        expected: Vec<&'static str>,
        found: Option<String>,
    },
    /// Parentheses or brackets nested deeper than the parser's limit.
    NestingTooDeep { limit: usize },
    /// More operators on one line than the evaluator takes.
    ExpressionTooLong { limit: usize },
    /// A unit exponent that is not a small rational, e.g. `m^(1/0)`.
    BadExponent { text: String },
    /// A unit exponent beyond the limit, e.g. `m^1000000`.
    ExponentTooLarge { text: String, limit: u32 },
    /// `2 m^ 2`: a `^` touching a unit, then a space; ambiguous between a unit power and a
    /// power of the quantity.
    SpacedUnitPower { unit: String },
    /// `f(x, x)`: a parameter named twice.
    DuplicateParameter { name: String },
}

impl fmt::Display for SyntaxError {
    fn fmt(&self, formatter: &mut fmt::Formatter<'_>) -> fmt::Result {
        match &self.kind {
            SyntaxErrorKind::Unexpected { expected, found } => {
                let found = match found {
                    Some(text) => format!("`{text}`"),
                    None => "the end of the line".to_string(),
                };
                match expected.as_slice() {
                    [] => write!(formatter, "unexpected {found}"),
                    [only] => write!(formatter, "expected {only}, found {found}"),
                    [first @ .., last] => {
                        write!(
                            formatter,
                            "expected {} or {last}, found {found}",
                            first.join(", ")
                        )
                    }
                }
            }
            SyntaxErrorKind::NestingTooDeep { limit } => {
                write!(
                    formatter,
                    "nesting too deep: more than {limit} levels of parentheses"
                )
            }
            SyntaxErrorKind::ExpressionTooLong { limit } => {
                write!(
                    formatter,
                    "expression too long: more than {limit} operators on one line"
                )
            }
            SyntaxErrorKind::BadExponent { text } => {
                write!(
                    formatter,
                    "unit exponent `{text}` is not a whole number or a fraction like (1/2)"
                )
            }
            SyntaxErrorKind::ExponentTooLarge { text, limit } => {
                write!(
                    formatter,
                    "unit exponent `{text}` is too large: exponents are limited to {limit} in size"
                )
            }
            SyntaxErrorKind::DuplicateParameter { name } => {
                write!(formatter, "parameter `{name}` is named twice")
            }
            SyntaxErrorKind::SpacedUnitPower { unit } => {
                write!(
                    formatter,
                    "a space after `{unit}^`: write a unit power without spaces (`{unit}^2`), \
                     or a power of the quantity in parentheses (`(2 {unit})^2`)"
                )
            }
        }
    }
}
