//! The message loop: the initialize handshake, requests answered from the open documents,
//! notifications that open, change, save and close them, and a protocol error (never a crash)
//! for a message out of turn, a method the server does not know or parameters it cannot read.

use super::completion::completions;
use super::diagnostics::diagnostics;
use super::document::Document;
use super::hover::hover;
use super::inlay::inlay_hints;
use super::navigation::{definition, symbols};
use super::transport::{Incoming, MessageReader};
use lsp_server::{ErrorCode, Message, Notification, Request, RequestId, Response};
use lsp_types::notification::{
    DidChangeTextDocument, DidCloseTextDocument, DidOpenTextDocument, DidSaveTextDocument, Exit,
    LogMessage, Notification as _, PublishDiagnostics,
};
use lsp_types::request::{
    Completion, DocumentSymbolRequest, GotoDefinition, HoverRequest, Initialize, InlayHintRequest,
    Request as _, Shutdown,
};
use lsp_types::{
    CompletionOptions, CompletionResponse, DocumentSymbolResponse, GotoDefinitionResponse,
    InitializeResult, LogMessageParams, MessageType, OneOf, PublishDiagnosticsParams,
    ServerCapabilities, ServerInfo, TextDocumentPositionParams, TextDocumentSyncCapability,
    TextDocumentSyncKind, Uri,
};
use serde::de::DeserializeOwned;
use serde::Serialize;
use std::collections::HashMap;
use std::io::{self, Write};

/// Serves the protocol over standard input and output until the client says `exit`; the exit
/// code is 0 after a `shutdown` request, 1 otherwise (as the protocol asks).
pub fn run() -> u8 {
    let mut reader = MessageReader::new(io::stdin().lock());
    let mut output = io::stdout().lock();
    let mut server = Server::default();
    loop {
        let replies = match reader.next() {
            Incoming::End => return 1,
            Incoming::Message(message) => server.handle(message),
            Incoming::Malformed { response, problem } => match response {
                Some(response) => vec![response.into()],
                // A message with no readable id cannot be answered; the client's log is told.
                None => vec![log(
                    MessageType::ERROR,
                    format!("ignored a message: {problem}"),
                )],
            },
        };
        for reply in replies {
            if reply
                .write(&mut output)
                .and_then(|()| output.flush())
                .is_err()
            {
                return 1;
            }
        }
        if let Some(code) = server.exit_code {
            return code;
        }
    }
}

