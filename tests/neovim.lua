-- Opens the sheet named by FLUXSHEET_SHEET in headless Neovim, attaches the fluxsheet language
-- server (FLUXSHEET_BINARY) and writes each diagnostic it publishes to FLUXSHEET_OUT as
-- `line:column:severity:message`. Uses only calls present since Neovim 0.7 (Debian's).
local sheet = vim.env.FLUXSHEET_SHEET
vim.cmd("edit " .. vim.fn.fnameescape(sheet))
local client = vim.lsp.start_client({
  name = "fluxsheet",
  cmd = { vim.env.FLUXSHEET_BINARY, "lsp" },
  root_dir = vim.fn.fnamemodify(sheet, ":h"),
})
vim.lsp.buf_attach_client(0, client)
vim.wait(30000, function()
  return #vim.diagnostic.get(0) > 0
end, 20)
local lines = {}
for _, diagnostic in ipairs(vim.diagnostic.get(0)) do
  table.insert(lines, string.format("%d:%d:%d:%s", diagnostic.lnum, diagnostic.col,
    diagnostic.severity, diagnostic.message:gsub("\n", " | ")))
end
vim.fn.writefile(lines, vim.env.FLUXSHEET_OUT)
vim.lsp.stop_client(client)
vim.cmd("qa!")
