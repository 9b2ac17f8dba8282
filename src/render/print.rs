//! The HTML report on paper: the `@page` rules and print styles a browser applies when the
//! report is printed or saved as PDF, on A4 or Letter alike.
//!
//! Page margins leave room for the running header (the project at the left, the report's
//! sheet at the right) and footer (the tool's version at the left, "page N of M" at the
//! right), drawn by CSS page-margin boxes. Chromium prints those in place of its own header
//! and footer, so the pages come out the same whatever that setting is (headless:
//! `--no-pdf-header-footer` or not). No paper size is set: the print dialog's is used. Table
//! rows, working steps, charts and short tables never split across pages, headings stay with
//! what follows them, and a longer table's header row repeats on each page it spans.

/// The print rules of a report about `sheet` (its file name) in `project` (the title block's
/// project, or its title, when the sheet has one).
pub fn page_style(project: Option<&str>, sheet: &str, version: &str) -> String {
    let header_left = project.unwrap_or("");
    format!(
        "@page {{ margin: 18mm 15mm 17mm 15mm;
  @top-left {{ content: {}; {MARGIN_FONT} }}
  @top-right {{ content: {}; {MARGIN_FONT} }}
  @bottom-left {{ content: {}; {MARGIN_FONT} }}
  @bottom-right {{ content: \"page \" counter(page) \" of \" counter(pages); {MARGIN_FONT} }}
}}
{PRINT}",
        css_string(header_left),
        css_string(&format!("Calculation report: {sheet}")),
        css_string(&format!("fluxsheet {version}")),
    )
}

/// The running header's and footer's type: small and grey, under the body's.
const MARGIN_FONT: &str = "font: 8pt system-ui, sans-serif; color: #57606a;";

const PRINT: &str = "@media print {
  html { font-size: 9.5pt; }
  main { max-width: none; padding: 0; }
  h1 { margin-top: 0; }
  h2, h3 { break-after: avoid; }
  h2 { margin-top: 1.2rem; }
  thead { display: table-header-group; }
  tr, div.step, figure.chart, table.meta, table.whole, section.caution, li { break-inside: avoid; }
  p { orphans: 3; widows: 3; }
  table.lines th:nth-child(1) { width: 7%; } table.lines th:nth-child(2) { width: 14%; }
  table.lines th:nth-child(3) { width: 11%; } table.lines th:nth-child(4) { width: 10%; }
  table.lines th:nth-child(6) { width: 17%; }
  table.inputs code, code#sha256 { word-break: break-all; }
  figure.chart svg { display: block; width: 100%; max-height: 110mm; }
  tr.failed td, tr.error td, th, section.caution { print-color-adjust: exact; -webkit-print-color-adjust: exact; }
}
";

/// Tables of at most this many rows print whole, on the next page when they do not fit: a
/// short table split leaves a header and a row or two alone at the foot of a page.
pub const WHOLE_TABLE_ROWS: usize = 20;

/// ` whole` for a table short enough to keep on one page, for its class attribute.
pub fn whole_class(rows: usize) -> &'static str {
    if rows <= WHOLE_TABLE_ROWS {
        " whole"
    } else {
        ""
    }
}

/// A CSS string literal holding `text` exactly: every character that could end the string,
/// the rule or the style element (quotes, backslashes, `<`, line breaks) as a hex escape.
fn css_string(text: &str) -> String {
    let mut literal = String::with_capacity(text.len() + 2);
    literal.push('"');
    for character in text.chars() {
        if character.is_alphanumeric() && character.is_ascii()
            || " .,:;-_()/@&+#".contains(character)
        {
            literal.push(character);
        } else {
            // The space after a hex escape ends it and is not part of the text.
            literal.push_str(&format!("\\{:x} ", character as u32));
        }
    }
    literal.push('"');
    literal
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn text_in_a_css_string_cannot_end_it() {
        assert_eq!(css_string("Site 4 (east)"), "\"Site 4 (east)\"");
        assert_eq!(
            css_string("a\"b\\c</style>\nd"),
            "\"a\\22 b\\5c c\\3c /style\\3e \\a d\""
        );
        assert_eq!(css_string("Südfeld"), "\"S\\fc dfeld\"");
    }

    #[test]
    fn the_page_style_names_project_sheet_and_version() {
        let style = page_style(Some("Harbour \"North\""), "quay.fxs", "0.1.0");
        assert!(
            style.contains("@top-left { content: \"Harbour \\22 North\\22 \";"),
            "{style}"
        );
        assert!(
            style.contains("\"Calculation report: quay.fxs\""),
            "{style}"
        );
        assert!(
            style.contains("counter(page) \" of \" counter(pages)"),
            "{style}"
        );
        assert!(!page_style(None, "a.fxs", "1").contains("Harbour"));
    }
}
