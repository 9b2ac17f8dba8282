//! Distribution lines: the parameters checked (dimensions, temperature rules, order, signs),
//! then either the median (a sheet run without `--samples`) or a column of this block's
//! samples.

use super::*;
use crate::eval::error::{EvalError, EvalErrorKind};
use crate::eval::uncertainty::law::BoundsError;
use crate::eval::uncertainty::{Law, Spread, UncertainInput};
use crate::eval::value::{Column, Quantity, TemperatureKind, Value};
use crate::syntax::{Distribution, ExpressionKind, Family, Span};

impl<'l> Calculator<'l> {
    /// The value of a distribution: its median, or the samples of the current block.
    pub(super) fn distribution(
        &mut self,
        distribution: &Distribution,
        span: Span,
        scope: &dyn Scope,
    ) -> Result<Value, Failure> {
        let refuse = |message: String, at: Span| -> Failure {
            EvalError::new(EvalErrorKind::Distribution { message }, at).into()
        };
        if !self.parameters.is_empty() {
            let message = "a distribution is an input: it stands on a line of its own, not in a function's body".to_string();
            return Err(refuse(message, span));
        }
        let what = "a distribution's parameter";
        let mut values = Vec::with_capacity(distribution.parameters.len());
        for parameter in &distribution.parameters {
            values.push(self.scalar(parameter, what, scope)?);
        }
        let expected = match distribution.family {
            Family::Triangular => 3,
            _ => 2,
        };
        if values.len() != expected {
            // The grammar gives each family its parameters; anything else is our bug.
            let message = "a distribution with the wrong number of parameters (an internal error)"
                .to_string();
            return Err(refuse(message, span));
        }
        let spans: Vec<Span> = distribution.parameters.iter().map(|p| p.span).collect();
        let law = law_of(distribution.family, &values, &spans)
            .map_err(|(message, at)| refuse(message, at))?;
        let central = values[0];
        let bounds = match &distribution.bounds {
            None => None,
            Some([low, high]) => {
                let low_value = self.scalar(low, "a bound", scope)?;
                let high_value = self.scalar(high, "a bound", scope)?;
                for (bound, at) in [(&low_value, low.span), (&high_value, high.span)] {
                    same_kind(&central, bound, "a bound", at)
                        .map_err(|(message, at)| refuse(message, at))?;
                }
                if low_value.value >= high_value.value || low_value.value.is_nan() {
                    let message = "the lower bound must be below the upper one".to_string();
                    return Err(refuse(message, low.span.to(high.span)));
                }
                Some((low_value.value, high_value.value))
            }
        };
        let spread = Spread::new(law, bounds).map_err(|BoundsError::NothingInside { share }| {
            let at = distribution
                .bounds
                .as_ref()
                .map_or(span, |[low, high]| low.span.to(high.span));
            refuse(
                format!(
                    "the bounds keep {} of the distribution, too little to sample (at least one in a billion is needed)",
                    if share > 0.0 { format!("a share of {share:.1e}") } else { "nothing".to_string() }
                ),
                at,
            )
        })?;
        let mut correlations = Vec::with_capacity(distribution.correlations.len());
        for correlation in &distribution.correlations {
            let rank = self.scalar(&correlation.rank, "a rank correlation", scope)?;
            if !rank.dimension.is_dimensionless() || rank.value.abs() >= 1.0 || rank.value.is_nan()
            {
                let message =
                    "a rank correlation is a plain number strictly between -1 and 1".to_string();
                return Err(refuse(message, correlation.rank.span));
            }
            let other = &correlation.with;
            let is_distribution = scope.definition(&other.text).is_some_and(|definition| {
                matches!(definition.expression.kind, ExpressionKind::Distribution(_))
            });
            // A correlation with the line itself is refused earlier, as a circular definition.
            if !is_distribution {
                let message = format!(
                    "`{}` is not a distribution: a rank correlation is between two uncertain inputs",
                    other.text
                );
                return Err(refuse(message, other.span));
            }
            correlations.push((other.text.clone(), rank.value, correlation.rank.span));
        }
        let temperature = central.temperature;
        let shape = Quantity {
            value: spread.median(),
            dimension: central.dimension,
            temperature,
        };
        crate::eval::evaluate::refuse_below_absolute_zero(&shape, false, span)?;
        let input = UncertainInput {
            key: span.start,
            spread,
            dimension: central.dimension,
            correlations,
        };
        match self
            .uncertain
            .iter_mut()
            .find(|known| known.key == span.start)
        {
            Some(known) => *known = input,
            None => self.uncertain.push(input),
        }
        let Some(block) = &self.sampling else {
            self.notes.insert(
                span.start,
                "its median; `--samples N` samples it".to_string(),
            );
            return Ok(Value::Scalar(shape));
        };
        let Some(scores) = block.scores.get(&span.start) else {
            let message = "this distribution has no samples drawn (an internal error)".to_string();
            return Err(refuse(message, span));
        };
        let mut samples = Vec::new();
        spread.transform(scores, &mut samples);
        let below_zero = matches!(temperature, TemperatureKind::Absolute(_))
            .then(|| samples.iter().position(|kelvin| *kelvin < 0.0))
            .flatten();
        if let Some(row) = below_zero {
            let quantity = Quantity {
                value: samples[row],
                ..shape
            };
            if let Err(error) =
                crate::eval::evaluate::refuse_below_absolute_zero(&quantity, false, span)
            {
                return Err(error.in_row(row, "").into());
            }
        }
        Ok(Value::Column(Column {
            values: std::sync::Arc::new(samples),
            dimension: central.dimension,
            temperature,
            origin: std::sync::Arc::from(""),
        }))
    }
}

