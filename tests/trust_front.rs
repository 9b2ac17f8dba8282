//! No silent wrong numbers at the front doors: `solve` to full precision over brackets that
//! span decades, sessions that load sheets with includes, and expressions that start with a
//! minus sign on the command line. Reference values name their source.

use crate::util::{assert_close, fluxsheet, run, run_sheet};

/// `run --format json` of a sheet given as text: the JSON, after checking the run was clean.
fn run_json(sheet: &str) -> serde_json::Value {
    let (code, stdout, stderr) = run_sheet(sheet, &["--format", "json"]);
    assert_eq!(code, 0, "{stderr}{stdout}");
    serde_json::from_str(&stdout).expect("valid JSON")
}

/// The JSON object of the line `name`.
fn json_line<'j>(json: &'j serde_json::Value, name: &str) -> &'j serde_json::Value {
    json["lines"]
        .as_array()
        .expect("lines")
        .iter()
        .find(|line| line["name"] == name)
        .unwrap_or_else(|| panic!("no line `{name}` in {json}"))
}

/// The SI value of a solved line.
fn solved(json: &serde_json::Value, name: &str) -> f64 {
    json_line(json, name)["si_value"]
        .as_f64()
        .expect("a number")
}

/// The accuracy a solved line's note claims: the final bracket's width relative to the root,
/// or the residual relative to the target when the line met it to rounding. Panics if the note
/// claims neither.
fn claimed_accuracy(json: &serde_json::Value, name: &str) -> f64 {
    let note = json_line(json, name)["note"]
        .as_str()
        .expect("a solve note");
    let number_after = |marker: &str| -> Option<f64> {
        let rest = &note[note.find(marker)? + marker.len()..];
        rest.split_whitespace().next()?.parse().ok()
    };
    if note.contains("(exact)") {
        0.0
    } else if note.contains("meets the target to rounding") {
        number_after("(").expect("the residual relative to the target")
    } else {
        number_after("root bracketed to ").expect("the bracket width")
    }
}

/// A root of a decade-spanning bracket is found to the last digits: today's solve would stop
/// at 1e-12 of the larger bracket end (1e-6 m here), leaving 1e-5 m wrong by 1 %.
#[test]
fn solve_over_a_log_spaced_bracket_finds_cube_roots_to_full_precision() {
    let sheet = "\
x = 1 m
y [m^3] = x^3
x_small [m] = solve y == 2e-15 m^3 for x between 1e-6 m and 1e6 m
x_unit [m] = solve y == 2 m^3 for x between 1e-6 m and 1e6 m
x_large [m] = solve y == 2e15 m^3 for x between 1e-6 m and 1e6 m
";
    let json = run_json(sheet);
    // Cube roots of 2e-15, 2 and 2e15 (Python mpmath cbrt, 30 digits).
    for (name, expected) in [
        ("x_small", 1.259_921_049_894_873_2e-5),
        ("x_unit", 1.259_921_049_894_873_2),
        ("x_large", 1.259_921_049_894_873_2e5),
    ] {
        assert_close(solved(&json, name), expected, 1e-15, name);
        let claimed = claimed_accuracy(&json, name);
        assert!(claimed <= 1e-15, "{name}: claimed accuracy {claimed:e}");
    }
}

/// The time at which a Theis drawdown reaches a target, bracketed by 1 s and 100 yr: the
/// answer is 9.06 s, nine decades below the upper end.
#[test]
fn solve_for_a_theis_time_in_a_century_wide_bracket_matches_an_independent_root() {
    let sheet = "\
Q = 0.012 m^3/s
T_aq = 4.5e-3 m^2/s
S = 2.5e-4
r = 25 m
t = 1 d
s [m] = theis_drawdown(Q, T_aq, S, r, t)
t_reach [s] = solve s == 0.05 m for t between 1 s and 100 yr
";
    let json = run_json(sheet);
    // Root of Q/(4 pi T) E1(r^2 S / (4 T t)) = 0.05 m for the inputs above, computed with
    // Python mpmath findroot and e1 at 30 digits: 9.06377110489926789341 s.
    assert_close(
        solved(&json, "t_reach"),
        9.063_771_104_899_268,
        1e-12,
        "t_reach",
    );
    let claimed = claimed_accuracy(&json, "t_reach");
    assert!(claimed <= 1e-14, "claimed accuracy {claimed:e}");
}

/// A root at zero has no relative precision; the note then gives the bracket's absolute width,
/// and the answer is zero to the float spacing of the bracket's larger end.
#[test]
fn solve_for_a_root_at_zero_ends_and_says_how_close_it_is() {
    let json =
        run_json("x = 1 m\ny [m^3] = x^3\nx0 [m] = solve y == 0 m^3 for x between -1 m and 2 m\n");
    let line = json_line(&json, "x0");
    let value = line["si_value"].as_f64().expect("a number");
    // The exact root is 0 (closed form); 2 m is the bracket's larger end.
    assert!(value.abs() <= 2.0 * 2.0 * f64::EPSILON, "{value}");
    let note = line["note"].as_str().expect("a solve note");
    assert!(
        note.contains("(exact)") || (note.contains("root bracketed to") && note.ends_with(" m")),
        "{note}"
    );
}

