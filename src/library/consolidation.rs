//! Consolidation: the linear stress–strain law (Hooke) through the soil's compressibility,
//! coupled with Darcy's law for the water squeezed out, as in Terzaghi's one-dimensional theory.
//!
//! Hooke gives the constrained (oedometric) modulus M and its inverse, the coefficient of volume
//! compressibility m_v; Darcy's K over m_v γ_w is the coefficient of consolidation c_v; the time
//! factor T_v = c_v t / H_dr² sets the average degree of consolidation U from Terzaghi's series.
//! U(T_v) is computed here, not read from a table, and inverted for the time to reach a given U.

use super::dimensions::{
    AREA_PER_TIME, COMPRESSIBILITY, DIMENSIONLESS, LENGTH, PRESSURE, PRESSURE_GRADIENT, TIME,
    VELOCITY,
};
use super::relation::{arguments, Domain, Form, Parameter, Relation};
use crate::eval::function::CallError;
use crate::eval::Formulation;
use crate::numeric::message_number;
use std::f64::consts::PI;

const TERZAGHI_1925: &str = "Terzaghi, K., 1925, Erdbaumechanik auf bodenphysikalischer \
Grundlage, Franz Deuticke, Leipzig und Wien; Taylor, D. W., 1948, Fundamentals of Soil \
Mechanics, John Wiley & Sons, New York, chapter 10";

/// Hooke's law in one dimension.
pub static HOOKE: Formulation = Formulation {
    id: "hooke-linear-elastic",
    title: "Hooke's law, sigma = E epsilon",
    citation: "Timoshenko, S. P. and Goodier, J. N., 1951, Theory of Elasticity, 2nd ed., \
McGraw-Hill, New York, chapter 1",
    validity: "linear elastic material; E the modulus of the loading: Young's modulus under \
uniaxial stress, the constrained modulus M with no lateral strain; soils only over a small \
range of stress around the state at which the modulus was measured",
    ranges: &[],
};
/// The constrained modulus from Young's modulus and Poisson's ratio.
pub static CONSTRAINED_MODULUS: Formulation = Formulation {
    id: "constrained-modulus",
    title: "constrained (oedometric) modulus, M = E (1 - nu) / ((1 + nu)(1 - 2 nu))",
    citation: "Timoshenko, S. P. and Goodier, J. N., 1951, Theory of Elasticity, 2nd ed., \
McGraw-Hill, New York (Hooke's law with no lateral strain); Lambe, T. W. and Whitman, R. V., \
1969, Soil Mechanics, John Wiley & Sons, New York, chapter 12",
    validity: "isotropic linear elastic soil skeleton loaded with no lateral strain (an \
oedometer, a wide fill on a thin layer); drained E and nu; nu in [0, 0.5)",
    ranges: &[],
};
/// The coefficient of volume compressibility.
pub static VOLUME_COMPRESSIBILITY: Formulation = Formulation {
    id: "volume-compressibility",
    title: "coefficient of volume compressibility, m_v = 1 / M = (e0 - e1) / ((1 + e0) \
dsigma')",
    citation: "Terzaghi, K., 1925, Erdbaumechanik; Craig, R. F., 2004, Craig's Soil Mechanics, \
7th ed., Spon Press, London, chapter 7",
    validity: "one-dimensional (oedometric) compression over the stress increment dsigma' of \
interest: m_v depends on the stress range",
    ranges: &[],
};
/// The coefficient of consolidation: Darcy over Hooke.
pub static CONSOLIDATION_COEFFICIENT: Formulation = Formulation {
    id: "consolidation-coefficient",
    title: "coefficient of consolidation, c_v = K / (m_v gamma_w)",
    citation: TERZAGHI_1925,
    validity: "saturated soil, incompressible water and grains, Darcy flow; K and m_v taken \
constant over the stress increment",
    ranges: &[],
};
/// Terzaghi's one-dimensional consolidation: time factor and average degree.
pub static TERZAGHI_CONSOLIDATION: Formulation = Formulation {
    id: "terzaghi-1925-consolidation",
    title: "Terzaghi's one-dimensional consolidation, U = 1 - sum 2/M^2 exp(-M^2 T_v), \
M = pi (2m + 1) / 2, T_v = c_v t / H_dr^2",
    citation: TERZAGHI_1925,
    validity: "one-dimensional vertical drainage and compression of a saturated homogeneous \
layer; excess pore pressure initially uniform with depth (a wide load applied at once); H_dr \
the longest drainage path (half the layer drained on both faces, all of it drained on one); \
constant c_v; primary consolidation only (no creep)",
    ranges: &[],
};
/// Primary settlement of a layer.
pub static PRIMARY_SETTLEMENT: Formulation = Formulation {
    id: "primary-settlement",
    title: "primary consolidation settlement of a layer, s = m_v dsigma' H, or s = Cc H / \
(1 + e0) log10((sigma0' + dsigma') / sigma0')",
    citation: "Terzaghi, K. and Peck, R. B., 1967, Soil Mechanics in Engineering Practice, \
2nd ed., John Wiley & Sons, New York, article 13; Craig, R. F., 2004, Craig's Soil Mechanics, \
7th ed., Spon Press, London, chapter 7",
    validity: "one-dimensional compression of a layer of thickness H under a wide load; m_v \
for the stress increment, or Cc for a normally consolidated clay loaded along its virgin \
compression line; divide thick layers into sublayers",
    ranges: &[],
};

