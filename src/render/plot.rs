//! SVG line charts for calculation sheets.
//!
//! Over 800 lines: axis ticks, log scales, legends and the SVG text escaping a chart needs,
//! each small and tied to the others through the one layout.
//!
//! Charts are drawn with `plotters` through its SVG backend only. Plotters is
//! built without any font feature: it then falls back to a built-in text size
//! estimate, which is all an SVG needs because the viewer lays out the text.
//! Ticks are computed here rather than by plotters so that every axis, linear
//! or logarithmic, gets readable labels (`3e-6`, not `0.000003`) and a log
//! axis always shows at least two decades.

use std::fmt;

use plotters::coord::ranged1d::{DefaultFormatting, KeyPointHint, Ranged, ValueFormatter};
use plotters::coord::types::RangedCoordf64;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

/// Width of every chart, in pixels; fixed so sheets look alike.
pub const CHART_WIDTH: u32 = 800;
/// Height of every chart, in pixels.
pub const CHART_HEIGHT: u32 = 500;

/// One curve of a chart: its y values, one per x value of the chart.
#[derive(Debug, Clone)]
pub struct Series<'a> {
    /// Name shown in the legend and in error messages.
    pub label: String,
    /// The y values, as many as the chart has x values.
    pub values: &'a [f64],
}

/// Everything needed to draw one chart.
#[derive(Debug, Clone)]
pub struct Chart<'a> {
    /// Text above the plot, if any.
    pub title: Option<String>,
    /// Horizontal axis title, unit included by the caller (e.g. `T_site [degC]`).
    pub x_label: String,
    /// Vertical axis title, unit included by the caller (e.g. `K [m/s]`).
    pub y_label: String,
    /// The shared x values of all series.
    pub x: &'a [f64],
    /// One or more curves, each as long as `x`.
    pub series: Vec<Series<'a>>,
    /// Draw the horizontal axis on a base-10 logarithmic scale.
    pub log_x: bool,
    /// Draw the vertical axis on a base-10 logarithmic scale.
    pub log_y: bool,
    /// A profile: the x values run down the vertical axis (depth grows downwards) and the
    /// series across; `x_label` then titles the vertical axis.
    pub down: bool,
    /// A cross-plot: a marker at every point and no line joining them.
    pub points: bool,
}

impl Chart<'_> {
    /// Point `row` of `series` as drawn: (across, up or down).
    fn drawn(&self, series: &Series, row: usize) -> (f64, f64) {
        if self.down {
            (series.values[row], self.x[row])
        } else {
            (self.x[row], series.values[row])
        }
    }

    /// Every series value, for planning the axis they lie on.
    fn all_series_values(&self) -> impl Iterator<Item = f64> + '_ {
        self.series.iter().flat_map(|s| s.values.iter().copied())
    }
}

/// Which axis of the chart a problem concerns.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Axis {
    /// The horizontal axis.
    X,
    /// The vertical axis.
    Y,
}

impl fmt::Display for Axis {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Axis::X => f.write_str("x"),
            Axis::Y => f.write_str("y"),
        }
    }
}

/// Where a bad value came from: the x values or a named series.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum ValueSource {
    /// The chart's x values.
    X,
    /// The y values of the series with this name.
    Series(String),
}

impl fmt::Display for ValueSource {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            ValueSource::X => f.write_str("the x values"),
            ValueSource::Series(name) => write!(f, "series '{name}'"),
        }
    }
}

/// Why a chart could not be drawn.
#[derive(Debug, Clone, PartialEq)]
pub enum PlotError {
    /// The chart has no series to draw.
    NoSeries,
    /// A line needs at least two points.
    TooFewPoints {
        /// How many x values were given.
        count: usize,
    },
    /// A series does not have one value per x value.
    LengthMismatch {
        /// Name of the offending series.
        series: String,
        /// How many values the series has.
        series_len: usize,
        /// How many x values the chart has.
        x_len: usize,
    },
    /// A value is NaN or infinite.
    NonFinite {
        /// Where the value came from.
        source: ValueSource,
        /// Position of the value, counted from 0.
        index: usize,
        /// The value itself.
        value: f64,
    },
    /// A logarithmic axis was asked for, but a value on it is zero or negative.
    NonPositiveOnLogAxis {
        /// The logarithmic axis.
        axis: Axis,
        /// Where the value came from.
        source: ValueSource,
        /// Position of the value, counted from 0.
        index: usize,
        /// The value itself.
        value: f64,
    },
    /// The values on an axis span more than a floating-point number can hold.
    RangeTooWide {
        /// The axis concerned.
        axis: Axis,
    },
    /// The drawing library failed; the text is its own message.
    Drawing(String),
}

