//! `fit` lines on sheets: synthetic records from known parameters come back (the noise-free
//! case to 1e-8 relative), the report names each value with its uncertainty, and every refusal
//! says why at the right place.

use fluxsheet::eval::{evaluate_sheet, Evaluation, LineOutcome, LineResult, Severity, Shown};
use fluxsheet::library::Builtins;

fn evaluate(sheet: &str) -> Evaluation {
    evaluate_sheet(sheet, Builtins::standard())
}

fn line<'e>(evaluation: &'e Evaluation, name: &str) -> &'e LineOutcome {
    evaluation
        .lines
        .iter()
        .find(|line| line.name.as_deref() == Some(name))
        .unwrap_or_else(|| panic!("no line `{name}`"))
}

/// The SI value of a single-value line.
fn si(evaluation: &Evaluation, name: &str) -> f64 {
    match &line(evaluation, name).result {
        LineResult::Value(Shown::Scalar(shown)) => shown.quantity.value,
        other => panic!("`{name}`: {other:?} in {:?}", evaluation.diagnostics),
    }
}

/// The first error and the text its span covers.
fn first_error<'s>(evaluation: &Evaluation, sheet: &'s str) -> (String, &'s str) {
    let diagnostic = evaluation
        .diagnostics
        .iter()
        .find(|diagnostic| diagnostic.severity == Severity::Error)
        .unwrap_or_else(|| panic!("no error in {:?}", evaluation.diagnostics));
    (
        diagnostic.message.clone(),
        &sheet[diagnostic.span.start..diagnostic.span.end],
    )
}

/// A pumping test written from Theis with T = 2.5e-3 m^2/s and S = 2e-4 (the "true" values
/// appear only in the line that makes the record, never in the model).
const THEIS_RECORD: &str = "\
Q = 20 L/s
r = 40 m
t = 1 min to 2 d count 40 log
s_seen = theis_drawdown(Q, 2.5e-3 m^2/s, 2e-4, r, t)
T = 1e-3 m^2/s
S = 1e-5
s_model = theis_drawdown(Q, T, S, r, t)
";

#[test]
fn a_noise_free_drawdown_record_gives_t_and_s_back() {
    for log in ["", " log"] {
        let sheet = format!(
            "{THEIS_RECORD}T_fit = fit s_model to s_seen varying T, S{log}\n\
             S_fit = fit s_model to s_seen varying S, T{log}\n"
        );
        let evaluation = evaluate(&sheet);
        let t = si(&evaluation, "T_fit");
        let s = si(&evaluation, "S_fit");
        assert!(((t - 2.5e-3) / 2.5e-3).abs() < 1e-8, "T = {t}{log}");
        assert!(((s - 2e-4) / 2e-4).abs() < 1e-8, "S = {s}{log}");
        let note = line(&evaluation, "T_fit").note.clone().unwrap();
        assert!(note.starts_with("T = "), "{note}");
        for part in [
            "standard error",
            "95 % interval",
            "; S = ",
            "RMS residual",
            "iterations",
        ] {
            assert!(note.contains(part), "{note}");
        }
    }
}

#[test]
fn a_slug_test_record_gives_k_back() {
    let sheet = "\
t = 10 s to 600 s step 10 s
ratio_seen = hvorslev_head_ratio(3e-6 m/s, 2.5 cm, 5 cm, 1.5 m, t)
K = 1e-5 m/s
ratio_model = hvorslev_head_ratio(K, 2.5 cm, 5 cm, 1.5 m, t)
K_fit [m/s] = fit ratio_model to ratio_seen varying K log
";
    let evaluation = evaluate(sheet);
    let k = si(&evaluation, "K_fit");
    assert!(((k - 3e-6) / 3e-6).abs() < 1e-8, "K = {k}");
}

