//! The unit catalog: every unit the language knows, in one table, with its dimension, its
//! factor to SI written as exact decimals, and where the definition comes from.
//!
//! Over 800 lines: the table itself, one row per unit with its source, is most of the file.
//!
//! To add a unit, add one row here (see DEVELOPERS.md). Factors are text so that the exact
//! definition is what is stored and reviewed; `Factor::from_definition` reads them.

/// How a unit relates to temperature, which decides whether it carries an offset.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TemperatureRole {
    /// Not a temperature unit, or kelvin: a plain multiplicative unit.
    None,
    /// An absolute temperature scale (`degC`, `degF`, `degR`): value_K = (x + offset) × factor.
    Absolute,
    /// A temperature difference (`delta_degC`, `delta_degF`): multiplicative, never offset.
    Difference,
}

/// One catalog row.
#[derive(Debug)]
pub struct UnitDefinition {
    /// Accepted spellings; the first is the one shown.
    pub symbols: &'static [&'static str],
    pub name: &'static str,
    /// Exponents of L M T I Θ N J.
    pub dimension: [i32; 7],
    /// Factor to the SI coherent unit, as exact decimals joined by `*` and `/`.
    pub factor: &'static str,
    /// For absolute temperature scales: the offset in the unit's own degrees.
    pub offset: Option<&'static str>,
    pub temperature: TemperatureRole,
    /// Whether SI prefixes (`k`, `m`, `µ`, …) may be put in front of it.
    pub prefixable: bool,
    pub source: &'static str,
    /// A short remark shown in `fluxsheet units` (conventions, exactness).
    pub note: &'static str,
    /// The system of measure it belongs to, which the mixed-units warning reads.
    pub system: UnitSystem,
}

/// The system of measure of a unit, for telling a sheet that mixes systems.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum UnitSystem {
    /// SI, the units accepted for use with it, and units of metric origin (bar, darcy, poise,
    /// the thermochemical calorie, mmHg).
    Metric,
    /// US customary measure and the oilfield units built on it (ft, psi, bbl, BTU, degF).
    UsCustomary,
    /// British imperial measure (the imperial gallon, the long ton, the EC therm of
    /// 100 000 BTU).
    Imperial,
    /// Belongs to no system: time, frequency, angles and plain ratios.
    None,
}

const METRIC: UnitSystem = UnitSystem::Metric;
const US_CUSTOMARY: UnitSystem = UnitSystem::UsCustomary;
const IMPERIAL: UnitSystem = UnitSystem::Imperial;
const NO_SYSTEM: UnitSystem = UnitSystem::None;

/// An SI prefix (SI Brochure, 9th ed., Table 7).
#[derive(Debug)]
pub struct Prefix {
    pub symbols: &'static [&'static str],
    pub factor: &'static str,
}

const SI_BROCHURE_BASE: &str = "SI Brochure 9th ed. (2019), Table 2";
const SI_BROCHURE_DERIVED: &str = "SI Brochure 9th ed. (2019), Table 4";
const SI_BROCHURE_ACCEPTED: &str = "SI Brochure 9th ed. (2019), Table 8";
const NIST_811: &str = "NIST SP 811 (2008), Appendix B.8";
const NIST_811_CONVENTIONAL: &str = "NIST SP 811 (2008), Appendix B.8 (conventional)";
const COMMON_PRACTICE: &str = "common practice";
const JULIAN_YEAR: &str = "IAU Julian year (365.25 d), from memory";

