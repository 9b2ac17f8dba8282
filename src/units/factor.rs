//! Exact conversion factors.
//!
//! A factor is kept as a decimal mantissa in [1, 10) times a power of ten, so factors that are
//! exact by definition (ft = 0.3048 m, US gal = 3.785411784 L, lbf, psi) compose exactly however
//! small or large the result (mD^2 is 1e-31 m^4), and turn into an `f64` once, correctly rounded,
//! at the end. Factors that cannot stay exact (a fractional power) fall back to `f64` and say so.

use rust_decimal::prelude::ToPrimitive;
use rust_decimal::Decimal;
use std::fmt;
use std::str::FromStr;

/// pi to the 28 digits a decimal holds.
const PI_28_DIGITS: &str = "3.141592653589793238462643383";

/// A multiplicative factor to SI, exact where its definition is.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Factor {
    exact: Option<ScientificDecimal>,
    value: f64,
}

/// 10^0 to 10^22: every one is an exact double (5^22 < 2^53).
const EXACT_POWERS_OF_TEN: [f64; 23] = [
    1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16,
    1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
];

/// `mantissa × 10^exponent` with 1 <= |mantissa| < 10 (28 significant digits).
#[derive(Debug, Clone, Copy, PartialEq)]
struct ScientificDecimal {
    mantissa: Decimal,
    exponent: i32,
}

/// The text of a factor definition in the catalog could not be read (a bug in the catalog).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct BadFactorText(pub String);

impl Factor {
    pub const ONE: Factor = Factor {
        exact: Some(ScientificDecimal {
            mantissa: Decimal::ONE,
            exponent: 0,
        }),
        value: 1.0,
    };

    /// A factor from a definition such as `0.45359237*9.80665/0.00064516` (exact decimals
    /// joined by `*` and `/`, read left to right) or containing `pi` (28 digits, inexact).
    pub fn from_definition(text: &str) -> Result<Factor, BadFactorText> {
        let bad = || BadFactorText(text.to_string());
        let mut result = ScientificDecimal::one();
        let mut exact = true;
        let mut dividing = false;
        let mut rest = text.trim();
        loop {
            let end = rest.find(['*', '/']).unwrap_or(rest.len());
            let term = rest[..end].trim();
            let number = if term == "pi" {
                exact = false;
                ScientificDecimal::parse(PI_28_DIGITS).ok_or_else(bad)?
            } else {
                ScientificDecimal::parse(term).ok_or_else(bad)?
            };
            result = if dividing {
                result.divide(&number)
            } else {
                result.multiply(&number)
            }
            .ok_or_else(bad)?;
            if end == rest.len() {
                break;
            }
            dividing = rest.as_bytes()[end] == b'/';
            rest = &rest[end + 1..];
        }
        let factor = Factor::from_scientific(result);
        Ok(if exact {
            factor
        } else {
            Factor {
                exact: None,
                value: factor.value,
            }
        })
    }

    fn from_scientific(number: ScientificDecimal) -> Factor {
        Factor {
            value: number.to_f64(),
            exact: Some(number),
        }
    }

    /// An inexact factor known only as a double.
    pub fn from_f64(value: f64) -> Factor {
        Factor { exact: None, value }
    }

    pub fn value(&self) -> f64 {
        self.value
    }

    pub fn is_exact(&self) -> bool {
        self.exact.is_some()
    }

    pub fn multiply(&self, other: &Factor) -> Factor {
        match (self.exact, other.exact) {
            (Some(left), Some(right)) => match left.multiply(&right) {
                Some(product) => Factor::from_scientific(product),
                None => Factor::from_f64(self.value * other.value),
            },
            _ => Factor::from_f64(self.value * other.value),
        }
    }

    pub fn divide(&self, other: &Factor) -> Factor {
        match (self.exact, other.exact) {
            (Some(left), Some(right)) => match left.divide(&right) {
                Some(quotient) => Factor::from_scientific(quotient),
                None => Factor::from_f64(self.value / other.value),
            },
            _ => Factor::from_f64(self.value / other.value),
        }
    }

