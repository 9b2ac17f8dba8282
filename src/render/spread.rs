//! The summary of a sampled run (`run --samples N`): the spread of each uncertain line, the
//! probability that each check fails, and which inputs drive each result, as terminal tables,
//! Markdown or CSV, and its JSON mirror.

use super::format_significant;
use super::text_table::{Align, TextTable};
use super::{Format, RenderOptions};
use crate::eval::uncertainty::{percentile_label, CheckSpread, SampleSummary};
use serde::Serialize;
use std::io::{self, Write};

/// A sentence above a table, wrapped to the terminal's width like the tables.
fn write_paragraph(out: &mut dyn Write, options: RenderOptions, text: &str) -> io::Result<()> {
    match options.width {
        Some(width) => {
            for line in super::text_table::wrap(text, width) {
                writeln!(out, "{line}")?;
            }
            Ok(())
        }
        None => writeln!(out, "{text}"),
    }
}

/// The spread table's header: line, name, mean, sd, the chosen percentiles, unit.
fn spread_header(summary: &SampleSummary) -> Vec<String> {
    let mut header: Vec<String> = ["line", "name", "mean", "sd"].map(String::from).to_vec();
    header.extend(summary.percentiles.iter().map(|p| percentile_label(*p)));
    header.push("unit".to_string());
    header
}

/// One row per uncertain line; a plain number shows no unit, as in the sheet's table.
fn spread_rows(summary: &SampleSummary, digits: u32) -> Vec<Vec<String>> {
    summary
        .lines
        .iter()
        .map(|line| {
            let mut row = vec![
                line.line.to_string(),
                line.name.clone().unwrap_or_default(),
                format_significant(line.mean, digits),
                format_significant(line.sd, digits),
            ];
            row.extend(
                line.percentiles
                    .iter()
                    .map(|value| format_significant(*value, digits)),
            );
            row.push(if line.unit == "1" {
                String::new()
            } else {
                line.unit.clone()
            });
            row
        })
        .collect()
}

/// The three tables, after the sheet's own.
pub fn write_summary(
    out: &mut dyn Write,
    summary: &SampleSummary,
    options: RenderOptions,
) -> io::Result<()> {
    let digits = options.digits;
    writeln!(out)?;
    write_paragraph(
        out,
        options,
        &format!(
            "Sampled {} times, seed {}. Generator: {}.",
            summary.samples, summary.seed, summary.generator
        ),
    )?;
    let header = spread_header(summary);
    let rows = spread_rows(summary, digits);
    let numbers = 2..header.len() - 1;
    write_block(out, options, &header, &rows, numbers)?;
    if !summary.checks.is_empty() {
        writeln!(out)?;
        writeln!(out, "Checks over the samples:")?;
        let header = ["line", "check", "failing samples", "probability of failing"];
        let rows: Vec<Vec<String>> = summary
            .checks
            .iter()
            .map(|check| {
                vec![
                    check.line.to_string(),
                    check.text.clone(),
                    format!("{} of {}", check.failed, check.samples),
                    probability_text(check),
                ]
            })
            .collect();
        write_block(out, options, &header, &rows, 2..4)?;
    }
    if !summary.sensitivity.is_empty() {
        writeln!(out)?;
        let noise = noise_level(summary.samples);
        write_paragraph(
            out,
            options,
            &format!(
                "What drives each result (Spearman rank correlation with each input, largest \
                 first; inputs below {}, within the sampling noise of zero, left out):",
                format_significant(noise, 2)
            ),
        )?;
        let header = ["line", "result", "inputs by rank correlation"];
        let rows: Vec<Vec<String>> = summary
            .sensitivity
            .iter()
            .map(|result| {
                let ranking: Vec<String> = result
                    .inputs
                    .iter()
                    .filter_map(|(name, rank)| match rank {
                        Some(rank) if rank.abs() >= noise => {
                            Some(format!("{name} {}", signed(*rank)))
                        }
                        _ => None,
                    })
                    .collect();
                let ranking = if ranking.is_empty() {
                    "(none beyond the sampling noise)".to_string()
                } else {
                    ranking.join(", ")
                };
                vec![result.line.to_string(), result.name.clone(), ranking]
            })
            .collect();
        write_block(out, options, &header, &rows, 0..0)?;
    }
    Ok(())
}

