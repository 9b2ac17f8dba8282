//! `fluxsheet check FILE|DIR…`: evaluates every sheet in-process (folders searched recursively
//! for `.fxs`, in sorted order) and prints only what needs attention (errors, warnings, failed
//! checks, values that moved since an earlier run), then a line per sheet and a total.

use super::against::{added_names, compare, compare_inputs, Earlier, InputChange, Moved};
use super::{exit, exit_code_for, read_sheet, unreadable_json, SheetSource};
use crate::eval::warnings::warning_count;
use crate::eval::{Evaluation, LineResult, Settings, Severity};
use crate::front::limits::{FileKind, ReadLimits};
use crate::render::json::{
    diagnostics_json, fields_json, inputs_json, value_json, CheckJson, DiagnosticJson, FieldJson,
    InputJson,
};
use crate::render::report::InputFile;
use crate::render::table::check_text;
use crate::render::{self, Format, RenderOptions};
use clap::Args;
use codespan_reporting::term::termcolor::{Ansi, NoColor};
use serde::Serialize;
use std::io::{self, IsTerminal, Write};
use std::path::{Path, PathBuf};

#[derive(Args, Debug)]
#[command(
    after_help = "Prints nothing for a clean sheet but its summary line; errors, warnings and failed \
checks are shown with their line. Exit codes: 0 all sheets ok, 1 a check failed or a value moved, \
3 a sheet has errors (or, with --deny-warnings, warnings).\n\nExamples:\n  fluxsheet check worksheets\n  \
fluxsheet check --deny-warnings site/*.fxs\n  fluxsheet check --format json worksheets\n  \
fluxsheet run --format json site.fxs > earlier.json && fluxsheet check site.fxs --against earlier.json"
)]
pub struct CheckArgs {
    /// Sheet files and folders (searched recursively for `.fxs`); `-` reads standard input
    #[arg(required = true, value_name = "FILE|DIR")]
    pub paths: Vec<String>,
    /// Treat warnings as errors (exit code 3). An input kept on purpose though no line uses it
    /// takes a display unit, `k_spare [mD] = 420 mD`, and is not warned
    #[arg(long)]
    pub deny_warnings: bool,
    /// Let `include` and `column … from` lines read files outside each sheet's folder tree
    #[arg(long)]
    pub allow_outside: bool,
    /// Compare every named value with this earlier `fluxsheet run --format json` output
    #[arg(long, value_name = "EARLIER.json")]
    pub against: Option<PathBuf>,
    /// Relative change beyond which a value counts as moved (with --against)
    #[arg(long, requires = "against", value_parser = parse_tolerance, value_name = "RELATIVE")]
    pub tolerance: Option<f64>,
    /// Fail (exit 1) a sheet whose title block names no checker (`@checker: …` missing or blank)
    #[arg(long)]
    pub require_signoff: bool,
    #[command(flatten)]
    pub limits: super::LimitArgs,
}

/// Default of `--tolerance`.
pub const DEFAULT_TOLERANCE: f64 = 1e-9;

fn parse_tolerance(text: &str) -> Result<f64, String> {
    match text.trim().parse::<f64>() {
        Ok(value) if value.is_finite() && value >= 0.0 => Ok(value),
        _ => Err("expected a relative tolerance, a number >= 0 such as 1e-6".to_string()),
    }
}

/// A sheet to check: its label and, unless it is standard input, its path.
struct Target {
    label: String,
    path: Option<PathBuf>,
    /// The path within the folder given (the file name for a file given by itself), to pair
    /// it with an earlier run of a folder that moved.
    relative: Option<String>,
    /// Why it cannot be checked at all (a path that does not exist, an unreadable folder).
    problem: Option<String>,
}

