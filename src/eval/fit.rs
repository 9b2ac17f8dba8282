//! `fit model to observed varying a, b [log]`: the values of input lines for which a column
//! line best matches a column of observations by least squares. Each trial re-evaluates only
//! the lines between the varied inputs and the model, through an overlay scope, as a solve
//! does; the line's value is the first varied input's fitted value, and its note gives every
//! fitted value with its standard error and 95 % interval, the residual RMS and the iterations.

use super::error::{EvalError, EvalErrorKind};
use super::evaluate::{Calculator, Failure, Scope, Shown, ShownValue};
use super::solve::{lines_between_any, In};
use super::value::{Quantity, Value};
use crate::numeric::{fit_least_squares, FitError, Fitted};
use crate::syntax::{Fit, Name, Span};
use rustc_hash::FxHashMap as HashMap;

impl Calculator<'_> {
    /// Fits the varied inputs; the report goes to `notes`.
    pub(crate) fn fit(
        &mut self,
        fit: &Fit,
        span: Span,
        scope: &dyn Scope,
    ) -> Result<Value, Failure> {
        let error = |message: String, at: Span| -> Failure {
            EvalError::new(EvalErrorKind::Fit { message }, at).into()
        };
        for (index, name) in fit.varying.iter().enumerate() {
            if fit.varying[..index]
                .iter()
                .any(|earlier| earlier.text == name.text)
            {
                return Err(error(format!("`{}` is varied twice", name.text), name.span));
            }
        }
        let mut inputs: Vec<ShownValue> = Vec::with_capacity(fit.varying.len());
        for name in &fit.varying {
            match scope.lookup(&name.text) {
                None => {
                    return Err(error(
                        format!(
                            "`{}` is not a line of the sheet; a fit varies named inputs",
                            name.text
                        ),
                        name.span,
                    ))
                }
                Some(None) => return Err(Failure::Upstream(name.text.clone())),
                Some(Some(Shown::Scalar(shown))) => inputs.push(shown.clone()),
                Some(Some(_)) => {
                    return Err(EvalError::new(
                        EvalErrorKind::ScalarNeeded {
                            what: "an input varied by a fit",
                        },
                        name.span,
                    )
                    .into())
                }
            }
        }
        let observed = column_of(scope, &fit.observed, "the observations of a fit")?;
        let model = column_of(scope, &fit.model, "the model of a fit")?;
        if model.dimension != observed.dimension {
            return Err(EvalError::new(
                EvalErrorKind::DimensionMismatch {
                    operation: super::error::Operation::Compare,
                    left: model.dimension,
                    right: observed.dimension,
                },
                fit.model.span,
            )
            .into());
        }
        if model.values.len() != observed.values.len() {
            return Err(error(
                format!(
                    "`{}` has {} rows but `{}` has {}: the model must give one value per observation",
                    fit.model.text,
                    model.values.len(),
                    fit.observed.text,
                    observed.values.len()
                ),
                fit.model.span,
            ));
        }
        let names: Vec<&str> = fit.varying.iter().map(|name| name.text.as_str()).collect();
        for name in &fit.varying {
            if lines_between_any(scope, &fit.model.text, &[name.text.as_str()]).is_empty() {
                return Err(error(
                    format!(
                        "`{}` does not depend on `{}`, so the data cannot fix it",
                        fit.model.text, name.text
                    ),
                    name.span,
                ));
            }
        }
        let chain = lines_between_any(scope, &fit.model.text, &names);
        let model_name = &fit.model.text;
        let mut trial = |parameters: &[f64]| -> Result<Vec<f64>, Failure> {
            let mut values: HashMap<String, Shown> = HashMap::default();
            for ((name, shown), &value) in names.iter().zip(&inputs).zip(parameters) {
                let quantity = Quantity {
                    value,
                    ..shown.quantity
                };
                values.insert(
                    name.to_string(),
                    Shown::Scalar(ShownValue {
                        quantity,
                        unit: shown.unit.clone(),
                        value,
                    }),
                );
            }
            self.reevaluate_chain(&chain, &mut values, scope)?;
            match values.get(model_name.as_str()) {
                Some(Shown::Column(shown)) => Ok(shown.column.values.to_vec()),
                _ => Err(error(
                    format!("`{model_name}` is no longer a column"),
                    fit.model.span,
                )),
            }
        };
        let initial: Vec<f64> = inputs.iter().map(|shown| shown.quantity.value).collect();
        let fitted = fit_least_squares(&mut trial, &initial, &observed.values, fit.logarithmic)
            .map_err(|failure| match failure {
                FitError::Model(Failure::Error(inner)) => {
                    Failure::Error(inner.with_label(span, "while fitting".to_string()))
                }
                FitError::Model(upstream) => upstream,
                other => error(describe(&other, fit), refusal_span(&other, fit, span)),
            })?;
        let note = report(&fitted, fit, &inputs, &observed_unit(scope, &fit.observed));
        self.notes.insert(span.start, note);
        Ok(Value::Scalar(Quantity {
            value: fitted.parameters[0],
            ..inputs[0].quantity
        }))
    }
}

