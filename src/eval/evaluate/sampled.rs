//! `run --samples N`: the sheet evaluated once per block of samples, blocks shared among
//! threads, each block's distributions giving columns of samples through the column engine;
//! then the blocks joined in order and summarised (spread per line, failure probability per
//! check, rank correlation of each result with each input).
//!
//! Determinism: a block's scores depend only on the seed and the block's index, and blocks
//! are joined in index order, so the output is bit-identical whatever the thread count. An
//! error is reported from the first block (in sample order) that has one, naming its sample.

use super::sheet::{evaluate_prepared, Prepared};
use super::*;
use crate::eval::diagnostic::Diagnostic;
use crate::eval::error::{EvalError, EvalErrorKind};
use crate::eval::function::Library;
use crate::eval::uncertainty::scores::{Mixing, BLOCK, GENERATOR};
use crate::eval::uncertainty::statistics::{correlation, mean_and_sd, percentile, ranks};
use crate::eval::uncertainty::{
    BlockScores, CheckSpread, LineSpread, SampleSummary, Sampling, Sensitivity, UncertainInput,
};
use crate::syntax::{LineKind, Span};
use crate::units::Unit;
use std::sync::Arc;

/// The code of the diagnostic for `--samples` on a sheet without distributions (a
/// command-line error).
pub const NOTHING_TO_SAMPLE: &str = "nothing-to-sample";

/// What one block leaves for the summary: the main lines' sample columns (SI), its checks,
/// its inputs' scores, or its errors.
struct BlockOutcome {
    columns: Vec<Option<Arc<Vec<f64>>>>,
    checks: Vec<Option<CheckOutcome>>,
    scores: Vec<Arc<Vec<f64>>>,
    errors: Vec<Diagnostic>,
}

/// Samples the sheet and puts the summary into `evaluation` (the median run, without
/// errors), or the first failing block's errors into its diagnostics.
pub(super) fn sample(
    prepared: &Prepared,
    library: &dyn Library,
    settings: &Settings,
    sampling: &Sampling,
    mut inputs: Vec<UncertainInput>,
    evaluation: &mut Evaluation,
) {
    if inputs.is_empty() || sampling.samples == 0 {
        let message = if sampling.samples == 0 {
            "`--samples` must be at least 1".to_string()
        } else {
            "`--samples`: the sheet has no distributions to sample (write an input as, e.g., `K = lognormal median 1e-9 m/s factor 3`)".to_string()
        };
        let mut diagnostic = Diagnostic::error(message, Span::new(0, 0));
        diagnostic.code = Some(NOTHING_TO_SAMPLE);
        evaluation.diagnostics.push(diagnostic);
        return;
    }
    // Every uncertain line keeps all its samples: a bound on memory like any column's.
    let value_lines = evaluation
        .lines
        .iter()
        .filter(|line| matches!(line.result, LineResult::Value(_)))
        .count();
    let held = sampling.samples.saturating_mul(value_lines.max(1));
    if held > settings.max_total_rows {
        let message = format!(
            "`--samples {}` over the sheet's {value_lines} lines would hold {held} sample values, over the limit of {} (raise it with `--max-total-rows`)",
            sampling.samples, settings.max_total_rows
        );
        evaluation
            .diagnostics
            .push(Diagnostic::error(message, Span::new(0, 0)));
        return;
    }
    inputs.sort_by_key(|input| input.key);
    let names = input_names(prepared, &inputs);
    let mixing = match mixing(&inputs, &names) {
        Ok(mixing) => mixing,
        Err(error) => {
            evaluation.diagnostics.push(error.to_diagnostic());
            return;
        }
    };
    let blocks = sampling.samples.div_ceil(BLOCK);
    let outcomes = evaluate_blocks(
        prepared, library, settings, sampling, &inputs, &mixing, blocks,
    );
    if let Some(failed) = outcomes.iter().find(|outcome| !outcome.errors.is_empty()) {
        evaluation.diagnostics.extend(failed.errors.iter().cloned());
        evaluation
            .diagnostics
            .sort_by_key(|diagnostic| diagnostic.span.start);
        return;
    }
    let summary = summarise(evaluation, sampling, &inputs, &names, &outcomes);
    evaluation.samples = Some(Box::new(summary));
}

