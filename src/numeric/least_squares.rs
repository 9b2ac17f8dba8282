//! Nonlinear least squares over a few parameters: Levenberg–Marquardt from the
//! `levenberg-marquardt` crate (a port of MINPACK's lmder), with a forward-difference Jacobian,
//! parameters that start positive fitted as their logarithms (so they stay positive and a step
//! spans decades evenly), and the standard errors of the result from the Jacobian at the
//! optimum: Cov = s² (JᵀJ)⁻¹ with s² = SSR / (m − n).

use levenberg_marquardt::{LeastSquaresProblem, LevenbergMarquardt, TerminationReason};
use nalgebra::{storage::Owned, DMatrix, DVector, Dyn};

/// Relative step of the finite-difference Jacobian: about the square root of the rounding
/// level, the usual choice for forward differences.
const JACOBIAN_STEP: f64 = 1.5e-8;
/// A fit whose scaled normal matrix has a smallest eigenvalue below this (a condition number
/// above 1e12) cannot tell its parameters apart; common practice, no single source.
const IDENTIFIABLE_LIMIT: f64 = 1e-12;
/// Most model evaluations (residuals and Jacobian columns) before a fit gives up.
const PATIENCE: usize = 200;

/// What a fit found.
#[derive(Debug, Clone)]
pub struct Fitted {
    pub parameters: Vec<f64>,
    pub standard_errors: Vec<f64>,
    /// Half-widths of the 95 % intervals (Student's t on m − n degrees of freedom).
    pub half_widths: Vec<f64>,
    /// √(SSR / m), in the residuals' unit (their logarithm's for a fit in log space).
    pub rms: f64,
    /// The solver's evaluations of the residuals (its iterations, plus rejected steps).
    pub iterations: usize,
}

/// Why a fit gave no answer.
#[derive(Debug, Clone, PartialEq)]
pub enum FitError<E> {
    /// The model failed at some trial parameters.
    Model(E),
    /// Fewer observations than parameters plus one: no degrees of freedom for an error.
    TooFewObservations {
        observations: usize,
        parameters: usize,
    },
    /// An observation (or, in log space, a non-positive value) that cannot be fitted.
    BadObservation { row: usize, value: f64 },
    /// The residuals do not change with this parameter, or only together with others.
    NotIdentifiable { parameter: usize },
    /// The solver stopped without meeting its tolerances.
    NotConverged { reason: String, iterations: usize },
}

/// The trial model: the parameters in, one predicted value per observation out.
pub type Model<'m, E> = dyn FnMut(&[f64]) -> Result<Vec<f64>, E> + 'm;

struct Problem<'m, 'a, E> {
    model: &'m mut Model<'a, E>,
    observed: &'m [f64],
    logarithmic: bool,
    /// Which parameters are fitted as their logarithms.
    as_logarithm: Vec<bool>,
    failure: Option<FitError<E>>,
}

impl<E> Problem<'_, '_, E> {
    fn untransform(&self, transformed: &DVector<f64>) -> Vec<f64> {
        transformed
            .iter()
            .zip(&self.as_logarithm)
            .map(|(&value, &log)| if log { value.exp() } else { value })
            .collect()
    }

    fn evaluate(&mut self, transformed: &DVector<f64>) -> Option<DVector<f64>> {
        let parameters = self.untransform(transformed);
        let predicted = match (self.model)(&parameters) {
            Ok(values) => values,
            Err(error) => {
                self.failure.get_or_insert(FitError::Model(error));
                return None;
            }
        };
        if predicted.len() != self.observed.len() {
            return None;
        }
        let residuals = predicted.iter().zip(self.observed).map(|(&p, &o)| {
            if self.logarithmic {
                // A model at or below zero has no logarithm: far from any observation.
                if p > 0.0 {
                    p.ln() - o.ln()
                } else {
                    f64::NAN
                }
            } else {
                p - o
            }
        });
        Some(DVector::from_iterator(self.observed.len(), residuals))
    }
}

