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

// ----- provenance: every relation cites its formulation -----

/// The ids of the formulations a sheet's run used, from its JSON.
fn recorded_formulations(sheet: &str) -> Vec<String> {
    let (code, stdout, stderr) = run_sheet(sheet, &["--format", "json"]);
    assert_eq!(code, 0, "{sheet}: {stdout}{stderr}");
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    json["formulations"]
        .as_array()
        .unwrap()
        .iter()
        .map(|formulation| formulation["id"].as_str().unwrap().to_string())
        .collect()
}

#[test]
fn layered_means_cite_freeze_and_cherry() {
    let sheet = "K = {1e-4, 1e-6} m/s\nb = {2, 3} m\n\
K_along [m/s] = layered_along(K, b)\nK_across [m/s] = layered_across(K, b)\n";
    let (code, stdout, _) = run_sheet(sheet, &["--format", "json"]);
    assert_eq!(code, 0, "{stdout}");
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let cited: Vec<&str> = json["formulations"]
        .as_array()
        .unwrap()
        .iter()
        .map(|formulation| formulation["citation"].as_str().unwrap())
        .collect();
    // Freeze & Cherry 1979, eqs. 2.31 and 2.32 (equation numbers from memory).
    assert!(
        cited
            .iter()
            .any(|citation| citation.contains("Freeze") && citation.contains("eq. 2.31")),
        "{cited:?}"
    );
    assert!(
        cited
            .iter()
            .any(|citation| citation.contains("Freeze") && citation.contains("eq. 2.32")),
        "{cited:?}"
    );
    // The run footer names them, one line each; Markdown carries the citation.
    let (_, stdout, _) = run_sheet(sheet, &[]);
    assert!(
        stdout.contains("Formulations used:") && stdout.contains("  layered-along   "),
        "{stdout}"
    );
    let (_, markdown, _) = run_sheet(sheet, &["--format", "markdown"]);
    assert!(markdown.contains("eq. 2.31"), "{markdown}");
    // A refused call cites nothing.
    let refused = recorded_formulations("K = {1e-4, 1e-6} m/s\nb = {2, 3} m\nx = b / 1 m\n");
    assert!(refused.is_empty(), "{refused:?}");
}

/// Functions of numbers, not of a publication: mathematics (`math`'s table) and the column
/// utilities (aggregates and interpolation in a table). Everything else is a relation.
const COLUMN_UTILITIES: &[&str] = &[
    "sum",
    "mean",
    "geomean",
    "harmean",
    "count",
    "interpolate",
    "interpolate_log",
];