/// Without `--samples`, a check that depends on a distribution is decided at the inputs'
/// medians: its message says so, so that a pass is not read as a pass of every case.
pub(super) fn note_checks_at_medians(prepared: &Prepared, evaluation: &mut Evaluation) {
    let main = &prepared.lines[..prepared.main_lines];
    let mut uncertain: Vec<&str> = prepared
        .lines
        .iter()
        .filter_map(|line| match &line.kind {
            LineKind::Definition(definition)
                if matches!(
                    definition.expression.kind,
                    crate::syntax::ExpressionKind::Distribution(_)
                ) =>
            {
                Some(definition.name.text.as_str())
            }
            _ => None,
        })
        .collect();
    // Names that depend on an uncertain name, to a fixed point (sheets are small).
    loop {
        let before = uncertain.len();
        for line in &prepared.lines {
            if let LineKind::Definition(definition) = &line.kind {
                let name = definition.name.text.as_str();
                if uncertain.contains(&name) {
                    continue;
                }
                let mut depends = false;
                definition
                    .expression
                    .for_each_name(&mut |used, _| depends |= uncertain.contains(&used));
                if depends {
                    uncertain.push(name);
                }
            }
        }
        if uncertain.len() == before {
            break;
        }
    }
    for (line, outcome) in main.iter().zip(evaluation.lines.iter_mut()) {
        let (LineKind::Check(check), LineResult::Check(result)) = (&line.kind, &mut outcome.result)
        else {
            continue;
        };
        let mut depends = false;
        for side in [&check.left, &check.right] {
            side.for_each_name(&mut |used, _| depends |= uncertain.contains(&used));
        }
        if depends {
            let note =
                "decided at the inputs' medians; `--samples N` gives the probability of failing";
            result.message = Some(match &result.message {
                Some(message) => format!("{message} ({note})"),
                None => note.to_string(),
            });
        }
    }
}

/// The line name of each input (by the start of its expression, or of its `--set` value).
fn input_names(prepared: &Prepared, inputs: &[UncertainInput]) -> Vec<String> {
    inputs
        .iter()
        .map(|input| {
            prepared
                .lines
                .iter()
                .find_map(|line| match &line.kind {
                    LineKind::Definition(definition) => {
                        let replaced = prepared
                            .overrides
                            .iter()
                            .find(|(name, _)| *name == definition.name.text)
                            .map(|(_, expression)| expression.span.start);
                        let start = replaced.unwrap_or(definition.expression.span.start);
                        (start == input.key).then(|| definition.name.text.clone())
                    }
                    _ => None,
                })
                .unwrap_or_default()
        })
        .collect()
}

/// The correlation of the inputs' scores from the rank correlations the sheet states.
fn mixing(inputs: &[UncertainInput], names: &[String]) -> Result<Mixing, EvalError> {
    let mut pairs: Vec<(usize, usize, f64)> = Vec::new();
    let mut first_span = None;
    for (index, input) in inputs.iter().enumerate() {
        for (other, rank, span) in &input.correlations {
            first_span.get_or_insert(*span);
            let Some(other_index) = names.iter().position(|name| name == other) else {
                continue;
            };
            let given_twice = pairs.iter().any(|(a, b, _)| {
                (*a, *b) == (index, other_index) || (*a, *b) == (other_index, index)
            });
            if given_twice {
                let message = format!(
                    "the rank correlation of `{}` and `{other}` is given twice: state it on one of the two lines",
                    names[index]
                );
                return Err(EvalError::new(
                    EvalErrorKind::Distribution { message },
                    *span,
                ));
            }
            pairs.push((index, other_index, *rank));
        }
    }
    Mixing::new(inputs.len(), &pairs).map_err(|_| {
        let message = "the rank correlations cannot hold together (no set of inputs can have them all): weaken one".to_string();
        EvalError::new(
            EvalErrorKind::Distribution { message },
            first_span.unwrap_or(Span::new(0, 0)),
        )
    })
}

