//! Diffusion of solutes: Fick's first law in free solution and in a saturated porous medium,
//! and the pore diffusion coefficient from a tortuosity factor or the formation factor.
//!
//! A molar concentration gradient (mol/m⁴) gives a molar flux, a mass-concentration gradient
//! (kg/m⁴, e.g. `mg/(L*m)`) a mass flux: each relation has one form for each. The flux is
//! positive along x, so it is negative where the concentration rises.

use super::dimensions::{
    AREA_PER_TIME, DIMENSIONLESS, MASS_CONCENTRATION_GRADIENT, MASS_FLUX,
    MOLAR_CONCENTRATION_GRADIENT, MOLAR_FLUX,
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
const FREE_DIFFUSION: Parameter = Parameter::new(
    "D0",
    "a free-solution diffusion coefficient",
    AREA_PER_TIME,
    Domain::NonNegative,
);
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
                example: "fick_flux(2e-9 m^2/s, 0.5 mol/m^4)",
                body: fick_flux,
            },
            Form {
                parameters: &[FREE_SOLUTION_D, MASS_GRADIENT],
                result: MASS_FLUX,
                unit: "kg/(m^2*s)",
                formulations: &[&FICK],
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
                example: "porous_fick_flux(0.4, 5e-10 m^2/s, 0.5 mol/m^4)",
                body: porous_fick_flux,
            },
            Form {
                parameters: &[POROSITY, PORE_DIFFUSION, MASS_GRADIENT],
                result: MASS_FLUX,
                unit: "kg/(m^2*s)",
                formulations: &[&POROUS_FICK],
                example: "porous_fick_flux(0.4, 5e-10 m^2/s, 30 mg/(L*m))",
                body: porous_fick_flux,
            },
        ],
    },
];

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
                super::three_figures(formation_factor * porosity)
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
}
