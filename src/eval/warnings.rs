//! Warnings: a second pass over a parsed sheet and its evaluation that finds what is legal but
//! probably unintended. It never changes a value; its findings join the evaluation's
//! diagnostics with `Severity::Warning`.
//!
//! The kinds, each with a stable code:
//!
//! - `unused-line`: an input no other line or check uses, the likely trace of a typo'd name or a
//!   forgotten input. An input is a line made of literals only (`k = 420 mD`); a line that names
//!   another line or calls a function computes a result, which the table shows, and is never
//!   warned. Checks, tolerances and plots count as uses. A display unit keeps an input
//!   deliberately (`k_spare [mD] = 420 mD`). A sheet where no line computes is a list of values
//!   and gets none.
//! - `shadowed-builtin`: a sheet name equal to a built-in function or constant.
//! - `mixed-units`: a named or bare line whose literals mix SI/metric and US customary units
//!   and that declares no display unit (so the value silently shows in SI).
//! - `porosity-range`, `conductivity-range`: plausibility of common inputs, with ranges taken
//!   from common practice (see `PLAUSIBLE_*`). Water temperatures need no warning: the water
//!   functions refuse ice, and steam at any pressure the sheet does not give (their refusal
//!   says which pressure keeps the water liquid).
//! - `angle-in-radians`: a plain number beyond a full turn (2π) in `sin`, `cos` or `tan`,
//!   most likely degrees written without `deg`.
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
use rustc_hash::{FxHashMap as HashMap, FxHashSet as HashSet};

/// Porosity is a fraction of the bulk volume (common practice).
pub const PLAUSIBLE_POROSITY: (f64, f64) = (0.0, 1.0);
/// Hydraulic conductivity of natural ground, unfractured clay to clean gravel, in m/s (common
/// practice).
pub const PLAUSIBLE_CONDUCTIVITY: (f64, f64) = (1e-13, 1.0);
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
    angles_in_radians(lines, evaluation, &mut warnings);
    for line in lines {
        shadowed_builtin(line, library, &mut warnings);
        mixed_units(line, &mut warnings);
        unit_precedence(line, &mut warnings);
    }
    for (line, outcome) in lines.iter().zip(&evaluation.lines) {
        if let (LineKind::Definition(definition), LineResult::Value(shown)) =
            (&line.kind, &outcome.result)
        {
            let span = definition.name.span.to(definition.expression.span);
            plausible_value(&definition.name.text, &shown.value(), span, &mut warnings);
        }
    }
    warnings
}

fn unused_lines(lines: &[Line], evaluation: &Evaluation, warnings: &mut Vec<Diagnostic>) {
    let mut used: HashSet<&str> = HashSet::default();
    for line in lines {
        if let LineKind::Plot(plot) = &line.kind {
            for name in plot.series.iter().chain([&plot.against]) {
                used.insert(name.text.as_str());
            }
        }
        for expression in line.expressions() {
            expression.for_each_name(&mut |name, _| {
                used.insert(name);
            });
        }
    }
    // A sheet of inputs alone is a list of values (a conversion, a data table), not a
    // calculation that forgot one of them.
    let computes = lines.iter().any(|line| match &line.kind {
        LineKind::Definition(definition) => !is_input(&definition.expression),
        LineKind::Display(display) => !is_input(&display.expression),
        _ => false,
    });
    if !computes {
        return;
    }
    for (line, outcome) in lines.iter().zip(&evaluation.lines) {
        let LineKind::Definition(definition) = &line.kind else {
            continue;
        };
        let name = definition.name.text.as_str();
        // A column of text (sample names) is there to label the column table's rows.
        let labels = matches!(outcome.result, LineResult::Value(super::Shown::Labels(_)));
        if used.contains(name)
            || definition.display_unit.is_some()
            || labels
            || !is_input(&definition.expression)
            || !matches!(outcome.result, LineResult::Value(_))
        {
            continue;
        }
        let written = evaluation.sources.text_of(definition.expression.span);
        let unit = first_unit(&definition.expression).unwrap_or("1");
        warnings.push(
            Diagnostic::warning(
                format!("input `{name}` is used by no line or check"),
                definition.name.span,
            )
            .with_code("unused-line")
            .with_help(Some(format!(
                "use it in a line or a check, or remove it; to keep `{name}` as a shown input, \
write `{name} [{unit}] = {written}`"
            ))),
        );
    }
}

