//! Bracketed root finding by Brent's method, with the reasons a bracket holds no root.
//!
//! Over 800 lines because its tests are: each way a bracket can fail (poles, steps, flat
//! stretches, special values) has its own case beside the search it checks.

use super::*;

// ---------------------------------------------------------------------------
// Root finding
// ---------------------------------------------------------------------------

/// A root found by [`brent`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Root {
    /// The root estimate.
    pub x: f64,
    /// Number of evaluations of the function, including the two at the
    /// bracket ends.
    pub iterations: u32,
    /// The function's value at `x` (signed; 0 for an exact root).
    pub residual: f64,
    /// Why the search stopped, which says how well `x` is known.
    pub convergence: Convergence,
}

/// What the x returned by [`brent`] is known to satisfy.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Convergence {
    /// The function is exactly 0 at x.
    Exact,
    /// |f(x)| is within [`Tolerance::residual`]: closer to zero than the
    /// caller can tell apart, so narrowing the bracket further would chase
    /// rounding noise.
    Residual,
    /// The sign change lies in an interval of this width that holds x.
    Bracket { width: f64 },
}

/// When [`brent`] may stop.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Tolerance {
    /// Absolute, in units of x: the search stops once the sign change is
    /// known within about `x` + 4·ε·|x| (ε = `f64::EPSILON`). 0 asks for
    /// full 64-bit precision relative to the root.
    pub x: f64,
    /// Absolute, in units of f: a sample with |f| at or below it is taken
    /// as the root. 0 accepts only an exact zero.
    pub residual: f64,
}

impl Tolerance {
    /// A tolerance on x alone.
    pub fn x(x: f64) -> Tolerance {
        Tolerance { x, residual: 0.0 }
    }
}

/// Why [`brent`] found no root.
#[derive(Debug, Clone, PartialEq)]
pub enum SolveError<E> {
    /// The bracket ends are not finite, or are equal.
    BadBracket { lower: f64, upper: f64 },
    /// A tolerance is negative, NaN or infinite.
    BadTolerance { tolerance: Tolerance },
    /// The function has the same sign at both ends, so the bracket is not
    /// known to hold a root.
    NoSignChange {
        lower: f64,
        upper: f64,
        f_lower: f64,
        f_upper: f64,
    },
    /// The function returned NaN, or ±infinity at a bracket end.
    NotFinite { x: f64, value: f64 },
    /// The sign change is a jump (a pole or a step), not a root: see
    /// [`brent`] for the criterion. `f_left` and `f_right` are the values at
    /// the smaller and larger x of the final bracket around `near`.
    Discontinuous {
        near: f64,
        f_left: f64,
        f_right: f64,
    },
    /// The evaluation budget ran out; the sign change lies in [lower, upper].
    NotConverged {
        iterations: u32,
        lower: f64,
        upper: f64,
    },
    /// The function itself reported an error.
    Function(E),
}

impl<E: fmt::Display> fmt::Display for SolveError<E> {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            SolveError::BadBracket { lower, upper } => write!(
                f,
                "the bracket [{}, {}] cannot be searched: both ends must be finite and different",
                Number(*lower),
                Number(*upper)
            ),
            SolveError::BadTolerance { tolerance } => write!(
                f,
                "the tolerances (x {}, residual {}) cannot be used: each must be a finite \
                 number, 0 or greater",
                Number(tolerance.x),
                Number(tolerance.residual)
            ),
            SolveError::NoSignChange {
                lower,
                upper,
                f_lower,
                f_upper,
            } => write!(
                f,
                "the function has the same sign at both ends of the bracket \
                 (f({}) = {}, f({}) = {}), so the bracket is not known to hold a root: \
                 choose ends where the function has opposite signs",
                Number(*lower),
                Number(*f_lower),
                Number(*upper),
                Number(*f_upper)
            ),
            SolveError::NotFinite { x, value } => write!(
                f,
                "the function returned {} at x = {}, where a finite number is needed",
                Number(*value),
                Number(*x)
            ),
            SolveError::Discontinuous {
                near,
                f_left,
                f_right,
            } => write!(
                f,
                "the function jumps from {} to {} near x = {} without passing through zero: \
                 this is a discontinuity (such as a pole or a step), not a root",
                Number(*f_left),
                Number(*f_right),
                Number(*near)
            ),
            SolveError::NotConverged {
                iterations,
                lower,
                upper,
            } => write!(
                f,
                "no root found within {iterations} evaluations of the function; the sign change \
                 lies between {} and {}: allow more iterations or a larger tolerance",
                Number(*lower),
                Number(*upper)
            ),
            SolveError::Function(error) => {
                write!(f, "the function could not be evaluated: {error}")
            }
        }
    }
}

