//! The working of a sheet, as a checker reads a hand calculation: for each computed line, the
//! expression, the same expression with every input's value and unit put in place of its name,
//! and the result in the line's display unit. A built-in relation called on the line shows its
//! formula with the argument values in it and cites its formulation. A column shows its first
//! rows and its statistics, never every substitution.
//!
//! The substitution works on the expression's text: names are replaced, units after numbers and
//! inside `[ ]`, quoted text and function names are left as written.

use super::format_significant;
use crate::eval::{Evaluation, Library, LineResult, Shown, Value};
use crate::syntax::Span;

/// Rows of a column shown before its statistics.
pub const FIRST_ROWS: usize = 3;

/// The working of one computed line.
#[derive(Debug, Clone, PartialEq)]
pub struct Working {
    pub line: usize,
    pub name: Option<String>,
    pub expression: String,
    /// The expression with values in place of names (a column as its first rows).
    pub substituted: String,
    /// The result in the display unit (for a column: its first rows and statistics).
    pub result: String,
    pub relations: Vec<RelationWorking>,
}

/// A built-in relation called on a line: its formula, the formula with the call's values in
/// it (SI, as the formula is written), and the formulations it follows.
#[derive(Debug, Clone, PartialEq)]
pub struct RelationWorking {
    pub call: String,
    pub formula: String,
    pub substituted: String,
    pub citations: Vec<String>,
}

/// The working of every computed line of the main sheet (lines that name another value or
/// call a function; plain inputs are in the table already).
pub fn working(evaluation: &Evaluation, library: &dyn Library, digits: u32) -> Vec<Working> {
    let main_text = evaluation
        .sources
        .file(0)
        .map_or("", |file| file.text.as_str());
    let line_spans = line_spans(main_text);
    let lookup = |name: &str| -> Option<String> {
        let shown = evaluation
            .lines
            .iter()
            .find_map(|line| match &line.result {
                LineResult::Value(shown) if line.name.as_deref() == Some(name) => Some(shown),
                _ => None,
            })
            .or_else(|| {
                evaluation
                    .included_values
                    .iter()
                    .find(|(included, _)| included == name)
                    .map(|(_, shown)| shown)
            });
        match shown {
            Some(shown) => first_value(shown, digits),
            None => library.constant(name).map(|constant| {
                let quantity = constant.quantity;
                let text =
                    quantity_text(quantity.value, &quantity.dimension.si_unit_text(), digits);
                if text.contains(' ') {
                    format!("({text})")
                } else {
                    text
                }
            }),
        }
    };
    let mut all = Vec::new();
    for line in &evaluation.lines {
        let LineResult::Value(shown) = &line.result else {
            continue;
        };
        // A data-file column is an input: the Inputs table names its file and hash.
        if line.expression.starts_with("column ") {
            continue;
        }
        // A sampled line shows the P50 of its samples, which no substitution of single values
        // gives: its spread is in the summary instead.
        let sampled = evaluation.samples.as_ref().is_some_and(|summary| {
            summary
                .lines
                .iter()
                .any(|spread| spread.line == line.number)
        });
        if sampled {
            continue;
        }
        let substituted = substitute(&line.expression, &lookup);
        let span = line_spans.get(line.number.wrapping_sub(1)).copied();
        let relations = span
            .map(|span| relations_on(evaluation, library, span, digits))
            .unwrap_or_default();
        if substituted == line.expression && relations.is_empty() {
            continue;
        }
        all.push(Working {
            line: line.number,
            name: line.name.clone(),
            expression: line.expression.clone(),
            substituted,
            result: result_text(shown, digits),
            relations,
        });
    }
    all
}

/// Writes the working as plain text, for `run --working`.
pub fn write_text(out: &mut dyn std::io::Write, all: &[Working]) -> std::io::Result<()> {
    writeln!(out, "\nWorking")?;
    for working in all {
        let head = match &working.name {
            Some(name) => format!("line {}  {name} = ", working.line),
            None => format!("line {}  ", working.line),
        };
        let indent = " ".repeat(head.chars().count().saturating_sub(2));
        writeln!(out, "{head}{}", working.expression)?;
        writeln!(out, "{indent}= {}", working.substituted)?;
        writeln!(out, "{indent}= {}", working.result)?;
        for relation in &working.relations {
            if relation.formula.is_empty() {
                writeln!(out, "{indent}  {}", relation.call)?;
            } else {
                writeln!(out, "{indent}  {}: {}", relation.call, relation.formula)?;
                writeln!(out, "{indent}  {}", relation.substituted)?;
            }
            for citation in &relation.citations {
                writeln!(out, "{indent}  after {citation}")?;
            }
        }
    }
    Ok(())
}