/// `-40 degF` is -40 degC: the two scales meet there (exact, from the definitions
/// degF = (x + 459.67) * 5/9 K and degC = x + 273.15 K).
#[test]
fn eval_takes_an_expression_that_starts_with_a_minus_sign() {
    let (code, stdout, stderr) = run(&["eval", "-40 degF [degC]"]);
    assert_eq!(code, 0, "{stderr}");
    let (number, unit) = stdout.trim().split_once(' ').expect("value and unit");
    assert_eq!(unit, "degC", "{stdout}");
    assert_close(number.parse().expect("a number"), -40.0, 1e-12, "table");
    for arguments in [
        ["eval", "--format", "json", "-40 degF [degC]"],
        ["eval", "-40 degF [degC]", "--format", "json"],
    ] {
        let (code, stdout, stderr) = run(&arguments);
        assert_eq!(code, 0, "{arguments:?}: {stderr}");
        let json: serde_json::Value = serde_json::from_str(&stdout).expect("valid JSON");
        assert_eq!(json["unit"], "degC", "{arguments:?}");
        let value = json["value"].as_f64().expect("a number");
        assert_close(value, -40.0, 1e-12, "json");
        // -40 degC is 233.15 K (exact, from the definition of degC).
        let kelvin = json["si_value"].as_f64().expect("a number");
        assert_close(kelvin, 233.15, 1e-15, "json si_value");
    }
    // `-2^2` is -(2^2) (README: `^` binds tighter than unary minus).
    let (code, stdout, _) = run(&["eval", "--digits", "3", "-2^2"]);
    assert_eq!((code, stdout.as_str()), (0, "-4\n"));
}

#[test]
fn a_mistyped_option_is_not_read_as_an_expression() {
    let (code, _, stderr) = run(&["eval", "--bogus"]);
    assert_eq!(code, 2, "{stderr}");
    assert!(stderr.contains("not an option of `eval`"), "{stderr}");
    // Real options and help keep working.
    let (code, stdout, _) = run(&["eval", "--help"]);
    assert_eq!(code, 0);
    assert!(stdout.contains("-40 degF [degC]"), "{stdout}");
}

#[test]
fn set_takes_a_negative_value() {
    let sheet = "x = 2 m\ny [m] = x * 2\n";
    let (code, stdout, stderr) = run_sheet(sheet, &["--format", "json", "--set", "x=-3 m"]);
    assert_eq!(code, 0, "{stderr}");
    let json: serde_json::Value = serde_json::from_str(&stdout).expect("valid JSON");
    let y = json_line(&json, "y")["si_value"]
        .as_f64()
        .expect("a number");
    assert_close(y, -6.0, 1e-15, "y = -3 m * 2");
}

/// Runs `fluxsheet ARGS…` from the repository's folder (so `worksheets/…` paths resolve as a
/// user would type them) with `script` on standard input.
fn session_in_repository(arguments: &[&str], script: &str) -> (i32, String, String) {
    crate::util::outcome(
        fluxsheet()
            .current_dir(env!("CARGO_MANIFEST_DIR"))
            .env("FLUXSHEET_HISTORY", "off")
            .args(arguments)
            .write_stdin(script),
    )
}

/// No line of a session's error output is an `error:` with nothing after it.
fn assert_no_empty_error(stderr: &str) {
    for line in stderr.lines() {
        let trimmed = line.trim();
        assert!(
            !(trimmed == "error:" || trimmed.ends_with(" error:") || trimmed.ends_with("error: ")),
            "an error without a message: {line:?} in\n{stderr}"
        );
    }
}

/// The lines of the liner sheet that depend on its include (`site_K`, `rho_gw`, `mu_gw` come
/// from `shared/eastfield_constants.fxs`), and one that does not.
const LINER_LINES: [&str; 5] = ["K_liner", "q_leak", "Q_leak", "Q_leak_daily", "J_cl"];

/// `name`'s shown value and unit as `fluxsheet run --format json` gives them for the liner sheet.
fn liner_values_from_run() -> Vec<(f64, String)> {
    let sheet = crate::util::worksheet("clay_liner_leakage.fxs");
    let (code, stdout, stderr) = run(&["run", "--format", "json", sheet.to_str().unwrap()]);
    assert_eq!(code, 0, "{stderr}");
    let json: serde_json::Value = serde_json::from_str(&stdout).expect("valid JSON");
    LINER_LINES
        .iter()
        .map(|name| {
            let line = json_line(&json, name);
            (
                line["value"].as_f64().expect("a number"),
                line["unit"].as_str().expect("a unit").to_string(),
            )
        })
        .collect()
}

