//! The interactive session: scripted over standard input, and on a pseudo-terminal for
//! completion, hints, Ctrl-C, Ctrl-D and the history file.

use crate::util::{assert_close, fluxsheet, run, worksheet};

/// Runs `fluxsheet ARGS…` with `script` on standard input; (exit code, stdout, stderr).
fn session(arguments: &[&str], script: &str) -> (i32, String, String) {
    crate::util::outcome(
        fluxsheet()
            .env("FLUXSHEET_HISTORY", "off")
            .args(arguments)
            .write_stdin(script),
    )
}

#[test]
fn definitions_print_values_with_units() {
    let script = "k = 420 mD\nrho = 998.2 kg/m^3\nmu = 1.002 cP\nK [m/s] = k * rho * g0 / mu\nK [ft/d]\ncheck K <= 1e-4 m/s\n";
    let (code, stdout, stderr) = session(&["repl"], script);
    assert_eq!(code, 0, "{stderr}");
    assert_eq!(
        stdout,
        "k = 420 mD\nrho = 998.2 kg/m^3\nmu = 1.002 cP\nK = 4.05e-6 m/s\n1.148 ft/d\ncheck passed: 4.05e-6 m/s <= 1e-4 m/s\n"
    );
}

#[test]
fn no_command_without_a_terminal_reads_the_session_from_stdin() {
    let (code, stdout, _) = session(&[], "2 ft [m]\n");
    assert_eq!((code, stdout.as_str()), (0, "0.6096 m\n"));
}

#[test]
fn redefinition_recomputes_only_the_dependents() {
    let script = "a = 2 m\nb [cm] = a * 3\nc = b + 1 m\nd = 5 s\ncheck c > 6 m\na = 3 m\n";
    let (code, stdout, stderr) = session(&["repl"], script);
    assert_eq!(code, 0, "{stderr}");
    let after: Vec<&str> = stdout.lines().skip(5).collect();
    assert_eq!(
        after,
        [
            "a = 3 m   (redefined; was `a = 2 m`)",
            "  b = 900 cm",
            "  c = 10 m",
            "  check passed: 10 m > 6 m",
        ]
    );
}

#[test]
fn a_circular_redefinition_is_refused_and_the_old_one_kept() {
    let (code, stdout, stderr) = session(&["repl"], "a = 2 m\nb = a * 2\na = b / 2\na\n");
    assert_eq!(code, 3);
    assert!(
        stderr.contains("error: circular definition: `a` -> `b` -> `a`"),
        "{stderr}"
    );
    assert!(stderr.contains("the definition of `a` is unchanged"));
    assert!(stdout.ends_with("2 m\n"), "{stdout}");
}

#[test]
fn errors_do_not_end_the_session() {
    let script =
        "a = 2 m\nb = a + 1 s\nc = (\nnope * 2\n:nonsense\n:load does-not-exist.fxs\nd = a * 2\n";
    let (code, stdout, stderr) = session(&["repl"], script);
    assert_eq!(code, 3, "an entry had an error");
    assert_eq!(stdout, "a = 2 m\nd = 4 m\n");
    assert!(stderr.contains("cannot add a time (s) to a length (m)"));
    assert!(
        stderr.contains("1 │ b = a + 1 s\n  │     ^^^^^^^"),
        "{stderr}"
    );
    assert!(stderr.contains("unknown name `nope`"));
    assert!(stderr.contains("unknown command `:nonsense`"));
    assert!(stderr.contains("cannot read `does-not-exist.fxs`"));
}

#[test]
fn a_redefinition_that_breaks_a_dependent_reports_it() {
    let (_, stdout, stderr) = session(&["repl"], "a = 2 m\nb = a + 1 m\nc = b * 2\na = 1 s\n");
    assert!(stdout.contains("a = 1 s   (redefined"), "{stdout}");
    assert!(stdout.contains("  c: not evaluated, `b` has no value"));
    assert!(
        stderr.contains("  `b` now has an error:\n  error: cannot add a length (m) to a time (s)")
    );
}

