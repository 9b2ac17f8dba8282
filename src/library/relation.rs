//! A relation is one declarative entry: its name, its parameters (name, meaning, dimension,
//! physical domain, optional default), its result, the formulations it evaluates with their
//! validity ranges, an example call, and a body over plain SI numbers.
//!
//! Everything around the body is done here, once, from the entry: the argument count, each
//! dimension, each domain, each validity range, the provenance record, the signature shown in
//! listings and hints, and the column kernel of the fast path (the body itself, with the same
//! checks on every row, made over whole column spans first). A body therefore never checks a single parameter; it checks only
//! what involves several (a radius of influence beyond the well, a head that falls) and returns
//! the value.
//!
//! A relation may have several forms when the dimension of an argument says which formula is
//! meant (`hydraulic_conductivity(k, T)` for water or `(k, rho, mu)` for any fluid): the first
//! form whose argument count and dimensions match is used.

use crate::eval::function::{CallError, ColumnKernel, FormulaUse, RowFailure, Rows, ValidRange};
use crate::eval::{Formulation, Function, Provenance, Quantity};
use crate::units::{Dimension, Unit};

/// The body of a relation: checked SI arguments in parameter order (defaults filled in), the
/// SI result.
pub type Body = fn(&[f64]) -> Result<f64, CallError>;

/// What values a parameter takes beyond its dimension.
///
/// `repr(u8)` keeps the variant in a plain first byte, so the check on every row of a column
/// reads one byte rather than decoding a niche inside a bounded domain's fields.
#[derive(Debug, Clone, Copy, PartialEq)]
#[repr(u8)]
pub enum Domain {
    /// Any finite value: a gradient, a pumping rate (negative for injection), a drawdown.
    Any,
    /// Above zero.
    Positive,
    /// Zero or above.
    NonNegative,
    /// A volume fraction in (0, 1]: porosity, storativity, a tortuosity factor.
    Fraction,
    /// In (0, 1), where 1 has no meaning (no grains left at a porosity of 1).
    OpenFraction,
    /// An absolute temperature: not a difference, not below absolute zero.
    AbsoluteTemperature,
    /// Bounds of the quantity itself, as data: a Poisson's ratio in [0, 0.5).
    Within(Interval),
}

/// The bounds of a `Domain::Within`, in SI, each included or not, with the unit the message
/// and listings state them in (`""` for a plain number).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Interval {
    pub low: f64,
    pub low_included: bool,
    pub high: f64,
    pub high_included: bool,
    pub unit: &'static str,
}

impl Domain {
    /// Strictly below `high` (SI), with no lower bound: `(-inf, high)`.
    pub const fn below(high: f64, unit: &'static str) -> Domain {
        Domain::Within(Interval {
            low: f64::NEG_INFINITY,
            low_included: false,
            high,
            high_included: false,
            unit,
        })
    }

    /// From `low` (included) to `high` (included), SI: `[low, high]`.
    pub const fn between(low: f64, high: f64, unit: &'static str) -> Domain {
        Domain::Within(Interval {
            low,
            low_included: true,
            high,
            high_included: true,
            unit,
        })
    }

    /// From `low` (included) to below `high` (excluded), SI: `[low, high)`.
    pub const fn from_up_to_below(low: f64, high: f64, unit: &'static str) -> Domain {
        Domain::Within(Interval {
            low,
            low_included: true,
            high,
            high_included: false,
            unit,
        })
    }
}

impl Interval {
    #[inline]
    fn admits(&self, value: f64) -> bool {
        let above_low = if self.low_included {
            value >= self.low
        } else {
            value > self.low
        };
        let below_high = if self.high_included {
            value <= self.high
        } else {
            value < self.high
        };
        above_low && below_high
    }

    /// `[0, 0.5)`, `(-inf, 2 m)`, in the interval's unit.
    fn describe(&self) -> String {
        let in_unit = |si: f64| {
            if si.is_infinite() {
                if si < 0.0 { "-inf" } else { "inf" }.to_string()
            } else {
                let shown = Unit::lookup(self.unit).map_or(si, |unit| unit.from_si(si));
                crate::numeric::message_number(shown)
            }
        };
        let open = if self.low_included { '[' } else { '(' };
        let close = if self.high_included { ']' } else { ')' };
        let unit = if self.unit.is_empty() {
            String::new()
        } else {
            format!(" {}", self.unit)
        };
        format!(
            "{open}{}, {}{close}{unit}",
            in_unit(self.low),
            in_unit(self.high)
        )
    }
}

/// One parameter of a relation.
#[derive(Debug)]
pub struct Parameter {
    pub name: &'static str,
    /// What it is, with its article: "a hydraulic conductivity", "an effective porosity".
    pub meaning: &'static str,
    pub dimension: Dimension,
    pub domain: Domain,
    /// The SI value used when the argument is left out (trailing parameters only).
    pub default: Option<f64>,
    /// A pressure of liquid water: at or above the saturation pressure at the form's absolute
    /// temperature. The formulation checks it on every call; the flag lets a column prove it
    /// once for all its rows from the hottest row.
    pub liquid_water_pressure: bool,
}

impl Parameter {
    pub const fn new(
        name: &'static str,
        meaning: &'static str,
        dimension: Dimension,
        domain: Domain,
    ) -> Parameter {
        Parameter {
            name,
            meaning,
            dimension,
            domain,
            default: None,
            liquid_water_pressure: false,
        }
    }

