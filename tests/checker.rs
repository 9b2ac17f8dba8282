//! The checker's workflow: check-line semantics, `fluxsheet check` over files and folders,
//! warnings and `--deny-warnings`, `fluxsheet report` (Markdown and HTML, opened in headless
//! Chromium), and `check --against` an earlier run.

use crate::util::{fluxsheet, run, run_sheet, worksheet};
use fluxsheet::eval::{evaluate_sheet, Evaluation, LineResult, Severity};
use fluxsheet::library::Builtins;
use std::path::{Path, PathBuf};
use std::process::Command;
use std::time::{Duration, Instant};

// ----- helpers -----

fn evaluate(sheet: &str) -> Evaluation {
    evaluate_sheet(sheet, Builtins::standard())
}

/// Whether the sheet's single check passed; panics on errors.
fn passes(check: &str) -> bool {
    let evaluation = evaluate(&format!("{check}\n"));
    assert!(
        !evaluation.has_errors(),
        "{check}: {:?}",
        evaluation.diagnostics
    );
    match &evaluation.lines[0].result {
        LineResult::Check(outcome) => outcome.passed,
        other => panic!("{check}: not a check result: {other:?}"),
    }
}

/// The warning codes of a sheet, in source order.
fn warning_codes(sheet: &str) -> Vec<&'static str> {
    let evaluation = evaluate_sheet(sheet, Builtins::standard());
    assert!(
        !evaluation.has_errors(),
        "{sheet}: {:?}",
        evaluation.diagnostics
    );
    evaluation
        .diagnostics
        .iter()
        .filter(|diagnostic| diagnostic.severity == Severity::Warning)
        .map(|diagnostic| diagnostic.code.unwrap_or("?"))
        .collect()
}

fn write(path: &Path, text: &str) {
    if let Some(parent) = path.parent() {
        std::fs::create_dir_all(parent).unwrap();
    }
    std::fs::write(path, text).unwrap();
}

/// Runs the binary in `folder` and returns (exit code, stdout, stderr).
fn run_in(folder: &Path, arguments: &[&str]) -> (i32, String, String) {
    crate::util::outcome(fluxsheet().current_dir(folder).args(arguments))
}

const GOOD: &str = "## A clean sheet\nL = 2 ft\nL_m [m] = L\ncheck L_m < 1 m \"short\"\n";
const FAILING: &str = "h = 3 m\ncheck h < 2 m \"too deep\"\ncheck h > 1 m\n";
const BROKEN: &str = "a = 2 m + 1 s\nb = nothing_here * 2\n";

// ----- 1. check lines without columns: comparisons, tolerances, exit codes -----

#[test]
fn every_comparison_including_its_boundary() {
    assert!(passes("check 1 m < 2 m"));
    assert!(!passes("check 2 m < 2 m"));
    assert!(passes("check 2 m <= 2 m"));
    assert!(!passes("check 2.001 m <= 2 m"));
    assert!(passes("check 3 m > 2 m"));
    assert!(!passes("check 2 m > 2 m"));
    assert!(passes("check 2 m >= 2 m"));
    assert!(!passes("check 1.999 m >= 2 m"));
    assert!(passes("check 100 cm == 1 m"));
    assert!(!passes("check 101 cm == 1 m"));
    assert!(passes("check 101 cm != 1 m"));
    assert!(!passes("check 100 cm != 1 m"));
    // Different units of one dimension compare in SI.
    assert!(passes("check 1 ft < 1 m"));
    assert!(passes("check 0 degC > 31 degF"));
}

#[test]
fn relative_tolerance_is_of_the_right_side() {
    // |2 - 1.9| = 0.1 m; 5 % of the right side is 0.095 m (of the left it would be 0.1 m).
    assert!(!passes("check 2 m == 1.9 m within 5 %"));
    assert!(passes("check 1.91 m == 2 m within 5 %"));
    // For < and <= the tolerance widens the right side upwards; for > and >= downwards.
    assert!(passes("check 1.009 m < 1 m within 1 %"));
    assert!(!passes("check 1.011 m < 1 m within 1 %"));
    assert!(passes("check 0.991 m > 1 m within 1 %"));
    assert!(!passes("check 0.989 m >= 1 m within 1 %"));
    // A tolerance makes `!=` need a difference beyond it.
    assert!(!passes("check 1.005 m != 1 m within 1 %"));
    assert!(passes("check 1.02 m != 1 m within 1 %"));
    // A bare number is a fraction too.
    assert!(passes("check 1.005 m == 1 m within 0.01"));
}

