//! Liners: leakage through a saturated mineral liner under a ponded head; the steady
//! advective–diffusive solute flux across a liner and the advective breakthrough time; leakage
//! through holes in a geomembrane, on a low-permeability soil (composite liner, Giroud's
//! empirical equations) or with free flow beneath (an orifice).
//!
//! Giroud's equations are fitted in fixed units (m, m², m/s giving m³/s) and are not
//! dimensionally homogeneous: their entries take and return checked quantities, and their
//! bodies work in those units, which here happen to be the SI base units.

use super::dimensions::{
    AREA, DENSITY, DIMENSIONLESS, LENGTH, MASS_FLUX, MOLAR_CONCENTRATION, MOLAR_FLUX, TIME,
    VELOCITY, VOLUME_FLOW_RATE,
};
use super::relation::{arguments, Domain, Form, Parameter, Relation};
use crate::eval::function::CallError;
use crate::eval::Formulation;

/// Leakage through a saturated liner with ponded head.
pub static LINER_LEAKAGE: Formulation = Formulation {
    id: "liner-leakage",
    title: "leakage through a saturated liner, q = K (h + t) / t",
    citation: "Darcy's law across the liner, as in e.g. Kuo, J., 2014, Practical Design \
Calculations for Groundwater and Soil Remediation, 2nd ed., CRC Press, Boca Raton, example 3.3",
    validity: "steady vertical flow through an intact, fully saturated liner (no cracks, no \
geomembrane); head h ponded on top, free drainage (zero pressure head) at the base",
    ranges: &[],
};
/// Steady advective–diffusive flux across a liner between fixed concentrations.
pub static LINER_SOLUTE_FLUX: Formulation = Formulation {
    id: "liner-advective-diffusive-flux",
    title: "steady advective-diffusive flux through a liner, J = q c0 / (1 - exp(-Pe)), \
Pe = q L / (n D)",
    citation: "the steady solution of the one-dimensional advection-dispersion equation with \
c = c0 on top and c = 0 at the base, as in Rowe, R. K., Quigley, R. M., Brachman, R. W. I. and \
Booker, J. R., 2004, Barrier Systems for Waste Disposal Facilities, 2nd ed., Spon Press, London",
    validity: "steady state (long after breakthrough); saturated homogeneous liner; source \
concentration c0 held on top, the base flushed to zero; q the Darcy flux through the liner \
(negative upwards), D the hydrodynamic dispersion coefficient (De in a clay liner); tends to \
n D c0 / L as q -> 0 and to q c0 at large Pe",
    ranges: &[],
};
/// Advective breakthrough of a sorbing solute across a liner.
pub static LINER_BREAKTHROUGH: Formulation = Formulation {
    id: "liner-advective-breakthrough",
    title: "advective breakthrough time through a liner, t = n R L / q",
    citation: "Freeze, R. A. and Cherry, J. A., 1979, Groundwater, Prentice-Hall, Englewood \
Cliffs NJ, section 9.2 (retarded front velocity v / R)",
    validity: "plug flow at the seepage velocity q / n, retarded by R; ignores diffusion and \
dispersion, which bring the first arrival earlier (use ogata_banks for the spread front): an \
upper bound, not a design time",
    ranges: &[],
};
const GIROUD_1997: &str = "Giroud, J. P., 1997, Equations for calculating the rate of liquid \
migration through composite liners due to geomembrane defects, Geosynthetics International \
4(3-4), 335-348";
/// Giroud's empirical equation for a hole in a geomembrane in good contact with the soil.
pub static GIROUD_GOOD_CONTACT: Formulation = Formulation {
    id: "giroud-1997-good-contact",
    title: "leakage through a hole in a composite liner, good contact, Q = 0.21 [1 + 0.1 \
(h/t_s)^0.95] a^0.1 h^0.9 K_s^0.74 (m^3/s with a in m^2, h and t_s in m, K_s in m/s)",
    citation: GIROUD_1997,
    validity: "empirical, fitted in fixed units (Q m^3/s, a m^2, h and t_s m, K_s m/s): not \
dimensionally homogeneous; steady flow through a circular hole in a geomembrane on a \
low-permeability soil layer of thickness t_s (compacted clay, or a geosynthetic clay liner with \
its own t_s and K_s), free drainage below it; good contact: the geomembrane laid with as few \
wrinkles as possible on a well-compacted, smooth soil surface",
    ranges: &[],
};
/// The same equation for poor contact.
pub static GIROUD_POOR_CONTACT: Formulation = Formulation {
    id: "giroud-1997-poor-contact",
    title: "leakage through a hole in a composite liner, poor contact, Q = 1.15 [1 + 0.1 \
(h/t_s)^0.95] a^0.1 h^0.9 K_s^0.74 (m^3/s with a in m^2, h and t_s in m, K_s in m/s)",
    citation: GIROUD_1997,
    validity: "empirical, fitted in fixed units (Q m^3/s, a m^2, h and t_s m, K_s m/s): not \
dimensionally homogeneous; as for good contact, but the geomembrane laid with wrinkles, or on \
a soil surface that is poorly compacted or not smooth",
    ranges: &[],
};
/// Free flow through a hole: Bernoulli's orifice.
pub static GEOMEMBRANE_ORIFICE: Formulation = Formulation {
    id: "geomembrane-hole-orifice",
    title: "free flow through a hole in a geomembrane, Q = C_B a sqrt(2 g h)",
    citation: "Bernoulli's equation for an orifice, applied to geomembrane holes with C_B = 0.6 \
by Giroud, J. P. and Bonaparte, R., 1989, Leakage through liners constructed with \
geomembranes - Part I. Geomembrane liners, Geotextiles and Geomembranes 8(1), 27-67",
    validity: "a hole whose flow is not impeded beneath it (geomembrane alone over a pervious \
layer); h the liquid head on the hole, thin geomembrane, sharp-edged hole; C_B about 0.6",
    ranges: &[],
};
/// Standard gravity, exact (CGPM 1901).
const STANDARD_GRAVITY: f64 = 9.80665;
/// Giroud's (1997) contact quality factors, good and poor contact.
const GOOD_CONTACT_FACTOR: f64 = 0.21;
const POOR_CONTACT_FACTOR: f64 = 1.15;

