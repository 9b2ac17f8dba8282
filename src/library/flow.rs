//! Flow through porous media: Darcy's law in its two forms and what follows from it (seepage
//! velocity, advective travel time, transmissivity, the Reynolds number that bounds it), the
//! link between intrinsic permeability and hydraulic conductivity, and permeability estimates
//! from grain size (Hazen, Kozeny–Carman).
//!
//! Fluxes follow one sign convention: the gradient is taken along an axis s and the flux is
//! positive along that axis.

use super::dimensions::{
    ACCELERATION, AREA, DENSITY, DIMENSIONLESS, DYNAMIC_VISCOSITY, LENGTH, PER_LENGTH_TIME,
    PRESSURE_GRADIENT, TIME, VELOCITY,
};
use super::relation::{arguments, Domain, Form, Parameter, Relation};
use super::water;
use crate::eval::function::{CallError, ValidRange};
use crate::eval::Formulation;
use uom::si::f64::{Pressure, ThermodynamicTemperature};
use uom::si::pressure::pascal;
use uom::si::thermodynamic_temperature::kelvin;

/// Standard gravity, exact (CGPM 1901), used to turn k into K.
const STANDARD_GRAVITY: f64 = 9.80665;

const BEAR_1972: &str = "Bear, J., 1972, Dynamics of Fluids in Porous Media, American Elsevier, \
New York, chapter 5";
const FREEZE_CHERRY_1979: &str = "Freeze, R. A. and Cherry, J. A., 1979, Groundwater, \
Prentice-Hall, Englewood Cliffs NJ";
/// Darcy's law with the hydraulic conductivity of the rock for the fluid.
pub static DARCY: Formulation = Formulation {
    id: "darcy-1856",
    title: "Darcy's law, q = K i",
    citation: "Darcy, H., 1856, Les fontaines publiques de la ville de Dijon, Victor Dalmont, \
Paris, note D",
    validity: "steady laminar flow of a Newtonian fluid through a saturated, rigid porous \
medium; Reynolds number below about 1 to 10",
    ranges: &[],
};
/// Darcy's law in permeability form, with gravity as an explicit body force.
pub static DARCY_PERMEABILITY: Formulation = Formulation {
    id: "darcy-permeability-gravity",
    title: "Darcy's law in permeability form, q = -(k/mu)(dp/ds - rho g_s)",
    citation: "Hubbert, M. K., 1940, The theory of ground-water motion, Journal of Geology \
48(8), 785-944; Bear, J., 1972, Dynamics of Fluids in Porous Media, American Elsevier, New York, \
chapter 5",
    validity: "as Darcy's law; one fluid whose density is taken constant along the path; k the \
intrinsic permeability",
    ranges: &[],
};
/// Hydraulic conductivity and intrinsic permeability, one property of the medium and one of
/// the fluid; `hydraulic_conductivity` and `intrinsic_permeability` evaluate it both ways.
pub static CONDUCTIVITY_FROM_PERMEABILITY: Formulation = Formulation {
    id: "conductivity-permeability",
    title: "hydraulic conductivity from intrinsic permeability, K = k rho g0 / mu",
    citation: "Hubbert, M. K., 1940, The theory of ground-water motion, Journal of Geology \
48(8), 785-944; Freeze, R. A. and Cherry, J. A., 1979, Groundwater, Prentice-Hall, Englewood \
Cliffs NJ, section 2.3",
    validity: "one Newtonian fluid of density rho and viscosity mu saturating the medium; k a \
property of the medium alone (no gas slippage, no swelling clay)",
    ranges: &[],
};
/// The average velocity of water in the connected pores.
pub static SEEPAGE_VELOCITY: Formulation = Formulation {
    id: "seepage-velocity",
    title: "average linear (seepage) velocity, v = q / n_e",
    citation: FREEZE_CHERRY_1979,
    validity: "n_e the effective (connected, flowing) porosity; an average over the pores, not \
the fastest path",
    ranges: &[],
};
/// Advective arrival time, with no spreading.
pub static ADVECTIVE_TRAVEL_TIME: Formulation = Formulation {
    id: "advective-travel-time",
    title: "advective (plug-flow) travel time, t = L / v",
    citation: FREEZE_CHERRY_1979,
    validity: "advection only: no dispersion, diffusion, sorption or decay; v uniform along the \
path (use the seepage velocity, not the Darcy flux)",
    ranges: &[],
};
/// Transmissivity of an aquifer of uniform thickness.
pub static TRANSMISSIVITY: Formulation = Formulation {
    id: "transmissivity",
    title: "aquifer transmissivity, T = K b",
    citation: FREEZE_CHERRY_1979,
    validity: "horizontal flow through a saturated thickness b; K the thickness-averaged \
horizontal hydraulic conductivity",
    ranges: &[],
};
/// The Reynolds number that bounds Darcy's law.
pub static REYNOLDS: Formulation = Formulation {
    id: "porous-media-reynolds",
    title: "Reynolds number of flow in a porous medium, Re = rho q d / mu",
    citation: BEAR_1972,
    validity: "d a representative grain diameter (often d10 or d50); Darcy's law is commonly \
taken valid for Re below 1 to 10 (common practice)",
    ranges: &[],
};
/// Hazen's grain-size rule for clean sands.
pub static HAZEN: Formulation = Formulation {
    id: "hazen-1892",
    title: "Hazen's rule, K = C d10^2",
    citation: "Hazen, A., 1892, Some physical properties of sands and gravels, with special \
reference to their use in filtration, 24th Annual Report, Massachusetts State Board of Health, \
Boston, 539-556; limits as restated by Carrier, W. D., 2003, Goodbye, Hazen; hello, \
Kozeny-Carman, Journal of Geotechnical and Geoenvironmental Engineering 129(11), 1054-1056",
    validity: "clean, loose sands with 0.1 mm <= d10 <= 3 mm and uniformity coefficient \
d60/d10 below about 5; C about 100 (cm s)^-1 (reported 40 to 150), water near 10 degC",
    ranges: &[ValidRange {
        parameter: "d10",
        low: 0.1e-3,
        high: 3e-3,
        unit: "mm",
    }],
};
/// Kozeny–Carman permeability of a granular pack.
pub static KOZENY_CARMAN: Formulation = Formulation {
    id: "kozeny-carman",
    title: "Kozeny-Carman permeability, k = d^2 n^3 / (180 (1-n)^2)",
    citation: "Carman, P. C., 1937, Fluid flow through granular beds, Transactions of the \
Institution of Chemical Engineers 15, 150-166; constant 180 for spheres as in Bear, J., 1972, \
Dynamics of Fluids in Porous Media, American Elsevier, New York, chapter 5",
    validity: "laminar flow through packs of near-uniform, near-spherical grains without clay; \
d a representative grain diameter",
    ranges: &[],
};
// ---------------------------------------------------------------------------------------------
// Parameters used by several relations
// ---------------------------------------------------------------------------------------------

