//! No silent wrong numbers: each input that once printed a plausible wrong value with exit 0
//! now gives the right value or an error that names the fix in the user's own numbers.

use crate::util::{assert_close, fluxsheet, outcome, run, run_sheet, si_value};
use std::fs;

/// `fluxsheet eval EXPR`: (exit code, stdout, stderr).
fn eval(expression: &str) -> (i32, String, String) {
    run(&["eval", "--", expression])
}

/// Asserts that `expression` is refused (exit 3) with every fragment in the message.
fn assert_refused(expression: &str, fragments: &[&str]) {
    let (code, stdout, stderr) = eval(expression);
    assert_eq!(code, 3, "{expression}: {stdout}{stderr}");
    for fragment in fragments {
        assert!(
            stderr.contains(fragment),
            "{expression}: missing {fragment:?} in\n{stderr}"
        );
    }
}

// -- Offset-scale temperatures never enter a product, quotient or power as kelvin -------------

#[test]
fn a_celsius_value_divided_by_a_length_is_refused_with_both_readings() {
    let (code, _, stderr) = run_sheet("dT = 60 degC\ngrad [K/km] = dT / 2 km\n", &[]);
    assert_eq!(code, 3, "{stderr}");
    for fragment in [
        "60 degC (`dT`)",
        "`60 K`",
        "`60 delta_degC`",
        "`kelvin(dT)` (333.15 K)",
    ] {
        assert!(stderr.contains(fragment), "missing {fragment:?}:\n{stderr}");
    }
    // Either reading, once said, gives its own number: 60 K over 2 km is 30 K/km.
    let (code, stdout, stderr) = run_sheet("dT = 60 K\ngrad [K/km] = dT / 2 km\n", &[]);
    assert_eq!(code, 0, "{stderr}");
    assert!(stdout.contains("30"), "{stdout}");
}

#[test]
fn heat_and_flux_with_offset_literals_are_refused_and_differences_work() {
    assert_refused(
        "4186 J/(kg*K) * 1 kg * 10 degC [kJ]",
        &["10 degC", "`10 K` or `10 delta_degC`", "kelvin(10 degC)"],
    );
    assert_refused(
        "1.2 W/(m*K) * 11 degF / 1.5 m",
        &["11 degF", "`11 delta_degF`"],
    );
    // 4186 J/(kg K) × 1 kg × 10 K = 41.86 kJ (hand arithmetic).
    assert_close(
        si_value("4186 J/(kg*K) * 1 kg * 10 delta_degC [kJ]"),
        41_860.0,
        1e-12,
        "heat for a 10 K rise",
    );
    // 1.2 W/(m K) × (11 × 5/9) K / 1.5 m (hand arithmetic).
    assert_close(
        si_value("1.2 W/(m*K) * 11 delta_degF / 1.5 m"),
        1.2 * 11.0 * 5.0 / 9.0 / 1.5,
        1e-12,
        "Fourier flux for an 11 degF difference",
    );
}

#[test]
fn kelvin_is_the_one_spelling_for_the_absolute_reading() {
    // Ideal-gas density of dry air at 20 degC: p / (R_specific T), hand arithmetic.
    assert_close(
        si_value("101325 Pa / (287.05 J/(kg*K) * kelvin(20 degC))"),
        101_325.0 / (287.05 * 293.15),
        1e-12,
        "air density",
    );
    assert_close(
        si_value("kelvin(68 degF)"),
        293.15,
        1e-12,
        "68 degF in kelvin",
    );
    assert_refused("kelvin(5 delta_degC)", &["temperature difference"]);
    assert_refused("kelvin(3 m)", &["temperature"]);
}

#[test]
fn powers_negation_and_non_temperature_functions_refuse_offset_temperatures() {
    assert_refused("(20 degC)^2", &["raised to a power", "kelvin(20 degC)"]);
    assert_refused("sqrt(20 degC)", &["passed to `sqrt`"]);
    assert_refused("abs(20 degC)", &["passed to `abs`"]);
    let (code, _, stderr) = run_sheet("T = 20 degC\nx = -T\n", &[]);
    assert_eq!(code, 3);
    assert!(
        stderr.contains("negated") && stderr.contains("kelvin(T)"),
        "{stderr}"
    );
    // A leading minus on a literal is part of the number: minus forty degrees Fahrenheit.
    assert_close(si_value("-40 degF [degC]"), 233.15, 1e-12, "-40 degF");
}

#[test]
fn what_takes_an_absolute_temperature_keeps_working() {
    let sheet = "\
T = 20 degC
T_hot = 68 degF
rho [kg/m^3] = water_density(T)
rise [K] = T_hot - T
T_F [degF] = T
warmest [degC] = max(T, T_hot)
T_mid = mean({10, 30} degC)
check T < 30 degC
check T_hot == 20 degC
";
    let (code, stdout, stderr) = run_sheet(sheet, &["--format", "json"]);
    assert_eq!(code, 0, "{stderr}{stdout}");
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let value = |name: &str| {
        json["lines"]
            .as_array()
            .unwrap()
            .iter()
            .find(|line| line["name"] == name)
            .unwrap()["si_value"]
            .as_f64()
            .unwrap()
    };
    assert!(value("rise").abs() < 1e-9, "68 degF is 20 degC");
    assert_close(value("T_F"), 293.15, 1e-12, "shown in degF, held in K");
    assert_close(value("T_mid"), 293.15, 1e-12, "mean of 10 and 30 degC");
    // Rankine and kelvin start at absolute zero: they multiply as written.
    assert_close(
        si_value("300 degR * 2"),
        300.0 * 5.0 / 9.0 * 2.0,
        1e-12,
        "degR",
    );
    assert_close(si_value("300 K * 2"), 600.0, 1e-12, "K");
}

