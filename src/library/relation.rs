//! A relation is one declarative entry: its name, its parameters (name, meaning, dimension,
//! physical domain, optional default), its result, the formulations it evaluates with their
//! validity ranges, an example call, and a body over plain SI numbers.
//!
//! Everything around the body is done here, once, from the entry: the argument count, each
//! dimension, each domain, each validity range, the provenance record, the signature shown in
//! listings and hints, and the row kernel of the column fast path (the body itself, with the
//! same checks on every row). A body therefore never checks a single parameter; it checks only
//! what involves several (a radius of influence beyond the well, a head that falls) and returns
//! the value.
//!
//! A relation may have several forms when the dimension of an argument says which formula is
//! meant (`hydraulic_conductivity(k, T)` for water or `(k, rho, mu)` for any fluid): the first
//! form whose argument count and dimensions match is used.

use crate::eval::function::{CallError, FormulaUse, RowKernel, ValidRange};
use crate::eval::{Formulation, Function, Provenance, Quantity};
use crate::units::{Dimension, Unit};

/// The body of a relation: checked SI arguments in parameter order (defaults filled in), the
/// SI result.
pub type Body = fn(&[f64]) -> Result<f64, CallError>;

/// What values a parameter takes beyond its dimension.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
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
        }
    }

    /// `K: a hydraulic conductivity, a velocity (m/s), 0 or more`.
    pub fn describe(&self) -> String {
        let domain = match self.domain {
            Domain::Any => "",
            Domain::Positive => ", above 0",
            Domain::NonNegative => ", 0 or more",
            Domain::Fraction => ", in (0, 1]",
            Domain::OpenFraction => ", in (0, 1)",
            Domain::AbsoluteTemperature => ", absolute",
        };
        let default = match self.default {
            Some(value) => format!(
                "; {} {} when left out",
                crate::eval::error::short_number(value),
                self.dimension.preferred_si_unit()
            ),
            None => String::new(),
        };
        format!(
            "{}: {}, {}{domain}{default}",
            self.name,
            self.meaning,
            self.dimension.phrase()
        )
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
    fn admits(self, value: f64) -> bool {
        match self {
            Domain::Any => true,
            Domain::Positive => value > 0.0,
            Domain::NonNegative | Domain::AbsoluteTemperature => value >= 0.0,
            Domain::Fraction => value > 0.0 && value <= 1.0,
            Domain::OpenFraction => value > 0.0 && value < 1.0,
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
    };
    CallError::Domain {
        argument: Some(index),
        message,
    }
}

/// "`d10` = 5 mm is outside 0.1 to 3 mm, the range of Hazen's rule, K = C d10^2".
fn outside_range_message(value: f64, range: &ValidRange, formulation: &Formulation) -> String {
    let in_unit = |si: f64| Unit::lookup(range.unit).map_or(si, |unit| unit.from_si(si));
    let bound = |si: f64| crate::eval::error::short_number(in_unit(si));
    format!(
        "`{}` = {} {} is outside {} to {} {}, the range of {}",
        range.parameter,
        super::three_figures(in_unit(value)),
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

    /// Every relation is its own row kernel: the rows after the first go through the same
    /// number checks and the body, without re-deciding the form or the dimensions. The checks
    /// that can fail are listed once here, so a row costs only them and the body.
    fn row_kernel(&self, first_row: &[Quantity]) -> Option<RowKernel<'_>> {
        let form = self.form_for(first_row).ok()?;
        let provided = first_row.len();
        let domains: Vec<(usize, Domain)> = form.parameters[..provided]
            .iter()
            .enumerate()
            .filter(|(_, parameter)| parameter.domain != Domain::Any)
            .map(|(index, parameter)| (index, parameter.domain))
            .collect();
        let has_ranges = form
            .formulations
            .iter()
            .any(|formulation| !formulation.ranges.is_empty());
        let arity = form.parameters.len().min(MOST_PARAMETERS);
        let mut defaults = [0.0; MOST_PARAMETERS];
        for (slot, parameter) in defaults.iter_mut().zip(form.parameters) {
            *slot = parameter.default.unwrap_or(f64::NAN);
        }
        Some(Box::new(move |row: &[f64]| {
            for &(index, domain) in &domains {
                match row.get(index) {
                    Some(value) if domain.admits(*value) => {}
                    _ => return Err(domain_error(index, &form.parameters[index])),
                }
            }
            if has_ranges {
                form.check_numbers(row)?;
            }
            if row.len() == arity {
                return (form.body)(row);
            }
            if row.len() != provided || arity > MOST_PARAMETERS {
                return form.evaluate(row);
            }
            // Written element by element: copying the whole template costs a `memcpy` call
            // per row.
            let mut full = [0.0; MOST_PARAMETERS];
            for index in 0..arity {
                full[index] = match row.get(index) {
                    Some(value) => *value,
                    None => defaults[index],
                };
            }
            (form.body)(&full[..arity])
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

    /// A value just outside a domain, if the domain has an outside.
    fn outside(domain: Domain) -> Option<f64> {
        match domain {
            Domain::Any => None,
            Domain::Positive | Domain::Fraction | Domain::OpenFraction => Some(0.0),
            Domain::NonNegative | Domain::AbsoluteTemperature => Some(-1e-300),
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
                    if let Some(value) = outside(parameter.domain) {
                        arguments[index] = Quantity {
                            value,
                            ..example[index]
                        };
                        match function.call(&arguments, &mut provenance) {
                            Err(CallError::Domain { argument, message }) => {
                                assert_eq!(argument, Some(index), "{}: {message}", form.example);
                                assert!(message.contains(parameter.name), "{message}");
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

    /// The column fast path is the body itself: every row goes through the same checks.
    #[test]
    fn row_kernels_check_every_row() {
        let library = Builtins::standard();
        let function = library.function("darcy_flux").unwrap();
        let first = [Quantity::new(1e-5, VELOCITY), Quantity::dimensionless(0.01)];
        let kernel = function.row_kernel(&first).expect("a kernel");
        assert_eq!(kernel(&[2e-5, 0.5]).unwrap(), 1e-5);
        assert!(matches!(
            kernel(&[-2e-5, 0.5]),
            Err(CallError::Domain {
                argument: Some(0),
                ..
            })
        ));
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
            "`d10` = 0.0500 mm is outside 0.1 to 3 mm, the range of Hazen's rule, K = C d10^2"
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
