//! Warnings that point at likely mistakes and nothing else, and built-ins that say which
//! publication they evaluate: unused inputs, hot water, angles in radians, formulations in the
//! run's provenance.

use crate::util::{run, run_sheet};

/// The codes of the warnings (or, with `--deny-warnings`, the errors) in a JSON run.
fn diagnostic_codes(stdout: &str) -> Vec<String> {
    let json: serde_json::Value = serde_json::from_str(stdout).unwrap();
    json["diagnostics"]
        .as_array()
        .unwrap()
        .iter()
        .map(|diagnostic| diagnostic["code"].as_str().unwrap_or("?").to_string())
        .collect()
}

// ----- unused-line: inputs only -----

#[test]
fn result_lines_shown_in_the_table_pass_deny_warnings() {
    // `aniso` and `K_mean` compute results that no other line uses and that are not the last
    // line of their section: the table shows them, so they are not "unused".
    let sheet = "## Cores (invented)\n\
K_h = 3e-5 m/s\n\
K_v = 2e-6 m/s\n\
aniso = K_h / K_v\n\
K_mean = sqrt(K_h * K_v)\n\
i = 0.01\n\
q [m/d] = K_h * i\n";
    let (code, stdout, stderr) = run_sheet(sheet, &["--deny-warnings", "--format", "json"]);
    assert_eq!(code, 0, "{stdout}{stderr}");
    assert!(diagnostic_codes(&stdout).is_empty(), "{stdout}");
}

#[test]
fn an_unused_literal_input_is_warned_with_the_way_to_keep_it() {
    let sheet = "## Inputs\n\
k_core = 420 mD\n\
k_spare = 420 mD\n\
## Result\n\
K [m/s] = hydraulic_conductivity(k_core, 12 degC)\n";
    let (code, _, stderr) = run_sheet(sheet, &[]);
    assert_eq!(code, 0, "{stderr}");
    assert!(
        stderr.contains("warning[unused-line]: input `k_spare` is used by no line or check"),
        "{stderr}"
    );
    assert!(
        stderr.contains("to keep `k_spare` as a shown input, write `k_spare [mD] = 420 mD`"),
        "{stderr}"
    );
    assert!(!stderr.contains("`k_core`"), "{stderr}");
    let (code, _, stderr) = run_sheet(sheet, &["--deny-warnings"]);
    assert_eq!(code, 3, "{stderr}");
    // Following the help silences it.
    let kept = sheet.replace("k_spare = 420 mD", "k_spare [mD] = 420 mD");
    let (code, _, stderr) = run_sheet(&kept, &["--deny-warnings"]);
    assert_eq!(code, 0, "{stderr}");
}

#[test]
fn the_last_input_of_a_section_is_warned_too() {
    // A forgotten viscosity at the end of the inputs section is the mistake the warning is for.
    let sheet = "## Inputs\nk = 420 mD\nrho = 998 kg/m^3\nmu = 1 cP\n## Result\n\
K [m/s] = k * rho * g0 / 1.002 cP\n";
    let (_, stdout, _) = run_sheet(sheet, &["--format", "json"]);
    assert_eq!(diagnostic_codes(&stdout), ["unused-line"]);
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    assert_eq!(json["diagnostics"][0]["line"], 4);
}

// ----- hot water: the pressure, not the brine functions -----

/// The number after `label` and before `unit` in `text`.
fn number_between(text: &str, label: &str, unit: &str) -> f64 {
    let start = text
        .find(label)
        .unwrap_or_else(|| panic!("{label} in {text}"))
        + label.len();
    let end = start + text[start..].find(unit).unwrap();
    text[start..end].trim().parse().unwrap()
}

