//! Calls: built-ins (row by row over columns, through their kernels) and sheet functions.

use super::*;
use crate::eval::columns::Rows;
use crate::eval::error::{EvalError, EvalErrorKind};
use crate::eval::function::{CallError, ColumnKernel, Function, RowFailure};
use crate::eval::value::{Column, Quantity, Value};
use crate::syntax::{Expression, FunctionDefinition, Span};
use crate::units::Dimension;
use std::sync::Arc;

/// Calls with at most this many arguments pass them on the stack.
pub(super) const SHORT_CALL: usize = 8;

/// Nesting of sheet-function calls beyond which a call is refused (recursion is refused at
/// definition, so only a pathological chain of distinct functions reaches it).
pub(super) const CALL_DEPTH_LIMIT: usize = 64;
/// How a distribution called like a function (`lognormal(…)`) is written.
fn distribution_written(name: &str) -> Option<&'static str> {
    Some(match name {
        "normal" => "normal mean 0.9 m sd 0.05 m",
        "lognormal" => "lognormal median 1e-9 m/s factor 3",
        "uniform" => "uniform 0.2 to 0.4",
        "loguniform" => "loguniform 1 mD to 100 mD",
        "triangular" => "triangular 0.1 m to 0.6 m likely 0.3 m",
        _ => return None,
    })
}

impl<'l> Calculator<'l> {
    /// A call of a built-in: whole-column functions get the values as they are; others are
    /// applied row by row, with the dimensions checked on the first row only.
    pub(super) fn call_builtin(
        &mut self,
        function: &crate::syntax::Name,
        arguments: &[Expression],
        span: Span,
        scope: &dyn Scope,
    ) -> Result<Value, Failure> {
        let Some(callee) = self.library.function(&function.text) else {
            if let Some(written) = distribution_written(&function.text) {
                let message = format!(
                    "a distribution is not a function call: write it as `{written}` (the README's Uncertainty section lists them)"
                );
                let kind = EvalErrorKind::Distribution { message };
                return Err(EvalError::new(kind, function.span).into());
            }
            let kind = if scope.lookup(&function.text).is_some()
                || self.library.constant(&function.text).is_some()
            {
                EvalErrorKind::NameCalledAsFunction {
                    name: function.text.clone(),
                }
            } else {
                EvalErrorKind::UnknownFunction {
                    name: function.text.clone(),
                    suggestion: self.suggest(&function.text, scope),
                }
            };
            return Err(EvalError::new(kind, function.span).into());
        };
        let mut values = Vec::with_capacity(arguments.len());
        for argument in arguments {
            let value = self.expression(argument, scope)?;
            if !callee.takes_absolute_temperature() {
                let shape = match &value {
                    Value::Scalar(quantity) => Some(*quantity),
                    Value::Column(column) => Some(column.shape()),
                    Value::Labels(_) => None,
                };
                if let Some(shape) = shape {
                    let operation = format!("passed to `{}`", function.text);
                    refuse_offset_temperature(&shape, &operation, argument.span)
                        .map_err(|error| point_at_operand(error, argument))?;
                }
            }
            values.push(value);
        }
        self.calls.push(CallRecord {
            function: function.text.clone(),
            span,
            arguments: arguments
                .iter()
                .map(|argument| argument.span)
                .zip(values.iter().cloned())
                .collect(),
        });
        let call_error = |error: CallError| {
            let at = match &error {
                CallError::WrongDimension { argument, .. } => Some(*argument),
                CallError::Domain { argument, .. } | CallError::OutOfRange { argument, .. } => {
                    *argument
                }
                CallError::ArgumentCount { .. } => None,
            };
            let error_span = at
                .and_then(|index| arguments.get(index))
                .map_or(span, |argument| argument.span);
            EvalError::new(
                EvalErrorKind::Call {
                    function: function.text.clone(),
                    error,
                },
                error_span,
            )
        };
        if let Some(result) = callee.call_values(&values, &mut self.provenance) {
            // Over samples, a function of whole columns would combine the samples of a block.
            let sampled = self.sampling.is_some()
                && values.iter().any(|value| matches!(value, Value::Column(_)));
            if sampled {
                let what = "a function of whole columns (an aggregate, a table, layers, wells)";
                return Err(EvalError::new(EvalErrorKind::NotWithSamples { what }, span).into());
            }
            return result.map_err(|error| call_error(error).into());
        }
        let mut rows = None;
        let mut first_column = 0;
        for (index, value) in values.iter().enumerate() {
            if let Value::Labels(labels) = value {
                let kind = EvalErrorKind::TextInArithmetic {
                    origin: labels.origin.to_string(),
                };
                return Err(EvalError::new(kind, arguments[index].span).into());
            }
            if let Some(length) = value.rows() {
                match rows {
                    None => (rows, first_column) = (Some(length), index),
                    Some(earlier) if earlier != length => {
                        let kind = EvalErrorKind::ColumnLengths {
                            left_rows: earlier,
                            left_origin: crate::eval::columns::origin(&values[first_column])
                                .to_string(),
                            right_rows: length,
                            right_origin: crate::eval::columns::origin(value).to_string(),
                        };
                        return Err(EvalError::new(kind, arguments[index].span)
                            .with_label(arguments[first_column].span, format!("{earlier} rows"))
                            .into());
                    }
                    Some(_) => {}
                }
            }
        }
        let row_one = |value: &Value| {
            value
                .quantity_at(0)
                .unwrap_or(Quantity::dimensionless(f64::NAN))
        };
        let Some(rows) = rows else {
            // All single values, the common case: short calls pass them on the stack.
            let mut buffer = [Quantity::dimensionless(0.0); SHORT_CALL];
            let owned: Vec<Quantity>;
            let scalars: &[Quantity] = if values.len() <= SHORT_CALL {
                for (slot, value) in buffer.iter_mut().zip(&values) {
                    *slot = row_one(value);
                }
                &buffer[..values.len()]
            } else {
                owned = values.iter().map(row_one).collect();
                &owned
            };
            return callee
                .call(scalars, &mut self.provenance)
                .map(Value::Scalar)
                .map_err(|error| call_error(error).into());
        };
        let first_row: Vec<Quantity> = values.iter().map(row_one).collect();
        let origin: Arc<str> = Arc::from(crate::eval::columns::origin(&values[first_column]));
        if rows == 0 {
            return Err(EvalError::new(
                EvalErrorKind::BadRange {
                    message: "a column with no rows".to_string(),
                },
                span,
            )
            .into());
        }
        let shape = callee
            .call(&first_row, &mut self.provenance)
            .map_err(|error| call_error(error).in_row(0, &origin))?;
        let columns: Vec<Rows> = values.iter().map(Rows::of).collect();
        let computed = match callee.column_kernel(&first_row) {
            Some(kernel) => {
                let mut results = vec![0.0; rows];
                results[0] = shape.value;
                match rows_in_parallel(kernel.as_ref(), &columns, &mut results, self.threads) {
                    None => Ok(results),
                    Some(failure) => Err(failure),
                }
            }
            None => self.rows_one_by_one(callee, first_row, &columns, rows, shape.value),
        };
        match computed {
            Ok(results) => Ok(Value::Column(Column {
                values: Arc::new(results),
                dimension: shape.dimension,
                temperature: shape.temperature,
                origin,
            })),
            Err(RowFailure { row, error }) => {
                let error = match error {
                    Some(error) => call_error(error),
                    None => EvalError::new(EvalErrorKind::NotFinite, span),
                };
                Err(error.in_row(row, &origin).into())
            }
        }
    }

