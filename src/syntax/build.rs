//! Builds the syntax tree from pest pairs. Operator precedence and associativity live in one
//! table here (`binding_power`), not in the grammar. `expect_*` helpers would be user errors; a pair shape
//! the grammar rules out is reported as `internal`, never a panic.
//!
//! Over 800 lines: one builder per grammar rule, kept together with the precedence table
//! they share, and the tests of each rule's tree at the foot.

use super::ast::*;
use super::error::{SyntaxError, SyntaxErrorKind};
use super::parser::{Rule, WorksheetParser};
use super::span::Span;
use pest::iterators::{Pair, Pairs};
use pest::Parser;

/// Deepest nesting of `(`/`[` accepted on one line; keeps parsing and evaluation off the stack's
/// edge for hostile input.
pub const NESTING_LIMIT: usize = 64;
/// Most operators accepted on one line, for the same reason.
pub const OPERATOR_LIMIT: usize = 256;

/// A parsed sheet: every line (bad ones as `LineKind::Invalid`) and every syntax error.
#[derive(Debug, Clone, PartialEq)]
pub struct ParsedSheet {
    pub sheet: Sheet,
    pub errors: Vec<SyntaxError>,
}

/// Parses a whole sheet, one line at a time.
pub fn parse_sheet(source: &str) -> ParsedSheet {
    parse_sheet_at(source, 0)
}

/// Parses a sheet whose text starts at byte `base` of a larger offset space (an included
/// sheet laid after the one that includes it).
pub fn parse_sheet_at(source: &str, base: usize) -> ParsedSheet {
    let cores = std::thread::available_parallelism().map_or(1, usize::from);
    parse_sheet_with(source, base, cores)
}

/// `parse_sheet_at` on at most `threads` threads (a long sheet's lines are split between them).
pub fn parse_sheet_with(source: &str, base: usize, threads: usize) -> ParsedSheet {
    let mut raw_lines = Vec::new();
    // Editors on some systems start a UTF-8 file with a byte-order mark; it is not text.
    let (source, mut offset) = match source.strip_prefix(BYTE_ORDER_MARK) {
        Some(rest) => (rest, base + BYTE_ORDER_MARK.len_utf8()),
        None => (source, base),
    };
    for (index, raw_line) in source.split('\n').enumerate() {
        let text = raw_line.strip_suffix('\r').unwrap_or(raw_line);
        raw_lines.push((index + 1, text, offset));
        offset += raw_line.len() + 1;
    }
    // A final newline does not make a line of its own.
    if source.ends_with('\n') {
        raw_lines.pop();
    }
    let parse = |&(number, text, offset): &(usize, &str, usize)| {
        parse_line(text, number, offset).map_err(|error| {
            let invalid = Line {
                number,
                span: Span::new(offset, offset + text.len()),
                kind: LineKind::Invalid,
                comment: None,
            };
            (invalid, error)
        })
    };
    // Lines parse independently, so a long sheet is split across the machine's cores.
    let workers = threads.min(8);
    let results: Vec<Result<Line, (Line, SyntaxError)>> =
        if workers > 1 && raw_lines.len() >= PARALLEL_PARSE_LINES {
            let chunk = raw_lines.len().div_ceil(workers);
            std::thread::scope(|scope| {
                let handles: Vec<_> = raw_lines
                    .chunks(chunk)
                    .map(|lines| scope.spawn(move || lines.iter().map(parse).collect::<Vec<_>>()))
                    .collect();
                let mut all = Vec::with_capacity(raw_lines.len());
                for (handle, lines) in handles.into_iter().zip(raw_lines.chunks(chunk)) {
                    // A worker that panicked (a bug of ours) has its lines parsed again here.
                    all.extend(
                        handle
                            .join()
                            .unwrap_or_else(|_| lines.iter().map(parse).collect()),
                    );
                }
                all
            })
        } else {
            raw_lines.iter().map(parse).collect()
        };
    let mut lines = Vec::with_capacity(results.len());
    let mut errors = Vec::new();
    for result in results {
        match result {
            Ok(line) => lines.push(line),
            Err((invalid, error)) => {
                lines.push(invalid);
                errors.push(error);
            }
        }
    }
    ParsedSheet {
        sheet: Sheet { lines },
        errors,
    }
}

/// The UTF-8 byte-order mark, skipped at the start of a sheet (as data files skip it).
pub const BYTE_ORDER_MARK: char = '\u{feff}';

/// Sheets shorter than this are parsed on one thread: starting threads would cost more.
const PARALLEL_PARSE_LINES: usize = 2_000;

/// Parses one line whose text starts at byte `offset` of its file.
pub fn parse_line(text: &str, number: usize, offset: usize) -> Result<Line, SyntaxError> {
    guard_against_deep_input(text, offset)?;
    if let Some(kind_and_comment) = plain_text_line(text) {
        let (kind, comment) = kind_and_comment;
        return Ok(Line {
            number,
            span: Span::new(offset, offset + text.len()),
            kind,
            comment,
        });
    }
    parse_line_with_grammar(text, number, offset)
}

/// A blank line, a heading or a comment alone: what the grammar makes of them is plain (a
/// heading or a comment is the rest of the line, trimmed), so they skip the parser's fixed
/// cost. Anything else is `None` and goes to the grammar.
fn plain_text_line(text: &str) -> Option<(LineKind, Option<String>)> {
    let rest = text.trim_start_matches([' ', '\t']);
    if rest.is_empty() {
        return Some((LineKind::Blank, None));
    }
    if let Some(heading) = rest.strip_prefix("##") {
        return Some((LineKind::Heading(heading.trim().to_string()), None));
    }
    let comment = rest.strip_prefix('#')?;
    Some((LineKind::Comment, Some(comment.trim().to_string())))
}