#[test]
fn hot_water_without_a_pressure_is_told_to_give_one() {
    let (code, _, stderr) = run_sheet("rho [kg/m^3] = water_density(120 degC)\n", &[]);
    assert_eq!(code, 3, "{stderr}");
    assert!(stderr.contains("give the pressure on site"), "{stderr}");
    assert!(!stderr.contains("brine"), "{stderr}");
    // The saturation pressure named is IAPWS-IF97's at 120 degC, here from the independent
    // `seuif97` implementation (saturated liquid, quality 0; MPa).
    let expected_kpa = seuif97::tx(120.0, 0.0, seuif97::OP) * 1000.0;
    let named_kpa = number_between(&stderr, "p_sat =", "kPa");
    crate::util::assert_close(named_kpa, expected_kpa, 1e-5, "p_sat(120 degC)");
    // The suggested call keeps the water liquid: following it gives a value and no warning.
    let suggested_bar = number_between(&stderr, "`water_density(120 degC,", "bar)`");
    assert!(suggested_bar * 100.0 > expected_kpa, "{stderr}");
    let followed = format!("rho [kg/m^3] = water_density(120 degC, {suggested_bar} bar)\n");
    let (code, _, stderr) = run_sheet(&followed, &["--deny-warnings"]);
    assert_eq!(code, 0, "{stderr}");
}

#[test]
fn hot_water_under_its_pressure_and_hot_columns_are_not_warned() {
    // p_sat(150 degC) is about 4.76 bar (IAPWS-IF97 region 4, from memory): 10 bar is liquid.
    let sheet = "T = 20 degC to 150 degC step 10 K\n\
rho [kg/m^3] = water_density(T, 10 bar)\n\
mu [cP] = water_viscosity(T, 10 bar)\n\
p_boil [bar] = saturation_pressure(150 degC)\n\
check p_boil < 10 bar \"liquid at the site pressure\"\n";
    let (code, stdout, stderr) = run_sheet(sheet, &["--deny-warnings", "--format", "json"]);
    assert_eq!(code, 0, "{stdout}{stderr}");
    assert!(diagnostic_codes(&stdout).is_empty(), "{stdout}");
}

// ----- angle-in-radians -----

#[test]
fn a_plain_number_beyond_a_full_turn_in_sin_points_at_deg() {
    let (code, stdout, stderr) = run_sheet("x = sin(30)\n", &[]);
    assert_eq!(code, 0, "{stderr}");
    assert!(stdout.contains("-0.988"), "{stdout}"); // still sin of 30 radians
    assert!(stderr.contains("warning[angle-in-radians]"), "{stderr}");
    assert!(stderr.contains("did you mean `sin(30 deg)`?"), "{stderr}");
    assert!(stderr.contains("<stdin>:1:9"), "{stderr}");

    // Through a line of its own, the suggestion is for that line.
    let (_, _, stderr) = run_sheet("theta = 45\nc = cos(theta)\n", &[]);
    assert!(
        stderr.contains("did you mean `theta = 45 deg`?"),
        "{stderr}"
    );
    // A column: the first row beyond 2 pi is named.
    let (_, _, stderr) = run_sheet("a = {1, 2, 90}\nt = tan(a)\n", &[]);
    assert!(stderr.contains("plain number 90 in row 3"), "{stderr}");
    let (_, stdout, _) = run_sheet("x = tan(-7)\n", &["--format", "json"]);
    assert_eq!(diagnostic_codes(&stdout), ["angle-in-radians"]);
}

#[test]
fn angles_with_a_unit_and_small_plain_numbers_are_not_warned() {
    for sheet in [
        "x = sin(30 deg)\n",
        "x = sin(400 deg)\n",
        "x = sin(7 rad)\n",
        "theta = 7 rad\nx = cos(theta)\n",
        "w = 15 deg/h\nt = 10 h\nx = sin(w * t)\n",
        "x = sin(2)\ny = cos(-6.2)\nz = tan(pi / 4)\n",
        "x = sqrt(30)\n",
    ] {
        let (code, stdout, stderr) = run_sheet(sheet, &["--deny-warnings", "--format", "json"]);
        assert_eq!(code, 0, "{sheet}: {stdout}{stderr}");
        assert!(diagnostic_codes(&stdout).is_empty(), "{sheet}: {stdout}");
    }
}

#[test]
fn the_warning_codes_are_in_the_readme_table() {
    let readme =
        std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/README.md")).unwrap();
    for code in ["unused-line", "angle-in-radians"] {
        assert!(readme.contains(&format!("| `{code}` |")), "{code}");
    }
    assert!(!readme.contains("`water-temperature`"));
    let (code, stdout, _) = run(&["check", "--help"]);
    assert_eq!(code, 0);
    // clap wraps the help text, so look for its start.
    assert!(stdout.contains("display unit, `k_spare [mD]"), "{stdout}");
}