impl<E: std::error::Error + 'static> std::error::Error for SolveError<E> {
    fn source(&self) -> Option<&(dyn std::error::Error + 'static)> {
        match self {
            SolveError::Function(error) => Some(error),
            _ => None,
        }
    }
}

/// A budget for [`brent`] that brackets of practical size meet. Brent
/// (1973, ch. 4) shows the method never needs more than about the square of
/// the number of bisections, log2(width / tolerance) (from memory); smooth
/// functions need far fewer, typically 5-15. The value itself is common
/// practice, no single source.
pub const DEFAULT_MAX_ITERATIONS: u32 = 200;

/// The sign change is accepted as a root only if the jump |f(left)| +
/// |f(right)| across the final bracket is at most this fraction of the
/// largest finite |f| seen. Chosen so that a continuous function needs a
/// slope of about 1e-3·scale per float spacing before it is called
/// discontinuous (common practice, no single source).
const JUMP_FRACTION: f64 = 1e-3;

/// Extra bisections allowed to decide whether a suspect sign change is a
/// jump; 100 halvings shrink any bracket by 2^100 ≈ 1e30.
const JUMP_CHECK_EVALUATIONS: u32 = 100;

#[derive(Debug, Clone, Copy)]
struct Sample {
    x: f64,
    fx: f64,
}

fn same_sign(a: f64, b: f64) -> bool {
    (a > 0.0 && b > 0.0) || (a < 0.0 && b < 0.0)
}

/// Counts evaluations and keeps the largest finite |f| seen, the scale
/// against which a jump is judged.
struct Evaluator<F> {
    function: F,
    evaluations: u32,
    largest_magnitude: f64,
}

impl<F, E> Evaluator<F>
where
    F: FnMut(f64) -> Result<f64, E>,
{
    fn sample(&mut self, x: f64) -> Result<Sample, SolveError<E>> {
        self.evaluations = self.evaluations.saturating_add(1);
        let fx = (self.function)(x).map_err(SolveError::Function)?;
        if fx.is_nan() {
            return Err(SolveError::NotFinite { x, value: fx });
        }
        if fx.is_finite() {
            self.largest_magnitude = self.largest_magnitude.max(fx.abs());
        }
        Ok(Sample { x, fx })
    }

    /// A bracket end must give a finite value: an infinite one usually
    /// means the end sits on a pole, and the search needs finite ends to
    /// interpolate from and to judge jumps against.
    fn sample_end(&mut self, x: f64) -> Result<Sample, SolveError<E>> {
        let end = self.sample(x)?;
        if end.fx.is_finite() {
            Ok(end)
        } else {
            Err(SolveError::NotFinite { x, value: end.fx })
        }
    }

    fn root(&self, at: Sample, convergence: Convergence) -> Root {
        Root {
            x: at.x,
            iterations: self.evaluations,
            residual: at.fx,
            convergence,
        }
    }
}

/// Whether a sample is a root by its value alone: exactly zero, or within
/// the residual tolerance.
fn root_by_value(at: Sample, residual_tolerance: f64) -> Option<Convergence> {
    if at.fx == 0.0 {
        Some(Convergence::Exact)
    } else if at.fx.abs() <= residual_tolerance {
        Some(Convergence::Residual)
    } else {
        None
    }
}

