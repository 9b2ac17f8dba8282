//! Completion: units after a number or inside `[ ]`, ranked by the dimension expected there
//! where it is known (a line's own dimension inside its `[ ]`, a built-in's parameter inside
//! its call); elsewhere the sheet's names and functions, the built-ins with their signatures
//! and the constants.

use super::document::Document;
use crate::eval::LineResult;
use crate::library::Builtins;
use crate::syntax::LineKind;
use crate::units::unit::catalog_entries;
use crate::units::Dimension;
use lsp_types::{CompletionItem, CompletionItemKind, Documentation};

/// What may be written at the cursor.
#[derive(Debug, Clone, PartialEq)]
pub enum Expected {
    /// A unit, of this dimension when known.
    Unit(Option<Dimension>),
    /// A name, function or constant.
    Name,
}

/// The completions at byte `offset`.
pub fn completions(document: &Document, offset: usize) -> Vec<CompletionItem> {
    match expected_at(document, offset) {
        Expected::Unit(dimension) => unit_items(document, dimension),
        Expected::Name => name_items(document),
    }
}

/// What the text before the cursor on its line calls for.
pub fn expected_at(document: &Document, offset: usize) -> Expected {
    let offset = offset.min(document.text.len());
    let line_start = document.text[..offset].rfind('\n').map_or(0, |at| at + 1);
    let before = &document.text[line_start..offset];
    // The word being typed is left out: what matters is what stands before it.
    let before =
        before.trim_end_matches(|character: char| character.is_alphanumeric() || character == '_');
    let last_open = before.rfind('[');
    let last_close = before.rfind(']');
    if last_open.is_some() && last_open > last_close {
        return Expected::Unit(own_line_dimension(document, line_start));
    }
    if follows_a_number(before) {
        return Expected::Unit(argument_dimension(before));
    }
    Expected::Name
}

/// Whether the unit being typed follows a number: `3 `, `3 m/`, `3m*`, `{1, 2} `.
fn follows_a_number(before: &str) -> bool {
    // A chunk's last operand: `darcy_flux(3` ends in the number `3`.
    let chunks: Vec<&str> = before
        .split_whitespace()
        .map(|chunk| chunk.rsplit(['(', ',', '=']).next().unwrap_or(chunk))
        .collect();
    let is_number = |chunk: &str| {
        chunk.ends_with('}')
            || (chunk.starts_with(|character: char| character.is_ascii_digit() || character == '.')
                && chunk
                    .ends_with(|character: char| character.is_ascii_digit() || character == '.'))
    };
    if before.ends_with(char::is_whitespace) {
        return chunks.last().is_some_and(|last| is_number(last));
    }
    let Some((last, rest)) = chunks.split_last() else {
        return false;
    };
    if last.starts_with(|character: char| character.is_ascii_digit()) {
        return !last.ends_with(['+', '-', ',']);
    }
    // Inside a unit written after a space: `9.81 m/`.
    last.ends_with(['/', '*', '^', '(']) && rest.last().is_some_and(|previous| is_number(previous))
}

/// The dimension of the line whose `[ ]` the cursor is in, from the last evaluation.
fn own_line_dimension(document: &Document, line_start: usize) -> Option<Dimension> {
    let line = document.text[..line_start].matches('\n').count();
    match &document.outcome(line)?.result {
        LineResult::Value(shown) => shown.value().dimension(),
        _ => None,
    }
}

/// The dimension of the built-in parameter whose argument is being written, if the cursor is
/// inside a call of a relation: `darcy_flux(3 ` expects a velocity.
fn argument_dimension(before: &str) -> Option<Dimension> {
    let mut depth = 0usize;
    let mut commas = 0usize;
    for (index, character) in before.char_indices().rev() {
        match character {
            ')' => depth += 1,
            '(' if depth > 0 => depth -= 1,
            '(' => {
                let name_start = before[..index]
                    .char_indices()
                    .rev()
                    .take_while(|(_, c)| c.is_alphanumeric() || *c == '_')
                    .last()
                    .map(|(at, _)| at)?;
                let function = &before[name_start..index];
                let relation = Builtins::standard()
                    .relations()
                    .find(|relation| relation.name == function)?;
                return relation
                    .forms
                    .iter()
                    .find_map(|form| form.parameters.get(commas))
                    .map(|parameter| parameter.dimension);
            }
            ',' if depth == 0 => commas += 1,
            _ => {}
        }
    }
    None
}

