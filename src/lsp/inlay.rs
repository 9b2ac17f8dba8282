//! Each line's value and unit at its end, as inlay hints: `= 4.05e-6 m/s`, a column as
//! `= 9 rows, first 0 degC … last 40 degC`, a check as passed or failed.

use super::document::Document;
use crate::eval::{LineResult, Shown};
use crate::render::format_significant;
use crate::render::table::check_text;
use lsp_types::{InlayHint, InlayHintLabel, Range};

/// Significant figures of the values shown, as `run` shows them by default.
const DIGITS: u32 = 4;

/// The hints of the lines in `range`.
pub fn inlay_hints(document: &Document, range: Range) -> Vec<InlayHint> {
    let first = range.start.line as usize;
    let last = range.end.line as usize;
    document
        .evaluation
        .lines
        .iter()
        .filter(|outcome| (first..=last).contains(&(outcome.number - 1)))
        .filter_map(|outcome| {
            let label = hint_text(&outcome.result)?;
            let line = outcome.number - 1;
            let end = document.index.line_end(&document.text, line);
            Some(InlayHint {
                position: document.index.position(&document.text, end),
                label: InlayHintLabel::String(label),
                kind: None,
                text_edits: None,
                tooltip: None,
                padding_left: Some(true),
                padding_right: None,
                data: None,
            })
        })
        .collect()
}

/// What a line's hint says; `None` for lines with nothing to show.
pub fn hint_text(result: &LineResult) -> Option<String> {
    match result {
        LineResult::Value(shown) => Some(format!("= {}", value_text(shown))),
        LineResult::Check(check) => {
            let verdict = if check.passed { "passed" } else { "failed" };
            Some(format!("{verdict}: {}", check_text(check, DIGITS)))
        }
        LineResult::Skipped { because_of } => Some(format!("(skipped: {because_of} has an error)")),
        _ => None,
    }
}

/// A value with its unit; a column as its length, first and last rows.
pub fn value_text(shown: &Shown) -> String {
    match shown {
        Shown::Scalar(scalar) => with_unit(scalar.value, &scalar.unit),
        Shown::Column(column) => {
            let rows = column.len();
            match rows {
                0 => "0 rows".to_string(),
                _ => format!(
                    "{rows} rows, first {} … last {}",
                    with_unit(column.shown(0), &column.unit),
                    with_unit(column.shown(rows - 1), &column.unit)
                ),
            }
        }
        Shown::Labels(labels) => match (labels.texts.first(), labels.texts.last()) {
            (Some(first), Some(last)) => format!(
                "{} rows, first \"{first}\" … last \"{last}\"",
                labels.texts.len()
            ),
            _ => "0 rows".to_string(),
        },
    }
}

fn with_unit(value: f64, unit: &str) -> String {
    let number = format_significant(value, DIGITS);
    if unit.is_empty() || unit == "1" {
        number
    } else {
        format!("{number} {unit}")
    }
}

#[cfg(test)]
mod tests {
    use super::value_text;
    use crate::eval::{evaluate_sheet, LineResult};
    use crate::library::Builtins;

    fn shown_values(sheet: &str) -> Vec<String> {
        evaluate_sheet(sheet, Builtins::standard())
            .lines
            .iter()
            .filter_map(|line| match &line.result {
                LineResult::Value(shown) => Some(value_text(shown)),
                _ => None,
            })
            .collect()
    }

    #[test]
    fn scalars_show_value_and_unit_and_columns_their_length_and_ends() {
        let sheet = "k = 420 mD\nK [ft/d] = 4.05e-6 m/s\nT = 0 degC to 40 degC step 5 K\nn = 0.3\n";
        assert_eq!(
            shown_values(sheet),
            [
                "420 mD",
                "1.148 ft/d",
                "9 rows, first 0 degC … last 40 degC",
                "0.3"
            ]
        );
    }
}
