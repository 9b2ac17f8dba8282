//! The calculation report of one sheet, as Markdown or as one self-contained HTML page: the
//! sheet's headings, comments and lines with values and units, its checks with their results,
//! the sources (exactly the built-in formulations the sheet used), the input's SHA-256, the
//! tool's version and the caution.
//!
//! The report is first turned into `Block`s, then written by one writer per format. A chart is
//! a `Block::Figure` holding finished SVG markup: the HTML writer inlines it as is, the Markdown
//! writer points to the HTML report. Each `plot` line of the sheet becomes a figure after its
//! row; the sheet's columns follow the lines as tables, a row per element.

use super::table::check_text;
use super::CAUTION;
use crate::eval::{Evaluation, LineResult, Severity};
use crate::library::Builtins;
use sha2::{Digest, Sha256};
use std::io::{self, Write};

/// A file a run read besides the main sheet (an included sheet, a data file).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct InputFile {
    /// Relative to the main sheet's folder, `/`-separated (`shared/site.fxs`, `../data/k.csv`).
    pub path: String,
    /// Lower-case hex SHA-256 of the bytes read.
    pub sha256: String,
    pub bytes: usize,
}

/// What a report is made from.
pub struct ReportContext<'a> {
    /// The sheet's file as given on the command line.
    pub label: &'a str,
    pub source: &'a str,
    /// The included sheets and data files the run read, with their hashes.
    pub inputs: &'a [InputFile],
    pub evaluation: &'a Evaluation,
    /// Version of the tool that wrote the report.
    pub version: &'a str,
    /// Significant figures of displayed values.
    pub digits: u32,
}

/// The lower-case hex SHA-256 of some bytes (of the sheet file, for the report).
pub fn sha256_hex(bytes: &[u8]) -> String {
    Sha256::digest(bytes)
        .iter()
        .map(|byte| format!("{byte:02x}"))
        .collect()
}

/// One piece of the sheet's body, in file order.
#[derive(Debug, Clone, PartialEq)]
pub enum Block {
    Heading(String),
    /// Consecutive whole-line comments, joined into one paragraph.
    Prose(String),
    /// Consecutive lines with results.
    Rows(Vec<Row>),
    /// A chart: SVG markup made by the tool (never by the sheet's text), inlined in HTML.
    Figure(Figure),
    /// The sheet's columns of one length: a header per column, a row per element.
    Columns {
        header: Vec<String>,
        rows: Vec<Vec<String>>,
    },
}