    /// `K: a hydraulic conductivity, a velocity (m/s), 0 or more`.
    pub fn describe(&self) -> String {
        let domain = match self.domain {
            Domain::Any => String::new(),
            Domain::Positive => ", above 0".to_string(),
            Domain::NonNegative => ", 0 or more".to_string(),
            Domain::Fraction => ", in (0, 1]".to_string(),
            Domain::OpenFraction => ", in (0, 1)".to_string(),
            Domain::AbsoluteTemperature => ", absolute".to_string(),
            Domain::Within(interval) => format!(", in {}", interval.describe()),
        };
        let default = match self.default {
            Some(value) => match self.dimension.preferred_si_unit().as_str() {
                "1" => format!("; {} when left out", crate::numeric::message_number(value)),
                unit => format!(
                    "; {} {unit} when left out",
                    crate::numeric::message_number(value)
                ),
            },
            None => String::new(),
        };
        format!(
            "{}: {}, {}{domain}{default}",
            self.name,
            self.meaning,
            self.dimension.phrase()
        )
    }

    /// The same parameter, marked as the pressure of liquid water (see `liquid_water_pressure`).
    pub const fn of_liquid_water(mut self) -> Parameter {
        self.liquid_water_pressure = true;
        self
    }

    /// The same parameter, optional, with `value` (SI) when left out.
    pub const fn or(mut self, value: f64) -> Parameter {
        self.default = Some(value);
        self
    }
}

/// One formula of a relation, chosen by its arguments' count and dimensions.
#[derive(Debug)]
pub struct Form {
    pub parameters: &'static [Parameter],
    pub result: Dimension,
    /// The unit a result is usually stated in, for listings (`m/s`).
    pub unit: &'static str,
    pub formulations: &'static [&'static Formulation],
    /// The formula in the sheet's operators over the parameters' names (`q = K * i`), shown in
    /// listings and in the working, where each parameter name is replaced by the call's value.
    /// Where a formulation has no short closed form, the property it evaluates and its
    /// arguments (`rho = 1 / (dg/dp)(T, p)`).
    pub formula: &'static str,
    /// A call that works, shown in listings and walked by the generic test.
    pub example: &'static str,
    pub body: Body,
}

/// A built-in relation: one entry in its family's table.
#[derive(Debug)]
pub struct Relation {
    pub name: &'static str,
    pub summary: &'static str,
    pub forms: &'static [Form],
}

/// The most arguments a relation takes; kernels keep a row's arguments on the stack.
const MOST_PARAMETERS: usize = 8;

impl Form {
    fn required(&self) -> usize {
        self.parameters
            .iter()
            .take_while(|parameter| parameter.default.is_none())
            .count()
    }

    /// `(k, T[, p])`: each optional parameter in brackets.
    fn parameter_list(&self) -> String {
        let required = self.required();
        let mut text = String::from("(");
        for (index, parameter) in self.parameters.iter().enumerate() {
            let separator = if index == 0 { "" } else { ", " };
            if index < required {
                text.push_str(separator);
                text.push_str(parameter.name);
            } else {
                text.push_str(&format!("[{separator}{}]", parameter.name));
            }
        }
        text.push(')');
        text
    }

    /// Whether the arguments have this form's count and dimensions; the first mismatch if not.
    fn matches(&self, arguments: &[Quantity]) -> Result<(), CallError> {
        if arguments.len() < self.required() || arguments.len() > self.parameters.len() {
            return Err(CallError::ArgumentCount {
                expected: "",
                found: arguments.len(),
            });
        }
        for (index, (argument, parameter)) in arguments.iter().zip(self.parameters).enumerate() {
            if argument.dimension != parameter.dimension {
                return Err(CallError::WrongDimension {
                    argument: index,
                    parameter: parameter.name,
                    expected: parameter.dimension,
                    found: argument.dimension,
                });
            }
        }
        Ok(())
    }

    /// Checks each argument's domain (and temperature kind) and each validity range.
    fn check_values(&self, arguments: &[Quantity]) -> Result<(), CallError> {
        for (index, (argument, parameter)) in arguments.iter().zip(self.parameters).enumerate() {
            if parameter.domain == Domain::AbsoluteTemperature
                && argument.is_temperature_difference()
            {
                return Err(CallError::Domain {
                    argument: Some(index),
                    message: format!(
                        "`{}` must be an absolute temperature, not a temperature difference",
                        parameter.name
                    ),
                });
            }
        }
        let mut values = [0.0; MOST_PARAMETERS];
        for (slot, argument) in values.iter_mut().zip(arguments) {
            *slot = argument.value;
        }
        self.check_numbers(&values[..arguments.len()])
    }

    /// The checks that depend only on the numbers: every row of a column goes through them.
    fn check_numbers(&self, values: &[f64]) -> Result<(), CallError> {
        for (index, (value, parameter)) in values.iter().zip(self.parameters).enumerate() {
            if !parameter.domain.admits(*value) {
                return Err(domain_error(index, parameter));
            }
        }
        for formulation in self.formulations {
            for range in formulation.ranges {
                self.check_range(values, range, formulation)?;
            }
        }
        Ok(())
    }

    fn check_range(
        &self,
        values: &[f64],
        range: &ValidRange,
        formulation: &Formulation,
    ) -> Result<(), CallError> {
        let index = self
            .parameters
            .iter()
            .position(|parameter| parameter.name == range.parameter);
        match index.and_then(|index| values.get(index).map(|value| (index, *value))) {
            Some((index, value)) if value < range.low || value > range.high => {
                Err(CallError::OutOfRange {
                    argument: Some(index),
                    message: outside_range_message(value, range, formulation),
                })
            }
            _ => Ok(()),
        }
    }