impl fmt::Display for PlotError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            PlotError::NoSeries => f.write_str("chart has no series to plot"),
            PlotError::TooFewPoints { count } => write!(
                f,
                "chart needs at least 2 points to draw a line, but has {count}"
            ),
            PlotError::LengthMismatch {
                series,
                series_len,
                x_len,
            } => write!(
                f,
                "series '{series}' has {series_len} values but there are {x_len} x values; \
                 each series needs one value per x value"
            ),
            PlotError::NonFinite {
                source,
                index,
                value,
            } => write!(
                f,
                "{source} contain {value} at index {index}; only finite numbers can be plotted"
            ),
            PlotError::NonPositiveOnLogAxis {
                axis,
                source,
                index,
                value,
            } => write!(
                f,
                "log {axis} axis needs values > 0, but {source} contain {value} at index {index}; \
                 use a linear {axis} axis or drop that point"
            ),
            PlotError::RangeTooWide { axis } => write!(
                f,
                "the {axis} values span too wide a range to plot (beyond floating-point limits)"
            ),
            PlotError::Drawing(message) => write!(f, "could not draw chart: {message}"),
        }
    }
}

impl std::error::Error for PlotError {}

impl<E: std::error::Error + Send + Sync> From<DrawingAreaErrorKind<E>> for PlotError {
    fn from(error: DrawingAreaErrorKind<E>) -> Self {
        PlotError::Drawing(error.to_string())
    }
}

