//! Transport relations of porous media as sheet functions: Darcy's law and what follows from it
//! (seepage velocity, travel time, transmissivity, the Reynolds number that bounds it), Fick's,
//! Fourier's and Ohm's laws with the porous-medium coefficients that feed them (tortuosity,
//! formation factor, Archie's law, the geometric-mean conductivity), permeability estimates from
//! grain size (Hazen, Kozeny–Carman), lab reductions (Klinkenberg, constant- and falling-head
//! permeameters) and the leakage through a saturated liner.
//!
//! Every function takes SI quantities, refuses a wrong dimension or an argument outside the
//! physical domain with the argument's index, and records the formulation it evaluates. Fluxes
//! follow one sign convention: the gradient is taken along an axis s (or x) and the flux is
//! positive along that axis, so `fick_flux(D, dc_dx)` is negative where the concentration rises.
//! The argument checks here are shared with `wells`.

use super::Builtin;
use crate::eval::function::{expect_argument_count, expect_dimension, CallError};
use crate::eval::{Formulation, Provenance, Quantity};
use crate::units::Dimension;

// Dimensions, base order L M T I Θ N J.
pub(super) const DIMENSIONLESS: Dimension = Dimension::from_integers([0, 0, 0, 0, 0, 0, 0]);
pub(super) const LENGTH: Dimension = Dimension::from_integers([1, 0, 0, 0, 0, 0, 0]);
pub(super) const AREA: Dimension = Dimension::from_integers([2, 0, 0, 0, 0, 0, 0]);
pub(super) const TIME: Dimension = Dimension::from_integers([0, 0, 1, 0, 0, 0, 0]);
pub(super) const VELOCITY: Dimension = Dimension::from_integers([1, 0, -1, 0, 0, 0, 0]);
pub(super) const ACCELERATION: Dimension = Dimension::from_integers([1, 0, -2, 0, 0, 0, 0]);
/// Transmissivity and diffusion coefficients share L^2 T^-1.
pub(super) const AREA_PER_TIME: Dimension = Dimension::from_integers([2, 0, -1, 0, 0, 0, 0]);
pub(super) const VOLUME_FLOW_RATE: Dimension = Dimension::from_integers([3, 0, -1, 0, 0, 0, 0]);
const DENSITY: Dimension = Dimension::from_integers([-3, 1, 0, 0, 0, 0, 0]);
const DYNAMIC_VISCOSITY: Dimension = Dimension::from_integers([-1, 1, -1, 0, 0, 0, 0]);
const PRESSURE: Dimension = Dimension::from_integers([-1, 1, -2, 0, 0, 0, 0]);
const PRESSURE_GRADIENT: Dimension = Dimension::from_integers([-2, 1, -2, 0, 0, 0, 0]);
const MOLAR_CONCENTRATION_GRADIENT: Dimension = Dimension::from_integers([-4, 0, 0, 0, 0, 1, 0]);
const MASS_CONCENTRATION_GRADIENT: Dimension = Dimension::from_integers([-4, 1, 0, 0, 0, 0, 0]);
const MOLAR_FLUX: Dimension = Dimension::from_integers([-2, 0, -1, 0, 0, 1, 0]);
const MASS_FLUX: Dimension = Dimension::from_integers([-2, 1, -1, 0, 0, 0, 0]);
const THERMAL_CONDUCTIVITY: Dimension = Dimension::from_integers([1, 1, -3, 0, -1, 0, 0]);
const TEMPERATURE_GRADIENT: Dimension = Dimension::from_integers([-1, 0, 0, 0, 1, 0, 0]);
const HEAT_FLUX: Dimension = Dimension::from_integers([0, 1, -3, 0, 0, 0, 0]);
const ELECTRICAL_CONDUCTIVITY: Dimension = Dimension::from_integers([-3, -1, 3, 2, 0, 0, 0]);
const ELECTRICAL_RESISTIVITY: Dimension = Dimension::from_integers([3, 1, -3, -2, 0, 0, 0]);
/// A voltage gradient (V/m), the electric field with its sign reversed.
const VOLTAGE_GRADIENT: Dimension = Dimension::from_integers([1, 1, -3, -1, 0, 0, 0]);
const CURRENT_DENSITY: Dimension = Dimension::from_integers([-2, 0, 0, 1, 0, 0, 0]);
/// Hazen's coefficient written with its units, 1/(cm·s) in the trade.
const HAZEN_COEFFICIENT: Dimension = Dimension::from_integers([-1, 0, -1, 0, 0, 0, 0]);

// ---------------------------------------------------------------------------------------------
// Formulations
// ---------------------------------------------------------------------------------------------

const BEAR_1972: &str = "Bear, J., 1972, Dynamics of Fluids in Porous Media, American Elsevier, \
New York, chapter 5";
const FREEZE_CHERRY_1979: &str = "Freeze, R. A. and Cherry, J. A., 1979, Groundwater, \
Prentice-Hall, Englewood Cliffs NJ";
const SHACKELFORD_DANIEL_1991: &str = "Shackelford, C. D. and Daniel, D. E., 1991, Diffusion in \
saturated soil. I: Background, Journal of Geotechnical Engineering 117(3), 467-484";
const ARCHIE_1942: &str = "Archie, G. E., 1942, The electrical resistivity log as an aid in \
determining some reservoir characteristics, Transactions of the AIME 146(1), 54-62";

/// Darcy's law with the hydraulic conductivity of the rock for the fluid.
pub static DARCY: Formulation = Formulation {
    id: "darcy-1856",
    title: "Darcy's law, q = K i",
    citation: "Darcy, H., 1856, Les fontaines publiques de la ville de Dijon, Victor Dalmont, \
Paris, note D",
    validity: "steady laminar flow of a Newtonian fluid through a saturated, rigid porous \
medium; Reynolds number below about 1 to 10",
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
};

/// The average velocity of water in the connected pores.
pub static SEEPAGE_VELOCITY: Formulation = Formulation {
    id: "seepage-velocity",
    title: "average linear (seepage) velocity, v = q / n_e",
    citation: FREEZE_CHERRY_1979,
    validity: "n_e the effective (connected, flowing) porosity; an average over the pores, not \
the fastest path",
};

/// Advective arrival time, with no spreading.
pub static ADVECTIVE_TRAVEL_TIME: Formulation = Formulation {
    id: "advective-travel-time",
    title: "advective (plug-flow) travel time, t = L / v",
    citation: FREEZE_CHERRY_1979,
    validity: "advection only: no dispersion, diffusion, sorption or decay; v uniform along the \
path (use the seepage velocity, not the Darcy flux)",
};

/// Transmissivity of an aquifer of uniform thickness.
pub static TRANSMISSIVITY: Formulation = Formulation {
    id: "transmissivity",
    title: "aquifer transmissivity, T = K b",
    citation: FREEZE_CHERRY_1979,
    validity: "horizontal flow through a saturated thickness b; K the thickness-averaged \
horizontal hydraulic conductivity",
};

