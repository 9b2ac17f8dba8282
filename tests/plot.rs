//! Checks the SVG charts as a viewer would read them: valid XML, one curve
//! per series, readable titles, ticks and legend, and clear errors.

use std::collections::BTreeMap;

use fluxsheet::render::plot::{render_svg, Axis, Chart, PlotError, Series, ValueSource};

const AXIS_COLOUR: &str = "#000000";
const TEMPERATURES: [f64; 6] = [5.0, 10.0, 15.0, 20.0, 25.0, 30.0];
const K_SAND: [f64; 6] = [2.1e-4, 2.4e-4, 2.7e-4, 3.0e-4, 3.3e-4, 3.6e-4];
const K_CLAY: [f64; 6] = [1.0e-7, 4.0e-7, 2.0e-6, 9.0e-6, 6.0e-5, 1.0e-3];

fn chart<'a>(x: &'a [f64], series: Vec<Series<'a>>) -> Chart<'a> {
    Chart {
        title: None,
        x_label: "T_site [degC]".to_string(),
        y_label: "K [m/s]".to_string(),
        x,
        series,
        log_x: false,
        log_y: false,
        down: false,
        points: false,
    }
}

fn series<'a>(label: &str, values: &'a [f64]) -> Series<'a> {
    Series {
        label: label.to_string(),
        values,
    }
}

fn render(chart: &Chart) -> String {
    match render_svg(chart) {
        Ok(svg) => svg,
        Err(error) => panic!("chart should render, got: {error}"),
    }
}

/// The SVG parsed as XML, which also proves it is well formed.
fn parse(svg: &str) -> roxmltree::Document<'_> {
    roxmltree::Document::parse(svg).expect("SVG must be well-formed XML")
}

/// Trimmed content of every `<text>` element, in document order.
fn texts(doc: &roxmltree::Document) -> Vec<String> {
    doc.descendants()
        .filter(|n| n.has_tag_name("text"))
        .map(|n| n.text().unwrap_or("").trim().to_string())
        .collect()
}

/// Plotters writes each line series as one `<polyline>`, and the axes and
/// tick marks as black ones. Curves are therefore the coloured polylines,
/// counted per stroke colour; each must hold one vertex per x value.
fn curves_by_colour(doc: &roxmltree::Document, points_per_curve: usize) -> BTreeMap<String, usize> {
    let mut counts = BTreeMap::new();
    for node in doc.descendants().filter(|n| n.has_tag_name("polyline")) {
        let stroke = node.attribute("stroke").unwrap_or("").to_string();
        if stroke == AXIS_COLOUR {
            continue;
        }
        let vertices = node
            .attribute("points")
            .unwrap_or("")
            .split_whitespace()
            .count();
        assert_eq!(
            vertices, points_per_curve,
            "curve {stroke} has {vertices} vertices"
        );
        *counts.entry(stroke).or_insert(0) += 1;
    }
    counts
}

fn count_text(texts: &[String], wanted: &str) -> usize {
    texts.iter().filter(|t| t.as_str() == wanted).count()
}

#[test]
fn single_series_has_one_curve_axis_titles_and_no_legend() {
    let chart = chart(&TEMPERATURES, vec![series("K sand", &K_SAND)]);
    let svg = render(&chart);
    let doc = parse(&svg);

    let root = doc.root_element();
    assert_eq!(root.tag_name().name(), "svg");
    assert_eq!(root.attribute("width"), Some("800"));
    assert_eq!(root.attribute("height"), Some("500"));

    let curves = curves_by_colour(&doc, TEMPERATURES.len());
    assert_eq!(curves.values().sum::<usize>(), 1, "{curves:?}");

    let texts = texts(&doc);
    assert_eq!(count_text(&texts, "T_site [degC]"), 1);
    assert_eq!(count_text(&texts, "K [m/s]"), 1);
    assert_eq!(count_text(&texts, "K sand"), 0, "no legend for one series");
}

