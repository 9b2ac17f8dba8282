//! Benchmarks: parse + evaluate generated sheets of 10 000 and 100 000 lines (cost must grow
//! linearly), the cost of single property calls, `fluxsheet check` over a folder of 200
//! generated 50-line sheets (the pre-commit case, process start included), and session
//! entries, and a sheet sampled 100 000 times beside a hand-written loop. Run with
//! `cargo bench`.

use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion, Throughput};
use fluxsheet::eval::evaluate_sheet;
use fluxsheet::library::Builtins;
use std::hint::black_box;

/// The same allocator as the `fluxsheet` binary, so the figures are the product's.
#[global_allocator]
static ALLOCATOR: mimalloc::MiMalloc = mimalloc::MiMalloc;

/// A sheet of `lines` lines in the shape of real work: unit literals, references to earlier
/// lines, display conversions and function calls, in groups of five.
pub fn generated_sheet(lines: usize) -> String {
    let mut sheet = String::with_capacity(lines * 40);
    for group in 0..lines / 5 {
        sheet.push_str(&format!("k_{group} = {}.5 mD\n", group % 97));
        sheet.push_str(&format!("h_{group} = {} ft\n", 1 + group % 13));
        sheet.push_str(&format!(
            "K_{group} [m/s] = k_{group} * 998.2 kg/m^3 * g0 / 1.002 cP\n"
        ));
        sheet.push_str(&format!(
            "q_{group} [m/d] = K_{group} * (h_{group} + 0.6 m) / 0.6 m\n"
        ));
        sheet.push_str(&format!(
            "r_{group} [mm] = sqrt(q_{group} * 2 d * 1 m) + ln(3) * 1 mm\n"
        ));
    }
    sheet
}

fn sheets(criterion: &mut Criterion) {
    let library = Builtins::standard();
    let mut group = criterion.benchmark_group("parse_and_evaluate");
    group.sample_size(10);
    for lines in [10_000usize, 100_000] {
        let sheet = generated_sheet(lines);
        group.throughput(Throughput::Elements(lines as u64));
        group.bench_with_input(
            BenchmarkId::from_parameter(lines),
            &sheet,
            |bencher, sheet| {
                bencher.iter(|| {
                    let evaluation = evaluate_sheet(black_box(sheet), library);
                    assert!(!evaluation.has_errors());
                    evaluation
                })
            },
        );
    }
    group.finish();
}

/// ns per call of the property functions, through the same `Library` call a sheet makes, over
/// a sweep of site temperatures (so no call can be folded away).
fn property_calls(criterion: &mut Criterion) {
    use fluxsheet::eval::{Library, Provenance, Quantity};
    use fluxsheet::units::Dimension;
    let library = Builtins::standard();
    let temperatures: Vec<Quantity> = (0..1000)
        .map(|index| Quantity::new(275.15 + 0.06 * index as f64, Dimension::TEMPERATURE))
        .collect();
    let permeability = Quantity::new(
        250.0 * 1e-15 / 1.01325,
        Dimension::from_integers([2, 0, 0, 0, 0, 0, 0]),
    );
    let mut group = criterion.benchmark_group("property_call");
    group.throughput(Throughput::Elements(temperatures.len() as u64));
    for name in ["water_density", "water_viscosity", "hydraulic_conductivity"] {
        let function = library.function(name).expect("built-in exists");
        group.bench_function(name, |bencher| {
            let mut provenance = Provenance::default();
            bencher.iter(|| {
                let mut total = 0.0;
                for temperature in &temperatures {
                    let arguments = if name == "hydraulic_conductivity" {
                        vec![permeability, *temperature]
                    } else {
                        vec![*temperature]
                    };
                    total += function
                        .call(black_box(&arguments), &mut provenance)
                        .expect("in range")
                        .value;
                }
                total
            })
        });
    }
    group.finish();
}