/// Expands the arguments into sheets, in argument order, folders sorted and recursive.
fn targets(paths: &[String]) -> Vec<Target> {
    let mut targets = Vec::new();
    for argument in paths {
        if argument == "-" {
            targets.push(Target {
                label: "<stdin>".to_string(),
                path: None,
                relative: None,
                problem: None,
            });
            continue;
        }
        let path = PathBuf::from(argument);
        if path.is_dir() {
            let mut found = Vec::new();
            let mut problems = Vec::new();
            walk(&path, &mut found, &mut problems);
            found.sort();
            targets.extend(found.into_iter().map(|found| Target {
                label: found.display().to_string(),
                relative: found.strip_prefix(&path).ok().map(|relative| {
                    relative
                        .components()
                        .map(|part| part.as_os_str().to_string_lossy().into_owned())
                        .collect::<Vec<_>>()
                        .join("/")
                }),
                path: Some(found),
                problem: None,
            }));
            targets.extend(problems);
        } else {
            targets.push(Target {
                label: argument.clone(),
                relative: path
                    .file_name()
                    .map(|name| name.to_string_lossy().into_owned()),
                path: Some(path),
                problem: None,
            });
        }
    }
    targets
}

/// Collects `.fxs` files under `directory`. Symbolic links to folders are not followed (no
/// loops); links to files are, and a link to nothing is an unreadable sheet, not skipped.
fn walk(directory: &Path, found: &mut Vec<PathBuf>, problems: &mut Vec<Target>) {
    let entries = match std::fs::read_dir(directory) {
        Ok(entries) => entries,
        Err(error) => {
            problems.push(Target {
                label: directory.display().to_string(),
                path: None,
                relative: None,
                problem: Some(format!(
                    "cannot read folder `{}`: {error}",
                    directory.display()
                )),
            });
            return;
        }
    };
    for entry in entries.flatten() {
        let path = entry.path();
        let Ok(kind) = entry.file_type() else {
            continue;
        };
        if kind.is_dir() {
            walk(&path, found, problems);
        } else if path.extension().is_some_and(|extension| extension == "fxs")
            // A dangling link is kept: reading it fails, and `check` says so.
            && (kind.is_file() || (kind.is_symlink() && !path.is_dir()))
        {
            found.push(path);
        }
    }
}

/// Reads a sheet from its path (or standard input).
fn read_target(target: &Target, limits: &ReadLimits) -> Result<SheetSource, String> {
    if let Some(problem) = &target.problem {
        return Err(problem.clone());
    }
    let Some(path) = &target.path else {
        return read_sheet("-", limits);
    };
    let label = &target.label;
    let text = limits.read_file(path, label, FileKind::Sheet)?;
    Ok(SheetSource {
        label: label.clone(),
        text,
    })
}

/// What became of one sheet.
struct SheetReport {
    label: String,
    evaluation: Option<Evaluation>,
    unreadable: Option<String>,
    moved: Vec<Moved>,
    /// Named values the earlier run did not have: `(line, name)`.
    added: Vec<(u64, String)>,
    /// Input files whose hash differs from the earlier run's, or that came or went.
    input_changes: Vec<InputChange>,
    /// Every file the run read, with its hash.
    inputs: Vec<InputFile>,
    /// `--require-signoff` and the sheet names no checker.
    unsigned: bool,
    /// `--against` was given.
    compared: bool,
    /// `--against` was given but the earlier run has no such sheet.
    no_earlier: bool,
    code: u8,
}

impl SheetReport {
    fn counts(&self) -> Counts {
        let Some(evaluation) = &self.evaluation else {
            return Counts {
                errors: 1,
                ..Counts::default()
            };
        };
        let mut counts = Counts::default();
        for line in &evaluation.lines {
            match &line.result {
                LineResult::Value(_) => counts.values += 1,
                LineResult::Check(check) => {
                    counts.checks += 1;
                    if check.passed {
                        counts.passed += 1;
                    }
                }
                _ => {}
            }
        }
        counts.warnings = warning_count(evaluation);
        counts.errors = evaluation
            .diagnostics
            .iter()
            .filter(|diagnostic| diagnostic.severity == Severity::Error)
            .count();
        counts.moved = self.moved.len() + self.added.len() + usize::from(self.no_earlier);
        counts
    }

    fn status(&self) -> &'static str {
        match self.code {
            exit::OK => "ok",
            exit::CHECK_FAILED => "failed",
            _ => "error",
        }
    }
}

