//! Units and dimensions: the seven SI base dimensions with rational exponents, the unit catalog
//! with exact factors and sources, and the algebra that combines units.
//!
//! This layer knows nothing of syntax or evaluation: callers hand it symbols and exponents.

pub mod catalog;
pub mod dimension;
pub mod factor;
pub mod unit;

pub use catalog::{TemperatureRole, UnitSystem};
pub use dimension::{Dimension, Exponent};
pub use factor::Factor;
pub use unit::{system_of, Unit, UnitError};
