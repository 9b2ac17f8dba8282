//! Electrical conduction: Ohm's law in differential form, and Archie's law linking the
//! resistivity of a water-saturated rock to its porosity.

use super::dimensions::{
    CURRENT_DENSITY, DENSITY, DENSITY_PER_CONDUCTIVITY, DIMENSIONLESS, ELECTRICAL_CONDUCTIVITY,
    ELECTRICAL_RESISTIVITY, PER_TEMPERATURE, TEMPERATURE, VOLTAGE_GRADIENT,
};
use super::relation::{arguments, Domain, Form, Parameter, Relation};
use crate::eval::function::CallError;
use crate::eval::function::ValidRange;
use crate::eval::Formulation;

const ARCHIE_1942: &str = "Archie, G. E., 1942, The electrical resistivity log as an aid in \
determining some reservoir characteristics, Transactions of the AIME 146(1), 54-62";
/// Ohm's law in differential form.
pub static OHM: Formulation = Formulation {
    id: "ohm-1827",
    title: "Ohm's law, j = -sigma dV/dx",
    citation: "Ohm, G. S., 1827, Die galvanische Kette, mathematisch bearbeitet, T. H. Riemann, \
Berlin",
    validity: "linear (ohmic) conduction in an isotropic medium, steady current",
    ranges: &[],
};
/// Archie's first law, formation factor from porosity.
pub static ARCHIE: Formulation = Formulation {
    id: "archie-1942",
    title: "Archie's law, F = rho_0 / rho_w = a n^-m",
    citation: ARCHIE_1942,
    validity: "clean (clay-free), fully water-saturated rock where surface conduction is \
negligible; a and m fitted per formation (Archie: a = 1, m 1.8 to 2.0 for consolidated \
sandstones, about 1.3 for unconsolidated sands)",
    ranges: &[],
};
/// Archie's second law, water saturation from the true resistivity.
pub static ARCHIE_SATURATION: Formulation = Formulation {
    id: "archie-1942-saturation",
    title: "Archie's saturation law, S_w = (a rho_w / (n^m rho_t))^(1/n_s)",
    citation: ARCHIE_1942,
    validity: "clean (clay-free) rock where surface conduction is negligible; the saturation \
exponent n_s is about 2 in water-wet rock (Archie), larger in oil-wet rock",
    ranges: &[],
};
/// Arps' temperature correction of an NaCl solution's resistivity.
pub static ARPS: Formulation = Formulation {
    id: "arps-1953",
    title: "Arps' correction, rho_2 = rho_1 (t_1 + 21.5 °C) / (t_2 + 21.5 °C)",
    citation: "Arps, J. J., 1953, The effect of temperature on the density and electrical \
resistivity of sodium chloride solutions, Transactions of the AIME 198, 327-330 (from memory)",
    validity: "NaCl-dominated water between 0 and 200 °C (the range of the chart it \
approximates, from memory); written on the Celsius scale, so the temperatures are absolute and \
the offset is applied inside",
    ranges: &[
        ValidRange {
            parameter: "T_1",
            low: 273.15,
            high: 473.15,
            unit: "K",
        },
        ValidRange {
            parameter: "T_2",
            low: 273.15,
            high: 473.15,
            unit: "K",
        },
    ],
};
/// Linear compensation of a conductivity to 25 °C.
pub static EC_COMPENSATION: Formulation = Formulation {
    id: "ec-linear-compensation-25c",
    title: "linear temperature compensation, EC_25 = EC / (1 + alpha (T - 25 °C))",
    citation: "ISO 7888:1985, Water quality - Determination of electrical conductivity, and \
Standard Methods for the Examination of Water and Wastewater, method 2510 (from memory); \
alpha about 0.019-0.021 per K for natural waters (common practice)",
    validity: "natural waters between about 0 and 35 °C; alpha depends on the water and its \
ions (0.02 per K when left out, common practice)",
    ranges: &[ValidRange {
        parameter: "T",
        low: 273.15,
        high: 308.15,
        unit: "K",
    }],
};
/// Total dissolved solids from conductivity with the trade's factor.
pub static TDS_FACTOR: Formulation = Formulation {
    id: "tds-from-ec-factor",
    title: "total dissolved solids, TDS = k_e EC_25",
    citation: "Standard Methods for the Examination of Water and Wastewater, method 2510 (from \
memory); Hem, J. D., 1985, Study and interpretation of the chemical characteristics of natural \
water, USGS Water-Supply Paper 2254 (from memory)",
    validity: "k_e 0.55-0.9 (mg/L)/(uS/cm) for natural waters, about 0.55-0.7 for most \
(common practice); fit k_e to analyses of the water itself where they exist",
    ranges: &[],
};
const POROSITY: Parameter = Parameter::new("n", "a porosity", DIMENSIONLESS, Domain::Fraction);
const TORTUOSITY_CONSTANT: Parameter = Parameter::new(
    "a",
    "Archie's tortuosity constant",
    DIMENSIONLESS,
    Domain::Positive,
);
const CEMENTATION: Parameter = Parameter::new(
    "m",
    "Archie's cementation exponent",
    DIMENSIONLESS,
    Domain::Positive,
);
const WATER_RESISTIVITY: Parameter = Parameter::new(
    "rho_w",
    "the resistivity of the pore water",
    ELECTRICAL_RESISTIVITY,
    Domain::Positive,
);

