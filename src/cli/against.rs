//! `fluxsheet check --against EARLIER.json`: the values of an earlier `fluxsheet run --format
//! json` (one sheet object or an array of them), and the comparison of a new evaluation with
//! them, named line by named line (compared in SI, shown in the line's display unit), and of
//! the files the run read, by their SHA-256.

use crate::eval::{Evaluation, LineResult};
use serde_json::Value;
use std::path::Path;

/// One named value of an earlier run.
#[derive(Debug, Clone)]
pub struct EarlierValue {
    pub name: String,
    pub line: u64,
    /// One number for a single value, every row for a column.
    pub si_values: Vec<f64>,
    pub is_column: bool,
    pub si_unit: String,
    /// The value as the sheet showed it (`92.37 m^3/yr`), first row of a column.
    pub shown: Option<String>,
}

/// One sheet of an earlier run.
#[derive(Debug, Clone)]
pub struct EarlierSheet {
    pub file: Option<String>,
    /// The sheet's `@title`, to pair sheets whose paths moved.
    pub title: Option<String>,
    pub values: Vec<EarlierValue>,
    /// `(path, sha256)` of every input the earlier run read (empty for runs that did not say).
    pub inputs: Vec<(String, String)>,
}

/// An input file that is not what it was.
#[derive(Debug, Clone, PartialEq)]
pub struct InputChange {
    pub path: String,
    /// `changed`, `added` or `removed`.
    pub change: &'static str,
}

/// What the earlier run read against what this run read, path by path.
pub fn compare_inputs(
    earlier: &EarlierSheet,
    now: &[crate::render::report::InputFile],
) -> Vec<InputChange> {
    if earlier.inputs.is_empty() {
        return Vec::new();
    }
    let mut changes = Vec::new();
    // The main sheet comes first on both sides and pairs whatever its name (a renamed sheet
    // paired by its title); the other inputs pair by their path from the sheet's folder.
    let (Some((_, main_sha256)), Some(main)) = (earlier.inputs.first(), now.first()) else {
        return changes;
    };
    if main.sha256 != *main_sha256 {
        changes.push(InputChange {
            path: main.path.clone(),
            change: "changed",
        });
    }
    let now = &now[1..];
    for (path, sha256) in &earlier.inputs[1..] {
        match now.iter().find(|input| input.path == *path) {
            Some(input) if input.sha256 != *sha256 => changes.push(InputChange {
                path: path.clone(),
                change: "changed",
            }),
            Some(_) => {}
            None => changes.push(InputChange {
                path: path.clone(),
                change: "removed",
            }),
        }
    }
    for input in now {
        if !earlier.inputs[1..]
            .iter()
            .any(|(path, _)| *path == input.path)
        {
            changes.push(InputChange {
                path: input.path.clone(),
                change: "added",
            });
        }
    }
    changes
}

/// All sheets of an earlier run.
#[derive(Debug, Clone)]
pub struct Earlier {
    pub sheets: Vec<EarlierSheet>,
}

/// A value that is not what it was.
#[derive(Debug, Clone)]
pub struct Moved {
    pub name: String,
    /// The line now, or the earlier line when it is gone.
    pub line: u64,
    /// For a column: the row (1-based) that moved most, which the values are from.
    pub row: Option<usize>,
    pub old_si_value: f64,
    pub old_si_unit: String,
    /// `None` when the line is no longer computed.
    pub new_si_value: Option<f64>,
    pub new_si_unit: Option<String>,
    /// |new - old| / max(|old|, |new|), when both exist in the same SI unit.
    pub relative_change: Option<f64>,
    /// The values as the sheets show them, in their display units (the row that moved most).
    pub old_shown: Option<String>,
    pub new_shown: Option<String>,
    /// Signed (new - old) / |old|, for the summary: how a checker reads "3 % up".
    pub signed_change: Option<f64>,
}

impl Earlier {
    /// Reads and checks the earlier JSON; the message says what is wrong.
    pub fn load(path: &Path) -> Result<Earlier, String> {
        let shown = path.display();
        let text = std::fs::read_to_string(path)
            .map_err(|error| format!("cannot read earlier results `{shown}`: {error}"))?;
        let document: Value = serde_json::from_str(&text)
            .map_err(|error| format!("earlier results `{shown}` are not JSON: {error}"))?;
        let objects: Vec<&Value> = match &document {
            Value::Array(items) => items.iter().collect(),
            object @ Value::Object(_) => vec![object],
            _ => Vec::new(),
        };
        if objects.is_empty() {
            return Err(format!(
                "earlier results `{shown}` hold no sheet: expected the output of `fluxsheet run --format json`"
            ));
        }
        let sheets = objects
            .into_iter()
            .map(|object| sheet_of(object).ok_or_else(|| {
                format!(
                    "earlier results `{shown}` are not the output of `fluxsheet run --format json` (a sheet lacks `lines` with `name`, `line`, `si_value` and `si_unit`)"
                )
            }))
            .collect::<Result<Vec<_>, _>>()?;
        Ok(Earlier { sheets })
    }

