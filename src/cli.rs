//! The command-line front door: argument definitions (clap), and the commands `run`, `eval`
//! and `units` (the others in `cli/`). With `repl`, `lsp` and `front`, the only code that reads
//! files or writes to the terminal; everything else is handed writers.
//!
//! Over 800 lines: the clap definitions of every command with their help texts, beside the
//! commands that share their loading and output settings.

use crate::eval::warnings::deny_warnings;
use crate::eval::{
    evaluate, evaluate_with, Evaluation, LineResult, Settings, Shown, NOTHING_TO_SAMPLE,
    UNKNOWN_OVERRIDE,
};
use crate::front::limits::{FileKind, ReadLimits};
use crate::front::streams::{error_stream, PipeSafe};
use crate::library::Builtins;
use crate::render::json::{diagnostics_json, sheet_json, DiagnosticJson};
use crate::render::report::InputFile;
use crate::render::{self, Format, RenderOptions};
use crate::units::unit::{catalog_entries, prefixes};
use crate::units::Dimension;
use clap::{Args, Parser, Subcommand, ValueEnum};
use std::io::{self, Write};
use std::path::{Path, PathBuf};

mod against;
mod check;
mod functions;
mod in_order;
mod output_file;
mod plots;
mod properties;
mod report;
mod sample_args;

pub use sample_args::SampleArgs;

/// Exit codes, as documented in the README.
pub use crate::front::exit;

#[derive(Parser, Debug)]
#[command(
    name = "fluxsheet",
    version,
    about = "Calculation sheets with units for Darcy, Fick, Fourier and Ohm transport in porous media",
    long_about = "Evaluates plain-text calculation sheets (.fxs): named lines with units, full dimensional \
analysis and exact unit conversion, printed as a table.\n\nExit codes: 0 all good, 1 a check line failed, \
2 bad command line, 3 the sheet has errors or a file cannot be read.",
    after_help = "Examples:\n  fluxsheet run worksheets/core_permeability.fxs\n  fluxsheet eval '250 mD * 1000 kg/m^3 * g0 / 1 cP [m/s]'\n  fluxsheet units pressure"
)]
pub struct CommandLine {
    #[command(flatten)]
    pub output: OutputArgs,
    /// Without a command, an interactive session starts (`fluxsheet repl`).
    #[command(subcommand)]
    pub command: Option<Command>,
}

#[derive(Args, Debug, Clone, Copy)]
pub struct OutputArgs {
    /// Output format
    #[arg(long, value_enum, default_value_t = FormatArg::Table, global = true)]
    pub format: FormatArg,
    /// Significant figures of displayed values (1 to 17; default 4, and 15 for CSV, whose
    /// numbers are read back by programs)
    #[arg(long, global = true, value_parser = clap::value_parser!(u32).range(1..=17))]
    pub digits: Option<u32>,
}

/// Significant figures shown when `--digits` is not given.
const DEFAULT_DIGITS: u32 = 4;
/// CSV's default: 15 significant figures are all a double holds of a decimal value, without
/// the last-bit noise of converting it back from SI (`420.00000000000006 mD`).
const FULL_PRECISION_DIGITS: u32 = 15;

#[derive(ValueEnum, Debug, Clone, Copy, PartialEq, Eq)]
pub enum FormatArg {
    Table,
    Markdown,
    Csv,
    Json,
}

#[derive(Args, Debug)]
pub struct RunArgs {
    /// Sheet files (`-` reads standard input)
    #[arg(required = true)]
    pub files: Vec<String>,
    /// Let `include` and `column … from` lines read files outside the sheet's folder tree
    #[arg(long)]
    pub allow_outside: bool,
    /// Treat warnings as errors (exit code 3)
    #[arg(long)]
    pub deny_warnings: bool,
    /// Replace the line NAME by VALUE for this run (what-if), e.g. `k_lab=40 mD` or
    /// `T=0 degC to 40 degC step 5 K`; the value must have the line's dimension
    #[arg(long = "set", value_name = "NAME=VALUE")]
    pub overrides: Vec<String>,
    /// Write the sheet's `plot` lines as SVG: the first to FILE, the next to FILE-2.svg, …
    #[arg(long, value_name = "FILE.svg")]
    pub plot: Option<PathBuf>,
    /// After the table, show the working of each computed line: the expression, the values put
    /// in, the result, and the formula of each built-in relation with its source
    #[arg(long)]
    pub working: bool,
    #[command(flatten)]
    pub limits: LimitArgs,
    #[command(flatten)]
    pub sampling: SampleArgs,
}