#[test]
fn two_series_have_two_colours_title_and_legend() {
    let mut chart = chart(
        &TEMPERATURES,
        vec![
            series("medium sand", &K_SAND),
            series("silty clay", &K_CLAY),
        ],
    );
    chart.title = Some("Conductivity vs. temperature".to_string());
    chart.log_y = true;
    let svg = render(&chart);
    let doc = parse(&svg);

    let curves = curves_by_colour(&doc, TEMPERATURES.len());
    assert_eq!(curves.len(), 2, "one colour per series: {curves:?}");
    assert!(curves.values().all(|&n| n == 1), "{curves:?}");

    let texts = texts(&doc);
    assert_eq!(count_text(&texts, "Conductivity vs. temperature"), 1);
    assert_eq!(count_text(&texts, "T_site [degC]"), 1);
    assert_eq!(count_text(&texts, "K [m/s]"), 1);
    assert_eq!(count_text(&texts, "medium sand"), 1);
    assert_eq!(count_text(&texts, "silty clay"), 1);
}

#[test]
fn many_series_keep_distinct_colours() {
    let columns: Vec<Vec<f64>> = (0..14)
        .map(|k| TEMPERATURES.iter().map(|t| t + k as f64).collect())
        .collect();
    let all = columns
        .iter()
        .enumerate()
        .map(|(k, values)| series(&format!("case {k}"), values))
        .collect();
    let svg = render(&chart(&TEMPERATURES, all));
    let doc = parse(&svg);

    let curves = curves_by_colour(&doc, TEMPERATURES.len());
    assert_eq!(curves.len(), 14, "{curves:?}");
    let texts = texts(&doc);
    assert!((0..14).all(|k| count_text(&texts, &format!("case {k}")) == 1));
}

#[test]
fn log_y_over_four_decades_labels_every_decade() {
    let x = [0.0, 1.0, 2.0, 3.0, 4.0];
    let k = [1e-7, 1e-6, 1e-5, 1e-4, 1e-3];
    let mut chart = chart(&x, vec![series("K", &k)]);
    chart.log_y = true;
    let svg = render(&chart);
    let texts = texts(&parse(&svg));

    for label in ["1e-7", "1e-6", "1e-5", "1e-4", "1e-3"] {
        assert_eq!(count_text(&texts, label), 1, "missing {label} in {texts:?}");
    }
}

#[test]
fn log_axes_within_one_decade_still_get_ticks() {
    let x = [2.0, 3.0, 4.0];
    let y = [0.2, 0.3, 0.4];
    let mut chart = chart(&x, vec![series("y", &y)]);
    chart.log_x = true;
    chart.log_y = true;
    let svg = render(&chart);
    let texts = texts(&parse(&svg));

    // x runs over 1..10 and y over 0.1..1, so "1" ends both axes.
    assert_eq!(count_text(&texts, "1"), 2, "{texts:?}");
    for label in ["2", "5", "10", "0.1", "0.2", "0.5"] {
        assert_eq!(count_text(&texts, label), 1, "missing {label} in {texts:?}");
    }
}

#[test]
fn tiny_linear_values_get_scientific_tick_labels() {
    let k = [3.0e-6, 3.5e-6, 4.0e-6, 4.5e-6, 5.0e-6, 5.5e-6];
    let svg = render(&chart(&TEMPERATURES, vec![series("K", &k)]));
    let texts = texts(&parse(&svg));

    assert!(count_text(&texts, "4e-6") == 1, "{texts:?}");
    assert!(count_text(&texts, "4.5e-6") == 1, "{texts:?}");
    assert!(
        texts.iter().all(|t| !t.starts_with("0.00000")),
        "no long decimals: {texts:?}"
    );
}

#[test]
fn ordinary_values_get_plain_tick_labels() {
    let y = [-0.1, 0.0, 0.1, 0.2, 0.3, 0.4];
    let svg = render(&chart(&TEMPERATURES, vec![series("dh/dz", &y)]));
    let texts = texts(&parse(&svg));

    for label in ["5", "10", "30", "0.0", "0.2", "-0.1"] {
        assert_eq!(count_text(&texts, label), 1, "missing {label} in {texts:?}");
    }
    assert_eq!(count_text(&texts, "-0.0"), 0);
}

