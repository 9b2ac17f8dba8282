//! Robust inputs: every bad input gets its documented exit code and a message that names the
//! problem; nothing is lost (no output over an input, no session save that drops lines), no
//! false pass, no panic on a closed pipe, no hang.
//!
//! `BAD_INPUTS` is the one table of bad inputs, by category. An entry is a sheet (run as
//! `fluxsheet run sheet.fxs` in a folder of fixtures), `$` and a command line whose arguments
//! are separated by `|` (run in the same folder), or `>` and a session script fed to
//! `fluxsheet repl` on standard input. Each row gives the exit code and a fragment of the
//! message (standard error and output together).

use crate::util::{fluxsheet, outcome};
use std::path::Path;
use std::process::Stdio;
use std::time::Duration;

/// (sheet, command line or session; exit code; fragment of the message)
const BAD_INPUTS: &[(&str, i32, &str)] = &[
    // syntax
    ("x = 1 +", 3, "expected an expression"),
    ("x = (1", 3, "found the end of the line"),
    ("x = 1 m)", 3, "found `)`"),
    ("= 2", 3, "unexpected `=`"),
    ("x = \"text\"", 3, "expected an expression"),
    ("x = 1 m [ft", 3, "found `[ft`"),
    ("f(x, x) = x", 3, "parameter `x` is named twice"),
    ("f(a, b, a) = a + b", 3, "parameter `a` is named twice"),
    ("x = 2 m^ 2", 3, "write a unit power without spaces"),
    ("x = 3 ft^ 3", 3, "a space after `ft^`"),
    ("x = 2 m^x", 3, "a space after `m^`"),
    ("x = 1 m^(1/0)", 3, "is not a whole number or a fraction"),
    ("x = 1 m^1000000", 3, "exponents are limited to 1000"),
    ("x = 1 m^-2147483648", 3, "exponents are limited to 1000"),
    ("x = 1 ft^-2147483648", 3, "exponents are limited to 1000"),
    ("x = 1 m^(1/99999999999)", 3, "exponents are limited to 1000"),
    ("x = 1 m^4294967296", 3, "exponents are limited to 1000"),
    (
        "x = ((((((((((((((((((((((((((((((((((((((((((((((((((((((((((((((((((1))))))))))))))))))))))))))))))))))))))))))))))))))))))))))))))))))",
        3,
        "nesting too deep",
    ),
    // names and definitions
    ("x = y", 3, "unknown name `y`"),
    ("x = 1\nx = 2", 3, "already defined on line 1"),
    ("a = b\nb = a", 3, "circular definition"),
    ("x = foo(1)", 3, "unknown function `foo`"),
    // numbers
    ("x = 1e400", 3, "not a finite number"),
    ("x = 1 / 0", 3, "division by zero"),
    ("x = ln(0)", 3, "logarithm of zero"),
    ("x = sqrt(-1)", 3, "square root of a negative number"),
    ("x = 10^400", 3, "not a finite number"),
    ("x = (2 m)^1e-10", 3, "simple fraction"),
    ("x = (2 m)^0.123456", 3, "simple fraction"),
    ("x = 2 ^ (1 m)", 3, "exponent must be dimensionless"),
    ("x = 1 m + 1 s", 3, "cannot add a time (s) to a length (m)"),
    ("x [m] = 1 s", 3, "cannot show a time (s) in `m`"),
    ("x = 2 b", 3, "unknown unit `b`"),
    ("x = 1 PA", 3, "letter case"),
    ("x = 1 md", 3, "unknown unit `md`"),
    // temperatures
    ("x = -500 degF", 3, "below absolute zero"),
    ("x = 20 degC - 300 K", 3, "below absolute zero"),
    ("x = 20 degC + 30 degC", 3, "two absolute temperatures"),
    ("x = 20 degC * 2", 3, "absolute temperature of 20 degC"),
    ("x = sqrt(20 degC)", 3, "passed to `sqrt`"),
    ("x = water_density(-20 degC)", 3, "below the ice point"),
    // functions
    ("x = sqrt(1, 2)", 3, "takes 1 argument(s), but 2 were given"),
    ("f(a) = a\nx = f(1, 2)", 3, "`f` takes 1 argument(s)"),
    ("f(a [m]) = a\nx = f(1 s)", 3, "parameter `a` must be a length"),
    ("f(a) = f(a)", 3, "recursive function"),
    // checks
    ("check 1 m < 2 s", 3, "cannot compare a length (m) with a time (s)"),
    (
        "check 1 m == 2 m within 1e309 %",
        3,
        "relative tolerance must be below 100 %",
    ),
    ("check 1 m == 2 m within 100 %", 3, "below 100 %"),
    ("check 1 m == 2 m within -1 %", 3, "cannot be negative"),
    ("check 1 m == 2 m within 1 s", 3, "a tolerance must be a fraction"),
    ("k = 2 m\ncheck k > 3 m", 1, "FAILED"),
    // columns
    ("x = {1, 2} m + {1, 2, 3} m", 3, "columns of different lengths"),
    ("x = 0 m to 10 m step -1 m", 3, "the step must be non-zero"),
    ("x = 1 m to 10 m count 1", 3, "at least 2"),
    ("x = 0 m to 1 m count 2 log", 3, "both ends above zero"),
    ("x = 1 m to 1e9 m step 1 um", 3, "longer than the limit"),
    ("x = 1 m to 2 s step 1 m", 3, "cannot compare a length (m) with a time (s)"),
    (
        "x = 1 m\ny = 3 m\nT = solve x == 2 m for y between 0 m and 1 m",
        3,
        "does not depend on `y`",
    ),
    ("$run|list.fxs|--max-rows|2", 3, "longer than the limit of 2 rows"),
    ("plot x against y", 3, "unknown name `y`"),
    // CSV data files
    ("x = column k from \"nope.csv\"", 3, "cannot read `nope.csv`"),
    ("x = column k from \"bad_number.csv\"", 3, "`abc` is not a number"),
    ("x = column a from \"ragged.csv\"", 3, "1 cells where the header has 2"),
    ("x = column k from \"bad_unit.csv\"", 3, "unknown unit `furlong`"),
    ("x = column zz from \"cores.csv\"", 3, "has no column `zz`"),
    (
        "x = column sample from \"cores.csv\"\ny = x * 2",
        3,
        "a column of text",
    ),
    // includes
    ("include \"nope.fxs\"", 3, "cannot read `nope.fxs`"),
    ("include \"loop_a.fxs\"", 3, "include cycle"),
    ("include \"/etc/passwd\"", 3, "is an absolute path"),
    ("include \"c.fxs\"\nc = 2 m", 3, "already defined"),
    ("include \"chain/level_0.fxs\"", 3, "nested more than 64 sheets deep"),
    // output files
    ("$run|plotted.fxs|--plot|plotted.fxs", 2, "an input of this run"),
    ("$run|plotted.fxs|--plot|./sub/../plotted.fxs", 2, "an input of this run"),
    ("$run|plotted.fxs|--plot|cores.csv", 2, "an input of this run"),
    ("$run|plotted.fxs|--plot|c.fxs", 0, "wrote c.fxs"),
    ("$run|list.fxs|--plot|out.svg", 2, "no plot line"),
    ("$report|notes.md|-o|notes.md", 2, "an input of this run"),
    ("$report|includer.fxs|-o|included.md", 2, "an input of this run"),
    ("$report|list.fxs|-o|out.txt", 2, "cannot tell the report format"),
    // command line
    ("$eval|-x", 3, "unknown name `x`"),
    ("$eval|--fromat", 2, "not an option"),
    ("$eval|", 2, "nothing to evaluate"),
    ("$run|nope.fxs", 3, "cannot read `nope.fxs`"),
    ("$run|not_utf8.fxs", 3, "not UTF-8"),
    ("$run|--digits|0|list.fxs", 2, "digits"),
    ("$run|doubling.fxs|--set|k", 2, "write NAME=VALUE"),
    ("$run|doubling.fxs|--set|kk=1 m", 2, "no line named `kk`"),
    ("$run|doubling.fxs|--set|k=1 s", 3, "the sheet's line is a length"),
    ("$run|doubling.fxs|--set|k=j", 3, "through the value given by `--set k=…`"),
    ("$run|doubling.fxs|--set|k=k*", 3, "expected an expression"),
    ("$run|list.fxs|doubling.fxs|--plot|x.svg", 2, "give one file"),
    ("$check|nope_folder/x.fxs", 3, "cannot read"),
    // session
    (">x = 1 +", 3, "expected an expression"),
    (">x = y", 3, "unknown name `y`"),
    (">include \"c.fxs\"", 3, ":load"),
    (">:save", 3, "needs a file"),
    (">:load nope.fxs", 3, "cannot read"),
    (">f(x, x) = x", 3, "named twice"),
    (">x = 2 m^ 2", 3, "unit power without spaces"),
];