const YOUNG_MODULUS: Parameter =
    Parameter::new("E", "a Young's modulus", PRESSURE, Domain::Positive);
const COMPRESSIBILITY_PARAMETER: Parameter = Parameter::new(
    "m_v",
    "a coefficient of volume compressibility",
    COMPRESSIBILITY,
    Domain::Positive,
);
const CONSOLIDATION_C: Parameter = Parameter::new(
    "c_v",
    "a coefficient of consolidation",
    AREA_PER_TIME,
    Domain::Positive,
);
const DRAINAGE_PATH: Parameter = Parameter::new(
    "H_dr",
    "the longest drainage path",
    LENGTH,
    Domain::Positive,
);
const STRESS_INCREMENT: Parameter = Parameter::new(
    "dsigma",
    "an effective stress increment",
    PRESSURE,
    Domain::Positive,
);
const LAYER_THICKNESS: Parameter =
    Parameter::new("H", "the layer thickness", LENGTH, Domain::Positive);
const INITIAL_VOID_RATIO: Parameter = Parameter::new(
    "e0",
    "an initial void ratio",
    DIMENSIONLESS,
    Domain::Positive,
);
/// γ_w = 1000 kg/m³ × g0, the conventional unit weight of water (the same as the `mH2O`
/// unit's factor).
const UNIT_WEIGHT_OF_WATER: f64 = 1000.0 * 9.80665;

