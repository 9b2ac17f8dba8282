//! `fluxsheet functions [NAME]`: the built-ins listed by name, signature and summary, or one
//! of them in full (summary, each parameter with its unit, domain and default, the validity
//! ranges, the sources), or one formulation by its id (the ids the "Formulations used" footer
//! of `run` names).

use super::write_listing;
use crate::eval::{Formulation, Function, Library};
use crate::library::Builtins;
use crate::render::text_table::wrap;
use crate::render::{self, Format, RenderOptions};
use crate::units::Unit;
use std::io::{self, Write};

/// Lists the built-ins whose name contains `filter`; a name or formulation id given exactly
/// (in the table format) shows that entry in full.
pub fn write_functions(
    out: &mut dyn Write,
    filter: Option<&str>,
    options: RenderOptions,
) -> io::Result<()> {
    let library = Builtins::standard();
    if let (Some(name), Format::Table) = (filter, options.format) {
        let width = options.width.unwrap_or(usize::MAX);
        if let Some(function) = library.function(name) {
            return write_function(out, function, width);
        }
        if let Some(formulation) = formulation_by_id(library, name) {
            return write_formulation(out, library, formulation, width);
        }
    }
    let keep = |name: &str| filter.is_none_or(|text| name.contains(text));
    let mut rows: Vec<Vec<String>> = Vec::new();
    for (name, builtin) in library.functions_sorted() {
        if keep(name) {
            let sources: Vec<String> = builtin
                .formulations()
                .iter()
                .map(|formulation| {
                    format!("{} [valid: {}]", formulation.citation, formulation.validity)
                })
                .collect();
            rows.push(vec![
                builtin.signature(),
                "function".to_string(),
                builtin.summary().to_string(),
                sources.join("; "),
            ]);
        }
    }
    for constant in library.constants_sorted() {
        if keep(constant.name) {
            let value = render::format_significant(constant.quantity.value, 12);
            rows.push(vec![
                constant.name.to_string(),
                format!("constant = {value} {}", constant.unit),
                constant.summary.to_string(),
                constant.source.to_string(),
            ]);
        }
    }
    if let (Some(text), true) = (filter, rows.is_empty()) {
        let names = library.names();
        let hint = match crate::suggest::closest(text, names.iter().copied(), 0.8) {
            Some(name) => format!(": did you mean `{name}`?"),
            None => String::new(),
        };
        crate::stderr_line!("no built-in function or constant matches `{text}`{hint}");
    }
    if options.format != Format::Table {
        return write_listing(out, &["name", "kind", "summary", "source"], &rows, options);
    }
    // The terminal shows what a user scans for: how to call it and what it gives.
    let short: Vec<Vec<String>> = rows
        .into_iter()
        .map(|row| match row[1].strip_prefix("constant = ") {
            Some(value) => vec![format!("{} = {value}", row[0]), row[2].clone()],
            None => vec![row[0].clone(), row[2].clone()],
        })
        .collect();
    write_listing(out, &["name", "summary"], &short, options)?;
    writeln!(out)?;
    let hint = "`fluxsheet functions NAME` shows one in full: parameters, units, ranges, sources.";
    for line in wrap(hint, options.width.unwrap_or(usize::MAX)) {
        writeln!(out, "{line}")?;
    }
    Ok(())
}

/// The formulation whose id is `id`, from any built-in that cites it.
fn formulation_by_id(library: &Builtins, id: &str) -> Option<&'static Formulation> {
    library
        .functions_sorted()
        .into_iter()
        .flat_map(|(_, function)| function.formulations())
        .find(|formulation| formulation.id == id)
}

/// `text` after a label, wrapped to `width` with its continuation lines indented under it.
fn write_labelled(out: &mut dyn Write, label: &str, text: &str, width: usize) -> io::Result<()> {
    let indent = label.chars().count();
    let lines = wrap(text, width.saturating_sub(indent).max(20));
    for (index, line) in lines.iter().enumerate() {
        if index == 0 {
            writeln!(out, "{label}{line}")?;
        } else {
            writeln!(out, "{:indent$}{line}", "")?;
        }
    }
    Ok(())
}

fn write_function(out: &mut dyn Write, function: &dyn Function, width: usize) -> io::Result<()> {
    write_labelled(out, "", &function.signature(), width)?;
    write_labelled(out, "  ", function.summary(), width)?;
    let details = function.details();
    if !details.is_empty() {
        writeln!(out)?;
        for line in details {
            // `details` indents a form's parameters by two spaces under the form.
            let (label, text) = match line.strip_prefix("  ") {
                Some(parameter) => ("    ", parameter.to_string()),
                None => ("  ", line),
            };
            write_labelled(out, label, &text, width)?;
        }
    }
    for formulation in function.formulations() {
        writeln!(out)?;
        write_formulation_text(out, formulation, width)?;
    }
    Ok(())
}

fn write_formulation(
    out: &mut dyn Write,
    library: &Builtins,
    formulation: &'static Formulation,
    width: usize,
) -> io::Result<()> {
    write_formulation_text(out, formulation, width)?;
    let users: Vec<&str> = library
        .functions_sorted()
        .into_iter()
        .filter(|(_, function)| {
            function
                .formulations()
                .iter()
                .any(|used| used.id == formulation.id)
        })
        .map(|(name, _)| name)
        .collect();
    write_labelled(out, "  used by: ", &users.join(", "), width)
}

/// A formulation: id and title, then its source, validity and plain ranges.
fn write_formulation_text(
    out: &mut dyn Write,
    formulation: &Formulation,
    width: usize,
) -> io::Result<()> {
    write_labelled(
        out,
        "",
        &format!("formulation {}: {}", formulation.id, formulation.title),
        width,
    )?;
    write_labelled(out, "  source: ", formulation.citation, width)?;
    write_labelled(out, "  valid:  ", formulation.validity, width)?;
    for range in formulation.ranges {
        let in_unit = |si: f64| Unit::lookup(range.unit).map_or(si, |unit| unit.from_si(si));
        let text = format!(
            "{} from {} to {} {} (refused outside)",
            range.parameter,
            crate::numeric::message_number(in_unit(range.low)),
            crate::numeric::message_number(in_unit(range.high)),
            range.unit
        );
        write_labelled(out, "  range:  ", &text, width)?;
    }
    Ok(())
}