/// Lays the fixtures every row may use in `folder`.
fn fixtures(folder: &Path) {
    let write = |name: &str, text: &[u8]| {
        let path = folder.join(name);
        std::fs::create_dir_all(path.parent().unwrap()).unwrap();
        std::fs::write(path, text).unwrap();
    };
    write("c.fxs", b"c = 1 m\n");
    write("sub/keep", b"");
    write("loop_a.fxs", b"include \"loop_b.fxs\"\n");
    write("loop_b.fxs", b"include \"loop_a.fxs\"\n");
    write("cores.csv", b"sample,k [mD],T [degC]\nA,40,10\nB,250,20\n");
    write("bad_number.csv", b"k [mD]\n40\nabc\n");
    write("ragged.csv", b"a [m],b [m]\n1,2\n3\n");
    write("bad_unit.csv", b"k [furlong]\n1\n");
    write("list.fxs", b"x = {1, 2, 3} m\ny = x * 2\n");
    write("doubling.fxs", b"k = 2 m\ncheck k > 3 m\nj = k * 3\n");
    write(
        "plotted.fxs",
        b"T = column T from \"cores.csv\"\nk = column k from \"cores.csv\"\nplot k against T\n",
    );
    write("notes.md", b"x = 1 m\ny = x * 2\n");
    write("includer.fxs", b"include \"included.md\"\ny = c * 2\n");
    write("included.md", b"c = 1 m\n");
    write("not_utf8.fxs", b"x = 1 m \xff\n");
    // A chain deeper than the include limit: level_i includes level_(i+1).
    for level in 0..70 {
        let text = format!("include \"level_{}.fxs\"\nv{level} = 1 m\n", level + 1);
        write(&format!("chain/level_{level}.fxs"), text.as_bytes());
    }
    write("chain/level_70.fxs", b"end = 1 m\n");
}

