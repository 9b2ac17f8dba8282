//! `solve line == goal for unknown between lower and upper`: the value of an input line for
//! which another line equals a target. Each trial re-evaluates only the lines on the way from
//! the unknown to the solved line, in dependency order, over the settled values of the rest.

use super::error::{EvalError, EvalErrorKind};
use super::evaluate::{Calculator, Failure, Scope, Shown, ShownValue};
use super::value::{Quantity, Value};
use crate::numeric::{brent, SolveError};
use crate::syntax::{Definition, FunctionDefinition, Solve, Span};
use rustc_hash::FxHashMap as HashMap;

/// Most trials before a solve gives up; Brent's method needs far fewer on any continuous line.
const MAX_ITERATIONS: u32 = 200;
/// Bracket width, relative to the bracket's ends, at which a root is accepted.
const RELATIVE_TOLERANCE: f64 = 1e-12;

/// A scope with some lines' values replaced (the unknown's trial value, and the lines that
/// depend on it).
struct Overlay<'s> {
    base: &'s dyn Scope,
    values: &'s HashMap<String, Shown>,
}

impl Scope for Overlay<'_> {
    fn lookup(&self, name: &str) -> Option<Option<&Shown>> {
        match self.values.get(name) {
            Some(shown) => Some(Some(shown)),
            None => self.base.lookup(name),
        }
    }

    fn definition(&self, name: &str) -> Option<&Definition> {
        self.base.definition(name)
    }

    fn for_each_defined(&self, visit: &mut dyn FnMut(&str)) {
        self.base.for_each_defined(visit)
    }

    fn sheet_function(&self, name: &str) -> Option<Option<&FunctionDefinition>> {
        self.base.sheet_function(name)
    }
}

impl Calculator<'_> {
    /// Solves for the unknown; the iterations and residual go to `notes`.
    pub(crate) fn solve(
        &mut self,
        solve: &Solve,
        span: Span,
        scope: &dyn Scope,
    ) -> Result<Value, Failure> {
        let error = |message: String, at: Span| -> Failure {
            EvalError::new(EvalErrorKind::Solve { message }, at).into()
        };
        let (unknown, target) = (&solve.unknown.text, &solve.line.text);
        let unknown_value = match scope.lookup(unknown) {
            None => {
                return Err(error(
                    format!("`{unknown}` is not a line of the sheet; solve varies a named input"),
                    solve.unknown.span,
                ))
            }
            Some(None) => return Err(Failure::Upstream(unknown.clone())),
            Some(Some(Shown::Scalar(shown))) => shown.clone(),
            Some(Some(_)) => {
                return Err(EvalError::new(
                    EvalErrorKind::ScalarNeeded {
                        what: "the unknown of a solve",
                    },
                    solve.unknown.span,
                )
                .into())
            }
        };
        let target_dimension = match scope.lookup(target) {
            None => {
                return Err(error(
                    format!("`{target}` is not a line of the sheet"),
                    solve.line.span,
                ))
            }
            Some(None) => return Err(Failure::Upstream(target.clone())),
            Some(Some(Shown::Scalar(shown))) => shown.quantity.dimension,
            Some(Some(_)) => {
                return Err(EvalError::new(
                    EvalErrorKind::ScalarNeeded {
                        what: "the solved line",
                    },
                    solve.line.span,
                )
                .into())
            }
        };
        let goal = self.scalar(&solve.goal, "the target of a solve", scope)?;
        if goal.dimension != target_dimension {
            return Err(EvalError::new(
                EvalErrorKind::DimensionMismatch {
                    operation: super::error::Operation::Compare,
                    left: target_dimension,
                    right: goal.dimension,
                },
                solve.goal.span,
            )
            .into());
        }
        let lower = self.scalar(&solve.lower, "the lower end of a solve's bracket", scope)?;
        let upper = self.scalar(&solve.upper, "the upper end of a solve's bracket", scope)?;
        for (end, expression) in [(&lower, &solve.lower), (&upper, &solve.upper)] {
            if end.dimension != unknown_value.quantity.dimension {
                return Err(EvalError::new(
                    EvalErrorKind::DimensionMismatch {
                        operation: super::error::Operation::Compare,
                        left: unknown_value.quantity.dimension,
                        right: end.dimension,
                    },
                    expression.span,
                )
                .into());
            }
        }
        let chain = lines_between(scope, target, unknown);
        if chain.is_empty() {
            return Err(error(
                format!("`{target}` does not depend on `{unknown}`, so no value of it can change `{target}`"),
                solve.unknown.span,
            ));
        }
        let trial_shape = unknown_value.quantity;
        let mut last_trial = f64::NAN;
        let mut trial = |x: f64| -> Result<f64, Failure> {
            last_trial = x;
            let mut values: HashMap<String, Shown> = HashMap::default();
            // Only the quantity of a trial value is read by the lines that use it.
            let quantity = Quantity {
                value: x,
                ..trial_shape
            };
            values.insert(
                unknown.clone(),
                Shown::Scalar(ShownValue {
                    quantity,
                    unit: unknown_value.unit.clone(),
                    value: x,
                }),
            );
            for name in &chain {
                let Some(definition) = scope.definition(name) else {
                    return Err(Failure::Upstream(name.clone()));
                };
                let overlay = Overlay {
                    base: scope,
                    values: &values,
                };
                let shown = self.line_value(
                    &definition.expression,
                    definition.display_unit.as_ref(),
                    &overlay,
                )?;
                values.insert(name.clone(), shown);
            }
            match values.get(target) {
                Some(Shown::Scalar(shown)) => Ok(shown.quantity.value - goal.value),
                _ => Err(EvalError::new(
                    EvalErrorKind::ScalarNeeded {
                        what: "the solved line",
                    },
                    solve.line.span,
                )
                .into()),
            }
        };
        let tolerance = RELATIVE_TOLERANCE * lower.value.abs().max(upper.value.abs()).max(1e-300);
        let root = brent(
            &mut trial,
            lower.value,
            upper.value,
            tolerance,
            MAX_ITERATIONS,
        )
        .map_err(|failure| match failure {
            // A pole inside the bracket: the line has no value there, so it jumps.
            SolveError::Function(Failure::Error(inner))
                if matches!(
                    inner.kind.as_ref(),
                    EvalErrorKind::DivisionByZero | EvalErrorKind::NotFinite
                ) =>
            {
                error(
                    format!(
                        "`{target}` is not continuous in the bracket: it has no value at `{unknown}` = {last_trial:.6e} (SI) ({}); choose a bracket that leaves that point out",
                        inner.kind
                    ),
                    span,
                )
            }
            SolveError::Function(Failure::Error(inner)) => {
                Failure::Error(inner.with_label(span, format!("while solving for `{unknown}`")))
            }
            SolveError::Function(upstream) => upstream,
            other => error(describe(&other, target, unknown, goal.value), span),
        })?;
        self.notes.insert(
            span.start,
            format!(
                "Brent's method, {} iterations; residual {:.2e} {}",
                root.iterations,
                root.residual.abs(),
                target_dimension.preferred_si_unit()
            ),
        );
        Ok(Value::Scalar(Quantity {
            value: root.x,
            ..trial_shape
        }))
    }
}

