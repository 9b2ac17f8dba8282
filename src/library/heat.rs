//! Heat in porous media: Fourier's law and the conductivity of a saturated medium; heat
//! capacity, diffusivity and the thermal Péclet number; the steady profile with vertical
//! groundwater flow; conduction into a half-space after a step and the damping and lag of a
//! periodic surface temperature; the geothermal gradient.

use super::dimensions::{
    AREA_PER_TIME, DENSITY, DIMENSIONLESS, HEAT_FLUX, LENGTH, SPECIFIC_HEAT, TEMPERATURE,
    TEMPERATURE_GRADIENT, THERMAL_CONDUCTIVITY, TIME, VELOCITY, VOLUMETRIC_HEAT_CAPACITY,
};
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
const CARSLAW_JAEGER: &str = "Carslaw, H. S. and Jaeger, J. C., 1959, Conduction of heat in \
solids, 2nd ed., Oxford University Press";
/// Heat capacity of a saturated medium, weighted by volume.
pub static VOLUMETRIC_HEAT_CAPACITY_MIXING: Formulation = Formulation {
    id: "volumetric-heat-capacity-mixing",
    title: "volumetric heat capacity, rho c = (1-n) rho_s c_s + n rho_f c_f",
    citation: "Domenico, P. A. and Schwartz, F. W., 1998, Physical and chemical hydrogeology, \
2nd ed., Wiley, section on heat transport (from memory); the volume-weighted sum is the \
energy balance of a saturated medium",
    validity: "fully saturated medium, solid and fluid at the same temperature",
    ranges: &[],
};
/// Thermal diffusivity as defined.
pub static THERMAL_DIFFUSIVITY: Formulation = Formulation {
    id: "thermal-diffusivity",
    title: "thermal diffusivity, alpha = lambda / (rho c)",
    citation: CARSLAW_JAEGER,
    validity: "conduction only; for a saturated medium lambda and rho c are the bulk values",
    ranges: &[],
};
/// The ratio of heat carried by flow to heat conducted.
pub static THERMAL_PECLET: Formulation = Formulation {
    id: "thermal-peclet",
    title: "thermal Péclet number, Pe = q rho_f c_f L / lambda",
    citation: "Bredehoeft, J. D. and Papadopulos, I. S., 1965, Rates of vertical groundwater \
movement estimated from the Earth's thermal profile, Water Resources Research 1(2), 325-328 \
(their beta)",
    validity: "q the Darcy flux, rho_f c_f the fluid's volumetric heat capacity, lambda the \
bulk conductivity of the saturated medium; above about 1 advection dominates",
    ranges: &[],
};
/// Steady one-dimensional conduction and advection between two fixed temperatures.
pub static BREDEHOEFT_PAPADOPULOS: Formulation = Formulation {
    id: "bredehoeft-papadopulos-1965",
    title: "steady temperature with vertical groundwater flow, (T - T_0)/(T_L - T_0) = \
(exp(beta z/L) - 1)/(exp(beta) - 1)",
    citation: "Bredehoeft, J. D. and Papadopulos, I. S., 1965, Rates of vertical groundwater \
movement estimated from the Earth's thermal profile, Water Resources Research 1(2), 325-328",
    validity: "steady, one-dimensional vertical flow through a homogeneous, isotropic, fully \
saturated layer of thickness L with fixed temperatures T_0 at its top (z = 0) and T_L at its \
base; z depth below the top, beta = q rho_f c_f L / lambda with q positive downward",
    ranges: &[],
};
/// Conduction into a semi-infinite solid after a step change at its surface.
pub static HALF_SPACE_STEP: Formulation = Formulation {
    id: "half-space-step-erfc",
    title: "half-space after a surface step, T = T_i + (T_s - T_i) erfc(z / (2 sqrt(alpha t)))",
    citation: CARSLAW_JAEGER,
    validity: "homogeneous half-space at T_i when its surface is held at T_s from t = 0; \
conduction only",
    ranges: &[],
};
/// Damping and lag of a periodic surface temperature with depth.
pub static PERIODIC_SURFACE: Formulation = Formulation {
    id: "periodic-surface-temperature",
    title: "periodic surface temperature in a half-space, amplitude A_0 exp(-z sqrt(pi / \
(alpha P))), lag z sqrt(P / (pi alpha)) / 2",
    citation: CARSLAW_JAEGER,
    validity: "homogeneous half-space, sinusoidal surface temperature of period P, the steady \
periodic state long after it began; conduction only",
    ranges: &[],
};

