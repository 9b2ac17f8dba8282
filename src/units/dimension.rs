//! Physical dimensions as rational powers of the seven SI base quantities.
//!
//! Exponents are rationals so that `sqrt` of an area is a length and `sqrt` of a length is
//! L^(1/2) instead of an error or a silent truncation. All arithmetic on exponents is checked:
//! an overflow is an error value, never a panic.

use num_rational::Ratio;
use num_traits::{CheckedAdd, CheckedMul, CheckedSub};
use std::fmt;

/// A rational exponent of a base dimension.
pub type Exponent = Ratio<i32>;

/// The seven SI base quantities, in the SI Brochure's order.
pub const BASE_SYMBOLS: [&str; 7] = ["L", "M", "T", "I", "Θ", "N", "J"];
/// The SI base unit of each base quantity, used to spell SI units (`m s^-1`).
pub const BASE_UNITS: [&str; 7] = ["m", "kg", "s", "A", "K", "mol", "cd"];

/// Largest numerator or denominator an exponent may reach; keeps arithmetic far from overflow.
const EXPONENT_LIMIT: i32 = 1_000;

/// A dimension: the exponent of each base quantity.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct Dimension {
    exponents: [Exponent; 7],
}

/// An exponent left the supported range (numerator or denominator above 1000).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct ExponentOverflow;

impl Dimension {
    pub const fn dimensionless() -> Self {
        Dimension {
            exponents: [Ratio::new_raw(0, 1); 7],
        }
    }

    /// A dimension from integer exponents in base order L M T I Θ N J.
    pub const fn from_integers(powers: [i32; 7]) -> Self {
        let mut exponents = [Ratio::new_raw(0, 1); 7];
        let mut index = 0;
        while index < 7 {
            exponents[index] = Ratio::new_raw(powers[index], 1);
            index += 1;
        }
        Dimension { exponents }
    }

    pub const LENGTH: Dimension = Dimension::from_integers([1, 0, 0, 0, 0, 0, 0]);
    pub const MASS: Dimension = Dimension::from_integers([0, 1, 0, 0, 0, 0, 0]);
    pub const TIME: Dimension = Dimension::from_integers([0, 0, 1, 0, 0, 0, 0]);
    pub const TEMPERATURE: Dimension = Dimension::from_integers([0, 0, 0, 0, 1, 0, 0]);

    pub fn exponents(&self) -> &[Exponent; 7] {
        &self.exponents
    }

    pub fn is_dimensionless(&self) -> bool {
        self.exponents
            .iter()
            .all(|exponent| *exponent == Ratio::from_integer(0))
    }

    pub fn is_temperature(&self) -> bool {
        *self == Dimension::TEMPERATURE
    }

    pub fn multiply(&self, other: &Dimension) -> Result<Dimension, ExponentOverflow> {
        self.combine(other, |left, right| left.checked_add(&right))
    }

    pub fn divide(&self, other: &Dimension) -> Result<Dimension, ExponentOverflow> {
        self.combine(other, |left, right| left.checked_sub(&right))
    }

    pub fn power(&self, exponent: Exponent) -> Result<Dimension, ExponentOverflow> {
        let mut exponents = self.exponents;
        for slot in exponents.iter_mut() {
            *slot = checked(slot.checked_mul(&exponent))?;
        }
        Ok(Dimension { exponents })
    }

    fn combine(
        &self,
        other: &Dimension,
        operation: impl Fn(Exponent, Exponent) -> Option<Exponent>,
    ) -> Result<Dimension, ExponentOverflow> {
        let mut exponents = self.exponents;
        for (slot, right) in exponents.iter_mut().zip(other.exponents.iter()) {
            *slot = checked(operation(*slot, *right))?;
        }
        Ok(Dimension { exponents })
    }

    /// The SI coherent unit of this dimension spelled with base units, e.g. `kg m^-1 s^-2`.
    pub fn si_unit_text(&self) -> String {
        self.spell(&BASE_UNITS, "1")
    }

