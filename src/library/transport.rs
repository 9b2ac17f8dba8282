//! Solute transport in saturated porous media: sorption and retardation, hydrodynamic
//! dispersion, the Péclet number, and the one-dimensional advection–dispersion solution for a
//! continuous source (Ogata–Banks), with retardation and with first-order decay.
//!
//! Concentrations are returned relative to the source, c/c0: multiply by the source
//! concentration in the sheet, in whatever unit it is stated.
//!
//! The Ogata–Banks solution holds exp(v x / D) · erfc(…), whose factors overflow and underflow
//! at Péclet numbers of a few hundred while their product stays small. It is evaluated here as
//! exp(−a²) · erfcx(b), with erfcx(b) = exp(b²) erfc(b) the scaled complementary error
//! function, so every exponent is zero or below and no factor leaves the range of `f64`.

use super::dimensions::{
    AREA_PER_TIME, DENSITY, DIMENSIONLESS, LENGTH, PER_TIME, TIME, VELOCITY, VOLUME_PER_MASS,
};
use super::relation::{arguments, Domain, Form, Parameter, Relation};
use crate::eval::function::CallError;
use crate::eval::Formulation;

const FREEZE_CHERRY_1979: &str = "Freeze, R. A. and Cherry, J. A., 1979, Groundwater, \
Prentice-Hall, Englewood Cliffs NJ";

/// Retardation of a linearly, reversibly sorbing solute.
pub static RETARDATION: Formulation = Formulation {
    id: "retardation-linear-sorption",
    title: "retardation factor for linear sorption, R = 1 + rho_b Kd / n",
    citation: "Freeze, R. A. and Cherry, J. A., 1979, Groundwater, Prentice-Hall, Englewood \
Cliffs NJ, section 9.2 (eq. 9.14)",
    validity: "saturated medium; linear, reversible, instantaneous sorption (a constant \
distribution coefficient Kd over the concentrations of interest); rho_b the dry bulk density",
    ranges: &[],
};
/// Velocity of a retarded solute front.
pub static RETARDED_VELOCITY: Formulation = Formulation {
    id: "retarded-velocity",
    title: "velocity of a retarded solute front, v_c = v / R",
    citation: FREEZE_CHERRY_1979,
    validity: "linear equilibrium sorption; v the seepage (average linear) velocity; R below 1 \
stands for anion exclusion",
    ranges: &[],
};
/// Longitudinal hydrodynamic dispersion.
pub static HYDRODYNAMIC_DISPERSION: Formulation = Formulation {
    id: "hydrodynamic-dispersion",
    title: "longitudinal hydrodynamic dispersion coefficient, D = alpha_L v + D*",
    citation: "Bear, J., 1972, Dynamics of Fluids in Porous Media, American Elsevier, New York, \
chapter 10; Freeze, R. A. and Cherry, J. A., 1979, Groundwater, section 2.13",
    validity: "one-dimensional flow; mechanical dispersion proportional to the seepage velocity \
v; alpha_L depends on the scale of the problem (field values grow with distance)",
    ranges: &[],
};
/// The Péclet number of a transport problem.
pub static PECLET: Formulation = Formulation {
    id: "peclet-number",
    title: "Peclet number, Pe = v L / D",
    citation: "Bear, J., 1972, Dynamics of Fluids in Porous Media, American Elsevier, New York, \
chapter 10",
    validity: "any length L that characterises the problem (a liner thickness, a travel \
distance, a grain diameter); advection dominates above about 1, diffusion below",
    ranges: &[],
};
/// Ogata–Banks: one-dimensional advection–dispersion from a continuous source.
pub static OGATA_BANKS: Formulation = Formulation {
    id: "ogata-banks-1961",
    title: "Ogata-Banks solution, c/c0 = 1/2 [erfc((R x - v t)/(2 sqrt(D R t))) + \
exp(v x / D) erfc((R x + v t)/(2 sqrt(D R t)))]",
    citation: "Ogata, A. and Banks, R. B., 1961, A solution of the differential equation of \
longitudinal dispersion in porous media, U.S. Geological Survey Professional Paper 411-A; \
retardation as in van Genuchten, M. Th. and Alves, W. J., 1982, Analytical solutions of the \
one-dimensional convective-dispersive solute transport equation, USDA Technical Bulletin 1661",
    validity: "semi-infinite homogeneous medium, steady uniform seepage velocity v, constant \
dispersion coefficient D; concentration c0 held at x = 0 from t = 0, none in the medium before; \
linear equilibrium sorption (R); evaluated without overflow at any Peclet number",
    ranges: &[],
};
/// Advection–dispersion with first-order decay.
pub static ADVECTION_DISPERSION_DECAY: Formulation = Formulation {
    id: "van-genuchten-alves-1982-decay",
    title: "advection-dispersion with first-order decay, c/c0 = 1/2 exp((v - u) x / (2 D)) \
erfc((R x - u t)/(2 sqrt(D R t))) + 1/2 exp((v + u) x / (2 D)) erfc((R x + u t)/(2 sqrt(D R t))), \
u = sqrt(v^2 + 4 lambda R D)",
    citation: "van Genuchten, M. Th. and Alves, W. J., 1982, Analytical solutions of the \
one-dimensional convective-dispersive solute transport equation, USDA Technical Bulletin 1661; \
Bear, J., 1972, Dynamics of Fluids in Porous Media, American Elsevier, New York",
    validity: "as the Ogata-Banks solution, with first-order decay at rate lambda of the solute \
in solution and sorbed alike (radioactive decay: lambda = ln 2 / half-life)",
    ranges: &[],
};

