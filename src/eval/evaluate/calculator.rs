//! The calculator shared by sheets and sessions: expressions against a scope of names, units,
//! and values shown in their display units.

use super::*;
use crate::eval::data::DataTable;
use crate::eval::error::{EvalError, EvalErrorKind};
use crate::eval::function::{Library, Provenance};
use crate::eval::sources::SourceMap;
use crate::eval::value::{Quantity, Value};
use crate::syntax::{
    Definition, Expression, ExpressionKind, FunctionDefinition, Span, UnitExpression,
    UnitExpressionKind,
};
use crate::units::{Exponent, TemperatureRole, Unit, UnitError};
use rustc_hash::FxHashMap as HashMap;
use std::sync::Arc;

/// Why an expression produced no value.
pub(crate) enum Failure {
    Error(EvalError),
    /// A line it needs failed; that line's name.
    Upstream(String),
}

impl From<EvalError> for Failure {
    fn from(error: EvalError) -> Failure {
        Failure::Error(error)
    }
}

/// The names an expression can refer to besides built-ins: a sheet's definitions and
/// functions, or a session's lines.
pub(crate) trait Scope {
    /// `None` if no line defines `name`; `Some(None)` if one does but it has no value (it failed
    /// or is not evaluated yet).
    fn lookup(&self, name: &str) -> Option<Option<&Shown>>;
    /// The definition of a named line, for a solve that re-evaluates it.
    fn definition(&self, name: &str) -> Option<&Definition>;
    /// Every defined name, for "did you mean".
    fn for_each_defined(&self, visit: &mut dyn FnMut(&str));
    /// A function defined by the sheet: `Some(None)` if it exists but was refused.
    fn sheet_function(&self, _name: &str) -> Option<Option<&FunctionDefinition>> {
        None
    }
}
/// Evaluates expressions, calls sheet functions, shows values in units and decides checks
/// against a `Scope`. It keeps the provenance of the calls it made, a record of built-in calls
/// and a cache of resolved units, so it is reused across the lines of a sheet or the entries of
/// a session.
pub(crate) struct Calculator<'l> {
    pub(super) library: &'l dyn Library,
    pub(crate) provenance: Provenance,
    pub(crate) calls: Vec<CallRecord>,
    pub(super) unit_cache: HashMap<String, Unit>,
    /// Parameter values of the sheet functions being called, innermost last.
    pub(super) parameters: Vec<Vec<(String, Value)>>,
    /// The longest column allowed.
    pub(crate) max_rows: usize,
    /// Threads a long column's kernel may be split across (`Settings::threads`).
    pub(crate) threads: usize,
    /// The rows the sheet's column-valued lines hold together, against `--max-total-rows`.
    pub(crate) row_budget: crate::eval::columns::RowBudget,
    /// The data files the sheet reads, by the span of the path in each `column … from` line.
    pub(crate) data_files: HashMap<usize, Result<Arc<DataTable>, EvalError>>,
    /// Notes on how values were found (a solve's iterations), by expression span start.
    pub(crate) notes: HashMap<usize, String>,
    /// Data files handed to a session, by the path as written.
    pub(crate) data_by_path: HashMap<String, Result<Arc<DataTable>, String>>,
    /// The normal scores of the block of samples being evaluated (`run --samples`); without
    /// them a distribution gives its median.
    pub(crate) sampling: Option<Arc<crate::eval::uncertainty::BlockScores>>,
    /// The distributions met, in evaluation order (one per input).
    pub(crate) uncertain: Vec<crate::eval::uncertainty::UncertainInput>,
}
impl<'l> Calculator<'l> {
    pub(crate) fn new(library: &'l dyn Library) -> Calculator<'l> {
        Calculator {
            library,
            provenance: Provenance::default(),
            calls: Vec::new(),
            unit_cache: HashMap::default(),
            parameters: Vec::new(),
            max_rows: crate::eval::columns::DEFAULT_MAX_ROWS,
            threads: super::available_cores(),
            row_budget: crate::eval::columns::RowBudget::new(
                crate::eval::columns::DEFAULT_MAX_TOTAL_ROWS,
            ),
            data_files: HashMap::default(),
            notes: HashMap::default(),
            data_by_path: HashMap::default(),
            sampling: None,
            uncertain: Vec::new(),
        }
    }

    /// The value of an expression; names resolve through the parameters of the function being
    /// called, then `scope`, then the library.
    pub(crate) fn expression(
        &mut self,
        expression: &Expression,
        scope: &dyn Scope,
    ) -> Result<Value, Failure> {
        let span = expression.span;
        if self.sampling.is_some() {
            if let Some(what) = not_sampled(&expression.kind) {
                let error = EvalError::new(EvalErrorKind::NotWithSamples { what }, span);
                return Err(error.into());
            }
        }
        let value = match &expression.kind {
            ExpressionKind::Quantity { digits, unit } => {
                Value::Scalar(self.literal(digits, unit.as_ref(), span)?)
            }
            ExpressionKind::List { items, unit } => self.list(items, unit.as_ref(), span)?,
            ExpressionKind::Range(range) => self.range(range, span, scope)?,
            ExpressionKind::FileColumn {
                header,
                path,
                path_span,
            } => self.file_column(header, path, *path_span, span)?,
            ExpressionKind::Solve(solve) => self.solve(solve, span, scope)?,
            ExpressionKind::Fit(fit) => self.fit(fit, span, scope)?,
            ExpressionKind::Distribution(distribution) => {
                self.distribution(distribution, span, scope)?
            }
            ExpressionKind::Name(name) => self.name(name, span, scope)?,
            ExpressionKind::Call {
                function,
                arguments,
            } if scope.sheet_function(&function.text).is_some() => {
                self.call_sheet_function(function, arguments, span, scope)?
            }
            ExpressionKind::Call {
                function,
                arguments,
            } => self.call_builtin(function, arguments, span, scope)?,
            ExpressionKind::Negate(inner) => {
                let value = self.expression(inner, scope)?;
                crate::eval::columns::negate(value, span)
                    .map_err(|error| point_at_operand(error, inner))?
            }
            ExpressionKind::Binary {
                operator,
                left,
                right,
            } => {
                let left_value = self.expression(left, scope)?;
                let right_value = self.expression(right, scope)?;
                crate::eval::columns::combine(
                    *operator,
                    &left_value,
                    &right_value,
                    span,
                    right.span,
                )
                .map_err(|error| {
                    name_offset_operand(error, [(left, &left_value), (right, &right_value)])
                })?
            }
        };
        if let Value::Scalar(quantity) = &value {
            if !quantity.value.is_finite() {
                return Err(EvalError::new(EvalErrorKind::NotFinite, span).into());
            }
        }
        Ok(value)
    }

    /// An expression that must give one value (a range's ends, a tolerance, a bracket).
    pub(crate) fn scalar(
        &mut self,
        expression: &Expression,
        what: &'static str,
        scope: &dyn Scope,
    ) -> Result<Quantity, Failure> {
        match self.expression(expression, scope)? {
            Value::Scalar(quantity) => Ok(quantity),
            _ => Err(EvalError::new(EvalErrorKind::ScalarNeeded { what }, expression.span).into()),
        }
    }

    pub(super) fn name(
        &mut self,
        name: &str,
        span: Span,
        scope: &dyn Scope,
    ) -> Result<Value, Failure> {
        if let Some(parameters) = self.parameters.last() {
            if let Some((_, value)) = parameters.iter().find(|(parameter, _)| parameter == name) {
                return Ok(value.clone());
            }
        }
        if let Some(slot) = scope.lookup(name) {
            return match slot {
                Some(shown) => Ok(shown.value()),
                None => Err(Failure::Upstream(name.to_string())),
            };
        }
        if let Some(constant) = self.library.constant(name) {
            return Ok(Value::Scalar(constant.quantity));
        }
        let kind = if self.library.function(name).is_some() {
            EvalErrorKind::FunctionUsedAsValue {
                name: name.to_string(),
            }
        } else {
            EvalErrorKind::UnknownName {
                name: name.to_string(),
                suggestion: self.suggest(name, scope),
            }
        };
        Err(EvalError::new(kind, span).into())
    }

    /// The closest sheet or built-in name, for "did you mean".
    pub(super) fn suggest(&self, name: &str, scope: &dyn Scope) -> Option<String> {
        let mut defined = Vec::new();
        scope.for_each_defined(&mut |candidate| defined.push(candidate.to_string()));
        let library_names = self.library.names();
        let candidates = defined
            .iter()
            .map(String::as_str)
            .chain(library_names.iter().copied());
        crate::suggest::closest(name, candidates, 0.8).map(str::to_string)
    }

    pub(super) fn unit(&mut self, expression: &UnitExpression) -> Result<Unit, EvalError> {
        if let Some(unit) = self.unit_cache.get(expression.text.as_str()) {
            return Ok(unit.clone());
        }
        let unit = resolve_unit(expression)?;
        self.unit_cache
            .insert(expression.text.clone(), unit.clone());
        Ok(unit)
    }

    /// A line's value in its display unit: the expression evaluated, then shown.
    pub(crate) fn line_value(
        &mut self,
        expression: &Expression,
        declared: Option<&UnitExpression>,
        scope: &dyn Scope,
    ) -> Result<Shown, Failure> {
        let value = self.expression(expression, scope)?;
        self.shown(value, declared, expression, scope)
            .map_err(Failure::from)
    }

    /// Converts a value to its display unit: the declared one (checked), a literal's own unit,
    /// a bare name's line's unit, or the preferred SI unit.
    pub(crate) fn shown(
        &mut self,
        value: Value,
        declared: Option<&UnitExpression>,
        expression: &Expression,
        scope: &dyn Scope,
    ) -> Result<Shown, EvalError> {
        if let Some(unit_expression) = written_unit(expression, declared, scope) {
            let unit = self.unit(unit_expression)?;
            return present(
                value,
                Some((&unit, &unit_expression.text)),
                unit_expression.span,
            );
        }
        // A data-file column shows in its header's unit.
        if let ExpressionKind::FileColumn { header, path, .. } = &expression.kind {
            let table = match (
                self.data_files.get(&expression.span.start),
                self.data_by_path.get(path),
            ) {
                (Some(Ok(table)), _) | (None, Some(Ok(table))) => Some(table.clone()),
                _ => None,
            };
            let written = table.and_then(|table| {
                table
                    .column(&header.text)
                    .and_then(|column| column.unit.clone())
            });
            if let Some(text) = written {
                let unit = crate::syntax::parse_unit(&text)
                    .ok()
                    .and_then(|unit| resolve_unit(&unit).ok());
                if let Some(unit) = unit {
                    return present(value, Some((&unit, &text)), expression.span);
                }
            }
        }
        // A bare name (`y = x`, or `x` alone) shows in the unit its own line shows in, and a
        // solve's result in its unknown's.
        let like = match &expression.kind {
            ExpressionKind::Name(name) => Some(name),
            ExpressionKind::Solve(solve) => Some(&solve.unknown.text),
            ExpressionKind::Fit(fit) => fit.varying.first().map(|name| &name.text),
            _ => None,
        };
        if let Some(name) = like {
            if let Some(shown) = shown_like(&value, name, scope, expression.span) {
                return Ok(shown);
            }
        }
        present(value, None, expression.span)
    }

    /// The unit a check shows both sides in: the right side's if it has one of its own.
    pub(super) fn shown_for_check(
        &mut self,
        quantity: Quantity,
        sides: [&Expression; 2],
        scope: &dyn Scope,
    ) -> Result<ShownValue, EvalError> {
        let value = Value::Scalar(quantity);
        for side in sides {
            let shown = match &side.kind {
                ExpressionKind::Quantity { unit: Some(_), .. }
                | ExpressionKind::List { unit: Some(_), .. } => {
                    Some(self.shown(value.clone(), None, side, scope)?)
                }
                ExpressionKind::Name(name) => shown_like(&value, name, scope, side.span),
                _ => None,
            };
            if let Some(Shown::Scalar(shown)) = shown {
                return Ok(shown);
            }
        }
        Ok(ShownValue {
            quantity,
            unit: quantity.dimension.preferred_si_unit(),
            value: quantity.value,
        })
    }
}

/// What a sampled sheet cannot hold: columns of its own (their rows would be taken for
/// samples) and the lines that search over inputs.
fn not_sampled(kind: &ExpressionKind) -> Option<&'static str> {
    match kind {
        ExpressionKind::List { .. } => Some("a list"),
        ExpressionKind::Range(_) => Some("a range"),
        ExpressionKind::FileColumn { .. } => Some("a data-file column"),
        ExpressionKind::Solve(_) => Some("a `solve` line"),
        ExpressionKind::Fit(_) => Some("a `fit` line"),
        _ => None,
    }
}