/// Draws the chart and returns it as a standalone SVG document.
pub fn render_svg(chart: &Chart) -> Result<String, PlotError> {
    validate(chart)?;
    // In a profile the vertical axis is the x column, from its first value to its last with
    // no margin (a depth axis starts at the surface), growing downwards.
    let (x_axis, mut y_axis) = if chart.down {
        (
            plan_axis(
                Axis::X,
                chart.all_series_values(),
                chart.log_x,
                chart.points,
            )?,
            plan_axis(Axis::Y, chart.x.iter().copied(), chart.log_y, false)?,
        )
    } else {
        (
            // A cross-plot's markers at the extremes stay clear of the frame.
            plan_axis(Axis::X, chart.x.iter().copied(), chart.log_x, chart.points)?,
            plan_axis(Axis::Y, chart.all_series_values(), chart.log_y, true)?,
        )
    };
    y_axis.reversed = chart.down;

    let canvas = (CHART_WIDTH * SCALE, CHART_HEIGHT * SCALE);
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, canvas).into_drawing_area();
        root.fill(&WHITE)?;
        // The coordinate types differ between linear and log axes, so each
        // combination gets its own instance of the generic drawing code.
        match (x_axis.scale, y_axis.scale) {
            (Scale::Linear, Scale::Linear) => draw(
                &root,
                chart,
                (&x_axis, linear_coord(&x_axis)),
                (&y_axis, linear_coord(&y_axis)),
            )?,
            (Scale::Linear, Scale::Log) => draw(
                &root,
                chart,
                (&x_axis, linear_coord(&x_axis)),
                (&y_axis, log_coord(&y_axis)),
            )?,
            (Scale::Log, Scale::Linear) => draw(
                &root,
                chart,
                (&x_axis, log_coord(&x_axis)),
                (&y_axis, linear_coord(&y_axis)),
            )?,
            (Scale::Log, Scale::Log) => draw(
                &root,
                chart,
                (&x_axis, log_coord(&x_axis)),
                (&y_axis, log_coord(&y_axis)),
            )?,
        }
        root.present()?;
    }
    // The drawing was made on a finer canvas; its viewBox stays, while the
    // displayed size becomes the chart size.
    let drawn_header = format!(r#"<svg width="{}" height="{}""#, canvas.0, canvas.1);
    let shown_header = format!(r#"<svg width="{CHART_WIDTH}" height="{CHART_HEIGHT}""#);
    match svg.strip_prefix(&drawn_header) {
        Some(rest) => Ok(format!("{shown_header}{rest}")),
        None => Err(PlotError::Drawing(
            "unexpected SVG header from the drawing library".to_string(),
        )),
    }
}

/// Checks the input up front so that problems are reported in terms of the
/// caller's data rather than as a broken drawing.
fn validate(chart: &Chart) -> Result<(), PlotError> {
    if chart.series.is_empty() {
        return Err(PlotError::NoSeries);
    }
    if chart.x.len() < 2 {
        return Err(PlotError::TooFewPoints {
            count: chart.x.len(),
        });
    }
    for (position, series) in chart.series.iter().enumerate() {
        if series.values.len() != chart.x.len() {
            return Err(PlotError::LengthMismatch {
                series: series_name(series, position),
                series_len: series.values.len(),
                x_len: chart.x.len(),
            });
        }
    }
    let ((x_axis, x_log), (series_axis, series_log)) = if chart.down {
        ((Axis::Y, chart.log_y), (Axis::X, chart.log_x))
    } else {
        ((Axis::X, chart.log_x), (Axis::Y, chart.log_y))
    };
    check_values(chart.x, ValueSource::X, x_axis, x_log)?;
    for (position, series) in chart.series.iter().enumerate() {
        let source = ValueSource::Series(series_name(series, position));
        check_values(series.values, source, series_axis, series_log)?;
    }
    Ok(())
}

fn check_values(
    values: &[f64],
    source: ValueSource,
    axis: Axis,
    log_scale: bool,
) -> Result<(), PlotError> {
    for (index, &value) in values.iter().enumerate() {
        if !value.is_finite() {
            return Err(PlotError::NonFinite {
                source,
                index,
                value,
            });
        }
        if log_scale && value <= 0.0 {
            return Err(PlotError::NonPositiveOnLogAxis {
                axis,
                source,
                index,
                value,
            });
        }
    }
    Ok(())
}

/// Name used for a series in the legend and in messages; unnamed series get
/// a number so the engineer can still tell which one is meant.
fn series_name(series: &Series, position: usize) -> String {
    let label = printable(&series.label);
    if label.trim().is_empty() {
        format!("series {}", position + 1)
    } else {
        label
    }
}

/// Replaces control characters, which XML cannot carry, with spaces.
fn printable(text: &str) -> String {
    text.chars()
        .map(|c| if c.is_control() { ' ' } else { c })
        .collect()
}

// ---------------------------------------------------------------------------
// Axis planning: range, ticks and labels
// ---------------------------------------------------------------------------

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Scale {
    Linear,
    Log,
}

/// How many labelled ticks an axis may carry at most.
const MAX_LABELS: usize = 10;
/// The x axis gets fewer, as its labels sit side by side.
const MAX_X_LABELS: usize = 8;
/// Plot width, in displayed pixels, left even with the widest y labels.
const MIN_PLOT_WIDTH: u32 = 600;

/// The decided layout of one axis.
#[derive(Debug, Clone)]
struct AxisPlan {
    scale: Scale,
    start: f64,
    end: f64,
    /// Labelled ticks with bold grid lines.
    major: Vec<f64>,
    /// Unlabelled ticks with light grid lines.
    minor: Vec<f64>,
    /// Label text for each major tick, same order.
    labels: Vec<String>,
    /// Drawn from its end to its start: a depth axis growing downwards.
    reversed: bool,
}

impl AxisPlan {
    /// Label for a tick value handed back by plotters; ticks are ours, so
    /// the nearest one is the value asked about.
    fn label_for(&self, value: f64) -> String {
        self.major
            .iter()
            .zip(&self.labels)
            .min_by(|(a, _), (b, _)| (*a - value).abs().total_cmp(&(*b - value).abs()))
            .map(|(_, label)| label.clone())
            .unwrap_or_default()
    }

    fn longest_label_chars(&self) -> usize {
        self.labels
            .iter()
            .map(|l| l.chars().count())
            .max()
            .unwrap_or(0)
    }

    /// Position of a value along the axis, 0 at the start and 1 at the end (as drawn: the
    /// start of a reversed axis is at its far end).
    fn fraction(&self, value: f64) -> f64 {
        let fraction = self.unreversed_fraction(value);
        if self.reversed {
            1.0 - fraction
        } else {
            fraction
        }
    }

    fn unreversed_fraction(&self, value: f64) -> f64 {
        match self.scale {
            Scale::Linear => (value - self.start) / (self.end - self.start),
            Scale::Log => {
                (value.log10() - self.start.log10()) / (self.end.log10() - self.start.log10())
            }
        }
    }
}

/// The plan of one axis over `values`; `margin` keeps curves off the frame (the value axis
/// of a line chart), while an axis of positions (x, or depth) spans its values exactly.
fn plan_axis(
    axis: Axis,
    values: impl Iterator<Item = f64>,
    log_scale: bool,
    margin: bool,
) -> Result<AxisPlan, PlotError> {
    let (min, max) = values.fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), v| {
        (lo.min(v), hi.max(v))
    });
    if log_scale {
        let max_labels = match axis {
            Axis::X => MAX_X_LABELS,
            Axis::Y => MAX_LABELS,
        };
        return Ok(plan_log_axis(min, max, max_labels));
    }
    match axis {
        Axis::Y => plan_linear_axis(axis, min, max, MAX_LABELS, margin),
        // X labels sit side by side: take the most ticks whose labels
        // still leave room between them.
        Axis::X => {
            let mut plan = plan_linear_axis(axis, min, max, MAX_X_LABELS, margin)?;
            for max_labels in (2..MAX_X_LABELS).rev() {
                let label_width = char_width(TICK_FONT) * (plan.longest_label_chars() as u32 + 2);
                if label_width * plan.major.len() as u32 <= MIN_PLOT_WIDTH {
                    break;
                }
                plan = plan_linear_axis(axis, min, max, max_labels, margin)?;
            }
            Ok(plan)
        }
    }
}

