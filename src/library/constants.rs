//! Named constants. Values exact by definition (standard gravity; the 2019 SI defining
//! constants and the products of them) are composed in exact decimal before rounding once.

use crate::eval::{Constant, Quantity};
use crate::units::{Dimension, Factor};
use std::sync::OnceLock;

/// (name, exact definition, dimension L M T I Θ N J, display unit, summary, source)
type ConstantRow = (
    &'static str,
    &'static str,
    [i32; 7],
    &'static str,
    &'static str,
    &'static str,
);

const ROWS: &[ConstantRow] = &[
    (
        "pi",
        "3.141592653589793238462643383",
        [0; 7],
        "1",
        "the ratio of a circle's circumference to its diameter",
        "mathematics",
    ),
    (
        "g0",
        "9.80665",
        [1, 0, -2, 0, 0, 0, 0],
        "m/s^2",
        "standard acceleration of gravity (exact)",
        "CGPM 1901; NIST SP 811 (2008)",
    ),
    (
        "N_A",
        "6.02214076e23",
        [0, 0, 0, 0, 0, -1, 0],
        "1/mol",
        "Avogadro constant (exact)",
        "SI Brochure 9th ed. (2019), Table 1",
    ),
    (
        "k_B",
        "1.380649e-23",
        [2, 1, -2, 0, -1, 0, 0],
        "J/K",
        "Boltzmann constant (exact)",
        "SI Brochure 9th ed. (2019), Table 1",
    ),
    (
        "R",
        "6.02214076e23*1.380649e-23",
        [2, 1, -2, 0, -1, -1, 0],
        "J/(mol*K)",
        "molar gas constant N_A k_B (exact)",
        "SI Brochure 9th ed. (2019), Table 1 (product)",
    ),
    (
        "F",
        "6.02214076e23*1.602176634e-19",
        [0, 0, 1, 1, 0, -1, 0],
        "C/mol",
        "Faraday constant N_A e (exact)",
        "SI Brochure 9th ed. (2019), Table 1 (product)",
    ),
];

/// All constants, built once.
pub fn constants() -> &'static [Constant] {
    static CONSTANTS: OnceLock<Vec<Constant>> = OnceLock::new();
    CONSTANTS.get_or_init(|| {
        ROWS.iter()
            .map(
                |(name, definition, dimension, unit, summary, source)| Constant {
                    name,
                    // The rows are ours and tested; a row that fails to read would show as NaN there.
                    quantity: Quantity::new(
                        Factor::from_definition(definition)
                            .map_or(f64::NAN, |factor| factor.value()),
                        Dimension::from_integers(*dimension),
                    ),
                    unit,
                    summary,
                    source,
                },
            )
            .collect()
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn defined_constants_are_exact_products() {
        let value = |name: &str| {
            constants()
                .iter()
                .find(|constant| constant.name == name)
                .unwrap()
                .quantity
                .value
        };
        // Source: SI Brochure 9th ed. (2019) Table 1; R = N_A k_B = 8.314 462 618 153 24 J/(mol K).
        assert_eq!(value("R"), 8.31446261815324);
        // F = N_A e = 96 485.332 123 310 018 4 C/mol.
        assert_eq!(value("F"), "96485.3321233100184".parse::<f64>().unwrap());
        assert_eq!(value("g0"), 9.80665);
        assert_eq!(value("pi"), std::f64::consts::PI);
    }
}
