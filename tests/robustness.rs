//! Generated input never panics: every string is a result or a diagnostic. Deep nesting is
//! refused with a clear error, not a stack overflow.

use crate::util::run_sheet;
use fluxsheet::eval::evaluate_sheet;
use fluxsheet::library::Builtins;
use proptest::prelude::*;

proptest! {
    #![proptest_config(ProptestConfig { cases: 2_000, ..ProptestConfig::default() })]

    /// Any text: the library returns values or diagnostics and never panics.
    #[test]
    fn any_text_evaluates_or_diagnoses(text in "\\PC{0,80}") {
        let evaluation = evaluate_sheet(&text, Builtins::standard());
        prop_assert!(evaluation.lines.len() <= text.split('\n').count());
    }

    /// Text built from the language's own tokens reaches deeper into the evaluator.
    #[test]
    fn token_soup_evaluates_or_diagnoses(tokens in proptest::collection::vec(prop_oneof![
        Just("x"), Just("y"), Just("="), Just("+"), Just("-"), Just("*"), Just("/"), Just("^"),
        Just("("), Just(")"), Just("["), Just("]"), Just("2"), Just("0"), Just("1e308"), Just("m"),
        Just("degC"), Just("mD"), Just(" "), Just("\n"), Just("sqrt("), Just("ln("), Just(","),
        Just("check "), Just("<="), Just("within"), Just("#"), Just("##"), Just("%"), Just("0.5"),
        Just("f("), Just("g(x) = "), Just("[m/s]"), Just("include \"a.fxs\""), Just("f(x [m]) = x"),
        Just("water_density("), Just("degF"), Just("-"), Just("^"), Just("(1/2)"),
        Just("{1, 2, 3} m"), Just("{"), Just("}"), Just(" to "), Just(" step "), Just(" count "),
        Just(" log"), Just("0 degC to 40 degC step 5 K"), Just("1 mD to 1 darcy count 4 log"),
        Just("solve y == 2 m for x between 0 m and 5 m"), Just("plot y against x"), Just("mean("),
        Just("geomean("), Just("layered_across("), Just("interpolate("), Just("min("), Just("count("),
        Just("hydraulic_conductivity(250 mD, "), Just("column k from \"c.csv\""),
    ], 0..40)) {
        let text: String = tokens.concat();
        let evaluation = evaluate_sheet(&text, Builtins::standard());
        for line in &evaluation.lines {
            match &line.result {
                fluxsheet::eval::LineResult::Value(fluxsheet::eval::Shown::Scalar(shown)) => {
                    prop_assert!(shown.value.is_finite() && shown.quantity.value.is_finite());
                }
                fluxsheet::eval::LineResult::Value(fluxsheet::eval::Shown::Column(shown)) => {
                    prop_assert!(shown.shown_values().all(f64::is_finite));
                }
                _ => {}
            }
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 48, ..ProptestConfig::default() })]

    /// The binary itself: exit 0, 1 or 3 with output, never a crash.
    #[test]
    fn binary_exits_cleanly_on_any_text(text in "\\PC{0,60}") {
        let (code, stdout, stderr) = run_sheet(&text, &[]);
        prop_assert!(matches!(code, 0 | 1 | 3), "exit {} for {:?}: {}", code, text, stderr);
        prop_assert!(!stderr.contains("panicked"));
        prop_assert!(!stdout.is_empty() || !stderr.is_empty() || text.trim().is_empty() || code == 0);
    }
}

#[test]
fn hundred_thousand_parentheses_are_refused_clearly() {
    let sheet = format!("x = {}1{}\n", "(".repeat(100_000), ")".repeat(100_000));
    let (code, _, stderr) = run_sheet(&sheet, &[]);
    assert_eq!(code, 3);
    assert!(
        stderr.contains("nesting too deep"),
        "{}",
        &stderr[..stderr.len().min(300)]
    );
}

#[test]
fn very_long_operator_chains_are_refused_clearly() {
    let sheet = format!("x = 1{}\n", " + 1".repeat(50_000));
    let (code, _, stderr) = run_sheet(&sheet, &[]);
    assert_eq!(code, 3);
    assert!(stderr.contains("expression too long"));
}

#[test]
fn non_utf8_input_is_a_clear_error() {
    let directory = tempfile::tempdir().unwrap();
    let path = directory.path().join("binary.fxs");
    std::fs::write(&path, [0xff, 0xfe, 0x00]).unwrap();
    let (code, _, stderr) = crate::util::run(&["run", path.to_str().unwrap()]);
    assert_eq!(code, 3);
    assert!(stderr.contains("not UTF-8"));
}