/// Forward differences of the residuals in the transformed parameters.
fn jacobian_at<E>(problem: &mut Problem<'_, '_, E>, base: &DVector<f64>) -> Option<DMatrix<f64>> {
    let at = problem.evaluate(base)?;
    let mut jacobian = DMatrix::zeros(at.len(), base.len());
    for column in 0..base.len() {
        let mut shifted = base.clone();
        let step = JACOBIAN_STEP * base[column].abs().max(1.0);
        shifted[column] += step;
        let moved = problem.evaluate(&shifted)?;
        jacobian.set_column(column, &((moved - &at) / step));
    }
    Some(jacobian)
}

/// The problem as the crate sees it: residuals and a Jacobian computed on demand.
struct Solver<'p, 'm, 'a, E> {
    problem: std::cell::RefCell<&'p mut Problem<'m, 'a, E>>,
    current: DVector<f64>,
    residuals: Option<DVector<f64>>,
}

impl<E> LeastSquaresProblem<f64, Dyn, Dyn> for Solver<'_, '_, '_, E> {
    type ResidualStorage = Owned<f64, Dyn>;
    type JacobianStorage = Owned<f64, Dyn, Dyn>;
    type ParameterStorage = Owned<f64, Dyn>;

    fn set_params(&mut self, x: &DVector<f64>) {
        self.current.copy_from(x);
        self.residuals = self.problem.borrow_mut().evaluate(x);
    }

    fn params(&self) -> DVector<f64> {
        self.current.clone()
    }

    fn residuals(&self) -> Option<DVector<f64>> {
        self.residuals.clone()
    }

    fn jacobian(&self) -> Option<DMatrix<f64>> {
        jacobian_at(&mut self.problem.borrow_mut(), &self.current)
    }
}

/// Fits `initial.len()` parameters so that `model` best matches `observed` in the least-squares
/// sense (of the logarithms with `logarithmic`), starting from `initial`.
pub fn fit_least_squares<E>(
    model: &mut Model<'_, E>,
    initial: &[f64],
    observed: &[f64],
    logarithmic: bool,
) -> Result<Fitted, FitError<E>> {
    fit_with_patience(model, initial, observed, logarithmic, PATIENCE)
}

fn fit_with_patience<E>(
    model: &mut Model<'_, E>,
    initial: &[f64],
    observed: &[f64],
    logarithmic: bool,
    patience: usize,
) -> Result<Fitted, FitError<E>> {
    let (m, n) = (observed.len(), initial.len());
    if m <= n {
        return Err(FitError::TooFewObservations {
            observations: m,
            parameters: n,
        });
    }
    if let Some(row) = observed
        .iter()
        .position(|&value| !value.is_finite() || (logarithmic && value <= 0.0))
    {
        return Err(FitError::BadObservation {
            row: row + 1,
            value: observed[row],
        });
    }
    let as_logarithm: Vec<bool> = initial.iter().map(|&value| value > 0.0).collect();
    let start = DVector::from_iterator(
        n,
        initial
            .iter()
            .map(|&value| if value > 0.0 { value.ln() } else { value }),
    );
    let mut problem = Problem {
        model,
        observed,
        logarithmic,
        as_logarithm,
        failure: None,
    };
    let residuals = problem.evaluate(&start);
    let solver = Solver {
        problem: std::cell::RefCell::new(&mut problem),
        current: start,
        residuals,
    };
    let (solver, report) = LevenbergMarquardt::new()
        .with_patience(patience)
        .minimize(solver);
    let best = solver.current.clone();
    drop(solver);
    if let Some(failure) = problem.failure.take() {
        return Err(failure);
    }
    let iterations = report.number_of_evaluations;
    if !report.termination.was_successful() {
        return Err(FitError::NotConverged {
            reason: describe(&report.termination),
            iterations,
        });
    }
    let parameters = problem.untransform(&best);
    // The Jacobian in the parameters themselves: d r / d p = (d r / d ln p) / p.
    let Some(mut jacobian) = jacobian_at(&mut problem, &best) else {
        return Err(problem.failure.take().unwrap_or(FitError::NotConverged {
            reason: "the model has no value at the optimum".to_string(),
            iterations,
        }));
    };
    for (column, (&log, &value)) in problem.as_logarithm.iter().zip(&parameters).enumerate() {
        if log {
            let scaled = jacobian.column(column) / value;
            jacobian.set_column(column, &scaled);
        }
    }
    let residuals = problem.evaluate(&best).unwrap_or_else(|| DVector::zeros(m));
    let ssr = residuals.norm_squared();
    let covariance = covariance(&jacobian, ssr, m, n)?;
    let quantile = student_t_975((m - n) as f64);
    let standard_errors: Vec<f64> = (0..n).map(|j| covariance[(j, j)].sqrt()).collect();
    Ok(Fitted {
        half_widths: standard_errors.iter().map(|se| quantile * se).collect(),
        standard_errors,
        parameters,
        rms: (ssr / m as f64).sqrt(),
        iterations,
    })
}