/// What the server offers: incremental text sync, hovers, completion, definitions, the
/// outline and inlay hints.
pub fn capabilities() -> ServerCapabilities {
    ServerCapabilities {
        text_document_sync: Some(TextDocumentSyncCapability::Kind(
            TextDocumentSyncKind::INCREMENTAL,
        )),
        hover_provider: Some(lsp_types::HoverProviderCapability::Simple(true)),
        completion_provider: Some(CompletionOptions {
            trigger_characters: Some(vec!["[".to_string(), "/".to_string(), "*".to_string()]),
            ..CompletionOptions::default()
        }),
        definition_provider: Some(OneOf::Left(true)),
        document_symbol_provider: Some(OneOf::Left(true)),
        inlay_hint_provider: Some(OneOf::Left(true)),
        ..ServerCapabilities::default()
    }
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
enum Phase {
    #[default]
    WaitingForInitialize,
    Running,
    ShutDown,
}

/// The server's state: the open documents and what was published for them.
#[derive(Default)]
pub struct Server {
    phase: Phase,
    documents: HashMap<String, Document>,
    /// For each open document, the other files (included sheets) it published diagnostics for,
    /// so they are cleared when the problem goes.
    published: HashMap<String, Vec<Uri>>,
    /// Set by `exit`.
    pub exit_code: Option<u8>,
}

impl Server {
    /// Handles one message; returns the messages to send back.
    pub fn handle(&mut self, message: Message) -> Vec<Message> {
        let request_id = match &message {
            Message::Request(request) => Some(request.id.clone()),
            _ => None,
        };
        // Handlers return errors as values; this net turns a bug of ours into an error reply
        // instead of ending the editor's session.
        let outcome = std::panic::catch_unwind(std::panic::AssertUnwindSafe(|| match message {
            Message::Request(request) => self.request(request),
            Message::Notification(notification) => self.notification(notification),
            Message::Response(_) => Vec::new(),
        }));
        match (outcome, request_id) {
            (Ok(replies), _) => replies,
            (Err(_), Some(id)) => vec![error(id, ErrorCode::InternalError, "internal error")],
            (Err(_), None) => vec![log(MessageType::ERROR, "internal error".to_string())],
        }
    }

    fn request(&mut self, request: Request) -> Vec<Message> {
        let id = request.id.clone();
        let method = request.method.as_str();
        match (self.phase, method) {
            (Phase::WaitingForInitialize, Initialize::METHOD) => {
                self.phase = Phase::Running;
                let result = InitializeResult {
                    capabilities: capabilities(),
                    server_info: Some(ServerInfo {
                        name: "fluxsheet".to_string(),
                        version: Some(env!("CARGO_PKG_VERSION").to_string()),
                    }),
                };
                vec![Response::new_ok(id, result).into()]
            }
            (Phase::WaitingForInitialize, _) => vec![error(
                id,
                ErrorCode::ServerNotInitialized,
                "the server is not initialized yet",
            )],
            (Phase::ShutDown, _) | (Phase::Running, Initialize::METHOD) => vec![error(
                id,
                ErrorCode::InvalidRequest,
                &format!("`{method}` is out of turn"),
            )],
            (Phase::Running, Shutdown::METHOD) => {
                self.phase = Phase::ShutDown;
                vec![Response::new_ok(id, ()).into()]
            }
            (Phase::Running, HoverRequest::METHOD) => {
                self.answer::<HoverRequest>(request, |server, params| {
                    let (document, offset) =
                        server.locate(&params.text_document_position_params)?;
                    hover(document, offset)
                })
            }
            (Phase::Running, Completion::METHOD) => {
                self.answer::<Completion>(request, |server, params| {
                    let (document, offset) = server.locate(&params.text_document_position)?;
                    Some(CompletionResponse::Array(completions(document, offset)))
                })
            }
            (Phase::Running, GotoDefinition::METHOD) => {
                self.answer::<GotoDefinition>(request, |server, params| {
                    let (document, offset) =
                        server.locate(&params.text_document_position_params)?;
                    definition(document, offset).map(GotoDefinitionResponse::Scalar)
                })
            }
            (Phase::Running, DocumentSymbolRequest::METHOD) => self
                .answer::<DocumentSymbolRequest>(request, |server, params| {
                    let document = server.document(&params.text_document.uri)?;
                    Some(DocumentSymbolResponse::Nested(symbols(document)))
                }),
            (Phase::Running, InlayHintRequest::METHOD) => {
                self.answer::<InlayHintRequest>(request, |server, params| {
                    let document = server.document(&params.text_document.uri)?;
                    Some(inlay_hints(document, params.range))
                })
            }
            (Phase::Running, _) => vec![error(
                id,
                ErrorCode::MethodNotFound,
                &format!("unknown method `{method}`"),
            )],
        }
    }

    /// Reads a request's parameters (an "invalid params" error if they do not fit) and answers.
    fn answer<R>(
        &mut self,
        request: Request,
        handler: impl FnOnce(&Self, R::Params) -> R::Result,
    ) -> Vec<Message>
    where
        R: lsp_types::request::Request,
        R::Params: DeserializeOwned,
        R::Result: Serialize,
    {
        match serde_json::from_value::<R::Params>(request.params) {
            Ok(params) => vec![Response::new_ok(request.id, handler(self, params)).into()],
            Err(problem) => vec![error(
                request.id,
                ErrorCode::InvalidParams,
                &format!("invalid parameters of `{}`: {problem}", R::METHOD),
            )],
        }
    }

    fn notification(&mut self, notification: Notification) -> Vec<Message> {
        if notification.method == Exit::METHOD {
            self.exit_code = Some(if self.phase == Phase::ShutDown { 0 } else { 1 });
            return Vec::new();
        }
        if self.phase != Phase::Running {
            return Vec::new();
        }
        // A notification cannot be answered: one with parameters that do not fit is logged.
        let method = notification.method.clone();
        let result = match method.as_str() {
            DidOpenTextDocument::METHOD => {
                read::<DidOpenTextDocument>(notification).map(|params| {
                    let document = params.text_document;
                    let key = document.uri.as_str().to_string();
                    let opened = Document::open(document.uri, document.text, document.version);
                    self.documents.insert(key.clone(), opened);
                    self.publish(&key)
                })
            }
            DidChangeTextDocument::METHOD => {
                read::<DidChangeTextDocument>(notification).map(|params| {
                    let key = params.text_document.uri.as_str().to_string();
                    match self.documents.get_mut(&key) {
                        Some(document) => {
                            document.change(params.text_document.version, params.content_changes);
                            self.publish(&key)
                        }
                        None => Vec::new(),
                    }
                })
            }
            DidSaveTextDocument::METHOD => read::<DidSaveTextDocument>(notification).map(|_| {
                // A saved sheet may be included by another open one: evaluate them all again.
                let keys: Vec<String> = self.documents.keys().cloned().collect();
                keys.iter()
                    .flat_map(|key| {
                        if let Some(document) = self.documents.get_mut(key) {
                            document.reevaluate();
                        }
                        self.publish(key)
                    })
                    .collect()
            }),
            DidCloseTextDocument::METHOD => {
                read::<DidCloseTextDocument>(notification).map(|params| {
                    let uri = params.text_document.uri;
                    let key = uri.as_str().to_string();
                    self.documents.remove(&key);
                    let others = self.published.remove(&key).unwrap_or_default();
                    std::iter::once(uri)
                        .chain(others)
                        .map(|uri| publish_notification(uri, Vec::new(), None))
                        .collect()
                })
            }
            _ => Ok(Vec::new()),
        };
        result.unwrap_or_else(|problem| {
            vec![log(
                MessageType::ERROR,
                format!("invalid parameters of `{method}`: {problem}"),
            )]
        })
    }

    /// The diagnostics of a document, and empty lists for included files that no longer have any.
    fn publish(&mut self, key: &str) -> Vec<Message> {
        let Some(document) = self.documents.get(key) else {
            return Vec::new();
        };
        let files = diagnostics(document);
        let mut messages = Vec::new();
        let others: Vec<Uri> = files
            .iter()
            .map(|(uri, _)| uri.clone())
            .filter(|uri| *uri != document.uri)
            .collect();
        for stale in self.published.remove(key).unwrap_or_default() {
            if !others.contains(&stale) {
                messages.push(publish_notification(stale, Vec::new(), None));
            }
        }
        for (uri, list) in files {
            let version = (uri == document.uri).then_some(document.version);
            messages.push(publish_notification(uri, list, version));
        }
        self.published.insert(key.to_string(), others);
        messages
    }

    fn document(&self, uri: &Uri) -> Option<&Document> {
        self.documents.get(uri.as_str())
    }

    /// The document and byte offset of a request's position.
    fn locate(&self, position: &TextDocumentPositionParams) -> Option<(&Document, usize)> {
        let document = self.document(&position.text_document.uri)?;
        let offset = document.index.offset(&document.text, position.position);
        Some((document, offset))
    }
}

fn read<N>(notification: Notification) -> Result<N::Params, serde_json::Error>
where
    N: lsp_types::notification::Notification,
    N::Params: DeserializeOwned,
{
    serde_json::from_value(notification.params)
}

fn error(id: RequestId, code: ErrorCode, message: &str) -> Message {
    Response::new_err(id, code as i32, message.to_string()).into()
}

fn log(kind: MessageType, message: String) -> Message {
    Notification::new(
        LogMessage::METHOD.to_string(),
        LogMessageParams { typ: kind, message },
    )
    .into()
}

fn publish_notification(
    uri: Uri,
    diagnostics: Vec<lsp_types::Diagnostic>,
    version: Option<i32>,
) -> Message {
    Notification::new(
        PublishDiagnostics::METHOD.to_string(),
        PublishDiagnosticsParams {
            uri,
            diagnostics,
            version,
        },
    )
    .into()
}