const L: [i32; 7] = [1, 0, 0, 0, 0, 0, 0];
const AREA: [i32; 7] = [2, 0, 0, 0, 0, 0, 0];
const VOLUME: [i32; 7] = [3, 0, 0, 0, 0, 0, 0];
const MASS: [i32; 7] = [0, 1, 0, 0, 0, 0, 0];
const TIME: [i32; 7] = [0, 0, 1, 0, 0, 0, 0];
const FREQUENCY: [i32; 7] = [0, 0, -1, 0, 0, 0, 0];
const CURRENT: [i32; 7] = [0, 0, 0, 1, 0, 0, 0];
const TEMPERATURE: [i32; 7] = [0, 0, 0, 0, 1, 0, 0];
const AMOUNT: [i32; 7] = [0, 0, 0, 0, 0, 1, 0];
const FORCE: [i32; 7] = [1, 1, -2, 0, 0, 0, 0];
const PRESSURE: [i32; 7] = [-1, 1, -2, 0, 0, 0, 0];
const ENERGY: [i32; 7] = [2, 1, -2, 0, 0, 0, 0];
const POWER: [i32; 7] = [2, 1, -3, 0, 0, 0, 0];
const DYNAMIC_VISCOSITY: [i32; 7] = [-1, 1, -1, 0, 0, 0, 0];
const KINEMATIC_VISCOSITY: [i32; 7] = [2, 0, -1, 0, 0, 0, 0];
const CHARGE: [i32; 7] = [0, 0, 1, 1, 0, 0, 0];
const VOLTAGE: [i32; 7] = [2, 1, -3, -1, 0, 0, 0];
const RESISTANCE: [i32; 7] = [2, 1, -3, -2, 0, 0, 0];
const CONDUCTANCE: [i32; 7] = [-2, -1, 3, 2, 0, 0, 0];
const NONE: [i32; 7] = [0, 0, 0, 0, 0, 0, 0];
const VOLUME_FLOW: [i32; 7] = [3, 0, -1, 0, 0, 0, 0];

/// Builds a plain row; the few rows with offsets or temperature roles set those fields. One
/// argument per column of the table, so that each row reads as a line of it.
#[allow(clippy::too_many_arguments)]
const fn unit(
    symbols: &'static [&'static str],
    name: &'static str,
    dimension: [i32; 7],
    factor: &'static str,
    prefixable: bool,
    source: &'static str,
    note: &'static str,
    system: UnitSystem,
) -> UnitDefinition {
    UnitDefinition {
        symbols,
        name,
        dimension,
        factor,
        offset: None,
        temperature: TemperatureRole::None,
        prefixable,
        source,
        note,
        system,
    }
}

/// Spellings used in the trade for more than one unit: refused with the choices rather than
/// guessed (`a`: annum or are).
pub const AMBIGUOUS: &[(&str, &[(&str, &str)])] = &[
    ("a", &[("yr", "a year (annum)"), ("are", "an are, 100 m^2")]),
    (
        "ton",
        &[
            ("t", "a tonne, 1000 kg"),
            ("ton_US", "a short ton, 2000 lb"),
            ("ton_UK", "a long ton, 2240 lb"),
        ],
    ),
    (
        "pcf",
        &[("lb/ft^3", "a density"), ("lbf/ft^3", "a unit weight")],
    ),
    (
        "therm",
        &[("therm_US", "the US therm"), ("therm_EC", "the EC therm")],
    ),
];

