//! Columns: lists, ranges, data files, column arithmetic, aggregates and layered media,
//! interpolation, solve, overrides, limits and plots. Reference values name their source.

use crate::util::{assert_close, fluxsheet, outcome, run, run_sheet};
use fluxsheet::eval::{evaluate_sheet, Evaluation, LineResult, Shown};
use fluxsheet::library::Builtins;
use std::path::Path;

fn evaluate(sheet: &str) -> Evaluation {
    evaluate_sheet(sheet, Builtins::standard())
}

/// The shown numbers of a column line.
fn column(evaluation: &Evaluation, name: &str) -> Vec<f64> {
    match line_value(evaluation, name) {
        Shown::Column(column) => column.shown_values().collect(),
        other => panic!("`{name}` is not a column: {other:?}"),
    }
}

fn scalar(evaluation: &Evaluation, name: &str) -> f64 {
    match line_value(evaluation, name) {
        Shown::Scalar(shown) => shown.value,
        other => panic!("`{name}` is not a single value: {other:?}"),
    }
}

fn line_value<'e>(evaluation: &'e Evaluation, name: &str) -> &'e Shown {
    let line = evaluation
        .lines
        .iter()
        .find(|line| line.name.as_deref() == Some(name))
        .unwrap_or_else(|| panic!("no line `{name}`"));
    match &line.result {
        LineResult::Value(shown) => shown,
        other => panic!("`{name}`: {other:?} ({:?})", evaluation.diagnostics),
    }
}

fn first_error(evaluation: &Evaluation) -> String {
    evaluation
        .diagnostics
        .iter()
        .find(|diagnostic| diagnostic.severity == fluxsheet::eval::Severity::Error)
        .map(|diagnostic| diagnostic.message.clone())
        .unwrap_or_else(|| panic!("no error in {:?}", evaluation.diagnostics))
}

fn write(folder: &Path, name: &str, text: &str) -> std::path::PathBuf {
    let path = folder.join(name);
    std::fs::write(&path, text).unwrap();
    path
}

fn run_file(path: &Path, arguments: &[&str]) -> (i32, String, String) {
    outcome(fluxsheet().arg("run").arg(path).args(arguments))
}

#[test]
fn ranges_by_step_and_by_count_include_both_ends() {
    let evaluation = evaluate(
        "T = 0 degC to 40 degC step 10 K\nx = 0 to 1 step 0.1\nk = 1 mD to 10000 mD count 5 log\n\
         d = 2 m to 1 m count 3\nT [degC]\nx\nk\nd",
    );
    assert_eq!(column(&evaluation, "T"), vec![0.0, 10.0, 20.0, 30.0, 40.0]);
    let x = column(&evaluation, "x");
    assert_eq!(x.len(), 11);
    assert_eq!(x[10], 1.0, "the end is exact, not 0.9999999999999999");
    let k = column(&evaluation, "k");
    for (got, want) in k.iter().zip([1.0, 10.0, 100.0, 1000.0, 10000.0]) {
        assert_close(*got, want, 1e-12, "log range");
    }
    assert_eq!(column(&evaluation, "d"), vec![2.0, 1.5, 1.0]);
}

#[test]
fn bad_ranges_are_errors_that_say_why() {
    let cases = [
        (
            "T = 0 degC to 40 degC step 5 degC",
            "a step is a temperature difference",
        ),
        ("x = 0 m to 1 m step 0 m", "must be non-zero"),
        ("x = 0 m to 1 m step -0.1 m", "towards the end"),
        ("x = 0 m to 1 s step 1 s", "cannot compare"),
        ("x = 0 m to 1 m count 1.5", "whole number of at least 2"),
        ("x = 0 m to 1 m count 5 log", "above zero"),
        ("x = 0 m to 1 m step 1 s", "dimension of the ends"),
    ];
    for (sheet, expected) in cases {
        let message = first_error(&evaluate(sheet));
        assert!(message.contains(expected), "{sheet}: {message}");
    }
}

#[test]
fn scalars_broadcast_and_units_carry_through_columns() {
    let evaluation =
        evaluate("L = {1, 2, 5} m\nA = 2 m^2\nV [L] = L * A\nh [ft] = -L\nL2 [m^2] = L^2");
    assert_eq!(column(&evaluation, "V"), vec![2000.0, 4000.0, 10000.0]);
    let h = column(&evaluation, "h");
    assert_close(h[0], -1.0 / 0.3048, 1e-15, "m to ft, exact foot");
    assert_eq!(column(&evaluation, "L2"), vec![1.0, 4.0, 25.0]);
}

