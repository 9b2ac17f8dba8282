//! Dewatering design: steady flow to a well in an unconfined aquifer (Dupuit–Thiem), the
//! Dupuit–Forchheimer discharge between two heads, Sichardt's empirical radius of influence,
//! the equivalent radius of a rectangular excavation, and the drawdown of several wells by
//! superposition, with image wells for a straight constant-head or no-flow boundary.
//!
//! The several-well functions take the wells as columns (rates and positions), so they are
//! `Builtin`s of whole columns; the rest are relations of single values.

use super::columns::{count_error, rows, scalar};
use super::dimensions::{AREA_PER_TIME, DIMENSIONLESS, LENGTH, TIME, VELOCITY, VOLUME_FLOW_RATE};
use super::relation::{arguments, Domain, Form, Parameter, Relation};
use super::wells::{well_function, THEIS, THIEM, WELL_FUNCTION};
use super::{Builtin, ColumnBody};
use crate::eval::function::CallError;
use crate::eval::{Formulation, Provenance, Quantity, TemperatureKind, Value};
use crate::units::Dimension;
use std::f64::consts::PI;

/// Dupuit's steady unconfined flow to a well, with Thiem's radius of influence.
pub static DUPUIT_THIEM: Formulation = Formulation {
    id: "dupuit-thiem",
    title: "Dupuit-Thiem equation, Q = pi K (H^2 - h^2) / ln(R / r)",
    citation: "Dupuit, J., 1863, Etudes theoriques et pratiques sur le mouvement des eaux dans \
les canaux decouverts et a travers les terrains permeables, 2nd ed., Dunod, Paris; with Thiem, \
G., 1906, Hydrologische Methoden, J. M. Gebhardt, Leipzig",
    validity: "steady radial flow to a fully penetrating well in a homogeneous, isotropic \
unconfined aquifer on a horizontal base; Dupuit's assumption of horizontal flow (drawdown small \
against the saturated thickness; poor close to the well, where the seepage face forms); heads \
measured from the base",
    ranges: &[],
};

/// Dupuit–Forchheimer flow between two heads.
pub static DUPUIT_FORCHHEIMER: Formulation = Formulation {
    id: "dupuit-forchheimer",
    title: "Dupuit-Forchheimer discharge per unit width, q = K (h1^2 - h2^2) / (2 L)",
    citation: "Forchheimer, P., 1886, Ueber die Ergiebigkeit von Brunnen-Anlagen und \
Sickerschlitzen, Zeitschrift des Architekten- und Ingenieur-Vereins zu Hannover 32, 539-563; \
as in Bear, J., 1972, Dynamics of Fluids in Porous Media, Elsevier, section 8.1 (from memory)",
    validity: "steady one-dimensional unconfined flow on a horizontal base without recharge \
between two fully penetrating boundaries of heads h1 and h2 a distance L apart; Dupuit's \
assumption of horizontal flow",
    ranges: &[],
};

/// Sichardt's empirical radius of influence.
pub static SICHARDT: Formulation = Formulation {
    id: "sichardt-1928",
    title: "Sichardt radius of influence, R = 3000 s sqrt(K), R and s in m, K in m/s",
    citation: "Sichardt, W., 1928, Das Fassungsvermoegen von Rohrbrunnen und seine Bedeutung \
fuer die Grundwasserabsenkung, insbesondere fuer groessere Absenkungstiefen, Springer, Berlin",
    validity: "empirical and not dimensionally homogeneous: fitted with s in metres, K in \
metres per second and R in metres (the sheet converts any unit to these before the formula, \
so the coefficient 3000 is always applied in its own units); an estimate for steady \
dewatering design in unconfined sands and gravels, not a measured property",
    ranges: &[],
};

/// The equivalent radius of a rectangular excavation by equal area.
pub static EQUIVALENT_RADIUS_AREA: Formulation = Formulation {
    id: "equivalent-radius-area",
    title: "equivalent radius of a rectangle by equal area, r = sqrt(a b / pi)",
    citation: "common practice in dewatering design (no single source)",
    validity: "treats a rectangular pit or well ring as one large well of the same plan area; \
common practice for aspect ratios up to about 3 to 5 (no single source)",
    ranges: &[],
};

/// The equivalent radius of a rectangular excavation by equal perimeter.
pub static EQUIVALENT_RADIUS_PERIMETER: Formulation = Formulation {
    id: "equivalent-radius-perimeter",
    title: "equivalent radius of a rectangle by equal perimeter, r = (a + b) / pi",
    citation: "common practice in dewatering design (no single source)",
    validity: "treats a rectangular pit or well ring as one large well of the same perimeter; \
common practice for long narrow excavations (no single source); gives a larger radius than \
equal area",
    ranges: &[],
};