/// An input is a line made of literals only (`k = 420 mD`, `T = 0 degC to 40 degC step 5 K`,
/// a data-file column): it names no other line and calls no function. Any other line computes
/// a result, which the table shows whether or not another line uses it.
fn is_input(expression: &Expression) -> bool {
    let mut computes = false;
    expression.for_each_name(&mut |_, _| computes = true);
    expression.for_each_call(&mut |_, _| computes = true);
    !computes
}

/// The first unit written in an expression, as written (`mD` in `420 mD`).
fn first_unit(expression: &Expression) -> Option<&str> {
    match &expression.kind {
        ExpressionKind::Quantity {
            unit: Some(unit), ..
        }
        | ExpressionKind::List {
            unit: Some(unit), ..
        } => Some(unit.text.as_str()),
        ExpressionKind::Range(range) => range.parts().into_iter().find_map(first_unit),
        ExpressionKind::Distribution(distribution) => {
            distribution.parameters.iter().find_map(first_unit)
        }
        ExpressionKind::Negate(inner) => first_unit(inner),
        ExpressionKind::Binary { left, right, .. } => {
            first_unit(left).or_else(|| first_unit(right))
        }
        _ => None,
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
    expression.for_each_subexpression(&mut |part| {
        if let ExpressionKind::Quantity {
            unit: Some(unit), ..
        }
        | ExpressionKind::List {
            unit: Some(unit), ..
        } = &part.kind
        {
            unit_systems(unit, systems);
        }
    });
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
    let (expression, declared) = match &line.kind {
        LineKind::Definition(definition) => {
            (&definition.expression, definition.display_unit.is_some())
        }
        LineKind::Display(display) => (&display.expression, display.display_unit.is_some()),
        _ => return,
    };
    if declared {
        return;
    }
    let mut systems = Systems::default();
    collect_systems(expression, &mut systems);
    if systems.metric && systems.us_customary {
        let label = match &line.kind {
            LineKind::Definition(definition) => format!("`{}`", definition.name.text),
            _ => "this line".to_string(),
        };
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
                        crate::numeric::message_number(value)
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
                        crate::numeric::message_number(value)
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

/// `sin(30)`: a plain number beyond a full turn (2π) in `sin`, `cos` or `tan` is most likely
/// degrees written without `deg`. An argument that writes an angle unit anywhere (`30 deg`,
/// `7 rad`, `15 deg/h * t`), directly or through the lines it names, says which is meant.
fn angles_in_radians(lines: &[Line], evaluation: &Evaluation, warnings: &mut Vec<Diagnostic>) {
    let definitions: HashMap<&str, &Expression> = lines
        .iter()
        .filter_map(|line| match &line.kind {
            LineKind::Definition(definition) => {
                Some((definition.name.text.as_str(), &definition.expression))
            }
            _ => None,
        })
        .collect();
    let full_turn = std::f64::consts::TAU;
    let mut seen: HashSet<Span> = HashSet::default();
    for expression in lines.iter().flat_map(Line::expressions) {
        expression.for_each_subexpression(&mut |node| {
            let ExpressionKind::Call {
                function,
                arguments,
            } = &node.kind
            else {
                return;
            };
            let [argument] = arguments.as_slice() else {
                return;
            };
            if !TRIGONOMETRY.contains(&function.text.as_str())
                || writes_angle_unit(argument, &definitions, &mut HashSet::default())
            {
                return;
            }
            let passed = evaluation
                .calls
                .iter()
                .filter_map(|call| call.arguments.first())
                .filter(|(span, _)| *span == argument.span)
                .find_map(|(_, value)| first_outside(value, -full_turn, full_turn));
            let Some((value, row)) = passed else {
                return;
            };
            if !seen.insert(argument.span) {
                return;
            }
            let name = &function.text;
            let number = crate::numeric::message_number(value);
            let written = evaluation.sources.text_of(argument.span);
            let suggestion = match &argument.kind {
                ExpressionKind::Quantity { unit: None, .. } => format!("`{name}({written} deg)`"),
                ExpressionKind::Name(line) => match definitions.get(line.as_str()) {
                    Some(defined)
                        if matches!(defined.kind, ExpressionKind::Quantity { unit: None, .. }) =>
                    {
                        format!(
                            "`{line} = {} deg`",
                            evaluation.sources.text_of(defined.span)
                        )
                    }
                    _ => format!("`{name}({written} * 1 deg)`"),
                },
                _ => format!("`{name}(({written}) * 1 deg)`"),
            };
            warnings.push(
                Diagnostic::warning(
                    format!(
                        "`{name}` of the plain number {number}{row} reads it as {number} radians, \
more than a full turn"
                    ),
                    argument.span,
                )
                .with_code("angle-in-radians")
                .with_help(Some(format!(
                    "did you mean {suggestion}? a number without a unit is in radians; write \
`rad` if radians are meant"
                ))),
            );
        });
    }
}

/// The functions of an angle.
const TRIGONOMETRY: &[&str] = &["sin", "cos", "tan"];

/// Units that say a number is an angle.
const ANGLE_UNITS: &[&str] = &["rad", "deg", "°"];

/// The expressions of a line that are evaluated.
/// `W/m*K` reads as W·K/m, since `*` and `/` bind left to right; the trade usually means
/// W/(m·K). Warns on every unit written with a `*` after a `/` outside parentheses.
fn unit_precedence(line: &Line, warnings: &mut Vec<Diagnostic>) {
    let mut units: Vec<&UnitExpression> = Vec::new();
    if let LineKind::Definition(definition) = &line.kind {
        units.extend(definition.display_unit.as_ref());
    }
    if let LineKind::Display(display) = &line.kind {
        units.extend(display.display_unit.as_ref());
    }
    for expression in line.expressions() {
        expression.for_each_subexpression(&mut |part| {
            if let ExpressionKind::Quantity {
                unit: Some(unit), ..
            }
            | ExpressionKind::List {
                unit: Some(unit), ..
            } = &part.kind
            {
                units.push(unit);
            }
        });
    }
    for unit in units {
        if let Some(meant) = meant_denominator(&unit.text) {
            warnings.push(
                Diagnostic::warning(
                    format!(
                        "`{}` is read as ({})*{}: a `*` after a `/` multiplies, it does not divide",
                        unit.text,
                        &unit.text[..unit.text.rfind('*').unwrap_or(0)],
                        &unit.text[unit.text.rfind('*').map_or(0, |star| star + 1)..]
                    ),
                    unit.span,
                )
                .with_code("unit-precedence")
                .with_help(Some(format!(
                    "if the whole is the denominator, write `{meant}`; to keep it as it is, write the \
numerator first (`W*K/m`)"
                ))),
            );
        }
    }
}

/// `W/m*K` -> `W/(m*K)`: the unit as probably meant, when a `*` follows a `/` at the top level.
fn meant_denominator(text: &str) -> Option<String> {
    let mut depth = 0;
    let mut slash = None;
    for (index, character) in text.char_indices() {
        match character {
            '(' => depth += 1,
            ')' => depth -= 1,
            '/' if depth == 0 && slash.is_none() => slash = Some(index),
            '*' | '·' | '⋅' if depth == 0 && slash.is_some() => {
                let slash = slash?;
                return Some(format!("{}/({})", &text[..slash], &text[slash + 1..]));
            }
            _ => {}
        }
    }
    None
}

/// Whether an angle unit is written in `expression` or in the lines it names. A name that is
/// not a line of this sheet (an included line, a function parameter) might be an angle: it
/// counts as one, so that no warning rests on a guess.
fn writes_angle_unit<'a>(
    expression: &'a Expression,
    definitions: &HashMap<&str, &'a Expression>,
    visited: &mut HashSet<&'a str>,
) -> bool {
    let mut angle = false;
    expression.for_each_subexpression(&mut |node| match &node.kind {
        ExpressionKind::Quantity {
            unit: Some(unit), ..
        }
        | ExpressionKind::List {
            unit: Some(unit), ..
        } => angle |= unit_is_angle(unit),
        ExpressionKind::Name(name) if visited.insert(name.as_str()) => {
            angle |= match definitions.get(name.as_str()) {
                Some(defined) => writes_angle_unit(defined, definitions, visited),
                None => true,
            };
        }
        ExpressionKind::FileColumn { .. } => angle = true,
        _ => {}
    });
    angle
}

fn unit_is_angle(unit: &UnitExpression) -> bool {
    match &unit.kind {
        UnitExpressionKind::Symbol(symbol) => ANGLE_UNITS.contains(&symbol.as_str()),
        UnitExpressionKind::One => false,
        UnitExpressionKind::Product(left, right) | UnitExpressionKind::Quotient(left, right) => {
            unit_is_angle(left) || unit_is_angle(right)
        }
        UnitExpressionKind::Power { base, .. } => unit_is_angle(base),
    }
}