pub static RELATIONS: &[Relation] = &[
    Relation {
        name: "hooke_stress",
        summary: "stress sigma = E epsilon (Pa) from a strain and a modulus (Young's under \
uniaxial stress, the constrained modulus with no lateral strain), the linear stress-strain law; \
Hooke",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "E",
                    "an elastic modulus (Young's, or constrained)",
                    PRESSURE,
                    Domain::Positive,
                ),
                Parameter::new(
                    "epsilon",
                    "a strain (negative in extension)",
                    DIMENSIONLESS,
                    Domain::Any,
                ),
            ],
            result: PRESSURE,
            unit: "kPa",
            formulations: &[&HOOKE],
            formula: "sigma = E * epsilon",
            example: "hooke_stress(8 MPa, 0.5 %)",
            body: hooke_stress,
        }],
    },
    Relation {
        name: "constrained_modulus",
        summary: "constrained (oedometric) modulus M = E (1 - nu) / ((1 + nu)(1 - 2 nu)) (Pa) \
from Young's modulus E and Poisson's ratio nu (0 to below 0.5); no lateral strain",
        forms: &[Form {
            parameters: &[
                YOUNG_MODULUS,
                Parameter::new(
                    "nu",
                    "a Poisson's ratio",
                    DIMENSIONLESS,
                    // M diverges at 0.5, an incompressible skeleton.
                    Domain::from_up_to_below(0.0, 0.5, ""),
                ),
            ],
            result: PRESSURE,
            unit: "MPa",
            formulations: &[&CONSTRAINED_MODULUS],
            formula: "M = E * (1 - nu) / ((1 + nu) * (1 - 2 * nu))",
            example: "constrained_modulus(8 MPa, 0.3)",
            body: constrained_modulus,
        }],
    },
    Relation {
        name: "volume_compressibility",
        summary: "coefficient of volume compressibility m_v (1/Pa): 1 / M from a constrained \
modulus, or (e0 - e1) / ((1 + e0) dsigma) from an oedometer stage, void ratio e0 falling to e1 \
under the effective stress increment dsigma",
        forms: &[
            Form {
                parameters: &[Parameter::new(
                    "M",
                    "a constrained (oedometric) modulus",
                    PRESSURE,
                    Domain::Positive,
                )],
                result: COMPRESSIBILITY,
                unit: "m^2/MN",
                formulations: &[&VOLUME_COMPRESSIBILITY],
                formula: "m_v = 1 / M",
                example: "volume_compressibility(10.8 MPa)",
                body: volume_compressibility_from_modulus,
            },
            Form {
                parameters: &[
                    INITIAL_VOID_RATIO,
                    Parameter::new(
                        "e1",
                        "the void ratio at the end of the stage",
                        DIMENSIONLESS,
                        Domain::Positive,
                    ),
                    STRESS_INCREMENT,
                ],
                result: COMPRESSIBILITY,
                unit: "m^2/MN",
                formulations: &[&VOLUME_COMPRESSIBILITY],
                formula: "m_v = (e0 - e1) / ((1 + e0) * dsigma)",
                example: "volume_compressibility(1.20, 1.12, 100 kPa)",
                body: volume_compressibility_from_oedometer,
            },
        ],
    },
    Relation {
        name: "consolidation_coefficient",
        summary: "coefficient of consolidation c_v = K / (m_v gamma_w) (m^2/s); K hydraulic \
conductivity, m_v coefficient of volume compressibility, gamma_w unit weight of water (1000 \
kg/m^3 * g0 when left out); Terzaghi 1925",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "K",
                    "a hydraulic conductivity",
                    VELOCITY,
                    Domain::NonNegative,
                ),
                COMPRESSIBILITY_PARAMETER,
                Parameter::new(
                    "gamma_w",
                    "the unit weight of water",
                    PRESSURE_GRADIENT,
                    Domain::Positive,
                )
                .or(UNIT_WEIGHT_OF_WATER),
            ],
            result: AREA_PER_TIME,
            unit: "m^2/yr",
            formulations: &[&CONSOLIDATION_COEFFICIENT],
            formula: "c_v = K / (m_v * gamma_w)",
            example: "consolidation_coefficient(2e-10 m/s, 0.5 m^2/MN)",
            body: consolidation_coefficient,
        }],
    },
    Relation {
        name: "time_factor",
        summary: "consolidation time factor T_v = c_v t / H_dr^2 (dimensionless); c_v \
coefficient of consolidation, t time since loading, H_dr longest drainage path; Terzaghi 1925",
        forms: &[Form {
            parameters: &[
                CONSOLIDATION_C,
                Parameter::new("t", "the time since loading", TIME, Domain::NonNegative),
                DRAINAGE_PATH,
            ],
            result: DIMENSIONLESS,
            unit: "1",
            formulations: &[&TERZAGHI_CONSOLIDATION],
            formula: "T_v = c_v * t / H_dr^2",
            example: "time_factor(1.3 m^2/yr, 2 yr, 2.5 m)",
            body: time_factor,
        }],
    },
    Relation {
        name: "consolidation_degree",
        summary: "average degree of consolidation U(T_v) = 1 - sum 2/M^2 exp(-M^2 T_v), M = pi \
(2m + 1)/2 (dimensionless, 0 to 1) for a uniform initial excess pore pressure; full double \
precision; Terzaghi 1925",
        forms: &[Form {
            parameters: &[Parameter::new(
                "T_v",
                "a consolidation time factor",
                DIMENSIONLESS,
                Domain::NonNegative,
            )],
            result: DIMENSIONLESS,
            unit: "1",
            formulations: &[&TERZAGHI_CONSOLIDATION],
            formula: "U = 1 - sum(2 / M^2 * exp(-M^2 * T_v)), M = pi * (2 * m + 1) / 2",
            example: "consolidation_degree(0.197)",
            body: consolidation_degree,
        }],
    },
    Relation {
        name: "consolidation_time",
        summary: "time t = T_v(U) H_dr^2 / c_v (s) to reach the average degree of consolidation \
U, the inverse of consolidation_degree; c_v coefficient of consolidation, H_dr longest \
drainage path; Terzaghi 1925",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "U",
                    "an average degree of consolidation",
                    DIMENSIONLESS,
                    Domain::OpenFraction,
                ),
                CONSOLIDATION_C,
                DRAINAGE_PATH,
            ],
            result: TIME,
            unit: "yr",
            formulations: &[&TERZAGHI_CONSOLIDATION],
            formula: "t = T_v(U) * H_dr^2 / c_v",
            example: "consolidation_time(0.9, 1.3 m^2/yr, 2.5 m)",
            body: consolidation_time,
        }],
    },
    Relation {
        name: "primary_settlement",
        summary: "primary consolidation settlement of a layer (m): s = m_v dsigma H from a \
coefficient of volume compressibility, or s = Cc H / (1 + e0) log10((sigma0 + dsigma) / \
sigma0) from a compression index Cc, initial void ratio e0 and initial effective stress sigma0",
        forms: &[
            Form {
                parameters: &[COMPRESSIBILITY_PARAMETER, STRESS_INCREMENT, LAYER_THICKNESS],
                result: LENGTH,
                unit: "mm",
                formulations: &[&PRIMARY_SETTLEMENT],
                formula: "s = m_v * dsigma * H",
                example: "primary_settlement(0.5 m^2/MN, 60 kPa, 5 m)",
                body: settlement_from_compressibility,
            },
            Form {
                parameters: &[
                    Parameter::new("Cc", "a compression index", DIMENSIONLESS, Domain::Positive),
                    INITIAL_VOID_RATIO,
                    Parameter::new(
                        "sigma0",
                        "the initial vertical effective stress",
                        PRESSURE,
                        Domain::Positive,
                    ),
                    STRESS_INCREMENT,
                    LAYER_THICKNESS,
                ],
                result: LENGTH,
                unit: "mm",
                formulations: &[&PRIMARY_SETTLEMENT],
                formula: "s = Cc * H / (1 + e0) * log10((sigma0 + dsigma) / sigma0)",
                example: "primary_settlement(0.45, 1.3, 40 kPa, 60 kPa, 5 m)",
                body: settlement_from_compression_index,
            },
        ],
    },
];