/// One line through the grammar (every line but the plain ones of `plain_text_line`).
fn parse_line_with_grammar(text: &str, number: usize, offset: usize) -> Result<Line, SyntaxError> {
    let mut pairs =
        WorksheetParser::parse(Rule::line, text).map_err(|error| convert(error, text, offset))?;
    let line_pair = pairs.next().ok_or_else(|| internal(offset))?;
    let builder = Builder { offset };
    let mut kind = LineKind::Blank;
    let mut comment = None;
    for pair in line_pair.into_inner() {
        match pair.as_rule() {
            Rule::heading => {
                let text = inner_text(pair).map(|text| text.trim().to_string());
                kind = LineKind::Heading(text.unwrap_or_default());
            }
            Rule::comment => {
                comment = inner_text(pair).map(|text| text.trim().to_string());
            }
            Rule::definition => kind = builder.definition(pair)?,
            Rule::field_line => {
                let mut field = Field {
                    name: String::new(),
                    text: String::new(),
                };
                for inner in pair.into_inner() {
                    match inner.as_rule() {
                        Rule::field_name => field.name = inner.as_str().to_string(),
                        Rule::field_text => field.text = inner.as_str().trim().to_string(),
                        _ => {}
                    }
                }
                kind = LineKind::Field(field);
            }
            Rule::include_line => {
                for inner in pair.into_inner() {
                    match inner.as_rule() {
                        Rule::quoted_path => {
                            let path_span = builder.span(&inner);
                            let path = inner_text(inner).unwrap_or_default();
                            kind = LineKind::Include(Include { path, path_span });
                        }
                        Rule::comment => {
                            comment = inner_text(inner).map(|text| text.trim().to_string());
                        }
                        _ => {}
                    }
                }
            }
            Rule::display => kind = LineKind::Display(builder.display(pair)?),
            Rule::plot_line => {
                let (plot, plot_comment) = builder.plot(pair)?;
                kind = LineKind::Plot(plot);
                comment = plot_comment;
            }
            Rule::check_line => {
                let (check, check_comment) = builder.check(pair)?;
                kind = LineKind::Check(Box::new(check));
                comment = check_comment;
            }
            _ => {}
        }
    }
    if kind == LineKind::Blank && comment.is_some() {
        kind = LineKind::Comment;
    }
    Ok(Line {
        number,
        span: Span::new(offset, offset + text.len()),
        kind,
        comment,
    })
}

/// Parses a unit written alone, e.g. a command-line `--unit viscosity=cP`.
pub fn parse_unit(text: &str) -> Result<UnitExpression, SyntaxError> {
    guard_against_deep_input(text, 0)?;
    let mut pairs =
        WorksheetParser::parse(Rule::unit_alone, text).map_err(|error| convert(error, text, 0))?;
    let unit = pairs
        .next()
        .and_then(|pair| pair.into_inner().next())
        .ok_or_else(|| internal(0))?;
    Builder { offset: 0 }.unit(unit)
}

/// Parses an expression written alone, e.g. a command-line `--from 0degC`.
pub fn parse_expression(text: &str) -> Result<Expression, SyntaxError> {
    guard_against_deep_input(text, 0)?;
    let mut pairs = WorksheetParser::parse(Rule::expression_alone, text)
        .map_err(|error| convert(error, text, 0))?;
    let expression = pairs
        .next()
        .and_then(|pair| pair.into_inner().next())
        .ok_or_else(|| internal(0))?;
    Builder { offset: 0 }.expression(expression)
}

/// Parses the value of a `--set name=value` override: an expression or a range. Spans count
/// from `offset`, where the caller places the text in its source map.
pub fn parse_set_value(text: &str, offset: usize) -> Result<Expression, SyntaxError> {
    guard_against_deep_input(text, offset)?;
    let mut pairs = WorksheetParser::parse(Rule::set_value, text)
        .map_err(|error| convert(error, text, offset))?;
    let value = pairs
        .next()
        .and_then(|pair| pair.into_inner().next())
        .ok_or_else(|| internal(offset))?;
    Builder { offset }.line_value(value)
}

/// The text of a pair's first inner pair: a message's text, a comment's, a path's.
fn inner_text(pair: Pair<Rule>) -> Option<String> {
    pair.into_inner()
        .next()
        .map(|text| text.as_str().to_string())
}

/// Rejects nesting and operator counts that would exhaust the stack in a recursive parser.
/// Only operators of expressions count: not the signs of a list's values or of a number's
/// exponent (`1e-3`), nor characters inside a quoted message or path.
fn guard_against_deep_input(text: &str, offset: usize) -> Result<(), SyntaxError> {
    let mut depth = 0usize;
    let mut operators = 0usize;
    let mut in_quotes = false;
    let mut in_list = false;
    let mut previous = ' ';
    let mut before_previous = ' ';
    for (position, character) in text.char_indices() {
        let exponent_sign = matches!(previous, 'e' | 'E') && before_previous.is_ascii_digit();
        before_previous = previous;
        previous = character;
        if in_quotes {
            in_quotes = character != '"';
            continue;
        }
        match character {
            '"' => in_quotes = true,
            '{' => in_list = true,
            '}' => in_list = false,
            '(' | '[' => {
                depth += 1;
                if depth > NESTING_LIMIT {
                    return Err(SyntaxError {
                        kind: SyntaxErrorKind::NestingTooDeep {
                            limit: NESTING_LIMIT,
                        },
                        span: Span::new(offset + position, offset + position + 1),
                    });
                }
            }
            ')' | ']' => depth = depth.saturating_sub(1),
            '+' | '-' | '*' | '/' | '^' if !in_list && !exponent_sign => {
                operators += 1;
                if operators > OPERATOR_LIMIT {
                    return Err(SyntaxError {
                        kind: SyntaxErrorKind::ExpressionTooLong {
                            limit: OPERATOR_LIMIT,
                        },
                        span: Span::new(offset + position, offset + position + 1),
                    });
                }
            }
            '#' => break,
            _ => {}
        }
    }
    Ok(())
}

/// Binding power and right-associativity of each binary operator; a sign binds between `*`
/// and `^`, so `-2^2` is -(2^2) and `2^-1` is 2^(-1).
fn binding_power(operator: BinaryOperator) -> (u8, bool) {
    match operator {
        BinaryOperator::Add | BinaryOperator::Subtract => (1, false),
        BinaryOperator::Multiply | BinaryOperator::Divide => (2, false),
        BinaryOperator::Power => (4, true),
    }
}

/// The binding power of a unary sign.
const SIGN_POWER: u8 = 3;

/// One element of an expression's flat pair list.
enum Token {
    Sign { negative: bool, span: Span },
    Operand(Expression),
    Operator(BinaryOperator),
}

struct Builder {
    offset: usize,
}

impl Builder {
    fn span(&self, pair: &Pair<Rule>) -> Span {
        let span = pair.as_span();
        Span::new(span.start() + self.offset, span.end() + self.offset)
    }

