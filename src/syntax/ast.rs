//! The syntax tree of a sheet. Every node carries the span of the text it came from; nothing
//! here knows about units' meaning or values, only what was written.

use super::span::Span;

/// A whole sheet: its lines in file order.
#[derive(Debug, Clone, PartialEq)]
pub struct Sheet {
    pub lines: Vec<Line>,
}

/// One line of source.
#[derive(Debug, Clone, PartialEq)]
pub struct Line {
    /// 1-based line number in the file.
    pub number: usize,
    /// The line's text without its line ending.
    pub span: Span,
    pub kind: LineKind,
    /// A trailing `# comment`, without the `#`.
    pub comment: Option<String>,
}

#[derive(Debug, Clone, PartialEq)]
pub enum LineKind {
    Blank,
    /// A line that holds only a comment (the text is in `Line::comment`).
    Comment,
    Heading(String),
    Definition(Definition),
    Display(Display),
    /// Boxed: a check is the largest line and the rarest.
    Check(Box<Check>),
    Function(FunctionDefinition),
    Include(Include),
    Plot(Plot),
    /// `@checker: B. Checker`: a field of the title block.
    Field(Field),
    /// A line that failed to parse; its error is in the parse result.
    Invalid,
}

/// `name [unit] = expression`
#[derive(Debug, Clone, PartialEq)]
pub struct Definition {
    pub name: Name,
    pub display_unit: Option<UnitExpression>,
    pub expression: Expression,
}

/// `name(parameters) [unit] = body`
#[derive(Debug, Clone, PartialEq)]
pub struct FunctionDefinition {
    pub name: Name,
    pub parameters: Vec<Parameter>,
    pub result_unit: Option<UnitExpression>,
    pub body: Expression,
}

/// A function parameter, optionally with the unit whose dimension it must have.
#[derive(Debug, Clone, PartialEq)]
pub struct Parameter {
    pub name: Name,
    pub unit: Option<UnitExpression>,
}

/// `@name: text`: one field of the sheet's title block (project, job, title, author, checker,
/// date, revision), shown at the top of reports and in JSON, never evaluated.
#[derive(Debug, Clone, PartialEq)]
pub struct Field {
    pub name: String,
    /// The text after the colon, trimmed; empty when the field is left blank.
    pub text: String,
}

/// `include "path"`
#[derive(Debug, Clone, PartialEq)]
pub struct Include {
    pub path: String,
    pub path_span: Span,
}

/// `plot K_cold, K_warm against T log y "title"`: a chart of columns.
#[derive(Debug, Clone, PartialEq)]
pub struct Plot {
    pub series: Vec<Name>,
    pub against: Name,
    /// `log x`, `log y`: the axes as drawn, x across and y up (or down).
    pub log_x: bool,
    pub log_y: bool,
    /// `down`: `against` on the vertical axis, growing downwards (a depth profile).
    pub down: bool,
    /// `points`: markers only (a cross-plot), no line joining the rows.
    pub points: bool,
    pub title: Option<String>,
}

/// `from to to step s` or `from to to count n [log]`.
#[derive(Debug, Clone, PartialEq)]
pub struct Range {
    pub from: Expression,
    pub to: Expression,
    pub spacing: Spacing,
}

#[derive(Debug, Clone, PartialEq)]
pub enum Spacing {
    Step(Expression),
    Count {
        count: Expression,
        logarithmic: bool,
    },
}

/// `solve line == goal for unknown between lower and upper`.
#[derive(Debug, Clone, PartialEq)]
pub struct Solve {
    pub line: Name,
    pub goal: Expression,
    pub unknown: Name,
    pub lower: Expression,
    pub upper: Expression,
}

/// `fit model to observed varying a, b [log]`.
#[derive(Debug, Clone, PartialEq)]
pub struct Fit {
    pub model: Name,
    pub observed: Name,
    /// The inputs varied; the first is the line's value.
    pub varying: Vec<Name>,
    /// Least squares on the logarithms of the model and the observations.
    pub logarithmic: bool,
}