fn hooke_stress(values: &[f64]) -> Result<f64, CallError> {
    let [modulus, strain] = arguments(values);
    Ok(modulus * strain)
}

/// M = E (1 - ν) / ((1 + ν)(1 - 2ν)); the entry's domain keeps ν in [0, 0.5).
fn constrained_modulus(values: &[f64]) -> Result<f64, CallError> {
    let [modulus, poisson] = arguments(values);
    Ok(modulus * (1.0 - poisson) / ((1.0 + poisson) * (1.0 - 2.0 * poisson)))
}

fn volume_compressibility_from_modulus(values: &[f64]) -> Result<f64, CallError> {
    let [modulus] = arguments(values);
    Ok(1.0 / modulus)
}

fn volume_compressibility_from_oedometer(values: &[f64]) -> Result<f64, CallError> {
    let [initial, end, increment] = arguments(values);
    if end > initial {
        return Err(CallError::Domain {
            argument: Some(1),
            message: format!(
                "`e1` = {} is above `e0` = {}: the void ratio must fall under a load increment",
                message_number(end),
                message_number(initial)
            ),
        });
    }
    Ok((initial - end) / ((1.0 + initial) * increment))
}

fn consolidation_coefficient(values: &[f64]) -> Result<f64, CallError> {
    let [conductivity, compressibility, unit_weight] = arguments(values);
    Ok(conductivity / (compressibility * unit_weight))
}