    /// A named line, or a sheet function when the name is followed by parameters.
    fn definition(&self, pair: Pair<Rule>) -> Result<LineKind, SyntaxError> {
        let fallback = self.span(&pair);
        let mut name = None;
        let mut parameters = None;
        let mut display_unit = None;
        let mut expression = None;
        for inner in pair.into_inner() {
            match inner.as_rule() {
                Rule::name => {
                    name = Some(Name {
                        text: inner.as_str().to_string(),
                        span: self.span(&inner),
                    })
                }
                Rule::parameters => parameters = Some(self.parameters(inner)?),
                Rule::display_unit => display_unit = Some(self.display_unit(inner)?),
                Rule::ranged | Rule::file_column | Rule::solve | Rule::fit | Rule::distribution => {
                    expression = Some(self.line_value(inner)?)
                }
                _ => {}
            }
        }
        let (Some(name), Some(expression)) = (name, expression) else {
            return Err(internal(fallback.start));
        };
        Ok(match parameters {
            Some(parameters) => LineKind::Function(FunctionDefinition {
                name,
                parameters,
                result_unit: display_unit,
                body: expression,
            }),
            None => LineKind::Definition(Definition {
                name,
                display_unit,
                expression,
            }),
        })
    }

    fn parameters(&self, pair: Pair<Rule>) -> Result<Vec<Parameter>, SyntaxError> {
        let fallback = self.span(&pair);
        let mut parameters = Vec::new();
        for parameter in pair.into_inner() {
            let mut parts = parameter.into_inner();
            let parameter_name = parts.next().ok_or_else(|| internal(fallback.start))?;
            let unit = match parts.next() {
                Some(unit) => Some(self.display_unit(unit)?),
                None => None,
            };
            // `f(x, x)` would silently bind the first argument only.
            if parameters
                .iter()
                .any(|earlier: &Parameter| earlier.name.text == parameter_name.as_str())
            {
                return Err(SyntaxError {
                    kind: SyntaxErrorKind::DuplicateParameter {
                        name: parameter_name.as_str().to_string(),
                    },
                    span: self.span(&parameter_name),
                });
            }
            parameters.push(Parameter {
                name: Name {
                    text: parameter_name.as_str().to_string(),
                    span: self.span(&parameter_name),
                },
                unit,
            });
        }
        Ok(parameters)
    }

    fn display(&self, pair: Pair<Rule>) -> Result<Display, SyntaxError> {
        let fallback = self.span(&pair);
        let mut display_unit = None;
        let mut expression = None;
        for inner in pair.into_inner() {
            match inner.as_rule() {
                Rule::display_unit => display_unit = Some(self.display_unit(inner)?),
                Rule::ranged => expression = Some(self.line_value(inner)?),
                _ => {}
            }
        }
        let expression = expression.ok_or_else(|| internal(fallback.start))?;
        Ok(Display {
            expression,
            display_unit,
        })
    }

    fn check(&self, pair: Pair<Rule>) -> Result<(Check, Option<String>), SyntaxError> {
        let fallback = self.span(&pair);
        let mut expressions = Vec::new();
        let mut comparison = None;
        let mut tolerance = None;
        let mut tolerance_text = None;
        let mut message = None;
        let mut comment = None;
        for inner in pair.into_inner() {
            match inner.as_rule() {
                Rule::expression => expressions.push(self.expression(inner)?),
                Rule::comparison => {
                    let operator = match inner.as_str() {
                        "<" => Comparison::Less,
                        "<=" => Comparison::LessOrEqual,
                        ">" => Comparison::Greater,
                        ">=" => Comparison::GreaterOrEqual,
                        "==" => Comparison::Equal,
                        _ => Comparison::NotEqual,
                    };
                    comparison = Some((operator, self.span(&inner)));
                }
                Rule::tolerance => {
                    let expression = inner
                        .into_inner()
                        .next()
                        .ok_or_else(|| internal(fallback.start))?;
                    tolerance_text = Some(expression.as_str().trim().to_string());
                    tolerance = Some(self.expression(expression)?);
                }
                Rule::message => message = inner_text(inner),
                Rule::comment => comment = inner_text(inner).map(|text| text.trim().to_string()),
                _ => {}
            }
        }
        let mut expressions = expressions.into_iter();
        match (expressions.next(), comparison, expressions.next()) {
            (Some(left), Some((comparison, comparison_span)), Some(right)) => Ok((
                Check {
                    left,
                    comparison,
                    comparison_span,
                    right,
                    tolerance,
                    tolerance_text,
                    message,
                },
                comment,
            )),
            _ => Err(internal(fallback.start)),
        }
    }

    fn display_unit(&self, pair: Pair<Rule>) -> Result<UnitExpression, SyntaxError> {
        let fallback = self.span(&pair);
        let unit = pair
            .into_inner()
            .next()
            .ok_or_else(|| internal(fallback.start))?;
        self.unit(unit)
    }

    fn expression(&self, pair: Pair<Rule>) -> Result<Expression, SyntaxError> {
        self.operations(pair.into_inner())
    }

    /// The value side of a named line: an expression, a range, a file column or a solve.
    fn line_value(&self, pair: Pair<Rule>) -> Result<Expression, SyntaxError> {
        let span = self.span(&pair);
        let rule = pair.as_rule();
        if rule == Rule::ranged {
            // The common case, a plain expression, builds nothing else.
            let mut inner = pair.into_inner();
            let from = inner.next().ok_or_else(|| internal(span.start))?;
            let from = self.expression(from)?;
            return match inner.next() {
                None => Ok(from),
                Some(tail) => Ok(Expression {
                    kind: ExpressionKind::Range(Box::new(self.range(from, tail)?)),
                    span,
                }),
            };
        }
        if rule == Rule::distribution {
            // The rule's last repetition takes the spaces before a comment: not part of it.
            let trimmed = pair.as_str().trim_end().len();
            let span = Span::new(span.start, span.start + trimmed);
            let kind = ExpressionKind::Distribution(Box::new(self.distribution(pair)?));
            return Ok(Expression { kind, span });
        }
        let mut expressions = Vec::new();
        let mut names = Vec::new();
        let mut path = None;
        let mut logarithmic = false;
        for inner in pair.into_inner() {
            match inner.as_rule() {
                Rule::log_keyword => logarithmic = true,
                Rule::expression => expressions.push(self.expression(inner)?),
                Rule::name => names.push(Name {
                    text: inner.as_str().to_string(),
                    span: self.span(&inner),
                }),
                Rule::quoted_path => {
                    let path_span = self.span(&inner);
                    let text = inner_text(inner);
                    path = Some((text.unwrap_or_default(), path_span));
                }
                _ => {}
            }
        }
        let kind = match rule {
            Rule::file_column => {
                let (Some(header), Some((path, path_span))) = (names.pop(), path) else {
                    return Err(internal(span.start));
                };
                ExpressionKind::FileColumn {
                    header,
                    path,
                    path_span,
                }
            }
            Rule::solve => {
                let [goal, lower, upper]: [Expression; 3] =
                    expressions.try_into().map_err(|_| internal(span.start))?;
                let [line, unknown]: [Name; 2] =
                    names.try_into().map_err(|_| internal(span.start))?;
                ExpressionKind::Solve(Box::new(Solve {
                    line,
                    goal,
                    unknown,
                    lower,
                    upper,
                }))
            }
            Rule::fit => {
                let mut names = names.into_iter();
                let (Some(model), Some(observed)) = (names.next(), names.next()) else {
                    return Err(internal(span.start));
                };
                ExpressionKind::Fit(Box::new(Fit {
                    model,
                    observed,
                    varying: names.collect(),
                    logarithmic,
                }))
            }
            _ => return Err(internal(span.start)),
        };
        Ok(Expression { kind, span })
    }

