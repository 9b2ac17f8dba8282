//! The dimensions the built-in relations take and give, named once. Base order L M T I Θ N J.

use crate::units::Dimension;

pub const DIMENSIONLESS: Dimension = Dimension::from_integers([0, 0, 0, 0, 0, 0, 0]);
pub const LENGTH: Dimension = Dimension::from_integers([1, 0, 0, 0, 0, 0, 0]);
pub const AREA: Dimension = Dimension::from_integers([2, 0, 0, 0, 0, 0, 0]);
pub const TIME: Dimension = Dimension::from_integers([0, 0, 1, 0, 0, 0, 0]);
pub const TEMPERATURE: Dimension = Dimension::from_integers([0, 0, 0, 0, 1, 0, 0]);
pub const VELOCITY: Dimension = Dimension::from_integers([1, 0, -1, 0, 0, 0, 0]);
pub const ACCELERATION: Dimension = Dimension::from_integers([1, 0, -2, 0, 0, 0, 0]);
/// Transmissivity and diffusion coefficients share L^2 T^-1, as does kinematic viscosity.
pub const AREA_PER_TIME: Dimension = Dimension::from_integers([2, 0, -1, 0, 0, 0, 0]);
pub const VOLUME_FLOW_RATE: Dimension = Dimension::from_integers([3, 0, -1, 0, 0, 0, 0]);
pub const DENSITY: Dimension = Dimension::from_integers([-3, 1, 0, 0, 0, 0, 0]);
pub const DYNAMIC_VISCOSITY: Dimension = Dimension::from_integers([-1, 1, -1, 0, 0, 0, 0]);
pub const PRESSURE: Dimension = Dimension::from_integers([-1, 1, -2, 0, 0, 0, 0]);
pub const PRESSURE_GRADIENT: Dimension = Dimension::from_integers([-2, 1, -2, 0, 0, 0, 0]);
pub const MOLAR_CONCENTRATION_GRADIENT: Dimension =
    Dimension::from_integers([-4, 0, 0, 0, 0, 1, 0]);
pub const MASS_CONCENTRATION_GRADIENT: Dimension = Dimension::from_integers([-4, 1, 0, 0, 0, 0, 0]);
pub const MOLAR_FLUX: Dimension = Dimension::from_integers([-2, 0, -1, 0, 0, 1, 0]);
pub const MASS_FLUX: Dimension = Dimension::from_integers([-2, 1, -1, 0, 0, 0, 0]);
pub const SPECIFIC_HEAT: Dimension = Dimension::from_integers([2, 0, -2, 0, -1, 0, 0]);
pub const THERMAL_CONDUCTIVITY: Dimension = Dimension::from_integers([1, 1, -3, 0, -1, 0, 0]);
pub const TEMPERATURE_GRADIENT: Dimension = Dimension::from_integers([-1, 0, 0, 0, 1, 0, 0]);
pub const HEAT_FLUX: Dimension = Dimension::from_integers([0, 1, -3, 0, 0, 0, 0]);
pub const ELECTRICAL_CONDUCTIVITY: Dimension = Dimension::from_integers([-3, -1, 3, 2, 0, 0, 0]);
pub const ELECTRICAL_RESISTIVITY: Dimension = Dimension::from_integers([3, 1, -3, -2, 0, 0, 0]);
/// A voltage gradient (V/m), the electric field with its sign reversed.
pub const VOLTAGE_GRADIENT: Dimension = Dimension::from_integers([1, 1, -3, -1, 0, 0, 0]);
pub const CURRENT_DENSITY: Dimension = Dimension::from_integers([-2, 0, 0, 1, 0, 0, 0]);
/// Hazen's coefficient written with its units, 1/(cm·s) in the trade.
pub const PER_LENGTH_TIME: Dimension = Dimension::from_integers([-1, 0, -1, 0, 0, 0, 0]);
/// Heat capacity per volume, J/(m^3 K): rho c of a fluid or of a saturated medium.
pub const VOLUMETRIC_HEAT_CAPACITY: Dimension = Dimension::from_integers([-1, 1, -2, 0, -1, 0, 0]);
/// A coefficient per kelvin: the temperature coefficient of conductivity.
pub const PER_TEMPERATURE: Dimension = Dimension::from_integers([0, 0, 0, 0, -1, 0, 0]);
/// Dissolved solids per conductivity, (mg/L)/(uS/cm) in the trade.
pub const DENSITY_PER_CONDUCTIVITY: Dimension = Dimension::from_integers([0, 2, -3, -2, 0, 0, 0]);
/// A rate constant (1/s): first-order decay.
pub const PER_TIME: Dimension = Dimension::from_integers([0, 0, -1, 0, 0, 0, 0]);
/// A molar concentration (mol/m³); a mass concentration has the dimension of a density.
pub const MOLAR_CONCENTRATION: Dimension = Dimension::from_integers([-3, 0, 0, 0, 0, 1, 0]);
/// Volume per mass (m³/kg): a distribution coefficient Kd, usually written in L/kg or mL/g.
pub const VOLUME_PER_MASS: Dimension = Dimension::from_integers([3, -1, 0, 0, 0, 0, 0]);
/// The inverse of a pressure (1/Pa): a coefficient of volume compressibility m_v.
pub const COMPRESSIBILITY: Dimension = Dimension::from_integers([1, -1, 2, 0, 0, 0, 0]);