pub static RELATIONS: &[Relation] = &[
    Relation {
        name: "ohm_current_density",
        summary: "current density j = -sigma dV_dx (A/m^2); sigma electrical conductivity, dV_dx \
voltage gradient (V/m); Ohm 1827",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "sigma",
                    "an electrical conductivity",
                    ELECTRICAL_CONDUCTIVITY,
                    Domain::NonNegative,
                ),
                Parameter::new("dV_dx", "a voltage gradient", VOLTAGE_GRADIENT, Domain::Any),
            ],
            result: CURRENT_DENSITY,
            unit: "A/m^2",
            formulations: &[&OHM],
            formula: "j = -sigma * dV_dx",
            example: "ohm_current_density(0.02 S/m, 0.5 V/m)",
            body: ohm_current_density,
        }],
    },
    Relation {
        name: "archie_formation_factor",
        summary:
            "formation factor F = a n^-m (dimensionless); n porosity, a tortuosity constant, m \
cementation exponent; Archie 1942",
        forms: &[Form {
            parameters: &[POROSITY, TORTUOSITY_CONSTANT, CEMENTATION],
            result: DIMENSIONLESS,
            unit: "1",
            formulations: &[&ARCHIE],
            formula: "F = a * n^-m",
            example: "archie_formation_factor(0.25, 1, 2)",
            body: archie_formation_factor,
        }],
    },
    Relation {
        name: "archie_resistivity",
        summary:
            "resistivity of the water-saturated rock rho_0 = a rho_w n^-m (ohm*m); rho_w pore \
water resistivity; Archie 1942",
        forms: &[Form {
            parameters: &[
                WATER_RESISTIVITY,
                POROSITY,
                TORTUOSITY_CONSTANT,
                CEMENTATION,
            ],
            result: ELECTRICAL_RESISTIVITY,
            unit: "ohm*m",
            formulations: &[&ARCHIE],
            formula: "rho_0 = a * rho_w * n^-m",
            example: "archie_resistivity(20 ohm*m, 0.25, 1, 2)",
            body: archie_resistivity,
        }],
    },
    Relation {
        name: "archie_porosity",
        summary: "porosity n = (a rho_w / rho_bulk)^(1/m) of a water-saturated rock from its bulk \
resistivity; Archie 1942",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "rho_bulk",
                    "the bulk resistivity of the saturated rock",
                    ELECTRICAL_RESISTIVITY,
                    Domain::Positive,
                ),
                WATER_RESISTIVITY,
                TORTUOSITY_CONSTANT,
                CEMENTATION,
            ],
            result: DIMENSIONLESS,
            unit: "1",
            formulations: &[&ARCHIE],
            formula: "n = (a * rho_w / rho_bulk)^(1 / m)",
            example: "archie_porosity(320 ohm*m, 20 ohm*m, 1, 2)",
            body: archie_porosity,
        }],
    },
    Relation {
        name: "archie_saturation",
        summary: "water saturation S_w = (a rho_w / (n^m rho_t))^(1/n_s) from the true \
resistivity rho_t; n_s saturation exponent; Archie 1942",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "rho_t",
                    "the true resistivity of the rock",
                    ELECTRICAL_RESISTIVITY,
                    Domain::Positive,
                ),
                WATER_RESISTIVITY,
                POROSITY,
                TORTUOSITY_CONSTANT,
                CEMENTATION,
                Parameter::new(
                    "n_s",
                    "Archie's saturation exponent",
                    DIMENSIONLESS,
                    Domain::Positive,
                ),
            ],
            result: DIMENSIONLESS,
            unit: "1",
            formulations: &[&ARCHIE_SATURATION],
            formula: "S_w = (a * rho_w / (n^m * rho_t))^(1 / n_s)",
            example: "archie_saturation(40 ohm*m, 0.05 ohm*m, 0.2, 1, 2, 2)",
            body: archie_saturation,
        }],
    },
    Relation {
        name: "arps_resistivity",
        summary: "resistivity at T_2 of water whose resistivity is rho_1 at T_1, rho_1 (t_1 + \
21.5 °C)/(t_2 + 21.5 °C); absolute temperatures (20 degC); Arps 1953",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "rho_1",
                    "the resistivity at T_1",
                    ELECTRICAL_RESISTIVITY,
                    Domain::Positive,
                ),
                Parameter::new(
                    "T_1",
                    "the temperature of the measurement",
                    TEMPERATURE,
                    Domain::AbsoluteTemperature,
                ),
                Parameter::new(
                    "T_2",
                    "the temperature wanted",
                    TEMPERATURE,
                    Domain::AbsoluteTemperature,
                ),
            ],
            result: ELECTRICAL_RESISTIVITY,
            unit: "ohm*m",
            formulations: &[&ARPS],
            formula: "rho_2 = rho_1 * (T_1 - 251.65 K) / (T_2 - 251.65 K)",
            example: "arps_resistivity(0.5 ohm*m, 24 degC, 80 degC)",
            body: arps_resistivity,
        }],
    },
    Relation {
        name: "conductivity_at_25c",
        summary: "electrical conductivity compensated to 25 °C, EC / (1 + alpha (T - 25 °C)); \
alpha 0.02 per K when left out (common practice)",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "EC",
                    "the conductivity measured at T",
                    ELECTRICAL_CONDUCTIVITY,
                    Domain::NonNegative,
                ),
                Parameter::new(
                    "T",
                    "the water temperature",
                    TEMPERATURE,
                    Domain::AbsoluteTemperature,
                ),
                Parameter::new(
                    "alpha",
                    "the temperature coefficient",
                    PER_TEMPERATURE,
                    Domain::NonNegative,
                )
                .or(0.02),
            ],
            result: ELECTRICAL_CONDUCTIVITY,
            unit: "uS/cm",
            formulations: &[&EC_COMPENSATION],
            formula: "EC_25 = EC / (1 + alpha * (T - 298.15 K))",
            example: "conductivity_at_25c(850 uS/cm, 12 degC)",
            body: conductivity_at_25c,
        }],
    },
    Relation {
        name: "dissolved_solids",
        summary: "total dissolved solids k_e EC_25 (mg/L); k_e 0.55-0.9 (mg/L)/(uS/cm), about \
0.55-0.7 for most natural waters (common practice)",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "EC_25",
                    "the conductivity at 25 °C",
                    ELECTRICAL_CONDUCTIVITY,
                    Domain::NonNegative,
                ),
                Parameter::new(
                    "k_e",
                    "the factor of dissolved solids to conductivity",
                    DENSITY_PER_CONDUCTIVITY,
                    Domain::Positive,
                ),
            ],
            result: DENSITY,
            unit: "mg/L",
            formulations: &[&TDS_FACTOR],
            formula: "TDS = k_e * EC_25",
            example: "dissolved_solids(900 uS/cm, 0.65 (mg/L)/(uS/cm))",
            body: dissolved_solids,
        }],
    },
];

