//! Fluid properties and permeability <-> hydraulic conductivity as sheet functions.
//!
//! This is the one bridge between the engine's runtime quantities (SI value + dimension) and
//! the typed `uom` formulations in `water`, `brine` and `air`: arguments are checked for
//! dimension here, turned into `uom` quantities, and results turned back. The formulations
//! themselves never see an unchecked number.

use super::air;
use super::brine;
use super::formulation::{Formulation, OutOfRange};
use super::transport::require_non_negative;
use super::water;
use super::Builtin;
use crate::eval::function::{expect_argument_count, expect_dimension, CallError, RowKernel};
use crate::eval::{Provenance, Quantity};
use crate::units::Dimension;
use uom::si::f64::{Pressure, Ratio, ThermodynamicTemperature};
use uom::si::pressure::pascal;
use uom::si::ratio::ratio;
use uom::si::thermodynamic_temperature::kelvin;

/// Standard atmosphere, the default pressure of the water functions.
pub const STANDARD_PRESSURE_PA: f64 = 101_325.0;

const TEMPERATURE: Dimension = Dimension::TEMPERATURE;
const PRESSURE: Dimension = Dimension::from_integers([-1, 1, -2, 0, 0, 0, 0]);
const DENSITY: Dimension = Dimension::from_integers([-3, 1, 0, 0, 0, 0, 0]);
const DYNAMIC_VISCOSITY: Dimension = Dimension::from_integers([-1, 1, -1, 0, 0, 0, 0]);
const AREA: Dimension = Dimension::from_integers([2, 0, 0, 0, 0, 0, 0]);
const VELOCITY: Dimension = Dimension::from_integers([1, 0, -1, 0, 0, 0, 0]);
const KINEMATIC_VISCOSITY: Dimension = Dimension::from_integers([2, 0, -1, 0, 0, 0, 0]);
const SPECIFIC_HEAT: Dimension = Dimension::from_integers([2, 0, -2, 0, -1, 0, 0]);
const THERMAL_CONDUCTIVITY: Dimension = Dimension::from_integers([1, 1, -3, 0, -1, 0, 0]);

/// Standard gravity, exact (CGPM 1901), used to turn k into K.
const STANDARD_GRAVITY: f64 = 9.80665;

const IF97: &[&Formulation] = &[&water::IF97_REGION1];
const IF97_AND_VISCOSITY: &[&Formulation] = &[&water::IF97_REGION1, &water::IAPWS2008_VISCOSITY];
const IF97_AND_CONDUCTIVITY: &[&Formulation] =
    &[&water::IF97_REGION1, &water::IAPWS2011_CONDUCTIVITY];
const SATURATION: &[&Formulation] = &[&water::IF97_REGION4];
const BRINE_DENSITY: &[&Formulation] = &[&brine::BATZLE_WANG_DENSITY];
const BRINE_VISCOSITY: &[&Formulation] = &[&brine::BATZLE_WANG_VISCOSITY];
const AIR_VISCOSITY: &[&Formulation] = &[&air::SUTHERLAND_AIR];
const AIR_DENSITY: &[&Formulation] = &[&air::IDEAL_GAS_DRY_AIR];

