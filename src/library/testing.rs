//! Shared by the families' reference tests: unit factors written from their definitions, and
//! `check`, which calls a built-in through the standard library (so through its entry's
//! argument, domain and range checks) and compares with a published or hand-computed value.

#![allow(clippy::unwrap_used)]

use super::Builtins;
use crate::eval::{CallError, Library, Provenance, Quantity};
use crate::units::Dimension;

// Unit factors to SI (exact by definition unless noted).
pub const CM: f64 = 0.01;
pub const MM: f64 = 1e-3;
pub const FT: f64 = 0.3048;
pub const GALLON: f64 = 3.785_411_784e-3;
pub const MINUTE: f64 = 60.0;
pub const DAY: f64 = 86_400.0;
pub const PSI: f64 = 0.453_592_37 * 9.806_65 / (0.0254 * 0.0254);
/// 1 mD = 1e-3 D, with 1 D = 1e-12/1.01325 m^2 as in the unit catalog.
pub const MILLIDARCY: f64 = 1e-15 / 1.013_25;

pub fn si(value: f64, dimension: Dimension) -> Quantity {
    Quantity::new(value, dimension)
}

pub fn number(value: f64) -> Quantity {
    Quantity::dimensionless(value)
}

/// What a call must give.
pub enum Expected {
    /// SI value, its dimension, relative tolerance.
    Value(f64, Dimension, f64),
    WrongDimension(usize),
    Domain(usize),
    OutOfRange(usize),
}

/// Calls `name` through the standard library (so through its entry's checks) with SI
/// arguments and compares with `expected`. A value must also have recorded every formulation
/// of the form that was called; a refusal must record none.
pub fn check(name: &str, arguments: &[Quantity], expected: Expected, source: &str) {
    let (result, provenance) = call(name, arguments);
    match (expected, result) {
        (Expected::Value(value, dimension, relative), Ok(found)) => {
            assert_eq!(found.dimension, dimension, "{name} ({source}): dimension");
            let difference = if value == 0.0 {
                found.value.abs()
            } else {
                ((found.value - value) / value).abs()
            };
            assert!(
                difference <= relative,
                "{name} ({source}): {} vs {value} (relative {difference:e} > {relative:e})",
                found.value
            );
            assert!(
                !provenance.formulations().is_empty(),
                "{name}: nothing recorded"
            );
        }
        (Expected::WrongDimension(index), Err(CallError::WrongDimension { argument, .. }))
        | (
            Expected::Domain(index),
            Err(CallError::Domain {
                argument: Some(argument),
                ..
            }),
        )
        | (
            Expected::OutOfRange(index),
            Err(CallError::OutOfRange {
                argument: Some(argument),
                ..
            }),
        ) => {
            assert_eq!(argument, index, "{name} ({source}): refused argument");
            assert!(provenance.formulations().is_empty(), "{name}: recorded");
        }
        (_, outcome) => panic!("{name} ({source}): unexpected {outcome:?}"),
    }
}

/// Calls a built-in by name with SI arguments: its result and what it recorded.
pub fn call(name: &str, arguments: &[Quantity]) -> (Result<Quantity, CallError>, Provenance) {
    let function = Builtins::standard()
        .function(name)
        .unwrap_or_else(|| panic!("no function `{name}`"));
    let mut provenance = Provenance::default();
    (function.call(arguments, &mut provenance), provenance)
}

#[cfg(test)]
mod tests {
    //! Refusal tables of the relations written before the generic walk existed, kept as they
    //! were: each names the argument that must be refused.

    use super::*;
    use crate::library::dimensions::*;

    #[test]
    fn wrong_dimensions_are_refused_with_the_argument() {
        let metre = si(1.0, LENGTH);
        let speed = si(1e-5, VELOCITY);
        let cases: Vec<(&str, Vec<Quantity>, usize)> = vec![
            ("darcy_flux", vec![metre, number(0.1)], 0),
            ("darcy_flux", vec![speed, metre], 1),
            (
                "darcy_flux_pressure",
                vec![
                    si(1e-12, AREA),
                    si(1e-3, DYNAMIC_VISCOSITY),
                    si(1.0, PRESSURE),
                    si(1000.0, DENSITY),
                    si(9.8, ACCELERATION),
                ],
                2,
            ),
            ("seepage_velocity", vec![speed, metre], 1),
            ("fick_flux", vec![si(1e-9, AREA_PER_TIME), metre], 1),
            (
                "fick_flux",
                vec![speed, si(1.0, MOLAR_CONCENTRATION_GRADIENT)],
                0,
            ),
            (
                "fourier_flux",
                vec![si(2.0, THERMAL_CONDUCTIVITY), si(1.0, TIME)],
                1,
            ),
            (
                "ohm_current_density",
                vec![si(1.0, ELECTRICAL_RESISTIVITY), si(1.0, VOLTAGE_GRADIENT)],
                0,
            ),
            ("hazen_conductivity", vec![si(0.2 * MM, LENGTH), metre], 1),
            ("hazen_conductivity", vec![number(0.2)], 0),
            (
                "klinkenberg_liquid_permeability",
                vec![si(1e-13, AREA), si(1e4, PRESSURE), metre],
                2,
            ),
            ("liner_leakage", vec![speed, metre, si(1.0, TIME)], 2),
        ];
        for (name, arguments, index) in cases {
            check(
                name,
                &arguments,
                Expected::WrongDimension(index),
                "dimension",
            );
        }
    }