    /// The body over checked numbers, with the defaults of left-out parameters filled in
    /// (a full row goes to the body as it is).
    fn evaluate(&self, values: &[f64]) -> Result<f64, CallError> {
        if values.len() == self.parameters.len() {
            return (self.body)(values);
        }
        let mut full = [0.0; MOST_PARAMETERS];
        for (index, (slot, parameter)) in full.iter_mut().zip(self.parameters).enumerate() {
            *slot = match values.get(index) {
                Some(value) => *value,
                None => parameter.default.unwrap_or(f64::NAN),
            };
        }
        (self.body)(&full[..self.parameters.len()])
    }
}

impl Domain {
    /// Whether the domain takes `value` (a plain comparison: every row of a column asks).
    #[inline]
    fn admits(&self, value: f64) -> bool {
        match self {
            Domain::Any => true,
            Domain::Positive => value > 0.0,
            Domain::NonNegative | Domain::AbsoluteTemperature => value >= 0.0,
            Domain::Fraction => value > 0.0 && value <= 1.0,
            Domain::OpenFraction => value > 0.0 && value < 1.0,
            Domain::Within(interval) => interval.admits(value),
        }
    }
}

/// The refusal of a value outside a parameter's domain, naming the domain.
#[cold]
fn domain_error(index: usize, parameter: &Parameter) -> CallError {
    let name = parameter.name;
    let meaning = parameter.meaning;
    let message = match parameter.domain {
        Domain::Any => format!("`{name}` is outside its domain"),
        Domain::Positive => format!("`{name}` must be positive"),
        Domain::NonNegative => format!("`{name}` must not be negative"),
        Domain::Fraction => format!("`{name}` is {meaning} and must lie in (0, 1]"),
        Domain::OpenFraction => format!("`{name}` is {meaning} and must lie in (0, 1)"),
        Domain::AbsoluteTemperature => {
            format!("`{name}` is below absolute zero: it must be 0 K or above")
        }
        Domain::Within(interval) => {
            format!(
                "`{name}` is {meaning} and must lie in {}",
                interval.describe()
            )
        }
    };
    CallError::Domain {
        argument: Some(index),
        message,
    }
}

/// "`d10` = 5 mm is outside 0.1 to 3 mm, the range of Hazen's rule, K = C d10^2".
fn outside_range_message(value: f64, range: &ValidRange, formulation: &Formulation) -> String {
    let in_unit = |si: f64| Unit::lookup(range.unit).map_or(si, |unit| unit.from_si(si));
    let bound = |si: f64| crate::numeric::message_number(in_unit(si));
    format!(
        "`{}` = {} {} is outside {} to {} {}, the range of {}",
        range.parameter,
        crate::numeric::message_number(in_unit(value)),
        range.unit,
        bound(range.low),
        bound(range.high),
        range.unit,
        formulation.title
    )
}

impl Relation {
    /// The form the arguments call: the first whose count and dimensions match. Otherwise the
    /// mismatch of a form with the right number of arguments, or the count error.
    fn form_for(&self, arguments: &[Quantity]) -> Result<&'static Form, CallError> {
        let mut dimension_error: Option<CallError> = None;
        for form in self.forms {
            match form.matches(arguments) {
                Ok(()) => return Ok(form),
                Err(error @ CallError::WrongDimension { argument, .. }) => {
                    // The form that matched the most arguments says best what was meant.
                    let further = match &dimension_error {
                        Some(CallError::WrongDimension { argument: best, .. }) => argument > *best,
                        _ => true,
                    };
                    if further {
                        dimension_error = Some(error);
                    }
                }
                Err(_) => {}
            }
        }
        Err(dimension_error.unwrap_or(CallError::ArgumentCount {
            expected: self.count_words(),
            found: arguments.len(),
        }))
    }

    /// "2", "1 or 2", "2 to 5": how many arguments the forms take.
    fn count_words(&self) -> &'static str {
        const WORDS: [&str; 9] = ["0", "1", "2", "3", "4", "5", "6", "7", "8"];
        let low = self.forms.iter().map(Form::required).min().unwrap_or(0);
        let high = self
            .forms
            .iter()
            .map(|form| form.parameters.len())
            .max()
            .unwrap_or(0);
        match (low, high) {
            (low, high) if low == high => WORDS.get(low).copied().unwrap_or("several"),
            (1, 2) => "1 or 2",
            (2, 3) => "2 or 3",
            (3, 4) => "3 or 4",
            _ => "a different number of",
        }
    }

    /// The formula of each form, without repeats (`K = k * rho * g0 / mu`), for listings.
    pub fn formulas(&self) -> Vec<&'static str> {
        let mut formulas: Vec<&'static str> = Vec::new();
        for form in self.forms {
            if !formulas.contains(&form.formula) {
                formulas.push(form.formula);
            }
        }
        formulas
    }

    /// The parameter lists of the forms, without repeats: `(k, T[, p]) or (k, rho, mu)`.
    pub fn parameter_lists(&self) -> String {
        let mut lists: Vec<String> = Vec::new();
        for form in self.forms {
            let list = form.parameter_list();
            if !lists.contains(&list) {
                lists.push(list);
            }
        }
        lists.join(" or ")
    }
}

impl Function for Relation {
    fn signature(&self) -> String {
        format!("{}{}", self.name, self.parameter_lists())
    }

