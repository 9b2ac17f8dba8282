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

#[test]
fn core_permeability_pins() {
    let json = run_json(&worksheet("core_permeability.fxs"));
    // K = k rho g / mu with mD = 1e-15/1.01325 m^2, cP = 1e-3 Pa s.
    let millidarcy = 1e-15 / 1.01325;
    let k_a = 420.0 * millidarcy * 998.2 * 9.80665 / 1.002e-3;
    assert_close(value(&json, "K_A"), k_a, 1e-12, "K_A");
    assert_close(
        value(&json, "K_A_field"),
        k_a * 86400.0 / 0.3048,
        1e-12,
        "K_A in ft/d",
    );
    let k_c = 1800.0 * millidarcy * 998.2 * 9.80665 / 1.002e-3;
    let gallon_per_day_per_square_foot = 0.003785411784 / 86400.0 / (0.3048 * 0.3048);
    assert_close(
        value(&json, "K_C_field"),
        k_c / gallon_per_day_per_square_foot,
        1e-12,
        "K_C",
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
