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
        stdout.contains(
            "    q = -lambda * dT_dx\n      = -(2.5 W/(m*K)) * (0.03 K/m)\n      = -0.075 W/m^2\n"
        ),
        "{stdout}"
    );
    // Cited by its title (the footer names its id; `functions ID` and reports give the source).
    assert!(
        stdout.contains("    after Fourier's law, q = -lambda dT/dx\n"),
        "{stdout}"
    );
    assert!(stdout.contains("fourier-1822"), "{stdout}");
    // A column shows its first rows and statistics.
    assert!(
        stdout.contains("mean({420, 380, 510, … 4 rows} mD)"),
        "{stdout}"
    );
}

/// The working is written from the syntax tree: parentheses where precedence needs them, a
/// `--set` value in place of the sheet's, a default argument named, a column call's first row,
/// a sheet function's body with the call's arguments in it.
#[test]
fn run_working_is_built_from_the_syntax_tree() {
    let folder = tempfile::tempdir().unwrap();
    write(
        &folder.path().join("w.fxs"),
        "a = 5 m\nb = 2 m\nc = 3\n\
h [m] = -(a - b)^2 / (c * b)\n\
leak(K [m/s], head, t [m]) [m/d] = K * (head + t) / t\n\
q = leak(1e-9 m/s, a, b)\n\
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
        stdout.contains("p = 101325 Pa (left out)) (row 1 of 2)"),
        "{stdout}"
    );
    assert!(stdout.contains("rho_w(283.2 K, 101325 Pa)"), "{stdout}");
    assert!(
        stdout.contains("    leak(K, head, t) = K * (head + t) / t\n                     = (1e-9 m/s) * ((6 m) + (2 m)) / (2 m)\n"),
        "{stdout}"
    );
    // The working fits a 100-column terminal.
    let working = &stdout[stdout.find("\nWorking\n").expect("a working")..];
    for line in working.lines() {
        assert!(
            line.chars().count() <= 100,
            "{} columns: {line}",
            line.chars().count()
        );
    }
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

// ----- The report on paper -----

/// A sheet long enough for several pages: a title block, an include, a data file of 60
/// readings (a column table that spans pages), a chart and checks.
fn printed_project() -> tempfile::TempDir {
    let folder = tempfile::tempdir().unwrap();
    let mut readings = String::from("z [m],T [degC]\n");
    for row in 0..60 {
        readings.push_str(&format!(
            "{},{:.2}\n",
            row * 2,
            9.0 + 0.061 * f64::from(row * 2)
        ));
    }
    write(&folder.path().join("data/profile.csv"), &readings);
    write(&folder.path().join("shared/site.fxs"), SITE);
    write(
        &folder.path().join("basin.fxs"),
        "@project: Quarry Lane infiltration basin (invented)\n\
@job: QL-0207\n\
@checker: B. Checker\n\
include \"shared/site.fxs\"\n\
## Temperature log of borehole QL-4 (invented)\n\
z = column z from \"data/profile.csv\"\n\
T = column T from \"data/profile.csv\"\n\
grad [K/km] = (max(T) - min(T)) / (max(z) - min(z))\n\
q [mW/m^2] = lambda_rock * grad\n\
f = fourier_flux(lambda_rock, grad)\n\
check q <= 200 mW/m^2 \"within continental heat flow\"\n\
plot T against z down \"Temperature log of QL-4\"\n\
## Conductivity against temperature\n\
T_sweep = 0 degC to 40 degC step 5 K\n\
K_sweep [m/s] = hydraulic_conductivity(250 mD, T_sweep)\n\
plot K_sweep against T_sweep log y \"K of the basin floor against temperature\"\n",
    );
    folder
}

/// The PDF's pages as text, in layout order (`pdftotext -layout`: a form feed ends each page).
fn pdf_pages(pdftotext: &Path, pdf: &Path) -> Vec<String> {
    let output = Command::new(pdftotext)
        .args(["-layout", pdf.to_str().unwrap(), "-"])
        .output()
        .unwrap();
    assert!(output.status.success(), "pdftotext failed");
    let text = String::from_utf8(output.stdout).unwrap();
    let mut pages: Vec<String> = text.split('\u{c}').map(str::to_string).collect();
    if pages.last().is_some_and(|last| last.trim().is_empty()) {
        pages.pop();
    }
    pages
}

/// Chromium prints `html` to `pdf`, with `options` besides the headless ones.
fn print_to_pdf(chromium: &Path, html: &Path, pdf: &Path, options: &[&str]) {
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
        .args(options)
        .arg(format!("--user-data-dir={}", profile.path().display()))
        .arg(format!("--print-to-pdf={}", pdf.display()))
        .arg(format!("file://{}", html.display()))
        .stdout(std::process::Stdio::null())
        .stderr(std::process::Stdio::null())
        .spawn()
        .unwrap();
    let started = std::time::Instant::now();
    while child.try_wait().unwrap().is_none() {
        if started.elapsed() > std::time::Duration::from_secs(120) {
            let _ = child.kill();
            panic!("chromium did not finish printing");
        }
        std::thread::sleep(std::time::Duration::from_millis(50));
    }
    assert!(pdf.exists(), "no PDF written");
}

/// The HTML report printed by headless Chromium on A4 and on Letter (the paper chosen as a
/// print dialog would, by a `size` rule added to a copy): every page carries the project and
/// the report in its header and "page N of M" in its footer, whether Chromium's own header
/// and footer are switched off (A4) or left on (Letter: the report's replace them); a column
/// table spanning pages repeats its header row; a short table and each chart lie whole on one
/// page; no page ends on a heading. The test is skipped on a workstation without Chromium or
/// pdftotext and fails in CI.
#[test]
fn the_html_report_prints_on_a4_and_letter() {
    let (Some(chromium), Some(pdftotext)) = (
        crate::util::program("chromium"),
        crate::util::program("pdftotext"),
    ) else {
        assert!(
            std::env::var_os("CI").is_none(),
            "Chromium and pdftotext are required in CI (.ci/run installs them)"
        );
        eprintln!("skipped: chromium or pdftotext (poppler-utils) missing on this machine");
        return;
    };
    let folder = printed_project();
    let (code, _, stderr) = run_in(folder.path(), &["report", "basin.fxs", "-o", "basin.html"]);
    assert_eq!(code, 0, "{stderr}");
    let html = std::fs::read_to_string(folder.path().join("basin.html")).unwrap();
    let browser_header_footer_off: &[&str] = &["--no-pdf-header-footer"];
    for (paper, width_mm, options) in [
        ("A4", 210.0, browser_header_footer_off),
        ("letter", 215.9, &[][..]),
    ] {
        let copy = folder.path().join(format!("basin-{paper}.html"));
        let pdf = folder.path().join(format!("basin-{paper}.pdf"));
        write(
            &copy,
            &html.replace(
                "</head>",
                &format!("<style>@page {{ size: {paper}; }}</style></head>"),
            ),
        );
        print_to_pdf(&chromium, &copy, &pdf, options);
        let pages = pdf_pages(&pdftotext, &pdf);
        // Nothing of the browser's own header and footer (the address, the page's title).
        assert!(
            pages.iter().all(|page| !page.contains("file:")),
            "{paper}: the browser's footer is printed"
        );
        let count = pages.len();
        assert!((3..=12).contains(&count), "{paper}: {count} pages");
        for (index, page) in pages.iter().enumerate() {
            let lines: Vec<&str> = page
                .lines()
                .filter(|line| !line.trim().is_empty())
                .collect();
            let (first, last) = (lines[0], lines[lines.len() - 1]);
            assert!(
                first.contains("Quarry Lane infiltration basin (invented)")
                    && first.contains("Calculation report: basin.fxs"),
                "{paper} page {}: header `{first}`",
                index + 1
            );
            assert!(
                last.contains(&format!("page {} of {count}", index + 1))
                    && last.contains("fluxsheet"),
                "{paper} page {}: footer `{last}`",
                index + 1
            );
            // The line above the footer is never a section's heading.
            let above_footer = lines[lines.len() - 2].trim();
            for heading in [
                "Calculation",
                "Working",
                "Checks",
                "Inputs",
                "Sources",
                "Caution",
            ] {
                assert_ne!(above_footer, heading, "{paper} page {}", index + 1);
            }
        }
        // The 60 readings span pages, and every page with a row of them shows the header
        // row. A reading's line is `row z T` with z = 2 (row - 1) m and T of 9 to 17 degC.
        let is_reading = |line: &str| {
            let cells: Vec<&str> = line.split_whitespace().collect();
            match cells.as_slice() {
                [row, z, temperature] => {
                    row.parse::<u32>().is_ok_and(|row| {
                        (1..=60).contains(&row) && z.parse::<u32>() == Ok(2 * (row - 1))
                    }) && temperature
                        .parse::<f64>()
                        .is_ok_and(|value| (9.0..17.0).contains(&value))
                }
                _ => false,
            }
        };
        let is_header = |line: &str| {
            line.split_whitespace().collect::<Vec<_>>() == ["row", "z", "[m]", "T", "[degC]"]
        };
        let table_pages: Vec<&String> = pages
            .iter()
            .filter(|page| page.lines().any(is_reading))
            .collect();
        let readings: usize = table_pages
            .iter()
            .map(|page| page.lines().filter(|line| is_reading(line)).count())
            .sum();
        assert_eq!(
            readings, 60,
            "{paper}: every reading printed once, on one line"
        );
        assert!(
            table_pages.len() >= 2,
            "{paper}: the readings fit on one page"
        );
        for page in &table_pages {
            assert!(
                page.lines().any(is_header),
                "{paper}: a page of readings without the header row"
            );
        }
        // The nine rows of the temperature sweep, a short table, print whole on one page.
        let sweep_headers = pages
            .iter()
            .flat_map(|page| page.lines())
            .filter(|line| {
                line.split_whitespace().collect::<Vec<_>>()
                    == ["row", "T_sweep", "[degC]", "K_sweep", "[m/s]"]
            })
            .count();
        assert_eq!(
            sweep_headers, 1,
            "{paper}: the sweep's table split across pages"
        );
        // Each chart whole on one page: its caption and both axis titles together.
        for (caption, across, upright) in [
            ("Temperature log of QL-4", "T [degC]", "z [m]"),
            (
                "K of the basin floor against temperature",
                "T_sweep [degC]",
                "K_sweep [m/s]",
            ),
        ] {
            let page = pages
                .iter()
                .find(|page| page.lines().any(|line| line.trim() == caption))
                .unwrap_or_else(|| panic!("{paper}: caption `{caption}` not printed"));
            assert!(
                page.contains(across) && page.contains(upright),
                "{paper}: {caption}"
            );
        }
        // Every page is the paper chosen: the media boxes of the PDF's pages, in points
        // (595 x 842 for A4, 612 x 792 for Letter).
        let bytes = std::fs::read(&pdf).unwrap();
        let text = String::from_utf8_lossy(&bytes);
        let widths: Vec<f64> = text
            .split("/MediaBox [0 0 ")
            .skip(1)
            .filter_map(|rest| rest.split_whitespace().next()?.parse().ok())
            .collect();
        let expected = width_mm / 25.4 * 72.0;
        assert_eq!(widths.len(), count, "{paper}: {widths:?}");
        assert!(
            widths.iter().all(|width| (width - expected).abs() < 1.0),
            "{paper}: {widths:?} points wide, not {expected}"
        );
    }
}
