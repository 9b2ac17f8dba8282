//! Plot lines: the columns of a chart, in the first series' unit.

use super::*;
use crate::eval::error::{EvalError, EvalErrorKind};
use crate::units::Unit;

impl<'l> Calculator<'l> {
    /// Gathers a plot line's columns: every series the length of the x column, all series of one
    /// dimension (shown in the first series' unit).
    pub(crate) fn plot(
        &mut self,
        plot: &crate::syntax::Plot,
        scope: &dyn Scope,
    ) -> Result<PlotOutcome, Failure> {
        if self.sampling.is_some() {
            let what = "a `plot` line";
            let error = EvalError::new(EvalErrorKind::NotWithSamples { what }, plot.against.span);
            return Err(error.into());
        }
        let column = |name: &crate::syntax::Name| -> Result<ShownColumn, Failure> {
            match scope.lookup(&name.text) {
                None => Err(EvalError::new(
                    EvalErrorKind::UnknownName {
                        name: name.text.clone(),
                        suggestion: None,
                    },
                    name.span,
                )
                .into()),
                Some(None) => Err(Failure::Upstream(name.text.clone())),
                Some(Some(Shown::Column(column))) => Ok(column.as_ref().clone()),
                Some(Some(_)) => Err(EvalError::new(
                    EvalErrorKind::Plot {
                        message: format!(
                            "`{}` is not a column of numbers; a plot draws columns",
                            name.text
                        ),
                    },
                    name.span,
                )
                .into()),
            }
        };
        let x = column(&plot.against)?;
        let mut series: Vec<(String, Vec<f64>)> = Vec::new();
        let mut first: Option<(ShownColumn, Unit)> = None;
        for name in &plot.series {
            let shown = column(name)?;
            if shown.len() != x.len() {
                return Err(EvalError::new(
                    EvalErrorKind::ColumnLengths {
                        left_rows: shown.len(),
                        left_origin: name.text.clone(),
                        right_rows: x.len(),
                        right_origin: plot.against.text.clone(),
                    },
                    name.span,
                )
                .into());
            }
            let values = match &first {
                None => {
                    let unit = crate::syntax::parse_unit(&shown.unit)
                        .ok()
                        .and_then(|expression| resolve_unit(&expression).ok())
                        .unwrap_or_else(Unit::dimensionless);
                    let values = shown.shown_values().collect();
                    first = Some((shown, unit));
                    values
                }
                Some((reference, unit)) => {
                    if reference.column.dimension != shown.column.dimension {
                        return Err(EvalError::new(
                            EvalErrorKind::Plot {
                                message: format!(
                                    "`{}` is {} but `{}` is {}: series on one chart share a dimension",
                                    name.text,
                                    shown.column.dimension.phrase(),
                                    plot.series[0].text,
                                    reference.column.dimension.phrase()
                                ),
                            },
                            name.span,
                        )
                        .into());
                    }
                    if reference.unit == shown.unit {
                        shown.shown_values().collect()
                    } else {
                        shown
                            .column
                            .values
                            .iter()
                            .map(|value| unit.from_si(*value))
                            .collect()
                    }
                }
            };
            series.push((name.text.clone(), values));
        }
        let y_unit = first
            .as_ref()
            .map_or(String::new(), |(shown, _)| shown.unit.clone());
        let with_unit = |name: &str, unit: &str| match unit {
            "1" | "" => name.to_string(),
            unit => format!("{name} [{unit}]"),
        };
        let y_label = match series.as_slice() {
            [(name, _)] => with_unit(name, &y_unit),
            _ => with_unit("", &y_unit).trim().to_string(),
        };
        Ok(PlotOutcome {
            title: plot.title.clone(),
            x_label: with_unit(&plot.against.text, &x.unit),
            y_label,
            x: x.shown_values().collect(),
            series,
            log_x: plot.log_x,
            log_y: plot.log_y,
            down: plot.down,
            points: plot.points,
        })
    }
}
