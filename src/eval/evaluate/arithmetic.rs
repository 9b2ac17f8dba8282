//! Arithmetic and temperature rules: dimensions of `+ - * / ^`, what absolute temperatures and
//! differences may do, and absolute zero.

use crate::eval::error::{EvalError, EvalErrorKind, Operation};
use crate::eval::function::CallError;
use crate::eval::value::{OffsetScale, Quantity, TemperatureKind, Value};
use crate::syntax::{BinaryOperator, Expression, ExpressionKind, Span};
use crate::units::{Exponent, TemperatureRole, Unit};

pub(crate) fn binary(
    operator: BinaryOperator,
    left: Quantity,
    right: Quantity,
    span: Span,
    right_span: Span,
) -> Result<Quantity, EvalError> {
    use TemperatureKind::Unspecified;
    let error = |kind| EvalError::new(kind, span);
    let overflow = |_| error(EvalErrorKind::ExponentOverflow);
    match operator {
        BinaryOperator::Add | BinaryOperator::Subtract => {
            let adding = operator == BinaryOperator::Add;
            if left.dimension != right.dimension {
                let operation = if adding {
                    Operation::Add
                } else {
                    Operation::Subtract
                };
                return Err(error(EvalErrorKind::DimensionMismatch {
                    operation,
                    left: left.dimension,
                    right: right.dimension,
                }));
            }
            let temperature = if left.dimension.is_temperature() {
                sum_temperature(adding, left.temperature, right.temperature).map_err(error)?
            } else {
                Unspecified
            };
            let value = if adding {
                left.value + right.value
            } else {
                left.value - right.value
            };
            let sum = Quantity {
                value,
                dimension: left.dimension,
                temperature,
            };
            refuse_below_absolute_zero(&sum, false, span)?;
            Ok(sum)
        }
        BinaryOperator::Multiply => {
            refuse_offset_temperature(&left, "multiplied", span)?;
            refuse_offset_temperature(&right, "multiplied", span)?;
            let dimension = left
                .dimension
                .multiply(&right.dimension)
                .map_err(overflow)?;
            Ok(Quantity {
                value: left.value * right.value,
                dimension,
                temperature: scaled_temperature(&left, &right),
            })
        }
        BinaryOperator::Divide => {
            refuse_offset_temperature(&left, "divided", span)?;
            refuse_offset_temperature(&right, "divided by", span)?;
            if right.value == 0.0 {
                return Err(EvalError::new(EvalErrorKind::DivisionByZero, right_span));
            }
            let dimension = left.dimension.divide(&right.dimension).map_err(overflow)?;
            let temperature = if right.dimension.is_dimensionless() {
                scaled_temperature(&left, &right)
            } else {
                Unspecified
            };
            Ok(Quantity {
                value: left.value / right.value,
                dimension,
                temperature,
            })
        }
        BinaryOperator::Power => {
            if !right.dimension.is_dimensionless() {
                return Err(EvalError::new(
                    EvalErrorKind::ExponentNotDimensionless {
                        found: right.dimension,
                    },
                    right_span,
                ));
            }
            refuse_offset_temperature(&left, "raised to a power", span)?;
            let dimension = if left.dimension.is_dimensionless() {
                left.dimension
            } else {
                let exponent = simple_fraction(right.value).ok_or_else(|| {
                    EvalError::new(
                        EvalErrorKind::ExponentNotRational { value: right.value },
                        right_span,
                    )
                })?;
                left.dimension.power(exponent).map_err(overflow)?
            };
            if left.value == 0.0 && right.value < 0.0 {
                return Err(error(EvalErrorKind::DivisionByZero));
            }
            let value = left.value.powf(right.value);
            if value.is_nan() {
                return Err(error(EvalErrorKind::Call {
                    function: "^".to_string(),
                    error: CallError::Domain {
                        argument: None,
                        message: "a negative number has no real fractional power".to_string(),
                    },
                }));
            }
            Ok(Quantity::new(value, dimension))
        }
    }
}

/// Points an offset-temperature error at the operand that caused it and names it as written,
/// so the suggested fix (`kelvin(dT)`) is in the user's own words.
pub(super) fn name_offset_operand(
    error: EvalError,
    operands: [(&Expression, &Value); 2],
) -> EvalError {
    let offending = operands.into_iter().find(|(_, value)| match value {
        Value::Scalar(quantity) => quantity.is_absolute_temperature(),
        Value::Column(column) => column.shape().is_absolute_temperature(),
        Value::Labels(_) => false,
    });
    match offending {
        Some((expression, _)) => point_at_operand(error, expression),
        None => error,
    }
}

/// An offset-temperature error about `expression`: pointed at it, naming it as written.
pub(super) fn point_at_operand(mut error: EvalError, expression: &Expression) -> EvalError {
    if let EvalErrorKind::OffsetTemperature { operand, .. } = error.kind.as_mut() {
        *operand = written_operand(expression);
        error.span = expression.span;
    }
    error
}

