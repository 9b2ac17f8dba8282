//! Plain numerics for calculation sheets, with no physics in them: aggregates of columns
//! (`aggregates`), table interpolation (`interpolation`), bracketed root finding (`roots`),
//! least squares, numbers as text to significant figures (`significant`), and the errors and
//! input checks they share.
//!
//! Everything works on plain `f64` and never panics. Invalid input is
//! reported as an error naming the argument, the 1-based row, the offending
//! value and the allowed range, so a sheet can show it to an engineer as is.
//! Infinite and NaN inputs are always rejected: in a sheet they are the
//! symptom of an upstream mistake, not data.

use std::fmt;

mod aggregates;
mod interpolation;
mod least_squares;
mod roots;
mod significant;

pub use aggregates::*;
pub use interpolation::*;
pub use least_squares::*;
pub use roots::*;
pub use significant::{format_significant, message_number, write_significant, MESSAGE_DIGITS};

// ---------------------------------------------------------------------------
// Errors
// ---------------------------------------------------------------------------

/// The values an argument accepts, as stated in error messages.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Allowed {
    /// Strictly greater than zero.
    Positive,
    /// Zero or greater.
    NonNegative,
}

impl fmt::Display for Allowed {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Allowed::Positive => "greater than 0",
            Allowed::NonNegative => "0 or greater",
        })
    }
}

/// The direction of a strictly monotonic column.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Order {
    Increasing,
    Decreasing,
}

impl fmt::Display for Order {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Order::Increasing => "increasing",
            Order::Decreasing => "decreasing",
        })
    }
}

/// Why a column function rejected its input. Rows are 1-based, as a sheet
/// shows them; `row: None` means the argument is a single value.
#[derive(Debug, Clone, PartialEq)]
pub enum ColumnError {
    /// The column has no rows.
    Empty { argument: &'static str },
    /// The column has rows, but fewer than the calculation needs.
    TooFewRows {
        argument: &'static str,
        rows: usize,
        required: usize,
    },
    /// Two columns that pair up row by row have different lengths.
    LengthMismatch {
        first: &'static str,
        first_rows: usize,
        second: &'static str,
        second_rows: usize,
    },
    /// A value is NaN or infinite.
    NotFinite {
        argument: &'static str,
        row: Option<usize>,
        value: f64,
    },
    /// A value lies outside the range the physics allows.
    OutOfRange {
        argument: &'static str,
        row: Option<usize>,
        value: f64,
        allowed: Allowed,
        reason: &'static str,
    },
    /// A table's x column is not strictly monotonic at `row`. `order` is the
    /// direction set by the first two rows, `None` when row 2 repeats row 1.
    NotMonotonic {
        argument: &'static str,
        row: usize,
        value: f64,
        previous: f64,
        order: Option<Order>,
    },
    /// An interpolation point lies outside the table; tables never extrapolate.
    OutsideTable {
        argument: &'static str,
        row: Option<usize>,
        value: f64,
        low: f64,
        high: f64,
    },
    /// The result exceeds what a 64-bit float can hold (about 1.8e308).
    Overflow { argument: &'static str },
}

/// Formats a number for messages: shortest round-trip digits, with an
/// exponent for very large or small magnitudes (unlike `{}` for `f64`, which
/// would print 1e300 with 301 digits).
struct Number(f64);

impl fmt::Display for Number {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{:?}", self.0)
    }
}

/// "row 3 of `xs`" for a column entry, "`x`" for a single value.
struct Location {
    argument: &'static str,
    row: Option<usize>,
}

impl fmt::Display for Location {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self.row {
            Some(row) => write!(f, "row {row} of `{}`", self.argument),
            None => write!(f, "`{}`", self.argument),
        }
    }
}

fn rows_word(count: usize) -> &'static str {
    if count == 1 {
        "row"
    } else {
        "rows"
    }
}

