//! Functions of whole columns: aggregates and interpolation in a table of two columns (the
//! layered media are in `layered`). The numerics are in `crate::numeric`; this module
//! checks dimensions once per column and carries them to the result.

use super::Builtin;
use crate::eval::function::CallError;
use crate::eval::{Column, Provenance, Quantity, TemperatureKind, Value};
use crate::numeric::{self, ColumnError, Interpolation, InterpolationTable};
use crate::units::Dimension;
use std::sync::Arc;

pub const FUNCTIONS: &[(&str, Builtin)] = &[
    ("sum", Builtin::on_columns("sum(values)", "sum of a column's rows (compensated summation)", one_value, sum)),
    ("mean", Builtin::on_columns("mean(values)", "arithmetic mean of a column", one_value, mean).taking_temperature()),
    ("geomean", Builtin::on_columns("geomean(values)", "geometric mean of a column of positive values (the usual average of permeabilities of a log-normal sample)", one_value, geomean)),
    ("harmean", Builtin::on_columns("harmean(values)", "harmonic mean of a column of positive values", one_value, harmean)),
    ("count", Builtin::on_columns("count(values)", "number of rows of a column (1 for a single value)", count_one, count).taking_temperature()),
    ("interpolate", Builtin::on_columns("interpolate(xs, ys, x)", "y at x, linear between the rows of a table of columns xs, ys; outside the table is an error", not_columns, interpolate_linear).taking_temperature()),
    ("interpolate_log", Builtin::on_columns("interpolate_log(xs, ys, x)", "y at x with ln y linear in x (for values spanning decades); ys positive; outside the table is an error", not_columns, interpolate_log).taking_temperature()),
];

/// An aggregate of one value is that value.
fn one_value(arguments: &[Quantity], _: &mut Provenance) -> Result<Quantity, CallError> {
    match arguments {
        [value] => Ok(*value),
        _ => Err(count_error(arguments.len(), "1 (a column)")),
    }
}

fn count_one(arguments: &[Quantity], _: &mut Provenance) -> Result<Quantity, CallError> {
    match arguments {
        [_] => Ok(Quantity::dimensionless(1.0)),
        _ => Err(count_error(arguments.len(), "1 (a column)")),
    }
}

/// Table and layer functions need columns; a call with values alone is refused.
pub(super) fn not_columns(_: &[Quantity], _: &mut Provenance) -> Result<Quantity, CallError> {
    Err(CallError::Domain {
        argument: Some(0),
        message: "needs columns (a list, a range or a data-file column), not single values"
            .to_string(),
    })
}

pub(super) fn count_error(found: usize, expected: &'static str) -> CallError {
    CallError::ArgumentCount { expected, found }
}

/// A column's numbers with its dimension and temperature kind; a single value is one row.
pub(super) struct Rows<'a> {
    pub(super) values: &'a [f64],
    pub(super) dimension: Dimension,
    pub(super) temperature: TemperatureKind,
}

pub(super) fn rows(value: &Value, argument: usize) -> Result<Rows<'_>, CallError> {
    match value {
        Value::Scalar(quantity) => Ok(Rows {
            values: std::slice::from_ref(&quantity.value),
            dimension: quantity.dimension,
            temperature: quantity.temperature,
        }),
        Value::Column(column) => Ok(Rows {
            values: &column.values,
            dimension: column.dimension,
            temperature: column.temperature,
        }),
        Value::Labels(labels) => Err(CallError::Domain {
            argument: Some(argument),
            message: format!("`{}` is a column of text, not numbers", labels.origin),
        }),
    }
}

pub(super) fn numeric_error(argument: usize) -> impl Fn(ColumnError) -> CallError {
    move |error| CallError::Domain {
        argument: Some(argument),
        message: error.to_string(),
    }
}

/// The one argument of an aggregate.
fn single<'a>(arguments: &'a [Value]) -> Result<Rows<'a>, CallError> {
    match arguments {
        [value] => rows(value, 0),
        _ => Err(count_error(arguments.len(), "1 (a column)")),
    }
}

pub(super) fn scalar(value: f64, dimension: Dimension, temperature: TemperatureKind) -> Value {
    Value::Scalar(Quantity {
        value,
        dimension,
        temperature,
    })
}

