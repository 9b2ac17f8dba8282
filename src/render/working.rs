//! The working of a sheet, as a checker reads a hand calculation: for each computed line, the
//! expression, the same expression with every input's value and unit put in place of its name,
//! and the result in the line's display unit. A built-in relation called on the line shows its
//! declared formula with the call's values in it, its result, and its formulations. A column
//! shows its first rows and its statistics, never every substitution.
//!
//! The substituted expression is built from the syntax tree: the line's expression is parsed
//! again at its place in the sources (so its calls meet the evaluation's `CallRecord`s), each
//! name becomes its value, and the tree is written back with the parentheses its precedence
//! needs. Literals and units stay as written.

use super::format_significant;
use crate::eval::function::FormulaUse;
use crate::eval::{
    CallRecord, Evaluation, Library, LineResult, Provenance, Quantity, Shown, Value,
};
use crate::syntax::{
    BinaryOperator, Expression, ExpressionKind, FunctionDefinition, LineKind, Spacing,
};
use rustc_hash::FxHashMap as HashMap;

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

/// A built-in relation called on a line: the call with its values, its declared formula, the
/// formula with the call's values in it (SI, as the formula is written), the call's result and
/// the titles of the formulations it follows (cited in full in the sources of the report and
/// the footer of `run`). A call over columns shows its first row.
#[derive(Debug, Clone, PartialEq)]
pub struct RelationWorking {
    pub call: String,
    pub formula: String,
    pub substituted: String,
    pub result: String,
    pub formulations: Vec<&'static str>,
}

/// The working of every computed line of the main sheet (lines that name another value or
/// call a function; plain inputs are in the table already, and the note of a `solve` or `fit`
/// line says how its value was found).
pub fn working(evaluation: &Evaluation, library: &dyn Library, digits: u32) -> Vec<Working> {
    let named: HashMap<&str, &Shown> = evaluation
        .included_values
        .iter()
        .map(|(name, shown)| (name.as_str(), shown))
        .chain(
            evaluation
                .lines
                .iter()
                .filter_map(|line| match &line.result {
                    LineResult::Value(shown) => Some((line.name.as_deref()?, shown)),
                    _ => None,
                }),
        )
        .collect();
    let lookup = |name: &str| -> Option<String> {
        match named.get(name) {
            Some(shown) => first_value(shown, digits),
            None => library.constant(name).map(|constant| {
                let quantity = constant.quantity;
                in_parentheses(quantity_text(
                    quantity.value,
                    &quantity.dimension.preferred_si_unit(),
                    digits,
                ))
            }),
        }
    };
    let mut records: HashMap<(usize, usize), &CallRecord> = HashMap::default();
    for record in &evaluation.calls {
        records
            .entry((record.span.start, record.span.end))
            .or_insert(record);
    }
    let definitions = sheet_functions(evaluation);
    let functions: HashMap<&str, &FunctionDefinition> = definitions
        .iter()
        .map(|definition| (definition.name.text.as_str(), definition))
        .collect();
    let writer = TreeWriter {
        lookup: &lookup,
        library,
        records: &records,
        functions: &functions,
        digits,
    };
    let mut all = Vec::new();
    for line in &evaluation.lines {
        let (LineResult::Value(shown), Some(span)) = (&line.result, line.expression_span) else {
            continue;
        };
        // A data-file column is an input (the Inputs table names its file and hash), and a
        // `solve` or `fit` line is not an expression: neither parses as one.
        let Ok(tree) = crate::syntax::parse_set_value(&line.expression, span.start) else {
            continue;
        };
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
        // An uncertain input (`normal mean a sd b`) is an input whatever its parameters name.
        if matches!(tree.kind, ExpressionKind::Distribution(_)) {
            continue;
        }
        // Literals alone (`6 m` given by `--set`, a list, a range of literals) are inputs.
        let mut computed = false;
        tree.for_each_subexpression(&mut |part| {
            computed |= matches!(
                part.kind,
                ExpressionKind::Name(_) | ExpressionKind::Call { .. }
            );
        });
        if !computed {
            continue;
        }
        let mut relations = Vec::new();
        let substituted = writer.whole(&tree, &mut relations);
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

/// Binding strength of a tree node as written: a child that binds more loosely than its
/// parent operator needs parentheses.
fn precedence(expression: &Expression) -> u8 {
    match &expression.kind {
        ExpressionKind::Binary { operator, .. } => operator_precedence(*operator),
        ExpressionKind::Negate(_) => 3,
        ExpressionKind::Range(_) => 0,
        _ => 5,
    }
}

fn operator_precedence(operator: BinaryOperator) -> u8 {
    match operator {
        BinaryOperator::Add | BinaryOperator::Subtract => 1,
        BinaryOperator::Multiply | BinaryOperator::Divide => 2,
        // Tighter than a sign: `-2^2` is -(2^2).
        BinaryOperator::Power => 4,
    }
}

fn operator_text(operator: BinaryOperator) -> &'static str {
    match operator {
        BinaryOperator::Add => " + ",
        BinaryOperator::Subtract => " - ",
        BinaryOperator::Multiply => " * ",
        BinaryOperator::Divide => " / ",
        BinaryOperator::Power => "^",
    }
}

/// Writes a tree back as text with values in place of names, and collects the working of the
/// relations it calls.
struct TreeWriter<'a> {
    lookup: &'a dyn Fn(&str) -> Option<String>,
    library: &'a dyn Library,
    records: &'a HashMap<(usize, usize), &'a CallRecord>,
    /// The main sheet's functions, whose bodies are shown with a call's arguments in them.
    functions: &'a HashMap<&'a str, &'a FunctionDefinition>,
    digits: u32,
}