#[test]
fn absolute_tolerance_has_the_sides_unit() {
    assert!(passes("check 0.98 m > 1 m within 3 cm"));
    assert!(!passes("check 0.96 m >= 1 m within 3 cm"));
    assert!(passes("check 1.02 m == 1 m within 0.1 ft"));
    assert!(passes("check 50 kPa <= 7 psi within 2 kPa"));
}

#[test]
fn default_equality_allows_only_rounding() {
    assert!(passes("check 0.1 m + 0.2 m == 0.3 m"));
    assert!(!passes("check 0.1 m + 0.2 m != 0.3 m"));
    assert!(!passes("check 1.000001 m == 1 m"));
}

#[test]
fn check_errors_exit_3_and_failures_exit_1() {
    assert_eq!(run_sheet("check 1 m < 1 s\n", &[]).0, 3);
    assert_eq!(run_sheet("check 1 m == 1 m within -1 %\n", &[]).0, 3);
    // A check that needs a broken line is not evaluated; the error decides the exit code.
    assert_eq!(
        run_sheet("a = 2 m + 1 s\ncheck a < 1 m\ncheck 2 m < 1 m\n", &[]).0,
        3
    );
    let (code, stdout, _) = run_sheet("x = 3 m\ncheck x < 2 m \"x must stay small\"\n", &[]);
    assert_eq!(code, 1);
    assert!(
        stdout.contains("FAILED") && stdout.contains("x must stay small"),
        "{stdout}"
    );
}

// ----- 2. fluxsheet check FILE|DIR… -----

fn folder_of_sheets() -> tempfile::TempDir {
    let folder = tempfile::tempdir().unwrap();
    let root = folder.path();
    write(&root.join("sheets/good.fxs"), GOOD);
    write(&root.join("sheets/failing.fxs"), FAILING);
    write(&root.join("sheets/deeper/broken.fxs"), BROKEN);
    write(&root.join("sheets/notes.txt"), "not a sheet = = =\n");
    folder
}

#[test]
fn check_over_a_folder_prints_problems_and_a_summary() {
    let folder = folder_of_sheets();
    let (code, stdout, stderr) = run_in(folder.path(), &["check", "sheets"]);
    assert_eq!(code, 3, "{stdout}{stderr}");
    let summaries: Vec<&str> = stdout
        .lines()
        .filter(|line| line.starts_with("sheets/") && line.contains(".fxs: "))
        .filter(|line| !line.contains(".fxs:1") && !line.contains(".fxs:2"))
        .collect();
    assert_eq!(
        summaries,
        [
            "sheets/deeper/broken.fxs: error (0 values, 0/0 checks passed, 2 errors)",
            "sheets/failing.fxs: failed (1 value, 1/2 checks passed)",
            "sheets/good.fxs: ok (2 values, 1/1 checks passed)",
        ],
        "{stdout}"
    );
    assert!(
        stdout.contains("sheets/failing.fxs:2: failed check: 3 m < 2 m: too deep"),
        "{stdout}"
    );
    assert!(stdout.contains("cannot add a time (s) to a length (m)"));
    assert!(stdout.contains("sheets/deeper/broken.fxs:1:5"), "{stdout}");
    assert_eq!(
        stdout.lines().last(),
        Some(
            "total: 3 sheets: 1 ok, 1 failed, 1 with errors (2 errors, 0 warnings, 1 failed check)"
        )
    );
    // No values: the good sheet's 0.6096 m is not printed.
    assert!(!stdout.contains("0.6096"), "{stdout}");
    assert!(!stdout.contains("notes.txt"));
}

#[test]
fn check_exit_codes_follow_the_worst_sheet() {
    let folder = folder_of_sheets();
    let root = folder.path();
    assert_eq!(run_in(root, &["check", "sheets/good.fxs"]).0, 0);
    assert_eq!(
        run_in(root, &["check", "sheets/good.fxs", "sheets/failing.fxs"]).0,
        1
    );
    assert_eq!(
        run_in(root, &["check", "sheets/good.fxs", "sheets/deeper"]).0,
        3
    );
    let (code, stdout, _) = run_in(root, &["check", "sheets/good.fxs"]);
    assert_eq!(code, 0);
    assert_eq!(
        stdout,
        "sheets/good.fxs: ok (2 values, 1/1 checks passed)\n\
total: 1 sheet: 1 ok, 0 failed, 0 with errors (0 errors, 0 warnings, 0 failed checks)\n"
    );
    let (code, stdout, _) = run_in(root, &["check", "no/such/folder"]);
    assert_eq!(code, 3);
    assert!(stdout.contains("cannot read `no/such/folder`"), "{stdout}");
}