/// Limits shared by the commands that evaluate sheets.
#[derive(Args, Debug, Clone, Copy)]
pub struct LimitArgs {
    /// Longest column a sheet may make (ranges, lists, data files)
    #[arg(long, value_name = "ROWS", default_value_t = crate::eval::columns::DEFAULT_MAX_ROWS)]
    pub max_rows: usize,
    /// Most rows all of a sheet's columns may hold together
    #[arg(long, value_name = "ROWS", default_value_t = crate::eval::columns::DEFAULT_MAX_TOTAL_ROWS)]
    pub max_total_rows: usize,
    /// Largest sheet file, included sheet or standard input, in bytes
    #[arg(long, value_name = "BYTES", default_value_t = crate::front::limits::DEFAULT_MAX_SHEET_BYTES)]
    pub max_sheet_bytes: u64,
    /// Largest data file (`column … from`), in bytes
    #[arg(long, value_name = "BYTES", default_value_t = crate::front::limits::DEFAULT_MAX_DATA_BYTES)]
    pub max_data_bytes: u64,
    /// The cell separator of data files, when the header line does not make it plain (by
    /// default each file's own: a first line `sep=;`, or the commonest of `,` `;` tab in its
    /// header)
    #[arg(long, value_enum, value_name = "SEPARATOR")]
    pub data_delimiter: Option<DelimiterArg>,
}

#[derive(ValueEnum, Debug, Clone, Copy, PartialEq, Eq)]
pub enum DelimiterArg {
    Comma,
    Semicolon,
    Tab,
}

impl LimitArgs {
    pub fn settings(&self) -> Settings {
        Settings {
            max_rows: self.max_rows,
            max_total_rows: self.max_total_rows,
            data_delimiter: self.data_delimiter.map(|delimiter| match delimiter {
                DelimiterArg::Comma => b',',
                DelimiterArg::Semicolon => b';',
                DelimiterArg::Tab => b'\t',
            }),
            ..Settings::default()
        }
    }

    /// The sizes of the files a command may read.
    pub fn read_limits(&self) -> crate::front::limits::ReadLimits {
        crate::front::limits::ReadLimits {
            sheet_bytes: self.max_sheet_bytes,
            data_bytes: self.max_data_bytes,
        }
    }
}