/// `value unit`, or the bare number for a plain number.
fn quantity_text(value: f64, unit: &str, digits: u32) -> String {
    let number = format_significant(value, digits);
    if unit.is_empty() || unit == "1" {
        number
    } else {
        format!("{number} {unit}")
    }
}

/// A column's first rows as a list with its unit: `{640, 420, … 12 rows} mD`.
fn quantity_text_list(list: &str, unit: &str) -> String {
    if unit.is_empty() || unit == "1" {
        list.to_string()
    } else {
        format!("{list} {unit}")
    }
}

/// A value as it goes into a substituted expression: in parentheses when it has a unit or a
/// sign, so that `L^2` reads `(2 m)^2`; a column as its first rows.
fn first_value(shown: &Shown, digits: u32) -> Option<String> {
    let (value, unit) = match shown {
        Shown::Scalar(scalar) => (scalar.value, scalar.unit.as_str()),
        Shown::Column(column) => {
            let rows = column.len();
            let mut first: Vec<String> = (0..rows.min(FIRST_ROWS))
                .map(|row| format_significant(column.shown(row), digits))
                .collect();
            if rows > FIRST_ROWS {
                first.push(format!("… {rows} rows"));
            }
            let list = format!("{{{}}}", first.join(", "));
            return Some(quantity_text_list(&list, &column.unit));
        }
        _ => return None,
    };
    let text = quantity_text(value, unit, digits);
    Some(if text.contains(' ') || value < 0.0 {
        format!("({text})")
    } else {
        text
    })
}

/// The result: a value in its display unit, or a column's first rows and statistics.
pub fn result_text(shown: &Shown, digits: u32) -> String {
    match shown {
        Shown::Scalar(scalar) => quantity_text(scalar.value, &scalar.unit, digits),
        Shown::Column(column) => {
            let unit = if column.unit == "1" { "" } else { &column.unit };
            let rows = column.len();
            let first: Vec<String> = (0..rows.min(FIRST_ROWS))
                .map(|row| format_significant(column.shown(row), digits))
                .collect();
            let more = if rows > FIRST_ROWS { ", …" } else { "" };
            let values: Vec<f64> = column.shown_values().collect();
            let statistics = match (
                crate::numeric::minimum(&values),
                crate::numeric::mean(&values),
                crate::numeric::maximum(&values),
            ) {
                (Ok((low, _)), Ok(mean), Ok((high, _))) => format!(
                    "; min {}, mean {}, max {}",
                    format_significant(low, digits),
                    format_significant(mean, digits),
                    format_significant(high, digits)
                ),
                _ => String::new(),
            };
            format!("{rows} rows: {}{more} {unit}{statistics}", first.join(", ")).replace("  ", " ")
        }
        Shown::Labels(labels) => format!("{} rows of text", labels.texts.len()),
    }
}

/// The byte span of each line of a text (without its line ending).
fn line_spans(text: &str) -> Vec<Span> {
    let mut spans = Vec::new();
    let mut start = 0;
    for line in text.split('\n') {
        spans.push(Span::new(start, start + line.len()));
        start += line.len() + 1;
    }
    spans
}

/// The relations called on the line at `span` (of the main sheet), once per call.
fn relations_on(
    evaluation: &Evaluation,
    library: &dyn Library,
    span: Span,
    digits: u32,
) -> Vec<RelationWorking> {
    let mut relations: Vec<RelationWorking> = Vec::new();
    let mut seen: Vec<Span> = Vec::new();
    for call in &evaluation.calls {
        if call.span.start < span.start || call.span.end > span.end || seen.contains(&call.span) {
            continue;
        }
        seen.push(call.span);
        let Some(function) = library.function(&call.function) else {
            continue;
        };
        let formulations = function.formulations();
        if formulations.is_empty() {
            continue;
        }
        let parameters = parameter_names(&function.signature(), call.arguments.len());
        let values: Vec<(String, String)> = call
            .arguments
            .iter()
            .enumerate()
            .filter_map(|(index, (_, value))| {
                let parameter = parameters.get(index).cloned().unwrap_or_default();
                let text = match value {
                    Value::Scalar(quantity) => {
                        quantity_text(quantity.value, &quantity.dimension.si_unit_text(), digits)
                    }
                    Value::Column(column) if !column.is_empty() => {
                        quantity_text(column.values[0], &column.dimension.si_unit_text(), digits)
                    }
                    _ => return None,
                };
                let text = if text.contains(' ') || text.starts_with('-') {
                    format!("({text})")
                } else {
                    text
                };
                Some((parameter, text))
            })
            .collect();
        let named = values
            .iter()
            .map(|(name, value)| match name.is_empty() {
                true => value.clone(),
                false => format!("{name} = {value}"),
            })
            .collect::<Vec<_>>()
            .join(", ");
        let formula = formula_of(function.summary());
        let substituted = match &formula {
            Some(formula) => {
                let lookup = |name: &str| {
                    values
                        .iter()
                        .find(|(parameter, _)| parameter == name)
                        .map(|(_, value)| value.clone())
                };
                substitute_words(formula, &lookup)
            }
            None => format!("{}({named})", call.function),
        };
        relations.push(RelationWorking {
            call: format!("{}({named})", call.function),
            formula: formula.unwrap_or_default(),
            substituted,
            citations: formulations
                .iter()
                .map(|formulation| format!("{}: {}", formulation.title, formulation.citation))
                .collect(),
        });
    }
    relations
}