/// Image wells for a straight boundary.
pub static IMAGE_WELLS: Formulation = Formulation {
    id: "image-wells",
    title: "image wells across a straight boundary: opposite rate for constant head, same \
rate for no flow",
    citation: "Ferris, J. G., Knowles, D. B., Brown, R. H. and Stallman, R. W., 1962, Theory \
of aquifer tests, U.S. Geological Survey Water-Supply Paper 1536-E, 69-174",
    validity: "a straight, fully penetrating boundary of infinite length along the line \
x = x_b: constant head (a river in full contact) or no flow (an impermeable wall); the wells \
and the point on one side of it",
    ranges: &[],
};

const CONDUCTIVITY: Parameter =
    Parameter::new("K", "a hydraulic conductivity", VELOCITY, Domain::Positive);
const RADIUS_OF_INFLUENCE: Parameter =
    Parameter::new("R", "the radius of influence", LENGTH, Domain::Positive);
const DISTANCE: Parameter =
    Parameter::new("r", "the distance from the well", LENGTH, Domain::Positive);
const SATURATED_THICKNESS: Parameter = Parameter::new(
    "H",
    "the undisturbed saturated thickness (head above the base)",
    LENGTH,
    Domain::Positive,
);
const SIDE_A: Parameter = Parameter::new(
    "a",
    "the length of the excavation",
    LENGTH,
    Domain::Positive,
);
const SIDE_B: Parameter =
    Parameter::new("b", "the width of the excavation", LENGTH, Domain::Positive);

pub static RELATIONS: &[Relation] = &[
    Relation {
        name: "dupuit_thiem_discharge",
        summary: "steady pumping rate Q = pi K (H^2 - h^2) / ln(R / r) (m^3/s) of a well in an \
unconfined aquifer: H saturated thickness at R, h the head above the base at r; Dupuit 1863",
        forms: &[Form {
            parameters: &[
                CONDUCTIVITY,
                SATURATED_THICKNESS,
                Parameter::new(
                    "h",
                    "the head above the base at distance r",
                    LENGTH,
                    Domain::NonNegative,
                ),
                DISTANCE,
                RADIUS_OF_INFLUENCE,
            ],
            result: VOLUME_FLOW_RATE,
            unit: "L/s",
            formulations: &[&DUPUIT_THIEM],
            formula: "Q = pi * K * (H^2 - h^2) / ln(R / r)",
            example: "dupuit_thiem_discharge(2e-4 m/s, 20 m, 15 m, 0.3 m, 250 m)",
            body: dupuit_thiem_discharge,
        }],
    },
    Relation {
        name: "dupuit_thiem_head",
        summary: "steady head h = sqrt(H^2 - Q ln(R / r) / (pi K)) (m, above the base) at r \
from a well pumping Q in an unconfined aquifer of saturated thickness H; Dupuit 1863",
        forms: &[Form {
            parameters: &[
                Parameter::new(
                    "Q",
                    "a pumping rate (negative for injection)",
                    VOLUME_FLOW_RATE,
                    Domain::Any,
                ),
                CONDUCTIVITY,
                SATURATED_THICKNESS,
                DISTANCE,
                RADIUS_OF_INFLUENCE,
            ],
            result: LENGTH,
            unit: "m",
            formulations: &[&DUPUIT_THIEM],
            formula: "h = sqrt(H^2 - Q * ln(R / r) / (pi * K))",
            example: "dupuit_thiem_head(20 L/s, 2e-4 m/s, 20 m, 0.3 m, 250 m)",
            body: dupuit_thiem_head,
        }],
    },
    Relation {
        name: "dupuit_forchheimer_discharge",
        summary: "steady unconfined discharge per unit width q = K (h1^2 - h2^2) / (2 L) (m^2/s) \
between heads h1 and h2 above the base, L apart; Forchheimer 1886",
        forms: &[Form {
            parameters: &[
                CONDUCTIVITY,
                Parameter::new(
                    "h1",
                    "the upstream head above the base",
                    LENGTH,
                    Domain::NonNegative,
                ),
                Parameter::new(
                    "h2",
                    "the downstream head above the base",
                    LENGTH,
                    Domain::NonNegative,
                ),
                Parameter::new(
                    "L",
                    "the distance between the two heads",
                    LENGTH,
                    Domain::Positive,
                ),
            ],
            result: AREA_PER_TIME,
            unit: "m^2/s",
            formulations: &[&DUPUIT_FORCHHEIMER],
            formula: "q = K * (h1^2 - h2^2) / (2 * L)",
            example: "dupuit_forchheimer_discharge(1e-4 m/s, 12 m, 8 m, 150 m)",
            body: dupuit_forchheimer_discharge,
        }],
    },
    Relation {
        name: "sichardt_radius",
        summary: "empirical radius of influence R = 3000 s sqrt(K) (m), fitted with s in m and \
K in m/s (not dimensionally homogeneous; the sheet converts to those units first); Sichardt 1928",
        forms: &[Form {
            parameters: &[
                Parameter::new("s", "the drawdown at the well", LENGTH, Domain::Positive),
                CONDUCTIVITY,
            ],
            result: LENGTH,
            unit: "m",
            formulations: &[&SICHARDT],
            formula: "R = 3000 * s * sqrt(K) (s in m, K in m/s, R in m)",
            example: "sichardt_radius(4 m, 2e-4 m/s)",
            body: sichardt_radius,
        }],
    },
    Relation {
        name: "equivalent_radius_area",
        summary: "equivalent radius r = sqrt(a b / pi) (m) of an a by b rectangular excavation \
by equal area; common practice",
        forms: &[Form {
            parameters: &[SIDE_A, SIDE_B],
            result: LENGTH,
            unit: "m",
            formulations: &[&EQUIVALENT_RADIUS_AREA],
            formula: "r = sqrt(a * b / pi)",
            example: "equivalent_radius_area(60 m, 25 m)",
            body: equivalent_radius_area,
        }],
    },
    Relation {
        name: "equivalent_radius_perimeter",
        summary: "equivalent radius r = (a + b) / pi (m) of an a by b rectangular excavation \
by equal perimeter; common practice",
        forms: &[Form {
            parameters: &[SIDE_A, SIDE_B],
            result: LENGTH,
            unit: "m",
            formulations: &[&EQUIVALENT_RADIUS_PERIMETER],
            formula: "r = (a + b) / pi",
            example: "equivalent_radius_perimeter(60 m, 25 m)",
            body: equivalent_radius_perimeter,
        }],
    },
];

