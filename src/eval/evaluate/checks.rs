//! Check lines: comparisons with a tolerance or the rounding allowance, over values or columns.

use super::*;
use crate::eval::error::{EvalError, EvalErrorKind, Operation};
use crate::syntax::{Check, Comparison};
use crate::units::Dimension;

impl<'l> Calculator<'l> {
    /// Decides a check line. Over columns, every row must pass; the outcome shows the first
    /// row that failed, or the row closest to failing.
    pub(crate) fn check(
        &mut self,
        check: &Check,
        scope: &dyn Scope,
    ) -> Result<CheckOutcome, Failure> {
        let left = self.expression(&check.left, scope)?;
        let right = self.expression(&check.right, scope)?;
        let both = check.left.span.to(check.right.span);
        let rows = crate::eval::columns::common_rows(&left, &right, both)?;
        let (left_dimension, right_dimension) = (left.dimension(), right.dimension());
        if left_dimension != right_dimension {
            return Err(EvalError::new(
                EvalErrorKind::DimensionMismatch {
                    operation: Operation::Compare,
                    left: left_dimension.unwrap_or(Dimension::dimensionless()),
                    right: right_dimension.unwrap_or(Dimension::dimensionless()),
                },
                both,
            )
            .into());
        }
        let tolerance = match &check.tolerance {
            None => None,
            Some(tolerance) => {
                let value = self.scalar(tolerance, "a tolerance", scope)?;
                if value.value < 0.0 {
                    return Err(
                        EvalError::new(EvalErrorKind::NegativeTolerance, tolerance.span).into(),
                    );
                }
                if value.dimension.is_dimensionless() {
                    if value.value >= 1.0 || value.value.is_nan() {
                        let error =
                            EvalError::new(EvalErrorKind::ToleranceTooLarge, tolerance.span);
                        return Err(error.into());
                    }
                    Some((value.value, true))
                } else if Some(value.dimension) == right_dimension {
                    Some((value.value, false))
                } else {
                    return Err(EvalError::new(
                        EvalErrorKind::ToleranceDimension {
                            found: value.dimension,
                            sides: right_dimension.unwrap_or(Dimension::dimensionless()),
                        },
                        tolerance.span,
                    )
                    .into());
                }
            }
        };
        // How far row values are from failing: a check passes at a margin of zero or more
        // (strict comparisons need more than zero).
        // Without a tolerance, sides within the rounding allowance count as equal, for every
        // comparison alike: `0.3 m + 0.3 m + 0.3 m >= 0.9 m` passes and `0.3 m + 0.6 m < 0.9 m`
        // fails, as they do on paper.
        let comparison = check.comparison;
        let margin = |l: f64, r: f64| {
            let (allowance, rounding) = match tolerance {
                None => (ROUNDING_ALLOWANCE * r.abs().max(l.abs()), true),
                Some((fraction, true)) => (fraction * r.abs(), false),
                Some((absolute, false)) => (absolute, false),
            };
            match comparison {
                Comparison::Less if rounding => r - allowance - l,
                Comparison::Greater if rounding => l - (r + allowance),
                Comparison::Less | Comparison::LessOrEqual => r + allowance - l,
                Comparison::Greater | Comparison::GreaterOrEqual => l - (r - allowance),
                Comparison::Equal => allowance - (l - r).abs(),
                Comparison::NotEqual => (l - r).abs() - allowance,
            }
        };
        let passes = |margin: f64| match comparison {
            Comparison::Less | Comparison::Greater | Comparison::NotEqual => margin > 0.0,
            _ => margin >= 0.0,
        };
        let (a, b) = (
            crate::eval::columns::Rows::of(&left),
            crate::eval::columns::Rows::of(&right),
        );
        let (shown_row, summary) = match rows {
            None => (0, None),
            Some(total) => {
                let mut failed = 0;
                let mut first_failed = None;
                let mut closest = (0, f64::INFINITY);
                for row in 0..total {
                    let row_margin = margin(a.at(row), b.at(row));
                    if !passes(row_margin) {
                        failed += 1;
                        first_failed.get_or_insert(row);
                    }
                    if row_margin < closest.1 {
                        closest = (row, row_margin);
                    }
                }
                let shown_row = first_failed.unwrap_or(closest.0);
                let summary = CheckRows {
                    total,
                    failed,
                    shown_row: shown_row + 1,
                    sampled: false,
                };
                (shown_row, Some(summary))
            }
        };
        let passed = match summary {
            Some(summary) => summary.failed == 0,
            None => passes(margin(a.at(0), b.at(0))),
        };
        let sides = [&check.right, &check.left];
        let (Some(left_row), Some(right_row)) =
            (left.quantity_at(shown_row), right.quantity_at(shown_row))
        else {
            return Err(EvalError::new(EvalErrorKind::NotFinite, both).into());
        };
        let right_shown = self.shown_for_check(right_row, sides, scope)?;
        let left_shown = self.shown_for_check(left_row, sides, scope)?;
        Ok(CheckOutcome {
            passed,
            comparison: check.comparison,
            left: left_shown,
            right: right_shown,
            tolerance: check.tolerance_text.clone(),
            message: check.message.clone(),
            rows: summary,
        })
    }
}