    fn spell(&self, symbols: &[&str; 7], empty: &str) -> String {
        let mut parts = Vec::new();
        for (symbol, exponent) in symbols.iter().zip(self.exponents.iter()) {
            if *exponent == Ratio::from_integer(0) {
                continue;
            }
            if *exponent == Ratio::from_integer(1) {
                parts.push(symbol.to_string());
            } else if exponent.is_integer() {
                parts.push(format!("{symbol}^{}", exponent.numer()));
            } else {
                parts.push(format!(
                    "{symbol}^({}/{})",
                    exponent.numer(),
                    exponent.denom()
                ));
            }
        }
        if parts.is_empty() {
            empty.to_string()
        } else {
            parts.join(" ")
        }
    }

    /// The SI unit engineers would write for this dimension (`Pa`, `m/s`, `W/(m*K)`), falling back
    /// to a composition of base units (`kg/(m*s^3)`, see `composed_si_unit`). Its value is
    /// the SI value: every quantity without a unit of its own is shown in it, so that the
    /// number shown is the number computed.
    pub fn preferred_si_unit(&self) -> String {
        if let Some((_, unit)) = PREFERRED_SI_UNITS
            .iter()
            .find(|(powers, _)| Dimension::from_integers(*powers) == *self)
        {
            return unit.to_string();
        }
        self.composed_si_unit()
    }

    /// Base units as engineers write a derived unit: the positive powers over the negative
    /// ones, mass first, a denominator of several units in parentheses, no negative
    /// exponents: `kg/m^4`, `kg*m^2/(s^3*A)`, `1/(m*s)`, `m^(1/2)`; `1` when dimensionless.
    pub fn composed_si_unit(&self) -> String {
        // Mass first, then length and time: `kg*m/s^2`, `kg/(m*s^2)`.
        const ORDER: [usize; 7] = [1, 0, 2, 3, 4, 5, 6];
        let power = |symbol: &str, exponent: Exponent| -> String {
            if exponent == Ratio::from_integer(1) {
                symbol.to_string()
            } else if exponent.is_integer() {
                format!("{symbol}^{}", exponent.numer())
            } else {
                format!("{symbol}^({}/{})", exponent.numer(), exponent.denom())
            }
        };
        let zero = Ratio::from_integer(0);
        let mut numerator = Vec::new();
        let mut denominator = Vec::new();
        for index in ORDER {
            let exponent = self.exponents[index];
            if exponent > zero {
                numerator.push(power(BASE_UNITS[index], exponent));
            } else if exponent < zero {
                denominator.push(power(BASE_UNITS[index], -exponent));
            }
        }
        let top = if numerator.is_empty() {
            "1".to_string()
        } else {
            numerator.join("*")
        };
        match denominator.len() {
            0 => top,
            1 => format!("{top}/{}", denominator[0]),
            _ => format!("{top}/({})", denominator.join("*")),
        }
    }

    /// The unit a value with no unit of its own is shown in: the trade's usual unit where it
    /// differs from SI (a solute's mass flux in mg/(m^2*d)), otherwise `preferred_si_unit`.
    /// Whoever shows a value in it converts from SI first.
    pub fn display_unit(&self) -> String {
        match TRADE_DISPLAY_UNITS
            .iter()
            .find(|(powers, _)| Dimension::from_integers(*powers) == *self)
        {
            Some((_, unit)) => unit.to_string(),
            None => self.preferred_si_unit(),
        }
    }

    /// A trade name for common dimensions (`velocity`, `pressure`), used in error messages.
    /// The one phrase every message uses for a dimension: "a velocity (m/s)", "a dimensionless
    /// number", "a quantity of dimension L^(1/2) (m^(1/2))".
    pub fn phrase(&self) -> String {
        match self.quantity_name() {
            Some("dimensionless") => "a dimensionless number".to_string(),
            Some(name) => {
                let article = if name.starts_with(['a', 'e', 'i', 'o', 'u']) {
                    "an"
                } else {
                    "a"
                };
                format!("{article} {name} ({})", self.preferred_si_unit())
            }
            None => format!(
                "a quantity of dimension {self} ({})",
                self.preferred_si_unit()
            ),
        }
    }

    pub fn quantity_name(&self) -> Option<&'static str> {
        NAMED_DIMENSIONS
            .iter()
            .find(|(powers, _)| Dimension::from_integers(*powers) == *self)
            .map(|(_, name)| *name)
    }

    /// Parses a dimension written as a trade name (`length`) or base symbols (`L T^-1`).
    pub fn from_name(text: &str) -> Option<Dimension> {
        let wanted = text.trim().to_lowercase().replace(['_', '-'], " ");
        NAMED_DIMENSIONS
            .iter()
            .find(|(_, name)| *name == wanted)
            .map(|(powers, _)| Dimension::from_integers(*powers))
    }
}

