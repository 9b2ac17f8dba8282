//! Liquid water as sheet relations: density, viscosity, specific heat, thermal conductivity and
//! saturation pressure at T (and p, one standard atmosphere when left out). The formulations
//! themselves, typed with `uom`, are in `iapws`; they refuse ice, steam and anything outside
//! their published range, so these entries only convert numbers to and from them.

mod iapws;

pub use iapws::*;

use super::dimensions::{
    AREA_PER_TIME, DENSITY, DYNAMIC_VISCOSITY, PRESSURE, SPECIFIC_HEAT, TEMPERATURE,
    THERMAL_CONDUCTIVITY,
};
use super::formulation::refused;
use super::relation::{arguments, Domain, Form, Parameter, Relation};
use crate::eval::function::CallError;
use crate::eval::Formulation;
use uom::si::f64::{Pressure, ThermodynamicTemperature};
use uom::si::pressure::pascal;
use uom::si::thermodynamic_temperature::kelvin;

/// Standard atmosphere, the pressure of the water relations when none is given.
pub const STANDARD_PRESSURE_PA: f64 = 101_325.0;

/// The water temperature, absolute.
pub const TEMPERATURE_PARAMETER: Parameter = Parameter::new(
    "T",
    "the water temperature",
    TEMPERATURE,
    Domain::AbsoluteTemperature,
);
/// The absolute pressure, one standard atmosphere when left out.
pub const PRESSURE_PARAMETER: Parameter =
    Parameter::new("p", "the absolute pressure", PRESSURE, Domain::Any)
        .or(STANDARD_PRESSURE_PA)
        .of_liquid_water();
const STATE: &[Parameter] = &[TEMPERATURE_PARAMETER, PRESSURE_PARAMETER];

const IF97: &[&Formulation] = &[&IF97_REGION1];
const IF97_AND_VISCOSITY: &[&Formulation] = &[&IF97_REGION1, &IAPWS2008_VISCOSITY];
const IF97_AND_CONDUCTIVITY: &[&Formulation] = &[&IF97_REGION1, &IAPWS2011_CONDUCTIVITY];

pub static RELATIONS: &[Relation] = &[
    Relation {
        name: "water_density",
        summary: "density of liquid water; p defaults to 101 325 Pa",
        forms: &[Form {
            parameters: STATE,
            result: DENSITY,
            unit: "kg/m^3",
            formulations: IF97,
            formula: "rho = 1 / (dg/dp)(T, p), g the IF97 region 1 Gibbs energy",
            example: "water_density(12 degC)",
            body: density_body,
        }],
    },
    Relation {
        name: "water_viscosity",
        summary: "dynamic viscosity of liquid water at the IF97 density",
        forms: &[Form {
            parameters: STATE,
            result: DYNAMIC_VISCOSITY,
            unit: "mPa*s",
            formulations: IF97_AND_VISCOSITY,
            formula: "mu = mu_0(T) * mu_1(T, rho_w(T, p)), IAPWS 2008 without critical enhancement",
            example: "water_viscosity(12 degC)",
            body: viscosity_body,
        }],
    },
    Relation {
        name: "water_kinematic_viscosity",
        summary: "kinematic viscosity mu/rho of liquid water",
        forms: &[Form {
            parameters: STATE,
            result: AREA_PER_TIME,
            unit: "m^2/s",
            formulations: IF97_AND_VISCOSITY,
            formula: "nu = mu_w(T, p) / rho_w(T, p)",
            example: "water_kinematic_viscosity(12 degC)",
            body: kinematic_viscosity_body,
        }],
    },
    Relation {
        name: "water_specific_heat",
        summary: "isobaric specific heat capacity cp of liquid water",
        forms: &[Form {
            parameters: STATE,
            result: SPECIFIC_HEAT,
            unit: "kJ/(kg*K)",
            formulations: IF97,
            formula: "cp = -T * (d2g/dT2)(T, p), g the IF97 region 1 Gibbs energy",
            example: "water_specific_heat(12 degC)",
            body: specific_heat_body,
        }],
    },
    Relation {
        name: "water_thermal_conductivity",
        summary: "thermal conductivity of liquid water (critical enhancement neglected)",
        forms: &[Form {
            parameters: STATE,
            result: THERMAL_CONDUCTIVITY,
            unit: "W/(m*K)",
            formulations: IF97_AND_CONDUCTIVITY,
            formula: "lambda = lambda_0(T) * lambda_1(T, rho_w(T, p)), IAPWS 2011 without critical enhancement",
            example: "water_thermal_conductivity(12 degC)",
            body: thermal_conductivity_body,
        }],
    },
    Relation {
        name: "saturation_pressure",
        summary: "saturation (vapour) pressure of water",
        forms: &[Form {
            parameters: &[TEMPERATURE_PARAMETER],
            result: PRESSURE,
            unit: "kPa",
            formulations: &[&IF97_REGION4],
            formula: "p_sat = p_IF97,region4(T)",
            example: "saturation_pressure(80 degC)",
            body: saturation_pressure_body,
        }],
    },
];

/// The typed state of a body's `(T, p)` arguments.
pub fn state(values: &[f64]) -> (ThermodynamicTemperature, Pressure) {
    let [temperature, pressure] = arguments(values);
    (
        ThermodynamicTemperature::new::<kelvin>(temperature),
        Pressure::new::<pascal>(pressure),
    )
}

fn density_body(values: &[f64]) -> Result<f64, CallError> {
    let (t, p) = state(values);
    Ok(density(t, p).map_err(refused)?.value)
}

fn viscosity_body(values: &[f64]) -> Result<f64, CallError> {
    let (t, p) = state(values);
    Ok(viscosity(t, p).map_err(refused)?.value)
}

fn kinematic_viscosity_body(values: &[f64]) -> Result<f64, CallError> {
    let (t, p) = state(values);
    Ok(kinematic_viscosity(t, p).map_err(refused)?.value)
}

fn specific_heat_body(values: &[f64]) -> Result<f64, CallError> {
    let (t, p) = state(values);
    Ok(specific_heat(t, p).map_err(refused)?.value)
}

fn thermal_conductivity_body(values: &[f64]) -> Result<f64, CallError> {
    let (t, p) = state(values);
    Ok(thermal_conductivity(t, p).map_err(refused)?.value)
}

fn saturation_pressure_body(values: &[f64]) -> Result<f64, CallError> {
    let [temperature] = arguments(values);
    let t = ThermodynamicTemperature::new::<kelvin>(temperature);
    Ok(saturation_pressure(t).map_err(refused)?.value)
}
