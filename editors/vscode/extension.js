// Starts `fluxsheet lsp` for .fxs files; everything else (values as inlay hints, diagnostics,
// hovers, completion, definitions, outline) comes from the server.
const vscode = require("vscode");
const { LanguageClient } = require("vscode-languageclient/node");

let client;

function activate() {
  const command = vscode.workspace.getConfiguration("fluxsheet").get("path") || "fluxsheet";
  client = new LanguageClient(
    "fluxsheet",
    "fluxsheet",
    { command, args: ["lsp"] },
    { documentSelector: [{ scheme: "file", language: "fluxsheet" }, { scheme: "untitled", language: "fluxsheet" }] }
  );
  return client.start();
}

function deactivate() {
  return client ? client.stop() : undefined;
}

module.exports = { activate, deactivate };
