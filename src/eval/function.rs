//! The interface between the evaluator and built-in functions and constants. The evaluator
//! defines it; `library` implements it; the front ends hand a library to the evaluator.

pub use super::columns::Rows;
use super::value::{Quantity, Value};
use crate::units::Dimension;
use std::fmt;

/// A published formulation (a standard, a correlation, a law) that built-ins implement. Kept
/// here so that the evaluator can record which ones a sheet used.
#[derive(Debug, PartialEq)]
pub struct Formulation {
    /// Short stable identifier, e.g. `iapws-if97-region1`.
    pub id: &'static str,
    /// Human title, e.g. `IAPWS-IF97 region 1 (liquid water)`.
    pub title: &'static str,
    /// Full citation of the publication the equations and coefficients come from.
    pub citation: &'static str,
    /// Validity range as published, in words and units.
    pub validity: &'static str,
    /// The parameter ranges of `validity` that are plain bounds, as data: the evaluator refuses
    /// a relation's arguments outside them. Bounds that depend on other arguments (a pressure
    /// above saturation at T) stay in the formulation's code.
    pub ranges: &'static [ValidRange],
}

/// A range of one parameter inside which a formulation was published as valid. Bounds are SI;
/// `unit` is the unit the message states them in (`0.1 to 3 mm`).
#[derive(Debug, PartialEq)]
pub struct ValidRange {
    pub parameter: &'static str,
    pub low: f64,
    pub high: f64,
    pub unit: &'static str,
}

/// The formulations a sheet's calls used, in first-use order, without repeats.
#[derive(Debug, Default, Clone)]
pub struct Provenance {
    used: Vec<&'static Formulation>,
}

impl Provenance {
    pub fn record(&mut self, formulation: &'static Formulation) {
        if !self.used.iter().any(|known| known.id == formulation.id) {
            self.used.push(formulation);
        }
    }

    pub fn formulations(&self) -> &[&'static Formulation] {
        &self.used
    }
}

/// A built-in function callable from a sheet.
pub trait Function: Sync {
    /// How it is called, e.g. `water_density(T[, p])`.
    fn signature(&self) -> String;
    /// One line on what it computes.
    fn summary(&self) -> &'static str;
    /// The formula of each form, in the sheet's operators (`q = K * i`), for listings; empty
    /// for the built-ins that are not relations.
    fn formulas(&self) -> Vec<&'static str> {
        Vec::new()
    }
    /// The formula of the form that these arguments call, with its parameters' names, for the
    /// working of a line.
    fn formula_for(&self, _arguments: &[Quantity]) -> Option<FormulaUse> {
        None
    }
    /// The formulations behind it, for listings.
    fn formulations(&self) -> Vec<&'static Formulation> {
        Vec::new()
    }
    fn call(
        &self,
        arguments: &[Quantity],
        provenance: &mut Provenance,
    ) -> Result<Quantity, CallError>;
    /// For functions of whole columns (aggregates, table lookups): the result. `None` means
    /// the function is applied row by row through `call`.
    fn call_values(
        &self,
        _arguments: &[Value],
        _provenance: &mut Provenance,
    ) -> Option<Result<Value, CallError>> {
        None
    }
    /// A fast path for the rows after the first: given arguments shaped like `first_row`
    /// (which `call` has accepted, so dimensions are already checked), a kernel that computes
    /// spans of rows from plain SI numbers. `None` means every row goes through `call`.
    fn column_kernel(&self, _first_row: &[Quantity]) -> Option<Box<dyn ColumnKernel + '_>> {
        None
    }
    /// Whether an absolute temperature from an offset scale (`20 degC`) may be passed: true
    /// for functions that take a temperature as such (properties, comparisons, means); the
    /// evaluator refuses it everywhere else, as it refuses it in a product.
    fn takes_absolute_temperature(&self) -> bool {
        false
    }
    /// Its parameters (meaning, dimension, domain, default) and an example call, one line
    /// each, for `:about`, listings and editor hovers.
    fn details(&self) -> Vec<String> {
        Vec::new()
    }
}