    /// `lognormal median 1e-9 m/s factor 3 between … and … rank 0.5 with t`.
    fn distribution(&self, pair: Pair<Rule>) -> Result<Distribution, SyntaxError> {
        let start = self.span(&pair).start;
        let mut inner = pair.into_inner();
        let shape = inner.next().ok_or_else(|| internal(start))?;
        let mut family = match shape.as_rule() {
            Rule::normal => Family::Normal,
            Rule::lognormal => Family::LogNormalFactor,
            Rule::uniform => Family::Uniform,
            Rule::loguniform => Family::LogUniform,
            Rule::triangular => Family::Triangular,
            _ => return Err(internal(start)),
        };
        let mut parameters = Vec::new();
        for part in shape.into_inner() {
            match part.as_rule() {
                Rule::expression => parameters.push(self.expression(part)?),
                Rule::log_spread => {
                    for spread in part.into_inner() {
                        match spread.as_rule() {
                            Rule::sdln_keyword => family = Family::LogNormalSdLn,
                            Rule::sdlog10_keyword => family = Family::LogNormalSdLog10,
                            Rule::expression => parameters.push(self.expression(spread)?),
                            _ => {}
                        }
                    }
                }
                _ => {}
            }
        }
        let mut bounds = None;
        let mut correlations = Vec::new();
        for tail in inner {
            let rule = tail.as_rule();
            let mut expressions = Vec::new();
            let mut with = None;
            for part in tail.into_inner() {
                match part.as_rule() {
                    Rule::expression => expressions.push(self.expression(part)?),
                    Rule::name => {
                        with = Some(Name {
                            text: part.as_str().to_string(),
                            span: self.span(&part),
                        })
                    }
                    _ => {}
                }
            }
            match (rule, with) {
                (Rule::truncation, _) => {
                    bounds = Some(expressions.try_into().map_err(|_| internal(start))?)
                }
                (Rule::correlation, Some(with)) => {
                    let rank = expressions.pop().ok_or_else(|| internal(start))?;
                    correlations.push(Correlation { rank, with });
                }
                _ => return Err(internal(start)),
            }
        }
        Ok(Distribution {
            family,
            parameters,
            bounds,
            correlations,
        })
    }

    /// `from` and the tail `to B step S` or `to B count N [log]`.
    fn range(&self, from: Expression, tail: Pair<Rule>) -> Result<Range, SyntaxError> {
        let start = self.span(&tail).start;
        let mut expressions = Vec::new();
        let (mut by_count, mut logarithmic) = (false, false);
        for inner in tail.into_inner() {
            match inner.as_rule() {
                Rule::expression => expressions.push(self.expression(inner)?),
                Rule::count_keyword => by_count = true,
                Rule::log_keyword => logarithmic = true,
                _ => {}
            }
        }
        let [to, spacing]: [Expression; 2] = expressions.try_into().map_err(|_| internal(start))?;
        let spacing = if by_count {
            Spacing::Count {
                count: spacing,
                logarithmic,
            }
        } else {
            Spacing::Step(spacing)
        };
        Ok(Range { from, to, spacing })
    }

    /// `plot a, b against x log y "title"`, and the line's trailing comment.
    fn plot(&self, pair: Pair<Rule>) -> Result<(Plot, Option<String>), SyntaxError> {
        let span = self.span(&pair);
        let mut names = Vec::new();
        let (mut log_x, mut log_y) = (false, false);
        let (mut down, mut points) = (false, false);
        let mut title = None;
        let mut comment = None;
        for inner in pair.into_inner() {
            match inner.as_rule() {
                Rule::name => names.push(Name {
                    text: inner.as_str().to_string(),
                    span: self.span(&inner),
                }),
                Rule::log_axis => {
                    if inner.as_str().trim_end().ends_with('x') {
                        log_x = true;
                    } else {
                        log_y = true;
                    }
                }
                Rule::down_keyword => down = true,
                Rule::points_keyword => points = true,
                Rule::message => title = inner_text(inner),
                Rule::comment => comment = inner_text(inner).map(|text| text.trim().to_string()),
                _ => {}
            }
        }
        let against = names.pop().ok_or_else(|| internal(span.start))?;
        let plot = Plot {
            series: names,
            against,
            log_x,
            log_y,
            down,
            points,
            title,
        };
        Ok((plot, comment))
    }

    fn operations(&self, pairs: Pairs<Rule>) -> Result<Expression, SyntaxError> {
        let mut tokens: Vec<Token> = Vec::new();
        for pair in pairs {
            if pair.as_rule() == Rule::operator && pair.as_str() == "^" {
                self.refuse_spaced_unit_power(tokens.last(), &pair)?;
            }
            let token = match pair.as_rule() {
                Rule::sign => Token::Sign {
                    negative: pair.as_str() == "-",
                    span: self.span(&pair),
                },
                Rule::operator => Token::Operator(match pair.as_str() {
                    "+" => BinaryOperator::Add,
                    "-" => BinaryOperator::Subtract,
                    "*" => BinaryOperator::Multiply,
                    "/" => BinaryOperator::Divide,
                    _ => BinaryOperator::Power,
                }),
                _ => Token::Operand(self.primary(pair)?),
            };
            tokens.push(token);
        }
        climb(&mut tokens.into_iter().peekable(), 0).ok_or_else(|| internal(self.offset))
    }