    /// The earlier sheet to compare `label` (read from `path`) with. With one sheet on each side
    /// they pair whatever their names; otherwise by the same file label, then the same file,
    /// then the one earlier file whose path ends with `relative` (the sheet's path within the
    /// folder given, so `sheets_v2/x.fxs` finds `sheets/x.fxs`), then the one of the same
    /// `@title`.
    pub fn find(
        &self,
        label: &str,
        path: Option<&Path>,
        checked: usize,
        relative: Option<&str>,
        title: Option<&str>,
    ) -> Option<&EarlierSheet> {
        let found = self.find_by_file(label, path, checked);
        if found.is_some() {
            return found;
        }
        if let Some(relative) = relative {
            let wanted: Vec<&str> = relative.split(['/', '\\']).collect();
            let matches: Vec<&EarlierSheet> = self
                .sheets
                .iter()
                .filter(|sheet| {
                    sheet.file.as_deref().is_some_and(|file| {
                        let parts: Vec<&str> = file.split(['/', '\\']).collect();
                        parts.ends_with(&wanted)
                    })
                })
                .collect();
            if let [only] = matches.as_slice() {
                return Some(only);
            }
        }
        let title = title.filter(|title| !title.is_empty())?;
        let matches: Vec<&EarlierSheet> = self
            .sheets
            .iter()
            .filter(|sheet| sheet.title.as_deref() == Some(title))
            .collect();
        match matches.as_slice() {
            [only] => Some(only),
            _ => None,
        }
    }

    fn find_by_file(
        &self,
        label: &str,
        path: Option<&Path>,
        checked: usize,
    ) -> Option<&EarlierSheet> {
        if checked == 1 && self.sheets.len() == 1 {
            return self.sheets.first();
        }
        if let Some(sheet) = self
            .sheets
            .iter()
            .find(|sheet| sheet.file.as_deref() == Some(label))
        {
            return Some(sheet);
        }
        let canonical = path.and_then(|path| path.canonicalize().ok())?;
        self.sheets.iter().find(|sheet| {
            sheet
                .file
                .as_deref()
                .and_then(|file| Path::new(file).canonicalize().ok())
                .is_some_and(|earlier| earlier == canonical)
        })
    }
}

/// A sheet object's named values; `None` when it is not shaped like `run`'s JSON. An object
/// with only `diagnostics` (a file that could not be read) has no values.
fn sheet_of(object: &Value) -> Option<EarlierSheet> {
    let file = object
        .get("file")
        .and_then(Value::as_str)
        .map(str::to_string);
    let Some(lines) = object.get("lines") else {
        return object.get("diagnostics").map(|_| EarlierSheet {
            file,
            title: None,
            values: Vec::new(),
            inputs: Vec::new(),
        });
    };
    let title = object
        .get("fields")
        .and_then(Value::as_array)
        .and_then(|fields| {
            fields
                .iter()
                .find(|field| field.get("field").and_then(Value::as_str) == Some("title"))
        })
        .and_then(|field| field.get("text"))
        .and_then(Value::as_str)
        .map(str::to_string);
    let inputs = object
        .get("inputs")
        .and_then(Value::as_array)
        .map(|inputs| {
            inputs
                .iter()
                .filter_map(|input| {
                    Some((
                        input.get("path")?.as_str()?.to_string(),
                        input.get("sha256")?.as_str()?.to_string(),
                    ))
                })
                .collect()
        })
        .unwrap_or_default();
    let mut values = Vec::new();
    for line in lines.as_array()? {
        let name = match line.get("name")? {
            Value::Null => continue,
            name => name.as_str()?.to_string(),
        };
        let (si_values, is_column) = match line.get("si_value")? {
            Value::Array(items) => (
                items
                    .iter()
                    .map(Value::as_f64)
                    .collect::<Option<Vec<f64>>>()?,
                true,
            ),
            number => (vec![number.as_f64()?], false),
        };
        let shown = match (line.get("value"), line.get("unit").and_then(Value::as_str)) {
            (Some(Value::Array(items)), Some(unit)) => items
                .first()
                .and_then(Value::as_f64)
                .map(|value| (value, unit)),
            (Some(value), Some(unit)) => value.as_f64().map(|value| (value, unit)),
            _ => None,
        };
        values.push(EarlierValue {
            name,
            line: line.get("line")?.as_u64()?,
            si_values,
            is_column,
            si_unit: line.get("si_unit")?.as_str()?.to_string(),
            shown: shown.map(|(value, unit)| shown_text(value, unit)),
        });
    }
    Some(EarlierSheet {
        file,
        title,
        values,
        inputs,
    })
}

/// A value in full with its display unit.
fn shown_text(value: f64, unit: &str) -> String {
    let number = crate::render::format_significant(value, 10);
    if unit.is_empty() || unit == "1" {
        number
    } else {
        format!("{number} {unit}")
    }
}