/// Finds a root of `f` in [lower, upper] by Brent's method: Brent (1973),
/// "Algorithms for Minimization without Derivatives", Prentice-Hall, ch. 4
/// (also in Forsythe, Malcolm & Moler 1977, "Computer Methods for
/// Mathematical Computations"; both from memory). Each step tries inverse
/// quadratic or secant interpolation and falls back to bisection whenever
/// interpolation would converge slower than bisection, so convergence is
/// guaranteed for any sign change and superlinear near a simple root.
///
/// * `f` must have opposite signs at the two ends (either order of ends is
///   accepted); an exact zero at an end is returned at once, and so is a
///   value within the residual tolerance.
/// * `tolerance.x` is absolute, in units of x: the returned x lies within
///   about `tolerance.x` + 4·ε·|x| of the sign change (ε = `f64::EPSILON`).
///   0 asks for full 64-bit precision relative to the root, which a bracket
///   spanning many decades reaches too; note that a root at or near 0 with
///   `tolerance.x` 0 may need many evaluations. `tolerance.residual` stops
///   the search at any x where |f| is that small ([`Convergence`] says
///   which test stopped it).
/// * `max_iterations` bounds the number of evaluations of `f` (both ends
///   included, and always made) in the search; [`DEFAULT_MAX_ITERATIONS`]
///   suits most uses.
///   Deciding whether a suspect sign change is a jump (below) may add up to
///   100 evaluations. [`Root::iterations`] reports all evaluations made.
///
/// **Discontinuities.** A sign change can be a jump rather than a root, as
/// in 1/(x − 1) across x = 1 or a step function. When the bracket has shrunk
/// to tolerance, the jump |f(left)| + |f(right)| across it is compared with
/// the largest finite |f| seen during the search. A continuous function
/// makes the jump vanish with the bracket; if it is still more than 1e-3 of
/// that scale, the bracket is bisected further, up to adjacent floats (at
/// most 100 more evaluations). If the jump becomes small the root is
/// accepted (the function was merely steep); otherwise
/// [`SolveError::Discontinuous`] is returned. So a "root" is never reported
/// where |f| stays large. Jumps smaller than 1e-3 of the largest |f| seen
/// are not distinguished from roots; check [`Root::residual`] if that
/// matters.
///
/// **Non-finite values.** NaN from `f` is always an error, and so is ±inf at
/// a bracket end. Inside the bracket ±inf is kept as a value of that sign
/// (with bisection instead of interpolation), because that is what a pole
/// evaluated exactly yields (1/0 = +inf), and the search then reports the
/// pole as a discontinuity rather than stopping with a less helpful error.
pub fn brent<E>(
    f: impl FnMut(f64) -> Result<f64, E>,
    lower: f64,
    upper: f64,
    tolerance: Tolerance,
    max_iterations: u32,
) -> Result<Root, SolveError<E>> {
    if !lower.is_finite() || !upper.is_finite() || lower == upper {
        return Err(SolveError::BadBracket { lower, upper });
    }
    let usable = |value: f64| value.is_finite() && value >= 0.0;
    if !usable(tolerance.x) || !usable(tolerance.residual) {
        return Err(SolveError::BadTolerance { tolerance });
    }
    let mut evaluator = Evaluator {
        function: f,
        evaluations: 0,
        largest_magnitude: 0.0,
    };
    let low_end = evaluator.sample_end(lower)?;
    if let Some(convergence) = root_by_value(low_end, tolerance.residual) {
        return Ok(evaluator.root(low_end, convergence));
    }
    let high_end = evaluator.sample_end(upper)?;
    if let Some(convergence) = root_by_value(high_end, tolerance.residual) {
        return Ok(evaluator.root(high_end, convergence));
    }
    if same_sign(low_end.fx, high_end.fx) {
        return Err(SolveError::NoSignChange {
            lower,
            upper,
            f_lower: low_end.fx,
            f_upper: high_end.fx,
        });
    }
    match search(&mut evaluator, low_end, high_end, tolerance, max_iterations)? {
        SearchEnd::Root(at, convergence) => Ok(evaluator.root(at, convergence)),
        SearchEnd::Bracket { best, contra } => {
            settle(&mut evaluator, best, contra, tolerance.residual)
        }
    }
}

enum SearchEnd {
    /// f is zero here, exactly or within the residual tolerance.
    Root(Sample, Convergence),
    /// The sign change lies between `best` (smaller |f|) and `contra`,
    /// within tolerance.
    Bracket { best: Sample, contra: Sample },
}