/// A column made on this line (a list, a range, a data-file column) is named after the line, so that
/// errors about its rows and length say where it came from.
pub(crate) fn with_origin(shown: Shown, name: &str) -> Shown {
    match shown {
        Shown::Column(mut shown) if shown.column.origin.is_empty() => {
            shown.column.origin = Arc::from(name);
            Shown::Column(shown)
        }
        Shown::Labels(mut labels) if labels.origin.is_empty() => {
            labels.origin = Arc::from(name);
            Shown::Labels(labels)
        }
        other => other,
    }
}

/// `value` in the unit the line named `name` shows in, when that works (same dimension and
/// temperature rules).
pub(super) fn shown_like(
    value: &Value,
    name: &str,
    scope: &dyn Scope,
    span: Span,
) -> Option<Shown> {
    let Some(Some(line)) = scope.lookup(name) else {
        return None;
    };
    let text = line.unit();
    let expression = crate::syntax::parse_unit(text).ok()?;
    let unit = resolve_unit(&expression).ok()?;
    present(value.clone(), Some((&unit, text)), span).ok()
}

/// The unit written for a value: the declared one, a literal's or list's own, a range's start's,
/// or the result unit of the sheet function it calls.
pub(super) fn written_unit<'e>(
    expression: &'e Expression,
    declared: Option<&'e UnitExpression>,
    scope: &'e dyn Scope,
) -> Option<&'e UnitExpression> {
    if declared.is_some() {
        return declared;
    }
    match &expression.kind {
        ExpressionKind::Quantity { unit, .. } | ExpressionKind::List { unit, .. } => unit.as_ref(),
        ExpressionKind::Range(range) => written_unit(&range.from, None, scope),
        // A distribution shows in its first parameter's unit (`normal mean 0.9 m …` in m).
        ExpressionKind::Distribution(distribution) => distribution
            .parameters
            .first()
            .and_then(|first| written_unit(first, None, scope)),
        ExpressionKind::Call { function, .. } => scope
            .sheet_function(&function.text)
            .flatten()
            .and_then(|definition| definition.result_unit.as_ref()),
        _ => None,
    }
}

