//! The `fluxsheet` binary: parse the command line, run, exit with the documented code.

use clap::Parser;
use fluxsheet::cli::{self, exit};
use std::process::ExitCode;

/// A sheet allocates many small, short-lived nodes; mimalloc handles that pattern markedly
/// faster than the system allocator (see the benchmark in `benches/engine.rs`).
#[global_allocator]
static ALLOCATOR: mimalloc::MiMalloc = mimalloc::MiMalloc;

fn main() -> ExitCode {
    let command_line = match cli::CommandLine::try_parse() {
        Ok(command_line) => command_line,
        Err(error) => {
            // Help and version are not errors; everything else clap rejects is a usage error.
            let code = if error.use_stderr() {
                exit::USAGE
            } else {
                exit::OK
            };
            let _ = error.print();
            return ExitCode::from(code);
        }
    };
    // Evaluation recurses over expressions; a roomy stack keeps the parser's nesting limits far
    // from the edge in every build profile.
    let worker = std::thread::Builder::new()
        .stack_size(64 * 1024 * 1024)
        .spawn(move || cli::run(command_line));
    let code = match worker.map(|handle| handle.join()) {
        Ok(Ok(code)) => code,
        _ => {
            fluxsheet::stderr_line!(
                "error: internal failure (please report it with the sheet that caused it)"
            );
            exit::SHEET_ERROR
        }
    };
    ExitCode::from(code)
}