#[test]
fn x_tick_labels_leave_room_between_them() {
    let x = [100_000.0, 100_000.4, 100_000.7, 100_001.0];
    let y = [1.0, 2.0, 3.0, 4.0];
    let svg = render(&chart(&x, vec![series("y", &y)]));
    let doc = parse(&svg);

    // X tick labels are the centred texts on the lowest common baseline
    // above the axis title.
    let mut rows: BTreeMap<i64, Vec<(f64, usize)>> = BTreeMap::new();
    for node in doc.descendants().filter(|n| n.has_tag_name("text")) {
        if node.attribute("text-anchor") != Some("middle") {
            continue;
        }
        let number = |name| node.attribute(name).and_then(|v| v.parse::<f64>().ok());
        if let (Some(x), Some(y)) = (number("x"), number("y")) {
            let chars = node.text().unwrap_or("").trim().chars().count();
            rows.entry(y as i64).or_default().push((x, chars));
        }
    }
    let ticks = rows
        .values()
        .rev()
        .find(|row| row.len() >= 2)
        .expect("a row of x tick labels");
    // The canvas is drawn at 4 times the displayed size.
    let displayed: Vec<(f64, usize)> = ticks.iter().map(|&(x, n)| (x / 4.0, n)).collect();
    for pair in displayed.windows(2) {
        let gap = pair[1].0 - pair[0].0;
        let room = 7.0 * (pair[0].1 + pair[1].1) as f64 / 2.0 + 8.0;
        assert!(gap >= room, "labels too close: {displayed:?}");
    }
    assert!(displayed.len() >= 3, "too few x ticks: {displayed:?}");
}

#[test]
fn all_equal_values_still_render() {
    let x = [2.0, 2.0, 2.0];
    let y = [7.0, 7.0, 7.0];
    let zero = [0.0, 0.0, 0.0];
    for (log_x, log_y, values) in [
        (false, false, &y),
        (false, false, &zero),
        (true, true, &y),
        (false, true, &[1e-3, 1e-3, 1e-3]),
    ] {
        let mut chart = chart(&x, vec![series("flat", values)]);
        chart.log_x = log_x;
        chart.log_y = log_y;
        let svg = render(&chart);
        let doc = parse(&svg);
        assert_eq!(curves_by_colour(&doc, x.len()).values().sum::<usize>(), 1);
        assert!(texts(&doc).len() > 4, "ticks expected");
    }
}

#[test]
fn markup_in_labels_is_escaped() {
    let mut chart = chart(
        &TEMPERATURES,
        vec![series("q < q_max & ok", &K_SAND), series("", &K_CLAY)],
    );
    chart.x_label = "x \"<in>\" [m]\u{7}".to_string();
    chart.title = Some("A & B".to_string());
    let svg = render(&chart);
    let texts = texts(&parse(&svg));

    assert_eq!(count_text(&texts, "q < q_max & ok"), 1);
    assert_eq!(
        count_text(&texts, "series 2"),
        1,
        "unnamed series get a number"
    );
    assert_eq!(count_text(&texts, "x \"<in>\" [m]"), 1);
    assert_eq!(count_text(&texts, "A & B"), 1);
}

#[test]
fn no_series_is_an_error() {
    let chart = chart(&TEMPERATURES, vec![]);
    assert_eq!(render_svg(&chart), Err(PlotError::NoSeries));
}

#[test]
fn fewer_than_two_points_is_an_error() {
    for x in [&[][..], &[1.0][..]] {
        let y = vec![1.0; x.len()];
        let chart = chart(x, vec![series("y", &y)]);
        assert_eq!(
            render_svg(&chart),
            Err(PlotError::TooFewPoints { count: x.len() })
        );
    }
}

