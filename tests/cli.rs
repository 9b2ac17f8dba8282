//! Commands, formats, exit codes and the JSON contract of DESIGN.md.

use crate::util::{eval_json, fluxsheet, run, run_sheet, worksheet};

#[test]
fn eval_json_has_the_documented_fields() {
    let value = eval_json("2 ft/d [m/s]");
    assert_eq!(value["unit"], "m/s");
    assert_eq!(value["si_unit"], "m s^-1");
    assert_eq!(value["dimension"], "L T^-1");
    // 2 ft/d = 0.6096 m / 86400 s.
    assert_eq!(value["si_value"].as_f64().unwrap(), 0.6096 / 86400.0);
    assert_eq!(value["value"], value["si_value"]);
}

#[test]
fn eval_prints_value_and_unit() {
    let (code, stdout, _) = run(&["eval", "1 acre*ft [m^3]", "--digits", "15"]);
    assert_eq!((code, stdout.as_str()), (0, "1233.48183754752 m^3\n"));
    let (_, stdout, _) = run(&["eval", "300 K [degC]"]);
    assert_eq!(stdout, "26.85 degC\n");
    let (_, stdout, _) = run(&["eval", "sqrt(4 m^2)"]);
    assert_eq!(stdout, "2 m\n");
}

#[test]
fn run_json_lists_lines_checks_and_diagnostics() {
    let sheet = "a = 2 m\nb [cm] = a * 3\ncheck b > 5 m\nc = a + 1 s\n";
    let (code, stdout, _) = run_sheet(sheet, &["--format", "json"]);
    assert_eq!(code, 3);
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let lines = json["lines"].as_array().unwrap();
    assert_eq!(lines.len(), 2);
    assert_eq!(lines[1]["line"], 2);
    assert_eq!(lines[1]["name"], "b");
    assert_eq!(lines[1]["unit"], "cm");
    assert_eq!(lines[1]["value"].as_f64().unwrap(), 600.0);
    assert_eq!(lines[1]["si_value"].as_f64().unwrap(), 6.0);
    assert_eq!(json["checks"][0]["passed"], true);
    assert_eq!(json["checks"][0]["line"], 3);
    let diagnostic = &json["diagnostics"][0];
    assert_eq!(diagnostic["severity"], "error");
    assert_eq!(
        (diagnostic["line"].as_u64(), diagnostic["column"].as_u64()),
        (Some(4), Some(5))
    );
    assert_eq!(
        diagnostic["message"],
        "cannot add a time (s) to a length (m)"
    );
}

#[test]
fn eval_errors_in_json_go_to_stdout_with_exit_3() {
    let (code, stdout, _) = run(&["eval", "--format", "json", "2 m + 1 s"]);
    assert_eq!(code, 3);
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    assert_eq!(json["diagnostics"][0]["column"], 1);
}

#[test]
fn failed_check_exits_1_and_errors_win_with_3() {
    assert_eq!(run_sheet("check 1 m > 2 m\n", &[]).0, 1);
    assert_eq!(run_sheet("check 1 m > 2 m\nx = y\n", &[]).0, 3);
    assert_eq!(run_sheet("check 3 m > 2 m\n", &[]).0, 0);
}

#[test]
fn check_tolerances_relative_and_absolute() {
    assert_eq!(run_sheet("check 1.005 m == 1 m within 1 %\n", &[]).0, 0);
    assert_eq!(run_sheet("check 1.02 m == 1 m within 1 %\n", &[]).0, 1);
    assert_eq!(run_sheet("check 1.02 m == 1 m within 3 cm\n", &[]).0, 0);
    assert_eq!(run_sheet("check 1.02 m <= 1 m within 3 cm\n", &[]).0, 0);
    assert_eq!(run_sheet("check 1 m == 1 m within 1 s\n", &[]).0, 3);
    // Float noise does not fail an equality without a tolerance.
    assert_eq!(run_sheet("check 0.1 m + 0.2 m == 0.3 m\n", &[]).0, 0);
}