/// A clean 50-line sheet in five sections: a heading, a comment, inputs, a property call, unit
/// conversions and a check in each, every line used or displayed (no warnings).
pub fn checker_sheet(index: usize) -> String {
    let mut sheet = String::with_capacity(50 * 48);
    for section in 0..5 {
        let tag = format!("{index}_{section}");
        let millidarcy = 10 + (index * 7 + section * 13) % 490;
        let celsius = 5 + (index + section) % 20;
        sheet.push_str(&format!("## Core {tag} (generated)\n"));
        sheet.push_str("# Lab permeability at the groundwater temperature.\n");
        sheet.push_str(&format!("k_{tag} = {millidarcy} mD\n"));
        sheet.push_str(&format!("T_{tag} = {celsius} degC\n"));
        sheet.push_str(&format!(
            "K_{tag} [m/s] = hydraulic_conductivity(k_{tag}, T_{tag})\n"
        ));
        sheet.push_str(&format!("i_{tag} = 0.{} m / 25 m\n", 1 + section));
        sheet.push_str(&format!("n_{tag} = 0.{}\n", 2 + section % 3));
        sheet.push_str(&format!("q_{tag} [m/d] = K_{tag} * i_{tag}\n"));
        sheet.push_str(&format!("v_{tag} [ft/d] = q_{tag} / n_{tag}\n"));
        sheet.push_str(&format!(
            "check v_{tag} > q_{tag} \"seepage is faster than the flux\"\n"
        ));
    }
    sheet
}

fn check_folder(criterion: &mut Criterion) {
    let folder = tempfile::tempdir().expect("temporary folder");
    for index in 0..200 {
        let sub = folder.path().join(format!("site_{}", index % 10));
        std::fs::create_dir_all(&sub).expect("folder");
        std::fs::write(
            sub.join(format!("sheet_{index:03}.fxs")),
            checker_sheet(index),
        )
        .expect("sheet written");
    }
    let binary = env!("CARGO_BIN_EXE_fluxsheet");
    let mut group = criterion.benchmark_group("check_folder");
    group.sample_size(10);
    group.throughput(Throughput::Elements(200));
    group.bench_function("200_sheets_of_50_lines", |bencher| {
        bencher.iter(|| {
            let output = std::process::Command::new(binary)
                .arg("check")
                .arg(folder.path())
                .output()
                .expect("fluxsheet runs");
            assert_eq!(
                output.status.code(),
                Some(0),
                "{}",
                String::from_utf8_lossy(&output.stdout)
            );
            output
        })
    });
    group.finish();
}

/// An interactive session: one entry into a session of 1 000 lines (parse and evaluate one
/// line), and redefining an input that 100 lines depend on (directly and through each other).
fn session(criterion: &mut Criterion) {
    use fluxsheet::eval::session::{Outcome, Session};
    let library = Builtins::standard();
    let mut group = criterion.benchmark_group("session");
    let mut loaded = Session::new(library);
    loaded.load(
        "<bench>",
        &generated_sheet(1_000),
        &mut fluxsheet::eval::NoIncludes,
    );
    assert_eq!(loaded.lines().len(), 1_000);
    let mut flip = false;
    group.bench_function("entry_in_1000_lines", |bencher| {
        bencher.iter(|| {
            // The first entry adds `probe`, the others replace it: the session stays 1 001 lines.
            flip = !flip;
            let entry = if flip {
                "probe [m/d] = q_100 * 2 + K_7 * 0.5 + 1 mm/d"
            } else {
                "probe [m/d] = q_101 * 2 + K_8 * 0.5 + 1 mm/d"
            };
            let report = loaded.enter(black_box(entry));
            assert!(!matches!(report.outcome, Outcome::Refused));
            report
        })
    });
    let mut chained = Session::new(library);
    let mut sheet = generated_sheet(1_000);
    sheet.push_str("h0 = 1 m\n");
    sheet.push_str("d_0 = h0 * 2\n");
    for index in 1..100 {
        sheet.push_str(&format!(
            "d_{index} = d_{} + h0 * 0.5 + q_{index} * 1 d\n",
            index - 1
        ));
    }
    chained.load("<bench>", &sheet, &mut fluxsheet::eval::NoIncludes);
    group.bench_function("redefine_input_with_100_dependents", |bencher| {
        bencher.iter(|| {
            flip = !flip;
            let entry = if flip { "h0 = 2 m" } else { "h0 = 1.5 m" };
            let report = chained.enter(black_box(entry));
            assert_eq!(report.recomputed.len(), 100);
            report
        })
    });
    group.finish();
}

/// Rows of the column benchmarks.
pub const COLUMN_ROWS: usize = 1_000_000;

/// `K = hydraulic_conductivity(k, T)` over a column of a million temperatures.
pub const ONE_LINE_SWEEP: &str =
    "k = 250 mD\nT = 0 degC to 40 degC count 1000000\nK [m/s] = hydraulic_conductivity(k, T)\n";

