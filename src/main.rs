//! The `fluxsheet` binary: parse the command line, run, exit with the documented code.

use clap::Parser;
use fluxsheet::cli::{self, exit};
use std::process::ExitCode;

fn main() -> ExitCode {
    let command_line = match cli::CommandLine::try_parse() {
        Ok(command_line) => command_line,
        Err(error) => {
            // Help and version are not errors; everything else clap rejects is a usage error.
            let code = if error.use_stderr() { exit::USAGE } else { exit::OK };
            let _ = error.print();
            return ExitCode::from(code);
        }
    };
    ExitCode::from(cli::run(command_line))
}