#[test]
fn columns_of_different_lengths_are_an_error_naming_both_lines() {
    let evaluation = evaluate("a = {1, 2, 3} m\nb = {1, 2} m\nc = a + b");
    let message = first_error(&evaluation);
    assert!(message.contains("3 rows (from `a`)"), "{message}");
    assert!(message.contains("2 rows (from `b`)"), "{message}");
}

#[test]
fn an_error_in_one_row_names_the_row() {
    let evaluation = evaluate("x = {1, 0, 2} m\ny = 1 m / x");
    let message = first_error(&evaluation);
    assert!(message.contains("division by zero"), "{message}");
    assert!(message.contains("row 2 of `x`"), "{message}");
    // A formulation refusing one row: 200 degC at 1 atm is steam, outside IF97 region 1.
    let evaluation = evaluate("T = {20, 200} degC\nrho = water_density(T)");
    let message = first_error(&evaluation);
    assert!(message.contains("row 2 of `T`"), "{message}");
}

#[test]
fn checks_over_columns_need_every_row() {
    let evaluation = evaluate("q = {1, 5, 9} m/d\ncheck q <= 6 m/d\ncheck q <= 10 m/d");
    let checks: Vec<_> = evaluation
        .lines
        .iter()
        .filter_map(|line| match &line.result {
            LineResult::Check(check) => Some(check),
            _ => None,
        })
        .collect();
    assert!(!checks[0].passed);
    let rows = checks[0].rows.unwrap();
    assert_eq!((rows.total, rows.failed, rows.shown_row), (3, 1, 3));
    assert!(checks[1].passed);
    assert_eq!(
        checks[1].rows.unwrap().shown_row,
        3,
        "row 3 is closest to failing"
    );
}

#[test]
fn the_table_output_adds_one_table_of_columns_in_every_format() {
    let sheet = "T = 0 degC to 20 degC step 10 K\nK [m/s] = hydraulic_conductivity(250 mD, T)\n";
    let (code, stdout, _) = run_sheet(sheet, &[]);
    assert_eq!(code, 0);
    assert!(
        stdout.contains("T [degC]") && stdout.contains("K [m/s]"),
        "{stdout}"
    );
    assert!(stdout.contains("3 rows"), "{stdout}");
    let (_, markdown, _) = run_sheet(sheet, &["--format", "markdown"]);
    assert!(
        markdown.contains("| row | T [degC] | K [m/s] |"),
        "{markdown}"
    );
    let (_, csv, _) = run_sheet(sheet, &["--format", "csv", "--digits", "3"]);
    assert!(csv.contains("\n1,T,1,0,degC,"), "{csv}");
    assert!(csv.contains("\n2,K,3,2.41e-6,m/s,\n"), "{csv}");
    assert_eq!(
        csv.lines().filter(|line| line.starts_with("2,K,")).count(),
        3
    );
    let (_, json, _) = run_sheet(sheet, &["--format", "json"]);
    let json: serde_json::Value = serde_json::from_str(&json).unwrap();
    let t = &json["lines"][0];
    assert_eq!(t["value"], serde_json::json!([0.0, 10.0, 20.0]));
    assert_eq!(t["si_value"], serde_json::json!([273.15, 283.15, 293.15]));
    assert_eq!(json["lines"][1]["value"].as_array().unwrap().len(), 3);
}

/// Two layers of 10 m each, K = 1000 m/d and 1 m/d (the problem of The Groundwater Project's
/// "Introduction to Karst Aquifers", exercise 5, after Bouwer 1978; the book's answer not
/// read, the numbers are the formulas of Freeze & Cherry 1979 eqs. 2.31-2.32 by hand):
/// along = (1000*10 + 1*10)/20 = 500.5 m/d, across = 20/(10/1000 + 10/1) = 20/10.01 m/d.
#[test]
fn layered_conductivity_of_a_published_two_layer_problem() {
    let evaluation = evaluate(
        "K = {1000, 1} m/d\nb = {10, 10} m\nKx [m/d] = layered_along(K, b)\nKz [m/d] = layered_across(K, b)",
    );
    assert_close(scalar(&evaluation, "Kx"), 500.5, 1e-14, "along");
    assert_close(scalar(&evaluation, "Kz"), 20.0 / 10.01, 1e-14, "across");
}

