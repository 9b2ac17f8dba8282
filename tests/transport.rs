//! The transport and well functions through the real binary: trade units in, SI out, the
//! formulations a sheet used in its JSON, and refusals as sheet errors (exit 3) that point at
//! the offending argument. Reference values name their source; the unit tests beside each
//! function hold the full tables.

use crate::util::{assert_close, run, run_sheet, si_value};

const FT: f64 = 0.3048;

#[test]
fn liner_sheet_reproduces_a_published_example_and_lists_its_formulations() {
    // Kuo, J., 2014, Practical Design Calculations for Groundwater and Soil Remediation, 2nd
    // ed., CRC Press, example 3.3: 2 ft clay liner, K = 1e-7 cm/s, 1 ft of leachate,
    // n_e = 0.25; printed travel time 1,176 days (from a velocity rounded to 5.2e-2 cm/d).
    let sheet = "\
K_liner = 1e-7 cm/s
q [cm/s] = liner_leakage(K_liner, 1 ft, 2 ft)
v [cm/d] = seepage_velocity(q, 0.25)
t_through [d] = travel_time(2 ft, v)
check t_through == 1176 d within 0.1 %
";
    let (code, stdout, stderr) = run_sheet(sheet, &["--format", "json"]);
    assert_eq!(code, 0, "{stderr}{stdout}");
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let q = &json["lines"][1];
    assert_eq!(q["name"], "q");
    assert_close(
        q["value"].as_f64().unwrap(),
        1.5e-7,
        1e-12,
        "Darcy velocity, cm/s",
    );
    let ids: Vec<&str> = json["formulations"]
        .as_array()
        .unwrap()
        .iter()
        .map(|formulation| formulation["id"].as_str().unwrap())
        .collect();
    assert_eq!(
        ids,
        ["liner-leakage", "seepage-velocity", "advective-travel-time"]
    );
}

#[test]
fn theis_and_cooper_jacob_in_us_units_match_a_published_example() {
    // Kuo 2014, example 3.13: Q = 20 gpm, T = 12,000 gpd/ft, S = 0.005, r = 20 ft, t = 1 d;
    // printed W(u) = 7.50 at u = 3.12e-4, so s = 114.6 x 20 x 7.50 / 12,000 = 1.4325 ft.
    let theis = si_value("theis_drawdown(20 gpm, 12000 gal/(d*ft), 0.005, 20 ft, 1 d)");
    assert_close(theis, 1.4325 * FT, 3e-3, "Theis drawdown");
    let jacob = si_value("cooper_jacob_drawdown(20 gpm, 12000 gal/(d*ft), 0.005, 20 ft, 1 d)");
    assert_close(jacob, 1.4325 * FT, 3e-3, "Cooper-Jacob drawdown");
    let transmissivity = si_value("transmissivity(400 gal/(d*ft^2), 30 ft)");
    assert_close(
        transmissivity,
        si_value("12000 gal/(d*ft)"),
        1e-12,
        "T = K b",
    );
}

#[test]
fn thiem_in_us_units_matches_a_published_example() {
    // Kuo 2014, example 6.1: T = 6,000 gpd/ft, Q = 40 gpm, 5 ft of drawdown at 10 ft with a
    // radius of influence of 263 ft (R printed to three figures).
    let drawdown = si_value("thiem_drawdown(40 gpm, 6000 gal/(d*ft), 10 ft, 263 ft)");
    assert_close(drawdown, 5.0 * FT, 3e-3, "Thiem drawdown");
    let discharge = si_value("thiem_discharge(6000 gal/(d*ft), 5 ft, 10 ft, 263 ft)");
    assert_close(discharge, si_value("40 gpm"), 3e-3, "Thiem discharge");
}

#[test]
fn well_function_through_the_binary_matches_the_table() {
    // Published W(u) table (Huisman 1972, table 4.1): W(1e-10) = 22.4486, W(5) = 0.001148.
    assert!((si_value("theis_well_function(1e-10)") - 22.4486).abs() < 5e-5);
    assert!((si_value("theis_well_function(5)") - 0.001148).abs() < 5e-7);
}

