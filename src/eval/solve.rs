//! `solve line == goal for unknown between lower and upper`: the value of an input line for
//! which another line equals a target. Each trial re-evaluates only the lines on the way from
//! the unknown to the solved line, in dependency order, over the settled values of the rest.

use super::error::{EvalError, EvalErrorKind};
use super::evaluate::{Calculator, Failure, Scope, Shown, ShownValue};
use super::value::{Quantity, Value};
use crate::numeric::{brent, Convergence, Root, SolveError, Tolerance};
use crate::syntax::{Definition, FunctionDefinition, Solve, Span};
use rustc_hash::FxHashMap as HashMap;

/// Most trials before a solve gives up; Brent's method needs far fewer on any continuous line.
const MAX_ITERATIONS: u32 = 200;
/// A line within this fraction of the target equals it to rounding: a few units in the last
/// place of a double (common practice, no single source).
const ROUNDING_LEVEL: f64 = 4.0 * f64::EPSILON;

/// A scope with some lines' values replaced (the unknown's trial value, and the lines that
/// depend on it).
pub(super) struct Overlay<'s> {
    pub(super) base: &'s dyn Scope,
    pub(super) values: &'s HashMap<String, Shown>,
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
    /// Re-evaluates the lines of `chain`, in order, over `values` (the trial inputs and the
    /// lines already redone), adding each result: the one re-evaluation behind solve and fit.
    pub(crate) fn reevaluate_chain(
        &mut self,
        chain: &[String],
        values: &mut HashMap<String, Shown>,
        scope: &dyn Scope,
    ) -> Result<(), Failure> {
        for name in chain {
            let Some(definition) = scope.definition(name) else {
                return Err(Failure::Upstream(name.clone()));
            };
            let overlay = Overlay {
                base: scope,
                values,
            };
            let shown = self.line_value(
                &definition.expression,
                definition.display_unit.as_ref(),
                &overlay,
            )?;
            values.insert(name.clone(), shown);
        }
        Ok(())
    }

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
        let target_value = match scope.lookup(target) {
            None => {
                return Err(error(
                    format!("`{target}` is not a line of the sheet"),
                    solve.line.span,
                ))
            }
            Some(None) => return Err(Failure::Upstream(target.clone())),
            Some(Some(Shown::Scalar(shown))) => shown.clone(),
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
        let target_dimension = target_value.quantity.dimension;
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
            self.reevaluate_chain(&chain, &mut values, scope)?;
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
        let tolerance = solve_tolerance(lower.value, upper.value, goal.value);
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
                        "`{target}` is not continuous in the bracket: it has no value at `{unknown}` = {} ({}); choose a bracket that leaves that point out",
                        In::unit_of(&unknown_value).write(last_trial),
                        inner.kind
                    ),
                    span,
                )
            }
            SolveError::Function(Failure::Error(inner)) => {
                Failure::Error(inner.with_label(span, format!("while solving for `{unknown}`")))
            }
            SolveError::Function(upstream) => upstream,
            other => {
                let units = (In::unit_of(&target_value), In::unit_of(&unknown_value));
                error(describe(&other, target, unknown, goal.value, &units), span)
            }
        })?;
        self.notes.insert(
            span.start,
            accuracy_note(&root, &target_value, goal.value, &unknown_value),
        );
        Ok(Value::Scalar(Quantity {
            value: root.x,
            ..trial_shape
        }))
    }
}

/// Writes SI values in the unit a line shows in (`1.35e-6 m/s`, `21.5 degC`), for messages.
pub(super) struct In {
    unit: Option<crate::units::Unit>,
    text: String,
}

impl In {
    pub(super) fn unit_of(shown: &ShownValue) -> In {
        let unit = crate::syntax::parse_unit(&shown.unit)
            .ok()
            .and_then(|expression| super::evaluate::resolve_unit(&expression).ok());
        In {
            unit,
            text: shown.unit.clone(),
        }
    }

    pub(super) fn write(&self, si_value: f64) -> String {
        let number = match &self.unit {
            Some(unit) => unit.from_si(si_value),
            None => si_value,
        };
        match self.text.as_str() {
            "1" | "" => crate::numeric::message_number(number),
            unit => format!("{} {unit}", crate::numeric::message_number(number)),
        }
    }
}

/// When Brent's method may stop: once the root is bracketed to a few rounding errors of
/// itself, however many decades the bracket spans, or once the line equals the goal to
/// rounding. A bracket that reaches zero also gets an absolute floor, the float spacing at its
/// larger end, so a root at zero (which has no relative precision) ends in a bounded number of
/// trials; a bracket on one side of zero needs none.
fn solve_tolerance(lower: f64, upper: f64, goal: f64) -> Tolerance {
    let reaches_zero = lower.signum() != upper.signum() || lower == 0.0 || upper == 0.0;
    Tolerance {
        x: if reaches_zero {
            f64::EPSILON * lower.abs().max(upper.abs())
        } else {
            0.0
        },
        residual: ROUNDING_LEVEL * goal.abs(),
    }
}

