//! `fluxsheet properties FLUID`: a property table versus temperature, computed through the same
//! built-in functions a sheet calls, so the table and the sheets can never disagree.

use super::{exit, write_listing, OutputArgs};
use crate::eval::{evaluate_sheet, Library, LineResult, Provenance, Quantity};
use crate::library::Builtins;
use crate::render::{self, Format};
use clap::{Args, ValueEnum};
use std::io::{self, Write};

/// Most rows a table may have; a typo in `--step` should not print a million lines.
const MOST_ROWS: usize = 10_000;

#[derive(Args, Debug)]
#[command(
    after_help = "Examples:\n  fluxsheet properties water --from 0degC --to 40degC --step 2K\n  fluxsheet properties water --from 50degC --to 150degC --step 10K --pressure 5bar --unit viscosity=cP\n  fluxsheet properties brine --salinity 0.1 --pressure 20MPa --from 20degC --to 120degC --step 20K\n  fluxsheet properties air --from -20degC --to 40degC --step 10K"
)]
pub struct PropertiesArgs {
    /// The fluid
    #[arg(value_enum)]
    pub fluid: Fluid,
    /// First temperature, with its unit
    #[arg(long, default_value = "0degC", allow_hyphen_values = true)]
    pub from: String,
    /// Last temperature, with its unit
    #[arg(long, default_value = "40degC", allow_hyphen_values = true)]
    pub to: String,
    /// Temperature step, a difference (`2K`, `5delta_degF`)
    #[arg(long, default_value = "5K")]
    pub step: String,
    /// Pressure (water, brine, air); defaults to 101325 Pa for water and air, required for brine
    #[arg(long)]
    pub pressure: Option<String>,
    /// NaCl mass fraction for brine (`0.1`, `10%`, `35000ppm`)
    #[arg(long)]
    pub salinity: Option<String>,
    /// Unit of a column, e.g. `viscosity=cP` (repeatable); columns: temperature, density,
    /// viscosity, kinematic_viscosity, specific_heat, thermal_conductivity, saturation_pressure
    #[arg(long = "unit", value_name = "COLUMN=UNIT")]
    pub units: Vec<String>,
}

#[derive(ValueEnum, Debug, Clone, Copy, PartialEq, Eq)]
pub enum Fluid {
    Water,
    Brine,
    Air,
}

/// What a column's built-in takes after the temperature.
#[derive(Clone, Copy)]
enum Takes {
    Nothing,
    /// The pressure if one was given (water defaults to one atmosphere itself).
    Pressure,
    PressureAndSalinity,
    Salinity,
}

/// One column: key for `--unit`, header, unit, the built-in that fills it and what it takes.
struct Column {
    key: &'static str,
    header: &'static str,
    unit: String,
    function: &'static str,
    takes: Takes,
}

fn columns(fluid: Fluid) -> Vec<Column> {
    let column = |key, header, unit: &str, function, takes| Column {
        key,
        header,
        unit: unit.to_string(),
        function,
        takes,
    };
    match fluid {
        Fluid::Water => vec![
            column("density", "rho", "kg/m^3", "water_density", Takes::Pressure),
            column(
                "viscosity",
                "mu",
                "mPa*s",
                "water_viscosity",
                Takes::Pressure,
            ),
            column(
                "kinematic_viscosity",
                "nu",
                "mm^2/s",
                "water_kinematic_viscosity",
                Takes::Pressure,
            ),
            column(
                "specific_heat",
                "cp",
                "kJ/(kg*K)",
                "water_specific_heat",
                Takes::Pressure,
            ),
            column(
                "thermal_conductivity",
                "lambda",
                "W/(m*K)",
                "water_thermal_conductivity",
                Takes::Pressure,
            ),
            column(
                "saturation_pressure",
                "p_sat",
                "kPa",
                "saturation_pressure",
                Takes::Nothing,
            ),
        ],
        Fluid::Brine => vec![
            column(
                "density",
                "rho",
                "kg/m^3",
                "brine_density",
                Takes::PressureAndSalinity,
            ),
            column(
                "viscosity",
                "mu",
                "mPa*s",
                "brine_viscosity",
                Takes::Salinity,
            ),
        ],
        Fluid::Air => vec![
            column("density", "rho", "kg/m^3", "air_density", Takes::Pressure),
            column("viscosity", "mu", "uPa*s", "air_viscosity", Takes::Nothing),
        ],
    }
}