#[test]
fn permeability_units_convert_on_the_way_in() {
    // Hazen's rule with d10 in mm and C as the trade's bare 100 or with its units: the rule's
    // own arithmetic, 100 x (0.02 cm)^2 = 0.04 cm/s.
    assert_close(
        si_value("hazen_conductivity(0.2 mm)"),
        4e-4,
        1e-12,
        "Hazen default C",
    );
    assert_close(
        si_value("hazen_conductivity(0.2 mm, 100 1/(cm*s))"),
        4e-4,
        1e-12,
        "Hazen C with units",
    );
    // 420 mD of water at 20 degC under 1 kPa/m, horizontal: q = (k/mu) 1000 Pa/m.
    let k = 420e-15 / 1.01325;
    assert_close(
        si_value("darcy_flux_pressure(420 mD, 1.002 cP, -1 kPa/m, 998.2 kg/m^3, 0 m/s^2)"),
        k / 1.002e-3 * 1000.0,
        1e-12,
        "Darcy in permeability form",
    );
    // Das, Principles of Geotechnical Engineering (from memory): falling head, a = 40 mm^2,
    // L = 200 mm, A = 1000 mm^2, 500 mm to 300 mm in 180 s gives 2.27e-3 cm/s.
    assert_close(
        si_value("falling_head_conductivity(40 mm^2, 200 mm, 1000 mm^2, 180 s, 500 mm, 300 mm)"),
        2.27e-5,
        2.5e-3,
        "falling head",
    );
}

#[test]
fn a_wrong_dimension_is_a_sheet_error_at_the_argument() {
    let (code, stdout, _) = run(&["eval", "--format", "json", "darcy_flux(1 m, 0.01)"]);
    assert_eq!(code, 3);
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let diagnostic = &json["diagnostics"][0];
    assert_eq!(
        diagnostic["message"],
        "`darcy_flux`: argument `K` must be a velocity (m/s), found a length (m)"
    );
    assert_eq!(diagnostic["column"], 12, "points at the first argument");

    let (code, _, stderr) = run(&[
        "eval",
        "theis_drawdown(20 gpm, 12000 gal/(d*ft), 0.005, 20 ft, 5 m)",
    ]);
    assert_eq!(code, 3);
    assert!(
        stderr.contains("argument `t` must be a time (s), found a length (m)"),
        "{stderr}"
    );
}

#[test]
fn arguments_outside_the_domain_are_sheet_errors() {
    let sheet = "\
n_bad = seepage_velocity(1e-5 m/s, 1.3)
early = cooper_jacob_drawdown(20 gpm, 12000 gal/(d*ft), 0.005, 200 ft, 10 min)
fine_silt = hazen_conductivity(0.02 mm)
falling = falling_head_conductivity(40 mm^2, 200 mm, 1000 mm^2, 180 s, 300 mm, 500 mm)
ok = thiem_drawdown(40 gpm, 6000 gal/(d*ft), 10 ft, 263 ft)
";
    let (code, stdout, stderr) = run_sheet(sheet, &["--format", "json"]);
    assert_eq!(code, 3, "{stderr}");
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let messages: Vec<&str> = json["diagnostics"]
        .as_array()
        .unwrap()
        .iter()
        .map(|diagnostic| diagnostic["message"].as_str().unwrap())
        .collect();
    assert_eq!(messages.len(), 4, "{messages:?}");
    assert_eq!(
        messages[0],
        "`seepage_velocity`: `n_e` is an effective porosity and must lie in (0, 1]"
    );
    assert!(
        messages[1].contains("use `theis_drawdown`"),
        "{}",
        messages[1]
    );
    assert!(
        messages[2].contains("0.02 mm is outside 0.1 to 3 mm"),
        "{}",
        messages[2]
    );
    assert!(
        messages[3].contains("`h2` must be below `h1`"),
        "{}",
        messages[3]
    );
    // The line that does not depend on an error still evaluates.
    assert_eq!(json["lines"].as_array().unwrap().len(), 1);
    assert_eq!(json["lines"][0]["name"], "ok");
}