/// ln k_i = mu +- z_i in symmetric pairs: the sample's mean of ln k is exactly mu, so its
/// geometric mean is e^mu (here 100 mD); the arithmetic mean is larger (AM-GM inequality).
#[test]
fn geometric_mean_of_a_log_normal_sample() {
    let spreads = [0.3, 0.9, 1.4, 2.2];
    let values: Vec<String> = spreads
        .iter()
        .flat_map(|z: &f64| [100.0 * z.exp(), 100.0 * (-z).exp()])
        .map(|value| format!("{value:e}"))
        .collect();
    let sheet = format!(
        "k = {{{}}} mD\nk_g [mD] = geomean(k)\nk_a [mD] = mean(k)\nk_h [mD] = harmean(k)\nn = count(k)\nk_lo [mD] = min(k)\nk_hi [mD] = max(k)\ntotal [mD] = sum(k)",
        values.join(", ")
    );
    let evaluation = evaluate(&sheet);
    assert_close(scalar(&evaluation, "k_g"), 100.0, 1e-12, "geomean");
    let (h, a) = (scalar(&evaluation, "k_h"), scalar(&evaluation, "k_a"));
    assert!(
        h < 100.0 && 100.0 < a,
        "harmonic <= geometric <= arithmetic"
    );
    assert_eq!(scalar(&evaluation, "n"), 8.0);
    assert_close(
        scalar(&evaluation, "k_lo"),
        100.0 * (-2.2f64).exp(),
        1e-12,
        "min",
    );
    assert_close(
        scalar(&evaluation, "k_hi"),
        100.0 * 2.2f64.exp(),
        1e-12,
        "max",
    );
    assert_close(
        scalar(&evaluation, "total"),
        8.0 * a,
        1e-12,
        "sum = n * mean",
    );
}

#[test]
fn aggregates_refuse_what_has_no_meaning() {
    let message = first_error(&evaluate("T = {10, 20} degC\ns = sum(T)"));
    assert!(message.contains("cannot be passed to `sum`"), "{message}");
    let message = first_error(&evaluate("k = {1, -2} mD\ng = geomean(k)"));
    assert!(message.contains("row 2"), "{message}");
    let message = first_error(&evaluate(
        "K = {1, 2} m/s\nb = {1, 2} s\nx = layered_along(K, b)",
    ));
    assert!(message.contains("thickness"), "{message}");
}

#[test]
fn interpolation_inside_the_table_and_an_error_outside() {
    // y = 3 e^(0.5 x) is exactly log-linear; y = 2 x + 1 exactly linear.
    let evaluation = evaluate(
        "xs = {0, 1, 2, 4} m\nys = {1, 3, 5, 9} s\ny [s] = interpolate(xs, ys, 2.5 m)\n\
         ye = {3, 4.946163812100385, 8.154845485377136, 22.16716829679195} Pa\n\
         z [Pa] = interpolate_log(xs, ye, {0.5, 3} m)",
    );
    assert_close(scalar(&evaluation, "y"), 6.0, 1e-15, "linear");
    let z = column(&evaluation, "z");
    assert_close(z[0], 3.0 * 0.25f64.exp(), 1e-12, "log-linear");
    assert_close(z[1], 3.0 * 1.5f64.exp(), 1e-12, "log-linear");
    let evaluation = evaluate("xs = {0, 1} m\nys = {1, 3} s\ny = interpolate(xs, ys, 1.5 m)");
    let message = first_error(&evaluation);
    assert!(message.contains("not extrapolated"), "{message}");
    let message = first_error(&evaluate(
        "xs = {0, 1} m\nys = {1, 3} s\ny = interpolate(xs, ys, 1 s)",
    ));
    assert!(message.contains("must be"), "{message}");
}