/// The main loop of Brent's zero finder.
///
/// Invariants: f(best) and f(contra) have opposite signs, |f(best)| <=
/// |f(contra)|; `previous` is the iterate before `best`. `step` is the
/// latest correction and `step_before` the one before it: an interpolated
/// step is accepted only if it lies well inside the bracket and is under half
/// of `step_before`, which guarantees at least bisection-like progress every
/// two steps (Brent 1973, ch. 4).
fn search<F, E>(
    evaluator: &mut Evaluator<F>,
    low_end: Sample,
    high_end: Sample,
    tolerances: Tolerance,
    max_iterations: u32,
) -> Result<SearchEnd, SolveError<E>>
where
    F: FnMut(f64) -> Result<f64, E>,
{
    let mut previous = low_end;
    let mut best = high_end;
    let mut contra = low_end;
    let mut step = best.x - previous.x;
    let mut step_before = step;
    loop {
        if same_sign(best.fx, contra.fx) {
            // The latest iterate landed on the contrapoint's side: the sign
            // change now lies between it and the iterate before it.
            contra = previous;
            step = best.x - previous.x;
            step_before = step;
        }
        if contra.fx.abs() < best.fx.abs() {
            previous = best;
            best = contra;
            contra = previous;
        }
        // Brent's tolerance: the requested absolute part plus a relative
        // part of a few rounding errors, with a floor so steps never vanish.
        let tolerance =
            (2.0 * f64::EPSILON * best.x.abs() + 0.5 * tolerances.x).max(f64::MIN_POSITIVE);
        let to_midpoint = 0.5 * (contra.x - best.x);
        if to_midpoint.abs() <= tolerance {
            return Ok(SearchEnd::Bracket { best, contra });
        }
        if evaluator.evaluations >= max_iterations {
            return Err(SolveError::NotConverged {
                iterations: evaluator.evaluations,
                lower: best.x.min(contra.x),
                upper: best.x.max(contra.x),
            });
        }
        let interpolated = if step_before.abs() >= tolerance
            && previous.fx.abs() > best.fx.abs()
            && [previous.fx, best.fx, contra.fx]
                .iter()
                .all(|v| v.is_finite())
        {
            interpolation_step(previous, best, contra, to_midpoint)
                .filter(|&(p, q)| {
                    2.0 * p < 3.0 * to_midpoint * q - (tolerance * q).abs()
                        && p < (0.5 * step_before * q).abs()
                })
                .map(|(p, q)| p / q)
                .filter(|candidate| candidate.is_finite())
        } else {
            None
        };
        match interpolated {
            Some(correction) => {
                step_before = step;
                step = correction;
            }
            None => {
                step = to_midpoint;
                step_before = step;
            }
        }
        previous = best;
        let correction = if step.abs() > tolerance {
            step
        } else {
            tolerance.copysign(to_midpoint)
        };
        best = evaluator.sample(best.x + correction)?;
        if let Some(convergence) = root_by_value(best, tolerances.residual) {
            return Ok(SearchEnd::Root(best, convergence));
        }
    }
}

/// The interpolated correction to `best` as a fraction p/q with p >= 0:
/// inverse quadratic interpolation through the three samples when they are
/// distinct, otherwise the secant through `previous` and `best`
/// (Brent 1973, ch. 4). `None` if the arithmetic fails.
fn interpolation_step(
    previous: Sample,
    best: Sample,
    contra: Sample,
    to_midpoint: f64,
) -> Option<(f64, f64)> {
    let s = best.fx / previous.fx;
    let (p, q) = if previous.x == contra.x {
        (2.0 * to_midpoint * s, 1.0 - s)
    } else {
        let q = previous.fx / contra.fx;
        let r = best.fx / contra.fx;
        (
            s * (2.0 * to_midpoint * q * (q - r) - (best.x - previous.x) * (r - 1.0)),
            (q - 1.0) * (r - 1.0) * (s - 1.0),
        )
    };
    // Fold the sign into q so that p >= 0, as the acceptance test expects.
    let (p, q) = if p > 0.0 { (p, -q) } else { (-p, q) };
    (p.is_finite() && q.is_finite()).then_some((p, q))
}

