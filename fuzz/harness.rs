//! The entry points the fuzz targets drive, shared with the `cargo test` that replays the
//! committed corpus (`tests/fuzz_corpus.rs`), so a saved input is a regression test on stable
//! Rust. Each function takes raw bytes and must return without panicking, whatever they are.
//!
//! Inputs are split on NUL bytes into parts (a sheet, a sheet it includes, a data file), so one
//! byte string reaches includes and data files without a file system.

use fluxsheet::eval::session::Session;
use fluxsheet::eval::{evaluate, evaluate_with, IncludeLoader, LoadedSheet, NoIncludes, Settings};
use fluxsheet::library::Builtins;
use fluxsheet::render::report::{sha256_hex, write_html, write_markdown, InputFile, ReportContext};
use fluxsheet::render::{self, Format, RenderOptions};
use fluxsheet::syntax::{parse_expression, parse_line, parse_set_value, parse_unit};
use fluxsheet::units::Unit;
use std::io;

/// Longest column a fuzzed sheet may make: large enough for every feature, small enough that
/// a mistyped range costs microseconds, not seconds.
pub const FUZZ_MAX_ROWS: usize = 2_000;

/// Serves every `include` from one text and every data file (a path ending in `.csv`) from
/// another, keyed by the path as written so that include cycles are found as on disk.
pub struct MemoryLoader {
    pub included_sheet: String,
    pub data_file: String,
    /// Each file served, as (path, text), in loading order.
    pub loaded: Vec<(String, String)>,
}

impl IncludeLoader for MemoryLoader {
    fn load(&mut self, path: &str, _from: &str) -> Result<LoadedSheet, String> {
        let text = if path.ends_with(".csv") {
            &self.data_file
        } else if path.ends_with(".fxs") {
            &self.included_sheet
        } else {
            return Err(format!("cannot read `{path}`: no such file"));
        };
        self.loaded.push((path.to_string(), text.clone()));
        Ok(LoadedSheet {
            label: path.to_string(),
            key: path.to_string(),
            text: text.clone(),
        })
    }
}

/// The NUL-separated parts of an input, as text; missing parts are empty.
fn parts(data: &[u8]) -> [String; 3] {
    let text = String::from_utf8_lossy(data);
    let mut pieces = text.splitn(3, '\0').map(str::to_string);
    [
        pieces.next().unwrap_or_default(),
        pieces.next().unwrap_or_default(),
        pieces.next().unwrap_or_default(),
    ]
}

fn fuzz_settings() -> Settings {
    Settings {
        max_rows: FUZZ_MAX_ROWS,
        ..Settings::default()
    }
}

/// A sheet (part 1) with an included sheet (part 2) and a data file (part 3), evaluated and
/// rendered through every output format: tables, Markdown, CSV, JSON, both reports, charts
/// and diagnostics.
pub fn sheet_in_every_format(data: &[u8]) {
    let [sheet, included_sheet, data_file] = parts(data);
    let mut loader = MemoryLoader {
        included_sheet,
        data_file,
        loaded: Vec::new(),
    };
    let evaluation = evaluate_with(
        "main.fxs",
        &sheet,
        Builtins::standard(),
        &mut loader,
        &fuzz_settings(),
    );
    for format in [Format::Table, Format::Markdown, Format::Csv] {
        let options = RenderOptions {
            format,
            digits: 4,
            width: Some(80),
        };
        render::table::write_sheet(&mut io::sink(), &evaluation, options)
            .expect("a sink accepts everything");
    }
    // The run's inputs as the front end hashes them: the main sheet, then every file loaded.
    let inputs: Vec<InputFile> = std::iter::once(("main.fxs", sheet.as_str()))
        .chain(
            loader
                .loaded
                .iter()
                .map(|(path, text)| (path.as_str(), text.as_str())),
        )
        .map(|(path, text)| InputFile {
            path: path.to_string(),
            sha256: sha256_hex(text.as_bytes()),
            bytes: text.len(),
        })
        .collect();
    let json = render::json::sheet_json(Some("main.fxs"), &evaluation, &inputs);
    serde_json::to_writer(io::sink(), &json).expect("JSON of finite numbers always serializes");
    let context = ReportContext {
        label: "main.fxs",
        source: &sheet,
        inputs: &inputs,
        evaluation: &evaluation,
        version: "fuzz",
        digits: 4,
    };
    write_markdown(&mut io::sink(), &context).expect("a sink accepts everything");
    write_html(&mut io::sink(), &context).expect("a sink accepts everything");
    for line in &evaluation.lines {
        if let fluxsheet::eval::LineResult::Plot(plot) = &line.result {
            // A chart that cannot be drawn is an error value; only a panic is a finding.
            let _ = render::plot::plot_svg(plot);
        }
    }
    let mut diagnostics = codespan_reporting::term::termcolor::NoColor::new(io::sink());
    render::write_diagnostics(
        &mut diagnostics,
        &evaluation.sources,
        &evaluation.diagnostics,
    )
    .expect("a sink accepts everything");
}

/// The unit and expression parsers on one text, each entry point in turn, and the `eval`
/// command's evaluation of it.
pub fn parsers(data: &[u8]) {
    let text = String::from_utf8_lossy(data);
    if parse_unit(&text).is_ok() {
        // A unit that parses is resolved (lookup, prefixes, algebra) by the evaluator.
        let sheet = format!("x [{text}] = 1 {text}");
        let _ = evaluate("<unit>", &sheet, Builtins::standard(), &mut NoIncludes);
    }
    let _ = Unit::lookup(&text);
    let _ = parse_expression(&text);
    let _ = parse_set_value(&text, 0);
    let _ = parse_line(&text, 1, 0);
    let evaluation = evaluate("<expression>", &text, Builtins::standard(), &mut NoIncludes);
    let _ = evaluation.has_errors();
}

/// A session: part 1 is loaded as a sheet (with part 2 as its includes and part 3 as its data
/// file), then every line of part 2 is entered, one entry at a time, as a user would type them.
pub fn session_lines(data: &[u8]) {
    let [sheet, entries, data_file] = parts(data);
    let mut loader = MemoryLoader {
        included_sheet: entries.clone(),
        data_file: data_file.clone(),
        loaded: Vec::new(),
    };
    let library = Builtins::standard();
    let mut session = Session::new(library);
    session.set_max_rows(FUZZ_MAX_ROWS);
    session.provide_data_file("data.csv", Ok(data_file));
    if !sheet.is_empty() {
        let _ = session.load("main.fxs", &sheet, &mut loader);
    }
    for entry in entries.lines() {
        let _ = session.enter(entry);
    }
    let _ = session.to_sheet();
    let _ = session.last_result();
}
