//! Aggregates of a column: compensated sums, means, extremes.

use super::*;

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
pub(crate) struct CompensatedSum {
    sum: f64,
    compensation: f64,
}

impl CompensatedSum {
    pub(crate) fn add(&mut self, value: f64) {
        let total = self.sum + value;
        self.compensation += if self.sum.abs() >= value.abs() {
            (self.sum - total) + value
        } else {
            (value - total) + self.sum
        };
        self.sum = total;
    }

    /// NaN or infinite when an intermediate sum overflowed.
    pub(crate) fn total(&self) -> f64 {
        self.sum + self.compensation
    }
}

pub(crate) fn compensated_sum(values: impl IntoIterator<Item = f64>) -> f64 {
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::numeric::test_support::*;

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
}
