//! Sheet functions and includes: dimension checks at each call pointing at call and
//! definition, recursion refused, the include sandbox, include cycles.

use crate::util::{fluxsheet, run_sheet};
use std::path::Path;

/// Writes files into a scratch folder and runs `fluxsheet run --format json MAIN [ARGS]`.
fn run_in(files: &[(&str, &str)], main: &str, arguments: &[&str]) -> (i32, serde_json::Value) {
    let directory = tempfile::tempdir().unwrap();
    for (name, text) in files {
        let path = directory.path().join(name);
        std::fs::create_dir_all(path.parent().unwrap()).unwrap();
        std::fs::write(path, text).unwrap();
    }
    let output = fluxsheet()
        .current_dir(directory.path())
        .args(["run", "--format", "json"])
        .args(arguments)
        .arg(Path::new(main))
        .output()
        .unwrap();
    (
        output.status.code().unwrap_or(-1),
        serde_json::from_slice(&output.stdout).unwrap(),
    )
}

fn messages(json: &serde_json::Value) -> Vec<String> {
    json["diagnostics"]
        .as_array()
        .unwrap()
        .iter()
        .map(|d| d["message"].as_str().unwrap().to_string())
        .collect()
}

fn value(json: &serde_json::Value, name: &str) -> f64 {
    json["lines"]
        .as_array()
        .unwrap()
        .iter()
        .find(|line| line["name"] == name)
        .unwrap()["si_value"]
        .as_f64()
        .unwrap()
}

#[test]
fn sheet_functions_evaluate_with_parameters_and_globals() {
    let sheet = "g_here = 9.81 m/s^2\nhead(p [Pa], rho) [m] = p / (rho * g_here)\nh = head(98.1 kPa, 1000 kg/m^3)\n";
    let (code, stdout, _) = run_sheet(sheet, &["--format", "json"]);
    assert_eq!(code, 0);
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    assert!((value(&json, "h") - 10.0).abs() < 1e-12);
    assert_eq!(json["lines"][0]["name"], "g_here");
}

#[test]
fn a_parameter_of_the_wrong_dimension_points_at_call_and_definition() {
    let (code, stdout, stderr) = run_sheet("f(x [m]) = 2 * x\ny = f(3 s)\n", &["--format", "json"]);
    assert_eq!(code, 3, "{stderr}");
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    assert_eq!(
        messages(&json),
        vec!["`f`: parameter `x` must be a length (m), found a time (s)"]
    );
    assert_eq!(
        (
            json["diagnostics"][0]["line"].as_u64(),
            json["diagnostics"][0]["column"].as_u64()
        ),
        (Some(2), Some(7))
    );
    let (_, _, rendered) = run_sheet("f(x [m]) = 2 * x\ny = f(3 s)\n", &[]);
    assert!(rendered.contains("declared here"), "{rendered}");
}

#[test]
fn an_error_inside_a_body_names_the_call() {
    let (code, _, stderr) = run_sheet("f(x) = x + 1 m\ny = f(2 s)\n", &[]);
    assert_eq!(code, 3);
    assert!(
        stderr.contains("cannot add a length (m) to a time (s)"),
        "{stderr}"
    );
    assert!(stderr.contains("in this call of `f`"), "{stderr}");
}

#[test]
fn argument_count_and_result_unit_are_checked() {
    let (code, _, stderr) = run_sheet("f(a, b) = a * b\ny = f(2)\n", &[]);
    assert_eq!(code, 3);
    assert!(stderr.contains("`f` takes 2 argument(s), but 1 were given"));
    let (code, _, stderr) = run_sheet("f(a) [m] = a * 2\ny = f(2 s)\n", &[]);
    assert_eq!(code, 3);
    assert!(
        stderr.contains("`f` should give a length (m), but its body gives a time (s)"),
        "{stderr}"
    );
}