/// Sw = (a ρw / (n^m ρt))^(1/ns); a true resistivity below the water-saturated rock's would
/// need Sw above 1: refused.
fn archie_saturation(values: &[f64]) -> Result<f64, CallError> {
    let [true_resistivity, water, porosity, a, m, saturation_exponent] = arguments(values);
    let saturation =
        (a * water / (porosity.powf(m) * true_resistivity)).powf(1.0 / saturation_exponent);
    if saturation > 1.0 {
        return Err(CallError::Domain {
            argument: Some(0),
            message: "`rho_t` is below the resistivity of the water-saturated rock, a `rho_w` \
n^-m, which would need a water saturation above 1"
                .to_string(),
        });
    }
    Ok(saturation)
}

/// The Arps constant, 21.5 on the Celsius scale (6.77 on the Fahrenheit one), from memory.
const ARPS_OFFSET_CELSIUS: f64 = 21.5;
const CELSIUS_ZERO: f64 = 273.15;

/// ρ2 = ρ1 (t1 + 21.5)/(t2 + 21.5) with t in °C, taken from absolute temperatures here so that
/// nobody multiplies a Celsius reading.
fn arps_resistivity(values: &[f64]) -> Result<f64, CallError> {
    let [resistivity, from, to] = arguments(values);
    let shifted = |kelvins: f64| kelvins - CELSIUS_ZERO + ARPS_OFFSET_CELSIUS;
    Ok(resistivity * shifted(from) / shifted(to))
}