/// An aggregate of one column: same dimension and temperature kind as the rows. Absolute
/// temperatures reach only the aggregates marked `taking_temperature` (the evaluator refuses
/// them elsewhere), so a sum of `degC` values never happens.
fn aggregate(
    arguments: &[Value],
    reduce: impl Fn(&[f64]) -> Result<f64, ColumnError>,
) -> Option<Result<Value, CallError>> {
    Some(single(arguments).and_then(|rows| {
        let value = reduce(rows.values).map_err(numeric_error(0))?;
        Ok(scalar(value, rows.dimension, rows.temperature))
    }))
}

fn sum(arguments: &[Value], _: &mut Provenance) -> Option<Result<Value, CallError>> {
    aggregate(arguments, numeric::sum)
}

fn mean(arguments: &[Value], _: &mut Provenance) -> Option<Result<Value, CallError>> {
    aggregate(arguments, numeric::mean)
}

fn geomean(arguments: &[Value], _: &mut Provenance) -> Option<Result<Value, CallError>> {
    aggregate(arguments, numeric::geometric_mean)
}

fn harmean(arguments: &[Value], _: &mut Provenance) -> Option<Result<Value, CallError>> {
    aggregate(arguments, numeric::harmonic_mean)
}

fn count(arguments: &[Value], _: &mut Provenance) -> Option<Result<Value, CallError>> {
    Some(match arguments {
        [value] => Ok(Value::Scalar(Quantity::dimensionless(
            value.rows().unwrap_or(1) as f64,
        ))),
        _ => Err(count_error(arguments.len(), "1 (a column)")),
    })
}

/// Picks a column's extreme row: its value and 1-based row.
type Extreme = fn(&[f64]) -> Result<(f64, usize), ColumnError>;

/// `min(column)` or `max(column)`: one column only; any other call goes row by row.
fn extreme(arguments: &[Value], pick: Extreme) -> Option<Result<Value, CallError>> {
    let [Value::Column(_) | Value::Labels(_)] = arguments else {
        return None;
    };
    aggregate(arguments, |values| pick(values).map(|(value, _)| value))
}

pub fn column_minimum(arguments: &[Value], _: &mut Provenance) -> Option<Result<Value, CallError>> {
    extreme(arguments, numeric::minimum)
}

pub fn column_maximum(arguments: &[Value], _: &mut Provenance) -> Option<Result<Value, CallError>> {
    extreme(arguments, numeric::maximum)
}

fn interpolate_linear(arguments: &[Value], _: &mut Provenance) -> Option<Result<Value, CallError>> {
    Some(interpolate(arguments, Interpolation::Linear))
}

fn interpolate_log(arguments: &[Value], _: &mut Provenance) -> Option<Result<Value, CallError>> {
    Some(interpolate(arguments, Interpolation::LogLinear))
}

/// y at x (a value or a column) in the table (xs, ys); the table is checked once.
fn interpolate(arguments: &[Value], interpolation: Interpolation) -> Result<Value, CallError> {
    let [xs, ys, x] = arguments else {
        return Err(count_error(arguments.len(), "3 (xs, ys, x)"));
    };
    let (xs, ys, at) = (rows(xs, 0)?, rows(ys, 1)?, rows(x, 2)?);
    if at.dimension != xs.dimension {
        return Err(CallError::WrongDimension {
            argument: 2,
            parameter: "x",
            expected: xs.dimension,
            found: at.dimension,
        });
    }
    if xs.values.len() != ys.values.len() {
        return Err(CallError::Domain {
            argument: Some(1),
            message: format!(
                "`xs` has {} rows but `ys` has {}: a table pairs them row by row",
                xs.values.len(),
                ys.values.len()
            ),
        });
    }
    let table =
        InterpolationTable::new(xs.values, ys.values, interpolation).map_err(numeric_error(0))?;
    let temperature = ys.temperature;
    match x {
        Value::Column(column) => {
            let values = table
                .at_each(&column.values)
                .map_err(|error| CallError::OutOfRange {
                    argument: Some(2),
                    message: format!("{error} ({})", si_note(xs.dimension)),
                })?;
            Ok(Value::Column(Column {
                values: Arc::new(values),
                dimension: ys.dimension,
                temperature,
                origin: column.origin.clone(),
            }))
        }
        _ => {
            let value = table
                .at(at.values[0])
                .map_err(|error| CallError::OutOfRange {
                    argument: Some(2),
                    message: format!("{error} ({})", si_note(xs.dimension)),
                })?;
            Ok(scalar(value, ys.dimension, temperature))
        }
    }
}

/// Which unit the numbers of a table message are in.
fn si_note(dimension: Dimension) -> String {
    match dimension.preferred_si_unit().as_str() {
        "1" => "dimensionless".to_string(),
        unit => format!("values in {unit}"),
    }
}
