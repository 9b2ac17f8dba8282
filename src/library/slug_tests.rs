//! Slug tests: hydraulic conductivity from the recovery of a head displaced in a well, by
//! Hvorslev (1951) and by Bouwer & Rice (1976) with the published polynomial fits of their
//! coefficient curves.
//!
//! Each method comes both ways: K from one normalised head h/h0 read at time t (the
//! `_conductivity` relations), and h/h0 at time t from K (the `_head_ratio` relations), the
//! model a `fit` line matches to a recorded head–time series to give K with its uncertainty.

use super::dimensions::{DIMENSIONLESS, LENGTH, TIME, VELOCITY};
use super::relation::{arguments, Domain, Form, Parameter, Relation};
use crate::eval::function::CallError;
use crate::eval::Formulation;

/// Hvorslev's basic time lag for a well screen in a uniform soil.
pub static HVORSLEV: Formulation = Formulation {
    id: "hvorslev-1951",
    title: "Hvorslev slug test, K = r_c^2 ln(L_e / R) / (2 L_e t) ln(h0 / h)",
    citation: "Hvorslev, M. J., 1951, Time lag and soil permeability in ground-water \
observations, Bulletin 36, Waterways Experiment Station, Corps of Engineers, U.S. Army, \
Vicksburg, Mississippi (shape case 8)",
    validity: "a screen of length L_e and radius R in a uniform, isotropic soil of infinite \
extent, L_e / R above 8; casing radius r_c where the water level moves; negligible storage \
(the recovery is exponential)",
    ranges: &[],
};

/// Bouwer and Rice's slug test, with the polynomial fits of their curves.
pub static BOUWER_RICE: Formulation = Formulation {
    id: "bouwer-rice-1976",
    title: "Bouwer-Rice slug test, K = r_c^2 ln(R_e / r_w) / (2 L_e t) ln(y0 / y)",
    citation: "Bouwer, H. and Rice, R. C., 1976, A slug test for determining hydraulic \
conductivity of unconfined aquifers with completely or partially penetrating wells, Water \
Resources Research 12(3), 423-428; coefficients A, B and C by the polynomial fits of the \
published curves in Van Rooy, D., 1988, Ground Water 26(1) (coefficients from memory)",
    validity: "a well screened over L_e with its bottom L_w below the water table in an \
unconfined aquifer of saturated thickness D (L_e <= L_w <= D); L_e / r_w from 4 to 2500, \
the span of the published curves; ln((D - L_w) / r_w) limited to 6 as published; negligible \
storage",
    ranges: &[],
};

/// e^(−1): at this normalised head the time read is Hvorslev's basic time lag.
const BASIC_TIME_LAG_RATIO: f64 = 0.367_879_441_171_442_33;

const CASING_RADIUS: Parameter = Parameter::new(
    "rc",
    "the casing radius where the water level moves",
    LENGTH,
    Domain::Positive,
);
const SCREEN_LENGTH: Parameter =
    Parameter::new("Le", "the screen length", LENGTH, Domain::Positive);
const TIME_SINCE_START: Parameter = Parameter::new(
    "t",
    "the time since the slug was added",
    TIME,
    Domain::Positive,
);
const HEAD_RATIO: Parameter = Parameter::new(
    "ratio",
    "the normalised head h/h0 read at t",
    DIMENSIONLESS,
    Domain::OpenFraction,
)
.or(BASIC_TIME_LAG_RATIO);
const CONDUCTIVITY: Parameter =
    Parameter::new("K", "a hydraulic conductivity", VELOCITY, Domain::Positive);
const WELL_RADIUS: Parameter = Parameter::new(
    "rw",
    "the radius of the screen with its filter pack",
    LENGTH,
    Domain::Positive,
);
const WELL_DEPTH: Parameter = Parameter::new(
    "Lw",
    "the depth of the screen bottom below the water table",
    LENGTH,
    Domain::Positive,
);
const AQUIFER_THICKNESS: Parameter = Parameter::new(
    "D",
    "the saturated thickness of the aquifer",
    LENGTH,
    Domain::Positive,
);