    /// `2 m^ 2` reads as `(2 m)^2` (4 m²) while `2 m^2` is 2 m²: a `^` touching a number's
    /// unit was meant as a unit power, so its spacing is refused rather than guessed.
    fn refuse_spaced_unit_power(
        &self,
        previous: Option<&Token>,
        power: &Pair<Rule>,
    ) -> Result<(), SyntaxError> {
        let Some(Token::Operand(Expression {
            kind: ExpressionKind::Quantity {
                unit: Some(unit), ..
            },
            ..
        })) = previous
        else {
            return Ok(());
        };
        let power_span = self.span(power);
        // `(2 m)^2` has the parenthesis between the unit and the `^`.
        if unit.span.end == power_span.start {
            return Err(SyntaxError {
                kind: SyntaxErrorKind::SpacedUnitPower {
                    unit: unit.text.clone(),
                },
                span: power_span,
            });
        }
        Ok(())
    }

    fn primary(&self, pair: Pair<Rule>) -> Result<Expression, SyntaxError> {
        let span = self.span(&pair);
        match pair.as_rule() {
            Rule::quantity => {
                let mut inner = pair.into_inner();
                let digits = inner
                    .next()
                    .map(|number| number.as_str().to_string())
                    .unwrap_or_default();
                let unit = match inner.next() {
                    Some(unit) => Some(self.unit(unit)?),
                    None => None,
                };
                Ok(Expression {
                    kind: ExpressionKind::Quantity { digits, unit },
                    span,
                })
            }
            Rule::list => {
                let mut items = Vec::new();
                let mut unit = None;
                for inner in pair.into_inner() {
                    match inner.as_rule() {
                        Rule::list_item => items.push(inner.as_str().to_string()),
                        Rule::unit_expression => unit = Some(self.unit(inner)?),
                        _ => {}
                    }
                }
                Ok(Expression {
                    kind: ExpressionKind::List { items, unit },
                    span,
                })
            }
            Rule::reference => {
                let mut inner = pair.into_inner();
                let name = inner.next().ok_or_else(|| internal(span.start))?;
                let Some(arguments) = inner.next() else {
                    // The name's own span: the rule's may hold the spaces after it.
                    let kind = ExpressionKind::Name(name.as_str().to_string());
                    return Ok(Expression {
                        kind,
                        span: self.span(&name),
                    });
                };
                let function = Name {
                    text: name.as_str().to_string(),
                    span: self.span(&name),
                };
                let arguments = arguments
                    .into_inner()
                    .map(|argument| self.expression(argument))
                    .collect::<Result<_, _>>()?;
                Ok(Expression {
                    kind: ExpressionKind::Call {
                        function,
                        arguments,
                    },
                    span,
                })
            }
            Rule::expression => {
                // Parentheses: the span widens to include them.
                let inner = self.expression(pair)?;
                Ok(Expression {
                    kind: inner.kind,
                    span: Span::new(inner.span.start - 1, inner.span.end + 1),
                })
            }
            _ => Err(internal(span.start)),
        }
    }

    /// A unit tree. Only a whole unit expression keeps its text (for display and as the unit
    /// cache's key); inner nodes leave it empty, which saves an allocation per node.
    fn unit(&self, pair: Pair<Rule>) -> Result<UnitExpression, SyntaxError> {
        let span = self.span(&pair);
        match pair.as_rule() {
            Rule::unit_expression => {
                let text = pair.as_str().to_string();
                let mut inner = pair.into_inner();
                let first = inner.next().ok_or_else(|| internal(span.start))?;
                let mut result = self.unit(first)?;
                while let (Some(operator), Some(factor)) = (inner.next(), inner.next()) {
                    let right = self.unit(factor)?;
                    let combined_span = result.span.to(right.span);
                    let kind = if operator.as_rule() == Rule::unit_per {
                        UnitExpressionKind::Quotient(Box::new(result), Box::new(right))
                    } else {
                        UnitExpressionKind::Product(Box::new(result), Box::new(right))
                    };
                    result = UnitExpression {
                        kind,
                        span: combined_span,
                        text: String::new(),
                    };
                }
                Ok(UnitExpression { text, ..result })
            }
            Rule::unit_factor => {
                let mut inner = pair.into_inner();
                let base = inner.next().ok_or_else(|| internal(span.start))?;
                let base = self.unit(base)?;
                match inner.next() {
                    None => Ok(base),
                    Some(exponent) => {
                        let written = match exponent.as_rule() {
                            Rule::unit_superscript => plain_digits(exponent.as_str()),
                            _ => exponent.as_str().to_string(),
                        };
                        let (numerator, denominator) =
                            exponent_value(&written).map_err(|kind| SyntaxError {
                                kind,
                                span: self.span(&exponent),
                            })?;
                        Ok(UnitExpression {
                            kind: UnitExpressionKind::Power {
                                base: Box::new(base),
                                numerator,
                                denominator,
                            },
                            span,
                            text: String::new(),
                        })
                    }
                }
            }
            Rule::unit_symbol => Ok(UnitExpression {
                kind: UnitExpressionKind::Symbol(pair.as_str().to_string()),
                span,
                text: String::new(),
            }),
            Rule::unit_one => Ok(UnitExpression {
                kind: UnitExpressionKind::One,
                span,
                text: String::new(),
            }),
            _ => Err(internal(span.start)),
        }
    }
}

/// `⁻¹` -> `-1`: a superscript power as the digits `exponent_value` reads.
fn plain_digits(superscript: &str) -> String {
    superscript
        .chars()
        .map(|character| match character {
            '⁻' => '-',
            '⁰' => '0',
            '¹' => '1',
            '²' => '2',
            '³' => '3',
            '⁴' => '4',
            '⁵' => '5',
            '⁶' => '6',
            '⁷' => '7',
            '⁸' => '8',
            _ => '9',
        })
        .collect()
}