/// Q = π K (H² − h²) / ln(R / r): Dupuit's horizontal-flow discharge; h above H is injection.
fn dupuit_thiem_discharge(values: &[f64]) -> Result<f64, CallError> {
    let [conductivity, thickness, head, radius, influence] = arguments(values);
    require_inside_influence(radius, influence, 4)?;
    Ok(PI * conductivity * (thickness * thickness - head * head) / (influence / radius).ln())
}

/// h = √(H² − Q ln(R / r) / (π K)); refused where the well would pump the aquifer dry.
fn dupuit_thiem_head(values: &[f64]) -> Result<f64, CallError> {
    let [discharge, conductivity, thickness, radius, influence] = arguments(values);
    require_inside_influence(radius, influence, 4)?;
    let squared =
        thickness * thickness - discharge * (influence / radius).ln() / (PI * conductivity);
    if squared < 0.0 {
        return Err(CallError::Domain {
            argument: Some(0),
            message: "`Q` is more than the aquifer can give at `r`: the head would fall below \
the base (H^2 - Q ln(R/r) / (pi K) < 0)"
                .to_string(),
        });
    }
    Ok(squared.sqrt())
}

/// q = K (h1² − h2²) / (2 L): positive from h1 towards h2.
fn dupuit_forchheimer_discharge(values: &[f64]) -> Result<f64, CallError> {
    let [conductivity, upstream, downstream, distance] = arguments(values);
    Ok(conductivity * (upstream * upstream - downstream * downstream) / (2.0 * distance))
}

/// Sichardt's fitted coefficient, in m^(-1/2) s^(1/2): s in m and K in m/s give R in m.
const SICHARDT_COEFFICIENT: f64 = 3000.0;

/// R = 3000 s √K with s in m, K in m/s (the SI numbers the body receives).
fn sichardt_radius(values: &[f64]) -> Result<f64, CallError> {
    let [drawdown, conductivity] = arguments(values);
    Ok(SICHARDT_COEFFICIENT * drawdown * conductivity.sqrt())
}

fn equivalent_radius_area(values: &[f64]) -> Result<f64, CallError> {
    let [length, width] = arguments(values);
    Ok((length * width / PI).sqrt())
}

fn equivalent_radius_perimeter(values: &[f64]) -> Result<f64, CallError> {
    let [length, width] = arguments(values);
    Ok((length + width) / PI)
}

/// r < R, with the index of `R` among the arguments for the message.
fn require_inside_influence(radius: f64, influence: f64, index: usize) -> Result<(), CallError> {
    if influence <= radius {
        return Err(CallError::Domain {
            argument: Some(index),
            message: "`R` must be larger than `r`: the radius of influence lies beyond the point \
where drawdown is wanted"
                .to_string(),
        });
    }
    Ok(())
}

// ---------------------------------------------------------------------------
// Several wells: superposition and image wells
// ---------------------------------------------------------------------------

