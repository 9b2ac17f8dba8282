//! Diagnostics: the one shape every error and warning takes on its way to the user. Layers
//! produce their own error types; this is what `render` draws and JSON reports.

use crate::syntax::{Span, SyntaxError};

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Severity {
    Error,
    Warning,
}

impl Severity {
    pub fn word(self) -> &'static str {
        match self {
            Severity::Error => "error",
            Severity::Warning => "warning",
        }
    }
}

/// A message about a span of the source, with optional secondary labels and a help line.
#[derive(Debug, Clone, PartialEq)]
pub struct Diagnostic {
    pub severity: Severity,
    pub message: String,
    pub span: Span,
    /// Other places worth showing (the first definition of a duplicate name, say).
    pub labels: Vec<(Span, String)>,
    pub help: Option<String>,
    /// A short stable name for the kind of warning (`unused-line`), for filtering and JSON.
    pub code: Option<&'static str>,
}

impl Diagnostic {
    pub fn error(message: impl Into<String>, span: Span) -> Diagnostic {
        Diagnostic {
            severity: Severity::Error,
            message: message.into(),
            span,
            labels: Vec::new(),
            help: None,
            code: None,
        }
    }

    pub fn warning(message: impl Into<String>, span: Span) -> Diagnostic {
        Diagnostic {
            severity: Severity::Warning,
            message: message.into(),
            span,
            labels: Vec::new(),
            help: None,
            code: None,
        }
    }

    pub fn with_label(mut self, span: Span, message: impl Into<String>) -> Diagnostic {
        self.labels.push((span, message.into()));
        self
    }

    pub fn with_code(mut self, code: &'static str) -> Diagnostic {
        self.code = Some(code);
        self
    }

    pub fn with_help(mut self, help: Option<String>) -> Diagnostic {
        self.help = help;
        self
    }
}

impl From<&SyntaxError> for Diagnostic {
    fn from(error: &SyntaxError) -> Diagnostic {
        Diagnostic::error(error.to_string(), error.span).with_help(error.hint().map(str::to_string))
    }
}