pub const FUNCTIONS: &[(&str, Builtin)] = &[
    ("water_density", Builtin::new("water_density(T[, p])", "density of liquid water; p defaults to 101 325 Pa", water_density).citing(IF97).with_kernel(water_density_rows).taking_temperature()),
    ("water_viscosity", Builtin::new("water_viscosity(T[, p])", "dynamic viscosity of liquid water at the IF97 density", water_viscosity).citing(IF97_AND_VISCOSITY).with_kernel(water_viscosity_rows).taking_temperature()),
    ("water_kinematic_viscosity", Builtin::new("water_kinematic_viscosity(T[, p])", "kinematic viscosity mu/rho of liquid water", water_kinematic_viscosity).citing(IF97_AND_VISCOSITY).taking_temperature()),
    ("water_specific_heat", Builtin::new("water_specific_heat(T[, p])", "isobaric specific heat capacity cp of liquid water", water_specific_heat).citing(IF97).taking_temperature()),
    ("water_thermal_conductivity", Builtin::new("water_thermal_conductivity(T[, p])", "thermal conductivity of liquid water (critical enhancement neglected)", water_thermal_conductivity).citing(IF97_AND_CONDUCTIVITY).taking_temperature()),
    ("saturation_pressure", Builtin::new("saturation_pressure(T)", "saturation (vapour) pressure of water", saturation_pressure).citing(SATURATION).taking_temperature()),
    ("brine_density", Builtin::new("brine_density(T, p, S)", "density of NaCl brine; S is the NaCl mass fraction (0.1, 10 % or 100000 ppm)", brine_density).citing(BRINE_DENSITY).taking_temperature()),
    ("brine_viscosity", Builtin::new("brine_viscosity(T, S)", "dynamic viscosity of NaCl brine; S is the NaCl mass fraction", brine_viscosity).citing(BRINE_VISCOSITY).taking_temperature()),
    ("air_viscosity", Builtin::new("air_viscosity(T)", "dynamic viscosity of dry air (Sutherland's law)", air_viscosity).citing(AIR_VISCOSITY).taking_temperature()),
    ("air_density", Builtin::new("air_density(T, p)", "density of dry air as an ideal gas", air_density).citing(AIR_DENSITY).taking_temperature()),
    ("hydraulic_conductivity", Builtin::new("hydraulic_conductivity(k, T[, p]) or (k, rho, mu)", "K = k rho g0 / mu: for water at T (and p), or for any fluid of density rho and viscosity mu", hydraulic_conductivity).citing(IF97_AND_VISCOSITY).with_kernel(hydraulic_conductivity_rows).taking_temperature()),
    ("intrinsic_permeability", Builtin::new("intrinsic_permeability(K, T[, p]) or (K, rho, mu)", "k = K mu / (rho g0): for water at T (and p), or for any fluid", intrinsic_permeability).citing(IF97_AND_VISCOSITY).with_kernel(intrinsic_permeability_rows).taking_temperature()),
];

/// An absolute temperature argument; a temperature difference is refused.
fn temperature(
    arguments: &[Quantity],
    index: usize,
) -> Result<ThermodynamicTemperature, CallError> {
    let value = expect_dimension(arguments, index, "T", TEMPERATURE)?;
    if arguments[index].is_temperature_difference() {
        return Err(CallError::Domain {
            argument: Some(index),
            message: "`T` must be an absolute temperature, not a temperature difference"
                .to_string(),
        });
    }
    Ok(ThermodynamicTemperature::new::<kelvin>(value))
}

/// The optional pressure argument at `index`, defaulting to one standard atmosphere.
fn pressure_or_standard(arguments: &[Quantity], index: usize) -> Result<Pressure, CallError> {
    let pascals = match arguments.get(index) {
        Some(_) => expect_dimension(arguments, index, "p", PRESSURE)?,
        None => STANDARD_PRESSURE_PA,
    };
    Ok(Pressure::new::<pascal>(pascals))
}

fn salinity(arguments: &[Quantity], index: usize) -> Result<Ratio, CallError> {
    Ok(Ratio::new::<ratio>(expect_dimension(
        arguments,
        index,
        "S",
        Dimension::dimensionless(),
    )?))
}

/// A formulation's refusal, as a call error that names its range.
fn refused(error: OutOfRange) -> CallError {
    CallError::OutOfRange {
        argument: None,
        message: error.to_string(),
    }
}

/// Evaluates `(T[, p])` water functions: checks arguments, records provenance, converts.
fn water_property(
    arguments: &[Quantity],
    provenance: &mut Provenance,
    formulations: &'static [&'static Formulation],
    dimension: Dimension,
    property: impl Fn(ThermodynamicTemperature, Pressure) -> Result<f64, OutOfRange>,
) -> Result<Quantity, CallError> {
    expect_argument_count(arguments, 1, 2, "1 or 2 (T[, p])")?;
    let value = property(
        temperature(arguments, 0)?,
        pressure_or_standard(arguments, 1)?,
    )
    .map_err(refused)?;
    for formulation in formulations {
        provenance.record(formulation);
    }
    Ok(Quantity::new(value, dimension))
}