fn plan_linear_axis(
    axis: Axis,
    min: f64,
    max: f64,
    max_labels: usize,
    margin: bool,
) -> Result<AxisPlan, PlotError> {
    let (mut start, mut end) = (min, max);
    if start == end {
        // A flat line still deserves a visible axis: open it around the value.
        let half_width = if start == 0.0 { 1.0 } else { start.abs() * 0.1 };
        start -= half_width;
        end += half_width;
    } else if margin {
        // Keep curves off the frame so their extremes stay visible.
        let margin = (end - start) * 0.05;
        start -= margin;
        end += margin;
    }
    let span = end - start;
    if !span.is_finite() || span <= 0.0 {
        return Err(PlotError::RangeTooWide { axis });
    }

    let step = nice_step(span, max_labels);
    let first_index = (start / step).ceil();
    let mut major = Vec::new();
    // Index-based stepping avoids accumulated rounding; the cap guards
    // against a pathological step that would never reach the end.
    for i in 0..=(4 * max_labels) {
        let value = (first_index + i as f64) * step;
        if value > end + step * 1e-9 {
            break;
        }
        major.push(if value.abs() < step * 1e-9 {
            0.0
        } else {
            value
        });
    }

    let subdivisions = if step_mantissa(step) == 2 { 4 } else { 5 };
    let minor_step = step / subdivisions as f64;
    let first_minor = (start / minor_step).ceil();
    let mut minor = Vec::new();
    for i in 0..=(4 * max_labels * subdivisions) {
        let index = first_minor + i as f64;
        let value = index * minor_step;
        if value > end {
            break;
        }
        if (index.rem_euclid(subdivisions as f64)).abs() > 0.5 {
            minor.push(value);
        }
    }

    let labels = linear_labels(&major, step);
    Ok(AxisPlan {
        scale: Scale::Linear,
        start,
        end,
        major,
        minor,
        labels,
        reversed: false,
    })
}

/// Smallest step of the form 1, 2 or 5 times a power of ten that keeps the
/// number of ticks at or below `max_ticks`.
fn nice_step(span: f64, max_ticks: usize) -> f64 {
    let rough = span / max_ticks.max(1) as f64;
    let magnitude = 10f64.powf(rough.log10().floor());
    for factor in [1.0, 2.0, 5.0, 10.0] {
        let step = factor * magnitude;
        if span / step <= max_ticks as f64 {
            return step;
        }
    }
    10.0 * magnitude
}

/// Leading digit of a step made by `nice_step` (1, 2 or 5).
fn step_mantissa(step: f64) -> u32 {
    let exponent = step.log10().floor();
    (step / 10f64.powf(exponent)).round() as u32
}

/// Log axes use plain decimals only inside this band; outside it engineers
/// read `1e-6` faster than `0.000001`.
fn needs_scientific(magnitude: f64) -> bool {
    magnitude != 0.0 && !(1e-3..1e5).contains(&magnitude)
}

/// Labels for evenly spaced ticks: plain decimals unless scientific
/// notation is clearly shorter, so `3.5e-6` beats `0.0000035` while
/// `100000.2` beats `1.000002e5`.
fn linear_labels(ticks: &[f64], step: f64) -> Vec<String> {
    let step_exponent = snapped_log10(step).floor() as i32;
    let decimals = (-step_exponent).max(0) as usize;
    let plain: Vec<String> = ticks.iter().map(|&v| format!("{v:.decimals$}")).collect();
    let scientific_labels: Vec<String> = ticks
        .iter()
        .map(|&value| {
            if value == 0.0 {
                return "0".to_string();
            }
            let value_exponent = snapped_log10(value.abs()).floor() as i32;
            let digits = (value_exponent - step_exponent).max(0) as usize;
            scientific(value, digits)
        })
        .collect();
    let longest = |labels: &[String]| labels.iter().map(|l| l.chars().count()).max().unwrap_or(0);
    if longest(&plain) <= longest(&scientific_labels) + 1 {
        plain
    } else {
        scientific_labels
    }
}

/// `value` as `m.mmme-x` with trailing zeros of the mantissa dropped.
fn scientific(value: f64, mantissa_digits: usize) -> String {
    let text = format!("{value:.mantissa_digits$e}");
    match text.split_once('e') {
        Some((mantissa, exponent)) if mantissa.contains('.') => {
            let mantissa = mantissa.trim_end_matches('0').trim_end_matches('.');
            format!("{mantissa}e{exponent}")
        }
        _ => text,
    }
}

/// Rounds a base-10 logarithm that is within float noise of an integer, so
/// that exact decades such as 1e-3 are not widened by a whole decade.
fn snapped_log10(value: f64) -> f64 {
    let log = value.log10();
    if (log - log.round()).abs() < 1e-9 {
        log.round()
    } else {
        log
    }
}

