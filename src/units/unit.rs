//! A resolved unit: dimension, exact factor, and, for a lone absolute temperature scale, its
//! offset. Units are built from catalog symbols with `lookup` and combined with `multiply`,
//! `divide` and `power`; any combination drops the offset, so inside a compound unit a degree
//! is a temperature difference (`W/(m*degC)`), as the trade writes it.

use super::catalog::{TemperatureRole, UnitDefinition, AMBIGUOUS, PREFIXES, UNITS};
use super::dimension::{Dimension, Exponent, ExponentOverflow};
use super::factor::Factor;
use rustc_hash::FxBuildHasher;
use std::collections::HashMap;
use std::sync::OnceLock;

/// A unit ready for conversion.
#[derive(Debug, Clone, PartialEq)]
pub struct Unit {
    pub dimension: Dimension,
    pub factor: Factor,
    /// Only for a lone absolute temperature scale: value_SI = (x + offset) × factor.
    pub offset: Option<Factor>,
    /// Set for lone temperature units to tell absolute scales from differences.
    pub temperature: TemperatureRole,
}

/// Why a unit could not be built.
#[derive(Debug, Clone, PartialEq)]
pub enum UnitError {
    Unknown {
        symbol: String,
        suggestions: Vec<String>,
    },
    /// A prefixed reading (`PA`: peta-ampere) that exists only because of letter case, where a
    /// catalog unit has the same letters (`Pa`): refused rather than guessed.
    CaseOnly {
        symbol: String,
        /// The reading it would get, e.g. "the prefix `P` (1e15) on `A` (ampere)".
        reading: String,
        /// The catalog unit with the same letters, e.g. `Pa` (pascal).
        suggestion: String,
        suggestion_name: String,
    },
    /// A spelling the trade uses for more than one unit (`a`, `ton`): the choices, each a
    /// symbol and what it means.
    Ambiguous {
        symbol: String,
        choices: Vec<(String, String)>,
    },
    ExponentOverflow,
}

impl From<ExponentOverflow> for UnitError {
    fn from(_: ExponentOverflow) -> Self {
        UnitError::ExponentOverflow
    }
}

/// A catalog row with its factor read on first use: a run reads the factors of the units it
/// writes, not of the whole table.
#[derive(Debug)]
pub struct CatalogEntry {
    pub definition: &'static UnitDefinition,
    unit: OnceLock<Unit>,
}

impl CatalogEntry {
    /// The row as a unit, its exact factor read from the definition the first time.
    pub fn unit(&self) -> &Unit {
        self.unit.get_or_init(|| {
            let definition = self.definition;
            // The table is ours; a factor it cannot read is a bug caught by the catalog test.
            let factor =
                Factor::from_definition(definition.factor).unwrap_or(Factor::from_f64(f64::NAN));
            let offset = definition
                .offset
                .map(|text| Factor::from_definition(text).unwrap_or(Factor::from_f64(0.0)));
            Unit {
                dimension: Dimension::from_integers(definition.dimension),
                factor,
                offset: offset.filter(|_| definition.offset != Some("0")),
                temperature: definition.temperature,
            }
        })
    }
}

struct Catalog {
    by_symbol: HashMap<&'static str, usize, FxBuildHasher>,
    entries: Vec<CatalogEntry>,
    prefixes: Vec<(&'static str, Factor)>,
}

/// The catalog's index of symbols, built from the `UNITS` table on first use (the factors wait
/// for their own first use).
fn catalog() -> &'static Catalog {
    static CATALOG: OnceLock<Catalog> = OnceLock::new();
    CATALOG.get_or_init(|| {
        let mut entries = Vec::with_capacity(UNITS.len());
        let mut by_symbol = HashMap::with_capacity_and_hasher(UNITS.len() * 2, FxBuildHasher);
        for definition in UNITS {
            for symbol in definition.symbols {
                by_symbol.insert(*symbol, entries.len());
            }
            entries.push(CatalogEntry {
                definition,
                unit: OnceLock::new(),
            });
        }
        let prefixes = PREFIXES
            .iter()
            .flat_map(|prefix| {
                let factor = Factor::from_definition(prefix.factor).unwrap_or(Factor::ONE);
                prefix.symbols.iter().map(move |symbol| (*symbol, factor))
            })
            .collect();
        Catalog {
            by_symbol,
            entries,
            prefixes,
        }
    })
}

/// Catalog symbols by their lower-case letters, for case-aware suggestions and refusals (built
/// on first need: only a unit written in an unusual case asks).
fn by_folded() -> &'static HashMap<String, Vec<&'static str>> {
    static BY_FOLDED: OnceLock<HashMap<String, Vec<&'static str>>> = OnceLock::new();
    BY_FOLDED.get_or_init(|| {
        let mut by_folded: HashMap<String, Vec<&'static str>> = HashMap::new();
        for definition in UNITS {
            for symbol in definition.symbols {
                by_folded
                    .entry(symbol.to_lowercase())
                    .or_default()
                    .push(symbol);
            }
        }
        by_folded
    })
}

/// All catalog rows, in table order.
pub fn catalog_entries() -> &'static [CatalogEntry] {
    &catalog().entries
}

