//! Dry air: Sutherland's law for viscosity and the ideal-gas law for density.
//!
//! Both are engineering approximations for dry air at modest pressure. Humidity is not modelled.
//!
//! Constants and where they come from (all recalled from memory, not read from a source here):
//!
//! * Sutherland: mu_ref = 1.716e-5 Pa s at T_ref = 273.15 K is the reference tabulated for air
//!   in F. M. White, *Viscous Fluid Flow* (Table 1-2, which gives T_0 = 273 K); S = 110.4 K is
//!   the Sutherland constant of the U.S. Standard Atmosphere 1976 (White lists 111 K). With
//!   these the law reproduces the Standard Atmosphere's beta T^1.5 / (T + S) form with
//!   beta = 1.458e-6 to four digits. White gives about 2 % accuracy for air over 170-1900 K,
//!   which is the range enforced here.
//! * Ideal gas: R = 8.31446261815324 J/(mol K), exact in the 2019 SI as N_A k_B (CODATA 2018);
//!   M_air = 0.0289647 kg/mol, a commonly tabulated molar mass of dry air (the U.S. Standard
//!   Atmosphere 1976 uses 0.0289644 kg/mol, 1e-5 lower in relative terms). The range enforced,
//!   200-1900 K and 0 < p <= 1 MPa, keeps the compressibility factor within about 2 % of 1
//!   (estimate from the second virial coefficient of air) and below dissociation.

use uom::si::dynamic_viscosity::pascal_second;
use uom::si::f64::{DynamicViscosity, MassDensity, Pressure, ThermodynamicTemperature};
use uom::si::mass_density::kilogram_per_cubic_meter;
use uom::si::pressure::pascal;
use uom::si::thermodynamic_temperature::kelvin;

use super::dimensions::{DENSITY, DYNAMIC_VISCOSITY, PRESSURE, TEMPERATURE};
use super::formulation::refused;
use super::formulation::{Formulation, OutOfRange};
use super::relation::{arguments, Domain, Form, Parameter, Relation};
use super::water::{check_temperature, out_of_range, pressure_text};
use crate::eval::function::CallError;

/// Sutherland's law for the viscosity of dry air.
pub static SUTHERLAND_AIR: Formulation = Formulation {
    id: "sutherland-air",
    title: "Sutherland's law for dry air (mu_ref = 1.716e-5 Pa s, T_ref = 273.15 K, S = 110.4 K)",
    citation: "Sutherland, W., 1893, The viscosity of gases and molecular force, Philosophical \
Magazine 36, 507-531; constants for air as tabulated in White, F. M., Viscous Fluid Flow \
(McGraw-Hill), Table 1-2, and S = 110.4 K from the U.S. Standard Atmosphere, 1976 (NOAA/NASA/\
USAF)",
    validity: "170 K <= T <= 1900 K (about 2 % accuracy per White); pressure-independent, valid \
for the dilute gas",
    ranges: &[],
};

/// Ideal-gas density of dry air.
pub static IDEAL_GAS_DRY_AIR: Formulation = Formulation {
    id: "ideal-gas-dry-air",
    title: "Ideal gas, dry air (M = 0.0289647 kg/mol)",
    citation:
        "Ideal-gas law rho = p M / (R T) with R = 8.31446261815324 J/(mol K) (exact in the 2019 \
SI, CODATA 2018) and M = 0.0289647 kg/mol for dry air (U.S. Standard Atmosphere, 1976 and ISO \
2533:1975 tabulate 0.0289644 kg/mol)",
    validity: "200 K <= T <= 1900 K, 0 < p <= 1 MPa (compressibility factor within about 2 % of \
1); dry air, no humidity",
    ranges: &[],
};

const MU_REF: f64 = 1.716e-5;
const T_REF: f64 = 273.15;
const SUTHERLAND_S: f64 = 110.4;
const T_MIN_SUTHERLAND: f64 = 170.0;
const T_MAX: f64 = 1900.0;

/// Molar gas constant, J/(mol K): N_A k_B, exact in the 2019 SI.
const R_MOLAR: f64 = 8.314_462_618_153_24;
/// Molar mass of dry air, kg/mol.
const M_AIR: f64 = 0.028_964_7;
const T_MIN_IDEAL: f64 = 200.0;
const P_MAX_IDEAL: f64 = 1.0e6;