fn describe(error: &SolveError<Failure>, target: &str, unknown: &str, goal: f64) -> String {
    match error {
        SolveError::NoSignChange {
            f_lower, f_upper, ..
        } => format!(
            "no solution in the bracket: `{target}` is {:.4e} at the lower end and {:.4e} at the upper end (SI), both on the same side of the target {:.4e}",
            f_lower + goal,
            f_upper + goal,
            goal
        ),
        SolveError::Discontinuous { near, .. } => format!(
            "`{target}` is not continuous near `{unknown}` = {near:.6e} (SI): it jumps across the target there instead of reaching it"
        ),
        SolveError::NotConverged {
            iterations,
            lower,
            upper,
        } => format!(
            "no convergence after {iterations} iterations; the last bracket was {lower:.6e} to {upper:.6e} (SI)"
        ),
        SolveError::BadBracket { lower, upper } => format!(
            "the bracket's ends must be two different finite values, found {lower:e} and {upper:e} (SI)"
        ),
        SolveError::BadTolerance { x_tolerance } => {
            format!("the solver's tolerance {x_tolerance:e} is not usable")
        }
        SolveError::NotFinite { x, value } => format!(
            "`{target}` is not a finite number ({value}) at `{unknown}` = {x:.6e} (SI)"
        ),
        SolveError::Function(_) => format!("`{target}` could not be evaluated"),
    }
}

/// The lines that must be re-evaluated when `unknown` changes, for `target`'s value: those
/// that depend on `unknown` and that `target` needs, in dependency order, ending with `target`.
/// Empty if `target` does not depend on `unknown`.
fn lines_between(scope: &dyn Scope, target: &str, unknown: &str) -> Vec<String> {
    let mut depends: HashMap<String, bool> = HashMap::default();
    let mut order = Vec::new();
    visit(scope, target, unknown, &mut depends, &mut order);
    order
}

fn visit(
    scope: &dyn Scope,
    name: &str,
    unknown: &str,
    depends: &mut HashMap<String, bool>,
    order: &mut Vec<String>,
) -> bool {
    if name == unknown {
        return true;
    }
    if let Some(known) = depends.get(name) {
        return *known;
    }
    // Marked first so that a cycle (refused elsewhere) cannot recurse forever.
    depends.insert(name.to_string(), false);
    let Some(definition) = scope.definition(name) else {
        return false;
    };
    let mut used = Vec::new();
    collect_names(scope, &definition.expression, &[], &mut used, 0);
    let mut any = false;
    for used_name in used {
        any |= visit(scope, &used_name, unknown, depends, order);
    }
    if any {
        depends.insert(name.to_string(), true);
        order.push(name.to_string());
    }
    any
}

/// The sheet names an expression uses, through the bodies of the sheet functions it calls.
fn collect_names(
    scope: &dyn Scope,
    expression: &crate::syntax::Expression,
    parameters: &[&str],
    used: &mut Vec<String>,
    depth: usize,
) {
    expression.for_each_name(&mut |name, _| {
        if !parameters.contains(&name) && !used.iter().any(|known| known == name) {
            used.push(name.to_string());
        }
    });
    if depth > 64 {
        return;
    }
    expression.for_each_call(&mut |function, _| {
        if let Some(Some(definition)) = scope.sheet_function(function) {
            let names: Vec<&str> = definition
                .parameters
                .iter()
                .map(|parameter| parameter.name.text.as_str())
                .collect();
            collect_names(scope, &definition.body, &names, used, depth + 1);
        }
    });
}