/// The Reynolds number that bounds Darcy's law.
pub static REYNOLDS: Formulation = Formulation {
    id: "porous-media-reynolds",
    title: "Reynolds number of flow in a porous medium, Re = rho q d / mu",
    citation: BEAR_1972,
    validity: "d a representative grain diameter (often d10 or d50); Darcy's law is commonly \
taken valid for Re below 1 to 10 (common practice)",
};

/// Fick's first law in free solution.
pub static FICK: Formulation = Formulation {
    id: "fick-1855",
    title: "Fick's first law, J = -D dc/dx",
    citation: "Fick, A., 1855, Ueber Diffusion, Annalen der Physik und Chemie 94, 59-86",
    validity: "dilute solute, isothermal, no advection; D the free-solution diffusion \
coefficient",
};

/// Pore diffusion coefficient from a tortuosity factor.
pub static TORTUOSITY_DIFFUSION: Formulation = Formulation {
    id: "tortuosity-diffusion",
    title: "effective diffusion coefficient, D* = tau D0 (tau <= 1)",
    citation: SHACKELFORD_DANIEL_1991,
    validity: "saturated medium, non-sorbing solute; tau the apparent tortuosity factor in \
(0, 1], about 0.01 to 0.5 in laboratory studies of soils",
};

/// Pore diffusion coefficient from the electrical formation factor.
pub static FORMATION_FACTOR_DIFFUSION: Formulation = Formulation {
    id: "formation-factor-diffusion",
    title: "effective diffusion coefficient from the formation factor, D* = D0 / (F n)",
    citation: "Klinkenberg, L. J., 1951, Analogy between diffusion and electrical conductivity \
in porous rocks, Geological Society of America Bulletin 62(6), 559-564",
    validity: "saturated, clay-free medium without surface conduction, non-sorbing solute; F the \
electrical formation factor rho_0 / rho_w",
};

/// Fick's first law in a saturated porous medium, per unit of total area.
pub static POROUS_FICK: Formulation = Formulation {
    id: "porous-fick",
    title: "Fick's first law in a porous medium, J = -n D* dc/dx",
    citation: SHACKELFORD_DANIEL_1991,
    validity: "saturated medium, steady diffusion of a non-sorbing solute; c the pore-water \
concentration, J per unit of total cross-section",
};

/// Fourier's law of conduction.
pub static FOURIER: Formulation = Formulation {
    id: "fourier-1822",
    title: "Fourier's law, q = -lambda dT/dx",
    citation: "Fourier, J., 1822, Theorie analytique de la chaleur, Firmin Didot, Paris",
    validity: "conduction in an isotropic medium; for soil and rock lambda is the bulk \
(effective) conductivity and convection in the pores is neglected",
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
};

/// Ohm's law in differential form.
pub static OHM: Formulation = Formulation {
    id: "ohm-1827",
    title: "Ohm's law, j = -sigma dV/dx",
    citation: "Ohm, G. S., 1827, Die galvanische Kette, mathematisch bearbeitet, T. H. Riemann, \
Berlin",
    validity: "linear (ohmic) conduction in an isotropic medium, steady current",
};

/// Archie's first law, formation factor from porosity.
pub static ARCHIE: Formulation = Formulation {
    id: "archie-1942",
    title: "Archie's law, F = rho_0 / rho_w = a n^-m",
    citation: ARCHIE_1942,
    validity: "clean (clay-free), fully water-saturated rock where surface conduction is \
negligible; a and m fitted per formation (Archie: a = 1, m 1.8 to 2.0 for consolidated \
sandstones, about 1.3 for unconsolidated sands)",
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
};

/// Klinkenberg's gas-slip correction.
pub static KLINKENBERG: Formulation = Formulation {
    id: "klinkenberg-1941",
    title: "Klinkenberg correction, k_liquid = k_gas / (1 + b / p_mean)",
    citation: "Klinkenberg, L. J., 1941, The permeability of porous media to liquids and gases, \
Drilling and Production Practice, American Petroleum Institute, 200-213",
    validity: "slip flow of one gas through a dry core; b fitted for the same gas and core from \
tests at several mean pressures; p_mean absolute",
};

/// Constant-head permeameter reduction.
pub static CONSTANT_HEAD: Formulation = Formulation {
    id: "constant-head-permeameter",
    title: "constant-head permeameter, K = Q L / (A dh)",
    citation: "ASTM D2434, Standard Test Method for Permeability of Granular Soils (Constant \
Head), ASTM International; from Darcy's law",
    validity: "steady laminar flow through a saturated specimen; granular soils (ASTM D2434: \
not more than 10 % passing the 75 um sieve)",
};

/// Falling-head (standpipe) permeameter reduction.
pub static FALLING_HEAD: Formulation = Formulation {
    id: "falling-head-permeameter",
    title: "falling-head permeameter, K = (a L / (A t)) ln(h1 / h2)",
    citation: "Darcy's law with continuity in the standpipe, as in e.g. Das, B. M., Principles \
of Geotechnical Engineering, Cengage Learning, chapter on permeability",
    validity: "saturated specimen, laminar flow, no volume change; h1 and h2 measured above the \
outflow (tailwater) level",
};

/// Leakage through a saturated liner with ponded head.
pub static LINER_LEAKAGE: Formulation = Formulation {
    id: "liner-leakage",
    title: "leakage through a saturated liner, q = K (h + t) / t",
    citation: "Darcy's law across the liner, as in e.g. Kuo, J., 2014, Practical Design \
Calculations for Groundwater and Soil Remediation, 2nd ed., CRC Press, Boca Raton, example 3.3",
    validity: "steady vertical flow through an intact, fully saturated liner (no cracks, no \
geomembrane); head h ponded on top, free drainage (zero pressure head) at the base",
};

// ---------------------------------------------------------------------------------------------
// The function table
// ---------------------------------------------------------------------------------------------

