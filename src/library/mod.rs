//! Built-in relations, functions and constants, in families by physics: flow (Darcy),
//! diffusion, solute transport, heat, electrical, laboratory tests, liners, consolidation,
//! wells, water, brine, air; plus
//! mathematics, functions of whole columns, and constants.
//!
//! A relation is one declarative entry (`relation::Relation`): its parameters with dimensions
//! and domains, its result, its formulations and a body over checked SI numbers; everything
//! else (checks, provenance, signature, column kernel) follows from the entry. The few built-ins
//! that are polymorphic in dimension (`sqrt`, `min`, `max`, `kelvin`, the aggregates) are a
//! `Builtin`, the escape hatch, whose body checks its own arguments.
//!
//! `library` implements `eval::Library`; it knows nothing of syntax, files or output.

pub mod air;
pub mod brine;
pub mod columns;
pub mod consolidation;
pub mod constants;
pub mod dewatering;
pub mod diffusion;
pub mod dimensions;
pub mod electrical;
pub mod electrolyte;
pub mod flow;
pub mod formulation;
pub mod heat;
pub mod laboratory;
pub mod layered;
pub mod leaky;
pub mod liners;
pub mod math;
pub mod relation;
pub mod slug_tests;
#[cfg(test)]
mod testing;
pub mod transport;
pub mod water;
pub mod wells;

use crate::eval::{
    CallError, Constant, Formulation, Function, Library, Provenance, Quantity, Value,
};
use rustc_hash::FxHashMap;
use std::sync::OnceLock;

/// A function body: arguments in SI with dimensions, the provenance to record into.
pub type Body = fn(&[Quantity], &mut Provenance) -> Result<Quantity, CallError>;

/// The body of a function of whole columns (an aggregate, a table lookup); `None` hands the
/// call to the row-by-row body (`min(a, b)` of two values, say).
pub type ColumnBody = fn(&[Value], &mut Provenance) -> Option<Result<Value, CallError>>;

/// A built-in polymorphic in dimension (`sqrt`, `min`, an aggregate): the escape hatch for what
/// a `Relation`, with one dimension per parameter, cannot say. Its body checks its arguments.
pub struct Builtin {
    pub signature: &'static str,
    pub summary: &'static str,
    pub formulations: &'static [&'static Formulation],
    pub body: Body,
    /// Set for functions of whole columns; `body` then serves scalar calls only.
    pub column_body: Option<ColumnBody>,
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
    fn signature(&self) -> String {
        self.signature.to_string()
    }

    fn summary(&self) -> &'static str {
        self.summary
    }

    fn formulations(&self) -> Vec<&'static Formulation> {
        self.formulations.to_vec()
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

    fn takes_absolute_temperature(&self) -> bool {
        self.takes_temperature
    }
}

/// Every relation, by family.
fn all_relations() -> impl Iterator<Item = &'static relation::Relation> {
    flow::RELATIONS
        .iter()
        .chain(diffusion::RELATIONS)
        .chain(transport::RELATIONS)
        .chain(heat::RELATIONS)
        .chain(electrical::RELATIONS)
        .chain(laboratory::RELATIONS)
        .chain(liners::RELATIONS)
        .chain(consolidation::RELATIONS)
        .chain(wells::RELATIONS)
        .chain(dewatering::RELATIONS)
        .chain(leaky::RELATIONS)
        .chain(slug_tests::RELATIONS)
        .chain(water::RELATIONS)
        .chain(brine::RELATIONS)
        .chain(electrolyte::RELATIONS)
        .chain(air::RELATIONS)
}

/// Every built-in that is not a relation: mathematics and functions of whole columns.
fn all_builtins() -> impl Iterator<Item = &'static (&'static str, Builtin)> {
    math::FUNCTIONS
        .iter()
        .chain(columns::FUNCTIONS.iter())
        .chain(layered::FUNCTIONS.iter())
        .chain(dewatering::FUNCTIONS.iter())
}

/// The standard library handed to the evaluator.
pub struct Builtins {
    functions: FxHashMap<&'static str, &'static dyn Function>,
    constants: FxHashMap<&'static str, &'static Constant>,
}

impl Builtins {
    /// The shared instance; built on first use.
    pub fn standard() -> &'static Builtins {
        static BUILTINS: OnceLock<Builtins> = OnceLock::new();
        BUILTINS.get_or_init(|| {
            let mut functions: FxHashMap<&'static str, &'static dyn Function> =
                FxHashMap::default();
            for relation in all_relations() {
                functions.insert(relation.name, relation);
            }
            for (name, builtin) in all_builtins() {
                functions.insert(name, builtin);
            }
            Builtins {
                functions,
                constants: constants::constants()
                    .iter()
                    .map(|constant| (constant.name, constant))
                    .collect(),
            }
        })
    }

    /// Functions sorted by name, for listings.
    pub fn functions_sorted(&self) -> Vec<(&'static str, &'static dyn Function)> {
        let mut list: Vec<_> = self
            .functions
            .iter()
            .map(|(name, function)| (*name, *function))
            .collect();
        list.sort_by_key(|(name, _)| *name);
        list
    }

    /// The relations, for listings that show parameters and examples.
    pub fn relations(&self) -> impl Iterator<Item = &'static relation::Relation> {
        all_relations()
    }

    pub fn constants_sorted(&self) -> Vec<&'static Constant> {
        let mut list: Vec<_> = self.constants.values().copied().collect();
        list.sort_by_key(|constant| constant.name);
        list
    }
}

impl Library for Builtins {
    fn function(&self, name: &str) -> Option<&dyn Function> {
        self.functions.get(name).copied()
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