#[derive(Default, Clone, Copy)]
struct Counts {
    values: usize,
    checks: usize,
    passed: usize,
    errors: usize,
    warnings: usize,
    moved: usize,
}

/// An SI value in full (shortest text that reads back to the same double), in exponent form
/// when it is very small or large.
fn exact(value: f64) -> String {
    let magnitude = value.abs();
    if magnitude == 0.0 || (1e-3..1e7).contains(&magnitude) {
        format!("{value}")
    } else {
        format!("{value:e}")
    }
}

fn plural(count: usize, one: &str, many: &str) -> String {
    format!("{count} {}", if count == 1 { one } else { many })
}

/// Runs `check`; returns the exit code.
pub fn run(out: &mut dyn Write, arguments: &CheckArgs, options: RenderOptions) -> io::Result<u8> {
    let earlier = match &arguments.against {
        Some(path) => match Earlier::load(path) {
            Ok(earlier) => Some(earlier),
            Err(message) => {
                crate::stderr_line!("error: {message}");
                return Ok(exit::SHEET_ERROR);
            }
        },
        None => None,
    };
    let tolerance = arguments.tolerance.unwrap_or(DEFAULT_TOLERANCE);
    let targets = targets(&arguments.paths);
    let json = options.format == Format::Json;
    let color = !json && io::stdout().is_terminal() && std::env::var_os("NO_COLOR").is_none();
    // Standard input is read here, in argument order, so that a second `-` still finds it empty
    // whichever thread gets to it first.
    let items: Vec<(&Target, Option<Result<SheetSource, String>>)> = targets
        .iter()
        .map(|target| {
            let from_stdin = target.path.is_none() && target.problem.is_none();
            let read = from_stdin.then(|| read_target(target, &arguments.limits.read_limits()));
            (target, read)
        })
        .collect();
    // The sheets share the cores: each gets its share for its own parse and long columns.
    let cores = crate::eval::available_cores();
    let settings = Settings {
        threads: (cores / items.len().clamp(1, cores)).max(1),
        ..arguments.limits.settings()
    };
    let check_one = |(target, read_before): &(&Target, Option<Result<SheetSource, String>>)| {
        let target: &Target = target;
        let read = match read_before {
            Some(read) => read.clone(),
            None => read_target(target, &arguments.limits.read_limits()),
        };
        match read {
            Err(message) => SheetReport {
                label: target.label.clone(),
                evaluation: None,
                unreadable: Some(message),
                moved: Vec::new(),
                added: Vec::new(),
                input_changes: Vec::new(),
                inputs: Vec::new(),
                unsigned: false,
                compared: false,
                no_earlier: false,
                code: exit::SHEET_ERROR,
            },
            Ok(source) => {
                let (evaluation, read) = super::evaluate_file_reading(
                    &source,
                    target.path.as_deref(),
                    arguments.allow_outside,
                    arguments.deny_warnings,
                    &settings,
                    &arguments.limits.read_limits(),
                );
                let inputs = super::all_inputs(&source, &read);
                let mut code = exit_code_for(&evaluation);
                let title = evaluation
                    .fields
                    .iter()
                    .rev()
                    .find(|field| field.name == "title")
                    .map(|field| field.text.as_str());
                let mut moved = Vec::new();
                let mut added = Vec::new();
                let mut input_changes = Vec::new();
                let mut no_earlier = false;
                if let Some(earlier) = &earlier {
                    match earlier.find(
                        &target.label,
                        target.path.as_deref(),
                        targets.len(),
                        target.relative.as_deref(),
                        title,
                    ) {
                        Some(sheet) => {
                            moved = compare(sheet, &evaluation, tolerance);
                            added = added_names(sheet, &evaluation);
                            input_changes = compare_inputs(sheet, &inputs);
                        }
                        None => no_earlier = true,
                    }
                }
                let unsigned = arguments.require_signoff
                    && !evaluation
                        .fields
                        .iter()
                        .any(|field| field.name == "checker" && !field.text.is_empty());
                let changed = !moved.is_empty()
                    || !added.is_empty()
                    || !input_changes.is_empty()
                    || no_earlier
                    || unsigned;
                if changed && code == exit::OK {
                    code = exit::CHECK_FAILED;
                }
                SheetReport {
                    label: target.label.clone(),
                    evaluation: Some(evaluation),
                    unreadable: None,
                    moved,
                    added,
                    input_changes,
                    inputs,
                    unsigned,
                    compared: earlier.is_some(),
                    no_earlier,
                    code,
                }
            }
        }
    };
    // Each sheet's report is printed (or turned into its JSON) as soon as the sheets before
    // it are done, then dropped: only its counts stay.
    let mut summaries = Vec::with_capacity(targets.len());
    let mut sheets_json = Vec::new();
    super::in_order::map_in_order(&items, check_one, |report: SheetReport| {
        if json {
            sheets_json.push(sheet_json(&report));
        } else {
            write_text(out, &report, options, color, tolerance)?;
        }
        summaries.push(Summary {
            code: report.code,
            counts: report.counts(),
        });
        Ok(())
    })?;
    let worst = summaries
        .iter()
        .map(|summary| summary.code)
        .max()
        .unwrap_or(exit::OK);
    let total = Total::of(&summaries);
    if json {
        let document = CheckDocument {
            sheets: sheets_json,
            total,
            exit_code: worst,
        };
        writeln!(
            out,
            "{}",
            serde_json::to_string_pretty(&document).map_err(io::Error::other)?
        )?;
    } else {
        writeln!(out, "{}", total.line(earlier.is_some()))?;
    }
    Ok(worst)
}