#[test]
fn underscore_is_the_last_result() {
    let script = "4 ft [m]\n_ * 2\nh = _\nq = 3 m^3/s\nflow_per_width [m^2/s] = _ / 10 m\n:lines\n";
    let (code, stdout, stderr) = session(&["repl"], script);
    assert_eq!(code, 0, "{stderr}");
    let lines: Vec<&str> = stdout.lines().collect();
    assert_eq!(
        &lines[..5],
        [
            "1.219 m",
            "2.438 m",
            "h = 2.438 m",
            "q = 3 m^3/s",
            "flow_per_width = 0.3 m^2/s"
        ]
    );
    // In a kept line `_` became the name (or value) it stood for.
    assert!(
        stdout.contains("flow_per_width [m^2/s] = q / 10 m"),
        "{stdout}"
    );
    assert!(stdout.contains("h = (2.4384e0 m)"), "{stdout}");
}

#[test]
fn a_saved_session_runs_as_a_sheet_with_the_same_values() {
    let directory = tempfile::tempdir().unwrap();
    let path = directory.path().join("saved.fxs");
    let path_text = path.to_str().unwrap();
    let script = format!(
        "## Test pad\nk = 250 mD # core\nT = 15 degC\nK [m/s] = hydraulic_conductivity(k, T)\nk = 300 mD\ni = 0.02\nq [m/d] = K * i\nq [ft/d]\ncheck q < 1 m/d\n:save {path_text}\n"
    );
    let (code, stdout, stderr) = session(&["--digits", "17", "repl"], &script);
    assert_eq!(code, 0, "{stderr}");
    assert!(
        stdout.contains(&format!("saved 7 lines to {path_text}")),
        "{stdout}"
    );
    assert!(!stderr.contains("not saved"), "{stderr}");
    let saved = std::fs::read_to_string(&path).unwrap();
    assert_eq!(
        saved,
        "## Test pad\nk = 300 mD\nT = 15 degC\nK [m/s] = hydraulic_conductivity(k, T)\ni = 0.02\nq [m/d] = K * i\ncheck q < 1 m/d\n"
    );
    let (code, json, stderr) = run(&["run", "--format", "json", path_text]);
    assert_eq!(code, 0, "{stderr}");
    let json: serde_json::Value = serde_json::from_str(&json).unwrap();
    let value_in_sheet = |name: &str| {
        json["lines"]
            .as_array()
            .unwrap()
            .iter()
            .find(|line| line["name"] == name)
            .and_then(|line| line["value"].as_f64())
            .unwrap()
    };
    let value_in_session = |name: &str| {
        let prefix = format!("{name} = ");
        let printed = stdout
            .lines()
            .rev()
            .find_map(|line| line.trim_start().strip_prefix(&prefix))
            .unwrap();
        printed.split(' ').next().unwrap().parse::<f64>().unwrap()
    };
    for name in ["k", "T", "K", "q"] {
        assert_close(value_in_session(name), value_in_sheet(name), 1e-15, name);
    }
}

#[test]
fn save_does_not_replace_another_file_unless_forced() {
    let directory = tempfile::tempdir().unwrap();
    let path = directory.path().join("other.fxs");
    std::fs::write(&path, "x = 1 m\n").unwrap();
    let path_text = path.to_str().unwrap();
    let script = format!("a = 2 m\n:save {path_text}\n:save --force {path_text}\nb = 3 m\n:save\n");
    let (code, stdout, stderr) = session(&["repl"], &script);
    assert_eq!(code, 3, "the first save was refused");
    assert!(stderr.contains("exists; `:save --force"), "{stderr}");
    assert!(stdout.contains("saved 1 line to"), "{stdout}");
    assert!(stdout.contains("saved 2 lines"), "{stdout}");
    assert_eq!(
        std::fs::read_to_string(&path).unwrap(),
        "a = 2 m\nb = 3 m\n"
    );
}

#[test]
fn a_file_is_loaded_first_and_can_be_changed_and_saved_back() {
    let directory = tempfile::tempdir().unwrap();
    let path = directory.path().join("site.fxs");
    std::fs::copy(worksheet("core_permeability.fxs"), &path).unwrap();
    let path_text = path.to_str().unwrap();
    let original = std::fs::read_to_string(&path).unwrap();
    let (code, before, _) = run(&["run", "--format", "json", path_text]);
    assert_eq!(code, 0);
    let before: serde_json::Value = serde_json::from_str(&before).unwrap();
    let (code, stdout, stderr) = session(&["repl", path_text], ":lines\n:save\n");
    assert_eq!(code, 0, "{stderr}");
    assert!(
        stdout.starts_with(&format!("loaded {path_text}: ")),
        "{stdout}"
    );
    assert!(stdout.contains(&format!("saved {} lines", original.lines().count())));
    // Loading and saving unchanged gives the same sheet back.
    assert_eq!(std::fs::read_to_string(&path).unwrap(), original);
    let first = before["lines"][0]["name"].as_str().unwrap().to_string();
    let listed = stdout
        .lines()
        .find(|line| line.contains(&format!(" {first} ")));
    assert!(listed.is_some(), "{stdout}");
}