#[test]
fn recursion_is_refused_at_the_definition() {
    let (code, stdout, _) = run_sheet(
        "f(x) = g(x)\ng(x) = f(x) + 1\ny = f(2)\nz = 3 m\n",
        &["--format", "json"],
    );
    assert_eq!(code, 3);
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let all = messages(&json);
    assert_eq!(all.len(), 2, "{all:?}");
    assert!(
        all.iter()
            .all(|message| message.starts_with("recursive function: `f` -> `g` -> `f`")),
        "{all:?}"
    );
    // The call is skipped quietly; unrelated lines still evaluate.
    assert_eq!(value(&json, "z"), 3.0);
}

#[test]
fn includes_bring_names_and_functions() {
    let files = [
        (
            "shared/site.fxs",
            "rho_w = 1000 kg/m^3\nhead(p) [m] = p / (rho_w * g0)\n",
        ),
        (
            "main.fxs",
            "include \"shared/site.fxs\"\nh = head(9.80665 kPa)\nm = rho_w * 2 m^3\n",
        ),
    ];
    let (code, json) = run_in(&files, "main.fxs", &[]);
    assert_eq!(code, 0, "{json}");
    assert!((value(&json, "h") - 1.0).abs() < 1e-12);
    assert_eq!(value(&json, "m"), 2000.0);
    // Only the main sheet's lines are listed.
    assert!(json["lines"]
        .as_array()
        .unwrap()
        .iter()
        .all(|line| line["name"] != "rho_w"));
}

#[test]
fn a_sheet_included_twice_loads_once() {
    let files = [
        ("constants.fxs", "c = 2 m\n"),
        ("a.fxs", "include \"constants.fxs\"\n"),
        (
            "main.fxs",
            "include \"constants.fxs\"\ninclude \"a.fxs\"\nd = c * 2\n",
        ),
    ];
    let (code, json) = run_in(&files, "main.fxs", &[]);
    assert_eq!(code, 0, "{json}");
    assert_eq!(value(&json, "d"), 4.0);
}

#[test]
fn include_cycles_are_errors_that_list_the_chain() {
    let files = [
        ("a.fxs", "include \"b.fxs\"\nx = 1 m\n"),
        ("b.fxs", "include \"a.fxs\"\n"),
    ];
    let (code, json) = run_in(&files, "a.fxs", &[]);
    assert_eq!(code, 3);
    assert_eq!(
        messages(&json),
        vec!["include cycle: `a.fxs` includes `b.fxs` includes `a.fxs`"]
    );
    assert_eq!(json["diagnostics"][0]["file"], "b.fxs");
}

#[test]
fn includes_may_not_leave_the_sheet_folder_unless_allowed() {
    let files = [
        ("outside.fxs", "secret = 1 m\n"),
        (
            "project/main.fxs",
            "include \"../outside.fxs\"\ny = secret * 2\n",
        ),
    ];
    let (code, json) = run_in(&files, "project/main.fxs", &[]);
    assert_eq!(code, 3);
    assert!(
        messages(&json)[0].contains("outside the sheet's folder; pass --allow-outside"),
        "{json}"
    );
    let (code, json) = run_in(&files, "project/main.fxs", &["--allow-outside"]);
    assert_eq!(code, 0, "{json}");
    assert_eq!(value(&json, "y"), 2.0);
}

#[test]
fn absolute_include_paths_are_refused() {
    let (code, json) = run_in(
        &[("main.fxs", "include \"/etc/hostname\"\n")],
        "main.fxs",
        &[],
    );
    assert_eq!(code, 3);
    assert!(messages(&json)[0].contains("is an absolute path"), "{json}");
}

#[test]
fn a_missing_include_is_an_error_at_its_path() {
    let (code, json) = run_in(
        &[("main.fxs", "x = 1 m\ninclude \"nope.fxs\"\n")],
        "main.fxs",
        &[],
    );
    assert_eq!(code, 3);
    assert_eq!(json["diagnostics"][0]["line"], 2);
    assert_eq!(json["diagnostics"][0]["column"], 9);
    assert_eq!(value(&json, "x"), 1.0);
}
