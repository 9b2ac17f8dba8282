//! Uncertainty: inputs given as distributions (`lognormal median 1e-9 m/s factor 3`), sampled
//! through the sheet by `run --samples N`, and summarised per line as mean, standard deviation
//! and percentiles, per check as a probability of failing, and per result as a ranking of the
//! inputs by rank correlation.
//!
//! This module holds the numerics on plain `f64` (`law` the families and their transforms,
//! `normal` Φ and Φ⁻¹, `scores` the generator and the correlation of scores, `statistics`) and
//! the summary types; `eval::evaluate::sampled` drives the evaluator over blocks of samples on
//! threads and fills the summary. Nothing here does I/O.

pub mod law;
pub mod normal;
pub mod scores;
pub mod statistics;

pub use law::{Law, Spread};

use crate::syntax::Span;
use crate::units::Dimension;
use std::sync::Arc;

/// What `run --samples N` asks for.
#[derive(Debug, Clone, PartialEq)]
pub struct Sampling {
    pub samples: usize,
    pub seed: u64,
    /// Percentiles to report, 0 to 100 (default 5, 50, 95).
    pub percentiles: Vec<f64>,
    /// Threads to evaluate blocks on (the output does not depend on it).
    pub threads: usize,
}

/// The percentiles reported when none are asked for.
pub const DEFAULT_PERCENTILES: [f64; 3] = [5.0, 50.0, 95.0];

impl Sampling {
    pub fn new(samples: usize, seed: u64) -> Sampling {
        Sampling {
            samples,
            seed,
            percentiles: DEFAULT_PERCENTILES.to_vec(),
            threads: std::thread::available_parallelism().map_or(1, |threads| threads.get()),
        }
    }
}

/// An uncertain input as the evaluator found it: the law in SI, and the rank correlations it
/// states with other inputs (by line name).
#[derive(Debug, Clone, PartialEq)]
pub struct UncertainInput {
    /// The start of the distribution's expression: how a block's scores find their input.
    pub key: usize,
    pub spread: Spread,
    pub dimension: Dimension,
    /// `(other input's line name, rank correlation, span of the rank)`.
    pub correlations: Vec<(String, f64, Span)>,
}

/// The normal scores of one block of samples, by input key.
#[derive(Debug, Clone, Default)]
pub struct BlockScores {
    /// The 0-based number of the block's first sample.
    pub first_sample: usize,
    pub scores: rustc_hash::FxHashMap<usize, Arc<Vec<f64>>>,
}

/// The spread of one line's samples, in its display unit.
#[derive(Debug, Clone, PartialEq)]
pub struct LineSpread {
    pub line: usize,
    pub name: Option<String>,
    pub unit: String,
    /// An input (a distribution line) rather than a result.
    pub is_input: bool,
    pub mean: f64,
    pub sd: f64,
    /// The asked percentiles, in the order of `SampleSummary::percentiles`.
    pub percentiles: Vec<f64>,
    /// The percentiles 0, 0.1, 0.2, … 100 in the display unit (1001 values), for charts.
    pub quantiles: Vec<f64>,
}

/// How often a check line failed over the samples.
#[derive(Debug, Clone, PartialEq)]
pub struct CheckSpread {
    pub line: usize,
    pub text: String,
    pub failed: usize,
    pub samples: usize,
    /// The first failing sample, 1-based.
    pub first_failed: Option<usize>,
}

impl CheckSpread {
    /// The estimated probability of failing.
    pub fn probability(&self) -> f64 {
        self.failed as f64 / self.samples as f64
    }

    /// The binomial standard error of that estimate, sqrt(p (1 − p) / n).
    pub fn standard_error(&self) -> f64 {
        let p = self.probability();
        (p * (1.0 - p) / self.samples as f64).sqrt()
    }

    /// With no failing sample, the one-sided 95 % upper bound 3 / n ("rule of three",
    /// Hanley & Lippman-Hand 1983): zero failures in n samples does not mean a probability
    /// of zero.
    pub fn upper_bound_if_none_failed(&self) -> Option<f64> {
        (self.failed == 0).then(|| 3.0 / self.samples as f64)
    }
}

/// The inputs that drive one result, by Spearman rank correlation, largest in size first.
#[derive(Debug, Clone, PartialEq)]
pub struct Sensitivity {
    pub line: usize,
    pub name: String,
    /// `(input name, rank correlation)`; `None` when the result does not vary.
    pub inputs: Vec<(String, Option<f64>)>,
}

/// Everything `run --samples` adds to an evaluation.
#[derive(Debug, Clone, PartialEq)]
pub struct SampleSummary {
    pub samples: usize,
    pub seed: u64,
    pub generator: &'static str,
    pub percentiles: Vec<f64>,
    /// Uncertain lines of the main sheet, in file order: inputs and results.
    pub lines: Vec<LineSpread>,
    pub checks: Vec<CheckSpread>,
    /// One per result line of the main sheet that some input moves.
    pub sensitivity: Vec<Sensitivity>,
}

/// `P5`, `P50`, `P97.5`: a percentile's label.
pub fn percentile_label(p: f64) -> String {
    // `{}` of an f64 prints 5 as `5` and 97.5 as `97.5`: the shortest exact form.
    format!("P{p}")
}
