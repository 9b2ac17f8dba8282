//! Data files: a CSV whose header names each column and its unit (`sample,k [mD],T [degC]`),
//! read into columns with the same exact unit conversions as literals. A missing value, a bad
//! number or an unknown unit is an error naming the line and the column; nothing is guessed.

use super::evaluate::{literal_temperature, resolve_unit};
use super::value::{Column, Labels, Value};
use std::sync::Arc;

/// A data file's columns, in file order.
#[derive(Debug, Clone, PartialEq)]
pub struct DataTable {
    /// The file as the sheet names it.
    pub label: String,
    pub columns: Vec<DataColumn>,
}

#[derive(Debug, Clone, PartialEq)]
pub struct DataColumn {
    /// The header's name part (`k` of `k [mD]`).
    pub name: String,
    /// The header's unit as written (`mD`), which the column shows in.
    pub unit: Option<String>,
    pub value: Value,
}

impl DataTable {
    /// The column named `name`, as a value whose origin is the column's name.
    pub fn column(&self, name: &str) -> Option<&DataColumn> {
        self.columns.iter().find(|column| column.name == name)
    }
}

/// Reads a CSV data file. Lines starting with `#` are comments; cells are trimmed. A column
/// with a unit in its header holds numbers; one without holds numbers (dimensionless) if every
/// cell is a number, and text otherwise.
pub fn read_table(label: &str, text: &str, max_rows: usize) -> Result<DataTable, String> {
    let mut reader = csv::ReaderBuilder::new()
        .trim(csv::Trim::All)
        .comment(Some(b'#'))
        .from_reader(text.as_bytes());
    let at_line = |line: u64, column: usize, header: &str| {
        format!("`{label}` line {line}, column {} (`{header}`)", column + 1)
    };
    let headers = reader
        .headers()
        .map_err(|error| format!("cannot read `{label}`: {error}"))?
        .clone();
    if headers.is_empty() || headers.iter().all(str::is_empty) {
        return Err(format!("`{label}` has no header line"));
    }
    let header_line = headers.position().map_or(1, |position| position.line());
    let mut parsed_headers = Vec::with_capacity(headers.len());
    for (index, header) in headers.iter().enumerate() {
        let (name, unit_text) = split_header(header)
            .map_err(|message| format!("{}: {message}", at_line(header_line, index, header)))?;
        let unit = match unit_text {
            Some(unit_text) => {
                let expression = crate::syntax::parse_unit(unit_text).map_err(|_| {
                    format!(
                        "{}: `{unit_text}` is not a unit",
                        at_line(header_line, index, header)
                    )
                })?;
                let unit = resolve_unit(&expression)
                    .map_err(|error| format!("{}: {error}", at_line(header_line, index, header)))?;
                Some(unit)
            }
            None => None,
        };
        if parsed_headers
            .iter()
            .any(|(earlier, _, _, _): &(String, _, _, _)| *earlier == name)
        {
            return Err(format!(
                "{}: a second column named `{name}`",
                at_line(header_line, index, header)
            ));
        }
        parsed_headers.push((name.to_string(), unit, header.to_string(), unit_text));
    }
    let mut cells: Vec<Vec<String>> = vec![Vec::new(); parsed_headers.len()];
    let mut lines: Vec<u64> = Vec::new();
    for record in reader.records() {
        let record = record.map_err(|error| match error.position() {
            Some(position) => format!(
                "`{label}` line {}: {}",
                position.line(),
                describe_csv_error(&error)
            ),
            None => format!("cannot read `{label}`: {error}"),
        })?;
        if lines.len() >= max_rows {
            return Err(format!(
                "`{label}` has more than {max_rows} rows, the limit (raise it with `--max-rows`)"
            ));
        }
        let line = record.position().map_or(0, |position| position.line());
        lines.push(line);
        for (index, cell) in record.iter().enumerate() {
            if let Some(column) = cells.get_mut(index) {
                column.push(cell.to_string());
            }
        }
    }
    if lines.is_empty() {
        return Err(format!("`{label}` has a header but no rows"));
    }
    let mut columns = Vec::with_capacity(parsed_headers.len());
    for (index, ((name, unit, header, unit_text), texts)) in
        parsed_headers.into_iter().zip(cells).enumerate()
    {
        // Named after the line that reads it, when one does (`with_origin`).
        let origin: Arc<str> = Arc::from("");
        let all_numbers = texts.iter().all(|text| text.parse::<f64>().is_ok());
        let value = if unit.is_none() && !all_numbers && texts.iter().any(|text| !text.is_empty()) {
            Value::Labels(Labels {
                texts: Arc::new(texts),
                origin,
            })
        } else {
            let unit = unit.unwrap_or_else(crate::units::Unit::dimensionless);
            let mut values = Vec::with_capacity(texts.len());
            for (row, text) in texts.iter().enumerate() {
                let where_ = at_line(lines[row], index, &header);
                if text.is_empty() {
                    return Err(format!("{where_}: missing value"));
                }
                let number: f64 = text
                    .parse()
                    .map_err(|_| format!("{where_}: `{text}` is not a number"))?;
                let value = unit.to_si(number, Some(text));
                if !value.is_finite() {
                    return Err(format!("{where_}: `{text}` is out of range"));
                }
                if unit.is_absolute_temperature() && value < 0.0 {
                    return Err(format!(
                        "{where_}: `{text}` is below absolute zero ({} K)",
                        crate::numeric::message_number(value)
                    ));
                }
                values.push(value);
            }
            let temperature = literal_temperature(&unit);
            Value::Column(Column {
                values: Arc::new(values),
                dimension: unit.dimension,
                temperature,
                origin,
            })
        };
        columns.push(DataColumn {
            name,
            unit: unit_text.map(str::to_string),
            value,
        });
    }
    Ok(DataTable {
        label: label.to_string(),
        columns,
    })
}