fn checked(exponent: Option<Exponent>) -> Result<Exponent, ExponentOverflow> {
    match exponent {
        Some(value)
            if value.numer().unsigned_abs() <= EXPONENT_LIMIT.unsigned_abs()
                && value.denom().unsigned_abs() <= EXPONENT_LIMIT.unsigned_abs() =>
        {
            Ok(value)
        }
        _ => Err(ExponentOverflow),
    }
}

/// Names engineers use for dimensions, base order L M T I Θ N J. Where two quantities share a
/// dimension (kinematic viscosity, diffusivity and transmissivity are all L^2 T^-1), the name
/// says so rather than guessing which one is meant.
const NAMED_DIMENSIONS: &[([i32; 7], &str)] = &[
    ([0, 0, 0, 0, 0, 0, 0], "dimensionless"),
    ([1, 0, 0, 0, 0, 0, 0], "length"),
    ([2, 0, 0, 0, 0, 0, 0], "area"),
    ([3, 0, 0, 0, 0, 0, 0], "volume"),
    ([0, 1, 0, 0, 0, 0, 0], "mass"),
    ([0, 0, 1, 0, 0, 0, 0], "time"),
    ([0, 0, -1, 0, 0, 0, 0], "frequency"),
    ([0, 0, 0, 1, 0, 0, 0], "electric current"),
    ([0, 0, 0, 0, 1, 0, 0], "temperature"),
    ([0, 0, 0, 0, 0, 1, 0], "amount of substance"),
    ([0, 0, 0, 0, 0, 0, 1], "luminous intensity"),
    ([1, 0, -1, 0, 0, 0, 0], "velocity"),
    ([1, 0, -2, 0, 0, 0, 0], "acceleration"),
    ([3, 0, -1, 0, 0, 0, 0], "volume flow rate"),
    ([2, 0, -1, 0, 0, 0, 0], "area per time"),
    ([-3, 1, 0, 0, 0, 0, 0], "density"),
    ([1, 1, -2, 0, 0, 0, 0], "force"),
    ([-1, 1, -2, 0, 0, 0, 0], "pressure"),
    ([-2, 1, -2, 0, 0, 0, 0], "pressure gradient"),
    ([2, 1, -2, 0, 0, 0, 0], "energy"),
    ([2, 1, -3, 0, 0, 0, 0], "power"),
    ([0, 1, -3, 0, 0, 0, 0], "heat flux"),
    ([-1, 1, -1, 0, 0, 0, 0], "dynamic viscosity"),
    ([1, 1, -3, 0, -1, 0, 0], "thermal conductivity"),
    ([2, 0, -2, 0, -1, 0, 0], "specific heat capacity"),
    ([0, 0, 1, 1, 0, 0, 0], "electric charge"),
    ([2, 1, -3, -1, 0, 0, 0], "voltage"),
    ([2, 1, -3, -2, 0, 0, 0], "electrical resistance"),
    ([-2, -1, 3, 2, 0, 0, 0], "electrical conductance"),
    ([3, 1, -3, -2, 0, 0, 0], "electrical resistivity"),
    ([-3, -1, 3, 2, 0, 0, 0], "electrical conductivity"),
    ([-2, 0, 0, 1, 0, 0, 0], "current density"),
    ([-3, 0, 0, 0, 0, 1, 0], "concentration"),
    ([-2, 0, -1, 0, 0, 1, 0], "molar flux"),
    ([-2, 1, -1, 0, 0, 0, 0], "mass flux"),
    ([0, 1, -1, 0, 0, 0, 0], "mass flow rate"),
    ([-1, 0, 0, 0, 1, 0, 0], "temperature gradient"),
];

/// Every spelling of the two tables below with its dimension, for tests that read each back.
pub fn listed_display_units() -> impl Iterator<Item = (Dimension, &'static str)> {
    PREFERRED_SI_UNITS
        .iter()
        .chain(TRADE_DISPLAY_UNITS)
        .map(|(powers, unit)| (Dimension::from_integers(*powers), *unit))
}

