//! Warnings: a second pass over a parsed sheet and its evaluation that finds what is legal but
//! probably unintended. It never changes a value; its findings join the evaluation's
//! diagnostics with `Severity::Warning`.
//!
//! The kinds, each with a stable code:
//!
//! - `unused-line`: a named line no other line uses and that is not displayed. A line counts as
//!   displayed when it declares a display unit (`name [unit] = …`) or is the last named or bare
//!   line of its section (a `##` heading starts a section; the lines before the first heading
//!   are one too). Checks and tolerances count as uses.
//! - `shadowed-builtin`: a sheet name equal to a built-in function or constant.
//! - `mixed-units`: a named or bare line whose literals mix SI/metric and US customary units
//!   and that declares no display unit (so the value silently shows in SI).
//! - `porosity-range`, `conductivity-range`, `water-temperature`: plausibility of common
//!   inputs, with ranges taken from common practice (see `PLAUSIBLE_*`).
//!
//! Warnings are only looked for on a sheet without errors: an error can hide a use or a value,
//! and the first job is to fix it.

use super::diagnostic::{Diagnostic, Severity};
use super::evaluate::{Evaluation, LineResult};
use super::function::Library;
use super::value::Value;
use crate::syntax::{
    Expression, ExpressionKind, Line, LineKind, Span, UnitExpression, UnitExpressionKind,
};
use crate::units::Dimension;
use std::collections::HashSet;

/// Porosity is a fraction of the bulk volume (common practice).
pub const PLAUSIBLE_POROSITY: (f64, f64) = (0.0, 1.0);
/// Hydraulic conductivity of natural ground, unfractured clay to clean gravel, in m/s (common
/// practice).
pub const PLAUSIBLE_CONDUCTIVITY: (f64, f64) = (1e-13, 1.0);
/// Liquid groundwater at near-atmospheric pressure, 0 to 100 °C, in kelvin (common practice).
pub const PLAUSIBLE_WATER_TEMPERATURE: (f64, f64) = (273.15, 373.15);

/// Functions citing a formulation whose id starts with this take the temperature of water; the
/// brine correlations (the high-temperature formulations, fitted for reservoir conditions) do
/// not, so they are not flagged.
const WATER_FORMULATION_PREFIX: &str = "iapws-";

/// Unit symbols of US customary (and imperial-derived oilfield) measure. Time, angles and
/// plain ratios belong to no system; every other catalog unit counts as SI or metric.
const US_CUSTOMARY: &[&str] = &[
    "ft",
    "in",
    "yd",
    "mi",
    "acre",
    "gal",
    "bbl",
    "gpm",
    "lb",
    "lbf",
    "psi",
    "ftH2O",
    "inH2O",
    "BTU",
    "Btu",
    "hp",
    "degF",
    "°F",
    "degR",
    "°R",
    "delta_degF",
];
const NO_SYSTEM: &[&str] = &[
    "s", "min", "h", "d", "wk", "yr", "Hz", "%", "ppm", "ppb", "rad", "deg", "°",
];

/// Turns every warning into an error (`--deny-warnings`), saying so in its message.
pub fn deny_warnings(evaluation: &mut Evaluation) {
    for diagnostic in &mut evaluation.diagnostics {
        if diagnostic.severity == Severity::Warning {
            diagnostic.severity = Severity::Error;
            diagnostic.message = format!(
                "{} (a warning, made an error by --deny-warnings)",
                diagnostic.message
            );
        }
    }
}

/// How many diagnostics are warnings.
pub fn warning_count(evaluation: &Evaluation) -> usize {
    evaluation
        .diagnostics
        .iter()
        .filter(|diagnostic| diagnostic.severity == Severity::Warning)
        .count()
}