/// The parameter names of the form with `count` arguments, read from a signature such as
/// `hydraulic_conductivity(k, T[, p]) or (k, rho, mu)`.
fn parameter_names(signature: &str, count: usize) -> Vec<String> {
    // Each form: its names and how many are required (those before the first `[`).
    let forms: Vec<(Vec<String>, usize)> = signature
        .split(" or ")
        .filter_map(|form| {
            let open = form.find('(')?;
            let close = form.rfind(')')?;
            let inside = &form[open + 1..close];
            let names_in = |text: &str| -> Vec<String> {
                text.split(',')
                    .map(|name| name.trim_matches(|c: char| c == '[' || c == ']' || c == ' '))
                    .filter(|name| !name.is_empty())
                    .map(str::to_string)
                    .collect()
            };
            let required = names_in(inside.split('[').next().unwrap_or_default()).len();
            Some((names_in(inside), required))
        })
        .collect();
    // Two forms that take this many arguments (`(k, T, p)` or `(k, rho, mu)`) cannot be told
    // apart here: no names then, rather than wrong ones.
    let fitting: Vec<&Vec<String>> = forms
        .iter()
        .filter(|(names, required)| *required <= count && count <= names.len())
        .map(|(names, _)| names)
        .collect();
    match fitting.as_slice() {
        [only] => only.to_vec(),
        _ => Vec::new(),
    }
}

/// The formula of a relation's summary: `q = K i` from "Darcy flux q = K i (m/s); …", the
/// first clause's `symbol = right side` without the unit in parentheses that ends it.
fn formula_of(summary: &str) -> Option<String> {
    let clause = summary.split([';', ':']).next()?;
    let equals = clause.find(" = ")?;
    let symbol = clause[..equals].split_whitespace().last()?;
    let mut right = clause[equals + 3..].trim();
    if let Some(open) = right.rfind(" (") {
        if right.ends_with(')') {
            right = right[..open].trim();
        }
    }
    if right.is_empty() {
        return None;
    }
    Some(format!("{symbol} = {right}"))
}

fn is_name_start(character: char) -> bool {
    character.is_alphabetic() || character == '_'
}

fn is_name_character(character: char) -> bool {
    character.is_alphanumeric() || character == '_'
}

/// Replaces every whole word that `lookup` knows (a formula's parameter names).
fn substitute_words(text: &str, lookup: &dyn Fn(&str) -> Option<String>) -> String {
    let mut out = String::with_capacity(text.len());
    let mut rest = text;
    while let Some(character) = rest.chars().next() {
        if is_name_start(character) {
            let end = rest
                .find(|c: char| !is_name_character(c))
                .unwrap_or(rest.len());
            let word = &rest[..end];
            match lookup(word) {
                Some(value) => out.push_str(&value),
                None => out.push_str(word),
            }
            rest = &rest[end..];
        } else {
            out.push(character);
            rest = &rest[character.len_utf8()..];
        }
    }
    out
}