/// What stays of a sheet's report once it is printed.
struct Summary {
    code: u8,
    counts: Counts,
}

fn write_text(
    out: &mut dyn Write,
    report: &SheetReport,
    options: RenderOptions,
    color: bool,
    tolerance: f64,
) -> io::Result<()> {
    let label = &report.label;
    if let Some(message) = &report.unreadable {
        writeln!(out, "error: {message}")?;
        writeln!(out, "{label}: error (not checked)")?;
        return Ok(());
    }
    let Some(evaluation) = &report.evaluation else {
        return Ok(());
    };
    if !evaluation.diagnostics.is_empty() {
        if color {
            render::write_diagnostics(
                &mut Ansi::new(&mut *out),
                &evaluation.sources,
                &evaluation.diagnostics,
            )?;
        } else {
            render::write_diagnostics(
                &mut NoColor::new(&mut *out),
                &evaluation.sources,
                &evaluation.diagnostics,
            )?;
        }
    }
    for line in &evaluation.lines {
        if let LineResult::Check(check) = &line.result {
            if !check.passed {
                writeln!(
                    out,
                    "{label}:{}: failed check: {}",
                    line.number,
                    check_text(check, options.digits)
                )?;
            }
        }
    }
    if report.no_earlier {
        writeln!(
            out,
            "{label}: no earlier results for this sheet to compare with"
        )?;
    }
    if report.unsigned {
        writeln!(
            out,
            "{label}: not signed off: the title block names no checker (`@checker: …`)"
        )?;
    }
    for moved in &report.moved {
        let old = exact(moved.old_si_value);
        let in_row = moved
            .row
            .map(|row| format!(" in row {row}"))
            .unwrap_or_default();
        let old_unit = &moved.old_si_unit;
        let shown = (moved.old_shown.as_ref(), moved.new_shown.as_ref());
        match (moved.new_si_value, &moved.new_si_unit, moved.relative_change) {
            (Some(_), _, Some(relative)) if shown.0.is_some() && shown.1.is_some() => writeln!(
                out,
                "{label}:{}: `{}` moved{in_row}: {} -> {} ({}; relative change {relative:.3e} > {tolerance:e})",
                moved.line,
                moved.name,
                shown.0.map_or("", String::as_str),
                shown.1.map_or("", String::as_str),
                signed_percent(moved.signed_change),
            )?,
            (Some(new), _, Some(relative)) => writeln!(
                out,
                "{label}:{}: `{}` moved{in_row}: {old} -> {} {old_unit} (relative change {relative:.3e} > {tolerance:e})",
                moved.line,
                moved.name,
                exact(new)
            )?,
            (Some(new), Some(unit), None) => writeln!(
                out,
                "{label}:{}: `{}` changed dimension: {old} {old_unit} -> {} {unit}",
                moved.line,
                moved.name,
                exact(new)
            )?,
            _ => writeln!(
                out,
                "{label}:{}: `{}` is no longer computed (was {})",
                moved.line,
                moved.name,
                moved.old_shown.clone().unwrap_or(format!("{old} {old_unit}"))
            )?,
        }
    }
    for (line, name) in &report.added {
        writeln!(
            out,
            "{label}:{line}: `{name}` is new (not in the earlier run)"
        )?;
    }
    for change in &report.input_changes {
        writeln!(
            out,
            "{label}: input `{}` {} since the earlier run",
            change.path,
            match change.change {
                "changed" => "changed (its SHA-256 differs)",
                "added" => "is read now but was not",
                _ => "is no longer read",
            }
        )?;
    }
    if report.compared && !report.no_earlier {
        write_summary(out, report)?;
    }
    let counts = report.counts();
    let mut details = vec![
        plural(counts.values, "value", "values"),
        format!("{}/{} checks passed", counts.passed, counts.checks),
    ];
    if counts.errors > 0 {
        details.push(plural(counts.errors, "error", "errors"));
    }
    if counts.warnings > 0 {
        details.push(plural(counts.warnings, "warning", "warnings"));
    }
    if counts.moved > 0 {
        details.push(format!("{} moved", plural(counts.moved, "value", "values")));
    }
    writeln!(out, "{label}: {} ({})", report.status(), details.join(", "))
}