const DARCY_FLUX_THROUGH_LINER: Parameter = Parameter::new(
    "q",
    "the Darcy flux through the liner (negative upwards)",
    VELOCITY,
    Domain::Any,
);
const LINER_THICKNESS: Parameter =
    Parameter::new("L", "the liner thickness", LENGTH, Domain::Positive);
const LINER_POROSITY: Parameter =
    Parameter::new("n", "the liner's porosity", DIMENSIONLESS, Domain::Fraction);
const LINER_DISPERSION: Parameter = Parameter::new(
    "D",
    "a hydrodynamic dispersion coefficient (De in clay)",
    super::dimensions::AREA_PER_TIME,
    Domain::Positive,
);
const HOLE_AREA: Parameter = Parameter::new("a", "the area of the hole", AREA, Domain::Positive);
const HEAD_ON_LINER: Parameter = Parameter::new(
    "h",
    "the liquid head on the geomembrane",
    LENGTH,
    Domain::NonNegative,
);
const SOIL_THICKNESS: Parameter = Parameter::new(
    "t_s",
    "the thickness of the soil liner beneath",
    LENGTH,
    Domain::Positive,
);
const SOIL_CONDUCTIVITY: Parameter = Parameter::new(
    "K_s",
    "the soil liner's hydraulic conductivity",
    VELOCITY,
    Domain::NonNegative,
);