/// Precedence climbing over an expression's tokens: operands and operators alternate (the
/// grammar guarantees it) and signs prefix operands. `None` only if that shape is broken.
fn climb(
    tokens: &mut std::iter::Peekable<std::vec::IntoIter<Token>>,
    minimum: u8,
) -> Option<Expression> {
    let mut left = match tokens.next()? {
        Token::Operand(operand) => operand,
        Token::Sign { negative, span } => {
            let operand = climb(tokens, SIGN_POWER)?;
            let span = span.to(operand.span);
            match (negative, operand.kind) {
                // `-40 degF` is minus forty degrees Fahrenheit, not the negative of 40 degF.
                (true, ExpressionKind::Quantity { digits, unit }) if !digits.starts_with('-') => {
                    Expression {
                        kind: ExpressionKind::Quantity {
                            digits: format!("-{digits}"),
                            unit,
                        },
                        span,
                    }
                }
                (true, kind) => Expression {
                    kind: ExpressionKind::Negate(Box::new(Expression {
                        kind,
                        span: operand.span,
                    })),
                    span,
                },
                (false, kind) => Expression { kind, span },
            }
        }
        Token::Operator(_) => return None,
    };
    while let Some(Token::Operator(operator)) = tokens.peek() {
        let operator = *operator;
        let (power, right_associative) = binding_power(operator);
        if power < minimum {
            break;
        }
        tokens.next();
        let right = climb(tokens, if right_associative { power } else { power + 1 })?;
        let span = left.span.to(right.span);
        let kind = ExpressionKind::Binary {
            operator,
            left: Box::new(left),
            right: Box::new(right),
        };
        left = Expression { kind, span };
    }
    Some(left)
}

/// The largest numerator or denominator of a unit exponent: far beyond any real unit, and
/// small enough that exact factor powers stay cheap.
pub const UNIT_EXPONENT_LIMIT: u32 = 1_000;

/// Reads `2`, `-1`, `(1/2)`, `(-3/2)`; an error for a zero denominator or a number beyond
/// [`UNIT_EXPONENT_LIMIT`] (checked without overflow: `-2147483648` is refused, not wrapped).
fn exponent_value(text: &str) -> Result<(i32, i32), SyntaxErrorKind> {
    let inside = text.trim_start_matches('(').trim_end_matches(')');
    let (numerator, denominator) = inside.split_once('/').unwrap_or((inside, "1"));
    let too_large = SyntaxErrorKind::ExponentTooLarge {
        text: text.to_string(),
        limit: UNIT_EXPONENT_LIMIT,
    };
    let within_limit = |digits: &str| -> Result<i32, SyntaxErrorKind> {
        match digits.parse::<i64>() {
            Ok(value) if value.unsigned_abs() <= u64::from(UNIT_EXPONENT_LIMIT) => {
                i32::try_from(value).map_err(|_| too_large.clone())
            }
            // Only digits and a sign reach here (the grammar), so a failure is a huge number.
            _ => Err(too_large.clone()),
        }
    };
    let numerator = within_limit(numerator)?;
    let denominator = within_limit(denominator)?;
    if denominator <= 0 {
        return Err(SyntaxErrorKind::BadExponent {
            text: text.to_string(),
        });
    }
    Ok((numerator, denominator))
}

fn internal(position: usize) -> SyntaxError {
    SyntaxError {
        kind: SyntaxErrorKind::Unexpected {
            expected: vec!["valid syntax (internal parser error)"],
            found: None,
            hint: None,
        },
        span: Span::new(position, position),
    }
}

/// Turns a pest error into ours, naming what was expected in user words.
fn convert(error: pest::error::Error<Rule>, text: &str, offset: usize) -> SyntaxError {
    let position = match error.location {
        pest::error::InputLocation::Pos(position) => position,
        pest::error::InputLocation::Span((start, _)) => start,
    };
    let mut expected: Vec<&'static str> = Vec::new();
    if let pest::error::ErrorVariant::ParsingError { positives, .. } = &error.variant {
        for rule in positives {
            if let Some(words) = describe(*rule) {
                if !expected.contains(&words) {
                    expected.push(words);
                }
            }
        }
    }
    let rest = &text[position.min(text.len())..];
    let found: String = rest
        .chars()
        .take_while(|character| !character.is_whitespace())
        .take(12)
        .collect();
    let found_width = found.len().max(1);
    SyntaxError {
        kind: SyntaxErrorKind::Unexpected {
            expected,
            found: if rest.is_empty() { None } else { Some(found) },
            hint: super::error::hint_for(text),
        },
        span: Span::new(
            offset + position,
            offset + (position + found_width).min(text.len().max(position)),
        ),
    }
}

