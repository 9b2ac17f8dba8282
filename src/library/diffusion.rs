//! Diffusion of solutes: Fick's first law in free solution and in a saturated porous medium,
//! the pore diffusion coefficient from a tortuosity factor or the formation factor, and Fick's
//! second law in a half-space after a step change at its surface (the erfc solution) with the
//! depth a given relative concentration reaches in a given time.
//!
//! A molar concentration gradient (mol/m⁴) gives a molar flux, a mass-concentration gradient
//! (kg/m⁴, e.g. `mg/(L*m)`) a mass flux: each relation has one form for each. The flux is
//! positive along x, so it is negative where the concentration rises.

use super::dimensions::{
    AREA_PER_TIME, DIMENSIONLESS, LENGTH, MASS_CONCENTRATION_GRADIENT, MASS_FLUX,
    MOLAR_CONCENTRATION_GRADIENT, MOLAR_FLUX, TIME,
};
use super::relation::{arguments, Domain, Form, Parameter, Relation};
use crate::eval::function::CallError;
use crate::eval::Formulation;

const SHACKELFORD_DANIEL_1991: &str = "Shackelford, C. D. and Daniel, D. E., 1991, Diffusion in \
saturated soil. I: Background, Journal of Geotechnical Engineering 117(3), 467-484";
/// Fick's first law in free solution.
pub static FICK: Formulation = Formulation {
    id: "fick-1855",
    title: "Fick's first law, J = -D dc/dx",
    citation: "Fick, A., 1855, Ueber Diffusion, Annalen der Physik und Chemie 94, 59-86",
    validity: "dilute solute, isothermal, no advection; D the free-solution diffusion \
coefficient",
    ranges: &[],
};
/// Pore diffusion coefficient from a tortuosity factor.
pub static TORTUOSITY_DIFFUSION: Formulation = Formulation {
    id: "tortuosity-diffusion",
    title: "effective diffusion coefficient, D* = tau D0 (tau <= 1)",
    citation: SHACKELFORD_DANIEL_1991,
    validity: "saturated medium, non-sorbing solute; tau the apparent tortuosity factor in \
(0, 1], about 0.01 to 0.5 in laboratory studies of soils",
    ranges: &[],
};
/// Pore diffusion coefficient from the electrical formation factor.
pub static FORMATION_FACTOR_DIFFUSION: Formulation = Formulation {
    id: "formation-factor-diffusion",
    title: "effective diffusion coefficient from the formation factor, D* = D0 / (F n)",
    citation: "Klinkenberg, L. J., 1951, Analogy between diffusion and electrical conductivity \
in porous rocks, Geological Society of America Bulletin 62(6), 559-564",
    validity: "saturated, clay-free medium without surface conduction, non-sorbing solute; F the \
electrical formation factor rho_0 / rho_w",
    ranges: &[],
};
/// Fick's first law in a saturated porous medium, per unit of total area.
pub static POROUS_FICK: Formulation = Formulation {
    id: "porous-fick",
    title: "Fick's first law in a porous medium, J = -n D* dc/dx",
    citation: SHACKELFORD_DANIEL_1991,
    validity: "saturated medium, steady diffusion of a non-sorbing solute; c the pore-water \
concentration, J per unit of total cross-section",
    ranges: &[],
};
/// Fick's second law in a half-space after a step change of concentration at its surface.
pub static HALF_SPACE_DIFFUSION: Formulation = Formulation {
    id: "half-space-diffusion-erfc",
    title: "diffusion into a half-space after a step change at its surface, \
(c - c_i)/(c_s - c_i) = erfc(x / (2 sqrt(D t / R)))",
    citation: "Crank, J., 1975, The Mathematics of Diffusion, 2nd ed., Clarendon Press, Oxford, \
chapter 2 (semi-infinite medium, constant surface concentration); apparent diffusion D/R for \
a linearly sorbing solute as in Shackelford, C. D. and Daniel, D. E., 1991, Diffusion in \
saturated soil. I: Background, Journal of Geotechnical Engineering 117(3), 467-484",
    validity: "one-dimensional diffusion without advection into a homogeneous medium of \
uniform initial concentration c_i, much thicker than the depth reached; surface concentration \
c_s held from t = 0; constant D; linear equilibrium sorption (R)",
    ranges: &[],
};
const FREE_DIFFUSION: Parameter = Parameter::new(
    "D0",
    "a free-solution diffusion coefficient",
    AREA_PER_TIME,
    Domain::NonNegative,
);
const DEPTH_TIME: Parameter = Parameter::new(
    "t",
    "the time since the step change",
    TIME,
    Domain::Positive,
);
const HALF_SPACE_D: Parameter = Parameter::new(
    "D",
    "a diffusion coefficient (De in a porous medium)",
    AREA_PER_TIME,
    Domain::Positive,
);
const SORPTION_RETARDATION: Parameter =
    Parameter::new("R", "a retardation factor", DIMENSIONLESS, Domain::Positive).or(1.0);
