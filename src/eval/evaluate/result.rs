//! What an evaluation gives: each line's result, shown values in their units, check outcomes,
//! plots, and the calls made, for the front ends to render.

use crate::eval::diagnostic::Diagnostic;
use crate::eval::function::Provenance;
use crate::eval::sources::SourceMap;
use crate::eval::value::{Column, Labels, Quantity, Value};
use crate::syntax::{Comparison, Span};
use crate::units::Unit;

/// Relative rounding allowance of every check written without `within`: sides closer than this
/// count as equal (so `<=` passes and `<` fails at the boundary).
pub const ROUNDING_ALLOWANCE: f64 = 1e-9;

/// Everything a run of a sheet produced.
#[derive(Debug, Clone)]
pub struct Evaluation {
    /// The main sheet's lines (lines of included sheets are evaluated but not listed).
    pub lines: Vec<LineOutcome>,
    /// The main sheet and every sheet it included; diagnostics' spans point into these.
    pub sources: SourceMap,
    pub diagnostics: Vec<Diagnostic>,
    pub provenance: Provenance,
    /// Every built-in call that got its arguments evaluated, in evaluation order (for checks
    /// on the values passed, such as the plausibility warnings).
    pub calls: Vec<CallRecord>,
    /// The main sheet's title-block fields (`@checker: …`), in file order.
    pub fields: Vec<crate::syntax::Field>,
    /// Named values defined in included sheets, `(name, value)`, so the working of a line that
    /// uses them can show their values.
    pub included_values: Vec<(String, Shown)>,
    /// With `run --samples N`: the spread of every uncertain line, the failure probability of
    /// each check and the ranking of the inputs. The uncertain lines' values are then their
    /// sampled P50.
    pub samples: Option<Box<crate::eval::uncertainty::SampleSummary>>,
}

/// A built-in call and the values of its arguments.
#[derive(Debug, Clone)]
pub struct CallRecord {
    pub function: String,
    /// The whole call.
    pub span: Span,
    /// Each argument's span and value.
    pub arguments: Vec<(Span, Value)>,
}

impl Evaluation {
    pub fn has_errors(&self) -> bool {
        self.diagnostics
            .iter()
            .any(|diagnostic| diagnostic.severity == crate::eval::Severity::Error)
    }

    pub fn failed_checks(&self) -> usize {
        self.lines
            .iter()
            .filter(|line| matches!(&line.result, LineResult::Check(check) if !check.passed))
            .count()
    }
}

/// One source line and what became of it.
#[derive(Debug, Clone)]
pub struct LineOutcome {
    pub number: usize,
    pub name: Option<String>,
    /// The expression's source text (empty for headings and comments).
    pub expression: String,
    /// Where that text lies in the sources, for a named or shown line: parsed again at this
    /// offset, its calls meet the `CallRecord`s of the evaluation.
    pub expression_span: Option<Span>,
    pub comment: Option<String>,
    pub result: LineResult,
    /// How the value was found, where that is worth saying (a solve's iterations).
    pub note: Option<String>,
}

#[derive(Debug, Clone)]
pub enum LineResult {
    Blank,
    Comment,
    Heading(String),
    Value(Shown),
    /// Boxed: a check outcome is the largest result and the rarest.
    Check(Box<CheckOutcome>),
    /// The line has an error of its own (reported in the diagnostics).
    Error,
    /// Not evaluated because a line it needs has an error; names that line.
    Skipped {
        because_of: String,
    },
    /// A function definition, with its parameters as written.
    Function {
        signature: String,
    },
    /// An include line and the sheet it brought in.
    Include {
        file: String,
    },
    /// A plot line's data, ready to draw.
    Plot(Box<PlotOutcome>),
}

