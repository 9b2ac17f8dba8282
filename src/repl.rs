//! The interactive session: `fluxsheet` alone, or `fluxsheet repl [FILE]`.
//!
//! Over 800 lines: the line editor loop, the scripted loop and the session commands (`:load`,
//! `:save`, `:about`, …) share the printing of results and errors kept here.
//!
//! On a terminal, lines are read with a line editor (completion, hints, history kept across
//! sessions); otherwise lines are read from standard input, so a session can be scripted.
//! Each entry goes to an `eval::session::Session`; results go to standard output, errors and
//! notes to standard error. Commands start with `:` (`:help` lists them). No error ends the
//! session; only `:quit`, Ctrl-D or the end of the input do.

mod complete;

use crate::eval::session::{EntryReport, Outcome, Session, SessionLine, LAST_RESULT};
use crate::eval::{CheckOutcome, Diagnostic, Library, LineResult, Shown, ShownValue};
use crate::library::Builtins;
use crate::render::{format_significant, RenderOptions};
use crate::units::unit::{catalog_entries, Unit};
use crate::units::Dimension;
use complete::{EditorHelper, COMMANDS};
use rustyline::config::{CompletionType, Config};
use rustyline::error::ReadlineError;
use rustyline::history::FileHistory;
use rustyline::Editor;
use std::io::{self, BufRead, IsTerminal, Write};
use std::path::{Path, PathBuf};

/// The environment variable that moves the history file (`FLUXSHEET_HISTORY=PATH`, a file or
/// a folder) or turns history off (`FLUXSHEET_HISTORY=off`).
pub const HISTORY_VARIABLE: &str = "FLUXSHEET_HISTORY";

const PROMPT: &str = "fx> ";

/// Runs a session; returns the exit code. On a terminal it is 0; reading from a pipe, it is 3
/// if any entry had an error and 1 if a check line fails at the end, as for a sheet.
pub fn run(file: Option<&str>, options: RenderOptions, out: &mut dyn Write) -> io::Result<u8> {
    let library = Builtins::standard();
    let mut repl = Repl::new(library, options.digits);
    // Whole lines at a time (a snippet is drawn in many small pieces), and a closed pipe ends
    // no session.
    let mut err = io::LineWriter::new(crate::front::streams::PipeSafe::new(io::stderr()));
    let terminal = io::stdin().is_terminal();
    if let Some(file) = file {
        if !repl.open(Path::new(file), out, &mut err)? {
            return Ok(crate::front::exit::SHEET_ERROR);
        }
    }
    if terminal {
        interactive(&mut repl, out, &mut err)?;
        Ok(crate::front::exit::OK)
    } else {
        scripted(&mut repl, &mut io::stdin().lock(), out, &mut err)?;
        // As for a sheet: errors win, then a check line that fails at the end of the script.
        let failing_check = repl.session.lines().iter().any(
            |line| matches!(line.result(), crate::eval::LineResult::Check(check) if !check.passed),
        );
        Ok(if repl.errors > 0 {
            crate::front::exit::SHEET_ERROR
        } else if failing_check {
            crate::front::exit::CHECK_FAILED
        } else {
            crate::front::exit::OK
        })
    }
}

/// Reads entries from a non-terminal input until its end or `:quit`.
fn scripted(
    repl: &mut Repl,
    input: &mut dyn BufRead,
    out: &mut dyn Write,
    err: &mut dyn Write,
) -> io::Result<()> {
    let mut bytes = Vec::new();
    loop {
        bytes.clear();
        if input.read_until(b'\n', &mut bytes)? == 0 {
            break;
        }
        let flow = match std::str::from_utf8(&bytes) {
            Ok(text) => repl.handle(text, out, err)?,
            Err(_) => {
                repl.errors += 1;
                writeln!(err, "error: the line is not UTF-8 text")?;
                Flow::Continue
            }
        };
        out.flush()?;
        if flow == Flow::Quit {
            break;
        }
    }
    repl.quit_note(err, false)
}