const POROSITY: Parameter = Parameter::new("n", "a porosity", DIMENSIONLESS, Domain::Fraction);
const MOLAR_GRADIENT: Parameter = Parameter::new(
    "dc_dx",
    "a concentration gradient",
    MOLAR_CONCENTRATION_GRADIENT,
    Domain::Any,
);
const MASS_GRADIENT: Parameter = Parameter::new(
    "dc_dx",
    "a concentration gradient",
    MASS_CONCENTRATION_GRADIENT,
    Domain::Any,
);
const FREE_SOLUTION_D: Parameter = Parameter::new(
    "D",
    "a diffusion coefficient",
    AREA_PER_TIME,
    Domain::NonNegative,
);
const PORE_DIFFUSION: Parameter = Parameter::new(
    "De",
    "a pore (effective) diffusion coefficient",
    AREA_PER_TIME,
    Domain::NonNegative,
);

pub static RELATIONS: &[Relation] = &[
    Relation {
        name: "fick_flux",
        summary:
            "diffusive flux J = -D dc_dx in free solution (mol/(m^2*s), or kg/(m^2*s) for a mass \
concentration gradient); Fick 1855",
        forms: &[
            Form {
                parameters: &[FREE_SOLUTION_D, MOLAR_GRADIENT],
                result: MOLAR_FLUX,
                unit: "mol/(m^2*s)",
                formulations: &[&FICK],
                formula: "J = -D * dc_dx",
                example: "fick_flux(2e-9 m^2/s, 0.5 mol/m^4)",
                body: fick_flux,
            },
            Form {
                parameters: &[FREE_SOLUTION_D, MASS_GRADIENT],
                result: MASS_FLUX,
                unit: "kg/(m^2*s)",
                formulations: &[&FICK],
                formula: "J = -D * dc_dx",
                example: "fick_flux(2e-9 m^2/s, 30 mg/(L*m))",
                body: fick_flux,
            },
        ],
    },
    Relation {
        name: "effective_diffusion",
        summary:
            "effective (pore) diffusion coefficient D* = tau D0 (m^2/s); tau apparent tortuosity \
factor in (0, 1]; Shackelford & Daniel 1991",
        forms: &[Form {
            parameters: &[
                FREE_DIFFUSION,
                Parameter::new(
                    "tau",
                    "a tortuosity factor (1 for a straight path)",
                    DIMENSIONLESS,
                    Domain::Fraction,
                ),
            ],
            result: AREA_PER_TIME,
            unit: "m^2/s",
            formulations: &[&TORTUOSITY_DIFFUSION],
            formula: "D* = tau * D0",
            example: "effective_diffusion(2e-9 m^2/s, 0.3)",
            body: effective_diffusion,
        }],
    },
    Relation {
        name: "effective_diffusion_formation",
        summary:
            "effective (pore) diffusion coefficient D* = D0 / (F n) (m^2/s) from the electrical \
formation factor F and porosity n, the same D* as effective_diffusion; Klinkenberg 1951",
        forms: &[Form {
            parameters: &[
                FREE_DIFFUSION,
                Parameter::new("F", "a formation factor", DIMENSIONLESS, Domain::Positive),
                POROSITY,
            ],
            result: AREA_PER_TIME,
            unit: "m^2/s",
            formulations: &[&FORMATION_FACTOR_DIFFUSION],
            formula: "D* = D0 / (F * n)",
            example: "effective_diffusion_formation(2e-9 m^2/s, 12, 0.3)",
            body: effective_diffusion_formation,
        }],
    },
    Relation {
        name: "porous_fick_flux",
        summary: "diffusive flux per unit of total area J = -n De dc_dx (mol/(m^2*s) or \
kg/(m^2*s)); n porosity, De the effective (pore) diffusion coefficient D*, c pore-water \
concentration; Shackelford & Daniel 1991",
        forms: &[
            Form {
                parameters: &[POROSITY, PORE_DIFFUSION, MOLAR_GRADIENT],
                result: MOLAR_FLUX,
                unit: "mol/(m^2*s)",
                formulations: &[&POROUS_FICK],
                formula: "J = -n * De * dc_dx",
                example: "porous_fick_flux(0.4, 5e-10 m^2/s, 0.5 mol/m^4)",
                body: porous_fick_flux,
            },
            Form {
                parameters: &[POROSITY, PORE_DIFFUSION, MASS_GRADIENT],
                result: MASS_FLUX,
                unit: "kg/(m^2*s)",
                formulations: &[&POROUS_FICK],
                formula: "J = -n * De * dc_dx",
                example: "porous_fick_flux(0.4, 5e-10 m^2/s, 30 mg/(L*m))",
                body: porous_fick_flux,
            },
        ],
    },
    Relation {
        name: "half_space_diffusion",
        summary: "relative concentration (c - c_i)/(c_s - c_i) = erfc(x / (2 sqrt(D t / R))) at \
depth x, time t after the surface concentration stepped to c_s (dimensionless); D diffusion \
coefficient (De in a porous medium), R retardation factor (1 when left out); Crank 1975",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "x",
                    "the depth below the surface",
                    LENGTH,
                    Domain::NonNegative,
                ),
                DEPTH_TIME,
                HALF_SPACE_D,
                SORPTION_RETARDATION,
            ],
            result: DIMENSIONLESS,
            unit: "1",
            formulations: &[&HALF_SPACE_DIFFUSION],
            formula: "c_rel = erfc(x / (2 * sqrt(D * t / R)))",
            example: "half_space_diffusion(0.5 m, 30 yr, 5e-10 m^2/s)",
            body: half_space_diffusion,
        }],
    },
    Relation {
        name: "diffusion_front_depth",
        summary: "depth x = 2 sqrt(D t / R) erfcinv(c_ratio) (m) at which the relative \
concentration (c - c_i)/(c_s - c_i) has reached c_ratio after time t; the inverse of \
half_space_diffusion in x; Crank 1975",
        forms: &[Form {
            parameters: &[
                DEPTH_TIME,
                HALF_SPACE_D,
                Parameter::new(
                    "c_ratio",
                    "a relative concentration marking the front",
                    DIMENSIONLESS,
                    Domain::OpenFraction,
                ),
                SORPTION_RETARDATION,
            ],
            result: LENGTH,
            unit: "m",
            formulations: &[&HALF_SPACE_DIFFUSION],
            formula: "x = 2 * sqrt(D * t / R) * erfcinv(c_ratio)",
            example: "diffusion_front_depth(30 yr, 5e-10 m^2/s, 0.1)",
            body: diffusion_front_depth,
        }],
    },
];

