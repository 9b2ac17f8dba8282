//! The language server driven over stdio as an editor drives it: `lsp-server` frames the
//! messages on this side too, `lsp-types` shapes them.

use lsp_server::{Message, Notification, Request, RequestId, Response};
use lsp_types::notification::{
    DidChangeTextDocument, DidOpenTextDocument, Exit, Initialized, Notification as _,
    PublishDiagnostics,
};
use lsp_types::request::{
    Completion, DocumentSymbolRequest, GotoDefinition, HoverRequest, Initialize, InlayHintRequest,
    Request as _, Shutdown,
};
use lsp_types::{
    CompletionResponse, DidChangeTextDocumentParams, DidOpenTextDocumentParams,
    DocumentSymbolResponse, GotoDefinitionResponse, Hover, HoverContents, InlayHint,
    InlayHintLabel, Position, PublishDiagnosticsParams, Range, SymbolKind,
    TextDocumentContentChangeEvent, TextDocumentIdentifier, TextDocumentItem,
    TextDocumentPositionParams, Uri, VersionedTextDocumentIdentifier,
};
use serde_json::{json, Value};
use std::io::{BufReader, Write};
use std::path::Path;
use std::process::{Child, ChildStdin, Command, Stdio};
use std::sync::mpsc::{channel, Receiver};
use std::time::Duration;

/// How long any one answer may take before the test fails (not a performance target: a
/// guard against a hung server).
const PATIENCE: Duration = Duration::from_secs(30);

struct Client {
    child: Child,
    input: ChildStdin,
    messages: Receiver<Message>,
    next_id: i32,
    /// Notifications that arrived while waiting for a response.
    notifications: Vec<Notification>,
}

impl Client {
    fn start() -> Client {
        let mut child = Command::new(env!("CARGO_BIN_EXE_fluxsheet"))
            .arg("lsp")
            .stdin(Stdio::piped())
            .stdout(Stdio::piped())
            .stderr(Stdio::null())
            .spawn()
            .unwrap();
        let input = child.stdin.take().unwrap();
        let mut output = BufReader::new(child.stdout.take().unwrap());
        let (sender, messages) = channel();
        std::thread::spawn(move || {
            while let Ok(Some(message)) = Message::read(&mut output) {
                if sender.send(message).is_err() {
                    break;
                }
            }
        });
        Client {
            child,
            input,
            messages,
            next_id: 0,
            notifications: Vec::new(),
        }
    }

    fn send(&mut self, message: Message) {
        message.write(&mut self.input).unwrap();
    }

    fn raw(&mut self, body: &str) {
        write!(self.input, "Content-Length: {}\r\n\r\n{body}", body.len()).unwrap();
        self.input.flush().unwrap();
    }

    fn request_raw(&mut self, method: &str, params: Value) -> Response {
        self.next_id += 1;
        let id = RequestId::from(self.next_id);
        self.send(Request::new(id.clone(), method.to_string(), params).into());
        self.response(&id)
    }

    fn response(&mut self, id: &RequestId) -> Response {
        loop {
            match self
                .messages
                .recv_timeout(PATIENCE)
                .expect("the server answers")
            {
                Message::Response(response) if response.id == *id => return response,
                Message::Notification(notification) => self.notifications.push(notification),
                _ => {}
            }
        }
    }

    fn request<R: lsp_types::request::Request>(&mut self, params: R::Params) -> R::Result {
        let response = self.request_raw(R::METHOD, serde_json::to_value(params).unwrap());
        let result = response.response_result.expect("a result, not an error");
        serde_json::from_value(result).unwrap()
    }

    fn notify<N: lsp_types::notification::Notification>(&mut self, params: N::Params) {
        self.send(Notification::new(N::METHOD.to_string(), params).into());
    }

    /// The next diagnostics published for `uri`.
    fn diagnostics_for(&mut self, uri: &Uri) -> PublishDiagnosticsParams {
        let matches = |notification: &Notification| {
            notification.method == PublishDiagnostics::METHOD
                && notification.params["uri"] == json!(uri.as_str())
        };
        if let Some(at) = self.notifications.iter().position(matches) {
            let found = self.notifications.remove(at);
            return serde_json::from_value(found.params).unwrap();
        }
        loop {
            if let Message::Notification(notification) =
                self.messages.recv_timeout(PATIENCE).expect("diagnostics")
            {
                if matches(&notification) {
                    return serde_json::from_value(notification.params).unwrap();
                }
                self.notifications.push(notification);
            }
        }
    }

