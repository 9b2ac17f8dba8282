//! What is under the cursor, where a name is defined (across includes), and the outline of a
//! sheet: headings as sections holding the named lines and functions below them.

use super::diagnostics::location;
use super::document::Document;
use crate::syntax::UnitExpressionKind;
use crate::syntax::{Expression, ExpressionKind, Line, LineKind, Span, UnitExpression};
use lsp_types::{DocumentSymbol, Location, SymbolKind};

/// What the cursor is on.
#[derive(Debug, Clone, PartialEq)]
pub enum Token {
    /// A unit symbol inside a unit (`m` of `m/s^2`).
    Unit { symbol: String, span: Span },
    /// A word: a sheet name, a sheet function, a built-in or a constant.
    Word { text: String, span: Span },
}

/// The token at byte `offset` of the document, if any.
pub fn token_at(document: &Document, offset: usize) -> Option<Token> {
    let line = document
        .syntax()
        .iter()
        .find(|line| line.span.start <= offset && offset <= line.span.end)?;
    let mut unit = None;
    for_each_unit(line, &mut |symbol: &str, span: Span| {
        if span.start <= offset && offset <= span.end {
            unit = Some(Token::Unit {
                symbol: symbol.to_string(),
                span,
            });
        }
    });
    unit.or_else(|| word_at(&document.text, offset))
}

/// The word (letters of any script, digits, `_`) around `offset`.
pub fn word_at(text: &str, offset: usize) -> Option<Token> {
    let offset = offset.min(text.len());
    if !text.is_char_boundary(offset) {
        return None;
    }
    let is_word = |character: char| character.is_alphanumeric() || character == '_';
    let start = text[..offset]
        .char_indices()
        .rev()
        .take_while(|(_, character)| is_word(*character))
        .last()
        .map_or(offset, |(index, _)| index);
    let end = text[offset..]
        .char_indices()
        .find(|(_, character)| !is_word(*character))
        .map_or(text.len(), |(index, _)| offset + index);
    let word = &text[start..end];
    if word.is_empty() || word.starts_with(|character: char| character.is_ascii_digit()) {
        return None;
    }
    Some(Token::Word {
        text: word.to_string(),
        span: Span::new(start, end),
    })
}

/// The line (of this sheet or an included one) that defines `name` as a value or a function.
pub fn defining_line<'d>(document: &'d Document, name: &str) -> Option<&'d Line> {
    document.syntax().iter().find(|line| match &line.kind {
        LineKind::Definition(definition) => definition.name.text == name,
        LineKind::Function(function) => function.name.text == name,
        _ => false,
    })
}

/// The span of the name a line defines.
pub fn defined_name_span(line: &Line) -> Option<Span> {
    match &line.kind {
        LineKind::Definition(definition) => Some(definition.name.span),
        LineKind::Function(function) => Some(function.name.span),
        _ => None,
    }
}

/// Where the word at `offset` is defined.
pub fn definition(document: &Document, offset: usize) -> Option<Location> {
    let Token::Word { text, .. } = word_at(&document.text, offset)? else {
        return None;
    };
    let line = defining_line(document, &text)?;
    location(document, defined_name_span(line)?)
}

/// The outline: each heading a section holding the named lines and functions after it.
pub fn symbols(document: &Document) -> Vec<DocumentSymbol> {
    let text_length = document.text.len();
    let mut outline: Vec<DocumentSymbol> = Vec::new();
    let mut section: Option<DocumentSymbol> = None;
    for line in document
        .syntax()
        .iter()
        .filter(|line| line.span.end <= text_length)
    {
        let range = document.index.range(&document.text, line.span.range());
        let symbol = |name: String, kind: SymbolKind, detail: Option<String>, span: Span| {
            #[allow(deprecated)] // `deprecated` is a required field of the protocol type.
            DocumentSymbol {
                name,
                detail,
                kind,
                tags: None,
                deprecated: None,
                range,
                selection_range: document.index.range(&document.text, span.range()),
                children: None,
            }
        };
        let entry = match &line.kind {
            LineKind::Heading(title) => {
                outline.extend(section.take());
                section = Some(symbol(
                    title.trim().to_string(),
                    SymbolKind::NAMESPACE,
                    None,
                    line.span,
                ));
                continue;
            }
            LineKind::Definition(definition) => symbol(
                definition.name.text.clone(),
                SymbolKind::VARIABLE,
                value_detail(document, line),
                definition.name.span,
            ),
            LineKind::Function(function) => symbol(
                function.name.text.clone(),
                SymbolKind::FUNCTION,
                None,
                function.name.span,
            ),
            _ => continue,
        };
        match section.as_mut() {
            Some(section) => {
                section.range.end = entry.range.end;
                section.children.get_or_insert_with(Vec::new).push(entry);
            }
            None => outline.push(entry),
        }
    }
    outline.extend(section);
    outline
}

fn value_detail(document: &Document, line: &Line) -> Option<String> {
    match &document.outcome(line.number - 1)?.result {
        crate::eval::LineResult::Value(shown) => Some(super::inlay::value_text(shown)),
        _ => None,
    }
}

/// Calls `visit` with every unit symbol written on a line and its span.
pub fn for_each_unit(line: &Line, visit: &mut dyn FnMut(&str, Span)) {
    let mut units: Vec<&UnitExpression> = Vec::new();
    let mut expressions: Vec<&Expression> = Vec::new();
    match &line.kind {
        LineKind::Definition(definition) => {
            units.extend(&definition.display_unit);
            expressions.push(&definition.expression);
        }
        LineKind::Display(display) => {
            units.extend(&display.display_unit);
            expressions.push(&display.expression);
        }
        LineKind::Check(check) => {
            expressions.extend([&check.left, &check.right]);
            expressions.extend(&check.tolerance);
        }
        LineKind::Function(function) => {
            units.extend(
                function
                    .parameters
                    .iter()
                    .filter_map(|parameter| parameter.unit.as_ref()),
            );
            units.extend(&function.result_unit);
            expressions.push(&function.body);
        }
        _ => {}
    }
    for expression in expressions {
        expression.for_each_subexpression(&mut |part| {
            if let ExpressionKind::Quantity { unit, .. } | ExpressionKind::List { unit, .. } =
                &part.kind
            {
                units.extend(unit);
            }
        });
    }
    while let Some(unit) = units.pop() {
        match &unit.kind {
            UnitExpressionKind::Symbol(symbol) => visit(symbol, unit.span),
            UnitExpressionKind::One => {}
            UnitExpressionKind::Product(left, right)
            | UnitExpressionKind::Quotient(left, right) => units.extend([&**left, &**right]),
            UnitExpressionKind::Power { base, .. } => units.push(base),
        }
    }
}