/// An uncertain input: a family, its parameters as written, optional bounds and rank
/// correlations with other inputs.
#[derive(Debug, Clone, PartialEq)]
pub struct Distribution {
    pub family: Family,
    /// The family's parameters in the order written: normal mean and sd; log-normal median and
    /// spread; uniform and log-uniform low and high; triangular low, high and most likely.
    pub parameters: Vec<Expression>,
    /// `between low and high`.
    pub bounds: Option<[Expression; 2]>,
    pub correlations: Vec<Correlation>,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Family {
    Normal,
    /// Median and multiplicative standard deviation (exp of the sd of ln x).
    LogNormalFactor,
    /// Median and the standard deviation of ln x.
    LogNormalSdLn,
    /// Median and the standard deviation of log10 x.
    LogNormalSdLog10,
    Uniform,
    LogUniform,
    Triangular,
}

impl Family {
    /// The family's name as written in a sheet.
    pub fn keyword(self) -> &'static str {
        match self {
            Family::Normal => "normal",
            Family::LogNormalFactor | Family::LogNormalSdLn | Family::LogNormalSdLog10 => {
                "lognormal"
            }
            Family::Uniform => "uniform",
            Family::LogUniform => "loguniform",
            Family::Triangular => "triangular",
        }
    }
}

/// `rank 0.6 with K`: a rank correlation with another input.
#[derive(Debug, Clone, PartialEq)]
pub struct Correlation {
    pub rank: Expression,
    pub with: Name,
}

/// A bare `expression [unit]`.
#[derive(Debug, Clone, PartialEq)]
pub struct Display {
    pub expression: Expression,
    pub display_unit: Option<UnitExpression>,
}

/// `check left <op> right [within tolerance] ["message"]`
#[derive(Debug, Clone, PartialEq)]
pub struct Check {
    pub left: Expression,
    pub comparison: Comparison,
    pub comparison_span: Span,
    pub right: Expression,
    pub tolerance: Option<Expression>,
    /// The tolerance as written (`1 %`), for showing the check.
    pub tolerance_text: Option<String>,
    pub message: Option<String>,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Comparison {
    Less,
    LessOrEqual,
    Greater,
    GreaterOrEqual,
    Equal,
    NotEqual,
}

impl Comparison {
    pub fn symbol(self) -> &'static str {
        match self {
            Comparison::Less => "<",
            Comparison::LessOrEqual => "<=",
            Comparison::Greater => ">",
            Comparison::GreaterOrEqual => ">=",
            Comparison::Equal => "==",
            Comparison::NotEqual => "!=",
        }
    }
}

#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Name {
    pub text: String,
    pub span: Span,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Expression {
    pub kind: ExpressionKind,
    pub span: Span,
}

