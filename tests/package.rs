//! The checker's package: the working of every computed line, the SHA-256 of every input, the
//! title block and sign-off, `--against` across edited inputs and moved folders, and the
//! project folder that widens the include sandbox.

use crate::util::outcome;
use std::path::Path;
use std::process::Command;

fn write(path: &Path, text: &str) {
    if let Some(parent) = path.parent() {
        std::fs::create_dir_all(parent).unwrap();
    }
    std::fs::write(path, text).unwrap();
}

fn run_in(folder: &Path, arguments: &[&str]) -> (i32, String, String) {
    outcome(crate::util::fluxsheet().current_dir(folder).args(arguments))
}

const SITE: &str = "## Site constants (invented)\nlambda_rock = 2.5 W/(m*K)\n";
const CORES: &str = "k [mD]\n420\n380\n510\n640\n";
const SHEET: &str = "@project: Example Basin heat study (invented)\n\
@job: J-0000\n\
@title: Conductive heat flux\n\
@author: A. Engineer\n\
@checker: B. Checker\n\
@date: 2000-01-01\n\
@revision: A\n\
include \"shared/site.fxs\"\n\
k = column k from \"data/cores.csv\"\n\
grad = 30 K/km\n\
q [mW/m^2] = lambda_rock * grad\n\
f = fourier_flux(lambda_rock, grad)\n\
k_mean [mD] = mean(k)\n";

/// A project folder: `sheets/heat.fxs` with an include and a data file.
fn project() -> tempfile::TempDir {
    let folder = tempfile::tempdir().unwrap();
    write(&folder.path().join("sheets/heat.fxs"), SHEET);
    write(&folder.path().join("sheets/shared/site.fxs"), SITE);
    write(&folder.path().join("sheets/data/cores.csv"), CORES);
    folder
}

/// SHA-256 by the system's `sha256sum`, independent of the tool's own hashing.
fn independent_sha256(path: &Path) -> String {
    let output = Command::new("sha256sum").arg(path).output().unwrap();
    String::from_utf8(output.stdout).unwrap()[..64].to_string()
}

#[test]
fn the_markdown_report_shows_title_block_working_and_inputs() {
    let folder = project();
    let (code, _, stderr) = run_in(folder.path(), &["report", "sheets/heat.fxs", "-o", "r.md"]);
    assert_eq!(code, 0, "{stderr}");
    let report = std::fs::read_to_string(folder.path().join("r.md")).unwrap();
    let version = env!("CARGO_PKG_VERSION");
    insta::assert_snapshot!(report.replace(version, "VERSION"));
}

#[test]
fn every_input_is_hashed_in_json_check_json_and_the_report() {
    let folder = project();
    let sheets = folder.path().join("sheets");
    let expected = [
        ("heat.fxs", independent_sha256(&sheets.join("heat.fxs"))),
        (
            "data/cores.csv",
            independent_sha256(&sheets.join("data/cores.csv")),
        ),
        (
            "shared/site.fxs",
            independent_sha256(&sheets.join("shared/site.fxs")),
        ),
    ];
    let (code, stdout, stderr) = run_in(
        folder.path(),
        &["run", "--format", "json", "sheets/heat.fxs"],
    );
    assert_eq!(code, 0, "{stderr}");
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let (_, check_out, _) = run_in(
        folder.path(),
        &["check", "--format", "json", "sheets/heat.fxs"],
    );
    let check: serde_json::Value = serde_json::from_str(&check_out).unwrap();
    for inputs in [&json["inputs"], &check["sheets"][0]["inputs"]] {
        let listed: Vec<(String, String)> = inputs
            .as_array()
            .unwrap()
            .iter()
            .map(|input| {
                (
                    input["path"].as_str().unwrap().to_string(),
                    input["sha256"].as_str().unwrap().to_string(),
                )
            })
            .collect();
        assert_eq!(listed.len(), 3, "{listed:?}");
        for (path, sha256) in &expected {
            assert!(
                listed.contains(&(path.to_string(), sha256.clone())),
                "{path} {sha256} not in {listed:?}"
            );
        }
    }
    run_in(
        folder.path(),
        &["report", "sheets/heat.fxs", "-o", "r.html"],
    );
    let html = std::fs::read_to_string(folder.path().join("r.html")).unwrap();
    for (_, sha256) in &expected {
        assert!(
            html.contains(sha256.as_str()),
            "{sha256} not in the HTML report"
        );
    }
}