fn time_factor(values: &[f64]) -> Result<f64, CallError> {
    let [coefficient, time, path] = arguments(values);
    Ok(coefficient * time / (path * path))
}

fn consolidation_degree(values: &[f64]) -> Result<f64, CallError> {
    let [factor] = arguments(values);
    Ok(average_degree(factor))
}

fn consolidation_time(values: &[f64]) -> Result<f64, CallError> {
    let [degree, coefficient, path] = arguments(values);
    Ok(time_factor_for_degree(degree) * path * path / coefficient)
}

fn settlement_from_compressibility(values: &[f64]) -> Result<f64, CallError> {
    let [compressibility, increment, thickness] = arguments(values);
    Ok(compressibility * increment * thickness)
}

fn settlement_from_compression_index(values: &[f64]) -> Result<f64, CallError> {
    let [index, void_ratio, initial_stress, increment, thickness] = arguments(values);
    Ok(index * thickness / (1.0 + void_ratio)
        * ((initial_stress + increment) / initial_stress).log10())
}

/// At and below this time factor U = 2 √(T_v / π): the terms the short-time form leaves out
/// are of order exp(−1/T_v) < 1e-40 there, while the series would need hundreds of terms.
const SHORT_TIME_LIMIT: f64 = 0.01;

/// Terzaghi's average degree of consolidation for a uniform initial excess pore pressure.
///
/// Above `SHORT_TIME_LIMIT`: U = 1 − Σ_{m≥0} 2/M² exp(−M² T_v), M = π(2m + 1)/2, summed until
/// a term falls below 1e-17 (at most about 60 terms); below it the short-time form.
pub fn average_degree(factor: f64) -> f64 {
    if factor <= SHORT_TIME_LIMIT {
        return 2.0 * (factor / PI).sqrt();
    }
    let mut remaining = 0.0;
    for m in 0.. {
        let eigenvalue = PI * (2 * m + 1) as f64 / 2.0;
        let term = 2.0 / (eigenvalue * eigenvalue) * (-eigenvalue * eigenvalue * factor).exp();
        remaining += term;
        if term < 1e-17 {
            break;
        }
    }
    1.0 - remaining
}

/// T_v at which the average degree of consolidation reaches `degree` in (0, 1), by bisection on
/// the monotone U(T_v) to the last bit. Below the short-time limit the closed inverse
/// T_v = π U² / 4 is exact.
pub fn time_factor_for_degree(degree: f64) -> f64 {
    if degree <= average_degree(SHORT_TIME_LIMIT) {
        return PI * degree * degree / 4.0;
    }
    let (mut low, mut high) = (SHORT_TIME_LIMIT, 1.0);
    while average_degree(high) < degree {
        low = high;
        high *= 2.0;
    }
    while high - low > f64::EPSILON * high {
        let middle = 0.5 * (low + high);
        if average_degree(middle) < degree {
            low = middle;
        } else {
            high = middle;
        }
    }
    0.5 * (low + high)
}

#[cfg(test)]
mod tests {
    //! Reference cases through `library::testing::check`, naming the source of each value.

    use super::{average_degree, time_factor_for_degree};
    use crate::library::dimensions::*;
    use crate::library::testing::*;

    const YEAR: f64 = 365.25 * DAY;