    fn summary(&self) -> &'static str {
        self.summary
    }

    fn formulas(&self) -> Vec<&'static str> {
        Relation::formulas(self)
    }

    fn formula_for(&self, arguments: &[Quantity]) -> Option<FormulaUse> {
        let form = self.form_for(arguments).ok()?;
        Some(FormulaUse {
            formula: form.formula,
            parameters: form
                .parameters
                .iter()
                .map(|parameter| {
                    let default = parameter
                        .default
                        .map(|value| Quantity::new(value, parameter.dimension));
                    (parameter.name, default)
                })
                .collect(),
            formulations: form.formulations,
        })
    }

    fn formulations(&self) -> Vec<&'static Formulation> {
        let mut all: Vec<&'static Formulation> = Vec::new();
        for form in self.forms {
            for formulation in form.formulations {
                if !all.iter().any(|known| known.id == formulation.id) {
                    all.push(formulation);
                }
            }
        }
        all
    }

    fn call(
        &self,
        arguments: &[Quantity],
        provenance: &mut Provenance,
    ) -> Result<Quantity, CallError> {
        let form = self.form_for(arguments)?;
        form.check_values(arguments)?;
        let mut values = [0.0; MOST_PARAMETERS];
        for (slot, argument) in values.iter_mut().zip(arguments) {
            *slot = argument.value;
        }
        let value = form.evaluate(&values[..arguments.len()])?;
        for formulation in form.formulations {
            provenance.record(formulation);
        }
        Ok(Quantity::new(value, form.result))
    }

    /// Every relation is its own column kernel: the rows after the first go through the same
    /// number checks and the body, without re-deciding the form or the dimensions.
    fn column_kernel(&self, first_row: &[Quantity]) -> Option<Box<dyn ColumnKernel + '_>> {
        let form = self.form_for(first_row).ok()?;
        let provided = first_row.len();
        let arity = form.parameters.len();
        if provided > arity || arity > MOST_PARAMETERS {
            return None;
        }
        let mut template = [0.0; MOST_PARAMETERS];
        for (index, (slot, parameter)) in template.iter_mut().zip(form.parameters).enumerate() {
            *slot = match first_row.get(index) {
                Some(argument) => argument.value,
                None => parameter.default.unwrap_or(f64::NAN),
            };
        }
        let temperature = form
            .parameters
            .iter()
            .position(|parameter| parameter.domain == Domain::AbsoluteTemperature);
        let pressure = form
            .parameters
            .iter()
            .position(|parameter| parameter.liquid_water_pressure);
        Some(Box::new(FormKernel {
            form,
            provided,
            arity,
            template,
            liquid_state: temperature.zip(pressure),
        }))
    }

    fn details(&self) -> Vec<String> {
        let mut lines = Vec::new();
        for form in self.forms {
            lines.push(format!(
                "{}{} gives {}",
                self.name,
                form.parameter_list(),
                form.result.phrase()
            ));
            lines.push(format!("  {}", form.formula));
            for parameter in form.parameters {
                lines.push(format!("  {}", parameter.describe()));
            }
            lines.push(format!("  e.g. {}", form.example));
        }
        lines
    }

    fn takes_absolute_temperature(&self) -> bool {
        self.forms.iter().any(|form| {
            form.parameters
                .iter()
                .any(|parameter| parameter.domain == Domain::AbsoluteTemperature)
        })
    }
}

/// The column fast path of one form for one call: the argument count, the defaults and the
/// scalars are settled on the first row. A span of rows is checked column by column first
/// (plain comparisons over slices), then the body runs in a tight loop up to the first refused
/// row, whose refusal is then worded exactly as `Function::call` words it.
struct FormKernel {
    form: &'static Form,
    /// Arguments given; the parameters after them take their defaults.
    provided: usize,
    arity: usize,
    /// A row with the scalars and defaults in place; columns fill their slots row by row.
    template: [f64; MOST_PARAMETERS],
    /// The absolute temperature and the liquid-water pressure, when the form has both: a span
    /// of rows proves once from its hottest row and lowest pressure that no row is steam.
    liquid_state: Option<(usize, usize)>,
}

