//! Column numerics for calculation sheets: aggregates, effective coefficients
//! of layered media, table interpolation and bracketed root finding.
//!
//! Everything works on plain `f64` and never panics. Invalid input is
//! reported as an error naming the argument, the 1-based row, the offending
//! value and the allowed range, so a sheet can show it to an engineer as is.
//! Infinite and NaN inputs are always rejected: in a sheet they are the
//! symptom of an upstream mistake, not data.

use std::fmt;

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

fn require_rows(
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

fn require_same_length(
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
fn check_value(
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
fn check_column(
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
fn clamp_between(value: f64, low: f64, high: f64) -> f64 {
    value.max(low).min(high)
}

/// Smallest and largest value of a column already checked to be finite and
/// non-empty.
fn value_range(values: &[f64]) -> (f64, f64) {
    values
        .iter()
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(low, high), &value| {
            (low.min(value), high.max(value))
        })
}

// ---------------------------------------------------------------------------
// Aggregates
// ---------------------------------------------------------------------------

/// Compensated running sum after Kahan (1965, "Further remarks on reducing
/// truncation errors", Comm. ACM 8(1):40) as improved by Neumaier (1974,
/// "Rundungsfehleranalyse einiger Verfahren zur Summation endlicher Summen",
/// ZAMM 54:39-51); both from memory, see also Higham, "Accuracy and Stability
/// of Numerical Algorithms", 2nd ed. 2002, ch. 4. The rounding error of each
/// addition is recovered exactly and accumulated separately, so the error of
/// the total no longer grows with the number of rows; Neumaier's variant
/// also stays exact when an addend is larger than the running sum.
#[derive(Debug, Clone, Copy, Default)]
struct CompensatedSum {
    sum: f64,
    compensation: f64,
}

impl CompensatedSum {
    fn add(&mut self, value: f64) {
        let total = self.sum + value;
        self.compensation += if self.sum.abs() >= value.abs() {
            (self.sum - total) + value
        } else {
            (value - total) + self.sum
        };
        self.sum = total;
    }

    /// NaN or infinite when an intermediate sum overflowed.
    fn total(&self) -> f64 {
        self.sum + self.compensation
    }
}

fn compensated_sum(values: impl IntoIterator<Item = f64>) -> f64 {
    values
        .into_iter()
        .fold(CompensatedSum::default(), |mut sum, value| {
            sum.add(value);
            sum
        })
        .total()
}

/// Arithmetic mean of a checked, non-empty column. When the plain sum would
/// overflow, the rows are divided by the row count first; the mean is then
/// representable because it lies between the smallest and largest row.
fn checked_mean(values: &[f64]) -> f64 {
    let rows = values.len() as f64;
    let (low, high) = value_range(values);
    let total = compensated_sum(values.iter().copied());
    let mean = if total.is_finite() {
        total / rows
    } else {
        compensated_sum(values.iter().map(|&value| value / rows))
    };
    clamp_between(mean, low, high)
}

/// Sum of a column, with compensated (Kahan-Neumaier) summation so that a
/// million rows sum to within a few rounding errors of the exact total.
/// An empty column is an error, as it almost always is a sheet mistake; so
/// is a total beyond the largest float.
pub fn sum(values: &[f64]) -> Result<f64, ColumnError> {
    const ARGUMENT: &str = "values";
    require_rows(ARGUMENT, values, 1)?;
    check_column(ARGUMENT, values, None)?;
    let total = compensated_sum(values.iter().copied());
    if total.is_finite() {
        return Ok(total);
    }
    // A partial sum overflowed; the total may still fit (MAX + MAX − MAX).
    // Halving is exact for all but subnormal rows, which cannot matter here.
    let half = compensated_sum(values.iter().map(|&value| value * 0.5));
    if half.abs() <= f64::MAX * 0.5 {
        Ok(half * 2.0)
    } else {
        Err(ColumnError::Overflow { argument: ARGUMENT })
    }
}

/// Arithmetic mean, with compensated summation.
pub fn mean(values: &[f64]) -> Result<f64, ColumnError> {
    const ARGUMENT: &str = "values";
    require_rows(ARGUMENT, values, 1)?;
    check_column(ARGUMENT, values, None)?;
    Ok(checked_mean(values))
}

/// Geometric mean, computed as exp(mean of ln x) so that products of many
/// rows cannot overflow or underflow. It is the natural average of
/// log-normally distributed coefficients such as hydraulic conductivity
/// (it is the effective conductivity of a two-dimensional isotropic
/// log-normal medium, Matheron 1967, from memory). All rows must be > 0.
pub fn geometric_mean(values: &[f64]) -> Result<f64, ColumnError> {
    const ARGUMENT: &str = "values";
    require_rows(ARGUMENT, values, 1)?;
    check_column(
        ARGUMENT,
        values,
        Some((
            Allowed::Positive,
            "the geometric mean takes the logarithm of every value",
        )),
    )?;
    let (low, high) = value_range(values);
    let mean_log = compensated_sum(values.iter().map(|value| value.ln())) / values.len() as f64;
    // The mean of a set lies between its extremes; clamping removes the last
    // rounding error of exp() that could otherwise break that (or overflow
    // when every row is near the largest float).
    Ok(clamp_between(mean_log.exp(), low, high))
}

/// Harmonic mean n / Σ(1/x): the effective value of coefficients acting in
/// series (equal-thickness layers across flow). All rows must be > 0.
///
/// Computed as x_min · n / Σ(x_min/x) so that each term lies in (0, 1]:
/// 1/x would overflow for tiny rows.
pub fn harmonic_mean(values: &[f64]) -> Result<f64, ColumnError> {
    const ARGUMENT: &str = "values";
    require_rows(ARGUMENT, values, 1)?;
    check_column(
        ARGUMENT,
        values,
        Some((
            Allowed::Positive,
            "the harmonic mean takes the reciprocal of every value",
        )),
    )?;
    let (low, high) = value_range(values);
    let scaled_reciprocals = compensated_sum(values.iter().map(|&value| low / value));
    Ok(clamp_between(
        low * (values.len() as f64 / scaled_reciprocals),
        low,
        high,
    ))
}

/// Smallest value and the 1-based row where it first occurs.
pub fn minimum(values: &[f64]) -> Result<(f64, usize), ColumnError> {
    extreme(values, |candidate, best| candidate < best)
}

/// Largest value and the 1-based row where it first occurs.
pub fn maximum(values: &[f64]) -> Result<(f64, usize), ColumnError> {
    extreme(values, |candidate, best| candidate > best)
}

fn extreme(
    values: &[f64],
    replaces: impl Fn(f64, f64) -> bool,
) -> Result<(f64, usize), ColumnError> {
    const ARGUMENT: &str = "values";
    require_rows(ARGUMENT, values, 1)?;
    check_column(ARGUMENT, values, None)?;
    let mut best: Option<(f64, usize)> = None;
    for (index, &value) in values.iter().enumerate() {
        best = match best {
            Some((best_value, _)) if !replaces(value, best_value) => best,
            _ => Some((value, index + 1)),
        };
    }
    best.ok_or(ColumnError::Empty { argument: ARGUMENT })
}

// ---------------------------------------------------------------------------
// Layered media
// ---------------------------------------------------------------------------

const COEFFICIENT: &str = "coefficient";
const THICKNESS: &str = "thickness";

/// Checks a layer table: same length, at least one layer, finite values,
/// thickness > 0 and coefficient within `coefficient_allowed`.
fn check_layers(
    coefficient: &[f64],
    thickness: &[f64],
    coefficient_allowed: (Allowed, &'static str),
) -> Result<(), ColumnError> {
    require_rows(COEFFICIENT, coefficient, 1)?;
    require_same_length(COEFFICIENT, coefficient, THICKNESS, thickness)?;
    for (index, (&layer_coefficient, &layer_thickness)) in
        coefficient.iter().zip(thickness).enumerate()
    {
        let row = Some(index + 1);
        check_value(
            COEFFICIENT,
            row,
            layer_coefficient,
            Some(coefficient_allowed),
        )?;
        check_value(
            THICKNESS,
            row,
            layer_thickness,
            Some((Allowed::Positive, "every layer needs a positive thickness")),
        )?;
    }
    Ok(())
}

/// Compensated sum of terms that are each exact to one rounding: `None` if a
/// term or the total overflowed, or a nonzero term lost precision by
/// underflowing (the flag marks a term whose zero is genuine).
fn reliable_sum(terms: impl Iterator<Item = (f64, bool)>) -> Option<f64> {
    let mut total = CompensatedSum::default();
    for (term, genuine_zero) in terms {
        if !(term.is_normal() || (term == 0.0 && genuine_zero)) {
            return None;
        }
        total.add(term);
    }
    Some(total.total()).filter(|sum| sum.is_finite())
}

/// ln Σ e^(l_i), shifted by the largest l so that no exponential overflows;
/// -inf entries (ln 0) contribute nothing.
fn log_sum_exp(logs: impl Iterator<Item = f64> + Clone) -> f64 {
    let largest = logs.clone().fold(f64::NEG_INFINITY, f64::max);
    if largest == f64::NEG_INFINITY {
        return largest;
    }
    largest + compensated_sum(logs.map(|log| (log - largest).exp())).ln()
}

/// Effective coefficient for flow parallel to the layers: the
/// thickness-weighted arithmetic mean K = Σ K_i b_i / Σ b_i.
///
/// All layers see the same gradient and their fluxes add (layers in
/// parallel). Freeze & Cherry (1979), "Groundwater", section 2.4, eq. 2.31
/// (section and equation number from memory); the same result is derived in
/// Todd & Mays (2005), "Groundwater Hydrology", and Fetter (2001), "Applied
/// Hydrogeology" (from memory). Because Darcy, Fick, Fourier and Ohm share
/// the form flux = −coefficient · gradient, it holds for hydraulic, diffusive,
/// thermal and electrical conductivity alike. Coefficients must be >= 0,
/// thicknesses > 0.
pub fn layered_along(coefficient: &[f64], thickness: &[f64]) -> Result<f64, ColumnError> {
    check_layers(
        coefficient,
        thickness,
        (
            Allowed::NonNegative,
            "a transport coefficient cannot be negative",
        ),
    )?;
    let (low, high) = value_range(coefficient);
    let layers = coefficient.iter().zip(thickness);
    let direct = reliable_sum(layers.clone().map(|(&k, &b)| (k * b, k == 0.0)))
        .zip(reliable_sum(thickness.iter().map(|&b| (b, false))))
        .map(|(flow, total_thickness)| flow / total_thickness);
    let along = direct.unwrap_or_else(|| {
        // Only for values beyond about 1e±150: the same ratio in logarithms.
        (log_sum_exp(layers.map(|(k, b)| k.ln() + b.ln()))
            - log_sum_exp(thickness.iter().map(|b| b.ln())))
        .exp()
    });
    Ok(clamp_between(along, low, high))
}

/// Effective coefficient for flow perpendicular to the layers: the
/// thickness-weighted harmonic mean K = Σ b_i / Σ (b_i / K_i).
///
/// The flux is the same through every layer and the potential drops add
/// (layers in series, like resistors). Freeze & Cherry (1979),
/// "Groundwater", section 2.4, eq. 2.32 (from memory); also Todd & Mays
/// (2005) and Fetter (2001) (from memory). Coefficients must be > 0: a layer
/// with zero coefficient stops all flow across the stack. Thicknesses > 0.
pub fn layered_across(coefficient: &[f64], thickness: &[f64]) -> Result<f64, ColumnError> {
    check_layers(
        coefficient,
        thickness,
        (
            Allowed::Positive,
            "a layer with zero coefficient blocks all flow across the layers",
        ),
    )?;
    let (low, high) = value_range(coefficient);
    let layers = coefficient.iter().zip(thickness);
    let direct = reliable_sum(thickness.iter().map(|&b| (b, false)))
        .zip(reliable_sum(layers.clone().map(|(&k, &b)| (b / k, false))))
        .map(|(total_thickness, resistance)| total_thickness / resistance);
    let across = direct.unwrap_or_else(|| {
        // Only for values beyond about 1e±150: the same ratio in logarithms.
        (log_sum_exp(thickness.iter().map(|b| b.ln()))
            - log_sum_exp(layers.map(|(k, b)| b.ln() - k.ln())))
        .exp()
    });
    Ok(clamp_between(across, low, high))
}

// ---------------------------------------------------------------------------
// Table interpolation
// ---------------------------------------------------------------------------

/// How a table is interpolated between rows.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Interpolation {
    /// y is linear in x between rows.
    Linear,
    /// ln(y) is linear in x between rows (y = a·e^(b·x) on each interval),
    /// the natural choice for quantities spanning decades such as
    /// permeability versus porosity or viscosity versus temperature.
    /// Needs every y > 0.
    LogLinear,
}

/// A table validated once, then interpolated many times in O(log m) each
/// by binary search. x must be strictly increasing or strictly decreasing.
/// Points outside the table are errors, never extrapolated; a point equal
/// to a table x returns that row's y exactly.
#[derive(Debug, Clone, PartialEq)]
pub struct InterpolationTable {
    xs: Vec<f64>,
    ys: Vec<f64>,
    /// The quantity that is linear in x: ys itself, or ln(ys).
    linear_in_x: Vec<f64>,
    order: Order,
    interpolation: Interpolation,
}

impl InterpolationTable {
    /// Validates the table: equal lengths, at least 2 rows, finite values,
    /// strictly monotonic xs, and ys > 0 for [`Interpolation::LogLinear`].
    pub fn new(xs: &[f64], ys: &[f64], interpolation: Interpolation) -> Result<Self, ColumnError> {
        require_same_length("xs", xs, "ys", ys)?;
        require_rows("xs", xs, 2)?;
        check_column("xs", xs, None)?;
        let order = strict_order("xs", xs)?;
        let y_allowed = match interpolation {
            Interpolation::Linear => None,
            Interpolation::LogLinear => Some((
                Allowed::Positive,
                "log-linear interpolation takes the logarithm of y",
            )),
        };
        check_column("ys", ys, y_allowed)?;
        let linear_in_x = match interpolation {
            Interpolation::Linear => ys.to_vec(),
            Interpolation::LogLinear => ys.iter().map(|y| y.ln()).collect(),
        };
        Ok(InterpolationTable {
            xs: xs.to_vec(),
            ys: ys.to_vec(),
            linear_in_x,
            order,
            interpolation,
        })
    }

    /// The interpolation kind this table was built with.
    pub fn interpolation(&self) -> Interpolation {
        self.interpolation
    }

    /// Smallest and largest table x (whatever the table's order).
    pub fn range(&self) -> (f64, f64) {
        let first = self.xs.first().copied().unwrap_or(f64::NAN);
        let last = self.xs.last().copied().unwrap_or(f64::NAN);
        (first.min(last), first.max(last))
    }

    /// Interpolated y at `x`.
    pub fn at(&self, x: f64) -> Result<f64, ColumnError> {
        self.evaluate("x", None, x)
    }

    /// Interpolated y for every row of `queries`; an error names the first
    /// bad row of `queries`.
    pub fn at_each(&self, queries: &[f64]) -> Result<Vec<f64>, ColumnError> {
        queries
            .iter()
            .enumerate()
            .map(|(index, &x)| self.evaluate("x", Some(index + 1), x))
            .collect()
    }

    fn evaluate(
        &self,
        argument: &'static str,
        row: Option<usize>,
        x: f64,
    ) -> Result<f64, ColumnError> {
        check_value(argument, row, x, None)?;
        let (low, high) = self.range();
        let outside = ColumnError::OutsideTable {
            argument,
            row,
            value: x,
            low,
            high,
        };
        if x < low || x > high {
            return Err(outside);
        }
        // First row that is not before x in the table's own order.
        let upper = match self.order {
            Order::Increasing => self.xs.partition_point(|&table_x| table_x < x),
            Order::Decreasing => self.xs.partition_point(|&table_x| table_x > x),
        };
        let (Some(&x_upper), Some(&y_upper)) = (self.xs.get(upper), self.ys.get(upper)) else {
            return Err(outside);
        };
        if x_upper == x {
            return Ok(y_upper);
        }
        let lower = upper.wrapping_sub(1);
        let (Some(&x_lower), Some(&y_lower), Some(&v_lower), Some(&v_upper)) = (
            self.xs.get(lower),
            self.ys.get(lower),
            self.linear_in_x.get(lower),
            self.linear_in_x.get(upper),
        ) else {
            return Err(outside);
        };
        let fraction = interval_fraction(x_lower, x_upper, x);
        let value = lerp(v_lower, v_upper, fraction);
        let y = match self.interpolation {
            Interpolation::Linear => value,
            Interpolation::LogLinear => value.exp(),
        };
        // Interpolation never leaves the interval's y range; clamping keeps
        // the last rounding error from doing so.
        Ok(clamp_between(y, y_lower.min(y_upper), y_lower.max(y_upper)))
    }
}

/// Direction of a column that must be strictly monotonic, or the first row
/// breaking it.
fn strict_order(argument: &'static str, xs: &[f64]) -> Result<Order, ColumnError> {
    let mut order = None;
    for (index, pair) in xs.windows(2).enumerate() {
        let &[previous, value] = pair else {
            continue;
        };
        let step = if value > previous {
            Some(Order::Increasing)
        } else if value < previous {
            Some(Order::Decreasing)
        } else {
            None
        };
        match (order, step) {
            (None, Some(direction)) => order = Some(direction),
            (Some(expected), Some(direction)) if expected == direction => {}
            _ => {
                return Err(ColumnError::NotMonotonic {
                    argument,
                    row: index + 2,
                    value,
                    previous,
                    order,
                });
            }
        }
    }
    order.ok_or(ColumnError::TooFewRows {
        argument,
        rows: xs.len(),
        required: 2,
    })
}

/// Position of `x` in [x0, x1] as a fraction in [0, 1]; halves the operands
/// when x1 − x0 would overflow.
fn interval_fraction(x0: f64, x1: f64, x: f64) -> f64 {
    let width = x1 - x0;
    let fraction = if width.is_finite() {
        (x - x0) / width
    } else {
        (x * 0.5 - x0 * 0.5) / (x1 * 0.5 - x0 * 0.5)
    };
    clamp_between(fraction, 0.0, 1.0)
}

/// Straight-line interpolation between v0 (fraction 0) and v1 (fraction 1).
fn lerp(v0: f64, v1: f64, fraction: f64) -> f64 {
    let difference = v1 - v0;
    if difference.is_finite() {
        v0 + fraction * difference
    } else {
        v0 * (1.0 - fraction) + v1 * fraction
    }
}

/// Linear interpolation of the table (xs, ys) at `x`; validates the table on
/// every call, so build an [`InterpolationTable`] to interpolate many points.
pub fn interpolate_linear(xs: &[f64], ys: &[f64], x: f64) -> Result<f64, ColumnError> {
    InterpolationTable::new(xs, ys, Interpolation::Linear)?.at(x)
}

/// Log-linear interpolation (ln y linear in x) of the table (xs, ys) at `x`;
/// needs every y > 0. Validates the table on every call.
pub fn interpolate_log(xs: &[f64], ys: &[f64], x: f64) -> Result<f64, ColumnError> {
    InterpolationTable::new(xs, ys, Interpolation::LogLinear)?.at(x)
}

// ---------------------------------------------------------------------------
// Root finding
// ---------------------------------------------------------------------------

/// A root found by [`brent`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Root {
    /// The root estimate.
    pub x: f64,
    /// Number of evaluations of the function, including the two at the
    /// bracket ends.
    pub iterations: u32,
    /// The function's value at `x` (signed; 0 for an exact root).
    pub residual: f64,
    /// Why the search stopped, which says how well `x` is known.
    pub convergence: Convergence,
}

/// What the x returned by [`brent`] is known to satisfy.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Convergence {
    /// The function is exactly 0 at x.
    Exact,
    /// |f(x)| is within [`Tolerance::residual`]: closer to zero than the
    /// caller can tell apart, so narrowing the bracket further would chase
    /// rounding noise.
    Residual,
    /// The sign change lies in an interval of this width that holds x.
    Bracket { width: f64 },
}

/// When [`brent`] may stop.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Tolerance {
    /// Absolute, in units of x: the search stops once the sign change is
    /// known within about `x` + 4·ε·|x| (ε = `f64::EPSILON`). 0 asks for
    /// full 64-bit precision relative to the root.
    pub x: f64,
    /// Absolute, in units of f: a sample with |f| at or below it is taken
    /// as the root. 0 accepts only an exact zero.
    pub residual: f64,
}

