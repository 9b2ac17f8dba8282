//! Uncertainty: distributions sampled by `run --samples N`. Statistics against closed forms
//! and against samples regenerated here from the stated generator; reproducibility across
//! thread counts; refusals (exit 3) for distributions that do not make sense; truncation,
//! domains and the temperature rules on every sample.

use crate::util::run_sheet;
use rand::SeedableRng;
use rand_distr::Distribution;

/// `run --format json --samples N …` of a sheet, parsed; the exit code must be `expected`.
fn sampled_json(sheet: &str, arguments: &[&str], expected: i32) -> serde_json::Value {
    let mut all = vec!["--format", "json"];
    all.extend_from_slice(arguments);
    let (code, stdout, stderr) = run_sheet(sheet, &all);
    assert_eq!(code, expected, "{stderr}{stdout}");
    serde_json::from_str(&stdout).unwrap_or_else(|error| panic!("{error}: {stdout}"))
}

/// The summary of line `name`.
fn spread<'j>(json: &'j serde_json::Value, name: &str) -> &'j serde_json::Value {
    json["samples"]["lines"]
        .as_array()
        .and_then(|lines| lines.iter().find(|line| line["name"] == name))
        .unwrap_or_else(|| panic!("no spread of `{name}` in {json}"))
}

fn number(value: &serde_json::Value) -> f64 {
    value
        .as_f64()
        .unwrap_or_else(|| panic!("not a number: {value}"))
}

/// The standard normal scores of one input, regenerated from the generator the README
/// states: ChaCha8 seeded with the seed, one stream per block of 8192 samples, inputs drawn
/// one after another in file order, each score from `rand_distr::StandardNormal`.
fn scores(seed: u64, samples: usize, inputs: usize, input: usize) -> Vec<f64> {
    const BLOCK: usize = 8192;
    let mut all = Vec::with_capacity(samples);
    for block in 0..samples.div_ceil(BLOCK) {
        let len = BLOCK.min(samples - block * BLOCK);
        let mut generator = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
        generator.set_stream(block as u64);
        for drawn in 0..inputs {
            let block_scores: Vec<f64> = (0..len)
                .map(|_| rand_distr::StandardNormal.sample(&mut generator))
                .collect();
            if drawn == input {
                all.extend(block_scores);
            }
        }
    }
    all
}

/// Definition 7 of Hyndman & Fan (1996), written out again: linear between the order
/// statistics at h = (n − 1) p.
fn percentile_by_hand(values: &[f64], p: f64) -> f64 {
    let mut sorted = values.to_vec();
    sorted.sort_by(f64::total_cmp);
    let h = (sorted.len() - 1) as f64 * p / 100.0;
    let (low, high) = (h.floor() as usize, h.ceil() as usize);
    sorted[low] + (h - low as f64) * (sorted[high] - sorted[low])
}

/// Φ(z) by Simpson's rule over the normal density from -12 to z: independent of the erfc the
/// program uses.
fn normal_cdf_by_quadrature(z: f64) -> f64 {
    let steps = 20_000;
    let (a, width) = (-12.0, (z + 12.0) / steps as f64);
    let density = |x: f64| (-0.5 * x * x).exp() / (2.0 * std::f64::consts::PI).sqrt();
    let mut sum = density(a) + density(z);
    for step in 1..steps {
        let weight = if step % 2 == 1 { 4.0 } else { 2.0 };
        sum += weight * density(a + step as f64 * width);
    }
    sum * width / 3.0
}