    /// Rows 1.. of a call of a function without a kernel, each through `call`.
    fn rows_one_by_one(
        &mut self,
        callee: &dyn Function,
        mut row_values: Vec<Quantity>,
        columns: &[Rows<'_>],
        rows: usize,
        first_value: f64,
    ) -> Result<Vec<f64>, RowFailure> {
        let mut results = Vec::with_capacity(rows);
        results.push(first_value);
        for row in 1..rows {
            for (quantity, column) in row_values.iter_mut().zip(columns) {
                quantity.value = column.at(row);
            }
            match callee.call(&row_values, &mut self.provenance) {
                Ok(value) if value.value.is_finite() => results.push(value.value),
                Ok(_) => return Err(RowFailure { row, error: None }),
                Err(error) => {
                    return Err(RowFailure {
                        row,
                        error: Some(error),
                    })
                }
            }
        }
        Ok(results)
    }

    /// Resolves a function's declared units once at its definition; returns its signature.
    pub(crate) fn check_function_units(
        &mut self,
        function: &FunctionDefinition,
    ) -> Result<String, EvalError> {
        let mut parameters = Vec::new();
        for parameter in &function.parameters {
            match &parameter.unit {
                Some(unit) => {
                    self.unit(unit)?;
                    parameters.push(format!("{} [{}]", parameter.name.text, unit.text));
                }
                None => parameters.push(parameter.name.text.clone()),
            }
        }
        let mut signature = format!("{}({})", function.name.text, parameters.join(", "));
        if let Some(unit) = &function.result_unit {
            self.unit(unit)?;
            signature.push_str(&format!(" [{}]", unit.text));
        }
        Ok(signature)
    }

    /// Calls a function defined in the sheet: arguments checked against declared dimensions,
    /// the body evaluated with the parameters bound, errors pointing at call and definition.
    pub(super) fn call_sheet_function(
        &mut self,
        name: &crate::syntax::Name,
        arguments: &[Expression],
        span: Span,
        scope: &dyn Scope,
    ) -> Result<Value, Failure> {
        let Some(Some(definition)) = scope.sheet_function(&name.text) else {
            return Err(Failure::Upstream(name.text.clone()));
        };
        let defined_here =
            |error: EvalError| error.with_label(definition.name.span, "defined here");
        if arguments.len() != definition.parameters.len() {
            let kind = EvalErrorKind::SheetFunctionArguments {
                function: name.text.clone(),
                expected: definition.parameters.len(),
                found: arguments.len(),
            };
            return Err(defined_here(EvalError::new(kind, span)).into());
        }
        let mut bound = Vec::with_capacity(arguments.len());
        for (argument, parameter) in arguments.iter().zip(&definition.parameters) {
            let value = self.expression(argument, scope)?;
            if let Some(unit) = &parameter.unit {
                let unit = self.unit(unit)?;
                if Some(unit.dimension) != value.dimension() {
                    let kind = EvalErrorKind::ParameterDimension {
                        function: name.text.clone(),
                        parameter: parameter.name.text.clone(),
                        expected: unit.dimension,
                        found: value.dimension().unwrap_or(Dimension::dimensionless()),
                    };
                    let error = EvalError::new(kind, argument.span)
                        .with_label(parameter.name.span, "declared here");
                    return Err(error.into());
                }
            }
            bound.push((parameter.name.text.clone(), value));
        }
        if self.parameters.len() >= CALL_DEPTH_LIMIT {
            return Err(Failure::Upstream(name.text.clone()));
        }
        self.parameters.push(bound);
        let result = self.expression(&definition.body, scope);
        self.parameters.pop();
        let value = result.map_err(|failure| match failure {
            Failure::Error(error) => {
                Failure::Error(error.with_label(span, format!("in this call of `{}`", name.text)))
            }
            upstream => upstream,
        })?;
        if let Some(unit) = &definition.result_unit {
            let unit = self.unit(unit)?;
            if Some(unit.dimension) != value.dimension() {
                let kind = EvalErrorKind::ResultDimension {
                    function: name.text.clone(),
                    expected: unit.dimension,
                    found: value.dimension().unwrap_or(Dimension::dimensionless()),
                };
                return Err(EvalError::new(kind, span)
                    .with_label(unit_span(definition), "declared here")
                    .into());
            }
        }
        Ok(value)
    }
}

/// Where a function declares its result unit (or its name, if it declares none).
pub(super) fn unit_span(function: &FunctionDefinition) -> Span {
    function
        .result_unit
        .as_ref()
        .map_or(function.name.span, |unit| unit.span)
}

/// The fewest rows a thread of a column kernel takes: a column is split across the cores only
/// from twice this many rows. Starting a thread and joining it costs far less than 20 000 rows
/// of even the cheapest relation (see DEVELOPERS.md, Performance).
pub(crate) const PARALLEL_ROWS: usize = 20_000;

/// Rows 1.. of a call through its kernel into `results` (row 0 holds the first row's value),
/// split into one contiguous span per thread (at most `threads`) when the column is long.
/// Every span stops at its own first failure, so the first failing span's failure is the
/// column's first failing row, the one a row-by-row loop would report.
fn rows_in_parallel(
    kernel: &dyn ColumnKernel,
    arguments: &[Rows<'_>],
    results: &mut [f64],
    threads: usize,
) -> Option<RowFailure> {
    let rest = &mut results[1..];
    let threads = threads.min(rest.len() / PARALLEL_ROWS.max(1)).max(1);
    if threads == 1 {
        return kernel.rows(arguments, 1, rest).err();
    }
    let span = rest.len().div_ceil(threads);
    std::thread::scope(|scope| {
        let mut pending = Vec::with_capacity(threads);
        let mut spans = rest.chunks_mut(span).enumerate();
        // This thread takes the first span itself.
        let (_, own) = spans.next()?;
        for (index, chunk) in spans {
            let first = 1 + index * span;
            pending.push(scope.spawn(move || kernel.rows(arguments, first, chunk)));
        }
        let mut failed = kernel.rows(arguments, 1, own).err();
        for handle in pending {
            // A kernel that panicked is our bug: the panic goes on as it would on one thread.
            let outcome = handle
                .join()
                .unwrap_or_else(|panic| std::panic::resume_unwind(panic));
            if failed.is_none() {
                failed = outcome.err();
            }
        }
        failed
    })
}