/// A signed relative change as a percentage: `+3.2 %`.
fn signed_percent(change: Option<f64>) -> String {
    match change {
        Some(change) => format!("{:+.3} %", change * 100.0),
        None => "new value".to_string(),
    }
}

/// The short table of what changed since the earlier run: moved, added, removed, inputs.
fn write_summary(out: &mut dyn Write, report: &SheetReport) -> io::Result<()> {
    let removed = report
        .moved
        .iter()
        .filter(|moved| moved.new_si_value.is_none())
        .count();
    let moved = report.moved.len() - removed;
    let changed_inputs = report.input_changes.len();
    if moved + removed + report.added.len() + changed_inputs == 0 {
        return Ok(());
    }
    writeln!(out, "{}: since the earlier run", report.label)?;
    writeln!(out, "  {:<16} {:>5}", "moved", moved)?;
    writeln!(out, "  {:<16} {:>5}", "added", report.added.len())?;
    writeln!(out, "  {:<16} {:>5}", "removed", removed)?;
    writeln!(out, "  {:<16} {:>5}", "inputs changed", changed_inputs)
}

#[derive(Serialize, Default)]
struct Total {
    sheets: usize,
    ok: usize,
    failed: usize,
    with_errors: usize,
    errors: usize,
    warnings: usize,
    failed_checks: usize,
    moved: usize,
}

impl Total {
    fn of(summaries: &[Summary]) -> Total {
        let mut total = Total {
            sheets: summaries.len(),
            ..Total::default()
        };
        for summary in summaries {
            match summary.code {
                exit::OK => total.ok += 1,
                exit::CHECK_FAILED => total.failed += 1,
                _ => total.with_errors += 1,
            }
            let counts = summary.counts;
            total.errors += counts.errors;
            total.warnings += counts.warnings;
            total.failed_checks += counts.checks - counts.passed;
            total.moved += counts.moved;
        }
        total
    }

    fn line(&self, against: bool) -> String {
        let mut details = vec![
            plural(self.errors, "error", "errors"),
            plural(self.warnings, "warning", "warnings"),
            plural(self.failed_checks, "failed check", "failed checks"),
        ];
        if against {
            details.push(format!("{} moved", plural(self.moved, "value", "values")));
        }
        format!(
            "total: {}: {} ok, {} failed, {} with errors ({})",
            plural(self.sheets, "sheet", "sheets"),
            self.ok,
            self.failed,
            self.with_errors,
            details.join(", ")
        )
    }
}