#[test]
fn run_working_substitutes_values_and_cites_the_relation() {
    let folder = project();
    let (code, stdout, stderr) = run_in(folder.path(), &["run", "--working", "sheets/heat.fxs"]);
    assert_eq!(code, 0, "{stderr}");
    assert!(stdout.contains("q = lambda_rock * grad"), "{stdout}");
    assert!(stdout.contains("= (2.5 W/(m*K)) * (30 K/km)"), "{stdout}");
    assert!(stdout.contains("= 75 mW/m^2"), "{stdout}");
    // The relation's declared formula, the same with the call's values in SI and its result
    // (2.5 W/(m*K) x 0.03 K/m = 0.075 W/m^2, by hand), and its source.
    assert!(stdout.contains("q = -lambda * dT_dx"), "{stdout}");
    assert!(
        stdout.contains("q = -(2.5 W/(m*K)) * (0.03 K/m) = -0.075 W/m^2"),
        "{stdout}"
    );
    assert!(stdout.contains("Fourier, J., 1822"), "{stdout}");
    // A column shows its first rows and statistics.
    assert!(
        stdout.contains("mean({420, 380, 510, … 4 rows} mD)"),
        "{stdout}"
    );
}

/// The working is written from the syntax tree: parentheses where precedence needs them, a
/// `--set` value in place of the sheet's, a default argument named, a column call's first row.
#[test]
fn run_working_is_built_from_the_syntax_tree() {
    let folder = tempfile::tempdir().unwrap();
    write(
        &folder.path().join("w.fxs"),
        "a = 5 m\nb = 2 m\nc = 3\n\
h [m] = -(a - b)^2 / (c * b)\n\
T = {10, 20} degC\n\
K [m/s] = hydraulic_conductivity(100 mD, T)\n",
    );
    let (code, stdout, stderr) = run_in(
        folder.path(),
        &["run", "--working", "w.fxs", "--set", "a=6 m"],
    );
    assert_eq!(code, 0, "{stderr}");
    assert!(stdout.contains("h = -(a - b)^2 / (c * b)"), "{stdout}");
    // (6 - 2)^2 / (3 x 2) = 16 / 6 = 2.667 m, by hand.
    assert!(
        stdout.contains("= -((6 m) - (2 m))^2 / (3 * (2 m))"),
        "{stdout}"
    );
    assert!(stdout.contains("= -2.667 m"), "{stdout}");
    assert!(
        stdout.contains("= hydraulic_conductivity(100 mD, {10, 20} degC)"),
        "{stdout}"
    );
    assert!(
        stdout.contains("p = 101300 Pa (left out)) (row 1 of 2)"),
        "{stdout}"
    );
    assert!(stdout.contains("rho_w(283.2 K, 101300 Pa)"), "{stdout}");
}

#[test]
fn require_signoff_fails_a_sheet_without_a_checker() {
    let folder = tempfile::tempdir().unwrap();
    write(&folder.path().join("blank.fxs"), "@checker:\nL = 2 m\n");
    write(&folder.path().join("none.fxs"), "L = 2 m\n");
    write(
        &folder.path().join("signed.fxs"),
        "@checker: B. Checker\nL = 2 m\n",
    );
    for (sheet, expected) in [("blank.fxs", 1), ("none.fxs", 1), ("signed.fxs", 0)] {
        let (code, stdout, _) = run_in(folder.path(), &["check", "--require-signoff", sheet]);
        assert_eq!(code, expected, "{sheet}: {stdout}");
        assert_eq!(stdout.contains("not signed off"), expected == 1, "{stdout}");
    }
    // Without the option a sheet with no checker is fine.
    assert_eq!(run_in(folder.path(), &["check", "none.fxs"]).0, 0);
}

#[test]
fn against_detects_an_edited_include_when_no_value_moved() {
    let folder = project();
    let (_, earlier, _) = run_in(
        folder.path(),
        &["run", "--format", "json", "sheets/heat.fxs"],
    );
    write(&folder.path().join("earlier.json"), &earlier);
    write(
        &folder.path().join("sheets/shared/site.fxs"),
        &format!("{SITE}# reviewed\n"),
    );
    let (code, stdout, _) = run_in(
        folder.path(),
        &["check", "sheets/heat.fxs", "--against", "earlier.json"],
    );
    assert_eq!(code, 1, "{stdout}");
    assert!(
        stdout.contains("input `shared/site.fxs` changed (its SHA-256 differs)"),
        "{stdout}"
    );
    assert!(!stdout.contains("moved:"), "{stdout}");
    let (_, json, _) = run_in(
        folder.path(),
        &[
            "check",
            "--format",
            "json",
            "sheets/heat.fxs",
            "--against",
            "earlier.json",
        ],
    );
    let json: serde_json::Value = serde_json::from_str(&json).unwrap();
    assert_eq!(
        json["sheets"][0]["input_changes"],
        serde_json::json!([{ "path": "shared/site.fxs", "change": "changed" }])
    );
}

