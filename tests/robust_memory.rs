//! Bounded memory: every way a sheet could make the process grow without bound is an error
//! with a limit the user can raise (`--max-rows`, `--max-total-rows`, `--max-sheet-bytes`,
//! `--max-data-bytes`), and long columns are written as they are formatted. The limits here are
//! set small so each case runs in milliseconds; the peak memory of the defaults is measured,
//! not asserted (DEVELOPERS.md, Performance).

use crate::util::{outcome, run, run_sheet};
use std::path::Path;

/// A scratch folder holding `files` (name, contents).
fn folder_with(files: &[(&str, &[u8])]) -> tempfile::TempDir {
    let folder = tempfile::tempdir().unwrap();
    for (name, contents) in files {
        std::fs::write(folder.path().join(name), contents).unwrap();
    }
    folder
}

fn path_text(folder: &Path, name: &str) -> String {
    folder.join(name).to_str().unwrap().to_string()
}

#[test]
fn a_column_longer_than_max_rows_is_refused_before_it_is_made() {
    let (code, _, stderr) = run_sheet("x = 1 m to 100 m count 100\n", &["--max-rows", "50"]);
    assert_eq!(code, 3, "{stderr}");
    assert!(
        stderr.contains("a column of 100 rows is longer than the limit of 50 rows"),
        "{stderr}"
    );
}

#[test]
fn a_billion_rows_under_a_raised_max_rows_meet_the_total_limit_instead_of_aborting() {
    let (code, _, stderr) = run_sheet("x = 1 to 1e9 count 1e9\n", &["--max-rows", "1000000000"]);
    assert_eq!(code, 3, "{stderr}");
    assert!(stderr.contains("--max-total-rows"), "{stderr}");
    assert!(!stderr.contains("memory allocation"), "{stderr}");
}

#[test]
fn columns_past_the_total_limit_are_errors_and_the_earlier_ones_stay() {
    // `z` depends on `y`, so `y` is evaluated first and `z` is the line that goes over.
    let sheet = "x = 1 to 100 count 100\ny = x * 2\nz = y * 3\nsame = x\n";
    let (code, stdout, stderr) = run_sheet(sheet, &["--max-total-rows", "250", "--format", "json"]);
    assert_eq!(code, 3, "{stderr}");
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let names: Vec<&str> = json["lines"]
        .as_array()
        .unwrap()
        .iter()
        .map(|line| line["name"].as_str().unwrap())
        .collect();
    // `same` shares `x`'s rows, so it costs nothing; `z` would make 300 rows in all.
    assert_eq!(names, ["x", "y", "same"]);
    let messages: Vec<&str> = json["diagnostics"]
        .as_array()
        .unwrap()
        .iter()
        .map(|diagnostic| diagnostic["message"].as_str().unwrap())
        .collect();
    assert_eq!(messages.len(), 1, "{messages:?}");
    assert!(
        messages[0].contains("300 rows in all, over the limit of 250"),
        "{messages:?}"
    );
}

#[test]
fn a_sheet_larger_than_the_limit_is_an_error_from_a_file_and_from_standard_input() {
    let sheet = format!("x = 1 m\n{}", "# padding\n".repeat(20));
    let folder = folder_with(&[("big.fxs", sheet.as_bytes())]);
    let file = path_text(folder.path(), "big.fxs");
    let (code, _, stderr) = run(&["run", "--max-sheet-bytes", "64", &file]);
    assert_eq!(code, 3, "{stderr}");
    assert!(
        stderr.contains(
            "is larger than 64 bytes, the limit for a sheet (raise it with `--max-sheet-bytes`)"
        ),
        "{stderr}"
    );
    let (code, _, stderr) = run_sheet(&sheet, &["--max-sheet-bytes", "64"]);
    assert_eq!(code, 3, "{stderr}");
    assert!(
        stderr.contains("`<stdin>` is larger than 64 bytes"),
        "{stderr}"
    );
    let (code, _, stderr) = run(&["check", "--max-sheet-bytes", "64", &file]);
    assert_eq!(code, 3, "{stderr}");
    let (code, stdout, stderr) = run(&["run", "--max-sheet-bytes", "1000", &file]);
    assert_eq!(code, 0, "{stderr}");
    assert!(stdout.contains("x "), "{stdout}");
}

#[test]
fn an_included_sheet_and_a_data_file_have_their_own_limits() {
    let data = format!("k [mD]\n{}", "40\n".repeat(50));
    let folder = folder_with(&[
        (
            "main.fxs",
            b"include \"shared.fxs\"\nk = column k from \"cores.csv\"\nk_mean = mean(k) + a\n",
        ),
        (
            "shared.fxs",
            format!("a = 1 mD\n{}", "# note\n".repeat(30)).as_bytes(),
        ),
        ("cores.csv", data.as_bytes()),
    ]);
    let main = path_text(folder.path(), "main.fxs");
    let (code, _, stderr) = run(&["run", "--max-sheet-bytes", "100", &main]);
    assert_eq!(code, 3, "{stderr}");
    assert!(
        stderr.contains("cannot include: `shared.fxs` is larger than 100 bytes"),
        "{stderr}"
    );
    let (code, _, stderr) = run(&["run", "--max-data-bytes", "100", &main]);
    assert_eq!(code, 3, "{stderr}");
    assert!(
        stderr.contains("`cores.csv` is larger than 100 bytes, the limit for a data file (raise it with `--max-data-bytes`)"),
        "{stderr}"
    );
    let (code, stdout, stderr) = run(&["run", &main]);
    assert_eq!(code, 0, "{stderr}");
    assert!(stdout.contains("k_mean"), "{stdout}");
}