const CONDUCTIVITY: Parameter = Parameter::new(
    "K",
    "a hydraulic conductivity",
    VELOCITY,
    Domain::NonNegative,
);
const PERMEABILITY: Parameter =
    Parameter::new("k", "an intrinsic permeability", AREA, Domain::NonNegative);
const FLUID_DENSITY: Parameter =
    Parameter::new("rho", "the fluid density", DENSITY, Domain::Positive);
const FLUID_VISCOSITY: Parameter = Parameter::new(
    "mu",
    "the dynamic viscosity",
    DYNAMIC_VISCOSITY,
    Domain::Positive,
);

/// `hydraulic_conductivity` and `intrinsic_permeability`: the relation itself, and the water
/// properties when the fluid is water at T.
const PERMEABILITY_WITH_WATER: &[&Formulation] = &[
    &water::IF97_REGION1,
    &water::IAPWS2008_VISCOSITY,
    &CONDUCTIVITY_FROM_PERMEABILITY,
];

// ---------------------------------------------------------------------------------------------
// The relations
// ---------------------------------------------------------------------------------------------

pub static RELATIONS: &[Relation] = &[
    Relation {
        name: "darcy_flux",
        summary:
            "Darcy flux q = K i (m/s); K hydraulic conductivity, i = -dh/ds the head drop per \
length along s (dimensionless), so q > 0 flows along s toward lower head; Darcy 1856",
        forms: &[Form {
            parameters: &[
                CONDUCTIVITY,
                Parameter::new("i", "the hydraulic gradient", DIMENSIONLESS, Domain::Any),
            ],
            result: VELOCITY,
            unit: "m/s",
            formulations: &[&DARCY],
            formula: "q = K * i",
            example: "darcy_flux(2e-5 m/s, 0.004)",
            body: darcy_flux,
        }],
    },
    Relation {
        name: "darcy_flux_pressure",
        summary:
            "Darcy flux q = -(k/mu)(dp_ds - rho g_s) (m/s) along s; k permeability, mu viscosity, \
dp_ds pressure gradient along s, rho fluid density, g_s gravity along s (g0 if s points down, \
-g0 if up, 0 horizontal); Hubbert 1940",
        forms: &[Form {
            parameters: &[
                PERMEABILITY,
                FLUID_VISCOSITY,
                Parameter::new(
                    "dp_ds",
                    "the pressure gradient along s",
                    PRESSURE_GRADIENT,
                    Domain::Any,
                ),
                Parameter::new("rho", "the fluid density", DENSITY, Domain::NonNegative),
                Parameter::new(
                    "g_s",
                    "the component of gravity along s",
                    ACCELERATION,
                    Domain::Any,
                ),
            ],
            result: VELOCITY,
            unit: "m/s",
            formulations: &[&DARCY_PERMEABILITY],
            formula: "q = -(k / mu) * (dp_ds - rho * g_s)",
            example: "darcy_flux_pressure(250 mD, 1 cP, -2 kPa/m, 1000 kg/m^3, 0 m/s^2)",
            body: darcy_flux_pressure,
        }],
    },
    Relation {
        name: "seepage_velocity",
        summary: "average linear velocity v = q / n_e (m/s); q Darcy flux, n_e effective porosity \
in (0, 1]",
        forms: &[Form {
            parameters: &[
                Parameter::new("q", "a Darcy flux", VELOCITY, Domain::Any),
                Parameter::new(
                    "n_e",
                    "an effective porosity",
                    DIMENSIONLESS,
                    Domain::Fraction,
                ),
            ],
            result: VELOCITY,
            unit: "m/s",
            formulations: &[&SEEPAGE_VELOCITY],
            formula: "v = q / n_e",
            example: "seepage_velocity(1e-6 m/s, 0.25)",
            body: seepage_velocity,
        }],
    },
    Relation {
        name: "travel_time",
        summary:
            "advective travel time t = L / v (s); L path length, v seepage velocity (positive); \
no dispersion or retardation",
        forms: &[Form {
            parameters: &[
                Parameter::new("L", "a path length", LENGTH, Domain::NonNegative),
                Parameter::new(
                    "v",
                    "a seepage velocity along the path",
                    VELOCITY,
                    Domain::Positive,
                ),
            ],
            result: TIME,
            unit: "d",
            formulations: &[&ADVECTIVE_TRAVEL_TIME],
            formula: "t = L / v",
            example: "travel_time(120 m, 0.3 m/d)",
            body: travel_time,
        }],
    },
    Relation {
        name: "transmissivity",
        summary: "aquifer transmissivity T = K b (m^2/s); K hydraulic conductivity, b saturated \
thickness",
        forms: &[Form {
            parameters: &[
                CONDUCTIVITY,
                Parameter::new("b", "a saturated thickness", LENGTH, Domain::Positive),
            ],
            result: super::dimensions::AREA_PER_TIME,
            unit: "m^2/s",
            formulations: &[&TRANSMISSIVITY],
            formula: "T = K * b",
            example: "transmissivity(3e-4 m/s, 12 m)",
            body: transmissivity,
        }],
    },
    Relation {
        name: "reynolds_number",
        summary:
            "Reynolds number Re = rho |q| d / mu (dimensionless); d grain diameter; Darcy's law \
is commonly taken valid for Re below 1 to 10 (common practice, Bear 1972); the number is \
returned, not checked",
        forms: &[Form {
            parameters: &[
                Parameter::new("q", "a Darcy flux", VELOCITY, Domain::Any),
                Parameter::new("d", "a grain diameter", LENGTH, Domain::Positive),
                FLUID_DENSITY,
                FLUID_VISCOSITY,
            ],
            result: DIMENSIONLESS,
            unit: "1",
            formulations: &[&REYNOLDS],
            formula: "Re = rho * abs(q) * d / mu",
            example: "reynolds_number(1e-4 m/s, 0.5 mm, 1000 kg/m^3, 1 cP)",
            body: reynolds_number,
        }],
    },
    Relation {
        name: "hydraulic_conductivity",
        summary: "K = k rho g0 / mu: for water at T (and p), or for any fluid of density rho and \
viscosity mu",
        forms: &[
            Form {
                parameters: &[
                    PERMEABILITY,
                    water::TEMPERATURE_PARAMETER,
                    water::PRESSURE_PARAMETER,
                ],
                result: VELOCITY,
                unit: "m/s",
                formulations: PERMEABILITY_WITH_WATER,
                formula: "K = k * rho_w(T, p) * g0 / mu_w(T, p)",
                example: "hydraulic_conductivity(250 mD, 12 degC)",
                body: hydraulic_conductivity_of_water,
            },
            Form {
                parameters: &[PERMEABILITY, FLUID_DENSITY, FLUID_VISCOSITY],
                result: VELOCITY,
                unit: "m/s",
                formulations: &[&CONDUCTIVITY_FROM_PERMEABILITY],
                formula: "K = k * rho * g0 / mu",
                example: "hydraulic_conductivity(250 mD, 1080 kg/m^3, 0.6 cP)",
                body: hydraulic_conductivity_of_fluid,
            },
        ],
    },
    Relation {
        name: "intrinsic_permeability",
        summary: "k = K mu / (rho g0): for water at T (and p), or for any fluid",
        forms: &[
            Form {
                parameters: &[
                    CONDUCTIVITY,
                    water::TEMPERATURE_PARAMETER,
                    water::PRESSURE_PARAMETER,
                ],
                result: AREA,
                unit: "mD",
                formulations: PERMEABILITY_WITH_WATER,
                formula: "k = K * mu_w(T, p) / (rho_w(T, p) * g0)",
                example: "intrinsic_permeability(2e-6 m/s, 12 degC)",
                body: permeability_for_water,
            },
            Form {
                parameters: &[CONDUCTIVITY, FLUID_DENSITY, FLUID_VISCOSITY],
                result: AREA,
                unit: "mD",
                formulations: &[&CONDUCTIVITY_FROM_PERMEABILITY],
                formula: "k = K * mu / (rho * g0)",
                example: "intrinsic_permeability(2e-6 m/s, 1080 kg/m^3, 0.6 cP)",
                body: permeability_for_fluid,
            },
        ],
    },
    Relation {
        name: "hazen_conductivity",
        summary:
            "hydraulic conductivity K = C d10^2 (K in cm/s for d10 in cm); C defaults to 100, a \
plain number read as 1/(cm*s), or a quantity such as 100 1/(cm*s); refused outside \
0.1 mm <= d10 <= 3 mm; Hazen 1892",
        forms: &[
            Form {
                parameters: &[
                    D10,
                    Parameter::new(
                        "C",
                        "Hazen's coefficient in 1/(cm s)",
                        DIMENSIONLESS,
                        Domain::Positive,
                    )
                    .or(HAZEN_DEFAULT_COEFFICIENT),
                ],
                result: VELOCITY,
                unit: "cm/s",
                formulations: &[&HAZEN],
                formula: "K = C / (cm*s) * d10^2",
                example: "hazen_conductivity(0.2 mm)",
                body: hazen_with_trade_coefficient,
            },
            Form {
                parameters: &[
                    D10,
                    Parameter::new(
                        "C",
                        "Hazen's coefficient",
                        PER_LENGTH_TIME,
                        Domain::Positive,
                    )
                    .or(HAZEN_DEFAULT_COEFFICIENT * PER_CENTIMETRE_SECOND),
                ],
                result: VELOCITY,
                unit: "cm/s",
                formulations: &[&HAZEN],
                formula: "K = C * d10^2",
                example: "hazen_conductivity(0.2 mm, 120 1/(cm*s))",
                body: hazen,
            },
        ],
    },
    Relation {
        name: "kozeny_carman_permeability",
        summary: "intrinsic permeability k = d^2 n^3 / (180 (1-n)^2) (m^2); d grain diameter, n \
porosity in (0, 1); Carman 1937, Bear 1972",
        forms: &[Form {
            parameters: &[
                Parameter::new("d", "a grain diameter", LENGTH, Domain::Positive),
                Parameter::new("n", "a porosity", DIMENSIONLESS, Domain::OpenFraction),
            ],
            result: AREA,
            unit: "darcy",
            formulations: &[&KOZENY_CARMAN],
            formula: "k = d^2 * n^3 / (180 * (1 - n)^2)",
            example: "kozeny_carman_permeability(0.3 mm, 0.35)",
            body: kozeny_carman,
        }],
    },
];