/// Replaces the sheet names of an expression with their values. A number's unit (`2 m`,
/// `3 gal/(d*ft^2)`), a unit in `[ ]`, quoted text, a function name (a word before `(`) and
/// the words of ranges stay as written.
pub fn substitute(expression: &str, lookup: &dyn Fn(&str) -> Option<String>) -> String {
    let characters: Vec<char> = expression.chars().collect();
    let mut out = String::with_capacity(expression.len());
    let mut index = 0;
    let mut after_number = false;
    while index < characters.len() {
        let character = characters[index];
        if character == '"' {
            let end = characters[index + 1..]
                .iter()
                .position(|c| *c == '"')
                .map_or(characters.len(), |position| index + 2 + position);
            out.extend(&characters[index..end]);
            index = end;
            after_number = false;
        } else if character == '[' {
            let end = characters[index..]
                .iter()
                .position(|c| *c == ']')
                .map_or(characters.len(), |position| index + position + 1);
            out.extend(&characters[index..end]);
            index = end;
            after_number = false;
        } else if character.is_ascii_digit()
            || (character == '.'
                && characters
                    .get(index + 1)
                    .is_some_and(|next| next.is_ascii_digit()))
        {
            let start = index;
            while index < characters.len() {
                let current = characters[index];
                let exponent_sign = matches!(current, '+' | '-')
                    && index > start
                    && matches!(characters[index - 1], 'e' | 'E');
                let exponent = matches!(current, 'e' | 'E')
                    && characters
                        .get(index + 1)
                        .is_some_and(|next| next.is_ascii_digit() || matches!(next, '+' | '-'));
                if current.is_ascii_digit() || current == '.' || exponent || exponent_sign {
                    index += 1;
                } else {
                    break;
                }
            }
            out.extend(&characters[start..index]);
            after_number = true;
        } else if is_name_start(character) {
            let start = index;
            while index < characters.len() && is_name_character(characters[index]) {
                index += 1;
            }
            let word: String = characters[start..index].iter().collect();
            let keyword = matches!(
                word.as_str(),
                "to" | "step" | "count" | "log" | "from" | "for" | "between" | "and" | "against"
            );
            if after_number && !keyword {
                // A unit: up to the next space, comma or unbalanced `)`.
                let mut depth = 0_i32;
                while index < characters.len() {
                    match characters[index] {
                        '(' => depth += 1,
                        ')' if depth == 0 => break,
                        ')' => depth -= 1,
                        ' ' | '\t' | ',' if depth == 0 => break,
                        _ => {}
                    }
                    index += 1;
                }
                out.extend(&characters[start..index]);
            } else {
                let next = characters[index..].iter().find(|c| !c.is_whitespace());
                match (next == Some(&'('), lookup(&word)) {
                    (false, Some(value)) => {
                        // Alone between delimiters (`f(x, y)`, a whole expression) a value
                        // needs no parentheses of its own.
                        let previous = out.trim_end().chars().last();
                        let alone = matches!(previous, None | Some('(' | ','))
                            && matches!(next, None | Some(')' | ','));
                        let bare = value
                            .strip_prefix('(')
                            .and_then(|inner| inner.strip_suffix(')'))
                            .filter(|inner| alone && !inner.starts_with('-'));
                        out.push_str(bare.unwrap_or(&value));
                    }
                    _ => out.push_str(&word),
                }
            }
            after_number = false;
        } else {
            out.push(character);
            if !character.is_whitespace() {
                after_number = false;
            }
            index += 1;
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::{formula_of, parameter_names, substitute};

    fn values(name: &str) -> Option<String> {
        match name {
            "K" => Some("(2e-5 m/s)".to_string()),
            "i" => Some("0.02".to_string()),
            "m" => Some("(99 kg)".to_string()),
            _ => None,
        }
    }

    #[test]
    fn names_are_replaced_and_units_and_calls_are_not() {
        let check = |expression: &str, expected: &str| {
            assert_eq!(substitute(expression, &values), expected, "{expression}");
        };
        check("K * i", "(2e-5 m/s) * 0.02");
        check("K^2 / 3 m", "(2e-5 m/s)^2 / 3 m");
        check("2 m + m", "2 m + (99 kg)");
        check("3 gal/(d*ft^2) * i", "3 gal/(d*ft^2) * 0.02");
        check("sqrt(K) [m/s]", "sqrt(2e-5 m/s) [m/s]");
        check("K", "2e-5 m/s");
        check("K(i)", "K(0.02)");
        check("1.5e-3 m * i", "1.5e-3 m * 0.02");
        check("0 m to K step i", "0 m to (2e-5 m/s) step 0.02");
    }

    #[test]
    fn formulas_and_parameters_come_from_the_listing() {
        assert_eq!(
            formula_of("Darcy flux q = K i (m/s); K hydraulic conductivity"),
            Some("q = K i".to_string())
        );
        assert_eq!(formula_of("absolute value, any dimension"), None);
        assert_eq!(
            parameter_names("hydraulic_conductivity(k, T[, p]) or (k, rho, mu)", 3),
            Vec::<String>::new()
        );
        assert_eq!(
            parameter_names("hydraulic_conductivity(k, T[, p]) or (k, rho, mu)", 2),
            ["k", "T", "p"]
        );
        assert_eq!(parameter_names("darcy_flux(K, i)", 2), ["K", "i"]);
    }
}