/// All warnings of an evaluated sheet; `lines` are the main sheet's, which `evaluation` lists.
pub fn sheet_warnings(
    lines: &[Line],
    evaluation: &Evaluation,
    library: &dyn Library,
) -> Vec<Diagnostic> {
    let mut warnings = Vec::new();
    unused_lines(lines, evaluation, &mut warnings);
    for line in lines {
        shadowed_builtin(line, library, &mut warnings);
        mixed_units(line, &mut warnings);
    }
    for (line, outcome) in lines.iter().zip(&evaluation.lines) {
        if let (LineKind::Definition(definition), LineResult::Value(shown)) =
            (&line.kind, &outcome.result)
        {
            let span = definition.name.span.to(definition.expression.span);
            plausible_value(&definition.name.text, &shown.value(), span, &mut warnings);
        }
    }
    water_temperatures(evaluation, library, &mut warnings);
    warnings
}

fn unused_lines(lines: &[Line], evaluation: &Evaluation, warnings: &mut Vec<Diagnostic>) {
    let mut used: HashSet<&str> = HashSet::new();
    for line in lines {
        let expressions: Vec<&Expression> = match &line.kind {
            LineKind::Definition(definition) => vec![&definition.expression],
            LineKind::Function(function) => vec![&function.body],
            LineKind::Display(display) => vec![&display.expression],
            LineKind::Check(check) => {
                let mut sides = vec![&check.left, &check.right];
                sides.extend(check.tolerance.as_ref());
                sides
            }
            LineKind::Plot(plot) => {
                for name in plot.series.iter().chain([&plot.against]) {
                    used.insert(name.text.as_str());
                }
                Vec::new()
            }
            _ => Vec::new(),
        };
        for expression in expressions {
            expression.for_each_name(&mut |name, _| {
                used.insert(name);
            });
        }
    }
    // The last result-bearing line of each section is the section's answer.
    let mut last_of_section: HashSet<usize> = HashSet::new();
    let mut last: Option<usize> = None;
    for (index, line) in lines.iter().enumerate() {
        match &line.kind {
            LineKind::Heading(_) => {
                last_of_section.extend(last.take());
            }
            LineKind::Definition(_) | LineKind::Display(_) => last = Some(index),
            _ => {}
        }
    }
    last_of_section.extend(last);
    for (index, (line, outcome)) in lines.iter().zip(&evaluation.lines).enumerate() {
        let LineKind::Definition(definition) = &line.kind else {
            continue;
        };
        let name = definition.name.text.as_str();
        let displayed = definition.display_unit.is_some() || last_of_section.contains(&index);
        // A column of text (sample names) is there to label the column table's rows.
        let labels = matches!(outcome.result, LineResult::Value(super::Shown::Labels(_)));
        if used.contains(name)
            || displayed
            || labels
            || !matches!(outcome.result, LineResult::Value(_))
        {
            continue;
        }
        warnings.push(
            Diagnostic::warning(
                format!("`{name}` is never used and not displayed"),
                definition.name.span,
            )
            .with_code("unused-line")
            .with_help(Some(format!(
                "use it in another line or a check, show it with a unit (`{name} [unit] = …`), \
or remove it"
            ))),
        );
    }
}

fn shadowed_builtin(line: &Line, library: &dyn Library, warnings: &mut Vec<Diagnostic>) {
    let LineKind::Definition(definition) = &line.kind else {
        return;
    };
    let name = definition.name.text.as_str();
    let described = if let Some(constant) = library.constant(name) {
        Some(format!(
            "the built-in constant `{name}` ({}); on this sheet `{name}` means this line",
            constant.summary
        ))
    } else {
        library.function(name).map(|function| {
            format!(
                "the built-in function `{}`; calls still reach the built-in, the bare name \
means this line",
                function.signature()
            )
        })
    };
    if let Some(described) = described {
        warnings.push(
            Diagnostic::warning(
                format!("`{name}` shadows {described}"),
                definition.name.span,
            )
            .with_code("shadowed-builtin")
            .with_help(Some(format!(
                "rename it (e.g. `{name}_1` or a more specific name)"
            ))),
        );
    }
}

#[derive(Default)]
struct Systems {
    metric: bool,
    us_customary: bool,
}