impl Tolerance {
    /// A tolerance on x alone.
    pub fn x(x: f64) -> Tolerance {
        Tolerance { x, residual: 0.0 }
    }
}

/// Why [`brent`] found no root.
#[derive(Debug, Clone, PartialEq)]
pub enum SolveError<E> {
    /// The bracket ends are not finite, or are equal.
    BadBracket { lower: f64, upper: f64 },
    /// A tolerance is negative, NaN or infinite.
    BadTolerance { tolerance: Tolerance },
    /// The function has the same sign at both ends, so the bracket is not
    /// known to hold a root.
    NoSignChange {
        lower: f64,
        upper: f64,
        f_lower: f64,
        f_upper: f64,
    },
    /// The function returned NaN, or ±infinity at a bracket end.
    NotFinite { x: f64, value: f64 },
    /// The sign change is a jump (a pole or a step), not a root: see
    /// [`brent`] for the criterion. `f_left` and `f_right` are the values at
    /// the smaller and larger x of the final bracket around `near`.
    Discontinuous {
        near: f64,
        f_left: f64,
        f_right: f64,
    },
    /// The evaluation budget ran out; the sign change lies in [lower, upper].
    NotConverged {
        iterations: u32,
        lower: f64,
        upper: f64,
    },
    /// The function itself reported an error.
    Function(E),
}