// A `static`, not a `const` as in `math`: the entries cite formulation statics inline
// (`.citing(&[&DARCY])`), which a static's initializer may borrow for 'static and a const's may not.
pub static FUNCTIONS: &[(&str, Builtin)] = &[
    (
        "darcy_flux",
        Builtin::new(
            "darcy_flux(K, i)",
            "Darcy flux q = K i (m/s); K hydraulic conductivity, i = -dh/ds the head drop per \
length along s (dimensionless), so q > 0 flows along s toward lower head; Darcy 1856",
            darcy_flux,
        )
        .citing(&[&DARCY]),
    ),
    (
        "darcy_flux_pressure",
        Builtin::new(
            "darcy_flux_pressure(k, mu, dp_ds, rho, g_s)",
            "Darcy flux q = -(k/mu)(dp_ds - rho g_s) (m/s) along s; k permeability, mu viscosity, \
dp_ds pressure gradient along s, rho fluid density, g_s gravity along s (g0 if s points down, \
-g0 if up, 0 horizontal); Hubbert 1940",
            darcy_flux_pressure,
        )
        .citing(&[&DARCY_PERMEABILITY]),
    ),
    (
        "seepage_velocity",
        Builtin::new(
            "seepage_velocity(q, n_e)",
            "average linear velocity v = q / n_e (m/s); q Darcy flux, n_e effective porosity \
in (0, 1]",
            seepage_velocity,
        )
        .citing(&[&SEEPAGE_VELOCITY]),
    ),
    (
        "travel_time",
        Builtin::new(
            "travel_time(L, v)",
            "advective travel time t = L / v (s); L path length, v seepage velocity (positive); \
no dispersion or retardation",
            travel_time,
        )
        .citing(&[&ADVECTIVE_TRAVEL_TIME]),
    ),
    (
        "transmissivity",
        Builtin::new(
            "transmissivity(K, b)",
            "aquifer transmissivity T = K b (m^2/s); K hydraulic conductivity, b saturated \
thickness",
            transmissivity,
        )
        .citing(&[&TRANSMISSIVITY]),
    ),
    (
        "reynolds_number",
        Builtin::new(
            "reynolds_number(q, d, rho, mu)",
            "Reynolds number Re = rho |q| d / mu (dimensionless); d grain diameter; Darcy's law \
is commonly taken valid for Re below 1 to 10 (common practice, Bear 1972); the number is \
returned, not checked",
            reynolds_number,
        )
        .citing(&[&REYNOLDS]),
    ),
    (
        "fick_flux",
        Builtin::new(
            "fick_flux(D, dc_dx)",
            "diffusive flux J = -D dc_dx in free solution (mol/(m^2*s), or kg/(m^2*s) for a mass \
concentration gradient); Fick 1855",
            fick_flux,
        )
        .citing(&[&FICK]),
    ),
    (
        "effective_diffusion",
        Builtin::new(
            "effective_diffusion(D0, tau)",
            "effective (pore) diffusion coefficient D* = tau D0 (m^2/s); tau apparent tortuosity \
factor in (0, 1]; Shackelford & Daniel 1991",
            effective_diffusion,
        )
        .citing(&[&TORTUOSITY_DIFFUSION]),
    ),
    (
        "effective_diffusion_formation",
        Builtin::new(
            "effective_diffusion_formation(D0, F, n)",
            "effective (pore) diffusion coefficient D* = D0 / (F n) (m^2/s) from the electrical \
formation factor F and porosity n, the same D* as effective_diffusion; Klinkenberg 1951",
            effective_diffusion_formation,
        )
        .citing(&[&FORMATION_FACTOR_DIFFUSION]),
    ),
    (
        "porous_fick_flux",
        Builtin::new(
            "porous_fick_flux(n, De, dc_dx)",
            "diffusive flux per unit of total area J = -n De dc_dx (mol/(m^2*s) or \
kg/(m^2*s)); n porosity, De the effective (pore) diffusion coefficient D*, c pore-water \
concentration; Shackelford & Daniel 1991",
            porous_fick_flux,
        )
        .citing(&[&POROUS_FICK]),
    ),
    (
        "fourier_flux",
        Builtin::new(
            "fourier_flux(lambda, dT_dx)",
            "conductive heat flux q = -lambda dT_dx (W/m^2); lambda thermal conductivity, dT_dx \
temperature gradient (K/m); Fourier 1822",
            fourier_flux,
        )
        .citing(&[&FOURIER]),
    ),
    (
        "geometric_mean_conductivity",
        Builtin::new(
            "geometric_mean_conductivity(lambda_solid, lambda_fluid, n)",
            "saturated thermal conductivity lambda = lambda_solid^(1-n) lambda_fluid^n \
(W/(m*K)); n porosity; Woodside & Messmer 1961, Johansen 1975",
            geometric_mean_conductivity,
        )
        .citing(&[&GEOMETRIC_MEAN_CONDUCTIVITY]),
    ),
    (
        "ohm_current_density",
        Builtin::new(
            "ohm_current_density(sigma, dV_dx)",
            "current density j = -sigma dV_dx (A/m^2); sigma electrical conductivity, dV_dx \
voltage gradient (V/m); Ohm 1827",
            ohm_current_density,
        )
        .citing(&[&OHM]),
    ),
    (
        "archie_formation_factor",
        Builtin::new(
            "archie_formation_factor(n, a, m)",
            "formation factor F = a n^-m (dimensionless); n porosity, a tortuosity constant, m \
cementation exponent; Archie 1942",
            archie_formation_factor,
        )
        .citing(&[&ARCHIE]),
    ),
    (
        "archie_resistivity",
        Builtin::new(
            "archie_resistivity(rho_w, n, a, m)",
            "resistivity of the water-saturated rock rho_0 = a rho_w n^-m (ohm*m); rho_w pore \
water resistivity; Archie 1942",
            archie_resistivity,
        )
        .citing(&[&ARCHIE]),
    ),
    (
        "archie_porosity",
        Builtin::new(
            "archie_porosity(rho_bulk, rho_w, a, m)",
            "porosity n = (a rho_w / rho_bulk)^(1/m) of a water-saturated rock from its bulk \
resistivity; Archie 1942",
            archie_porosity,
        )
        .citing(&[&ARCHIE]),
    ),
    (
        "hazen_conductivity",
        Builtin::new(
            "hazen_conductivity(d10[, C])",
            "hydraulic conductivity K = C d10^2 (K in cm/s for d10 in cm); C defaults to 100, a \
plain number read as 1/(cm*s), or a quantity such as 100 1/(cm*s); refused outside \
0.1 mm <= d10 <= 3 mm; Hazen 1892",
            hazen_conductivity,
        )
        .citing(&[&HAZEN]),
    ),
    (
        "kozeny_carman_permeability",
        Builtin::new(
            "kozeny_carman_permeability(d, n)",
            "intrinsic permeability k = d^2 n^3 / (180 (1-n)^2) (m^2); d grain diameter, n \
porosity in (0, 1); Carman 1937, Bear 1972",
            kozeny_carman_permeability,
        )
        .citing(&[&KOZENY_CARMAN]),
    ),
    (
        "klinkenberg_liquid_permeability",
        Builtin::new(
            "klinkenberg_liquid_permeability(k_gas, b, p_mean)",
            "equivalent liquid permeability k_l = k_gas / (1 + b / p_mean) (m^2); b Klinkenberg \
slip factor (pressure), p_mean absolute mean gas pressure; Klinkenberg 1941",
            klinkenberg_liquid_permeability,
        )
        .citing(&[&KLINKENBERG]),
    ),
    (
        "constant_head_conductivity",
        Builtin::new(
            "constant_head_conductivity(Q, L, A, dh)",
            "hydraulic conductivity K = Q L / (A dh) (m/s) from a constant-head test; Q flow \
rate, L specimen length, A specimen area, dh head loss across it; ASTM D2434",
            constant_head_conductivity,
        )
        .citing(&[&CONSTANT_HEAD]),
    ),
    (
        "falling_head_conductivity",
        Builtin::new(
            "falling_head_conductivity(a, L, A, t, h1, h2)",
            "hydraulic conductivity K = (a L / (A t)) ln(h1 / h2) (m/s) from a falling-head \
test; a standpipe area, L and A specimen length and area, h1 > h2 the heads at the start and \
after time t",
            falling_head_conductivity,
        )
        .citing(&[&FALLING_HEAD]),
    ),
    (
        "liner_leakage",
        Builtin::new(
            "liner_leakage(K, h, t)",
            "leakage flux through a saturated liner q = K (h + t) / t (m/s, volume per area and \
time); h ponded head on top, t liner thickness, free drainage below",
            liner_leakage,
        )
        .citing(&[&LINER_LEAKAGE]),
    ),
];

