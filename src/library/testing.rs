//! Shared by the families' reference tests: unit factors written from their definitions, and
//! `check`, which calls a built-in through the standard library (so through its entry's
//! argument, domain and range checks) and compares with a published or hand-computed value.

#![allow(clippy::unwrap_used)]

use super::Builtins;
use crate::eval::{CallError, Library, Provenance, Quantity};
use crate::units::Dimension;

// Unit factors to SI (exact by definition unless noted).
pub const CM: f64 = 0.01;
pub const MM: f64 = 1e-3;
pub const FT: f64 = 0.3048;
pub const GALLON: f64 = 3.785_411_784e-3;
pub const MINUTE: f64 = 60.0;
pub const DAY: f64 = 86_400.0;
pub const PSI: f64 = 0.453_592_37 * 9.806_65 / (0.0254 * 0.0254);
/// 1 mD = 1e-3 D, with 1 D = 1e-12/1.01325 m^2 as in the unit catalog.
pub const MILLIDARCY: f64 = 1e-15 / 1.013_25;

pub fn si(value: f64, dimension: Dimension) -> Quantity {
    Quantity::new(value, dimension)
}

pub fn number(value: f64) -> Quantity {
    Quantity::dimensionless(value)
}

/// What a call must give.
pub enum Expected {
    /// SI value, its dimension, relative tolerance.
    Value(f64, Dimension, f64),
    WrongDimension(usize),
    Domain(usize),
    OutOfRange(usize),
}

/// Calls `name` through the standard library (so through its entry's checks) with SI
/// arguments and compares with `expected`. A value must also have recorded every formulation
/// of the form that was called; a refusal must record none.
pub fn check(name: &str, arguments: &[Quantity], expected: Expected, source: &str) {
    let (result, provenance) = call(name, arguments);
    match (expected, result) {
        (Expected::Value(value, dimension, relative), Ok(found)) => {
            assert_eq!(found.dimension, dimension, "{name} ({source}): dimension");
            let difference = if value == 0.0 {
                found.value.abs()
            } else {
                ((found.value - value) / value).abs()
            };
            assert!(
                difference <= relative,
                "{name} ({source}): {} vs {value} (relative {difference:e} > {relative:e})",
                found.value
            );
            assert!(
                !provenance.formulations().is_empty(),
                "{name}: nothing recorded"
            );
        }
        (Expected::WrongDimension(index), Err(CallError::WrongDimension { argument, .. }))
        | (
            Expected::Domain(index),
            Err(CallError::Domain {
                argument: Some(argument),
                ..
            }),
        )
        | (
            Expected::OutOfRange(index),
            Err(CallError::OutOfRange {
                argument: Some(argument),
                ..
            }),
        ) => {
            assert_eq!(argument, index, "{name} ({source}): refused argument");
            assert!(provenance.formulations().is_empty(), "{name}: recorded");
        }
        (_, outcome) => panic!("{name} ({source}): unexpected {outcome:?}"),
    }
}

/// Calls a built-in by name with SI arguments: its result and what it recorded.
pub fn call(name: &str, arguments: &[Quantity]) -> (Result<Quantity, CallError>, Provenance) {
    let function = Builtins::standard()
        .function(name)
        .unwrap_or_else(|| panic!("no function `{name}`"));
    let mut provenance = Provenance::default();
    (function.call(arguments, &mut provenance), provenance)
}