/// Evaluates a command-line value such as `20degC` or `5bar` with the sheet evaluator.
fn quantity(text: &str, option: &str) -> Result<Quantity, String> {
    let evaluation = evaluate_sheet(text, Builtins::standard());
    if let Some(diagnostic) = evaluation.diagnostics.first() {
        return Err(format!("{option} `{text}`: {}", diagnostic.message));
    }
    match evaluation.lines.first().map(|line| &line.result) {
        Some(LineResult::Value(crate::eval::Shown::Scalar(shown))) => Ok(shown.quantity),
        _ => Err(format!("{option} needs a value with a unit, e.g. `20degC`")),
    }
}

/// Converts an SI value into a unit given as text, checking the dimension.
fn in_unit(quantity: Quantity, unit_text: &str) -> Result<f64, String> {
    let expression = crate::syntax::parse_unit(unit_text)
        .map_err(|error| format!("unit `{unit_text}`: {error}"))?;
    let unit = crate::eval::evaluate::resolve_unit(&expression)
        .map_err(|error| format!("unit `{unit_text}`: {error}"))?;
    crate::eval::evaluate::show_in(quantity, &unit, unit_text, expression.span)
        .map(|shown| shown.value)
        .map_err(|error| error.to_string())
}

pub fn run(out: &mut dyn Write, arguments: &PropertiesArgs, output: &OutputArgs) -> io::Result<u8> {
    match table(out, arguments, output) {
        Ok(()) => Ok(exit::OK),
        Err(TableError::Io(error)) => Err(error),
        Err(TableError::Usage(message)) => {
            crate::stderr_line!("error: {message}");
            Ok(exit::USAGE)
        }
        Err(TableError::Range(message)) => {
            crate::stderr_line!("error: {message}");
            Ok(exit::SHEET_ERROR)
        }
    }
}

enum TableError {
    Io(io::Error),
    Usage(String),
    Range(String),
}

impl From<io::Error> for TableError {
    fn from(error: io::Error) -> Self {
        TableError::Io(error)
    }
}