#[test]
fn check_json_for_machines() {
    let folder = folder_of_sheets();
    let (code, stdout, _) = run_in(folder.path(), &["check", "--format", "json", "sheets"]);
    assert_eq!(code, 3);
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let sheets = json["sheets"].as_array().unwrap();
    let files: Vec<&str> = sheets
        .iter()
        .map(|sheet| sheet["file"].as_str().unwrap())
        .collect();
    assert_eq!(
        files,
        [
            "sheets/deeper/broken.fxs",
            "sheets/failing.fxs",
            "sheets/good.fxs"
        ]
    );
    let statuses: Vec<&str> = sheets
        .iter()
        .map(|sheet| sheet["status"].as_str().unwrap())
        .collect();
    assert_eq!(statuses, ["error", "failed", "ok"]);
    assert_eq!(sheets[1]["failed_checks"][0]["line"], 2);
    assert_eq!(sheets[1]["failed_checks"][0]["message"], "too deep");
    assert_eq!(sheets[1]["failed_checks"][0]["left"]["si_value"], 3.0);
    assert_eq!(sheets[0]["diagnostics"][0]["severity"], "error");
    assert_eq!(sheets[0]["diagnostics"][0]["line"], 1);
    assert!(sheets[2].get("lines").is_none(), "check prints no values");
    assert_eq!(json["total"]["sheets"], 3);
    assert_eq!(json["total"]["ok"], 1);
    assert_eq!(json["total"]["failed"], 1);
    assert_eq!(json["total"]["with_errors"], 1);
    assert_eq!(json["total"]["failed_checks"], 1);
    assert_eq!(json["exit_code"], 3);
}

#[test]
fn check_reads_standard_input_and_has_help() {
    let output = fluxsheet()
        .args(["check", "-"])
        .write_stdin(FAILING)
        .output()
        .unwrap();
    assert_eq!(output.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&output.stdout).contains("<stdin>:2: failed check"));
    for command in ["check", "report"] {
        let (code, stdout, _) = run(&[command, "--help"]);
        assert_eq!(code, 0);
        assert!(stdout.contains("Examples:"), "{command}");
    }
}

#[test]
fn the_demo_sheets_check_clean_with_warnings_denied() {
    let folder = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("worksheets");
    let output = fluxsheet()
        .args(["check", "--deny-warnings", "--format", "json"])
        .arg(&folder)
        .output()
        .unwrap();
    let json: serde_json::Value = serde_json::from_slice(&output.stdout).unwrap();
    assert_eq!(output.status.code(), Some(0), "{json:#}");
    assert!(json["total"]["sheets"].as_u64().unwrap() >= 3);
    assert_eq!(json["total"]["warnings"], 0);
    assert_eq!(json["total"]["ok"], json["total"]["sheets"]);
}

// ----- 3. warnings -----

#[test]
fn unused_line_is_an_input_no_line_uses() {
    assert_eq!(
        warning_codes("## In\na = 2 m\nspare = 3 m\nb = a * 2\n"),
        ["unused-line"]
    );
    // A display unit keeps an input deliberately; the last line of a section is not exempt.
    assert!(warning_codes("a = 2 m\nshown [cm] = 3 m\nb = a * 2\n").is_empty());
    assert_eq!(
        warning_codes("## One\na = 2 m\nb = a * 2\n## Two\nc = 1 s\n"),
        ["unused-line"]
    );
    // Checks and tolerances are uses; a sheet of inputs alone is a list of values.
    assert!(warning_codes("a = 2 m\ntol = 1 cm\ncheck a == 2 m within tol\nz = 1\n").is_empty());
    // The rendered warning names the line and says how to keep it.
    let evaluation = evaluate_sheet("spare = 3 m\nb = 2 * g0\n", Builtins::standard());
    let warning = &evaluation.diagnostics[0];
    assert_eq!(warning.message, "input `spare` is used by no line or check");
    assert!(warning
        .help
        .as_deref()
        .unwrap()
        .contains("`spare [m] = 3 m`"));
}