/// The product and the quotient of independent log-normals are log-normal: ln(a b) has mean
/// ln(m_a m_b) and standard deviation sqrt(s_a² + s_b²). Checked at a fixed seed to within
/// four standard errors (σ / sqrt(n) for the mean of the logarithm, σ / sqrt(2 n) for its
/// standard deviation).
#[test]
fn products_and_quotients_of_log_normals_are_log_normal() {
    let sheet = "a = lognormal median 2 m factor 1.5
b = lognormal median 3 s sdln 0.3
p = a * b
r = a / b
ln_p = ln(p / (1 m*s))
ln_r = ln(r / (1 m/s))
";
    let samples: f64 = 40_000.0;
    let json = sampled_json(sheet, &["--samples", "40000", "--seed", "5"], 0);
    let sigma = (1.5f64.ln().powi(2) + 0.3f64.powi(2)).sqrt();
    for (name, median) in [("ln_p", 6f64.ln()), ("ln_r", (2.0f64 / 3.0).ln())] {
        let line = spread(&json, name);
        let mean_error = sigma / samples.sqrt();
        let sd_error = sigma / (2.0 * samples).sqrt();
        assert!(
            (number(&line["mean"]) - median).abs() < 4.0 * mean_error,
            "{name}: {line}"
        );
        assert!(
            (number(&line["sd"]) - sigma).abs() < 4.0 * sd_error,
            "{name}: {line}"
        );
        let p50 = number(&line["percentiles"]["P50"]);
        assert!(
            (p50 - median).abs() < 4.0 * 1.2533 * mean_error,
            "{name}: {line}"
        );
    }
    // The product itself: its P50 is the product of the medians, 6 m*s.
    let product = spread(&json, "p");
    let p50 = number(&product["percentiles"]["P50"]);
    assert!(
        (p50 / 6.0).ln().abs() < 4.0 * 1.2533 * sigma / samples.sqrt(),
        "{product}"
    );
}

/// The percentiles shown are those of the samples the stated generator gives: regenerated
/// here, sorted and interpolated by hand.
#[test]
fn percentiles_match_an_independent_computation() {
    let sheet = "x = normal mean 10 m sd 2 m\ny = lognormal median 4 kPa sdlog10 0.25\n";
    let arguments = [
        "--samples",
        "1000",
        "--seed",
        "42",
        "--percentiles",
        "2.5,5,50,95,99",
    ];
    let json = sampled_json(sheet, &arguments, 0);
    let x: Vec<f64> = scores(42, 1000, 2, 0)
        .iter()
        .map(|z| 10.0 + 2.0 * z)
        .collect();
    let sdln = 0.25 * std::f64::consts::LN_10;
    let y: Vec<f64> = scores(42, 1000, 2, 1)
        .iter()
        .map(|z| 4.0 * (sdln * z).exp())
        .collect();
    for (name, values) in [("x", &x), ("y", &y)] {
        let line = spread(&json, name);
        for p in [2.5, 5.0, 50.0, 95.0, 99.0] {
            let shown = number(&line["percentiles"][format!("P{p}")]);
            let expected = percentile_by_hand(values, p);
            assert!(
                (shown - expected).abs() <= 1e-12 * expected.abs(),
                "{name} P{p}: {shown} vs {expected}"
            );
        }
        let mean = values.iter().sum::<f64>() / values.len() as f64;
        assert!(
            (number(&line["mean"]) - mean).abs() <= 1e-12 * mean.abs(),
            "{name} mean"
        );
    }
    // And against the closed form: P95 of the log-normal is 4 kPa · 10^(0.25 · 1.6449),
    // within the sampling error of 1000 samples (a few per cent).
    let p95 = number(&spread(&json, "y")["percentiles"]["P95"]);
    let closed = 4.0 * 10f64.powf(0.25 * 1.644_853_626_951_472);
    assert!((p95 / closed - 1.0).abs() < 0.08, "{p95} vs {closed}");
}

/// P(K > 3e-9 m/s) for K log-normal with median 1e-9 m/s and factor 3 is 1 − Φ(1): the
/// check `K <= 3e-9 m/s` fails with that probability, within four standard errors, and the
/// standard error reported is sqrt(p (1 − p) / n).
#[test]
fn a_checks_failure_probability_matches_the_closed_form() {
    let sheet = "K = lognormal median 1e-9 m/s factor 3\ncheck K <= 3e-9 m/s \"liner limit\"\n";
    let samples: f64 = 50_000.0;
    let json = sampled_json(sheet, &["--samples", "50000", "--seed", "9"], 1);
    let check = &json["samples"]["checks"][0];
    let expected = 1.0 - normal_cdf_by_quadrature(1.0);
    assert!(
        (expected - 0.158_655_253_931_457).abs() < 1e-9,
        "the quadrature itself"
    );
    let probability = number(&check["probability"]);
    let error = (expected * (1.0 - expected) / samples).sqrt();
    assert!((probability - expected).abs() < 4.0 * error, "{check}");
    assert!(
        (number(&check["standard_error"]) / error - 1.0).abs() < 0.05,
        "{check}"
    );
    assert_eq!(number(&check["failed"]), (probability * samples).round());
    // The sheet's check line says how many samples failed.
    assert_eq!(json["checks"][0]["passed"], false);
    assert_eq!(json["checks"][0]["rows"]["total"], 50_000);
}