const POSITION: Parameter = Parameter::new(
    "x",
    "the distance from the source",
    LENGTH,
    Domain::NonNegative,
);
const ELAPSED: Parameter = Parameter::new(
    "t",
    "the time since the source began",
    TIME,
    Domain::Positive,
);
const SEEPAGE_VELOCITY: Parameter = Parameter::new(
    "v",
    "a seepage velocity (negative towards the source)",
    VELOCITY,
    Domain::Any,
);
const DISPERSION: Parameter = Parameter::new(
    "D",
    "a hydrodynamic dispersion coefficient",
    AREA_PER_TIME,
    Domain::Positive,
);
const RETARDATION_FACTOR: Parameter =
    Parameter::new("R", "a retardation factor", DIMENSIONLESS, Domain::Positive);

pub static RELATIONS: &[Relation] = &[
    Relation {
        name: "retardation_factor",
        summary: "retardation factor R = 1 + rho_b Kd / n (dimensionless); rho_b dry bulk \
density, Kd distribution coefficient (e.g. L/kg), n porosity; linear sorption; Freeze & Cherry \
1979",
        forms: &[Form {
            parameters: &[
                Parameter::new("rho_b", "a dry bulk density", DENSITY, Domain::Positive),
                Parameter::new(
                    "Kd",
                    "a distribution coefficient",
                    VOLUME_PER_MASS,
                    Domain::NonNegative,
                ),
                Parameter::new("n", "a porosity", DIMENSIONLESS, Domain::Fraction),
            ],
            result: DIMENSIONLESS,
            unit: "1",
            formulations: &[&RETARDATION],
            formula: "R = 1 + rho_b * Kd / n",
            example: "retardation_factor(1.8 g/cm^3, 0.5 L/kg, 0.35)",
            body: retardation_factor,
        }],
    },
    Relation {
        name: "retarded_velocity",
        summary: "velocity of a sorbing solute front v_c = v / R (m/s); v seepage velocity, R \
retardation factor",
        forms: &[Form {
            parameters: &[SEEPAGE_VELOCITY, RETARDATION_FACTOR],
            result: VELOCITY,
            unit: "m/d",
            formulations: &[&RETARDED_VELOCITY],
            formula: "v_c = v / R",
            example: "retarded_velocity(0.3 m/d, 3.6)",
            body: retarded_velocity,
        }],
    },
    Relation {
        name: "dispersion_coefficient",
        summary: "longitudinal hydrodynamic dispersion coefficient D = alpha_L |v| + De \
(m^2/s); alpha_L dispersivity, v seepage velocity, De effective (pore) diffusion coefficient; \
Bear 1972",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "alpha_L",
                    "a longitudinal dispersivity",
                    LENGTH,
                    Domain::NonNegative,
                ),
                SEEPAGE_VELOCITY,
                Parameter::new(
                    "De",
                    "an effective (pore) diffusion coefficient",
                    AREA_PER_TIME,
                    Domain::NonNegative,
                ),
            ],
            result: AREA_PER_TIME,
            unit: "m^2/s",
            formulations: &[&HYDRODYNAMIC_DISPERSION],
            formula: "D = alpha_L * abs(v) + De",
            example: "dispersion_coefficient(0.5 m, 0.3 m/d, 1e-9 m^2/s)",
            body: dispersion_coefficient,
        }],
    },
    Relation {
        name: "peclet_number",
        summary: "Peclet number Pe = v L / D (dimensionless); v seepage velocity, L a length of \
the problem, D dispersion (or diffusion) coefficient",
        forms: &[Form {
            parameters: &[
                SEEPAGE_VELOCITY,
                Parameter::new("L", "a characteristic length", LENGTH, Domain::NonNegative),
                DISPERSION,
            ],
            result: DIMENSIONLESS,
            unit: "1",
            formulations: &[&PECLET],
            formula: "Pe = v * L / D",
            example: "peclet_number(0.1 m/yr, 0.9 m, 6e-10 m^2/s)",
            body: peclet_number,
        }],
    },
    Relation {
        name: "ogata_banks",
        summary: "relative concentration c/c0 at distance x and time t downstream of a \
continuous source c0 (dimensionless); v seepage velocity, D dispersion coefficient, R \
retardation factor (1 when left out); stable at any Peclet number; Ogata & Banks 1961",
        forms: &[Form {
            parameters: &[
                POSITION,
                ELAPSED,
                SEEPAGE_VELOCITY,
                DISPERSION,
                Parameter::new("R", "a retardation factor", DIMENSIONLESS, Domain::Positive)
                    .or(1.0),
            ],
            result: DIMENSIONLESS,
            unit: "1",
            formulations: &[&OGATA_BANKS],
            formula: "c/c0 = 1/2 * (erfc((R * x - v * t) / (2 * sqrt(D * R * t))) + exp(v * x / D) * erfc((R * x + v * t) / (2 * sqrt(D * R * t))))",
            example: "ogata_banks(20 m, 1 yr, 0.1 m/d, 2e-5 m^2/s, 1.5)",
            body: ogata_banks,
        }],
    },
    Relation {
        name: "ogata_banks_decay",
        summary: "relative concentration c/c0 downstream of a continuous source with \
first-order decay at rate lambda (dimensionless); x, t, v, D, R as in ogata_banks; van \
Genuchten & Alves 1982",
        forms: &[Form {
            parameters: &[
                POSITION,
                ELAPSED,
                SEEPAGE_VELOCITY,
                DISPERSION,
                RETARDATION_FACTOR,
                Parameter::new(
                    "lambda",
                    "a first-order decay rate constant",
                    PER_TIME,
                    Domain::NonNegative,
                ),
            ],
            result: DIMENSIONLESS,
            unit: "1",
            formulations: &[&ADVECTION_DISPERSION_DECAY],
            formula: "c/c0 = 1/2 * (exp((v - u) * x / (2 * D)) * erfc((R * x - u * t) / (2 * sqrt(D * R * t))) + exp((v + u) * x / (2 * D)) * erfc((R * x + u * t) / (2 * sqrt(D * R * t)))), u = sqrt(v^2 + 4 * lambda * R * D)",
            example: "ogata_banks_decay(20 m, 1 yr, 0.1 m/d, 2e-5 m^2/s, 1.5, 0.1 1/yr)",
            body: ogata_banks_decay,
        }],
    },
];