/// Evaluates every block, blocks taken in turn by `sampling.threads` threads.
fn evaluate_blocks(
    prepared: &Prepared,
    library: &dyn Library,
    settings: &Settings,
    sampling: &Sampling,
    inputs: &[UncertainInput],
    mixing: &Mixing,
    blocks: usize,
) -> Vec<BlockOutcome> {
    let evaluate_block = |block: usize| {
        let first_sample = block * BLOCK;
        let len = BLOCK.min(sampling.samples - first_sample);
        let scores = mixing.block_scores(inputs.len(), sampling.seed, block as u64, len);
        let block_scores = BlockScores {
            first_sample,
            scores: inputs
                .iter()
                .zip(&scores)
                .map(|(input, scores)| (input.key, scores.clone()))
                .collect(),
        };
        let (evaluation, _) =
            evaluate_prepared(prepared, library, settings, Some(Arc::new(block_scores)));
        let errors: Vec<Diagnostic> = evaluation
            .diagnostics
            .into_iter()
            .filter(|diagnostic| diagnostic.severity == crate::eval::Severity::Error)
            .collect();
        let mut columns = Vec::with_capacity(evaluation.lines.len());
        let mut checks = Vec::with_capacity(evaluation.lines.len());
        for line in evaluation.lines {
            let (column, check) = match line.result {
                LineResult::Value(Shown::Column(shown)) => (Some(shown.column.values), None),
                LineResult::Check(outcome) => (None, Some(*outcome)),
                _ => (None, None),
            };
            columns.push(column);
            checks.push(check);
        }
        BlockOutcome {
            columns,
            checks,
            scores,
            errors,
        }
    };
    // Blocks are of equal size, so an even share per thread balances; results come back in
    // block order whatever the thread count.
    let block_numbers: Vec<usize> = (0..blocks).collect();
    in_parallel(sampling.threads, &block_numbers, |block| {
        evaluate_block(*block)
    })
}

/// The samples of one line, joined over the blocks.
fn joined(
    outcomes: &[BlockOutcome],
    pick: impl Fn(&BlockOutcome) -> Option<&Arc<Vec<f64>>>,
) -> Option<Vec<f64>> {
    let mut all = Vec::new();
    for outcome in outcomes {
        all.extend_from_slice(pick(outcome)?);
    }
    Some(all)
}

/// One uncertain line summarised: its spread, its ranking of the inputs, and its P50 in SI
/// for the table.
struct LineResultSummary {
    spread: LineSpread,
    /// `(input name, rank correlation)` for a result line; empty for an input.
    ranking: Vec<(String, Option<f64>)>,
    median_si: f64,
}