pub static RELATIONS: &[Relation] = &[
    Relation {
        name: "liner_solute_flux",
        summary: "steady advective-diffusive solute flux through a liner J = q c0 / (1 - \
exp(-Pe)), Pe = q L / (n D) (kg/(m^2*s), or mol/(m^2*s) for a molar c0); q Darcy flux, c0 \
concentration on top (zero at the base), L thickness, n porosity, D dispersion coefficient; not \
the sum of advective and diffusive fluxes",
        forms: &[
            Form {
                parameters: &[
                    DARCY_FLUX_THROUGH_LINER,
                    Parameter::new(
                        "c0",
                        "the concentration on top of the liner",
                        DENSITY,
                        Domain::NonNegative,
                    ),
                    LINER_THICKNESS,
                    LINER_POROSITY,
                    LINER_DISPERSION,
                ],
                result: MASS_FLUX,
                unit: "g/(m^2*yr)",
                formulations: &[&LINER_SOLUTE_FLUX],
                formula: "J = q * c0 / (1 - exp(-q * L / (n * D)))",
                example: "liner_solute_flux(0.03 m/yr, 1500 mg/L, 0.9 m, 0.38, 6.7e-10 m^2/s)",
                body: liner_solute_flux,
            },
            Form {
                parameters: &[
                    DARCY_FLUX_THROUGH_LINER,
                    Parameter::new(
                        "c0",
                        "the concentration on top of the liner",
                        MOLAR_CONCENTRATION,
                        Domain::NonNegative,
                    ),
                    LINER_THICKNESS,
                    LINER_POROSITY,
                    LINER_DISPERSION,
                ],
                result: MOLAR_FLUX,
                unit: "mol/(m^2*yr)",
                formulations: &[&LINER_SOLUTE_FLUX],
                formula: "J = q * c0 / (1 - exp(-q * L / (n * D)))",
                example: "liner_solute_flux(0.03 m/yr, 40 mol/m^3, 0.9 m, 0.38, 6.7e-10 m^2/s)",
                body: liner_solute_flux,
            },
        ],
    },
    Relation {
        name: "liner_breakthrough_time",
        summary: "advective breakthrough time t = n R L / q (s) of a solute front through a liner \
of thickness L; q Darcy flux (downwards, positive), n porosity, R retardation factor (1 when \
left out); diffusion ignored, so an upper bound",
        forms: &[Form {
            parameters: &[
                LINER_THICKNESS,
                Parameter::new(
                    "q",
                    "the Darcy flux through the liner",
                    VELOCITY,
                    Domain::Positive,
                ),
                LINER_POROSITY,
                Parameter::new("R", "a retardation factor", DIMENSIONLESS, Domain::Positive)
                    .or(1.0),
            ],
            result: TIME,
            unit: "yr",
            formulations: &[&LINER_BREAKTHROUGH],
            formula: "t = n * R * L / q",
            example: "liner_breakthrough_time(0.9 m, 0.03 m/yr, 0.38, 2)",
            body: liner_breakthrough_time,
        }],
    },
    Relation {
        name: "geomembrane_leakage_good_contact",
        summary: "leakage through one hole of area a in a geomembrane on a soil liner (or GCL), \
good contact: Q = 0.21 [1 + 0.1 (h/t_s)^0.95] a^0.1 h^0.9 K_s^0.74 (m^3/s), empirical in fixed \
units (m, m^2, m/s), converted here; h head on the geomembrane, t_s and K_s the soil liner's \
thickness and conductivity; Giroud 1997",
        forms: &[Form {
            parameters: &[HOLE_AREA, HEAD_ON_LINER, SOIL_THICKNESS, SOIL_CONDUCTIVITY],
            result: VOLUME_FLOW_RATE,
            unit: "L/d",
            formulations: &[&GIROUD_GOOD_CONTACT],
            formula: "Q = 0.21 * (1 + 0.1 * (h / t_s)^0.95) * a^0.1 * h^0.9 * K_s^0.74 (m, m^2, m/s, m^3/s)",
            example: "geomembrane_leakage_good_contact(1 cm^2, 0.3 m, 0.6 m, 1e-9 m/s)",
            body: geomembrane_leakage_good_contact,
        }],
    },
    Relation {
        name: "geomembrane_leakage_poor_contact",
        summary: "leakage through one hole as geomembrane_leakage_good_contact, poor contact \
(wrinkles, a rough or poorly compacted soil surface): Q = 1.15 [1 + 0.1 (h/t_s)^0.95] a^0.1 \
h^0.9 K_s^0.74 (m^3/s), empirical in fixed units (m, m^2, m/s), converted here; Giroud 1997",
        forms: &[Form {
            parameters: &[HOLE_AREA, HEAD_ON_LINER, SOIL_THICKNESS, SOIL_CONDUCTIVITY],
            result: VOLUME_FLOW_RATE,
            unit: "L/d",
            formulations: &[&GIROUD_POOR_CONTACT],
            formula: "Q = 1.15 * (1 + 0.1 * (h / t_s)^0.95) * a^0.1 * h^0.9 * K_s^0.74 (m, m^2, m/s, m^3/s)",
            example: "geomembrane_leakage_poor_contact(1 cm^2, 0.3 m, 0.6 m, 1e-9 m/s)",
            body: geomembrane_leakage_poor_contact,
        }],
    },
    Relation {
        name: "geomembrane_leakage_free_flow",
        summary: "leakage through one hole of area a in a geomembrane with free flow beneath, \
Q = C_B a sqrt(2 g0 h) (m^3/s); h head on the hole, C_B discharge coefficient (0.6 when left \
out); Giroud & Bonaparte 1989",
        forms: &[Form {
            parameters: &[
                HOLE_AREA,
                HEAD_ON_LINER,
                Parameter::new(
                    "C_B",
                    "an orifice discharge coefficient",
                    DIMENSIONLESS,
                    Domain::Fraction,
                )
                .or(0.6),
            ],
            result: VOLUME_FLOW_RATE,
            unit: "L/d",
            formulations: &[&GEOMEMBRANE_ORIFICE],
            formula: "Q = C_B * a * sqrt(2 * g0 * h)",
            example: "geomembrane_leakage_free_flow(1 cm^2, 0.3 m)",
            body: geomembrane_leakage_free_flow,
        }],
    },
    Relation {
        name: "liner_leakage",
        summary:
            "leakage flux through a saturated liner q = K (h + t) / t (m/s, volume per area and \
time); h ponded head on top, t liner thickness, free drainage below",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "K",
                    "the liner's hydraulic conductivity",
                    VELOCITY,
                    Domain::NonNegative,
                ),
                Parameter::new(
                    "h",
                    "the head ponded on the liner",
                    LENGTH,
                    Domain::NonNegative,
                ),
                Parameter::new("t", "the liner thickness", LENGTH, Domain::Positive),
            ],
            result: VELOCITY,
            unit: "m/s",
            formulations: &[&LINER_LEAKAGE],
            formula: "q = K * (h + t) / t",
            example: "liner_leakage(1e-9 m/s, 0.3 m, 0.9 m)",
            body: liner_leakage,
        }],
    },
];