fn retardation_factor(values: &[f64]) -> Result<f64, CallError> {
    let [bulk_density, distribution_coefficient, porosity] = arguments(values);
    Ok(1.0 + bulk_density * distribution_coefficient / porosity)
}

fn retarded_velocity(values: &[f64]) -> Result<f64, CallError> {
    let [velocity, retardation] = arguments(values);
    Ok(velocity / retardation)
}

/// Mechanical dispersion grows with the speed, not its direction: |v|.
fn dispersion_coefficient(values: &[f64]) -> Result<f64, CallError> {
    let [dispersivity, velocity, pore_diffusion] = arguments(values);
    Ok(dispersivity * velocity.abs() + pore_diffusion)
}

fn peclet_number(values: &[f64]) -> Result<f64, CallError> {
    let [velocity, length, dispersion] = arguments(values);
    Ok(velocity * length / dispersion)
}

fn ogata_banks(values: &[f64]) -> Result<f64, CallError> {
    let [position, time, velocity, dispersion, retardation] = arguments(values);
    Ok(advection_dispersion(
        position,
        time,
        velocity,
        dispersion,
        retardation,
        0.0,
    ))
}

fn ogata_banks_decay(values: &[f64]) -> Result<f64, CallError> {
    let [position, time, velocity, dispersion, retardation, decay] = arguments(values);
    Ok(advection_dispersion(
        position,
        time,
        velocity,
        dispersion,
        retardation,
        decay * retardation,
    ))
}