/// The function definitions of the main sheet, parsed again from its lines.
fn sheet_functions(evaluation: &Evaluation) -> Vec<FunctionDefinition> {
    let Some(file) = evaluation.sources.file(0) else {
        return Vec::new();
    };
    let wanted: Vec<usize> = evaluation
        .lines
        .iter()
        .filter(|line| matches!(line.result, LineResult::Function { .. }))
        .map(|line| line.number)
        .collect();
    if wanted.is_empty() {
        return Vec::new();
    }
    let text = file
        .text
        .strip_prefix(crate::syntax::BYTE_ORDER_MARK)
        .unwrap_or(&file.text);
    text.split('\n')
        .enumerate()
        .filter(|(index, _)| wanted.contains(&(index + 1)))
        .filter_map(|(index, line)| {
            let line = line.strip_suffix('\r').unwrap_or(line);
            match crate::syntax::parse_line(line, index + 1, 0).ok()?.kind {
                LineKind::Function(definition) => Some(definition),
                _ => None,
            }
        })
        .collect()
}

impl TreeWriter<'_> {
    /// A whole expression, or a call's argument: a value standing alone needs no parentheses
    /// of its own (unless it is negative).
    fn whole(&self, expression: &Expression, relations: &mut Vec<RelationWorking>) -> String {
        let text = self.write(expression, relations);
        match &expression.kind {
            ExpressionKind::Name(_) => text
                .strip_prefix('(')
                .and_then(|inner| inner.strip_suffix(')'))
                .filter(|inner| !inner.starts_with('-'))
                .map_or(text.clone(), str::to_string),
            _ => text,
        }
    }

    fn write(&self, expression: &Expression, relations: &mut Vec<RelationWorking>) -> String {
        match &expression.kind {
            ExpressionKind::Quantity { digits, unit } => match unit {
                Some(unit) => format!("{digits} {}", unit.text),
                None => digits.clone(),
            },
            ExpressionKind::Name(name) => (self.lookup)(name).unwrap_or_else(|| name.clone()),
            ExpressionKind::List { items, unit } => {
                let list = format!("{{{}}}", items.join(", "));
                match unit {
                    Some(unit) => format!("{list} {}", unit.text),
                    None => list,
                }
            }
            ExpressionKind::Range(range) => {
                let from = self.write(&range.from, relations);
                let to = self.write(&range.to, relations);
                match &range.spacing {
                    Spacing::Step(step) => {
                        format!("{from} to {to} step {}", self.write(step, relations))
                    }
                    Spacing::Count { count, logarithmic } => format!(
                        "{from} to {to} count {}{}",
                        self.write(count, relations),
                        if *logarithmic { " log" } else { "" }
                    ),
                }
            }
            // Not inside an expression a working is written for (a line of its own).
            ExpressionKind::FileColumn { header, .. } => format!("column {}", header.text),
            ExpressionKind::Solve(solve) => format!("solve {}", solve.line.text),
            ExpressionKind::Fit(fit) => format!("fit {}", fit.model.text),
            ExpressionKind::Distribution(distribution) => {
                format!("{} distribution", distribution.family.keyword())
            }
            ExpressionKind::Call {
                function,
                arguments,
            } => {
                let written: Vec<String> = arguments
                    .iter()
                    .map(|argument| self.whole(argument, relations))
                    .collect();
                let relation = self
                    .relation(&function.text, expression)
                    .or_else(|| self.sheet_function(&function.text, &written));
                if let Some(relation) = relation {
                    if !relations.contains(&relation) {
                        relations.push(relation);
                    }
                }
                format!("{}({})", function.text, written.join(", "))
            }
            ExpressionKind::Negate(inner) => {
                let text = self.write(inner, relations);
                if precedence(inner) <= 3 {
                    format!("-({text})")
                } else {
                    format!("-{text}")
                }
            }
            ExpressionKind::Binary {
                operator,
                left,
                right,
            } => {
                let own = operator_precedence(*operator);
                let power = *operator == BinaryOperator::Power;
                let mut left_text = self.write(left, relations);
                // `(2 m)^2`: a literal with a unit is a power's base only in parentheses.
                let unit_literal =
                    matches!(&left.kind, ExpressionKind::Quantity { unit: Some(_), .. });
                if precedence(left) < own || (power && (precedence(left) == own || unit_literal)) {
                    left_text = format!("({left_text})");
                }
                let mut right_text = self.write(right, relations);
                let same_needs =
                    matches!(operator, BinaryOperator::Subtract | BinaryOperator::Divide);
                if precedence(right) < own || (same_needs && precedence(right) == own) {
                    right_text = format!("({right_text})");
                }
                format!("{left_text}{}{right_text}", operator_text(*operator))
            }
        }
    }

    /// The working of a call of one of the sheet's functions: its body with each parameter
    /// replaced by the argument as written out (`arguments`). Calls inside the body are not
    /// followed: their values belong to every call of the function at once.
    fn sheet_function(&self, function: &str, arguments: &[String]) -> Option<RelationWorking> {
        let definition = self.functions.get(function)?;
        let parameters: Vec<&str> = definition
            .parameters
            .iter()
            .map(|parameter| parameter.name.text.as_str())
            .collect();
        if parameters.len() != arguments.len() {
            return None;
        }
        let lookup = |name: &str| match parameters.iter().position(|known| *known == name) {
            Some(index) => Some(in_parentheses(arguments[index].clone())),
            None => (self.lookup)(name),
        };
        let body_writer = TreeWriter {
            lookup: &lookup,
            library: self.library,
            records: &HashMap::default(),
            functions: &HashMap::default(),
            digits: self.digits,
        };
        let symbol = format!("{function}({})", parameters.join(", "));
        let body = body_writer.whole(&definition.body, &mut Vec::new());
        let named: Vec<String> = parameters
            .iter()
            .zip(arguments)
            .map(|(parameter, argument)| format!("{parameter} = {argument}"))
            .collect();
        Some(RelationWorking {
            call: format!("{function}({})", named.join(", ")),
            formula: format!("{symbol} = {}", text_of_tree(&definition.body)),
            substituted: format!("{symbol} = {body}"),
            result: String::new(),
            formulations: Vec::new(),
        })
    }

    /// The working of a call of a relation that declares a formula: its arguments' values
    /// (the first row of a column), defaults of those left out, the formula with them in it,
    /// and its result.
    fn relation(&self, function: &str, call: &Expression) -> Option<RelationWorking> {
        let builtin = self.library.function(function)?;
        let record = self.records.get(&(call.span.start, call.span.end))?;
        let mut rows: Option<usize> = None;
        let mut arguments: Vec<Quantity> = Vec::new();
        for (_, value) in &record.arguments {
            arguments.push(match value {
                Value::Scalar(quantity) => *quantity,
                Value::Column(column) if !column.is_empty() => {
                    rows = Some(column.len());
                    column.quantity(0)
                }
                _ => return None,
            });
        }
        let FormulaUse {
            formula,
            parameters,
            formulations,
        } = builtin.formula_for(&arguments)?;
        let digits = self.digits;
        let mut values: Vec<(&str, String)> = Vec::new();
        let mut named: Vec<String> = Vec::new();
        for (index, (parameter, default)) in parameters.iter().enumerate() {
            let (quantity, left_out) = match (arguments.get(index), default) {
                (Some(quantity), _) => (*quantity, false),
                (None, Some(default)) => (*default, true),
                (None, None) => continue,
            };
            // A default is a constant of the relation: shown to six figures so that
            // 101325 Pa does not read as a rounded 101300 Pa.
            let shown_digits = if left_out { digits.max(6) } else { digits };
            let text = quantity_text(
                quantity.value,
                &quantity.dimension.preferred_si_unit(),
                shown_digits,
            );
            named.push(if left_out {
                format!("{parameter} = {text} (left out)")
            } else {
                format!("{parameter} = {text}")
            });
            values.push((parameter, in_parentheses(text)));
        }
        let (symbol, right) = formula.split_once(" = ").unwrap_or(("", formula));
        let lookup = |word: &str| {
            values
                .iter()
                .find(|(parameter, _)| *parameter == word)
                .map(|(_, value)| value.clone())
        };
        let substituted = match symbol {
            "" => substitute_words(right, &lookup),
            symbol => format!("{symbol} = {}", substitute_words(right, &lookup)),
        };
        let result = builtin
            .call(&arguments, &mut Provenance::default())
            .map(|quantity| {
                quantity_text(
                    quantity.value,
                    &quantity.dimension.preferred_si_unit(),
                    digits,
                )
            })
            .unwrap_or_default();
        let row = match rows {
            Some(rows) => format!(" (row 1 of {rows})"),
            None => String::new(),
        };
        Some(RelationWorking {
            call: format!("{function}({}){row}", named.join(", ")),
            formula: formula.to_string(),
            substituted,
            result,
            formulations: formulations
                .iter()
                .map(|formulation| formulation.title)
                .collect(),
        })
    }
}