/// The line-editor loop on a terminal.
fn interactive(repl: &mut Repl, out: &mut dyn Write, err: &mut dyn Write) -> io::Result<()> {
    let config = Config::builder()
        .auto_add_history(true)
        .history_ignore_space(true)
        .max_history_size(1000)
        .and_then(|builder| builder.history_ignore_dups(true))
        .map_err(io::Error::other)?
        .completion_type(CompletionType::List)
        .build();
    let mut editor: Editor<EditorHelper, FileHistory> =
        Editor::with_config(config).map_err(io::Error::other)?;
    let mut helper = EditorHelper::new(repl.library);
    helper.color = std::env::var_os("NO_COLOR").is_none();
    helper.names = repl.names();
    editor.set_helper(Some(helper));
    let history = match history_file() {
        Ok(Some(path)) => match prepare_history(&path) {
            Ok(()) => {
                if let Err(error) = editor.load_history(&path) {
                    writeln!(
                        err,
                        "note: history not read from {}: {error}",
                        path.display()
                    )?;
                }
                Some(path)
            }
            Err(error) => {
                writeln!(err, "note: history is off: {}: {error}", path.display())?;
                None
            }
        },
        Ok(None) => None,
        Err(reason) => {
            writeln!(err, "note: history is off: {reason}")?;
            None
        }
    };
    writeln!(
        out,
        "fluxsheet {} session: enter sheet lines or expressions; `:help` lists the commands, Ctrl-D quits.",
        env!("CARGO_PKG_VERSION")
    )?;
    loop {
        out.flush()?;
        err.flush()?;
        match editor.readline(PROMPT) {
            Ok(line) => {
                let names_before = repl.session.definition_count();
                let flow = repl.handle(&line, out, err)?;
                if flow == Flow::Quit {
                    break;
                }
                if repl.session.definition_count() != names_before || repl.names_changed {
                    repl.names_changed = false;
                    let names = repl.names();
                    if let Some(helper) = editor.helper_mut() {
                        helper.names = names;
                    }
                }
            }
            // Ctrl-C cancels the line being typed.
            Err(ReadlineError::Interrupted) => continue,
            Err(ReadlineError::Eof) => break,
            Err(error) => {
                writeln!(err, "error: cannot read the terminal: {error}")?;
                break;
            }
        }
    }
    if let Some(path) = &history {
        if let Err(error) = editor.append_history(path) {
            writeln!(
                err,
                "note: history not saved to {}: {error}",
                path.display()
            )?;
        }
    }
    repl.quit_note(err, history.is_some())
}

/// Where history is kept: `FLUXSHEET_HISTORY`, else `$XDG_DATA_HOME/fluxsheet/history`, else
/// `~/.local/share/fluxsheet/history`. `Ok(None)` when turned off.
fn history_file() -> Result<Option<PathBuf>, String> {
    if let Some(value) = std::env::var_os(HISTORY_VARIABLE) {
        if value.is_empty() || value.eq_ignore_ascii_case("off") {
            return Ok(None);
        }
        let path = PathBuf::from(value);
        return Ok(Some(if path.is_dir() {
            path.join("history")
        } else {
            path
        }));
    }
    // The XDG base-directory rules: a relative XDG_DATA_HOME is ignored.
    let data_home = std::env::var_os("XDG_DATA_HOME")
        .map(PathBuf::from)
        .filter(|path| path.is_absolute())
        .or_else(|| {
            std::env::var_os("HOME")
                .filter(|home| !home.is_empty())
                .map(|home| PathBuf::from(home).join(".local").join("share"))
        })
        .ok_or("neither XDG_DATA_HOME nor HOME is set")?;
    Ok(Some(data_home.join("fluxsheet").join("history")))
}