/// The SI prefixes with their factors.
pub fn prefixes() -> &'static [(&'static str, Factor)] {
    &catalog().prefixes
}

impl Unit {
    pub fn dimensionless() -> Unit {
        Unit {
            dimension: Dimension::dimensionless(),
            factor: Factor::ONE,
            offset: None,
            temperature: TemperatureRole::None,
        }
    }

    /// A symbol from the catalog, optionally behind an SI prefix (`kPa`, `µS`, `mD`).
    pub fn lookup(symbol: &str) -> Result<Unit, UnitError> {
        if let Some((_, choices)) = AMBIGUOUS.iter().find(|(spelling, _)| *spelling == symbol) {
            return Err(UnitError::Ambiguous {
                symbol: symbol.to_string(),
                choices: choices
                    .iter()
                    .map(|(choice, meaning)| (choice.to_string(), meaning.to_string()))
                    .collect(),
            });
        }
        let catalog = catalog();
        if let Some(index) = catalog.by_symbol.get(symbol) {
            return Ok(catalog.entries[*index].unit().clone());
        }
        for (prefix, prefix_factor) in &catalog.prefixes {
            let Some(rest) = symbol.strip_prefix(prefix) else {
                continue;
            };
            let Some(index) = catalog.by_symbol.get(rest) else {
                continue;
            };
            let entry = &catalog.entries[*index];
            if entry.definition.prefixable {
                if let Some(same_letters) = catalog.unprefixed_with_same_letters(symbol) {
                    return Err(UnitError::CaseOnly {
                        symbol: symbol.to_string(),
                        reading: format!(
                            "the prefix `{prefix}` ({:e}) on `{rest}` ({})",
                            prefix_factor.value(),
                            entry.definition.name
                        ),
                        suggestion: same_letters.to_string(),
                        suggestion_name: catalog.entries[catalog.by_symbol[same_letters]]
                            .definition
                            .name
                            .to_string(),
                    });
                }
                let unit = entry.unit();
                return Ok(Unit {
                    dimension: unit.dimension,
                    factor: prefix_factor.multiply(&unit.factor),
                    offset: None,
                    temperature: unit.temperature,
                });
            }
        }
        if let Some(power) = trailing_power_of_length(symbol) {
            return Ok(power);
        }
        Err(UnitError::Unknown {
            symbol: symbol.to_string(),
            suggestions: suggest_symbols(symbol),
        })
    }

    pub fn multiply(&self, other: &Unit) -> Result<Unit, UnitError> {
        Ok(Unit::compound(
            self.dimension.multiply(&other.dimension)?,
            self.factor.multiply(&other.factor),
        ))
    }

    pub fn divide(&self, other: &Unit) -> Result<Unit, UnitError> {
        Ok(Unit::compound(
            self.dimension.divide(&other.dimension)?,
            self.factor.divide(&other.factor),
        ))
    }

    pub fn power(&self, exponent: Exponent) -> Result<Unit, UnitError> {
        Ok(Unit::compound(
            self.dimension.power(exponent)?,
            self.factor.power(*exponent.numer(), *exponent.denom()),
        ))
    }

    /// A product, quotient or power: no offset, and a degree in it means a difference.
    fn compound(dimension: Dimension, factor: Factor) -> Unit {
        Unit {
            dimension,
            factor,
            offset: None,
            temperature: TemperatureRole::None,
        }
    }

    pub fn is_absolute_temperature(&self) -> bool {
        self.temperature == TemperatureRole::Absolute
    }

    /// Converts a value in this unit to SI. The literal text, when given, is used for an exact
    /// decimal product.
    pub fn to_si(&self, value: f64, literal: Option<&str>) -> f64 {
        match &self.offset {
            Some(offset) => (value + offset.value()) * self.factor.value(),
            None => literal
                .and_then(|text| self.factor.apply_exact(text))
                .unwrap_or(value * self.factor.value()),
        }
    }

    /// Converts an SI value to this unit.
    pub fn from_si(&self, si_value: f64) -> f64 {
        let scaled = si_value / self.factor.value();
        match &self.offset {
            Some(offset) => scaled - offset.value(),
            None => scaled,
        }
    }
}

/// `m3`, `ft2`, `cm3`: a length symbol with a trailing 2 or 3 is that power, as the trade
/// writes areas and volumes (`m3/d`).
fn trailing_power_of_length(symbol: &str) -> Option<Unit> {
    let (stem, power) = match symbol.strip_suffix('2') {
        Some(stem) => (stem, 2),
        None => (symbol.strip_suffix('3')?, 3),
    };
    let base = Unit::lookup(stem).ok()?;
    if base.dimension != Dimension::from_integers([1, 0, 0, 0, 0, 0, 0]) {
        return None;
    }
    base.power(Exponent::new(power, 1)).ok()
}