/// Fick's second law with c(0, t) = c_s, c(x, 0) = c_i: erfc of x over 2√(D t / R).
fn half_space_diffusion(values: &[f64]) -> Result<f64, CallError> {
    let [depth, time, diffusion, retardation] = arguments(values);
    Ok(libm::erfc(
        depth / (2.0 * (diffusion * time / retardation).sqrt()),
    ))
}

fn diffusion_front_depth(values: &[f64]) -> Result<f64, CallError> {
    let [time, diffusion, ratio, retardation] = arguments(values);
    Ok(2.0 * (diffusion * time / retardation).sqrt() * inverse_erfc(ratio))
}

/// y with erfc(y) = `ratio`, for `ratio` in (0, 1): y in (0, 27), where erfc falls
/// monotonically from 1 to below the smallest normal double. Bisection to the last bit, since
/// erfc is monotone and the bracket is known; about 60 halvings.
fn inverse_erfc(ratio: f64) -> f64 {
    let (mut low, mut high) = (0.0_f64, 27.3_f64);
    while high - low > f64::EPSILON * high {
        let middle = 0.5 * (low + high);
        if libm::erfc(middle) > ratio {
            low = middle;
        } else {
            high = middle;
        }
    }
    0.5 * (low + high)
}

fn fick_flux(values: &[f64]) -> Result<f64, CallError> {
    let [diffusion, gradient] = arguments(values);
    Ok(-diffusion * gradient)
}