pub static FUNCTIONS: &[(&str, Builtin)] = &[
    (
        "wells_thiem_drawdown",
        Builtin::on_columns(
            "wells_thiem_drawdown(Q, xw, yw, T, R, x, y)",
            "steady drawdown (m) at (x, y) of wells pumping Q at (xw, yw) (columns, or one \
well as values), sum of Q / (2 pi T) ln(R / r_i); Thiem 1906 by superposition",
            thiem_one_well,
            wells_thiem_drawdown,
        )
        .citing(&[&THIEM]),
    ),
    (
        "wells_theis_drawdown",
        Builtin::on_columns(
            "wells_theis_drawdown(Q, xw, yw, T, S, t, x, y)",
            "drawdown (m) at (x, y) and time t of wells pumping Q at (xw, yw) since t = 0 \
(columns, or one well as values), sum of Q / (4 pi T) W(r_i^2 S / (4 T t)); Theis 1935 by \
superposition",
            theis_one_well,
            wells_theis_drawdown,
        )
        .citing(&[&THEIS, &WELL_FUNCTION]),
    ),
    (
        "wells_thiem_drawdown_recharge",
        Builtin::on_columns(
            "wells_thiem_drawdown_recharge(Q, xw, yw, T, x, y, xb)",
            "steady drawdown (m) at (x, y) of wells near a straight constant-head boundary \
along x = xb (a river): each well with an image of opposite rate, sum of Q / (2 pi T) \
ln(r_image / r_i); no radius of influence needed",
            thiem_recharge_one_well,
            wells_thiem_drawdown_recharge,
        )
        .citing(&[&THIEM, &IMAGE_WELLS]),
    ),
    (
        "wells_theis_drawdown_recharge",
        Builtin::on_columns(
            "wells_theis_drawdown_recharge(Q, xw, yw, T, S, t, x, y, xb)",
            "drawdown (m) at (x, y) and time t of wells near a straight constant-head boundary \
along x = xb: Theis for each well minus Theis for its image",
            theis_recharge_one_well,
            wells_theis_drawdown_recharge,
        )
        .citing(&[&THEIS, &WELL_FUNCTION, &IMAGE_WELLS]),
    ),
    (
        "wells_theis_drawdown_barrier",
        Builtin::on_columns(
            "wells_theis_drawdown_barrier(Q, xw, yw, T, S, t, x, y, xb)",
            "drawdown (m) at (x, y) and time t of wells near a straight no-flow boundary along \
x = xb: Theis for each well plus Theis for its image",
            theis_barrier_one_well,
            wells_theis_drawdown_barrier,
        )
        .citing(&[&THEIS, &WELL_FUNCTION, &IMAGE_WELLS]),
    ),
];

/// How the images of a well field across the boundary x = x_b act.
#[derive(Clone, Copy, PartialEq, Eq)]
enum Boundary {
    None,
    /// Constant head: the image pumps the opposite rate.
    Recharge,
    /// No flow: the image pumps the same rate.
    Barrier,
}

/// The argument lists, by function: the names for messages and the dimension of each.
const THIEM_ARGUMENTS: &[(&str, Dimension)] = &[
    ("T", AREA_PER_TIME),
    ("R", LENGTH),
    ("x", LENGTH),
    ("y", LENGTH),
];
const THEIS_ARGUMENTS: &[(&str, Dimension)] = &[
    ("T", AREA_PER_TIME),
    ("S", DIMENSIONLESS),
    ("t", TIME),
    ("x", LENGTH),
    ("y", LENGTH),
];
const THIEM_RECHARGE_ARGUMENTS: &[(&str, Dimension)] = &[
    ("T", AREA_PER_TIME),
    ("x", LENGTH),
    ("y", LENGTH),
    ("xb", LENGTH),
];
const THEIS_BOUNDARY_ARGUMENTS: &[(&str, Dimension)] = &[
    ("T", AREA_PER_TIME),
    ("S", DIMENSIONLESS),
    ("t", TIME),
    ("x", LENGTH),
    ("y", LENGTH),
    ("xb", LENGTH),
];

/// The well field: rates and positions, one row per well.
struct Field<'a> {
    rates: &'a [f64],
    xs: &'a [f64],
    ys: &'a [f64],
}