/// Runs one row in `folder`; (exit code, standard error and output).
fn run_row(folder: &Path, input: &str) -> (i32, String) {
    let mut command = fluxsheet();
    command.current_dir(folder).timeout(Duration::from_secs(60));
    if let Some(arguments) = input.strip_prefix('$') {
        command.args(arguments.split('|'));
    } else if let Some(script) = input.strip_prefix('>') {
        command.arg("repl").write_stdin(format!("{script}\n"));
    } else {
        std::fs::write(folder.join("sheet.fxs"), format!("{input}\n")).unwrap();
        command.args(["run", "sheet.fxs"]);
    }
    let (code, stdout, stderr) = outcome(&mut command);
    (code, format!("{stderr}{stdout}"))
}

#[test]
fn every_bad_input_has_its_exit_code_and_names_the_problem() {
    let folder = tempfile::tempdir().unwrap();
    fixtures(folder.path());
    let mut failures = Vec::new();
    for (input, expected_code, fragment) in BAD_INPUTS {
        let (code, text) = run_row(folder.path(), input);
        if code != *expected_code || !text.contains(fragment) {
            failures.push(format!(
                "{input:?}: exit {code} (expected {expected_code}), message lacks {fragment:?}:\n{text}"
            ));
        }
        assert_ne!(code, 101, "{input:?} panicked:\n{text}");
    }
    assert!(
        failures.is_empty(),
        "{} of {} rows failed:\n{}",
        failures.len(),
        BAD_INPUTS.len(),
        failures.join("\n")
    );
}