/// `k [mD]` -> (`k`, Some(`mD`)); `sample` -> (`sample`, None).
fn split_header(header: &str) -> Result<(&str, Option<&str>), String> {
    let Some(open) = header.find('[') else {
        if header.is_empty() {
            return Err("an empty header".to_string());
        }
        return Ok((header, None));
    };
    let name = header[..open].trim();
    let rest = &header[open + 1..];
    let Some(close) = rest.find(']') else {
        return Err("a `[` without its `]`".to_string());
    };
    if !rest[close + 1..].trim().is_empty() {
        return Err("text after the unit's `]`".to_string());
    }
    if name.is_empty() {
        return Err("a unit without a column name".to_string());
    }
    Ok((name, Some(rest[..close].trim())))
}

fn describe_csv_error(error: &csv::Error) -> String {
    match error.kind() {
        csv::ErrorKind::UnequalLengths {
            expected_len, len, ..
        } => format!("{len} cells where the header has {expected_len}"),
        csv::ErrorKind::Utf8 { .. } => "not UTF-8 text".to_string(),
        _ => error.to_string(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn column(table: &DataTable, name: &str) -> Vec<f64> {
        match table.column(name).map(|column| &column.value) {
            Some(Value::Column(column)) => column.values.to_vec(),
            other => panic!("no numeric column {name}: {other:?}"),
        }
    }

    #[test]
    fn header_units_convert_each_cell_exactly() {
        let table = read_table(
            "cores.csv",
            "sample,k [mD],T [degC],n\nA-1,40,20,0.3\nA-2,250,8.5,0.25\n",
            100,
        )
        .expect("reads");
        // 1 darcy = 9.869233e-13 m^2 to the 7 digits NIST SP 811 B.8 prints (from memory).
        let k = column(&table, "k");
        assert!(
            (k[0] / (40.0 * 9.869233e-16) - 1.0).abs() < 5e-7,
            "{}",
            k[0]
        );
        assert_eq!(column(&table, "T"), vec![293.15, 281.65]);
        assert_eq!(column(&table, "n"), vec![0.3, 0.25]);
        assert!(matches!(
            table.column("sample").map(|column| &column.value),
            Some(Value::Labels(_))
        ));
    }

    #[test]
    fn bad_cells_name_line_and_column() {
        let missing = read_table("d.csv", "x [m],y [s]\n1,2\n3,\n", 100).unwrap_err();
        assert_eq!(missing, "`d.csv` line 3, column 2 (`y [s]`): missing value");
        let bad = read_table("d.csv", "x [m]\n1\nabc\n", 100).unwrap_err();
        assert_eq!(
            bad,
            "`d.csv` line 3, column 1 (`x [m]`): `abc` is not a number"
        );
        let unit = read_table("d.csv", "x [mDD]\n1\n", 100).unwrap_err();
        assert!(
            unit.starts_with("`d.csv` line 1, column 1 (`x [mDD]`): unknown unit `mDD`"),
            "{unit}"
        );
        let ragged = read_table("d.csv", "x [m],y [m]\n1,2\n3\n", 100).unwrap_err();
        assert_eq!(ragged, "`d.csv` line 3: 1 cells where the header has 2");
        let long = read_table("d.csv", "x\n1\n2\n3\n", 2).unwrap_err();
        assert!(long.contains("more than 2 rows"), "{long}");
    }
}
