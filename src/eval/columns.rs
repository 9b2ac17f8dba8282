//! Arithmetic on columns. Dimensions and temperature rules are decided once per operation by
//! the scalar rules on one representative row; the numbers then go through a plain loop over
//! `f64`, and a single pass afterwards finds the first row that overflowed or divided by zero.

use super::error::{EvalError, EvalErrorKind};
use super::evaluate::{binary, refuse_below_absolute_zero, refuse_offset_temperature};
use super::value::{Column, Quantity, TemperatureKind, Value};
use crate::syntax::{BinaryOperator, Span};
use std::sync::Arc;

/// The default longest column: long enough for any field or lab data set, short enough that a
/// mistyped step is an error rather than an out-of-memory kill.
pub const DEFAULT_MAX_ROWS: usize = 10_000_000;

/// The default limit on the rows of all of a sheet's column-valued lines together: five
/// columns of the longest length, 400 MB of numbers, so that twenty long columns are an error
/// rather than an out-of-memory kill.
pub const DEFAULT_MAX_TOTAL_ROWS: usize = 50_000_000;

/// How many rows a sheet's column-valued lines hold together, against the limit. A column
/// shared by several lines (`y = x`) is counted once.
#[derive(Debug, Clone)]
pub(crate) struct RowBudget {
    pub(crate) limit: usize,
    kept: usize,
    counted: rustc_hash::FxHashSet<usize>,
}

impl RowBudget {
    pub(crate) fn new(limit: usize) -> RowBudget {
        RowBudget {
            limit,
            kept: 0,
            counted: Default::default(),
        }
    }

    /// Refuses a column of `rows` more rows before it is allocated.
    pub(crate) fn check(&self, rows: usize, span: Span) -> Result<(), EvalError> {
        if self.kept.saturating_add(rows) > self.limit {
            return Err(EvalError::new(
                EvalErrorKind::TooManyRowsInAll {
                    rows,
                    kept: self.kept,
                    limit: self.limit,
                },
                span,
            ));
        }
        Ok(())
    }

    /// Counts a line's column (once, however many lines share it), or refuses it when it
    /// takes the total over the limit.
    pub(crate) fn keep(&mut self, value: &Value, span: Span) -> Result<(), EvalError> {
        let (address, rows) = match value {
            Value::Scalar(_) => return Ok(()),
            Value::Column(column) => (Arc::as_ptr(&column.values) as usize, column.len()),
            Value::Labels(labels) => (Arc::as_ptr(&labels.texts) as usize, labels.texts.len()),
        };
        if self.counted.contains(&address) {
            return Ok(());
        }
        self.check(rows, span)?;
        self.counted.insert(address);
        self.kept += rows;
        Ok(())
    }
}

/// Room for a column of `rows` numbers, or an error when the allocator has none (rather than
/// the process aborting).
pub(crate) fn allocate_rows(rows: usize, span: Span) -> Result<Vec<f64>, EvalError> {
    let mut values = Vec::new();
    values
        .try_reserve_exact(rows)
        .map_err(|_| EvalError::new(EvalErrorKind::NoMemoryForColumn { rows }, span))?;
    Ok(values)
}

/// The number of rows two operands share: `None` if both are scalars.
pub(crate) fn common_rows(
    left: &Value,
    right: &Value,
    span: Span,
) -> Result<Option<usize>, EvalError> {
    for value in [left, right] {
        if let Value::Labels(labels) = value {
            return Err(EvalError::new(
                EvalErrorKind::TextInArithmetic {
                    origin: labels.origin.to_string(),
                },
                span,
            ));
        }
    }
    match (left.rows(), right.rows()) {
        (Some(left_rows), Some(right_rows)) if left_rows != right_rows => Err(EvalError::new(
            EvalErrorKind::ColumnLengths {
                left_rows,
                left_origin: origin(left).to_string(),
                right_rows,
                right_origin: origin(right).to_string(),
            },
            span,
        )),
        (Some(rows), _) | (_, Some(rows)) => Ok(Some(rows)),
        (None, None) => Ok(None),
    }
}