// ---------------------------------------------------------------------------------------------
// Argument checks, shared with `wells`
// ---------------------------------------------------------------------------------------------

/// A parameter: its name in the signature and the dimension it must have.
pub(super) struct Parameter {
    pub name: &'static str,
    pub dimension: Dimension,
}

pub(super) const fn parameter(name: &'static str, dimension: Dimension) -> Parameter {
    Parameter { name, dimension }
}

const COUNT_WORDS: [&str; 8] = ["0", "1", "2", "3", "4", "5", "6", "7"];

/// Checks the argument count and every dimension; returns the SI values in order.
pub(super) fn read_arguments<const N: usize>(
    arguments: &[Quantity],
    parameters: &[Parameter; N],
) -> Result<[f64; N], CallError> {
    let expected = COUNT_WORDS.get(N).copied().unwrap_or("more");
    expect_argument_count(arguments, N, N, expected)?;
    let mut values = [0.0; N];
    for (index, (slot, parameter)) in values.iter_mut().zip(parameters).enumerate() {
        *slot = expect_dimension(arguments, index, parameter.name, parameter.dimension)?;
    }
    Ok(values)
}

pub(super) fn domain(argument: usize, message: String) -> CallError {
    CallError::Domain {
        argument: Some(argument),
        message,
    }
}

pub(super) fn require_positive(value: f64, argument: usize, name: &str) -> Result<(), CallError> {
    if value > 0.0 {
        Ok(())
    } else {
        Err(domain(argument, format!("`{name}` must be positive")))
    }
}

pub(super) fn require_non_negative(
    value: f64,
    argument: usize,
    name: &str,
) -> Result<(), CallError> {
    if value >= 0.0 {
        Ok(())
    } else {
        Err(domain(argument, format!("`{name}` must not be negative")))
    }
}

/// A volume fraction (porosity, storativity, tortuosity factor) in (0, 1].
pub(super) fn require_fraction(
    value: f64,
    argument: usize,
    name: &str,
    what: &str,
) -> Result<(), CallError> {
    if value > 0.0 && value <= 1.0 {
        Ok(())
    } else {
        Err(domain(
            argument,
            format!("`{name}` is {what} and must lie in (0, 1]"),
        ))
    }
}

/// A number with about three significant figures for messages: `0.0512`, `12.3`, `1.23e-7`.
pub(super) fn three_figures(value: f64) -> String {
    let magnitude = value.abs();
    if magnitude != 0.0 && !(1e-3..1e5).contains(&magnitude) {
        return format!("{value:.2e}");
    }
    let decimals = if magnitude == 0.0 {
        0
    } else {
        (2 - magnitude.log10().floor() as i32).max(0) as usize
    };
    format!("{value:.decimals$}")
}

// ---------------------------------------------------------------------------------------------
// Darcy
// ---------------------------------------------------------------------------------------------

/// Darcy flux q = K·i (m/s), Darcy (1856).
///
/// `i` is the hydraulic gradient as a head drop per length along the chosen axis s,
/// i = −dh/ds, so a positive `i` gives a positive flux along s, toward lower head. A negative
/// `i` (head rising along s) gives a flux against s.
fn darcy_flux(arguments: &[Quantity], provenance: &mut Provenance) -> Result<Quantity, CallError> {
    let [conductivity, gradient] = read_arguments(
        arguments,
        &[parameter("K", VELOCITY), parameter("i", DIMENSIONLESS)],
    )?;
    require_non_negative(conductivity, 0, "K")?;
    provenance.record(&DARCY);
    Ok(Quantity::new(conductivity * gradient, VELOCITY))
}

/// Darcy flux from permeability, q = −(k/μ)(dp/ds − ρ g_s) (m/s); Hubbert (1940), Bear (1972).
///
/// `g_s` is the component of gravitational acceleration along s: `g0` when s points down,
/// `-g0` when it points up, `g0 * sin(angle below horizontal)` on a slope, 0 horizontally. The
/// gravity term is an argument, not hidden, because a vertical or inclined column is where a
/// pressure-only Darcy law gives the wrong sign. A hydrostatic column (dp/ds = ρ g_s) has q = 0.
fn darcy_flux_pressure(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [permeability, viscosity, pressure_gradient, density, gravity_along_s] = read_arguments(
        arguments,
        &[
            parameter("k", AREA),
            parameter("mu", DYNAMIC_VISCOSITY),
            parameter("dp_ds", PRESSURE_GRADIENT),
            parameter("rho", DENSITY),
            parameter("g_s", ACCELERATION),
        ],
    )?;
    require_non_negative(permeability, 0, "k")?;
    require_positive(viscosity, 1, "mu")?;
    require_non_negative(density, 3, "rho")?;
    provenance.record(&DARCY_PERMEABILITY);
    let driving = pressure_gradient - density * gravity_along_s;
    Ok(Quantity::new(
        -(permeability / viscosity) * driving,
        VELOCITY,
    ))
}

/// Average linear (seepage) velocity v = q / n_e (m/s); Freeze & Cherry (1979).
fn seepage_velocity(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [flux, porosity] = read_arguments(
        arguments,
        &[parameter("q", VELOCITY), parameter("n_e", DIMENSIONLESS)],
    )?;
    require_fraction(porosity, 1, "n_e", "an effective porosity")?;
    provenance.record(&SEEPAGE_VELOCITY);
    Ok(Quantity::new(flux / porosity, VELOCITY))
}

/// Advective travel time t = L / v (s). The velocity must point along the path: a zero or
/// negative velocity never arrives, which is refused rather than returned as infinity.
fn travel_time(arguments: &[Quantity], provenance: &mut Provenance) -> Result<Quantity, CallError> {
    let [length, velocity] = read_arguments(
        arguments,
        &[parameter("L", LENGTH), parameter("v", VELOCITY)],
    )?;
    require_non_negative(length, 0, "L")?;
    if velocity <= 0.0 {
        return Err(domain(
            1,
            "`v` must be positive: the flow must move along the path to arrive".to_string(),
        ));
    }
    provenance.record(&ADVECTIVE_TRAVEL_TIME);
    Ok(Quantity::new(length / velocity, TIME))
}

/// Transmissivity T = K b (m²/s).
fn transmissivity(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [conductivity, thickness] = read_arguments(
        arguments,
        &[parameter("K", VELOCITY), parameter("b", LENGTH)],
    )?;
    require_non_negative(conductivity, 0, "K")?;
    require_positive(thickness, 1, "b")?;
    provenance.record(&TRANSMISSIVITY);
    Ok(Quantity::new(conductivity * thickness, AREA_PER_TIME))
}