fn collect_systems(expression: &Expression, systems: &mut Systems) {
    match &expression.kind {
        ExpressionKind::Quantity {
            unit: Some(unit), ..
        } => unit_systems(unit, systems),
        ExpressionKind::List {
            unit: Some(unit), ..
        } => unit_systems(unit, systems),
        ExpressionKind::Quantity { unit: None, .. }
        | ExpressionKind::List { unit: None, .. }
        | ExpressionKind::FileColumn { .. }
        | ExpressionKind::Name(_) => {}
        ExpressionKind::Range(range) => {
            for part in range.parts() {
                collect_systems(part, systems);
            }
        }
        ExpressionKind::Solve(solve) => {
            for part in [&solve.goal, &solve.lower, &solve.upper] {
                collect_systems(part, systems);
            }
        }
        ExpressionKind::Call { arguments, .. } => {
            for argument in arguments {
                collect_systems(argument, systems);
            }
        }
        ExpressionKind::Negate(inner) => collect_systems(inner, systems),
        ExpressionKind::Binary { left, right, .. } => {
            collect_systems(left, systems);
            collect_systems(right, systems);
        }
    }
}

fn unit_systems(unit: &UnitExpression, systems: &mut Systems) {
    match &unit.kind {
        UnitExpressionKind::Symbol(symbol) => {
            if US_CUSTOMARY.contains(&symbol.as_str()) {
                systems.us_customary = true;
            } else if !NO_SYSTEM.contains(&symbol.as_str()) {
                systems.metric = true;
            }
        }
        UnitExpressionKind::One => {}
        UnitExpressionKind::Product(left, right) | UnitExpressionKind::Quotient(left, right) => {
            unit_systems(left, systems);
            unit_systems(right, systems);
        }
        UnitExpressionKind::Power { base, .. } => unit_systems(base, systems),
    }
}

fn mixed_units(line: &Line, warnings: &mut Vec<Diagnostic>) {
    let (expression, declared, label) = match &line.kind {
        LineKind::Definition(definition) => (
            &definition.expression,
            definition.display_unit.is_some(),
            format!("`{}`", definition.name.text),
        ),
        LineKind::Display(display) => (
            &display.expression,
            display.display_unit.is_some(),
            "this line".to_string(),
        ),
        _ => return,
    };
    if declared {
        return;
    }
    let mut systems = Systems::default();
    collect_systems(expression, &mut systems);
    if systems.metric && systems.us_customary {
        let hint = match &line.kind {
            LineKind::Definition(definition) => format!("`{} [unit] = …`", definition.name.text),
            _ => "`… [unit]`".to_string(),
        };
        warnings.push(
            Diagnostic::warning(
                format!(
                    "{label} mixes SI/metric and US customary units but declares no display unit"
                ),
                expression.span,
            )
            .with_code("mixed-units")
            .with_help(Some(format!(
                "say which unit the result is wanted in: {hint}"
            ))),
        );
    }
}

/// Porosity names: `n`, `ne`, `n_e`, `n_eff`, `n_tot`, and any name starting with `phi`, `φ`
/// or `porosity` or ending in `_porosity` (case-insensitive).
pub fn is_porosity_name(name: &str) -> bool {
    let lower = name.to_lowercase();
    matches!(lower.as_str(), "n" | "ne" | "n_e" | "n_eff" | "n_tot")
        || lower.starts_with("phi")
        || lower.starts_with('φ')
        || lower.starts_with("porosity")
        || lower.ends_with("_porosity")
}

/// Hydraulic-conductivity names: a capital `K` first (`K`, `K_A`, `Ksat`); the value must also
/// have the dimension of a velocity.
pub fn is_conductivity_name(name: &str) -> bool {
    name.starts_with('K')
}

