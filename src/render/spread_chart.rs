//! Charts of a sampled run for the HTML report: the exceedance curve of a result (the
//! probability that it is exceeded, against its value, drawn by the line-chart renderer) and
//! the tornado chart of its inputs (one bar per input, its rank correlation with the result,
//! largest on top, drawn here as plain SVG).

use super::plot::{render_svg, Chart, PlotError, Series};
use crate::eval::uncertainty::{LineSpread, Sensitivity};
use std::fmt::Write as _;

/// P(value > x) in %, against x, from the line's quantiles; a log x axis when the values are
/// positive and span more than a decade.
pub fn exceedance_svg(line: &LineSpread) -> Result<String, PlotError> {
    let count = line.quantiles.len();
    let exceeded: Vec<f64> = (0..count)
        .map(|index| 100.0 * (1.0 - index as f64 / (count - 1).max(1) as f64))
        .collect();
    let (low, high) = (
        line.quantiles.first().copied().unwrap_or(0.0),
        line.quantiles.last().copied().unwrap_or(0.0),
    );
    let name = line.name.clone().unwrap_or_default();
    let unit = if line.unit == "1" {
        String::new()
    } else {
        format!(" [{}]", line.unit)
    };
    let chart = Chart {
        // The report's caption titles the chart: no second title inside it.
        title: None,
        x_label: format!("{name}{unit}"),
        y_label: "probability of exceeding [%]".to_string(),
        x: &line.quantiles,
        series: vec![Series {
            label: name,
            values: &exceeded,
        }],
        log_x: low > 0.0 && high / low > 10.0,
        log_y: false,
        down: false,
        points: false,
    };
    render_svg(&chart)
}

/// Width and height of a tornado chart; rows grow with the inputs.
const TORNADO_WIDTH: f64 = 800.0;
const TORNADO_ROW: f64 = 34.0;

/// One bar per input whose rank correlation is at least `noise` in size, largest on top.
pub fn tornado_svg(result: &Sensitivity, noise: f64) -> String {
    let bars: Vec<(&str, f64)> = result
        .inputs
        .iter()
        .filter_map(|(name, rank)| {
            rank.filter(|rank| rank.abs() >= noise)
                .map(|rank| (name.as_str(), rank))
        })
        .collect();
    // The report's caption titles the chart, so the drawing starts with its tick lines.
    let (top, left, right) = (24.0, 200.0, 60.0);
    let height = top + TORNADO_ROW * bars.len().max(1) as f64 + 50.0;
    let plot_width = TORNADO_WIDTH - left - right;
    let x_of = |rank: f64| left + (rank + 1.0) / 2.0 * plot_width;
    let mut svg = String::new();
    let _ = write!(
        svg,
        r#"<svg width="{TORNADO_WIDTH}" height="{height}" viewBox="0 0 {TORNADO_WIDTH} {height}" font-family="sans-serif" font-size="14">"#
    );
    let _ = write!(svg, r#"<rect width="100%" height="100%" fill="white"/>"#);
    let bottom = top + TORNADO_ROW * bars.len().max(1) as f64;
    for tick in [-1.0, -0.5, 0.0, 0.5, 1.0] {
        let x = x_of(tick);
        let stroke = if tick == 0.0 { "#333" } else { "#ddd" };
        let _ = write!(
            svg,
            r#"<line x1="{x}" y1="{}" x2="{x}" y2="{bottom}" stroke="{stroke}"/><text x="{x}" y="{}" text-anchor="middle">{tick:+}</text>"#,
            top - 8.0,
            bottom + 20.0
        );
    }
    for (row, (name, rank)) in bars.iter().enumerate() {
        let y = top + TORNADO_ROW * row as f64 + 5.0;
        let (from, to) = (x_of(0.0), x_of(*rank));
        let colour = if *rank >= 0.0 { "#c0504d" } else { "#4f81bd" };
        // The name and the value sit in the left margin, clear of bars that reach -1.
        let _ = write!(
            svg,
            r#"<rect x="{}" y="{y}" width="{}" height="{}" fill="{colour}"/><text x="{}" y="{}" text-anchor="end">{}  {rank:+.2}</text>"#,
            from.min(to),
            (to - from).abs(),
            TORNADO_ROW - 10.0,
            left - 12.0,
            y + 17.0,
            escape(name),
        );
    }
    if bars.is_empty() {
        let _ = write!(
            svg,
            r#"<text x="{}" y="{}" text-anchor="middle">no input moves it beyond the sampling noise</text>"#,
            TORNADO_WIDTH / 2.0,
            top + 20.0
        );
    }
    let _ = write!(
        svg,
        r#"<text x="{}" y="{}" text-anchor="middle">Spearman rank correlation</text></svg>"#,
        x_of(0.0),
        bottom + 42.0
    );
    svg
}

fn escape(text: &str) -> String {
    text.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_tornado_has_one_bar_per_input_above_the_noise_largest_first() {
        let result = Sensitivity {
            line: 4,
            name: "Q<".to_string(),
            inputs: vec![
                ("K<".to_string(), Some(0.9)),
                ("n".to_string(), Some(-0.3)),
                ("t".to_string(), Some(0.001)),
                ("h".to_string(), None),
            ],
        };
        let svg = tornado_svg(&result, 0.01);
        let document = svg.replace("<svg ", "<svg xmlns=\"http://www.w3.org/2000/svg\" ");
        let parsed = roxmltree::Document::parse(&document);
        assert!(parsed.is_ok(), "{svg}");
        // The background and two bars.
        assert_eq!(svg.matches("<rect").count(), 3, "{svg}");
        let (k, n) = (svg.find(">K&lt;  +0.90<"), svg.find(">n  -0.30<"));
        assert!(k.is_some() && n.is_some() && k < n, "{svg}");
        // No title inside: the report's caption gives it.
        assert!(!svg.contains(">t  ") && !svg.contains("Q&lt;"), "{svg}");
    }
}
