//! Runtime quantities: an SI value with its dimension, and for temperatures whether the value
//! is an absolute temperature or a difference (which decides what `+`, `-` and `[degC]` mean).

use crate::units::Dimension;

/// What a temperature value stands for. Meaningful only when the dimension is temperature.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TemperatureKind {
    /// Written on an absolute scale (`20 degC`, `68 degF`, `500 degR`).
    Absolute,
    /// A difference: absolute minus absolute, or a `delta_degC`/`delta_degF` literal.
    Difference,
    /// Kelvin or a computed temperature: usable either way.
    Unspecified,
}

/// A value in SI coherent units with its dimension.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Quantity {
    pub value: f64,
    pub dimension: Dimension,
    pub temperature: TemperatureKind,
}

impl Quantity {
    pub fn new(value: f64, dimension: Dimension) -> Quantity {
        Quantity {
            value,
            dimension,
            temperature: TemperatureKind::Unspecified,
        }
    }

    pub fn dimensionless(value: f64) -> Quantity {
        Quantity::new(value, Dimension::dimensionless())
    }

    pub fn with_temperature(self, temperature: TemperatureKind) -> Quantity {
        Quantity {
            temperature,
            ..self
        }
    }

    pub fn is_absolute_temperature(&self) -> bool {
        self.dimension.is_temperature() && self.temperature == TemperatureKind::Absolute
    }

    pub fn is_temperature_difference(&self) -> bool {
        self.dimension.is_temperature() && self.temperature == TemperatureKind::Difference
    }
}