/// `1.23 % ± 0.035 %`, or with no failing sample the 95 % upper bound.
pub fn probability_text(check: &CheckSpread) -> String {
    match check.upper_bound_if_none_failed() {
        Some(bound) => format!(
            "0 % (below {} % at 95 % confidence)",
            format_significant(bound * 100.0, 2)
        ),
        None => format!(
            "{} % ± {} %",
            format_significant(check.probability() * 100.0, 3),
            format_significant(check.standard_error() * 100.0, 2)
        ),
    }
}

/// Three standard errors of a rank correlation of independent samples, 3 / sqrt(n − 1): a
/// smaller one cannot be told from zero.
pub fn noise_level(samples: usize) -> f64 {
    3.0 / (samples.saturating_sub(1).max(1) as f64).sqrt()
}

/// A rank correlation with its sign, two decimals: `+0.87`, `-0.12`.
pub fn signed(rank: f64) -> String {
    format!("{rank:+.2}")
}

/// A table in the output's format; the `numbers` columns are right-aligned.
fn write_block<S: AsRef<str>>(
    out: &mut dyn Write,
    options: RenderOptions,
    header: &[S],
    rows: &[Vec<String>],
    numbers: std::ops::Range<usize>,
) -> io::Result<()> {
    match options.format {
        Format::Csv => {
            let mut writer = csv::Writer::from_writer(out);
            writer.write_record(header.iter().map(AsRef::as_ref))?;
            for row in rows {
                writer.write_record(row)?;
            }
            writer.flush()
        }
        Format::Markdown => {
            let cells: Vec<&str> = header.iter().map(AsRef::as_ref).collect();
            writeln!(out, "| {} |", cells.join(" | "))?;
            let rule: Vec<&str> = (0..cells.len())
                .map(|column| {
                    if numbers.contains(&column) || column == 0 {
                        "---:"
                    } else {
                        "---"
                    }
                })
                .collect();
            writeln!(out, "|{}|", rule.join("|"))?;
            for row in rows {
                let escaped: Vec<String> =
                    row.iter().map(|cell| cell.replace('|', "\\|")).collect();
                writeln!(out, "| {} |", escaped.join(" | "))?;
            }
            Ok(())
        }
        Format::Table | Format::Json => {
            let aligns: Vec<Align> = (0..header.len())
                .map(|column| {
                    if numbers.contains(&column) {
                        Align::Right
                    } else {
                        Align::Left
                    }
                })
                .collect();
            let mut table = TextTable::new(header, &aligns);
            for row in rows {
                table.measure(row);
            }
            // Text columns may wrap to fit the terminal; numbers never do.
            let widths = table.widths().to_vec();
            for (column, width) in widths.iter().enumerate() {
                if !numbers.contains(&column) {
                    table.set_floor(column, (*width).min(14));
                }
            }
            table.fit(options.width);
            table.write_header(out, header)?;
            for row in rows {
                table.write_row(out, row)?;
            }
            Ok(())
        }
    }
}