impl<E: fmt::Display> fmt::Display for SolveError<E> {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            SolveError::BadBracket { lower, upper } => write!(
                f,
                "the bracket [{}, {}] cannot be searched: both ends must be finite and different",
                Number(*lower),
                Number(*upper)
            ),
            SolveError::BadTolerance { tolerance } => write!(
                f,
                "the tolerances (x {}, residual {}) cannot be used: each must be a finite \
                 number, 0 or greater",
                Number(tolerance.x),
                Number(tolerance.residual)
            ),
            SolveError::NoSignChange {
                lower,
                upper,
                f_lower,
                f_upper,
            } => write!(
                f,
                "the function has the same sign at both ends of the bracket \
                 (f({}) = {}, f({}) = {}), so the bracket is not known to hold a root: \
                 choose ends where the function has opposite signs",
                Number(*lower),
                Number(*f_lower),
                Number(*upper),
                Number(*f_upper)
            ),
            SolveError::NotFinite { x, value } => write!(
                f,
                "the function returned {} at x = {}, where a finite number is needed",
                Number(*value),
                Number(*x)
            ),
            SolveError::Discontinuous {
                near,
                f_left,
                f_right,
            } => write!(
                f,
                "the function jumps from {} to {} near x = {} without passing through zero: \
                 this is a discontinuity (such as a pole or a step), not a root",
                Number(*f_left),
                Number(*f_right),
                Number(*near)
            ),
            SolveError::NotConverged {
                iterations,
                lower,
                upper,
            } => write!(
                f,
                "no root found within {iterations} evaluations of the function; the sign change \
                 lies between {} and {}: allow more iterations or a larger tolerance",
                Number(*lower),
                Number(*upper)
            ),
            SolveError::Function(error) => {
                write!(f, "the function could not be evaluated: {error}")
            }
        }
    }
}

impl<E: std::error::Error + 'static> std::error::Error for SolveError<E> {
    fn source(&self) -> Option<&(dyn std::error::Error + 'static)> {
        match self {
            SolveError::Function(error) => Some(error),
            _ => None,
        }
    }
}

/// A budget for [`brent`] that brackets of practical size meet. Brent
/// (1973, ch. 4) shows the method never needs more than about the square of
/// the number of bisections, log2(width / tolerance) (from memory); smooth
/// functions need far fewer, typically 5-15. The value itself is common
/// practice, no single source.
pub const DEFAULT_MAX_ITERATIONS: u32 = 200;

/// The sign change is accepted as a root only if the jump |f(left)| +
/// |f(right)| across the final bracket is at most this fraction of the
/// largest finite |f| seen. Chosen so that a continuous function needs a
/// slope of about 1e-3·scale per float spacing before it is called
/// discontinuous (common practice, no single source).
const JUMP_FRACTION: f64 = 1e-3;

/// Extra bisections allowed to decide whether a suspect sign change is a
/// jump; 100 halvings shrink any bracket by 2^100 ≈ 1e30.
const JUMP_CHECK_EVALUATIONS: u32 = 100;

#[derive(Debug, Clone, Copy)]
struct Sample {
    x: f64,
    fx: f64,
}

fn same_sign(a: f64, b: f64) -> bool {
    (a > 0.0 && b > 0.0) || (a < 0.0 && b < 0.0)
}

/// Counts evaluations and keeps the largest finite |f| seen, the scale
/// against which a jump is judged.
struct Evaluator<F> {
    function: F,
    evaluations: u32,
    largest_magnitude: f64,
}

impl<F, E> Evaluator<F>
where
    F: FnMut(f64) -> Result<f64, E>,
{
    fn sample(&mut self, x: f64) -> Result<Sample, SolveError<E>> {
        self.evaluations = self.evaluations.saturating_add(1);
        let fx = (self.function)(x).map_err(SolveError::Function)?;
        if fx.is_nan() {
            return Err(SolveError::NotFinite { x, value: fx });
        }
        if fx.is_finite() {
            self.largest_magnitude = self.largest_magnitude.max(fx.abs());
        }
        Ok(Sample { x, fx })
    }

    /// A bracket end must give a finite value: an infinite one usually
    /// means the end sits on a pole, and the search needs finite ends to
    /// interpolate from and to judge jumps against.
    fn sample_end(&mut self, x: f64) -> Result<Sample, SolveError<E>> {
        let end = self.sample(x)?;
        if end.fx.is_finite() {
            Ok(end)
        } else {
            Err(SolveError::NotFinite { x, value: end.fx })
        }
    }

    fn root(&self, at: Sample, convergence: Convergence) -> Root {
        Root {
            x: at.x,
            iterations: self.evaluations,
            residual: at.fx,
            convergence,
        }
    }
}

/// Whether a sample is a root by its value alone: exactly zero, or within
/// the residual tolerance.
fn root_by_value(at: Sample, residual_tolerance: f64) -> Option<Convergence> {
    if at.fx == 0.0 {
        Some(Convergence::Exact)
    } else if at.fx.abs() <= residual_tolerance {
        Some(Convergence::Residual)
    } else {
        None
    }
}