#[derive(Serialize)]
struct CheckDocument {
    sheets: Vec<SheetCheckJson>,
    total: Total,
    exit_code: u8,
}

#[derive(Serialize)]
struct SheetCheckJson {
    file: String,
    status: &'static str,
    #[serde(skip_serializing_if = "Vec::is_empty")]
    fields: Vec<FieldJson>,
    inputs: Vec<InputJson>,
    #[serde(skip_serializing_if = "std::ops::Not::not")]
    not_signed_off: bool,
    values: usize,
    checks: usize,
    passed_checks: usize,
    failed_checks: Vec<CheckJson<'static>>,
    diagnostics: Vec<DiagnosticJson>,
    #[serde(skip_serializing_if = "Option::is_none")]
    moved: Option<Vec<MovedJson>>,
    #[serde(skip_serializing_if = "std::ops::Not::not")]
    no_earlier_results: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    added: Option<Vec<AddedJson>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    input_changes: Option<Vec<InputChangeJson>>,
}

#[derive(Serialize)]
struct AddedJson {
    name: String,
    line: u64,
}

#[derive(Serialize)]
struct InputChangeJson {
    path: String,
    change: &'static str,
}

#[derive(Serialize)]
struct MovedJson {
    name: String,
    line: u64,
    #[serde(skip_serializing_if = "Option::is_none")]
    row: Option<usize>,
    old_si_value: f64,
    old_si_unit: String,
    new_si_value: Option<f64>,
    new_si_unit: Option<String>,
    relative_change: Option<f64>,
    /// In the line's display unit.
    old_value: Option<String>,
    new_value: Option<String>,
}

fn sheet_json(report: &SheetReport) -> SheetCheckJson {
    let counts = report.counts();
    let mut failed_checks = Vec::new();
    let mut diagnostics = Vec::new();
    if let Some(evaluation) = &report.evaluation {
        for line in &evaluation.lines {
            if let LineResult::Check(check) = &line.result {
                if !check.passed {
                    failed_checks.push(CheckJson {
                        line: line.number,
                        passed: false,
                        text: line.expression.clone(),
                        left: value_json(&check.left),
                        right: value_json(&check.right),
                        message: check.message.clone(),
                        rows: None,
                    });
                }
            }
        }
        diagnostics = diagnostics_json(&evaluation.sources, &evaluation.diagnostics);
    }
    if let Some(message) = &report.unreadable {
        diagnostics.push(unreadable_json(&report.label, message));
    }
    SheetCheckJson {
        file: report.label.clone(),
        status: report.status(),
        fields: report
            .evaluation
            .as_ref()
            .map(fields_json)
            .unwrap_or_default(),
        inputs: inputs_json(&report.inputs),
        not_signed_off: report.unsigned,
        values: counts.values,
        checks: counts.checks,
        passed_checks: counts.passed,
        failed_checks,
        diagnostics,
        moved: report.compared.then(|| {
            report
                .moved
                .iter()
                .map(|moved| MovedJson {
                    name: moved.name.clone(),
                    line: moved.line,
                    row: moved.row,
                    old_si_value: moved.old_si_value,
                    old_si_unit: moved.old_si_unit.clone(),
                    new_si_value: moved.new_si_value,
                    new_si_unit: moved.new_si_unit.clone(),
                    relative_change: moved.relative_change,
                    old_value: moved.old_shown.clone(),
                    new_value: moved.new_shown.clone(),
                })
                .collect()
        }),
        no_earlier_results: report.no_earlier,
        added: report.compared.then(|| {
            report
                .added
                .iter()
                .map(|(line, name)| AddedJson {
                    name: name.clone(),
                    line: *line,
                })
                .collect()
        }),
        input_changes: report.compared.then(|| {
            report
                .input_changes
                .iter()
                .map(|change| InputChangeJson {
                    path: change.path.clone(),
                    change: change.change,
                })
                .collect()
        }),
    }
}