/// c/c0 for R ∂c/∂t = D ∂²c/∂x² − v ∂c/∂x − μ c on x ≥ 0, c(0, t) = c0, c(x, 0) = 0, with
/// u = √(v² + 4 μ D) (van Genuchten & Alves 1982; μ = 0 is Ogata–Banks with retardation):
///
/// c/c0 = ½ e^((v−u)x/2D) erfc(a) + ½ e^((v+u)x/2D) erfc(b),
/// a = (R x − u t)/(2√(D R t)), b = (R x + u t)/(2√(D R t)).
///
/// Since b² − a² = u x / D, the second term is ½ e^((v−u)x/2D − a²) erfcx(b): both exponents
/// are zero or below (u ≥ |v|), so nothing overflows at any Péclet number.
pub fn advection_dispersion(
    position: f64,
    time: f64,
    velocity: f64,
    dispersion: f64,
    retardation: f64,
    decay: f64,
) -> f64 {
    let u = (velocity * velocity + 4.0 * decay * dispersion).sqrt();
    let spread = 2.0 * (dispersion * retardation * time).sqrt();
    let a = (retardation * position - u * time) / spread;
    let b = (retardation * position + u * time) / spread;
    let attenuation = (velocity - u) * position / (2.0 * dispersion);
    let ahead = attenuation.exp() * libm::erfc(a);
    let behind = (attenuation - a * a).exp() * scaled_erfc(b);
    0.5 * (ahead + behind)
}

/// Below this argument erfcx(x) = exp(x²) erfc(x) is computed directly: erfc(6) ≈ 2e-17 is far
/// from underflow and exp(36) from overflow, and libm's erfc keeps its relative accuracy there.
const SCALED_ERFC_DIRECT_LIMIT: f64 = 6.0;
/// Terms of the continued fraction; at x ≥ 6 it has converged to double precision long before.
const SCALED_ERFC_TERMS: usize = 60;

/// The scaled complementary error function erfcx(x) = exp(x²) erfc(x) for x ≥ 0 (for x < 0
/// the direct product, finite while x² stays below about 700).
///
/// At and above 6 it is Laplace's continued fraction (Abramowitz & Stegun 1964, eq. 7.1.14),
/// erfcx(x) = (1/√π) / (x + (1/2)/(x + 1/(x + (3/2)/(x + 2/(x + …))))), summed from the back.
pub fn scaled_erfc(x: f64) -> f64 {
    if x < SCALED_ERFC_DIRECT_LIMIT {
        return (x * x).exp() * libm::erfc(x);
    }
    let mut tail = x;
    for k in (1..=SCALED_ERFC_TERMS).rev() {
        tail = x + (k as f64 / 2.0) / tail;
    }
    1.0 / (std::f64::consts::PI.sqrt() * tail)
}