/// Finds a root of `f` in [lower, upper] by Brent's method: Brent (1973),
/// "Algorithms for Minimization without Derivatives", Prentice-Hall, ch. 4
/// (also in Forsythe, Malcolm & Moler 1977, "Computer Methods for
/// Mathematical Computations"; both from memory). Each step tries inverse
/// quadratic or secant interpolation and falls back to bisection whenever
/// interpolation would converge slower than bisection, so convergence is
/// guaranteed for any sign change and superlinear near a simple root.
///
/// * `f` must have opposite signs at the two ends (either order of ends is
///   accepted); an exact zero at an end is returned at once, and so is a
///   value within the residual tolerance.
/// * `tolerance.x` is absolute, in units of x: the returned x lies within
///   about `tolerance.x` + 4·ε·|x| of the sign change (ε = `f64::EPSILON`).
///   0 asks for full 64-bit precision relative to the root, which a bracket
///   spanning many decades reaches too; note that a root at or near 0 with
///   `tolerance.x` 0 may need many evaluations. `tolerance.residual` stops
///   the search at any x where |f| is that small ([`Convergence`] says
///   which test stopped it).
/// * `max_iterations` bounds the number of evaluations of `f` (both ends
///   included, and always made) in the search; [`DEFAULT_MAX_ITERATIONS`]
///   suits most uses.
///   Deciding whether a suspect sign change is a jump (below) may add up to
///   100 evaluations. [`Root::iterations`] reports all evaluations made.
///
/// **Discontinuities.** A sign change can be a jump rather than a root, as
/// in 1/(x − 1) across x = 1 or a step function. When the bracket has shrunk
/// to tolerance, the jump |f(left)| + |f(right)| across it is compared with
/// the largest finite |f| seen during the search. A continuous function
/// makes the jump vanish with the bracket; if it is still more than 1e-3 of
/// that scale, the bracket is bisected further, up to adjacent floats (at
/// most 100 more evaluations). If the jump becomes small the root is
/// accepted (the function was merely steep); otherwise
/// [`SolveError::Discontinuous`] is returned. So a "root" is never reported
/// where |f| stays large. Jumps smaller than 1e-3 of the largest |f| seen
/// are not distinguished from roots; check [`Root::residual`] if that
/// matters.
///
/// **Non-finite values.** NaN from `f` is always an error, and so is ±inf at
/// a bracket end. Inside the bracket ±inf is kept as a value of that sign
/// (with bisection instead of interpolation), because that is what a pole
/// evaluated exactly yields (1/0 = +inf), and the search then reports the
/// pole as a discontinuity rather than stopping with a less helpful error.
pub fn brent<E>(
    f: impl FnMut(f64) -> Result<f64, E>,
    lower: f64,
    upper: f64,
    tolerance: Tolerance,
    max_iterations: u32,
) -> Result<Root, SolveError<E>> {
    if !lower.is_finite() || !upper.is_finite() || lower == upper {
        return Err(SolveError::BadBracket { lower, upper });
    }
    let usable = |value: f64| value.is_finite() && value >= 0.0;
    if !usable(tolerance.x) || !usable(tolerance.residual) {
        return Err(SolveError::BadTolerance { tolerance });
    }
    let mut evaluator = Evaluator {
        function: f,
        evaluations: 0,
        largest_magnitude: 0.0,
    };
    let low_end = evaluator.sample_end(lower)?;
    if let Some(convergence) = root_by_value(low_end, tolerance.residual) {
        return Ok(evaluator.root(low_end, convergence));
    }
    let high_end = evaluator.sample_end(upper)?;
    if let Some(convergence) = root_by_value(high_end, tolerance.residual) {
        return Ok(evaluator.root(high_end, convergence));
    }
    if same_sign(low_end.fx, high_end.fx) {
        return Err(SolveError::NoSignChange {
            lower,
            upper,
            f_lower: low_end.fx,
            f_upper: high_end.fx,
        });
    }
    match search(&mut evaluator, low_end, high_end, tolerance, max_iterations)? {
        SearchEnd::Root(at, convergence) => Ok(evaluator.root(at, convergence)),
        SearchEnd::Bracket { best, contra } => {
            settle(&mut evaluator, best, contra, tolerance.residual)
        }
    }
}

enum SearchEnd {
    /// f is zero here, exactly or within the residual tolerance.
    Root(Sample, Convergence),
    /// The sign change lies between `best` (smaller |f|) and `contra`,
    /// within tolerance.
    Bracket { best: Sample, contra: Sample },
}

/// The main loop of Brent's zero finder.
///
/// Invariants: f(best) and f(contra) have opposite signs, |f(best)| <=
/// |f(contra)|; `previous` is the iterate before `best`. `step` is the
/// latest correction and `step_before` the one before it: an interpolated
/// step is accepted only if it lies well inside the bracket and is under half
/// of `step_before`, which guarantees at least bisection-like progress every
/// two steps (Brent 1973, ch. 4).
fn search<F, E>(
    evaluator: &mut Evaluator<F>,
    low_end: Sample,
    high_end: Sample,
    tolerances: Tolerance,
    max_iterations: u32,
) -> Result<SearchEnd, SolveError<E>>
where
    F: FnMut(f64) -> Result<f64, E>,
{
    let mut previous = low_end;
    let mut best = high_end;
    let mut contra = low_end;
    let mut step = best.x - previous.x;
    let mut step_before = step;
    loop {
        if same_sign(best.fx, contra.fx) {
            // The latest iterate landed on the contrapoint's side: the sign
            // change now lies between it and the iterate before it.
            contra = previous;
            step = best.x - previous.x;
            step_before = step;
        }
        if contra.fx.abs() < best.fx.abs() {
            previous = best;
            best = contra;
            contra = previous;
        }
        // Brent's tolerance: the requested absolute part plus a relative
        // part of a few rounding errors, with a floor so steps never vanish.
        let tolerance =
            (2.0 * f64::EPSILON * best.x.abs() + 0.5 * tolerances.x).max(f64::MIN_POSITIVE);
        let to_midpoint = 0.5 * (contra.x - best.x);
        if to_midpoint.abs() <= tolerance {
            return Ok(SearchEnd::Bracket { best, contra });
        }
        if evaluator.evaluations >= max_iterations {
            return Err(SolveError::NotConverged {
                iterations: evaluator.evaluations,
                lower: best.x.min(contra.x),
                upper: best.x.max(contra.x),
            });
        }
        let interpolated = if step_before.abs() >= tolerance
            && previous.fx.abs() > best.fx.abs()
            && [previous.fx, best.fx, contra.fx]
                .iter()
                .all(|v| v.is_finite())
        {
            interpolation_step(previous, best, contra, to_midpoint)
                .filter(|&(p, q)| {
                    2.0 * p < 3.0 * to_midpoint * q - (tolerance * q).abs()
                        && p < (0.5 * step_before * q).abs()
                })
                .map(|(p, q)| p / q)
                .filter(|candidate| candidate.is_finite())
        } else {
            None
        };
        match interpolated {
            Some(correction) => {
                step_before = step;
                step = correction;
            }
            None => {
                step = to_midpoint;
                step_before = step;
            }
        }
        previous = best;
        let correction = if step.abs() > tolerance {
            step
        } else {
            tolerance.copysign(to_midpoint)
        };
        best = evaluator.sample(best.x + correction)?;
        if let Some(convergence) = root_by_value(best, tolerances.residual) {
            return Ok(SearchEnd::Root(best, convergence));
        }
    }
}

/// The interpolated correction to `best` as a fraction p/q with p >= 0:
/// inverse quadratic interpolation through the three samples when they are
/// distinct, otherwise the secant through `previous` and `best`
/// (Brent 1973, ch. 4). `None` if the arithmetic fails.
fn interpolation_step(
    previous: Sample,
    best: Sample,
    contra: Sample,
    to_midpoint: f64,
) -> Option<(f64, f64)> {
    let s = best.fx / previous.fx;
    let (p, q) = if previous.x == contra.x {
        (2.0 * to_midpoint * s, 1.0 - s)
    } else {
        let q = previous.fx / contra.fx;
        let r = best.fx / contra.fx;
        (
            s * (2.0 * to_midpoint * q * (q - r) - (best.x - previous.x) * (r - 1.0)),
            (q - 1.0) * (r - 1.0) * (s - 1.0),
        )
    };
    // Fold the sign into q so that p >= 0, as the acceptance test expects.
    let (p, q) = if p > 0.0 { (p, -q) } else { (-p, q) };
    (p.is_finite() && q.is_finite()).then_some((p, q))
}