/// Checks the three well columns and the single values after them (a one-row column counts
/// as a value); returns the field and the values in SI.
fn field_and_values<'a>(
    arguments: &'a [Value],
    names: &[(&'static str, Dimension)],
    expected: &'static str,
) -> Result<(Field<'a>, Vec<f64>), CallError> {
    if arguments.len() != 3 + names.len() {
        return Err(count_error(arguments.len(), expected));
    }
    let wells = [("Q", VOLUME_FLOW_RATE), ("xw", LENGTH), ("yw", LENGTH)];
    let mut columns = Vec::with_capacity(3);
    for (index, (name, dimension)) in wells.iter().enumerate() {
        let column = rows(&arguments[index], index)?;
        require_dimension(index, name, *dimension, column.dimension)?;
        columns.push(column.values);
    }
    let count = columns[0].len();
    for (index, column) in columns.iter().enumerate().skip(1) {
        if column.len() != count {
            return Err(CallError::Domain {
                argument: Some(index),
                message: format!(
                    "`{}` has {} rows but `Q` has {count}: give one row per well",
                    wells[index].0,
                    column.len()
                ),
            });
        }
    }
    let mut values = Vec::with_capacity(names.len());
    for (offset, (name, dimension)) in names.iter().enumerate() {
        let index = 3 + offset;
        let column = rows(&arguments[index], index)?;
        require_dimension(index, name, *dimension, column.dimension)?;
        let [value] = column.values else {
            return Err(CallError::Domain {
                argument: Some(index),
                message: format!("`{name}` must be a single value, not a column"),
            });
        };
        values.push(*value);
    }
    for (index, column) in columns.iter().enumerate() {
        if let Some(row) = column.iter().position(|value| !value.is_finite()) {
            return Err(CallError::Domain {
                argument: Some(index),
                message: format!(
                    "`{}` row {} is not a finite number",
                    wells[index].0,
                    row + 1
                ),
            });
        }
    }
    Ok((
        Field {
            rates: columns[0],
            xs: columns[1],
            ys: columns[2],
        },
        values,
    ))
}

fn require_dimension(
    index: usize,
    name: &'static str,
    expected: Dimension,
    found: Dimension,
) -> Result<(), CallError> {
    if expected != found {
        return Err(CallError::WrongDimension {
            argument: index,
            parameter: name,
            expected,
            found,
        });
    }
    Ok(())
}

fn positive(value: f64, index: usize, name: &str) -> Result<(), CallError> {
    if value > 0.0 && value.is_finite() {
        Ok(())
    } else {
        Err(CallError::Domain {
            argument: Some(index),
            message: format!("`{name}` must be above 0"),
        })
    }
}

/// Σ over the wells (and their images) of `drawdown(rate, distance)` at (x, y).
fn superpose(
    field: &Field,
    point: (f64, f64),
    boundary: Option<(Boundary, f64, usize)>,
    // The drawdown of one well (rate, distance) at the point: the model the function sums.
    drawdown: &dyn Fn(f64, f64) -> Result<f64, CallError>,
) -> Result<f64, CallError> {
    let (x, y) = point;
    if let Some((_, line, index)) = boundary {
        let side = (x - line).signum();
        let crossing = field
            .xs
            .iter()
            .position(|&xw| (xw - line).signum() != side || xw == line);
        if x == line || crossing.is_some() {
            return Err(CallError::Domain {
                argument: Some(index),
                message: match crossing {
                    Some(row) => format!(
                        "well {} and the point are not on the same side of the boundary \
x = xb: image wells need every well and the point strictly on one side",
                        row + 1
                    ),
                    None => "the point lies on the boundary x = xb, where the drawdown is \
fixed (constant head) or the images coincide; move it off the line"
                        .to_string(),
                },
            });
        }
    }
    let mut total = 0.0;
    for (row, ((&rate, &xw), &yw)) in field.rates.iter().zip(field.xs).zip(field.ys).enumerate() {
        let distance = (x - xw).hypot(y - yw);
        if distance == 0.0 {
            return Err(CallError::Domain {
                argument: Some(1),
                message: format!(
                    "the point is at the centre of well {}, where the line-sink drawdown has no \
value: place it at the well radius",
                    row + 1
                ),
            });
        }
        total += drawdown(rate, distance)?;
        if let Some((kind, line, _)) = boundary {
            let image = (x - (2.0 * line - xw)).hypot(y - yw);
            let sign = if kind == Boundary::Recharge {
                -1.0
            } else {
                1.0
            };
            total += sign * drawdown(rate, image)?;
        }
    }
    Ok(total)
}

/// A call with values alone (through `Function::call`) is a field of one well.
fn one_well(
    arguments: &[Quantity],
    provenance: &mut Provenance,
    body: ColumnBody,
) -> Result<Quantity, CallError> {
    let values: Vec<Value> = arguments.iter().copied().map(Value::Scalar).collect();
    match body(&values, provenance) {
        Some(Ok(Value::Scalar(quantity))) => Ok(quantity),
        Some(Err(error)) => Err(error),
        _ => Err(count_error(arguments.len(), "single values")),
    }
}

macro_rules! one_well_body {
    ($name:ident, $body:ident) => {
        fn $name(
            arguments: &[Quantity],
            provenance: &mut Provenance,
        ) -> Result<Quantity, CallError> {
            one_well(arguments, provenance, $body)
        }
    };
}

one_well_body!(thiem_one_well, wells_thiem_drawdown);
one_well_body!(theis_one_well, wells_theis_drawdown);
one_well_body!(thiem_recharge_one_well, wells_thiem_drawdown_recharge);
one_well_body!(theis_recharge_one_well, wells_theis_drawdown_recharge);
one_well_body!(theis_barrier_one_well, wells_theis_drawdown_barrier);

type Outcome = Option<Result<Value, CallError>>;

fn length(value: Result<f64, CallError>) -> Result<Value, CallError> {
    value.map(|metres| scalar(metres, LENGTH, TemperatureKind::Unspecified))
}

fn record(provenance: &mut Provenance, formulations: &[&'static Formulation]) {
    for formulation in formulations {
        provenance.record(formulation);
    }
}

fn wells_thiem_drawdown(arguments: &[Value], provenance: &mut Provenance) -> Outcome {
    let result = field_and_values(arguments, THIEM_ARGUMENTS, "7 (Q, xw, yw, T, R, x, y)")
        .and_then(|(field, values)| {
            let [transmissivity, influence, x, y] = values[..] else {
                unreachable!("four values were checked")
            };
            positive(transmissivity, 3, "T")?;
            positive(influence, 4, "R")?;
            superpose(&field, (x, y), None, &|rate, distance| {
                if distance >= influence {
                    return Err(CallError::Domain {
                        argument: Some(4),
                        message: format!(
                            "the point is {distance:.4} m from a well, beyond the radius of \
influence `R`: Thiem gives no drawdown there; use a larger R"
                        ),
                    });
                }
                Ok(rate / (2.0 * PI * transmissivity) * (influence / distance).ln())
            })
        });
    if result.is_ok() {
        record(provenance, &[&THIEM]);
    }
    Some(length(result))
}

/// Theis drawdown of one well, checked: T, S and t taken from `values` in that order.
fn theis_checked(values: &[f64]) -> Result<(f64, f64, f64), CallError> {
    let (transmissivity, storativity, time) = (values[0], values[1], values[2]);
    positive(transmissivity, 3, "T")?;
    if !(storativity > 0.0 && storativity <= 1.0) {
        return Err(CallError::Domain {
            argument: Some(4),
            message: "`S` must be in (0, 1]".to_string(),
        });
    }
    positive(time, 5, "t")?;
    Ok((transmissivity, storativity, time))
}

fn theis_well(transmissivity: f64, storativity: f64, time: f64) -> impl Fn(f64, f64) -> f64 {
    move |rate, distance| {
        let u = distance * distance * storativity / (4.0 * transmissivity * time);
        rate / (4.0 * PI * transmissivity) * well_function(u)
    }
}

fn theis_field(arguments: &[Value], boundary: Boundary) -> Result<f64, CallError> {
    let (names, expected) = match boundary {
        Boundary::None => (THEIS_ARGUMENTS, "8 (Q, xw, yw, T, S, t, x, y)"),
        _ => (THEIS_BOUNDARY_ARGUMENTS, "9 (Q, xw, yw, T, S, t, x, y, xb)"),
    };
    let (field, values) = field_and_values(arguments, names, expected)?;
    let (transmissivity, storativity, time) = theis_checked(&values)?;
    let well = theis_well(transmissivity, storativity, time);
    let line = (boundary != Boundary::None).then(|| (boundary, values[5], 8));
    superpose(&field, (values[3], values[4]), line, &|rate, distance| {
        Ok(well(rate, distance))
    })
}

fn wells_theis_drawdown(arguments: &[Value], provenance: &mut Provenance) -> Outcome {
    let result = theis_field(arguments, Boundary::None);
    if result.is_ok() {
        record(provenance, &[&THEIS, &WELL_FUNCTION]);
    }
    Some(length(result))
}

fn wells_theis_drawdown_recharge(arguments: &[Value], provenance: &mut Provenance) -> Outcome {
    let result = theis_field(arguments, Boundary::Recharge);
    if result.is_ok() {
        record(provenance, &[&THEIS, &WELL_FUNCTION, &IMAGE_WELLS]);
    }
    Some(length(result))
}

fn wells_theis_drawdown_barrier(arguments: &[Value], provenance: &mut Provenance) -> Outcome {
    let result = theis_field(arguments, Boundary::Barrier);
    if result.is_ok() {
        record(provenance, &[&THEIS, &WELL_FUNCTION, &IMAGE_WELLS]);
    }
    Some(length(result))
}

fn wells_thiem_drawdown_recharge(arguments: &[Value], provenance: &mut Provenance) -> Outcome {
    let result = field_and_values(
        arguments,
        THIEM_RECHARGE_ARGUMENTS,
        "7 (Q, xw, yw, T, x, y, xb)",
    )
    .and_then(|(field, values)| {
        let [transmissivity, x, y, line] = values[..] else {
            unreachable!("four values were checked")
        };
        positive(transmissivity, 3, "T")?;
        // Each well's image pumps −Q: Q/(2πT) ln(R/r) − Q/(2πT) ln(R/r') = Q/(2πT) ln(r'/r),
        // written as the sum of +ln(1/r) for the well and −ln(1/r') for the image.
        superpose(
            &field,
            (x, y),
            Some((Boundary::Recharge, line, 6)),
            &|rate, distance| Ok(-rate / (2.0 * PI * transmissivity) * distance.ln()),
        )
    });
    if result.is_ok() {
        record(provenance, &[&THIEM, &IMAGE_WELLS]);
    }
    Some(length(result))
}

#[cfg(test)]
mod tests {
    //! The dewatering relations against hand computations of the published formulas, and the
    //! several-well functions against single-well calls added by hand.

    use super::*;
    use crate::eval::Library;
    use crate::library::testing::{call, check, number, si, Expected};
    use crate::library::Builtins;

    #[test]
    fn dupuit_thiem_and_forchheimer_by_hand() {
        // K = 2e-4 m/s, H = 20 m, h = 15 m at r = 0.3 m, R = 250 m:
        // Q = pi 2e-4 (400 - 225) / ln(833.3) = 0.016349 m^3/s (hand arithmetic).
        let q = PI * 2e-4 * (400.0 - 225.0) / (250.0_f64 / 0.3).ln();
        assert!((q - 0.016_349).abs() < 1e-6);
        let geometry = [si(0.3, LENGTH), si(250.0, LENGTH)];
        check(
            "dupuit_thiem_discharge",
            &[
                si(2e-4, VELOCITY),
                si(20.0, LENGTH),
                si(15.0, LENGTH),
                geometry[0],
                geometry[1],
            ],
            Expected::Value(q, VOLUME_FLOW_RATE, 1e-14),
            "Dupuit 1863 by hand",
        );
        check(
            "dupuit_thiem_head",
            &[
                si(q, VOLUME_FLOW_RATE),
                si(2e-4, VELOCITY),
                si(20.0, LENGTH),
                geometry[0],
                geometry[1],
            ],
            Expected::Value(15.0, LENGTH, 1e-12),
            "the head back from the rate",
        );
        check(
            "dupuit_thiem_head",
            &[
                si(10.0 * q, VOLUME_FLOW_RATE),
                si(2e-4, VELOCITY),
                si(20.0, LENGTH),
                geometry[0],
                geometry[1],
            ],
            Expected::Domain(0),
            "pumped dry",
        );
        // q = 1e-4 (144 - 64) / 300 = 2.6667e-5 m^2/s (hand arithmetic).
        check(
            "dupuit_forchheimer_discharge",
            &[
                si(1e-4, VELOCITY),
                si(12.0, LENGTH),
                si(8.0, LENGTH),
                si(150.0, LENGTH),
            ],
            Expected::Value(1e-4 * 80.0 / 300.0, AREA_PER_TIME, 1e-14),
            "Forchheimer 1886 by hand",
        );
    }

    #[test]
    fn sichardt_and_equivalent_radii() {
        // Sichardt: s = 5 m in K = 1e-4 m/s gives R = 3000 x 5 x 0.01 = 150 m (the usual
        // textbook illustration, from memory).
        check(
            "sichardt_radius",
            &[si(5.0, LENGTH), si(1e-4, VELOCITY)],
            Expected::Value(150.0, LENGTH, 1e-14),
            "Sichardt 1928",
        );
        // Fixed units: 5 m in K = 1e-4 m/s is 16.40 ft and 0.01969 ft/min; the sheet hands
        // SI to the body, so the result is still 150 m.
        check(
            "sichardt_radius",
            &[
                si(16.404_199_475 * 0.3048, LENGTH),
                si(0.019_685 * 0.3048 / 60.0, VELOCITY),
            ],
            Expected::Value(150.0, LENGTH, 1e-5),
            "Sichardt in other units",
        );
        // A 40 m by 20 m pit: sqrt(800 / pi) = 15.958 m; (40 + 20) / pi = 19.099 m.
        check(
            "equivalent_radius_area",
            &[si(40.0, LENGTH), si(20.0, LENGTH)],
            Expected::Value(15.957_691_216, LENGTH, 1e-10),
            "equal area, common practice",
        );
        check(
            "equivalent_radius_perimeter",
            &[si(40.0, LENGTH), si(20.0, LENGTH)],
            Expected::Value(19.098_593_171, LENGTH, 1e-10),
            "equal perimeter, common practice",
        );
    }

    fn column(values: &[f64], dimension: Dimension) -> Value {
        Value::Column(crate::eval::Column {
            values: std::sync::Arc::new(values.to_vec()),
            dimension,
            temperature: TemperatureKind::Unspecified,
            origin: "wells".into(),
        })
    }

    fn call_field(name: &str, arguments: &[Value]) -> Result<f64, CallError> {
        let function = Builtins::standard().function(name).expect("registered");
        let mut provenance = Provenance::default();
        match function.call_values(arguments, &mut provenance) {
            Some(Ok(Value::Scalar(quantity))) => {
                assert_eq!(quantity.dimension, LENGTH);
                assert!(!provenance.formulations().is_empty());
                Ok(quantity.value)
            }
            Some(Err(error)) => Err(error),
            other => panic!("{name}: {other:?}"),
        }
    }

    fn value(quantity: Quantity) -> Value {
        Value::Scalar(quantity)
    }

    #[test]
    fn several_wells_add_up_and_images_mirror() {
        let rates = [0.01, 0.02, -0.005];
        let xs = [0.0, 50.0, -30.0];
        let ys = [0.0, 10.0, 40.0];
        let (t, s, time, x, y) = (2e-3, 1e-4, 86_400.0, 20.0, 5.0);
        let wells = [
            column(&rates, VOLUME_FLOW_RATE),
            column(&xs, LENGTH),
            column(&ys, LENGTH),
        ];
        let theis = |q: f64, distance: f64| {
            q / (4.0 * PI * t) * well_function(distance * distance * s / (4.0 * t * time))
        };
        let mut by_hand = 0.0;
        let mut with_river = 0.0;
        let mut with_wall = 0.0;
        let line = 200.0;
        for ((&q, &xw), &yw) in rates.iter().zip(&xs).zip(&ys) {
            let single = call(
                "theis_drawdown",
                &[
                    si(q, VOLUME_FLOW_RATE),
                    si(t, AREA_PER_TIME),
                    number(s),
                    si((x - xw).hypot(y - yw), LENGTH),
                    si(time, TIME),
                ],
            )
            .0
            .expect("valid")
            .value;
            by_hand += single;
            let image = theis(q, (x - (2.0 * line - xw)).hypot(y - yw));
            with_river += single - image;
            with_wall += single + image;
        }
        let mut arguments = wells.to_vec();
        arguments.extend([
            value(si(t, AREA_PER_TIME)),
            value(number(s)),
            value(si(time, TIME)),
            value(si(x, LENGTH)),
            value(si(y, LENGTH)),
        ]);
        let found = call_field("wells_theis_drawdown", &arguments).expect("valid");
        assert!(
            ((found - by_hand) / by_hand).abs() < 1e-14,
            "{found} vs {by_hand}"
        );
        arguments.push(value(si(line, LENGTH)));
        let river = call_field("wells_theis_drawdown_recharge", &arguments).expect("valid");
        assert!(((river - with_river) / with_river).abs() < 1e-13);
        let wall = call_field("wells_theis_drawdown_barrier", &arguments).expect("valid");
        assert!(((wall - with_wall) / with_wall).abs() < 1e-13);
        assert!(river < found && found < wall);
        // A point beyond the boundary is refused at xb.
        let mut across = arguments.clone();
        across[6] = value(si(250.0, LENGTH));
        assert!(matches!(
            call_field("wells_theis_drawdown_recharge", &across),
            Err(CallError::Domain {
                argument: Some(8),
                ..
            })
        ));
    }

    #[test]
    fn steady_fields_match_thiem_by_hand() {
        let (t, influence) = (1e-3, 300.0);
        let rates = [0.01, 0.01];
        let xs = [-10.0, 10.0];
        let ys = [0.0, 0.0];
        let point = (0.0, 5.0);
        let r = 125.0_f64.sqrt();
        let expected = 2.0 * 0.01 / (2.0 * PI * t) * (influence / r).ln();
        let wells = [
            column(&rates, VOLUME_FLOW_RATE),
            column(&xs, LENGTH),
            column(&ys, LENGTH),
        ];
        let mut arguments = wells.to_vec();
        arguments.extend([
            value(si(t, AREA_PER_TIME)),
            value(si(influence, LENGTH)),
            value(si(point.0, LENGTH)),
            value(si(point.1, LENGTH)),
        ]);
        let found = call_field("wells_thiem_drawdown", &arguments).expect("valid");
        assert!(((found - expected) / expected).abs() < 1e-14);
        // A river along x = 60 m: each well's image at 120 - xw pumps -Q, so
        // s = sum Q / (2 pi T) ln(r_image / r) (Ferris et al. 1962).
        let image = |xw: f64| (point.0 - (120.0 - xw)).hypot(point.1);
        let river: f64 = xs
            .iter()
            .map(|&xw| 0.01 / (2.0 * PI * t) * (image(xw) / r).ln())
            .sum();
        let mut near_river = wells.to_vec();
        near_river.extend([
            value(si(t, AREA_PER_TIME)),
            value(si(point.0, LENGTH)),
            value(si(point.1, LENGTH)),
            value(si(60.0, LENGTH)),
        ]);
        let found = call_field("wells_thiem_drawdown_recharge", &near_river).expect("valid");
        assert!(((found - river) / river).abs() < 1e-13);
        // Refusals: a point at a well, a point beyond R, mismatched columns, a column T.
        let mut at_well = arguments.clone();
        at_well[5] = value(si(-10.0, LENGTH));
        at_well[6] = value(si(0.0, LENGTH));
        assert!(call_field("wells_thiem_drawdown", &at_well).is_err());
        let mut far = arguments.clone();
        far[5] = value(si(400.0, LENGTH));
        assert!(matches!(
            call_field("wells_thiem_drawdown", &far),
            Err(CallError::Domain {
                argument: Some(4),
                ..
            })
        ));
        let mut short = arguments.clone();
        short[1] = column(&[0.0], LENGTH);
        assert!(matches!(
            call_field("wells_thiem_drawdown", &short),
            Err(CallError::Domain {
                argument: Some(1),
                ..
            })
        ));
        let mut wrong = arguments.clone();
        wrong[3] = value(si(1e-3, VELOCITY));
        assert!(matches!(
            call_field("wells_thiem_drawdown", &wrong),
            Err(CallError::WrongDimension { argument: 3, .. })
        ));
        // One well as single values through `call`.
        let one = call(
            "wells_thiem_drawdown",
            &[
                si(0.01, VOLUME_FLOW_RATE),
                si(0.0, LENGTH),
                si(0.0, LENGTH),
                si(t, AREA_PER_TIME),
                si(influence, LENGTH),
                si(30.0, LENGTH),
                si(40.0, LENGTH),
            ],
        )
        .0
        .expect("valid");
        let thiem = 0.01 / (2.0 * PI * t) * (influence / 50.0).ln();
        assert!(((one.value - thiem) / thiem).abs() < 1e-14);
    }
}
