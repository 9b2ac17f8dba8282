//! Electrical conduction: Ohm's law in differential form, and Archie's law linking the
//! resistivity of a water-saturated rock to its porosity.

use super::dimensions::{
    CURRENT_DENSITY, DIMENSIONLESS, ELECTRICAL_CONDUCTIVITY, ELECTRICAL_RESISTIVITY,
    VOLTAGE_GRADIENT,
};
use super::relation::{arguments, Domain, Form, Parameter, Relation};
use crate::eval::function::CallError;
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
            example: "archie_porosity(320 ohm*m, 20 ohm*m, 1, 2)",
            body: archie_porosity,
        }],
    },
];

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
}
