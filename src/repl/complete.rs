//! Completion and hints for the session's line editor.
//!
//! Where the cursor is decides what completes: a session command after a leading `:`; a unit
//! symbol inside `[ ]` or right after a number (`9.81 m/s`, `20degC`); otherwise a session
//! name, a built-in function or a constant. Hints show a function's signature while its
//! arguments are typed, and the rest of a name or command when only one fits.

use crate::library::Builtins;
use crate::units::unit::{catalog_entries, prefixes};
use rustyline::completion::{Completer, FilenameCompleter, Pair};
use rustyline::highlight::Highlighter;
use rustyline::hint::{Hint, Hinter};
use rustyline::validate::Validator;
use rustyline::Context;
use std::borrow::Cow;

/// The session's commands, for completion and hints.
pub const COMMANDS: &[&str] = &[
    ":about", ":clear", ":help", ":lines", ":load", ":quit", ":save", ":units",
];

/// What the editor asks of the session: names to complete, signatures to hint.
pub struct EditorHelper {
    /// Names the session defines, sorted.
    pub names: Vec<String>,
    functions: Vec<(&'static str, String)>,
    constants: Vec<&'static str>,
    /// Every catalog symbol, sorted.
    units: Vec<&'static str>,
    /// Symbols that take an SI prefix.
    prefixable: Vec<&'static str>,
    prefixes: Vec<&'static str>,
    files: FilenameCompleter,
    /// Whether hints may be drawn dim with ANSI codes.
    pub color: bool,
}

/// A hint: the text shown after the cursor, and what the right arrow inserts (nothing for a
/// signature).
pub struct EditorHint {
    display: String,
    completion: Option<String>,
}

impl Hint for EditorHint {
    fn display(&self) -> &str {
        &self.display
    }

    fn completion(&self) -> Option<&str> {
        self.completion.as_deref()
    }
}

impl EditorHelper {
    pub fn new(library: &Builtins) -> EditorHelper {
        let functions = library
            .functions_sorted()
            .into_iter()
            .map(|(name, builtin)| (name, builtin.signature()))
            .collect();
        let constants = library
            .constants_sorted()
            .into_iter()
            .map(|constant| constant.name)
            .collect();
        let mut units: Vec<&'static str> = catalog_entries()
            .iter()
            .flat_map(|entry| entry.definition.symbols.iter().copied())
            .collect();
        units.sort_unstable();
        units.dedup();
        let prefixable = catalog_entries()
            .iter()
            .filter(|entry| entry.definition.prefixable)
            .flat_map(|entry| entry.definition.symbols.iter().copied())
            .collect();
        EditorHelper {
            names: Vec::new(),
            functions,
            constants,
            units,
            prefixable,
            prefixes: prefixes().iter().map(|(symbol, _)| *symbol).collect(),
            files: FilenameCompleter::new(),
            color: false,
        }
    }

    /// Completion candidates for `line` with the cursor at byte `pos`: where the replaced word
    /// starts, and the candidates. File names for `:load` and `:save` are not included here.
    pub fn candidates(&self, line: &str, pos: usize) -> (usize, Vec<Pair>) {
        let before = line.get(..pos).unwrap_or(line);
        if let Some(command_text) = before.trim_start().strip_prefix(':') {
            return self.command_candidates(before, command_text);
        }
        let start = word_start(before);
        let word = &before[start..];
        if word.starts_with(|character: char| character.is_ascii_digit() || character == '.') {
            // A unit written right after its number: `20degC`.
            let unit_start = start + number_length(word);
            if unit_start == before.len() {
                return (pos, Vec::new());
            }
            return (unit_start, self.unit_candidates(&before[unit_start..]));
        }
        if in_unit_position(&before[..start]) {
            return (start, self.unit_candidates(word));
        }
        (start, self.name_candidates(word, Some(&before[..start])))
    }

