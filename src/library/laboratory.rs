//! Laboratory tests reduced to a permeability or a conductivity: the constant- and
//! falling-head permeameters, and Klinkenberg's correction of a gas permeability.

use super::dimensions::{AREA, LENGTH, PRESSURE, TIME, VELOCITY, VOLUME_FLOW_RATE};
use super::relation::{arguments, Domain, Form, Parameter, Relation};
use crate::eval::function::CallError;
use crate::eval::Formulation;

/// Klinkenberg's gas-slip correction.
pub static KLINKENBERG: Formulation = Formulation {
    id: "klinkenberg-1941",
    title: "Klinkenberg correction, k_liquid = k_gas / (1 + b / p_mean)",
    citation: "Klinkenberg, L. J., 1941, The permeability of porous media to liquids and gases, \
Drilling and Production Practice, American Petroleum Institute, 200-213",
    validity: "slip flow of one gas through a dry core; b fitted for the same gas and core from \
tests at several mean pressures; p_mean absolute",
    ranges: &[],
};
/// Constant-head permeameter reduction.
pub static CONSTANT_HEAD: Formulation = Formulation {
    id: "constant-head-permeameter",
    title: "constant-head permeameter, K = Q L / (A dh)",
    citation: "ASTM D2434, Standard Test Method for Permeability of Granular Soils (Constant \
Head), ASTM International; from Darcy's law",
    validity: "steady laminar flow through a saturated specimen; granular soils (ASTM D2434: \
not more than 10 % passing the 75 um sieve)",
    ranges: &[],
};
/// Falling-head (standpipe) permeameter reduction.
pub static FALLING_HEAD: Formulation = Formulation {
    id: "falling-head-permeameter",
    title: "falling-head permeameter, K = (a L / (A t)) ln(h1 / h2)",
    citation: "Darcy's law with continuity in the standpipe, as in e.g. Das, B. M., Principles \
of Geotechnical Engineering, Cengage Learning, chapter on permeability",
    validity: "saturated specimen, laminar flow, no volume change; h1 and h2 measured above the \
outflow (tailwater) level",
    ranges: &[],
};
const SPECIMEN_LENGTH: Parameter =
    Parameter::new("L", "the specimen length", LENGTH, Domain::Positive);
const SPECIMEN_AREA: Parameter =
    Parameter::new("A", "the specimen cross-section", AREA, Domain::Positive);

pub static RELATIONS: &[Relation] = &[
    Relation {
        name: "klinkenberg_liquid_permeability",
        summary:
            "equivalent liquid permeability k_l = k_gas / (1 + b / p_mean) (m^2); b Klinkenberg \
slip factor (pressure), p_mean absolute mean gas pressure; Klinkenberg 1941",
        forms: &[Form {
            parameters: &[
                Parameter::new("k_gas", "a gas permeability", AREA, Domain::NonNegative),
                Parameter::new("b", "the slip factor", PRESSURE, Domain::NonNegative),
                Parameter::new(
                    "p_mean",
                    "the absolute mean gas pressure",
                    PRESSURE,
                    Domain::Positive,
                ),
            ],
            result: AREA,
            unit: "mD",
            formulations: &[&KLINKENBERG],
            formula: "k_l = k_gas / (1 + b / p_mean)",
            example: "klinkenberg_liquid_permeability(12 mD, 0.8 bar, 3 bar)",
            body: klinkenberg,
        }],
    },
    Relation {
        name: "constant_head_conductivity",
        summary: "hydraulic conductivity K = Q L / (A dh) (m/s) from a constant-head test; Q flow \
rate, L specimen length, A specimen area, dh head loss across it; ASTM D2434",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "Q",
                    "the steady outflow rate",
                    VOLUME_FLOW_RATE,
                    Domain::NonNegative,
                ),
                SPECIMEN_LENGTH,
                SPECIMEN_AREA,
                Parameter::new(
                    "dh",
                    "the head loss across the specimen",
                    LENGTH,
                    Domain::Positive,
                ),
            ],
            result: VELOCITY,
            unit: "m/s",
            formulations: &[&CONSTANT_HEAD],
            formula: "K = Q * L / (A * dh)",
            example: "constant_head_conductivity(2 mL/s, 15 cm, 80 cm^2, 40 cm)",
            body: constant_head,
        }],
    },
    Relation {
        name: "falling_head_conductivity",
        summary: "hydraulic conductivity K = (a L / (A t)) ln(h1 / h2) (m/s) from a falling-head \
test; a standpipe area, L and A specimen length and area, h1 > h2 the heads at the start and \
after time t",
        forms: &[Form {
            parameters: &[
                Parameter::new("a", "the standpipe cross-section", AREA, Domain::Positive),
                SPECIMEN_LENGTH,
                SPECIMEN_AREA,
                Parameter::new("t", "the time between the readings", TIME, Domain::Positive),
                Parameter::new("h1", "the first head reading", LENGTH, Domain::Positive),
                Parameter::new("h2", "the second head reading", LENGTH, Domain::Positive),
            ],
            result: VELOCITY,
            unit: "m/s",
            formulations: &[&FALLING_HEAD],
            formula: "K = a * L / (A * t) * ln(h1 / h2)",
            example: "falling_head_conductivity(1 cm^2, 10 cm, 20 cm^2, 1 h, 60 cm, 50 cm)",
            body: falling_head,
        }],
    },
];

/// k_l = k_g / (1 + b / p̄); `p_mean` is absolute: gauge pressure would overstate the slip.
fn klinkenberg(values: &[f64]) -> Result<f64, CallError> {
    let [gas_permeability, slip_factor, mean_pressure] = arguments(values);
    Ok(gas_permeability / (1.0 + slip_factor / mean_pressure))
}

/// K = Q L / (A Δh); ASTM D2434.
fn constant_head(values: &[f64]) -> Result<f64, CallError> {
    let [flow, length, area, head_loss] = arguments(values);
    Ok(flow * length / (area * head_loss))
}

/// K = (a L / (A t)) ln(h1 / h2). The head must fall: h2 at or above h1 is a failed or
/// mislabelled reading.
fn falling_head(values: &[f64]) -> Result<f64, CallError> {
    let [standpipe_area, length, area, time, head_start, head_end] = arguments(values);
    if head_end >= head_start {
        return Err(CallError::Domain {
            argument: Some(5),
            message: "`h2` must be below `h1`: the head falls during a falling-head test"
                .to_string(),
        });
    }
    Ok(standpipe_area * length / (area * time) * (head_start / head_end).ln())
}

#[cfg(test)]
mod tests {
    //! Reference cases through `library::testing::check`. Each value names its source; "from
    //! memory" marks textbook examples recalled rather than re-read.

    use crate::library::dimensions::*;
    use crate::library::testing::*;

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
            &[si(0.2 * MM, LENGTH), si(100.0 / CM, PER_LENGTH_TIME)],
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
}