/// Dynamic viscosity of dry air by Sutherland's law,
/// mu = mu_ref (T / T_ref)^1.5 (T_ref + S) / (T + S).
///
/// Input: absolute temperature. Valid for 170 K <= T <= 1900 K (dilute gas; no pressure
/// dependence). Returns Pa s.
pub fn viscosity(t: ThermodynamicTemperature) -> Result<DynamicViscosity, OutOfRange> {
    let t_k = t.get::<kelvin>();
    check_temperature(&SUTHERLAND_AIR, t_k, T_MIN_SUTHERLAND, T_MAX)?;
    let ratio = t_k / T_REF;
    let mu = MU_REF * ratio * ratio.sqrt() * (T_REF + SUTHERLAND_S) / (t_k + SUTHERLAND_S);
    Ok(DynamicViscosity::new::<pascal_second>(mu))
}

/// Density of dry air as an ideal gas, rho = p M / (R T).
///
/// Input: absolute temperature and absolute pressure. Valid for 200 K <= T <= 1900 K and
/// 0 < p <= 1 MPa. Returns kg/m^3.
pub fn density(t: ThermodynamicTemperature, p: Pressure) -> Result<MassDensity, OutOfRange> {
    let (t_k, p_pa) = (t.get::<kelvin>(), p.get::<pascal>());
    check_temperature(&IDEAL_GAS_DRY_AIR, t_k, T_MIN_IDEAL, T_MAX)?;
    if !p_pa.is_finite() {
        return Err(out_of_range(
            &IDEAL_GAS_DRY_AIR,
            format!("p = {p_pa} Pa is not a finite pressure"),
        ));
    }
    if p_pa <= 0.0 {
        return Err(out_of_range(
            &IDEAL_GAS_DRY_AIR,
            format!(
                "p = {} is not a positive absolute pressure",
                pressure_text(p_pa)
            ),
        ));
    }
    if p_pa > P_MAX_IDEAL {
        return Err(out_of_range(
            &IDEAL_GAS_DRY_AIR,
            format!(
                "p = {} is above {}: the ideal-gas law is not accurate enough there",
                pressure_text(p_pa),
                pressure_text(P_MAX_IDEAL)
            ),
        ));
    }
    Ok(MassDensity::new::<kilogram_per_cubic_meter>(
        p_pa * M_AIR / (R_MOLAR * t_k),
    ))
}

// ---------------------------------------------------------------------------------------------
// The sheet relations
// ---------------------------------------------------------------------------------------------

const AIR_TEMPERATURE: Parameter = Parameter::new(
    "T",
    "the air temperature",
    TEMPERATURE,
    Domain::AbsoluteTemperature,
);

pub static RELATIONS: &[Relation] = &[
    Relation {
        name: "air_viscosity",
        summary: "dynamic viscosity of dry air (Sutherland's law)",
        forms: &[Form {
            parameters: &[AIR_TEMPERATURE],
            result: DYNAMIC_VISCOSITY,
            unit: "Pa*s",
            formulations: &[&SUTHERLAND_AIR],
            formula:
                "mu = 1.716e-5 Pa*s * (T / 273.15 K)^(3/2) * (273.15 K + 110.4 K) / (T + 110.4 K)",
            example: "air_viscosity(15 degC)",
            body: viscosity_body,
        }],
    },
    Relation {
        name: "air_density",
        summary: "density of dry air as an ideal gas",
        forms: &[Form {
            parameters: &[
                AIR_TEMPERATURE,
                Parameter::new("p", "the absolute pressure", PRESSURE, Domain::Any),
            ],
            result: DENSITY,
            unit: "kg/m^3",
            formulations: &[&IDEAL_GAS_DRY_AIR],
            formula: "rho = p * 0.0289647 kg/mol / (R * T)",
            example: "air_density(15 degC, 101.325 kPa)",
            body: density_body,
        }],
    },
];