#[cfg(test)]
mod tests {
    //! Reference cases through `library::testing::check`, naming the source of each value, and
    //! the numerics checked against independent computations.

    use super::{advection_dispersion, scaled_erfc};
    use crate::library::dimensions::*;
    use crate::library::testing::*;

    const YEAR: f64 = 365.25 * DAY;

    #[test]
    fn retardation_and_dispersion_match_hand_arithmetic() {
        // Freeze & Cherry (1979) eq. 9.14 by hand: 1 + 1800 kg/m^3 * 0.5e-3 m^3/kg / 0.35.
        check(
            "retardation_factor",
            &[
                si(1800.0, DENSITY),
                si(0.5e-3, VOLUME_PER_MASS),
                number(0.35),
            ],
            Expected::Value(1.0 + 0.9 / 0.35, DIMENSIONLESS, 1e-14),
            "Freeze & Cherry 1979 eq. 9.14, hand arithmetic",
        );
        // A non-sorbing solute (Kd = 0) is not retarded: R = 1 exactly.
        check(
            "retardation_factor",
            &[si(1800.0, DENSITY), si(0.0, VOLUME_PER_MASS), number(0.35)],
            Expected::Value(1.0, DIMENSIONLESS, 0.0),
            "Kd = 0",
        );
        check(
            "retarded_velocity",
            &[si(0.3 / DAY, VELOCITY), number(3.0)],
            Expected::Value(0.1 / DAY, VELOCITY, 1e-14),
            "v / R by hand",
        );
        check(
            "dispersion_coefficient",
            &[
                si(0.5, LENGTH),
                si(-2e-6, VELOCITY),
                si(1e-9, AREA_PER_TIME),
            ],
            Expected::Value(1.001e-6, AREA_PER_TIME, 1e-13),
            "alpha |v| + De by hand, flow towards the source",
        );
        check(
            "peclet_number",
            &[si(2e-6, VELOCITY), si(3.0, LENGTH), si(1e-6, AREA_PER_TIME)],
            Expected::Value(6.0, DIMENSIONLESS, 1e-14),
            "v L / D by hand",
        );
    }

    /// The Ogata–Banks form evaluated directly, as published; finite while exp(v x / D) is.
    fn ogata_banks_direct(x: f64, t: f64, v: f64, d: f64, r: f64) -> f64 {
        let spread = 2.0 * (d * r * t).sqrt();
        0.5 * (libm::erfc((r * x - v * t) / spread)
            + (v * x / d).exp() * libm::erfc((r * x + v * t) / spread))
    }

    /// The solution by numerical inversion-free means: c(x, t) = ∫₀ᵗ of the flux-weighted
    /// first-passage density of a point at x, here the Laplace-free form
    /// c/c0 = ∫₀ᵗ x/(2√(π D' τ³)) exp(−(x − v' τ)²/(4 D' τ)) dτ with D' = D/R, v' = v/R,
    /// integrated by Simpson's rule in the variable s = 1/√τ.
    fn ogata_banks_by_quadrature(x: f64, t: f64, v: f64, d: f64, r: f64) -> f64 {
        let (d, v) = (d / r, v / r);
        // τ = 1/s², dτ = −2/s³ ds; the integrand in s is x/√(π D) exp(−(x − v/s²)² s²/(4 D)).
        let density = |s: f64| {
            let tau = 1.0 / (s * s);
            x / (std::f64::consts::PI * d).sqrt() * (-(x - v * tau).powi(2) / (4.0 * d * tau)).exp()
        };
        let (low, high) = (1.0 / t.sqrt(), 1.0 / t.sqrt() + 40.0 * d.sqrt() / x);
        let steps = 200_000;
        let width = (high - low) / steps as f64;
        let mut sum = density(low) + density(high);
        for step in 1..steps {
            let weight = if step % 2 == 1 { 4.0 } else { 2.0 };
            sum += weight * density(low + step as f64 * width);
        }
        sum * width / 3.0
    }

