//! Every demo sheet runs clean; its key values are pinned by a computation done here in plain
//! Rust from the sheet's inputs and exact unit definitions, not by re-reading our own output.

use crate::util::{assert_close, fluxsheet, worksheet};
use std::path::PathBuf;

fn run_json(path: &PathBuf) -> serde_json::Value {
    let output = fluxsheet()
        .args(["run", "--format", "json"])
        .arg(path)
        .output()
        .unwrap();
    assert_eq!(
        output.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&output.stderr)
    );
    serde_json::from_slice(&output.stdout).unwrap()
}

fn value(json: &serde_json::Value, name: &str) -> f64 {
    json["lines"]
        .as_array()
        .unwrap()
        .iter()
        .find(|line| line["name"] == name)
        .unwrap_or_else(|| panic!("no line `{name}`"))["value"]
        .as_f64()
        .unwrap()
}

#[test]
fn every_demo_sheet_runs_clean() {
    let directory = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("worksheets");
    let mut count = 0;
    for entry in std::fs::read_dir(directory).unwrap() {
        let path = entry.unwrap().path();
        if path.extension().is_some_and(|extension| extension == "fxs") {
            let json = run_json(&path);
            assert!(
                json["diagnostics"].as_array().unwrap().is_empty(),
                "{}",
                path.display()
            );
            assert!(json["checks"]
                .as_array()
                .unwrap()
                .iter()
                .all(|check| check["passed"] == true));
            count += 1;
        }
    }
    assert!(count >= 2);
}

/// Water density and viscosity from the independent `seuif97` crate (IF97 and IAPWS 2008 as
/// implemented there), K = k rho g0 / mu, mD = 1e-15/1.01325 m^2.
#[test]
fn core_permeability_pins() {
    use seuif97::{pt, OD, ODV};
    let json = run_json(&worksheet("core_permeability.fxs"));
    let conductivity = |millidarcy: f64, celsius: f64| {
        let pressure_mpa = 0.101325;
        let density = pt(pressure_mpa, celsius, (OD, 1));
        let viscosity = pt(pressure_mpa, celsius, (ODV, 1));
        millidarcy * 1e-15 / 1.01325 * density * 9.80665 / viscosity
    };
    assert_close(
        value(&json, "K_lab_A"),
        conductivity(420.0, 20.0),
        1e-11,
        "K_lab_A",
    );
    assert_close(value(&json, "K_A"), conductivity(420.0, 9.0), 1e-11, "K_A");
    assert_close(value(&json, "K_C"), conductivity(1800.0, 9.0), 1e-11, "K_C");
    assert_close(
        value(&json, "K_A_field"),
        conductivity(420.0, 9.0) * 86400.0 / 0.3048,
        1e-11,
        "ft/d",
    );
    let gallon_per_day_per_square_foot = 0.003785411784 / 86400.0 / (0.3048 * 0.3048);
    assert_close(
        value(&json, "K_C_field"),
        conductivity(1800.0, 9.0) / gallon_per_day_per_square_foot,
        1e-11,
        "gpd/ft2",
    );
    assert_close(
        value(&json, "correction"),
        conductivity(1.0, 9.0) / conductivity(1.0, 20.0),
        1e-11,
        "correction",
    );
}

/// Batzle & Wang (1992), Geophysics 57(11): eq. 27a/27b (density, g/cm^3, T in degC, P in MPa,
/// S mass fraction) and eq. 32 (viscosity, cP), typed here from the equations as printed in
/// the paper and its public reproductions (from memory), independently of `src/library/brine.rs`.
#[test]
fn hot_brine_reservoir_pins() {
    let json = run_json(&worksheet("hot_brine_reservoir.fxs"));
    let (t, s) = (82.0f64, 0.08f64);
    let p = 3200.0 * 0.45359237 * 9.80665 / 0.0254 / 0.0254 / 1e6; // psi -> MPa
    let water = 1.0
        + 1e-6
            * (-80.0 * t - 3.3 * t * t + 0.00175 * t.powi(3) + 489.0 * p - 2.0 * t * p
                + 0.016 * t * t * p
                - 1.3e-5 * t.powi(3) * p
                - 0.333 * p * p
                - 0.002 * t * p * p);
    let brine = water
        + s * (0.668
            + 0.44 * s
            + 1e-6
                * (300.0 * p - 2400.0 * p * s
                    + t * (80.0 + 3.0 * t - 3300.0 * s - 13.0 * p + 47.0 * p * s)));
    assert_close(value(&json, "rho_b"), brine * 1000.0, 1e-12, "rho_b");
    let viscosity_cp = 0.1
        + 0.333 * s
        + (1.65 + 91.9 * s.powi(3))
            * (-(0.42 * (s.powf(0.8) - 0.17).powi(2) + 0.045) * t.powf(0.8)).exp();
    assert_close(value(&json, "mu_b"), viscosity_cp, 1e-12, "mu_b");
    let millidarcy = 1e-15 / 1.01325;
    let psi = 0.45359237 * 9.80665 / 0.0254 / 0.0254;
    let flux = 185.0 * millidarcy / (viscosity_cp * 1e-3) * (450.0 * psi) / (1200.0 * 0.3048); // m/s
    assert_close(value(&json, "q"), flux * 86400.0, 1e-12, "q");
    let rate = flux * 86400.0 * 38.0 * 0.3048 * 300.0;
    assert_close(value(&json, "Q"), rate, 1e-12, "Q");
    assert_close(
        value(&json, "Q_field"),
        rate / (42.0 * 0.003785411784),
        1e-12,
        "bbl/d",
    );
}

#[test]
fn sand_aquifer_seepage_pins() {
    let json = run_json(&worksheet("sand_aquifer_seepage.fxs"));
    let gradient = (42.35 - 41.10) / (250.0 * 0.3048);
    let darcy_flux = 35.0 * 0.3048 * gradient; // m/d
    assert_close(value(&json, "q"), darcy_flux, 1e-12, "q");
    assert_close(value(&json, "v"), darcy_flux / 0.28, 1e-12, "v");
    let travel_days = 0.4 * 1609.344 / (darcy_flux / 0.28);
    assert_close(
        value(&json, "travel_time"),
        travel_days / 365.25,
        1e-12,
        "travel time",
    );
    let flow = darcy_flux * 120.0 * 8.0; // m^3/d
    assert_close(value(&json, "Q"), flow, 1e-12, "Q");
    assert_close(
        value(&json, "Q_us"),
        flow / 0.003785411784 / 1440.0,
        1e-12,
        "Q in gpm",
    );
}