#[derive(Subcommand, Debug)]
pub enum Command {
    /// Evaluate sheets and print the table of their lines
    #[command(
        after_help = "Examples:\n  fluxsheet run worksheets/core_permeability.fxs\n  fluxsheet run --format json a.fxs b.fxs\n  fluxsheet run site.fxs --set k_lab=40mD --set 'T_site=0 degC to 40 degC step 5 K'\n  fluxsheet run sweep.fxs --plot sweep.svg\n  cat site.fxs | fluxsheet run -"
    )]
    Run(RunArgs),
    /// Check sheets and folders of sheets: print only errors, warnings and failed checks
    Check(check::CheckArgs),
    /// Write a calculation report of a sheet as Markdown or self-contained HTML
    Report(report::ReportArgs),
    /// Evaluate one expression or line and print its value and unit
    #[command(
        after_help = "Examples:\n  fluxsheet eval '1 acre*ft [m^3]' --digits 15\n  fluxsheet eval 'sqrt(4 m^2)'\n  fluxsheet eval '300 K [degC]'\n  fluxsheet eval '-40 degF [degC]'"
    )]
    Eval {
        /// The expression, optionally followed by `[unit]`, or a line `name = expression`
        // A sheet expression may start with a minus sign (`-40 degF`); options still work
        // before or after it.
        #[arg(allow_hyphen_values = true, value_parser = expression_argument)]
        expression: String,
    },
    /// List the unit catalog: symbols, dimensions, exact factors and sources
    #[command(
        after_help = "Examples:\n  fluxsheet units\n  fluxsheet units pressure\n  fluxsheet units darcy"
    )]
    Units {
        /// Show only units whose symbol or name contains this text, or of this dimension (`length`)
        filter: Option<String>,
    },
    /// Print a table of fluid properties versus temperature
    Properties(properties::PropertiesArgs),
    /// List built-in functions and constants, or show one (or a formulation by its id) in full
    #[command(
        after_help = "Examples:\n  fluxsheet functions\n  fluxsheet functions darcy\n  fluxsheet functions water_viscosity\n  fluxsheet functions iapws-2008-viscosity"
    )]
    Functions {
        /// Show only entries whose name contains this text; an exact name or formulation id
        /// shows that entry in full
        filter: Option<String>,
    },
    /// Start an interactive session (also `fluxsheet` with no command)
    #[command(
        after_help = "Enter sheet lines or expressions; `:help` lists the session's commands.\nWithout a terminal, lines are read from standard input (exit 3 if any had an error).\nHistory: $XDG_DATA_HOME/fluxsheet/history (FLUXSHEET_HISTORY=off or =PATH changes it).\n\nExamples:\n  fluxsheet repl worksheets/core_permeability.fxs\n  printf 'k = 420 mD\\nk [m^2]\\n' | fluxsheet repl"
    )]
    Repl {
        /// A sheet to load first (created by `:save` if it does not exist)
        file: Option<String>,
    },
    /// Serve the language server protocol over standard input and output, for editors
    #[command(
        after_help = "Editors start it themselves; the README shows the set-up for Neovim, Helix and VS Code."
    )]
    Lsp,
    /// Print a shell completion script (bash, zsh, fish or powershell) to standard output
    #[command(
        after_help = "Examples:\n  fluxsheet completions bash > ~/.local/share/bash-completion/completions/fluxsheet\n  fluxsheet completions zsh > \"${fpath[1]}/_fluxsheet\"\n  fluxsheet completions fish > ~/.config/fish/completions/fluxsheet.fish"
    )]
    Completions {
        /// The shell
        shell: clap_complete::Shell,
    },
    /// Print the manual page (roff) to standard output
    #[command(after_help = "Example:\n  fluxsheet manual > fluxsheet.1 && man ./fluxsheet.1")]
    Manual,
}

impl OutputArgs {
    pub fn options(&self) -> RenderOptions {
        let format = match self.format {
            FormatArg::Table => Format::Table,
            FormatArg::Markdown => Format::Markdown,
            FormatArg::Csv => Format::Csv,
            FormatArg::Json => Format::Json,
        };
        let digits = match (self.digits, format) {
            (Some(digits), _) => digits,
            (None, Format::Csv) => FULL_PRECISION_DIGITS,
            (None, _) => DEFAULT_DIGITS,
        };
        let width = (format == Format::Table).then(table_width);
        RenderOptions {
            format,
            digits,
            width,
        }
    }
}

/// The width terminal tables are fitted to when standard output is not a terminal (a pipe or
/// a file, usually read later in a terminal or an editor).
pub const WIDTH_WITHOUT_TERMINAL: usize = 100;

/// The width of terminal tables: `COLUMNS` when it holds a number, else the terminal's own
/// width when standard output is one, else `WIDTH_WITHOUT_TERMINAL`.
pub fn table_width() -> usize {
    let from_environment = std::env::var("COLUMNS")
        .ok()
        .and_then(|text| text.trim().parse::<usize>().ok())
        .filter(|columns| *columns > 0);
    from_environment
        .or_else(|| {
            terminal_size::terminal_size_of(io::stdout())
                .map(|(terminal_size::Width(columns), _)| usize::from(columns))
        })
        .unwrap_or(WIDTH_WITHOUT_TERMINAL)
        .max(crate::render::text_table::NARROWEST)
}