/// The report's part for a sampled run: the three tables, then for each final result (one
/// that no other uncertain line uses) its exceedance curve and its tornado chart.
pub fn report_blocks(
    summary: &SampleSummary,
    evaluation: &crate::eval::Evaluation,
    digits: u32,
) -> Vec<super::report::Block> {
    use super::report::{Block, Figure};
    let mut blocks = vec![
        Block::Heading(format!(
            "Uncertainty: {} samples, seed {}",
            summary.samples, summary.seed
        )),
        Block::Prose(format!(
            "The sheet's distributions were sampled {} times (generator: {}). The values above \
             are the P50 of the samples; each uncertain line's spread follows, in its unit.",
            summary.samples, summary.generator
        )),
    ];
    let header = spread_header(summary);
    blocks.push(Block::Columns {
        header,
        rows: spread_rows(summary, digits),
    });
    if !summary.checks.is_empty() {
        blocks.push(Block::Columns {
            header: ["line", "check", "failing samples", "probability of failing"]
                .map(str::to_string)
                .to_vec(),
            rows: summary
                .checks
                .iter()
                .map(|check| {
                    vec![
                        check.line.to_string(),
                        check.text.clone(),
                        format!("{} of {}", check.failed, check.samples),
                        probability_text(check),
                    ]
                })
                .collect(),
        });
    }
    let noise = noise_level(summary.samples);
    // A final result: no other uncertain line's expression names it.
    let is_final = |name: &str| {
        !evaluation.lines.iter().any(|line| {
            line.name.as_deref() != Some(name)
                && summary
                    .lines
                    .iter()
                    .any(|spread| spread.line == line.number)
                && line
                    .expression
                    .split(|c: char| !(c.is_alphanumeric() || c == '_'))
                    .any(|word| word == name)
        })
    };
    for result in &summary.sensitivity {
        if !is_final(&result.name) {
            continue;
        }
        if let Some(spread) = summary.lines.iter().find(|line| line.line == result.line) {
            match super::spread_chart::exceedance_svg(spread) {
                Ok(svg) => blocks.push(Block::Figure(Figure {
                    caption: format!("Probability that {} is exceeded", result.name),
                    svg: svg.replacen(" xmlns=\"http://www.w3.org/2000/svg\"", "", 1),
                })),
                Err(error) => blocks.push(Block::Prose(format!(
                    "The exceedance chart of {} cannot be drawn: {error}",
                    result.name
                ))),
            }
        }
        blocks.push(Block::Figure(Figure {
            caption: format!(
                "Inputs that drive {} (rank correlations of {} or more in size)",
                result.name,
                format_significant(noise, 2)
            ),
            svg: super::spread_chart::tornado_svg(result, noise),
        }));
    }
    blocks
}

/// `samples` in the JSON of `run --samples N`.
#[derive(Serialize)]
pub struct SamplesJson {
    pub samples: usize,
    pub seed: u64,
    pub generator: &'static str,
    pub lines: Vec<LineSpreadJson>,
    pub checks: Vec<CheckSpreadJson>,
    pub sensitivity: Vec<SensitivityJson>,
}

#[derive(Serialize)]
pub struct LineSpreadJson {
    pub line: usize,
    pub name: Option<String>,
    pub input: bool,
    pub unit: String,
    pub mean: f64,
    pub sd: f64,
    /// `{"P5": …, "P50": …, "P95": …}`, in the line's unit.
    pub percentiles: serde_json::Map<String, serde_json::Value>,
}

#[derive(Serialize)]
pub struct CheckSpreadJson {
    pub line: usize,
    pub text: String,
    pub failed: usize,
    pub samples: usize,
    pub probability: f64,
    pub standard_error: f64,
    /// With no failing sample: the 95 % upper bound of the probability, 3 / samples.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub upper_bound_95: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub first_failing_sample: Option<usize>,
}

#[derive(Serialize)]
pub struct SensitivityJson {
    pub line: usize,
    pub name: String,
    /// Largest rank correlation in size first; `rank` is null when the result does not vary.
    pub inputs: Vec<InputRankJson>,
}

#[derive(Serialize)]
pub struct InputRankJson {
    pub input: String,
    pub rank_correlation: Option<f64>,
}

pub fn samples_json(summary: &SampleSummary) -> SamplesJson {
    SamplesJson {
        samples: summary.samples,
        seed: summary.seed,
        generator: summary.generator,
        lines: summary
            .lines
            .iter()
            .map(|line| LineSpreadJson {
                line: line.line,
                name: line.name.clone(),
                input: line.is_input,
                unit: line.unit.clone(),
                mean: line.mean,
                sd: line.sd,
                percentiles: summary
                    .percentiles
                    .iter()
                    .zip(&line.percentiles)
                    .map(|(p, value)| (percentile_label(*p), serde_json::json!(value)))
                    .collect(),
            })
            .collect(),
        checks: summary
            .checks
            .iter()
            .map(|check| CheckSpreadJson {
                line: check.line,
                text: check.text.clone(),
                failed: check.failed,
                samples: check.samples,
                probability: check.probability(),
                standard_error: check.standard_error(),
                upper_bound_95: check.upper_bound_if_none_failed(),
                first_failing_sample: check.first_failed,
            })
            .collect(),
        sensitivity: summary
            .sensitivity
            .iter()
            .map(|result| SensitivityJson {
                line: result.line,
                name: result.name.clone(),
                inputs: result
                    .inputs
                    .iter()
                    .map(|(input, rank)| InputRankJson {
                        input: input.clone(),
                        rank_correlation: *rank,
                    })
                    .collect(),
            })
            .collect(),
    }
}
