//! `run --plot FILE.svg`: the sheet's `plot` lines written as SVG files. The first chart goes
//! to FILE, the next to FILE-2.svg and so on, so one option names them all.

use super::exit;
use super::output_file::{refuse_output, write_atomically};
use crate::eval::{Evaluation, LineResult, PlotOutcome};
use crate::render::plot::plot_svg;
use std::path::{Path, PathBuf};

/// The plot lines of the main sheet, in order.
pub fn plots(evaluation: &Evaluation) -> Vec<(usize, &PlotOutcome)> {
    evaluation
        .lines
        .iter()
        .filter_map(|line| match &line.result {
            LineResult::Plot(plot) => Some((line.number, plot.as_ref())),
            _ => None,
        })
        .collect()
}

/// The file the `index`-th chart (0-based) goes to.
fn numbered(target: &Path, index: usize) -> PathBuf {
    if index == 0 {
        return target.to_path_buf();
    }
    let stem = target
        .file_stem()
        .map_or("plot".into(), |stem| stem.to_string_lossy());
    let extension = target
        .extension()
        .map_or("svg".into(), |extension| extension.to_string_lossy());
    target.with_file_name(format!("{stem}-{}.{extension}", index + 1))
}

/// Writes every chart; the error carries the exit code (2: nothing to plot, or a file that may
/// not be written; 3: a chart cannot
/// be drawn or written). No chart replaces an input of the run (`inputs`): the sheet, an
/// included sheet or a data file.
pub fn write_plots(
    evaluation: &Evaluation,
    target: &Path,
    inputs: &[PathBuf],
) -> Result<Vec<PathBuf>, (u8, String)> {
    let charts = plots(evaluation);
    if charts.is_empty() {
        let message = if evaluation.has_errors() {
            "no chart written: the sheet's plot lines have errors (see above)"
        } else {
            "the sheet has no plot line to draw; add one such as `plot K against T log y`"
        };
        return Err((exit::USAGE, message.to_string()));
    }
    // Every chart's file is checked before any is written.
    for index in 0..charts.len() {
        refuse_output(&numbered(target, index), inputs)
            .map_err(|message| (exit::USAGE, message))?;
    }
    let mut written = Vec::new();
    for (index, (line, chart)) in charts.into_iter().enumerate() {
        let svg = plot_svg(chart)
            .map_err(|error| (exit::SHEET_ERROR, format!("plot on line {line}: {error}")))?;
        let file = numbered(target, index);
        write_atomically(&file, |output| {
            std::io::Write::write_all(output, svg.as_bytes())
        })
        .map_err(|error| {
            (
                exit::SHEET_ERROR,
                format!("cannot write `{}`: {error}", file.display()),
            )
        })?;
        written.push(file);
    }
    Ok(written)
}

#[cfg(test)]
mod tests {
    use super::numbered;
    use std::path::Path;

    #[test]
    fn later_charts_are_numbered_beside_the_first() {
        let target = Path::new("out/sweep.svg");
        assert_eq!(numbered(target, 0), Path::new("out/sweep.svg"));
        assert_eq!(numbered(target, 1), Path::new("out/sweep-2.svg"));
        assert_eq!(numbered(target, 2), Path::new("out/sweep-3.svg"));
    }
}