/// Reynolds number Re = ρ |q| d / μ of flow through grains of diameter d (Bear 1972).
///
/// Darcy's law is commonly taken valid below Re of 1 to 10 (common practice, not a sharp
/// limit). The engine has no warnings yet, so the number is returned for a check line to judge.
fn reynolds_number(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [flux, diameter, density, viscosity] = read_arguments(
        arguments,
        &[
            parameter("q", VELOCITY),
            parameter("d", LENGTH),
            parameter("rho", DENSITY),
            parameter("mu", DYNAMIC_VISCOSITY),
        ],
    )?;
    require_positive(diameter, 1, "d")?;
    require_positive(density, 2, "rho")?;
    require_positive(viscosity, 3, "mu")?;
    provenance.record(&REYNOLDS);
    Ok(Quantity::dimensionless(
        density * flux.abs() * diameter / viscosity,
    ))
}

// ---------------------------------------------------------------------------------------------
// Fick
// ---------------------------------------------------------------------------------------------

/// Reads a concentration gradient, molar (mol/m⁴) or by mass (kg/m⁴, e.g. `mg/(L*m)`), and
/// returns its value with the dimension the matching flux has.
fn concentration_gradient(
    arguments: &[Quantity],
    argument: usize,
) -> Result<(f64, Dimension), CallError> {
    let gradient = arguments[argument];
    if gradient.dimension == MOLAR_CONCENTRATION_GRADIENT {
        Ok((gradient.value, MOLAR_FLUX))
    } else if gradient.dimension == MASS_CONCENTRATION_GRADIENT {
        Ok((gradient.value, MASS_FLUX))
    } else {
        Err(CallError::WrongDimension {
            argument,
            parameter: "dc_dx",
            expected: MOLAR_CONCENTRATION_GRADIENT,
            found: gradient.dimension,
        })
    }
}

/// Fick's first law in free solution, J = −D dc/dx; Fick (1855). A molar gradient gives a
/// molar flux, a mass-concentration gradient a mass flux.
fn fick_flux(arguments: &[Quantity], provenance: &mut Provenance) -> Result<Quantity, CallError> {
    expect_argument_count(arguments, 2, 2, "2")?;
    let diffusion = expect_dimension(arguments, 0, "D", AREA_PER_TIME)?;
    let (gradient, flux_dimension) = concentration_gradient(arguments, 1)?;
    require_non_negative(diffusion, 0, "D")?;
    provenance.record(&FICK);
    Ok(Quantity::new(-diffusion * gradient, flux_dimension))
}

/// Effective (pore) diffusion coefficient D* = τ D0 (m²/s).
///
/// Convention: τ is the apparent tortuosity factor of Shackelford & Daniel (1991), at most 1
/// (the ω of Freeze & Cherry 1979), not the tortuosity L_e/L ≥ 1. D* is the coefficient that
/// multiplies the pore-water gradient and the porosity in `porous_fick_flux`.
fn effective_diffusion(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [free_diffusion, tortuosity_factor] = read_arguments(
        arguments,
        &[
            parameter("D0", AREA_PER_TIME),
            parameter("tau", DIMENSIONLESS),
        ],
    )?;
    require_non_negative(free_diffusion, 0, "D0")?;
    require_fraction(
        tortuosity_factor,
        1,
        "tau",
        "a tortuosity factor (1 for a straight path)",
    )?;
    provenance.record(&TORTUOSITY_DIFFUSION);
    Ok(Quantity::new(
        free_diffusion * tortuosity_factor,
        AREA_PER_TIME,
    ))
}

/// Effective (pore) diffusion coefficient from the formation factor, D* = D0 / (F n) (m²/s).
///
/// Convention: the same D* as `effective_diffusion`, so that `porous_fick_flux(n, D*, dc_dx)` is
/// −(D0/F) dc/dx, Klinkenberg's (1951) electrical analogy. The implied tortuosity factor
/// 1/(F n) cannot exceed 1 (F n is at least 1 for an insulating matrix, by the Hashin–Shtrikman
/// bound), so F n below 1 is refused as data inconsistent with the model.
fn effective_diffusion_formation(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [free_diffusion, formation_factor, porosity] = read_arguments(
        arguments,
        &[
            parameter("D0", AREA_PER_TIME),
            parameter("F", DIMENSIONLESS),
            parameter("n", DIMENSIONLESS),
        ],
    )?;
    require_non_negative(free_diffusion, 0, "D0")?;
    require_positive(formation_factor, 1, "F")?;
    require_fraction(porosity, 2, "n", "a porosity")?;
    if formation_factor * porosity < 1.0 {
        return Err(domain(
            1,
            format!(
                "`F` times `n` is {}, below 1: the pore diffusion coefficient would exceed `D0`, \
which an insulating matrix does not allow",
                three_figures(formation_factor * porosity)
            ),
        ));
    }
    provenance.record(&FORMATION_FACTOR_DIFFUSION);
    Ok(Quantity::new(
        free_diffusion / (formation_factor * porosity),
        AREA_PER_TIME,
    ))
}

/// Diffusive flux through a saturated porous medium, J = −n D* dc/dx per unit of total area;
/// Shackelford & Daniel (1991). c is the pore-water concentration.
fn porous_fick_flux(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    expect_argument_count(arguments, 3, 3, "3")?;
    let porosity = expect_dimension(arguments, 0, "n", DIMENSIONLESS)?;
    let diffusion = expect_dimension(arguments, 1, "De", AREA_PER_TIME)?;
    let (gradient, flux_dimension) = concentration_gradient(arguments, 2)?;
    require_fraction(porosity, 0, "n", "a porosity")?;
    require_non_negative(diffusion, 1, "De")?;
    provenance.record(&POROUS_FICK);
    Ok(Quantity::new(
        -porosity * diffusion * gradient,
        flux_dimension,
    ))
}

// ---------------------------------------------------------------------------------------------
// Fourier
// ---------------------------------------------------------------------------------------------

/// Fourier's law, q = −λ dT/dx (W/m²); Fourier (1822).
fn fourier_flux(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [conductivity, gradient] = read_arguments(
        arguments,
        &[
            parameter("lambda", THERMAL_CONDUCTIVITY),
            parameter("dT_dx", TEMPERATURE_GRADIENT),
        ],
    )?;
    require_non_negative(conductivity, 0, "lambda")?;
    provenance.record(&FOURIER);
    Ok(Quantity::new(-conductivity * gradient, HEAT_FLUX))
}