fn water_density(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    water_property(arguments, provenance, IF97, DENSITY, |t, p| {
        Ok(water::density(t, p)?.value)
    })
}

fn water_viscosity(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    water_property(
        arguments,
        provenance,
        IF97_AND_VISCOSITY,
        DYNAMIC_VISCOSITY,
        |t, p| Ok(water::viscosity(t, p)?.value),
    )
}

fn water_kinematic_viscosity(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    water_property(
        arguments,
        provenance,
        IF97_AND_VISCOSITY,
        KINEMATIC_VISCOSITY,
        |t, p| Ok(water::kinematic_viscosity(t, p)?.value),
    )
}

fn water_specific_heat(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    water_property(arguments, provenance, IF97, SPECIFIC_HEAT, |t, p| {
        Ok(water::specific_heat(t, p)?.value)
    })
}

fn water_thermal_conductivity(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    water_property(
        arguments,
        provenance,
        IF97_AND_CONDUCTIVITY,
        THERMAL_CONDUCTIVITY,
        |t, p| Ok(water::thermal_conductivity(t, p)?.value),
    )
}

fn saturation_pressure(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    expect_argument_count(arguments, 1, 1, "1 (T)")?;
    let value = water::saturation_pressure(temperature(arguments, 0)?)
        .map_err(refused)?
        .value;
    provenance.record(&water::IF97_REGION4);
    Ok(Quantity::new(value, PRESSURE))
}

fn brine_density(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    expect_argument_count(arguments, 3, 3, "3 (T, p, S)")?;
    let pressure = Pressure::new::<pascal>(expect_dimension(arguments, 1, "p", PRESSURE)?);
    let value = brine::density(
        temperature(arguments, 0)?,
        pressure,
        salinity(arguments, 2)?,
    )
    .map_err(refused)?
    .value;
    provenance.record(&brine::BATZLE_WANG_DENSITY);
    Ok(Quantity::new(value, DENSITY))
}

fn brine_viscosity(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    expect_argument_count(arguments, 2, 2, "2 (T, S)")?;
    let value = brine::viscosity(temperature(arguments, 0)?, salinity(arguments, 1)?)
        .map_err(refused)?
        .value;
    provenance.record(&brine::BATZLE_WANG_VISCOSITY);
    Ok(Quantity::new(value, DYNAMIC_VISCOSITY))
}

fn air_viscosity(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    expect_argument_count(arguments, 1, 1, "1 (T)")?;
    let value = air::viscosity(temperature(arguments, 0)?)
        .map_err(refused)?
        .value;
    provenance.record(&air::SUTHERLAND_AIR);
    Ok(Quantity::new(value, DYNAMIC_VISCOSITY))
}

fn air_density(arguments: &[Quantity], provenance: &mut Provenance) -> Result<Quantity, CallError> {
    expect_argument_count(arguments, 2, 2, "2 (T, p)")?;
    let pressure = Pressure::new::<pascal>(expect_dimension(arguments, 1, "p", PRESSURE)?);
    let value = air::density(temperature(arguments, 0)?, pressure)
        .map_err(refused)?
        .value;
    provenance.record(&air::IDEAL_GAS_DRY_AIR);
    Ok(Quantity::new(value, DENSITY))
}

/// Density and viscosity of the fluid named by arguments 1.. : `(T[, p])` for water, or
/// `(rho, mu)` for any fluid. The second argument's dimension says which form was meant.
fn fluid(arguments: &[Quantity], provenance: &mut Provenance) -> Result<(f64, f64), CallError> {
    expect_argument_count(
        arguments,
        2,
        3,
        "2 or 3 ((k or K), T[, p] or (k or K), rho, mu)",
    )?;
    if arguments[1].dimension == DENSITY {
        expect_argument_count(
            arguments,
            3,
            3,
            "3 when a density is given: (k or K), rho, mu",
        )?;
        let density = arguments[1].value;
        let viscosity = expect_dimension(arguments, 2, "mu", DYNAMIC_VISCOSITY)?;
        if density <= 0.0 || viscosity <= 0.0 {
            return Err(CallError::Domain {
                argument: Some(if density <= 0.0 { 1 } else { 2 }),
                message: "density and viscosity must be positive".to_string(),
            });
        }
        return Ok((density, viscosity));
    }
    let t = temperature(arguments, 1)?;
    let p = pressure_or_standard(arguments, 2)?;
    let (density, viscosity) = water::density_and_viscosity(t, p).map_err(refused)?;
    for formulation in IF97_AND_VISCOSITY {
        provenance.record(formulation);
    }
    Ok((density.value, viscosity.value))
}