    #[test]
    fn arguments_outside_the_domain_are_refused_with_the_argument() {
        let metre = si(1.0, LENGTH);
        let speed = si(1e-5, VELOCITY);
        let cases: Vec<(&str, Vec<Quantity>, Expected)> = vec![
            (
                "darcy_flux",
                vec![si(-1e-5, VELOCITY), number(0.1)],
                Expected::Domain(0),
            ),
            (
                "seepage_velocity",
                vec![speed, number(0.0)],
                Expected::Domain(1),
            ),
            (
                "seepage_velocity",
                vec![speed, number(1.2)],
                Expected::Domain(1),
            ),
            (
                "travel_time",
                vec![metre, si(0.0, VELOCITY)],
                Expected::Domain(1),
            ),
            (
                "travel_time",
                vec![metre, si(-1e-6, VELOCITY)],
                Expected::Domain(1),
            ),
            (
                "transmissivity",
                vec![speed, si(0.0, LENGTH)],
                Expected::Domain(1),
            ),
            (
                "reynolds_number",
                vec![
                    speed,
                    si(0.0, LENGTH),
                    si(1000.0, DENSITY),
                    si(1e-3, DYNAMIC_VISCOSITY),
                ],
                Expected::Domain(1),
            ),
            (
                "effective_diffusion",
                vec![si(1e-9, AREA_PER_TIME), number(1.5)],
                Expected::Domain(1),
            ),
            (
                "effective_diffusion_formation",
                vec![si(1e-9, AREA_PER_TIME), number(2.0), number(0.3)],
                Expected::Domain(1),
            ),
            (
                "porous_fick_flux",
                vec![
                    number(-0.1),
                    si(1e-9, AREA_PER_TIME),
                    si(1.0, MOLAR_CONCENTRATION_GRADIENT),
                ],
                Expected::Domain(0),
            ),
            (
                "geometric_mean_conductivity",
                vec![
                    si(3.0, THERMAL_CONDUCTIVITY),
                    si(0.0, THERMAL_CONDUCTIVITY),
                    number(0.3),
                ],
                Expected::Domain(1),
            ),
            (
                "archie_formation_factor",
                vec![number(0.2), number(1.0), number(0.0)],
                Expected::Domain(2),
            ),
            (
                "archie_porosity",
                vec![
                    si(0.1, ELECTRICAL_RESISTIVITY),
                    si(0.25, ELECTRICAL_RESISTIVITY),
                    number(1.0),
                    number(2.0),
                ],
                Expected::Domain(0),
            ),
            (
                "hazen_conductivity",
                vec![si(0.05 * MM, LENGTH)],
                Expected::OutOfRange(0),
            ),
            (
                "hazen_conductivity",
                vec![si(5.0 * MM, LENGTH)],
                Expected::OutOfRange(0),
            ),
            (
                "hazen_conductivity",
                vec![si(0.2 * MM, LENGTH), number(-100.0)],
                Expected::Domain(1),
            ),
            (
                "kozeny_carman_permeability",
                vec![si(0.2 * MM, LENGTH), number(1.0)],
                Expected::Domain(1),
            ),
            (
                "klinkenberg_liquid_permeability",
                vec![si(1e-13, AREA), si(1e4, PRESSURE), si(0.0, PRESSURE)],
                Expected::Domain(2),
            ),
            (
                "constant_head_conductivity",
                vec![
                    si(1e-6, VOLUME_FLOW_RATE),
                    metre,
                    si(0.01, AREA),
                    si(0.0, LENGTH),
                ],
                Expected::Domain(3),
            ),
            (
                "falling_head_conductivity",
                vec![
                    si(4e-5, AREA),
                    metre,
                    si(1e-3, AREA),
                    si(-1.0, TIME),
                    si(0.5, LENGTH),
                    si(0.3, LENGTH),
                ],
                Expected::Domain(3),
            ),
            (
                "falling_head_conductivity",
                vec![
                    si(4e-5, AREA),
                    metre,
                    si(1e-3, AREA),
                    si(180.0, TIME),
                    si(0.3, LENGTH),
                    si(0.3, LENGTH),
                ],
                Expected::Domain(5),
            ),
            (
                "liner_leakage",
                vec![speed, metre, si(0.0, LENGTH)],
                Expected::Domain(2),
            ),
        ];
        for (name, arguments, expected) in cases {
            check(name, &arguments, expected, "domain");
        }
    }
}