pub static RELATIONS: &[Relation] = &[
    Relation {
        name: "hvorslev_conductivity",
        summary: "K = rc^2 ln(Le / R) / (2 Le t) ln(1 / ratio) (m/s) from the normalised head \
ratio = h/h0 at time t (left out: 1/e, so t is the basic time lag); Le / R > 8; Hvorslev 1951",
        forms: &[Form {
            parameters: &[
                CASING_RADIUS,
                Parameter::new("R", "the screen radius", LENGTH, Domain::Positive),
                SCREEN_LENGTH,
                TIME_SINCE_START,
                HEAD_RATIO,
            ],
            result: VELOCITY,
            unit: "m/s",
            formulations: &[&HVORSLEV],
            formula: "K = rc^2 * ln(Le / R) / (2 * Le * t) * ln(1 / ratio)",
            example: "hvorslev_conductivity(2.5 cm, 5 cm, 1.5 m, 300 s)",
            body: hvorslev_conductivity,
        }],
    },
    Relation {
        name: "hvorslev_head_ratio",
        summary: "normalised head h/h0 = exp(-2 K Le t / (rc^2 ln(Le / R))) at time t of a \
slug test (for fitting K to a record); Le / R > 8; Hvorslev 1951",
        forms: &[Form {
            parameters: &[
                CONDUCTIVITY,
                CASING_RADIUS,
                Parameter::new("R", "the screen radius", LENGTH, Domain::Positive),
                SCREEN_LENGTH,
                TIME_SINCE_START,
            ],
            result: DIMENSIONLESS,
            unit: "1",
            formulations: &[&HVORSLEV],
            formula: "h/h0 = exp(-2 * K * Le * t / (rc^2 * ln(Le / R)))",
            example: "hvorslev_head_ratio(1e-6 m/s, 2.5 cm, 5 cm, 1.5 m, 300 s)",
            body: hvorslev_head_ratio,
        }],
    },
    Relation {
        name: "bouwer_rice_conductivity",
        summary: "K = rc^2 ln(Re / rw) / (2 Le t) ln(1 / ratio) (m/s) from the normalised head \
ratio = y/y0 at time t (left out: 1/e); Le <= Lw <= D; Bouwer & Rice 1976",
        forms: &[Form {
            parameters: &[
                CASING_RADIUS,
                WELL_RADIUS,
                SCREEN_LENGTH,
                WELL_DEPTH,
                AQUIFER_THICKNESS,
                TIME_SINCE_START,
                HEAD_RATIO,
            ],
            result: VELOCITY,
            unit: "m/s",
            formulations: &[&BOUWER_RICE],
            formula: "K = rc^2 * ln(Re / rw) / (2 * Le * t) * ln(1 / ratio), ln(Re / rw) from rw, Le, Lw, D",
            example: "bouwer_rice_conductivity(5 cm, 10 cm, 3 m, 5 m, 20 m, 120 s, 0.3)",
            body: bouwer_rice_conductivity,
        }],
    },
    Relation {
        name: "bouwer_rice_head_ratio",
        summary: "normalised head y/y0 = exp(-2 K Le t / (rc^2 ln(Re / rw))) at time t of a \
slug test (for fitting K to a record); Bouwer & Rice 1976",
        forms: &[Form {
            parameters: &[
                CONDUCTIVITY,
                CASING_RADIUS,
                WELL_RADIUS,
                SCREEN_LENGTH,
                WELL_DEPTH,
                AQUIFER_THICKNESS,
                TIME_SINCE_START,
            ],
            result: DIMENSIONLESS,
            unit: "1",
            formulations: &[&BOUWER_RICE],
            formula: "y/y0 = exp(-2 * K * Le * t / (rc^2 * ln(Re / rw))), ln(Re / rw) from rw, Le, Lw, D",
            example: "bouwer_rice_head_ratio(1e-5 m/s, 5 cm, 10 cm, 3 m, 5 m, 20 m, 120 s)",
            body: bouwer_rice_head_ratio,
        }],
    },
];

/// Hvorslev's shape factor term ln(Le / R), refused where Le / R ≤ 8 (argument `Le`).
fn hvorslev_shape(screen_radius: f64, screen_length: f64, index: usize) -> Result<f64, CallError> {
    let ratio = screen_length / screen_radius;
    if ratio <= 8.0 {
        return Err(CallError::OutOfRange {
            argument: Some(index),
            message: format!(
                "Le / R = {} is not above 8, where Hvorslev's simplified shape factor holds",
                crate::numeric::message_number(ratio)
            ),
        });
    }
    Ok(ratio.ln())
}

fn hvorslev_conductivity(values: &[f64]) -> Result<f64, CallError> {
    let [casing, screen_radius, screen_length, time, ratio] = arguments(values);
    let shape = hvorslev_shape(screen_radius, screen_length, 2)?;
    Ok(casing * casing * shape / (2.0 * screen_length * time) * (1.0 / ratio).ln())
}

fn hvorslev_head_ratio(values: &[f64]) -> Result<f64, CallError> {
    let [conductivity, casing, screen_radius, screen_length, time] = arguments(values);
    let shape = hvorslev_shape(screen_radius, screen_length, 3)?;
    Ok((-2.0 * conductivity * screen_length * time / (casing * casing * shape)).exp())
}

