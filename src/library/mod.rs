//! Built-in functions and constants: mathematics, fluid properties (`water`, `brine`, `air`
//! formulations typed with `uom`, exposed through `properties`), the transport laws and the
//! relations around them (`transport`, `wells`), and constants. One entry per function:
//! signature, summary, formulations, and the body.
//!
//! `library` implements `eval::Library`; it knows nothing of syntax, files or output.

pub mod air;
pub mod brine;
pub mod columns;
pub mod constants;
pub mod formulation;
pub mod math;
pub mod properties;
pub mod transport;
pub mod water;
pub mod wells;

use crate::eval::function::RowKernel;
use crate::eval::{
    CallError, Constant, Formulation, Function, Library, Provenance, Quantity, Value,
};
use std::collections::HashMap;
use std::sync::OnceLock;

/// A function body: arguments in SI with dimensions, the provenance to record into.
pub type Body = fn(&[Quantity], &mut Provenance) -> Result<Quantity, CallError>;

/// The body of a function of whole columns (an aggregate, a table lookup); `None` hands the
/// call to the row-by-row body (`min(a, b)` of two values, say).
pub type ColumnBody = fn(&[Value], &mut Provenance) -> Option<Result<Value, CallError>>;

/// Builds the row kernel of a function for arguments shaped like the first row.
pub type KernelMaker = fn(&[Quantity]) -> Option<RowKernel<'static>>;

/// A built-in function described by data.
pub struct Builtin {
    pub signature: &'static str,
    pub summary: &'static str,
    pub formulations: &'static [&'static Formulation],
    pub body: Body,
    /// Set for functions of whole columns; `body` then serves scalar calls only.
    pub column_body: Option<ColumnBody>,
    pub kernel: Option<KernelMaker>,
    /// Takes absolute temperatures from offset scales (see `Function::takes_absolute_temperature`).
    pub takes_temperature: bool,
}

impl Builtin {
    pub const fn new(signature: &'static str, summary: &'static str, body: Body) -> Builtin {
        Builtin {
            signature,
            summary,
            formulations: &[],
            body,
            column_body: None,
            kernel: None,
            takes_temperature: false,
        }
    }

    /// A function that takes whole columns; `scalar_body` handles all-scalar calls.
    pub const fn on_columns(
        signature: &'static str,
        summary: &'static str,
        scalar_body: Body,
        column_body: ColumnBody,
    ) -> Builtin {
        let mut builtin = Builtin::new(signature, summary, scalar_body);
        builtin.column_body = Some(column_body);
        builtin
    }

    /// Adds a fast path for the rows of a column after the first.
    pub const fn with_kernel(mut self, kernel: KernelMaker) -> Builtin {
        self.kernel = Some(kernel);
        self
    }

    /// Accepts absolute temperatures such as `20 degC` (a property, a mean, a lookup).
    pub const fn taking_temperature(mut self) -> Builtin {
        self.takes_temperature = true;
        self
    }

    pub const fn citing(mut self, formulations: &'static [&'static Formulation]) -> Builtin {
        self.formulations = formulations;
        self
    }
}

impl Function for Builtin {
    fn signature(&self) -> &'static str {
        self.signature
    }

    fn summary(&self) -> &'static str {
        self.summary
    }

    fn formulations(&self) -> &'static [&'static Formulation] {
        self.formulations
    }

    fn call(
        &self,
        arguments: &[Quantity],
        provenance: &mut Provenance,
    ) -> Result<Quantity, CallError> {
        (self.body)(arguments, provenance)
    }

    fn call_values(
        &self,
        arguments: &[Value],
        provenance: &mut Provenance,
    ) -> Option<Result<Value, CallError>> {
        self.column_body
            .and_then(|body| body(arguments, provenance))
    }

    fn row_kernel(&self, first_row: &[Quantity]) -> Option<RowKernel<'_>> {
        self.kernel.and_then(|make| make(first_row))
    }

    fn takes_absolute_temperature(&self) -> bool {
        self.takes_temperature
    }
}

/// Every built-in function, by family.
fn all_functions() -> impl Iterator<Item = &'static (&'static str, Builtin)> {
    math::FUNCTIONS
        .iter()
        .chain(properties::FUNCTIONS)
        .chain(columns::FUNCTIONS.iter())
        .chain(transport::FUNCTIONS.iter())
        .chain(wells::FUNCTIONS.iter())
}

/// The standard library handed to the evaluator.
pub struct Builtins {
    functions: HashMap<&'static str, &'static Builtin>,
    constants: HashMap<&'static str, &'static Constant>,
}

impl Builtins {
    /// The shared instance; built on first use.
    pub fn standard() -> &'static Builtins {
        static BUILTINS: OnceLock<Builtins> = OnceLock::new();
        BUILTINS.get_or_init(|| Builtins {
            functions: all_functions()
                .map(|(name, builtin)| (*name, builtin))
                .collect(),
            constants: constants::constants()
                .iter()
                .map(|constant| (constant.name, constant))
                .collect(),
        })
    }

    /// Functions sorted by name, for listings.
    pub fn functions_sorted(&self) -> Vec<(&'static str, &'static Builtin)> {
        let mut list: Vec<_> = self
            .functions
            .iter()
            .map(|(name, builtin)| (*name, *builtin))
            .collect();
        list.sort_by_key(|(name, _)| *name);
        list
    }

    pub fn constants_sorted(&self) -> Vec<&'static Constant> {
        let mut list: Vec<_> = self.constants.values().copied().collect();
        list.sort_by_key(|constant| constant.name);
        list
    }
}

impl Library for Builtins {
    fn function(&self, name: &str) -> Option<&dyn Function> {
        self.functions
            .get(name)
            .map(|builtin| *builtin as &dyn Function)
    }

    fn constant(&self, name: &str) -> Option<&Constant> {
        self.constants.get(name).copied()
    }

    fn names(&self) -> Vec<&'static str> {
        self.functions
            .keys()
            .chain(self.constants.keys())
            .copied()
            .collect()
    }
}