/// Accepts the converged bracket as a root if the jump across it is small;
/// otherwise bisects further to tell a steep root from a discontinuity.
fn settle<F, E>(
    evaluator: &mut Evaluator<F>,
    best: Sample,
    contra: Sample,
    residual_tolerance: f64,
) -> Result<Root, SolveError<E>>
where
    F: FnMut(f64) -> Result<f64, E>,
{
    let (mut left, mut right) = if best.x < contra.x {
        (best, contra)
    } else {
        (contra, best)
    };
    let jump_is_small = |left: Sample, right: Sample, scale: f64| {
        let jump = left.fx.abs() + right.fx.abs();
        jump.is_finite() && jump <= JUMP_FRACTION * scale
    };
    // The end with the smaller |f|, and the bracket's width.
    let bracketed = |left: Sample, right: Sample| {
        let best = if right.fx.abs() < left.fx.abs() {
            right
        } else {
            left
        };
        let width = right.x - left.x;
        (best, Convergence::Bracket { width })
    };
    for _ in 0..JUMP_CHECK_EVALUATIONS {
        if jump_is_small(left, right, evaluator.largest_magnitude) {
            let (best, convergence) = bracketed(left, right);
            return Ok(evaluator.root(best, convergence));
        }
        let middle = 0.5 * left.x + 0.5 * right.x;
        if middle <= left.x || middle >= right.x {
            break; // adjacent floats: the bracket cannot shrink further
        }
        let sample = evaluator.sample(middle)?;
        if let Some(convergence) = root_by_value(sample, residual_tolerance) {
            return Ok(evaluator.root(sample, convergence));
        }
        if same_sign(sample.fx, left.fx) {
            left = sample;
        } else {
            right = sample;
        }
    }
    if jump_is_small(left, right, evaluator.largest_magnitude) {
        let (best, convergence) = bracketed(left, right);
        return Ok(evaluator.root(best, convergence));
    }
    Err(SolveError::Discontinuous {
        near: 0.5 * left.x + 0.5 * right.x,
        f_left: left.fx,
        f_right: right.fx,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::convert::Infallible;
    use std::f64::consts::PI;

    fn close(actual: f64, expected: f64, relative: f64) -> bool {
        (actual - expected).abs() <= relative * expected.abs()
    }

    fn ok(value: f64) -> Result<f64, Infallible> {
        Ok(value)
    }

    /// Deterministic pseudo-random numbers in [0, 1) (a 64-bit LCG with
    /// Knuth's MMIX constants, from memory); quality is irrelevant here.
    struct Lcg(u64);

    impl Lcg {
        fn next(&mut self) -> f64 {
            self.0 = self
                .0
                .wrapping_mul(6_364_136_223_846_793_005)
                .wrapping_add(1_442_695_040_888_963_407);
            (self.0 >> 11) as f64 / (1u64 << 53) as f64
        }
    }

    // ----- aggregates -----

    #[test]
    fn aggregates_of_a_hand_set() {
        // Hand computation for 2, 8, 4, 1:
        // sum 15; mean 15/4 = 3.75; geometric (2·8·4·1)^(1/4) = 64^(1/4) = 2√2;
        // harmonic 4 / (1/2 + 1/8 + 1/4 + 1) = 4 / 1.875 = 32/15.
        let values = [2.0, 8.0, 4.0, 1.0];
        assert_eq!(sum(&values), Ok(15.0));
        assert_eq!(mean(&values), Ok(3.75));
        assert!(close(
            geometric_mean(&values).unwrap(),
            2.0 * 2f64.sqrt(),
            1e-15
        ));
        assert!(close(harmonic_mean(&values).unwrap(), 32.0 / 15.0, 1e-15));
        assert_eq!(minimum(&values), Ok((1.0, 4)));
        assert_eq!(maximum(&values), Ok((8.0, 2)));
    }

    #[test]
    fn extremes_report_the_first_row_of_a_tie() {
        let values = [3.0, -1.0, 7.0, -1.0, 7.0];
        assert_eq!(minimum(&values), Ok((-1.0, 2)));
        assert_eq!(maximum(&values), Ok((7.0, 3)));
    }

    #[test]
    fn aggregates_reject_empty_and_non_finite_columns() {
        let empty = ColumnError::Empty { argument: "values" };
        assert_eq!(sum(&[]), Err(empty.clone()));
        assert_eq!(mean(&[]), Err(empty.clone()));
        assert_eq!(geometric_mean(&[]), Err(empty.clone()));
        assert_eq!(harmonic_mean(&[]), Err(empty.clone()));
        assert_eq!(minimum(&[]), Err(empty.clone()));
        assert_eq!(maximum(&[]), Err(empty));
        match mean(&[1.0, 2.0, f64::NAN]) {
            Err(ColumnError::NotFinite { row: Some(3), .. }) => {}
            other => panic!("expected NaN in row 3, got {other:?}"),
        }
        assert!(matches!(
            sum(&[f64::INFINITY]),
            Err(ColumnError::NotFinite { row: Some(1), .. })
        ));
    }

    #[test]
    fn geometric_and_harmonic_means_need_positive_values() {
        let error = geometric_mean(&[1.0, 0.0, 3.0]).unwrap_err();
        assert!(matches!(
            error,
            ColumnError::OutOfRange {
                row: Some(2),
                allowed: Allowed::Positive,
                ..
            }
        ));
        assert_eq!(
            error.to_string(),
            "row 2 of `values` is 0.0, but it must be greater than 0 \
             (the geometric mean takes the logarithm of every value)"
        );
        assert!(matches!(
            harmonic_mean(&[1.0, 2.0, -3.0]),
            Err(ColumnError::OutOfRange { row: Some(3), .. })
        ));
    }

    #[test]
    fn compensated_sum_keeps_small_terms_next_to_huge_ones() {
        // Exact sum is 2 (1 + 1, the ±1e100 cancel); plain left-to-right
        // summation gives 0, and so does Kahan's original variant.
        assert_eq!(sum(&[1.0, 1e100, 1.0, -1e100]), Ok(2.0));
    }

    #[test]
    fn a_million_rows_sum_accurately() {
        // One million copies of fl(0.1) = 0.1000000000000000055511...: the
        // exact sum 100000.0000000000055511... rounds to 100000.0 (closed form).
        let values = vec![0.1; 1_000_000];
        let compensated = sum(&values).unwrap();
        let naive: f64 = values.iter().sum();
        assert!((compensated - 100_000.0).abs() < 1e-10, "{compensated}");
        assert!(
            (naive - 100_000.0).abs() > 1e-7,
            "plain summation drifts: {naive}"
        );

        // Telescoping series: Σ_{i=1}^{n} 1/(i(i+1)) = 1 − 1/(n+1) (closed form);
        // rounding each term changes the total by far less than 1e-16.
        let n = 1_000_000u32;
        let terms: Vec<f64> = (1..=n)
            .map(|i| 1.0 / (f64::from(i) * (f64::from(i) + 1.0)))
            .collect();
        let expected = 1.0 - 1.0 / (f64::from(n) + 1.0);
        assert!((sum(&terms).unwrap() - expected).abs() <= 2.0 * f64::EPSILON);
    }

    #[test]
    fn overflowing_sum_is_an_error_but_the_mean_is_not() {
        let huge = [f64::MAX, f64::MAX, f64::MAX];
        assert_eq!(
            sum(&huge),
            Err(ColumnError::Overflow { argument: "values" })
        );
        // Only a partial sum overflows here; the total MAX fits.
        assert_eq!(sum(&[f64::MAX, f64::MAX, -f64::MAX]), Ok(f64::MAX));
        assert_eq!(mean(&huge), Ok(f64::MAX));
        assert_eq!(geometric_mean(&huge), Ok(f64::MAX));
        assert_eq!(harmonic_mean(&huge), Ok(f64::MAX));
    }

    #[test]
    fn harmonic_mean_of_tiny_values_does_not_overflow() {
        // 1/1e-310 overflows to infinity; the scaled form does not.
        assert_eq!(harmonic_mean(&[1e-310, 1e-310]), Ok(1e-310));
        assert_eq!(geometric_mean(&[1e-310, 1e-310]), Ok(1e-310));
    }

    #[test]
    fn geometric_mean_of_a_log_normal_sample() {
        // ln K_i = μ + σ z_i with z_i = ±0.1, ±0.2, ..., ±3.0: the sample mean
        // of ln K is exactly μ, so the geometric mean is e^μ (closed form).
        // μ = ln 3e-5 (a hydraulic conductivity in m/s), σ = 1.2.
        let mu = 3e-5f64.ln();
        let sigma = 1.2;
        let sample: Vec<f64> = (1..=30)
            .flat_map(|k| {
                let z = f64::from(k) / 10.0;
                [(mu + sigma * z).exp(), (mu - sigma * z).exp()]
            })
            .collect();
        let geometric = geometric_mean(&sample).unwrap();
        assert!(close(geometric, 3e-5, 1e-13), "{geometric}");
        // HM <= GM <= AM for positive values (Hardy, Littlewood & Pólya 1934,
        // "Inequalities", from memory), strictly when the values differ.
        let harmonic = harmonic_mean(&sample).unwrap();
        let arithmetic = mean(&sample).unwrap();
        assert!(harmonic < geometric && geometric < arithmetic);
    }

    #[test]
    fn mean_inequality_holds_on_random_columns() {
        let mut random = Lcg(7);
        for _ in 0..200 {
            let rows = 1 + (random.next() * 20.0) as usize;
            let values: Vec<f64> = (0..rows)
                .map(|_| 10f64.powf(12.0 * random.next() - 6.0))
                .collect();
            let harmonic = harmonic_mean(&values).unwrap();
            let geometric = geometric_mean(&values).unwrap();
            let arithmetic = mean(&values).unwrap();
            assert!(
                harmonic <= geometric && geometric <= arithmetic,
                "{values:?}"
            );
        }
    }

    // ----- layered media -----

    #[test]
    fn two_layer_textbook_exercise() {
        // Problem stated in The Groundwater Project, "Introduction to Karst
        // Aquifers", Exercise 5 (formulas after Bouwer 1978): two layers, each
        // 10 m thick, K = 1000 m/d and 1 m/d. The expected values are our own
        // arithmetic (the book's solution was not consulted):
        // along = (1000·10 + 1·10) / 20 = 500.5 m/d;
        // across = 20 / (10/1000 + 10/1) = 20 / 10.01 = 1.998001998... m/d.
        let coefficient = [1000.0, 1.0];
        let thickness = [10.0, 10.0];
        assert!(close(
            layered_along(&coefficient, &thickness).unwrap(),
            500.5,
            1e-15
        ));
        assert!(close(
            layered_across(&coefficient, &thickness).unwrap(),
            20.0 / 10.01,
            1e-15
        ));
    }

    #[test]
    fn three_layer_hand_example() {
        // K = 10, 0.1, 1 m/d; b = 2, 1, 5 m; total 8 m (hand computation):
        // along = (10·2 + 0.1·1 + 1·5) / 8 = 25.1 / 8 = 3.1375 m/d;
        // across = 8 / (2/10 + 1/0.1 + 5/1) = 8 / 15.2 = 10/19 m/d.
        let coefficient = [10.0, 0.1, 1.0];
        let thickness = [2.0, 1.0, 5.0];
        assert!(close(
            layered_along(&coefficient, &thickness).unwrap(),
            3.1375,
            1e-15
        ));
        assert!(close(
            layered_across(&coefficient, &thickness).unwrap(),
            10.0 / 19.0,
            1e-15
        ));
    }

    #[test]
    fn equal_layers_give_their_own_value() {
        let coefficient = [2.5e-5; 4];
        let thickness = [0.3, 7.0, 1.1, 12.0];
        assert_eq!(layered_along(&coefficient, &thickness), Ok(2.5e-5));
        assert_eq!(layered_across(&coefficient, &thickness), Ok(2.5e-5));
    }

    #[test]
    fn along_is_never_below_across() {
        // Weighted AM >= weighted HM (Hardy, Littlewood & Pólya, from memory).
        let mut random = Lcg(42);
        for _ in 0..500 {
            let layers = 1 + (random.next() * 8.0) as usize;
            let coefficient: Vec<f64> = (0..layers)
                .map(|_| 10f64.powf(-12.0 + 10.0 * random.next()))
                .collect();
            let thickness: Vec<f64> = (0..layers).map(|_| 0.01 + 50.0 * random.next()).collect();
            let along = layered_along(&coefficient, &thickness).unwrap();
            let across = layered_across(&coefficient, &thickness).unwrap();
            assert!(along >= across, "{coefficient:?} {thickness:?}");
        }
    }

    #[test]
    fn one_tight_layer_dominates_flow_across() {
        // Two 10 m sands (1e-4 m/s) and a 0.1 m clay (1e-11 m/s). Closed form:
        // across = 20.1 / (1e5 + 1e5 + 1e10) ≈ 2.00996e-9 m/s, close to the
        // clay-only estimate 1e-11 · 20.1 / 0.1 = 2.01e-9; along stays near
        // the sands' 1e-4 · 20 / 20.1.
        let coefficient = [1e-4, 1e-4, 1e-11];
        let thickness = [10.0, 10.0, 0.1];
        let across = layered_across(&coefficient, &thickness).unwrap();
        let along = layered_along(&coefficient, &thickness).unwrap();
        assert!(close(across, 20.1 / (1e5 + 1e5 + 1e10), 1e-14));
        assert!(close(across, 2.01e-9, 1e-4));
        assert!(close(along, 1e-4 * 20.0 / 20.1, 1e-6));
    }

    #[test]
    fn layer_inputs_are_validated() {
        assert_eq!(
            layered_along(&[1.0, 2.0, 3.0], &[1.0, 2.0]),
            Err(ColumnError::LengthMismatch {
                first: "coefficient",
                first_rows: 3,
                second: "thickness",
                second_rows: 2,
            })
        );
        assert_eq!(
            layered_across(&[], &[]),
            Err(ColumnError::Empty {
                argument: "coefficient"
            })
        );
        let zero_thickness = layered_along(&[1.0, 2.0], &[1.0, 0.0]).unwrap_err();
        assert_eq!(
            zero_thickness.to_string(),
            "row 2 of `thickness` is 0.0, but it must be greater than 0 \
             (every layer needs a positive thickness)"
        );
        // A zero coefficient is fine along the layers, fatal across them.
        assert_eq!(layered_along(&[0.0, 2.0], &[1.0, 1.0]), Ok(1.0));
        assert!(matches!(
            layered_across(&[0.0, 2.0], &[1.0, 1.0]),
            Err(ColumnError::OutOfRange {
                argument: "coefficient",
                row: Some(1),
                allowed: Allowed::Positive,
                ..
            })
        ));
        assert!(matches!(
            layered_along(&[1.0, -2.0], &[1.0, 1.0]),
            Err(ColumnError::OutOfRange {
                row: Some(2),
                allowed: Allowed::NonNegative,
                ..
            })
        ));
        assert!(matches!(
            layered_across(&[1.0, 2.0], &[1.0, f64::NAN]),
            Err(ColumnError::NotFinite {
                argument: "thickness",
                row: Some(2),
                ..
            })
        ));
    }

    #[test]
    fn extreme_layer_values_stay_accurate() {
        // Closed forms. K·b overflows: along = (MAX·MAX + MAX/2·MAX) / 2MAX.
        let along = layered_along(&[f64::MAX, f64::MAX / 2.0], &[f64::MAX, f64::MAX]).unwrap();
        assert!(close(along, 0.75 * f64::MAX, 1e-12), "{along}");
        // K·b underflows: along = (1e-200 + 3e-200)·1e-200 / 2e-200 = 2e-200.
        let along = layered_along(&[1e-200, 3e-200], &[1e-200, 1e-200]).unwrap();
        assert!(close(along, 2e-200, 1e-12), "{along}");
        // b/K overflows: across = 2e200 / (1e400 + 0.25e400) = 1.6e-200.
        let across = layered_across(&[1e-200, 4e-200], &[1e200, 1e200]).unwrap();
        assert!(close(across, 1.6e-200, 1e-12), "{across}");
        // Direct path: Σb / Σ(b/K) = (1e300 + 1e-300) / (1 + 1) = 5e299.
        let across = layered_across(&[1e-300, 1e300], &[1e-300, 1e300]).unwrap();
        assert!(close(across, 5e299, 1e-15), "{across}");
    }

    // ----- interpolation -----

    #[test]
    fn linear_interpolation_is_exact_on_a_line() {
        // y = 3x − 2 (closed form).
        let xs = [0.0, 1.5, 4.0, 10.0];
        let ys: Vec<f64> = xs.iter().map(|x| 3.0 * x - 2.0).collect();
        for x in [0.0, 0.2, 1.0, 1.5, 2.75, 3.999, 7.0, 9.5, 10.0] {
            let y = interpolate_linear(&xs, &ys, x).unwrap();
            assert!((y - (3.0 * x - 2.0)).abs() <= 1e-14 * 30.0, "x = {x}: {y}");
        }
    }

    #[test]
    fn log_linear_interpolation_is_exact_on_an_exponential() {
        // y = 2.5·e^(−0.7x) (closed form); also a table spanning 12 decades.
        let xs = [0.0, 1.0, 2.0, 5.0, 9.0];
        let curve = |x: f64| 2.5 * (-0.7 * x).exp();
        let ys: Vec<f64> = xs.iter().map(|&x| curve(x)).collect();
        for x in [0.0, 0.5, 1.25, 3.0, 4.9, 8.0, 9.0] {
            let y = interpolate_log(&xs, &ys, x).unwrap();
            assert!(close(y, curve(x), 1e-14), "x = {x}: {y}");
        }
        let decades = interpolate_log(&[0.0, 12.0], &[1e-14, 1e-2], 3.0).unwrap();
        assert!(close(decades, 1e-11, 1e-13));
        // Linear interpolation of the same two rows would give ~3e-3.
        let linear = interpolate_linear(&[0.0, 12.0], &[1e-14, 1e-2], 3.0).unwrap();
        assert!(close(linear, 0.25 * 1e-2, 1e-10));
    }

    #[test]
    fn table_rows_are_returned_exactly() {
        let xs = [0.1, 0.7, 1.3, 2.9];
        let ys = [1e-3, 0.37, 12.0, 5e4];
        for kind in [Interpolation::Linear, Interpolation::LogLinear] {
            let increasing = InterpolationTable::new(&xs, &ys, kind).unwrap();
            let reversed_xs: Vec<f64> = xs.iter().rev().copied().collect();
            let reversed_ys: Vec<f64> = ys.iter().rev().copied().collect();
            let decreasing = InterpolationTable::new(&reversed_xs, &reversed_ys, kind).unwrap();
            for (&x, &y) in xs.iter().zip(&ys) {
                assert_eq!(increasing.at(x), Ok(y));
                assert_eq!(decreasing.at(x), Ok(y));
            }
        }
    }

    #[test]
    fn decreasing_tables_interpolate() {
        // Hand values: halfway between (10, 0) and (5, 1) is (7.5, 0.5).
        let xs = [10.0, 5.0, 0.0];
        let ys = [0.0, 1.0, 4.0];
        assert_eq!(interpolate_linear(&xs, &ys, 7.5), Ok(0.5));
        assert_eq!(interpolate_linear(&xs, &ys, 2.5), Ok(2.5));
        // ln y linear: halfway between y = 1 and y = 4 is √(1·4) = 2.
        assert!(close(
            interpolate_log(&[10.0, 5.0, 0.0], &[8.0, 1.0, 4.0], 2.5).unwrap(),
            2.0,
            1e-15
        ));
        let table = InterpolationTable::new(&xs, &ys, Interpolation::Linear).unwrap();
        assert_eq!(table.range(), (0.0, 10.0));
    }

    #[test]
    fn points_outside_the_table_are_errors() {
        let xs = [0.0, 4.0, 10.0];
        let ys = [1.0, 2.0, 3.0];
        let error = interpolate_linear(&xs, &ys, 10.5).unwrap_err();
        assert_eq!(
            error,
            ColumnError::OutsideTable {
                argument: "x",
                row: None,
                value: 10.5,
                low: 0.0,
                high: 10.0,
            }
        );
        assert_eq!(
            error.to_string(),
            "`x` is 10.5, outside the table's range [0.0, 10.0]; tables are not extrapolated"
        );
        assert!(matches!(
            interpolate_log(&[10.0, 0.0], &[1.0, 2.0], -1e-9),
            Err(ColumnError::OutsideTable {
                low: 0.0,
                high: 10.0,
                ..
            })
        ));
        assert!(matches!(
            interpolate_linear(&xs, &ys, f64::NAN),
            Err(ColumnError::NotFinite { argument: "x", .. })
        ));
    }

    #[test]
    fn non_monotonic_x_names_the_first_bad_row() {
        let error = interpolate_linear(&[0.0, 1.0, 3.0, 2.0, 5.0], &[0.0; 5], 0.5).unwrap_err();
        assert_eq!(
            error,
            ColumnError::NotMonotonic {
                argument: "xs",
                row: 4,
                value: 2.0,
                previous: 3.0,
                order: Some(Order::Increasing),
            }
        );
        assert_eq!(
            error.to_string(),
            "row 4 of `xs` is 2.0 after 3.0 in row 3, but the column is increasing from its \
             first two rows: table x values must be strictly increasing or strictly \
             decreasing, with no repeats"
        );
        assert!(matches!(
            interpolate_linear(&[1.0, 1.0, 2.0], &[0.0; 3], 1.5),
            Err(ColumnError::NotMonotonic {
                row: 2,
                order: None,
                ..
            })
        ));
        assert!(matches!(
            interpolate_linear(&[3.0, 2.0, 2.0], &[0.0; 3], 2.5),
            Err(ColumnError::NotMonotonic {
                row: 3,
                order: Some(Order::Decreasing),
                ..
            })
        ));
    }

    #[test]
    fn table_shape_is_validated() {
        assert_eq!(
            interpolate_linear(&[1.0], &[2.0], 1.0),
            Err(ColumnError::TooFewRows {
                argument: "xs",
                rows: 1,
                required: 2
            })
        );
        assert_eq!(
            interpolate_linear(&[1.0, 2.0], &[2.0], 1.0),
            Err(ColumnError::LengthMismatch {
                first: "xs",
                first_rows: 2,
                second: "ys",
                second_rows: 1
            })
        );
        assert!(matches!(
            interpolate_log(&[1.0, 2.0, 3.0], &[1.0, 0.0, 3.0], 1.5),
            Err(ColumnError::OutOfRange {
                argument: "ys",
                row: Some(2),
                ..
            })
        ));
        assert_eq!(interpolate_linear(&[1.0, 2.0], &[-4.0, 0.0], 1.5), Ok(-2.0));
    }

    #[test]
    fn prepared_table_interpolates_many_points() {
        // 1001-row table of y = x² on [0, 10]; 200 000 queries against the
        // closed form (linear interpolation error of x² is at most h²/4).
        let xs: Vec<f64> = (0..=1000).map(|i| f64::from(i) / 100.0).collect();
        let ys: Vec<f64> = xs.iter().map(|x| x * x).collect();
        let table = InterpolationTable::new(&xs, &ys, Interpolation::Linear).unwrap();
        let queries: Vec<f64> = (0..200_000).map(|i| f64::from(i) * 5e-5).collect();
        let values = table.at_each(&queries).unwrap();
        let spacing: f64 = 0.01;
        for (&x, &y) in queries.iter().zip(&values) {
            assert!(
                (y - x * x).abs() <= spacing * spacing / 4.0 + 1e-12,
                "x = {x}"
            );
        }
        let mut bad = queries.clone();
        bad[12] = 11.0;
        assert!(matches!(
            table.at_each(&bad),
            Err(ColumnError::OutsideTable { row: Some(13), .. })
        ));
    }

    // ----- root finding -----

    #[test]
    fn wallis_cubic() {
        // x³ − 2x − 5 = 0, Wallis's example for Newton's method; real root
        // 2.0945514815423265... (from memory, confirmed independently by
        // Newton iteration in 40-digit decimal arithmetic).
        let root = brent(
            |x| ok(x * x * x - 2.0 * x - 5.0),
            2.0,
            3.0,
            Tolerance::x(1e-15),
            100,
        )
        .unwrap();
        assert!(
            (root.x - 2.094_551_481_542_326_5).abs() <= 4e-15,
            "{root:?}"
        );
        assert!(root.iterations < 50, "{root:?}");
        assert!(root.residual.abs() < 1e-13);
    }

    #[test]
    fn dottie_number() {
        // cos x = x at 0.7390851332151607... (the Dottie number; from memory,
        // confirmed independently by Newton iteration in 40-digit decimals).
        let root = brent(|x| ok(x.cos() - x), 0.0, 1.0, Tolerance::x(0.0), 100).unwrap();
        assert!(
            (root.x - 0.739_085_133_215_160_7).abs() <= 2e-16,
            "{root:?}"
        );
        assert!(root.iterations < 50, "{root:?}");
    }

    #[test]
    fn bracket_order_does_not_matter() {
        let forward = brent(|x| ok(x.cos() - x), 0.0, 1.0, Tolerance::x(1e-12), 100).unwrap();
        let backward = brent(|x| ok(x.cos() - x), 1.0, 0.0, Tolerance::x(1e-12), 100).unwrap();
        assert!((forward.x - backward.x).abs() < 2e-12);
    }

    #[test]
    fn root_at_a_bracket_end_is_returned_at_once() {
        let root = brent(|x| ok(x - 2.0), 2.0, 3.0, Tolerance::x(1e-12), 100).unwrap();
        assert_eq!(
            root,
            Root {
                x: 2.0,
                iterations: 1,
                residual: 0.0,
                convergence: Convergence::Exact,
            }
        );
        let root = brent(|x| ok(x - 3.0), 2.0, 3.0, Tolerance::x(1e-12), 100).unwrap();
        assert_eq!((root.x, root.iterations), (3.0, 2));
    }

    #[test]
    fn bracket_ends_close_to_roots_do_not_look_like_a_jump() {
        // sin is 1.2e-16 at fl(π) and −2.4e-16 at fl(2π): the sign change is
        // the root π itself, one float away from the lower end (closed form).
        let root = brent(|x| ok(x.sin()), PI, 2.0 * PI, Tolerance::x(0.0), 100).unwrap();
        assert!((root.x - PI).abs() <= 1e-15, "{root:?}");
    }

    #[test]
    fn steep_but_continuous_function_gives_a_root() {
        // tanh(1e6 (x − 1)) changes from −1 to 1 within ~1e-6 of x = 1: at a
        // tolerance of 1e-3 it looks like a step, but it is continuous.
        let root = brent(
            |x| ok((1e6 * (x - 1.0)).tanh()),
            0.0,
            3.0,
            Tolerance::x(1e-3),
            100,
        )
        .unwrap();
        assert!((root.x - 1.0).abs() <= 1e-3, "{root:?}");
        assert!(root.residual.abs() < 1e-3, "{root:?}");
    }

    #[test]
    fn same_sign_at_both_ends_is_reported() {
        let error = brent(|x| ok(x * x + 1.0), -1.0, 1.0, Tolerance::x(1e-12), 100).unwrap_err();
        assert_eq!(
            error,
            SolveError::NoSignChange {
                lower: -1.0,
                upper: 1.0,
                f_lower: 2.0,
                f_upper: 2.0,
            }
        );
        assert!(error.to_string().contains("same sign at both ends"));
        assert!(error.to_string().contains("f(-1.0) = 2.0, f(1.0) = 2.0"));
    }

    #[test]
    fn pole_is_a_discontinuity_not_a_root() {
        // 1/(x − 1) changes sign across its pole at x = 1 but has no root.
        let error = brent(|x| ok(1.0 / (x - 1.0)), 0.0, 2.0, Tolerance::x(1e-12), 100).unwrap_err();
        match error {
            SolveError::Discontinuous {
                near,
                f_left,
                f_right,
            } => {
                assert!((near - 1.0).abs() < 1e-9, "{near}");
                assert!(f_left < -1e9 && f_right > 1e9, "{f_left} {f_right}");
            }
            other => panic!("expected a discontinuity, got {other:?}"),
        }
        // Same with a bracket that does not put the pole at a bisection point.
        let shifted = brent(|x| ok(1.0 / (x - 1.0)), 0.3, 2.9, Tolerance::x(1e-10), 100);
        assert!(
            matches!(shifted, Err(SolveError::Discontinuous { .. })),
            "{shifted:?}"
        );
    }

    #[test]
    fn step_is_a_discontinuity_not_a_root() {
        let step = |x: f64| ok(if x < 1.0 { -1.0 } else { 1.0 });
        match brent(step, 0.0, 3.0, Tolerance::x(1e-12), 200) {
            Err(SolveError::Discontinuous {
                near,
                f_left,
                f_right,
            }) => {
                assert!((near - 1.0).abs() < 1e-12, "{near}");
                assert_eq!((f_left, f_right), (-1.0, 1.0));
            }
            other => panic!("expected a discontinuity, got {other:?}"),
        }
        // Lopsided step: −1 below 2, +100 above.
        let lopsided = |x: f64| ok(if x < 2.0 { -1.0 } else { 100.0 });
        assert!(matches!(
            brent(lopsided, -5.0, 7.0, Tolerance::x(1e-9), 200),
            Err(SolveError::Discontinuous { .. })
        ));
        let message = SolveError::<Infallible>::Discontinuous {
            near: 1.0,
            f_left: -1.0,
            f_right: 1.0,
        }
        .to_string();
        assert!(message.contains("not a root"), "{message}");
    }

    #[derive(Debug, Clone, PartialEq)]
    struct LookupFailed(f64);

    impl fmt::Display for LookupFailed {
        fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
            write!(f, "no table value at {}", self.0)
        }
    }

    impl std::error::Error for LookupFailed {}

    #[test]
    fn function_errors_are_passed_on() {
        // Fails only inside the bracket, near the root at 1.5.
        let failing = |x: f64| {
            if (1.4..1.6).contains(&x) {
                Err(LookupFailed(x))
            } else {
                Ok(x - 1.5)
            }
        };
        let error = brent(failing, 0.0, 5.0, Tolerance::x(1e-12), 100).unwrap_err();
        assert!(
            matches!(error, SolveError::Function(LookupFailed(_))),
            "{error:?}"
        );
        assert!(error
            .to_string()
            .starts_with("the function could not be evaluated: no table value"));
        assert!(std::error::Error::source(&error).is_some());
    }

    #[test]
    fn non_finite_values_are_errors() {
        assert!(matches!(
            brent(
                |x| ok(if x > 0.5 { f64::NAN } else { x - 1.0 }),
                0.0,
                2.0,
                Tolerance::x(1e-12),
                100
            ),
            Err(SolveError::NotFinite { x: 2.0, .. })
        ));
        assert!(matches!(
            brent(|x| ok(1.0 / x), 0.0, 2.0, Tolerance::x(1e-12), 100),
            Err(SolveError::NotFinite { x: 0.0, value }) if value == f64::INFINITY
        ));
        // NaN inside the bracket.
        assert!(matches!(
            brent(
                |x| ok(if (0.9..1.1).contains(&x) {
                    f64::NAN
                } else {
                    x - 1.0
                }),
                0.0,
                2.0,
                Tolerance::x(1e-12),
                100
            ),
            Err(SolveError::NotFinite { .. })
        ));
    }

    #[test]
    fn unusable_brackets_and_tolerances_are_rejected() {
        let line = |x: f64| ok(x);
        assert!(matches!(
            brent(line, 1.0, 1.0, Tolerance::x(1e-9), 100),
            Err(SolveError::BadBracket { .. })
        ));
        assert!(matches!(
            brent(line, f64::NAN, 1.0, Tolerance::x(1e-9), 100),
            Err(SolveError::BadBracket { .. })
        ));
        assert!(matches!(
            brent(line, -1.0, f64::INFINITY, Tolerance::x(1e-9), 100),
            Err(SolveError::BadBracket { .. })
        ));
        assert!(matches!(
            brent(line, -1.0, 1.0, Tolerance::x(-1e-9), 100),
            Err(SolveError::BadTolerance { .. })
        ));
        assert!(matches!(
            brent(line, -1.0, 1.0, Tolerance::x(f64::NAN), 100),
            Err(SolveError::BadTolerance { .. })
        ));
    }

    #[test]
    fn evaluation_budget_is_respected() {
        let error = brent(|x| ok(x.cos() - x), 0.0, 1.0, Tolerance::x(0.0), 4).unwrap_err();
        match error {
            SolveError::NotConverged {
                iterations,
                lower,
                upper,
            } => {
                assert_eq!(iterations, 4);
                assert!(lower < 0.739_085_133_215_160_7 && 0.739_085_133_215_160_7 < upper);
            }
            other => panic!("expected NotConverged, got {other:?}"),
        }
    }

    #[test]
    fn smooth_roots_need_few_evaluations() {
        // Closed-form roots: e^x = 2 at ln 2; x² = 2 at √2; x^5 = 10 at 10^(1/5);
        // 1 − e^(−x/5) = 0.5 at 5 ln 2 (a drawdown-like saturation curve).
        // (function, lower, upper, expected root)
        type Case = (fn(f64) -> f64, f64, f64, f64);
        let cases: [Case; 4] = [
            (|x| x.exp() - 2.0, -3.0, 4.0, 2f64.ln()),
            (|x| x * x - 2.0, 0.0, 10.0, 2f64.sqrt()),
            (|x| x.powi(5) - 10.0, 0.0, 3.0, 10f64.powf(0.2)),
            (|x| 0.5 - (-x / 5.0).exp(), 0.0, 100.0, 5.0 * 2f64.ln()),
        ];
        for (function, lower, upper, expected) in cases {
            let root = brent(|x| ok(function(x)), lower, upper, Tolerance::x(1e-13), 100).unwrap();
            assert!((root.x - expected).abs() < 1e-12, "{root:?} vs {expected}");
            assert!(root.iterations < 50, "{root:?}");
        }
    }

    #[test]
    fn decade_spanning_brackets_give_roots_to_full_precision() {
        // Closed forms: x³ = 2e-15 at 2e-15^(1/3) = 1.25992104989487316e-5 and
        // x³ = 2 at 2^(1/3) = 1.25992104989487316 (both from Python mpmath
        // cbrt, 30 digits), in a bracket of twelve decades.
        for (goal, expected) in [
            (2e-15, 1.259_921_049_894_873_2e-5),
            (2.0, 1.259_921_049_894_873_2),
        ] {
            let root = brent(|x| ok(x * x * x - goal), 1e-6, 1e6, Tolerance::x(0.0), 200).unwrap();
            assert!(
                (root.x - expected).abs() <= 4.0 * f64::EPSILON * expected,
                "{root:?} vs {expected}"
            );
            if let Convergence::Bracket { width } = root.convergence {
                assert!(width.abs() <= 4.0 * f64::EPSILON * expected, "{root:?}");
            }
        }
    }

    #[test]
    fn convergence_says_which_test_stopped_the_search() {
        // e^x = 2 at ln 2 (closed form).
        let by_width = brent(|x| ok(x.exp() - 2.0), -3.0, 4.0, Tolerance::x(0.0), 100).unwrap();
        match by_width.convergence {
            Convergence::Bracket { width } => {
                assert!(
                    width.abs() <= 4.0 * f64::EPSILON * 2f64.ln(),
                    "{by_width:?}"
                )
            }
            Convergence::Exact => assert_eq!(by_width.residual, 0.0),
            Convergence::Residual => panic!("no residual tolerance was given: {by_width:?}"),
        }
        let loose = Tolerance {
            x: 0.0,
            residual: 1e-6,
        };
        let by_residual = brent(|x| ok(x.exp() - 2.0), -3.0, 4.0, loose, 100).unwrap();
        assert!(
            by_residual.convergence == Convergence::Residual
                || by_residual.convergence == Convergence::Exact,
            "{by_residual:?}"
        );
        assert!(by_residual.residual.abs() <= 1e-6, "{by_residual:?}");
        assert!(
            by_residual.iterations < by_width.iterations,
            "{by_residual:?}"
        );
        assert!(matches!(
            brent(
                ok,
                -1.0,
                1.0,
                Tolerance {
                    x: 0.0,
                    residual: -1.0
                },
                100
            ),
            Err(SolveError::BadTolerance { .. })
        ));
    }

    #[test]
    fn loose_tolerance_still_gives_a_root_within_it() {
        let root = brent(
            |x| ok(x * x * x - 2.0 * x - 5.0),
            2.0,
            3.0,
            Tolerance::x(0.1),
            100,
        )
        .unwrap();
        assert!((root.x - 2.094_551_481_542_326_5).abs() <= 0.1, "{root:?}");
    }

    #[test]
    fn awkward_inputs_give_values_or_errors() {
        // Every function must return (not panic) on any mix of special values.
        const SPECIAL: [f64; 12] = [
            0.0,
            -0.0,
            1.0,
            -1.0,
            f64::MAX,
            -f64::MAX,
            f64::MIN_POSITIVE,
            5e-324,
            f64::NAN,
            f64::INFINITY,
            f64::NEG_INFINITY,
            1e-300,
        ];
        let mut random = Lcg(3);
        let mut pick = || SPECIAL[(random.next() * SPECIAL.len() as f64) as usize];
        for _ in 0..3000 {
            let rows = (pick().abs().min(3.0)) as usize + 1;
            let a: Vec<f64> = (0..rows).map(|_| pick()).collect();
            let b: Vec<f64> = (0..rows).map(|_| pick()).collect();
            let results = [
                sum(&a),
                mean(&a),
                geometric_mean(&a),
                harmonic_mean(&a),
                minimum(&a).map(|(value, _)| value),
                layered_along(&a, &b),
                layered_across(&a, &b),
                interpolate_linear(&a, &b, pick()),
                interpolate_log(&a, &b, pick()),
            ];
            for value in results.into_iter().flatten() {
                assert!(!value.is_nan(), "{a:?} {b:?}");
            }
            let (lower, upper, tolerance) = (pick(), pick(), pick());
            let _ = brent(
                |x| ok(x - 0.25),
                lower,
                upper,
                Tolerance::x(tolerance.abs()),
                50,
            );
        }
    }

    #[test]
    fn roots_of_random_cubics_are_sign_changes() {
        // Closed-form check: the root lies between adjacent floats at which
        // the cubic changes sign, or makes it vanish.
        let mut random = Lcg(11);
        for _ in 0..300 {
            let (a, b, c) = (
                4.0 * random.next() - 2.0,
                4.0 * random.next() - 2.0,
                4.0 * random.next() - 2.0,
            );
            let cubic = |x: f64| x * x * x + a * x * x + b * x + c;
            // A cubic tends to ±inf, so [-10, 10] holds a sign change here.
            let root = brent(|x| ok(cubic(x)), -10.0, 10.0, Tolerance::x(0.0), 200).unwrap();
            let below = cubic(root.x - 8.0 * f64::EPSILON * root.x.abs().max(1.0));
            let above = cubic(root.x + 8.0 * f64::EPSILON * root.x.abs().max(1.0));
            assert!(root.residual == 0.0 || !same_sign(below, above), "{root:?}");
            assert!(root.iterations < 60, "{root:?}");
        }
    }
}