/// The note on a solved line: iterations, the residual (also relative to the goal), and how
/// closely the root is known: the final bracket's width relative to the root, or that the line
/// met the goal to rounding.
fn accuracy_note(root: &Root, target: &ShownValue, goal: f64, unknown: &ShownValue) -> String {
    let residual = difference_text(target, root.residual.abs());
    let relative_residual = if root.convergence == Convergence::Exact {
        " (exact)".to_string()
    } else if goal != 0.0 {
        format!(
            " ({} of the target)",
            crate::numeric::message_number(root.residual.abs() / goal.abs())
        )
    } else {
        String::new()
    };
    let accuracy = match root.convergence {
        Convergence::Exact => String::new(),
        Convergence::Residual => "; the line meets the target to rounding".to_string(),
        // Relative to the root unless the bracket reaches zero, where a relative width says nothing.
        Convergence::Bracket { width } if width.abs() < root.x.abs() => format!(
            "; root bracketed to {} of its value",
            crate::numeric::message_number(width.abs() / root.x.abs())
        ),
        Convergence::Bracket { width } => format!(
            "; root bracketed to {}",
            difference_text(unknown, width.abs())
        ),
    };
    format!(
        "Brent's method, {} iterations; residual {residual}{relative_residual}{accuracy}",
        root.iterations
    )
}

/// A difference in the line's unit unless that unit has an offset (degC), then in SI.
fn difference_text(line: &ShownValue, difference: f64) -> String {
    let unit = In::unit_of(line);
    match &unit.unit {
        Some(found) if found.offset.is_none() => unit.write(difference),
        _ => format!(
            "{} {}",
            crate::numeric::message_number(difference),
            line.quantity.dimension.preferred_si_unit()
        ),
    }
}

fn describe(
    error: &SolveError<Failure>,
    target: &str,
    unknown: &str,
    goal: f64,
    (target_unit, unknown_unit): &(In, In),
) -> String {
    match error {
        SolveError::NoSignChange {
            f_lower, f_upper, ..
        } => format!(
            "no solution in the bracket: `{target}` is {} at the lower end and {} at the upper end, both on the same side of the target {}",
            target_unit.write(f_lower + goal),
            target_unit.write(f_upper + goal),
            target_unit.write(goal)
        ),
        SolveError::Discontinuous { near, .. } => format!(
            "`{target}` is not continuous near `{unknown}` = {}: it jumps across the target there instead of reaching it",
            unknown_unit.write(*near)
        ),
        SolveError::NotConverged {
            iterations,
            lower,
            upper,
        } => format!(
            "no convergence after {iterations} iterations; the last bracket was {} to {}",
            unknown_unit.write(*lower),
            unknown_unit.write(*upper)
        ),
        SolveError::BadBracket { lower, upper } => format!(
            "the bracket's ends must be two different values, found {} and {}",
            unknown_unit.write(*lower),
            unknown_unit.write(*upper)
        ),
        SolveError::BadTolerance { tolerance } => format!(
            "the solver's tolerances (x {:e}, residual {:e}) are not usable",
            tolerance.x, tolerance.residual
        ),
        SolveError::NotFinite { x, value } => format!(
            "`{target}` is not a finite number ({value}) at `{unknown}` = {}",
            unknown_unit.write(*x)
        ),
        SolveError::Function(_) => format!("`{target}` could not be evaluated"),
    }
}

/// The lines that must be re-evaluated when `unknown` changes, for `target`'s value: those
/// that depend on `unknown` and that `target` needs, in dependency order, ending with `target`.
/// Empty if `target` does not depend on `unknown`.
fn lines_between(scope: &dyn Scope, target: &str, unknown: &str) -> Vec<String> {
    lines_between_any(scope, target, &[unknown])
}

/// The lines on the way from any of `unknowns` to `target`, in dependency order.
pub(super) fn lines_between_any(scope: &dyn Scope, target: &str, unknowns: &[&str]) -> Vec<String> {
    let mut depends: HashMap<String, bool> = HashMap::default();
    let mut order = Vec::new();
    visit(scope, target, unknowns, &mut depends, &mut order);
    order
}

fn visit(
    scope: &dyn Scope,
    name: &str,
    unknowns: &[&str],
    depends: &mut HashMap<String, bool>,
    order: &mut Vec<String>,
) -> bool {
    if unknowns.contains(&name) {
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
        any |= visit(scope, &used_name, unknowns, depends, order);
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
