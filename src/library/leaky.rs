//! Flow to a well in a leaky confined aquifer (Hantush–Jacob): the leaky well function
//! W(u, r/B) and the drawdown built on it.
//!
//! W(u, β) = ∫_u^∞ exp(−y − β²/(4y)) / y dy is computed, not read from a table: where
//! u ≥ β/2 by the convergent series Σ (−β²/(4u))ⁿ/n! · E_{n+1}(u), whose ratio β²/(4u) is then at
//! most β/2; below, through the exact reflection W(u, β) = 2 K0(β) − W(β²/(4u), β), which maps u
//! above β/2. K0 is the trapezoid rule on ∫_0^∞ exp(−β cosh t) dt, exact to rounding for an
//! integrand analytic in a strip. Checked in the tests against an independent quadrature.

use super::dimensions::{AREA_PER_TIME, DIMENSIONLESS, LENGTH, TIME, VOLUME_FLOW_RATE};
use super::relation::{arguments, Domain, Form, Parameter, Relation};
use super::wells::well_function;
use crate::eval::function::CallError;
use crate::eval::Formulation;
use std::f64::consts::PI;

/// Hantush and Jacob's leaky aquifer.
pub static HANTUSH_JACOB: Formulation = Formulation {
    id: "hantush-jacob-1955",
    title: "Hantush-Jacob equation, s = Q / (4 pi T) W(u, r/B), u = r^2 S / (4 T t), \
B = sqrt(T b' / K')",
    citation: "Hantush, M. S. and Jacob, C. E., 1955, Non-steady radial flow in an infinite \
leaky aquifer, Transactions, American Geophysical Union 36(1), 95-100",
    validity: "confined aquifer of infinite extent leaking through an aquitard of thickness b' \
and conductivity K' from an unpumped layer of constant head; no storage in the aquitard; Theis \
conditions otherwise; r/B up to 10",
    ranges: &[],
};

/// The leaky well function itself.
pub static LEAKY_WELL_FUNCTION: Formulation = Formulation {
    id: "hantush-well-function",
    title: "leaky well function W(u, r/B) = integral from u to infinity of \
exp(-y - (r/B)^2 / (4 y)) / y dy",
    citation: "Hantush, M. S., 1956, Analysis of data from pumping tests in leaky aquifers, \
Transactions, American Geophysical Union 37(6), 702-714 (the table of W(u, r/B))",
    validity: "u > 0 and r/B from 0 to 10; this implementation agrees with an independent \
quadrature to 1e-10 relative for u from 1e-6 to 10 and r/B from 1e-3 to 6, beyond the \
published table",
    ranges: &[],
};

/// Above this r/B the series' cancellation grows (as exp(r/B)); 10 keeps it under 1e-11.
const LARGEST_BETA: f64 = 10.0;

const RATE: Parameter = Parameter::new(
    "Q",
    "a pumping rate (negative for injection)",
    VOLUME_FLOW_RATE,
    Domain::Any,
);

pub static RELATIONS: &[Relation] = &[
    Relation {
        name: "hantush_well_function",
        summary: "leaky well function W(u, r/B) (dimensionless), u > 0, r/B from 0 to 10; \
W(u, 0) = W(u); Hantush 1956",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "u",
                    "the argument r^2 S / (4 T t)",
                    DIMENSIONLESS,
                    Domain::Positive,
                ),
                Parameter::new(
                    "beta",
                    "the ratio r/B of distance to leakage factor",
                    DIMENSIONLESS,
                    Domain::NonNegative,
                ),
            ],
            result: DIMENSIONLESS,
            unit: "1",
            formulations: &[&LEAKY_WELL_FUNCTION],
            formula:
                "W(u, beta) = integral of exp(-y - beta^2 / (4 * y)) / y dy from u to infinity",
            example: "hantush_well_function(0.01, 0.1)",
            body: hantush_well_function,
        }],
    },
    Relation {
        name: "hantush_drawdown",
        summary: "drawdown s = Q / (4 pi T) W(u, r/B) (m) in a leaky confined aquifer, \
u = r^2 S / (4 T t), leakage factor B = sqrt(T b' / K'); Hantush & Jacob 1955",
        forms: &[Form {
            parameters: &[
                RATE,
                Parameter::new("T", "a transmissivity", AREA_PER_TIME, Domain::Positive),
                Parameter::new(
                    "S",
                    "a storage coefficient",
                    DIMENSIONLESS,
                    Domain::Fraction,
                ),
                Parameter::new("r", "the distance from the well", LENGTH, Domain::Positive),
                Parameter::new("t", "the time since pumping began", TIME, Domain::Positive),
                Parameter::new(
                    "B",
                    "the leakage factor sqrt(T b' / K')",
                    LENGTH,
                    Domain::Positive,
                ),
            ],
            result: LENGTH,
            unit: "m",
            formulations: &[&HANTUSH_JACOB, &LEAKY_WELL_FUNCTION],
            formula: "s = Q / (4 * pi * T) * W(r^2 * S / (4 * T * t), r / B)",
            example: "hantush_drawdown(15 L/s, 2e-3 m^2/s, 1e-4, 30 m, 1 d, 600 m)",
            body: hantush_drawdown,
        }],
    },
];