/// Every earlier value that the new evaluation does not reproduce within `tolerance`
/// (relative), in the earlier sheet's order.
pub fn compare(earlier: &EarlierSheet, evaluation: &Evaluation, tolerance: f64) -> Vec<Moved> {
    let mut moved = Vec::new();
    for old in &earlier.values {
        let now = evaluation
            .lines
            .iter()
            .find(|line| line.name.as_deref() == Some(old.name.as_str()));
        let old_first = old.si_values.first().copied().unwrap_or(f64::NAN);
        let value = now.and_then(|line| match &line.result {
            LineResult::Value(shown) => match (shown.value(), old.is_column) {
                (crate::eval::Value::Scalar(quantity), false) => Some((
                    line.number as u64,
                    vec![quantity.value],
                    quantity.dimension,
                    shown,
                )),
                (crate::eval::Value::Column(column), true)
                    if column.len() == old.si_values.len() =>
                {
                    Some((
                        line.number as u64,
                        column.values.to_vec(),
                        column.dimension,
                        shown,
                    ))
                }
                _ => None,
            },
            _ => None,
        });
        let Some((line, new_values, dimension, shown)) = value else {
            // Gone, failed, or no longer the same shape (scalar against column, other length).
            moved.push(Moved {
                name: old.name.clone(),
                line: now.map_or(old.line, |line| line.number as u64),
                row: None,
                old_si_value: old_first,
                old_si_unit: old.si_unit.clone(),
                new_si_value: None,
                new_si_unit: None,
                relative_change: None,
                old_shown: old.shown.clone(),
                new_shown: None,
                signed_change: None,
            });
            continue;
        };
        let new_unit = dimension.si_unit_text();
        let (row, relative) = old
            .si_values
            .iter()
            .zip(&new_values)
            .map(|(old, new)| relative_change(*old, *new))
            .enumerate()
            .fold(
                (0, 0.0),
                |most, (row, change)| {
                    if change > most.1 {
                        (row, change)
                    } else {
                        most
                    }
                },
            );
        let same_unit = new_unit == old.si_unit;
        if !same_unit || relative > tolerance {
            moved.push(Moved {
                name: old.name.clone(),
                line,
                row: old.is_column.then_some(row + 1),
                old_si_value: old.si_values[row],
                old_si_unit: old.si_unit.clone(),
                new_si_value: Some(new_values[row]),
                new_si_unit: Some(new_unit),
                relative_change: same_unit.then_some(relative),
                old_shown: shown_in(shown, old.si_values[row], row)
                    .filter(|_| same_unit)
                    .or_else(|| old.shown.clone()),
                new_shown: shown_in(shown, new_values[row], row),
                signed_change: (same_unit && old.si_values[row] != 0.0)
                    .then(|| (new_values[row] - old.si_values[row]) / old.si_values[row].abs()),
            });
        }
    }
    moved
}

/// An SI value of the line `shown` in the line's display unit (today's unit, so old and new
/// read alike).
fn shown_in(shown: &crate::eval::Shown, si_value: f64, row: usize) -> Option<String> {
    use crate::eval::Shown;
    let (unit, display) = match shown {
        Shown::Scalar(scalar) => (scalar.unit.clone(), scalar.value / scalar.quantity.value),
        Shown::Column(column) if row < column.len() => (
            column.unit.clone(),
            column.shown(row) / column.column.values[row],
        ),
        _ => return None,
    };
    // A linear unit: the ratio shown/SI of the line's own value converts any other value.
    // An offset unit (degC) is not linear: shown in SI then.
    if !display.is_finite() || unit.contains("deg") {
        return None;
    }
    Some(shown_text(si_value * display, &unit))
}

/// The named values of the new evaluation that the earlier sheet did not have.
pub fn added_names(earlier: &EarlierSheet, evaluation: &Evaluation) -> Vec<(u64, String)> {
    evaluation
        .lines
        .iter()
        .filter(|line| matches!(line.result, LineResult::Value(_)))
        .filter_map(|line| {
            let name = line.name.as_ref()?;
            (!earlier.values.iter().any(|old| old.name == *name))
                .then(|| (line.number as u64, name.clone()))
        })
        .collect()
}

/// |new - old| / max(|old|, |new|); 0 when both are 0.
pub fn relative_change(old: f64, new: f64) -> f64 {
    let scale = old.abs().max(new.abs());
    if scale == 0.0 {
        0.0
    } else {
        (new - old).abs() / scale
    }
}

#[cfg(test)]
mod tests {
    use super::relative_change;

    #[test]
    fn relative_change_is_symmetric_and_zero_safe() {
        assert_eq!(relative_change(0.0, 0.0), 0.0);
        assert_eq!(relative_change(0.0, 1e-300), 1.0);
        assert_eq!(relative_change(2.0, 1.0), 0.5);
        assert_eq!(relative_change(1.0, 2.0), 0.5);
    }
}