/// The expression of `eval`, which may start with one minus sign. A leading `--word` is a
/// mistyped option, not an expression (no one writes `-(-x)` as `--x`), so clap refuses it as
/// a usage error instead of the evaluator reporting an unknown name.
fn expression_argument(text: &str) -> Result<String, String> {
    let option_like = text
        .strip_prefix("--")
        .is_some_and(|rest| rest.starts_with(|c: char| c.is_alphabetic()));
    if option_like {
        Err(format!(
            "`{text}` is not an option of `eval`, and an expression cannot start with `--` \
             (`fluxsheet eval --help` lists the options)"
        ))
    } else {
        Ok(text.to_string())
    }
}

/// Why `--format` (a global option) cannot apply to `command`, so that no flag is accepted and
/// silently ignored.
fn refused_format(command: &Command, format: Format) -> Option<String> {
    let name = match format {
        Format::Table => return None,
        Format::Markdown => "markdown",
        Format::Csv => "csv",
        Format::Json => "json",
    };
    match (command, format) {
        (Command::Check(_), Format::Markdown | Format::Csv) => Some(format!(
            "`check` writes a summary (the default) or `--format json`, not `{name}`: for the \
             values of a sheet as {name}, use `fluxsheet run --format {name}`"
        )),
        (Command::Report(_), _) => Some(format!(
            "`report` takes its format from the output file's name (*.md or *.html), not from \
             `--format {name}`: for JSON, use `fluxsheet run --format json`"
        )),
        (Command::Repl { .. }, _) => Some(format!(
            "the interactive session shows values as it goes; `--format {name}` does not \
             apply to it (`fluxsheet run --format {name} FILE` writes a sheet as {name})"
        )),
        (Command::Completions { .. } | Command::Manual, _) => {
            Some(format!("`--format {name}` does not apply to this command"))
        }
        _ => None,
    }
}

/// Runs a parsed command line and returns the process exit code. Standard output tolerates a
/// closed pipe (`run bad.fxs | head -1`): the commands finish and the exit code is still the
/// sheet's.
pub fn run(command_line: CommandLine) -> u8 {
    // The language server owns standard input and output for the protocol.
    if let Some(Command::Lsp) = &command_line.command {
        return crate::lsp::run();
    }
    let options = command_line.output.options();
    let mut out = PipeSafe::new(io::stdout().lock());
    let refusal = match &command_line.command {
        Some(command) => refused_format(command, options.format),
        None => refused_format(&Command::Repl { file: None }, options.format),
    };
    if let Some(message) = refusal {
        crate::stderr_line!("error: {message}");
        return exit::USAGE;
    }
    let Some(command) = &command_line.command else {
        return finish(crate::repl::run(None, options, &mut out), &mut out);
    };
    let result = match command {
        Command::Run(arguments) => run_files(&mut out, arguments, options),
        Command::Check(arguments) => check::run(&mut out, arguments, options),
        Command::Report(arguments) => report::run(&mut out, arguments, options),
        Command::Eval { expression } => eval_expression(&mut out, expression, options),
        Command::Units { filter } => {
            list_units(&mut out, filter.as_deref(), options).map(|_| exit::OK)
        }
        Command::Functions { filter } => {
            functions::write_functions(&mut out, filter.as_deref(), options).map(|_| exit::OK)
        }
        Command::Properties(arguments) => {
            properties::run(&mut out, arguments, &command_line.output)
        }
        Command::Repl { file } => crate::repl::run(file.as_deref(), options, &mut out),
        // Served above, before standard output is locked.
        Command::Lsp => Ok(exit::OK),
        Command::Completions { shell } => {
            let mut definition = <CommandLine as clap::CommandFactory>::command();
            clap_complete::generate(*shell, &mut definition, "fluxsheet", &mut out);
            Ok(exit::OK)
        }
        Command::Manual => {
            let definition = <CommandLine as clap::CommandFactory>::command();
            clap_mangen::Man::new(definition)
                .render(&mut out)
                .map(|_| exit::OK)
        }
    };
    finish(result, &mut out)
}

/// The exit code of a command's result, after flushing its output.
fn finish(result: io::Result<u8>, out: &mut dyn Write) -> u8 {
    match result.and_then(|code| out.flush().map(|_| code)) {
        Ok(code) => code,
        Err(error) => {
            crate::stderr_line!("error: cannot write output: {error}");
            exit::SHEET_ERROR
        }
    }
}