/// A check that no sample fails still does not claim a probability of zero.
#[test]
fn a_check_no_sample_fails_reports_an_upper_bound() {
    let sheet = "t = uniform 0.8 m to 1 m\ncheck t >= 0.5 m\n";
    let json = sampled_json(sheet, &["--samples", "3000"], 0);
    let check = &json["samples"]["checks"][0];
    assert_eq!(check["failed"], 0);
    assert_eq!(number(&check["upper_bound_95"]), 3.0 / 3000.0);
    let (_, table, _) = run_sheet(sheet, &["--samples", "3000"]);
    assert!(
        table.contains("0 % (below 0.1 % at 95 % confidence)"),
        "{table}"
    );
}

/// The same seed gives the same output, bit for bit, on one thread or two; another seed
/// gives other numbers.
#[test]
fn the_same_seed_gives_identical_output_on_any_number_of_threads() {
    let sheet = "K = lognormal median 2e-10 m/s factor 3
t = normal mean 0.9 m sd 0.05 m between 0.6 m and 1.2 m
h = triangular 0.05 m to 0.6 m likely 0.3 m rank 0.4 with K
T = uniform 8 degC to 14 degC
q [mm/yr] = liner_leakage(K, h, t) * water_density(T) / 1000 kg/m^3
check q <= 10 mm/yr
";
    let run = |threads: &str, seed: &str, format: &str| {
        let arguments = [
            "--samples",
            "20000",
            "--seed",
            seed,
            "--threads",
            threads,
            "--format",
            format,
        ];
        run_sheet(sheet, &arguments)
    };
    for format in ["json", "table"] {
        let one = run("1", "7", format);
        let two = run("2", "7", format);
        assert_eq!(one.0, 1, "{}", one.2);
        assert_eq!(one, two, "{format}");
        let other_seed = run("2", "8", format);
        assert_ne!(one.1, other_seed.1, "{format}");
    }
}

/// A distribution's parameters are checked like any arithmetic: each refusal exits 3 and
/// says what is wrong.
#[test]
fn distributions_that_make_no_sense_exit_3() {
    for (sheet, fragment) in [
        ("x = normal mean 1 m sd 2 s", "dimension of the mean"),
        ("x = normal mean 1 m sd 0 m", "above zero"),
        ("x = lognormal median 1 m factor 2 m", "plain number"),
        ("x = lognormal median 1 m factor 0.5", "above 1"),
        ("x = lognormal median -1 m factor 2", "above zero"),
        ("x = uniform 1 m to 2 kg", "dimension of the first"),
        ("x = uniform 2 m to 1 m", "below the second"),
        ("x = loguniform 0 m to 1 m", "above zero"),
        (
            "x = triangular 1 m to 2 m likely 3 m",
            "between the lower and the upper",
        ),
        (
            "x = normal mean 1 m sd 1 m between 0 s and 2 s",
            "dimension of the first",
        ),
        (
            "x = normal mean 0 m sd 1 m between 40 m and 50 m",
            "too little to sample",
        ),
        (
            "x = uniform 1 to 2 rank 2 with y\ny = uniform 1 to 2",
            "strictly between -1 and 1",
        ),
        (
            "x = uniform 1 to 2 rank 0.5 with y\ny = 3",
            "not a distribution",
        ),
        ("x = normal mean 10 degC sd 2 degC", "difference"),
        (
            "x = lognormal median 10 degC factor 2",
            "absolute temperature",
        ),
        ("f(a) = normal mean a sd 1\ny = f(2)", "line of its own"),
    ] {
        let (code, stdout, stderr) = run_sheet(sheet, &[]);
        assert_eq!(code, 3, "{sheet}: {stdout}{stderr}");
        assert!(stderr.contains(fragment), "{sheet}: {stderr}");
        let (sampled_code, _, _) = run_sheet(sheet, &["--samples", "100"]);
        assert_eq!(sampled_code, 3, "{sheet} with --samples");
    }
}