#[test]
fn unreadable_file_exits_3() {
    let (code, _, stderr) = run(&["run", "no/such/sheet.fxs"]);
    assert_eq!(code, 3);
    assert!(
        stderr.contains("cannot read `no/such/sheet.fxs`"),
        "{stderr}"
    );
}

#[test]
fn bad_command_line_exits_2() {
    assert_eq!(run(&["frobnicate"]).0, 2);
    assert_eq!(run(&["run"]).0, 2);
    assert_eq!(run(&["eval", "1 m", "--digits", "0"]).0, 2);
    assert_eq!(run(&["eval", "1 m", "--format", "xml"]).0, 2);
}

#[test]
fn every_command_has_help_with_an_example() {
    for command in ["run", "eval", "units", "functions"] {
        let (code, stdout, _) = run(&[command, "--help"]);
        assert_eq!(code, 0, "{command}");
        assert!(
            stdout.contains("Examples:"),
            "{command} help lacks examples"
        );
    }
    let (code, stdout, _) = run(&["--help"]);
    assert_eq!(code, 0);
    assert!(stdout.contains("Exit codes"));
}

#[test]
fn units_lists_and_filters_by_text_and_dimension() {
    let (code, stdout, _) = run(&["units"]);
    assert_eq!(code, 0);
    assert!(
        stdout.contains("365.25 d"),
        "units must say how long a year is"
    );
    let (_, stdout, _) = run(&["units", "pressure", "--format", "csv"]);
    let symbols: Vec<&str> = stdout
        .lines()
        .skip(1)
        .map(|line| line.split(',').next().unwrap())
        .collect();
    assert!(
        symbols.contains(&"psi") && symbols.contains(&"mH2O") && symbols.contains(&"Pa"),
        "{symbols:?}"
    );
    assert!(!symbols.contains(&"m"));
    let (_, stdout, _) = run(&["units", "darcy", "--format", "json"]);
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    assert_eq!(json.as_array().unwrap().len(), 1);
    assert!(json[0]["factor_to_SI"]
        .as_str()
        .unwrap()
        .starts_with("9.869232667160128"));
}

#[test]
fn functions_lists_builtins_and_constants() {
    let (code, stdout, _) = run(&["functions", "--format", "csv"]);
    assert_eq!(code, 0);
    for name in ["sqrt(x)", "ln(x)", "g0", "pi", "R", "F", "N_A", "k_B"] {
        assert!(
            stdout.lines().any(|line| line.starts_with(name)),
            "{name} missing"
        );
    }
}

#[test]
fn run_accepts_several_files_and_all_formats() {
    let core = worksheet("core_permeability.fxs");
    let sand = worksheet("sand_aquifer_seepage.fxs");
    for format in ["table", "markdown", "csv", "json"] {
        let output = fluxsheet()
            .args(["run", "--format", format])
            .arg(&core)
            .arg(&sand)
            .output()
            .unwrap();
        assert_eq!(output.status.code(), Some(0), "{format}");
    }
    let output = fluxsheet()
        .args(["run", "--format", "json"])
        .arg(&core)
        .arg(&sand)
        .output()
        .unwrap();
    let json: serde_json::Value = serde_json::from_slice(&output.stdout).unwrap();
    assert_eq!(json.as_array().map(Vec::len), Some(2));
}

#[test]
fn digits_sets_significant_figures() {
    let (_, stdout, _) = run(&["eval", "2 / 3", "--digits", "2"]);
    assert_eq!(stdout, "0.67\n");
    let (_, stdout, _) = run(&["eval", "2 / 3", "--digits", "6"]);
    assert_eq!(stdout, "0.666667\n");
}