/// Accepts the converged bracket as a root if the jump across it is small;
/// otherwise bisects further to tell a steep root from a discontinuity.
fn settle<F, E>(
    evaluator: &mut Evaluator<F>,
    best: Sample,
    contra: Sample,
    residual_tolerance: f64,
) -> Result<Root, SolveError<E>>
where
    F: FnMut(f64) -> Result<f64, E>,
{
    let (mut left, mut right) = if best.x < contra.x {
        (best, contra)
    } else {
        (contra, best)
    };
    let jump_is_small = |left: Sample, right: Sample, scale: f64| {
        let jump = left.fx.abs() + right.fx.abs();
        jump.is_finite() && jump <= JUMP_FRACTION * scale
    };
    // The end with the smaller |f|, and the bracket's width.
    let bracketed = |left: Sample, right: Sample| {
        let best = if right.fx.abs() < left.fx.abs() {
            right
        } else {
            left
        };
        let width = right.x - left.x;
        (best, Convergence::Bracket { width })
    };
    for _ in 0..JUMP_CHECK_EVALUATIONS {
        if jump_is_small(left, right, evaluator.largest_magnitude) {
            let (best, convergence) = bracketed(left, right);
            return Ok(evaluator.root(best, convergence));
        }
        let middle = 0.5 * left.x + 0.5 * right.x;
        if middle <= left.x || middle >= right.x {
            break; // adjacent floats: the bracket cannot shrink further
        }
        let sample = evaluator.sample(middle)?;
        if let Some(convergence) = root_by_value(sample, residual_tolerance) {
            return Ok(evaluator.root(sample, convergence));
        }
        if same_sign(sample.fx, left.fx) {
            left = sample;
        } else {
            right = sample;
        }
    }
    if jump_is_small(left, right, evaluator.largest_magnitude) {
        let (best, convergence) = bracketed(left, right);
        return Ok(evaluator.root(best, convergence));
    }
    Err(SolveError::Discontinuous {
        near: 0.5 * left.x + 0.5 * right.x,
        f_left: left.fx,
        f_right: right.fx,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::numeric::test_support::*;
    use std::convert::Infallible;
    use std::f64::consts::PI;

    // ----- root finding -----

    #[test]
    fn wallis_cubic() {
        // x³ − 2x − 5 = 0, Wallis's example for Newton's method; real root
        // 2.0945514815423265... (from memory, confirmed independently by
        // Newton iteration in 40-digit decimal arithmetic).
        let root = brent(
            |x| ok(x * x * x - 2.0 * x - 5.0),
            2.0,
            3.0,
            Tolerance::x(1e-15),
            100,
        )
        .unwrap();
        assert!(
            (root.x - 2.094_551_481_542_326_5).abs() <= 4e-15,
            "{root:?}"
        );
        assert!(root.iterations < 50, "{root:?}");
        assert!(root.residual.abs() < 1e-13);
    }

    #[test]
    fn dottie_number() {
        // cos x = x at 0.7390851332151607... (the Dottie number; from memory,
        // confirmed independently by Newton iteration in 40-digit decimals).
        let root = brent(|x| ok(x.cos() - x), 0.0, 1.0, Tolerance::x(0.0), 100).unwrap();
        assert!(
            (root.x - 0.739_085_133_215_160_7).abs() <= 2e-16,
            "{root:?}"
        );
        assert!(root.iterations < 50, "{root:?}");
    }

    #[test]
    fn bracket_order_does_not_matter() {
        let forward = brent(|x| ok(x.cos() - x), 0.0, 1.0, Tolerance::x(1e-12), 100).unwrap();
        let backward = brent(|x| ok(x.cos() - x), 1.0, 0.0, Tolerance::x(1e-12), 100).unwrap();
        assert!((forward.x - backward.x).abs() < 2e-12);
    }

    #[test]
    fn root_at_a_bracket_end_is_returned_at_once() {
        let root = brent(|x| ok(x - 2.0), 2.0, 3.0, Tolerance::x(1e-12), 100).unwrap();
        assert_eq!(
            root,
            Root {
                x: 2.0,
                iterations: 1,
                residual: 0.0,
                convergence: Convergence::Exact,
            }
        );
        let root = brent(|x| ok(x - 3.0), 2.0, 3.0, Tolerance::x(1e-12), 100).unwrap();
        assert_eq!((root.x, root.iterations), (3.0, 2));
    }

    #[test]
    fn bracket_ends_close_to_roots_do_not_look_like_a_jump() {
        // sin is 1.2e-16 at fl(π) and −2.4e-16 at fl(2π): the sign change is
        // the root π itself, one float away from the lower end (closed form).
        let root = brent(|x| ok(x.sin()), PI, 2.0 * PI, Tolerance::x(0.0), 100).unwrap();
        assert!((root.x - PI).abs() <= 1e-15, "{root:?}");
    }

    #[test]
    fn steep_but_continuous_function_gives_a_root() {
        // tanh(1e6 (x − 1)) changes from −1 to 1 within ~1e-6 of x = 1: at a
        // tolerance of 1e-3 it looks like a step, but it is continuous.
        let root = brent(
            |x| ok((1e6 * (x - 1.0)).tanh()),
            0.0,
            3.0,
            Tolerance::x(1e-3),
            100,
        )
        .unwrap();
        assert!((root.x - 1.0).abs() <= 1e-3, "{root:?}");
        assert!(root.residual.abs() < 1e-3, "{root:?}");
    }

    #[test]
    fn same_sign_at_both_ends_is_reported() {
        let error = brent(|x| ok(x * x + 1.0), -1.0, 1.0, Tolerance::x(1e-12), 100).unwrap_err();
        assert_eq!(
            error,
            SolveError::NoSignChange {
                lower: -1.0,
                upper: 1.0,
                f_lower: 2.0,
                f_upper: 2.0,
            }
        );
        assert!(error.to_string().contains("same sign at both ends"));
        assert!(error.to_string().contains("f(-1.0) = 2.0, f(1.0) = 2.0"));
    }

    #[test]
    fn pole_is_a_discontinuity_not_a_root() {
        // 1/(x − 1) changes sign across its pole at x = 1 but has no root.
        let error = brent(|x| ok(1.0 / (x - 1.0)), 0.0, 2.0, Tolerance::x(1e-12), 100).unwrap_err();
        match error {
            SolveError::Discontinuous {
                near,
                f_left,
                f_right,
            } => {
                assert!((near - 1.0).abs() < 1e-9, "{near}");
                assert!(f_left < -1e9 && f_right > 1e9, "{f_left} {f_right}");
            }
            other => panic!("expected a discontinuity, got {other:?}"),
        }
        // Same with a bracket that does not put the pole at a bisection point.
        let shifted = brent(|x| ok(1.0 / (x - 1.0)), 0.3, 2.9, Tolerance::x(1e-10), 100);
        assert!(
            matches!(shifted, Err(SolveError::Discontinuous { .. })),
            "{shifted:?}"
        );
    }

    #[test]
    fn step_is_a_discontinuity_not_a_root() {
        let step = |x: f64| ok(if x < 1.0 { -1.0 } else { 1.0 });
        match brent(step, 0.0, 3.0, Tolerance::x(1e-12), 200) {
            Err(SolveError::Discontinuous {
                near,
                f_left,
                f_right,
            }) => {
                assert!((near - 1.0).abs() < 1e-12, "{near}");
                assert_eq!((f_left, f_right), (-1.0, 1.0));
            }
            other => panic!("expected a discontinuity, got {other:?}"),
        }
        // Lopsided step: −1 below 2, +100 above.
        let lopsided = |x: f64| ok(if x < 2.0 { -1.0 } else { 100.0 });
        assert!(matches!(
            brent(lopsided, -5.0, 7.0, Tolerance::x(1e-9), 200),
            Err(SolveError::Discontinuous { .. })
        ));
        let message = SolveError::<Infallible>::Discontinuous {
            near: 1.0,
            f_left: -1.0,
            f_right: 1.0,
        }
        .to_string();
        assert!(message.contains("not a root"), "{message}");
    }

    #[derive(Debug, Clone, PartialEq)]
    struct LookupFailed(f64);

    impl fmt::Display for LookupFailed {
        fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
            write!(f, "no table value at {}", self.0)
        }
    }

    impl std::error::Error for LookupFailed {}

    #[test]
    fn function_errors_are_passed_on() {
        // Fails only inside the bracket, near the root at 1.5.
        let failing = |x: f64| {
            if (1.4..1.6).contains(&x) {
                Err(LookupFailed(x))
            } else {
                Ok(x - 1.5)
            }
        };
        let error = brent(failing, 0.0, 5.0, Tolerance::x(1e-12), 100).unwrap_err();
        assert!(
            matches!(error, SolveError::Function(LookupFailed(_))),
            "{error:?}"
        );
        assert!(error
            .to_string()
            .starts_with("the function could not be evaluated: no table value"));
        assert!(std::error::Error::source(&error).is_some());
    }

    #[test]
    fn non_finite_values_are_errors() {
        assert!(matches!(
            brent(
                |x| ok(if x > 0.5 { f64::NAN } else { x - 1.0 }),
                0.0,
                2.0,
                Tolerance::x(1e-12),
                100
            ),
            Err(SolveError::NotFinite { x: 2.0, .. })
        ));
        assert!(matches!(
            brent(|x| ok(1.0 / x), 0.0, 2.0, Tolerance::x(1e-12), 100),
            Err(SolveError::NotFinite { x: 0.0, value }) if value == f64::INFINITY
        ));
        // NaN inside the bracket.
        assert!(matches!(
            brent(
                |x| ok(if (0.9..1.1).contains(&x) {
                    f64::NAN
                } else {
                    x - 1.0
                }),
                0.0,
                2.0,
                Tolerance::x(1e-12),
                100
            ),
            Err(SolveError::NotFinite { .. })
        ));
    }

    #[test]
    fn unusable_brackets_and_tolerances_are_rejected() {
        let line = |x: f64| ok(x);
        assert!(matches!(
            brent(line, 1.0, 1.0, Tolerance::x(1e-9), 100),
            Err(SolveError::BadBracket { .. })
        ));
        assert!(matches!(
            brent(line, f64::NAN, 1.0, Tolerance::x(1e-9), 100),
            Err(SolveError::BadBracket { .. })
        ));
        assert!(matches!(
            brent(line, -1.0, f64::INFINITY, Tolerance::x(1e-9), 100),
            Err(SolveError::BadBracket { .. })
        ));
        assert!(matches!(
            brent(line, -1.0, 1.0, Tolerance::x(-1e-9), 100),
            Err(SolveError::BadTolerance { .. })
        ));
        assert!(matches!(
            brent(line, -1.0, 1.0, Tolerance::x(f64::NAN), 100),
            Err(SolveError::BadTolerance { .. })
        ));
    }

    #[test]
    fn evaluation_budget_is_respected() {
        let error = brent(|x| ok(x.cos() - x), 0.0, 1.0, Tolerance::x(0.0), 4).unwrap_err();
        match error {
            SolveError::NotConverged {
                iterations,
                lower,
                upper,
            } => {
                assert_eq!(iterations, 4);
                assert!(lower < 0.739_085_133_215_160_7 && 0.739_085_133_215_160_7 < upper);
            }
            other => panic!("expected NotConverged, got {other:?}"),
        }
    }

    #[test]
    fn smooth_roots_need_few_evaluations() {
        // Closed-form roots: e^x = 2 at ln 2; x² = 2 at √2; x^5 = 10 at 10^(1/5);
        // 1 − e^(−x/5) = 0.5 at 5 ln 2 (a drawdown-like saturation curve).
        // (function, lower, upper, expected root)
        type Case = (fn(f64) -> f64, f64, f64, f64);
        let cases: [Case; 4] = [
            (|x| x.exp() - 2.0, -3.0, 4.0, 2f64.ln()),
            (|x| x * x - 2.0, 0.0, 10.0, 2f64.sqrt()),
            (|x| x.powi(5) - 10.0, 0.0, 3.0, 10f64.powf(0.2)),
            (|x| 0.5 - (-x / 5.0).exp(), 0.0, 100.0, 5.0 * 2f64.ln()),
        ];
        for (function, lower, upper, expected) in cases {
            let root = brent(|x| ok(function(x)), lower, upper, Tolerance::x(1e-13), 100).unwrap();
            assert!((root.x - expected).abs() < 1e-12, "{root:?} vs {expected}");
            assert!(root.iterations < 50, "{root:?}");
        }
    }

    #[test]
    fn decade_spanning_brackets_give_roots_to_full_precision() {
        // Closed forms: x³ = 2e-15 at 2e-15^(1/3) = 1.25992104989487316e-5 and
        // x³ = 2 at 2^(1/3) = 1.25992104989487316 (both from Python mpmath
        // cbrt, 30 digits), in a bracket of twelve decades.
        for (goal, expected) in [
            (2e-15, 1.259_921_049_894_873_2e-5),
            (2.0, 1.259_921_049_894_873_2),
        ] {
            let root = brent(|x| ok(x * x * x - goal), 1e-6, 1e6, Tolerance::x(0.0), 200).unwrap();
            assert!(
                (root.x - expected).abs() <= 4.0 * f64::EPSILON * expected,
                "{root:?} vs {expected}"
            );
            if let Convergence::Bracket { width } = root.convergence {
                assert!(width.abs() <= 4.0 * f64::EPSILON * expected, "{root:?}");
            }
        }
    }

    #[test]
    fn convergence_says_which_test_stopped_the_search() {
        // e^x = 2 at ln 2 (closed form).
        let by_width = brent(|x| ok(x.exp() - 2.0), -3.0, 4.0, Tolerance::x(0.0), 100).unwrap();
        match by_width.convergence {
            Convergence::Bracket { width } => {
                assert!(
                    width.abs() <= 4.0 * f64::EPSILON * 2f64.ln(),
                    "{by_width:?}"
                )
            }
            Convergence::Exact => assert_eq!(by_width.residual, 0.0),
            Convergence::Residual => panic!("no residual tolerance was given: {by_width:?}"),
        }
        let loose = Tolerance {
            x: 0.0,
            residual: 1e-6,
        };
        let by_residual = brent(|x| ok(x.exp() - 2.0), -3.0, 4.0, loose, 100).unwrap();
        assert!(
            by_residual.convergence == Convergence::Residual
                || by_residual.convergence == Convergence::Exact,
            "{by_residual:?}"
        );
        assert!(by_residual.residual.abs() <= 1e-6, "{by_residual:?}");
        assert!(
            by_residual.iterations < by_width.iterations,
            "{by_residual:?}"
        );
        assert!(matches!(
            brent(
                ok,
                -1.0,
                1.0,
                Tolerance {
                    x: 0.0,
                    residual: -1.0
                },
                100
            ),
            Err(SolveError::BadTolerance { .. })
        ));
    }

    #[test]
    fn loose_tolerance_still_gives_a_root_within_it() {
        let root = brent(
            |x| ok(x * x * x - 2.0 * x - 5.0),
            2.0,
            3.0,
            Tolerance::x(0.1),
            100,
        )
        .unwrap();
        assert!((root.x - 2.094_551_481_542_326_5).abs() <= 0.1, "{root:?}");
    }

    #[test]
    fn awkward_inputs_give_values_or_errors() {
        // Every function must return (not panic) on any mix of special values (the layered
        // means have the same test in `library::layered`).
        const SPECIAL: [f64; 12] = [
            0.0,
            -0.0,
            1.0,
            -1.0,
            f64::MAX,
            -f64::MAX,
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
            let rows = (pick().abs().min(3.0)) as usize + 1;
            let a: Vec<f64> = (0..rows).map(|_| pick()).collect();
            let b: Vec<f64> = (0..rows).map(|_| pick()).collect();
            let results = [
                sum(&a),
                mean(&a),
                geometric_mean(&a),
                harmonic_mean(&a),
                minimum(&a).map(|(value, _)| value),
                interpolate_linear(&a, &b, pick()),
                interpolate_log(&a, &b, pick()),
            ];
            for value in results.into_iter().flatten() {
                assert!(!value.is_nan(), "{a:?} {b:?}");
            }
            let (lower, upper, tolerance) = (pick(), pick(), pick());
            let _ = brent(
                |x| ok(x - 0.25),
                lower,
                upper,
                Tolerance::x(tolerance.abs()),
                50,
            );
        }
    }

    #[test]
    fn roots_of_random_cubics_are_sign_changes() {
        // Closed-form check: the root lies between adjacent floats at which
        // the cubic changes sign, or makes it vanish.
        let mut random = Lcg(11);
        for _ in 0..300 {
            let (a, b, c) = (
                4.0 * random.next() - 2.0,
                4.0 * random.next() - 2.0,
                4.0 * random.next() - 2.0,
            );
            let cubic = |x: f64| x * x * x + a * x * x + b * x + c;
            // A cubic tends to ±inf, so [-10, 10] holds a sign change here.
            let root = brent(|x| ok(cubic(x)), -10.0, 10.0, Tolerance::x(0.0), 200).unwrap();
            let below = cubic(root.x - 8.0 * f64::EPSILON * root.x.abs().max(1.0));
            let above = cubic(root.x + 8.0 * f64::EPSILON * root.x.abs().max(1.0));
            assert!(root.residual == 0.0 || !same_sign(below, above), "{root:?}");
            assert!(root.iterations < 60, "{root:?}");
        }
    }
}