    fn command_candidates(&self, before: &str, command_text: &str) -> (usize, Vec<Pair>) {
        let colon = before.len() - command_text.len() - 1;
        match command_text.split_once(char::is_whitespace) {
            None => {
                let typed = &before[colon..];
                let pairs = COMMANDS
                    .iter()
                    .filter(|command| command.starts_with(typed))
                    .map(|command| pair(command, format!("{command} ")))
                    .collect();
                (colon, pairs)
            }
            Some(("about", _)) => {
                let start = word_start(before);
                let word = &before[start..];
                let mut pairs = self.name_candidates(word, None);
                for pair in &mut pairs {
                    pair.replacement = pair.replacement.trim_end_matches('(').to_string();
                }
                pairs.extend(self.unit_candidates(word));
                pairs.sort_by(|left, right| left.display.cmp(&right.display));
                pairs.dedup_by(|left, right| left.display == right.display);
                (start, pairs)
            }
            Some(_) => (before.len(), Vec::new()),
        }
    }

    /// Names starting with `word`; with the text `before` it on a sheet line, also the
    /// keywords that fit there.
    fn name_candidates(&self, word: &str, before: Option<&str>) -> Vec<Pair> {
        let mut pairs: Vec<Pair> = Vec::new();
        if let Some(before) = before.filter(|_| !word.is_empty()) {
            if before.trim().is_empty() && "check".starts_with(word) {
                pairs.push(pair("check", "check ".to_string()));
            }
            if before.trim_start().starts_with("check") && "within".starts_with(word) {
                pairs.push(pair("within", "within ".to_string()));
            }
        }
        for name in &self.names {
            if name.starts_with(word) {
                pairs.push(pair(name, name.clone()));
            }
        }
        for (name, _) in &self.functions {
            if name.starts_with(word) {
                pairs.push(pair(name, format!("{name}(")));
            }
        }
        for name in &self.constants {
            if name.starts_with(word) && !self.names.iter().any(|own| own == name) {
                pairs.push(pair(name, name.to_string()));
            }
        }
        pairs
    }

    fn unit_candidates(&self, word: &str) -> Vec<Pair> {
        let mut symbols: Vec<String> = self
            .units
            .iter()
            .filter(|symbol| symbol.starts_with(word))
            .map(|symbol| symbol.to_string())
            .collect();
        for prefix in &self.prefixes {
            let Some(rest) = word.strip_prefix(prefix) else {
                continue;
            };
            for symbol in &self.prefixable {
                if symbol.starts_with(rest) {
                    symbols.push(format!("{prefix}{symbol}"));
                }
            }
        }
        symbols.sort_unstable();
        symbols.dedup();
        symbols
            .into_iter()
            .map(|symbol| Pair {
                display: symbol.clone(),
                replacement: symbol,
            })
            .collect()
    }