#[test]
fn offset_temperatures_from_every_source_are_refused_in_products() {
    let folder = tempfile::tempdir().unwrap();
    fs::write(folder.path().join("t.csv"), "T [degC]\n10\n20\n").unwrap();
    let data_sheet = folder.path().join("data.fxs");
    fs::write(&data_sheet, "T = column T from \"t.csv\"\nE = T * 2 J/K\n").unwrap();
    let (code, _, stderr) = run(&["run", data_sheet.to_str().unwrap()]);
    assert_eq!(code, 3, "data file: {stderr}");
    assert!(stderr.contains("cannot be multiplied"), "{stderr}");

    let (code, _, stderr) = run_sheet("T = 300 K\nE = T * 2 J/K\n", &["--set", "T=20 degC"]);
    assert_eq!(code, 3, "--set: {stderr}");
    assert!(stderr.contains("20 degC"), "{stderr}");

    let (code, _, stderr) = run_sheet("heat(T) = T * 2 J/K\nE = heat(20 degC)\n", &[]);
    assert_eq!(code, 3, "sheet function: {stderr}");
    assert!(stderr.contains("cannot be multiplied"), "{stderr}");

    let (code, _, stderr) = outcome(
        fluxsheet()
            .args(["repl"])
            .env("FLUXSHEET_HISTORY", "off")
            .write_stdin("T = 20 degC\nT * 2 J/K\n"),
    );
    assert_eq!(code, 3, "session: {stderr}");
    assert!(stderr.contains("kelvin(T)"), "{stderr}");
}

// -- Nothing below absolute zero -----------------------------------------------------------

#[test]
fn temperatures_below_absolute_zero_are_refused_wherever_made_or_shown() {
    assert_refused("-500 degF [K]", &["below absolute zero", "-500 degF"]);
    assert_refused("-10 K [degC]", &["below absolute zero"]);
    assert_refused("-1 degR", &["below absolute zero"]);
    assert_refused("20 degC - 300 K", &["-280 degC is below absolute zero"]);
    assert_refused("{10, -500} degF", &["below absolute zero"]);
    let (code, _, stderr) = run_sheet("T = {10, 20} degC\nT2 = T - 290 K\n", &[]);
    assert_eq!(code, 3);
    assert!(
        stderr.contains("below absolute zero") && stderr.contains("row 1"),
        "{stderr}"
    );
    // A hand-written gas density can no longer come out negative.
    assert_refused(
        "101325 Pa / (287.05 J/(kg*K) * kelvin(-500 degF))",
        &["below absolute zero"],
    );
    let folder = tempfile::tempdir().unwrap();
    fs::write(folder.path().join("t.csv"), "T [degF]\n50\n-500\n").unwrap();
    let sheet = folder.path().join("s.fxs");
    fs::write(&sheet, "T = column T from \"t.csv\"\n").unwrap();
    let (code, _, stderr) = run(&["run", sheet.to_str().unwrap()]);
    assert_eq!(code, 3);
    assert!(stderr.contains("below absolute zero"), "{stderr}");
    // A temperature difference may be negative.
    assert_close(si_value("-10 K"), -10.0, 1e-12, "a negative difference");
}

// -- Checks at the boundary --------------------------------------------------------------

#[test]
fn every_comparison_has_the_same_rounding_allowance_both_ways() {
    // 0.3 + 0.3 + 0.3 is 0.8999999999999999 in binary and 0.3 + 0.6 is 0.8999999999999999:
    // equal to 0.9 within rounding, so the non-strict comparisons pass and the strict fail.
    let cases = [
        ("t = 0.3 m + 0.3 m + 0.3 m\ncheck t >= 0.9 m\n", 0),
        ("t = 0.3 m + 0.3 m + 0.3 m\ncheck t <= 0.9 m\n", 0),
        ("t = 0.3 m + 0.6 m\ncheck t < 0.9 m\n", 1),
        ("t = 0.3 m + 0.3 m + 0.3 m\ncheck t > 0.9 m\n", 1),
        ("t = 0.1 m + 0.2 m\ncheck t <= 0.3 m\n", 0),
        ("t = 0.1 m + 0.2 m\ncheck t > 0.3 m\n", 1),
        ("t = 0.1 m + 0.2 m\ncheck 0.3 m >= t\n", 0),
        // Beyond the allowance (1e-9 relative) a difference is a difference.
        ("t = 0.9 m - 1 nm\ncheck t < 0.9 m\n", 0),
        ("t = 0.9 m + 1 nm\ncheck t <= 0.9 m\n", 1),
        ("t = 0.9 m + 1 nm\ncheck t > 0.9 m\n", 0),
        // An explicit tolerance replaces the allowance, as documented.
        ("t = 0.95 m\ncheck t <= 0.9 m within 10 %\n", 0),
    ];
    for (sheet, expected) in cases {
        let (code, stdout, stderr) = run_sheet(sheet, &[]);
        assert_eq!(code, expected, "{sheet}{stdout}{stderr}");
    }
}