    fn initialize(&mut self) {
        let result = self
            .request::<Initialize>(serde_json::from_value(json!({"capabilities": {}})).unwrap());
        assert!(result.capabilities.inlay_hint_provider.is_some());
        assert!(result.capabilities.hover_provider.is_some());
        self.notify::<Initialized>(lsp_types::InitializedParams {});
    }

    fn open(&mut self, uri: &Uri, text: &str) {
        self.notify::<DidOpenTextDocument>(DidOpenTextDocumentParams {
            text_document: TextDocumentItem::new(uri.clone(), "fluxsheet".into(), 1, text.into()),
        });
    }

    /// Sends `shutdown` and `exit`; the exit code.
    fn finish(mut self) -> Option<i32> {
        self.request::<Shutdown>(());
        self.notify::<Exit>(());
        drop(self.input);
        self.child.wait().unwrap().code()
    }
}

fn uri_of(path: &Path) -> Uri {
    format!("file://{}", path.display()).parse().unwrap()
}

fn at(uri: &Uri, line: u32, character: u32) -> TextDocumentPositionParams {
    TextDocumentPositionParams::new(
        TextDocumentIdentifier::new(uri.clone()),
        Position::new(line, character),
    )
}

fn hover_text(hover: Option<Hover>) -> String {
    match hover.expect("a hover").contents {
        HoverContents::Markup(markup) => markup.value,
        other => panic!("markdown expected, got {other:?}"),
    }
}

fn hint_labels(hints: Option<Vec<InlayHint>>) -> Vec<(u32, String)> {
    hints
        .unwrap_or_default()
        .into_iter()
        .map(|hint| match hint.label {
            InlayHintLabel::String(label) => (hint.position.line, label),
            InlayHintLabel::LabelParts(parts) => (
                hint.position.line,
                parts.into_iter().map(|part| part.value).collect(),
            ),
        })
        .collect()
}

fn all_lines(uri: &Uri) -> lsp_types::InlayHintParams {
    lsp_types::InlayHintParams {
        text_document: TextDocumentIdentifier::new(uri.clone()),
        range: Range::new(Position::new(0, 0), Position::new(100, 0)),
        work_done_progress_params: Default::default(),
    }
}

const SHARED: &str = "rho_w = 998.2 kg/m^3\nmu_w = 1.002 cP\n";

const SITE: &str = "## Lab core
include \"shared.fxs\"
k = 420 mD
K [m/s] = k * rho_w * g0 / mu_w
T [degC] = 0 degC to 40 degC step 5 K
q [m/d] = darcy_flux(K, 0.02)
";