/// A sheet's text and the name to show for it.
#[derive(Clone)]
pub(crate) struct SheetSource {
    pub label: String,
    pub text: String,
}

/// Reads the sheet `file` (`-`: standard input), refusing one larger than `limits` allow.
pub(crate) fn read_sheet(file: &str, limits: &ReadLimits) -> Result<SheetSource, String> {
    if file == "-" {
        let text = limits.read_text(io::stdin().lock(), "<stdin>", FileKind::Sheet)?;
        return Ok(SheetSource {
            label: "<stdin>".to_string(),
            text,
        });
    }
    let text = limits.read_file(Path::new(file), file, FileKind::Sheet)?;
    Ok(SheetSource {
        label: file.to_string(),
        text,
    })
}

fn exit_code_for(evaluation: &Evaluation) -> u8 {
    if evaluation.has_errors() {
        exit::SHEET_ERROR
    } else if evaluation.failed_checks() > 0 {
        exit::CHECK_FAILED
    } else {
        exit::OK
    }
}

/// Every input of a run: the main sheet, then the included sheets and data files, each with
/// its SHA-256 (the JSON `inputs` and the report's input table).
pub(crate) fn all_inputs(source: &SheetSource, read: &ReadInputs) -> Vec<InputFile> {
    let main = InputFile {
        path: Path::new(&source.label)
            .file_name()
            .map_or(source.label.clone(), |name| {
                name.to_string_lossy().into_owned()
            }),
        sha256: render::report::sha256_hex(source.text.as_bytes()),
        bytes: source.text.len(),
    };
    std::iter::once(main)
        .chain(read.hashed.iter().cloned())
        .collect()
}

/// The files a run read besides the main sheet: canonical paths (which no output may
/// replace) and, for the record, each file's hash.
pub(crate) struct ReadInputs {
    pub paths: Vec<PathBuf>,
    pub hashed: Vec<InputFile>,
}

/// Evaluates a sheet read from a file (or stdin when `path` is `None`) with its includes under
/// the folder sandbox; warnings become errors with `deny`. Shared by `run`, `check`, `report`.
/// Returns every file the run read: the sheet, its includes and data files (the inputs an
/// output file must not replace), with their hashes.
pub(crate) fn evaluate_file_reading(
    source: &SheetSource,
    path: Option<&Path>,
    allow_outside: bool,
    deny: bool,
    settings: &Settings,
    limits: &ReadLimits,
) -> (Evaluation, ReadInputs) {
    let mut loader =
        crate::front::includes::FileIncludeLoader::new(&source.label, path, allow_outside)
            .with_limits(*limits);
    let mut evaluation = evaluate_with(
        &source.label,
        &source.text,
        Builtins::standard(),
        &mut loader,
        settings,
    );
    if deny {
        deny_warnings(&mut evaluation);
    }
    let paths = path
        .map(Path::to_path_buf)
        .into_iter()
        .chain(loader.files_read().iter().cloned())
        .collect();
    let hashed = loader.inputs().to_vec();
    (evaluation, ReadInputs { paths, hashed })
}

/// `NAME=VALUE` pairs of `--set`, checked for shape (the names are checked against the sheet).
fn parse_overrides(overrides: &[String]) -> Result<Vec<(String, String)>, String> {
    overrides
        .iter()
        .map(|pair| match pair.split_once('=') {
            Some((name, value)) if !name.trim().is_empty() && !value.trim().is_empty() => {
                Ok((name.trim().to_string(), value.trim().to_string()))
            }
            _ => Err(format!(
                "`--set {pair}`: write NAME=VALUE, e.g. `--set k_lab=40mD`"
            )),
        })
        .collect()
}