    /// The hint for `line` with the cursor at its end.
    pub fn hint_text(&self, line: &str) -> Option<EditorHint> {
        if let Some(typed) = line.trim_start().strip_prefix(':') {
            if typed.is_empty() || typed.contains(char::is_whitespace) {
                return None;
            }
            let typed = format!(":{typed}");
            let mut matching = COMMANDS
                .iter()
                .filter(|command| command.starts_with(&typed));
            return match (matching.next(), matching.next()) {
                (Some(command), None) if command.len() > typed.len() => {
                    let rest = command[typed.len()..].to_string();
                    Some(EditorHint {
                        display: rest.clone(),
                        completion: Some(rest),
                    })
                }
                _ => None,
            };
        }
        let start = word_start(line);
        let word = &line[start..];
        let name_position = !word.is_empty()
            && !word.starts_with(|character: char| character.is_ascii_digit())
            && !in_unit_position(&line[..start]);
        if name_position && word.chars().count() >= 2 {
            let mut matching = self
                .functions
                .iter()
                .filter(|(name, _)| name.starts_with(word));
            let others = self.names.iter().any(|name| name.starts_with(word))
                || self.constants.iter().any(|name| name.starts_with(word));
            if let (Some((name, signature)), None, false) =
                (matching.next(), matching.next(), others)
            {
                let rest = &name[word.len()..];
                let arguments = signature.strip_prefix(name).unwrap_or("");
                return Some(EditorHint {
                    display: format!("{rest}{arguments}"),
                    completion: Some(format!("{rest}(")),
                });
            }
        }
        let function = open_call(line)?;
        let (name, signature) = self.functions.iter().find(|(name, _)| *name == function)?;
        let _ = name;
        Some(EditorHint {
            display: format!("   {signature}"),
            completion: None,
        })
    }
}

fn pair(display: &str, replacement: String) -> Pair {
    Pair {
        display: display.to_string(),
        replacement,
    }
}

/// Characters of names and unit symbols.
fn is_word_character(character: char) -> bool {
    character.is_alphanumeric() || matches!(character, '_' | '%' | '°' | 'µ')
}

/// Where the word that ends at the end of `text` starts.
fn word_start(text: &str) -> usize {
    text.char_indices()
        .rev()
        .take_while(|(_, character)| is_word_character(*character))
        .last()
        .map_or(text.len(), |(index, _)| index)
}

/// The length of the number at the start of `word` (`20`, `1.5e-3` has no `-` here, `2.`).
fn number_length(word: &str) -> usize {
    let bytes = word.as_bytes();
    let mut length = 0;
    while length < bytes.len() && (bytes[length].is_ascii_digit() || bytes[length] == b'.') {
        length += 1;
    }
    if length < bytes.len() && matches!(bytes[length], b'e' | b'E') {
        let mut exponent = length + 1;
        if exponent < bytes.len() && matches!(bytes[exponent], b'+' | b'-') {
            exponent += 1;
        }
        if exponent < bytes.len() && bytes[exponent].is_ascii_digit() {
            while exponent < bytes.len() && bytes[exponent].is_ascii_digit() {
                exponent += 1;
            }
            length = exponent;
        }
    }
    length
}

/// Whether a word right after `before` is in unit position: inside `[ ]`, or part of a unit
/// written after a number (`2 m/`, `10 gal/(d*`).
pub fn in_unit_position(before: &str) -> bool {
    let opened = before.matches('[').count();
    let closed = before.matches(']').count();
    if opened > closed {
        return true;
    }
    let mut rest = before;
    loop {
        if let Some(inner) = rest.strip_suffix('(') {
            if inner.ends_with(['*', '/']) {
                rest = inner;
                continue;
            }
            return false;
        }
        if let Some(inner) = rest.strip_suffix(['*', '/']) {
            match strip_unit_factor(inner) {
                Some(outer) => {
                    rest = outer;
                    continue;
                }
                None => return false,
            }
        }
        break;
    }
    ends_with_number(rest.trim_end_matches([' ', '\t']))
}

/// `text` without the unit factor at its end (`m`, `ft^2`, `s^-1`, `(d*ft^2)`, the `1` of
/// `1/d`), or `None` if it does not end with one.
fn strip_unit_factor(text: &str) -> Option<&str> {
    let mut rest = text;
    // An exponent: `^2`, `^-1`, `^(1/2)`.
    if let Some(inner) = rest.strip_suffix(')') {
        let open = matching_open(inner)?;
        if let Some(base) = inner[..open].strip_suffix('^') {
            rest = base;
        } else {
            return Some(&inner[..open]);
        }
    } else if rest.ends_with(|character: char| character.is_ascii_digit()) {
        let digits = rest.trim_end_matches(|character: char| character.is_ascii_digit());
        let signed = digits.strip_suffix('-').unwrap_or(digits);
        match signed.strip_suffix('^') {
            Some(base) => rest = base,
            None if &rest[digits.len()..] == "1"
                && !digits.ends_with(|character: char| {
                    is_word_character(character) || character == '.'
                }) =>
            {
                return Some(digits)
            }
            None => {}
        }
    }
    if let Some(inner) = rest.strip_suffix(')') {
        let open = matching_open(inner)?;
        return Some(&inner[..open]);
    }
    let start = word_start(rest);
    let symbol = &rest[start..];
    if symbol
        .starts_with(|character: char| character.is_alphabetic() || matches!(character, '%' | '°'))
    {
        Some(&rest[..start])
    } else {
        None
    }
}

/// The index of the `(` that the `)` just after `text` closes.
fn matching_open(text: &str) -> Option<usize> {
    let mut depth = 1usize;
    for (index, character) in text.char_indices().rev() {
        match character {
            ')' => depth += 1,
            '(' => {
                depth -= 1;
                if depth == 0 {
                    return Some(index);
                }
            }
            _ => {}
        }
    }
    None
}

/// Whether `text` ends with a number literal (not the digits of a name such as `x2`).
fn ends_with_number(text: &str) -> bool {
    let start = text
        .char_indices()
        .rev()
        .take_while(|(_, character)| character.is_alphanumeric() || matches!(character, '_' | '.'))
        .last()
        .map_or(text.len(), |(index, _)| index);
    text[start..].starts_with(|character: char| character.is_ascii_digit() || character == '.')
}

/// The function whose argument list the end of `line` is in: `water_density(20 degC, ` gives
/// `water_density`.
fn open_call(line: &str) -> Option<&str> {
    let mut depth = 0usize;
    for (index, character) in line.char_indices().rev() {
        match character {
            ')' => depth += 1,
            '(' if depth > 0 => depth -= 1,
            '(' => {
                let before = &line[..index];
                let start = word_start(before);
                let name = &before[start..];
                if name.is_empty() {
                    // A plain parenthesis: look further out.
                    continue;
                }
                return Some(name);
            }
            _ => {}
        }
    }
    None
}

impl Completer for EditorHelper {
    type Candidate = Pair;