/// s² (JᵀJ)⁻¹ with s² = SSR / (m − n), after checking that JᵀJ, scaled to unit diagonal,
/// is far from singular: otherwise names the parameter the data cannot fix.
pub fn covariance<E>(
    jacobian: &DMatrix<f64>,
    ssr: f64,
    m: usize,
    n: usize,
) -> Result<DMatrix<f64>, FitError<E>> {
    let normal = jacobian.transpose() * jacobian;
    let diagonal: Vec<f64> = (0..n).map(|j| normal[(j, j)]).collect();
    if let Some(parameter) = diagonal.iter().position(|&d| d <= 0.0 || !d.is_finite()) {
        return Err(FitError::NotIdentifiable { parameter });
    }
    let scaled = DMatrix::from_fn(n, n, |i, j| {
        normal[(i, j)] / (diagonal[i].sqrt() * diagonal[j].sqrt())
    });
    let eigen = scaled.clone().symmetric_eigen();
    let (smallest, _) = eigen
        .eigenvalues
        .iter()
        .enumerate()
        .map(|(index, &value)| (value, index))
        .fold((f64::INFINITY, 0), |best, next| {
            if next.0 < best.0 {
                next
            } else {
                best
            }
        });
    if smallest < IDENTIFIABLE_LIMIT {
        let index = eigen
            .eigenvalues
            .iter()
            .position(|&value| value == smallest)
            .unwrap_or(0);
        let vector = eigen.eigenvectors.column(index);
        let parameter = (0..n)
            .max_by(|&a, &b| vector[a].abs().total_cmp(&vector[b].abs()))
            .unwrap_or(0);
        return Err(FitError::NotIdentifiable { parameter });
    }
    let Some(inverse) = scaled.try_inverse() else {
        return Err(FitError::NotIdentifiable { parameter: 0 });
    };
    let variance = ssr / (m - n) as f64;
    Ok(DMatrix::from_fn(n, n, |i, j| {
        variance * inverse[(i, j)] / (diagonal[i].sqrt() * diagonal[j].sqrt())
    }))
}

fn describe(reason: &TerminationReason) -> String {
    match reason {
        TerminationReason::LostPatience => {
            "the solver's limit of model evaluations was reached".to_string()
        }
        TerminationReason::Numerical(what) => {
            format!("the model gave a value that is not a number ({what})")
        }
        TerminationReason::User(_) => "the model has no value at a trial point".to_string(),
        TerminationReason::NoImprovementPossible(what) => {
            format!("no step improves the fit any further ({what}) before the tolerances were met")
        }
        other => format!("{other:?}"),
    }
}