    /// Integer powers stay exact; other powers are computed in `f64`.
    pub fn power(&self, numerator: i32, denominator: i32) -> Factor {
        if denominator == 1 {
            if let Some(exact) = self.exact {
                let mut result = Some(ScientificDecimal::one());
                for _ in 0..numerator.unsigned_abs() {
                    result = result.and_then(|value| value.multiply(&exact));
                }
                if numerator < 0 {
                    result = result.and_then(|value| ScientificDecimal::one().divide(&value));
                }
                if let Some(value) = result {
                    return Factor::from_scientific(value);
                }
            }
        }
        Factor::from_f64(
            self.value
                .powf(f64::from(numerator) / f64::from(denominator)),
        )
    }

    /// Multiplies a decimal literal by this factor, exactly, rounding to `f64` once.
    /// Returns `None` when the literal or the product leaves the decimal range.
    pub fn apply_exact(&self, literal: &str) -> Option<f64> {
        let number = ScientificDecimal::parse(literal)?;
        Some(number.multiply(&self.exact?)?.to_f64())
    }

    /// The exact decimal text of the factor (`1233.48183754752`), or the double with a note.
    pub fn describe(&self) -> String {
        match self.exact {
            Some(exact) => exact.to_string(),
            None => format!("{:e} (rounded)", self.value),
        }
    }
}

impl ScientificDecimal {
    fn one() -> Self {
        ScientificDecimal {
            mantissa: Decimal::ONE,
            exponent: 0,
        }
    }

    /// Reads `123.45`, `1e-12`, `9.80665E0`.
    fn parse(text: &str) -> Option<Self> {
        let (digits, exponent) = match text.find(['e', 'E']) {
            Some(position) => (&text[..position], text[position + 1..].parse::<i32>().ok()?),
            None => (text, 0),
        };
        // Long literals are cut to what a decimal holds; the rounding is far below an f64's.
        let mantissa = Decimal::from_str(digits)
            .or_else(|_| Decimal::from_scientific(&format!("{digits}e0")))
            .ok()?;
        let mut number = ScientificDecimal::from_decimal(mantissa)?;
        number.exponent = number.exponent.checked_add(exponent)?;
        Some(number)
    }

    fn from_decimal(value: Decimal) -> Option<Self> {
        ScientificDecimal {
            mantissa: value,
            exponent: 0,
        }
        .normalized()
    }

    /// Brings the mantissa into [1, 10) by moving its decimal point (no division). `None` for
    /// zero (no factor is zero).
    fn normalized(self) -> Option<Self> {
        if self.mantissa.is_zero() {
            return None;
        }
        let unscaled = self.mantissa.mantissa();
        let digits = unscaled.unsigned_abs().ilog10() + 1;
        // A decimal holds at most 29 digits, so the new scale is at most 28.
        let new_scale = digits - 1;
        let shift = new_scale as i32 - self.mantissa.scale() as i32;
        Some(ScientificDecimal {
            mantissa: Decimal::from_i128_with_scale(unscaled, new_scale).normalize(),
            exponent: self.exponent.checked_add(shift)?,
        })
    }

    fn multiply(&self, other: &Self) -> Option<Self> {
        ScientificDecimal {
            mantissa: self.mantissa.checked_mul(other.mantissa)?,
            exponent: self.exponent.checked_add(other.exponent)?,
        }
        .normalized()
    }

    fn divide(&self, other: &Self) -> Option<Self> {
        ScientificDecimal {
            mantissa: self.mantissa.checked_div(other.mantissa)?,
            exponent: self.exponent.checked_sub(other.exponent)?,
        }
        .normalized()
    }

    /// Correctly rounded: the decimal text goes through the standard library's float parser.
    fn to_f64(self) -> f64 {
        // Clinger's fast path: an integer below 2^53 and a power of ten up to 10^22 are both
        // exact doubles, so one multiplication or division rounds once, as reading the
        // decimal text does. Zero keeps its sign through the text.
        let digits = self.mantissa.mantissa();
        let power = i64::from(self.exponent) - i64::from(self.mantissa.scale());
        if digits != 0 && digits.unsigned_abs() < 1 << 53 && power.unsigned_abs() <= 22 {
            let whole = digits as f64;
            let ten_to_the = EXACT_POWERS_OF_TEN[power.unsigned_abs() as usize];
            return if power >= 0 {
                whole * ten_to_the
            } else {
                whole / ten_to_the
            };
        }
        self.to_f64_through_text()
    }