/// A name or a literal as the user wrote it (`dT`, `10 degC`); `None` for anything longer.
pub(super) fn written_operand(expression: &Expression) -> Option<String> {
    match &expression.kind {
        ExpressionKind::Name(name) => Some(name.clone()),
        ExpressionKind::Quantity {
            digits,
            unit: Some(unit),
        } => Some(format!("{digits} {}", unit.text)),
        _ => None,
    }
}

/// The kind of `left ± right` for two temperatures: absolute minus absolute is a difference,
/// absolute plus or minus a difference stays absolute on its scale, two absolutes never add.
pub(super) fn sum_temperature(
    adding: bool,
    left: TemperatureKind,
    right: TemperatureKind,
) -> Result<TemperatureKind, EvalErrorKind> {
    use TemperatureKind::{Absolute, Difference, Unspecified};
    Ok(match (adding, left, right) {
        (true, Absolute(_), Absolute(_)) => return Err(EvalErrorKind::AbsoluteTemperatureSum),
        (true, Absolute(scale), _) | (true, _, Absolute(scale)) => Absolute(scale),
        (false, Absolute(_) | Unspecified, Absolute(_)) => Difference,
        (false, Difference, Absolute(_)) => return Err(EvalErrorKind::AbsoluteFromDifference),
        (false, Absolute(scale), _) => Absolute(scale),
        (_, Difference, _) | (_, _, Difference) => Difference,
        _ => Unspecified,
    })
}

/// The kind of temperature a literal in `unit` is: `degC` and `degF` alone are absolute on
/// their offset scale; `K` and `degR` start at absolute zero, so they multiply as written.
pub(crate) fn literal_temperature(unit: &Unit) -> TemperatureKind {
    match (unit.temperature, &unit.offset) {
        (TemperatureRole::Absolute, Some(_)) => {
            TemperatureKind::Absolute(OffsetScale::of_degree(unit.factor.value()))
        }
        (TemperatureRole::Difference, _) => TemperatureKind::Difference,
        _ => TemperatureKind::Unspecified,
    }
}

/// An absolute temperature from an offset scale never enters a product, quotient or power as
/// kelvin: 60 degC times something is not 333.15 K times it unless the user says so.
pub(crate) fn refuse_offset_temperature(
    quantity: &Quantity,
    operation: &str,
    span: Span,
) -> Result<(), EvalError> {
    match quantity.offset_scale() {
        Some(scale) => Err(EvalError::new(
            EvalErrorKind::OffsetTemperature {
                operand: None,
                scale,
                kelvin: quantity.value,
                operation: operation.to_string(),
            },
            span,
        )),
        None => Ok(()),
    }
}

/// Nothing is colder than absolute zero: refuses an absolute temperature (or a value about
/// to be shown on an absolute scale, `shown_absolute`) below 0 K.
pub(crate) fn refuse_below_absolute_zero(
    quantity: &Quantity,
    shown_absolute: bool,
    span: Span,
) -> Result<(), EvalError> {
    let absolute = shown_absolute || quantity.is_absolute_temperature();
    if absolute && quantity.dimension.is_temperature() && quantity.value < 0.0 {
        return Err(EvalError::new(
            EvalErrorKind::BelowAbsoluteZero {
                kelvin: quantity.value,
                scale: quantity.offset_scale(),
            },
            span,
        ));
    }
    Ok(())
}

/// Scaling a temperature difference by a number keeps it a difference; anything else that
/// multiplies a temperature is a plain kelvin quantity.
pub(super) fn scaled_temperature(left: &Quantity, right: &Quantity) -> TemperatureKind {
    if left.is_temperature_difference() && right.dimension.is_dimensionless()
        || right.is_temperature_difference() && left.dimension.is_dimensionless()
    {
        TemperatureKind::Difference
    } else {
        TemperatureKind::Unspecified
    }
}

/// The fraction n/d (d <= 12) equal to `value` within rounding, for powers of units. Only an
/// exact zero is the power zero: `(2 m)^1e-10` is not dimensionless.
pub(super) fn simple_fraction(value: f64) -> Option<Exponent> {
    (1..=12).find_map(|denominator| {
        let numerator = value * f64::from(denominator);
        let rounded = numerator.round();
        let zero_only_if_exact = rounded != 0.0 || value == 0.0;
        ((numerator - rounded).abs() < 1e-9 && rounded.abs() <= 1_000.0 && zero_only_if_exact)
            .then(|| Exponent::new(rounded as i32, denominator))
    })
}

#[cfg(test)]
mod tests {
    //! The temperature and dimension rules, one table row per case, through `binary`.

    use super::*;
    use crate::syntax::Span;
    use crate::units::Dimension;
    use TemperatureKind::{Absolute, Difference, Unspecified};