#[test]
fn a_name_that_shadows_a_builtin() {
    assert_eq!(warning_codes("R = 3 m\nx [m] = R\n"), ["shadowed-builtin"]);
    assert_eq!(
        warning_codes("sqrt = 3 m\nx [m] = sqrt\n"),
        ["shadowed-builtin"]
    );
    assert!(warning_codes("R_well = 3 m\nx [m] = R_well\n").is_empty());
}

#[test]
fn mixed_unit_systems_need_a_display_unit() {
    assert_eq!(warning_codes("x = 2 ft + 1 m\n"), ["mixed-units"]);
    assert_eq!(warning_codes("2 gal/min * 3 h + 1 m^3\n"), ["mixed-units"]);
    assert!(warning_codes("x [m] = 2 ft + 1 m\n").is_empty());
    assert!(warning_codes("2 ft + 1 m [ft]\n").is_empty());
    // One system, or units that belong to none (time, ratios), do not mix.
    assert!(warning_codes("x = 2 ft/d * 3 d + 1 in\n").is_empty());
    assert!(warning_codes("x = 2 m/d * 3 d * 50 %\n").is_empty());
    // The system is the catalog's tag: spellings and units once missing from a private list.
    assert_eq!(warning_codes("x = 3 gpd + 1 m^3/d\n"), ["mixed-units"]);
    assert_eq!(warning_codes("x = 2 ksi + 1 MPa\n"), ["mixed-units"]);
    assert!(warning_codes("x = 2 ft/day * 3 hr + 1 in\n").is_empty());
    assert!(warning_codes("x = 2 cfs * 1 year / 1 acre\n").is_empty());
    let evaluation = evaluate_sheet("x = 2 gal_imp + 1 L\n", Builtins::standard());
    assert!(evaluation.diagnostics[0]
        .message
        .contains("mixes SI/metric and imperial units"));
}

#[test]
fn porosity_outside_zero_to_one() {
    assert_eq!(warning_codes("n_e = 28\n"), ["porosity-range"]);
    assert_eq!(warning_codes("porosity = -0.1\n"), ["porosity-range"]);
    assert_eq!(warning_codes("phi_core = 1.2\n"), ["porosity-range"]);
    assert!(warning_codes("n_e = 28 %\n").is_empty());
    assert!(warning_codes("n = 0.35\n").is_empty());
    // Other names are not porosities.
    assert!(warning_codes("layers = 28\n").is_empty());
    let evaluation = evaluate_sheet("n_e = 28\n", Builtins::standard());
    assert!(evaluation.diagnostics[0]
        .message
        .contains("common practice"));
}

#[test]
fn hydraulic_conductivity_outside_common_range() {
    assert_eq!(warning_codes("K = 2 m/s\n"), ["conductivity-range"]);
    assert_eq!(
        warning_codes("K_clay = 1e-14 m/s\n"),
        ["conductivity-range"]
    );
    assert_eq!(
        warning_codes("k = 1e-6 m^2\nK_x [m/s] = k * 1000 kg/m^3 * g0 / 1 cP\n"),
        ["conductivity-range"]
    );
    assert!(warning_codes("K = 35 ft/d\n").is_empty());
    // A lower-case k is a permeability, and a K that is not a velocity is not a conductivity.
    assert!(warning_codes("k = 2 m/s\n").is_empty());
    assert!(warning_codes("K_ratio = 50\n").is_empty());
}

#[test]
fn hot_water_under_a_stated_pressure_is_not_warned() {
    // Above 100 degC the water functions refuse steam unless the sheet gives a pressure at or
    // above saturation, so a call that returns is liquid water within IAPWS-IF97.
    assert!(warning_codes("T = 150 degC\nrho [kg/m^3] = water_density(T, 10 bar)\n").is_empty());
    assert!(warning_codes("p [kPa] = saturation_pressure(120 degC)\n").is_empty());
    assert!(warning_codes("K [m/s] = hydraulic_conductivity(40 mD, 130 degC, 5 bar)\n").is_empty());
    assert!(warning_codes("rho [kg/m^3] = brine_density(150 degC, 20 MPa, 0)\n").is_empty());
}

#[test]
fn a_sheet_with_errors_reports_errors_only() {
    let evaluation = evaluate_sheet("R = 3 m\nn = 28\nx = 1 m + 1 s\n", Builtins::standard());
    assert!(evaluation.has_errors());
    assert!(evaluation
        .diagnostics
        .iter()
        .all(|diagnostic| diagnostic.severity == Severity::Error));
}