/// EC25 = EC / (1 + α (T − 25 °C)).
fn conductivity_at_25c(values: &[f64]) -> Result<f64, CallError> {
    let [conductivity, temperature, coefficient] = arguments(values);
    let factor = 1.0 + coefficient * (temperature - (CELSIUS_ZERO + 25.0));
    if factor <= 0.0 {
        return Err(CallError::Domain {
            argument: Some(2),
            message: "`alpha` is so large that 1 + alpha (T - 25 °C) is not positive".to_string(),
        });
    }
    Ok(conductivity / factor)
}

/// TDS = ke EC25.
fn dissolved_solids(values: &[f64]) -> Result<f64, CallError> {
    let [conductivity, factor] = arguments(values);
    Ok(factor * conductivity)
}

/// j = −σ dV/dx; Ohm (1827).
fn ohm_current_density(values: &[f64]) -> Result<f64, CallError> {
    let [conductivity, gradient] = arguments(values);
    Ok(-conductivity * gradient)
}

/// F = a n^−m; Archie (1942).
fn archie_formation_factor(values: &[f64]) -> Result<f64, CallError> {
    let [porosity, a, m] = arguments(values);
    Ok(a * porosity.powf(-m))
}

/// ρ0 = a ρw n^−m, the resistivity of the fully water-saturated rock.
fn archie_resistivity(values: &[f64]) -> Result<f64, CallError> {
    let [water, porosity, a, m] = arguments(values);
    Ok(a * water * porosity.powf(-m))
}

/// n = (a ρw / ρb)^(1/m), Archie (1942) solved for n. A bulk resistivity below a ρw would need
/// n above 1: refused.
fn archie_porosity(values: &[f64]) -> Result<f64, CallError> {
    let [bulk, water, a, m] = arguments(values);
    let porosity = (a * water / bulk).powf(1.0 / m);
    if porosity > 1.0 {
        return Err(CallError::Domain {
            argument: Some(0),
            message: "`rho_bulk` is below `a` times `rho_w`, which would need a porosity above 1"
                .to_string(),
        });
    }
    Ok(porosity)
}

#[cfg(test)]
mod tests {
    //! Reference cases through `library::testing::check`. Each value names its source; "from
    //! memory" marks textbook examples recalled rather than re-read.

    use crate::library::dimensions::*;
    use crate::library::testing::*;