// -- Physical domains on every built-in ---------------------------------------------------

/// One call per built-in with a value outside its physical domain or published range, and a
/// word the refusal must contain. Every built-in appears (checked below), so a new one needs
/// a line here.
const OUT_OF_DOMAIN: &[(&str, &str, &str)] = &[
    ("bouwer_rice_conductivity", "bouwer_rice_conductivity(5 cm, 10 cm, 3 m, 25 m, 20 m, 120 s, 0.3)", "`Lw` must not exceed `D`"),
    ("bouwer_rice_head_ratio", "bouwer_rice_head_ratio(1e-5 m/s, 5 cm, 10 cm, 6 m, 5 m, 20 m, 120 s)", "`Le` must not exceed `Lw`"),
    ("dupuit_forchheimer_discharge", "dupuit_forchheimer_discharge(1e-4 m/s, 12 m, 8 m, 0 m)", "positive"),
    ("dupuit_thiem_discharge", "dupuit_thiem_discharge(2e-4 m/s, 20 m, 15 m, 300 m, 250 m)", "larger than `r`"),
    ("dupuit_thiem_head", "dupuit_thiem_head(1 m^3/s, 2e-4 m/s, 20 m, 0.3 m, 250 m)", "below the base"),
    ("equivalent_radius_area", "equivalent_radius_area(-60 m, 25 m)", "positive"),
    ("equivalent_radius_perimeter", "equivalent_radius_perimeter(60 m, 0 m)", "positive"),
    ("hantush_drawdown", "hantush_drawdown(15 L/s, 2e-3 m^2/s, 1e-4, 30 m, 1 d, 2 m)", "above 10"),
    ("hantush_well_function", "hantush_well_function(0.01, -0.1)", "negative"),
    ("hvorslev_conductivity", "hvorslev_conductivity(2.5 cm, 5 cm, 1.5 m, 300 s, 1.2)", "(0, 1)"),
    ("hvorslev_head_ratio", "hvorslev_head_ratio(1e-6 m/s, 2.5 cm, 5 cm, 0.3 m, 300 s)", "not above 8"),
    ("sichardt_radius", "sichardt_radius(-4 m, 2e-4 m/s)", "positive"),
    ("specific_capacity", "specific_capacity(2e-3 m^2/s, 0, 0.15 m, 1 d)", "(0, 1]"),
    ("theis_recovery_drawdown", "theis_recovery_drawdown(15 L/s, 2e-3 m^2/s, 1e-4, 30 m, 1 d, 2 d)", "after `tp`"),
    ("wells_theis_drawdown", "wells_theis_drawdown({10, 20} L/s, {0, 50} m, {0, 0} m, 2e-3 m^2/s, 1e-4, -1 d, 20 m, 5 m)", "above 0"),
    ("wells_theis_drawdown_barrier", "wells_theis_drawdown_barrier({10, 20} L/s, {0, 50} m, {0, 0} m, 2e-3 m^2/s, 1e-4, 1 d, 20 m, 5 m, 30 m)", "same side"),
    ("wells_theis_drawdown_recharge", "wells_theis_drawdown_recharge({10, 20} L/s, {0, 50} m, {0, 0} m, 2e-3 m^2/s, 2, 1 d, 20 m, 5 m, 100 m)", "(0, 1]"),
    ("wells_thiem_drawdown", "wells_thiem_drawdown({10, 20} L/s, {0, 50} m, {0, 0} m, 2e-3 m^2/s, 30 m, 20 m, 50 m)", "radius of influence"),
    ("wells_thiem_drawdown_recharge", "wells_thiem_drawdown_recharge({10, 20} L/s, {0, 50} m, {0} m, 2e-3 m^2/s, 20 m, 5 m, 100 m)", "one row per well"),
    ("abs", "abs(20 degC)", "absolute temperature"),
    ("air_density", "air_density(20 degC, -1 bar)", "positive"),
    ("air_viscosity", "air_viscosity(100 K)", "170 K"),
    (
        "archie_formation_factor",
        "archie_formation_factor(1.2, 1, 2)",
        "(0, 1]",
    ),
    (
        "archie_porosity",
        "archie_porosity(-10 ohm*m, 1 ohm*m, 1, 2)",
        "positive",
    ),
    (
        "archie_resistivity",
        "archie_resistivity(-1 ohm*m, 0.2, 1, 2)",
        "positive",
    ),
    (
        "brine_density",
        "brine_density(20 degC, 1 bar, -0.1)",
        "must lie in [0, 1]",
    ),
    (
        "brine_viscosity",
        "brine_viscosity(20 degC, 0.5)",
        "fitted limit",
    ),
    (
        "constant_head_conductivity",
        "constant_head_conductivity(1 L/s, -1 m, 1 m^2, 1 m)",
        "positive",
    ),
    (
        "cooper_jacob_drawdown",
        "cooper_jacob_drawdown(1 L/s, 1e-3 m^2/s, 1.5, 10 m, 1 d)",
        "(0, 1]",
    ),
    ("cos", "cos(3 m)", "dimensionless"),
    ("count", "count({1, 2} m, 3 m)", "argument"),
    ("darcy_flux", "darcy_flux(-1e-5 m/s, 0.01)", "negative"),
    (
        "darcy_flux_pressure",
        "darcy_flux_pressure(1 D, -1 cP, 1 Pa/m, 1000 kg/m^3, 0 m/s^2)",
        "positive",
    ),
    (
        "effective_diffusion",
        "effective_diffusion(-1e-9 m^2/s, 0.5)",
        "negative",
    ),
    (
        "effective_diffusion_formation",
        "effective_diffusion_formation(1e-9 m^2/s, 10, 1.5)",
        "(0, 1]",
    ),
    ("exp", "exp(2 m)", "dimensionless"),
    (
        "falling_head_conductivity",
        "falling_head_conductivity(1 cm^2, 10 cm, 20 cm^2, 1 h, 50 cm, 60 cm)",
        "below",
    ),
    ("fick_flux", "fick_flux(-1e-9 m^2/s, 1 mol/m^4)", "negative"),
    (
        "fourier_flux",
        "fourier_flux(-2 W/(m*K), 0.03 K/m)",
        "negative",
    ),
    ("geomean", "geomean({1, -2} mD)", "greater than 0"),
    (
        "geometric_mean_conductivity",
        "geometric_mean_conductivity(3 W/(m*K), 0.6 W/(m*K), 0)",
        "(0, 1]",
    ),
    ("harmean", "harmean({1, 0} mD)", "greater than 0"),
    (
        "hazen_conductivity",
        "hazen_conductivity(5 mm)",
        "0.1 to 3 mm",
    ),
    (
        "hydraulic_conductivity",
        "hydraulic_conductivity(-1 darcy, 20 degC)",
        "negative",
    ),
    (
        "interpolate",
        "interpolate({1, 2} m, {3, 4} s, 5 m)",
        "outside",
    ),
    (
        "interpolate_log",
        "interpolate_log({1, 2} m, {3, -4} s, 1.5 m)",
        "greater than 0",
    ),
    (
        "intrinsic_permeability",
        "intrinsic_permeability(-1e-5 m/s, 20 degC)",
        "negative",
    ),
    ("kelvin", "kelvin(-5 K)", "absolute zero"),
    (
        "klinkenberg_liquid_permeability",
        "klinkenberg_liquid_permeability(-1 mD, 1 bar, 2 bar)",
        "negative",
    ),
    (
        "kozeny_carman_permeability",
        "kozeny_carman_permeability(0.2 mm, 1)",
        "(0, 1)",
    ),
    (
        "layered_across",
        "layered_across({1, 2} m/s, {-1, 3} m)",
        "greater than 0",
    ),
    (
        "layered_along",
        "layered_along({1, -2} m/s, {1, 1} m)",
        "0 or greater",
    ),
    (
        "liner_leakage",
        "liner_leakage(-1e-9 m/s, 0.3 m, 1 m)",
        "negative",
    ),
    ("ln", "ln(-1)", "negative"),
    ("log10", "log10(0)", "zero"),
    ("max", "max(1 m, 2 s)", "argument"),
    ("mean", "mean({1, 2} m, 3 m)", "argument"),
    ("min", "min(1 m, 2 s)", "argument"),
    (
        "ohm_current_density",
        "ohm_current_density(-0.01 S/m, 1 V/m)",
        "negative",
    ),
    (
        "porous_fick_flux",
        "porous_fick_flux(0, 1e-10 m^2/s, 1 mol/m^4)",
        "(0, 1]",
    ),
    (
        "reynolds_number",
        "reynolds_number(1e-4 m/s, -1 mm, 1000 kg/m^3, 1 cP)",
        "positive",
    ),
    (
        "saturation_pressure",
        "saturation_pressure(400 degC)",
        "647",
    ),
    (
        "seepage_velocity",
        "seepage_velocity(1e-6 m/s, 1.3)",
        "(0, 1]",
    ),
    ("sin", "sin(2 K)", "dimensionless"),
    ("sqrt", "sqrt(-4 m^2)", "negative"),
    ("sum", "sum({1, 2} degC)", "absolute temperature"),
    ("tan", "tan(1 s)", "dimensionless"),
    (
        "theis_drawdown",
        "theis_drawdown(1 L/s, -1e-3 m^2/s, 1e-4, 10 m, 1 d)",
        "positive",
    ),
    (
        "theis_well_function",
        "theis_well_function(-0.1)",
        "positive",
    ),
    (
        "thiem_discharge",
        "thiem_discharge(1e-3 m^2/s, 1 m, 10 m, 5 m)",
        "larger than",
    ),
    (
        "thiem_drawdown",
        "thiem_drawdown(1 L/s, 1e-3 m^2/s, -1 m, 100 m)",
        "positive",
    ),
    (
        "transmissivity",
        "transmissivity(-1e-5 m/s, 10 m)",
        "negative",
    ),
    ("travel_time", "travel_time(-5 m, 1 m/d)", "negative"),
    (
        "water_density",
        "water_density(20 degC, -1 bar)",
        "positive",
    ),
    (
        "water_kinematic_viscosity",
        "water_kinematic_viscosity(-5 degC)",
        "273.15 K",
    ),
    (
        "water_specific_heat",
        "water_specific_heat(400 degC, 200 bar)",
        "623.15 K",
    ),
    (
        "water_thermal_conductivity",
        "water_thermal_conductivity(20 degC, 200 MPa)",
        "100 MPa",
    ),
    (
        "water_viscosity",
        "water_viscosity(20 degC, 0 Pa)",
        "positive",
    ),
    (
        "archie_saturation",
        "archie_saturation(40 ohm*m, 0.05 ohm*m, 0, 1, 2, 2)",
        "(0, 1]",
    ),
    (
        "arps_resistivity",
        "arps_resistivity(0.5 ohm*m, 24 degC, 250 degC)",
        "outside",
    ),
    (
        "batzle_wang_brine_density",
        "batzle_wang_brine_density(20 degC, 1 bar, -0.1)",
        "below 0",
    ),
    (
        "batzle_wang_brine_viscosity",
        "batzle_wang_brine_viscosity(20 degC, 0.5)",
        "above 0.3",
    ),
    (
        "brine_specific_heat",
        "brine_specific_heat(130 degC, 1 MPa, 0.1)",
        "fitted range",
    ),
    (
        "brine_thermal_conductivity",
        "brine_thermal_conductivity(60 degC, 1 MPa, 0.3)",
        "outside 0 to 0.26",
    ),
    (
        "brine_viscosity",
        "brine_viscosity(60 degC, 40 MPa, 0.1)",
        "outside 0.1 to 35 MPa",
    ),
    (
        "conductivity_at_25c",
        "conductivity_at_25c(850 uS/cm, 50 degC)",
        "outside",
    ),
    (
        "dissolved_solids",
        "dissolved_solids(900 uS/cm, -0.6 (mg/L)/(uS/cm))",
        "positive",
    ),
    (
        "geothermal_gradient",
        "geothermal_gradient(65 mW/m^2, 0 W/(m*K))",
        "positive",
    ),
    (
        "half_space_temperature",
        "half_space_temperature(10 degC, 40 degC, 2 m, -1 d, 1e-6 m^2/s)",
        "positive",
    ),
    (
        "salt_brine_density",
        "salt_brine_density(20 degC, 1 bar, 0.1, -0.01, 0)",
        "KCl mass fraction",
    ),
    (
        "salt_brine_specific_heat",
        "salt_brine_specific_heat(20 degC, 1 bar, 0.05, 0, 0.01)",
        "fitted range for CaCl2",
    ),
    (
        "salt_brine_viscosity",
        "salt_brine_viscosity(120 degC, 0.05, 0, 0.01)",
        "fitted range for CaCl2",
    ),
    (
        "seasonal_amplitude",
        "seasonal_amplitude(10 K, -1 m, 8e-7 m^2/s, 1 yr)",
        "must not be negative",
    ),
    (
        "seasonal_lag",
        "seasonal_lag(3 m, 0 m^2/s, 1 yr)",
        "positive",
    ),
    (
        "thermal_diffusivity",
        "thermal_diffusivity(-2 W/(m*K), 2 MJ/(m^3*K))",
        "positive",
    ),
    (
        "thermal_peclet_number",
        "thermal_peclet_number(0.1 m/yr, 4.18 MJ/(m^3*K), 0 m, 2.5 W/(m*K))",
        "positive",
    ),
    (
        "vertical_flow_temperature",
        "vertical_flow_temperature(10 degC, 16 degC, 120 m, 100 m, 1.3)",
        "must not exceed",
    ),
    (
        "volumetric_heat_capacity",
        "volumetric_heat_capacity(1.5, 2650 kg/m^3, 0.84 kJ/(kg*K), 1000 kg/m^3, 4.19 kJ/(kg*K))",
        "(0, 1]",
    ),
    (
        "consolidation_coefficient",
        "consolidation_coefficient(1e-9 m/s, -0.5 m^2/MN)",
        "positive",
    ),
    (
        "consolidation_degree",
        "consolidation_degree(-0.1)",
        "negative",
    ),
    (
        "consolidation_time",
        "consolidation_time(1, 1.3 m^2/yr, 2.5 m)",
        "(0, 1)",
    ),
    (
        "constrained_modulus",
        "constrained_modulus(8 MPa, 0.5)",
        "0.5",
    ),
    (
        "diffusion_front_depth",
        "diffusion_front_depth(30 yr, 5e-10 m^2/s, 1)",
        "(0, 1)",
    ),
    (
        "dispersion_coefficient",
        "dispersion_coefficient(-0.5 m, 0.3 m/d, 1e-9 m^2/s)",
        "negative",
    ),
    (
        "geomembrane_leakage_free_flow",
        "geomembrane_leakage_free_flow(1 cm^2, 0.3 m, 1.2)",
        "(0, 1]",
    ),
    (
        "geomembrane_leakage_good_contact",
        "geomembrane_leakage_good_contact(1 cm^2, 0.3 m, 0 m, 1e-9 m/s)",
        "positive",
    ),
    (
        "geomembrane_leakage_poor_contact",
        "geomembrane_leakage_poor_contact(1 cm^2, -0.3 m, 0.6 m, 1e-9 m/s)",
        "negative",
    ),
    (
        "half_space_diffusion",
        "half_space_diffusion(0.5 m, 0 yr, 5e-10 m^2/s)",
        "positive",
    ),
    ("hooke_stress", "hooke_stress(-8 MPa, 0.5 %)", "positive"),
    (
        "liner_breakthrough_time",
        "liner_breakthrough_time(0.9 m, -0.03 m/yr, 0.38)",
        "positive",
    ),
    (
        "liner_solute_flux",
        "liner_solute_flux(0.03 m/yr, 1500 mg/L, 0.9 m, 1.2, 6.7e-10 m^2/s)",
        "(0, 1]",
    ),
    (
        "ogata_banks",
        "ogata_banks(20 m, 1 yr, 0.1 m/d, 0 m^2/s)",
        "positive",
    ),
    (
        "ogata_banks_decay",
        "ogata_banks_decay(20 m, 1 yr, 0.1 m/d, 2e-5 m^2/s, 1.5, -0.1 1/yr)",
        "negative",
    ),
    (
        "peclet_number",
        "peclet_number(0.1 m/yr, -0.9 m, 6e-10 m^2/s)",
        "negative",
    ),
    (
        "primary_settlement",
        "primary_settlement(0.45, 1.3, 0 kPa, 60 kPa, 5 m)",
        "positive",
    ),
    (
        "retardation_factor",
        "retardation_factor(1.8 g/cm^3, -0.5 L/kg, 0.35)",
        "negative",
    ),
    (
        "retarded_velocity",
        "retarded_velocity(0.3 m/d, 0)",
        "positive",
    ),
    (
        "time_factor",
        "time_factor(1.3 m^2/yr, -2 yr, 2.5 m)",
        "negative",
    ),
    (
        "volume_compressibility",
        "volume_compressibility(1.12, 1.20, 100 kPa)",
        "fall",
    ),
];