impl fmt::Display for ColumnError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match *self {
            ColumnError::Empty { argument } => {
                write!(f, "`{argument}` is empty: at least one value is needed")
            }
            ColumnError::TooFewRows {
                argument,
                rows,
                required,
            } => write!(
                f,
                "`{argument}` has {rows} {}, but at least {required} are needed",
                rows_word(rows)
            ),
            ColumnError::LengthMismatch {
                first,
                first_rows,
                second,
                second_rows,
            } => write!(
                f,
                "`{first}` has {first_rows} {} but `{second}` has {second_rows}: \
                 they pair up row by row, so they must have the same number of rows",
                rows_word(first_rows)
            ),
            ColumnError::NotFinite {
                argument,
                row,
                value,
            } => write!(
                f,
                "{} is {}: a finite number is needed",
                Location { argument, row },
                Number(value)
            ),
            ColumnError::OutOfRange {
                argument,
                row,
                value,
                allowed,
                reason,
            } => write!(
                f,
                "{} is {}, but it must be {allowed} ({reason})",
                Location { argument, row },
                Number(value)
            ),
            ColumnError::NotMonotonic {
                argument,
                row,
                value,
                previous,
                order,
            } => {
                let previous_row = row.saturating_sub(1);
                match order {
                    None => write!(
                        f,
                        "row {row} of `{argument}` ({}) repeats row {previous_row}",
                        Number(value)
                    )?,
                    Some(order) => write!(
                        f,
                        "row {row} of `{argument}` is {} after {} in row {previous_row}, \
                         but the column is {order} from its first two rows",
                        Number(value),
                        Number(previous)
                    )?,
                }
                f.write_str(
                    ": table x values must be strictly increasing or strictly decreasing, \
                     with no repeats",
                )
            }
            ColumnError::OutsideTable {
                argument,
                row,
                value,
                low,
                high,
            } => write!(
                f,
                "{} is {}, outside the table's range [{}, {}]; tables are not extrapolated",
                Location { argument, row },
                Number(value),
                Number(low),
                Number(high)
            ),
            ColumnError::Overflow { argument } => write!(
                f,
                "the result computed from `{argument}` is too large for a 64-bit float \
                 (above about 1.8e308)"
            ),
        }
    }
}

impl std::error::Error for ColumnError {}

// ---------------------------------------------------------------------------
// Validation helpers
// ---------------------------------------------------------------------------

pub(crate) fn require_rows(
    argument: &'static str,
    values: &[f64],
    required: usize,
) -> Result<(), ColumnError> {
    if values.is_empty() {
        Err(ColumnError::Empty { argument })
    } else if values.len() < required {
        Err(ColumnError::TooFewRows {
            argument,
            rows: values.len(),
            required,
        })
    } else {
        Ok(())
    }
}

pub(crate) fn require_same_length(
    first: &'static str,
    first_values: &[f64],
    second: &'static str,
    second_values: &[f64],
) -> Result<(), ColumnError> {
    if first_values.len() == second_values.len() {
        Ok(())
    } else {
        Err(ColumnError::LengthMismatch {
            first,
            first_rows: first_values.len(),
            second,
            second_rows: second_values.len(),
        })
    }
}

/// Checks one value: finite, and within `allowed` if given.
pub(crate) fn check_value(
    argument: &'static str,
    row: Option<usize>,
    value: f64,
    allowed: Option<(Allowed, &'static str)>,
) -> Result<(), ColumnError> {
    if !value.is_finite() {
        return Err(ColumnError::NotFinite {
            argument,
            row,
            value,
        });
    }
    if let Some((allowed, reason)) = allowed {
        let accepted = match allowed {
            Allowed::Positive => value > 0.0,
            Allowed::NonNegative => value >= 0.0,
        };
        if !accepted {
            return Err(ColumnError::OutOfRange {
                argument,
                row,
                value,
                allowed,
                reason,
            });
        }
    }
    Ok(())
}

/// Checks every row of a column, reporting the first bad row.
pub(crate) fn check_column(
    argument: &'static str,
    values: &[f64],
    allowed: Option<(Allowed, &'static str)>,
) -> Result<(), ColumnError> {
    values
        .iter()
        .enumerate()
        .try_for_each(|(index, &value)| check_value(argument, Some(index + 1), value, allowed))
}

/// Like `f64::clamp`, but cannot panic (it relies on `low <= high`, which
/// every caller guarantees, yet a wrong guess yields a value, not a crash).
pub(crate) fn clamp_between(value: f64, low: f64, high: f64) -> f64 {
    value.max(low).min(high)
}

/// Smallest and largest value of a column already checked to be finite and
/// non-empty.
pub(crate) fn value_range(values: &[f64]) -> (f64, f64) {
    values
        .iter()
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(low, high), &value| {
            (low.min(value), high.max(value))
        })
}

/// Shared by the numerics' tests.
#[cfg(test)]
pub(crate) mod test_support {
    use std::convert::Infallible;

    pub fn close(actual: f64, expected: f64, relative: f64) -> bool {
        (actual - expected).abs() <= relative * expected.abs()
    }

    pub fn ok(value: f64) -> Result<f64, Infallible> {
        Ok(value)
    }

    /// Deterministic pseudo-random numbers in [0, 1) (a 64-bit LCG with
    /// Knuth's MMIX constants, from memory); quality is irrelevant here.
    pub struct Lcg(pub u64);

    impl Lcg {
        pub fn next(&mut self) -> f64 {
            self.0 = self
                .0
                .wrapping_mul(6_364_136_223_846_793_005)
                .wrapping_add(1_442_695_040_888_963_407);
            (self.0 >> 11) as f64 / (1u64 << 53) as f64
        }
    }
}