#[test]
fn the_table_covers_every_category() {
    let sheets = BAD_INPUTS
        .iter()
        .filter(|(input, ..)| !input.starts_with(['$', '>']));
    let commands = BAD_INPUTS
        .iter()
        .filter(|(input, ..)| input.starts_with('$'));
    let sessions = BAD_INPUTS
        .iter()
        .filter(|(input, ..)| input.starts_with('>'));
    assert!(BAD_INPUTS.len() >= 60, "{} rows", BAD_INPUTS.len());
    assert!(sheets.count() >= 40);
    assert!(commands.count() >= 15);
    assert!(sessions.count() >= 5);
}

/// (sheet, a fragment of the printed table): inputs that used to be refused or misread.
const ACCEPTED_INPUTS: &[(&str, &str)] = &[
    // A byte-order mark at the start, as some editors write it.
    ("\u{feff}x = 1 m\ny = x * 2", "x * 2"),
    // One included sheet by two spellings is one sheet.
    (
        "include \"c.fxs\"\ninclude \"sub/../c.fxs\"\ny = c * 2",
        "c * 2",
    ),
    // A finite range whose width overflows a double.
    ("x = -1.7e308 m to 1.7e308 m count 3", "3 rows"),
    // A unit power in parentheses, then a power of the quantity.
    ("x = (2 m^2)^2", "m^4"),
    // An include chain within the limit.
    ("include \"chain/level_10.fxs\"\ny = v10 * 2", "v10 * 2"),
];

#[test]
fn inputs_once_misread_are_accepted() {
    let folder = tempfile::tempdir().unwrap();
    fixtures(folder.path());
    for (sheet, fragment) in ACCEPTED_INPUTS {
        let (code, text) = run_row(folder.path(), sheet);
        assert_eq!(code, 0, "{sheet:?}:\n{text}");
        assert!(
            text.contains(fragment),
            "{sheet:?} lacks {fragment:?}:\n{text}"
        );
    }
}

#[test]
fn only_the_operators_of_expressions_count_toward_the_limit() {
    let folder = tempfile::tempdir().unwrap();
    fixtures(folder.path());
    // 300 values with signs and exponents, and a message of 300 dashes: no operator among them.
    let values = vec!["-1.5e-3"; 300].join(", ");
    let dashes = "-".repeat(300);
    let sheet = format!("x = {{{values}}} m\ncheck sum(x) < 0 m \"{dashes}\"");
    let (code, text) = run_row(folder.path(), &sheet);
    assert_eq!(code, 0, "{text}");
    assert!(text.contains("300 rows"), "{text}");
    // The limit still holds for the operators of an expression.
    let long = format!("x = 1{}", " + 1".repeat(300));
    let (code, text) = run_row(folder.path(), &long);
    assert_eq!(code, 3);
    assert!(text.contains("more than 256 operators"), "{text}");
}

/// The SI value of line `name` in `fluxsheet run --format json` with `arguments`.
fn si_value_of(folder: &Path, arguments: &[&str], name: &str) -> f64 {
    let (code, stdout, stderr) = outcome(
        fluxsheet()
            .current_dir(folder)
            .args(["run", "--format", "json"])
            .args(arguments),
    );
    assert!(code <= 1, "{arguments:?}: {stderr}");
    let document: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let lines = document["lines"].as_array().unwrap();
    let line = lines.iter().find(|line| line["name"] == name).unwrap();
    line["si_value"].as_f64().unwrap()
}

#[test]
fn set_may_refer_to_the_sheets_own_value() {
    let folder = tempfile::tempdir().unwrap();
    fixtures(folder.path());
    let sheet_value = si_value_of(folder.path(), &["doubling.fxs"], "k");
    let doubled = si_value_of(folder.path(), &["doubling.fxs", "--set", "k=k*2"], "k");
    assert_eq!(doubled, sheet_value * 2.0);
    // Lines that use `k` see the new value, and the failing check now passes.
    let j = si_value_of(folder.path(), &["doubling.fxs", "--set", "k=k*2"], "j");
    assert_eq!(j, doubled * 3.0);
    let (code, _, stderr) = outcome(fluxsheet().current_dir(folder.path()).args([
        "run",
        "doubling.fxs",
        "--set",
        "k=k*2",
    ]));
    assert_eq!(code, 0, "{stderr}");
}