#[test]
fn every_builtin_refuses_values_outside_its_domain_with_the_range() {
    for (_, expression, fragment) in OUT_OF_DOMAIN {
        assert_refused(expression, &[fragment]);
    }
}

#[test]
fn columns_are_held_to_the_same_domains_on_every_row() {
    // Row kernels skip the per-call checks after row 1, so the domain must live in them too.
    assert_refused(
        "hydraulic_conductivity({1, -1} darcy, 20 degC)",
        &["negative", "row 2"],
    );
    assert_refused(
        "intrinsic_permeability({1e-5, -1e-5} m/s, 20 degC)",
        &["negative", "row 2"],
    );
    assert_refused(
        "hydraulic_conductivity({1, -1} darcy, 998 kg/m^3, 1 cP)",
        &["negative", "row 2"],
    );
}

#[test]
fn the_domain_table_names_every_builtin() {
    let (code, stdout, _) = run(&["functions", "--format", "json"]);
    assert_eq!(code, 0);
    let listing: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let missing: Vec<String> = listing
        .as_array()
        .unwrap()
        .iter()
        .filter(|entry| entry["kind"] == "function")
        .map(|entry| {
            let signature = entry["name"].as_str().unwrap();
            signature[..signature.find('(').unwrap()].to_string()
        })
        .filter(|name| !OUT_OF_DOMAIN.iter().any(|(listed, _, _)| listed == name))
        .collect();
    assert!(
        missing.is_empty(),
        "built-ins without a domain test: {missing:?}"
    );
}