/// Thermal conductivity of a saturated medium by the geometric mean,
/// λ = λs^(1−n) λf^n (W/(m·K)); Woodside & Messmer (1961), used by Johansen (1975) for the
/// saturated end member. Both citations are from memory.
fn geometric_mean_conductivity(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [solid, fluid, porosity] = read_arguments(
        arguments,
        &[
            parameter("lambda_solid", THERMAL_CONDUCTIVITY),
            parameter("lambda_fluid", THERMAL_CONDUCTIVITY),
            parameter("n", DIMENSIONLESS),
        ],
    )?;
    require_positive(solid, 0, "lambda_solid")?;
    require_positive(fluid, 1, "lambda_fluid")?;
    require_fraction(porosity, 2, "n", "a porosity")?;
    provenance.record(&GEOMETRIC_MEAN_CONDUCTIVITY);
    Ok(Quantity::new(
        solid.powf(1.0 - porosity) * fluid.powf(porosity),
        THERMAL_CONDUCTIVITY,
    ))
}

// ---------------------------------------------------------------------------------------------
// Ohm and Archie
// ---------------------------------------------------------------------------------------------

/// Ohm's law in differential form, j = −σ dV/dx (A/m²); Ohm (1827).
fn ohm_current_density(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [conductivity, gradient] = read_arguments(
        arguments,
        &[
            parameter("sigma", ELECTRICAL_CONDUCTIVITY),
            parameter("dV_dx", VOLTAGE_GRADIENT),
        ],
    )?;
    require_non_negative(conductivity, 0, "sigma")?;
    provenance.record(&OHM);
    Ok(Quantity::new(-conductivity * gradient, CURRENT_DENSITY))
}

/// Archie's constants `a` and `m`, checked at the given argument positions.
fn archie_constants(a: f64, m: f64, a_argument: usize, m_argument: usize) -> Result<(), CallError> {
    require_positive(a, a_argument, "a")?;
    require_positive(m, m_argument, "m")
}

/// Archie's formation factor F = a n^−m; Archie (1942).
fn archie_formation_factor(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [porosity, a, m] = read_arguments(
        arguments,
        &[
            parameter("n", DIMENSIONLESS),
            parameter("a", DIMENSIONLESS),
            parameter("m", DIMENSIONLESS),
        ],
    )?;
    require_fraction(porosity, 0, "n", "a porosity")?;
    archie_constants(a, m, 1, 2)?;
    provenance.record(&ARCHIE);
    Ok(Quantity::dimensionless(a * porosity.powf(-m)))
}

/// Resistivity of the fully water-saturated rock, ρ0 = a ρw n^−m (Ω·m); Archie (1942).
fn archie_resistivity(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [water, porosity, a, m] = read_arguments(
        arguments,
        &[
            parameter("rho_w", ELECTRICAL_RESISTIVITY),
            parameter("n", DIMENSIONLESS),
            parameter("a", DIMENSIONLESS),
            parameter("m", DIMENSIONLESS),
        ],
    )?;
    require_positive(water, 0, "rho_w")?;
    require_fraction(porosity, 1, "n", "a porosity")?;
    archie_constants(a, m, 2, 3)?;
    provenance.record(&ARCHIE);
    Ok(Quantity::new(
        a * water * porosity.powf(-m),
        ELECTRICAL_RESISTIVITY,
    ))
}

/// Porosity of a water-saturated rock from its resistivity, n = (a ρw / ρb)^(1/m);
/// Archie (1942) solved for n. A bulk resistivity below a ρw would need n above 1: refused.
fn archie_porosity(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [bulk, water, a, m] = read_arguments(
        arguments,
        &[
            parameter("rho_bulk", ELECTRICAL_RESISTIVITY),
            parameter("rho_w", ELECTRICAL_RESISTIVITY),
            parameter("a", DIMENSIONLESS),
            parameter("m", DIMENSIONLESS),
        ],
    )?;
    require_positive(bulk, 0, "rho_bulk")?;
    require_positive(water, 1, "rho_w")?;
    archie_constants(a, m, 2, 3)?;
    let porosity = (a * water / bulk).powf(1.0 / m);
    if porosity > 1.0 {
        return Err(domain(
            0,
            "`rho_bulk` is below `a` times `rho_w`, which would need a porosity above 1"
                .to_string(),
        ));
    }
    provenance.record(&ARCHIE);
    Ok(Quantity::dimensionless(porosity))
}

// ---------------------------------------------------------------------------------------------
// Permeability estimates
// ---------------------------------------------------------------------------------------------

/// Hazen's coefficient when none is given, 1/(cm·s): the commonly used round value.
const HAZEN_DEFAULT_COEFFICIENT: f64 = 100.0;
/// One 1/(cm·s) in SI, 1/(m·s).
const PER_CENTIMETRE_SECOND: f64 = 100.0;
/// The range of d10 Hazen's rule is usually given for, metres.
const HAZEN_D10_RANGE: (f64, f64) = (0.1e-3, 3.0e-3);

/// Hazen's rule K = C d10² (Hazen 1892): K in cm/s when d10 is in cm and C ≈ 100.
///
/// The trade writes C as a bare number meaning 1/(cm·s); a dimensionless `C` is read that way,
/// so `hazen_conductivity(0.2 mm)` is 100 × (0.02 cm)² = 0.04 cm/s. A `C` written with units
/// (`100 1/(cm*s)`) is used as given. Outside 0.1 mm ≤ d10 ≤ 3 mm, the range the rule is usually
/// given for, the call is refused rather than extrapolated.
fn hazen_conductivity(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    expect_argument_count(arguments, 1, 2, "1 or 2")?;
    let d10 = expect_dimension(arguments, 0, "d10", LENGTH)?;
    let coefficient = match arguments.get(1) {
        None => HAZEN_DEFAULT_COEFFICIENT * PER_CENTIMETRE_SECOND,
        Some(given) if given.dimension == DIMENSIONLESS => given.value * PER_CENTIMETRE_SECOND,
        Some(given) if given.dimension == HAZEN_COEFFICIENT => given.value,
        Some(given) => {
            return Err(CallError::WrongDimension {
                argument: 1,
                parameter: "C",
                expected: DIMENSIONLESS,
                found: given.dimension,
            })
        }
    };
    require_positive(d10, 0, "d10")?;
    let (lowest, highest) = HAZEN_D10_RANGE;
    if d10 < lowest || d10 > highest {
        return Err(CallError::OutOfRange {
            argument: Some(0),
            message: format!(
                "`d10` = {} mm is outside 0.1 to 3 mm, the range Hazen's rule is given for",
                three_figures(d10 * 1e3)
            ),
        });
    }
    require_positive(coefficient, 1, "C")?;
    provenance.record(&HAZEN);
    Ok(Quantity::new(coefficient * d10 * d10, VELOCITY))
}

/// Kozeny–Carman permeability k = d² n³ / (180 (1 − n)²) (m²); Carman (1937) with the constant
/// 180 for spheres (Bear 1972). n = 1 has no solids and no finite permeability: refused.
fn kozeny_carman_permeability(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [diameter, porosity] = read_arguments(
        arguments,
        &[parameter("d", LENGTH), parameter("n", DIMENSIONLESS)],
    )?;
    require_positive(diameter, 0, "d")?;
    if !(porosity > 0.0 && porosity < 1.0) {
        return Err(domain(
            1,
            "`n` is a porosity and must lie in (0, 1) here: at 1 there are no grains".to_string(),
        ));
    }
    provenance.record(&KOZENY_CARMAN);
    let solids = 1.0 - porosity;
    Ok(Quantity::new(
        diameter * diameter * porosity.powi(3) / (180.0 * solids * solids),
        AREA,
    ))
}