#[test]
fn length_mismatch_names_series_and_lengths() {
    let short = [1.0, 2.0, 3.0];
    let chart = chart(
        &TEMPERATURES,
        vec![series("K sand", &K_SAND), series("K clay", &short)],
    );
    let error = render_svg(&chart).unwrap_err();
    assert_eq!(
        error,
        PlotError::LengthMismatch {
            series: "K clay".to_string(),
            series_len: 3,
            x_len: 6,
        }
    );
    let message = error.to_string();
    assert!(message.contains("'K clay'") && message.contains('3') && message.contains('6'));
}

#[test]
fn non_finite_values_are_errors() {
    let x_with_nan = [1.0, f64::NAN, 3.0];
    let y = [1.0, 2.0, 3.0];
    let error = render_svg(&chart(&x_with_nan, vec![series("y", &y)])).unwrap_err();
    assert!(matches!(
        error,
        PlotError::NonFinite { source: ValueSource::X, index: 1, value } if value.is_nan()
    ));

    let x = [1.0, 2.0, 3.0];
    let y_with_inf = [1.0, 2.0, f64::INFINITY];
    let error = render_svg(&chart(&x, vec![series("q", &y_with_inf)])).unwrap_err();
    assert_eq!(
        error,
        PlotError::NonFinite {
            source: ValueSource::Series("q".to_string()),
            index: 2,
            value: f64::INFINITY,
        }
    );
    assert!(error.to_string().contains("series 'q'"));
    assert!(error.to_string().contains("index 2"));
}

#[test]
fn log_axis_rejects_zero_and_negative_values() {
    let x = [1.0, 2.0, 3.0];
    let y = [1e-6, 0.0, 1e-4];
    let mut log_y_chart = chart(&x, vec![series("K", &y)]);
    log_y_chart.log_y = true;
    let error = render_svg(&log_y_chart).unwrap_err();
    assert_eq!(
        error,
        PlotError::NonPositiveOnLogAxis {
            axis: Axis::Y,
            source: ValueSource::Series("K".to_string()),
            index: 1,
            value: 0.0,
        }
    );
    let message = error.to_string();
    assert!(
        message.contains("log y axis") && message.contains("'K'"),
        "{message}"
    );

    let x_negative = [-1.0, 2.0, 3.0];
    let positive = [1.0, 2.0, 3.0];
    let mut log_x_chart = chart(&x_negative, vec![series("K", &positive)]);
    log_x_chart.log_x = true;
    let error = render_svg(&log_x_chart).unwrap_err();
    assert_eq!(
        error,
        PlotError::NonPositiveOnLogAxis {
            axis: Axis::X,
            source: ValueSource::X,
            index: 0,
            value: -1.0,
        }
    );
    assert!(error.to_string().contains("-1"));

    // The same values are fine on linear axes.
    assert!(render_svg(&chart(&x_negative, vec![series("K", &y)])).is_ok());
}

#[test]
fn range_beyond_float_limits_is_an_error() {
    let x = [1.0, 2.0];
    let y = [-f64::MAX, f64::MAX];
    assert_eq!(
        render_svg(&chart(&x, vec![series("y", &y)])),
        Err(PlotError::RangeTooWide { axis: Axis::Y })
    );
}

#[test]
fn drawing_errors_become_plot_errors() {
    let drawing_error: plotters::drawing::DrawingAreaErrorKind<std::io::Error> =
        plotters::drawing::DrawingAreaErrorKind::LayoutError;
    let error = PlotError::from(drawing_error);
    assert!(matches!(error, PlotError::Drawing(_)));
    assert!(error.to_string().starts_with("could not draw chart"));
}

/// The markers of the chart as (cx, cy) in SVG units, in document order.
fn markers(doc: &roxmltree::Document) -> Vec<(f64, f64)> {
    doc.descendants()
        .filter(|n| n.has_tag_name("circle"))
        .map(|n| {
            let number = |name: &str| n.attribute(name).unwrap().parse::<f64>().unwrap();
            (number("cx"), number("cy"))
        })
        .collect()
}