/// The temperature rules of the README, each once.
#[test]
fn temperature_rules() {
    let json = eval_json("30 degC - 20 degC");
    assert_eq!(json["unit"], "K");
    assert!((json["si_value"].as_f64().unwrap() - 10.0).abs() < 1e-12);
    let json = eval_json("(30 degC - 20 degC) [delta_degF]");
    assert!((json["value"].as_f64().unwrap() - 18.0).abs() < 1e-9);
    let json = eval_json("20 degC + 5 K [degC]");
    assert!((json["value"].as_f64().unwrap() - 25.0).abs() < 1e-12);
    let json = eval_json("300 K [degF]");
    assert!((json["value"].as_f64().unwrap() - 80.33).abs() < 1e-9);
    // Inside a compound unit a degree is a difference: 1 W/(m*degF) = 1.8 W/(m*K).
    assert!(
        (eval_json("1 W/(m*degF) [W/(m*K)]")["value"]
            .as_f64()
            .unwrap()
            - 1.8)
            .abs()
            < 1e-12
    );
    for refused in [
        "20 degC [delta_degC]",
        "5 delta_degC - 20 degC",
        "20 degC + 20 degF",
        "(20 degC - 10 degC) [degF]",
    ] {
        assert_eq!(run(&["eval", refused]).0, 3, "{refused}");
    }
}

/// Rational exponents: powers and roots of units combine exactly.
#[test]
fn dimension_algebra_with_rational_exponents() {
    assert!(
        (eval_json("sqrt(2 m) * sqrt(8 m) [m]")["value"]
            .as_f64()
            .unwrap()
            - 4.0)
            .abs()
            < 1e-15
    );
    assert_eq!(eval_json("(4 m)^(3/2)")["dimension"], "L^(3/2)");
    assert_eq!(eval_json("(9 m^2)^0.5 [m]")["value"].as_f64(), Some(3.0));
    assert_eq!(
        eval_json("1 m^(1/2) * 1 m^(1/2) [m]")["value"].as_f64(),
        Some(1.0)
    );
    assert_eq!(eval_json("2 kg*m/s^2 [N]")["value"].as_f64(), Some(2.0));
    assert_eq!(eval_json("1 1/d [1/s]")["dimension"], "T^-1");
    assert_eq!(run(&["eval", "sqrt(-4 m^2)"]).0, 3);
    assert_eq!(run(&["eval", "exp(2 m)"]).0, 3);
}

/// Without `[unit]`: a literal shows in its own unit, a bare name in its line's unit, anything
/// else in the preferred SI unit.
#[test]
fn default_display_units() {
    let (code, stdout, _) = run_sheet(
        "k = 420 mD\nj = k\nT = 9 degC\nU = T\nw = k * 2\n",
        &["--format", "json"],
    );
    assert_eq!(code, 0);
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let units: Vec<&str> = json["lines"]
        .as_array()
        .unwrap()
        .iter()
        .map(|line| line["unit"].as_str().unwrap())
        .collect();
    assert_eq!(units, vec!["mD", "mD", "degC", "degC", "m^2"]);
}

/// Completions come from the clap definitions: every shell gets a script naming the commands,
/// and bash accepts its script's syntax.
#[test]
fn shell_completions_and_the_manual_page_are_generated() {
    for shell in ["bash", "zsh", "fish", "powershell"] {
        let (code, stdout, stderr) = run(&["completions", shell]);
        assert_eq!(code, 0, "{shell}: {stderr}");
        for command in ["run", "check", "report", "eval", "properties"] {
            assert!(stdout.contains(command), "{shell} lacks {command}");
        }
    }
    let (_, script, _) = run(&["completions", "bash"]);
    let folder = tempfile::tempdir().unwrap();
    let path = folder.path().join("fluxsheet.bash");
    std::fs::write(&path, script).unwrap();
    let syntax = std::process::Command::new("bash")
        .arg("-n")
        .arg(&path)
        .output()
        .expect("bash runs");
    assert!(
        syntax.status.success(),
        "{}",
        String::from_utf8_lossy(&syntax.stderr)
    );
    let (code, manual, _) = run(&["manual"]);
    assert_eq!(code, 0);
    assert!(
        manual.starts_with(".ie") || manual.contains(".TH fluxsheet 1"),
        "{manual}"
    );
    assert!(manual.contains(".SH NAME") && manual.contains("porous media"));
    let (code, _, stderr) = run(&["completions", "tcsh"]);
    assert_eq!(code, 2, "an unknown shell is a usage error: {stderr}");
}

