//! Provenance of built-in formulations. `Formulation` itself is defined in `eval` (which
//! records what a sheet used); this module adds the error a formulation returns outside its
//! published validity range.

use std::fmt;

pub use crate::eval::Formulation;

/// A formulation was asked to evaluate outside its published validity range.
#[derive(Debug, Clone, PartialEq)]
pub struct OutOfRange {
    pub formulation: &'static Formulation,
    /// What was out of range, with the offending value, e.g. `T = 268.15 K is below 273.15 K`.
    pub detail: String,
}

impl fmt::Display for OutOfRange {
    fn fmt(&self, formatter: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            formatter,
            "{}; {} is valid for {}",
            self.detail, self.formulation.title, self.formulation.validity
        )
    }
}

impl std::error::Error for OutOfRange {}

/// A formulation's refusal, as a call error that names its range.
pub fn refused(error: OutOfRange) -> crate::eval::CallError {
    crate::eval::CallError::OutOfRange {
        argument: None,
        message: error.to_string(),
    }
}