/// A call that succeeds for every relation, as (name, arguments as `number unit`). The column
/// form lists each number twice. Invented inputs, inside every published range.
const SAMPLE_CALLS: &[(&str, &[&str])] = &[
    ("air_density", &["20 degC", "101.325 kPa"]),
    (
        "bouwer_rice_conductivity",
        &["5 cm", "10 cm", "3 m", "5 m", "20 m", "120 s", "0.3"],
    ),
    (
        "bouwer_rice_head_ratio",
        &["1e-5 m/s", "5 cm", "10 cm", "3 m", "5 m", "20 m", "120 s"],
    ),
    (
        "dupuit_forchheimer_discharge",
        &["1e-4 m/s", "12 m", "8 m", "150 m"],
    ),
    (
        "dupuit_thiem_discharge",
        &["2e-4 m/s", "20 m", "15 m", "0.3 m", "250 m"],
    ),
    (
        "dupuit_thiem_head",
        &["20 L/s", "2e-4 m/s", "20 m", "0.3 m", "250 m"],
    ),
    ("equivalent_radius_area", &["60 m", "25 m"]),
    ("equivalent_radius_perimeter", &["60 m", "25 m"]),
    (
        "hantush_drawdown",
        &["15 L/s", "2e-3 m^2/s", "1e-4", "30 m", "1 d", "600 m"],
    ),
    ("hantush_well_function", &["0.01", "0.1"]),
    (
        "hvorslev_conductivity",
        &["2.5 cm", "5 cm", "1.5 m", "300 s"],
    ),
    (
        "hvorslev_head_ratio",
        &["1e-6 m/s", "2.5 cm", "5 cm", "1.5 m", "300 s"],
    ),
    ("sichardt_radius", &["4 m", "2e-4 m/s"]),
    (
        "specific_capacity",
        &["2e-3 m^2/s", "1e-4", "0.15 m", "1 d"],
    ),
    (
        "theis_recovery_drawdown",
        &["15 L/s", "2e-3 m^2/s", "1e-4", "30 m", "3 d", "2 d"],
    ),
    (
        "wells_theis_drawdown",
        &[
            "15 L/s",
            "0 m",
            "0 m",
            "2e-3 m^2/s",
            "1e-4",
            "1 d",
            "30 m",
            "5 m",
        ],
    ),
    (
        "wells_theis_drawdown_barrier",
        &[
            "15 L/s",
            "0 m",
            "0 m",
            "2e-3 m^2/s",
            "1e-4",
            "1 d",
            "30 m",
            "5 m",
            "100 m",
        ],
    ),
    (
        "wells_theis_drawdown_recharge",
        &[
            "15 L/s",
            "0 m",
            "0 m",
            "2e-3 m^2/s",
            "1e-4",
            "1 d",
            "30 m",
            "5 m",
            "100 m",
        ],
    ),
    (
        "wells_thiem_drawdown",
        &["15 L/s", "0 m", "0 m", "2e-3 m^2/s", "300 m", "30 m", "5 m"],
    ),
    (
        "wells_thiem_drawdown_recharge",
        &["15 L/s", "0 m", "0 m", "2e-3 m^2/s", "30 m", "5 m", "100 m"],
    ),
    ("air_viscosity", &["20 degC"]),
    ("archie_formation_factor", &["0.25", "1", "2"]),
    ("archie_porosity", &["40 ohm*m", "2 ohm*m", "1", "2"]),
    ("archie_resistivity", &["2 ohm*m", "0.25", "1", "2"]),
    ("brine_density", &["60 degC", "20 MPa", "0.1"]),
    ("brine_viscosity", &["60 degC", "0.1"]),
    (
        "constant_head_conductivity",
        &["1e-6 m^3/s", "0.1 m", "0.01 m^2", "0.5 m"],
    ),
    (
        "cooper_jacob_drawdown",
        &["0.01 m^3/s", "1e-3 m^2/s", "1e-4", "5 m", "1 d"],
    ),
    ("darcy_flux", &["1e-5 m/s", "0.01"]),
    (
        "darcy_flux_pressure",
        &[
            "1e-12 m^2",
            "1e-3 Pa*s",
            "-100 Pa/m",
            "1000 kg/m^3",
            "0 m/s^2",
        ],
    ),
    ("effective_diffusion", &["2e-9 m^2/s", "0.3"]),
    (
        "effective_diffusion_formation",
        &["2e-9 m^2/s", "10", "0.3"],
    ),
    (
        "falling_head_conductivity",
        &["1e-4 m^2", "0.1 m", "0.01 m^2", "600 s", "1 m", "0.5 m"],
    ),
    ("fick_flux", &["1e-9 m^2/s", "-10 mol/m^4"]),
    ("fourier_flux", &["2 W/(m*K)", "-0.03 K/m"]),
    (
        "geometric_mean_conductivity",
        &["3 W/(m*K)", "0.6 W/(m*K)", "0.3"],
    ),
    ("hazen_conductivity", &["0.2 mm"]),
    ("hydraulic_conductivity", &["40 mD", "12 degC"]),
    ("intrinsic_permeability", &["1e-5 m/s", "12 degC"]),
    (
        "klinkenberg_liquid_permeability",
        &["50 mD", "50 kPa", "200 kPa"],
    ),
    ("kozeny_carman_permeability", &["0.2 mm", "0.35"]),
    ("layered_across", &["1e-4 m/s", "2 m"]),
    ("layered_along", &["1e-4 m/s", "2 m"]),
    ("liner_leakage", &["1e-9 m/s", "0.3 m", "0.6 m"]),
    ("ohm_current_density", &["0.01 S/m", "-2 V/m"]),
    ("porous_fick_flux", &["0.35", "5e-10 m^2/s", "-10 mol/m^4"]),
    (
        "reynolds_number",
        &["1e-5 m/s", "0.5 mm", "1000 kg/m^3", "1e-3 Pa*s"],
    ),
    ("saturation_pressure", &["60 degC"]),
    ("seepage_velocity", &["1e-6 m/s", "0.25"]),
    (
        "theis_drawdown",
        &["0.01 m^3/s", "1e-3 m^2/s", "1e-4", "5 m", "1 d"],
    ),
    ("theis_well_function", &["0.01"]),
    ("thiem_discharge", &["1e-3 m^2/s", "2 m", "0.15 m", "300 m"]),
    (
        "thiem_drawdown",
        &["0.01 m^3/s", "1e-3 m^2/s", "0.15 m", "300 m"],
    ),
    ("transmissivity", &["1e-4 m/s", "20 m"]),
    ("travel_time", &["100 m", "1e-5 m/s"]),
    ("water_density", &["20 degC"]),
    ("water_kinematic_viscosity", &["20 degC"]),
    ("water_specific_heat", &["20 degC"]),
    ("water_thermal_conductivity", &["20 degC"]),
    ("water_viscosity", &["20 degC"]),
    (
        "archie_saturation",
        &["40 ohm*m", "0.05 ohm*m", "0.2", "1", "2", "2"],
    ),
    ("arps_resistivity", &["0.5 ohm*m", "24 degC", "80 degC"]),
    ("batzle_wang_brine_density", &["60 degC", "20 MPa", "0.1"]),
    ("batzle_wang_brine_viscosity", &["60 degC", "0.1"]),
    ("brine_specific_heat", &["60 degC", "20 MPa", "0.1"]),
    ("conductivity_at_25c", &["850 uS/cm", "12 degC", "0.02 1/K"]),
    ("dissolved_solids", &["900 uS/cm", "0.65 (mg/L)/(uS/cm)"]),
    ("geothermal_gradient", &["65 mW/m^2", "2.5 W/(m*K)"]),
    (
        "half_space_temperature",
        &["10 degC", "40 degC", "2 m", "30 d", "1e-6 m^2/s"],
    ),
    (
        "salt_brine_density",
        &["60 degC", "5 MPa", "0.05", "0.01", "0.02"],
    ),
    (
        "salt_brine_specific_heat",
        &["60 degC", "5 MPa", "0.05", "0.01", "0.02"],
    ),
    ("salt_brine_viscosity", &["60 degC", "0.05", "0.01", "0.02"]),
    ("seasonal_amplitude", &["10 K", "3 m", "8e-7 m^2/s", "1 yr"]),
    ("seasonal_lag", &["3 m", "8e-7 m^2/s", "1 yr"]),
    ("thermal_diffusivity", &["2.5 W/(m*K)", "2.5 MJ/(m^3*K)"]),
    (
        "thermal_peclet_number",
        &["0.1 m/yr", "4.18 MJ/(m^3*K)", "100 m", "2.5 W/(m*K)"],
    ),
    (
        "vertical_flow_temperature",
        &["10 degC", "16 degC", "40 m", "100 m", "1.3"],
    ),
    (
        "volumetric_heat_capacity",
        &[
            "0.3",
            "2650 kg/m^3",
            "0.84 kJ/(kg*K)",
            "1000 kg/m^3",
            "4.19 kJ/(kg*K)",
        ],
    ),
    ("consolidation_coefficient", &["2e-10 m/s", "0.5 m^2/MN"]),
    ("consolidation_degree", &["0.3"]),
    ("consolidation_time", &["0.9", "1.3 m^2/yr", "2.5 m"]),
    ("constrained_modulus", &["8 MPa", "0.3"]),
    ("diffusion_front_depth", &["30 yr", "5e-10 m^2/s", "0.1"]),
    (
        "dispersion_coefficient",
        &["0.5 m", "0.3 m/d", "1e-9 m^2/s"],
    ),
    ("geomembrane_leakage_free_flow", &["1 cm^2", "0.3 m"]),
    (
        "geomembrane_leakage_good_contact",
        &["1 cm^2", "0.3 m", "0.6 m", "1e-9 m/s"],
    ),
    (
        "geomembrane_leakage_poor_contact",
        &["1 cm^2", "0.3 m", "0.6 m", "1e-9 m/s"],
    ),
    ("half_space_diffusion", &["0.5 m", "30 yr", "5e-10 m^2/s"]),
    ("hooke_stress", &["8 MPa", "0.005"]),
    (
        "liner_breakthrough_time",
        &["0.9 m", "0.03 m/yr", "0.38", "2"],
    ),
    (
        "liner_solute_flux",
        &["0.03 m/yr", "1500 mg/L", "0.9 m", "0.38", "6.7e-10 m^2/s"],
    ),
    (
        "ogata_banks",
        &["20 m", "1 yr", "0.1 m/d", "2e-5 m^2/s", "1.5"],
    ),
    (
        "ogata_banks_decay",
        &["20 m", "1 yr", "0.1 m/d", "2e-5 m^2/s", "1.5", "0.1 1/yr"],
    ),
    ("peclet_number", &["0.1 m/yr", "0.9 m", "6e-10 m^2/s"]),
    ("primary_settlement", &["0.5 m^2/MN", "60 kPa", "5 m"]),
    ("retardation_factor", &["1.8 g/cm^3", "0.5 L/kg", "0.35"]),
    ("retarded_velocity", &["0.3 m/d", "3.6"]),
    ("time_factor", &["1.3 m^2/yr", "2 yr", "2.5 m"]),
    ("volume_compressibility", &["1.20", "1.12", "100 kPa"]),
];