/// Ten lines over the same column: properties, flux, seepage velocity and travel time.
pub const TEN_LINE_SWEEP: &str = "k = 250 mD
T = 0 degC to 40 degC count 1000000
K [m/s] = hydraulic_conductivity(k, T)
rho = water_density(T)
mu [cP] = water_viscosity(T)
i = 0.02
q [m/d] = K * i
n = 0.3
v [m/d] = q / n
t [d] = 100 m / v
";

/// The same work as the sheets, written by hand in Rust on plain `f64` with the same
/// formulations: the physical limit the evaluator is measured against.
fn hand_loop(temperatures: &[f64], ten_lines: bool) -> Vec<Vec<f64>> {
    use fluxsheet::library::water;
    use uom::si::f64::{Pressure, ThermodynamicTemperature};
    use uom::si::pressure::pascal;
    use uom::si::thermodynamic_temperature::kelvin;
    let k = 250.0 * 9.869_232_667_160_128e-16;
    let p = Pressure::new::<pascal>(101_325.0);
    let state = |t: f64| ThermodynamicTemperature::new::<kelvin>(t);
    let conductivity: Vec<f64> = temperatures
        .iter()
        .map(|t| {
            let (rho, mu) = water::density_and_viscosity(state(*t), p).expect("in range");
            k * rho.value * 9.80665 / mu.value
        })
        .collect();
    if !ten_lines {
        return vec![conductivity];
    }
    let density: Vec<f64> = temperatures
        .iter()
        .map(|t| water::density(state(*t), p).expect("in range").value)
        .collect();
    let viscosity: Vec<f64> = temperatures
        .iter()
        .map(|t| water::viscosity(state(*t), p).expect("in range").value)
        .collect();
    let flux: Vec<f64> = conductivity.iter().map(|k| k * 0.02).collect();
    let velocity: Vec<f64> = flux.iter().map(|q| q / 0.3).collect();
    let time: Vec<f64> = velocity.iter().map(|v| 100.0 / v).collect();
    vec![conductivity, density, viscosity, flux, velocity, time]
}

/// A sheet over a column of a million rows beside the hand-written loop doing the same work.
fn columns(criterion: &mut Criterion) {
    let library = Builtins::standard();
    let mut group = criterion.benchmark_group("column_1M");
    group.sample_size(10);
    group.throughput(Throughput::Elements(COLUMN_ROWS as u64));
    let temperatures: Vec<f64> = (0..COLUMN_ROWS)
        .map(|row| 273.15 + 40.0 * row as f64 / (COLUMN_ROWS - 1) as f64)
        .collect();
    group.bench_function("hand_loop_K", |bencher| {
        bencher.iter(|| hand_loop(black_box(&temperatures), false))
    });
    group.bench_function("sheet_K", |bencher| {
        bencher.iter(|| {
            let evaluation = evaluate_sheet(black_box(ONE_LINE_SWEEP), library);
            assert!(!evaluation.has_errors());
            evaluation
        })
    });
    group.bench_function("hand_loop_10_lines", |bencher| {
        bencher.iter(|| hand_loop(black_box(&temperatures), true))
    });
    group.bench_function("sheet_10_lines", |bencher| {
        bencher.iter(|| {
            let evaluation = evaluate_sheet(black_box(TEN_LINE_SWEEP), library);
            assert!(!evaluation.has_errors());
            evaluation
        })
    });
    group.finish();
}

/// Output of a 1 000 000-row column beside computing it: the sheet evaluated, then the same
/// evaluation written as CSV, as the terminal table and as JSON to a sink. Each output's time
/// over `compute` is its cost in columns computed; per cell it is the time over 1 000 000.
fn column_output(criterion: &mut Criterion) {
    use fluxsheet::render::{Format, RenderOptions};
    const SHEET: &str = "x = 1 m to 1000000 m count 1000000\ny [ft] = x * 1.5\n";
    let library = Builtins::standard();
    let mut group = criterion.benchmark_group("column_output_1M");
    group.sample_size(10);
    group.throughput(Throughput::Elements(1_000_000));
    group.bench_function("compute", |bencher| {
        bencher.iter(|| evaluate_sheet(black_box(SHEET), library))
    });
    let evaluation = evaluate_sheet(SHEET, library);
    assert!(!evaluation.has_errors());
    let options = |format, digits| RenderOptions {
        format,
        digits,
        width: Some(100),
    };
    for (name, format, digits) in [
        ("csv_15_digits", Format::Csv, 15),
        ("csv_4_digits", Format::Csv, 4),
        ("table_4_digits", Format::Table, 4),
    ] {
        group.bench_function(name, |bencher| {
            bencher.iter(|| {
                let mut sink = std::io::BufWriter::new(std::io::sink());
                fluxsheet::render::table::write_sheet(
                    &mut sink,
                    black_box(&evaluation),
                    options(format, digits),
                )
                .expect("a sink takes everything");
            })
        });
    }
    group.bench_function("json", |bencher| {
        bencher.iter(|| {
            let mut sink = std::io::BufWriter::new(std::io::sink());
            let json = fluxsheet::render::json::sheet_json(None, black_box(&evaluation), &[]);
            serde_json::to_writer(&mut sink, &json).expect("a sink takes everything");
        })
    });
    group.finish();
}