    const CELSIUS: TemperatureKind = Absolute(OffsetScale::Celsius);

    fn temperature(kelvin: f64, kind: TemperatureKind) -> Quantity {
        Quantity::new(kelvin, Dimension::TEMPERATURE).with_temperature(kind)
    }

    fn metres(value: f64) -> Quantity {
        Quantity::new(value, Dimension::LENGTH)
    }

    fn apply(
        operator: BinaryOperator,
        left: Quantity,
        right: Quantity,
    ) -> Result<Quantity, String> {
        let span = Span::new(0, 1);
        binary(operator, left, right, span, span).map_err(|error| error.to_string())
    }

    /// (left, operator, right, the kind of the result or a word of the refusal).
    #[test]
    fn temperature_rules() {
        use BinaryOperator::{Add, Divide, Multiply, Power, Subtract};
        let twenty_c = temperature(293.15, CELSIUS);
        let ten_c = temperature(283.15, CELSIUS);
        let five_k_difference = temperature(5.0, Difference);
        let kelvin = temperature(300.0, Unspecified);
        let two = Quantity::dimensionless(2.0);
        let cases: [(
            Quantity,
            BinaryOperator,
            Quantity,
            Result<TemperatureKind, &str>,
        ); 14] = [
            (twenty_c, Subtract, ten_c, Ok(Difference)),
            (twenty_c, Add, five_k_difference, Ok(CELSIUS)),
            (five_k_difference, Add, twenty_c, Ok(CELSIUS)),
            (twenty_c, Subtract, five_k_difference, Ok(CELSIUS)),
            (
                twenty_c,
                Add,
                ten_c,
                Err("cannot add two absolute temperatures"),
            ),
            (
                five_k_difference,
                Subtract,
                twenty_c,
                Err("from a temperature difference"),
            ),
            (kelvin, Subtract, twenty_c, Ok(Difference)),
            (five_k_difference, Multiply, two, Ok(Difference)),
            (kelvin, Multiply, two, Ok(Unspecified)),
            (
                twenty_c,
                Multiply,
                two,
                Err("cannot be multiplied as if it were 293.15 K"),
            ),
            (
                two,
                Divide,
                twenty_c,
                Err("cannot be divided by as if it were 293.15 K"),
            ),
            (
                twenty_c,
                Divide,
                metres(2.0),
                Err("cannot be divided as if it were 293.15 K"),
            ),
            (twenty_c, Power, two, Err("raised to a power")),
            (
                twenty_c,
                Subtract,
                temperature(300.0, Unspecified),
                Err("below absolute zero"),
            ),
        ];
        for (index, (left, operator, right, expected)) in cases.into_iter().enumerate() {
            match (apply(operator, left, right), expected) {
                (Ok(result), Ok(kind)) => assert_eq!(result.temperature, kind, "case {index}"),
                (Err(message), Err(word)) => {
                    assert!(message.contains(word), "case {index}: {message}")
                }
                (outcome, expected) => panic!("case {index}: {outcome:?}, expected {expected:?}"),
            }
        }
    }

    #[test]
    fn dimension_rules() {
        use BinaryOperator::{Add, Divide, Multiply, Power};
        let cases: [(Quantity, BinaryOperator, Quantity, Result<f64, &str>); 6] = [
            (metres(2.0), Multiply, metres(3.0), Ok(6.0)),
            (metres(3.0), Divide, metres(2.0), Ok(1.5)),
            (metres(2.0), Add, metres(3.0), Ok(5.0)),
            (
                metres(2.0),
                Add,
                Quantity::dimensionless(1.0),
                Err("cannot add"),
            ),
            (
                metres(2.0),
                Power,
                Quantity::dimensionless(0.5),
                Ok(2f64.sqrt()),
            ),
            (metres(2.0), Divide, metres(0.0), Err("division by zero")),
        ];
        for (index, (left, operator, right, expected)) in cases.into_iter().enumerate() {
            match (apply(operator, left, right), expected) {
                (Ok(result), Ok(value)) => assert_eq!(result.value, value, "case {index}"),
                (Err(message), Err(word)) => {
                    assert!(message.contains(word), "case {index}: {message}")
                }
                (outcome, expected) => panic!("case {index}: {outcome:?}, expected {expected:?}"),
            }
        }
    }

    #[test]
    fn literals_on_offset_scales_are_absolute_and_kelvin_is_plain() {
        let celsius = Unit::lookup("degC").unwrap();
        let rankine = Unit::lookup("degR").unwrap();
        let difference = Unit::lookup("delta_degF").unwrap();
        assert_eq!(literal_temperature(&celsius), CELSIUS);
        assert_eq!(literal_temperature(&rankine), Unspecified);
        assert_eq!(literal_temperature(&difference), Difference);
    }
}