/// The Vogel-type water viscosity law mu = 2.414e-5 Pa s * 10^(247.8 K / (T - 140 K)) (a
/// common engineering fit, from memory) inverts in closed form: for a target K, mu = k rho g / K
/// and T = 140 K + 247.8 K / log10(mu / 2.414e-5 Pa s).
#[test]
fn solve_matches_the_closed_form_of_an_invertible_viscosity_law() {
    let sheet = "\
mu_law(T [K]) [Pa*s] = 2.414e-5 Pa*s * 10^(247.8 K / (kelvin(T) - 140 K))
k = 500 mD
rho = 999 kg/m^3
T = 10 degC
K [m/s] = hydraulic_conductivity(k, rho, mu_law(T))
T_for [degC] = solve K == 6e-6 m/s for T between 0 degC and 80 degC
";
    let evaluation = evaluate(sheet);
    let k: f64 = 500.0 * 9.869_232_667_160_128e-16; // 1 mD = 1e-15/1.01325 m^2 (darcy by definition)
    let viscosity: f64 = k * 999.0 * 9.80665 / 6e-6;
    let kelvin = 140.0 + 247.8 / (viscosity / 2.414e-5).log10();
    assert_close(scalar(&evaluation, "T_for"), kelvin - 273.15, 1e-9, "solve");
    let note = evaluation
        .lines
        .iter()
        .find(|line| line.name.as_deref() == Some("T_for"))
        .and_then(|line| line.note.clone())
        .unwrap();
    let iterations: u32 = note
        .split_whitespace()
        .find_map(|word| word.parse().ok())
        .unwrap();
    assert!((2..50).contains(&iterations), "{note}");
}

#[test]
fn solve_says_when_the_bracket_holds_no_root_or_the_line_jumps() {
    let message = first_error(&evaluate(
        "T = 10 degC\nK = hydraulic_conductivity(500 mD, T)\nT2 = solve K == 1 m/s for T between 0 degC and 40 degC",
    ));
    assert!(message.contains("no solution in the bracket"), "{message}");
    let message = first_error(&evaluate(
        "x = 0.5 m\ny = 1 m / (x - 1 m)\nx0 = solve y == 0 for x between 0 m and 2 m",
    ));
    assert!(message.contains("not continuous"), "{message}");
    let message = first_error(&evaluate(
        "x = 1 m\ny = 2 m\nz = solve y == 1 m for x between 0 m and 2 m",
    ));
    assert!(message.contains("does not depend on `x`"), "{message}");
    let message = first_error(&evaluate(
        "x = 1 m\ny = x * 2\nz = solve y == 1 s for x between 0 m and 2 m",
    ));
    assert!(message.contains("cannot compare"), "{message}");
}

#[test]
fn data_files_read_with_header_units_and_exact_conversions() {
    let folder = tempfile::tempdir().unwrap();
    write(
        folder.path(),
        "cores.csv",
        "# lab sheet\nsample,k [mD],T [degF],n\nA-1,40,68,0.3\nA-2,250,50,0.25\n",
    );
    let sheet = write(
        folder.path(),
        "sheet.fxs",
        "s = column sample from \"cores.csv\"\nk = column k from \"cores.csv\"\nT = column T from \"cores.csv\"\n\
         n = column n from \"cores.csv\"\nT_C [degC] = T\nk_m [m^2] = k\nn\n",
    );
    let (code, stdout, stderr) = run_file(&sheet, &["--format", "json"]);
    assert_eq!(code, 0, "{stderr}");
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let line = |name: &str| {
        json["lines"]
            .as_array()
            .unwrap()
            .iter()
            .find(|line| line["name"] == name)
            .unwrap()
            .clone()
    };
    assert_eq!(line("s")["value"], serde_json::json!(["A-1", "A-2"]));
    assert_eq!(
        line("k")["unit"],
        "mD",
        "a data column shows in its header's unit"
    );
    // 68 degF = 20 degC and 50 degF = 10 degC exactly (NIST SP 811 B.9: t/degC = (t/degF - 32)/1.8).
    let celsius = line("T_C")["value"].clone();
    assert_close(celsius[0].as_f64().unwrap(), 20.0, 1e-14, "68 degF");
    assert_close(celsius[1].as_f64().unwrap(), 10.0, 1e-14, "50 degF");
    // 1 mD = 1e-15 / 1.01325 m^2: the darcy's definition (1 cP * 1 cm^2 / (1 s * 1 atm)).
    let k = line("k_m")["value"][0].as_f64().unwrap();
    assert_close(k, 40.0e-15 / 1.01325, 1e-15, "mD");
}