#[derive(Debug, Clone, PartialEq)]
pub enum ExpressionKind {
    /// A number literal with an optional unit; the digits are kept as written so that exact
    /// unit factors can be applied in decimal.
    Quantity {
        digits: String,
        unit: Option<UnitExpression>,
    },
    Name(String),
    /// `{12, 40, 150} mD`: the numbers as written (with their signs) and the unit.
    List {
        items: Vec<String>,
        unit: Option<UnitExpression>,
    },
    Range(Box<Range>),
    /// `column k from "cores.csv"`.
    FileColumn {
        header: Name,
        path: String,
        path_span: Span,
    },
    Solve(Box<Solve>),
    Fit(Box<Fit>),
    /// `lognormal median 1e-9 m/s factor 3`: an uncertain input.
    Distribution(Box<Distribution>),
    Call {
        function: Name,
        arguments: Vec<Expression>,
    },
    Negate(Box<Expression>),
    Binary {
        operator: BinaryOperator,
        left: Box<Expression>,
        right: Box<Expression>,
    },
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum BinaryOperator {
    Add,
    Subtract,
    Multiply,
    Divide,
    Power,
}

/// A unit as written: symbols, products, quotients and powers.
#[derive(Debug, Clone, PartialEq)]
pub struct UnitExpression {
    pub kind: UnitExpressionKind,
    pub span: Span,
    /// The unit's text as written, e.g. `gal/(d*ft^2)`; empty on the inner nodes of a unit.
    pub text: String,
}

#[derive(Debug, Clone, PartialEq)]
pub enum UnitExpressionKind {
    Symbol(String),
    /// The `1` of `1/d`.
    One,
    Product(Box<UnitExpression>, Box<UnitExpression>),
    Quotient(Box<UnitExpression>, Box<UnitExpression>),
    /// A power with a rational exponent `numerator/denominator` (denominator > 0).
    Power {
        base: Box<UnitExpression>,
        numerator: i32,
        denominator: i32,
    },
}

impl Expression {
    /// Calls `visit` on this expression and on every expression inside it, outermost first:
    /// the one walk over the tree that the passes over names, calls, units, warnings and the
    /// editor build on.
    pub fn for_each_subexpression<'a>(&'a self, visit: &mut impl FnMut(&'a Expression)) {
        visit(self);
        match &self.kind {
            ExpressionKind::Quantity { .. }
            | ExpressionKind::Name(_)
            | ExpressionKind::List { .. }
            | ExpressionKind::Fit(_)
            | ExpressionKind::FileColumn { .. } => {}
            ExpressionKind::Range(range) => {
                for part in range.parts() {
                    part.for_each_subexpression(visit);
                }
            }
            ExpressionKind::Solve(solve) => {
                for part in [&solve.goal, &solve.lower, &solve.upper] {
                    part.for_each_subexpression(visit);
                }
            }
            ExpressionKind::Distribution(distribution) => {
                let bounds = distribution.bounds.iter().flatten();
                let ranks = distribution.correlations.iter().map(|with| &with.rank);
                for part in distribution.parameters.iter().chain(bounds).chain(ranks) {
                    part.for_each_subexpression(visit);
                }
            }
            ExpressionKind::Call { arguments, .. } => {
                for argument in arguments {
                    argument.for_each_subexpression(visit);
                }
            }
            ExpressionKind::Negate(inner) => inner.for_each_subexpression(visit),
            ExpressionKind::Binary { left, right, .. } => {
                left.for_each_subexpression(visit);
                right.for_each_subexpression(visit);
            }
        }
    }

    /// Calls `visit` on the name of every function this expression calls.
    pub fn for_each_call<'a>(&'a self, visit: &mut impl FnMut(&'a str, Span)) {
        self.for_each_subexpression(&mut |expression| {
            if let ExpressionKind::Call { function, .. } = &expression.kind {
                visit(&function.text, function.span);
            }
        });
    }

    /// Calls `visit` on every sheet name this expression refers to (not function names).
    pub fn for_each_name<'a>(&'a self, visit: &mut impl FnMut(&'a str, Span)) {
        self.for_each_subexpression(&mut |expression| match &expression.kind {
            ExpressionKind::Name(name) => visit(name, expression.span),
            ExpressionKind::Fit(fit) => {
                visit(&fit.model.text, fit.model.span);
                visit(&fit.observed.text, fit.observed.span);
                for name in &fit.varying {
                    visit(&name.text, name.span);
                }
            }
            ExpressionKind::Solve(solve) => {
                visit(&solve.line.text, solve.line.span);
                visit(&solve.unknown.text, solve.unknown.span);
            }
            ExpressionKind::Distribution(distribution) => {
                for correlation in &distribution.correlations {
                    visit(&correlation.with.text, correlation.with.span);
                }
            }
            _ => {}
        });
    }
}

impl Line {
    /// The line's top-level expressions: a definition's value, a function's body, a shown
    /// expression, a check's sides and tolerance. Walk each with `for_each_subexpression`.
    pub fn expressions(&self) -> Vec<&Expression> {
        match &self.kind {
            LineKind::Definition(definition) => vec![&definition.expression],
            LineKind::Function(function) => vec![&function.body],
            LineKind::Display(display) => vec![&display.expression],
            LineKind::Check(check) => {
                let mut sides = vec![&check.left, &check.right];
                sides.extend(check.tolerance.as_ref());
                sides
            }
            _ => Vec::new(),
        }
    }
}

impl Range {
    /// The range's three expressions.
    pub fn parts(&self) -> [&Expression; 3] {
        let spacing = match &self.spacing {
            Spacing::Step(step) => step,
            Spacing::Count { count, .. } => count,
        };
        [&self.from, &self.to, spacing]
    }
}