    fn complete(
        &self,
        line: &str,
        pos: usize,
        _context: &Context<'_>,
    ) -> rustyline::Result<(usize, Vec<Pair>)> {
        let before = line.get(..pos).unwrap_or(line).trim_start();
        if before.starts_with(":load ") || before.starts_with(":save ") {
            return self.files.complete_path(line, pos);
        }
        Ok(self.candidates(line, pos))
    }
}

impl Hinter for EditorHelper {
    type Hint = EditorHint;

    fn hint(&self, line: &str, pos: usize, _context: &Context<'_>) -> Option<EditorHint> {
        if pos < line.len() {
            return None;
        }
        self.hint_text(line)
    }
}

impl Highlighter for EditorHelper {
    fn highlight_hint<'h>(&self, hint: &'h str) -> Cow<'h, str> {
        if self.color {
            Cow::Owned(format!("\x1b[2m{hint}\x1b[0m"))
        } else {
            Cow::Borrowed(hint)
        }
    }
}

impl Validator for EditorHelper {}

impl rustyline::Helper for EditorHelper {}

#[cfg(test)]
mod tests {
    use super::*;

    fn helper() -> EditorHelper {
        let mut helper = EditorHelper::new(Builtins::standard());
        helper.names = vec!["k_core".to_string(), "K_site".to_string()];
        helper
    }

    fn completions(line: &str) -> Vec<String> {
        let (_, pairs) = helper().candidates(line, line.len());
        pairs.into_iter().map(|pair| pair.replacement).collect()
    }

    #[test]
    fn unit_positions() {
        for unit_position in [
            "2 ",
            "9.81 m/",
            "10 gal/(d*",
            "x = 3 kg/m^3*",
            "a [",
            "a [ft/",
            "1.2e-3 ",
        ] {
            assert!(in_unit_position(unit_position), "{unit_position:?}");
        }
        for name_position in ["", "x = ", "2*", "a * ", "sqrt(", "x2 ", "a [m] = "] {
            assert!(!in_unit_position(name_position), "{name_position:?}");
        }
    }

    #[test]
    fn completes_units_after_numbers_and_in_brackets() {
        assert!(completions("k = 420 m").contains(&"mD".to_string()));
        assert!(completions("k = 420 kP").contains(&"kPa".to_string()));
        assert!(completions("x = 20deg").contains(&"degC".to_string()));
        assert!(completions("K [ft/").contains(&"d".to_string()));
        assert!(!completions("K [ft/").contains(&"K_site".to_string()));
    }

    #[test]
    fn completes_names_functions_and_constants() {
        let found = completions("x = k");
        assert!(found.contains(&"k_core".to_string()));
        assert!(!found.contains(&"kPa".to_string()));
        assert!(completions("x = water_d").contains(&"water_density(".to_string()));
        assert!(completions("x = g").contains(&"g0".to_string()));
        assert_eq!(completions(":he"), vec![":help ".to_string()]);
        assert!(completions(":about water_v").contains(&"water_viscosity".to_string()));
    }

    #[test]
    fn hints_show_signatures() {
        let helper = helper();
        let hint = helper
            .hint_text("x = water_density(20 degC, ")
            .map(|hint| hint.display);
        assert_eq!(hint.as_deref(), Some("   water_density(T[, p])"));
        let hint = helper.hint_text("x = brine_visc").map(|hint| hint.display);
        assert_eq!(hint.as_deref(), Some("osity(T, S) or (T, p, S)"));
        assert!(helper.hint_text("x = 2 m").is_none());
    }
}