fn hantush_well_function(values: &[f64]) -> Result<f64, CallError> {
    let [u, beta] = arguments(values);
    require_table_beta(beta, 1, "`beta` must be at most 10")?;
    Ok(leaky_well_function(u, beta))
}

/// Refuses r/B above 10, where the series loses digits and the table stops long before.
fn require_table_beta(beta: f64, argument: usize, advice: &str) -> Result<(), CallError> {
    if beta > LARGEST_BETA {
        return Err(CallError::OutOfRange {
            argument: Some(argument),
            message: format!(
                "r/B = {} is above {LARGEST_BETA}, beyond the range of the leaky well function \
(there the drawdown is essentially the steady 2 K0(r/B) and tiny); {advice}",
                crate::numeric::message_number(beta)
            ),
        });
    }
    Ok(())
}

/// s = Q / (4π T) W(u, r/B); r/B above 10 is refused at `B`.
fn hantush_drawdown(values: &[f64]) -> Result<f64, CallError> {
    let [discharge, transmissivity, storativity, radius, time, leakage] = arguments(values);
    let beta = radius / leakage;
    require_table_beta(beta, 5, "`B` must be at least r/10")?;
    let u = radius * radius * storativity / (4.0 * transmissivity * time);
    Ok(discharge / (4.0 * PI * transmissivity) * leaky_well_function(u, beta))
}

/// Hantush's leaky well function W(u, β) for u > 0, 0 ≤ β ≤ 10.
pub fn leaky_well_function(u: f64, beta: f64) -> f64 {
    if beta == 0.0 {
        return well_function(u);
    }
    if u >= beta / 2.0 {
        leaky_series(u, beta)
    } else {
        2.0 * bessel_k0(beta) - leaky_series(beta * beta / (4.0 * u), beta)
    }
}

/// Σ (−x)ⁿ/n! · E_{n+1}(u), x = β²/(4u) ≤ β/2: E_{n+1} by the upward recurrence
/// E_{n+1} = (e^(−u) − u E_n)/n, whose errors the factor xⁿ/n! damps (u x = β²/4).
fn leaky_series(u: f64, beta: f64) -> f64 {
    let x = beta * beta / (4.0 * u);
    let decay = (-u).exp();
    let mut exponential_integral = well_function(u);
    let mut coefficient = 1.0;
    let mut sum = exponential_integral;
    for n in 1..400 {
        let n = n as f64;
        exponential_integral = (decay - u * exponential_integral) / n;
        coefficient *= -x / n;
        let term = coefficient * exponential_integral;
        sum += term;
        if term.abs() <= 1e-17 * sum.abs() && n > x {
            break;
        }
    }
    sum
}

/// K0(x) for x > 0 by the trapezoid rule on ∫_0^∞ exp(−x cosh t) dt with step 0.05: the
/// error falls as exp(−π²/h), far below rounding.
pub fn bessel_k0(x: f64) -> f64 {
    const STEP: f64 = 0.05;
    let mut sum = 0.5 * (-x).exp();
    let mut k = 1.0;
    loop {
        let term = (-x * (k * STEP).cosh()).exp();
        sum += term;
        if term <= 1e-18 * sum {
            break;
        }
        k += 1.0;
    }
    sum * STEP
}

#[cfg(test)]
mod tests {
    //! W(u, r/B) against an independent quadrature and the published table's steady limits;
    //! the drawdown through `check`.

