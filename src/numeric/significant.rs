//! Numbers as text: a fixed number of significant figures, rounded half away from zero on the
//! decimal the user would see (the shortest text that reads back as the same double), so that
//! 0.125 to two figures is 0.13 as in a hand calculation, not 0.12.
//!
//! The rounding works on the digits of that shortest text (from `ryu`) directly: they are an
//! exact decimal, so rounding them is exact, with no decimal arithmetic and no allocation
//! beyond the text written. This is the one formatter of the program: tables, CSV, JSON display fields and
//! messages (`message_number`) all go through it.

use std::fmt::Write as _;

/// Significant figures of a number in a message ("T = 268.15 K is below …"): enough that a
/// value converted back to the user's scale reads as they wrote it.
pub const MESSAGE_DIGITS: u32 = 6;

/// Formats `value` to `digits` significant figures; plain notation for magnitudes from 1e-3
/// up to 1e6, scientific (`1.234e-9`) outside.
pub fn format_significant(value: f64, digits: u32) -> String {
    let mut text = String::with_capacity(12);
    write_significant(&mut text, value, digits);
    text
}

/// The digits of `value` (positive, finite) rounded to `digits` figures the exact way: the
/// shortest round-trip text, rounded half away from zero on its digits.
fn rounded_shortest_digits(value: f64, digits: usize) -> ([u8; 17], usize, i32) {
    // The shortest round-trip text (`1233.4818375475199`, `1e-7`, `1.2345678901234568e20`),
    // as its digits and the decimal exponent of the first of them. Where the exact value of
    // the double is a short decimal ending in 5 (…152.25), two shortest texts are equally
    // close, and ryu and the standard library break the tie differently; the standard
    // library's choice is the one shown.
    let (mut figures, mut count, mut exponent) = if tie_possible(value) {
        let mut standard = String::new();
        let _ = write!(standard, "{value:e}");
        decimal_digits(standard.as_bytes())
    } else {
        decimal_digits(ryu::Buffer::new().format_finite(value).as_bytes())
    };
    // Half away from zero on the exact decimal: the first dropped digit decides.
    if count > digits {
        let round_up = figures[digits] >= 5;
        count = digits;
        if round_up {
            let mut index = digits;
            loop {
                if index == 0 {
                    // 9.99… became 10: one figure, one decade up.
                    figures[0] = 1;
                    count = 1;
                    exponent += 1;
                    break;
                }
                index -= 1;
                if figures[index] == 9 {
                    figures[index] = 0;
                } else {
                    figures[index] += 1;
                    break;
                }
            }
        }
    }
    (figures, count, exponent)
}

/// Whether the exact value of `value` (positive, finite) is a decimal of at most 18
/// significant digits: only then can two shortest texts tie. A double is m·2^e; with m odd,
/// its decimal digits are those of m·2^e (e ≥ 0) or of m·5^-e (e < 0).
fn tie_possible(value: f64) -> bool {
    let bits = value.to_bits();
    let biased = ((bits >> 52) & 0x7ff) as i32;
    let fraction = bits & ((1u64 << 52) - 1);
    let (mut mantissa, mut exponent) = if biased == 0 {
        (fraction, -1074)
    } else {
        (fraction | (1u64 << 52), biased - 1075)
    };
    if mantissa == 0 {
        return false;
    }
    let zeros = mantissa.trailing_zeros();
    mantissa >>= zeros;
    exponent += zeros as i32;
    const EIGHTEEN_DIGITS: u128 = 1_000_000_000_000_000_000;
    let exact = if exponent >= 0 {
        (exponent < 64).then(|| u128::from(mantissa) << exponent)
    } else {
        5u128
            .checked_pow(exponent.unsigned_abs())
            .and_then(|power| power.checked_mul(u128::from(mantissa)))
    };
    exact.is_some_and(|digits| digits < EIGHTEEN_DIGITS)
}

/// Powers of ten a double holds exactly.
const EXACT_POWERS_OF_TEN: [f64; 23] = [
    1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16,
    1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
];