/// A pumping test of 1 000 readings (1 % noise from a fixed pattern) fitted for T and S: the
/// whole sheet, so the cost includes re-evaluating the model column on every trial.
fn fit_record(criterion: &mut Criterion) {
    let library = Builtins::standard();
    let noise: Vec<String> = (0..1000)
        .map(|i| format!("{:.6}", 1.0 + 0.01 * (7.0 * f64::from(i)).sin()))
        .collect();
    let sheet = format!(
        "Q = 20 L/s\nr = 40 m\nt = 1 min to 3 d count 1000 log\nnoise = {{{}}}\n\
         s_seen = theis_drawdown(Q, 2.5e-3 m^2/s, 2e-4, r, t) * noise\n\
         T = 1e-3 m^2/s\nS = 1e-5\ns_model = theis_drawdown(Q, T, S, r, t)\n\
         T_fit = fit s_model to s_seen varying T, S log\n",
        noise.join(", ")
    );
    let mut group = criterion.benchmark_group("fit");
    group.bench_function("theis_1000_points", |bencher| {
        bencher.iter(|| {
            let evaluation = evaluate_sheet(black_box(&sheet), library);
            assert!(!evaluation.has_errors());
            evaluation
        })
    });
    group.finish();
}

/// A keystroke in the editor on a 1 000-line sheet, through the language server's own message
/// handling: an edit of one input (full re-evaluation and the diagnostics to publish) followed
/// by the inlay hints of every line. Beside it, the two ways the engine could answer: the
/// full evaluation alone, and the session's incremental redefinition of the same input.
fn lsp_keystroke(criterion: &mut Criterion) {
    use fluxsheet::eval::session::Session;
    use fluxsheet::lsp::Server;
    use lsp_server::{Message, Notification, Request};
    use serde_json::json;
    let library = Builtins::standard();
    let sheet = generated_sheet(1_000);
    let folder = tempfile::tempdir().expect("a scratch folder");
    let path = folder.path().join("keystroke.fxs");
    std::fs::write(&path, &sheet).expect("the sheet is written");
    let uri = format!("file://{}", path.display());
    let mut server = Server::default();
    let initialize = Request::new(1.into(), "initialize".into(), json!({"capabilities": {}}));
    server.handle(Message::Request(initialize));
    server.handle(Message::Notification(Notification::new(
        "initialized".into(),
        json!({}),
    )));
    let open = json!({"textDocument": {"uri": uri, "languageId": "fluxsheet", "version": 1, "text": sheet}});
    server.handle(Message::Notification(Notification::new(
        "textDocument/didOpen".into(),
        open,
    )));
    let mut group = criterion.benchmark_group("lsp_keystroke_1000_lines");
    let mut version = 1;
    let mut request_id = 1;
    group.bench_function("edit_diagnostics_and_inlay_hints", |bencher| {
        bencher.iter(|| {
            version += 1;
            request_id += 1;
            // Line 500 is `k_100 = 3.5 mD`: its digit goes back and forth between 3 and 4.
            let digit = if version % 2 == 0 { "4" } else { "3" };
            let change = json!({
                "textDocument": {"uri": uri, "version": version},
                "contentChanges": [{"range": {"start": {"line": 500, "character": 8}, "end": {"line": 500, "character": 9}}, "text": digit}]
            });
            let published = server.handle(Message::Notification(Notification::new(
                "textDocument/didChange".into(),
                change,
            )));
            assert_eq!(published.len(), 1);
            let hints = json!({
                "textDocument": {"uri": uri},
                "range": {"start": {"line": 0, "character": 0}, "end": {"line": 1000, "character": 0}}
            });
            let answer = server.handle(Message::Request(Request::new(
                request_id.into(),
                "textDocument/inlayHint".into(),
                hints,
            )));
            black_box(answer)
        })
    });
    group.bench_function("full_evaluation_alone", |bencher| {
        bencher.iter(|| {
            let evaluation = evaluate_sheet(black_box(&sheet), library);
            assert!(!evaluation.has_errors());
            evaluation
        })
    });
    let mut session = Session::new(library);
    session.load("<bench>", &sheet, &mut fluxsheet::eval::NoIncludes);
    let mut flip = false;
    group.bench_function("session_redefinition", |bencher| {
        bencher.iter(|| {
            flip = !flip;
            let entry = if flip {
                "k_100 = 4.5 mD"
            } else {
                "k_100 = 3.5 mD"
            };
            session.enter(black_box(entry))
        })
    });
    group.finish();
}