#[test]
fn loading_reports_lines_left_out_and_redefinitions() {
    let directory = tempfile::tempdir().unwrap();
    let path = directory.path().join("part.fxs");
    std::fs::write(&path, "b = a * 2\nbad = (\na = 5 m\n").unwrap();
    let path_text = path.to_str().unwrap();
    let script = format!("a = 1 m\nb = 1 s\n:load {path_text}\nb\n");
    let (code, stdout, stderr) = session(&["repl"], &script);
    assert_eq!(code, 3, "a line was left out");
    assert!(
        stderr.contains(&format!("{path_text}:2: line left out")),
        "{stderr}"
    );
    assert!(stdout.contains("2 lines, redefining b, a"), "{stdout}");
    assert!(stdout.ends_with("10 m\n"), "{stdout}");
}

#[test]
fn commands_describe_functions_and_list_units() {
    let script = ":help\n:about water_viscosity\n:about g0\n:about psi\n:units area\n:clear\n:lines\n:quit\n2 m\n";
    let (code, stdout, stderr) = session(&["repl"], script);
    assert_eq!(code, 0, "{stderr}");
    for command in [
        ":lines", ":units", ":about", ":load", ":save", ":clear", ":help", ":quit",
    ] {
        assert!(
            stdout.contains(&format!("  {command}")),
            "{command} in help"
        );
    }
    assert!(stdout.contains("water_viscosity(T[, p])  (function)"));
    assert!(stdout.contains("    source: IAPWS"), "{stdout}");
    assert!(stdout.contains("    valid for: "));
    assert!(stdout.contains("g0 = 9.80665 m/s^2  (constant)"));
    assert!(stdout.contains("pound-force per square inch"));
    assert!(stdout.contains("darcy"), "{stdout}");
    assert!(stdout.contains("the session has no lines yet"));
    // `:quit` ends the session: the line after it is not read.
    assert!(!stdout.contains("\n2 m\n"));
}

#[test]
fn quitting_with_unsaved_lines_says_how_to_save() {
    let (code, _, stderr) = session(&["repl"], "a = 2 m\n");
    assert_eq!(code, 0);
    assert!(
        stderr.contains("note: 1 session line was not saved: `:save FILE`"),
        "{stderr}"
    );
    let (_, _, stderr) = session(&["repl"], "2 m [cm]\n");
    assert!(stderr.is_empty(), "nothing kept, nothing to say: {stderr}");
}