    /// The classic table of T_v against U for a uniform initial excess pore pressure (Taylor
    /// 1948; reprinted in most soil mechanics textbooks; from memory), to the three decimals
    /// printed there. Printings differ in the last digit at U = 0.6 (0.286 or 0.287); the
    /// series gives 0.28640.
    const TABLE: [(f64, f64); 10] = [
        (0.1, 0.008),
        (0.2, 0.031),
        (0.3, 0.071),
        (0.4, 0.126),
        (0.5, 0.197),
        (0.6, 0.286),
        (0.7, 0.403),
        (0.8, 0.567),
        (0.9, 0.848),
        (0.95, 1.129),
    ];

    #[test]
    fn the_time_factor_for_each_degree_matches_the_classic_table() {
        for (degree, tabled) in TABLE {
            let (time, _) = call(
                "consolidation_time",
                &[number(degree), si(1.0, AREA_PER_TIME), si(1.0, LENGTH)],
            );
            let factor = time.expect("a time").value;
            assert!(
                (factor - tabled).abs() <= 0.0005 + 1e-12,
                "U = {degree}: T_v {factor} vs table {tabled}"
            );
        }
        // The two a designer quotes, to the table's precision: T50 = 0.197, T90 = 0.848.
        check(
            "consolidation_degree",
            &[number(0.197)],
            Expected::Value(0.5, DIMENSIONLESS, 2e-3),
            "Taylor 1948 table, T50 = 0.197 (from memory)",
        );
        check(
            "consolidation_degree",
            &[number(0.848)],
            Expected::Value(0.9, DIMENSIONLESS, 1e-3),
            "Taylor 1948 table, T90 = 0.848 (from memory)",
        );
    }

    #[test]
    fn the_degree_matches_the_short_and_long_time_closed_forms() {
        // Short times: U = 2 sqrt(T/pi), exact to within terms of order exp(-1/T)
        // (Terzaghi 1925; common practice quotes it as accurate up to U = 0.6).
        for (factor, tolerance) in [(1e-6, 0.0), (1e-3, 0.0), (0.011, 1e-13), (0.05, 1e-8)] {
            let short = 2.0 * (factor / std::f64::consts::PI).sqrt();
            assert!(
                ((average_degree(factor) - short) / short).abs() <= tolerance,
                "T {factor}"
            );
        }
        // Long times: one term of the series, 1 - 8/pi^2 exp(-pi^2 T / 4), is exact once the
        // second is below double precision.
        let factor = 5.0_f64;
        let pi2 = std::f64::consts::PI.powi(2);
        check(
            "consolidation_degree",
            &[number(factor)],
            Expected::Value(
                1.0 - 8.0 / pi2 * (-pi2 * factor / 4.0).exp(),
                DIMENSIONLESS,
                1e-15,
            ),
            "first term of Terzaghi's series",
        );
        check(
            "consolidation_degree",
            &[number(0.0)],
            Expected::Value(0.0, DIMENSIONLESS, 0.0),
            "no time, no consolidation",
        );
    }

    #[test]
    fn the_inverse_round_trips() {
        for degree in [1e-6, 0.05, 0.1128, 0.11284, 0.3, 0.5, 0.9, 0.99, 0.999_999] {
            let factor = time_factor_for_degree(degree);
            assert!(
                ((average_degree(factor) - degree) / degree).abs() < 1e-13,
                "U {degree}"
            );
        }
        // Through the relations: time from U, then T_v from the time, then U again.
        let (c_v, path) = (1.3 / YEAR, 2.5);
        let (time, _) = call(
            "consolidation_time",
            &[number(0.9), si(c_v, AREA_PER_TIME), si(path, LENGTH)],
        );
        let (factor, _) = call(
            "time_factor",
            &[
                si(c_v, AREA_PER_TIME),
                time.expect("a time"),
                si(path, LENGTH),
            ],
        );
        check(
            "consolidation_degree",
            &[factor.expect("a time factor")],
            Expected::Value(0.9, DIMENSIONLESS, 1e-13),
            "round trip",
        );
    }

