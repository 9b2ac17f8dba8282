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
        /// The fix for a natural wrong attempt, in the line's own words (`write K [m/s] = 3
        /// ft/d`), when the line looks like one.
        hint: Option<String>,
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
            SyntaxErrorKind::Unexpected {
                expected, found, ..
            } => {
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

impl SyntaxError {
    /// The fix to show beside the message, if the line looks like a known wrong attempt.
    pub fn hint(&self) -> Option<&str> {
        match &self.kind {
            SyntaxErrorKind::Unexpected { hint, .. } => hint.as_deref(),
            _ => None,
        }
    }
}

/// The fix for a line that looks like a natural wrong attempt (`K = 3 ft/d [m/s]`,
/// `3 ft/d to m/s`, `x := 1`): the corrected line in the user's own words, or what to write.
pub fn hint_for(line: &str) -> Option<String> {
    let text = line.split(" #").next().unwrap_or(line).trim();
    let (left, right) = match text.split_once('=') {
        Some((left, right)) if !right.starts_with('=') && !left.ends_with(['<', '>', '!', ':']) => {
            (Some(left.trim()), right.trim())
        }
        _ => (None, text),
    };
    // `K = 3 ft/d [m/s]`: the display unit goes after the name.
    if let (Some(name), Some(open)) = (left, right.rfind('[')) {
        if right.ends_with(']') && !name.contains('[') && !name.contains('(') && open > 0 {
            let unit = &right[open..];
            let value = right[..open].trim();
            return Some(format!(
                "a line's display unit goes after its name: `{name} {unit} = {value}`"
            ));
        }
    }
    // `3 ft/d to m/s`: a conversion, not a range.
    if let Some((value, unit)) = right.rsplit_once(" to ") {
        let unit = unit.trim();
        let is_unit = !unit.is_empty()
            && !unit.contains(' ')
            && !unit.starts_with(|character: char| character.is_ascii_digit() || character == '-');
        if is_unit {
            let shown = match left {
                Some(name) => format!("{name} [{unit}] = {}", value.trim()),
                None => format!("{} [{unit}]", value.trim()),
            };
            return Some(format!(
                "to convert, put the unit in brackets: `{shown}` (a range needs `step` or `count`)"
            ));
        }
    }
    if let Some(rest) = text.strip_prefix("let ") {
        return Some(format!("a line is `name = value`: `{rest}`"));
    }
    if let Some((name, value)) = text.split_once(":=") {
        return Some(format!(
            "a line is `name = value`: `{} = {}`",
            name.trim(),
            value.trim()
        ));
    }
    if let Some((name, value)) = text.split_once("==") {
        if !text.starts_with("check ") {
            return Some(format!(
                "`==` compares in a check line: `check {} == {}`; `=` defines a line",
                name.trim(),
                value.trim()
            ));
        }
    }
    if text.starts_with("check ") && text.contains(" = ") && !text.contains("==") {
        return Some(format!(
            "a check compares with `==`: `{}`",
            text.replacen(" = ", " == ", 1)
        ));
    }
    if text.starts_with("check ") && !text.contains(['<', '>', '=']) {
        return Some("a check compares two sides: `check t >= 0.9 m`".to_string());
    }
    if right.contains("**") {
        return Some(format!(
            "powers are written with `^`: `{}`",
            text.replace("**", "^")
        ));
    }
    if let Some(position) = right.find(',') {
        let before = &right[..position];
        let after = &right[position + 1..];
        if !right.contains('{')
            && !right.contains('(')
            && before.ends_with(|character: char| character.is_ascii_digit())
            && after.starts_with(|character: char| character.is_ascii_digit())
        {
            return Some(format!(
                "decimals are written with a point: `{}`",
                text.replacen(
                    &format!("{before},{}", &after[..1]),
                    &format!("{before}.{}", &after[..1]),
                    1
                )
            ));
        }
    }
    if right.starts_with('{') && right.contains('}') {
        let inside = &right[1..right.find('}').unwrap_or(right.len())];
        if inside.split(',').any(|item| item.trim().contains(' ')) {
            return Some(
                "a list takes one unit after the braces: `{1, 2000} mD`; convert the items to \
one unit first"
                    .to_string(),
            );
        }
    }
    if right.starts_with('[') {
        return Some("a unit follows the number (`3 m`) or the name (`x [m] = 3 m`)".to_string());
    }
    None
}