fn plan_log_axis(min: f64, max: f64, max_labels: usize) -> AxisPlan {
    // Whole decades make log charts easy to read and guarantee ticks.
    // The clamp keeps powers of ten among normal (not subnormal) floats.
    let mut low = (snapped_log10(min).floor() as i32).clamp(-307, 307);
    let mut high = (snapped_log10(max).ceil() as i32).clamp(-307, 307);
    if low == high {
        low -= 1;
        high += 1;
    }
    let stride = ((high - low) as usize).div_ceil(max_labels.max(1)).max(1);
    // Widen to a whole number of strides so that the top decade is labelled too.
    high = (low + (stride * ((high - low) as usize).div_ceil(stride)) as i32).min(308);
    let decades = (high - low) as usize;

    let mut major = Vec::new();
    let mut minor = Vec::new();
    for exponent in low..=high {
        let decade = 10f64.powi(exponent);
        if ((exponent - low) as usize).is_multiple_of(stride) {
            major.push(decade);
        } else {
            minor.push(decade);
        }
        if exponent == high || stride > 1 {
            continue;
        }
        for factor in 2..=9 {
            let value = decade * factor as f64;
            // A single decade would have only two labels; add 2 and 5.
            if decades == 1 && (factor == 2 || factor == 5) {
                major.push(value);
            } else {
                minor.push(value);
            }
        }
    }
    major.sort_by(f64::total_cmp);

    let labels = log_labels(&major);
    AxisPlan {
        scale: Scale::Log,
        // A hair beyond the decades so rounding never drops the end ticks.
        start: 10f64.powi(low) * (1.0 - 1e-9),
        end: 10f64.powi(high) * (1.0 + 1e-9),
        major,
        minor,
        labels,
        reversed: false,
    }
}

fn log_labels(ticks: &[f64]) -> Vec<String> {
    let all_plain = ticks.iter().all(|&v| !needs_scientific(v));
    ticks
        .iter()
        .map(|&value| {
            if all_plain {
                let exponent = snapped_log10(value).floor() as i32;
                let decimals = (-exponent).max(0) as usize;
                format!("{value:.decimals$}")
            } else {
                scientific(value, 0)
            }
        })
        .collect()
}

/// A plotters coordinate that maps values like `inner` but uses the ticks
/// planned here. Plotters' own key-point wrapper cannot be used for this
/// because it loses the label formatting that the mesh requires.
struct PlannedCoord<R> {
    inner: R,
    major: Vec<f64>,
    minor: Vec<f64>,
    /// Maps the start to the far end of the pixels: a depth axis growing downwards.
    reversed: bool,
}

impl<R: Ranged<ValueType = f64>> Ranged for PlannedCoord<R> {
    type FormatOption = DefaultFormatting;
    type ValueType = f64;

    fn map(&self, value: &f64, limit: (i32, i32)) -> i32 {
        if self.reversed {
            self.inner.map(value, (limit.1, limit.0))
        } else {
            self.inner.map(value, limit)
        }
    }

    fn key_points<Hint: KeyPointHint>(&self, hint: Hint) -> Vec<f64> {
        if hint.weight().allow_light_points() {
            self.minor.clone()
        } else {
            self.major.clone()
        }
    }

    fn range(&self) -> std::ops::Range<f64> {
        self.inner.range()
    }

    fn axis_pixel_range(&self, limit: (i32, i32)) -> std::ops::Range<i32> {
        self.inner.axis_pixel_range(limit)
    }
}

fn linear_coord(plan: &AxisPlan) -> PlannedCoord<RangedCoordf64> {
    PlannedCoord {
        inner: (plan.start..plan.end).into(),
        major: plan.major.clone(),
        minor: plan.minor.clone(),
        reversed: plan.reversed,
    }
}

fn log_coord(plan: &AxisPlan) -> PlannedCoord<LogCoord<f64>> {
    PlannedCoord {
        inner: (plan.start..plan.end).log_scale().into(),
        major: plan.major.clone(),
        minor: plan.minor.clone(),
        reversed: plan.reversed,
    }
}

// ---------------------------------------------------------------------------
// Drawing
// ---------------------------------------------------------------------------

/// Colours chosen to be told apart easily on a white background.
const PALETTE: [RGBColor; 10] = [
    RGBColor(31, 99, 180),
    RGBColor(214, 96, 24),
    RGBColor(40, 150, 70),
    RGBColor(180, 40, 60),
    RGBColor(120, 80, 170),
    RGBColor(20, 150, 160),
    RGBColor(150, 110, 40),
    RGBColor(90, 90, 90),
    RGBColor(210, 80, 160),
    RGBColor(120, 140, 20),
];

/// Colour of the series at `position`. Past the palette, hues are spread by
/// the golden ratio and lightness alternates, so that even many series keep
/// distinct colours.
fn series_colour(position: usize) -> RGBColor {
    if let Some(colour) = PALETTE.get(position) {
        return *colour;
    }
    let hue = (0.5 + position as f64 * 0.618_033_988_75).fract();
    let lightness = if position.is_multiple_of(2) {
        0.32
    } else {
        0.5
    };
    let (r, g, b) = HSLColor(hue, 0.75, lightness).rgb();
    RGBColor(r, g, b)
}

/// Markers help to see where values were computed, but clutter dense curves.
const MAX_POINTS_WITH_MARKERS: usize = 40;