/// A value in a unit (`None`: the preferred SI unit), with the dimension and temperature rules
/// enforced once and every shown number checked to be finite.
pub(super) fn present(
    value: Value,
    unit: Option<(&Unit, &str)>,
    span: Span,
) -> Result<Shown, EvalError> {
    // An absolute temperature from an offset scale shows on that scale unless a unit is
    // asked for: `20 degC + 5 K` is 25 degC, not 298.2 K.
    let scale = match &value {
        Value::Scalar(quantity) => quantity.offset_scale(),
        Value::Column(column) => column.shape().offset_scale(),
        Value::Labels(_) => None,
    };
    let own_scale = match (unit, scale) {
        (None, Some(scale)) => Unit::lookup(scale.symbol())
            .ok()
            .map(|unit| (unit, scale.symbol())),
        _ => None,
    };
    // A dimension the trade states in a unit of its own (a solute's mass flux in
    // mg/(m^2*d)) shows in it, converted like a declared unit.
    let dimension = match &value {
        Value::Scalar(quantity) => Some(quantity.dimension),
        Value::Column(column) => Some(column.dimension),
        Value::Labels(_) => None,
    };
    let trade_text = dimension
        .filter(|dimension| unit.is_none() && own_scale.is_none() && !dimension.is_temperature())
        .map(|dimension| dimension.display_unit())
        .filter(|text| dimension.is_some_and(|dimension| *text != dimension.preferred_si_unit()));
    let trade_unit = trade_text.as_ref().and_then(|text| {
        let expression = crate::syntax::parse_unit(text).ok()?;
        resolve_unit(&expression)
            .ok()
            .map(|unit| (unit, text.as_str()))
    });
    let unit = match (&own_scale, &trade_unit) {
        (Some((unit, text)), _) => Some((unit, *text)),
        (None, Some((unit, text))) => Some((unit, *text)),
        (None, None) => unit,
    };
    match value {
        Value::Scalar(quantity) => Ok(Shown::Scalar(match unit {
            Some((unit, text)) => show_in(quantity, unit, text, span)?,
            None => ShownValue {
                quantity,
                unit: quantity.dimension.preferred_si_unit(),
                value: quantity.value,
            },
        })),
        Value::Column(column) => {
            let (unit_text, conversion) = match unit {
                Some((unit, text)) => {
                    show_in(column.shape(), unit, text, span)?;
                    (text.to_string(), Some(unit.clone()))
                }
                None => (column.dimension.preferred_si_unit(), None),
            };
            let shown = ShownColumn {
                column,
                unit: unit_text,
                conversion,
            };
            if let Some(row) = (0..shown.len()).find(|row| !shown.shown(*row).is_finite()) {
                let origin = shown.column.origin.to_string();
                return Err(EvalError::new(EvalErrorKind::NotFinite, span).in_row(row, &origin));
            }
            Ok(Shown::Column(Box::new(shown)))
        }
        Value::Labels(labels) => match unit {
            Some(_) => Err(EvalError::new(
                EvalErrorKind::TextInArithmetic {
                    origin: labels.origin.to_string(),
                },
                span,
            )),
            None => Ok(Shown::Labels(labels)),
        },
    }
}
pub(super) fn text_of(sources: &SourceMap, span: Span) -> String {
    sources.text_of(span).to_string()
}