/// Catalog units, those of the expected dimension first; with a dimension known, also the
/// compound units that spell it (`m/s`, and those the sheet already shows it in, `ft/d`).
fn unit_items(document: &Document, expected: Option<Dimension>) -> Vec<CompletionItem> {
    let mut compound: Vec<String> = Vec::new();
    if let Some(expected) = expected {
        compound.push(expected.preferred_si_unit());
        for outcome in &document.evaluation.lines {
            if let LineResult::Value(shown) = &outcome.result {
                let unit = shown.unit();
                if shown.value().dimension() == Some(expected)
                    && !unit.is_empty()
                    && !compound.iter().any(|known| known == unit)
                {
                    compound.push(unit.to_string());
                }
            }
        }
    }
    let phrase = expected
        .map(|dimension| dimension.phrase())
        .unwrap_or_default();
    // In this order: the SI spelling first, then the sheet's own in the order they appear.
    let spelled = compound
        .into_iter()
        .enumerate()
        .map(|(rank, unit)| CompletionItem {
            sort_text: Some(format!("0{rank:04}")),
            label: unit,
            kind: Some(CompletionItemKind::UNIT),
            detail: Some(phrase.clone()),
            ..CompletionItem::default()
        });
    let catalog = catalog_entries().iter().flat_map(|entry| {
        let dimension = entry.unit().dimension;
        let fits = expected.is_none_or(|expected| expected == dimension);
        entry
            .definition
            .symbols
            .iter()
            .map(move |symbol| CompletionItem {
                label: symbol.to_string(),
                kind: Some(CompletionItemKind::UNIT),
                detail: Some(format!(
                    "{} — {}",
                    entry.definition.name,
                    dimension.phrase()
                )),
                sort_text: Some(format!("{}{symbol}", if fits { 1 } else { 2 })),
                ..CompletionItem::default()
            })
    });
    let mut items: Vec<CompletionItem> = spelled.collect();
    for item in catalog {
        if !items.iter().any(|known| known.label == item.label) {
            items.push(item);
        }
    }
    items
}

fn name_items(document: &Document) -> Vec<CompletionItem> {
    let mut items = Vec::new();
    for line in document.syntax() {
        let (name, kind, detail) = match &line.kind {
            LineKind::Definition(definition) => {
                let value = (document.evaluation.sources.file_index_of(line.span.start) == 0)
                    .then(|| document.outcome(line.number - 1))
                    .flatten()
                    .and_then(|outcome| match &outcome.result {
                        LineResult::Value(shown) => Some(super::inlay::value_text(shown)),
                        _ => None,
                    });
                (&definition.name.text, CompletionItemKind::VARIABLE, value)
            }
            LineKind::Function(function) => {
                let parameters: Vec<&str> = function
                    .parameters
                    .iter()
                    .map(|parameter| parameter.name.text.as_str())
                    .collect();
                let signature = format!("{}({})", function.name.text, parameters.join(", "));
                (
                    &function.name.text,
                    CompletionItemKind::FUNCTION,
                    Some(signature),
                )
            }
            _ => continue,
        };
        if items
            .iter()
            .any(|item: &CompletionItem| item.label == *name)
        {
            continue;
        }
        items.push(CompletionItem {
            label: name.clone(),
            kind: Some(kind),
            detail,
            sort_text: Some(format!("0{name}")),
            ..CompletionItem::default()
        });
    }
    let library = Builtins::standard();
    for (name, function) in library.functions_sorted() {
        items.push(CompletionItem {
            label: name.to_string(),
            kind: Some(CompletionItemKind::FUNCTION),
            detail: Some(function.signature()),
            documentation: Some(Documentation::String(function.summary().to_string())),
            sort_text: Some(format!("1{name}")),
            ..CompletionItem::default()
        });
    }
    for constant in library.constants_sorted() {
        items.push(CompletionItem {
            label: constant.name.to_string(),
            kind: Some(CompletionItemKind::CONSTANT),
            detail: Some(format!("{} ({})", constant.summary, constant.unit)),
            sort_text: Some(format!("2{}", constant.name)),
            ..CompletionItem::default()
        });
    }
    items
}

#[cfg(test)]
mod tests {
    use super::follows_a_number;

    #[test]
    fn a_unit_is_expected_only_after_a_number() {
        for (before, expected) in [
            ("k = 420 ", true),
            ("g = 9.81 m/", true),
            ("v = 3m*", true),
            ("k = {40, 250} ", true),
            ("x = k * ", false),
            ("x = k_1 ", false),
            ("x = ", false),
            ("x = 3 + ", false),
            ("q = darcy_flux(3 ", true),
            ("q = darcy_flux(K, 0.5 m/", true),
            ("q = darcy_flux(", false),
        ] {
            assert_eq!(follows_a_number(before), expected, "{before:?}");
        }
    }
}