/// The data of a `plot` line: columns in display units, with axis labels that carry them.
#[derive(Debug, Clone, PartialEq)]
pub struct PlotOutcome {
    pub title: Option<String>,
    /// `T_site [degC]`
    pub x_label: String,
    /// `K_site [m/s]`, or the unit alone under several series: `[m/s]`
    pub y_label: String,
    pub x: Vec<f64>,
    /// Each series' name and values, all in the first series' unit.
    pub series: Vec<(String, Vec<f64>)>,
    /// Logarithmic axes, as drawn: x across, y up (or down).
    pub log_x: bool,
    pub log_y: bool,
    /// The x column down the vertical axis (a depth profile).
    pub down: bool,
    /// Markers only, no line (a cross-plot).
    pub points: bool,
}

/// A line's value with the unit it is shown in.
#[derive(Debug, Clone, PartialEq)]
pub enum Shown {
    Scalar(ShownValue),
    /// Boxed: a column's unit conversion is large, and most lines are scalars.
    Column(Box<ShownColumn>),
    /// A column of text (sample names) from a data file.
    Labels(Labels),
}

/// A column with the unit it is shown in. The numbers are converted when read, so showing a
/// column of a million rows costs no second copy.
#[derive(Debug, Clone, PartialEq)]
pub struct ShownColumn {
    pub column: Column,
    /// Display unit as written, or the preferred SI unit.
    pub unit: String,
    /// The unit's conversion; `None` for SI.
    pub(super) conversion: Option<Unit>,
}

impl ShownColumn {
    pub fn len(&self) -> usize {
        self.column.len()
    }

    pub fn is_empty(&self) -> bool {
        self.column.is_empty()
    }

    /// Row `row` (0-based) in the display unit.
    pub fn shown(&self, row: usize) -> f64 {
        let value = self.column.values[row];
        match &self.conversion {
            Some(unit) => unit.from_si(value),
            None => value,
        }
    }

    /// Every row in the display unit.
    pub fn shown_values(&self) -> impl Iterator<Item = f64> + '_ {
        (0..self.len()).map(|row| self.shown(row))
    }

    /// Row `row` as a scalar shown value.
    pub fn row(&self, row: usize) -> ShownValue {
        ShownValue {
            quantity: self.column.quantity(row),
            unit: self.unit.clone(),
            value: self.shown(row),
        }
    }
}

impl Shown {
    /// The value in SI.
    pub fn value(&self) -> Value {
        match self {
            Shown::Scalar(shown) => Value::Scalar(shown.quantity),
            Shown::Column(shown) => Value::Column(shown.column.clone()),
            Shown::Labels(labels) => Value::Labels(labels.clone()),
        }
    }

    pub fn as_scalar(&self) -> Option<&ShownValue> {
        match self {
            Shown::Scalar(shown) => Some(shown),
            _ => None,
        }
    }

    /// The unit it is shown in (empty for text).
    pub fn unit(&self) -> &str {
        match self {
            Shown::Scalar(shown) => &shown.unit,
            Shown::Column(shown) => &shown.unit,
            Shown::Labels(_) => "",
        }
    }

    /// The number of rows: `None` for a scalar.
    pub fn rows(&self) -> Option<usize> {
        match self {
            Shown::Scalar(_) => None,
            Shown::Column(shown) => Some(shown.len()),
            Shown::Labels(labels) => Some(labels.texts.len()),
        }
    }
}

/// A single value with the unit it is shown in.
#[derive(Debug, Clone, PartialEq)]
pub struct ShownValue {
    pub quantity: Quantity,
    /// Display unit as written (`ft/d`), or the preferred SI unit.
    pub unit: String,
    /// The value in that unit.
    pub value: f64,
}

#[derive(Debug, Clone, PartialEq)]
pub struct CheckOutcome {
    pub passed: bool,
    pub comparison: Comparison,
    pub left: ShownValue,
    pub right: ShownValue,
    /// The tolerance as written (`1 %`), when given.
    pub tolerance: Option<String>,
    pub message: Option<String>,
    /// For a check over columns: how many rows, how many failed, and which row `left` and
    /// `right` show (the first that failed, or the closest to failing).
    pub rows: Option<CheckRows>,
}

#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CheckRows {
    pub total: usize,
    pub failed: usize,
    /// 1-based.
    pub shown_row: usize,
    /// The rows are the samples of `run --samples`, not a column of the sheet.
    pub sampled: bool,
}