/// The first value of a scalar or column outside `low..=high`, and its row (1-based) in a
/// column, as message text: `= 1.2` or `= 1.2 in row 3`.
fn first_outside(value: &Value, low: f64, high: f64) -> Option<(f64, String)> {
    match value {
        Value::Scalar(quantity) => {
            (!(low..=high).contains(&quantity.value)).then(|| (quantity.value, String::new()))
        }
        Value::Column(column) => column
            .values
            .iter()
            .position(|value| !(low..=high).contains(value))
            .map(|row| (column.values[row], format!(" in row {}", row + 1))),
        Value::Labels(_) => None,
    }
}

fn plausible_value(name: &str, value: &Value, span: Span, warnings: &mut Vec<Diagnostic>) {
    let velocity = Dimension::from_integers([1, 0, -1, 0, 0, 0, 0]);
    let Some(dimension) = value.dimension() else {
        return;
    };
    if dimension.is_dimensionless() && is_porosity_name(name) {
        let (low, high) = PLAUSIBLE_POROSITY;
        if let Some((value, row)) = first_outside(value, low, high) {
            warnings.push(
                Diagnostic::warning(
                    format!(
                        "porosity `{name}` = {}{row} is outside {low} to {high} (common practice)",
                        short(value)
                    ),
                    span,
                )
                .with_code("porosity-range")
                .with_help(Some(
                    "a porosity is a fraction of the bulk volume: write `0.28` or `28 %`"
                        .to_string(),
                )),
            );
        }
    } else if dimension == velocity && is_conductivity_name(name) {
        let (low, high) = PLAUSIBLE_CONDUCTIVITY;
        if let Some((value, row)) = first_outside(value, low, high) {
            warnings.push(
                Diagnostic::warning(
                    format!(
                        "hydraulic conductivity `{name}` = {} m/s{row} is outside {low:e} to {high} m/s \
(common practice: unfractured clay to clean gravel)",
                        short(value)
                    ),
                    span,
                )
                .with_code("conductivity-range")
                .with_help(Some(
                    "check the input's unit (m/s, cm/s, m/d, ft/d) and its exponent".to_string(),
                )),
            );
        }
    }
}

/// Temperatures passed to the water (IAPWS) functions: liquid groundwater is 0 to 100 °C.
fn water_temperatures(
    evaluation: &Evaluation,
    library: &dyn Library,
    warnings: &mut Vec<Diagnostic>,
) {
    let (low, high) = PLAUSIBLE_WATER_TEMPERATURE;
    let mut seen: HashSet<Span> = HashSet::new();
    for call in &evaluation.calls {
        let Some(function) = library.function(&call.function) else {
            continue;
        };
        let takes_water = function
            .formulations()
            .iter()
            .any(|formulation| formulation.id.starts_with(WATER_FORMULATION_PREFIX));
        if !takes_water {
            continue;
        }
        for (span, argument) in &call.arguments {
            if !argument
                .dimension()
                .is_some_and(|dimension| dimension.is_temperature())
            {
                continue;
            }
            let Some((kelvin, row)) = first_outside(argument, low, high) else {
                continue;
            };
            if seen.insert(*span) {
                warnings.push(
                    Diagnostic::warning(
                        format!(
                            "water at {} degC{row} passed to `{}` is outside 0 to 100 degC (common \
practice for groundwater)",
                            short(kelvin - 273.15),
                            call.function
                        ),
                        *span,
                    )
                    .with_code("water-temperature")
                    .with_help(Some(
                        "check the temperature's unit (degC, degF, K); for hot reservoir water \
use the brine functions, the high-temperature formulations (S = 0 for fresh water)"
                            .to_string(),
                    )),
                );
            }
        }
    }
}

/// A value for a message, rounded to four significant figures: `28`, `0.2801`, `2e-14`.
pub(crate) fn short(value: f64) -> String {
    let rounded: f64 = format!("{value:.3e}").parse().unwrap_or(value);
    let magnitude = rounded.abs();
    if magnitude == 0.0 || (1e-4..1e6).contains(&magnitude) {
        format!("{rounded}")
    } else {
        format!("{rounded:e}")
    }
}