/// Porosity and K of invented cores, not sorted by porosity: a line through them would zigzag.
const POROSITY: [f64; 6] = [0.31, 0.12, 0.25, 0.18, 0.35, 0.22];
const K_CORES: [f64; 6] = [7e-6, 2e-8, 2e-6, 3e-7, 1.6e-5, 9e-7];

#[test]
fn a_cross_plot_draws_a_marker_per_row_and_no_line() {
    let mut chart = chart(&POROSITY, vec![series("K", &K_CORES)]);
    chart.points = true;
    chart.log_y = true;
    let svg = render(&chart);
    let doc = parse(&svg);
    assert!(
        curves_by_colour(&doc, 0).is_empty(),
        "no curve joins the points"
    );
    let markers = markers(&doc);
    assert_eq!(markers.len(), POROSITY.len());
    // Larger porosity lies to the right, larger K higher up (smaller SVG y), in row order.
    let (widest, _) = markers[4];
    let (narrowest, lowest) = markers[1];
    assert!(markers.iter().all(|(x, _)| *x <= widest && *x >= narrowest));
    assert!(markers.iter().all(|(_, y)| *y <= lowest));
    // No marker sits on the frame: the porosity axis keeps a margin. The frame's left edge
    // is the leftmost vertex of the black axis lines.
    let frame_left = doc
        .descendants()
        .filter(|n| n.has_tag_name("polyline") && n.attribute("stroke") == Some(AXIS_COLOUR))
        .flat_map(|n| {
            n.attribute("points")
                .unwrap_or("")
                .split_whitespace()
                .filter_map(|point| point.split(',').next()?.parse::<f64>().ok())
                .collect::<Vec<_>>()
        })
        .fold(f64::INFINITY, f64::min);
    assert!(narrowest > frame_left + 20.0, "{narrowest} {frame_left}");
}

#[test]
fn a_long_cross_plot_keeps_one_marker_per_pixel() {
    // 200 000 distinct points on a 997 x 201 grid.
    let x: Vec<f64> = (0..200_000).map(|row| (row % 997) as f64).collect();
    let y: Vec<f64> = (0..200_000).map(|row| (row / 997) as f64).collect();
    let mut chart = chart(&x, vec![series("y", &y)]);
    chart.points = true;
    let svg = render(&chart);
    let count = markers(&parse(&svg)).len();
    // At most one marker per displayed pixel of an 800 x 500 chart.
    assert!(count > 10_000 && count < 200_000, "{count} markers");
}

#[test]
fn a_profile_runs_its_x_values_down_the_vertical_axis() {
    let depth = [0.0, 20.0, 40.0, 60.0, 80.0, 100.0];
    let temperature = [9.0, 9.6, 10.2, 10.8, 11.4, 12.0];
    let mut chart = chart(&depth, vec![series("T", &temperature)]);
    chart.down = true;
    chart.x_label = "z [m]".to_string();
    chart.y_label = "T [degC]".to_string();
    let svg = render(&chart);
    let doc = parse(&svg);
    let markers = markers(&doc);
    assert_eq!(markers.len(), depth.len());
    for pair in markers.windows(2) {
        // Deeper rows lower on the page (larger SVG y), warmer rows further right.
        assert!(pair[1].1 > pair[0].1, "{markers:?}");
        assert!(pair[1].0 > pair[0].0, "{markers:?}");
    }
    assert_eq!(curves_by_colour(&doc, depth.len()).len(), 1);
    // The depth axis is titled on the vertical axis: its title is the rotated text.
    let rotated: Vec<String> = doc
        .descendants()
        .filter(|n| n.has_tag_name("text") && n.attribute("transform").is_some())
        .map(|n| n.text().unwrap_or("").trim().to_string())
        .collect();
    assert_eq!(rotated, ["z [m]"], "{rotated:?}");
    // `log y` in a profile is the depth axis as drawn: its values must be positive.
    chart.log_y = true;
    match render_svg(&chart) {
        Err(PlotError::NonPositiveOnLogAxis {
            axis: Axis::Y,
            source: ValueSource::X,
            ..
        }) => {}
        other => panic!("{other:?}"),
    }
}
