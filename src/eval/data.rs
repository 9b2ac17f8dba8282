//! Data files: a CSV whose header names each column and its unit (`sample,k [mD],T [degC]`),
//! read into columns with the same exact unit conversions as literals. A missing value, a bad
//! number or an unknown unit is an error naming the line and the column; nothing is guessed.
//!
//! Files saved by spreadsheets in a decimal-comma locale are read too: the delimiter (comma,
//! semicolon or tab) is found from the header line, or given by a first line `sep=;` or by
//! `--data-delimiter`. Where cells are separated by semicolons or tabs, a decimal comma
//! (`1,25`) is read as a decimal point; a comma inside a comma-separated file, or a point in a
//! file that writes decimal commas (`1.250`: a thousands separator?), is refused with a hint.
//! A censored value (`<1e-7`, `>5`, `n.d.`) is refused with what it is and how to state it.

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
    read_table_with(label, text, max_rows, None)
}

/// The cell separators a data file may use.
pub const DELIMITERS: [u8; 3] = [b',', b';', b'\t'];

/// `read_table` with the delimiter given (`None`: found from the file, see the module).
pub fn read_table_with(
    label: &str,
    text: &str,
    max_rows: usize,
    delimiter: Option<u8>,
) -> Result<DataTable, String> {
    // A spreadsheet's own delimiter line, `sep=;`, comes before the header.
    let (declared, text) = match text.trim_start_matches('\u{feff}').split_once('\n') {
        Some((first, rest)) if first.trim().starts_with("sep=") => {
            let separator = first.trim().trim_start_matches("sep=");
            match separator.as_bytes() {
                [byte] if DELIMITERS.contains(byte) => (Some(*byte), rest),
                [] if separator.is_empty() && first.contains('\t') => (Some(b'\t'), rest),
                _ => {
                    return Err(format!(
                        "`{label}` line 1: `{}` names no delimiter fluxsheet reads (`sep=,`, \
                         `sep=;` or a tab)",
                        first.trim()
                    ))
                }
            }
        }
        _ => (None, text),
    };
    let delimiter = delimiter
        .or(declared)
        .unwrap_or_else(|| detect_delimiter(text));
    let decimal_comma = delimiter != b',';
    let mut reader = csv::ReaderBuilder::new()
        .delimiter(delimiter)
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
        for (row, text) in texts.iter().enumerate() {
            if let Some(problem) = censored(text) {
                return Err(format!(
                    "{}: {problem}",
                    at_line(lines[row], index, &header)
                ));
            }
        }
        let numbers = NumberStyle::of(&texts, decimal_comma);
        let all_numbers = texts.iter().all(|text| numbers.parse(text).is_ok());
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
                let number = numbers
                    .parse(text)
                    .map_err(|problem| format!("{where_}: {problem}"))?;
                // The exact decimal of the cell as written with a point, for exact factors.
                let written = text.replace(',', ".");
                let value = unit.to_si(number, Some(&written));
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

/// The delimiter of a file without a `sep=` line: the one of comma, semicolon and tab that
/// the header line (the first line that is not a comment) holds most of; a comma on a tie.
fn detect_delimiter(text: &str) -> u8 {
    let header = text
        .lines()
        .map(str::trim)
        .find(|line| !line.is_empty() && !line.starts_with('#'))
        .unwrap_or("");
    let count = |delimiter: u8| header.bytes().filter(|byte| *byte == delimiter).count();
    let mut best = b',';
    for delimiter in [b';', b'\t'] {
        if count(delimiter) > count(best) {
            best = delimiter;
        }
    }
    best
}

/// How a column writes its numbers: with decimal points, or with decimal commas (only in a
/// file whose cells are not separated by commas).
#[derive(Debug, Clone, Copy, PartialEq)]
enum NumberStyle {
    Point,
    Comma,
}

impl NumberStyle {
    /// Decimal commas when the file may hold them and a cell of the column writes one.
    fn of(texts: &[String], comma_allowed: bool) -> NumberStyle {
        let writes_comma =
            |text: &String| text.contains(',') && text.replace(',', ".").parse::<f64>().is_ok();
        if comma_allowed && texts.iter().any(writes_comma) {
            NumberStyle::Comma
        } else {
            NumberStyle::Point
        }
    }

    fn parse(self, text: &str) -> Result<f64, String> {
        let plain = text.replace([',', '.'], "");
        if text.contains('.') && text.contains(',') && plain.parse::<f64>().is_ok() {
            return Err(format!(
                "`{text}` mixes points and commas: write the number without a thousands \
                 separator (`1234.5`, or `1234,5` in a file with semicolons between cells)"
            ));
        }
        match self {
            NumberStyle::Point => text.parse().map_err(|_| {
                if text.contains(',') && text.replace(',', ".").parse::<f64>().is_ok() {
                    format!(
                        "`{text}` has a decimal comma in a comma-separated file, where it \
                         cannot be told from a thousands separator: save the file with \
                         semicolons between cells (`sep=;` as its first line), or write \
                         decimal points"
                    )
                } else {
                    format!("`{text}` is not a number")
                }
            }),
            NumberStyle::Comma => {
                if text.contains('.') && !text.contains(',') {
                    return Err(format!(
                        "`{text}` has a point in a column that writes decimal commas: a \
                         thousands separator or a decimal point? Write it as the others are \
                         written (`1234` or `1,234`)"
                    ));
                }
                text.replace(',', ".")
                    .parse()
                    .map_err(|_| format!("`{text}` is not a number"))
            }
        }
    }
}

/// What is wrong with a censored cell (`<1e-7`, `>5`, `n.d.`), or `None` for any other cell.
fn censored(text: &str) -> Option<String> {
    let how = "it is not a measured value. Replace it in the file by the value you decide \
               to use, such as the limit itself or half of it (common practice for a value \
               below a detection limit), and say which in the sheet; or leave the row out";
    let bound = text
        .strip_prefix("<=")
        .or_else(|| text.strip_prefix('<'))
        .or_else(|| text.strip_prefix('≤'))
        .map(|limit| ("below", limit))
        .or_else(|| {
            text.strip_prefix(">=")
                .or_else(|| text.strip_prefix('>'))
                .or_else(|| text.strip_prefix('≥'))
                .map(|limit| ("above", limit))
        });
    if let Some((side, limit)) = bound {
        let limit = limit.trim();
        let what = match side {
            "below" => "below the detection (or reporting) limit",
            _ => "above the upper limit of the method (over range)",
        };
        return Some(if limit.is_empty() {
            format!("`{text}` is a censored value, {what}: {how}")
        } else {
            format!("`{text}` is a censored value, {what} {limit}: {how}")
        });
    }
    let lower = text.to_ascii_lowercase();
    let not_detected = [
        "nd",
        "n.d.",
        "n/d",
        "bdl",
        "<dl",
        "<lod",
        "<loq",
        "not detected",
    ];
    not_detected.contains(&lower.as_str()).then(|| {
        format!("`{text}` reads as \"not detected\", a value below a detection limit: {how}")
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
        } if *len > *expected_len => format!(
            "{len} cells where the header has {expected_len} (if that is a decimal comma, save \
             the file with semicolons between cells, or write `sep=;` as its first line)"
        ),
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
    fn semicolon_files_with_decimal_commas_are_read() {
        let table = read_table(
            "lab.csv",
            "probe;k [mD];T [degC]\nA;40,5;20\nB;1250;8,25\n",
            100,
        )
        .expect("reads");
        assert_eq!(column(&table, "T"), vec![293.15, 281.4]);
        let k = column(&table, "k");
        assert!(
            (k[0] / (40.5 * 9.869233e-16) - 1.0).abs() < 5e-7,
            "{}",
            k[0]
        );
        // The same with the spreadsheet's delimiter line, and with tabs.
        let declared = read_table("lab.csv", "sep=;\nx [m];y [m]\n1,5;2\n", 100).expect("reads");
        assert_eq!(column(&declared, "x"), vec![1.5]);
        let tabs = read_table("lab.tsv", "x [m]\ty [m]\n1,5\t2\n", 100).expect("reads");
        assert_eq!(column(&tabs, "x"), vec![1.5]);
        // Forced: a semicolon file read as commas has one column named `x [m];y [m]`.
        let forced = read_table_with("lab.csv", "x [m];y [m]\n1;2\n", 100, Some(b','));
        assert!(forced.is_err(), "{forced:?}");
    }

    #[test]
    fn ambiguous_separators_are_refused_with_a_hint() {
        let quoted = read_table("d.csv", "x [m],y [m]\n\"1,5\",2\n", 100).unwrap_err();
        assert!(
            quoted.contains("decimal comma in a comma-separated file"),
            "{quoted}"
        );
        assert!(quoted.contains("sep=;"), "{quoted}");
        let point = read_table("d.csv", "x [m];y [m]\n1,5;2\n1.250;3\n", 100).unwrap_err();
        assert!(point.starts_with("`d.csv` line 3, column 1"), "{point}");
        assert!(point.contains("thousands separator"), "{point}");
        let mixed = read_table("d.csv", "sep=;\nx [m]\n1.234,5\n", 100).unwrap_err();
        assert!(mixed.contains("mixes points and commas"), "{mixed}");
    }

    #[test]
    fn censored_values_say_what_they_are_and_how_to_state_them() {
        let below = read_table("w.csv", "c [mg/L];d [m]\n0,5;1\n<1e-7;2\n", 100).unwrap_err();
        assert!(
            below.starts_with(
                "`w.csv` line 3, column 1 (`c [mg/L]`): `<1e-7` is a censored value, below \
                 the detection (or reporting) limit 1e-7"
            ),
            "{below}"
        );
        assert!(below.contains("half of it"), "{below}");
        let above = read_table("w.csv", "EC [uS/cm]\n>5\n", 100).unwrap_err();
        assert!(above.contains("above the upper limit"), "{above}");
        // A column without a unit would otherwise become text.
        let text = read_table("w.csv", "ratio\n0.2\nn.d.\n", 100).unwrap_err();
        assert!(text.contains("not detected"), "{text}");
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
        let comma = read_table("d.csv", "x [m]\n1,5\n", 100).unwrap_err();
        assert!(comma.contains("`sep=;` as its first line"), "{comma}");
        let long = read_table("d.csv", "x\n1\n2\n3\n", 2).unwrap_err();
        assert!(long.contains("more than 2 rows"), "{long}");
    }
}