/// The fast path of `rounded_shortest_digits`, for up to 15 figures: `value` scaled by an
/// exact power of ten to a number of `digits` whole digits and rounded. The scaling rounds
/// once, and the shortest text lies within half a unit in the last place of `value`, so the
/// result is the exact one unless the fraction is within a few units in the last place of a
/// half; then, or when no exact power of ten fits, `None` sends it to the exact path.
fn scaled_digits(value: f64, digits: usize) -> Option<([u8; 17], usize, i32)> {
    if digits > 15 {
        return None;
    }
    let mut exponent = value.log10().floor() as i32;
    for _ in 0..2 {
        let shift = digits as i32 - 1 - exponent;
        let power = *EXACT_POWERS_OF_TEN.get(shift.unsigned_abs() as usize)?;
        let scaled = if shift >= 0 {
            value * power
        } else {
            value / power
        };
        let low = EXACT_POWERS_OF_TEN[digits - 1];
        if scaled < low {
            exponent -= 1;
            continue;
        }
        if scaled >= low * 10.0 {
            exponent += 1;
            continue;
        }
        let whole = scaled.floor();
        let fraction = scaled - whole;
        // The scaling is off by at most half an epsilon of `scaled`, and the shortest text
        // lies within half an epsilon of `value`: together at most one epsilon of `scaled`,
        // with room to spare.
        let margin = 1.5 * f64::EPSILON * scaled;
        if (fraction - 0.5).abs() <= margin {
            return None;
        }
        let mut integer = whole as u64 + u64::from(fraction > 0.5);
        if integer == 10u64.pow(digits as u32) {
            integer /= 10;
            exponent += 1;
        }
        let mut figures = [0u8; 17];
        for index in (0..digits).rev() {
            figures[index] = (integer % 10) as u8;
            integer /= 10;
        }
        return Some((figures, digits, exponent));
    }
    None
}

/// The significant digits of a decimal text (`0.00125`, `1233.5`, `1.25e-7`), without leading
/// zeros, with the decimal exponent of the first digit: one pass, no searching.
fn decimal_digits(text: &[u8]) -> ([u8; 17], usize, i32) {
    let mut figures = [0u8; 17];
    let mut count = 0;
    // Digits before the point and zeros before the first significant digit place the exponent.
    let mut whole_digits: i32 = 0;
    let mut leading_zeros: i32 = 0;
    let mut after_point = false;
    let mut written_exponent: i32 = 0;
    for (index, byte) in text.iter().enumerate() {
        match byte {
            b'.' => after_point = true,
            b'0'..=b'9' => {
                let figure = byte - b'0';
                if !after_point {
                    whole_digits += 1;
                }
                if count == 0 && figure == 0 {
                    leading_zeros += 1;
                } else if count < figures.len() {
                    figures[count] = figure;
                    count += 1;
                }
            }
            b'e' | b'E' => {
                let rest = &text[index + 1..];
                let (negative, digits) = match rest.split_first() {
                    Some((b'-', digits)) => (true, digits),
                    Some((b'+', digits)) => (false, digits),
                    _ => (false, rest),
                };
                let magnitude = digits
                    .iter()
                    .fold(0i32, |total, digit| total * 10 + i32::from(digit - b'0'));
                written_exponent = if negative { -magnitude } else { magnitude };
                break;
            }
            _ => {}
        }
    }
    (
        figures,
        count,
        written_exponent + whole_digits - leading_zeros - 1,
    )
}

/// A number for a message: `MESSAGE_DIGITS` significant figures, trailing zeros dropped.
pub fn message_number(value: f64) -> String {
    format_significant(value, MESSAGE_DIGITS)
}

/// Appends `value` to `out` as `format_significant` spells it, so that a writer of many cells
/// can reuse one buffer.
pub fn write_significant(out: &mut String, value: f64, digits: u32) {
    let digits = digits.clamp(1, 17) as usize;
    if value == 0.0 {
        out.push('0');
        return;
    }
    if !value.is_finite() {
        let _ = write!(out, "{value}");
        return;
    }
    let (figures, mut count, exponent) = match scaled_digits(value.abs(), digits) {
        Some(found) => found,
        None => rounded_shortest_digits(value.abs(), digits),
    };
    while count > 1 && figures[count - 1] == 0 {
        count -= 1;
    }
    let figures = &figures[..count];
    // Laid out in bytes on the stack, then appended once: at most a sign, `0.00`, 17 digits,
    // a point and `e-324`.
    let mut text = [0u8; 32];
    let mut length = 0;
    let mut put = |byte: u8| {
        text[length] = byte;
        length += 1;
    };
    if value < 0.0 {
        put(b'-');
    }
    if (-3..6).contains(&exponent) {
        if exponent < 0 {
            put(b'0');
            put(b'.');
            for _ in 0..(-exponent - 1) {
                put(b'0');
            }
            figures.iter().for_each(|figure| put(b'0' + figure));
        } else {
            let whole = exponent as usize + 1;
            for index in 0..whole.max(count) {
                if index == whole {
                    put(b'.');
                }
                put(b'0' + figures.get(index).copied().unwrap_or(0));
            }
        }
    } else {
        put(b'0' + figures[0]);
        if count > 1 {
            put(b'.');
            figures[1..].iter().for_each(|figure| put(b'0' + figure));
        }
        put(b'e');
        if exponent < 0 {
            put(b'-');
        }
        let mut power = itoa::Buffer::new();
        power
            .format(exponent.unsigned_abs())
            .bytes()
            .for_each(&mut put);
    }
    out.push_str(std::str::from_utf8(&text[..length]).unwrap_or_default());
}