#[test]
fn a_noisy_record_gives_the_parameters_within_their_intervals() {
    // 1 % multiplicative noise from a fixed list (values of sin(7 i), so no generator).
    let noise: Vec<String> = (0..40)
        .map(|i| format!("{:.6}", 1.0 + 0.01 * (7.0 * f64::from(i)).sin()))
        .collect();
    let sheet = format!(
        "{THEIS_RECORD}noise = {{{}}}\nnoisy = s_seen * noise\n\
         T_fit = fit s_model to noisy varying T, S log\nS_fit = fit s_model to noisy varying S, T log\n",
        noise.join(", ")
    );
    let evaluation = evaluate(&sheet);
    let t = si(&evaluation, "T_fit");
    let s = si(&evaluation, "S_fit");
    assert!(((t - 2.5e-3) / 2.5e-3).abs() < 0.03, "T = {t}");
    assert!(((s - 2e-4) / 2e-4).abs() < 0.1, "S = {s}");
}

#[test]
fn fits_refuse_with_the_reason_at_the_right_name() {
    let cases: &[(&str, &str, &str)] = &[
        (
            "x = {1, 2, 3} m\na = 2\nb = 1\ny_seen = {2, 4, 6} m\ny = a * x\nf = fit y to y_seen varying a, b",
            "does not depend on `b`",
            "b",
        ),
        (
            "x = {1, 2, 3, 4} m\na = 2\nb = 1\ny_seen = {2, 4, 6, 8} m\ny = a * b * x\nf = fit y to y_seen varying a, b",
            "cannot identify",
            "",
        ),
        (
            "x = {1, 2, 3} m\na = 2\ny_seen = 4 m\ny = a * x\nf = fit y to y_seen varying a",
            "must be a column",
            "y_seen",
        ),
        (
            "x = {1, 2, 3} m\na = 2\ny_seen = {1, 2, 3} s\ny = a * x\nf = fit y to y_seen varying a",
            "cannot compare",
            "y",
        ),
        (
            "x = {1, 2, 3} m\na = 2\ny_seen = {1, 2} m\ny = a * x\nf = fit y to y_seen varying a",
            "one value per observation",
            "y",
        ),
        (
            "x = {1, 2} m\na = 2\nb = 1\ny_seen = {1, 2} m\ny = a * x + b * 1 m\nf = fit y to y_seen varying a, b",
            "more observations than parameters",
            "y_seen",
        ),
        (
            "x = {1, 2, 3} m\na = 2\ny_seen = {1, -2, 3} m\ny = a * x\nf = fit y to y_seen varying a log",
            "positive observations",
            "y_seen",
        ),
        (
            "x = {1, 2, 3} m\na = 2\ny_seen = {1, 2, 3} m\ny = a * x\nf = fit y to y_seen varying a, a",
            "varied twice",
            "a",
        ),
        (
            "x = {1, 2, 3} m\ny_seen = {1, 2, 3} m\ny = 2 * x\nf = fit y to y_seen varying c",
            "not a line of the sheet",
            "c",
        ),
    ];
    for (sheet, fragment, spanned) in cases {
        let evaluation = evaluate(sheet);
        let (message, text) = first_error(&evaluation, sheet);
        assert!(message.contains(fragment), "{sheet}\n{message}");
        if !spanned.is_empty() {
            assert_eq!(text, *spanned, "{sheet}\n{message}");
        } else {
            assert!(["a", "b"].contains(&text), "{sheet}: {text}");
        }
    }
}

#[test]
fn a_model_that_fails_during_the_fit_says_so_on_the_fit_line() {
    // S above 1 during the search is refused by theis_drawdown: the error names the fit.
    let sheet = "\
t = {1, 2, 4, 8} h
s_seen = {0.2, 0.5, 0.9, 1.2} m
T = 1e-3 m^2/s
S = 0.9
s_model = theis_drawdown(10 L/s, T, S, 30 m, t)
f = fit s_model to s_seen varying T, S
";
    let evaluation = evaluate(sheet);
    if let Some(diagnostic) = evaluation
        .diagnostics
        .iter()
        .find(|diagnostic| diagnostic.severity == Severity::Error)
    {
        assert!(
            diagnostic
                .labels
                .iter()
                .any(|(_, label)| label.contains("while fitting"))
                || diagnostic.message.contains("fit"),
            "{diagnostic:?}"
        );
    } else {
        // The search may also stay inside S <= 1 and succeed: then it is a value.
        assert!(si(&evaluation, "f") > 0.0);
    }
}