fn summarise(
    evaluation: &mut Evaluation,
    sampling: &Sampling,
    inputs: &[UncertainInput],
    names: &[String],
    outcomes: &[BlockOutcome],
) -> SampleSummary {
    let samples = sampling.samples;
    // The main lines whose values vary: a single value in the median run, columns of samples
    // in the blocks.
    let uncertain: Vec<(usize, ShownColumnShape)> = evaluation
        .lines
        .iter()
        .enumerate()
        .filter_map(|(index, line)| match &line.result {
            LineResult::Value(Shown::Scalar(shown))
                if outcomes
                    .iter()
                    .all(|outcome| outcome.columns[index].is_some()) =>
            {
                Some((index, ShownColumnShape::of(shown)))
            }
            _ => None,
        })
        .collect();
    // Ranking is the costly part, so lines are ranked on the threads, one at a time each,
    // and only their summaries kept. An input's ranks are its scores' (the transforms keep
    // order).
    let input_indices: Vec<usize> = (0..inputs.len()).collect();
    let input_ranks: Vec<Vec<f64>> = in_parallel(sampling.threads, &input_indices, |input| {
        let scores = joined(outcomes, |outcome| outcome.scores.get(*input)).unwrap_or_default();
        ranks(&scores).0
    });
    let lines_view = &evaluation.lines;
    let summaries: Vec<LineResultSummary> =
        in_parallel(sampling.threads, &uncertain, |(index, shape)| {
            let values =
                joined(outcomes, |outcome| outcome.columns[*index].as_ref()).unwrap_or_default();
            summarise_line(
                &lines_view[*index],
                values,
                shape,
                &sampling.percentiles,
                names,
                &input_ranks,
            )
        });
    let mut lines = Vec::with_capacity(summaries.len());
    let mut sensitivity = Vec::new();
    for ((index, shape), summary) in uncertain.iter().zip(summaries) {
        let line = &mut evaluation.lines[*index];
        if let (false, Some(name)) = (summary.spread.is_input, &line.name) {
            sensitivity.push(Sensitivity {
                line: line.number,
                name: name.clone(),
                inputs: summary.ranking,
            });
        }
        // The table shows the sampled P50, and says so.
        line.result = LineResult::Value(Shown::Scalar(shape.shown(summary.median_si)));
        line.note = Some(format!("P50 of {samples} samples"));
        lines.push(summary.spread);
    }
    let checks = join_checks(evaluation, outcomes, samples);
    SampleSummary {
        samples,
        seed: sampling.seed,
        generator: GENERATOR,
        percentiles: sampling.percentiles.clone(),
        lines,
        checks,
        sensitivity,
    }
}

/// Quantiles kept per line for charts: P0, P0.1, …, P100.
const CHART_QUANTILES: usize = 1001;

fn summarise_line(
    line: &LineOutcome,
    values: Vec<f64>,
    shape: &ShownColumnShape,
    percentiles: &[f64],
    names: &[String],
    input_ranks: &[Vec<f64>],
) -> LineResultSummary {
    let is_input = line.name.as_ref().is_some_and(|name| names.contains(name));
    let mut ranking: Vec<(String, Option<f64>)> = Vec::new();
    let mut sorted = if is_input {
        // An input's ranks come from its scores; its values need only sorting.
        let mut values = values;
        values.sort_unstable_by(f64::total_cmp);
        values
    } else {
        let (line_ranks, sorted) = ranks(&values);
        drop(values);
        ranking = names
            .iter()
            .zip(input_ranks)
            .map(|(name, ranks)| (name.clone(), correlation(&line_ranks, ranks)))
            .collect();
        ranking.sort_by(|a, b| {
            let size = |value: &Option<f64>| value.map_or(-1.0, f64::abs);
            size(&b.1).total_cmp(&size(&a.1))
        });
        sorted
    };
    let median_si = percentile(&sorted, 50.0);
    // Display units are increasing functions of SI, so the sorted order holds.
    for value in sorted.iter_mut() {
        *value = shape.in_unit(*value);
    }
    let (mean, sd) = mean_and_sd(&sorted);
    let step = 100.0 / (CHART_QUANTILES - 1) as f64;
    LineResultSummary {
        spread: LineSpread {
            line: line.number,
            name: line.name.clone(),
            unit: shape.template.unit.clone(),
            is_input,
            mean,
            sd,
            percentiles: percentiles
                .iter()
                .map(|p| percentile(&sorted, *p))
                .collect(),
            quantiles: (0..CHART_QUANTILES)
                .map(|index| percentile(&sorted, index as f64 * step))
                .collect(),
        },
        ranking,
        median_si,
    }
}

/// How a line's scalar shows (its unit, conversion and temperature kind), to show sampled
/// values the same way.
struct ShownColumnShape {
    template: ShownValue,
    conversion: Option<Unit>,
}

impl ShownColumnShape {
    fn of(shown: &ShownValue) -> ShownColumnShape {
        let conversion = crate::syntax::parse_unit(&shown.unit)
            .ok()
            .and_then(|unit| resolve_unit(&unit).ok())
            .filter(|unit| unit.dimension == shown.quantity.dimension);
        ShownColumnShape {
            template: shown.clone(),
            conversion,
        }
    }