// -- Units that differ only by letter case -----------------------------------------------

#[test]
fn units_that_differ_only_by_case_are_refused_or_suggested_in_the_right_case() {
    assert_refused(
        "1 PA",
        &["`PA`", "letter case", "did you mean `Pa` (pascal)"],
    );
    for (typed, meant) in [
        ("md", "mD"),
        ("cp", "cP"),
        ("kpa", "kPa"),
        ("KPa", "kPa"),
        ("MPA", "MPa"),
        ("CP", "cP"),
    ] {
        assert_refused(&format!("1 {typed}"), &[&format!("did you mean `{meant}`")]);
    }
    // Correct spellings are untouched.
    assert_close(si_value("1 mPa*s"), 1e-3, 1e-15, "mPa*s");
    assert_close(si_value("1 MPa"), 1e6, 1e-15, "MPa");
}

// -- Oracle: random sheets against an independent f64 recomputation ----------------------

mod oracle {
    //! Random sheets are built from inputs with known SI values and combined with `+ - * /`
    //! and squares. An independent model recomputes each line in plain `f64` with a running
    //! bound on its rounding error, and predicts which lines must be errors (dimensions that do
    //! not match, an offset temperature in a product, absolute zero, division by zero, and
    //! anything depending on an error). Every value the engine gives must match the model
    //! within the bound, and every predicted error must be an error.
    //!
    //! Cases: `FLUXSHEET_ORACLE_CASES` (default 2 000 in the test suite).