/// Equivalent liquid permeability from a gas permeability, k_l = k_g / (1 + b / p̄);
/// Klinkenberg (1941). `p_mean` is absolute: gauge pressure would overstate the slip.
fn klinkenberg_liquid_permeability(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [gas_permeability, slip_factor, mean_pressure] = read_arguments(
        arguments,
        &[
            parameter("k_gas", AREA),
            parameter("b", PRESSURE),
            parameter("p_mean", PRESSURE),
        ],
    )?;
    require_non_negative(gas_permeability, 0, "k_gas")?;
    require_non_negative(slip_factor, 1, "b")?;
    if mean_pressure <= 0.0 {
        return Err(domain(
            2,
            "`p_mean` must be positive: it is the absolute mean gas pressure".to_string(),
        ));
    }
    provenance.record(&KLINKENBERG);
    Ok(Quantity::new(
        gas_permeability / (1.0 + slip_factor / mean_pressure),
        AREA,
    ))
}

// ---------------------------------------------------------------------------------------------
// Lab reductions and liners
// ---------------------------------------------------------------------------------------------

/// Constant-head permeameter, K = Q L / (A Δh) (m/s); ASTM D2434.
fn constant_head_conductivity(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [flow, length, area, head_loss] = read_arguments(
        arguments,
        &[
            parameter("Q", VOLUME_FLOW_RATE),
            parameter("L", LENGTH),
            parameter("A", AREA),
            parameter("dh", LENGTH),
        ],
    )?;
    require_non_negative(flow, 0, "Q")?;
    require_positive(length, 1, "L")?;
    require_positive(area, 2, "A")?;
    require_positive(head_loss, 3, "dh")?;
    provenance.record(&CONSTANT_HEAD);
    Ok(Quantity::new(flow * length / (area * head_loss), VELOCITY))
}

/// Falling-head permeameter, K = (a L / (A t)) ln(h1 / h2) (m/s). The head must fall: h2 at or
/// above h1 is a failed or mislabelled reading.
fn falling_head_conductivity(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [standpipe_area, length, area, time, head_start, head_end] = read_arguments(
        arguments,
        &[
            parameter("a", AREA),
            parameter("L", LENGTH),
            parameter("A", AREA),
            parameter("t", TIME),
            parameter("h1", LENGTH),
            parameter("h2", LENGTH),
        ],
    )?;
    require_positive(standpipe_area, 0, "a")?;
    require_positive(length, 1, "L")?;
    require_positive(area, 2, "A")?;
    require_positive(time, 3, "t")?;
    require_positive(head_start, 4, "h1")?;
    require_positive(head_end, 5, "h2")?;
    if head_end >= head_start {
        return Err(domain(
            5,
            "`h2` must be below `h1`: the head falls during a falling-head test".to_string(),
        ));
    }
    provenance.record(&FALLING_HEAD);
    Ok(Quantity::new(
        standpipe_area * length / (area * time) * (head_start / head_end).ln(),
        VELOCITY,
    ))
}

/// Leakage through a saturated liner, q = K (h + t) / t (m/s, i.e. m³ per m² and second).
///
/// Assumptions: steady one-dimensional downward flow through an intact, fully saturated liner of
/// thickness t; a head h ponded on top; free drainage below, so the pressure head at the base is
/// zero and the gradient is (h + t)/t. Suction below the liner and defects are not modelled.
fn liner_leakage(
    arguments: &[Quantity],
    provenance: &mut Provenance,
) -> Result<Quantity, CallError> {
    let [conductivity, head, thickness] = read_arguments(
        arguments,
        &[
            parameter("K", VELOCITY),
            parameter("h", LENGTH),
            parameter("t", LENGTH),
        ],
    )?;
    require_non_negative(conductivity, 0, "K")?;
    require_non_negative(head, 1, "h")?;
    require_positive(thickness, 2, "t")?;
    provenance.record(&LINER_LEAKAGE);
    Ok(Quantity::new(
        conductivity * (head + thickness) / thickness,
        VELOCITY,
    ))
}

#[cfg(test)]
mod tests {
    //! Reference cases, one table per topic, all through `check`. Each value names its source;
    //! "from memory" marks textbook examples recalled rather than re-read.

    use super::*;

    // Unit factors to SI (exact by definition unless noted).
    const CM: f64 = 0.01;
    const MM: f64 = 1e-3;
    const FT: f64 = 0.3048;
    const GALLON: f64 = 3.785_411_784e-3;
    const MINUTE: f64 = 60.0;
    const DAY: f64 = 86_400.0;
    const PSI: f64 = 0.453_592_37 * 9.806_65 / (0.0254 * 0.0254);
    /// 1 mD = 1e-3 D, with 1 D = 1e-12/1.01325 m^2 as in the unit catalog.
    const MILLIDARCY: f64 = 1e-15 / 1.013_25;

    fn si(value: f64, dimension: Dimension) -> Quantity {
        Quantity::new(value, dimension)
    }

    fn number(value: f64) -> Quantity {
        Quantity::dimensionless(value)
    }

    /// What a call must give.
    enum Expected {
        /// SI value, its dimension, relative tolerance.
        Value(f64, Dimension, f64),
        WrongDimension(usize),
        Domain(usize),
        OutOfRange(usize),
    }

