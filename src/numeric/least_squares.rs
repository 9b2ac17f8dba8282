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
        .with_patience(PATIENCE)
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
    if let Some(parameter) = diagonal.iter().position(|&d| !(d > 0.0) || !d.is_finite()) {
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
            format!("no convergence within {PATIENCE} evaluations of the model")
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