/// Units the trade states a quantity in that are not SI-coherent, base order L M T I Θ N J.
/// Kept short: each entry makes the shown number differ from the SI value.
const TRADE_DISPLAY_UNITS: &[([i32; 7], &str)] = &[
    // A solute's mass flux through a liner or an aquitard: fractions of a milligram per
    // square metre and day; in kg/(m^2*s) the same flux reads 1e-12 (common practice).
    ([-2, 1, -1, 0, 0, 0, 0], "mg/(m^2*d)"),
];

/// Usual SI spellings, base order L M T I Θ N J.
const PREFERRED_SI_UNITS: &[([i32; 7], &str)] = &[
    ([0, 0, 0, 0, 0, 0, 0], "1"),
    ([1, 0, 0, 0, 0, 0, 0], "m"),
    ([2, 0, 0, 0, 0, 0, 0], "m^2"),
    ([3, 0, 0, 0, 0, 0, 0], "m^3"),
    ([0, 1, 0, 0, 0, 0, 0], "kg"),
    ([0, 0, 1, 0, 0, 0, 0], "s"),
    ([0, 0, -1, 0, 0, 0, 0], "1/s"),
    ([0, 0, 0, 1, 0, 0, 0], "A"),
    ([0, 0, 0, 0, 1, 0, 0], "K"),
    ([0, 0, 0, 0, 0, 1, 0], "mol"),
    ([1, 0, -1, 0, 0, 0, 0], "m/s"),
    ([1, 0, -2, 0, 0, 0, 0], "m/s^2"),
    ([3, 0, -1, 0, 0, 0, 0], "m^3/s"),
    ([2, 0, -1, 0, 0, 0, 0], "m^2/s"),
    ([-3, 1, 0, 0, 0, 0, 0], "kg/m^3"),
    ([1, 1, -2, 0, 0, 0, 0], "N"),
    ([-1, 1, -2, 0, 0, 0, 0], "Pa"),
    ([-2, 1, -2, 0, 0, 0, 0], "Pa/m"),
    ([2, 1, -2, 0, 0, 0, 0], "J"),
    ([2, 1, -3, 0, 0, 0, 0], "W"),
    ([0, 1, -3, 0, 0, 0, 0], "W/m^2"),
    ([-1, 1, -1, 0, 0, 0, 0], "Pa*s"),
    ([1, 1, -3, 0, -1, 0, 0], "W/(m*K)"),
    ([2, 0, -2, 0, -1, 0, 0], "J/(kg*K)"),
    ([0, 0, 1, 1, 0, 0, 0], "C"),
    ([2, 1, -3, -1, 0, 0, 0], "V"),
    ([2, 1, -3, -2, 0, 0, 0], "ohm"),
    ([-2, -1, 3, 2, 0, 0, 0], "S"),
    ([3, 1, -3, -2, 0, 0, 0], "ohm*m"),
    ([-3, -1, 3, 2, 0, 0, 0], "S/m"),
    ([-2, 0, 0, 1, 0, 0, 0], "A/m^2"),
    ([-3, 0, 0, 0, 0, 1, 0], "mol/m^3"),
    ([-2, 0, -1, 0, 0, 1, 0], "mol/(m^2*s)"),
    ([-2, 1, -1, 0, 0, 0, 0], "kg/(m^2*s)"),
    ([0, 1, -1, 0, 0, 0, 0], "kg/s"),
    ([-1, 0, 0, 0, 1, 0, 0], "K/m"),
    ([-1, 0, 0, 0, 0, 0, 0], "1/m"),
    ([1, 0, 0, -1, 0, 0, 0], "m/A"),
    ([2, 1, -2, 0, -1, 0, 0], "J/K"),
    ([2, 1, -2, 0, -1, -1, 0], "J/(mol*K)"),
    ([0, 0, 1, 1, 0, -1, 0], "C/mol"),
    ([-4, 1, 0, 0, 0, 0, 0], "kg/m^4"),
    ([-4, 0, 0, 0, 0, 1, 0], "mol/m^4"),
    ([-2, 1, 0, 0, 0, 0, 0], "kg/m^2"),
    ([-1, 1, 0, 0, 0, 0, 0], "kg/m"),
    ([1, -1, 2, 0, 0, 0, 0], "1/Pa"),
    ([2, 0, -2, 0, 0, 0, 0], "J/kg"),
    ([0, 1, -3, 0, -1, 0, 0], "W/(m^2*K)"),
    ([0, -1, 3, 0, 1, 0, 0], "m^2*K/W"),
    ([-1, 1, -2, 0, -1, 0, 0], "J/(m^3*K)"),
    ([-1, 1, -3, 0, 0, 0, 0], "W/m^3"),
    ([1, 1, -3, 0, 0, 0, 0], "W/m"),
    ([-3, 0, 1, 1, 0, 0, 0], "C/m^3"),
    ([0, 0, -1, 0, 1, 0, 0], "K/s"),
    ([-3, 0, -1, 0, 0, 1, 0], "mol/(m^3*s)"),
    ([-3, 1, -1, 0, 0, 0, 0], "kg/(m^3*s)"),
];