    use fluxsheet::eval::{evaluate_sheet, LineResult, Shown};
    use fluxsheet::library::Builtins;
    use proptest::prelude::*;

    /// Exponents of L, M, T and temperature.
    type Dimension = [i32; 4];

    #[derive(Clone, Copy, PartialEq, Debug)]
    enum Temperature {
        /// `degC`, `degF`: absolute on an offset scale.
        Offset,
        Difference,
        Plain,
    }

    /// Units with their factors to SI, written from their definitions, not from the catalog.
    const UNITS: &[(&str, f64, Dimension, Temperature)] = &[
        ("m", 1.0, [1, 0, 0, 0], Temperature::Plain),
        ("cm", 0.01, [1, 0, 0, 0], Temperature::Plain),
        ("ft", 0.3048, [1, 0, 0, 0], Temperature::Plain), // NIST SP 811, B.8 (exact)
        ("s", 1.0, [0, 0, 1, 0], Temperature::Plain),
        ("d", 86_400.0, [0, 0, 1, 0], Temperature::Plain), // SI Brochure, Table 8
        ("kg", 1.0, [0, 1, 0, 0], Temperature::Plain),
        ("lb", 0.453_592_37, [0, 1, 0, 0], Temperature::Plain), // NIST SP 811, B.8 (exact)
        ("kPa", 1000.0, [-1, 1, -2, 0], Temperature::Plain),
        ("cP", 1e-3, [-1, 1, -1, 0], Temperature::Plain),
        ("mD", 1e-15 / 1.01325, [2, 0, 0, 0], Temperature::Plain), // darcy: 1e-12/1.01325 m^2
        ("K", 1.0, [0, 0, 0, 1], Temperature::Plain),
        ("delta_degC", 1.0, [0, 0, 0, 1], Temperature::Difference),
        ("degC", 1.0, [0, 0, 0, 1], Temperature::Offset),
    ];

