//! Values written in place: literals, lists, ranges and data-file columns.

use super::*;
use crate::eval::error::{EvalError, EvalErrorKind, Operation};
use crate::eval::value::{Column, Quantity, Value};
use crate::syntax::{Span, UnitExpression};
use std::sync::Arc;

impl<'l> Calculator<'l> {
    pub(super) fn literal(
        &mut self,
        digits: &str,
        unit: Option<&UnitExpression>,
        span: Span,
    ) -> Result<Quantity, Failure> {
        let number: f64 = digits.parse().unwrap_or(f64::INFINITY);
        let Some(unit_expression) = unit else {
            return Ok(Quantity::dimensionless(number));
        };
        let unit = self.unit(unit_expression)?;
        let temperature = literal_temperature(&unit);
        let value = unit.to_si(number, Some(digits));
        if !value.is_finite() {
            return Err(EvalError::new(EvalErrorKind::NotFinite, span).into());
        }
        let quantity = Quantity {
            value,
            dimension: unit.dimension,
            temperature,
        };
        refuse_below_absolute_zero(&quantity, unit.is_absolute_temperature(), span)?;
        Ok(quantity)
    }

    /// `{12, 40, 150} mD`: each number converted exactly, like a literal.
    pub(super) fn list(
        &mut self,
        items: &[String],
        unit: Option<&UnitExpression>,
        span: Span,
    ) -> Result<Value, Failure> {
        // `--max-rows` holds for every column, a list as much as a range.
        crate::eval::columns::check_rows(items.len() as f64, self.max_rows, span)?;
        let mut values = Vec::with_capacity(items.len());
        let mut shape = Quantity::dimensionless(0.0);
        for item in items {
            let digits = item.trim_start_matches('+');
            shape = self.literal(digits, unit, span)?;
            values.push(shape.value);
        }
        Ok(Value::Column(Column {
            values: Arc::new(values),
            dimension: shape.dimension,
            temperature: shape.temperature,
            origin: Arc::from(""),
        }))
    }

    /// `from to to step s` or `from to to count n [log]`.
    pub(super) fn range(
        &mut self,
        range: &crate::syntax::Range,
        span: Span,
        scope: &dyn Scope,
    ) -> Result<Value, Failure> {
        use crate::eval::columns::{allocate_rows, check_rows, spaced, stepped};
        use crate::syntax::Spacing;
        let from = self.scalar(&range.from, "the start of a range", scope)?;
        let to = self.scalar(&range.to, "the end of a range", scope)?;
        let bad = |message: String, at: Span| -> Failure {
            EvalError::new(EvalErrorKind::BadRange { message }, at).into()
        };
        if from.dimension != to.dimension {
            return Err(EvalError::new(
                EvalErrorKind::DimensionMismatch {
                    operation: Operation::Compare,
                    left: from.dimension,
                    right: to.dimension,
                },
                range.from.span.to(range.to.span),
            )
            .into());
        }
        let values = match &range.spacing {
            Spacing::Step(step_expression) => {
                let step = self.scalar(step_expression, "the step of a range", scope)?;
                if step.dimension != from.dimension {
                    return Err(bad(
                        format!(
                            "the step must have the dimension of the ends ({}), found {}",
                            from.dimension, step.dimension
                        ),
                        step_expression.span,
                    ));
                }
                if step.is_absolute_temperature() {
                    return Err(bad(
                        "a step is a temperature difference: write `5 K` or `5 delta_degC`"
                            .to_string(),
                        step_expression.span,
                    ));
                }
                let span_of_range = to.value - from.value;
                if step.value == 0.0
                    || (span_of_range != 0.0 && step.value.signum() != span_of_range.signum())
                {
                    return Err(bad(
                        "the step must be non-zero and go from the start towards the end"
                            .to_string(),
                        step_expression.span,
                    ));
                }
                let steps = (span_of_range / step.value * (1.0 + 1e-12) + 1e-9).floor() + 1.0;
                let rows = check_rows(steps, self.max_rows, span)?;
                self.row_budget.check(rows, span)?;
                stepped(
                    from.value,
                    to.value,
                    rows,
                    step.value,
                    allocate_rows(rows, span)?,
                )
            }
            Spacing::Count { count, logarithmic } => {
                let number = self.scalar(count, "the count of a range", scope)?;
                if !number.dimension.is_dimensionless()
                    || number.value.fract() != 0.0
                    || number.value < 2.0
                {
                    return Err(bad(
                        "the count must be a whole number of at least 2".to_string(),
                        count.span,
                    ));
                }
                let rows = check_rows(number.value, self.max_rows, count.span)?;
                if *logarithmic && (from.value <= 0.0 || to.value <= 0.0) {
                    return Err(bad(
                        "a logarithmic range needs both ends above zero".to_string(),
                        range.from.span.to(range.to.span),
                    ));
                }
                self.row_budget.check(rows, count.span)?;
                let values = allocate_rows(rows, count.span)?;
                spaced(from.value, to.value, rows, *logarithmic, values)
            }
        };
        Ok(Value::Column(Column {
            values: Arc::new(values),
            dimension: from.dimension,
            temperature: from.temperature,
            origin: Arc::from(""),
        }))
    }

    /// `column k from "file.csv"`: the file was read and checked when the sheet loaded (or,
    /// in a session, when the entry or sheet naming it was read).
    pub(super) fn file_column(
        &mut self,
        header: &crate::syntax::Name,
        path: &str,
        path_span: Span,
        span: Span,
    ) -> Result<Value, Failure> {
        let table = match (
            self.data_files.get(&span.start),
            self.data_by_path.get(path),
        ) {
            (Some(Ok(table)), _) | (None, Some(Ok(table))) => table.clone(),
            (Some(Err(error)), _) => return Err(error.clone().into()),
            (None, Some(Err(message))) => {
                let kind = EvalErrorKind::DataFile {
                    message: message.clone(),
                };
                return Err(EvalError::new(kind, path_span).into());
            }
            (None, None) => {
                return Err(EvalError::new(
                    EvalErrorKind::DataFile {
                        message: "data files are read only in sheets run from a file".to_string(),
                    },
                    span,
                )
                .into())
            }
        };
        table
            .column(&header.text)
            .map(|column| column.value.clone())
            .ok_or_else(|| {
                let names: Vec<String> = table
                    .columns
                    .iter()
                    .map(|column| format!("`{}`", column.name))
                    .collect();
                EvalError::new(
                    EvalErrorKind::DataFile {
                        message: format!(
                            "`{}` has no column `{}`; its columns are {}",
                            table.label,
                            header.text,
                            names.join(", ")
                        ),
                    },
                    header.span,
                )
                .into()
            })
    }
}