/// q = K (h + t) / t (m/s, i.e. m³ per m² and second). Steady one-dimensional downward flow
/// through an intact, fully saturated liner of thickness t; a head h ponded on top; free
/// drainage below, so the pressure head at the base is zero and the gradient is (h + t)/t.
/// Suction below the liner and defects are not modelled.
fn liner_leakage(values: &[f64]) -> Result<f64, CallError> {
    let [conductivity, head, thickness] = arguments(values);
    Ok(conductivity * (head + thickness) / thickness)
}

/// J = q c0 / (1 − e^(−Pe)) written as (n D c0 / L) · Pe / (1 − e^(−Pe)), with expm1 so that
/// the pure-diffusion limit (Pe → 0, factor → 1) and flow upwards (Pe < 0) keep their accuracy.
fn liner_solute_flux(values: &[f64]) -> Result<f64, CallError> {
    let [darcy_flux, concentration, thickness, porosity, dispersion] = arguments(values);
    let diffusive = porosity * dispersion * concentration / thickness;
    let peclet = darcy_flux * thickness / (porosity * dispersion);
    let factor = if peclet == 0.0 {
        1.0
    } else {
        peclet / -(-peclet).exp_m1()
    };
    Ok(diffusive * factor)
}

fn liner_breakthrough_time(values: &[f64]) -> Result<f64, CallError> {
    let [thickness, darcy_flux, porosity, retardation] = arguments(values);
    Ok(porosity * retardation * thickness / darcy_flux)
}

/// Giroud (1997) in its fitted units, m, m², m/s giving m³/s: the SI base units, so the
/// checked SI numbers go in and come out as they are.
fn giroud_hole_leakage(contact_factor: f64, values: &[f64]) -> f64 {
    let [area_m2, head_m, soil_thickness_m, conductivity_m_per_s] = arguments(values);
    let thickness_term = 1.0 + 0.1 * (head_m / soil_thickness_m).powf(0.95);
    contact_factor
        * thickness_term
        * area_m2.powf(0.1)
        * head_m.powf(0.9)
        * conductivity_m_per_s.powf(0.74)
}

fn geomembrane_leakage_good_contact(values: &[f64]) -> Result<f64, CallError> {
    Ok(giroud_hole_leakage(GOOD_CONTACT_FACTOR, values))
}

fn geomembrane_leakage_poor_contact(values: &[f64]) -> Result<f64, CallError> {
    Ok(giroud_hole_leakage(POOR_CONTACT_FACTOR, values))
}

fn geomembrane_leakage_free_flow(values: &[f64]) -> Result<f64, CallError> {
    let [area, head, discharge_coefficient] = arguments(values);
    Ok(discharge_coefficient * area * (2.0 * STANDARD_GRAVITY * head).sqrt())
}

#[cfg(test)]
mod tests {
    //! Reference cases through `library::testing::check`, naming the source of each value.