/// An endless device read as a sheet, an include or a data file stops at the limit.
#[cfg(unix)]
#[test]
fn reading_dev_zero_stops_at_the_limit() {
    let (code, _, stderr) = run(&["run", "--max-sheet-bytes", "4096", "/dev/zero"]);
    assert_eq!(code, 3, "{stderr}");
    assert!(
        stderr.contains("`/dev/zero` is larger than 4096 bytes"),
        "{stderr}"
    );
    let folder = folder_with(&[(
        "zero.fxs",
        b"include \"/dev/zero\"\nk = column k from \"/dev/zero\"\n",
    )]);
    let sheet = path_text(folder.path(), "zero.fxs");
    let (code, _, stderr) = run(&[
        "run",
        "--allow-outside",
        "--max-sheet-bytes",
        "4096",
        "--max-data-bytes",
        "4096",
        &sheet,
    ]);
    assert_eq!(code, 3, "{stderr}");
    assert!(stderr.contains("the limit for a sheet"), "{stderr}");
    assert!(stderr.contains("the limit for a data file"), "{stderr}");
}

/// With the address space capped below the column's size, the allocator's refusal is an error
/// on the line, not an abort.
#[cfg(unix)]
#[test]
fn a_column_the_allocator_refuses_is_an_error_not_an_abort() {
    let binary = assert_cmd::cargo::cargo_bin("fluxsheet");
    let script = format!(
        "ulimit -v 400000 && exec '{}' run --max-rows 100000000 --max-total-rows 100000000 -",
        binary.display()
    );
    let (code, _, stderr) = outcome(
        assert_cmd::Command::new("sh")
            .args(["-c", &script])
            .env("NO_COLOR", "1")
            .write_stdin("x = 1 to 1e8 count 1e8\n"),
    );
    assert_eq!(code, 3, "{stderr}");
    assert!(
        stderr.contains("not enough memory for a column of 100000000 rows"),
        "{stderr}"
    );
}

/// The streamed column table: every row, and every line as wide as the others (numbers and
/// their headers are right-aligned).
#[test]
fn a_long_column_table_is_written_whole_and_aligned() {
    let rows = 20_000;
    let sheet = format!("x = 1 m to {rows} m count {rows}\ny [ft] = x\n");
    let (code, stdout, stderr) = run_sheet(&sheet, &[]);
    assert_eq!(code, 0, "{stderr}");
    let column_table: Vec<&str> = stdout
        .lines()
        .skip_while(|line| !line.contains("x [m]"))
        .take_while(|line| !line.is_empty())
        .collect();
    // Header, the rule under it, and the rows.
    assert_eq!(column_table.len(), rows + 2);
    let width = column_table[0].chars().count();
    assert!(column_table
        .iter()
        .all(|line| line.chars().count() == width));
    let last_row: Vec<&str> = column_table[rows + 1].split_whitespace().collect();
    let feet = rows as f64 / 0.3048;
    assert_eq!(last_row[0], rows.to_string());
    assert_eq!(last_row[1], "20000");
    assert!((last_row[2].parse::<f64>().unwrap() / feet - 1.0).abs() < 5e-4);
}

/// The streamed JSON carries every row, in the display unit and in SI.
#[test]
fn a_long_column_in_json_has_every_row_in_both_units() {
    let rows = 20_000;
    let sheet = format!("x [ft] = 1 m to {rows} m count {rows}\n");
    let (code, stdout, stderr) = run_sheet(&sheet, &["--format", "json"]);
    assert_eq!(code, 0, "{stderr}");
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let line = &json["lines"][0];
    let shown = line["value"].as_array().unwrap();
    let si = line["si_value"].as_array().unwrap();
    assert_eq!((shown.len(), si.len()), (rows, rows));
    for (shown, si) in shown.iter().zip(si).step_by(997) {
        let (shown, si) = (shown.as_f64().unwrap(), si.as_f64().unwrap());
        assert!(
            (shown * 0.3048 / si - 1.0).abs() < 1e-12,
            "{shown} ft vs {si} m"
        );
    }
}

/// A chart of a long column draws a few points per pixel column, not a vertex per row.
#[test]
fn a_long_curve_is_drawn_as_few_points() {
    let rows = 20_000;
    let folder = folder_with(&[(
        "sweep.fxs",
        format!("x = 1 to {rows} count {rows}\ny = sqrt(x)\nplot y against x\n").as_bytes(),
    )]);
    let target = path_text(folder.path(), "sweep.svg");
    let sheet = path_text(folder.path(), "sweep.fxs");
    let (code, _, stderr) = run(&["run", "--format", "csv", &sheet, "--plot", &target]);
    assert_eq!(code, 0, "{stderr}");
    let svg = std::fs::read_to_string(&target).unwrap();
    let document = roxmltree::Document::parse(&svg).unwrap();
    let longest = document
        .descendants()
        .filter(|node| node.has_tag_name("polyline"))
        .map(|node| {
            node.attribute("points")
                .unwrap_or("")
                .split_whitespace()
                .count()
        })
        .max()
        .unwrap();
    // The plot area is a few thousand canvas pixels wide: at most four points a column.
    assert!((100..rows / 2).contains(&longest), "{longest} vertices");
}
