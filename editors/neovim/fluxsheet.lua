-- fluxsheet in Neovim: `.fxs` files get the `fluxsheet` language server (values as inlay
-- hints, unit errors as diagnostics). Put this file on the runtime path (for example as
-- ~/.config/nvim/plugin/fluxsheet.lua) with `fluxsheet` on PATH.

vim.filetype.add({ extension = { fxs = "fluxsheet" } })

vim.api.nvim_create_autocmd("FileType", {
  pattern = "fluxsheet",
  callback = function(event)
    vim.lsp.start({
      name = "fluxsheet",
      cmd = { "fluxsheet", "lsp" },
      root_dir = vim.fs.dirname(vim.api.nvim_buf_get_name(event.buf)),
    })
    -- Inlay hints (each line's value and unit) need Neovim 0.10 or later.
    if vim.lsp.inlay_hint then
      vim.lsp.inlay_hint.enable(true, { bufnr = event.buf })
    end
  end,
})