/// A clay liner's leakage with five uncertain inputs and water properties at the base
/// temperature: 20 lines, sampled 100 000 times.
pub const LINER_SHEET: &str = "## Clay liner under cell 4, Brackwater Moor landfill (invented site)
K_lab = lognormal median 2e-10 m/s factor 3
t_liner = normal mean 0.9 m sd 0.05 m between 0.6 m and 1.2 m
h_leachate = triangular 0.05 m to 0.6 m likely 0.3 m
T_base = uniform 8 degC to 14 degC
n_e = uniform 0.05 to 0.15
T_lab = 20 degC
rho_lab = water_density(T_lab)
mu_lab = water_viscosity(T_lab)
rho_site = water_density(T_base)
mu_site [mPa*s] = water_viscosity(T_base)
K_site [m/s] = K_lab * (rho_site / rho_lab) * (mu_lab / mu_site)
i = (h_leachate + t_liner) / t_liner
q [mm/yr] = K_site * i
A_cell = 2.4 ha
Q [m^3/d] = q * A_cell
v [m/yr] = q / n_e
t_travel [yr] = t_liner / v
check Q <= 0.5 m^3/d \"permit leakage limit\"
check t_travel >= 2 yr \"breakthrough time\"
";

/// Samples of the liner benchmark.
pub const LINER_SAMPLES: usize = 100_000;

/// The liner sheet's work written by hand: the same generator, scores and transforms, the
/// same water formulations, and the same summary (sorted percentiles, rank correlations of
/// each result with each input, check failures), on one thread.
fn liner_hand_loop(samples: usize, seed: u64) -> (Vec<Vec<f64>>, [usize; 2]) {
    use fluxsheet::eval::uncertainty::normal::{normal_cdf, normal_quantile};
    use fluxsheet::eval::uncertainty::scores::BLOCK;
    use fluxsheet::eval::uncertainty::statistics::{correlation, mean_and_sd, percentile, ranks};
    use fluxsheet::library::water;
    use rand::SeedableRng;
    use rand_distr::Distribution;
    use uom::si::f64::{Pressure, ThermodynamicTemperature};
    use uom::si::pressure::pascal;
    use uom::si::thermodynamic_temperature::kelvin;
    let p = Pressure::new::<pascal>(101_325.0);
    let state = |t: f64| ThermodynamicTemperature::new::<kelvin>(t);
    let (rho_lab, mu_lab) = water::density_and_viscosity(state(293.15), p).expect("in range");
    let (rho_lab, mu_lab) = (rho_lab.value, mu_lab.value);
    let kept = (normal_cdf(-6.0), normal_cdf(6.0));
    let triangle = |u: f64| {
        let (low, high, likely) = (0.05, 0.6, 0.3);
        if u <= (likely - low) / (high - low) {
            low + (u * (high - low) * (likely - low)).sqrt()
        } else {
            high - ((1.0 - u) * (high - low) * (high - likely)).sqrt()
        }
    };
    let mut lines: Vec<Vec<f64>> = (0..13).map(|_| Vec::with_capacity(samples)).collect();
    let mut failed = [0usize; 2];
    for block in 0..samples.div_ceil(BLOCK) {
        let len = BLOCK.min(samples - block * BLOCK);
        let mut generator = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
        generator.set_stream(block as u64);
        let scores: Vec<Vec<f64>> = (0..5)
            .map(|_| {
                (0..len)
                    .map(|_| rand_distr::StandardNormal.sample(&mut generator))
                    .collect()
            })
            .collect();
        #[allow(clippy::needless_range_loop)] // one row across five columns of scores
        for row in 0..len {
            let k_lab = 2e-10 * (3f64.ln() * scores[0][row]).exp();
            let u = kept.0 + (kept.1 - kept.0) * normal_cdf(scores[1][row]);
            let t_liner = (0.9 + 0.05 * normal_quantile(u)).clamp(0.6, 1.2);
            let h = triangle(normal_cdf(scores[2][row]));
            let t_base = 281.15 + 6.0 * normal_cdf(scores[3][row]);
            let n_e = 0.05 + 0.1 * normal_cdf(scores[4][row]);
            let (rho, mu) = water::density_and_viscosity(state(t_base), p).expect("in range");
            let (rho, mu) = (rho.value, mu.value);
            let k_site = k_lab * (rho / rho_lab) * (mu_lab / mu);
            let i = (h + t_liner) / t_liner;
            let q = k_site * i;
            let flow = q * 24_000.0;
            let v = q / n_e;
            let t_travel = t_liner / v;
            failed[0] += usize::from(flow > 0.5 / 86_400.0 * (1.0 + 1e-9));
            failed[1] += usize::from(t_travel < 2.0 * 31_557_600.0 * (1.0 - 1e-9));
            for (line, value) in lines.iter_mut().zip([
                k_lab, t_liner, h, t_base, n_e, rho, mu, k_site, i, q, flow, v, t_travel,
            ]) {
                line.push(value);
            }
        }
    }
    let ranked: Vec<(Vec<f64>, Vec<f64>)> = lines.iter().map(|line| ranks(line)).collect();
    let mut summary = Vec::new();
    for (ranks_of_line, sorted) in &ranked {
        let (mean, sd) = mean_and_sd(sorted);
        let mut row = vec![
            mean,
            sd,
            percentile(sorted, 5.0),
            percentile(sorted, 50.0),
            percentile(sorted, 95.0),
        ];
        row.extend(
            ranked[..5]
                .iter()
                .map(|(input, _)| correlation(ranks_of_line, input).unwrap_or(0.0)),
        );
        summary.push(row);
    }
    (summary, failed)
}