#[test]
fn set_may_use_a_line_defined_further_down() {
    let folder = tempfile::tempdir().unwrap();
    std::fs::write(folder.path().join("s.fxs"), "k = 2 m\nz = 5 m\nw = k * 2\n").unwrap();
    let z = si_value_of(folder.path(), &["s.fxs"], "z");
    let k = si_value_of(folder.path(), &["s.fxs", "--set", "k=z"], "k");
    assert_eq!(k, z);
}

#[test]
fn a_chart_never_replaces_an_input() {
    let folder = tempfile::tempdir().unwrap();
    fixtures(folder.path());
    let before = std::fs::read(folder.path().join("plotted.fxs")).unwrap();
    let data_before = std::fs::read(folder.path().join("cores.csv")).unwrap();
    #[cfg(unix)]
    std::fs::hard_link(
        folder.path().join("cores.csv"),
        folder.path().join("hard.csv"),
    )
    .unwrap();
    for target in ["plotted.fxs", "cores.csv", "sub/../plotted.fxs", "hard.csv"] {
        let (code, _) = run_row(folder.path(), &format!("$run|plotted.fxs|--plot|{target}"));
        if cfg!(unix) || target != "hard.csv" {
            assert_eq!(code, 2, "{target}");
        }
    }
    assert_eq!(
        std::fs::read(folder.path().join("plotted.fxs")).unwrap(),
        before
    );
    assert_eq!(
        std::fs::read(folder.path().join("cores.csv")).unwrap(),
        data_before
    );
}

#[cfg(unix)]
#[test]
fn a_chart_is_not_written_through_a_symbolic_link() {
    let folder = tempfile::tempdir().unwrap();
    fixtures(folder.path());
    std::fs::write(folder.path().join("keep.svg"), "mine").unwrap();
    std::os::unix::fs::symlink("keep.svg", folder.path().join("link.svg")).unwrap();
    let (code, text) = run_row(folder.path(), "$run|plotted.fxs|--plot|link.svg");
    assert_eq!(code, 2, "{text}");
    assert!(text.contains("symbolic link"), "{text}");
    assert_eq!(
        std::fs::read_to_string(folder.path().join("keep.svg")).unwrap(),
        "mine"
    );
}

#[test]
fn session_save_keeps_every_line_of_the_loaded_sheet_or_refuses() {
    let folder = tempfile::tempdir().unwrap();
    let sheet = folder.path().join("s.fxs");
    let written = "k = 2 m\r\nx = 1 +\r\nk = 3 m\r\ny = k * 2\r\n";
    std::fs::write(&sheet, written).unwrap();
    let (code, _, stderr) = outcome(
        fluxsheet()
            .current_dir(folder.path())
            .args(["repl", "s.fxs"])
            .write_stdin(":save\n"),
    );
    assert_eq!(code, 3);
    assert!(stderr.contains("does not replace `s.fxs`"), "{stderr}");
    assert!(stderr.contains("line(s) 2"), "{stderr}");
    assert!(stderr.contains("`k`"), "{stderr}");
    assert_eq!(std::fs::read_to_string(&sheet).unwrap(), written);
    // Saved elsewhere, nothing is lost; forced, the sheet is rewritten with its CR LF ends.
    let (_, stdout, _) = outcome(
        fluxsheet()
            .current_dir(folder.path())
            .args(["repl", "s.fxs"])
            .write_stdin(":save other.fxs\n"),
    );
    assert!(stdout.contains("saved"), "{stdout}");
    assert!(folder.path().join("other.fxs").exists());
    assert_eq!(std::fs::read_to_string(&sheet).unwrap(), written);
    let (_, stdout, _) = outcome(
        fluxsheet()
            .current_dir(folder.path())
            .args(["repl", "s.fxs"])
            .write_stdin(":save --force\n"),
    );
    assert!(stdout.contains("saved"), "{stdout}");
    let forced = std::fs::read_to_string(&sheet).unwrap();
    assert!(forced.contains("k = 3 m\r\n"), "{forced:?}");
    assert!(!forced.replace("\r\n", "").contains('\n'), "{forced:?}");
}

