//! The natural wrong attempts of a new user, each with the message and the fix it shows: one
//! snapshot of them all (reviewed by hand), and a check that each names its fix.

use crate::util::run_sheet;

/// (what a new user types, a fragment of the fix the message must show)
const WRONG_ATTEMPTS: &[(&str, &str)] = &[
    ("K = 3 ft/d [m/s]", "`K [m/s] = 3 ft/d`"),
    ("3 ft/d to m/s", "`3 ft/d [m/s]`"),
    ("K = 3 ft/d to m/s", "`K [m/s] = 3 ft/d`"),
    ("k = {1 mD, 2 D}", "`{1, 2000} mD`"),
    ("x == 1", "`check x == 1`"),
    ("x := 1", "`x = 1`"),
    ("let x = 1", "`x = 1`"),
    ("x = 1,5 m", "`x = 1.5 m`"),
    ("x = 2 ** 3", "`x = 2 ^ 3`"),
    ("A = 3 m**2", "`A = 3 m^2`"),
    ("x = [m] 3", "`x [m] = 3 m`"),
    ("check x", "`check t >= 0.9 m`"),
    ("check 1 m = 1 m", "`check 1 m == 1 m`"),
    ("p = 1 PA", "did you mean `Pa` (pascal)?"),
    ("k = 1 md", "did you mean `mD`"),
    ("mu = 1 cp", "did you mean `cP`"),
    ("p = 2 kpa", "did you mean `kPa`"),
    ("t = 1 a", "`yr` for a year"),
    ("m = 1 ton", "`ton_US` for a short ton"),
    ("gamma = 120 pcf", "`lbf/ft^3` for a unit weight"),
    (
        "dT = 60 degC\ngrad [K/km] = dT / 2 km",
        "`60 K` or `60 delta_degC`",
    ),
    (
        "Q [kJ] = 4186 J/(kg*K) * 1 kg * 10 degC",
        "`10 K` or `10 delta_degC`",
    ),
    ("T = -500 degF", "absolute zero is 0 K"),
    ("x = 2 b", "a product of a number and a name needs `*`"),
];

fn first_message(sheet: &str) -> String {
    let (code, stdout, stderr) = run_sheet(sheet, &[]);
    assert_eq!(code, 3, "{sheet}: {stdout}{stderr}");
    stderr
        .lines()
        .filter(|line| line.starts_with("error") || line.trim_start().starts_with("= help"))
        .take(2)
        .collect::<Vec<_>>()
        .join("\n")
}

#[test]
fn each_wrong_attempt_names_its_fix() {
    let mut all = String::new();
    for (attempt, fix) in WRONG_ATTEMPTS {
        let message = first_message(&format!("{attempt}\n"));
        assert!(message.contains(fix), "{attempt}: no {fix:?} in\n{message}");
        all.push_str(&format!("{attempt}\n{message}\n\n"));
    }
    insta::assert_snapshot!("wrong_attempts", all);
}

#[test]
fn a_star_after_a_slash_in_a_unit_is_warned() {
    let (code, _, stderr) = run_sheet("k [W/(m*K)] = 2.5 W/m*K\n", &[]);
    assert_eq!(code, 3, "the display unit's dimension differs: {stderr}");
    let (code, _, stderr) = run_sheet("k = 2.5 W/m*K\nq [W*K/m] = k\n", &[]);
    assert_eq!(code, 0, "{stderr}");
    assert!(stderr.contains("warning[unit-precedence]"), "{stderr}");
    assert!(stderr.contains("`W/(m*K)`"), "{stderr}");
}
