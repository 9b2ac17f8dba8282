//! Hovers: on a sheet name its value, unit, dimension and defining line; on a built-in its
//! formula, parameters with units, validity and citation; on a unit its definition and source.

use super::document::Document;
use super::inlay::value_text;
use super::navigation::{defining_line, token_at, Token};
use crate::eval::{Library, LineResult};
use crate::library::Builtins;
use crate::render::format_significant;
use crate::syntax::LineKind;
use crate::units::unit::{catalog_entries, prefixes, CatalogEntry, Unit};
use lsp_types::{Hover, HoverContents, MarkupContent, MarkupKind};

/// The hover at byte `offset`, if the cursor is on something known.
pub fn hover(document: &Document, offset: usize) -> Option<Hover> {
    let (markdown, span) = match token_at(document, offset)? {
        Token::Unit { symbol, span } => (unit_hover(&symbol)?, span),
        Token::Word { text, span } => (word_hover(document, &text)?, span),
    };
    let range = (span.end <= document.text.len())
        .then(|| document.index.range(&document.text, span.range()));
    Some(Hover {
        contents: HoverContents::Markup(MarkupContent {
            kind: MarkupKind::Markdown,
            value: markdown,
        }),
        range,
    })
}

/// A sheet's own name first (it may shadow a built-in), then built-ins and constants.
fn word_hover(document: &Document, word: &str) -> Option<String> {
    sheet_name_hover(document, word)
        .or_else(|| builtin_hover(word))
        .or_else(|| constant_hover(word))
}

fn sheet_name_hover(document: &Document, name: &str) -> Option<String> {
    let line = defining_line(document, name)?;
    let sources = &document.evaluation.sources;
    let (label, number, _) = sources.locate(line.span.start);
    let in_this_sheet = sources.file_index_of(line.span.start) == 0;
    let written = sources.text_of(line.span).trim();
    let place = if in_this_sheet {
        format!("line {number}")
    } else {
        format!("`{label}` line {number}")
    };
    let mut text = String::new();
    match &line.kind {
        LineKind::Function(_) => {
            text.push_str(&format!("**{name}** — sheet function\n\n"));
        }
        _ => {
            let outcome = in_this_sheet
                .then(|| document.outcome(number - 1))
                .flatten();
            match outcome.map(|outcome| &outcome.result) {
                Some(LineResult::Value(shown)) => {
                    text.push_str(&format!("**{name}** = {}\n\n", value_text(shown)));
                    let dimension = shown.value().dimension();
                    if let Some(dimension) = dimension {
                        text.push_str(&format!("dimension: {}\n\n", dimension.phrase()));
                    }
                }
                Some(LineResult::Error | LineResult::Skipped { .. }) => {
                    text.push_str(&format!("**{name}**: no value (see the diagnostics)\n\n"));
                }
                _ => text.push_str(&format!("**{name}**\n\n")),
            }
        }
    }
    text.push_str(&format!(
        "defined at {place}:\n```fluxsheet\n{written}\n```"
    ));
    Some(text)
}

fn builtin_hover(name: &str) -> Option<String> {
    let function = Builtins::standard().function(name)?;
    let mut text = format!(
        "```fluxsheet\n{}\n```\n{}\n",
        function.signature(),
        function.summary()
    );
    let details = function.details();
    if !details.is_empty() {
        text.push_str("\n```\n");
        text.push_str(&details.join("\n"));
        text.push_str("\n```\n");
    }
    for formulation in function.formulations() {
        text.push_str(&format!(
            "\n**{}**  \nvalid: {}  \nsource: {}\n",
            formulation.title, formulation.validity, formulation.citation
        ));
    }
    Some(text)
}

fn constant_hover(name: &str) -> Option<String> {
    let constant = Builtins::standard().constant(name)?;
    let quantity = &constant.quantity;
    Some(format!(
        "**{}** = {} {} (constant)\n\n{}\n\nsource: {}",
        constant.name,
        format_significant(quantity.value, 10),
        quantity.dimension.preferred_si_unit(),
        constant.summary,
        constant.source
    ))
}

/// A unit symbol's catalog row, and the prefix in front of it if any.
pub fn catalog_row(symbol: &str) -> Option<(Option<&'static str>, &'static CatalogEntry)> {
    let entries = catalog_entries();
    let exact = entries
        .iter()
        .find(|entry| entry.definition.symbols.contains(&symbol));
    if let Some(entry) = exact {
        return Some((None, entry));
    }
    Unit::lookup(symbol).ok()?;
    prefixes().iter().find_map(|(prefix, _)| {
        let rest = symbol.strip_prefix(prefix)?;
        let entry = entries.iter().find(|entry| {
            entry.definition.prefixable && entry.definition.symbols.contains(&rest)
        })?;
        Some((Some(*prefix), entry))
    })
}

fn unit_hover(symbol: &str) -> Option<String> {
    let (prefix, entry) = catalog_row(symbol)?;
    let definition = entry.definition;
    let unit = Unit::lookup(symbol).ok()?;
    let mut text = format!("**{symbol}** — ");
    if let Some(prefix) = prefix {
        text.push_str(&format!("`{prefix}` × "));
    }
    text.push_str(&format!(
        "{} ({})\n\n1 {symbol} = {} {}",
        definition.name,
        unit.dimension.phrase(),
        format_significant(unit.factor.value(), 10),
        unit.dimension.preferred_si_unit()
    ));
    if let Some(offset) = definition.offset {
        text.push_str(&format!(" (scale offset {offset})"));
    }
    text.push_str(&format!("\n\ndefinition: `{}`", definition.factor));
    if definition.symbols.len() > 1 {
        text.push_str(&format!("; also written {}", definition.symbols.join(", ")));
    }
    if !definition.note.is_empty() {
        text.push_str(&format!("\n\n{}", definition.note));
    }
    text.push_str(&format!("\n\nsource: {}", definition.source));
    Some(text)
}
