//! Output that fits: at 80 and 100 columns (`COLUMNS`), no line of `run` over every demo
//! sheet, of `functions` (the list, and entries in full) or of `units` is wider than the
//! terminal; without a terminal the width is 100; Markdown keeps whole texts.

use crate::util::{fluxsheet, outcome, worksheet};
use unicode_width::UnicodeWidthStr;

/// `fluxsheet ARGS…` with `COLUMNS=width`: (exit code, stdout).
fn at_width(width: usize, arguments: &[&str]) -> (i32, String) {
    let (code, stdout, _) = outcome(
        fluxsheet()
            .env("COLUMNS", width.to_string())
            .args(arguments),
    );
    (code, stdout)
}

fn assert_fits(width: usize, what: &str, text: &str) {
    assert!(!text.trim().is_empty(), "{what}: no output");
    for line in text.lines() {
        assert!(
            line.width() <= width,
            "{what} at {width} columns: a line of {} columns:\n{line}",
            line.width()
        );
    }
}

fn demo_sheets() -> Vec<std::path::PathBuf> {
    let mut sheets: Vec<_> = std::fs::read_dir(worksheet(""))
        .unwrap()
        .map(|entry| entry.unwrap().path())
        .filter(|path| path.extension().is_some_and(|extension| extension == "fxs"))
        .collect();
    sheets.sort();
    assert!(sheets.len() >= 10, "{sheets:?}");
    sheets
}

#[test]
fn run_fits_80_and_100_columns_on_every_demo_sheet() {
    for width in [80, 100] {
        for sheet in demo_sheets() {
            let sheet = sheet.to_str().unwrap();
            let (code, stdout) = at_width(width, &["run", sheet]);
            assert!(code == 0 || code == 1, "{sheet}: exit {code}");
            assert_fits(width, sheet, &stdout);
            let (_, working) = at_width(width, &["run", "--working", sheet]);
            assert!(working.len() >= stdout.len(), "{sheet}");
        }
    }
}

/// A sampled run adds its spread, checks and ranking: they fit too, and its checks count
/// samples, not rows.
#[test]
fn a_sampled_run_fits_80_and_100_columns() {
    let sheet = worksheet("liner_leakage_uncertainty.fxs");
    let sheet = sheet.to_str().unwrap();
    for width in [80, 100] {
        let (code, stdout) = at_width(width, &["run", sheet, "--samples", "2000", "--seed", "3"]);
        assert!(code == 0 || code == 1, "exit {code}");
        assert_fits(width, "run --samples", &stdout);
        assert!(stdout.contains("What drives each result"), "{stdout}");
        assert!(stdout.contains(" of 2000 samples fail"), "{stdout}");
        assert!(!stdout.contains(" of 2000 rows"), "{stdout}");
    }
}

#[test]
fn functions_and_units_fit_80_and_100_columns() {
    for width in [80, 100] {
        let (code, list) = at_width(width, &["functions"]);
        assert_eq!(code, 0);
        assert_fits(width, "functions", &list);
        assert!(list.contains("darcy_flux(K, i)"), "{list}");
        for name in [
            "darcy_flux_pressure",
            "hazen_conductivity",
            "water_viscosity",
            "bouwer_rice_conductivity",
            "iapws-2008-viscosity",
            "g0",
        ] {
            let (code, text) = at_width(width, &["functions", name]);
            assert_eq!(code, 0, "{name}");
            assert_fits(width, name, &text);
        }
        let (_, units) = at_width(width, &["units"]);
        assert_fits(width, "units", &units);
        let (_, pressure) = at_width(width, &["properties", "water"]);
        assert_fits(width, "properties water", &pressure);
    }
}

/// A long expression wraps inside its column; the whole text is still there in Markdown and
/// JSON; a column table too wide for the terminal is drawn in blocks, each with the row number.
#[test]
fn long_texts_wrap_and_wide_column_tables_come_in_blocks() {
    let folder = tempfile::tempdir().unwrap();
    let path = folder.path().join("wide.fxs");
    let long = "hydraulic_conductivity(400 mD, T) * (1 + 0 * water_density(T) / (1000 kg/m^3)) \
                * (1 + 0 * water_viscosity(T) / (1 mPa*s))";
    std::fs::write(
        &path,
        format!(
            "T = 0 degC to 40 degC step 10 K\nK_first_column_with_a_long_name [m/s] = {long}\n\
             K_second_column_with_a_long_name [cm/s] = K_first_column_with_a_long_name\n\
             K_third_column_with_a_long_name [ft/d] = K_first_column_with_a_long_name\n"
        ),
    )
    .unwrap();
    let path = path.to_str().unwrap();
    let (code, table) = at_width(80, &["run", path]);
    assert_eq!(code, 0, "{table}");
    assert_fits(80, "wide sheet", &table);
    // Two blocks of the column table, each headed by the row numbers.
    let headers = table
        .lines()
        .filter(|line| line.starts_with("row "))
        .count();
    assert_eq!(headers, 2, "{table}");
    let (_, markdown) = at_width(80, &["run", "--format", "markdown", path]);
    assert!(markdown.contains(long), "{markdown}");
    // Not a terminal and no `COLUMNS`: 100 columns.
    let (_, piped, _) = outcome(fluxsheet().args(["run", path]));
    assert_fits(100, "piped", &piped);
    assert!(piped.lines().any(|line| line.width() > 80), "{piped}");
}