/// Builds a unit from its written form. A lone absolute scale keeps its offset; anything
/// compound treats degrees as differences.
pub fn resolve_unit(expression: &UnitExpression) -> Result<Unit, EvalError> {
    let at = |error: UnitError, span: Span| match error {
        UnitError::Unknown {
            symbol,
            suggestions,
        } => EvalError::new(
            EvalErrorKind::UnknownUnit {
                symbol,
                suggestions,
            },
            span,
        ),
        UnitError::CaseOnly {
            symbol,
            reading,
            suggestion,
            suggestion_name,
        } => EvalError::new(
            EvalErrorKind::CaseOnlyUnit {
                symbol,
                reading,
                suggestion,
                suggestion_name,
            },
            span,
        ),
        UnitError::Ambiguous { symbol, choices } => {
            EvalError::new(EvalErrorKind::AmbiguousUnit { symbol, choices }, span)
        }
        UnitError::ExponentOverflow => EvalError::new(EvalErrorKind::ExponentOverflow, span),
    };
    match &expression.kind {
        UnitExpressionKind::Symbol(symbol) => {
            Unit::lookup(symbol).map_err(|error| at(error, expression.span))
        }
        UnitExpressionKind::One => Ok(Unit::dimensionless()),
        UnitExpressionKind::Product(left, right) => resolve_unit(left)?
            .multiply(&resolve_unit(right)?)
            .map_err(|error| at(error, expression.span)),
        UnitExpressionKind::Quotient(left, right) => resolve_unit(left)?
            .divide(&resolve_unit(right)?)
            .map_err(|error| at(error, expression.span)),
        UnitExpressionKind::Power {
            base,
            numerator,
            denominator,
        } => resolve_unit(base)?
            .power(Exponent::new(*numerator, *denominator))
            .map_err(|error| at(error, expression.span)),
    }
}