#[cfg(test)]
mod tests {
    use super::{format_significant, message_number};
    use rust_decimal::{Decimal, RoundingStrategy};
    use std::str::FromStr;

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
        check(-0.0, 4, "0");
        check(100.0, 4, "100");
        check(1.5e6, 4, "1.5e6");
        check(0.00099996, 4, "0.001");
        check(f64::INFINITY, 4, "inf");
        check(f64::MIN_POSITIVE, 3, "2.23e-308");
        check(5e-324, 17, "5e-324");
        check(f64::MAX, 17, "1.7976931348623157e308");
        // Exactly 664743399286152.25: two 16-digit shortest texts tie; the standard
        // library's (…523) is the one shown, as before.
        check(6.647433992861523e14, 16, "6.647433992861523e14");
        check(6.647433992861523e14, 15, "6.64743399286152e14");
    }

    #[test]
    fn messages_use_six_figures() {
        assert_eq!(message_number(-5.0 + 273.15), "268.15");
        assert_eq!(message_number(0.1 + 0.2), "0.3");
        assert_eq!(message_number(101_325.0), "101325");
        assert_eq!(message_number(1.234e-7), "1.234e-7");
        assert_eq!(message_number(0.0512), "0.0512");
        assert_eq!(message_number(-5.000_000_000_1), "-5");
    }

    /// The formatter this one replaced: exact decimal arithmetic on the shortest text. Kept
    /// here as the reference the digit rounding must agree with.
    fn exact_reference(value: f64, digits: u32) -> String {
        let digits = digits.clamp(1, 17);
        if value == 0.0 {
            return "0".to_string();
        }
        if !value.is_finite() {
            return value.to_string();
        }
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
        if (-3..6).contains(&exponent) {
            let mut scaled = rounded;
            for _ in 0..exponent.unsigned_abs() {
                scaled = if exponent > 0 {
                    scaled * Decimal::TEN
                } else {
                    scaled / Decimal::TEN
                };
            }
            let decimals = (i64::from(digits) - 1 - i64::from(exponent)).max(0) as u32;
            return scaled.round_dp(decimals).normalize().to_string();
        }
        format!("{}e{exponent}", rounded.normalize())
    }

    /// A small deterministic generator (SplitMix64), so a failure names a reproducible case.
    fn next(state: &mut u64) -> u64 {
        *state = state.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut mixed = *state;
        mixed = (mixed ^ (mixed >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        mixed = (mixed ^ (mixed >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        mixed ^ (mixed >> 31)
    }

    #[test]
    fn agrees_with_exact_decimal_rounding_on_random_values() {
        let mut state = 20_261_202;
        let mut compared = 0;
        for case in 0..400_000 {
            let bits = next(&mut state);
            let value = match case % 4 {
                // Any double at all.
                0 => f64::from_bits(bits),
                // Engineering magnitudes, 1e-15 to 1e15.
                1 => (bits as f64 / u64::MAX as f64 * 30.0 - 15.0).exp2() * 1.7,
                // Short decimals, where ties (…5) are common: 0.125, 26.85, 1.0005.
                2 => (bits % 2_000_001) as f64 / 10f64.powi((bits >> 40) as i32 % 9),
                // Numbers near a power of ten, where rounding carries: 9.9996, 999.96.
                _ => 10f64.powi((bits % 31) as i32 - 15) * (1.0 - (bits >> 33) as f64 * 1e-12),
            };
            let value = if bits & (1 << 63) != 0 { -value } else { value };
            let digits = 1 + (next(&mut state) % 17) as u32;
            if !value.is_finite() {
                continue;
            }
            assert_eq!(
                format_significant(value, digits),
                exact_reference(value, digits),
                "{value:e} to {digits} figures"
            );
            compared += 1;
        }
        assert!(compared > 200_000, "only {compared} values compared");
    }
}
