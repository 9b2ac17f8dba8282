//! Mathematical built-ins: `sqrt exp ln log10 abs min max kelvin sin cos tan`. Each checks the
//! dimensions it needs and refuses arguments outside its domain instead of returning NaN.

use super::Builtin;
use crate::eval::function::{expect_argument_count, CallError};
use crate::eval::{Provenance, Quantity};
use crate::units::{Dimension, Exponent};

pub const FUNCTIONS: &[(&str, Builtin)] = &[
    (
        "sqrt",
        Builtin::new(
            "sqrt(x)",
            "square root; halves every dimension exponent",
            sqrt,
        ),
    ),
    (
        "exp",
        Builtin::new("exp(x)", "e to the power x; x dimensionless", exp),
    ),
    (
        "ln",
        Builtin::new(
            "ln(x)",
            "natural logarithm; x dimensionless and positive",
            ln,
        ),
    ),
    (
        "log10",
        Builtin::new(
            "log10(x)",
            "base-10 logarithm; x dimensionless and positive",
            log10,
        ),
    ),
    (
        "abs",
        Builtin::new("abs(x)", "absolute value, any dimension", abs),
    ),
    (
        "min",
        Builtin::on_columns(
            "min(x, y, …) or min(column)",
            "smallest argument, row by row; or the smallest row of one column",
            min,
            super::columns::column_minimum,
        )
        .taking_temperature(),
    ),
    (
        "max",
        Builtin::on_columns(
            "max(x, y, …) or max(column)",
            "largest argument, row by row; or the largest row of one column",
            max,
            super::columns::column_maximum,
        )
        .taking_temperature(),
    ),
    (
        "kelvin",
        Builtin::new(
            "kelvin(T)",
            "an absolute temperature as plain kelvin, for products and quotients: `R * kelvin(20 degC)`",
            kelvin,
        )
        .taking_temperature(),
    ),
    (
        "sin",
        Builtin::new(
            "sin(x)",
            "sine; x an angle (dimensionless, radians or `deg`)",
            sin,
        ),
    ),
    (
        "cos",
        Builtin::new(
            "cos(x)",
            "cosine; x an angle (dimensionless, radians or `deg`)",
            cos,
        ),
    ),
    (
        "tan",
        Builtin::new(
            "tan(x)",
            "tangent; x an angle (dimensionless, radians or `deg`)",
            tan,
        ),
    ),
];

fn one_argument(arguments: &[Quantity]) -> Result<Quantity, CallError> {
    expect_argument_count(arguments, 1, 1, "1")?;
    Ok(arguments[0])
}

fn dimensionless_argument(arguments: &[Quantity]) -> Result<f64, CallError> {
    let argument = one_argument(arguments)?;
    if !argument.dimension.is_dimensionless() {
        return Err(CallError::WrongDimension {
            argument: 0,
            parameter: "x",
            expected: Dimension::dimensionless(),
            found: argument.dimension,
        });
    }
    Ok(argument.value)
}

fn domain(message: &str) -> CallError {
    CallError::Domain {
        argument: Some(0),
        message: message.to_string(),
    }
}

fn sqrt(arguments: &[Quantity], _: &mut Provenance) -> Result<Quantity, CallError> {
    let argument = one_argument(arguments)?;
    if argument.value < 0.0 {
        return Err(domain("the square root of a negative number is not real"));
    }
    let dimension = argument
        .dimension
        .power(Exponent::new(1, 2))
        .map_err(|_| domain("the dimension's exponents grow too large"))?;
    Ok(Quantity::new(argument.value.sqrt(), dimension))
}

fn exp(arguments: &[Quantity], _: &mut Provenance) -> Result<Quantity, CallError> {
    Ok(Quantity::dimensionless(
        dimensionless_argument(arguments)?.exp(),
    ))
}

fn positive_logarithm(
    arguments: &[Quantity],
    logarithm: fn(f64) -> f64,
) -> Result<Quantity, CallError> {
    let value = dimensionless_argument(arguments)?;
    if value <= 0.0 {
        return Err(domain(
            "the logarithm of zero or a negative number is undefined",
        ));
    }
    Ok(Quantity::dimensionless(logarithm(value)))
}

fn ln(arguments: &[Quantity], _: &mut Provenance) -> Result<Quantity, CallError> {
    positive_logarithm(arguments, f64::ln)
}

fn log10(arguments: &[Quantity], _: &mut Provenance) -> Result<Quantity, CallError> {
    positive_logarithm(arguments, f64::log10)
}

fn abs(arguments: &[Quantity], _: &mut Provenance) -> Result<Quantity, CallError> {
    let argument = one_argument(arguments)?;
    Ok(Quantity {
        value: argument.value.abs(),
        ..argument
    })
}

fn extreme(
    arguments: &[Quantity],
    pick_right: fn(f64, f64) -> bool,
) -> Result<Quantity, CallError> {
    expect_argument_count(arguments, 1, usize::MAX, "1 or more")?;
    let mut best = arguments[0];
    for (index, argument) in arguments.iter().enumerate().skip(1) {
        if argument.dimension != best.dimension {
            return Err(CallError::WrongDimension {
                argument: index,
                parameter: "x",
                expected: best.dimension,
                found: argument.dimension,
            });
        }
        if pick_right(best.value, argument.value) {
            best = *argument;
        }
    }
    Ok(best)
}

fn min(arguments: &[Quantity], _: &mut Provenance) -> Result<Quantity, CallError> {
    extreme(arguments, |best, candidate| candidate < best)
}

fn max(arguments: &[Quantity], _: &mut Provenance) -> Result<Quantity, CallError> {
    extreme(arguments, |best, candidate| candidate > best)
}

/// `kelvin(20 degC)` is 293.15 K that multiplies as written: the one way to say that an
/// absolute temperature from an offset scale is meant as kelvin in a product or quotient.
fn kelvin(arguments: &[Quantity], _: &mut Provenance) -> Result<Quantity, CallError> {
    let argument = one_argument(arguments)?;
    if !argument.dimension.is_temperature() {
        return Err(CallError::WrongDimension {
            argument: 0,
            parameter: "T",
            expected: Dimension::TEMPERATURE,
            found: argument.dimension,
        });
    }
    if argument.is_temperature_difference() {
        return Err(domain(
            "`T` is a temperature difference, which is already a number of kelvin; `kelvin` takes an absolute temperature",
        ));
    }
    if argument.value < 0.0 {
        return Err(domain("`T` is below absolute zero"));
    }
    Ok(Quantity::new(argument.value, argument.dimension))
}

fn sin(arguments: &[Quantity], _: &mut Provenance) -> Result<Quantity, CallError> {
    Ok(Quantity::dimensionless(
        dimensionless_argument(arguments)?.sin(),
    ))
}

fn cos(arguments: &[Quantity], _: &mut Provenance) -> Result<Quantity, CallError> {
    Ok(Quantity::dimensionless(
        dimensionless_argument(arguments)?.cos(),
    ))
}

fn tan(arguments: &[Quantity], _: &mut Provenance) -> Result<Quantity, CallError> {
    Ok(Quantity::dimensionless(
        dimensionless_argument(arguments)?.tan(),
    ))
}