/// Hazen's coefficient when none is given, 1/(cm·s): the commonly used round value.
const HAZEN_DEFAULT_COEFFICIENT: f64 = 100.0;
/// One 1/(cm·s) in SI, 1/(m·s).
const PER_CENTIMETRE_SECOND: f64 = 100.0;

const D10: Parameter = Parameter::new(
    "d10",
    "the grain size 10 % by mass is finer than",
    LENGTH,
    Domain::Positive,
);

// ---------------------------------------------------------------------------------------------
// Bodies: checked SI numbers in, SI value out
// ---------------------------------------------------------------------------------------------

/// i = −dh/ds, so a positive `i` gives a positive flux along s, toward lower head.
fn darcy_flux(values: &[f64]) -> Result<f64, CallError> {
    let [conductivity, gradient] = arguments(values);
    Ok(conductivity * gradient)
}

/// The gravity term is an argument, not hidden, because a vertical or inclined column is where
/// a pressure-only Darcy law gives the wrong sign. A hydrostatic column (dp/ds = ρ g_s) has q = 0.
fn darcy_flux_pressure(values: &[f64]) -> Result<f64, CallError> {
    let [permeability, viscosity, pressure_gradient, density, gravity_along_s] = arguments(values);
    Ok(-(permeability / viscosity) * (pressure_gradient - density * gravity_along_s))
}