/// CSV is read by programs: without `--digits` it carries 15 significant figures (all a double
/// holds of a decimal value), so each number read back by a CSV reader agrees with the JSON of
/// the same run to 15 figures, and with `--digits 17` exactly.
#[test]
fn csv_output_carries_full_precision_by_default() {
    let sheet = worksheet("core_permeability.fxs");
    let sheet = sheet.to_str().unwrap();
    let (_, json_text, _) = run(&["run", "--format", "json", sheet]);
    let json: serde_json::Value = serde_json::from_str(&json_text).unwrap();
    let json_value = |name: &str| {
        json["lines"]
            .as_array()
            .unwrap()
            .iter()
            .find(|line| line["name"] == name)
            .and_then(|line| line["value"].as_f64())
    };
    for (digits, tolerance) in [(None, 5e-15), (Some("17"), 0.0)] {
        let mut arguments = vec!["run", "--format", "csv", sheet];
        if let Some(digits) = digits {
            arguments.extend(["--digits", digits]);
        }
        let (_, csv_text, _) = run(&arguments);
        let mut reader = csv::Reader::from_reader(csv_text.as_bytes());
        let mut compared = 0;
        for record in reader.records() {
            let record = record.expect("every record reads");
            let (name, value) = (&record[1], &record[3]);
            let (Ok(value), Some(expected)) = (value.parse::<f64>(), json_value(name)) else {
                continue;
            };
            assert!(
                (value - expected).abs() <= tolerance * expected.abs(),
                "{name}: csv {value} json {expected} ({digits:?} digits)"
            );
            compared += 1;
        }
        assert!(compared >= 10, "{compared} values compared");
    }
    let (_, rounded, _) = run(&["run", "--format", "csv", "--digits", "4", sheet]);
    assert!(rounded.contains(",4.051e-6,"), "{rounded}");
}

/// A sheet of single values and columns of different lengths is one CSV table, one record per
/// value, that a CSV reader takes whole.
#[test]
fn csv_of_values_and_columns_of_different_lengths_is_one_table() {
    let folder = tempfile::tempdir().unwrap();
    let path = folder.path().join("mixed.fxs");
    std::fs::write(
        &path,
        "k = 420 mD\nT = 10 degC to 30 degC step 10 K\nd = {1, 2} m\nlabel [mD] = 2 * k\ncheck k > 1 mD\n",
    )
    .unwrap();
    let (code, csv_text, _) = run(&["run", "--format", "csv", path.to_str().unwrap()]);
    assert_eq!(code, 0);
    let mut reader = csv::Reader::from_reader(csv_text.as_bytes());
    assert_eq!(
        reader.headers().unwrap(),
        vec!["line", "name", "row", "value", "unit", "expression"]
    );
    let records: Vec<Vec<String>> = reader
        .records()
        .map(|record| record.unwrap().iter().map(str::to_string).collect())
        .collect();
    let expected: Vec<Vec<&str>> = vec![
        vec!["1", "k", "", "420", "mD", "420 mD"],
        vec!["2", "T", "1", "10", "degC", "10 degC to 30 degC step 10 K"],
        vec!["2", "T", "2", "20", "degC", ""],
        vec!["2", "T", "3", "30", "degC", ""],
        vec!["3", "d", "1", "1", "m", "{1, 2} m"],
        vec!["3", "d", "2", "2", "m", ""],
        vec!["4", "label", "", "840", "mD", "2 * k"],
        vec!["5", "check", "", "passed", "", "420 mD > 1 mD"],
    ];
    assert_eq!(records, expected);
}