#[test]
fn an_editor_session_gets_values_hovers_completions_definitions_and_diagnostics() {
    let folder = tempfile::tempdir().unwrap();
    let root = folder.path().canonicalize().unwrap();
    std::fs::write(root.join("shared.fxs"), SHARED).unwrap();
    std::fs::write(root.join("site.fxs"), SITE).unwrap();
    let site = uri_of(&root.join("site.fxs"));
    let mut client = Client::start();
    client.initialize();
    client.open(&site, SITE);
    let published = client.diagnostics_for(&site);
    assert_eq!(published.diagnostics, vec![], "a clean sheet");
    assert_eq!(published.version, Some(1));

    // Values at the ends of lines. K = 420 mD × 998.2 kg/m³ × 9.80665 m/s² / 1.002 mPa·s,
    // with 1 D = 9.869233e-13 m² (NIST SP 811): 4.0495e-6 m/s; q = 0.02 K = 8.099e-8 m/s,
    // 0.006998 m/d.
    let hints = hint_labels(client.request::<InlayHintRequest>(all_lines(&site)));
    assert_eq!(
        hints,
        vec![
            (2, "= 420 mD".to_string()),
            (3, "= 4.05e-6 m/s".to_string()),
            (4, "= 9 rows, first 0 degC … last 40 degC".to_string()),
            (5, "= 0.006998 m/d".to_string()),
        ]
    );

    // Hovers: a sheet name, a built-in, a unit.
    let on_k = hover_text(client.request::<HoverRequest>(lsp_types::HoverParams {
        text_document_position_params: at(&site, 3, 11),
        work_done_progress_params: Default::default(),
    }));
    assert!(on_k.contains("**k** = 420 mD"), "{on_k}");
    assert!(on_k.contains("dimension: an area (m^2)"), "{on_k}");
    assert!(on_k.contains("k = 420 mD\n"), "{on_k}");
    let on_darcy = hover_text(client.request::<HoverRequest>(lsp_types::HoverParams {
        text_document_position_params: at(&site, 5, 14),
        work_done_progress_params: Default::default(),
    }));
    assert!(on_darcy.contains("darcy_flux(K, i)"), "{on_darcy}");
    assert!(on_darcy.contains("source: "), "{on_darcy}");
    let on_unit = hover_text(client.request::<HoverRequest>(lsp_types::HoverParams {
        text_document_position_params: at(&site, 2, 9),
        work_done_progress_params: Default::default(),
    }));
    assert!(on_unit.contains("**mD**"), "{on_unit}");
    assert!(on_unit.contains("source: "), "{on_unit}");

    // Completion inside K's `[ ]` ranks velocities first; after `q = ` it offers names.
    let completion = client.request::<Completion>(lsp_types::CompletionParams {
        text_document_position: at(&site, 3, 3),
        work_done_progress_params: Default::default(),
        partial_result_params: Default::default(),
        context: None,
    });
    let Some(CompletionResponse::Array(mut units)) = completion else {
        panic!("a completion list");
    };
    units.sort_by(|a, b| a.sort_text.cmp(&b.sort_text));
    let velocities: Vec<&str> = units
        .iter()
        .take(2)
        .map(|item| item.label.as_str())
        .collect();
    assert_eq!(
        velocities,
        ["m/s", "m/d"],
        "the SI unit, then the sheet's own"
    );
    assert!(
        units.iter().any(|item| item.label == "Pa"),
        "all units are offered"
    );
    let completion = client.request::<Completion>(lsp_types::CompletionParams {
        text_document_position: at(&site, 5, 10),
        work_done_progress_params: Default::default(),
        partial_result_params: Default::default(),
        context: None,
    });
    let Some(CompletionResponse::Array(names)) = completion else {
        panic!("a completion list");
    };
    let darcy = names
        .iter()
        .find(|item| item.label == "darcy_flux")
        .expect("built-ins");
    assert_eq!(darcy.detail.as_deref(), Some("darcy_flux(K, i)"));
    assert!(
        names.iter().any(|item| item.label == "rho_w"),
        "included names"
    );

    // Go to definition across the include.
    let definition = client.request::<GotoDefinition>(lsp_types::GotoDefinitionParams {
        text_document_position_params: at(&site, 3, 15),
        work_done_progress_params: Default::default(),
        partial_result_params: Default::default(),
    });
    let Some(GotoDefinitionResponse::Scalar(location)) = definition else {
        panic!("one location");
    };
    assert_eq!(location.uri, uri_of(&root.join("shared.fxs")));
    assert_eq!(
        location.range,
        Range::new(Position::new(0, 0), Position::new(0, 5))
    );

    // The outline: the heading holds the named lines.
    let symbols = client.request::<DocumentSymbolRequest>(lsp_types::DocumentSymbolParams {
        text_document: TextDocumentIdentifier::new(site.clone()),
        work_done_progress_params: Default::default(),
        partial_result_params: Default::default(),
    });
    let Some(DocumentSymbolResponse::Nested(symbols)) = symbols else {
        panic!("nested symbols");
    };
    assert_eq!(symbols.len(), 1);
    assert_eq!(symbols[0].name, "Lab core");
    assert_eq!(symbols[0].kind, SymbolKind::NAMESPACE);
    let children: Vec<&str> = symbols[0]
        .children
        .iter()
        .flatten()
        .map(|child| child.name.as_str())
        .collect();
    assert_eq!(children, ["k", "K", "T", "q"]);

    // An edit: the value follows, and a unit error is underlined where `run` puts it.
    client.notify::<DidChangeTextDocument>(DidChangeTextDocumentParams {
        text_document: VersionedTextDocumentIdentifier::new(site.clone(), 2),
        content_changes: vec![TextDocumentContentChangeEvent {
            range: Some(Range::new(Position::new(2, 4), Position::new(2, 7))),
            range_length: None,
            text: "42".to_string(),
        }],
    });
    let published = client.diagnostics_for(&site);
    assert_eq!(published.version, Some(2));
    assert_eq!(published.diagnostics, vec![]);
    let hints = hint_labels(client.request::<InlayHintRequest>(all_lines(&site)));
    assert_eq!(hints[1], (3, "= 4.05e-7 m/s".to_string()));
    client.notify::<DidChangeTextDocument>(DidChangeTextDocumentParams {
        text_document: VersionedTextDocumentIdentifier::new(site.clone(), 3),
        content_changes: vec![TextDocumentContentChangeEvent {
            range: Some(Range::new(Position::new(2, 10), Position::new(2, 10))),
            range_length: None,
            text: " + 1 m".to_string(),
        }],
    });
    let published = client.diagnostics_for(&site);
    let (code, _, run_errors) = {
        let text = "## Lab core\ninclude \"shared.fxs\"\nk = 42 mD + 1 m\n";
        std::fs::write(root.join("edited.fxs"), text).unwrap();
        let output = Command::new(env!("CARGO_BIN_EXE_fluxsheet"))
            .args(["run", "edited.fxs"])
            .current_dir(&root)
            .env("NO_COLOR", "1")
            .output()
            .unwrap();
        (
            output.status.code(),
            (),
            String::from_utf8_lossy(&output.stderr).into_owned(),
        )
    };
    assert_eq!(code, Some(3));
    assert_eq!(
        published.diagnostics.len(),
        1,
        "{:?}",
        published.diagnostics
    );
    let error = &published.diagnostics[0];
    assert_eq!(error.severity, Some(lsp_types::DiagnosticSeverity::ERROR));
    assert_eq!(
        error.range,
        Range::new(Position::new(2, 4), Position::new(2, 15))
    );
    let first_line = error.message.lines().next().unwrap();
    assert!(
        run_errors.contains(first_line),
        "{first_line} not in {run_errors}"
    );

    // Protocol errors, never a crash: unknown method, bad parameters, a frame that is not JSON.
    let unknown = client.request_raw("fluxsheet/unknown", json!({}));
    assert_eq!(unknown.response_result.unwrap_err().code, -32601);
    let bad = client.request_raw(HoverRequest::METHOD, json!({"textDocument": 5}));
    assert_eq!(bad.response_result.unwrap_err().code, -32602);
    client.raw("{this is not json");
    client.raw(r#"{"jsonrpc":"2.0","id":99,"method":7}"#);
    let refused = client.response(&RequestId::from(99));
    assert_eq!(refused.response_result.unwrap_err().code, -32600);
    let still_there = client.request::<HoverRequest>(lsp_types::HoverParams {
        text_document_position_params: at(&site, 2, 0),
        work_done_progress_params: Default::default(),
    });
    assert!(still_there.is_some());

    assert_eq!(client.finish(), Some(0));
}

#[test]
fn errors_in_included_sheets_are_published_there_and_on_the_include_line() {
    let folder = tempfile::tempdir().unwrap();
    let root = folder.path().canonicalize().unwrap();
    std::fs::write(root.join("shared.fxs"), "rho_w = 998.2 kg/m^3 + 1 m\n").unwrap();
    let text = "include \"shared.fxs\"\nx = 1 m\n";
    std::fs::write(root.join("site.fxs"), text).unwrap();
    let site = uri_of(&root.join("site.fxs"));
    let shared = uri_of(&root.join("shared.fxs"));
    let mut client = Client::start();
    client.initialize();
    client.open(&site, text);
    let on_site = client.diagnostics_for(&site);
    let on_shared = client.diagnostics_for(&shared);
    assert_eq!(on_shared.diagnostics.len(), 1);
    assert_eq!(on_shared.diagnostics[0].range.start, Position::new(0, 8));
    assert_eq!(on_site.diagnostics.len(), 1);
    assert_eq!(on_site.diagnostics[0].range.start.line, 0);
    assert!(on_site.diagnostics[0]
        .message
        .ends_with(&on_shared.diagnostics[0].message));
    // Requests before `initialize` and after `shutdown` are refused, and `exit` without a
    // `shutdown` exits with 1.
    let mut early = Client::start();
    let refused = early.request_raw(HoverRequest::METHOD, json!({}));
    assert_eq!(refused.response_result.unwrap_err().code, -32002);
    early.notify::<Exit>(());
    assert_eq!(early.child.wait().unwrap().code(), Some(1));
    assert_eq!(client.finish(), Some(0));
}

/// A real editor: headless Neovim from the distribution's packages opens a sheet with a unit
/// error and reads the diagnostic back. Without Neovim the test is skipped on a workstation
/// and fails in CI (`.ci/run` installs it).
#[test]
fn neovim_shows_a_unit_error_from_the_server() {
    let Some(neovim) = neovim() else {
        assert!(
            std::env::var_os("CI").is_none(),
            "Neovim is required in CI (.ci/run installs it)"
        );
        eprintln!("skipped: no nvim on this machine");
        return;
    };
    let folder = tempfile::tempdir().unwrap();
    let root = folder.path().canonicalize().unwrap();
    let sheet = root.join("pad.fxs");
    std::fs::write(&sheet, "k = 420 mD\nh = 2 m + 3 s\n").unwrap();
    let out = root.join("diagnostics.txt");
    let script = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/neovim.lua");
    let mut child = Command::new(neovim)
        .args([
            "--headless",
            "--clean",
            "-n",
            "-u",
            "NONE",
            "-i",
            "NONE",
            "-c",
        ])
        .arg(format!("luafile {}", script.display()))
        .env("FLUXSHEET_SHEET", &sheet)
        .env("FLUXSHEET_BINARY", env!("CARGO_BIN_EXE_fluxsheet"))
        .env("FLUXSHEET_OUT", &out)
        .env("HOME", &root)
        .env("XDG_STATE_HOME", &root)
        .stdin(Stdio::null())
        .stdout(Stdio::null())
        .stderr(Stdio::null())
        .spawn()
        .unwrap();
    let started = std::time::Instant::now();
    while child.try_wait().unwrap().is_none() {
        if started.elapsed() > Duration::from_secs(120) {
            let _ = child.kill();
            panic!("neovim did not finish");
        }
        std::thread::sleep(Duration::from_millis(50));
    }
    let diagnostics = std::fs::read_to_string(&out).unwrap();
    let (code, _, run_errors) = {
        let output = Command::new(env!("CARGO_BIN_EXE_fluxsheet"))
            .args(["run", "pad.fxs"])
            .current_dir(&root)
            .env("NO_COLOR", "1")
            .output()
            .unwrap();
        (
            output.status.code(),
            (),
            String::from_utf8_lossy(&output.stderr).into_owned(),
        )
    };
    assert_eq!(code, Some(3));
    let lines: Vec<&str> = diagnostics.lines().collect();
    assert_eq!(lines.len(), 1, "{diagnostics}");
    // Line 2 (0-based 1), from column 4 (0-based): `2 m + 3 s`; severity 1 is an error.
    let (place, message) = lines[0].split_at("1:4:1:".len());
    assert_eq!(place, "1:4:1:");
    let first_line = message.split(" | ").next().unwrap();
    assert!(first_line.contains("cannot add"), "{message}");
    assert!(
        run_errors.contains(first_line),
        "{first_line} not in {run_errors}"
    );
}

fn neovim() -> Option<std::path::PathBuf> {
    let path = std::env::var_os("PATH")?;
    std::env::split_paths(&path)
        .map(|folder| folder.join("nvim"))
        .find(|candidate| candidate.exists())
}

/// The highlighting grammar colours every keyword the parser's grammar has.
#[test]
fn the_highlighting_grammar_knows_every_keyword_of_the_language() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    let pest = std::fs::read_to_string(root.join("grammar/worksheet.pest")).unwrap();
    let highlighting: Value = serde_json::from_str(
        &std::fs::read_to_string(root.join("editors/vscode/syntaxes/fluxsheet.tmLanguage.json"))
            .unwrap(),
    )
    .unwrap();
    let pattern = highlighting["repository"]["keyword"]["match"]
        .as_str()
        .unwrap();
    let highlighted: Vec<&str> = pattern
        .trim_start_matches("\\b(")
        .trim_end_matches(")\\b")
        .split('|')
        .collect();
    // Keyword rules read `name_keyword = @{ "word" ~ !name_character }`; `within` is the
    // tolerance's literal.
    let keywords: Vec<&str> = pest
        .lines()
        .filter(|line| line.contains("_keyword = @{ \""))
        .filter_map(|line| line.split('"').nth(1))
        .chain(["within"])
        .collect();
    assert!(keywords.len() >= 15, "{keywords:?}");
    for keyword in keywords {
        assert!(
            highlighted.contains(&keyword),
            "`{keyword}` is not highlighted"
        );
    }
}