/// τ is the apparent tortuosity factor of Shackelford & Daniel (1991), at most 1 (the ω of
/// Freeze & Cherry 1979), not the tortuosity L_e/L ≥ 1. D* multiplies the pore-water gradient
/// and the porosity in `porous_fick_flux`.
fn effective_diffusion(values: &[f64]) -> Result<f64, CallError> {
    let [free_diffusion, tortuosity_factor] = arguments(values);
    Ok(free_diffusion * tortuosity_factor)
}

/// The same D* as `effective_diffusion`, so that `porous_fick_flux(n, D*, dc_dx)` is
/// −(D0/F) dc/dx, Klinkenberg's (1951) electrical analogy. The implied tortuosity factor
/// 1/(F n) cannot exceed 1 (F n is at least 1 for an insulating matrix, by the Hashin–Shtrikman
/// bound), so F n below 1 is refused as data inconsistent with the model.
fn effective_diffusion_formation(values: &[f64]) -> Result<f64, CallError> {
    let [free_diffusion, formation_factor, porosity] = arguments(values);
    if formation_factor * porosity < 1.0 {
        return Err(CallError::Domain {
            argument: Some(1),
            message: format!(
                "`F` times `n` is {}, below 1: the pore diffusion coefficient would exceed `D0`, \
which an insulating matrix does not allow",
                crate::numeric::message_number(formation_factor * porosity)
            ),
        });
    }
    Ok(free_diffusion / (formation_factor * porosity))
}

fn porous_fick_flux(values: &[f64]) -> Result<f64, CallError> {
    let [porosity, diffusion, gradient] = arguments(values);
    Ok(-porosity * diffusion * gradient)
}

#[cfg(test)]
mod tests {
    //! Reference cases through `library::testing::check`. Each value names its source; "from
    //! memory" marks textbook examples recalled rather than re-read.

    use crate::library::dimensions::*;
    use crate::library::testing::*;

    #[test]
    fn fick_and_pore_diffusion_match_references() {
        // Hand arithmetic: chloride, D0 = 2.03e-9 m^2/s at 25 degC (Li & Gregory 1974, from
        // memory), across a gradient of 10 mol/m^3 per metre.
        check(
            "fick_flux",
            &[
                si(2.03e-9, AREA_PER_TIME),
                si(10.0, MOLAR_CONCENTRATION_GRADIENT),
            ],
            Expected::Value(-2.03e-8, MOLAR_FLUX, 1e-12),
            "hand arithmetic",
        );
        check(
            "fick_flux",
            &[
                si(2.03e-9, AREA_PER_TIME),
                si(-0.5, MASS_CONCENTRATION_GRADIENT),
            ],
            Expected::Value(1.015e-9, MASS_FLUX, 1e-12),
            "hand arithmetic, mass concentration",
        );
        check(
            "effective_diffusion",
            &[si(2.03e-9, AREA_PER_TIME), number(0.3)],
            Expected::Value(6.09e-10, AREA_PER_TIME, 1e-12),
            "hand arithmetic",
        );
        // Klinkenberg (1951) analogy, exact by construction: n D* = D0 / F, so the porous flux
        // with D* from the formation factor is -(D0/F) dc/dx. F = 12, n = 0.25, D* = D0/3.
        check(
            "effective_diffusion_formation",
            &[si(2.03e-9, AREA_PER_TIME), number(12.0), number(0.25)],
            Expected::Value(2.03e-9 / 3.0, AREA_PER_TIME, 1e-12),
            "D0 / (F n)",
        );
        check(
            "porous_fick_flux",
            &[
                number(0.25),
                si(2.03e-9 / 3.0, AREA_PER_TIME),
                si(10.0, MOLAR_CONCENTRATION_GRADIENT),
            ],
            Expected::Value(-2.03e-9 / 12.0 * 10.0, MOLAR_FLUX, 1e-12),
            "-(D0/F) dc/dx",
        );
    }

