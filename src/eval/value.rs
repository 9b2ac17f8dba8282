//! Runtime quantities: an SI value with its dimension, and for temperatures whether the value
//! is an absolute temperature or a difference (which decides what `+`, `-` and `[degC]` mean).

use crate::units::Dimension;
use std::sync::Arc;

/// What a temperature value stands for. Meaningful only when the dimension is temperature.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TemperatureKind {
    /// An absolute temperature written on an offset scale (`20 degC`, `68 degF`). Its kelvin
    /// value is not the number the user wrote, so it never silently enters a product, a
    /// quotient or a power: the user says whether a difference or kelvin was meant.
    Absolute(OffsetScale),
    /// A difference: absolute minus absolute, or a `delta_degC`/`delta_degF` literal.
    Difference,
    /// Kelvin, Rankine or a computed temperature: usable either way.
    Unspecified,
}

/// The two temperature scales whose zero is not absolute zero.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum OffsetScale {
    Celsius,
    Fahrenheit,
}

impl OffsetScale {
    /// The scale of a lone absolute temperature unit with an offset (`degC`, `degF`), told
    /// apart by the size of its degree.
    pub fn of_degree(kelvin_per_degree: f64) -> OffsetScale {
        if kelvin_per_degree == 1.0 {
            OffsetScale::Celsius
        } else {
            OffsetScale::Fahrenheit
        }
    }

    pub fn symbol(self) -> &'static str {
        match self {
            OffsetScale::Celsius => "degC",
            OffsetScale::Fahrenheit => "degF",
        }
    }

    pub fn difference_symbol(self) -> &'static str {
        match self {
            OffsetScale::Celsius => "delta_degC",
            OffsetScale::Fahrenheit => "delta_degF",
        }
    }

    /// Kelvin in one degree of the scale.
    pub fn degree(self) -> f64 {
        match self {
            OffsetScale::Celsius => 1.0,
            OffsetScale::Fahrenheit => 5.0 / 9.0,
        }
    }

    /// An absolute temperature in kelvin, on this scale.
    pub fn from_kelvin(self, kelvin: f64) -> f64 {
        match self {
            OffsetScale::Celsius => kelvin - 273.15,
            OffsetScale::Fahrenheit => kelvin * 1.8 - 459.67,
        }
    }
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

    /// An absolute temperature from an offset scale (`degC`, `degF`).
    pub fn is_absolute_temperature(&self) -> bool {
        self.offset_scale().is_some()
    }

    /// The offset scale an absolute temperature was written on, if it was.
    pub fn offset_scale(&self) -> Option<OffsetScale> {
        match self.temperature {
            TemperatureKind::Absolute(scale) if self.dimension.is_temperature() => Some(scale),
            _ => None,
        }
    }

    pub fn is_temperature_difference(&self) -> bool {
        self.dimension.is_temperature() && self.temperature == TemperatureKind::Difference
    }
}

/// A column of quantities that share one dimension and temperature kind: a sweep, a list, a
/// column of a data file, or anything computed from one. Values are SI; the vector is shared
/// so that naming a column elsewhere copies nothing.
#[derive(Debug, Clone, PartialEq)]
pub struct Column {
    pub values: Arc<Vec<f64>>,
    pub dimension: Dimension,
    pub temperature: TemperatureKind,
    /// The line the column first came from (`T_site`), for errors about lengths.
    pub origin: Arc<str>,
}

/// A column of text from a data file (sample names): shown in tables, refused in arithmetic.
#[derive(Debug, Clone, PartialEq)]
pub struct Labels {
    pub texts: Arc<Vec<String>>,
    pub origin: Arc<str>,
}

/// What an expression evaluates to.
#[derive(Debug, Clone, PartialEq)]
pub enum Value {
    Scalar(Quantity),
    Column(Column),
    Labels(Labels),
}

impl Column {
    pub fn len(&self) -> usize {
        self.values.len()
    }

    pub fn is_empty(&self) -> bool {
        self.values.is_empty()
    }

    /// Row `row` (0-based) as a quantity.
    pub fn quantity(&self, row: usize) -> Quantity {
        Quantity {
            value: self.values[row],
            dimension: self.dimension,
            temperature: self.temperature,
        }
    }

    /// The dimension and temperature kind of every row, with a stand-in value.
    pub fn shape(&self) -> Quantity {
        Quantity {
            value: self.values.first().copied().unwrap_or(1.0),
            dimension: self.dimension,
            temperature: self.temperature,
        }
    }
}

impl Value {
    /// The number of rows: `None` for a scalar.
    pub fn rows(&self) -> Option<usize> {
        match self {
            Value::Scalar(_) => None,
            Value::Column(column) => Some(column.len()),
            Value::Labels(labels) => Some(labels.texts.len()),
        }
    }

    pub fn as_scalar(&self) -> Option<&Quantity> {
        match self {
            Value::Scalar(quantity) => Some(quantity),
            _ => None,
        }
    }

    /// The dimension shared by every element (text has none).
    pub fn dimension(&self) -> Option<Dimension> {
        match self {
            Value::Scalar(quantity) => Some(quantity.dimension),
            Value::Column(column) => Some(column.dimension),
            Value::Labels(_) => None,
        }
    }

    /// Row `row` as a quantity; a scalar is the same in every row.
    pub fn quantity_at(&self, row: usize) -> Option<Quantity> {
        match self {
            Value::Scalar(quantity) => Some(*quantity),
            Value::Column(column) => column.values.get(row).map(|_| column.quantity(row)),
            Value::Labels(_) => None,
        }
    }
}