/// Creates the history folder (owner-only, 0700) and file (0600) if they do not exist.
fn prepare_history(path: &Path) -> io::Result<()> {
    if let Some(folder) = path
        .parent()
        .filter(|folder| !folder.as_os_str().is_empty())
    {
        let mut builder = std::fs::DirBuilder::new();
        builder.recursive(true);
        #[cfg(unix)]
        std::os::unix::fs::DirBuilderExt::mode(&mut builder, 0o700);
        builder.create(folder)?;
    }
    if !path.exists() {
        let mut options = std::fs::OpenOptions::new();
        options.write(true).create_new(true);
        #[cfg(unix)]
        std::os::unix::fs::OpenOptionsExt::mode(&mut options, 0o600);
        options.open(path)?;
    }
    Ok(())
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Flow {
    Continue,
    Quit,
}

/// The session and what the front end knows about it.
struct Repl {
    session: Session<'static>,
    library: &'static Builtins,
    digits: u32,
    /// The sheet `:save` writes when no file is named.
    file: Option<PathBuf>,
    /// Entries and commands that reported an error.
    errors: usize,
    /// Set when the session's names changed in a way a count does not show (`:clear`, `:load`).
    names_changed: bool,
    /// How the loaded sheet's text differs from what `:save` would write over it: lines the
    /// session left out, or names defined twice (collapsed to the last). `:save` refuses to
    /// replace the sheet while this says something, so no line the user wrote is lost quietly.
    file_losses: Vec<String>,
    /// The loaded sheet ends its lines with CR LF; `:save` over it keeps that.
    file_crlf: bool,
}

impl Repl {
    fn new(library: &'static Builtins, digits: u32) -> Repl {
        Repl {
            session: Session::new(library),
            library,
            digits,
            file: None,
            errors: 0,
            names_changed: false,
            file_losses: Vec::new(),
            file_crlf: false,
        }
    }

    fn names(&self) -> Vec<String> {
        self.session
            .names()
            .into_iter()
            .map(str::to_string)
            .collect()
    }

    /// Opens the sheet given on the command line: loads it, or starts a new one if it does not
    /// exist yet. `false` if it cannot be read.
    fn open(&mut self, path: &Path, out: &mut dyn Write, err: &mut dyn Write) -> io::Result<bool> {
        if !path.exists() {
            writeln!(
                out,
                "new sheet {}: `:save` writes the session there",
                path.display()
            )?;
            self.file = Some(path.to_path_buf());
            return Ok(true);
        }
        self.load(path, out, err)
    }

    /// One input line (or several pasted at once).
    fn handle(
        &mut self,
        input: &str,
        out: &mut dyn Write,
        err: &mut dyn Write,
    ) -> io::Result<Flow> {
        for raw in input.split('\n') {
            let text = raw.strip_suffix('\r').unwrap_or(raw);
            let flow = if text.trim_start().starts_with(':') {
                self.command(text.trim(), out, err)?
            } else {
                self.read_data_files(text);
                let report = self.session.enter(text);
                self.print_entry(&report, out, err)?;
                Flow::Continue
            };
            if flow == Flow::Quit {
                return Ok(Flow::Quit);
            }
        }
        Ok(Flow::Continue)
    }

    // ----- entries -----

    fn print_entry(
        &mut self,
        report: &EntryReport,
        out: &mut dyn Write,
        err: &mut dyn Write,
    ) -> io::Result<()> {
        match &report.outcome {
            Outcome::Nothing => {}
            Outcome::Refused => {
                self.errors += 1;
                out.flush()?;
                write_diagnostics(err, &report.text, &report.diagnostics, "")?;
            }
            Outcome::Shown(value) => writeln!(out, "{}", self.shown(value))?,
            Outcome::Added(index) => {
                if let Some(line) = self.session.line(*index) {
                    if let Some(text) = self.result_text(line) {
                        writeln!(out, "{text}")?;
                    }
                }
            }
            Outcome::Replaced { index, previous } => {
                if let Some(line) = self.session.line(*index) {
                    let text = self.result_text(line).unwrap_or_default();
                    writeln!(out, "{text}   (redefined; was `{previous}`)")?;
                }
            }
        }
        for index in &report.recomputed {
            if let Some(line) = self.session.line(*index) {
                self.print_line(line, "  ", out, err)?;
            }
        }
        Ok(())
    }

    /// A kept line's result as the session prints it, with its errors on standard error.
    fn print_line(
        &self,
        line: &SessionLine,
        indent: &str,
        out: &mut dyn Write,
        err: &mut dyn Write,
    ) -> io::Result<()> {
        match line.result() {
            LineResult::Error => {
                out.flush()?;
                let label = line.name().map_or_else(
                    || format!("`{}`", line.text().trim()),
                    |name| format!("`{name}`"),
                );
                writeln!(err, "{indent}{label} now has an error:")?;
                write_diagnostics(err, line.text(), line.diagnostics(), indent)?;
            }
            _ => {
                if let Some(text) = self.result_text(line) {
                    writeln!(out, "{indent}{text}")?;
                }
            }
        }
        Ok(())
    }

    /// `name = 4.05e-6 m/s`, `check passed: …`, `c: not evaluated …`; `None` for headings,
    /// comments and blank lines.
    fn result_text(&self, line: &SessionLine) -> Option<String> {
        let label = match line.name() {
            Some(name) => name.to_string(),
            None => line.text().trim().to_string(),
        };
        match line.result() {
            LineResult::Value(value) => Some(format!("{label} = {}", self.shown(value))),
            LineResult::Check(check) => Some(self.check_text(check)),
            LineResult::Skipped { because_of } if because_of.is_empty() => {
                Some(format!("{label}: not evaluated"))
            }
            LineResult::Skipped { because_of } => Some(format!(
                "{label}: not evaluated, `{because_of}` has no value"
            )),
            LineResult::Error => Some(format!(
                "{label}: error: {}",
                error_message(line.diagnostics())
            )),
            LineResult::Function { signature } => Some(format!("{signature}: function")),
            LineResult::Include { file } => Some(format!("include {file}")),
            LineResult::Plot(plot) => Some(format!(
                "plot of {} against {} ({} points): `:save` the session, then `fluxsheet run SHEET --plot FILE.svg` draws it",
                plot.series
                    .iter()
                    .map(|(name, _)| format!("`{name}`"))
                    .collect::<Vec<_>>()
                    .join(", "),
                plot.x_label,
                plot.x.len()
            )),
            LineResult::Blank | LineResult::Comment | LineResult::Heading(_) => None,
        }
    }

    /// A line's value: one quantity, or a column's first rows and its length.
    fn shown(&self, value: &Shown) -> String {
        const SHOWN_ROWS: usize = 8;
        let (items, unit, rows): (Vec<String>, &str, usize) = match value {
            Shown::Scalar(value) => return self.quantity(value),
            Shown::Column(column) => (
                column
                    .shown_values()
                    .take(SHOWN_ROWS)
                    .map(|item| format_significant(item, self.digits))
                    .collect(),
                &column.unit,
                column.len(),
            ),
            Shown::Labels(labels) => (
                labels.texts.iter().take(SHOWN_ROWS).cloned().collect(),
                "1",
                labels.texts.len(),
            ),
        };
        let more = if rows > SHOWN_ROWS { ", …" } else { "" };
        let unit = if unit == "1" {
            String::new()
        } else {
            format!(" {unit}")
        };
        format!("{{{}{more}}}{unit} ({rows} rows)", items.join(", "))
    }

    fn quantity(&self, value: &ShownValue) -> String {
        let number = format_significant(value.value, self.digits);
        if value.unit == "1" {
            number
        } else {
            format!("{number} {}", value.unit)
        }
    }

    fn check_text(&self, check: &CheckOutcome) -> String {
        let verdict = if check.passed { "passed" } else { "FAILED" };
        let mut text = format!(
            "check {verdict}: {} {} {}",
            self.quantity(&check.left),
            check.comparison.symbol(),
            self.quantity(&check.right)
        );
        if let Some(tolerance) = &check.tolerance {
            text.push_str(&format!(" within {tolerance}"));
        }
        if let Some(message) = &check.message {
            text.push_str(&format!(" ({message})"));
        }
        text
    }

    // ----- commands -----

    fn command(
        &mut self,
        text: &str,
        out: &mut dyn Write,
        err: &mut dyn Write,
    ) -> io::Result<Flow> {
        let (name, argument) = match text.split_once(char::is_whitespace) {
            Some((name, argument)) => (name, argument.trim()),
            None => (text, ""),
        };
        match name {
            ":help" => write_help(out)?,
            ":lines" => self.list_lines(out)?,
            ":units" => self.list_units(argument, out, err)?,
            ":about" => self.about(argument, out, err)?,
            ":load" => {
                if argument.is_empty() {
                    self.fail(err, "`:load` needs a file: `:load site.fxs`")?;
                } else {
                    self.load(Path::new(argument), out, err)?;
                }
            }
            ":save" => self.save(argument, out, err)?,
            ":clear" => {
                let lines = self.session.own_lines().count();
                self.session.clear();
                self.names_changed = true;
                writeln!(out, "cleared {}", count(lines, "line"))?;
            }
            ":quit" => return Ok(Flow::Quit),
            _ => {
                let closest = crate::suggest::closest(name, COMMANDS.iter().copied(), 0.7)
                    .map(|command| format!(" (did you mean `{command}`?)"))
                    .unwrap_or_default();
                self.fail(
                    err,
                    &format!("unknown command `{name}`{closest}; `:help` lists the commands"),
                )?;
            }
        }
        Ok(Flow::Continue)
    }

    fn fail(&mut self, err: &mut dyn Write, message: &str) -> io::Result<()> {
        self.errors += 1;
        writeln!(err, "error: {message}")
    }

    fn list_lines(&self, out: &mut dyn Write) -> io::Result<()> {
        let lines: Vec<&SessionLine> = self.session.own_lines().collect();
        if lines.is_empty() {
            return writeln!(out, "the session has no lines yet");
        }
        let width = lines
            .iter()
            .map(|line| line.text().chars().count())
            .max()
            .unwrap_or(0)
            .min(56);
        let number_width = lines.len().to_string().len();
        for (index, line) in lines.iter().enumerate() {
            let text = line.text();
            let result = match line.result() {
                LineResult::Value(value) => self.shown(value),
                LineResult::Plot(_) => "plot".to_string(),
                LineResult::Check(check) => {
                    let text = self.check_text(check);
                    text.strip_prefix("check ").unwrap_or(&text).to_string()
                }
                LineResult::Error => format!("error: {}", error_message(line.diagnostics())),
                LineResult::Skipped { because_of } => {
                    format!("not evaluated, `{because_of}` has no value")
                }
                LineResult::Function { signature } => format!("function {signature}"),
                LineResult::Include { file } => format!("include {file}"),
                LineResult::Blank | LineResult::Comment | LineResult::Heading(_) => String::new(),
            };
            let line_text = if result.is_empty() {
                format!("{:>number_width$}  {text}", index + 1)
            } else {
                format!("{:>number_width$}  {text:<width$}  {result}", index + 1)
            };
            writeln!(out, "{}", line_text.trim_end())?;
        }
        if self.session.is_modified() {
            writeln!(
                out,
                "(not saved: `:save FILE` writes these lines as a sheet)"
            )?;
        }
        Ok(())
    }

    fn list_units(
        &mut self,
        filter: &str,
        out: &mut dyn Write,
        err: &mut dyn Write,
    ) -> io::Result<()> {
        let dimension = if filter.is_empty() {
            None
        } else {
            Dimension::from_name(filter)
        };
        let text = filter.to_lowercase();
        let mut count = 0;
        for entry in catalog_entries() {
            let definition = entry.definition;
            let keep = match dimension {
                Some(dimension) => entry.unit().dimension == dimension,
                None => {
                    text.is_empty()
                        || definition.name.to_lowercase().contains(&text)
                        || definition
                            .symbols
                            .iter()
                            .any(|symbol| symbol.to_lowercase().contains(&text))
                }
            };
            if keep {
                count += 1;
                writeln!(
                    out,
                    "{:<14} {:<40} {}",
                    definition.symbols.join(" "),
                    definition.name,
                    dimension_text(&entry.unit().dimension)
                )?;
            }
        }
        if count == 0 {
            self.fail(
                err,
                &format!("no unit matches `{filter}` (try a symbol, a name or a dimension such as `pressure`)"),
            )?;
        } else if filter.is_empty() {
            writeln!(
                out,
                "SI prefixes go on metric units (kPa, mD, cP, µS); `:about SYMBOL` gives factor and source."
            )?;
        }
        Ok(())
    }

    fn about(&mut self, name: &str, out: &mut dyn Write, err: &mut dyn Write) -> io::Result<()> {
        if name.is_empty() {
            return self.fail(err, "`:about` needs a name: `:about water_density`");
        }
        let mut found = false;
        if let Some(line) = self.session.definition(name) {
            found = true;
            match line.value() {
                Some(value) => writeln!(out, "{name} = {}", self.shown(value))?,
                None => writeln!(out, "{name}: no value")?,
            }
            writeln!(out, "  defined in the session: {}", line.text())?;
            if !line.references().is_empty() {
                writeln!(out, "  uses: {}", line.references().join(", "))?;
            }
            let users = self.session.used_by(name);
            if !users.is_empty() {
                writeln!(out, "  used by: {}", users.join(", "))?;
            }
        }
        if name == LAST_RESULT && !found {
            found = true;
            match self.session.last_result() {
                Some(value) => writeln!(out, "_ = {} (the last result)", self.shown(value))?,
                None => writeln!(out, "_ holds the last result; there is none yet")?,
            }
        }
        if let Some(function) = self.library.function(name) {
            found = true;
            writeln!(out, "{}  (function)", function.signature())?;
            writeln!(out, "  {}", function.summary())?;
            for line in function.details() {
                writeln!(out, "  {line}")?;
            }
            for formulation in function.formulations() {
                writeln!(out, "  formulation: {}", formulation.title)?;
                writeln!(out, "    source: {}", formulation.citation)?;
                writeln!(out, "    valid for: {}", formulation.validity)?;
            }
        }
        if let Some(constant) = self.library.constant(name) {
            found = true;
            writeln!(
                out,
                "{} = {} {}  (constant)",
                constant.name,
                format_significant(constant.quantity.value, 12),
                constant.unit
            )?;
            writeln!(out, "  {}", constant.summary)?;
            writeln!(out, "  source: {}", constant.source)?;
        }
        if let Some(entry) = catalog_entries()
            .iter()
            .find(|entry| entry.definition.symbols.contains(&name))
        {
            found = true;
            let definition = entry.definition;
            writeln!(
                out,
                "{}  (unit: {}, {})",
                definition.symbols.join(" "),
                definition.name,
                dimension_text(&entry.unit().dimension)
            )?;
            let mut factor = entry.unit().factor.describe();
            if let Some(offset) = definition.offset.filter(|offset| *offset != "0") {
                factor = format!("(x + {offset}) * {factor}");
            }
            writeln!(
                out,
                "  in SI: {factor} {}",
                entry.unit().dimension.preferred_si_unit()
            )?;
            writeln!(out, "  source: {}", definition.source)?;
            if !definition.note.is_empty() {
                writeln!(out, "  note: {}", definition.note)?;
            }
        } else if !found {
            if let Ok(unit) = Unit::lookup(name) {
                found = true;
                writeln!(
                    out,
                    "{name}  (unit with an SI prefix, {})",
                    dimension_text(&unit.dimension)
                )?;
                writeln!(
                    out,
                    "  in SI: {} {}",
                    unit.factor.describe(),
                    unit.dimension.preferred_si_unit()
                )?;
            }
        }
        if !found {
            let mut candidates: Vec<&str> = self.session.names();
            candidates.extend(self.library.names());
            let closest = crate::suggest::closest(name, candidates, 0.8)
                .map(|candidate| format!(" (did you mean `{candidate}`?)"))
                .unwrap_or_default();
            self.fail(
                err,
                &format!("`{name}` is not a session name, function, constant or unit{closest}"),
            )?;
        }
        Ok(())
    }

    /// Reads the data files that the `column … from` lines of a typed entry name, relative to
    /// the current folder, under the same folder rule as `run`, and hands them to the session.
    /// (A loaded sheet's data files are read by `Session::load` through the same loader.)
    fn read_data_files(&mut self, text: &str) {
        let label = "<session>";
        let mut loader = crate::front::includes::FileIncludeLoader::new(label, None, false);
        for (index, line) in text.lines().enumerate() {
            let Ok(parsed) = crate::syntax::parse_line(line, index + 1, 0) else {
                continue;
            };
            let crate::syntax::LineKind::Definition(definition) = parsed.kind else {
                continue;
            };
            if let crate::syntax::ExpressionKind::FileColumn { path, .. } =
                &definition.expression.kind
            {
                let read = crate::eval::IncludeLoader::load_data(&mut loader, path, label)
                    .map(|file| file.text);
                self.session.provide_data_file(path, read);
            }
        }
    }

    /// Loads a sheet into the session; `false` if it cannot be read.
    fn load(&mut self, path: &Path, out: &mut dyn Write, err: &mut dyn Write) -> io::Result<bool> {
        let label = path.display().to_string();
        let limits = crate::front::limits::ReadLimits::default();
        let text = match limits.read_file(path, &label, crate::front::limits::FileKind::Sheet) {
            Ok(text) => text,
            Err(message) => {
                self.fail(err, &message)?;
                return Ok(false);
            }
        };
        let was_empty = self.session.lines().is_empty() && !self.session.is_modified();
        // Includes and data files load as `run` loads them: relative to the sheet, inside its
        // folder tree.
        let mut loader = crate::front::includes::FileIncludeLoader::new(&label, Some(path), false);
        let report = self.session.load(&label, &text, &mut loader);
        self.names_changed = true;
        out.flush()?;
        for (sheet, number, line_text, diagnostic) in &report.rejected {
            self.errors += 1;
            writeln!(err, "{sheet}:{number}: line left out:")?;
            write_diagnostics(err, line_text, std::slice::from_ref(diagnostic), "")?;
        }
        let mut failed = 0;
        let main_lines = report
            .kept
            .iter()
            .map(|(number, index)| (label.as_str(), *number, *index));
        let included_lines = report
            .included
            .iter()
            .map(|(sheet, number, index)| (sheet.as_str(), *number, *index));
        for (sheet, number, index) in main_lines.chain(included_lines) {
            let Some(line) = self.session.line(index) else {
                continue;
            };
            if matches!(line.result(), LineResult::Error) {
                failed += 1;
                self.errors += 1;
                writeln!(err, "{sheet}:{number}:")?;
                write_diagnostics(err, line.text(), line.diagnostics(), "")?;
            }
        }
        let failed_checks = report
            .kept
            .iter()
            .filter_map(|(_, index)| self.session.line(*index))
            .filter(|line| matches!(line.result(), LineResult::Check(check) if !check.passed))
            .count();
        let mut summary = format!("loaded {label}: {}", count(report.kept.len(), "line"));
        if !report.replaced.is_empty() {
            let names: Vec<&str> = report
                .replaced
                .iter()
                .map(|(_, name)| name.as_str())
                .collect();
            summary.push_str(&format!(", redefining {}", names.join(", ")));
        }
        if failed > 0 {
            summary.push_str(&format!(", {failed} with errors"));
        }
        if failed_checks > 0 {
            summary.push_str(&format!(", {failed_checks} failed checks"));
        }
        if !report.rejected.is_empty() {
            summary.push_str(&format!(", {} left out", report.rejected.len()));
        }
        writeln!(out, "{summary} (`:lines` lists them)")?;
        for index in &report.recomputed {
            if let Some(line) = self.session.line(*index) {
                self.print_line(line, "  ", out, err)?;
            }
        }
        if was_empty {
            self.file = Some(path.to_path_buf());
            self.file_crlf = text.contains("\r\n");
            self.file_losses = Vec::new();
            let left_out = report
                .rejected
                .iter()
                .filter(|(sheet, ..)| *sheet == label)
                .map(|(_, number, ..)| number.to_string())
                .collect::<Vec<_>>();
            if !left_out.is_empty() {
                self.file_losses.push(format!(
                    "it would drop line(s) {} (left out)",
                    left_out.join(", ")
                ));
            }
            if !report.replaced.is_empty() {
                let names: Vec<String> = report
                    .replaced
                    .iter()
                    .map(|(_, name)| format!("`{name}`"))
                    .collect();
                self.file_losses.push(format!(
                    "it would keep one line of {} (defined more than once)",
                    names.join(", ")
                ));
            }
        }
        Ok(true)
    }

    fn save(&mut self, argument: &str, out: &mut dyn Write, err: &mut dyn Write) -> io::Result<()> {
        let (force, name) = match argument.strip_prefix("--force") {
            Some(rest) => (true, rest.trim()),
            None => (false, argument),
        };
        let target = if name.is_empty() {
            match &self.file {
                Some(file) => file.clone(),
                None => {
                    return self.fail(err, "`:save` needs a file the first time: `:save site.fxs`")
                }
            }
        } else {
            PathBuf::from(name)
        };
        if self.session.lines().is_empty() {
            return self.fail(err, "nothing to save: the session has no lines");
        }
        let own_file = self.file.as_deref() == Some(target.as_path());
        if target.exists() && !own_file && !force {
            return self.fail(
                err,
                &format!(
                    "`{}` exists; `:save --force {}` replaces it",
                    target.display(),
                    target.display()
                ),
            );
        }
        if own_file && !force && !self.file_losses.is_empty() {
            return self.fail(
                err,
                &format!(
                    "`:save` does not replace `{}`: {}; save to another file (`:save other.fxs`), or `:save --force` to replace it anyway",
                    target.display(),
                    self.file_losses.join("; ")
                ),
            );
        }
        let mut sheet = self.session.to_sheet();
        if own_file && self.file_crlf {
            sheet = sheet.replace('\n', "\r\n");
        }
        match std::fs::write(&target, &sheet) {
            Ok(()) => {
                self.session.mark_saved();
                if !own_file {
                    self.file_crlf = false;
                }
                // What is on disk now is what the session holds.
                self.file_losses.clear();
                writeln!(
                    out,
                    "saved {} to {}",
                    count(self.session.own_lines().count(), "line"),
                    target.display()
                )?;
                self.file = Some(target);
                Ok(())
            }
            Err(error) => self.fail(
                err,
                &format!("cannot write `{}`: {error}", target.display()),
            ),
        }
    }

    /// On the way out: if lines were not saved, say how they could have been (never asks).
    fn quit_note(&self, err: &mut dyn Write, history: bool) -> io::Result<()> {
        if !self.session.is_modified() || self.session.lines().is_empty() {
            return Ok(());
        }
        let count = self.session.own_lines().count();
        let kept = if history {
            "; the entries stay in the history (Up arrow)"
        } else {
            ""
        };
        let lines = if count == 1 {
            "1 session line was".to_string()
        } else {
            format!("{count} session lines were")
        };
        writeln!(
            err,
            "note: {lines} not saved: `:save FILE` before quitting writes them as a sheet{kept}"
        )
    }
}

/// `1 line`, `3 lines`.
fn count(number: usize, noun: &str) -> String {
    if number == 1 {
        format!("1 {noun}")
    } else {
        format!("{number} {noun}s")
    }
}

fn dimension_text(dimension: &Dimension) -> String {
    match dimension.quantity_name() {
        Some(name) => format!("{name} ({dimension})"),
        None => dimension.to_string(),
    }
}

fn write_help(out: &mut dyn Write) -> io::Result<()> {
    writeln!(
        out,
        "\
Enter a sheet line or an expression:
  k = 420 mD                     define a name (entering it again redefines it and
                                 recomputes the lines that use it)
  K [m/s] = k * 998 kg/m^3 * g0 / 1 cP
  K [ft/d]                       show a value in a unit
  check K < 1e-4 m/s             a check
  _ * 2                          `_` is the last result; in a kept line it becomes
                                 that result's name (or value)
Commands:
  :lines               the session's lines and values
  :units [FILTER]      units, by text or dimension (`:units pressure`)
  :about NAME          a function's formula, source and range; a constant, unit or name
  :load FILE           add a sheet's lines to the session
  :save [FILE]         write the session as a sheet (`--force` replaces another file)
  :clear               forget every line
  :help                this list
  :quit                leave (also Ctrl-D)
Tab completes names, functions and units; Ctrl-C cancels the line being typed."
    )
}

/// Diagnostics of one line, drawn compactly: message, the line, an underline, a help line.
/// The first error's message, never empty: an `error:` with nothing after it helps no one.
fn error_message(diagnostics: &[Diagnostic]) -> &str {
    diagnostics
        .first()
        .map(|diagnostic| diagnostic.message.as_str())
        .filter(|message| !message.trim().is_empty())
        .unwrap_or(UNDESCRIBED_ERROR)
}

/// Said of a line with an error but no description (a bug of ours, never a blank `error:`).
const UNDESCRIBED_ERROR: &str = "this line could not be evaluated (no reason was recorded)";

/// Draws a session line's diagnostics with the same snippet renderer as `run`.
fn write_diagnostics(
    err: &mut dyn Write,
    text: &str,
    diagnostics: &[Diagnostic],
    indent: &str,
) -> io::Result<()> {
    if diagnostics.is_empty() {
        writeln!(err, "{indent}error: {UNDESCRIBED_ERROR}")?;
        writeln!(err, "{indent}  | {text}")?;
        return Ok(());
    }
    let mut sources = crate::eval::SourceMap::default();
    sources.add("<session>", text);
    let mut drawn = Vec::new();
    crate::render::write_diagnostics(
        &mut codespan_reporting::term::termcolor::NoColor::new(&mut drawn),
        &sources,
        diagnostics,
    )?;
    for line in String::from_utf8_lossy(&drawn).lines() {
        writeln!(err, "{indent}{line}")?;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn session(script: &str) -> (String, String, usize) {
        let mut repl = Repl::new(Builtins::standard(), 4);
        let mut out = Vec::new();
        let mut err = Vec::new();
        scripted(&mut repl, &mut script.as_bytes(), &mut out, &mut err).unwrap();
        (
            String::from_utf8(out).unwrap(),
            String::from_utf8(err).unwrap(),
            repl.errors,
        )
    }

    #[test]
    fn entries_print_values_and_dependents() {
        let (out, err, errors) = session("a = 2 m\nb [cm] = a * 3\na = 3 m\nb [ft]\n");
        assert_eq!(
            out,
            "a = 2 m\nb = 600 cm\na = 3 m   (redefined; was `a = 2 m`)\n  b = 900 cm\n29.53 ft\n"
        );
        assert_eq!(errors, 0, "{err}");
    }

    #[test]
    fn errors_are_drawn_under_the_line() {
        let (_, err, errors) = session("a = 2 m\nb = a + 1 s\n");
        assert_eq!(errors, 1);
        assert_eq!(
            err,
            "error: cannot add a time (s) to a length (m)\n  ┌─ <session>:1:5\n  │\n1 │ b = a + 1 s\n  │     ^^^^^^^\n\n\
             note: 1 session line was not saved: `:save FILE` before quitting writes them as a sheet\n"
        );
    }
}