    #[test]
    fn half_space_diffusion_matches_the_erfc_table() {
        // Arguments chosen so that x / (2 sqrt(D t)) is exactly 0.5 and 1: erf(0.5) =
        // 0.5204998778 and erf(1) = 0.8427007929 (Abramowitz & Stegun 1964, table 7.1).
        let (diffusion, time) = (1e-9_f64, 2.5e8_f64);
        let scale = 2.0 * (diffusion * time).sqrt(); // 1 m
        for (argument, erf) in [(0.5, 0.520_499_877_8), (1.0, 0.842_700_792_9)] {
            check(
                "half_space_diffusion",
                &[
                    si(argument * scale, LENGTH),
                    si(time, TIME),
                    si(diffusion, AREA_PER_TIME),
                ],
                Expected::Value(1.0 - erf, DIMENSIONLESS, 1e-9),
                "Abramowitz & Stegun 1964, table 7.1",
            );
        }
        // A retardation factor R slows the front as D/R: R = 4 halves the argument.
        check(
            "half_space_diffusion",
            &[
                si(0.5 * scale, LENGTH),
                si(time, TIME),
                si(4.0 * diffusion, AREA_PER_TIME),
                number(4.0),
            ],
            Expected::Value(1.0 - 0.520_499_877_8, DIMENSIONLESS, 1e-9),
            "D/R, Abramowitz & Stegun 1964, table 7.1",
        );
        // An independent erfc: the Maclaurin series of erf (A&S 7.1.5) at x = 0.8.
        let x: f64 = 0.8;
        let (mut term, mut erf) = (x, 0.0);
        for n in 0..40 {
            erf += term / (2 * n + 1) as f64;
            term *= -x * x / (n + 1) as f64;
        }
        erf *= 2.0 / std::f64::consts::PI.sqrt();
        check(
            "half_space_diffusion",
            &[
                si(0.8 * scale, LENGTH),
                si(time, TIME),
                si(diffusion, AREA_PER_TIME),
            ],
            Expected::Value(1.0 - erf, DIMENSIONLESS, 1e-13),
            "A&S 7.1.5 series",
        );
    }

    #[test]
    fn the_front_depth_inverts_the_erfc_solution() {
        // erfc(1) = 1 - 0.8427007929 (A&S table 7.1): that front sits at x = 2 sqrt(D t).
        let (diffusion, time) = (5e-10, 30.0 * 365.25 * 86400.0);
        check(
            "diffusion_front_depth",
            &[
                si(time, TIME),
                si(diffusion, AREA_PER_TIME),
                number(1.0 - 0.842_700_792_9),
            ],
            Expected::Value(2.0 * (diffusion * time).sqrt(), LENGTH, 1e-9),
            "Abramowitz & Stegun 1964, table 7.1",
        );
        for ratio in [1e-12, 1e-3, 0.1, 0.5, 0.9, 0.999_999] {
            let (depth, _) = call(
                "diffusion_front_depth",
                &[
                    si(time, TIME),
                    si(diffusion, AREA_PER_TIME),
                    number(ratio),
                    number(2.5),
                ],
            );
            let depth = depth.expect("a depth");
            check(
                "half_space_diffusion",
                &[
                    depth,
                    si(time, TIME),
                    si(diffusion, AREA_PER_TIME),
                    number(2.5),
                ],
                Expected::Value(ratio, DIMENSIONLESS, 1e-12),
                "round trip",
            );
        }
    }
}