/// The formula a call used: its text and the form's parameters in order, each with the value
/// it takes when left out.
#[derive(Debug, Clone, PartialEq)]
pub struct FormulaUse {
    pub formula: &'static str,
    pub parameters: Vec<(&'static str, Option<Quantity>)>,
    /// The formulations this form follows (those it records when called).
    pub formulations: &'static [&'static Formulation],
}

/// Computes a function over a span of rows from the columns' plain SI numbers. One call
/// covers many rows, so the evaluator may hand disjoint spans to several threads.
pub trait ColumnKernel: Sync {
    /// Writes rows `first..first + out.len()` of the call over `arguments` into `out`, each
    /// row going through the same checks as `Function::call`; stops at the first row that
    /// fails.
    fn rows(&self, arguments: &[Rows<'_>], first: usize, out: &mut [f64])
        -> Result<(), RowFailure>;
}

/// The first row of a span that failed, and why: a refusal, or `None` for a result that is not
/// a finite number.
#[derive(Debug, Clone, PartialEq)]
pub struct RowFailure {
    pub row: usize,
    pub error: Option<CallError>,
}

/// A named constant.
#[derive(Debug, Clone)]
pub struct Constant {
    pub name: &'static str,
    pub quantity: Quantity,
    /// The unit to show it in, e.g. `m/s^2`.
    pub unit: &'static str,
    pub summary: &'static str,
    pub source: &'static str,
}

/// What the evaluator needs from a library of built-ins.
/// `Sync`: a sampled sheet is evaluated on several threads at once.
pub trait Library: Sync {
    fn function(&self, name: &str) -> Option<&dyn Function>;
    fn constant(&self, name: &str) -> Option<&Constant>;
    /// Every function and constant name, for "did you mean" hints.
    fn names(&self) -> Vec<&'static str>;
}

/// Why a call failed. `argument` indexes the call's arguments so the evaluator can point at it.
#[derive(Debug, Clone, PartialEq)]
pub enum CallError {
    ArgumentCount {
        expected: &'static str,
        found: usize,
    },
    WrongDimension {
        argument: usize,
        parameter: &'static str,
        expected: Dimension,
        found: Dimension,
    },
    /// Outside the mathematical or physical domain (ln of a negative, porosity above 1).
    Domain {
        argument: Option<usize>,
        message: String,
    },
    /// Outside a formulation's published validity range; the message names the range.
    OutOfRange {
        argument: Option<usize>,
        message: String,
    },
}

impl fmt::Display for CallError {
    fn fmt(&self, formatter: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            CallError::ArgumentCount { expected, found } => {
                write!(
                    formatter,
                    "takes {expected} argument(s), but {found} were given"
                )
            }
            CallError::WrongDimension {
                parameter,
                expected,
                found,
                ..
            } => write!(
                formatter,
                "argument `{parameter}` must be {}, found {}",
                expected.phrase(),
                found.phrase()
            ),
            CallError::Domain { message, .. } | CallError::OutOfRange { message, .. } => {
                formatter.write_str(message)
            }
        }
    }
}

/// Checks the number of arguments against an inclusive range.
pub fn expect_argument_count(
    arguments: &[Quantity],
    minimum: usize,
    maximum: usize,
    expected: &'static str,
) -> Result<(), CallError> {
    if arguments.len() < minimum || arguments.len() > maximum {
        return Err(CallError::ArgumentCount {
            expected,
            found: arguments.len(),
        });
    }
    Ok(())
}

/// Checks one argument's dimension.
pub fn expect_dimension(
    arguments: &[Quantity],
    argument: usize,
    parameter: &'static str,
    expected: Dimension,
) -> Result<f64, CallError> {
    let found = arguments[argument].dimension;
    if found != expected {
        return Err(CallError::WrongDimension {
            argument,
            parameter,
            expected,
            found,
        });
    }
    Ok(arguments[argument].value)
}
