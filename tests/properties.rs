//! Fluid properties and k <-> K conversions as a sheet sees them: through the binary, with
//! values checked against published tables, handbook facts and independent arithmetic.

use crate::util::{assert_close, run, run_sheet, si_value};

/// Source: IAPWS R7-97(2012) Table 5 gives v at (300 K, 3 MPa) = 0.100215168e-2 m^3/kg;
/// the sheet function must agree to 9 significant digits.
#[test]
fn water_density_iapws_if97_table_5_through_a_sheet() {
    assert_close(
        si_value("water_density(300 K, 3 MPa)"),
        1.0 / 0.100215168e-2,
        5e-9,
        "rho(300 K, 3 MPa)",
    );
    assert_close(
        si_value("water_density(500 K, 3 MPa)"),
        1.0 / 0.120241800e-2,
        5e-9,
        "rho(500 K, 3 MPa)",
    );
}

/// Source: IAPWS R7-97(2012) Table 35: p_sat(300 K) = 0.353658941e-2 MPa.
#[test]
fn saturation_pressure_iapws_if97_table_35() {
    assert_close(
        si_value("saturation_pressure(300 K)"),
        0.353658941e4,
        5e-9,
        "p_sat(300 K)",
    );
}

/// Handbook facts, from memory: density maximum of water near 4 degC is about 999.97 kg/m^3;
/// viscosity at 20 degC is about 1.002 mPa s (common practice).
#[test]
fn handbook_water_facts() {
    assert_close(
        si_value("water_density(4 degC)"),
        999.97,
        2e-5,
        "rho(4 degC)",
    );
    assert_close(
        si_value("water_viscosity(20 degC)"),
        1.002e-3,
        1e-3,
        "mu(20 degC)",
    );
}

/// Common practice: "1 darcy of water at 20 degC is about 1e-5 m/s"; the formulations give
/// K near 9.6e-6 m/s.
#[test]
fn one_darcy_at_20_degc_is_about_ten_micrometres_per_second() {
    let conductivity = si_value("hydraulic_conductivity(1 darcy, 20 degC)");
    assert!((9.5e-6..9.8e-6).contains(&conductivity), "{conductivity}");
}

/// K = k rho g0 / mu, computed here from the property functions' own outputs.
#[test]
fn conductivity_is_k_rho_g_over_mu_and_round_trips() {
    let k = 250.0 * 1e-15 / 1.01325;
    let density = si_value("water_density(9 degC)");
    let viscosity = si_value("water_viscosity(9 degC)");
    let expected = k * density * 9.80665 / viscosity;
    assert_close(
        si_value("hydraulic_conductivity(250 mD, 9 degC)"),
        expected,
        1e-14,
        "K(250 mD, 9 degC)",
    );
    assert_close(
        si_value("intrinsic_permeability(hydraulic_conductivity(250 mD, 9 degC), 9 degC)"),
        k,
        1e-14,
        "round trip",
    );
    assert_close(
        si_value("hydraulic_conductivity(250 mD, 1000 kg/m^3, 1 cP)"),
        k * 1000.0 * 9.80665 / 1e-3,
        1e-14,
        "any fluid",
    );
}

/// The temperature correction is the viscosity and density ratio, nothing else.
#[test]
fn temperature_correction_follows_the_viscosity_ratio() {
    let ratio =
        si_value("hydraulic_conductivity(1 D, 8 degC) / hydraulic_conductivity(1 D, 20 degC)");
    let viscosity_ratio = si_value("water_viscosity(20 degC) / water_viscosity(8 degC)");
    let density_ratio = si_value("water_density(8 degC) / water_density(20 degC)");
    assert_close(ratio, viscosity_ratio * density_ratio, 1e-14, "K ratio");
    // Roughly 30 % lower at 8 degC than at 20 degC (common practice).
    assert!((0.70..0.75).contains(&ratio), "{ratio}");
}

