//! `fluxsheet report FILE -o REPORT.md|REPORT.html`: evaluates a sheet and writes its report,
//! atomically (a temporary file in the target's folder, then a rename), never over the sheet
//! itself.

use super::output_file::{refuse_output, write_atomically};
use super::{exit, exit_code_for, read_sheet};
use crate::render::report::{write_html, write_markdown, ReportContext};
use crate::render::RenderOptions;
use clap::Args;
use std::io::{self, Write};
use std::path::{Path, PathBuf};

#[derive(Args, Debug)]
#[command(
    after_help = "The format follows the output's extension: .md (Markdown) or .html (one \
self-contained page). The report is written even when a check fails or the sheet has errors (it \
says so); the exit code is the sheet's, as with `run`.\n\nExamples:\n  fluxsheet report \
worksheets/core_permeability.fxs -o core.html\n  fluxsheet report site.fxs -o site-report.md \
--digits 6"
)]
pub struct ReportArgs {
    /// The sheet (`-` reads standard input)
    pub file: String,
    /// The report to write: `.md` or `.html`
    #[arg(short = 'o', long = "output", value_name = "REPORT.md|REPORT.html")]
    pub output: PathBuf,
    /// Let `include` and `column … from` lines read files outside the sheet's folder tree
    #[arg(long)]
    pub allow_outside: bool,
    #[command(flatten)]
    pub limits: super::LimitArgs,
    #[command(flatten)]
    pub sampling: super::SampleArgs,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum ReportFormat {
    Markdown,
    Html,
}

fn format_of(path: &Path) -> Option<ReportFormat> {
    let extension = path.extension()?.to_str()?.to_ascii_lowercase();
    match extension.as_str() {
        "md" | "markdown" => Some(ReportFormat::Markdown),
        "html" | "htm" => Some(ReportFormat::Html),
        _ => None,
    }
}

/// Runs `report`; returns the exit code.
pub fn run(out: &mut dyn Write, arguments: &ReportArgs, options: RenderOptions) -> io::Result<u8> {
    let source = match read_sheet(&arguments.file, &arguments.limits.read_limits()) {
        Ok(source) => source,
        Err(message) => {
            crate::stderr_line!("error: {message}");
            return Ok(exit::SHEET_ERROR);
        }
    };
    let output = &arguments.output;
    let Some(format) = format_of(output) else {
        crate::stderr_line!(
            "error: cannot tell the report format from `{}`: name it *.md or *.html",
            output.display()
        );
        return Ok(exit::USAGE);
    };
    let path = (arguments.file != "-").then(|| Path::new(arguments.file.as_str()));
    let (evaluation, inputs) = super::evaluate_file_reading(
        &source,
        path,
        arguments.allow_outside,
        false,
        &super::Settings {
            sampling: arguments.sampling.sampling(),
            ..arguments.limits.settings()
        },
        &arguments.limits.read_limits(),
    );
    let nothing_to_sample = evaluation
        .diagnostics
        .iter()
        .find(|diagnostic| diagnostic.code == Some(crate::eval::NOTHING_TO_SAMPLE));
    if let Some(diagnostic) = nothing_to_sample {
        crate::stderr_line!("error: {}", diagnostic.message);
        return Ok(exit::USAGE);
    }
    if let Err(message) = refuse_output(output, &inputs.paths) {
        crate::stderr_line!("error: {message}");
        return Ok(exit::USAGE);
    }
    let all_inputs = super::all_inputs(&source, &inputs);
    let context = ReportContext {
        label: &source.label,
        source: &source.text,
        inputs: &all_inputs,
        evaluation: &evaluation,
        version: env!("CARGO_PKG_VERSION"),
        digits: options.digits,
    };
    // Drawn straight into the temporary file, which a signal removes.
    let written = write_atomically(output, |file| {
        let mut buffered = io::BufWriter::new(file);
        match format {
            ReportFormat::Markdown => write_markdown(&mut buffered, &context)?,
            ReportFormat::Html => write_html(&mut buffered, &context)?,
        }
        buffered.flush()
    });
    if let Err(error) = written {
        crate::stderr_line!("error: cannot write `{}`: {error}", output.display());
        return Ok(exit::SHEET_ERROR);
    }
    writeln!(out, "wrote {}", output.display())?;
    Ok(exit_code_for(&evaluation))
}
