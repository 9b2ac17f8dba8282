//! JSON output. Serializable mirror types live here, at the edge, so the JSON contract in
//! DESIGN.md does not freeze the evaluator's internal types. A column's numbers are borrowed
//! from the evaluation and converted as they are written, so a sheet's JSON can be streamed to
//! its writer without a copy of its columns.

use crate::eval::{Diagnostic, Evaluation, LineResult, Shown, ShownColumn, ShownValue, SourceMap};
use serde::{Serialize, Serializer};

#[derive(Serialize)]
pub struct SheetJson<'e> {
    #[serde(skip_serializing_if = "Option::is_none")]
    pub file: Option<String>,
    /// The title block (`@project: …`), field by field; absent when the sheet has none.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub fields: Vec<FieldJson>,
    /// Every file the run read: the main sheet first, then includes and data files.
    pub inputs: Vec<InputJson>,
    pub lines: Vec<LineJson<'e>>,
    pub checks: Vec<CheckJson<'e>>,
    pub diagnostics: Vec<DiagnosticJson>,
    pub formulations: Vec<FormulationJson>,
    /// With `--samples N`: the spread of each uncertain line, each check's probability of
    /// failing, and the inputs that drive each result.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub samples: Option<Box<crate::render::spread::SamplesJson>>,
}

#[derive(Serialize)]
pub struct FieldJson {
    pub field: String,
    pub text: String,
}

#[derive(Serialize)]
pub struct InputJson {
    /// Relative to the main sheet's folder (the main sheet by its file name).
    pub path: String,
    pub sha256: String,
    pub bytes: usize,
}

/// The inputs of a run as JSON.
pub fn inputs_json(inputs: &[crate::render::report::InputFile]) -> Vec<InputJson> {
    inputs
        .iter()
        .map(|input| InputJson {
            path: input.path.clone(),
            sha256: input.sha256.clone(),
            bytes: input.bytes,
        })
        .collect()
}

/// The title block as JSON.
pub fn fields_json(evaluation: &Evaluation) -> Vec<FieldJson> {
    evaluation
        .fields
        .iter()
        .map(|field| FieldJson {
            field: field.name.clone(),
            text: field.text.clone(),
        })
        .collect()
}

#[derive(Serialize)]
pub struct LineJson<'e> {
    pub line: usize,
    pub name: Option<String>,
    pub expression: String,
    #[serde(flatten)]
    pub value: ValueJson<'e>,
    /// How the value was found (a solve's iterations), when that is worth saying.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub note: Option<String>,
}

/// The value fields of `eval` and of each `run` line: numbers for a single value, arrays for a
/// column (text for a column of labels, which has no SI value or dimension).
#[derive(Serialize)]
pub struct ValueJson<'e> {
    pub value: Numbers<'e>,
    pub unit: String,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub si_value: Option<Numbers<'e>>,
    pub si_unit: String,
    pub dimension: String,
}

/// A number, or an array of them (or of text), written as JSON is written.
pub enum Numbers<'e> {
    One(f64),
    /// A column's rows in its display unit.
    Shown(&'e ShownColumn),
    /// A column's rows in SI.
    Si(&'e [f64]),
    Text(&'e [String]),
}

impl Serialize for Numbers<'_> {
    fn serialize<S: Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        match self {
            Numbers::One(value) => serializer.serialize_f64(*value),
            Numbers::Shown(column) => serializer.collect_seq(column.shown_values()),
            Numbers::Si(values) => serializer.collect_seq(values.iter()),
            Numbers::Text(texts) => serializer.collect_seq(texts.iter()),
        }
    }
}

#[derive(Serialize)]
pub struct CheckJson<'e> {
    pub line: usize,
    pub passed: bool,
    pub text: String,
    pub left: ValueJson<'e>,
    pub right: ValueJson<'e>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub message: Option<String>,
    /// For a check over columns: rows checked, rows failed, and the row `left`/`right` show.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub rows: Option<CheckRowsJson>,
}

#[derive(Serialize)]
pub struct CheckRowsJson {
    pub total: usize,
    pub failed: usize,
    pub shown_row: usize,
}