    /// The correctly rounded double of any value, through its decimal text.
    fn to_f64_through_text(self) -> f64 {
        format!("{}e{}", self.mantissa, self.exponent)
            .parse::<f64>()
            .unwrap_or_else(|_| {
                self.mantissa.to_f64().unwrap_or(f64::NAN) * 10f64.powi(self.exponent)
            })
    }
}

impl fmt::Display for ScientificDecimal {
    /// Plain decimal text when the exponent is moderate, scientific otherwise.
    fn fmt(&self, formatter: &mut fmt::Formatter<'_>) -> fmt::Result {
        if (-6..=12).contains(&self.exponent) {
            let mut value = self.mantissa;
            let ten = Decimal::TEN;
            for _ in 0..self.exponent.unsigned_abs() {
                value = if self.exponent > 0 {
                    value * ten
                } else {
                    value / ten
                };
            }
            write!(formatter, "{}", value.normalize())
        } else {
            write!(formatter, "{}e{}", self.mantissa, self.exponent)
        }
    }
}

#[cfg(test)]
mod tests {
    /// The fast conversion gives the very double the decimal text reads as: mantissas of up
    /// to 17 digits over the whole range of exponents, both signs, and the products of unit
    /// factors with literals that sheets make.
    #[test]
    fn fast_conversion_to_double_is_the_correctly_rounded_one() {
        let mut state: u64 = 0x2545_f491_4f6c_dd1d;
        let mut next = move || {
            state ^= state << 13;
            state ^= state >> 7;
            state ^= state << 17;
            state
        };
        for _ in 0..200_000 {
            let digits = next() % 10u64.pow(1 + (next() % 17) as u32);
            let exponent = (next() % 60) as i32 - 30;
            let sign = if next() % 2 == 0 { "" } else { "-" };
            let text = format!("{sign}{digits}e{exponent}");
            let Some(number) = ScientificDecimal::parse(&text) else {
                // Zero has no mantissa in [1, 10): callers multiply as doubles instead.
                assert_eq!(digits, 0, "{text}");
                continue;
            };
            assert_eq!(
                number.to_f64().to_bits(),
                number.to_f64_through_text().to_bits(),
                "{text}"
            );
        }
        let feet = Factor::from_definition("0.3048").expect("ft");
        for literal in ["1", "12.5", "0.001", "-7", "3e-9", "123456789.123", "1e300"] {
            let exact = feet.apply_exact(literal).expect("exact");
            let number = ScientificDecimal::parse(literal)
                .and_then(|value| value.multiply(&feet.exact?))
                .expect("a product");
            assert_eq!(
                exact.to_bits(),
                number.to_f64_through_text().to_bits(),
                "{literal} ft"
            );
        }
    }

    use super::*;

    fn exact(text: &str) -> Factor {
        Factor::from_definition(text).expect("catalog text")
    }

    #[test]
    fn acre_foot_composes_exactly() {
        // Source: NIST SP 811 (2008) B.8: ft = 0.3048 m exactly; acre = 43 560 ft^2.
        let foot = exact("0.3048");
        let acre = exact("43560").multiply(&foot.power(2, 1));
        let acre_foot = acre.multiply(&foot);
        assert_eq!(acre_foot.describe(), "1233.48183754752");
        assert_eq!(acre_foot.value(), 1233.48183754752);
    }

    #[test]
    fn tiny_factors_keep_all_digits() {
        // darcy = 1e-12/1.01325 m^2 by definition; its square is far below Decimal's 1e-28.
        let darcy = exact("1e-12/1.01325");
        let millidarcy_squared = darcy.multiply(&exact("0.001")).power(2, 1);
        let expected = (1e-15f64 / 1.01325).powi(2);
        assert!((millidarcy_squared.value() / expected - 1.0).abs() < 1e-15);
        assert!(millidarcy_squared.is_exact());
    }

    #[test]
    fn fractional_power_is_inexact() {
        let root = exact("4").power(1, 2);
        assert!(!root.is_exact());
        assert_eq!(root.value(), 2.0);
    }

    #[test]
    fn literal_times_factor_is_exact() {
        // 20 ft = 6.096 m exactly.
        assert_eq!(exact("0.3048").apply_exact("20"), Some(6.096));
        assert_eq!(exact("0.3048").apply_exact("2e3"), Some(609.6));
    }
}