/// A quantity in a given unit, with the dimension and temperature rules enforced.
pub fn show_in(
    quantity: Quantity,
    unit: &Unit,
    unit_text: &str,
    span: Span,
) -> Result<ShownValue, EvalError> {
    if unit.dimension != quantity.dimension {
        return Err(EvalError::new(
            EvalErrorKind::DisplayUnitMismatch {
                unit: unit_text.to_string(),
                unit_dimension: unit.dimension,
                value_dimension: quantity.dimension,
            },
            span,
        ));
    }
    if unit.is_absolute_temperature() && quantity.is_temperature_difference() {
        return Err(EvalError::new(
            EvalErrorKind::DifferenceShownAsAbsolute {
                unit: unit_text.to_string(),
            },
            span,
        ));
    }
    if unit.temperature == TemperatureRole::Difference && quantity.is_absolute_temperature() {
        return Err(EvalError::new(
            EvalErrorKind::AbsoluteShownAsDifference {
                unit: unit_text.to_string(),
            },
            span,
        ));
    }
    refuse_below_absolute_zero(&quantity, unit.is_absolute_temperature(), span)?;
    let value = unit.from_si(quantity.value);
    if !value.is_finite() {
        return Err(EvalError::new(EvalErrorKind::NotFinite, span));
    }
    Ok(ShownValue {
        quantity,
        unit: unit_text.to_string(),
        value,
    })
}