    /// A line as the model sees it.
    #[derive(Clone, Copy, Debug)]
    enum Expected {
        /// SI value, bound on its rounding error, dimension, temperature kind.
        Value(f64, f64, Dimension, Temperature),
        /// The engine must report an error (or skip the line).
        Error,
        /// Too close to a boundary (zero, overflow) to predict: not checked.
        Unknown,
    }

    const ULP: f64 = f64::EPSILON;

    fn input(number: f64, unit: usize) -> Expected {
        let (_, factor, dimension, temperature) = UNITS[unit];
        let value = if temperature == Temperature::Offset {
            number + 273.15
        } else {
            number * factor
        };
        if temperature == Temperature::Offset && value < 0.0 {
            return Expected::Error;
        }
        // The engine rounds an exact decimal product once; the model rounds up to twice.
        Expected::Value(
            value,
            4.0 * ULP * value.abs() + 1e-300,
            dimension,
            temperature,
        )
    }

    fn combine(operator: char, left: Expected, right: Expected) -> Expected {
        use Temperature::{Difference, Offset, Plain};
        let (a, ea, da, ta, b, eb, db, tb) = match (left, right) {
            (Expected::Error, _) | (_, Expected::Error) => return Expected::Error,
            (Expected::Unknown, _) | (_, Expected::Unknown) => return Expected::Unknown,
            (Expected::Value(a, ea, da, ta), Expected::Value(b, eb, db, tb)) => {
                (a, ea, da, ta, b, eb, db, tb)
            }
        };
        let is_temperature = da == [0, 0, 0, 1];
        match operator {
            '+' | '-' => {
                if da != db {
                    return Expected::Error;
                }
                let adding = operator == '+';
                let kind = if !is_temperature {
                    Plain
                } else {
                    match (adding, ta, tb) {
                        (true, Offset, Offset) => return Expected::Error,
                        (true, Offset, _) | (true, _, Offset) => Offset,
                        (false, Offset | Plain, Offset) => Difference,
                        (false, Difference, Offset) => return Expected::Error,
                        (false, Offset, _) => Offset,
                        (_, Difference, _) | (_, _, Difference) => Difference,
                        _ => Plain,
                    }
                };
                let value = if adding { a + b } else { a - b };
                let error = ea + eb + ULP * value.abs();
                if kind == Offset && value < 0.0 {
                    return if value.abs() <= error {
                        Expected::Unknown
                    } else {
                        Expected::Error
                    };
                }
                Expected::Value(value, error, da, kind)
            }
            '*' | '/' => {
                if ta == Offset && is_temperature || tb == Offset && db == [0, 0, 0, 1] {
                    return Expected::Error;
                }
                let dimension: Dimension = std::array::from_fn(|index| {
                    if operator == '*' {
                        da[index] + db[index]
                    } else {
                        da[index] - db[index]
                    }
                });
                let dimensionless = |d: Dimension| d == [0, 0, 0, 0];
                let kind = if (ta == Difference && is_temperature && dimensionless(db))
                    || (operator == '*'
                        && tb == Difference
                        && db == [0, 0, 0, 1]
                        && dimensionless(da))
                {
                    Difference
                } else {
                    Plain
                };
                if operator == '*' {
                    let value = a * b;
                    let error = b.abs() * ea + a.abs() * eb + ea * eb + ULP * value.abs();
                    Expected::Value(value, error, dimension, kind)
                } else {
                    if b.abs() <= eb {
                        // Zero within rounding: the engine may divide or refuse.
                        return if b == 0.0 && eb <= 1e-300 {
                            Expected::Error
                        } else {
                            Expected::Unknown
                        };
                    }
                    let value = a / b;
                    let error = (ea + value.abs() * eb) / (b.abs() - eb) + ULP * value.abs();
                    Expected::Value(value, error, dimension, kind)
                }
            }
            _ => unreachable!("the generator makes only + - * /"),
        }
    }

