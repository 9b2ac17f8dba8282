//! Liners: leakage through a saturated mineral liner under a ponded head.

use super::dimensions::{LENGTH, VELOCITY};
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
pub static RELATIONS: &[Relation] = &[Relation {
    name: "liner_leakage",
    summary: "leakage flux through a saturated liner q = K (h + t) / t (m/s, volume per area and \
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
        example: "liner_leakage(1e-9 m/s, 0.3 m, 0.9 m)",
        body: liner_leakage,
    }],
}];

/// q = K (h + t) / t (m/s, i.e. m³ per m² and second). Steady one-dimensional downward flow
/// through an intact, fully saturated liner of thickness t; a head h ponded on top; free
/// drainage below, so the pressure head at the base is zero and the gradient is (h + t)/t.
/// Suction below the liner and defects are not modelled.
fn liner_leakage(values: &[f64]) -> Result<f64, CallError> {
    let [conductivity, head, thickness] = arguments(values);
    Ok(conductivity * (head + thickness) / thickness)
}