fn seepage_velocity(values: &[f64]) -> Result<f64, CallError> {
    let [flux, porosity] = arguments(values);
    Ok(flux / porosity)
}

/// A zero or negative velocity never arrives: refused by the domain, not returned as infinity.
fn travel_time(values: &[f64]) -> Result<f64, CallError> {
    let [length, velocity] = arguments(values);
    Ok(length / velocity)
}

fn transmissivity(values: &[f64]) -> Result<f64, CallError> {
    let [conductivity, thickness] = arguments(values);
    Ok(conductivity * thickness)
}

fn reynolds_number(values: &[f64]) -> Result<f64, CallError> {
    let [flux, diameter, density, viscosity] = arguments(values);
    Ok(density * flux.abs() * diameter / viscosity)
}

/// Density and viscosity of liquid water at T and p (IAPWS-IF97 and IAPWS 2008).
fn water_state(temperature: f64, pressure: f64) -> Result<(f64, f64), CallError> {
    let (density, viscosity) = water::density_and_viscosity(
        ThermodynamicTemperature::new::<kelvin>(temperature),
        Pressure::new::<pascal>(pressure),
    )
    .map_err(super::formulation::refused)?;
    Ok((density.value, viscosity.value))
}

fn hydraulic_conductivity_of_water(values: &[f64]) -> Result<f64, CallError> {
    let [permeability, temperature, pressure] = arguments(values);
    let (density, viscosity) = water_state(temperature, pressure)?;
    Ok(permeability * density * STANDARD_GRAVITY / viscosity)
}