fn run_files(out: &mut dyn Write, arguments: &RunArgs, options: RenderOptions) -> io::Result<u8> {
    let files = &arguments.files;
    let (allow_outside, deny) = (arguments.allow_outside, arguments.deny_warnings);
    let mut settings = arguments.limits.settings();
    settings.sampling = arguments.sampling.sampling();
    let read_limits = arguments.limits.read_limits();
    settings.overrides = match parse_overrides(&arguments.overrides) {
        Ok(overrides) => overrides,
        Err(message) => {
            crate::stderr_line!("error: {message}");
            return Ok(exit::USAGE);
        }
    };
    if arguments.plot.is_some() && files.len() != 1 {
        crate::stderr_line!("error: `--plot` draws the plots of one sheet; give one file");
        return Ok(exit::USAGE);
    }
    let mut worst = exit::OK;
    let mut json_sheets = Vec::new();
    for (index, file) in files.iter().enumerate() {
        let source = match read_sheet(file, &read_limits) {
            Ok(source) => source,
            Err(message) => {
                worst = exit::SHEET_ERROR;
                if options.format == Format::Json {
                    json_sheets.push(JsonSheet::Unreadable(serde_json::json!({ "file": file, "diagnostics": [unreadable_json(file, &message)] })));
                } else {
                    crate::stderr_line!("error: {message}");
                }
                continue;
            }
        };
        let path = (file != "-").then(|| Path::new(file.as_str()));
        let (evaluation, inputs) =
            evaluate_file_reading(&source, path, allow_outside, deny, &settings, &read_limits);
        if evaluation.diagnostics.iter().any(|diagnostic| {
            diagnostic.code == Some(UNKNOWN_OVERRIDE) || diagnostic.code == Some(NOTHING_TO_SAMPLE)
        }) {
            render::write_diagnostics(
                &mut error_stream(),
                &evaluation.sources,
                &evaluation.diagnostics,
            )?;
            return Ok(exit::USAGE);
        }
        worst = worst.max(exit_code_for(&evaluation));
        if let Some(target) = &arguments.plot {
            match plots::write_plots(&evaluation, target, &inputs.paths) {
                Ok(written) => {
                    for file in written {
                        crate::stderr_line!("wrote {}", file.display());
                    }
                }
                Err((code, message)) => {
                    crate::stderr_line!("error: {message}");
                    worst = worst.max(code);
                }
            }
        }
        if options.format == Format::Json {
            let inputs = all_inputs(&source, &inputs);
            json_sheets.push(JsonSheet::Evaluated {
                label: source.label,
                evaluation,
                inputs,
            });
            continue;
        }
        if files.len() > 1 {
            if index > 0 {
                writeln!(out)?;
            }
            writeln!(out, "{}", source.label)?;
        }
        render::table::write_sheet(out, &evaluation, options)?;
        if let Some(summary) = &evaluation.samples {
            render::spread::write_summary(out, summary, options)?;
        }
        if arguments.working {
            let working =
                render::working::working(&evaluation, Builtins::standard(), options.digits);
            render::working::write_text(out, &working)?;
        }
        if !evaluation.diagnostics.is_empty() {
            out.flush()?;
            render::write_diagnostics(
                &mut error_stream(),
                &evaluation.sources,
                &evaluation.diagnostics,
            )?;
        }
    }
    if options.format == Format::Json {
        write_json_sheets(out, &json_sheets)?;
    }
    Ok(worst)
}

/// A sheet of `run --format json`, kept until every file is read so that several sheets make
/// one array.
enum JsonSheet {
    Evaluated {
        label: String,
        evaluation: Evaluation,
        inputs: Vec<InputFile>,
    },
    Unreadable(serde_json::Value),
}