fn viscosity_body(values: &[f64]) -> Result<f64, CallError> {
    let [temperature] = arguments(values);
    Ok(
        viscosity(ThermodynamicTemperature::new::<kelvin>(temperature))
            .map_err(refused)?
            .value,
    )
}

fn density_body(values: &[f64]) -> Result<f64, CallError> {
    let [temperature, pressure] = arguments(values);
    Ok(density(
        ThermodynamicTemperature::new::<kelvin>(temperature),
        Pressure::new::<pascal>(pressure),
    )
    .map_err(refused)?
    .value)
}

#[cfg(test)]
mod tests {
    use super::*;
    use uom::si::thermodynamic_temperature::degree_celsius;

    fn kelvins(t: f64) -> ThermodynamicTemperature {
        ThermodynamicTemperature::new::<kelvin>(t)
    }
    fn pa(p: f64) -> Pressure {
        Pressure::new::<pascal>(p)
    }

    fn assert_rel(actual: f64, expected: f64, tol: f64, what: &str) {
        let err = ((actual - expected) / expected).abs();
        assert!(
            err <= tol,
            "{what}: got {actual:e}, expected {expected:e}, relative error {err:e} > {tol:e}"
        );
    }

    #[test]
    fn sutherland_reference_point_and_300_k() {
        let at_ref = viscosity(kelvins(273.15))
            .expect("in range")
            .get::<pascal_second>();
        assert_rel(at_ref, 1.716e-5, 1e-15, "mu(T_ref)");
        // Handbook (from memory): Incropera & DeWitt, Table A.4, air at 300 K: 184.6e-7 N s/m^2.
        let at_300 = viscosity(kelvins(300.0))
            .expect("in range")
            .get::<pascal_second>();
        assert_rel(at_300, 1.846e-5, 2e-3, "mu(300 K)");
        // Same law in the U.S. Standard Atmosphere 1976 form, beta = 1.458e-6 (from memory).
        for t in [200.0, 300.0, 1000.0] {
            let mu = viscosity(kelvins(t))
                .expect("in range")
                .get::<pascal_second>();
            let standard = 1.458e-6 * f64::powf(t, 1.5) / (t + 110.4);
            assert_rel(mu, standard, 1e-4, &format!("beta form at {t} K"));
        }
    }

    #[test]
    fn ideal_gas_at_twenty_celsius() {
        // From memory: dry air at 20 °C and 101325 Pa is 1.2041 kg/m^3.
        let rho = density(
            ThermodynamicTemperature::new::<degree_celsius>(20.0),
            pa(101_325.0),
        )
        .expect("in range")
        .get::<kilogram_per_cubic_meter>();
        assert!((rho - 1.2041).abs() < 5e-5, "rho = {rho}");
    }

    fn refused(result: Result<impl std::fmt::Debug, OutOfRange>) -> OutOfRange {
        match result {
            Ok(value) => panic!("expected OutOfRange, got {value:?}"),
            Err(err) => err,
        }
    }

    #[test]
    fn out_of_range_inputs_are_refused() {
        let err = refused(viscosity(kelvins(100.0)));
        assert!(err.detail.contains("below 170 K"), "{}", err.detail);
        assert_eq!(err.formulation, &SUTHERLAND_AIR);
        refused(viscosity(kelvins(2000.0)));
        refused(viscosity(kelvins(f64::NAN)));
        refused(viscosity(kelvins(-1.0)));
        let err = refused(density(kelvins(300.0), pa(2.0e6)));
        assert!(err.detail.contains("above 1 MPa"), "{}", err.detail);
        assert_eq!(err.formulation, &IDEAL_GAS_DRY_AIR);
        refused(density(kelvins(300.0), pa(0.0)));
        refused(density(kelvins(300.0), pa(-5.0)));
        refused(density(kelvins(300.0), pa(f64::NAN)));
        refused(density(kelvins(0.0), pa(101_325.0)));
        refused(density(kelvins(150.0), pa(101_325.0)));
        refused(density(kelvins(f64::INFINITY), pa(101_325.0)));
        assert!(density(kelvins(200.0), pa(1.0e6)).is_ok());
        assert!(viscosity(kelvins(1900.0)).is_ok());
    }
}