fn hydraulic_conductivity_of_fluid(values: &[f64]) -> Result<f64, CallError> {
    let [permeability, density, viscosity] = arguments(values);
    Ok(permeability * density * STANDARD_GRAVITY / viscosity)
}

fn permeability_for_water(values: &[f64]) -> Result<f64, CallError> {
    let [conductivity, temperature, pressure] = arguments(values);
    let (density, viscosity) = water_state(temperature, pressure)?;
    Ok(conductivity * viscosity / (density * STANDARD_GRAVITY))
}

fn permeability_for_fluid(values: &[f64]) -> Result<f64, CallError> {
    let [conductivity, density, viscosity] = arguments(values);
    Ok(conductivity * viscosity / (density * STANDARD_GRAVITY))
}

/// The trade writes C as a bare number meaning 1/(cm·s): `hazen_conductivity(0.2 mm)` is
/// 100 × (0.02 cm)² = 0.04 cm/s.
fn hazen_with_trade_coefficient(values: &[f64]) -> Result<f64, CallError> {
    let [d10, coefficient] = arguments(values);
    Ok(coefficient * PER_CENTIMETRE_SECOND * d10 * d10)
}

/// A `C` written with units (`100 1/(cm*s)`) is used as given.
fn hazen(values: &[f64]) -> Result<f64, CallError> {
    let [d10, coefficient] = arguments(values);
    Ok(coefficient * d10 * d10)
}

/// n = 1 has no solids and no finite permeability: the domain is (0, 1).
fn kozeny_carman(values: &[f64]) -> Result<f64, CallError> {
    let [diameter, porosity] = arguments(values);
    let solids = 1.0 - porosity;
    Ok(diameter * diameter * porosity.powi(3) / (180.0 * solids * solids))
}