/// Writes one sheet's JSON object, or an array of several, straight to `out`: a column's
/// numbers are converted as they are written, never collected into a JSON tree first.
fn write_json_sheets(out: &mut dyn Write, sheets: &[JsonSheet]) -> io::Result<()> {
    #[derive(serde::Serialize)]
    #[serde(untagged)]
    enum Document<'e> {
        Evaluated(render::json::SheetJson<'e>),
        Unreadable(&'e serde_json::Value),
    }
    let documents: Vec<Document> = sheets
        .iter()
        .map(|sheet| match sheet {
            JsonSheet::Evaluated {
                label,
                evaluation,
                inputs,
            } => Document::Evaluated(sheet_json(Some(label), evaluation, inputs)),
            JsonSheet::Unreadable(value) => Document::Unreadable(value),
        })
        .collect();
    let mut buffered = io::BufWriter::new(out);
    match documents.as_slice() {
        [one] => serde_json::to_writer_pretty(&mut buffered, one),
        all => serde_json::to_writer_pretty(&mut buffered, all),
    }
    // `From` keeps an I/O error's kind (a closed pipe stays one).
    .map_err(io::Error::from)?;
    writeln!(buffered)?;
    buffered.flush()
}

fn unreadable_json(file: &str, message: &str) -> DiagnosticJson {
    DiagnosticJson {
        severity: "error",
        code: None,
        file: Some(file.to_string()),
        line: 0,
        column: 0,
        end_line: 0,
        end_column: 0,
        message: message.to_string(),
        help: None,
    }
}

fn eval_expression(out: &mut dyn Write, text: &str, options: RenderOptions) -> io::Result<u8> {
    let evaluation = evaluate(
        "<expression>",
        text,
        Builtins::standard(),
        &mut crate::eval::NoIncludes,
    );
    let json = options.format == Format::Json;
    if evaluation.has_errors() {
        if json {
            let diagnostics = diagnostics_json(&evaluation.sources, &evaluation.diagnostics);
            writeln!(
                out,
                "{}",
                serde_json::to_string_pretty(&serde_json::json!({ "diagnostics": diagnostics }))
                    .map_err(io::Error::other)?
            )?;
        } else {
            render::write_diagnostics(
                &mut error_stream(),
                &evaluation.sources,
                &evaluation.diagnostics,
            )?;
        }
        return Ok(exit::SHEET_ERROR);
    }
    // Warnings about the expression itself (an angle in radians, mixed unit systems) go to
    // stderr; whether a one-line sheet's lines are used is not a question here.
    let warnings: Vec<_> = evaluation
        .diagnostics
        .iter()
        .filter(|diagnostic| diagnostic.code != Some("unused-line"))
        .cloned()
        .collect();
    if !warnings.is_empty() && !json {
        render::write_diagnostics(&mut error_stream(), &evaluation.sources, &warnings)?;
    }
    let results: Vec<&LineResult> = evaluation
        .lines
        .iter()
        .map(|line| &line.result)
        .filter(|result| matches!(result, LineResult::Value(_) | LineResult::Check(_)))
        .collect();
    match results.last() {
        Some(LineResult::Value(shown)) => {
            if json {
                writeln!(
                    out,
                    "{}",
                    serde_json::to_string_pretty(&render::json::line_value_json(shown))
                        .map_err(io::Error::other)?
                )?;
            } else {
                match shown {
                    Shown::Scalar(_) if options.format != Format::Table => {
                        render::table::write_sheet(out, &evaluation, options)?
                    }
                    Shown::Scalar(shown) => {
                        let value = render::format_significant(shown.value, options.digits);
                        match shown.unit.as_str() {
                            "1" => writeln!(out, "{value}")?,
                            unit => writeln!(out, "{value} {unit}")?,
                        }
                    }
                    _ => render::table::write_sheet(out, &evaluation, options)?,
                }
            }
            Ok(exit::OK)
        }
        Some(LineResult::Check(_)) => {
            render::table::write_sheet(out, &evaluation, options)?;
            Ok(exit_code_for(&evaluation))
        }
        _ => {
            crate::stderr_line!(
                "error: nothing to evaluate: give an expression such as `2 ft [m]`"
            );
            Ok(exit::USAGE)
        }
    }
}

fn list_units(out: &mut dyn Write, filter: Option<&str>, options: RenderOptions) -> io::Result<()> {
    let dimension_filter = filter.and_then(Dimension::from_name);
    let text_filter = filter.map(str::to_lowercase);
    let rows: Vec<Vec<String>> = catalog_entries()
        .iter()
        .filter(|entry| match (dimension_filter, &text_filter) {
            (Some(dimension), _) => entry.unit().dimension == dimension,
            (None, Some(text)) => {
                entry.definition.name.to_lowercase().contains(text)
                    || entry
                        .definition
                        .symbols
                        .iter()
                        .any(|symbol| symbol.to_lowercase().contains(text))
            }
            (None, None) => true,
        })
        .map(|entry| {
            let dimension = entry.unit().dimension;
            let dimension_text = match dimension.quantity_name() {
                Some(name) => format!("{name} ({dimension})"),
                None => dimension.to_string(),
            };
            let mut factor = entry.unit().factor.describe();
            if let Some(offset) = entry.definition.offset.filter(|offset| *offset != "0") {
                factor = format!("(x + {offset}) * {factor}");
            }
            vec![
                entry.definition.symbols.join(" "),
                entry.definition.name.to_string(),
                dimension_text,
                format!("{factor} {}", dimension.preferred_si_unit()),
                system_words(entry.definition.system).to_string(),
                entry.definition.source.to_string(),
                entry.definition.note.to_string(),
            ]
        })
        .collect();
    let header = [
        "symbol",
        "name",
        "dimension",
        "factor to SI",
        "system",
        "source",
        "note",
    ];
    write_listing(out, &header, &rows, options)?;
    if options.format == Format::Table && filter.is_none() {
        let symbols: Vec<&str> = prefixes().iter().map(|(symbol, _)| *symbol).collect();
        let notes = format!(
            "SI prefixes (on units marked in DEVELOPERS.md as prefixable): {}\nA degree inside \
             a compound unit (W/(m*degC)) is a temperature difference.",
            symbols.join(" ")
        );
        writeln!(out)?;
        for line in render::text_table::wrap(&notes, options.width.unwrap_or(usize::MAX)) {
            writeln!(out, "{line}")?;
        }
    }
    Ok(())
}

/// The system of measure as the `mixed-units` warning words it; empty for none.
fn system_words(system: crate::units::UnitSystem) -> &'static str {
    match system {
        crate::units::UnitSystem::Metric => "SI/metric",
        crate::units::UnitSystem::UsCustomary => "US customary",
        crate::units::UnitSystem::Imperial => "imperial",
        crate::units::UnitSystem::None => "",
    }
}