/// The 0.975 quantile of Student's t on `nu` degrees of freedom: the table for 1 to 5
/// (Abramowitz & Stegun 1964, table 26.10), above that the Cornish–Fisher expansion about the
/// normal quantile (A&S 26.7.5), within 1e-4 from 6 on.
pub fn student_t_975(nu: f64) -> f64 {
    const TABLE: [f64; 5] = [12.706_205, 4.302_653, 3.182_446, 2.776_445, 2.570_582];
    if nu < 5.5 {
        return TABLE[(nu.round().max(1.0) as usize - 1).min(4)];
    }
    let z: f64 = 1.959_963_984_540_054;
    let (z3, z5, z7, z9) = (z.powi(3), z.powi(5), z.powi(7), z.powi(9));
    z + (z3 + z) / (4.0 * nu)
        + (5.0 * z5 + 16.0 * z3 + 3.0 * z) / (96.0 * nu * nu)
        + (3.0 * z7 + 19.0 * z5 + 17.0 * z3 - 15.0 * z) / (384.0 * nu.powi(3))
        + (79.0 * z9 + 776.0 * z7 + 1482.0 * z5 - 1920.0 * z3 - 945.0 * z) / (92_160.0 * nu.powi(4))
}

#[cfg(test)]
mod tests {
    //! Synthetic records from known parameters, with and without noise; the standard errors
    //! against a covariance computed here from the analytic Jacobian; refusals.

    use super::*;