impl RelationWorking {
    /// The relation set out as a hand calculation: its formula, then `= ` the formula with the
    /// values in it, then `= ` its result, each `=` under the formula's.
    pub fn steps(&self) -> Vec<String> {
        let (symbol, _) = self
            .formula
            .split_once(" = ")
            .unwrap_or(("", &self.formula));
        let under = format!("{}= ", " ".repeat(symbol.chars().count() + 1));
        let values = self
            .substituted
            .split_once(" = ")
            .map_or(self.substituted.as_str(), |(_, right)| right);
        let mut steps = vec![self.formula.clone(), format!("{under}{values}")];
        if !self.result.is_empty() {
            steps.push(format!("{under}{}", self.result));
        }
        steps
    }
}

/// A tree written back as it stands, names and all (a sheet function's body).
fn text_of_tree(expression: &Expression) -> String {
    let keep = |_: &str| None;
    TreeWriter {
        lookup: &keep,
        library: crate::library::Builtins::standard(),
        records: &HashMap::default(),
        functions: &HashMap::default(),
        digits: 4,
    }
    .whole(expression, &mut Vec::new())
}

/// `(text)` when it has a unit or a sign, so that it reads as one factor.
fn in_parentheses(text: String) -> String {
    if text.contains(' ') || text.starts_with('-') {
        format!("({text})")
    } else {
        text
    }
}