    fn square(operand: Expected) -> Expected {
        match operand {
            Expected::Value(_, _, _, Temperature::Offset) => Expected::Error,
            Expected::Value(a, ea, d, _) => Expected::Value(
                a * a,
                2.0 * a.abs() * ea + ea * ea + ULP * a * a,
                d.map(|exponent| 2 * exponent),
                Temperature::Plain,
            ),
            other => other,
        }
    }

    /// A generated sheet: input lines, then computed lines over earlier names.
    #[derive(Debug, Clone)]
    struct Plan {
        inputs: Vec<(f64, usize)>,
        /// (left operand, operator, right operand, square the result); an operand is an
        /// earlier line's index or, when `None`, the plain number 2.
        computed: Vec<(usize, char, usize, bool)>,
    }

    fn plan() -> impl Strategy<Value = Plan> {
        let number = prop_oneof![
            (-500i32..500).prop_map(|n| f64::from(n) / 4.0),
            (1.0f64..1e3),
            (1e-9f64..1e-3),
        ];
        let inputs = proptest::collection::vec((number, 0..UNITS.len()), 2..6);
        inputs.prop_flat_map(|inputs| {
            let count = inputs.len();
            let step = (
                0usize..64,
                prop::sample::select(vec!['+', '-', '*', '/']),
                0usize..64,
                prop::bool::weighted(0.15),
            );
            proptest::collection::vec(step, 1..8).prop_map(move |steps| Plan {
                inputs: inputs.clone(),
                computed: steps
                    .into_iter()
                    .enumerate()
                    .map(|(index, (l, op, r, sq))| {
                        (l % (count + index), op, r % (count + index), sq)
                    })
                    .collect(),
            })
        })
    }

    fn sheet_and_model(plan: &Plan) -> (String, Vec<Expected>) {
        let mut text = String::new();
        let mut model = Vec::new();
        for (index, (number, unit)) in plan.inputs.iter().enumerate() {
            text.push_str(&format!("x{index} = {number} {}\n", UNITS[*unit].0));
            model.push(input(*number, *unit));
        }
        for (left, operator, right, squared) in &plan.computed {
            let index = model.len();
            let mut expected = combine(*operator, model[*left], model[*right]);
            let mut expression = format!("x{left} {operator} x{right}");
            if *squared {
                expected = square(expected);
                expression = format!("({expression})^2");
            }
            if let Expected::Value(value, ..) = expected {
                if !(value.abs() < 1e300 && (value == 0.0 || value.abs() > 1e-300)) {
                    expected = Expected::Unknown;
                }
            }
            text.push_str(&format!("x{index} = {expression}\n"));
            model.push(expected);
        }
        (text, model)
    }

    fn cases() -> u32 {
        std::env::var("FLUXSHEET_ORACLE_CASES")
            .ok()
            .and_then(|text| text.parse().ok())
            .unwrap_or(2_000)
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(cases()))]

        #[test]
        fn every_value_matches_an_independent_recomputation(plan in plan()) {
            let (text, model) = sheet_and_model(&plan);
            let evaluation = evaluate_sheet(&text, Builtins::standard());
            for (index, expected) in model.iter().enumerate() {
                let line = &evaluation.lines[index];
                let value = match &line.result {
                    LineResult::Value(Shown::Scalar(shown)) => Some(shown.quantity.value),
                    LineResult::Error | LineResult::Skipped { .. } => None,
                    other => panic!("line {}: {other:?}", index + 1),
                };
                match (expected, value) {
                    (Expected::Value(want, bound, ..), Some(got)) => prop_assert!(
                        (got - want).abs() <= 2.0 * bound,
                        "line {}: engine {got:e}, model {want:e} (±{bound:e})\n{text}", index + 1
                    ),
                    (Expected::Value(want, ..), None) => prop_assert!(
                        false, "line {}: error where the model has {want:e}\n{text}\n{:?}",
                        index + 1, evaluation.diagnostics
                    ),
                    (Expected::Error, Some(got)) => prop_assert!(
                        false, "line {}: printed {got:e} where an error was due\n{text}", index + 1
                    ),
                    (Expected::Error, None) | (Expected::Unknown, _) => {}
                }
            }
        }
    }
}

#[test]
fn eval_shows_the_warnings_about_its_expression() {
    let (code, stdout, stderr) = eval("sin(30)");
    assert_eq!(code, 0);
    assert!(stdout.starts_with("-0.988"), "{stdout}");
    assert!(stderr.contains("sin(30 deg)"), "{stderr}");
}

#[test]
fn absolute_temperatures_show_on_the_scale_they_were_written_on() {
    for (expression, shown) in [
        ("20 degC + 5 K", "25 degC\n"),
        ("mean({10, 20} degC)", "15 degC\n"),
        ("68 degF - 5 delta_degF", "63 degF\n"),
        ("20 degC + 5 K [K]", "298.2 K\n"),
    ] {
        let (code, stdout, stderr) = eval(expression);
        assert_eq!(code, 0, "{expression}: {stderr}");
        assert_eq!(stdout, shown, "{expression}");
    }
}