/// The law of a family from its checked parameters; an error names the parameter at fault.
fn law_of(family: Family, values: &[Quantity], spans: &[Span]) -> Result<Law, (String, Span)> {
    let name = family.keyword();
    let (central, central_span) = (values[0], spans[0]);
    let others = || values.iter().zip(spans).skip(1);
    let offset_scale = central.offset_scale();
    let refuse_offset = |what: &str| -> Result<(), (String, Span)> {
        match offset_scale {
            Some(scale) => Err((
                format!(
                    "a {what} of an absolute temperature on the {} scale has no meaning (its logarithm depends on the scale's zero): give it in K, or sample a difference",
                    scale.symbol()
                ),
                central_span,
            )),
            None => Ok(()),
        }
    };
    match family {
        Family::Normal => {
            let (sd, sd_span) = (values[1], spans[1]);
            same_kind_difference(&central, &sd, "the standard deviation", sd_span)?;
            positive(sd.value, "the standard deviation", sd_span)?;
            Ok(Law::Normal {
                mean: central.value,
                sd: sd.value,
            })
        }
        Family::LogNormalFactor | Family::LogNormalSdLn | Family::LogNormalSdLog10 => {
            refuse_offset("log-normal")?;
            positive(central.value, "a log-normal's median", central_span)?;
            let (spread, spread_span) = (values[1], spans[1]);
            if !spread.dimension.is_dimensionless() {
                return Err((
                    format!(
                        "a log-normal's spread is a plain number, not {}",
                        spread.dimension.phrase()
                    ),
                    spread_span,
                ));
            }
            let sdln = match family {
                Family::LogNormalFactor => {
                    if !(spread.value > 1.0 && spread.value.is_finite()) {
                        return Err((
                            "the factor (the multiplicative standard deviation, exp of the sd of ln x) must be above 1".to_string(),
                            spread_span,
                        ));
                    }
                    spread.value.ln()
                }
                Family::LogNormalSdLog10 => {
                    positive(spread.value, "the standard deviation of log10", spread_span)?;
                    spread.value * std::f64::consts::LN_10
                }
                _ => {
                    positive(spread.value, "the standard deviation of ln", spread_span)?;
                    spread.value
                }
            };
            Ok(Law::LogNormal {
                median: central.value,
                sdln,
            })
        }
        Family::Uniform | Family::LogUniform | Family::Triangular => {
            for (value, span) in others() {
                same_kind(&central, value, "every value", *span)?;
            }
            let (low, high) = (central.value, values[1].value);
            if low >= high || low.is_nan() {
                return Err((
                    format!("`{name}` goes from the lower value to the higher: the first must be below the second"),
                    central_span.to(spans[1]),
                ));
            }
            match family {
                Family::LogUniform => {
                    refuse_offset("log-uniform")?;
                    positive(low, "a log-uniform's lower value", central_span)?;
                    Ok(Law::LogUniform { low, high })
                }
                Family::Triangular => {
                    let likely = values[2].value;
                    if !(low..=high).contains(&likely) {
                        return Err((
                            "the most likely value must lie between the lower and the upper value"
                                .to_string(),
                            spans[2],
                        ));
                    }
                    Ok(Law::Triangular { low, high, likely })
                }
                _ => Ok(Law::Uniform { low, high }),
            }
        }
    }
}

fn positive(value: f64, what: &str, span: Span) -> Result<(), (String, Span)> {
    if value > 0.0 && value.is_finite() {
        Ok(())
    } else {
        Err((format!("{what} must be above zero"), span))
    }
}

/// `other` has the dimension of `central`, and an absolute temperature is not mixed with a
/// difference.
fn same_kind(
    central: &Quantity,
    other: &Quantity,
    what: &str,
    span: Span,
) -> Result<(), (String, Span)> {
    if other.dimension != central.dimension {
        return Err((
            format!(
                "{what} must have the dimension of the first: that is {}, this is {}",
                central.dimension.phrase(),
                other.dimension.phrase()
            ),
            span,
        ));
    }
    let mixed = central.is_absolute_temperature() && other.is_temperature_difference()
        || central.is_temperature_difference() && other.is_absolute_temperature();
    if mixed {
        return Err((
            format!("{what} must be an absolute temperature too, or all differences (`K`, `delta_degC`)"),
            span,
        ));
    }
    Ok(())
}

/// A spread of a temperature is a difference: `normal mean 10 degC sd 2 K`, never `sd 2 degC`.
fn same_kind_difference(
    central: &Quantity,
    spread: &Quantity,
    what: &str,
    span: Span,
) -> Result<(), (String, Span)> {
    if spread.dimension != central.dimension {
        return Err((
            format!(
                "{what} must have the dimension of the mean: that is {}, this is {}",
                central.dimension.phrase(),
                spread.dimension.phrase()
            ),
            span,
        ));
    }
    if spread.is_absolute_temperature() {
        return Err((
            format!("{what} of a temperature is a difference: write it in `K` or `delta_degC`, not as an absolute temperature"),
            span,
        ));
    }
    Ok(())
}