    use crate::library::dimensions::*;
    use crate::library::testing::*;

    const YEAR: f64 = 365.25 * DAY;

    /// The steady advection–diffusion equation q c' = n D c'' on (0, L), c(0) = c0, c(L) = 0,
    /// by central finite differences on `nodes` intervals (Thomas algorithm), and the total flux
    /// q c - n D c' at the base by a second-order one-sided difference: independent of the
    /// closed form.
    fn flux_by_finite_differences(q: f64, c0: f64, l: f64, n: f64, d: f64, nodes: usize) -> f64 {
        let h = l / nodes as f64;
        let (lower, diagonal, upper) = (
            n * d / (h * h) + q / (2.0 * h),
            -2.0 * n * d / (h * h),
            n * d / (h * h) - q / (2.0 * h),
        );
        // Unknowns c_1 .. c_{nodes-1}; c_0 = c0 and c_nodes = 0 move to the right-hand side.
        let size = nodes - 1;
        let mut modified_upper = vec![0.0; size];
        let mut modified_right = vec![0.0; size];
        for i in 0..size {
            let right = if i == 0 { -lower * c0 } else { 0.0 };
            let (previous_upper, previous_right) = if i == 0 {
                (0.0, 0.0)
            } else {
                (modified_upper[i - 1], modified_right[i - 1])
            };
            let pivot = diagonal - lower * previous_upper;
            modified_upper[i] = upper / pivot;
            modified_right[i] = (right - lower * previous_right) / pivot;
        }
        let mut c = vec![0.0; nodes + 1];
        c[0] = c0;
        for i in (0..size).rev() {
            c[i + 1] = modified_right[i] - modified_upper[i] * c[i + 2];
        }
        let gradient = (3.0 * c[nodes] - 4.0 * c[nodes - 1] + c[nodes - 2]) / (2.0 * h);
        q * c[nodes] - n * d * gradient
    }

    #[test]
    fn liner_solute_flux_meets_both_limits_and_a_finite_difference_solution() {
        let (c0, l, n, d) = (1.5, 0.9, 0.38, 6.7e-10); // 1500 mg/L chloride as kg/m^3
        let call_flux = |q: f64| {
            call(
                "liner_solute_flux",
                &[
                    si(q, VELOCITY),
                    si(c0, DENSITY),
                    si(l, LENGTH),
                    number(n),
                    si(d, AREA_PER_TIME),
                ],
            )
            .0
            .expect("a flux")
            .value
        };
        // Pure diffusion (q = 0): Fick's law across the liner, n D c0 / L.
        check(
            "liner_solute_flux",
            &[
                si(0.0, VELOCITY),
                si(c0, DENSITY),
                si(l, LENGTH),
                number(n),
                si(d, AREA_PER_TIME),
            ],
            Expected::Value(n * d * c0 / l, MASS_FLUX, 1e-15),
            "pure diffusion limit",
        );
        // A vanishing flux joins that limit smoothly (no 0/0).
        let tiny = 1e-20;
        assert!(((call_flux(tiny) - n * d * c0 / l) / (n * d * c0 / l)).abs() < 1e-9);
        // Large Pe: pure advection, q c0.
        let fast = 60.0 * n * d / l;
        check(
            "liner_solute_flux",
            &[
                si(fast, VELOCITY),
                si(c0, DENSITY),
                si(l, LENGTH),
                number(n),
                si(d, AREA_PER_TIME),
            ],
            Expected::Value(fast * c0, MASS_FLUX, 1e-15),
            "pure advection limit",
        );
        // Pe = 4.7, downwards, and Pe = -2, upwards: against finite differences.
        for peclet in [4.7, 0.3, -2.0] {
            let q = peclet * n * d / l;
            let numerical = flux_by_finite_differences(q, c0, l, n, d, 4000);
            let closed = call_flux(q);
            assert!(
                ((closed - numerical) / closed).abs() < 1e-5,
                "Pe {peclet}: {closed} vs finite differences {numerical}"
            );
        }
        // The worked example: at Pe = 4.7, adding q c0 and n D c0 / L by hand is about
        // 20 % high, since J = (n D c0 / L) Pe / (1 - exp(-Pe)).
        let q = 4.7 * n * d / l;
        let by_hand = q * c0 + n * d * c0 / l;
        let overestimate = by_hand / call_flux(q) - 1.0;
        assert!((0.19..0.21).contains(&overestimate), "{overestimate}");
    }