    /// y = a exp(−b x), a Theis-like decay with two positive parameters.
    fn decay(xs: &[f64]) -> impl FnMut(&[f64]) -> Result<Vec<f64>, ()> + '_ {
        move |p: &[f64]| Ok(xs.iter().map(|x| p[0] * (-p[1] * x).exp()).collect())
    }

    fn xs() -> Vec<f64> {
        (0..40).map(|i| 0.1 * f64::from(i)).collect()
    }

    /// A fixed pseudo-random noise in [−1, 1] (a linear congruential generator), so the test
    /// is the same on every run.
    fn noise(count: usize) -> Vec<f64> {
        let mut state: u64 = 12_345;
        (0..count)
            .map(|_| {
                state = state
                    .wrapping_mul(6_364_136_223_846_793_005)
                    .wrapping_add(1);
                ((state >> 11) as f64 / (1u64 << 53) as f64) * 2.0 - 1.0
            })
            .collect()
    }

    #[test]
    fn noise_free_records_give_the_parameters_back() {
        let xs = xs();
        let observed: Vec<f64> = xs.iter().map(|x| 2.5 * (-0.7 * x).exp()).collect();
        for logarithmic in [false, true] {
            let fitted = fit_least_squares(&mut decay(&xs), &[1.0, 0.2], &observed, logarithmic)
                .expect("fits");
            assert!(
                ((fitted.parameters[0] - 2.5) / 2.5).abs() < 1e-8,
                "{fitted:?}"
            );
            assert!(
                ((fitted.parameters[1] - 0.7) / 0.7).abs() < 1e-8,
                "{fitted:?}"
            );
            assert!(fitted.rms < 1e-8);
            assert!(fitted.iterations > 1);
        }
    }

    #[test]
    fn standard_errors_agree_with_the_analytic_covariance() {
        let xs = xs();
        let observed: Vec<f64> = xs
            .iter()
            .zip(noise(xs.len()))
            .map(|(x, e)| 2.5 * (-0.7 * x).exp() + 0.02 * e)
            .collect();
        let fitted =
            fit_least_squares(&mut decay(&xs), &[1.0, 0.2], &observed, false).expect("fits");
        let (a, b) = (fitted.parameters[0], fitted.parameters[1]);
        assert!(
            (a - 2.5).abs() < 0.05 && (b - 0.7).abs() < 0.05,
            "{fitted:?}"
        );
        // J = [exp(−b x), −a x exp(−b x)]; Cov = s² (JᵀJ)⁻¹ inverted by hand (2 × 2).
        let (mut saa, mut sab, mut sbb, mut ssr) = (0.0, 0.0, 0.0, 0.0);
        for (x, y) in xs.iter().zip(&observed) {
            let e = (-b * x).exp();
            let (ja, jb) = (e, -a * x * e);
            saa += ja * ja;
            sab += ja * jb;
            sbb += jb * jb;
            ssr += (a * e - y).powi(2);
        }
        let variance = ssr / (xs.len() - 2) as f64;
        let determinant = saa * sbb - sab * sab;
        let se_a = (variance * sbb / determinant).sqrt();
        let se_b = (variance * saa / determinant).sqrt();
        assert!(
            ((fitted.standard_errors[0] - se_a) / se_a).abs() < 1e-5,
            "{fitted:?} {se_a}"
        );
        assert!(
            ((fitted.standard_errors[1] - se_b) / se_b).abs() < 1e-5,
            "{fitted:?} {se_b}"
        );
        let t = student_t_975(38.0);
        assert!((fitted.half_widths[0] - t * fitted.standard_errors[0]).abs() < 1e-15);
        assert!(((fitted.rms - (ssr / 40.0).sqrt()) / fitted.rms).abs() < 1e-6);
    }

    #[test]
    fn student_t_matches_the_table() {
        // A&S table 26.10, 0.975 quantile: 10 -> 2.228139, 30 -> 2.042272, 120 -> 1.979930.
        for (nu, quantile) in [(10.0, 2.228_139), (30.0, 2.042_272), (120.0, 1.979_930)] {
            assert!((student_t_975(nu) - quantile).abs() < 2e-4, "{nu}");
        }
        assert_eq!(student_t_975(3.0), 3.182_446);
    }

    #[test]
    fn refusals() {
        let xs = xs();
        let observed: Vec<f64> = xs.iter().map(|x| 3.0 * x).collect();
        // Only the product a b is seen by the data.
        let mut product = |p: &[f64]| -> Result<Vec<f64>, ()> {
            Ok(xs.iter().map(|x| p[0] * p[1] * x).collect())
        };
        assert!(matches!(
            fit_least_squares(&mut product, &[1.0, 1.0], &observed, false),
            Err(FitError::NotIdentifiable { .. })
        ));
        // A parameter the model ignores.
        let mut ignores =
            |p: &[f64]| -> Result<Vec<f64>, ()> { Ok(xs.iter().map(|x| p[0] * x).collect()) };
        assert!(matches!(
            fit_least_squares(&mut ignores, &[1.0, 1.0], &observed, false),
            Err(FitError::NotIdentifiable { parameter: 1 })
        ));
        // Too few evaluations allowed to get there.
        let decaying: Vec<f64> = xs.iter().map(|x| 2.5 * (-0.7 * x).exp()).collect();
        assert!(matches!(
            fit_with_patience(&mut decay(&xs), &[1e3, 50.0], &decaying, false, 2),
            Err(FitError::NotConverged { .. })
        ));
        // As many observations as parameters; a negative observation in log space.
        assert!(matches!(
            fit_least_squares(&mut decay(&xs[..2]), &[1.0, 1.0], &decaying[..2], false),
            Err(FitError::TooFewObservations { .. })
        ));
        let mut negative = decaying.clone();
        negative[4] = -0.1;
        assert_eq!(
            fit_least_squares(&mut decay(&xs), &[1.0, 1.0], &negative, true).err(),
            Some(FitError::BadObservation {
                row: 5,
                value: -0.1
            })
        );
        // A model error stops the fit and comes back as it was.
        let mut failing = |_: &[f64]| -> Result<Vec<f64>, &str> { Err("no value") };
        assert_eq!(
            fit_least_squares(&mut failing, &[1.0], &decaying, false).err(),
            Some(FitError::Model("no value"))
        );
    }
}