/// Plotters places everything on whole pixels, which makes sloped curves
/// wobble. Drawing on a canvas this many times finer and letting the SVG
/// viewBox scale it down keeps curves smooth. All sizes below are in
/// displayed pixels and go through `px`.
const SCALE: u32 = 4;

fn px(displayed: u32) -> u32 {
    displayed * SCALE
}

fn font_px(displayed: f64) -> f64 {
    displayed * f64::from(SCALE)
}

const FONT: &str = "sans-serif";
/// Plotters writes an SVG font size 1.24 times smaller than the size given.
const FONT_SHRINK: f64 = 1.24;
const TICK_FONT: f64 = 16.0;
const AXIS_TITLE_FONT: f64 = 19.0;
const CHART_TITLE_FONT: f64 = 24.0;

/// Generous width of one tick-label character in displayed pixels, so the
/// label areas are never too narrow for their numbers.
fn char_width(font: f64) -> u32 {
    (font / FONT_SHRINK * 0.62).ceil() as u32
}

fn text_height(font: f64) -> u32 {
    (font / FONT_SHRINK).ceil() as u32
}

fn draw<DB, X, Y>(
    root: &DrawingArea<DB, Shift>,
    chart: &Chart,
    (x_plan, x_coord): (&AxisPlan, X),
    (y_plan, y_coord): (&AxisPlan, Y),
) -> Result<(), PlotError>
where
    DB: DrawingBackend,
    DB::ErrorType: 'static,
    X: Ranged<ValueType = f64> + ValueFormatter<f64>,
    Y: Ranged<ValueType = f64> + ValueFormatter<f64>,
{
    let tick_char = char_width(TICK_FONT);
    let y_tick_width = tick_char * y_plan.longest_label_chars() as u32;
    let x_tick_half_width = tick_char * x_plan.longest_label_chars() as u32 / 2;
    // Half of the top y tick label sticks out above the plot.
    let mut top_margin = text_height(TICK_FONT) / 2 + 10;

    if let Some(title) = chart.title.as_deref().filter(|t| !t.trim().is_empty()) {
        let style = TextStyle::from((FONT, font_px(CHART_TITLE_FONT)).into_font())
            .pos(Pos::new(HPos::Center, VPos::Top));
        let centre = (px(CHART_WIDTH / 2) as i32, px(10) as i32);
        root.draw(&Text::new(printable(title), centre, style))?;
        top_margin += 10 + text_height(CHART_TITLE_FONT);
    }

    let mut builder = ChartBuilder::on(root);
    builder
        .margin_top(px(top_margin))
        .margin_left(px(10))
        // The last x tick label is centred on the right edge of the plot.
        .margin_right(px(10 + x_tick_half_width))
        .margin_bottom(px(8))
        .x_label_area_size(px(text_height(TICK_FONT)
            + text_height(AXIS_TITLE_FONT)
            + 22))
        .y_label_area_size(px(y_tick_width + text_height(AXIS_TITLE_FONT) + 24));
    let mut context = builder.build_cartesian_2d(x_coord, y_coord)?;

    let x_format = |value: &f64| x_plan.label_for(*value);
    let y_format = |value: &f64| y_plan.label_for(*value);
    let (across, upright) = if chart.down {
        (&chart.y_label, &chart.x_label)
    } else {
        (&chart.x_label, &chart.y_label)
    };
    context
        .configure_mesh()
        .x_desc(printable(across))
        .y_desc(printable(upright))
        .x_label_formatter(&x_format)
        .y_label_formatter(&y_format)
        .label_style((FONT, font_px(TICK_FONT)))
        .axis_desc_style((FONT, font_px(AXIS_TITLE_FONT)))
        .set_all_tick_mark_size(px(5))
        .bold_line_style(RGBColor(200, 200, 200).stroke_width(px(1)))
        .light_line_style(RGBColor(235, 235, 235).stroke_width(px(1)))
        .axis_style(BLACK.stroke_width(px(1)))
        .draw()?;

    let with_markers = chart.points || chart.x.len() <= MAX_POINTS_WITH_MARKERS;
    let marker_radius = px(3);
    for (position, series) in chart.series.iter().enumerate() {
        let colour = series_colour(position);
        let points = (0..chart.x.len()).map(|row| chart.drawn(series, row));
        let coordinates = context.as_coord_spec();
        let long = chart.x.len() > THIN_CURVES_ABOVE;
        // A profile's curve runs down the pixel rows: thin along those.
        let path: Vec<(f64, f64)> = match (chart.points, long, chart.down) {
            (true, _, _) => Vec::new(),
            (false, false, _) => points.clone().collect(),
            (false, true, false) => {
                thinned_path(points.clone(), |point| coordinates.translate(point))
            }
            (false, true, true) => thinned_path(points.clone(), |point| {
                let (column, row) = coordinates.translate(point);
                (row, column)
            }),
        };
        // Of a long cross-plot, one marker per displayed pixel: the same picture, and an SVG
        // of a million rows stays small.
        let mut seen = std::collections::HashSet::new();
        let markers: Vec<(f64, f64)> = if with_markers {
            points
                .filter(|point| {
                    let (column, row) = coordinates.translate(point);
                    !long || seen.insert((column / SCALE as i32, row / SCALE as i32))
                })
                .collect()
        } else {
            Vec::new()
        };
        if !chart.points {
            context.draw_series(std::iter::once(PathElement::new(
                path,
                colour.stroke_width(px(2)),
            )))?;
        }
        context.draw_series(
            markers
                .into_iter()
                .map(|point| Circle::new(point, marker_radius, colour.filled())),
        )?;
    }

    if chart.series.len() >= 2 {
        let corner = emptiest_corner(chart, x_plan, y_plan);
        draw_legend(&context.plotting_area().strip_coord_spec(), chart, corner)?;
    }
    Ok(())
}

