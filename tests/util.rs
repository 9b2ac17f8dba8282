//! Shared helpers: run the binary, write scratch sheets, read JSON.

use assert_cmd::Command;
use std::path::PathBuf;

/// The built binary with colour off and a clean environment for output: no `COLUMNS`, so
/// tables take the width of output that is not a terminal.
pub fn fluxsheet() -> Command {
    let mut command = Command::cargo_bin("fluxsheet").expect("binary is built");
    command.env("NO_COLOR", "1").env_remove("COLUMNS");
    command
}

/// Runs a prepared command; (exit code, stdout, stderr).
pub fn outcome(command: &mut Command) -> (i32, String, String) {
    let output = command.output().expect("binary runs");
    (
        output.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&output.stdout).into_owned(),
        String::from_utf8_lossy(&output.stderr).into_owned(),
    )
}

/// Runs `fluxsheet ARGS…` and returns (exit code, stdout, stderr).
pub fn run(arguments: &[&str]) -> (i32, String, String) {
    outcome(fluxsheet().args(arguments))
}

/// Runs a sheet given as text through `fluxsheet run -` with extra arguments.
pub fn run_sheet(sheet: &str, arguments: &[&str]) -> (i32, String, String) {
    outcome(
        fluxsheet()
            .arg("run")
            .args(arguments)
            .arg("-")
            .write_stdin(sheet),
    )
}

/// `fluxsheet eval --format json EXPR` parsed.
pub fn eval_json(expression: &str) -> serde_json::Value {
    let (code, stdout, stderr) = run(&["eval", "--format", "json", "--", expression]);
    assert_eq!(code, 0, "{expression}: {stderr}{stdout}");
    serde_json::from_str(&stdout).expect("valid JSON")
}

/// The SI value of an expression, through the binary.
pub fn si_value(expression: &str) -> f64 {
    eval_json(expression)["si_value"].as_f64().expect("number")
}

pub fn worksheet(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("worksheets")
        .join(name)
}

/// A program on the `PATH` (`chromium`, `pdftotext`), where the distribution's packages put it.
pub fn program(name: &str) -> Option<PathBuf> {
    let path = std::env::var_os("PATH")?;
    std::env::split_paths(&path)
        .map(|folder| folder.join(name))
        .find(|candidate| candidate.exists())
}

/// Relative difference check with the tolerance visible at the call.
pub fn assert_close(actual: f64, expected: f64, relative: f64, what: &str) {
    let difference = ((actual - expected) / expected).abs();
    assert!(
        difference <= relative,
        "{what}: {actual} vs {expected} (relative {difference:e} > {relative:e})"
    );
}