fn table(
    out: &mut dyn Write,
    arguments: &PropertiesArgs,
    output: &OutputArgs,
) -> Result<(), TableError> {
    let usage = TableError::Usage;
    let from = quantity(&arguments.from, "--from").map_err(usage)?;
    let to = quantity(&arguments.to, "--to").map_err(usage)?;
    let step = quantity(&arguments.step, "--step").map_err(usage)?;
    for (option, value) in [("--from", &from), ("--to", &to), ("--step", &step)] {
        if !value.dimension.is_temperature() {
            return Err(usage(format!("{option} must be a temperature")));
        }
    }
    if step.value <= 0.0 {
        return Err(usage("--step must be positive".to_string()));
    }
    if to.value < from.value {
        return Err(usage("--to must not be below --from".to_string()));
    }
    let rows = ((to.value - from.value) / step.value + 1e-9).floor() as usize + 1;
    if rows > MOST_ROWS {
        return Err(usage(format!(
            "{rows} rows requested; at most {MOST_ROWS} (use a larger --step)"
        )));
    }
    let pressure = match (&arguments.pressure, arguments.fluid) {
        (Some(text), _) => Some(quantity(text, "--pressure").map_err(usage)?),
        (None, Fluid::Brine) => {
            return Err(usage(
                "brine needs --pressure (e.g. --pressure 20MPa)".to_string(),
            ))
        }
        (None, Fluid::Air) => Some(Quantity::new(
            101_325.0,
            crate::units::Dimension::from_integers([-1, 1, -2, 0, 0, 0, 0]),
        )),
        (None, Fluid::Water) => None,
    };
    let salinity = match (&arguments.salinity, arguments.fluid) {
        (Some(text), Fluid::Brine) => Some(quantity(text, "--salinity").map_err(usage)?),
        (None, Fluid::Brine) => {
            return Err(usage(
                "brine needs --salinity (e.g. --salinity 0.1)".to_string(),
            ))
        }
        (Some(_), _) => return Err(usage("--salinity applies to brine only".to_string())),
        (None, _) => None,
    };
    let mut columns = columns(arguments.fluid);
    let mut temperature_unit = "degC".to_string();
    for setting in &arguments.units {
        let Some((key, unit)) = setting.split_once('=') else {
            return Err(usage(format!(
                "--unit `{setting}`: write COLUMN=UNIT, e.g. viscosity=cP"
            )));
        };
        if key == "temperature" {
            temperature_unit = unit.to_string();
            continue;
        }
        let Some(column) = columns.iter_mut().find(|column| column.key == key) else {
            return Err(usage(format!("--unit: no column `{key}` for this fluid")));
        };
        column.unit = unit.to_string();
    }
    let library = Builtins::standard();
    let mut provenance = Provenance::default();
    let mut header = vec![format!("T [{temperature_unit}]")];
    header.extend(
        columns
            .iter()
            .map(|column| format!("{} [{}]", column.header, column.unit)),
    );
    let mut table_rows: Vec<Vec<f64>> = Vec::with_capacity(rows);
    for index in 0..rows {
        let temperature = Quantity::new(from.value + step.value * index as f64, from.dimension);
        let mut row = vec![in_unit(temperature, &temperature_unit).map_err(usage)?];
        for column in &columns {
            let extra: Vec<Quantity> = match column.takes {
                Takes::Nothing => Vec::new(),
                Takes::Pressure => pressure.into_iter().collect(),
                Takes::PressureAndSalinity => pressure.into_iter().chain(salinity).collect(),
                Takes::Salinity => salinity.into_iter().collect(),
            };
            let arguments: Vec<Quantity> = std::iter::once(temperature).chain(extra).collect();
            let function = library.function(column.function).ok_or_else(|| {
                TableError::Range(format!("internal: no built-in `{}`", column.function))
            })?;
            let value = function
                .call(&arguments, &mut provenance)
                .map_err(|error| {
                    TableError::Range(format!(
                        "`{}` at T = {:.2} K: {error}",
                        column.function, temperature.value
                    ))
                })?;
            row.push(in_unit(value, &column.unit).map_err(usage)?);
        }
        table_rows.push(row);
    }
    if output.options().format == Format::Json {
        let objects: Vec<serde_json::Map<String, serde_json::Value>> = table_rows
            .iter()
            .map(|row| {
                header
                    .iter()
                    .cloned()
                    .zip(row.iter().map(|value| serde_json::json!(value)))
                    .collect()
            })
            .collect();
        let document = serde_json::json!({ "rows": objects, "formulations": provenance.formulations().iter().map(|f| f.citation).collect::<Vec<_>>() });
        writeln!(
            out,
            "{}",
            serde_json::to_string_pretty(&document).map_err(io::Error::other)?
        )?;
        return Ok(());
    }
    let text_rows: Vec<Vec<String>> = table_rows
        .iter()
        .map(|row| {
            row.iter()
                .map(|value| render::format_significant(*value, output.options().digits))
                .collect()
        })
        .collect();
    let header_text: Vec<&str> = header.iter().map(String::as_str).collect();
    write_listing(out, &header_text, &text_rows, output.options())?;
    if output.options().format != Format::Csv {
        render::table::write_formulations(out, provenance.formulations(), output.options())?;
    }
    Ok(())
}
