//! Layered media: the effective coefficient of a stack of layers for flow along them (a
//! thickness-weighted mean) and across them (a thickness-weighted harmonic mean). It holds for
//! any of the four transport coefficients, since Darcy, Fick, Fourier and Ohm share one form.
//! The functions take whole columns (coefficients and thicknesses), so they are `Builtin`s of
//! whole columns rather than relations of single values.

use super::columns::{count_error, not_columns, numeric_error, rows, scalar, Rows};
use super::Builtin;
use crate::eval::function::CallError;
use crate::eval::{Formulation, Provenance, TemperatureKind, Value};
use crate::numeric::{
    check_value, clamp_between, compensated_sum, require_rows, require_same_length, value_range,
    Allowed, ColumnError, CompensatedSum,
};
use crate::units::Dimension;

// Section and equation numbers of Freeze & Cherry are from memory, as in `numeric`.

/// Layers in parallel: the same gradient in every layer, the fluxes add. Holds for any of the
/// four transport coefficients, since Darcy, Fick, Fourier and Ohm share one form.
pub static LAYERED_ALONG: Formulation = Formulation {
    id: "layered-along",
    title: "effective coefficient for flow along layers, K = sum(K_i b_i) / sum(b_i)",
    citation: "Freeze, R. A. and Cherry, J. A., 1979, Groundwater, Prentice-Hall, Englewood \
Cliffs NJ, section 2.4, eq. 2.31",
    validity: "steady flow parallel to the layers, each layer homogeneous; coefficients \
K_i >= 0, thicknesses b_i > 0",
    ranges: &[],
};

/// Layers in series: the same flux through every layer, the potential drops add.
pub static LAYERED_ACROSS: Formulation = Formulation {
    id: "layered-across",
    title: "effective coefficient for flow across layers, K = sum(b_i) / sum(b_i / K_i)",
    citation: "Freeze, R. A. and Cherry, J. A., 1979, Groundwater, Prentice-Hall, Englewood \
Cliffs NJ, section 2.4, eq. 2.32",
    validity: "steady flow perpendicular to the layers, each layer homogeneous; coefficients \
K_i > 0, thicknesses b_i > 0",
    ranges: &[],
};

pub static FUNCTIONS: &[(&str, Builtin)] = &[
    ("layered_along", Builtin::on_columns("layered_along(coefficient, thickness)", "effective coefficient for flow along layers: sum(K b) / sum(b) (Freeze & Cherry 1979, eq. 2.31)", not_columns, layered_along).citing(&[&LAYERED_ALONG])),
    ("layered_across", Builtin::on_columns("layered_across(coefficient, thickness)", "effective coefficient for flow across layers: sum(b) / sum(b / K) (Freeze & Cherry 1979, eq. 2.32)", not_columns, layered_across).citing(&[&LAYERED_ACROSS])),
];

/// The coefficient and thickness columns of a layered medium.
fn layers(arguments: &[Value]) -> Result<(Rows<'_>, Rows<'_>), CallError> {
    let [coefficient, thickness] = arguments else {
        return Err(count_error(arguments.len(), "2 (coefficient, thickness)"));
    };
    let (coefficient, thickness) = (rows(coefficient, 0)?, rows(thickness, 1)?);
    if thickness.dimension != Dimension::LENGTH {
        return Err(CallError::WrongDimension {
            argument: 1,
            parameter: "thickness",
            expected: Dimension::LENGTH,
            found: thickness.dimension,
        });
    }
    Ok((coefficient, thickness))
}

/// An effective coefficient of layers: the coefficient's dimension, no temperature kind. The
/// formulation is recorded once the layers are accepted.
fn layered(
    arguments: &[Value],
    mean: fn(&[f64], &[f64]) -> Result<f64, ColumnError>,
    formulation: &'static Formulation,
    provenance: &mut Provenance,
) -> Option<Result<Value, CallError>> {
    Some(layers(arguments).and_then(|(coefficient, thickness)| {
        let value = mean(coefficient.values, thickness.values).map_err(numeric_error(0))?;
        provenance.record(formulation);
        Ok(scalar(
            value,
            coefficient.dimension,
            TemperatureKind::Unspecified,
        ))
    }))
}

fn layered_along(
    arguments: &[Value],
    provenance: &mut Provenance,
) -> Option<Result<Value, CallError>> {
    layered(arguments, effective_along, &LAYERED_ALONG, provenance)
}