const CONDUCTIVITY: Parameter = Parameter::new(
    "lambda",
    "the bulk thermal conductivity",
    THERMAL_CONDUCTIVITY,
    Domain::Positive,
);
const DIFFUSIVITY: Parameter = Parameter::new(
    "alpha",
    "the thermal diffusivity",
    AREA_PER_TIME,
    Domain::Positive,
);
const DEPTH: Parameter = Parameter::new(
    "z",
    "the depth below the surface",
    LENGTH,
    Domain::NonNegative,
);
const PERIOD: Parameter = Parameter::new(
    "P",
    "the period of the surface temperature",
    TIME,
    Domain::Positive,
);

pub static RELATIONS: &[Relation] = &[
    Relation {
        name: "volumetric_heat_capacity",
        summary: "heat capacity of a saturated medium per volume rho c = (1-n) rho_s c_s + n rho_f \
c_f (J/(m^3*K))",
        forms: &[Form {
            parameters: &[
                Parameter::new("n", "a porosity", DIMENSIONLESS, Domain::Fraction),
                Parameter::new("rho_s", "the density of the solid", DENSITY, Domain::Positive),
                Parameter::new("c_s", "the specific heat of the solid", SPECIFIC_HEAT, Domain::Positive),
                Parameter::new("rho_f", "the density of the pore fluid", DENSITY, Domain::Positive),
                Parameter::new("c_f", "the specific heat of the pore fluid", SPECIFIC_HEAT, Domain::Positive),
            ],
            result: VOLUMETRIC_HEAT_CAPACITY,
            unit: "MJ/(m^3*K)",
            formulations: &[&VOLUMETRIC_HEAT_CAPACITY_MIXING],
            formula: "rho_c = (1 - n) * rho_s * c_s + n * rho_f * c_f",
            example: "volumetric_heat_capacity(0.3, 2650 kg/m^3, 0.84 kJ/(kg*K), 1000 kg/m^3, 4.19 kJ/(kg*K))",
            body: volumetric_heat_capacity,
        }],
    },
    Relation {
        name: "thermal_diffusivity",
        summary: "thermal diffusivity alpha = lambda / (rho c) (m^2/s)",
        forms: &[Form {
            parameters: &[
                CONDUCTIVITY,
                Parameter::new(
                    "rho_c",
                    "the volumetric heat capacity",
                    VOLUMETRIC_HEAT_CAPACITY,
                    Domain::Positive,
                ),
            ],
            result: AREA_PER_TIME,
            unit: "m^2/s",
            formulations: &[&THERMAL_DIFFUSIVITY],
            formula: "alpha = lambda / rho_c",
            example: "thermal_diffusivity(2.5 W/(m*K), 2.5 MJ/(m^3*K))",
            body: thermal_diffusivity,
        }],
    },
    Relation {
        name: "thermal_peclet_number",
        summary: "thermal Péclet number Pe = q rho_f c_f L / lambda; q Darcy flux, rho_f c_f the \
fluid's volumetric heat capacity, L length; Bredehoeft & Papadopulos 1965",
        forms: &[Form {
            parameters: &[
                Parameter::new("q", "the Darcy flux", VELOCITY, Domain::Any),
                Parameter::new(
                    "rho_c_f",
                    "the fluid's volumetric heat capacity",
                    VOLUMETRIC_HEAT_CAPACITY,
                    Domain::Positive,
                ),
                Parameter::new("L", "the length of the flow path", LENGTH, Domain::Positive),
                CONDUCTIVITY,
            ],
            result: DIMENSIONLESS,
            unit: "1",
            formulations: &[&THERMAL_PECLET],
            formula: "Pe = q * rho_c_f * L / lambda",
            example: "thermal_peclet_number(0.1 m/yr, 4.18 MJ/(m^3*K), 100 m, 2.5 W/(m*K))",
            body: thermal_peclet_number,
        }],
    },
    Relation {
        name: "vertical_flow_temperature",
        summary: "steady temperature at depth z in a layer of thickness L with vertical flow, \
T_0 at the top and T_L at the base; beta the thermal Péclet number (q positive downward); \
Bredehoeft & Papadopulos 1965",
        forms: &[Form {
            parameters: &[
                Parameter::new("T_0", "the temperature at the top", TEMPERATURE, Domain::AbsoluteTemperature),
                Parameter::new("T_L", "the temperature at the base", TEMPERATURE, Domain::AbsoluteTemperature),
                Parameter::new("z", "the depth below the top", LENGTH, Domain::NonNegative),
                Parameter::new("L", "the layer thickness", LENGTH, Domain::Positive),
                Parameter::new("beta", "the thermal Péclet number", DIMENSIONLESS, Domain::Any),
            ],
            result: TEMPERATURE,
            unit: "degC",
            formulations: &[&BREDEHOEFT_PAPADOPULOS],
            formula: "T = T_0 + (T_L - T_0) * (exp(beta * z / L) - 1) / (exp(beta) - 1)",
            example: "vertical_flow_temperature(10 degC, 16 degC, 40 m, 100 m, 1.3)",
            body: vertical_flow_temperature,
        }],
    },
    Relation {
        name: "half_space_temperature",
        summary: "temperature at depth z, time t after the surface of a half-space at T_i is \
held at T_s: T_i + (T_s - T_i) erfc(z / (2 sqrt(alpha t))); Carslaw & Jaeger 1959",
        forms: &[Form {
            parameters: &[
                Parameter::new("T_i", "the initial temperature", TEMPERATURE, Domain::AbsoluteTemperature),
                Parameter::new("T_s", "the surface temperature", TEMPERATURE, Domain::AbsoluteTemperature),
                DEPTH,
                Parameter::new("t", "the time since the step", TIME, Domain::Positive),
                DIFFUSIVITY,
            ],
            result: TEMPERATURE,
            unit: "degC",
            formulations: &[&HALF_SPACE_STEP],
            formula: "T = T_i + (T_s - T_i) * erfc(z / (2 * sqrt(alpha * t)))",
            example: "half_space_temperature(10 degC, 40 degC, 2 m, 30 d, 1e-6 m^2/s)",
            body: half_space_temperature,
        }],
    },
    Relation {
        name: "seasonal_amplitude",
        summary: "amplitude at depth z of a periodic surface temperature of amplitude A_0: A_0 \
exp(-z sqrt(pi / (alpha P))); Carslaw & Jaeger 1959",
        forms: &[Form {
            parameters: &[
                Parameter::new("A_0", "the surface amplitude (a difference)", TEMPERATURE, Domain::NonNegative),
                DEPTH,
                DIFFUSIVITY,
                PERIOD,
            ],
            result: TEMPERATURE,
            unit: "K",
            formulations: &[&PERIODIC_SURFACE],
            formula: "A = A_0 * exp(-z * sqrt(pi / (alpha * P)))",
            example: "seasonal_amplitude(10 K, 3 m, 8e-7 m^2/s, 1 yr)",
            body: seasonal_amplitude,
        }],
    },
    Relation {
        name: "seasonal_lag",
        summary: "time lag at depth z of a periodic surface temperature: z sqrt(P / (pi alpha)) \
/ 2; Carslaw & Jaeger 1959",
        forms: &[Form {
            parameters: &[DEPTH, DIFFUSIVITY, PERIOD],
            result: TIME,
            unit: "d",
            formulations: &[&PERIODIC_SURFACE],
            formula: "t_lag = z / 2 * sqrt(P / (pi * alpha))",
            example: "seasonal_lag(3 m, 8e-7 m^2/s, 1 yr)",
            body: seasonal_lag,
        }],
    },
    Relation {
        name: "geothermal_gradient",
        summary: "conductive geothermal gradient dT_dz = q / lambda (K/m) under a heat flow q; \
for layered rock give lambda = layered_across(lambdas, thicknesses); Fourier 1822",
        forms: &[Form {
            parameters: &[
                Parameter::new("q", "the conductive heat flow", HEAT_FLUX, Domain::Any),
                CONDUCTIVITY,
            ],
            result: TEMPERATURE_GRADIENT,
            unit: "K/km",
            formulations: &[&FOURIER],
            formula: "dT_dz = q / lambda",
            example: "geothermal_gradient(65 mW/m^2, 2.5 W/(m*K))",
            body: geothermal_gradient,
        }],
    },
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
            formula: "q = -lambda * dT_dx",
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
            formula: "lambda = lambda_solid^(1 - n) * lambda_fluid^n",
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

/// (1 − n) ρs cs + n ρf cf: the energy stored per kelvin in a unit volume of saturated medium.
fn volumetric_heat_capacity(values: &[f64]) -> Result<f64, CallError> {
    let [porosity, solid_density, solid_heat, fluid_density, fluid_heat] = arguments(values);
    Ok((1.0 - porosity) * solid_density * solid_heat + porosity * fluid_density * fluid_heat)
}

/// α = λ / (ρc).
fn thermal_diffusivity(values: &[f64]) -> Result<f64, CallError> {
    let [conductivity, heat_capacity] = arguments(values);
    Ok(conductivity / heat_capacity)
}

/// Pe = q ρf cf L / λ, signed as q.
fn thermal_peclet_number(values: &[f64]) -> Result<f64, CallError> {
    let [flux, fluid_heat_capacity, length, conductivity] = arguments(values);
    Ok(flux * fluid_heat_capacity * length / conductivity)
}

/// Bredehoeft & Papadopulos (1965): T0 + (TL − T0)(e^{βz/L} − 1)/(e^β − 1), written with
/// expm1 so that small β tends smoothly to the linear conduction profile (β = 0 is that line).
fn vertical_flow_temperature(values: &[f64]) -> Result<f64, CallError> {
    let [top, base, depth, thickness, beta] = arguments(values);
    if depth > thickness {
        return Err(CallError::Domain {
            argument: Some(2),
            message: "`z` is below the base of the layer: it must not exceed `L`".to_string(),
        });
    }
    let fraction = depth / thickness;
    let shape = if beta == 0.0 {
        fraction
    } else {
        (beta * fraction).exp_m1() / beta.exp_m1()
    };
    if !shape.is_finite() {
        return Err(CallError::Domain {
            argument: Some(4),
            message: "`beta` is too large in magnitude for the profile to be computed".to_string(),
        });
    }
    Ok(top + (base - top) * shape)
}

/// Ti + (Ts − Ti) erfc(z / 2√(αt)); Carslaw & Jaeger (1959), the semi-infinite solid.
fn half_space_temperature(values: &[f64]) -> Result<f64, CallError> {
    let [initial, surface, depth, time, diffusivity] = arguments(values);
    let argument = depth / (2.0 * (diffusivity * time).sqrt());
    Ok(initial + (surface - initial) * libm::erfc(argument))
}

/// A0 exp(−z √(π/(αP))): the damping of a surface wave with depth.
fn seasonal_amplitude(values: &[f64]) -> Result<f64, CallError> {
    let [amplitude, depth, diffusivity, period] = arguments(values);
    Ok(amplitude * (-depth * (std::f64::consts::PI / (diffusivity * period)).sqrt()).exp())
}

/// z/2 √(P/(πα)): the phase lag 2π·lag/P equals z √(π/(αP)), the exponent of the damping.
fn seasonal_lag(values: &[f64]) -> Result<f64, CallError> {
    let [depth, diffusivity, period] = arguments(values);
    Ok(0.5 * depth * (period / (std::f64::consts::PI * diffusivity)).sqrt())
}

/// dT/dz = q/λ, Fourier's law for a steady conductive heat flow (positive down into the Earth
/// when q is the upward heat flow).
fn geothermal_gradient(values: &[f64]) -> Result<f64, CallError> {
    let [heat_flow, conductivity] = arguments(values);
    Ok(heat_flow / conductivity)
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

    #[test]
    fn heat_capacity_diffusivity_and_peclet_are_their_definitions() {
        // Hand arithmetic: 0.7 x 2650 x 840 + 0.3 x 1000 x 4190 = 1 558 200 + 1 257 000.
        check(
            "volumetric_heat_capacity",
            &[
                number(0.3),
                si(2650.0, DENSITY),
                si(840.0, SPECIFIC_HEAT),
                si(1000.0, DENSITY),
                si(4190.0, SPECIFIC_HEAT),
            ],
            Expected::Value(2_815_200.0, VOLUMETRIC_HEAT_CAPACITY, 1e-15),
            "hand arithmetic",
        );
        check(
            "thermal_diffusivity",
            &[
                si(2.5, THERMAL_CONDUCTIVITY),
                si(2.5e6, VOLUMETRIC_HEAT_CAPACITY),
            ],
            Expected::Value(1e-6, AREA_PER_TIME, 1e-15),
            "hand arithmetic",
        );
        // 0.1 m/yr (Julian year) through 100 m, water 4.18 MJ/(m^3 K), rock 2.5 W/(m K):
        // Pe = 0.1 / 31 557 600 x 4.18e6 x 100 / 2.5 = 0.529 8... (hand arithmetic, exact inputs).
        check(
            "thermal_peclet_number",
            &[
                si(0.1 / 31_557_600.0, VELOCITY),
                si(4.18e6, VOLUMETRIC_HEAT_CAPACITY),
                si(100.0, LENGTH),
                si(2.5, THERMAL_CONDUCTIVITY),
            ],
            Expected::Value(
                0.1 * 4.18e6 * 100.0 / 2.5 / 31_557_600.0,
                DIMENSIONLESS,
                1e-15,
            ),
            "definition",
        );
        // 65 mW/m^2 through granite of 2.5 W/(m K): 26 K/km (hand arithmetic).
        check(
            "geothermal_gradient",
            &[si(0.065, HEAT_FLUX), si(2.5, THERMAL_CONDUCTIVITY)],
            Expected::Value(0.026, TEMPERATURE_GRADIENT, 1e-15),
            "hand arithmetic",
        );
    }

    #[test]
    fn vertical_flow_profile_solves_its_equation() {
        // Bredehoeft & Papadopulos (1965): T'' = (beta / L) T' with T(0) = T0, T(L) = TL. The
        // closed form at beta = 1.3, z/L = 0.4: (e^0.52 - 1)/(e^1.3 - 1), typed from the paper's
        // expression with f64 exp; then the differential equation by central differences.
        let (top, base, length, beta) = (283.15, 289.15, 100.0, 1.3);
        let profile = |depth: f64| {
            call(
                "vertical_flow_temperature",
                &[
                    si(top, TEMPERATURE),
                    si(base, TEMPERATURE),
                    si(depth, LENGTH),
                    si(length, LENGTH),
                    number(beta),
                ],
            )
            .0
            .unwrap()
            .value
        };
        let shape = (0.52_f64.exp() - 1.0) / (1.3_f64.exp() - 1.0);
        check(
            "vertical_flow_temperature",
            &[
                si(top, TEMPERATURE),
                si(base, TEMPERATURE),
                si(40.0, LENGTH),
                si(length, LENGTH),
                number(beta),
            ],
            Expected::Value(top + (base - top) * shape, TEMPERATURE, 1e-14),
            "Bredehoeft & Papadopulos 1965, closed form",
        );
        assert_eq!(profile(0.0), top);
        assert!((profile(length) - base).abs() < 1e-12);
        let step = 0.5;
        for depth in [10.0, 40.0, 75.0] {
            let second = (profile(depth + step) - 2.0 * profile(depth) + profile(depth - step))
                / (step * step);
            let first = (profile(depth + step) - profile(depth - step)) / (2.0 * step);
            assert!(
                (second - beta / length * first).abs() < 1e-6 * first.abs(),
                "{depth}"
            );
        }
        // Without flow the profile is the straight conduction line, and nearly so for tiny beta.
        for beta in [0.0, 1e-12] {
            let (value, _) = call(
                "vertical_flow_temperature",
                &[
                    si(top, TEMPERATURE),
                    si(base, TEMPERATURE),
                    si(25.0, LENGTH),
                    si(length, LENGTH),
                    number(beta),
                ],
            );
            assert!((value.unwrap().value - (top + 0.25 * (base - top))).abs() < 1e-9);
        }
        let (refusal, _) = call(
            "vertical_flow_temperature",
            &[
                si(top, TEMPERATURE),
                si(base, TEMPERATURE),
                si(101.0, LENGTH),
                si(length, LENGTH),
                number(beta),
            ],
        );
        assert!(refusal.is_err());
    }

    #[test]
    fn half_space_and_seasonal_wave_match_closed_forms() {
        // z / (2 sqrt(alpha t)) = 1 with alpha = 1e-6 m^2/s, t = 1e6 s, z = 2 m; erfc(1) =
        // 1 - 0.842700792949715 (Abramowitz & Stegun, Table 7.1, erf(1)).
        check(
            "half_space_temperature",
            &[
                si(283.15, TEMPERATURE),
                si(313.15, TEMPERATURE),
                si(2.0, LENGTH),
                si(1e6, TIME),
                si(1e-6, AREA_PER_TIME),
            ],
            Expected::Value(
                283.15 + 30.0 * (1.0 - 0.842_700_792_949_715),
                TEMPERATURE,
                1e-14,
            ),
            "Carslaw & Jaeger 1959; erf(1) from Abramowitz & Stegun Table 7.1",
        );
        // At the damping depth d = sqrt(alpha P / pi) the amplitude is A0/e and the lag P/(2 pi)
        // (Carslaw & Jaeger 1959, the periodic surface temperature).
        let (diffusivity, period) = (8e-7, 31_557_600.0);
        let damping_depth = (diffusivity * period / std::f64::consts::PI).sqrt();
        check(
            "seasonal_amplitude",
            &[
                si(10.0, TEMPERATURE),
                si(damping_depth, LENGTH),
                si(diffusivity, AREA_PER_TIME),
                si(period, TIME),
            ],
            Expected::Value(10.0 / std::f64::consts::E, TEMPERATURE, 1e-14),
            "Carslaw & Jaeger 1959, damping depth",
        );
        check(
            "seasonal_lag",
            &[
                si(damping_depth, LENGTH),
                si(diffusivity, AREA_PER_TIME),
                si(period, TIME),
            ],
            Expected::Value(period / (2.0 * std::f64::consts::PI), TIME, 1e-14),
            "Carslaw & Jaeger 1959, damping depth",
        );
    }
}