#[cfg(test)]
mod tests {
    use super::resolve_unit;
    use crate::units::dimension::listed_display_units;
    use crate::units::Dimension;

    /// The unit `text` reads as, through the sheet's own unit parser.
    fn read_back(text: &str) -> crate::units::Unit {
        let expression = crate::syntax::parse_unit(text).unwrap_or_else(|_| panic!("`{text}`"));
        resolve_unit(&expression).unwrap_or_else(|_| panic!("`{text}` resolves"))
    }

    #[test]
    fn every_display_spelling_reads_back_as_its_dimension() {
        for (dimension, text) in listed_display_units() {
            let unit = read_back(text);
            assert_eq!(unit.dimension, dimension, "`{text}`");
            if text == dimension.preferred_si_unit() {
                assert_eq!(unit.factor.value(), 1.0, "`{text}` is coherent SI");
            }
        }
        // A solute flux of 1 mg/(m^2*d) in SI, by hand: 1e-6 kg / 86 400 s.
        let flux = read_back("mg/(m^2*d)");
        assert!((flux.factor.value() - 1e-6 / 86_400.0).abs() < 1e-25);
    }

    #[test]
    fn composed_spellings_read_back_as_their_dimension_in_si() {
        let mut state: u64 = 7;
        for _ in 0..2_000 {
            let mut powers = [0i32; 7];
            // Luminous intensity has no unit in the catalog (no sheet needs candela).
            for power in powers.iter_mut().take(6) {
                state = state
                    .wrapping_mul(6_364_136_223_846_793_005)
                    .wrapping_add(1);
                *power = ((state >> 33) % 7) as i32 - 3;
            }
            let dimension = Dimension::from_integers(powers);
            let text = dimension.composed_si_unit();
            let unit = read_back(&text);
            assert_eq!(unit.dimension, dimension, "`{text}`");
            assert_eq!(unit.factor.value(), 1.0, "`{text}`");
        }
    }
}