/// Every unit the language knows.
pub const UNITS: &[UnitDefinition] = &[
    // Length
    unit(&["m"], "metre", L, "1", true, SI_BROCHURE_BASE, "", METRIC),
    unit(
        &["ft"],
        "foot (international)",
        L,
        "0.3048",
        false,
        NIST_811,
        "exact",
        US_CUSTOMARY,
    ),
    unit(
        &["in"],
        "inch",
        L,
        "0.0254",
        false,
        NIST_811,
        "exact",
        US_CUSTOMARY,
    ),
    unit(
        &["yd"],
        "yard",
        L,
        "0.9144",
        false,
        NIST_811,
        "exact",
        US_CUSTOMARY,
    ),
    unit(
        &["mi"],
        "mile (international)",
        L,
        "1609.344",
        false,
        NIST_811,
        "exact",
        US_CUSTOMARY,
    ),
    // Area
    unit(
        &["ha"],
        "hectare",
        AREA,
        "10000",
        false,
        SI_BROCHURE_ACCEPTED,
        "exact",
        METRIC,
    ),
    unit(
        &["acre", "ac"],
        "acre (international)",
        AREA,
        "43560*0.3048*0.3048",
        false,
        NIST_811,
        "43 560 ft^2, exact",
        US_CUSTOMARY,
    ),
    // Volume
    unit(
        &["L", "l"],
        "litre",
        VOLUME,
        "0.001",
        true,
        SI_BROCHURE_ACCEPTED,
        "exact",
        METRIC,
    ),
    unit(
        &["gal"],
        "gallon (US liquid)",
        VOLUME,
        "0.003785411784",
        false,
        NIST_811,
        "231 in^3, exact",
        US_CUSTOMARY,
    ),
    unit(
        &["bbl"],
        "barrel (oil, 42 US gal)",
        VOLUME,
        "42*0.003785411784",
        false,
        NIST_811,
        "exact",
        US_CUSTOMARY,
    ),
    unit(
        &["gpm"],
        "US gallon per minute",
        VOLUME_FLOW,
        "0.003785411784/60",
        false,
        NIST_811,
        "exact",
        US_CUSTOMARY,
    ),
    // Time
    unit(
        &["s", "sec"],
        "second",
        TIME,
        "1",
        true,
        SI_BROCHURE_BASE,
        "",
        NO_SYSTEM,
    ),
    unit(
        &["min"],
        "minute",
        TIME,
        "60",
        false,
        SI_BROCHURE_ACCEPTED,
        "exact",
        NO_SYSTEM,
    ),
    unit(
        &["h", "hr"],
        "hour",
        TIME,
        "3600",
        false,
        SI_BROCHURE_ACCEPTED,
        "exact",
        NO_SYSTEM,
    ),
    unit(
        &["d", "day"],
        "day",
        TIME,
        "86400",
        false,
        SI_BROCHURE_ACCEPTED,
        "exact",
        NO_SYSTEM,
    ),
    unit(
        &["wk"],
        "week",
        TIME,
        "604800",
        false,
        NIST_811,
        "7 d, exact",
        NO_SYSTEM,
    ),
    unit(
        &["yr", "year"],
        "year (Julian, 365.25 d)",
        TIME,
        "31557600",
        false,
        JULIAN_YEAR,
        "365.25 d = 31 557 600 s, exact",
        NO_SYSTEM,
    ),
    unit(
        &["Hz"],
        "hertz",
        FREQUENCY,
        "1",
        true,
        SI_BROCHURE_DERIVED,
        "",
        NO_SYSTEM,
    ),
    // Mass
    unit(
        &["g"],
        "gram",
        MASS,
        "0.001",
        true,
        SI_BROCHURE_BASE,
        "kg is k + g",
        METRIC,
    ),
    unit(
        &["t"],
        "tonne",
        MASS,
        "1000",
        false,
        SI_BROCHURE_ACCEPTED,
        "exact",
        METRIC,
    ),
    unit(
        &["lb"],
        "pound (avoirdupois)",
        MASS,
        "0.45359237",
        false,
        NIST_811,
        "exact",
        US_CUSTOMARY,
    ),
    // Force
    unit(
        &["N"],
        "newton",
        FORCE,
        "1",
        true,
        SI_BROCHURE_DERIVED,
        "",
        METRIC,
    ),
    unit(
        &["lbf"],
        "pound-force",
        FORCE,
        "0.45359237*9.80665",
        false,
        NIST_811,
        "exact",
        US_CUSTOMARY,
    ),
    unit(
        &["kgf"],
        "kilogram-force",
        FORCE,
        "9.80665",
        false,
        NIST_811,
        "exact",
        METRIC,
    ),
    // Pressure
    unit(
        &["Pa"],
        "pascal",
        PRESSURE,
        "1",
        true,
        SI_BROCHURE_DERIVED,
        "",
        METRIC,
    ),
    unit(
        &["bar"],
        "bar",
        PRESSURE,
        "100000",
        true,
        NIST_811,
        "exact",
        METRIC,
    ),
    unit(
        &["atm"],
        "standard atmosphere",
        PRESSURE,
        "101325",
        false,
        NIST_811,
        "exact",
        METRIC,
    ),
    unit(
        &["psi"],
        "pound-force per square inch",
        PRESSURE,
        "0.45359237*9.80665/0.0254/0.0254",
        false,
        NIST_811,
        "lbf/in^2, exact",
        US_CUSTOMARY,
    ),
    unit(
        &["mmHg"],
        "millimetre of mercury (conventional)",
        PRESSURE,
        "133.322387415",
        false,
        NIST_811_CONVENTIONAL,
        "13.5951 kg/L x 1 mm x g0",
        METRIC,
    ),
    unit(
        &["mH2O"],
        "metre of water (conventional)",
        PRESSURE,
        "9806.65",
        false,
        NIST_811_CONVENTIONAL,
        "1000 kg/m^3 x 1 m x g0, exact",
        METRIC,
    ),
    unit(
        &["cmH2O"],
        "centimetre of water (conventional)",
        PRESSURE,
        "98.0665",
        false,
        NIST_811_CONVENTIONAL,
        "exact",
        METRIC,
    ),
    unit(
        &["ftH2O", "ft_H2O"],
        "foot of water (conventional)",
        PRESSURE,
        "0.3048*9806.65",
        false,
        NIST_811_CONVENTIONAL,
        "exact",
        US_CUSTOMARY,
    ),
    unit(
        &["inH2O"],
        "inch of water (conventional)",
        PRESSURE,
        "0.0254*9806.65",
        false,
        NIST_811_CONVENTIONAL,
        "exact",
        US_CUSTOMARY,
    ),
    // Energy and power
    unit(
        &["J"],
        "joule",
        ENERGY,
        "1",
        true,
        SI_BROCHURE_DERIVED,
        "",
        METRIC,
    ),
    unit(
        &["cal"],
        "calorie (thermochemical)",
        ENERGY,
        "4.184",
        true,
        NIST_811,
        "exact",
        METRIC,
    ),
    unit(
        &["BTU", "Btu"],
        "British thermal unit (IT)",
        ENERGY,
        "1055.05585262",
        false,
        NIST_811,
        "exact",
        US_CUSTOMARY,
    ),
    unit(
        &["Wh"],
        "watt hour",
        ENERGY,
        "3600",
        true,
        NIST_811,
        "exact; kWh is k + Wh",
        METRIC,
    ),
    unit(
        &["eV"],
        "electronvolt",
        ENERGY,
        "1.602176634e-19",
        true,
        SI_BROCHURE_ACCEPTED,
        "exact (2019 SI)",
        METRIC,
    ),
    unit(
        &["W"],
        "watt",
        POWER,
        "1",
        true,
        SI_BROCHURE_DERIVED,
        "",
        METRIC,
    ),
    unit(
        &["hp"],
        "horsepower (mechanical, 550 ft lbf/s)",
        POWER,
        "550*0.3048*0.45359237*9.80665",
        false,
        NIST_811,
        "exact",
        US_CUSTOMARY,
    ),
    // Temperature
    unit(
        &["K"],
        "kelvin",
        TEMPERATURE,
        "1",
        true,
        SI_BROCHURE_BASE,
        "",
        METRIC,
    ),
    UnitDefinition {
        symbols: &["degC", "°C", "℃"],
        name: "degree Celsius",
        dimension: TEMPERATURE,
        factor: "1",
        offset: Some("273.15"),
        temperature: TemperatureRole::Absolute,
        prefixable: false,
        source: SI_BROCHURE_DERIVED,
        note: "absolute; a difference inside a compound unit",
        system: METRIC,
    },
    UnitDefinition {
        symbols: &["degF", "°F", "℉"],
        name: "degree Fahrenheit",
        dimension: TEMPERATURE,
        factor: "5/9",
        offset: Some("459.67"),
        temperature: TemperatureRole::Absolute,
        prefixable: false,
        source: NIST_811,
        note: "absolute; a difference inside a compound unit",
        system: US_CUSTOMARY,
    },
    UnitDefinition {
        symbols: &["degR", "°R"],
        name: "degree Rankine",
        dimension: TEMPERATURE,
        factor: "5/9",
        offset: Some("0"),
        temperature: TemperatureRole::Absolute,
        prefixable: false,
        source: NIST_811,
        note: "absolute",
        system: US_CUSTOMARY,
    },
    UnitDefinition {
        symbols: &["delta_degC"],
        name: "degree Celsius (difference)",
        dimension: TEMPERATURE,
        factor: "1",
        offset: None,
        temperature: TemperatureRole::Difference,
        prefixable: false,
        source: SI_BROCHURE_DERIVED,
        note: "temperature difference",
        system: METRIC,
    },
    UnitDefinition {
        symbols: &["delta_degF"],
        name: "degree Fahrenheit (difference)",
        dimension: TEMPERATURE,
        factor: "5/9",
        offset: None,
        temperature: TemperatureRole::Difference,
        prefixable: false,
        source: NIST_811,
        note: "temperature difference",
        system: US_CUSTOMARY,
    },
    // Viscosity
    unit(
        &["P"],
        "poise",
        DYNAMIC_VISCOSITY,
        "0.1",
        true,
        NIST_811,
        "exact; cP = mPa s",
        METRIC,
    ),
    unit(
        &["St"],
        "stokes",
        KINEMATIC_VISCOSITY,
        "0.0001",
        true,
        NIST_811,
        "exact",
        METRIC,
    ),
    // Permeability
    unit(
        &["darcy", "D"],
        "darcy",
        AREA,
        "1e-12/1.01325",
        true,
        NIST_811,
        "1 cP x (1 cm/s) / (1 atm/cm), exact; SP 811 prints 9.869233E-13 m^2",
        METRIC,
    ),
    // Amount, electricity
    unit(
        &["mol"],
        "mole",
        AMOUNT,
        "1",
        true,
        SI_BROCHURE_BASE,
        "",
        METRIC,
    ),
    unit(
        &["A"],
        "ampere",
        CURRENT,
        "1",
        true,
        SI_BROCHURE_BASE,
        "",
        METRIC,
    ),
    unit(
        &["C"],
        "coulomb",
        CHARGE,
        "1",
        true,
        SI_BROCHURE_DERIVED,
        "",
        METRIC,
    ),
    unit(
        &["V"],
        "volt",
        VOLTAGE,
        "1",
        true,
        SI_BROCHURE_DERIVED,
        "",
        METRIC,
    ),
    unit(
        &["ohm", "Ω"],
        "ohm",
        RESISTANCE,
        "1",
        true,
        SI_BROCHURE_DERIVED,
        "",
        METRIC,
    ),
    unit(
        &["S"],
        "siemens",
        CONDUCTANCE,
        "1",
        true,
        SI_BROCHURE_DERIVED,
        "",
        METRIC,
    ),
    unit(
        &["mho"],
        "mho",
        CONDUCTANCE,
        "1",
        true,
        NIST_811,
        "the siemens under its old name; umho/cm is uS/cm",
        METRIC,
    ),
    unit(
        &["HFU"],
        "heat flow unit",
        [0, 1, -3, 0, 0, 0, 0],
        "4.184/1000000/0.0001",
        false,
        COMMON_PRACTICE,
        "1 ucal/(cm^2*s) with the thermochemical calorie (NIST SP 811 B.8): 41.84 mW/m^2",
        METRIC,
    ),
    // Ratios and angles
    unit(
        &["%"],
        "percent",
        NONE,
        "0.01",
        false,
        COMMON_PRACTICE,
        "exact",
        NO_SYSTEM,
    ),
    unit(
        &["ppm"],
        "part per million",
        NONE,
        "0.000001",
        false,
        COMMON_PRACTICE,
        "by mass or volume as the data say",
        NO_SYSTEM,
    ),
    unit(
        &["ppb"],
        "part per billion",
        NONE,
        "0.000000001",
        false,
        COMMON_PRACTICE,
        "",
        NO_SYSTEM,
    ),
    unit(
        &["rad"],
        "radian",
        NONE,
        "1",
        false,
        SI_BROCHURE_DERIVED,
        "",
        NO_SYSTEM,
    ),
    unit(
        &["deg", "°"],
        "degree (angle)",
        NONE,
        "pi/180",
        false,
        SI_BROCHURE_ACCEPTED,
        "pi/180, not a decimal",
        NO_SYSTEM,
    ),
    // Trade spellings: units engineers type every day, beside the SI and NIST rows above.
    unit(
        &["are"],
        "are",
        AREA,
        "100",
        false,
        NIST_811,
        "exact; `a` alone is refused (annum or are)",
        METRIC,
    ),
    unit(
        &["gal_imp", "impgal"],
        "gallon (imperial)",
        VOLUME,
        "0.00454609",
        false,
        NIST_811,
        "exact; `gal` is the US gallon",
        IMPERIAL,
    ),
    unit(
        &["cfs"],
        "cubic foot per second",
        VOLUME_FLOW,
        "0.3048*0.3048*0.3048",
        false,
        NIST_811,
        "exact",
        US_CUSTOMARY,
    ),
    unit(
        &["gpd"],
        "US gallon per day",
        VOLUME_FLOW,
        "0.003785411784/86400",
        false,
        COMMON_PRACTICE,
        "exact from NIST SP 811 gallon and day",
        US_CUSTOMARY,
    ),
    unit(
        &["MGD"],
        "million US gallons per day",
        VOLUME_FLOW,
        "3785.411784/86400",
        false,
        COMMON_PRACTICE,
        "exact from NIST SP 811 gallon and day",
        US_CUSTOMARY,
    ),
    unit(
        &["ton_US"],
        "ton (short, 2000 lb)",
        MASS,
        "907.18474",
        false,
        NIST_811,
        "exact",
        US_CUSTOMARY,
    ),
    unit(
        &["ton_UK"],
        "ton (long, 2240 lb)",
        MASS,
        "1016.0469088",
        false,
        NIST_811,
        "exact",
        IMPERIAL,
    ),
    unit(
        &["kip"],
        "kip (1000 lbf)",
        FORCE,
        "4448.2216152605",
        false,
        NIST_811,
        "exact",
        US_CUSTOMARY,
    ),
    unit(
        &["ksi"],
        "kip per square inch",
        PRESSURE,
        "453.59237*9.80665/0.0254/0.0254",
        false,
        NIST_811,
        "exact",
        US_CUSTOMARY,
    ),
    unit(
        &["tsf"],
        "ton-force (short) per square foot",
        PRESSURE,
        "907.18474*9.80665/0.3048/0.3048",
        false,
        COMMON_PRACTICE,
        "2000 lbf/ft^2, exact from NIST SP 811 factors; geotechnical practice",
        US_CUSTOMARY,
    ),
    unit(
        &["Torr", "torr"],
        "torr",
        PRESSURE,
        "101325/760",
        false,
        NIST_811,
        "exact, 1/760 atm",
        METRIC,
    ),
    unit(
        &["inHg"],
        "inch of mercury (conventional)",
        PRESSURE,
        "13595.1*9.80665*0.0254",
        false,
        NIST_811_CONVENTIONAL,
        "13.5951 kg/L x 1 in x g0",
        US_CUSTOMARY,
    ),
    unit(
        &["mmH2O"],
        "millimetre of water (conventional)",
        PRESSURE,
        "9.80665",
        false,
        NIST_811_CONVENTIONAL,
        "1000 kg/m^3 x 1 mm x g0, exact",
        METRIC,
    ),
    unit(
        &["therm_US"],
        "therm (US)",
        ENERGY,
        "105480400",
        false,
        NIST_811,
        "exact as tabulated; `therm` alone is refused (US or EC)",
        US_CUSTOMARY,
    ),
    unit(
        &["therm_EC"],
        "therm (EC)",
        ENERGY,
        "105506000",
        false,
        NIST_811,
        "exact as tabulated",
        IMPERIAL,
    ),
];

