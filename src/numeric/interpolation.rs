//! Linear and log-linear interpolation in a table of two columns; never an extrapolation.

use super::*;

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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::numeric::test_support::*;

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
}