/// On a pseudo-terminal: Tab completion of names and units, a signature hint, Ctrl-C
/// cancelling a line, Ctrl-D quitting, and the history file with owner-only permissions.
#[cfg(unix)]
#[test]
fn terminal_session_completes_hints_cancels_and_keeps_history() {
    use rexpect::session::{spawn_with_options, Options};
    use std::os::unix::fs::PermissionsExt;

    let data_home = tempfile::tempdir().unwrap();
    let mut command = std::process::Command::new(assert_cmd::cargo::cargo_bin("fluxsheet"));
    command
        .env("XDG_DATA_HOME", data_home.path())
        .env_remove("FLUXSHEET_HISTORY")
        .env("NO_COLOR", "1")
        .env("TERM", "xterm");
    let options = Options {
        timeout_ms: Some(20_000),
        strip_ansi_escape_codes: true,
    };
    let mut terminal = spawn_with_options(command, options).unwrap();
    terminal.exp_string("fx> ").unwrap();

    terminal.send_line("k_core = 420 mD").unwrap();
    terminal.exp_string("k_core = 420 mD\r\n").unwrap();
    terminal.exp_string("fx> ").unwrap();

    // A session name completes with Tab; the value proves the line was `k_core * 2`.
    terminal.send("x = k_c").unwrap();
    terminal.send("\t").unwrap();
    terminal.send_line(" * 2").unwrap();
    terminal.exp_string("x = 8.29e-13 m^2").unwrap();
    terminal.exp_string("fx> ").unwrap();

    // A unit completes after a number.
    terminal.send("z [m^2] = 2 acr").unwrap();
    terminal.send("\t").unwrap();
    terminal.send_line("").unwrap();
    terminal.exp_string("z = 8094 m^2").unwrap();
    terminal.exp_string("fx> ").unwrap();

    // The hint shows the rest of the only function that fits, with its arguments.
    terminal.send("w = water_densi").unwrap();
    terminal.flush().unwrap();
    terminal.exp_string("ty(T[, p])").unwrap();
    // Ctrl-C cancels the line: it is neither evaluated nor kept in the history.
    terminal.send_control('c').unwrap();
    // The hint's redraws repeat the prompt on the same line; the cancelled line ends with a
    // new line, and only then does the next prompt read (text typed ahead of it is dropped).
    terminal.exp_string("\n").unwrap();
    terminal.exp_string("fx> ").unwrap();
    terminal.send_line("w = 2 m * 3").unwrap();
    terminal.exp_string("w = 6 m\r\n").unwrap();
    terminal.exp_string("fx> ").unwrap();

    // Ctrl-D quits, with a note on how the unsaved lines could have been kept.
    terminal.send_control('d').unwrap();
    terminal.exp_string("not saved: `:save FILE`").unwrap();
    terminal.exp_eof().unwrap();

    let folder = data_home.path().join("fluxsheet");
    let history = folder.join("history");
    let mode =
        |path: &std::path::Path| std::fs::metadata(path).unwrap().permissions().mode() & 0o777;
    assert_eq!(mode(&folder), 0o700);
    assert_eq!(mode(&history), 0o600);
    let kept = std::fs::read_to_string(&history).unwrap();
    assert!(kept.contains("k_core = 420 mD"), "{kept}");
    assert!(kept.contains("x = k_core * 2"), "{kept}");
    assert!(!kept.contains("water_densi"), "{kept}");
}

/// Sheet functions in a session: defined, called, redefined (callers recomputed), checked at
/// the call, and refused when recursive; includes are refused with a pointer to `:load`.
#[test]
fn sheet_functions_in_a_session() {
    let script = "leak(K [m/s], h, t [m]) [m/d] = K * (h + t) / t\n\
q = leak(1e-9 m/s, 0.3 m, 0.6 m)\n\
leak(K [m/s], h, t [m]) [mm/d] = K * (h + t) / t\n\
bad = leak(2 m, 1 m, 1 m)\n\
f(x) = f(x) + 1\n\
include \"other.fxs\"\n";
    let (code, stdout, stderr) = session(&["repl"], script);
    assert_eq!(code, 3, "entries with errors make the exit code 3");
    assert!(stdout.contains("q = 1.296e-4 m/d"), "{stdout}");
    assert!(
        stdout.contains("  q = 0.1296 mm/d"),
        "callers are recomputed: {stdout}"
    );
    assert!(
        stderr.contains("parameter `K` must be a velocity (m/s), found a length (m)"),
        "{stderr}"
    );
    assert!(
        stderr.contains("circular definition: `f` -> `f`"),
        "{stderr}"
    );
    assert!(
        stderr.contains("includes are not available in a session"),
        "{stderr}"
    );
}

/// A loaded sheet's data files are read relative to the sheet, its columns print as their
/// first rows, and its plot lines are kept and say how to draw them.
#[test]
fn loading_a_sheet_with_data_files_columns_and_plots() {
    let sheet = worksheet("core_sweep.fxs");
    let script = "k_geometric\nK_sweep\nplot K_sweep against T_sweep\nmean(k_core) [mD]\n";
    let (code, stdout, stderr) = session(&["repl", sheet.to_str().unwrap()], script);
    assert_eq!(code, 0, "{stderr}");
    assert!(stdout.contains("447.1 mD"), "{stdout}");
    assert!(stdout.contains("(9 rows)"), "{stdout}");
    assert!(stdout.contains("--plot FILE.svg"), "{stdout}");
    assert!(stdout.contains("749.3 mD"), "{stdout}");
}