    #[test]
    fn ogata_banks_matches_the_direct_form_and_an_independent_quadrature() {
        // Moderate Peclet numbers, where the published form is finite.
        let cases = [
            (20.0, YEAR, 0.1 / DAY, 2e-5, 1.5),
            (5.0, 30.0 * DAY, 0.2 / DAY, 1e-5, 1.0),
            (1.0, 10.0 * YEAR, 1e-9, 6e-10, 2.0),
            (0.5, 3.0 * YEAR, 0.0, 1e-9, 1.0),
        ];
        for (x, t, v, d, r) in cases {
            let direct = ogata_banks_direct(x, t, v, d, r);
            let quadrature = ogata_banks_by_quadrature(x, t, v, d, r);
            check(
                "ogata_banks",
                &[
                    si(x, LENGTH),
                    si(t, TIME),
                    si(v, VELOCITY),
                    si(d, AREA_PER_TIME),
                    number(r),
                ],
                Expected::Value(direct, DIMENSIONLESS, 1e-12),
                "the published form evaluated directly",
            );
            let stable = advection_dispersion(x, t, v, d, r, 0.0);
            assert!(
                (stable - quadrature).abs() < 1e-7,
                "x {x}: {stable} vs quadrature {quadrature}"
            );
        }
    }

    #[test]
    fn ogata_banks_is_stable_at_large_peclet_numbers() {
        // Where both are finite the stable and direct forms agree (v x / D up to 700).
        for peclet in [50.0, 200.0, 500.0, 700.0] {
            let (x, d) = (10.0, 1e-6);
            let v = peclet * d / x;
            for fraction in [0.8, 0.95, 1.0, 1.05, 1.3] {
                let t = fraction * x / v;
                let stable = advection_dispersion(x, t, v, d, 1.0, 0.0);
                let direct = ogata_banks_direct(x, t, v, d, 1.0);
                assert!(
                    (stable - direct).abs() <= 1e-12 * direct.abs().max(1e-300),
                    "Pe {peclet}, t/t_adv {fraction}: {stable} vs {direct}"
                );
            }
        }
        // Beyond that the direct form is inf * 0; the stable one stays in [0, 1] and tends to
        // ½ erfc of the first argument, its Pe -> infinity limit (Ogata & Banks 1961).
        for peclet in [1e3, 1e5, 1e8] {
            let (x, d) = (10.0, 1e-6);
            let v = peclet * d / x;
            assert!(ogata_banks_direct(x, x / v, v, d, 1.0).is_nan());
            for fraction in [0.9, 1.0, 1.1] {
                let t = fraction * x / v;
                let stable = advection_dispersion(x, t, v, d, 1.0, 0.0);
                let first = 0.5 * libm::erfc((x - v * t) / (2.0 * (d * t).sqrt()));
                assert!((0.0..=1.0).contains(&stable), "{stable}");
                assert!(
                    (stable - first).abs() < 2.0 / peclet.sqrt(),
                    "{stable} vs {first}"
                );
            }
        }
    }

    #[test]
    fn the_front_passes_at_the_retarded_advective_time() {
        // At x = v t / R the first term is erfc(0) = 1, so c/c0 is a little above one half
        // (Ogata & Banks 1961): ½ (1 + e^Pe erfc(√Pe)) with Pe = v x / D, evaluated here with
        // the asymptotic series of Abramowitz & Stegun (1964) eq. 7.1.23 at Pe = 400.
        let (x, d, r) = (4.0, 1e-8, 2.0);
        let v = 400.0 * d / x;
        let t = r * x / v;
        let b = (400.0f64).sqrt();
        // erfcx(20) from the leading terms of A&S 7.1.23: (1/(√π b)) (1 − 1/(2b²) + 3/(4b⁴)).
        let erfcx_20 = (1.0 - 1.0 / (2.0 * b * b) + 3.0 / (4.0 * b.powi(4)))
            / (std::f64::consts::PI.sqrt() * b);
        check(
            "ogata_banks",
            &[
                si(x, LENGTH),
                si(t, TIME),
                si(v, VELOCITY),
                si(d, AREA_PER_TIME),
                number(r),
            ],
            Expected::Value(0.5 * (1.0 + erfcx_20), DIMENSIONLESS, 1e-7),
            "A&S 7.1.23 asymptotic series, three terms",
        );
    }