#[test]
fn bad_data_files_exit_3_with_line_and_column() {
    let folder = tempfile::tempdir().unwrap();
    let cases = [
        (
            "k [mD],b [m]\n40,1\n,2\n",
            "line 3, column 1 (`k [mD]`): missing value",
        ),
        (
            "k [mD],b [m]\n40,1\n50,x2\n",
            "line 3, column 2 (`b [m]`): `x2` is not a number",
        ),
        (
            "k [mDx],b [m]\n40,1\n",
            "line 1, column 1 (`k [mDx]`): unknown unit `mDx`",
        ),
        (
            "k [mD],b [m]\n40,1\n50\n",
            "line 3: 1 cells where the header has 2",
        ),
    ];
    for (index, (data, expected)) in cases.iter().enumerate() {
        let file = format!("data{index}.csv");
        write(folder.path(), &file, data);
        let sheet = write(
            folder.path(),
            &format!("sheet{index}.fxs"),
            &format!("k = column k from \"{file}\"\nb = column b from \"{file}\"\nk\nb\n"),
        );
        let (code, _, stderr) = run_file(&sheet, &[]);
        assert_eq!(code, 3, "{data}: {stderr}");
        assert!(stderr.contains(expected), "{data}: {stderr}");
    }
    write(folder.path(), "good.csv", "k [mD],b [m]\n40,1\n");
    let sheet = write(
        folder.path(),
        "missing.fxs",
        "k = column kk from \"good.csv\"\nk\n",
    );
    let (code, _, stderr) = run_file(&sheet, &[]);
    assert_eq!(code, 3);
    assert!(
        stderr.contains("has no column `kk`; its columns are `k`, `b`"),
        "{stderr}"
    );
}

#[test]
fn data_files_stay_inside_the_sheets_folder_unless_allowed() {
    let outer = tempfile::tempdir().unwrap();
    let inner = outer.path().join("sheets");
    std::fs::create_dir(&inner).unwrap();
    write(outer.path(), "outside.csv", "x [m]\n1\n2\n");
    let sheet = write(&inner, "s.fxs", "x = column x from \"../outside.csv\"\nx\n");
    let (code, _, stderr) = run_file(&sheet, &[]);
    assert_eq!(code, 3);
    assert!(stderr.contains("outside the sheet's folder"), "{stderr}");
    let (code, stdout, stderr) = run_file(&sheet, &["--allow-outside"]);
    assert_eq!(code, 0, "{stderr}");
    assert!(stdout.contains("2 rows"), "{stdout}");
}

#[test]
fn overrides_replace_an_input_for_one_run() {
    let sheet = "k = 250 mD\nT = 10 degC\nK [m/s] = hydraulic_conductivity(k, T)\n";
    let (code, stdout, stderr) = run_sheet(
        sheet,
        &[
            "--format",
            "json",
            "--set",
            "k=1 darcy",
            "--set",
            "T=0 degC to 20 degC step 10 K",
        ],
    );
    assert_eq!(code, 0, "{stderr}");
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    assert_eq!(json["lines"][0]["unit"], "darcy");
    assert!(json["lines"][0]["note"]
        .as_str()
        .unwrap()
        .contains("`250 mD`"));
    assert_eq!(json["lines"][2]["value"].as_array().unwrap().len(), 3);
    let (code, _, stderr) = run_sheet(sheet, &["--set", "kk=1 mD"]);
    assert_eq!(code, 2, "an unknown name is a command-line error");
    assert!(
        stderr.contains("no line named `kk`") && stderr.contains("did you mean `k`?"),
        "{stderr}"
    );
    let (code, _, stderr) = run_sheet(sheet, &["--set", "k=3 m"]);
    assert_eq!(code, 3);
    assert!(stderr.contains("the sheet's line is an area"), "{stderr}");
    let (code, _, stderr) = run_sheet(sheet, &["--set", "k"]);
    assert_eq!(code, 2);
    assert!(stderr.contains("NAME=VALUE"), "{stderr}");
}

#[test]
fn a_column_longer_than_the_limit_is_an_error_not_an_allocation() {
    // 1e12 rows of f64 would be 8 TB: refused before anything is allocated.
    let (code, _, stderr) = run_sheet("x = 0 m to 1 m count 1000000000000\n", &[]);
    assert_eq!(code, 3);
    assert!(
        stderr.contains("longer than the limit of 10000000 rows"),
        "{stderr}"
    );
    let (code, _, stderr) = run_sheet("x = 0 m to 1 m step 1 mm\nx\n", &["--max-rows", "100"]);
    assert_eq!(code, 3);
    assert!(
        stderr.contains("1001 rows is longer than the limit of 100"),
        "{stderr}"
    );
}