#[test]
fn warnings_show_on_run_and_check_and_deny_makes_them_errors() {
    let sheet = "n_e = 28\nv [m/d] = 1 m/d / n_e\n";
    let (code, stdout, stderr) = run_sheet(sheet, &[]);
    assert_eq!(code, 0);
    assert!(stdout.contains("v"));
    assert!(
        stderr.contains("warning[porosity-range]") && stderr.contains("<stdin>:1:1"),
        "{stderr}"
    );
    let (code, _, stderr) = run_sheet(sheet, &["--deny-warnings"]);
    assert_eq!(code, 3);
    assert!(
        stderr.contains("error[porosity-range]") && stderr.contains("--deny-warnings"),
        "{stderr}"
    );
    let (code, stdout, _) = run_sheet(sheet, &["--format", "json"]);
    assert_eq!(code, 0);
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    assert_eq!(json["diagnostics"][0]["severity"], "warning");
    assert_eq!(json["diagnostics"][0]["code"], "porosity-range");

    let folder = tempfile::tempdir().unwrap();
    write(&folder.path().join("warned.fxs"), sheet);
    let (code, stdout, _) = run_in(folder.path(), &["check", "warned.fxs"]);
    assert_eq!(code, 0);
    assert!(stdout.contains("warning[porosity-range]"), "{stdout}");
    assert!(
        stdout.contains("warned.fxs: ok (2 values, 0/0 checks passed, 1 warning)"),
        "{stdout}"
    );
    let (code, stdout, _) = run_in(folder.path(), &["check", "--deny-warnings", "warned.fxs"]);
    assert_eq!(code, 3);
    assert!(stdout.contains("warned.fxs: error"), "{stdout}");
}

// ----- 4. report -----

const REPORTED: &str = "## Core from borehole B-3 (invented)\n\
# Lab permeability, groundwater temperature from the logger.\n\
k = 40 mD\n\
T = 12 degC\n\
K [m/s] = hydraulic_conductivity(k, T)   # water at T\n\
L = 2 ft\n\
L_m [m] = L\n\
check K < 1e-5 m/s \"fine sand or finer\"\n\
check L_m > 1 m \"long enough\"\n";

fn sources_section(markdown: &str) -> Vec<&str> {
    let start = markdown.find("## Sources").unwrap();
    let end = markdown.find("## Caution").unwrap();
    markdown[start..end]
        .lines()
        .filter(|line| line.starts_with("- "))
        .collect()
}

#[test]
fn markdown_report_has_the_sheet_checks_sources_hash_version_and_caution() {
    use sha2::Digest;
    let folder = tempfile::tempdir().unwrap();
    write(&folder.path().join("core.fxs"), REPORTED);
    let (code, stdout, stderr) = run_in(folder.path(), &["report", "core.fxs", "-o", "core.md"]);
    assert_eq!(code, 1, "one check fails: {stderr}");
    assert_eq!(stdout, "wrote core.md\n");
    let report = std::fs::read_to_string(folder.path().join("core.md")).unwrap();
    assert!(report.contains("### Core from borehole B-3 (invented)"));
    assert!(report.contains("Lab permeability, groundwater temperature from the logger."));
    assert!(
        report.contains("| 7 | L_m | 0.6096 | m | `L` |"),
        "{report}"
    );
    assert!(report.contains("| 3 | k | 40 | mD | `40 mD` |"), "{report}");
    assert!(report.contains("water at T"), "trailing comment");
    assert!(report.contains("fine sand or finer | passed |"), "{report}");
    assert!(report.contains("long enough | **FAILED** |"), "{report}");
    assert!(report.contains("1 of 2 checks FAILED"));
    let hash: String = sha2::Sha256::digest(REPORTED.as_bytes())
        .iter()
        .map(|byte| format!("{byte:02x}"))
        .collect();
    assert!(report.contains(&format!("`{hash}`")));
    assert!(report.contains(&format!("fluxsheet {}", env!("CARGO_PKG_VERSION"))));
    assert!(report.contains(fluxsheet::render::CAUTION));
    // Exactly the formulations used: hydraulic_conductivity(k, T) is IF97 region 1 for the
    // density, IAPWS 2008 for the viscosity and K = k rho g0 / mu, nothing else.
    let sources = sources_section(&report);
    assert_eq!(sources.len(), 3, "{sources:#?}");
    assert!(sources[0].starts_with("- **IAPWS-IF97 region 1 (liquid water)**"));
    assert!(sources[0].contains("273.15 K <= T <= 623.15 K"));
    assert!(sources[1].starts_with("- **IAPWS 2008 viscosity of water"));
    assert!(sources[1].contains("IAPWS R12-08"));
    assert!(sources[2].starts_with("- **hydraulic conductivity from intrinsic permeability"));
    assert!(sources[2].contains("Hubbert"));
}