/// The narrowest a listing's column is drawn before its cells wrap.
const LISTING_FLOOR: usize = 14;

/// A plain listing in any format.
fn write_listing(
    out: &mut dyn Write,
    header: &[&str],
    rows: &[Vec<String>],
    options: RenderOptions,
) -> io::Result<()> {
    match options.format {
        Format::Json => {
            let objects: Vec<serde_json::Map<String, serde_json::Value>> = rows
                .iter()
                .map(|row| {
                    header
                        .iter()
                        .zip(row.iter())
                        .map(|(key, value)| {
                            (
                                key.replace(' ', "_"),
                                serde_json::Value::String(value.clone()),
                            )
                        })
                        .collect()
                })
                .collect();
            writeln!(
                out,
                "{}",
                serde_json::to_string_pretty(&objects).map_err(io::Error::other)?
            )
        }
        Format::Csv => {
            let mut writer = csv::Writer::from_writer(out);
            writer.write_record(header).map_err(io::Error::other)?;
            for row in rows {
                writer.write_record(row).map_err(io::Error::other)?;
            }
            writer.flush()
        }
        Format::Markdown => {
            writeln!(out, "| {} |", header.join(" | "))?;
            writeln!(out, "|{}", "---|".repeat(header.len()))?;
            for row in rows {
                writeln!(
                    out,
                    "| {} |",
                    row.iter()
                        .map(|cell| cell.replace('|', "\\|"))
                        .collect::<Vec<_>>()
                        .join(" | ")
                )?;
            }
            Ok(())
        }
        Format::Table => {
            // Columns of numbers are right-aligned, so that their digits line up.
            let aligns: Vec<render::text_table::Align> = (0..header.len())
                .map(|index| {
                    let numeric = rows.iter().all(|row| {
                        row.get(index)
                            .is_some_and(|cell| cell.parse::<f64>().is_ok())
                    });
                    if numeric && !rows.is_empty() {
                        render::text_table::Align::Right
                    } else {
                        render::text_table::Align::Left
                    }
                })
                .collect();
            let mut table = render::text_table::TextTable::new(header, &aligns);
            for row in rows {
                table.measure(row);
            }
            // Every column may wrap, the widest first; a short one keeps its width.
            let widths = table.widths().to_vec();
            for (index, width) in widths.iter().enumerate() {
                table.set_floor(index, (*width).min(LISTING_FLOOR));
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