/// `between` keeps every sample inside its bounds; without it, a porosity sampled below
/// zero is refused by the relation's domain, naming the first failing sample, which is the
/// first the stated generator puts below zero.
#[test]
fn truncation_is_honoured_and_domains_apply_to_every_sample() {
    let kept =
        "n = normal mean 0.35 sd 0.3 between 0.01 and 1\nv [m/d] = seepage_velocity(0.1 m/d, n)\n";
    let json = sampled_json(kept, &["--samples", "20000", "--percentiles", "0,100"], 0);
    let n = spread(&json, "n");
    assert!(number(&n["percentiles"]["P0"]) >= 0.01, "{n}");
    assert!(number(&n["percentiles"]["P100"]) <= 1.0, "{n}");
    let free = "n = normal mean 0.35 sd 0.3\nv [m/d] = seepage_velocity(0.1 m/d, n)\n";
    let first_outside = scores(1, 20_000, 1, 0)
        .iter()
        .position(|z| 0.35 + 0.3 * z <= 0.0 || 0.35 + 0.3 * z > 1.0)
        .map(|index| index + 1);
    let Some(first_outside) = first_outside else {
        panic!("the stated generator puts no sample outside (0, 1]")
    };
    for threads in ["1", "2"] {
        let (code, _, stderr) = run_sheet(free, &["--samples", "20000", "--threads", threads]);
        assert_eq!(code, 3, "{stderr}");
        assert!(
            stderr.contains(&format!("(in sample {first_outside})")),
            "{stderr}"
        );
    }
}

/// The temperature rules hold on every sample: an absolute temperature on an offset scale
/// does not enter a product, nothing goes below absolute zero, and a water formulation
/// refuses samples outside its range.
#[test]
fn temperature_rules_apply_to_every_sample() {
    for (sheet, fragment) in [
        ("T = normal mean 10 degC sd 3 K\nx = T * 2", "kelvin"),
        ("T = normal mean 10 degC sd 200 K", "absolute zero"),
        (
            "T = uniform 20 degC to 120 degC\nrho = water_density(T)",
            "(in sample",
        ),
    ] {
        let (code, stdout, stderr) = run_sheet(sheet, &["--samples", "5000"]);
        assert_eq!(code, 3, "{sheet}: {stdout}");
        assert!(stderr.contains(fragment), "{sheet}: {stderr}");
    }
    // A sampled site temperature goes through the water functions and shows in degC.
    let sheet = "T = uniform 8 degC to 14 degC\nmu [mPa*s] = water_viscosity(T)\n";
    let json = sampled_json(sheet, &["--samples", "4000"], 0);
    let t = spread(&json, "T");
    assert_eq!(t["unit"], "degC");
    assert!((number(&t["mean"]) - 11.0).abs() < 0.1, "{t}");
    // Water at 8 to 14 degC: 1.38 to 1.17 mPa·s (IAPWS 2008, from memory to two digits).
    let mu = spread(&json, "mu");
    assert!(
        number(&mu["percentiles"]["P5"]) > 1.16 && number(&mu["percentiles"]["P95"]) < 1.39,
        "{mu}"
    );
}

/// Without `--samples`, a distribution is its median, and the table and JSON say so.
#[test]
fn without_samples_a_distribution_is_its_median_with_a_note() {
    let sheet =
        "K = lognormal median 1e-9 m/s factor 3\nh = triangular 0.1 m to 0.6 m likely 0.3 m\n";
    let json = sampled_json(sheet, &[], 0);
    assert!(json.get("samples").is_none());
    assert_eq!(number(&json["lines"][0]["si_value"]), 1e-9);
    // The median of the triangle: F(0.3) = 0.4, so 0.6 − sqrt(0.5 · 0.5 · 0.3).
    let h = number(&json["lines"][1]["si_value"]);
    assert!((h - (0.6 - 0.075f64.sqrt())).abs() < 1e-12, "{h}");
    assert!(json["lines"][0]["note"]
        .as_str()
        .is_some_and(|note| note.contains("median")));
    let (_, table, _) = run_sheet(sheet, &[]);
    assert!(
        table.contains("its median; `--samples N` samples it"),
        "{table}"
    );
}