#[test]
fn a_sheet_without_formulations_says_so() {
    let folder = tempfile::tempdir().unwrap();
    write(&folder.path().join("plain.fxs"), GOOD);
    let (code, _, _) = run_in(folder.path(), &["report", "plain.fxs", "-o", "plain.md"]);
    assert_eq!(code, 0);
    let report = std::fs::read_to_string(folder.path().join("plain.md")).unwrap();
    assert!(sources_section(&report).is_empty());
    assert!(report.contains("No built-in formulation was used"));
}

#[test]
fn report_refuses_to_overwrite_its_sheet() {
    let folder = tempfile::tempdir().unwrap();
    let sheet = folder.path().join("sheet.md");
    write(&sheet, GOOD);
    std::fs::create_dir(folder.path().join("sub")).unwrap();
    for output in ["sheet.md", "./sub/../sheet.md"] {
        let (code, _, stderr) = run_in(folder.path(), &["report", "sheet.md", "-o", output]);
        assert_eq!(code, 2, "{output}");
        assert!(stderr.contains("an input of this run"), "{stderr}");
    }
    #[cfg(unix)]
    {
        std::os::unix::fs::symlink(&sheet, folder.path().join("link.md")).unwrap();
        let (code, _, _) = run_in(folder.path(), &["report", "sheet.md", "-o", "link.md"]);
        assert_eq!(code, 2);
    }
    assert_eq!(std::fs::read_to_string(&sheet).unwrap(), GOOD);
}