/// The line a column came from (empty for a scalar).
pub(crate) fn origin(value: &Value) -> &str {
    match value {
        Value::Scalar(_) => "",
        Value::Column(column) => &column.origin,
        Value::Labels(labels) => &labels.origin,
    }
}

/// The operands' first column origin, which the result inherits.
fn shared_origin(left: &Value, right: &Value) -> Arc<str> {
    match (left, right) {
        (Value::Column(column), _) | (_, Value::Column(column)) => column.origin.clone(),
        _ => Arc::from(""),
    }
}

/// One representative row: the dimension, the temperature kind and the first value.
fn shape(value: &Value) -> Quantity {
    match value {
        Value::Scalar(quantity) => *quantity,
        Value::Column(column) => column.shape(),
        Value::Labels(_) => Quantity::dimensionless(f64::NAN),
    }
}

/// One argument of a call over columns, read by row: a column's values, or one scalar in
/// every row.
#[derive(Debug, Clone, Copy)]
pub enum Rows<'a> {
    Same(f64),
    Each(&'a [f64]),
}

impl Rows<'_> {
    pub fn of(value: &Value) -> Rows<'_> {
        match value {
            Value::Scalar(quantity) => Rows::Same(quantity.value),
            Value::Column(column) => Rows::Each(&column.values),
            Value::Labels(_) => Rows::Same(f64::NAN),
        }
    }

    #[inline]
    pub fn at(self, row: usize) -> f64 {
        match self {
            Rows::Same(value) => value,
            Rows::Each(values) => values[row],
        }
    }
}

/// `left <operator> right` where either side may be a column.
pub(crate) fn combine(
    operator: BinaryOperator,
    left: &Value,
    right: &Value,
    span: Span,
    right_span: Span,
) -> Result<Value, EvalError> {
    let rows = common_rows(left, right, span)?;
    if let (Value::Scalar(left), Value::Scalar(right)) = (left, right) {
        return binary(operator, *left, *right, span, right_span).map(Value::Scalar);
    }
    // Not both scalars, and no text (refused above): at least one side is a column.
    let rows = rows.unwrap_or(1);
    let (left_shape, right_shape) = (shape(left), shape(right));
    if operator == BinaryOperator::Power
        && !left_shape.dimension.is_dimensionless()
        && right.rows().is_some()
    {
        return Err(EvalError::new(
            EvalErrorKind::ScalarNeeded {
                what: "the exponent of a quantity with a unit",
            },
            right_span,
        ));
    }
    // The scalar rules on row 1 decide dimension and temperature kind for every row (and
    // report row 1's own errors).
    let origin = shared_origin(left, right);
    let result_shape = binary(operator, left_shape, right_shape, span, right_span)
        .map_err(|error| error.in_row(0, &origin))?;
    let (a, b) = (Rows::of(left), Rows::of(right));
    let values: Vec<f64> = match operator {
        BinaryOperator::Add => (0..rows).map(|row| a.at(row) + b.at(row)).collect(),
        BinaryOperator::Subtract => (0..rows).map(|row| a.at(row) - b.at(row)).collect(),
        BinaryOperator::Multiply => (0..rows).map(|row| a.at(row) * b.at(row)).collect(),
        BinaryOperator::Divide => (0..rows).map(|row| a.at(row) / b.at(row)).collect(),
        BinaryOperator::Power => (0..rows).map(|row| a.at(row).powf(b.at(row))).collect(),
    };
    if let Some(row) = values.iter().position(|value| !value.is_finite()) {
        let kind = match operator {
            BinaryOperator::Divide if b.at(row) == 0.0 => EvalErrorKind::DivisionByZero,
            BinaryOperator::Power if a.at(row) < 0.0 => EvalErrorKind::Call {
                function: "^".to_string(),
                error: super::function::CallError::Domain {
                    argument: None,
                    message: "a negative number has no real fractional power".to_string(),
                },
            },
            _ => EvalErrorKind::NotFinite,
        };
        return Err(EvalError::new(kind, span).in_row(row, &origin));
    }
    if result_shape.is_absolute_temperature() {
        if let Some(row) = values.iter().position(|kelvin| *kelvin < 0.0) {
            let below = Quantity {
                value: values[row],
                ..result_shape
            };
            refuse_below_absolute_zero(&below, false, span).map_err(|e| e.in_row(row, &origin))?;
        }
    }
    Ok(Value::Column(Column {
        values: Arc::new(values),
        dimension: result_shape.dimension,
        temperature: result_shape.temperature,
        origin,
    }))
}