/// A rank correlation between two inputs holds in the samples, and the ranking shows it.
#[test]
fn a_rank_correlation_between_inputs_holds() {
    let sheet =
        "a = lognormal median 1 m factor 2\nb = uniform 0 s to 1 s rank -0.7 with a\nc = b * 2\n";
    let json = sampled_json(sheet, &["--samples", "30000"], 0);
    let ranking = &json["samples"]["sensitivity"][0];
    assert_eq!(ranking["name"], "c");
    let with_a = ranking["inputs"]
        .as_array()
        .and_then(|inputs| inputs.iter().find(|input| input["input"] == "a"))
        .map(|input| number(&input["rank_correlation"]));
    assert!(
        with_a.is_some_and(|rank| (rank + 0.7).abs() < 0.02),
        "{ranking}"
    );
    // Correlations that cannot hold together are refused.
    let impossible = "a = uniform 0 to 1\nb = uniform 0 to 1 rank 0.9 with a\nc = uniform 0 to 1 rank 0.9 with a rank -0.9 with b\n";
    let (code, _, stderr) = run_sheet(impossible, &["--samples", "100"]);
    assert_eq!(code, 3, "{stderr}");
    assert!(stderr.contains("cannot hold together"), "{stderr}");
}

/// `--samples` on a sheet with nothing uncertain is a command-line error, and so are its
/// companions without it; columns of the sheet's own cannot be sampled yet.
#[test]
fn sampling_refuses_what_it_cannot_do() {
    let (code, _, stderr) = run_sheet("x = 2 m\n", &["--samples", "100"]);
    assert_eq!(code, 2, "{stderr}");
    assert!(stderr.contains("no distributions"), "{stderr}");
    let (code, _, _) = run_sheet("x = uniform 1 to 2\n", &["--seed", "3"]);
    assert_eq!(code, 2);
    let (code, _, _) = run_sheet(
        "x = uniform 1 to 2\n",
        &["--samples", "10", "--percentiles", "150"],
    );
    assert_eq!(code, 2);
    for (sheet, fragment) in [
        ("x = uniform 1 to 2\nk = {1, 2, 3}\ny = x * 2", "a list"),
        ("x = uniform 1 to 2\ny = mean(x)", "whole columns"),
    ] {
        let (code, _, stderr) = run_sheet(sheet, &["--samples", "100"]);
        assert_eq!(code, 3, "{sheet}");
        assert!(
            stderr.contains(fragment) && stderr.contains("cannot be sampled"),
            "{stderr}"
        );
    }
}