#[test]
fn report_is_written_whole_with_no_temporary_left() {
    let folder = tempfile::tempdir().unwrap();
    let root = folder.path();
    write(&root.join("a.fxs"), GOOD);
    write(&root.join("out.html"), "an older report");
    let (code, _, _) = run_in(root, &["report", "a.fxs", "-o", "out.html"]);
    assert_eq!(code, 0);
    let html = std::fs::read_to_string(root.join("out.html")).unwrap();
    assert!(html.starts_with("<!DOCTYPE html>") && html.trim_end().ends_with("</html>"));
    let mut names: Vec<String> = std::fs::read_dir(root)
        .unwrap()
        .map(|entry| entry.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    names.sort();
    assert_eq!(names, ["a.fxs", "out.html"]);
    // A folder that does not exist: an error, and nothing written.
    let (code, _, stderr) = run_in(root, &["report", "a.fxs", "-o", "missing/out.md"]);
    assert_eq!(code, 3);
    assert!(stderr.contains("cannot write"), "{stderr}");
    // A format that cannot be told from the name is a usage error.
    assert_eq!(run_in(root, &["report", "a.fxs", "-o", "out.pdf"]).0, 2);
    assert!(!root.join("out.pdf").exists());
}

/// The HTML report is self-contained and a browser shows the table and the values. Without
/// Chromium the test is skipped on a workstation and fails in CI.
#[test]
fn html_report_renders_in_headless_chromium() {
    let folder = tempfile::tempdir().unwrap();
    let root = folder.path();
    // The reported sheet plus a sweep and its chart, which the browser must draw too.
    let sheet = format!(
        "{REPORTED}T_sweep = 0 degC to 20 degC step 5 K\nK_sweep [m/s] = hydraulic_conductivity(k, T_sweep)\nplot K_sweep against T_sweep\n"
    );
    write(&root.join("core.fxs"), &sheet);
    let (code, _, stderr) = run_in(root, &["report", "core.fxs", "-o", "core.html"]);
    assert_eq!(code, 1, "{stderr}");
    let path = root.join("core.html");
    let html = std::fs::read_to_string(&path).unwrap();
    for outside in ["http://", "https://", "<link", "<script", "src="] {
        assert!(!html.contains(outside), "not self-contained: {outside}");
    }
    let Some(chromium) = chromium() else {
        assert!(
            std::env::var_os("CI").is_none(),
            "Chromium is required in CI (.ci/run installs it)"
        );
        eprintln!("skipped: no chromium on this machine");
        return;
    };
    let profile = tempfile::tempdir().unwrap();
    let mut child = Command::new(chromium)
        .args([
            "--headless",
            "--no-sandbox",
            "--disable-gpu",
            "--disable-background-networking",
            "--disable-component-update",
            "--disable-sync",
            "--no-first-run",
        ])
        .arg(format!("--user-data-dir={}", profile.path().display()))
        .arg("--dump-dom")
        .arg(format!("file://{}", path.display()))
        .stdout(std::process::Stdio::piped())
        .stderr(std::process::Stdio::null())
        .spawn()
        .unwrap();
    let started = Instant::now();
    while child.try_wait().unwrap().is_none() {
        if started.elapsed() > Duration::from_secs(120) {
            let _ = child.kill();
            panic!("chromium did not finish");
        }
        std::thread::sleep(Duration::from_millis(50));
    }
    let output = child.wait_with_output().unwrap();
    let dom = String::from_utf8_lossy(&output.stdout);
    assert!(dom.contains("<table class=\"lines"), "{dom}");
    assert!(dom.contains("<td class=\"value\">0.6096</td>"), "{dom}");
    assert!(dom.contains("<td>L_m</td>"));
    assert!(dom.contains("<span class=\"failed\">FAILED</span>"));
    assert!(dom.contains("data-formulation=\"iapws-if97-region1\""));
    assert!(dom.contains("data-formulation=\"iapws-2008-viscosity\""));
    // `hydraulic_conductivity` also cites the relation between k and K it evaluates.
    assert!(dom.contains("data-formulation=\"conductivity-permeability\""));
    assert_eq!(dom.matches("data-formulation=").count(), 3);
    assert!(dom.contains("<h2>Caution</h2>"));
    // The chart is inline SVG in the page, with its curve, and the sweep's column table.
    assert!(dom.contains("<figure class=\"chart\"><svg"), "{dom}");
    assert!(dom.contains("<polyline"), "{dom}");
    assert!(dom.contains("<th>K_sweep [m/s]</th>"), "{dom}");
}

/// `chromium` on the `PATH`, where the Debian package puts it.
fn chromium() -> Option<PathBuf> {
    crate::util::program("chromium")
}

// ----- 5. check --against an earlier run -----

#[test]
fn against_an_unchanged_sheet_reports_nothing_and_a_changed_value_is_listed() {
    let folder = tempfile::tempdir().unwrap();
    let root = folder.path();
    std::fs::copy(worksheet("core_permeability.fxs"), root.join("core.fxs")).unwrap();
    let (code, earlier, _) = run_in(root, &["run", "--format", "json", "core.fxs"]);
    assert_eq!(code, 0);
    write(&root.join("earlier.json"), &earlier);

    let (code, stdout, _) = run_in(root, &["check", "core.fxs", "--against", "earlier.json"]);
    assert_eq!(code, 0, "{stdout}");
    assert_eq!(
        stdout,
        "core.fxs: ok (14 values, 3/3 checks passed)\n\
total: 1 sheet: 1 ok, 0 failed, 0 with errors (0 errors, 0 warnings, 0 failed checks, 0 values moved)\n"
    );

    // Edit the copy: core B's permeability moves, and with it K_lab_B and K_B.
    let sheet = std::fs::read_to_string(root.join("core.fxs")).unwrap();
    write(
        &root.join("core.fxs"),
        &sheet.replace("k_core_B = 95 mD", "k_core_B = 96 mD"),
    );
    let (code, stdout, _) = run_in(root, &["check", "core.fxs", "--against", "earlier.json"]);
    assert_eq!(code, 1, "{stdout}");
    let moved: Vec<&str> = stdout
        .lines()
        .filter(|line| line.contains("moved:"))
        .collect();
    assert_eq!(moved.len(), 3, "{stdout}");
    let si_of = |json: &str| -> f64 {
        let json: serde_json::Value = serde_json::from_str(json).unwrap();
        json["lines"]
            .as_array()
            .unwrap()
            .iter()
            .find(|line| line["name"] == "k_core_B")
            .unwrap()["si_value"]
            .as_f64()
            .unwrap()
    };
    let old_si = si_of(&earlier);
    let new_si = si_of(&run_in(root, &["run", "--format", "json", "core.fxs"]).1);
    assert_eq!(new_si / old_si, 96.0 / 95.0);
    // Shown in the line's display unit, with the signed change.
    assert_eq!(
        moved[0],
        "core.fxs:4: `k_core_B` moved: 95 mD -> 96 mD (+1.053 %; relative change 1.042e-2 > 1e-9)"
    );
    assert!(moved[1].contains("`K_lab_B`") && moved[2].contains("`K_B`"));

    // JSON carries old and new SI values.
    let (code, stdout, _) = run_in(
        root,
        &[
            "check",
            "--format",
            "json",
            "core.fxs",
            "--against",
            "earlier.json",
        ],
    );
    assert_eq!(code, 1);
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let first = &json["sheets"][0]["moved"][0];
    assert_eq!(first["name"], "k_core_B");
    assert_eq!(first["old_si_value"].as_f64(), Some(old_si));
    assert_eq!(first["new_si_value"].as_f64(), Some(new_si));
    assert_eq!(json["total"]["moved"], 3);

    // A tolerance wider than the change accepts the values; the edited sheet is still a
    // changed input.
    let (code, stdout, _) = run_in(
        root,
        &[
            "check",
            "core.fxs",
            "--against",
            "earlier.json",
            "--tolerance",
            "0.02",
        ],
    );
    assert_eq!(code, 1);
    assert!(!stdout.contains("moved:"), "{stdout}");
    assert!(stdout.contains("input `core.fxs` changed"), "{stdout}");
}

#[test]
fn against_pairs_sheets_of_an_array_and_notices_removed_lines() {
    let folder = tempfile::tempdir().unwrap();
    let root = folder.path();
    write(&root.join("a.fxs"), GOOD);
    write(&root.join("b.fxs"), "x [m] = 3 ft\n");
    let (_, earlier, _) = run_in(root, &["run", "--format", "json", "a.fxs", "b.fxs"]);
    write(&root.join("earlier.json"), &earlier);
    let (code, stdout, _) = run_in(
        root,
        &["check", "a.fxs", "b.fxs", "--against", "earlier.json"],
    );
    assert_eq!(code, 0, "{stdout}");
    write(&root.join("b.fxs"), "y [m] = 3 ft\n");
    let (code, stdout, _) = run_in(
        root,
        &["check", "a.fxs", "b.fxs", "--against", "earlier.json"],
    );
    assert_eq!(code, 1);
    assert!(
        stdout.contains("b.fxs:1: `x` is no longer computed (was 0.9144 m)"),
        "{stdout}"
    );
    // A sheet the earlier run did not have cannot be confirmed.
    write(&root.join("c.fxs"), "z [m] = 1 ft\n");
    let (code, stdout, _) = run_in(
        root,
        &["check", "a.fxs", "c.fxs", "--against", "earlier.json"],
    );
    assert_eq!(code, 1);
    assert!(stdout.contains("c.fxs: no earlier results"), "{stdout}");
}

#[test]
fn against_needs_readable_earlier_results() {
    let folder = tempfile::tempdir().unwrap();
    let root = folder.path();
    write(&root.join("a.fxs"), GOOD);
    write(&root.join("bad.json"), "{ not json");
    write(&root.join("other.json"), "{\"something\": 1}");
    let (code, _, stderr) = run_in(root, &["check", "a.fxs", "--against", "bad.json"]);
    assert_eq!(code, 3);
    assert!(stderr.contains("not JSON"), "{stderr}");
    let (code, _, stderr) = run_in(root, &["check", "a.fxs", "--against", "other.json"]);
    assert_eq!(code, 3);
    assert!(stderr.contains("fluxsheet run --format json"), "{stderr}");
    assert_eq!(run_in(root, &["check", "a.fxs", "--tolerance", "0.1"]).0, 2);
    assert_eq!(
        run_in(
            root,
            &[
                "check",
                "a.fxs",
                "--against",
                "bad.json",
                "--tolerance",
                "-1"
            ]
        )
        .0,
        2
    );
}

mod generated {
    use fluxsheet::eval::evaluate_sheet;
    use fluxsheet::library::Builtins;
    use proptest::prelude::*;

    proptest! {
        #![proptest_config(ProptestConfig { cases: 500, ..ProptestConfig::default() })]

        /// The warning pass never panics, whatever the sheet.
        #[test]
        fn warnings_never_panic(tokens in proptest::collection::vec(prop_oneof![
            Just("n"), Just("K"), Just("R"), Just(" = "), Just("+"), Just("*"), Just("/"),
            Just("2"), Just("0"), Just(" m/s"), Just(" ft"), Just(" m"), Just(" degC"),
            Just("water_density("), Just(")"), Just("\n"), Just("## h\n"), Just("[m]"),
            Just("check "), Just(" < "),
        ], 0..30)) {
            let text: String = tokens.concat();
            let evaluation = evaluate_sheet(&text, Builtins::standard());
            prop_assert!(evaluation.lines.len() <= text.split('\n').count());
        }
    }
}