impl Catalog {
    /// A catalog symbol spelled with the same letters as `symbol` in another case (`Pa` for
    /// `PA`), if there is one.
    fn unprefixed_with_same_letters(&self, symbol: &str) -> Option<&'static str> {
        by_folded()
            .get(&symbol.to_lowercase())?
            .iter()
            .find(|candidate| **candidate != symbol)
            .copied()
    }

    /// Units, prefixed or not, with the same letters as `symbol` in another case (`mD` for
    /// `md`, `kPa` for `KPA`), those keeping more of the user's own letter cases first.
    fn same_letters(&self, symbol: &str) -> Vec<String> {
        let folded = symbol.to_lowercase();
        let mut found: Vec<String> = by_folded()
            .get(&folded)
            .into_iter()
            .flatten()
            .map(|candidate| candidate.to_string())
            .collect();
        for (prefix, _) in &self.prefixes {
            let Some(rest) = folded.strip_prefix(&prefix.to_lowercase()) else {
                continue;
            };
            for base in by_folded().get(rest).into_iter().flatten() {
                if self.entries[self.by_symbol[base]].definition.prefixable {
                    found.push(format!("{prefix}{base}"));
                }
            }
        }
        let kept_cases = |candidate: &String| {
            candidate
                .chars()
                .zip(symbol.chars())
                .filter(|(a, b)| a == b)
                .count()
        };
        found.retain(|candidate| candidate != symbol);
        found.sort_by_key(|candidate| std::cmp::Reverse(kept_cases(candidate)));
        found.dedup();
        found
    }
}

/// Up to three catalog spellings closest to an unknown symbol: the same letters in another
/// case first (`md` -> `mD`), then the closest spellings.
pub fn suggest_symbols(symbol: &str) -> Vec<String> {
    let catalog = catalog();
    let mut suggestions = catalog.same_letters(symbol);
    let mut scored: Vec<(f64, &str)> = catalog
        .by_symbol
        .keys()
        .map(|candidate| (strsim::jaro_winkler(symbol, candidate), *candidate))
        .filter(|(score, _)| *score > 0.7)
        .collect();
    scored.sort_by(|left, right| right.0.total_cmp(&left.0).then(left.1.cmp(right.1)));
    for (_, candidate) in scored {
        if !suggestions.iter().any(|known| known == candidate) {
            suggestions.push(candidate.to_string());
        }
    }
    suggestions.truncate(3);
    suggestions
}

#[cfg(test)]
mod tests {
    use super::*;

    fn si(symbol: &str) -> f64 {
        Unit::lookup(symbol).expect(symbol).factor.value()
    }

    #[test]
    fn every_catalog_factor_reads() {
        for entry in catalog_entries() {
            assert!(
                entry.unit().factor.value().is_finite(),
                "{:?}",
                entry.definition.symbols
            );
            assert!(Factor::from_definition(entry.definition.factor).is_ok());
        }
    }

    #[test]
    fn prefixes_apply_only_to_metric_units() {
        assert_eq!(si("kPa"), 1000.0);
        // 1/1.01325 = 0.986923266716012830002467… (long division); the exact decimal rounds once.
        assert_eq!(si("mD"), "9.8692326671601283e-16".parse::<f64>().unwrap());
        assert_eq!(si("µS"), 1e-6);
        assert_eq!(si("uS"), 1e-6);
        assert_eq!(si("kg"), 1.0);
        assert_eq!(si("cP"), 0.001);
        assert!(Unit::lookup("kft").is_err());
    }

    /// Every prefixed spelling refused because a catalog unit has the same letters: pinned,
    /// so that a new unit or prefix that adds one is noticed (and listed in the README).
    #[test]
    fn prefixed_readings_that_differ_only_by_case_are_refused() {
        let catalog = catalog();
        let mut refused = Vec::new();
        for (prefix, _) in &catalog.prefixes {
            for symbol in catalog.by_symbol.keys() {
                let joined = format!("{prefix}{symbol}");
                if let Err(UnitError::CaseOnly { .. }) = Unit::lookup(&joined) {
                    refused.push(joined);
                }
            }
        }
        refused.sort();
        assert_eq!(refused, ["EV", "PA", "YD", "aC", "hA", "hP", "pA", "yD"]);
    }

    #[test]
    fn suggestions_put_the_same_letters_first() {
        assert_eq!(suggest_symbols("md")[0], "mD");
        assert_eq!(suggest_symbols("cp")[0], "cP");
        assert_eq!(suggest_symbols("kpa")[0], "kPa");
        assert_eq!(suggest_symbols("KPa")[0], "kPa");
        assert_eq!(suggest_symbols("MPA")[0], "MPa");
    }

    #[test]
    fn unknown_unit_suggests_close_symbols() {
        match Unit::lookup("psia") {
            Err(UnitError::Unknown { suggestions, .. }) => {
                assert!(suggestions.contains(&"psi".to_string()))
            }
            other => panic!("{other:?}"),
        }
    }

    #[test]
    fn degree_celsius_alone_is_affine() {
        let celsius = Unit::lookup("degC").unwrap();
        assert_eq!(celsius.to_si(20.0, None), 293.15);
        assert!((celsius.from_si(300.0) - 26.85).abs() < 1e-12);
        let per_degree = Unit::lookup("W").unwrap().divide(&celsius).unwrap();
        assert_eq!(per_degree.offset, None);
        assert_eq!(per_degree.factor.value(), 1.0);
    }
}