/// Bouwer & Rice's ln(Re / rw) from the geometry, with A, B, C by the published fits in
/// x = Le / rw. Refuses Le > Lw or Lw > D (at those arguments) and x outside the curves.
pub fn bouwer_rice_shape(
    well_radius: f64,
    screen_length: f64,
    well_depth: f64,
    thickness: f64,
    first: usize,
) -> Result<f64, CallError> {
    if screen_length > well_depth {
        return Err(CallError::Domain {
            argument: Some(first + 1),
            message: "`Le` must not exceed `Lw`: the screen lies below the water table".to_string(),
        });
    }
    if well_depth > thickness {
        return Err(CallError::Domain {
            argument: Some(first + 2),
            message: "`Lw` must not exceed `D`: the well ends inside the aquifer".to_string(),
        });
    }
    let x = screen_length / well_radius;
    if !(4.0..=2500.0).contains(&x) {
        return Err(CallError::OutOfRange {
            argument: Some(first + 1),
            message: format!(
                "Le / rw = {} is outside 4 to 2500, the span of the published Bouwer-Rice curves",
                crate::numeric::message_number(x)
            ),
        });
    }
    let depth_term = 1.1 / (well_depth / well_radius).ln();
    let inverse = if well_depth < thickness {
        let a = polynomial(
            x,
            &[1.472, 3.537e-2, -8.148e-5, 1.028e-7, -6.484e-11, 1.573e-14],
        );
        let b = polynomial(x, &[0.2372, 5.151e-3, -2.682e-6, -3.491e-10, 4.738e-13]);
        let below = ((thickness - well_depth) / well_radius).ln().min(6.0);
        depth_term + (a + b * below) / x
    } else {
        let c = polynomial(x, &[0.7920, 3.993e-2, -5.743e-5, 3.858e-8, -9.659e-12]);
        depth_term + c / x
    };
    Ok(1.0 / inverse)
}

/// c0 + c1 x + c2 x² + … by Horner's rule.
fn polynomial(x: f64, coefficients: &[f64]) -> f64 {
    coefficients.iter().rev().fold(0.0, |sum, c| sum * x + c)
}

fn bouwer_rice_conductivity(values: &[f64]) -> Result<f64, CallError> {
    let [casing, well_radius, screen_length, well_depth, thickness, time, ratio] =
        arguments(values);
    let shape = bouwer_rice_shape(well_radius, screen_length, well_depth, thickness, 1)?;
    Ok(casing * casing * shape / (2.0 * screen_length * time) * (1.0 / ratio).ln())
}

fn bouwer_rice_head_ratio(values: &[f64]) -> Result<f64, CallError> {
    let [conductivity, casing, well_radius, screen_length, well_depth, thickness, time] =
        arguments(values);
    let shape = bouwer_rice_shape(well_radius, screen_length, well_depth, thickness, 2)?;
    Ok((-2.0 * conductivity * screen_length * time / (casing * casing * shape)).exp())
}

#[cfg(test)]
mod tests {
    //! The slug-test relations against hand computations of the published formulas and the
    //! published coefficient curves, through `check`.

    use super::*;
    use crate::library::testing::{check, number, si, Expected, CM};

    #[test]
    fn hvorslev_basic_time_lag() {
        // rc = 2.5 cm, R = 5 cm, Le = 1.5 m, T0 = 300 s: K = 0.025^2 ln(30) / (2 x 1.5 x 300)
        // = 2.3619e-6 m/s (hand arithmetic of Hvorslev's case 8).
        let expected = 0.025_f64.powi(2) * 30_f64.ln() / (2.0 * 1.5 * 300.0);
        let arguments = [
            si(2.5 * CM, LENGTH),
            si(5.0 * CM, LENGTH),
            si(1.5, LENGTH),
            si(300.0, TIME),
        ];
        check(
            "hvorslev_conductivity",
            &arguments,
            Expected::Value(expected, VELOCITY, 1e-14),
            "Hvorslev 1951 case 8 at the basic time lag",
        );
        assert!((expected - 2.3619e-6).abs() < 1e-10);
        // Reading h/h0 = 0.5 at 208 s is the same exponential: ln 2 / 208 = 1 / T0' .
        let mut half = arguments.to_vec();
        half[3] = si(300.0 * 2_f64.ln(), TIME);
        half.push(number(0.5));
        check(
            "hvorslev_conductivity",
            &half,
            Expected::Value(expected, VELOCITY, 1e-12),
            "the same recovery read at h/h0 = 0.5",
        );
        // The forward model gives back the ratio.
        check(
            "hvorslev_head_ratio",
            &[
                si(expected, VELOCITY),
                si(2.5 * CM, LENGTH),
                si(5.0 * CM, LENGTH),
                si(1.5, LENGTH),
                si(300.0, TIME),
            ],
            Expected::Value(BASIC_TIME_LAG_RATIO, DIMENSIONLESS, 1e-12),
            "forward model at T0",
        );
        // A short screen: Le / R = 6 is outside the formula.
        check(
            "hvorslev_conductivity",
            &[
                si(2.5 * CM, LENGTH),
                si(5.0 * CM, LENGTH),
                si(0.3, LENGTH),
                si(300.0, TIME),
            ],
            Expected::OutOfRange(2),
            "Le / R below 8",
        );
    }