    use super::*;
    use crate::library::testing::{check, number, si, Expected};

    /// W(u, β) by the trapezoid rule in y = u + e^s over s from ln u − 40 to ln 800: the
    /// integrand is analytic in a strip and decays at both ends, so the rule converges
    /// geometrically; independent of the series and the reflection above.
    fn quadrature(u: f64, beta: f64) -> f64 {
        let step = 0.01;
        let (low, high) = (u.ln() - 40.0, 800_f64.ln());
        let mut sum = 0.0;
        let mut s = low;
        while s <= high {
            let e = s.exp();
            let y = u + e;
            sum += (-y - beta * beta / (4.0 * y)).exp() / y * e;
            s += step;
        }
        sum * step
    }

    #[test]
    fn leaky_well_function_matches_quadrature() {
        let mut worst: f64 = 0.0;
        for u in [
            1e-6, 5e-6, 1e-5, 5e-5, 1e-4, 5e-4, 1e-3, 5e-3, 0.01, 0.05, 0.1, 0.5, 1.0, 2.0, 5.0,
            10.0,
        ] {
            {
                for beta in [
                    1e-3, 0.01, 0.05, 0.1, 0.3, 0.5, 1.0, 1.5, 2.0, 3.0, 4.0, 6.0,
                ] {
                    let expected = quadrature(u, beta);
                    let found = leaky_well_function(u, beta);
                    let relative = ((found - expected) / expected).abs();
                    worst = worst.max(relative);
                    assert!(
                        relative < 1e-10,
                        "W({u}, {beta}) = {found} vs quadrature {expected}: {relative:e}"
                    );
                }
            }
        }
        assert!(worst > 0.0);
    }

    #[test]
    fn bessel_k0_matches_the_published_table() {
        // Abramowitz and Stegun 1964, table 9.8 (values from memory, to the digits shown).
        for (x, k0) in [
            (0.1, 2.427_069_025),
            (1.0, 0.421_024_438_2),
            (2.0, 0.113_893_872_7),
            (5.0, 3.691_098_334e-3),
        ] {
            assert!(((bessel_k0(x) - k0) / k0).abs() < 1e-9, "K0({x})");
        }
    }

    #[test]
    fn the_table_steady_column_and_theis_limit() {
        // Hantush 1956's table: for small u, W(u, r/B) tends to 2 K0(r/B): 9.4425 at r/B =
        // 0.01, 4.8541 at 0.1, 0.8420 at 1.0 (printed values, from memory).
        for (beta, printed) in [(0.01, 9.4425), (0.1, 4.8541), (1.0, 0.8420)] {
            check(
                "hantush_well_function",
                &[number(1e-9), number(beta)],
                Expected::Value(printed, DIMENSIONLESS, 6e-5 / printed),
                "Hantush 1956 table, steady column",
            );
        }
        // r/B = 0 is the Theis well function: W(0.01) = 4.0379 (Theis table).
        check(
            "hantush_well_function",
            &[number(0.01), number(0.0)],
            Expected::Value(4.037_929_6, DIMENSIONLESS, 1e-7),
            "r/B = 0 is Theis",
        );
        check(
            "hantush_well_function",
            &[number(0.01), number(10.5)],
            Expected::OutOfRange(1),
            "beyond r/B = 10",
        );
    }

    #[test]
    fn drawdown_is_the_scaled_function() {
        // Q = 4 pi m^3/s, T = 1 m^2/s make s = W; r = 10 m, B = 100 m, S = 4e-4, t = 1 s
        // give u = 100 x 4e-4 / 4 = 0.01 and r/B = 0.1.
        let arguments = [
            si(4.0 * PI, VOLUME_FLOW_RATE),
            si(1.0, AREA_PER_TIME),
            number(4e-4),
            si(10.0, LENGTH),
            si(1.0, TIME),
            si(100.0, LENGTH),
        ];
        check(
            "hantush_drawdown",
            &arguments,
            Expected::Value(quadrature(0.01, 0.1), LENGTH, 1e-9),
            "closed form through quadrature",
        );
        let mut too_leaky = arguments;
        too_leaky[5] = si(0.5, LENGTH);
        check(
            "hantush_drawdown",
            &too_leaky,
            Expected::OutOfRange(5),
            "r/B = 20",
        );
    }
}