    #[test]
    fn scaled_erfc_agrees_with_the_direct_product_and_published_values() {
        for x in [6.0_f64, 7.5, 10.0, 15.0, 20.0, 25.0] {
            let direct = (x * x).exp() * libm::erfc(x);
            let scaled = scaled_erfc(x);
            assert!(
                ((scaled - direct) / direct).abs() < 1e-13,
                "{x}: {scaled} vs {direct}"
            );
        }
        // Continuity across the hand-over point.
        let below = scaled_erfc(6.0 - 1e-12);
        let above = scaled_erfc(6.0);
        assert!(((below - above) / above).abs() < 1e-12);
        // erfc(1) = 1 - 0.8427007929 (Abramowitz & Stegun 1964, table 7.1, erf(1)).
        assert!((scaled_erfc(1.0) / 1f64.exp() - (1.0 - 0.842_700_792_9)).abs() < 1e-10);
        // Large x: 1/(x √π) (1 - 1/(2x²)), A&S 7.1.23, to its next term's size.
        let x = 1e4;
        let leading = (1.0 - 0.5 / (x * x)) / (x * std::f64::consts::PI.sqrt());
        assert!(((scaled_erfc(x) - leading) / leading).abs() < 1e-15);
    }

    #[test]
    fn decay_reduces_to_ogata_banks_and_solves_its_equation() {
        let (x, t, v, d, r) = (20.0, YEAR, 0.1 / DAY, 2e-5, 1.5);
        // lambda = 0 is the Ogata-Banks solution with retardation.
        check(
            "ogata_banks_decay",
            &[
                si(x, LENGTH),
                si(t, TIME),
                si(v, VELOCITY),
                si(d, AREA_PER_TIME),
                number(r),
                si(0.0, PER_TIME),
            ],
            Expected::Value(ogata_banks_direct(x, t, v, d, r), DIMENSIONLESS, 1e-12),
            "lambda = 0",
        );
        // Long after the front passed, the steady profile with decay:
        // c/c0 = exp((v - sqrt(v^2 + 4 lambda R D)) x / (2 D)) (van Genuchten & Alves 1982).
        let lambda = 0.1 / YEAR;
        let u = (v * v + 4.0 * lambda * r * d).sqrt();
        check(
            "ogata_banks_decay",
            &[
                si(x, LENGTH),
                si(100.0 * YEAR, TIME),
                si(v, VELOCITY),
                si(d, AREA_PER_TIME),
                number(r),
                si(lambda, PER_TIME),
            ],
            Expected::Value(((v - u) * x / (2.0 * d)).exp(), DIMENSIONLESS, 1e-12),
            "steady state with decay",
        );
        // The PDE R c_t = D c_xx - v c_x - lambda R c by central differences, independent of
        // how the closed form was derived.
        let c = |x: f64, t: f64| advection_dispersion(x, t, v, d, r, lambda * r);
        let (h, k) = (0.01, 600.0);
        let c_t = (c(x, t + k) - c(x, t - k)) / (2.0 * k);
        let c_x = (c(x + h, t) - c(x - h, t)) / (2.0 * h);
        let c_xx = (c(x + h, t) - 2.0 * c(x, t) + c(x - h, t)) / (h * h);
        let residual = r * c_t - (d * c_xx - v * c_x - lambda * r * c(x, t));
        assert!(
            residual.abs() < 1e-6 * (v * c_x).abs(),
            "residual {residual}"
        );
        // And the boundary: c(0, t) = c0.
        assert!((c(0.0, t) - 1.0).abs() < 1e-15);
    }
}