/// `report --samples N` adds the summary, and for each final result its exceedance curve and
/// tornado chart (as SVG read back here); Markdown carries the tables.
#[test]
fn a_sampled_report_carries_the_summary_and_its_charts() {
    let folder = tempfile::tempdir().unwrap();
    let sheet = folder.path().join("liner.fxs");
    std::fs::write(
        &sheet,
        "K = lognormal median 1e-9 m/s factor 3\nh = uniform 0.1 m to 0.5 m\nq [mm/yr] = liner_leakage(K, h, 0.9 m)\ncheck q <= 60 mm/yr\n",
    )
    .unwrap();
    let html = folder.path().join("r.html");
    let arguments = ["report", "--samples", "5000", "-o"];
    let (code, _, stderr) = crate::util::outcome(
        crate::util::fluxsheet()
            .args(arguments)
            .arg(&html)
            .arg(&sheet),
    );
    assert_eq!(code, 1, "{stderr}"); // some samples fail the check
    let page = std::fs::read_to_string(&html).unwrap();
    assert!(page.contains("Uncertainty: 5000 samples, seed 1"), "{page}");
    assert!(page.contains("probability of failing"));
    // Each chart titled once, by its caption.
    assert!(page.contains("<figcaption>Probability that q is exceeded</figcaption>"));
    assert!(page.contains("<figcaption>Inputs that drive q (rank correlations"));
    assert!(!page.contains("Exceedance of q") && !page.contains("What drives q ("));
    let figures = page.matches("<svg").count();
    assert_eq!(
        figures, 2,
        "one exceedance curve and one tornado for the one final result"
    );
    for svg in page.split("<svg").skip(1) {
        let end = svg.find("</svg>").unwrap();
        let document = format!(
            "<svg xmlns=\"http://www.w3.org/2000/svg\"{}</svg>",
            &svg[..end]
        );
        assert!(roxmltree::Document::parse(&document).is_ok(), "{document}");
    }
    let markdown = folder.path().join("r.md");
    let (_, _, stderr) = crate::util::outcome(
        crate::util::fluxsheet()
            .args(arguments)
            .arg(&markdown)
            .arg(&sheet),
    );
    let text = std::fs::read_to_string(&markdown).unwrap_or_else(|_| panic!("{stderr}"));
    assert!(
        text.contains("| line | name | mean | sd | P5 | P50 | P95 | unit |"),
        "{text}"
    );
}

proptest::proptest! {
    #![proptest_config(proptest::prelude::ProptestConfig { cases: 300, ..proptest::prelude::ProptestConfig::default() })]

    /// Distribution lines with any parameters (signs, zeros, huge and tiny numbers, units that
    /// do not match, bounds, correlations), sampled: a summary or diagnostics, never a panic,
    /// and every summary number finite.
    #[test]
    fn sampled_distributions_summarise_or_diagnose(
        family in 0usize..6,
        a in proptest::prop_oneof![proptest::prelude::Just(0.0), -1e3..1e3f64, proptest::prelude::Just(1e300), proptest::prelude::Just(1e-300)],
        b in proptest::prop_oneof![proptest::prelude::Just(0.0), -1e3..1e3f64, proptest::prelude::Just(1e300)],
        c in -1e3..1e3f64,
        unit in proptest::sample::select(vec!["m", "s", "degC", "K", "", "mD"]),
        bounded in proptest::bool::ANY,
        rank in -1.5..1.5f64,
    ) {
        let with_unit = |value: f64| format!("{value:e} {unit}").trim().to_string();
        let (a, b, c) = (with_unit(a), with_unit(b), with_unit(c));
        let value = match family {
            0 => format!("normal mean {a} sd {b}"),
            1 => format!("lognormal median {a} factor {}", c.split(' ').next().unwrap_or("2")),
            2 => format!("uniform {a} to {b}"),
            3 => format!("loguniform {a} to {b}"),
            4 => format!("triangular {a} to {b} likely {c}"),
            _ => format!("lognormal median {a} sdlog10 0.5"),
        };
        let bounds = if bounded { format!(" between {c} and {b}") } else { String::new() };
        let sheet = format!("x = {value}{bounds}\ny = uniform 0 to 1 rank {rank} with x\nz = x * y\ncheck z <= 1 {unit}\n");
        let mut sampling = fluxsheet::eval::uncertainty::Sampling::new(300, 4);
        sampling.threads = 2;
        let settings = fluxsheet::eval::Settings { sampling: Some(sampling), ..fluxsheet::eval::Settings::default() };
        let evaluation = fluxsheet::eval::evaluate_with(
            "<prop>",
            &sheet,
            fluxsheet::library::Builtins::standard(),
            &mut fluxsheet::eval::NoIncludes,
            &settings,
        );
        if let Some(summary) = &evaluation.samples {
            for line in &summary.lines {
                proptest::prop_assert!(line.mean.is_finite() && line.sd.is_finite(), "{sheet}: {} {}", line.mean, line.sd);
                proptest::prop_assert!(line.percentiles.iter().all(|p| p.is_finite()), "{sheet}");
            }
        } else {
            proptest::prop_assert!(evaluation.has_errors(), "{sheet}: neither summary nor error");
        }
    }
}