/// The SVG holds one curve per series (a polyline in the series' colour), the axis titles
/// with their units and the title; a second plot line goes to FILE-2.svg.
#[test]
fn plot_lines_write_svg_charts() {
    let folder = tempfile::tempdir().unwrap();
    let sheet = write(
        folder.path(),
        "sweep.fxs",
        "T = 0 degC to 40 degC step 5 K\nK [m/s] = hydraulic_conductivity(250 mD, T)\n\
         K2 [m/d] = hydraulic_conductivity(2 darcy, T)\nplot K, K2 against T log y \"K against T\"\n\
         plot K against T\n",
    );
    let target = folder.path().join("chart.svg");
    let (code, _, stderr) = run_file(&sheet, &["--plot", target.to_str().unwrap()]);
    assert_eq!(code, 0, "{stderr}");
    let svg = std::fs::read_to_string(&target).unwrap();
    let document = roxmltree::Document::parse(&svg).unwrap();
    let texts: Vec<&str> = document
        .descendants()
        .filter(|node| node.has_tag_name("text"))
        .filter_map(|node| node.text())
        .collect();
    for expected in ["T [degC]", "[m/s]", "K against T", "K", "K2"] {
        assert!(
            texts.iter().any(|text| text.trim() == expected),
            "{expected}: {texts:?}"
        );
    }
    let mut colours: Vec<&str> = document
        .descendants()
        .filter(|node| node.has_tag_name("polyline"))
        .filter_map(|node| node.attribute("stroke"))
        .filter(|colour| !colour.eq_ignore_ascii_case("#000000"))
        .collect();
    colours.sort_unstable();
    colours.dedup();
    assert_eq!(colours.len(), 2, "two series");
    let second = std::fs::read_to_string(folder.path().join("chart-2.svg")).unwrap();
    assert!(
        second.contains("K [m/s]"),
        "one series: the y title names it"
    );
    let flat = write(folder.path(), "flat.fxs", "x = 1 m\nx\n");
    let (code, _, stderr) = run_file(&flat, &["--plot", target.to_str().unwrap()]);
    assert_eq!(code, 2);
    assert!(stderr.contains("no plot line"), "{stderr}");
}

#[test]
fn plots_refuse_what_they_cannot_draw() {
    let message = first_error(&evaluate("x = 1 m\ny = 2 s\nplot y against x"));
    assert!(message.contains("not a column"), "{message}");
    let message = first_error(&evaluate(
        "x = {1, 2} m\ny = {1, 2} s\nz = {1, 2} kg\nplot y, z against x",
    ));
    assert!(message.contains("share a dimension"), "{message}");
}