fn layered_across(
    arguments: &[Value],
    provenance: &mut Provenance,
) -> Option<Result<Value, CallError>> {
    layered(arguments, effective_across, &LAYERED_ACROSS, provenance)
}

// ---------------------------------------------------------------------------
// Layered media
// ---------------------------------------------------------------------------

const COEFFICIENT: &str = "coefficient";
const THICKNESS: &str = "thickness";

/// Checks a layer table: same length, at least one layer, finite values,
/// thickness > 0 and coefficient within `coefficient_allowed`.
fn check_layers(
    coefficient: &[f64],
    thickness: &[f64],
    coefficient_allowed: (Allowed, &'static str),
) -> Result<(), ColumnError> {
    require_rows(COEFFICIENT, coefficient, 1)?;
    require_same_length(COEFFICIENT, coefficient, THICKNESS, thickness)?;
    for (index, (&layer_coefficient, &layer_thickness)) in
        coefficient.iter().zip(thickness).enumerate()
    {
        let row = Some(index + 1);
        check_value(
            COEFFICIENT,
            row,
            layer_coefficient,
            Some(coefficient_allowed),
        )?;
        check_value(
            THICKNESS,
            row,
            layer_thickness,
            Some((Allowed::Positive, "every layer needs a positive thickness")),
        )?;
    }
    Ok(())
}

/// Compensated sum of terms that are each exact to one rounding: `None` if a
/// term or the total overflowed, or a nonzero term lost precision by
/// underflowing (the flag marks a term whose zero is genuine).
fn reliable_sum(terms: impl Iterator<Item = (f64, bool)>) -> Option<f64> {
    let mut total = CompensatedSum::default();
    for (term, genuine_zero) in terms {
        if !(term.is_normal() || (term == 0.0 && genuine_zero)) {
            return None;
        }
        total.add(term);
    }
    Some(total.total()).filter(|sum| sum.is_finite())
}

/// ln Σ e^(l_i), shifted by the largest l so that no exponential overflows;
/// -inf entries (ln 0) contribute nothing.
fn log_sum_exp(logs: impl Iterator<Item = f64> + Clone) -> f64 {
    let largest = logs.clone().fold(f64::NEG_INFINITY, f64::max);
    if largest == f64::NEG_INFINITY {
        return largest;
    }
    largest + compensated_sum(logs.map(|log| (log - largest).exp())).ln()
}

/// Effective coefficient for flow parallel to the layers: the
/// thickness-weighted arithmetic mean K = Σ K_i b_i / Σ b_i.
///
/// All layers see the same gradient and their fluxes add (layers in
/// parallel). Freeze & Cherry (1979), "Groundwater", section 2.4, eq. 2.31
/// (section and equation number from memory); the same result is derived in
/// Todd & Mays (2005), "Groundwater Hydrology", and Fetter (2001), "Applied
/// Hydrogeology" (from memory). Because Darcy, Fick, Fourier and Ohm share
/// the form flux = −coefficient · gradient, it holds for hydraulic, diffusive,
/// thermal and electrical conductivity alike. Coefficients must be >= 0,
/// thicknesses > 0.
pub fn effective_along(coefficient: &[f64], thickness: &[f64]) -> Result<f64, ColumnError> {
    check_layers(
        coefficient,
        thickness,
        (
            Allowed::NonNegative,
            "a transport coefficient cannot be negative",
        ),
    )?;
    let (low, high) = value_range(coefficient);
    let layers = coefficient.iter().zip(thickness);
    let direct = reliable_sum(layers.clone().map(|(&k, &b)| (k * b, k == 0.0)))
        .zip(reliable_sum(thickness.iter().map(|&b| (b, false))))
        .map(|(flow, total_thickness)| flow / total_thickness);
    let along = direct.unwrap_or_else(|| {
        // Only for values beyond about 1e±150: the same ratio in logarithms.
        (log_sum_exp(layers.map(|(k, b)| k.ln() + b.ln()))
            - log_sum_exp(thickness.iter().map(|b| b.ln())))
        .exp()
    });
    Ok(clamp_between(along, low, high))
}

/// Effective coefficient for flow perpendicular to the layers: the
/// thickness-weighted harmonic mean K = Σ b_i / Σ (b_i / K_i).
///
/// The flux is the same through every layer and the potential drops add
/// (layers in series, like resistors). Freeze & Cherry (1979),
/// "Groundwater", section 2.4, eq. 2.32 (from memory); also Todd & Mays
/// (2005) and Fetter (2001) (from memory). Coefficients must be > 0: a layer
/// with zero coefficient stops all flow across the stack. Thicknesses > 0.
pub fn effective_across(coefficient: &[f64], thickness: &[f64]) -> Result<f64, ColumnError> {
    check_layers(
        coefficient,
        thickness,
        (
            Allowed::Positive,
            "a layer with zero coefficient blocks all flow across the layers",
        ),
    )?;
    let (low, high) = value_range(coefficient);
    let layers = coefficient.iter().zip(thickness);
    let direct = reliable_sum(thickness.iter().map(|&b| (b, false)))
        .zip(reliable_sum(layers.clone().map(|(&k, &b)| (b / k, false))))
        .map(|(total_thickness, resistance)| total_thickness / resistance);
    let across = direct.unwrap_or_else(|| {
        // Only for values beyond about 1e±150: the same ratio in logarithms.
        (log_sum_exp(thickness.iter().map(|b| b.ln()))
            - log_sum_exp(layers.map(|(k, b)| b.ln() - k.ln())))
        .exp()
    });
    Ok(clamp_between(across, low, high))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::numeric::test_support::*;

    // ----- layered media -----

    #[test]
    fn two_layer_textbook_exercise() {
        // Problem stated in The Groundwater Project, "Introduction to Karst
        // Aquifers", Exercise 5 (formulas after Bouwer 1978): two layers, each
        // 10 m thick, K = 1000 m/d and 1 m/d. The expected values are our own
        // arithmetic (the book's solution was not consulted):
        // along = (1000·10 + 1·10) / 20 = 500.5 m/d;
        // across = 20 / (10/1000 + 10/1) = 20 / 10.01 = 1.998001998... m/d.
        let coefficient = [1000.0, 1.0];
        let thickness = [10.0, 10.0];
        assert!(close(
            effective_along(&coefficient, &thickness).unwrap(),
            500.5,
            1e-15
        ));
        assert!(close(
            effective_across(&coefficient, &thickness).unwrap(),
            20.0 / 10.01,
            1e-15
        ));
    }

    #[test]
    fn three_layer_hand_example() {
        // K = 10, 0.1, 1 m/d; b = 2, 1, 5 m; total 8 m (hand computation):
        // along = (10·2 + 0.1·1 + 1·5) / 8 = 25.1 / 8 = 3.1375 m/d;
        // across = 8 / (2/10 + 1/0.1 + 5/1) = 8 / 15.2 = 10/19 m/d.
        let coefficient = [10.0, 0.1, 1.0];
        let thickness = [2.0, 1.0, 5.0];
        assert!(close(
            effective_along(&coefficient, &thickness).unwrap(),
            3.1375,
            1e-15
        ));
        assert!(close(
            effective_across(&coefficient, &thickness).unwrap(),
            10.0 / 19.0,
            1e-15
        ));
    }

    #[test]
    fn equal_layers_give_their_own_value() {
        let coefficient = [2.5e-5; 4];
        let thickness = [0.3, 7.0, 1.1, 12.0];
        assert_eq!(effective_along(&coefficient, &thickness), Ok(2.5e-5));
        assert_eq!(effective_across(&coefficient, &thickness), Ok(2.5e-5));
    }

    #[test]
    fn along_is_never_below_across() {
        // Weighted AM >= weighted HM (Hardy, Littlewood & Pólya, from memory).
        let mut random = Lcg(42);
        for _ in 0..500 {
            let layers = 1 + (random.next() * 8.0) as usize;
            let coefficient: Vec<f64> = (0..layers)
                .map(|_| 10f64.powf(-12.0 + 10.0 * random.next()))
                .collect();
            let thickness: Vec<f64> = (0..layers).map(|_| 0.01 + 50.0 * random.next()).collect();
            let along = effective_along(&coefficient, &thickness).unwrap();
            let across = effective_across(&coefficient, &thickness).unwrap();
            assert!(along >= across, "{coefficient:?} {thickness:?}");
        }
    }

    #[test]
    fn one_tight_layer_dominates_flow_across() {
        // Two 10 m sands (1e-4 m/s) and a 0.1 m clay (1e-11 m/s). Closed form:
        // across = 20.1 / (1e5 + 1e5 + 1e10) ≈ 2.00996e-9 m/s, close to the
        // clay-only estimate 1e-11 · 20.1 / 0.1 = 2.01e-9; along stays near
        // the sands' 1e-4 · 20 / 20.1.
        let coefficient = [1e-4, 1e-4, 1e-11];
        let thickness = [10.0, 10.0, 0.1];
        let across = effective_across(&coefficient, &thickness).unwrap();
        let along = effective_along(&coefficient, &thickness).unwrap();
        assert!(close(across, 20.1 / (1e5 + 1e5 + 1e10), 1e-14));
        assert!(close(across, 2.01e-9, 1e-4));
        assert!(close(along, 1e-4 * 20.0 / 20.1, 1e-6));
    }

    #[test]
    fn layer_inputs_are_validated() {
        assert_eq!(
            effective_along(&[1.0, 2.0, 3.0], &[1.0, 2.0]),
            Err(ColumnError::LengthMismatch {
                first: "coefficient",
                first_rows: 3,
                second: "thickness",
                second_rows: 2,
            })
        );
        assert_eq!(
            effective_across(&[], &[]),
            Err(ColumnError::Empty {
                argument: "coefficient"
            })
        );
        let zero_thickness = effective_along(&[1.0, 2.0], &[1.0, 0.0]).unwrap_err();
        assert_eq!(
            zero_thickness.to_string(),
            "row 2 of `thickness` is 0.0, but it must be greater than 0 \
             (every layer needs a positive thickness)"
        );
        // A zero coefficient is fine along the layers, fatal across them.
        assert_eq!(effective_along(&[0.0, 2.0], &[1.0, 1.0]), Ok(1.0));
        assert!(matches!(
            effective_across(&[0.0, 2.0], &[1.0, 1.0]),
            Err(ColumnError::OutOfRange {
                argument: "coefficient",
                row: Some(1),
                allowed: Allowed::Positive,
                ..
            })
        ));
        assert!(matches!(
            effective_along(&[1.0, -2.0], &[1.0, 1.0]),
            Err(ColumnError::OutOfRange {
                row: Some(2),
                allowed: Allowed::NonNegative,
                ..
            })
        ));
        assert!(matches!(
            effective_across(&[1.0, 2.0], &[1.0, f64::NAN]),
            Err(ColumnError::NotFinite {
                argument: "thickness",
                row: Some(2),
                ..
            })
        ));
    }

    #[test]
    fn extreme_layer_values_stay_accurate() {
        // Closed forms. K·b overflows: along = (MAX·MAX + MAX/2·MAX) / 2MAX.
        let along = effective_along(&[f64::MAX, f64::MAX / 2.0], &[f64::MAX, f64::MAX]).unwrap();
        assert!(close(along, 0.75 * f64::MAX, 1e-12), "{along}");
        // K·b underflows: along = (1e-200 + 3e-200)·1e-200 / 2e-200 = 2e-200.
        let along = effective_along(&[1e-200, 3e-200], &[1e-200, 1e-200]).unwrap();
        assert!(close(along, 2e-200, 1e-12), "{along}");
        // b/K overflows: across = 2e200 / (1e400 + 0.25e400) = 1.6e-200.
        let across = effective_across(&[1e-200, 4e-200], &[1e200, 1e200]).unwrap();
        assert!(close(across, 1.6e-200, 1e-12), "{across}");
        // Direct path: Σb / Σ(b/K) = (1e300 + 1e-300) / (1 + 1) = 5e299.
        let across = effective_across(&[1e-300, 1e300], &[1e-300, 1e300]).unwrap();
        assert!(close(across, 5e299, 1e-15), "{across}");
    }

    #[test]
    fn awkward_inputs_give_values_or_errors() {
        // Never a panic or a NaN on any mix of special values.
        const SPECIAL: [f64; 9] = [
            0.0,
            -1.0,
            f64::MAX,
            f64::MIN_POSITIVE,
            5e-324,
            f64::NAN,
            f64::INFINITY,
            f64::NEG_INFINITY,
            1e-300,
        ];
        let mut random = Lcg(3);
        let mut pick = || SPECIAL[(random.next() * SPECIAL.len() as f64) as usize];
        for _ in 0..3000 {
            let rows = (random_rows(pick())) + 1;
            let a: Vec<f64> = (0..rows).map(|_| pick()).collect();
            let b: Vec<f64> = (0..rows).map(|_| pick()).collect();
            for value in [effective_along(&a, &b), effective_across(&a, &b)]
                .into_iter()
                .flatten()
            {
                assert!(!value.is_nan(), "{a:?} {b:?}");
            }
        }
    }

    fn random_rows(value: f64) -> usize {
        value.abs().min(3.0) as usize
    }
}