impl FormKernel {
    /// The first row in `first..end` that a domain or a validity range refuses, or `end`. Only
    /// columns are looked at: a scalar is the same in every row, and the first row passed.
    fn first_refused(&self, arguments: &[Rows<'_>], first: usize, end: usize) -> usize {
        let mut refused = end;
        for (argument, parameter) in arguments.iter().zip(&self.form.parameters[..self.provided]) {
            let Rows::Each(values) = argument else {
                continue;
            };
            let Some(span) = values.get(first..refused) else {
                return first;
            };
            if parameter.domain != Domain::Any {
                let domain = parameter.domain;
                if let Some(offset) = span.iter().position(|value| !domain.admits(*value)) {
                    refused = first + offset;
                }
            }
            for formulation in self.form.formulations {
                for range in formulation.ranges {
                    if range.parameter != parameter.name {
                        continue;
                    }
                    let span = &values[first..refused];
                    if let Some(offset) = span
                        .iter()
                        .position(|value| *value < range.low || *value > range.high)
                    {
                        refused = first + offset;
                    }
                }
            }
        }
        refused
    }

    /// The extreme of an argument (or its default) over `first..end`: the hottest row with
    /// `f64::max`, the lowest pressure with `f64::min`.
    fn extreme(
        &self,
        arguments: &[Rows<'_>],
        index: usize,
        span: std::ops::Range<usize>,
        pick: fn(f64, f64) -> f64,
    ) -> f64 {
        match arguments.get(index) {
            Some(Rows::Each(values)) => values.get(span).map_or(f64::NAN, |values| {
                values.iter().copied().reduce(pick).unwrap_or(f64::NAN)
            }),
            Some(Rows::Same(value)) => *value,
            None => self.template[index],
        }
    }
}

impl ColumnKernel for FormKernel {
    fn rows(
        &self,
        arguments: &[Rows<'_>],
        first: usize,
        out: &mut [f64],
    ) -> Result<(), RowFailure> {
        let end = first + out.len();
        let _liquid = self.liquid_state.and_then(|(temperature, pressure)| {
            let hottest = self.extreme(arguments, temperature, first..end, f64::max);
            let lowest = self.extreme(arguments, pressure, first..end, f64::min);
            super::water::prove_liquid(hottest, lowest)
        });
        // The columns among the arguments, with their slots in a row.
        let mut columns: [(usize, &[f64]); MOST_PARAMETERS] = [(0, &[]); MOST_PARAMETERS];
        let mut column_count = 0;
        for (index, argument) in arguments.iter().enumerate().take(self.provided) {
            if let Rows::Each(values) = argument {
                if values.len() < end {
                    return Err(RowFailure {
                        row: values.len().max(first),
                        error: None,
                    });
                }
                columns[column_count] = (index, values);
                column_count += 1;
            }
        }
        let columns = &columns[..column_count];
        let mut row_values = self.template;
        let mut row = first;
        while row < end {
            let refused = self.first_refused(arguments, row, end);
            for (slot, row_number) in out[row - first..refused - first]
                .iter_mut()
                .zip(row..refused)
            {
                for &(index, values) in columns {
                    row_values[index] = values[row_number];
                }
                match (self.form.body)(&row_values[..self.arity]) {
                    Ok(value) if value.is_finite() => *slot = value,
                    Ok(_) => {
                        return Err(RowFailure {
                            row: row_number,
                            error: None,
                        })
                    }
                    Err(error) => {
                        return Err(RowFailure {
                            row: row_number,
                            error: Some(error),
                        })
                    }
                }
            }
            if refused == end {
                break;
            }
            for &(index, values) in columns {
                row_values[index] = values[refused];
            }
            if let Err(error) = self.form.check_numbers(&row_values[..self.provided]) {
                return Err(RowFailure {
                    row: refused,
                    error: Some(error),
                });
            }
            // The slice checks and the row's own checks agree, so this is not reached; if it
            // were, the row is computed like any other.
            row = refused;
            let slot = &mut out[row - first];
            match (self.form.body)(&row_values[..self.arity]) {
                Ok(value) if value.is_finite() => *slot = value,
                Ok(_) => return Err(RowFailure { row, error: None }),
                Err(error) => {
                    return Err(RowFailure {
                        row,
                        error: Some(error),
                    })
                }
            }
            row += 1;
        }
        Ok(())
    }
}

/// The first `N` arguments of a body as an array, for naming them in one `let`.
pub fn arguments<const N: usize>(values: &[f64]) -> [f64; N] {
    std::array::from_fn(|index| values.get(index).copied().unwrap_or(f64::NAN))
}

#[cfg(test)]
mod tests {
    //! The generic walk over every entry, and the machinery around it.

    use super::*;
    use crate::eval::{evaluate_sheet, Library, LineResult, Shown};
    use crate::library::dimensions::*;
    use crate::library::testing::*;
    use crate::library::Builtins;

    /// The arguments of a form's example, evaluated as a sheet would.
    fn example_arguments(form: &Form) -> Vec<Quantity> {
        let open = form.example.find('(').expect("example call");
        let inner = &form.example[open + 1..form.example.len() - 1];
        let mut sheet = String::new();
        for (index, argument) in split_arguments(inner).iter().enumerate() {
            sheet.push_str(&format!("a{index} = {argument}\n"));
        }
        let evaluation = evaluate_sheet(&sheet, Builtins::standard());
        evaluation
            .lines
            .iter()
            .map(|line| match &line.result {
                LineResult::Value(Shown::Scalar(shown)) => shown.quantity,
                other => panic!("{}: argument {other:?}", form.example),
            })
            .collect()
    }

    /// Splits at the commas outside parentheses.
    fn split_arguments(text: &str) -> Vec<String> {
        let (mut parts, mut depth, mut current) = (Vec::new(), 0, String::new());
        for character in text.chars() {
            match character {
                '(' => depth += 1,
                ')' => depth -= 1,
                ',' if depth == 0 => {
                    parts.push(current.trim().to_string());
                    current.clear();
                    continue;
                }
                _ => {}
            }
            current.push(character);
        }
        parts.push(current.trim().to_string());
        parts
    }

    /// Values just outside a domain, at each end it has.
    fn outside(domain: Domain) -> Vec<f64> {
        match domain {
            Domain::Any => vec![],
            Domain::Positive | Domain::Fraction | Domain::OpenFraction => vec![0.0],
            Domain::NonNegative | Domain::AbsoluteTemperature => vec![-1e-300],
            Domain::Within(interval) => {
                let step = |bound: f64| (bound.abs() * 1e-12).max(1e-300);
                let mut values = Vec::new();
                if interval.low.is_finite() {
                    values.push(if interval.low_included {
                        interval.low - step(interval.low)
                    } else {
                        interval.low
                    });
                }
                if interval.high.is_finite() {
                    values.push(if interval.high_included {
                        interval.high + step(interval.high)
                    } else {
                        interval.high
                    });
                }
                values
            }
        }
    }

    /// Every form of every relation: its example works and records each of its formulations; a
    /// wrong dimension at each parameter, a value just outside each domain and just outside each
    /// validity range are refused, pointing at that argument, and record nothing.
    #[test]
    fn every_entry_checks_what_it_declares() {
        let library = Builtins::standard();
        let mut walked = 0;
        for relation in library.relations() {
            let function = library.function(relation.name).expect("registered");
            for form in relation.forms {
                let example = example_arguments(form);
                let mut provenance = Provenance::default();
                let value = function
                    .call(&example, &mut provenance)
                    .unwrap_or_else(|error| panic!("{}: {error}", form.example));
                assert_eq!(value.dimension, form.result, "{}: result", form.example);
                for formulation in form.formulations {
                    assert!(
                        provenance.formulations().contains(formulation),
                        "{}: `{}` not recorded",
                        form.example,
                        formulation.id
                    );
                }
                for (index, parameter) in form.parameters.iter().enumerate().take(example.len()) {
                    let mut arguments = example.clone();
                    arguments[index] =
                        Quantity::new(1.0, Dimension::from_integers([0, 0, 0, 0, 0, 0, 3]));
                    let mut provenance = Provenance::default();
                    match function.call(&arguments, &mut provenance) {
                        Err(CallError::WrongDimension {
                            argument,
                            parameter: named,
                            ..
                        }) => {
                            // With several forms, any form's parameter at that place may speak.
                            assert_eq!(argument, index, "{}", form.example);
                            assert!(
                                relation.forms.iter().any(|other| other
                                    .parameters
                                    .get(index)
                                    .is_some_and(|candidate| candidate.name == named)),
                                "{}: named `{named}`",
                                form.example
                            );
                            let _ = parameter;
                        }
                        other => panic!(
                            "{}: wrong dimension at `{}`: {other:?}",
                            form.example, parameter.name
                        ),
                    }
                    for value in outside(parameter.domain) {
                        arguments[index] = Quantity {
                            value,
                            ..example[index]
                        };
                        match function.call(&arguments, &mut provenance) {
                            Err(CallError::Domain { argument, message }) => {
                                assert_eq!(argument, Some(index), "{}: {message}", form.example);
                                assert!(message.contains(parameter.name), "{message}");
                                if let Domain::Within(interval) = parameter.domain {
                                    assert!(message.contains(&interval.describe()), "{message}");
                                }
                            }
                            other => panic!(
                                "{}: `{}` = {value}: {other:?}",
                                form.example, parameter.name
                            ),
                        }
                    }
                    assert!(
                        provenance.formulations().is_empty(),
                        "{}: recorded a refusal",
                        form.example
                    );
                    walked += 1;
                }
                for formulation in form.formulations {
                    for range in formulation.ranges {
                        let index = form
                            .parameters
                            .iter()
                            .position(|parameter| parameter.name == range.parameter)
                            .expect("a range names a parameter");
                        let step = |bound: f64| (bound.abs() * 1e-9).max(f64::MIN_POSITIVE);
                        for value in [range.low - step(range.low), range.high + step(range.high)] {
                            let mut arguments = example.clone();
                            arguments[index].value = value;
                            let mut provenance = Provenance::default();
                            match function.call(&arguments, &mut provenance) {
                                Err(CallError::OutOfRange { argument, message }) => {
                                    assert_eq!(argument, Some(index));
                                    assert!(message.contains(range.unit), "{message}");
                                }
                                other => {
                                    panic!("{}: {value} outside the range: {other:?}", form.example)
                                }
                            }
                        }
                    }
                }
            }
        }
        assert!(walked >= 100, "walked {walked} parameters");
    }

    #[test]
    fn bounded_domains_state_their_bounds_in_their_unit() {
        let cases = [
            (Domain::from_up_to_below(0.0, 0.5, ""), "[0, 0.5)", 0.0, 0.5),
            (Domain::below(0.002, "mm"), "(-inf, 2) mm", -1e9, 0.002),
            (
                Domain::between(1e5, 35e6, "MPa"),
                "[0.1, 35] MPa",
                1e5,
                35e6 * 1.000_001,
            ),
        ];
        for (domain, text, inside_or_edge, outside) in cases {
            let Domain::Within(interval) = domain else {
                panic!("{domain:?}")
            };
            assert_eq!(interval.describe(), text);
            assert!(domain.admits(inside_or_edge), "{text}: {inside_or_edge}");
            assert!(!domain.admits(outside), "{text}: {outside}");
            assert!(!domain.admits(f64::NAN), "{text}: NaN");
        }
    }

    /// Every form declares its formula as `symbol = right side`, and the right side names each
    /// of the form's parameters (the working puts the call's values in place of those names).
    #[test]
    fn every_form_declares_a_formula_over_its_parameters() {
        let is_name_character = |c: char| c.is_alphanumeric() || c == '_';
        let mut forms = 0;
        for relation in Builtins::standard().relations() {
            for form in relation.forms {
                let (symbol, right) = form
                    .formula
                    .split_once(" = ")
                    .unwrap_or_else(|| panic!("{}: `{}`", relation.name, form.formula));
                assert!(!symbol.trim().is_empty(), "{}", relation.name);
                let words: Vec<&str> = right.split(|c| !is_name_character(c)).collect();
                for parameter in form.parameters {
                    assert!(
                        words.contains(&parameter.name),
                        "{}: `{}` does not name `{}`",
                        relation.name,
                        form.formula,
                        parameter.name
                    );
                }
                forms += 1;
            }
        }
        assert!(forms >= 100, "{forms} forms");
    }

    /// A formula written in the sheet's own operators and functions is evaluated as a sheet,
    /// with each parameter set to the SI value of the example's argument (or its default), and
    /// must give the body's value: the formula shown in the working is the one computed.
    /// Formulas over functions a sheet does not have (`W(u)`, `erfc`, `rho_w(T, p)`) or in
    /// fixed units are left to the reference tests; most forms are plain algebra.
    #[test]
    fn formulas_in_sheet_operators_give_the_body_value() {
        let library = Builtins::standard();
        let mut checked = Vec::new();
        for relation in library.relations() {
            let function = library.function(relation.name).expect("registered");
            for form in relation.forms {
                let example = example_arguments(form);
                let expected = function
                    .call(&example, &mut Provenance::default())
                    .expect("the example evaluates");
                let mut sheet = String::new();
                for (index, parameter) in form.parameters.iter().enumerate() {
                    let quantity = match (example.get(index), parameter.default) {
                        (Some(quantity), _) => *quantity,
                        (None, Some(value)) => Quantity::new(value, parameter.dimension),
                        (None, None) => unreachable!("the example gives every required argument"),
                    };
                    let unit = quantity.dimension.preferred_si_unit();
                    let unit = if unit == "1" { String::new() } else { unit };
                    sheet.push_str(&format!(
                        "{} = {:e} {unit}\n",
                        parameter.name, quantity.value
                    ));
                }
                let (_, right) = form.formula.split_once(" = ").expect("symbol = right side");
                sheet.push_str(&format!("formula_value = {right}\n"));
                let evaluation = evaluate_sheet(&sheet, Builtins::standard());
                let Some(LineResult::Value(Shown::Scalar(shown))) =
                    evaluation.lines.last().map(|line| &line.result)
                else {
                    continue;
                };
                assert_eq!(shown.quantity.dimension, form.result, "{}", form.formula);
                let difference = (shown.quantity.value - expected.value).abs();
                assert!(
                    difference <= 1e-9 * expected.value.abs().max(f64::MIN_POSITIVE),
                    "{}: `{}` gives {} where the body gives {}",
                    form.example,
                    form.formula,
                    shown.quantity.value,
                    expected.value
                );
                checked.push(form.example);
            }
        }
        assert!(
            checked.len() >= 60,
            "{} checked: {checked:?}",
            checked.len()
        );
    }

    /// Rows 1.. of a call over `columns` (`None`: a scalar, the first row's value) through
    /// `call` row by row, as the evaluator did before kernels: the values up to the first
    /// failing row, and that row with its refusal.
    fn row_by_row(
        name: &str,
        first_row: &[Quantity],
        columns: &[Option<&[f64]>],
    ) -> (Vec<f64>, Option<RowFailure>) {
        let library = Builtins::standard();
        let function = library.function(name).unwrap();
        let rows = columns
            .iter()
            .flatten()
            .map(|column| column.len())
            .max()
            .unwrap();
        let mut values = Vec::new();
        for row in 1..rows {
            let arguments: Vec<Quantity> = first_row
                .iter()
                .zip(columns)
                .map(|(first, column)| Quantity {
                    value: column.map_or(first.value, |column| column[row]),
                    ..*first
                })
                .collect();
            match function.call(&arguments, &mut Provenance::default()) {
                Ok(value) if value.value.is_finite() => values.push(value.value),
                Ok(_) => return (values, Some(RowFailure { row, error: None })),
                Err(error) => {
                    let failure = RowFailure {
                        row,
                        error: Some(error),
                    };
                    return (values, Some(failure));
                }
            }
        }
        (values, None)
    }

    /// The same rows through the column kernel, in spans of `span` rows as threads take them.
    fn through_kernel(
        name: &str,
        first_row: &[Quantity],
        columns: &[Option<&[f64]>],
        span: usize,
    ) -> (Vec<f64>, Option<RowFailure>) {
        let library = Builtins::standard();
        let function = library.function(name).unwrap();
        let kernel = function.column_kernel(first_row).expect("a kernel");
        let arguments: Vec<Rows> = first_row
            .iter()
            .zip(columns)
            .map(|(first, column)| column.map_or(Rows::Same(first.value), Rows::Each))
            .collect();
        let rows = columns
            .iter()
            .flatten()
            .map(|column| column.len())
            .max()
            .unwrap();
        let mut out = vec![f64::NAN; rows - 1];
        let mut failure = None;
        for (index, chunk) in out.chunks_mut(span).enumerate() {
            if let Err(failed) = kernel.rows(&arguments, 1 + index * span, chunk) {
                failure = Some(failed);
                break;
            }
        }
        let computed = failure.as_ref().map_or(rows - 1, |failed| failed.row - 1);
        out.truncate(computed);
        (out, failure)
    }

    /// The kernel gives exactly the values and the first refusal of `call` row by row, for
    /// every span length a thread might take.
    fn kernel_matches_calls(name: &str, first_row: &[Quantity], columns: &[Option<&[f64]>]) {
        let expected = row_by_row(name, first_row, columns);
        for span in [1, 2, 7, 1000, usize::MAX / 2] {
            let found = through_kernel(name, first_row, columns, span);
            assert_eq!(
                found.1, expected.1,
                "{name}, spans of {span}: first failure"
            );
            let same = found.0.len() == expected.0.len()
                && found
                    .0
                    .iter()
                    .zip(&expected.0)
                    .all(|(a, b)| a.to_bits() == b.to_bits());
            assert!(same, "{name}, spans of {span}: values differ");
        }
    }

    #[test]
    fn column_kernels_refuse_the_rows_calls_refuse() {
        // Domain: a negative conductivity at row 3 of a column, a fine gradient column.
        let conductivity = [1e-5, 2e-5, 3e-5, -1e-5, 5e-5];
        let gradient = [0.01, 0.5, 0.2, 0.1, 0.3];
        let first = [Quantity::new(1e-5, VELOCITY), Quantity::dimensionless(0.01)];
        kernel_matches_calls(
            "darcy_flux",
            &first,
            &[Some(&conductivity), Some(&gradient)],
        );
        kernel_matches_calls("darcy_flux", &first, &[Some(&conductivity), None]);
        // A range (Hazen's d10 from 0.1 to 3 mm) refused at row 4, after a clean row 3.
        let d10 = [0.2e-3, 0.5e-3, 1e-3, 2e-3, 4e-3, 0.05e-3];
        let first = [Quantity::new(0.2e-3, LENGTH)];
        kernel_matches_calls("hazen_conductivity", &first, &[Some(&d10)]);
        // Two refusals in the same row: the domain of the earlier parameter speaks first.
        let porosity = [0.3, 0.3, 1.5];
        let velocity = [1e-5, 1e-5, -1.0];
        let first = [Quantity::new(1e-5, VELOCITY), Quantity::dimensionless(0.3)];
        kernel_matches_calls(
            "seepage_velocity",
            &first,
            &[Some(&velocity), Some(&porosity)],
        );
        // Not-a-number rows are refused by the domains as they were row by row.
        let with_nan = [1e-5, f64::NAN, 1e-5];
        let first = [Quantity::new(1e-5, VELOCITY), Quantity::dimensionless(0.01)];
        kernel_matches_calls("darcy_flux", &first, &[Some(&with_nan), None]);
    }

    /// The saturation-pressure check proven once per span from its hottest row refuses exactly
    /// the rows that the check on every row refused: steam at one atmosphere from 99.97 °C
    /// (at 1 atm water boils at 373.124 K, 99.974 °C, by IF97 region 4; from memory), columns of
    /// pressures falling through p_sat, rows just either side of it, and defaults.
    #[test]
    fn water_columns_refuse_steam_exactly_where_rows_did() {
        let kelvins = |celsius: &[f64]| celsius.iter().map(|t| t + 273.15).collect::<Vec<_>>();
        let warm = kelvins(
            &(0..2000)
                .map(|i| 5.0 + 0.05 * f64::from(i))
                .collect::<Vec<_>>(),
        );
        let boiling = kelvins(&[20.0, 60.0, 99.9, 99.97, 99.974, 99.98, 100.5]);
        let first_t = Quantity::new(warm[0], TEMPERATURE);
        let first_p = Quantity::new(101_325.0, PRESSURE);
        let permeability = Quantity::new(1e-12, AREA);
        for name in ["water_density", "water_viscosity", "water_specific_heat"] {
            kernel_matches_calls(name, &[first_t], &[Some(&warm)]);
            kernel_matches_calls(name, &[first_t], &[Some(&boiling)]);
            kernel_matches_calls(name, &[first_t, first_p], &[Some(&boiling), None]);
        }
        kernel_matches_calls(
            "hydraulic_conductivity",
            &[permeability, first_t],
            &[None, Some(&boiling)],
        );
        // Brine on IF97 water: at 1 atm through boiling, and at 2 bar with a salinity column.
        let salinity = vec![0.1; boiling.len()];
        let brine = [first_t, first_p, Quantity::dimensionless(0.1)];
        kernel_matches_calls(
            "brine_density",
            &brine,
            &[Some(&boiling), None, Some(&salinity)],
        );
        let two_bar = [
            first_t,
            Quantity::new(2e5, PRESSURE),
            Quantity::dimensionless(0.1),
        ];
        kernel_matches_calls(
            "brine_density",
            &two_bar,
            &[Some(&boiling), None, Some(&salinity)],
        );
        // Pressures around p_sat at 90 °C (70.18 kPa), within a few units in the last place.
        let p_sat = super::super::water::saturation_pressure_pa(363.15);
        let near: Vec<f64> = [-1.0, 0.0, 1.0, 4.0, 1e6, -3.0]
            .iter()
            .map(|ulps| p_sat + ulps * p_sat * f64::EPSILON)
            .collect();
        let at_90 = vec![363.15; near.len()];
        let first_p = Quantity::new(near[0] * 2.0, PRESSURE);
        for name in ["water_density", "water_viscosity"] {
            kernel_matches_calls(name, &[first_t, first_p], &[Some(&at_90), Some(&near)]);
            kernel_matches_calls(name, &[first_t, first_p], &[Some(&warm[..6]), Some(&near)]);
        }
    }

    #[test]
    fn signatures_come_from_the_parameters() {
        let library = Builtins::standard();
        let signature = |name: &str| library.function(name).unwrap().signature();
        assert_eq!(signature("darcy_flux"), "darcy_flux(K, i)");
        assert_eq!(signature("water_density"), "water_density(T[, p])");
        assert_eq!(
            signature("hydraulic_conductivity"),
            "hydraulic_conductivity(k, T[, p]) or (k, rho, mu)"
        );
        assert_eq!(signature("fick_flux"), "fick_flux(D, dc_dx)");
        assert_eq!(
            signature("hazen_conductivity"),
            "hazen_conductivity(d10[, C])"
        );
    }

    #[test]
    fn messages_are_lower_case_name_the_argument_and_have_no_final_period() {
        let refusals = [
            call(
                "falling_head_conductivity",
                &[
                    si(4e-5, AREA),
                    si(1.0, LENGTH),
                    si(1e-3, AREA),
                    si(180.0, TIME),
                    si(0.3, LENGTH),
                    si(0.4, LENGTH),
                ],
            ),
            call("hazen_conductivity", &[si(0.05 * MM, LENGTH)]),
            call("seepage_velocity", &[si(1e-5, VELOCITY), number(1.5)]),
        ];
        for (refusal, _) in refusals {
            let message = refusal.expect_err("refused").to_string();
            assert!(message.starts_with('`'), "{message}");
            assert!(!message.ends_with('.'), "{message}");
        }
        let message = call("hazen_conductivity", &[si(0.05 * MM, LENGTH)])
            .0
            .expect_err("refused")
            .to_string();
        assert_eq!(
            message,
            "`d10` = 0.05 mm is outside 0.1 to 3 mm, the range of Hazen's rule, K = C d10^2"
        );
    }

    #[test]
    fn argument_counts_are_checked() {
        assert!(matches!(
            call("darcy_flux", &[si(1e-5, VELOCITY)]).0,
            Err(CallError::ArgumentCount {
                expected: "2",
                found: 1
            })
        ));
        assert!(matches!(
            call("hazen_conductivity", &[]).0,
            Err(CallError::ArgumentCount { .. })
        ));
        assert!(matches!(
            call("water_density", &[]).0,
            Err(CallError::ArgumentCount {
                expected: "1 or 2",
                ..
            })
        ));
    }
}