fn describe(rule: Rule) -> Option<&'static str> {
    Some(match rule {
        Rule::expression
        | Rule::quantity
        | Rule::number
        | Rule::reference
        | Rule::name
        | Rule::sign => "an expression",
        Rule::operator => "an operator",
        Rule::arguments => "`(`",
        Rule::display_unit => "`[unit]`",
        Rule::unit_expression | Rule::unit_factor | Rule::unit_symbol | Rule::unit_one => "a unit",
        Rule::unit_exponent => "a unit exponent such as 2 or (1/2)",
        Rule::comparison => "a comparison (`<`, `<=`, `>`, `>=`, `==`, `!=`)",
        Rule::tolerance => "`within`",
        Rule::message => "a quoted message",
        Rule::comment => "a `#` comment",
        Rule::EOI => "the end of the line",
        Rule::definition | Rule::display | Rule::check_line => "a line",
        Rule::quoted_path => "a quoted path",
        Rule::field_name => {
            "a field name (project, job, title, author, checker, date or revision) and `:`"
        }
        Rule::list | Rule::list_item => "an expression",
        Rule::to_keyword | Rule::range_tail => "`to`",
        Rule::ranged => "an expression",
        Rule::step_keyword | Rule::count_keyword => "`step` or `count`",
        Rule::log_keyword => "`log`",
        Rule::from_keyword => "`from`",
        Rule::for_keyword => "`for`",
        Rule::between_keyword => "`between`",
        Rule::and_keyword => "`and`",
        Rule::against_keyword => "`against`",
        Rule::down_keyword => "`down`",
        Rule::points_keyword => "`points`",
        Rule::axis => "`x` or `y`",
        Rule::mean_keyword => "`mean`",
        Rule::sd_keyword => "`sd`",
        Rule::median_keyword | Rule::geomean_keyword => "`median` or `geomean`",
        Rule::log_spread | Rule::factor_keyword | Rule::sdln_keyword | Rule::sdlog10_keyword => {
            "`factor`, `sdln` or `sdlog10`"
        }
        Rule::likely_keyword => "`likely`",
        Rule::with_keyword => "`with`",
        Rule::truncation | Rule::correlation | Rule::rank_keyword => "`between` or `rank`",
        Rule::parameter | Rule::parameters => "a parameter name",
        _ => return None,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Blank lines, headings and comments alone skip the grammar: each gives exactly the line
    /// the grammar gives, and lines that only look like them still go through it.
    #[test]
    fn plain_lines_read_as_the_grammar_reads_them() {
        let plain = [
            "",
            " ",
            "\t \t",
            "#",
            "# a comment",
            "   #  indented comment  ",
            "##",
            "## Heading",
            "\t## Heading with (parentheses) and \"quotes\" ",
            "###  three",
            "#x = 1 m",
            "## ünïcödé  ",
            "# trailing\u{a0}",
            "#\u{3000}wide space",
        ];
        for text in plain {
            assert!(plain_text_line(text).is_some(), "{text:?} is plain");
            assert_eq!(
                parse_line(text, 3, 10),
                parse_line_with_grammar(text, 3, 10),
                "{text:?}"
            );
        }
        let not_plain = [
            "x = 1 m # note",
            "\u{a0}",
            "\u{3000}# wide space first",
            "@title: t",
            "check a > b",
            "\x0b",
            "x",
            " x = 2",
        ];
        for text in not_plain {
            assert!(
                plain_text_line(text).is_none(),
                "{text:?} goes to the grammar"
            );
        }
        // The depth guard still looks at every line first, as it did.
        for text in [
            format!("# {}", "(".repeat(NESTING_LIMIT + 1)),
            format!("## {}", "1 + ".repeat(OPERATOR_LIMIT + 1)),
        ] {
            assert_eq!(
                parse_line(&text, 1, 0),
                guard_against_deep_input(&text, 0)
                    .and_then(|()| parse_line_with_grammar(&text, 1, 0))
            );
        }
    }

    fn expression(text: &str) -> Expression {
        parse_expression(text).unwrap_or_else(|error| panic!("{text}: {error}"))
    }

    /// Renders a tree compactly to compare structure in one line.
    fn shape(expression: &Expression) -> String {
        match &expression.kind {
            ExpressionKind::Quantity {
                digits,
                unit: Some(unit),
            } => format!("{digits}[{}]", unit.text),
            ExpressionKind::Quantity { digits, unit: None } => digits.clone(),
            ExpressionKind::Name(name) => name.clone(),
            ExpressionKind::List { items, unit } => format!(
                "{{{}}}[{}]",
                items.join(","),
                unit.as_ref().map_or("", |unit| unit.text.as_str())
            ),
            ExpressionKind::Range(range) => {
                let [from, to, spacing] = range.parts();
                format!("range({},{},{})", shape(from), shape(to), shape(spacing))
            }
            ExpressionKind::FileColumn { header, path, .. } => {
                format!("column({},{path})", header.text)
            }
            ExpressionKind::Fit(fit) => format!(
                "fit({},{},{}{})",
                fit.model.text,
                fit.observed.text,
                fit.varying
                    .iter()
                    .map(|name| name.text.as_str())
                    .collect::<Vec<_>>()
                    .join(","),
                if fit.logarithmic { ",log" } else { "" }
            ),
            ExpressionKind::Solve(solve) => format!(
                "solve({}=={},{},{},{})",
                solve.line.text,
                shape(&solve.goal),
                solve.unknown.text,
                shape(&solve.lower),
                shape(&solve.upper)
            ),
            ExpressionKind::Distribution(distribution) => {
                let mut parts: Vec<String> = distribution.parameters.iter().map(shape).collect();
                if let Some([low, high]) = &distribution.bounds {
                    parts.push(format!("between {} and {}", shape(low), shape(high)));
                }
                for correlation in &distribution.correlations {
                    parts.push(format!(
                        "rank {} with {}",
                        shape(&correlation.rank),
                        correlation.with.text
                    ));
                }
                format!("{:?}({})", distribution.family, parts.join(","))
            }
            ExpressionKind::Call {
                function,
                arguments,
            } => {
                format!(
                    "{}({})",
                    function.text,
                    arguments.iter().map(shape).collect::<Vec<_>>().join(",")
                )
            }
            ExpressionKind::Negate(inner) => format!("(-{})", shape(inner)),
            ExpressionKind::Binary {
                operator,
                left,
                right,
            } => {
                let symbol = match operator {
                    BinaryOperator::Add => "+",
                    BinaryOperator::Subtract => "-",
                    BinaryOperator::Multiply => "*",
                    BinaryOperator::Divide => "/",
                    BinaryOperator::Power => "^",
                };
                format!("({}{symbol}{})", shape(left), shape(right))
            }
        }
    }

    fn check(text: &str, expected: &str) {
        assert_eq!(shape(&expression(text)), expected, "{text}");
    }

    #[test]
    fn precedence_and_associativity() {
        check("1 + 2 * 3", "(1+(2*3))");
        check("2 ^ 3 ^ 2", "(2^(3^2))");
        check("-2 ^ 2", "(-(2^2))");
        check("a - b - c", "((a-b)-c)");
        check("2^-1", "(2^-1)");
        check("-40 degF", "-40[degF]");
        check("-x", "(-x)");
        check("--2", "(--2)");
        check("(a + b) * c", "((a+b)*c)");
    }

    #[test]
    fn units_attach_to_numbers_only() {
        check("2 m/d * A", "(2[m/d]*A)");
        check("10 gal/(d*ft^2)", "10[gal/(d*ft^2)]");
        check("1.2e-3 Pa*s", "1.2e-3[Pa*s]");
        check("30 %", "30[%]");
        check("f(1 mD, ρ, 2)", "f(1[mD],ρ,2)");
        check("250mD", "250[mD]");
    }

    /// The value of a named line, as a shape.
    fn line_value(text: &str) -> String {
        match parse_line(text, 1, 0).map(|line| line.kind) {
            Ok(LineKind::Definition(definition)) => shape(&definition.expression),
            other => panic!("{text}: {other:?}"),
        }
    }

    #[test]
    fn distributions_with_their_parameters_bounds_and_correlations() {
        for (text, expected) in [
            ("x = normal mean 0.9 m sd 0.05 m", "Normal(0.9[m],0.05[m])"),
            ("x = normal mean 0.35 sd 0.05", "Normal(0.35,0.05)"),
            (
                "K = lognormal median 1e-9 m/s factor 3",
                "LogNormalFactor(1e-9[m/s],3)",
            ),
            (
                "K = lognormal geomean 1e-9 m/s sdln 1.1",
                "LogNormalSdLn(1e-9[m/s],1.1)",
            ),
            (
                "K = lognormal median 2 * k sdlog10 0.5",
                "LogNormalSdLog10((2*k),0.5)",
            ),
            ("n = uniform 0.3 to 0.45", "Uniform(0.3,0.45)"),
            (
                "k = loguniform 1 mD to 1 darcy",
                "LogUniform(1[mD],1[darcy])",
            ),
            (
                "h = triangular 0.1 m to 0.6 m likely 0.3 m",
                "Triangular(0.1[m],0.6[m],0.3[m])",
            ),
            (
                "n = normal mean 0.35 sd 0.1 between 0 and 1 rank -0.5 with K rank 0.2 with t",
                "Normal(0.35,0.1,between 0 and 1,rank -0.5 with K,rank 0.2 with t)",
            ),
        ] {
            assert_eq!(line_value(text), expected, "{text}");
        }
        // A name that happens to be a family's word is still a name.
        assert_eq!(line_value("y = normal * 2"), "(normal*2)");
        assert_eq!(line_value("y = uniform"), "uniform");
        // A family without its words is a syntax error that names them.
        let error = parse_line("x = normal mean 1 m", 1, 0).unwrap_err();
        assert!(error.to_string().contains("`sd`"), "{error}");
        let error = parse_line("x = lognormal median 1 m 3", 1, 0).unwrap_err();
        assert!(
            error.to_string().contains("`factor`, `sdln` or `sdlog10`"),
            "{error}"
        );
    }

    #[test]
    fn spans_point_into_the_line() {
        let line = parse_line("K [m/s] = 2 * k", 3, 100).unwrap();
        let LineKind::Definition(definition) = line.kind else {
            panic!()
        };
        assert_eq!(definition.name.span, Span::new(100, 101));
        assert_eq!(definition.expression.span, Span::new(110, 115));
        assert_eq!(definition.display_unit.unwrap().span, Span::new(103, 106));
    }

    #[test]
    fn headings_comments_and_checks() {
        assert_eq!(
            parse_line("## Site", 1, 0).unwrap().kind,
            LineKind::Heading("Site".into())
        );
        assert_eq!(
            parse_line("  # note", 1, 0).unwrap().kind,
            LineKind::Comment
        );
        let line = parse_line("x = 2 m # why", 1, 0).unwrap();
        assert_eq!(line.comment.as_deref(), Some("why"));
        let check = parse_line("check K <= 1e-9 m/s within 1 % \"liner limit\"", 1, 0).unwrap();
        let LineKind::Check(check) = check.kind else {
            panic!()
        };
        assert_eq!(check.comparison, Comparison::LessOrEqual);
        assert_eq!(check.message.as_deref(), Some("liner limit"));
        assert!(check.tolerance.is_some());
    }

    #[test]
    fn syntax_errors_say_what_was_expected() {
        let error = parse_line("x = 2 +", 1, 0).unwrap_err();
        assert_eq!(
            error.to_string(),
            "expected an expression, found the end of the line"
        );
        let error = parse_line("x = )", 1, 0).unwrap_err();
        assert_eq!(error.span, Span::new(4, 5));
    }

    #[test]
    fn deep_nesting_is_refused_not_overflowed() {
        let deep = format!("x = {}1{}", "(".repeat(100_000), ")".repeat(100_000));
        let error = parse_line(&deep, 1, 0).unwrap_err();
        assert!(matches!(error.kind, SyntaxErrorKind::NestingTooDeep { .. }));
    }

    #[test]
    fn functions_and_includes() {
        let line = parse_line("leak(K [m/s], h) [m/d] = K * h / 1 m", 1, 0).unwrap();
        let LineKind::Function(function) = line.kind else {
            panic!("{:?}", line.kind)
        };
        assert_eq!(function.name.text, "leak");
        assert_eq!(function.parameters.len(), 2);
        assert!(function.parameters[0].unit.is_some() && function.parameters[1].unit.is_none());
        assert!(function.result_unit.is_some());
        // A call shown in a unit is a display line, not a definition.
        assert!(matches!(
            parse_line("leak(a, b) [m/d]", 1, 0).unwrap().kind,
            LineKind::Display(_)
        ));
        let include = parse_line("include \"shared/site.fxs\" # constants", 1, 0).unwrap();
        assert!(
            matches!(include.kind, LineKind::Include(Include { ref path, .. }) if path == "shared/site.fxs")
        );
        assert_eq!(include.comment.as_deref(), Some("constants"));
        assert!(matches!(
            parse_line("include_depth = 3 m", 1, 0).unwrap().kind,
            LineKind::Definition(_)
        ));
    }

    #[test]
    fn a_long_sheet_parsed_on_several_threads_matches_line_by_line() {
        let text: String = (0..5_000)
            .map(|index| {
                if index % 997 == 0 {
                    format!("bad_{index} = = 1\n")
                } else {
                    format!("x_{index} = {index} m * 2\n")
                }
            })
            .collect();
        let parsed = parse_sheet(&text);
        let mut offset = 0;
        let mut expected_errors = 0;
        for (index, raw) in text.split_terminator('\n').enumerate() {
            match parse_line(raw, index + 1, offset) {
                Ok(line) => assert_eq!(parsed.sheet.lines[index], line),
                Err(error) => {
                    assert_eq!(parsed.sheet.lines[index].kind, LineKind::Invalid);
                    assert_eq!(parsed.errors[expected_errors], error);
                    expected_errors += 1;
                }
            }
            offset += raw.len() + 1;
        }
        assert_eq!(
            (parsed.sheet.lines.len(), parsed.errors.len()),
            (5_000, expected_errors)
        );
    }

    #[test]
    fn sheet_keeps_going_after_a_bad_line() {
        let parsed = parse_sheet("a = 1 m\nb = = 2\nc = a * 2\n");
        assert_eq!(parsed.sheet.lines.len(), 3);
        assert_eq!(parsed.errors.len(), 1);
        assert_eq!(parsed.sheet.lines[1].kind, LineKind::Invalid);
    }

    #[test]
    fn unit_exponents_are_rational() {
        let unit = parse_unit("m^(1/2)").unwrap();
        assert!(matches!(
            unit.kind,
            UnitExpressionKind::Power {
                numerator: 1,
                denominator: 2,
                ..
            }
        ));
        assert!(parse_unit("m^(1/0)").is_err());
    }
}
