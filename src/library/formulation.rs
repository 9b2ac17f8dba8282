//! Provenance of a built-in formulation: what it is, where it was published, and the range in
//! which it may be evaluated. Every property and transport function points at one of these, so
//! listings, run footers and reports all read the same citation text.

use std::fmt;

/// A published formulation (a standard, a correlation, a law) that built-in functions implement.
#[derive(Debug, PartialEq, Eq)]
pub struct Formulation {
    /// Short stable identifier, e.g. `iapws-if97-region1`.
    pub id: &'static str,
    /// Human title, e.g. `IAPWS-IF97 region 1 (liquid water)`.
    pub title: &'static str,
    /// Full citation of the publication the coefficients and equations come from.
    pub citation: &'static str,
    /// Validity range as published, in words and units, e.g. `273.15 K <= T <= 623.15 K, ...`.
    pub validity: &'static str,
}

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
            "{} is outside the validity range of {} ({})",
            self.detail, self.formulation.title, self.formulation.validity
        )
    }
}

impl std::error::Error for OutOfRange {}