    fn in_unit(&self, si: f64) -> f64 {
        match &self.conversion {
            Some(unit) => unit.from_si(si),
            None => si,
        }
    }

    fn shown(&self, si: f64) -> ShownValue {
        let mut shown = self.template.clone();
        shown.quantity.value = si;
        shown.value = self.in_unit(si);
        shown
    }
}

/// `work` over `items` on up to `threads` threads, results in the items' order.
fn in_parallel<T: Sync, R: Send>(
    threads: usize,
    items: &[T],
    work: impl Fn(&T) -> R + Sync,
) -> Vec<R> {
    let threads = threads.clamp(1, items.len().max(1));
    if threads == 1 {
        return items.iter().map(&work).collect();
    }
    let share = items.len().div_ceil(threads);
    std::thread::scope(|scope| {
        let workers: Vec<_> = items
            .chunks(share)
            .map(|chunk| scope.spawn(|| chunk.iter().map(&work).collect::<Vec<R>>()))
            .collect();
        workers
            .into_iter()
            .flat_map(|worker| {
                // A panic in a block is a bug: passed on, never a summary of fewer samples.
                worker
                    .join()
                    .unwrap_or_else(|panic| std::panic::resume_unwind(panic))
            })
            .collect()
    })
}

/// Each check line's failures over all blocks; the table's outcome shows the first failing
/// sample (or, when none fails, the closest to failing).
fn join_checks(
    evaluation: &mut Evaluation,
    outcomes: &[BlockOutcome],
    samples: usize,
) -> Vec<CheckSpread> {
    let mut spreads = Vec::new();
    for (index, line) in evaluation.lines.iter_mut().enumerate() {
        let LineResult::Check(median_outcome) = &mut line.result else {
            continue;
        };
        let per_block: Vec<(usize, &CheckOutcome)> = outcomes
            .iter()
            .enumerate()
            .filter_map(|(block, outcome)| {
                outcome.checks[index].as_ref().map(|check| (block, check))
            })
            .collect();
        let sampled = per_block.iter().all(|(_, check)| check.rows.is_some());
        if per_block.len() != outcomes.len() || !sampled {
            continue; // a check of single values: the same in every sample
        }
        let failed: usize = per_block
            .iter()
            .filter_map(|(_, check)| check.rows.map(|rows| rows.failed))
            .sum();
        let first_failing = per_block
            .iter()
            .find(|(_, check)| check.rows.is_some_and(|rows| rows.failed > 0));
        let shown = match first_failing {
            Some(found) => *found,
            None => *per_block
                .iter()
                .min_by(|a, b| margin(a.1).total_cmp(&margin(b.1)))
                .unwrap_or(&per_block[0]),
        };
        let (block, check) = shown;
        let shown_row = block * BLOCK + check.rows.map_or(1, |rows| rows.shown_row);
        let mut joined_outcome = check.clone();
        joined_outcome.passed = failed == 0;
        joined_outcome.rows = Some(CheckRows {
            total: samples,
            failed,
            shown_row,
            sampled: true,
        });
        **median_outcome = joined_outcome;
        spreads.push(CheckSpread {
            line: line.number,
            text: line.expression.clone(),
            failed,
            samples,
            first_failed: first_failing.map(|_| shown_row),
        });
    }
    spreads
}

/// How far a check's shown row is from failing, in SI (ignores tolerances: only to choose
/// which block's closest row to show).
fn margin(check: &CheckOutcome) -> f64 {
    use crate::syntax::Comparison;
    let (left, right) = (check.left.quantity.value, check.right.quantity.value);
    match check.comparison {
        Comparison::Less | Comparison::LessOrEqual => right - left,
        Comparison::Greater | Comparison::GreaterOrEqual => left - right,
        Comparison::Equal => -(left - right).abs(),
        Comparison::NotEqual => (left - right).abs(),
    }
}