/// The liner sheet sampled 100 000 times, on one thread and on every core, beside the loop
/// written by hand (one thread): `cargo bench --bench engine -- samples/`.
fn sampled_liner(criterion: &mut Criterion) {
    use fluxsheet::eval::uncertainty::Sampling;
    use fluxsheet::eval::{evaluate_with, NoIncludes, Settings};
    let library = Builtins::standard();
    let settings = |threads: usize| {
        let mut sampling = Sampling::new(LINER_SAMPLES, 1);
        sampling.threads = threads;
        Settings {
            sampling: Some(sampling),
            ..Settings::default()
        }
    };
    let run = |threads: usize| {
        evaluate_with(
            "<bench>",
            LINER_SHEET,
            library,
            &mut NoIncludes,
            &settings(threads),
        )
    };
    // The sheet and the hand loop agree (not timed): P95 of Q, and the failing samples.
    let evaluation = run(2);
    let summary = evaluation.samples.as_deref().expect("sampled");
    let (by_hand, failed) = liner_hand_loop(LINER_SAMPLES, 1);
    let sheet_q = summary
        .lines
        .iter()
        .find(|line| line.name.as_deref() == Some("Q"))
        .expect("Q");
    let hand_p95 = by_hand[10][4] * 86_400.0;
    assert!(
        (sheet_q.percentiles[2] - hand_p95).abs() <= 1e-9 * hand_p95,
        "{} vs {hand_p95}",
        sheet_q.percentiles[2]
    );
    assert_eq!(
        summary
            .checks
            .iter()
            .map(|check| check.failed)
            .collect::<Vec<_>>(),
        failed.to_vec()
    );
    let mut group = criterion.benchmark_group("samples");
    group.sample_size(10);
    group.throughput(Throughput::Elements(LINER_SAMPLES as u64));
    group.bench_function("hand_loop_liner_100k", |bencher| {
        bencher.iter(|| liner_hand_loop(black_box(LINER_SAMPLES), 1))
    });
    group.bench_function("sheet_liner_100k_1_thread", |bencher| {
        bencher.iter(|| run(black_box(1)))
    });
    group.bench_function("sheet_liner_100k_all_cores", |bencher| {
        let cores = std::thread::available_parallelism().map_or(1, |cores| cores.get());
        bencher.iter(|| run(black_box(cores)))
    });
    group.finish();
}

criterion_group!(
    benches,
    sampled_liner,
    sheets,
    property_calls,
    check_folder,
    session,
    columns,
    column_output,
    fit_record,
    lsp_keystroke
);
criterion_main!(benches);