#[test]
fn the_report_draws_charts_and_column_tables() {
    let folder = tempfile::tempdir().unwrap();
    let sheet = write(
        folder.path(),
        "sweep.fxs",
        "T = 0 degC to 20 degC step 10 K\nK [m/s] = hydraulic_conductivity(250 mD, T)\n\
plot K against T \"Conductivity of the sweep\"\n",
    );
    let report = folder.path().join("sweep.html");
    let (code, _, stderr) = run(&[
        "report",
        sheet.to_str().unwrap(),
        "-o",
        report.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{stderr}");
    let html = std::fs::read_to_string(&report).unwrap();
    assert!(
        html.contains("<figure class=\"chart\"><svg"),
        "the chart is inlined"
    );
    assert!(
        html.contains("<th>K [m/s]</th>"),
        "the column table is there"
    );
    // The title in the caption, not drawn again inside the chart.
    let start = html.find("<svg").unwrap();
    let end = html.find("</svg>").unwrap();
    assert!(!html[start..end].contains("Conductivity of the sweep"));
    assert!(html[end..].contains("<figcaption>Conductivity of the sweep</figcaption>"));
}

/// `points` and `down` reach the chart: markers without a line, and a profile whose depth
/// column titles the vertical axis and grows downwards.
#[test]
fn plot_options_draw_cross_plots_and_profiles() {
    let folder = tempfile::tempdir().unwrap();
    let sheet = write(
        folder.path(),
        "cores.fxs",
        "n = {0.31, 0.12, 0.25} \nk = {900, 3, 260} mD\nplot k against n points log y\n\
z = 0 m to 50 m step 10 m\nT [degC] = 9 degC + z * 30 K/km\nplot T against z down\n",
    );
    let target = folder.path().join("chart.svg");
    let (code, _, stderr) = run_file(&sheet, &["--plot", target.to_str().unwrap()]);
    assert_eq!(code, 0, "{stderr}");
    let svg = std::fs::read_to_string(&target).unwrap();
    let document = roxmltree::Document::parse(&svg).unwrap();
    let circles = document
        .descendants()
        .filter(|node| node.has_tag_name("circle"))
        .count();
    let curves = document
        .descendants()
        .filter(|node| node.has_tag_name("polyline"))
        .filter(|node| node.attribute("stroke") != Some("#000000"))
        .count();
    assert_eq!((circles, curves), (3, 0));
    let profile = std::fs::read_to_string(folder.path().join("chart-2.svg")).unwrap();
    let document = roxmltree::Document::parse(&profile).unwrap();
    let vertical: Vec<&str> = document
        .descendants()
        .filter(|node| node.has_tag_name("text") && node.attribute("transform").is_some())
        .filter_map(|node| node.text())
        .map(str::trim)
        .collect();
    assert_eq!(vertical, ["z [m]"]);
    let depths: Vec<f64> = document
        .descendants()
        .filter(|node| node.has_tag_name("circle"))
        .map(|node| node.attribute("cy").unwrap().parse().unwrap())
        .collect();
    assert_eq!(depths.len(), 6);
    assert!(
        depths.windows(2).all(|pair| pair[1] > pair[0]),
        "{depths:?}"
    );
}

#[test]
fn the_session_shows_columns() {
    use fluxsheet::eval::session::{Outcome, Session};
    let mut session = Session::new(Builtins::standard());
    session.enter("L = {1, 2, 3} m");
    let report = session.enter("L * 2 [cm]");
    match report.outcome {
        Outcome::Shown(Shown::Column(column)) => {
            assert_eq!(
                column.shown_values().collect::<Vec<_>>(),
                vec![200.0, 400.0, 600.0]
            )
        }
        other => panic!("{other:?}"),
    }
    let report = session.enter("M = _ + 1 cm");
    assert!(
        !matches!(report.outcome, Outcome::Refused),
        "{:?}",
        report.diagnostics
    );
}

#[test]
fn check_against_an_earlier_run_compares_columns_row_by_row() {
    let folder = tempfile::tempdir().unwrap();
    let sheet = write(folder.path(), "s.fxs", "q = {1, 2, 3} m/d\nq\n");
    let (code, earlier, _) = run_file(&sheet, &["--format", "json"]);
    assert_eq!(code, 0);
    let earlier_path = write(folder.path(), "earlier.json", &earlier);
    let against = [
        "check",
        sheet.to_str().unwrap(),
        "--against",
        earlier_path.to_str().unwrap(),
    ];
    let (code, stdout, stderr) = run(&against);
    assert_eq!(code, 0, "{stdout}{stderr}");
    std::fs::write(&sheet, "q = {1, 2.5, 3} m/d\nq\n").unwrap();
    let (code, stdout, _) = run(&against);
    assert_ne!(code, 0);
    assert!(stdout.contains("`q` moved in row 2"), "{stdout}");
    std::fs::write(&sheet, "q = {1, 2} m/d\nq\n").unwrap();
    let (code, stdout, _) = run(&against);
    assert_ne!(
        code, 0,
        "a column of another length is not the same value: {stdout}"
    );
}

#[test]
fn a_range_stands_alone_in_eval_with_a_display_unit() {
    let (code, stdout, stderr) = run(&[
        "eval",
        "--format",
        "json",
        "0 degC to 100 degC count 3 [degF]",
    ]);
    assert_eq!(code, 0, "{stderr}");
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    // 0, 50 and 100 degC are 32, 122 and 212 degF (NIST SP 811 B.9).
    let values: Vec<f64> = json["value"]
        .as_array()
        .unwrap()
        .iter()
        .map(|value| value.as_f64().unwrap())
        .collect();
    for (got, want) in values.iter().zip([32.0, 122.0, 212.0]) {
        assert_close(*got, want, 1e-12, "degF");
    }
}

#[test]
fn column_error_paths_say_what_is_wrong() {
    let cases = [
        (
            "a = {1, 2} m\nx = a to 3 m step 1 m",
            "must be a single value, not a column",
        ),
        (
            "a = {1, 2} m\nb = 2 m ^ {1, 2}",
            "the exponent of a quantity with a unit",
        ),
        (
            "L = {1, 2} m\ncheck L <= 1 m within {1, 2} %",
            "a tolerance must be a single value",
        ),
    ];
    for (sheet, expected) in cases {
        let message = first_error(&evaluate(sheet));
        assert!(message.contains(expected), "{sheet}: {message}");
    }
    let folder = tempfile::tempdir().unwrap();
    write(folder.path(), "c.csv", "sample,k [mD]\nA,1\nB,2\n");
    let sheet = write(
        folder.path(),
        "text.fxs",
        "s = column sample from \"c.csv\"\nt = s * 2\nu = mean(s)\n",
    );
    let (code, _, stderr) = run_file(&sheet, &[]);
    assert_eq!(code, 3);
    assert!(stderr.contains("`s` is a column of text"), "{stderr}");
    let negative = write(
        folder.path(),
        "negative.fxs",
        "x = {1, 2, 3} m\ny = {-1, 1, 2} m\nplot y against x log y\n",
    );
    let target = folder.path().join("n.svg");
    let (code, _, stderr) = run_file(&negative, &["--plot", target.to_str().unwrap()]);
    assert_eq!(code, 3, "a chart that cannot be drawn is an error");
    assert!(stderr.contains("plot on line 3"), "{stderr}");
    let (code, _, stderr) = run(&[
        "run",
        negative.to_str().unwrap(),
        sheet.to_str().unwrap(),
        "--plot",
        target.to_str().unwrap(),
    ]);
    assert_eq!(code, 2);
    assert!(stderr.contains("give one file"), "{stderr}");
}

/// The row kernels give, row for row, what the checked single-value calls give (those are
/// pinned against the IAPWS check tables in `properties`), with and without a pressure.
#[test]
fn row_kernels_match_single_value_calls() {
    let temperatures = [5.0, 20.0, 80.0];
    let sheet = "T = {5, 20, 80} degC\np = 5 bar\n\
        K [m/s] = hydraulic_conductivity(250 mD, T, p)\n\
        k [mD] = intrinsic_permeability(1e-5 m/s, T)\n\
        rho [kg/m^3] = water_density(T, p)\n\
        mu [Pa*s] = water_viscosity(T)\n";
    let columns = evaluate(sheet);
    for (row, celsius) in temperatures.iter().enumerate() {
        let single = evaluate(&format!(
            "T = {celsius} degC\np = 5 bar\n\
             K [m/s] = hydraulic_conductivity(250 mD, T, p)\n\
             k [mD] = intrinsic_permeability(1e-5 m/s, T)\n\
             rho [kg/m^3] = water_density(T, p)\n\
             mu [Pa*s] = water_viscosity(T)\n"
        ));
        for name in ["K", "k", "rho", "mu"] {
            assert_eq!(
                column(&columns, name)[row],
                scalar(&single, name),
                "{name} at {celsius} degC"
            );
        }
    }
}

/// Long columns are computed on every core, in spans; the row reported is still the first row
/// that fails, in whichever span it lies, and every value is the one a single value gives.
#[test]
fn long_columns_on_every_core_report_the_first_failing_row() {
    // K = 50 000 - r m/s at row r (0-based; exact in floating point): negative from row 50 001,
    // which is 1-based row 50 002, in the second span of two.
    let evaluation = evaluate("K = 50000 m/s to -49999 m/s count 100000\nq = darcy_flux(K, 0.01)");
    let message = first_error(&evaluation);
    assert!(message.contains("row 50002 of `K`"), "{message}");
    // Negative from row 20 001 on, through the first span and the whole second one.
    let evaluation = evaluate("K = 20000 m/s to -79999 m/s count 100000\nq = darcy_flux(K, 0.01)");
    let message = first_error(&evaluation);
    assert!(message.contains("row 20002 of `K`"), "{message}");
    // Steam in the last rows only: at 1 atm water boils at 373.1243 K = 99.9743 degC (IF97
    // region 4, from memory). Rows are 0.001 degC apart, so 99.974 degC (0-based row 79 974)
    // is the last liquid row and 99.975 degC (1-based row 79 976) the first steam.
    let evaluation = evaluate("T = 20 degC to 100.5 degC count 80501\nrho = water_density(T)");
    let message = first_error(&evaluation);
    assert!(message.contains("row 79976 of `T`"), "{message}");
    assert!(!evaluate("rho = water_density(99.974 degC)").has_errors());
    assert!(evaluate("rho = water_density(99.975 degC)").has_errors());
    let evaluation = evaluate("K = 1 m/s to 2 m/s count 100000\nq [m/s] = darcy_flux(K, 0.01)");
    let (conductivity, flux) = (column(&evaluation, "K"), column(&evaluation, "q"));
    assert_eq!(flux.len(), 100_000);
    for row in [0, 1, 49_999, 50_000, 50_001, 99_999] {
        let single = evaluate(&format!(
            "q [m/s] = darcy_flux({:e} m/s, 0.01)",
            conductivity[row]
        ));
        assert_eq!(flux[row], scalar(&single, "q"), "row {row}");
    }
}
