//! Number display: a fixed number of significant figures, rounded half away from zero on the
//! decimal the user would see (the shortest text that reads back as the same double), so that
//! 0.125 to two figures is 0.13 as in a hand calculation, not 0.12.

use rust_decimal::{Decimal, RoundingStrategy};
use std::str::FromStr;

/// Formats `value` to `digits` significant figures; plain notation for magnitudes from 1e-3
/// up to 1e6, scientific (`1.234e-9`) outside.
pub fn format_significant(value: f64, digits: u32) -> String {
    let digits = digits.clamp(1, 17);
    if value == 0.0 {
        return "0".to_string();
    }
    if !value.is_finite() {
        return value.to_string();
    }
    // `{:e}` is the shortest round-trip text, e.g. `1.2334818375475199e3`.
    let shortest = format!("{value:e}");
    let (mantissa_text, exponent_text) = shortest.split_once('e').unwrap_or((&shortest, "0"));
    let mut exponent: i32 = exponent_text.parse().unwrap_or(0);
    let Ok(mantissa) = Decimal::from_str(mantissa_text) else {
        return format!("{value:.*e}", (digits - 1) as usize);
    };
    let mut rounded =
        mantissa.round_dp_with_strategy(digits - 1, RoundingStrategy::MidpointAwayFromZero);
    if rounded.abs() >= Decimal::TEN {
        rounded /= Decimal::TEN;
        exponent += 1;
    }
    let plain = (-3..6).contains(&exponent);
    if plain {
        let mut scaled = rounded;
        for _ in 0..exponent.unsigned_abs() {
            scaled = if exponent > 0 {
                scaled * Decimal::TEN
            } else {
                scaled / Decimal::TEN
            };
        }
        let decimals = (i64::from(digits) - 1 - i64::from(exponent)).max(0) as u32;
        let text = scaled.round_dp(decimals).normalize().to_string();
        return text;
    }
    format!("{}e{exponent}", rounded.normalize())
}

#[cfg(test)]
mod tests {
    use super::format_significant;

    fn check(value: f64, digits: u32, expected: &str) {
        assert_eq!(
            format_significant(value, digits),
            expected,
            "{value} to {digits}"
        );
    }

    #[test]
    fn significant_figures() {
        check(1233.48183754752, 15, "1233.48183754752");
        check(1233.48183754752, 4, "1233");
        check(0.125, 2, "0.13");
        check(-0.125, 2, "-0.13");
        check(9.869233e-13, 4, "9.869e-13");
        check(999.96, 4, "1000");
        check(9999.6, 4, "10000");
        check(999999.7, 4, "1e6");
        check(26.85, 4, "26.85");
        check(0.001234567, 3, "0.00123");
        check(0.0001234567, 3, "1.23e-4");
        check(0.0, 4, "0");
        check(100.0, 4, "100");
        check(1.5e6, 4, "1.5e6");
    }
}