/// `40 mD` as a two-row column, `{40, 40} mD`.
fn as_column(argument: &str) -> String {
    match argument.split_once(' ') {
        Some((number, unit)) => format!("{{{number}, {number}}} {unit}"),
        None => format!("{{{argument}, {argument}}}"),
    }
}

#[test]
fn every_relation_declares_and_records_its_formulations() {
    let builtins = fluxsheet::library::Builtins::standard();
    let (code, stdout, _) = run(&["functions", "--format", "json"]);
    assert_eq!(code, 0);
    let listing: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let mut relations = 0;
    for entry in listing.as_array().unwrap() {
        if entry["kind"] != "function" {
            continue;
        }
        let signature = entry["name"].as_str().unwrap();
        let name = signature.split('(').next().unwrap();
        let pure = fluxsheet::library::math::FUNCTIONS
            .iter()
            .any(|(math, _)| *math == name)
            || COLUMN_UTILITIES.contains(&name);
        if pure {
            continue;
        }
        relations += 1;
        let (_, builtin) = builtins
            .functions_sorted()
            .into_iter()
            .find(|(listed, _)| *listed == name)
            .unwrap();
        assert!(
            !builtin.formulations().is_empty() && !entry["source"].as_str().unwrap().is_empty(),
            "`{name}` computes a relation but cites no formulation"
        );
        let Some((_, arguments)) = SAMPLE_CALLS.iter().find(|(sample, _)| *sample == name) else {
            panic!("`{name}`: add a sample call to SAMPLE_CALLS so its provenance is checked");
        };
        let declared: Vec<&str> = builtin.formulations().iter().map(|f| f.id).collect();
        let columns: Vec<String> = arguments
            .iter()
            .map(|argument| as_column(argument))
            .collect();
        // The several-well functions take the wells as columns but the rest as values.
        let mut sheets = if name.starts_with("wells_") {
            vec![format!(
                "x = {name}({}, {})\n",
                columns[..3].join(", "),
                arguments[3..].join(", ")
            )]
        } else {
            vec![format!("x = {name}({})\n", columns.join(", "))]
        };
        if !name.starts_with("layered_") {
            sheets.push(format!("x = {name}({})\n", arguments.join(", ")));
        }
        for sheet in sheets {
            let mut recorded = recorded_formulations(&sheet);
            recorded.sort();
            let mut expected: Vec<String> = declared.iter().map(|id| id.to_string()).collect();
            expected.sort();
            assert_eq!(recorded, expected, "{sheet}");
        }
    }
    assert_eq!(
        relations,
        SAMPLE_CALLS.len(),
        "a sample call for a function that is gone"
    );
}

#[test]
fn the_conductivity_permeability_relation_is_cited_for_any_fluid() {
    // The (k, rho, mu) form uses no water formulation but still evaluates K = k rho g0 / mu.
    let recorded =
        recorded_formulations("K [m/s] = hydraulic_conductivity(40 mD, 1000 kg/m^3, 1 cP)\n");
    assert_eq!(recorded, ["conductivity-permeability"]);
    let recorded = recorded_formulations(
        "k [mD] = intrinsic_permeability({1e-5, 2e-5} m/s, 850 kg/m^3, 3 cP)\n",
    );
    assert_eq!(recorded, ["conductivity-permeability"]);
}