#[derive(Debug, Clone, PartialEq)]
pub struct Figure {
    pub caption: String,
    pub svg: String,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum RowKind {
    Value,
    CheckPassed,
    CheckFailed,
    Error,
    Skipped,
}

/// One line of the sheet in the report's table.
#[derive(Debug, Clone, PartialEq)]
pub struct Row {
    pub line: usize,
    pub name: String,
    pub value: String,
    pub unit: String,
    pub expression: String,
    /// The line's trailing comment.
    pub note: String,
    pub kind: RowKind,
}

/// A unit as shown in a cell: blank for a plain number.
fn unit_cell(unit: &str) -> String {
    if unit == "1" {
        String::new()
    } else {
        unit.to_string()
    }
}

/// The sheet's body as blocks.
pub fn blocks(evaluation: &Evaluation, digits: u32) -> Vec<Block> {
    let mut blocks: Vec<Block> = Vec::new();
    for line in &evaluation.lines {
        let note = line.comment.clone().unwrap_or_default().trim().to_string();
        let row = |value: String, unit: String, expression: String, kind: RowKind| Row {
            line: line.number,
            name: line.name.clone().unwrap_or_default(),
            value,
            unit,
            expression,
            note: note.clone(),
            kind,
        };
        let new_row = match &line.result {
            LineResult::Blank => None,
            LineResult::Comment => {
                if !note.is_empty() {
                    match blocks.last_mut() {
                        Some(Block::Prose(text)) => {
                            text.push(' ');
                            text.push_str(&note);
                        }
                        _ => blocks.push(Block::Prose(note.clone())),
                    }
                }
                None
            }
            LineResult::Heading(text) => {
                blocks.push(Block::Heading(text.trim().to_string()));
                None
            }
            LineResult::Value(shown) => Some(row(
                crate::render::table::value_cell(shown, digits),
                unit_cell(shown.unit()),
                match &line.note {
                    Some(note) => format!("{}  ({note})", line.expression),
                    None => line.expression.clone(),
                },
                RowKind::Value,
            )),
            LineResult::Plot(_) => Some(Row {
                name: "plot".to_string(),
                ..row(
                    String::new(),
                    String::new(),
                    line.expression.clone(),
                    RowKind::Value,
                )
            }),
            LineResult::Check(check) => Some(Row {
                name: "check".to_string(),
                ..row(
                    if check.passed { "passed" } else { "FAILED" }.to_string(),
                    String::new(),
                    check_text(check, digits),
                    if check.passed {
                        RowKind::CheckPassed
                    } else {
                        RowKind::CheckFailed
                    },
                )
            }),
            LineResult::Function { signature } => Some(row(
                "function".to_string(),
                String::new(),
                format!("{signature} = {}", line.expression),
                RowKind::Value,
            )),
            LineResult::Include { file } => Some(Row {
                name: "include".to_string(),
                ..row(String::new(), String::new(), file.clone(), RowKind::Value)
            }),
            LineResult::Error => Some(row(
                "error".to_string(),
                String::new(),
                line.expression.clone(),
                RowKind::Error,
            )),
            LineResult::Skipped { because_of } => Some(row(
                "-".to_string(),
                String::new(),
                format!(
                    "{}  (not evaluated: `{because_of}` has an error)",
                    line.expression
                ),
                RowKind::Skipped,
            )),
        };
        if let Some(new_row) = new_row {
            match blocks.last_mut() {
                Some(Block::Rows(rows)) => rows.push(new_row),
                _ => blocks.push(Block::Rows(vec![new_row])),
            }
        }
        if let LineResult::Plot(plot) = &line.result {
            let caption = plot
                .title
                .clone()
                .unwrap_or_else(|| line.expression.clone());
            // The caption carries the title; the drawing does not repeat it.
            match super::plot::plot_svg_untitled(plot) {
                // Inline SVG in HTML needs no namespace, and the report names no outside address.
                Ok(svg) => blocks.push(Block::Figure(Figure {
                    caption,
                    svg: svg.replacen(" xmlns=\"http://www.w3.org/2000/svg\"", "", 1),
                })),
                Err(error) => blocks.push(Block::Prose(format!(
                    "The chart of line {} cannot be drawn: {error}",
                    line.number
                ))),
            }
        }
    }
    for table in super::table::column_tables(evaluation) {
        blocks.push(Block::Columns {
            header: table.header(),
            rows: (0..table.rows)
                .map(|row| table.cells(row, digits))
                .collect(),
        });
    }
    if let Some(summary) = &evaluation.samples {
        blocks.extend(super::spread::report_blocks(summary, evaluation, digits));
    }
    blocks
}

/// A check for the report's check list.
struct CheckEntry {
    line: usize,
    written: String,
    evaluated: String,
    passed: bool,
}

fn checks(evaluation: &Evaluation, digits: u32) -> Vec<CheckEntry> {
    evaluation
        .lines
        .iter()
        .filter_map(|line| match &line.result {
            LineResult::Check(check) => Some(CheckEntry {
                line: line.number,
                written: line.expression.clone(),
                evaluated: check_text(check, digits),
                passed: check.passed,
            }),
            _ => None,
        })
        .collect()
}

/// One sentence on the outcome, for the report's header.
fn outcome(evaluation: &Evaluation) -> String {
    let errors = evaluation
        .diagnostics
        .iter()
        .filter(|diagnostic| diagnostic.severity == Severity::Error)
        .count();
    let total = evaluation
        .lines
        .iter()
        .filter(|line| matches!(line.result, LineResult::Check(_)))
        .count();
    let failed = evaluation.failed_checks();
    if errors > 0 {
        format!(
            "the sheet has {errors} error{}: its results are incomplete",
            if errors == 1 { "" } else { "s" }
        )
    } else if total == 0 {
        "evaluated without errors; the sheet has no checks".to_string()
    } else if failed == 0 {
        format!(
            "all {total} check{} passed",
            if total == 1 { "" } else { "s" }
        )
    } else {
        format!("{failed} of {total} checks FAILED")
    }
}

/// The sheet's title-block fields, labelled, in the order a title block reads.
fn title_block(evaluation: &Evaluation) -> Vec<(&'static str, String)> {
    const ORDER: [(&str, &str); 7] = [
        ("project", "Project"),
        ("job", "Job number"),
        ("title", "Title"),
        ("author", "Author"),
        ("checker", "Checker"),
        ("date", "Date"),
        ("revision", "Revision"),
    ];
    ORDER
        .iter()
        .filter_map(|(field, label)| {
            let text = evaluation
                .fields
                .iter()
                .rev()
                .find(|known| known.name == *field)?
                .text
                .clone();
            Some((
                *label,
                if text.is_empty() {
                    "(blank)".to_string()
                } else {
                    text
                },
            ))
        })
        .collect()
}

fn file_name(label: &str) -> &str {
    std::path::Path::new(label)
        .file_name()
        .and_then(|name| name.to_str())
        .unwrap_or(label)
}

// ----- Markdown -----

/// Text for Markdown: `|` and `\` escaped, and `<` where it could open an HTML tag.
fn md_cell(text: &str) -> String {
    let mut escaped = String::with_capacity(text.len());
    let mut characters = text.chars().peekable();
    while let Some(character) = characters.next() {
        match character {
            '\\' => escaped.push_str("\\\\"),
            '|' => escaped.push_str("\\|"),
            '<' if characters
                .peek()
                .is_some_and(|next| next.is_alphabetic() || matches!(next, '/' | '!' | '?')) =>
            {
                escaped.push_str("&lt;")
            }
            other => escaped.push(other),
        }
    }
    escaped
}

fn md_code(text: &str) -> String {
    if text.is_empty() {
        String::new()
    } else if text.contains('`') {
        format!("`` {} ``", md_cell(text))
    } else {
        format!("`{}`", text.replace('|', "\\|"))
    }
}

/// Writes the report as Markdown.
pub fn write_markdown(out: &mut dyn Write, context: &ReportContext) -> io::Result<()> {
    let evaluation = context.evaluation;
    writeln!(
        out,
        "# Calculation report: {}\n",
        md_cell(file_name(context.label))
    )?;
    writeln!(out, "| | |\n|---|---|")?;
    for (field, text) in title_block(evaluation) {
        writeln!(out, "| {field} | {} |", md_cell(&text))?;
    }
    writeln!(out, "| Sheet | {} |", md_code(context.label))?;
    writeln!(
        out,
        "| SHA-256 of the sheet | `{}` |",
        sha256_hex(context.source.as_bytes())
    )?;
    writeln!(
        out,
        "| Written by | fluxsheet {} |",
        md_cell(context.version)
    )?;
    writeln!(out, "| Result | {} |\n", md_cell(&outcome(evaluation)))?;
    writeln!(out, "## Calculation\n")?;
    for block in blocks(evaluation, context.digits) {
        match block {
            Block::Heading(text) => writeln!(out, "### {}\n", md_cell(&text))?,
            Block::Prose(text) => writeln!(out, "{}\n", md_cell(&text))?,
            Block::Rows(rows) => {
                writeln!(out, "| line | name | value | unit | expression | note |")?;
                writeln!(out, "|---:|---|---:|---|---|---|")?;
                for row in rows {
                    let value = match row.kind {
                        RowKind::CheckFailed | RowKind::Error => format!("**{}**", row.value),
                        _ => md_cell(&row.value),
                    };
                    writeln!(
                        out,
                        "| {} | {} | {} | {} | {} | {} |",
                        row.line,
                        md_cell(&row.name),
                        value,
                        md_cell(&row.unit),
                        md_code(&row.expression),
                        md_cell(&row.note)
                    )?;
                }
                writeln!(out)?;
            }
            Block::Figure(figure) => writeln!(
                out,
                "*Chart: {} (drawn in the HTML report).*\n",
                md_cell(&figure.caption)
            )?,
            Block::Columns { header, rows } => {
                let cells = |cells: &[String]| {
                    cells
                        .iter()
                        .map(|cell| md_cell(cell))
                        .collect::<Vec<_>>()
                        .join(" | ")
                };
                writeln!(out, "| {} |", cells(&header))?;
                writeln!(out, "|{}", "---:|".repeat(header.len()))?;
                for row in &rows {
                    writeln!(out, "| {} |", cells(row))?;
                }
                writeln!(out)?;
            }
        }
    }
    let working = super::working::working(evaluation, Builtins::standard(), context.digits);
    if !working.is_empty() {
        writeln!(out, "## Working\n")?;
        for step in &working {
            let name = step
                .name
                .as_deref()
                .map(|name| format!("{name} = "))
                .unwrap_or_default();
            writeln!(out, "Line {}:\n", step.line)?;
            writeln!(out, "```text\n{name}{}", step.expression)?;
            let indent = " ".repeat(name.chars().count().saturating_sub(2));
            writeln!(out, "{indent}= {}", step.substituted)?;
            writeln!(out, "{indent}= {}\n```\n", step.result)?;
            for relation in &step.relations {
                let after: Vec<String> = relation
                    .formulations
                    .iter()
                    .map(|title| md_cell(title))
                    .collect();
                let after = match after.is_empty() {
                    true => String::new(),
                    false => format!(", after {} (see Sources)", after.join("; ")),
                };
                writeln!(out, "{}{after}:\n", md_code(&relation.call))?;
                writeln!(out, "```text\n{}\n```\n", relation.steps().join("\n"))?;
            }
        }
    }
    let checks = checks(evaluation, context.digits);
    writeln!(out, "## Checks\n")?;
    if checks.is_empty() {
        writeln!(out, "The sheet has no check lines.\n")?;
    } else {
        writeln!(out, "| line | check | evaluated | result |")?;
        writeln!(out, "|---:|---|---|---|")?;
        for check in &checks {
            writeln!(
                out,
                "| {} | {} | {} | {} |",
                check.line,
                md_code(&check.written),
                md_cell(&check.evaluated),
                if check.passed { "passed" } else { "**FAILED**" }
            )?;
        }
        writeln!(out)?;
    }
    if !evaluation.diagnostics.is_empty() {
        writeln!(out, "## Errors and warnings\n")?;
        for diagnostic in &evaluation.diagnostics {
            let (_, line, column) = evaluation.sources.locate(diagnostic.span.start);
            writeln!(
                out,
                "- line {line}, column {column}, {}: {}",
                diagnostic.severity.word(),
                md_cell(&diagnostic.message)
            )?;
        }
        writeln!(out)?;
    }
    writeln!(out, "## Inputs\n")?;
    writeln!(out, "| file | bytes | SHA-256 |\n|---|---:|---|")?;
    for input in context.inputs {
        writeln!(
            out,
            "| {} | {} | `{}` |",
            md_code(&input.path),
            input.bytes,
            input.sha256
        )?;
    }
    writeln!(out)?;
    writeln!(out, "## Sources\n")?;
    let used = evaluation.provenance.formulations();
    if used.is_empty() {
        writeln!(
            out,
            "No built-in formulation was used: every value follows from the sheet's inputs, \
exact unit definitions and exact constants.\n"
        )?;
    } else {
        for formulation in used {
            writeln!(
                out,
                "- **{}**. {}. Valid for: {}.",
                md_cell(formulation.title),
                md_cell(formulation.citation),
                md_cell(formulation.validity)
            )?;
        }
        writeln!(out)?;
    }
    writeln!(out, "## Caution\n\n{CAUTION}")
}

// ----- HTML -----

fn escape(text: &str) -> String {
    let mut escaped = String::with_capacity(text.len());
    for character in text.chars() {
        match character {
            '&' => escaped.push_str("&amp;"),
            '<' => escaped.push_str("&lt;"),
            '>' => escaped.push_str("&gt;"),
            '"' => escaped.push_str("&quot;"),
            '\'' => escaped.push_str("&#39;"),
            other => escaped.push(other),
        }
    }
    escaped
}

const STYLE: &str = "
body { font-family: system-ui, -apple-system, 'Segoe UI', sans-serif; color: #1d2329; margin: 0; background: #fff; }
main { max-width: 64rem; margin: 0 auto; padding: 1.5rem; }
h1 { font-size: 1.5rem; margin-bottom: 0.5rem; }
h2 { font-size: 1.2rem; border-bottom: 1px solid #c9d1d9; padding-bottom: 0.2rem; margin-top: 2rem; }
h3 { font-size: 1.05rem; margin-top: 1.5rem; }
table { border-collapse: collapse; width: 100%; margin: 0.5rem 0 1rem; font-size: 0.92rem; }
th, td { border: 1px solid #d0d7de; padding: 0.25rem 0.5rem; text-align: left; vertical-align: top; }
th { background: #f3f5f7; }
td.number, td.value { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
code { font-family: ui-monospace, 'SFMono-Regular', Menlo, Consolas, monospace; font-size: 0.88em; }
table.meta { width: auto; }
table.lines { table-layout: fixed; }
table.lines th:nth-child(1) { width: 3.5rem; } table.lines th:nth-child(2) { width: 9rem; }
table.lines th:nth-child(3) { width: 6.5rem; } table.lines th:nth-child(4) { width: 7rem; }
table.lines th:nth-child(6) { width: 13rem; }
table.lines td { overflow-wrap: anywhere; }
table.meta th { text-align: left; font-weight: 600; }
tr.failed td, tr.error td { background: #fdecea; }
tr.failed td.value, tr.error td.value, span.failed { color: #a40e0e; font-weight: 700; }
span.passed { color: #116329; }
figure.chart { margin: 1rem 0; }
figure.chart svg { max-width: 100%; height: auto; }
div.step pre { margin: 0.25rem 0 0.5rem; white-space: pre-wrap; }
div.step p.relation, div.step pre.relation { margin-left: 1.5rem; }
div.step p.relation { font-size: 0.92rem; margin-bottom: 0; }
section.caution { background: #fff8e1; border-left: 4px solid #d29922; padding: 0.25rem 1rem; margin-top: 2rem; }
";

/// Writes the report as one HTML page with its style inline and no outside resources.
pub fn write_html(out: &mut dyn Write, context: &ReportContext) -> io::Result<()> {
    let evaluation = context.evaluation;
    let title = format!("Calculation report: {}", file_name(context.label));
    // The running header names the project, or the sheet's title when it has no project.
    let field = |name: &str| {
        evaluation
            .fields
            .iter()
            .rev()
            .find(|field| field.name == name && !field.text.is_empty())
            .map(|field| field.text.as_str())
    };
    let page_style = super::print::page_style(
        field("project").or_else(|| field("title")),
        file_name(context.label),
        context.version,
    );
    writeln!(
        out,
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n\
<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n\
<meta name=\"generator\" content=\"fluxsheet {}\">\n<title>{}</title>\n\
<style>{STYLE}{page_style}</style>\n</head>\n<body>\n<main>",
        escape(context.version),
        escape(&title)
    )?;
    writeln!(out, "<h1>{}</h1>", escape(&title))?;
    writeln!(out, "<table class=\"meta\">")?;
    for (field, text) in title_block(evaluation) {
        writeln!(
            out,
            "<tr><th>{field}</th><td data-field=\"{}\">{}</td></tr>",
            field.to_lowercase(),
            escape(&text)
        )?;
    }
    writeln!(
        out,
        "<tr><th>Sheet</th><td><code>{}</code></td></tr>",
        escape(context.label)
    )?;
    writeln!(
        out,
        "<tr><th>SHA-256 of the sheet</th><td><code id=\"sha256\">{}</code></td></tr>",
        sha256_hex(context.source.as_bytes())
    )?;
    writeln!(
        out,
        "<tr><th>Written by</th><td>fluxsheet {}</td></tr>",
        escape(context.version)
    )?;
    writeln!(
        out,
        "<tr><th>Result</th><td id=\"result\">{}</td></tr>\n</table>",
        escape(&outcome(evaluation))
    )?;
    writeln!(out, "<section class=\"calculation\">\n<h2>Calculation</h2>")?;
    for block in blocks(evaluation, context.digits) {
        match block {
            Block::Heading(text) => writeln!(out, "<h3>{}</h3>", escape(&text))?,
            Block::Prose(text) => writeln!(out, "<p>{}</p>", escape(&text))?,
            Block::Rows(rows) => write_html_rows(out, &rows)?,
            Block::Figure(figure) => writeln!(
                out,
                "<figure class=\"chart\">{}<figcaption>{}</figcaption></figure>",
                figure.svg,
                escape(&figure.caption)
            )?,
            Block::Columns { header, rows } => {
                writeln!(
                    out,
                    "<table class=\"columns{}\">\n<thead><tr>",
                    super::print::whole_class(rows.len())
                )?;
                for cell in &header {
                    write!(out, "<th>{}</th>", escape(cell))?;
                }
                writeln!(out, "</tr></thead>\n<tbody>")?;
                for row in &rows {
                    write!(out, "<tr>")?;
                    for cell in row {
                        write!(out, "<td class=\"number\">{}</td>", escape(cell))?;
                    }
                    writeln!(out, "</tr>")?;
                }
                writeln!(out, "</tbody>\n</table>")?;
            }
        }
    }
    writeln!(out, "</section>")?;
    let working = super::working::working(evaluation, Builtins::standard(), context.digits);
    if !working.is_empty() {
        writeln!(out, "<section class=\"working\">\n<h2>Working</h2>")?;
        for step in &working {
            let name = step
                .name
                .as_deref()
                .map(|name| format!("{name} = "))
                .unwrap_or_default();
            let indent = " ".repeat(name.chars().count().saturating_sub(2));
            writeln!(
                out,
                "<div class=\"step\"><p>Line {}</p><pre>{}{}\n{indent}= {}\n{indent}= {}</pre>",
                step.line,
                escape(&name),
                escape(&step.expression),
                escape(&step.substituted),
                escape(&step.result)
            )?;
            for relation in &step.relations {
                let after: Vec<String> = relation
                    .formulations
                    .iter()
                    .map(|title| escape(title))
                    .collect();
                let after = match after.is_empty() {
                    true => String::new(),
                    false => format!(", after {} (see Sources)", after.join("; ")),
                };
                writeln!(
                    out,
                    "<p class=\"relation\"><code>{}</code>{after}:</p>\
<pre class=\"relation\">{}</pre>",
                    escape(&relation.call),
                    escape(&relation.steps().join("\n"))
                )?;
            }
            writeln!(out, "</div>")?;
        }
        writeln!(out, "</section>")?;
    }
    let checks = checks(evaluation, context.digits);
    writeln!(out, "<section class=\"checks\">\n<h2>Checks</h2>")?;
    if checks.is_empty() {
        writeln!(out, "<p>The sheet has no check lines.</p>")?;
    } else {
        writeln!(
            out,
            "<table class=\"checks\">\n<thead><tr><th>line</th><th>check</th><th>evaluated</th>\
<th>result</th></tr></thead>\n<tbody>"
        )?;
        for check in &checks {
            let (class, word) = if check.passed {
                ("passed", "passed")
            } else {
                ("failed", "FAILED")
            };
            writeln!(
                out,
                "<tr class=\"{class}\"><td class=\"number\">{}</td><td><code>{}</code></td>\
<td>{}</td><td><span class=\"{class}\">{word}</span></td></tr>",
                check.line,
                escape(&check.written),
                escape(&check.evaluated)
            )?;
        }
        writeln!(out, "</tbody>\n</table>")?;
    }
    writeln!(out, "</section>")?;
    if !evaluation.diagnostics.is_empty() {
        writeln!(
            out,
            "<section class=\"diagnostics\">\n<h2>Errors and warnings</h2>\n<ul>"
        )?;
        for diagnostic in &evaluation.diagnostics {
            let (_, line, column) = evaluation.sources.locate(diagnostic.span.start);
            writeln!(
                out,
                "<li>line {line}, column {column}, {}: {}</li>",
                diagnostic.severity.word(),
                escape(&diagnostic.message)
            )?;
        }
        writeln!(out, "</ul>\n</section>")?;
    }
    writeln!(
        out,
        "<section class=\"inputs\">\n<h2>Inputs</h2>\n<table class=\"inputs\">\n\
<thead><tr><th>file</th><th>bytes</th><th>SHA-256</th></tr></thead>\n<tbody>"
    )?;
    for input in context.inputs {
        writeln!(
            out,
            "<tr><td><code>{}</code></td><td class=\"number\">{}</td><td><code>{}</code></td></tr>",
            escape(&input.path),
            input.bytes,
            input.sha256
        )?;
    }
    writeln!(out, "</tbody>\n</table>\n</section>")?;
    writeln!(out, "<section class=\"sources\">\n<h2>Sources</h2>")?;
    let used = evaluation.provenance.formulations();
    if used.is_empty() {
        writeln!(
            out,
            "<p>No built-in formulation was used: every value follows from the sheet's inputs, \
exact unit definitions and exact constants.</p>"
        )?;
    } else {
        writeln!(out, "<ul>")?;
        for formulation in used {
            writeln!(
                out,
                "<li data-formulation=\"{}\"><strong>{}</strong>. {}. Valid for: {}.</li>",
                escape(formulation.id),
                escape(formulation.title),
                escape(formulation.citation),
                escape(formulation.validity)
            )?;
        }
        writeln!(out, "</ul>")?;
    }
    writeln!(out, "</section>")?;
    writeln!(
        out,
        "<section class=\"caution\">\n<h2>Caution</h2>\n<p>{}</p>\n</section>\n</main>\n</body>\n</html>",
        escape(CAUTION)
    )
}

fn write_html_rows(out: &mut dyn Write, rows: &[Row]) -> io::Result<()> {
    writeln!(
        out,
        "<table class=\"lines{}\">\n<thead><tr><th>line</th><th>name</th><th>value</th><th>unit</th>\
<th>expression</th><th>note</th></tr></thead>\n<tbody>",
        super::print::whole_class(rows.len())
    )?;
    for row in rows {
        let class = match row.kind {
            RowKind::Value => "value",
            RowKind::CheckPassed => "passed",
            RowKind::CheckFailed => "failed",
            RowKind::Error => "error",
            RowKind::Skipped => "skipped",
        };
        writeln!(
            out,
            "<tr class=\"{class}\"><td class=\"number\">{}</td><td>{}</td><td class=\"value\">{}</td>\
<td>{}</td><td><code>{}</code></td><td>{}</td></tr>",
            row.line,
            escape(&row.name),
            escape(&row.value),
            escape(&row.unit),
            escape(&row.expression),
            escape(&row.note)
        )?;
    }
    writeln!(out, "</tbody>\n</table>")
}

#[cfg(test)]
mod tests {
    use super::{escape, sha256_hex};

    #[test]
    fn sha256_of_a_known_text() {
        // FIPS 180-2 example "abc".
        assert_eq!(
            sha256_hex(b"abc"),
            "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
        );
    }

    #[test]
    fn html_escapes_markup() {
        assert_eq!(
            escape("a < b & \"c\" > 'd'"),
            "a &lt; b &amp; &quot;c&quot; &gt; &#39;d&#39;"
        );
    }
}