    #[test]
    fn liner_solute_flux_takes_molar_concentrations() {
        check(
            "liner_solute_flux",
            &[
                si(0.0, VELOCITY),
                si(40.0, MOLAR_CONCENTRATION),
                si(0.9, LENGTH),
                number(0.38),
                si(6.7e-10, AREA_PER_TIME),
            ],
            Expected::Value(0.38 * 6.7e-10 * 40.0 / 0.9, MOLAR_FLUX, 1e-15),
            "pure diffusion, molar",
        );
    }

    #[test]
    fn breakthrough_time_is_retarded_plug_flow() {
        // Hand arithmetic: 0.38 * 2 * 0.9 m / (0.03 m/yr) = 22.8 yr.
        check(
            "liner_breakthrough_time",
            &[
                si(0.9, LENGTH),
                si(0.03 / YEAR, VELOCITY),
                number(0.38),
                number(2.0),
            ],
            Expected::Value(22.8 * YEAR, TIME, 1e-14),
            "hand arithmetic",
        );
    }

    #[test]
    fn geomembrane_hole_leakage_matches_the_fitted_equations() {
        // No example of Giroud (1997) is recalled with its printed result, so the equation is
        // evaluated by hand here in its fitted units (m^2, m, m/s -> m^3/s) through logarithms:
        // a = 1 cm^2, h = 0.3 m, t_s = 0.6 m, K_s = 1e-9 m/s.
        let (a, h, t_s, k_s) = (1e-4_f64, 0.3_f64, 0.6_f64, 1e-9_f64);
        let power_part = (0.1 * a.ln() + 0.9 * h.ln() + 0.74 * k_s.ln()).exp();
        let thickness_term = 1.0 + 0.1 * (0.95 * (h / t_s).ln()).exp();
        let arguments = [
            si(a, AREA),
            si(h, LENGTH),
            si(t_s, LENGTH),
            si(k_s, VELOCITY),
        ];
        check(
            "geomembrane_leakage_good_contact",
            &arguments,
            Expected::Value(0.21 * thickness_term * power_part, VOLUME_FLOW_RATE, 1e-13),
            "Giroud 1997, good contact, C_qo = 0.21, by hand",
        );
        check(
            "geomembrane_leakage_poor_contact",
            &arguments,
            Expected::Value(1.15 * thickness_term * power_part, VOLUME_FLOW_RATE, 1e-13),
            "Giroud 1997, poor contact, C_qo = 1.15, by hand",
        );
        // A thick soil liner (h/t_s -> 0) gives back the earlier equation of Giroud and
        // co-workers without the thickness term, Q = 0.21 a^0.1 h^0.9 K_s^0.74 (from memory).
        check(
            "geomembrane_leakage_good_contact",
            &[
                si(a, AREA),
                si(h, LENGTH),
                si(1e9, LENGTH),
                si(k_s, VELOCITY),
            ],
            Expected::Value(0.21 * power_part, VOLUME_FLOW_RATE, 1e-9),
            "Giroud & Bonaparte 1989 form, from memory",
        );
        // No head, no leakage.
        check(
            "geomembrane_leakage_good_contact",
            &[
                si(a, AREA),
                si(0.0, LENGTH),
                si(t_s, LENGTH),
                si(k_s, VELOCITY),
            ],
            Expected::Value(0.0, VOLUME_FLOW_RATE, 0.0),
            "h = 0",
        );
    }

    #[test]
    fn free_flow_is_an_orifice() {
        // Bernoulli by hand: 0.6 * 1e-4 m^2 * sqrt(2 * 9.80665 m/s^2 * 0.3 m).
        check(
            "geomembrane_leakage_free_flow",
            &[si(1e-4, AREA), si(0.3, LENGTH)],
            Expected::Value(
                0.6 * 1e-4 * (2.0_f64 * 9.80665 * 0.3).sqrt(),
                VOLUME_FLOW_RATE,
                1e-15,
            ),
            "Giroud & Bonaparte 1989, C_B = 0.6, by hand",
        );
        check(
            "geomembrane_leakage_free_flow",
            &[si(1e-4, AREA), si(0.3, LENGTH), number(0.7)],
            Expected::Value(
                0.7 * 1e-4 * (2.0_f64 * 9.80665 * 0.3).sqrt(),
                VOLUME_FLOW_RATE,
                1e-15,
            ),
            "C_B = 0.7 given",
        );
    }
}