#[test]
fn against_pairs_moved_folders_and_shows_display_units() {
    let folder = project();
    let (_, earlier, _) = run_in(
        folder.path(),
        &["run", "--format", "json", "sheets/heat.fxs"],
    );
    write(&folder.path().join("earlier.json"), &earlier);
    // The project moves to `sheets_v2`; one input changes, one line goes, one comes.
    let moved = folder.path().join("sheets_v2");
    write(
        &moved.join("heat.fxs"),
        &SHEET
            .replace("30 K/km", "31 K/km")
            .replace("k_mean [mD] = mean(k)\n", "z = 2 m\n"),
    );
    write(&moved.join("shared/site.fxs"), SITE);
    write(&moved.join("data/cores.csv"), CORES);
    // A second sheet in the earlier run makes pairing by position impossible.
    let (code, stdout, _) = run_in(
        folder.path(),
        &[
            "check",
            "sheets_v2/heat.fxs",
            "sheets_v2/shared/site.fxs",
            "--against",
            "earlier.json",
        ],
    );
    assert_eq!(code, 1, "{stdout}");
    assert!(
        stdout.contains("`q` moved: 75 mW/m^2 -> 77.5 mW/m^2 (+3.333 %"),
        "{stdout}"
    );
    assert!(stdout.contains("`z` is new"), "{stdout}");
    assert!(
        stdout.contains("`k_mean` is no longer computed (was 487.5 mD)"),
        "{stdout}"
    );
    assert!(stdout.contains("input `heat.fxs` changed"), "{stdout}");
    for row in [
        "moved                3",
        "added                1",
        "removed              1",
        "inputs changed       1",
    ] {
        assert!(stdout.contains(row), "{row}: {stdout}");
    }
    // A folder given: paths relative to it pair with the earlier paths' ends.
    let (_, stdout, _) = run_in(
        folder.path(),
        &["check", "sheets_v2", "--against", "earlier.json"],
    );
    assert!(
        stdout.contains("sheets_v2/heat.fxs:11: `q` moved"),
        "{stdout}"
    );
}

#[test]
fn against_pairs_by_title_when_the_path_changed() {
    let folder = project();
    let (_, earlier, _) = run_in(
        folder.path(),
        &["run", "--format", "json", "sheets/heat.fxs"],
    );
    write(
        &folder.path().join("earlier.json"),
        &format!("[{earlier}, {earlier}]").replacen("Conductive heat flux", "Another title", 1),
    );
    write(&folder.path().join("renamed/flux.fxs"), SHEET);
    write(&folder.path().join("renamed/shared/site.fxs"), SITE);
    write(&folder.path().join("renamed/data/cores.csv"), CORES);
    write(&folder.path().join("renamed/other.fxs"), "L = 1 m\n");
    let (_, stdout, _) = run_in(
        folder.path(),
        &[
            "check",
            "renamed/flux.fxs",
            "renamed/other.fxs",
            "--against",
            "earlier.json",
        ],
    );
    assert!(stdout.contains("renamed/flux.fxs: ok"), "{stdout}");
    assert!(
        stdout.contains("renamed/other.fxs: no earlier results"),
        "{stdout}"
    );
}

#[test]
fn a_project_marker_widens_the_sandbox_and_nothing_more() {
    let outer = tempfile::tempdir().unwrap();
    let root = outer.path().join("project");
    write(&outer.path().join("secret.fxs"), "s = 1 m\n");
    write(&root.join("shared/site.fxs"), "g_site = 9.81 m/s^2\n");
    write(
        &root.join("sheets/a.fxs"),
        "include \"../shared/site.fxs\"\nx = g_site * 1 s\n",
    );
    write(
        &root.join("sheets/escape.fxs"),
        "include \"../../secret.fxs\"\ny = s\n",
    );
    std::os::unix::fs::symlink(
        outer.path().join("secret.fxs"),
        root.join("shared/link.fxs"),
    )
    .unwrap();
    write(
        &root.join("sheets/link.fxs"),
        "include \"../shared/link.fxs\"\ny = s\n",
    );
    // Without the marker `..` is refused.
    let (code, _, stderr) = run_in(&root, &["run", "sheets/a.fxs"]);
    assert_eq!(code, 3, "{stderr}");
    assert!(stderr.contains("outside the sheet's folder"), "{stderr}");
    write(&root.join("fluxsheet.project"), "");
    let (code, stdout, stderr) = run_in(&root, &["run", "sheets/a.fxs"]);
    assert_eq!(code, 0, "{stderr}");
    assert!(stdout.contains("9.81"), "{stdout}");
    for escape in ["sheets/escape.fxs", "sheets/link.fxs"] {
        let (code, _, stderr) = run_in(&root, &["run", escape]);
        assert_eq!(code, 3, "{escape}: {stderr}");
        assert!(
            stderr.contains("outside the sheet's folder"),
            "{escape}: {stderr}"
        );
    }
}