#[test]
fn session_save_of_a_clean_sheet_keeps_its_line_ends() {
    let folder = tempfile::tempdir().unwrap();
    let sheet = folder.path().join("s.fxs");
    std::fs::write(&sheet, "k = 2 m\r\ny = k * 2\r\n").unwrap();
    let (code, _, stderr) = outcome(
        fluxsheet()
            .current_dir(folder.path())
            .args(["repl", "s.fxs"])
            .write_stdin("z = 1 m\n:save\n"),
    );
    assert_eq!(code, 0, "{stderr}");
    let saved = std::fs::read_to_string(&sheet).unwrap();
    assert!(saved.starts_with("k = 2 m\r\ny = k * 2\r\n"), "{saved:?}");
}

/// A sheet with many syntax errors: a long table and many diagnostics.
fn many_errors(folder: &Path) -> std::path::PathBuf {
    let sheet: String = (0..3000).map(|index| format!("x{index} = 1 +\n")).collect();
    let path = folder.join("many.fxs");
    std::fs::write(&path, sheet).unwrap();
    path
}

/// Runs the binary with stdout or stderr a pipe whose reader is already gone.
fn exit_with_closed(stream: &str, arguments: &[&str]) -> i32 {
    let mut command = std::process::Command::new(assert_cmd::cargo::cargo_bin("fluxsheet"));
    command.args(arguments).stdin(Stdio::null());
    if stream == "stdout" {
        command.stdout(Stdio::piped()).stderr(Stdio::null());
    } else {
        command.stderr(Stdio::piped()).stdout(Stdio::null());
    }
    let mut child = command.spawn().unwrap();
    // Closing the reader before the program writes makes every write a broken pipe.
    drop(child.stdout.take());
    drop(child.stderr.take());
    child.wait().unwrap().code().unwrap_or(-1)
}

#[test]
fn a_closed_standard_output_keeps_the_sheets_exit_code() {
    let folder = tempfile::tempdir().unwrap();
    let sheet = many_errors(folder.path());
    let sheet = sheet.to_str().unwrap();
    assert_eq!(exit_with_closed("stdout", &["run", sheet]), 3);
    assert_eq!(exit_with_closed("stdout", &["check", sheet]), 3);
}

#[test]
fn a_closed_standard_error_is_no_panic() {
    let folder = tempfile::tempdir().unwrap();
    let sheet = many_errors(folder.path());
    let sheet = sheet.to_str().unwrap();
    assert_eq!(exit_with_closed("stderr", &["run", sheet]), 3);
    assert_eq!(exit_with_closed("stderr", &["eval", "-x"]), 3);
    assert_eq!(exit_with_closed("stderr", &["run", "nope.fxs"]), 3);
}

#[cfg(unix)]
#[test]
fn an_interrupted_report_leaves_no_temporary_file() {
    let folder = tempfile::tempdir().unwrap();
    std::fs::write(
        folder.path().join("big.fxs"),
        "x = 1 m to 300000 m count 300000\ny = x * 2\n",
    )
    .unwrap();
    let mut child = std::process::Command::new(assert_cmd::cargo::cargo_bin("fluxsheet"))
        .current_dir(folder.path())
        .args(["report", "big.fxs", "-o", "big.md"])
        .stdout(Stdio::null())
        .stderr(Stdio::null())
        .spawn()
        .unwrap();
    let temporary_exists = || {
        std::fs::read_dir(folder.path())
            .unwrap()
            .flatten()
            .any(|entry| entry.file_name().to_string_lossy().ends_with(".tmp"))
    };
    let started = std::time::Instant::now();
    while !temporary_exists() && started.elapsed() < Duration::from_secs(60) {
        if child.try_wait().unwrap().is_some() {
            break;
        }
        std::thread::sleep(Duration::from_millis(5));
    }
    let caught_while_writing = temporary_exists();
    let signal = std::process::Command::new("kill")
        .args(["-TERM", &child.id().to_string()])
        .status()
        .unwrap();
    assert!(signal.success());
    let status = child.wait().unwrap();
    assert!(
        caught_while_writing,
        "the report never showed its temporary file"
    );
    assert_ne!(status.code(), Some(0));
    assert!(!temporary_exists(), "temporary file left behind");
    assert!(!folder.path().join("big.md").exists());
}