#[test]
fn the_listing_shows_the_relations_with_their_sources() {
    let (code, stdout, _) = run(&["functions", "theis", "--format", "csv"]);
    assert_eq!(code, 0);
    assert!(stdout.contains("theis_drawdown(Q, T, S, r, t)"), "{stdout}");
    assert!(stdout.contains("Theis, C. V., 1935"), "{stdout}");
}

/// The README's list of built-ins is written by hand; this keeps it complete: every relation's
/// first form appears as its signature, and every other built-in by name.
#[test]
fn the_readme_lists_every_builtin() {
    use fluxsheet::eval::Library;
    let readme =
        std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/README.md")).unwrap();
    let library = fluxsheet::library::Builtins::standard();
    let mut missing = Vec::new();
    for relation in library.relations() {
        let signature = library.function(relation.name).unwrap().signature();
        let first_form = signature.split(" or ").next().unwrap();
        if !readme.contains(&format!("`{first_form}`")) {
            missing.push(first_form.to_string());
        }
    }
    for (name, _) in library.functions_sorted() {
        let as_word = |text: &str| {
            text.split(|character: char| !(character.is_alphanumeric() || character == '_'))
                .any(|word| word == name)
        };
        if !as_word(&readme) {
            missing.push(name.to_string());
        }
    }
    assert!(missing.is_empty(), "not in the README: {missing:?}");
}

#[test]
fn fixed_unit_geomembrane_equations_take_any_units_of_the_right_dimension() {
    // Giroud (1997) is fitted in m^2, m and m/s: a hole of 100 mm^2 under 300 mm of head on
    // 60 cm of clay at 1e-7 cm/s must leak what the SI inputs give, in any result unit.
    let trade =
        si_value("geomembrane_leakage_good_contact(100 mm^2, 300 mm, 60 cm, 1e-7 cm/s) [L/d]");
    let base = si_value("geomembrane_leakage_good_contact(1e-4 m^2, 0.3 m, 0.6 m, 1e-9 m/s)");
    assert_close(trade, base, 1e-14, "same leakage in trade units");
    let fitted = 0.21
        * (1.0 + 0.1 * 0.5_f64.powf(0.95))
        * 1e-4_f64.powf(0.1)
        * 0.3_f64.powf(0.9)
        * 1e-9_f64.powf(0.74);
    assert_close(
        base,
        fitted,
        1e-13,
        "Giroud 1997 in its fitted units (m^3/s)",
    );
}

#[test]
fn a_liner_sheet_couples_retardation_dispersion_and_breakthrough() {
    // Kd in mL/g and bulk density in g/cm^3: R = 1 + 1.7 * 2 / 0.35 (Freeze & Cherry 1979
    // eq. 9.14, hand arithmetic); the retarded plug-flow time is R times the unretarded one.
    let sheet = "\
R = retardation_factor(1.7 g/cm^3, 2 mL/g, 0.35)
t_plain [yr] = liner_breakthrough_time(0.9 m, 0.03 m/yr, 0.35)
t_retarded [yr] = liner_breakthrough_time(0.9 m, 0.03 m/yr, 0.35, R)
D [m^2/s] = dispersion_coefficient(0.01 m, 0.03 m/yr / 0.35, 6e-10 m^2/s)
c_half = ogata_banks(0.9 m, t_retarded, 0.03 m/yr / 0.35, D, R)
";
    let (code, stdout, stderr) = run_sheet(sheet, &["--format", "json"]);
    assert_eq!(code, 0, "{stderr}{stdout}");
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let line = |index: usize| json["lines"][index]["value"].as_f64().unwrap();
    let retardation = 1.0 + 1.7 * 2.0 / 0.35;
    assert_close(line(0), retardation, 1e-14, "R");
    assert_close(line(2), line(1) * retardation, 1e-14, "retarded time");
    // At the retarded advective time the first Ogata–Banks term is erfc(0) = 1: c/c0 is one
    // half plus the (positive) second term.
    assert!(line(4) > 0.5 && line(4) < 1.0, "{}", line(4));
}