/// Every out-of-range case is exit 3 with a message that names the range.
#[test]
fn out_of_range_is_refused_with_the_range() {
    for expression in [
        "water_density(-5 degC)",
        "water_density(120 degC)",
        "water_density(20 degC, 150 MPa)",
        "water_viscosity(400 degC, 50 MPa)",
        "saturation_pressure(700 K)",
        "brine_density(20 degC, 20 MPa, 30 %)",
        "brine_viscosity(300 degC, 0.1)",
        "air_viscosity(50 K)",
        "hydraulic_conductivity(1 D, -5 degC)",
    ] {
        let (code, _, stderr) = run(&["eval", expression]);
        assert_eq!(code, 3, "{expression}");
        assert!(stderr.contains("valid for"), "{expression}: {stderr}");
    }
    // A mass fraction below 0 is refused by the parameter's domain, which names its bounds.
    let (code, _, stderr) = run(&["eval", "brine_density(20 degC, 20 MPa, -1 %)"]);
    assert_eq!(code, 3);
    assert!(stderr.contains("must lie in [0, 1]"), "{stderr}");
}

#[test]
fn arguments_of_the_wrong_dimension_say_which_and_what() {
    let (code, _, stderr) = run(&["eval", "hydraulic_conductivity(2 m/s, 20 degC)"]);
    assert_eq!(code, 3);
    assert!(stderr.contains("argument `k` must be an area"), "{stderr}");
    let (_, _, stderr) = run(&["eval", "water_density(20 degC, 3 m)"]);
    assert!(
        stderr.contains("argument `p` must be a pressure"),
        "{stderr}"
    );
    let (_, _, stderr) = run(&["eval", "water_density(5 delta_degC)"]);
    assert!(stderr.contains("not a temperature difference"), "{stderr}");
}

#[test]
fn salinity_accepts_fraction_percent_and_ppm() {
    let fraction = si_value("brine_density(60 degC, 10 MPa, 0.05)");
    assert_eq!(si_value("brine_density(60 degC, 10 MPa, 5 %)"), fraction);
    assert_eq!(
        si_value("brine_density(60 degC, 10 MPa, 50000 ppm)"),
        fraction
    );
}

#[test]
fn run_lists_the_formulations_a_sheet_used() {
    let (code, stdout, _) = run_sheet("K = hydraulic_conductivity(40 mD, 12 degC)\n", &[]);
    assert_eq!(code, 0);
    assert!(stdout.contains("Formulations used:"));
    assert!(stdout.contains("IAPWS-IF97 region 1"));
    assert!(stdout.contains("IAPWS 2008 viscosity"));
    assert!(!stdout.contains("Batzle"));
    let (_, stdout, _) = run_sheet("x = 2 m\n", &[]);
    assert!(!stdout.contains("Formulations used:"));
}

#[test]
fn properties_table_in_every_format() {
    let (code, stdout, _) = run(&[
        "properties",
        "water",
        "--from",
        "0degC",
        "--to",
        "40degC",
        "--step",
        "2K",
        "--format",
        "csv",
    ]);
    assert_eq!(code, 0);
    let lines: Vec<&str> = stdout.lines().collect();
    assert_eq!(lines.len(), 22, "header and 21 rows");
    assert!(lines[0].starts_with("T [degC],rho [kg/m^3],mu [mPa*s]"));
    let (code, stdout, _) = run(&[
        "properties",
        "water",
        "--from",
        "20degC",
        "--to",
        "20degC",
        "--unit",
        "viscosity=cP",
        "--format",
        "json",
    ]);
    assert_eq!(code, 0);
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    assert_close(
        json["rows"][0]["mu [cP]"].as_f64().unwrap(),
        si_value("water_viscosity(20 degC)") * 1e3,
        1e-12,
        "mu in cP",
    );
    for format in ["table", "markdown"] {
        let (code, _, _) = run(&["properties", "air", "--format", format]);
        assert_eq!(code, 0);
    }
    let (code, _, _) = run(&[
        "properties",
        "brine",
        "--salinity",
        "0.1",
        "--pressure",
        "5bar",
        "--from",
        "10degC",
        "--to",
        "30degC",
    ]);
    assert_eq!(code, 0);
    assert_eq!(
        run(&["properties", "brine"]).0,
        2,
        "brine needs salinity and pressure"
    );
    assert_eq!(run(&["properties", "water", "--step", "-1K"]).0, 2);
    assert_eq!(
        run(&["properties", "water", "--from", "90degC", "--to", "120degC"]).0,
        3,
        "steam is refused"
    );
    assert_eq!(
        run(&["properties", "water", "--unit", "viscosity=m"]).0,
        2,
        "wrong unit dimension"
    );
}