/// SI prefixes, longest symbols first where two share a first letter (`da` before `d`).
pub const PREFIXES: &[Prefix] = &[
    Prefix {
        symbols: &["Q"],
        factor: "1e30",
    },
    Prefix {
        symbols: &["R"],
        factor: "1e27",
    },
    Prefix {
        symbols: &["Y"],
        factor: "1e24",
    },
    Prefix {
        symbols: &["Z"],
        factor: "1e21",
    },
    Prefix {
        symbols: &["E"],
        factor: "1e18",
    },
    Prefix {
        symbols: &["P"],
        factor: "1e15",
    },
    Prefix {
        symbols: &["T"],
        factor: "1e12",
    },
    Prefix {
        symbols: &["G"],
        factor: "1e9",
    },
    Prefix {
        symbols: &["M"],
        factor: "1e6",
    },
    Prefix {
        symbols: &["k"],
        factor: "1e3",
    },
    Prefix {
        symbols: &["h"],
        factor: "1e2",
    },
    Prefix {
        symbols: &["da"],
        factor: "1e1",
    },
    Prefix {
        symbols: &["d"],
        factor: "1e-1",
    },
    Prefix {
        symbols: &["c"],
        factor: "1e-2",
    },
    Prefix {
        symbols: &["m"],
        factor: "1e-3",
    },
    Prefix {
        symbols: &["u", "µ", "μ"],
        factor: "1e-6",
    },
    Prefix {
        symbols: &["n"],
        factor: "1e-9",
    },
    Prefix {
        symbols: &["p"],
        factor: "1e-12",
    },
    Prefix {
        symbols: &["f"],
        factor: "1e-15",
    },
    Prefix {
        symbols: &["a"],
        factor: "1e-18",
    },
    Prefix {
        symbols: &["z"],
        factor: "1e-21",
    },
    Prefix {
        symbols: &["y"],
        factor: "1e-24",
    },
];
