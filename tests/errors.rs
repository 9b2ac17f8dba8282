//! Each error class on a small sheet: exit code 3 and the full rendered message (snapshots in
//! `tests/snapshots`, reviewed by hand; colour is off).

use crate::util::run_sheet;

/// Runs a sheet, asserts exit 3, returns stderr.
fn rendered_error(sheet: &str) -> String {
    let (code, _, stderr) = run_sheet(sheet, &[]);
    assert_eq!(
        code, 3,
        "expected a sheet error for:\n{sheet}\nstderr:\n{stderr}"
    );
    stderr
}

macro_rules! error_snapshot {
    ($name:ident, $sheet:expr) => {
        #[test]
        fn $name() {
            insta::assert_snapshot!(stringify!($name), rendered_error($sheet));
        }
    };
}

error_snapshot!(syntax_error_says_what_was_expected, "a = 2 m *\n");
error_snapshot!(
    unknown_name_suggests_a_close_one,
    "K_site = 2 m/s\nq = K_sit * 2\n"
);
error_snapshot!(unknown_unit_suggests_symbols, "p = 30 psia\n");
error_snapshot!(unknown_function_suggests, "x = sqr(4 m^2)\n");
error_snapshot!(
    duplicate_definition_names_both_lines,
    "k = 2 mD\nT = 9 degC\nk = 3 mD\n"
);
error_snapshot!(
    cycle_lists_the_whole_cycle,
    "a = b + 1 m\nb = c\nc = a\nd = 2 m\n"
);
error_snapshot!(adding_a_velocity_to_a_length, "x = 2 m + 3 m/s\n");
error_snapshot!(display_unit_of_wrong_dimension, "K [ft] = 2 m/s\n");
error_snapshot!(
    two_absolute_temperatures_do_not_add,
    "T = 20 degC + 5 degC\n"
);
error_snapshot!(
    difference_shown_in_degrees_celsius,
    "dT [degC] = 30 degC - 20 degC\n"
);
error_snapshot!(division_by_zero, "x = 2 m / 0\n");
error_snapshot!(logarithm_of_zero, "x = ln(0)\n");
error_snapshot!(overflow_is_an_error_not_inf, "x = 1e300 * 1e300\n");
error_snapshot!(exponent_with_a_unit, "x = 2 ^ (3 m)\n");
error_snapshot!(irrational_power_of_a_unit, "x = (2 m) ^ pi\n");
error_snapshot!(trigonometry_needs_an_angle, "x = sin(2 m)\n");
error_snapshot!(
    nesting_too_deep,
    &format!("x = {}1{}\n", "(".repeat(100), ")".repeat(100))
);
error_snapshot!(function_used_as_a_value, "x = sqrt * 2\n");

#[test]
fn all_independent_errors_are_reported_and_other_lines_evaluate() {
    let sheet = "a = 2 m + 1 s\nb = 3 m\nc = b * 2\nd = a * 2\ne = = 1\nf = nope\n";
    let (code, stdout, stderr) = run_sheet(sheet, &["--format", "json"]);
    assert_eq!(code, 3);
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    let lines: Vec<u64> = json["diagnostics"]
        .as_array()
        .unwrap()
        .iter()
        .map(|d| d["line"].as_u64().unwrap())
        .collect();
    // a (dimension), e (syntax), f (unknown name); d depends on a and is not reported again.
    assert_eq!(lines, vec![1, 5, 6], "{stderr}");
    let evaluated: Vec<&str> = json["lines"]
        .as_array()
        .unwrap()
        .iter()
        .map(|l| l["name"].as_str().unwrap())
        .collect();
    assert_eq!(evaluated, vec!["b", "c"]);
}

#[test]
fn a_line_after_its_dependents_still_evaluates_first() {
    let (code, stdout, _) = run_sheet(
        "q [m/d] = K * i\ni = 0.01\nK = 10 m/d\n",
        &["--format", "json"],
    );
    assert_eq!(code, 0);
    let json: serde_json::Value = serde_json::from_str(&stdout).unwrap();
    assert_eq!(json["lines"][0]["value"].as_f64().unwrap(), 0.1);
}