#[cfg(test)]
mod tests {
    //! Reference cases through `library::testing::check`. Each value names its source; "from
    //! memory" marks textbook examples recalled rather than re-read.

    use crate::library::dimensions::*;
    use crate::library::testing::*;

    #[test]
    fn darcy_family_matches_published_examples() {
        // Kuo, J., 2014, Practical Design Calculations for Groundwater and Soil Remediation,
        // 2nd ed., CRC Press, example 3.3 (read in a public copy): a 2 ft compacted clay liner,
        // K = 1e-7 cm/s, leachate 1 ft deep, n_e = 0.25. Printed: i = 1.5, Darcy velocity
        // 1.5e-7 cm/s, seepage velocity 6.0e-7 cm/s = 5.2e-2 cm/d, travel time 1,176 d (the
        // book divides by the rounded 5.2e-2 cm/d; unrounded it is 1175.9 d).
        let liner_k = 1e-7 * CM;
        check(
            "liner_leakage",
            &[si(liner_k, VELOCITY), si(FT, LENGTH), si(2.0 * FT, LENGTH)],
            Expected::Value(1.5e-7 * CM, VELOCITY, 1e-12),
            "Kuo 2014 ex. 3.3, Darcy velocity",
        );
        check(
            "darcy_flux",
            &[si(liner_k, VELOCITY), number(1.5)],
            Expected::Value(1.5e-7 * CM, VELOCITY, 1e-12),
            "Kuo 2014 ex. 3.3, v_d = K i",
        );
        check(
            "seepage_velocity",
            &[si(1.5e-7 * CM, VELOCITY), number(0.25)],
            Expected::Value(6.0e-7 * CM, VELOCITY, 1e-12),
            "Kuo 2014 ex. 3.3, seepage velocity",
        );
        check(
            "travel_time",
            &[si(2.0 * FT, LENGTH), si(6.0e-7 * CM, VELOCITY)],
            Expected::Value(1176.0 * DAY, TIME, 5e-4),
            "Kuo 2014 ex. 3.3, 1,176 days",
        );
        // Same book, example 3.13: T = K b = 400 gpd/ft^2 x 30 ft = 12,000 gpd/ft.
        check(
            "transmissivity",
            &[
                si(400.0 * GALLON / DAY / (FT * FT), VELOCITY),
                si(30.0 * FT, LENGTH),
            ],
            Expected::Value(12_000.0 * GALLON / DAY / FT, AREA_PER_TIME, 1e-12),
            "Kuo 2014 ex. 3.13",
        );
        // Hubbert's (1940) point, exact: a hydrostatic column does not flow. s points down, so
        // g_s = +g0 and dp/ds = rho g0.
        let (rho, g) = (998.2, 9.806_65);
        check(
            "darcy_flux_pressure",
            &[
                si(1e-12, AREA),
                si(1.002e-3, DYNAMIC_VISCOSITY),
                si(rho * g, PRESSURE_GRADIENT),
                si(rho, DENSITY),
                si(g, ACCELERATION),
            ],
            Expected::Value(0.0, VELOCITY, 1e-30),
            "hydrostatic column, q = 0 exactly",
        );
        // Consistency with q = K i, K = k rho g / mu: upward flow (s up, g_s = -g0) under a
        // head gradient of 0.5 (head drop per length along s), i.e. dp/ds = -rho g (1 + 0.5).
        let (k, mu) = (1e-12, 1.002e-3);
        check(
            "darcy_flux_pressure",
            &[
                si(k, AREA),
                si(mu, DYNAMIC_VISCOSITY),
                si(-rho * g * 1.5, PRESSURE_GRADIENT),
                si(rho, DENSITY),
                si(-g, ACCELERATION),
            ],
            Expected::Value(k * rho * g / mu * 0.5, VELOCITY, 1e-12),
            "q = K i with K = k rho g / mu (derived)",
        );
        // Hand arithmetic (no published example used): 1e-3 m/s through 1 mm grains of water
        // at 20 degC, Re = 998.2 x 1e-3 x 1e-3 / 1.002e-3 = 0.99621.
        check(
            "reynolds_number",
            &[
                si(-1e-3, VELOCITY),
                si(1e-3, LENGTH),
                si(998.2, DENSITY),
                si(1.002e-3, DYNAMIC_VISCOSITY),
            ],
            Expected::Value(0.996_207_584_830_339_3, DIMENSIONLESS, 1e-12),
            "hand arithmetic; the sign of q does not matter",
        );
    }
}
