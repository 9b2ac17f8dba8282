//! Heat conduction: Fourier's law and the conductivity of a saturated medium.

use super::dimensions::{DIMENSIONLESS, HEAT_FLUX, TEMPERATURE_GRADIENT, THERMAL_CONDUCTIVITY};
use super::relation::{arguments, Domain, Form, Parameter, Relation};
use crate::eval::function::CallError;
use crate::eval::Formulation;

/// Fourier's law of conduction.
pub static FOURIER: Formulation = Formulation {
    id: "fourier-1822",
    title: "Fourier's law, q = -lambda dT/dx",
    citation: "Fourier, J., 1822, Theorie analytique de la chaleur, Firmin Didot, Paris",
    validity: "conduction in an isotropic medium; for soil and rock lambda is the bulk \
(effective) conductivity and convection in the pores is neglected",
    ranges: &[],
};
/// Geometric-mean mixing rule for the conductivity of a saturated medium.
pub static GEOMETRIC_MEAN_CONDUCTIVITY: Formulation = Formulation {
    id: "geometric-mean-conductivity",
    title: "geometric-mean thermal conductivity, lambda = lambda_s^(1-n) lambda_f^n",
    citation: "Woodside, W. and Messmer, J. H., 1961, Thermal conductivity of porous media. \
I. Unconsolidated sands, Journal of Applied Physics 32(9), 1688-1699; Johansen, O., 1975, \
Thermal conductivity of soils, PhD thesis, Norwegian Institute of Technology, Trondheim",
    validity: "fully saturated soils and rocks of one solid phase and one pore fluid; an \
empirical rule, no convection in the pores",
    ranges: &[],
};
pub static RELATIONS: &[Relation] = &[
    Relation {
        name: "fourier_flux",
        summary:
            "conductive heat flux q = -lambda dT_dx (W/m^2); lambda thermal conductivity, dT_dx \
temperature gradient (K/m); Fourier 1822",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "lambda",
                    "a thermal conductivity",
                    THERMAL_CONDUCTIVITY,
                    Domain::NonNegative,
                ),
                Parameter::new(
                    "dT_dx",
                    "a temperature gradient",
                    TEMPERATURE_GRADIENT,
                    Domain::Any,
                ),
            ],
            result: HEAT_FLUX,
            unit: "W/m^2",
            formulations: &[&FOURIER],
            example: "fourier_flux(2.1 W/(m*K), 0.03 K/m)",
            body: fourier_flux,
        }],
    },
    Relation {
        name: "geometric_mean_conductivity",
        summary: "saturated thermal conductivity lambda = lambda_solid^(1-n) lambda_fluid^n \
(W/(m*K)); n porosity; Woodside & Messmer 1961, Johansen 1975",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "lambda_solid",
                    "the conductivity of the solid",
                    THERMAL_CONDUCTIVITY,
                    Domain::Positive,
                ),
                Parameter::new(
                    "lambda_fluid",
                    "the conductivity of the pore fluid",
                    THERMAL_CONDUCTIVITY,
                    Domain::Positive,
                ),
                Parameter::new("n", "a porosity", DIMENSIONLESS, Domain::Fraction),
            ],
            result: THERMAL_CONDUCTIVITY,
            unit: "W/(m*K)",
            formulations: &[&GEOMETRIC_MEAN_CONDUCTIVITY],
            example: "geometric_mean_conductivity(3 W/(m*K), 0.6 W/(m*K), 0.3)",
            body: geometric_mean_conductivity,
        }],
    },
];

/// q = −λ dT/dx: positive along x, toward lower temperature.
fn fourier_flux(values: &[f64]) -> Result<f64, CallError> {
    let [conductivity, gradient] = arguments(values);
    Ok(-conductivity * gradient)
}

/// λ = λs^(1−n) λf^n; Woodside & Messmer (1961), used by Johansen (1975) for the saturated end
/// member. Both citations are from memory.
fn geometric_mean_conductivity(values: &[f64]) -> Result<f64, CallError> {
    let [solid, fluid, porosity] = arguments(values);
    Ok(solid.powf(1.0 - porosity) * fluid.powf(porosity))
}

#[cfg(test)]
mod tests {
    //! Reference cases through `library::testing::check`. Each value names its source; "from
    //! memory" marks textbook examples recalled rather than re-read.

    use crate::library::dimensions::*;
    use crate::library::testing::*;

    #[test]
    fn fourier_and_geometric_mean_match_references() {
        // Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, example 1.1 (from
        // memory): fireclay brick wall 0.15 m thick, lambda = 1.7 W/(m K), faces at 1400 K and
        // 1150 K: q'' = 1.7 x 250 / 0.15 = 2833 W/m^2 toward the cold face (+x).
        check(
            "fourier_flux",
            &[
                si(1.7, THERMAL_CONDUCTIVITY),
                si((1150.0 - 1400.0) / 0.15, TEMPERATURE_GRADIENT),
            ],
            Expected::Value(2833.3, HEAT_FLUX, 2e-5),
            "Incropera ex. 1.1 (from memory)",
        );
        // Johansen's constants (from memory): quartz 7.7 W/(m K), water 0.57 W/(m K). Quartz
        // sand at n = 0.4: 7.7^0.6 x 0.57^0.4 = exp(0.6 x 2.041220 - 0.4 x 0.562119) = 2.71797
        // (hand arithmetic with a table of logarithms, six figures).
        check(
            "geometric_mean_conductivity",
            &[
                si(7.7, THERMAL_CONDUCTIVITY),
                si(0.57, THERMAL_CONDUCTIVITY),
                number(0.4),
            ],
            Expected::Value(2.717_97, THERMAL_CONDUCTIVITY, 2e-6),
            "geometric mean, hand arithmetic",
        );
    }
}