/// Curves longer than this are thinned (`thinned_path`); shorter ones keep a vertex per row,
/// as a reader of the SVG expects.
const THIN_CURVES_ABOVE: usize = 10_000;

/// The points of a curve with each run of consecutive points on one pixel column reduced to
/// its first, lowest, highest and last point, in their order: the line then covers the same
/// pixels, and a curve of ten million rows is drawn (and held as SVG) as a few thousand points.
fn thinned_path(
    points: impl Iterator<Item = (f64, f64)>,
    pixel_of: impl Fn(&(f64, f64)) -> (i32, i32),
) -> Vec<(f64, f64)> {
    /// One pixel column's run: (row, point, pixel y) of its first, lowest, highest and last.
    struct Run {
        column: i32,
        kept: [(usize, (f64, f64), i32); 4],
    }
    fn flush(run: &Run, path: &mut Vec<(f64, f64)>) {
        let mut kept = run.kept;
        kept.sort_by_key(|(row, _, _)| *row);
        let mut previous = None;
        for (row, point, _) in kept {
            if previous != Some(row) {
                path.push(point);
                previous = Some(row);
            }
        }
    }
    let mut path = Vec::new();
    let mut current: Option<Run> = None;
    for (row, point) in points.enumerate() {
        let (column, pixel_y) = pixel_of(&point);
        let entry = (row, point, pixel_y);
        match &mut current {
            Some(run) if run.column == column => {
                // Screen y grows downwards; which of the two is "lowest" does not matter.
                if pixel_y < run.kept[1].2 {
                    run.kept[1] = entry;
                }
                if pixel_y > run.kept[2].2 {
                    run.kept[2] = entry;
                }
                run.kept[3] = entry;
            }
            _ => {
                if let Some(run) = &current {
                    flush(run, &mut path);
                }
                current = Some(Run {
                    column,
                    kept: [entry; 4],
                });
            }
        }
    }
    if let Some(run) = &current {
        flush(run, &mut path);
    }
    path
}

/// A corner of the plot area.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Corner {
    UpperRight,
    UpperLeft,
    LowerRight,
    LowerLeft,
}

/// Draws the legend box in a corner of the plot area. It is drawn here,
/// not by plotters, so that its spacing follows the drawing scale and its
/// colour samples are filled bars: the data curves then stay the only
/// polylines in the SVG.
fn draw_legend<DB>(
    plot_area: &DrawingArea<DB, Shift>,
    chart: &Chart,
    corner: Corner,
) -> Result<(), PlotError>
where
    DB: DrawingBackend,
    DB::ErrorType: 'static,
{
    let names: Vec<String> = chart
        .series
        .iter()
        .enumerate()
        .map(|(position, series)| series_name(series, position))
        .collect();
    let longest = names.iter().map(|n| n.chars().count()).max().unwrap_or(0) as u32;

    let (padding, bar_length, bar_gap) = (8, 22, 8);
    let row_height = text_height(TICK_FONT) * 3 / 2;
    let width = padding * 2 + bar_length + bar_gap + longest * char_width(TICK_FONT);
    let height = padding * 2 + row_height * names.len() as u32;
    let inset = 10;

    let (area_width, area_height) = plot_area.dim_in_pixel();
    let right_left = area_width.saturating_sub(px(inset + width)) as i32;
    let lower_top = area_height.saturating_sub(px(inset + height)) as i32;
    let (left, top) = match corner {
        Corner::UpperRight => (right_left, px(inset) as i32),
        Corner::UpperLeft => (px(inset) as i32, px(inset) as i32),
        Corner::LowerRight => (right_left, lower_top),
        Corner::LowerLeft => (px(inset) as i32, lower_top),
    };
    let (right, bottom) = (left + px(width) as i32, top + px(height) as i32);
    let border = px(1) as i32;

    // An opaque box drawn over a slightly larger grey one gives a border of
    // the right thickness at any drawing scale.
    plot_area.draw(&Rectangle::new(
        [(left, top), (right, bottom)],
        RGBColor(120, 120, 120).filled(),
    ))?;
    plot_area.draw(&Rectangle::new(
        [
            (left + border, top + border),
            (right - border, bottom - border),
        ],
        WHITE.filled(),
    ))?;

    let text_style = TextStyle::from((FONT, font_px(TICK_FONT)).into_font())
        .pos(Pos::new(HPos::Left, VPos::Center));
    for (row, name) in names.into_iter().enumerate() {
        let colour = series_colour(row);
        let middle = top + px(padding + row_height * row as u32 + row_height / 2) as i32;
        let bar_left = left + px(padding) as i32;
        let bar_right = bar_left + px(bar_length) as i32;
        plot_area.draw(&Rectangle::new(
            [(bar_left, middle - border), (bar_right, middle + border)],
            colour.filled(),
        ))?;
        let text_left = bar_right + px(bar_gap) as i32;
        plot_area.draw(&Text::new(name, (text_left, middle), text_style.clone()))?;
    }
    Ok(())
}