    /// Calls `name` from the table with SI arguments and compares with `expected`. A value must
    /// also have recorded every formulation the function cites; a refusal must record none.
    fn check(name: &str, arguments: &[Quantity], expected: Expected, source: &str) {
        let builtin = FUNCTIONS
            .iter()
            .find(|(entry, _)| *entry == name)
            .map(|(_, builtin)| builtin)
            .unwrap_or_else(|| panic!("no function `{name}`"));
        let mut provenance = Provenance::default();
        let result = (builtin.body)(arguments, &mut provenance);
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
                for formulation in builtin.formulations {
                    assert!(
                        provenance.formulations().contains(formulation),
                        "{name}: `{}` not recorded",
                        formulation.id
                    );
                }
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

    #[test]
    fn fick_fourier_ohm_archie_match_references() {
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
        // 0.05 S/m pore water, 2 V across 0.5 m (voltage rising along x): j = -0.2 A/m^2.
        check(
            "ohm_current_density",
            &[si(0.05, ELECTRICAL_CONDUCTIVITY), si(4.0, VOLTAGE_GRADIENT)],
            Expected::Value(-0.2, CURRENT_DENSITY, 1e-12),
            "hand arithmetic",
        );
        // A published worked exam solution (questions.collegedunia.com, a GATE geophysics
        // question): water 0.25 ohm m, rock 60 ohm m, a = 1, m = 2 give n = 6.45 %
        // (0.064549722). The same numbers run forwards give F = 240 and rho_0 = 60 ohm m.
        let porosity = 0.064_549_722;
        check(
            "archie_porosity",
            &[
                si(60.0, ELECTRICAL_RESISTIVITY),
                si(0.25, ELECTRICAL_RESISTIVITY),
                number(1.0),
                number(2.0),
            ],
            Expected::Value(porosity, DIMENSIONLESS, 1e-8),
            "GATE worked solution",
        );
        check(
            "archie_formation_factor",
            &[number(porosity), number(1.0), number(2.0)],
            // n is printed to 8 figures; F goes as n^-2, so 2e-8.
            Expected::Value(240.0, DIMENSIONLESS, 2e-8),
            "GATE worked solution, forwards",
        );
        check(
            "archie_resistivity",
            &[
                si(0.25, ELECTRICAL_RESISTIVITY),
                number(porosity),
                number(1.0),
                number(2.0),
            ],
            Expected::Value(60.0, ELECTRICAL_RESISTIVITY, 2e-8),
            "GATE worked solution, forwards",
        );
    }

    #[test]
    fn permeability_estimates_and_lab_reductions_match_references() {
        // Hazen: the rule's own arithmetic, 100 x (0.02 cm)^2 = 0.04 cm/s for d10 = 0.2 mm.
        check(
            "hazen_conductivity",
            &[si(0.2 * MM, LENGTH)],
            Expected::Value(0.04 * CM, VELOCITY, 1e-12),
            "Hazen, C = 100 default",
        );
        check(
            "hazen_conductivity",
            &[si(0.2 * MM, LENGTH), number(100.0)],
            Expected::Value(0.04 * CM, VELOCITY, 1e-12),
            "Hazen, C as a trade number",
        );
        check(
            "hazen_conductivity",
            &[si(0.2 * MM, LENGTH), si(100.0 / CM, HAZEN_COEFFICIENT)],
            Expected::Value(0.04 * CM, VELOCITY, 1e-12),
            "Hazen, C with its units",
        );
        check(
            "hazen_conductivity",
            &[si(1.0 * MM, LENGTH), number(50.0)],
            Expected::Value(0.5 * CM, VELOCITY, 1e-12),
            "Hazen, C = 50",
        );
        // Kozeny-Carman with the 180 constant, k = d^2 n^3 / (180 (1 - n)^2): d = 0.1 mm,
        // n = 0.30 by hand arithmetic.
        let k = 1e-8 * 0.027 / (180.0 * 0.49);
        check(
            "kozeny_carman_permeability",
            &[si(0.1 * MM, LENGTH), number(0.30)],
            Expected::Value(k, AREA, 1e-12),
            "Kozeny-Carman, hand arithmetic",
        );
        // Klinkenberg plot after Klinkenberg (1941), as fitted in a published slide example:
        // k_L = 24.78 mD, b = 1.66 psia. At 2 psia that core reads k_gas = 24.78 (1 + 0.83).
        check(
            "klinkenberg_liquid_permeability",
            &[
                si(24.78 * 1.83 * MILLIDARCY, AREA),
                si(1.66 * PSI, PRESSURE),
                si(2.0 * PSI, PRESSURE),
            ],
            Expected::Value(24.78 * MILLIDARCY, AREA, 1e-12),
            "Klinkenberg plot fit, algebra only",
        );
        // Das, Principles of Geotechnical Engineering, permeability chapter (from memory):
        // constant head, L = 30 cm, A = 177 cm^2, head 50 cm, 350 cm^3 in 5 min:
        // k = 350 x 30 / (177 x 50 x 300) = 3.95e-3 cm/s.
        check(
            "constant_head_conductivity",
            &[
                si(350.0 * CM * CM * CM / (5.0 * MINUTE), VOLUME_FLOW_RATE),
                si(30.0 * CM, LENGTH),
                si(177.0 * CM * CM, AREA),
                si(50.0 * CM, LENGTH),
            ],
            Expected::Value(3.95e-3 * CM, VELOCITY, 2e-3),
            "Das constant-head example (from memory)",
        );
        // Same chapter (from memory): falling head, L = 200 mm, A = 1000 mm^2, a = 40 mm^2,
        // head 500 mm falling to 300 mm in 180 s: k = 2.27e-3 cm/s.
        check(
            "falling_head_conductivity",
            &[
                si(40.0 * MM * MM, AREA),
                si(200.0 * MM, LENGTH),
                si(1000.0 * MM * MM, AREA),
                si(180.0, TIME),
                si(500.0 * MM, LENGTH),
                si(300.0 * MM, LENGTH),
            ],
            Expected::Value(2.27e-3 * CM, VELOCITY, 2.5e-3),
            "Das falling-head example (from memory)",
        );
    }

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

    #[test]
    fn messages_are_lower_case_name_the_argument_and_have_no_final_period() {
        let mut provenance = Provenance::default();
        let refusals = [
            falling_head_conductivity(
                &[
                    si(4e-5, AREA),
                    si(1.0, LENGTH),
                    si(1e-3, AREA),
                    si(180.0, TIME),
                    si(0.3, LENGTH),
                    si(0.4, LENGTH),
                ],
                &mut provenance,
            ),
            hazen_conductivity(&[si(0.05 * MM, LENGTH)], &mut provenance),
            seepage_velocity(&[si(1e-5, VELOCITY), number(1.5)], &mut provenance),
        ];
        for refusal in refusals {
            let message = refusal.expect_err("refused").to_string();
            assert!(message.starts_with('`'), "{message}");
            assert!(!message.ends_with('.'), "{message}");
        }
        let message = hazen_conductivity(&[si(0.05 * MM, LENGTH)], &mut provenance)
            .expect_err("refused")
            .to_string();
        assert_eq!(
            message,
            "`d10` = 0.0500 mm is outside 0.1 to 3 mm, the range Hazen's rule is given for"
        );
    }

    #[test]
    fn argument_counts_are_checked() {
        let mut provenance = Provenance::default();
        assert!(matches!(
            darcy_flux(&[si(1e-5, VELOCITY)], &mut provenance),
            Err(CallError::ArgumentCount {
                expected: "2",
                found: 1
            })
        ));
        assert!(matches!(
            hazen_conductivity(&[], &mut provenance),
            Err(CallError::ArgumentCount { .. })
        ));
    }

    #[test]
    fn every_function_cites_a_formulation_and_documents_itself() {
        for (name, builtin) in FUNCTIONS {
            assert!(!builtin.formulations.is_empty(), "{name} cites nothing");
            assert!(builtin.signature.starts_with(name), "{name}: signature");
            assert!(
                builtin.summary.contains('='),
                "{name}: summary without formula"
            );
        }
    }

    #[test]
    fn three_figures_reads_well() {
        assert_eq!(three_figures(0.0512), "0.0512");
        assert_eq!(three_figures(12.34), "12.3");
        assert_eq!(three_figures(1234.0), "1234");
        assert_eq!(three_figures(1.234e-7), "1.23e-7");
        assert_eq!(three_figures(0.0), "0");
    }
}