/// Row kernels: for columns, the arguments' dimensions and temperature kinds are checked once
/// on the first row by the functions above; later rows go straight to the formulations.
/// `(k or K, T[, p])` is the water form; the `(rho, mu)` form goes row by row. The four
/// kernels are written out: a shared helper taking the formula as a closure measured about 10 %
/// slower on a million rows (`cargo bench --bench engine -- column_1M`).
fn water_rows(first_row: &[Quantity], index: usize) -> Option<(bool, usize)> {
    (first_row.get(index)?.dimension == TEMPERATURE).then_some((first_row.len() > index + 1, index))
}

/// T and p of a row whose temperature is at `index`.
fn state(row: &[f64], index: usize, with_pressure: bool) -> (ThermodynamicTemperature, Pressure) {
    let pascals = if with_pressure {
        row[index + 1]
    } else {
        STANDARD_PRESSURE_PA
    };
    (
        ThermodynamicTemperature::new::<kelvin>(row[index]),
        Pressure::new::<pascal>(pascals),
    )
}

fn hydraulic_conductivity_rows(first_row: &[Quantity]) -> Option<RowKernel<'static>> {
    let (with_pressure, index) = water_rows(first_row, 1)?;
    Some(Box::new(move |row: &[f64]| {
        require_non_negative(row[0], 0, "k")?;
        let (t, p) = state(row, index, with_pressure);
        let (density, viscosity) = water::density_and_viscosity(t, p).map_err(refused)?;
        Ok(row[0] * density.value * STANDARD_GRAVITY / viscosity.value)
    }))
}

fn intrinsic_permeability_rows(first_row: &[Quantity]) -> Option<RowKernel<'static>> {
    let (with_pressure, index) = water_rows(first_row, 1)?;
    Some(Box::new(move |row: &[f64]| {
        require_non_negative(row[0], 0, "K")?;
        let (t, p) = state(row, index, with_pressure);
        let (density, viscosity) = water::density_and_viscosity(t, p).map_err(refused)?;
        Ok(row[0] * viscosity.value / (density.value * STANDARD_GRAVITY))
    }))
}

fn water_density_rows(first_row: &[Quantity]) -> Option<RowKernel<'static>> {
    let (with_pressure, index) = water_rows(first_row, 0)?;
    Some(Box::new(move |row: &[f64]| {
        let (t, p) = state(row, index, with_pressure);
        Ok(water::density(t, p).map_err(refused)?.value)
    }))
}

fn water_viscosity_rows(first_row: &[Quantity]) -> Option<RowKernel<'static>> {
    let (with_pressure, index) = water_rows(first_row, 0)?;
    Some(Box::new(move |row: &[f64]| {
        let (t, p) = state(row, index, with_pressure);
        Ok(water::viscosity(t, p).map_err(refused)?.value)
    }))
}

fn hydraulic_conductivity(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    expect_argument_count(arguments, 2, 3, "2 or 3 (k, T[, p] or k, rho, mu)")?;
    let permeability = expect_dimension(arguments, 0, "k", AREA)?;
    require_non_negative(permeability, 0, "k")?;
    let (density, viscosity) = fluid(arguments, provenance)?;
    Ok(Quantity::new(
        permeability * density * STANDARD_GRAVITY / viscosity,
        VELOCITY,
    ))
}

fn intrinsic_permeability(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    expect_argument_count(arguments, 2, 3, "2 or 3 (K, T[, p] or K, rho, mu)")?;
    let conductivity = expect_dimension(arguments, 0, "K", VELOCITY)?;
    require_non_negative(conductivity, 0, "K")?;
    let (density, viscosity) = fluid(arguments, provenance)?;
    Ok(Quantity::new(
        conductivity * viscosity / (density * STANDARD_GRAVITY),
        AREA,
    ))
}