/// Puts the legend where it hides the fewest data points.
fn emptiest_corner(chart: &Chart, x_plan: &AxisPlan, y_plan: &AxisPlan) -> Corner {
    // (position, x is on the right, y is at the top), in order of preference.
    let corners = [
        (Corner::UpperRight, true, true),
        (Corner::UpperLeft, false, true),
        (Corner::LowerRight, true, false),
        (Corner::LowerLeft, false, false),
    ];
    let fractions: Vec<(f64, f64)> = chart
        .series
        .iter()
        .flat_map(|series| (0..chart.x.len()).map(move |row| chart.drawn(series, row)))
        .map(|(x, y)| (x_plan.fraction(x), y_plan.fraction(y)))
        .collect();
    let hidden_points = |right: bool, top: bool| {
        fractions
            .iter()
            .filter(|(fx, fy)| {
                let in_x = if right { *fx > 0.6 } else { *fx < 0.4 };
                let in_y = if top { *fy > 0.6 } else { *fy < 0.4 };
                in_x && in_y
            })
            .count()
    };
    corners
        .into_iter()
        .min_by_key(|(_, right, top)| hidden_points(*right, *top))
        .map(|(position, _, _)| position)
        .unwrap_or(Corner::UpperRight)
}

/// The chart of a sheet's `plot` line.
pub fn plot_svg(plot: &crate::eval::PlotOutcome) -> Result<String, PlotError> {
    render_svg(&chart_of(plot, plot.title.clone()))
}

/// The chart of a `plot` line without its title, for a page that sets the title once in
/// the chart's caption.
pub fn plot_svg_untitled(plot: &crate::eval::PlotOutcome) -> Result<String, PlotError> {
    render_svg(&chart_of(plot, None))
}

fn chart_of(plot: &crate::eval::PlotOutcome, title: Option<String>) -> Chart<'_> {
    Chart {
        title,
        x_label: plot.x_label.clone(),
        y_label: plot.y_label.clone(),
        x: &plot.x,
        series: plot
            .series
            .iter()
            .map(|(label, values)| Series {
                label: label.clone(),
                values,
            })
            .collect(),
        log_x: plot.log_x,
        log_y: plot.log_y,
        down: plot.down,
        points: plot.points,
    }
}

#[cfg(test)]
mod tests {
    use super::thinned_path;

    /// Pixels of a chart 10 points per column wide and one point per pixel high.
    fn pixel_of(point: &(f64, f64)) -> (i32, i32) {
        ((point.0 / 10.0).floor() as i32, point.1 as i32)
    }

    #[test]
    fn points_on_their_own_pixel_columns_are_all_kept() {
        let points: Vec<(f64, f64)> = (0..50)
            .map(|i| (f64::from(i) * 10.0, f64::from(i)))
            .collect();
        assert_eq!(thinned_path(points.iter().copied(), pixel_of), points);
    }

    #[test]
    fn a_run_on_one_column_keeps_its_first_extremes_and_last_in_order() {
        let run = [
            (0.0, 5.0),
            (1.0, 9.0),
            (2.0, 1.0),
            (3.0, 4.0),
            (4.0, 6.0),
            (12.0, 3.0),
        ];
        assert_eq!(
            thinned_path(run.iter().copied(), pixel_of),
            [(0.0, 5.0), (1.0, 9.0), (2.0, 1.0), (4.0, 6.0), (12.0, 3.0)]
        );
    }

    #[test]
    fn a_million_points_become_a_few_per_column() {
        let points = (0..1_000_000).map(|i| (f64::from(i) / 1000.0, f64::from(i % 7)));
        let path = thinned_path(points, pixel_of);
        // 101 columns (0 to 100), at most four points each.
        assert!(path.len() <= 4 * 101, "{}", path.len());
        assert_eq!(path.first(), Some(&(0.0, 0.0)));
        assert_eq!(path.last(), Some(&(999.999, f64::from(999_999 % 7))));
    }
}