/// Checks that a session printed, for each of `LINER_LINES` asked as a bare expression, the
/// value and unit `run` gives (printed at 15 digits).
fn assert_session_matches_run(stdout: &str) {
    let printed: Vec<&str> = stdout.lines().rev().take(LINER_LINES.len()).collect();
    let printed: Vec<&str> = printed.into_iter().rev().collect();
    for ((name, (expected, unit)), line) in
        LINER_LINES.iter().zip(liner_values_from_run()).zip(printed)
    {
        let (number, printed_unit) = line.split_once(' ').expect("value and unit");
        assert_eq!(printed_unit, unit, "{name}: {line}");
        assert_close(number.parse().expect("a number"), expected, 1e-14, name);
    }
}

#[test]
fn a_session_loads_a_sheet_with_includes_and_gives_the_values_of_run() {
    let script = format!(
        ":load worksheets/clay_liner_leakage.fxs\n{}\n",
        LINER_LINES.join("\n")
    );
    let (code, stdout, stderr) = session_in_repository(&["repl", "--digits", "15"], &script);
    assert_eq!(code, 0, "{stderr}\n{stdout}");
    assert_no_empty_error(&stderr);
    assert!(
        stdout.starts_with("loaded worksheets/clay_liner_leakage.fxs: 26 lines"),
        "{stdout}"
    );
    assert_session_matches_run(&stdout);
}

#[test]
fn a_session_opened_on_a_sheet_with_includes_gives_the_values_of_run() {
    let script = format!("{}\n", LINER_LINES.join("\n"));
    let (code, stdout, stderr) = session_in_repository(
        &[
            "repl",
            "--digits",
            "15",
            "worksheets/clay_liner_leakage.fxs",
        ],
        &script,
    );
    assert_eq!(code, 0, "{stderr}\n{stdout}");
    assert_no_empty_error(&stderr);
    assert_session_matches_run(&stdout);
}

#[test]
fn included_lines_are_used_but_not_listed_saved_or_redefined() {
    let folder = tempfile::tempdir().unwrap();
    std::fs::create_dir(folder.path().join("shared")).unwrap();
    std::fs::write(
        folder.path().join("shared/site.fxs"),
        "g_site = 9.81 m/s^2\nhead(p) [m] = p / (1000 kg/m^3 * g_site)\n",
    )
    .unwrap();
    std::fs::write(
        folder.path().join("main.fxs"),
        "include \"shared/site.fxs\"\np = 98.1 kPa\nh = head(p)\n",
    )
    .unwrap();
    let script = ":lines\ng_site = 10 m/s^2\ninclude \"shared/site.fxs\"\nh [m]\n:save copy.fxs\n";
    let (code, stdout, stderr) = crate::util::outcome(
        fluxsheet()
            .current_dir(folder.path())
            .env("FLUXSHEET_HISTORY", "off")
            .args(["repl", "main.fxs"])
            .write_stdin(script),
    );
    assert_eq!(code, 3, "two entries were refused: {stderr}");
    assert_no_empty_error(&stderr);
    // 98.1 kPa / (1000 kg/m^3 * 9.81 m/s^2) = 10 m (hand computation).
    assert!(stdout.contains("\n10 m\n"), "{stdout}");
    assert!(
        !stdout.contains("g_site ="),
        "included lines are not listed: {stdout}"
    );
    assert!(
        stderr.contains("`g_site` is defined in the included sheet"),
        "{stderr}"
    );
    assert!(stderr.contains("`:load` the sheet"), "{stderr}");
    let saved = std::fs::read_to_string(folder.path().join("copy.fxs")).unwrap();
    assert_eq!(
        saved,
        "include \"shared/site.fxs\"\np = 98.1 kPa\nh = head(p)\n"
    );
}

#[test]
fn a_session_keeps_the_include_sandbox_of_run() {
    let folder = tempfile::tempdir().unwrap();
    std::fs::write(folder.path().join("outside.fxs"), "a = 1 m\n").unwrap();
    let inner = folder.path().join("inner");
    std::fs::create_dir(&inner).unwrap();
    std::fs::write(
        inner.join("main.fxs"),
        "include \"../outside.fxs\"\nb = a * 2\n",
    )
    .unwrap();
    let sheet = inner.join("main.fxs");
    let sheet = sheet.to_str().unwrap();
    let (run_code, _, run_stderr) = run(&["run", sheet]);
    assert_eq!(run_code, 3);
    assert!(
        run_stderr.contains("outside the sheet's folder"),
        "{run_stderr}"
    );
    let (code, _, stderr) = session_in_repository(&["repl", sheet], "b\n");
    assert_eq!(code, 3);
    assert_no_empty_error(&stderr);
    assert!(stderr.contains("outside the sheet's folder"), "{stderr}");
    assert!(
        stderr.contains("`a` has no value") || stderr.contains("unknown name `a`"),
        "{stderr}"
    );
}