    #[test]
    fn bouwer_rice_coefficients_follow_the_published_curves() {
        // Bouwer & Rice 1976, fig. 3, read from the curves (from memory, to about 5 %):
        // at Le / rw = 10, A about 1.8, B about 0.29, C about 1.2.
        let fits = |x: f64| {
            (
                polynomial(
                    x,
                    &[1.472, 3.537e-2, -8.148e-5, 1.028e-7, -6.484e-11, 1.573e-14],
                ),
                polynomial(x, &[0.2372, 5.151e-3, -2.682e-6, -3.491e-10, 4.738e-13]),
                polynomial(x, &[0.7920, 3.993e-2, -5.743e-5, 3.858e-8, -9.659e-12]),
            )
        };
        for (x, (a, b, c)) in [(10.0, (1.8, 0.29, 1.2))] {
            let (fa, fb, fc) = fits(x);
            for (found, read) in [(fa, a), (fb, b), (fc, c)] {
                assert!(
                    ((found - read) / read).abs() < 0.08,
                    "x = {x}: {found} vs {read}"
                );
            }
        }
    }

    #[test]
    fn bouwer_rice_conductivity_by_hand() {
        // rc = 5 cm, rw = 10 cm, Le = 3 m, Lw = 5 m, D = 20 m, y/y0 = 0.3 at 120 s.
        let x: f64 = 30.0;
        let a = 1.472 + 3.537e-2 * x - 8.148e-5 * x * x + 1.028e-7 * x.powi(3)
            - 6.484e-11 * x.powi(4)
            + 1.573e-14 * x.powi(5);
        let b = 0.2372 + 5.151e-3 * x - 2.682e-6 * x * x - 3.491e-10 * x.powi(3)
            + 4.738e-13 * x.powi(4);
        let below = (15.0_f64 / 0.1).ln().min(6.0);
        let shape = 1.0 / (1.1 / 50.0_f64.ln() + (a + b * below) / x);
        let expected = 0.05_f64.powi(2) * shape / (2.0 * 3.0 * 120.0) * (1.0_f64 / 0.3).ln();
        let arguments = [
            si(5.0 * CM, LENGTH),
            si(10.0 * CM, LENGTH),
            si(3.0, LENGTH),
            si(5.0, LENGTH),
            si(20.0, LENGTH),
            si(120.0, TIME),
            number(0.3),
        ];
        check(
            "bouwer_rice_conductivity",
            &arguments,
            Expected::Value(expected, VELOCITY, 1e-13),
            "Bouwer & Rice 1976 eqs. by hand, partial penetration",
        );
        // Fully penetrating: Lw = D uses C.
        let c =
            0.7920 + 3.993e-2 * x - 5.743e-5 * x * x + 3.858e-8 * x.powi(3) - 9.659e-12 * x.powi(4);
        let shape_full = 1.0 / (1.1 / 200.0_f64.ln() + c / x);
        let full = 0.05_f64.powi(2) * shape_full / (2.0 * 3.0 * 120.0) * (1.0_f64 / 0.3).ln();
        let mut penetrating = arguments;
        penetrating[3] = si(20.0, LENGTH);
        check(
            "bouwer_rice_conductivity",
            &penetrating,
            Expected::Value(full, VELOCITY, 1e-13),
            "Bouwer & Rice 1976 eqs. by hand, full penetration",
        );
        // The forward model inverts it.
        check(
            "bouwer_rice_head_ratio",
            &[
                si(expected, VELOCITY),
                si(5.0 * CM, LENGTH),
                si(10.0 * CM, LENGTH),
                si(3.0, LENGTH),
                si(5.0, LENGTH),
                si(20.0, LENGTH),
                si(120.0, TIME),
            ],
            Expected::Value(0.3, DIMENSIONLESS, 1e-12),
            "forward model",
        );
        let mut too_deep = arguments;
        too_deep[3] = si(25.0, LENGTH);
        check(
            "bouwer_rice_conductivity",
            &too_deep,
            Expected::Domain(3),
            "Lw beyond D",
        );
    }
}