/// Width the plain-text working is wrapped to: a 100-column terminal.
pub const TEXT_WIDTH: usize = 100;

/// Writes the working as plain text, for `run --working`, as a hand calculation is set out:
/// each `=` under the first, and each relation's formula with its values below the line.
pub fn write_text(out: &mut dyn std::io::Write, all: &[Working]) -> std::io::Result<()> {
    writeln!(out, "\nWorking")?;
    for working in all {
        let head = match &working.name {
            Some(name) => format!("line {}  {name} = ", working.line),
            None => format!("line {}  ", working.line),
        };
        let indent = " ".repeat(head.chars().count().saturating_sub(2));
        let steps = [
            (head.clone(), &working.expression),
            (format!("{indent}= "), &working.substituted),
            (format!("{indent}= "), &working.result),
        ];
        for (prefix, text) in steps {
            write_wrapped(out, &prefix, text)?;
        }
        for relation in &working.relations {
            write_wrapped(out, "    ", &relation.call)?;
            for step in relation.steps() {
                // The step's own indent (under the `=`) becomes the wrapping prefix.
                let text = step.trim_start();
                let indent = format!("    {}", &step[..step.len() - text.len()]);
                match text.strip_prefix("= ") {
                    Some(rest) => write_wrapped(out, &format!("{indent}= "), rest)?,
                    None => write_wrapped(out, &indent, text)?,
                }
            }
            for title in &relation.formulations {
                write_wrapped(out, "    after ", title)?;
            }
        }
    }
    Ok(())
}