impl fmt::Display for Dimension {
    /// Base symbols with exponents, e.g. `L T^-1`; `1` for a dimensionless quantity.
    fn fmt(&self, formatter: &mut fmt::Formatter<'_>) -> fmt::Result {
        formatter.write_str(&self.spell(&BASE_SYMBOLS, "1"))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn square_root_of_length_has_half_exponent() {
        let root = Dimension::LENGTH.power(Ratio::new(1, 2)).unwrap();
        assert_eq!(root.to_string(), "L^(1/2)");
        assert_eq!(root.multiply(&root).unwrap(), Dimension::LENGTH);
    }

    #[test]
    fn velocity_spells_with_base_symbols_and_units() {
        let velocity = Dimension::LENGTH.divide(&Dimension::TIME).unwrap();
        assert_eq!(velocity.to_string(), "L T^-1");
        assert_eq!(velocity.si_unit_text(), "m s^-1");
        assert_eq!(velocity.quantity_name(), Some("velocity"));
    }

    #[test]
    fn units_without_a_usual_spelling_are_composed_as_engineers_write_them() {
        let check = |powers: [i32; 7], expected: &str| {
            assert_eq!(
                Dimension::from_integers(powers).composed_si_unit(),
                expected,
                "{powers:?}"
            );
        };
        check([-4, 1, 0, 0, 0, 0, 0], "kg/m^4");
        check([1, 1, -3, 0, -1, 0, 0], "kg*m/(s^3*K)");
        check([-1, 0, -1, 0, 0, 0, 0], "1/(m*s)");
        check([2, 0, 0, 0, 0, 0, 0], "m^2");
        check([0, 0, 0, 0, 0, 0, 0], "1");
        check([3, 0, -2, 0, 0, 0, 0], "m^3/s^2");
        let root = Dimension::LENGTH.power(Ratio::new(1, 2)).unwrap();
        assert_eq!(root.composed_si_unit(), "m^(1/2)");
        let inverse_root = Dimension::TIME.power(Ratio::new(-1, 2)).unwrap();
        assert_eq!(inverse_root.composed_si_unit(), "1/s^(1/2)");
        // The trade's spellings win where they exist.
        assert_eq!(
            Dimension::from_integers([-4, 1, 0, 0, 0, 0, 0]).preferred_si_unit(),
            "kg/m^4"
        );
        assert_eq!(
            Dimension::from_integers([1, 1, -3, 0, -1, 0, 0]).preferred_si_unit(),
            "W/(m*K)"
        );
    }

    #[test]
    fn listed_spellings_are_distinct_dimensions() {
        let mut seen = std::collections::HashSet::new();
        for (powers, _) in PREFERRED_SI_UNITS {
            assert!(seen.insert(*powers), "{powers:?} listed twice");
        }
    }

    #[test]
    fn exponent_overflow_is_an_error() {
        let big = Dimension::LENGTH.power(Ratio::from_integer(999)).unwrap();
        assert_eq!(big.power(Ratio::from_integer(999)), Err(ExponentOverflow));
    }

    #[test]
    fn dimension_names_parse() {
        assert_eq!(Dimension::from_name("Length"), Some(Dimension::LENGTH));
        assert_eq!(
            Dimension::from_name("dynamic_viscosity")
                .map(|d| d.to_string())
                .as_deref(),
            Some("L^-1 M T^-1")
        );
        assert_eq!(Dimension::from_name("nonsense"), None);
    }
}
