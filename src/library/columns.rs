//! Functions of whole columns: aggregates, effective coefficients of layered media, and
//! interpolation in a table of two columns. The numerics are in `crate::numeric`; this module
//! checks dimensions once per column and carries them to the result.

use super::Builtin;
use crate::eval::function::CallError;
use crate::eval::{Column, Formulation, Provenance, Quantity, TemperatureKind, Value};
use crate::numeric::{self, ColumnError, Interpolation, InterpolationTable};
use crate::units::Dimension;
use std::sync::Arc;

// Section and equation numbers of Freeze & Cherry are from memory, as in `numeric`.

/// Layers in parallel: the same gradient in every layer, the fluxes add. Holds for any of the
/// four transport coefficients, since Darcy, Fick, Fourier and Ohm share one form.
pub static LAYERED_ALONG: Formulation = Formulation {
    id: "layered-along",
    title: "effective coefficient for flow along layers, K = sum(K_i b_i) / sum(b_i)",
    citation: "Freeze, R. A. and Cherry, J. A., 1979, Groundwater, Prentice-Hall, Englewood \
Cliffs NJ, section 2.4, eq. 2.31",
    validity: "steady flow parallel to the layers, each layer homogeneous; coefficients \
K_i >= 0, thicknesses b_i > 0",
    ranges: &[],
};

/// Layers in series: the same flux through every layer, the potential drops add.
pub static LAYERED_ACROSS: Formulation = Formulation {
    id: "layered-across",
    title: "effective coefficient for flow across layers, K = sum(b_i) / sum(b_i / K_i)",
    citation: "Freeze, R. A. and Cherry, J. A., 1979, Groundwater, Prentice-Hall, Englewood \
Cliffs NJ, section 2.4, eq. 2.32",
    validity: "steady flow perpendicular to the layers, each layer homogeneous; coefficients \
K_i > 0, thicknesses b_i > 0",
    ranges: &[],
};

// A `static`, as in `transport`: the layered entries cite formulation statics inline.
pub static FUNCTIONS: &[(&str, Builtin)] = &[
    ("sum", Builtin::on_columns("sum(values)", "sum of a column's rows (compensated summation)", one_value, sum)),
    ("mean", Builtin::on_columns("mean(values)", "arithmetic mean of a column", one_value, mean).taking_temperature()),
    ("geomean", Builtin::on_columns("geomean(values)", "geometric mean of a column of positive values (the usual average of permeabilities of a log-normal sample)", one_value, geomean)),
    ("harmean", Builtin::on_columns("harmean(values)", "harmonic mean of a column of positive values", one_value, harmean)),
    ("count", Builtin::on_columns("count(values)", "number of rows of a column (1 for a single value)", count_one, count).taking_temperature()),
    ("layered_along", Builtin::on_columns("layered_along(coefficient, thickness)", "effective coefficient for flow along layers: sum(K b) / sum(b) (Freeze & Cherry 1979, eq. 2.31)", not_columns, layered_along).citing(&[&LAYERED_ALONG])),
    ("layered_across", Builtin::on_columns("layered_across(coefficient, thickness)", "effective coefficient for flow across layers: sum(b) / sum(b / K) (Freeze & Cherry 1979, eq. 2.32)", not_columns, layered_across).citing(&[&LAYERED_ACROSS])),
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
fn not_columns(_: &[Quantity], _: &mut Provenance) -> Result<Quantity, CallError> {
    Err(CallError::Domain {
        argument: Some(0),
        message: "needs columns (a list, a range or a data-file column), not single values"
            .to_string(),
    })
}

fn count_error(found: usize, expected: &'static str) -> CallError {
    CallError::ArgumentCount { expected, found }
}

/// A column's numbers with its dimension and temperature kind; a single value is one row.
struct Rows<'a> {
    values: &'a [f64],
    dimension: Dimension,
    temperature: TemperatureKind,
}

fn rows(value: &Value, argument: usize) -> Result<Rows<'_>, CallError> {
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

fn numeric_error(argument: usize) -> impl Fn(ColumnError) -> CallError {
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

fn scalar(value: f64, dimension: Dimension, temperature: TemperatureKind) -> Value {
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

/// The coefficient and thickness columns of a layered medium.
fn layers(arguments: &[Value]) -> Result<(Rows<'_>, Rows<'_>), CallError> {
    let [coefficient, thickness] = arguments else {
        return Err(count_error(arguments.len(), "2 (coefficient, thickness)"));
    };
    let (coefficient, thickness) = (rows(coefficient, 0)?, rows(thickness, 1)?);
    if thickness.dimension != Dimension::LENGTH {
        return Err(CallError::WrongDimension {
            argument: 1,
            parameter: "thickness",
            expected: Dimension::LENGTH,
            found: thickness.dimension,
        });
    }
    Ok((coefficient, thickness))
}

/// An effective coefficient of layers: the coefficient's dimension, no temperature kind. The
/// formulation is recorded once the layers are accepted.
fn layered(
    arguments: &[Value],
    mean: fn(&[f64], &[f64]) -> Result<f64, ColumnError>,
    formulation: &'static Formulation,
    provenance: &mut Provenance,
) -> Option<Result<Value, CallError>> {
    Some(layers(arguments).and_then(|(coefficient, thickness)| {
        let value = mean(coefficient.values, thickness.values).map_err(numeric_error(0))?;
        provenance.record(formulation);
        Ok(scalar(
            value,
            coefficient.dimension,
            TemperatureKind::Unspecified,
        ))
    }))
}

fn layered_along(
    arguments: &[Value],
    provenance: &mut Provenance,
) -> Option<Result<Value, CallError>> {
    layered(
        arguments,
        numeric::layered_along,
        &LAYERED_ALONG,
        provenance,
    )
}

fn layered_across(
    arguments: &[Value],
    provenance: &mut Provenance,
) -> Option<Result<Value, CallError>> {
    layered(
        arguments,
        numeric::layered_across,
        &LAYERED_ACROSS,
        provenance,
    )
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