#[derive(Serialize)]
pub struct DiagnosticJson {
    pub severity: &'static str,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub code: Option<&'static str>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub file: Option<String>,
    pub line: usize,
    pub column: usize,
    pub end_line: usize,
    pub end_column: usize,
    pub message: String,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub help: Option<String>,
}

#[derive(Serialize)]
pub struct FormulationJson {
    pub id: &'static str,
    pub title: &'static str,
    pub citation: &'static str,
    pub validity: &'static str,
}

pub fn value_json(shown: &ShownValue) -> ValueJson<'static> {
    ValueJson {
        value: Numbers::One(shown.value),
        unit: shown.unit.clone(),
        si_value: Some(Numbers::One(shown.quantity.value)),
        si_unit: shown.quantity.dimension.si_unit_text(),
        dimension: shown.quantity.dimension.to_string(),
    }
}

/// A line's value: one number, or the column's numbers (or text) as arrays.
pub fn line_value_json(shown: &Shown) -> ValueJson<'_> {
    match shown {
        Shown::Scalar(shown) => value_json(shown),
        Shown::Column(shown) => ValueJson {
            value: Numbers::Shown(shown),
            unit: shown.unit.clone(),
            si_value: Some(Numbers::Si(&shown.column.values)),
            si_unit: shown.column.dimension.si_unit_text(),
            dimension: shown.column.dimension.to_string(),
        },
        Shown::Labels(labels) => ValueJson {
            value: Numbers::Text(&labels.texts),
            unit: String::new(),
            si_value: None,
            si_unit: String::new(),
            dimension: "text".to_string(),
        },
    }
}

/// Diagnostics with file, line and column; the file is omitted for a sheet with no file.
pub fn diagnostics_json(sources: &SourceMap, diagnostics: &[Diagnostic]) -> Vec<DiagnosticJson> {
    diagnostics
        .iter()
        .map(|diagnostic| {
            let (label, line, column) = sources.locate(diagnostic.span.start);
            let end = diagnostic.span.end.max(diagnostic.span.start);
            let (_, end_line, end_column) = sources.locate(end);
            DiagnosticJson {
                severity: diagnostic.severity.word(),
                code: diagnostic.code,
                file: (!label.starts_with('<')).then(|| label.to_string()),
                line,
                column,
                end_line,
                end_column,
                message: diagnostic.message.clone(),
                help: diagnostic.help.clone(),
            }
        })
        .collect()
}

pub fn sheet_json<'e>(
    file: Option<&str>,
    evaluation: &'e Evaluation,
    inputs: &[crate::render::report::InputFile],
) -> SheetJson<'e> {
    let mut lines = Vec::new();
    let mut checks = Vec::new();
    for line in &evaluation.lines {
        match &line.result {
            LineResult::Value(shown) => lines.push(LineJson {
                line: line.number,
                name: line.name.clone(),
                expression: line.expression.clone(),
                value: line_value_json(shown),
                note: line.note.clone(),
            }),
            LineResult::Check(check) => checks.push(CheckJson {
                line: line.number,
                passed: check.passed,
                text: line.expression.clone(),
                left: value_json(&check.left),
                right: value_json(&check.right),
                message: check.message.clone(),
                rows: check.rows.map(|rows| CheckRowsJson {
                    total: rows.total,
                    failed: rows.failed,
                    shown_row: rows.shown_row,
                }),
            }),
            _ => {}
        }
    }
    SheetJson {
        file: file.map(str::to_string),
        fields: fields_json(evaluation),
        inputs: inputs_json(inputs),
        lines,
        checks,
        diagnostics: diagnostics_json(&evaluation.sources, &evaluation.diagnostics),
        samples: evaluation
            .samples
            .as_deref()
            .map(|summary| Box::new(crate::render::spread::samples_json(summary))),
        formulations: evaluation
            .provenance
            .formulations()
            .iter()
            .map(|formulation| FormulationJson {
                id: formulation.id,
                title: formulation.title,
                citation: formulation.citation,
                validity: formulation.validity,
            })
            .collect(),
    }
}