    #[test]
    fn hooke_and_darcy_give_the_coefficient_of_consolidation() {
        check(
            "hooke_stress",
            &[si(8e6, PRESSURE), number(0.005)],
            Expected::Value(40e3, PRESSURE, 1e-15),
            "E epsilon by hand",
        );
        // nu = 0: no lateral coupling, M = E; nu = 0.3: M = E 0.7 / (1.3 * 0.4) (hand).
        check(
            "constrained_modulus",
            &[si(8e6, PRESSURE), number(0.0)],
            Expected::Value(8e6, PRESSURE, 1e-15),
            "nu = 0",
        );
        check(
            "constrained_modulus",
            &[si(8e6, PRESSURE), number(0.3)],
            Expected::Value(8e6 * 0.7 / 0.52, PRESSURE, 1e-15),
            "hand arithmetic",
        );
        check(
            "constrained_modulus",
            &[si(8e6, PRESSURE), number(0.5)],
            Expected::Domain(1),
            "nu = 0.5, the domain's open end",
        );
        check(
            "volume_compressibility",
            &[si(2e6, PRESSURE)],
            Expected::Value(5e-7, COMPRESSIBILITY, 1e-15),
            "1 / M",
        );
        // Oedometer stage: e from 1.20 to 1.12 under 100 kPa: 0.08 / (2.2 * 1e5) 1/Pa.
        check(
            "volume_compressibility",
            &[number(1.2), number(1.12), si(1e5, PRESSURE)],
            Expected::Value(0.08 / 2.2e5, COMPRESSIBILITY, 1e-13),
            "oedometer stage by hand",
        );
        check(
            "volume_compressibility",
            &[number(1.12), number(1.2), si(1e5, PRESSURE)],
            Expected::Domain(1),
            "swelling",
        );
        // K = 1e-9 m/s, m_v = 0.5 m^2/MN = 5e-7 1/Pa, gamma_w = 9806.65 N/m^3.
        check(
            "consolidation_coefficient",
            &[si(1e-9, VELOCITY), si(5e-7, COMPRESSIBILITY)],
            Expected::Value(1e-9 / (5e-7 * 9806.65), AREA_PER_TIME, 1e-14),
            "K / (m_v gamma_w) by hand",
        );
        check(
            "consolidation_coefficient",
            &[
                si(1e-9, VELOCITY),
                si(5e-7, COMPRESSIBILITY),
                si(9810.0, PRESSURE_GRADIENT),
            ],
            Expected::Value(1e-9 / (5e-7 * 9810.0), AREA_PER_TIME, 1e-14),
            "gamma_w given",
        );
        check(
            "time_factor",
            &[
                si(1.3 / YEAR, AREA_PER_TIME),
                si(2.0 * YEAR, TIME),
                si(2.5, LENGTH),
            ],
            Expected::Value(2.6 / 6.25, DIMENSIONLESS, 1e-14),
            "c_v t / H^2 by hand",
        );
    }

    #[test]
    fn settlement_of_a_layer() {
        // m_v dsigma H: 5e-7 1/Pa * 60 kPa * 5 m = 0.15 m.
        check(
            "primary_settlement",
            &[
                si(5e-7, COMPRESSIBILITY),
                si(6e4, PRESSURE),
                si(5.0, LENGTH),
            ],
            Expected::Value(0.15, LENGTH, 1e-14),
            "m_v dsigma H by hand",
        );
        // Cc form: 0.45 * 5 / 2.3 * log10(100 / 40).
        check(
            "primary_settlement",
            &[
                number(0.45),
                number(1.3),
                si(4e4, PRESSURE),
                si(6e4, PRESSURE),
                si(5.0, LENGTH),
            ],
            Expected::Value(0.45 * 5.0 / 2.3 * 2.5_f64.log10(), LENGTH, 1e-14),
            "Cc H / (1 + e0) log10 by hand",
        );
    }
}