/// `prefix` and `text` wrapped at spaces to `TEXT_WIDTH` columns, each further line indented
/// two spaces past the prefix. A word longer than the width stays whole.
fn write_wrapped(out: &mut dyn std::io::Write, prefix: &str, text: &str) -> std::io::Result<()> {
    let continuation = " ".repeat(prefix.chars().count().min(40) + 2);
    let mut line = prefix.to_string();
    let mut empty = true;
    for word in text.split(' ') {
        let width = line.chars().count();
        if !empty && width + 1 + word.chars().count() > TEXT_WIDTH {
            writeln!(out, "{line}")?;
            line = format!("{continuation}{word}");
        } else {
            if !empty {
                line.push(' ');
            }
            line.push_str(word);
        }
        empty = false;
    }
    writeln!(out, "{line}")
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
                Some(value) => {
                    // Alone as an argument (`rho_w(T, p)`), a value needs no parentheses.
                    let previous = out.trim_end().chars().last();
                    let next = rest[end..].trim_start().chars().next();
                    let alone =
                        matches!(previous, Some('(' | ',')) && matches!(next, Some(')' | ','));
                    let bare = value
                        .strip_prefix('(')
                        .and_then(|inner| inner.strip_suffix(')'))
                        .filter(|inner| alone && !inner.starts_with('-'));
                    out.push_str(bare.unwrap_or(&value));
                }
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::library::Builtins;

    fn values(name: &str) -> Option<String> {
        match name {
            "K" => Some("(2e-5 m/s)".to_string()),
            "i" => Some("0.02".to_string()),
            "m" => Some("(99 kg)".to_string()),
            "neg" => Some("(-3 m)".to_string()),
            _ => None,
        }
    }

    /// The expression written back from its tree with `values` in place of names.
    fn substituted(expression: &str) -> String {
        let tree = crate::syntax::parse_set_value(expression, 0).expect("parses");
        let records = HashMap::default();
        let writer = TreeWriter {
            lookup: &values,
            library: Builtins::standard(),
            records: &records,
            functions: &HashMap::default(),
            digits: 4,
        };
        writer.whole(&tree, &mut Vec::new())
    }

    #[test]
    fn names_are_replaced_and_literals_units_and_calls_are_not() {
        let check = |expression: &str, expected: &str| {
            assert_eq!(substituted(expression), expected, "{expression}");
        };
        check("K * i", "(2e-5 m/s) * 0.02");
        check("K^2 / 3 m", "(2e-5 m/s)^2 / 3 m");
        check("2 m + m", "2 m + (99 kg)");
        check("3 gal/(d*ft^2) * i", "3 gal/(d*ft^2) * 0.02");
        check("sqrt(K)", "sqrt(2e-5 m/s)");
        check("K", "2e-5 m/s");
        check("neg", "(-3 m)");
        check("1.5e-3 m * i", "1.5e-3 m * 0.02");
        check("0 m to K step i", "0 m to (2e-5 m/s) step 0.02");
        check("{1, 2, 3} mD", "{1, 2, 3} mD");
    }

    /// The tree loses the parentheses as written: they come back exactly where precedence and
    /// the order of `-`, `/` and `^` need them, and nowhere else.
    #[test]
    fn parentheses_follow_precedence() {
        let check = |expression: &str, expected: &str| {
            assert_eq!(substituted(expression), expected, "{expression}");
        };
        check("(a + b) * c", "(a + b) * c");
        check("a + (b * c)", "a + b * c");
        check("a - (b - c)", "a - (b - c)");
        check("(a - b) - c", "a - b - c");
        check("a / (b * c)", "a / (b * c)");
        check("a / b / c", "a / b / c");
        check("(a^b)^c", "(a^b)^c");
        check("a^b^c", "a^b^c");
        check("-a^2", "-a^2");
        check("(-a)^2", "(-a)^2");
        check("-(a + b)", "-(a + b)");
        check("(2 m)^2", "(2 m)^2");
        check("2 m^2", "2 m^2");
        check("i * -K", "0.02 * -(2e-5 m/s)");
    }

    #[test]
    fn text_wraps_at_the_width_under_its_prefix() {
        let mut out = Vec::new();
        let words = vec!["word"; 40].join(" ");
        write_wrapped(&mut out, "    after ", &words).unwrap();
        let text = String::from_utf8(out).unwrap();
        let lines: Vec<&str> = text.lines().collect();
        assert!(lines.len() >= 2, "{text}");
        assert!(
            lines.iter().all(|line| line.chars().count() <= TEXT_WIDTH),
            "{text}"
        );
        assert!(lines[0].starts_with("    after word"));
        assert!(lines[1].starts_with("            word"), "{text}");
        assert_eq!(text.matches("word").count(), 40);
    }

    #[test]
    fn a_formula_takes_values_by_whole_parameter_names() {
        let lookup = |word: &str| match word {
            "T" => Some("(285.15 K)".to_string()),
            "p" => Some("(101325 Pa)".to_string()),
            "k" => Some("(2e-13 m^2)".to_string()),
            _ => None,
        };
        assert_eq!(
            substitute_words("k * rho_w(T, p) * g0 / mu_w(T, p)", &lookup),
            "(2e-13 m^2) * rho_w(285.15 K, 101325 Pa) * g0 / mu_w(285.15 K, 101325 Pa)"
        );
        assert_eq!(
            substitute_words("T_0 + (T - p)", &lookup),
            "T_0 + ((285.15 K) - (101325 Pa))"
        );
    }
}