/// `-value`: a difference stays a difference; anything else negated is a plain quantity.
pub(crate) fn negate(value: Value, span: Span) -> Result<Value, EvalError> {
    if let Value::Scalar(quantity) = &value {
        refuse_offset_temperature(quantity, "negated", span)?;
    }
    if let Value::Column(column) = &value {
        refuse_offset_temperature(&column.shape(), "negated", span)?;
    }
    let temperature = |kind: TemperatureKind| match kind {
        TemperatureKind::Difference => TemperatureKind::Difference,
        _ => TemperatureKind::Unspecified,
    };
    match value {
        Value::Scalar(quantity) => Ok(Value::Scalar(Quantity {
            value: -quantity.value,
            temperature: temperature(quantity.temperature),
            ..quantity
        })),
        Value::Column(column) => Ok(Value::Column(Column {
            values: Arc::new(column.values.iter().map(|value| -value).collect()),
            temperature: temperature(column.temperature),
            ..column
        })),
        Value::Labels(labels) => Err(EvalError::new(
            EvalErrorKind::TextInArithmetic {
                origin: labels.origin.to_string(),
            },
            span,
        )),
    }
}

/// Refuses a column longer than `limit` before anything is allocated.
pub(crate) fn check_rows(rows: f64, limit: usize, span: Span) -> Result<usize, EvalError> {
    // NaN rows (a NaN count) are refused too.
    if rows.is_nan() || rows > limit as f64 {
        return Err(EvalError::new(
            EvalErrorKind::TooManyRows { rows, limit },
            span,
        ));
    }
    Ok(rows as usize)
}

/// Evenly spaced values from `from` to `to` (both included), `count` of them, linear or
/// geometric, written into `values` (empty, with room for them). The ends are exact.
pub(crate) fn spaced(
    from: f64,
    to: f64,
    count: usize,
    logarithmic: bool,
    mut values: Vec<f64>,
) -> Vec<f64> {
    let last = count.saturating_sub(1).max(1) as f64;
    if logarithmic {
        let (low, high) = (from.ln(), to.ln());
        values.extend((0..count).map(|row| (low + (high - low) * row as f64 / last).exp()));
    } else {
        let width = to - from;
        values.extend((0..count).map(|row| {
            if width.is_finite() {
                // Multiplied before divided: whole-number steps stay whole numbers.
                from + width * row as f64 / last
            } else {
                // Ends near the largest double: their difference overflows, a blend does not.
                let fraction = row as f64 / last;
                from * (1.0 - fraction) + to * fraction
            }
        }));
    }
    if let Some(first) = values.first_mut() {
        *first = from;
    }
    if count > 1 {
        if let Some(end) = values.last_mut() {
            *end = to;
        }
    }
    values
}

/// Values from `from` by `step` up to `to`, written into `values` (empty, with room for them):
/// the last is the last step that does not pass `to` (within a rounding allowance, so
/// `0 to 1 step 0.1` ends at exactly 1).
pub(crate) fn stepped(
    from: f64,
    to: f64,
    steps: usize,
    step: f64,
    mut values: Vec<f64>,
) -> Vec<f64> {
    values.extend((0..steps).map(|row| from + step * row as f64));
    if let Some(end) = values.last_mut() {
        if (*end - to).abs() <= 1e-9 * step.abs() {
            *end = to;
        }
    }
    values
}

#[cfg(test)]
mod tests {
    use super::spaced;

    #[test]
    fn a_range_of_whole_numbers_by_count_holds_whole_numbers() {
        let rows = 1_000_000;
        let values = spaced(1.0, 1e6, rows, false, Vec::with_capacity(rows));
        let off = values
            .iter()
            .enumerate()
            .find(|(row, value)| **value != (row + 1) as f64);
        assert_eq!(off, None);
    }
}