/// A column line's numbers and dimension.
struct ColumnValues {
    values: Vec<f64>,
    dimension: crate::units::Dimension,
}

fn column_of(scope: &dyn Scope, name: &Name, what: &'static str) -> Result<ColumnValues, Failure> {
    match scope.lookup(&name.text) {
        None => Err(EvalError::new(
            EvalErrorKind::Fit {
                message: format!("`{}` is not a line of the sheet", name.text),
            },
            name.span,
        )
        .into()),
        Some(None) => Err(Failure::Upstream(name.text.clone())),
        Some(Some(Shown::Column(shown))) => Ok(ColumnValues {
            values: shown.column.values.to_vec(),
            dimension: shown.column.dimension,
        }),
        Some(Some(_)) => Err(EvalError::new(
            EvalErrorKind::Fit {
                message: format!(
                    "{what} must be a column (a list, a range or a data-file column), and `{}` is not",
                    name.text
                ),
            },
            name.span,
        )
        .into()),
    }
}

/// The unit the observations are shown in, for the residual RMS.
fn observed_unit(scope: &dyn Scope, name: &Name) -> String {
    match scope.lookup(&name.text) {
        Some(Some(Shown::Column(shown))) => shown.unit.clone(),
        _ => String::new(),
    }
}

fn refusal_span(failure: &FitError<Failure>, fit: &Fit, whole: Span) -> Span {
    match failure {
        FitError::NotIdentifiable { parameter } => {
            fit.varying.get(*parameter).map_or(whole, |name| name.span)
        }
        FitError::BadObservation { .. } | FitError::TooFewObservations { .. } => fit.observed.span,
        _ => whole,
    }
}

fn describe(failure: &FitError<Failure>, fit: &Fit) -> String {
    let parameter = |index: usize| {
        fit.varying
            .get(index)
            .map_or("?", |name| name.text.as_str())
    };
    match failure {
        FitError::TooFewObservations {
            observations,
            parameters,
        } => format!(
            "{observations} observations cannot fit {parameters} parameter(s) with an uncertainty: a fit needs more observations than parameters"
        ),
        FitError::BadObservation { row, value } if fit.logarithmic => format!(
            "row {row} of `{}` is {value}: a fit in log space needs positive observations",
            fit.observed.text
        ),
        FitError::BadObservation { row, value } => {
            format!("row {row} of `{}` is {value}, not a finite number", fit.observed.text)
        }
        FitError::NotIdentifiable { parameter: index } => {
            let others: Vec<&str> = fit
                .varying
                .iter()
                .map(|name| name.text.as_str())
                .filter(|name| *name != parameter(*index))
                .collect();
            if others.is_empty() {
                format!(
                    "the data cannot identify `{}`: the model barely changes with it over these observations",
                    parameter(*index)
                )
            } else {
                format!(
                    "the data cannot identify `{}`: over these observations the model changes with it only as it does with {}; fix one of them or add observations that tell them apart",
                    parameter(*index),
                    others.iter().map(|name| format!("`{name}`")).collect::<Vec<_>>().join(", ")
                )
            }
        }
        FitError::NotConverged { reason, iterations } => format!(
            "the fit did not converge after {iterations} iterations: {reason}; start the varied inputs nearer the answer"
        ),
        FitError::Model(_) => format!("`{}` could not be evaluated", fit.model.text),
    }
}

/// `T = 2.01e-3 m^2/s, standard error 3.1e-5 m^2/s, 95 % 1.95e-3 to 2.07e-3 m^2/s; …; RMS
/// residual 0.012 m over 60 observations; Levenberg-Marquardt, 9 iterations`.
fn report(fitted: &Fitted, fit: &Fit, inputs: &[ShownValue], observed_unit: &str) -> String {
    let mut parts = Vec::new();
    for (index, name) in fit.varying.iter().enumerate() {
        let unit = In::unit_of(&inputs[index]);
        let value = fitted.parameters[index];
        let half = fitted.half_widths[index];
        parts.push(format!(
            "{} = {}, standard error {}, 95 % interval {} to {}",
            name.text,
            unit.write(value),
            unit.write(fitted.standard_errors[index]),
            unit.write(value - half),
            unit.write(value + half)
        ));
    }
    let rms = if fit.logarithmic {
        format!(
            "RMS residual of the logarithms {} (about {} %)",
            crate::numeric::message_number(fitted.rms),
            crate::numeric::message_number(fitted.rms * 100.0)
        )
    } else {
        let shown = ShownValue {
            quantity: Quantity::dimensionless(fitted.rms),
            unit: observed_unit.to_string(),
            value: fitted.rms,
        };
        format!("RMS residual {}", In::unit_of(&shown).write(fitted.rms))
    };
    format!(
        "{}; {rms}; Levenberg-Marquardt, {} iterations",
        parts.join("; "),
        fitted.iterations
    )
}