    #[test]
    fn ohm_and_archie_match_references() {
        // 0.05 S/m pore water, 2 V across 0.5 m (voltage rising along x): j = -0.2 A/m^2.
        check(
            "ohm_current_density",
            &[si(0.05, ELECTRICAL_CONDUCTIVITY), si(4.0, VOLTAGE_GRADIENT)],
            Expected::Value(-0.2, CURRENT_DENSITY, 1e-12),
            "hand arithmetic",
        );
        // A published worked exam solution (questions.collegedunia.com, a GATE geophysics
        // question): water 0.25 ohm m, rock 60 ohm m, a = 1, m = 2 give n = 6.45 %
        // (0.064549722). The same numbers run forwards give F = 240 and rho_0 = 60 ohm m.
        let porosity = 0.064_549_722;
        check(
            "archie_porosity",
            &[
                si(60.0, ELECTRICAL_RESISTIVITY),
                si(0.25, ELECTRICAL_RESISTIVITY),
                number(1.0),
                number(2.0),
            ],
            Expected::Value(porosity, DIMENSIONLESS, 1e-8),
            "GATE worked solution",
        );
        check(
            "archie_formation_factor",
            &[number(porosity), number(1.0), number(2.0)],
            // n is printed to 8 figures; F goes as n^-2, so 2e-8.
            Expected::Value(240.0, DIMENSIONLESS, 2e-8),
            "GATE worked solution, forwards",
        );
        check(
            "archie_resistivity",
            &[
                si(0.25, ELECTRICAL_RESISTIVITY),
                number(porosity),
                number(1.0),
                number(2.0),
            ],
            Expected::Value(60.0, ELECTRICAL_RESISTIVITY, 2e-8),
            "GATE worked solution, forwards",
        );
    }

    #[test]
    fn saturation_arps_and_water_conductivity_match_worked_examples() {
        // Log-analysis worked example (hand arithmetic): rho_w 0.05 ohm m, n 0.2, rho_t 40 ohm m,
        // a = 1, m = n_s = 2: F = 25, rho_0 = 1.25 ohm m, S_w = sqrt(1.25 / 40) = 0.176 777 ...
        check(
            "archie_saturation",
            &[
                si(40.0, ELECTRICAL_RESISTIVITY),
                si(0.05, ELECTRICAL_RESISTIVITY),
                number(0.2),
                number(1.0),
                number(2.0),
                number(2.0),
            ],
            Expected::Value(0.031_25_f64.sqrt(), DIMENSIONLESS, 1e-15),
            "hand arithmetic",
        );
        check(
            "archie_saturation",
            &[
                si(1.0, ELECTRICAL_RESISTIVITY),
                si(0.05, ELECTRICAL_RESISTIVITY),
                number(0.2),
                number(1.0),
                number(2.0),
                number(2.0),
            ],
            Expected::Domain(0),
            "rho_t below rho_0",
        );
        // Arps, Celsius form: 0.5 ohm m at 24 °C is 0.5 x 45.5 / 101.5 at 80 °C. The Fahrenheit
        // form of the chart books, rho (75 + 6.77)/(176 + 6.77) (from memory), is the same line
        // to 0.2 % (6.77 °F is 21.54 °C of offset).
        let (at_24, at_80) = (297.15, 353.15);
        check(
            "arps_resistivity",
            &[
                si(0.5, ELECTRICAL_RESISTIVITY),
                si(at_24, TEMPERATURE),
                si(at_80, TEMPERATURE),
            ],
            Expected::Value(0.5 * 45.5 / 101.5, ELECTRICAL_RESISTIVITY, 1e-14),
            "Arps 1953, Celsius form",
        );
        check(
            "arps_resistivity",
            &[
                si(0.5, ELECTRICAL_RESISTIVITY),
                si(at_24, TEMPERATURE),
                si(at_80, TEMPERATURE),
            ],
            Expected::Value(
                0.5 * (75.2 + 6.77) / (176.0 + 6.77),
                ELECTRICAL_RESISTIVITY,
                2e-3,
            ),
            "Arps 1953, Fahrenheit form (from memory)",
        );
        // 850 uS/cm at 12 °C, alpha 0.02 per K: 850 / (1 - 0.26) uS/cm (hand arithmetic).
        check(
            "conductivity_at_25c",
            &[si(0.085, ELECTRICAL_CONDUCTIVITY), si(285.15, TEMPERATURE)],
            Expected::Value(0.085 / 0.74, ELECTRICAL_CONDUCTIVITY, 1e-14),
            "hand arithmetic",
        );
        // 900 uS/cm = 0.09 S/m; k_e 0.65 (mg/L)/(uS/cm) = 0.65e-3 kg/m^3 / 1e-4 S/m = 6.5 SI:
        // 585 mg/L = 0.585 kg/m^3.
        check(
            "dissolved_solids",
            &[
                si(0.09, ELECTRICAL_CONDUCTIVITY),
                si(6.5, DENSITY_PER_CONDUCTIVITY),
            ],
            Expected::Value(0.585, DENSITY, 1e-14),
            "hand arithmetic",
        );
    }
}
